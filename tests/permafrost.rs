//! Perennially frozen ground: recognised in the undisturbed profile, reported as an active layer,
//! a permafrost table and a mean annual ground temperature, and never as a frost depth (a model's
//! bottom is not a depth of the ground).

use burrow::site::load_text;
use std::path::Path;

fn compute(text: &str) -> burrow::results::Results {
    let loaded = load_text(text, "t.yaml", Path::new(".")).unwrap_or_else(|e| panic!("{e:?}"));
    burrow::compute(&loaded, "t.yaml", b"", &burrow::Silent).unwrap()
}

/// Closed form (Carslaw & Jaeger 1959, §2.6): under a surface wave m − A cos ωt in a dry
/// homogeneous soil the annual maximum at depth z is m + A e^(−z/d), d = √(αP/π); it falls
/// below 0 °C at z = d ln(A/−m). With m = −2 °C, A = 8 K, α = 1e-6 m²/s: d = 3.1683 m and the
/// permafrost table lies at 4.3923 m. No unfrozen layer lies above it (the active layer ends
/// there too) and the mean annual ground temperature is m.
#[test]
fn the_permafrost_table_of_a_cold_annual_wave_is_where_the_annual_maximum_falls_below_zero() {
    let r = compute(
        "site: {name: Frostmere Flats}
climate: {model: annual-wave, mean: -2 °C, amplitude: 8 K, coldest_day: 30}
ground:
  layers: [{name: dry gravel, conductivity: 2.0 W/(m K), heat_capacity: 2.0 MJ/(m3 K)}]
",
    );
    let p = r.ground.permafrost.expect("permafrost is recognised");
    let d = (1e-6_f64 * 365.0 * 86_400.0 / std::f64::consts::PI).sqrt();
    let table = d * 4.0_f64.ln();
    println!(
        "table {:.4} m (closed form {table:.4} m), MAGT {:.4} °C",
        p.permafrost_table_depth_m, p.mean_annual_ground_temperature_c
    );
    assert!(
        (p.permafrost_table_depth_m - table).abs() < 0.005,
        "{}",
        p.permafrost_table_depth_m
    );
    assert_eq!(p.active_layer_depth_m, p.permafrost_table_depth_m);
    assert!((p.mean_annual_ground_temperature_c + 2.0).abs() < 1e-6);
    assert_eq!(
        r.ground.max_frost_depth_m, None,
        "the profile's bottom is not a frost depth"
    );
}

/// An invented subarctic town (monthly air −24.5 … +15.5 °C, n-factors 0.9 / 1.8, gravel fill
/// over clay, no geothermal flux): the frost study says the ground is permafrost (danger, failed
/// check) and gives no frost depth, cover or "frost at the crown", while the active layer it
/// reports is where the undisturbed annual maximum crosses 0 °C in the profile.
#[test]
fn a_frost_study_over_permafrost_gives_no_frost_depth_and_says_why() {
    let r = compute(
        "site: {name: Kettle Narrows}
climate:
  model: monthly-air
  air: [-24.5, -22, -15, -5, 4, 11.5, 15.5, 12.5, 5, -4, -15, -22]
  n_factor_freezing: 0.9
  n_factor_thawing: 1.8
ground:
  layers:
    - {name: gravel fill, thickness: 1.5 m, conductivity: 2.0 W/(m K), heat_capacity: 2.0 MJ/(m3 K), water_content: 0.08}
    - {name: clay, soil: clay}
studies:
  - id: main
    kind: frost
    method: both
    pipe: {id: main, cover: 2.5 m, outer_diameter: 160 mm, fluid: {temperature: 4 °C}}
",
    );
    let g = r.ground.permafrost.expect("permafrost in the profile");
    let s = &r.studies[0];
    let burrow::results::Figures::Frost(f) = &s.figures else {
        panic!("a frost study")
    };
    assert_eq!(f.max_frost_depth_m, None);
    assert_eq!(f.required_cover_m, None);
    assert_eq!(f.frost_reaches_pipe, None);
    assert_eq!(
        f.frost_depth_m.numerical, None,
        "the section's bottom is not a frost depth"
    );
    assert_eq!(f.permafrost, Some(g));
    let check = s.checks.iter().find(|c| c.code == "frost.permafrost").unwrap();
    assert!(!check.passed);
    assert!(
        !s.checks
            .iter()
            .any(|c| c.code == "frost.at_pipe" || c.code == "frost.cover")
    );
    let w = r.warnings.iter().find(|w| w.code == "frost.permafrost").unwrap();
    assert_eq!(w.level, burrow::results::Level::Danger);
    assert!(w.message.contains("does not apply"), "{}", w.message);
    assert!(r.warnings.iter().any(|w| w.code == "frost.domain_too_shallow"));
    // The active layer against the profile rows (0.25 m apart): between the last row whose
    // annual maximum is above 0 °C and the first below.
    let rows = &r.ground.profile;
    let i = rows.iter().position(|p| p.max_c < 0.0).unwrap();
    assert!(rows[i - 1].depth_m <= g.active_layer_depth_m && g.active_layer_depth_m <= rows[i].depth_m);
    assert!(g.mean_annual_ground_temperature_c < 0.0);
}
