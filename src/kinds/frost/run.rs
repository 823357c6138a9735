//! `kind: frost`: design freezing index, frost depth by Stefan and the modified Berggren
//! equation (TM 5-852-6), and whether a water main at its cover stays frost-free.

use super::Frost;
use super::numerical::{self, DEFAULT_RESOLUTION, PipeRun, Winter};
use super::result::*;
use crate::calendar::{civil_from_days, days_from_civil};
use crate::ground::climate::SurfaceYear;
use crate::ground::profile::Undisturbed;
use crate::model::{Climate, DAY_S, Method, NFactors, Pipe, PipeDrive, Site};
use crate::numerics::time::HOUR_S;
use crate::physics::buried_pipe::{GroundForm, Soil, ground::ground_resistance_m_k_per_w};
use crate::physics::frost as fp;
use crate::results::*;

/// Volumetric heat capacity of water near 0 °C, J/(m3 K): 999.8 kg/m3 × 4219 J/(kg K) (IAPWS-95
/// at 0.01 °C, from memory).
pub const WATER_C_J_PER_M3_K: f64 = 4.218e6;
/// Latent heat of freezing per m3 of water: 1000 kg/m3 × 333.55 kJ/kg (IAPWS).
pub const WATER_LATENT_J_PER_M3: f64 = 333.55e6;
/// The middle of the warmest half-year of a typical year of daily values (0-based, 365-day
/// year) as (month, day): the centre of the 183-day window with the highest mean. It is the
/// warmest day of a sinusoidal year and lies well inside the warm season of any other, so a
/// freezing season counted from it never cuts a winter in two, north or south of the equator.
/// The default start of the freezing season.
fn warmest_day(daily: &[f64]) -> (u32, u32) {
    const HALF: usize = 183;
    let n = daily.len();
    let mut sum: f64 = daily.iter().take(HALF).sum();
    let (mut best, mut best_start) = (sum, 0);
    for start in 1..n {
        sum += daily[(start + HALF - 1) % n] - daily[start - 1];
        if sum > best + 1e-9 {
            (best, best_start) = (sum, start);
        }
    }
    let d = (best_start + HALF / 2) % n;
    let (_, month, day) = civil_from_days(days_from_civil(2001, 1, 1) + d as i64);
    (month, day)
}

/// Day of the year (0-based, 365-day year) of a month and day.
fn day_of_year((month, day): (u32, u32)) -> usize {
    (days_from_civil(2001, month, day) - days_from_civil(2001, 1, 1)) as usize
}

