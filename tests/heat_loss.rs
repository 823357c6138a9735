//! `kind: heat-loss` through the whole pipeline (site text → results), against closed forms.

use burrow::results::{Figures, HeatLossResult, Results};
use burrow::site;
use std::f64::consts::PI;
use std::path::Path;

/// A site with a constant surface temperature and no geothermal flux: the undisturbed ground is
/// exactly `T_G` everywhere, so the steady closed forms apply month by month.
const T_G: f64 = 8.0;
const K: f64 = 1.6;

fn site_with(study: &str) -> String {
    format!(
        "site: {{name: heat loss check}}
climate: {{model: constant, temperature: {T_G}}}
ground:
  layers:
    - {{name: fill, conductivity: {K}, heat_capacity: 2.0e6}}
studies:
{study}"
    )
}

fn run(text: &str) -> Results {
    let loaded = site::load_text(text, "t.yaml", Path::new(".")).unwrap_or_else(|e| panic!("{e:#?}"));
    burrow::compute(&loaded, "t.yaml", b"", &burrow::Silent).unwrap()
}

fn heat_loss(r: &Results) -> &HeatLossResult {
    match &r.studies[0].figures {
        Figures::HeatLoss(h) => h,
        #[allow(unreachable_patterns)]
        _ => panic!("not a heat-loss study"),
    }
}

const PIPE: &str = "  - id: single
    kind: heat-loss
    surface_resistance: 0.0685
    pipes:
      - id: p
        x: 0
        depth: 0.9
        outer_diameter: 200 mm
        layers:
          - {name: steel, thickness: 4 mm, conductivity: 50}
          - {name: insulation, thickness: 50 mm, conductivity: 0.026}
          - {name: casing, thickness: 3 mm, conductivity: 0.4}
        fluid: {temperature: 80}
";

/// Wall layers in series (Carslaw & Jaeger §7.2: ln(r₂/r₁)/(2πk) each) plus the exact ground
/// resistance of a cylinder under an isothermal surface, acosh(H'/r_o)/(2πk) (shape factor of any
/// conduction text, e.g. Incropera, Table 4.1, case 1), with the surface resistance as an added
/// depth H' = H + k·R0 (EN 13941-1 practice).
#[test]
fn a_single_pipe_matches_the_closed_form() {
    let r = run(&site_with(PIPE));
    let h = heat_loss(&r);
    let r_o: f64 = 0.1;
    let radii = [r_o - 0.057, r_o - 0.053, r_o - 0.003, r_o];
    let ks = [50.0, 0.026, 0.4];
    let wall: f64 = (0..3)
        .map(|i| (radii[i + 1] / radii[i]).ln() / (2.0 * PI * ks[i]))
        .sum();
    let h_eff = 0.9 + K * 0.0685;
    let ground = (h_eff / r_o).acosh() / (2.0 * PI * K);
    let q = (80.0 - T_G) / (wall + ground);
    let got = h.pipes[0].heat_loss_w_per_m;
    assert!(((got - q) / q).abs() < 0.005, "{got} vs {q}");
    // Constant temperatures: the annual energy is the mean rate over 8760 h.
    assert!((h.pipes[0].annual_heat_loss_kwh_per_m - q * 8760.0 / 1000.0).abs() < 1e-6 * q * 8.76);
    assert!((h.pipes[0].u_w_per_m_k - q / (80.0 - T_G)).abs() < 1e-9);
}

const PAIR: &str = "  - id: pair
    kind: heat-loss
    length: 500 m
    pipes:
      - id: supply
        x: -0.2
        depth: 1.0
        outer_diameter: 225 mm
        layers: [{name: insulation, thickness: 60 mm, conductivity: 0.027}]
        fluid: {temperature: 90}
      - id: return
        x: 0.2
        depth: 1.0
        outer_diameter: 225 mm
        layers: [{name: insulation, thickness: 60 mm, conductivity: 0.027}]
        fluid: {temperature: 50}
    neighbours:
      - {id: near, x: 0.6, depth: 1.0, limit: 12}
      - {id: mid, x: 1.2, depth: 1.0}
      - {id: far, x: 3.0, depth: 1.0}
";

/// EN 13941-1 two-pipe formulas (Wallentén 1991): with own resistances R (insulation + ground)
/// and the mutual resistance R_m = ln(sqrt(1 + (2H'/E)²))/(2πk),
/// q_s = (R·ΔT_s − R_m·ΔT_r)/(R² − R_m²), q_r = (R·ΔT_r − R_m·ΔT_s)/(R² − R_m²).
#[test]
fn a_pair_matches_the_en_13941_two_pipe_formulas() {
    let r = run(&site_with(PAIR));
    let h = heat_loss(&r);
    let (r_o, r_i): (f64, f64) = (0.1125, 0.1125 - 0.06);
    let h_eff = 1.0 + K * 0.0685; // the kind's default surface resistance
    let own = (r_o / r_i).ln() / (2.0 * PI * 0.027) + (h_eff / r_o).acosh() / (2.0 * PI * K);
    let mutual = (1.0 + (2.0 * h_eff / 0.4_f64).powi(2)).sqrt().ln() / (2.0 * PI * K);
    let (ds, dr) = (90.0 - T_G, 50.0 - T_G);
    let det = own * own - mutual * mutual;
    let qs = (own * ds - mutual * dr) / det;
    let qr = (own * dr - mutual * ds) / det;
    let (gs, gr) = (h.pipes[0].heat_loss_w_per_m, h.pipes[1].heat_loss_w_per_m);
    assert!(
        ((gs - qs) / qs).abs() < 1e-9 && ((gr - qr) / qr).abs() < 1e-9,
        "{gs} {gr} vs {qs} {qr}"
    );
    assert!((h.total_heat_loss_w_per_m - qs - qr).abs() < 1e-9);
    assert!((h.annual_heat_loss_mwh - (qs + qr) * 8.76 * 500.0 / 1000.0).abs() < 1e-6);
}

