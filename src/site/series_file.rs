//! Reading a CSV of daily or hourly air temperatures (the `series` climate).
//!
//! Format: a header row naming the columns; the first column a date (`2031-01-15`) or a date and
//! time (`2031-01-15T06:00` or `2031-01-15 06:00`); the temperatures in the named column (or the
//! second). Records must be evenly spaced (one day, or one hour) with no gaps. Fields are
//! separated by commas (or semicolons); surrounding blanks and double quotes are ignored.

use crate::calendar::days_from_civil;
use crate::numerics::time::{DAY_S, HOUR_S};
use std::path::Path;

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum TemperatureUnit {
    Celsius,
    Fahrenheit,
    Kelvin,
}

impl TemperatureUnit {
    pub fn parse(text: &str) -> Option<Self> {
        match text.trim() {
            "°C" | "C" | "degC" => Some(Self::Celsius),
            "°F" | "F" | "degF" => Some(Self::Fahrenheit),
            "K" => Some(Self::Kelvin),
            _ => None,
        }
    }

    /// The unit's symbol as the site file writes it.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::Celsius => "°C",
            Self::Fahrenheit => "°F",
            Self::Kelvin => "K",
        }
    }

    fn to_celsius(self, t: f64) -> f64 {
        match self {
            Self::Celsius => t,
            // NIST SP 811 (2008), §B.8: t/°C = (t/°F − 32)/1.8; T/K = t/°C + 273.15.
            Self::Fahrenheit => (t - 32.0) / 1.8,
            Self::Kelvin => t - 273.15,
        }
    }
}

#[derive(Clone, Debug, PartialEq)]
pub struct Series {
    pub start_year: i32,
    pub start_day_of_year: f64,
    pub step_s: f64,
    pub air_c: Vec<f64>,
}

/// Reads and checks a temperature file. The error is one sentence that names the file and line.
pub fn read(path: &Path, column: Option<&str>, unit: TemperatureUnit) -> Result<Series, String> {
    let name = path.display().to_string();
    let bytes = super::read_bounded(path, super::MAX_DATA_FILE_BYTES)
        .map_err(|e| format!("cannot read the temperature file `{name}`: {}", io_reason(&e)))?;
    let text =
        String::from_utf8(bytes).map_err(|_| format!("the temperature file `{name}` is not UTF-8 text"))?;
    parse(&text, &name, column, unit)
}

fn io_reason(e: &std::io::Error) -> String {
    match e.kind() {
        std::io::ErrorKind::NotFound => "no such file (the path is relative to the site file)".into(),
        _ => e.to_string(),
    }
}

pub fn parse(text: &str, name: &str, column: Option<&str>, unit: TemperatureUnit) -> Result<Series, String> {
    let mut lines = text
        .lines()
        .enumerate()
        .filter(|(_, l)| !l.trim().is_empty() && !l.trim_start().starts_with('#'));
    let (_, header) = lines.next().ok_or_else(|| {
        format!("the temperature file `{name}` is empty; it needs a header row and records")
    })?;
    let sep = if header.contains(';') && !header.contains(',') {
        ';'
    } else {
        ','
    };
    let headers: Vec<String> = split(header, sep);
    let col = match column {
        None if headers.len() >= 2 => 1,
        None => {
            return Err(format!(
                "the temperature file `{name}` has one column; it needs a date column and a temperature column"
            ));
        }
        Some(c) => headers.iter().position(|h| h == c).ok_or_else(|| {
            format!(
                "the temperature file `{name}` has no column `{c}`; its columns are: {}",
                headers.join(", ")
            )
        })?,
    };
    if let Some(named) = header_temperature_unit(&headers[col])
        && named != unit
    {
        return Err(format!(
            "the temperature file `{name}` heads its column `{}`, which names {}, but the temperatures are read as {}; give `unit: {}` in the climate",
            headers[col],
            named.symbol(),
            unit.symbol(),
            named.symbol()
        ));
    }
    let mut times: Vec<f64> = Vec::new();
    let mut temps = Vec::new();
    let mut first_date = None;
    for (i, line) in lines {
        let n = i + 1;
        let fields = split(line, sep);
        let stamp = fields.first().map(String::as_str).unwrap_or("");
        let (days, secs) = parse_stamp(stamp).ok_or_else(|| {
            format!("line {n} of `{name}`: `{stamp}` is not a date such as 2031-01-15 or 2031-01-15T06:00")
        })?;
        if first_date.is_none() {
            first_date = Some(stamp.get(..10).unwrap_or(stamp).to_string());
        }
        let value = fields.get(col).map(String::as_str).unwrap_or("");
        let t: f64 = value.parse().ok().filter(|t: &f64| t.is_finite()).ok_or_else(|| {
            format!("line {n} of `{name}`: `{value}` in column `{}` is not a temperature (a finite number is needed; fill gaps before use)", headers[col])
        })?;
        let time = days as f64 * DAY_S + secs;
        if let (Some(&prev), Some(&prev2)) = (
            times.last(),
            times.len().checked_sub(2).and_then(|k| times.get(k)),
        ) {
            let step = prev - prev2;
            if (time - prev - step).abs() > 1.0 {
                return Err(format!(
                    "line {n} of `{name}`: the records are not evenly spaced (a step of {} h after steps of {} h); fill the gap or remove the duplicate",
                    (time - prev) / HOUR_S,
                    step / HOUR_S
                ));
            }
        } else if let Some(&prev) = times.last()
            && time - prev != DAY_S
            && time - prev != 3_600.0
        {
            return Err(format!(
                "line {n} of `{name}`: records must be one day or one hour apart, but this one follows the previous by {} h",
                (time - prev) / HOUR_S
            ));
        }
        times.push(time);
        temps.push(unit.to_celsius(t));
    }
    if temps.len() < 2 {
        return Err(format!(
            "the temperature file `{name}` holds fewer than two records"
        ));
    }
    let step_s = times[1] - times[0];
    let per_year = (crate::numerics::time::YEAR_S / step_s).round() as usize;
    if temps.len() < per_year {
        return Err(format!(
            "the temperature file `{name}` covers less than one year ({} records at {} h); give at least a whole year",
            temps.len(),
            step_s / HOUR_S
        ));
    }
    let first = first_date.unwrap_or_default();
    let (y, m, d) = parse_date(&first).unwrap_or((1970, 1, 1));
    let start_day = (days_from_civil(y, m, d) - days_from_civil(y, 1, 1)) as f64
        + 1.0
        + (times[0].rem_euclid(DAY_S)) / DAY_S;
    Ok(Series {
        start_year: y,
        start_day_of_year: start_day,
        step_s,
        air_c: temps,
    })
}

