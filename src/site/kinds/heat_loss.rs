//! `kind: heat-loss`: heat loss of buried district-heating pipes, insulation sizing, and the soil
//! temperature at neighbouring utilities.

use super::MethodDoc;
use crate::model::{Economics, HeatLoss, Neighbour, Sizing};
use crate::site::diagnostic::KeyPath;
use crate::site::doc::PipeDoc;
use crate::site::quantity::*;
use crate::site::validate::{self, Validator};
use schemars::JsonSchema;
use serde::Deserialize;

/// Surface resistance this kind uses unless the study gives one: EN 13941-1 practice
/// (`from memory`: 0.0685 m2 K/W).
pub use crate::physics::buried_pipe::DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W;

/// The methods this kind offers: the analytic figures, alone or with the engine's steady
/// solution beside them as a cross-check.
pub const METHODS: [crate::model::Method; 2] = [crate::model::Method::Analytic, crate::model::Method::Both];

/// Heat loss of buried district-heating pipes (a supply/return pair, or any pipes in one trench).
#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct HeatLossDoc {
    /// A unique name for the study, used in the report and in file names (letters, digits, `-`,
    /// `_`, `.`).
    pub id: String,
    /// `analytic` (line sources with images, the default) or `both` (the analytic figures with the
    /// finite-volume engine's steady solution beside them as a cross-check).
    #[serde(default)]
    pub method: Option<MethodDoc>,
    /// Thermal resistance between the surface temperature and the ground (default 0.0685 m2 K/W,
    /// EN 13941-1 practice; 0 = the surface temperature is imposed on the ground).
    #[serde(default)]
    pub surface_resistance: Option<Q<ArealResistance>>,
    /// Trench length for the route totals.
    #[serde(default)]
    pub length: Option<Q<Length>>,
    /// The pipes in the trench, each with its fluid temperature.
    pub pipes: Vec<PipeDoc>,
    /// Candidate insulation thicknesses to compare.
    #[serde(default)]
    pub sizing: Option<SizingDoc>,
    /// Points whose soil temperature matters (a drinking-water main, a cable).
    #[serde(default)]
    pub neighbours: Vec<NeighbourDoc>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct SizingDoc {
    /// Name of the wall layer whose thickness varies (the outer diameter follows).
    pub layer: String,
    /// Candidate thicknesses of that layer.
    #[schemars(length(min = 1))]
    pub thicknesses: Vec<Q<Length>>,
    /// Largest acceptable heat loss of the whole trench (all pipes together).
    #[serde(default)]
    pub heat_loss_limit: Option<Q<LinearHeatRate>>,
    /// Life-cycle cost comparison of the candidates.
    #[serde(default)]
    pub economic: Option<EconomicDoc>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct EconomicDoc {
    /// Price of the heat lost, in currency units per MWh.
    pub heat_price: f64,
    /// Installed cost of each candidate per metre of trench, in the same currency (one value per
    /// thickness).
    pub cost_per_metre: Vec<f64>,
    /// Years over which the losses are paid.
    pub years: f64,
    /// Real discount rate per year (a fraction or a percentage).
    pub discount_rate: Q<Fraction>,
}

#[derive(Debug, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct NeighbourDoc {
    /// A name for the point.
    pub id: String,
    /// Horizontal position.
    pub x: Q<Length>,
    /// Depth below the surface.
    pub depth: Q<Length>,
    /// Highest acceptable soil temperature there.
    #[serde(default)]
    pub limit: Option<Q<Temperature>>,
}

