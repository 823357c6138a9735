//! Freezing and thawing indices from air (or surface) temperatures.
//!
//! TM 5-852-6 (1988), chapter 2 ("freezing and thawing indices"): the freezing index of one
//! season is the difference between the highest and the lowest points of the curve of
//! cumulative degree-days (daily mean temperature minus 0 °C, summed day after day) over that
//! freezing season. A mid-winter thaw raises the curve and so subtracts from the index. The
//! design freezing index is the mean of the three coldest seasons in the latest 30 years of
//! record. The thawing index is the same construction on the rise of the curve over a thawing
//! season.

use std::f64::consts::PI;

use super::{check_finite, check_non_negative, check_positive};
use crate::calendar::days_from_civil;

/// Days in each month of the model year (365 days, as everywhere in burrow).
const MONTH_DAYS: [u32; 12] = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/// A calendar day within the year (month 1–12, day of month), used as a season's first day.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct MonthDay {
    /// Month, 1 = January.
    pub month: u32,
    /// Day of the month, 1-based.
    pub day: u32,
}

/// 1 July: the usual first day of a northern-hemisphere freezing season (TM 5-852-6 counts a
/// freezing season from the summer high of the cumulative curve through the next winter).
pub const FREEZING_SEASON_START: MonthDay = MonthDay { month: 7, day: 1 };

/// 1 January: a first day that keeps a northern-hemisphere summer (the thawing season) whole.
pub const THAWING_SEASON_START: MonthDay = MonthDay { month: 1, day: 1 };

/// A record of daily mean temperatures (°C), one per day without gaps, starting on a date.
#[derive(Debug, Clone, Copy)]
pub struct DailyRecord<'a> {
    /// Year of the first value (proleptic Gregorian calendar; leap years are real here).
    pub first_year: i32,
    /// Month of the first value, 1–12.
    pub first_month: u32,
    /// Day of the month of the first value.
    pub first_day: u32,
    /// Daily mean temperatures, °C.
    pub daily_mean_c: &'a [f64],
}

/// The indices of one complete season of a [`DailyRecord`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SeasonIndices {
    /// Calendar year in which the season starts.
    pub start_year: i32,
    /// Number of days in the season (365 or 366).
    pub days: usize,
    /// Freezing index of the season, °C·days (largest fall of the cumulative curve).
    pub freezing_index_c_days: f64,
    /// Thawing index of the season, °C·days (largest rise of the cumulative curve).
    pub thawing_index_c_days: f64,
}

/// The cumulative degree-day curve `S_0 = 0, S_i = S_{i−1} + T_i·(1 day)` (°C·days) of daily
/// mean temperatures `daily_mean_c` (°C); `n + 1` points for `n` days (TM 5-852-6 ch. 2).
pub fn cumulative_degree_days(daily_mean_c: &[f64]) -> Result<Vec<f64>, String> {
    check_series(daily_mean_c)?;
    let mut curve = Vec::with_capacity(daily_mean_c.len() + 1);
    let mut sum = 0.0;
    curve.push(sum);
    for t in daily_mean_c {
        sum += t;
        curve.push(sum);
    }
    Ok(curve)
}

/// Freezing index (°C·days) of one season of daily mean temperatures (°C): the largest fall
/// `max_{i ≤ j} (S_i − S_j)` of the cumulative degree-day curve, i.e. the span from its highest
/// point to the lowest point after it (TM 5-852-6 ch. 2). Thaws inside that span subtract.
pub fn freezing_index_c_days(daily_mean_c: &[f64]) -> Result<f64, String> {
    let curve = cumulative_degree_days(daily_mean_c)?;
    Ok(largest_fall(&curve))
}

/// Thawing index (°C·days) of one season of daily mean temperatures (°C): the largest rise
/// `max_{i ≤ j} (S_j − S_i)` of the cumulative degree-day curve (TM 5-852-6 ch. 2).
pub fn thawing_index_c_days(daily_mean_c: &[f64]) -> Result<f64, String> {
    let curve = cumulative_degree_days(daily_mean_c)?;
    let negated: Vec<f64> = curve.iter().map(|s| -s).collect();
    Ok(largest_fall(&negated))
}

