//! The site-file keys of `kind: borefield`: a field of ground heat exchangers for a heat pump — its g-function,
//! borehole resistance, fluid temperatures over the design life, and the length that keeps them
//! inside the limits.
//!
//! Doc comments here become the schema's descriptions: write them for the user.

use crate::site::doc::MethodDoc;
use crate::site::quantity::*;
use schemars::JsonSchema;
use serde::Deserialize;

/// A field of vertical ground heat exchangers (boreholes) serving a heat pump.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
#[schemars(extend("x-renamed" = {"size": "find: length"}))]
pub struct BorefieldDoc {
    /// A unique name for the study, used in the report and in file names (letters, digits, `-`,
    /// `_`, `.`).
    pub id: String,
    /// `analytic` (g-functions with temporal superposition; the only method of this kind).
    #[serde(default)]
    pub method: Option<MethodDoc>,
    /// Where the boreholes are: a rectangle of rows × columns, or a list of points.
    pub layout: LayoutDoc,
    /// The borehole geometry (the same for every borehole).
    pub borehole: BoreholeDoc,
    /// The pipes in each borehole and the grout around them.
    pub heat_exchanger: HeatExchangerDoc,
    /// The heat-carrier fluid and its flow.
    pub fluid: BoreFluidDoc,
    /// Heat exchanged with the ground by the whole field: give exactly one of `monthly`,
    /// `building`, `hourly` or `constant`.
    pub loads: LoadsDoc,
    /// Limits on the MEAN fluid temperature (mean of the field's inlet and outlet).
    pub limits: LimitsDoc,
    /// How long the field must serve (whole months; e.g. `25 years`).
    pub design_life: Q<Time>,
    /// Condition at the borehole walls for the g-function: `uniform-temperature` (default) or
    /// `uniform-heat-flux`.
    #[serde(default)]
    pub wall_condition: Option<WallConditionDoc>,
    /// `length`: find the shortest active length that keeps the fluid inside the limits (the
    /// layout stays as given).
    #[serde(default)]
    pub find: Option<FindDoc>,
    /// Segments per borehole for the uniform-wall-temperature g-function (default 12).
    #[serde(default)]
    pub segments: Option<usize>,
    /// Wire-to-water efficiency of the circulation pump (default 50 %).
    #[serde(default)]
    pub pump_efficiency: Option<Q<Fraction>>,
    /// A ground conductivity measured by a thermal response test; replaces the depth-averaged
    /// conductivity of the soil layers along the boreholes.
    #[serde(default)]
    pub ground_conductivity: Option<Q<Conductivity>>,
}

/// Where the boreholes stand.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct LayoutDoc {
    /// A rectangular grid of boreholes.
    #[serde(default)]
    pub rectangle: Option<RectangleDoc>,
    /// Borehole positions as `[x, y]` pairs (plain numbers in metres).
    #[serde(default)]
    pub points: Option<Vec<Vec<Q<Length>>>>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct RectangleDoc {
    pub rows: usize,
    pub columns: usize,
    /// Distance between neighbouring boreholes, centre to centre.
    pub spacing: Q<Length>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct BoreholeDoc {
    /// Heat-exchanging length H of each borehole (the starting value when sizing).
    pub active_length: Q<Length>,
    /// Depth of the top of the active length below the surface (default 0).
    #[serde(default)]
    pub top_depth: Option<Q<Length>>,
    /// Drilled diameter.
    pub diameter: Q<Length>,
}

/// The pipes in a borehole; `type` says which.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(tag = "type", rename_all = "kebab-case", deny_unknown_fields)]
pub enum HeatExchangerDoc {
    /// One U-tube: a downward and an upward leg.
    SingleU {
        pipe: LoopPipeDoc,
        /// Distance between the centres of the two legs.
        shank_spacing: Q<Length>,
        /// Conductivity of the grout (backfill) in the borehole.
        grout_conductivity: Q<Conductivity>,
        /// A measured effective borehole resistance; replaces the calculated one.
        #[serde(default)]
        borehole_resistance: Option<Q<LinearResistance>>,
    },
    /// Two U-tubes in parallel, sharing the flow equally.
    DoubleU {
        pipe: LoopPipeDoc,
        /// Distance between the centres of diagonally opposite legs.
        shank_spacing: Q<Length>,
        /// Conductivity of the grout (backfill) in the borehole.
        grout_conductivity: Q<Conductivity>,
        /// How the legs are joined: `diagonal` (default: the two downward legs side by side) or
        /// `adjacent`.
        #[serde(default)]
        pairing: Option<PairingDoc>,
        /// A measured effective borehole resistance; replaces the calculated one.
        #[serde(default)]
        borehole_resistance: Option<Q<LinearResistance>>,
    },
    /// An inner pipe centred in an outer pipe; one stream in the inner pipe, the other in the
    /// annulus.
    Coaxial {
        inner_pipe: LoopPipeDoc,
        outer_pipe: LoopPipeDoc,
        /// Conductivity of the grout between the outer pipe and the borehole wall.
        grout_conductivity: Q<Conductivity>,
        /// A measured effective borehole resistance; replaces the calculated one.
        #[serde(default)]
        borehole_resistance: Option<Q<LinearResistance>>,
    },
}

#[derive(Clone, Copy, Debug, Deserialize, JsonSchema)]
#[serde(rename_all = "kebab-case")]
pub enum PairingDoc {
    Diagonal,
    Adjacent,
}

/// A loop pipe.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct LoopPipeDoc {
    pub outer_diameter: Q<Length>,
    /// Wall thickness.
    pub wall: Q<Length>,
    /// Conductivity of the pipe material (PE 100 about 0.4 W/(m K)).
    pub conductivity: Q<Conductivity>,
    /// Absolute roughness of the inner surface (default 1.5 µm, smooth plastic).
    #[serde(default)]
    pub roughness: Option<Q<Length>>,
}

