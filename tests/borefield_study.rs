//! `kind: borefield` through the whole pipeline (site text → results), against closed forms,
//! the g-function module called directly, and hand calculations.

use burrow::kinds::borefield::BorefieldResult;
use burrow::physics::gfunction::{Borehole, WallCondition, gfunction};
use burrow::physics::superposition::MONTH_S;
use burrow::results::{Figures, Level, Results};
use burrow::site;
use std::f64::consts::PI;
use std::path::Path;

/// Homogeneous dry rock under an annual wave without geothermal flux: the annual-mean
/// undisturbed temperature is the mean surface temperature at every depth (Carslaw & Jaeger
/// §2.6), so T₀ = 9 °C exactly.
const K: f64 = 2.5;
const C: f64 = 2.2e6;
const T0: f64 = 9.0;

fn site_text(study: &str) -> String {
    format!(
        "site: {{name: borefield check}}
climate: {{model: annual-wave, mean: {T0} °C, amplitude: 8 K, coldest_day: 30}}
ground:
  layers:
    - {{name: rock, conductivity: {K}, heat_capacity: {C}}}
studies:
{study}"
    )
}

fn run_in(text: &str, dir: &Path) -> Results {
    let loaded = site::load_text(text, "t.yaml", dir).unwrap_or_else(|e| panic!("{e:#?}"));
    burrow::compute(&loaded, "t.yaml", b"", &burrow::Silent).unwrap()
}

fn run(text: &str) -> Results {
    run_in(text, Path::new("."))
}

fn borefield(r: &Results, i: usize) -> &BorefieldResult {
    match &r.studies[i].figures {
        Figures::Borefield(b) => b,
        _ => panic!("not a borefield study"),
    }
}

/// A study with the given layout, loads and extra keys; single U, 25 % propylene glycol.
fn study(layout: &str, length: f64, loads: &str, extra: &str) -> String {
    format!(
        "  - id: field
    kind: borefield
    layout: {layout}
    borehole: {{active_length: {length} m, top_depth: 2 m, diameter: 140 mm}}
    heat_exchanger:
      type: single-u
      pipe: {{outer_diameter: 40 mm, wall: 3.7 mm, conductivity: 0.42}}
      shank_spacing: 80 mm
      grout_conductivity: 1.6
{extra}    fluid: {{mixture: propylene-glycol, concentration: 25 %, flow_per_borehole: 0.5 l/s}}
    loads: {loads}
    limits: {{min_fluid: -3 °C, max_fluid: 30 °C}}
"
    )
}

const ONE: &str = "{points: [[0, 0]]}";
const MEASURED: &str = "      borehole_resistance: 0.1 m K/W\n";

fn g_at(length: f64, t_s: f64) -> f64 {
    let field = [Borehole {
        x_m: 0.0,
        y_m: 0.0,
        length_m: length,
        buried_depth_m: 2.0,
        radius_m: 0.07,
    }];
    gfunction(&field, K / C, &[t_s], WallCondition::UniformHeatFlux).unwrap()[0]
}

/// Constant extraction q' on one borehole with uniform flux: the mean fluid temperature at the
/// end is T₀ − q'/(2πk)·g(t) − q'·R_b* (Eskilson 1987, the definition of g), with g computed by
/// the g-function module at exactly that time — the study instead interpolates its g table and
/// superposes monthly steps.
#[test]
fn constant_load_ends_at_the_g_function_closed_form() {
    let length = 120.0;
    let power = 4000.0;
    let text = site_text(&format!(
        "{}    design_life: 3 years\n    wall_condition: uniform-heat-flux\n",
        study(ONE, length, &format!("{{constant: {power} W}}"), MEASURED)
    ));
    let r = run(&text);
    let b = borefield(&r, 0);
    assert!(
        (b.ground.undisturbed_c - T0).abs() < 1e-9,
        "{}",
        b.ground.undisturbed_c
    );
    assert_eq!(b.borehole_resistance_m_k_per_w, 0.1);
    let q = power / length;
    for months in [1usize, 12, 36] {
        let t = months as f64 * MONTH_S;
        let expected = T0 - q / (2.0 * PI * K) * g_at(length, t) - q * 0.1;
        let got = b.months[months - 1].mean_c;
        eprintln!("constant load, month {months}: study {got:.5} °C, closed form {expected:.5} °C");
        assert!(
            (got - expected).abs() < 0.005,
            "month {months}: {got} vs {expected}"
        );
    }
    // Inlet colder than the mean by Q/(2 ṁ c_p), ṁ c_p at the lower limit (−3 °C).
    let capacity = b.fluid.density_kg_per_m3 * 0.5e-3 * b.fluid.specific_heat_j_per_kg_k;
    let inlet = b.months[35].mean_c - power / (2.0 * capacity);
    assert!(
        (b.coldest_fluid_c - inlet).abs() < 1e-9,
        "{} vs {inlet}",
        b.coldest_fluid_c
    );
}

