//! Quantities with units, as written in burrow's YAML site files.
//!
//! A field value is either a plain number, read in the field's plain unit
//! ([`Dimension::plain_unit`]), or a string holding a number and a unit:
//! `110 mm`, `110mm`, `1.4 W/(m K)`, `1.4 W/m/K`, `1.4 W m-1 K-1`, `-5 °C`,
//! `0.8 Btu/(h ft °F)`, `1450 °C·d`, `25 %`, `1.2e-3 m`. A string holding only
//! a number is read like a plain number.
//!
//! # Unit expressions
//! A unit is a product of atoms, each with an optional integer exponent:
//! `m2`, `m^2`, `m²`, `m-1`, `m^-1`, `m⁻¹`. Atoms multiply when written side by
//! side (space) or joined by `*`, `·`, `⋅` or `.`; `/` divides by the single atom
//! or parenthesised group that follows it, so `W/m/K` and `W/(m K)` mean the same,
//! while `W/m K` is rejected as ambiguous (NIST SP 811 (2008) §6.1.6, from memory,
//! asks for parentheses after a solidus). Only the atoms in the list below exist; there are
//! no generic SI prefixes, so `mK` is reported as unknown instead of being guessed.
//! Every atom carries its factor to SI and its exponents of length, mass, time and
//! temperature; the product must have the exponents of the expected [`Dimension`].
//!
//! Inside a compound unit, `K`, `°C`, `C`, `degC`, `℃` are temperature
//! differences of 1 K and `°F`, `F`, `degF`, `℉` of 5/9 K; `Δ°C`, `ΔK`, `Δ°F`,
//! `delta_degC`, `delta_degF` are difference-only spellings. An absolute
//! temperature ([`Dimension::Temperature`]) is a lone scale unit with its offset:
//! t/°C = (t/°F − 32)/1.8 and t/°C = T/K − 273.15 (NIST SP 811 (2008) B.8 and
//! §4.2.1.1; section numbers from memory).
//!
//! Atoms: length `m cm mm km in ft`; mass `g kg lb`; time `s min h d day days
//! week weeks year years yr a`; temperature difference as above; power `W kW MW`;
//! energy `J kJ MJ GJ Wh kWh MWh GWh Btu therm`; volume `l L gal`; volume flow
//! `gpm`; pressure `Pa kPa MPa bar psi`. A fraction also takes a lone `%`.
//! Imperial factors are those of NIST SP 811 (2008) Appendix B; `gal` is the US
//! gallon, `Btu` the International Table Btu, `therm` the US therm.
//!
//! Errors are single sentences without a trailing full stop or source location;
//! the caller adds file, line, column and key path.

// The hour, day and year of the model calendar: burrow's year is 365 days (31 536 000 s), not
// the Julian 365.25 d, so that a year of hourly loads is exactly 8760 hours.
use crate::numerics::time::{DAY_S, HOUR_S, YEAR_S};
use std::fmt;

/// Exponents of length, mass, time and temperature.
type DimVec = [i32; 4];

/// One kilowatt hour, J.
const KWH_J: f64 = 1e3 * HOUR_S;
/// NIST SP 811 (2008) B.8: 1 in = 0.0254 m exactly.
const INCH_M: f64 = 0.0254;
/// NIST SP 811 (2008) B.8: 1 ft = 0.3048 m exactly.
const FOOT_M: f64 = 0.3048;
/// NIST SP 811 (2008) B.8: 1 lb (avoirdupois) = 0.45359237 kg exactly.
const POUND_KG: f64 = 0.453_592_37;
/// US gallon = 231 in³ (NIST SP 811 (2008) B.8 footnote), 3.785411784e-3 m³.
const US_GALLON_M3: f64 = 231.0 * INCH_M * INCH_M * INCH_M;
/// International Table Btu, NIST SP 811 (2008) B.8: 1055.05585262 J.
const BTU_IT_J: f64 = 1_055.055_852_62;
/// US therm = 100 000 Btu₅₉ = 1.054804e8 J, NIST SP 811 (2008) B.8.
const THERM_US_J: f64 = 1.054_804e8;
/// Size of one degree Fahrenheit in kelvin, 1/1.8 (NIST SP 811 (2008) B.8).
const FAHRENHEIT_K: f64 = 5.0 / 9.0;
/// Standard acceleration of gravity, m/s² (NIST SP 811 (2008) B.8 footnote).
const STANDARD_GRAVITY: f64 = 9.806_65;
/// Pound-force per square inch in pascal: lb·g₀/in² ≈ 6894.757 Pa (NIST SP 811 B.8).
const PSI_PA: f64 = POUND_KG * STANDARD_GRAVITY / (INCH_M * INCH_M);
/// 0 °C in kelvin.
const ZERO_CELSIUS_K: f64 = 273.15;

