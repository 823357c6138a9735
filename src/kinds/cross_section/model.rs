//! The validated model of a `kind: cross-section` study, in model units.

use crate::model::Pipe;

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
