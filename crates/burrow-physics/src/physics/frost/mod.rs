//! Analytic frost physics for water mains: freezing indices, n-factors, frost depth (Stefan,
//! modified Berggren, Neumann), a stagnant water-filled pipe, bleed flow and the cover a main
//! needs.
//!
//! Units: temperatures in °C, temperature differences in K, times in s, lengths in m,
//! conductivities in W/(m K), volumetric heat capacities and latent heats in J/(m³ K) and J/m³,
//! line resistances in m K/W. Freezing and thawing indices are in °C·days where the name says
//! `c_days` and in °C·s (the SI form used by the frost-depth formulas) where it says `c_s`;
//! [`c_days_to_c_s`] converts.
//!
//! Main sources:
//! - US Army / Air Force TM 5-852-6 (AFR 88-19, Vol. 6), *Arctic and Subarctic Construction:
//!   Calculation Methods for Determination of Depths of Freeze and Thaw in Soils*, 1988
//!   (freezing index, design freezing index, n-factors, Stefan and modified Berggren formulas,
//!   multi-layer procedure).
//! - H. P. Aldrich & H. M. Paynter, *Analytical studies of freezing and thawing of soils*,
//!   Arctic Construction and Frost Effects Laboratory, Tech. Rep. 42, 1953 (the λ coefficient).
//! - V. J. Lunardini, *Theory of n-factors and correlation of data*, Proc. 3rd Int. Conf. on
//!   Permafrost, Edmonton, 1978 (n-factors).
//! - H. S. Carslaw & J. C. Jaeger, *Conduction of Heat in Solids*, 2nd ed., 1959, §11.2
//!   (Neumann's solution).
//!
//! Every function returns `Err(message)` with one sentence saying what is wrong and what is
//! allowed instead of panicking on bad input.

mod berggren;
mod gumbel;
mod index;
mod n_factors;
mod neumann;
mod pipe;
mod stefan;

pub use berggren::{BerggrenDepth, FreezingSeason, berggren_lambda, modified_berggren_depth};
pub use gumbel::{GumbelFit, GumbelMethod, fit_gumbel};
pub use index::{
    DailyRecord, FREEZING_SEASON_START, MonthDay, SeasonIndices, THAWING_SEASON_START,
    cumulative_degree_days, daily_from_monthly_means, design_index_three_coldest, freezing_index_c_days,
    monthly_freezing_index_c_days, monthly_freezing_index_lower_bound_c_days, seasonal_indices,
    sinusoid_freezing_index_c_days, sinusoid_thawing_index_c_days, thawing_index_c_days,
    typical_year_freezing_index_c_days, typical_year_thawing_index_c_days,
};
pub use n_factors::{NFactorPreset, n_factor_preset, n_factor_presets};
pub use neumann::{NeumannFreezing, neumann_xi};
pub use pipe::{
    DEFAULT_FROST_MARGIN_M, PipeCover, StagnantPipe, StagnantRun, bleed_flow_m3_per_s, outlet_temperature_c,
    required_cover,
};
pub use stefan::{FrostLayer, layered_stefan_depth_m, layered_stefan_index_c_s, stefan_depth_m};

use crate::numerics::checks::{
    finite as check_finite, non_negative as check_non_negative, positive as check_positive,
};
use crate::physics::annual_wave::DAY_S;

/// Converts a freezing or thawing index from °C·days to °C·s (× 86 400).
pub fn c_days_to_c_s(index_c_days: f64) -> f64 {
    index_c_days * DAY_S
}

/// Converts a freezing or thawing index from °C·s to °C·days (÷ 86 400).
pub fn c_s_to_c_days(index_c_s: f64) -> f64 {
    index_c_s / DAY_S
}
