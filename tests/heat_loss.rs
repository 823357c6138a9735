//! `kind: heat-loss` through the whole pipeline (site text → results), against closed forms.

use burrow::kinds::heat_loss::HeatLossResult;
use burrow::results::{Figures, Results};
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
    // The check holds the chosen candidate's own loss to the limit, the same figure the results
    // give for it.
    let study = &r.studies[0];
    let check = study
        .checks
        .iter()
        .find(|c| c.code == "heat_loss.loss_limit")
        .unwrap();
    let chosen_loss = s.chosen_heat_loss_w_per_m.unwrap();
    assert!(check.passed && check.value == Some(chosen_loss) && chosen_loss <= 25.0);
    let figure = study
        .decisive_figures
        .iter()
        .find(|f| f.key == "sizing.chosen_heat_loss_w_per_m")
        .unwrap();
    assert_eq!(figure.value, chosen_loss);
    // A limit no candidate meets: none chosen, and a caution says so.
    let r = run(&sizing_site(1.0));
    let failed = r.studies[0]
        .checks
        .iter()
        .find(|c| c.code == "heat_loss.loss_limit")
        .unwrap();
    assert!(!failed.passed && failed.value.unwrap() > 1.0);
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

// ---- twin pipes -------------------------------------------------------------------------------

/// A twin pipe (invented, of the usual proportions of a pre-insulated 2 × DN80 twin): carriers
/// 88.9 × 3.2 mm steel, 120 mm apart, in a 280 mm casing 4 mm thick.
const TWIN: &str = "  - id: twin
    kind: heat-loss
    surface_resistance: 0.0685
    twin:
      id: t
      depth: 0.8 m
      outer_diameter: 280 mm
      casing: {thickness: 4 mm, conductivity: 0.4}
      insulation_conductivity: 0.026
      carrier_spacing: 120 mm
      carriers:
        outer_diameter: 88.9 mm
        layers: [{name: steel, thickness: 3.2 mm, conductivity: 50}]
      supply: {temperature: 80}
      return: {temperature: 45}
";

/// The study's twin (Wallentén's first-order formulas, EN 15698-1 form) against an independent
/// method for the same pipe: the multipole expansion at order 10 (Bennet, Claesson & Hellström
/// 1987), which tests/buried_pipe.rs holds within 0.5 % of a boundary-collocation reference
/// (tests/reference/buried_pipe_mfs.py). The first-order formulas drop the higher multipoles of
/// the carriers, worth about 1 % on the total and a few per cent on the return pipe's small loss
/// (tests/buried_pipe.rs measured up to 4.2 % there): the tolerances are those, not a restatement.
#[test]
fn a_twin_pipe_agrees_with_the_multipole_method() {
    use burrow::physics::buried_pipe::twin::{TwinMethod, TwinPipe};
    use burrow::physics::buried_pipe::{GroundForm, Position, Soil};
    let r = run(&site_with(TWIN));
    let h = heat_loss(&r);
    let ids: Vec<&str> = h.pipes.iter().map(|p| p.id.as_str()).collect();
    assert_eq!(ids, ["supply", "return"]);
    let twin = TwinPipe {
        centre: Position::new(0.0, 0.8),
        casing_outer_radius_m: 0.14,
        casing_thickness_m: 0.004,
        casing_conductivity_w_per_m_k: 0.4,
        insulation_conductivity_w_per_m_k: 0.026,
        carrier_outer_radius_m: 0.04445,
        carrier_spacing_m: 0.12,
        carrier_wall_resistance_m_k_per_w: (0.04445_f64 / 0.04125).ln() / (2.0 * PI * 50.0),
    };
    let soil = Soil::new(K, 0.0685).unwrap();
    let [qs, qr] = twin
        .resistances(&soil, GroundForm::Exact, TwinMethod::Multipole { order: 10 })
        .unwrap()
        .heat_rates_w_per_m(80.0, 45.0, T_G)
        .unwrap();
    let (ss, sr) = (h.pipes[0].heat_loss_w_per_m, h.pipes[1].heat_loss_w_per_m);
    let total = ((ss + sr) - (qs + qr)) / (qs + qr);
    let supply = (ss - qs) / qs;
    let ret = (sr - qr) / qs;
    eprintln!(
        "study {ss:.4} {sr:.4}, multipole {qs:.4} {qr:.4}: total {total:.4}, supply {supply:.4}, return {ret:.4} (of the supply loss)"
    );
    assert!(total.abs() < 0.015, "total {total}");
    assert!(supply.abs() < 0.03, "supply {supply}");
    assert!(ret.abs() < 0.05, "return {ret}");
    let t = h.twin.as_ref().expect("a twin result");
    assert!((t.total_heat_loss_w_per_m - (ss + sr)).abs() < 1e-12 * ss);
    // Constant temperatures: the annual energy is the mean rate over 8760 h.
    assert!((t.annual_heat_loss_kwh_per_m - (ss + sr) * 8.76).abs() < 1e-6 * ss);
}

