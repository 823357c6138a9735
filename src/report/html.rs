//! `report.html`: one self-contained page (inline CSS and SVG, no scripts, no network
//! resources), built with maud: every text spliced into the page is escaped by construction,
//! and only our own CSS and the SVG of our own plot renderer go in unescaped.
//!
//! The page renders what the results hold and decides nothing: the summary shows each study's
//! decisive figures and the checks the study made, as the study wrote them.

use super::plot::{Band, LinePlot, Series, SeriesStyle};
use super::{Figure, ReportFigures};
use crate::model::{Climate, Site};
use crate::results::{Assumption, Check, DecisiveFigure, Level, Results, StudyFailure};
use crate::site::units::{Dimension, format_quantity};
use maud::{DOCTYPE, Markup, PreEscaped, html};

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
.fails { color: var(--danger); font-weight: bold; }
figure { margin: 1rem 0; page-break-inside: avoid; break-inside: avoid; } figure svg { width: 100%; height: auto; max-width: 720px; display: block; }
figcaption { color: var(--muted); font-size: .9rem; }
.cautions { border: 1px solid var(--ink); padding: .7rem 1rem; margin-top: 2rem; }
section.study { page-break-before: always; break-before: page; }
.echo pre { background: #f6f6f3; border-left: 3px solid #bbb; padding: .5rem .8rem; font-size: .8rem; overflow-x: auto; white-space: pre-wrap; }
@media print { body { margin: 0; max-width: none; } h2 { page-break-after: avoid; break-after: avoid; } a { color: inherit; } }
"#;

/// The whole report page.
pub fn report(results: &Results, site: &Site, figures: &ReportFigures) -> String {
    html! {
        (DOCTYPE)
        html lang="en" {
            head {
                meta charset="utf-8";
                meta name="viewport" content="width=device-width, initial-scale=1";
                title { (results.site.name) " — burrow report" }
                // Our own constant style sheet; escaping would break its quoted font names.
                style { (PreEscaped(STYLE)) }
            }
            body {
                (title_block(results))
                (warnings(results))
                (failed_studies(&results.failed_studies))
                (summary(results))
                (inputs(site))
                (ground(results, &figures.ground))
                (studies(results, site, &figures.studies))
                h2 #cautions { "Cautions" }
                p.cautions { (crate::CAUTION) }
            }
        }
    }
    .into_string()
}

fn title_block(r: &Results) -> Markup {
    html! {
        header {
            h1 { (r.site.name) }
            @if let Some(d) = &r.site.description {
                p { (d) }
            }
            p.meta {
                "burrow " (r.tool.version) " · report of " (crate::calendar::today_utc())
                " · input " code { (r.site.input_file) }
                " (SHA-256 " code { (r.site.input_sha256) } ")"
            }
            p.meta { "Estimates for design support; see the cautions at the end." }
        }
    }
}

fn warnings(r: &Results) -> Markup {
    html! {
        h2 #warnings { "Warnings" }
        @if r.warnings.is_empty() {
            p { "No warning was raised." }
        }
        @for w in &r.warnings {
            @let (class, word) = match w.level {
                Level::Danger => ("danger", "danger"),
                Level::Caution => ("caution", "caution"),
                Level::Info => ("info", "note"),
            };
            div.warning.(class) {
                span.level { (word) }
                code { (w.code) }
                @if let Some(s) = &w.study {
                    " · study " (s)
                }
                br;
                (w.message)
            }
        }
    }
}

/// The studies that could not be run, beside the warnings so that no reader misses them.
fn failed_studies(failed: &[StudyFailure]) -> Markup {
    html! {
        @if !failed.is_empty() {
            h2 #failed-studies { "Failed studies" }
            p { "These studies could not be run; the report holds no figures of theirs. The other studies ran." }
            @for f in failed {
                div.warning.danger {
                    span.level { "failed" }
                    "study " code { (f.id) } " (" (f.kind) ")"
                    br;
                    (f.reason)
                }
            }
        }
    }
}

fn summary(r: &Results) -> Markup {
    let g = &r.ground;
    let surface_min = g.surface_daily_c.iter().cloned().fold(f64::INFINITY, f64::min);
    let surface_max = g
        .surface_daily_c
        .iter()
        .cloned()
        .fold(f64::NEG_INFINITY, f64::max);
    let deepest = g.profile.last().map(|p| p.depth_m).unwrap_or(0.0);
    html! {
        h2 #summary { "Summary" }
        table {
            tr { th { "figure" } th.n { "value" } }
            tr {
                td { "Mean ground-surface temperature" }
                td.n { (format!("{:.2} °C", g.surface_mean_c)) }
            }
            tr {
                td { "Surface temperature range over the year" }
                td.n { (format!("{surface_min:.1} to {surface_max:.1} °C")) }
            }
            @if let Some(p) = &g.permafrost {
                tr {
                    td { "Permafrost: active layer; permafrost table; mean annual ground temperature" }
                    td.n {
                        (format!(
                            "{:.2} m; {:.2} m; {:.1} °C",
                            p.active_layer_depth_m, p.permafrost_table_depth_m, p.mean_annual_ground_temperature_c
                        ))
                    }
                }
            } @else {
                tr {
                    td { "Deepest frost in the undisturbed ground" }
                    td.n {
                        @match g.max_frost_depth_m {
                            Some(d) if d > 0.0 => (format!("{d:.2} m")),
                            Some(_) => "none",
                            None => "below the profile's depth",
                        }
                    }
                }
            }
            tr {
                td { "Undisturbed temperature at " (deepest) " m (mean)" }
                td.n { (format!("{:.2} °C", g.profile.last().map(|p| p.mean_c).unwrap_or(f64::NAN))) }
            }
            tr { td { "Studies run" } td.n { (r.studies.len()) } }
        }
        @if !r.studies.is_empty() || !r.failed_studies.is_empty() {
            table.studies {
                tr { th { "study" } th { "decisive figures" } th { "checks" } }
                @for s in &r.studies {
                    tr {
                        td { a href={ "#study-" (s.id) } { (s.id) } " (" (s.kind) ")" }
                        td { (decisive_figures(&s.decisive_figures)) }
                        td { (checks(&s.checks)) }
                    }
                }
                @for f in &r.failed_studies {
                    tr {
                        td { (f.id) " (" (f.kind) ")" }
                        td colspan="2" { span.fails { "failed: " } (f.reason) }
                    }
                }
            }
        }
    }
}

/// A study's decisive figures, one line each: label, value and unit; "(found)" marks a value
/// the study found (a length, a thickness, a cover).
fn decisive_figures(figures: &[DecisiveFigure]) -> Markup {
    html! {
        @for (i, f) in figures.iter().enumerate() {
            @if i > 0 { br; }
            (f.label) " " (figure_value(f.value, &f.unit)) " " (f.unit)
            @if f.sized { " (found)" }
        }
    }
}

/// A study's checks as the study worded them, one line each; a failed one says so first.
fn checks(checks: &[Check]) -> Markup {
    html! {
        @if checks.is_empty() {
            "no limits set"
        }
        @for (i, c) in checks.iter().enumerate() {
            @if i > 0 { br; }
            @if !c.passed { span.fails { "FAILS: " } }
            (c.message)
        }
    }
}

/// A decisive figure's value printed for its unit: temperatures and temperature differences to
/// 0.1 K, anything else to three significant figures but at most three decimals (a millimetre
/// of a length); whole digits are never rounded away.
pub fn figure_value(value: f64, unit: &str) -> String {
    if !value.is_finite() {
        return "—".into();
    }
    let decimals = if matches!(unit, "°C" | "K") {
        1
    } else if value == 0.0 {
        0
    } else {
        (2 - value.abs().log10().floor() as i32).clamp(0, 3) as usize
    };
    let text = format!("{value:.decimals$}");
    // A value that rounds to zero is printed without a sign.
    match text.strip_prefix('-') {
        Some(rest) if rest.chars().all(|c| c == '0' || c == '.') => rest.to_string(),
        _ => text,
    }
}

fn inputs(site: &Site) -> Markup {
    let t = |v| format_quantity(v, Dimension::Temperature);
    html! {
        h2 #inputs { "Inputs" }
        h3 { "Climate" }
        @match &site.climate {
            Climate::AnnualWave { mean_c, amplitude_k, coldest_day } => {
                p {
                    "Annual sinusoidal wave of the ground-surface temperature: mean " (t(*mean_c))
                    ", amplitude " (format_quantity(*amplitude_k, Dimension::TemperatureDifference))
                    ", coldest on day " (coldest_day) " of the year."
                }
            }
            Climate::MonthlyAir { air_c, n_factors } => {
                p {
                    "Monthly mean air temperatures, turned into surface temperatures by the n-factors (freezing "
                    (n_factors.freezing) ", thawing " (n_factors.thawing)
                    "); the monthly values are joined by a trigonometric series that keeps each month's mean."
                }
                table {
                    tr {
                        @for m in ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"] {
                            th.n { (m) }
                        }
                    }
                    tr {
                        @for a in air_c {
                            td.n { (format!("{a:.1}")) }
                        }
                    }
                }
                p.meta { "°C, air" }
            }
            Climate::Series(s) => {
                p {
                    "Measured air temperatures from " code { (s.source) } ": " (s.air_c.len())
                    " records at " (s.step_s / crate::numerics::time::HOUR_S) " h steps from day " (s.start_day_of_year.floor())
                    " of " (s.start_year) "; n-factors freezing " (s.n_factors.freezing)
                    ", thawing " (s.n_factors.thawing)
                    ". The undisturbed ground uses the mean year of the record."
                }
            }
            Climate::Constant { temperature_c } => {
                p { "Ground surface held at " (t(*temperature_c)) " from the start." }
            }
        }
        h3 { "Ground" }
        p {
            "Geothermal heat flux "
            (format_quantity(site.ground.geothermal_flux_w_per_m2, Dimension::HeatFlux))
            "; initial temperature "
            @match site.ground.initial_temperature_c {
                Some(v) => (t(v)),
                None => "the periodic undisturbed state",
            }
            "."
        }
        table {
            tr {
                th { "layer" }
                th.n { "top" }
                th.n { "thickness" }
                th.n { "conductivity" br; "unfrozen / frozen" }
                th.n { "heat capacity" br; "unfrozen / frozen" }
                th.n { "water content" }
                th.n { "latent heat" }
            }
            @for (l, top) in site.ground.layers.iter().zip(site.ground.layer_tops_m()) {
                tr {
                    td {
                        (l.name)
                        @if let Some(p) = &l.preset {
                            " " span.meta { "(" (p) ")" }
                        }
                    }
                    td.n { (format!("{top:.2} m")) }
                    td.n {
                        @match l.thickness_m {
                            Some(t) => (format!("{t:.2} m")),
                            None => "to the bottom",
                        }
                    }
                    td.n { (format!("{:.2} / {:.2} W/(m K)", l.conductivity_w_per_m_k, l.frozen_conductivity_w_per_m_k)) }
                    td.n {
                        (format!(
                            "{:.2} / {:.2} MJ/(m3 K)",
                            l.heat_capacity_j_per_m3_k / 1e6,
                            l.frozen_heat_capacity_j_per_m3_k / 1e6
                        ))
                    }
                    td.n { (format!("{:.0} %", l.water_content * 100.0)) }
                    td.n { (format!("{:.0} MJ/m3", l.latent_heat_j_per_m3 / 1e6)) }
                }
            }
        }
    }
}

