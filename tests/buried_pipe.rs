//! Checks of burrow::physics::buried_pipe.
//!
//! The main reference is tests/reference/buried_pipe_mfs.csv, written by buried_pipe_mfs.py: an
//! independent boundary-collocation solution (method of fundamental solutions, NumPy least
//! squares) of the full conduction problem — isothermal carriers, insulation, ground half-space —
//! that uses none of the closed forms under test. Each row carries a coarse and a fine solution;
//! `reference_is_converged` checks they agree before the fine value is used.

use burrow::physics::buried_pipe::ground::{
    ground_resistance_m_k_per_w, line_source_rise_k_per_w_per_m, mutual_resistance_m_k_per_w,
};
use burrow::physics::buried_pipe::seasonal::{MONTH_HOURS, annual_energy_kwh_per_m, monthly_pipe_states};
use burrow::physics::buried_pipe::sizing::{
    CandidateLoss, Economics, Layout, SizingCase, candidate_loss, cheapest, life_cycle_costs,
    present_value_factor, sweep, thinnest_meeting_limit,
};
use burrow::physics::buried_pipe::system::{
    Drive, PipeSection, pair_heat_rates_w_per_m, resistance_matrix, solve_pipes,
    solve_pipes_with_insulation_laws, temperature_rise_k,
};
use burrow::physics::buried_pipe::twin::{TwinMethod, TwinPipe};
use burrow::physics::buried_pipe::wall::{
    LinearConductivity, WallLayer, aged_lambda50_w_per_m_k, face_temperatures_c, wall_resistance_m_k_per_w,
};
use burrow::physics::buried_pipe::{DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W, GroundForm, Position, Soil};

const CSV: &str = include_str!("reference/buried_pipe_mfs.csv");

/// Fine reference value of `case`/`quantity`.
fn reference(case: &str, quantity: &str) -> f64 {
    CSV.lines()
        .filter(|l| !l.starts_with('#') && !l.starts_with("case,"))
        .map(|l| l.split(',').collect::<Vec<_>>())
        .find(|f| f[0] == case && f[1] == quantity)
        .map(|f| f[3].parse().expect("numeric reference"))
        .unwrap_or_else(|| panic!("reference row {case},{quantity} missing"))
}

fn rel(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs()
}

fn soil(r0: f64) -> Soil {
    Soil::new(1.5, r0).unwrap()
}

/// An insulated pipe as in the reference script: carrier radius `r_p` (isothermal, no steel),
/// polyurethane 0.027 W/(m K) out to `r_c`, no casing.
fn insulated(x_m: f64, depth_m: f64, r_p: f64, r_c: f64) -> PipeSection {
    PipeSection {
        centre: Position::new(x_m, depth_m),
        outer_radius_m: r_c,
        layers: vec![WallLayer::new(r_c - r_p, 0.027)],
    }
}

#[test]
fn reference_is_converged() {
    // The collocation reference at two resolutions (tests/reference/buried_pipe_mfs.py).
    for l in CSV
        .lines()
        .filter(|l| !l.starts_with('#') && !l.starts_with("case,"))
    {
        let f: Vec<&str> = l.split(',').collect();
        let (coarse, fine): (f64, f64) = (f[2].parse().unwrap(), f[3].parse().unwrap());
        assert!(rel(coarse, fine) < 1e-5, "reference row not converged: {l}");
    }
}

#[test]
fn bare_cylinder_ground_resistance_is_the_bipolar_closed_form() {
    // Isothermal cylinder r = 0.1 m under an isothermal surface, k = 1.5 W/(m K):
    // R = acosh(H/r)/(2πk) (shape factor 2π/acosh(2H/D), Carslaw & Jaeger 1959) against the
    // collocation reference, from a shallow H/r = 1.5 to a deep H/r = 30. Required 0.5 %.
    for h in [0.15, 0.3, 1.0, 3.0] {
        let r = ground_resistance_m_k_per_w(h, 0.1, &soil(0.0), GroundForm::Exact).unwrap();
        let r_ref = reference(&format!("bare_r0.1_h{h:?}"), "resistance_m_k_per_w");
        assert!(rel(r, r_ref) < 0.005, "H = {h}: {r} vs {r_ref}");
    }
}

