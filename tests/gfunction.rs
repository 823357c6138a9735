//! Borehole-field g-functions (burrow::physics::gfunction) against independent references.
//!
//! Reference data: tests/reference/gfunction_reference.py (SciPy quad / quad_vec, a dense
//! straightforward segment implementation, special.exp1, special.j1/y1) writes
//! tests/reference/gfunction_single.csv and tests/reference/gfunction_fields.csv.

use burrow::physics::gfunction::{
    Borehole, NearField, Options, WallCondition, characteristic_time_s, default_times, gfunction,
    gfunction_with, rectangle,
};

const LINE: Options = Options {
    near_field: NearField::LineSource,
};

/// Rows of a reference CSV (comment lines start with '#', the first other line is the header).
fn read_csv(name: &str) -> (String, Vec<Vec<String>>) {
    let path = format!("{}/tests/reference/{name}", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{path}: {e}"));
    let comment: String = text
        .lines()
        .filter(|l| l.starts_with('#'))
        .collect::<Vec<_>>()
        .join("\n");
    let rows = text
        .lines()
        .filter(|l| !l.starts_with('#') && !l.is_empty())
        .skip(1)
        .map(|l| l.split(',').map(str::to_string).collect())
        .collect();
    (comment, rows)
}

struct SingleRow {
    ln_t_ts: f64,
    t_s: f64,
    fls: f64,
    ils: f64,
    cylinder: f64,
}

/// One borehole of the single-borehole reference: H = 150 m, D = 4 m, r_b = 0.07 m, α = 1e-6.
const ALPHA: f64 = 1e-6;
fn single_borehole() -> Vec<Borehole> {
    rectangle(1, 1, 6.0, 150.0, 4.0, 0.07)
}

fn single_reference() -> (Vec<SingleRow>, f64) {
    let (_, rows) = read_csv("gfunction_single.csv");
    let mut out = Vec::new();
    let mut steady = f64::NAN;
    for r in rows {
        if r[0] == "inf" {
            steady = r[2].parse().unwrap();
            continue;
        }
        let v: Vec<f64> = r.iter().map(|x| x.parse().unwrap()).collect();
        out.push(SingleRow {
            ln_t_ts: v[0],
            t_s: v[1],
            fls: v[2],
            ils: v[3],
            cylinder: v[4],
        });
    }
    (out, steady)
}

fn relative(a: f64, b: f64) -> f64 {
    (a / b - 1.0).abs()
}

#[test]
fn single_borehole_uniform_flux_matches_the_fls_integral_from_scipy() {
    // Reference: Claesson & Javed (2011) mean-wall FLS integral by scipy.integrate.quad (itself
    // checked against a direct double integral of the point source in the script).
    // Requirement: 0.5 % for ln(t/ts) ≥ −8; the quadrature here is far better, so the check is
    // 1e-9 at every time from −10 to 3 (measured: 2e-12).
    let (reference, _) = single_reference();
    let times: Vec<f64> = reference.iter().map(|r| r.t_s).collect();
    let g = gfunction_with(
        &single_borehole(),
        ALPHA,
        &times,
        WallCondition::UniformHeatFlux,
        &LINE,
    )
    .unwrap();
    for (row, gi) in reference.iter().zip(&g) {
        assert!(
            relative(*gi, row.fls) < 1e-9,
            "ln(t/ts) = {:.2}: {gi} vs SciPy {}",
            row.ln_t_ts,
            row.fls
        );
    }
}

#[test]
fn cylinder_source_near_field_adds_the_scipy_cylinder_minus_line_difference() {
    // Reference: FLS (quad) + [cylinder source (Carslaw & Jaeger §13.7, scipy j1/y1 + quad)
    // − infinite line source (scipy exp1)], all from the SciPy script.
    let (reference, _) = single_reference();
    let times: Vec<f64> = reference.iter().map(|r| r.t_s).collect();
    let g = gfunction(&single_borehole(), ALPHA, &times, WallCondition::UniformHeatFlux).unwrap();
    for (row, gi) in reference.iter().zip(&g) {
        let expected = row.fls + row.cylinder - row.ils;
        assert!(
            relative(*gi, expected) < 1e-9,
            "ln(t/ts) = {:.2}: {gi} vs {expected}",
            row.ln_t_ts
        );
    }
    // The correction matters at early times (Fo ≈ 23 at ln(t/ts) = −10: about 2 %) and vanishes
    // late: it is the radius effect, not a change of the far field.
    let first = &reference[0];
    assert!(relative(g[0], first.fls) > 0.01);
    assert!(relative(g[39], reference[39].fls) < 1e-6);
}

#[test]
fn single_borehole_tends_to_the_steady_finite_line_source_at_late_times() {
    // Reference: the steady FLS in closed form (double integral of 1/ρ for the source and its
    // image, F(u) = u·asinh(u/r) − √(u² + r²)), computed in the SciPy script.
    let (_, steady) = single_reference();
    let ts = characteristic_time_s(150.0, ALPHA);
    let times = [ts * 3f64.exp(), ts * 12f64.exp()];
    let g = gfunction_with(
        &single_borehole(),
        ALPHA,
        &times,
        WallCondition::UniformHeatFlux,
        &LINE,
    )
    .unwrap();
    assert!(relative(g[1], steady) < 1e-6, "{} vs steady {steady}", g[1]);
    assert!(g[0] < g[1] && relative(g[0], steady) < 2e-3);
}

#[test]
fn single_borehole_tends_to_the_infinite_line_source_at_early_times() {
    // Reference: infinite line source ½E1(r²/(4αt)) (scipy.special.exp1). End effects make
    // the FLS smaller; the gap shrinks as t → 0 (from the SciPy data: 0.1 % at ln(t/ts) = −10).
    let (reference, _) = single_reference();
    let times: Vec<f64> = reference.iter().map(|r| r.t_s).collect();
    let g = gfunction_with(
        &single_borehole(),
        ALPHA,
        &times,
        WallCondition::UniformHeatFlux,
        &LINE,
    )
    .unwrap();
    let gaps: Vec<f64> = reference
        .iter()
        .zip(&g)
        .map(|(r, gi)| (r.ils - gi) / r.ils)
        .collect();
    assert!(
        gaps[0] > 0.0 && gaps[0] < 2e-3,
        "gap at ln(t/ts) = −10: {}",
        gaps[0]
    );
    assert!(
        gaps[..10].windows(2).all(|w| w[0] < w[1]),
        "the gap must grow with time: {gaps:?}"
    );
}

#[test]
fn single_borehole_follows_eskilsons_short_time_formula() {
    // Eskilson (1987): for 5 r_b²/α < t < t_s, g ≈ ln(H/(2 r_b)) + ½ ln(t/t_s) (from memory;
    // it is the line-source asymptote). Checked from ln(t/ts) = −9 to −6 within 1 %.
    let (reference, _) = single_reference();
    let times: Vec<f64> = reference.iter().map(|r| r.t_s).collect();
    let g = gfunction_with(
        &single_borehole(),
        ALPHA,
        &times,
        WallCondition::UniformHeatFlux,
        &LINE,
    )
    .unwrap();
    for (row, gi) in reference.iter().zip(&g) {
        if (-9.0..=-6.0).contains(&row.ln_t_ts) {
            let eskilson = (150.0_f64 / (2.0 * 0.07)).ln() + 0.5 * row.ln_t_ts;
            assert!(
                relative(*gi, eskilson) < 0.01,
                "ln(t/ts) = {}: {gi} vs {eskilson}",
                row.ln_t_ts
            );
        }
    }
}

struct FieldCase {
    rows: usize,
    columns: usize,
    spacing_m: f64,
    segments: usize,
    times: Vec<f64>,
    ubwt: Vec<f64>,
    uhf: Vec<f64>,
}

fn field_reference() -> Vec<FieldCase> {
    let (_, rows) = read_csv("gfunction_fields.csv");
    let mut cases: Vec<FieldCase> = Vec::new();
    for r in rows {
        let key = (
            r[1].parse::<usize>().unwrap(),
            r[2].parse().unwrap(),
            r[3].parse::<f64>().unwrap(),
            r[4].parse().unwrap(),
        );
        let same = cases
            .last()
            .is_some_and(|c| (c.rows, c.columns, c.spacing_m, c.segments) == key);
        if !same {
            cases.push(FieldCase {
                rows: key.0,
                columns: key.1,
                spacing_m: key.2,
                segments: key.3,
                times: Vec::new(),
                ubwt: Vec::new(),
                uhf: Vec::new(),
            });
        }
        let c = cases.last_mut().unwrap();
        c.times.push(r[6].parse().unwrap());
        c.ubwt.push(r[7].parse().unwrap());
        c.uhf.push(r[8].parse().unwrap());
    }
    cases
}

/// The reference fields: H = 100 m, D = 2 m, r_b = 0.05 m, α = 1e-6 m²/s.
fn reference_field(c: &FieldCase) -> Vec<Borehole> {
    rectangle(c.rows, c.columns, c.spacing_m, 100.0, 2.0, 0.05)
}

#[test]
fn small_fields_uniform_wall_temperature_match_the_dense_scipy_implementation() {
    // Reference: 2 × 2 and 3 × 3 fields at B/H = 0.05 and 0.1, a dense SciPy implementation
    // (every segment pair by quad_vec, no symmetry, same temporal-superposition variant,
    // numpy.linalg.solve).
    let cases = field_reference();
    assert_eq!(cases.len(), 4);
    for c in &cases {
        let condition = WallCondition::UniformTemperature { segments: c.segments };
        let g = gfunction_with(&reference_field(c), ALPHA, &c.times, condition, &LINE).unwrap();
        for (k, (gi, expected)) in g.iter().zip(&c.ubwt).enumerate() {
            assert!(
                relative(*gi, *expected) < 1e-8,
                "{}×{} B = {} m, time {k}: {gi} vs SciPy {expected}",
                c.rows,
                c.columns,
                c.spacing_m
            );
        }
    }
}

#[test]
fn small_fields_uniform_heat_flux_match_the_dense_scipy_implementation() {
    for c in &field_reference() {
        let g = gfunction_with(
            &reference_field(c),
            ALPHA,
            &c.times,
            WallCondition::UniformHeatFlux,
            &LINE,
        )
        .unwrap();
        for (gi, expected) in g.iter().zip(&c.uhf) {
            assert!(relative(*gi, *expected) < 1e-8, "{gi} vs SciPy {expected}");
        }
    }
}

#[test]
fn uniform_wall_temperature_lies_below_uniform_flux_for_fields() {
    // Physical fact: for a given total heat rate the isothermal wall has the lowest mean wall
    // temperature (the heat moves to where the ground is least disturbed), so g_UBWT < g_UHF,
    // the gap growing as the boreholes interact (Cimmino & Bernier 2014, their comparisons).
    let field = rectangle(3, 4, 6.0, 150.0, 4.0, 0.07);
    let times = default_times(150.0, ALPHA);
    let ubwt = gfunction(&field, ALPHA, &times, WallCondition::uniform_temperature()).unwrap();
    let uhf = gfunction(&field, ALPHA, &times, WallCondition::UniformHeatFlux).unwrap();
    for (k, (a, b)) in ubwt.iter().zip(&uhf).enumerate() {
        assert!(a < b, "time {k}: UBWT {a} must be below UHF {b}");
    }
    assert!((uhf[39] - ubwt[39]) / uhf[39] > 0.05);
}

#[test]
fn one_segment_uniform_wall_temperature_of_one_borehole_equals_uniform_flux() {
    // With one borehole and one segment the heat rate is fixed, so both conditions coincide.
    let times = default_times(150.0, ALPHA);
    let a = gfunction(
        &single_borehole(),
        ALPHA,
        &times,
        WallCondition::UniformTemperature { segments: 1 },
    )
    .unwrap();
    let b = gfunction(&single_borehole(), ALPHA, &times, WallCondition::UniformHeatFlux).unwrap();
    for (x, y) in a.iter().zip(&b) {
        assert!(relative(*x, *y) < 1e-12);
    }
    // With 12 segments the single borehole's UBWT value lies (slightly) below its UHF value.
    let c = gfunction(
        &single_borehole(),
        ALPHA,
        &times,
        WallCondition::uniform_temperature(),
    )
    .unwrap();
    assert!(c[39] < b[39] && relative(c[39], b[39]) < 0.02);
}

#[test]
fn g_grows_with_time_and_with_the_number_of_boreholes() {
    let times = default_times(150.0, ALPHA);
    let mut previous_last = 0.0;
    for n in [1, 2, 3, 4] {
        let g = gfunction(
            &rectangle(n, n, 6.0, 150.0, 4.0, 0.07),
            ALPHA,
            &times,
            WallCondition::uniform_temperature(),
        )
        .unwrap();
        assert!(
            g.windows(2).all(|w| w[1] > w[0]),
            "{n}×{n}: g must grow with time"
        );
        assert!(
            g[39] > previous_last,
            "{n}×{n}: g must grow with the number of boreholes"
        );
        previous_last = g[39];
    }
}

#[test]
fn symmetry_reduction_does_not_change_the_result() {
    // Moving one borehole by 1 mm removes every symmetry, so the full system is solved; the
    // g-function must agree with the reduced (eightfold) solution of the exact square.
    let times = default_times(150.0, ALPHA);
    let square = rectangle(4, 4, 6.0, 150.0, 4.0, 0.07);
    let mut moved = square.clone();
    moved[5].x_m += 0.001;
    let a = gfunction(&square, ALPHA, &times, WallCondition::uniform_temperature()).unwrap();
    let b = gfunction(&moved, ALPHA, &times, WallCondition::uniform_temperature()).unwrap();
    for (x, y) in a.iter().zip(&b) {
        assert!(relative(*x, *y) < 2e-4, "{x} vs {y}");
    }
    // Order, translation and a 90° rotation of the field leave g unchanged.
    let mut turned: Vec<Borehole> = square
        .iter()
        .map(|b| Borehole {
            x_m: 100.0 - b.y_m,
            y_m: b.x_m - 7.0,
            ..*b
        })
        .collect();
    turned.reverse();
    let c = gfunction(&turned, ALPHA, &times, WallCondition::uniform_temperature()).unwrap();
    for (x, y) in a.iter().zip(&c) {
        assert!(relative(*x, *y) < 1e-10);
    }
}

#[test]
fn fields_of_unequal_boreholes_are_solved() {
    // Two lengths and two depths: no shared segment structure; UBWT still below UHF.
    let mut field = rectangle(2, 3, 7.0, 120.0, 3.0, 0.06);
    field[0].length_m = 90.0;
    field[4].buried_depth_m = 10.0;
    let times = default_times(120.0, ALPHA);
    let a = gfunction(&field, ALPHA, &times, WallCondition::uniform_temperature()).unwrap();
    let b = gfunction(&field, ALPHA, &times, WallCondition::UniformHeatFlux).unwrap();
    assert!(a.iter().zip(&b).all(|(x, y)| x < y && *x > 0.0));
}

#[test]
fn default_times_span_eskilsons_range() {
    let times = default_times(150.0, ALPHA);
    let ts = characteristic_time_s(150.0, ALPHA);
    assert_eq!(times.len(), 40);
    assert!(((times[0] / ts).ln() + 10.0).abs() < 1e-12);
    assert!(((times[39] / ts).ln() - 3.0).abs() < 1e-12);
}

#[test]
fn bad_input_is_refused_with_a_message() {
    let times = default_times(150.0, ALPHA);
    let ok = single_borehole();
    let uhf = WallCondition::UniformHeatFlux;
    assert!(gfunction(&[], ALPHA, &times, uhf).unwrap_err().contains("empty"));
    assert!(
        gfunction(&ok, -1.0, &times, uhf)
            .unwrap_err()
            .contains("diffusivity")
    );
    assert!(gfunction(&ok, ALPHA, &[], uhf).is_err());
    assert!(
        gfunction(&ok, ALPHA, &[2.0, 1.0], uhf)
            .unwrap_err()
            .contains("increasing")
    );
    assert!(gfunction(&ok, ALPHA, &[f64::NAN], uhf).is_err());
    let zero = WallCondition::UniformTemperature { segments: 0 };
    assert!(
        gfunction(&ok, ALPHA, &times, zero)
            .unwrap_err()
            .contains("segments")
    );
    let mut bad = ok.clone();
    bad[0].length_m = 0.0;
    assert!(
        gfunction(&bad, ALPHA, &times, uhf)
            .unwrap_err()
            .contains("length")
    );
    let mut bad = ok.clone();
    bad[0].radius_m = f64::INFINITY;
    assert!(
        gfunction(&bad, ALPHA, &times, uhf)
            .unwrap_err()
            .contains("radius")
    );
    let too_early = gfunction_with(&ok, ALPHA, &[1.0], uhf, &LINE).unwrap_err();
    assert!(too_early.contains("too short"));
    let ubwt = WallCondition::uniform_temperature();
    let many_times: Vec<f64> = (1..=2000).map(|i| 1e5 * f64::from(i)).collect();
    assert!(
        gfunction(&ok, ALPHA, &many_times, ubwt)
            .unwrap_err()
            .contains("at most")
    );
    // 150 geometric times: 11 325 distinct differences × 180 distances × 35 segment pairs.
    let geometric: Vec<f64> = (0..150).map(|i| 1e5 * 1.08_f64.powi(i)).collect();
    let big = rectangle(20, 20, 6.0, 150.0, 4.0, 0.07);
    assert!(
        gfunction(&big, ALPHA, &geometric, ubwt)
            .unwrap_err()
            .contains("fewer times")
    );
    let overlapping = rectangle(1, 2, 0.1, 150.0, 4.0, 0.07);
    assert!(
        gfunction(&overlapping, ALPHA, &times, uhf)
            .unwrap_err()
            .contains("overlap")
    );
}
