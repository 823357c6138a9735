//! Temporal superposition of borehole heat loads on a step response.
//!
//! The step response h(t) (K per W/m, i.e. g(t)/(2πλ) for a g-function g and ground
//! conductivity λ) is the rise of the mean borehole-wall temperature after a unit heat rate
//! per metre of borehole is switched on at t = 0. Loads are heat rates **to the ground** per
//! metre of borehole, W/m: positive when heat is injected (cooling mode), negative when it is
//! extracted (heating mode), as in burrow's `heat_to_ground`.
//!
//! For loads q'_i held constant over the fixed steps ((i−1)Δt, iΔt], i = 1..N, the wall
//! temperature at the end of step n is (Duhamel's superposition, e.g. Eskilson 1987, ch. 3):
//!
//! T_b(nΔt) = T₀ + Σ_{i=1..n} (q'_i − q'_{i−1}) h((n − i + 1)Δt),  q'_0 = 0.
//!
//! Three evaluations of that sum are provided:
//! - [`wall_temperature_change_direct`]: the sum itself, O(N²), the exact reference;
//! - [`wall_temperature_change_fft`]: the same linear convolution by FFT (rustfft), O(N log N);
//! - [`wall_temperature_change_aggregated`]: the load-aggregation scheme of Claesson & Javed
//!   (2012), O(N log N) with a small approximation error.
//!
//! [`monthly_fluid_temperatures`] superposes monthly mean loads and a peak pulse at the end of
//! each month and returns mean, inlet and outlet fluid temperatures.

use rustfft::{Fft, FftPlanner, num_complex::Complex};
use std::sync::{Arc, Mutex, OnceLock};

/// Length of one model month: a 365-day year divided into twelve equal months (730 h), s.
pub use crate::numerics::time::MONTH_S;

/// Cells per level used by default in the load aggregation: 16 keeps the error below 0.05 K over
/// 25 years of hourly loads (measured in `tests/superposition.rs`: 0.035 K; 8 cells gave 0.057 K).
pub const DEFAULT_CELLS_PER_LEVEL: usize = 16;

/// A step response h(t) of the borehole wall, K per W/m, for t > 0 in seconds.
pub trait StepResponse {
    /// h(t_s), K m/W.
    fn at_k_m_per_w(&self, t_s: f64) -> Result<f64, String>;
}

impl<F: Fn(f64) -> f64> StepResponse for F {
    fn at_k_m_per_w(&self, t_s: f64) -> Result<f64, String> {
        let value = self(t_s);
        if value.is_finite() {
            Ok(value)
        } else {
            Err(format!(
                "the step response at t = {t_s} s is {value}; it must be a finite number"
            ))
        }
    }
}

/// A step response given as a table of (t, h) pairs.
///
/// Between points h is interpolated linearly in ln t (g-functions are smooth in ln t); below the
/// first time, linearly in t from h(0) = 0; beyond the last time it is not extrapolated.
#[derive(Clone, Debug, PartialEq)]
pub struct TabulatedStepResponse {
    times_s: Vec<f64>,
    values_k_m_per_w: Vec<f64>,
}

impl TabulatedStepResponse {
    /// Times must be positive and strictly increasing, values finite; at least two points.
    pub fn new(times_s: Vec<f64>, values_k_m_per_w: Vec<f64>) -> Result<Self, String> {
        if times_s.len() != values_k_m_per_w.len() || times_s.len() < 2 {
            return Err(format!(
                "the step-response table has {} times and {} values; give the same number of each, at least two",
                times_s.len(),
                values_k_m_per_w.len()
            ));
        }
        if !(times_s[0].is_finite() && times_s[0] > 0.0)
            || times_s.windows(2).any(|w| !(w[1].is_finite() && w[1] > w[0]))
        {
            return Err("the step-response times must be positive and strictly increasing".into());
        }
        if values_k_m_per_w.iter().any(|v| !v.is_finite()) {
            return Err("the step-response values must be finite numbers".into());
        }
        Ok(Self {
            times_s,
            values_k_m_per_w,
        })
    }
}

