//! In-pipe convection and hydraulics, each check against a named independent reference.

use burrow::materials::fluids::{Fluid, Mixture};
use burrow::physics::pipe_flow::*;
use std::f64::consts::PI;

fn rel(a: f64, b: f64) -> f64 {
    (a / b - 1.0).abs()
}

#[test]
fn laminar_loop_pressure_drop_equals_hagen_poiseuille() {
    // Hagen–Poiseuille: Δp = 128 μ L V̇ / (π d⁴) for fully developed laminar flow (any fluid
    // mechanics text, e.g. White, Fluid Mechanics, eq. (6.44)); written here independently of
    // the Darcy form the module uses.
    let fluid = Fluid::new(Mixture::PropyleneGlycol, 0.3).unwrap();
    let (t_c, d, length) = (0.0, 0.0262, 300.0);
    let mass_flow = 0.05;
    let flow = tube_flow(&fluid, t_c, mass_flow, d).unwrap();
    assert!(
        flow.reynolds < LAMINAR_LIMIT_RE,
        "case must be laminar, Re = {}",
        flow.reynolds
    );
    let f = darcy_friction_factor(flow.reynolds, 0.0, TurbulentFriction::Colebrook).unwrap();
    let ours = loop_pressure_drop_pa(&flow, f, length, 0.0).unwrap();
    let mu = fluid.dynamic_viscosity_pa_s(t_c);
    let volume_flow = mass_flow / fluid.density_kg_per_m3(t_c);
    let hagen_poiseuille = 128.0 * mu * length * volume_flow / (PI * d.powi(4));
    assert!(
        rel(ours, hagen_poiseuille) < 1e-12,
        "{ours} vs {hagen_poiseuille}"
    );
}

#[test]
fn reynolds_number_of_a_tube_is_four_mass_flow_over_pi_d_mu() {
    // Identity Re = ρ v d/μ = 4 ṁ/(π d μ) for a circular tube.
    let water = Fluid::new(Mixture::Water, 0.0).unwrap();
    let flow = tube_flow(&water, 10.0, 0.3, 0.0326).unwrap();
    let expected = 4.0 * 0.3 / (PI * 0.0326 * water.dynamic_viscosity_pa_s(10.0));
    assert!(rel(flow.reynolds, expected) < 1e-12);
}

#[test]
fn colebrook_matches_moody_chart_values() {
    // Moody (1944) chart / Colebrook values as tabulated in fluid-mechanics texts
    // (from memory, read to 3 figures: tolerance 1.5 %).
    let cases = [
        (1.0e4, 0.0, 0.0309),
        (1.0e5, 0.0, 0.0180),
        (1.0e6, 0.0, 0.0116),
        (1.0e5, 1.0e-3, 0.0222),
    ];
    for (re, eps, moody) in cases {
        let f = darcy_friction_colebrook(re, eps).unwrap();
        assert!(rel(f, moody) < 0.015, "Re {re}, ε/d {eps}: {f} vs Moody {moody}");
    }
}

#[test]
fn colebrook_reaches_nikuradse_fully_rough_law() {
    // Nikuradse (1933) fully rough law as given by von Kármán: 1/√f = 1.14 + 2 log10(d/ε)
    // (White, Fluid Mechanics, eq. (6.63), from memory). Colebrook at Re = 1e9 must approach it;
    // the constants 1.14 and 2 log10 3.7 = 1.136 differ by 0.3 %.
    for eps in [1e-3_f64, 1e-2, 0.05] {
        let nikuradse = (1.14 + 2.0 * (1.0 / eps).log10()).powi(-2);
        let f = darcy_friction_colebrook(1e9, eps).unwrap();
        assert!(rel(f, nikuradse) < 0.005, "ε/d {eps}: {f} vs {nikuradse}");
    }
}

#[test]
fn haaland_within_two_percent_of_colebrook() {
    // Haaland (1983) states agreement with Colebrook within about ±1.5 %; checked at 2 %
    // over the Moody chart's turbulent range.
    let mut worst: f64 = 0.0;
    for eps in [0.0, 1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 0.05] {
        for i in 0..=44 {
            let re = 4000.0 * 10f64.powf(0.1 * i as f64);
            let c = darcy_friction_colebrook(re, eps).unwrap();
            let h = darcy_friction_haaland(re, eps).unwrap();
            worst = worst.max(rel(h, c));
        }
    }
    assert!(worst < 0.02, "worst Haaland/Colebrook difference {worst}");
}

