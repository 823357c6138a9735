//! Report section, plots and CSV of a `heat-loss` study.

use super::{CrossCheck, HeatLossResult, SizingResult, TwinResult};
use crate::report::Figure;
use crate::report::plot::isotherm_levels;
use crate::report::plot::{FieldPlot, LinePlot, Series, SeriesStyle, render_field_plot, render_line_plot};
use crate::results::StudyResult;
use maud::{Markup, html};
use std::fmt::Write;

pub fn figures(s: &StudyResult, h: &HeatLossResult) -> Result<Vec<Figure>, String> {
    let mut out = Vec::new();
    if let Some(f) = &h.field {
        let markers = h
            .neighbours
            .iter()
            .map(|n| (n.x_m, n.depth_m, n.id.clone()))
            .collect();
        let finite = f.values_c.iter().flatten().filter(|v| v.is_finite());
        let (lo, hi) = finite.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &v| {
            (a.min(v), b.max(v))
        });
        let plot = FieldPlot {
            title: "Soil temperature around the pipes".into(),
            x_label: "x (m)".into(),
            z_label: "depth (m)".into(),
            colour_bar_label: "temperature (°C)".into(),
            x_m: f.x_m.clone(),
            z_m: f.z_m.clone(),
            values: f.values_c.clone(),
            value_range: Some((lo, hi.min(lo + 60.0))),
            isotherms: isotherm_levels(lo, hi.min(lo + 60.0)),
            markers,
        };
        out.push(Figure {
            stem: format!("{}-field", s.id),
            caption: format!(
                "Soil temperature in {}; isotherms labelled in °C; neighbours marked.",
                f.label
            ),
            rendered: render_field_plot(&plot, 760, 460)?,
        });
    }
    let months: Vec<f64> = (1..=12).map(f64::from).collect();
    let series = h
        .pipes
        .iter()
        .enumerate()
        .map(|(i, p)| Series {
            name: p.id.clone(),
            points: months
                .iter()
                .zip(&p.monthly_heat_loss_w_per_m)
                .map(|(m, q)| (*m, *q))
                .collect(),
            style: SeriesStyle::LineMarkers,
            colour: i,
        })
        .collect();
    out.push(Figure {
        stem: format!("{}-monthly", s.id),
        caption: "Monthly mean heat loss of each pipe.".into(),
        rendered: render_line_plot(
            &LinePlot {
                title: "Monthly heat loss".into(),
                x_label: "month".into(),
                y_label: "heat loss (W/m)".into(),
                series,
                x_range: Some((1.0, 12.0)),
                ..Default::default()
            },
            720,
            400,
        )?,
    });
    if let Some(sz) = &h.sizing {
        let mut c: Vec<_> = sz.candidates.iter().collect();
        c.sort_by(|a, b| a.insulation_thickness_m.total_cmp(&b.insulation_thickness_m));
        let series = vec![Series {
            name: "trench heat loss".into(),
            points: c
                .iter()
                .map(|c| (c.insulation_thickness_m * 1000.0, c.heat_loss_w_per_m))
                .collect(),
            style: SeriesStyle::LineMarkers,
            colour: 0,
        }];
        let hlines = sz
            .heat_loss_limit_w_per_m
            .map(|l| vec![(l, format!("limit {l} W/m"))])
            .unwrap_or_default();
        out.push(Figure {
            stem: format!("{}-sizing", s.id),
            caption: "Trench heat loss against the thickness of the varied layer.".into(),
            rendered: render_line_plot(
                &LinePlot {
                    title: format!("Heat loss against {} thickness", sz.layer),
                    x_label: format!("{} thickness (mm)", sz.layer),
                    y_label: "heat loss (W/m)".into(),
                    series,
                    hlines,
                    ..Default::default()
                },
                720,
                400,
            )?,
        });
        if c.iter().all(|c| c.life_cycle_cost_per_m.is_some()) {
            out.push(Figure {
                stem: format!("{}-life-cycle-cost", s.id),
                caption: "Life-cycle cost per metre of trench: present value of the heat lost plus the installed cost.".into(),
                rendered: render_line_plot(
                    &LinePlot {
                        title: "Life-cycle cost".into(),
                        x_label: format!("{} thickness (mm)", sz.layer),
                        y_label: "cost per metre".into(),
                        series: vec![Series {
                            name: "life-cycle cost".into(),
                            points: c
                                .iter()
                                .map(|c| (c.insulation_thickness_m * 1000.0, c.life_cycle_cost_per_m.unwrap_or(f64::NAN)))
                                .collect(),
                            style: SeriesStyle::LineMarkers,
                            colour: 2,
                        }],
                        ..Default::default()
                    },
                    720,
                    400,
                )?,
            });
        }
    }
    Ok(out)
}

