//! The fast freezing path (`SolverKind::Iterative`, the default with freezing)
//! against the direct (Cholesky) reference on a freezing case with a cold pipe:
//! both iterate the same backward-Euler enthalpy equations, so they must agree
//! to the iteration tolerance, and both must conserve energy.

use burrow::engine::material::Material;
use burrow::engine::section::{
    Drive, Geometry, Initial, Pipe, SectionModel, SoilLayer, Solution, SolverKind, TransientOptions,
    solve_transient,
};
use burrow::physics::annual_wave::AnnualWave;

const DAY: f64 = 86_400.0;

/// Moist soil (25 % water by volume, latent heat 0.25 × 333.55 MJ/m³ — IAPWS
/// latent heat of fusion) under a winter surface, with a pipe whose fluid is
/// below 0 °C (a ground heat collector) so that the soil freezes around it while
/// the frost front also comes down from the surface.
fn model(fluid_c: f64) -> SectionModel {
    let wave = AnnualWave::new(3.0, 10.0, 30.0, 365.0 * DAY).unwrap();
    let soil = Material::new(1.4, 2.0, 2.2e6, 1.8e6, 0.25 * 333.55e6, 0.5).unwrap();
    let mut m = SectionModel::new(
        Geometry::Planar,
        6.0,
        4.0,
        vec![SoilLayer {
            thickness_m: 4.0,
            material: soil,
        }],
        Box::new(move |t| wave.surface_c(t)),
    );
    m.surface_resistance_m2_k_per_w = 0.05;
    m.pipes.push(Pipe {
        x_m: 0.0,
        z_m: 1.0,
        outer_radius_m: 0.1,
        wall_resistance_m_k_per_w: 0.3,
        drive: Drive::FluidTemperature(Box::new(move |_| fluid_c)),
    });
    m
}

fn run(solver: SolverKind, dt: f64, days: f64, fluid_c: f64) -> Solution {
    let steps = (days * DAY / dt).round() as usize;
    let mut opts = TransientOptions::new(dt, steps, Initial::Uniform(3.0));
    opts.solver = solver;
    opts.probes = vec![(0.0, 0.7), (0.0, 1.12), (2.5, 0.3)];
    solve_transient(&model(fluid_c), &opts).unwrap()
}

fn max_diff(a: &[f64], b: &[f64]) -> f64 {
    a.iter().zip(b).map(|(x, y)| (x - y).abs()).fold(0.0, f64::max)
}

fn compare(dt: f64, days: f64) {
    let fluid_c = -4.0;
    let direct = run(SolverKind::Direct, dt, days, fluid_c);
    let fast = run(SolverKind::Auto, dt, days, fluid_c);
    let n = direct.times_s.len();
    let q_scale = direct.pipes[0]
        .heat_rate_w_per_m
        .iter()
        .fold(0.0_f64, |m, q| m.max(q.abs()));
    let dq = max_diff(
        &direct.pipes[0].heat_rate_w_per_m,
        &fast.pipes[0].heat_rate_w_per_m,
    );
    let dfrost = max_diff(&direct.frost_depth_m, &fast.frost_depth_m);
    let dprobe = (0..3)
        .map(|p| max_diff(&direct.probes_c[p], &fast.probes_c[p]))
        .fold(0.0, f64::max);
    println!(
        "dt {dt} s, {n} steps, {} cells: heat rate {dq:.2e} W/m of {q_scale:.2} W/m, frost {dfrost:.2e} m ({:.3} m deep), probes {dprobe:.2e} K; balance direct {:.1e} fast {:.1e}; solves direct {} fast {}",
        direct.cells,
        direct.frost_depth_m[n - 1],
        direct.energy_balance_relative_error,
        fast.energy_balance_relative_error,
        direct.linear_solves,
        fast.linear_solves
    );
    // The soil must actually freeze around the pipe and under the surface.
    assert!(
        direct.probes_c[1][n - 1] < 0.0,
        "the soil next to the pipe must be freezing, it is at {} °C",
        direct.probes_c[1][n - 1]
    );
    assert!(
        direct.frost_depth_m[n - 1] > 0.1,
        "the frost must come down from the surface"
    );
    // Same equations, same iteration tolerance (1e-5 K): agreement far below
    // the physics' own uncertainty.
    assert!(dq < 1e-3 * q_scale, "heat rate differs by {dq} W/m");
    assert!(dfrost < 2e-3, "frost depth differs by {dfrost} m");
    assert!(dprobe < 5e-3, "probe temperatures differ by {dprobe} K");
    assert!(direct.energy_balance_relative_error < 1e-4);
    assert!(fast.energy_balance_relative_error < 1e-4);
}

#[test]
fn fast_freezing_path_matches_direct_solver_around_a_cold_pipe_at_hourly_steps() {
    compare(3600.0, 20.0);
}

#[test]
fn fast_freezing_path_matches_direct_solver_around_a_cold_pipe_at_six_hour_steps() {
    compare(6.0 * 3600.0, 60.0);
}
