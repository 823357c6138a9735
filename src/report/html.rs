//! `report.html`: one self-contained page (inline CSS and SVG, no scripts, no network
//! resources). Every text that comes from the user is escaped.

// HTML is written line by line; a trailing `\n` in `write!` keeps the markup readable.
#![allow(clippy::write_with_newline)]

use super::plot::{Band, LinePlot, Series, SeriesStyle};
use super::{Figure, ReportFigures};
use crate::model::{Climate, Site};
use crate::results::{Figures, Level, Results, StudyResult};
use crate::site::units::{Dimension, format_quantity};
use std::fmt::Write;

/// Escapes text for HTML element content and attribute values.
pub fn esc(text: &str) -> String {
    let mut s = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => s.push_str("&amp;"),
            '<' => s.push_str("&lt;"),
            '>' => s.push_str("&gt;"),
            '"' => s.push_str("&quot;"),
            '\'' => s.push_str("&#39;"),
            _ => s.push(c),
        }
    }
    s
}

const STYLE: &str = r#"
:root { --ink:#1d2327; --muted:#5b6770; --rule:#c9d1d6; --danger:#a3122a; --caution:#8a5a00; --info:#2f5d7c; }
body { font-family: "DejaVu Sans", "Segoe UI", Helvetica, Arial, sans-serif; color: var(--ink); max-width: 62rem; margin: 2rem auto; padding: 0 1.2rem; line-height: 1.45; }
h1 { font-size: 1.7rem; margin-bottom: .2rem; } h2 { border-bottom: 2px solid var(--ink); padding-bottom: .15rem; margin-top: 2.2rem; }
h3 { margin-top: 1.4rem; }
.meta { color: var(--muted); font-size: .9rem; } .meta code { word-break: break-all; }
table { border-collapse: collapse; margin: .6rem 0 1rem; font-size: .92rem; }
th, td { border-bottom: 1px solid var(--rule); padding: .25rem .7rem; text-align: left; vertical-align: top; }
td.n, th.n { text-align: right; font-variant-numeric: tabular-nums; }
.warning { border-left: 6px solid; padding: .4rem .8rem; margin: .5rem 0; background: #f6f7f8; }
.warning.danger { border-color: var(--danger); } .warning.caution { border-color: var(--caution); } .warning.info { border-color: var(--info); }
.warning .level { font-weight: bold; text-transform: uppercase; letter-spacing: .04em; margin-right: .5rem; }
.danger .level { color: var(--danger); } .caution .level { color: var(--caution); } .info .level { color: var(--info); }
figure { margin: 1rem 0; page-break-inside: avoid; break-inside: avoid; } figure svg { width: 100%; height: auto; max-width: 720px; display: block; }
figcaption { color: var(--muted); font-size: .9rem; }
.cautions { border: 1px solid var(--ink); padding: .7rem 1rem; margin-top: 2rem; }
section.study { page-break-before: always; break-before: page; }
.echo pre { background: #f6f6f3; border-left: 3px solid #bbb; padding: .5rem .8rem; font-size: .8rem; overflow-x: auto; white-space: pre-wrap; }
@media print { body { margin: 0; max-width: none; } h2 { page-break-after: avoid; break-after: avoid; } a { color: inherit; } }
"#;

/// The whole report page.
pub fn report(results: &Results, site: &Site, figures: &ReportFigures) -> String {
    let mut h = String::new();
    let _ = write!(
        h,
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n<title>{} — burrow report</title>\n<style>{STYLE}</style>\n</head>\n<body>\n",
        esc(&results.site.name)
    );
    title_block(&mut h, results);
    warnings(&mut h, results);
    summary(&mut h, results);
    inputs(&mut h, site);
    ground(&mut h, results, &figures.ground);
    studies(&mut h, results, site, &figures.studies);
    let _ = write!(
        h,
        "<h2 id=\"cautions\">Cautions</h2>\n<p class=\"cautions\">{}</p>\n</body>\n</html>\n",
        esc(crate::CAUTION)
    );
    h
}

fn title_block(h: &mut String, r: &Results) {
    let _ = write!(h, "<header>\n<h1>{}</h1>\n", esc(&r.site.name));
    if let Some(d) = &r.site.description {
        let _ = write!(h, "<p>{}</p>\n", esc(d));
    }
    let _ = write!(
        h,
        "<p class=\"meta\">burrow {} · report of {} · input <code>{}</code> (SHA-256 <code>{}</code>)</p>\n<p class=\"meta\">Estimates for design support; see the cautions at the end.</p>\n</header>\n",
        esc(&r.tool.version),
        crate::calendar::today_utc(),
        esc(&r.site.input_file),
        esc(&r.site.input_sha256)
    );
}

fn warnings(h: &mut String, r: &Results) {
    let _ = write!(h, "<h2 id=\"warnings\">Warnings</h2>\n");
    if r.warnings.is_empty() {
        let _ = write!(h, "<p>No warning was raised.</p>\n");
        return;
    }
    for w in &r.warnings {
        let (class, word) = match w.level {
            Level::Danger => ("danger", "danger"),
            Level::Caution => ("caution", "caution"),
            Level::Info => ("info", "note"),
        };
        let study = w
            .study
            .as_deref()
            .map(|s| format!(" · study {}", esc(s)))
            .unwrap_or_default();
        let _ = write!(
            h,
            "<div class=\"warning {class}\"><span class=\"level\">{word}</span><code>{}</code>{study}<br>{}</div>\n",
            esc(&w.code),
            esc(&w.message)
        );
    }
}

fn summary(h: &mut String, r: &Results) {
    let g = &r.ground;
    let surface_min = g.surface_daily_c.iter().cloned().fold(f64::INFINITY, f64::min);
    let surface_max = g
        .surface_daily_c
        .iter()
        .cloned()
        .fold(f64::NEG_INFINITY, f64::max);
    let deepest = g.profile.last().map(|p| p.depth_m).unwrap_or(0.0);
    let _ = write!(
        h,
        "<h2 id=\"summary\">Summary</h2>\n<table>\n<tr><th>figure</th><th class=\"n\">value</th></tr>\n\
<tr><td>Mean ground-surface temperature</td><td class=\"n\">{:.2} °C</td></tr>\n\
<tr><td>Surface temperature range over the year</td><td class=\"n\">{:.1} to {:.1} °C</td></tr>\n\
<tr><td>Deepest frost in the undisturbed ground</td><td class=\"n\">{}</td></tr>\n\
<tr><td>Undisturbed temperature at {deepest} m (mean)</td><td class=\"n\">{:.2} °C</td></tr>\n\
<tr><td>Studies run</td><td class=\"n\">{}</td></tr>\n</table>\n",
        g.surface_mean_c,
        surface_min,
        surface_max,
        if g.max_frost_depth_m > 0.0 {
            format!("{:.2} m", g.max_frost_depth_m)
        } else {
            "none".into()
        },
        g.profile.last().map(|p| p.mean_c).unwrap_or(f64::NAN),
        r.studies.len()
    );
    if r.studies.is_empty() {
        return;
    }
    let _ = write!(
        h,
        "<table class=\"studies\">\n<tr><th>study</th><th>decisive figures</th><th>against its limits</th></tr>\n"
    );
    for s in &r.studies {
        let (figures, verdict) = study_summary(s);
        let _ = write!(
            h,
            "<tr><td><a href=\"#study-{}\">{}</a> ({})</td><td>{}</td><td>{}</td></tr>\n",
            esc(&s.id),
            esc(&s.id),
            esc(&s.kind),
            esc(&figures),
            esc(&verdict)
        );
    }
    let _ = write!(h, "</table>\n");
}

/// The one or two figures that decide a study, and whether they pass the limits the site file
/// set (plain text; the caller escapes it).
pub fn study_summary(s: &StudyResult) -> (String, String) {
    match &s.figures {
        Figures::HeatLoss(hl) => {
            let figures = format!(
                "heat loss {:.1} W per metre of trench; {:.1} MWh a year over {:.0} m",
                hl.total_heat_loss_w_per_m, hl.annual_heat_loss_mwh, hl.length_m
            );
            let hot: Vec<&str> = hl
                .neighbours
                .iter()
                .filter(|n| n.exceeds_limit)
                .map(|n| n.id.as_str())
                .collect();
            let mut verdict = match hl
                .sizing
                .as_ref()
                .and_then(|z| z.heat_loss_limit_w_per_m.map(|l| (z, l)))
            {
                Some((z, limit)) => match z.chosen_insulation_thickness_m {
                    Some(t) => format!(
                        "passes the {limit} W/m limit with {:.0} mm of {}",
                        t * 1000.0,
                        z.layer
                    ),
                    None => format!("FAILS: no candidate meets the {limit} W/m limit"),
                },
                None => "no heat-loss limit set".into(),
            };
            if !hot.is_empty() {
                verdict.push_str(&format!("; FAILS: soil too warm at {}", hot.join(", ")));
            }
            (figures, verdict)
        }
        Figures::Frost(f) => {
            let figures = format!(
                "frost depth {:.2} m{}",
                f.max_frost_depth_m,
                f.required_cover_m
                    .map(|c| format!("; required cover {c:.2} m"))
                    .unwrap_or_default()
            );
            let mut verdict = match f.frost_reaches_pipe {
                Some(true) => "FAILS: frost reaches the pipe".to_string(),
                Some(false) => "passes: the pipe lies below the frost".to_string(),
                None => "no pipe checked".to_string(),
            };
            if let Some(t) = f.stagnant.as_ref().and_then(|st| st.time_to_first_ice_h) {
                verdict.push_str(&format!(
                    "; FAILS: standing water starts to freeze after {t:.0} h"
                ));
            }
            (figures, verdict)
        }
        Figures::CrossSection(c) => (
            format!(
                "{}{}",
                c.pipes
                    .iter()
                    .map(|p| format!("{}: {:.1} W/m", p.id, p.mean_heat_rate_w_per_m))
                    .collect::<Vec<_>>()
                    .join(", "),
                c.max_frost_depth_m
                    .map(|d| format!("; frost depth {d:.2} m"))
                    .unwrap_or_default()
            ),
            "no limits (a free section)".into(),
        ),
        Figures::Borefield(b) => {
            let t = &b.fluid_temperature;
            let figures = format!(
                "active length {:.1} m × {} boreholes ({:.0} m); mean fluid {:.1} to {:.1} °C",
                b.active_length_m, b.boreholes, b.total_length_m, t.min_c, t.max_c
            );
            let tolerance = if b.sizing.is_some() { 0.1 } else { 0.0 };
            let within =
                t.min_c >= b.limits.min_fluid_c - tolerance && t.max_c <= b.limits.max_fluid_c + tolerance;
            let mut verdict = if within {
                format!(
                    "passes: within {} to {} °C",
                    b.limits.min_fluid_c, b.limits.max_fluid_c
                )
            } else {
                format!(
                    "FAILS: outside {} to {} °C",
                    b.limits.min_fluid_c, b.limits.max_fluid_c
                )
            };
            let margin = b.coldest_fluid_c - b.fluid_freezing_point_c;
            if margin < crate::kinds::borefield::run::ANTIFREEZE_MARGIN_K {
                verdict.push_str(&format!(
                    "; FAILS: coldest fluid only {margin:.1} K above freezing"
                ));
            }
            (figures, verdict)
        }
    }
}

fn inputs(h: &mut String, site: &Site) {
    let _ = write!(h, "<h2 id=\"inputs\">Inputs</h2>\n<h3>Climate</h3>\n");
    let t = |v| esc(&format_quantity(v, Dimension::Temperature));
    match &site.climate {
        Climate::AnnualWave {
            mean_c,
            amplitude_k,
            coldest_day,
        } => {
            let _ = write!(
                h,
                "<p>Annual sinusoidal wave of the ground-surface temperature: mean {}, amplitude {}, coldest on day {coldest_day} of the year.</p>\n",
                t(*mean_c),
                esc(&format_quantity(*amplitude_k, Dimension::TemperatureDifference))
            );
        }
        Climate::MonthlyAir { air_c, n_factors } => {
            let _ = write!(
                h,
                "<p>Monthly mean air temperatures, turned into surface temperatures by the n-factors (freezing {}, thawing {}); the monthly values are joined by a trigonometric series that keeps each month's mean.</p>\n<table><tr>",
                n_factors.freezing, n_factors.thawing
            );
            for m in [
                "Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec",
            ] {
                let _ = write!(h, "<th class=\"n\">{m}</th>");
            }
            let _ = write!(h, "</tr><tr>");
            for a in air_c {
                let _ = write!(h, "<td class=\"n\">{a:.1}</td>");
            }
            let _ = write!(h, "</tr></table><p class=\"meta\">°C, air</p>\n");
        }
        Climate::Series(s) => {
            let _ = write!(
                h,
                "<p>Measured air temperatures from <code>{}</code>: {} records at {} h steps from day {} of {}; n-factors freezing {}, thawing {}. The undisturbed ground uses the mean year of the record.</p>\n",
                esc(&s.source),
                s.air_c.len(),
                s.step_s / 3600.0,
                s.start_day_of_year.floor(),
                s.start_year,
                s.n_factors.freezing,
                s.n_factors.thawing
            );
        }
        Climate::Constant { temperature_c } => {
            let _ = write!(
                h,
                "<p>Ground surface held at {} from the start.</p>\n",
                t(*temperature_c)
            );
        }
    }
    let _ = write!(
        h,
        "<h3>Ground</h3>\n<p>Geothermal heat flux {}; initial temperature {}.</p>\n<table>\n<tr><th>layer</th><th class=\"n\">top</th><th class=\"n\">thickness</th><th class=\"n\">conductivity<br>unfrozen / frozen</th><th class=\"n\">heat capacity<br>unfrozen / frozen</th><th class=\"n\">water content</th><th class=\"n\">latent heat</th></tr>\n",
        esc(&format_quantity(
            site.ground.geothermal_flux_w_per_m2,
            Dimension::HeatFlux
        )),
        match site.ground.initial_temperature_c {
            Some(v) => t(v),
            None => "the periodic undisturbed state".into(),
        }
    );
    for (l, top) in site.ground.layers.iter().zip(site.ground.layer_tops_m()) {
        let preset = l
            .preset
            .as_deref()
            .map(|p| format!(" <span class=\"meta\">({})</span>", esc(p)))
            .unwrap_or_default();
        let _ = write!(
            h,
            "<tr><td>{}{preset}</td><td class=\"n\">{top:.2} m</td><td class=\"n\">{}</td><td class=\"n\">{:.2} / {:.2} W/(m K)</td><td class=\"n\">{:.2} / {:.2} MJ/(m3 K)</td><td class=\"n\">{:.0} %</td><td class=\"n\">{:.0} MJ/m3</td></tr>\n",
            esc(&l.name),
            l.thickness_m
                .map(|t| format!("{t:.2} m"))
                .unwrap_or_else(|| "to the bottom".into()),
            l.conductivity_w_per_m_k,
            l.frozen_conductivity_w_per_m_k,
            l.heat_capacity_j_per_m3_k / 1e6,
            l.frozen_heat_capacity_j_per_m3_k / 1e6,
            l.water_content * 100.0,
            l.latent_heat_j_per_m3 / 1e6
        );
    }
    let _ = write!(h, "</table>\n");
}

fn ground(h: &mut String, r: &Results, figures: &[Figure]) {
    let g = &r.ground;
    let method = if g.profile_method == "closed-form" {
        "the closed-form periodic solution for a homogeneous soil under a sinusoidal surface temperature (Carslaw &amp; Jaeger, <i>Conduction of Heat in Solids</i>, 1959, §2.6; Kusuda &amp; Achenbach 1965), plus the steady geothermal gradient".to_string()
    } else {
        format!(
            "a 1-D periodic finite-volume solution through the soil layers, with the latent heat of the soil water released over its freezing interval (enthalpy formulation), repeated until the year repeats itself ({} years of spin-up; energy balance error {:.1e})",
            g.spin_up_years,
            g.energy_balance_relative_error.unwrap_or(0.0)
        )
    };
    let _ = write!(
        h,
        "<h2 id=\"ground\">Undisturbed ground</h2>\n<p>Found by {method}.</p>\n"
    );
    figure_list(h, figures);
    let _ = write!(
        h,
        "<table>\n<tr><th class=\"n\">depth</th><th class=\"n\">mean</th><th class=\"n\">lowest</th><th class=\"n\">highest</th></tr>\n"
    );
    for row in g.profile.iter().filter(|p| is_listed_depth(p.depth_m)) {
        let _ = write!(
            h,
            "<tr><td class=\"n\">{:.2} m</td><td class=\"n\">{:.2} °C</td><td class=\"n\">{:.2} °C</td><td class=\"n\">{:.2} °C</td></tr>\n",
            row.depth_m, row.mean_c, row.min_c, row.max_c
        );
    }
    let _ = write!(
        h,
        "</table>\n<p class=\"meta\">Every 0.25 m in <code>ground-profile.csv</code>.</p>\n"
    );
}

fn figure_list(h: &mut String, figures: &[Figure]) {
    for f in figures {
        let _ = write!(
            h,
            "<figure id=\"fig-{}\">\n{}\n<figcaption>{}</figcaption>\n</figure>\n",
            esc(&f.stem),
            strip_xml_declaration(&f.rendered.svg),
            esc(&f.caption)
        );
    }
}

/// One section per study: its method, figures and key results.
fn studies(h: &mut String, r: &Results, site: &Site, figures: &[Vec<Figure>]) {
    for (s, figs) in r.studies.iter().zip(figures) {
        let _ = write!(
            h,
            "<section class=\"study\" id=\"study-{}\">\n<h2>Study {} <span class=\"meta\">({}, {} method)</span></h2>\n",
            esc(&s.id),
            esc(&s.id),
            esc(&s.kind),
            esc(&s.method)
        );
        if let Some(e) = site
            .studies
            .iter()
            .find(|m| m.id == s.id)
            .and_then(|m| m.echo.as_ref())
        {
            let _ = write!(
                h,
                "<details open class=\"echo\"><summary>Inputs as written (site file, lines {}–{})</summary>\n<pre>{}</pre>\n</details>\n",
                e.first_line,
                e.last_line,
                esc(&e.text)
            );
        }
        s.figures.section(h);
        figure_list(h, figs);
        let _ = write!(h, "</section>\n");
    }
}

fn is_listed_depth(z: f64) -> bool {
    [
        0.0, 0.5, 1.0, 1.5, 2.0, 3.0, 5.0, 7.5, 10.0, 15.0, 20.0, 30.0, 50.0, 100.0, 200.0,
    ]
    .iter()
    .any(|d| (d - z).abs() < 1e-9)
}

fn strip_xml_declaration(svg: &str) -> &str {
    match svg.find("<svg") {
        Some(i) => &svg[i..],
        None => svg,
    }
}

/// The envelope plot: annual band and mean against depth (depth downward).
pub fn profile_plot(r: &Results) -> LinePlot {
    // Below the seasonal zone only the geothermal gradient remains: a deep profile (a borefield's)
    // is plotted over its top part, where the seasons show; the CSV holds every depth.
    let deep = r
        .ground
        .profile
        .last()
        .is_some_and(|p| p.depth_m > 2.0 * PROFILE_PLOT_DEPTH_M);
    let p: Vec<_> = r
        .ground
        .profile
        .iter()
        .filter(|row| !deep || row.depth_m <= PROFILE_PLOT_DEPTH_M)
        .collect();
    LinePlot {
        title: if deep {
            format!("Undisturbed ground temperature, top {PROFILE_PLOT_DEPTH_M} m")
        } else {
            "Undisturbed ground temperature".into()
        },
        x_label: "temperature (°C)".into(),
        y_label: "depth (m)".into(),
        series: vec![Series {
            name: "annual mean".into(),
            points: p.iter().map(|r| (r.mean_c, r.depth_m)).collect(),
            style: SeriesStyle::Line,
            colour: 0,
        }],
        bands: vec![Band {
            name: "annual range".into(),
            lower: p.iter().map(|r| (r.min_c, r.depth_m)).collect(),
            upper: p.iter().map(|r| (r.max_c, r.depth_m)).collect(),
            colour: 0,
        }],
        y_down: true,
        x_range: None,
        y_range: None,
        hlines: Vec::new(),
        vlines: vec![(0.0, "0 °C".into())],
    }
}

/// Depth to which a deep undisturbed profile is plotted, m.
pub const PROFILE_PLOT_DEPTH_M: f64 = 20.0;

/// The surface temperature over the typical year.
pub fn surface_plot(r: &Results) -> LinePlot {
    LinePlot {
        title: "Ground-surface temperature, typical year".into(),
        x_label: "day of year".into(),
        y_label: "temperature (°C)".into(),
        series: vec![Series {
            name: "surface".into(),
            points: r
                .ground
                .surface_daily_c
                .iter()
                .enumerate()
                .map(|(d, t)| ((d + 1) as f64, *t))
                .collect(),
            style: SeriesStyle::Line,
            colour: 1,
        }],
        bands: Vec::new(),
        y_down: false,
        x_range: Some((1.0, 365.0)),
        y_range: None,
        hlines: vec![(0.0, "0 °C".into())],
        vlines: Vec::new(),
    }
}

#[cfg(test)]
mod tests {
    use super::esc;

    #[test]
    fn markup_in_user_text_is_escaped() {
        assert_eq!(
            esc("<b>\"A&B's\"</b>"),
            "&lt;b&gt;&quot;A&amp;B&#39;s&quot;&lt;/b&gt;"
        );
    }
}
