//! Validation of a `kind: heat-loss` study's keys into its model: units, ranges, references,
//! geometry; every problem located.

use super::doc::*;

use super::Economics;
use super::HeatLoss;
use super::Neighbour;
use super::Sizing;
use super::TwinCasing;
use crate::model::{Pipe, WallLayer};
use crate::site::diagnostic::KeyPath;
use crate::site::doc::PipeDoc;
use crate::site::units::Dimension;
use crate::site::validate::{self, Validator};

/// Surface resistance this kind uses unless the study gives one: EN 13941-1 practice
/// (`from memory`: 0.0685 m2 K/W).
pub use crate::physics::buried_pipe::DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W;

/// The methods this kind offers: the analytic figures, alone or with the engine's steady
/// solution beside them as a cross-check.
pub const METHODS: [crate::model::Method; 2] = [crate::model::Method::Analytic, crate::model::Method::Both];

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
    let (pipes, twin) = match (&doc.twin, doc.pipes.is_empty()) {
        (Some(_), false) => {
            v.out.error(
                &path.key("twin"),
                "give either `pipes` or `twin` in one heat-loss study, not both",
            );
            (None, None)
        }
        (Some(t), true) => match twin(t, &path.key("twin"), v) {
            Some((pipes, casing)) => (Some(pipes), Some(Some(casing))),
            None => (None, None),
        },
        (None, true) => {
            v.out.error(
                &path.key("pipes"),
                "a heat-loss study needs at least one pipe (or a `twin`)",
            );
            (None, None)
        }
        (None, false) => (validate::pipes(&doc.pipes, &path.key("pipes"), v), Some(None)),
    };
    let sizing = match (&doc.sizing, &doc.twin) {
        (None, _) => Some(None),
        (Some(s), None) => sizing(s, &doc.pipes, &path.key("sizing"), v).map(Some),
        (Some(s), Some(_)) => {
            if s.layer != TWIN_INSULATION {
                v.out.error(
                    &path.key("sizing").key("layer"),
                    format!(
                        "with a twin pipe the sized layer is its insulation: write `layer: {TWIN_INSULATION}` (the thickness is the insulation's least cover over a carrier), not `{}`",
                        s.layer
                    ),
                );
            }
            sizing(s, &[], &path.key("sizing"), v).map(Some)
        }
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
        surface_resistance_m2_k_per_w: surface_r?,
        sizing: sizing?,
        neighbours: neighbours.into_iter().collect::<Option<_>>()?,
        twin: twin?,
    };
    inside_pipes(&study, path, v).then_some(study)
}

