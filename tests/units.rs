//! Checks of the unit parser against published conversion factors.
//!
//! "NIST B.8" below means NIST Special Publication 811 (2008 edition), "Guide for
//! the Use of the International System of Units", Appendix B.8 (factors listed
//! alphabetically). Factors marked "exact" there are checked to 1e-12 relative;
//! factors NIST prints with 7 significant digits are checked to 6e-7 relative,
//! the rounding of the printed value.

use Dimension as D;
use burrow::site::units::{Dimension, UnitError, format_quantity, parse_quantity, plain_number};
use proptest::prelude::*;

const EXACT: f64 = 1e-12;
/// Half a unit in the 7th significant digit of a NIST B.8 printed factor.
const NIST7: f64 = 6e-7;

const ALL: [Dimension; 21] = [
    D::Length,
    D::Temperature,
    D::TemperatureDifference,
    D::Time,
    D::Conductivity,
    D::VolumetricHeatCapacity,
    D::SpecificHeatCapacity,
    D::Density,
    D::Power,
    D::LinearHeatRate,
    D::HeatFlux,
    D::Energy,
    D::VolumeFlow,
    D::MassFlow,
    D::Velocity,
    D::Pressure,
    D::LinearResistance,
    D::ArealResistance,
    D::DegreeDays,
    D::Fraction,
    D::Dimensionless,
];

fn close(got: f64, want: f64, rel: f64) -> bool {
    (got - want).abs() <= rel * want.abs().max(1e-300)
}

#[track_caller]
fn check(text: &str, dim: Dimension, want: f64, rel: f64) {
    let got = parse_quantity(text, dim).unwrap_or_else(|e| panic!("`{text}` as {dim:?}: {e}"));
    assert!(
        close(got, want, rel),
        "`{text}` as {dim:?}: got {got}, want {want}"
    );
}

#[track_caller]
fn rejected(text: &str, dim: Dimension) -> String {
    match parse_quantity(text, dim) {
        Ok(v) => panic!("`{text}` as {dim:?} was accepted as {v}"),
        Err(UnitError(msg)) => {
            assert!(
                !msg.ends_with('.') && !msg.contains('\n') && !msg.contains(". "),
                "not one sentence: {msg}"
            );
            msg
        }
    }
}

#[test]
fn inch_and_foot_are_exact_si_lengths() {
    check("1 m", D::Length, 1.0, EXACT);
    check("110 mm", D::Length, 0.11, EXACT);
    check("110mm", D::Length, 0.11, EXACT);
    check("25 cm", D::Length, 0.25, EXACT);
    check("1.5 km", D::Length, 1500.0, EXACT);
    check("1.2e-3 m", D::Length, 1.2e-3, EXACT);
    check(".5 m", D::Length, 0.5, EXACT);
    check("+2. m", D::Length, 2.0, EXACT);
    check("−2 m", D::Length, -2.0, EXACT); // Unicode minus sign
    check("4.5 in", D::Length, 4.5 * 0.0254, EXACT); // NIST B.8: in = 2.54E-02 m, exact
    check("10 ft", D::Length, 3.048, EXACT); // NIST B.8: ft = 3.048E-01 m, exact
}

#[test]
fn absolute_temperature_scales_follow_celsius_and_fahrenheit_definitions() {
    check("-5 °C", D::Temperature, -5.0, EXACT);
    check("-5 C", D::Temperature, -5.0, EXACT);
    check("12 degC", D::Temperature, 12.0, EXACT);
    check("12 ℃", D::Temperature, 12.0, EXACT);
    // NIST B.8: t/°C = (t/°F − 32)/1.8.
    check("23 °F", D::Temperature, -5.0, EXACT);
    check("32 F", D::Temperature, 0.0, EXACT);
    check("212 degF", D::Temperature, 100.0, EXACT);
    check("-40 °F", D::Temperature, -40.0, EXACT); // the two scales cross at -40
    // SP 811 §4.2.1.1: t/°C = T/K − 273.15.
    check("273.15 K", D::Temperature, 0.0, EXACT);
    check("300 K", D::Temperature, 26.85, EXACT);
    // NIST B.8: t/°F = T/°R − 459.67, so −459.67 °F is absolute zero.
    check("-459.67 °F", D::Temperature, -273.15, EXACT);
    check("0 K", D::Temperature, -273.15, EXACT);
    assert_eq!(plain_number(8.5, D::Temperature), Ok(8.5));
}

