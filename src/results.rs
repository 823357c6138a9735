//! The plain result types that `results.json` serialises (the contract in product.md). Figures
//! carry their unit in the key. Report writers read these; nothing here computes.

use serde::Serialize;

pub use crate::kinds::Figures;

#[derive(Clone, Debug, Serialize)]
pub struct Results {
    pub tool: Tool,
    pub site: SiteInfo,
    pub ground: GroundResults,
    pub studies: Vec<StudyResult>,
    /// Studies that could not be run, each with the reason (the other studies still ran).
    pub failed_studies: Vec<StudyFailure>,
    pub warnings: Vec<Warning>,
}

/// A study that failed to run: which, and why (one sentence).
#[derive(Clone, Debug, Serialize, PartialEq)]
pub struct StudyFailure {
    pub id: String,
    pub kind: String,
    pub reason: String,
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
    /// Deepest depth at which the soil freezes in the typical year (0 when it never does; null
    /// when it is still frozen at the bottom of the profile, as in permafrost).
    pub max_frost_depth_m: Option<f64>,
    /// Perennially frozen ground, when the undisturbed annual maximum lies below 0 °C at some
    /// depth.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub permafrost: Option<PermafrostFigures>,
    /// Years of spin-up the numerical profile needed (0 for the closed form).
    pub spin_up_years: usize,
    /// |heat in − heat out − Δstored| / throughput of the numerical profile's last year.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub energy_balance_relative_error: Option<f64>,
}

/// Perennially frozen ground in the undisturbed profile.
#[derive(Clone, Copy, Debug, Serialize, PartialEq)]
pub struct PermafrostFigures {
    /// Depth of the seasonal thaw (the layer that thaws and refreezes each year).
    pub active_layer_depth_m: f64,
    /// Depth of the top of the perennially frozen ground (deeper than the active layer where an
    /// unfrozen layer lies between them).
    pub permafrost_table_depth_m: f64,
    /// Mean annual ground temperature below the annual swing.
    pub mean_annual_ground_temperature_c: f64,
}

impl PermafrostFigures {
    pub fn from_profile(p: &crate::ground::profile::Permafrost) -> Self {
        Self {
            active_layer_depth_m: p.active_layer_m,
            permafrost_table_depth_m: p.table_m,
            mean_annual_ground_temperature_c: p.mean_annual_c,
        }
    }
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
    /// The study's design decisions: each limit or rule it checked, passed or failed.
    pub checks: Vec<Check>,
    /// The assumptions the study used (constants, tolerances, defaults), with their sources.
    pub assumptions: Vec<Assumption>,
    /// The figures that decide the study, with where to find each in the study's entry.
    pub decisive_figures: Vec<DecisiveFigure>,
}

/// One design decision of a study: a figure against its limit or rule.
#[derive(Clone, Debug, Serialize, PartialEq)]
pub struct Check {
    /// burrow's dotted name for the check, e.g. `frost.cover`.
    pub code: String,
    pub passed: bool,
    /// The figure checked and the limit it is held to (null where the check is not numeric).
    pub value: Option<f64>,
    pub limit: Option<f64>,
    /// Unit of `value` and `limit`, as the report prints it.
    pub unit: String,
    /// One sentence saying what was checked and how it came out.
    pub message: String,
}

impl Check {
    pub fn new(
        code: &str,
        passed: bool,
        value: Option<f64>,
        limit: Option<f64>,
        unit: &str,
        message: String,
    ) -> Self {
        Self {
            code: code.into(),
            passed,
            value,
            limit,
            unit: unit.into(),
            message,
        }
    }
}

/// A constant, tolerance or default a study used, for the report and the record.
#[derive(Clone, Debug, Serialize, PartialEq)]
pub struct Assumption {
    pub name: String,
    pub value: f64,
    pub unit: String,
    /// Where the value comes from (a standard, a paper, `common practice, no source`).
    pub source: String,
}

impl Assumption {
    pub fn new(name: &str, value: f64, unit: &str, source: &str) -> Self {
        Self {
            name: name.into(),
            value,
            unit: unit.into(),
            source: source.into(),
        }
    }
}

/// Which direction of a decisive figure is unsafe or costly.
#[derive(Clone, Copy, Debug, Serialize, PartialEq, Eq)]
#[serde(rename_all = "lowercase")]
pub enum Worse {
    Higher,
    Lower,
}

/// A figure that decides a study.
#[derive(Clone, Debug, Serialize, PartialEq)]
pub struct DecisiveFigure {
    /// Dotted path of the figure in the study's entry of `results.json`
    /// (`fluid_temperature.min_c`, `active_length_m`).
    pub key: String,
    pub value: f64,
    pub unit: String,
    pub label: String,
    pub worse: Worse,
    /// True for a value the study found (a length, a thickness, a cover).
    pub sized: bool,
    /// The check that holds this figure to a limit, if any.
    pub check: Option<String>,
}

impl DecisiveFigure {
    pub fn new(key: &str, value: f64, unit: &str, label: &str, worse: Worse) -> Self {
        Self {
            key: key.into(),
            value,
            unit: unit.into(),
            label: label.into(),
            worse,
            sized: false,
            check: None,
        }
    }

    /// Marks the figure as one the study found.
    pub fn sized(mut self) -> Self {
        self.sized = true;
        self
    }

    /// Names the check that holds the figure to a limit.
    pub fn checked_by(mut self, code: &str) -> Self {
        self.check = Some(code.into());
        self
    }
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
