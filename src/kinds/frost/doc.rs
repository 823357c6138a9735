//! The site-file keys of `kind: frost`: design freezing index, frost depth, and whether a water main is safe.
//!
//! Doc comments here become the schema's descriptions: write them for the user.

use crate::site::doc::MethodDoc;
use crate::site::doc::PipeDoc;
use crate::site::quantity::*;
use schemars::JsonSchema;
use serde::Deserialize;

/// Frost penetration under the site's climate and whether a water main at its cover stays
/// frost-free.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct FrostDoc {
    /// A unique name for the study, used in the report and in file names (letters, digits, `-`,
    /// `_`, `.`).
    pub id: String,
    /// `analytic` (Stefan and modified Berggren, the default), `numerical` (the finite-volume
    /// engine's run of the design winter with the pipe in place, after two spin-up years) or
    /// `both`.
    #[serde(default)]
    pub method: Option<MethodDoc>,
    /// The main or service line to check (optional).
    #[serde(default)]
    pub pipe: Option<PipeDoc>,
    /// A design AIR freezing index from a local design table; overrides the one derived from the
    /// climate and is turned into a surface index with the freezing n-factor.
    #[serde(default)]
    pub design_freezing_index: Option<Q<DegreeDays>>,
    // Its schema (and so its description, which lists every preset) is generated from the
    // table of surface presets by `surface_schema`.
    #[serde(default)]
    #[schemars(schema_with = "surface_schema")]
    pub surface: Option<String>,
    /// Return period of the design winter (Gumbel fit of the seasonal indices of a multi-year
    /// series); default: the mean of the three coldest winters (TM 5-852-6).
    #[serde(default)]
    pub return_period: Option<Q<Time>>,
    /// Clearance between the frost depth and the pipe crown for the required cover (default 0.2 m,
    /// common practice).
    #[serde(default)]
    pub margin: Option<Q<Length>>,
    /// A period without flow in the coldest weather: how long the water stands.
    #[serde(default)]
    pub stagnant: Option<StagnantDoc>,
    /// First day of the freezing season over which the freezing index is counted, as `MM-DD`
    /// (default: the warmest day of the site's typical surface year, found from the climate, so
    /// that no winter is cut in two in either hemisphere; the results say which day was used).
    #[serde(default)]
    pub season_start: Option<String>,
    /// Find the flow that keeps the water above freezing along a length of main in the coldest
    /// ground (needs a pipe driven by its water temperature).
    #[serde(default)]
    pub bleed: Option<Box<BleedDoc>>,
    /// An insulation board laid flat above the main: when frost reaches the main, the study
    /// finds the narrowest width that keeps the crown above 0 °C (engine runs).
    #[serde(default)]
    pub board: Option<Box<BoardDoc>>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct BleedDoc {
    /// Length of main between the warm supply and the far end, in m.
    pub length: Q<Length>,
    /// Lowest water temperature allowed at the far end, in °C (default 0 °C).
    #[serde(default)]
    pub min_temperature: Option<Q<Temperature>>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct BoardDoc {
    /// Board thickness, in m.
    pub thickness: Q<Length>,
    /// Board thermal conductivity, in W/(m K) (extruded polystyrene about 0.03–0.04).
    pub conductivity: Q<Conductivity>,
    /// Board volumetric heat capacity, in J/(m3 K) (default 0.05e6, extruded polystyrene).
    #[serde(default)]
    pub heat_capacity: Option<Q<VolumetricHeatCapacity>>,
    /// Clear distance between the board's underside and the pipe crown, in m (default 0.1 m).
    #[serde(default)]
    pub gap: Option<Q<Length>>,
    /// Widest board to try, in m (default 3 m).
    #[serde(default)]
    pub max_width: Option<Q<Length>>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct StagnantDoc {
    /// How long the water stands still.
    pub duration: Q<Time>,
}

/// The schema of `surface`: the n-factor presets' keys, from the one table of them.
fn surface_schema(_: &mut schemars::SchemaGenerator) -> schemars::Schema {
    let presets = crate::physics::frost::n_factor_presets();
    let names: Vec<&str> = presets.iter().map(|p| p.key).collect();
    let description = format!(
        "Surface type whose n-factors replace the climate's (see `burrow materials`): {}.",
        names
            .iter()
            .map(|n| format!("`{n}`"))
            .collect::<Vec<_>>()
            .join(", ")
    );
    schemars::json_schema!({
        "type": "string",
        "enum": names,
        "description": description,
    })
}
