//! Transient conduction and freezing in the 2-D engine against closed forms.

mod common;

use std::f64::consts::PI;

use burrow::engine::material::Material;
use burrow::engine::section::{
    Geometry, GridOptions, Inclusion, Initial, SectionModel, SoilLayer, SolverKind, TransientOptions,
    solve_steady, solve_transient,
};
use burrow::physics::annual_wave::{AnnualWave, YEAR_S, damping_depth_m, lag_s};
use common::{key, read_reference, uniform_soil};

const K: f64 = 1.5;
const C: f64 = 2.0e6;
const DAY: f64 = 86_400.0;

/// erf by the Abramowitz & Stegun 7.1.26 rational approximation is too coarse
/// (2.5e-5 relative is fine here, but use the series/continued fraction instead):
/// erf(x) = 2/√π Σ (−1)ⁿ x^(2n+1)/(n!(2n+1)) (A&S 7.1.5), converged for x < 3.
fn erf(x: f64) -> f64 {
    let mut term = x;
    let mut sum = x;
    for n in 1..200 {
        term *= -x * x / n as f64;
        let add = term / (2 * n + 1) as f64;
        sum += add;
        if add.abs() < 1e-17 {
            break;
        }
    }
    2.0 / PI.sqrt() * sum
}

fn column_grid() -> GridOptions {
    GridOptions {
        surface_cell_m: 0.02,
        min_cell_m: 0.02,
        max_cell_m: 0.5,
        growth_ratio: 1.1,
        cells_across_pipe: 10,
    }
}

fn step_run(solver: SolverKind, grid: GridOptions, dt: f64, steps: usize) -> (Vec<f64>, Vec<Vec<f64>>, f64) {
    let model = uniform_soil(Geometry::Planar, 1.0, 20.0, K, C, -10.0);
    let mut opts = TransientOptions::new(dt, steps, Initial::Uniform(5.0));
    opts.grid = grid;
    opts.solver = solver;
    opts.probes = vec![(0.5, 0.2), (0.0, 0.5), (-0.5, 1.0)];
    let s = solve_transient(&model, &opts).unwrap();
    (s.times_s, s.probes_c, s.energy_balance_relative_error)
}

#[test]
fn surface_step_on_dry_half_space_follows_erfc_solution() {
    // Carslaw & Jaeger 1959 §2.4: T = T_s + (T_i − T_s)·erf(z / 2√(αt)); a 15 K step.
    let alpha = K / C;
    for solver in [SolverKind::Direct, SolverKind::Adi] {
        // Hourly steps; checked from 2 days (48 steps) on, where backward Euler's
        // first-order time error (≈ Δt/2 of delay) is below 0.05 K.
        let (times, probes, balance) = step_run(solver, column_grid(), 3600.0, 720);
        let mut worst: f64 = 0.0;
        for (p, &z) in [0.2, 0.5, 1.0].iter().enumerate() {
            for n in [47, 119, 239, 719] {
                let t = times[n];
                let exact = -10.0 + 15.0 * erf(z / (2.0 * (alpha * t).sqrt()));
                println!(
                    "z = {z} m, t = {:.2} d: {:.4} vs {exact:.4}",
                    t / DAY,
                    probes[p][n]
                );
                worst = worst.max((probes[p][n] - exact).abs());
            }
        }
        println!("{solver:?}: largest error {worst:.4} K, balance {balance:.2e}");
        assert!(worst < 0.05, "{worst}");
        assert!(balance < 1e-10, "{balance}");
    }
}

#[test]
fn surface_step_converges_when_cells_and_step_are_halved() {
    let (_, coarse, _) = step_run(SolverKind::Adi, column_grid(), 0.25 * DAY, 40);
    let (_, fine, _) = step_run(SolverKind::Adi, column_grid().refined(), 0.125 * DAY, 80);
    let change = (coarse[0][39] - fine[0][79]).abs();
    println!("T(0.2 m, 10 d): {} -> {} K", coarse[0][39], fine[0][79]);
    assert!(change < 0.05, "{change}");
}