impl StepResponse for TabulatedStepResponse {
    fn at_k_m_per_w(&self, t_s: f64) -> Result<f64, String> {
        let (ts, hs) = (&self.times_s, &self.values_k_m_per_w);
        let last = ts[ts.len() - 1];
        if !(t_s.is_finite() && t_s > 0.0 && t_s <= last) {
            return Err(format!(
                "the step response is asked for at t = {t_s} s; the table covers 0 to {last} s"
            ));
        }
        if t_s <= ts[0] {
            return Ok(hs[0] * t_s / ts[0]);
        }
        let i = ts.partition_point(|&t| t < t_s).clamp(1, ts.len() - 1);
        let w = (t_s / ts[i - 1]).ln() / (ts[i] / ts[i - 1]).ln();
        Ok(hs[i - 1] + w * (hs[i] - hs[i - 1]))
    }
}

/// A step response sampled at the ends of fixed time steps: `values[k] = h((k + 1) Δt)`.
#[derive(Clone, Debug, PartialEq)]
pub struct SampledStepResponse {
    step_s: f64,
    values_k_m_per_w: Vec<f64>,
}

impl SampledStepResponse {
    /// Sample `h` at Δt, 2Δt, …, `steps` Δt.
    pub fn new(h: &impl StepResponse, step_s: f64, steps: usize) -> Result<Self, String> {
        if !(step_s.is_finite() && step_s > 0.0) {
            return Err(format!(
                "the time step is {step_s} s; it must be a positive number of seconds"
            ));
        }
        let values = (1..=steps)
            .map(|k| h.at_k_m_per_w(k as f64 * step_s))
            .collect::<Result<Vec<_>, _>>()?;
        Ok(Self {
            step_s,
            values_k_m_per_w: values,
        })
    }

    pub fn step_s(&self) -> f64 {
        self.step_s
    }

    /// h((k + 1) Δt) for k = 0..len.
    pub fn values_k_m_per_w(&self) -> &[f64] {
        &self.values_k_m_per_w
    }

    fn check_covers(&self, steps: usize) -> Result<(), String> {
        if steps > self.values_k_m_per_w.len() {
            Err(format!(
                "{steps} load steps were given but the step response is sampled over {} steps; sample it over at least as many",
                self.values_k_m_per_w.len()
            ))
        } else {
            Ok(())
        }
    }
}

/// Load increments Δq'_i = q'_i − q'_{i−1} with q'_0 = 0, W/m.
pub fn load_increments(loads_w_per_m: &[f64]) -> Result<Vec<f64>, String> {
    if let Some(i) = loads_w_per_m.iter().position(|q| !q.is_finite()) {
        return Err(format!(
            "load {i} is {}; loads must be finite numbers",
            loads_w_per_m[i]
        ));
    }
    Ok(std::iter::once(loads_w_per_m.first().copied().unwrap_or(0.0))
        .chain(loads_w_per_m.windows(2).map(|w| w[1] - w[0]))
        .take(loads_w_per_m.len())
        .collect())
}

/// Borehole-wall temperature change T_b − T₀ at the end of every step, K, by the direct sum
/// T_b(n) − T₀ = Σ_{i≤n} Δq'_i h((n − i + 1)Δt). O(N²): the exact reference for short series.
pub fn wall_temperature_change_direct(
    loads_w_per_m: &[f64],
    h: &SampledStepResponse,
) -> Result<Vec<f64>, String> {
    h.check_covers(loads_w_per_m.len())?;
    let dq = load_increments(loads_w_per_m)?;
    let hv = &h.values_k_m_per_w;
    Ok((0..dq.len())
        .map(|n| (0..=n).map(|i| dq[i] * hv[n - i]).sum())
        .collect())
}

/// Borehole-wall temperature change at the end of every step, K: the same sum as
/// [`wall_temperature_change_direct`] computed as a linear convolution by FFT, O(N log N).
/// Agrees with the direct sum to rounding (≈1e-12 K). Transforms the step response on every call
/// (plans are cached per length); use [`FftConvolution`] to reuse the transformed response for
/// many load series.
pub fn wall_temperature_change_fft(
    loads_w_per_m: &[f64],
    h: &SampledStepResponse,
) -> Result<Vec<f64>, String> {
    FftConvolution::new(h, loads_w_per_m.len())?.wall_temperature_change(loads_w_per_m)
}

