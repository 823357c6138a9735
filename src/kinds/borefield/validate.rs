//! Validation of a `kind: borefield` study's keys into its model: units, ranges, references,
//! geometry; every problem located.

use super::doc::*;

use super::Borefield;
use super::BoreholeWall;
use super::GroundLoads;
use super::HeatExchanger;
use super::LoopPipe;
use crate::materials::fluids::{Fluid, Mixture};
use crate::model::Method;
use crate::numerics::time::{HOUR_S, MONTH_S};
use crate::physics::borehole::DoubleUPairing;
use crate::physics::gfunction::WallCondition;
use crate::site::diagnostic::KeyPath;
use crate::site::quantity::*;
use crate::site::units::Dimension;
use crate::site::validate::Validator;

/// The methods this kind offers: g-functions and superposition (analytic).
pub const METHODS: [Method; 1] = [Method::Analytic];

/// Shortest and longest active length the sizing searches, m (common practice, no source: most
/// vertical ground heat exchangers are drilled 40–300 m deep).
pub const SIZING_RANGE_M: (f64, f64) = (20.0, 400.0);

/// Default absolute roughness of a polyethylene loop pipe, m (common practice, no source:
/// drawn plastic pipe is hydraulically smooth, 1.5 µm).
pub const DEFAULT_PIPE_ROUGHNESS_M: f64 = 1.5e-6;

/// Default wire-to-water efficiency of the circulation pump (common practice, no source).
pub const DEFAULT_PUMP_EFFICIENCY: f64 = 0.5;

/// Default duration of a monthly peak load, s (common practice, no source: a cold morning of
/// 6 hours at the peak load).
pub const DEFAULT_PEAK_DURATION_S: f64 = 6.0 * HOUR_S;

