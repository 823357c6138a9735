//! Report section, plots and CSV of a `frost` study.

// HTML is written line by line; a trailing `\n` in `write!` keeps the markup readable.
#![allow(clippy::write_with_newline)]

use super::Figure;
use super::html::esc;
use super::plot::{LinePlot, Series, SeriesStyle, render_line_plot};
use crate::results::{FrostResult, StudyResult};
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
    let mut hlines = vec![(
        f.max_frost_depth_m,
        format!("frost depth {:.2} m", f.max_frost_depth_m),
    )];
    if let Some(c) = f.pipe_crown_depth_m {
        hlines.push((c, format!("pipe crown {c:.2} m")));
    }
    if let Some(c) = f.required_cover_m {
        hlines.push((c, format!("required cover {c:.2} m")));
    }
    Ok(vec![
        Figure {
            stem: format!("{}-degree-days", s.id),
            caption: "Cumulative surface degree-days over the freezing season from 1 July; the freezing index is the fall from the highest to the lowest point.".into(),
            rendered: render_line_plot(
                &LinePlot {
                    title: "Cumulative degree-days of the design season".into(),
                    x_label: "days from 1 July".into(),
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
    ])
}

pub fn section(h: &mut String, f: &FrostResult) {
    let _ = write!(
        h,
        "<p>Method: the design surface freezing index ({}) drives Stefan's formula, summed layer by layer, and the modified Berggren equation, whose coefficient λ comes from the Neumann two-phase relation behind Aldrich &amp; Paynter's (1953) chart (US Army/Air Force TM 5-852-6). Stefan neglects the soil's sensible heat and is shown as an upper bound; the modified Berggren depth governs.</p>\n",
        esc(&f.design_index_basis)
    );
    let opt = |v: Option<f64>, unit: &str| v.map(|x| format!("{x:.2} {unit}")).unwrap_or_else(|| "—".into());
    let _ = write!(
        h,
        "<table>\n<tr><th>figure</th><th class=\"n\">value</th></tr>\n\
<tr><td>Design surface freezing index</td><td class=\"n\">{:.0} °C·d</td></tr>\n\
<tr><td>Air freezing index</td><td class=\"n\">{}</td></tr>\n\
<tr><td>Mean annual surface temperature; freezing season</td><td class=\"n\">{:.2} °C; {:.0} days</td></tr>\n\
<tr><td>Frost depth, Stefan (upper bound)</td><td class=\"n\">{}</td></tr>\n\
<tr><td>Frost depth, modified Berggren</td><td class=\"n\">{}</td></tr>\n\
<tr><td>Frost depth, numerical</td><td class=\"n\">{}</td></tr>\n\
<tr><td><b>Governing frost depth</b></td><td class=\"n\"><b>{:.2} m</b></td></tr>\n",
        f.design_freezing_index_c_days,
        opt(f.air_freezing_index_c_days, "°C·d"),
        f.mean_annual_surface_c,
        f.freezing_season_days,
        opt(f.frost_depth_m.stefan, "m"),
        opt(f.frost_depth_m.berggren, "m"),
        f.frost_depth_m
            .numerical
            .map(|x| format!("{x:.2} m"))
            .unwrap_or_else(|| "not run".into()),
        f.max_frost_depth_m
    );
    if let Some(b) = &f.berggren {
        let _ = write!(
            h,
            "<tr><td>Berggren λ (thermal ratio α, fusion parameter μ)</td><td class=\"n\">{:.3} ({:.2}, {:.3})</td></tr>\n",
            b.lambda, b.thermal_ratio, b.fusion_parameter
        );
    }
    if let Some(reaches) = f.frost_reaches_pipe {
        let _ = write!(
            h,
            "<tr><td>Pipe crown depth</td><td class=\"n\">{}</td></tr>\n<tr><td>Frost reaches the pipe</td><td class=\"n\">{}</td></tr>\n<tr><td>Coldest pipe wall (undisturbed ground, water through the wall)</td><td class=\"n\">{}</td></tr>\n<tr><td><b>Required cover</b> (frost depth + {:.2} m margin, common practice)</td><td class=\"n\"><b>{}</b></td></tr>\n",
            opt(f.pipe_crown_depth_m, "m"),
            if reaches { "<b>yes</b>" } else { "no" },
            opt(f.pipe_min_temperature_c, "°C"),
            f.margin_m,
            opt(f.required_cover_m, "m")
        );
    }
    if let Some(s) = &f.stagnant {
        let _ = write!(
            h,
            "<tr><td>Stagnant water: {:.0} h without flow at {:.1} °C ground, from {:.1} °C</td><td class=\"n\">first ice {}; ice fraction {:.0} %</td></tr>\n",
            s.duration_h,
            s.ground_temperature_c,
            s.initial_water_temperature_c,
            s.time_to_first_ice_h
                .map(|t| format!("after {t:.0} h"))
                .unwrap_or_else(|| "never".into()),
            s.ice_fraction * 100.0
        );
    }
    let _ = write!(h, "</table>\n");
    if !f.seasons.is_empty() {
        let _ = write!(
            h,
            "<p class=\"meta\">Seasonal surface freezing indices: {}.</p>\n",
            f.seasons
                .iter()
                .map(|s| format!(
                    "{}/{}: {:.0} °C·d",
                    s.start_year,
                    s.start_year + 1,
                    s.freezing_index_c_days
                ))
                .collect::<Vec<_>>()
                .join("; ")
        );
    }
}

/// `<id>-degree-days.csv`: the cumulative curve of the design season.
pub fn degree_days_csv(f: &FrostResult) -> String {
    let mut s = String::from("days_from_1_july,cumulative_surface_degree_days_c_d\n");
    for (d, v) in f.cumulative_degree_days.iter().enumerate() {
        let _ = writeln!(s, "{d},{v:.4}");
    }
    s
}
