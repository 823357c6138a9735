//! Thermal response factors (g-functions) of borehole fields for ground-source heat pumps.
//!
//! A g-function gives the mean borehole-wall temperature of a field after a constant total heat
//! rate has been injected for a time t: `T_b(t) − T_ground = q'/(2πk)·g(t)`, with q' the heat
//! rate per metre of active borehole (W/m) and k the ground conductivity (Eskilson 1987,
//! *Thermal analysis of heat extraction boreholes*, Lund). Times are often given as
//! `ln(t/t_s)` with Eskilson's time scale `t_s = H²/(9α)`.
//!
//! # Methods
//!
//! * **Uniform heat flux** ([`WallCondition::UniformHeatFlux`]): every borehole carries the same
//!   q' along its whole length. Each borehole is a finite line source (FLS) with its mirror
//!   image above the ground surface; the mean wall temperature of borehole i caused by borehole
//!   j is the mean-wall single integral of Claesson & Javed (2011), ASHRAE Trans. 117(2),
//!   generalised to two boreholes as in Cimmino & Bernier (2014) (see `fls` for the formula),
//!   summed over j (spatial superposition) and averaged over the field, weighted by length.
//! * **Uniform borehole-wall temperature** ([`WallCondition::UniformTemperature`]): each
//!   borehole is split into `segments` equal segments, each a finite line source. At each
//!   requested time the segment heat rates are those that give one wall temperature common to
//!   all segments while the field's total heat rate stays fixed (Cimmino & Bernier 2014, Int. J.
//!   Heat Mass Transfer 70, 641–650; Cimmino 2018, J. Building Performance Simulation 11(6),
//!   655–668). The heat rates are piecewise constant over the intervals between requested
//!   times and superposed in time exactly (see `superposition`).
//! * **Near field** ([`NearField`]): line sources ignore the borehole's radius, which matters
//!   while `Fo = αt/r_b²` is small (ln(t/t_s) below about −10 for usual boreholes). With
//!   [`NearField::CylinderSource`] (the default) each segment's response to itself gets the
//!   additive correction `g_CS(Fo) − g_ILS(Fo)`: the infinite cylinder source with constant
//!   wall flux (Carslaw & Jaeger 1959, §13.7) minus the infinite line source (C&J §10.4,
//!   Ingersoll et al. 1954) at the same radius. The correction is the exact difference between
//!   the radial solutions of a cylinder and a line in an infinite medium; it decays like
//!   ln(Fo)/Fo, so the FLS alone governs once the radial field has grown past the radius, and
//!   end and image effects (which the correction does not touch) govern late times. It is
//!   therefore a blend without weights or switching times. [`NearField::LineSource`] keeps
//!   the pure FLS.
//!
//! # Speed
//!
//! The FLS integrand factors into `exp(−d²s²)` (horizontal distance) and a segment part
//! (vertical geometry), so one quadrature in s, shared by all times, gives a table of responses
//! indexed by distinct distance and distinct segment pair (`response`). Equivalent boreholes
//! under the square group of the layout (rectangle: four symmetries; square: eight) share
//! their unknowns (`symmetry`), responses below 1e-16 of the largest at a time are skipped,
//! and the reduced dense systems are solved by LU or LU-preconditioned GMRES (`dense`).
//! Benchmark (benches/gfunction.rs, 2 shared cores): 40 times, 12 segments, 5 × 5 ≈ 40 ms,
//! 10 × 10 ≈ 0.11 s, 20 × 20 ≈ 0.85 s (1.3 s on one thread).
//!
//! # Not covered
//!
//! Inclined boreholes, unequal segment lengths along a borehole, symmetries other than the
//! axis-aligned square group (rotated or hexagonal layouts are solved without reduction), the
//! fluid side (equal inlet temperature, borehole resistance), and layered or anisotropic ground.

mod cylinder;
mod dense;
mod fls;
mod layout;
mod quadrature;
mod response;
mod superposition;
mod symmetry;

use cylinder::CylinderSource;
use layout::Layout;
use response::ResponseTable;
use superposition::Differences;

/// One vertical borehole. Its active (heat-exchanging) part runs from `buried_depth_m` down to
/// `buried_depth_m + length_m`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Borehole {
    /// Horizontal position, m.
    pub x_m: f64,
    /// Horizontal position, m.
    pub y_m: f64,
    /// Active length H, m.
    pub length_m: f64,
    /// Depth D of the top of the active part below the ground surface, m.
    pub buried_depth_m: f64,
    /// Borehole radius r_b, m.
    pub radius_m: f64,
}

/// The condition at the borehole walls.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum WallCondition {
    /// The same heat rate per metre everywhere on every borehole.
    UniformHeatFlux,
    /// One wall temperature common to every borehole and depth; each borehole is split into
    /// `segments` equal segments (see [`WallCondition::DEFAULT_SEGMENTS`]).
    UniformTemperature { segments: usize },
}

