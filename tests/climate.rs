//! Climate models → undisturbed ground, checked against the closed-form periodic solution.
//!
//! The monthly-air and series climates always go through the numerical 1-D column; when their
//! input is a sampled sinusoid and the soil is homogeneous and dry, the result must match the
//! closed form of Carslaw & Jaeger, *Conduction of Heat in Solids* (1959), §2.6.

use burrow::physics::annual_wave::AnnualWave;
use burrow::site;
use std::f64::consts::PI;
use std::path::Path;

const MEAN: f64 = 8.0;
const AMP: f64 = 10.0;
const COLDEST_DAY: f64 = 30.0;
const K: f64 = 1.5;
const C: f64 = 2.2e6;

const GROUND: &str = "ground:
  layers:
    - {name: uniform, conductivity: 1.5, heat_capacity: 2.2e6}
";

fn closed_form() -> AnnualWave {
    AnnualWave {
        mean_c: MEAN,
        amplitude_k: AMP,
        coldest_day: COLDEST_DAY,
        period_s: 365.0 * 86_400.0,
    }
}

fn assert_matches_closed_form(results: &burrow::results::Results, tol_k: f64) {
    let wave = closed_form();
    assert_eq!(results.ground.profile_method, "numerical");
    let mut worst: f64 = 0.0;
    for row in &results.ground.profile {
        let (mean, min, max) = wave.envelope(row.depth_m, K / C, 0.0);
        for (got, want) in [(row.mean_c, mean), (row.min_c, min), (row.max_c, max)] {
            worst = worst.max((got - want).abs());
        }
    }
    eprintln!("largest difference from the closed form: {worst:.4} K");
    assert!(worst < tol_k, "largest difference from the closed form {worst} K");
}

fn compute(text: &str, dir: &Path) -> burrow::results::Results {
    let loaded = site::load_text(text, "t.yaml", dir).unwrap_or_else(|e| panic!("{e:?}"));
    burrow::compute(&loaded, "t.yaml", b"", &burrow::Silent).unwrap()
}

/// Twelve monthly means of the sinusoid (exact averages over twelve equal months) must give back
/// the sinusoid, and with it the closed-form envelope.
#[test]
fn monthly_means_of_a_wave_give_the_closed_form_envelope() {
    let tau_min = (COLDEST_DAY - 1.0) / 365.0;
    let s1 = (PI / 12.0).sin() / (PI / 12.0); // mean of cos over a twelfth of its period, per unit
    let months: Vec<String> = (0..12)
        .map(|j| {
            let tau = (j as f64 + 0.5) / 12.0;
            format!("{:.12}", MEAN - AMP * s1 * (2.0 * PI * (tau - tau_min)).cos())
        })
        .collect();
    let text = format!(
        "site: {{name: monthly}}\nclimate: {{model: monthly-air, air: [{}], n_factor_freezing: 1, n_factor_thawing: 1}}\n{GROUND}",
        months.join(", ")
    );
    let r = compute(&text, Path::new("."));
    assert_matches_closed_form(&r, 0.05);
}

/// A daily CSV of the sinusoid (two years) gives the closed-form envelope.
#[test]
fn a_daily_series_of_a_wave_gives_the_closed_form_envelope() {
    let dir = std::env::temp_dir().join(format!("burrow-climate-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let mut csv = String::from("date,air_temperature\n");
    for i in 0..730 {
        let (y, m, d) = burrow::calendar::civil_from_days(burrow::calendar::days_from_civil(2031, 1, 1) + i);
        let t = (i % 365) as f64 * 86_400.0;
        let value = MEAN - AMP * (2.0 * PI * (t - (COLDEST_DAY - 1.0) * 86_400.0) / (365.0 * 86_400.0)).cos();
        csv.push_str(&format!("{y:04}-{m:02}-{d:02},{value:.9}\n"));
    }
    // 2032 is a leap year: the file then has 731 days' dates for 730 records, which is fine;
    // what matters is the even daily step.
    std::fs::write(dir.join("mast.csv"), csv).unwrap();
    let text = format!(
        "site: {{name: series}}\nclimate: {{model: series, file: mast.csv, column: air_temperature}}\n{GROUND}"
    );
    let r = compute(&text, &dir);
    assert_matches_closed_form(&r, 0.05);
}

/// A constant surface with a geothermal flux: steady conduction, so the temperature rises by
/// q·d/k through each layer (Fourier's law in series).
#[test]
fn constant_surface_with_geothermal_flux_rises_by_q_over_k_per_layer() {
    let text = "site: {name: steady}
climate: {model: constant, temperature: 5 °C}
ground:
  geothermal_flux: 0.08
  layers:
    - {name: a, thickness: 4 m, conductivity: 2.0, heat_capacity: 2e6}
    - {name: b, conductivity: 1.0, heat_capacity: 2e6}
";
    let r = compute(text, Path::new("."));
    for row in &r.ground.profile {
        let z = row.depth_m;
        let want = 5.0 + 0.08 * z.min(4.0) / 2.0 + 0.08 * (z - 4.0).max(0.0) / 1.0;
        assert!(
            (row.mean_c - want).abs() < 1e-12 && row.min_c == row.max_c,
            "at {z} m"
        );
    }
}

/// The closed-form site path reports the closed form itself (no numerical drift).
#[test]
fn a_homogeneous_dry_site_uses_the_closed_form() {
    let text = format!(
        "site: {{name: wave}}\nclimate: {{model: annual-wave, mean: {MEAN}, amplitude: {AMP}, coldest_day: {COLDEST_DAY}}}\n{GROUND}"
    );
    let r = compute(&text, Path::new("."));
    assert_eq!(r.ground.profile_method, "closed-form");
    let d = (K / C * 365.0 * 86_400.0 / PI).sqrt(); // damping depth, C&J §2.6
    let at_d = r
        .ground
        .profile
        .iter()
        .find(|p| (p.depth_m - 2.0).abs() < 1e-9)
        .unwrap();
    assert!((at_d.max_c - MEAN - AMP * (-2.0 / d).exp()).abs() < 1e-9);
}

/// Frost depth of the undisturbed ground under a wave whose minimum is below 0 °C: in a dry
/// homogeneous soil the 0 °C isotherm reaches the depth where the damped amplitude equals the
/// mean, z = d·ln(A/m) (C&J §2.6).
#[test]
fn undisturbed_frost_depth_is_where_the_damped_amplitude_equals_the_mean() {
    let text = format!(
        "site: {{name: wave}}\nclimate: {{model: annual-wave, mean: {MEAN}, amplitude: {AMP}, coldest_day: 30}}\n{GROUND}"
    );
    let r = compute(&text, Path::new("."));
    let d = (K / C * 365.0 * 86_400.0 / PI).sqrt();
    let want = d * (AMP / MEAN).ln();
    assert!(
        (r.ground.max_frost_depth_m.unwrap() - want).abs() < 0.005,
        "{} vs {want}",
        r.ground.max_frost_depth_m.unwrap()
    );
}
