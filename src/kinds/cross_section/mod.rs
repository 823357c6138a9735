//! `kind: cross-section`: any 2-D section of the ground with pipes, probes and inclusions,
//! solved by the transient finite-volume engine with freezing soil water (or its steady state).

pub mod doc;
pub mod model;
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
use crate::site::validate::Validator;

pub struct CrossSectionKind;

common_keys!(doc::CrossSectionDoc);

impl Kind for CrossSectionKind {
    const NAME: &'static str = "cross-section";
    const METHODS: &'static [Method] = &[Method::Numerical];
    const DEFAULT_METHOD: Method = Method::Numerical;
    type Doc = doc::CrossSectionDoc;
    type Model = CrossSection;
    type Result = CrossSectionResult;

    fn validate(doc: &Self::Doc, path: &KeyPath, v: &mut Validator) -> Option<Self::Model> {
        validate::validate(doc, path, v)
    }

    fn deepest_point_m(model: &Self::Model) -> f64 {
        model.depth_m
    }

    fn run(cx: &StudyContext, model: &Self::Model) -> Result<Outcome<Self::Result>, String> {
        let (result, warnings) = run::run(cx.id, model, cx.site, cx.ground)?;
        Ok(Outcome {
            result,
            warnings,
            checks: Vec::new(),
            assumptions: Vec::new(),
        })
    }

    fn decisive_figures(r: &Self::Result) -> Vec<DecisiveFigure> {
        let mut out: Vec<DecisiveFigure> = r
            .pipes
            .iter()
            .enumerate()
            .map(|(i, p)| {
                DecisiveFigure::new(
                    &format!("pipes[{i}].mean_heat_rate_w_per_m"),
                    p.mean_heat_rate_w_per_m,
                    "W/m",
                    &format!("mean heat to the ground from {}", p.id),
                    Worse::Higher,
                )
            })
            .collect();
        if let Some(d) = r.max_frost_depth_m {
            out.push(DecisiveFigure::new(
                "max_frost_depth_m",
                d,
                "m",
                "frost depth",
                Worse::Higher,
            ));
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
        vec![(format!("{}-series.csv", study.id), report::series_csv(r))]
    }
}
