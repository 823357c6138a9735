//! Transient two-dimensional heat conduction with freezing in a vertical
//! cross-section of the ground (x across, z down from the surface) or in
//! axisymmetric r–z coordinates around one borehole.
//!
//! ```text
//! ∂H/∂t = ∇·(k(T)∇T),   H(T) = sensible + latent enthalpy (engine::material)
//! ```
//!
//! # Domain and boundaries
//!
//! Planar: `x ∈ [−W/2, W/2]`, `z ∈ [0, D]`, per metre of length along the pipes.
//! Axisymmetric: `r ∈ [0, R]`, `z ∈ [0, D]`, whole 2π (heat rates per metre of
//! borehole). The surface `z = 0` exchanges heat with the surface temperature
//! `T_s(t)` through the resistance `R0` (m²K/W, Robin; Dirichlet when `R0 = 0`). The
//! bottom receives the upward heat flux `q_geo` (W/m², 0 by default); the sides are
//! adiabatic (symmetry planes; in r–z the axis is a symmetry line).
//!
//! # Discretisation
//!
//! * Cell-centred finite volumes on a rectilinear graded grid ([`crate::engine::grid`]):
//!   cells are smallest at the surface, around pipes and across inclusions and grow
//!   geometrically away; layer interfaces, inclusion edges, the borehole wall and
//!   the faces around a well-index pipe lie on cell faces exactly.
//! * Each cell has one material (inclusion over layer) and its own frozen/unfrozen
//!   state. Face conductances are series (harmonic) sums of the two half-cell
//!   resistances; in r–z the radial half-cell resistance is the exact cylindrical
//!   `ln(r_face/r_centre)/(2πk·Δz)`.
//! * Pipes (planar), with the wall layers lumped in `R_wall` (m K/W, see
//!   [`wall_resistance_m_k_per_w`]) between the fluid and the outer surface, which is
//!   taken as isothermal at `T_w`:
//!   - a pipe at least a fifth of its local cell size in diameter is cut out at its
//!     true radius: cells whose centre lies inside the circle leave the domain, and
//!     each remaining cell next to one is joined to the pipe surface along the grid
//!     line by `k·A_face/d`, with `d` the distance from the cell centre to the true
//!     circle (Shortley–Weller treatment of a curved Dirichlet boundary); the grid
//!     there has `cells_across_pipe` cells per diameter;
//!   - a smaller pipe sits at the centre of a cell of a locally uniform 3 × 3 block
//!     and is joined to it by the well index `2πk/ln(r_eq/r_o)` with
//!     `r_eq = 0.14·sqrt(Δx² + Δz²)` (D. W. Peaceman, "Interpretation of well-block
//!     pressures in numerical reservoir simulation with nonsquare grid blocks and
//!     anisotropic permeability", SPE Journal 23(3), 1983, 531–543; for square cells
//!     it is 0.198·Δx, Peaceman 1978).
//!
//!   A pipe driven by its fluid temperature with `R_wall = 0` fixes `T_w = T_f`;
//!   otherwise `T_w` is an unknown of the step (fluid: `(T_f − T_w)/R_wall = q'`;
//!   heat rate: `q'` given) and is found by a capacitance (Schur complement) step:
//!   the cell response to each wall temperature is precomputed with the same
//!   solver, so one linear solve per step plus one per pipe after a change of
//!   coefficients. The iterative solver instead takes each wall node eliminated
//!   into the cell system (`T_w = (Σ g·T + b)/a`, a symmetric rank-one term, see
//!   [`crate::engine::linear`]), so it needs no responses: one solve per iteration.
//! * Borehole (r–z): the wall `r = r_b` between `top` and `bottom` is a grid face;
//!   the cells inside are removed (ends adiabatic). A fluid-driven borehole has an
//!   isothermal wall node behind `R_wall` (the borehole resistance); a
//!   heat-rate-driven one injects the uniform flux `q'/(2πr_b)` (the cylinder source
//!   condition, Carslaw & Jaeger 1959 §13.7).
//! * Time: backward Euler with a fixed step. Freezing uses the linearised enthalpy
//!   update of Swaminathan & Voller (1992) ([`crate::engine::material`]): per
//!   iteration one linear solve of the cell system built at the current iterate;
//!   iteration stops when the linearisation was exact or no temperature moved by
//!   more than the tolerance. In transient runs each cell's conductivity is taken
//!   at the start of the step (lagged one step, first order in Δt like backward
//!   Euler itself; the latent heat stays fully implicit), so the linearisation is
//!   exact when no cell changed its piece of H(T) and most steps take one
//!   iteration; the steady solve iterates the conductivity too (Picard), where a
//!   mushy cell's k(T) makes the linearisation inexact.
//! * Linear algebra ([`crate::engine::linear`]): sparse Cholesky (reference),
//!   Douglas–Gunn ADI (fast, default without freezing) or preconditioned
//!   conjugate gradients (default with freezing; the Cholesky result to the
//!   iteration tolerance). All are written in delta form `δ = S(r)`,
//!   `r = f − K·Tᵐ`. The wall temperatures of node pipes enter `r` at their last
//!   iterate and are corrected through the responses, which are recomputed
//!   whenever the coefficients change; only the cells whose linearisation was not
//!   exact (and their faces) have their coefficients rebuilt.
//!
//! # Invariants
//!
//! * Energy: in every iteration the stored enthalpy changes by exactly `Δt` times
//!   the net inflow through the surface, the bottom and the pipe walls evaluated at
//!   the solved temperatures. This holds for the direct solver (exact solve) and for
//!   the ADI solver (its splitting term sums to zero because `A_x` holds only
//!   internal faces). The run reports `|heat in − Δstored| / throughput`.
//! * Nothing here knows YAML, units strings, files or plotting; all numbers are SI
//!   (m, s, °C, K, W, J).

#![allow(clippy::needless_range_loop)] // index loops over cells mirror the stencil formulas

use std::f64::consts::PI;

use crate::numerics::checks::positive as check_positive;

use crate::engine::grid::{Axis, Grading, Zone};
use crate::engine::linear::{AdiSolver, CellSolver, Coefficients, DirectSolver, PcgSolver, WallNode};
use crate::engine::material::{Material, Piece};

pub use crate::engine::linear::SolverKind;

/// A function of time `t_s` (s) returning °C or W/m.
pub type TimeFunction = Box<dyn Fn(f64) -> f64 + Send + Sync>;
/// A function of position `(x_m, z_m)` (planar) or `(r_m, z_m)` returning °C.
pub type FieldFunction = Box<dyn Fn(f64, f64) -> f64 + Send + Sync>;

/// Planar cross-section or axisymmetric r–z model.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Geometry {
    /// x across (`[−W/2, W/2]`), z down; quantities per metre of length.
    Planar,
    /// r from the axis (`[0, R]`), z down; whole 2π.
    Axisymmetric,
}

/// One soil layer; the last extends to the bottom of the model.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SoilLayer {
    /// Thickness, m (ignored for the last layer).
    pub thickness_m: f64,
    /// Thermal properties.
    pub material: Material,
}

/// An axis-aligned rectangle of another material (e.g. an insulation board).
/// In r–z, `x` means `r`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Inclusion {
    /// Left edge, m.
    pub x_min_m: f64,
    /// Right edge, m.
    pub x_max_m: f64,
    /// Top edge (depth), m.
    pub z_min_m: f64,
    /// Bottom edge (depth), m.
    pub z_max_m: f64,
    /// Thermal properties (a dry material for a board without water).
    pub material: Material,
}

/// What drives a pipe or borehole.
pub enum Drive {
    /// Fluid temperature `T_f(t)`, °C.
    FluidTemperature(TimeFunction),
    /// Heat rate to the ground `q'(t)`, W per metre, positive into the ground.
    HeatRate(TimeFunction),
}

/// A horizontal pipe in a planar section.
pub struct Pipe {
    /// Centre, m across.
    pub x_m: f64,
    /// Centre depth, m.
    pub z_m: f64,
    /// Outer radius, m.
    pub outer_radius_m: f64,
    /// Resistance between the fluid and the outer surface, m·K/W (0: the outer
    /// surface is at the fluid temperature).
    pub wall_resistance_m_k_per_w: f64,
    /// Fluid temperature or heat rate.
    pub drive: Drive,
}

/// A vertical borehole on the axis of an axisymmetric model.
pub struct Borehole {
    /// Borehole radius, m.
    pub radius_m: f64,
    /// Depth of the top of the borehole, m.
    pub top_m: f64,
    /// Depth of the bottom, m.
    pub bottom_m: f64,
    /// Borehole resistance between the fluid and the wall, m·K/W.
    pub wall_resistance_m_k_per_w: f64,
    /// Fluid temperature or heat rate per metre of borehole.
    pub drive: Drive,
}

/// The physical model of a cross-section (no numerics).
pub struct SectionModel {
    /// Planar or axisymmetric.
    pub geometry: Geometry,
    /// Planar: full width W (x from −W/2 to W/2), m. Axisymmetric: radius R, m.
    pub width_m: f64,
    /// Depth of the bottom boundary, m.
    pub depth_m: f64,
    /// Soil layers from the top down.
    pub layers: Vec<SoilLayer>,
    /// Rectangles of other materials.
    pub inclusions: Vec<Inclusion>,
    /// Pipes (planar only).
    pub pipes: Vec<Pipe>,
    /// The borehole (axisymmetric only).
    pub borehole: Option<Borehole>,
    /// Surface temperature `T_s(t)`, °C.
    pub surface_c: TimeFunction,
    /// Resistance between `T_s` and the ground surface, m²K/W (0: Dirichlet).
    pub surface_resistance_m2_k_per_w: f64,
    /// Upward heat flux entering at the bottom, W/m².
    pub bottom_flux_w_per_m2: f64,
}

impl SectionModel {
    /// A model of `layers` under the surface temperature `surface_c`, with no
    /// pipes, no inclusions, no surface resistance and no bottom flux.
    pub fn new(
        geometry: Geometry,
        width_m: f64,
        depth_m: f64,
        layers: Vec<SoilLayer>,
        surface_c: TimeFunction,
    ) -> Self {
        Self {
            geometry,
            width_m,
            depth_m,
            layers,
            inclusions: Vec::new(),
            pipes: Vec::new(),
            borehole: None,
            surface_c,
            surface_resistance_m2_k_per_w: 0.0,
            bottom_flux_w_per_m2: 0.0,
        }
    }
}

