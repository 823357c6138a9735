//! `kind: heat-loss`: monthly steady heat losses of the pipes in one trench, insulation
//! sizing, and the soil temperature at neighbouring points.
//!
//! Analytic method (physics::buried_pipe): every pipe a line source with its image above the
//! surface, the surface resistance as an added depth, each pipe's wall layers as coaxial
//! cylinders; each month a steady state of that month's fluid temperatures against the month's
//! undisturbed ground temperature at the pipe's depth (EN 13941-1 practice).

use crate::ground::profile::Undisturbed;
use crate::model::{HeatLoss, Method, Pipe, PipeDrive, Site};
use crate::physics::buried_pipe::seasonal::{annual_energy_kwh_per_m, monthly_pipe_states};
use crate::physics::buried_pipe::sizing::{cheapest, present_value_factor};
use crate::physics::buried_pipe::system::{Drive, PipeSection, temperature_rise_k};
use crate::physics::buried_pipe::wall::WallLayer;
use crate::physics::buried_pipe::{GroundForm, Position, Soil};
use crate::results::*;

/// Layers within twice the pipe depth whose conductivity differs from the one used by more than
/// this share trigger a caution (the analytic method sees one homogeneous soil).
const LAYER_CONTRAST: f64 = 0.2;

/// Relative difference between the methods above which a caution is raised (issue contract).
const CROSS_CHECK_CAUTION: f64 = 0.05;

/// Annual losses of one arrangement of pipes.
struct Losses {
    /// `monthly[i][m]`, W/m.
    monthly: Vec<[f64; 12]>,
    mean: Vec<f64>,
    annual_kwh: Vec<f64>,
}

impl Losses {
    fn total_mean(&self) -> f64 {
        self.mean.iter().sum()
    }
    fn total_kwh(&self) -> f64 {
        self.annual_kwh.iter().sum()
    }
}

pub fn run(
    id: &str,
    method: Method,
    study: &HeatLoss,
    site: &Site,
    ground: &Undisturbed,
) -> Result<(HeatLossResult, Vec<Warning>), String> {
    let mut warnings = Vec::new();
    let mean_depth = study.pipes.iter().map(|p| p.depth_m).sum::<f64>() / study.pipes.len() as f64;
    let k = site.ground.layer_at(mean_depth).conductivity_w_m_k;
    if let Some(w) = layered_ground_caution(id, study, site, k) {
        warnings.push(w);
    }
    let soil = Soil::new(k, study.surface_resistance_m2_k_w)?;
    let ground_c: Vec<[f64; 12]> = study
        .pipes
        .iter()
        .map(|p| ground.monthly_mean_at(p.depth_m))
        .collect();
    let losses = losses(&study.pipes, &ground_c, &soil).map_err(|e| format!("study {id}: {e}"))?;

    let pipes: Vec<PipeLoss> = study
        .pipes
        .iter()
        .enumerate()
        .map(|(i, p)| {
            let fluid = fluid_monthly(p);
            let mean_fluid = fluid.iter().sum::<f64>() / 12.0;
            let mean_ground = ground_c[i].iter().sum::<f64>() / 12.0;
            PipeLoss {
                id: p.id.clone(),
                heat_loss_w_per_m: losses.mean[i],
                annual_heat_loss_kwh_per_m: losses.annual_kwh[i],
                u_w_per_m_k: losses.mean[i] / (mean_fluid - mean_ground),
                monthly_heat_loss_w_per_m: losses.monthly[i].to_vec(),
                monthly_fluid_temperature_c: fluid.to_vec(),
            }
        })
        .collect();

    let neighbours = neighbours(id, study, ground, &losses, &soil, &mut warnings)?;
    let sizing = match &study.sizing {
        Some(s) => Some(sizing(id, study, s, &ground_c, &soil, &mut warnings)?),
        None => None,
    };
    let field = field(study, ground, &losses, &soil);
    let cross_check = match method {
        Method::Both => {
            let c = numerical_cross_check(study, site, &losses).map_err(|e| format!("study {id}: {e}"))?;
            if c.max_relative_difference > CROSS_CHECK_CAUTION {
                warnings.push(Warning {
                    study: Some(id.to_string()),
                    level: Level::Caution,
                    code: "heat_loss.methods_differ".into(),
                    message: format!(
                        "the analytic and numerical heat losses differ by {:.1} % (more than {:.0} %); layered soil or closely spaced pipes make the analytic method less exact — prefer the numerical figures",
                        c.max_relative_difference * 100.0,
                        CROSS_CHECK_CAUTION * 100.0
                    ),
                });
            }
            Some(c)
        }
        _ => None,
    };
    Ok((
        HeatLossResult {
            total_heat_loss_w_per_m: losses.total_mean(),
            annual_heat_loss_mwh: losses.total_kwh() * study.length_m / 1000.0,
            length_m: study.length_m,
            soil_conductivity_w_m_k: k,
            surface_resistance_m2_k_per_w: study.surface_resistance_m2_k_w,
            monthly_ground_temperature_c: ground.monthly_mean_at(mean_depth).to_vec(),
            pipes,
            sizing,
            neighbours,
            cross_check,
            field: Some(field),
        },
        warnings,
    ))
}

