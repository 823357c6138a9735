//! `kind: frost`: the design freezing index, frost depth by Stefan, modified Berggren and the
//! engine's design winter, and whether a water main is safe (cover, coldest wall, stagnant
//! water, bleed flow, insulation board).

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

pub struct FrostKind;

impl Kind for FrostKind {
    const NAME: &'static str = "frost";
    const METHODS: &'static [Method] = &validate::METHODS;
    const DEFAULT_METHOD: Method = Method::Analytic;
    type Doc = doc::FrostDoc;
    type Model = Frost;
    type Result = FrostResult;

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
        model.pipe.as_ref().map_or(0.0, |p| 2.0 * p.depth_m)
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
        let mut out = vec![
            DecisiveFigure::new(
                "max_frost_depth_m",
                r.max_frost_depth_m,
                "m",
                "frost depth",
                Worse::Higher,
            ),
            DecisiveFigure::new(
                "design_freezing_index_c_days",
                r.design_freezing_index_c_days,
                "°C·d",
                "design surface freezing index",
                Worse::Higher,
            ),
        ];
        if let Some(c) = r.required_cover_m {
            out.push(
                DecisiveFigure::new("required_cover_m", c, "m", "cover needed", Worse::Higher)
                    .sized()
                    .checked_by("frost.cover"),
            );
        }
        if let Some(t) = r.pipe_min_temperature_c {
            out.push(DecisiveFigure::new(
                "pipe_min_temperature_c",
                t,
                "°C",
                "coldest pipe wall",
                Worse::Lower,
            ));
        }
        if let Some(b) = &r.bleed {
            out.push(
                DecisiveFigure::new(
                    "bleed.flow_l_per_min",
                    b.flow_l_per_min,
                    "l/min",
                    "bleed flow",
                    Worse::Higher,
                )
                .sized(),
            );
        }
        if let Some(Some(w)) = r.board_width_m {
            out.push(
                DecisiveFigure::new("board_width_m", w, "m", "insulation board width", Worse::Higher)
                    .sized()
                    .checked_by("frost.board"),
            );
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
        report::csv_files(study, r)
    }
}
