//! The shared mechanisms of every study kind: values set at key paths of the site file as
//! written, `cover` instead of `depth` for any pipe, the decisions of each study as checks, and
//! a study that fails without hiding the others.

use burrow::kinds::StudyKind;
use burrow::site::keypath;
use burrow::site::yaml::Value;
use burrow::site::{Override, load_text, load_text_with};
use std::path::Path;
use std::process::Command;

const SITE: &str = "\
site: {name: Pellow Marsh test site}
climate: {model: annual-wave, mean: 8 °C, amplitude: 9 K, coldest_day: 30}
ground:
  layers:
    - {name: fill, thickness: 0.6 m, conductivity: 1.4 W/(m K), heat_capacity: 2.0 MJ/(m3 K)}
    - {name: clay, conductivity: 1.2 W/(m K), heat_capacity: 2.4 MJ/(m3 K)}
studies:
  - id: trunk
    kind: heat-loss
    pipes:
      - {id: supply, x: -0.2 m, depth: 1.0 m, outer_diameter: 200 mm, fluid: {temperature: 80 °C},
         layers: [{name: insulation, thickness: 60 mm, conductivity: 0.027 W/(m K)}]}
      - {id: return, x: 0.2 m, depth: 1.0 m, outer_diameter: 200 mm, fluid: {temperature: 45 °C},
         layers: [{name: insulation, thickness: 60 mm, conductivity: 0.027 W/(m K)}]}
";

fn set(path: &str, value: Value) -> Override {
    Override {
        path: keypath::parse(path).unwrap(),
        value,
    }
}

fn heat_loss_pipes(loaded: &burrow::site::Loaded) -> &[burrow::model::Pipe] {
    match &loaded.site.studies[0].kind {
        StudyKind::HeatLoss(h) => &h.pipes,
        other => panic!("not a heat-loss study: {}", other.name()),
    }
}

#[test]
fn a_value_set_at_a_key_path_reaches_the_model_in_the_keys_own_units() {
    let base = load_text(SITE, "t.yaml", Path::new(".")).unwrap();
    assert_eq!(base.site.ground.layers[1].conductivity_w_per_m_k, 1.2);
    let o = [
        set("ground.layers[1].conductivity", Value::Number(1.5)),
        set(
            "studies[trunk].pipes[return].depth",
            Value::String("1.25 m".into()),
        ),
        set(
            "studies[0].pipes[*].layers[0].conductivity",
            Value::String("0.03 W/(m K)".into()),
        ),
    ];
    let varied = load_text_with(SITE, "t.yaml", Path::new("."), &o).unwrap();
    assert_eq!(varied.site.ground.layers[1].conductivity_w_per_m_k, 1.5);
    assert_eq!(varied.site.ground.layers[0].conductivity_w_per_m_k, 1.4);
    let pipes = heat_loss_pipes(&varied);
    assert_eq!(pipes[1].depth_m, 1.25);
    assert_eq!(pipes[0].depth_m, 1.0);
    assert!(pipes.iter().all(|p| p.layers[0].conductivity_w_per_m_k == 0.03));
}

#[test]
fn a_set_value_is_validated_like_any_input_and_located_at_its_key() {
    let e = load_text_with(
        SITE,
        "t.yaml",
        Path::new("."),
        &[set("ground.layers[0].conductivity", Value::Number(-1.0))],
    )
    .unwrap_err();
    let error = e
        .iter()
        .find(|d| d.severity == burrow::site::Severity::Error)
        .unwrap();
    assert_eq!(error.path.to_string(), "ground.layers[0].conductivity");
    assert_eq!(
        error.loc.line, 5,
        "the message points at the key in the file: {error}"
    );
    let e = load_text_with(
        SITE,
        "t.yaml",
        Path::new("."),
        &[set("studies[north].pipes[0].depth", Value::Number(1.0))],
    )
    .unwrap_err();
    assert!(
        e[0].message.contains("`north`") && e[0].message.contains("trunk"),
        "{}",
        e[0]
    );
}