#[test]
fn line_source_ground_resistance_tends_to_exact_for_deep_pipes() {
    // ln(2H/r) is the H ≫ r limit of acosh(H/r) (acosh x = ln(x + sqrt(x²−1)) → ln 2x); the
    // error ln(2/(1+sqrt(1−(r/H)²))) ≈ (r/2H)²: 1e-5 of R at H/r = 100 but 0.5 % of R at H/r = 3.
    let s = soil(0.0);
    let exact = |h| ground_resistance_m_k_per_w(h, 0.1, &s, GroundForm::Exact).unwrap();
    let line = |h| ground_resistance_m_k_per_w(h, 0.1, &s, GroundForm::LineSource).unwrap();
    assert!(rel(line(10.0), exact(10.0)) < 1e-5);
    assert!(rel(line(0.3), exact(0.3)) > 5e-3);
    assert!(
        line(0.3) > exact(0.3),
        "the line source overestimates the resistance of a shallow pipe"
    );
}

#[test]
fn surface_resistance_as_added_depth_matches_a_robin_surface() {
    // EN 13941-1 takes the surface resistance R0 as an added depth H' = H + k·R0. The reference
    // solves the Robin surface condition exactly (Green's function with a line of images,
    // Carslaw & Jaeger 1959). Required 0.5 % for R0 = 0.0685 (the default, `from memory`) and
    // for a large R0 = 0.2 m² K/W (snow cover).
    for r0 in [DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W, 0.2] {
        let r = ground_resistance_m_k_per_w(1.0, 0.1, &soil(r0), GroundForm::Exact).unwrap();
        let r_ref = reference(&format!("robin_r0.1_h1.0_R0{r0}"), "resistance_m_k_per_w");
        assert!(rel(r, r_ref) < 0.005, "R0 = {r0}: {r} vs {r_ref}");
    }
}

#[test]
fn insulated_single_pipe_matches_wall_plus_ground_in_series() {
    // Carrier 114.3 mm at 70 K above the ground, PUR 0.027 W/(m K) to r = 0.1 m, H = 1 m:
    // q = ΔT/(ln(r_c/r_p)/(2πλ_i) + acosh(H/r_c)/(2πk)) against the collocation reference (which
    // lets the casing surface take any temperature). Required 0.5 %.
    let pipe = insulated(0.0, 1.0, 0.05715, 0.1);
    let states = solve_pipes(
        &[pipe],
        &[Drive::FluidC(80.0)],
        &[10.0],
        &soil(0.0),
        GroundForm::Exact,
    )
    .unwrap();
    let q_ref = reference("single_insulated", "heat_w_per_m");
    assert!(
        rel(states[0].heat_w_per_m, q_ref) < 0.005,
        "{} vs {q_ref}",
        states[0].heat_w_per_m
    );
}

#[test]
fn wall_layers_add_in_series_and_equal_one_layer_of_the_same_material() {
    // Σ ln(r_{i+1}/r_i)/(2πk_i): two layers of one material equal a single layer
    // (ln a + ln b = ln ab); a steel wall adds almost nothing to the insulation.
    let split = [WallLayer::new(0.02, 0.027), WallLayer::new(0.03, 0.027)];
    let whole = [WallLayer::new(0.05, 0.027)];
    let a = wall_resistance_m_k_per_w(0.05, &split).unwrap();
    let b = wall_resistance_m_k_per_w(0.05, &whole).unwrap();
    assert!(rel(a, b) < 1e-12);
    let with_steel = [WallLayer::new(0.0036, 50.0), WallLayer::new(0.05, 0.027)];
    let c = wall_resistance_m_k_per_w(0.0464, &with_steel).unwrap();
    assert!(c > wall_resistance_m_k_per_w(0.05, &whole).unwrap());
}

