//! The validated site model: every value in the model's units (m, °C, K, s, W, J, W/(m K),
//! J/(m3 K), ...), every reference resolved, no strings to interpret. Studies and the ground
//! module read only this; nothing here knows YAML or unit spellings.

/// Length of the model day and year (365 days; leap days are ignored by every study).
pub use crate::numerics::time::{DAY_S, YEAR_S};

pub use crate::kinds::StudyKind;

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