const LEN: DimVec = [1, 0, 0, 0];
const MASS: DimVec = [0, 1, 0, 0];
const TIME: DimVec = [0, 0, 1, 0];
const TEMP: DimVec = [0, 0, 0, 1];
const POWER: DimVec = [2, 1, -3, 0];
const ENERGY: DimVec = [2, 1, -2, 0];
const VOLUME: DimVec = [3, 0, 0, 0];
const PRESSURE: DimVec = [-1, 1, -2, 0];

/// One unit symbol: its spellings, its size in SI base units and its dimension.
struct Atom {
    names: &'static [&'static str],
    factor: f64,
    dim: DimVec,
}

const fn atom(names: &'static [&'static str], factor: f64, dim: DimVec) -> Atom {
    Atom { names, factor, dim }
}

/// The complete list of unit symbols; nothing else is recognised.
#[rustfmt::skip]
const ATOMS: &[Atom] = &[
    atom(&["m"], 1.0, LEN), atom(&["cm"], 0.01, LEN), atom(&["mm"], 0.001, LEN),
    atom(&["km"], 1000.0, LEN), atom(&["in"], INCH_M, LEN), atom(&["ft"], FOOT_M, LEN),
    atom(&["g"], 0.001, MASS), atom(&["kg"], 1.0, MASS), atom(&["lb"], POUND_KG, MASS),
    atom(&["s"], 1.0, TIME), atom(&["min"], 60.0, TIME), atom(&["h"], HOUR_S, TIME),
    atom(&["d", "day", "days"], DAY_S, TIME),
    atom(&["week", "weeks"], 7.0 * DAY_S, TIME),
    atom(&["year", "years", "yr", "a"], YEAR_S, TIME),
    atom(&["K", "°C", "C", "degC", "℃", "ΔK", "Δ°C", "ΔC", "delta_degC"], 1.0, TEMP),
    atom(&["°F", "F", "degF", "℉", "Δ°F", "ΔF", "delta_degF"], FAHRENHEIT_K, TEMP),
    atom(&["W"], 1.0, POWER), atom(&["kW"], 1e3, POWER), atom(&["MW"], 1e6, POWER),
    atom(&["J"], 1.0, ENERGY), atom(&["kJ"], 1e3, ENERGY), atom(&["MJ"], 1e6, ENERGY),
    atom(&["GJ"], 1e9, ENERGY), atom(&["Wh"], HOUR_S, ENERGY), atom(&["kWh"], KWH_J, ENERGY),
    atom(&["MWh"], 1e3 * KWH_J, ENERGY), atom(&["GWh"], 1e6 * KWH_J, ENERGY),
    atom(&["Btu"], BTU_IT_J, ENERGY), atom(&["therm"], THERM_US_J, ENERGY),
    atom(&["l", "L"], 1e-3, VOLUME), atom(&["gal"], US_GALLON_M3, VOLUME),
    atom(&["gpm"], US_GALLON_M3 / 60.0, [3, 0, -1, 0]),
    atom(&["Pa"], 1.0, PRESSURE), atom(&["kPa"], 1e3, PRESSURE), atom(&["MPa"], 1e6, PRESSURE),
    atom(&["bar"], 1e5, PRESSURE), atom(&["psi"], PSI_PA, PRESSURE),
];

