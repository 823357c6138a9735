//! Time constants of the model calendar. A model year is 365 days (leap days are ignored by
//! every study); a model month is a twelfth of it (730 h).

/// One hour, s.
pub const HOUR_S: f64 = 3_600.0;
/// One day, s.
pub const DAY_S: f64 = 24.0 * HOUR_S;
/// One model year (365 days), s.
pub const YEAR_S: f64 = 365.0 * DAY_S;
/// One model month (a twelfth of the model year, 730 h), s.
pub const MONTH_S: f64 = YEAR_S / 12.0;
/// Hours in a model year.
pub const HOURS_PER_YEAR: usize = 8760;
/// Hours in a model month.
pub const HOURS_PER_MONTH: usize = 730;
