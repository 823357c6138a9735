//! One-dimensional vertical soil column: layered, freezing, solved to its
//! annually repeating (periodic) state.
//!
//! # Model
//!
//! Heat conduction with latent heat, `∂H/∂t = ∂/∂z (k(T) ∂T/∂z)`, where the
//! volumetric enthalpy `H(T)` (J/m³) contains sensible and latent heat. Water freezes
//! linearly between 0 °C and `−freezing_interval_k`; above that range the unfrozen
//! properties apply, below it the frozen ones; inside it the conductivity is
//! interpolated linearly in the liquid fraction and the sensible capacity is the
//! mean of the frozen and unfrozen values (so `H` is continuous and piecewise
//! linear in `T` and can be inverted exactly).
//!
//! * Space: cell-centred finite volumes. The surface cell has the requested size
//!   `h₀`; cells grow geometrically with depth, `h(z) = h₀·min(1 + z/2 m, 16)`
//!   (1 % per cell for 2 cm cells), so that halving `h₀` halves every cell. The
//!   slow growth keeps cells small through the seasonal frost zone, where the
//!   enthalpy method is only about first-order accurate in the cell size. Layer
//!   interfaces and the reporting depth lie on cell faces; face conductances are
//!   harmonic means (series resistances).
//! * Surface: Dirichlet, the prescribed surface temperature. Bottom: a constant
//!   upward heat flux (the geothermal flux), placed at
//!   `max(2·depth, depth + 5·d_max)` with `d_max` the largest damping depth of the
//!   layers, where the annual wave is below `e⁻⁵` of its surface value.
//! * Time: backward (implicit) Euler with one tridiagonal (Thomas) solve per
//!   iteration. Backward Euler is chosen over Crank–Nicolson because with 2 cm
//!   surface cells and 6 h steps the cell Fourier number `αΔt/h²` is about 40,
//!   where Crank–Nicolson lets stiff modes ring (amplification → −1) and produces
//!   oscillations at a freezing front; backward Euler is L-stable and monotone.
//!   Its first-order time error for the annual wave is `≈ A·ωΔt/4` per damping
//!   depth of travel, about 0.004 K for A = 10 K and 1460 steps per year.
//! * Freezing: the linearised enthalpy update of C. R. Swaminathan & V. R. Voller,
//!   "A general enthalpy method for modeling solidification processes",
//!   Metallurgical Transactions B 23B (1992) 651–664 (from memory): each
//!   iteration solves `Δz/Δt·[Hᵐ + Cᵐ(T* − Tᵐ) − Hⁿ] = flux balance(T*)` with
//!   `Cᵐ = dH/dT(Tᵐ)` and conductivities at `Tᵐ`, then sets
//!   `Hᵐ⁺¹ = Hᵐ + Cᵐ(T* − Tᵐ)` and `Tᵐ⁺¹ = H⁻¹(Hᵐ⁺¹)`. The stored enthalpy
//!   therefore changes by exactly the net face fluxes of the solved system in
//!   every iteration: energy is conserved to round-off whether or not the
//!   iteration has fully converged. It stops when no temperature moves by more
//!   than 1e-6 K, or at once when no cell changed its piece of `H(T)` and none
//!   sits where `k` depends on `T` (the linearisation was then exact).
//! * Periodic state: start from the closed-form annual wave of the first layer
//!   (first harmonic of the surface temperature, [`AnnualWave`]) on top of the
//!   steady geothermal profile, then repeat years until consecutive years differ
//!   by less than the tolerance on every day and in every cell. After each year
//!   the annual mean below the seasonal freeze–thaw zone is corrected so that every
//!   face carries the geothermal flux on average (see `Column::correct_deep_mean`),
//!   which removes the decades-long drift of the deep mean: a 15 m profile
//!   converges to 1e-4 K in about 5 years for dry soil and 15–20 years with frost.
//!   Note that the criterion bounds the change between years, not the distance
//!   to the exact periodic state, which can be a few times larger.
//!
//! Time convention: `t = 0` s is 1 January 00:00, the year has 365 days, and day
//! index `i` of the output is the instant `t = i·86 400 s` (00:00 on day of year
//! `i + 1`), as in [`crate::physics::annual_wave`].

use crate::physics::annual_wave::{AnnualWave, DAY_S, YEAR_S, damping_depth_m};

pub use crate::engine::material::DEFAULT_FREEZING_INTERVAL_K;
use crate::engine::material::Material;

/// Days in the model year; the periodic output has one profile per day.
pub const DAYS_PER_YEAR: usize = 365;

/// Depth scale (m) of the geometric cell growth `h(z) = h₀·(1 + z/L)`.
const GROWTH_LENGTH_M: f64 = 2.0;
/// Largest cell as a multiple of the surface cell.
const MAX_CELL_FACTOR: f64 = 16.0;
/// Refuse grids larger than this (a typical 15 m profile uses about 300 cells).
const MAX_CELLS: usize = 200_000;
/// Iteration limit of the freezing (enthalpy) iteration in one time step.
const MAX_ITERATIONS: usize = 100;
/// The enthalpy iteration stops when no cell temperature changes by more (K).
const ITERATION_TOLERANCE_K: f64 = 1e-6;