#[test]
fn fahrenheit_difference_scales_by_five_ninths_without_offset() {
    // A difference of 9 °F is 5 K (NIST B.8: °F as interval = 5/9 K) ...
    check("9 °F", D::TemperatureDifference, 5.0, EXACT);
    check("9 Δ°F", D::TemperatureDifference, 5.0, EXACT);
    check("9 delta_degF", D::TemperatureDifference, 5.0, EXACT);
    // ... while the temperature 9 °F is (9 − 32)/1.8 °C.
    check("9 °F", D::Temperature, -23.0 / 1.8, EXACT);
    check("10 °C", D::TemperatureDifference, 10.0, EXACT);
    check("10 K", D::TemperatureDifference, 10.0, EXACT);
    check("10 ΔK", D::TemperatureDifference, 10.0, EXACT);
}

#[test]
fn time_units_use_a_365_day_year() {
    check("30 s", D::Time, 30.0, EXACT);
    check("30 min", D::Time, 1800.0, EXACT);
    check("6 h", D::Time, 21_600.0, EXACT);
    check("2 d", D::Time, 172_800.0, EXACT);
    check("2 days", D::Time, 172_800.0, EXACT);
    check("1 week", D::Time, 604_800.0, EXACT);
    // burrow's convention: 1 year = 365 d = 8760 h (stated in the module docs).
    check("25 years", D::Time, 25.0 * 8760.0 * 3600.0, EXACT);
    check("1 yr", D::Time, 31_536_000.0, EXACT);
    check("1 a", D::Time, 31_536_000.0, EXACT);
}

#[test]
fn conductivity_spellings_agree_and_btu_form_matches_nist() {
    for text in [
        "1.4 W/(m K)",
        "1.4 W/m/K",
        "1.4 W/(m·K)",
        "1.4 W/(m*K)",
        "1.4 W/(m.K)",
        "1.4 W m-1 K-1",
        "1.4 W·m⁻¹·K⁻¹",
        "1.4 W m^-1 K^-1",
        "1.4 W/(m °C)",
        "1.4 W/(m-K)",
        "1.4W/(m K)",
    ] {
        check(text, D::Conductivity, 1.4, EXACT);
    }
    // NIST B.8: Btu_IT·ft/(h·ft²·°F) = 1.730735 W/(m·K).
    check("0.8 Btu/(h ft °F)", D::Conductivity, 0.8 * 1.730_735, NIST7);
    check("1 Btu/h/ft/°F", D::Conductivity, 1.730_735, NIST7);
}

#[test]
fn btu_it_equals_the_it_calorie_per_gram_kelvin_times_pound_times_fahrenheit_degree() {
    // Btu_IT = 1 cal_IT/(g·°C) × 1 lb × 1 °F = 4.1868 J/(g K) × 453.59237 g × 5/9 K
    // (cal_IT = 4.1868 J and lb = 0.45359237 kg exactly, NIST B.8).
    let btu = 4.1868 * 453.592_37 * 5.0 / 9.0;
    check("1 Btu", D::Energy, btu, EXACT);
    check("1 Btu", D::Energy, 1.055_056e3, NIST7); // NIST B.8 printed value
    // NIST B.8: Btu_IT/(lb·°F) = 4.1868E+03 J/(kg·K), exact.
    check("1 Btu/(lb °F)", D::SpecificHeatCapacity, 4186.8, EXACT);
    // NIST B.8: Btu_IT/h = 2.930711E-01 W.
    check("1 Btu/h", D::Power, 0.293_071_1, NIST7);
}

#[test]
fn heat_capacities_and_density() {
    check("2.1 MJ/(m3 K)", D::VolumetricHeatCapacity, 2.1e6, EXACT);
    check("2100 kJ/(m³·K)", D::VolumetricHeatCapacity, 2.1e6, EXACT);
    check("2.1e6 J m-3 K-1", D::VolumetricHeatCapacity, 2.1e6, EXACT);
    check("4.19 kJ/(kg K)", D::SpecificHeatCapacity, 4190.0, EXACT);
    check("840 J/kg/K", D::SpecificHeatCapacity, 840.0, EXACT);
    check("1000 kg/m3", D::Density, 1000.0, EXACT);
    check("1 g/cm3", D::Density, 1000.0, EXACT);
    check("1 lb/ft3", D::Density, 16.018_46, NIST7); // NIST B.8: lb/ft³ = 1.601846E+01 kg/m³
}

