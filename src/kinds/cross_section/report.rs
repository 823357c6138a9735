//! Report section, plots and CSV of a `cross-section` study.

use super::CrossSectionResult;
use crate::report::Figure;
use crate::report::plot::isotherm_levels;
use crate::report::plot::{
    ArrowLayer, FieldPlot, LinePlot, Series, SeriesStyle, render_field_plot_with_arrows, render_line_plot,
};
use crate::results::StudyResult;
use maud::{Markup, html};
use std::fmt::Write;

pub fn figures(s: &StudyResult, c: &CrossSectionResult) -> Result<Vec<Figure>, String> {
    let mut out = Vec::new();
    for (i, f) in c.fields.iter().enumerate() {
        let finite = f.values_c.iter().flatten().filter(|v| v.is_finite());
        let (lo, hi) = finite.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &v| {
            (a.min(v), b.max(v))
        });
        let mut levels = isotherm_levels(lo, hi);
        if lo < 0.0 && hi > 0.0 && !levels.contains(&0.0) {
            levels.push(0.0);
        }
        let arrows = ArrowLayer {
            arrows: c.flux.get(i).map_or_else(Vec::new, |a| {
                (0..a.x_m.len())
                    .map(|j| (a.x_m[j], a.z_m[j], a.qx_w_per_m2[j], a.qz_w_per_m2[j]))
                    .collect()
            }),
            unit: "W/m²".into(),
        };
        out.push(Figure {
            stem: format!("{}-field-{}", s.id, i + 1),
            caption: format!(
                "Temperature field, {}; isotherms labelled in °C (0 °C marks the frost line); arrows show the heat flux q = −k∇T, their length proportional to its magnitude (scale arrow in the top-left corner).",
                f.label
            ),
            rendered: render_field_plot_with_arrows(
                &FieldPlot {
                    title: format!("Temperature, {}", f.label),
                    x_label: "x (m)".into(),
                    z_label: "depth (m)".into(),
                    colour_bar_label: "temperature (°C)".into(),
                    x_m: f.x_m.clone(),
                    z_m: f.z_m.clone(),
                    values: f.values_c.clone(),
                    value_range: Some((lo, hi)),
                    isotherms: levels,
                    markers: Vec::new(),
                },
                &arrows,
                760,
                480,
            )?,
        });
    }
    let t = &c.series;
    if !t.times_d.is_empty() {
        let line = |name: &str, v: &[f64], colour| Series {
            name: name.to_string(),
            points: t.times_d.iter().zip(v).map(|(a, b)| (*a, *b)).collect(),
            style: SeriesStyle::Line,
            colour,
        };
        if !t.probe_ids.is_empty() {
            out.push(Figure {
                stem: format!("{}-probes", s.id),
                caption: "Temperature at each probe over the run.".into(),
                rendered: render_line_plot(
                    &LinePlot {
                        title: "Probe temperatures".into(),
                        x_label: "time (days)".into(),
                        y_label: "temperature (°C)".into(),
                        series: t
                            .probe_ids
                            .iter()
                            .zip(&t.probes_c)
                            .enumerate()
                            .map(|(i, (n, v))| line(n, v, i))
                            .collect(),
                        hlines: vec![(0.0, "0 °C".into())],
                        ..Default::default()
                    },
                    720,
                    400,
                )?,
            });
        }
        if !t.pipe_ids.is_empty() {
            out.push(Figure {
                stem: format!("{}-pipes", s.id),
                caption: "Heat from each pipe to the ground over the run.".into(),
                rendered: render_line_plot(
                    &LinePlot {
                        title: "Pipe heat rates".into(),
                        x_label: "time (days)".into(),
                        y_label: "heat to the ground (W/m)".into(),
                        series: t
                            .pipe_ids
                            .iter()
                            .zip(&t.pipe_heat_w_per_m)
                            .enumerate()
                            .map(|(i, (n, v))| line(n, v, i))
                            .collect(),
                        ..Default::default()
                    },
                    720,
                    400,
                )?,
            });
        }
        out.push(Figure {
            stem: format!("{}-frost-depth", s.id),
            caption: "Depth of the 0 °C isotherm at the edge of the section, away from the pipes.".into(),
            rendered: render_line_plot(
                &LinePlot {
                    title: "Frost depth".into(),
                    x_label: "time (days)".into(),
                    y_label: "frost depth (m)".into(),
                    series: vec![line("frost depth", &t.frost_depth_m, 4)],
                    y_down: true,
                    ..Default::default()
                },
                720,
                400,
            )?,
        });
    }
    Ok(out)
}

pub fn section(c: &CrossSectionResult) -> Markup {
    html! {
        p {
            "Method: finite volumes on a graded rectilinear grid of " (c.cells)
            " cells (harmonic-mean face conductances; layer and inclusion edges on cell faces); "
            @if c.steady {
                "the steady state of the annual-mean surface and fluid temperatures"
            } @else {
                "implicit (backward Euler) time steps"
            }
            "; latent heat of the soil water by an energy-conserving enthalpy formulation; pipes cut out at their true radius (or coupled by a Peaceman well index when smaller than a cell) with their wall layers as an analytic resistance. Energy balance error "
            (format!("{:.1e}", c.energy_balance_relative_error))
            "."
        }
        @if !c.pipes.is_empty() {
            table {
                tr { th { "pipe" } th.n { "mean heat to ground" } th.n { "final" } }
                @for p in &c.pipes {
                    tr {
                        td { (p.id) }
                        td.n { (format!("{:.2} W/m", p.mean_heat_rate_w_per_m)) }
                        td.n { (format!("{:.2} W/m", p.final_heat_rate_w_per_m)) }
                    }
                }
            }
        }
        @if !c.probes.is_empty() {
            table {
                tr { th { "probe" } th.n { "lowest" } th.n { "highest" } th.n { "final" } }
                @for p in &c.probes {
                    tr {
                        td { (p.id) }
                        td.n { (format!("{:.2} °C", p.min_c)) }
                        td.n { (format!("{:.2} °C", p.max_c)) }
                        td.n { (format!("{:.2} °C", p.final_c)) }
                    }
                }
            }
        }
        @if let Some(f) = c.max_frost_depth_m {
            p { (format!("Deepest frost at the section's edge: {f:.2} m.")) }
        }
    }
}

/// `<id>-series.csv`: the time series with units in the header.
pub fn series_csv(c: &CrossSectionResult) -> String {
    let t = &c.series;
    let mut s = String::from("time_d,frost_depth_m");
    for id in &t.pipe_ids {
        let _ = write!(s, ",{}_heat_w_per_m", id.replace(',', "_"));
    }
    for id in &t.probe_ids {
        let _ = write!(s, ",{}_c", id.replace(',', "_"));
    }
    s.push('\n');
    for (i, time) in t.times_d.iter().enumerate() {
        let _ = write!(
            s,
            "{time:.5},{:.4}",
            t.frost_depth_m.get(i).copied().unwrap_or(f64::NAN)
        );
        for v in t.pipe_heat_w_per_m.iter().chain(&t.probes_c) {
            let _ = write!(s, ",{:.4}", v.get(i).copied().unwrap_or(f64::NAN));
        }
        s.push('\n');
    }
    s
}
