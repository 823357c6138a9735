//! The finite-volume engine's side of `kind: frost`: the design winter run with the main in
//! place (free-field frost depth, coldest pipe wall, the field at the deepest frost) and the
//! search for the narrowest insulation board that keeps the crown above 0 °C.
//!
//! Time line of a run (t = 0 is 1 January 00:00 of the periodic year):
//!
//! 1. the periodic undisturbed ground (`ground::profile`) at the season start `t₀`;
//! 2. two spin-up years of the typical surface year with the pipe (or board) in place, at
//!    daily steps, so that the ground around it reaches its own periodic state;
//! 3. the design season `t₀ + 2 y … t₀ + 3 y`: the typical surface year with its below-zero part
//!    scaled so that the season's freezing index equals the design index (a scale of 1 when the
//!    design index is the typical year's own), at [`Resolution::winter_step_s`].
//!
//! The free-field frost depth is the deepest 0 °C isotherm at the section's edge column, half a
//! section width away from the pipe. With the engine's freezing interval (latent heat released
//! between 0 °C and `−interval`), 0 °C is where the first ice forms: deeper than a sharp-front
//! formula's depth by part of the mushy zone, so the numerical figure is on the safe side.

use super::FrostBoard;
use crate::engine::material::Material;
use crate::engine::section::{
    self, GridOptions, Inclusion, Initial, SectionModel, Snapshot, Solution, TransientOptions,
};
use crate::ground::climate::SurfaceYear;
use crate::ground::profile::Undisturbed;
use crate::kinds::engine_model::{engine_pipe, sample, soil_layers};
use crate::model::{DAY_S, Pipe, Site, YEAR_S};
use crate::numerics::roots;
use crate::numerics::time::HOUR_S;
use crate::physics::frost as fp;

/// Mesh and steps of the frost runs.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Resolution {
    pub grid: GridOptions,
    /// Step of the spin-up years, s.
    pub spin_up_step_s: f64,
    /// Step of the design season, s.
    pub winter_step_s: f64,
    /// Distance from the pipe to each side of the section, m.
    pub half_width_m: f64,
    /// Depth of the section, m.
    pub depth_m: f64,
}

/// Default resolution (stated in DEVELOPERS.md): cells of 3 cm at the surface and at most 5 cm
/// around the pipe (6 across its diameter), growing by at most 1.2 to 1 m; a section 10 m wide
/// and 10 m deep (about 2,300 cells with a 160 mm main); daily spin-up steps and 6-hour steps in
/// the design season. A grid of 12,000 cells at 3-hour steps moved the frost depth of the silt in
/// tests/frost_study.rs by 0.5 % (1.980 → 1.990 m; measured once while choosing these values,
/// not a committed test).
pub const DEFAULT_RESOLUTION: Resolution = Resolution {
    grid: GridOptions {
        surface_cell_m: 0.03,
        min_cell_m: 0.05,
        max_cell_m: 1.0,
        growth_ratio: 1.2,
        cells_across_pipe: 6,
    },
    spin_up_step_s: DAY_S,
    winter_step_s: 6.0 * HOUR_S,
    half_width_m: 5.0,
    depth_m: 10.0,
};

/// Board runs: daily steps throughout (a run of two years takes well under a second).
const BOARD_STEP_S: f64 = DAY_S;
/// Spin-up years before the design season.
pub const SPIN_UP_YEARS: usize = 2;
/// Spin-up years of each board run (the board changes the ground's stored heat within a year).
const BOARD_SPIN_UP_YEARS: usize = 1;
/// Soil beyond the edge of the widest board, m.
const BOARD_SIDE_M: f64 = 4.0;
/// The board search stops when the bracket is narrower than this share of the width (or 1 cm).
const BOARD_TOLERANCE: f64 = 0.02;

/// The surface temperature of the runs: the typical year, and in the design season its frost
/// scaled by `scale`.
#[derive(Clone)]
pub struct Winter {
    pub surface: SurfaceYear,
    /// Start of the freezing season in the periodic year, s.
    pub season_start_s: f64,
    /// Factor on the below-zero surface temperatures of the design season.
    pub scale: f64,
}