/// Largest `curve[i] − curve[j]` with `i ≤ j` (0 when the curve never falls).
fn largest_fall(curve: &[f64]) -> f64 {
    let mut highest = f64::NEG_INFINITY;
    let mut fall: f64 = 0.0;
    for &s in curve {
        highest = highest.max(s);
        fall = fall.max(highest - s);
    }
    fall
}

/// Splits a daily record into complete seasons starting each year on `start` (default
/// [`FREEZING_SEASON_START`], 1 July, for freezing; [`THAWING_SEASON_START`] for thawing) and
/// returns the freezing and thawing index of each (TM 5-852-6 ch. 2). Seasons the record does
/// not cover completely are left out.
pub fn seasonal_indices(record: &DailyRecord, start: MonthDay) -> Result<Vec<SeasonIndices>, String> {
    check_date(
        record.first_year,
        record.first_month,
        record.first_day,
        "the record's first date",
    )?;
    if start.month == 2 && start.day == 29 {
        return Err("a season cannot start on 29 February; choose a day that every year has".into());
    }
    check_date(2001, start.month, start.day, "the season's first day")?;
    check_series(record.daily_mean_c)?;
    let first = days_from_civil(record.first_year, record.first_month, record.first_day);
    let end = first + record.daily_mean_c.len() as i64;
    let mut seasons = Vec::new();
    let mut year = record.first_year - 1;
    loop {
        let season_start = days_from_civil(year, start.month, start.day);
        let season_end = days_from_civil(year + 1, start.month, start.day);
        if season_start >= end {
            break;
        }
        if season_start >= first && season_end <= end {
            let slice = &record.daily_mean_c[(season_start - first) as usize..(season_end - first) as usize];
            seasons.push(SeasonIndices {
                start_year: year,
                days: slice.len(),
                freezing_index_c_days: freezing_index_c_days(slice)?,
                thawing_index_c_days: thawing_index_c_days(slice)?,
            });
        }
        year += 1;
    }
    Ok(seasons)
}

/// Design freezing (or thawing) index, °C·days: the mean of the three coldest (largest) seasonal
/// indices in `seasonal_c_days` (TM 5-852-6 ch. 2: the three coldest winters in the latest
/// 30 years of record; pass those 30 seasons).
pub fn design_index_three_coldest(seasonal_c_days: &[f64]) -> Result<f64, String> {
    if seasonal_c_days.len() < 3 {
        return Err(format!(
            "the design index needs at least 3 seasonal indices and {} were given; TM 5-852-6 asks for 30 seasons",
            seasonal_c_days.len()
        ));
    }
    for &f in seasonal_c_days {
        check_non_negative("a seasonal index (°C·days)", f)?;
    }
    let mut sorted = seasonal_c_days.to_vec();
    sorted.sort_by(|a, b| b.total_cmp(a));
    Ok(sorted[..3].iter().sum::<f64>() / 3.0)
}

/// Daily means (°C, 365 values from 1 January) that reproduce twelve monthly means `monthly_c`
/// (°C) exactly: a periodic piecewise-linear curve through one node at the middle of each month,
/// with the node values solved so that every month's average of the curve equals its mean; each
/// day's value is the exact average of the curve over that day.
///
/// Interpolating through the monthly means themselves would flatten the winter low; this
/// mean-preserving form keeps the monthly heat sums. A daily series is still smoother than real
/// weather, so an index computed from monthly data understates the one from daily records.
pub fn daily_from_monthly_means(monthly_c: &[f64; 12]) -> Result<Vec<f64>, String> {
    for &t in monthly_c {
        check_finite("a monthly mean temperature (°C)", t)?;
    }
    let starts = month_starts_day();
    let mids: Vec<f64> = (0..12)
        .map(|i| starts[i] + f64::from(MONTH_DAYS[i]) / 2.0)
        .collect();
    let nodes = mean_preserving_nodes(monthly_c, &mids);
    let mut daily = Vec::with_capacity(365);
    for day in 0..365 {
        let d = f64::from(day);
        daily.push(periodic_linear_integral(&mids, &nodes, d, d + 1.0));
    }
    Ok(daily)
}

/// First day (0-based, fractional position) of each month of the 365-day year.
fn month_starts_day() -> [f64; 12] {
    let mut starts = [0.0; 12];
    for i in 1..12 {
        starts[i] = starts[i - 1] + f64::from(MONTH_DAYS[i - 1]);
    }
    starts
}

