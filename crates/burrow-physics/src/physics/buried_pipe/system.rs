//! Any number of pipes in one cross-section: the resistance matrix, the coupled heat rates, the
//! closed form for a supply/return pair, the soil temperature at a neighbouring point, and the
//! fixed point of an EN 253 insulation law for separate pipes and for a twin pipe.

use super::ground::{
    ground_resistance_m_k_per_w, line_source_rise_k_per_w_per_m, mutual_resistance_m_k_per_w,
};
use super::twin::{TwinMethod, TwinPipe, TwinResistances};
use super::wall::{
    LinearConductivity, WallLayer, face_temperatures_c, inner_radius_m, wall_resistance_m_k_per_w,
};
use super::{GroundForm, Position, Soil, finite};

/// A pipe in the cross-section.
#[derive(Clone, Debug, PartialEq)]
pub struct PipeSection {
    /// Centre of the pipe (x across, depth of the centre below the surface).
    pub centre: Position,
    /// Outermost radius (outside the casing), m.
    pub outer_radius_m: f64,
    /// Wall layers from the inside out (may be empty: a bare pipe).
    pub layers: Vec<WallLayer>,
}

impl PipeSection {
    /// Radius inside the innermost layer, m.
    pub fn inner_radius_m(&self) -> Result<f64, String> {
        inner_radius_m(self.outer_radius_m, &self.layers)
    }

    /// Resistance of all wall layers, m K/W ([`wall_resistance_m_k_per_w`]).
    pub fn wall_resistance_m_k_per_w(&self) -> Result<f64, String> {
        wall_resistance_m_k_per_w(self.inner_radius_m()?, &self.layers)
    }

    /// Own resistance = wall layers + ground, m K/W: the pipe's diagonal entry (`R_s` or `R_r`).
    pub fn own_resistance_m_k_per_w(&self, soil: &Soil, form: GroundForm) -> Result<f64, String> {
        Ok(self.wall_resistance_m_k_per_w()?
            + ground_resistance_m_k_per_w(self.centre.depth_m, self.outer_radius_m, soil, form)?)
    }
}

/// What sets a pipe's exchange with the ground.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Drive {
    /// Fluid temperature, °C.
    FluidC(f64),
    /// Heat given to the ground, W/m (negative: taken from it).
    HeatWPerM(f64),
}

/// A pipe's solved state.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PipeState {
    /// Heat given to the ground, W/m.
    pub heat_w_per_m: f64,
    /// Fluid temperature, °C.
    pub fluid_c: f64,
}

/// The N×N resistance matrix, m K/W: own resistances (wall + ground) on the diagonal, mutual
/// resistances (soil only) off it, so that `T_i − T_g,i = Σ_j R_ij q_j`
/// (superposition of line sources with their images; EN 13941-1 for two pipes; Wallentén 1991,
/// *Steady-state heat loss from insulated pipes*, Lund, for the general case).
pub fn resistance_matrix(
    pipes: &[PipeSection],
    soil: &Soil,
    form: GroundForm,
) -> Result<Vec<Vec<f64>>, String> {
    check_no_overlap(pipes)?;
    let n = pipes.len();
    let mut r = vec![vec![0.0; n]; n];
    for i in 0..n {
        r[i][i] = pipes[i].own_resistance_m_k_per_w(soil, form)?;
        for j in 0..i {
            let m = mutual_resistance_m_k_per_w(pipes[i].centre, pipes[j].centre, soil)?;
            r[i][j] = m;
            r[j][i] = m;
        }
    }
    Ok(r)
}

fn check_no_overlap(pipes: &[PipeSection]) -> Result<(), String> {
    for i in 0..pipes.len() {
        for j in 0..i {
            let gap = pipes[i].centre.distance_m(&pipes[j].centre)
                - pipes[i].outer_radius_m
                - pipes[j].outer_radius_m;
            if gap.is_nan() || gap <= 0.0 {
                return Err(format!(
                    "pipes {j} and {i} overlap (their outer surfaces are {gap:.4} m apart); \
                     pipes must not touch"
                ));
            }
        }
    }
    Ok(())
}