pub fn run(
    id: &str,
    method: Method,
    f: &Frost,
    site: &Site,
    ground: &Undisturbed,
) -> Result<(FrostResult, Vec<Warning>), String> {
    let mut warnings = Vec::new();
    let warn = |level, code: &str, message: String| Warning {
        study: Some(id.to_string()),
        level,
        code: code.into(),
        message,
    };
    let climate = with_surface_preset(&site.climate, f, id, &mut warnings)?;
    let year = SurfaceYear::from_climate(&climate);
    let daily: Vec<f64> = (0..365)
        .map(|d| year.surface_c((d as f64 + 0.5) * DAY_S))
        .collect();
    let start = f.season_start.unwrap_or_else(|| warmest_day(&daily));
    let start_day = day_of_year(start);
    let season: Vec<f64> = (0..365).map(|d| daily[(d + start_day) % 365]).collect();
    let n_f = air_n_factors(&climate).map_or(1.0, |n| n.freezing);

    let (surface_index, air_index, basis, seasons) = design_index(f, &climate, &season, start, n_f)?;
    if matches!(climate, Climate::MonthlyAir { .. }) && f.design_air_freezing_index_c_days.is_none() {
        warnings.push(warn(
            Level::Caution,
            "frost.monthly_means",
            "the freezing index comes from monthly mean temperatures, which understate it (cold spells average out); use a daily series or a design index from a local table for final design".into(),
        ));
    }
    let mean_annual = daily.iter().sum::<f64>() / 365.0;
    let season_days = daily.iter().filter(|t| **t < 0.0).count() as f64;
    let layers = frost_layers(site);
    // Stefan and Berggren balance the freezing index against latent heat; a soil with no water
    // freezes without it, and its frost depth is where the undisturbed ground's annual minimum
    // crosses 0 °C.
    let stefan = match fp::layered_stefan_depth_m(&layers, fp::c_days_to_c_s(surface_index)) {
        Ok(x) => Some(x),
        Err(e) => {
            warnings.push(warn(
                Level::Caution,
                "frost.no_latent_heat",
                format!("Stefan's and Berggren's formulas do not apply ({e}); the frost depth is where the undisturbed ground's lowest temperature crosses 0 °C"),
            ));
            None
        }
    };
    let berggren = if stefan.is_some() && surface_index > 0.0 && season_days > 0.0 {
        match fp::modified_berggren_depth(
            &layers,
            &fp::FreezingSeason {
                surface_index_c_s: fp::c_days_to_c_s(surface_index),
                length_s: season_days * DAY_S,
                mean_annual_c: mean_annual,
                freezing_point_c: 0.0,
            },
        ) {
            Ok(b) => Some(b),
            Err(e) => {
                warnings.push(warn(Level::Caution, "frost.berggren_not_applicable", format!("the modified Berggren equation does not apply here ({e}); the frost depth falls back on Stefan's formula")));
                None
            }
        }
    } else {
        None
    };
    let analytic = method != Method::Numerical;
    let analytic_depth = berggren
        .map(|b| b.depth_m)
        .or(stefan)
        .or_else(|| ground.max_frost_depth_m(crate::ground::profile::DEFAULT_PROFILE_DEPTH_M));
    let permafrost = ground.permafrost(crate::ground::profile::DEFAULT_PROFILE_DEPTH_M);
    if let Some(p) = &permafrost {
        warnings.push(warn(
            Level::Danger,
            "frost.permafrost",
            format!(
                "the ground is perennially frozen: below an active layer of {:.2} m the permafrost table lies at {:.2} m and the mean annual ground temperature is {:.1} °C; a frost-depth cover rule does not apply — a main here needs insulation or heat tracing (or an above-ground or utilidor route) designed to local practice for permafrost",
                p.active_layer_m, p.table_m, p.mean_annual_c
            ),
        ));
    }
    // The engine's winter needs a winter: a surface year scaled to the design index.
    let winter = if method == Method::Analytic && f.board.is_none() {
        None
    } else {
        match Winter::new(year.clone(), start_day as f64 * DAY_S, surface_index) {
            Ok(w) => Some(w),
            Err(e) if analytic => {
                warnings.push(warn(
                    Level::Caution,
                    "frost.no_numerical_winter",
                    format!("the engine's winter was not run: {e}"),
                ));
                None
            }
            Err(e) => return Err(format!("study {id}: {e}")),
        }
    };
    let run = match (&winter, method) {
        (Some(w), Method::Numerical | Method::Both) => Some(numerical_run(site, ground, f.pipe.as_ref(), w)?),
        _ => None,
    };
    if let Some((r, _)) = &run
        && r.energy_balance_relative_error > 1e-4
    {
        warnings.push(warn(
            Level::Caution,
            "frost.energy_balance",
            format!(
                "the engine's energy balance closes only to {:.1e} of the heat throughput",
                r.energy_balance_relative_error
            ),
        ));
    }
    // Frost that reaches the bottom of the engine's section is the section's boundary, not a
    // depth of the ground: the section is too shallow to show it.
    let numerical_depth = run.as_ref().and_then(|(r, _)| {
        if r.free_field_depth_m >= r.domain_depth_m - 0.05 * r.domain_depth_m {
            warnings.push(warn(
                Level::Caution,
                "frost.domain_too_shallow",
                format!(
                    "the engine's frost reaches the bottom of its {:.1} m deep section; the section is too shallow to give a frost depth",
                    r.domain_depth_m
                ),
            ));
            None
        } else {
            Some(r.free_field_depth_m)
        }
    });
    let governing = if permafrost.is_some() {
        None
    } else {
        match (analytic, numerical_depth) {
            (true, Some(n)) => Some(berggren.map_or(n, |b| b.depth_m.max(n))),
            (false, Some(n)) => Some(n),
            _ => analytic_depth,
        }
    };

    let mut result = FrostResult {
        design_freezing_index_c_days: surface_index,
        air_freezing_index_c_days: air_index,
        design_index_basis: basis,
        frost_depth_m: FrostDepths {
            stefan: stefan.filter(|_| analytic),
            berggren: berggren.map(|b| b.depth_m).filter(|_| analytic),
            numerical: numerical_depth,
        },
        max_frost_depth_m: governing,
        permafrost: permafrost
            .as_ref()
            .map(crate::results::PermafrostFigures::from_profile),
        mean_annual_surface_c: mean_annual,
        freezing_season_days: season_days,
        berggren: berggren.filter(|_| analytic).map(|b| BerggrenFigures {
            lambda: b.lambda,
            thermal_ratio: b.alpha,
            fusion_parameter: b.mu,
        }),
        seasons,
        frost_reaches_pipe: None,
        pipe_crown_depth_m: None,
        pipe_min_temperature_c: None,
        water_min_temperature_c: None,
        required_cover_m: None,
        margin_m: f.margin_m,
        stagnant: None,
        season_start: season_start_text(start),
        numerical: run.map(|(r, circle)| Box::new(numerical_figures(r, circle, winter.as_ref()))),
        bleed: None,
        board_width_m: None,
        board: None,
        cumulative_degree_days: fp::cumulative_degree_days(&season)?,
        lowest_profile: (0..=100)
            .map(|i| {
                let z = i as f64 * 0.04;
                (z, ground.envelope_at(z).1)
            })
            .collect(),
    };
    if let Some(pipe) = &f.pipe {
        pipe_checks(id, f, pipe, site, ground, &mut result, &mut warnings)?;
        if let (Some(board), Some(w)) = (&f.board, &winter) {
            board_figures(pipe, board, site, ground, w, &mut result)?;
        }
    }
    Ok((result, warnings))
}