/// Node values `v_i` at the month middles such that the periodic piecewise-linear curve has the
/// given monthly means. Month i's mean is `a_i v_{i−1} + (1 − a_i − c_i) v_i + c_i v_{i+1}` with
/// `a_i = len_i / (8 h_{i−1,i})`, `c_i = len_i / (8 h_{i,i+1})` (h: node spacings); the system is
/// strictly diagonally dominant (a, c ≈ 1/8), so Gauss–Seidel converges geometrically.
fn mean_preserving_nodes(monthly_c: &[f64; 12], mids: &[f64]) -> Vec<f64> {
    let spacing = |i: usize, j: usize| (mids[j] - mids[i]).rem_euclid(365.0);
    let coef: Vec<(f64, f64)> = (0..12)
        .map(|i| {
            let len = f64::from(MONTH_DAYS[i]);
            (
                len / (8.0 * spacing((i + 11) % 12, i)),
                len / (8.0 * spacing(i, (i + 1) % 12)),
            )
        })
        .collect();
    let mut v = monthly_c.to_vec();
    for _ in 0..200 {
        let mut change: f64 = 0.0;
        for i in 0..12 {
            let (a, c) = coef[i];
            let new = (monthly_c[i] - a * v[(i + 11) % 12] - c * v[(i + 1) % 12]) / (1.0 - a - c);
            change = change.max((new - v[i]).abs());
            v[i] = new;
        }
        if change < 1e-14 * (1.0 + monthly_c.iter().fold(0.0_f64, |m, t| m.max(t.abs()))) {
            break;
        }
    }
    v
}

/// Average over `[from, to]` (days, within one year) of the 365-day-periodic piecewise-linear
/// curve through `(mids[i], nodes[i])`.
fn periodic_linear_integral(mids: &[f64], nodes: &[f64], from: f64, to: f64) -> f64 {
    let value = |x: f64| -> f64 {
        // Segment from node k (at or before x, periodically) to node k + 1.
        let x = x.rem_euclid(365.0);
        let k = mids.iter().rposition(|&m| m <= x).unwrap_or(11);
        let next = (k + 1) % 12;
        let x0 = mids[k];
        let h = (mids[next] - x0).rem_euclid(365.0);
        let s = (x - x0).rem_euclid(365.0) / h;
        nodes[k] + s * (nodes[next] - nodes[k])
    };
    // Split at the nodes inside the interval; on each piece the curve is linear, so the
    // trapezoid rule is exact.
    let mut cuts = vec![from];
    cuts.extend(mids.iter().copied().filter(|&m| m > from && m < to));
    cuts.push(to);
    let mut integral = 0.0;
    for w in cuts.windows(2) {
        integral += 0.5 * (value(w[0]) + value(w[1])) * (w[1] - w[0]);
    }
    integral / (to - from)
}

/// Start index (0-based day of the 365-day year) of `start`.
fn day_index(start: MonthDay) -> Result<usize, String> {
    if start.month == 2 && start.day == 29 {
        return Err("a season cannot start on 29 February; choose a day that every year has".into());
    }
    check_date(2001, start.month, start.day, "the season's first day")?;
    Ok((days_from_civil(2001, start.month, start.day) - days_from_civil(2001, 1, 1)) as usize)
}

/// Rotates a typical year of 365 daily means so that it starts on `start`.
fn rotated_year(daily_mean_c: &[f64], start: MonthDay) -> Result<Vec<f64>, String> {
    if daily_mean_c.len() != 365 {
        return Err(format!(
            "a typical year needs 365 daily values and {} were given",
            daily_mean_c.len()
        ));
    }
    let k = day_index(start)?;
    Ok(daily_mean_c[k..]
        .iter()
        .chain(&daily_mean_c[..k])
        .copied()
        .collect())
}

/// Freezing index (°C·days) of a typical (repeating) year of 365 daily means (°C) starting
/// 1 January, counted over the season that starts on `start` (normally 1 July), TM 5-852-6 ch. 2.
pub fn typical_year_freezing_index_c_days(daily_mean_c: &[f64], start: MonthDay) -> Result<f64, String> {
    freezing_index_c_days(&rotated_year(daily_mean_c, start)?)
}

