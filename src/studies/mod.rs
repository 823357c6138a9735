//! One module per study kind: the validated model → calls into `physics` and `engine` → plain
//! results. A study never reads YAML or writes files.
//!
//! Kinds the product defines but this version cannot run are listed in the schema
//! (`x-planned-kinds`) and refused by the site check with a "not supported yet" message.

use crate::ground::profile::Undisturbed;
use crate::model::{Site, Study};
use crate::results::{StudyResult, Warning};

/// Runs one study against the site's undisturbed ground.
pub fn run(
    study: &Study,
    _site: &Site,
    _ground: &Undisturbed,
) -> Result<(StudyResult, Vec<Warning>), String> {
    match &study.kind {
        crate::model::StudyKind::CrossSection(_) => Err("the cross-section engine is not built yet".into()),
    }
}

/// The deepest point any study of the site reaches (a borehole bottom, a model domain), m.
pub fn deepest_point_m(site: &Site) -> f64 {
    site.studies
        .iter()
        .map(|s| match &s.kind {
            crate::model::StudyKind::CrossSection(c) => c.depth_m,
        })
        .fold(0.0, f64::max)
}
