//! Stefan's formula for the depth of frost, for one soil and for layered soils.
//!
//! Stefan's formula neglects the sensible heat of the soil: all the heat drawn through the
//! frozen layer is latent heat released at the front, and the temperature in the frozen layer
//! is linear. TM 5-852-6 (1988) ch. 2, "Stefan formula": `X = sqrt(2 k_f F / L)` with F the
//! surface freezing index. For layered soils (TM 5-852-6 ch. 2, "multilayer systems", after
//! Aldrich & Paynter 1953) the index needed to freeze through layer i is
//! `F_i = L_i d_i (Σ_{j<i} d_j/k_j + d_i/(2 k_i))`; the layers are frozen one after another
//! until the available index is used up, and the last layer is solved for a partial depth.

use super::{check_non_negative, check_positive};

/// One soil layer for the frost-depth formulas. The last layer of a list extends without limit
/// (its `thickness_m` is not used).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FrostLayer {
    /// Thickness, m.
    pub thickness_m: f64,
    /// Thermal conductivity of the frozen soil, W/(m K).
    pub k_frozen_w_mk: f64,
    /// Thermal conductivity of the unfrozen soil, W/(m K).
    pub k_unfrozen_w_mk: f64,
    /// Volumetric heat capacity of the frozen soil, J/(m³ K).
    pub c_frozen_j_m3k: f64,
    /// Volumetric heat capacity of the unfrozen soil, J/(m³ K).
    pub c_unfrozen_j_m3k: f64,
    /// Volumetric latent heat of the soil water, J/m³ (0 for a dry layer).
    pub latent_j_per_m3: f64,
}

impl FrostLayer {
    /// A layer whose frozen and unfrozen properties are equal.
    pub fn uniform(thickness_m: f64, k_w_mk: f64, c_j_m3k: f64, latent_j_per_m3: f64) -> Self {
        Self {
            thickness_m,
            k_frozen_w_mk: k_w_mk,
            k_unfrozen_w_mk: k_w_mk,
            c_frozen_j_m3k: c_j_m3k,
            c_unfrozen_j_m3k: c_j_m3k,
            latent_j_per_m3,
        }
    }

    /// Mean of the frozen and unfrozen conductivities, W/(m K) (TM 5-852-6's k for the
    /// modified Berggren formula).
    pub fn k_mean_w_mk(&self) -> f64 {
        0.5 * (self.k_frozen_w_mk + self.k_unfrozen_w_mk)
    }

    /// Mean of the frozen and unfrozen volumetric heat capacities, J/(m³ K) (TM 5-852-6's C
    /// for the modified Berggren formula).
    pub fn c_mean_j_m3k(&self) -> f64 {
        0.5 * (self.c_frozen_j_m3k + self.c_unfrozen_j_m3k)
    }
}

/// Checks a layer list: at least one layer, positive conductivities and heat capacities, latent
/// heat ≥ 0, and a positive thickness for every layer but the last.
pub(super) fn check_layers(layers: &[FrostLayer]) -> Result<(), String> {
    if layers.is_empty() {
        return Err("the soil has no layers; give at least one".into());
    }
    for (i, l) in layers.iter().enumerate() {
        let n = i + 1;
        if i + 1 < layers.len() {
            check_positive(&format!("the thickness of layer {n} (m)"), l.thickness_m)?;
        }
        check_positive(
            &format!("the frozen conductivity of layer {n} (W/(m K))"),
            l.k_frozen_w_mk,
        )?;
        check_positive(
            &format!("the unfrozen conductivity of layer {n} (W/(m K))"),
            l.k_unfrozen_w_mk,
        )?;
        check_positive(
            &format!("the frozen heat capacity of layer {n} (J/(m³ K))"),
            l.c_frozen_j_m3k,
        )?;
        check_positive(
            &format!("the unfrozen heat capacity of layer {n} (J/(m³ K))"),
            l.c_unfrozen_j_m3k,
        )?;
        check_non_negative(&format!("the latent heat of layer {n} (J/m³)"), l.latent_j_per_m3)?;
    }
    Ok(())
}

/// The pieces of the layers between the surface and `depth_m`: (layer, thickness within depth).
pub(super) fn slices(layers: &[FrostLayer], depth_m: f64) -> Vec<(&FrostLayer, f64)> {
    let mut out = Vec::new();
    let mut top = 0.0;
    for (i, l) in layers.iter().enumerate() {
        let last = i + 1 == layers.len();
        let bottom = if last { f64::INFINITY } else { top + l.thickness_m };
        let piece = depth_m.min(bottom) - top;
        if piece <= 0.0 {
            break;
        }
        out.push((l, piece));
        top = bottom;
    }
    out
}