impl Winter {
    /// The winter whose season (from `season_start_s`) has the freezing index
    /// `design_index_c_days` (°C·days, TM 5-852-6 cumulative-curve definition), found by
    /// Brent's method on the factor applied to the typical year's below-zero temperatures.
    pub fn new(surface: SurfaceYear, season_start_s: f64, design_index_c_days: f64) -> Result<Self, String> {
        let mut w = Winter {
            surface,
            season_start_s,
            scale: 1.0,
        };
        let typical = w.season_index(1.0)?;
        if (typical - design_index_c_days).abs() <= 1e-9 * design_index_c_days.max(1.0) {
            return Ok(w);
        }
        if typical <= 0.0 {
            return Err("the typical year of the climate never freezes, so there is no winter to scale to the design freezing index".into());
        }
        let (mut lo, mut hi) = (0.0, 1.0);
        while w.season_index(hi)? < design_index_c_days {
            lo = hi;
            hi *= 2.0;
            if hi > 1e3 {
                return Err("the design freezing index is far beyond the climate's winter".into());
            }
        }
        let excess = |scale: f64| -> Result<f64, String> { Ok(w.season_index(scale)? - design_index_c_days) };
        let scale = roots::try_brent(excess, lo, hi, 1e-13 * hi)?
            .ok_or("the design freezing index could not be bracketed by scaling the climate's winter")?;
        w.scale = scale;
        Ok(w)
    }

    fn season_index(&self, scale: f64) -> Result<f64, String> {
        let days: Vec<f64> = (0..365)
            .map(|d| {
                scaled(
                    self.surface
                        .surface_c(self.season_start_s + (d as f64 + 0.5) * DAY_S),
                    scale,
                )
            })
            .collect();
        fp::freezing_index_c_days(&days)
    }

    /// Surface temperature at `t_s` of a run whose design season starts at `design_start_s`.
    fn surface_c(&self, t_s: f64, design_start_s: f64) -> f64 {
        let t = self.surface.surface_c(t_s);
        if t_s > design_start_s {
            scaled(t, self.scale)
        } else {
            t
        }
    }
}

fn scaled(t_c: f64, scale: f64) -> f64 {
    if t_c < 0.0 { scale * t_c } else { t_c }
}

/// What the design winter run with the pipe gives.
#[derive(Clone, Debug)]
pub struct PipeRun {
    pub cells: usize,
    /// Depth of the section's bottom, m: a frost depth there is the model's boundary, not the
    /// ground's.
    pub domain_depth_m: f64,
    /// Deepest free-field frost (0 °C isotherm at the section edge) in the design season, m.
    pub free_field_depth_m: f64,
    /// Days from the season start of that deepest frost.
    pub deepest_day: f64,
    /// Days from the season start and the free-field frost depth (m) at every step.
    pub days: Vec<f64>,
    pub frost_depth_m: Vec<f64>,
    /// The enthalpy method's free-field front (frozen thickness Σ f·Δz of the edge
    /// column): deepest in the design season and at its end, m.
    pub free_field_front_depth_m: f64,
    pub final_front_depth_m: f64,
    /// Lowest pipe-wall (outer surface) temperature of the design season, °C.
    pub wall_min_c: f64,
    /// Lowest free-field ground temperature at the pipe's centre depth, °C.
    pub ground_min_at_pipe_c: f64,
    /// The field at the deepest frost (x measured from the pipe centre).
    pub field: Snapshot,
    /// Largest relative energy imbalance of the two runs.
    pub energy_balance_relative_error: f64,
    /// Linear solves of both runs.
    pub linear_solves: usize,
}

fn base_model(
    site: &Site,
    winter: &Winter,
    width_m: f64,
    depth_m: f64,
    design_start_s: f64,
) -> Result<SectionModel, String> {
    let w = winter.clone();
    let mut m = SectionModel::new(
        section::Geometry::Planar,
        width_m,
        depth_m,
        soil_layers(site)?,
        Box::new(move |t| w.surface_c(t, design_start_s)),
    );
    m.bottom_flux_w_per_m2 = site.ground.geothermal_flux_w_per_m2;
    Ok(m)
}

