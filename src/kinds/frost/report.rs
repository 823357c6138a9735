//! Report section, plots and CSV of a `frost` study.

use super::FrostResult;
use crate::report::Figure;
use crate::report::plot::isotherm_levels;
use crate::report::plot::{FieldPlot, LinePlot, Series, SeriesStyle, render_field_plot, render_line_plot};
use crate::results::StudyResult;
use maud::{Markup, html};
use std::fmt::Write;

pub fn figures(s: &StudyResult, f: &FrostResult) -> Result<Vec<Figure>, String> {
    let curve = Series {
        name: "cumulative surface degree-days".into(),
        points: f
            .cumulative_degree_days
            .iter()
            .enumerate()
            .map(|(d, v)| (d as f64, *v))
            .collect(),
        style: SeriesStyle::Line,
        colour: 0,
    };
    let mut hlines: Vec<(f64, String)> = f
        .max_frost_depth_m
        .map(|d| (d, format!("frost depth {d:.2} m")))
        .into_iter()
        .collect();
    if let Some(p) = &f.permafrost {
        hlines.push((
            p.permafrost_table_depth_m,
            format!("permafrost table {:.2} m", p.permafrost_table_depth_m),
        ));
    }
    if let Some(c) = f.pipe_crown_depth_m {
        hlines.push((c, format!("pipe crown {c:.2} m")));
    }
    if let Some(c) = f.required_cover_m {
        hlines.push((c, format!("required cover {c:.2} m")));
    }
    let mut out = vec![
        Figure {
            stem: format!("{}-degree-days", s.id),
            caption: format!("Cumulative surface degree-days over the freezing season from {} (MM-DD); the freezing index is the fall from the highest to the lowest point.", f.season_start),
            rendered: render_line_plot(
                &LinePlot {
                    title: "Cumulative degree-days of the design season".into(),
                    x_label: format!("days from {} (MM-DD)", f.season_start),
                    y_label: "degree-days (°C·d)".into(),
                    series: vec![curve],
                    x_range: Some((0.0, 365.0)),
                    ..Default::default()
                },
                720,
                400,
            )?,
        },
        Figure {
            stem: format!("{}-frost-depth", s.id),
            caption: "Lowest undisturbed ground temperature over the year against depth, with the governing frost depth, the pipe crown and the required cover.".into(),
            rendered: render_line_plot(
                &LinePlot {
                    title: "Frost against depth".into(),
                    x_label: "lowest temperature over the year (°C)".into(),
                    y_label: "depth (m)".into(),
                    series: vec![Series {
                        name: "lowest ground temperature".into(),
                        points: f.lowest_profile.iter().map(|(z, t)| (*t, *z)).collect(),
                        style: SeriesStyle::Line,
                        colour: 4,
                    }],
                    y_down: true,
                    hlines,
                    vlines: vec![(0.0, "0 °C".into())],
                    ..Default::default()
                },
                720,
                480,
            )?,
        },
    ];
    if let Some(n) = &f.numerical {
        out.push(Figure {
            stem: format!("{}-frost-series", s.id),
            caption: "Free-field frost depth (the deepest 0 °C isotherm at the edge of the engine's section, away from the pipe) through the design season, with the pipe crown.".into(),
            rendered: render_line_plot(
                &LinePlot {
                    title: "Frost depth through the design winter".into(),
                    x_label: format!("days from {} (MM-DD)", f.season_start),
                    y_label: "frost depth (m)".into(),
                    series: vec![Series {
                        name: "free-field frost depth (engine)".into(),
                        points: n
                            .series_days
                            .iter()
                            .zip(&n.series_frost_depth_m)
                            .map(|(d, x)| (*d, *x))
                            .collect(),
                        style: SeriesStyle::Line,
                        colour: 0,
                    }],
                    y_down: true,
                    hlines: f
                        .pipe_crown_depth_m
                        .map(|c| vec![(c, format!("pipe crown {c:.2} m"))])
                        .unwrap_or_default(),
                    x_range: Some((0.0, 365.0)),
                    ..Default::default()
                },
                720,
                400,
            )?,
        });
        if let Some(field) = &n.field {
            let finite = field.values_c.iter().flatten().filter(|v| v.is_finite());
            let (lo, hi) = finite.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &v| {
                (a.min(v), b.max(v))
            });
            let mut levels = isotherm_levels(lo, hi);
            if lo < 0.0 && hi > 0.0 && !levels.contains(&0.0) {
                levels.push(0.0);
            }
            out.push(Figure {
                stem: format!("{}-field", s.id),
                caption: format!(
                    "Temperature around the main at the deepest frost ({}); isotherms in °C, the 0 °C isotherm is the frost line; the marker is the pipe centre.",
                    field.label
                ),
                rendered: render_field_plot(
                    &FieldPlot {
                        title: "Ground temperature at the deepest frost".into(),
                        x_label: "x from the pipe centre (m)".into(),
                        z_label: "depth (m)".into(),
                        colour_bar_label: "temperature (°C)".into(),
                        x_m: field.x_m.clone(),
                        z_m: field.z_m.clone(),
                        values: field.values_c.clone(),
                        value_range: Some((lo, hi)),
                        isotherms: levels,
                        markers: n
                            .pipe_circle
                            .map(|(x, z, _)| vec![(x, z, "pipe".to_string())])
                            .unwrap_or_default(),
                    },
                    760,
                    480,
                )?,
            });
        }
    }
    Ok(out)
}

