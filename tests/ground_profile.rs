//! Undisturbed ground temperature: closed-form annual wave and the layered,
//! freezing soil column, each checked against an independent reference.
//!
//! All soils and climates here are invented demo data.

use burrow::engine::column::{
    ColumnLayer, ColumnOptions, PeriodicProfile, StepOptions, periodic_profile, step_response,
};
use burrow::physics::annual_wave::{AnnualWave, DAY_S, YEAR_S, damping_depth_m, lag_s};
use std::f64::consts::{E, PI};

// ---------------------------------------------------------------- helpers

const K_SOIL: f64 = 1.5; // W/(m K)
const C_SOIL: f64 = 2.2e6; // J/(m3 K)

fn demo_wave() -> AnnualWave {
    AnnualWave::new(8.0, 10.0, 30.0, YEAR_S).expect("valid wave")
}

fn options(cell_size_m: f64, steps_per_year: usize) -> ColumnOptions {
    ColumnOptions {
        depth_m: 15.0,
        cell_size_m,
        steps_per_year,
        max_years: 200,
        tolerance_k: 1e-4,
    }
}

fn run(layers: &[ColumnLayer], wave: &AnnualWave, q_w_per_m2: f64, opts: &ColumnOptions) -> PeriodicProfile {
    let surface = |t: f64| wave.surface_c(t);
    periodic_profile(layers, &surface, q_w_per_m2, opts).expect("periodic profile")
}

/// Linear interpolation of (mean, min, max) at `z_m` from `mean_min_max`.
fn envelope_at(rows: &[(f64, f64, f64, f64)], z_m: f64) -> (f64, f64, f64) {
    let j = rows.partition_point(|r| r.0 < z_m).clamp(1, rows.len() - 1);
    let (a, b) = (rows[j - 1], rows[j]);
    let w = (z_m - a.0) / (b.0 - a.0);
    (
        a.1 + w * (b.1 - a.1),
        a.2 + w * (b.2 - a.2),
        a.3 + w * (b.3 - a.3),
    )
}

/// Minimal complex arithmetic for the two-layer reference.
#[derive(Debug, Clone, Copy)]
struct Cx {
    re: f64,
    im: f64,
}

impl Cx {
    fn new(re: f64, im: f64) -> Self {
        Self { re, im }
    }
    fn add(self, o: Self) -> Self {
        Self::new(self.re + o.re, self.im + o.im)
    }
    fn sub(self, o: Self) -> Self {
        Self::new(self.re - o.re, self.im - o.im)
    }
    fn mul(self, o: Self) -> Self {
        Self::new(self.re * o.re - self.im * o.im, self.re * o.im + self.im * o.re)
    }
    fn div(self, o: Self) -> Self {
        let d = o.re * o.re + o.im * o.im;
        Self::new(
            (self.re * o.re + self.im * o.im) / d,
            (self.im * o.re - self.re * o.im) / d,
        )
    }
    fn scale(self, s: f64) -> Self {
        Self::new(self.re * s, self.im * s)
    }
    fn exp(self) -> Self {
        let m = self.re.exp();
        Self::new(m * self.im.cos(), m * self.im.sin())
    }
    fn abs(self) -> f64 {
        self.re.hypot(self.im)
    }
}

/// Exact periodic solution for a layer (thickness `h_m`, k1, α1) over a
/// half-space (k2, α2) under a unit surface oscillation of period `period_s`:
/// returns |T̂(z)|, the amplitude at depth `z_m` per kelvin of surface amplitude.
///
/// Carslaw & Jaeger 1959 §2.6 (periodic solutions of the conduction equation) with
/// the matching conditions of composite media: with T = Re[T̂(z)·e^{iωt}],
/// iωT̂ = α·T̂'' gives T̂ = a·e^{κz} + b·e^{−κz}, κ = (1+i)·sqrt(ω/2α). Layer 1 keeps
/// both terms, the half-space only the decaying one; T and k·dT/dz are continuous at
/// z = h and T̂(0) = 1. Derived here independently of the crate.
fn two_layer_amplitude(z_m: f64, h_m: f64, k1: f64, a1: f64, k2: f64, a2: f64, period_s: f64) -> f64 {
    let omega = 2.0 * PI / period_s;
    let kappa = |alpha: f64| Cx::new(1.0, 1.0).scale((omega / (2.0 * alpha)).sqrt());
    let (kap1, kap2) = (kappa(a1), kappa(a2));
    let g1 = kap1.scale(k1);
    let g2 = kap2.scale(k2);
    let reflection = g1.sub(g2).div(g1.add(g2));
    let decay = kap1.scale(-2.0 * h_m).exp();
    let b = Cx::new(1.0, 0.0).div(Cx::new(1.0, 0.0).add(reflection.mul(decay)));
    let a = b.mul(reflection).mul(decay);
    let layer1 = |z: f64| a.mul(kap1.scale(z).exp()).add(b.mul(kap1.scale(-z).exp()));
    if z_m <= h_m {
        layer1(z_m).abs()
    } else {
        layer1(h_m).mul(kap2.scale(-(z_m - h_m)).exp()).abs()
    }
}