/// The heat-carrier fluid.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct BoreFluidDoc {
    /// `water`, `propylene-glycol`, `ethylene-glycol` or `ethanol` (see `burrow materials`).
    pub mixture: String,
    /// Mass fraction of the additive (e.g. `25 %`); 0 or absent for water.
    #[serde(default)]
    pub concentration: Option<Q<Fraction>>,
    /// Volume flow through one borehole (all its circuits together).
    pub flow_per_borehole: Q<VolumeFlow>,
}

/// Heat exchanged with the ground by the whole field.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct LoadsDoc {
    /// Ground-side monthly energies and peaks.
    #[serde(default)]
    pub monthly: Option<MonthlyLoadsDoc>,
    /// Building-side monthly energies and peaks, turned into ground loads with the heat pump's
    /// COP and EER: from the ground = heating·(1 − 1/COP), to the ground = cooling·(1 + 1/EER).
    #[serde(default)]
    pub building: Option<BuildingLoadsDoc>,
    /// A CSV file of 8760 hourly ground loads in W (first column; an optional header row;
    /// positive = from the ground), repeated every year. Path relative to the site file.
    #[serde(default)]
    pub hourly: Option<String>,
    /// One load for the whole design life (positive = from the ground).
    #[serde(default)]
    pub constant: Option<Q<Power>>,
}

/// Monthly ground loads, January first.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
#[schemars(extend("x-renamed" = {
    "extracted": "from_ground",
    "injected": "to_ground",
    "peak_extraction": "peak: {from_ground}",
    "peak_injection": "peak: {to_ground}",
    "peak_hours": "peak: {duration}"
}))]
pub struct MonthlyLoadsDoc {
    /// Heat the field gives the heat pump each month, taken from the ground (12 values; plain
    /// numbers in kWh).
    #[schemars(length(min = 12, max = 12))]
    pub from_ground: Vec<Q<Energy>>,
    /// Heat the field takes back each month, given to the ground (12 values; plain numbers in
    /// kWh).
    #[schemars(length(min = 12, max = 12))]
    pub to_ground: Vec<Q<Energy>>,
    /// The highest load of each month in each direction and how long it lasts (optional;
    /// default: no peak above the monthly mean).
    #[serde(default)]
    pub peak: Option<MonthlyPeakDoc>,
}

/// The peaks of the monthly ground loads.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct MonthlyPeakDoc {
    /// Peak heat flow from the ground in each month (12 values; plain numbers in W).
    #[serde(default)]
    #[schemars(length(min = 12, max = 12))]
    pub from_ground: Option<Vec<Q<Power>>>,
    /// Peak heat flow to the ground in each month (12 values; plain numbers in W).
    #[serde(default)]
    #[schemars(length(min = 12, max = 12))]
    pub to_ground: Option<Vec<Q<Power>>>,
    /// How long each peak lasts (default 6 h).
    #[serde(default)]
    pub duration: Option<Q<Time>>,
}

/// Monthly building loads, January first.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
#[schemars(extend("x-renamed" = {
    "peak_heating": "peak: {heating}",
    "peak_cooling": "peak: {cooling}",
    "peak_hours": "peak: {duration}"
}))]
pub struct BuildingLoadsDoc {
    /// Heat delivered to the building each month (12 values; plain numbers in kWh).
    #[schemars(length(min = 12, max = 12))]
    pub heating: Vec<Q<Energy>>,
    /// Heat removed from the building each month (12 values; plain numbers in kWh).
    #[schemars(length(min = 12, max = 12))]
    pub cooling: Vec<Q<Energy>>,
    /// The highest building load of each month and how long it lasts (optional; default: no
    /// peak above the monthly mean).
    #[serde(default)]
    pub peak: Option<BuildingPeakDoc>,
    /// Seasonal coefficient of performance of the heat pump in heating.
    pub cop: f64,
    /// Seasonal energy-efficiency ratio in cooling (give any positive value when there is no
    /// cooling).
    pub eer: f64,
}

/// The peaks of the monthly building loads.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct BuildingPeakDoc {
    /// Peak heating of each month (12 values; plain numbers in W).
    #[serde(default)]
    #[schemars(length(min = 12, max = 12))]
    pub heating: Option<Vec<Q<Power>>>,
    /// Peak cooling of each month (12 values; plain numbers in W).
    #[serde(default)]
    #[schemars(length(min = 12, max = 12))]
    pub cooling: Option<Vec<Q<Power>>>,
    /// How long each peak lasts (default 6 h).
    #[serde(default)]
    pub duration: Option<Q<Time>>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct LimitsDoc {
    /// Lowest acceptable mean fluid temperature.
    pub min_fluid: Q<Temperature>,
    /// Highest acceptable mean fluid temperature.
    pub max_fluid: Q<Temperature>,
}

#[derive(Clone, Copy, Debug, Deserialize, JsonSchema)]
#[serde(rename_all = "kebab-case")]
pub enum WallConditionDoc {
    UniformTemperature,
    UniformHeatFlux,
}

/// What a borefield study finds.
#[derive(Clone, Copy, Debug, Deserialize, JsonSchema)]
#[serde(rename_all = "kebab-case")]
pub enum FindDoc {
    /// The shortest active length H of every borehole that keeps the fluid inside its limits.
    Length,
}