pub fn validate(doc: &BorefieldDoc, path: &KeyPath, v: &mut Validator) -> Option<Borefield> {
    let layout = layout(&doc.layout, &path.key("layout"), v);
    let bp = path.key("borehole");
    let length = v.positive_q(
        &doc.borehole.active_length,
        &bp.key("active_length"),
        "the active length",
    );
    v.plausible(
        length,
        (10.0, 500.0),
        &bp.key("active_length"),
        "an active length",
        Dimension::Length,
    );
    let top = match &doc.borehole.top_depth {
        None => Some(0.0),
        Some(q) => {
            let d = v.q(q, &bp.key("top_depth"));
            v.within(d, (0.0, 100.0), &bp.key("top_depth"), "the top depth in metres")
        }
    };
    let diameter = v.positive_q(
        &doc.borehole.diameter,
        &bp.key("diameter"),
        "the borehole diameter",
    );
    v.plausible(
        diameter,
        (0.075, 0.3),
        &bp.key("diameter"),
        "a borehole diameter",
        Dimension::Length,
    );
    let exchanger = heat_exchanger(&doc.heat_exchanger, diameter, &path.key("heat_exchanger"), v);
    let fluid = fluid(&doc.fluid, &path.key("fluid"), v);
    let fp = path.key("fluid").key("flow_per_borehole");
    let flow = v.positive_q(&doc.fluid.flow_per_borehole, &fp, "the flow per borehole");
    v.plausible(
        flow,
        (0.05e-3, 3e-3),
        &fp,
        "a flow per borehole",
        Dimension::VolumeFlow,
    );
    let loads = loads(&doc.loads, &path.key("loads"), v);
    let lp = path.key("limits");
    let min_fluid = v.q(&doc.limits.min_fluid, &lp.key("min_fluid"));
    let max_fluid = v.q(&doc.limits.max_fluid, &lp.key("max_fluid"));
    if let (Some(lo), Some(hi)) = (min_fluid, max_fluid)
        && lo >= hi
    {
        v.out.error(
            &lp.key("max_fluid"),
            format!("the highest fluid temperature ({hi} °C) must lie above the lowest ({lo} °C)"),
        );
        return None;
    }
    if let (Some(f), Some(lo)) = (fluid, min_fluid) {
        let freezing = f.freezing_point_c();
        if lo <= freezing {
            v.out.error(
                &lp.key("min_fluid"),
                format!(
                    "the lowest fluid temperature {lo} °C is at or below the freezing point of the fluid ({freezing:.1} °C); raise the limit or the antifreeze concentration"
                ),
            );
            return None;
        }
        if let Some(hi) = max_fluid
            && let Err(e) = f.check_temperature(hi)
        {
            v.out.error(&lp.key("max_fluid"), e);
            return None;
        }
    }
    let life = design_life(&doc.design_life, &path.key("design_life"), v);
    let segments = match doc.segments {
        None => Some(WallCondition::DEFAULT_SEGMENTS),
        Some(n) if (1..=WallCondition::MAX_SEGMENTS).contains(&n) => Some(n),
        Some(n) => {
            v.out.error(
                &path.key("segments"),
                format!(
                    "{n} segments per borehole are not allowed; give 1 to {}",
                    WallCondition::MAX_SEGMENTS
                ),
            );
            None
        }
    };
    let pump = match &doc.pump_efficiency {
        None => Some(DEFAULT_PUMP_EFFICIENCY),
        Some(q) => {
            let e = v.q(q, &path.key("pump_efficiency"));
            v.within(
                e,
                (0.05, 1.0),
                &path.key("pump_efficiency"),
                "the pump efficiency",
            )
        }
    };
    let ground_k = match &doc.ground_conductivity {
        None => Some(None),
        Some(q) => {
            let k = v.positive_q(q, &path.key("ground_conductivity"), "the ground conductivity");
            v.plausible(
                k,
                (0.3, 7.0),
                &path.key("ground_conductivity"),
                "a ground conductivity",
                Dimension::Conductivity,
            );
            k.map(Some)
        }
    };
    let (positions, description) = layout?;
    if let Some(n) = segments
        && positions.len() * n > MAX_BOREHOLE_SEGMENTS
    {
        v.out.error(
            &path.key("layout"),
            format!(
                "{} boreholes of {n} segments make a g-function of {} segments, more than the {MAX_BOREHOLE_SEGMENTS} burrow solves; give fewer segments (`segments`) or split the field",
                positions.len(),
                positions.len() * n
            ),
        );
        return None;
    }
    let (exchanger, grout, measured) = exchanger?;
    if let (Some(d), Some(s)) = (diameter, min_spacing(&positions))
        && s <= d
    {
        v.out.error(
            &path.key("layout"),
            format!(
                "two boreholes stand {s:.3} m apart, closer than the borehole diameter {d:.3} m; move them apart"
            ),
        );
        return None;
    }
    if let (Some(l), Some(h)) = (&loads, length)
        && doc.find.is_none()
    {
        specific_energy(l, positions.len() as f64 * h, &path.key("loads"), v);
    }
    Some(Borefield {
        positions_m: positions,
        layout_description: description,
        active_length_m: length?,
        top_depth_m: top?,
        borehole_radius_m: diameter? / 2.0,
        exchanger,
        grout_conductivity_w_per_m_k: grout,
        measured_resistance_m_k_per_w: measured,
        fluid: fluid?,
        flow_per_borehole_m3_per_s: flow?,
        loads: loads?,
        min_fluid_c: min_fluid?,
        max_fluid_c: max_fluid?,
        design_life_months: life?,
        wall_condition: match doc.wall_condition {
            None | Some(WallConditionDoc::UniformTemperature) => BoreholeWall::UniformTemperature,
            Some(WallConditionDoc::UniformHeatFlux) => BoreholeWall::UniformHeatFlux,
        },
        size: doc.find.is_some(),
        segments: segments?,
        pump_efficiency: pump?,
        ground_conductivity_w_per_m_k: ground_k?,
    })
}