/// Runs `model` from the undisturbed ground at `t₀` through `spin_years` at `spin_step_s`, then
/// the design season at `winter_step_s` from the spin-up's last field, with snapshots at the end
/// of every day of the season. Returns (spin-up, design season).
fn spin_up_and_winter(
    model: &SectionModel,
    ground: &Undisturbed,
    t0: f64,
    spin_years: usize,
    res: &Resolution,
    probes: Vec<(f64, f64)>,
    daily_snapshots: bool,
) -> Result<(Option<Solution>, Solution), String> {
    let design_start = t0 + spin_years as f64 * YEAR_S;
    let g = ground.clone();
    let mut initial = Initial::Field(Box::new(move |_x, z| g.at(z, t0)));
    let mut spin = None;
    if spin_years > 0 {
        let steps = (spin_years as f64 * YEAR_S / res.spin_up_step_s).round() as usize;
        let mut o = TransientOptions::new(res.spin_up_step_s, steps, initial);
        o.grid = res.grid;
        o.start_s = t0;
        o.snapshot_times_s = vec![t0 + steps as f64 * res.spin_up_step_s];
        let s = section::solve_transient(model, &o)?;
        let last = s
            .snapshots
            .last()
            .cloned()
            .ok_or("the spin-up run returned no final field")?;
        initial = Initial::Field(Box::new(move |x, z| sample(&last, x, z)));
        spin = Some(s);
    }
    let steps = (YEAR_S / res.winter_step_s).round() as usize;
    let mut o = TransientOptions::new(res.winter_step_s, steps, initial);
    o.grid = res.grid;
    o.start_s = design_start;
    o.probes = probes;
    if daily_snapshots {
        o.snapshot_times_s = (1..=365).map(|d| design_start + d as f64 * DAY_S).collect();
    }
    Ok((spin, section::solve_transient(model, &o)?))
}

/// The design winter with the main in place (its centre at x = 0 of the section), or of the
/// bare ground when there is no main.
pub fn winter_run(
    site: &Site,
    ground: &Undisturbed,
    pipe: Option<&Pipe>,
    winter: &Winter,
    res: &Resolution,
) -> Result<PipeRun, String> {
    let t0 = winter.season_start_s;
    let design_start = t0 + SPIN_UP_YEARS as f64 * YEAR_S;
    let pipe_depth = pipe.map_or(1.0, |p| p.depth_m);
    let domain_depth_m = res.depth_m.max(3.0 * pipe_depth);
    let mut model = base_model(site, winter, 2.0 * res.half_width_m, domain_depth_m, design_start)?;
    if let Some(pipe) = pipe {
        let mut p = engine_pipe(pipe, false)?;
        p.x_m = 0.0;
        model.pipes.push(p);
    }
    let probes = vec![(res.half_width_m, pipe_depth)];
    let (spin, run) = spin_up_and_winter(&model, ground, t0, SPIN_UP_YEARS, res, probes, true)?;
    let (n_max, depth_max) = run
        .frost_depth_m
        .iter()
        .copied()
        .enumerate()
        .fold((0, 0.0), |(i, d), (j, x)| if x > d { (j, x) } else { (i, d) });
    let t_max = run.times_s.get(n_max).copied().unwrap_or(design_start);
    let field = run
        .snapshots
        .iter()
        .min_by(|a, b| (a.time_s - t_max).abs().total_cmp(&(b.time_s - t_max).abs()))
        .cloned()
        .ok_or("the design winter run returned no field")?;
    let min = |v: &[f64]| v.iter().copied().fold(f64::INFINITY, f64::min);
    Ok(PipeRun {
        cells: run.cells,
        domain_depth_m,
        free_field_depth_m: depth_max,
        deepest_day: (t_max - design_start) / DAY_S,
        days: run.times_s.iter().map(|t| (t - design_start) / DAY_S).collect(),
        frost_depth_m: run.frost_depth_m.clone(),
        free_field_front_depth_m: run.front_depth_m.iter().copied().fold(0.0, f64::max),
        final_front_depth_m: run.front_depth_m.last().copied().unwrap_or(0.0),
        wall_min_c: run.pipes.first().map_or(f64::NAN, |s| min(&s.wall_c)),
        ground_min_at_pipe_c: run.probes_c.first().map_or(f64::NAN, |v| min(v)),
        field,
        energy_balance_relative_error: spin
            .as_ref()
            .map_or(0.0, |s| s.energy_balance_relative_error)
            .max(run.energy_balance_relative_error),
        linear_solves: spin.as_ref().map_or(0, |s| s.linear_solves) + run.linear_solves,
    })
}

/// One board width tried.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct BoardTrial {
    pub width_m: f64,
    /// Lowest temperature at the crown over the design season, °C.
    pub crown_min_c: f64,
    /// Deepest 0 °C isotherm above the middle of the board (over the pipe), m.
    pub frost_depth_m: f64,
}

