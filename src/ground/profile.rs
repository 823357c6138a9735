//! The undisturbed ground: temperature against depth and time of year, before any pipe or
//! borehole disturbs it. Closed form where it holds (homogeneous dry soil under a sinusoidal or
//! constant surface), else the 1-D periodic finite-volume column with latent heat.

use super::climate::SurfaceYear;
use crate::engine::column::{self, ColumnLayer, ColumnOptions, PeriodicProfile};
use crate::model::{DAY_S, Ground, Site, YEAR_S};
use crate::physics::annual_wave::AnnualWave;
use crate::results::ProfileRow;

/// Depth to which the envelope is reported unless a study reaches deeper.
pub const DEFAULT_PROFILE_DEPTH_M: f64 = 15.0;
/// Spacing of the reported envelope rows.
pub const PROFILE_ROW_SPACING_M: f64 = 0.25;

/// How the undisturbed temperature was found.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Method {
    ClosedForm,
    Numerical,
}

impl Method {
    pub fn name(self) -> &'static str {
        match self {
            Method::ClosedForm => "closed-form",
            Method::Numerical => "numerical",
        }
    }
}

/// The undisturbed periodic ground temperature T(z, t).
#[derive(Clone, Debug)]
pub struct Undisturbed {
    pub method: Method,
    pub surface: SurfaceYear,
    field: Field,
    pub spin_up_years: usize,
    pub energy_balance_relative_error: Option<f64>,
}

#[derive(Clone, Debug)]
enum Field {
    /// Homogeneous dry soil: the wave of Carslaw & Jaeger §2.6 plus the geothermal gradient.
    Wave {
        wave: AnnualWave,
        diffusivity_m2_per_s: f64,
        gradient_k_per_m: f64,
    },
    /// A surface held at one temperature: steady conduction of the geothermal flux.
    Steady {
        surface_c: f64,
        ground: Ground,
    },
    Numerical(PeriodicProfile),
}

/// Options of the numerical column (defaults in [`ColumnOptions`] terms).
/// Perennially frozen ground found in the undisturbed profile ([`Undisturbed::permafrost`]).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Permafrost {
    /// Depth to which the ground thaws and refreezes each year, m.
    pub active_layer_m: f64,
    /// Depth of the top of the perennially frozen ground, m.
    pub table_m: f64,
    /// Mean annual ground temperature, °C, and the depth it is read at, m.
    pub mean_annual_c: f64,
    pub depth_of_mean_m: f64,
}

pub fn column_options(depth_m: f64) -> ColumnOptions {
    ColumnOptions {
        depth_m,
        cell_size_m: 0.02,
        steps_per_year: 365 * 4,
        max_years: 400,
        tolerance_k: 1e-3,
    }
}

/// Solves the undisturbed ground of a site down to at least `depth_m`.
pub fn undisturbed(site: &Site, depth_m: f64) -> Result<Undisturbed, String> {
    let surface = SurfaceYear::from_climate(&site.climate);
    let ground = &site.ground;
    let first = &ground.layers[0];
    let field = match &surface {
        SurfaceYear::Constant { temperature_c } => Field::Steady {
            surface_c: *temperature_c,
            ground: ground.clone(),
        },
        SurfaceYear::Wave {
            mean_c,
            amplitude_k,
            t_min_s,
        } if ground.is_homogeneous_and_dry() => Field::Wave {
            wave: AnnualWave {
                mean_c: *mean_c,
                amplitude_k: *amplitude_k,
                coldest_day: t_min_s / DAY_S + 1.0,
                period_s: YEAR_S,
            },
            diffusivity_m2_per_s: first.conductivity_w_per_m_k / first.heat_capacity_j_per_m3_k,
            gradient_k_per_m: ground.geothermal_flux_w_per_m2 / first.conductivity_w_per_m_k,
        },
        _ => {
            let layers: Vec<ColumnLayer> = ground.layers.iter().map(column_layer).collect();
            let f = |t: f64| surface.surface_c(t);
            let profile = column::periodic_profile(
                &layers,
                &f,
                ground.geothermal_flux_w_per_m2,
                &column_options(depth_m),
            )?;
            Field::Numerical(profile)
        }
    };
    let (spin_up_years, energy) = match &field {
        Field::Numerical(p) => (p.years_to_converge, Some(p.energy_balance_relative_error)),
        _ => (0, None),
    };
    Ok(Undisturbed {
        method: if matches!(field, Field::Numerical(_)) {
            Method::Numerical
        } else {
            Method::ClosedForm
        },
        surface,
        field,
        spin_up_years,
        energy_balance_relative_error: energy,
    })
}

pub fn column_layer(l: &crate::model::SoilLayer) -> ColumnLayer {
    ColumnLayer {
        thickness_m: l.thickness_m.unwrap_or(f64::INFINITY),
        conductivity: l.conductivity_w_per_m_k,
        frozen_conductivity: l.frozen_conductivity_w_per_m_k,
        heat_capacity: l.heat_capacity_j_per_m3_k,
        frozen_heat_capacity: l.frozen_heat_capacity_j_per_m3_k,
        latent_heat_j_per_m3: l.latent_heat_j_per_m3,
        freezing_interval_k: l.freezing_interval_k,
    }
}

impl Undisturbed {
    /// Temperature at depth `z_m` and time `t_s` of the periodic year, °C.
    pub fn at(&self, z_m: f64, t_s: f64) -> f64 {
        match &self.field {
            Field::Wave {
                wave,
                diffusivity_m2_per_s,
                gradient_k_per_m,
            } => wave.ground_c(z_m, t_s, *diffusivity_m2_per_s, *gradient_k_per_m),
            Field::Steady { surface_c, ground } => surface_c + geothermal_rise_k(ground, z_m),
            Field::Numerical(p) => p.at(z_m, t_s),
        }
    }

