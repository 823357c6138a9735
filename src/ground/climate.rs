//! Climate → ground-surface temperature over a year.
//!
//! Time `t` is in seconds from 1 January 00:00; the year has 365 days (`model::YEAR_S`) and, for
//! monthly data, twelve equal months. Air temperatures become surface temperatures through the
//! n-factors alone: `n_f·T` below 0 °C and `n_t·T` above (TM 5-852-6, 1988, §2-3); no other
//! air-to-surface conversion is applied.

use crate::model::{AirSeries, Climate, DAY_S, NFactors, YEAR_S};
use std::f64::consts::PI;

/// The surface temperature of the periodic (typical) year, as a function of time.
#[derive(Clone, Debug, PartialEq)]
pub enum SurfaceYear {
    Wave {
        mean_c: f64,
        amplitude_k: f64,
        t_min_s: f64,
    },
    /// A trigonometric series in the phase τ = t/YEAR of the AIR temperature, then n-factors.
    Harmonics {
        mean_c: f64,
        cos: [f64; 6],
        sin: [f64; 6],
        n: NFactors,
    },
    /// Air temperatures at even steps over one year (periodic), then n-factors.
    Samples {
        step_s: f64,
        air_c: Vec<f64>,
        n: NFactors,
    },
    Constant {
        temperature_c: f64,
    },
}

impl SurfaceYear {
    pub fn from_climate(climate: &Climate) -> Self {
        match climate {
            Climate::AnnualWave {
                mean_c,
                amplitude_k,
                coldest_day,
            } => SurfaceYear::Wave {
                mean_c: *mean_c,
                amplitude_k: *amplitude_k,
                t_min_s: (coldest_day - 1.0) * DAY_S,
            },
            Climate::MonthlyAir { air_c, n_factors } => monthly_harmonics(air_c, *n_factors),
            Climate::Series(series) => SurfaceYear::Samples {
                step_s: series.step_s,
                air_c: typical_year(series),
                n: series.n_factors,
            },
            Climate::Constant { temperature_c } => SurfaceYear::Constant {
                temperature_c: *temperature_c,
            },
        }
    }

    /// Surface temperature at time `t_s` (periodic with one year), °C.
    pub fn surface_c(&self, t_s: f64) -> f64 {
        match self {
            SurfaceYear::Wave {
                mean_c,
                amplitude_k,
                t_min_s,
            } => mean_c - amplitude_k * (2.0 * PI * (t_s - t_min_s) / YEAR_S).cos(),
            SurfaceYear::Harmonics { n, .. } | SurfaceYear::Samples { n, .. } => {
                apply_n_factors(self.air_c(t_s), *n)
            }
            SurfaceYear::Constant { temperature_c } => *temperature_c,
        }
    }

    /// Air temperature at `t_s` for climates given as air temperatures; the surface temperature
    /// otherwise.
    pub fn air_c(&self, t_s: f64) -> f64 {
        match self {
            SurfaceYear::Harmonics { mean_c, cos, sin, .. } => {
                let tau = t_s / YEAR_S;
                let mut t = *mean_c;
                for k in 0..6 {
                    let w = 2.0 * PI * (k + 1) as f64 * tau;
                    t += cos[k] * w.cos() + sin[k] * w.sin();
                }
                t
            }
            SurfaceYear::Samples { step_s, air_c, .. } => {
                let n = air_c.len();
                let x = (t_s / step_s).rem_euclid(n as f64);
                let i = x.floor() as usize % n;
                let f = x - x.floor();
                air_c[i] * (1.0 - f) + air_c[(i + 1) % n] * f
            }
            _ => self.surface_c(t_s),
        }
    }

    /// True when the surface temperature is a pure sinusoid (closed forms apply).
    pub fn is_sinusoidal(&self) -> bool {
        matches!(self, SurfaceYear::Wave { .. } | SurfaceYear::Constant { .. })
    }
}

/// TM 5-852-6 n-factors: surface = n_f·air below 0 °C, n_t·air above.
pub fn apply_n_factors(air_c: f64, n: NFactors) -> f64 {
    if air_c < 0.0 {
        n.freezing * air_c
    } else {
        n.thawing * air_c
    }
}