#[test]
fn pair_matches_the_collocation_reference() {
    // Supply 80 °C, return 50 °C, ground 10 °C; k = 1.5; no surface resistance (the reference has
    // an isothermal surface). Equal pipes 0.35 m apart at 1 m (gap 0.15 m); unequal pipes at
    // unequal depths; an extreme pair only 2 cm apart at 0.6 m. Line sources neglect the
    // distortion of one pipe's field by the other's insulated body, an error growing as
    // (r_c/E)²: measured 0.3 % for the realistic gaps (required 0.5 %) and 1.2 % for the 2 cm gap
    // (required 1.5 %).
    let s = soil(0.0);
    let cases = [
        (
            "pair_equal",
            insulated(-0.175, 1.0, 0.05715, 0.1),
            insulated(0.175, 1.0, 0.05715, 0.1),
            0.005,
        ),
        (
            "pair_close",
            insulated(-0.11, 0.6, 0.05715, 0.1),
            insulated(0.11, 0.6, 0.05715, 0.1),
            0.015,
        ),
        (
            "pair_mixed",
            insulated(-0.2, 1.1, 0.0695, 0.125),
            insulated(0.2, 0.9, 0.04445, 0.09),
            0.005,
        ),
    ];
    for (name, sup, ret, tol) in cases {
        let q = solve_pipes(
            &[sup, ret],
            &[Drive::FluidC(80.0), Drive::FluidC(50.0)],
            &[10.0, 10.0],
            &s,
            GroundForm::Exact,
        )
        .unwrap();
        let (qs, qr) = (
            reference(name, "supply_heat_w_per_m"),
            reference(name, "return_heat_w_per_m"),
        );
        println!(
            "{name}: {:.4} {:.4} ref {qs:.4} {qr:.4}",
            q[0].heat_w_per_m, q[1].heat_w_per_m
        );
        assert!(
            rel(q[0].heat_w_per_m, qs) < tol,
            "{name} supply {} vs {qs}",
            q[0].heat_w_per_m
        );
        assert!(
            rel(q[1].heat_w_per_m, qr) < tol,
            "{name} return {} vs {qr}",
            q[1].heat_w_per_m
        );
    }
}

#[test]
fn mutual_resistance_at_equal_depths_is_the_en13941_form() {
    // EN 13941-1: R_m = ln(sqrt(1 + (2H'/E)²))/(2πλ_g), H' = H + λ_g·R0.
    let s = soil(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W);
    let (h, e) = (0.9, 0.3);
    let h_eff = h + 1.5 * DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W;
    let en = (1.0 + (2.0 * h_eff / e).powi(2)).sqrt().ln() / (2.0 * std::f64::consts::PI * 1.5);
    let r_m = mutual_resistance_m_k_per_w(Position::new(-e / 2.0, h), Position::new(e / 2.0, h), &s).unwrap();
    assert!(rel(r_m, en) < 1e-12, "{r_m} vs {en}");
}

#[test]
fn equal_pair_sum_and_difference_follow_en13941() {
    // For two equal pipes (R_s = R_r = R), EN 13941-1's pair formulas split into
    // q_s + q_r = (ΔT_s + ΔT_r)/(R + R_m) and q_s − q_r = (ΔT_s − ΔT_r)/(R − R_m).
    let s = soil(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W);
    let pipes = [
        insulated(-0.2, 0.9, 0.0445, 0.0875),
        insulated(0.2, 0.9, 0.0445, 0.0875),
    ];
    let r = resistance_matrix(&pipes, &s, GroundForm::LineSource).unwrap();
    let (own, mutual) = (r[0][0], r[0][1]);
    let (dts, dtr) = (85.0 - 8.0, 45.0 - 8.0);
    let [qs, qr] = pair_heat_rates_w_per_m(own, own, mutual, dts, dtr).unwrap();
    assert!(rel(qs + qr, (dts + dtr) / (own + mutual)) < 1e-12);
    assert!(rel(qs - qr, (dts - dtr) / (own - mutual)) < 1e-12);
    assert!(
        qr < qs && qr > 0.0,
        "the supply warms the return's soil: it loses less"
    );
}

#[test]
fn pair_closed_form_agrees_with_the_n_pipe_superposition() {
    // The 2×2 inverse (EN 13941-1) against the general N-pipe elimination, unequal pipes at
    // unequal depths with surface resistance; and a third pipe far away changes nothing.
    let s = soil(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W);
    let pipes = [
        insulated(-0.25, 1.2, 0.0695, 0.125),
        insulated(0.2, 0.9, 0.04445, 0.09),
    ];
    let r = resistance_matrix(&pipes, &s, GroundForm::Exact).unwrap();
    let closed = pair_heat_rates_w_per_m(r[0][0], r[1][1], r[0][1], 90.0 - 7.5, 45.0 - 8.0).unwrap();
    let states = solve_pipes(
        &pipes,
        &[Drive::FluidC(90.0), Drive::FluidC(45.0)],
        &[7.5, 8.0],
        &s,
        GroundForm::Exact,
    )
    .unwrap();
    assert!(rel(states[0].heat_w_per_m, closed[0]) < 1e-12);
    assert!(rel(states[1].heat_w_per_m, closed[1]) < 1e-12);
    let mut three = pipes.to_vec();
    three.push(insulated(500.0, 1.0, 0.05, 0.1));
    let far = solve_pipes(
        &three,
        &[Drive::FluidC(90.0), Drive::FluidC(45.0), Drive::FluidC(60.0)],
        &[7.5, 8.0, 8.0],
        &s,
        GroundForm::Exact,
    )
    .unwrap();
    assert!(rel(far[0].heat_w_per_m, closed[0]) < 1e-4);
}