fn ground(r: &Results, figures: &[Figure]) -> Markup {
    let g = &r.ground;
    html! {
        h2 #ground { "Undisturbed ground" }
        p {
            "Found by "
            @if g.profile_method == "closed-form" {
                "the closed-form periodic solution for a homogeneous soil under a sinusoidal surface temperature (Carslaw & Jaeger, "
                i { "Conduction of Heat in Solids" }
                ", 1959, §2.6; Kusuda & Achenbach 1965), plus the steady geothermal gradient"
            } @else {
                (format!(
                    "a 1-D periodic finite-volume solution through the soil layers, with the latent heat of the soil water released over its freezing interval (enthalpy formulation), repeated until the year repeats itself ({} years of spin-up; energy balance error {:.1e})",
                    g.spin_up_years,
                    g.energy_balance_relative_error.unwrap_or(0.0)
                ))
            }
            "."
        }
        (figure_list(figures))
        table {
            tr { th.n { "depth" } th.n { "mean" } th.n { "lowest" } th.n { "highest" } }
            @for row in g.profile.iter().filter(|p| is_listed_depth(p.depth_m)) {
                tr {
                    td.n { (format!("{:.2} m", row.depth_m)) }
                    td.n { (format!("{:.2} °C", row.mean_c)) }
                    td.n { (format!("{:.2} °C", row.min_c)) }
                    td.n { (format!("{:.2} °C", row.max_c)) }
                }
            }
        }
        p.meta { "Every 0.25 m in " code { "ground-profile.csv" } "." }
    }
}