impl WallCondition {
    /// Segments per borehole used by [`WallCondition::uniform_temperature`].
    pub const DEFAULT_SEGMENTS: usize = 12;
    /// Largest number of segments per borehole accepted.
    pub const MAX_SEGMENTS: usize = 100;
    /// Largest number of times accepted under the uniform wall temperature.
    pub const MAX_TIMES: usize = 200;

    /// Uniform wall temperature with the default 12 segments per borehole.
    pub fn uniform_temperature() -> Self {
        Self::UniformTemperature {
            segments: Self::DEFAULT_SEGMENTS,
        }
    }
}

/// How the borehole's own radius enters (see the module documentation).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum NearField {
    /// Pure finite line sources.
    LineSource,
    /// Finite line sources plus the cylinder-source correction of each segment's self response.
    #[default]
    CylinderSource,
}

/// Below this Fourier number `αt/r_b²` a line source has no meaningful wall temperature (its
/// response at the wall is below e^(−25)); [`NearField::LineSource`] refuses such times.
pub const MIN_LINE_SOURCE_FOURIER: f64 = 0.01;

/// Settings of [`gfunction_with`].
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct Options {
    pub near_field: NearField,
}

/// Eskilson's time scale `t_s = H²/(9α)`, s, for length `length_m` (m) and ground diffusivity
/// `diffusivity_m2_per_s` (m²/s).
pub fn characteristic_time_s(length_m: f64, diffusivity_m2_per_s: f64) -> f64 {
    length_m * length_m / (9.0 * diffusivity_m2_per_s)
}

/// Forty times, s, evenly spaced in `ln(t/t_s)` from −10 to 3 (`t_s = H²/(9α)`), the range of
/// Eskilson's g-function charts.
pub fn default_times(length_m: f64, diffusivity_m2_per_s: f64) -> Vec<f64> {
    let ts = characteristic_time_s(length_m, diffusivity_m2_per_s);
    let n = 40;
    (0..n)
        .map(|i| ts * (-10.0 + 13.0 * i as f64 / (n - 1) as f64).exp())
        .collect()
}

/// A rectangular field of `rows × columns` boreholes on a square grid of `spacing_m` (m), the
/// first at the origin, columns along x; all with length `length_m`, buried depth `depth_m`
/// and radius `radius_m` (m). Validation happens in [`gfunction`].
pub fn rectangle(
    rows: usize,
    columns: usize,
    spacing_m: f64,
    length_m: f64,
    depth_m: f64,
    radius_m: f64,
) -> Vec<Borehole> {
    (0..rows)
        .flat_map(|r| {
            (0..columns).map(move |c| Borehole {
                x_m: c as f64 * spacing_m,
                y_m: r as f64 * spacing_m,
                length_m,
                buried_depth_m: depth_m,
                radius_m,
            })
        })
        .collect()
}

/// The g-function of `field` at `times_s` (s, strictly increasing, positive) for ground
/// diffusivity `diffusivity_m2_per_s` (m²/s), with the default [`Options`] (cylinder-source near
/// field). Returns one dimensionless value per time.
pub fn gfunction(
    field: &[Borehole],
    diffusivity_m2_per_s: f64,
    times_s: &[f64],
    condition: WallCondition,
) -> Result<Vec<f64>, String> {
    gfunction_with(
        field,
        diffusivity_m2_per_s,
        times_s,
        condition,
        &Options::default(),
    )
}

/// [`gfunction`] with explicit [`Options`].
pub fn gfunction_with(
    field: &[Borehole],
    diffusivity_m2_per_s: f64,
    times_s: &[f64],
    condition: WallCondition,
    options: &Options,
) -> Result<Vec<f64>, String> {
    check_field(field)?;
    check_times(diffusivity_m2_per_s, times_s)?;
    let segments = match condition {
        WallCondition::UniformHeatFlux => 1,
        WallCondition::UniformTemperature { segments } => {
            if times_s.len() > WallCondition::MAX_TIMES {
                return Err(format!(
                    "{} times were given; the uniform-wall-temperature g-function takes at most {} (its cost grows with the square of their number), and about 40 evenly spaced in ln t are usually enough",
                    times_s.len(),
                    WallCondition::MAX_TIMES
                ));
            }
            if segments == 0 || segments > WallCondition::MAX_SEGMENTS {
                return Err(format!(
                    "the number of segments per borehole is {segments}; it must be between 1 and {}",
                    WallCondition::MAX_SEGMENTS
                ));
            }
            segments
        }
    };
    let layout = Layout::build(field, segments);
    let cylinder = match options.near_field {
        NearField::CylinderSource => {
            let cs = CylinderSource::new();
            let r_max = field.iter().map(|b| b.radius_m).fold(0.0, f64::max);
            if diffusivity_m2_per_s * times_s[0] / (r_max * r_max) < cs.smallest_fourier() {
                return Err(format!(
                    "the first time {} s is too short for the cylinder source (αt/r_b² must be at least {:e}); use later times",
                    times_s[0],
                    cs.smallest_fourier()
                ));
            }
            Some(cs)
        }
        NearField::LineSource => {
            let r_max = field.iter().map(|b| b.radius_m).fold(0.0, f64::max);
            if diffusivity_m2_per_s * times_s[0] / (r_max * r_max) < MIN_LINE_SOURCE_FOURIER {
                return Err(format!(
                    "the first time {} s is too short for a line source (αt/r_b² must be at least {MIN_LINE_SOURCE_FOURIER}); use the cylinder-source near field or later times",
                    times_s[0]
                ));
            }
            None
        }
    };
    match condition {
        WallCondition::UniformHeatFlux => {
            check_table_size(&layout, times_s.len())?;
            let table = ResponseTable::build(&layout, diffusivity_m2_per_s, times_s, cylinder.as_ref());
            Ok(superposition::uniform_heat_flux(&layout, &table, times_s.len()))
        }
        WallCondition::UniformTemperature { .. } => {
            let differences = Differences::new(times_s);
            check_table_size(&layout, differences.taus_s.len())?;
            let table = ResponseTable::build(
                &layout,
                diffusivity_m2_per_s,
                &differences.taus_s,
                cylinder.as_ref(),
            );
            superposition::uniform_wall_temperature(&layout, &table, &differences)
        }
    }
}

