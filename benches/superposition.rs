//! Speed of the temporal superposition for 25 years of hourly loads (219 000 steps), and of one
//! multipole resistance evaluation. Run with `cargo bench --bench superposition`; prints medians.

#[path = "../tests/common/line_source.rs"]
mod line_source;

use burrow::physics::borehole::{DEFAULT_MULTIPOLE_ORDER, SingleU};
use burrow::physics::superposition::*;
use std::hint::black_box;
use std::time::{Duration, Instant};

/// Time this thread has spent on a CPU, ns (Linux schedstat); None elsewhere. On a shared
/// machine it is the better measure: wall time includes waiting for the other jobs' cores.
fn thread_cpu_ns() -> Option<u64> {
    let text = std::fs::read_to_string("/proc/thread-self/schedstat").ok()?;
    text.split_whitespace().next()?.parse().ok()
}

/// Median wall time and median on-CPU time of `runs` calls.
fn median_of(runs: usize, mut f: impl FnMut()) -> (Duration, Option<Duration>) {
    let mut wall = Vec::with_capacity(runs);
    let mut cpu = Vec::with_capacity(runs);
    for _ in 0..runs {
        let (start, cpu_start) = (Instant::now(), thread_cpu_ns());
        f();
        wall.push(start.elapsed());
        if let (Some(a), Some(b)) = (cpu_start, thread_cpu_ns()) {
            cpu.push(Duration::from_nanos(b - a));
        }
    }
    wall.sort();
    cpu.sort();
    (wall[runs / 2], cpu.get(runs / 2).copied())
}

fn report(label: &str, (wall, cpu): (Duration, Option<Duration>)) {
    let cpu = cpu.map_or("n/a".to_string(), |c| format!("{:.2} ms", c.as_secs_f64() * 1e3));
    println!(
        "{label:<48} wall {:>9.2} ms   on-CPU {cpu:>10}",
        wall.as_secs_f64() * 1e3
    );
}

fn main() {
    let n = 25 * 8760;
    let loads = line_source::synthetic_hourly_load(n);
    let response = line_source::line_source_step_response(0.075, 2.5, 1.0e-6);
    let sampling = median_of(5, || {
        black_box(SampledStepResponse::new(&response, 3600.0, n).unwrap());
    });
    let h = SampledStepResponse::new(&response, 3600.0, n).unwrap();
    let first_call = median_of(1, || {
        black_box(wall_temperature_change_fft(black_box(&loads), &h).unwrap());
    });
    let fft = median_of(11, || {
        black_box(wall_temperature_change_fft(black_box(&loads), &h).unwrap());
    });
    let prepared = FftConvolution::new(&h, n).unwrap();
    let fft_reused = median_of(11, || {
        black_box(prepared.wall_temperature_change(black_box(&loads)).unwrap());
    });
    let aggregated = median_of(5, || {
        black_box(
            wall_temperature_change_aggregated(black_box(&loads), &h, DEFAULT_CELLS_PER_LEVEL).unwrap(),
        );
    });
    let direct_n = 20_000;
    let direct = median_of(3, || {
        black_box(wall_temperature_change_direct(black_box(&loads[..direct_n]), &h).unwrap());
    });
    let u = SingleU {
        borehole_radius_m: 0.075,
        pipe_outer_radius_m: 0.016,
        shank_spacing_m: 0.07,
        grout_conductivity_w_per_m_k: 1.5,
        ground_conductivity_w_per_m_k: 2.5,
        pipe_resistance_m_k_per_w: 0.05,
    };
    let multipole = median_of(21, || {
        black_box(black_box(u).resistances(DEFAULT_MULTIPOLE_ORDER).unwrap());
    });
    println!("steps: {n} (25 years hourly); medians");
    report("sample line-source step response", sampling);
    report("FFT convolution (exact), first call (plans)", first_call);
    report("FFT convolution (exact), later calls", fft);
    report("FFT convolution, plan and h spectrum reused", fft_reused);
    report(
        &format!("load aggregation ({DEFAULT_CELLS_PER_LEVEL} cells per level)"),
        aggregated,
    );
    report(
        &format!("direct convolution, first {direct_n} steps only"),
        direct,
    );
    report(
        &format!("single-U R_b, R_a, multipole order {DEFAULT_MULTIPOLE_ORDER}"),
        multipole,
    );
}