/// Resistance of concentric wall layers, m·K/W: `Σ ln(r_out/r_in)/(2πk)` (steady
/// radial conduction through a cylindrical shell, Carslaw & Jaeger 1959 §7.2).
/// `inner_radius_m` is the bore; `layers` are `(thickness_m, conductivity_w_mk)`
/// from the inside out.
pub fn wall_resistance_m_k_per_w(inner_radius_m: f64, layers: &[(f64, f64)]) -> Result<f64, String> {
    use crate::physics::buried_pipe::wall::{WallLayer, wall_resistance_m_k_per_w};
    let layers: Vec<WallLayer> = layers.iter().map(|&(t, k)| WallLayer::new(t, k)).collect();
    wall_resistance_m_k_per_w(inner_radius_m, &layers)
}

/// Mesh settings.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GridOptions {
    /// Largest cell at the ground surface, m.
    pub surface_cell_m: f64,
    /// Largest cell around pipes, across inclusions and at the borehole wall, m.
    pub min_cell_m: f64,
    /// Largest cell anywhere, m.
    pub max_cell_m: f64,
    /// Largest ratio of neighbouring cells (≤ 1.3).
    pub growth_ratio: f64,
    /// Cells across the diameter of a cut-out pipe.
    pub cells_across_pipe: usize,
}

impl Default for GridOptions {
    fn default() -> Self {
        Self {
            surface_cell_m: 0.05,
            min_cell_m: 0.05,
            max_cell_m: 1.0,
            growth_ratio: 1.15,
            cells_across_pipe: 10,
        }
    }
}

impl GridOptions {
    /// The same grid with every cell size halved (for convergence checks).
    pub fn refined(&self) -> Self {
        Self {
            surface_cell_m: 0.5 * self.surface_cell_m,
            min_cell_m: 0.5 * self.min_cell_m,
            max_cell_m: 0.5 * self.max_cell_m,
            growth_ratio: self.growth_ratio.sqrt(),
            cells_across_pipe: 2 * self.cells_across_pipe,
        }
    }

    fn validate(&self) -> Result<(), String> {
        for (name, v) in [
            ("surface_cell_m", self.surface_cell_m),
            ("min_cell_m", self.min_cell_m),
            ("max_cell_m", self.max_cell_m),
        ] {
            if !(v.is_finite() && v > 0.0) {
                return Err(format!("{name} is {v}; it must be a positive length in metres"));
            }
        }
        if !(self.growth_ratio > 1.0 && self.growth_ratio <= 1.3) {
            return Err(format!(
                "growth_ratio is {}; it must be above 1 and at most 1.3",
                self.growth_ratio
            ));
        }
        if self.cells_across_pipe < 4 {
            return Err("cells_across_pipe must be at least 4".into());
        }
        Ok(())
    }
}

/// Initial temperature field.
pub enum Initial {
    /// The same temperature everywhere, °C.
    Uniform(f64),
    /// `T0(x, z)` (planar) or `T0(r, z)` (axisymmetric), °C, sampled at cell centres.
    Field(FieldFunction),
}

/// Settings of [`solve_transient`].
pub struct TransientOptions {
    /// Mesh.
    pub grid: GridOptions,
    /// Time of the initial state, s (the time functions are evaluated at
    /// `start_s + n·time_step_s`).
    pub start_s: f64,
    /// Fixed time step, s.
    pub time_step_s: f64,
    /// Number of steps.
    pub steps: usize,
    /// Linear solver.
    pub solver: SolverKind,
    /// Initial temperatures.
    pub initial: Initial,
    /// Points `(x_m, z_m)` whose temperature is recorded every step (bilinear
    /// interpolation between cell centres).
    pub probes: Vec<(f64, f64)>,
    /// Times (s) of field snapshots (linear in time between steps).
    pub snapshot_times_s: Vec<f64>,
    /// Isotherm tracked as the frost depth, °C (0 by default).
    pub frost_isotherm_c: f64,
    /// Freezing iteration: stop when no temperature moves by more, K.
    pub iteration_tolerance_k: f64,
    /// Freezing iteration: at most this many linear solves per step.
    pub max_iterations: usize,
}

impl TransientOptions {
    /// Defaults: [`SolverKind::Auto`], start at 0 s, 0 °C isotherm, tolerance
    /// 1e-5 K, at most 50 iterations.
    pub fn new(time_step_s: f64, steps: usize, initial: Initial) -> Self {
        Self {
            grid: GridOptions::default(),
            start_s: 0.0,
            time_step_s,
            steps,
            solver: SolverKind::Auto,
            initial,
            probes: Vec::new(),
            snapshot_times_s: Vec::new(),
            frost_isotherm_c: 0.0,
            iteration_tolerance_k: 1e-5,
            max_iterations: 50,
        }
    }
}

/// Temperatures at cell centres at one instant.
#[derive(Debug, Clone, PartialEq)]
pub struct Snapshot {
    /// Time, s.
    pub time_s: f64,
    /// Cell-centre x (or r), m.
    pub x_m: Vec<f64>,
    /// Cell-centre depths, m.
    pub z_m: Vec<f64>,
    /// `t_c[iz * x_m.len() + ix]`, °C; cells inside a pipe hold its wall temperature.
    pub t_c: Vec<f64>,
    /// Heat-flux density `q = −k∇T` at the cell centres, W/m², across (towards
    /// +x or +r) and down (towards depth), same layout as `t_c`; NaN inside pipes.
    /// See [`Stepper::heat_flux_w_per_m2`] for how it is formed from the face flows.
    pub q_x_w_per_m2: Vec<f64>,
    pub q_z_w_per_m2: Vec<f64>,
}

/// Time series of one pipe or the borehole.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct PipeSeries {
    /// Heat rate to the ground, W per metre (positive into the ground).
    pub heat_rate_w_per_m: Vec<f64>,
    /// Outer-surface (wall) temperature, °C.
    pub wall_c: Vec<f64>,
    /// Fluid temperature, °C.
    pub fluid_c: Vec<f64>,
}

/// Result of [`solve_transient`].
#[derive(Debug, Clone, PartialEq)]
pub struct Solution {
    /// End time of every step, s.
    pub times_s: Vec<f64>,
    /// One series per pipe (planar) or one for the borehole (axisymmetric).
    pub pipes: Vec<PipeSeries>,
    /// `probes_c[probe][step]`, °C.
    pub probes_c: Vec<Vec<f64>>,
    /// Field snapshots at the requested times (those inside the run).
    pub snapshots: Vec<Snapshot>,
    /// Deepest crossing of the frost isotherm in the edge column (x = +W/2 or
    /// r = R), m, per step; 0 when the column is above the isotherm ("first ice"
    /// with the default 0 °C isotherm: interpolated between cell centres).
    pub frost_depth_m: Vec<f64>,
    /// The enthalpy method's own front in the edge column, m, per step: the frozen
    /// thickness `Σ f·Δz` over its cells (`f` the frozen fraction of the water,
    /// 0 in materials without water). Exact for a one-dimensional front from the
    /// surface (it locates the front inside its cell); where the column has thawed
    /// from above it is the thickness of the ice left, not the depth of its base.
    pub front_depth_m: Vec<f64>,
    /// |heat in − Δstored| / heat throughput over the run.
    pub energy_balance_relative_error: f64,
    /// Cells of the grid (including those inside pipes).
    pub cells: usize,
    /// Linear solves (solver applications) in the run.
    pub linear_solves: usize,
    /// Numeric factorisations (Cholesky, or preconditioner set-ups).
    pub factorisations: usize,
    /// Iterations of the iterative linear solver over the run (0 for the others).
    pub linear_iterations: usize,
    /// Freezing (Swaminathan–Voller) iterations over the run: solves of the cell
    /// system excluding the pipe-wall responses.
    pub nonlinear_iterations: usize,
}

/// Result of [`solve_steady`].
#[derive(Debug, Clone, PartialEq)]
pub struct SteadySolution {
    /// Heat rate of each pipe (or the borehole) to the ground, W/m.
    pub heat_rate_w_per_m: Vec<f64>,
    /// Wall temperature of each pipe, °C.
    pub wall_c: Vec<f64>,
    /// Fluid temperature of each pipe, °C.
    pub fluid_c: Vec<f64>,
    /// The temperature field.
    pub field: Snapshot,
    /// |heat in| / throughput (net inflow should be zero), ≈ round-off.
    pub energy_balance_relative_error: f64,
    /// Cells of the grid.
    pub cells: usize,
}

// ---------------------------------------------------------------------------
// Mesh: grid, materials, geometric factors, pipe couplings.
// ---------------------------------------------------------------------------

/// How a pipe (or the borehole) exchanges heat with its cells.
#[derive(Debug, Clone)]
struct Coupling {
    /// `(cell, factor)`: link conductance = factor·k(cell), W/(m K) or W/K.
    links: Vec<(usize, f64)>,
    /// Length the heat rate is reported per (1 m planar; borehole length in r–z).
    length_m: f64,
    /// Uniform-flux borehole: `(cell, share of q'·L)` sources instead of links.
    uniform_flux: Vec<(usize, f64)>,
    /// Radial half-cell resistance factors (resistance = factor/k, K/W) of the
    /// uniform-flux cells, for the wall temperature.
    wall_factor: Vec<f64>,
}

struct Mesh {
    geometry: Geometry,
    x: Axis,
    z: Axis,
    nx: usize,
    nz: usize,
    material: Vec<Material>,
    active: Vec<bool>,
    /// Pipe owning each inactive cell.
    owner: Vec<Option<usize>>,
    volume: Vec<f64>,
    /// Half-cell resistance factors (resistance = factor / k) of x faces:
    /// (left cell part, right cell part).
    x_half: Vec<(f64, f64)>,
    z_half: Vec<(f64, f64)>,
    /// Surface: (half-cell factor, R0/area) per top cell.
    surface: Vec<(f64, f64)>,
    /// Bottom cell areas.
    bottom_area: Vec<f64>,
    couplings: Vec<Coupling>,
}

/// Pipe diameter below which the well index is used instead of a cut-out: a fifth
/// of the cell, so that `r_eq ≈ 0.2·Δx ≥ 2·r_o`.
const WELL_DIAMETER_FRACTION: f64 = 0.2;

fn is_well(pipe: &Pipe, grid: &GridOptions) -> bool {
    2.0 * pipe.outer_radius_m <= WELL_DIAMETER_FRACTION * grid.min_cell_m
}