pub fn section(h: &HeatLossResult) -> Markup {
    html! {
        p {
            "Method: steady conduction month by month — each pipe a line source with its image above the surface (Kelvin; Carslaw & Jaeger §10.10), the exact cylinder ground resistance acosh(H′/r)/(2πk), the surface resistance R0 = "
            (h.surface_resistance_m2_k_per_w)
            " m² K/W as an added depth H′ = H + k·R0 (EN 13941-1 practice), wall layers as coaxial cylinders, the pair coupled through the mutual resistance (EN 13941-1; Wallentén 1991). Soil conductivity "
            (format!("{:.2}", h.soil_conductivity_w_per_m_k))
            " W/(m K), the layer at the pipes."
        }
        table {
            tr { th { "pipe" } th.n { "heat loss" } th.n { "per year" } th.n { "U" } }
            @for p in &h.pipes {
                tr {
                    td { (p.id) }
                    td.n { (format!("{:.2} W/m", p.heat_loss_w_per_m)) }
                    td.n { (format!("{:.1} kWh/m", p.annual_heat_loss_kwh_per_m)) }
                    td.n { (format!("{:.4} W/(m K)", p.u_w_per_m_k)) }
                }
            }
            tr {
                th { "trench" }
                th.n { (format!("{:.2} W/m", h.total_heat_loss_w_per_m)) }
                th.n { (format!("{:.1} MWh over {} m", h.annual_heat_loss_mwh, h.length_m)) }
                th {}
            }
        }
        @if let Some(t) = &h.twin {
            (twin_section(t))
        }
        @for p in h.pipes.iter().filter(|p| p.insulation_conductivity_w_per_m_k.is_some()) {
            p {
                "Insulation of " b { (p.id) } " by EN 253 practice (aged λ50 and its slope): "
                (format!(
                    "{:.4} W/(m K) at its mean temperature {:.1} °C",
                    p.insulation_conductivity_w_per_m_k.unwrap_or(f64::NAN),
                    p.insulation_mean_temperature_c.unwrap_or(f64::NAN)
                ))
                " (annual means)."
            }
        }
        @if let Some(c) = &h.cross_check {
            (cross_check(h, c))
        }
        @if !h.neighbours.is_empty() {
            (neighbours(h))
        }
        @if let Some(sz) = &h.sizing {
            (sizing(sz))
        }
    }
}

/// The engine's steady solution of the same section beside the analytic annual means.
fn cross_check(h: &HeatLossResult, c: &CrossCheck) -> Markup {
    html! {
        h4 { "Analytic against numerical" }
        p {
            "The finite-volume engine's steady solution of the same section (" (c.model) "; "
            (c.cells) " cells) beside the analytic annual means; trench total "
            (format!(
                "{:.2} W/m numerically ({:.2} % apart)",
                c.total_heat_loss_w_per_m,
                c.total_relative_difference * 100.0
            ))
            @if let (Some(a), Some(d)) = (c.antisymmetric_heat_flow_w_per_m, c.antisymmetric_relative_difference) {
                (format!(", antisymmetric part {a:.2} W/m ({:.2} % apart)", d * 100.0))
            }
            (format!("; largest difference {:.2} %.", c.max_relative_difference * 100.0))
        }
        table {
            tr { th { "pipe" } th.n { "analytic" } th.n { "numerical" } }
            @for (p, n) in h.pipes.iter().zip(&c.pipes) {
                tr {
                    td { (p.id) }
                    td.n { (format!("{:.2} W/m", p.heat_loss_w_per_m)) }
                    td.n { (format!("{:.2} W/m", n.heat_loss_w_per_m)) }
                }
            }
        }
    }
}

/// The highest soil temperature at each neighbouring point, against its limit.
fn neighbours(h: &HeatLossResult) -> Markup {
    html! {
        h4 { "Neighbouring points" }
        table {
            tr {
                th { "point" }
                th.n { "highest soil temperature" }
                th.n { "numerical" }
                th.n { "month" }
                th.n { "limit" }
                th { "passes" }
            }
            @for n in &h.neighbours {
                tr {
                    td { (n.id) }
                    td.n { (format!("{:.1} °C", n.max_temperature_c)) }
                    td.n { (or_dash(n.numerical_max_temperature_c.map(|t| format!("{t:.1} °C")))) }
                    td.n { (n.month_of_max) }
                    td.n { (or_dash(n.limit_c.map(|l| format!("{l:.1} °C")))) }
                    td {
                        @if n.limit_c.is_none() {
                            "—"
                        } @else if n.exceeds_limit {
                            "no"
                        } @else {
                            "yes"
                        }
                    }
                }
            }
        }
    }
}