/// The same constant load as an hourly file: the FFT convolution of hourly steps must reproduce
/// the monthly superposition at every month end (both exact for a constant load).
#[test]
fn hourly_constant_load_matches_the_monthly_path() {
    let dir = tempfile::tempdir().unwrap();
    let mut csv = String::from("load_w\n");
    for _ in 0..8760 {
        csv.push_str("4000\n");
    }
    std::fs::write(dir.path().join("loads.csv"), csv).unwrap();
    let tail = "    design_life: 2 years\n    wall_condition: uniform-heat-flux\n";
    let hourly = run_in(
        &site_text(&format!(
            "{}{tail}",
            study(ONE, 120.0, "{hourly: loads.csv}", MEASURED)
        )),
        dir.path(),
    );
    let monthly = run(&site_text(&format!(
        "{}{tail}",
        study(ONE, 120.0, "{constant: 4 kW}", MEASURED)
    )));
    let (h, m) = (borefield(&hourly, 0), borefield(&monthly, 0));
    for k in [0usize, 5, 23] {
        eprintln!(
            "hourly vs monthly, month {}: {:.5} vs {:.5}",
            k + 1,
            h.months[k].min_c,
            m.months[k].mean_c
        );
        // The hourly month row holds the minimum over the month: the month's last hour.
        assert!(
            (h.months[k].min_c - m.months[k].mean_c).abs() < 0.01,
            "month {}: {} vs {}",
            k + 1,
            h.months[k].min_c,
            m.months[k].mean_c
        );
    }
    assert!((h.annual_loads.from_ground_mwh - 4.0 * 8.76).abs() < 1e-9);
}

/// Building loads become ground loads by the heat pump's energy balance: 100 MWh of heating at
/// COP 4 takes 75 MWh from the ground; 40 MWh of cooling at EER 4 rejects 50 MWh (hand
/// calculation).
#[test]
fn building_loads_become_ground_loads_by_cop_and_eer() {
    let loads = "
      building:
        heating: [100 MWh, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0]
        cooling: [0, 0, 0, 0, 0, 0, 40 MWh, 0, 0, 0, 0, 0]
        cop: 4
        eer: 4";
    let text = site_text(&format!(
        "{}    design_life: 1 year\n",
        study(
            "{rectangle: {rows: 2, columns: 2, spacing: 8 m}}",
            150.0,
            loads,
            ""
        )
    ));
    let r = run(&text);
    let b = borefield(&r, 0);
    assert!(
        (b.annual_loads.from_ground_mwh - 75.0).abs() < 1e-9,
        "{}",
        b.annual_loads.from_ground_mwh
    );
    assert!(
        (b.annual_loads.to_ground_mwh - 50.0).abs() < 1e-9,
        "{}",
        b.annual_loads.to_ground_mwh
    );
    assert_eq!(
        burrow::kinds::borefield::run::ground_from_building(100.0, 40.0, 4.0, 4.0),
        (75.0, 50.0)
    );
}