#[test]
fn periodic_surface_wave_is_damped_and_delayed_as_in_closed_form() {
    // Carslaw & Jaeger 1959 §2.6 (physics::annual_wave): amplitude A·exp(−z/d),
    // lag z/d·P/(2π). Started from the closed-form periodic state; the second year
    // is analysed by its first Fourier harmonic.
    let alpha = K / C;
    let wave = AnnualWave::new(8.0, 10.0, 30.0, YEAR_S).unwrap();
    let model = SectionModel::new(
        Geometry::Planar,
        1.0,
        30.0,
        vec![SoilLayer {
            thickness_m: 30.0,
            material: Material::dry(K, C).unwrap(),
        }],
        Box::new(move |t| wave.surface_c(t)),
    );
    let steps_per_year = 365;
    let dt = YEAR_S / steps_per_year as f64;
    let mut opts = TransientOptions::new(
        dt,
        2 * steps_per_year,
        Initial::Field(Box::new(move |_, z| wave.ground_c(z, 0.0, alpha, 0.0))),
    );
    opts.grid = column_grid();
    let depths = [0.5, 1.0, 2.0, 4.0];
    opts.probes = depths.iter().map(|&z| (0.0, z)).collect();
    let s = solve_transient(&model, &opts).unwrap();
    let d = damping_depth_m(alpha, YEAR_S);
    let omega = 2.0 * PI / YEAR_S;
    for (p, &z) in depths.iter().enumerate() {
        let (mut a, mut b) = (0.0, 0.0);
        for n in steps_per_year..2 * steps_per_year {
            let v = s.probes_c[p][n];
            let phase = omega * (s.times_s[n] - wave.coldest_time_s());
            a += 2.0 * v * phase.cos() / steps_per_year as f64;
            b += 2.0 * v * phase.sin() / steps_per_year as f64;
        }
        // T = mean − A_z cos(ω(t − t_min) − φ): a = −A_z cos φ, b = −A_z sin φ.
        let amplitude = a.hypot(b);
        let lag = (-b).atan2(-a).rem_euclid(2.0 * PI) / omega;
        let expected_amplitude = 10.0 * (-z / d).exp();
        let expected_lag = lag_s(z, alpha, YEAR_S);
        println!(
            "z = {z}: amplitude {amplitude:.4} (exact {expected_amplitude:.4}), lag {:.2} d (exact {:.2} d)",
            lag / DAY,
            expected_lag / DAY
        );
        assert!((amplitude - expected_amplitude).abs() < 0.01 * 10.0);
        assert!((lag - expected_lag).abs() < 1.5 * DAY);
    }
    assert!(
        s.energy_balance_relative_error < 1e-10,
        "{}",
        s.energy_balance_relative_error
    );
}

fn neumann_model(keys: &[(String, f64)]) -> SectionModel {
    let material = Material::new(
        key(keys, "k_unfrozen_w_mk"),
        key(keys, "k_frozen_w_mk"),
        key(keys, "c_unfrozen_j_m3k"),
        key(keys, "c_frozen_j_m3k"),
        key(keys, "latent_j_m3"),
        key(keys, "freezing_interval_k"),
    )
    .unwrap();
    let surface = key(keys, "surface_c");
    SectionModel::new(
        Geometry::Planar,
        0.5,
        12.0,
        vec![SoilLayer {
            thickness_m: 12.0,
            material,
        }],
        Box::new(move |_| surface),
    )
}

fn neumann_run(solver: SolverKind, grid: GridOptions, dt: f64, days: usize) -> (Vec<f64>, Vec<f64>, f64) {
    let (keys, _) = read_reference("tests/reference/neumann.csv");
    let model = neumann_model(&keys);
    let steps = (days as f64 * DAY / dt).round() as usize;
    let mut opts = TransientOptions::new(dt, steps, Initial::Uniform(key(&keys, "initial_c")));
    opts.grid = grid;
    opts.solver = solver;
    // The reference freezes at the half-frozen point −interval/2.
    opts.frost_isotherm_c = -0.5 * key(&keys, "freezing_interval_k");
    let s = solve_transient(&model, &opts).unwrap();
    (s.times_s, s.frost_depth_m, s.energy_balance_relative_error)
}

fn freezing_grid() -> GridOptions {
    GridOptions {
        surface_cell_m: 0.01,
        min_cell_m: 0.01,
        max_cell_m: 0.5,
        growth_ratio: 1.05,
        cells_across_pipe: 10,
    }
}

