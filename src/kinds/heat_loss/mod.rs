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
use crate::results::{DecisiveFigure, StudyResult, Worse};
use crate::site::diagnostic::KeyPath;
use crate::site::doc::MethodDoc;
use crate::site::validate::Validator;

pub struct HeatLossKind;

impl Kind for HeatLossKind {
    const NAME: &'static str = "heat-loss";
    const METHODS: &'static [Method] = &validate::METHODS;
    const DEFAULT_METHOD: Method = Method::Analytic;
    type Doc = doc::HeatLossDoc;
    type Model = HeatLoss;
    type Result = HeatLossResult;

    fn id(doc: &Self::Doc) -> &str {
        &doc.id
    }

    fn method(doc: &Self::Doc) -> Option<MethodDoc> {
        doc.method
    }

    fn validate(doc: &Self::Doc, path: &KeyPath, v: &mut Validator) -> Option<Self::Model> {
        validate::validate(doc, path, v)
    }

    fn deepest_point_m(model: &Self::Model) -> f64 {
        model.pipes.iter().map(|p| 2.0 * p.depth_m).fold(0.0, f64::max)
    }

    fn run(cx: &StudyContext, model: &Self::Model) -> Result<Outcome<Self::Result>, String> {
        let (result, warnings) = run::run(cx.id, cx.method, model, cx.site, cx.ground)?;
        Ok(Outcome {
            result,
            warnings,
            checks: Vec::new(),
            assumptions: Vec::new(),
        })
    }

    fn decisive_figures(r: &Self::Result) -> Vec<DecisiveFigure> {
        let limited = r.sizing.as_ref().is_some_and(|z| z.heat_loss_limit_w_per_m.is_some());
        let mut loss = DecisiveFigure::new(
            "total_heat_loss_w_per_m",
            r.total_heat_loss_w_per_m,
            "W/m",
            "heat loss per metre of trench",
            Worse::Higher,
        );
        if limited {
            loss = loss.checked_by("heat_loss.loss_limit");
        }
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