/// Heating and cooling in the same month are netted into one monthly ground load (exact for
/// the mean: superposition is linear), but neither direction's peak nor the gross energies are
/// lost. 38 MWh of heating at COP 4 takes 28.5 MWh from the ground and 20 MWh of cooling at
/// EER 4 gives 25 MWh back in January (hand calculation): gross 28.5 / 25 MWh, net 3.5 / 0 MWh.
/// With a 60 kW heating peak (45 kW from the ground) the fluid in January is exactly that of a
/// field given the net 3.5 MWh with the 45 kW peak from the ground on it.
#[test]
fn heating_and_cooling_in_one_month_keep_their_peaks_and_gross_energies() {
    let zeros = "0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0";
    let building = format!(
        "
      building:
        heating: [38 MWh, {zeros}]
        cooling: [20 MWh, {zeros}]
        peak: {{heating: [60 kW, {zeros}]}}
        cop: 4
        eer: 4"
    );
    let net = format!(
        "
      monthly:
        from_ground: [3.5 MWh, {zeros}]
        to_ground: [0, {zeros}]
        peak: {{from_ground: [45 kW, {zeros}]}}"
    );
    let result = |loads: &str| {
        run(&site_text(&format!(
            "{}    design_life: 1 year\n",
            study(ONE, 120.0, loads, MEASURED)
        )))
    };
    let rb = result(&building);
    let rn = result(&net);
    let (b, n) = (borefield(&rb, 0), borefield(&rn, 0));
    let a = &b.annual_loads;
    assert!((a.from_ground_mwh - 28.5).abs() < 1e-9 && (a.to_ground_mwh - 25.0).abs() < 1e-9);
    assert!((a.net_from_ground_mwh - 3.5).abs() < 1e-9 && a.net_to_ground_mwh.abs() < 1e-9);
    assert_eq!(a.netted_months, 1);
    assert!(rb.warnings.iter().any(|w| w.code == "borefield.netted_months"));
    assert!((b.months[0].min_c - n.months[0].min_c).abs() < 1e-9);
    assert!((b.months[0].mean_c - n.months[0].mean_c).abs() < 1e-9);
    assert!(
        b.months[0].min_c < b.months[0].mean_c - 0.5,
        "the heating peak is kept"
    );
}

/// A peak pulse of duration t_p and amplitude (peak − mean) lowers the mean fluid temperature by
/// (P̂ − P̄)/H · (g(t_p)/(2πk) + R_b*) below the month's mean-load value (hand calculation from
/// the superposition of one extra step).
#[test]
fn peak_pulse_lowers_the_fluid_by_the_short_step_response() {
    let length = 100.0;
    let loads = "
      monthly:
        from_ground: [2190 kWh, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0]
        to_ground: [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0]
        peak: {from_ground: [8 kW, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0], duration: 4 h}";
    let text = site_text(&format!(
        "{}    design_life: 1 year\n    wall_condition: uniform-heat-flux\n",
        study(ONE, length, loads, MEASURED)
    ));
    let r = run(&text);
    let b = borefield(&r, 0);
    let mean_w = 2190e3 * 3600.0 / MONTH_S; // 3 kW over a 730-h month
    assert!((mean_w - 3_000.0).abs() < 1e-6);
    let drop = (8_000.0 - mean_w) / length * (g_at(length, 4.0 * 3600.0) / (2.0 * PI * K) + 0.1);
    let jan = b.months[0];
    eprintln!(
        "peak pulse: study {:.5} K, hand {drop:.5} K",
        jan.mean_c - jan.min_c
    );
    assert!(
        ((jan.mean_c - jan.min_c) - drop).abs() < 0.01,
        "{} vs {drop}",
        jan.mean_c - jan.min_c
    );
    // No peak in the other months: their range collapses to the mean.
    assert!((b.months[5].mean_c - b.months[5].min_c).abs() < 1e-12);
}

fn sizing_study(scale: f64) -> String {
    let e = [40.0, 34.0, 26.0, 16.0, 7.0, 2.0, 0.0, 0.0, 4.0, 14.0, 26.0, 36.0];
    let i = [0.0, 0.0, 0.0, 0.0, 2.0, 8.0, 12.0, 10.0, 3.0, 0.0, 0.0, 0.0];
    let list = |v: &[f64]| {
        v.iter()
            .map(|x| format!("{} MWh", x * scale))
            .collect::<Vec<_>>()
            .join(", ")
    };
    let pe: Vec<f64> = e.iter().map(|x| x * 3.0).collect();
    let loads = format!(
        "
      monthly:
        from_ground: [{}]
        to_ground: [{}]
        peak: {{from_ground: [{}]}}",
        list(&e),
        list(&i),
        pe.iter()
            .map(|x| format!("{} kW", x * scale))
            .collect::<Vec<_>>()
            .join(", ")
    );
    site_text(&format!(
        "{}    design_life: 20 years\n    find: length\n",
        study(
            "{rectangle: {rows: 4, columns: 5, spacing: 6 m}}",
            150.0,
            &loads,
            ""
        )
    ))
}

