//! Temporal superposition: FFT and load aggregation against the direct convolution, and the
//! monthly mean/peak method against a hand calculation.

#[path = "common/line_source.rs"]
mod line_source;

use burrow::physics::superposition::*;
use line_source::{exp1, line_source_step_response, synthetic_hourly_load};

const HOUR_S: f64 = 3600.0;

fn line_source() -> impl Fn(f64) -> f64 {
    line_source_step_response(0.075, 2.5, 1.0e-6)
}

#[test]
fn test_exponential_integral_matches_abramowitz_stegun() {
    // Abramowitz & Stegun (1964) Table 5.1 (from memory, 10 figures): E1(0.1) = 1.8229239584,
    // E1(1) = 0.2193839344, E1(2) = 0.0489005107, E1(10) = 4.156968929e-6.
    for (x, e1) in [
        (0.1, 1.822_923_958_4),
        (1.0, 0.219_383_934_4),
        (2.0, 0.048_900_510_7),
        (10.0, 4.156_968_929e-6),
    ] {
        assert!((exp1(x) / e1 - 1.0).abs() < 1e-9, "E1({x}) = {}", exp1(x));
    }
}

#[test]
fn fft_convolution_equals_direct_sum_for_a_year_of_hourly_loads() {
    // Exact reference: the direct O(N²) sum of Duhamel's superposition.
    let n = 8760;
    let loads = synthetic_hourly_load(n);
    let h = SampledStepResponse::new(&line_source(), HOUR_S, n).unwrap();
    let direct = wall_temperature_change_direct(&loads, &h).unwrap();
    let fft = wall_temperature_change_fft(&loads, &h).unwrap();
    let worst = direct
        .iter()
        .zip(&fft)
        .map(|(a, b)| (a - b).abs())
        .fold(0.0, f64::max);
    assert!(worst < 1e-9, "worst FFT − direct difference {worst} K");
}

#[test]
fn constant_load_gives_step_response_plus_borehole_resistance() {
    // A constant heat rate q' switched on at t = 0: T_f = T0 + q'(h(t) + R_b) exactly
    // (definition of the step response; with extraction q'_ext = −q' this is T0 − q'_ext(g/2πk + R_b)).
    let n = 2000;
    let q = -35.0;
    let loads = vec![q; n];
    let response = line_source();
    let h = SampledStepResponse::new(&response, HOUR_S, n).unwrap();
    let operation = BoreholeOperation {
        undisturbed_c: 9.0,
        resistance_m_k_per_w: 0.11,
        length_m: 180.0,
        flow_capacity_w_per_k: 1500.0,
    };
    let series = fluid_temperature_series(&loads, &h, &operation).unwrap();
    for (i, temps) in series.iter().enumerate() {
        let t = (i + 1) as f64 * HOUR_S;
        let expected = 9.0 + q * (response(t) + 0.11);
        assert!((temps.mean_c - expected).abs() < 1e-10, "step {i}");
        // Inlet and outlet straddle the mean by Q/(2 ṁc_p) = 35·180/3000 = 2.1 K (extraction warms
        // the fluid on its way through).
        assert!((temps.outlet_c - temps.mean_c - 2.1).abs() < 1e-12);
        assert!((temps.mean_c - temps.inlet_c - 2.1).abs() < 1e-12);
    }
}

#[test]
fn aggregation_is_exact_when_every_cell_is_one_step() {
    // With cells of width 1 the shifting scheme is the direct sum.
    let n = 500;
    let loads = synthetic_hourly_load(n);
    let h = SampledStepResponse::new(&line_source(), HOUR_S, n).unwrap();
    let direct = wall_temperature_change_direct(&loads, &h).unwrap();
    let aggregated = wall_temperature_change_aggregated(&loads, &h, n).unwrap();
    let worst = direct
        .iter()
        .zip(&aggregated)
        .map(|(a, b)| (a - b).abs())
        .fold(0.0, f64::max);
    assert!(worst < 1e-12, "{worst}");
}

#[test]
fn aggregation_error_over_25_years_of_hourly_loads() {
    // Claesson & Javed (2012) aggregation against the exact convolution (FFT, itself checked
    // against the direct sum above) for 25 years of hourly loads. Required: error below 0.05 K
    // with the default cells per level, a small fraction of the ±1 K to which borehole designs
    // are meaningful (common practice, no source). Errors are printed for the report; the
    // error is numerical diffusion of the annual wave in the wide cells, so it halves each
    // time the cells per level double.
    let n = 25 * 8760;
    let loads = synthetic_hourly_load(n);
    let h = SampledStepResponse::new(&line_source(), HOUR_S, n).unwrap();
    let exact = wall_temperature_change_fft(&loads, &h).unwrap();
    let mut errors = Vec::new();
    for cells in [2, 4, 8, 16] {
        let aggregated = wall_temperature_change_aggregated(&loads, &h, cells).unwrap();
        let worst = exact
            .iter()
            .zip(&aggregated)
            .map(|(a, b)| (a - b).abs())
            .fold(0.0, f64::max);
        let cell_count = aggregation_cell_widths(n, cells).unwrap().len();
        println!("aggregation, {cells} cells per level ({cell_count} cells): max error {worst:.4} K");
        errors.push(worst);
    }
    let default = wall_temperature_change_aggregated(&loads, &h, DEFAULT_CELLS_PER_LEVEL).unwrap();
    let worst_default = exact
        .iter()
        .zip(&default)
        .map(|(a, b)| (a - b).abs())
        .fold(0.0, f64::max);
    assert!(
        worst_default < 0.05,
        "{DEFAULT_CELLS_PER_LEVEL} cells per level: {worst_default} K"
    );
    assert!(
        errors[3] <= errors[0],
        "more cells per level must not be less accurate"
    );
}

