//! The engine's section model built from the site model: soil layers, pipes and their drives,
//! shared by every kind that runs the finite-volume engine (cross-section, frost, heat loss).

use crate::engine::material::Material;
use crate::engine::section::{self, Drive, Pipe as EnginePipe, SoilLayer};
use crate::model::{DAY_S, Pipe, PipeDrive, Site, YEAR_S};
use crate::physics::buried_pipe::wall::{WallLayer, wall_resistance_m_k_per_w};

/// The site's soil layers as the engine's layers.
pub fn soil_layers(site: &Site) -> Result<Vec<SoilLayer>, String> {
    site.ground
        .layers
        .iter()
        .map(|l| {
            Ok(SoilLayer {
                thickness_m: l.thickness_m.unwrap_or(f64::INFINITY),
                material: Material::new(
                    l.conductivity_w_per_m_k,
                    l.frozen_conductivity_w_per_m_k,
                    l.heat_capacity_j_per_m3_k,
                    l.frozen_heat_capacity_j_per_m3_k,
                    l.latent_heat_j_per_m3,
                    l.freezing_interval_k,
                )?,
            })
        })
        .collect()
}

/// The engine's view of a pipe: centre, outer radius, the wall layers as one resistance, and its
/// drive as a function of time (monthly values held over each twelfth of the year).
pub fn engine_pipe(p: &Pipe, steady: bool) -> Result<EnginePipe, String> {
    let wall = if p.layers.is_empty() {
        0.0
    } else {
        let layers: Vec<WallLayer> = p
            .layers
            .iter()
            .map(|l| WallLayer::new(l.thickness_m, l.conductivity_w_per_m_k))
            .collect();
        wall_resistance_m_k_per_w(p.inner_radius_m(), &layers)?
    };
    let drive = match &p.drive {
        PipeDrive::FluidTemperature { monthly_c } => {
            let m = *monthly_c;
            if steady {
                let mean = m.iter().sum::<f64>() / 12.0;
                Drive::FluidTemperature(Box::new(move |_| mean))
            } else {
                Drive::FluidTemperature(Box::new(move |t| m[month_of(t)]))
            }
        }
        PipeDrive::HeatToGround { w_per_m } => {
            let q = *w_per_m;
            Drive::HeatRate(Box::new(move |_| q))
        }
    };
    Ok(EnginePipe {
        x_m: p.x_m,
        z_m: p.depth_m,
        outer_radius_m: p.outer_radius_m(),
        wall_resistance_m_k_per_w: wall,
        drive,
    })
}

/// Month (0–11) of time `t_s` in the periodic year of twelve equal months.
fn month_of(t_s: f64) -> usize {
    ((t_s.rem_euclid(YEAR_S) / YEAR_S) * 12.0)
        .floor()
        .clamp(0.0, 11.0) as usize
}

/// Mean over the 365 days of the periodic year.
pub fn annual_mean(f: impl Fn(f64) -> f64) -> f64 {
    (0..365).map(|d| f((d as f64 + 0.5) * DAY_S)).sum::<f64>() / 365.0
}

/// Bilinear sample of a cell-centre field (nearest edge values outside the centres).
pub fn sample(snap: &section::Snapshot, x: f64, z: f64) -> f64 {
    let locate = |axis: &[f64], v: f64| -> (usize, f64) {
        let n = axis.len();
        if n < 2 || v <= axis[0] {
            return (0, 0.0);
        }
        if v >= axis[n - 1] {
            return (n - 2, 1.0);
        }
        let i = axis.partition_point(|a| *a <= v) - 1;
        (i, (v - axis[i]) / (axis[i + 1] - axis[i]))
    };
    let nx = snap.x_m.len();
    let (i, fx) = locate(&snap.x_m, x);
    let (j, fz) = locate(&snap.z_m, z);
    let at = |a: usize, b: usize| snap.t_c[b * nx + a];
    let top = at(i, j) * (1.0 - fx) + at((i + 1).min(nx - 1), j) * fx;
    let jb = (j + 1).min(snap.z_m.len() - 1);
    let bottom = at(i, jb) * (1.0 - fx) + at((i + 1).min(nx - 1), jb) * fx;
    top * (1.0 - fz) + bottom * fz
}