#[test]
fn heat_driven_pipe_reaches_the_temperature_that_drives_the_same_heat() {
    // Superposition is linear: prescribing the heat rates solved for given temperatures must give
    // those temperatures back (mixed drives use the same matrix).
    let s = soil(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W);
    let pipes = [
        insulated(-0.2, 1.0, 0.05715, 0.1),
        insulated(0.2, 1.0, 0.05715, 0.1),
        PipeSection {
            centre: Position::new(1.0, 1.5),
            outer_radius_m: 0.08,
            layers: vec![],
        },
    ];
    let g = [8.0, 8.0, 8.5];
    let by_t = solve_pipes(
        &pipes,
        &[Drive::FluidC(80.0), Drive::FluidC(50.0), Drive::FluidC(12.0)],
        &g,
        &s,
        GroundForm::Exact,
    )
    .unwrap();
    let mixed = solve_pipes(
        &pipes,
        &[
            Drive::FluidC(80.0),
            Drive::HeatWPerM(by_t[1].heat_w_per_m),
            Drive::HeatWPerM(by_t[2].heat_w_per_m),
        ],
        &g,
        &s,
        GroundForm::Exact,
    )
    .unwrap();
    for (a, b) in by_t.iter().zip(&mixed) {
        assert!((a.fluid_c - b.fluid_c).abs() < 1e-9);
        assert!((a.heat_w_per_m - b.heat_w_per_m).abs() < 1e-9);
    }
}

fn twin_dn50(depth_m: f64) -> TwinPipe {
    // 2 × 60.3 mm carriers 80.3 mm apart in PUR 0.027 out to r = 0.1091 m (no casing wall, as in
    // the reference), no steel resistance.
    TwinPipe {
        centre: Position::new(0.0, depth_m),
        casing_outer_radius_m: 0.1091,
        casing_thickness_m: 0.0,
        casing_conductivity_w_per_m_k: 0.4,
        insulation_conductivity_w_per_m_k: 0.027,
        carrier_outer_radius_m: 0.03015,
        carrier_spacing_m: 0.0803,
        carrier_wall_resistance_m_k_per_w: 0.0,
    }
}

fn twin_cases() -> Vec<(&'static str, TwinPipe)> {
    let dn100 = TwinPipe {
        centre: Position::new(0.0, 1.0),
        casing_outer_radius_m: 0.1716,
        carrier_outer_radius_m: 0.05715,
        carrier_spacing_m: 0.1512,
        ..twin_dn50(1.0)
    };
    let tight = TwinPipe {
        centre: Position::new(0.0, 0.7),
        casing_outer_radius_m: 0.0784,
        carrier_outer_radius_m: 0.02415,
        carrier_spacing_m: 0.0702,
        ..twin_dn50(0.7)
    };
    vec![
        ("twin_dn50", twin_dn50(0.8)),
        ("twin_dn50_vertical", twin_dn50(0.8)),
        ("twin_dn100", dn100),
        ("twin_tight", tight),
    ]
}

#[test]
fn twin_pipe_multipole_matches_the_collocation_reference() {
    // Supply 80 °C, return 50 °C, ground 8 °C. The multipole method at order 6 (Bennet, Claesson
    // & Hellström 1987) against the collocation reference: required 0.5 % on each carrier. The
    // vertical twin has the same resistances (the surface's effect on the antisymmetric part is
    // neglected): the reference shows < 0.5 % difference.
    let s = soil(0.0);
    for (name, twin) in twin_cases() {
        let res = twin
            .resistances(&s, GroundForm::Exact, TwinMethod::Multipole { order: 6 })
            .unwrap();
        let [qs, qr] = res.heat_rates_w_per_m(80.0, 50.0, 8.0).unwrap();
        let (rs, rr) = (
            reference(name, "supply_heat_w_per_m"),
            reference(name, "return_heat_w_per_m"),
        );
        println!("{name}: multipole {qs:.4} {qr:.4} ref {rs:.4} {rr:.4}");
        assert!(rel(qs, rs) < 0.005, "{name} supply {qs} vs {rs}");
        assert!(rel(qr, rr) < 0.005, "{name} return {qr} vs {rr}");
    }
}