/// The physics view of a model pipe.
fn section(p: &Pipe) -> PipeSection {
    PipeSection {
        centre: Position::new(p.x_m, p.depth_m),
        outer_radius_m: p.outer_radius_m(),
        layers: p
            .layers
            .iter()
            .map(|l| WallLayer::new(l.thickness_m, l.conductivity_w_m_k))
            .collect(),
    }
}

fn drives(p: &Pipe) -> [Drive; 12] {
    match &p.drive {
        PipeDrive::FluidTemperature { monthly_c } => monthly_c.map(Drive::FluidC),
        PipeDrive::HeatToGround { w_per_m } => [Drive::HeatWPerM(*w_per_m); 12],
    }
}

fn fluid_monthly(p: &Pipe) -> [f64; 12] {
    match &p.drive {
        PipeDrive::FluidTemperature { monthly_c } => *monthly_c,
        PipeDrive::HeatToGround { .. } => [f64::NAN; 12],
    }
}

fn losses(pipes: &[Pipe], ground_c: &[[f64; 12]], soil: &Soil) -> Result<Losses, String> {
    let sections: Vec<PipeSection> = pipes.iter().map(section).collect();
    let drives: Vec<[Drive; 12]> = pipes.iter().map(drives).collect();
    let states = monthly_pipe_states(&sections, &drives, ground_c, soil, GroundForm::Exact)?;
    let monthly: Vec<[f64; 12]> = states.iter().map(|s| s.map(|st| st.heat_w_per_m)).collect();
    let mean = monthly.iter().map(|m| m.iter().sum::<f64>() / 12.0).collect();
    let annual_kwh = monthly
        .iter()
        .map(annual_energy_kwh_per_m)
        .collect::<Result<_, _>>()?;
    Ok(Losses {
        monthly,
        mean,
        annual_kwh,
    })
}

fn layered_ground_caution(id: &str, study: &HeatLoss, site: &Site, k: f64) -> Option<Warning> {
    let deepest = study.pipes.iter().map(|p| p.depth_m).fold(0.0, f64::max);
    let tops = site.ground.layer_tops_m();
    let differing: Vec<String> = site
        .ground
        .layers
        .iter()
        .zip(&tops)
        .filter(|(l, top)| **top < 2.0 * deepest && (l.conductivity_w_m_k - k).abs() > LAYER_CONTRAST * k)
        .map(|(l, _)| format!("{} ({:.2} W/(m K))", l.name, l.conductivity_w_m_k))
        .collect();
    (!differing.is_empty()).then(|| Warning {
        study: Some(id.to_string()),
        level: Level::Caution,
        code: "heat_loss.layered_ground".into(),
        message: format!(
            "the analytic method uses one soil of {k:.2} W/(m K) (the layer at the pipes), but within twice the pipe depth {} differ by more than {:.0} %; the numerical method resolves the layers",
            differing.join(", "),
            LAYER_CONTRAST * 100.0
        ),
    })
}

fn neighbours(
    id: &str,
    study: &HeatLoss,
    ground: &Undisturbed,
    losses: &Losses,
    soil: &Soil,
    warnings: &mut Vec<Warning>,
) -> Result<Vec<NeighbourResult>, String> {
    let sources: Vec<Position> = study
        .pipes
        .iter()
        .map(|p| Position::new(p.x_m, p.depth_m))
        .collect();
    let radii: Vec<f64> = study.pipes.iter().map(Pipe::outer_radius_m).collect();
    let mut out = Vec::new();
    for n in &study.neighbours {
        let undisturbed = ground.monthly_mean_at(n.depth_m);
        let mut best = (f64::NEG_INFINITY, 0);
        for (m, t_g) in undisturbed.iter().enumerate() {
            let q: Vec<f64> = losses.monthly.iter().map(|x| x[m]).collect();
            let t = t_g + temperature_rise_k(Position::new(n.x_m, n.depth_m), &sources, &radii, &q, soil)?;
            if t > best.0 {
                best = (t, m + 1);
            }
        }
        let exceeds = n.limit_c.is_some_and(|l| best.0 > l);
        if let (true, Some(limit)) = (exceeds, n.limit_c) {
            warnings.push(Warning {
                study: Some(id.to_string()),
                level: Level::Caution,
                code: "heat_loss.neighbour_limit".into(),
                message: format!(
                    "the soil at `{}` reaches {:.1} °C (month {}), above its limit of {limit:.1} °C; move the pipes or the neighbour apart, insulate more or lay the pipes deeper",
                    n.id, best.0, best.1
                ),
            });
        }
        out.push(NeighbourResult {
            id: n.id.clone(),
            x_m: n.x_m,
            depth_m: n.depth_m,
            max_temperature_c: best.0,
            month_of_max: best.1,
            limit_c: n.limit_c,
            exceeds_limit: exceeds,
        });
    }
    Ok(out)
}

