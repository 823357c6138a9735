//! `kind: borefield`: a field of vertical ground heat exchangers for a heat pump: its
//! g-function, borehole resistance, mean fluid temperatures over the design life, hydraulics,
//! and the active length that keeps the fluid within its limits.

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

pub struct BorefieldKind;

common_keys!(doc::BorefieldDoc);

impl Kind for BorefieldKind {
    const NAME: &'static str = "borefield";
    const METHODS: &'static [Method] = &validate::METHODS;
    const DEFAULT_METHOD: Method = Method::Analytic;
    type Doc = doc::BorefieldDoc;
    type Model = Borefield;
    type Result = BorefieldResult;

    fn validate(doc: &Self::Doc, path: &KeyPath, v: &mut Validator) -> Option<Self::Model> {
        validate::validate(doc, path, v)
    }

    fn deepest_point_m(b: &Self::Model) -> f64 {
        let longest = if b.size {
            validate::SIZING_RANGE_M.1
        } else {
            b.active_length_m
        };
        b.top_depth_m + longest
    }

    fn run(cx: &StudyContext, model: &Self::Model) -> Result<Outcome<Self::Result>, String> {
        run::run(cx.id, model, cx.site, cx.ground)
    }

    fn decisive_figures(r: &Self::Result) -> Vec<DecisiveFigure> {
        let sized = r.sizing.is_some();
        let mut length = DecisiveFigure::new(
            "active_length_m",
            r.active_length_m,
            "m",
            "active length per borehole",
            Worse::Higher,
        );
        let mut total = DecisiveFigure::new(
            "total_length_m",
            r.total_length_m,
            "m",
            "total active length",
            Worse::Higher,
        );
        if sized {
            length = length.sized();
            total = total.sized();
        }
        vec![
            DecisiveFigure::new(
                "fluid_temperature.min_c",
                r.fluid_temperature.min_c,
                "°C",
                "coldest mean fluid temperature",
                Worse::Lower,
            )
            .checked_by("borefield.min_fluid"),
            DecisiveFigure::new(
                "fluid_temperature.max_c",
                r.fluid_temperature.max_c,
                "°C",
                "warmest mean fluid temperature",
                Worse::Higher,
            )
            .checked_by("borefield.max_fluid"),
            length,
            total,
        ]
    }

    fn figures(study: &StudyResult, r: &Self::Result) -> Result<Vec<Figure>, String> {
        report::figures(study, r)
    }

    fn section(r: &Self::Result) -> maud::Markup {
        report::section(r)
    }

    fn csv_files(study: &StudyResult, r: &Self::Result) -> Vec<(String, String)> {
        vec![
            (format!("{}-fluid.csv", study.id), report::fluid_csv(r)),
            (format!("{}-g-function.csv", study.id), report::g_function_csv(r)),
        ]
    }
}
