//! Report section, plots and CSV of a `borefield` study.

use super::BorefieldResult;
use super::{FluidMonth, LimitProximity};
use crate::report::Figure;
use crate::report::grid::{CalendarGrid, Mark, render_calendar_grid};
use crate::report::plot::{Band, FROM_GROUND, LinePlot, Series, SeriesStyle, TO_GROUND, render_line_plot};
use crate::results::StudyResult;
use maud::{Markup, html};
use std::fmt::Write;

const MONTH_NAMES: [&str; 12] = [
    "Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec",
];

/// The design life's months in years of twelve.
fn years_of(b: &BorefieldResult) -> Vec<[FluidMonth; 12]> {
    b.months
        .chunks_exact(12)
        .map(|c| std::array::from_fn(|m| c[m]))
        .collect()
}

/// The study's marks of the months, as the calendar draws them.
fn marks_of(b: &BorefieldResult) -> Vec<[Option<Mark>; 12]> {
    b.month_marks
        .chunks_exact(12)
        .map(|c| {
            std::array::from_fn(|m| match c[m] {
                LimitProximity::Beyond => Some(Mark::Beyond),
                LimitProximity::Near => Some(Mark::Near),
                LimitProximity::Within => None,
            })
        })
        .collect()
}

pub fn figures(s: &StudyResult, b: &BorefieldResult) -> Result<Vec<Figure>, String> {
    let years = years_of(b);
    let (lo, hi) = (b.limits.min_fluid_c, b.limits.max_fluid_c);
    let calendar = Figure {
        stem: format!("{}-fluid-calendar", s.id),
        caption: format!(
            "Mean fluid temperature month by month (across) and year by year (down) over the design life, on burrow's scale from the cold side (the lower limit, {lo} °C) through the undisturbed ground temperature ({:.1} °C, pale: colder months take heat from the ground, warmer ones give it back) to the warm side (the upper limit, {hi} °C). A cross marks a month whose peak passes a limit; a ring one whose peak comes near it (the study's assumptions say how near).",
            b.ground.undisturbed_c
        ),
        rendered: render_calendar_grid(
            &CalendarGrid {
                title: "Mean fluid temperature through the design life".into(),
                colour_bar_label: "mean fluid temperature (°C)".into(),
                values: years.iter().map(|y| y.map(|m| m.mean_c)).collect(),
                marks: marks_of(b),
                value_range: (lo, hi),
                centre: b
                    .ground
                    .undisturbed_c
                    .clamp(lo + 0.1 * (hi - lo), hi - 0.1 * (hi - lo)),
                beyond_key: "the month's peak passes a limit".into(),
                near_key: "the month's peak comes near a limit".into(),
            },
            760,
            (260 + 9 * years.len() as u32).min(900),
        )?,
    };
    let yearly = |f: fn(&[FluidMonth; 12]) -> f64| -> Vec<(f64, f64)> {
        years
            .iter()
            .enumerate()
            .map(|(y, row)| (y as f64 + 1.0, f(row)))
            .collect()
    };
    let coldest_peak = yearly(|r| r.iter().map(|m| m.min_c).fold(f64::INFINITY, f64::min));
    let warmest_peak = yearly(|r| r.iter().map(|m| m.max_c).fold(f64::NEG_INFINITY, f64::max));
    let span = (hi - lo).max(1.0);
    let y_min = coldest_peak.iter().map(|p| p.1).fold(lo, f64::min) - 0.15 * span;
    let y_max = warmest_peak.iter().map(|p| p.1).fold(hi, f64::max) + 0.15 * span;
    let x_end = years.len() as f64 + 0.5;
    let below = Band {
        name: format!("below {lo} °C"),
        lower: vec![(0.5, y_min), (x_end, y_min)],
        upper: vec![(0.5, lo), (x_end, lo)],
        colour: FROM_GROUND,
    };
    let above = Band {
        name: format!("above {hi} °C"),
        lower: vec![(0.5, hi), (x_end, hi)],
        upper: vec![(0.5, y_max), (x_end, y_max)],
        colour: TO_GROUND,
    };
    let peaks = Figure {
        stem: format!("{}-yearly-peaks", s.id),
        caption: "Each year's coldest and warmest mean fluid temperature during the peaks, against the limits: the shaded regions are outside them.".into(),
        rendered: render_line_plot(
            &LinePlot {
                title: "Coldest and warmest peak of each year".into(),
                x_label: "year of operation".into(),
                y_label: "mean fluid temperature (°C)".into(),
                series: vec![
                    Series {
                        name: "coldest peak".into(),
                        points: coldest_peak,
                        style: SeriesStyle::LineMarkers,
                        colour: FROM_GROUND,
                    },
                    Series {
                        name: "warmest peak".into(),
                        points: warmest_peak,
                        style: SeriesStyle::LineMarkers,
                        colour: TO_GROUND,
                    },
                ],
                bands: vec![below, above],
                x_range: Some((0.5, x_end)),
                y_range: Some((y_min, y_max)),
                ..Default::default()
            },
            760,
            340,
        )?,
    };
    let coldest_month = yearly(|r| r.iter().map(|m| m.mean_c).fold(f64::INFINITY, f64::min));
    let warmest_month = yearly(|r| r.iter().map(|m| m.mean_c).fold(f64::NEG_INFINITY, f64::max));
    let drift = Figure {
        stem: format!("{}-drift", s.id),
        caption: format!(
            "The drift of the field: each year's coldest and warmest monthly mean fluid temperature, with the undisturbed ground temperature along the boreholes ({:.1} °C) for reference.",
            b.ground.undisturbed_c
        ),
        rendered: render_line_plot(
            &LinePlot {
                title: "Year-by-year drift".into(),
                x_label: "year of operation".into(),
                y_label: "monthly mean fluid temperature (°C)".into(),
                series: vec![
                    Series {
                        name: "coldest month".into(),
                        points: coldest_month,
                        style: SeriesStyle::LineMarkers,
                        colour: FROM_GROUND,
                    },
                    Series {
                        name: "warmest month".into(),
                        points: warmest_month,
                        style: SeriesStyle::LineMarkers,
                        colour: TO_GROUND,
                    },
                    Series {
                        name: format!("undisturbed ground {:.1} °C", b.ground.undisturbed_c),
                        points: vec![(0.5, b.ground.undisturbed_c), (x_end, b.ground.undisturbed_c)],
                        style: SeriesStyle::Dashed,
                        colour: 6,
                    },
                ],
                x_range: Some((0.5, x_end)),
                ..Default::default()
            },
            760,
            340,
        )?,
    };
    let plan = plan_figure(s, b)?;
    let loads = loads_figure(s, b)?;
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
    Ok(vec![plan, loads, calendar, peaks, drift, g])
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
                html! { "Ground loads per year: from the ground; to the ground" },
                html! {
                    (format!("{:.1} MWh; {:.1} MWh", b.annual_loads.from_ground_mwh, b.annual_loads.to_ground_mwh))
                    @if b.annual_loads.netted_months > 0 {
                        (format!(
                            " gross; {:.1} MWh; {:.1} MWh net of the {} month(s) that flow both ways",
                            b.annual_loads.net_from_ground_mwh, b.annual_loads.net_to_ground_mwh, b.annual_loads.netted_months
                        ))
                    }
                },
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
        @if let (Some(s), Some(decision)) = (&b.sizing, &b.decision) {
            p {
                b { "Sizing:" }
                (format!(
                    " the shortest active length in {:.0}–{:.0} m that keeps the mean fluid temperature within its limits is ",
                    s.range_m[0], s.range_m[1]
                ))
                b { (format!("{:.1} m", b.active_length_m)) }
                " per borehole; "
                (decision)
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

/// The field in plan, on equal scales (a square image over a square range).
fn plan_figure(s: &StudyResult, b: &BorefieldResult) -> Result<Figure, String> {
    let xs = b.positions_m.iter().map(|p| p[0]);
    let ys = b.positions_m.iter().map(|p| p[1]);
    let (x0, x1) = xs.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, c), x| {
        (a.min(x), c.max(x))
    });
    let (y0, y1) = ys.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, c), y| {
        (a.min(y), c.max(y))
    });
    let span = (x1 - x0).max(y1 - y0).max(1.0) * 1.2 + 4.0;
    let (cx, cy) = ((x0 + x1) / 2.0, (y0 + y1) / 2.0);
    Ok(Figure {
        stem: format!("{}-plan", s.id),
        caption: format!(
            "The field in plan on equal scales: {} boreholes ({}).",
            b.boreholes, b.layout
        ),
        rendered: render_line_plot(
            &LinePlot {
                title: format!("Borehole layout in plan ({} boreholes)", b.boreholes),
                x_label: "x (m)".into(),
                y_label: "y (m)".into(),
                series: vec![Series {
                    name: String::new(),
                    points: b.positions_m.iter().map(|p| (p[0], p[1])).collect(),
                    style: SeriesStyle::Markers,
                    colour: FROM_GROUND,
                }],
                x_range: Some((cx - span / 2.0, cx + span / 2.0)),
                y_range: Some((cy - span / 2.0, cy + span / 2.0)),
                ..Default::default()
            },
            560,
            560,
        )?,
    })
}