/// The engine's section against the multipole method at order 10 (Bennet, Claesson & Hellström
/// 1987; < 0.1 % from a boundary-collocation reference, tests/buried_pipe.rs) for the model the
/// engine solves: the casing wall taken as soil. What remains is the engine's own error (the
/// staircase of the insulation circle and the grid), which a second-order finite-volume scheme
/// with about 12 cells per insulation radius and 10 per carrier diameter keeps to about 1 % on
/// the total; the antisymmetric part crosses the 31 mm gap between the carriers on about 3
/// cells. Both get the 3 % of the pair check (issue contract); measured: 1.3 % and 0.5 %.
#[test]
fn a_twin_pipe_agrees_with_the_engine() {
    use burrow::physics::buried_pipe::twin::{TwinMethod, TwinPipe};
    use burrow::physics::buried_pipe::{GroundForm, Position, Soil};
    let text = site_with(&TWIN.replace("kind: heat-loss", "kind: heat-loss\n    method: both"));
    let r = run(&text);
    let h = heat_loss(&r);
    let c = h.cross_check.as_ref().expect("method both gives a cross-check");
    let twin = TwinPipe {
        centre: Position::new(0.0, 0.8),
        casing_outer_radius_m: 0.14,
        casing_thickness_m: 0.004,
        casing_conductivity_w_per_m_k: K,
        insulation_conductivity_w_per_m_k: 0.026,
        carrier_outer_radius_m: 0.04445,
        carrier_spacing_m: 0.12,
        carrier_wall_resistance_m_k_per_w: (0.04445_f64 / 0.04125).ln() / (2.0 * PI * 50.0),
    };
    let soil = Soil::new(K, 0.0685).unwrap();
    let res = twin
        .resistances(&soil, GroundForm::Exact, TwinMethod::Multipole { order: 10 })
        .unwrap();
    let [qs, qr] = res.heat_rates_w_per_m(80.0, 45.0, T_G).unwrap();
    let (ns, nr) = (c.pipes[0].heat_loss_w_per_m, c.pipes[1].heat_loss_w_per_m);
    let total = ((ns + nr) - (qs + qr)) / (qs + qr);
    let anti = ((ns - nr) - (qs - qr)) / (qs - qr);
    eprintln!(
        "engine {ns:.3} {nr:.3}, multipole {qs:.3} {qr:.3}: total {total:.4}, antisymmetric {anti:.4}; study's difference {:.4} {:?}, cells {}",
        c.total_relative_difference, c.antisymmetric_relative_difference, c.cells
    );
    assert!(total.abs() < 0.03, "total {total}");
    assert!(anti.abs() < 0.03, "antisymmetric {anti}");
    assert!(c.antisymmetric_relative_difference.is_some());
}

fn errors(text: &str) -> Vec<(String, String)> {
    site::load_text(text, "t.yaml", Path::new("."))
        .unwrap_err()
        .iter()
        .map(|d| (d.path.to_string(), d.message.clone()))
        .collect()
}

#[test]
fn twin_pipes_with_carriers_overlapping_or_outside_the_casing_are_refused() {
    let e = errors(&site_with(
        &TWIN.replace("carrier_spacing: 120 mm", "carrier_spacing: 80 mm"),
    ));
    assert!(
        e.iter()
            .any(|(p, m)| p == "studies[0].twin.carrier_spacing" && m.contains("overlap")),
        "{e:?}"
    );
    let e = errors(&site_with(
        &TWIN.replace("carrier_spacing: 120 mm", "carrier_spacing: 200 mm"),
    ));
    assert!(
        e.iter()
            .any(|(p, m)| p == "studies[0].twin.carrier_spacing" && m.contains("inner radius")),
        "{e:?}"
    );
    let e = errors(&site_with(&TWIN.replace("depth: 0.8 m", "depth: 0.1 m")));
    assert!(e.iter().any(|(p, _)| p == "studies[0].twin.depth"), "{e:?}");
    let with_pipe = TWIN.replace(
        "    twin:\n",
        "    pipes: [{id: p, depth: 2, outer_diameter: 0.2, fluid: {temperature: 60}}]\n    twin:\n",
    );
    let e = errors(&site_with(&with_pipe));
    assert!(
        e.iter()
            .any(|(p, m)| p == "studies[0].twin" && m.contains("not both")),
        "{e:?}"
    );
    let sized = format!("{TWIN}    sizing: {{layer: foam, thicknesses: [40 mm]}}\n");
    let e = errors(&site_with(&sized));
    assert!(e.iter().any(|(p, _)| p == "studies[0].sizing.layer"), "{e:?}");
}

