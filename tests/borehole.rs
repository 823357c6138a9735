//! Borehole thermal resistances: multipole method against closed forms and an independent
//! numerical solution of the cross-section.

use burrow::physics::borehole::*;
use std::f64::consts::PI;

fn rel(a: f64, b: f64) -> f64 {
    (a / b - 1.0).abs()
}

fn single(rb: f64, rp: f64, s: f64, lb: f64, l: f64, r_pipe: f64) -> SingleU {
    SingleU {
        borehole_radius_m: rb,
        pipe_outer_radius_m: rp,
        shank_spacing_m: s,
        grout_conductivity_w_per_m_k: lb,
        ground_conductivity_w_per_m_k: l,
        pipe_resistance_m_k_per_w: r_pipe,
    }
}

/// Single-U cases spanning grout lighter and heavier than the ground, close and wide shanks.
fn single_cases() -> Vec<SingleU> {
    vec![
        single(0.075, 0.016, 0.070, 1.5, 2.5, 0.05),
        single(0.075, 0.016, 0.100, 0.8, 3.5, 0.08),
        single(0.075, 0.016, 0.050, 3.0, 1.5, 0.02),
        single(0.060, 0.020, 0.060, 2.0, 2.0, 0.12),
        single(0.075, 0.016, 0.070, 1.5, 2.5, 0.0),
    ]
}

#[test]
fn first_order_multipole_equals_claesson_hellstrom_closed_form() {
    // Claesson & Hellström (2011), HVAC&R Research 17(6), first-order formulas for R_b and R_a
    // (as written in `SingleU::first_order_closed_form`) against the general multipole solver
    // truncated at order 1: the same approximation, computed two independent ways.
    for u in single_cases() {
        let closed = u.first_order_closed_form().unwrap();
        let general = u.resistances(1).unwrap();
        assert!(
            rel(closed.borehole_m_k_per_w, general.borehole_m_k_per_w) < 1e-12,
            "{u:?}"
        );
        assert!(
            rel(closed.internal_m_k_per_w, general.internal_m_k_per_w) < 1e-12,
            "{u:?}"
        );
    }
}

#[test]
fn zeroth_order_multipole_equals_line_source_formula() {
    // Claesson & Hellström (2011) zeroth-order (line-source) formulas for R_b and R_a.
    for u in single_cases() {
        let closed = u.zeroth_order_closed_form().unwrap();
        let general = u.resistances(0).unwrap();
        assert!(rel(closed.borehole_m_k_per_w, general.borehole_m_k_per_w) < 1e-12);
        assert!(rel(closed.internal_m_k_per_w, general.internal_m_k_per_w) < 1e-12);
    }
}

#[test]
fn centred_pipe_gives_the_concentric_cylinder_resistance() {
    // One pipe at the borehole centre: R_b = R_p + ln(r_b/r_p)/(2π λ_b) exactly, whatever the
    // ground conductivity (Carslaw & Jaeger 1959, §7.2, section number from memory, steady radial conduction).
    for (lb, l) in [(1.5, 2.5), (3.0, 0.5), (2.0, 2.0)] {
        let section = CrossSection {
            borehole_radius_m: 0.07,
            grout_conductivity_w_per_m_k: lb,
            ground_conductivity_w_per_m_k: l,
            pipes: vec![PipeInBorehole {
                x_m: 0.0,
                y_m: 0.0,
                outer_radius_m: 0.02,
                pipe_resistance_m_k_per_w: 0.03,
            }],
        };
        let r = section.resistance_matrix(DEFAULT_MULTIPOLE_ORDER).unwrap();
        let exact = 0.03 + (0.07_f64 / 0.02).ln() / (2.0 * PI * lb);
        assert!(rel(r.borehole_resistance_m_k_per_w().unwrap(), exact) < 1e-12);
    }
}