fn sizing(doc: &SizingDoc, pipes: &[PipeDoc], path: &KeyPath, v: &mut Validator) -> Option<Sizing> {
    let has_layer = if pipes.is_empty() {
        doc.layer == TWIN_INSULATION
    } else {
        pipes.iter().any(|p| p.layers.iter().any(|l| l.name == doc.layer))
    };
    if !has_layer && !pipes.is_empty() {
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

/// The name `sizing.layer` takes for a twin pipe's insulation.
pub const TWIN_INSULATION: &str = "insulation";

/// The twin's two carriers as pipes (supply, return) and its casing.
fn twin(doc: &TwinDoc, path: &KeyPath, v: &mut Validator) -> Option<(Vec<Pipe>, TwinCasing)> {
    let x = match &doc.x {
        Some(q) => v.q(q, &path.key("x")),
        None => Some(0.0),
    };
    let diameter = v.positive_q(
        &doc.outer_diameter,
        &path.key("outer_diameter"),
        "the casing diameter",
    );
    let depth = validate::centre_depth(
        &doc.depth,
        &doc.cover,
        diameter,
        path,
        v,
        "the twin pipe's casing",
    );
    v.plausible(
        depth,
        (0.2, 10.0),
        &path.key("depth"),
        "a pipe depth",
        Dimension::Length,
    );
    v.plausible(
        diameter,
        (0.05, 2.0),
        &path.key("outer_diameter"),
        "a casing diameter",
        Dimension::Length,
    );
    let casing_t = v.positive_q(
        &doc.casing.thickness,
        &path.key("casing").key("thickness"),
        "the casing thickness",
    );
    let casing_k = v.positive_q(
        &doc.casing.conductivity,
        &path.key("casing").key("conductivity"),
        "the casing conductivity",
    );
    let insulation = validate::layer_conductivity(
        &doc.insulation_conductivity,
        &path.key("insulation_conductivity"),
        v,
    );
    let spacing = v.positive_q(
        &doc.carrier_spacing,
        &path.key("carrier_spacing"),
        "the carrier spacing",
    );
    let cp = path.key("carriers");
    let carrier_d = v.positive_q(
        &doc.carriers.outer_diameter,
        &cp.key("outer_diameter"),
        "the carrier diameter",
    );
    let layers = validate::wall_layers(&doc.carriers.layers, &cp.key("layers"), v);
    let supply =
        validate::fluid_temperature(&doc.supply.temperature, &path.key("supply").key("temperature"), v);
    let ret = validate::fluid_temperature(
        &doc.return_.temperature,
        &path.key("return").key("temperature"),
        v,
    );
    let layers: Vec<WallLayer> = layers?;
    let (x, z, d, t_c, k_c, (k_i, law), s, d_p) = (
        x?,
        depth?,
        diameter?,
        casing_t?,
        casing_k?,
        insulation?,
        spacing?,
        carrier_d?,
    );
    let mut ok = true;
    let mut fail = |v: &mut Validator, p: KeyPath, msg: String| {
        v.out.error(&p, msg);
        ok = false;
    };
    let wall: f64 = layers.iter().map(|l| l.thickness_m).sum();
    if wall >= d_p / 2.0 {
        fail(
            v,
            cp.key("layers"),
            format!(
                "the carrier's wall layers add up to {} m, but its outer radius is only {} m; they must leave a bore",
                round3(wall),
                round3(d_p / 2.0)
            ),
        );
    }
    if t_c >= d / 2.0 {
        fail(
            v,
            path.key("casing").key("thickness"),
            format!(
                "the casing is {} m thick but the casing's outer radius is only {} m; it must leave room for the insulation",
                round3(t_c),
                round3(d / 2.0)
            ),
        );
    }
    if s <= d_p {
        fail(
            v,
            path.key("carrier_spacing"),
            format!(
                "the carriers overlap: their centres are {} m apart but each is {} m across; the spacing must exceed the carrier diameter",
                round3(s),
                round3(d_p)
            ),
        );
    } else if s / 2.0 + d_p / 2.0 >= d / 2.0 - t_c {
        fail(
            v,
            path.key("carrier_spacing"),
            format!(
                "the carriers reach {} m from the casing's centre but its inner radius is {} m; reduce the spacing or enlarge the casing",
                round3(s / 2.0 + d_p / 2.0),
                round3(d / 2.0 - t_c)
            ),
        );
    }
    if z <= d / 2.0 {
        fail(
            v,
            path.key("depth"),
            format!(
                "the top of the casing is above the ground surface: the depth is to the casing's centre and must exceed its outer radius ({} m)",
                round3(d / 2.0)
            ),
        );
    }
    if !ok {
        return None;
    }
    let carrier = |id: &str, x_m: f64, drive| Pipe {
        id: id.into(),
        x_m,
        depth_m: z,
        outer_diameter_m: d_p,
        layers: layers.clone(),
        drive,
    };
    Some((
        vec![
            carrier("supply", x - s / 2.0, supply?),
            carrier("return", x + s / 2.0, ret?),
        ],
        TwinCasing {
            id: doc.id.clone(),
            x_m: x,
            depth_m: z,
            outer_diameter_m: d,
            casing_thickness_m: t_c,
            casing_conductivity_w_per_m_k: k_c,
            insulation_conductivity_w_per_m_k: k_i,
            insulation_law: law,
            carrier_spacing_m: s,
        },
    ))
}

fn round3(x: f64) -> f64 {
    (x * 1000.0).round() / 1000.0
}

/// A neighbour must lie in the soil, not inside a pipe.
fn inside_pipes(s: &HeatLoss, path: &KeyPath, v: &mut Validator) -> bool {
    let mut ok = true;
    for (i, n) in s.neighbours.iter().enumerate() {
        if let Some(t) = &s.twin
            && (n.x_m - t.x_m).hypot(n.depth_m - t.depth_m) <= t.outer_radius_m()
        {
            v.out.error(
                &path.key("neighbours").index(i),
                format!(
                    "neighbour `{}` lies inside twin pipe `{}`; place it in the soil",
                    n.id, t.id
                ),
            );
            ok = false;
            continue;
        }
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
