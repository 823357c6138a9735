//! `kind: cross-section` through the whole pipeline (site text → engine → results).

use burrow::kinds::cross_section::CrossSectionResult;
use burrow::results::{Figures, Results};
use burrow::site;
use std::f64::consts::PI;
use std::path::Path;

fn run(text: &str) -> Results {
    let loaded = site::load_text(text, "t.yaml", Path::new(".")).unwrap_or_else(|e| panic!("{e:#?}"));
    burrow::compute(&loaded, "t.yaml", b"", &burrow::Silent).unwrap()
}

fn section(r: &Results) -> &CrossSectionResult {
    match &r.studies[0].figures {
        Figures::CrossSection(c) => c,
        _ => panic!("not a cross-section"),
    }
}

/// Steady isothermal pipe under an isothermal surface: q' = 2πkΔT/acosh(2H/D) (shape factor of a
/// cylinder under an isothermal plane; Carslaw & Jaeger 1959), within 2 % at the default grid.
/// The wall layer adds its shell resistance ln(r_o/r_i)/(2πk_w) in series.
#[test]
fn a_steady_pipe_matches_the_shape_factor_with_its_wall_in_series() {
    let text = "site: {name: steady pipe}
climate: {model: constant, temperature: 5}
ground:
  layers: [{name: fill, conductivity: 1.5, heat_capacity: 2.0e6}]
studies:
  - id: pipe
    kind: cross-section
    domain: {width: 30 m, depth: 15 m}
    time: {steady: true}
    pipes:
      - {id: p, x: 0, depth: 1.0, outer_diameter: 0.2, fluid: {temperature: 45}, layers: [{name: wall, thickness: 10 mm, conductivity: 0.4}]}
";
    let r = run(text);
    let c = section(&r);
    let wall = (0.1_f64 / 0.09).ln() / (2.0 * PI * 0.4);
    let ground = (2.0_f64 * 1.0 / 0.2).acosh() / (2.0 * PI * 1.5);
    let q = 40.0 / (wall + ground);
    let got = c.pipes[0].mean_heat_rate_w_per_m;
    assert!(((got - q) / q).abs() < 0.02, "{got} vs {q}");
    assert!(c.energy_balance_relative_error < 1e-4);
}

/// The bundled example runs: a heat-extracting loop cools the soil between its pipes below the
/// undisturbed temperature and the energy balance closes.
#[test]
fn the_ground_loop_example_cools_the_soil_between_the_pipes() {
    let path =
        Path::new(env!("CARGO_MANIFEST_DIR")).join("site-examples/brockwell-allotments-ground-loop.yaml");
    let loaded = site::load(&path).unwrap();
    let r = burrow::compute(&loaded, "x", b"", &burrow::Silent).unwrap();
    let c = section(&r);
    assert!(c.energy_balance_relative_error < 1e-4);
    assert!((c.pipes[0].mean_heat_rate_w_per_m + 12.0).abs() < 1e-6);
    let between = &c.probes[0];
    assert!(between.min_c < between.max_c - 3.0, "{between:?}");
    assert_eq!(c.fields.len(), 2);
}

#[test]
fn a_pipe_outside_the_domain_is_refused() {
    let text = "site: {name: x}
climate: {model: constant, temperature: 5}
ground:
  layers: [{name: fill, conductivity: 1.5, heat_capacity: 2.0e6}]
studies:
  - id: pipe
    kind: cross-section
    domain: {width: 2 m, depth: 2 m}
    time: {steady: true}
    pipes: [{id: p, x: 0.95, depth: 1.0, outer_diameter: 0.2, heat_to_ground: 5}]
";
    let e = site::load_text(text, "t.yaml", Path::new(".")).unwrap_err();
    assert!(e.iter().any(|d| d.path.to_string() == "studies[0].pipes[0]" && d.message.contains("outside the section")), "{e:?}");
}