fn figure_list(figures: &[Figure]) -> Markup {
    html! {
        @for f in figures {
            figure id={ "fig-" (f.stem) } {
                // The SVG comes from our own plot renderer (report::plot), which escapes every
                // text it draws; it goes into the page as it is.
                (PreEscaped(strip_xml_declaration(&f.rendered.svg)))
                figcaption { (f.caption) }
            }
        }
    }
}

/// One section per study: its inputs as written, the kind's own section, the assumptions the
/// study used, and its figures.
fn studies(r: &Results, site: &Site, figures: &[Vec<Figure>]) -> Markup {
    html! {
        @for (s, figs) in r.studies.iter().zip(figures) {
            section.study id={ "study-" (s.id) } {
                h2 { "Study " (s.id) " " span.meta { "(" (s.kind) ", " (s.method) " method)" } }
                @if let Some(e) = site.studies.iter().find(|m| m.id == s.id).and_then(|m| m.echo.as_ref()) {
                    details.echo open {
                        summary { "Inputs as written (site file, lines " (e.first_line) "–" (e.last_line) ")" }
                        pre { (e.text) }
                    }
                }
                (s.figures.section())
                (assumptions(&s.assumptions))
                (figure_list(figs))
            }
        }
    }
}

/// The constants, tolerances and defaults a study used, with their sources.
fn assumptions(assumptions: &[Assumption]) -> Markup {
    html! {
        @if !assumptions.is_empty() {
            h4 { "Assumptions" }
            table.assumptions {
                tr { th { "assumption" } th.n { "value" } th { "unit" } th { "source" } }
                @for a in assumptions {
                    tr {
                        td { (a.name) }
                        td.n { (a.value) }
                        td { (a.unit) }
                        td { (a.source) }
                    }
                }
            }
        }
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
    use super::*;
    use crate::results::Worse;

    fn check(passed: bool, message: &str) -> Check {
        Check {
            code: "kind.rule".into(),
            passed,
            value: Some(1.0),
            limit: Some(2.0),
            unit: "m".into(),
            message: message.into(),
        }
    }

    #[test]
    fn checks_are_shown_as_the_study_worded_them_and_a_failed_one_says_so() {
        let html = checks(&[
            check(true, "cover 1.2 m meets 1.0 m"),
            check(false, "fluid <0 °C>"),
        ])
        .into_string();
        assert_eq!(
            html,
            "cover 1.2 m meets 1.0 m<br><span class=\"fails\">FAILS: </span>fluid &lt;0 °C&gt;"
        );
        assert_eq!(checks(&[]).into_string(), "no limits set");
    }

    #[test]
    fn decisive_figures_give_label_value_unit_and_mark_what_the_study_found() {
        let figures = [
            DecisiveFigure::new("a_m", 1.2345, "m", "frost depth", Worse::Higher),
            DecisiveFigure::new("b_m", 112.04, "m", "active length", Worse::Higher).sized(),
            DecisiveFigure::new("c_c", -2.04, "°C", "coldest <fluid>", Worse::Lower),
        ];
        assert_eq!(
            decisive_figures(&figures).into_string(),
            "frost depth 1.23 m<br>active length 112 m (found)<br>coldest &lt;fluid&gt; -2.0 °C"
        );
    }

    #[test]
    fn figure_values_keep_three_significant_figures_and_temperatures_a_tenth_of_a_kelvin() {
        assert_eq!(figure_value(0.075, "m"), "0.075");
        assert_eq!(figure_value(0.04364, "m"), "0.044");
        assert_eq!(figure_value(3.8e-18, "m"), "0.000");
        assert_eq!(figure_value(-0.02, "°C"), "0.0");
        assert_eq!(figure_value(1.5, "m"), "1.50");
        assert_eq!(figure_value(23.456, "W/m"), "23.5");
        assert_eq!(figure_value(-12.02, "W/m"), "-12.0");
        assert_eq!(figure_value(1234.56, "m"), "1235");
        assert_eq!(figure_value(0.0, "l/min"), "0");
        assert_eq!(figure_value(4.0, "°C"), "4.0");
        assert_eq!(figure_value(-0.26, "K"), "-0.3");
        assert_eq!(figure_value(f64::NAN, "m"), "—");
    }

    #[test]
    fn failed_studies_are_listed_with_their_reason_escaped() {
        let failed = [StudyFailure {
            id: "<b>field</b>".into(),
            kind: "borefield".into(),
            reason: "no length in 20–400 m keeps the fluid above <limit>".into(),
        }];
        let html = failed_studies(&failed).into_string();
        assert!(html.contains("id=\"failed-studies\""), "{html}");
        assert!(
            html.contains("<code>&lt;b&gt;field&lt;/b&gt;</code> (borefield)"),
            "{html}"
        );
        assert!(html.contains("above &lt;limit&gt;"), "{html}");
        assert_eq!(failed_studies(&[]).into_string(), "");
    }

    #[test]
    fn a_failed_study_has_its_row_in_the_summary_with_its_reason() {
        let results = Results {
            tool: crate::results::Tool {
                name: "burrow".into(),
                version: "0".into(),
            },
            site: crate::results::SiteInfo {
                name: "site".into(),
                description: None,
                input_file: "site.yaml".into(),
                input_sha256: String::new(),
            },
            ground: crate::results::GroundResults {
                profile: Vec::new(),
                profile_method: "closed-form".into(),
                surface_daily_c: vec![0.0],
                surface_mean_c: 0.0,
                max_frost_depth_m: Some(0.0),
                permafrost: None,
                spin_up_years: 0,
                energy_balance_relative_error: None,
            },
            studies: Vec::new(),
            failed_studies: vec![StudyFailure {
                id: "field".into(),
                kind: "borefield".into(),
                reason: "no length in 20–400 m meets the lower limit".into(),
            }],
            warnings: Vec::new(),
        };
        let html = summary(&results).into_string();
        assert!(
            html.contains("<tr><td>field (borefield)</td><td colspan=\"2\"><span class=\"fails\">failed: </span>no length in 20–400 m meets the lower limit</td></tr>"),
            "{html}"
        );
    }

    #[test]
    fn assumptions_are_a_table_only_when_the_study_used_some() {
        assert_eq!(assumptions(&[]).into_string(), "");
        let html = assumptions(&[Assumption {
            name: "U-bend loss".into(),
            value: 1.5,
            unit: "velocity heads".into(),
            source: "common practice, no source".into(),
        }])
        .into_string();
        assert!(
            html.contains("<td>U-bend loss</td><td class=\"n\">1.5</td><td>velocity heads</td><td>common practice, no source</td>"),
            "{html}"
        );
    }
}