/// The trigonometric series whose mean over each twelfth of the year equals that month's mean.
///
/// A series sampled at mid-month interpolates the twelve values exactly (discrete Fourier
/// transform); the mean of `cos(2πkτ)` over a month is its mid-month value times
/// `s_k = sin(πk/12)/(πk/12)`, so dividing each harmonic by `s_k` makes the monthly means exact.
/// The 6th cosine vanishes at every mid-month point and is left out.
pub fn monthly_harmonics(air_c: &[f64; 12], n: NFactors) -> SurfaceYear {
    let mean_c = air_c.iter().sum::<f64>() / 12.0;
    let mut cos = [0.0; 6];
    let mut sin = [0.0; 6];
    for k in 1..=6 {
        let weight = if k == 6 { 1.0 / 12.0 } else { 2.0 / 12.0 };
        let (mut a, mut b) = (0.0, 0.0);
        for (j, m) in air_c.iter().enumerate() {
            let w = 2.0 * PI * k as f64 * (j as f64 + 0.5) / 12.0;
            a += m * w.cos();
            b += m * w.sin();
        }
        let x = PI * k as f64 / 12.0;
        let s_k = x.sin() / x;
        cos[k - 1] = if k == 6 { 0.0 } else { weight * a / s_k };
        sin[k - 1] = weight * b / s_k;
    }
    SurfaceYear::Harmonics { mean_c, cos, sin, n }
}

/// The mean year of a multi-year record: each step of the year averaged over the years that hold
/// it (the record may start on any day).
pub fn typical_year(series: &AirSeries) -> Vec<f64> {
    let per_year = (YEAR_S / series.step_s).round() as usize;
    let offset = ((series.start_day_of_year - 1.0) * DAY_S / series.step_s).round() as usize;
    let mut sum = vec![0.0; per_year];
    let mut count = vec![0usize; per_year];
    for (i, t) in series.air_c.iter().enumerate() {
        let slot = (i + offset) % per_year;
        sum[slot] += t;
        count[slot] += 1;
    }
    // The file holds at least one whole year (checked on reading), so every slot has a value.
    sum.iter()
        .zip(&count)
        .map(|(s, &c)| s / c.max(1) as f64)
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    const N1: NFactors = NFactors {
        freezing: 1.0,
        thawing: 1.0,
    };

    /// Mean over [a, b] by composite Simpson's rule with 2000 panels (independent of the algebra).
    fn mean_over(f: impl Fn(f64) -> f64, a: f64, b: f64) -> f64 {
        let n = 2000;
        let h = (b - a) / n as f64;
        let mut s = f(a) + f(b);
        for i in 1..n {
            s += f(a + i as f64 * h) * if i % 2 == 1 { 4.0 } else { 2.0 };
        }
        s * h / 3.0 / (b - a)
    }

    #[test]
    fn monthly_interpolation_reproduces_every_monthly_mean() {
        let air = [
            -9.5, -8.1, -3.0, 4.2, 10.8, 15.5, 17.9, 16.6, 11.7, 5.4, -0.8, -6.9,
        ];
        let year = monthly_harmonics(&air, N1);
        for (j, m) in air.iter().enumerate() {
            let a = j as f64 * YEAR_S / 12.0;
            let got = mean_over(|t| year.air_c(t), a, a + YEAR_S / 12.0);
            assert!((got - m).abs() < 1e-9, "month {j}: {got} vs {m}");
        }
    }

    #[test]
    fn wave_is_coldest_on_the_given_day() {
        let c = Climate::AnnualWave {
            mean_c: 8.0,
            amplitude_k: 10.0,
            coldest_day: 30.0,
        };
        let y = SurfaceYear::from_climate(&c);
        assert!((y.surface_c(29.0 * DAY_S) - (-2.0)).abs() < 1e-12);
        assert!((y.surface_c(29.0 * DAY_S + YEAR_S / 2.0) - 18.0).abs() < 1e-12);
    }

    #[test]
    fn n_factors_scale_freezing_and_thawing_separately() {
        let n = NFactors {
            freezing: 0.5,
            thawing: 1.5,
        };
        assert_eq!(apply_n_factors(-10.0, n), -5.0);
        assert_eq!(apply_n_factors(10.0, n), 15.0);
    }

    #[test]
    fn typical_year_averages_across_years() {
        let s = AirSeries {
            start_year: 2031,
            start_day_of_year: 1.0,
            step_s: DAY_S,
            air_c: (0..730).map(|i| if i < 365 { 1.0 } else { 3.0 }).collect(),
            n_factors: N1,
            source: String::new(),
        };
        let y = typical_year(&s);
        assert_eq!(y.len(), 365);
        assert!(y.iter().all(|&v| (v - 2.0).abs() < 1e-12));
    }
}