fn validate_model(model: &SectionModel) -> Result<(), String> {
    check_positive("the model width", model.width_m)?;
    check_positive("the model depth", model.depth_m)?;
    if model.layers.is_empty() {
        return Err("at least one soil layer is needed".into());
    }
    for (i, l) in model.layers[..model.layers.len() - 1].iter().enumerate() {
        check_positive(&format!("the thickness of layer {i}"), l.thickness_m)?;
    }
    if !(model.surface_resistance_m2_k_per_w.is_finite() && model.surface_resistance_m2_k_per_w >= 0.0) {
        return Err(format!(
            "the surface resistance is {} m²K/W; it must be zero or positive",
            model.surface_resistance_m2_k_per_w
        ));
    }
    if !model.bottom_flux_w_per_m2.is_finite() {
        return Err("the bottom heat flux must be a finite number of W/m²".into());
    }
    let (x_lo, x_hi) = x_range(model);
    for (i, inc) in model.inclusions.iter().enumerate() {
        let ok = inc.x_min_m < inc.x_max_m
            && inc.z_min_m < inc.z_max_m
            && inc.x_min_m >= x_lo
            && inc.x_max_m <= x_hi
            && inc.z_min_m >= 0.0
            && inc.z_max_m <= model.depth_m;
        if !ok {
            return Err(format!(
                "inclusion {i} is empty or outside the domain; it must lie within x ∈ [{x_lo}, {x_hi}] m, z ∈ [0, {}] m",
                model.depth_m
            ));
        }
    }
    match model.geometry {
        Geometry::Planar => {
            if model.borehole.is_some() {
                return Err("a borehole needs the axisymmetric geometry".into());
            }
            for (i, p) in model.pipes.iter().enumerate() {
                check_positive(&format!("the outer radius of pipe {i}"), p.outer_radius_m)?;
                if !(p.wall_resistance_m_k_per_w.is_finite() && p.wall_resistance_m_k_per_w >= 0.0) {
                    return Err(format!("pipe {i}: the wall resistance must be zero or positive"));
                }
                let r = p.outer_radius_m;
                if !(p.x_m - r > x_lo && p.x_m + r < x_hi && p.z_m - r > 0.0 && p.z_m + r < model.depth_m) {
                    return Err(format!(
                        "pipe {i} at x = {} m, depth {} m with radius {r} m is not inside the ground",
                        p.x_m, p.z_m
                    ));
                }
                for (j, q) in model.pipes[..i].iter().enumerate() {
                    if (p.x_m - q.x_m).hypot(p.z_m - q.z_m) <= p.outer_radius_m + q.outer_radius_m {
                        return Err(format!("pipes {j} and {i} overlap; move them apart"));
                    }
                }
            }
        }
        Geometry::Axisymmetric => {
            if !model.pipes.is_empty() {
                return Err("the axisymmetric geometry takes one borehole on the axis, not pipes".into());
            }
            if let Some(b) = &model.borehole {
                check_positive("the borehole radius", b.radius_m)?;
                if !(b.wall_resistance_m_k_per_w.is_finite() && b.wall_resistance_m_k_per_w >= 0.0) {
                    return Err("the borehole resistance must be zero or positive".into());
                }
                if !(b.top_m >= 0.0
                    && b.bottom_m > b.top_m
                    && b.bottom_m < model.depth_m
                    && b.radius_m < model.width_m)
                {
                    return Err(format!(
                        "the borehole from {} m to {} m depth must lie above the model bottom ({} m) and be narrower than the model",
                        b.top_m, b.bottom_m, model.depth_m
                    ));
                }
            }
        }
    }
    Ok(())
}

fn x_range(model: &SectionModel) -> (f64, f64) {
    match model.geometry {
        Geometry::Planar => (-0.5 * model.width_m, 0.5 * model.width_m),
        Geometry::Axisymmetric => (0.0, model.width_m),
    }
}

/// Local cell size around a cut-out pipe.
fn pipe_cell_m(pipe: &Pipe, grid: &GridOptions) -> f64 {
    if is_well(pipe, grid) {
        grid.min_cell_m
    } else {
        grid.min_cell_m
            .min(2.0 * pipe.outer_radius_m / grid.cells_across_pipe as f64)
    }
}

fn build_axes(model: &SectionModel, grid: &GridOptions) -> Result<(Axis, Axis), String> {
    let grading = Grading {
        max_cell_m: grid.max_cell_m,
        growth_ratio: grid.growth_ratio,
    };
    let (x_lo, x_hi) = x_range(model);
    let mut x_lines = Vec::new();
    let mut z_lines = Vec::new();
    let mut x_zones = Vec::new();
    let mut z_zones = vec![Zone {
        lo_m: 0.0,
        hi_m: 0.0,
        size_m: grid.surface_cell_m,
    }];
    let mut depth = 0.0;
    for l in &model.layers[..model.layers.len() - 1] {
        depth += l.thickness_m;
        z_lines.push(depth);
    }
    for inc in &model.inclusions {
        x_lines.extend([inc.x_min_m, inc.x_max_m]);
        z_lines.extend([inc.z_min_m, inc.z_max_m]);
        x_zones.push(Zone {
            lo_m: inc.x_min_m,
            hi_m: inc.x_max_m,
            size_m: grid.min_cell_m,
        });
        z_zones.push(Zone {
            lo_m: inc.z_min_m,
            hi_m: inc.z_max_m,
            size_m: grid.min_cell_m,
        });
    }
    for p in &model.pipes {
        let h = pipe_cell_m(p, grid);
        if is_well(p, grid) {
            // The pipe at the centre of a uniform 3 × 3 block of cells.
            x_lines.extend([p.x_m - 1.5 * h, p.x_m - 0.5 * h, p.x_m + 0.5 * h, p.x_m + 1.5 * h]);
            z_lines.extend([p.z_m - 1.5 * h, p.z_m - 0.5 * h, p.z_m + 0.5 * h, p.z_m + 1.5 * h]);
            x_zones.push(Zone {
                lo_m: p.x_m - 1.5 * h,
                hi_m: p.x_m + 1.5 * h,
                size_m: h,
            });
            z_zones.push(Zone {
                lo_m: p.z_m - 1.5 * h,
                hi_m: p.z_m + 1.5 * h,
                size_m: h,
            });
        } else {
            let reach = p.outer_radius_m + 2.0 * h;
            x_zones.push(Zone {
                lo_m: p.x_m - reach,
                hi_m: p.x_m + reach,
                size_m: h,
            });
            z_zones.push(Zone {
                lo_m: p.z_m - reach,
                hi_m: p.z_m + reach,
                size_m: h,
            });
        }
    }
    if let Some(b) = &model.borehole {
        x_lines.push(b.radius_m);
        z_lines.extend([b.top_m, b.bottom_m]);
        let h = grid.min_cell_m.min(0.5 * b.radius_m);
        x_zones.push(Zone {
            lo_m: 0.0,
            hi_m: b.radius_m,
            size_m: h,
        });
    }
    if x_zones.is_empty() {
        x_zones.push(Zone {
            lo_m: x_hi,
            hi_m: x_hi,
            size_m: grid.max_cell_m,
        });
    }
    let x = Axis::graded(x_lo, x_hi, &x_lines, &x_zones, grading)?;
    let z = Axis::graded(0.0, model.depth_m, &z_lines, &z_zones, grading)?;
    if x.cells() * z.cells() > 4_000_000 {
        return Err(format!(
            "the grid would have {} cells; use larger cells (at most 4 million)",
            x.cells() * z.cells()
        ));
    }
    Ok((x, z))
}

impl Mesh {
    fn build(model: &SectionModel, grid: &GridOptions) -> Result<Self, String> {
        validate_model(model)?;
        grid.validate()?;
        let (x, z) = build_axes(model, grid)?;
        let (nx, nz) = (x.cells(), z.cells());
        let n = nx * nz;
        let geometry = model.geometry;

        // Materials: layer by cell-centre depth, then inclusions.
        let mut tops = Vec::new();
        let mut depth = 0.0;
        for l in &model.layers[..model.layers.len() - 1] {
            depth += l.thickness_m;
            tops.push(depth);
        }
        let mut material = Vec::with_capacity(n);
        for &zc in z.centres_m() {
            let layer = &model.layers[tops.partition_point(|&t| t <= zc)];
            for &xc in x.centres_m() {
                let inside = model
                    .inclusions
                    .iter()
                    .rev()
                    .find(|i| xc > i.x_min_m && xc < i.x_max_m && zc > i.z_min_m && zc < i.z_max_m);
                material.push(inside.map_or(layer.material, |i| i.material));
            }
        }

        // Geometric factors.
        let (xf, xc, xw) = (
            x.faces_m().to_vec(),
            x.centres_m().to_vec(),
            x.widths_m().to_vec(),
        );
        let zw = z.widths_m().to_vec();
        let mut volume = vec![0.0; n];
        let area_top = |ix: usize| match geometry {
            Geometry::Planar => xw[ix],
            Geometry::Axisymmetric => PI * (xf[ix + 1].powi(2) - xf[ix].powi(2)),
        };
        for iz in 0..nz {
            for ix in 0..nx {
                volume[iz * nx + ix] = area_top(ix) * zw[iz];
            }
        }
        let mut x_half = Vec::with_capacity(nz * (nx - 1));
        for &dz in &zw {
            for ix in 0..nx - 1 {
                let face = xf[ix + 1];
                x_half.push(match geometry {
                    Geometry::Planar => (0.5 * xw[ix] / dz, 0.5 * xw[ix + 1] / dz),
                    Geometry::Axisymmetric => (
                        (face / xc[ix]).ln() / (2.0 * PI * dz),
                        (xc[ix + 1] / face).ln() / (2.0 * PI * dz),
                    ),
                });
            }
        }
        let mut z_half = Vec::with_capacity((nz - 1) * nx);
        for iz in 0..nz - 1 {
            for ix in 0..nx {
                let a = area_top(ix);
                z_half.push((0.5 * zw[iz] / a, 0.5 * zw[iz + 1] / a));
            }
        }
        let surface = (0..nx)
            .map(|ix| {
                (
                    0.5 * zw[0] / area_top(ix),
                    model.surface_resistance_m2_k_per_w / area_top(ix),
                )
            })
            .collect();
        let bottom_area = (0..nx).map(area_top).collect();

        let mut mesh = Self {
            geometry,
            x,
            z,
            nx,
            nz,
            material,
            active: vec![true; n],
            owner: vec![None; n],
            volume,
            x_half,
            z_half,
            surface,
            bottom_area,
            couplings: Vec::new(),
        };
        match geometry {
            Geometry::Planar => {
                for (p, pipe) in model.pipes.iter().enumerate() {
                    let coupling = if is_well(pipe, grid) {
                        mesh.well_coupling(pipe)?
                    } else {
                        mesh.cut_out(p, pipe)
                    };
                    mesh.couplings.push(coupling);
                }
            }
            Geometry::Axisymmetric => {
                if let Some(b) = &model.borehole {
                    let coupling = mesh.borehole_coupling(b);
                    mesh.couplings.push(coupling);
                }
            }
        }
        // Faces touching an inactive cell carry no heat.
        for iz in 0..nz {
            for ix in 0..nx - 1 {
                let c = iz * nx + ix;
                if !mesh.active[c] || !mesh.active[c + 1] {
                    mesh.x_half[iz * (nx - 1) + ix] = (f64::INFINITY, f64::INFINITY);
                }
            }
        }
        for c in 0..(nz - 1) * nx {
            if !mesh.active[c] || !mesh.active[c + nx] {
                mesh.z_half[c] = (f64::INFINITY, f64::INFINITY);
            }
        }
        Ok(mesh)
    }

