//! The site file as written: the Rust types that the JSON Schema is generated from and that the
//! YAML is deserialised into. Physical fields are [`Q`] values, still in the user's units; the
//! conversion to the SI model and the checks of physical sense live in `validate`.
//!
//! Doc comments here become the schema's descriptions: write them for the user.

use super::quantity::*;
use schemars::JsonSchema;
use serde::Deserialize;

pub use crate::kinds::StudyDoc;

/// A burrow site file: where the site is, what drives its ground surface, its soil, and the
/// studies to run.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
#[schemars(title = "burrow site file")]
pub struct SiteDoc {
    pub site: SiteInfoDoc,
    pub climate: ClimateDoc,
    pub ground: GroundDoc,
    /// The studies to run, in order. An empty list reports the undisturbed ground only.
    #[serde(default)]
    pub studies: Vec<StudyDoc>,
}

/// What the site is called.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct SiteInfoDoc {
    /// Free text shown on the report.
    pub name: String,
    /// Optional free text: the design question, the client, the project number.
    #[serde(default)]
    pub description: Option<String>,
}

/// What drives the temperature of the ground surface.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(tag = "model", rename_all = "kebab-case", deny_unknown_fields)]
pub enum ClimateDoc {
    /// A sinusoidal annual wave of the ground-SURFACE temperature.
    AnnualWave {
        /// Annual mean ground-surface temperature.
        mean: Q<Temperature>,
        /// Half the annual swing of the surface temperature.
        amplitude: Q<TemperatureDifference>,
        /// Day of the year (1 = 1 January) on which the surface is coldest.
        coldest_day: f64,
    },
    /// Twelve monthly mean AIR temperatures, January first, turned into surface temperatures by
    /// the n-factors.
    MonthlyAir {
        /// Twelve monthly mean air temperatures, January to December.
        #[schemars(length(min = 12, max = 12))]
        air: Vec<Q<Temperature>>,
        /// Ratio of the surface to the air freezing index (default 1: surface = air).
        #[serde(default)]
        n_factor_freezing: Option<f64>,
        /// Ratio of the surface to the air thawing index (default 1: surface = air).
        #[serde(default)]
        n_factor_thawing: Option<f64>,
    },
    /// A CSV file of daily or hourly AIR temperatures, turned into surface temperatures by the
    /// n-factors.
    Series {
        /// Path of the CSV file, relative to the site file. First column: the date
        /// (`2031-01-15`) or date and time (`2031-01-15T06:00`); a header row names the columns.
        file: String,
        /// Header of the column holding the air temperature (default: the second column).
        #[serde(default)]
        column: Option<String>,
        /// Unit of the temperatures in the file: `°C` (default), `°F` or `K`.
        #[serde(default)]
        unit: Option<String>,
        /// Ratio of the surface to the air freezing index (default 1: surface = air).
        #[serde(default)]
        n_factor_freezing: Option<f64>,
        /// Ratio of the surface to the air thawing index (default 1: surface = air).
        #[serde(default)]
        n_factor_thawing: Option<f64>,
    },
    /// The ground surface held at one temperature from t = 0 (a step; for checks).
    Constant {
        /// Surface temperature from t = 0 on.
        temperature: Q<Temperature>,
    },
}

/// The soil: layers from the surface down, and what comes up from below.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct GroundDoc {
    /// Temperature of the whole ground at t = 0 for transient studies. Default: the periodic
    /// undisturbed state that the climate settles into.
    #[serde(default)]
    pub initial_temperature: Option<Q<Temperature>>,
    /// Upward heat flux from the earth's interior (typically 0.04–0.1 W/m2). Default 0.
    #[serde(default)]
    pub geothermal_flux: Option<Q<HeatFlux>>,
    /// Soil layers from the surface down; the last one extends to the bottom of every model.
    #[schemars(length(min = 1))]
    pub layers: Vec<LayerDoc>,
}