#[test]
fn power_heat_rate_and_flux() {
    check("5 W", D::Power, 5.0, EXACT);
    check("3 kW", D::Power, 3000.0, EXACT);
    check("2 MW", D::Power, 2e6, EXACT);
    check("30 W/m", D::LinearHeatRate, 30.0, EXACT);
    check("0.03 kW/m", D::LinearHeatRate, 30.0, EXACT);
    check("10 W/ft", D::LinearHeatRate, 10.0 / 0.3048, EXACT);
    check("50 W/m2", D::HeatFlux, 50.0, EXACT);
    check("50 W/m²", D::HeatFlux, 50.0, EXACT);
    check("0.05 kW/m^2", D::HeatFlux, 50.0, EXACT);
}

#[test]
fn energy_plain_numbers_are_kwh_and_strings_convert_to_joules() {
    assert_eq!(plain_number(1.0, D::Energy), Ok(3.6e6)); // 1 kWh = 3.6 MJ exactly
    check("12", D::Energy, 12.0 * 3.6e6, EXACT);
    check("12 MWh", D::Energy, 4.32e10, EXACT);
    check("1 GWh", D::Energy, 3.6e12, EXACT);
    check("1 Wh", D::Energy, 3600.0, EXACT);
    check("1 kWh", D::Energy, 3.6e6, EXACT);
    check("5 J", D::Energy, 5.0, EXACT);
    check("5 kJ", D::Energy, 5e3, EXACT);
    check("5 MJ", D::Energy, 5e6, EXACT);
    check("5 GJ", D::Energy, 5e9, EXACT);
    check("1 kW h", D::Energy, 3.6e6, EXACT);
    check("1 therm", D::Energy, 1.054_804e8, EXACT); // NIST B.8: therm (U.S.) = 1.054804E+08 J
}

#[test]
fn volume_and_mass_flow_and_velocity() {
    check("0.3 l/s", D::VolumeFlow, 3e-4, EXACT);
    check("0.3 L/s", D::VolumeFlow, 3e-4, EXACT);
    check("18 l/min", D::VolumeFlow, 3e-4, EXACT);
    check("3.6 m3/h", D::VolumeFlow, 1e-3, EXACT);
    check("0.001 m3/s", D::VolumeFlow, 1e-3, EXACT);
    // NIST B.8 footnote: US gallon = 231 in³ = 3.785411784E-03 m³, exact.
    check("3 gpm", D::VolumeFlow, 3.0 * 3.785_411_784e-3 / 60.0, EXACT);
    check("3 gal/min", D::VolumeFlow, 3.0 * 3.785_411_784e-3 / 60.0, EXACT);
    check("1 gpm", D::VolumeFlow, 6.309_020e-5, NIST7); // NIST B.8: gal/min = 6.309020E-05 m³/s
    check("2 kg/s", D::MassFlow, 2.0, EXACT);
    check("3600 kg/h", D::MassFlow, 1.0, EXACT);
    check("1.5 m/s", D::Velocity, 1.5, EXACT);
    check("1 ft/s", D::Velocity, 0.3048, EXACT);
}

#[test]
fn pressure_units_match_nist() {
    check("10 Pa", D::Pressure, 10.0, EXACT);
    check("101.325 kPa", D::Pressure, 101_325.0, EXACT);
    check("1 MPa", D::Pressure, 1e6, EXACT);
    check("1 bar", D::Pressure, 1e5, EXACT); // NIST B.8: bar = 1E+05 Pa, exact
    check("1 psi", D::Pressure, 6.894_757e3, NIST7); // NIST B.8: psi = 6.894757E+03 Pa
    check("5 kg m-1 s-2", D::Pressure, 5.0, EXACT); // Pa in base units
}

#[test]
fn pipe_and_surface_resistances_are_different_dimensions() {
    check("0.11 m K/W", D::LinearResistance, 0.11, EXACT);
    check("0.11 m·K/W", D::LinearResistance, 0.11, EXACT);
    check("0.0685 m2 K/W", D::ArealResistance, 0.0685, EXACT);
    check("0.0685 m²·K/W", D::ArealResistance, 0.0685, EXACT);
    // NIST B.8: °F·h·ft²/Btu_IT = 1.761102E-01 K·m²/W.
    check("1 ft2 h °F/Btu", D::ArealResistance, 0.176_110_2, NIST7);
    let msg = rejected("0.1 m2 K/W", D::LinearResistance);
    assert!(
        msg.contains("per square metre") && msg.contains("per metre of pipe"),
        "{msg}"
    );
    assert!(msg.contains("m K/W"), "{msg}");
    let msg = rejected("0.1 m K/W", D::ArealResistance);
    assert!(
        msg.contains("per square metre") && msg.contains("per metre of pipe"),
        "{msg}"
    );
}

