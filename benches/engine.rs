//! Speed of the 2-D engine: a 20 m × 10 m section with one pipe, about 20,000 cells.
//! Run: cargo bench --bench engine. Prints wall-clock medians of a few runs.

use std::time::Instant;

use burrow::engine::material::Material;
use burrow::engine::section::{
    Drive, Geometry, GridOptions, Initial, Pipe, SectionModel, SoilLayer, SolverKind, TransientOptions,
    grid_size, solve_transient,
};
use burrow::physics::annual_wave::{AnnualWave, YEAR_S};

fn model(freezing: bool) -> SectionModel {
    let wave = AnnualWave::new(5.0, 12.0, 30.0, YEAR_S).unwrap();
    let material = if freezing {
        Material::new(1.4, 2.0, 2.2e6, 1.8e6, 0.25 * 333.55e6, 0.5).unwrap()
    } else {
        Material::dry(1.4, 2.2e6).unwrap()
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
        wall_resistance_m_k_w: 0.8,
        drive: Drive::FluidTemperature(Box::new(|_| 8.0)),
    });
    m
}

fn grid(scale: f64) -> GridOptions {
    GridOptions {
        surface_cell_m: 0.02 * scale,
        min_cell_m: 0.02 * scale,
        max_cell_m: 0.2 * scale,
        growth_ratio: 1.05,
        cells_across_pipe: 20,
    }
}

fn peak_memory_mb() -> f64 {
    std::fs::read_to_string("/proc/self/status")
        .ok()
        .and_then(|s| {
            s.lines()
                .find(|l| l.starts_with("VmHWM"))
                .and_then(|l| l.split_whitespace().nth(1).and_then(|v| v.parse::<f64>().ok()))
        })
        .map_or(f64::NAN, |kb| kb / 1024.0)
}

fn time_run(
    label: &str,
    freezing: bool,
    scale: f64,
    dt: f64,
    steps: usize,
    solver: SolverKind,
    repeats: usize,
) -> f64 {
    let m = model(freezing);
    let mut times = Vec::new();
    let mut info = String::new();
    for _ in 0..repeats {
        let mut opts = TransientOptions::new(dt, steps, Initial::Uniform(5.0));
        opts.grid = grid(scale);
        opts.solver = solver;
        let start = Instant::now();
        let s = solve_transient(&m, &opts).unwrap();
        times.push(start.elapsed().as_secs_f64());
        info = format!(
            "cells {}, steps {steps}, solves/step {:.2}, factorisations {}, balance {:.1e}",
            s.cells,
            s.linear_solves as f64 / steps as f64,
            s.factorisations,
            s.energy_balance_relative_error
        );
    }
    times.sort_by(f64::total_cmp);
    let median = times[times.len() / 2];
    println!(
        "{label:<48} {median:8.3} s  ({info}; peak RSS {:.0} MB)",
        peak_memory_mb()
    );
    median
}

fn main() {
    for scale in [2.0, 1.0, 0.5] {
        let (nx, nz) = grid_size(&model(false), &grid(scale)).unwrap();
        println!("grid scale {scale}: {nx} × {nz} = {} cells", nx * nz);
    }
    let hour = 3600.0;
    let year_h = 8760;
    println!("\n-- one year, 1 h steps, no freezing --");
    time_run(
        "ADI (default without freezing)",
        false,
        1.0,
        hour,
        year_h,
        SolverKind::Adi,
        3,
    );
    time_run(
        "Direct (Cholesky, factor reused)",
        false,
        1.0,
        hour,
        year_h,
        SolverKind::Direct,
        1,
    );

    println!("\n-- freezing (default: Direct, refactor when coefficients change) --");
    // January: the costly part of a freezing year; extrapolated below.
    let jan = time_run(
        "Direct, 1 h steps, 31 days of January",
        true,
        1.0,
        hour,
        31 * 24,
        SolverKind::Direct,
        1,
    );
    println!(
        "  → a year if every month cost as much as January: {:.0} s",
        jan * 365.0 / 31.0
    );
    let jan6 = time_run(
        "Direct, 6 h steps, 31 days of January",
        true,
        1.0,
        6.0 * hour,
        31 * 4,
        SolverKind::Direct,
        1,
    );
    println!(
        "  → a year at 6 h steps, same extrapolation: {:.0} s",
        jan6 * 365.0 / 31.0
    );

    println!("\n-- scaling of the ADI scheme (no freezing, 1 h steps) --");
    for scale in [2.0, 1.0, 0.5] {
        time_run(
            &format!("cells: grid scale {scale}, 30 days"),
            false,
            scale,
            hour,
            30 * 24,
            SolverKind::Adi,
            3,
        );
    }
    for days in [30, 60, 120] {
        time_run(
            &format!("steps: {days} days"),
            false,
            1.0,
            hour,
            days * 24,
            SolverKind::Adi,
            3,
        );
    }
    println!("\n-- scaling of the direct solver (no freezing, 1 h steps, 30 days) --");
    for scale in [2.0, 1.0, 0.5] {
        time_run(
            &format!("cells: grid scale {scale}"),
            false,
            scale,
            hour,
            30 * 24,
            SolverKind::Direct,
            1,
        );
    }
}
