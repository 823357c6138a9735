//! Monthly heat rates and annual energy.
//!
//! Each month is a steady state: the month's fluid temperatures against the month's undisturbed
//! ground temperature at the pipe's depth (the soil's heat capacity between months is neglected,
//! as in EN 13941-1's annual calculation). Months are of equal length, 365/12 days = 730 h.

use super::system::{Drive, PipeSection, PipeState, resistance_matrix, solve_with_matrix};
use super::twin::TwinResistances;
use super::{GroundForm, Soil, finite};
use crate::numerics::time::{HOUR_S, MONTH_S};

/// Hours in one month: 365/12 days × 24 h = 730 h ([`MONTH_S`] in hours).
pub const MONTH_HOURS: f64 = MONTH_S / HOUR_S;

/// Annual energy per metre, kWh/m: `Σ_months q_m·730 h / 1000` for twelve monthly mean heat
/// rates `monthly_w_per_m` (W/m).
pub fn annual_energy_kwh_per_m(monthly_w_per_m: &[f64; 12]) -> Result<f64, String> {
    for &q in monthly_w_per_m {
        finite("a monthly heat rate", q, "W/m")?;
    }
    Ok(monthly_w_per_m.iter().sum::<f64>() * MONTH_HOURS / 1000.0)
}

/// Monthly states of N pipes: `drives[i][month]` and `undisturbed_c[i][month]` (°C, the
/// undisturbed ground at pipe i's depth) per pipe; the resistance matrix is built once.
pub fn monthly_pipe_states(
    pipes: &[PipeSection],
    drives: &[[Drive; 12]],
    undisturbed_c: &[[f64; 12]],
    soil: &Soil,
    form: GroundForm,
) -> Result<Vec<[PipeState; 12]>, String> {
    if drives.len() != pipes.len() || undisturbed_c.len() != pipes.len() {
        return Err("give twelve monthly drives and ground temperatures for every pipe".into());
    }
    let r = resistance_matrix(pipes, soil, form)?;
    let blank = PipeState {
        heat_w_per_m: 0.0,
        fluid_c: 0.0,
    };
    let mut out = vec![[blank; 12]; pipes.len()];
    for month in 0..12 {
        let d: Vec<Drive> = drives.iter().map(|x| x[month]).collect();
        let g: Vec<f64> = undisturbed_c.iter().map(|x| x[month]).collect();
        for (i, s) in solve_with_matrix(&r, &d, &g)?.into_iter().enumerate() {
            out[i][month] = s;
        }
    }
    Ok(out)
}

/// Monthly `[q_supply, q_return]` (W/m) of a twin pipe ([`TwinResistances::heat_rates_w_per_m`]).
pub fn monthly_twin_heat_rates(
    twin: &TwinResistances,
    supply_c: &[f64; 12],
    return_c: &[f64; 12],
    ground_c: &[f64; 12],
) -> Result<[[f64; 2]; 12], String> {
    let mut out = [[0.0; 2]; 12];
    for (m, o) in out.iter_mut().enumerate() {
        *o = twin.heat_rates_w_per_m(supply_c[m], return_c[m], ground_c[m])?;
    }
    Ok(out)
}