/// The FFT convolution with one step response, prepared for load series of a given length:
/// transform planned and the zero-padded step response transformed once, so that each load
/// series costs two complex FFTs of length 2^⌈log2 2N⌉ (the inverse runs through the forward
/// plan).
pub struct FftConvolution {
    steps: usize,
    forward: Arc<dyn Fft<f64>>,
    response_spectrum: Vec<Complex<f64>>,
    scratch_len: usize,
}

impl FftConvolution {
    /// Prepare for load series of exactly `steps` steps.
    pub fn new(h: &SampledStepResponse, steps: usize) -> Result<Self, String> {
        h.check_covers(steps)?;
        let len = (2 * steps).next_power_of_two().max(2);
        let forward = planned_forward_fft(len);
        let scratch_len = forward.get_inplace_scratch_len();
        let mut response_spectrum = zero_padded(&h.values_k_m_per_w[..steps], len);
        let mut scratch = vec![Complex::new(0.0, 0.0); scratch_len];
        forward.process_with_scratch(&mut response_spectrum, &mut scratch);
        Ok(Self {
            steps,
            forward,
            response_spectrum,
            scratch_len,
        })
    }

    /// Borehole-wall temperature change at the end of every step, K, for `loads_w_per_m`
    /// (exactly the number of steps this convolution was prepared for).
    pub fn wall_temperature_change(&self, loads_w_per_m: &[f64]) -> Result<Vec<f64>, String> {
        if loads_w_per_m.len() != self.steps {
            return Err(format!(
                "{} loads were given to a convolution prepared for {} steps; prepare one for this length",
                loads_w_per_m.len(),
                self.steps
            ));
        }
        let dq = load_increments(loads_w_per_m)?;
        let len = self.response_spectrum.len();
        let mut buffer = zero_padded(&dq, len);
        let mut scratch = vec![Complex::new(0.0, 0.0); self.scratch_len];
        self.forward.process_with_scratch(&mut buffer, &mut scratch);
        // Inverse transform through the forward plan: x = conj(FFT(conj(X)))/L; only the real
        // part is kept, so the outer conjugation is not needed.
        for (x, y) in buffer.iter_mut().zip(&self.response_spectrum) {
            *x = (*x * *y).conj();
        }
        self.forward.process_with_scratch(&mut buffer, &mut scratch);
        let scale = 1.0 / len as f64;
        Ok(buffer[..self.steps].iter().map(|c| c.re * scale).collect())
    }
}

/// A forward FFT plan of length `len`, from one planner shared by the process so that repeated
/// convolutions of the same length (a depth-sizing loop) plan only once.
fn planned_forward_fft(len: usize) -> Arc<dyn Fft<f64>> {
    static PLANNER: OnceLock<Mutex<FftPlanner<f64>>> = OnceLock::new();
    let planner = PLANNER.get_or_init(|| Mutex::new(FftPlanner::new()));
    // A poisoned lock only means another thread panicked while planning; the planner's cache
    // is still usable.
    let mut planner = planner.lock().unwrap_or_else(|poisoned| poisoned.into_inner());
    planner.plan_fft_forward(len)
}

fn zero_padded(values: &[f64], len: usize) -> Vec<Complex<f64>> {
    let mut buffer = vec![Complex::new(0.0, 0.0); len];
    for (b, v) in buffer.iter_mut().zip(values) {
        b.re = *v;
    }
    buffer
}

/// Widths (in steps) of the aggregation cells of Claesson & Javed (2012) covering `steps` steps:
/// `cells_per_level` cells of width 1, then as many of width 2, 4, 8, …; the last cell is cut so
/// that the widths add up to `steps` exactly.
pub fn aggregation_cell_widths(steps: usize, cells_per_level: usize) -> Result<Vec<usize>, String> {
    if cells_per_level == 0 {
        return Err("the number of cells per aggregation level is 0; give at least 1".into());
    }
    let mut widths = Vec::new();
    let mut covered = 0;
    let mut v = 0;
    while covered < steps {
        let width = (1usize << (v / cells_per_level).min(40)).min(steps - covered);
        widths.push(width);
        covered += width;
        v += 1;
    }
    Ok(widths)
}

