//! Coaxial wall layers of a pipe (steel, insulation, casing) and the insulation conductivity.

use super::{finite, not_negative, positive};
use std::f64::consts::PI;

/// Largest fresh λ50 of polyurethane insulation that EN 253 allows, W/(m K) (`from memory`:
/// EN 253:2009+A2:2015, requirement on the thermal conductivity at 50 °C of the unaged foam).
pub const EN253_MAX_FRESH_LAMBDA50_W_PER_M_K: f64 = 0.029;

/// One coaxial wall layer.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct WallLayer {
    /// Radial thickness, m.
    pub thickness_m: f64,
    /// Thermal conductivity, W/(m K).
    pub conductivity_w_per_m_k: f64,
}

impl WallLayer {
    pub fn new(thickness_m: f64, conductivity_w_per_m_k: f64) -> Self {
        Self {
            thickness_m,
            conductivity_w_per_m_k,
        }
    }
}

/// Resistance of one cylindrical shell per metre, m K/W: `ln(r_out/r_in)/(2πk)` (steady radial
/// conduction in a hollow cylinder; Carslaw & Jaeger, *Conduction of Heat in Solids*, 2nd ed.
/// 1959, §7.2; Incropera & DeWitt, *Fundamentals of Heat and Mass Transfer*, §3.3.1,
/// eq. (3.28), equation number `from memory`).
/// Radii in m, conductivity in W/(m K).
pub fn shell_resistance_m_k_per_w(
    inner_radius_m: f64,
    outer_radius_m: f64,
    conductivity_w_per_m_k: f64,
) -> Result<f64, String> {
    positive("the inner radius of a wall layer", inner_radius_m, "m")?;
    positive(
        "the conductivity of a wall layer",
        conductivity_w_per_m_k,
        "W/(m K)",
    )?;
    if !(outer_radius_m.is_finite() && outer_radius_m >= inner_radius_m) {
        return Err(format!(
            "a wall layer's outer radius {outer_radius_m} m is below its inner radius {inner_radius_m} m; \
             it must be at least as large"
        ));
    }
    Ok((outer_radius_m / inner_radius_m).ln() / (2.0 * PI * conductivity_w_per_m_k))
}

/// Resistance of coaxial layers from the inside out, m K/W:
/// `Σ ln(r_{i+1}/r_i)/(2π k_i)` (series shells, [`shell_resistance_m_k_per_w`]).
/// `inner_radius_m` is the radius inside the first layer, m.
pub fn wall_resistance_m_k_per_w(inner_radius_m: f64, layers: &[WallLayer]) -> Result<f64, String> {
    let mut r_m = inner_radius_m;
    let mut total = 0.0;
    for layer in layers {
        not_negative("a wall layer's thickness", layer.thickness_m, "m")?;
        total += shell_resistance_m_k_per_w(r_m, r_m + layer.thickness_m, layer.conductivity_w_per_m_k)?;
        r_m += layer.thickness_m;
    }
    Ok(total)
}

/// Radius inside the innermost layer of a pipe given by its outer radius and its layers, m.
pub fn inner_radius_m(outer_radius_m: f64, layers: &[WallLayer]) -> Result<f64, String> {
    positive("the outer radius", outer_radius_m, "m")?;
    let inner = outer_radius_m - layers.iter().map(|l| l.thickness_m).sum::<f64>();
    if inner > 0.0 {
        Ok(inner)
    } else {
        Err(format!(
            "the wall layers are together {:.4} m thick, more than the outer radius {outer_radius_m} m; \
             they must leave a bore",
            outer_radius_m - inner
        ))
    }
}

/// Temperatures at the faces of the layers, °C, from the inside out (`layers.len() + 1` values,
/// the first the fluid-side face at `inner_c`), when `heat_w_per_m` flows outwards through them.
pub fn face_temperatures_c(
    inner_c: f64,
    heat_w_per_m: f64,
    inner_radius_m: f64,
    layers: &[WallLayer],
) -> Result<Vec<f64>, String> {
    finite("the inner face temperature", inner_c, "°C")?;
    finite("the heat rate", heat_w_per_m, "W/m")?;
    let mut faces = Vec::with_capacity(layers.len() + 1);
    faces.push(inner_c);
    let mut r_m = inner_radius_m;
    let mut t_c = inner_c;
    for layer in layers {
        t_c -= heat_w_per_m
            * shell_resistance_m_k_per_w(r_m, r_m + layer.thickness_m, layer.conductivity_w_per_m_k)?;
        r_m += layer.thickness_m;
        faces.push(t_c);
    }
    Ok(faces)
}