/// What kind of quantity a field holds; fixes the accepted units and the unit of
/// the value handed to the model.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum Dimension {
    Length,
    /// Absolute temperature on a scale (°C, °F, K).
    Temperature,
    TemperatureDifference,
    Time,
    Conductivity,
    VolumetricHeatCapacity,
    SpecificHeatCapacity,
    Density,
    Power,
    LinearHeatRate,
    HeatFlux,
    Energy,
    VolumeFlow,
    MassFlow,
    Velocity,
    Pressure,
    /// Thermal resistance of one metre of pipe or borehole, m K/W.
    LinearResistance,
    /// Thermal resistance of one square metre of surface, m² K/W.
    ArealResistance,
    DegreeDays,
    /// A share: plain numbers are fractions (0.25), strings may use `%`.
    Fraction,
    /// A pure number; only plain numbers are accepted.
    Dimensionless,
}

use Dimension as D;

/// Every dimension, in declaration order.
#[rustfmt::skip]
const ALL: [Dimension; 21] = [
    D::Length, D::Temperature, D::TemperatureDifference, D::Time, D::Conductivity,
    D::VolumetricHeatCapacity, D::SpecificHeatCapacity, D::Density, D::Power, D::LinearHeatRate,
    D::HeatFlux, D::Energy, D::VolumeFlow, D::MassFlow, D::Velocity, D::Pressure,
    D::LinearResistance, D::ArealResistance, D::DegreeDays, D::Fraction, D::Dimensionless,
];

impl Dimension {
    /// Unit of a plain number and of the value returned by [`parse_quantity`] and
    /// [`plain_number`], with one exception: for [`Dimension::Energy`] a plain number
    /// is in kWh ("kWh" is returned here) while returned values are in J.
    /// Fraction and Dimensionless return "" (a fraction of 1, a pure number).
    pub fn plain_unit(self) -> &'static str {
        self.table().0
    }

    /// Phrase naming the quantity, for messages: "a length".
    pub fn describe(self) -> &'static str {
        self.table().1
    }

    /// Short list of accepted unit spellings, for messages.
    pub fn examples(self) -> &'static str {
        self.table().2
    }

    /// Base-dimension exponents; `None` for the absolute temperature, which is
    /// never part of a product.
    fn vector(self) -> Option<DimVec> {
        self.table().3
    }

    /// Plain unit, description, example units and base-dimension exponents.
    #[rustfmt::skip]
    fn table(self) -> (&'static str, &'static str, &'static str, Option<DimVec>) {
        match self {
            D::Length => ("m", "a length", "m, cm, mm, km, in, ft", Some(LEN)),
            D::Temperature => ("°C", "a temperature", "°C, °F, K, C, degC, F, degF", None),
            D::TemperatureDifference =>
                ("K", "a temperature difference", "K, °C, °F, ΔK, Δ°C, Δ°F", Some(TEMP)),
            D::Time => ("s", "a time span", "s, min, h, d, week, year", Some(TIME)),
            D::Conductivity => ("W/(m K)", "a thermal conductivity",
                "W/(m K), W/m/K, W m-1 K-1, Btu/(h ft °F)", Some([1, 1, -3, -1])),
            D::VolumetricHeatCapacity => ("J/(m3 K)", "a volumetric heat capacity",
                "J/(m3 K), kJ/(m3 K), MJ/(m3 K)", Some([-1, 1, -2, -1])),
            D::SpecificHeatCapacity => ("J/(kg K)", "a specific heat capacity",
                "J/(kg K), kJ/(kg K), Btu/(lb °F)", Some([2, 0, -2, -1])),
            D::Density => ("kg/m3", "a density", "kg/m3, g/cm3, lb/ft3", Some([-3, 1, 0, 0])),
            D::Power => ("W", "a power", "W, kW, MW, Btu/h", Some(POWER)),
            D::LinearHeatRate =>
                ("W/m", "a heat rate per metre", "W/m, kW/m, W/ft", Some([1, 1, -3, 0])),
            D::HeatFlux => ("W/m2", "a heat flux", "W/m2, kW/m2", Some([0, 1, -3, 0])),
            D::Energy => ("kWh", "an energy",
                "kWh, J, kJ, MJ, GJ, Wh, MWh, GWh, Btu, therm", Some(ENERGY)),
            D::VolumeFlow => ("m3/s", "a volume flow rate",
                "m3/s, m3/h, l/s, l/min, gpm", Some([3, 0, -1, 0])),
            D::MassFlow => ("kg/s", "a mass flow rate", "kg/s, kg/h", Some([0, 1, -1, 0])),
            D::Velocity => ("m/s", "a velocity", "m/s, ft/s", Some([1, 0, -1, 0])),
            D::Pressure => ("Pa", "a pressure", "Pa, kPa, MPa, bar, psi", Some(PRESSURE)),
            D::LinearResistance => ("m K/W", "a thermal resistance per metre of pipe",
                "m K/W", Some([-1, -1, 3, 1])),
            D::ArealResistance => ("m2 K/W", "a thermal resistance per square metre",
                "m2 K/W", Some([0, -1, 3, 1])),
            D::DegreeDays =>
                ("K·d", "a degree-day total", "K·d, °C·d, °F·d", Some([0, 0, 1, 1])),
            D::Fraction => ("", "a fraction", "% or a plain fraction such as 0.25", Some([0; 4])),
            D::Dimensionless =>
                ("", "a plain number", "a plain number without a unit", Some([0; 4])),
        }
    }

    /// Size of the returned unit in SI base units (K·d for degree-days, else 1).
    fn returned_factor(self) -> f64 {
        match self {
            D::DegreeDays => DAY_S,
            _ => 1.0,
        }
    }

    /// Size of the plain-number unit in returned units (kWh in J for energy).
    fn plain_factor(self) -> f64 {
        match self {
            D::Energy => KWH_J,
            _ => 1.0,
        }
    }
}

