//! Starter site files printed by `burrow init`, and the table printed by `burrow materials`.

use crate::materials::{fluids, soils};
use std::fmt::Write;

pub const DISTRICT_HEATING: &str = include_str!("../templates/district-heating.yaml");
pub const BOREFIELD: &str = include_str!("../templates/borefield.yaml");
pub const WATER_MAIN: &str = include_str!("../templates/water-main.yaml");

/// Every template with its name, for tests and for `init`.
pub const ALL: [(&str, &str); 3] = [
    ("district-heating", DISTRICT_HEATING),
    ("borefield", BOREFIELD),
    ("water-main", WATER_MAIN),
];

/// The soil presets and antifreeze mixtures a site file may name.
pub fn materials_table() -> String {
    let mut s = String::from("Soil presets (a layer's `soil:`); unfrozen / frozen values\n\n");
    let _ = writeln!(
        s,
        "{:<18} {:>15} {:>17} {:>8} {:>14}  source",
        "name", "k W/(m K)", "C MJ/(m3 K)", "water", "k range"
    );
    for p in soils::presets() {
        let _ = writeln!(
            s,
            "{:<18} {:>6.2} / {:<6.2} {:>7.2} / {:<7.2} {:>7.0}% {:>6.2}–{:<6.2}  {}",
            p.name,
            p.conductivity_w_per_m_k,
            p.frozen_conductivity_w_per_m_k,
            p.heat_capacity_j_per_m3_k / 1e6,
            p.frozen_heat_capacity_j_per_m3_k / 1e6,
            p.water_content * 100.0,
            p.conductivity_range_w_per_m_k.0,
            p.conductivity_range_w_per_m_k.1,
            p.source
        );
    }
    s.push_str("\nSurface presets (a frost study's `surface:`): n-factors, surface / air index\n\n");
    let _ = writeln!(
        s,
        "{:<20} {:>9} {:>9}  surface; source",
        "name", "freezing", "thawing"
    );
    for p in crate::physics::frost::n_factor_presets() {
        let _ = writeln!(
            s,
            "{:<20} {:>9.2} {:>9}  {}; {}",
            p.key,
            p.freezing,
            p.thawing.map_or("—".to_string(), |t| format!("{t:.2}")),
            p.surface,
            p.source
        );
    }
    s.push_str("\nAntifreeze mixtures (concentration as a mass fraction)\n\n");
    let _ = writeln!(
        s,
        "{:<18} {:>14}  freezing point at 10 / 20 / 30 % by mass",
        "name", "max fraction"
    );
    for m in fluids::Mixture::all() {
        let fractions: &[f64] = if m == fluids::Mixture::Water {
            &[0.0]
        } else {
            &[0.1, 0.2, 0.3]
        };
        let points: Vec<String> = fractions
            .iter()
            .filter_map(|&x| fluids::Fluid::new(m, x).ok())
            .map(|f| format!("{:.1} °C", f.freezing_point_c()))
            .collect();
        let _ = writeln!(
            s,
            "{:<18} {:>13.0}%  {}",
            m.name(),
            m.max_mass_fraction() * 100.0,
            points.join(" / ")
        );
    }
    s
}
