//! Validation of a `kind: cross-section` study's keys into its model: units, ranges, references,
//! geometry; every problem located.

use super::doc::*;

use super::CrossSection;
use super::Inclusion;
use super::Probe;
use super::SectionTime;
use crate::model::DAY_S;
use crate::site::diagnostic::KeyPath;
use crate::site::validate::{self, Validator, round_sig};

pub fn validate(doc: &CrossSectionDoc, path: &KeyPath, v: &mut Validator) -> Option<CrossSection> {
    let width = v.positive_q(
        &doc.domain.width,
        &path.key("domain").key("width"),
        "the section width",
    );
    let depth = v.positive_q(
        &doc.domain.depth,
        &path.key("domain").key("depth"),
        "the section depth",
    );
    let (cell_min, cell_max) = match &doc.cell_size {
        None => (Some(0.02), Some(0.5)),
        Some(c) => {
            let p = path.key("cell_size");
            let lo = v.positive_q(&c.min, &p.key("min"), "the smallest cell size");
            let hi = v.positive_q(&c.max, &p.key("max"), "the largest cell size");
            if let (Some(a), Some(b)) = (lo, hi)
                && a > b
            {
                v.out.error(
                    &p.key("min"),
                    format!(
                        "the smallest cell size ({} m) exceeds the largest ({} m)",
                        round_sig(a),
                        round_sig(b)
                    ),
                );
            }
            (lo, hi)
        }
    };
    let surface_r = match &doc.surface_resistance {
        None => Some(0.0),
        Some(q) => {
            let r = v.q(q, &path.key("surface_resistance"));
            v.within(
                r,
                (0.0, f64::INFINITY),
                &path.key("surface_resistance"),
                "the surface resistance",
            )
        }
    };
    let time = time(&doc.time, &path.key("time"), v);
    let pipes = validate::pipes(&doc.pipes, &path.key("pipes"), v);
    let probes: Vec<Option<Probe>> = doc
        .probes
        .iter()
        .enumerate()
        .map(|(i, p)| {
            let pp = path.key("probes").index(i);
            let x = v.q(&p.x, &pp.key("x"));
            let z = v.q(&p.depth, &pp.key("depth"));
            let z = v.within(z, (0.0, f64::INFINITY), &pp.key("depth"), "a probe depth");
            Some(Probe {
                id: p.id.clone(),
                x_m: x?,
                depth_m: z?,
            })
        })
        .collect();
    let inclusions: Vec<Option<Inclusion>> = doc
        .inclusions
        .iter()
        .enumerate()
        .map(|(i, d)| inclusion(d, &path.key("inclusions").index(i), v))
        .collect();
    let snapshots: Vec<Option<f64>> = doc
        .snapshots
        .iter()
        .enumerate()
        .map(|(i, q)| {
            let p = path.key("snapshots").index(i);
            let t = v.q(q, &p);
            v.within(t, (0.0, f64::INFINITY), &p, "a snapshot time")
        })
        .collect();
    let section = CrossSection {
        width_m: width?,
        depth_m: depth?,
        cell_min_m: cell_min?,
        cell_max_m: cell_max?,
        time: time?,
        pipes: pipes?,
        probes: probes.into_iter().collect::<Option<_>>()?,
        inclusions: inclusions.into_iter().collect::<Option<_>>()?,
        snapshots_s: snapshots.into_iter().collect::<Option<_>>()?,
        surface_resistance_m2_k_per_w: surface_r?,
    };
    geometry(&section, path, v).then_some(section)
}

