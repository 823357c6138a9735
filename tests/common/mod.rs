//! Shared helpers of the engine tests (references computed in Rust from closed forms).
#![allow(dead_code)]

use std::f64::consts::PI;

use burrow::engine::material::Material;
use burrow::engine::section::{Geometry, SectionModel, SoilLayer};

/// Temperature rise (K per W/m, times 2πk) at (xo, zo) from a unit line source at
/// (xs, zs) in the strip x ∈ [−W/2, W/2], z ∈ [0, Db] with T = 0 at z = 0, no flux
/// at z = Db and at x = ±W/2: the image lattice (method of images, Carslaw &
/// Jaeger 1959 §10.10). Sources at zs + 4Db·m and 2Db − zs + 4Db·m, sinks at
/// −zs + 4Db·m and 2Db + zs + 4Db·m; each mirrored about the sides with period 2W.
/// `skip_primary` leaves out the source itself and its surface image (whose
/// effect on the pipe's own wall is acosh(2H/D), exact for a finite cylinder).
pub fn image_sum(xs: f64, zs: f64, xo: f64, zo: f64, w: f64, db: f64, skip_primary: bool) -> f64 {
    let mut total = 0.0;
    let (jm, mm) = (30_i32, 400_i32);
    for j in -jm..=jm {
        let shift = 2.0 * w * j as f64;
        for (xi, _) in [(xs + shift, 0), (w - xs + shift, 1)] {
            for m in -mm..=mm {
                let p = 4.0 * db * m as f64;
                let images = [
                    (zs + p, 1.0),
                    (2.0 * db - zs + p, 1.0),
                    (-zs + p, -1.0),
                    (2.0 * db + zs + p, -1.0),
                ];
                for (k, &(zi, sign)) in images.iter().enumerate() {
                    let primary = j == 0 && m == 0 && (xi - xs).abs() < 1e-12 && (k == 0 || k == 2);
                    if skip_primary && primary {
                        continue;
                    }
                    let d = (xo - xi).hypot(zo - zi);
                    total -= sign * d.ln();
                }
            }
        }
    }
    total
}

/// Shape-factor resistance of a cylinder of diameter `d` with its centre at depth
/// `h` under an isothermal surface: acosh(2H/D)/(2πk), m·K/W (Carslaw & Jaeger
/// 1959 §10.10, any conduction text's shape-factor table).
pub fn buried_cylinder_resistance(h: f64, d: f64, k: f64) -> f64 {
    (2.0 * h / d).acosh() / (2.0 * PI * k)
}

/// A uniform dry soil model.
pub fn uniform_soil(
    geometry: Geometry,
    width: f64,
    depth: f64,
    k: f64,
    c: f64,
    surface_c: f64,
) -> SectionModel {
    SectionModel::new(
        geometry,
        width,
        depth,
        vec![SoilLayer {
            thickness_m: depth,
            material: Material::dry(k, c).unwrap(),
        }],
        Box::new(move |_| surface_c),
    )
}

/// Reads `key,value` and two-column data rows of a reference CSV (comments `#`).
pub fn read_reference(path: &str) -> (Vec<(String, f64)>, Vec<Vec<f64>>) {
    let text = std::fs::read_to_string(path).unwrap();
    let mut keys = Vec::new();
    let mut rows = Vec::new();
    for line in text
        .lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
    {
        let parts: Vec<&str> = line.split(',').collect();
        let numbers: Option<Vec<f64>> = parts.iter().map(|p| p.trim().parse().ok()).collect();
        match numbers {
            Some(v) => rows.push(v),
            None if parts.len() == 2 => {
                if let Ok(v) = parts[1].trim().parse() {
                    keys.push((parts[0].to_string(), v));
                }
            }
            None => {}
        }
    }
    (keys, rows)
}

pub fn key(keys: &[(String, f64)], name: &str) -> f64 {
    keys.iter().find(|(k, _)| k == name).map(|(_, v)| *v).unwrap()
}