fn min_spacing(points: &[(f64, f64)]) -> Option<f64> {
    let mut best: Option<f64> = None;
    for (i, a) in points.iter().enumerate() {
        for b in &points[i + 1..] {
            let d = (a.0 - b.0).hypot(a.1 - b.1);
            best = Some(best.map_or(d, |x: f64| x.min(d)));
        }
    }
    best
}

fn layout(doc: &LayoutDoc, path: &KeyPath, v: &mut Validator) -> Option<(Vec<(f64, f64)>, String)> {
    match (&doc.rectangle, &doc.points) {
        (Some(r), None) => {
            let p = path.key("rectangle");
            let spacing = v.positive_q(&r.spacing, &p.key("spacing"), "the borehole spacing");
            v.plausible(
                spacing,
                (3.0, 20.0),
                &p.key("spacing"),
                "a borehole spacing",
                Dimension::Length,
            );
            for (key, n) in [("rows", r.rows), ("columns", r.columns)] {
                if !(1..=50).contains(&n) {
                    v.out
                        .error(&p.key(key), format!("{n} {key} are not allowed; give 1 to 50"));
                    return None;
                }
            }
            let s = spacing?;
            let positions = (0..r.rows)
                .flat_map(|i| (0..r.columns).map(move |j| (j as f64 * s, i as f64 * s)))
                .collect();
            Some((
                positions,
                format!(
                    "{} × {} rectangle, {} m spacing",
                    r.rows,
                    r.columns,
                    crate::site::validate::round_sig(s)
                ),
            ))
        }
        (None, Some(points)) => {
            let p = path.key("points");
            if points.is_empty() || points.len() > 2500 {
                v.out.error(
                    &p,
                    format!("{} points were given; give 1 to 2500 boreholes", points.len()),
                );
                return None;
            }
            let mut out = Vec::with_capacity(points.len());
            let mut ok = true;
            for (i, xy) in points.iter().enumerate() {
                let pi = p.index(i);
                if xy.len() != 2 {
                    v.out.error(
                        &pi,
                        format!("a point is a pair [x, y], but {} values were given", xy.len()),
                    );
                    ok = false;
                    continue;
                }
                match (v.q(&xy[0], &pi.index(0)), v.q(&xy[1], &pi.index(1))) {
                    (Some(x), Some(y)) => out.push((x, y)),
                    _ => ok = false,
                }
            }
            ok.then(|| {
                let n = out.len();
                (out, format!("{n} boreholes at given points"))
            })
        }
        _ => {
            v.out.error(
                path,
                "give exactly one of `rectangle` (rows, columns, spacing) or `points` (a list of [x, y])",
            );
            None
        }
    }
}

fn loop_pipe(doc: &LoopPipeDoc, path: &KeyPath, v: &mut Validator) -> Option<LoopPipe> {
    let d = v.positive_q(
        &doc.outer_diameter,
        &path.key("outer_diameter"),
        "the pipe's outer diameter",
    );
    let wall = v.positive_q(&doc.wall, &path.key("wall"), "the pipe wall");
    let k = v.positive_q(
        &doc.conductivity,
        &path.key("conductivity"),
        "the pipe conductivity",
    );
    let roughness = match &doc.roughness {
        None => Some(DEFAULT_PIPE_ROUGHNESS_M),
        Some(q) => {
            let r = v.q(q, &path.key("roughness"));
            v.within(r, (0.0, 0.005), &path.key("roughness"), "the roughness in metres")
        }
    };
    let (d, wall) = (d?, wall?);
    if 2.0 * wall >= d {
        v.out.error(
            &path.key("wall"),
            format!("a wall of {wall} m leaves no bore in a pipe of {d} m outer diameter; the wall must be thinner than the radius"),
        );
        return None;
    }
    Some(LoopPipe {
        outer_diameter_m: d,
        wall_m: wall,
        conductivity_w_per_m_k: k?,
        roughness_m: roughness?,
    })
}

type Exchanger = (HeatExchanger, f64, Option<f64>);

