//! The site-file keys of `kind: cross-section`: a free 2-D section of the ground with pipes, probes and inclusions.
//!
//! Doc comments here become the schema's descriptions: write them for the user.

use crate::site::doc::MethodDoc;
use crate::site::doc::PipeDoc;
use crate::site::quantity::*;
use schemars::JsonSchema;
use serde::Deserialize;

/// A 2-D cross-section of the ground (x across, depth down) solved by the finite-volume engine.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct CrossSectionDoc {
    /// A unique name for the study, used in the report and in file names (letters, digits, `-`,
    /// `_`, `.`).
    pub id: String,
    /// Only `numerical` applies to this kind (the default).
    #[serde(default)]
    pub method: Option<MethodDoc>,
    /// Thermal resistance between the surface temperature and the ground (default 0: the surface
    /// temperature is imposed on the ground).
    #[serde(default)]
    pub surface_resistance: Option<Q<ArealResistance>>,
    /// Size of the section: it spans x = −width/2 … width/2 and depth 0 … depth.
    pub domain: DomainDoc,
    /// Smallest and largest cell size of the grid (default 0.02 m and 0.5 m).
    #[serde(default)]
    pub cell_size: Option<CellSizeDoc>,
    /// A duration and a fixed step, or `steady: true`.
    pub time: TimeDoc,
    /// Pipes in the section.
    #[serde(default)]
    pub pipes: Vec<PipeDoc>,
    /// Points whose temperature is recorded over time.
    #[serde(default)]
    pub probes: Vec<ProbeDoc>,
    /// Rectangles of another material (insulation boards, duct banks, road bases).
    #[serde(default)]
    pub inclusions: Vec<InclusionDoc>,
    /// Times (from the start) at which the temperature field is plotted.
    #[serde(default)]
    pub snapshots: Vec<Q<Time>>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct DomainDoc {
    /// Width of the section.
    pub width: Q<Length>,
    /// Depth of the section's bottom below the surface.
    pub depth: Q<Length>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct CellSizeDoc {
    /// Smallest cell size (near the surface and the pipes).
    pub min: Q<Length>,
    /// Largest cell size (far from everything).
    pub max: Q<Length>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct TimeDoc {
    /// Solve the steady state of the annual-mean surface and fluid temperatures instead.
    #[serde(default)]
    pub steady: Option<bool>,
    /// Simulated time from the start.
    #[serde(default)]
    pub duration: Option<Q<Time>>,
    /// Time step.
    #[serde(default)]
    pub step: Option<Q<Time>>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct ProbeDoc {
    /// A name for the probe.
    pub id: String,
    /// Horizontal position.
    pub x: Q<Length>,
    /// Depth below the surface.
    pub depth: Q<Length>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct InclusionDoc {
    /// A name for the inclusion.
    pub id: String,
    /// Horizontal position of the rectangle's centre.
    pub x: Q<Length>,
    /// Depth of the rectangle's top edge.
    pub depth: Q<Length>,
    /// Horizontal size.
    pub width: Q<Length>,
    /// Vertical size (thickness of a board).
    pub height: Q<Length>,
    /// Thermal conductivity of the material.
    pub conductivity: Q<Conductivity>,
    /// Volumetric heat capacity of the material.
    pub heat_capacity: Q<VolumetricHeatCapacity>,
}