/// One soil layer of the column. Heat capacities are volumetric, J/(m³·K);
/// conductivities in W/(m·K).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ColumnLayer {
    /// Layer thickness, m. The last layer extends to the bottom of the column
    /// and its thickness is ignored.
    pub thickness_m: f64,
    /// Unfrozen thermal conductivity, W/(m·K).
    pub conductivity: f64,
    /// Frozen thermal conductivity, W/(m·K).
    pub frozen_conductivity: f64,
    /// Unfrozen volumetric heat capacity, J/(m³·K).
    pub heat_capacity: f64,
    /// Frozen volumetric heat capacity, J/(m³·K).
    pub frozen_heat_capacity: f64,
    /// Latent heat of the pore water per unit soil volume, J/m³
    /// (volumetric water content × 1000 kg/m³ × 333.55 kJ/kg, IAPWS); 0 for dry soil.
    pub latent_heat_j_per_m3: f64,
    /// Water freezes linearly between 0 °C and `−freezing_interval_k`, K
    /// (default [`DEFAULT_FREEZING_INTERVAL_K`]).
    pub freezing_interval_k: f64,
}

impl ColumnLayer {
    /// A layer without water: the same properties frozen and unfrozen.
    pub fn dry(thickness_m: f64, conductivity: f64, heat_capacity: f64) -> Self {
        Self {
            thickness_m,
            conductivity,
            frozen_conductivity: conductivity,
            heat_capacity,
            frozen_heat_capacity: heat_capacity,
            latent_heat_j_per_m3: 0.0,
            freezing_interval_k: DEFAULT_FREEZING_INTERVAL_K,
        }
    }

    /// A moist layer with the default freezing interval.
    pub fn moist(
        thickness_m: f64,
        conductivity: f64,
        frozen_conductivity: f64,
        heat_capacity: f64,
        frozen_heat_capacity: f64,
        latent_heat_j_per_m3: f64,
    ) -> Self {
        Self {
            thickness_m,
            conductivity,
            frozen_conductivity,
            heat_capacity,
            frozen_heat_capacity,
            latent_heat_j_per_m3,
            freezing_interval_k: DEFAULT_FREEZING_INTERVAL_K,
        }
    }

    fn validate(&self, index: usize, is_last: bool) -> Result<(), String> {
        let positive = [
            ("conductivity", self.conductivity),
            ("frozen_conductivity", self.frozen_conductivity),
            ("heat_capacity", self.heat_capacity),
            ("frozen_heat_capacity", self.frozen_heat_capacity),
            ("freezing_interval_k", self.freezing_interval_k),
        ];
        for (name, value) in positive {
            if !(value.is_finite() && value > 0.0) {
                return Err(format!(
                    "layer {index}: {name} is {value}; it must be a positive finite number"
                ));
            }
        }
        if !(self.latent_heat_j_per_m3.is_finite() && self.latent_heat_j_per_m3 >= 0.0) {
            return Err(format!(
                "layer {index}: latent_heat_j_per_m3 is {}; it must be zero or a positive finite number",
                self.latent_heat_j_per_m3
            ));
        }
        let thickness_ok = self.thickness_m.is_finite() && self.thickness_m > 0.0;
        if !is_last && !thickness_ok {
            return Err(format!(
                "layer {index}: thickness_m is {}; every layer but the last needs a positive thickness",
                self.thickness_m
            ));
        }
        Ok(())
    }
}

/// Numerical settings of [`periodic_profile`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ColumnOptions {
    /// Report temperatures from the surface down to this depth, m.
    pub depth_m: f64,
    /// Size of the surface cell, m; cells grow geometrically below it.
    pub cell_size_m: f64,
    /// Implicit time steps per 365-day year (1460 = 6 h steps).
    pub steps_per_year: usize,
    /// Give up (with an error) after simulating this many years.
    pub max_years: usize,
    /// Convergence: largest change of any daily cell temperature between two
    /// consecutive years, K.
    pub tolerance_k: f64,
}

impl ColumnOptions {
    fn validate(&self) -> Result<(), String> {
        if !(self.depth_m.is_finite() && self.depth_m > 0.0) {
            return Err(format!(
                "depth_m is {}; it must be a positive finite depth in metres",
                self.depth_m
            ));
        }
        if !(self.cell_size_m.is_finite() && self.cell_size_m > 0.0) || self.cell_size_m > 0.25 * self.depth_m
        {
            return Err(format!(
                "cell_size_m is {}; it must be positive and at most a quarter of depth_m ({} m)",
                self.cell_size_m, self.depth_m
            ));
        }
        if self.steps_per_year < 52 {
            return Err(format!(
                "steps_per_year is {}; at least 52 (weekly) steps are needed, 1460 (6 h) is typical",
                self.steps_per_year
            ));
        }
        if self.max_years < 2 {
            return Err(
                "max_years must be at least 2, because convergence compares two consecutive years".into(),
            );
        }
        if !(self.tolerance_k.is_finite() && self.tolerance_k > 0.0) {
            return Err(format!(
                "tolerance_k is {}; it must be a positive temperature difference in K",
                self.tolerance_k
            ));
        }
        Ok(())
    }
}

