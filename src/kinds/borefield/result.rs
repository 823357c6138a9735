//! The plain result figures of a `kind: borefield` study (serialised into `results.json`).

use serde::Serialize;

/// `kind: borefield` (contract in issue "Borefield design").
#[derive(Clone, Debug, Serialize)]
pub struct BorefieldResult {
    pub layout: String,
    pub boreholes: usize,
    /// Position of each borehole (x, y), m.
    pub positions_m: Vec<[f64; 2]>,
    /// The ground loads of a year month by month (January first), whole field: energy from and
    /// to the ground (gross), and the peak in each direction (0 where none is given), as the
    /// study used them.
    pub monthly_loads: MonthlyLoadFigures,
    /// Condition at the borehole walls of the g-function: `uniform-temperature` or
    /// `uniform-heat-flux`.
    pub wall_condition: String,
    /// The field's g-function at the final active length.
    pub g_function: Vec<GPoint>,
    /// Eskilson's time scale t_s = H²/(9α), in years.
    pub characteristic_time_years: f64,
    /// Effective borehole resistance R_b* (mean fluid to borehole wall, short circuit included).
    pub borehole_resistance_m_k_per_w: f64,
    /// Where R_b* came from: `multipole` (calculated) or `measured`.
    pub borehole_resistance_source: String,
    /// Local resistance R_b and internal resistance R_a of the cross-section (absent when
    /// measured).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub local_borehole_resistance_m_k_per_w: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub internal_resistance_m_k_per_w: Option<f64>,
    pub active_length_m: f64,
    /// Active length × number of boreholes.
    pub total_length_m: f64,
    pub top_depth_m: f64,
    pub ground: BorefieldGround,
    pub fluid: BorefieldFluid,
    pub fluid_freezing_point_c: f64,
    /// Mean fluid temperature (mean of the field's inlet and outlet), peaks included.
    pub fluid_temperature: FluidTemperatureFigures,
    /// The borefield inlet at the design extraction peak: mean − Q/(2ṁc_p).
    pub coldest_fluid_c: f64,
    /// The borefield inlet at the design injection peak: mean + Q/(2ṁc_p).
    pub warmest_fluid_c: f64,
    /// Change of the yearly mean borehole-wall temperature from the first to the last year.
    pub ground_temperature_drift_k: f64,
    /// Pressure drop of one borehole loop at the coldest fluid temperature.
    pub pressure_drop_kpa: f64,
    /// Pump power for the whole field's borehole loops (headers and heat pump excluded).
    pub pumping_power_w: f64,
    pub limits: FluidLimits,
    /// Which side decided the sized length: `cold-side` (the lower limit, met at an extraction
    /// peak), `warm-side` (the upper limit) or `none` when the shortest length searched already
    /// meets both.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub decided_by: Option<String>,
    /// The same in a plain sentence, with the temperature and the month it is reached.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub decision: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub sizing: Option<BorefieldSizing>,
    /// Ground loads of one year, whole field.
    pub annual_loads: AnnualGroundLoads,
    /// Design life in years.
    pub design_life_years: f64,
    /// One row per month of the design life, for the report and the CSV.
    #[serde(skip)]
    pub months: Vec<FluidMonth>,
    /// How each month's peaks stand against the limits, in the order of `months` (the marks of
    /// the report's calendar; not serialised).
    #[serde(skip)]
    pub month_marks: Vec<LimitProximity>,
}

#[derive(Clone, Copy, Debug, Serialize)]
pub struct GPoint {
    pub ln_t_over_ts: f64,
    pub g: f64,
}

#[derive(Clone, Debug, Serialize)]
pub struct BorefieldGround {
    /// Conductivity along the active length (thickness-weighted mean of the layers, or the
    /// measured value).
    #[serde(rename = "conductivity_w_m_k")]
    pub conductivity_w_per_m_k: f64,
    /// `layers` or `measured`.
    pub conductivity_source: String,
    #[serde(rename = "heat_capacity_j_m3_k")]
    pub heat_capacity_j_per_m3_k: f64,
    #[serde(rename = "diffusivity_m2_s")]
    pub diffusivity_m2_per_s: f64,
    /// Undisturbed temperature: the annual mean averaged over the active length.
    pub undisturbed_c: f64,
}

