//! Effective borehole resistance against a numerical solution of the two-channel heat balance
//! along the depth (the Δ-circuit model of Hellström 1991), integrated here by RK4 shooting.

use burrow::physics::borehole::*;
use faer::Mat;
use faer::linalg::solvers::{DenseSolveCore, Solve};

/// Δ-circuit conductances per metre, W/(m K): leg 1 (downward) to the wall, leg 2 (upward) to the
/// wall, and between the legs.
#[derive(Clone, Copy)]
struct Circuit {
    g1: f64,
    g2: f64,
    g12: f64,
}

impl Circuit {
    fn symmetric(rb: f64, ra: f64) -> Self {
        // R1 = R2 = 2 R_b; 1/R_a = 1/R12 + 1/(R1 + R2).
        Circuit {
            g1: 0.5 / rb,
            g2: 0.5 / rb,
            g12: 1.0 / ra - 1.0 / (4.0 * rb),
        }
    }
}

enum Wall {
    /// Uniform borehole-wall temperature 0.
    Temperature,
    /// Uniform heat flux to the ground, W/m.
    Flux(f64),
}

/// Integrate from the top with T1(0) = 1, T2(0) = s, returning (T1(H), T2(H), ∫T_b dz).
fn shoot(c: Circuit, wall: &Wall, length: f64, capacity: f64, s: f64) -> [f64; 3] {
    let wall_temperature = |t1: f64, t2: f64| match wall {
        Wall::Temperature => 0.0,
        Wall::Flux(q) => (c.g1 * t1 + c.g2 * t2 - q) / (c.g1 + c.g2),
    };
    let rhs = |y: [f64; 3]| {
        let tb = wall_temperature(y[0], y[1]);
        [
            (-c.g1 * (y[0] - tb) - c.g12 * (y[0] - y[1])) / capacity,
            (c.g2 * (y[1] - tb) + c.g12 * (y[1] - y[0])) / capacity,
            tb,
        ]
    };
    let steps = 4000;
    let h = length / steps as f64;
    let mut y = [1.0, s, 0.0];
    for _ in 0..steps {
        let k1 = rhs(y);
        let k2 = rhs(std::array::from_fn(|i| y[i] + 0.5 * h * k1[i]));
        let k3 = rhs(std::array::from_fn(|i| y[i] + 0.5 * h * k2[i]));
        let k4 = rhs(std::array::from_fn(|i| y[i] + h * k3[i]));
        y = std::array::from_fn(|i| y[i] + h / 6.0 * (k1[i] + 2.0 * k2[i] + 2.0 * k3[i] + k4[i]));
    }
    y
}

/// R_b* = (T_f,mean − mean T_b)/q' from the numerical solution with the foot condition
/// T1(H) = T2(H) (found by linear shooting on the outlet temperature).
fn numerical_effective_resistance(c: Circuit, wall: Wall, length: f64, capacity: f64) -> f64 {
    let mismatch = |s: f64| {
        let y = shoot(c, &wall, length, capacity, s);
        y[0] - y[1]
    };
    let (m0, m1) = (mismatch(0.0), mismatch(1.0));
    let outlet = -m0 / (m1 - m0);
    let y = shoot(c, &wall, length, capacity, outlet);
    let heat_per_m = capacity * (1.0 - outlet) / length;
    let mean_fluid = 0.5 * (1.0 + outlet);
    let mean_wall = y[2] / length;
    (mean_fluid - mean_wall) / heat_per_m
}

fn rel(a: f64, b: f64) -> f64 {
    (a / b - 1.0).abs()
}

#[test]
fn uniform_flux_formula_matches_depth_integration_for_a_u_tube() {
    // Hellström (1991): R_b* = R_b + H²/(3 R_a (ṁc_p)²) for a uniform heat flux along the depth.
    let (rb, ra) = (0.10, 0.35);
    for (length, capacity) in [(100.0, 1200.0), (200.0, 1200.0), (250.0, 400.0)] {
        let formula = effective_resistance_uniform_flux(rb, ra, length, capacity).unwrap();
        let numeric =
            numerical_effective_resistance(Circuit::symmetric(rb, ra), Wall::Flux(1.0), length, capacity);
        assert!(
            rel(formula, numeric) < 1e-6,
            "H {length}, C {capacity}: {formula} vs {numeric}"
        );
    }
}

