//! Unit slips that once passed with at most a caution are errors that name the unit the user
//! probably meant: a value outside its key's plausible range that lands inside it after one of
//! the listed slips of the same dimension. Other values outside the range are cautions, and
//! values far outside it errors.

use burrow::site::{Severity, load_text};
use std::path::Path;

const SITE: &str = "site: {name: Harrow Cross}
climate:
  model: monthly-air
  air: [-6, -5, -1, 4, 9, 13, 15, 14, 11, 6, 1, -4]
ground:
  layers: [{name: silt, conductivity: 1.4 W/(m K), heat_capacity: 2.4 MJ/(m3 K), water_content: 0.25}]
studies:
  - id: main
    kind: frost
    pipe: {id: main, depth: 1.6 m, outer_diameter: 160 mm, fluid: {temperature: 4 °C}}
    stagnant: {duration: 48 h}
  - id: field
    kind: borefield
    layout: {rectangle: {rows: 2, columns: 2, spacing: 6 m}}
    borehole: {active_length: 120 m, diameter: 140 mm}
    heat_exchanger:
      type: single-u
      pipe: {outer_diameter: 40 mm, wall: 3.7 mm, conductivity: 0.42}
      shank_spacing: 80 mm
      grout_conductivity: 1.6
    fluid: {mixture: propylene-glycol, concentration: 25 %, flow_per_borehole: 0.5 l/s}
    loads:
      monthly:
        from_ground: [16 MWh, 14 MWh, 11 MWh, 7 MWh, 3 MWh, 1 MWh, 0.5 MWh, 0.5 MWh, 2 MWh, 6 MWh, 11 MWh, 15 MWh]
        to_ground: [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0]
        peak: {from_ground: [60 kW, 58 kW, 50 kW, 40 kW, 25 kW, 10 kW, 5 kW, 5 kW, 20 kW, 35 kW, 50 kW, 58 kW]}
    limits: {min_fluid: -3 °C, max_fluid: 30 °C}
    design_life: 20 years
";

/// (severity, path, message) of every problem found.
fn problems(text: &str) -> Vec<(Severity, String, String)> {
    let list = match load_text(text, "t.yaml", Path::new(".")) {
        Ok(l) => l.warnings,
        Err(d) => d,
    };
    list.into_iter()
        .map(|d| (d.severity, d.path.to_string(), d.message))
        .collect()
}

fn error_at(text: &str, path: &str, words: &str) {
    let p = problems(text);
    assert!(
        p.iter()
            .any(|(s, at, m)| *s == Severity::Error && at == path && m.contains(words)),
        "no error at {path} saying `{words}` in {p:?}"
    );
}

#[test]
fn the_site_as_written_has_no_problem() {
    assert!(problems(SITE).is_empty(), "{:?}", problems(SITE));
}

#[test]
fn a_plain_number_meant_in_another_unit_is_an_error_naming_that_unit() {
    error_at(
        &SITE.replace("heat_capacity: 2.4 MJ/(m3 K)", "heat_capacity: 2.4"),
        "ground.layers[0].heat_capacity",
        "did you mean 2.4 MJ/(m3 K)?",
    );
    error_at(
        &SITE.replace("duration: 48 h", "duration: 48"),
        "studies[0].stagnant.duration",
        "did you mean 48 h?",
    );
    error_at(
        &SITE.replace("flow_per_borehole: 0.5 l/s", "flow_per_borehole: 0.5"),
        "studies[1].fluid.flow_per_borehole",
        "did you mean 0.5 l/s?",
    );
    error_at(
        &SITE.replace("water_content: 0.25", "water_content: 25"),
        "ground.layers[0].water_content",
        "did you mean 25 %?",
    );
    // Air temperatures in kelvin (264.15 K = −9 °C) read as °C.
    let kelvin = SITE.replace(
        "[-6, -5, -1, 4, 9, 13, 15, 14, 11, 6, 1, -4]",
        "[264.15, 266.15, 272.15, 277.15, 282.15, 286.15, 288.15, 287.15, 284.15, 279.15, 274.15, 269.15]",
    );
    error_at(&kelvin, "climate.air[0]", "did you mean 264.15 K?");
}