/// The result of the board search.
#[derive(Clone, Debug)]
pub struct BoardSearch {
    /// Narrowest width found that keeps the crown at or above 0 °C (0 when no board is needed),
    /// `None` when even the widest does not.
    pub width_m: Option<f64>,
    pub trials: Vec<BoardTrial>,
}

/// One design winter (after one spin-up year) of the ground with a board of `width_m` centred
/// above the crown, without the water's heat (standing water: the conservative case, as for the
/// free-field frost depth). The board's middle lies on the section's right edge, a symmetry
/// plane, so the edge column is the column over the pipe.
pub fn board_trial(
    site: &Site,
    ground: &Undisturbed,
    pipe: &Pipe,
    board: &FrostBoard,
    winter: &Winter,
    width_m: f64,
) -> Result<BoardTrial, String> {
    let half = 0.5 * board.max_width_m + BOARD_SIDE_M;
    let t0 = winter.season_start_s;
    let design_start = t0 + BOARD_SPIN_UP_YEARS as f64 * YEAR_S;
    let depth = DEFAULT_RESOLUTION.depth_m.max(3.0 * pipe.depth_m);
    let mut model = base_model(site, winter, 2.0 * half, depth, design_start)?;
    let crown = pipe.cover_m();
    if width_m > 0.0 {
        let bottom = crown - board.gap_m;
        model.inclusions.push(Inclusion {
            x_min_m: half - 0.5 * width_m,
            x_max_m: half,
            z_min_m: bottom - board.thickness_m,
            z_max_m: bottom,
            material: Material::dry(board.conductivity_w_per_m_k, board.heat_capacity_j_per_m3_k)?,
        });
    }
    let res = Resolution {
        spin_up_step_s: BOARD_STEP_S,
        winter_step_s: BOARD_STEP_S,
        ..DEFAULT_RESOLUTION
    };
    let (_, run) = spin_up_and_winter(
        &model,
        ground,
        t0,
        BOARD_SPIN_UP_YEARS,
        &res,
        vec![(half, crown)],
        false,
    )?;
    Ok(BoardTrial {
        width_m,
        crown_min_c: run.probes_c[0].iter().copied().fold(f64::INFINITY, f64::min),
        frost_depth_m: run.frost_depth_m.iter().copied().fold(0.0, f64::max),
    })
}

/// Narrowest board width in `[0, max_width]` keeping the crown at or above 0 °C: Brent's method
/// over widths (the crown's lowest temperature rises with the width), each an engine run
/// ([`board_trial`]), until the bracket is within [`BOARD_TOLERANCE`] of the width.
pub fn board_search(
    site: &Site,
    ground: &Undisturbed,
    pipe: &Pipe,
    board: &FrostBoard,
    winter: &Winter,
) -> Result<BoardSearch, String> {
    let mut trials = Vec::new();
    let trial = |w: f64, trials: &mut Vec<BoardTrial>| -> Result<bool, String> {
        let t = board_trial(site, ground, pipe, board, winter, w)?;
        trials.push(t);
        Ok(t.crown_min_c >= 0.0)
    };
    if trial(0.0, &mut trials)? {
        return Ok(BoardSearch {
            width_m: Some(0.0),
            trials,
        });
    }
    if !trial(board.max_width_m, &mut trials)? {
        return Ok(BoardSearch {
            width_m: None,
            trials,
        });
    }
    // The crown's lowest temperature against the width, each new width one engine run (the two
    // ends are already in `trials`).
    let crown_min_c = |w: f64| -> Result<f64, String> {
        if let Some(t) = trials.iter().find(|t| t.width_m == w) {
            return Ok(t.crown_min_c);
        }
        let t = board_trial(site, ground, pipe, board, winter, w)?;
        trials.push(t);
        Ok(t.crown_min_c)
    };
    let tolerance = |w: f64| (BOARD_TOLERANCE * w).max(0.01);
    let bracket = roots::try_brent_bracket(crown_min_c, 0.0, board.max_width_m, tolerance)?
        .ok_or("the board search lost its bracket; the crown temperature is not finite")?;
    // The end that keeps the crown at or above 0 °C: the narrowest width known to be enough.
    let width = bracket.non_negative_end();
    trials.sort_by(|a, b| a.width_m.total_cmp(&b.width_m));
    Ok(BoardSearch {
        width_m: Some(width),
        trials,
    })
}