#[test]
fn eccentric_pipe_in_isothermal_borehole_matches_bipolar_shape_factor() {
    // Ground conductivity → ∞ makes the borehole wall isothermal (σ → −1). One eccentric pipe
    // (eccentricity e) then has the exact resistance
    // R = R_p + acosh((r_b² + r_p² − e²)/(2 r_b r_p))/(2π λ_b)
    // (eccentric cylinders: Incropera & DeWitt, Fundamentals of Heat and Mass Transfer,
    // Table 4.1, S = 2π/cosh⁻¹((D² + d² − 4e²)/(2Dd)), from memory).
    let (rb, rp, lb) = (0.075_f64, 0.016_f64, 1.5);
    for e in [0.01, 0.03, 0.045] {
        let section = CrossSection {
            borehole_radius_m: rb,
            grout_conductivity_w_per_m_k: lb,
            ground_conductivity_w_per_m_k: 1e12,
            pipes: vec![PipeInBorehole {
                x_m: e,
                y_m: 0.0,
                outer_radius_m: rp,
                pipe_resistance_m_k_per_w: 0.0,
            }],
        };
        let r = section
            .resistance_matrix(MAX_MULTIPOLE_ORDER)
            .unwrap()
            .borehole_resistance_m_k_per_w()
            .unwrap();
        let exact = ((rb * rb + rp * rp - e * e) / (2.0 * rb * rp)).acosh() / (2.0 * PI * lb);
        assert!(rel(r, exact) < 1e-8, "e = {e}: {r} vs {exact}");
    }
}

#[test]
fn resistance_matrix_is_symmetric() {
    // Reciprocity of steady conduction: R_ij = R_ji.
    let d = DoubleU {
        borehole_radius_m: 0.07,
        pipe_outer_radius_m: 0.016,
        shank_spacing_m: 0.09,
        grout_conductivity_w_per_m_k: 1.2,
        ground_conductivity_w_per_m_k: 3.0,
        pipe_resistance_m_k_per_w: 0.07,
        pairing: DoubleUPairing::Diagonal,
    };
    let mut section = d.cross_section();
    section.pipes[1].pipe_resistance_m_k_per_w = 0.02; // break the symmetry of the layout
    section.pipes[2].x_m = -0.03;
    let r = section
        .resistance_matrix(DEFAULT_MULTIPOLE_ORDER)
        .unwrap()
        .matrix_m_k_per_w;
    assert_eq!(r.len(), 4);
    for (i, row) in r.iter().enumerate() {
        for (j, r_ij) in row.iter().enumerate() {
            assert!((r_ij - r[j][i]).abs() < 1e-12 * r[i][i], "R[{i},{j}]");
        }
    }
}

#[test]
fn multipole_correction_vanishes_as_pipes_shrink() {
    // As r_p → 0 at fixed shank spacing the line-source (zeroth-order) value becomes exact; the
    // leading multipole correction scales as (r_p/2x_c)² (Claesson & Hellström 2011), so halving
    // r_p divides it by about 4. β is held fixed so that only the geometry changes.
    let beta = 0.3;
    let correction = |rp: f64| {
        let lb = 1.5;
        let u = single(0.075, rp, 0.07, lb, 2.5, beta / (2.0 * PI * lb));
        u.resistances(0).unwrap().borehole_m_k_per_w
            - u.resistances(DEFAULT_MULTIPOLE_ORDER).unwrap().borehole_m_k_per_w
    };
    let (c1, c2, c3) = (correction(0.008), correction(0.004), correction(0.002));
    assert!(c1 > 0.0 && c2 > 0.0 && c3 > 0.0);
    assert!(
        (c1 / c2 - 4.0).abs() < 0.2 && (c2 / c3 - 4.0).abs() < 0.05,
        "{c1} {c2} {c3}"
    );
}

struct MfsCase {
    kind: String,
    pairing: String,
    values: Vec<f64>,
}

