//! Neumann's exact solution for freezing of a semi-infinite soil after a step of the surface
//! temperature (two phases, different frozen and unfrozen properties).
//!
//! Carslaw & Jaeger, *Conduction of Heat in Solids*, 2nd ed., 1959, §11.2, eqs. (4)–(7): the
//! soil z > 0 is unfrozen at `V` until t = 0, when the surface is held at `T0 < Tf`. The front is
//! at `X = 2ξ sqrt(a1 t)` (a = k/C, index 1 frozen, 2 unfrozen) with
//!
//! ```text
//! frozen    T1 = T0 + (Tf − T0) erf(z / 2√(a1 t)) / erf ξ
//! unfrozen  T2 = V − (V − Tf) erfc(z / 2√(a2 t)) / erfc(ξ ν),   ν = √(a1/a2)
//! ```
//!
//! and ξ the root of the Stefan condition `k1 ∂T1/∂z − k2 ∂T2/∂z = L dX/dt` at z = X:
//!
//! ```text
//! e^{−ξ²}/erf ξ − β e^{−ξ²ν²}/erfc(ξν) = √π ξ / Ste,
//! β = k2 √a1 (V − Tf) / (k1 √a2 (Tf − T0)),   Ste = C1 (Tf − T0) / L.
//! ```
//!
//! The left side falls strictly from +∞ (ξ → 0) and the right side rises, so the root is unique;
//! it is bracketed and found by Brent's method. The second term is written with the scaled
//! complementary error function `erfcx(x) = e^{x²} erfc(x)` so that it stays finite for large ξν.

use std::f64::consts::PI;

use crate::numerics::special::{erf, erfcx};

use super::{check_finite, check_non_negative, check_positive};
use crate::numerics::roots::decreasing_root_on_positive_axis;

/// The dimensionless Neumann root ξ (> 0) of `e^{−ξ²}/erf ξ − β/erfcx(νξ) = √π ξ · inv_ste`
/// (Carslaw & Jaeger 1959 §11.2), where `beta` ≥ 0 is the unfrozen-side heat ratio, `nu` > 0
/// the square root of the diffusivity ratio a1/a2 and `inv_ste` ≥ 0 the inverse Stefan number
/// `L / (C1 (Tf − T0))` (0 for no latent heat). `beta` and `inv_ste` may not both be 0 (the
/// front would run to infinity).
pub fn neumann_xi(beta: f64, nu: f64, inv_ste: f64) -> Result<f64, String> {
    check_non_negative("the unfrozen-side heat ratio β", beta)?;
    check_positive("the diffusivity ratio ν = √(a1/a2)", nu)?;
    check_non_negative("the inverse Stefan number L/(C ΔT)", inv_ste)?;
    if beta == 0.0 && inv_ste == 0.0 {
        return Err(
            "with no latent heat and unfrozen soil exactly at the freezing point the front runs to infinity; give latent heat or warmer soil".into(),
        );
    }
    let residual =
        |xi: f64| -> f64 { (-xi * xi).exp() / erf(xi) - beta / erfcx(nu * xi) - PI.sqrt() * xi * inv_ste };
    // One-phase small-Stefan estimate ξ ≈ sqrt(Ste/2) as a starting bracket, capped to O(1).
    let guess = if inv_ste > 0.0 {
        (0.5 / inv_ste).sqrt().min(1.0)
    } else {
        0.5
    };
    decreasing_root_on_positive_axis(residual, guess)
        .ok_or_else(|| "the Neumann equation has no root for these properties; check them".to_string())
}

/// Neumann's two-phase freezing problem (Carslaw & Jaeger 1959 §11.2): a semi-infinite soil at
/// `initial_c` whose surface is held at `surface_c` (below `freezing_point_c`) from t = 0.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NeumannFreezing {
    /// Frozen conductivity k1, W/(m K).
    pub k_frozen_w_mk: f64,
    /// Frozen volumetric heat capacity C1, J/(m³ K).
    pub c_frozen_j_m3k: f64,
    /// Unfrozen conductivity k2, W/(m K).
    pub k_unfrozen_w_mk: f64,
    /// Unfrozen volumetric heat capacity C2, J/(m³ K).
    pub c_unfrozen_j_m3k: f64,
    /// Volumetric latent heat L, J/m³.
    pub latent_j_per_m3: f64,
    /// Initial (unfrozen) soil temperature V, °C (≥ freezing point).
    pub initial_c: f64,
    /// Surface temperature T0 from t = 0, °C (< freezing point).
    pub surface_c: f64,
    /// Freezing point Tf, °C.
    pub freezing_point_c: f64,
}