#[test]
fn freezing_front_follows_neumann_two_phase_solution() {
    // Carslaw & Jaeger 1959 §11.2, reference depths from tests/reference/neumann.py (SciPy).
    let (_, rows) = read_reference("tests/reference/neumann.csv");
    let dt = 3600.0;
    for solver in [SolverKind::Adi, SolverKind::Direct] {
        let days = if solver == SolverKind::Adi { 60 } else { 10 };
        let (times, depth, balance) = neumann_run(solver, freezing_grid(), dt, days);
        for row in rows.iter().filter(|r| r[0] <= days as f64 * DAY) {
            let n = times.iter().position(|&t| (t - row[0]).abs() < 1.0).unwrap();
            let error = depth[n] / row[1] - 1.0;
            println!(
                "{solver:?} t = {} d: {:.4} m vs {:.4} m ({:+.2} %)",
                row[0] / DAY,
                depth[n],
                row[1],
                100.0 * error
            );
            assert!(error.abs() < 0.03);
        }
        println!("{solver:?} balance {balance:.2e}");
        assert!(balance < 1e-10, "{balance}");
    }
}

#[test]
fn freezing_front_converges_when_cells_and_step_are_halved() {
    let (_, coarse, _) = neumann_run(SolverKind::Adi, freezing_grid(), 3600.0, 20);
    let (_, fine, _) = neumann_run(SolverKind::Adi, freezing_grid().refined(), 1800.0, 20);
    let (a, b) = (*coarse.last().unwrap(), *fine.last().unwrap());
    println!("frost depth at 20 d: {a} -> {b} m");
    assert!((a / b - 1.0).abs() < 0.03);
}

#[test]
fn insulation_board_and_layers_carry_the_bottom_flux_in_series() {
    // Steady 1-D conduction: T(z) = T_s + q·∫dz/k (Fourier's law in series). A 50 mm
    // board (k = 0.035) spans the section at 0.4 m depth below 0.3 m of sand.
    let q = 0.5;
    let sand = Material::dry(2.0, 2e6).unwrap();
    let clay = Material::dry(1.2, 2.5e6).unwrap();
    let board = Material::dry(0.035, 3e4).unwrap();
    let mut model = SectionModel::new(
        Geometry::Planar,
        2.0,
        5.0,
        vec![
            SoilLayer {
                thickness_m: 0.3,
                material: sand,
            },
            SoilLayer {
                thickness_m: 4.7,
                material: clay,
            },
        ],
        Box::new(|_| 2.0),
    );
    model.bottom_flux_w_per_m2 = q;
    model.inclusions.push(Inclusion {
        x_min_m: -1.0,
        x_max_m: 1.0,
        z_min_m: 0.4,
        z_max_m: 0.45,
        material: board,
    });
    let s = solve_steady(&model, &GridOptions::default(), 0.0).unwrap();
    let nx = s.field.x_m.len();
    for (iz, &z) in s.field.z_m.iter().enumerate() {
        let resistance = if z < 0.3 {
            z / 2.0
        } else if z < 0.4 {
            0.15 + (z - 0.3) / 1.2
        } else if z < 0.45 {
            0.15 + 0.1 / 1.2 + (z - 0.4) / 0.035
        } else {
            0.15 + 0.1 / 1.2 + 0.05 / 0.035 + (z - 0.45) / 1.2
        };
        let exact = 2.0 + q * resistance;
        assert!((s.field.t_c[iz * nx] - exact).abs() < 1e-9, "z = {z}");
    }
}

/// A moist silt (from memory: 30 % water by volume, Kersten-like conductivities):
/// k 1.4 / 2.0 W/(m K) unfrozen / frozen, C 2.6 / 1.9 MJ/(m³ K), latent heat
/// 0.30 × 1000 kg/m³ × 333.55 kJ/kg (IAPWS), water freezing over the default 0.5 K.
fn silt() -> Material {
    Material::new(1.4, 2.0, 2.6e6, 1.9e6, 0.30 * 333.55e6, 0.5).unwrap()
}

