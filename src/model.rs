//! The validated site model: every value in the model's units (m, °C, K, s, W, J, W/(m K),
//! J/(m3 K), ...), every reference resolved, no strings to interpret. Studies and the ground
//! module read only this; nothing here knows YAML or unit spellings.

/// Length of the model day and year (365 days; leap days are ignored by every study).
pub use crate::physics::annual_wave::{DAY_S, YEAR_S};

#[derive(Clone, Debug, PartialEq)]
pub struct Site {
    pub name: String,
    pub description: Option<String>,
    pub climate: Climate,
    pub ground: Ground,
    pub studies: Vec<Study>,
}

/// What drives the ground surface. Times are seconds from 1 January 00:00 of year 0.
#[derive(Clone, Debug, PartialEq)]
pub enum Climate {
    /// Surface temperature `mean − amplitude·cos(2π(t − t_min)/P)`, P = one year.
    AnnualWave {
        mean_c: f64,
        amplitude_k: f64,
        /// Day of year of the minimum, 1 = 1 January.
        coldest_day: f64,
    },
    /// Monthly mean air temperatures, January first.
    MonthlyAir { air_c: [f64; 12], n_factors: NFactors },
    /// Measured air temperatures at even steps from the first record.
    Series(AirSeries),
    /// Surface held at one temperature from t = 0.
    Constant { temperature_c: f64 },
}

/// Ratios of surface to air freezing and thawing indices (TM 5-852-6): the surface temperature
/// is `n_f·T_air` below 0 °C and `n_t·T_air` above.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct NFactors {
    pub freezing: f64,
    pub thawing: f64,
}

/// Air temperatures at a fixed step, from a file.
#[derive(Clone, Debug, PartialEq)]
pub struct AirSeries {
    /// Day of year (1 = 1 January) and year of the first record.
    pub start_year: i32,
    pub start_day_of_year: f64,
    pub step_s: f64,
    pub air_c: Vec<f64>,
    pub n_factors: NFactors,
    /// Where the data came from, for the report (file name only).
    pub source: String,
}

#[derive(Clone, Debug, PartialEq)]
pub struct Ground {
    pub initial_temperature_c: Option<f64>,
    pub geothermal_flux_w_per_m2: f64,
    pub layers: Vec<SoilLayer>,
}

#[derive(Clone, Debug, PartialEq)]
pub struct SoilLayer {
    pub name: String,
    /// `None` for the last layer, which extends to the bottom of every model.
    pub thickness_m: Option<f64>,
    pub conductivity_w_per_m_k: f64,
    pub heat_capacity_j_per_m3_k: f64,
    pub frozen_conductivity_w_per_m_k: f64,
    pub frozen_heat_capacity_j_per_m3_k: f64,
    /// Volumetric water content, 0..1.
    pub water_content: f64,
    /// Latent heat released when all the layer's water freezes, J/m3.
    pub latent_heat_j_per_m3: f64,
    /// The water freezes over (−interval, 0] °C.
    pub freezing_interval_k: f64,
    /// The preset the layer started from, if any.
    pub preset: Option<String>,
}

impl Ground {
    /// Depth of the top of each layer, m.
    pub fn layer_tops_m(&self) -> Vec<f64> {
        let mut top = 0.0;
        self.layers
            .iter()
            .map(|l| {
                let t = top;
                top += l.thickness_m.unwrap_or(f64::INFINITY);
                t
            })
            .collect()
    }

    /// The layer that holds depth `z_m` (the last layer below all the others).
    pub fn layer_at(&self, z_m: f64) -> &SoilLayer {
        let tops = self.layer_tops_m();
        let i = tops.iter().rposition(|&t| t <= z_m).unwrap_or(0);
        &self.layers[i]
    }

    /// True when every layer has the same properties and none holds water: the homogeneous,
    /// non-freezing soil for which closed-form solutions hold.
    pub fn is_homogeneous_and_dry(&self) -> bool {
        let first = &self.layers[0];
        self.layers.iter().all(|l| {
            l.water_content == 0.0
                && l.conductivity_w_per_m_k == first.conductivity_w_per_m_k
                && l.heat_capacity_j_per_m3_k == first.heat_capacity_j_per_m3_k
        })
    }
}

/// A study to run.
#[derive(Clone, Debug, PartialEq)]
pub struct Study {
    pub id: String,
    pub method: Method,
    pub kind: StudyKind,
    /// The study's lines of the site file, as written, for the report's input echo.
    pub echo: Option<InputEcho>,
}

/// Lines of the site file, verbatim (units as the user wrote them), with their line numbers.
#[derive(Clone, Debug, PartialEq)]
pub struct InputEcho {
    pub first_line: usize,
    pub last_line: usize,
    pub text: String,
}

