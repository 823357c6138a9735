//! `kind: frost` through the whole pipeline (site text → results), against closed forms and
//! hand calculations.

use burrow::kinds::frost::FrostResult;
use burrow::results::{Figures, Level, Results};
use burrow::site;
use std::f64::consts::PI;
use std::path::Path;

const K_F: f64 = 2.0;
const W: f64 = 0.25; // volumetric water content
const L: f64 = W * 1000.0 * 333.55e3; // J/m3 (IAPWS latent heat)

fn site_text(climate: &str, study: &str) -> String {
    format!(
        "site: {{name: frost check}}
climate: {climate}
ground:
  layers:
    - {{name: silt, conductivity: 1.5, frozen_conductivity: {K_F}, heat_capacity: 2.4e6, frozen_heat_capacity: 1.9e6, water_content: {W}}}
studies:
{study}"
    )
}

fn run_in(text: &str, dir: &Path) -> Results {
    let loaded = site::load_text(text, "t.yaml", dir).unwrap_or_else(|e| panic!("{e:#?}"));
    burrow::compute(&loaded, "t.yaml", b"", &burrow::Silent).unwrap()
}

fn frost(r: &Results) -> &FrostResult {
    match &r.studies[0].figures {
        Figures::Frost(f) => f,
        _ => panic!("not a frost study"),
    }
}

const WAVE: &str = "{model: annual-wave, mean: 3 °C, amplitude: 12 K, coldest_day: 20}";

fn study(depth: f64) -> String {
    format!(
        "  - id: main
    kind: frost
    pipe: {{id: m, depth: {depth} m, outer_diameter: 160 mm, layers: [{{name: pe, thickness: 9.5 mm, conductivity: 0.4}}], fluid: {{temperature: 4 °C}}}}
"
    )
}

/// Freezing index of a sinusoidal surface temperature m − A cos ωt over one year:
/// F = (P/π)(A sin θ − m θ), θ = acos(m/A) (TM 5-852-6; integral of the negative part), and
/// Stefan's depth X = sqrt(2 k_f F / L) (TM 5-852-6, ch. 3).
#[test]
fn a_wave_climate_gives_the_closed_form_index_and_stefan_depth() {
    let r = run_in(&site_text(WAVE, &study(2.0)), Path::new("."));
    let f = frost(&r);
    let theta = (3.0_f64 / 12.0).acos();
    let index = 365.0 / PI * (12.0 * theta.sin() - 3.0 * theta);
    assert!(
        (f.design_freezing_index_c_days - index).abs() < 1e-6 * index,
        "{} vs {index}",
        f.design_freezing_index_c_days
    );
    let stefan = (2.0 * K_F * index * 86_400.0 / L).sqrt();
    let got = f.frost_depth_m.stefan.unwrap();
    assert!((got - stefan).abs() < 1e-6, "{got} vs {stefan}");
    // The modified Berggren depth lies below Stefan's upper bound (λ < 1) and governs.
    let b = f.frost_depth_m.berggren.unwrap();
    assert!(b < stefan && f.max_frost_depth_m == Some(b));
}

#[test]
fn a_main_below_the_frost_is_safe_and_one_above_is_flagged() {
    let deep = run_in(&site_text(WAVE, &study(2.5)), Path::new("."));
    assert_eq!(frost(&deep).frost_reaches_pipe, Some(false));
    assert!(!deep.warnings.iter().any(|w| w.level == Level::Danger));
    let shallow = run_in(&site_text(WAVE, &study(0.8)), Path::new("."));
    assert_eq!(frost(&shallow).frost_reaches_pipe, Some(true));
    assert!(
        shallow
            .warnings
            .iter()
            .any(|w| w.code == "frost.at_pipe" && w.level == Level::Danger)
    );
}

/// The required cover lies between the frost depth and the frost depth plus the margin (here it
/// is exactly their sum: the crown sits the margin below the frost).
#[test]
fn the_required_cover_is_the_frost_depth_plus_the_margin() {
    let r = run_in(
        &site_text(
            WAVE,
            &study(1.0).replace("kind: frost", "kind: frost\n    margin: 0.3 m"),
        ),
        Path::new("."),
    );
    let f = frost(&r);
    let cover = f.required_cover_m.unwrap();
    assert!(cover >= f.max_frost_depth_m.unwrap() && cover <= f.max_frost_depth_m.unwrap() + 0.3 + 1e-12);
    assert!((cover - f.max_frost_depth_m.unwrap() - 0.3).abs() < 1e-12);
}

