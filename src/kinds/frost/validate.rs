//! Validation of a `kind: frost` study's keys into its model: units, ranges, references,
//! geometry; every problem located.

use super::doc::*;

use super::Frost;
use super::FrostBleed;
use super::FrostBoard;
use crate::model::{Method, PipeDrive};
use crate::numerics::time::DAY_S;
use crate::site::diagnostic::KeyPath;
use crate::site::units::Dimension;
use crate::site::validate::{self, Validator};

/// The methods this kind offers: the analytic formulas, the engine's winter run, or both.
pub const METHODS: [Method; 3] = [Method::Analytic, Method::Numerical, Method::Both];

/// Clear distance between a board's underside and the pipe crown when the site file gives none,
/// m (`common practice, no source`: a bedding layer of about 0.1 m of sand between board and
/// pipe).
pub const DEFAULT_BOARD_GAP_M: f64 = 0.1;
/// Widest board tried when the site file gives no `max_width`, m.
pub const DEFAULT_BOARD_MAX_WIDTH_M: f64 = 3.0;
/// Volumetric heat capacity of a foam board when none is given, J/(m3 K): extruded polystyrene,
/// about 35 kg/m3 × 1450 J/(kg K) (from memory; its effect on a winter is negligible).
pub const DEFAULT_BOARD_HEAT_CAPACITY_J_PER_M3_K: f64 = 0.05e6;

/// `MM-DD` → (month, day) of a day every year has.
fn month_day(text: &str) -> Option<(u32, u32)> {
    let (m, d) = text.trim().split_once('-')?;
    let (m, d): (u32, u32) = (m.parse().ok()?, d.parse().ok()?);
    const DAYS: [u32; 12] = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
    ((1..=12).contains(&m) && d >= 1 && d <= DAYS[(m - 1) as usize]).then_some((m, d))
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
        Some(s) => {
            let p = path.key("stagnant").key("duration");
            let d = v.positive_q(&s.duration, &p, "the stagnant period");
            // Water stands in a main from an hour (a repair) to a few weeks (an empty house):
            // common practice, no source.
            v.plausible(
                d,
                (1800.0, 30.0 * DAY_S),
                &p,
                "a period without flow",
                Dimension::Time,
            );
            d.map(Some)
        }
    };
    let season_start = match &doc.season_start {
        None => Some(None),
        Some(text) => {
            let md = month_day(text);
            if md.is_none() {
                v.out.error(
                    &path.key("season_start"),
                    format!("`{text}` is not a day of the year; write it as MM-DD, e.g. 07-01 (29 February is not allowed)"),
                );
            }
            md.map(Some)
        }
    };
    let bleed = match &doc.bleed {
        None => Some(None),
        Some(b) => {
            let p = path.key("bleed");
            let length = v.positive_q(&b.length, &p.key("length"), "the bleed length");
            let min_t = match &b.min_temperature {
                None => Some(0.0),
                Some(q) => {
                    let t = v.q(q, &p.key("min_temperature"));
                    v.within(
                        t,
                        (0.0, 30.0),
                        &p.key("min_temperature"),
                        "the lowest water temperature",
                    )
                }
            };
            let fluid_driven = doc.pipe.as_ref().is_some_and(|p| p.fluid.is_some());
            if !fluid_driven {
                v.out.error(
                    &p,
                    "a bleed flow needs a `pipe` driven by its water temperature (`fluid: {temperature}`)",
                );
                None
            } else {
                match (length, min_t) {
                    (Some(length_m), Some(min_temperature_c)) => Some(Some(FrostBleed {
                        length_m,
                        min_temperature_c,
                    })),
                    _ => None,
                }
            }
        }
    };
    let board = match &doc.board {
        None => Some(None),
        Some(b) => board(b, &path.key("board"), v, doc.pipe.is_some()),
    };
    if doc.stagnant.is_some() && doc.pipe.is_none() {
        v.out.error(
            &path.key("stagnant"),
            "a stagnant period needs a `pipe` to hold the water",
        );
        return None;
    }
    let f = Frost {
        pipe: pipe?,
        design_air_freezing_index_c_days: index?,
        surface_preset: surface?,
        return_period_years: return_period?,
        margin_m: margin?,
        stagnant_s: stagnant?,
        season_start: season_start?,
        bleed: bleed?,
        board: board?,
    };
    check_with_pipe(&f, path, v).then_some(f)
}

fn board(b: &BoardDoc, p: &KeyPath, v: &mut Validator, has_pipe: bool) -> Option<Option<FrostBoard>> {
    let thickness = v.positive_q(&b.thickness, &p.key("thickness"), "the board thickness");
    let k = v.positive_q(&b.conductivity, &p.key("conductivity"), "the board conductivity");
    let c = match &b.heat_capacity {
        None => Some(DEFAULT_BOARD_HEAT_CAPACITY_J_PER_M3_K),
        Some(q) => v.positive_q(q, &p.key("heat_capacity"), "the board heat capacity"),
    };
    let gap = match &b.gap {
        None => Some(DEFAULT_BOARD_GAP_M),
        Some(q) => {
            let g = v.q(q, &p.key("gap"));
            v.within(g, (0.0, 2.0), &p.key("gap"), "the gap between board and crown")
        }
    };
    let max_width = match &b.max_width {
        None => Some(DEFAULT_BOARD_MAX_WIDTH_M),
        Some(q) => {
            let w = v.q(q, &p.key("max_width"));
            v.within(w, (0.05, 20.0), &p.key("max_width"), "the widest board")
        }
    };
    if !has_pipe {
        v.out.error(p, "a board needs a `pipe` to lie above");
        return None;
    }
    Some(Some(FrostBoard {
        thickness_m: thickness?,
        conductivity_w_per_m_k: k?,
        heat_capacity_j_per_m3_k: c?,
        gap_m: gap?,
        max_width_m: max_width?,
    }))
}

/// Checks that need the validated pipe: the board must lie in the ground, a bleed flow needs the
/// water temperature.
fn check_with_pipe(f: &Frost, path: &KeyPath, v: &mut Validator) -> bool {
    let Some(pipe) = &f.pipe else { return true };
    let mut ok = true;
    if let Some(b) = &f.board {
        let top = pipe.cover_m() - b.gap_m - b.thickness_m;
        if top <= 0.0 {
            v.out.error(
                &path.key("board"),
                format!(
                    "the board would stick out of the ground (its top at {top:.3} m): the crown is {:.3} m deep, so gap plus thickness must be less than that",
                    pipe.cover_m()
                ),
            );
            ok = false;
        }
    }
    if f.bleed.is_some() && !matches!(pipe.drive, PipeDrive::FluidTemperature { .. }) {
        ok = false;
    }
    ok
}
