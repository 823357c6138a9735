//! `kind: frost`: design freezing index, frost depth, and whether a water main is safe.

use super::MethodDoc;
use crate::model::{Frost, Method};
use crate::site::diagnostic::KeyPath;
use crate::site::doc::PipeDoc;
use crate::site::quantity::*;
use crate::site::validate::{self, Validator};
use schemars::JsonSchema;
use serde::Deserialize;

/// The methods this kind offers (the numerical run arrives with the engine).
pub const METHODS: [Method; 1] = [Method::Analytic];

/// Frost penetration under the site's climate and whether a water main at its cover stays
/// frost-free.
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct FrostDoc {
    /// A unique name for the study, used in the report and in file names (letters, digits, `-`,
    /// `_`, `.`).
    pub id: String,
    /// `analytic` (Stefan and modified Berggren, the default).
    #[serde(default)]
    pub method: Option<MethodDoc>,
    /// The main or service line to check (optional).
    #[serde(default)]
    pub pipe: Option<PipeDoc>,
    /// A design AIR freezing index from a local design table; overrides the one derived from the
    /// climate and is turned into a surface index with the freezing n-factor.
    #[serde(default)]
    pub design_freezing_index: Option<Q<DegreeDays>>,
    /// Surface type whose n-factors replace the climate's (see `burrow materials`): e.g. `turf`,
    /// `snow-cleared-asphalt`.
    #[serde(default)]
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
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct StagnantDoc {
    /// How long the water stands still.
    pub duration: Q<Time>,
}

pub fn validate(doc: &FrostDoc, path: &KeyPath, v: &mut Validator) -> Option<Frost> {
    let pipe = match &doc.pipe {
        None => Some(None),
        Some(p) => validate::pipes(std::slice::from_ref(p), &path.key("pipe"), v).map(|mut p| p.pop()),
    };
    let index = v.opt_q(&doc.design_freezing_index, &path.key("design_freezing_index"));
    let index = match index {
        Some(Some(f)) if f < 0.0 => {
            v.out.error(
                &path.key("design_freezing_index"),
                "a freezing index cannot be negative",
            );
            None
        }
        other => other,
    };
    let surface = match &doc.surface {
        None => Some(None),
        Some(name) => match crate::physics::frost::n_factor_preset(name) {
            Ok(p) => Some(Some(p.key.to_string())),
            Err(_) => {
                let names: Vec<&str> = crate::physics::frost::n_factor_presets()
                    .iter()
                    .map(|p| p.key)
                    .collect();
                v.out.error(
                    &path.key("surface"),
                    format!("`{name}` is not a surface type; use one of: {}", names.join(", ")),
                );
                None
            }
        },
    };
    let return_period = match &doc.return_period {
        None => Some(None),
        Some(q) => {
            let t = v.q(q, &path.key("return_period"));
            let years = t.map(|t| t / crate::model::YEAR_S);
            v.within(
                years,
                (1.01, 1000.0),
                &path.key("return_period"),
                "the return period in years",
            )
            .map(Some)
        }
    };
    let margin = match &doc.margin {
        None => Some(crate::physics::frost::DEFAULT_FROST_MARGIN_M),
        Some(q) => {
            let m = v.q(q, &path.key("margin"));
            v.within(m, (0.0, 5.0), &path.key("margin"), "the margin")
        }
    };
    let stagnant = match &doc.stagnant {
        None => Some(None),
        Some(s) => v
            .positive_q(
                &s.duration,
                &path.key("stagnant").key("duration"),
                "the stagnant period",
            )
            .map(Some),
    };
    if doc.stagnant.is_some() && doc.pipe.is_none() {
        v.out.error(
            &path.key("stagnant"),
            "a stagnant period needs a `pipe` to hold the water",
        );
        return None;
    }
    Some(Frost {
        pipe: pipe?,
        design_air_freezing_index_c_days: index?,
        surface_preset: surface?,
        return_period_years: return_period?,
        margin_m: margin?,
        stagnant_s: stagnant?,
    })
}
