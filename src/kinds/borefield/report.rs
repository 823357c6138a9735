//! Report section, plots and CSV of a `borefield` study.

use super::BorefieldResult;
use crate::report::Figure;
use crate::report::plot::{Band, LinePlot, Series, SeriesStyle, render_line_plot};
use crate::results::StudyResult;
use maud::{Markup, html};
use std::fmt::Write;

const MONTH_NAMES: [&str; 12] = [
    "Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec",
];

fn limit_lines(b: &BorefieldResult) -> Vec<(f64, String)> {
    vec![
        (
            b.limits.min_fluid_c,
            format!("lower limit {} °C", b.limits.min_fluid_c),
        ),
        (
            b.limits.max_fluid_c,
            format!("upper limit {} °C", b.limits.max_fluid_c),
        ),
    ]
}

pub fn figures(s: &StudyResult, b: &BorefieldResult) -> Result<Vec<Figure>, String> {
    let years = |m: usize| (m as f64 - 0.5) / 12.0;
    let life = Figure {
        stem: format!("{}-fluid-life", s.id),
        caption: "Mean fluid temperature over the design life: the monthly mean (line) and the range reached during the monthly peaks (band), with the limits.".into(),
        rendered: render_line_plot(
            &LinePlot {
                title: "Mean fluid temperature over the design life".into(),
                x_label: "years of operation".into(),
                y_label: "mean fluid temperature (°C)".into(),
                series: vec![
                    Series {
                        name: "monthly mean".into(),
                        points: b.months.iter().map(|m| (years(m.month), m.mean_c)).collect(),
                        style: SeriesStyle::Line,
                        colour: 0,
                    },
                    Series {
                        name: "borehole wall".into(),
                        points: b.months.iter().map(|m| (years(m.month), m.wall_c)).collect(),
                        style: SeriesStyle::Dotted,
                        colour: 2,
                    },
                ],
                bands: vec![Band {
                    name: "peaks".into(),
                    lower: b.months.iter().map(|m| (years(m.month), m.min_c)).collect(),
                    upper: b.months.iter().map(|m| (years(m.month), m.max_c)).collect(),
                    colour: 0,
                }],
                hlines: limit_lines(b),
                x_range: Some((0.0, b.design_life_years)),
                ..Default::default()
            },
            900,
            420,
        )?,
    };
    let n = b.months.len();
    let month_series = |rows: &[crate::kinds::borefield::FluidMonth],
                        f: fn(&crate::kinds::borefield::FluidMonth) -> f64| {
        rows.iter()
            .enumerate()
            .map(|(i, m)| (i as f64 + 1.0, f(m)))
            .collect::<Vec<_>>()
    };
    let first = &b.months[..12.min(n)];
    let last = &b.months[n.saturating_sub(12)..];
    let years_label = |y: f64| format!("year {y:.0}");
    let first_last = Figure {
        stem: format!("{}-first-last-year", s.id),
        caption: "Mean fluid temperature month by month in the first and the last year of the design life: the drift of the ground shows as the gap between them.".into(),
        rendered: render_line_plot(
            &LinePlot {
                title: "First and last year".into(),
                x_label: "month (1 = January)".into(),
                y_label: "mean fluid temperature (°C)".into(),
                series: vec![
                    Series {
                        name: format!("{} lowest", years_label(1.0)),
                        points: month_series(first, |m| m.min_c),
                        style: SeriesStyle::LineMarkers,
                        colour: 0,
                    },
                    Series {
                        name: format!("{} highest", years_label(1.0)),
                        points: month_series(first, |m| m.max_c),
                        style: SeriesStyle::Dashed,
                        colour: 0,
                    },
                    Series {
                        name: format!("{} lowest", years_label(b.design_life_years.ceil())),
                        points: month_series(last, |m| m.min_c),
                        style: SeriesStyle::LineMarkers,
                        colour: 1,
                    },
                    Series {
                        name: format!("{} highest", years_label(b.design_life_years.ceil())),
                        points: month_series(last, |m| m.max_c),
                        style: SeriesStyle::Dashed,
                        colour: 1,
                    },
                ],
                hlines: limit_lines(b),
                x_range: Some((0.5, 12.5)),
                ..Default::default()
            },
            720,
            420,
        )?,
    };
    let g = Figure {
        stem: format!("{}-g-function", s.id),
        caption: "The field's g-function against ln(t/t_s), t_s = H²/(9α); the borehole-wall temperature after a step of q' W/m is T₀ − q'/(2πk)·g for extraction.".into(),
        rendered: render_line_plot(
            &LinePlot {
                title: format!("g-function ({})", b.wall_condition),
                x_label: "ln(t/t_s)".into(),
                y_label: "g".into(),
                series: vec![Series {
                    name: String::new(),
                    points: b.g_function.iter().map(|p| (p.ln_t_over_ts, p.g)).collect(),
                    style: SeriesStyle::LineMarkers,
                    colour: 4,
                }],
                vlines: vec![(
                    (b.design_life_years / b.characteristic_time_years).ln(),
                    "end of design life".into(),
                )],
                ..Default::default()
            },
            720,
            420,
        )?,
    };
    Ok(vec![life, first_last, g])
}

