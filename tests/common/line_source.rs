//! Test input only: the infinite line-source step response of the borehole wall,
//! h(t) = E1(r_b²/(4αt))/(4πλ) (Kelvin line source; Carslaw & Jaeger 1959, §10.4), as a
//! plausible shape of step response for superposition tests and benchmarks.

/// Exponential integral E1(x), x > 0: power series (Abramowitz & Stegun 5.1.11) for x ≤ 5,
/// continued fraction (A&S 5.1.22) above.
pub fn exp1(x: f64) -> f64 {
    const EULER_GAMMA: f64 = 0.577_215_664_901_532_9;
    if x <= 5.0 {
        let mut term = 1.0;
        let mut sum = 0.0;
        for k in 1..200 {
            term *= -x / k as f64;
            let add = -term / k as f64;
            sum += add;
            if add.abs() < 1e-17 * sum.abs() {
                break;
            }
        }
        -EULER_GAMMA - x.ln() + sum
    } else {
        // E1(x) = e^{-x} / (x + 1/(1 + 1/(x + 2/(1 + 2/(x + ...))))), evaluated backwards.
        let mut f = 0.0;
        for k in (1..60).rev() {
            let k = k as f64;
            f = k / (1.0 + k / (x + f));
        }
        (-x).exp() / (x + f)
    }
}

/// h(t) in K m/W for a borehole of radius `rb_m` in ground of conductivity `k` and diffusivity
/// `alpha_m2_per_s`.
pub fn line_source_step_response(rb_m: f64, k: f64, alpha_m2_per_s: f64) -> impl Fn(f64) -> f64 {
    move |t_s: f64| exp1(rb_m * rb_m / (4.0 * alpha_m2_per_s * t_s)) / (4.0 * std::f64::consts::PI * k)
}

/// An invented 25-year-like hourly load of a heating-dominated borehole, heat to the ground in
/// W/m: annual swing, daily swing, and deterministic pseudo-random noise.
pub fn synthetic_hourly_load(steps: usize) -> Vec<f64> {
    let mut state: u64 = 0x2545_f491_4f6c_dd1d;
    (0..steps)
        .map(|i| {
            state = state
                .wrapping_mul(6_364_136_223_846_793_005)
                .wrapping_add(1_442_695_040_888_963_407);
            let noise = ((state >> 11) as f64 / (1u64 << 53) as f64 - 0.5) * 10.0;
            let hour = i as f64;
            let annual = (2.0 * std::f64::consts::PI * hour / 8760.0).cos();
            let daily = (2.0 * std::f64::consts::PI * hour / 24.0).cos();
            -12.0 - 22.0 * annual + 8.0 * daily * (0.5 + 0.5 * annual) + noise
        })
        .collect()
}