fn time(doc: &TimeDoc, path: &KeyPath, v: &mut Validator) -> Option<SectionTime> {
    match (doc.steady, &doc.duration, &doc.step) {
        (Some(true), None, None) => Some(SectionTime::Steady),
        (Some(true), _, _) => {
            v.out.error(
                path,
                "a steady solve takes no `duration` or `step`; remove them or set `steady: false`",
            );
            None
        }
        (_, Some(d), Some(s)) => {
            let d = v.positive_q(d, &path.key("duration"), "the duration");
            let s = v.positive_q(s, &path.key("step"), "the time step");
            if let (Some(d), Some(s)) = (d, s)
                && s > d
            {
                v.out.error(
                    &path.key("step"),
                    format!(
                        "the step ({} h) is longer than the duration ({} h)",
                        round_sig(s / crate::numerics::time::HOUR_S),
                        round_sig(d / crate::numerics::time::HOUR_S)
                    ),
                );
                return None;
            }
            Some(SectionTime::Transient {
                duration_s: d?,
                step_s: s?,
            })
        }
        _ => {
            v.out.error(
                path,
                "give `duration` and `step` (for example `{duration: 3 years, step: 6 h}`) or `steady: true`",
            );
            None
        }
    }
}

fn inclusion(d: &InclusionDoc, path: &KeyPath, v: &mut Validator) -> Option<Inclusion> {
    let x = v.q(&d.x, &path.key("x"));
    let z = v.q(&d.depth, &path.key("depth"));
    let z = v.within(
        z,
        (0.0, f64::INFINITY),
        &path.key("depth"),
        "the depth of an inclusion's top",
    );
    let w = v.positive_q(&d.width, &path.key("width"), "an inclusion width");
    let h = v.positive_q(&d.height, &path.key("height"), "an inclusion height");
    let k = v.positive_q(
        &d.conductivity,
        &path.key("conductivity"),
        "an inclusion conductivity",
    );
    let c = v.positive_q(
        &d.heat_capacity,
        &path.key("heat_capacity"),
        "an inclusion heat capacity",
    );
    Some(Inclusion {
        id: d.id.clone(),
        x_m: x?,
        depth_m: z?,
        width_m: w?,
        height_m: h?,
        conductivity_w_per_m_k: k?,
        heat_capacity_j_per_m3_k: c?,
    })
}

/// Everything must lie inside the domain; no pipe may cut an inclusion.
fn geometry(s: &CrossSection, path: &KeyPath, v: &mut Validator) -> bool {
    let half = s.width_m / 2.0;
    let mut ok = true;
    for (i, p) in s.pipes.iter().enumerate() {
        let r = p.outer_radius_m();
        if p.x_m.abs() + r > half || p.depth_m + r > s.depth_m {
            v.out.error(
                &path.key("pipes").index(i),
                format!(
                    "pipe `{}` reaches outside the section (x −{half} … {half} m, depth 0 … {} m); widen or deepen the domain",
                    p.id, s.depth_m
                ),
            );
            ok = false;
        }
        for (j, b) in s.inclusions.iter().enumerate() {
            let dx = (p.x_m - b.x_m).abs() - b.width_m / 2.0;
            let dz = (p.depth_m - (b.depth_m + b.height_m / 2.0)).abs() - b.height_m / 2.0;
            let gap = dx.max(0.0).hypot(dz.max(0.0));
            if gap < r {
                v.out.error(
                    &path.key("inclusions").index(j),
                    format!(
                        "inclusion `{}` cuts through pipe `{}`; a pipe must lie wholly in the soil",
                        b.id, p.id
                    ),
                );
                ok = false;
            }
        }
    }
    for (i, p) in s.probes.iter().enumerate() {
        if p.x_m.abs() > half || p.depth_m > s.depth_m {
            v.out.error(
                &path.key("probes").index(i),
                format!("probe `{}` lies outside the section", p.id),
            );
            ok = false;
        }
    }
    for (i, b) in s.inclusions.iter().enumerate() {
        if (b.x_m).abs() + b.width_m / 2.0 > half + 1e-12 || b.depth_m + b.height_m > s.depth_m + 1e-12 {
            v.out.error(
                &path.key("inclusions").index(i),
                format!("inclusion `{}` reaches outside the section", b.id),
            );
            ok = false;
        }
    }
    if let SectionTime::Transient { duration_s, .. } = s.time {
        for (i, t) in s.snapshots_s.iter().enumerate() {
            if *t > duration_s {
                v.out.error(
                    &path.key("snapshots").index(i),
                    format!(
                        "a snapshot at {} d lies after the end of the run ({} d)",
                        round_sig(t / DAY_S),
                        round_sig(duration_s / DAY_S)
                    ),
                );
                ok = false;
            }
        }
    }
    ok &= resources(s, path, v);
    if s.cell_min_m > s.width_m.min(s.depth_m) / 10.0 {
        v.out.warning(
            &path.key("cell_size").key("min"),
            "the smallest cell is more than a tenth of the section; results will be coarse",
        );
    }
    ok
}