fn moist_silt(thickness_m: f64) -> ColumnLayer {
    // Invented: about 30 % water by volume; 1.0e8 J/m3 ≈ 0.3 × 1000 kg/m3 × 334 kJ/kg.
    ColumnLayer::moist(thickness_m, 1.3, 2.0, 2.6e6, 1.9e6, 1.0e8)
}

fn cold_wave() -> AnnualWave {
    AnnualWave::new(2.0, 12.0, 25.0, YEAR_S).expect("valid wave")
}

// ---------------------------------------------------------------- closed form

/// Carslaw & Jaeger 1959 §2.6: the boundary condition of the periodic solution is
/// the surface sinusoid T_mean − A·cos(ω(t − t_min)); coldest at t_min, warmest
/// half a period later.
#[test]
fn closed_form_surface_is_the_prescribed_sinusoid() {
    let w = demo_wave();
    let t_min = 29.0 * DAY_S; // day 30 starts after 29 whole days
    for i in 0..50 {
        let t = i as f64 * 7.3 * DAY_S;
        let expected = 8.0 - 10.0 * (2.0 * PI * (t - t_min) / YEAR_S).cos();
        assert!((w.surface_c(t) - expected).abs() < 1e-12);
        assert!((w.ground_c(0.0, t, K_SOIL / C_SOIL, 0.0) - expected).abs() < 1e-12);
    }
    assert!((w.surface_c(t_min) - (8.0 - 10.0)).abs() < 1e-12);
    assert!((w.surface_c(t_min + 0.5 * YEAR_S) - (8.0 + 10.0)).abs() < 1e-12);
}

/// The closed form satisfies Fourier's one-dimensional conduction equation
/// ∂T/∂t = α·∂²T/∂z² (Carslaw & Jaeger 1959 ch. I), checked by central differences
/// independently of how the formula was derived.
#[test]
fn closed_form_satisfies_the_heat_conduction_equation() {
    let w = demo_wave();
    let alpha = K_SOIL / C_SOIL;
    for &(z, day) in &[(0.4, 10.0), (1.3, 100.0), (3.7, 250.0)] {
        let t = day * DAY_S;
        let (dz, dt) = (1e-3, 600.0);
        let f = |z: f64, t: f64| w.ground_c(z, t, alpha, 0.03);
        let dtdt = (f(z, t + dt) - f(z, t - dt)) / (2.0 * dt);
        let d2 = (f(z + dz, t) - 2.0 * f(z, t) + f(z - dz, t)) / (dz * dz);
        assert!(
            (dtdt - alpha * d2).abs() < 1e-5 * dtdt.abs().max(1e-8),
            "z {z}: dT/dt {dtdt:e} vs a d2T/dz2 {:e}",
            alpha * d2
        );
    }
}

/// Carslaw & Jaeger 1959 §2.6: the amplitude decays as exp(−z/d); at one damping
/// depth it is A/e. Measured by sampling the wave over a year.
#[test]
fn amplitude_at_one_damping_depth_is_a_over_e() {
    let w = demo_wave();
    let alpha = K_SOIL / C_SOIL;
    let d = damping_depth_m(alpha, YEAR_S);
    assert!((d - (2.0 * alpha / (2.0 * PI / YEAR_S)).sqrt()).abs() < 1e-12);
    let samples: Vec<f64> = (0..20_000)
        .map(|i| w.ground_c(d, i as f64 * YEAR_S / 20_000.0, alpha, 0.0))
        .collect();
    let hi = samples.iter().cloned().fold(f64::MIN, f64::max);
    let lo = samples.iter().cloned().fold(f64::MAX, f64::min);
    assert!(((hi - lo) / 2.0 - 10.0 / E).abs() < 1e-6);
    let (mean, min, max) = w.envelope(d, alpha, 0.0);
    assert!((mean - 8.0).abs() < 1e-12);
    assert!((max - min - 2.0 * 10.0 / E).abs() < 1e-12);
}