/// Heat rates and fluid temperatures of N pipes, each driven by a fluid temperature or a heat
/// rate, each in its own undisturbed ground temperature `undisturbed_c[i]` (°C, at its depth).
///
/// Solves `T_i − T_g,i = Σ_j R_ij q_j` ([`resistance_matrix`]) for the unknown half of each
/// pair (q for temperature-driven pipes, T for heat-driven ones).
pub fn solve_pipes(
    pipes: &[PipeSection],
    drives: &[Drive],
    undisturbed_c: &[f64],
    soil: &Soil,
    form: GroundForm,
) -> Result<Vec<PipeState>, String> {
    let r = resistance_matrix(pipes, soil, form)?;
    solve_with_matrix(&r, drives, undisturbed_c)
}

/// [`solve_pipes`] with a precomputed resistance matrix.
pub fn solve_with_matrix(
    r: &[Vec<f64>],
    drives: &[Drive],
    undisturbed_c: &[f64],
) -> Result<Vec<PipeState>, String> {
    let n = r.len();
    if drives.len() != n || undisturbed_c.len() != n {
        return Err(format!(
            "{n} pipes were given with {} drives and {} ground temperatures; give one of each per pipe",
            drives.len(),
            undisturbed_c.len()
        ));
    }
    for (i, d) in drives.iter().enumerate() {
        finite(
            &format!("the undisturbed ground temperature at pipe {i}"),
            undisturbed_c[i],
            "°C",
        )?;
        match d {
            Drive::FluidC(t) => finite(&format!("the fluid temperature of pipe {i}"), *t, "°C")?,
            Drive::HeatWPerM(q) => finite(&format!("the heat rate of pipe {i}"), *q, "W/m")?,
        }
    }
    let unknown: Vec<usize> = (0..n)
        .filter(|&i| matches!(drives[i], Drive::FluidC(_)))
        .collect();
    let known_q = |j: usize| match drives[j] {
        Drive::HeatWPerM(q) => q,
        Drive::FluidC(_) => 0.0,
    };
    let a: Vec<Vec<f64>> = unknown
        .iter()
        .map(|&i| unknown.iter().map(|&j| r[i][j]).collect())
        .collect();
    let b: Vec<f64> = unknown
        .iter()
        .map(|&i| {
            let Drive::FluidC(t) = drives[i] else {
                unreachable!()
            };
            t - undisturbed_c[i] - (0..n).map(|j| r[i][j] * known_q(j)).sum::<f64>()
        })
        .collect();
    let x = solve_small(a, b)?;
    let mut q: Vec<f64> = (0..n).map(known_q).collect();
    for (k, &i) in unknown.iter().enumerate() {
        q[i] = x[k];
    }
    Ok((0..n)
        .map(|i| PipeState {
            heat_w_per_m: q[i],
            fluid_c: undisturbed_c[i] + (0..n).map(|j| r[i][j] * q[j]).sum::<f64>(),
        })
        .collect())
}

/// Gaussian elimination with partial pivoting for a small dense system.
pub(crate) fn solve_small(mut a: Vec<Vec<f64>>, mut b: Vec<f64>) -> Result<Vec<f64>, String> {
    let n = b.len();
    for c in 0..n {
        let p = (c..n)
            .max_by(|&i, &j| a[i][c].abs().total_cmp(&a[j][c].abs()))
            .unwrap_or(c);
        if a[p][c].is_nan() || a[p][c].abs() <= 1e-300 {
            return Err("the linear system is singular; check the pipe positions and sizes".into());
        }
        a.swap(c, p);
        b.swap(c, p);
        let (upper, lower) = a.split_at_mut(c + 1);
        let pivot_row = &upper[c];
        for (offset, row) in lower.iter_mut().enumerate() {
            let f = row[c] / pivot_row[c];
            for (x, p) in row[c..].iter_mut().zip(&pivot_row[c..]) {
                *x -= f * p;
            }
            b[c + 1 + offset] -= f * b[c];
        }
    }
    let mut x = vec![0.0; n];
    for i in (0..n).rev() {
        let s: f64 = (i + 1..n).map(|k| a[i][k] * x[k]).sum();
        x[i] = (b[i] - s) / a[i][i];
    }
    Ok(x)
}