#[test]
fn friction_factor_is_continuous_across_the_transition() {
    // Construction check: the interpolation meets laminar 64/Re at 2300 and Colebrook at 4000.
    let below = darcy_friction_factor(
        LAMINAR_LIMIT_RE * (1.0 - 1e-12),
        0.0,
        TurbulentFriction::Colebrook,
    )
    .unwrap();
    let at = darcy_friction_factor(LAMINAR_LIMIT_RE, 0.0, TurbulentFriction::Colebrook).unwrap();
    assert!(rel(below, at) < 1e-9);
    let top = darcy_friction_factor(
        TURBULENT_FROM_RE * (1.0 - 1e-12),
        0.0,
        TurbulentFriction::Colebrook,
    )
    .unwrap();
    let turbulent = darcy_friction_colebrook(TURBULENT_FROM_RE, 0.0).unwrap();
    assert!(rel(top, turbulent) < 1e-9);
}

#[test]
fn laminar_nusselt_numbers_are_the_analytic_values() {
    // Shah & London (1978): uniform wall temperature 3.6568 (Graetz eigenvalue), uniform heat
    // flux 48/11 = 4.3636 (exact). From memory, 4 figures.
    assert!((nusselt_laminar(LaminarWall::UniformTemperature) - 3.6568).abs() < 1e-3);
    assert!((nusselt_laminar(LaminarWall::UniformHeatFlux) - 4.3636).abs() < 1e-4);
    assert_eq!(
        nusselt_tube(1000.0, 7.0, LaminarWall::default()).unwrap(),
        nusselt_laminar(LaminarWall::UniformTemperature)
    );
}

#[test]
fn gnielinski_hand_calculation_at_re_1e4_pr_7() {
    // Hand calculation of Gnielinski (1976) eq. at Re = 1e4, Pr = 7:
    // f = (0.79 ln 1e4 − 1.64)⁻² = 5.63618⁻² = 0.0314793; f/8 = 0.00393491;
    // Nu = 0.00393491·9000·7 / (1 + 12.7·0.0627289·(7^(2/3) − 1)) = 247.899/3.11862 = 79.49.
    // Dittus–Boelter 0.023 Re^0.8 Pr^0.4 gives 79.39 at the same point (Incropera eq. 8.60).
    let nu = nusselt_gnielinski_1976(1.0e4, 7.0).unwrap();
    assert!((nu - 79.49).abs() < 0.02, "{nu}");
}

#[test]
fn gnielinski_agrees_with_petukhov_1970() {
    // Petukhov (1970), Nu = (f/8) Re Pr / (1.07 + 12.7 √(f/8)(Pr^(2/3) − 1)), stated accurate to
    // 5–6 % for 1e4 < Re < 5e6, 0.5 < Pr < 200 (Incropera, from memory). Gnielinski's form
    // departs from it by design at low Re (the −1000 term) and low Pr (1 instead of 1.07);
    // both fit the same data, so they are asked to agree within 10 % over 1e4–1e6, Pr 0.7–100.
    let mut worst: f64 = 0.0;
    for re in [1e4_f64, 3e4, 1e5, 3e5, 1e6] {
        for pr in [0.7_f64, 2.0, 7.0, 20.0, 100.0] {
            let f8 = friction_factor_filonenko(re).unwrap() / 8.0;
            let petukhov = f8 * re * pr / (1.07 + 12.7 * f8.sqrt() * (pr.powf(2.0 / 3.0) - 1.0));
            worst = worst.max(rel(nusselt_gnielinski_1976(re, pr).unwrap(), petukhov));
        }
    }
    assert!(worst < 0.10, "worst Gnielinski/Petukhov difference {worst}");
}

#[test]
fn gnielinski_agrees_with_dittus_boelter_within_its_stated_error() {
    // Dittus–Boelter Nu = 0.023 Re^0.8 Pr^0.4 (Incropera eq. 8.60), stated to err by up to 25 %
    // (Incropera §8.5, from memory), Re 1e4–1e5, Pr 0.7–100.
    for re in [1e4_f64, 3e4, 1e5] {
        for pr in [0.7_f64, 2.0, 7.0, 20.0, 100.0] {
            let db = 0.023 * re.powf(0.8) * pr.powf(0.4);
            let nu = nusselt_gnielinski_1976(re, pr).unwrap();
            assert!(rel(nu, db) < 0.25, "Re {re} Pr {pr}: {nu} vs {db}");
        }
    }
}

#[test]
fn tube_nusselt_is_continuous_at_both_ends_of_the_transition() {
    // Gnielinski (2013): the interpolation joins the laminar value at 2300 and the turbulent
    // equation at 4000.
    for wall in [LaminarWall::UniformTemperature, LaminarWall::UniformHeatFlux] {
        let at_2300 = nusselt_tube(LAMINAR_LIMIT_RE, 5.0, wall).unwrap();
        assert!((at_2300 - nusselt_laminar(wall)).abs() < 1e-9);
        let below_4000 = nusselt_tube(TURBULENT_FROM_RE * (1.0 - 1e-12), 5.0, wall).unwrap();
        let at_4000 = nusselt_gnielinski_1976(TURBULENT_FROM_RE, 5.0).unwrap();
        assert!(rel(below_4000, at_4000) < 1e-9);
    }
}