/// One soil layer. Give `soil` (a preset: see `burrow materials`) or the properties, or both:
/// properties given override the preset's.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct LayerDoc {
    /// A name for the report.
    pub name: String,
    /// Name of a soil preset whose properties this layer starts from.
    #[serde(default)]
    pub soil: Option<String>,
    /// Layer thickness; may be left out for the last layer, which extends downward.
    #[serde(default)]
    pub thickness: Option<Q<Length>>,
    /// Thermal conductivity of the unfrozen soil.
    #[serde(default)]
    pub conductivity: Option<Q<Conductivity>>,
    /// Volumetric heat capacity of the unfrozen soil.
    #[serde(default)]
    pub heat_capacity: Option<Q<VolumetricHeatCapacity>>,
    /// Thermal conductivity of the frozen soil (default: the unfrozen value).
    #[serde(default)]
    pub frozen_conductivity: Option<Q<Conductivity>>,
    /// Volumetric heat capacity of the frozen soil (default: the unfrozen value).
    #[serde(default)]
    pub frozen_heat_capacity: Option<Q<VolumetricHeatCapacity>>,
    /// Volumetric water content (0 to 1, or a percentage); its freezing releases latent heat.
    /// 0 means the layer never freezes.
    #[serde(default)]
    pub water_content: Option<Q<Fraction>>,
    /// Temperature interval below 0 °C over which the soil water freezes (default 0.5 K).
    #[serde(default)]
    pub freezing_interval: Option<Q<TemperatureDifference>>,
}

/// A pipe in a cross-section, described the same way in every study kind.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct PipeDoc {
    /// A name unique within the study.
    pub id: String,
    /// Horizontal position of the centre; 0 is the middle of the study's cross-section.
    #[serde(default)]
    pub x: Option<Q<Length>>,
    /// Depth of the pipe's CENTRE below the ground surface (or give `cover`).
    #[serde(default)]
    pub depth: Option<Q<Length>>,
    /// Instead of `depth`: the cover, from the ground surface down to the pipe's crown (the top
    /// of its outer surface); depth = cover + outer diameter / 2.
    #[serde(default)]
    pub cover: Option<Q<Length>>,
    /// Outermost diameter (over the casing or jacket).
    pub outer_diameter: Q<Length>,
    /// Wall layers from the inside out (carrier, insulation, casing); may be empty.
    #[serde(default)]
    pub layers: Vec<WallLayerDoc>,
    /// What flows inside: a temperature (one value or 12 monthly values).
    #[serde(default)]
    pub fluid: Option<PipeFluidDoc>,
    /// Instead of `fluid`: heat given to the ground per metre of pipe (negative = taken from it).
    #[serde(default)]
    pub heat_to_ground: Option<Q<LinearHeatRate>>,
}

/// One cylindrical wall layer.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct WallLayerDoc {
    /// A name, e.g. steel, insulation, casing.
    pub name: String,
    /// Radial thickness of the layer.
    pub thickness: Q<Length>,
    /// Thermal conductivity of the layer material: a value, or for insulation the EN 253 form
    /// `{lambda_50, slope, ageing}` (heat-loss studies evaluate it at the layer's mean
    /// temperature; other kinds use its value at 50 °C).
    pub conductivity: LayerConductivityDoc,
}

/// A wall layer's conductivity.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(untagged)]
pub enum LayerConductivityDoc {
    Value(Q<Conductivity>),
    Insulation(InsulationConductivityDoc),
}

/// Insulation conductivity by EN 253 practice: `λ(T) = λ50·(1 + ageing) + slope·(T − 50 °C)`,
/// `T` the layer's mean temperature.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct InsulationConductivityDoc {
    /// Conductivity of the fresh insulation at a mean temperature of 50 °C (λ50).
    pub lambda_50: Q<Conductivity>,
    /// Change of conductivity per kelvin of mean temperature, a plain number in W/(m K²)
    /// (default 0).
    #[serde(default)]
    pub slope: Option<f64>,
    /// Relative allowance for ageing over the design life, from the maker's ageing test
    /// (a fraction or a percentage; default 0).
    #[serde(default)]
    pub ageing: Option<Q<Fraction>>,
}

/// The fluid in a pipe.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct PipeFluidDoc {
    /// Fluid temperature: one value, or a list of 12 monthly values (January first).
    pub temperature: OneOrMonthly,
}

/// One value for the whole year, or twelve monthly values.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(untagged)]
pub enum OneOrMonthly {
    One(Q<Temperature>),
    Monthly(#[schemars(length(min = 12, max = 12))] Vec<Q<Temperature>>),
}

/// Which solution to use.
#[derive(Clone, Copy, Debug, Deserialize, JsonSchema, PartialEq, Eq)]
#[serde(rename_all = "kebab-case")]
pub enum MethodDoc {
    Analytic,
    Numerical,
    Both,
}