/// A pipe's centre (x, depth) and outer radius in the field's coordinates, m.
type PipeCircle = (f64, f64, f64);

/// `MM-DD` of a (month, day).
fn season_start_text((month, day): (u32, u32)) -> String {
    format!("{month:02}-{day:02}")
}

/// The engine's winter with the pipe when there is one, else of the bare ground; with the
/// pipe's circle (x, depth, radius) in the field's coordinates.
fn numerical_run(
    site: &Site,
    ground: &Undisturbed,
    pipe: Option<&Pipe>,
    winter: &Winter,
) -> Result<(PipeRun, Option<PipeCircle>), String> {
    let r = numerical::winter_run(site, ground, pipe, winter, &DEFAULT_RESOLUTION)?;
    Ok((r, pipe.map(|p| (0.0, p.depth_m, p.outer_radius_m()))))
}

/// Figures of the engine's winter; the field cropped to the region around the pipe and the
/// frost.
fn numerical_figures(
    r: PipeRun,
    circle: Option<PipeCircle>,
    winter: Option<&Winter>,
) -> FrostNumericalFigures {
    let snap = &r.field;
    let nx = snap.x_m.len();
    let z_max = (2.0 * r.free_field_depth_m)
        .max(circle.map_or(0.0, |c| c.1 + 1.0))
        .max(2.0);
    let keep_x: Vec<usize> = (0..nx).filter(|&i| snap.x_m[i].abs() <= 3.0).collect();
    let keep_z: Vec<usize> = (0..snap.z_m.len()).filter(|&j| snap.z_m[j] <= z_max).collect();
    let field = Field {
        label: format!("day {:.0} of the design season, deepest frost", r.deepest_day),
        x_m: keep_x.iter().map(|&i| snap.x_m[i]).collect(),
        z_m: keep_z.iter().map(|&j| snap.z_m[j]).collect(),
        values_c: keep_z
            .iter()
            .map(|&j| keep_x.iter().map(|&i| snap.t_c[j * nx + i]).collect())
            .collect(),
    };
    FrostNumericalFigures {
        cells: r.cells,
        time_step_h: DEFAULT_RESOLUTION.winter_step_s / HOUR_S,
        spin_up_years: numerical::SPIN_UP_YEARS,
        winter_scale: winter.map_or(1.0, |w| w.scale),
        free_field_frost_depth_m: r.free_field_depth_m,
        deepest_frost_day: r.deepest_day,
        max_front_depth_m: r.free_field_front_depth_m,
        final_front_depth_m: r.final_front_depth_m,
        pipe_min_wall_temperature_c: circle.map(|_| r.wall_min_c),
        ground_min_at_pipe_c: circle.map(|_| r.ground_min_at_pipe_c),
        energy_balance_relative_error: r.energy_balance_relative_error,
        series_days: r.days,
        series_frost_depth_m: r.frost_depth_m,
        field: Some(field),
        pipe_circle: circle,
    }
}