/// Heat rates `[q_s, q_r]` (W/m) of a supply/return pair from the 2×2 resistance system
/// `[T_s − T_g; T_r − T_g] = [[R_s, R_m], [R_m, R_r]]·[q_s; q_r]` (EN 13941-1, two pipes in one
/// trench; Wallentén 1991):
///
/// `q_s = (R_r·ΔT_s − R_m·ΔT_r)/(R_s·R_r − R_m²)`, `q_r = (R_s·ΔT_r − R_m·ΔT_s)/(R_s·R_r − R_m²)`.
///
/// `own_supply`, `own_return` = wall + ground (m K/W), `mutual` = soil only (m K/W); the
/// excesses `ΔT` are fluid minus undisturbed ground temperature (K).
pub fn pair_heat_rates_w_per_m(
    own_supply_m_k_per_w: f64,
    own_return_m_k_per_w: f64,
    mutual_m_k_per_w: f64,
    supply_excess_k: f64,
    return_excess_k: f64,
) -> Result<[f64; 2], String> {
    let det = own_supply_m_k_per_w * own_return_m_k_per_w - mutual_m_k_per_w * mutual_m_k_per_w;
    if !(det.is_finite() && det > 0.0) {
        return Err(
            "the pair's own resistances must exceed their mutual resistance; check the pipe data".into(),
        );
    }
    Ok([
        (own_return_m_k_per_w * supply_excess_k - mutual_m_k_per_w * return_excess_k) / det,
        (own_supply_m_k_per_w * return_excess_k - mutual_m_k_per_w * supply_excess_k) / det,
    ])
}

/// Temperature rise of the soil at `point` (K above the undisturbed temperature there) caused by
/// pipes at `sources` giving `heat_w_per_m` each: `ΔT = Σ_j q_j·ln(d'_j/d_j)/(2πk)` (line
/// sources with their images, [`line_source_rise_k_per_w_per_m`]). The caller adds the
/// undisturbed ground temperature. `radii_m` are the pipes' outer radii: the point must lie
/// outside every pipe.
pub fn temperature_rise_k(
    point: Position,
    sources: &[Position],
    radii_m: &[f64],
    heat_w_per_m: &[f64],
    soil: &Soil,
) -> Result<f64, String> {
    if sources.len() != heat_w_per_m.len() || sources.len() != radii_m.len() {
        return Err("give one heat rate and one radius per pipe".into());
    }
    let mut rise = 0.0;
    for ((src, &r_m), &q) in sources.iter().zip(radii_m).zip(heat_w_per_m) {
        if point.distance_m(src) < r_m {
            return Err(format!(
                "the point ({}, {}) m lies inside a pipe; pick a point in the soil",
                point.x_m, point.depth_m
            ));
        }
        finite("a pipe's heat rate", q, "W/m")?;
        rise += q * line_source_rise_k_per_w_per_m(point, *src, soil)?;
    }
    Ok(rise)
}

/// Largest change of an insulation conductivity between two passes at which the EN 253 fixed
/// point counts as settled, W/(m K).
pub const INSULATION_LAW_TOLERANCE_W_PER_M_K: f64 = 1e-9;

/// Passes of the EN 253 fixed point before it counts as not settling.
const INSULATION_LAW_PASSES: usize = 100;

/// The fixed point `λ = law(T_mean(λ))` of EN 253 practice (the foam's conductivity taken at its
/// mean temperature) for one or more insulations at once, by direct iteration: `pass(λ)` solves
/// the heat flow with the conductivities `λ` (W/(m K)) and returns its state and the conductivities
/// the laws give at the resulting mean insulation temperatures. Starts from `start_w_per_m_k`
/// and stops when no conductivity changes by [`INSULATION_LAW_TOLERANCE_W_PER_M_K`] or more
/// (at most 100 passes). Returns the last state (solved with the previous conductivities, which
/// differ from the returned ones by less than the tolerance) and the settled conductivities;
/// `None` when the iteration does not settle.
fn settle_insulation_laws<S>(
    start_w_per_m_k: Vec<f64>,
    mut pass: impl FnMut(&[f64]) -> Result<(S, Vec<f64>), String>,
) -> Result<Option<(S, Vec<f64>)>, String> {
    let mut lambda = start_w_per_m_k;
    for _ in 0..INSULATION_LAW_PASSES {
        let (state, next) = pass(&lambda)?;
        let change = lambda
            .iter()
            .zip(&next)
            .map(|(now, then)| (then - now).abs())
            .fold(0.0, f64::max);
        if change < INSULATION_LAW_TOLERANCE_W_PER_M_K {
            return Ok(Some((state, next)));
        }
        lambda = next;
    }
    Ok(None)
}