/// Mean insulation temperature, °C: the arithmetic mean of its inner and outer faces
/// (`common practice, no source`; the temperature at which EN 253 states λ, e.g. λ50 at 50 °C).
pub fn insulation_mean_temperature_c(inner_face_c: f64, outer_face_c: f64) -> f64 {
    0.5 * (inner_face_c + outer_face_c)
}

/// Reference temperature of λ50, °C (EN 253: the conductivity of the foam at a mean temperature
/// of 50 °C).
pub const LAMBDA50_REFERENCE_C: f64 = 50.0;

/// Insulation conductivity linear in temperature, `λ(T) = λ_ref + s·(T − T_ref)`
/// (the form used with EN 253 test results, e.g. `λ_ref` = λ50 at `T_ref` = 50 °C).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LinearConductivity {
    /// λ at the reference temperature, W/(m K).
    pub reference_w_per_m_k: f64,
    /// Reference temperature, °C.
    pub reference_c: f64,
    /// Slope dλ/dT, W/(m K²).
    pub slope_w_per_m_k2: f64,
}

impl LinearConductivity {
    /// Checked constructor: all values finite, λ_ref positive.
    pub fn new(reference_w_per_m_k: f64, reference_c: f64, slope_w_per_m_k2: f64) -> Result<Self, String> {
        positive(
            "the reference insulation conductivity",
            reference_w_per_m_k,
            "W/(m K)",
        )?;
        finite("the reference temperature", reference_c, "°C")?;
        finite("the conductivity slope", slope_w_per_m_k2, "W/(m K2)")?;
        Ok(Self {
            reference_w_per_m_k,
            reference_c,
            slope_w_per_m_k2,
        })
    }

    /// The EN 253 design law: the aged λ50 ([`aged_lambda50_w_per_m_k`] of the fresh λ50, W/(m K),
    /// and the ageing allowance, a fraction) at [`LAMBDA50_REFERENCE_C`], with the slope dλ/dT in
    /// W/(m K²).
    pub fn en253(
        fresh_lambda50_w_per_m_k: f64,
        ageing_allowance: f64,
        slope_w_per_m_k2: f64,
    ) -> Result<Self, String> {
        Self::new(
            aged_lambda50_w_per_m_k(fresh_lambda50_w_per_m_k, ageing_allowance)?,
            LAMBDA50_REFERENCE_C,
            slope_w_per_m_k2,
        )
    }

    /// λ at the mean insulation temperature `t_c` (°C), W/(m K); an error when the line gives
    /// zero or less there.
    pub fn at(&self, t_c: f64) -> Result<f64, String> {
        let lambda = self.reference_w_per_m_k + self.slope_w_per_m_k2 * (t_c - self.reference_c);
        if lambda.is_finite() && lambda > 0.0 {
            Ok(lambda)
        } else {
            Err(format!(
                "the insulation conductivity line gives {lambda} W/(m K) at {t_c} °C; \
                 the slope must keep it positive over the operating temperatures"
            ))
        }
    }
}

/// Aged λ50, W/(m K): the fresh λ50 raised by a relative ageing allowance,
/// `λ50,aged = λ50,fresh·(1 + a)`.
///
/// EN 253 asks for the conductivity of the aged foam for design; the allowance `a` (dimensionless)
/// comes from the manufacturer's ageing test. Typical values are 0.1–0.3 over 30 years for
/// casings without a diffusion barrier (`from memory`).
pub fn aged_lambda50_w_per_m_k(fresh_w_per_m_k: f64, ageing_allowance: f64) -> Result<f64, String> {
    positive("the fresh λ50", fresh_w_per_m_k, "W/(m K)")?;
    not_negative("the ageing allowance", ageing_allowance, "(fraction)")?;
    Ok(fresh_w_per_m_k * (1.0 + ageing_allowance))
}
