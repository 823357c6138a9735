//! The engine's steady solution of a heat-loss cross-section, as unit responses.
//!
//! Steady conduction without freezing is linear, so the section is solved once per pipe with
//! that pipe driven by a unit (1 K of fluid excess over the undisturbed ground, or 1 W/m) and the
//! others at zero, under a surface at 0 °C with no bottom flux: every soil layer resolved, the
//! pipes cut out at their true radius with their wall layers as a resistance. Any month's state
//! is then the sum of the responses weighted by that month's excesses — the same month-by-month
//! steady superposition the analytic method makes, so the two differ only in the conduction
//! model (homogeneous half-space with line sources against the layered, meshed section).
//!
//! A twin pipe's insulation is a circle holding both carriers, which the engine (rectangular
//! inclusions only) cannot take as such: it is meshed as a staircase of horizontal strips, each
//! as wide as makes its area equal to the circle's slice between the same depths (to the
//! nearest half cell), with cells of a twelfth of the radius; the thin casing
//! wall (a few mm, below the cell size; about 1 % of the symmetric resistance) is left as soil.

use super::TwinCasing;
use crate::engine::section::{self, Drive, GridOptions, Inclusion, Pipe as EnginePipe, SectionModel};
use crate::kinds::engine_model::{engine_pipe, sample, soil_layers};
use crate::model::{Pipe, PipeDrive, Site};

/// Strips (rows of cells) per radius of a twin pipe's insulation staircase.
const ROWS_PER_RADIUS: usize = 12;

/// Unit responses of a section: `heat[i][j]` is pipe i's heat rate (W/m) and `probes[n][j]` the
/// temperature rise at probe n (K) per unit drive of pipe j.
#[derive(Clone, Debug)]
pub struct Responses {
    pub heat: Vec<Vec<f64>>,
    pub probes: Vec<Vec<f64>>,
    /// Cells of the engine's grid.
    pub cells: usize,
}

impl Responses {
    /// Heat rates (W/m) and probe rises (K) for the drives `x` (K of fluid excess for a
    /// fluid-driven pipe, W/m for a heat-driven one).
    pub fn apply(&self, x: &[f64]) -> (Vec<f64>, Vec<f64>) {
        let dot = |row: &Vec<f64>| row.iter().zip(x).map(|(a, b)| a * b).sum();
        (
            self.heat.iter().map(dot).collect(),
            self.probes.iter().map(dot).collect(),
        )
    }
}

/// The insulation body of a twin pipe for the engine.
#[derive(Clone, Copy, Debug)]
pub struct TwinBody {
    pub x_m: f64,
    pub depth_m: f64,
    /// Outer radius of the insulation (inner radius of the casing), m.
    pub radius_m: f64,
    pub conductivity_w_per_m_k: f64,
}

impl TwinBody {
    pub fn of(t: &TwinCasing, insulation_w_per_m_k: f64) -> Self {
        Self {
            x_m: t.x_m,
            depth_m: t.depth_m,
            radius_m: t.outer_radius_m() - t.casing_thickness_m,
            conductivity_w_per_m_k: insulation_w_per_m_k,
        }
    }

    /// The equal-area staircase: strip `j` between depths `z_j` and `z_{j+1}` is centred on the
    /// circle and as wide as the circle's area between those depths divided by the strip height,
    /// rounded to a whole number of half cells (the total area then falls short by 0.09 %).
    fn strips(&self) -> Result<Vec<Inclusion>, String> {
        let r = self.radius_m;
        let h = r / ROWS_PER_RADIUS as f64;
        // ∫ 2·sqrt(r² − y²) dy from 0 to y.
        let area_to = |y: f64| {
            let y = y.clamp(-r, r);
            y * (r * r - y * y).max(0.0).sqrt() + r * r * (y / r).asin()
        };
        let material = crate::engine::material::Material::dry(self.conductivity_w_per_m_k, 1.0e6)?;
        (0..2 * ROWS_PER_RADIUS)
            .map(|j| {
                let y0 = -r + j as f64 * h;
                // Snapped to half a cell so that no sliver cells appear between nearly equal
                // strips (the grid refines around every edge).
                let exact = 0.5 * (area_to(y0 + h) - area_to(y0)) / h;
                let half = (exact / (0.5 * h)).round() * 0.5 * h;
                Ok(Inclusion {
                    x_min_m: self.x_m - half,
                    x_max_m: self.x_m + half,
                    z_min_m: self.depth_m + y0,
                    z_max_m: self.depth_m + y0 + h,
                    material,
                })
            })
            .collect()
    }
}