/// The sized length meets the governing limit within 0.1 K when the field is re-run, unsized,
/// at that length; more load needs more length.
#[test]
fn sized_length_meets_the_governing_limit_and_grows_with_the_load() {
    let r = run(&sizing_study(1.0));
    let b = borefield(&r, 0);
    assert_eq!(b.decided_by.as_deref(), Some("cold-side"));
    assert!(
        b.decision
            .as_deref()
            .unwrap()
            .starts_with("the mean fluid temperature at the extraction peak decides the length: ")
    );
    assert!(
        (b.fluid_temperature.min_c - (-3.0)).abs() < 0.1,
        "{}",
        b.fluid_temperature.min_c
    );
    let sized_text = sizing_study(1.0);
    let loads = sized_text
        .split("loads: ")
        .nth(1)
        .and_then(|rest| rest.split("\n    limits").next())
        .unwrap();
    let recheck = site_text(&format!(
        "{}    design_life: 20 years\n",
        study(
            "{rectangle: {rows: 4, columns: 5, spacing: 6 m}}",
            b.active_length_m,
            loads,
            ""
        )
    ));
    let again = borefield(&run(&recheck), 0).fluid_temperature.min_c;
    eprintln!(
        "sized {:.2} m: min fluid {:.4} °C, re-run {again:.4} °C",
        b.active_length_m, b.fluid_temperature.min_c
    );
    assert!(
        (again + 3.0).abs() < 0.1,
        "re-run at {:.2} m gives {again} °C",
        b.active_length_m
    );
    let more = borefield(&run(&sizing_study(1.3)), 0).active_length_m;
    assert!(more > b.active_length_m + 5.0, "{more} vs {}", b.active_length_m);
}

/// The g-function interpolated in ln H between the sizing lengths stays within 0.5 % of the
/// g-function computed at the length itself, from one hour to the design life.
#[test]
fn g_function_interpolated_in_length_matches_the_direct_one() {
    use burrow::kinds::borefield::run::{Design, GInterpolator};
    let text = sizing_study(1.0);
    let loaded = site::load_text(&text, "t.yaml", Path::new(".")).unwrap();
    let s = &loaded.site;
    let ground = burrow::ground::profile::undisturbed(s, 410.0).unwrap();
    let burrow::model::StudyKind::Borefield(b) = &s.studies[0].kind else {
        panic!()
    };
    let design = Design::new(b, s, &ground).unwrap();
    let nodes = Design::sizing_nodes();
    let mut lengths = nodes.clone();
    lengths.extend([47.0, 95.0, 173.0, 311.0]);
    let grid = design.tau_grid(&lengths);
    let ts: Vec<f64> = nodes.iter().map(|&h| design.time_scale_s(h)).collect();
    let interp = GInterpolator::new(
        &nodes,
        &ts,
        nodes.iter().map(|&h| design.g_curve(h, &grid).unwrap()).collect(),
    );
    let mut worst: f64 = 0.0;
    for h in [47.0, 95.0, 173.0, 311.0] {
        let direct = design.g_curve(h, &grid).unwrap();
        let between = interp.at(h, design.time_scale_s(h));
        // Over the times the study uses: from the shortest peak (1 h here) to the design life.
        let ts = design.time_scale_s(h);
        for (tau, (a, b)) in direct.taus().iter().zip(direct.g.iter().zip(&between.g)) {
            let t = ts * tau.exp();
            if (3600.0..=20.0 * 365.0 * 86400.0).contains(&t) {
                worst = worst.max((a - b).abs() / a);
            }
        }
    }
    eprintln!("largest relative difference of the interpolated g: {worst:.2e}");
    assert!(worst < 0.005, "largest relative difference {worst}");
}

/// Water with a lower limit of 1 °C leaves the coldest fluid less than 3 K above 0 °C: danger
/// (common practice, no source, for the 3 K margin), and `--strict` would exit 3.
#[test]
fn antifreeze_margin_below_three_kelvin_is_danger() {
    let text = site_text(&format!(
        "{}    design_life: 2 years\n",
        study(ONE, 100.0, "{constant: 3 kW}", MEASURED)
            .replace("mixture: propylene-glycol, concentration: 25 %", "mixture: water")
            .replace("min_fluid: -3 °C", "min_fluid: 1 °C")
    ));
    let r = run(&text);
    let w = r
        .warnings
        .iter()
        .find(|w| w.code == "borefield.antifreeze_margin")
        .expect("antifreeze warning");
    assert_eq!(w.level, Level::Danger);
    // The coldest fluid here lies below 0 °C (the limit is on the mean, the inlet is colder):
    // the message says the water would freeze and by how much, with the right sign (it once
    // read "only -4.4 K above the freezing point").
    let b = borefield(&r, 0);
    assert!(b.fluid_freezing_point_c == 0.0 && b.coldest_fluid_c < 0.0);
    let below = format!("{:.1} K below the freezing point", -b.coldest_fluid_c);
    assert!(
        w.message.contains("would freeze") && w.message.contains(&below),
        "{}",
        w.message
    );
}

