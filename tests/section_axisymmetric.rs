//! Axisymmetric (r–z) mode: a borehole with a constant heat rate against the line
//! and cylinder sources (reference data: tests/reference/borehole.py, SciPy).

mod common;

use burrow::engine::section::{
    Borehole, Drive, Geometry, GridOptions, Initial, SolverKind, TransientOptions, solve_transient,
};
use common::{key, read_reference, uniform_soil};

const T0: f64 = 10.0;

struct Run {
    times_s: Vec<f64>,
    wall_c: Vec<f64>,
    probe_c: Vec<f64>,
    balance: f64,
}

/// `radial_only`: a nearly adiabatic surface and the borehole over the whole model
/// depth, so that the field depends on r alone and the mean wall temperature is
/// the local one (no finite-length effect at late times).
fn run(solver: SolverKind, grid: GridOptions, dt: f64, steps: usize, radial_only: bool) -> Run {
    let (keys, _) = read_reference("tests/reference/borehole.csv");
    let (k, c, r_b, q) = (
        key(&keys, "k_w_mk"),
        key(&keys, "c_j_m3k"),
        key(&keys, "radius_m"),
        key(&keys, "heat_rate_w_m"),
    );
    // A 100 m borehole in a 40 m wide model; probe at 50 m depth.
    let depth = if radial_only { 100.5 } else { 150.0 };
    let mut model = uniform_soil(Geometry::Axisymmetric, 40.0, depth, k, c, T0);
    if radial_only {
        model.surface_resistance_m2_k_per_w = 1e9;
    }
    model.borehole = Some(Borehole {
        radius_m: r_b,
        top_m: 0.0,
        bottom_m: 100.0,
        wall_resistance_m_k_per_w: 0.1,
        drive: Drive::HeatRate(Box::new(move |_| q)),
    });
    let mut opts = TransientOptions::new(dt, steps, Initial::Uniform(T0));
    opts.grid = grid;
    opts.solver = solver;
    opts.probes = vec![(0.5, 50.0)];
    let s = solve_transient(&model, &opts).unwrap();
    Run {
        times_s: s.times_s,
        wall_c: s.pipes[0].wall_c.clone(),
        probe_c: s.probes_c[0].clone(),
        balance: s.energy_balance_relative_error,
    }
}

fn rows(kind: f64) -> Vec<Vec<f64>> {
    let (_, rows) = read_reference("tests/reference/borehole.csv");
    rows.into_iter().filter(|r| r[0] == kind).collect()
}

fn at(times: &[f64], t: f64) -> usize {
    times.iter().position(|&x| (x - t).abs() < 1e-6 * t).unwrap()
}

#[test]
fn borehole_wall_follows_cylinder_source_at_early_times() {
    // Carslaw & Jaeger 1959 §13.7 / Ingersoll 1954: constant flux at r = r_b.
    let grid = GridOptions {
        surface_cell_m: 0.5,
        min_cell_m: 0.004,
        max_cell_m: 5.0,
        growth_ratio: 1.1,
        cells_across_pipe: 10,
    };
    for solver in [SolverKind::Direct, SolverKind::Adi] {
        let r = run(solver, grid, 60.0, 24 * 60, false);
        for row in rows(0.0) {
            let n = at(&r.times_s, row[2]);
            let rise = r.wall_c[n] - T0;
            println!(
                "{solver:?} t = {} h: wall rise {rise:.4} K vs {:.4} K",
                row[2] / 3600.0,
                row[3]
            );
            assert!((rise / row[3] - 1.0).abs() < 0.02);
        }
        println!("balance {:.2e}", r.balance);
        assert!(r.balance < 1e-4);
    }
}

#[test]
fn borehole_follows_line_source_at_late_times() {
    // Kelvin line source, Carslaw & Jaeger 1959 §10.4: q'/(4πk)·E1(r²/4αt).
    for solver in [SolverKind::Direct, SolverKind::Adi] {
        let r = run(solver, GridOptions::default(), 86_400.0, 365, true);
        for row in rows(1.0) {
            let n = at(&r.times_s, row[2]);
            let rise = if row[1] < 0.1 {
                r.wall_c[n] - T0
            } else {
                r.probe_c[n] - T0
            };
            println!(
                "{solver:?} r = {} m, t = {} d: rise {rise:.4} K vs {:.4} K",
                row[1],
                row[2] / 86_400.0,
                row[3]
            );
            assert!((rise / row[3] - 1.0).abs() < 0.02);
        }
        println!("balance {:.2e}", r.balance);
        assert!(r.balance < 1e-4);
    }
}