#[test]
fn monthly_means_and_peaks_match_hand_calculation() {
    // Hand calculation with h(t) = 0.05 + 0.01 ln(t / 1 h) K m/W, months of 730 h, peak 6 h:
    // h(6 h) = 0.0679176, h(730 h) = 0.1159304, h(1460 h) = 0.1228619, h(2190 h) = 0.1269166.
    // Loads (heat to ground, W/m): means −30, −20, +10; peaks −60, −45, +35.
    // T0 = 10 °C, R_b* = 0.1 m K/W, H = 150 m, ṁc_p = 1000 W/K (inlet/outlet ± q'·0.075 K).
    //
    // Month 1: ΔT_b = −30·0.1159304 = −3.477912; T_f = 10 − 3.477912 − 3.0 = 3.522088;
    //          peak ΔT_b = −3.477912 − 30·0.0679176 = −5.515440; T_f = 10 − 5.515440 − 6.0 = −1.515440.
    // Month 2: ΔT_b = −30·0.1228619 + 10·0.1159304 = −2.526553; T_f = 10 − 2.526553 − 2.0 = 5.473447;
    //          peak ΔT_b = −2.526553 − 25·0.0679176 = −4.224493; T_f = 10 − 4.224493 − 4.5 = 1.275507.
    // Month 3: ΔT_b = −30·0.1269166 + 10·0.1228619 + 30·0.1159304 = 0.899033; T_f = 11.899033;
    //          peak ΔT_b = 0.899033 + 25·0.0679176 = 2.596973; T_f = 12.596973 + 3.5 = 16.096973.
    // (7-figure h values: the sums carry about ±3e-6 K of rounding.)
    let h = |t: f64| 0.05 + 0.01 * (t / HOUR_S).ln();
    let loads = MonthlyLoads {
        mean_w_per_m: vec![-30.0, -20.0, 10.0],
        peak_w_per_m: vec![-60.0, -45.0, 35.0],
        peak_duration_s: 6.0 * HOUR_S,
    };
    let operation = BoreholeOperation {
        undisturbed_c: 10.0,
        resistance_m_k_per_w: 0.1,
        length_m: 150.0,
        flow_capacity_w_per_k: 1000.0,
    };
    let months = monthly_fluid_temperatures(&loads, &h, &operation).unwrap();
    let expected = [
        (3.522088, -1.515440),
        (5.473447, 1.275507),
        (11.899033, 16.096973),
    ];
    for (m, (mean, peak)) in expected.iter().enumerate() {
        assert!(
            (months[m].mean.mean_c - mean).abs() < 1e-5,
            "month {m}: {:?}",
            months[m]
        );
        assert!(
            (months[m].peak.mean_c - peak).abs() < 1e-5,
            "month {m}: {:?}",
            months[m]
        );
    }
    // Inlet of month 1 at its mean load: 3.522088 + (−30)·150/(2·1000) = 1.272088; outlet 5.772088.
    assert!((months[0].mean.inlet_c - 1.272088).abs() < 1e-5);
    assert!((months[0].mean.outlet_c - 5.772088).abs() < 1e-5);
}

#[test]
fn tabulated_response_interpolates_in_log_time() {
    // A table of h = a + b ln t is reproduced exactly between its nodes (interpolation linear in
    // ln t), and linearly from 0 below the first node.
    let f = |t: f64| 0.02 + 0.015 * (t / HOUR_S).ln();
    let times: Vec<f64> = [1.0, 10.0, 100.0, 1000.0, 1e4, 1e5]
        .iter()
        .map(|h| h * HOUR_S)
        .collect();
    let values = times.iter().map(|&t| f(t)).collect();
    let table = TabulatedStepResponse::new(times, values).unwrap();
    for t in [3.0 * HOUR_S, 47.0 * HOUR_S, 5000.0 * HOUR_S] {
        assert!((table.at_k_m_per_w(t).unwrap() - f(t)).abs() < 1e-14);
    }
    assert!((table.at_k_m_per_w(0.5 * HOUR_S).unwrap() - 0.5 * f(HOUR_S)).abs() < 1e-15);
    assert!(
        table.at_k_m_per_w(2e5 * HOUR_S).is_err(),
        "no extrapolation past the table"
    );
}

#[test]
fn bad_superposition_inputs_are_refused() {
    let h = SampledStepResponse::new(&line_source(), HOUR_S, 10).unwrap();
    assert!(
        wall_temperature_change_fft(&[1.0; 11], &h).is_err(),
        "more loads than response samples"
    );
    assert!(wall_temperature_change_direct(&[1.0, f64::NAN], &h).is_err());
    assert!(wall_temperature_change_aggregated(&[1.0; 5], &h, 0).is_err());
    assert!(SampledStepResponse::new(&line_source(), -1.0, 10).is_err());
    assert!(TabulatedStepResponse::new(vec![2.0, 1.0], vec![0.1, 0.2]).is_err());
    let loads = MonthlyLoads {
        mean_w_per_m: vec![1.0, 2.0],
        peak_w_per_m: vec![1.0],
        peak_duration_s: 3600.0,
    };
    let op = BoreholeOperation {
        undisturbed_c: 10.0,
        resistance_m_k_per_w: 0.1,
        length_m: 100.0,
        flow_capacity_w_per_k: 1000.0,
    };
    assert!(monthly_fluid_temperatures(&loads, &line_source(), &op).is_err());
}
