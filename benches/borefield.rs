//! Speed of the `borefield` study (run: cargo bench --bench borefield).
//!
//! Square fields of n × n boreholes, 6 m spacing, H = 150 m, D = 2 m, 140 mm, single U, uniform
//! wall temperature with 12 segments, layered ground. Timed, median of several runs:
//! - the g-function on the study's own ln(t/t_s) grid (about 50 times, covering 1 h to 25 years);
//! - 25 years of hourly loads (219 000 steps, FFT) once the g-function is known;
//! - sizing of the active length (monthly loads with peaks), g-function work included;
//! - the whole study as `burrow run` computes it.
use burrow::kinds::borefield::run::Design;
use burrow::model::StudyKind;
use burrow::site;
use std::time::Instant;

fn median_seconds(runs: usize, mut f: impl FnMut()) -> f64 {
    let mut samples: Vec<f64> = (0..runs)
        .map(|_| {
            let t = Instant::now();
            f();
            t.elapsed().as_secs_f64()
        })
        .collect();
    samples.sort_by(f64::total_cmp);
    samples[runs / 2]
}

fn site_text(n: usize, loads: &str, size: bool) -> String {
    let scale = (n * n) as f64 / 100.0;
    let monthly = |v: [f64; 12], unit: &str| {
        v.iter()
            .map(|x| format!("{:.3} {unit}", x * scale))
            .collect::<Vec<_>>()
            .join(", ")
    };
    let loads = match loads {
        "hourly" => "{hourly: loads.csv}".to_string(),
        _ => format!(
            "
      monthly:
        from_ground: [{}]
        to_ground: [{}]
        peak: {{from_ground: [{}], to_ground: [{}]}}",
            monthly(
                [
                    180.0, 160.0, 120.0, 80.0, 30.0, 10.0, 5.0, 5.0, 25.0, 70.0, 120.0, 170.0
                ],
                "MWh"
            ),
            monthly(
                [0.0, 0.0, 0.0, 10.0, 40.0, 80.0, 100.0, 90.0, 40.0, 5.0, 0.0, 0.0],
                "MWh"
            ),
            monthly(
                [
                    600.0, 580.0, 500.0, 400.0, 250.0, 100.0, 50.0, 50.0, 200.0, 350.0, 500.0, 580.0
                ],
                "kW"
            ),
            monthly(
                [
                    0.0, 0.0, 0.0, 100.0, 300.0, 450.0, 500.0, 480.0, 300.0, 50.0, 0.0, 0.0
                ],
                "kW"
            ),
        ),
    };
    format!(
        "site: {{name: bench}}
climate: {{model: annual-wave, mean: 9 °C, amplitude: 9 K, coldest_day: 30}}
ground:
  geothermal_flux: 0.06 W/m2
  layers:
    - {{name: till, thickness: 15 m, conductivity: 2.0, heat_capacity: 2.3e6}}
    - {{name: granite, conductivity: 3.0, heat_capacity: 2.2e6}}
studies:
  - id: field
    kind: borefield
    layout: {{rectangle: {{rows: {n}, columns: {n}, spacing: 6 m}}}}
    borehole: {{active_length: 150 m, top_depth: 2 m, diameter: 140 mm}}
    heat_exchanger:
      type: single-u
      pipe: {{outer_diameter: 40 mm, wall: 3.7 mm, conductivity: 0.42}}
      shank_spacing: 80 mm
      grout_conductivity: 1.6
    fluid: {{mixture: propylene-glycol, concentration: 25 %, flow_per_borehole: 0.5 l/s}}
    loads: {loads}
    limits: {{min_fluid: -2 °C, max_fluid: 30 °C}}
    design_life: 25 years
{}",
        if size { "    find: length\n" } else { "" }
    )
}

fn main() {
    let dir = tempfile::tempdir().expect("temporary folder");
    // Hourly ground loads of a whole field, W: a heating season with a daily cycle.
    let mut csv = String::from("load_w\n");
    for h in 0..8760 {
        let day = h as f64 / 24.0;
        let season = (2.0 * std::f64::consts::PI * (day - 15.0) / 365.0).cos();
        let daily = 1.0 + 0.4 * (2.0 * std::f64::consts::PI * (h % 24) as f64 / 24.0).sin();
        csv.push_str(&format!("{:.1}\n", 200_000.0 * season * daily));
    }
    std::fs::write(dir.path().join("loads.csv"), csv).expect("write loads");
    for (n, runs) in [(5, 7), (10, 5), (20, 3)] {
        let text = site_text(n, "hourly", false);
        let loaded = site::load_text(&text, "bench.yaml", dir.path()).expect("valid site");
        let s = &loaded.site;
        let ground = burrow::ground::profile::undisturbed(s, 160.0).expect("ground");
        let StudyKind::Borefield(b) = &s.studies[0].kind else {
            unreachable!()
        };
        let design = Design::new(b, s, &ground).expect("design");
        let grid = design.tau_grid(&[150.0]);
        let mut curve = None;
        let g = median_seconds(runs, || curve = Some(design.g_curve(150.0, &grid).expect("g")));
        let curve = curve.expect("curve");
        let mut min = 0.0;
        let hourly = median_seconds(runs, || {
            min = design.evaluate(150.0, &curve).expect("evaluation").min_c();
        });
        let sizing_text = site_text(n, "monthly", true);
        let loaded = site::load_text(&sizing_text, "bench.yaml", dir.path()).expect("valid site");
        let s2 = &loaded.site;
        let ground2 = burrow::ground::profile::undisturbed(s2, 410.0).expect("ground");
        let StudyKind::Borefield(b2) = &s2.studies[0].kind else {
            unreachable!()
        };
        let design2 = Design::new(b2, s2, &ground2).expect("design");
        let mut length = 0.0;
        let sizing = median_seconds(runs, || length = design2.size().expect("sized").length_m);
        let whole = median_seconds(runs.min(3), || {
            burrow::compute(&loaded, "bench.yaml", b"", &burrow::Silent).expect("run");
        });
        println!(
            "{n:>2} × {n:<2} g-function ({} times) {:>8.1} ms | 25 y hourly {:>7.1} ms (min {min:.2} °C) | sizing {:>8.1} ms (H = {length:.1} m) | whole sized study {:>8.1} ms",
            grid.points,
            g * 1e3,
            hourly * 1e3,
            sizing * 1e3,
            whole * 1e3
        );
    }
}
