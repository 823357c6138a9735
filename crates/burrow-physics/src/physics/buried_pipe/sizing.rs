//! Insulation sizing: the loss of each candidate thickness, the thinnest meeting a limit, and the
//! life-cycle cost.
//!
//! A candidate thickness grows the insulation outwards from the carrier; the casing keeps its
//! wall thickness, so the outer diameter grows with the insulation. The centre depth stays fixed
//! (the product's `depth` is to the centre; a thicker pipe has less cover). In a pair the clear
//! gap between the casings stays fixed, so the centre spacing grows.

use super::seasonal::{annual_energy_kwh_per_m, monthly_pipe_states, monthly_twin_heat_rates};
use super::system::{Drive, PipeSection};
use super::twin::{TwinMethod, TwinPipe};
use super::wall::{WallLayer, inner_radius_m, wall_resistance_m_k_per_w};
use super::{GroundForm, Position, Soil, not_negative, positive};

/// How the carriers are laid.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Layout {
    /// One pipe at the supply temperature.
    Single,
    /// Supply and return pipes side by side at the same depth with `clear_gap_m` between the casings.
    Pair { clear_gap_m: f64 },
    /// Both carriers in one casing, centres `carrier_spacing_m` apart; the thickness is the
    /// insulation's least cover over a carrier.
    Twin {
        carrier_spacing_m: f64,
        method: TwinMethod,
    },
}

/// Everything but the insulation thickness.
#[derive(Clone, Debug, PartialEq)]
pub struct SizingCase {
    pub layout: Layout,
    /// Depth of the centre (of the pair, or of the casing), m.
    pub depth_m: f64,
    /// Outer radius of the carrier (steel) pipe, m.
    pub carrier_outer_radius_m: f64,
    /// The carrier's own wall layers, inside out, ending at `carrier_outer_radius_m`.
    pub carrier_layers: Vec<WallLayer>,
    /// Insulation conductivity (design value, e.g. aged λ50), W/(m K).
    pub insulation_conductivity_w_per_m_k: f64,
    /// Casing wall thickness, m, and conductivity, W/(m K).
    pub casing_thickness_m: f64,
    pub casing_conductivity_w_per_m_k: f64,
    pub soil: Soil,
    pub form: GroundForm,
    /// Monthly supply, return and undisturbed ground (at the centre depth) temperatures, °C.
    pub supply_c: [f64; 12],
    pub return_c: [f64; 12],
    pub ground_c: [f64; 12],
}

/// The loss of one candidate, per metre of trench (all carriers together).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CandidateLoss {
    pub insulation_thickness_m: f64,
    /// Outer diameter of the casing, m.
    pub outer_diameter_m: f64,
    /// Mean heat loss over the year, W/m.
    pub mean_heat_loss_w_per_m: f64,
    /// Annual heat loss, kWh/m.
    pub annual_energy_kwh_per_m: f64,
}

/// The loss of every candidate insulation thickness (m), in the order given.
pub fn sweep(case: &SizingCase, thicknesses_m: &[f64]) -> Result<Vec<CandidateLoss>, String> {
    thicknesses_m.iter().map(|&t| candidate_loss(case, t)).collect()
}

/// The loss of one candidate insulation thickness `thickness_m` (m).
pub fn candidate_loss(case: &SizingCase, thickness_m: f64) -> Result<CandidateLoss, String> {
    positive("an insulation thickness", thickness_m, "m")?;
    not_negative("the casing thickness", case.casing_thickness_m, "m")?;
    let monthly_w_per_m = match case.layout {
        Layout::Single | Layout::Pair { .. } => pipes_monthly_loss(case, thickness_m)?,
        Layout::Twin {
            carrier_spacing_m,
            method,
        } => twin_monthly_loss(case, thickness_m, carrier_spacing_m, method)?,
    };
    let outer_radius_m = match case.layout {
        Layout::Twin {
            carrier_spacing_m, ..
        } => 0.5 * carrier_spacing_m + case.carrier_outer_radius_m + thickness_m + case.casing_thickness_m,
        _ => case.carrier_outer_radius_m + thickness_m + case.casing_thickness_m,
    };
    let annual = annual_energy_kwh_per_m(&monthly_w_per_m)?;
    Ok(CandidateLoss {
        insulation_thickness_m: thickness_m,
        outer_diameter_m: 2.0 * outer_radius_m,
        mean_heat_loss_w_per_m: monthly_w_per_m.iter().sum::<f64>() / 12.0,
        annual_energy_kwh_per_m: annual,
    })
}