/// The annually repeating ground temperature, one profile per day.
#[derive(Debug, Clone, PartialEq)]
pub struct PeriodicProfile {
    /// Reported depths, m: the surface (0), the cell centres above `depth_m`, and
    /// `depth_m` itself.
    pub depths_m: Vec<f64>,
    /// Number of daily profiles (365).
    pub days: usize,
    /// `temperatures_c[day][node]`, °C; day `i` is the instant `t = i·86 400 s`
    /// (00:00 on day of year `i + 1`).
    pub temperatures_c: Vec<Vec<f64>>,
    /// Years simulated until two consecutive years agreed within the tolerance.
    pub years_to_converge: usize,
    /// |heat in at the surface and bottom − change of stored enthalpy| divided by
    /// the heat throughput (Σ|surface flux|·Δt + Σ|bottom flux|·Δt), last year.
    pub energy_balance_relative_error: f64,
}

impl PeriodicProfile {
    /// For every reported depth: `(depth_m, annual mean, minimum, maximum)` in °C,
    /// taken over the daily profiles.
    pub fn mean_min_max(&self) -> Vec<(f64, f64, f64, f64)> {
        self.depths_m
            .iter()
            .enumerate()
            .map(|(node, &z)| {
                let mut sum = 0.0;
                let mut lo = f64::INFINITY;
                let mut hi = f64::NEG_INFINITY;
                for day in &self.temperatures_c {
                    let t = day[node];
                    sum += t;
                    lo = lo.min(t);
                    hi = hi.max(t);
                }
                (z, sum / self.temperatures_c.len() as f64, lo, hi)
            })
            .collect()
    }

    /// Temperature (°C) at depth `depth_m` (m) and time `t_s` (s after 1 January
    /// 00:00, taken modulo the 365-day year), interpolated linearly in depth and in
    /// time between the daily profiles. Returns NaN for a depth outside
    /// `[0, depths_m.last()]` or a non-finite input.
    pub fn at(&self, depth_m: f64, t_s: f64) -> f64 {
        let (Some(&top), Some(&bottom)) = (self.depths_m.first(), self.depths_m.last()) else {
            return f64::NAN;
        };
        if !depth_m.is_finite() || !t_s.is_finite() || depth_m < top || depth_m > bottom {
            return f64::NAN;
        }
        let days = self.temperatures_c.len();
        if days == 0 {
            return f64::NAN;
        }
        let upper = self.depths_m.partition_point(|&z| z < depth_m).max(1);
        let (z0, z1) = (self.depths_m[upper - 1], self.depths_m[upper]);
        let wz = if z1 > z0 { (depth_m - z0) / (z1 - z0) } else { 0.0 };
        let day_f = t_s.rem_euclid(YEAR_S) / DAY_S;
        let d0 = (day_f.floor() as usize) % days;
        let d1 = (d0 + 1) % days;
        let wt = day_f - day_f.floor();
        let in_depth = |d: usize| {
            let row = &self.temperatures_c[d];
            row[upper - 1] + wz * (row[upper] - row[upper - 1])
        };
        in_depth(d0) + wt * (in_depth(d1) - in_depth(d0))
    }

    /// Deepest depth (m) reached by the isotherm `threshold_c` over the year (for
    /// 0 °C: the frost penetration depth), interpolated where the annual minimum
    /// crosses the threshold. `Some(0.0)` if the surface never goes below it;
    /// `None` if the annual minimum is still below it at the deepest reported depth.
    pub fn frost_penetration_m(&self, threshold_c: f64) -> Option<f64> {
        let envelope = self.mean_min_max();
        let first = envelope.first()?;
        if first.2 >= threshold_c {
            return Some(0.0);
        }
        envelope.windows(2).find_map(|pair| {
            let (za, _, min_a, _) = pair[0];
            let (zb, _, min_b, _) = pair[1];
            (min_a < threshold_c && min_b >= threshold_c)
                .then(|| za + (threshold_c - min_a) / (min_b - min_a) * (zb - za))
        })
    }
}

/// Numerical settings of [`step_response`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StepOptions {
    /// Depth of the insulated bottom, m (deep enough that the step does not reach it).
    pub domain_depth_m: f64,
    /// Size of the surface cell, m.
    pub cell_size_m: f64,
    /// Duration of the simulation, s.
    pub duration_s: f64,
    /// Number of implicit time steps.
    pub steps: usize,
}

/// Frozen depth against time after a sudden change of the surface temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct StepResponse {
    /// End time of every step, s.
    pub times_s: Vec<f64>,
    /// Frozen thickness (m) at those times: Σ cell width × frozen fraction, which is
    /// the depth of the half-frozen point when the freezing zone is thin.
    pub frost_depth_m: Vec<f64>,
    /// |heat in − change of stored enthalpy| / heat throughput over the run.
    pub energy_balance_relative_error: f64,
}