fn mfs_cases() -> Vec<MfsCase> {
    let text = include_str!("reference/borehole_mfs.csv");
    text.lines()
        .skip(1)
        .map(|line| {
            let cols: Vec<&str> = line.split(',').collect();
            MfsCase {
                kind: cols[0].to_string(),
                pairing: cols[1].to_string(),
                values: cols[2..].iter().map(|v| v.parse().unwrap()).collect(),
            }
        })
        .collect()
}

fn multipole_for(case: &MfsCase, order: usize) -> BoreholeResistances {
    let v = &case.values;
    if case.kind == "single" {
        single(v[0], v[1], v[2], v[3], v[4], v[5])
            .resistances(order)
            .unwrap()
    } else {
        DoubleU {
            borehole_radius_m: v[0],
            pipe_outer_radius_m: v[1],
            shank_spacing_m: v[2],
            grout_conductivity_w_per_m_k: v[3],
            ground_conductivity_w_per_m_k: v[4],
            pipe_resistance_m_k_per_w: v[5],
            pairing: if case.pairing == "adjacent" {
                DoubleUPairing::Adjacent
            } else {
                DoubleUPairing::Diagonal
            },
        }
        .resistances(order)
        .unwrap()
    }
}

#[test]
fn multipole_matches_independent_fundamental_solution_reference() {
    // tests/reference/borehole_mfs.py: method of fundamental solutions for the same
    // cross-section (no multipoles, no image formulas), self-converged to < 1e-9. The multipole
    // method at order 10 must agree to 1e-6 on R_b and R_a, single and double U, both pairings,
    // including pipes 1.5 mm from the borehole wall and 2 mm from each other.
    let cases = mfs_cases();
    assert!(cases.len() >= 10);
    for case in &cases {
        let (rb_ref, ra_ref) = (case.values[6], case.values[7]);
        let ours = multipole_for(case, DEFAULT_MULTIPOLE_ORDER);
        assert!(
            rel(ours.borehole_m_k_per_w, rb_ref) < 1e-6,
            "{} {:?}: R_b {} vs {rb_ref}",
            case.kind,
            case.values,
            ours.borehole_m_k_per_w
        );
        assert!(
            rel(ours.internal_m_k_per_w, ra_ref) < 1e-6,
            "{} {:?}: R_a {} vs {ra_ref}",
            case.kind,
            case.values,
            ours.internal_m_k_per_w
        );
    }
}

#[test]
fn first_order_is_within_two_percent_and_line_source_within_fifteen() {
    // Accuracy of the low orders against the same reference. Claesson & Hellström (2011) report
    // first-order errors of at most about 1 % in practical cases (from memory); 2 % is asked
    // here because the reference set includes pipes almost touching the wall. The zeroth order
    // is known to be much worse (errors of 10 % and more; Javed & Spitler 2017, from memory).
    for case in &mfs_cases() {
        let (rb_ref, ra_ref) = (case.values[6], case.values[7]);
        let first = multipole_for(case, 1);
        let zeroth = multipole_for(case, 0);
        assert!(rel(first.borehole_m_k_per_w, rb_ref) < 0.02, "{:?}", case.values);
        assert!(rel(first.internal_m_k_per_w, ra_ref) < 0.02, "{:?}", case.values);
        assert!(rel(zeroth.borehole_m_k_per_w, rb_ref) < 0.15, "{:?}", case.values);
    }
}

