//! Bad site files: each gives exit 1, a message located at file:line:column with its key path,
//! and no bundle. Run through the real binary, as a user would.

use std::path::{Path, PathBuf};
use std::process::Command;

const GOOD: &str = "site:
  name: Test plot
climate:
  model: annual-wave
  mean: 8 °C
  amplitude: 10 K
  coldest_day: 30
ground:
  layers:
    - name: sand
      thickness: 2 m
      conductivity: 1.5 W/(m K)
      heat_capacity: 2.2 MJ/(m3 K)
    - name: clay
      conductivity: 1.2
      heat_capacity: 2.5e6
studies: []
";

struct Outcome {
    code: i32,
    stdout: String,
    stderr: String,
    bundle_written: bool,
}

fn scratch(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("burrow-bad-input-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

fn burrow(args: &[&str], dir: &Path) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_burrow"))
        .args(args)
        .current_dir(dir)
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// Writes `bytes` as site.yaml, runs `check` and `run` on it.
fn try_site(name: &str, bytes: &[u8]) -> Outcome {
    let dir = scratch(name);
    std::fs::write(dir.join("site.yaml"), bytes).unwrap();
    let (code, stdout, _) = burrow(&["check", "site.yaml"], &dir);
    let (run_code, _, stderr) = burrow(&["run", "site.yaml", "--out", "bundle"], &dir);
    assert_eq!(code, run_code, "check and run disagree for {name}");
    let bundle_written = dir.join("bundle").exists() || std::fs::read_dir(&dir).unwrap().count() > 1;
    Outcome {
        code,
        stdout,
        stderr,
        bundle_written,
    }
}

/// Asserts the file is refused with a message at `line:col` naming `path` and containing `words`.
fn refused(name: &str, bytes: &[u8], line: usize, col: usize, path: &str, words: &str) {
    let o = try_site(name, bytes);
    assert_eq!(o.code, 1, "{name}: expected exit 1\n{}", o.stdout);
    assert!(!o.bundle_written, "{name}: a failed run left files behind");
    let wanted = format!("site.yaml:{line}:{col}: error: {path}: ");
    let hit = o.stdout.lines().find(|l| l.starts_with(&wanted));
    let hit = hit.unwrap_or_else(|| panic!("{name}: no line starting `{wanted}` in\n{}", o.stdout));
    assert!(hit.contains(words), "{name}: `{hit}` does not say `{words}`");
    assert!(
        o.stderr.contains(&wanted),
        "{name}: run did not report the problem on stderr:\n{}",
        o.stderr
    );
    assert!(!o.stderr.contains("panicked"), "{name}: panic");
}

#[test]
fn the_good_file_runs() {
    let o = try_site("good", GOOD.as_bytes());
    assert_eq!(o.code, 0, "{}\n{}", o.stdout, o.stderr);
}

#[test]
fn an_empty_file_is_refused() {
    refused("empty", b"# only a comment\n", 1, 1, "(top level)", "empty");
}

#[test]
fn a_missing_file_is_refused() {
    let dir = scratch("missing");
    let (code, stdout, _) = burrow(&["check", "nowhere.yaml"], &dir);
    assert_eq!(code, 1);
    assert!(
        stdout.contains("nowhere.yaml:1:1: error") && stdout.contains("does not exist"),
        "{stdout}"
    );
    let (code, _, stderr) = burrow(&["run", "nowhere.yaml", "--out", "b"], &dir);
    assert_eq!(code, 1);
    assert!(stderr.contains("does not exist"));
    assert!(!dir.join("b").exists());
}

#[test]
fn non_utf8_bytes_are_located() {
    let mut bytes = GOOD.as_bytes().to_vec();
    let at = GOOD.find("Test").unwrap();
    bytes[at] = 0xff;
    refused("non-utf8", &bytes, 2, 9, "(top level)", "not UTF-8");
}

#[test]
fn a_syntax_error_is_located() {
    let text = GOOD.replace("  amplitude: 10 K", "  amplitude: [10 K");
    let o = try_site("syntax", text.as_bytes());
    assert_eq!(o.code, 1);
    assert!(
        o.stdout.contains("site.yaml:") && o.stdout.contains("malformed"),
        "{}",
        o.stdout
    );
    assert!(!o.bundle_written);
}

#[test]
fn an_alias_bomb_is_refused() {
    let mut text = String::from(GOOD);
    text.push_str("x0: &a0 [lol, lol, lol, lol, lol, lol, lol, lol, lol]\n");
    for i in 1..10 {
        let p = i - 1;
        text.push_str(&format!(
            "x{i}: &a{i} [*a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}]\n"
        ));
    }
    let o = try_site("alias-bomb", text.as_bytes());
    assert_eq!(o.code, 1);
    assert!(o.stdout.contains("alias bomb"), "{}", o.stdout);
}

#[test]
fn a_duplicate_key_is_refused() {
    let text = GOOD.replace("  coldest_day: 30\n", "  coldest_day: 30\n  mean: 9 °C\n");
    refused(
        "duplicate-key",
        text.as_bytes(),
        8,
        3,
        "(top level)",
        "appears twice",
    );
}

#[test]
fn an_unknown_key_suggests_the_near_one() {
    let text = GOOD.replace(
        "      conductivity: 1.5 W/(m K)",
        "      conductivty: 1.5 W/(m K)",
    );
    refused(
        "unknown-key",
        text.as_bytes(),
        12,
        7,
        "ground.layers[0].conductivty",
        "did you mean `conductivity`",
    );
}

#[test]
fn a_missing_section_is_refused() {
    let text = GOOD.replace("site:\n  name: Test plot\n", "");
    refused(
        "missing-site",
        text.as_bytes(),
        1,
        1,
        "site",
        "required key `site` is missing",
    );
}

#[test]
fn a_missing_property_without_preset_is_refused() {
    let text = GOOD.replace("      conductivity: 1.2\n", "");
    refused(
        "missing-k",
        text.as_bytes(),
        14,
        7,
        "ground.layers[1].conductivity",
        "give the thermal conductivity or name a `soil` preset",
    );
}

#[test]
fn a_wrong_type_is_refused() {
    let text = GOOD.replace("coldest_day: 30", "coldest_day: thirty");
    refused(
        "wrong-type",
        text.as_bytes(),
        7,
        16,
        "climate.coldest_day",
        "expected a number",
    );
    let text = GOOD.replace("thickness: 2 m", "thickness: [2, 3]");
    refused(
        "list-for-number",
        text.as_bytes(),
        11,
        18,
        "ground.layers[0].thickness",
        "expected a number or a quantity with a unit",
    );
}

#[test]
fn an_unknown_unit_is_refused() {
    let text = GOOD.replace("1.5 W/(m K)", "1.5 W/(m Q)");
    refused(
        "unknown-unit",
        text.as_bytes(),
        12,
        21,
        "ground.layers[0].conductivity",
        "Q",
    );
}

#[test]
fn a_wrong_dimension_is_refused() {
    let text = GOOD.replace("thickness: 2 m", "thickness: 2 W/(m K)");
    refused(
        "wrong-dimension",
        text.as_bytes(),
        11,
        18,
        "ground.layers[0].thickness",
        "length",
    );
}

#[test]
fn non_finite_numbers_are_refused() {
    let text = GOOD.replace("mean: 8 °C", "mean: .nan");
    refused("nan", text.as_bytes(), 5, 9, "climate.mean", "");
    let text = GOOD.replace("conductivity: 1.2", "conductivity: .inf");
    refused(
        "inf",
        text.as_bytes(),
        15,
        21,
        "ground.layers[1].conductivity",
        "",
    );
    let text = GOOD.replace("conductivity: 1.2", "conductivity: 1e999");
    refused(
        "overflow",
        text.as_bytes(),
        15,
        21,
        "ground.layers[1].conductivity",
        "",
    );
}

#[test]
fn non_positive_properties_are_refused() {
    let text = GOOD.replace("conductivity: 1.5 W/(m K)", "conductivity: -1.5 W/(m K)");
    refused(
        "negative-k",
        text.as_bytes(),
        12,
        21,
        "ground.layers[0].conductivity",
        "greater than zero",
    );
    let text = GOOD.replace("heat_capacity: 2.5e6", "heat_capacity: 0");
    refused(
        "zero-c",
        text.as_bytes(),
        16,
        22,
        "ground.layers[1].heat_capacity",
        "greater than zero",
    );
    let text = GOOD.replace("thickness: 2 m", "thickness: 0 m");
    refused(
        "zero-thickness",
        text.as_bytes(),
        11,
        18,
        "ground.layers[0].thickness",
        "greater than zero",
    );
}

#[test]
fn a_missing_thickness_above_the_last_layer_is_refused() {
    let text = GOOD.replace("      thickness: 2 m\n", "");
    refused(
        "no-thickness",
        text.as_bytes(),
        10,
        7,
        "ground.layers[0].thickness",
        "only the last layer",
    );
}

#[test]
fn water_content_outside_zero_to_one_is_refused() {
    let text = GOOD.replace(
        "      heat_capacity: 2.5e6\n",
        "      heat_capacity: 2.5e6\n      water_content: 140 %\n",
    );
    refused(
        "water",
        text.as_bytes(),
        17,
        22,
        "ground.layers[1].water_content",
        "between 0 and 1",
    );
}

#[test]
fn a_negative_amplitude_and_a_bad_day_are_both_reported() {
    let text = GOOD
        .replace("amplitude: 10 K", "amplitude: -10 K")
        .replace("coldest_day: 30", "coldest_day: 400");
    let o = try_site("two-errors", text.as_bytes());
    assert_eq!(o.code, 1);
    assert!(
        o.stdout.contains("site.yaml:6:14: error: climate.amplitude"),
        "{}",
        o.stdout
    );
    assert!(
        o.stdout.contains("site.yaml:7:16: error: climate.coldest_day"),
        "{}",
        o.stdout
    );
    assert!(o.stdout.contains("2 error(s)"));
}

#[test]
fn an_unknown_climate_model_lists_the_models() {
    let text = GOOD.replace("model: annual-wave", "model: sine");
    refused(
        "model",
        text.as_bytes(),
        4,
        10,
        "climate.model",
        "annual-wave, monthly-air, series, constant",
    );
}

#[test]
fn eleven_monthly_values_are_refused() {
    let text = GOOD.replace(
        "  model: annual-wave\n  mean: 8 °C\n  amplitude: 10 K\n  coldest_day: 30\n",
        "  model: monthly-air\n  air: [-5, -4, 0, 5, 10, 14, 16, 15, 11, 6, 1]\n",
    );
    refused("eleven", text.as_bytes(), 5, 8, "climate.air", "exactly 12");
}

#[test]
fn an_unknown_soil_preset_lists_the_presets() {
    let text = GOOD.replace("    - name: clay\n", "    - name: clay\n      soil: loam-ish\n");
    refused(
        "preset",
        text.as_bytes(),
        15,
        13,
        "ground.layers[1].soil",
        "moist-sand",
    );
}

#[test]
fn a_missing_series_file_is_refused() {
    let text = GOOD.replace(
        "  model: annual-wave\n  mean: 8 °C\n  amplitude: 10 K\n  coldest_day: 30\n",
        "  model: series\n  file: weather/mast.csv\n",
    );
    refused("series", text.as_bytes(), 5, 9, "climate.file", "no such file");
}

#[test]
fn unknown_study_kinds_and_missing_kind_keys_are_refused() {
    let text = GOOD.replace(
        "studies: []\n",
        "studies:\n  - id: a\n    kind: borefield\n  - id: b\n    kind: sunbathing\n",
    );
    let o = try_site("kinds", text.as_bytes());
    assert_eq!(o.code, 1);
    assert!(
        o.stdout
            .contains("site.yaml:18:5: error: studies[0].layout: the required key `layout` is missing"),
        "{}",
        o.stdout
    );
    assert!(o.stdout.contains("site.yaml:21:11: error: studies[1].kind: `sunbathing` is not a known `kind`; use one of: heat-loss, cross-section, frost, borefield"), "{}", o.stdout);
}

const HEAT_LOSS: &str = "  - id: ID
    kind: heat-loss
    pipes:
      - {id: p, depth: 1 m, outer_diameter: 200 mm, fluid: {temperature: 70 °C}, layers: [{name: pur, thickness: 50 mm, conductivity: 0.027}]}
";

#[test]
fn duplicate_and_unsafe_study_ids_are_refused() {
    let studies = format!(
        "studies:\n{}{}{}",
        HEAT_LOSS.replace("ID", "trunk"),
        HEAT_LOSS.replace("ID", "trunk"),
        HEAT_LOSS.replace("ID", "../x")
    );
    let text = GOOD.replace("studies: []\n", &studies);
    let o = try_site("ids", text.as_bytes());
    assert_eq!(o.code, 1);
    assert!(
        o.stdout.contains(
            "site.yaml:22:9: error: studies[1].id: the study id `trunk` is already used by studies[0]"
        ),
        "{}",
        o.stdout
    );
    assert!(
        o.stdout
            .contains("site.yaml:26:9: error: studies[2].id: the study id `../x` names files"),
        "{}",
        o.stdout
    );
}

#[test]
fn a_pipe_above_the_surface_is_refused() {
    let studies = format!(
        "studies:\n{}",
        HEAT_LOSS
            .replace("ID", "trunk")
            .replace("depth: 1 m", "depth: 0.05 m")
    );
    let text = GOOD.replace("studies: []\n", &studies);
    refused(
        "pipe-above",
        text.as_bytes(),
        21,
        24,
        "studies[0].pipes[0].depth",
        "above the ground surface",
    );
}

#[test]
fn a_second_document_is_refused() {
    let text = format!("{GOOD}---\nsite: {{name: other}}\n");
    refused("two-docs", text.as_bytes(), 18, 1, "(top level)", "second one");
}

#[test]
fn an_implausible_value_warns_but_runs() {
    let text = GOOD.replace("conductivity: 1.5 W/(m K)", "conductivity: 9 W/(m K)");
    let o = try_site("implausible", text.as_bytes());
    assert_eq!(o.code, 0, "{}", o.stderr);
    assert!(
        o.stdout
            .contains("site.yaml:12:21: warning: ground.layers[0].conductivity"),
        "{}",
        o.stdout
    );
    assert!(o.stderr.contains("input.unusual_value"), "{}", o.stderr);
}

#[test]
fn usage_errors_exit_two() {
    let dir = scratch("usage");
    assert_eq!(burrow(&["run"], &dir).0, 2);
    assert_eq!(burrow(&["frobnicate"], &dir).0, 2);
    assert_eq!(burrow(&["init", "swimming-pool"], &dir).0, 2);
}

const BOREFIELD: &str = "studies:
  - id: bf
    kind: borefield
    layout: {rectangle: {rows: 2, columns: 2, spacing: 6 m}}
    borehole: {active_length: 120 m, diameter: 140 mm}
    heat_exchanger:
      type: single-u
      pipe: {outer_diameter: 40 mm, wall: 3.7 mm, conductivity: 0.42}
      shank_spacing: 80 mm
      grout_conductivity: 1.6
    fluid: {mixture: propylene-glycol, concentration: 25 %, flow_per_borehole: 0.5 l/s}
    loads: {constant: 5 kW}
    limits: {min_fluid: -3 °C, max_fluid: 30 °C}
    design_life: 20 years
";

fn borefield_site(from: &str, to: &str) -> String {
    let study = BOREFIELD.replace(from, to);
    assert!(from.is_empty() || study != BOREFIELD, "`{from}` not found");
    GOOD.replace("studies: []\n", &study)
}

#[test]
fn the_good_borefield_runs() {
    let o = try_site("bf-good", borefield_site("", "").as_bytes());
    assert_eq!(o.code, 0, "{}\n{}", o.stdout, o.stderr);
}

#[test]
fn borefield_layout_must_be_one_form() {
    let text = borefield_site(
        "{rectangle: {rows: 2, columns: 2, spacing: 6 m}}",
        "{rectangle: {rows: 2, columns: 2, spacing: 6 m}, points: [[0, 0]]}",
    );
    refused(
        "bf-layout",
        text.as_bytes(),
        20,
        13,
        "studies[0].layout",
        "give exactly one of `rectangle`",
    );
    let text = borefield_site(
        "{rectangle: {rows: 2, columns: 2, spacing: 6 m}}",
        "{points: [[0, 0], [0.1, 0]]}",
    );
    refused(
        "bf-close",
        text.as_bytes(),
        20,
        13,
        "studies[0].layout",
        "closer than the borehole diameter",
    );
}

#[test]
fn borefield_lower_limit_at_the_freezing_point_is_refused() {
    let text = borefield_site("mixture: propylene-glycol, concentration: 25 %", "mixture: water");
    refused(
        "bf-freeze",
        text.as_bytes(),
        29,
        25,
        "studies[0].limits.min_fluid",
        "freezing point of the fluid (0.0 °C)",
    );
}

#[test]
fn borefield_legs_outside_the_borehole_are_refused() {
    let text = borefield_site("shank_spacing: 80 mm", "shank_spacing: 130 mm");
    refused(
        "bf-shank",
        text.as_bytes(),
        25,
        22,
        "studies[0].heat_exchanger.shank_spacing",
        "beyond the borehole wall",
    );
}

#[test]
fn borefield_needs_exactly_one_kind_of_load() {
    let text = borefield_site("loads: {constant: 5 kW}", "loads: {}");
    refused(
        "bf-noload",
        text.as_bytes(),
        28,
        12,
        "studies[0].loads",
        "give exactly one of `monthly`",
    );
}

#[test]
fn borefield_hourly_file_is_checked_line_by_line() {
    let text = borefield_site("loads: {constant: 5 kW}", "loads: {hourly: loads.csv}");
    let dir = scratch("bf-hourly");
    std::fs::write(dir.join("site.yaml"), &text).unwrap();
    std::fs::write(dir.join("loads.csv"), "load_w\n100\n200\nabc\n").unwrap();
    let (code, stdout, _) = burrow(&["check", "site.yaml"], &dir);
    assert_eq!(code, 1);
    assert!(
        stdout.contains("site.yaml:28:21: error: studies[0].loads.hourly: line 4 of"),
        "{stdout}"
    );
    assert!(stdout.contains("`abc` is not a load in W"), "{stdout}");
    std::fs::write(dir.join("loads.csv"), "100\n200\n").unwrap();
    let (code, stdout, _) = burrow(&["check", "site.yaml"], &dir);
    assert_eq!(code, 1);
    assert!(
        stdout.contains("holds 2 hourly values; it needs exactly 8760"),
        "{stdout}"
    );
}

#[test]
fn borefield_design_life_must_be_whole_months() {
    let text = borefield_site("design_life: 20 years", "design_life: 3 weeks");
    refused(
        "bf-life",
        text.as_bytes(),
        30,
        18,
        "studies[0].design_life",
        "whole months from 1 to 100 years",
    );
}

/// Limits no length can meet are found by the run, not the check: exit 1, a sentence naming the
/// study and the range, and a bundle that lists the failed study with its reason.
#[test]
fn borefield_sizing_that_cannot_meet_the_limits_fails_the_run_cleanly() {
    let text = borefield_site("loads: {constant: 5 kW}", "loads: {constant: 400 kW}")
        .replace("design_life: 20 years", "design_life: 20 years\n    find: length");
    let dir = scratch("bf-unmeetable");
    std::fs::write(dir.join("site.yaml"), &text).unwrap();
    let (code, _, stderr) = burrow(&["run", "site.yaml", "--out", "bundle"], &dir);
    assert_eq!(code, 1, "{stderr}");
    assert!(
        stderr
            .contains("no active length from 20 to 400 m keeps the mean fluid temperature within its limits"),
        "{stderr}"
    );
    let json: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(dir.join("bundle/results.json")).unwrap()).unwrap();
    assert!(
        json["failed_studies"][0]["reason"]
            .as_str()
            .unwrap()
            .starts_with("no active length from 20 to 400 m")
    );
    assert_eq!(json["studies"].as_array().unwrap().len(), 0);
}

/// The borefield's former load and sizing keys are refused with a message naming burrow's keys
/// (`from_ground`, `to_ground`, `peak`, `find: length`).
#[test]
fn former_borefield_keys_name_their_replacements() {
    let text = borefield_site(
        "loads: {constant: 5 kW}",
        "loads:\n      monthly:\n        extracted: [1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1]\n        to_ground: [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0]\n        peak_hours: 6 h",
    );
    refused(
        "bf-old-monthly",
        text.as_bytes(),
        30,
        9,
        "studies[0].loads.monthly.extracted",
        "write `from_ground` instead",
    );
    refused(
        "bf-old-peak",
        text.as_bytes(),
        32,
        9,
        "studies[0].loads.monthly.peak_hours",
        "write `peak: {duration}` instead",
    );
    let text = borefield_site(
        "design_life: 20 years",
        "design_life: 20 years\n    size: active_length",
    );
    refused(
        "bf-old-size",
        text.as_bytes(),
        31,
        5,
        "studies[0].size",
        "write `find: length` instead",
    );
}
