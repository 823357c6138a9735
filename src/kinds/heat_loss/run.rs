//! `kind: heat-loss`: monthly steady heat losses of the pipes in one trench, insulation
//! sizing, and the soil temperature at neighbouring points.
//!
//! Analytic method (physics::buried_pipe): every pipe a line source with its image above the
//! surface, the surface resistance as an added depth, each pipe's wall layers as coaxial
//! cylinders; each month a steady state of that month's fluid temperatures against the month's
//! undisturbed ground temperature at the pipe's depth (EN 13941-1 practice).

use super::HeatLoss;
use super::TwinCasing;
use super::numerical::{self, Responses, TwinBody};
use super::result::*;
use crate::ground::profile::Undisturbed;
use crate::model::{InsulationLaw, Method, Pipe, PipeDrive, Site};
use crate::numerics::time::MONTH_S;
use crate::physics::buried_pipe::seasonal::{annual_energy_kwh_per_m, monthly_pipe_states};
use crate::physics::buried_pipe::sizing::{cheapest, present_value_factor};
use crate::physics::buried_pipe::system::{
    Drive, PipeSection, solve_pipes_with_insulation_laws, temperature_rise_k, twin_with_insulation_law,
};
use crate::physics::buried_pipe::twin::{TwinMethod, TwinPipe, TwinResistances};
use crate::physics::buried_pipe::wall::{
    LinearConductivity, WallLayer, insulation_mean_temperature_c, wall_resistance_m_k_per_w,
};
use crate::physics::buried_pipe::{GroundForm, Position, Soil};
use crate::results::*;
use rayon::prelude::*;

/// Layers within twice the pipe depth whose conductivity differs from the one used by more than
/// this share trigger a caution (the analytic method sees one homogeneous soil).
pub const LAYER_CONTRAST: f64 = 0.2;

/// Relative difference between the methods above which a caution is raised (issue contract).
pub const CROSS_CHECK_CAUTION: f64 = 0.05;

/// The converged insulation of one pipe (or of the twin) under an EN 253 law, per month.
#[derive(Clone, Copy, Debug)]
struct Insulation {
    lambda_w_per_m_k: [f64; 12],
    mean_c: [f64; 12],
}

impl Insulation {
    fn mean_lambda(&self) -> f64 {
        self.lambda_w_per_m_k.iter().sum::<f64>() / 12.0
    }
    fn mean_temperature_c(&self) -> f64 {
        self.mean_c.iter().sum::<f64>() / 12.0
    }
}

/// A twin pipe's analytic figures.
struct TwinLosses {
    /// Resistances at the annual-mean insulation conductivity.
    resistances: TwinResistances,
    insulation_w_per_m_k: f64,
    insulation: Option<Insulation>,
}

/// Annual losses of one arrangement of pipes.
struct Losses {
    /// `monthly[i][m]`, W/m.
    monthly: Vec<[f64; 12]>,
    mean: Vec<f64>,
    annual_kwh: Vec<f64>,
    /// Per pipe, with an EN 253 law on one of its layers.
    insulation: Vec<Option<Insulation>>,
    twin: Option<TwinLosses>,
}