fn pipes_monthly_loss(case: &SizingCase, thickness_m: f64) -> Result<[f64; 12], String> {
    let mut layers = case.carrier_layers.clone();
    layers.push(WallLayer::new(
        thickness_m,
        case.insulation_conductivity_w_per_m_k,
    ));
    if case.casing_thickness_m > 0.0 {
        layers.push(WallLayer::new(
            case.casing_thickness_m,
            case.casing_conductivity_w_per_m_k,
        ));
    }
    let r_o = case.carrier_outer_radius_m + thickness_m + case.casing_thickness_m;
    let pipe = |x_m: f64| PipeSection {
        centre: Position::new(x_m, case.depth_m),
        outer_radius_m: r_o,
        layers: layers.clone(),
    };
    let (pipes, drives) = match case.layout {
        Layout::Pair { clear_gap_m } => {
            not_negative("the clear gap between the casings", clear_gap_m, "m")?;
            let half = r_o + 0.5 * clear_gap_m;
            (
                vec![pipe(-half), pipe(half)],
                vec![case.supply_c.map(Drive::FluidC), case.return_c.map(Drive::FluidC)],
            )
        }
        _ => (vec![pipe(0.0)], vec![case.supply_c.map(Drive::FluidC)]),
    };
    let ground = vec![case.ground_c; pipes.len()];
    let states = monthly_pipe_states(&pipes, &drives, &ground, &case.soil, case.form)?;
    let mut total = [0.0; 12];
    for s in &states {
        for (t, m) in total.iter_mut().zip(s) {
            *t += m.heat_w_per_m;
        }
    }
    Ok(total)
}

fn twin_monthly_loss(
    case: &SizingCase,
    thickness_m: f64,
    carrier_spacing_m: f64,
    method: TwinMethod,
) -> Result<[f64; 12], String> {
    let carrier_inner = inner_radius_m(case.carrier_outer_radius_m, &case.carrier_layers)?;
    let twin = TwinPipe {
        centre: Position::new(0.0, case.depth_m),
        casing_outer_radius_m: 0.5 * carrier_spacing_m
            + case.carrier_outer_radius_m
            + thickness_m
            + case.casing_thickness_m,
        casing_thickness_m: case.casing_thickness_m,
        casing_conductivity_w_per_m_k: case.casing_conductivity_w_per_m_k,
        insulation_conductivity_w_per_m_k: case.insulation_conductivity_w_per_m_k,
        carrier_outer_radius_m: case.carrier_outer_radius_m,
        carrier_spacing_m,
        carrier_wall_resistance_m_k_per_w: wall_resistance_m_k_per_w(carrier_inner, &case.carrier_layers)?,
    };
    let res = twin.resistances(&case.soil, case.form, method)?;
    let monthly = monthly_twin_heat_rates(&res, &case.supply_c, &case.return_c, &case.ground_c)?;
    Ok(monthly.map(|[s, r]| s + r))
}

/// Index of the thinnest candidate whose mean heat loss is at most `limit_w_per_m` (W/m), or
/// `None` when none meets it.
pub fn thinnest_meeting_limit(candidates: &[CandidateLoss], limit_w_per_m: f64) -> Option<usize> {
    candidates
        .iter()
        .enumerate()
        .filter(|(_, c)| c.mean_heat_loss_w_per_m <= limit_w_per_m)
        .min_by(|a, b| a.1.insulation_thickness_m.total_cmp(&b.1.insulation_thickness_m))
        .map(|(i, _)| i)
}

/// Present value of a constant yearly payment of 1 over `years` at discount rate `rate`
/// (fraction per year): `(1 − (1 + i)^−n)/i`, and `n` when `i = 0` (the uniform-series
/// present-worth factor (P/A, i, n) of engineering economics, also called the annuity factor;
/// `common practice, no source`).
pub fn present_value_factor(rate: f64, years: f64) -> Result<f64, String> {
    positive("the life in years", years, "years")?;
    if !(rate.is_finite() && rate > -1.0) {
        return Err(format!(
            "the discount rate {rate} is invalid; it must be a finite fraction above -1"
        ));
    }
    if rate.abs() < 1e-12 {
        return Ok(years);
    }
    Ok((1.0 - (1.0 + rate).powf(-years)) / rate)
}

/// The prices of a life-cycle cost.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Economics {
    /// Price of the heat lost, currency per MWh.
    pub heat_price_per_mwh: f64,
    /// Discount rate, fraction per year.
    pub discount_rate: f64,
    /// Life, years.
    pub years: f64,
}

/// Life-cycle cost per metre of trench for each candidate, currency/m:
/// `present_value_factor × annual heat lost (MWh/m) × heat price + insulation cost per metre`.
/// `insulation_cost_per_m[i]` belongs to `candidates[i]`.
pub fn life_cycle_costs(
    candidates: &[CandidateLoss],
    insulation_cost_per_m: &[f64],
    economics: &Economics,
) -> Result<Vec<f64>, String> {
    if candidates.len() != insulation_cost_per_m.len() {
        return Err("give one insulation cost per candidate".into());
    }
    not_negative("the heat price", economics.heat_price_per_mwh, "per MWh")?;
    let factor = present_value_factor(economics.discount_rate, economics.years)?;
    candidates
        .iter()
        .zip(insulation_cost_per_m)
        .map(|(c, &cost)| {
            not_negative("an insulation cost", cost, "per m")?;
            Ok(factor * c.annual_energy_kwh_per_m / 1000.0 * economics.heat_price_per_mwh + cost)
        })
        .collect()
}

/// Index of the lowest cost (`None` for an empty list).
pub fn cheapest(costs: &[f64]) -> Option<usize> {
    costs
        .iter()
        .enumerate()
        .min_by(|a, b| a.1.total_cmp(b.1))
        .map(|(i, _)| i)
}
