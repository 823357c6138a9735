//! The only code that knows YAML and unit spellings: site file text → validated [`Site`] model.
//!
//! Steps, each reporting every problem it finds with file:line:column and key path:
//! 1. read the bytes (missing file, non-UTF-8);
//! 2. parse the YAML into a located tree (`yaml`; syntax, alias bombs, duplicate keys);
//! 3. check the tree against the generated JSON Schema (`schema`; missing/unknown keys, types);
//! 4. deserialise into the document types (`doc`) and validate them into the SI model
//!    (`validate`; units, ranges, references, geometry).

pub mod diagnostic;
pub mod doc;
pub mod keypath;
pub mod quantity;
pub mod schema;
pub mod series_file;
pub mod units;
pub mod validate;
pub mod yaml;

use crate::model::Site;
pub use diagnostic::{Diagnostic, KeyPath, Severity};
use std::path::Path;
use yaml::Loc;

/// Largest site file read, bytes (a site file is a few kilobytes; long series go in CSV files).
pub const MAX_SITE_FILE_BYTES: u64 = 1 << 20;
/// Largest data file (a temperature series, hourly loads) read, bytes: about 30 years of hourly
/// records.
pub const MAX_DATA_FILE_BYTES: u64 = 64 << 20;

/// Reads at most `limit` bytes of a file; a longer one (or an endless one such as `/dev/zero`)
/// is refused with a sentence naming the limit, so reading never grows without bound.
pub fn read_bounded(path: &Path, limit: u64) -> std::io::Result<Vec<u8>> {
    use std::io::Read;
    let file = std::fs::File::open(path)?;
    let mut bytes = Vec::new();
    file.take(limit + 1).read_to_end(&mut bytes)?;
    if bytes.len() as u64 > limit {
        return Err(std::io::Error::other(format!(
            "the file is larger than {} MB, more than this kind of file ever needs",
            limit >> 20
        )));
    }
    Ok(bytes)
}

/// A site file that validated: the model, and the warnings raised on the way.
#[derive(Clone, Debug)]
pub struct Loaded {
    pub site: Site,
    pub warnings: Vec<Diagnostic>,
}

/// Reads and validates a site file. On failure, every problem found (errors and warnings).
pub fn load(path: &Path) -> Result<Loaded, Vec<Diagnostic>> {
    let label = path.display().to_string();
    let at_file = |message: String| {
        vec![Diagnostic {
            severity: Severity::Error,
            file: label.clone(),
            loc: Loc { line: 1, column: 1 },
            path: KeyPath::root(),
            message,
        }]
    };
    if path.is_dir() {
        return Err(at_file("this is a folder, not a site file".into()));
    }
    let bytes = read_bounded(path, MAX_SITE_FILE_BYTES).map_err(|e| {
        at_file(match e.kind() {
            std::io::ErrorKind::NotFound => "the site file does not exist; check the path".into(),
            std::io::ErrorKind::IsADirectory => "this is a folder, not a site file".into(),
            _ => format!("the site file cannot be read: {e}"),
        })
    })?;
    let text = match String::from_utf8(bytes) {
        Ok(t) => t,
        Err(e) => {
            let good = &e.as_bytes()[..e.utf8_error().valid_up_to()];
            let good = std::str::from_utf8(good).unwrap_or("");
            let line = good.matches('\n').count() + 1;
            let column = good.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
            return Err(vec![Diagnostic {
                severity: Severity::Error,
                file: label,
                loc: Loc { line, column },
                path: KeyPath::root(),
                message: "the site file is not UTF-8 text: save it as UTF-8".into(),
            }]);
        }
    };
    let base_dir = path.parent().unwrap_or(Path::new("."));
    load_text(&text, &label, base_dir)
}

/// Validates site-file text; `label` names it in messages, `base_dir` anchors relative paths.
pub fn load_text(text: &str, label: &str, base_dir: &Path) -> Result<Loaded, Vec<Diagnostic>> {
    load_text_with(text, label, base_dir, &[])
}

/// A value to set at a key path of the site file as written, before it is validated.
#[derive(Clone, Debug, PartialEq)]
pub struct Override {
    pub path: keypath::Path,
    /// A number (in the key's plain unit) or a string (a value with its unit, a preset name).
    pub value: yaml::Value,
}