impl Losses {
    fn total_mean(&self) -> f64 {
        self.mean.iter().sum()
    }
    fn total_kwh(&self) -> f64 {
        self.annual_kwh.iter().sum()
    }
    fn from_monthly(
        monthly: Vec<[f64; 12]>,
        insulation: Vec<Option<Insulation>>,
        twin: Option<TwinLosses>,
    ) -> Result<Self, String> {
        let mean = monthly.iter().map(|m| m.iter().sum::<f64>() / 12.0).collect();
        let annual_kwh = monthly
            .iter()
            .map(annual_energy_kwh_per_m)
            .collect::<Result<_, _>>()?;
        Ok(Self {
            monthly,
            mean,
            annual_kwh,
            insulation,
            twin,
        })
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
    let k = site.ground.layer_at(mean_depth).conductivity_w_per_m_k;
    if let Some(w) = layered_ground_caution(id, study, site, k) {
        warnings.push(w);
    }
    let soil = Soil::new(k, study.surface_resistance_m2_k_per_w)?;
    let ground_c: Vec<[f64; 12]> = study
        .pipes
        .iter()
        .map(|p| ground.monthly_mean_at(p.depth_m))
        .collect();
    let losses = analytic(study, &ground_c, &soil).map_err(|e| format!("study {id}: {e}"))?;

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
                insulation_conductivity_w_per_m_k: losses.insulation[i].map(|x| x.mean_lambda()),
                insulation_mean_temperature_c: losses.insulation[i].map(|x| x.mean_temperature_c()),
            }
        })
        .collect();

    let mut neighbours = neighbours(id, study, ground, &losses, &soil, &mut warnings)?;
    let both = matches!(method, Method::Both);
    let sizing = match &study.sizing {
        Some(s) => Some(sizing(id, study, s, site, &ground_c, &soil, both, &mut warnings)?),
        None => None,
    };
    let field = field(study, ground, &losses, &soil);
    let cross_check = if both {
        let (c, numerical_max) = numerical_cross_check(study, site, ground, &ground_c, &losses)
            .map_err(|e| format!("study {id}: {e}"))?;
        for (n, t) in neighbours.iter_mut().zip(numerical_max) {
            n.numerical_max_temperature_c = Some(t);
        }
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
        Some(Box::new(c))
    } else {
        None
    };
    let twin = study.twin.as_ref().zip(losses.twin.as_ref()).map(|(t, tl)| {
        let q_s = losses.mean[0];
        let q_r = losses.mean[1];
        Box::new(TwinResult {
            id: t.id.clone(),
            casing_outer_diameter_m: t.outer_diameter_m,
            carrier_spacing_m: t.carrier_spacing_m,
            insulation_conductivity_w_per_m_k: tl.insulation_w_per_m_k,
            insulation_mean_temperature_c: tl.insulation.map(|x| x.mean_temperature_c()),
            symmetric_resistance_m_k_per_w: tl.resistances.symmetric_m_k_per_w(),
            antisymmetric_resistance_m_k_per_w: tl.resistances.antisymmetric_m_k_per_w,
            h_s: tl.resistances.h_s(),
            h_a: tl.resistances.h_a(),
            symmetric_heat_loss_w_per_m: q_s + q_r,
            antisymmetric_heat_flow_w_per_m: 0.5 * (q_s - q_r),
            total_heat_loss_w_per_m: losses.total_mean(),
            annual_heat_loss_kwh_per_m: losses.total_kwh(),
        })
    });
    Ok((
        HeatLossResult {
            total_heat_loss_w_per_m: losses.total_mean(),
            annual_heat_loss_mwh: losses.total_kwh() * study.length_m / 1000.0,
            length_m: study.length_m,
            soil_conductivity_w_per_m_k: k,
            surface_resistance_m2_k_per_w: study.surface_resistance_m2_k_per_w,
            monthly_ground_temperature_c: ground.monthly_mean_at(mean_depth).to_vec(),
            pipes,
            sizing,
            neighbours,
            cross_check,
            twin,
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
            .map(|l| WallLayer::new(l.thickness_m, l.conductivity_w_per_m_k))
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

/// The EN 253 law of the site file ([`LinearConductivity::en253`]).
fn linear_law(law: &InsulationLaw) -> Result<LinearConductivity, String> {
    LinearConductivity::en253(law.lambda_50_w_per_m_k, law.ageing, law.slope_w_per_m_k2)
}

/// The analytic monthly losses of the study's pipes, or of its twin pipe.
fn analytic(study: &HeatLoss, ground_c: &[[f64; 12]], soil: &Soil) -> Result<Losses, String> {
    match &study.twin {
        Some(t) => twin_losses(t, &study.pipes, &ground_c[0], soil),
        None => pipe_losses(&study.pipes, ground_c, soil),
    }
}

fn pipe_losses(pipes: &[Pipe], ground_c: &[[f64; 12]], soil: &Soil) -> Result<Losses, String> {
    let sections: Vec<PipeSection> = pipes.iter().map(section).collect();
    let drives: Vec<[Drive; 12]> = pipes.iter().map(drives).collect();
    let mut laws = Vec::with_capacity(pipes.len());
    for p in pipes {
        let mut with_law = p
            .layers
            .iter()
            .enumerate()
            .filter_map(|(i, l)| l.insulation_law.map(|w| (i, w)));
        let first = with_law.next();
        if with_law.next().is_some() {
            return Err(format!(
                "pipe `{}` has more than one layer with a λ50 law; give the law on its insulation layer only",
                p.id
            ));
        }
        laws.push(match first {
            Some((i, law)) => Some((i, linear_law(&law)?)),
            None => None,
        });
    }
    if laws.iter().all(Option::is_none) {
        let states = monthly_pipe_states(&sections, &drives, ground_c, soil, GroundForm::Exact)?;
        let monthly = states.iter().map(|s| s.map(|st| st.heat_w_per_m)).collect();
        return Losses::from_monthly(monthly, vec![None; pipes.len()], None);
    }
    let mut monthly = vec![[0.0; 12]; pipes.len()];
    let mut insulation: Vec<Option<Insulation>> = laws
        .iter()
        .map(|l| {
            l.map(|_| Insulation {
                lambda_w_per_m_k: [0.0; 12],
                mean_c: [0.0; 12],
            })
        })
        .collect();
    for m in 0..12 {
        let d: Vec<Drive> = drives.iter().map(|x| x[m]).collect();
        let g: Vec<f64> = ground_c.iter().map(|x| x[m]).collect();
        let (states, lambdas) =
            solve_pipes_with_insulation_laws(&sections, &laws, &d, &g, soil, GroundForm::Exact)?;
        for (i, s) in states.iter().enumerate() {
            monthly[i][m] = s.heat_w_per_m;
            if let (Some(ins), Some(lambda), Some((layer, _))) = (&mut insulation[i], lambdas[i], laws[i]) {
                let mut sec = sections[i].clone();
                sec.layers[layer].conductivity_w_per_m_k = lambda;
                let faces = crate::physics::buried_pipe::wall::face_temperatures_c(
                    s.fluid_c,
                    s.heat_w_per_m,
                    sec.inner_radius_m()?,
                    &sec.layers,
                )?;
                ins.lambda_w_per_m_k[m] = lambda;
                ins.mean_c[m] = insulation_mean_temperature_c(faces[layer], faces[layer + 1]);
            }
        }
    }
    Losses::from_monthly(monthly, insulation, None)
}

/// The physics twin pipe of the study's casing and carriers, with insulation conductivity
/// `insulation_w_per_m_k`.
fn twin_pipe(t: &TwinCasing, carrier: &Pipe, insulation_w_per_m_k: f64) -> Result<TwinPipe, String> {
    let layers: Vec<WallLayer> = carrier
        .layers
        .iter()
        .map(|l| WallLayer::new(l.thickness_m, l.conductivity_w_per_m_k))
        .collect();
    Ok(TwinPipe {
        centre: Position::new(t.x_m, t.depth_m),
        casing_outer_radius_m: t.outer_radius_m(),
        casing_thickness_m: t.casing_thickness_m,
        casing_conductivity_w_per_m_k: t.casing_conductivity_w_per_m_k,
        insulation_conductivity_w_per_m_k: insulation_w_per_m_k,
        carrier_outer_radius_m: carrier.outer_radius_m(),
        carrier_spacing_m: t.carrier_spacing_m,
        carrier_wall_resistance_m_k_per_w: wall_resistance_m_k_per_w(carrier.inner_radius_m(), &layers)?,
    })
}

/// One month of a twin pipe: `[q_s, q_r]` (W/m), the resistances, and with a law
/// `(λ, mean insulation temperature)`.
type TwinMonth = ([f64; 2], TwinResistances, Option<(f64, f64)>);

/// One month of a twin pipe: Wallentén's first-order formulas ([`TwinMethod::FirstOrder`], the
/// EN 15698-1 form), with an EN 253 law settled by [`twin_with_insulation_law`]. Returns the
/// rates `[q_s, q_r]`, the resistances and, with a law, `(λ, mean temperature)`.
fn twin_month(
    t: &TwinCasing,
    carrier: &Pipe,
    law: Option<&LinearConductivity>,
    temperatures_c: (f64, f64, f64),
    soil: &Soil,
) -> Result<TwinMonth, String> {
    let (form, method) = (GroundForm::Exact, TwinMethod::FirstOrder);
    let pipe = twin_pipe(t, carrier, t.insulation_conductivity_w_per_m_k)?;
    match law {
        None => {
            let res = pipe.resistances(soil, form, method)?;
            let (supply_c, return_c, ground_c) = temperatures_c;
            Ok((res.heat_rates_w_per_m(supply_c, return_c, ground_c)?, res, None))
        }
        Some(law) => {
            let s = twin_with_insulation_law(&pipe, law, temperatures_c, soil, form, method)?;
            Ok((
                s.heat_w_per_m,
                s.resistances,
                Some((s.insulation_w_per_m_k, s.insulation_mean_c)),
            ))
        }
    }
}

fn twin_losses(
    t: &TwinCasing,
    carriers: &[Pipe],
    ground_c: &[f64; 12],
    soil: &Soil,
) -> Result<Losses, String> {
    let law = t.insulation_law.as_ref().map(linear_law).transpose()?;
    let (supply, ret) = (fluid_monthly(&carriers[0]), fluid_monthly(&carriers[1]));
    let mut monthly = vec![[0.0; 12]; 2];
    let mut ins = Insulation {
        lambda_w_per_m_k: [t.insulation_conductivity_w_per_m_k; 12],
        mean_c: [f64::NAN; 12],
    };
    for m in 0..12 {
        let (q, _, state) = twin_month(
            t,
            &carriers[0],
            law.as_ref(),
            (supply[m], ret[m], ground_c[m]),
            soil,
        )?;
        monthly[0][m] = q[0];
        monthly[1][m] = q[1];
        if let Some((lambda, mean_c)) = state {
            ins.lambda_w_per_m_k[m] = lambda;
            ins.mean_c[m] = mean_c;
        }
    }
    let lambda = ins.mean_lambda();
    let resistances =
        twin_pipe(t, &carriers[0], lambda)?.resistances(soil, GroundForm::Exact, TwinMethod::FirstOrder)?;
    let insulation = law.is_some().then_some(ins);
    Losses::from_monthly(
        monthly,
        vec![None; 2],
        Some(TwinLosses {
            resistances,
            insulation_w_per_m_k: lambda,
            insulation,
        }),
    )
}

/// The line sources that heat the soil, with their radii and monthly heat rates: every pipe, or
/// for a twin pipe one source at the casing's centre carrying the total (the antisymmetric part
/// circulates between the carriers inside the insulation and is neglected outside it).
fn sources(study: &HeatLoss, losses: &Losses) -> (Vec<Position>, Vec<f64>, Vec<[f64; 12]>) {
    match &study.twin {
        Some(t) => {
            let total: [f64; 12] = std::array::from_fn(|m| losses.monthly.iter().map(|x| x[m]).sum());
            (
                vec![Position::new(t.x_m, t.depth_m)],
                vec![t.outer_radius_m()],
                vec![total],
            )
        }
        None => (
            study
                .pipes
                .iter()
                .map(|p| Position::new(p.x_m, p.depth_m))
                .collect(),
            study.pipes.iter().map(Pipe::outer_radius_m).collect(),
            losses.monthly.clone(),
        ),
    }
}

fn layered_ground_caution(id: &str, study: &HeatLoss, site: &Site, k: f64) -> Option<Warning> {
    let deepest = study.pipes.iter().map(|p| p.depth_m).fold(0.0, f64::max);
    let tops = site.ground.layer_tops_m();
    let differing: Vec<String> = site
        .ground
        .layers
        .iter()
        .zip(&tops)
        .filter(|(l, top)| **top < 2.0 * deepest && (l.conductivity_w_per_m_k - k).abs() > LAYER_CONTRAST * k)
        .map(|(l, _)| format!("{} ({:.2} W/(m K))", l.name, l.conductivity_w_per_m_k))
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
    let (sources, radii, monthly) = sources(study, losses);
    let mut out = Vec::new();
    for n in &study.neighbours {
        let undisturbed = ground.monthly_mean_at(n.depth_m);
        let mut best = (f64::NEG_INFINITY, 0);
        for (m, t_g) in undisturbed.iter().enumerate() {
            let q: Vec<f64> = monthly.iter().map(|x| x[m]).collect();
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
            numerical_max_temperature_c: None,
        });
    }
    Ok(out)
}

#[allow(clippy::too_many_arguments)]
fn sizing(
    id: &str,
    study: &HeatLoss,
    s: &crate::kinds::heat_loss::Sizing,
    site: &Site,
    ground_c: &[[f64; 12]],
    soil: &Soil,
    numerical: bool,
    warnings: &mut Vec<Warning>,
) -> Result<SizingResult, String> {
    let pv = match &s.economic {
        Some(e) => Some(present_value_factor(e.discount_rate, e.years)?),
        None => None,
    };
    let studies: Vec<HeatLoss> = s
        .thicknesses_m
        .iter()
        .map(|&t| candidate_study(study, &s.layer, t))
        .collect();
    let analytic: Vec<Losses> = studies
        .iter()
        .zip(&s.thicknesses_m)
        .map(|(c, t)| {
            analytic(c, ground_c, soil)
                .map_err(|e| format!("study {id}: with {} mm of {}: {e}", t * 1000.0, s.layer))
        })
        .collect::<Result<_, _>>()?;
    // The engine's cross-check of every candidate, in parallel (each is independent).
    let numerical: Vec<Option<f64>> = if numerical {
        studies
            .par_iter()
            .zip(&analytic)
            .map(|(c, l)| numerical_losses(c, site, ground_c, l, &[]).map(|n| Some(n.total_mean)))
            .collect::<Result<_, String>>()
            .map_err(|e| format!("study {id}: sizing cross-check: {e}"))?
    } else {
        vec![None; studies.len()]
    };
    let mut candidates = Vec::new();
    for (c, ((&t, l), cand)) in s.thicknesses_m.iter().zip(&analytic).zip(&studies).enumerate() {
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
            outer_diameters_m: match &cand.twin {
                Some(tw) => vec![tw.outer_diameter_m],
                None => cand.pipes.iter().map(|p| p.outer_diameter_m).collect(),
            },
            meets_limit: s.heat_loss_limit_w_per_m.map(|lim| total <= lim),
            life_cycle_cost_per_m: cost,
            numerical_heat_loss_w_per_m: numerical[c],
            numerical_relative_difference: numerical[c].map(|n| (total - n) / n.abs()),
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
    let chosen_loss = chosen.and_then(|t| {
        candidates
            .iter()
            .find(|c| c.insulation_thickness_m == t)
            .map(|c| c.heat_loss_w_per_m)
    });
    Ok(SizingResult {
        layer: s.layer.clone(),
        chosen_insulation_thickness_m: chosen,
        chosen_heat_loss_w_per_m: chosen_loss,
        heat_loss_limit_w_per_m: s.heat_loss_limit_w_per_m,
        cheapest_insulation_thickness_m: cheapest_t,
        candidates,
    })
}

/// The study with insulation thickness `t` (m): the named layer of every pipe
/// ([`with_layer_thickness`]), or a twin pipe's insulation as its least cover over a carrier
/// (the casing grows about its centre; the carriers stay).
fn candidate_study(study: &HeatLoss, layer: &str, t: f64) -> HeatLoss {
    let mut c = study.clone();
    match &mut c.twin {
        Some(tw) => {
            let r_p = study.pipes[0].outer_radius_m();
            tw.outer_diameter_m = 2.0 * (0.5 * tw.carrier_spacing_m + r_p + t + tw.casing_thickness_m);
        }
        None => c.pipes = with_layer_thickness(&study.pipes, layer, t),
    }
    c
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
    let (sources, radii, monthly) = sources(study, losses);
    let q: Vec<f64> = monthly.iter().map(|x| x[month]).collect();
    let t_mid = (month as f64 + 0.5) * MONTH_S;
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
use crate::calendar::MONTH_NAMES as MONTHS;

/// The engine's monthly figures.
struct NumericalLosses {
    /// Annual mean per pipe, W/m.
    mean: Vec<f64>,
    total_mean: f64,
    /// Highest monthly temperature at each probe, °C.
    probe_max_c: Vec<f64>,
    cells: usize,
}

/// The engine's steady responses of the study's section ([`numerical::responses`]), all soil
/// layers resolved, applied month by month to the same excesses as the analytic method. With an
/// EN 253 law the insulation takes its annual-mean converged conductivity from the analytic
/// solution.
fn numerical_losses(
    study: &HeatLoss,
    site: &Site,
    ground_c: &[[f64; 12]],
    losses: &Losses,
    probes: &[(f64, f64, [f64; 12])],
) -> Result<NumericalLosses, String> {
    let mut pipes = study.pipes.clone();
    for (p, ins) in pipes.iter_mut().zip(&losses.insulation) {
        if let Some(ins) = ins {
            for l in p.layers.iter_mut().filter(|l| l.insulation_law.is_some()) {
                l.conductivity_w_per_m_k = ins.mean_lambda();
            }
        }
    }
    let twin = study
        .twin
        .as_ref()
        .zip(losses.twin.as_ref())
        .map(|(t, tl)| TwinBody::of(t, tl.insulation_w_per_m_k));
    let points: Vec<(f64, f64)> = probes.iter().map(|&(x, z, _)| (x, z)).collect();
    let resp: Responses =
        numerical::responses(&pipes, twin, site, study.surface_resistance_m2_k_per_w, &points)?;
    let mut monthly = vec![[0.0; 12]; pipes.len()];
    let mut probe_max_c = vec![f64::NEG_INFINITY; probes.len()];
    for m in 0..12 {
        let x: Vec<f64> = pipes
            .iter()
            .zip(ground_c)
            .map(|(p, g)| match &p.drive {
                PipeDrive::FluidTemperature { monthly_c } => monthly_c[m] - g[m],
                PipeDrive::HeatToGround { w_per_m } => *w_per_m,
            })
            .collect();
        let (q, rises) = resp.apply(&x);
        for (i, q) in q.into_iter().enumerate() {
            monthly[i][m] = q;
        }
        for (n, rise) in rises.into_iter().enumerate() {
            probe_max_c[n] = probe_max_c[n].max(probes[n].2[m] + rise);
        }
    }
    let mean: Vec<f64> = monthly.iter().map(|q| q.iter().sum::<f64>() / 12.0).collect();
    Ok(NumericalLosses {
        total_mean: mean.iter().sum(),
        mean,
        probe_max_c,
        cells: resp.cells,
    })
}

fn relative_difference(analytic: f64, numerical: f64) -> f64 {
    ((analytic - numerical) / numerical).abs()
}

/// The engine's figures beside the analytic ones, and each neighbour's highest temperature from
/// the engine's fields (on the same undisturbed ground).
fn numerical_cross_check(
    study: &HeatLoss,
    site: &Site,
    ground: &Undisturbed,
    ground_c: &[[f64; 12]],
    losses: &Losses,
) -> Result<(CrossCheck, Vec<f64>), String> {
    let probes: Vec<(f64, f64, [f64; 12])> = study
        .neighbours
        .iter()
        .map(|n| (n.x_m, n.depth_m, ground.monthly_mean_at(n.depth_m)))
        .collect();
    let num = numerical_losses(study, site, ground_c, losses, &probes)?;
    let pipes: Vec<CrossCheckPipe> = study
        .pipes
        .iter()
        .zip(&num.mean)
        .map(|(p, q)| CrossCheckPipe {
            id: p.id.clone(),
            heat_loss_w_per_m: *q,
        })
        .collect();
    let total_relative_difference = relative_difference(losses.total_mean(), num.total_mean);
    let (anti, anti_diff, max_relative_difference, model) = match &study.twin {
        Some(_) => {
            let a_num = 0.5 * (num.mean[0] - num.mean[1]);
            let a_ana = 0.5 * (losses.mean[0] - losses.mean[1]);
            let d = relative_difference(a_ana, a_num);
            (
                Some(a_num),
                Some(d),
                d.max(total_relative_difference),
                "finite-volume steady state per unit drive, summed month by month; soil layers resolved; carriers cut out at their true radius with the steel as a resistance; the insulation circle as an equal-area staircase of 24 strips; the casing wall taken as soil".to_string(),
            )
        }
        None => (
            None,
            None,
            num.mean
                .iter()
                .zip(&losses.mean)
                .map(|(n, a)| relative_difference(*a, *n))
                .fold(0.0, f64::max),
            "finite-volume steady state per unit drive, summed month by month; soil layers resolved; pipes cut out at their true radius with their wall layers as a resistance".to_string(),
        ),
    };
    Ok((
        CrossCheck {
            method: "numerical".into(),
            pipes,
            max_relative_difference,
            total_heat_loss_w_per_m: num.total_mean,
            total_relative_difference,
            antisymmetric_heat_flow_w_per_m: anti,
            antisymmetric_relative_difference: anti_diff,
            model,
            cells: num.cells,
        },
        num.probe_max_c,
    ))
}