#[test]
fn laminar_annulus_reaches_parallel_plate_and_tube_limits() {
    // Shah & London (1978): parallel plates, one wall isothermal, the other insulated,
    // Nu(d_h = 2 gap) = 4.861 (from memory). Outer wall of an annulus with a vanishing core is a
    // tube: 3.657.
    for wall in [AnnulusWall::Inner, AnnulusWall::Outer] {
        let nu = nusselt_annulus_laminar(1.0, wall).unwrap();
        assert!((nu - 4.861).abs() < 0.01, "{wall:?}: {nu}");
    }
    let outer_tiny_core = nusselt_annulus_laminar(1e-9, AnnulusWall::Outer).unwrap();
    assert!((outer_tiny_core - 3.657).abs() < 0.01);
}

#[test]
fn turbulent_annulus_walls_agree_in_the_parallel_plate_limit() {
    // Symmetry: as d_i/D_o → 1 both walls of the annulus become equivalent plates, so the
    // Gnielinski (2009) inner- and outer-wall factors must give the same Nusselt number.
    let inner = nusselt_annulus(3e4, 5.0, 0.999, AnnulusWall::Inner).unwrap();
    let outer = nusselt_annulus(3e4, 5.0, 0.999, AnnulusWall::Outer).unwrap();
    assert!(rel(inner, outer) < 1e-3, "{inner} vs {outer}");
}

#[test]
fn pipe_wall_resistance_hand_value() {
    // PE 100 pipe 32 × 2.9 mm, k = 0.4 W/(m K): ln(16/13.1)/(2π·0.4) = 0.199977/2.513274 = 0.079568 m K/W (hand).
    let r = cylinder_wall_resistance_m_k_per_w(0.0131, 0.016, 0.4).unwrap();
    assert!((r - 0.079568).abs() < 1e-6, "{r}");
}

#[test]
fn pumping_power_is_pressure_drop_times_flow_over_efficiency() {
    // Definition of hydraulic power (any pump text): 50 kPa · 0.5 l/s / 0.4 = 62.5 W.
    let p = pumping_power_w(50_000.0, 0.5e-3, 0.4).unwrap();
    assert!((p - 62.5).abs() < 1e-9);
}

#[test]
fn bad_inputs_are_refused_with_a_message() {
    assert!(darcy_friction_colebrook(-1.0, 0.0).is_err());
    assert!(darcy_friction_haaland(1e5, 0.2).is_err());
    assert!(nusselt_tube(f64::NAN, 5.0, LaminarWall::default()).is_err());
    assert!(nusselt_tube(1e5, 0.1, LaminarWall::default()).is_err());
    assert!(pumping_power_w(1.0, 1.0, 0.0).is_err());
    assert!(cylinder_wall_resistance_m_k_per_w(0.02, 0.01, 0.4).is_err());
    let water = Fluid::new(Mixture::Water, 0.0).unwrap();
    assert!(
        tube_flow(&water, -5.0, 0.3, 0.03).is_err(),
        "water below its freezing point"
    );
    assert!(annulus_flow(&water, 10.0, 0.3, 0.05, 0.04).is_err());
}

#[test]
fn laminar_film_resistance_does_not_depend_on_diameter() {
    // Fully developed laminar flow: h = Nu k/d, so R = 1/(π d h) = 1/(π Nu k) for every d
    // (consequence of a constant Nusselt number; Shah & London 1978).
    let fluid = Fluid::new(Mixture::EthyleneGlycol, 0.25).unwrap();
    let t_c = -2.0;
    let k = fluid.conductivity_w_per_m_k(t_c);
    let expected = 1.0 / (PI * nusselt_laminar(LaminarWall::UniformTemperature) * k);
    for d in [0.02, 0.0262, 0.04] {
        let flow = tube_flow(&fluid, t_c, 0.02, d).unwrap();
        assert!(flow.reynolds < LAMINAR_LIMIT_RE);
        let wall_only = cylinder_wall_resistance_m_k_per_w(d / 2.0, d / 2.0 + 0.003, 0.4).unwrap();
        let r_p = pipe_resistance_m_k_per_w(
            &flow,
            LaminarWall::UniformTemperature,
            d / 2.0,
            d / 2.0 + 0.003,
            0.4,
        )
        .unwrap();
        assert!(rel(r_p - wall_only, expected) < 1e-12, "d = {d}");
    }
}