/// A rejected value: one sentence saying what is wrong and what is allowed.
#[derive(Clone, Debug, PartialEq)]
pub struct UnitError(pub String);

impl fmt::Display for UnitError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.0)
    }
}

impl std::error::Error for UnitError {}

/// Reads a string "number unit" (or a bare number, meaning the plain unit) as a
/// quantity of `dim`, returned in the model's unit: SI, with °C for temperatures,
/// K·d for degree-days, J for energy and a fraction of 1 for fractions.
pub fn parse_quantity(text: &str, dim: Dimension) -> Result<f64, UnitError> {
    let t = text.trim();
    if t.chars().count() > MAX_QUANTITY_CHARS {
        return Err(UnitError(format!(
            "a value with its unit may be at most {MAX_QUANTITY_CHARS} characters long; for {} write a number and one of {}",
            dim.describe(),
            dim.examples()
        )));
    }
    if t.is_empty() {
        return Err(UnitError(format!(
            "the value is empty; give {} as a number, optionally followed by one of {}",
            dim.describe(),
            dim.examples()
        )));
    }
    let (number, unit) = split_number(t, dim)?;
    let unit = unit.trim();
    if unit.is_empty() {
        return plain_number(number, dim);
    }
    let value = match dim {
        D::Dimensionless => {
            return Err(UnitError(format!(
                "`{t}` has a unit, but a plain number is expected here; give the number alone"
            )));
        }
        D::Fraction if unit == "%" => number * 0.01,
        D::Temperature => match absolute_to_celsius(number, unit) {
            Some(t_c) => t_c,
            None => return Err(wrong_dimension(t, parse_unit(unit, t, dim)?.dim, dim)),
        },
        _ => {
            let term = parse_unit(unit, t, dim)?;
            if dim == D::Fraction || dim.vector() != Some(term.dim) {
                return Err(wrong_dimension(t, term.dim, dim));
            }
            number * term.factor / dim.returned_factor()
        }
    };
    checked(value, t, dim)
}

