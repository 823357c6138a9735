//! Speed of the uniform-wall-temperature g-function (run: cargo bench --bench gfunction).
//!
//! Square fields, spacing 6 m, H = 150 m, D = 4 m, r_b = 0.07 m, α = 1e-6 m²/s, 12 segments,
//! the 40 default times. Prints the median of several runs.
use burrow::physics::gfunction::{WallCondition, default_times, gfunction, rectangle};
use std::time::Instant;

fn median_seconds(runs: usize, mut f: impl FnMut()) -> f64 {
    let mut samples: Vec<f64> = (0..runs)
        .map(|_| {
            let t = Instant::now();
            f();
            t.elapsed().as_secs_f64()
        })
        .collect();
    samples.sort_by(f64::total_cmp);
    samples[runs / 2]
}

fn main() {
    let alpha = 1e-6;
    let times = default_times(150.0, alpha);
    for (n, runs) in [(5, 9), (10, 7), (20, 5)] {
        let field = rectangle(n, n, 6.0, 150.0, 4.0, 0.07);
        for (label, condition) in [
            (
                "uniform wall temperature, 12 segments",
                WallCondition::uniform_temperature(),
            ),
            ("uniform heat flux", WallCondition::UniformHeatFlux),
        ] {
            let mut last = 0.0;
            let s = median_seconds(runs, || {
                last = gfunction(&field, alpha, &times, condition).expect("valid field")[39];
            });
            println!(
                "{n:>2} × {n:<2} {label:<40} median {:>8.1} ms   (g at ln(t/ts) = 3: {last:.3})",
                s * 1e3
            );
        }
    }
}
