//! Steady buried pipes in the 2-D engine against closed forms, at the default grid.

mod common;

use std::f64::consts::PI;

use burrow::engine::section::{
    Drive, Geometry, GridOptions, Pipe, SectionModel, solve_steady, wall_resistance_m_k_per_w,
};
use common::{buried_cylinder_resistance, image_sum, uniform_soil};

const K: f64 = 1.5;
const WIDTH: f64 = 80.0;
const DEPTH: f64 = 40.0;

fn pipe(x: f64, z: f64, r: f64, wall: f64, fluid_c: f64) -> Pipe {
    Pipe {
        x_m: x,
        z_m: z,
        outer_radius_m: r,
        wall_resistance_m_k_per_w: wall,
        drive: Drive::FluidTemperature(Box::new(move |_| fluid_c)),
    }
}

fn model_with(pipes: Vec<Pipe>) -> SectionModel {
    let mut m = uniform_soil(Geometry::Planar, WIDTH, DEPTH, K, 2.0e6, 0.0);
    m.pipes = pipes;
    m
}

/// Self resistance including the images of the model's adiabatic bottom and sides.
fn self_resistance(h: f64, d: f64) -> f64 {
    buried_cylinder_resistance(h, d, K) + image_sum(0.0, h, 0.0, h, WIDTH, DEPTH, true) / (2.0 * PI * K)
}

#[test]
fn isothermal_pipe_matches_cylinder_shape_factor_under_isothermal_surface() {
    // Carslaw & Jaeger 1959 §10.10 (shape factor 2π/acosh(2H/D)): H = 1 m, D = 0.2 m.
    let (h, d, dt) = (1.0, 0.2, 10.0);
    let s = solve_steady(
        &model_with(vec![pipe(0.0, h, 0.5 * d, 0.0, dt)]),
        &GridOptions::default(),
        0.0,
    )
    .unwrap();
    let q = s.heat_rate_w_per_m[0];
    let half_space = dt / buried_cylinder_resistance(h, d, K);
    let finite_domain = dt / self_resistance(h, d);
    println!(
        "q = {q} W/m, half-space {half_space}, with domain images {finite_domain}, cells {}",
        s.cells
    );
    assert!((q / half_space - 1.0).abs() < 0.02);
    // The same pipe with the 80 m × 40 m domain's own boundaries as images.
    assert!((q / finite_domain - 1.0).abs() < 0.01);
    assert!(
        s.energy_balance_relative_error < 1e-10,
        "{}",
        s.energy_balance_relative_error
    );
}

#[test]
fn pipe_smaller_than_its_cell_matches_shape_factor_through_the_well_index() {
    // D = 20 mm in 0.2 m cells: coupled by the Peaceman (1983) well index.
    let (h, d, dt) = (1.2, 0.02, 10.0);
    let grid = GridOptions {
        min_cell_m: 0.2,
        ..GridOptions::default()
    };
    let s = solve_steady(&model_with(vec![pipe(0.3, h, 0.5 * d, 0.0, dt)]), &grid, 0.0).unwrap();
    let expected = dt / self_resistance(h, d);
    println!("q = {} W/m, expected {expected}", s.heat_rate_w_per_m[0]);
    assert!((s.heat_rate_w_per_m[0] / expected - 1.0).abs() < 0.02);
    assert!(
        s.energy_balance_relative_error < 1e-10,
        "{}",
        s.energy_balance_relative_error
    );
}

#[test]
fn two_distant_pipes_match_line_sources_with_images() {
    // Superposed line sources with their images (valid for spacing, depth ≫ D):
    // T_i = Σ_j q_j R_ij, R_ij = Σ images ln(d'/d)/(2πk) (Carslaw & Jaeger 1959 §10.10).
    let (h, d) = (1.5, 0.1);
    let (xa, xb) = (-2.0, 2.0);
    let (ta, tb) = (10.0, 4.0);
    let s = solve_steady(
        &model_with(vec![pipe(xa, h, 0.5 * d, 0.0, ta), pipe(xb, h, 0.5 * d, 0.0, tb)]),
        &GridOptions::default(),
        0.0,
    )
    .unwrap();
    let r_self = self_resistance(h, d);
    let r_mutual = image_sum(xa, h, xb, h, WIDTH, DEPTH, false) / (2.0 * PI * K);
    let det = r_self * r_self - r_mutual * r_mutual;
    let qa = (ta * r_self - tb * r_mutual) / det;
    let qb = (tb * r_self - ta * r_mutual) / det;
    println!("q = {:?}, expected {qa} {qb}", s.heat_rate_w_per_m);
    assert!((s.heat_rate_w_per_m[0] / qa - 1.0).abs() < 0.02);
    assert!((s.heat_rate_w_per_m[1] / qb - 1.0).abs() < 0.02);
    assert!(
        s.energy_balance_relative_error < 1e-10,
        "{}",
        s.energy_balance_relative_error
    );
}