/// Carslaw & Jaeger 1959 §2.6: the extremes travel down with phase z/d, i.e. a lag
/// of P/(2π) per damping depth. The minimum at depth d is located by sampling.
#[test]
fn lag_is_period_over_two_pi_per_damping_depth() {
    let w = demo_wave();
    let alpha = K_SOIL / C_SOIL;
    let d = damping_depth_m(alpha, YEAR_S);
    let per_d = YEAR_S / (2.0 * PI);
    assert!((lag_s(d, alpha, YEAR_S) - per_d).abs() < 1e-6);
    assert!((lag_s(2.5 * d, alpha, YEAR_S) - 2.5 * per_d).abs() < 1e-6);
    // Time of the minimum at z = d, by dense sampling and a parabola through the best three.
    let n = 100_000;
    let dt = YEAR_S / n as f64;
    let f = |i: i64| w.ground_c(d, w.coldest_time_s() + i as f64 * dt, alpha, 0.0);
    let best = (0..n as i64).min_by(|&a, &b| f(a).total_cmp(&f(b))).unwrap();
    let (fm, f0, fp) = (f(best - 1), f(best), f(best + 1));
    let offset = 0.5 * (fm - fp) / (fm - 2.0 * f0 + fp);
    let lag = (best as f64 + offset) * dt;
    assert!((lag - per_d).abs() < 1e-4 * per_d, "lag {lag} s vs {per_d} s");
}

// ---------------------------------------------------------------- column vs closed form

/// A homogeneous dry column must reproduce the closed form (Carslaw & Jaeger 1959
/// §2.6; Kusuda & Achenbach 1965): annual mean, min and max within 0.05 K at every
/// reported depth to 15 m, and the whole daily time series as well.
#[test]
fn homogeneous_column_matches_the_closed_form_annual_wave() {
    let w = demo_wave();
    let p = run(
        &[ColumnLayer::dry(1.0, K_SOIL, C_SOIL)],
        &w,
        0.0,
        &options(0.02, 1460),
    );
    let alpha = K_SOIL / C_SOIL;
    assert!(*p.depths_m.last().unwrap() == 15.0);
    let mut worst: f64 = 0.0;
    for (z, mean, min, max) in p.mean_min_max() {
        let (m0, lo0, hi0) = w.envelope(z, alpha, 0.0);
        for (got, want) in [(mean, m0), (min, lo0), (max, hi0)] {
            worst = worst.max((got - want).abs());
            assert!((got - want).abs() < 0.05, "z {z}: {got} vs {want}");
        }
    }
    let mut worst_series: f64 = 0.0;
    for &z in &[0.0, 0.3, 1.0, 2.0, 4.0, 8.0, 15.0] {
        for day in 0..365 {
            let t = (day as f64 + 0.5) * DAY_S;
            let diff = (p.at(z, t) - w.ground_c(z, t, alpha, 0.0)).abs();
            worst_series = worst_series.max(diff);
        }
    }
    eprintln!("homogeneous: worst envelope error {worst:.4} K, worst daily error {worst_series:.4} K");
    assert!(worst_series < 0.05);
}

/// Steady conduction (Fourier's law) in series: with an upward flux q the annual
/// mean rises by q/k per metre, piecewise with the layer conductivities. The
/// problem is linear, so the periodic mean is exactly the steady profile; the
/// 5e-4 K allowance covers the 1e-4 K spin-up tolerance.
#[test]
fn geothermal_flux_raises_the_mean_by_q_over_k_per_metre() {
    let w = demo_wave();
    let q = 0.065;
    let homogeneous = run(
        &[ColumnLayer::dry(1.0, K_SOIL, C_SOIL)],
        &w,
        q,
        &options(0.02, 1460),
    );
    let mut worst: f64 = 0.0;
    for (z, mean, _, _) in homogeneous.mean_min_max() {
        let expected = 8.0 + q * z / K_SOIL;
        worst = worst.max((mean - expected).abs());
        assert!((mean - expected).abs() < 5e-4, "z {z}: {mean} vs {expected}");
    }
    let layers = [
        ColumnLayer::dry(2.0, 0.9, 1.5e6),
        ColumnLayer::dry(1.0, 2.4, 2.3e6),
    ];
    let layered = run(&layers, &w, q, &options(0.02, 1460));
    let mut seen_upper = false;
    let mut seen_lower = false;
    for (z, mean, _, _) in layered.mean_min_max() {
        let expected = 8.0 + q * (z.min(2.0) / 0.9 + (z - 2.0).max(0.0) / 2.4);
        seen_upper |= z < 2.0;
        seen_lower |= z > 2.0;
        worst = worst.max((mean - expected).abs());
        assert!((mean - expected).abs() < 5e-4, "z {z}: {mean} vs {expected}");
    }
    eprintln!("geothermal: worst mean error {worst:.2e} K");
    assert!(seen_upper && seen_lower);
}