fn sizing(
    id: &str,
    study: &HeatLoss,
    s: &crate::model::Sizing,
    ground_c: &[[f64; 12]],
    soil: &Soil,
    warnings: &mut Vec<Warning>,
) -> Result<SizingResult, String> {
    let pv = match &s.economic {
        Some(e) => Some(present_value_factor(e.discount_rate, e.years)?),
        None => None,
    };
    let mut candidates = Vec::new();
    for (c, &t) in s.thicknesses_m.iter().enumerate() {
        let pipes = with_layer_thickness(&study.pipes, &s.layer, t);
        let l = losses(&pipes, ground_c, soil)
            .map_err(|e| format!("study {id}: with {} mm of {}: {e}", t * 1000.0, s.layer))?;
        let total = l.total_mean();
        let cost = match (&s.economic, pv) {
            (Some(e), Some(pv)) => {
                Some(pv * l.total_kwh() / 1000.0 * e.heat_price_per_mwh + e.cost_per_metre[c])
            }
            _ => None,
        };
        candidates.push(Candidate {
            insulation_thickness_m: t,
            heat_loss_w_per_m: total,
            annual_heat_loss_kwh_per_m: l.total_kwh(),
            outer_diameters_m: pipes.iter().map(|p| p.outer_diameter_m).collect(),
            meets_limit: s.heat_loss_limit_w_per_m.map(|lim| total <= lim),
            life_cycle_cost_per_m: cost,
        });
    }
    let chosen = candidates
        .iter()
        .filter(|c| c.meets_limit == Some(true))
        .map(|c| c.insulation_thickness_m)
        .fold(None, |a: Option<f64>, t| Some(a.map_or(t, |a| a.min(t))));
    if let (Some(limit), None) = (s.heat_loss_limit_w_per_m, chosen) {
        warnings.push(Warning {
            study: Some(id.to_string()),
            level: Level::Caution,
            code: "heat_loss.limit_not_met".into(),
            message: format!(
                "no candidate thickness of `{}` keeps the trench loss below {limit:.1} W/m; try thicker insulation, a better insulation class or a twin pipe",
                s.layer
            ),
        });
    }
    let costs: Vec<f64> = candidates
        .iter()
        .filter_map(|c| c.life_cycle_cost_per_m)
        .collect();
    let cheapest_t = (costs.len() == candidates.len())
        .then(|| cheapest(&costs))
        .flatten()
        .map(|i| candidates[i].insulation_thickness_m);
    Ok(SizingResult {
        layer: s.layer.clone(),
        chosen_insulation_thickness_m: chosen,
        heat_loss_limit_w_per_m: s.heat_loss_limit_w_per_m,
        cheapest_insulation_thickness_m: cheapest_t,
        candidates,
    })
}

/// The pipes with their layer `name` at thickness `t`. The outer diameters follow; the pipes
/// keep their depths and the clear horizontal gaps between neighbours (the trench widens about
/// its centre, as when a thicker insulation series is laid with the same clearances).
fn with_layer_thickness(pipes: &[Pipe], name: &str, t: f64) -> Vec<Pipe> {
    let mut out: Vec<Pipe> = pipes.to_vec();
    for q in &mut out {
        for l in q.layers.iter_mut().filter(|l| l.name == name) {
            q.outer_diameter_m += 2.0 * (t - l.thickness_m);
            l.thickness_m = t;
        }
    }
    let mut order: Vec<usize> = (0..pipes.len()).collect();
    order.sort_by(|&a, &b| pipes[a].x_m.total_cmp(&pipes[b].x_m));
    let mut x = vec![0.0; pipes.len()];
    for w in order.windows(2) {
        let (a, b) = (w[0], w[1]);
        let gap = pipes[b].x_m - pipes[a].x_m - pipes[a].outer_radius_m() - pipes[b].outer_radius_m();
        x[b] = x[a] + out[a].outer_radius_m() + gap.max(0.0) + out[b].outer_radius_m();
    }
    let shift = (pipes.iter().map(|p| p.x_m).sum::<f64>() - x.iter().sum::<f64>()) / pipes.len() as f64;
    for (q, x) in out.iter_mut().zip(x) {
        q.x_m = x + shift;
    }
    out
}

