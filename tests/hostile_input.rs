//! Inputs that once crashed burrow or exhausted the machine (found by hand and by fuzzing) are
//! located errors or bounded, documented limits, and never a panic, an abort or a silent move.

use burrow::site::{Severity, load_text};
use std::path::{Path, PathBuf};
use std::process::Command;

const SITE: &str = "site: {name: Quillan Row}
climate: {model: annual-wave, mean: 8 °C, amplitude: 9 K, coldest_day: 30}
ground:
  layers: [{name: silt, conductivity: 1.4 W/(m K), heat_capacity: 2.0 MJ/(m3 K)}]
studies:
  - id: main
    kind: frost
";

fn errors(text: &str) -> Vec<String> {
    match load_text(text, "t.yaml", Path::new(".")) {
        Ok(_) => Vec::new(),
        Err(d) => d
            .iter()
            .filter(|d| d.severity == Severity::Error)
            .map(|d| d.to_string())
            .collect(),
    }
}

fn scratch(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("burrow-hostile-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

fn burrow(args: &[&str], dir: &Path) -> (Option<i32>, String) {
    let o = Command::new(env!("CARGO_BIN_EXE_burrow"))
        .args(args)
        .current_dir(dir)
        .output()
        .unwrap();
    (
        o.status.code(),
        String::from_utf8_lossy(&o.stdout).into_owned() + &String::from_utf8_lossy(&o.stderr),
    )
}

#[test]
fn carriage_returns_alone_end_lines_like_newlines() {
    let cr = SITE.replace('\n', "\r");
    let loaded = load_text(&cr, "t.yaml", Path::new(".")).unwrap();
    let echo = loaded.site.studies[0].echo.as_ref().unwrap();
    assert_eq!((echo.first_line, echo.last_line), (6, 7));
    assert!(
        echo.text.starts_with("- id: main") && echo.text.ends_with("kind: frost"),
        "{}",
        echo.text
    );
    // An error in such a file is located on the right line.
    let bad = SITE
        .replace("amplitude: 9 K", "amplitude: 9 parsecs")
        .replace('\n', "\r");
    let e = errors(&bad);
    assert!(e[0].starts_with("t.yaml:2:"), "{e:?}");
}

#[test]
fn unit_strings_that_nest_or_grow_are_refused_with_a_sentence() {
    let nested = format!("{}m{} K", "(".repeat(4_000), ")".repeat(4_000));
    let e = errors(&SITE.replace("amplitude: 9 K", &format!("amplitude: \"9 {nested}\"")));
    assert!(e.iter().any(|m| m.contains("at most 64 characters")), "{e:?}");
    let deep = SITE.replace("conductivity: 1.4 W/(m K)", "conductivity: 1.4 W/((((((m K))))))");
    let e = errors(&deep);
    assert!(e.iter().any(|m| m.contains("nested more than 4 deep")), "{e:?}");
    // Exponents that multiply past any physical unit (they once wrapped to m882311577).
    let wrap = SITE.replace("amplitude: 9 K", "amplitude: 9 ((((K99)99)99)99)");
    let e = errors(&wrap);
    assert!(e.iter().any(|m| m.contains("beyond ±12")), "{e:?}");
    let digits = SITE.replace("amplitude: 9 K", "amplitude: 9 K123456789012");
    assert!(!errors(&digits).is_empty());
}

#[test]
fn an_alias_bomb_of_long_strings_is_stopped_by_the_text_budget() {
    // 160,000 copies of a 9,000-byte string would be 1.4 GB; the node budget alone lets them by.
    let long = "x".repeat(9_000);
    let row = format!("[{}]", vec!["*s"; 400].join(", "));
    let table = format!("[{}]", vec!["*r"; 400].join(", "));
    let text = format!("{SITE}x-s: &s {long}\nx-r: &r {row}\nx-t: {table}\n");
    let e = errors(&text);
    assert!(
        e.iter().any(|m| m.contains("MB of text through its aliases")),
        "{e:?}"
    );
}

#[test]
fn a_value_longer_than_any_site_file_needs_is_refused() {
    let e = errors(&SITE.replace("Quillan Row", &"Q".repeat(20_000)));
    assert!(e.iter().any(|m| m.contains("at most 10000 bytes")), "{e:?}");
}

#[test]
fn a_long_list_is_not_blamed_on_aliases() {
    let many = vec!["1"; 250_000].join(", ");
    let e = errors(&format!("{SITE}x-values: [{many}]\n"));
    assert!(
        e.iter()
            .any(|m| m.contains("holds more than 200000 values") && !m.contains("alias")),
        "{e:?}"
    );
}

#[test]
fn many_keys_are_all_reported_as_unknown() {
    let keys: String = (0..20_000).map(|i| format!("k{i}: 1\n")).collect();
    let e = errors(&format!("{SITE}{keys}"));
    assert_eq!(e.iter().filter(|m| m.contains("unknown key")).count(), 20_000);
}

#[test]
fn an_endless_file_is_refused_at_its_size_limit() {
    let dir = scratch("endless");
    let (code, out) = burrow(&["check", "/dev/zero"], &dir);
    assert_eq!(code, Some(1), "{out}");
    assert!(out.contains("larger than 1 MB"), "{out}");
    let series = SITE.replace(
        "{model: annual-wave, mean: 8 °C, amplitude: 9 K, coldest_day: 30}",
        "{model: series, file: /dev/zero}",
    );
    std::fs::write(dir.join("site.yaml"), series).unwrap();
    let (code, out) = burrow(&["check", "site.yaml"], &dir);
    assert_eq!(code, Some(1), "{out}");
    assert!(out.contains("larger than 64 MB"), "{out}");
}

#[test]
fn study_ids_that_would_escape_the_bundle_or_hide_characters_are_refused() {
    let e = errors(&SITE.replace("id: main", "id: .."));
    assert!(e.iter().any(|m| m.contains("(not first)")), "{e:?}");
    let e = errors(&SITE.replace("id: main", "id: \"ma\\0in\""));
    assert!(
        e.iter().any(|m| m.contains("ma\\u{0}in") && !m.contains('\0')),
        "{e:?}"
    );
}

#[test]
fn out_never_moves_a_file_or_a_foreign_folder_aside() {
    let dir = scratch("out");
    std::fs::write(dir.join("site.yaml"), SITE).unwrap();
    std::fs::write(dir.join("notes.txt"), "keep me").unwrap();
    let (code, out) = burrow(&["run", "site.yaml", "--quiet", "--out", "notes.txt"], &dir);
    assert_eq!(code, Some(1), "{out}");
    assert!(out.contains("is an existing file"), "{out}");
    assert_eq!(std::fs::read_to_string(dir.join("notes.txt")).unwrap(), "keep me");
    std::fs::create_dir_all(dir.join("work")).unwrap();
    std::fs::write(dir.join("work/thesis.tex"), "keep me too").unwrap();
    let (code, out) = burrow(&["run", "site.yaml", "--quiet", "--out", "work"], &dir);
    assert_eq!(code, Some(1), "{out}");
    assert!(out.contains("not a previous burrow bundle"), "{out}");
    assert!(dir.join("work/thesis.tex").is_file());
    // A previous bundle is replaced as before.
    let (code, out) = burrow(&["run", "site.yaml", "--quiet", "--out", "bundle"], &dir);
    assert_eq!(code, Some(0), "{out}");
    let (code, out) = burrow(&["run", "site.yaml", "--quiet", "--out", "bundle"], &dir);
    assert_eq!(code, Some(0), "{out}");
}

const SECTION: &str = "site: {name: Ottery Gate}
climate: {model: annual-wave, mean: 9 °C, amplitude: 9 K, coldest_day: 30}
ground:
  layers: [{name: loam, conductivity: 1.3 W/(m K), heat_capacity: 2.4 MJ/(m3 K)}]
studies:
  - id: loop
    kind: cross-section
    domain: {width: 6 m, depth: 6 m}
    cell_size: {min: 0.05 m, max: 0.5 m}
    time: {duration: 120 d, step: 6 h}
    pipes:
      - {id: a, depth: 1.3 m, outer_diameter: 40 mm, heat_to_ground: -12 W/m}
";

#[test]
fn a_run_too_large_to_finish_is_refused_before_anything_is_allocated() {
    assert!(errors(SECTION).is_empty(), "{:?}", errors(SECTION));
    // 1000 years at 1 s steps once asked for ~250 GB and aborted the process.
    let e = errors(&SECTION.replace(
        "{duration: 120 d, step: 6 h}",
        "{duration: 1000 years, step: 1 s}",
    ));
    assert!(
        e.iter().any(|m| m.contains("studies[0].time.step")
            && m.contains("steps")
            && m.contains("take a step of at least")),
        "{e:?}"
    );
    let e = errors(&SECTION.replace("{min: 0.05 m, max: 0.5 m}", "{min: 0.1 mm, max: 1 mm}"));
    assert!(
        e.iter()
            .any(|m| m.contains("cells") && m.contains("larger cells")),
        "{e:?}"
    );
    let many: Vec<String> = (1..=150).map(|d| format!("{d} h")).collect();
    let e = errors(&SECTION.replace(
        "time: {duration: 120 d, step: 6 h}",
        &format!(
            "time: {{duration: 120 d, step: 6 h}}\n    snapshots: [{}]",
            many.join(", ")
        ),
    ));
    assert!(e.iter().any(|m| m.contains("at most 100 fields")), "{e:?}");
}

#[test]
fn values_beyond_anything_physical_are_refused_where_they_are_written() {
    for (from, to, path) in [
        (
            "conductivity: 1.3 W/(m K)",
            "conductivity: 1e308",
            "ground.layers[0].conductivity",
        ),
        (
            "conductivity: 1.3 W/(m K)",
            "conductivity: 1e50 W/(m K)",
            "ground.layers[0].conductivity",
        ),
        (
            "conductivity: 1.3 W/(m K)",
            "conductivity: 1e10",
            "ground.layers[0].conductivity",
        ),
        (
            "{name: loam, conductivity",
            "{name: loam, thickness: 1e308 m, conductivity",
            "ground.layers[0].thickness",
        ),
    ] {
        let e = errors(&SECTION.replace(from, to));
        assert!(
            e.iter().any(|m| m.contains(path) && m.contains("beyond any")),
            "{to}: {e:?}"
        );
    }
}

/// A field whose g-function would need more segments than burrow solves is refused at its
/// layout, before any matrix is built: 50 × 50 boreholes at 12 segments are 30,000.
#[test]
fn a_borefield_too_large_for_its_g_function_is_refused_at_the_layout() {
    let text = "site: {name: Hollin Moss}
climate: {model: annual-wave, mean: 9 °C, amplitude: 8 K, coldest_day: 30}
ground:
  layers: [{name: sand, conductivity: 2.0 W/(m K), heat_capacity: 2.2 MJ/(m3 K)}]
studies:
  - id: big
    kind: borefield
    layout: {rectangle: {rows: 50, columns: 50, spacing: 6 m}}
    borehole: {active_length: 100 m, top_depth: 1 m, diameter: 140 mm}
    heat_exchanger:
      type: single-u
      pipe: {outer_diameter: 32 mm, wall: 2.9 mm, conductivity: 0.42 W/(m K)}
      shank_spacing: 70 mm
      grout_conductivity: 1.5 W/(m K)
    fluid: {mixture: propylene-glycol, concentration: 25 %, flow_per_borehole: 0.5 l/s}
    loads: {constant: 400 kW}
    limits: {min_fluid: -3 °C, max_fluid: 30 °C}
    design_life: 10 years
";
    let e = errors(text);
    assert!(
        e.iter()
            .any(|m| m.contains("studies[0].layout") && m.contains("30000 segments")),
        "{e:?}"
    );
}