/// [`solve_pipes`] with a temperature-dependent insulation (EN 253 practice: λ at the layer's
/// mean temperature): `insulation[i] = Some((layer, law))` makes layer `layer` of pipe `i` follow
/// `law` at its mean temperature ([`super::wall::insulation_mean_temperature_c`] of the layer's
/// faces from [`face_temperatures_c`], °C). Fixed-point iteration from λ at the law's reference
/// temperature until λ changes by < 1e-9 W/(m K) (at most 100 passes). Returns the states (heat
/// rates W/m, fluid temperatures °C) and the converged conductivities, W/(m K) (`None` where no
/// law was given).
pub fn solve_pipes_with_insulation_laws(
    pipes: &[PipeSection],
    insulation: &[Option<(usize, LinearConductivity)>],
    drives: &[Drive],
    undisturbed_c: &[f64],
    soil: &Soil,
    form: GroundForm,
) -> Result<(Vec<PipeState>, Vec<Option<f64>>), String> {
    if insulation.len() != pipes.len() {
        return Err("give one insulation entry (or none) per pipe".into());
    }
    // (pipe, layer, law) of every insulation with a law.
    let with_law: Vec<(usize, usize, LinearConductivity)> = insulation
        .iter()
        .enumerate()
        .filter_map(|(i, entry)| entry.map(|(layer, law)| (i, layer, law)))
        .collect();
    if let Some((_, layer, _)) = with_law
        .iter()
        .find(|(i, layer, _)| *layer >= pipes[*i].layers.len())
    {
        return Err(format!(
            "the insulation layer index {layer} is beyond the pipe's layers"
        ));
    }
    let start = with_law
        .iter()
        .map(|(_, _, law)| law.at(law.reference_c))
        .collect::<Result<Vec<_>, _>>()?;
    let mut current: Vec<PipeSection> = pipes.to_vec();
    let settled = settle_insulation_laws(start, |lambda| {
        for (&(i, layer, _), &l) in with_law.iter().zip(lambda) {
            current[i].layers[layer].conductivity_w_per_m_k = l;
        }
        let states = solve_pipes(&current, drives, undisturbed_c, soil, form)?;
        let next = with_law
            .iter()
            .map(|&(i, layer, law)| {
                let pipe = &current[i];
                let faces = face_temperatures_c(
                    states[i].fluid_c,
                    states[i].heat_w_per_m,
                    pipe.inner_radius_m()?,
                    &pipe.layers,
                )?;
                law.at(super::wall::insulation_mean_temperature_c(
                    faces[layer],
                    faces[layer + 1],
                ))
            })
            .collect::<Result<Vec<_>, _>>()?;
        Ok((states, next))
    })?;
    let Some((states, lambda)) = settled else {
        return Err(
            "the temperature-dependent insulation conductivity did not settle; check the slope of the law"
                .into(),
        );
    };
    let mut lambdas = vec![None; pipes.len()];
    for (&(i, _, _), l) in with_law.iter().zip(lambda) {
        lambdas[i] = Some(l);
    }
    Ok((states, lambdas))
}

/// A twin pipe whose insulation follows an EN 253 law, settled.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct TwinUnderLaw {
    /// `[q_supply, q_return]`, W/m (positive into the ground).
    pub heat_w_per_m: [f64; 2],
    /// The resistances at the settled conductivity, m K/W.
    pub resistances: TwinResistances,
    /// The settled insulation conductivity, W/(m K).
    pub insulation_w_per_m_k: f64,
    /// The mean insulation temperature it belongs to, °C.
    pub insulation_mean_c: f64,
}

