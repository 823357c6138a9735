//! Gumbel (extreme value type I, largest values) fit of seasonal freezing indices and its
//! return-period values.
//!
//! E. J. Gumbel, *Statistics of Extremes*, Columbia University Press, 1958: distribution
//! `P(X ≤ x) = exp(−exp(−(x − u)/β))` (location u, scale β). Method of moments (§6.2.3):
//! `β = s·√6/π`, `u = x̄ − γ β` with s the sample standard deviation (n − 1) and γ Euler's
//! constant. Maximum likelihood (§6.2.4): `β = x̄ − Σ x e^{−x/β} / Σ e^{−x/β}`,
//! `u = −β ln((1/n) Σ e^{−x/β})`. The T-year return value is the quantile at `1 − 1/T`,
//! `x_T = u − β ln(−ln(1 − 1/T))`, evaluated with statrs' Gumbel distribution.

use statrs::distribution::{ContinuousCDF, Gumbel};

use crate::numerics::roots::brent;

/// Euler–Mascheroni constant γ.
const EULER_GAMMA: f64 = 0.577_215_664_901_532_9;

/// How the Gumbel parameters were estimated.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum GumbelMethod {
    /// Method of moments (Gumbel 1958 §6.2.3).
    Moments,
    /// Maximum likelihood (Gumbel 1958 §6.2.4).
    MaximumLikelihood,
}

/// A Gumbel distribution fitted to seasonal indices (°C·days).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GumbelFit {
    /// Location u, °C·days (the mode).
    pub location_c_days: f64,
    /// Scale β, °C·days.
    pub scale_c_days: f64,
    /// The estimator used.
    pub method: GumbelMethod,
    /// Number of seasons fitted.
    pub seasons: usize,
}

/// Fits a Gumbel distribution to seasonal indices `seasonal_c_days` (°C·days, at least 2 and
/// not all equal) by `method`.
pub fn fit_gumbel(seasonal_c_days: &[f64], method: GumbelMethod) -> Result<GumbelFit, String> {
    let n = seasonal_c_days.len();
    if n < 2 {
        return Err(format!(
            "a Gumbel fit needs at least 2 seasonal indices and {n} were given"
        ));
    }
    if let Some(x) = seasonal_c_days.iter().find(|x| !x.is_finite()) {
        return Err(format!(
            "a seasonal index is {x}; every index must be a finite number"
        ));
    }
    let mean = seasonal_c_days.iter().sum::<f64>() / n as f64;
    let var = seasonal_c_days.iter().map(|x| (x - mean).powi(2)).sum::<f64>() / (n - 1) as f64;
    let sd = var.sqrt();
    if sd <= 1e-12 * mean.abs().max(1.0) {
        return Err("all seasonal indices are equal; a Gumbel fit needs indices that vary".into());
    }
    let moments_scale = sd * 6f64.sqrt() / std::f64::consts::PI;
    let (location, scale) = match method {
        GumbelMethod::Moments => (mean - EULER_GAMMA * moments_scale, moments_scale),
        GumbelMethod::MaximumLikelihood => maximum_likelihood(seasonal_c_days, mean, moments_scale)?,
    };
    Ok(GumbelFit {
        location_c_days: location,
        scale_c_days: scale,
        method,
        seasons: n,
    })
}

/// Maximum-likelihood (u, β): the root of `g(β) = β − x̄ + Σ x w / Σ w`, `w = e^{−(x − x̄)/β}`,
/// which rises from `min x − x̄ < 0` (β → 0) through zero to +∞; then `u` from the second
/// likelihood equation. Data are centred on x̄ to keep the exponentials finite.
fn maximum_likelihood(x: &[f64], mean: f64, guess: f64) -> Result<(f64, f64), String> {
    let weighted = |beta: f64| -> (f64, f64) {
        // Shift by the smallest centred value so that every exponent is ≤ 0.
        let ymin = x.iter().fold(f64::INFINITY, |m, &v| m.min(v - mean));
        let (mut sw, mut swy) = (0.0, 0.0);
        for &v in x {
            let y = v - mean;
            let w = (-(y - ymin) / beta).exp();
            sw += w;
            swy += w * y;
        }
        (sw, swy / sw)
    };
    let g = |beta: f64| {
        let (_, wmean) = weighted(beta);
        beta + wmean
    };
    let mut hi = guess;
    while g(hi) <= 0.0 {
        hi *= 2.0;
        if !hi.is_finite() {
            return Err(
                "the maximum-likelihood Gumbel fit did not converge; use the method of moments".into(),
            );
        }
    }
    let mut lo = guess;
    while g(lo) >= 0.0 {
        lo *= 0.5;
        if lo < 1e-300 {
            return Err(
                "the maximum-likelihood Gumbel fit did not converge; use the method of moments".into(),
            );
        }
    }
    let beta = brent(g, lo, hi, 1e-13 * guess)
        .ok_or("the maximum-likelihood Gumbel fit did not converge; use the method of moments")?;
    let ymin = x.iter().fold(f64::INFINITY, |m, &v| m.min(v - mean));
    let (sw, _) = weighted(beta);
    let location = mean + ymin - beta * (sw / x.len() as f64).ln();
    Ok((location, beta))
}

impl GumbelFit {
    fn distribution(&self) -> Result<Gumbel, String> {
        Gumbel::new(self.location_c_days, self.scale_c_days)
            .map_err(|e| format!("the Gumbel parameters are invalid ({e}); the scale must be positive"))
    }

    /// The index (°C·days) exceeded on average once in `return_period_years` seasons (> 1):
    /// the quantile at `1 − 1/T` (Gumbel 1958), via statrs' `Gumbel::inverse_cdf`.
    pub fn return_value_c_days(&self, return_period_years: f64) -> Result<f64, String> {
        if !(return_period_years.is_finite() && return_period_years > 1.0) {
            return Err(format!(
                "the return period {return_period_years} years is invalid; it must be a finite number above 1"
            ));
        }
        Ok(self.distribution()?.inverse_cdf(1.0 - 1.0 / return_period_years))
    }

    /// Return period (years) of the index `index_c_days`: `1 / (1 − P(X ≤ x))`.
    pub fn return_period_years(&self, index_c_days: f64) -> Result<f64, String> {
        Ok(1.0 / self.distribution()?.sf(index_c_days))
    }
}