/// The soil temperature in the month of the largest total loss (line sources with images on the
/// undisturbed ground), for the report's field plot. Inside the pipes: not a number.
fn field(study: &HeatLoss, ground: &Undisturbed, losses: &Losses, soil: &Soil) -> Field {
    let month = (0..12)
        .max_by(|&a, &b| {
            let ta: f64 = losses.monthly.iter().map(|x| x[a]).sum();
            let tb: f64 = losses.monthly.iter().map(|x| x[b]).sum();
            ta.total_cmp(&tb)
        })
        .unwrap_or(0);
    let reach = study
        .pipes
        .iter()
        .map(|p| p.x_m.abs() + p.depth_m)
        .chain(study.neighbours.iter().map(|n| n.x_m.abs() + 0.5))
        .fold(1.0, f64::max);
    let deepest = study
        .pipes
        .iter()
        .map(|p| p.depth_m + p.outer_radius_m())
        .chain(study.neighbours.iter().map(|n| n.depth_m))
        .fold(0.0, f64::max);
    let (nx, nz) = (121, 61);
    let x_m: Vec<f64> = (0..nx)
        .map(|i| -reach + 2.0 * reach * i as f64 / (nx - 1) as f64)
        .collect();
    let z_m: Vec<f64> = (0..nz)
        .map(|i| 2.0 * deepest * i as f64 / (nz - 1) as f64)
        .collect();
    let sources: Vec<Position> = study
        .pipes
        .iter()
        .map(|p| Position::new(p.x_m, p.depth_m))
        .collect();
    let radii: Vec<f64> = study.pipes.iter().map(Pipe::outer_radius_m).collect();
    let q: Vec<f64> = losses.monthly.iter().map(|x| x[month]).collect();
    let t_mid = (month as f64 + 0.5) * 365.0 / 12.0 * crate::model::DAY_S;
    let values_c = z_m
        .iter()
        .map(|&z| {
            let t_g = ground.at(z, t_mid);
            x_m.iter()
                .map(|&x| {
                    temperature_rise_k(Position::new(x, z), &sources, &radii, &q, soil)
                        .map_or(f64::NAN, |rise| t_g + rise)
                })
                .collect()
        })
        .collect();
    Field {
        label: format!(
            "{} (largest loss), line sources on the undisturbed ground",
            MONTHS[month]
        ),
        x_m,
        z_m,
        values_c,
    }
}

const MONTHS: [&str; 12] = [
    "January",
    "February",
    "March",
    "April",
    "May",
    "June",
    "July",
    "August",
    "September",
    "October",
    "November",
    "December",
];

/// The engine's steady solution of the same trench under the annual-mean surface and fluid
/// temperatures, all soil layers resolved. Steady conduction is linear (without freezing), so the
/// annual mean of the monthly steady losses equals the loss under the annual-mean temperatures.
fn numerical_cross_check(study: &HeatLoss, site: &Site, losses: &Losses) -> Result<CrossCheck, String> {
    use crate::engine::section::{self, GridOptions, SectionModel};
    use crate::studies::cross_section::{annual_mean, engine_pipe, soil_layers};
    let year = crate::ground::climate::SurfaceYear::from_climate(&site.climate);
    let mean_surface = annual_mean(|t| year.surface_c(t));
    let reach = study
        .pipes
        .iter()
        .map(|p| p.x_m.abs() + p.outer_radius_m())
        .fold(0.0, f64::max);
    let deepest = study
        .pipes
        .iter()
        .map(|p| p.depth_m + p.outer_radius_m())
        .fold(0.0, f64::max);
    let width = 2.0 * (reach + 20.0 * deepest).max(20.0);
    let depth = (20.0 * deepest).max(20.0);
    let mut model = SectionModel::new(
        section::Geometry::Planar,
        width,
        depth,
        soil_layers(site)?,
        Box::new(move |_| mean_surface),
    );
    model.surface_resistance_m2_k_w = study.surface_resistance_m2_k_w;
    model.bottom_flux_w_m2 = site.ground.geothermal_flux_w_m2;
    model.pipes = study
        .pipes
        .iter()
        .map(|p| engine_pipe(p, true))
        .collect::<Result<_, _>>()?;
    let sol = section::solve_steady(&model, &GridOptions::default(), 0.0)?;
    let pipes: Vec<CrossCheckPipe> = study
        .pipes
        .iter()
        .zip(&sol.heat_rate_w_per_m)
        .map(|(p, q)| CrossCheckPipe {
            id: p.id.clone(),
            heat_loss_w_per_m: *q,
        })
        .collect();
    let max_relative_difference = pipes
        .iter()
        .zip(&losses.mean)
        .map(|(n, a)| ((n.heat_loss_w_per_m - a) / a).abs())
        .fold(0.0, f64::max);
    Ok(CrossCheck {
        method: "numerical".into(),
        pipes,
        max_relative_difference,
    })
}
