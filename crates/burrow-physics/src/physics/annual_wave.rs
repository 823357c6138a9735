//! Closed-form annual temperature wave in a homogeneous semi-infinite soil.
//!
//! Source: H. S. Carslaw & J. C. Jaeger, *Conduction of Heat in Solids*, 2nd ed.,
//! Oxford 1959, §2.6 ("periodic surface temperature"), applied to the ground by
//! T. Kusuda & P. R. Achenbach, "Earth temperature and thermal diffusivity at
//! selected stations in the United States", ASHRAE Transactions 71(1), 1965.
//!
//! With the surface held at `T_mean − A·cos(ω(t − t_min))` the periodic solution is
//!
//! ```text
//! T(z, t) = T_mean + g·z − A·exp(−z/d)·cos(ω(t − t_min) − z/d)
//! d = sqrt(2α/ω) = sqrt(α·P/π),  ω = 2π/P
//! ```
//!
//! where `g = q_geo/k` is the steady geothermal gradient (superposed because the
//! equation is linear).
//!
//! # Time convention
//!
//! Time `t_s` is in seconds with `t = 0` at **1 January 00:00**. Day of year `d`
//! (1-based, fractional values allowed) starts at `t = (d − 1)·86 400 s`, so day 1
//! is 1 January and `coldest_day = 1.5` means 1 January 12:00. One year is
//! 365 days ([`YEAR_S`]).

use std::f64::consts::PI;

pub use crate::numerics::time::{DAY_S, YEAR_S};

/// A sinusoidal annual surface temperature and its penetration into the ground.
///
/// See the module documentation for the time convention (t = 0 s is 1 January
/// 00:00; day of year `d` starts at `(d − 1)·86 400 s`).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AnnualWave {
    /// Annual mean surface temperature, °C.
    pub mean_c: f64,
    /// Half the annual surface swing (mean to extreme), K.
    pub amplitude_k: f64,
    /// Day of year (1-based, fractional allowed) at which the surface is coldest;
    /// the minimum occurs at `t = (coldest_day − 1)·86 400 s`.
    pub coldest_day: f64,
    /// Period of the wave, s (normally [`YEAR_S`]).
    pub period_s: f64,
}

impl AnnualWave {
    /// Checked constructor: all values finite, amplitude ≥ 0, period > 0.
    pub fn new(mean_c: f64, amplitude_k: f64, coldest_day: f64, period_s: f64) -> Result<Self, String> {
        if !mean_c.is_finite() || !coldest_day.is_finite() {
            return Err("the mean temperature and coldest day must be finite numbers".into());
        }
        if !(amplitude_k.is_finite() && amplitude_k >= 0.0) {
            return Err(format!(
                "the amplitude {amplitude_k} K is invalid; it must be finite and not negative"
            ));
        }
        if !(period_s.is_finite() && period_s > 0.0) {
            return Err(format!(
                "the period {period_s} s is invalid; it must be a positive number of seconds"
            ));
        }
        Ok(Self {
            mean_c,
            amplitude_k,
            coldest_day,
            period_s,
        })
    }

    /// Angular frequency ω = 2π/P, rad/s.
    pub fn angular_frequency_rad_s(&self) -> f64 {
        2.0 * PI / self.period_s
    }

    /// Time of the surface minimum, s after 1 January 00:00.
    pub fn coldest_time_s(&self) -> f64 {
        (self.coldest_day - 1.0) * DAY_S
    }

    /// The periodic part `−A·exp(−z/d)·cos(ω(t − t_min) − z/d)` (K), with the depth
    /// given as the dimensionless `z/d`. Carslaw & Jaeger 1959 §2.6.
    fn periodic_part_k(&self, t_s: f64, z_over_d: f64) -> f64 {
        let phase = self.angular_frequency_rad_s() * (t_s - self.coldest_time_s()) - z_over_d;
        -self.amplitude_k * (-z_over_d).exp() * phase.cos()
    }

    /// Surface temperature (°C) at time `t_s` (s after 1 January 00:00):
    /// `T_mean − A·cos(ω(t − t_min))`.
    pub fn surface_c(&self, t_s: f64) -> f64 {
        self.mean_c + self.periodic_part_k(t_s, 0.0)
    }

    /// Undisturbed ground temperature (°C) at depth `z_m` (m, positive down) and time
    /// `t_s` (s after 1 January 00:00) in a homogeneous soil of thermal diffusivity
    /// `diffusivity_m2_per_s` (m²/s) with steady geothermal gradient `gradient_k_per_m`
    /// (K/m, = q_geo/k, positive when warmer at depth).
    ///
    /// `T = T_mean + g·z − A·exp(−z/d)·cos(ω(t − t_min) − z/d)`,
    /// Carslaw & Jaeger 1959 §2.6; Kusuda & Achenbach 1965.
    /// A non-positive diffusivity gives NaN.
    pub fn ground_c(&self, z_m: f64, t_s: f64, diffusivity_m2_per_s: f64, gradient_k_per_m: f64) -> f64 {
        let d = damping_depth_m(diffusivity_m2_per_s, self.period_s);
        self.mean_c + gradient_k_per_m * z_m + self.periodic_part_k(t_s, z_m / d)
    }

    /// Annual `(mean, min, max)` temperature (°C) at depth `z_m` (m):
    /// mean `T_mean + g·z`, swing `±A·exp(−z/d)` (Carslaw & Jaeger 1959 §2.6).
    pub fn envelope(&self, z_m: f64, diffusivity_m2_per_s: f64, gradient_k_per_m: f64) -> (f64, f64, f64) {
        let d = damping_depth_m(diffusivity_m2_per_s, self.period_s);
        let mean = self.mean_c + gradient_k_per_m * z_m;
        let swing = self.amplitude_k * (-z_m / d).exp();
        (mean, mean - swing, mean + swing)
    }
}

/// Damping depth `d = sqrt(2α/ω) = sqrt(α·P/π)` (m) for diffusivity
/// `diffusivity_m2_per_s` (m²/s) and period `period_s` (s); the amplitude falls by 1/e
/// over each `d`. Carslaw & Jaeger 1959 §2.6. Non-positive inputs give NaN.
pub fn damping_depth_m(diffusivity_m2_per_s: f64, period_s: f64) -> f64 {
    if diffusivity_m2_per_s > 0.0 && period_s > 0.0 {
        (diffusivity_m2_per_s * period_s / PI).sqrt()
    } else {
        f64::NAN
    }
}

/// Time lag (s) of the temperature extremes at depth `z_m` (m) behind the surface:
/// `z/d · P/(2π)`, i.e. `P/(2π)` per damping depth. Carslaw & Jaeger 1959 §2.6.
pub fn lag_s(z_m: f64, diffusivity_m2_per_s: f64, period_s: f64) -> f64 {
    z_m / damping_depth_m(diffusivity_m2_per_s, period_s) * period_s / (2.0 * PI)
}
