//! `kind: cross-section`: the site's ground with the study's pipes and inclusions, solved by the
//! 2-D finite-volume engine (transient over a duration, or steady).

use super::CrossSection;
use super::SectionTime;
use super::result::*;
use crate::engine::material::Material;
use crate::engine::section::{
    self, GridOptions, Inclusion, Initial, SectionModel, TimeFunction, TransientOptions,
};
use crate::ground::climate::SurfaceYear;
use crate::ground::profile::Undisturbed;
use crate::kinds::engine_model::{annual_mean, engine_pipe, sample, soil_layers};
use crate::model::{DAY_S, Site};
use crate::results::*;

/// Largest ratio of neighbouring cells of the grid.
const GROWTH_RATIO: f64 = 1.15;
/// A frost depth within the lowest 5 % of the section is taken as the section's bottom.
const BOTTOM_SHARE: f64 = 0.95;
/// Most records kept of a series for the report and CSV (longer runs are thinned evenly).
const MAX_RECORDS: usize = 3000;
/// Heat-flux arrows across the width of a field plot.
const ARROW_COLUMNS: usize = 24;

pub fn run(
    id: &str,
    s: &CrossSection,
    site: &Site,
    ground: &Undisturbed,
) -> Result<(CrossSectionResult, Vec<Warning>), String> {
    let surface = SurfaceYear::from_climate(&site.climate);
    let steady = matches!(s.time, SectionTime::Steady);
    let model = model(s, site, &surface, steady).map_err(|e| format!("study {id}: {e}"))?;
    let grid = GridOptions {
        surface_cell_m: s.cell_min_m,
        min_cell_m: s.cell_min_m,
        max_cell_m: s.cell_max_m,
        growth_ratio: GROWTH_RATIO,
        cells_across_pipe: 10,
    };
    let mut result = match s.time {
        SectionTime::Steady => steady_result(s, &model, &grid)?,
        SectionTime::Transient { duration_s, step_s } => {
            transient_result(s, site, ground, &model, grid, duration_s, step_s)?
        }
    };
    let mut warnings = Vec::new();
    // Frost at the bottom of the section is the model's boundary, not a depth of the ground.
    let bottom = BOTTOM_SHARE * s.depth_m;
    if result.max_frost_depth_m.is_some_and(|d| d >= bottom) {
        warnings.push(Warning {
            study: Some(id.to_string()),
            level: Level::Caution,
            code: "cross_section.domain_too_shallow".into(),
            message: format!(
                "the frost reaches the bottom of the {:.1} m deep section, so the section is too shallow to give a frost depth; make `domain.depth` larger",
                s.depth_m
            ),
        });
        result.max_frost_depth_m = None;
        if result.final_frost_depth_m.is_some_and(|d| d >= bottom) {
            result.final_frost_depth_m = None;
        }
    }
    if result.energy_balance_relative_error > 1e-4 {
        warnings.push(Warning {
            study: Some(id.to_string()),
            level: Level::Caution,
            code: "cross_section.energy_balance".into(),
            message: format!(
                "the energy balance closes only to {:.1e} of the heat throughput; refine the grid or the step",
                result.energy_balance_relative_error
            ),
        });
    }
    Ok((result, warnings))
}