    /// Annual mean, lowest and highest temperature at each reported depth.
    pub fn envelope(&self, depth_m: f64) -> Vec<ProfileRow> {
        let n = (depth_m / PROFILE_ROW_SPACING_M).round() as usize;
        (0..=n)
            .map(|i| {
                let z = i as f64 * PROFILE_ROW_SPACING_M;
                let (mean_c, min_c, max_c) = self.envelope_at(z);
                ProfileRow {
                    depth_m: z,
                    mean_c,
                    min_c,
                    max_c,
                }
            })
            .collect()
    }

    /// (mean, min, max) over the year at one depth.
    pub fn envelope_at(&self, z_m: f64) -> (f64, f64, f64) {
        match &self.field {
            Field::Wave {
                wave,
                diffusivity_m2_per_s,
                gradient_k_per_m,
            } => wave.envelope(z_m, *diffusivity_m2_per_s, *gradient_k_per_m),
            Field::Steady { .. } => {
                let t = self.at(z_m, 0.0);
                (t, t, t)
            }
            Field::Numerical(p) => {
                let samples: Vec<f64> = (0..p.days).map(|d| p.at(z_m, (d as f64 + 0.5) * DAY_S)).collect();
                let mean = samples.iter().sum::<f64>() / samples.len() as f64;
                let min = samples.iter().cloned().fold(f64::INFINITY, f64::min);
                let max = samples.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
                (mean, min, max)
            }
        }
    }

    /// Deepest depth reached by the 0 °C isotherm over the year (0 when the ground never freezes),
    /// found on a 1 cm scan and refined linearly; `None` when the ground is still frozen at
    /// `depth_m` (permafrost, or frost deeper than the profile): a model boundary is not a frost
    /// depth.
    pub fn max_frost_depth_m(&self, depth_m: f64) -> Option<f64> {
        let step = 0.01;
        let n = (depth_m / step).round() as usize;
        let mins: Vec<f64> = (0..=n).map(|i| self.envelope_at(i as f64 * step).1).collect();
        if mins[0] >= 0.0 {
            return Some(0.0);
        }
        match mins.iter().rposition(|&t| t < 0.0) {
            Some(i) if i < n => {
                let (a, b) = (mins[i], mins[i + 1]);
                Some((i as f64 + a / (a - b)) * step)
            }
            _ => None,
        }
    }

    /// Perennially frozen ground: present when the annual maximum lies below 0 °C at some depth
    /// down to `depth_m` (a 1 cm scan, crossings refined linearly). The permafrost table is the
    /// shallowest depth whose annual maximum is below 0 °C; the active layer, the ground above
    /// it that freezes and thaws each year, ends there too, unless an unfrozen layer (its annual
    /// minimum above 0 °C, a talik) lies between: the active layer then ends where the winter's
    /// frost from the surface stops. The mean annual ground temperature is the annual mean at the
    /// depth where the annual swing falls below 0.1 K (or at `depth_m`).
    pub fn permafrost(&self, depth_m: f64) -> Option<Permafrost> {
        let step = 0.01;
        let n = (depth_m / step).round() as usize;
        let rows: Vec<(f64, f64, f64)> = (0..=n).map(|i| self.envelope_at(i as f64 * step)).collect();
        let cross = |i: usize, f: fn(&(f64, f64, f64)) -> f64| {
            if i == 0 {
                return 0.0;
            }
            let (a, b) = (f(&rows[i - 1]), f(&rows[i]));
            (i as f64 - 1.0 + a / (a - b)) * step
        };
        let table_i = rows.iter().position(|r| r.2 < 0.0)?;
        let table_m = cross(table_i, |r| r.2);
        let talik = rows[..table_i].iter().position(|r| r.1 > 0.0);
        let active_layer_m = match talik {
            Some(i) => cross(i, |r| r.1),
            None => table_m,
        };
        let still = rows.iter().position(|r| r.2 - r.1 < 0.1).unwrap_or(n);
        Some(Permafrost {
            active_layer_m,
            table_m,
            mean_annual_c: rows[still].0,
            depth_of_mean_m: still as f64 * step,
        })
    }

    /// Mean temperature at depth `z_m` in each of the twelve equal months (January first), °C:
    /// the mean of the month's daily values.
    pub fn monthly_mean_at(&self, z_m: f64) -> [f64; 12] {
        let days = 365.0 / 12.0;
        let mut out = [0.0; 12];
        for (m, o) in out.iter_mut().enumerate() {
            let start = m as f64 * days;
            let n = 30;
            *o = (0..n)
                .map(|i| self.at(z_m, (start + (i as f64 + 0.5) * days / n as f64) * DAY_S))
                .sum::<f64>()
                / n as f64;
        }
        out
    }

    /// Surface temperature of the typical year, one value per day (at midday).
    pub fn surface_daily_c(&self) -> Vec<f64> {
        (0..365)
            .map(|d| self.surface.surface_c((d as f64 + 0.5) * DAY_S))
            .collect()
    }
}

/// Steady rise of temperature with depth carried by the geothermal flux through the layers, K.
pub fn geothermal_rise_k(ground: &Ground, z_m: f64) -> f64 {
    let mut rise = 0.0;
    let mut top = 0.0;
    for l in &ground.layers {
        let bottom = top + l.thickness_m.unwrap_or(f64::INFINITY);
        let within = (z_m.min(bottom) - top).max(0.0);
        rise += ground.geothermal_flux_w_per_m2 * within / l.conductivity_w_per_m_k;
        top = bottom;
        if top >= z_m {
            break;
        }
    }
    rise
}
