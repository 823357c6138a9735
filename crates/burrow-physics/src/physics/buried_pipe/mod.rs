//! Steady heat loss of buried district-heating pipes: single pipes, supply/return pairs, any
//! number of pipes in one cross-section, and twin pipes; the soil temperature at a neighbouring
//! point; monthly and annual losses; insulation sizing and life-cycle cost.
//!
//! # The model
//!
//! Steady two-dimensional conduction in a homogeneous half-space of conductivity `k` whose surface
//! is held at the undisturbed ground temperature through a surface resistance `R0` (m² K/W). Each
//! pipe is a line source with its negative image above the surface (Kelvin; Carslaw & Jaeger,
//! *Conduction of Heat in Solids*, 2nd ed. 1959, §10.10), the surface resistance is an added
//! depth `H' = H + k·R0` (EN 13941-1 practice), and the pipe's own wall layers are coaxial
//! cylinders. Superposition is linear, so every pipe may sit in its own undisturbed ground
//! temperature (the caller supplies it at the pipe's depth; temperatures here are excesses over
//! it).
//!
//! # What includes what (per metre of pipe, m K/W)
//!
//! - *wall resistance* [`wall::wall_resistance_m_k_per_w`]: every wall layer from the inside out
//!   (steel, insulation, casing…); fluid-side film resistance is not included (negligible for
//!   turbulent water in steel; add it as a layer if wanted);
//! - *ground resistance* [`ground::ground_resistance_m_k_per_w`]: from the outer surface of the
//!   pipe to the (effective) ground surface;
//! - *own resistance* `R_s`, `R_r` of a pipe in a pair or group = wall + ground: the diagonal of
//!   the resistance matrix ([`system::resistance_matrix`]);
//! - *mutual resistance* `R_m` ([`ground::mutual_resistance_m_k_per_w`]): soil only, the
//!   off-diagonal.
//!
//! Signs: a heat rate is positive when the pipe gives heat to the ground (a loss).
//!
//! # Accuracy (see tests/buried_pipe.rs)
//!
//! Line sources ignore the distortion of one pipe's field by another pipe's body; against a
//! boundary-collocation reference this costs < 0.5 % for spacings of two outer diameters and
//! more. The twin-pipe formulas are first-order multipoles (see [`twin`]).

pub mod ground;
pub mod seasonal;
pub mod sizing;
pub mod system;
pub mod twin;
pub mod wall;

/// Surface resistance between the ground surface and the air, m² K/W, as commonly used with
/// EN 13941-1 (`from memory`: 0.0685 m² K/W; corresponds to a surface heat-transfer coefficient
/// of about 14.6 W/(m² K)).
pub const DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W: f64 = 0.0685;

/// The soil around the pipes.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Soil {
    /// Thermal conductivity, W/(m K).
    pub conductivity_w_per_m_k: f64,
    /// Surface resistance R0 between the ground surface and the undisturbed temperature, m² K/W
    /// (0 = the surface is held at the undisturbed temperature).
    pub surface_resistance_m2_k_per_w: f64,
}

impl Soil {
    /// Checked constructor: conductivity finite and positive, surface resistance finite and not
    /// negative.
    pub fn new(conductivity_w_per_m_k: f64, surface_resistance_m2_k_per_w: f64) -> Result<Self, String> {
        positive("the soil conductivity", conductivity_w_per_m_k, "W/(m K)")?;
        not_negative("the surface resistance", surface_resistance_m2_k_per_w, "m2 K/W")?;
        Ok(Self {
            conductivity_w_per_m_k,
            surface_resistance_m2_k_per_w,
        })
    }

    /// Effective depth H' = H + k·R0, m: the surface resistance as an added soil layer of the same
    /// thermal resistance (EN 13941-1 practice).
    pub fn effective_depth_m(&self, depth_m: f64) -> f64 {
        depth_m + self.conductivity_w_per_m_k * self.surface_resistance_m2_k_per_w
    }
}

/// Which closed form gives a pipe's own ground resistance.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum GroundForm {
    /// Isothermal cylinder under an isothermal surface: `acosh(H'/r)/(2πk)` (exact).
    #[default]
    Exact,
    /// Line source with its image: `ln(2H'/r)/(2πk)` (the common approximation, written
    /// `ln(4H/D)` in EN 13941-1); too low by `ln((1+sqrt(1−(r/H')²))/2)`, i.e. by ~(r/2H')².
    LineSource,
}

/// A point of the cross-section: `x_m` across, `depth_m` down from the ground surface.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Position {
    pub x_m: f64,
    pub depth_m: f64,
}

impl Position {
    pub fn new(x_m: f64, depth_m: f64) -> Self {
        Self { x_m, depth_m }
    }

    /// Straight-line distance to another point, m.
    pub fn distance_m(&self, other: &Position) -> f64 {
        (self.x_m - other.x_m).hypot(self.depth_m - other.depth_m)
    }
}

/// The shared checks ([`crate::numerics::checks`]) with the unit named beside the quantity.
pub(crate) fn positive(what: &str, value: f64, unit: &str) -> Result<(), String> {
    crate::numerics::checks::positive(&format!("{what} ({unit})"), value)
}

pub(crate) fn not_negative(what: &str, value: f64, unit: &str) -> Result<(), String> {
    crate::numerics::checks::non_negative(&format!("{what} ({unit})"), value)
}

pub(crate) fn finite(what: &str, value: f64, unit: &str) -> Result<(), String> {
    crate::numerics::checks::finite(&format!("{what} ({unit})"), value)
}
