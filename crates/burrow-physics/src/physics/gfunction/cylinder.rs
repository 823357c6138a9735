//! The near field of one borehole: infinite line source and infinite cylinder source with a
//! constant heat rate at the borehole wall.
//!
//! Both are written as g-functions of the Fourier number `Fo = α t / r_b²`, i.e. the wall
//! temperature rise in units of `q'/(2πk)`.

use super::quadrature::{Node, Rules, log_panels};
use std::f64::consts::PI;

/// Euler–Mascheroni constant γ.
const EULER_GAMMA: f64 = 0.577_215_664_901_532_9;

/// The exponential integral E1(x) = ∫_x^∞ e^(−u)/u du for x > 0: the power series
/// (Abramowitz & Stegun 1964, eq. 5.1.11) for x ≤ 1, the continued fraction (A&S eq. 5.1.22,
/// evaluated by the modified Lentz method) above.
pub(crate) fn exponential_integral_e1(x: f64) -> f64 {
    if x <= 1.0 {
        let mut sum = 0.0;
        let mut term = 1.0;
        for k in 1..200 {
            let kf = k as f64;
            term *= -x / kf;
            let add = term / kf;
            sum += add;
            if add.abs() < 1e-17 * sum.abs().max(1e-300) {
                break;
            }
        }
        -EULER_GAMMA - x.ln() - sum
    } else {
        let tiny = 1e-300;
        let mut b = x + 1.0;
        let mut c = 1.0 / tiny;
        let mut d = 1.0 / b;
        let mut h = d;
        for i in 1..200 {
            let a = -((i * i) as f64);
            b += 2.0;
            d = 1.0 / (a * d + b);
            c = b + a / c;
            let delta = c * d;
            h *= delta;
            if (delta - 1.0).abs() < 1e-16 {
                break;
            }
        }
        h * (-x).exp()
    }
}

/// Infinite line source at the borehole wall: `g = ½·E1(1/(4·Fo))`, Fo = αt/r_b² (Ingersoll,
/// Zobel & Ingersoll 1954, *Heat Conduction*, ch. 10; Carslaw & Jaeger 1959, §10.4, the
/// continuous line source `v = q'/(4πK)·E1(r²/(4κt))`). Dimensionless.
pub(crate) fn infinite_line_source(fourier: f64) -> f64 {
    0.5 * exponential_integral_e1(1.0 / (4.0 * fourier))
}

/// Infinite cylinder source with a constant heat rate per unit length at its surface, wall
/// temperature (Carslaw & Jaeger 1959, §13.7, the region bounded internally by a circular
/// cylinder with constant flux; Ingersoll et al. 1954). At `r = r_b` the Wronskian
/// `J1·Y0 − J0·Y1 = 2/(πβ)` reduces C&J's integral to
///
/// ```text
/// g_CS(Fo) = (4/π²) ∫₀^∞ (1 − exp(−β² Fo)) / (β³ (J1(β)² + Y1(β)²)) dβ
/// ```
///
/// evaluated on fixed Gauss–Legendre panels in ln β (the Bessel part is computed once).
pub(crate) struct CylinderSource {
    nodes: Vec<Node>,
    /// Quadrature weight times `(4/π²)/(β³ (J1² + Y1²))` at each node.
    factors: Vec<f64>,
    beta_low: f64,
    beta_high: f64,
}

impl CylinderSource {
    const BETA_LOW: f64 = 1e-7;
    const BETA_HIGH: f64 = 1e5;

    pub(crate) fn new() -> Self {
        let rules = Rules::new();
        let nodes = log_panels(Self::BETA_LOW, Self::BETA_HIGH, 0.25, &rules);
        let factors = nodes
            .iter()
            .map(|n| {
                let b = n.s;
                let j1 = libm::j1(b);
                let y1 = libm::y1(b);
                n.weight * 4.0 / (PI * PI) / (b * b * b * (j1 * j1 + y1 * y1))
            })
            .collect();
        Self {
            nodes,
            factors,
            beta_low: Self::BETA_LOW,
            beta_high: Self::BETA_HIGH,
        }
    }

    /// The smallest Fourier number this table resolves (the factor `exp(−β²Fo)` must have died
    /// out at the top of the table).
    pub(crate) fn smallest_fourier(&self) -> f64 {
        (8.0 / self.beta_high).powi(2)
    }

    /// `g_CS(Fo)`, dimensionless; `fourier ≥ smallest_fourier()`.
    pub(crate) fn g(&self, fourier: f64) -> f64 {
        let body: f64 = self
            .nodes
            .iter()
            .zip(&self.factors)
            .map(|(n, f)| -libm::expm1(-n.s * n.s * fourier) * f)
            .sum();
        // Below β_low: J1² + Y1² = (2/(πβ))² to O(β² ln β), so the piece is ½·Ein(β_low² Fo),
        // Ein(x) = ∫₀ˣ (1 − e^(−u))/u du = E1(x) + ln x + γ.
        let x = self.beta_low * self.beta_low * fourier;
        let low = 0.5
            * if x < 1e-6 {
                x - x * x / 4.0
            } else {
                exponential_integral_e1(x) + x.ln() + EULER_GAMMA
            };
        // Above β_high: exp(−β²Fo) ≈ 0 and J1² + Y1² = 2/(πβ)·(1 + 3/(8β²) + …) (A&S 9.2.28),
        // so the piece is (2/π)(1/β_high − 1/(8 β_high³)).
        let b = self.beta_high;
        let high = 2.0 / PI * (1.0 / b - 1.0 / (8.0 * b * b * b));
        body + low + high
    }

    /// The near-field correction `g_CS(Fo) − g_ILS(Fo)` added to a borehole segment's own
    /// response (see the module documentation of `gfunction`).
    pub(crate) fn correction(&self, fourier: f64) -> f64 {
        self.g(fourier) - infinite_line_source(fourier)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn e1_matches_tabulated_values() {
        // Abramowitz & Stegun (1964), Table 5.1: E1(1) = 0.219383934, E1(0.5) = 0.559773595,
        // E1(2) = 0.048900511.
        assert!((exponential_integral_e1(1.0) - 0.219_383_934).abs() < 1e-9);
        assert!((exponential_integral_e1(0.5) - 0.559_773_595).abs() < 1e-9);
        assert!((exponential_integral_e1(2.0) - 0.048_900_511).abs() < 1e-9);
    }

    #[test]
    fn cylinder_source_tends_to_the_plane_wall_at_short_times() {
        // At Fo → 0 the wall sees a plane with constant flux: ΔT = 2q''√(αt/π)/k, i.e.
        // g = 2√(Fo/π) (Carslaw & Jaeger §2.9); curvature adds O(Fo).
        let cs = CylinderSource::new();
        let fo = 1e-6;
        let plane = 2.0 * (fo / PI).sqrt();
        assert!((cs.g(fo) / plane - 1.0).abs() < 2e-3);
    }

    #[test]
    fn cylinder_source_tends_to_the_line_source_at_long_times() {
        let cs = CylinderSource::new();
        for fo in [1e3, 1e5] {
            assert!(cs.correction(fo).abs() < 10.0 / fo, "Fo = {fo}");
        }
    }
}