/// Converts a plain YAML number of `dim` (in [`Dimension::plain_unit`]) to the
/// returned unit; rejects NaN, infinities and results that overflow.
pub fn plain_number(value: f64, dim: Dimension) -> Result<f64, UnitError> {
    if !value.is_finite() {
        return Err(UnitError(format!(
            "`{value}` is not a finite number; give {} as an ordinary number",
            dim.describe()
        )));
    }
    checked(value * dim.plain_factor(), &format_number(value), dim)
}

/// Formats a value in the returned unit for echoing inputs, with up to 12
/// significant digits: "1.4 W/(m K)", "12 °C", "25 %", "3600 kWh". Energy is shown
/// in kWh and fractions in %; [`parse_quantity`] reads the result back.
pub fn format_quantity(value: f64, dim: Dimension) -> String {
    let (shown, unit) = match dim {
        D::Fraction => (value * 100.0, "%"),
        _ => (value / dim.plain_factor(), dim.plain_unit()),
    };
    let number = format_number(shown);
    if unit.is_empty() {
        number
    } else {
        format!("{number} {unit}")
    }
}

/// Rounds to 12 significant digits and prints the shortest form, switching to
/// exponent notation outside 1e-4 ≤ |x| < 1e9.
fn format_number(x: f64) -> String {
    if x == 0.0 || !x.is_finite() {
        return if x == 0.0 { "0".into() } else { x.to_string() };
    }
    let rounded: f64 = format!("{x:.11e}").parse().unwrap_or(x);
    if (1e-4..1e9).contains(&rounded.abs()) {
        format!("{rounded}")
    } else {
        format!("{rounded:e}")
    }
}

/// Final checks on a converted value: finite, and not below absolute zero.
fn checked(value: f64, t: &str, dim: Dimension) -> Result<f64, UnitError> {
    if !value.is_finite() {
        return Err(UnitError(format!(
            "`{t}` is too large to be {}; give a smaller number",
            dim.describe()
        )));
    }
    if dim == D::Temperature && value < -ZERO_CELSIUS_K - 1e-9 {
        return Err(UnitError(format!(
            "`{t}` is below absolute zero (-273.15 °C, -459.67 °F, 0 K); give a real temperature"
        )));
    }
    Ok(value)
}

/// Refuses a converted value past [`Dimension::physical_bound`]: `written` is the value as the
/// site file gives it, for the message.
pub fn within_physical_bound(value: f64, written: &str, dim: Dimension) -> Result<f64, UnitError> {
    match dim.physical_bound() {
        Some(bound) if value.abs() > bound => Err(UnitError(format!(
            "`{written}` is beyond any {} a site file can hold (at most {} in size); check the value and its unit",
            dim.describe().trim_start_matches("a ").trim_start_matches("an "),
            format_quantity(bound, dim)
        ))),
        _ => Ok(value),
    }
}

impl Dimension {
    /// The largest magnitude of this dimension any key of a site file can meaningfully take, in
    /// the returned unit: far beyond every physical value (a soil's conductivity is a few
    /// W/(m K), silver's 430), so that a value past it is a slip, and so that no later
    /// computation sizes an allocation from it. Each key's own plausible range is narrower and
    /// checked in validation.
    pub fn physical_bound(self) -> Option<f64> {
        Some(match self {
            D::Length => 1e6,
            D::Temperature | D::TemperatureDifference => 1e4,
            D::Time => 1e11,
            D::Conductivity => 1e4,
            D::VolumetricHeatCapacity => 1e9,
            D::SpecificHeatCapacity => 1e6,
            D::Density => 1e5,
            D::Power => 1e12,
            D::LinearHeatRate => 1e7,
            D::HeatFlux => 1e8,
            D::Energy => 1e18,
            D::VolumeFlow => 1e3,
            D::MassFlow => 1e6,
            D::Velocity => 1e3,
            D::Pressure => 1e10,
            D::LinearResistance | D::ArealResistance => 1e6,
            D::DegreeDays => 1e6,
            D::Fraction | D::Dimensionless => return None,
        })
    }
}