#[test]
fn cover_to_the_crown_gives_the_same_pipe_as_depth_to_the_centre() {
    // depth = cover + outer diameter / 2 = 0.9 m + 0.1 m.
    let with_cover = SITE.replace("x: 0.2 m, depth: 1.0 m", "x: 0.2 m, cover: 0.9 m");
    let a = load_text(SITE, "t.yaml", Path::new(".")).unwrap();
    let b = load_text(&with_cover, "t.yaml", Path::new(".")).unwrap();
    assert_eq!(heat_loss_pipes(&a), heat_loss_pipes(&b));
    let both = SITE.replace("x: 0.2 m, depth: 1.0 m", "x: 0.2 m, depth: 1.0 m, cover: 0.9 m");
    let e = load_text(&both, "t.yaml", Path::new(".")).unwrap_err();
    assert!(
        e.iter()
            .any(|d| d.path.to_string() == "studies[0].pipes[1].cover" && d.message.contains("not both")),
        "{e:?}"
    );
    let neither = SITE.replace("x: 0.2 m, depth: 1.0 m, ", "x: 0.2 m, ");
    let e = load_text(&neither, "t.yaml", Path::new(".")).unwrap_err();
    assert!(
        e.iter().any(|d| d.message.contains("`depth` is missing")),
        "{e:?}"
    );
    let negative = SITE.replace("x: 0.2 m, depth: 1.0 m", "x: 0.2 m, cover: -0.1 m");
    let e = load_text(&negative, "t.yaml", Path::new(".")).unwrap_err();
    assert!(e.iter().any(|d| d.message.contains("zero or more")), "{e:?}");
}

/// A main laid above the frost: the study's own check fails (frost depth against the crown
/// depth), and the decisive figure names that check. Modified Berggren frost depth is well
/// beyond 0.5 m under a 9 K surface amplitude around a 2 °C mean (the study's own figure; the
/// check compares it with the crown).
#[test]
fn a_main_above_the_frost_fails_its_frost_check() {
    let text = "\
site: {name: Hobb's Lane}
climate: {model: annual-wave, mean: 2 °C, amplitude: 12 K, coldest_day: 30}
ground:
  layers: [{name: silt, soil: silt}]
studies:
  - id: main
    kind: frost
    pipe: {id: main, cover: 0.4 m, outer_diameter: 110 mm, fluid: {temperature: 4 °C}}
";
    let loaded = load_text(text, "t.yaml", Path::new(".")).unwrap();
    let r = burrow::compute(&loaded, "t.yaml", b"", &burrow::Silent).unwrap();
    let s = &r.studies[0];
    let at_pipe = s.checks.iter().find(|c| c.code == "frost.at_pipe").unwrap();
    assert!(!at_pipe.passed);
    assert!(at_pipe.value.unwrap() > at_pipe.limit.unwrap());
    assert_eq!(at_pipe.limit, Some(0.4));
    let cover = s.checks.iter().find(|c| c.code == "frost.cover").unwrap();
    assert!(!cover.passed && cover.limit.unwrap() > 0.4);
    assert!(r.warnings.iter().any(|w| w.code == "frost.at_pipe"));
}

/// A borefield whose sizing can find no length (a load far beyond what 400 m boreholes carry)
/// fails alone: the frost study still runs and is reported, the failure names the study, and
/// the command exits 1 with the bundle written.
#[test]
fn a_failed_study_does_not_hide_the_others() {
    let text = "\
site: {name: Cobble Yard depot}
climate: {model: annual-wave, mean: 9 °C, amplitude: 8 K, coldest_day: 30}
ground:
  layers: [{name: sand, conductivity: 2.0 W/(m K), heat_capacity: 2.2 MJ/(m3 K)}]
studies:
  - id: frost-check
    kind: frost
  - id: yard-field
    kind: borefield
    layout: {rectangle: {rows: 1, columns: 2, spacing: 6 m}}
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
    find: length
";
    let dir = std::env::temp_dir().join(format!("burrow-isolation-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join("site.yaml");
    std::fs::write(&file, text).unwrap();
    let loaded = burrow::site::load(&file).unwrap_or_else(|e| panic!("{e:?}"));
    let r = burrow::compute(&loaded, "site.yaml", b"", &burrow::Silent).unwrap();
    assert_eq!(r.studies.len(), 1);
    assert_eq!(r.studies[0].id, "frost-check");
    assert_eq!(r.failed_studies.len(), 1);
    let f = &r.failed_studies[0];
    assert_eq!((f.id.as_str(), f.kind.as_str()), ("yard-field", "borefield"));
    assert!(
        !f.reason.is_empty() && !f.reason.starts_with("study "),
        "{}",
        f.reason
    );

    let out = dir.join("bundle");
    let o = Command::new(env!("CARGO_BIN_EXE_burrow"))
        .args(["run", "--quiet", "--out"])
        .arg(&out)
        .arg(&file)
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(1), "{}", String::from_utf8_lossy(&o.stderr));
    assert!(String::from_utf8_lossy(&o.stderr).contains("yard-field"));
    let json: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(out.join("results.json")).unwrap()).unwrap();
    assert_eq!(json["failed_studies"][0]["id"], "yard-field");
    assert_eq!(json["studies"][0]["id"], "frost-check");
    assert!(out.join("report.html").is_file());
}

