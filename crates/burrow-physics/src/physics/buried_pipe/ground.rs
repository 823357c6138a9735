//! The soil's part: a pipe's own ground resistance, the mutual resistance of two pipes, and the
//! temperature rise that a line source and its image cause at a point.

use super::{GroundForm, Position, Soil, positive};
use std::f64::consts::PI;

/// Ground resistance of one pipe per metre, m K/W, from its outer surface to the ground surface.
///
/// With `H' = H + k·R0` ([`Soil::effective_depth_m`]):
/// - [`GroundForm::Exact`]: `R_g = acosh(H'/r_o)/(2πk)`, the isothermal cylinder under an
///   isothermal plane, conduction shape factor `S' = 2π/acosh(2H/D)` (bipolar coordinates;
///   Carslaw & Jaeger, *Conduction of Heat in Solids*, 2nd ed. 1959; the shape-factor table of
///   Incropera & DeWitt, *Fundamentals of Heat and Mass Transfer*, Table 4.1, case 1 — table
///   and case number `from memory`);
/// - [`GroundForm::LineSource`]: `R_g = ln(2H'/r_o)/(2πk)`, a line source and its image
///   (EN 13941-1, written there `ln(4H/D_c)/(2πλ_g)`).
///
/// `depth_m` is the depth of the pipe's centre, `outer_radius_m` its outermost radius (m).
pub fn ground_resistance_m_k_per_w(
    depth_m: f64,
    outer_radius_m: f64,
    soil: &Soil,
    form: GroundForm,
) -> Result<f64, String> {
    positive("the outer radius", outer_radius_m, "m")?;
    if !(depth_m.is_finite() && depth_m > outer_radius_m) {
        return Err(format!(
            "the pipe centre depth {depth_m} m leaves no cover over the outer radius {outer_radius_m} m; \
             the depth must exceed the outer radius"
        ));
    }
    let h_eff_m = soil.effective_depth_m(depth_m);
    let ratio = h_eff_m / outer_radius_m;
    let shape = match form {
        GroundForm::Exact => ratio.acosh(),
        GroundForm::LineSource => (2.0 * ratio).ln(),
    };
    Ok(shape / (2.0 * PI * soil.conductivity_w_per_m_k))
}

/// Temperature rise at `point` per unit heat rate of a line source at `source` (K per W/m), with
/// the source's negative image above the effective surface:
/// `ΔT/q = ln(d'/d)/(2πk)`, `d` the distance to the source, `d'` the distance to its image,
/// the source mirrored in the effective surface `z = −k·R0`, i.e. at depth `−(H + 2k·R0)`
/// (Kelvin's method of images, Carslaw & Jaeger 1959, chapter on steady two-dimensional flow;
/// EN 13941-1 for the surface resistance as an added depth).
///
/// The point must lie in the soil (depth ≥ 0) and away from the source itself.
pub fn line_source_rise_k_per_w_per_m(point: Position, source: Position, soil: &Soil) -> Result<f64, String> {
    if !(point.depth_m.is_finite() && point.depth_m >= 0.0 && point.x_m.is_finite()) {
        return Err(format!(
            "the point at depth {} m is not in the soil; the depth must be zero or more",
            point.depth_m
        ));
    }
    let d_m = point.distance_m(&source);
    if d_m.is_nan() || d_m <= 0.0 {
        return Err("the point coincides with a pipe centre; pick a point in the soil".into());
    }
    let surface_shift_m = soil.conductivity_w_per_m_k * soil.surface_resistance_m2_k_per_w;
    let image = Position::new(source.x_m, -source.depth_m - 2.0 * surface_shift_m);
    let d_image_m = point.distance_m(&image);
    Ok((d_image_m / d_m).ln() / (2.0 * PI * soil.conductivity_w_per_m_k))
}

/// Mutual resistance of two pipes per metre, m K/W: the temperature rise at the centre of one per
/// unit heat rate of the other (symmetric in the two).
///
/// `R_m = ln(d'/d)/(2πk)` with `d` the centre distance and `d'` the distance from one centre to
/// the other's image ([`line_source_rise_k_per_w_per_m`]). For equal depths this is
/// EN 13941-1's `R_m = ln(sqrt(1 + (2H'/E)²))/(2πk)` (E = centre spacing).
pub fn mutual_resistance_m_k_per_w(a: Position, b: Position, soil: &Soil) -> Result<f64, String> {
    line_source_rise_k_per_w_per_m(a, b, soil)
}
