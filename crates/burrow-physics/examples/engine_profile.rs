//! One run of the benchmark section of `benches/engine.rs` (20 m × 10 m, one pipe,
//! a freezing soil), for profiling with callgrind or perf:
//! `cargo run --release -p burrow-physics --example engine_profile -- <days> <step h> [scale] [solver]`
//! (solver: iterative | direct | adi). Prints cells, solves, iterations and the
//! energy balance.

use burrow_physics::engine::material::Material;
use burrow_physics::engine::section::{
    Drive, Geometry, GridOptions, Initial, Pipe, SectionModel, SoilLayer, SolverKind, TransientOptions,
    solve_transient,
};
use burrow_physics::physics::annual_wave::{AnnualWave, YEAR_S};

fn main() {
    let args: Vec<String> = std::env::args().collect();
    let days: f64 = args.get(1).and_then(|s| s.parse().ok()).unwrap_or(30.0);
    let step_h: f64 = args.get(2).and_then(|s| s.parse().ok()).unwrap_or(1.0);
    let scale: f64 = args.get(3).and_then(|s| s.parse().ok()).unwrap_or(1.0);
    let solver = match args.get(4).map(String::as_str) {
        Some("direct") => SolverKind::Direct,
        Some("adi") => SolverKind::Adi,
        _ => SolverKind::Iterative,
    };
    let dry = args.get(5).is_some_and(|s| s == "dry");
    let wave = AnnualWave::new(5.0, 12.0, 30.0, YEAR_S).unwrap();
    let material = if dry {
        Material::dry(1.4, 2.2e6).unwrap()
    } else {
        Material::new(1.4, 2.0, 2.2e6, 1.8e6, 0.25 * 333.55e6, 0.5).unwrap()
    };
    let mut m = SectionModel::new(
        Geometry::Planar,
        20.0,
        10.0,
        vec![SoilLayer {
            thickness_m: 10.0,
            material,
        }],
        Box::new(move |t| wave.surface_c(t)),
    );
    m.pipes.push(Pipe {
        x_m: 0.0,
        z_m: 1.2,
        outer_radius_m: 0.1,
        wall_resistance_m_k_per_w: 0.8,
        drive: Drive::FluidTemperature(Box::new(|_| 8.0)),
    });
    let dt = step_h * 3600.0;
    let steps = (days * 86400.0 / dt).round() as usize;
    let mut opts = TransientOptions::new(dt, steps, Initial::Uniform(5.0));
    opts.grid = GridOptions {
        surface_cell_m: 0.02 * scale,
        min_cell_m: 0.02 * scale,
        max_cell_m: 0.2 * scale,
        growth_ratio: 1.09,
        cells_across_pipe: 20,
    };
    opts.solver = solver;
    opts.probes = vec![(0.0, 0.5), (5.0, 1.0), (0.0, 1.0), (2.0, 0.3)];
    let start = std::time::Instant::now();
    let s = solve_transient(&m, &opts).unwrap();
    if args.get(6).is_some_and(|a| a == "compare") {
        opts.solver = SolverKind::Direct;
        let d = solve_transient(&m, &opts).unwrap();
        let diff = |a: &[f64], b: &[f64]| a.iter().zip(b).map(|(x, y)| (x - y).abs()).fold(0.0, f64::max);
        let probes = (0..opts.probes.len())
            .map(|i| diff(&s.probes_c[i], &d.probes_c[i]))
            .fold(0.0, f64::max);
        println!(
            "against Direct: probes {probes:.2e} K, wall {:.2e} K, heat rate {:.2e} W/m, frost depth {:.2e} m",
            diff(&s.pipes[0].wall_c, &d.pipes[0].wall_c),
            diff(&s.pipes[0].heat_rate_w_per_m, &d.pipes[0].heat_rate_w_per_m),
            diff(&s.frost_depth_m, &d.frost_depth_m)
        );
    }
    let q = s.pipes[0].heat_rate_w_per_m.last().copied().unwrap_or(f64::NAN);
    let frost = s.frost_depth_m.iter().copied().fold(0.0, f64::max);
    println!(
        "cells {} steps {steps} wall {:.3} s solves/step {:.3} CG it/solve {:.2} factorisations {} balance {:.1e} q_end {:.6} max_frost {:.6} probe0_end {:.6} probe1_end {:.6}",
        s.cells,
        start.elapsed().as_secs_f64(),
        s.linear_solves as f64 / steps as f64,
        s.linear_iterations as f64 / s.linear_solves.max(1) as f64,
        s.factorisations,
        s.energy_balance_relative_error,
        q,
        frost,
        s.probes_c[0].last().unwrap(),
        s.probes_c[1].last().unwrap()
    );
}