pub fn section(b: &BorefieldResult) -> Markup {
    let t = &b.fluid_temperature;
    html! {
        p {
            "Method: g-function of the field from finite line sources with spatial superposition (" (b.wall_condition)
            "; Claesson & Javed 2011, Cimmino & Bernier 2014), borehole resistance by the multipole method (Claesson & Hellström 2011) with Hellström's (1991) short-circuit correction, and temporal superposition of the ground loads over the design life. Ground properties are the thickness-weighted means of the layers along the boreholes; the undisturbed temperature is the annual-mean profile averaged over the active length. Fluid properties are taken at the lower fluid limit."
        }
        table {
            tr { th { "figure" } th.n { "value" } }
            (row(html! { "Layout" }, html! { (b.layout) }))
            (row(
                html! { b { "Active length per borehole" } " (top at depth)" },
                html! { b { (format!("{:.1} m", b.active_length_m)) } (format!(" ({:.1} m)", b.top_depth_m)) },
            ))
            (row(html! { "Total active length" }, html! { (format!("{:.0} m", b.total_length_m)) }))
            (row(
                html! { "Ground conductivity; diffusivity; undisturbed temperature" },
                html! {
                    (format!("{:.2} W/(m K) (", b.ground.conductivity_w_per_m_k))
                    (b.ground.conductivity_source)
                    (format!("); {:.2e} m²/s; {:.2} °C", b.ground.diffusivity_m2_per_s, b.ground.undisturbed_c))
                },
            ))
            (row(
                html! { "Effective borehole resistance R_b*" },
                html! { (format!("{:.4} m K/W (", b.borehole_resistance_m_k_per_w)) (b.borehole_resistance_source) ")" },
            ))
            @if let (Some(rb), Some(ra)) = (b.local_borehole_resistance_m_k_per_w, b.internal_resistance_m_k_per_w) {
                (row(html! { "Local R_b; internal R_a" }, html! { (format!("{rb:.4} m K/W; {ra:.4} m K/W")) }))
            }
            (row(
                html! { "Fluid; freezing point" },
                html! {
                    (b.fluid.mixture)
                    (format!(" {:.0} %; {:.1} °C", b.fluid.mass_fraction * 100.0, b.fluid_freezing_point_c))
                },
            ))
            (row(
                html! { "Flow per borehole; Reynolds number (coldest fluid)" },
                html! {
                    (format!("{:.3} l/s; {:.0} (", b.fluid.flow_per_borehole_l_per_s, b.fluid.reynolds))
                    (b.fluid.flow_regime)
                    ")"
                },
            ))
            (row(
                html! { "Ground loads per year: extracted; injected" },
                html! { (format!("{:.1} MWh; {:.1} MWh", b.annual_loads.extracted_mwh, b.annual_loads.injected_mwh)) },
            ))
            (row(
                html! { "Mean fluid temperature, lowest / highest over the design life" },
                html! { (format!("{:.2} °C / {:.2} °C", t.min_c, t.max_c)) },
            ))
            (row(
                html! { "first year; last year" },
                html! {
                    (format!(
                        "{:.2} / {:.2} °C; {:.2} / {:.2} °C",
                        t.first_year_min_c, t.first_year_max_c, t.last_year_min_c, t.last_year_max_c
                    ))
                },
            ))
            (row(
                html! { "Limits on the mean fluid temperature" },
                html! { (format!("{} °C to {} °C", b.limits.min_fluid_c, b.limits.max_fluid_c)) },
            ))
            (row(
                html! { "Coldest fluid (field inlet at the extraction peak); warmest" },
                html! { (format!("{:.2} °C; {:.2} °C", b.coldest_fluid_c, b.warmest_fluid_c)) },
            ))
            (row(
                html! { "Drift of the yearly mean borehole-wall temperature, first to last year" },
                html! { (format!("{:+.2} K", b.ground_temperature_drift_k)) },
            ))
            (row(
                html! { "Pressure drop of one borehole loop; pump power of the field (loops only)" },
                html! { (format!("{:.1} kPa; {:.0} W", b.pressure_drop_kpa, b.pumping_power_w)) },
            ))
        }
        @if let (Some(s), Some(g)) = (&b.sizing, &b.governing_limit) {
            p {
                b { "Sizing:" }
                (format!(
                    " the shortest active length in {:.0}–{:.0} m that keeps the mean fluid temperature within its limits is ",
                    s.range_m[0], s.range_m[1]
                ))
                b { (format!("{:.1} m", b.active_length_m)) }
                " per borehole; "
                @match g.as_str() {
                    "min_fluid" => "the lower limit governs",
                    "max_fluid" => "the upper limit governs",
                    _ => "the shortest length searched already meets both limits",
                }
                (format!(
                    ". Length needed for the lower limit {:.1} m, for the upper limit {:.1} m. The g-function was computed at {} and interpolated in ln H; the figures above use the g-function computed at the sized length.",
                    s.length_for_min_fluid_m,
                    s.length_for_max_fluid_m,
                    s.g_function_lengths_m.iter().map(|l| format!("{l:.0} m")).collect::<Vec<_>>().join(", ")
                ))
            }
        }
        p.meta {
            "Months are twelve equal parts of a 365-day year (730 h). Pressure drop: Darcy–Weisbach with Colebrook's friction factor over the loop from the surface to the foot and back, plus the loss of the U-bend at the foot; headers, manifolds and the heat pump are not included."
        }
    }
}

