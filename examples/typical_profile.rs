//! Times a typical periodic ground-temperature profile (15 m, 2 cm surface cells,
//! 6 h steps, tolerance 1e-4 K) for a dry homogeneous soil and for a two-layer
//! freezing soil. Run with `cargo run --release --example typical_profile`.
//! Soils and climates are invented demo data.

use burrow::engine::column::{ColumnLayer, ColumnOptions, periodic_profile};
use burrow::physics::annual_wave::{AnnualWave, YEAR_S};
use std::time::Instant;

struct Case {
    name: &'static str,
    layers: Vec<ColumnLayer>,
    geothermal_flux_w_per_m2: f64,
    climate: AnnualWave,
}

fn main() -> Result<(), String> {
    let mild = AnnualWave::new(8.0, 10.0, 30.0, YEAR_S)?;
    let cold = AnnualWave::new(3.0, 13.0, 25.0, YEAR_S)?;
    let cases = [
        Case {
            name: "dry homogeneous, no geothermal flux",
            layers: vec![ColumnLayer::dry(1.0, 1.5, 2.2e6)],
            geothermal_flux_w_per_m2: 0.0,
            climate: mild,
        },
        Case {
            name: "dry homogeneous, 0.06 W/m2",
            layers: vec![ColumnLayer::dry(1.0, 1.5, 2.2e6)],
            geothermal_flux_w_per_m2: 0.06,
            climate: mild,
        },
        Case {
            name: "two-layer freezing soil, cold climate",
            layers: vec![
                ColumnLayer::moist(1.2, 1.1, 1.8, 2.6e6, 1.9e6, 1.0e8),
                ColumnLayer::moist(1.0, 1.6, 2.4, 2.4e6, 1.8e6, 0.8e8),
            ],
            geothermal_flux_w_per_m2: 0.06,
            climate: cold,
        },
    ];
    let opts = ColumnOptions {
        depth_m: 15.0,
        cell_size_m: 0.02,
        steps_per_year: 365 * 4,
        max_years: 400,
        tolerance_k: 1e-4,
    };
    for case in &cases {
        let surface = |t: f64| case.climate.surface_c(t);
        let mut fastest = f64::INFINITY;
        let mut profile = None;
        for _ in 0..5 {
            let start = Instant::now();
            let p = periodic_profile(&case.layers, &surface, case.geothermal_flux_w_per_m2, &opts)?;
            fastest = fastest.min(start.elapsed().as_secs_f64());
            profile = Some(p);
        }
        let Some(p) = profile else {
            return Err("no run".into());
        };
        println!(
            "{}: {:.0} ms (fastest of 5), {} years simulated, {} reported depths, energy balance {:.1e}, frost depth {:?} m",
            case.name,
            fastest * 1e3,
            p.years_to_converge,
            p.depths_m.len(),
            p.energy_balance_relative_error,
            p.frost_penetration_m(0.0)
        );
    }
    Ok(())
}