/// A design air index from a local table becomes a surface index through the freezing n-factor
/// (TM 5-852-6: surface index = n_f × air index).
#[test]
fn a_design_air_index_is_scaled_by_the_freezing_n_factor() {
    let climate = "{model: monthly-air, air: [-8, -6, -1, 5, 11, 15, 17, 16, 12, 6, 0, -5], n_factor_freezing: 0.7, n_factor_thawing: 1.2}";
    let s = study(2.0).replace("kind: frost", "kind: frost\n    design_freezing_index: 1200 °C·d");
    let r = run_in(&site_text(climate, &s), Path::new("."));
    let f = frost(&r);
    assert!((f.design_freezing_index_c_days - 840.0).abs() < 1e-9);
    assert_eq!(f.air_freezing_index_c_days, Some(1200.0));
}

/// Four winters of a daily series, each a block of constant frost: the seasonal index of a block
/// of n days at −a °C is n·a; the design index is the mean of the three coldest (TM 5-852-6).
#[test]
fn a_series_design_index_is_the_mean_of_the_three_coldest_winters() {
    let dir = std::env::temp_dir().join(format!("burrow-frost-series-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let mut csv = String::from("date,air\n");
    let start = burrow::calendar::days_from_civil(2030, 7, 1);
    let frosts = [-4.0, -9.0, -6.0, -12.0];
    let mut day = start;
    for a in frosts {
        for i in 0..365 {
            let (y, m, d) = burrow::calendar::civil_from_days(day);
            let t = if (150..210).contains(&i) { a } else { 5.0 };
            csv.push_str(&format!("{y:04}-{m:02}-{d:02},{t}\n"));
            day += 1;
        }
    }
    // One more day so that the last season is complete even across the leap day of 2032.
    for _ in 0..2 {
        let (y, m, d) = burrow::calendar::civil_from_days(day);
        csv.push_str(&format!("{y:04}-{m:02}-{d:02},5\n"));
        day += 1;
    }
    std::fs::write(dir.join("mast.csv"), csv).unwrap();
    let r = run_in(&site_text("{model: series, file: mast.csv}", &study(2.0)), &dir);
    let f = frost(&r);
    let want = 60.0 * (12.0 + 9.0 + 6.0) / 3.0;
    assert!(f.seasons.len() >= 3, "{:?}", f.seasons);
    assert!(
        (f.design_freezing_index_c_days - want).abs() < 1e-9,
        "{} vs {want}",
        f.design_freezing_index_c_days
    );
}

/// Coldest pipe wall: the water's temperature reaches the wall through the wall and ground
/// resistances in series, so T_wall = T_g + (T_w − T_g)·R_g/(R_w + R_g), with R_g the cylinder
/// under an isothermal surface, acosh(H/r)/(2πk) (Carslaw & Jaeger; shape-factor tables), and the
/// coldest undisturbed T_g at the pipe depth from the closed-form wave, mean − A·e^(−z/d)
/// (Carslaw & Jaeger §2.6). A dry homogeneous soil keeps the ground on the closed form.
#[test]
fn the_coldest_pipe_wall_follows_the_series_resistances() {
    let text = "site: {name: wall}
climate: {model: annual-wave, mean: 3 °C, amplitude: 12 K, coldest_day: 20}
ground:
  layers: [{name: dry sand, conductivity: 1.5, heat_capacity: 2.0e6}]
studies:
  - id: main
    kind: frost
    pipe: {id: m, depth: 1.5 m, outer_diameter: 0.16, layers: [{name: pe, thickness: 10 mm, conductivity: 0.4}], fluid: {temperature: 4}}
";
    let r = run_in(text, Path::new("."));
    let f = frost(&r);
    let d = (1.5_f64 / 2.0e6 * 365.0 * 86_400.0 / PI).sqrt();
    let t_g = 3.0 - 12.0 * (-1.5 / d).exp();
    let r_g = (1.5_f64 / 0.08).acosh() / (2.0 * PI * 1.5);
    let r_w = (0.08_f64 / 0.07).ln() / (2.0 * PI * 0.4);
    let want = t_g + (4.0 - t_g) * r_g / (r_w + r_g);
    let got = f.pipe_min_temperature_c.unwrap();
    assert!((got - want).abs() < 1e-3, "{got} vs {want}");
    // Dry soil: no latent heat for Stefan or Berggren, so the frost depth is where the damped
    // minimum crosses 0 °C, z = d·ln(A/m) (Carslaw & Jaeger §2.6), and a caution says so.
    assert_eq!(f.frost_depth_m.stefan, None);
    assert!(
        (f.max_frost_depth_m.unwrap() - d * (12.0_f64 / 3.0).ln()).abs() < 0.005,
        "{}",
        f.max_frost_depth_m.unwrap()
    );
    assert!(r.warnings.iter().any(|w| w.code == "frost.no_latent_heat"));
}

fn homogeneous_site(climate: &str, interval: &str, study: &str) -> String {
    format!(
        "site: {{name: frost check}}
climate: {climate}
ground:
  layers:
    - {{name: silt, conductivity: 1.5, frozen_conductivity: {K_F}, heat_capacity: 2.4e6, frozen_heat_capacity: 1.9e6, water_content: {W}, freezing_interval: {interval}}}
studies:
{study}"
    )
}

/// The engine's free-field frost depth against the modified Berggren equation (TM 5-852-6) in
/// one homogeneous soil under the annual wave. The engine itself is checked against Neumann's
/// surface-step solution (Carslaw & Jaeger §11.2) in tests/section_transient.rs
/// (`freezing_front_follows_neumann_two_phase_solution`, within 3 %). Berggren's λ is that
/// Neumann solution for a STEP of the season's mean surface temperature from a ground at the
/// mean annual temperature; the real surface is the sinusoid and the ground starts from its
/// periodic state, which is the approximation the equation makes. The soil here freezes over
/// 0.05 K so that the engine's 0 °C isotherm is the sharp front Berggren assumes. Tolerance 10 %
/// (from memory: the size of the modified Berggren equation's departures from numerical
/// solutions for homogeneous soils); measured in the output.
#[test]
fn the_engines_free_field_frost_depth_agrees_with_modified_berggren_in_a_homogeneous_soil() {
    let s = study(2.5).replace("kind: frost", "kind: frost\n    method: both");
    let r = run_in(&homogeneous_site(WAVE, "0.05 K", &s), Path::new("."));
    let f = frost(&r);
    let b = f.frost_depth_m.berggren.unwrap();
    let n = f.frost_depth_m.numerical.unwrap();
    println!("numerical {n:.3} m, Berggren {b:.3} m, ratio {:.4}", n / b);
    assert!((n / b - 1.0).abs() < 0.10, "numerical {n} vs Berggren {b}");
    // The governing depth is the deeper of the two; Stefan stays an upper bound of Berggren.
    assert_eq!(f.max_frost_depth_m, Some(n.max(b)));
    let num = f.numerical.as_ref().unwrap();
    assert!(num.energy_balance_relative_error < 1e-4);
    // The design index is the typical year's own (closed form vs the daily curve: 1e-3).
    assert!((num.winter_scale - 1.0).abs() < 1e-3, "{}", num.winter_scale);
    // The same typical year in the 1-D periodic column (engine/column.rs, a separate code
    // checked against the closed forms in tests/ground_profile.rs) freezes to the same depth:
    // the 2-D section's edge column is the free field. Within 3 % (the two grids differ).
    let column = r.ground.max_frost_depth_m.unwrap();
    println!("1-D periodic column {column:.3} m");
    assert!((n / column - 1.0).abs() < 0.03, "section {n} vs column {column}");
    // The water at 4 °C keeps the wall above 0 °C and warmer than the free-field ground at its
    // depth; the report's pipe figure is the engine's.
    let wall = f.pipe_min_temperature_c.unwrap();
    assert_eq!(Some(wall), num.pipe_min_wall_temperature_c);
    assert!(wall > num.ground_min_at_pipe_c.unwrap() && wall < 4.0, "{wall}");
}

fn index_of(climate: &str, season_start: &str) -> f64 {
    let s = format!("  - id: f\n    kind: frost\n    season_start: \"{season_start}\"\n");
    let r = run_in(&site_text(climate, &s), Path::new("."));
    let f = frost(&r);
    assert_eq!(f.season_start, season_start);
    f.design_freezing_index_c_days
}

/// Moving the season start within the warm part of the year counts the same winter: the
/// cumulative degree-day curve of a contiguous winter falls by the same amount (TM 5-852-6's
/// definition is the largest fall within the season). The climate is a sinusoid, 3 − 12 cos,
/// coldest in late January, given as monthly values and interpolated to days (the closed-form
/// path of an `annual-wave` climate does not depend on the start at all).
#[test]
fn a_season_start_in_summer_or_autumn_leaves_the_freezing_index_unchanged() {
    let air: Vec<String> = (0..12)
        .map(|i| format!("{:.4}", 3.0 - 12.0 * (2.0 * PI * (i as f64 - 0.2) / 12.0).cos()))
        .collect();
    let climate = format!(
        "{{model: monthly-air, air: [{}], n_factor_freezing: 1, n_factor_thawing: 1}}",
        air.join(", ")
    );
    let climate = climate.as_str();
    let july = index_of(climate, "07-01");
    for start in ["05-15", "09-01", "10-10"] {
        let other = index_of(climate, start);
        assert!((other - july).abs() < 1e-9 * july, "{start}: {other} vs {july}");
    }
    assert!(july > 300.0, "{july}");
}

/// South of the equator the default season start follows the climate: with the same sinusoid
/// shifted by half a year (coldest in late July), the default start is the warmest day of the
/// typical year (late January), the whole winter is counted, and the index equals the northern
/// climate's and the southern one's counted from an explicit summer start. (With a fixed 1 July
/// start the southern winter would be cut in two; the largest fall of the cumulative curve
/// within a season is TM 5-852-6's definition.)
#[test]
fn the_default_season_start_follows_the_climate_in_the_southern_hemisphere() {
    let climate = |shift: f64| {
        let air: Vec<String> = (0..12)
            .map(|i| {
                format!(
                    "{:.4}",
                    3.0 - 12.0 * (2.0 * PI * (i as f64 - 0.2 - shift) / 12.0).cos()
                )
            })
            .collect();
        format!(
            "{{model: monthly-air, air: [{}], n_factor_freezing: 1, n_factor_thawing: 1}}",
            air.join(", ")
        )
    };
    let (north, south) = (climate(0.0), climate(6.0));
    let default_of = |climate: &str| {
        let r = run_in(
            &site_text(climate, "  - id: f\n    kind: frost\n"),
            Path::new("."),
        );
        let f = frost(&r);
        (f.design_freezing_index_c_days, f.season_start.clone())
    };
    let (south_default, start) = default_of(&south);
    let (north_default, north_start) = default_of(&north);
    let south_summer = index_of(&south, "01-15");
    let south_cut = index_of(&south, "07-01");
    println!(
        "south default {south_default:.6} from {start}, north {north_default:.6} from {north_start}, south from 07-01 {south_cut:.2}"
    );
    assert!(start.starts_with("01-") || start.starts_with("02-"), "{start}");
    assert!(
        north_start.starts_with("07-") || north_start.starts_with("08-"),
        "{north_start}"
    );
    assert!((south_default - south_summer).abs() < 1e-9 * south_summer);
    // Mirrors to within the unequal lengths of the calendar months the monthly means stand for
    // (measured 1.8e-6 relative).
    assert!((south_default - north_default).abs() < 1e-5 * north_default);
    assert!(
        south_cut < 0.8 * south_default,
        "a 1 July start cuts the southern winter"
    );
}

/// A season that starts at the coldest instant of a sinusoidal surface splits the winter into
/// two equal halves; the index is then one half, ∫ (A cos φ − m) dt over φ = 2π(t − t_min)/P
/// from 0 to θ = acos(m/A): (P/2π)(A sin θ − m θ), half the whole winter's (P/π)(A sin θ − m θ)
/// (TM 5-852-6's largest fall of the cumulative curve within the season).
#[test]
fn a_season_start_inside_the_winter_splits_it_and_lowers_the_index() {
    // Coldest day 20 (1-based): the minimum is at t = 19 d; the season from 01-20 starts there.
    let whole = index_of(WAVE, "07-01");
    let split = index_of(WAVE, "01-20");
    let (m, a, p) = (3.0_f64, 12.0_f64, 365.0_f64);
    let theta = (m / a).acos();
    let want = p / (2.0 * PI) * (a * theta.sin() - m * theta);
    println!("whole {whole:.2}, split {split:.2}, hand {want:.2} °C·d");
    assert!((split / want - 1.0).abs() < 0.005, "{split} vs {want}");
    assert!(split < 0.55 * whole);
}

/// Bleed flow against a hand calculation: the steady heat balance of water flowing through
/// ground at T_g, T(L) = T_g + (T_in − T_g) exp(−L/(Q ρc R')) (Incropera & DeWitt §8.3.3),
/// solved for Q with T(L) = T_min: Q = L / (ρc R' ln((T_in − T_g)/(T_min − T_g))). R' is the
/// wall, ln(r_o/r_i)/(2πk_w), plus the ground, acosh(H/r_o)/(2πk) (cylinder under an
/// isothermal surface); T_g the coldest closed-form ground at the pipe depth, m − A e^(−z/d)
/// (Carslaw & Jaeger §2.6, dry homogeneous soil); ρc of water at 0 °C 4.218 MJ/(m3 K) (from
/// memory, 0.1 %).
#[test]
fn the_bleed_flow_matches_the_heat_balance_along_the_pipe() {
    let text = "site: {name: bleed}
climate: {model: annual-wave, mean: 3 °C, amplitude: 12 K, coldest_day: 20}
ground:
  layers: [{name: dry sand, conductivity: 1.5, heat_capacity: 2.0e6}]
studies:
  - id: main
    kind: frost
    pipe: {id: m, depth: 1.5 m, outer_diameter: 0.16, layers: [{name: pe, thickness: 10 mm, conductivity: 0.4}], fluid: {temperature: 4}}
    bleed: {length: 400 m, min_temperature: 0.5 °C}
";
    let r = run_in(text, Path::new("."));
    let b = frost(&r).bleed.as_ref().unwrap();
    let d = (1.5_f64 / 2.0e6 * 365.0 * 86_400.0 / PI).sqrt();
    let t_g = 3.0 - 12.0 * (-1.5 / d).exp();
    let r_g = (1.5_f64 / 0.08).acosh() / (2.0 * PI * 1.5);
    let r_w = (0.08_f64 / 0.07).ln() / (2.0 * PI * 0.4);
    let q = 400.0 / (4.218e6 * (r_w + r_g) * ((4.0 - t_g) / (0.5 - t_g)).ln());
    let want = q * 60_000.0;
    println!(
        "bleed {:.4} l/min vs hand {want:.4} l/min (T_g {t_g:.3} °C)",
        b.flow_l_per_min
    );
    assert!((b.flow_l_per_min / want - 1.0).abs() < 1e-3);
    assert_eq!(
        (b.length_m, b.min_temperature_c, b.inlet_temperature_c),
        (400.0, 0.5, 4.0)
    );
    // The flow grows with the length: the heat balance is linear in L for a fixed outlet.
    let long = run_in(&text.replace("400 m", "800 m"), Path::new("."));
    let b2 = frost(&long).bleed.as_ref().unwrap();
    assert!((b2.flow_l_per_min / b.flow_l_per_min - 2.0).abs() < 1e-9);
}

const MILD_WAVE: &str = "{model: annual-wave, mean: 6 °C, amplitude: 12 K, coldest_day: 20}";

const BOARD_STUDY: &str = "  - id: main
    kind: frost
    method: both
    pipe: {id: m, depth: 1.0 m, outer_diameter: 160 mm, layers: [{name: pe, thickness: 9.5 mm, conductivity: 0.4}], fluid: {temperature: 4 °C}}
    board: {thickness: 50 mm, conductivity: 0.035 W/(m K), gap: 0.1 m, max_width: 3 m}
    bleed: {length: 400 m}
";

/// The insulation board found by the engine: frost over the pipe gets shallower as the board
/// widens; the width found keeps the crown at or above 0 °C all winter and a board 20 %
/// narrower does not (each a design winter after a spin-up year, water standing). Also the
/// results.json keys of the issue.
#[test]
fn the_narrowest_board_keeps_the_crown_out_of_frost_and_a_narrower_one_does_not() {
    let text = site_text(MILD_WAVE, BOARD_STUDY);
    let loaded = site::load_text(&text, "t.yaml", Path::new(".")).unwrap();
    let r = burrow::compute(&loaded, "t.yaml", b"", &burrow::Silent).unwrap();
    let f = frost(&r);
    assert_eq!(f.frost_reaches_pipe, Some(true));
    let trials = &f.board.as_ref().unwrap().trials;
    let width = f.board_width_m.unwrap().expect("a board up to 3 m should do");
    for t in trials {
        println!(
            "board {:.3} m: crown min {:+.3} °C, frost over pipe {:.3} m",
            t.width_m, t.crown_min_temperature_c, t.frost_depth_over_pipe_m
        );
    }
    for pair in trials.windows(2) {
        assert!(
            pair[1].frost_depth_over_pipe_m <= pair[0].frost_depth_over_pipe_m + 0.005,
            "{pair:?}"
        );
    }
    assert!(trials[0].frost_depth_over_pipe_m > trials.last().unwrap().frost_depth_over_pipe_m + 0.3);
    let found = trials.iter().find(|t| t.width_m == width).unwrap();
    assert!(found.crown_min_temperature_c >= 0.0);
    // 20 % narrower, run afresh through the same engine path.
    let site = &loaded.site;
    let ground = burrow::ground::profile::undisturbed(site, 15.0).unwrap();
    let burrow::model::StudyKind::Frost(study) = &site.studies[0].kind else {
        panic!("frost")
    };
    let pipe = study.pipe.as_ref().unwrap();
    let winter = burrow::kinds::frost::numerical::Winter::new(
        burrow::ground::climate::SurfaceYear::from_climate(&site.climate),
        181.0 * 86_400.0,
        f.design_freezing_index_c_days,
    )
    .unwrap();
    let narrower = burrow::kinds::frost::numerical::board_trial(
        site,
        &ground,
        pipe,
        study.board.as_ref().unwrap(),
        &winter,
        0.8 * width,
    )
    .unwrap();
    println!(
        "board {:.3} m: crown min {:+.3} °C",
        narrower.width_m, narrower.crown_min_c
    );
    assert!(narrower.crown_min_c < 0.0);

    // results.json carries the keys.
    let json = serde_json::to_value(&r).unwrap();
    let s = &json["studies"][0];
    for key in ["stefan", "berggren", "numerical"] {
        assert!(s["frost_depth_m"][key].is_number(), "frost_depth_m.{key}");
    }
    for key in [
        "design_freezing_index_c_days",
        "max_frost_depth_m",
        "pipe_min_temperature_c",
        "required_cover_m",
        "board_width_m",
        "season_start",
    ] {
        assert!(!s[key].is_null(), "{key}");
    }
    assert!(s["frost_reaches_pipe"].as_bool().unwrap());
    assert!(s["bleed"]["flow_l_per_min"].as_f64().unwrap() > 0.0);
}

fn refusal(study: &str) -> String {
    let errors = site::load_text(&site_text(WAVE, study), "t.yaml", Path::new(".")).unwrap_err();
    errors
        .iter()
        .map(|d| format!("{d:?}"))
        .collect::<Vec<_>>()
        .join("\n")
}

/// The new keys are checked where they are written: a day that does not exist, a bleed flow
/// without water to bleed, a board that would stick out of the ground.
#[test]
fn bad_season_start_bleed_and_board_keys_are_refused_with_their_key_path() {
    let e = refusal("  - id: f\n    kind: frost\n    season_start: \"02-30\"\n");
    assert!(e.contains("season_start") && e.contains("MM-DD"), "{e}");
    let e = refusal("  - id: f\n    kind: frost\n    bleed: {length: 100 m}\n");
    assert!(e.contains("bleed") && e.contains("water temperature"), "{e}");
    let e = refusal(&study(0.3).replace(
        "kind: frost",
        "kind: frost\n    board: {thickness: 0.2 m, conductivity: 0.035}",
    ));
    assert!(e.contains("board") && e.contains("out of the ground"), "{e}");
}
