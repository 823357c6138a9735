//! The multipole borehole resistance against the finite-volume engine's steady 2-D solution of
//! the same borehole cross-section (grout conductivity equal to the ground's, so the grout disc
//! needs no boundary on the rectilinear grid).

mod common;

use burrow::engine::section::{Drive, Geometry, GridOptions, Pipe, solve_steady};
use burrow::physics::borehole::SingleU;
use common::uniform_soil;
use std::f64::consts::PI;

const K: f64 = 2.0;

/// Mean of the cell-centre field on a circle, by bilinear interpolation.
fn circle_mean(s: &burrow::engine::section::Snapshot, xc: f64, zc: f64, r: f64) -> f64 {
    let nx = s.x_m.len();
    let at = |x: f64, z: f64| {
        let i = s.x_m.partition_point(|&v| v <= x).clamp(1, nx - 1) - 1;
        let j = s.z_m.partition_point(|&v| v <= z).clamp(1, s.z_m.len() - 1) - 1;
        let u = (x - s.x_m[i]) / (s.x_m[i + 1] - s.x_m[i]);
        let w = (z - s.z_m[j]) / (s.z_m[j + 1] - s.z_m[j]);
        let t = |a: usize, b: usize| s.t_c[b * nx + a];
        (1.0 - u) * (1.0 - w) * t(i, j)
            + u * (1.0 - w) * t(i + 1, j)
            + (1.0 - u) * w * t(i, j + 1)
            + u * w * t(i + 1, j + 1)
    };
    let n = 720;
    (0..n)
        .map(|k| {
            let a = 2.0 * PI * (k as f64 + 0.5) / n as f64;
            at(xc + r * a.cos(), zc + r * a.sin())
        })
        .sum::<f64>()
        / n as f64
}

/// Engine R_b = (T_f − mean T on the borehole circle)/(q₁ + q₂) for two legs of outer radius
/// `rp` at shank spacing `s` held at the fluid temperature, in a borehole of radius `rb`.
fn engine_resistance(rb: f64, rp: f64, s: f64) -> f64 {
    let depth = 10.0;
    let mut model = uniform_soil(Geometry::Planar, 20.0, 20.0, K, 2.0e6, 0.0);
    model.pipes = [-0.5 * s, 0.5 * s]
        .iter()
        .map(|&x| Pipe {
            x_m: x,
            z_m: depth,
            outer_radius_m: rp,
            wall_resistance_m_k_per_w: 0.0,
            drive: Drive::FluidTemperature(Box::new(|_| 10.0)),
        })
        .collect();
    let grid = GridOptions {
        min_cell_m: 0.004,
        cells_across_pipe: 16,
        ..GridOptions::default()
    };
    let steady = solve_steady(&model, &grid, 0.0).unwrap();
    assert!(steady.energy_balance_relative_error < 1e-4);
    let q: f64 = steady.heat_rate_w_per_m.iter().sum();
    (10.0 - circle_mean(&steady.field, 0.0, depth, rb)) / q
}

/// Single U-tubes with the legs' outer surfaces at the fluid temperature (R_p = 0): the engine's
/// steady section against the multipole method (Claesson & Hellström 2011) at order 10. The
/// engine sees the legs 10 m below an isothermal surface; that far field is harmonic across the
/// borehole, so it shifts the fluid and the circle mean alike and leaves R_b unchanged to
/// (r_b/10 m)². Measured: 0.1 % (16 k cells; 8 mm and 2 mm cells give the same to 0.3 %).
///
/// With a pipe resistance the two models differ by design: the multipole method applies R_p
/// locally around each leg (β = 2πλ_b R_p), the engine in series with an isothermal outer
/// surface, so the engine gives R_b(R_p = 0) + R_p/2 — 2.8 % below the multipole value for
/// R_p = 0.08 m K/W in the first case here. Borefield studies use the multipole value.
#[test]
fn multipole_borehole_resistance_matches_the_engine_steady_section() {
    for (rb, rp, s) in [(0.07, 0.02, 0.08), (0.055, 0.016, 0.06)] {
        let engine = engine_resistance(rb, rp, s);
        let multipole = SingleU {
            borehole_radius_m: rb,
            pipe_outer_radius_m: rp,
            shank_spacing_m: s,
            grout_conductivity_w_per_m_k: K,
            ground_conductivity_w_per_m_k: K,
            pipe_resistance_m_k_per_w: 0.0,
        }
        .resistances(10)
        .unwrap()
        .borehole_m_k_per_w;
        println!("r_b {rb}, r_p {rp}, s {s}: R_b engine {engine:.5}, multipole {multipole:.5}");
        assert!(
            (engine / multipole - 1.0).abs() < 0.005,
            "{engine} vs {multipole}"
        );
    }
}
