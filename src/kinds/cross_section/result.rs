//! The plain result figures of a `kind: cross-section` study (serialised into `results.json`).

use crate::results::Field;
use serde::Serialize;

/// `kind: cross-section` (contract in issue "Transient 2-D conduction engine").
#[derive(Clone, Debug, Serialize)]
pub struct CrossSectionResult {
    pub cells: usize,
    /// Heat from each pipe to the ground, positive.
    pub pipes: Vec<SectionPipeFigures>,
    pub probes: Vec<ProbeFigures>,
    /// Deepest 0 °C isotherm at the section's edge column (away from the pipes), m:
    /// "first ice", interpolated between cell centres.
    pub max_frost_depth_m: Option<f64>,
    pub final_frost_depth_m: Option<f64>,
    /// The enthalpy method's front at the edge column, m: the frozen thickness
    /// Σ f·Δz of its cells (f the frozen fraction of the water), which locates the
    /// front inside its cell (exact for a front from the surface); largest over
    /// the run and at its end. Null for a steady section.
    pub max_front_depth_m: Option<f64>,
    pub final_front_depth_m: Option<f64>,
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
