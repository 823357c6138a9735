//! One module per study kind: the validated model → calls into `physics` and `engine` → plain
//! results. A study never reads YAML or writes files.
//!
//! No study kind is implemented yet; `site::validate::SUPPORTED_KINDS` lists what runs, and the
//! site validator refuses the others with a "not supported yet" message.

use crate::ground::profile::Undisturbed;
use crate::model::{Site, Study};
use crate::results::{StudyResult, Warning};

/// Runs one study against the site's undisturbed ground.
pub fn run(
    study: &Study,
    _site: &Site,
    _ground: &Undisturbed,
) -> Result<(StudyResult, Vec<Warning>), String> {
    match study.kind {}
}

/// The deepest point any study of the site reaches (a borehole bottom, a model domain), m.
pub fn deepest_point_m(site: &Site) -> f64 {
    site.studies.iter().map(|s| match s.kind {}).fold(0.0, f64::max)
}