fn model(s: &CrossSection, site: &Site, surface: &SurfaceYear, steady: bool) -> Result<SectionModel, String> {
    let layers = soil_layers(site)?;
    let surface_c: TimeFunction = if steady {
        let mean = annual_mean(|t| surface.surface_c(t));
        Box::new(move |_| mean)
    } else {
        let year = surface.clone();
        Box::new(move |t| year.surface_c(t))
    };
    let mut m = SectionModel::new(section::Geometry::Planar, s.width_m, s.depth_m, layers, surface_c);
    m.surface_resistance_m2_k_per_w = s.surface_resistance_m2_k_per_w;
    m.bottom_flux_w_per_m2 = site.ground.geothermal_flux_w_per_m2;
    m.inclusions = s
        .inclusions
        .iter()
        .map(|b| {
            Ok(Inclusion {
                x_min_m: b.x_m - b.width_m / 2.0,
                x_max_m: b.x_m + b.width_m / 2.0,
                z_min_m: b.depth_m,
                z_max_m: b.depth_m + b.height_m,
                material: Material::dry(b.conductivity_w_per_m_k, b.heat_capacity_j_per_m3_k)?,
            })
        })
        .collect::<Result<_, String>>()?;
    m.pipes = s
        .pipes
        .iter()
        .map(|p| engine_pipe(p, steady))
        .collect::<Result<_, String>>()?;
    Ok(m)
}

fn steady_result(
    s: &CrossSection,
    model: &SectionModel,
    grid: &GridOptions,
) -> Result<CrossSectionResult, String> {
    let sol = section::solve_steady(model, grid, 0.0)?;
    let field = snapshot_field(&sol.field, "steady state");
    let probes = s
        .probes
        .iter()
        .map(|p| {
            let t = sample(&sol.field, p.x_m, p.depth_m);
            ProbeFigures {
                id: p.id.clone(),
                min_c: t,
                max_c: t,
                final_c: t,
            }
        })
        .collect();
    Ok(CrossSectionResult {
        cells: sol.cells,
        pipes: s
            .pipes
            .iter()
            .zip(&sol.heat_rate_w_per_m)
            .map(|(p, q)| SectionPipeFigures {
                id: p.id.clone(),
                mean_heat_rate_w_per_m: *q,
                final_heat_rate_w_per_m: *q,
            })
            .collect(),
        probes,
        max_frost_depth_m: None,
        final_frost_depth_m: None,
        max_front_depth_m: None,
        final_front_depth_m: None,
        energy_balance_relative_error: sol.energy_balance_relative_error,
        steady: true,
        series: SectionSeries::default(),
        fields: vec![field],
        flux: vec![flux_arrows(&sol.field, ARROW_COLUMNS)],
    })
}

#[allow(clippy::too_many_arguments)]
fn transient_result(
    s: &CrossSection,
    site: &Site,
    ground: &Undisturbed,
    model: &SectionModel,
    grid: GridOptions,
    duration_s: f64,
    step_s: f64,
) -> Result<CrossSectionResult, String> {
    let steps = (duration_s / step_s).round().max(1.0) as usize;
    let initial = match site.ground.initial_temperature_c {
        Some(t) => Initial::Uniform(t),
        None => {
            let g = ground.clone();
            Initial::Field(Box::new(move |_x, z| g.at(z, 0.0)))
        }
    };
    let mut opts = TransientOptions::new(step_s, steps, initial);
    opts.grid = grid;
    opts.probes = s.probes.iter().map(|p| (p.x_m, p.depth_m)).collect();
    opts.snapshot_times_s = s.snapshots_s.clone();
    let sol = section::solve_transient(model, &opts)?;
    let mean = |v: &[f64]| {
        if v.is_empty() {
            f64::NAN
        } else {
            v.iter().sum::<f64>() / v.len() as f64
        }
    };
    let last = |v: &[f64]| v.last().copied().unwrap_or(f64::NAN);
    let stride = sol.times_s.len().div_ceil(MAX_RECORDS).max(1);
    let thin = |v: &[f64]| v.iter().step_by(stride).copied().collect::<Vec<f64>>();
    let fields = sol
        .snapshots
        .iter()
        .map(|snap| snapshot_field(snap, &format!("day {:.0}", snap.time_s / DAY_S)))
        .collect();
    let flux = sol
        .snapshots
        .iter()
        .map(|snap| flux_arrows(snap, ARROW_COLUMNS))
        .collect();
    Ok(CrossSectionResult {
        cells: sol.cells,
        pipes: s
            .pipes
            .iter()
            .zip(&sol.pipes)
            .map(|(p, ps)| SectionPipeFigures {
                id: p.id.clone(),
                mean_heat_rate_w_per_m: mean(&ps.heat_rate_w_per_m),
                final_heat_rate_w_per_m: last(&ps.heat_rate_w_per_m),
            })
            .collect(),
        probes: s
            .probes
            .iter()
            .zip(&sol.probes_c)
            .map(|(p, v)| ProbeFigures {
                id: p.id.clone(),
                min_c: v.iter().cloned().fold(f64::INFINITY, f64::min),
                max_c: v.iter().cloned().fold(f64::NEG_INFINITY, f64::max),
                final_c: last(v),
            })
            .collect(),
        max_frost_depth_m: Some(sol.frost_depth_m.iter().cloned().fold(0.0, f64::max)),
        final_frost_depth_m: Some(last(&sol.frost_depth_m)),
        max_front_depth_m: Some(sol.front_depth_m.iter().cloned().fold(0.0, f64::max)),
        final_front_depth_m: Some(last(&sol.front_depth_m)),
        energy_balance_relative_error: sol.energy_balance_relative_error,
        steady: false,
        series: SectionSeries {
            times_d: thin(&sol.times_s).iter().map(|t| t / DAY_S).collect(),
            pipe_heat_w_per_m: sol.pipes.iter().map(|p| thin(&p.heat_rate_w_per_m)).collect(),
            probes_c: sol.probes_c.iter().map(|p| thin(p)).collect(),
            frost_depth_m: thin(&sol.frost_depth_m),
            pipe_ids: s.pipes.iter().map(|p| p.id.clone()).collect(),
            probe_ids: s.probes.iter().map(|p| p.id.clone()).collect(),
        },
        fields,
        flux,
    })
}

