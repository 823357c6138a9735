//! Speed of an 8-thickness insulation sizing sweep with the analytic methods, and of a whole
//! heat-loss study with 8 candidates, analytic and with the engine's cross-check of every
//! candidate (run: cargo bench --bench buried_pipe). Prints medians of repeated runs.
use burrow::physics::buried_pipe::sizing::{Layout, SizingCase, sweep};
use burrow::physics::buried_pipe::twin::TwinMethod;
use burrow::physics::buried_pipe::wall::WallLayer;
use burrow::physics::buried_pipe::{DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W, GroundForm, Soil};
use std::hint::black_box;
use std::time::Instant;

const THICKNESSES_M: [f64; 8] = [0.02, 0.03, 0.045, 0.06, 0.08, 0.1, 0.13, 0.16];

fn case(layout: Layout) -> SizingCase {
    let months: [f64; 12] =
        std::array::from_fn(|m| 9.0 - 5.0 * (2.0 * std::f64::consts::PI * m as f64 / 12.0).cos());
    SizingCase {
        layout,
        depth_m: 1.0,
        carrier_outer_radius_m: 0.05715,
        carrier_layers: vec![WallLayer::new(0.0036, 50.0)],
        insulation_conductivity_w_per_m_k: 0.027,
        casing_thickness_m: 0.004,
        casing_conductivity_w_per_m_k: 0.4,
        soil: Soil::new(1.5, DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W).unwrap(),
        form: GroundForm::Exact,
        supply_c: months.map(|t| 95.0 - t),
        return_c: [45.0; 12],
        ground_c: months,
    }
}

fn median_us(mut f: impl FnMut()) -> f64 {
    for _ in 0..20 {
        f();
    }
    let mut times: Vec<f64> = (0..201)
        .map(|_| {
            let t = Instant::now();
            f();
            t.elapsed().as_secs_f64() * 1e6
        })
        .collect();
    times.sort_by(f64::total_cmp);
    times[times.len() / 2]
}

/// A heat-loss study (a pair, or a twin pipe) with 8 candidate thicknesses.
fn study_site(method: &str, twin: bool) -> String {
    let arrangement = if twin {
        "    twin:
      id: t
      depth: 0.85
      outer_diameter: 250 mm
      casing: {thickness: 3.9 mm, conductivity: 0.43}
      insulation_conductivity: {lambda_50: 0.0235, slope: 0.0001, ageing: 0.2}
      carrier_spacing: 110 mm
      carriers: {outer_diameter: 76.1 mm, layers: [{name: steel, thickness: 2.9 mm, conductivity: 50}]}
      supply: {temperature: [85, 85, 82, 78, 72, 70, 70, 70, 72, 78, 82, 85]}
      return: {temperature: 45}
"
    } else {
        "    pipes:
      - {id: supply, x: -0.19, depth: 1.0, outer_diameter: 250 mm, layers: [{name: steel, thickness: 4.5 mm, conductivity: 50}, {name: insulation, thickness: 43.6 mm, conductivity: 0.027}, {name: casing, thickness: 3.9 mm, conductivity: 0.43}], fluid: {temperature: [85, 85, 82, 78, 72, 70, 70, 70, 72, 78, 82, 85]}}
      - {id: return, x: 0.19, depth: 1.0, outer_diameter: 250 mm, layers: [{name: steel, thickness: 4.5 mm, conductivity: 50}, {name: insulation, thickness: 43.6 mm, conductivity: 0.027}, {name: casing, thickness: 3.9 mm, conductivity: 0.43}], fluid: {temperature: 45}}
"
    };
    format!(
        "site: {{name: bench}}
climate: {{model: annual-wave, mean: 10.4, amplitude: 8.6, coldest_day: 32}}
ground:
  layers: [{{name: sand, conductivity: 1.6, heat_capacity: 2.1e6}}]
studies:
  - id: s
    kind: heat-loss
    method: {method}
{arrangement}    sizing: {{layer: insulation, thicknesses: [25 mm, 30 mm, 37 mm, 45 mm, 55 mm, 65 mm, 80 mm, 95 mm]}}
"
    )
}

fn median_s(runs: usize, mut f: impl FnMut()) -> f64 {
    f();
    let mut times: Vec<f64> = (0..runs)
        .map(|_| {
            let t = Instant::now();
            f();
            t.elapsed().as_secs_f64()
        })
        .collect();
    times.sort_by(f64::total_cmp);
    times[times.len() / 2]
}

fn studies() {
    for twin in [false, true] {
        for (method, runs, target) in [("analytic", 21, "< 0.05 s"), ("both", 3, "< 10 s")] {
            let text = study_site(method, twin);
            let loaded = burrow::site::load_text(&text, "bench.yaml", std::path::Path::new("."))
                .unwrap_or_else(|e| panic!("{e:?}"));
            let s = median_s(runs, || {
                black_box(burrow::compute(&loaded, "bench.yaml", b"", &burrow::Silent).unwrap());
            });
            let what = if twin { "twin pipe" } else { "pair" };
            println!(
                "whole heat-loss study, {what}, 8 candidates, method {method}: median {s:.3} s (target {target})"
            );
        }
    }
}

fn main() {
    let runs = [
        ("pair (2 pipes, 12 months)", Layout::Pair { clear_gap_m: 0.15 }),
        (
            "twin, first-order formulas",
            Layout::Twin {
                carrier_spacing_m: 0.15,
                method: TwinMethod::FirstOrder,
            },
        ),
        (
            "twin, multipole order 6",
            Layout::Twin {
                carrier_spacing_m: 0.15,
                method: TwinMethod::Multipole { order: 6 },
            },
        ),
    ];
    for (name, layout) in runs {
        let c = case(layout);
        let us = median_us(|| {
            black_box(sweep(black_box(&c), black_box(&THICKNESSES_M)).unwrap());
        });
        println!("8-thickness sizing sweep, {name}: median {us:.1} µs (target < 50 000 µs)");
    }
    studies();
}
