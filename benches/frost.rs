//! Speed of the frost physics (medians of repeated runs; `cargo bench --bench frost`).

use std::hint::black_box;
use std::time::Instant;

use burrow::physics::frost::*;

/// Median wall time per call (s) of `f` over `runs` batches of `per_batch` calls.
fn median_s(runs: usize, per_batch: usize, mut f: impl FnMut()) -> f64 {
    let mut times: Vec<f64> = (0..runs)
        .map(|_| {
            let start = Instant::now();
            for _ in 0..per_batch {
                f();
            }
            start.elapsed().as_secs_f64() / per_batch as f64
        })
        .collect();
    times.sort_by(f64::total_cmp);
    times[runs / 2]
}

fn report(name: &str, seconds: f64) {
    println!("{name:<52} {:>10.3} µs", seconds * 1e6);
}

fn main() {
    report(
        "berggren_lambda(1.0, 0.3)",
        median_s(21, 2000, || {
            black_box(berggren_lambda(black_box(1.0), black_box(0.3)).unwrap());
        }),
    );
    let neumann = NeumannFreezing {
        k_frozen_w_mk: 2.0,
        c_frozen_j_m3k: 1.9e6,
        k_unfrozen_w_mk: 1.2,
        c_unfrozen_j_m3k: 2.5e6,
        latent_j_per_m3: 1.0e8,
        initial_c: 5.0,
        surface_c: -10.0,
        freezing_point_c: 0.0,
    };
    report(
        "NeumannFreezing::xi (two-phase)",
        median_s(21, 2000, || {
            black_box(black_box(&neumann).xi().unwrap());
        }),
    );
    let layers = [
        FrostLayer::uniform(0.5, 2.4, 1.8e6, 3.0e7),
        FrostLayer::uniform(0.7, 1.6, 2.3e6, 9.0e7),
        FrostLayer::uniform(50.0, 1.2, 2.6e6, 1.3e8),
    ];
    let season = FreezingSeason {
        surface_index_c_s: c_days_to_c_s(1100.0),
        length_s: 140.0 * 86_400.0,
        mean_annual_c: 3.5,
        freezing_point_c: 0.0,
    };
    report(
        "modified_berggren_depth (3 layers)",
        median_s(21, 200, || {
            black_box(modified_berggren_depth(black_box(&layers), black_box(&season)).unwrap());
        }),
    );
    // 30 years of invented daily means.
    let daily: Vec<f64> = (0..30 * 365 + 8)
        .map(|d| {
            4.0 - 14.0 * (2.0 * std::f64::consts::PI * (d as f64 - 15.0) / 365.25).cos()
                + ((d * 7919) % 13) as f64
                - 6.0
        })
        .collect();
    let record = DailyRecord {
        first_year: 1991,
        first_month: 1,
        first_day: 1,
        daily_mean_c: &daily,
    };
    report(
        "seasonal_indices (30 years of daily means)",
        median_s(21, 20, || {
            black_box(seasonal_indices(black_box(&record), FREEZING_SEASON_START).unwrap());
        }),
    );
    let pipe = StagnantPipe {
        inner_diameter_m: 0.1,
        wall_resistance_m_k_per_w: 0.15,
        ground_resistance_m_k_per_w: 0.75,
        water_heat_capacity_j_m3k: 4.218e6,
        water_latent_j_per_m3: 3.3348e8,
        freezing_point_c: 0.0,
    };
    let ground: Vec<f64> = (0..8760)
        .map(|h| -3.0 * (2.0 * std::f64::consts::PI * h as f64 / 8760.0).cos())
        .collect();
    report(
        "StagnantPipe::run_series (8760 hourly steps)",
        median_s(21, 20, || {
            black_box(pipe.run_series(5.0, black_box(&ground), 3600.0).unwrap());
        }),
    );
}
