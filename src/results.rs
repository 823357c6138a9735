//! The plain result types that `results.json` serialises (the contract in product.md). Figures
//! carry their unit in the key. Report writers read these; nothing here computes.

use serde::Serialize;

#[derive(Clone, Debug, Serialize)]
pub struct Results {
    pub tool: Tool,
    pub site: SiteInfo,
    pub ground: GroundResults,
    pub studies: Vec<StudyResult>,
    pub warnings: Vec<Warning>,
}

#[derive(Clone, Debug, Serialize)]
pub struct Tool {
    pub name: String,
    pub version: String,
}

#[derive(Clone, Debug, Serialize)]
pub struct SiteInfo {
    pub name: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub description: Option<String>,
    /// File name of the site file and the SHA-256 of its bytes.
    pub input_file: String,
    pub input_sha256: String,
}

#[derive(Clone, Debug, Serialize)]
pub struct GroundResults {
    /// The undisturbed annual envelope: mean, lowest and highest temperature against depth.
    pub profile: Vec<ProfileRow>,
    /// `closed-form` (homogeneous dry soil under a sinusoidal surface) or `numerical`
    /// (1-D periodic finite volumes with latent heat).
    pub profile_method: String,
    /// Surface temperature of the typical year, one value a day.
    pub surface_daily_c: Vec<f64>,
    /// Mean of the surface temperature over the year.
    pub surface_mean_c: f64,
    /// Deepest depth at which the soil freezes in the typical year (0 when it never does).
    pub max_frost_depth_m: f64,
    /// Years of spin-up the numerical profile needed (0 for the closed form).
    pub spin_up_years: usize,
    /// |heat in − heat out − Δstored| / throughput of the numerical profile's last year.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub energy_balance_relative_error: Option<f64>,
}

#[derive(Clone, Copy, Debug, Serialize, PartialEq)]
pub struct ProfileRow {
    pub depth_m: f64,
    pub mean_c: f64,
    pub min_c: f64,
    pub max_c: f64,
}

/// One study's figures: the common keys, then the kind's own.
#[derive(Clone, Debug, Serialize)]
pub struct StudyResult {
    pub id: String,
    pub kind: String,
    pub method: String,
    #[serde(flatten)]
    pub figures: Figures,
}

/// The figures of each study kind.
#[derive(Clone, Debug, Serialize)]
#[serde(untagged)]
pub enum Figures {
    HeatLoss(HeatLossResult),
    Frost(FrostResult),
    CrossSection(CrossSectionResult),
    Borefield(Box<BorefieldResult>),
}

/// A 2-D temperature field on cell centres, for plots (not serialised into results.json).
#[derive(Clone, Debug, Default)]
pub struct Field {
    /// What the field shows, e.g. "January, coldest ground".
    pub label: String,
    pub x_m: Vec<f64>,
    pub z_m: Vec<f64>,
    /// `values_c[iz][ix]`.
    pub values_c: Vec<Vec<f64>>,
}

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

#[derive(Clone, Copy, Debug, Serialize, PartialEq, Eq, PartialOrd, Ord)]
#[serde(rename_all = "lowercase")]
pub enum Level {
    Info,
    Caution,
    Danger,
}

#[derive(Clone, Debug, Serialize)]
pub struct Warning {
    /// The study that raised it; `None` for the site as a whole.
    pub study: Option<String>,
    pub level: Level,
    /// burrow's dotted name for the warning, e.g. `frost.at_pipe`.
    pub code: String,
    pub message: String,
}

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
    /// depth (Stefan is an upper bound, shown only).
    pub max_frost_depth_m: f64,
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
    /// Deepest free-field frost (0 °C isotherm at the section edge, away from the pipe), m.
    pub free_field_frost_depth_m: f64,
    /// Days from the season start of the deepest frost.
    pub deepest_frost_day: f64,
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

/// `kind: cross-section` (contract in issue "Transient 2-D conduction engine").
#[derive(Clone, Debug, Serialize)]
pub struct CrossSectionResult {
    pub cells: usize,
    /// Heat from each pipe to the ground, positive.
    pub pipes: Vec<SectionPipeFigures>,
    pub probes: Vec<ProbeFigures>,
    /// Deepest 0 °C isotherm at the section's edge column (away from the pipes), m.
    pub max_frost_depth_m: Option<f64>,
    pub final_frost_depth_m: Option<f64>,
    /// |heat in − heat out − Δstored| / throughput over the run.
    pub energy_balance_relative_error: f64,
    pub steady: bool,
    #[serde(skip)]
    pub series: SectionSeries,
    #[serde(skip)]
    pub fields: Vec<Field>,
    /// Heat-flux arrows of each field (same order as `fields`).
    #[serde(skip)]
    pub flux: Vec<FluxArrows>,
}

/// Heat-flux density `q = −k∇T` sampled on a sparse grid of points, for arrows on a field
/// plot (plain data; computed by the study from the engine's face flows).
#[derive(Clone, Debug, Default)]
pub struct FluxArrows {
    /// Arrow positions, m across and m deep.
    pub x_m: Vec<f64>,
    pub z_m: Vec<f64>,
    /// Components, W/m²: across (towards +x) and down (towards depth).
    pub qx_w_per_m2: Vec<f64>,
    pub qz_w_per_m2: Vec<f64>,
}

#[derive(Clone, Debug, Serialize)]
pub struct SectionPipeFigures {
    pub id: String,
    pub mean_heat_rate_w_per_m: f64,
    pub final_heat_rate_w_per_m: f64,
}

#[derive(Clone, Debug, Serialize)]
pub struct ProbeFigures {
    pub id: String,
    pub min_c: f64,
    pub max_c: f64,
    pub final_c: f64,
}

/// Time series of a transient section, for the report and CSV.
#[derive(Clone, Debug, Default)]
pub struct SectionSeries {
    pub times_d: Vec<f64>,
    pub pipe_ids: Vec<String>,
    pub pipe_heat_w_per_m: Vec<Vec<f64>>,
    pub probe_ids: Vec<String>,
    pub probes_c: Vec<Vec<f64>>,
    pub frost_depth_m: Vec<f64>,
}

/// `kind: borefield` (contract in issue "Borefield design").
#[derive(Clone, Debug, Serialize)]
pub struct BorefieldResult {
    pub layout: String,
    pub boreholes: usize,
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
    /// Which limit fixed the sized length: `min_fluid`, `max_fluid`, or `none` when the shortest
    /// length searched already meets both.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub governing_limit: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub sizing: Option<BorefieldSizing>,
    /// Ground loads of one year, whole field.
    pub annual_loads: AnnualGroundLoads,
    /// Design life in years.
    pub design_life_years: f64,
    /// One row per month of the design life, for the report and the CSV.
    #[serde(skip)]
    pub months: Vec<FluidMonth>,
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
    pub extracted_mwh: f64,
    pub injected_mwh: f64,
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
