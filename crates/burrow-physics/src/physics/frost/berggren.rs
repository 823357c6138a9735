//! Modified Berggren formula for the depth of frost (Aldrich & Paynter 1953; TM 5-852-6, 1988,
//! ch. 2 "modified Berggren formula"), for one soil and for layered soils.
//!
//! `X = λ sqrt(2 k F / L)` corrects Stefan's formula for the sensible heat of the soil: F is the
//! surface freezing index (°C·s), k and C the means of the frozen and unfrozen conductivities and
//! heat capacities (TM 5-852-6), and λ depends on
//!
//! - the thermal ratio `α = v0 / vs`, with `v0` = mean annual temperature − freezing point and
//!   `vs = F / t` the mean surface temperature below freezing over the freezing season of
//!   length t;
//! - the fusion parameter `μ = C vs / L`.
//!
//! Aldrich & Paynter's chart of λ(α, μ) is Neumann's solution with equal frozen and unfrozen
//! properties (Carslaw & Jaeger 1959 §11.2) written in these variables. Here it is solved, not
//! read from a digitised chart: with `X = 2ξ sqrt(k t / C)` and `F = vs t`,
//!
//! ```text
//! e^{−ξ²} (1/erf ξ − α/erfc ξ) = √π ξ / μ          (Neumann, k1 = k2, C1 = C2)
//! λ = X / sqrt(2 k F / L) = ξ sqrt(2/μ)
//! ```
//!
//! so that λ → 1 as μ → 0 and λ falls as μ or α grows.
//!
//! Layered soils (TM 5-852-6 ch. 2, multilayer systems): C and L are thickness-weighted means
//! over the frozen depth X, λ follows from α and that μ, and the surface index needed to freeze
//! to X is the layered Stefan sum divided by λ²:
//! `F(X) = (1/λ²) Σ L_i d_i (Σ_{j<i} d_j/k_j + d_i/(2 k_i))`. TM 5-852-6 iterates on X by hand;
//! here `F(X) = F` is solved by Brent's method on X, which gives the same fixed point.

use super::neumann::neumann_xi;
use super::stefan::{FrostLayer, check_layers, latent_resistance_sum, slices};
use super::{check_finite, check_non_negative, check_positive};
use crate::numerics::roots::brent;

/// The freezing season that drives the modified Berggren formula.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FreezingSeason {
    /// Surface freezing index n·F, °C·s.
    pub surface_index_c_s: f64,
    /// Length of the freezing season t, s.
    pub length_s: f64,
    /// Mean annual temperature, °C (TM 5-852-6 uses the mean annual air temperature).
    pub mean_annual_c: f64,
    /// Freezing point of the soil water, °C (normally 0).
    pub freezing_point_c: f64,
}

/// Result of the modified Berggren formula.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BerggrenDepth {
    /// Frost depth X, m.
    pub depth_m: f64,
    /// Coefficient λ at that depth.
    pub lambda: f64,
    /// Thermal ratio α = v0/vs (infinite when the freezing index is 0).
    pub alpha: f64,
    /// Fusion parameter μ = C vs / L with C and L averaged over the frozen depth (infinite when
    /// the frozen depth holds no water).
    pub mu: f64,
}

/// The modified Berggren coefficient `λ = ξ sqrt(2/μ)` for thermal ratio `alpha` (≥ 0) and fusion
/// parameter `mu` (≥ 0), with ξ Neumann's root for equal frozen and unfrozen properties
/// (Aldrich & Paynter 1953; Carslaw & Jaeger 1959 §11.2; module docs). λ(α, 0) = 1.
pub fn berggren_lambda(alpha: f64, mu: f64) -> Result<f64, String> {
    check_non_negative("the thermal ratio α", alpha)?;
    check_non_negative("the fusion parameter μ", mu)?;
    if mu == 0.0 {
        return Ok(1.0);
    }
    Ok(neumann_xi(alpha, 1.0, 1.0 / mu)? * (2.0 / mu).sqrt())
}

impl FreezingSeason {
    fn check(&self) -> Result<(), String> {
        check_non_negative("the surface freezing index (°C·s)", self.surface_index_c_s)?;
        check_positive("the length of the freezing season (s)", self.length_s)?;
        check_finite("the mean annual temperature (°C)", self.mean_annual_c)?;
        check_finite("the freezing point (°C)", self.freezing_point_c)?;
        if self.mean_annual_c < self.freezing_point_c {
            return Err(format!(
                "the mean annual temperature {:.2} °C is below the freezing point; the modified Berggren formula is for seasonal frost in ground that is unfrozen on average",
                self.mean_annual_c
            ));
        }
        Ok(())
    }