/// Converts an absolute temperature written with a lone scale unit to °C.
fn absolute_to_celsius(x: f64, unit: &str) -> Option<f64> {
    match unit {
        "°C" | "C" | "degC" | "℃" => Some(x),
        "°F" | "F" | "degF" | "℉" => Some((x - 32.0) * FAHRENHEIT_K),
        "K" => Some(x - ZERO_CELSIUS_K),
        _ => None,
    }
}

/// Message for a unit that parsed but has the wrong dimension, naming the
/// dimension that was given when one matches.
fn wrong_dimension(t: &str, got: DimVec, want: Dimension) -> UnitError {
    let given = ALL
        .iter()
        .find(|d| **d != D::Fraction && d.vector() == Some(got))
        .copied();
    UnitError(match given {
        Some(g) if g != want => format!(
            "`{t}` is {}, but {} is expected here; use {}",
            g.describe(),
            want.describe(),
            want.examples()
        ),
        _ => format!(
            "`{t}` has units of {}, which is not accepted for {}; use {}",
            base_units(got),
            want.describe(),
            want.examples()
        ),
    })
}

/// Writes a dimension vector in SI base units, e.g. "kg m s-3 K-1".
fn base_units(v: DimVec) -> String {
    let parts: Vec<String> = ["m", "kg", "s", "K"]
        .iter()
        .zip(v)
        .filter(|(_, e)| *e != 0)
        .map(|(s, e)| if e == 1 { s.to_string() } else { format!("{s}{e}") })
        .collect();
    if parts.is_empty() {
        "1 (a pure number)".into()
    } else {
        parts.join(" ")
    }
}

/// Splits "−1.2e-3 mm" into the number and the rest. Accepts a sign (`+`, `-`,
/// `−`), digits with an optional decimal point (`.5`, `5.`) and an exponent.
fn split_number(t: &str, dim: Dimension) -> Result<(f64, &str), UnitError> {
    let (negative, body) = match t.chars().next() {
        Some(c @ ('+' | '-' | '−')) => (c != '+', &t[c.len_utf8()..]),
        _ => (false, t),
    };
    let b = body.as_bytes();
    let digits_from = |mut i: usize| {
        while i < b.len() && b[i].is_ascii_digit() {
            i += 1;
        }
        i
    };
    let int_end = digits_from(0);
    let mut end = int_end;
    if end < b.len() && b[end] == b'.' {
        end = digits_from(end + 1);
    }
    if int_end == 0 && end <= 1 {
        let word = body.trim_start_matches('.').to_ascii_lowercase();
        let why = if ["nan", "inf", "infinity"].contains(&word.as_str()) {
            "not-a-number and infinite values are not allowed"
        } else {
            "it does not start with a number"
        };
        return Err(UnitError(format!(
            "cannot read `{t}` as {}: {why}; write a number such as 0.5, optionally followed by one of {}",
            dim.describe(),
            dim.examples()
        )));
    }
    if end < b.len() && (b[end] | 0x20) == b'e' {
        let mut i = end + 1;
        if i < b.len() && (b[i] == b'+' || b[i] == b'-') {
            i += 1;
        }
        let exp_end = digits_from(i);
        if exp_end > i {
            end = exp_end;
        }
    }
    if end < b.len() && matches!(b[end], b'0'..=b'9' | b'.' | b',') {
        return Err(UnitError(format!(
            "cannot read the number in `{t}`; write one number with a decimal point, such as 1.25"
        )));
    }
    let magnitude: f64 = body[..end].parse().map_err(|_| {
        UnitError(format!(
            "cannot read the number in `{t}`; write a number such as 1.25"
        ))
    })?;
    let number = if negative { -magnitude } else { magnitude };
    if !number.is_finite() {
        return Err(UnitError(format!(
            "`{t}` is too large to be {}; give a smaller number",
            dim.describe()
        )));
    }
    Ok((number, &body[end..]))
}