#[test]
fn twin_pipe_first_order_formulas_match_the_reference_within_3_percent() {
    // Wallentén's first-order twin formulas (EN 15698-1): required 3 % on the supply carrier and
    // on the total loss. The return carrier's small loss is a difference of two larger parts and
    // the first order errs on the antisymmetric part by up to ~3 % when the carriers are less
    // than one diameter apart; it is checked to 5 % (documented limitation of the first order).
    let s = soil(0.0);
    for (name, twin) in twin_cases() {
        let res = twin
            .resistances(&s, GroundForm::Exact, TwinMethod::FirstOrder)
            .unwrap();
        let [qs, qr] = res.heat_rates_w_per_m(80.0, 50.0, 8.0).unwrap();
        let (rs, rr) = (
            reference(name, "supply_heat_w_per_m"),
            reference(name, "return_heat_w_per_m"),
        );
        println!("{name}: first order {qs:.4} {qr:.4} ref {rs:.4} {rr:.4}");
        assert!(rel(qs, rs) < 0.03, "{name} supply {qs} vs {rs}");
        assert!(rel(qs + qr, rs + rr) < 0.03, "{name} total");
        assert!(rel(qr, rr) < 0.05, "{name} return {qr} vs {rr}");
    }
}

#[test]
fn multipole_order_one_reproduces_the_first_order_closed_form() {
    // The closed forms (hand-derived first order) and the numerical multipole solution at order 1
    // are two independent routes to the same truncation; with a steel wall (β > 0) too.
    let s = soil(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W);
    for (_, mut twin) in twin_cases() {
        for wall in [0.0, 0.02] {
            twin.carrier_wall_resistance_m_k_per_w = wall;
            let a = twin
                .resistances(&s, GroundForm::Exact, TwinMethod::FirstOrder)
                .unwrap();
            let b = twin
                .resistances(&s, GroundForm::Exact, TwinMethod::Multipole { order: 1 })
                .unwrap();
            assert!(rel(a.insulation_symmetric_m_k_per_w, b.insulation_symmetric_m_k_per_w) < 1e-10);
            assert!(rel(a.antisymmetric_m_k_per_w, b.antisymmetric_m_k_per_w) < 1e-10);
        }
    }
}

#[test]
fn twin_antisymmetric_resistance_without_casing_contrast_is_the_two_cylinder_closed_form() {
    // With the insulation's conductivity equal to the ground's (σ = 0) and the casing far away,
    // R_a is the resistance between two parallel cylinders in an infinite medium,
    // acosh(D/r)/(πk) for centres 2D apart (bipolar coordinates; the shape-factor table of any
    // conduction text, `from memory` for the table). The multipole series must converge to it.
    let s = Soil::new(0.027, 0.0).unwrap();
    let twin = TwinPipe {
        casing_outer_radius_m: 5.0,
        centre: Position::new(0.0, 50.0),
        ..twin_dn50(50.0)
    };
    let res = twin
        .resistances(&s, GroundForm::Exact, TwinMethod::Multipole { order: 12 })
        .unwrap();
    let exact = (0.04015f64 / 0.03015).acosh() / (std::f64::consts::PI * 0.027);
    assert!(
        rel(res.antisymmetric_m_k_per_w, exact) < 1e-6,
        "{} vs {exact}",
        res.antisymmetric_m_k_per_w
    );
}

#[test]
fn twin_dimensionless_coefficients_reproduce_the_heat_rates() {
    // Wallentén's form q = 2πλ_i[h_s(T_m − T_g) ± h_a(T_s − T_r)/2].
    let s = soil(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W);
    let res = twin_dn50(0.8)
        .resistances(&s, GroundForm::LineSource, TwinMethod::FirstOrder)
        .unwrap();
    let [qs, qr] = res.heat_rates_w_per_m(85.0, 45.0, 9.0).unwrap();
    let f = 2.0 * std::f64::consts::PI * 0.027;
    assert!(rel(qs, f * (res.h_s() * (65.0 - 9.0) + res.h_a() * 20.0)) < 1e-12);
    assert!(rel(qr, f * (res.h_s() * (65.0 - 9.0) - res.h_a() * 20.0)) < 1e-12);
}