/// Two-layer soil against the exact periodic two-layer solution (complex transfer,
/// Carslaw & Jaeger 1959 §2.6 with continuity of T and k·dT/dz at the interface),
/// implemented in this file. Annual min and max within 0.05 K at every depth.
#[test]
fn two_layer_column_matches_the_exact_periodic_two_layer_solution() {
    let w = demo_wave();
    let (h, k1, c1, k2, c2) = (1.5, 0.9, 1.5e6, 2.4, 2.3e6);
    let layers = [ColumnLayer::dry(h, k1, c1), ColumnLayer::dry(1.0, k2, c2)];
    let p = run(&layers, &w, 0.0, &options(0.02, 1460));
    let mut worst: f64 = 0.0;
    let mut differs_from_homogeneous: f64 = 0.0;
    for (z, _, min, max) in p.mean_min_max() {
        let amp = 10.0 * two_layer_amplitude(z, h, k1, k1 / c1, k2, k2 / c2, YEAR_S);
        for (got, want) in [(min, 8.0 - amp), (max, 8.0 + amp)] {
            worst = worst.max((got - want).abs());
            assert!((got - want).abs() < 0.05, "z {z}: {got} vs {want}");
        }
        let (_, lo_top_only, _) = w.envelope(z, k1 / c1, 0.0);
        differs_from_homogeneous = differs_from_homogeneous.max((lo_top_only - (8.0 - amp)).abs());
    }
    eprintln!("two-layer: worst min/max error {worst:.4} K");
    // The reference is discriminating: the lower layer changes the answer by far
    // more than the tolerance.
    assert!(differs_from_homogeneous > 0.5);
}

// ---------------------------------------------------------------- numerical convergence

fn max_envelope_difference(a: &PeriodicProfile, b: &PeriodicProfile) -> f64 {
    let (ra, rb) = (a.mean_min_max(), b.mean_min_max());
    [
        0.0, 0.1, 0.25, 0.5, 0.75, 1.0, 1.5, 2.0, 3.0, 5.0, 8.0, 12.0, 15.0,
    ]
    .iter()
    .map(|&z| {
        let (_, lo_a, hi_a) = envelope_at(&ra, z);
        let (_, lo_b, hi_b) = envelope_at(&rb, z);
        (lo_a - lo_b).abs().max((hi_a - hi_b).abs())
    })
    .fold(0.0, f64::max)
}

/// Numerical convergence (common practice, no source): halving both the cell size
/// and the time step changes the annual min/max by less than 0.02 K, for dry soil
/// and for a two-layer freezing soil.
#[test]
fn halving_cells_and_steps_changes_min_max_by_less_than_0_02_k() {
    let w = demo_wave();
    let dry = [ColumnLayer::dry(1.0, K_SOIL, C_SOIL)];
    let coarse = run(&dry, &w, 0.0, &options(0.02, 1460));
    let fine = run(&dry, &w, 0.0, &options(0.01, 2920));
    let dry_change = max_envelope_difference(&coarse, &fine);

    let cold = cold_wave();
    let freezing = [
        moist_silt(1.2),
        ColumnLayer::moist(1.0, 1.8, 2.6, 2.3e6, 1.8e6, 0.6e8),
    ];
    let coarse = run(&freezing, &cold, 0.06, &options(0.02, 1460));
    let fine = run(&freezing, &cold, 0.06, &options(0.01, 2920));
    let freezing_change = max_envelope_difference(&coarse, &fine);
    eprintln!("refinement: dry {dry_change:.4} K, freezing {freezing_change:.4} K");
    assert!(dry_change < 0.02);
    assert!(freezing_change < 0.02);
}