/// Freezing of a column held at a constant `surface_c` (°C) from a uniform initial
/// temperature `initial_c` (°C), with an insulated bottom: the frozen thickness
/// against time. Same discretisation as [`periodic_profile`]; meant to be checked
/// against Neumann's two-phase solution (Carslaw & Jaeger 1959 §11.2).
pub fn step_response(
    layers: &[ColumnLayer],
    initial_c: f64,
    surface_c: f64,
    opts: &StepOptions,
) -> Result<StepResponse, String> {
    validate_layers(layers)?;
    if !initial_c.is_finite() || !surface_c.is_finite() {
        return Err("the initial and surface temperatures must be finite numbers in °C".into());
    }
    if !(opts.domain_depth_m.is_finite() && opts.domain_depth_m > 0.0) {
        return Err(format!(
            "domain_depth_m is {}; it must be a positive depth in metres",
            opts.domain_depth_m
        ));
    }
    if !(opts.cell_size_m.is_finite() && opts.cell_size_m > 0.0)
        || opts.cell_size_m > 0.25 * opts.domain_depth_m
    {
        return Err(format!(
            "cell_size_m is {}; it must be positive and at most a quarter of domain_depth_m",
            opts.cell_size_m
        ));
    }
    if !(opts.duration_s.is_finite() && opts.duration_s > 0.0) || opts.steps == 0 {
        return Err("duration_s must be positive and steps at least 1".into());
    }
    let grid = Grid::build(layers, opts.cell_size_m, opts.domain_depth_m, &[])?;
    let mut column = Column::new(&grid, layers, &vec![initial_c; grid.cells()]);
    let dt = opts.duration_s / opts.steps as f64;
    let stored_start = column.stored_j_m2();
    let mut heat_in = 0.0;
    let mut throughput = 0.0;
    let mut times_s = Vec::with_capacity(opts.steps);
    let mut frost_depth_m = Vec::with_capacity(opts.steps);
    for n in 0..opts.steps {
        let flux = column.step(dt, surface_c, 0.0)?;
        heat_in += dt * flux.surface_w_per_m2;
        throughput += dt * flux.surface_w_per_m2.abs();
        times_s.push((n + 1) as f64 * dt);
        frost_depth_m.push(column.frozen_thickness_m());
    }
    let imbalance = (heat_in - (column.stored_j_m2() - stored_start)).abs();
    Ok(StepResponse {
        times_s,
        frost_depth_m,
        energy_balance_relative_error: relative(imbalance, throughput),
    })
}

/// The periodic (annually repeating) temperature profile of a layered, possibly
/// freezing soil column under the surface temperature `surface_c(t_s)` (°C, `t_s` in
/// s after 1 January 00:00, sampled on `[0, 365 d)` and treated as periodic) and an
/// upward geothermal heat flux `geothermal_flux_w_per_m2` (W/m², positive upward, so the
/// ground warms with depth). See the module documentation for the method.
pub fn periodic_profile(
    layers: &[ColumnLayer],
    surface_c: &dyn Fn(f64) -> f64,
    geothermal_flux_w_per_m2: f64,
    opts: &ColumnOptions,
) -> Result<PeriodicProfile, String> {
    validate_layers(layers)?;
    opts.validate()?;
    if !geothermal_flux_w_per_m2.is_finite() {
        return Err("the geothermal flux must be a finite number of W/m²".into());
    }
    let steps = opts.steps_per_year;
    let dt = YEAR_S / steps as f64;
    let surface_at_step = sample_surface(surface_c, steps, dt)?;
    let surface_at_day = sample_surface(surface_c, DAYS_PER_YEAR, DAY_S)?;

    let max_diffusivity = layers
        .iter()
        .map(|l| (l.conductivity / l.heat_capacity).max(l.frozen_conductivity / l.frozen_heat_capacity))
        .fold(0.0, f64::max);
    let bottom_m = (2.0 * opts.depth_m).max(opts.depth_m + 5.0 * damping_depth_m(max_diffusivity, YEAR_S));
    let grid = Grid::build(layers, opts.cell_size_m, bottom_m, &[opts.depth_m])?;

    let initial = initial_temperatures(&grid, layers, &surface_at_step, dt, geothermal_flux_w_per_m2);
    let mut column = Column::new(&grid, layers, &initial);
    let mut previous_days: Option<Vec<Vec<f64>>> = None;
    let mut last_change = f64::INFINITY;

    for year in 1..=opts.max_years {
        let stored_start = column.stored_j_m2();
        let mut stats = YearStatistics::new(column.t.len());
        let mut days = Vec::with_capacity(DAYS_PER_YEAR);
        days.push(column.t.clone());
        let mut heat_in = 0.0;
        let mut throughput = 0.0;
        for n in 0..steps {
            // Day `d` lies in this step when n·365 < d·steps ≤ (n+1)·365.
            let next_day = days.len();
            let day_in_step = next_day < DAYS_PER_YEAR && next_day * steps <= (n + 1) * DAYS_PER_YEAR;
            let before = day_in_step.then(|| column.t.clone());
            let flux = column.step(dt, surface_at_step[(n + 1) % steps], geothermal_flux_w_per_m2)?;
            heat_in += dt * (flux.surface_w_per_m2 + flux.bottom_w_per_m2);
            throughput += dt * (flux.surface_w_per_m2.abs() + flux.bottom_w_per_m2.abs());
            stats.add(&column);
            if let Some(before) = before {
                let mut d = next_day;
                while d < DAYS_PER_YEAR && d * steps <= (n + 1) * DAYS_PER_YEAR {
                    let w = (d * steps - n * DAYS_PER_YEAR) as f64 / DAYS_PER_YEAR as f64;
                    days.push(
                        before
                            .iter()
                            .zip(&column.t)
                            .map(|(a, b)| a + w * (b - a))
                            .collect(),
                    );
                    d += 1;
                }
            }
        }
        let imbalance = (heat_in - (column.stored_j_m2() - stored_start)).abs();
        let balance = relative(imbalance, throughput);

        if let Some(previous) = &previous_days {
            last_change = max_abs_difference(previous, &days);
            if last_change < opts.tolerance_k {
                return Ok(report(
                    &grid,
                    &column,
                    &days,
                    &surface_at_day,
                    opts.depth_m,
                    year,
                    balance,
                ));
            }
        }
        column.correct_deep_mean(&stats, geothermal_flux_w_per_m2);
        previous_days = Some(days);
    }
    Err(format!(
        "the column did not reach its periodic state within {} years (last year-to-year change {:.3e} K, tolerance {:.3e} K); allow more years or a looser tolerance",
        opts.max_years, last_change, opts.tolerance_k
    ))
}