#[test]
fn uniform_flux_formula_matches_depth_integration_for_coaxial_both_flow_directions() {
    // Coaxial: only the annulus touches the wall (R_b = annulus-to-wall), R_a = inner-to-annulus.
    let (rb, ra, length, capacity) = (0.08, 0.09, 200.0, 1500.0);
    let formula = effective_resistance_uniform_flux(rb, ra, length, capacity).unwrap();
    let annulus_down = Circuit {
        g1: 1.0 / rb,
        g2: 0.0,
        g12: 1.0 / ra,
    };
    let centre_down = Circuit {
        g1: 0.0,
        g2: 1.0 / rb,
        g12: 1.0 / ra,
    };
    for circuit in [annulus_down, centre_down] {
        let numeric = numerical_effective_resistance(circuit, Wall::Flux(1.0), length, capacity);
        assert!(rel(formula, numeric) < 1e-6, "{formula} vs {numeric}");
    }
}

#[test]
fn uniform_wall_temperature_formula_matches_depth_integration() {
    // Hellström (1991): R_b* = R_b η coth η, η = H/(ṁc_p √(R_a R_b)), uniform wall temperature.
    let (rb, ra) = (0.10, 0.35);
    for (length, capacity) in [(100.0, 1200.0), (200.0, 600.0), (300.0, 300.0)] {
        let formula = effective_resistance_uniform_wall_temperature(rb, ra, length, capacity).unwrap();
        let numeric =
            numerical_effective_resistance(Circuit::symmetric(rb, ra), Wall::Temperature, length, capacity);
        assert!(
            rel(formula, numeric) < 1e-6,
            "H {length}, C {capacity}: {formula} vs {numeric}"
        );
    }
}

#[test]
fn effective_resistance_tends_to_local_resistance_at_infinite_flow() {
    // Limit ṁc_p → ∞: no temperature change along the depth, so R_b* → R_b (both forms).
    let (rb, ra, length) = (0.1, 0.35, 200.0);
    for capacity in [1e8, 1e10] {
        assert!(
            rel(
                effective_resistance_uniform_flux(rb, ra, length, capacity).unwrap(),
                rb
            ) < 1e-8
        );
        assert!(
            rel(
                effective_resistance_uniform_wall_temperature(rb, ra, length, capacity).unwrap(),
                rb
            ) < 1e-8
        );
    }
}

#[test]
fn short_circuit_term_grows_with_the_square_of_depth() {
    // At fixed flow the excess R_b* − R_b of the uniform-flux form is proportional to H².
    let (rb, ra, capacity) = (0.1, 0.35, 1000.0);
    let excess = |h: f64| effective_resistance_uniform_flux(rb, ra, h, capacity).unwrap() - rb;
    assert!(rel(excess(300.0), 9.0 * excess(100.0)) < 1e-12);
}

#[test]
fn effective_resistance_refuses_non_positive_inputs() {
    assert!(effective_resistance_uniform_flux(0.1, 0.0, 100.0, 1000.0).is_err());
    assert!(effective_resistance_uniform_wall_temperature(0.1, 0.3, 100.0, f64::NAN).is_err());
}