#[test]
fn fahrenheit_degree_days_scale_by_five_ninths() {
    check("1450 °C·d", D::DegreeDays, 1450.0, EXACT);
    check("1450 °C d", D::DegreeDays, 1450.0, EXACT);
    check("1450 °C·day", D::DegreeDays, 1450.0, EXACT);
    check("1450 K·d", D::DegreeDays, 1450.0, EXACT);
    check("1450 K d", D::DegreeDays, 1450.0, EXACT);
    check("1800 °F·d", D::DegreeDays, 1000.0, EXACT);
    check("24 K h", D::DegreeDays, 1.0, EXACT);
}

#[test]
fn fractions_take_percent_and_dimensionless_takes_no_unit() {
    check("25 %", D::Fraction, 0.25, EXACT);
    check("25%", D::Fraction, 0.25, EXACT);
    check("0.25", D::Fraction, 0.25, EXACT);
    assert_eq!(plain_number(0.25, D::Fraction), Ok(0.25));
    check("3", D::Dimensionless, 3.0, EXACT);
    assert_eq!(plain_number(3.0, D::Dimensionless), Ok(3.0));
    rejected("3 m", D::Dimensionless);
    rejected("3 %", D::Dimensionless);
    rejected("3 m/m", D::Fraction);
    rejected("3 %/K", D::Fraction);
}

#[test]
fn a_string_without_unit_means_the_plain_unit() {
    for dim in ALL {
        assert_eq!(parse_quantity(" 2.5 ", dim), plain_number(2.5, dim), "{dim:?}");
    }
}

#[test]
fn the_plain_unit_spelling_parses_to_the_plain_number() {
    for dim in ALL {
        let unit = dim.plain_unit();
        if !unit.is_empty() {
            let got = parse_quantity(&format!("2.5 {unit}"), dim).unwrap();
            assert!(
                close(got, plain_number(2.5, dim).unwrap(), EXACT),
                "{dim:?} {unit}"
            );
        }
    }
}

#[test]
fn every_listed_example_unit_is_accepted() {
    for dim in ALL {
        if matches!(dim, D::Fraction | D::Dimensionless) {
            continue;
        }
        for unit in dim.examples().split(", ") {
            let text = format!("2 {unit}");
            let v = parse_quantity(&text, dim).unwrap_or_else(|e| panic!("{text}: {e}"));
            assert!(v.is_finite() && v != 0.0, "{text}");
        }
    }
}

#[test]
fn empty_and_non_numeric_values_are_rejected() {
    rejected("", D::Length);
    rejected("   ", D::Length);
    let msg = rejected("mm", D::Length);
    assert!(msg.contains("does not start with a number"), "{msg}");
    for text in [".nan", "nan", "NaN", "inf", "-inf", ".inf", "-.inf", "Infinity"] {
        let msg = rejected(text, D::Length);
        assert!(msg.contains("not-a-number and infinite"), "{text}: {msg}");
    }
    for text in ["1,4 m", "1.2.3 m", "1e5.5 m", "- 5 m", "."] {
        rejected(text, D::Length);
    }
}

#[test]
fn unknown_units_are_named_with_the_accepted_list() {
    let msg = rejected("110 mK", D::Length);
    assert!(
        msg.contains("unknown unit `mK`") && msg.contains("m, cm, mm, km, in, ft"),
        "{msg}"
    );
    let msg = rejected("5 kPa/furlong", D::Pressure);
    assert!(msg.contains("`furlong`"), "{msg}");
    let msg = rejected("25 %", D::Length);
    assert!(msg.contains("`%`"), "{msg}");
}

#[test]
fn wrong_dimensions_name_what_was_given_and_what_is_expected() {
    let msg = rejected("2 m", D::Conductivity);
    assert_eq!(
        msg,
        "`2 m` is a length, but a thermal conductivity is expected here; \
         use W/(m K), W/m/K, W m-1 K-1, Btu/(h ft °F)"
    );
    let msg = rejected("5 s", D::Length);
    assert!(msg.contains("is a time span, but a length"), "{msg}");
    let msg = rejected("3 m/K", D::Length);
    assert!(msg.contains("has units of m K-1"), "{msg}");
    let msg = rejected("5 Δ°C", D::Temperature);
    assert!(msg.contains("temperature difference, but a temperature"), "{msg}");
    rejected("5 K/m", D::Temperature);
    rejected("5 °C·d", D::Temperature);
    rejected("5 J/(kg K)", D::VolumetricHeatCapacity);
    rejected("5 W", D::Energy);
}