impl NeumannFreezing {
    fn check(&self) -> Result<(), String> {
        check_positive("the frozen conductivity (W/(m K))", self.k_frozen_w_mk)?;
        check_positive("the frozen heat capacity (J/(m³ K))", self.c_frozen_j_m3k)?;
        check_positive("the unfrozen conductivity (W/(m K))", self.k_unfrozen_w_mk)?;
        check_positive("the unfrozen heat capacity (J/(m³ K))", self.c_unfrozen_j_m3k)?;
        check_non_negative("the latent heat (J/m³)", self.latent_j_per_m3)?;
        check_finite("the initial temperature (°C)", self.initial_c)?;
        check_finite("the surface temperature (°C)", self.surface_c)?;
        check_finite("the freezing point (°C)", self.freezing_point_c)?;
        if self.surface_c >= self.freezing_point_c {
            return Err(format!(
                "the surface temperature {} °C is not below the freezing point {} °C; nothing freezes",
                self.surface_c, self.freezing_point_c
            ));
        }
        if self.initial_c < self.freezing_point_c {
            return Err(format!(
                "the initial temperature {} °C is below the freezing point {} °C; it must be at or above it",
                self.initial_c, self.freezing_point_c
            ));
        }
        Ok(())
    }

    fn diffusivities(&self) -> (f64, f64) {
        (
            self.k_frozen_w_mk / self.c_frozen_j_m3k,
            self.k_unfrozen_w_mk / self.c_unfrozen_j_m3k,
        )
    }

    /// The root ξ of the transcendental equation of Carslaw & Jaeger §11.2 (module docs), so
    /// that the front is at `X = 2ξ sqrt(a1 t)`.
    pub fn xi(&self) -> Result<f64, String> {
        self.check()?;
        let (a1, a2) = self.diffusivities();
        let below = self.freezing_point_c - self.surface_c;
        let beta = self.k_unfrozen_w_mk * a1.sqrt() * (self.initial_c - self.freezing_point_c)
            / (self.k_frozen_w_mk * a2.sqrt() * below);
        let inv_ste = self.latent_j_per_m3 / (self.c_frozen_j_m3k * below);
        neumann_xi(beta, (a1 / a2).sqrt(), inv_ste)
    }

    /// Frost depth `X = 2ξ sqrt(a1 t)` (m) at time `t_s` (s ≥ 0) after the step.
    pub fn depth_m(&self, t_s: f64) -> Result<f64, String> {
        check_non_negative("the time (s)", t_s)?;
        let (a1, _) = self.diffusivities();
        Ok(2.0 * self.xi()? * (a1 * t_s).sqrt())
    }

    /// Temperature (°C) at depth `z_m` (m ≥ 0) and time `t_s` (s > 0) from the two-phase field
    /// of Carslaw & Jaeger §11.2 (module docs).
    pub fn temperature_c(&self, z_m: f64, t_s: f64) -> Result<f64, String> {
        check_non_negative("the depth (m)", z_m)?;
        check_positive("the time (s)", t_s)?;
        let xi = self.xi()?;
        let (a1, a2) = self.diffusivities();
        let front = 2.0 * xi * (a1 * t_s).sqrt();
        if z_m <= front {
            let eta = z_m / (2.0 * (a1 * t_s).sqrt());
            Ok(self.surface_c + (self.freezing_point_c - self.surface_c) * erf(eta) / erf(xi))
        } else {
            let eta = z_m / (2.0 * (a2 * t_s).sqrt());
            let xn = xi * (a1 / a2).sqrt();
            // erfc(η)/erfc(ξν) = erfcx(η)/erfcx(ξν) · e^{(ξν)² − η²}, finite for large arguments.
            let ratio = erfcx(eta) / erfcx(xn) * (xn * xn - eta * eta).exp();
            Ok(self.initial_c - (self.initial_c - self.freezing_point_c) * ratio)
        }
    }
}