fn validate_layers(layers: &[ColumnLayer]) -> Result<(), String> {
    if layers.is_empty() {
        return Err("at least one soil layer is needed".into());
    }
    let last = layers.len() - 1;
    layers
        .iter()
        .enumerate()
        .try_for_each(|(i, l)| l.validate(i, i == last))
}

fn sample_surface(surface_c: &dyn Fn(f64) -> f64, count: usize, interval_s: f64) -> Result<Vec<f64>, String> {
    (0..count)
        .map(|n| {
            let t_s = n as f64 * interval_s;
            let value = surface_c(t_s);
            if value.is_finite() {
                Ok(value)
            } else {
                Err(format!(
                    "the surface temperature at t = {t_s} s is {value}; it must be a finite number of °C"
                ))
            }
        })
        .collect()
}

fn relative(imbalance: f64, throughput: f64) -> f64 {
    if throughput > 0.0 {
        imbalance / throughput
    } else {
        imbalance
    }
}

fn max_abs_difference(a: &[Vec<f64>], b: &[Vec<f64>]) -> f64 {
    a.iter()
        .zip(b)
        .flat_map(|(ra, rb)| ra.iter().zip(rb).map(|(x, y)| (x - y).abs()))
        .fold(0.0, f64::max)
}

/// Start of the spin-up: the closed-form annual wave of the first layer (using the
/// first harmonic of the sampled surface temperature) on top of the steady
/// geothermal profile `T_mean + q·∫dz/k` (unfrozen conductivities).
fn initial_temperatures(
    grid: &Grid,
    layers: &[ColumnLayer],
    surface_at_step: &[f64],
    dt: f64,
    geothermal_flux_w_per_m2: f64,
) -> Vec<f64> {
    let wave = first_harmonic(surface_at_step, dt);
    let top = &layers[0];
    let diffusivity = top.conductivity / top.heat_capacity;
    let mut resistance = 0.0;
    grid.widths_m
        .iter()
        .zip(&grid.centres_m)
        .zip(&grid.layer_of_cell)
        .map(|((&w, &z), &layer)| {
            let half = 0.5 * w / layers[layer].conductivity;
            let r_centre = resistance + half;
            resistance += 2.0 * half;
            wave.ground_c(z, 0.0, diffusivity, 0.0) + geothermal_flux_w_per_m2 * r_centre
        })
        .collect()
}

/// Mean and first Fourier harmonic of equally spaced samples over one year,
/// expressed as an [`AnnualWave`].
fn first_harmonic(samples: &[f64], dt: f64) -> AnnualWave {
    let n = samples.len() as f64;
    let omega = 2.0 * std::f64::consts::PI / YEAR_S;
    let (mut mean, mut a, mut b) = (0.0, 0.0, 0.0);
    for (i, &s) in samples.iter().enumerate() {
        let phase = omega * i as f64 * dt;
        mean += s / n;
        a += 2.0 * s * phase.cos() / n;
        b += 2.0 * s * phase.sin() / n;
    }
    // mean + a·cos(ωt) + b·sin(ωt) = mean − R·cos(ωt − φ + π) with φ = atan2(b, a).
    let amplitude = a.hypot(b);
    let coldest_s = (b.atan2(a) + std::f64::consts::PI).rem_euclid(2.0 * std::f64::consts::PI) / omega;
    AnnualWave {
        mean_c: mean,
        amplitude_k: amplitude,
        coldest_day: coldest_s / DAY_S + 1.0,
        period_s: YEAR_S,
    }
}

/// Builds the output: surface value, cell centres above the reporting depth, and
/// the face temperature at the reporting depth (flux-consistent weighting).
fn report(
    grid: &Grid,
    column: &Column,
    days: &[Vec<f64>],
    surface_at_day: &[f64],
    depth_m: f64,
    years: usize,
    balance: f64,
) -> PeriodicProfile {
    let face = grid.face_index(depth_m);
    let mut depths_m = Vec::with_capacity(face + 2);
    depths_m.push(0.0);
    depths_m.extend_from_slice(&grid.centres_m[..face]);
    depths_m.push(grid.faces_m[face]);
    let temperatures_c = days
        .iter()
        .zip(surface_at_day)
        .map(|(cells, &surface)| {
            let mut row = Vec::with_capacity(face + 2);
            row.push(surface);
            row.extend_from_slice(&cells[..face]);
            row.push(column.face_temperature_c(face, cells));
            row
        })
        .collect();
    PeriodicProfile {
        depths_m,
        days: days.len(),
        temperatures_c,
        years_to_converge: years,
        energy_balance_relative_error: balance,
    }
}

/// The shared enthalpy material of a validated layer.
fn layer_material(l: &ColumnLayer) -> Material {
    Material::from_parts(
        l.conductivity,
        l.frozen_conductivity,
        l.heat_capacity,
        l.frozen_heat_capacity,
        l.latent_heat_j_per_m3,
        l.freezing_interval_k,
    )
}