/// Borehole-wall temperature change at the end of every step, K, by the load-aggregation
/// scheme of J. Claesson & S. Javed, *A load-aggregation method to calculate extraction
/// temperatures of borehole heat exchangers*, ASHRAE Trans. 118(1) (2012) 530–539 (scheme as
/// recalled, from memory):
///
/// - the past is divided into cells v = 1, 2, … (most recent first) whose widths double every
///   `cells_per_level` cells ([`aggregation_cell_widths`]); each cell holds one mean load q̄_v;
/// - each step, every cell passes the fraction Δt/width of its load on to the next older cell:
///   q̄_v ← q̄_v + (q̄_{v−1} − q̄_v)·Δt/w_v (oldest first), q̄_1 ← q'_n;
/// - T_b − T₀ = Σ_v q̄_v [h(τ_v) − h(τ_{v−1})], τ_v the age of the far edge of cell v.
///
/// Cost O(N · cells); exact when every width is 1.
pub fn wall_temperature_change_aggregated(
    loads_w_per_m: &[f64],
    h: &SampledStepResponse,
    cells_per_level: usize,
) -> Result<Vec<f64>, String> {
    let n = loads_w_per_m.len();
    h.check_covers(n)?;
    load_increments(loads_w_per_m)?;
    let widths = aggregation_cell_widths(n, cells_per_level)?;
    // Weight of each cell: h(τ_v) − h(τ_{v−1}).
    let mut weights = Vec::with_capacity(widths.len());
    let mut age = 0;
    let mut previous = 0.0;
    for &w in &widths {
        age += w;
        let value = h.values_k_m_per_w[age - 1];
        weights.push(value - previous);
        previous = value;
    }
    let shares: Vec<f64> = widths.iter().map(|&w| 1.0 / w as f64).collect();
    let mut cells = vec![0.0; widths.len()];
    let mut out = Vec::with_capacity(n);
    for &load in loads_w_per_m {
        for v in (1..cells.len()).rev() {
            cells[v] += (cells[v - 1] - cells[v]) * shares[v];
        }
        if let Some(first) = cells.first_mut() {
            *first = load;
        }
        out.push(cells.iter().zip(&weights).map(|(q, w)| q * w).sum());
    }
    Ok(out)
}

// ---------------------------------------------------------------------------------------------
// Fluid temperatures
// ---------------------------------------------------------------------------------------------

/// What turns a borehole-wall temperature into fluid temperatures.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct BoreholeOperation {
    /// Undisturbed ground temperature T₀, °C.
    pub undisturbed_c: f64,
    /// Borehole resistance used between wall and mean fluid temperature (normally the effective
    /// R_b*), m K/W.
    pub resistance_m_k_per_w: f64,
    /// Borehole length H, m.
    pub length_m: f64,
    /// ṁ c_p of the fluid through one borehole, W/K.
    pub flow_capacity_w_per_k: f64,
}

impl BoreholeOperation {
    fn validate(&self) -> Result<(), String> {
        if !self.undisturbed_c.is_finite() {
            return Err("the undisturbed ground temperature must be a finite number of °C".into());
        }
        for (what, v) in [
            ("borehole resistance (m K/W)", self.resistance_m_k_per_w),
            ("borehole length (m)", self.length_m),
            ("flow capacity ṁ c_p (W/K)", self.flow_capacity_w_per_k),
        ] {
            if !(v.is_finite() && v > 0.0) {
                return Err(format!("the {what} is {v}; it must be a positive finite number"));
            }
        }
        Ok(())
    }

    /// Fluid temperatures for wall-temperature change `wall_change_k` under load `load_w_per_m`:
    /// T_b = T₀ + ΔT_b, T_mean = T_b + q' R_b, inlet/outlet = T_mean ± Q/(2 ṁ c_p) with Q = q' H
    /// (heat given to the ground cools the fluid from inlet to outlet).
    pub fn fluid_temperatures(&self, wall_change_k: f64, load_w_per_m: f64) -> FluidTemperatures {
        let wall = self.undisturbed_c + wall_change_k;
        let mean = wall + load_w_per_m * self.resistance_m_k_per_w;
        let half_span = load_w_per_m * self.length_m / (2.0 * self.flow_capacity_w_per_k);
        FluidTemperatures {
            wall_c: wall,
            mean_c: mean,
            inlet_c: mean + half_span,
            outlet_c: mean - half_span,
        }
    }
}