/// Full multi-leg heat balance along the depth with the multipole conductance matrix K = R⁻¹
/// (q_i = Σ_j K_ij (T_j − T_b)), uniform wall temperature T_b = 0. Legs in `down` flow down with
/// capacity C/|down| each, and leg `up[i]` continues leg `down[i]` at the foot. Returns R_b*.
fn multi_leg_effective_resistance(
    k: &Mat<f64>,
    down: &[usize],
    up: &[usize],
    length: f64,
    capacity: f64,
) -> f64 {
    let n = k.nrows();
    let leg_capacity = capacity / down.len() as f64;
    let mut direction = vec![0.0; n];
    down.iter().for_each(|&i| direction[i] = 1.0);
    up.iter().for_each(|&i| direction[i] = -1.0);
    let rhs = |t: &[f64]| -> Vec<f64> {
        (0..n)
            .map(|i| -direction[i] * (0..n).map(|j| k[(i, j)] * t[j]).sum::<f64>() / leg_capacity)
            .collect()
    };
    // Integrate from the top with T_down = 1 and guessed up-leg temperatures; foot mismatch.
    let shoot = |guess: &[f64]| -> Vec<f64> {
        let mut t = vec![0.0; n];
        down.iter().for_each(|&i| t[i] = 1.0);
        up.iter().zip(guess).for_each(|(&i, g)| t[i] = *g);
        let steps = 4000;
        let h = length / steps as f64;
        for _ in 0..steps {
            let k1 = rhs(&t);
            let k2 = rhs(&t
                .iter()
                .zip(&k1)
                .map(|(a, b)| a + 0.5 * h * b)
                .collect::<Vec<_>>());
            let k3 = rhs(&t
                .iter()
                .zip(&k2)
                .map(|(a, b)| a + 0.5 * h * b)
                .collect::<Vec<_>>());
            let k4 = rhs(&t.iter().zip(&k3).map(|(a, b)| a + h * b).collect::<Vec<_>>());
            for i in 0..n {
                t[i] += h / 6.0 * (k1[i] + 2.0 * k2[i] + 2.0 * k3[i] + k4[i]);
            }
        }
        down.iter().zip(up).map(|(&d, &u)| t[d] - t[u]).collect()
    };
    // The mismatch is affine in the guesses: build its Jacobian from unit shots and solve.
    let m = up.len();
    let base = shoot(&vec![0.0; m]);
    let mut jacobian = Mat::<f64>::zeros(m, m);
    for c in 0..m {
        let mut g = vec![0.0; m];
        g[c] = 1.0;
        let shot = shoot(&g);
        for r in 0..m {
            jacobian[(r, c)] = shot[r] - base[r];
        }
    }
    let outlets = jacobian
        .as_ref()
        .partial_piv_lu()
        .solve(Mat::<f64>::from_fn(m, 1, |r, _| -base[r]));
    let outlet = (0..m).map(|r| outlets[(r, 0)]).sum::<f64>() / m as f64;
    let heat_per_m = capacity * (1.0 - outlet) / length;
    0.5 * (1.0 + outlet) / heat_per_m
}

#[test]
fn double_u_effective_resistance_matches_four_leg_depth_integration() {
    // The double U in parallel reduced to two channel groups (R_a between the downward and the
    // upward pairs, total ṁc_p) against the full four-leg heat balance with the multipole
    // conductance matrix, for both pairings; uniform wall temperature (Hellström 1991 form).
    for pairing in [DoubleUPairing::Diagonal, DoubleUPairing::Adjacent] {
        let d = DoubleU {
            borehole_radius_m: 0.07,
            pipe_outer_radius_m: 0.016,
            shank_spacing_m: 0.09,
            grout_conductivity_w_per_m_k: 1.5,
            ground_conductivity_w_per_m_k: 2.5,
            pipe_resistance_m_k_per_w: 0.06,
            pairing,
        };
        let r = d.resistances(DEFAULT_MULTIPOLE_ORDER).unwrap();
        let matrix = d
            .cross_section()
            .resistance_matrix(DEFAULT_MULTIPOLE_ORDER)
            .unwrap()
            .matrix_m_k_per_w;
        let n = matrix.len();
        let k = Mat::<f64>::from_fn(n, n, |i, j| matrix[i][j])
            .as_ref()
            .partial_piv_lu()
            .inverse();
        let (down, up) = d.legs();
        // Each U joins down[i] to up[i] at the foot.
        let (length, capacity) = (250.0, 500.0);
        let numeric = multi_leg_effective_resistance(&k, &down, &up, length, capacity);
        let formula = effective_resistance_uniform_wall_temperature(
            r.borehole_m_k_per_w,
            r.internal_m_k_per_w,
            length,
            capacity,
        )
        .unwrap();
        assert!(
            rel(formula, numeric) < 1e-6,
            "{pairing:?}: {formula} vs {numeric}"
        );
    }
}