fn heat_exchanger(
    doc: &HeatExchangerDoc,
    borehole_diameter: Option<f64>,
    path: &KeyPath,
    v: &mut Validator,
) -> Option<Exchanger> {
    let grout_of = |q: &Q<Conductivity>, v: &mut Validator| {
        let k = v.positive_q(q, &path.key("grout_conductivity"), "the grout conductivity");
        v.plausible(
            k,
            (0.5, 3.5),
            &path.key("grout_conductivity"),
            "a grout conductivity",
            Dimension::Conductivity,
        );
        k
    };
    let measured_of = |q: &Option<Q<LinearResistance>>, v: &mut Validator| match q {
        None => Some(None),
        Some(q) => {
            let r = v.positive_q(q, &path.key("borehole_resistance"), "the borehole resistance");
            v.plausible(
                r,
                (0.03, 0.5),
                &path.key("borehole_resistance"),
                "a borehole resistance",
                Dimension::LinearResistance,
            );
            r.map(Some)
        }
    };
    let fits = |pipe: &LoopPipe, shank: f64, legs_apart: f64, v: &mut Validator| -> bool {
        let mut ok = true;
        if legs_apart <= pipe.outer_diameter_m {
            v.out.error(
                &path.key("shank_spacing"),
                format!(
                    "legs {legs_apart:.4} m apart overlap: pipes of {} m outer diameter need their centres at least one diameter apart",
                    pipe.outer_diameter_m
                ),
            );
            ok = false;
        }
        if let Some(db) = borehole_diameter
            && shank + pipe.outer_diameter_m >= db
        {
            v.out.error(
                &path.key("shank_spacing"),
                format!(
                    "the legs reach beyond the borehole wall: shank spacing plus pipe diameter is {:.4} m in a borehole of {db} m",
                    shank + pipe.outer_diameter_m
                ),
            );
            ok = false;
        }
        ok
    };
    match doc {
        HeatExchangerDoc::SingleU {
            pipe,
            shank_spacing,
            grout_conductivity,
            borehole_resistance,
        } => {
            let pipe = loop_pipe(pipe, &path.key("pipe"), v);
            let shank = v.positive_q(shank_spacing, &path.key("shank_spacing"), "the shank spacing");
            let grout = grout_of(grout_conductivity, v);
            let measured = measured_of(borehole_resistance, v);
            let (pipe, shank) = (pipe?, shank?);
            fits(&pipe, shank, shank, v).then_some(())?;
            Some((
                HeatExchanger::SingleU {
                    pipe,
                    shank_spacing_m: shank,
                },
                grout?,
                measured?,
            ))
        }
        HeatExchangerDoc::DoubleU {
            pipe,
            shank_spacing,
            grout_conductivity,
            pairing,
            borehole_resistance,
        } => {
            let pipe = loop_pipe(pipe, &path.key("pipe"), v);
            let shank = v.positive_q(shank_spacing, &path.key("shank_spacing"), "the shank spacing");
            let grout = grout_of(grout_conductivity, v);
            let measured = measured_of(borehole_resistance, v);
            let (pipe, shank) = (pipe?, shank?);
            // Neighbouring legs of a double U are √2·(s/2) apart.
            fits(&pipe, shank, shank / std::f64::consts::SQRT_2, v).then_some(())?;
            Some((
                HeatExchanger::DoubleU {
                    pipe,
                    shank_spacing_m: shank,
                    pairing: match pairing {
                        None | Some(PairingDoc::Diagonal) => DoubleUPairing::Diagonal,
                        Some(PairingDoc::Adjacent) => DoubleUPairing::Adjacent,
                    },
                },
                grout?,
                measured?,
            ))
        }
        HeatExchangerDoc::Coaxial {
            inner_pipe,
            outer_pipe,
            grout_conductivity,
            borehole_resistance,
        } => {
            let inner = loop_pipe(inner_pipe, &path.key("inner_pipe"), v);
            let outer = loop_pipe(outer_pipe, &path.key("outer_pipe"), v);
            let grout = grout_of(grout_conductivity, v);
            let measured = measured_of(borehole_resistance, v);
            let (inner, outer) = (inner?, outer?);
            if inner.outer_diameter_m >= outer.inner_diameter_m() {
                v.out.error(
                    &path.key("inner_pipe").key("outer_diameter"),
                    format!(
                        "the inner pipe ({} m outside) does not fit in the outer pipe's bore ({:.4} m)",
                        inner.outer_diameter_m,
                        outer.inner_diameter_m()
                    ),
                );
                return None;
            }
            if let Some(db) = borehole_diameter
                && outer.outer_diameter_m >= db
            {
                v.out.error(
                    &path.key("outer_pipe").key("outer_diameter"),
                    format!(
                        "the outer pipe ({} m) does not fit in the borehole ({db} m)",
                        outer.outer_diameter_m
                    ),
                );
                return None;
            }
            Some((HeatExchanger::Coaxial { inner, outer }, grout?, measured?))
        }
    }
}