pub fn validate(doc: &HeatLossDoc, path: &KeyPath, v: &mut Validator) -> Option<HeatLoss> {
    let surface_r = match &doc.surface_resistance {
        None => Some(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W),
        Some(q) => {
            let r = v.q(q, &path.key("surface_resistance"));
            v.within(
                r,
                (0.0, f64::INFINITY),
                &path.key("surface_resistance"),
                "the surface resistance",
            )
        }
    };
    let length = match &doc.length {
        None => Some(1.0),
        Some(q) => v.positive_q(q, &path.key("length"), "the trench length"),
    };
    if doc.pipes.is_empty() {
        v.out
            .error(&path.key("pipes"), "a heat-loss study needs at least one pipe");
    }
    let pipes = validate::pipes(&doc.pipes, &path.key("pipes"), v);
    let sizing = match &doc.sizing {
        None => Some(None),
        Some(s) => sizing(s, &doc.pipes, &path.key("sizing"), v).map(Some),
    };
    let neighbours: Vec<Option<Neighbour>> = doc
        .neighbours
        .iter()
        .enumerate()
        .map(|(i, n)| {
            let p = path.key("neighbours").index(i);
            let x = v.q(&n.x, &p.key("x"));
            let z = v.positive_q(&n.depth, &p.key("depth"), "the depth of a neighbour");
            let limit = v.opt_q(&n.limit, &p.key("limit"));
            Some(Neighbour {
                id: n.id.clone(),
                x_m: x?,
                depth_m: z?,
                limit_c: limit?,
            })
        })
        .collect();
    let study = HeatLoss {
        length_m: length?,
        pipes: pipes?,
        surface_resistance_m2_k_w: surface_r?,
        sizing: sizing?,
        neighbours: neighbours.into_iter().collect::<Option<_>>()?,
    };
    inside_pipes(&study, path, v).then_some(study)
}

fn sizing(doc: &SizingDoc, pipes: &[PipeDoc], path: &KeyPath, v: &mut Validator) -> Option<Sizing> {
    let has_layer = pipes.iter().any(|p| p.layers.iter().any(|l| l.name == doc.layer));
    if !has_layer {
        let names: Vec<&str> = pipes
            .iter()
            .flat_map(|p| p.layers.iter().map(|l| l.name.as_str()))
            .collect();
        v.out.error(
            &path.key("layer"),
            format!(
                "no pipe has a wall layer named `{}`; the layers are: {}",
                doc.layer,
                names.join(", ")
            ),
        );
    }
    let thicknesses: Vec<Option<f64>> = doc
        .thicknesses
        .iter()
        .enumerate()
        .map(|(i, q)| v.positive_q(q, &path.key("thicknesses").index(i), "a candidate thickness"))
        .collect();
    let limit = v.opt_q(&doc.heat_loss_limit, &path.key("heat_loss_limit"));
    let economic = match &doc.economic {
        None => Some(None),
        Some(e) => {
            let p = path.key("economic");
            let price = v.within(
                Some(e.heat_price),
                (0.0, f64::INFINITY),
                &p.key("heat_price"),
                "the heat price",
            );
            let years = v.positive(Some(e.years), &p.key("years"), "the number of years");
            let rate = v.q(&e.discount_rate, &p.key("discount_rate"));
            let rate = v.within(rate, (-0.5, 1.0), &p.key("discount_rate"), "the discount rate");
            if e.cost_per_metre.len() != doc.thicknesses.len() {
                v.out.error(
                    &p.key("cost_per_metre"),
                    format!(
                        "give one cost per candidate thickness: {} thicknesses but {} costs",
                        doc.thicknesses.len(),
                        e.cost_per_metre.len()
                    ),
                );
                return None;
            }
            Some(Some(Economics {
                heat_price_per_mwh: price?,
                cost_per_metre: e.cost_per_metre.clone(),
                years: years?,
                discount_rate: rate?,
            }))
        }
    };
    has_layer.then_some(())?;
    Some(Sizing {
        layer: doc.layer.clone(),
        thicknesses_m: thicknesses.into_iter().collect::<Option<_>>()?,
        heat_loss_limit_w_per_m: limit?,
        economic: economic?,
    })
}

/// A neighbour must lie in the soil, not inside a pipe.
fn inside_pipes(s: &HeatLoss, path: &KeyPath, v: &mut Validator) -> bool {
    let mut ok = true;
    for (i, n) in s.neighbours.iter().enumerate() {
        for p in &s.pipes {
            if (n.x_m - p.x_m).hypot(n.depth_m - p.depth_m) <= p.outer_radius_m() {
                v.out.error(
                    &path.key("neighbours").index(i),
                    format!(
                        "neighbour `{}` lies inside pipe `{}`; place it in the soil",
                        n.id, p.id
                    ),
                );
                ok = false;
            }
        }
    }
    ok
}
