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

/// One study's figures. Each kind adds its own keys beside the common ones.
#[derive(Clone, Debug, Serialize)]
pub struct StudyResult {
    pub id: String,
    pub kind: String,
    pub method: String,
    #[serde(flatten)]
    pub figures: serde_json::Map<String, serde_json::Value>,
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