/// Longest value-with-unit string read (`-12.5 MJ/(m3 K)` has 15 characters).
pub const MAX_QUANTITY_CHARS: usize = 64;
/// Deepest nesting of parentheses in a unit expression.
const MAX_PARENTHESES: usize = 4;
/// Largest exponent of a base dimension a unit expression may reach (m⁴ is the most any
/// physical key needs).
const MAX_EXPONENT: i32 = 12;

/// A unit expression reduced to its SI factor and dimension vector.
#[derive(Clone, Copy)]
struct Term {
    factor: f64,
    dim: DimVec,
}

impl Term {
    fn times(self, other: Term, sign: i32) -> Result<Term, String> {
        let mut dim = self.dim;
        for (d, o) in dim.iter_mut().zip(other.dim) {
            *d += sign * o;
        }
        bounded(Term {
            factor: self.factor * other.factor.powi(sign),
            dim,
        })
    }

    fn pow(self, n: i32) -> Result<Term, String> {
        bounded(Term {
            factor: self.factor.powi(n),
            dim: self.dim.map(|d| d.saturating_mul(n)),
        })
    }
}

/// A term whose exponents stay within ±[`MAX_EXPONENT`] (no unit of a site file comes near).
fn bounded(t: Term) -> Result<Term, String> {
    if t.dim.iter().all(|d| d.abs() <= MAX_EXPONENT) && t.factor.is_finite() && t.factor > 0.0 {
        Ok(t)
    } else {
        Err(format!(
            "the exponents reach beyond ±{MAX_EXPONENT}, which no physical unit here needs"
        ))
    }
}

#[derive(Clone, Debug, PartialEq)]
enum Tok {
    Name(String),
    Exp(i32),
    Mul,
    Div,
    Open,
    Close,
}

/// Parses a unit expression (see the module documentation) into a [`Term`].
fn parse_unit(unit: &str, t: &str, dim: Dimension) -> Result<Term, UnitError> {
    let fail = |what: String| {
        UnitError(format!(
            "{what} in `{t}`; for {} use {}",
            dim.describe(),
            dim.examples()
        ))
    };
    let toks = tokenize(unit).map_err(fail)?;
    let mut p = Parser {
        toks: &toks,
        pos: 0,
        depth: 0,
    };
    let term = p.expr().map_err(fail)?;
    if p.pos < toks.len() {
        return Err(fail(format!("unexpected `{}`", show(&toks[p.pos]))));
    }
    Ok(term)
}

fn is_name_char(c: char) -> bool {
    c.is_alphabetic() || matches!(c, '°' | '%' | '_' | '℃' | '℉')
}

fn superscript_digit(c: char) -> Option<i32> {
    "⁰¹²³⁴⁵⁶⁷⁸⁹".chars().position(|s| s == c).map(|p| p as i32)
}