#[test]
fn double_u_pairing_changes_only_the_internal_resistance() {
    // Physical expectation: R_b has all four legs at one temperature, so the pairing cannot
    // matter; with the downward legs opposite (adjacent pairing) each downward leg has two upward
    // neighbours, so R_a is smaller.
    let base = DoubleU {
        borehole_radius_m: 0.07,
        pipe_outer_radius_m: 0.016,
        shank_spacing_m: 0.09,
        grout_conductivity_w_per_m_k: 1.5,
        ground_conductivity_w_per_m_k: 2.5,
        pipe_resistance_m_k_per_w: 0.05,
        pairing: DoubleUPairing::Diagonal,
    };
    let diagonal = base.resistances(DEFAULT_MULTIPOLE_ORDER).unwrap();
    let adjacent = DoubleU {
        pairing: DoubleUPairing::Adjacent,
        ..base
    }
    .resistances(DEFAULT_MULTIPOLE_ORDER)
    .unwrap();
    assert!(rel(diagonal.borehole_m_k_per_w, adjacent.borehole_m_k_per_w) < 1e-12);
    assert!(adjacent.internal_m_k_per_w < diagonal.internal_m_k_per_w);
}

#[test]
fn coaxial_borehole_resistance_equals_centred_pipe_multipole() {
    // Two independent paths to the annulus-to-wall resistance of a concentric layout: the
    // layered-cylinder sum of `Coaxial::resistances`, and the multipole solver with one centred
    // pipe (radius = outer pipe's outer radius, R_p = annulus film + outer wall).
    let c = Coaxial {
        borehole_radius_m: 0.07,
        inner_pipe_inner_radius_m: 0.0204,
        inner_pipe_outer_radius_m: 0.025,
        inner_pipe_conductivity_w_per_m_k: 0.4,
        outer_pipe_inner_radius_m: 0.0509,
        outer_pipe_outer_radius_m: 0.0555,
        outer_pipe_conductivity_w_per_m_k: 0.4,
        grout_conductivity_w_per_m_k: 2.0,
        h_inner_pipe_w_m2_k: 1500.0,
        h_annulus_inner_wall_w_m2_k: 900.0,
        h_annulus_outer_wall_w_m2_k: 800.0,
    };
    let ours = c.resistances().unwrap();
    let r_p = 1.0 / (2.0 * PI * 0.0509 * 800.0) + (0.0555_f64 / 0.0509).ln() / (2.0 * PI * 0.4);
    let section = CrossSection {
        borehole_radius_m: 0.07,
        grout_conductivity_w_per_m_k: 2.0,
        ground_conductivity_w_per_m_k: 2.5,
        pipes: vec![PipeInBorehole {
            x_m: 0.0,
            y_m: 0.0,
            outer_radius_m: 0.0555,
            pipe_resistance_m_k_per_w: r_p,
        }],
    };
    let multipole = section
        .resistance_matrix(4)
        .unwrap()
        .borehole_resistance_m_k_per_w()
        .unwrap();
    assert!(rel(ours.borehole_m_k_per_w, multipole) < 1e-12);
    // R_a by hand: 1/(2π·0.0204·1500) + ln(0.025/0.0204)/(2π·0.4) + 1/(2π·0.025·900)
    //            = 0.005201 + 0.080907 + 0.007074 = 0.093182 m K/W.
    assert!(
        (ours.internal_m_k_per_w - 0.093182).abs() < 2e-6,
        "{}",
        ours.internal_m_k_per_w
    );
}

#[test]
fn impossible_geometries_are_refused() {
    assert!(
        single(0.075, 0.016, 0.03, 1.5, 2.5, 0.05).resistances(5).is_err(),
        "legs overlap"
    );
    assert!(
        single(0.075, 0.016, 0.13, 1.5, 2.5, 0.05).resistances(5).is_err(),
        "leg outside the borehole"
    );
    assert!(
        single(0.075, 0.016, 0.07, -1.0, 2.5, 0.05)
            .resistances(5)
            .is_err(),
        "negative conductivity"
    );
    assert!(
        single(0.075, 0.016, 0.07, 1.5, 2.5, 0.05)
            .resistances(MAX_MULTIPOLE_ORDER + 1)
            .is_err()
    );
    assert!(
        single(0.075, 0.016, 0.13, 1.5, 2.5, 0.05)
            .first_order_closed_form()
            .is_err()
    );
}