fn fluid(doc: &BoreFluidDoc, path: &KeyPath, v: &mut Validator) -> Option<Fluid> {
    let Some(mixture) = Mixture::from_name(&doc.mixture) else {
        let names: Vec<&str> = Mixture::all().iter().map(|m| m.name()).collect();
        v.out.error(
            &path.key("mixture"),
            format!(
                "`{}` is not a known fluid; use one of: {}",
                doc.mixture,
                names.join(", ")
            ),
        );
        return None;
    };
    let fraction = match &doc.concentration {
        None => Some(0.0),
        Some(q) => v.q(q, &path.key("concentration")),
    }?;
    match Fluid::new(mixture, fraction) {
        Ok(f) => Some(f),
        Err(e) => {
            v.out.error(&path.key("concentration"), e);
            None
        }
    }
}

fn design_life(q: &Q<Time>, path: &KeyPath, v: &mut Validator) -> Option<usize> {
    let t = v.positive_q(q, path, "the design life")?;
    let months = t / MONTH_S;
    if (months - months.round()).abs() > 1e-6 * months.max(1.0) || !(12.0..=1200.0).contains(&months.round())
    {
        v.out.error(
            path,
            format!(
                "a design life of {} months is not allowed; give whole months from 1 to 100 years (e.g. `25 years`)",
                crate::site::validate::round_sig(months)
            ),
        );
        return None;
    }
    Some(months.round() as usize)
}

fn twelve<D: Dim>(values: &[Q<D>], path: &KeyPath, v: &mut Validator, what: &str) -> Option<[f64; 12]> {
    if values.len() != 12 {
        v.out.error(
            path,
            format!(
                "give 12 monthly values of {what}, January first; {} were given",
                values.len()
            ),
        );
        return None;
    }
    let mut out = [0.0; 12];
    let mut ok = true;
    for (i, q) in values.iter().enumerate() {
        let p = path.index(i);
        match v.q(q, &p) {
            Some(x) if x >= 0.0 => out[i] = x,
            Some(x) => {
                v.out
                    .error(&p, format!("{what} cannot be negative, but {x} was given"));
                ok = false;
            }
            None => ok = false,
        }
    }
    ok.then_some(out)
}

fn optional_twelve<D: Dim>(
    values: &Option<&[Q<D>]>,
    path: &KeyPath,
    v: &mut Validator,
    what: &str,
) -> Option<[f64; 12]> {
    match values {
        None => Some([0.0; 12]),
        Some(list) => twelve(list, path, v, what),
    }
}

fn peak_duration(q: &Option<&Q<Time>>, path: &KeyPath, v: &mut Validator) -> Option<f64> {
    match q {
        None => Some(DEFAULT_PEAK_DURATION_S),
        Some(q) => {
            let t = v.q(q, path);
            v.within(t, (60.0, MONTH_S), path, "the peak duration in seconds")
        }
    }
}