    /// Peaceman well index for a pipe at the centre of its cell.
    fn well_coupling(&self, pipe: &Pipe) -> Result<Coupling, String> {
        let (ix, iz) = (self.x.cell_of(pipe.x_m), self.z.cell_of(pipe.z_m));
        let (dx, dz) = (self.x.widths_m()[ix], self.z.widths_m()[iz]);
        let r_eq = 0.14 * dx.hypot(dz);
        if r_eq <= pipe.outer_radius_m {
            return Err(format!(
                "a pipe of radius {} m is too large for the well index in {dx:.4} m × {dz:.4} m cells",
                pipe.outer_radius_m
            ));
        }
        Ok(Coupling {
            links: vec![(iz * self.nx + ix, 2.0 * PI / (r_eq / pipe.outer_radius_m).ln())],
            length_m: 1.0,
            uniform_flux: Vec::new(),
            wall_factor: Vec::new(),
        })
    }

    /// Removes the cells whose centres lie inside the pipe and joins each
    /// neighbouring cell to the true circle along the grid line.
    fn cut_out(&mut self, p: usize, pipe: &Pipe) -> Coupling {
        let (nx, nz) = (self.nx, self.nz);
        let (xc, zc) = (self.x.centres_m().to_vec(), self.z.centres_m().to_vec());
        let r = pipe.outer_radius_m;
        let inside = |ix: usize, iz: usize| (xc[ix] - pipe.x_m).hypot(zc[iz] - pipe.z_m) < r;
        for iz in 0..nz {
            for ix in 0..nx {
                if inside(ix, iz) {
                    self.active[iz * nx + ix] = false;
                    self.owner[iz * nx + ix] = Some(p);
                }
            }
        }
        let (xw, zw) = (self.x.widths_m(), self.z.widths_m());
        let mut links = Vec::new();
        for iz in 0..nz {
            for ix in 0..nx {
                if inside(ix, iz) {
                    continue;
                }
                let c = iz * nx + ix;
                let mut factor = 0.0;
                // Neighbours along x: the circle crossing on this row.
                for (nix, dir) in [(ix.wrapping_sub(1), -1.0), (ix + 1, 1.0)] {
                    if nix < nx && inside(nix, iz) {
                        let half_chord = (r * r - (zc[iz] - pipe.z_m).powi(2)).max(0.0).sqrt();
                        let crossing = pipe.x_m - dir * half_chord;
                        let spacing = (xc[nix] - xc[ix]).abs();
                        let d = (crossing - xc[ix]).abs().max(0.01 * spacing);
                        factor += zw[iz] / d;
                    }
                }
                for (niz, dir) in [(iz.wrapping_sub(1), -1.0), (iz + 1, 1.0)] {
                    if niz < nz && inside(ix, niz) {
                        let half_chord = (r * r - (xc[ix] - pipe.x_m).powi(2)).max(0.0).sqrt();
                        let crossing = pipe.z_m - dir * half_chord;
                        let spacing = (zc[niz] - zc[iz]).abs();
                        let d = (crossing - zc[iz]).abs().max(0.01 * spacing);
                        factor += xw[ix] / d;
                    }
                }
                if factor > 0.0 {
                    links.push((c, factor));
                }
            }
        }
        Coupling {
            links,
            length_m: 1.0,
            uniform_flux: Vec::new(),
            wall_factor: Vec::new(),
        }
    }

    /// Borehole wall on the face `r = r_b` between its top and bottom.
    fn borehole_coupling(&mut self, b: &Borehole) -> Coupling {
        let (nx, nz) = (self.nx, self.nz);
        let (xc, zc, zw) = (
            self.x.centres_m().to_vec(),
            self.z.centres_m().to_vec(),
            self.z.widths_m(),
        );
        let wall_ix = self.x.cell_of(b.radius_m * (1.0 + 1e-9));
        let mut links = Vec::new();
        let mut uniform_flux = Vec::new();
        let mut wall_factor = Vec::new();
        let length = b.bottom_m - b.top_m;
        for iz in 0..nz {
            if zc[iz] <= b.top_m || zc[iz] >= b.bottom_m {
                continue;
            }
            for ix in 0..wall_ix {
                self.active[iz * nx + ix] = false;
                self.owner[iz * nx + ix] = Some(0);
            }
            let c = iz * nx + wall_ix;
            let half = (xc[wall_ix] / b.radius_m).ln() / (2.0 * PI * zw[iz]);
            match b.drive {
                Drive::FluidTemperature(_) => links.push((c, 1.0 / half)),
                Drive::HeatRate(_) => {
                    uniform_flux.push((c, zw[iz] / length));
                    wall_factor.push(half);
                }
            }
        }
        Coupling {
            links,
            length_m: length,
            uniform_flux,
            wall_factor,
        }
    }

    fn cells(&self) -> usize {
        self.nx * self.nz
    }
}

// ---------------------------------------------------------------------------
// The stepper: state, coefficients, pipe walls, one implicit step.
// ---------------------------------------------------------------------------

/// How a wall temperature is determined in a step.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Wall {
    /// Known (fluid temperature with no wall resistance).
    Fixed(f64),
    /// Unknown node behind a wall resistance: `(T_f, R_wall·length)` per coupling.
    Fluid(f64, f64),
    /// Unknown node with a given heat rate (W total).
    Rate(f64),
    /// Uniform flux (W total) into the wall cells, no node.
    Uniform(f64),
}

struct Drives<'a> {
    drives: Vec<(&'a Drive, f64)>,
}

impl<'a> Drives<'a> {
    fn of(model: &'a SectionModel) -> Self {
        let mut drives: Vec<(&Drive, f64)> = model
            .pipes
            .iter()
            .map(|p| (&p.drive, p.wall_resistance_m_k_per_w))
            .collect();
        if let Some(b) = &model.borehole {
            drives.push((&b.drive, b.wall_resistance_m_k_per_w));
        }
        Self { drives }
    }

    fn walls(&self, couplings: &[Coupling], t_s: f64) -> Result<Vec<Wall>, String> {
        self.drives
            .iter()
            .zip(couplings)
            .enumerate()
            .map(|(p, (&(drive, r_wall), coupling))| {
                let (value, wall) = match drive {
                    Drive::FluidTemperature(f) => {
                        let t_f = f(t_s);
                        let wall = if r_wall > 0.0 {
                            Wall::Fluid(t_f, r_wall / coupling.length_m)
                        } else {
                            Wall::Fixed(t_f)
                        };
                        (t_f, wall)
                    }
                    Drive::HeatRate(f) => {
                        let q = f(t_s);
                        let total = q * coupling.length_m;
                        let wall = if coupling.uniform_flux.is_empty() {
                            Wall::Rate(total)
                        } else {
                            Wall::Uniform(total)
                        };
                        (q, wall)
                    }
                };
                if value.is_finite() {
                    Ok(wall)
                } else {
                    Err(format!(
                        "the drive of pipe {p} at t = {t_s} s is {value}; it must be finite"
                    ))
                }
            })
            .collect()
    }
}

struct Stepper<'m> {
    mesh: &'m Mesh,
    solver: Box<dyn CellSolver>,
    coefficients: Coefficients,
    /// Conductivity and capacity the coefficients were built with.
    k_used: Vec<f64>,
    c_used: Vec<f64>,
    /// Active cells whose material is not linear (k or C depend on T).
    nonlinear: Vec<usize>,
    /// Cells whose k or C may have changed since the coefficients were built.
    dirty: Vec<usize>,
    /// Check every non-linear cell (temperatures set outside `apply_update`).
    check_all: bool,
    /// Whether each cell is in `nonlinear`.
    is_nonlinear: Vec<bool>,
    /// Transient runs take each cell's conductivity at the start of the step
    /// (the latent heat stays implicit); steady solves iterate it (Picard).
    lag_conductivity: bool,
    /// Cells whose conductivity moved since it was last taken (lagged mode), and
    /// whether each cell is listed there.
    k_dirty: Vec<usize>,
    in_k_dirty: Vec<bool>,
    /// Whether the solver takes the node pipes' walls eliminated into the system.
    eliminate_walls: bool,
    /// Sum of the pipe-link factors of each cell (link conductance = factor·k).
    link_factor: Vec<f64>,
    /// `V/Δt` of active cells (0 elsewhere) at `inverse_dt`.
    storage: Vec<f64>,
    /// `1/Δt` the coefficients were built with (0 for steady).
    inverse_dt: f64,
    prepared: bool,
    h: Vec<f64>,
    t: Vec<f64>,
    h_old: Vec<f64>,
    /// Response of the cells to a unit wall temperature of each node pipe.
    response: Vec<Vec<f64>>,
    /// Whether `response` belongs to the current solver state.
    responses_current: bool,
    /// Set at the start of each step (responses may be refreshed once per step).
    first_iteration: bool,
    /// Temperatures at the start of the step and the change over the last step
    /// (the first guess of an iterative solver), K.
    t_start: Vec<f64>,
    guess: Vec<f64>,
    guess_pending: bool,
    /// Cells whose first iterate of the step was moved ahead ([`Self::predict_pieces`]).
    ahead: Vec<usize>,
    moved_ahead: Vec<bool>,
    /// Wall temperature of each pipe in the last iteration, °C.
    walls_lag: Vec<f64>,
    r: Vec<f64>,
    delta: Vec<f64>,
    work: Vec<f64>,
    solves: usize,
    /// Freezing iterations (cell-system solves without the wall responses).
    iterations: usize,
    bottom_flux_w_per_m2: f64,
}

/// Heat flows of a solved iteration, W (or W/m).
#[derive(Debug, Clone, Default)]
struct Flows {
    surface: f64,
    bottom: f64,
    pipes: Vec<f64>,
    walls_c: Vec<f64>,
}