fn split(line: &str, sep: char) -> Vec<String> {
    line.split(sep)
        .map(|f| f.trim().trim_matches('"').trim().to_string())
        .collect()
}

fn parse_date(s: &str) -> Option<(i32, u32, u32)> {
    let mut parts = s.get(..10)?.split('-');
    let y: i32 = parts.next()?.parse().ok()?;
    let m: u32 = parts.next()?.parse().ok()?;
    let d: u32 = parts.next()?.parse().ok()?;
    let leap = (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
    let month_days = [
        31,
        if leap { 29 } else { 28 },
        31,
        30,
        31,
        30,
        31,
        31,
        30,
        31,
        30,
        31,
    ];
    ((1..=12).contains(&m) && d >= 1 && d <= month_days[(m - 1) as usize]).then_some((y, m, d))
}

/// Days since 1970-01-01 and seconds into the day.
fn parse_stamp(s: &str) -> Option<(i64, f64)> {
    let (y, m, d) = parse_date(s)?;
    let rest = &s[10..];
    let secs = if rest.is_empty() {
        0.0
    } else {
        let time = rest.strip_prefix(['T', ' '])?;
        let mut hms = time.split(':');
        let h: f64 = hms.next()?.parse().ok()?;
        let min: f64 = hms.next().map(str::parse).transpose().ok()?.unwrap_or(0.0);
        let sec: f64 = hms.next().map(str::parse).transpose().ok()?.unwrap_or(0.0);
        if !(0.0..24.0).contains(&h) || !(0.0..60.0).contains(&min) || !(0.0..61.0).contains(&sec) {
            return None;
        }
        h * HOUR_S + min * 60.0 + sec
    };
    Some((days_from_civil(y, m, d), secs))
}

/// Hours in the load file of a borefield: one model year.
pub use crate::numerics::time::HOURS_PER_YEAR;

/// Reads a file of 8760 hourly ground loads in W (first column; an optional header row; `#`
/// comments and blank lines skipped). The error is one sentence that names the file and line.
pub fn read_hourly_loads(path: &Path) -> Result<Vec<f64>, String> {
    let name = path.display().to_string();
    let bytes = super::read_bounded(path, super::MAX_DATA_FILE_BYTES)
        .map_err(|e| format!("cannot read the load file `{name}`: {}", io_reason(&e)))?;
    let text = String::from_utf8(bytes).map_err(|_| format!("the load file `{name}` is not UTF-8 text"))?;
    parse_hourly_loads(&text, &name)
}

/// [`read_hourly_loads`] on text already read; `name` names the file in messages.
pub fn parse_hourly_loads(text: &str, name: &str) -> Result<Vec<f64>, String> {
    let mut values = Vec::with_capacity(HOURS_PER_YEAR);
    for (i, line) in text.lines().enumerate() {
        let trimmed = line.trim();
        if trimmed.is_empty() || trimmed.starts_with('#') {
            continue;
        }
        let first = trimmed.split([',', ';', '\t']).next().unwrap_or("").trim();
        match first.parse::<f64>() {
            Ok(v) if v.is_finite() => values.push(v),
            _ if values.is_empty() && first.parse::<f64>().is_err() && i == first_data_line(text) => {
                if let Some(u) = header_power_unit(first) {
                    return Err(format!(
                        "the load file `{name}` heads its column `{first}`, which names {u}, but hourly loads are read in W; convert the file to W"
                    ));
                }
            }
            _ => {
                return Err(format!(
                    "line {} of `{name}`: `{first}` is not a load in W (a finite number is needed in the first column; fill gaps before use)",
                    i + 1
                ));
            }
        }
    }
    if values.len() != HOURS_PER_YEAR {
        return Err(format!(
            "the load file `{name}` holds {} hourly values; it needs exactly {HOURS_PER_YEAR} (one model year of 365 days)",
            values.len()
        ));
    }
    Ok(values)
}

/// The temperature unit a column header names, if it names one as a word of its own
/// (`air_F`, `T (°F)`, `temp_degC`, `air K`): the unit a file's author wrote down.
fn header_temperature_unit(header: &str) -> Option<TemperatureUnit> {
    let words: Vec<String> = header
        .split(|c: char| !(c.is_alphanumeric() || c == '°'))
        .filter(|w| !w.is_empty())
        .map(str::to_lowercase)
        .collect();
    words.iter().rev().find_map(|w| match w.as_str() {
        "°c" | "degc" | "c" | "celsius" => Some(TemperatureUnit::Celsius),
        "°f" | "degf" | "f" | "fahrenheit" => Some(TemperatureUnit::Fahrenheit),
        "k" | "kelvin" => Some(TemperatureUnit::Kelvin),
        _ => None,
    })
}

/// The power unit a load file's header names, if it names one other than W (`load_kW`).
fn header_power_unit(header: &str) -> Option<&'static str> {
    header
        .split(|c: char| !c.is_alphanumeric())
        .filter(|w| !w.is_empty())
        .find_map(|w| match w {
            "kW" | "kw" => Some("kW"),
            "MW" => Some("MW"),
            "Btu" | "btuh" | "BTUh" => Some("Btu/h"),
            _ => None,
        })
}