/// Neumann's two-phase problem for [`silt`]: unfrozen at 4 °C, the surface held at
/// −12 °C from t = 0, freezing point at the middle of the freezing interval.
fn silt_neumann() -> burrow::physics::frost::NeumannFreezing {
    let m = silt();
    burrow::physics::frost::NeumannFreezing {
        k_frozen_w_mk: m.frozen_conductivity(),
        c_frozen_j_m3k: m.frozen_heat_capacity(),
        k_unfrozen_w_mk: m.unfrozen_conductivity(),
        c_unfrozen_j_m3k: m.unfrozen_heat_capacity(),
        latent_j_per_m3: m.latent_heat_j_per_m3(),
        initial_c: 4.0,
        surface_c: -12.0,
        freezing_point_c: -0.5 * m.freezing_interval_k(),
    }
}

/// The engine's front (frozen thickness Σ f·Δz) and first ice (0 °C isotherm)
/// after `days`, on uniform cells of `cell_m`, in a 12 m column under a fixed
/// surface temperature, with the given material and initial temperature.
fn front_run(
    material: Material,
    initial_c: f64,
    surface_c: f64,
    cell_m: f64,
    dt: f64,
    days: f64,
) -> (f64, f64, f64) {
    let model = SectionModel::new(
        Geometry::Planar,
        4.0 * cell_m,
        12.0,
        vec![SoilLayer {
            thickness_m: 12.0,
            material,
        }],
        Box::new(move |_| surface_c),
    );
    let steps = (days * DAY / dt).round() as usize;
    let mut opts = TransientOptions::new(dt, steps, Initial::Uniform(initial_c));
    opts.grid = GridOptions {
        surface_cell_m: cell_m,
        min_cell_m: cell_m,
        max_cell_m: cell_m,
        growth_ratio: 1.1,
        cells_across_pipe: 10,
    };
    opts.solver = SolverKind::Iterative;
    let s = solve_transient(&model, &opts).unwrap();
    (
        *s.front_depth_m.last().unwrap(),
        *s.frost_depth_m.last().unwrap(),
        s.energy_balance_relative_error,
    )
}

#[test]
fn enthalpy_front_follows_neumann_two_phase_solution_on_coarse_and_fine_cells() {
    // Carslaw & Jaeger 1959 §11.2, Neumann's solution X = 2ξ√(α₁t) (burrow's
    // `physics::frost::neumann`, itself checked against SciPy in tests/frost.rs)
    // with the freezing point at the middle of the 0.5 K freezing interval.
    let expected = silt_neumann().depth_m(60.0 * DAY).unwrap();
    for (cell_m, dt, tolerance) in [(0.2, 3600.0, 0.03), (0.05, 3600.0, 0.01)] {
        let (front, first_ice, balance) = front_run(silt(), 4.0, -12.0, cell_m, dt, 60.0);
        let error = front / expected - 1.0;
        println!(
            "cells {cell_m} m: front {front:.4} m vs Neumann {expected:.4} m ({:+.2} %), first ice {first_ice:.4} m, balance {balance:.1e}",
            100.0 * error
        );
        assert!(error.abs() < tolerance, "{error}");
        assert!(balance < 1e-10, "{balance}");
    }
}

#[test]
fn enthalpy_front_follows_stefan_without_sensible_heat() {
    // Stefan's formula X = √(2 k₁ (T_f − T_s) t / L) (Carslaw & Jaeger 1959 §11.2,
    // the limit of Neumann's solution as the heat capacities vanish): a soil at its
    // melting edge (0 °C, so no heat comes from below) with capacities 1/1000 of a
    // soil's; the front of the 0.5 K interval at its middle, T_f = −0.25 °C.
    let material = Material::new(1.4, 2.0, 2.6e3, 1.9e3, 0.30 * 333.55e6, 0.5).unwrap();
    let (t_f, t_s, t) = (-0.25, -12.0, 30.0 * DAY);
    let expected = (2.0 * 2.0 * (t_f - t_s) * t / material.latent_heat_j_per_m3()).sqrt();
    let (front, _, balance) = front_run(material, 0.0, t_s, 0.05, 3600.0, 30.0);
    let error = front / expected - 1.0;
    println!(
        "Stefan: front {front:.4} m vs {expected:.4} m ({:+.2} %)",
        100.0 * error
    );
    assert!(error.abs() < 0.01, "{error}");
    assert!(balance < 1e-10, "{balance}");
}