/// Most time steps a run may take.
pub const MAX_STEPS: f64 = 5e6;
/// Most cells a section may have.
pub const MAX_CELLS: f64 = 2e6;
/// Most cell-steps (cells × steps) a run may do: a few hours of computing on one core.
pub const MAX_CELL_STEPS: f64 = 2e10;
/// Most field snapshots a run may keep.
pub const MAX_SNAPSHOTS: usize = 100;

/// Cells of one graded axis of length `length_m`, from above: the largest cells fill it, and
/// every refined place (the surface, each pipe or inclusion edge) adds a geometric run from the
/// smallest to the largest cell on each side at the engine's growth ratio (1.15).
fn axis_cells(length_m: f64, cell_min_m: f64, cell_max_m: f64, refined: usize) -> f64 {
    let run = (cell_max_m / cell_min_m).max(1.0).ln() / 1.15_f64.ln() + 1.0;
    length_m / cell_max_m + 2.0 * (refined as f64 + 1.0) * run
}

/// Refuses, before anything is allocated, a run too large for a design tool to finish: too
/// many steps, cells or snapshots, or too much work. Each message says what would fit.
fn resources(s: &CrossSection, path: &KeyPath, v: &mut Validator) -> bool {
    let features = s.pipes.len() + 2 * s.inclusions.len();
    let cells = axis_cells(s.width_m, s.cell_min_m, s.cell_max_m, features)
        * axis_cells(s.depth_m, s.cell_min_m, s.cell_max_m, features);
    let mut ok = true;
    if cells > MAX_CELLS {
        v.out.error(
            &path.key("cell_size"),
            format!(
                "the section would need about {} cells, more than the {} burrow runs; give larger cells or a smaller domain",
                round_sig(cells.round()),
                MAX_CELLS
            ),
        );
        ok = false;
    }
    if s.snapshots_s.len() > MAX_SNAPSHOTS {
        v.out.error(
            &path.key("snapshots"),
            format!(
                "{} snapshots are asked for; at most {MAX_SNAPSHOTS} fields are kept (each is a whole field of the section)",
                s.snapshots_s.len()
            ),
        );
        ok = false;
    }
    if let SectionTime::Transient { duration_s, step_s } = s.time {
        let steps = duration_s / step_s;
        let p = path.key("time").key("step");
        if steps > MAX_STEPS {
            v.out.error(
                &p,
                format!(
                    "the run would take {} steps, more than the {} burrow runs; take a step of at least {} h or a shorter duration",
                    round_sig(steps.round()),
                    MAX_STEPS,
                    round_sig((duration_s / MAX_STEPS / crate::numerics::time::HOUR_S * 1000.0).ceil() / 1000.0)
                ),
            );
            ok = false;
        } else if cells <= MAX_CELLS && cells * steps > MAX_CELL_STEPS {
            v.out.error(
                &p,
                format!(
                    "about {} cells over {} steps is more work than burrow does in one run (at most {} cell-steps); take a longer step, larger cells or a shorter duration",
                    round_sig(cells.round()),
                    round_sig(steps.round()),
                    MAX_CELL_STEPS
                ),
            );
            ok = false;
        }
    }
    ok
}
