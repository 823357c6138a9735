//! The site-file contract: the committed schema, the bundled examples and starters, and unit
//! independence of the results.

use burrow::site;
use std::path::{Path, PathBuf};
use std::process::Command;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

#[test]
fn committed_schema_equals_the_generated_one() {
    let committed = std::fs::read_to_string(root().join("schemas/site.schema.json")).expect(
        "schemas/site.schema.json exists; regenerate with `cargo run -- schema > schemas/site.schema.json`",
    );
    assert!(
        committed == site::schema::site_schema_text(),
        "schemas/site.schema.json is stale: regenerate it with `cargo run -- schema > schemas/site.schema.json`"
    );
}

#[test]
fn the_schema_states_the_unit_of_every_physical_field() {
    let schema = site::schema::site_schema_text();
    let json: serde_json::Value = serde_json::from_str(&schema).unwrap();
    let mut missing = Vec::new();
    fn walk(v: &serde_json::Value, path: String, missing: &mut Vec<String>) {
        if let Some(o) = v.as_object() {
            if o.contains_key("x-unit") {
                let d = o.get("description").and_then(|d| d.as_str()).unwrap_or("");
                let unit = o["x-unit"].as_str().unwrap();
                if !d.contains(unit) {
                    missing.push(path.clone());
                }
            }
            for (k, c) in o {
                walk(c, format!("{path}/{k}"), missing);
            }
        } else if let Some(a) = v.as_array() {
            for (i, c) in a.iter().enumerate() {
                walk(c, format!("{path}/{i}"), missing);
            }
        }
    }
    walk(&json, String::new(), &mut missing);
    assert!(missing.is_empty(), "descriptions without their unit: {missing:?}");
}

