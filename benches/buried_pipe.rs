//! Speed of an 8-thickness insulation sizing sweep with the analytic methods
//! (run: cargo bench --bench buried_pipe). Prints the median of repeated sweeps.
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
        insulation_conductivity_w_m_k: 0.027,
        casing_thickness_m: 0.004,
        casing_conductivity_w_m_k: 0.4,
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
}