/// Validates site-file text with `overrides` set on its tree first (see [`keypath`]); a key
/// path that does not exist in the file is an error naming it.
pub fn load_text_with(
    text: &str,
    label: &str,
    base_dir: &Path,
    overrides: &[Override],
) -> Result<Loaded, Vec<Diagnostic>> {
    let error_at = |loc: Loc, message: String| Diagnostic {
        severity: Severity::Error,
        file: label.to_string(),
        loc,
        path: KeyPath::root(),
        message,
    };
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    // One line ending for every later step: the YAML parser counts a lone `\r` as a line break,
    // `str::lines` does not, and the input echo and every location must agree.
    let normalised;
    let text = if text.contains('\r') {
        normalised = text.replace("\r\n", "\n").replace('\r', "\n");
        normalised.as_str()
    } else {
        text
    };
    let tree = yaml::parse(text).map_err(|e| vec![error_at(e.loc, e.message)])?;
    if tree.value == yaml::Value::Null {
        return Err(vec![error_at(
            Loc { line: 1, column: 1 },
            "the site file is empty; it needs `site`, `climate` and `ground` (`burrow init` prints a starter)".into(),
        )]);
    }
    let mut tree = tree;
    let mut failed = Vec::new();
    for o in overrides {
        if let Err(message) = keypath::set(&mut tree, &o.path, &o.value) {
            failed.push(error_at(Loc { line: 1, column: 1 }, message));
        }
    }
    if !failed.is_empty() {
        return Err(failed);
    }
    let mut out = diagnostic::Collector::new(label, &tree);
    let site_schema = schema::site_schema();
    schema::check_structure(&tree, &site_schema, &mut out);
    if out.has_errors() {
        return Err(sorted(out.items));
    }
    let document: doc::SiteDoc = match serde_json::from_value(schema::to_json(&tree)) {
        Ok(d) => d,
        Err(e) => {
            // The schema check passed, so this is a gap in the schema subset we check.
            out.error(
                &KeyPath::root(),
                format!("the site file does not fit its schema: {e}"),
            );
            return Err(sorted(out.items));
        }
    };
    let mut validator = validate::Validator {
        out: &mut out,
        base_dir,
    };
    let site = validate::site(&document, &mut validator);
    match site {
        Some(mut site) if !out.has_errors() => {
            for (study, echo) in site.studies.iter_mut().zip(study_echoes(text, &tree)) {
                study.echo = Some(echo);
            }
            Ok(Loaded {
                site,
                warnings: sorted(out.items),
            })
        }
        _ => Err(sorted(out.items)),
    }
}

/// The lines of each item of `studies`, verbatim: from the item's first line to the line before
/// the next item (or the next top-level key, or the end), trailing blank lines dropped and the
/// common indentation removed.
fn study_echoes(text: &str, tree: &yaml::Node) -> Vec<crate::model::InputEcho> {
    let yaml::Value::Map(top) = &tree.value else {
        return Vec::new();
    };
    let Some(pos) = top.iter().position(|(k, _)| k.name == "studies") else {
        return Vec::new();
    };
    let yaml::Value::Seq(items) = &top[pos].1.value else {
        return Vec::new();
    };
    let lines: Vec<&str> = text.lines().collect();
    let block_end = top
        .iter()
        .map(|(k, _)| k.loc.line)
        .filter(|&l| l > top[pos].0.loc.line)
        .min()
        .map_or(lines.len(), |l| l - 1);
    items
        .iter()
        .enumerate()
        .map(|(i, item)| {
            let first = item.loc.line.max(1);
            let next = items
                .get(i + 1)
                .map_or(block_end, |n| n.loc.line.saturating_sub(1));
            let mut last = next.max(first).min(lines.len());
            while last > first && lines[last - 1].trim().is_empty() {
                last -= 1;
            }
            let chunk = &lines[first - 1..last];
            let indent = chunk
                .iter()
                .filter(|l| !l.trim().is_empty())
                .map(|l| l.len() - l.trim_start().len())
                .min()
                .unwrap_or(0);
            let text = chunk
                .iter()
                .map(|l| l.get(indent.min(l.len() - l.trim_start().len())..).unwrap_or(""))
                .collect::<Vec<_>>()
                .join("\n");
            crate::model::InputEcho {
                first_line: first,
                last_line: last,
                text,
            }
        })
        .collect()
}

fn sorted(mut items: Vec<Diagnostic>) -> Vec<Diagnostic> {
    items.sort_by_key(|d| (d.loc.line, d.loc.column));
    items
}