/// Cell-centred grid with faces on layer interfaces and on requested depths.
#[derive(Debug, Clone)]
struct Grid {
    faces_m: Vec<f64>,
    widths_m: Vec<f64>,
    centres_m: Vec<f64>,
    layer_of_cell: Vec<usize>,
}

impl Grid {
    /// Stretched coordinate s(z) = ∫₀ᶻ dz'/h(z') for h(z) = h₀·min(1 + z/L, F).
    fn stretched(z: f64, h0: f64) -> f64 {
        let z_cap = (MAX_CELL_FACTOR - 1.0) * GROWTH_LENGTH_M;
        if z <= z_cap {
            GROWTH_LENGTH_M / h0 * (1.0 + z / GROWTH_LENGTH_M).ln()
        } else {
            GROWTH_LENGTH_M / h0 * MAX_CELL_FACTOR.ln() + (z - z_cap) / (MAX_CELL_FACTOR * h0)
        }
    }

    /// Inverse of [`Self::stretched`].
    fn unstretched(s: f64, h0: f64) -> f64 {
        let z_cap = (MAX_CELL_FACTOR - 1.0) * GROWTH_LENGTH_M;
        let s_cap = Self::stretched(z_cap, h0);
        if s <= s_cap {
            GROWTH_LENGTH_M * ((s * h0 / GROWTH_LENGTH_M).exp() - 1.0)
        } else {
            z_cap + (s - s_cap) * MAX_CELL_FACTOR * h0
        }
    }

    fn build(
        layers: &[ColumnLayer],
        cell_size_m: f64,
        bottom_m: f64,
        extra_faces_m: &[f64],
    ) -> Result<Self, String> {
        let mut interfaces = Vec::new();
        let mut depth = 0.0;
        for layer in &layers[..layers.len() - 1] {
            depth += layer.thickness_m;
            interfaces.push(depth);
        }
        let mut breaks: Vec<f64> = interfaces
            .iter()
            .chain(extra_faces_m)
            .copied()
            .filter(|&z| z > 0.0 && z < bottom_m)
            .collect();
        breaks.push(0.0);
        breaks.push(bottom_m);
        breaks.sort_by(f64::total_cmp);
        breaks.dedup_by(|a, b| (*a - *b).abs() <= 1e-9 * bottom_m);

        let mut faces_m = vec![0.0];
        for pair in breaks.windows(2) {
            let (sa, sb) = (
                Self::stretched(pair[0], cell_size_m),
                Self::stretched(pair[1], cell_size_m),
            );
            let n = ((sb - sa) - 1e-9).ceil().max(1.0) as usize;
            if faces_m.len() + n > MAX_CELLS {
                return Err(format!(
                    "cell_size_m = {cell_size_m} m would need more than {MAX_CELLS} cells; use a larger surface cell"
                ));
            }
            for j in 1..n {
                faces_m.push(Self::unstretched(
                    sa + (sb - sa) * j as f64 / n as f64,
                    cell_size_m,
                ));
            }
            faces_m.push(pair[1]);
        }
        let widths_m: Vec<f64> = faces_m.windows(2).map(|f| f[1] - f[0]).collect();
        let centres_m: Vec<f64> = faces_m.windows(2).map(|f| 0.5 * (f[0] + f[1])).collect();
        let layer_of_cell = centres_m
            .iter()
            .map(|&z| interfaces.partition_point(|&top| top <= z))
            .collect();
        Ok(Self {
            faces_m,
            widths_m,
            centres_m,
            layer_of_cell,
        })
    }

    fn cells(&self) -> usize {
        self.widths_m.len()
    }

    /// Index of the face closest to depth `z_m`.
    fn face_index(&self, z_m: f64) -> usize {
        let i = self.faces_m.partition_point(|&f| f < z_m);
        if i > 0 && (self.faces_m[i - 1] - z_m).abs() < (self.faces_m[i] - z_m).abs() {
            i - 1
        } else {
            i.min(self.faces_m.len() - 1)
        }
    }
}

/// Net heat flows of one time step, W/m², positive into the soil.
#[derive(Debug, Clone, Copy)]
struct StepFlux {
    surface_w_per_m2: f64,
    bottom_w_per_m2: f64,
}

/// Column state (enthalpy and temperature per cell) and work arrays.
#[derive(Debug, Clone)]
struct Column {
    widths_m: Vec<f64>,
    cells: Vec<Material>,
    /// Cells whose material has one linear H(T) and constant k.
    linear: Vec<bool>,
    h: Vec<f64>,
    t: Vec<f64>,
    h_old: Vec<f64>,
    /// Cell width / time step, m/s, for `storage_dt_s`.
    storage: Vec<f64>,
    storage_dt_s: f64,
    /// Conductivity used for `half_resistance` (NaN before the first step).
    k: Vec<f64>,
    k_changed: Vec<bool>,
    cap: Vec<f64>,
    half_resistance: Vec<f64>,
    /// Series conductance between cells i and i + 1, W/(m²·K).
    conductance: Vec<f64>,
    diag: Vec<f64>,
    rhs: Vec<f64>,
    solution: Vec<f64>,
    scratch: Vec<f64>,
}