/// The board search (only when frost reaches the crown by the governing depth).
fn board_figures(
    pipe: &Pipe,
    board: &crate::kinds::frost::FrostBoard,
    site: &Site,
    ground: &Undisturbed,
    winter: &Winter,
    r: &mut FrostResult,
) -> Result<(), String> {
    let (width, trials) = if r.frost_reaches_pipe == Some(true) {
        let s = numerical::board_search(site, ground, pipe, board, winter)?;
        (s.width_m, s.trials)
    } else {
        (Some(0.0), Vec::new())
    };
    r.board_width_m = Some(width);
    r.board = Some(Box::new(BoardFigures {
        thickness_m: board.thickness_m,
        conductivity_w_per_m_k: board.conductivity_w_per_m_k,
        gap_m: board.gap_m,
        max_width_m: board.max_width_m,
        trials: trials
            .iter()
            .map(|t| BoardTrialFigure {
                width_m: t.width_m,
                crown_min_temperature_c: t.crown_min_c,
                frost_depth_over_pipe_m: t.frost_depth_m,
            })
            .collect(),
    }));
    Ok(())
}

/// The climate with the study's surface preset's n-factors in place of its own (air climates
/// only; a preset on a surface-temperature climate is ignored with a caution).
fn with_surface_preset(
    climate: &Climate,
    f: &Frost,
    id: &str,
    warnings: &mut Vec<Warning>,
) -> Result<Climate, String> {
    if let Climate::Constant { .. } = climate {
        return Err(format!(
            "study {id}: a frost study needs a climate with seasons (annual-wave, monthly-air or series), not a constant surface temperature"
        ));
    }
    let Some(key) = &f.surface_preset else {
        return Ok(climate.clone());
    };
    let p = fp::n_factor_preset(key)?;
    let n = NFactors {
        freezing: p.freezing,
        thawing: p.thawing.unwrap_or(1.0),
    };
    Ok(match climate {
        Climate::MonthlyAir { air_c, .. } => Climate::MonthlyAir {
            air_c: *air_c,
            n_factors: n,
        },
        Climate::Series(s) => {
            let mut s = s.clone();
            s.n_factors = n;
            Climate::Series(s)
        }
        other => {
            warnings.push(Warning {
                study: Some(id.to_string()),
                level: Level::Caution,
                code: "frost.surface_preset_ignored".into(),
                message: format!("the surface type `{key}` was ignored: the climate already gives surface temperatures, which need no n-factors"),
            });
            other.clone()
        }
    })
}

fn air_n_factors(climate: &Climate) -> Option<NFactors> {
    match climate {
        Climate::MonthlyAir { n_factors, .. } => Some(*n_factors),
        Climate::Series(s) => Some(s.n_factors),
        _ => None,
    }
}

