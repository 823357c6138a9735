//! Report writers: results → files. Reads plain results (and the model, to echo inputs); never
//! computes physics.
//!
//! The bundle is written into a temporary folder beside the target and renamed into place, so a
//! failed run leaves either the previous bundle or nothing, never half of one.

pub mod csv;
pub mod grid;
pub mod html;
pub mod plot;

use crate::model::Site;
use crate::results::Results;
use std::path::Path;

/// One figure of the report: its file stem, caption and rendering.
pub struct Figure {
    pub stem: String,
    pub caption: String,
    pub rendered: plot::Rendered,
}

/// The figures of the report: the undisturbed ground's, then each study's (in study order).
pub struct ReportFigures {
    pub ground: Vec<Figure>,
    pub studies: Vec<Vec<Figure>>,
}

impl ReportFigures {
    pub fn all(&self) -> impl Iterator<Item = &Figure> {
        self.ground.iter().chain(self.studies.iter().flatten())
    }
}

pub fn figures(results: &Results) -> Result<ReportFigures, String> {
    let ground = vec![
        Figure {
            stem: "ground-profile".into(),
            caption: "Undisturbed ground temperature: the annual range (band) and mean against depth (a deep profile over its top 20 m; ground-profile.csv holds every depth).".into(),
            rendered: plot::render_line_plot(&html::profile_plot(results), 720, 540)?,
        },
        Figure {
            stem: "surface-temperature".into(),
            caption: "Ground-surface temperature over the typical year.".into(),
            rendered: plot::render_line_plot(&html::surface_plot(results), 720, 400)?,
        },
    ];
    let studies = results
        .studies
        .iter()
        .map(|s| s.figures.figures(s))
        .collect::<Result<_, _>>()?;
    Ok(ReportFigures { ground, studies })
}

/// Every CSV of the bundle: file name and text.
fn csv_files(results: &Results) -> Vec<(String, String)> {
    let mut files = vec![
        ("ground-profile.csv".to_string(), csv::ground_profile(results)),
        ("surface-temperature.csv".to_string(), csv::surface_daily(results)),
    ];
    for s in &results.studies {
        files.extend(s.figures.csv_files(s));
    }
    files
}

/// Writes `report.html`, `results.json`, the CSV files and every plot (SVG and PNG) to `out_dir`.
pub fn write_bundle(results: &Results, site: &Site, out_dir: &Path) -> Result<(), String> {
    check_target(out_dir)?;
    let parent = match out_dir.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => Path::new(".").to_path_buf(),
    };
    std::fs::create_dir_all(&parent)
        .map_err(|e| format!("cannot create the folder {}: {e}", parent.display()))?;
    let tmp = tempfile::Builder::new()
        .prefix(".burrow-bundle-")
        .tempdir_in(&parent)
        .map_err(|e| format!("cannot create a temporary folder in {}: {e}", parent.display()))?;
    let figures = figures(results)?;
    let write = |name: &str, bytes: &[u8]| {
        let path = tmp.path().join(name);
        if let Some(dir) = path.parent() {
            std::fs::create_dir_all(dir).map_err(|e| format!("cannot create {}: {e}", dir.display()))?;
        }
        std::fs::write(&path, bytes).map_err(|e| format!("cannot write {}: {e}", path.display()))
    };
    let json =
        serde_json::to_string_pretty(results).map_err(|e| format!("cannot serialise the results: {e}"))?;
    write("results.json", json.as_bytes())?;
    for (name, text) in csv_files(results) {
        write(&name, text.as_bytes())?;
    }
    for f in figures.all() {
        write(&format!("plots/{}.svg", f.stem), f.rendered.svg.as_bytes())?;
        write(&format!("plots/{}.png", f.stem), &f.rendered.png)?;
    }
    write("report.html", html::report(results, site, &figures).as_bytes())?;
    replace_dir(tmp, out_dir)
}

/// A bundle replaces only a previous bundle (or an empty folder): an existing file, or a folder
/// holding anything else, is refused before anything is written, so `--out` can never move a
/// user's file or folder aside.
fn check_target(target: &Path) -> Result<(), String> {
    let Ok(meta) = std::fs::symlink_metadata(target) else {
        return Ok(());
    };
    if !meta.is_dir() {
        return Err(format!(
            "{} is an existing file, not a folder: give `--out` a new folder or a previous bundle",
            target.display()
        ));
    }
    let entries: Vec<_> = std::fs::read_dir(target)
        .map_err(|e| format!("cannot read the folder {}: {e}", target.display()))?
        .filter_map(Result::ok)
        .map(|e| e.file_name().to_string_lossy().into_owned())
        .collect();
    let bundle = entries.iter().any(|n| n == "results.json") && entries.iter().any(|n| n == "report.html");
    if entries.is_empty() || bundle {
        Ok(())
    } else {
        Err(format!(
            "{} is a folder that holds other files, not a previous burrow bundle: give `--out` a new or empty folder",
            target.display()
        ))
    }
}

/// Moves the finished temporary folder to `target`, replacing what was there.
fn replace_dir(tmp: tempfile::TempDir, target: &Path) -> Result<(), String> {
    let staged = tmp.keep();
    let old = target.with_file_name(format!(
        ".burrow-old-{}-{}",
        target
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default(),
        std::process::id()
    ));
    let had_old = target.exists();
    if had_old {
        std::fs::rename(target, &old).map_err(|e| {
            let _ = std::fs::remove_dir_all(&staged);
            format!("cannot move the previous bundle {} aside: {e}", target.display())
        })?;
    }
    if let Err(e) = std::fs::rename(&staged, target) {
        if had_old {
            let _ = std::fs::rename(&old, target);
        }
        let _ = std::fs::remove_dir_all(&staged);
        return Err(format!("cannot move the bundle into {}: {e}", target.display()));
    }
    if had_old {
        let _ = std::fs::remove_dir_all(&old);
    }
    Ok(())
}