pub fn section(f: &FrostResult) -> Markup {
    html! {
        p {
            "Method: the design surface freezing index (" (f.design_index_basis)
            ") drives Stefan's formula, summed layer by layer, and the modified Berggren equation, whose coefficient λ comes from the Neumann two-phase relation behind Aldrich & Paynter's (1953) chart (US Army/Air Force TM 5-852-6). Stefan neglects the soil's sensible heat and is shown as an upper bound; the deeper of the modified Berggren and the numerical depth governs."
        }
        @if let Some(n) = &f.numerical {
            p {
                (format!(
                    "Numerical: burrow's finite-volume engine runs the section with the main in place (water at its monthly temperatures) from the periodic undisturbed ground through {} spin-up years of the typical year and then the design season, whose below-zero surface temperatures are scaled by {:.3} to give the design freezing index.",
                    n.spin_up_years, n.winter_scale
                ))
                " Latent heat of the soil water is released between 0 °C and the layer's freezing interval below it; the frost depth is the 0 °C isotherm (first ice) at the section's edge, away from the pipe, so it lies somewhat deeper than a sharp-front formula's."
            }
        }
        table {
            tr { th { "figure" } th.n { "value" } }
            (row("Design surface freezing index", html! { (format!("{:.0} °C·d", f.design_freezing_index_c_days)) }))
            (row("Air freezing index", html! { (opt(f.air_freezing_index_c_days, "°C·d")) }))
            (row(
                "Mean annual surface temperature; freezing season",
                html! { (format!("{:.2} °C; {:.0} days", f.mean_annual_surface_c, f.freezing_season_days)) },
            ))
            (row("Frost depth, Stefan (upper bound)", html! { (opt(f.frost_depth_m.stefan, "m")) }))
            (row("Frost depth, modified Berggren", html! { (opt(f.frost_depth_m.berggren, "m")) }))
            (row(
                "Frost depth, numerical (engine, free field, 0 °C isotherm)",
                html! {
                    @match f.frost_depth_m.numerical {
                        Some(x) => (format!("{x:.2} m")),
                        None => "not run",
                    }
                },
            ))
            @if let Some(p) = &f.permafrost {
                tr {
                    td { b { "Permafrost: active layer; permafrost table; mean annual ground temperature (no frost depth applies)" } }
                    td.n { b { (format!("{:.2} m; {:.2} m; {:.1} °C", p.active_layer_depth_m, p.permafrost_table_depth_m, p.mean_annual_ground_temperature_c)) } }
                }
            } @else {
                tr {
                    td { b { "Governing frost depth" } }
                    td.n {
                        b {
                            @match f.max_frost_depth_m {
                                Some(d) => (format!("{d:.2} m")),
                                None => "none found within the models' depth",
                            }
                        }
                    }
                }
            }
            @if let Some(b) = &f.berggren {
                (row(
                    "Berggren λ (thermal ratio α, fusion parameter μ)",
                    html! { (format!("{:.3} ({:.2}, {:.3})", b.lambda, b.thermal_ratio, b.fusion_parameter)) },
                ))
            }
            @if let Some(reaches) = f.frost_reaches_pipe {
                (row("Pipe crown depth", html! { (opt(f.pipe_crown_depth_m, "m")) }))
                (row(
                    "Frost reaches the pipe",
                    html! { @if reaches { b { "yes" } } @else { "no" } },
                ))
                tr {
                    td {
                        "Coldest pipe wall ("
                        @if f.numerical.as_ref().is_some_and(|n| n.pipe_min_wall_temperature_c.is_some()) {
                            "engine, design winter"
                        } @else {
                            "undisturbed ground, water through the wall"
                        }
                        ")"
                    }
                    td.n { (opt(f.pipe_min_temperature_c, "°C")) }
                }
                tr {
                    td { b { "Required cover" } (format!(" (frost depth + {:.2} m margin, common practice)", f.margin_m)) }
                    td.n { b { (opt(f.required_cover_m, "m")) } }
                }
            }
            @if let Some(n) = &f.numerical {
                (row(
                    "Engine run: cells; step; spin-up; winter scale; energy balance",
                    html! {
                        (format!(
                            "{}; {:.0} h; {} years; {:.3}; {:.1e}",
                            n.cells, n.time_step_h, n.spin_up_years, n.winter_scale, n.energy_balance_relative_error
                        ))
                    },
                ))
                (row("Deepest free-field frost, day of the season", html! { (format!("{:.0}", n.deepest_frost_day)) }))
            }
            @if let Some(b) = &f.bleed {
                tr {
                    td {
                        (format!(
                            "Bleed flow keeping {:.0} m of main at or above {:.1} °C (water in at {:.1} °C, ground at {:.1} °C)",
                            b.length_m, b.min_temperature_c, b.inlet_temperature_c, b.ground_temperature_c
                        ))
                    }
                    td.n { b { (format!("{:.2} l/min", b.flow_l_per_min)) } }
                }
            }
            @if let (Some(width), Some(b)) = (f.board_width_m, &f.board) {
                tr {
                    td {
                        (format!(
                            "Insulation board {:.0} mm, {:.3} W/(m K), {:.2} m above the crown: narrowest width keeping the crown above 0 °C (engine, no heat from the water)",
                            b.thickness_m * 1000.0,
                            b.conductivity_w_per_m_k,
                            b.gap_m
                        ))
                    }
                    td.n {
                        // The study reports 0 when no board is needed and null when the widest
                        // board allowed is not enough.
                        @match width {
                            Some(w) if w <= 0.0 => "none needed",
                            Some(w) => b { (format!("{w:.2} m")) },
                            None => (format!("none up to {:.2} m", b.max_width_m)),
                        }
                    }
                }
            }
            @if let Some(s) = &f.stagnant {
                (row(
                    &format!(
                        "Stagnant water: {:.0} h without flow at {:.1} °C ground, from {:.1} °C",
                        s.duration_h, s.ground_temperature_c, s.initial_water_temperature_c
                    ),
                    html! {
                        "first ice "
                        @match s.time_to_first_ice_h {
                            Some(t) => (format!("after {t:.0} h")),
                            None => "never",
                        }
                        (format!("; ice fraction {:.0} %", s.ice_fraction * 100.0))
                    },
                ))
            }
        }
        @if !f.seasons.is_empty() {
            p.meta {
                "Seasonal surface freezing indices: "
                (f.seasons
                    .iter()
                    .map(|s| format!("{}/{}: {:.0} °C·d", s.start_year, s.start_year + 1, s.freezing_index_c_days))
                    .collect::<Vec<_>>()
                    .join("; "))
                "."
            }
        }
    }
}