impl<'m> Stepper<'m> {
    fn new(mesh: &'m Mesh, solver: Box<dyn CellSolver>, t: Vec<f64>, bottom_flux_w_per_m2: f64) -> Self {
        let n = mesh.cells();
        let eliminate_walls = solver.eliminates_walls();
        let mut link_factor = vec![0.0; n];
        for coupling in &mesh.couplings {
            for &(c, factor) in &coupling.links {
                link_factor[c] += factor;
            }
        }
        let h = t
            .iter()
            .zip(&mesh.material)
            .map(|(&t, m)| m.enthalpy_j_per_m3(t))
            .collect();
        Self {
            mesh,
            solver,
            coefficients: Coefficients {
                active: mesh.active.clone(),
                ..Coefficients::new(mesh.nx, mesh.nz)
            },
            k_used: vec![f64::NAN; n],
            c_used: vec![f64::NAN; n],
            nonlinear: (0..n)
                .filter(|&c| mesh.active[c] && !mesh.material[c].is_linear())
                .collect(),
            dirty: Vec::new(),
            check_all: true,
            is_nonlinear: (0..n)
                .map(|c| mesh.active[c] && !mesh.material[c].is_linear())
                .collect(),
            link_factor,
            lag_conductivity: false,
            k_dirty: Vec::new(),
            in_k_dirty: vec![false; n],
            eliminate_walls,
            storage: vec![0.0; n],
            inverse_dt: f64::NAN,
            prepared: false,
            h,
            t,
            h_old: vec![0.0; n],
            response: Vec::new(),
            responses_current: false,
            first_iteration: true,
            t_start: Vec::new(),
            guess: Vec::new(),
            guess_pending: false,
            ahead: Vec::new(),
            moved_ahead: vec![false; n],
            walls_lag: Vec::new(),
            r: vec![0.0; n],
            delta: vec![0.0; n],
            work: vec![0.0; n],
            solves: 0,
            iterations: 0,
            bottom_flux_w_per_m2,
        }
    }

    fn stored_j(&self) -> f64 {
        self.mesh
            .volume
            .iter()
            .zip(&self.h)
            .zip(&self.mesh.active)
            .filter(|(_, a)| **a)
            .map(|((v, h), _)| v * h)
            .sum()
    }

    fn surface_conductance(&self, ix: usize) -> f64 {
        let (half, r0) = self.mesh.surface[ix];
        1.0 / (half / self.k_used[ix] + r0)
    }

    /// Rebuilds the coefficients where k or C changed; returns whether anything did.
    /// After the first build only the cells of non-linear materials are checked,
    /// and only the entries of cells that changed (and their faces) are rebuilt.
    fn update_coefficients(&mut self, inverse_dt: f64) -> bool {
        let mesh = self.mesh;
        if inverse_dt != self.inverse_dt {
            self.inverse_dt = inverse_dt;
            for c in 0..mesh.cells() {
                self.storage[c] = if mesh.active[c] {
                    mesh.volume[c] * inverse_dt
                } else {
                    0.0
                };
            }
            for c in 0..mesh.cells() {
                if mesh.active[c] {
                    let m = &mesh.material[c];
                    self.k_used[c] = m.conductivity(self.t[c]);
                    self.c_used[c] = m.capacity(self.t[c]);
                }
            }
            self.rebuild_all_coefficients();
            return true;
        }
        let mut changed = false;
        // Conductivities are re-taken every iteration (steady, Picard) or only in
        // the first iteration of a step (transient, lagged).
        let update_k = !self.lag_conductivity || self.first_iteration;
        let candidates = if self.check_all {
            std::mem::take(&mut self.nonlinear)
        } else {
            std::mem::take(&mut self.dirty)
        };
        let k_cells = if update_k && self.lag_conductivity {
            std::mem::take(&mut self.k_dirty)
        } else {
            Vec::new()
        };
        for &c in candidates.iter().chain(&k_cells) {
            let m = &mesh.material[c];
            let cap = m.capacity(self.t[c]);
            if cap != self.c_used[c] {
                self.c_used[c] = cap;
                self.coefficients.m[c] = mesh.volume[c] * cap * inverse_dt;
                changed = true;
            }
            if update_k {
                // Lagged k is the start-of-step value, also for a cell whose
                // iterate was moved ahead by `predict_pieces`.
                let t_k = if self.lag_conductivity {
                    self.t_start.get(c).copied().unwrap_or(self.t[c])
                } else {
                    self.t[c]
                };
                let k = m.conductivity(t_k);
                if k != self.k_used[c] {
                    self.k_used[c] = k;
                    self.rebuild_cell_conductances(c);
                    changed = true;
                }
            }
        }
        for &c in &k_cells {
            self.in_k_dirty[c] = false;
        }
        if self.check_all {
            self.nonlinear = candidates;
            self.check_all = false;
        } else {
            self.dirty = candidates;
        }
        self.dirty.clear();
        changed
    }

    /// Every coefficient from `k_used`, `c_used` and `inverse_dt`.
    fn rebuild_all_coefficients(&mut self) {
        let mesh = self.mesh;
        let (nx, nz) = (mesh.nx, mesh.nz);
        for c in 0..nx * nz {
            self.coefficients.m[c] = if mesh.active[c] {
                mesh.volume[c] * self.c_used[c] * self.inverse_dt
            } else {
                1.0
            };
            self.coefficients.d[c] = self.boundary_conductance(c);
        }
        for iz in 0..nz {
            for ix in 0..nx - 1 {
                self.coefficients.gx[iz * (nx - 1) + ix] = self.x_face_conductance(iz * (nx - 1) + ix);
            }
        }
        for f in 0..(nz - 1) * nx {
            self.coefficients.gz[f] = self.z_face_conductance(f);
        }
    }

    /// The boundary conductance and the four faces of cell `c` after its `k` changed.
    fn rebuild_cell_conductances(&mut self, c: usize) {
        let (nx, nz) = (self.mesh.nx, self.mesh.nz);
        let (ix, iz) = (c % nx, c / nx);
        self.coefficients.d[c] = self.boundary_conductance(c);
        if ix > 0 {
            let f = iz * (nx - 1) + ix - 1;
            self.coefficients.gx[f] = self.x_face_conductance(f);
        }
        if ix + 1 < nx {
            let f = iz * (nx - 1) + ix;
            self.coefficients.gx[f] = self.x_face_conductance(f);
        }
        if iz > 0 {
            self.coefficients.gz[c - nx] = self.z_face_conductance(c - nx);
        }
        if iz + 1 < nz {
            self.coefficients.gz[c] = self.z_face_conductance(c);
        }
    }

    /// Series conductance of x face `f` (0 where a side is outside the domain).
    fn x_face_conductance(&self, f: usize) -> f64 {
        let nx = self.mesh.nx;
        let (a, b) = self.mesh.x_half[f];
        let c = (f / (nx - 1)) * nx + f % (nx - 1);
        if a.is_finite() {
            1.0 / (a / self.k_used[c] + b / self.k_used[c + 1])
        } else {
            0.0
        }
    }

    /// Series conductance of z face `f` (0 where a side is outside the domain).
    fn z_face_conductance(&self, f: usize) -> f64 {
        let (a, b) = self.mesh.z_half[f];
        if a.is_finite() {
            1.0 / (a / self.k_used[f] + b / self.k_used[f + self.mesh.nx])
        } else {
            0.0
        }
    }

    /// Surface and pipe-link conductance on the diagonal of cell `c`.
    fn boundary_conductance(&self, c: usize) -> f64 {
        if !self.mesh.active[c] {
            return 0.0;
        }
        let k = self.k_used[c];
        let surface = if c < self.mesh.nx {
            1.0 / (self.mesh.surface[c].0 / k + self.mesh.surface[c].1)
        } else {
            0.0
        };
        surface + self.link_factor[c] * k
    }

