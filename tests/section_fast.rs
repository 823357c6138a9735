//! The fast (ADI) scheme against the direct (Cholesky) reference on 2-D problems
//! with pipes, where the splitting error is not zero.

mod common;

use burrow::engine::material::Material;
use burrow::engine::section::{
    Drive, Geometry, GridOptions, Initial, Pipe, SectionModel, SoilLayer, Solution, SolverKind,
    TransientOptions, solve_transient,
};
use burrow::physics::annual_wave::AnnualWave;

const DAY: f64 = 86_400.0;

fn dry() -> Material {
    Material::dry(1.4, 2.2e6).unwrap()
}

/// A district-heating-like pipe (fluid temperature, wall resistance) and a
/// heat-rate-driven pipe under a winter surface, in dry soil (the ADI scheme is
/// used only where nothing freezes; see `SolverKind::Auto`).
fn model() -> SectionModel {
    let wave = AnnualWave::new(4.0, 12.0, 30.0, 365.0 * DAY).unwrap();
    let mut m = SectionModel::new(
        Geometry::Planar,
        20.0,
        10.0,
        vec![SoilLayer {
            thickness_m: 10.0,
            material: dry(),
        }],
        Box::new(move |t| wave.surface_c(t)),
    );
    m.surface_resistance_m2_k_per_w = 0.05;
    m.bottom_flux_w_per_m2 = 0.06;
    m.pipes.push(Pipe {
        x_m: -1.0,
        z_m: 1.0,
        outer_radius_m: 0.1,
        wall_resistance_m_k_per_w: 0.8,
        drive: Drive::FluidTemperature(Box::new(|t| 50.0 + 10.0 * (t / (5.0 * DAY)).sin())),
    });
    m.pipes.push(Pipe {
        x_m: 2.0,
        z_m: 1.5,
        outer_radius_m: 0.02,
        wall_resistance_m_k_per_w: 0.1,
        drive: Drive::HeatRate(Box::new(|_| -15.0)),
    });
    m
}

fn run(solver: SolverKind, dt: f64, days: f64) -> Solution {
    let mut opts = TransientOptions::new(dt, (days * DAY / dt).round() as usize, Initial::Uniform(4.0));
    opts.solver = solver;
    opts.probes = vec![(0.0, 0.5), (-1.0, 1.3), (5.0, 1.0)];
    solve_transient(&model(), &opts).unwrap()
}

#[test]
fn adi_matches_direct_solver_with_pipes_under_winter_surface() {
    // 60 days from 1 January at 1 h steps: heat rates, fluid temperatures, probes
    // and frost depth of the fast scheme against the Cholesky reference.
    let dt = 3600.0;
    let direct = run(SolverKind::Direct, dt, 60.0);
    let adi = run(SolverKind::Adi, dt, 60.0);
    let n = direct.times_s.len();
    let skip = 24; // the first day, where the start-up transient is steep
    let max_diff = |a: &[f64], b: &[f64]| {
        a[skip..]
            .iter()
            .zip(&b[skip..])
            .map(|(x, y)| (x - y).abs())
            .fold(0.0, f64::max)
    };
    let q_scale = direct.pipes[0].heat_rate_w_per_m[skip..]
        .iter()
        .fold(0.0_f64, |m, q| m.max(q.abs()));
    let dq = max_diff(
        &direct.pipes[0].heat_rate_w_per_m,
        &adi.pipes[0].heat_rate_w_per_m,
    );
    let dtf = max_diff(&direct.pipes[1].fluid_c, &adi.pipes[1].fluid_c);
    let dprobe = (0..3)
        .map(|p| max_diff(&direct.probes_c[p], &adi.probes_c[p]))
        .fold(0.0, f64::max);
    let dfrost = max_diff(&direct.frost_depth_m, &adi.frost_depth_m);
    println!(
        "steps {n}: heat rate {:.3} W/m of {q_scale:.1} ({:.2} %), fluid {dtf:.4} K, probes {dprobe:.4} K, frost {:.4} m ({:.3} m deep)",
        dq,
        100.0 * dq / q_scale,
        dfrost,
        direct.frost_depth_m[n - 1]
    );
    println!(
        "balance direct {:.2e} adi {:.2e}; solves direct {} ({} factorisations) adi {}",
        direct.energy_balance_relative_error,
        adi.energy_balance_relative_error,
        direct.linear_solves,
        direct.factorisations,
        adi.linear_solves
    );
    assert!(
        direct.frost_depth_m[n - 1] > 0.1,
        "the surface must cool below 0 °C"
    );
    assert!(dq < 0.01 * q_scale);
    assert!(dtf < 0.05);
    assert!(dprobe < 0.05);
    assert!(dfrost < 0.03);
    assert!(direct.energy_balance_relative_error < 1e-4);
    assert!(adi.energy_balance_relative_error < 1e-4);
}

#[test]
fn pipe_heat_rate_converges_when_cells_and_step_are_halved() {
    let coarse = run(SolverKind::Adi, 3600.0, 20.0);
    let mut opts = TransientOptions::new(1800.0, 960, Initial::Uniform(4.0));
    opts.grid = GridOptions::default().refined();
    let fine = solve_transient(&model(), &opts).unwrap();
    let a = *coarse.pipes[0].heat_rate_w_per_m.last().unwrap();
    let b = *fine.pipes[0].heat_rate_w_per_m.last().unwrap();
    println!(
        "q' at 20 d: {a} -> {b} W/m ({} -> {} cells)",
        coarse.cells, fine.cells
    );
    assert!((a / b - 1.0).abs() < 0.02);
    assert!(fine.energy_balance_relative_error < 1e-4);
}
