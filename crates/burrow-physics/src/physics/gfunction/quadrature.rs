//! Gauss–Legendre quadrature on panels of a logarithmic variable.
//!
//! Nodes and weights of the n-point Gauss–Legendre rule on [−1, 1] are the roots of the Legendre
//! polynomial P_n and w_i = 2 / ((1 − x_i²) P_n'(x_i)²) (Abramowitz & Stegun 1964, eq. 25.4.29),
//! found by Newton's method from the Chebyshev-like first guess cos(π(i − ¼)/(n + ½)).

use std::f64::consts::PI;

/// The n-point Gauss–Legendre rule on [−1, 1] as (nodes, weights); n ≥ 1.
pub(crate) fn gauss_legendre(n: usize) -> (Vec<f64>, Vec<f64>) {
    let mut nodes = vec![0.0; n];
    let mut weights = vec![0.0; n];
    for i in 0..n.div_ceil(2) {
        let mut x = (PI * (i as f64 + 0.75) / (n as f64 + 0.5)).cos();
        let mut derivative = 1.0;
        for _ in 0..100 {
            let (p, dp) = legendre_with_derivative(n, x);
            derivative = dp;
            let step = p / dp;
            x -= step;
            if step.abs() < 1e-16 {
                break;
            }
        }
        let (_, dp) = legendre_with_derivative(n, x);
        if dp != 0.0 {
            derivative = dp;
        }
        let w = 2.0 / ((1.0 - x * x) * derivative * derivative);
        nodes[i] = -x;
        nodes[n - 1 - i] = x;
        weights[i] = w;
        weights[n - 1 - i] = w;
    }
    (nodes, weights)
}

/// P_n(x) and P_n'(x) by the three-term recurrence (A&S eq. 22.7.10).
fn legendre_with_derivative(n: usize, x: f64) -> (f64, f64) {
    let (mut p0, mut p1) = (1.0, x);
    if n == 0 {
        return (1.0, 0.0);
    }
    for k in 2..=n {
        let kf = k as f64;
        let p2 = ((2.0 * kf - 1.0) * x * p1 - (kf - 1.0) * p0) / kf;
        p0 = p1;
        p1 = p2;
    }
    let dp = n as f64 * (x * p1 - p0) / (x * x - 1.0);
    (p1, dp)
}

/// One quadrature node in the variable u = ln s: the value s and the weight for ∫ f(s) ds, that is
/// the Gauss weight times the Jacobian ds/du = s.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Node {
    pub s: f64,
    pub weight: f64,
}

/// Nodes for ∫_{s_low}^{s_high} f(s) ds, panels in ln s no wider than `max_panel` with
/// `order`-point Gauss–Legendre on each (fewer points on very narrow panels).
pub(crate) fn log_panels(s_low: f64, s_high: f64, max_panel: f64, rules: &Rules) -> Vec<Node> {
    let mut out = Vec::new();
    if s_high.partial_cmp(&s_low) != Some(std::cmp::Ordering::Greater) || s_low <= 0.0 {
        return out;
    }
    let (u0, u1) = (s_low.ln(), s_high.ln());
    let panels = ((u1 - u0) / max_panel).ceil().max(1.0) as usize;
    let width = (u1 - u0) / panels as f64;
    let (nodes, weights) = rules.for_width(width);
    for k in 0..panels {
        let centre = u0 + (k as f64 + 0.5) * width;
        for (x, w) in nodes.iter().zip(weights) {
            let s = (centre + 0.5 * width * x).exp();
            out.push(Node {
                s,
                weight: 0.5 * width * w * s,
            });
        }
    }
    out
}

/// Gauss–Legendre rules of a few orders, chosen by panel width in ln s.
pub(crate) struct Rules {
    narrow: (Vec<f64>, Vec<f64>),
    medium: (Vec<f64>, Vec<f64>),
    wide: (Vec<f64>, Vec<f64>),
}

impl Rules {
    pub(crate) fn new() -> Self {
        Self {
            narrow: gauss_legendre(3),
            medium: gauss_legendre(5),
            wide: gauss_legendre(8),
        }
    }

    fn for_width(&self, width: f64) -> (&[f64], &[f64]) {
        let rule = if width < 0.02 {
            &self.narrow
        } else if width < 0.08 {
            &self.medium
        } else {
            &self.wide
        };
        (&rule.0, &rule.1)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn gauss_legendre_integrates_polynomials_exactly() {
        for n in [2, 3, 5, 8, 12] {
            let (x, w) = gauss_legendre(n);
            for degree in 0..(2 * n) {
                let numeric: f64 = x.iter().zip(&w).map(|(x, w)| w * x.powi(degree as i32)).sum();
                let exact = if degree % 2 == 1 {
                    0.0
                } else {
                    2.0 / (degree as f64 + 1.0)
                };
                assert!((numeric - exact).abs() < 1e-13, "n={n} degree={degree}");
            }
        }
    }
}
