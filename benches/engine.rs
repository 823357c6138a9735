//! Speed of the 2-D engine: a 20 m × 10 m section with one pipe, about 21,000 cells
//! (169 × 124). Run: cargo bench --bench engine. Prints wall-clock medians of a
//! few runs and the CPU time of the median run (the machine is shared).

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
        wall_resistance_m_k_per_w: 0.8,
        drive: Drive::FluidTemperature(Box::new(|_| 8.0)),
    });
    m
}

fn grid(scale: f64) -> GridOptions {
    GridOptions {
        surface_cell_m: 0.02 * scale,
        min_cell_m: 0.02 * scale,
        max_cell_m: 0.2 * scale,
        growth_ratio: 1.09,
        cells_across_pipe: 20,
    }
}

/// CPU time of this (single-threaded) process so far, s.
fn cpu_s() -> f64 {
    std::fs::read_to_string("/proc/self/schedstat")
        .ok()
        .and_then(|s| s.split_whitespace().next().and_then(|v| v.parse::<f64>().ok()))
        .map_or(f64::NAN, |ns| ns * 1e-9)
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
        let cpu = cpu_s();
        let s = solve_transient(&m, &opts).unwrap();
        times.push((start.elapsed().as_secs_f64(), cpu_s() - cpu));
        info = format!(
            "cells {}, steps {steps}, solves/step {:.2}, freezing iterations/step {:.2}, CG iterations/solve {:.1}, factorisations {}, balance {:.1e}",
            s.cells,
            s.linear_solves as f64 / steps as f64,
            s.nonlinear_iterations as f64 / steps as f64,
            s.linear_iterations as f64 / s.linear_solves.max(1) as f64,
            s.factorisations,
            s.energy_balance_relative_error
        );
    }
    times.sort_by(|a, b| a.0.total_cmp(&b.0));
    let (median, cpu) = times[times.len() / 2];
    println!(
        "{label:<44} {median:8.3} s wall {cpu:8.3} s CPU ({info}; peak RSS {:.0} MB)",
        peak_memory_mb()
    );
    cpu
}

fn main() {
    for scale in [2.0, 1.0, 0.5] {
        let (nx, nz) = grid_size(&model(false), &grid(scale)).unwrap();
        println!("grid scale {scale}: {nx} × {nz} = {} cells", nx * nz);
    }
    let hour = 3600.0;
    let year_h = 8760;
    println!("\n-- one year, 1 h steps, no freezing (target < 4 s) --");
    time_run(
        "ADI (default without freezing)",
        false,
        1.0,
        hour,
        year_h,
        SolverKind::Adi,
        3,
    );

    println!("\n-- one year with freezing, Iterative (default with freezing) --");
    time_run(
        "Iterative, 1 h steps, a year (target < 10 s)",
        true,
        1.0,
        hour,
        year_h,
        SolverKind::Iterative,
        1,
    );
    time_run(
        "Iterative, 6 h steps, a year (target < 2 s)",
        true,
        1.0,
        6.0 * hour,
        year_h / 6,
        SolverKind::Iterative,
        1,
    );

    println!("\n-- freezing, Direct (the reference; refactorises when coefficients change) --");
    let week = time_run(
        "Direct, 1 h steps, first 7 days",
        true,
        1.0,
        hour,
        7 * 24,
        SolverKind::Direct,
        1,
    );
    let fast_week = time_run(
        "Iterative, 1 h steps, first 7 days",
        true,
        1.0,
        hour,
        7 * 24,
        SolverKind::Iterative,
        1,
    );
    println!(
        "  → Direct / Iterative CPU over the same week: {:.1}",
        week / fast_week
    );
    let week6 = time_run(
        "Direct, 6 h steps, first 7 days",
        true,
        1.0,
        6.0 * hour,
        7 * 4,
        SolverKind::Direct,
        1,
    );
    let fast_week6 = time_run(
        "Iterative, 6 h steps, first 7 days",
        true,
        1.0,
        6.0 * hour,
        7 * 4,
        SolverKind::Iterative,
        1,
    );
    println!(
        "  → Direct / Iterative CPU over the same week: {:.1}",
        week6 / fast_week6
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
    println!("\n-- scaling of the Iterative solver (freezing, 1 h steps) --");
    for scale in [2.0, 1.0, 0.5] {
        time_run(
            &format!("cells: grid scale {scale}, 30 days"),
            true,
            scale,
            hour,
            30 * 24,
            SolverKind::Iterative,
            1,
        );
    }
    for days in [15, 30, 60] {
        time_run(
            &format!("steps: {days} days"),
            true,
            1.0,
            hour,
            days * 24,
            SolverKind::Iterative,
            1,
        );
    }
}
