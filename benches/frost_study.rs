//! Speed of the frost study's engine run (issue 6 target: under 3 s): the design winter with
//! two spin-up years and the main in place, at the default resolution
//! (`studies::frost_numerical::DEFAULT_RESOLUTION`: about 2,300 cells, daily spin-up steps,
//! 6-hour steps in the design season), on the water-main example's ground and climate; and one
//! board-search trial (a spin-up year and the design season at daily steps, no pipe).
//! Run: cargo bench --bench frost_study. Prints wall-clock medians and the CPU time of this
//! process per run (the machine is shared).

use std::path::Path;
use std::time::Instant;

use burrow::ground::climate::SurfaceYear;
use burrow::kinds::frost::numerical::{DEFAULT_RESOLUTION, Winter, board_trial, winter_run};
use burrow::model::StudyKind;

/// CPU time of this process so far, s.
fn cpu_s() -> f64 {
    std::fs::read_to_string("/proc/self/schedstat")
        .ok()
        .and_then(|s| s.split_whitespace().next().and_then(|v| v.parse::<f64>().ok()))
        .map_or(f64::NAN, |ns| ns * 1e-9)
}

fn median(mut v: Vec<f64>) -> f64 {
    v.sort_by(f64::total_cmp);
    v[v.len() / 2]
}

fn main() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let loaded = burrow::site::load(&root.join("site-examples/tarnwick-heights-water-main.yaml"))
        .expect("the water-main example loads");
    let site = &loaded.site;
    let StudyKind::Frost(study) = &site.studies[0].kind else {
        panic!("the example's first study is a frost study")
    };
    let pipe = study.pipe.as_ref().expect("the example has a main");
    let ground = burrow::ground::profile::undisturbed(site, 15.0).expect("undisturbed ground");
    let year = SurfaceYear::from_climate(&site.climate);
    let index: f64 = {
        let days: Vec<f64> = (0..365)
            .map(|d| year.surface_c((181.0 + d as f64 + 0.5) * 86_400.0))
            .collect();
        burrow::physics::frost::freezing_index_c_days(&days).unwrap()
    };
    let winter = Winter::new(year, 181.0 * 86_400.0, index).unwrap();

    let (mut wall, mut cpu) = (Vec::new(), Vec::new());
    let mut cells = 0;
    let mut solves = 0;
    for _ in 0..3 {
        let (t, c) = (Instant::now(), cpu_s());
        let r = winter_run(site, &ground, Some(pipe), &winter, &DEFAULT_RESOLUTION).unwrap();
        wall.push(t.elapsed().as_secs_f64());
        cpu.push(cpu_s() - c);
        cells = r.cells;
        solves = r.linear_solves;
    }
    let steps = 2 * 365 + 365 * 4;
    println!(
        "design winter + 2 spin-up years with the main: {cells} cells, {steps} steps, {solves} solves: median {:.2} s wall, {:.2} s CPU",
        median(wall),
        median(cpu)
    );

    let board = study.board.as_ref().expect("the example has a board");
    let (mut wall, mut cpu) = (Vec::new(), Vec::new());
    for _ in 0..3 {
        let (t, c) = (Instant::now(), cpu_s());
        board_trial(site, &ground, pipe, board, &winter, 1.0).unwrap();
        wall.push(t.elapsed().as_secs_f64());
        cpu.push(cpu_s() - c);
    }
    println!(
        "one board trial (1 m board, spin-up year + design season, daily steps): median {:.2} s wall, {:.2} s CPU",
        median(wall),
        median(cpu)
    );
}