/// (surface index, air index, how it was found, seasonal indices of a series), °C·days.
fn design_index(
    f: &Frost,
    climate: &Climate,
    season: &[f64],
    start: (u32, u32),
    n_f: f64,
) -> Result<(f64, Option<f64>, String, Vec<SeasonFigure>), String> {
    let start_day = day_of_year(start);
    if let Some(air_index) = f.design_air_freezing_index_c_days {
        return Ok((
            n_f * air_index,
            Some(air_index),
            format!("design air freezing index from the site file × freezing n-factor {n_f}"),
            Vec::new(),
        ));
    }
    match climate {
        // The closed form counts the whole winter; it holds when the season starts on a day
        // above 0 °C (a sinusoid's freezing spell is one piece), else the season cuts the winter
        // and the cumulative curve of the season's days counts only its larger part.
        Climate::AnnualWave {
            mean_c, amplitude_k, ..
        } if season.first().is_some_and(|t| *t >= 0.0) => Ok((
            fp::sinusoid_freezing_index_c_days(*mean_c, *amplitude_k, 365.0)?,
            None,
            "closed form of the annual surface wave, (P/π)(A sin θ − m θ), θ = acos(m/A)".into(),
            Vec::new(),
        )),
        Climate::AnnualWave { .. } => Ok((
            fp::freezing_index_c_days(season)?,
            None,
            "cumulative degree-day curve of the annual wave's days; the season start falls in the winter and splits it (TM 5-852-6)".into(),
            Vec::new(),
        )),
        Climate::MonthlyAir { air_c, .. } => {
            let air_year = SurfaceYear::from_climate(&Climate::MonthlyAir {
                air_c: *air_c,
                n_factors: NFactors {
                    freezing: 1.0,
                    thawing: 1.0,
                },
            });
            let air_season: Vec<f64> = (0..365)
                .map(|d| air_year.air_c(((d + start_day) % 365) as f64 * DAY_S + 0.5 * DAY_S))
                .collect();
            Ok((
                fp::freezing_index_c_days(season)?,
                Some(fp::freezing_index_c_days(&air_season)?),
                "cumulative degree-day curve of the monthly means interpolated to days (TM 5-852-6)".into(),
                Vec::new(),
            ))
        }
        Climate::Series(s) => series_index(f, s, start),
        Climate::Constant { .. } => Err("a frost study needs a climate with seasons".into()),
    }
}

fn series_index(
    f: &Frost,
    s: &crate::model::AirSeries,
    start: (u32, u32),
) -> Result<(f64, Option<f64>, String, Vec<SeasonFigure>), String> {
    let per_day = (DAY_S / s.step_s).round().max(1.0) as usize;
    let daily_air: Vec<f64> = s
        .air_c
        .chunks(per_day)
        .filter(|c| c.len() == per_day)
        .map(|c| c.iter().sum::<f64>() / per_day as f64)
        .collect();
    let surface_of = |t: f64| crate::ground::climate::apply_n_factors(t, s.n_factors);
    let daily_surface: Vec<f64> = s
        .air_c
        .chunks(per_day)
        .filter(|c| c.len() == per_day)
        .map(|c| c.iter().map(|t| surface_of(*t)).sum::<f64>() / per_day as f64)
        .collect();
    let first = days_from_civil(s.start_year, 1, 1) + s.start_day_of_year.floor() as i64 - 1;
    let (y, m, d) = civil_from_days(first);
    let record = |v: &[f64]| -> Result<Vec<fp::SeasonIndices>, String> {
        fp::seasonal_indices(
            &fp::DailyRecord {
                first_year: y as i32,
                first_month: m,
                first_day: d,
                daily_mean_c: v,
            },
            fp::MonthDay {
                month: start.0,
                day: start.1,
            },
        )
    };
    let surface = record(&daily_surface)?;
    let air = record(&daily_air)?;
    if surface.is_empty() {
        return Err(format!(
            "the temperature file `{}` holds no complete freezing season (a year from {}); give at least one",
            s.source,
            season_start_text(start)
        ));
    }
    let seasons: Vec<SeasonFigure> = surface
        .iter()
        .map(|x| SeasonFigure {
            start_year: x.start_year,
            freezing_index_c_days: x.freezing_index_c_days,
        })
        .collect();
    let pick = |v: &[fp::SeasonIndices]| -> Result<(f64, String), String> {
        let idx: Vec<f64> = v.iter().map(|x| x.freezing_index_c_days).collect();
        match f.return_period_years {
            Some(t) => Ok((
                fp::fit_gumbel(&idx, fp::GumbelMethod::MaximumLikelihood)?.return_value_c_days(t)?,
                format!(
                    "Gumbel (maximum likelihood) {t}-year value of {} winters",
                    idx.len()
                ),
            )),
            None if idx.len() >= 3 => Ok((
                fp::design_index_three_coldest(&idx)?,
                format!("mean of the three coldest of {} winters (TM 5-852-6)", idx.len()),
            )),
            None => Ok((
                idx.iter().cloned().fold(0.0, f64::max),
                format!("the coldest of {} winter(s); TM 5-852-6 asks for 30", idx.len()),
            )),
        }
    };
    let (surface_index, basis) = pick(&surface)?;
    let (air_index, _) = pick(&air)?;
    Ok((surface_index, Some(air_index), basis, seasons))
}