// ---------------------------------------------------------------- freezing

/// Conservation of energy (first law): heat in at the surface and bottom equals
/// the change of stored enthalpy; relative error below 1e-4 over the final year.
#[test]
fn freezing_column_conserves_energy() {
    let layers = [
        moist_silt(1.0),
        ColumnLayer::moist(1.0, 1.8, 2.6, 2.3e6, 1.8e6, 0.6e8),
    ];
    let p = run(&layers, &cold_wave(), 0.06, &options(0.02, 1460));
    eprintln!("energy balance {:.2e}", p.energy_balance_relative_error);
    assert!(p.energy_balance_relative_error < 1e-4);
    assert!(
        p.frost_penetration_m(0.0).unwrap() > 0.3,
        "the test soil must actually freeze"
    );
}

/// Latent heat must be removed before the ground can cool below freezing, so frost
/// penetrates less deep with water than without (Stefan-type frost-depth reasoning,
/// e.g. Carslaw & Jaeger 1959 §11.2: the front speed falls as the latent heat rises).
/// Here the latent heat (1e8 J/m³) equals the sensible heat of about 45 K of the
/// soil, against a 12 K swing, so the reduction must be large: at least 20 %
/// (margin chosen by judgement, no source).
#[test]
fn latent_heat_makes_frost_penetration_shallower() {
    let wet = moist_silt(1.0);
    let dry = ColumnLayer {
        latent_heat_j_per_m3: 0.0,
        ..wet
    };
    let opts = options(0.02, 1460);
    let with_latent = run(&[wet], &cold_wave(), 0.06, &opts)
        .frost_penetration_m(0.0)
        .unwrap();
    let without = run(&[dry], &cold_wave(), 0.06, &opts)
        .frost_penetration_m(0.0)
        .unwrap();
    eprintln!("frost penetration: with latent heat {with_latent:.3} m, without {without:.3} m");
    assert!(with_latent > 0.2);
    assert!(with_latent < 0.8 * without);
}

/// Averaging ∂H/∂t = ∂/∂z(k ∂T/∂z) over one period of the periodic state gives
/// d/dz(k·dT̄/dz) = 0 when k does not depend on T (time average of the conduction
/// equation; latent heat drops out because H is periodic). So with equal frozen and
/// unfrozen conductivity the annual-mean temperature is the continuous straight
/// line T̄_surface + q·z/k through the freezing zone, latent heat or not.
#[test]
fn mean_annual_temperature_is_continuous_and_linear_through_the_frost_zone() {
    let layer = ColumnLayer {
        frozen_conductivity: 1.3,
        ..moist_silt(1.0)
    };
    let q = 0.06;
    let p = run(&[layer], &cold_wave(), q, &options(0.02, 1460));
    let frost = p.frost_penetration_m(0.0).unwrap();
    assert!(frost > 0.5);
    let mut worst: f64 = 0.0;
    for (z, mean, _, _) in p.mean_min_max() {
        worst = worst.max((mean - (2.0 + q * z / 1.3)).abs());
    }
    eprintln!("mean-annual deviation from the straight line: {worst:.4} K (frost depth {frost:.2} m)");
    assert!(worst < 0.01);
}

/// With frozen soil conducting better than unfrozen, winter cold enters more easily
/// than summer heat: the mean annual temperature below the frozen zone lies under
/// the surface mean (the "thermal offset"; from memory: Goodrich 1978, Romanovsky
/// & Osterkamp 1995). The mean profile stays continuous: no node deviates from the
/// straight line through its neighbours by more than 0.01 K, and below the frost
/// zone it is the steady line with slope q/k_unfrozen (time-averaged conduction).
#[test]
fn thermal_offset_is_negative_and_mean_profile_has_no_jump() {
    let layer = moist_silt(1.0);
    let q = 0.06;
    let p = run(&[layer], &cold_wave(), q, &options(0.02, 1460));
    let rows = p.mean_min_max();
    let frost = p.frost_penetration_m(0.0).unwrap();
    for trio in rows.windows(3) {
        let (za, ma) = (trio[0].0, trio[0].1);
        let (zb, mb) = (trio[1].0, trio[1].1);
        let (zc, mc) = (trio[2].0, trio[2].1);
        let line = ma + (mc - ma) * (zb - za) / (zc - za);
        assert!((mb - line).abs() < 0.01, "jump near z {zb}: {mb} vs {line}");
    }
    let deep: Vec<_> = rows.iter().filter(|r| r.0 > frost + 0.5).collect();
    let (z0, m0) = (deep[0].0, deep[0].1);
    for r in &deep {
        let expected = m0 + q * (r.0 - z0) / layer.conductivity;
        assert!((r.1 - expected).abs() < 2e-3, "z {}: {} vs {expected}", r.0, r.1);
    }
    let intercept = m0 - q * z0 / layer.conductivity;
    eprintln!("thermal offset {:.3} K", intercept - 2.0);
    assert!(intercept < 2.0 - 0.05);
}