/// The candidates of the insulation sizing.
fn sizing(sz: &SizingResult) -> Markup {
    html! {
        h4 { "Insulation sizing (" (sz.layer) ")" }
        p {
            "The outer diameter follows the layer; the pipes keep their depth and their clear horizontal gaps. Thinnest meeting the limit: "
            b {
                @match sz.chosen_insulation_thickness_m {
                    Some(t) => (format!("{:.1} mm", t * 1000.0)),
                    None => "none",
                }
            }
            ". Lowest life-cycle cost: "
            b { (or_dash(sz.cheapest_insulation_thickness_m.map(|t| format!("{:.1} mm", t * 1000.0)))) }
            "."
        }
        table {
            tr {
                th.n { "thickness" }
                th.n { "trench loss" }
                th.n { "per year" }
                th { "meets limit" }
                th.n { "life-cycle cost / m" }
                th.n { "numerical loss" }
            }
            @for c in &sz.candidates {
                tr {
                    td.n { (format!("{:.1} mm", c.insulation_thickness_m * 1000.0)) }
                    td.n { (format!("{:.2} W/m", c.heat_loss_w_per_m)) }
                    td.n { (format!("{:.1} kWh/m", c.annual_heat_loss_kwh_per_m)) }
                    td {
                        @match c.meets_limit {
                            Some(true) => "yes",
                            Some(false) => "no",
                            None => "—",
                        }
                    }
                    td.n { (or_dash(c.life_cycle_cost_per_m.map(|v| format!("{v:.0}")))) }
                    td.n { (or_dash(c.numerical_heat_loss_w_per_m.map(|v| format!("{v:.2} W/m")))) }
                }
            }
        }
    }
}

/// A figure's text, or a dash where the study has none.
fn or_dash(text: Option<String>) -> String {
    text.unwrap_or_else(|| "—".into())
}

/// The twin pipe's resistances and its symmetric/antisymmetric split.
fn twin_section(t: &TwinResult) -> Markup {
    html! {
        h4 { "Twin pipe " (t.id) }
        p {
            (format!(
                "Both carriers in one casing of {:.0} mm, {:.0} mm apart; Wallentén's first-order formulas (the form of EN 15698-1): symmetric resistance {:.4} m K/W (insulation, casing and ground; h",
                t.casing_outer_diameter_m * 1000.0,
                t.carrier_spacing_m * 1000.0,
                t.symmetric_resistance_m_k_per_w
            ))
            sub { "s" }
            (format!(" = {:.4}), antisymmetric {:.4} m K/W between the carriers (h", t.h_s, t.antisymmetric_resistance_m_k_per_w))
            sub { "a" }
            (format!(" = {:.4}); insulation {:.4} W/(m K)", t.h_a, t.insulation_conductivity_w_per_m_k))
            @if let Some(m) = t.insulation_mean_temperature_c {
                (format!(" at its mean temperature {m:.1} °C (EN 253 law)"))
            }
            (format!(
                ". Symmetric part (the twin's loss) {:.2} W/m, {:.1} kWh/m per year; supply → return {:.2} W/m.",
                t.symmetric_heat_loss_w_per_m,
                t.annual_heat_loss_kwh_per_m,
                t.antisymmetric_heat_flow_w_per_m
            ))
        }
    }
}

/// `<id>-monthly.csv`: the monthly figures with units in the header.
pub fn monthly_csv(h: &HeatLossResult) -> String {
    let mut s = String::from("month,ground_temperature_c");
    for p in &h.pipes {
        let _ = write!(
            s,
            ",{0}_fluid_temperature_c,{0}_heat_loss_w_per_m",
            p.id.replace(',', "_")
        );
    }
    s.push('\n');
    for m in 0..12 {
        let _ = write!(s, "{},{:.4}", m + 1, h.monthly_ground_temperature_c[m]);
        for p in &h.pipes {
            let _ = write!(
                s,
                ",{:.4},{:.4}",
                p.monthly_fluid_temperature_c[m], p.monthly_heat_loss_w_per_m[m]
            );
        }
        s.push('\n');
    }
    s
}