/// One row of the figure table: its label and its value.
fn row(label: Markup, value: Markup) -> Markup {
    html! {
        tr { td { (label) } td.n { (value) } }
    }
}

/// `<id>-fluid.csv`: one row per month of the design life.
pub fn fluid_csv(b: &BorefieldResult) -> String {
    let mut s = String::from(
        "month,year,calendar_month,mean_fluid_c,min_fluid_c,max_fluid_c,borehole_wall_c,coldest_inlet_c,warmest_inlet_c\n",
    );
    for m in &b.months {
        let _ = writeln!(
            s,
            "{},{},{},{:.4},{:.4},{:.4},{:.4},{:.4},{:.4}",
            m.month,
            (m.month - 1) / 12 + 1,
            MONTH_NAMES[(m.month - 1) % 12],
            m.mean_c,
            m.min_c,
            m.max_c,
            m.wall_c,
            m.inlet_min_c,
            m.inlet_max_c
        );
    }
    s
}

/// `<id>-g-function.csv`: the g-function table.
pub fn g_function_csv(b: &BorefieldResult) -> String {
    let mut s = String::from("ln_t_over_ts,g\n");
    for p in &b.g_function {
        let _ = writeln!(s, "{:.4},{:.6}", p.ln_t_over_ts, p.g);
    }
    s
}