impl Column {
    fn new(grid: &Grid, layers: &[ColumnLayer], t_c: &[f64]) -> Self {
        let cells: Vec<Material> = grid
            .layer_of_cell
            .iter()
            .map(|&l| layer_material(&layers[l]))
            .collect();
        let n = cells.len();
        let h = cells
            .iter()
            .zip(t_c)
            .map(|(m, &t)| m.enthalpy_j_per_m3(t))
            .collect();
        Self {
            widths_m: grid.widths_m.clone(),
            linear: cells.iter().map(Material::is_linear).collect(),
            cells,
            h,
            t: t_c.to_vec(),
            h_old: vec![0.0; n],
            storage: vec![0.0; n],
            storage_dt_s: f64::NAN,
            k: vec![f64::NAN; n],
            k_changed: vec![true; n],
            cap: vec![0.0; n],
            half_resistance: vec![0.0; n],
            conductance: vec![0.0; n.saturating_sub(1)],
            diag: vec![0.0; n],
            rhs: vec![0.0; n],
            solution: vec![0.0; n],
            scratch: vec![0.0; n],
        }
    }

    /// Stored enthalpy per unit area, J/m².
    fn stored_j_m2(&self) -> f64 {
        self.widths_m.iter().zip(&self.h).map(|(w, h)| w * h).sum()
    }

    /// Spin-up acceleration: corrects the annual mean below the seasonally
    /// freezing and thawing zone so that every face carries the geothermal flux.
    ///
    /// Summing the backward-Euler steps over a periodic year, the stored enthalpy
    /// returns to its start, so the annual-mean upward flux through every internal
    /// face equals the bottom flux q. During spin-up the deficit `q − F̄` reveals
    /// the slow drift of the deep mean (time constant ≈ 4L²/(π²α), decades for a
    /// 30 m column, centuries where deep ground sits in its freezing range).
    /// Below the deepest cell that moved between frozen, freezing and unfrozen
    /// during the year (the "anchor"), each cell is shifted by `δ` with
    /// `δ_anchor = 0`, `δᵢ₊₁ = δᵢ + (q − F̄ᵢ₊½)/Ḡᵢ₊½` (Ḡ: annual-mean face
    /// conductance), a Newton step on the annual-mean flux balance. In cells that
    /// stay unfrozen or frozen the problem is linear and a uniform shift is a steady
    /// solution, so the periodic part is untouched and the step is exact; its fixed
    /// point is the periodic state itself (`F̄ = q`).
    fn correct_deep_mean(&mut self, stats: &YearStatistics, geothermal_flux_w_per_m2: f64) {
        let n = self.cells.len();
        let crossed = |i: usize| {
            let m = &self.cells[i];
            !self.linear[i] && m.piece(stats.lo[i]) != m.piece(stats.hi[i])
        };
        let anchor = (0..n).rev().find(|&i| crossed(i)).map_or(0, |i| i + 1);
        let mut shift = 0.0;
        for i in anchor..n.saturating_sub(1) {
            let mean_flux = stats.flux_sum[i] / stats.count as f64;
            let mean_conductance = stats.conductance_sum[i] / stats.count as f64;
            shift += (geothermal_flux_w_per_m2 - mean_flux) / mean_conductance;
            let cell = i + 1;
            self.t[cell] += shift;
            self.h[cell] = self.cells[cell].enthalpy_j_per_m3(self.t[cell]);
        }
    }

    /// Temperature of face `face` (between cells `face − 1` and `face`) for the cell
    /// temperatures `t_c`, weighted by the half-cell conductances so that the flux
    /// through the face is continuous.
    fn face_temperature_c(&self, face: usize, t_c: &[f64]) -> f64 {
        if face == 0 || face >= t_c.len() {
            return t_c[face.min(t_c.len() - 1)];
        }
        let (a, b) = (face - 1, face);
        let ga = self.cells[a].conductivity(t_c[a]) / (0.5 * self.widths_m[a]);
        let gb = self.cells[b].conductivity(t_c[b]) / (0.5 * self.widths_m[b]);
        (ga * t_c[a] + gb * t_c[b]) / (ga + gb)
    }

    /// Frozen thickness Σ width·(1 − liquid fraction), m.
    fn frozen_thickness_m(&self) -> f64 {
        self.widths_m
            .iter()
            .zip(&self.cells)
            .zip(&self.t)
            .map(|((w, m), &t)| w * (1.0 - m.liquid_fraction(t)))
            .sum()
    }