/// Insulation by EN 253 practice, against a hand calculation: the single pipe of [`PIPE`] with
/// λ(T) = λ50·(1 + ageing) + slope·(T − 50 °C), T the mean of the insulation's two faces,
/// iterated by hand with the series resistances of the closed-form check above.
#[test]
fn insulation_conductivity_follows_its_mean_temperature_and_ageing() {
    let (l50, slope, ageing) = (0.024, 0.00012, 0.15);
    let text = site_with(&PIPE.replace(
        "conductivity: 0.026}",
        &format!(
            "conductivity: {{lambda_50: {l50}, slope: {slope}, ageing: {} %}}}}",
            ageing * 100.0
        ),
    ));
    let r = run(&text);
    let h = heat_loss(&r);
    let r_o: f64 = 0.1;
    let radii = [r_o - 0.057, r_o - 0.053, r_o - 0.003, r_o];
    let shell = |i: usize, k: f64| (radii[i + 1] / radii[i]).ln() / (2.0 * PI * k);
    let ground = ((0.9 + K * 0.0685) / r_o).acosh() / (2.0 * PI * K);
    let mut lambda = l50 * (1.0 + ageing);
    let (mut q, mut mean) = (0.0, 0.0);
    for _ in 0..50 {
        q = (80.0 - T_G) / (shell(0, 50.0) + shell(1, lambda) + shell(2, 0.4) + ground);
        let inner = 80.0 - q * shell(0, 50.0);
        let outer = inner - q * shell(1, lambda);
        mean = 0.5 * (inner + outer);
        lambda = l50 * (1.0 + ageing) + slope * (mean - 50.0);
    }
    let p = &h.pipes[0];
    assert!(
        ((p.heat_loss_w_per_m - q) / q).abs() < 1e-6,
        "{} vs {q}",
        p.heat_loss_w_per_m
    );
    assert!((p.insulation_conductivity_w_per_m_k.unwrap() - lambda).abs() < 1e-8);
    assert!((p.insulation_mean_temperature_c.unwrap() - mean).abs() < 1e-4);
    // The mean insulation temperature (~45 °C) lies below 50 °C, so λ is below the aged λ50.
    assert!(
        lambda < l50 * (1.0 + ageing) && mean > 40.0 && mean < 50.0,
        "{lambda} at {mean}"
    );
}

/// With a twin pipe the law is evaluated at the mean of the carriers' surfaces and the casing's
/// inner face; the reported λ is the law at the reported mean temperature, which lies between
/// the ground and the supply temperature.
#[test]
fn a_twin_pipes_insulation_law_is_consistent_with_its_mean_temperature() {
    let text = site_with(&TWIN.replace(
        "insulation_conductivity: 0.026",
        "insulation_conductivity: {lambda_50: 0.024, slope: 0.0001, ageing: 0.2}",
    ));
    let r = run(&text);
    let t = heat_loss(&r).twin.as_ref().unwrap().clone();
    let mean = t.insulation_mean_temperature_c.unwrap();
    let expected = 0.024 * 1.2 + 0.0001 * (mean - 50.0);
    assert!((t.insulation_conductivity_w_per_m_k - expected).abs() < 1e-8);
    // Carriers at 80 and 45 °C (mean 62.5) less a little steel drop; casing near the ground.
    assert!(mean > T_G && mean < 62.5, "{mean}");
    // The same twin with that λ as a fixed value loses the same heat (the law's fixed point).
    let fixed = run(&site_with(&TWIN.replace(
        "insulation_conductivity: 0.026",
        &format!("insulation_conductivity: {expected}"),
    )));
    let q = heat_loss(&fixed).total_heat_loss_w_per_m;
    assert!(((t.total_heat_loss_w_per_m - q) / q).abs() < 1e-6);
}