/// Which solution a study uses where its kind offers more than one.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Method {
    Analytic,
    Numerical,
    Both,
}

impl Method {
    pub fn name(self) -> &'static str {
        match self {
            Method::Analytic => "analytic",
            Method::Numerical => "numerical",
            Method::Both => "both",
        }
    }
}

#[derive(Clone, Debug, PartialEq)]
pub enum StudyKind {
    CrossSection(CrossSection),
    HeatLoss(HeatLoss),
    Frost(Frost),
    Borefield(Box<Borefield>),
}

impl StudyKind {
    /// The kind's name as the site file spells it.
    pub fn name(&self) -> &'static str {
        match self {
            StudyKind::CrossSection(_) => "cross-section",
            StudyKind::HeatLoss(_) => "heat-loss",
            StudyKind::Frost(_) => "frost",
            StudyKind::Borefield(_) => "borefield",
        }
    }
}

/// A free 2-D cross-section of the ground with pipes, probes and inclusions, solved by the
/// finite-volume engine. x across (0 at the centre), depth down from the surface.
#[derive(Clone, Debug, PartialEq)]
pub struct CrossSection {
    pub width_m: f64,
    pub depth_m: f64,
    pub cell_min_m: f64,
    pub cell_max_m: f64,
    pub time: SectionTime,
    pub pipes: Vec<Pipe>,
    pub probes: Vec<Probe>,
    pub inclusions: Vec<Inclusion>,
    /// Times of the field plots, s from the start.
    pub snapshots_s: Vec<f64>,
    /// Between the surface temperature and the ground; 0 = the surface temperature is imposed.
    pub surface_resistance_m2_k_per_w: f64,
}

/// Transient over a duration at a fixed step, or the steady state (annual-mean surface and fluid
/// temperatures).
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum SectionTime {
    Steady,
    Transient { duration_s: f64, step_s: f64 },
}

/// A point whose temperature is recorded.
#[derive(Clone, Debug, PartialEq)]
pub struct Probe {
    pub id: String,
    pub x_m: f64,
    pub depth_m: f64,
}

/// An axis-aligned rectangle of another material (an insulation board, a duct bank).
#[derive(Clone, Debug, PartialEq)]
pub struct Inclusion {
    pub id: String,
    /// Horizontal centre.
    pub x_m: f64,
    /// Depth of the top edge.
    pub depth_m: f64,
    pub width_m: f64,
    pub height_m: f64,
    pub conductivity_w_per_m_k: f64,
    pub heat_capacity_j_per_m3_k: f64,
}

/// A pipe in a cross-section (the same in every study kind). `x` across, `depth` down to the
/// centre; cover = depth − outer radius.
#[derive(Clone, Debug, PartialEq)]
pub struct Pipe {
    pub id: String,
    pub x_m: f64,
    pub depth_m: f64,
    pub outer_diameter_m: f64,
    /// Wall layers from the inside out.
    pub layers: Vec<WallLayer>,
    pub drive: PipeDrive,
}

#[derive(Clone, Debug, PartialEq)]
pub struct WallLayer {
    pub name: String,
    pub thickness_m: f64,
    /// With an [`InsulationLaw`], its design value at 50 °C (the aged λ50).
    pub conductivity_w_per_m_k: f64,
    /// Insulation conductivity by EN 253 practice; the heat-loss study evaluates it at the
    /// layer's mean temperature, other kinds use `conductivity_w_per_m_k`.
    pub insulation_law: Option<InsulationLaw>,
}

/// Insulation conductivity by EN 253 practice: `λ(T) = λ50·(1 + ageing) + slope·(T − 50 °C)`.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct InsulationLaw {
    /// Fresh λ50 (at a mean temperature of 50 °C), W/(m K).
    pub lambda_50_w_per_m_k: f64,
    /// dλ/dT, W/(m K²).
    pub slope_w_per_m_k2: f64,
    /// Relative allowance for ageing (0.15 = +15 %).
    pub ageing: f64,
}

/// What sets a pipe's heat exchange with the ground.
#[derive(Clone, Debug, PartialEq)]
pub enum PipeDrive {
    /// Fluid temperature, one per month (twelve equal values when constant).
    FluidTemperature { monthly_c: [f64; 12] },
    /// Heat given to the ground per metre of pipe (negative: taken from it).
    HeatToGround { w_per_m: f64 },
}

impl Pipe {
    pub fn outer_radius_m(&self) -> f64 {
        self.outer_diameter_m / 2.0
    }

    /// Radius inside the innermost wall layer.
    pub fn inner_radius_m(&self) -> f64 {
        self.outer_radius_m() - self.layers.iter().map(|l| l.thickness_m).sum::<f64>()
    }

