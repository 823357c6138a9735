//! The validated model of a `kind: heat-loss` study, in model units.

use crate::model::{InsulationLaw, Pipe};

/// Heat loss of buried pipes in one trench (district heating), with optional insulation sizing
/// and neighbouring points whose soil temperature matters.
#[derive(Clone, Debug, PartialEq)]
pub struct HeatLoss {
    /// Trench length for route totals, m.
    pub length_m: f64,
    pub pipes: Vec<Pipe>,
    pub surface_resistance_m2_k_per_w: f64,
    pub sizing: Option<Sizing>,
    pub neighbours: Vec<Neighbour>,
    /// A twin pipe; then `pipes` holds its two carriers (supply first), each with its own
    /// wall layers (the carrier wall) and fluid.
    pub twin: Option<TwinCasing>,
}

/// The casing and insulation around the two carriers of a twin pipe (carriers side by side at
/// the casing's depth, supply on the left).
#[derive(Clone, Debug, PartialEq)]
pub struct TwinCasing {
    pub id: String,
    pub x_m: f64,
    pub depth_m: f64,
    pub outer_diameter_m: f64,
    pub casing_thickness_m: f64,
    pub casing_conductivity_w_per_m_k: f64,
    /// Design value (aged λ50 with a law), W/(m K).
    pub insulation_conductivity_w_per_m_k: f64,
    pub insulation_law: Option<InsulationLaw>,
    /// Centre-to-centre distance of the carriers, m.
    pub carrier_spacing_m: f64,
}

impl TwinCasing {
    pub fn outer_radius_m(&self) -> f64 {
        self.outer_diameter_m / 2.0
    }
}

/// Candidate thicknesses of one named wall layer.
#[derive(Clone, Debug, PartialEq)]
pub struct Sizing {
    pub layer: String,
    pub thicknesses_m: Vec<f64>,
    /// On the trench total (all pipes), W/m.
    pub heat_loss_limit_w_per_m: Option<f64>,
    pub economic: Option<Economics>,
}

#[derive(Clone, Debug, PartialEq)]
pub struct Economics {
    /// Currency units per MWh of heat lost.
    pub heat_price_per_mwh: f64,
    /// Installed cost of each candidate per metre of trench, currency units.
    pub cost_per_metre: Vec<f64>,
    pub years: f64,
    pub discount_rate: f64,
}

/// A point in the soil whose temperature matters.
#[derive(Clone, Debug, PartialEq)]
pub struct Neighbour {
    pub id: String,
    pub x_m: f64,
    pub depth_m: f64,
    pub limit_c: Option<f64>,
}
