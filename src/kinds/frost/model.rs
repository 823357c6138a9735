//! The validated model of a `kind: frost` study, in model units.

use crate::model::Pipe;

/// Frost penetration under the site's climate, and the safety of a water main.
#[derive(Clone, Debug, PartialEq)]
pub struct Frost {
    pub pipe: Option<Pipe>,
    /// A design AIR freezing index that overrides the climate's, °C·days.
    pub design_air_freezing_index_c_days: Option<f64>,
    /// A surface type whose n-factors replace the climate's.
    pub surface_preset: Option<String>,
    /// Gumbel return period of the design winter (multi-year series), years.
    pub return_period_years: Option<f64>,
    /// Clearance between the frost depth and the crown for the required cover, m.
    pub margin_m: f64,
    /// A period without flow, s.
    pub stagnant_s: Option<f64>,
    /// First day (month 1–12, day of month) of the freezing season the index is counted over;
    /// `None`: the warmest day of the typical surface year, so that the season is never cut in
    /// two, in either hemisphere.
    pub season_start: Option<(u32, u32)>,
    /// The flow that keeps the water above a temperature over a length of main.
    pub bleed: Option<FrostBleed>,
    /// An insulation board whose width above the main is to be found.
    pub board: Option<FrostBoard>,
}

/// Bleed flow asked for by a frost study.
#[derive(Clone, Debug, PartialEq)]
pub struct FrostBleed {
    /// Length of main the water flows through, m.
    pub length_m: f64,
    /// Lowest water temperature allowed at the end of that length, °C.
    pub min_temperature_c: f64,
}

/// An insulation board laid flat above a main (its width is what the study finds).
#[derive(Clone, Debug, PartialEq)]
pub struct FrostBoard {
    pub thickness_m: f64,
    pub conductivity_w_per_m_k: f64,
    pub heat_capacity_j_per_m3_k: f64,
    /// Clear distance between the underside of the board and the pipe crown, m.
    pub gap_m: f64,
    /// Widest board tried, m.
    pub max_width_m: f64,
}