/// Thawing index (°C·days) of a typical year of 365 daily means (°C) starting 1 January,
/// counted over the season that starts on `start` (normally 1 January), TM 5-852-6 ch. 2.
pub fn typical_year_thawing_index_c_days(daily_mean_c: &[f64], start: MonthDay) -> Result<f64, String> {
    thawing_index_c_days(&rotated_year(daily_mean_c, start)?)
}

/// Freezing index (°C·days) of a typical year given as twelve monthly means (°C): the
/// mean-preserving daily interpolation ([`daily_from_monthly_means`]) counted over the season
/// from 1 July ([`typical_year_freezing_index_c_days`], TM 5-852-6 ch. 2). Smoother than real
/// weather, so it understates the index of the daily records behind the means.
pub fn monthly_freezing_index_c_days(monthly_c: &[f64; 12]) -> Result<f64, String> {
    typical_year_freezing_index_c_days(&daily_from_monthly_means(monthly_c)?, FREEZING_SEASON_START)
}

/// The classic monthly estimate Σ over months with a negative mean of (−mean × days in month),
/// °C·days, from twelve monthly means (°C). When the freezing months are consecutive it is a
/// lower bound of the index of any daily series with these monthly means: monthly averaging
/// hides the cold days of the shoulder months, so monthly means understate the freezing index.
pub fn monthly_freezing_index_lower_bound_c_days(monthly_c: &[f64; 12]) -> Result<f64, String> {
    let mut sum = 0.0;
    for (i, &t) in monthly_c.iter().enumerate() {
        check_finite("a monthly mean temperature (°C)", t)?;
        if t < 0.0 {
            sum += -t * f64::from(MONTH_DAYS[i]);
        }
    }
    Ok(sum)
}

/// Freezing index (°C·days) of the sinusoid `T = m − A cos(2πt/P)` over one period:
/// `F = (P/π)(A sin θ − m θ)`, `θ = acos(m/A)` for `|m| < A`; 0 when `m ≥ A` (never below 0 °C);
/// `−m·P` when `m ≤ −A` (always frozen). Obtained by integrating `−T` over the part of the
/// period with `T < 0`, `|2πt/P| < θ`. Inputs: `mean_c` (°C), `amplitude_k` (K, ≥ 0),
/// `period_days` (days, > 0).
pub fn sinusoid_freezing_index_c_days(
    mean_c: f64,
    amplitude_k: f64,
    period_days: f64,
) -> Result<f64, String> {
    check_finite("the mean temperature (°C)", mean_c)?;
    check_non_negative("the amplitude (K)", amplitude_k)?;
    check_positive("the period (days)", period_days)?;
    if mean_c >= amplitude_k {
        return Ok(0.0);
    }
    if mean_c <= -amplitude_k {
        return Ok(-mean_c * period_days);
    }
    let theta = (mean_c / amplitude_k).acos();
    Ok(period_days / PI * (amplitude_k * theta.sin() - mean_c * theta))
}

/// Thawing index (°C·days) of the sinusoid `T = m − A cos(2πt/P)` over one period: the integral
/// of `T` where `T > 0`, which equals the freezing index plus `m·P` (the whole period's
/// integral is `m·P`). Same inputs as [`sinusoid_freezing_index_c_days`].
pub fn sinusoid_thawing_index_c_days(mean_c: f64, amplitude_k: f64, period_days: f64) -> Result<f64, String> {
    Ok(sinusoid_freezing_index_c_days(mean_c, amplitude_k, period_days)? + mean_c * period_days)
}

fn check_series(daily_mean_c: &[f64]) -> Result<(), String> {
    if daily_mean_c.is_empty() {
        return Err("the temperature series is empty; give at least one daily mean".into());
    }
    if let Some(i) = daily_mean_c.iter().position(|t| !t.is_finite()) {
        return Err(format!(
            "daily mean temperature number {} is {}; every value must be a finite number (fill gaps before)",
            i + 1,
            daily_mean_c[i]
        ));
    }
    Ok(())
}

fn check_date(year: i32, month: u32, day: u32, what: &str) -> Result<(), String> {
    let valid = (1..=12).contains(&month) && day >= 1 && {
        let z = days_from_civil(year, month, day);
        crate::calendar::civil_from_days(z) == (i64::from(year), month, day)
    };
    if valid {
        Ok(())
    } else {
        Err(format!(
            "{what} {year}-{month:02}-{day:02} is not a calendar date"
        ))
    }
}