    /// Link conductances of coupling `p` at the current coefficients.
    fn link_g(&self, p: usize) -> impl Iterator<Item = (usize, f64)> + '_ {
        self.mesh.couplings[p]
            .links
            .iter()
            .map(|&(c, f)| (c, f * self.k_used[c]))
    }

    /// Refreshes the wall responses `u_p = S(g_p)` (solver applied to the link
    /// conductances of each node pipe) with the current solver and coefficients.
    fn refresh_responses(&mut self, walls: &[Wall]) {
        self.response.resize_with(walls.len(), Vec::new);
        for (p, wall) in walls.iter().enumerate() {
            let mut u = std::mem::take(&mut self.response[p]);
            u.resize(self.mesh.cells(), 0.0);
            if matches!(wall, Wall::Fluid(..) | Wall::Rate(_)) {
                self.work.iter_mut().for_each(|w| *w = 0.0);
                for &(c, f) in &self.mesh.couplings[p].links {
                    self.work[c] += f * self.k_used[c];
                }
                // The previous response is the starting guess of an iterative solver.
                self.solver.apply_from(&self.coefficients, &self.work, &mut u);
                self.solves += 1;
            }
            self.response[p] = u;
        }
        self.responses_current = true;
    }

    /// One linear solve at the current iterate: returns the solved temperatures
    /// in `self.delta` (as T*) and the flows at them.
    fn solve_iteration(&mut self, walls: &[Wall], surface_c: f64, inverse_dt: f64) -> Result<Flows, String> {
        let mesh = self.mesh;
        let nx = mesh.nx;
        if self.update_coefficients(inverse_dt) || !self.prepared {
            if self.eliminate_walls {
                self.coefficients.nodes = self.wall_nodes(walls);
            }
            self.solver.prepare(&self.coefficients)?;
            self.prepared = true;
            self.responses_current = self.eliminate_walls;
        }
        // Responses of an older operator would only slow the convergence (the wall
        // temperatures are lagged below), but where the soil at a pipe freezes the
        // iteration then oscillates; they are refreshed with the coefficients (an
        // iterative solver starts from the previous response, so this is cheap).
        if !self.responses_current {
            self.refresh_responses(walls);
        }
        self.first_iteration = false;
        if self.walls_lag.len() != walls.len() {
            self.walls_lag = (0..walls.len())
                .map(|p| {
                    let links = &mesh.couplings[p].links;
                    links.iter().map(|&(c, _)| self.t[c]).sum::<f64>() / links.len().max(1) as f64
                })
                .collect();
        }
        // Residual r = V/Δt·(Hⁿ − Hᵐ) + sources − A·Tᵐ (A = K − M: conduction and
        // boundary terms), without the unknown wall temperatures.
        self.coefficients.multiply_conduction(&self.t, &mut self.work);
        // Cells outside the domain: storage 0, no faces, so r = 0.
        for ((((r, s), h_old), h), w) in self
            .r
            .iter_mut()
            .zip(&self.storage)
            .zip(&self.h_old)
            .zip(&self.h)
            .zip(&self.work)
        {
            *r = s * (h_old - h) - w;
        }
        for ix in 0..nx {
            if mesh.active[ix] {
                self.r[ix] += self.surface_conductance(ix) * surface_c;
            }
            let bottom = (mesh.nz - 1) * nx + ix;
            if mesh.active[bottom] {
                self.r[bottom] += mesh.bottom_area[ix] * self.bottom_flux_w_per_m2;
            }
        }
        for (p, wall) in walls.iter().enumerate() {
            match *wall {
                Wall::Fixed(t_w) => {
                    for (c, g) in self.link_g(p).collect::<Vec<_>>() {
                        self.r[c] += g * t_w;
                    }
                }
                Wall::Uniform(total) => {
                    for &(c, share) in &mesh.couplings[p].uniform_flux {
                        self.r[c] += share * total;
                    }
                }
                Wall::Fluid(..) | Wall::Rate(_) if self.eliminate_walls => {
                    // The wall node is eliminated: its source term `g·b/a`.
                    let (inv_a, b) = self.node_terms(p, wall);
                    for (c, g) in self.link_g(p).collect::<Vec<_>>() {
                        self.r[c] += g * b * inv_a;
                    }
                }
                Wall::Fluid(..) | Wall::Rate(_) => {
                    // Lagged wall temperature; corrected through the response below.
                    let t_lag = self.walls_lag[p];
                    for &(c, f) in &mesh.couplings[p].links {
                        self.r[c] += f * self.k_used[c] * t_lag;
                    }
                }
            }
        }
        if self.solver.uses_guess() {
            // Guess: the last step's change in its first iteration, none after.
            if self.guess.len() == self.delta.len() && self.guess_pending {
                self.delta.copy_from_slice(&self.guess);
            } else {
                self.delta.iter_mut().for_each(|d| *d = 0.0);
            }
            self.guess_pending = false;
        }
        self.solver
            .apply_from(&self.coefficients, &self.r, &mut self.delta);
        self.solves += 1;
        self.iterations += 1;
        for (d, t) in self.delta.iter_mut().zip(&self.t) {
            *d += t;
        }
        if self.eliminate_walls {
            let walls_c = self.eliminated_walls(walls);
            return Ok(self.flows(walls, &walls_c, surface_c));
        }
        // Wall temperatures of node pipes: a small dense system on the link cells,
        // with the lagged walls' contribution `Σ T_lag·u` taken out there.
        let nodes: Vec<usize> = (0..walls.len())
            .filter(|&p| matches!(walls[p], Wall::Fluid(..) | Wall::Rate(_)))
            .collect();
        let mut saved = Vec::new();
        for &p in &nodes {
            for &(c, _) in &mesh.couplings[p].links {
                saved.push((c, self.delta[c]));
            }
        }
        for &(c, _) in &saved {
            self.delta[c] = saved.iter().find(|s| s.0 == c).map_or(0.0, |s| s.1)
                - nodes
                    .iter()
                    .map(|&q| self.walls_lag[q] * self.response[q][c])
                    .sum::<f64>();
        }
        let walls_c = self.solve_walls(walls);
        for &(c, value) in &saved {
            self.delta[c] = value;
        }
        for &p in &nodes {
            let correction = walls_c[p] - self.walls_lag[p];
            self.walls_lag[p] = walls_c[p];
            if correction != 0.0 {
                for (d, u) in self.delta.iter_mut().zip(&self.response[p]) {
                    *d += correction * u;
                }
            }
        }
        Ok(self.flows(walls, &walls_c, surface_c))
    }

    /// `(1/a, b)` of an eliminated wall node ([`WallNode`]): behind a wall
    /// resistance `a = Σg + 1/R`, `b = T_f/R`; with a given heat rate `a = Σg`, `b = q`.
    fn node_terms(&self, p: usize, wall: &Wall) -> (f64, f64) {
        let g: f64 = self.link_g(p).map(|(_, g)| g).sum();
        match *wall {
            Wall::Fluid(t_f, r) => (1.0 / (g + 1.0 / r), t_f / r),
            Wall::Rate(total) => (1.0 / g, total),
            _ => (0.0, 0.0),
        }
    }

    /// The node pipes' walls as eliminated nodes at the current conductivities.
    fn wall_nodes(&self, walls: &[Wall]) -> Vec<WallNode> {
        walls
            .iter()
            .enumerate()
            .filter(|(_, w)| matches!(w, Wall::Fluid(..) | Wall::Rate(_)))
            .map(|(p, w)| WallNode {
                links: self.link_g(p).collect(),
                inv_a: self.node_terms(p, w).0,
            })
            .collect()
    }

    /// Wall temperatures from the solved cells when the walls were eliminated:
    /// `T_w = (Σ g·T* + b)/a`.
    fn eliminated_walls(&self, walls: &[Wall]) -> Vec<f64> {
        walls
            .iter()
            .enumerate()
            .map(|(p, w)| match *w {
                Wall::Fixed(t) => t,
                Wall::Fluid(..) | Wall::Rate(_) => {
                    let (inv_a, b) = self.node_terms(p, w);
                    let sum: f64 = self.link_g(p).map(|(c, g)| g * self.delta[c]).sum();
                    (sum + b) * inv_a
                }
                Wall::Uniform(_) => f64::NAN,
            })
            .collect()
    }

    /// Solves the wall balances of the node pipes given `self.delta = T*` without
    /// their contribution and the responses.
    fn solve_walls(&self, walls: &[Wall]) -> Vec<f64> {
        let nodes: Vec<usize> = (0..walls.len())
            .filter(|&p| matches!(walls[p], Wall::Fluid(..) | Wall::Rate(_)))
            .collect();
        let mut walls_c: Vec<f64> = walls
            .iter()
            .map(|w| match *w {
                Wall::Fixed(t) => t,
                _ => f64::NAN,
            })
            .collect();
        if nodes.is_empty() {
            return walls_c;
        }
        let m = nodes.len();
        let mut a = vec![0.0; m * m];
        let mut b = vec![0.0; m];
        for (i, &p) in nodes.iter().enumerate() {
            // Σ g (T_w,p − T*_c − Σ_q T_w,q u_q,c) = inflow_p
            for (c, g) in self.link_g(p) {
                a[i * m + i] += g;
                b[i] += g * self.delta[c];
                for (j, &q) in nodes.iter().enumerate() {
                    a[i * m + j] -= g * self.response[q][c];
                }
            }
            match walls[p] {
                Wall::Fluid(t_f, r) => {
                    a[i * m + i] += 1.0 / r;
                    b[i] += t_f / r;
                }
                Wall::Rate(total) => b[i] += total,
                _ => {}
            }
        }
        let x = solve_dense(m, &mut a, &mut b);
        for (i, &p) in nodes.iter().enumerate() {
            walls_c[p] = x[i];
        }
        walls_c
    }

    /// Flows into the ground at the solved temperatures `self.delta`.
    fn flows(&self, walls: &[Wall], walls_c: &[f64], surface_c: f64) -> Flows {
        let mesh = self.mesh;
        let nx = mesh.nx;
        let t = &self.delta;
        let mut flows = Flows::default();
        for ix in 0..nx {
            if mesh.active[ix] {
                flows.surface += self.surface_conductance(ix) * (surface_c - t[ix]);
            }
            if mesh.active[(mesh.nz - 1) * nx + ix] {
                flows.bottom += mesh.bottom_area[ix] * self.bottom_flux_w_per_m2;
            }
        }
        for (p, wall) in walls.iter().enumerate() {
            let coupling = &mesh.couplings[p];
            let (flow, wall_c) = match *wall {
                Wall::Uniform(total) => {
                    let mean_wall: f64 = coupling
                        .uniform_flux
                        .iter()
                        .zip(&coupling.wall_factor)
                        .map(|(&(c, share), &wf)| share * (t[c] + share * total * wf / self.k_used[c]))
                        .sum();
                    (total, mean_wall)
                }
                _ => {
                    let t_w = walls_c[p];
                    (self.link_g(p).map(|(c, g)| g * (t_w - t[c])).sum(), t_w)
                }
            };
            flows.pipes.push(flow);
            flows.walls_c.push(wall_c);
        }
        flows
    }

    /// One backward-Euler step of length `dt_s` ending at `t_s`.
    fn step(
        &mut self,
        drives: &Drives,
        surface_c: f64,
        t_s: f64,
        dt_s: f64,
        opts: &IterationLimits,
    ) -> Result<Flows, String> {
        let walls = drives.walls(&self.mesh.couplings, t_s)?;
        self.h_old.copy_from_slice(&self.h);
        let inverse_dt = 1.0 / dt_s;
        let mut flows = Flows::default();
        self.first_iteration = true;
        let guessing = self.solver.uses_guess();
        if guessing {
            self.t_start.clone_from(&self.t);
            self.guess_pending = true;
            if self.lag_conductivity {
                self.predict_pieces();
            }
        }
        for _ in 0..opts.max_iterations.max(1) {
            flows = self.solve_iteration(&walls, surface_c, inverse_dt)?;
            // Energy balance holds after every iteration, converged or not.
            if self.apply_update()? < opts.tolerance_k {
                break;
            }
        }
        if guessing {
            self.guess.resize(self.t.len(), 0.0);
            for ((g, t), t0) in self.guess.iter_mut().zip(&self.t).zip(&self.t_start) {
                *g = t - t0;
            }
        }
        Ok(flows)
    }

    /// A better first Swaminathan–Voller iterate: a cell whose temperature,
    /// extrapolated by the last step's change, lies on another piece of H(T) starts
    /// the step there, `(H(T̃), T̃)` with `T̃ = Tⁿ + ΔTⁿ⁻¹`, so that the linear
    /// system is built with the capacity it will most likely end on. The iteration
    /// solves the same equations from any iterate on the H(T) curve (the enthalpy
    /// change of each iteration is the solved inflow from `Hⁿ`, so energy still
    /// closes) and stops as before when the linearisation was exact; a wrong
    /// prediction costs one more iteration, as a crossing did before.
    fn predict_pieces(&mut self) {
        if self.guess.len() != self.t.len() {
            return;
        }
        let mesh = self.mesh;
        for &c in &self.ahead {
            self.moved_ahead[c] = false;
        }
        self.ahead.clear();
        for i in 0..self.nonlinear.len() {
            let c = self.nonlinear[i];
            let m = &mesh.material[c];
            let (t, ahead) = (self.t[c], self.t[c] + self.guess[c]);
            if m.piece(ahead) != m.piece(t) {
                self.t[c] = ahead;
                self.h[c] = m.enthalpy_j_per_m3(ahead);
                self.moved_ahead[c] = true;
                self.ahead.push(c);
                // The guess of the solve is the change from this iterate.
                self.guess[c] = 0.0;
                self.dirty.push(c);
            }
        }
    }

    /// Swaminathan–Voller update of every cell from the solved `self.delta`;
    /// returns the largest temperature change, or 0 when the linearisation was
    /// exact (nothing left to iterate).
    fn apply_update(&mut self) -> Result<f64, String> {
        let mesh = self.mesh;
        let mut change: f64 = 0.0;
        let mut exact = true;
        let mut sum = 0.0;
        for c in 0..mesh.cells() {
            if !mesh.active[c] {
                continue;
            }
            let t_old = self.t[c];
            let (h, t_new) = if self.is_nonlinear[c] {
                let m = &mesh.material[c];
                let (h, t_new) = m.linearised_update(self.h[c], t_old, self.delta[c]);
                let exact_here = if self.lag_conductivity {
                    // Only the capacity is iterated; k follows at the next step. On
                    // one frozen or unfrozen piece k is constant, and whether it
                    // differs from `k_used` was checked when the cell got there
                    // (a cell moved ahead by `predict_pieces` got there without it).
                    let (old, new) = (m.piece(t_old), m.piece(t_new));
                    if (old != new || new == Piece::Freezing || self.moved_ahead[c])
                        && !self.in_k_dirty[c]
                        && m.conductivity(t_new) != self.k_used[c]
                    {
                        self.in_k_dirty[c] = true;
                        self.k_dirty.push(c);
                    }
                    old == new
                } else {
                    m.linearisation_exact(t_old, t_new)
                };
                if !exact_here {
                    // Its C (or k) changes: the coefficients are rebuilt there.
                    exact = false;
                    self.dirty.push(c);
                }
                (h, t_new)
            } else {
                // One straight H(T): c_used is the capacity, the update is exact.
                let cap = self.c_used[c];
                let h = self.h[c] + cap * (self.delta[c] - t_old);
                (h, h / cap)
            };
            let moved = (t_new - t_old).abs();
            if moved > change {
                change = moved;
            }
            sum += t_new;
            self.h[c] = h;
            self.t[c] = t_new;
        }
        if !sum.is_finite() {
            return Err("the temperatures became non-finite; check the model".into());
        }
        // With responses of an older operator the wall temperatures are not yet
        // consistent, so the iterate is only final when it stops moving.
        Ok(if exact && self.responses_current {
            0.0
        } else {
            change
        })
    }

    /// Temperature of cell `c` for output (a pipe's wall temperature inside it).
    fn display_c(&self, c: usize, walls_c: &[f64]) -> f64 {
        match self.mesh.owner[c] {
            Some(p) if !self.mesh.active[c] => walls_c.get(p).copied().unwrap_or(f64::NAN),
            _ => self.t[c],
        }
    }
}