/// Index of the first line that is neither blank nor a `#` comment (where a header may stand).
fn first_data_line(text: &str) -> usize {
    text.lines()
        .position(|l| !l.trim().is_empty() && !l.trim_start().starts_with('#'))
        .unwrap_or(0)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::calendar::civil_from_days;

    fn daily(n: usize) -> String {
        let mut s = String::from("date,air\n");
        for i in 0..n {
            let d = days_from_civil(2031, 1, 1) + i as i64;
            let (y, m, dd) = civil_from_days(d);
            s.push_str(&format!("{y:04}-{m:02}-{dd:02},{}\n", i as f64 * 0.01));
        }
        s
    }

    #[test]
    fn a_daily_year_is_read_with_its_step() {
        let s = parse(&daily(365), "w.csv", None, TemperatureUnit::Celsius).unwrap();
        assert_eq!(s.step_s, DAY_S);
        assert_eq!(s.air_c.len(), 365);
        assert_eq!(s.start_day_of_year, 1.0);
    }

    #[test]
    fn fahrenheit_files_convert_with_offset() {
        let text = daily(365).replace(",0\n", ",32\n");
        let s = parse(&text, "w.csv", Some("air"), TemperatureUnit::Fahrenheit).unwrap();
        assert!((s.air_c[0] - 0.0).abs() < 1e-12);
    }

    #[test]
    fn a_gap_is_refused_with_its_line() {
        let text: String = daily(400)
            .lines()
            .enumerate()
            .filter(|(i, _)| *i != 50)
            .map(|(_, l)| format!("{l}\n"))
            .collect();
        let e = parse(&text, "w.csv", None, TemperatureUnit::Celsius).unwrap_err();
        assert!(e.contains("line 51"), "{e}");
    }

    #[test]
    fn a_missing_value_is_refused() {
        let text = daily(365).replacen(",0.05\n", ",NA\n", 1);
        let e = parse(&text, "w.csv", None, TemperatureUnit::Celsius).unwrap_err();
        assert!(e.contains("`NA`"), "{e}");
    }

    #[test]
    fn less_than_a_year_is_refused() {
        let e = parse(&daily(100), "w.csv", None, TemperatureUnit::Celsius).unwrap_err();
        assert!(e.contains("less than one year"), "{e}");
    }
}