/// One direction of monthly loads: twelve energies at `base.key`, the optional twelve peaks at
/// `peak.key`, and the peaks held against the months' mean powers.
fn one_direction(
    energies: &[Q<Energy>],
    peaks: Option<&[Q<Power>]>,
    (base, peak, key): (&KeyPath, &KeyPath, &str),
    what: &str,
    v: &mut Validator,
) -> (Option<[f64; 12]>, Option<[f64; 12]>) {
    let e = twelve(energies, &base.key(key), v, what);
    let p = optional_twelve(&peaks, &peak.key(key), v, &format!("peak {what}"));
    if let (Some(e), Some(p)) = (e, p) {
        peaks_against_means(&e, &p, &base.key(key), &peak.key(key), v);
    }
    (e, p)
}

/// A monthly peak is the month's highest load: one below the month's mean power is an error, and
/// one more than [`PEAK_TO_MEAN_LIMIT`] times it is a caution — or an error naming MWh when
/// the energies read as MWh would explain it (a peak in kW against energies meant as MWh).
fn peaks_against_means(
    energy_j: &[f64; 12],
    peak_w: &[f64; 12],
    energy_path: &KeyPath,
    peak_path: &KeyPath,
    v: &mut Validator,
) {
    for m in 0..12 {
        let (e, p) = (energy_j[m], peak_w[m]);
        if p <= 0.0 || e <= 0.0 {
            continue;
        }
        let mean = e / MONTH_S;
        let kw = |w: f64| crate::site::validate::round_sig((w / 1e3 * 1e3).round() / 1e3);
        if p < mean * (1.0 - 1e-9) {
            v.out.error(
                &peak_path.index(m),
                format!(
                    "the peak, {} kW, is below the month's mean power of {} kW; a peak is the month's highest load (check the units of the peak and of the month's energy)",
                    kw(p),
                    kw(mean)
                ),
            );
        } else if p > PEAK_TO_MEAN_LIMIT * mean {
            let ratio = (p / mean).round();
            if p <= PEAK_TO_MEAN_LIMIT * mean * 1e3 && p >= mean * 1e3 {
                v.out.error(
                    &energy_path.index(m),
                    format!(
                        "the month's peak is {ratio} times its mean power; did you mean the energy in MWh (a plain number is kWh)?"
                    ),
                );
            } else {
                v.out.warning(
                    &peak_path.index(m),
                    format!("the peak is {ratio} times the month's mean power, far more than a heat pump's peaks usually are; check the peak and the energy"),
                );
            }
        }
    }
}

/// A monthly peak more than this many times the month's mean power is unusual (a month of 730 h
/// with a 6-h peak at full load and the rest idle gives about 120; heat-pump loads rarely reach
/// 20): common practice, no source.
const PEAK_TO_MEAN_LIMIT: f64 = 20.0;

/// A field's yearly heat per metre of borehole, kWh/(m a), usually lies in tens to a couple of
/// hundred (about 50–150 for heating-only houses in moist ground; common practice, no source):
/// outside 10–300 a caution, and an error naming MWh when energies read as MWh would put it in.
const SPECIFIC_ENERGY_KWH_PER_M: (f64, f64) = (10.0, 300.0);

fn specific_energy(loads: &GroundLoads, metres: f64, path: &KeyPath, v: &mut Validator) {
    let Some(g) = super::run::ground_side_months(loads) else {
        return;
    };
    let kwh = |j: f64| j / 3.6e6;
    let yearly = kwh(g.from_j.iter().sum::<f64>()).max(kwh(g.to_j.iter().sum::<f64>()));
    if yearly <= 0.0 || metres <= 0.0 {
        return;
    }
    let per_m = yearly / metres;
    let (lo, hi) = SPECIFIC_ENERGY_KWH_PER_M;
    if (lo..=hi).contains(&per_m) {
        return;
    }
    let shown = crate::site::validate::round_sig((per_m * 10.0).round() / 10.0);
    if per_m < lo && (lo..=hi).contains(&(per_m * 1e3)) {
        v.out.error(
            path,
            format!(
                "the loads give {shown} kWh a year per metre of borehole, far below the usual {lo}–{hi}; did you mean the monthly energies in MWh (a plain number is kWh)?"
            ),
        );
    } else {
        v.out.warning(
            path,
            format!(
                "the loads give {shown} kWh a year per metre of borehole, outside the usual {lo}–{hi}; check the loads, the number of boreholes and their length"
            ),
        );
    }
}