/// A slow flow of cold glycol is laminar (Re below 2300): caution.
#[test]
fn laminar_flow_is_a_caution() {
    let text = site_text(&format!(
        "{}    design_life: 1 year\n",
        study(ONE, 100.0, "{constant: 2 kW}", "").replace("0.5 l/s", "0.15 l/s")
    ));
    let r = run(&text);
    let b = borefield(&r, 0);
    assert!(b.fluid.reynolds < 2300.0 && b.fluid.flow_regime == "laminar");
    assert!(
        r.warnings
            .iter()
            .any(|w| w.code == "borefield.laminar_flow" && w.level == Level::Caution)
    );
}

/// Pressure drop of a single-U loop against Darcy–Weisbach with the Blasius smooth-pipe friction
/// factor f = 0.316 Re^−0.25 (valid 4000 < Re < 10⁵; e.g. White, Fluid Mechanics, eq. 6.55,
/// from memory) plus 1.5 velocity heads at the foot: the study uses Colebrook, which for smooth
/// pipes agrees with Blasius to about 3 % in this range.
#[test]
fn loop_pressure_drop_matches_darcy_weisbach_with_blasius() {
    let text = site_text(&format!(
        "{}    design_life: 1 year\n",
        study(ONE, 100.0, "{constant: 2 kW}", "")
            .replace("mixture: propylene-glycol, concentration: 25 %", "mixture: water")
            .replace("min_fluid: -3 °C", "min_fluid: 6 °C")
            .replace("0.5 l/s", "0.6 l/s")
    ));
    let r = run(&text);
    let b = borefield(&r, 0);
    let re = b.fluid.reynolds;
    assert!((4000.0..1e5).contains(&re), "{re}");
    // Water near the coldest fluid temperature (the study reports its Reynolds number there).
    let d = 0.0326;
    let area = PI / 4.0 * d * d;
    let fluid =
        burrow::materials::fluids::Fluid::new(burrow::materials::fluids::Mixture::Water, 0.0).unwrap();
    let t = b.coldest_fluid_c.max(0.0);
    // The mass flow is fixed by the volume flow at the lower limit (6 °C).
    let mass_flow = fluid.density_kg_per_m3(6.0) * 0.6e-3;
    let rho = fluid.density_kg_per_m3(t);
    let v = mass_flow / (rho * area);
    assert!((rho * v * d / fluid.dynamic_viscosity_pa_s(t) - re).abs() < 1e-6 * re);
    let f = 0.316 * re.powf(-0.25);
    let dp = (f * 2.0 * 102.0 / d + 1.5) * rho * v * v / 2.0;
    eprintln!(
        "pressure drop: study {:.3} kPa, Blasius {:.3} kPa (Re {re:.0})",
        b.pressure_drop_kpa,
        dp / 1000.0
    );
    assert!(
        (b.pressure_drop_kpa * 1000.0 - dp).abs() < 0.04 * dp,
        "{} kPa vs {} kPa",
        b.pressure_drop_kpa,
        dp / 1000.0
    );
    assert!((b.pumping_power_w - dp * 0.6e-3 / 0.5).abs() < 0.04 * b.pumping_power_w);
}

/// Heat rejected and extracted in balance leave no drift; extraction only cools the ground year
/// after year.
#[test]
fn unbalanced_extraction_cools_the_ground_year_after_year() {
    let text = site_text(&format!(
        "{}    design_life: 10 years\n",
        study(
            "{rectangle: {rows: 3, columns: 3, spacing: 5 m}}",
            100.0,
            "{constant: 20 kW}",
            MEASURED
        )
    ));
    let r = run(&text);
    let b = borefield(&r, 0);
    assert!(
        b.ground_temperature_drift_k < -0.5,
        "{}",
        b.ground_temperature_drift_k
    );
    assert!(b.fluid_temperature.last_year_min_c < b.fluid_temperature.first_year_min_c);
    let g = &b.g_function;
    assert!(g.windows(2).all(|w| w[1].g > w[0].g), "g must grow with time");
    assert!(g.first().unwrap().ln_t_over_ts <= -10.0 && g.last().unwrap().ln_t_over_ts >= 3.0);
}