#[test]
fn insulated_pipe_matches_series_of_wall_layers_and_ground() {
    // R = Σ ln(r_o/r_i)/(2πk_layer) + acosh(2H/D)/(2πk) (series resistances; wall
    // layers: Carslaw & Jaeger 1959 §7.2). Steel 3.6 mm, PUR 50 mm, PE casing 3.4 mm.
    let r_in = 0.1143 / 2.0 - 0.0036;
    let layers = [(0.0036, 50.0), (0.05, 0.026), (0.0034, 0.43)];
    let r_wall = wall_resistance_m_k_per_w(r_in, &layers).unwrap();
    let r_out = r_in + 0.0036 + 0.05 + 0.0034;
    let (h, dt) = (0.9, 70.0);
    let s = solve_steady(
        &model_with(vec![pipe(0.0, h, r_out, r_wall, dt)]),
        &GridOptions::default(),
        0.0,
    )
    .unwrap();
    let expected = dt / (r_wall + self_resistance(h, 2.0 * r_out));
    let half_space = dt / (r_wall + buried_cylinder_resistance(h, 2.0 * r_out, K));
    println!(
        "q = {} W/m, expected {expected}, half-space {half_space}",
        s.heat_rate_w_per_m[0]
    );
    assert!((s.heat_rate_w_per_m[0] / expected - 1.0).abs() < 0.01);
    assert!((s.heat_rate_w_per_m[0] / half_space - 1.0).abs() < 0.02);
    // The wall temperature divides ΔT like the two resistances.
    let wall_expected = dt - s.heat_rate_w_per_m[0] * r_wall;
    assert!((s.wall_c[0] - wall_expected).abs() < 1e-6);
    assert!(
        s.energy_balance_relative_error < 1e-10,
        "{}",
        s.energy_balance_relative_error
    );
}

#[test]
fn heat_rate_driven_pipe_reaches_the_fluid_temperature_of_the_series_resistance() {
    // Inverse of the previous check: q' given, T_f = q'·(R_wall + R_ground).
    let (h, r, r_wall, q) = (1.0, 0.1, 0.5, 25.0);
    let mut m = model_with(vec![]);
    m.pipes.push(Pipe {
        x_m: 0.0,
        z_m: h,
        outer_radius_m: r,
        wall_resistance_m_k_per_w: r_wall,
        drive: Drive::HeatRate(Box::new(move |_| q)),
    });
    let s = solve_steady(&m, &GridOptions::default(), 0.0).unwrap();
    let expected = q * (r_wall + self_resistance(h, 2.0 * r));
    println!("T_f = {} °C, expected {expected}", s.fluid_c[0]);
    assert!((s.heat_rate_w_per_m[0] - q).abs() < 1e-9 * q);
    assert!((s.fluid_c[0] / expected - 1.0).abs() < 0.01);
}

#[test]
fn steady_pipe_heat_rate_converges_when_cells_are_halved() {
    // Grid convergence: halving every cell moves q' by less than its 2 % tolerance.
    let m = model_with(vec![pipe(0.0, 1.0, 0.1, 0.0, 10.0)]);
    let coarse = solve_steady(&m, &GridOptions::default(), 0.0).unwrap();
    let fine = solve_steady(&m, &GridOptions::default().refined(), 0.0).unwrap();
    let change = (coarse.heat_rate_w_per_m[0] / fine.heat_rate_w_per_m[0] - 1.0).abs();
    println!(
        "coarse {} fine {} ({} -> {} cells)",
        coarse.heat_rate_w_per_m[0], fine.heat_rate_w_per_m[0], coarse.cells, fine.cells
    );
    assert!(change < 0.01, "{change}");
}