/// The soil temperature at a neighbour falls with distance from the pipes and lies between the
/// undisturbed ground and the supply temperature (maximum principle of steady conduction).
#[test]
fn neighbour_temperature_falls_with_distance_and_stays_between_ground_and_supply() {
    let r = run(&site_with(PAIR));
    let h = heat_loss(&r);
    let t: Vec<f64> = h.neighbours.iter().map(|n| n.max_temperature_c).collect();
    assert!(t[0] > t[1] && t[1] > t[2], "{t:?}");
    assert!(t.iter().all(|&x| x > T_G && x < 90.0), "{t:?}");
    assert_eq!(h.neighbours[0].exceeds_limit, t[0] > 12.0);
    let flagged = r.warnings.iter().any(|w| w.code == "heat_loss.neighbour_limit");
    assert_eq!(flagged, h.neighbours[0].exceeds_limit);
}

fn sizing_site(limit: f64) -> String {
    site_with(&format!(
        "{PAIR}    sizing:
      layer: insulation
      thicknesses: [80 mm, 30 mm, 40 mm, 50 mm, 60 mm, 100 mm, 120 mm, 150 mm]
      heat_loss_limit: {limit} W/m
      economic: {{heat_price: 60, cost_per_metre: [420, 300, 320, 345, 372, 480, 550, 660], years: 30, discount_rate: 4 %}}
"
    ))
}

#[test]
fn sizing_picks_the_thinnest_candidate_meeting_the_limit() {
    let r = run(&sizing_site(25.0));
    let s = heat_loss(&r).sizing.as_ref().unwrap();
    let mut by_t: Vec<_> = s.candidates.iter().collect();
    by_t.sort_by(|a, b| a.insulation_thickness_m.total_cmp(&b.insulation_thickness_m));
    // Loss falls as insulation grows.
    assert!(
        by_t.windows(2)
            .all(|w| w[1].heat_loss_w_per_m < w[0].heat_loss_w_per_m)
    );
    let thinnest_ok = by_t
        .iter()
        .find(|c| c.heat_loss_w_per_m <= 25.0)
        .unwrap()
        .insulation_thickness_m;
    assert_eq!(s.chosen_insulation_thickness_m, Some(thinnest_ok));
    // A limit no candidate meets: none chosen, and a caution says so.
    let r = run(&sizing_site(1.0));
    assert_eq!(
        heat_loss(&r)
            .sizing
            .as_ref()
            .unwrap()
            .chosen_insulation_thickness_m,
        None
    );
    assert!(r.warnings.iter().any(|w| w.code == "heat_loss.limit_not_met"));
}

/// With a realistic price and cost set, the cheapest life-cycle cost lies inside the candidate
/// range: thin insulation loses too much heat, thick insulation costs too much to lay.
#[test]
fn the_economic_optimum_is_interior() {
    let r = run(&sizing_site(25.0));
    let s = heat_loss(&r).sizing.as_ref().unwrap();
    let best = s.cheapest_insulation_thickness_m.unwrap();
    assert!(best > 0.03 && best < 0.15, "optimum at the edge: {best}");
    // The present value factor (1 − (1 + i)^−n)/i, i = 4 %, n = 30 (any engineering-economics
    // text): the 30 mm candidate's cost is that factor × its annual heat cost + 300.
    let pv = (1.0 - 1.04_f64.powf(-30.0)) / 0.04;
    let c30 = s
        .candidates
        .iter()
        .find(|c| c.insulation_thickness_m == 0.03)
        .unwrap();
    let want = pv * c30.annual_heat_loss_kwh_per_m / 1000.0 * 60.0 + 300.0;
    assert!((c30.life_cycle_cost_per_m.unwrap() - want).abs() < 1e-9);
}

/// Sizing keeps the clear gap between the casings: at 150 mm the casings (radius 0.2025 m) would
/// overlap at the given centres ±0.2 m, so the run only succeeds because the trench widens.
#[test]
fn thick_candidates_do_not_make_the_pipes_overlap() {
    let r = run(&sizing_site(25.0));
    let s = heat_loss(&r).sizing.as_ref().unwrap();
    assert!(s.candidates.iter().all(|c| c.heat_loss_w_per_m.is_finite()));
}

/// The analytic pair against the finite-volume engine's steady solution of the same trench
/// (independent method: no line sources, the pipes cut out of a grid), within 3 % (issue contract).
#[test]
fn a_pair_agrees_with_the_engine_within_three_percent() {
    let text = site_with(&PAIR.replace("kind: heat-loss", "kind: heat-loss\n    method: both"));
    let r = run(&text);
    let h = heat_loss(&r);
    let c = h.cross_check.as_ref().expect("method both gives a cross-check");
    for (a, n) in h.pipes.iter().zip(&c.pipes) {
        let d = (n.heat_loss_w_per_m - a.heat_loss_w_per_m) / a.heat_loss_w_per_m;
        eprintln!(
            "{}: analytic {:.3} W/m, numerical {:.3} W/m ({:+.2} %)",
            a.id,
            a.heat_loss_w_per_m,
            n.heat_loss_w_per_m,
            d * 100.0
        );
        assert!(d.abs() < 0.03, "{}: {d}", a.id);
    }
    assert!(!r.warnings.iter().any(|w| w.code == "heat_loss.methods_differ"));
}
