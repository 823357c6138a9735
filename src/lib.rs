//! burrow: a designer for things buried in the ground that exchange heat with it.
//!
//! Data flows one way: site file → [`site`] (YAML, units, validation) → [`model::Site`] (SI) →
//! [`ground`] and [`studies`] (which call [`physics`] and [`engine`]) → [`results::Results`]
//! (plain data) → [`report`] (HTML, plots, CSV, JSON). See DEVELOPERS.md for the code map.

pub use burrow_physics::numerics::checks;
pub use burrow_physics::{calendar, engine, materials, numerics, physics};

pub mod ground;
pub mod kinds;
pub mod model;
pub mod report;
pub mod results;
pub mod site;
pub mod templates;

use results::{GroundResults, Level, Results, SiteInfo, Tool, Warning};
use site::{Diagnostic, Loaded, Severity};
use std::path::{Path, PathBuf};

/// burrow's version, as shown in reports and `results.json`.
pub const VERSION: &str = env!("CARGO_PKG_VERSION");

/// The sentence every report and every run states.
pub const CAUTION: &str = "burrow's results are estimates for design support. They must be checked by a qualified engineer, and they do not replace local codes, utility standards or licensed practice (minimum cover depths, pipe standards, well and borehole regulations), which govern.";

/// Why a run stopped before writing a bundle. A study that fails does not stop the run: it is
/// listed in the results' `failed_studies` (see [`StudyError`]) and the others still run.
#[derive(Debug)]
pub enum RunError {
    /// The site file has errors; every problem found, located.
    Invalid(Vec<Diagnostic>),
    /// The site file could not be read again for its checksum.
    Read(String),
    /// The undisturbed ground, which every study needs, could not be solved.
    Ground(String),
    /// The bundle could not be written.
    Bundle(String),
}

impl std::fmt::Display for RunError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            RunError::Invalid(items) => {
                for d in items {
                    writeln!(f, "{d}")?;
                }
                Ok(())
            }
            RunError::Read(m) => write!(f, "{m}"),
            RunError::Ground(m) => write!(f, "the undisturbed ground could not be solved: {m}"),
            RunError::Bundle(m) => write!(f, "the report bundle could not be written: {m}"),
        }
    }
}

/// A study that failed to run: which study, of which kind, and why (one sentence).
#[derive(Clone, Debug, PartialEq)]
pub struct StudyError {
    pub study: String,
    pub kind: &'static str,
    pub message: String,
}

impl std::fmt::Display for StudyError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "study {} ({}) failed: {}", self.study, self.kind, self.message)
    }
}

/// What a finished run produced.
#[derive(Debug)]
pub struct RunSummary {
    pub bundle: PathBuf,
    pub results: Results,
    /// Validation warnings (plausibility of inputs), also listed in the results' warnings.
    pub input_warnings: Vec<Diagnostic>,
}

/// Progress reporting, so the library need not know about terminals.
pub trait Progress {
    fn stage(&self, _message: &str) {}
}

/// No progress output.
pub struct Silent;
impl Progress for Silent {}

/// Reads, validates, solves and writes the bundle into `out_dir` (replaced as a whole, never
/// left half-written).
pub fn run(site_path: &Path, out_dir: &Path, progress: &dyn Progress) -> Result<RunSummary, RunError> {
    let loaded = site::load(site_path).map_err(RunError::Invalid)?;
    let bytes = site::read_bounded(site_path, site::MAX_SITE_FILE_BYTES)
        .map_err(|e| RunError::Read(format!("cannot read {}: {e}", site_path.display())))?;
    let input_file = site_path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    let results = compute(&loaded, &input_file, &bytes, progress)?;
    progress.stage("writing the report");
    report::write_bundle(&results, &loaded.site, out_dir).map_err(RunError::Bundle)?;
    Ok(RunSummary {
        bundle: out_dir.to_path_buf(),
        results,
        input_warnings: loaded.warnings,
    })
}

/// The default bundle folder for a site file: `out/<site-file-stem>/`.
pub fn default_out_dir(site_path: &Path) -> PathBuf {
    let stem = site_path
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| "site".into());
    Path::new("out").join(stem)
}

/// Solves every study of a validated site: model in, plain results out. A study that fails is
/// listed in `failed_studies` with its reason and the others still run; only a failure of the
/// undisturbed ground, which every study needs, stops the run.
pub fn compute(
    loaded: &Loaded,
    input_file: &str,
    input_bytes: &[u8],
    progress: &dyn Progress,
) -> Result<Results, RunError> {
    let site = &loaded.site;
    progress.stage("undisturbed ground temperature");
    let depth = ground::profile::DEFAULT_PROFILE_DEPTH_M.max(kinds::deepest_point_m(site));
    let undisturbed = ground::profile::undisturbed(site, depth).map_err(RunError::Ground)?;
    let profile = undisturbed.envelope(depth);
    let mut warnings: Vec<Warning> = loaded
        .warnings
        .iter()
        .filter(|d| d.severity == Severity::Warning)
        .map(|d| Warning {
            study: None,
            level: Level::Caution,
            code: "input.unusual_value".into(),
            message: format!("{}: {}", d.path, d.message),
        })
        .collect();
    let mut study_results = Vec::new();
    let mut failed_studies = Vec::new();
    for study in &site.studies {
        progress.stage(&format!("study {}", study.id));
        match kinds::run(study, site, &undisturbed) {
            Ok((result, mut raised)) => {
                study_results.push(result);
                warnings.append(&mut raised);
            }
            Err(e) => failed_studies.push(results::StudyFailure {
                id: e.study,
                kind: e.kind.into(),
                reason: e.message,
            }),
        }
    }
    warnings.sort_by_key(|w| std::cmp::Reverse(w.level));
    Ok(Results {
        tool: Tool {
            name: "burrow".into(),
            version: VERSION.into(),
        },
        site: SiteInfo {
            name: site.name.clone(),
            description: site.description.clone(),
            input_file: input_file.to_string(),
            input_sha256: sha256_hex(input_bytes),
        },
        ground: GroundResults {
            profile,
            profile_method: undisturbed.method.name().into(),
            surface_daily_c: undisturbed.surface_daily_c(),
            surface_mean_c: undisturbed.envelope_at(0.0).0,
            max_frost_depth_m: undisturbed.max_frost_depth_m(depth),
            permafrost: undisturbed
                .permafrost(depth)
                .map(|p| results::PermafrostFigures::from_profile(&p)),
            spin_up_years: undisturbed.spin_up_years,
            energy_balance_relative_error: undisturbed.energy_balance_relative_error,
        },
        studies: study_results,
        failed_studies,
        warnings,
    })
}

fn sha256_hex(bytes: &[u8]) -> String {
    use sha2::{Digest, Sha256};
    Sha256::digest(bytes).iter().map(|b| format!("{b:02x}")).collect()
}