/// Largest response table accepted (entries of 8 bytes: 400 MB).
const MAX_TABLE_ENTRIES: usize = 50_000_000;

/// The uniform-wall-temperature table holds every time difference (K(K+1)/2 for K times), so
/// its size grows with the square of the number of times.
fn check_table_size(layout: &Layout, times: usize) -> Result<(), String> {
    let entries = times * layout.distances_m.len() * layout.keys.len();
    if entries > MAX_TABLE_ENTRIES {
        return Err(format!(
            "this field and list of times need {entries} response values, more than the {MAX_TABLE_ENTRIES} allowed; give fewer times (about 40, evenly spaced in ln t, are usually enough)"
        ));
    }
    Ok(())
}

fn check_field(field: &[Borehole]) -> Result<(), String> {
    if field.is_empty() {
        return Err("the borehole field is empty; give at least one borehole".into());
    }
    for (i, b) in field.iter().enumerate() {
        let n = i + 1;
        if !(b.x_m.is_finite() && b.y_m.is_finite()) {
            return Err(format!(
                "borehole {n} has a position that is not a finite number of metres"
            ));
        }
        if !(b.length_m.is_finite() && b.length_m > 0.0) {
            return Err(format!(
                "borehole {n} has length {} m; it must be a positive number of metres",
                b.length_m
            ));
        }
        if !(b.buried_depth_m.is_finite() && b.buried_depth_m >= 0.0) {
            return Err(format!(
                "borehole {n} has buried depth {} m; it must be zero or a positive number of metres",
                b.buried_depth_m
            ));
        }
        if !(b.radius_m.is_finite() && b.radius_m > 0.0 && b.radius_m < 0.5 * b.length_m) {
            return Err(format!(
                "borehole {n} has radius {} m; it must be positive and less than half its length",
                b.radius_m
            ));
        }
    }
    check_spacing(field)
}

/// No two boreholes may overlap (centre distance below the sum of the radii).
fn check_spacing(field: &[Borehole]) -> Result<(), String> {
    let mut order: Vec<usize> = (0..field.len()).collect();
    order.sort_by(|&a, &b| field[a].x_m.total_cmp(&field[b].x_m));
    let r_max = field.iter().map(|b| b.radius_m).fold(0.0, f64::max);
    for (k, &i) in order.iter().enumerate() {
        for &j in &order[k + 1..] {
            if field[j].x_m - field[i].x_m >= 2.0 * r_max {
                break;
            }
            let d = (field[i].x_m - field[j].x_m).hypot(field[i].y_m - field[j].y_m);
            if d < field[i].radius_m + field[j].radius_m {
                return Err(format!(
                    "boreholes {} and {} overlap ({d:.3} m apart); their centres must be at least the sum of their radii apart",
                    i.min(j) + 1,
                    i.max(j) + 1
                ));
            }
        }
    }
    Ok(())
}

fn check_times(diffusivity_m2_per_s: f64, times_s: &[f64]) -> Result<(), String> {
    if !(diffusivity_m2_per_s.is_finite() && diffusivity_m2_per_s > 0.0) {
        return Err(format!(
            "the ground diffusivity is {diffusivity_m2_per_s} m²/s; it must be a positive number"
        ));
    }
    if times_s.is_empty() {
        return Err("no times were given; give at least one positive time in seconds".into());
    }
    if !times_s.iter().all(|t| t.is_finite() && *t > 0.0) {
        return Err("every time must be a positive, finite number of seconds".into());
    }
    if times_s.windows(2).any(|w| w[1] <= w[0]) {
        return Err("the times must be strictly increasing".into());
    }
    Ok(())
}