/// A borefield over its own limit is a danger with a failed check, its report is still
/// written, and `--strict` exits 3; a fluid colder than its freezing point is said to freeze,
/// by how much (the sign right), and the properties taken at the edge of their range are
/// flagged. Invented loads far beyond two 60 m boreholes: 40 kW to the ground and, in the second
/// site, 40 kW from it.
#[test]
fn a_borefield_over_its_limits_is_a_danger_and_says_what_to_change() {
    let site = |load: &str| {
        format!(
            "\
site: {{name: Fenwick Lane depot}}
climate: {{model: annual-wave, mean: 9 °C, amplitude: 8 K, coldest_day: 30}}
ground:
  layers: [{{name: sand, conductivity: 2.0 W/(m K), heat_capacity: 2.2 MJ/(m3 K)}}]
studies:
  - id: yard
    kind: borefield
    layout: {{rectangle: {{rows: 1, columns: 2, spacing: 6 m}}}}
    borehole: {{active_length: 60 m, top_depth: 1 m, diameter: 140 mm}}
    heat_exchanger:
      type: single-u
      pipe: {{outer_diameter: 32 mm, wall: 2.9 mm, conductivity: 0.42 W/(m K)}}
      shank_spacing: 70 mm
      grout_conductivity: 1.5 W/(m K)
    fluid: {{mixture: propylene-glycol, concentration: 25 %, flow_per_borehole: 0.5 l/s}}
    loads: {{constant: {load}}}
    limits: {{min_fluid: -3 °C, max_fluid: 35 °C}}
    design_life: 2 years
"
        )
    };
    let dir = std::env::temp_dir().join(format!("burrow-over-limit-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join("hot.yaml");
    std::fs::write(&file, site("-40 kW")).unwrap();
    let loaded = burrow::site::load(&file).unwrap();
    let r = burrow::compute(&loaded, "hot.yaml", b"", &burrow::Silent).unwrap();
    let max = r.studies[0]
        .checks
        .iter()
        .find(|c| c.code == "borefield.max_fluid")
        .unwrap();
    assert!(!max.passed && max.value.unwrap() > 35.0);
    let w = r
        .warnings
        .iter()
        .find(|w| w.code == "borefield.limit_exceeded")
        .unwrap();
    assert_eq!(w.level, burrow::results::Level::Danger);
    assert!(
        w.message.contains("above the upper limit") && w.message.contains("lengthen"),
        "{}",
        w.message
    );
    let out = dir.join("bundle");
    let o = Command::new(env!("CARGO_BIN_EXE_burrow"))
        .args(["run", "--quiet", "--strict", "--out"])
        .arg(&out)
        .arg(&file)
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(3), "{}", String::from_utf8_lossy(&o.stderr));
    assert!(out.join("report.html").is_file());

    std::fs::write(&file, site("40 kW")).unwrap();
    let loaded = burrow::site::load(&file).unwrap();
    let r = burrow::compute(&loaded, "cold.yaml", b"", &burrow::Silent).unwrap();
    let s = &r.studies[0];
    let margin = s
        .checks
        .iter()
        .find(|c| c.code == "borefield.antifreeze_margin")
        .unwrap();
    assert!(!margin.passed && margin.value.unwrap() < 0.0);
    let w = r
        .warnings
        .iter()
        .find(|w| w.code == "borefield.antifreeze_margin")
        .unwrap();
    assert_eq!(w.level, burrow::results::Level::Danger);
    let below = format!("{:.1} K below the freezing point", -margin.value.unwrap());
    assert!(
        w.message.contains("would freeze") && w.message.contains(&below),
        "{}",
        w.message
    );
    assert!(
        r.warnings
            .iter()
            .any(|w| w.code == "borefield.fluid_properties_out_of_range")
    );
}
