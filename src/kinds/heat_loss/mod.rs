//! `kind: heat-loss`: heat loss of buried district-heating pipes (pairs, any pipes in one
//! trench, twin pipes), insulation sizing against a loss limit or by life-cycle cost, and the
//! soil temperature at neighbouring utilities.

pub mod doc;
pub mod model;
pub mod numerical;
pub mod report;
pub mod result;
pub mod run;
pub mod validate;

pub use model::*;
pub use result::*;

use super::{Kind, Outcome, StudyContext};
use crate::model::Method;
use crate::report::Figure;
use crate::results::{Assumption, Check, DecisiveFigure, StudyResult, Worse};
use crate::site::diagnostic::KeyPath;
use crate::site::validate::Validator;

pub struct HeatLossKind;

common_keys!(doc::HeatLossDoc);

impl Kind for HeatLossKind {
    const NAME: &'static str = "heat-loss";
    const METHODS: &'static [Method] = &validate::METHODS;
    const DEFAULT_METHOD: Method = Method::Analytic;
    type Doc = doc::HeatLossDoc;
    type Model = HeatLoss;
    type Result = HeatLossResult;

    fn validate(doc: &Self::Doc, path: &KeyPath, v: &mut Validator) -> Option<Self::Model> {
        validate::validate(doc, path, v)
    }

    fn deepest_point_m(model: &Self::Model) -> f64 {
        model.pipes.iter().map(|p| 2.0 * p.depth_m).fold(0.0, f64::max)
    }

    fn run(cx: &StudyContext, model: &Self::Model) -> Result<Outcome<Self::Result>, String> {
        let (result, warnings) = run::run(cx.id, cx.method, model, cx.site, cx.ground)?;
        Ok(Outcome {
            checks: checks(&result),
            assumptions: assumptions(&result, cx.method),
            result,
            warnings,
        })
    }

    fn decisive_figures(r: &Self::Result) -> Vec<DecisiveFigure> {
        // The study's own loss is that of the thickness the site file gives; the sizing's
        // limit holds the chosen candidate's loss (`sizing.chosen_heat_loss_w_per_m`).
        let loss = DecisiveFigure::new(
            "total_heat_loss_w_per_m",
            r.total_heat_loss_w_per_m,
            "W/m",
            "heat loss per metre of trench",
            Worse::Higher,
        );
        let mut out = vec![
            loss,
            DecisiveFigure::new(
                "annual_heat_loss_mwh",
                r.annual_heat_loss_mwh,
                "MWh",
                "heat lost a year over the trench",
                Worse::Higher,
            ),
        ];
        if let Some(t) = r.sizing.as_ref().and_then(|z| z.chosen_insulation_thickness_m) {
            out.push(
                DecisiveFigure::new(
                    "sizing.chosen_insulation_thickness_m",
                    t,
                    "m",
                    "insulation thickness chosen",
                    Worse::Higher,
                )
                .sized()
                .checked_by("heat_loss.loss_limit"),
            );
        }
        if let Some(q) = r.sizing.as_ref().and_then(|z| z.chosen_heat_loss_w_per_m) {
            out.push(
                DecisiveFigure::new(
                    "sizing.chosen_heat_loss_w_per_m",
                    q,
                    "W/m",
                    "heat loss with the chosen insulation",
                    Worse::Higher,
                )
                .checked_by("heat_loss.loss_limit"),
            );
        }
        for (i, n) in r.neighbours.iter().enumerate() {
            let mut f = DecisiveFigure::new(
                &format!("neighbours[{i}].max_temperature_c"),
                n.max_temperature_c,
                "°C",
                &format!("warmest soil at {}", n.id),
                Worse::Higher,
            );
            if n.limit_c.is_some() {
                f = f.checked_by("heat_loss.neighbour_limit");
            }
            out.push(f);
        }
        out
    }

    fn figures(study: &StudyResult, r: &Self::Result) -> Result<Vec<Figure>, String> {
        report::figures(study, r)
    }

    fn section(r: &Self::Result) -> maud::Markup {
        report::section(r)
    }

    fn csv_files(study: &StudyResult, r: &Self::Result) -> Vec<(String, String)> {
        vec![(format!("{}-monthly.csv", study.id), report::monthly_csv(r))]
    }
}

/// The study's decisions: the loss limit of a sizing, and each neighbour's temperature limit.
fn checks(r: &HeatLossResult) -> Vec<Check> {
    let mut out = Vec::new();
    if let Some((z, limit)) = r
        .sizing
        .as_ref()
        .and_then(|z| z.heat_loss_limit_w_per_m.map(|l| (z, l)))
    {
        let chosen = z
            .chosen_insulation_thickness_m
            .and_then(|t| z.candidates.iter().find(|c| c.insulation_thickness_m == t));
        out.push(match chosen {
            Some(c) => Check::new(
                "heat_loss.loss_limit",
                true,
                Some(c.heat_loss_w_per_m),
                Some(limit),
                "W/m",
                format!(
                    "{:.0} mm of {} keeps the trench loss at {:.1} W/m, within the {limit} W/m limit",
                    c.insulation_thickness_m * 1000.0,
                    z.layer,
                    c.heat_loss_w_per_m
                ),
            ),
            None => {
                let least = z
                    .candidates
                    .iter()
                    .map(|c| c.heat_loss_w_per_m)
                    .fold(f64::INFINITY, f64::min);
                Check::new(
                    "heat_loss.loss_limit",
                    false,
                    least.is_finite().then_some(least),
                    Some(limit),
                    "W/m",
                    format!(
                        "no candidate thickness of {} meets the {limit} W/m limit (the least loss is {least:.1} W/m)",
                        z.layer
                    ),
                )
            }
        });
    }
    for n in &r.neighbours {
        if let Some(limit) = n.limit_c {
            out.push(Check::new(
                "heat_loss.neighbour_limit",
                !n.exceeds_limit,
                Some(n.max_temperature_c),
                Some(limit),
                "°C",
                if n.exceeds_limit {
                    format!(
                        "the soil at {} reaches {:.1} °C, above its limit of {limit} °C",
                        n.id, n.max_temperature_c
                    )
                } else {
                    format!(
                        "the soil at {} stays at or below {:.1} °C, within its limit of {limit} °C",
                        n.id, n.max_temperature_c
                    )
                },
            ));
        }
    }
    out
}

fn assumptions(r: &HeatLossResult, method: Method) -> Vec<Assumption> {
    let mut out = vec![
        Assumption::new(
            "surface resistance, as an added depth λ·R0",
            r.surface_resistance_m2_k_per_w,
            "m2 K/W",
            "the site file, or EN 13941-1 practice (0.0685 m2 K/W, from memory)",
        ),
        Assumption::new(
            "contrast of soil conductivities within twice the pipe depth that raises a caution",
            run::LAYER_CONTRAST * 100.0,
            "%",
            "common practice, no source",
        ),
    ];
    if method == Method::Both {
        out.push(Assumption::new(
            "difference between the analytic and numerical losses that raises a caution",
            run::CROSS_CHECK_CAUTION * 100.0,
            "%",
            "burrow's own threshold",
        ));
    }
    out
}