/// One row of the figure table: its label and its value.
fn row(label: &str, value: Markup) -> Markup {
    html! {
        tr { td { (label) } td.n { (value) } }
    }
}

/// An optional figure to two decimals with its unit, or a dash.
fn opt(v: Option<f64>, unit: &str) -> String {
    v.map(|x| format!("{x:.2} {unit}")).unwrap_or_else(|| "—".into())
}

/// The CSV files of a frost study: file name and text.
pub fn csv_files(s: &StudyResult, f: &FrostResult) -> Vec<(String, String)> {
    let mut files = vec![(format!("{}-degree-days.csv", s.id), degree_days_csv(f))];
    if let Some(n) = &f.numerical {
        let mut t = String::from("days_from_season_start,free_field_frost_depth_m\n");
        for (d, x) in n.series_days.iter().zip(&n.series_frost_depth_m) {
            let _ = writeln!(t, "{d:.4},{x:.4}");
        }
        files.push((format!("{}-frost-depth.csv", s.id), t));
    }
    files
}

/// `<id>-degree-days.csv`: the cumulative curve of the design season.
pub fn degree_days_csv(f: &FrostResult) -> String {
    let mut s = String::from("days_from_season_start,cumulative_surface_degree_days_c_d\n");
    for (d, v) in f.cumulative_degree_days.iter().enumerate() {
        let _ = writeln!(s, "{d},{v:.4}");
    }
    s
}