fn run_bundle(site_file: &Path, name: &str) -> PathBuf {
    let out = std::env::temp_dir().join(format!("burrow-contract-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&out);
    let status = Command::new(env!("CARGO_BIN_EXE_burrow"))
        .args(["run", "--quiet", "--out"])
        .arg(&out)
        .arg(site_file)
        .output()
        .unwrap();
    assert_eq!(
        status.status.code(),
        Some(0),
        "{name}: {}",
        String::from_utf8_lossy(&status.stderr)
    );
    for file in [
        "report.html",
        "results.json",
        "ground-profile.csv",
        "plots/ground-profile.svg",
        "plots/ground-profile.png",
    ] {
        assert!(out.join(file).is_file(), "{name}: {file} missing from the bundle");
    }
    out
}

#[test]
fn every_example_checks_and_runs() {
    let mut n = 0;
    for entry in std::fs::read_dir(root().join("site-examples")).unwrap() {
        let path = entry.unwrap().path();
        if path.extension().is_some_and(|e| e == "yaml") {
            let loaded = site::load(&path).unwrap_or_else(|e| panic!("{}: {e:?}", path.display()));
            assert!(
                loaded.warnings.is_empty(),
                "{}: {:?}",
                path.display(),
                loaded.warnings
            );
            let stem = path.file_stem().unwrap().to_string_lossy().into_owned();
            let out = run_bundle(&path, &stem);
            let results: serde_json::Value =
                serde_json::from_str(&std::fs::read_to_string(out.join("results.json")).unwrap()).unwrap();
            assert_eq!(results["tool"]["name"], "burrow");
            assert!(results["ground"]["profile"].as_array().unwrap().len() >= 61);
            decisive_figures_point_at_their_values(&results, &stem);
            n += 1;
        }
    }
    assert!(n >= 3, "expected an example per user group");
}

/// Every decisive figure's `key` is a dotted path to the same value in the study's entry, and a
/// check it names is one of the study's checks (the generic access the summary, uncertainty and
/// inventories rely on).
fn decisive_figures_point_at_their_values(results: &serde_json::Value, name: &str) {
    for study in results["studies"].as_array().unwrap() {
        let figures = study["decisive_figures"].as_array().unwrap();
        assert!(
            !figures.is_empty(),
            "{name}: study {} has no decisive figure",
            study["id"]
        );
        let codes: Vec<&str> = study["checks"]
            .as_array()
            .unwrap()
            .iter()
            .map(|c| c["code"].as_str().unwrap())
            .collect();
        for f in figures {
            let key = f["key"].as_str().unwrap();
            let mut v = study;
            for part in key.split('.') {
                v = match part.split_once('[') {
                    Some((k, i)) => &v[k][i.trim_end_matches(']').parse::<usize>().unwrap()],
                    None => &v[part],
                };
            }
            assert_eq!(v.as_f64(), f["value"].as_f64(), "{name}: decisive figure {key}");
            if let Some(code) = f["check"].as_str() {
                assert!(
                    codes.contains(&code),
                    "{name}: {key} names the check {code}, not among {codes:?}"
                );
            }
        }
    }
}

#[test]
fn every_starter_template_checks_and_runs() {
    for (name, text) in burrow::templates::ALL {
        let dir = std::env::temp_dir().join(format!("burrow-template-{}-{name}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let file = dir.join(format!("{name}.yaml"));
        std::fs::write(&file, text).unwrap();
        site::load(&file).unwrap_or_else(|e| panic!("{name}: {e:?}"));
        let out = run_bundle(&file, name);
        let results: serde_json::Value =
            serde_json::from_str(&std::fs::read_to_string(out.join("results.json")).unwrap()).unwrap();
        decisive_figures_point_at_their_values(&results, name);
    }
}

/// The same site written in US customary units and in SI gives the same results.
/// Conversion factors: NIST SP 811 (2008) Appendix B: 1 ft = 0.3048 m; °F = 1.8 °C + 32; a
/// temperature difference of 1 °F = 5/9 K; 1 Btu_IT/(h ft °F) = 1055.05585262 J / (3600 s ×
/// 0.3048 m × 5/9 K).
#[test]
fn us_customary_and_si_inputs_give_identical_results() {
    let btu_k = 1055.05585262 / (3600.0 * 0.3048 * 5.0 / 9.0);
    let si = format!(
        "site: {{name: units}}
climate: {{model: annual-wave, mean: 10 °C, amplitude: 10 K, coldest_day: 30}}
ground:
  geothermal_flux: 0.06
  layers:
    - {{name: a, thickness: 3.048 m, conductivity: {k1}, heat_capacity: 2.2e6, water_content: 0.2}}
    - {{name: b, conductivity: {k2}, heat_capacity: 2.0e6}}
",
        k1 = btu_k,
        k2 = 1.5 * btu_k
    );
    let us = "site: {name: units}
climate: {model: annual-wave, mean: 50 °F, amplitude: 18 °F, coldest_day: 30}
ground:
  geothermal_flux: 0.06 W/m2
  layers:
    - {name: a, thickness: 10 ft, conductivity: 1 Btu/(h ft °F), heat_capacity: 2.2 MJ/(m3 K), water_content: 20 %}
    - {name: b, conductivity: 1.5 Btu/(h ft °F), heat_capacity: 2000 kJ/(m3 K)}
";
    let a = site::load_text(&si, "si.yaml", Path::new(".")).unwrap();
    let b = site::load_text(us, "us.yaml", Path::new(".")).unwrap();
    let ra = burrow::compute(&a, "x", b"", &burrow::Silent).unwrap();
    let rb = burrow::compute(&b, "x", b"", &burrow::Silent).unwrap();
    assert_eq!(ra.ground.profile_method, "numerical");
    for (p, q) in ra.ground.profile.iter().zip(&rb.ground.profile) {
        for (x, y) in [(p.mean_c, q.mean_c), (p.min_c, q.min_c), (p.max_c, q.max_c)] {
            assert!((x - y).abs() < 1e-9, "at {} m: {x} vs {y}", p.depth_m);
        }
    }
}

/// `--strict` turns a danger-level warning into exit code 3; the bundle is still written
/// (product.md, commands). The water-main example's main is laid too shallow on purpose.
#[test]
fn strict_exits_three_on_danger_and_still_writes_the_bundle() {
    let out = std::env::temp_dir().join(format!("burrow-strict-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&out);
    let o = Command::new(env!("CARGO_BIN_EXE_burrow"))
        .args(["run", "--quiet", "--strict", "--out"])
        .arg(&out)
        .arg(root().join("site-examples/tarnwick-heights-water-main.yaml"))
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(3), "{}", String::from_utf8_lossy(&o.stderr));
    assert!(String::from_utf8_lossy(&o.stderr).contains("DANGER"));
    assert!(out.join("report.html").is_file());
}

/// Every preset name the schema's descriptions offer next to `burrow materials` (soils, surfaces,
/// mixtures) is accepted by the site check, every name `burrow materials` lists is offered, and
/// the frost study's `surface` takes each of its listed values.
#[test]
fn every_preset_the_documentation_names_is_accepted() {
    let schema: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(root().join("schemas/site.schema.json")).unwrap())
            .unwrap();
    let mut offered: Vec<String> = Vec::new();
    fn walk(v: &serde_json::Value, out: &mut Vec<String>) {
        match v {
            serde_json::Value::Object(o) => {
                if let Some(d) = o.get("description").and_then(|d| d.as_str())
                    && d.contains("burrow materials")
                {
                    for (i, part) in d.split('`').enumerate() {
                        if i % 2 == 1 && part != "burrow materials" && part != "soil" {
                            out.push(part.to_string());
                        }
                    }
                }
                o.values().for_each(|x| walk(x, out));
            }
            serde_json::Value::Array(a) => a.iter().for_each(|x| walk(x, out)),
            _ => {}
        }
    }
    walk(&schema, &mut offered);
    let table = burrow::templates::materials_table();
    let surfaces: Vec<&str> = burrow::physics::frost::n_factor_presets()
        .iter()
        .map(|p| p.key)
        .collect();
    assert!(!offered.is_empty());
    for name in &offered {
        assert!(
            table
                .lines()
                .any(|l| l.split_whitespace().next() == Some(name.as_str())),
            "`{name}` is offered by the schema but not listed by `burrow materials`"
        );
    }
    for s in &surfaces {
        assert!(
            offered.iter().any(|o| o == s),
            "surface `{s}` is not offered by the schema"
        );
        let text = format!(
            "site: {{name: t}}\nclimate: {{model: monthly-air, air: [-8, -6, -1, 5, 11, 15, 17, 16, 12, 6, 0, -5]}}\nground:\n  layers: [{{name: silt, soil: silt}}]\nstudies:\n  - id: f\n    kind: frost\n    surface: {s}\n"
        );
        site::load_text(&text, "t.yaml", Path::new(".")).unwrap_or_else(|e| panic!("surface {s}: {e:?}"));
    }
    for soil in burrow::materials::soils::presets() {
        let text = format!(
            "site: {{name: t}}\nclimate: {{model: annual-wave, mean: 8, amplitude: 9, coldest_day: 30}}\nground:\n  layers: [{{name: x, soil: {}}}]\n",
            soil.name
        );
        site::load_text(&text, "t.yaml", Path::new("."))
            .unwrap_or_else(|e| panic!("soil {}: {e:?}", soil.name));
    }
}