#[test]
fn monthly_energies_meant_as_mwh_against_peaks_in_kw_are_an_error() {
    // 16 kWh in January against a 60 kW peak: the peak would be 2,700 times the month's mean.
    let kwh = SITE.replace(
        "[16 MWh, 14 MWh, 11 MWh, 7 MWh, 3 MWh, 1 MWh, 0.5 MWh, 0.5 MWh, 2 MWh, 6 MWh, 11 MWh, 15 MWh]",
        "[16, 14, 11, 7, 3, 1, 0.5, 0.5, 2, 6, 11, 15]",
    );
    error_at(
        &kwh,
        "studies[1].loads.monthly.from_ground[0]",
        "did you mean the energy in MWh",
    );
    // A peak below its month's mean power.
    let low = SITE.replace("from_ground: [60 kW, 58 kW", "from_ground: [6 kW, 58 kW");
    error_at(
        &low,
        "studies[1].loads.monthly.peak.from_ground[0]",
        "below the month's mean power",
    );
}

#[test]
fn other_values_outside_the_range_are_cautions_and_far_ones_errors() {
    let p = problems(&SITE.replace("conductivity: 1.4 W/(m K)", "conductivity: 7.5 W/(m K)"));
    assert!(
        p.iter().any(|(s, at, m)| *s == Severity::Warning
            && at == "ground.layers[0].conductivity"
            && m.contains("outside the usual range")),
        "{p:?}"
    );
    error_at(
        &SITE.replace("conductivity: 1.4 W/(m K)", "conductivity: 900 W/(m K)"),
        "ground.layers[0].conductivity",
        "far outside",
    );
}

/// A data file whose header names a unit other than the one its values are read in is refused:
/// a daily °F series read as °C once gave a freezing index of 3.5 °C·d, and an hourly file headed
/// `load_kW` was read as W.
#[test]
fn a_data_file_whose_header_names_another_unit_is_an_error() {
    use burrow::site::series_file::{TemperatureUnit, parse, parse_hourly_loads};
    let series = "date,air_F\n2031-01-01,23\n2031-01-02,25\n";
    let e = parse(series, "mast.csv", None, TemperatureUnit::Celsius).unwrap_err();
    assert!(e.contains("names °F") && e.contains("unit: °F"), "{e}");
    // Read as °F the header agrees (the two days are then refused only for being too short).
    let other = parse(series, "mast.csv", None, TemperatureUnit::Fahrenheit)
        .err()
        .unwrap_or_default();
    assert!(!other.contains("names"), "{other}");
    let loads = format!("load_kW\n{}", "1.5\n".repeat(8760));
    let e = parse_hourly_loads(&loads, "loads.csv").unwrap_err();
    assert!(e.contains("names kW") && e.contains("read in W"), "{e}");
    let watts = format!("load_w\n{}", "1500\n".repeat(8760));
    assert!(parse_hourly_loads(&watts, "loads.csv").is_ok());
}

/// A field's yearly heat per metre of borehole far below the usual tens to a couple of hundred
/// kWh (common practice, no source) that energies in MWh would explain is an error; 121 MWh over
/// 4 × 120 m is 252 kWh/m, inside; 121 kWh is 0.25 kWh/m.
#[test]
fn a_yearly_heat_per_metre_that_mwh_would_explain_is_an_error() {
    let no_peaks = SITE.replace(
        "        peak: {from_ground: [60 kW, 58 kW, 50 kW, 40 kW, 25 kW, 10 kW, 5 kW, 5 kW, 20 kW, 35 kW, 50 kW, 58 kW]}\n",
        "",
    );
    assert!(problems(&no_peaks).is_empty(), "{:?}", problems(&no_peaks));
    let kwh = no_peaks.replace(
        "[16 MWh, 14 MWh, 11 MWh, 7 MWh, 3 MWh, 1 MWh, 0.5 MWh, 0.5 MWh, 2 MWh, 6 MWh, 11 MWh, 15 MWh]",
        "[16, 14, 11, 7, 3, 1, 0.5, 0.5, 2, 6, 11, 15]",
    );
    error_at(
        &kwh,
        "studies[1].loads",
        "did you mean the monthly energies in MWh",
    );
}