#[derive(Clone, Debug, Serialize)]
pub struct BorefieldFluid {
    pub mixture: String,
    pub mass_fraction: f64,
    /// Temperature at which the properties for the resistances were taken (the lower limit).
    pub property_temperature_c: f64,
    #[serde(rename = "density_kg_m3")]
    pub density_kg_per_m3: f64,
    #[serde(rename = "specific_heat_j_kg_k")]
    pub specific_heat_j_per_kg_k: f64,
    pub flow_per_borehole_l_per_s: f64,
    /// Reynolds number of the slowest channel at the coldest fluid temperature.
    pub reynolds: f64,
    /// `laminar`, `transitional` or `turbulent`.
    pub flow_regime: String,
}

#[derive(Clone, Copy, Debug, Serialize)]
pub struct FluidTemperatureFigures {
    pub min_c: f64,
    pub max_c: f64,
    pub first_year_min_c: f64,
    pub first_year_max_c: f64,
    pub last_year_min_c: f64,
    pub last_year_max_c: f64,
}

#[derive(Clone, Copy, Debug, Serialize)]
pub struct FluidLimits {
    pub min_fluid_c: f64,
    pub max_fluid_c: f64,
}

#[derive(Clone, Debug, Serialize)]
pub struct BorefieldSizing {
    /// The range of active lengths searched.
    pub range_m: [f64; 2],
    /// Shortest active length meeting each limit (the range's lower end when it is met there).
    pub length_for_min_fluid_m: f64,
    pub length_for_max_fluid_m: f64,
    /// Lengths at which the g-function was computed and then interpolated.
    pub g_function_lengths_m: Vec<f64>,
}

#[derive(Clone, Copy, Debug, Serialize)]
pub struct AnnualGroundLoads {
    /// Gross heat taken from and given to the ground in a year, as the loads give it (each
    /// month's energy in each direction), MWh.
    pub from_ground_mwh: f64,
    pub to_ground_mwh: f64,
    /// The same after netting the two directions within each month, MWh: what the monthly
    /// means that drive the ground carry (netting is exact for the mean; each direction's peak
    /// is superposed on the net base).
    pub net_from_ground_mwh: f64,
    pub net_to_ground_mwh: f64,
    /// Months in which heat flows both ways, so that netting hides energy.
    pub netted_months: usize,
}

/// Mean fluid temperatures of one month of the design life, °C.
#[derive(Clone, Copy, Debug, Default, PartialEq, Serialize)]
pub struct FluidMonth {
    /// Month of the design life, 1 = first January.
    pub month: usize,
    /// Under the month's mean load (hourly loads: the month's mean of the hourly values).
    pub mean_c: f64,
    /// Lowest and highest, peaks included.
    pub min_c: f64,
    pub max_c: f64,
    /// Borehole-wall temperature under the month's mean load.
    pub wall_c: f64,
    /// Coldest and warmest field inlet.
    pub inlet_min_c: f64,
    pub inlet_max_c: f64,
}

/// How a month's peaks stand against the fluid limits.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum LimitProximity {
    Within,
    /// Within [`crate::kinds::borefield::run::NEAR_LIMIT_K`] of a limit.
    Near,
    /// Past a limit.
    Beyond,
}

/// A year's ground loads month by month.
#[derive(Clone, Debug, Serialize, PartialEq)]
pub struct MonthlyLoadFigures {
    pub from_ground_mwh: [f64; 12],
    pub to_ground_mwh: [f64; 12],
    pub peak_from_ground_kw: [f64; 12],
    pub peak_to_ground_kw: [f64; 12],
}
