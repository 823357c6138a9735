//! The plain result figures of a `kind: heat-loss` study (serialised into `results.json`).

use crate::results::Field;
use serde::Serialize;

/// `kind: heat-loss` (contract in issue "District-heating pipes").
#[derive(Clone, Debug, Serialize)]
pub struct HeatLossResult {
    pub pipes: Vec<PipeLoss>,
    /// All pipes together, annual mean, W per metre of trench.
    pub total_heat_loss_w_per_m: f64,
    /// Trench total over `length`, MWh per year.
    pub annual_heat_loss_mwh: f64,
    pub length_m: f64,
    /// Conductivity of the soil the analytic method used (the layer at the pipes).
    #[serde(rename = "soil_conductivity_w_m_k")]
    pub soil_conductivity_w_per_m_k: f64,
    pub surface_resistance_m2_k_per_w: f64,
    /// Undisturbed monthly ground temperature at the mean pipe depth, °C.
    pub monthly_ground_temperature_c: Vec<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub sizing: Option<SizingResult>,
    pub neighbours: Vec<NeighbourResult>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub cross_check: Option<Box<CrossCheck>>,
    /// The twin pipe's figures, when the study has one (its carriers are `pipes`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub twin: Option<Box<TwinResult>>,
    /// The section's temperature in the month of the largest loss, for the report.
    #[serde(skip)]
    pub field: Option<Field>,
}

#[derive(Clone, Debug, Serialize)]
pub struct PipeLoss {
    pub id: String,
    /// Annual mean heat given to the ground, W per metre of pipe.
    pub heat_loss_w_per_m: f64,
    pub annual_heat_loss_kwh_per_m: f64,
    /// Annual mean loss over (mean fluid − mean undisturbed ground temperature at the pipe).
    pub u_w_per_m_k: f64,
    pub monthly_heat_loss_w_per_m: Vec<f64>,
    pub monthly_fluid_temperature_c: Vec<f64>,
    /// With an EN 253 conductivity law on a wall layer: its conductivity at the layer's mean
    /// temperature, averaged over the months, W/(m K).
    #[serde(skip_serializing_if = "Option::is_none")]
    #[serde(rename = "insulation_conductivity_w_m_k")]
    pub insulation_conductivity_w_per_m_k: Option<f64>,
    /// That layer's mean temperature (average of its two faces), averaged over the months, °C.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub insulation_mean_temperature_c: Option<f64>,
}

/// A twin pipe (Wallentén's symmetric/antisymmetric split; EN 15698-1).
#[derive(Clone, Debug, Serialize)]
pub struct TwinResult {
    pub id: String,
    pub casing_outer_diameter_m: f64,
    pub carrier_spacing_m: f64,
    /// Insulation conductivity used (the annual mean with an EN 253 law), W/(m K).
    #[serde(rename = "insulation_conductivity_w_m_k")]
    pub insulation_conductivity_w_per_m_k: f64,
    /// Mean insulation temperature (carrier surfaces and casing inner face), annual mean, °C,
    /// with an EN 253 law.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub insulation_mean_temperature_c: Option<f64>,
    /// Both carriers together to the undisturbed ground: insulation + casing + ground, m K/W.
    pub symmetric_resistance_m_k_per_w: f64,
    /// Between the carriers, m K/W.
    pub antisymmetric_resistance_m_k_per_w: f64,
    /// Wallentén's dimensionless coefficients.
    pub h_s: f64,
    pub h_a: f64,
    /// Symmetric part (both carriers together; the twin's total), annual mean, W/m.
    pub symmetric_heat_loss_w_per_m: f64,
    /// Antisymmetric part: heat flowing from supply to return, `(q_s − q_r)/2`, annual mean, W/m.
    pub antisymmetric_heat_flow_w_per_m: f64,
    /// The twin's total, annual mean, W/m, and per year, kWh/m.
    pub total_heat_loss_w_per_m: f64,
    pub annual_heat_loss_kwh_per_m: f64,
}

#[derive(Clone, Debug, Serialize)]
pub struct SizingResult {
    pub layer: String,
    /// The thinnest candidate meeting the limit (absent when none does or no limit was given).
    pub chosen_insulation_thickness_m: Option<f64>,
    /// The trench loss of the chosen candidate, W/m: the figure the sizing held to the limit
    /// (the study's own `total_heat_loss_w_per_m` is that of the thickness the site file gives).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub chosen_heat_loss_w_per_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub heat_loss_limit_w_per_m: Option<f64>,
    /// The candidate with the lowest life-cycle cost, when economics were given.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub cheapest_insulation_thickness_m: Option<f64>,
    pub candidates: Vec<Candidate>,
}

#[derive(Clone, Debug, Serialize)]
pub struct Candidate {
    pub insulation_thickness_m: f64,
    /// Trench total (all pipes), annual mean, W/m: the figure the limit applies to.
    pub heat_loss_w_per_m: f64,
    pub annual_heat_loss_kwh_per_m: f64,
    /// Outer diameter of each pipe with this thickness, m (pipe order).
    pub outer_diameters_m: Vec<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub meets_limit: Option<bool>,
    /// Present value of the heat lost plus the installed cost, currency per metre of trench.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub life_cycle_cost_per_m: Option<f64>,
    /// With `method: both`: the engine's trench total, annual mean, W/m.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub numerical_heat_loss_w_per_m: Option<f64>,
    /// `(analytic − numerical)/numerical` of the trench total.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub numerical_relative_difference: Option<f64>,
}

#[derive(Clone, Debug, Serialize)]
pub struct NeighbourResult {
    pub id: String,
    pub x_m: f64,
    pub depth_m: f64,
    /// Highest monthly-mean soil temperature over the year, °C.
    pub max_temperature_c: f64,
    /// Month (1–12) of that highest value.
    pub month_of_max: usize,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub limit_c: Option<f64>,
    pub exceeds_limit: bool,
    /// With `method: both`: the highest monthly value from the engine's steady fields, °C.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub numerical_max_temperature_c: Option<f64>,
}

/// The other method's figures beside the study's own.
#[derive(Clone, Debug, Serialize)]
pub struct CrossCheck {
    pub method: String,
    pub pipes: Vec<CrossCheckPipe>,
    /// Largest `|analytic − numerical|/|numerical|` over the pipes; for a twin pipe over its
    /// total and its antisymmetric part (a carrier's own loss can be near zero).
    pub max_relative_difference: f64,
    /// The engine's trench total, annual mean, W/m, and its relative difference.
    pub total_heat_loss_w_per_m: f64,
    pub total_relative_difference: f64,
    /// Twin pipe: the engine's `(q_s − q_r)/2`, annual mean, W/m, and its relative difference.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub antisymmetric_heat_flow_w_per_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub antisymmetric_relative_difference: Option<f64>,
    /// How the engine's model departs from the analytic one, in words.
    pub model: String,
    /// Cells of the engine's grid.
    pub cells: usize,
}

#[derive(Clone, Debug, Serialize)]
pub struct CrossCheckPipe {
    pub id: String,
    pub heat_loss_w_per_m: f64,
}
