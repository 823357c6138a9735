//! The plain result figures of a `kind: frost` study (serialised into `results.json`).

use crate::results::Field;
use serde::Serialize;

/// `kind: frost` (contract in issue "Water mains").
#[derive(Clone, Debug, Serialize)]
pub struct FrostResult {
    /// The SURFACE freezing index the methods use (n-factor × air index for air climates), °C·d.
    pub design_freezing_index_c_days: f64,
    /// The air freezing index, where the climate gives air temperatures, °C·d.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub air_freezing_index_c_days: Option<f64>,
    /// How the design index was found.
    pub design_index_basis: String,
    pub frost_depth_m: FrostDepths,
    /// The governing frost depth: the deeper of modified Berggren and the numerical free-field
    /// depth (Stefan is an upper bound, shown only); null over permafrost or when the frost
    /// reaches the bottom of every model.
    pub max_frost_depth_m: Option<f64>,
    /// Perennially frozen ground under the site: then no frost depth is given (a frost-depth
    /// cover rule does not apply) and these figures stand instead.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub permafrost: Option<crate::results::PermafrostFigures>,
    /// Mean annual surface temperature and length of the freezing season used by Berggren.
    pub mean_annual_surface_c: f64,
    pub freezing_season_days: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub berggren: Option<BerggrenFigures>,
    /// Seasonal surface freezing indices of a multi-year series, °C·d.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub seasons: Vec<SeasonFigure>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub frost_reaches_pipe: Option<bool>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub pipe_crown_depth_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub pipe_min_temperature_c: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub water_min_temperature_c: Option<f64>,
    /// Shallowest cover (surface to crown) keeping the crown `margin` below the governing frost
    /// depth, m.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub required_cover_m: Option<f64>,
    pub margin_m: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub stagnant: Option<StagnantFigures>,
    /// First day of the freezing season the index is counted over, `MM-DD`.
    pub season_start: String,
    /// The engine's design winter (method `numerical` or `both`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub numerical: Option<Box<FrostNumericalFigures>>,
    /// Flow that keeps the water above `min_temperature_c` along `length_m` (when asked).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub bleed: Option<Box<BleedFigures>>,
    /// Narrowest insulation board width keeping the crown above 0 °C, m: absent when no board was
    /// given, 0 when the crown stays out of frost without one, null when even the widest tried
    /// does not.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub board_width_m: Option<Option<f64>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub board: Option<Box<BoardFigures>>,
    /// Cumulative surface degree-days over the design (typical) season, one value a day from
    /// the season start, for the report.
    #[serde(skip)]
    pub cumulative_degree_days: Vec<f64>,
    /// Lowest undisturbed temperature against depth (depth, °C), for the report.
    #[serde(skip)]
    pub lowest_profile: Vec<(f64, f64)>,
}

/// The engine's run of the design winter with the main in place.
#[derive(Clone, Debug, Serialize)]
pub struct FrostNumericalFigures {
    pub cells: usize,
    pub time_step_h: f64,
    pub spin_up_years: usize,
    /// Factor on the typical year's below-zero surface temperatures that gives the design
    /// season the design freezing index (1 when it is the typical year's own).
    pub winter_scale: f64,
    /// Deepest free-field frost (0 °C isotherm at the section edge, away from the pipe), m:
    /// "first ice", interpolated between cell centres. The governing depth uses this one (the
    /// deeper, conservative definition).
    pub free_field_frost_depth_m: f64,
    /// Days from the season start of the deepest frost.
    pub deepest_frost_day: f64,
    /// The enthalpy method's free-field front at the same edge: the frozen thickness Σ f·Δz
    /// of the column (f the frozen fraction of the water), located inside its cell, hence
    /// accurate on coarse cells; deepest over the design season and at its end, m.
    pub max_front_depth_m: f64,
    pub final_front_depth_m: f64,
    /// Lowest pipe-wall (outer surface) temperature of the design season, °C.
    pub pipe_min_wall_temperature_c: Option<f64>,
    /// Lowest free-field ground temperature at the pipe's centre depth, °C.
    pub ground_min_at_pipe_c: Option<f64>,
    pub energy_balance_relative_error: f64,
    /// Days from the season start and free-field frost depth, m, for the report and CSV.
    #[serde(skip)]
    pub series_days: Vec<f64>,
    #[serde(skip)]
    pub series_frost_depth_m: Vec<f64>,
    /// The field at the deepest frost (x from the pipe centre), for the report.
    #[serde(skip)]
    pub field: Option<Field>,
    /// Pipe centre (x, depth) and outer radius in the field's coordinates, m.
    #[serde(skip)]
    pub pipe_circle: Option<(f64, f64, f64)>,
}

#[derive(Clone, Debug, Serialize)]
pub struct BleedFigures {
    pub length_m: f64,
    /// Bleed flow, litres per minute (0 when the ground never gets colder than the limit).
    pub flow_l_per_min: f64,
    /// Coldest water entering the length, °C (the lowest monthly water temperature).
    pub inlet_temperature_c: f64,
    /// Coldest ground at the pipe depth by the governing method, °C.
    pub ground_temperature_c: f64,
    pub min_temperature_c: f64,
    /// Wall plus ground resistance per metre, m K/W.
    pub resistance_m_k_per_w: f64,
}

#[derive(Clone, Debug, Serialize)]
pub struct BoardFigures {
    pub thickness_m: f64,
    #[serde(rename = "conductivity_w_m_k")]
    pub conductivity_w_per_m_k: f64,
    /// Clear distance between the board's underside and the crown, m.
    pub gap_m: f64,
    pub max_width_m: f64,
    /// The widths the search tried, narrowest first.
    pub trials: Vec<BoardTrialFigure>,
}

#[derive(Clone, Debug, Serialize)]
pub struct BoardTrialFigure {
    pub width_m: f64,
    /// Lowest temperature at the crown in the design season (no heat from the water), °C.
    pub crown_min_temperature_c: f64,
    /// Deepest 0 °C isotherm over the pipe, m.
    pub frost_depth_over_pipe_m: f64,
}

#[derive(Clone, Debug, Serialize)]
pub struct FrostDepths {
    /// Absent when the soil holds no water (Stefan needs latent heat).
    pub stefan: Option<f64>,
    pub berggren: Option<f64>,
    pub numerical: Option<f64>,
}

#[derive(Clone, Debug, Serialize)]
pub struct BerggrenFigures {
    pub lambda: f64,
    pub thermal_ratio: f64,
    pub fusion_parameter: f64,
}

#[derive(Clone, Debug, Serialize)]
pub struct SeasonFigure {
    pub start_year: i32,
    pub freezing_index_c_days: f64,
}

#[derive(Clone, Debug, Serialize)]
pub struct StagnantFigures {
    pub duration_h: f64,
    /// Hours until ice starts to form, when it does within the coldest conditions.
    pub time_to_first_ice_h: Option<f64>,
    /// Share of the water frozen at the end of the period.
    pub ice_fraction: f64,
    /// Ground temperature at the pipe and starting water temperature assumed, °C.
    pub ground_temperature_c: f64,
    pub initial_water_temperature_c: f64,
}
