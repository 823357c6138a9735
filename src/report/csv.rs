//! CSV files of the bundle; every header names its unit.

use crate::results::Results;
use std::fmt::Write;

/// The undisturbed envelope: one row per depth.
pub fn ground_profile(results: &Results) -> String {
    let mut s = String::from("depth_m,mean_c,min_c,max_c\n");
    for r in &results.ground.profile {
        let _ = writeln!(s, "{},{:.4},{:.4},{:.4}", r.depth_m, r.mean_c, r.min_c, r.max_c);
    }
    s
}

/// The surface temperature of the typical year, one row per day.
pub fn surface_daily(results: &Results) -> String {
    let mut s = String::from("day_of_year,surface_temperature_c\n");
    for (d, t) in results.ground.surface_daily_c.iter().enumerate() {
        let _ = writeln!(s, "{},{:.4}", d + 1, t);
    }
    s
}