fn frost_layers(site: &Site) -> Vec<fp::FrostLayer> {
    site.ground
        .layers
        .iter()
        .map(|l| fp::FrostLayer {
            thickness_m: l.thickness_m.unwrap_or(f64::INFINITY),
            k_frozen_w_mk: l.frozen_conductivity_w_per_m_k,
            k_unfrozen_w_mk: l.conductivity_w_per_m_k,
            c_frozen_j_m3k: l.frozen_heat_capacity_j_per_m3_k,
            c_unfrozen_j_m3k: l.heat_capacity_j_per_m3_k,
            latent_j_per_m3: l.latent_heat_j_per_m3,
        })
        .collect()
}

/// Crown against frost, coldest wall and water, stagnant freezing, required cover.
fn pipe_checks(
    id: &str,
    f: &Frost,
    pipe: &Pipe,
    site: &Site,
    ground: &Undisturbed,
    r: &mut FrostResult,
    warnings: &mut Vec<Warning>,
) -> Result<(), String> {
    let crown = pipe.cover_m();
    r.pipe_crown_depth_m = Some(crown);
    // Over permafrost (or with no frost depth) the crown is not held to a frost depth: the
    // permafrost danger says what applies instead.
    if let Some(depth) = r.max_frost_depth_m {
        let reaches = depth >= crown;
        r.frost_reaches_pipe = Some(reaches);
        let cover = fp::required_cover(depth, pipe.outer_diameter_m, f.margin_m)?;
        r.required_cover_m = Some(cover.cover_m);
        if reaches {
            warnings.push(Warning {
                study: Some(id.to_string()),
                level: Level::Danger,
                code: "frost.at_pipe".into(),
                message: format!(
                    "frost reaches {depth:.2} m in the design winter, below the crown of `{}` at {:.2} m: the water can freeze; give it at least {:.2} m of cover, insulate it, or keep the water moving",
                    pipe.id, crown, cover.cover_m
                ),
            });
        }
    }
    // Coldest pipe wall: the undisturbed ground at the pipe's depth, day by day, with the water
    // (or the heat rate) through the wall and ground resistances in series.
    let k = site.ground.layer_at(pipe.depth_m).conductivity_w_per_m_k;
    let soil = Soil::new(k, 0.0)?;
    let r_ground =
        ground_resistance_m_k_per_w(pipe.depth_m, pipe.outer_radius_m(), &soil, GroundForm::Exact)?;
    let r_wall: f64 = wall_resistance(pipe)?;
    let mut wall_min = f64::INFINITY;
    let mut ground_min = f64::INFINITY;
    let mut water_min = f64::INFINITY;
    for d in 0..365 {
        let t_g = ground.at(pipe.depth_m, (d as f64 + 0.5) * DAY_S);
        let month = ((d as f64 + 0.5) / (365.0 / 12.0)) as usize;
        let t_wall = match &pipe.drive {
            PipeDrive::FluidTemperature { monthly_c } => {
                water_min = water_min.min(monthly_c[month.min(11)]);
                t_g + (monthly_c[month.min(11)] - t_g) * r_ground / (r_wall + r_ground)
            }
            PipeDrive::HeatToGround { w_per_m } => t_g + w_per_m * r_ground,
        };
        wall_min = wall_min.min(t_wall);
        ground_min = ground_min.min(t_g);
    }
    // The engine's coldest wall, where it ran, replaces the series-resistance estimate; so does
    // its coldest free-field ground at the pipe depth for the bleed flow.
    let numerical = r.numerical.as_ref();
    r.pipe_min_temperature_c = numerical
        .and_then(|n| n.pipe_min_wall_temperature_c)
        .or(Some(wall_min));
    r.water_min_temperature_c = water_min.is_finite().then_some(water_min);
    if let Some(bleed) = &f.bleed {
        let ground_c = numerical
            .and_then(|n| n.ground_min_at_pipe_c)
            .unwrap_or(ground_min);
        let resistance = r_wall + r_ground;
        match fp::bleed_flow_m3_per_s(
            water_min,
            ground_c,
            bleed.min_temperature_c,
            bleed.length_m,
            WATER_C_J_PER_M3_K,
            resistance,
        ) {
            Ok(flow) => {
                r.bleed = Some(Box::new(BleedFigures {
                    length_m: bleed.length_m,
                    flow_l_per_min: flow * 60_000.0,
                    inlet_temperature_c: water_min,
                    ground_temperature_c: ground_c,
                    min_temperature_c: bleed.min_temperature_c,
                    resistance_m_k_per_w: resistance,
                }))
            }
            Err(e) => warnings.push(Warning {
                study: Some(id.to_string()),
                level: Level::Caution,
                code: "frost.bleed_not_possible".into(),
                message: format!("no bleed flow was found: {e}"),
            }),
        }
    }
    if let Some(duration) = f.stagnant_s {
        let initial = if water_min.is_finite() {
            water_min
        } else {
            wall_min.max(0.5)
        };
        let stagnant = fp::StagnantPipe {
            inner_diameter_m: 2.0 * pipe.inner_radius_m(),
            wall_resistance_m_k_per_w: r_wall,
            ground_resistance_m_k_per_w: r_ground,
            water_heat_capacity_j_m3k: WATER_C_J_PER_M3_K,
            water_latent_j_per_m3: WATER_LATENT_J_PER_M3,
            freezing_point_c: 0.0,
        };
        let (first_ice, ice) = if ground_min < 0.0 && initial > 0.0 {
            (
                stagnant.time_to_first_ice_s(initial, ground_min)?,
                stagnant.ice_fraction_after(initial, ground_min, duration)?,
            )
        } else {
            (None, 0.0)
        };
        let freezes = first_ice.is_some_and(|t| t <= duration);
        if freezes {
            warnings.push(Warning {
                study: Some(id.to_string()),
                level: Level::Danger,
                code: "frost.stagnant_freeze".into(),
                message: format!(
                    "standing water in `{}` starts to freeze after {:.0} h at the coldest ground temperature ({:.1} °C), within the {:.0} h without flow (ice fraction {:.0} %); keep a bleed flow, insulate or lay deeper",
                    pipe.id,
                    first_ice.unwrap_or(0.0) / HOUR_S,
                    ground_min,
                    duration / HOUR_S,
                    ice * 100.0
                ),
            });
        }
        r.stagnant = Some(StagnantFigures {
            duration_h: duration / HOUR_S,
            time_to_first_ice_h: first_ice.map(|t| t / HOUR_S),
            ice_fraction: ice,
            ground_temperature_c: ground_min,
            initial_water_temperature_c: initial,
        });
    }
    Ok(())
}

fn wall_resistance(pipe: &Pipe) -> Result<f64, String> {
    let layers: Vec<crate::physics::buried_pipe::wall::WallLayer> = pipe
        .layers
        .iter()
        .map(|l| crate::physics::buried_pipe::wall::WallLayer::new(l.thickness_m, l.conductivity_w_per_m_k))
        .collect();
    if layers.is_empty() {
        return Ok(0.0);
    }
    crate::physics::buried_pipe::wall::wall_resistance_m_k_per_w(pipe.inner_radius_m(), &layers)
}
