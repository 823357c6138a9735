//! One module per study kind: the validated model → calls into `physics` and `engine` → plain
//! results. A study never reads YAML or writes files.
//!
//! Kinds the product defines but a version cannot run yet are listed in the schema
//! (`x-planned-kinds` on `StudyDoc`) and refused by the site check with a "not supported yet"
//! message; every kind of the product runs in this version.

pub mod borefield;
pub mod cross_section;
pub mod frost;
pub mod frost_numerical;
pub mod heat_loss;

use crate::ground::profile::Undisturbed;
use crate::model::{Site, Study, StudyKind};
use crate::results::{Figures, StudyResult, Warning};

/// Runs one study against the site's undisturbed ground.
pub fn run(study: &Study, site: &Site, ground: &Undisturbed) -> Result<(StudyResult, Vec<Warning>), String> {
    let (figures, warnings) = match &study.kind {
        StudyKind::CrossSection(c) => {
            let (r, w) = cross_section::run(&study.id, c, site, ground)?;
            (Figures::CrossSection(r), w)
        }
        StudyKind::HeatLoss(h) => {
            let (r, w) = heat_loss::run(&study.id, study.method, h, site, ground)?;
            (Figures::HeatLoss(r), w)
        }
        StudyKind::Frost(f) => {
            let (r, w) = frost::run(&study.id, study.method, f, site, ground)?;
            (Figures::Frost(r), w)
        }
        StudyKind::Borefield(b) => {
            let (r, w) = borefield::run(&study.id, b, site, ground)?;
            (Figures::Borefield(Box::new(r)), w)
        }
    };
    Ok((
        StudyResult {
            id: study.id.clone(),
            kind: study.kind.name().into(),
            method: study.method.name().into(),
            figures,
        },
        warnings,
    ))
}

/// The deepest point any study of the site reaches (a borehole bottom, a model domain), m.
pub fn deepest_point_m(site: &Site) -> f64 {
    site.studies
        .iter()
        .map(|s| match &s.kind {
            StudyKind::CrossSection(c) => c.depth_m,
            StudyKind::HeatLoss(h) => h.pipes.iter().map(|p| 2.0 * p.depth_m).fold(0.0, f64::max),
            StudyKind::Frost(f) => f.pipe.as_ref().map_or(0.0, |p| 2.0 * p.depth_m),
            StudyKind::Borefield(b) => {
                let longest = if b.size {
                    crate::site::kinds::borefield::SIZING_RANGE_M.1
                } else {
                    b.active_length_m
                };
                b.top_depth_m + longest
            }
        })
        .fold(0.0, f64::max)
}