    /// Mean surface temperature below freezing over the season, `vs = F/t`, K.
    fn vs_k(&self) -> f64 {
        self.surface_index_c_s / self.length_s
    }

    /// Thermal ratio `α = v0/vs`.
    fn alpha(&self) -> f64 {
        (self.mean_annual_c - self.freezing_point_c) / self.vs_k()
    }
}

/// Frost depth by the modified Berggren formula in layered soil (one layer for a homogeneous
/// soil), TM 5-852-6 ch. 2 and module docs. Layer conductivity and heat capacity are the means
/// of the frozen and unfrozen values ([`FrostLayer::k_mean_w_mk`], [`FrostLayer::c_mean_j_m3k`]).
pub fn modified_berggren_depth(
    layers: &[FrostLayer],
    season: &FreezingSeason,
) -> Result<BerggrenDepth, String> {
    check_layers(layers)?;
    season.check()?;
    if season.surface_index_c_s == 0.0 {
        return Ok(BerggrenDepth {
            depth_m: 0.0,
            lambda: 1.0,
            alpha: f64::INFINITY,
            mu: 0.0,
        });
    }
    let alpha = season.alpha();
    let at = |x: f64| depth_state(layers, season, alpha, x);
    let residual = |x: f64| {
        at(x)
            .map(|(needed, _, _)| needed - season.surface_index_c_s)
            .unwrap_or(f64::NAN)
    };
    // Start from the depth Stefan's formula gives for the top layer (λ ≤ 1 keeps the root near
    // or below it) and widen the bracket until the needed index changes sign.
    let top = &layers[0];
    let mut hi = (2.0 * top.k_mean_w_mk() * season.surface_index_c_s / top.latent_j_per_m3.max(1.0))
        .sqrt()
        .max(1e-3);
    let mut lo = hi;
    for _ in 0..200 {
        if residual(hi) > 0.0 {
            break;
        }
        hi *= 2.0;
    }
    for _ in 0..200 {
        if residual(lo) < 0.0 {
            break;
        }
        lo *= 0.5;
    }
    let (rl, rh) = (residual(lo), residual(hi));
    if !(rl < 0.0 && rh > 0.0) {
        return Err("the modified Berggren depth could not be bracketed; check the soil properties".into());
    }
    let depth = brent(residual, lo, hi, 1e-12 * hi).ok_or("the modified Berggren depth did not converge")?;
    let (_, lambda, mu) = at(depth)?;
    Ok(BerggrenDepth {
        depth_m: depth,
        lambda,
        alpha,
        mu,
    })
}

/// For a trial frost depth `x` (m): the surface index needed to freeze to it (°C·s), λ and μ.
/// `F(x) = C vs x W / (2ξ²)`, where `W = Σ L_i d_i R_mid,i / Σ L_i d_i` (or the plain
/// thickness-weighted mean of R_mid when the frozen depth is dry) is the latent-heat-weighted
/// mean resistance from the surface to each layer's middle; for L > 0 this equals
/// `(1/λ²) Σ L_i d_i R_mid,i` with `1/λ² = μ/(2ξ²)`, and it stays finite as L → 0.
fn depth_state(
    layers: &[FrostLayer],
    season: &FreezingSeason,
    alpha: f64,
    x: f64,
) -> Result<(f64, f64, f64), String> {
    let pieces = slices(layers, x);
    let c_mean = pieces.iter().map(|(l, d)| l.c_mean_j_m3k() * d).sum::<f64>() / x;
    let latent_sum = pieces.iter().map(|(l, d)| l.latent_j_per_m3 * d).sum::<f64>();
    let vs = season.vs_k();
    let inv_mu = latent_sum / x / (c_mean * vs);
    let xi = neumann_xi(alpha, 1.0, inv_mu)?;
    let (with_latent, unit_latent) = latent_resistance_sum(layers, x, |l| l.k_mean_w_mk());
    let weighted = if latent_sum > 0.0 {
        with_latent / latent_sum
    } else {
        unit_latent / x
    };
    let needed = c_mean * vs * x * weighted / (2.0 * xi * xi);
    let mu = if inv_mu > 0.0 { 1.0 / inv_mu } else { f64::INFINITY };
    let lambda = if inv_mu > 0.0 {
        xi * (2.0 * inv_mu).sqrt()
    } else {
        0.0
    };
    Ok((needed, lambda, mu))
}