/// Most borehole segments (boreholes × segments per borehole) of one field's g-function: the
/// uniform-wall-temperature system is dense in them (a 20 × 20 field at 12 segments is 4,800).
pub const MAX_BOREHOLE_SEGMENTS: usize = 12_000;

fn loads(doc: &LoadsDoc, path: &KeyPath, v: &mut Validator) -> Option<GroundLoads> {
    let given = [
        doc.monthly.is_some(),
        doc.building.is_some(),
        doc.hourly.is_some(),
        doc.constant.is_some(),
    ]
    .iter()
    .filter(|b| **b)
    .count();
    if given != 1 {
        v.out.error(
            path,
            format!("give exactly one of `monthly`, `building`, `hourly` or `constant`; {given} were given"),
        );
        return None;
    }
    if let Some(m) = &doc.monthly {
        let p = path.key("monthly");
        let pk = p.key("peak");
        let peak = m.peak.as_ref();
        let (extracted, pe) = one_direction(
            &m.from_ground,
            peak.and_then(|k| k.from_ground.as_deref()),
            (&p, &pk, "from_ground"),
            "heat from the ground",
            v,
        );
        let (injected, pi) = one_direction(
            &m.to_ground,
            peak.and_then(|k| k.to_ground.as_deref()),
            (&p, &pk, "to_ground"),
            "heat to the ground",
            v,
        );
        let duration = peak_duration(&peak.and_then(|k| k.duration.as_ref()), &pk.key("duration"), v);
        return Some(GroundLoads::Monthly {
            from_ground_j: extracted?,
            to_ground_j: injected?,
            peak_from_ground_w: pe?,
            peak_to_ground_w: pi?,
            peak_duration_s: duration?,
        });
    }
    if let Some(b) = &doc.building {
        let p = path.key("building");
        let pk = p.key("peak");
        let peak = b.peak.as_ref();
        let (heating, ph) = one_direction(
            &b.heating,
            peak.and_then(|k| k.heating.as_deref()),
            (&p, &pk, "heating"),
            "heating",
            v,
        );
        let (cooling, pc) = one_direction(
            &b.cooling,
            peak.and_then(|k| k.cooling.as_deref()),
            (&p, &pk, "cooling"),
            "cooling",
            v,
        );
        let cop = v.within(Some(b.cop), (1.0, 20.0), &p.key("cop"), "the COP");
        let eer = v.within(Some(b.eer), (1.0, 40.0), &p.key("eer"), "the EER");
        let duration = peak_duration(&peak.and_then(|k| k.duration.as_ref()), &pk.key("duration"), v);
        return Some(GroundLoads::Building {
            heating_j: heating?,
            cooling_j: cooling?,
            peak_heating_w: ph?,
            peak_cooling_w: pc?,
            cop: cop?,
            eer: eer?,
            peak_duration_s: duration?,
        });
    }
    if let Some(file) = &doc.hourly {
        let p = path.key("hourly");
        return match crate::site::series_file::read_hourly_loads(&v.base_dir.join(file)) {
            Ok(values) => Some(GroundLoads::Hourly {
                from_ground_w: values,
                source: file.clone(),
            }),
            Err(e) => {
                v.out.error(&p, e);
                None
            }
        };
    }
    let q = doc.constant.as_ref()?;
    let w = v.q(q, &path.key("constant"))?;
    Some(GroundLoads::Constant { from_ground_w: w })
}