#[test]
fn neighbour_temperature_matches_the_reference_field() {
    // Soil temperature rise beside the equal pair against the collocation field. Line sources
    // with images treat the pipes' bodies as soil; a real insulated pipe is a poorly conducting
    // obstacle that deflects the other sources' field (an induced dipole decaying as
    // (r_c/d)²). Measured 0.1–2.1 % at 4–20 casing radii; required 2.5 %, which on these
    // 1–4 K rises is below 0.08 K.
    let s = soil(0.0);
    let pipes = [
        insulated(-0.175, 1.0, 0.05715, 0.1),
        insulated(0.175, 1.0, 0.05715, 0.1),
    ];
    let st = solve_pipes(
        &pipes,
        &[Drive::FluidC(80.0), Drive::FluidC(50.0)],
        &[10.0, 10.0],
        &s,
        GroundForm::Exact,
    )
    .unwrap();
    let q = [st[0].heat_w_per_m, st[1].heat_w_per_m];
    let centres = [pipes[0].centre, pipes[1].centre];
    for (x, z) in [
        (0.6, 1.0),
        (1.0, 1.0),
        (2.0, 1.0),
        (0.0, 0.4),
        (0.0, 2.0),
        (1.0, 0.5),
    ] {
        let rise = temperature_rise_k(Position::new(x, z), &centres, &[0.1, 0.1], &q, &s).unwrap();
        let r = reference(&format!("pair_equal_probe_x{x:?}_z{z:?}"), "rise_k");
        println!(
            "probe ({x}, {z}): {rise:.4} vs {r:.4}: {:.2} %",
            100.0 * rel(rise, r)
        );
        assert!(rel(rise, r) < 0.025, "({x}, {z}): {rise} vs {r}");
    }
}

#[test]
fn neighbour_temperature_falls_with_distance_and_stays_between_ground_and_supply() {
    // Physical bounds (maximum principle): the soil lies between the undisturbed ground and the
    // hottest fluid, and the rise falls away from the pipes.
    let s = soil(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W);
    let pipes = [
        insulated(-0.175, 1.0, 0.05715, 0.1),
        insulated(0.175, 1.0, 0.05715, 0.1),
    ];
    let st = solve_pipes(
        &pipes,
        &[Drive::FluidC(80.0), Drive::FluidC(50.0)],
        &[10.0, 10.0],
        &s,
        GroundForm::Exact,
    )
    .unwrap();
    let q = [st[0].heat_w_per_m, st[1].heat_w_per_m];
    let centres = [pipes[0].centre, pipes[1].centre];
    let mut last = f64::INFINITY;
    for x in [0.3, 0.4, 0.6, 1.0, 1.5, 2.5, 4.0] {
        let t = 10.0 + temperature_rise_k(Position::new(x, 1.0), &centres, &[0.1, 0.1], &q, &s).unwrap();
        assert!(t > 10.0 && t < 80.0, "x = {x}: {t} °C");
        assert!(t < last, "x = {x}: {t} °C does not fall");
        last = t;
    }
    let inside = temperature_rise_k(Position::new(-0.15, 1.0), &centres, &[0.1, 0.1], &q, &s);
    assert!(inside.is_err(), "a point inside a pipe is refused");
}

#[test]
fn annual_energy_is_mean_rate_times_8760_hours_for_constant_temperatures() {
    // Months of 365/12 days: with constant temperatures E = q·8760 h.
    assert!((MONTH_HOURS * 12.0 - 8760.0).abs() < 1e-9);
    let s = soil(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W);
    let pipes = [
        insulated(-0.175, 1.0, 0.05715, 0.1),
        insulated(0.175, 1.0, 0.05715, 0.1),
    ];
    let states = monthly_pipe_states(
        &pipes,
        &[[Drive::FluidC(80.0); 12], [Drive::FluidC(50.0); 12]],
        &[[9.0; 12], [9.0; 12]],
        &s,
        GroundForm::Exact,
    )
    .unwrap();
    let q = states[0][0].heat_w_per_m;
    let e = annual_energy_kwh_per_m(&states[0].map(|m| m.heat_w_per_m)).unwrap();
    assert!(rel(e, q * 8760.0 / 1000.0) < 1e-12);
}