    /// Depth of the crown (top of the outer surface) below the ground surface.
    pub fn cover_m(&self) -> f64 {
        self.depth_m - self.outer_radius_m()
    }
}

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
    /// First day (month 1–12, day of month) of the freezing season the index is counted over.
    pub season_start: (u32, u32),
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

/// A field of vertical ground heat exchangers (boreholes) serving a heat pump: layout, borehole
/// and loop, antifreeze, ground loads over the design life, and the limits on the mean fluid
/// temperature.
#[derive(Clone, Debug, PartialEq)]
pub struct Borefield {
    /// Borehole positions (x, y), m.
    pub positions_m: Vec<(f64, f64)>,
    /// How the layout was given, for the report (e.g. "3 × 4 rectangle, 6 m spacing").
    pub layout_description: String,
    /// Active (heat-exchanging) length H of every borehole, m; the start of the search when
    /// `size` is set.
    pub active_length_m: f64,
    /// Depth D of the top of the active length below the surface, m.
    pub top_depth_m: f64,
    pub borehole_radius_m: f64,
    pub exchanger: HeatExchanger,
    pub grout_conductivity_w_per_m_k: f64,
    /// A measured effective borehole resistance (thermal response test), m K/W; replaces the
    /// calculated one.
    pub measured_resistance_m_k_per_w: Option<f64>,
    pub fluid: crate::materials::fluids::Fluid,
    /// Volume flow through one borehole (all its circuits together), m3/s.
    pub flow_per_borehole_m3_per_s: f64,
    pub loads: GroundLoads,
    /// Limits on the mean fluid temperature, °C.
    pub min_fluid_c: f64,
    pub max_fluid_c: f64,
    /// Design life in model months (730 h each).
    pub design_life_months: usize,
    pub wall_condition: BoreholeWall,
    /// Find the active length that meets the limits.
    pub size: bool,
    /// Segments per borehole for the uniform-wall-temperature g-function.
    pub segments: usize,
    /// Wire-to-water efficiency of the circulation pump, 0..1.
    pub pump_efficiency: f64,
    /// A measured ground conductivity (thermal response test), W/(m K); replaces the
    /// depth-averaged conductivity of the soil layers.
    pub ground_conductivity_w_per_m_k: Option<f64>,
}

/// The condition at the borehole walls for the g-function.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum BoreholeWall {
    UniformTemperature,
    UniformHeatFlux,
}

/// The loop inside a borehole.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum HeatExchanger {
    SingleU {
        pipe: LoopPipe,
        /// Centre-to-centre distance of the two legs, m.
        shank_spacing_m: f64,
    },
    /// Two U-tubes in parallel, sharing the flow equally.
    DoubleU {
        pipe: LoopPipe,
        /// Centre-to-centre distance of diagonally opposite legs, m.
        shank_spacing_m: f64,
        pairing: crate::physics::borehole::DoubleUPairing,
    },
    /// An inner pipe inside an outer pipe; one stream in each.
    Coaxial { inner: LoopPipe, outer: LoopPipe },
}

/// A plastic or metal pipe of a borehole loop.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LoopPipe {
    pub outer_diameter_m: f64,
    pub wall_m: f64,
    pub conductivity_w_per_m_k: f64,
    /// Absolute roughness of the inner surface, m.
    pub roughness_m: f64,
}

impl LoopPipe {
    pub fn inner_diameter_m(&self) -> f64 {
        self.outer_diameter_m - 2.0 * self.wall_m
    }
}

/// Heat exchanged with the ground by the whole field. Energies in J, powers in W; `extracted`
/// is taken from the ground (heating), `injected` given to it (cooling).
#[derive(Clone, Debug, PartialEq)]
pub enum GroundLoads {
    /// Ground-side monthly energies and peaks, January first; repeated every year.
    Monthly {
        extracted_j: [f64; 12],
        injected_j: [f64; 12],
        peak_extraction_w: [f64; 12],
        peak_injection_w: [f64; 12],
        peak_duration_s: f64,
    },
    /// Building-side monthly energies and peaks, turned into ground loads with the heat pump's
    /// COP and EER.
    Building {
        heating_j: [f64; 12],
        cooling_j: [f64; 12],
        peak_heating_w: [f64; 12],
        peak_cooling_w: [f64; 12],
        cop: f64,
        eer: f64,
        peak_duration_s: f64,
    },
    /// 8760 hourly ground loads, W, positive = extracted; repeated every year.
    Hourly { extracted_w: Vec<f64>, source: String },
    /// One load for the whole design life, W, positive = extracted.
    Constant { extracted_w: f64 },
}