/// The analytic method sees one soil; layers within twice the pipe depth that differ by more
/// than 20 % raise a caution (issue contract), layers that differ less do not.
#[test]
fn layered_ground_raises_a_caution_when_the_layers_differ() {
    let layered = |top_k: f64| {
        format!(
            "site: {{name: layered}}
climate: {{model: constant, temperature: {T_G}}}
ground:
  layers:
    - {{name: topsoil, thickness: 0.5, conductivity: {top_k}, heat_capacity: 2.0e6}}
    - {{name: sand, conductivity: {K}, heat_capacity: 2.0e6}}
studies:
{PIPE}"
        )
    };
    let r = run(&layered(0.8));
    assert!(
        r.warnings.iter().any(|w| w.code == "heat_loss.layered_ground"),
        "{:?}",
        r.warnings
    );
    // The analytic method uses the layer at the pipe centre.
    assert_eq!(heat_loss(&r).soil_conductivity_w_per_m_k, K);
    let r = run(&layered(1.5));
    assert!(!r.warnings.iter().any(|w| w.code == "heat_loss.layered_ground"));
}

/// In homogeneous ground under an isothermal surface (R0 = 0) the engine's field near a single
/// pipe matches the line source with its image (Kelvin; Carslaw & Jaeger §10.10), which is exact
/// for an isothermal cylinder when the source sits at the bipolar focus, sqrt(H² − r²) deep,
/// instead of the centre: for r/H = 0.11 that shifts the rise at 0.5–1 m by up to ~1 %; the
/// engine's grid adds ~0.5 %, so 1.5 %. (Measured further out, at 3 m, where the cells reach
/// 0.4 m and the rise is 0.3 K, the engine reads 2.5 % higher; beside a second pipe the line
/// sources also ignore that pipe's body, ~3 % at 3.6 radii from it.)
#[test]
fn the_engines_neighbour_temperatures_match_the_line_source_near_a_pipe() {
    let text = site_with(
        "  - id: s
    kind: heat-loss
    method: both
    surface_resistance: 0
    pipes:
      - {id: p, x: 0, depth: 1.0, outer_diameter: 0.225, layers: [{name: insulation, thickness: 60 mm, conductivity: 0.027}], fluid: {temperature: 90}}
    neighbours:
      - {id: side, x: 0.5, depth: 1.0}
      - {id: farther, x: 1.0, depth: 1.0}
      - {id: below, x: 0.0, depth: 2.0}
      - {id: above, x: 0.0, depth: 0.4}
",
    );
    let r = run(&text);
    let d: Vec<f64> = heat_loss(&r)
        .neighbours
        .iter()
        .map(|n| {
            let num = n
                .numerical_max_temperature_c
                .expect("method both gives the engine's value");
            (num - n.max_temperature_c) / (n.max_temperature_c - T_G)
        })
        .collect();
    assert!(d.iter().all(|d| d.abs() < 0.015), "{d:?}");
}

/// With `method: both` every sizing candidate carries the engine's trench total, within the 3 %
/// of the pair check, and it falls as the insulation grows.
#[test]
fn sizing_candidates_carry_the_engines_loss() {
    let text = sizing_site(25.0).replace("kind: heat-loss", "kind: heat-loss\n    method: both");
    let r = run(&text);
    let s = heat_loss(&r).sizing.as_ref().unwrap();
    let mut by_t: Vec<_> = s.candidates.iter().collect();
    by_t.sort_by(|a, b| a.insulation_thickness_m.total_cmp(&b.insulation_thickness_m));
    for c in &by_t {
        let n = c.numerical_heat_loss_w_per_m.unwrap();
        eprintln!(
            "{:.3} m: analytic {:.3}, engine {n:.3} W/m",
            c.insulation_thickness_m, c.heat_loss_w_per_m
        );
        assert!(c.numerical_relative_difference.unwrap().abs() < 0.03);
    }
    assert!(
        by_t.windows(2)
            .all(|w| w[1].numerical_heat_loss_w_per_m < w[0].numerical_heat_loss_w_per_m)
    );
}

/// A twin pipe's sizing grows the casing (least insulation cover over a carrier); the loss
/// falls with thickness, each candidate as Wallentén's formulas give it.
#[test]
fn a_twin_pipe_is_sized_by_its_insulation_cover() {
    let text = site_with(&format!(
        "{TWIN}    sizing: {{layer: insulation, thicknesses: [31.55 mm, 50 mm, 70 mm], heat_loss_limit: 25 W/m}}\n"
    ));
    let r = run(&text);
    let h = heat_loss(&r);
    let s = h.sizing.as_ref().unwrap();
    // 31.55 mm of cover is the study's own casing (0.06 + 0.04445 + 0.03155 + 0.004 = 0.14 m).
    assert!((s.candidates[0].outer_diameters_m[0] - 0.28).abs() < 1e-9);
    assert!((s.candidates[0].heat_loss_w_per_m - h.total_heat_loss_w_per_m).abs() < 1e-9);
    assert!(
        s.candidates
            .windows(2)
            .all(|w| w[1].heat_loss_w_per_m < w[0].heat_loss_w_per_m)
    );
}