/// Stefan's formula `X = sqrt(2 k_f F / L)` (TM 5-852-6 ch. 2): frost depth (m) for a frozen
/// conductivity `k_frozen_w_mk` (W/(m K)), surface freezing index `index_c_s` (°C·s, = n × air
/// index) and volumetric latent heat `latent_j_per_m3` (J/m³, > 0).
pub fn stefan_depth_m(k_frozen_w_mk: f64, index_c_s: f64, latent_j_per_m3: f64) -> Result<f64, String> {
    check_positive("the frozen conductivity (W/(m K))", k_frozen_w_mk)?;
    check_non_negative("the surface freezing index (°C·s)", index_c_s)?;
    check_positive("the volumetric latent heat (J/m³)", latent_j_per_m3)?;
    Ok((2.0 * k_frozen_w_mk * index_c_s / latent_j_per_m3).sqrt())
}

/// Surface freezing index (°C·s) that freezes layered soil down to `depth_m` by the layered
/// Stefan formula `Σ L_i d_i (Σ_{j<i} d_j/k_j + d_i/(2 k_i))` with frozen conductivities
/// (TM 5-852-6 ch. 2, multilayer systems; Aldrich & Paynter 1953), d_i the thickness of layer i
/// above `depth_m`.
pub fn layered_stefan_index_c_s(layers: &[FrostLayer], depth_m: f64) -> Result<f64, String> {
    check_layers(layers)?;
    check_non_negative("the frost depth (m)", depth_m)?;
    Ok(latent_resistance_sum(layers, depth_m, |l| l.k_frozen_w_mk).0)
}

/// `(Σ L_i d_i (R_above,i + d_i/(2k_i)), Σ d_i (R_above,i + d_i/(2k_i)))` over the layer pieces
/// above `depth_m`, with the conductivity chosen by `k`; the second sum is the same with unit
/// latent heat (used where every layer is dry).
pub(super) fn latent_resistance_sum(
    layers: &[FrostLayer],
    depth_m: f64,
    k: impl Fn(&FrostLayer) -> f64,
) -> (f64, f64) {
    let mut resistance_above = 0.0;
    let (mut with_latent, mut unit_latent) = (0.0, 0.0);
    for (l, d) in slices(layers, depth_m) {
        let ki = k(l);
        let mid = resistance_above + d / (2.0 * ki);
        with_latent += l.latent_j_per_m3 * d * mid;
        unit_latent += d * mid;
        resistance_above += d / ki;
    }
    (with_latent, unit_latent)
}

/// Frost depth (m) under a surface freezing index `index_c_s` (°C·s) in layered soil by the
/// layered Stefan formula (TM 5-852-6 ch. 2, multilayer systems): each layer takes
/// `F_i = L_i d_i (R_above + d_i/(2k_i))`; in the layer where the index runs out the partial
/// depth x solves `L x (R_above + x/(2k)) = F_left`, i.e. `x = k(−R_above + sqrt(R_above² +
/// 2 F_left/(k L)))`. A dry layer (L = 0) freezes through at no cost.
pub fn layered_stefan_depth_m(layers: &[FrostLayer], index_c_s: f64) -> Result<f64, String> {
    check_layers(layers)?;
    check_non_negative("the surface freezing index (°C·s)", index_c_s)?;
    if index_c_s == 0.0 {
        return Ok(0.0);
    }
    let mut left = index_c_s;
    let mut top = 0.0;
    let mut resistance_above = 0.0;
    for (i, l) in layers.iter().enumerate() {
        let k = l.k_frozen_w_mk;
        let last = i + 1 == layers.len();
        if last && l.latent_j_per_m3 == 0.0 {
            return Err(
                "the deepest layer is dry, so Stefan's formula puts frost at any depth; give it latent heat"
                    .into(),
            );
        }
        let whole = l.latent_j_per_m3 * l.thickness_m * (resistance_above + l.thickness_m / (2.0 * k));
        if last || whole > left {
            let x = k
                * (-resistance_above
                    + (resistance_above.powi(2) + 2.0 * left / (k * l.latent_j_per_m3)).sqrt());
            return Ok(top + x);
        }
        left -= whole;
        top += l.thickness_m;
        resistance_above += l.thickness_m / k;
    }
    Err("the soil has no layers; give at least one".into())
}