struct IterationLimits {
    max_iterations: usize,
    tolerance_k: f64,
}

/// Gaussian elimination with partial pivoting for the small wall system.
fn solve_dense(m: usize, a: &mut [f64], b: &mut [f64]) -> Vec<f64> {
    for col in 0..m {
        let pivot = (col..m)
            .max_by(|&i, &j| a[i * m + col].abs().total_cmp(&a[j * m + col].abs()))
            .unwrap_or(col);
        if pivot != col {
            for k in 0..m {
                a.swap(col * m + k, pivot * m + k);
            }
            b.swap(col, pivot);
        }
        let d = a[col * m + col];
        for row in col + 1..m {
            let f = a[row * m + col] / d;
            for k in col..m {
                a[row * m + k] -= f * a[col * m + k];
            }
            b[row] -= f * b[col];
        }
    }
    let mut x = vec![0.0; m];
    for row in (0..m).rev() {
        let s: f64 = (row + 1..m).map(|k| a[row * m + k] * x[k]).sum();
        x[row] = (b[row] - s) / a[row * m + row];
    }
    x
}

// ---------------------------------------------------------------------------
// Public entry points and outputs.
// ---------------------------------------------------------------------------

fn finite(what: &str, v: f64) -> Result<f64, String> {
    if v.is_finite() {
        Ok(v)
    } else {
        Err(format!("{what} is {v}; it must be a finite number"))
    }
}

fn validate_transient(model: &SectionModel, opts: &TransientOptions) -> Result<(), String> {
    check_positive("the time step (s)", opts.time_step_s)?;
    finite("the start time (s)", opts.start_s)?;
    if opts.steps == 0 {
        return Err("at least one time step is needed".into());
    }
    if opts.max_iterations == 0 {
        return Err("max_iterations must be at least 1".into());
    }
    check_positive("the iteration tolerance (K)", opts.iteration_tolerance_k)?;
    finite("the frost isotherm (°C)", opts.frost_isotherm_c)?;
    let (x_lo, x_hi) = x_range(model);
    for (i, &(x, z)) in opts.probes.iter().enumerate() {
        if !(x >= x_lo && x <= x_hi && z >= 0.0 && z <= model.depth_m) {
            return Err(format!(
                "probe {i} at ({x} m, {z} m) is outside the domain x ∈ [{x_lo}, {x_hi}] m, z ∈ [0, {}] m",
                model.depth_m
            ));
        }
    }
    Ok(())
}

fn initial_field(mesh: &Mesh, initial: &Initial) -> Result<Vec<f64>, String> {
    let mut t = Vec::with_capacity(mesh.cells());
    for &z in mesh.z.centres_m() {
        for &x in mesh.x.centres_m() {
            let value = match initial {
                Initial::Uniform(v) => *v,
                Initial::Field(f) => f(x, z),
            };
            if !value.is_finite() {
                return Err(format!(
                    "the initial temperature at ({x} m, {z} m) is {value}; it must be finite"
                ));
            }
            t.push(value);
        }
    }
    Ok(t)
}

/// Relative residual of the iterative solver's solves. At 1e-4 the benchmark section
/// drifted 1.4e-3 K (probes) and 2.7e-3 K (pipe wall) from the Cholesky reference over 40
/// days at 1-hour steps; at 1e-6 it stays within 1e-5 K (measured with
/// `examples/engine_profile.rs ... compare`), for about 2.5 times the CG iterations.
const PCG_TOLERANCE: f64 = 1e-6;

fn new_solver(kind: SolverKind, mesh: &Mesh) -> Result<Box<dyn CellSolver>, String> {
    let kind = match kind {
        SolverKind::Auto if mesh.material.iter().all(Material::is_linear) => SolverKind::Adi,
        SolverKind::Auto => SolverKind::Iterative,
        other => other,
    };
    Ok(match kind {
        SolverKind::Adi => Box::new(AdiSolver::new(mesh.nx, mesh.nz)),
        SolverKind::Iterative => Box::new(PcgSolver::new(mesh.nx, mesh.nz, PCG_TOLERANCE)),
        _ => Box::new(DirectSolver::new(mesh.nx, mesh.nz)?),
    })
}

/// Fluid temperature of pipe `p` given its wall temperature and heat rate (W/m).
fn fluid_c(model: &SectionModel, p: usize, t_s: f64, wall_c: f64, q_w_per_m: f64) -> f64 {
    let (drive, r_wall) = match (model.pipes.get(p), &model.borehole) {
        (Some(pipe), _) => (&pipe.drive, pipe.wall_resistance_m_k_per_w),
        (None, Some(b)) => (&b.drive, b.wall_resistance_m_k_per_w),
        (None, None) => return f64::NAN,
    };
    match drive {
        Drive::FluidTemperature(f) => f(t_s),
        Drive::HeatRate(_) => wall_c + q_w_per_m * r_wall,
    }
}

impl Stepper<'_> {
    /// Heat-flux density `q = −k∇T` (W/m²) at the cell centres of the field `t`
    /// (°C), across and down. Each face carries the flow of the cell system,
    /// `g_face·(T_a − T_b)` with the series face conductance `g_face` the solver
    /// used (so the arrows follow the discrete heat flow exactly), divided by the
    /// face area (planar: per metre of length; r–z: `2πr·Δz` and the annulus).
    /// A cell's component is the mean over its two opposite faces; the symmetry
    /// sides count with zero flux and the bottom with the geothermal flux, while
    /// faces to a pipe and the ground surface are left out (one-sided value).
    /// NaN inside pipes.
    fn heat_flux_w_per_m2(&self, t: &[f64]) -> (Vec<f64>, Vec<f64>) {
        let mesh = self.mesh;
        let (nx, nz) = (mesh.nx, mesh.nz);
        let k = &self.coefficients;
        let (xf, xw, zw) = (mesh.x.faces_m(), mesh.x.widths_m(), mesh.z.widths_m());
        let axisymmetric = mesh.geometry == Geometry::Axisymmetric;
        // Area of the x face at axis position `xf[i]` in row `iz`, and of the z faces of column `ix`.
        let x_area = |i: usize, iz: usize| {
            if axisymmetric {
                2.0 * PI * xf[i] * zw[iz]
            } else {
                zw[iz]
            }
        };
        let z_area = |ix: usize| {
            if axisymmetric {
                PI * (xf[ix + 1].powi(2) - xf[ix].powi(2))
            } else {
                xw[ix]
            }
        };
        let mean = |faces: [Option<f64>; 2]| {
            let (sum, count) = faces
                .iter()
                .flatten()
                .fold((0.0, 0.0), |(s, n), q| (s + q, n + 1.0));
            if count > 0.0 { sum / count } else { 0.0 }
        };
        let n = mesh.cells();
        let (mut qx, mut qz) = (vec![f64::NAN; n], vec![f64::NAN; n]);
        for iz in 0..nz {
            for ix in 0..nx {
                let c = iz * nx + ix;
                if !mesh.active[c] {
                    continue;
                }
                let x_face = |a: usize, f: usize, i: usize| {
                    (mesh.active[a] && mesh.active[a + 1])
                        .then(|| k.gx[f] * (t[a] - t[a + 1]) / x_area(i, iz))
                };
                let west = if ix == 0 {
                    Some(0.0)
                } else {
                    x_face(c - 1, iz * (nx - 1) + ix - 1, ix)
                };
                let east = if ix + 1 == nx {
                    Some(0.0)
                } else {
                    x_face(c, iz * (nx - 1) + ix, ix + 1)
                };
                qx[c] = mean([west, east]);
                let z_face = |a: usize| {
                    (mesh.active[a] && mesh.active[a + nx]).then(|| k.gz[a] * (t[a] - t[a + nx]) / z_area(ix))
                };
                let north = if iz == 0 { None } else { z_face(c - nx) };
                let south = if iz + 1 == nz {
                    Some(-self.bottom_flux_w_per_m2)
                } else {
                    z_face(c)
                };
                qz[c] = mean([north, south]);
            }
        }
        (qx, qz)
    }

    fn display_field(&self, walls_c: &[f64]) -> Vec<f64> {
        (0..self.mesh.cells())
            .map(|c| self.display_c(c, walls_c))
            .collect()
    }

    fn probe_c(&self, x_m: f64, z_m: f64, walls_c: &[f64]) -> f64 {
        let nx = self.mesh.nx;
        let (x0, x1, wx) = self.mesh.x.interpolation(x_m);
        let (z0, z1, wz) = self.mesh.z.interpolation(z_m);
        let v = |ix: usize, iz: usize| self.display_c(iz * nx + ix, walls_c);
        (1.0 - wz) * ((1.0 - wx) * v(x0, z0) + wx * v(x1, z0))
            + wz * ((1.0 - wx) * v(x0, z1) + wx * v(x1, z1))
    }

    /// Frozen thickness `Σ f·Δz` of the edge column (last x column), m, with `f`
    /// the frozen fraction of the water in each cell (materials with latent heat only).
    fn frozen_thickness_m(&self) -> f64 {
        let mesh = self.mesh;
        let ix = mesh.nx - 1;
        (mesh.z.widths_m().iter().enumerate())
            .map(|(iz, dz)| (iz * mesh.nx + ix, dz))
            .filter(|&(c, _)| mesh.active[c] && mesh.material[c].latent_heat_j_per_m3() > 0.0)
            .map(|(c, dz)| (1.0 - mesh.material[c].liquid_fraction(self.t[c])) * dz)
            .sum()
    }

    /// Deepest crossing of `iso_c` in the edge column (last x column), m.
    fn frost_depth_m(&self, surface_c: f64, iso_c: f64) -> f64 {
        let mesh = self.mesh;
        let ix = mesh.nx - 1;
        let mut depths = vec![0.0];
        let mut temps = vec![if mesh.active[ix] {
            let g = self.surface_conductance(ix);
            let q = g * (surface_c - self.t[ix]);
            self.t[ix] + q * mesh.surface[ix].0 / self.k_used[ix]
        } else {
            surface_c
        }];
        for (iz, &z) in mesh.z.centres_m().iter().enumerate() {
            let c = iz * mesh.nx + ix;
            if mesh.active[c] {
                depths.push(z);
                temps.push(self.t[c]);
            }
        }
        for j in (0..temps.len()).rev() {
            if temps[j] < iso_c {
                return match temps.get(j + 1) {
                    Some(&below) => {
                        depths[j] + (iso_c - temps[j]) / (below - temps[j]) * (depths[j + 1] - depths[j])
                    }
                    None => depths[j],
                };
            }
        }
        0.0
    }
}