/// The year's ground loads month by month: the mean power of each month and its peak, from and
/// to the ground, in kW.
fn loads_figure(s: &StudyResult, b: &BorefieldResult) -> Result<Figure, String> {
    let l = &b.monthly_loads;
    // A model month is a twelfth of a 365-day year: 730 h.
    let mean_kw = |mwh: f64| mwh * 1e3 / 730.0;
    let months = |v: [f64; 12]| {
        v.iter()
            .enumerate()
            .map(|(m, x)| (m as f64 + 1.0, *x))
            .collect::<Vec<_>>()
    };
    let mut series = vec![
        Series {
            name: "mean from the ground".into(),
            points: months(l.from_ground_mwh.map(mean_kw)),
            style: SeriesStyle::LineMarkers,
            colour: FROM_GROUND,
        },
        Series {
            name: "mean to the ground".into(),
            points: months(l.to_ground_mwh.map(mean_kw)),
            style: SeriesStyle::LineMarkers,
            colour: TO_GROUND,
        },
    ];
    if l.peak_from_ground_kw.iter().any(|p| *p > 0.0) {
        series.push(Series {
            name: "peak from the ground".into(),
            points: months(l.peak_from_ground_kw),
            style: SeriesStyle::Dashed,
            colour: FROM_GROUND,
        });
    }
    if l.peak_to_ground_kw.iter().any(|p| *p > 0.0) {
        series.push(Series {
            name: "peak to the ground".into(),
            points: months(l.peak_to_ground_kw),
            style: SeriesStyle::Dashed,
            colour: TO_GROUND,
        });
    }
    Ok(Figure {
        stem: format!("{}-loads", s.id),
        caption: format!(
            "The field's ground loads month by month: each month's mean power and its peak, from and to the ground ({:.1} MWh from and {:.1} MWh to the ground in a year).",
            b.annual_loads.from_ground_mwh, b.annual_loads.to_ground_mwh
        ),
        rendered: render_line_plot(
            &LinePlot {
                title: "Ground loads of a year".into(),
                x_label: "month (1 = January)".into(),
                y_label: "power (kW)".into(),
                series,
                x_range: Some((0.5, 12.5)),
                ..Default::default()
            },
            760,
            340,
        )?,
    })
}