/// The unit responses of `pipes` (with their wall layers' conductivities as given) in the site's
/// layered ground, with a twin's insulation body when given; `probes` are `(x, depth)` points
/// (m) in the soil.
pub fn responses(
    pipes: &[Pipe],
    twin: Option<TwinBody>,
    site: &Site,
    surface_resistance_m2_k_per_w: f64,
    probes: &[(f64, f64)],
) -> Result<Responses, String> {
    let mut heat = vec![vec![0.0; pipes.len()]; pipes.len()];
    let mut rises = vec![vec![0.0; pipes.len()]; probes.len()];
    let mut cells = 0;
    for j in 0..pipes.len() {
        let model = unit_model(pipes, j, twin, site, surface_resistance_m2_k_per_w)?;
        let sol = section::solve_steady(&model, &grid(pipes, twin), 0.0)?;
        for (i, q) in sol.heat_rate_w_per_m.iter().enumerate() {
            heat[i][j] = *q;
        }
        for (n, &(x, z)) in probes.iter().enumerate() {
            rises[n][j] = sample(&sol.field, x, z);
        }
        cells = sol.cells;
    }
    Ok(Responses {
        heat,
        probes: rises,
        cells,
    })
}

/// Cells of about a twelfth of the twin's insulation radius there; the engine's defaults
/// elsewhere.
fn grid(pipes: &[Pipe], twin: Option<TwinBody>) -> GridOptions {
    let mut g = GridOptions::default();
    if let Some(t) = twin {
        g.min_cell_m = t.radius_m / ROWS_PER_RADIUS as f64;
    }
    // Pipes thinner than a fifth of a cell would become well-index nodes; keep them cut out.
    let thinnest = pipes
        .iter()
        .map(Pipe::outer_radius_m)
        .fold(f64::INFINITY, f64::min);
    g.min_cell_m = g.min_cell_m.min(4.0 * thinnest);
    g
}

fn unit_model(
    pipes: &[Pipe],
    driven: usize,
    twin: Option<TwinBody>,
    site: &Site,
    surface_resistance_m2_k_per_w: f64,
) -> Result<SectionModel, String> {
    let reach = pipes
        .iter()
        .map(|p| p.x_m.abs() + p.outer_radius_m())
        .chain(twin.map(|t| t.x_m.abs() + t.radius_m))
        .fold(0.0, f64::max);
    let deepest = pipes
        .iter()
        .map(|p| p.depth_m + p.outer_radius_m())
        .chain(twin.map(|t| t.depth_m + t.radius_m))
        .fold(0.0, f64::max);
    let width = 2.0 * (reach + 20.0 * deepest).max(20.0);
    let depth = (20.0 * deepest).max(20.0);
    let mut model = SectionModel::new(
        section::Geometry::Planar,
        width,
        depth,
        soil_layers(site)?,
        Box::new(|_| 0.0),
    );
    model.surface_resistance_m2_k_per_w = surface_resistance_m2_k_per_w;
    model.pipes = pipes
        .iter()
        .enumerate()
        .map(|(i, p)| {
            let unit = if i == driven { 1.0 } else { 0.0 };
            let mut e: EnginePipe = engine_pipe(p, true)?;
            e.drive = match p.drive {
                PipeDrive::FluidTemperature { .. } => Drive::FluidTemperature(Box::new(move |_| unit)),
                PipeDrive::HeatToGround { .. } => Drive::HeatRate(Box::new(move |_| unit)),
            };
            Ok(e)
        })
        .collect::<Result<_, String>>()?;
    if let Some(t) = twin {
        model.inclusions = t.strips()?;
    }
    Ok(model)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The staircase keeps the circle's area: each strip holds its slice to the nearest half
    /// cell of width, which for 24 strips costs 0.09 % of the area (computed for this layout).
    #[test]
    fn the_staircase_has_the_area_of_the_circle() {
        let body = TwinBody {
            x_m: 0.3,
            depth_m: 1.0,
            radius_m: 0.14,
            conductivity_w_per_m_k: 0.026,
        };
        let area: f64 = body
            .strips()
            .unwrap()
            .iter()
            .map(|s| (s.x_max_m - s.x_min_m) * (s.z_max_m - s.z_min_m))
            .sum();
        let exact = std::f64::consts::PI * 0.14 * 0.14;
        assert!(((area - exact) / exact).abs() < 2e-3, "{area} vs {exact}");
    }
}