#[test]
fn malformed_unit_expressions_are_rejected() {
    let msg = rejected("1.4 W/m K", D::Conductivity);
    assert!(msg.contains("ambiguous"), "{msg}");
    rejected("1.4 W/m·K", D::Conductivity);
    rejected("1.4 W/(m/K K)", D::Conductivity);
    rejected("1.4 W/(m K", D::Conductivity);
    rejected("1.4 W/(m K))", D::Conductivity);
    rejected("1.4 W/", D::Conductivity);
    rejected("1.4 /m", D::Conductivity);
    rejected("1 m^", D::Length);
    rejected("1 m2^3", D::ArealResistance);
    rejected("1 m 2", D::Length);
    rejected("1 m!", D::Length);
}

#[test]
fn below_absolute_zero_and_overflow_are_rejected() {
    let msg = rejected("-300 °C", D::Temperature);
    assert!(msg.contains("absolute zero"), "{msg}");
    rejected("-1 K", D::Temperature);
    rejected("-460 °F", D::Temperature);
    assert!(plain_number(-274.0, D::Temperature).is_err());
    let msg = rejected("1e400 m", D::Length);
    assert!(msg.contains("too large"), "{msg}");
    let msg = rejected("1e308 km", D::Length);
    assert!(msg.contains("too large"), "{msg}");
    assert!(plain_number(f64::NAN, D::Length).is_err());
    assert!(plain_number(f64::INFINITY, D::Power).is_err());
    assert!(plain_number(f64::NEG_INFINITY, D::Power).is_err());
    assert!(plain_number(1e305, D::Energy).is_err()); // 1e305 kWh overflows in J
    assert!(plain_number(1e305, D::Length).is_ok());
}

#[test]
fn formatting_echoes_inputs_in_the_plain_unit() {
    let cases = [
        ("110 mm", D::Length, "0.11 m"),
        ("1.4 W/m/K", D::Conductivity, "1.4 W/(m K)"),
        ("23 °F", D::Temperature, "-5 °C"),
        ("9 °F", D::TemperatureDifference, "5 K"),
        ("12 MWh", D::Energy, "12000 kWh"),
        ("25 %", D::Fraction, "25 %"),
        ("1450 °C·d", D::DegreeDays, "1450 K·d"),
        ("0.0685 m2 K/W", D::ArealResistance, "0.0685 m2 K/W"),
        ("2.1 MJ/(m3 K)", D::VolumetricHeatCapacity, "2100000 J/(m3 K)"),
    ];
    for (text, dim, want) in cases {
        let v = parse_quantity(text, dim).unwrap();
        assert_eq!(format_quantity(v, dim), want, "{text}");
    }
    assert_eq!(format_quantity(3.0, D::Dimensionless), "3");
    assert_eq!(format_quantity(1.2e-5, D::Length), "1.2e-5 m");
    assert_eq!(format_quantity(4.32e10, D::Power), "4.32e10 W");
    assert_eq!(format_quantity(-0.0, D::Length), "0 m");
}

/// Values spread over 20 decades with either sign (temperatures above absolute zero).
fn value_for(dim: Dimension) -> impl Strategy<Value = f64> {
    (1.0f64..10.0, -8i32..12, any::<bool>()).prop_map(move |(m, e, neg)| {
        let v = m * 10f64.powi(e);
        match dim {
            D::Temperature => v.min(1e9) - 273.15,
            _ if neg => -v,
            _ => v,
        }
    })
}

proptest! {
    #[test]
    fn format_then_parse_returns_the_value(
        (dim, v) in proptest::sample::select(ALL.to_vec()).prop_flat_map(|d| (Just(d), value_for(d)))
    ) {
        let text = format_quantity(v, dim);
        let back = parse_quantity(&text, dim).map_err(|e| TestCaseError::fail(e.0))?;
        prop_assert!(close(back, v, 1e-9) || (v.abs() < 1e-9 && back.abs() < 1e-9),
            "{dim:?}: {v} -> {text} -> {back}");
    }

    #[test]
    fn millimetres_and_feet_scale_linearly(x in -1e6f64..1e6) {
        let mm = parse_quantity(&format!("{x:e} mm"), D::Length).unwrap();
        let ft = parse_quantity(&format!("{x:e}ft"), D::Length).unwrap();
        prop_assert!(close(mm, x / 1000.0, EXACT) || x == 0.0);
        prop_assert!(close(ft, x * 0.3048, EXACT) || x == 0.0);
    }
}
