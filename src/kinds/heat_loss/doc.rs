//! The site-file keys of `kind: heat-loss`: heat loss of buried district-heating pipes, insulation sizing, and the soil
//! temperature at neighbouring utilities.
//!
//! Doc comments here become the schema's descriptions: write them for the user.

use crate::site::doc::MethodDoc;
use crate::site::doc::{LayerConductivityDoc, PipeDoc, PipeFluidDoc, WallLayerDoc};
use crate::site::quantity::*;
use schemars::JsonSchema;
use serde::Deserialize;

/// Surface resistance this kind uses unless the study gives one: EN 13941-1 practice
/// (`from memory`: 0.0685 m2 K/W).
pub use crate::physics::buried_pipe::DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W;

/// Heat loss of buried district-heating pipes (a supply/return pair, or any pipes in one trench).
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct HeatLossDoc {
    /// A unique name for the study, used in the report and in file names (letters, digits, `-`,
    /// `_`, `.`).
    pub id: String,
    /// `analytic` (line sources with images, the default) or `both` (the analytic figures with the
    /// finite-volume engine's steady solution beside them as a cross-check).
    #[serde(default)]
    pub method: Option<MethodDoc>,
    /// Thermal resistance between the surface temperature and the ground (default 0.0685 m2 K/W,
    /// EN 13941-1 practice; 0 = the surface temperature is imposed on the ground).
    #[serde(default)]
    pub surface_resistance: Option<Q<ArealResistance>>,
    /// Trench length for the route totals.
    #[serde(default)]
    pub length: Option<Q<Length>>,
    /// The pipes in the trench, each with its fluid temperature (or give `twin` instead).
    #[serde(default)]
    pub pipes: Vec<PipeDoc>,
    /// Instead of `pipes`: a twin pipe, both carriers in one insulated casing.
    #[serde(default)]
    pub twin: Option<Box<TwinDoc>>,
    /// Candidate insulation thicknesses to compare.
    #[serde(default)]
    pub sizing: Option<SizingDoc>,
    /// Points whose soil temperature matters (a drinking-water main, a cable).
    #[serde(default)]
    pub neighbours: Vec<NeighbourDoc>,
}

/// A twin pipe: supply and return carriers side by side (supply on the left) in one insulated
/// casing.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct TwinDoc {
    /// A name for the twin pipe (its carriers are reported as `supply` and `return`).
    pub id: String,
    /// Horizontal position of the casing's centre.
    #[serde(default)]
    pub x: Option<Q<Length>>,
    /// Depth of the casing's CENTRE below the ground surface (or give `cover`).
    #[serde(default)]
    pub depth: Option<Q<Length>>,
    /// Instead of `depth`: the cover, from the ground surface down to the casing's crown;
    /// depth = cover + outer diameter / 2.
    #[serde(default)]
    pub cover: Option<Q<Length>>,
    /// Outer diameter of the casing.
    pub outer_diameter: Q<Length>,
    /// The casing wall (its thickness and conductivity).
    pub casing: CasingDoc,
    /// Conductivity of the insulation filling the casing: a value, or the EN 253 form
    /// `{lambda_50, slope, ageing}`.
    pub insulation_conductivity: LayerConductivityDoc,
    /// Distance between the carriers' centres.
    pub carrier_spacing: Q<Length>,
    /// The two (equal) carrier pipes.
    pub carriers: CarrierDoc,
    /// Fluid in the supply carrier: a temperature (one value or 12 monthly values).
    pub supply: PipeFluidDoc,
    /// Fluid in the return carrier.
    #[serde(rename = "return")]
    pub return_: PipeFluidDoc,
}

/// The casing wall of a twin pipe.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct CasingDoc {
    /// Wall thickness.
    pub thickness: Q<Length>,
    /// Thermal conductivity of the casing material.
    pub conductivity: Q<Conductivity>,
}

/// A carrier pipe of a twin pipe.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct CarrierDoc {
    /// Outer diameter of the carrier (steel) pipe.
    pub outer_diameter: Q<Length>,
    /// The carrier's wall layers from the inside out (e.g. the steel); may be empty.
    #[serde(default)]
    pub layers: Vec<WallLayerDoc>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct SizingDoc {
    /// Name of the wall layer whose thickness varies (the outer diameter follows).
    pub layer: String,
    /// Candidate thicknesses of that layer.
    #[schemars(length(min = 1))]
    pub thicknesses: Vec<Q<Length>>,
    /// Largest acceptable heat loss of the whole trench (all pipes together).
    #[serde(default)]
    pub heat_loss_limit: Option<Q<LinearHeatRate>>,
    /// Life-cycle cost comparison of the candidates.
    #[serde(default)]
    pub economic: Option<EconomicDoc>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct EconomicDoc {
    /// Price of the heat lost, in currency units per MWh.
    pub heat_price: f64,
    /// Installed cost of each candidate per metre of trench, in the same currency (one value per
    /// thickness).
    pub cost_per_metre: Vec<f64>,
    /// Years over which the losses are paid.
    pub years: f64,
    /// Real discount rate per year (a fraction or a percentage).
    pub discount_rate: Q<Fraction>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct NeighbourDoc {
    /// A name for the point.
    pub id: String,
    /// Horizontal position.
    pub x: Q<Length>,
    /// Depth below the surface.
    pub depth: Q<Length>,
    /// Highest acceptable soil temperature there.
    #[serde(default)]
    pub limit: Option<Q<Temperature>>,
}
