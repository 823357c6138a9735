//! The table of segment-to-segment FLS responses at a sorted list of times, for every distinct
//! distance and segment pair of a layout.
//!
//! All times share one quadrature in s: since `h(τ) = ∫_{s0(τ)}^∞ …ds` with
//! `s0(τ) = 1/√(4ατ)`, the integral at the m-th smallest time is the one at the previous time
//! plus the integral over `[s0(τ_m), s0(τ_{m−1})]`. Each interval is integrated with
//! Gauss–Legendre panels in ln s, and at every node the integrand is the outer product of the
//! distance part `exp(−d²s²)` (one value per distance) and the segment part (one value per
//! segment pair), accumulated into the running table. The integral from the smallest time's
//! `s0` upwards is cut where `exp(−d_min² s²) < e^(−49)`.

use super::cylinder::CylinderSource;
use super::layout::Layout;
use super::quadrature::{Rules, log_panels};

/// Widest panel in ln s, and the cut of the upper tail as a multiple of 1/d_min.
const MAX_PANEL: f64 = 0.25;
const TAIL_CUT: f64 = 7.0;

pub(crate) struct ResponseTable {
    distances: usize,
    keys: usize,
    /// `[time][distance][key]`, dimensionless.
    values: Vec<f64>,
    /// Per time, the number of leading distances whose responses are not negligible (below
    /// 1e-16 of the largest response at that time from there on); the rest are skipped.
    reach: Vec<usize>,
}

impl ResponseTable {
    /// Responses at `taus_s` (strictly increasing, s) for ground diffusivity `alpha_m2_per_s`.
    /// With `cylinder`, each segment's own response gets the near-field correction
    /// `g_CS − g_ILS` at its radius.
    pub(crate) fn build(
        layout: &Layout,
        alpha_m2_per_s: f64,
        taus_s: &[f64],
        cylinder: Option<&CylinderSource>,
    ) -> Self {
        let nd = layout.distances_m.len();
        let nk = layout.keys.len();
        let mut values = vec![0.0; taus_s.len() * nd * nk];
        let mut running = vec![0.0; nd * nk];
        let rules = Rules::new();
        let d_min = layout.distances_m[0];
        let s0 = |tau: f64| 1.0 / (4.0 * alpha_m2_per_s * tau).sqrt();
        let mut upper = (TAIL_CUT / d_min).max(s0(taus_s[0]));
        let mut distance_part = vec![0.0; nd];
        let mut segment_part = vec![0.0; nk];
        let d2: Vec<f64> = layout.distances_m.iter().map(|d| d * d).collect();
        for (m, &tau) in taus_s.iter().enumerate() {
            let lower = s0(tau);
            for node in log_panels(lower, upper, MAX_PANEL, &rules) {
                let s2 = node.s * node.s;
                let mut live = 0;
                for (a, &dd) in distance_part.iter_mut().zip(&d2) {
                    *a = node.weight * (-dd * s2).exp();
                    if *a == 0.0 {
                        break;
                    }
                    live += 1;
                }
                for (b, key) in segment_part.iter_mut().zip(&layout.keys) {
                    *b = key.kernel(node.s);
                }
                for (row, &a) in running.chunks_exact_mut(nk).zip(&distance_part[..live]) {
                    for (r, &b) in row.iter_mut().zip(&segment_part) {
                        *r += a * b;
                    }
                }
            }
            upper = lower;
            let out = &mut values[m * nd * nk..(m + 1) * nd * nk];
            out.copy_from_slice(&running);
            if let Some(cs) = cylinder {
                for t in &layout.self_terms {
                    let fourier = alpha_m2_per_s * tau / (t.radius_m * t.radius_m);
                    out[t.distance * nk + t.key] += cs.correction(fourier);
                }
            }
        }
        let reach = values
            .chunks_exact(nd * nk)
            .map(|table| {
                let largest = table.iter().fold(0.0_f64, |m, v| m.max(v.abs()));
                let row_max = |d: usize| {
                    table[d * nk..(d + 1) * nk]
                        .iter()
                        .fold(0.0_f64, |m, v| m.max(v.abs()))
                };
                (0..nd)
                    .rev()
                    .find(|&d| row_max(d) >= 1e-16 * largest)
                    .map_or(0, |d| d + 1)
            })
            .collect();
        Self {
            distances: nd,
            keys: nk,
            values,
            reach,
        }
    }

    /// The `[distance][key]` table at the m-th time.
    pub(crate) fn at(&self, m: usize) -> &[f64] {
        let n = self.distances * self.keys;
        &self.values[m * n..(m + 1) * n]
    }

    /// Distances at or beyond this index have negligible responses at the m-th time.
    pub(crate) fn reach(&self, m: usize) -> usize {
        self.reach[m]
    }

    pub(crate) fn keys(&self) -> usize {
        self.keys
    }
}