#[test]
fn seasonal_ground_swing_changes_monthly_loss_but_not_the_annual_mean() {
    // Steady states are linear in the ground temperature: a symmetric ±5 K annual swing around
    // the same mean leaves the annual energy unchanged and gives the largest loss in the coldest
    // month.
    let s = soil(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W);
    let pipes = [insulated(0.0, 1.0, 0.05715, 0.1)];
    let swing: [f64; 12] =
        std::array::from_fn(|m| 9.0 - 5.0 * (2.0 * std::f64::consts::PI * (m as f64 + 0.5) / 12.0).cos());
    let flat = monthly_pipe_states(
        &pipes,
        &[[Drive::FluidC(80.0); 12]],
        &[[9.0; 12]],
        &s,
        GroundForm::Exact,
    )
    .unwrap();
    let wave = monthly_pipe_states(
        &pipes,
        &[[Drive::FluidC(80.0); 12]],
        &[swing],
        &s,
        GroundForm::Exact,
    )
    .unwrap();
    let e = |x: &[_; 12]| {
        annual_energy_kwh_per_m(&x.map(|m: burrow::physics::buried_pipe::system::PipeState| m.heat_w_per_m))
            .unwrap()
    };
    assert!(rel(e(&wave[0]), e(&flat[0])) < 1e-12);
    assert!(wave[0][0].heat_w_per_m > flat[0][0].heat_w_per_m);
}

fn pair_case() -> SizingCase {
    // DN100 (114.3 × 3.6 mm steel), PUR 0.027, PE casing 4 mm 0.4 W/(m K), 1.0 m deep, 0.15 m
    // clear gap; 80/50 °C against a 9 °C ground (invented demo data).
    SizingCase {
        layout: Layout::Pair { clear_gap_m: 0.15 },
        depth_m: 1.0,
        carrier_outer_radius_m: 0.05715,
        carrier_layers: vec![WallLayer::new(0.0036, 50.0)],
        insulation_conductivity_w_per_m_k: 0.027,
        casing_thickness_m: 0.004,
        casing_conductivity_w_per_m_k: 0.4,
        soil: soil(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W),
        form: GroundForm::Exact,
        supply_c: [80.0; 12],
        return_c: [50.0; 12],
        ground_c: [9.0; 12],
    }
}

const THICKNESSES_M: [f64; 8] = [0.02, 0.03, 0.045, 0.06, 0.08, 0.1, 0.13, 0.16];

#[test]
fn heat_loss_falls_as_insulation_grows() {
    // More insulation, less loss, for pairs, single pipes and twins (physical monotonicity).
    for layout in [
        Layout::Pair { clear_gap_m: 0.15 },
        Layout::Single,
        Layout::Twin {
            carrier_spacing_m: 0.15,
            method: TwinMethod::FirstOrder,
        },
    ] {
        let case = SizingCase {
            layout,
            ..pair_case()
        };
        let c = sweep(&case, &THICKNESSES_M).unwrap();
        for w in c.windows(2) {
            assert!(
                w[1].mean_heat_loss_w_per_m < w[0].mean_heat_loss_w_per_m,
                "{layout:?}"
            );
            assert!(w[1].outer_diameter_m > w[0].outer_diameter_m);
        }
    }
}

#[test]
fn thinnest_candidate_meeting_a_loss_limit_is_picked() {
    // Against a limit between two candidates' losses, the thicker of the two is the answer;
    // a limit below every candidate gives none.
    let c = sweep(&pair_case(), &THICKNESSES_M).unwrap();
    let limit = 0.5 * (c[3].mean_heat_loss_w_per_m + c[4].mean_heat_loss_w_per_m);
    assert_eq!(thinnest_meeting_limit(&c, limit), Some(4));
    assert_eq!(thinnest_meeting_limit(&c, 0.1), None);
    let mut reversed: Vec<CandidateLoss> = c.clone();
    reversed.reverse();
    assert_eq!(
        reversed[thinnest_meeting_limit(&reversed, limit).unwrap()].insulation_thickness_m,
        0.08
    );
}

#[test]
fn present_value_factor_matches_the_annuity_table() {
    // Uniform-series present-worth factor (P/A, 4 %, 30 years) = 17.2920 (interest tables of
    // engineering economics, `from memory`); 0 % gives the number of years.
    assert!((present_value_factor(0.04, 30.0).unwrap() - 17.2920).abs() < 1e-3);
    assert_eq!(present_value_factor(0.0, 30.0).unwrap(), 30.0);
}