/// Frost depth after a sudden, sustained cold surface against Neumann's two-phase
/// solution (Carslaw & Jaeger 1959 §11.2), reference values from SciPy in
/// tests/reference/neumann.py → neumann.csv
/// (regenerate with `pip install scipy; python3 neumann.py > neumann.csv`). Within 3 %.
#[test]
fn frost_depth_of_a_cold_step_follows_neumanns_solution() {
    let text = include_str!("reference/neumann.csv");
    let mut params = std::collections::HashMap::new();
    let mut reference = Vec::new();
    for line in text.lines().filter(|l| !l.starts_with('#')) {
        let (key, value) = line.split_once(',').expect("two columns");
        match (key.parse::<f64>(), value.parse::<f64>()) {
            (Ok(t), Ok(x)) => reference.push((t, x)),
            (Err(_), Ok(v)) => {
                params.insert(key.to_string(), v);
            }
            _ => {}
        }
    }
    let p = |k: &str| params[k];
    let layer = ColumnLayer {
        thickness_m: 1.0,
        conductivity: p("k_unfrozen_w_mk"),
        frozen_conductivity: p("k_frozen_w_mk"),
        heat_capacity: p("c_unfrozen_j_m3k"),
        frozen_heat_capacity: p("c_frozen_j_m3k"),
        latent_heat_j_per_m3: p("latent_j_m3"),
        freezing_interval_k: p("freezing_interval_k"),
    };
    let hours = 60 * 24;
    let opts = StepOptions {
        domain_depth_m: 10.0,
        cell_size_m: 0.01,
        duration_s: hours as f64 * 3600.0,
        steps: hours,
    };
    let r = step_response(&[layer], p("initial_c"), p("surface_c"), &opts).unwrap();
    assert!(r.energy_balance_relative_error < 1e-4);
    assert_eq!(reference.len(), 7);
    let mut worst: f64 = 0.0;
    for (t, x_ref) in reference {
        let i = (t / 3600.0).round() as usize - 1;
        assert!((r.times_s[i] - t).abs() < 1e-6);
        let rel = (r.frost_depth_m[i] - x_ref).abs() / x_ref;
        worst = worst.max(rel);
        assert!(
            rel < 0.03,
            "t {} d: {} m vs Neumann {} m",
            t / DAY_S,
            r.frost_depth_m[i],
            x_ref
        );
    }
    eprintln!("Neumann: worst relative frost-depth error {:.2} %", 100.0 * worst);
}

// ---------------------------------------------------------------- inputs

#[test]
fn invalid_inputs_are_rejected_with_a_message() {
    let w = demo_wave();
    let surface = |t: f64| w.surface_c(t);
    let bad = ColumnLayer::dry(1.0, -1.0, C_SOIL);
    let e = periodic_profile(&[bad], &surface, 0.0, &options(0.02, 1460)).unwrap_err();
    assert!(e.contains("conductivity"), "{e}");
    let e = periodic_profile(&[], &surface, 0.0, &options(0.02, 1460)).unwrap_err();
    assert!(e.contains("layer"), "{e}");
    let nan_surface = |_: f64| f64::NAN;
    let good = ColumnLayer::dry(1.0, K_SOIL, C_SOIL);
    assert!(periodic_profile(&[good], &nan_surface, 0.0, &options(0.02, 1460)).is_err());
    let too_strict = ColumnOptions {
        max_years: 2,
        tolerance_k: 1e-12,
        ..options(0.05, 365)
    };
    let cold = cold_wave();
    let cold_surface = |t: f64| cold.surface_c(t);
    let e = periodic_profile(&[moist_silt(1.0)], &cold_surface, 0.06, &too_strict).unwrap_err();
    assert!(e.contains("did not reach its periodic state"), "{e}");
    assert!(AnnualWave::new(8.0, -1.0, 30.0, YEAR_S).is_err());
}