/// Splits a unit into tokens. An exponent is only read directly after a name or
/// `)` (`m2`, `m-1`, `m²`, `m⁻¹`, `m^-1`); a hyphen not followed by a digit there is
/// a multiplication (`m-K`).
fn tokenize(unit: &str) -> Result<Vec<Tok>, String> {
    let chars: Vec<char> = unit.chars().collect();
    let digit = |c: char| c.to_digit(10).map(|d| d as i32).or(superscript_digit(c));
    let mut toks = Vec::new();
    let mut i = 0;
    while i < chars.len() {
        let c = chars[i];
        let after_factor = i > 0 && (is_name_char(chars[i - 1]) || chars[i - 1] == ')');
        if is_name_char(c) {
            let start = i;
            while i < chars.len() && is_name_char(chars[i]) {
                i += 1;
            }
            toks.push(Tok::Name(chars[start..i].iter().collect()));
        } else if after_factor && (matches!(c, '^' | '-' | '⁻') || digit(c).is_some()) {
            let mut j = i + usize::from(c == '^');
            let negative = matches!(chars.get(j), Some('-' | '⁻'));
            j += usize::from(negative || chars.get(j) == Some(&'+'));
            let start = j;
            let mut n: i32 = 0;
            while let Some(d) = chars.get(j).and_then(|&c| digit(c)) {
                n = n.saturating_mul(10).saturating_add(d);
                j += 1;
            }
            if j == start && c == '-' {
                toks.push(Tok::Mul);
                i += 1;
                continue;
            }
            if j == start || j - start > 2 {
                return Err(format!("cannot read the exponent after `{}`", chars[i - 1]));
            }
            toks.push(Tok::Exp(if negative { -n } else { n }));
            i = j;
        } else {
            match c {
                '*' | '·' | '⋅' | '.' => toks.push(Tok::Mul),
                '/' => toks.push(Tok::Div),
                '(' => toks.push(Tok::Open),
                ')' => toks.push(Tok::Close),
                c if c.is_whitespace() => {}
                c => return Err(format!("unexpected `{c}`")),
            }
            i += 1;
        }
    }
    Ok(toks)
}

/// Recursive-descent parser: expr = product ('/' factor)*; product = factor
/// ([*·.]? factor)*; factor = (name | '(' expr ')') exponent?.
struct Parser<'a> {
    toks: &'a [Tok],
    pos: usize,
    /// Parentheses open at the current position.
    depth: usize,
}

impl Parser<'_> {
    fn peek(&self) -> Option<&Tok> {
        self.toks.get(self.pos)
    }

    fn expr(&mut self) -> Result<Term, String> {
        let mut acc = self.product()?;
        while self.peek() == Some(&Tok::Div) {
            self.pos += 1;
            acc = acc.times(self.factor()?, -1)?;
            if matches!(self.peek(), Some(Tok::Mul | Tok::Name(_) | Tok::Open)) {
                return Err("`/` is followed by a product without parentheses, which is ambiguous".into());
            }
        }
        Ok(acc)
    }

    fn product(&mut self) -> Result<Term, String> {
        let mut acc = self.factor()?;
        loop {
            match self.peek() {
                Some(Tok::Mul) => self.pos += 1,
                Some(Tok::Name(_) | Tok::Open) => {}
                _ => return Ok(acc),
            }
            acc = acc.times(self.factor()?, 1)?;
        }
    }

    fn factor(&mut self) -> Result<Term, String> {
        let base = match self.toks.get(self.pos) {
            Some(Tok::Name(name)) => {
                self.pos += 1;
                let a = ATOMS
                    .iter()
                    .find(|a| a.names.contains(&name.as_str()))
                    .ok_or_else(|| format!("unknown unit `{name}`"))?;
                Term {
                    factor: a.factor,
                    dim: a.dim,
                }
            }
            Some(Tok::Open) => {
                if self.depth >= MAX_PARENTHESES {
                    return Err(format!("parentheses are nested more than {MAX_PARENTHESES} deep"));
                }
                self.pos += 1;
                self.depth += 1;
                let inner = self.expr()?;
                self.depth -= 1;
                if self.peek() != Some(&Tok::Close) {
                    return Err("missing `)`".into());
                }
                self.pos += 1;
                inner
            }
            Some(tok) => return Err(format!("a unit name is missing before `{}`", show(tok))),
            None => return Err("a unit name is missing at the end".into()),
        };
        match self.peek() {
            Some(&Tok::Exp(n)) => {
                self.pos += 1;
                base.pow(n)
            }
            _ => Ok(base),
        }
    }
}

fn show(tok: &Tok) -> String {
    match tok {
        Tok::Name(n) => n.clone(),
        Tok::Exp(n) => n.to_string(),
        Tok::Mul => "·".into(),
        Tok::Div => "/".into(),
        Tok::Open => "(".into(),
        Tok::Close => ")".into(),
    }
}