    /// One backward-Euler step of length `dt_s` with the surface held at
    /// `surface_c` and `bottom_flux_w_per_m2` entering at the bottom.
    fn step(&mut self, dt_s: f64, surface_c: f64, bottom_flux_w_per_m2: f64) -> Result<StepFlux, String> {
        let n = self.cells.len();
        self.h_old.copy_from_slice(&self.h);
        if dt_s != self.storage_dt_s {
            for (storage, w) in self.storage.iter_mut().zip(&self.widths_m) {
                *storage = w / dt_s;
            }
            self.storage_dt_s = dt_s;
        }
        for iteration in 0..MAX_ITERATIONS {
            // Conductances are recomputed only where a cell's k has changed.
            let mut any_changed = false;
            for i in 0..n {
                let m = &self.cells[i];
                let k = m.conductivity(self.t[i]);
                self.cap[i] = m.capacity(self.t[i]);
                self.k_changed[i] = k != self.k[i];
                if self.k_changed[i] {
                    any_changed = true;
                    self.k[i] = k;
                    self.half_resistance[i] = 0.5 * self.widths_m[i] / k;
                }
            }
            if any_changed {
                for i in 0..n - 1 {
                    if self.k_changed[i] || self.k_changed[i + 1] {
                        self.conductance[i] = 1.0 / (self.half_resistance[i] + self.half_resistance[i + 1]);
                    }
                }
            }
            let surface_conductance = 1.0 / self.half_resistance[0];
            for i in 0..n {
                let storage = self.storage[i];
                let above = if i == 0 {
                    surface_conductance
                } else {
                    self.conductance[i - 1]
                };
                let below = if i + 1 < n { self.conductance[i] } else { 0.0 };
                self.diag[i] = storage * self.cap[i] + above + below;
                self.rhs[i] = storage * (self.cap[i] * self.t[i] - self.h[i] + self.h_old[i]);
            }
            self.rhs[0] += surface_conductance * surface_c;
            self.rhs[n - 1] += bottom_flux_w_per_m2;
            solve_symmetric_tridiagonal(
                &self.diag,
                &self.conductance,
                &self.rhs,
                &mut self.solution,
                &mut self.scratch,
            );
            let surface_w_per_m2 = surface_conductance * (surface_c - self.solution[0]);
            let mut change: f64 = 0.0;
            // The linearisation was exact if no cell left its linear piece of H(T)
            // and no cell sits where k varies with T (inside the freezing range).
            let mut exact = true;
            for i in 0..n {
                let m = &self.cells[i];
                let (h_new, t_new) = m.linearised_update(self.h[i], self.t[i], self.solution[i]);
                self.h[i] = h_new;
                exact &= self.linear[i] || m.linearisation_exact(self.t[i], t_new);
                change = change.max((t_new - self.t[i]).abs());
                self.t[i] = t_new;
            }
            if !change.is_finite() {
                return Err("the column temperatures became non-finite; check the layer properties".into());
            }
            if exact || (iteration > 0 && change < ITERATION_TOLERANCE_K) {
                return Ok(StepFlux {
                    surface_w_per_m2,
                    bottom_w_per_m2: bottom_flux_w_per_m2,
                });
            }
        }
        Err(format!(
            "the freezing iteration did not converge in {MAX_ITERATIONS} iterations; use shorter time steps"
        ))
    }
}

/// Thomas algorithm for the symmetric tridiagonal system
/// `−g[i−1]·x[i−1] + diag[i]·x[i] − g[i]·x[i+1] = rhs[i]` (diagonally dominant:
/// `diag[i] ≥ g[i−1] + g[i]`, so no pivoting is needed).
fn solve_symmetric_tridiagonal(diag: &[f64], g: &[f64], rhs: &[f64], x: &mut [f64], c_prime: &mut [f64]) {
    let n = diag.len();
    let mut inverse = 1.0 / diag[0];
    c_prime[0] = if n > 1 { -g[0] * inverse } else { 0.0 };
    x[0] = rhs[0] * inverse;
    for i in 1..n {
        inverse = 1.0 / (diag[i] + g[i - 1] * c_prime[i - 1]);
        c_prime[i] = if i + 1 < n { -g[i] * inverse } else { 0.0 };
        x[i] = (rhs[i] + g[i - 1] * x[i - 1]) * inverse;
    }
    for i in (0..n - 1).rev() {
        x[i] -= c_prime[i] * x[i + 1];
    }
}

/// Per-year statistics over the backward-Euler steps: the range of every cell
/// temperature and, per internal face, the sums of the upward heat flux and of the
/// conductance of the solved systems.
#[derive(Debug, Clone)]
struct YearStatistics {
    lo: Vec<f64>,
    hi: Vec<f64>,
    flux_sum: Vec<f64>,
    conductance_sum: Vec<f64>,
    count: usize,
}

impl YearStatistics {
    fn new(cells: usize) -> Self {
        let faces = cells.saturating_sub(1);
        Self {
            lo: vec![f64::INFINITY; cells],
            hi: vec![f64::NEG_INFINITY; cells],
            flux_sum: vec![0.0; faces],
            conductance_sum: vec![0.0; faces],
            count: 0,
        }
    }

    /// Adds the state after one step of `column`.
    fn add(&mut self, column: &Column) {
        for (i, &t) in column.t.iter().enumerate() {
            self.lo[i] = self.lo[i].min(t);
            self.hi[i] = self.hi[i].max(t);
        }
        for i in 0..self.flux_sum.len() {
            let g = column.conductance[i];
            self.flux_sum[i] += g * (column.solution[i + 1] - column.solution[i]);
            self.conductance_sum[i] += g;
        }
        self.count += 1;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grid_puts_interfaces_and_report_depth_on_faces() {
        let layers = [ColumnLayer::dry(0.77, 1.0, 2e6), ColumnLayer::dry(1.0, 2.0, 2e6)];
        let g = Grid::build(&layers, 0.02, 30.0, &[15.0]).unwrap();
        for z in [0.77, 15.0, 30.0] {
            assert!(g.faces_m.iter().any(|&f| (f - z).abs() < 1e-12), "{z}");
        }
        assert!(g.widths_m[0] <= 0.02 + 1e-12);
        assert!(g.widths_m.iter().all(|&w| w <= 16.0 * 0.02 + 1e-9));
        assert_eq!(g.layer_of_cell[0], 0);
        assert_eq!(*g.layer_of_cell.last().unwrap(), 1);
    }
}