fn snapshot(stepper: &Stepper, time_s: f64, t_c: Vec<f64>) -> Snapshot {
    let (q_x_w_per_m2, q_z_w_per_m2) = stepper.heat_flux_w_per_m2(&t_c);
    Snapshot {
        time_s,
        x_m: stepper.mesh.x.centres_m().to_vec(),
        z_m: stepper.mesh.z.centres_m().to_vec(),
        t_c,
        q_x_w_per_m2,
        q_z_w_per_m2,
    }
}

fn relative(imbalance: f64, throughput: f64) -> f64 {
    if throughput > 0.0 {
        imbalance / throughput
    } else {
        imbalance
    }
}

/// Transient solution from the initial state over `opts.steps` backward-Euler
/// steps of `opts.time_step_s` (see the module documentation for the method).
pub fn solve_transient(model: &SectionModel, opts: &TransientOptions) -> Result<Solution, String> {
    validate_transient(model, opts)?;
    let mesh = Mesh::build(model, &opts.grid)?;
    let t0 = initial_field(&mesh, &opts.initial)?;
    let mut stepper = Stepper::new(
        &mesh,
        new_solver(opts.solver, &mesh)?,
        t0,
        model.bottom_flux_w_per_m2,
    );
    stepper.lag_conductivity = true;
    let drives = Drives::of(model);
    let limits = IterationLimits {
        max_iterations: opts.max_iterations,
        tolerance_k: opts.iteration_tolerance_k,
    };
    let dt = opts.time_step_s;
    let pipe_count = mesh.couplings.len();
    let mut solution = Solution {
        times_s: Vec::with_capacity(opts.steps),
        pipes: vec![PipeSeries::default(); pipe_count],
        probes_c: vec![Vec::with_capacity(opts.steps); opts.probes.len()],
        snapshots: Vec::new(),
        frost_depth_m: Vec::with_capacity(opts.steps),
        front_depth_m: Vec::with_capacity(opts.steps),
        energy_balance_relative_error: 0.0,
        cells: mesh.cells(),
        linear_solves: 0,
        factorisations: 0,
        linear_iterations: 0,
        nonlinear_iterations: 0,
    };
    let mut pending: Vec<f64> = opts
        .snapshot_times_s
        .iter()
        .copied()
        .filter(|&t| t >= opts.start_s && t <= opts.start_s + opts.steps as f64 * dt)
        .collect();
    pending.sort_by(f64::total_cmp);
    let mut walls_c = vec![f64::NAN; pipe_count];
    let stored_start = stepper.stored_j();
    let (mut heat_in, mut throughput) = (0.0, 0.0);
    for n in 0..opts.steps {
        let t_start = opts.start_s + n as f64 * dt;
        let t_s = t_start + dt;
        let surface_c = finite("the surface temperature", (model.surface_c)(t_s))?;
        let before = pending
            .first()
            .filter(|&&t| t <= t_s)
            .map(|_| stepper.display_field(&walls_c));
        let flows = stepper.step(&drives, surface_c, t_s, dt, &limits)?;
        walls_c.clone_from(&flows.walls_c);
        let pipe_total: f64 = flows.pipes.iter().sum();
        heat_in += dt * (flows.surface + flows.bottom + pipe_total);
        throughput += dt
            * (flows.surface.abs() + flows.bottom.abs() + flows.pipes.iter().map(|q| q.abs()).sum::<f64>());
        solution.times_s.push(t_s);
        for (p, series) in solution.pipes.iter_mut().enumerate() {
            let q = flows.pipes[p] / mesh.couplings[p].length_m;
            series.heat_rate_w_per_m.push(q);
            series.wall_c.push(flows.walls_c[p]);
            series.fluid_c.push(fluid_c(model, p, t_s, flows.walls_c[p], q));
        }
        for (probe, series) in opts.probes.iter().zip(solution.probes_c.iter_mut()) {
            series.push(stepper.probe_c(probe.0, probe.1, &walls_c));
        }
        solution
            .frost_depth_m
            .push(stepper.frost_depth_m(surface_c, opts.frost_isotherm_c));
        solution.front_depth_m.push(stepper.frozen_thickness_m());
        if let Some(before) = before {
            let after = stepper.display_field(&walls_c);
            while let Some(&t_snap) = pending.first().filter(|&&t| t <= t_s) {
                let w = ((t_snap - t_start) / dt).clamp(0.0, 1.0);
                let field = before.iter().zip(&after).map(|(a, b)| a + w * (b - a)).collect();
                solution.snapshots.push(snapshot(&stepper, t_snap, field));
                pending.remove(0);
            }
        }
    }
    let imbalance = (heat_in - (stepper.stored_j() - stored_start)).abs();
    solution.energy_balance_relative_error = relative(imbalance, throughput);
    solution.linear_solves = stepper.solves;
    solution.factorisations = stepper.solver.factorisations();
    solution.linear_iterations = stepper.solver.iterations();
    solution.nonlinear_iterations = stepper.iterations;
    Ok(solution)
}

/// Steady state under the boundary values at time `t_s` (surface temperature,
/// pipe drives), solved directly with the sparse Cholesky solver. Frozen and
/// unfrozen conductivities follow the solved temperatures (Picard iteration).
pub fn solve_steady(model: &SectionModel, grid: &GridOptions, t_s: f64) -> Result<SteadySolution, String> {
    finite("the time of the steady solve (s)", t_s)?;
    let mesh = Mesh::build(model, grid)?;
    let surface_c = finite("the surface temperature", (model.surface_c)(t_s))?;
    let solver = new_solver(SolverKind::Direct, &mesh)?;
    let mut stepper = Stepper::new(
        &mesh,
        solver,
        vec![surface_c; mesh.cells()],
        model.bottom_flux_w_per_m2,
    );
    let drives = Drives::of(model);
    let walls = drives.walls(&mesh.couplings, t_s)?;
    const PICARD_LIMIT: usize = 200;
    let mut flows = Flows::default();
    for iteration in 0..=PICARD_LIMIT {
        if iteration == PICARD_LIMIT {
            return Err(
                "the steady solve did not converge (frozen/unfrozen conductivities keep switching)".into(),
            );
        }
        stepper.h_old.copy_from_slice(&stepper.h);
        stepper.first_iteration = true;
        stepper.check_all = true;
        flows = stepper.solve_iteration(&walls, surface_c, 0.0)?;
        let mut change: f64 = 0.0;
        for c in 0..mesh.cells() {
            if mesh.active[c] {
                change = change.max((stepper.delta[c] - stepper.t[c]).abs());
                stepper.t[c] = stepper.delta[c];
                stepper.h[c] = mesh.material[c].enthalpy_j_per_m3(stepper.t[c]);
            }
        }
        if !change.is_finite() {
            return Err("the steady temperatures became non-finite; check the model".into());
        }
        let k_fixed = (0..mesh.cells())
            .all(|c| !mesh.active[c] || mesh.material[c].conductivity(stepper.t[c]) == stepper.k_used[c]);
        if k_fixed || change < 1e-7 {
            break;
        }
    }
    let pipe_total: f64 = flows.pipes.iter().sum();
    let throughput =
        flows.surface.abs() + flows.bottom.abs() + flows.pipes.iter().map(|q| q.abs()).sum::<f64>();
    let heat_rate: Vec<f64> = flows
        .pipes
        .iter()
        .zip(&mesh.couplings)
        .map(|(q, c)| q / c.length_m)
        .collect();
    let fluid = (0..heat_rate.len())
        .map(|p| fluid_c(model, p, t_s, flows.walls_c[p], heat_rate[p]))
        .collect();
    Ok(SteadySolution {
        field: snapshot(&stepper, t_s, stepper.display_field(&flows.walls_c)),
        heat_rate_w_per_m: heat_rate,
        wall_c: flows.walls_c.clone(),
        fluid_c: fluid,
        energy_balance_relative_error: relative(
            (flows.surface + flows.bottom + pipe_total).abs(),
            throughput,
        ),
        cells: mesh.cells(),
    })
}

/// Number of cells (nx, nz) the grid of `model` would have with `grid`.
pub fn grid_size(model: &SectionModel, grid: &GridOptions) -> Result<(usize, usize), String> {
    let mesh = Mesh::build(model, grid)?;
    Ok((mesh.nx, mesh.nz))
}
