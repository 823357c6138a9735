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
use crate::results::{Assumption, Check, DecisiveFigure, StudyResult, Worse};
use crate::site::diagnostic::KeyPath;
use crate::site::validate::Validator;

pub struct FrostKind;

common_keys!(doc::FrostDoc);

impl Kind for FrostKind {
    const NAME: &'static str = "frost";
    const METHODS: &'static [Method] = &validate::METHODS;
    const DEFAULT_METHOD: Method = Method::Analytic;
    type Doc = doc::FrostDoc;
    type Model = Frost;
    type Result = FrostResult;

    fn validate(doc: &Self::Doc, path: &KeyPath, v: &mut Validator) -> Option<Self::Model> {
        validate::validate(doc, path, v)
    }

    fn deepest_point_m(model: &Self::Model) -> f64 {
        model.pipe.as_ref().map_or(0.0, |p| 2.0 * p.depth_m)
    }

    fn run(cx: &StudyContext, model: &Self::Model) -> Result<Outcome<Self::Result>, String> {
        let (result, warnings) = run::run(cx.id, cx.method, model, cx.site, cx.ground)?;
        Ok(Outcome {
            checks: checks(&result),
            assumptions: assumptions(&result),
            result,
            warnings,
        })
    }

    fn decisive_figures(r: &Self::Result) -> Vec<DecisiveFigure> {
        let mut out = Vec::new();
        if let Some(d) = r.max_frost_depth_m {
            out.push(DecisiveFigure::new(
                "max_frost_depth_m",
                d,
                "m",
                "frost depth",
                Worse::Higher,
            ));
        }
        if let Some(p) = &r.permafrost {
            out.push(
                DecisiveFigure::new(
                    "permafrost.active_layer_depth_m",
                    p.active_layer_depth_m,
                    "m",
                    "active layer (seasonal thaw)",
                    Worse::Higher,
                )
                .checked_by("frost.permafrost"),
            );
            out.push(DecisiveFigure::new(
                "permafrost.permafrost_table_depth_m",
                p.permafrost_table_depth_m,
                "m",
                "permafrost table",
                Worse::Higher,
            ));
            out.push(DecisiveFigure::new(
                "permafrost.mean_annual_ground_temperature_c",
                p.mean_annual_ground_temperature_c,
                "°C",
                "mean annual ground temperature",
                Worse::Higher,
            ));
        }
        out.push(DecisiveFigure::new(
            "design_freezing_index_c_days",
            r.design_freezing_index_c_days,
            "°C·d",
            "design surface freezing index",
            Worse::Higher,
        ));
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

/// The study's decisions: frost at the crown, the cover against the required cover, standing
/// water, and the insulation board.
fn checks(r: &FrostResult) -> Vec<Check> {
    let mut out = Vec::new();
    if let Some(p) = &r.permafrost {
        out.push(Check::new(
            "frost.permafrost",
            false,
            Some(p.active_layer_depth_m),
            None,
            "m",
            format!(
                "the ground is perennially frozen below {:.2} m (permafrost table; mean annual ground temperature {:.1} °C): a frost-depth cover rule does not apply, a main needs insulation or heating to local practice",
                p.permafrost_table_depth_m, p.mean_annual_ground_temperature_c
            ),
        ));
    }
    if let (Some(reaches), Some(crown), Some(depth)) =
        (r.frost_reaches_pipe, r.pipe_crown_depth_m, r.max_frost_depth_m)
    {
        out.push(Check::new(
            "frost.at_pipe",
            !reaches,
            Some(depth),
            Some(crown),
            "m",
            if reaches {
                format!("frost reaches {depth:.2} m, below the crown at {crown:.2} m")
            } else {
                format!("the crown at {crown:.2} m lies below the frost depth of {depth:.2} m")
            },
        ));
        if let Some(required) = r.required_cover_m {
            let passed = crown >= required - COVER_TOLERANCE_M;
            out.push(Check::new(
                "frost.cover",
                passed,
                Some(crown),
                Some(required),
                "m",
                if passed {
                    format!("the cover of {crown:.2} m meets the {required:.2} m needed (frost depth plus {:.2} m margin)", r.margin_m)
                } else {
                    format!("the cover of {crown:.2} m is less than the {required:.2} m needed (frost depth plus {:.2} m margin)", r.margin_m)
                },
            ));
        }
    }
    if let Some(st) = &r.stagnant {
        let freezes = st.time_to_first_ice_h.is_some_and(|t| t <= st.duration_h);
        out.push(Check::new(
            "frost.stagnant_freeze",
            !freezes,
            st.time_to_first_ice_h,
            Some(st.duration_h),
            "h",
            match st.time_to_first_ice_h {
                Some(t) if freezes => format!(
                    "standing water starts to freeze after {t:.0} h, within the {:.0} h without flow",
                    st.duration_h
                ),
                Some(t) => format!(
                    "standing water first freezes after {t:.0} h, later than the {:.0} h without flow",
                    st.duration_h
                ),
                None => format!(
                    "standing water does not freeze in the {:.0} h without flow",
                    st.duration_h
                ),
            },
        ));
    }
    if let (Some(width), Some(board)) = (r.board_width_m, &r.board) {
        out.push(Check::new(
            "frost.board",
            width.is_some(),
            width,
            Some(board.max_width_m),
            "m",
            match width {
                Some(0.0) => "the crown stays out of frost without a board".to_string(),
                Some(w) => format!("a board {w:.2} m wide keeps the crown above 0 °C"),
                None => format!(
                    "no board up to {:.2} m wide keeps the crown above 0 °C",
                    board.max_width_m
                ),
            },
        ));
    }
    out
}

/// A cover within this distance of the required cover is taken as meeting it (rounding), m.
const COVER_TOLERANCE_M: f64 = 1e-9;

fn assumptions(r: &FrostResult) -> Vec<Assumption> {
    let mut out = vec![Assumption::new(
        "margin between the frost depth and the crown for the required cover",
        r.margin_m,
        "m",
        "the site file, or 0.2 m (common practice, no source)",
    )];
    if r.stagnant.is_some() || r.bleed.is_some() {
        out.push(Assumption::new(
            "volumetric heat capacity of water",
            run::WATER_C_J_PER_M3_K / 1e6,
            "MJ/(m3 K)",
            "999.8 kg/m3 × 4219 J/(kg K), IAPWS-95 at 0.01 °C (from memory)",
        ));
        out.push(Assumption::new(
            "latent heat of fusion of water per volume",
            run::WATER_LATENT_J_PER_M3 / 1e6,
            "MJ/m3",
            "333.55 kJ/kg (IAPWS) at 1000 kg/m3",
        ));
    }
    out
}