#[test]
fn life_cycle_optimum_is_interior_for_sensible_prices() {
    // Heat 60 €/MWh, 30 years, 4 %; insulation cost rising with the insulation's volume
    // (invented: 40 €/m for the pipe pair plus 2 500 €/m³ of foam and casing): the cheapest
    // candidate is neither the thinnest nor the thickest (common practice, no source: the
    // economic optimum of pre-insulated pairs lies in the middle of the series).
    let c = sweep(&pair_case(), &THICKNESSES_M).unwrap();
    let cost: Vec<f64> = c
        .iter()
        .map(|k| {
            let r_o = 0.5 * k.outer_diameter_m;
            40.0 + 2.0 * 2500.0 * std::f64::consts::PI * (r_o * r_o - 0.05715 * 0.05715)
        })
        .collect();
    let econ = Economics {
        heat_price_per_mwh: 60.0,
        discount_rate: 0.04,
        years: 30.0,
    };
    let lcc = life_cycle_costs(&c, &cost, &econ).unwrap();
    let best = cheapest(&lcc).unwrap();
    println!("life-cycle costs {lcc:?}, best {best}");
    assert!(best > 0 && best < c.len() - 1, "optimum at the edge: {best}");
}

#[test]
fn temperature_dependent_insulation_settles_at_its_mean_temperature() {
    // λ(T) = 0.026 + 1e-4·(T − 50) (an EN 253-style linear law, invented coefficients): the
    // converged λ equals the law at the mean of the insulation's faces, and a hotter supply pipe
    // gets the larger λ.
    let s = soil(DEFAULT_SURFACE_RESISTANCE_M2_K_PER_W);
    let law = LinearConductivity::new(0.026, 50.0, 1e-4).unwrap();
    let pipes = [
        insulated(-0.175, 1.0, 0.05715, 0.1),
        insulated(0.175, 1.0, 0.05715, 0.1),
    ];
    let (states, lambdas) = solve_pipes_with_insulation_laws(
        &pipes,
        &[Some((0, law)), Some((0, law))],
        &[Drive::FluidC(110.0), Drive::FluidC(50.0)],
        &[9.0, 9.0],
        &s,
        GroundForm::Exact,
    )
    .unwrap();
    for (i, st) in states.iter().enumerate() {
        let lambda = lambdas[i].unwrap();
        let layers = [WallLayer::new(0.1 - 0.05715, lambda)];
        let faces = face_temperatures_c(st.fluid_c, st.heat_w_per_m, 0.05715, &layers).unwrap();
        let expect = law.at(0.5 * (faces[0] + faces[1])).unwrap();
        assert!((lambda - expect).abs() < 1e-8);
    }
    assert!(lambdas[0].unwrap() > lambdas[1].unwrap());
    assert!(aged_lambda50_w_per_m_k(0.026, 0.15).unwrap() > 0.026);
}

#[test]
fn bad_inputs_are_refused_with_a_message() {
    let s = soil(0.0);
    assert!(Soil::new(-1.0, 0.0).is_err());
    assert!(Soil::new(1.5, f64::NAN).is_err());
    assert!(ground_resistance_m_k_per_w(0.05, 0.1, &s, GroundForm::Exact).is_err());
    let overlapping = [insulated(0.0, 1.0, 0.05, 0.1), insulated(0.15, 1.0, 0.05, 0.1)];
    let e = solve_pipes(
        &overlapping,
        &[Drive::FluidC(80.0), Drive::FluidC(50.0)],
        &[9.0, 9.0],
        &s,
        GroundForm::Exact,
    )
    .unwrap_err();
    assert!(e.contains("overlap"), "{e}");
    assert!(line_source_rise_k_per_w_per_m(Position::new(0.0, -1.0), Position::new(0.0, 1.0), &s).is_err());
    let mut twin = twin_dn50(0.8);
    twin.carrier_spacing_m = 0.2;
    assert!(
        twin.resistances(&s, GroundForm::Exact, TwinMethod::FirstOrder)
            .is_err()
    );
    assert!(present_value_factor(0.04, 0.0).is_err());
    assert!(candidate_loss(&pair_case(), -0.01).is_err());
    assert!(
        LinearConductivity::new(0.026, 50.0, 1e-3)
            .unwrap()
            .at(-100.0)
            .is_err()
    );
}