/// Heat rates of a twin pipe whose insulation follows an EN 253 law (EN 253 practice: the foam's
/// conductivity at its mean temperature, λ50 at 50 °C): the fixed point `λ = law(T_mean)` with
/// `T_mean` the mean ([`super::wall::insulation_mean_temperature_c`]) of the carriers' outer
/// surfaces (each fluid temperature less its carrier wall's drop `q·R_p`) and of the casing's
/// inner face (the undisturbed ground plus the total loss through casing and ground), iterated
/// as in [`solve_pipes_with_insulation_laws`] from λ at the law's reference temperature.
/// `twin.insulation_conductivity_w_per_m_k` is replaced by the law's value. Temperatures
/// `(supply, return, undisturbed ground at the casing's depth)` in °C.
pub fn twin_with_insulation_law(
    twin: &TwinPipe,
    law: &LinearConductivity,
    (supply_c, return_c, ground_c): (f64, f64, f64),
    soil: &Soil,
    form: GroundForm,
    method: TwinMethod,
) -> Result<TwinUnderLaw, String> {
    let settled = settle_insulation_laws(vec![law.at(law.reference_c)?], |lambda| {
        let pipe = TwinPipe {
            insulation_conductivity_w_per_m_k: lambda[0],
            ..*twin
        };
        let resistances = pipe.resistances(soil, form, method)?;
        let q = resistances.heat_rates_w_per_m(supply_c, return_c, ground_c)?;
        let r_p = pipe.carrier_wall_resistance_m_k_per_w;
        let carriers_c = 0.5 * ((supply_c - q[0] * r_p) + (return_c - q[1] * r_p));
        let casing_inner_c =
            ground_c + (q[0] + q[1]) * (resistances.casing_m_k_per_w + resistances.ground_m_k_per_w);
        let mean_c = super::wall::insulation_mean_temperature_c(carriers_c, casing_inner_c);
        Ok(((q, resistances, mean_c), vec![law.at(mean_c)?]))
    })?;
    let Some(((heat_w_per_m, resistances, insulation_mean_c), lambda)) = settled else {
        return Err("the temperature-dependent insulation conductivity of the twin pipe did not settle; check the slope of its law".into());
    };
    Ok(TwinUnderLaw {
        heat_w_per_m,
        resistances,
        insulation_w_per_m_k: lambda[0],
        insulation_mean_c,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::buried_pipe::DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W;

    fn twin(insulation_w_per_m_k: f64) -> TwinPipe {
        TwinPipe {
            centre: Position::new(0.0, 0.8),
            casing_outer_radius_m: 0.14,
            casing_thickness_m: 0.004,
            casing_conductivity_w_per_m_k: 0.4,
            insulation_conductivity_w_per_m_k: insulation_w_per_m_k,
            carrier_outer_radius_m: 0.04445,
            carrier_spacing_m: 0.12,
            carrier_wall_resistance_m_k_per_w: 1e-4,
        }
    }

    #[test]
    fn a_twin_pipes_law_settles_at_its_mean_insulation_temperature() {
        // EN 253 practice (λ at the foam's mean temperature): the settled λ is the law at the mean
        // of the carriers' surfaces and the casing's inner face, worked out here from the
        // returned rates; with no slope the law is the constant λ50 and the plain twin results.
        let soil = Soil::new(1.5, DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W).unwrap();
        let (form, method) = (GroundForm::Exact, TwinMethod::FirstOrder);
        let temperatures = (80.0, 45.0, 8.0);
        let law = LinearConductivity::en253(0.024, 0.2, 1e-4).unwrap();
        let s = twin_with_insulation_law(&twin(0.03), &law, temperatures, &soil, form, method).unwrap();
        let [q_s, q_r] = s.heat_w_per_m;
        let carriers = 0.5 * ((80.0 - q_s * 1e-4) + (45.0 - q_r * 1e-4));
        let casing = 8.0 + (q_s + q_r) * (s.resistances.casing_m_k_per_w + s.resistances.ground_m_k_per_w);
        let mean = 0.5 * (carriers + casing);
        assert!(
            (s.insulation_mean_c - mean).abs() < 1e-6,
            "{} vs {mean}",
            s.insulation_mean_c
        );
        assert!((s.insulation_w_per_m_k - law.at(mean).unwrap()).abs() < 1e-8);
        let plain = twin(s.insulation_w_per_m_k)
            .resistances(&soil, form, method)
            .unwrap();
        let q = plain.heat_rates_w_per_m(80.0, 45.0, 8.0).unwrap();
        assert!(((q[0] + q[1]) / (q_s + q_r) - 1.0).abs() < 1e-7);

        let flat = LinearConductivity::en253(0.026, 0.0, 0.0).unwrap();
        let s = twin_with_insulation_law(&twin(0.03), &flat, temperatures, &soil, form, method).unwrap();
        let plain = twin(0.026).resistances(&soil, form, method).unwrap();
        assert_eq!(s.heat_w_per_m, plain.heat_rates_w_per_m(80.0, 45.0, 8.0).unwrap());
        assert_eq!(s.insulation_w_per_m_k, 0.026);
    }
}