fn snapshot_field(snap: &section::Snapshot, label: &str) -> Field {
    let nx = snap.x_m.len();
    Field {
        label: label.to_string(),
        x_m: snap.x_m.clone(),
        z_m: snap.z_m.clone(),
        values_c: snap.t_c.chunks(nx).map(<[f64]>::to_vec).collect(),
    }
}

/// The snapshot's heat flux on a sparse grid: `columns` points evenly across the width and
/// rows at the same spacing down the depth (cell centres nearest to each point, so every arrow
/// is a value the engine computed); points inside a pipe are left out.
pub fn flux_arrows(snap: &section::Snapshot, columns: usize) -> FluxArrows {
    let mut arrows = FluxArrows::default();
    let (nx, x, z) = (snap.x_m.len(), &snap.x_m, &snap.z_m);
    let (Some(&x0), Some(&x1), Some(&z1)) = (x.first(), x.last(), z.last()) else {
        return arrows;
    };
    // The domain spans the outer faces; the centres are close enough for spacing.
    let spacing = (x1 - x0) / columns.max(1) as f64;
    if spacing.is_nan() || spacing <= 0.0 {
        return arrows;
    }
    let nearest = |axis: &[f64], v: f64| {
        let i = axis.partition_point(|a| *a < v).min(axis.len() - 1);
        if i > 0 && v - axis[i - 1] < axis[i] - v {
            i - 1
        } else {
            i
        }
    };
    let rows = ((z1 / spacing).floor() as usize).max(1);
    for row in 0..rows {
        let depth = (row as f64 + 0.5) * spacing;
        for col in 0..columns {
            let across = x0 + (col as f64 + 0.5) * spacing;
            let c = nearest(z, depth) * nx + nearest(x, across);
            let (qx, qz) = (snap.q_x_w_per_m2[c], snap.q_z_w_per_m2[c]);
            if qx.is_finite() && qz.is_finite() {
                arrows.x_m.push(x[c % nx]);
                arrows.z_m.push(z[c / nx]);
                arrows.qx_w_per_m2.push(qx);
                arrows.qz_w_per_m2.push(qz);
            }
        }
    }
    arrows
}