/// Borehole-wall and fluid temperatures at one instant, °C.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct FluidTemperatures {
    pub wall_c: f64,
    pub mean_c: f64,
    pub inlet_c: f64,
    pub outlet_c: f64,
}

/// Fluid temperatures at the end of every step of an hourly (or any fixed-step) load series,
/// using the FFT convolution.
pub fn fluid_temperature_series(
    loads_w_per_m: &[f64],
    h: &SampledStepResponse,
    operation: &BoreholeOperation,
) -> Result<Vec<FluidTemperatures>, String> {
    operation.validate()?;
    let wall = wall_temperature_change_fft(loads_w_per_m, h)?;
    Ok(wall
        .iter()
        .zip(loads_w_per_m)
        .map(|(dt, q)| operation.fluid_temperatures(*dt, *q))
        .collect())
}

/// Monthly loads with a peak per month, W/m of borehole (heat to the ground, positive when
/// injected).
#[derive(Clone, Debug, PartialEq)]
pub struct MonthlyLoads {
    /// Mean load of each month, consecutive months of [`MONTH_S`].
    pub mean_w_per_m: Vec<f64>,
    /// Peak load of each month (the signed load held for the peak duration).
    pub peak_w_per_m: Vec<f64>,
    /// Duration of the peak, s (for example 6 h).
    pub peak_duration_s: f64,
}

/// Temperatures of one month: after the month's mean load, and at the end of its peak.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct MonthlyTemperatures {
    pub mean: FluidTemperatures,
    pub peak: FluidTemperatures,
}

/// Monthly mean and peak fluid temperatures (common practice, no source, for where the pulse
/// sits): the monthly mean loads are superposed as steps of [`MONTH_S`]; at the end of month m
/// a pulse of amplitude (peak_m − mean_m) lasting `peak_duration_s` is added, so
///
/// ΔT_b,mean(m) = Σ_{i≤m} (q̄_i − q̄_{i−1}) h((m − i + 1)·month),
/// ΔT_b,peak(m) = ΔT_b,mean(m) + (q̂_m − q̄_m) h(t_peak).
///
/// Fluid temperatures follow from [`BoreholeOperation::fluid_temperatures`] with the mean load
/// and with the peak load respectively.
pub fn monthly_fluid_temperatures(
    loads: &MonthlyLoads,
    h: &impl StepResponse,
    operation: &BoreholeOperation,
) -> Result<Vec<MonthlyTemperatures>, String> {
    operation.validate()?;
    if loads.mean_w_per_m.len() != loads.peak_w_per_m.len() {
        return Err(format!(
            "{} monthly means and {} monthly peaks were given; give one peak per month",
            loads.mean_w_per_m.len(),
            loads.peak_w_per_m.len()
        ));
    }
    if !(loads.peak_duration_s.is_finite() && loads.peak_duration_s > 0.0 && loads.peak_duration_s <= MONTH_S)
    {
        return Err(format!(
            "the peak duration is {} s; it must be positive and at most one month ({MONTH_S} s)",
            loads.peak_duration_s
        ));
    }
    if let Some(q) = loads.peak_w_per_m.iter().find(|q| !q.is_finite()) {
        return Err(format!(
            "a monthly peak load is {q}; loads must be finite numbers"
        ));
    }
    let sampled = SampledStepResponse::new(h, MONTH_S, loads.mean_w_per_m.len())?;
    let wall = wall_temperature_change_direct(&loads.mean_w_per_m, &sampled)?;
    let h_peak = h.at_k_m_per_w(loads.peak_duration_s)?;
    Ok(wall
        .iter()
        .zip(loads.mean_w_per_m.iter().zip(&loads.peak_w_per_m))
        .map(|(dt, (mean, peak))| MonthlyTemperatures {
            mean: operation.fluid_temperatures(*dt, *mean),
            peak: operation.fluid_temperatures(dt + (peak - mean) * h_peak, *peak),
        })
        .collect())
}
