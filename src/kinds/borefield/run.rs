//! `kind: borefield`: g-function of the field, borehole resistance, mean fluid temperatures over
//! the design life by temporal superposition, hydraulics, and the active length that keeps the
//! fluid inside its limits.
//!
//! The chain, for one active length H:
//! 1. ground along the boreholes: conductivity and heat capacity are the thickness-weighted means
//!    of the layers over [D, D + H] (layers act in parallel for the radial heat flow); the
//!    undisturbed temperature T₀ is the annual-mean undisturbed profile (geothermal gradient
//!    included) averaged over the same interval;
//! 2. g-function (`physics::gfunction`) on a uniform grid of ln(t/t_s), interpolated between
//!    grid points by cubic (Catmull–Rom) segments;
//! 3. borehole resistance: multipole R_b and R_a (`physics::borehole`) with pipe resistances
//!    from the film and wall at the lower fluid limit, and the effective R_b* of Hellström
//!    (1991), which grows with H² at fixed flow;
//! 4. loads per metre of borehole superposed on the step response g/(2πk)
//!    (`physics::superposition`): monthly means plus a peak pulse, or 8760 hourly values
//!    repeated every year (FFT convolution, exact);
//! 5. mean fluid temperature T_f = T_b + q' R_b*, inlet and outlet ± Q/(2ṁc_p).
//!
//! Sizing computes the g-function at [`SIZING_NODES`] lengths spread geometrically over the
//! search range and interpolates it in ln H (cubic Lagrange over the four nearest lengths) at
//! every trial length; the length found is then re-evaluated with its own g-function and
//! corrected once by the difference, so the figures reported always come from an exact
//! g-function at the reported length.

use super::AnnualGroundLoads;
use super::Borefield;
use super::BorefieldFluid;
use super::BorefieldGround;
use super::BorefieldResult;
use super::BorefieldSizing;
use super::BoreholeWall;
use super::FluidLimits;
use super::FluidMonth;
use super::FluidTemperatureFigures;
use super::GPoint;
use super::GroundLoads;
use super::HeatExchanger;
use super::LimitProximity;
use super::MonthlyLoadFigures;
use super::validate::SIZING_RANGE_M;
use crate::ground::profile::Undisturbed;
use crate::kinds::Outcome;
use crate::materials::fluids::Fluid;
use crate::model::{Site, SoilLayer};
use crate::numerics::roots;
use crate::numerics::time::{HOUR_S, HOURS_PER_MONTH, MONTH_S};
use crate::physics::borehole::{
    self, BoreholeResistances, Coaxial, DEFAULT_MULTIPOLE_ORDER, DoubleU, SingleU,
};
use crate::physics::gfunction::{self, WallCondition, characteristic_time_s};
use crate::physics::pipe_flow::{
    self, AnnulusWall, ChannelFlow, LAMINAR_LIMIT_RE, LaminarWall, TURBULENT_FROM_RE, TurbulentFriction,
    U_BEND_LOSS_COEFFICIENT,
};
use crate::physics::superposition::{
    self, BoreholeOperation, FluidTemperatures, MonthlyLoads, SampledStepResponse,
};
use crate::results::{Assumption, Check, Level, Warning};
use std::f64::consts::PI;

/// Lengths at which sizing computes the g-function before interpolating in ln H.
pub const SIZING_NODES: usize = 6;

/// Smallest safe margin between the coldest fluid and its freezing point, K (common practice,
/// no source).
pub const ANTIFREEZE_MARGIN_K: f64 = 3.0;

/// Widest spacing of the ln(t/t_s) grid of the g-function.
const MAX_TAU_STEP: f64 = 0.35;

/// Most grid points of one g-function (the uniform-wall-temperature cost grows with the square
/// of their number).
const MAX_TAU_POINTS: usize = 52;

/// Tolerance on the governing fluid temperature of a sized length, K.
const SIZING_TOLERANCE_K: f64 = 0.02;

/// A month whose peak comes within this of a fluid limit is marked as near it, K (for the
/// report's calendar of the design life; burrow's choice, listed in the assumptions).
pub const NEAR_LIMIT_K: f64 = 1.0;

/// A sized design meets its limits within this tolerance (the search closes within
/// [`SIZING_TOLERANCE_K`]; the check allows for the once-corrected g-function), K.
pub const SIZED_LIMIT_TOLERANCE_K: f64 = 0.1;

pub fn run(
    id: &str,
    b: &Borefield,
    site: &Site,
    ground: &Undisturbed,
) -> Result<Outcome<BorefieldResult>, String> {
    let design = Design::new(b, site, ground)?;
    let (length, sizing) = if b.size {
        let s = design.size()?;
        (s.length_m, Some(s))
    } else {
        (b.active_length_m, None)
    };
    let grid = design.tau_grid(&[length]);
    let curve = design.g_curve(length, &grid)?;
    let eval = design.evaluate(length, &curve)?;
    result(id, &design, length, &curve, &eval, sizing)
}

// ---------------------------------------------------------------------------------------------
// The fixed part of a design: everything that does not change with the active length
// ---------------------------------------------------------------------------------------------

/// A borefield study with its length-independent figures worked out.
pub struct Design<'a> {
    b: &'a Borefield,
    layers: &'a [SoilLayer],
    ground: &'a Undisturbed,
    loads: Loads,
    /// R_b and R_a of the cross-section (None when a measured R_b* is given).
    local: Option<BoreholeResistances>,
    /// ṁ c_p of one borehole at the lower fluid limit, W/K.
    flow_capacity_w_per_k: f64,
    mass_flow_kg_per_s: f64,
    /// Shortest time the superposition asks the step response for, s.
    shortest_time_s: f64,
    life_s: f64,
}

/// Ground loads of the whole field in a form the superposition uses, W (positive = to the
/// ground).
#[derive(Clone, Debug, PartialEq)]
#[allow(clippy::large_enum_variant)] // one value per study
pub enum Loads {
    Monthly {
        mean_w: [f64; 12],
        /// Load during the month's extraction peak (≤ the mean).
        extraction_peak_w: [f64; 12],
        /// Load during the month's injection peak (≥ the mean).
        injection_peak_w: [f64; 12],
        peak_duration_s: f64,
    },
    Hourly(Vec<f64>),
}

/// Ground-side monthly energies from building-side ones: the heat pump extracts
/// heating·(1 − 1/COP) from the ground and rejects cooling·(1 + 1/EER) to it (energy balance of
/// the heat pump; common practice, no source). Works for energies (J) and powers (W).
pub fn ground_from_building(heating: f64, cooling: f64, cop: f64, eer: f64) -> (f64, f64) {
    (heating * (1.0 - 1.0 / cop), cooling * (1.0 + 1.0 / eer))
}

impl Loads {
    pub fn from_model(loads: &GroundLoads) -> Loads {
        let monthly = |from: [f64; 12], to: [f64; 12], pe: [f64; 12], pi: [f64; 12], d: f64| {
            let mean: [f64; 12] = std::array::from_fn(|m| (to[m] - from[m]) / MONTH_S);
            Loads::Monthly {
                mean_w: mean,
                extraction_peak_w: std::array::from_fn(|m| {
                    if pe[m] > 0.0 {
                        (-pe[m]).min(mean[m])
                    } else {
                        mean[m]
                    }
                }),
                injection_peak_w: std::array::from_fn(
                    |m| if pi[m] > 0.0 { pi[m].max(mean[m]) } else { mean[m] },
                ),
                peak_duration_s: d,
            }
        };
        if let Some(g) = ground_side_months(loads) {
            return monthly(g.from_j, g.to_j, g.peak_from_w, g.peak_to_w, g.peak_duration_s);
        }
        match loads {
            GroundLoads::Monthly { .. } | GroundLoads::Building { .. } => unreachable!("handled above"),
            GroundLoads::Hourly { from_ground_w, .. } => {
                Loads::Hourly(from_ground_w.iter().map(|p| -p).collect())
            }
            GroundLoads::Constant { from_ground_w } => Loads::Monthly {
                mean_w: [-from_ground_w; 12],
                extraction_peak_w: [-from_ground_w; 12],
                injection_peak_w: [-from_ground_w; 12],
                peak_duration_s: MONTH_S,
            },
        }
    }

    /// Heat taken from and given to the ground in one year after netting within each month
    /// (what drives the ground), J.
    fn net_annual_j(&self) -> (f64, f64) {
        match self {
            Loads::Monthly { mean_w, .. } => mean_w.iter().fold((0.0, 0.0), |(e, i), q| {
                (e + (-q).max(0.0) * MONTH_S, i + q.max(0.0) * MONTH_S)
            }),
            Loads::Hourly(q) => q.iter().fold((0.0, 0.0), |(e, i), q| {
                (e + (-q).max(0.0) * HOUR_S, i + q.max(0.0) * HOUR_S)
            }),
        }
    }
}

/// Monthly loads on the ground side, January first: energies (J) and peaks (W) from and to the
/// ground; building loads turned into ground loads by the heat pump ([`ground_from_building`]).
pub struct GroundSideMonths {
    pub from_j: [f64; 12],
    pub to_j: [f64; 12],
    pub peak_from_w: [f64; 12],
    pub peak_to_w: [f64; 12],
    pub peak_duration_s: f64,
}

/// The ground side of monthly or building loads; `None` for hourly and constant loads.
pub fn ground_side_months(loads: &GroundLoads) -> Option<GroundSideMonths> {
    match loads {
        GroundLoads::Monthly {
            from_ground_j,
            to_ground_j,
            peak_from_ground_w,
            peak_to_ground_w,
            peak_duration_s,
        } => Some(GroundSideMonths {
            from_j: *from_ground_j,
            to_j: *to_ground_j,
            peak_from_w: *peak_from_ground_w,
            peak_to_w: *peak_to_ground_w,
            peak_duration_s: *peak_duration_s,
        }),
        GroundLoads::Building {
            heating_j,
            cooling_j,
            peak_heating_w,
            peak_cooling_w,
            cop,
            eer,
            peak_duration_s,
        } => {
            let e: [(f64, f64); 12] =
                std::array::from_fn(|m| ground_from_building(heating_j[m], cooling_j[m], *cop, *eer));
            let p: [(f64, f64); 12] = std::array::from_fn(|m| {
                ground_from_building(peak_heating_w[m], peak_cooling_w[m], *cop, *eer)
            });
            Some(GroundSideMonths {
                from_j: e.map(|x| x.0),
                to_j: e.map(|x| x.1),
                peak_from_w: p.map(|x| x.0),
                peak_to_w: p.map(|x| x.1),
                peak_duration_s: *peak_duration_s,
            })
        }
        GroundLoads::Hourly { .. } | GroundLoads::Constant { .. } => None,
    }
}

/// The ground loads month by month, gross, in MWh and kW (an hourly series summed and its
/// extremes taken per model month; a constant load the same every month).
pub fn monthly_loads(model: &GroundLoads) -> MonthlyLoadFigures {
    let mwh = |j: f64| j / (1e6 * HOUR_S);
    if let Some(g) = ground_side_months(model) {
        return MonthlyLoadFigures {
            from_ground_mwh: g.from_j.map(mwh),
            to_ground_mwh: g.to_j.map(mwh),
            peak_from_ground_kw: g.peak_from_w.map(|w| w / 1e3),
            peak_to_ground_kw: g.peak_to_w.map(|w| w / 1e3),
        };
    }
    match model {
        GroundLoads::Monthly { .. } | GroundLoads::Building { .. } => unreachable!("handled above"),
        GroundLoads::Hourly { from_ground_w, .. } => {
            let month = |m: usize| &from_ground_w[m * HOURS_PER_MONTH..(m + 1) * HOURS_PER_MONTH];
            MonthlyLoadFigures {
                from_ground_mwh: std::array::from_fn(|m| {
                    month(m).iter().map(|w| w.max(0.0)).sum::<f64>() / 1e6
                }),
                to_ground_mwh: std::array::from_fn(|m| {
                    month(m).iter().map(|w| (-w).max(0.0)).sum::<f64>() / 1e6
                }),
                peak_from_ground_kw: std::array::from_fn(|m| {
                    month(m).iter().fold(0.0_f64, |a, w| a.max(*w)) / 1e3
                }),
                peak_to_ground_kw: std::array::from_fn(|m| {
                    month(m).iter().fold(0.0_f64, |a, w| a.max(-w)) / 1e3
                }),
            }
        }
        GroundLoads::Constant { from_ground_w } => {
            let e = from_ground_w.abs() * MONTH_S;
            let (from, to) = if *from_ground_w >= 0.0 { (e, 0.0) } else { (0.0, e) };
            MonthlyLoadFigures {
                from_ground_mwh: [mwh(from); 12],
                to_ground_mwh: [mwh(to); 12],
                peak_from_ground_kw: [from_ground_w.max(0.0) / 1e3; 12],
                peak_to_ground_kw: [(-from_ground_w).max(0.0) / 1e3; 12],
            }
        }
    }
}

/// The year's ground loads, gross (as the loads give them, each direction of each month) and net
/// (the directions of a month netted, as the monthly means carry them).
pub fn annual_loads(model: &GroundLoads, loads: &Loads) -> AnnualGroundLoads {
    let mwh = |j: f64| j / (1e6 * HOUR_S);
    let (net_from, net_to) = loads.net_annual_j();
    let months = |from: &[f64; 12], to: &[f64; 12]| {
        (
            from.iter().sum::<f64>(),
            to.iter().sum::<f64>(),
            from.iter()
                .zip(to)
                .filter(|(f, t)| **f > 0.0 && **t > 0.0)
                .count(),
        )
    };
    let (gross_from, gross_to, netted) = match ground_side_months(model) {
        Some(g) => months(&g.from_j, &g.to_j),
        None => (net_from, net_to, 0),
    };
    AnnualGroundLoads {
        from_ground_mwh: mwh(gross_from),
        to_ground_mwh: mwh(gross_to),
        net_from_ground_mwh: mwh(net_from),
        net_to_ground_mwh: mwh(net_to),
        netted_months: netted,
    }
}

/// The ground along the active length.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct GroundAlong {
    pub conductivity_w_per_m_k: f64,
    pub heat_capacity_j_per_m3_k: f64,
    pub undisturbed_c: f64,
}

impl GroundAlong {
    pub fn diffusivity_m2_per_s(&self) -> f64 {
        self.conductivity_w_per_m_k / self.heat_capacity_j_per_m3_k
    }
}

/// Thickness-weighted mean conductivity and heat capacity of the unfrozen layers over
/// [top, bottom] (m below the surface).
pub fn layer_means(layers: &[SoilLayer], top_m: f64, bottom_m: f64) -> (f64, f64) {
    let (mut z, mut k, mut c, mut w) = (0.0, 0.0, 0.0, 0.0);
    for l in layers {
        let t = l.thickness_m.unwrap_or(f64::INFINITY);
        let overlap = (z + t).min(bottom_m) - z.max(top_m);
        if overlap > 0.0 {
            k += overlap * l.conductivity_w_per_m_k;
            c += overlap * l.heat_capacity_j_per_m3_k;
            w += overlap;
        }
        z += t;
    }
    (k / w, c / w)
}

/// A g-function on a uniform grid of τ = ln(t/t_s), read between points by Catmull–Rom cubics.
#[derive(Clone, Debug, PartialEq)]
pub struct GCurve {
    pub tau0: f64,
    pub dtau: f64,
    pub g: Vec<f64>,
}

impl GCurve {
    pub fn taus(&self) -> Vec<f64> {
        (0..self.g.len())
            .map(|i| self.tau0 + i as f64 * self.dtau)
            .collect()
    }

    /// g at τ; outside the grid the end value is held (the grid is built to cover every time
    /// the study asks for).
    pub fn at(&self, tau: f64) -> f64 {
        let n = self.g.len();
        let x = (tau - self.tau0) / self.dtau;
        if n == 1 || x <= 0.0 {
            return self.g[0];
        }
        if x >= (n - 1) as f64 {
            return self.g[n - 1];
        }
        let i = x.floor() as isize;
        let u = x - i as f64;
        let p = |k: isize| self.g[k.clamp(0, n as isize - 1) as usize];
        let (p0, p1, p2, p3) = (p(i - 1), p(i), p(i + 1), p(i + 2));
        0.5 * (2.0 * p1
            + (p2 - p0) * u
            + (2.0 * p0 - 5.0 * p1 + 4.0 * p2 - p3) * u * u
            + (3.0 * p1 - p0 - 3.0 * p2 + p3) * u * u * u)
    }
}

/// A uniform τ grid.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct TauGrid {
    pub tau0: f64,
    pub dtau: f64,
    pub points: usize,
}

/// Mean fluid temperatures over the design life at one length.
#[derive(Clone, Debug, PartialEq)]
pub struct Evaluation {
    pub ground: GroundAlong,
    pub resistance_m_k_per_w: f64,
    pub months: Vec<FluidMonth>,
}

impl Evaluation {
    pub fn min_c(&self) -> f64 {
        self.months.iter().map(|m| m.min_c).fold(f64::INFINITY, f64::min)
    }
    pub fn max_c(&self) -> f64 {
        self.months
            .iter()
            .map(|m| m.max_c)
            .fold(f64::NEG_INFINITY, f64::max)
    }
}

impl<'a> Design<'a> {
    pub fn new(b: &'a Borefield, site: &'a Site, ground: &'a Undisturbed) -> Result<Self, String> {
        let t = b.min_fluid_c;
        let fluid = &b.fluid;
        fluid.check_temperature(t)?;
        let mass_flow = fluid.density_kg_per_m3(t) * b.flow_per_borehole_m3_per_s;
        let capacity = mass_flow * fluid.specific_heat_j_per_kg_k(t);
        let local = match b.measured_resistance_m_k_per_w {
            Some(_) => None,
            None => Some(local_resistances(b, site, fluid, t, mass_flow)?),
        };
        let loads = Loads::from_model(&b.loads);
        let shortest = match &loads {
            Loads::Monthly { peak_duration_s, .. } => peak_duration_s.min(HOUR_S),
            Loads::Hourly(_) => HOUR_S,
        };
        Ok(Design {
            b,
            layers: &site.ground.layers,
            ground,
            loads,
            local,
            flow_capacity_w_per_k: capacity,
            mass_flow_kg_per_s: mass_flow,
            shortest_time_s: shortest,
            life_s: b.design_life_months as f64 * MONTH_S,
        })
    }

    /// The ground along an active length `h_m`.
    pub fn ground_along(&self, h_m: f64) -> GroundAlong {
        let (top, bottom) = (self.b.top_depth_m, self.b.top_depth_m + h_m);
        let (k, c) = layer_means(self.layers, top, bottom);
        // Simpson's rule over 40 intervals of the annual-mean undisturbed profile.
        let n = 40;
        let dz = (bottom - top) / n as f64;
        let sum: f64 = (0..=n)
            .map(|i| {
                let w = if i == 0 || i == n {
                    1.0
                } else if i % 2 == 1 {
                    4.0
                } else {
                    2.0
                };
                w * self.ground.envelope_at(top + i as f64 * dz).0
            })
            .sum();
        GroundAlong {
            conductivity_w_per_m_k: self.b.ground_conductivity_w_per_m_k.unwrap_or(k),
            heat_capacity_j_per_m3_k: c,
            undisturbed_c: sum * dz / 3.0 / (bottom - top),
        }
    }

    /// Effective borehole resistance R_b* at active length `h_m`, m K/W.
    pub fn effective_resistance(&self, h_m: f64) -> Result<f64, String> {
        let Some(local) = self.local else {
            return Ok(self.b.measured_resistance_m_k_per_w.unwrap_or_default());
        };
        let (rb, ra, c) = (
            local.borehole_m_k_per_w,
            local.internal_m_k_per_w,
            self.flow_capacity_w_per_k,
        );
        match (self.b.exchanger, self.b.wall_condition) {
            (HeatExchanger::Coaxial { .. }, _) | (_, BoreholeWall::UniformHeatFlux) => {
                borehole::effective_resistance_uniform_flux(rb, ra, h_m, c)
            }
            (_, BoreholeWall::UniformTemperature) => {
                borehole::effective_resistance_uniform_wall_temperature(rb, ra, h_m, c)
            }
        }
    }

    /// A τ grid covering, for every length in `lengths_m`, the shortest time the superposition
    /// needs and the design life, and at least Eskilson's range −10..3.
    pub fn tau_grid(&self, lengths_m: &[f64]) -> TauGrid {
        let (mut lo, mut hi) = (-10.0_f64, 3.0_f64);
        for &h in lengths_m {
            let ts = characteristic_time_s(h, self.ground_along(h).diffusivity_m2_per_s());
            lo = lo.min((0.99 * self.shortest_time_s / ts).ln());
            hi = hi.max((1.01 * self.life_s / ts).ln());
        }
        let dtau = ((hi - lo) / (MAX_TAU_POINTS - 1) as f64).max(MAX_TAU_STEP);
        let points = ((hi - lo) / dtau).ceil() as usize + 1;
        TauGrid {
            tau0: lo,
            dtau,
            points,
        }
    }

    /// Eskilson's time scale H²/(9α) at active length `h_m`, s.
    pub fn time_scale_s(&self, h_m: f64) -> f64 {
        characteristic_time_s(h_m, self.ground_along(h_m).diffusivity_m2_per_s())
    }

    /// The g-function of the field at active length `h_m` on `grid`.
    pub fn g_curve(&self, h_m: f64, grid: &TauGrid) -> Result<GCurve, String> {
        let alpha = self.ground_along(h_m).diffusivity_m2_per_s();
        let ts = self.time_scale_s(h_m);
        let times: Vec<f64> = (0..grid.points)
            .map(|i| ts * (grid.tau0 + i as f64 * grid.dtau).exp())
            .collect();
        let field: Vec<gfunction::Borehole> = self
            .b
            .positions_m
            .iter()
            .map(|&(x, y)| gfunction::Borehole {
                x_m: x,
                y_m: y,
                length_m: h_m,
                buried_depth_m: self.b.top_depth_m,
                radius_m: self.b.borehole_radius_m,
            })
            .collect();
        let condition = match self.b.wall_condition {
            BoreholeWall::UniformTemperature => WallCondition::UniformTemperature {
                segments: self.b.segments,
            },
            BoreholeWall::UniformHeatFlux => WallCondition::UniformHeatFlux,
        };
        Ok(GCurve {
            tau0: grid.tau0,
            dtau: grid.dtau,
            g: gfunction::gfunction(&field, alpha, &times, condition)?,
        })
    }

    /// Mean fluid temperatures over the design life at active length `h_m` with g-function
    /// `curve` (for that length).
    pub fn evaluate(&self, h_m: f64, curve: &GCurve) -> Result<Evaluation, String> {
        let ground = self.ground_along(h_m);
        let resistance = self.effective_resistance(h_m)?;
        let ts = characteristic_time_s(h_m, ground.diffusivity_m2_per_s());
        let two_pi_k = 2.0 * PI * ground.conductivity_w_per_m_k;
        let step = |t: f64| curve.at((t / ts).ln()) / two_pi_k;
        let operation = BoreholeOperation {
            undisturbed_c: ground.undisturbed_c,
            resistance_m_k_per_w: resistance,
            length_m: h_m,
            flow_capacity_w_per_k: self.flow_capacity_w_per_k,
        };
        let per_metre = 1.0 / (self.b.positions_m.len() as f64 * h_m);
        let months = self.b.design_life_months;
        let rows = match &self.loads {
            Loads::Monthly {
                mean_w,
                extraction_peak_w,
                injection_peak_w,
                peak_duration_s,
            } => {
                let series = |values: &[f64; 12]| -> Vec<f64> {
                    (0..months).map(|m| values[m % 12] * per_metre).collect()
                };
                let run = |peaks: &[f64; 12]| {
                    superposition::monthly_fluid_temperatures(
                        &MonthlyLoads {
                            mean_w_per_m: series(mean_w),
                            peak_w_per_m: series(peaks),
                            peak_duration_s: *peak_duration_s,
                        },
                        &step,
                        &operation,
                    )
                };
                let cold = run(extraction_peak_w)?;
                let warm = run(injection_peak_w)?;
                cold.iter()
                    .zip(&warm)
                    .enumerate()
                    .map(|(m, (c, w))| {
                        let states = [c.mean, c.peak, w.peak];
                        FluidMonth {
                            month: m + 1,
                            mean_c: c.mean.mean_c,
                            min_c: c.peak.mean_c.min(c.mean.mean_c),
                            max_c: w.peak.mean_c.max(c.mean.mean_c),
                            wall_c: c.mean.wall_c,
                            inlet_min_c: states.iter().map(coldest).fold(f64::INFINITY, f64::min),
                            inlet_max_c: states.iter().map(warmest).fold(f64::NEG_INFINITY, f64::max),
                        }
                    })
                    .collect()
            }
            Loads::Hourly(values) => {
                let steps = months * HOURS_PER_MONTH;
                let q: Vec<f64> = (0..steps).map(|k| values[k % values.len()] * per_metre).collect();
                let sampled = SampledStepResponse::new(&step, HOUR_S, steps)?;
                let hours = superposition::fluid_temperature_series(&q, &sampled, &operation)?;
                hours
                    .chunks(HOURS_PER_MONTH)
                    .enumerate()
                    .map(|(m, chunk)| month_of_hours(m, chunk))
                    .collect()
            }
        };
        Ok(Evaluation {
            ground,
            resistance_m_k_per_w: resistance,
            months: rows,
        })
    }
}

fn coldest(s: &FluidTemperatures) -> f64 {
    s.inlet_c.min(s.outlet_c)
}

fn warmest(s: &FluidTemperatures) -> f64 {
    s.inlet_c.max(s.outlet_c)
}

fn month_of_hours(m: usize, chunk: &[FluidTemperatures]) -> FluidMonth {
    let n = chunk.len() as f64;
    FluidMonth {
        month: m + 1,
        mean_c: chunk.iter().map(|s| s.mean_c).sum::<f64>() / n,
        min_c: chunk.iter().map(|s| s.mean_c).fold(f64::INFINITY, f64::min),
        max_c: chunk.iter().map(|s| s.mean_c).fold(f64::NEG_INFINITY, f64::max),
        wall_c: chunk.iter().map(|s| s.wall_c).sum::<f64>() / n,
        inlet_min_c: chunk.iter().map(coldest).fold(f64::INFINITY, f64::min),
        inlet_max_c: chunk.iter().map(warmest).fold(f64::NEG_INFINITY, f64::max),
    }
}

// ---------------------------------------------------------------------------------------------
// The borehole cross-section and the loop's hydraulics
// ---------------------------------------------------------------------------------------------

/// The flows in one borehole: the U legs (or the coaxial inner pipe) and the coaxial annulus.
struct Channels {
    tube: ChannelFlow,
    annulus: Option<ChannelFlow>,
}

fn channels(
    ex: &HeatExchanger,
    fluid: &Fluid,
    t_c: f64,
    mass_flow_kg_per_s: f64,
) -> Result<Channels, String> {
    Ok(match ex {
        HeatExchanger::SingleU { pipe, .. } => Channels {
            tube: pipe_flow::tube_flow(fluid, t_c, mass_flow_kg_per_s, pipe.inner_diameter_m())?,
            annulus: None,
        },
        // Two circuits in parallel share the flow equally.
        HeatExchanger::DoubleU { pipe, .. } => Channels {
            tube: pipe_flow::tube_flow(fluid, t_c, 0.5 * mass_flow_kg_per_s, pipe.inner_diameter_m())?,
            annulus: None,
        },
        HeatExchanger::Coaxial { inner, outer } => Channels {
            tube: pipe_flow::tube_flow(fluid, t_c, mass_flow_kg_per_s, inner.inner_diameter_m())?,
            annulus: Some(pipe_flow::annulus_flow(
                fluid,
                t_c,
                mass_flow_kg_per_s,
                inner.outer_diameter_m,
                outer.inner_diameter_m(),
            )?),
        },
    })
}

/// R_b and R_a of the borehole cross-section with the fluid at `t_c`.
fn local_resistances(
    b: &Borefield,
    site: &Site,
    fluid: &Fluid,
    t_c: f64,
    mass_flow_kg_per_s: f64,
) -> Result<BoreholeResistances, String> {
    let flows = channels(&b.exchanger, fluid, t_c, mass_flow_kg_per_s)?;
    // The grout's multipole field sees the ground beside the boreholes: the conductivity of the
    // layers over the starting length (a measured value when given).
    let ground_k = b.ground_conductivity_w_per_m_k.unwrap_or_else(|| {
        layer_means(
            &site.ground.layers,
            b.top_depth_m,
            b.top_depth_m + b.active_length_m,
        )
        .0
    });
    let rb = b.borehole_radius_m;
    match b.exchanger {
        HeatExchanger::SingleU {
            pipe,
            shank_spacing_m,
        }
        | HeatExchanger::DoubleU {
            pipe,
            shank_spacing_m,
            ..
        } => {
            let rp = pipe_flow::pipe_resistance_m_k_per_w(
                &flows.tube,
                LaminarWall::UniformTemperature,
                0.5 * pipe.inner_diameter_m(),
                0.5 * pipe.outer_diameter_m,
                pipe.conductivity_w_per_m_k,
            )?;
            match b.exchanger {
                HeatExchanger::DoubleU { pairing, .. } => DoubleU {
                    borehole_radius_m: rb,
                    pipe_outer_radius_m: 0.5 * pipe.outer_diameter_m,
                    shank_spacing_m,
                    grout_conductivity_w_per_m_k: b.grout_conductivity_w_per_m_k,
                    ground_conductivity_w_per_m_k: ground_k,
                    pipe_resistance_m_k_per_w: rp,
                    pairing,
                }
                .resistances(DEFAULT_MULTIPOLE_ORDER),
                _ => SingleU {
                    borehole_radius_m: rb,
                    pipe_outer_radius_m: 0.5 * pipe.outer_diameter_m,
                    shank_spacing_m,
                    grout_conductivity_w_per_m_k: b.grout_conductivity_w_per_m_k,
                    ground_conductivity_w_per_m_k: ground_k,
                    pipe_resistance_m_k_per_w: rp,
                }
                .resistances(DEFAULT_MULTIPOLE_ORDER),
            }
        }
        HeatExchanger::Coaxial { inner, outer } => {
            let annulus = flows.annulus.ok_or("a coaxial borehole has an annulus flow")?;
            let h_of = |nu: f64, flow: &ChannelFlow| {
                pipe_flow::heat_transfer_coefficient_w_m2_k(
                    nu,
                    flow.conductivity_w_per_m_k,
                    flow.hydraulic_diameter_m,
                )
            };
            let ratio = inner.outer_diameter_m / outer.inner_diameter_m();
            let nu_tube = pipe_flow::nusselt_tube(
                flows.tube.reynolds,
                flows.tube.prandtl,
                LaminarWall::UniformTemperature,
            )?;
            let nu_in =
                pipe_flow::nusselt_annulus(annulus.reynolds, annulus.prandtl, ratio, AnnulusWall::Inner)?;
            let nu_out =
                pipe_flow::nusselt_annulus(annulus.reynolds, annulus.prandtl, ratio, AnnulusWall::Outer)?;
            Coaxial {
                borehole_radius_m: rb,
                inner_pipe_inner_radius_m: 0.5 * inner.inner_diameter_m(),
                inner_pipe_outer_radius_m: 0.5 * inner.outer_diameter_m,
                inner_pipe_conductivity_w_per_m_k: inner.conductivity_w_per_m_k,
                outer_pipe_inner_radius_m: 0.5 * outer.inner_diameter_m(),
                outer_pipe_outer_radius_m: 0.5 * outer.outer_diameter_m,
                outer_pipe_conductivity_w_per_m_k: outer.conductivity_w_per_m_k,
                grout_conductivity_w_per_m_k: b.grout_conductivity_w_per_m_k,
                h_inner_pipe_w_m2_k: h_of(nu_tube, &flows.tube)?,
                h_annulus_inner_wall_w_m2_k: h_of(nu_in, &annulus)?,
                h_annulus_outer_wall_w_m2_k: h_of(nu_out, &annulus)?,
            }
            .resistances()
        }
    }
}

/// Pressure drop and the slowest channel's Reynolds number of one borehole loop.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Hydraulics {
    pub pressure_drop_pa: f64,
    pub reynolds: f64,
}

/// Darcy–Weisbach with the Colebrook friction factor over the developed length from the surface
/// to the foot and back, plus the U-bend (or the coaxial turn) at the foot.
fn hydraulics(b: &Borefield, t_c: f64, mass_flow_kg_per_s: f64, length_m: f64) -> Result<Hydraulics, String> {
    let flows = channels(&b.exchanger, &b.fluid, t_c, mass_flow_kg_per_s)?;
    let depth = b.top_depth_m + length_m;
    let drop = |flow: &ChannelFlow, roughness_m: f64, path_m: f64, local: f64| -> Result<f64, String> {
        let f = pipe_flow::darcy_friction_factor(
            flow.reynolds,
            roughness_m / flow.hydraulic_diameter_m,
            TurbulentFriction::Colebrook,
        )?;
        pipe_flow::loop_pressure_drop_pa(flow, f, path_m, local)
    };
    Ok(match (&b.exchanger, &flows.annulus) {
        (HeatExchanger::SingleU { pipe, .. } | HeatExchanger::DoubleU { pipe, .. }, _) => Hydraulics {
            pressure_drop_pa: drop(
                &flows.tube,
                pipe.roughness_m,
                2.0 * depth,
                U_BEND_LOSS_COEFFICIENT,
            )?,
            reynolds: flows.tube.reynolds,
        },
        (HeatExchanger::Coaxial { inner, outer }, Some(annulus)) => Hydraulics {
            pressure_drop_pa: drop(&flows.tube, inner.roughness_m, depth, U_BEND_LOSS_COEFFICIENT)?
                + drop(annulus, outer.roughness_m, depth, 0.0)?,
            reynolds: flows.tube.reynolds.min(annulus.reynolds),
        },
        _ => return Err("a coaxial borehole has an annulus flow".into()),
    })
}

// ---------------------------------------------------------------------------------------------
// Sizing
// ---------------------------------------------------------------------------------------------

/// The sized length and how it was found.
#[derive(Clone, Debug, PartialEq)]
pub struct Sized {
    pub length_m: f64,
    pub governing: &'static str,
    pub length_for_min_m: f64,
    pub length_for_max_m: f64,
    pub node_lengths_m: Vec<f64>,
}

/// g-functions computed at `nodes` (ascending lengths, all on one τ grid), interpolated to
/// other lengths by cubic Lagrange polynomials in ln H over the four nearest lengths, at equal
/// physical time t (not equal t/t_s): the onset of interaction between boreholes, which sits at
/// t ≈ B²/α whatever the length, then stays put between the nodes, and only the slower end
/// effects move.
pub struct GInterpolator {
    ln_nodes: Vec<f64>,
    /// ln t_s of each node, s.
    ln_ts: Vec<f64>,
    curves: Vec<GCurve>,
}

impl GInterpolator {
    /// `ts_s[i]` is Eskilson's time scale of `nodes[i]` (which carries the ground along it).
    pub fn new(nodes: &[f64], ts_s: &[f64], curves: Vec<GCurve>) -> Self {
        GInterpolator {
            ln_nodes: nodes.iter().map(|h| h.ln()).collect(),
            ln_ts: ts_s.iter().map(|t| t.ln()).collect(),
            curves,
        }
    }

    /// The g-function at length `h_m` with time scale `ts_s`, on the nodes' τ grid.
    pub fn at(&self, h_m: f64, ts_s: f64) -> GCurve {
        let x = h_m.ln();
        let n = self.ln_nodes.len();
        let k = self.ln_nodes.iter().rposition(|&l| l <= x).unwrap_or(0);
        let start = k.saturating_sub(1).min(n.saturating_sub(4));
        let idx: Vec<usize> = (start..(start + 4).min(n)).collect();
        let weights: Vec<f64> = idx
            .iter()
            .map(|&i| {
                idx.iter()
                    .filter(|&&j| j != i)
                    .map(|&j| (x - self.ln_nodes[j]) / (self.ln_nodes[i] - self.ln_nodes[j]))
                    .product()
            })
            .collect();
        let first = &self.curves[0];
        let ln_ts = ts_s.ln();
        GCurve {
            tau0: first.tau0,
            dtau: first.dtau,
            g: first
                .taus()
                .iter()
                .map(|tau| {
                    // ln t = τ + ln t_s, the same t for every node.
                    idx.iter()
                        .zip(&weights)
                        .map(|(&i, w)| w * self.curves[i].at(tau + ln_ts - self.ln_ts[i]))
                        .sum()
                })
                .collect(),
        }
    }
}

impl Design<'_> {
    /// Lengths at which sizing computes the g-function: geometric over the search range.
    pub fn sizing_nodes() -> Vec<f64> {
        let (lo, hi) = SIZING_RANGE_M;
        (0..SIZING_NODES)
            .map(|i| lo * (hi / lo).powf(i as f64 / (SIZING_NODES - 1) as f64))
            .collect()
    }

    /// The shortest active length in [`SIZING_RANGE_M`] whose mean fluid temperature stays within
    /// both limits over the design life.
    pub fn size(&self) -> Result<Sized, String> {
        let nodes = Self::sizing_nodes();
        let grid = self.tau_grid(&nodes);
        let curves = nodes
            .iter()
            .map(|&h| self.g_curve(h, &grid))
            .collect::<Result<Vec<_>, _>>()?;
        let ts: Vec<f64> = nodes.iter().map(|&h| self.time_scale_s(h)).collect();
        let interp = GInterpolator::new(&nodes, &ts, curves);
        let b = self.b;
        // Margins: ≥ 0 when the limit is met.
        let margins = |e: &Evaluation| [e.min_c() - b.min_fluid_c, b.max_fluid_c - e.max_c()];
        let approx = |h: f64| -> Result<[f64; 2], String> {
            Ok(margins(&self.evaluate(h, &interp.at(h, self.time_scale_s(h)))?))
        };
        let (lo, hi) = SIZING_RANGE_M;
        let scan: Vec<f64> = (0..=16).map(|i| lo * (hi / lo).powf(i as f64 / 16.0)).collect();
        let scanned = scan.iter().map(|&h| approx(h)).collect::<Result<Vec<_>, _>>()?;
        let mut needed = [lo; 2];
        for limit in 0..2 {
            let Some(k) = scanned.iter().position(|m| m[limit] >= 0.0) else {
                let last = scanned[scanned.len() - 1];
                let (which, value, bound) = if limit == 0 {
                    ("lowest", b.min_fluid_c - last[0], b.min_fluid_c)
                } else {
                    ("highest", b.max_fluid_c - last[1], b.max_fluid_c)
                };
                return Err(format!(
                    "no active length from {lo} to {hi} m keeps the mean fluid temperature within its limits: at {hi} m the {which} mean fluid temperature is {value:.2} °C against the limit of {bound} °C; add boreholes, widen the spacing, balance the loads or relax the limit"
                ));
            };
            if k > 0 {
                needed[limit] =
                    length_where_margin_vanishes(scan[k - 1], scan[k], |h| Ok(approx(h)?[limit]))?;
            }
        }
        let governing = if needed[0] <= lo && needed[1] <= lo {
            None
        } else if needed[0] >= needed[1] {
            Some(0)
        } else {
            Some(1)
        };
        let mut length = needed[0].max(needed[1]);
        if let Some(limit) = governing {
            // One correction with the exact g-function at the length found: shift the
            // interpolated margin by its error there and solve again.
            let exact_grid = self.tau_grid(&[length]);
            let exact = margins(&self.evaluate(length, &self.g_curve(length, &exact_grid)?)?)[limit];
            let offset = exact - approx(length)?[limit];
            if exact.abs() > SIZING_TOLERANCE_K {
                let (a, c) = if exact < 0.0 { (length, hi) } else { (lo, length) };
                let shifted = |h: f64| Ok(approx(h)?[limit] + offset);
                if shifted(a)? * shifted(c)? < 0.0 {
                    length = length_where_margin_vanishes(a, c, shifted)?;
                }
            }
        }
        Ok(Sized {
            length_m: length,
            governing: match governing {
                None => "none",
                Some(0) => "cold-side",
                Some(_) => "warm-side",
            },
            length_for_min_m: needed[0],
            length_for_max_m: needed[1],
            node_lengths_m: nodes,
        })
    }
}

/// The length in [a, b] where the margin `f` (≥ 0 when the limit is met) crosses zero, to 1 mm:
/// the end of Brent's final bracket on the side where the limit is met.
fn length_where_margin_vanishes(
    a: f64,
    b: f64,
    f: impl Fn(f64) -> Result<f64, String>,
) -> Result<f64, String> {
    let bracket = roots::try_brent_bracket(f, a, b, |_| 1e-3)?.ok_or_else(|| {
        format!("the fluid temperature margin does not change sign between {a:.1} and {b:.1} m")
    })?;
    Ok(bracket.non_negative_end())
}

// ---------------------------------------------------------------------------------------------
// Results
// ---------------------------------------------------------------------------------------------

fn result(
    id: &str,
    d: &Design,
    length: f64,
    curve: &GCurve,
    e: &Evaluation,
    sized: Option<Sized>,
) -> Result<Outcome<BorefieldResult>, String> {
    let b = d.b;
    let n = b.positions_m.len();
    let months = &e.months;
    let year = |rows: &[FluidMonth]| {
        (
            rows.iter().map(|m| m.min_c).fold(f64::INFINITY, f64::min),
            rows.iter().map(|m| m.max_c).fold(f64::NEG_INFINITY, f64::max),
            rows.iter().map(|m| m.wall_c).sum::<f64>() / rows.len() as f64,
        )
    };
    let first = year(&months[..12]);
    let last = year(&months[months.len() - 12..]);
    let coldest = months.iter().map(|m| m.inlet_min_c).fold(f64::INFINITY, f64::min);
    let warmest = months
        .iter()
        .map(|m| m.inlet_max_c)
        .fold(f64::NEG_INFINITY, f64::max);
    let (lo, hi) = b.fluid.valid_temperature_range_c();
    let hydraulic_t = coldest.clamp(lo, hi);
    let hyd = hydraulics(b, hydraulic_t, d.mass_flow_kg_per_s, length)?;
    let volume_flow_field = b.flow_per_borehole_m3_per_s * n as f64;
    let pumping = pipe_flow::pumping_power_w(hyd.pressure_drop_pa, volume_flow_field, b.pump_efficiency)?;
    let freezing = b.fluid.freezing_point_c();
    let regime = if hyd.reynolds < LAMINAR_LIMIT_RE {
        "laminar"
    } else if hyd.reynolds < TURBULENT_FROM_RE {
        "transitional"
    } else {
        "turbulent"
    };
    let t_p = b.min_fluid_c;
    let figures = FluidTemperatureFigures {
        min_c: e.min_c(),
        max_c: e.max_c(),
        first_year_min_c: first.0,
        first_year_max_c: first.1,
        last_year_min_c: last.0,
        last_year_max_c: last.1,
    };
    let sized_run = sized.is_some();
    let annual = annual_loads(&b.loads, &d.loads);
    let mut warnings = Vec::new();
    let mut warn = |level, code: &str, message: String| {
        warnings.push(Warning {
            study: Some(id.to_string()),
            level,
            code: code.into(),
            message,
        })
    };
    let margin = coldest - freezing;
    let tolerance = if sized.is_some() {
        SIZED_LIMIT_TOLERANCE_K
    } else {
        0.0
    };
    let checks = vec![
        Check::new(
            "borefield.min_fluid",
            figures.min_c >= b.min_fluid_c - tolerance,
            Some(figures.min_c),
            Some(b.min_fluid_c),
            "°C",
            if figures.min_c >= b.min_fluid_c - tolerance {
                format!(
                    "the coldest mean fluid temperature, {:.2} °C, meets the lower limit of {} °C",
                    figures.min_c, b.min_fluid_c
                )
            } else {
                format!(
                    "the coldest mean fluid temperature, {:.2} °C, is below the lower limit of {} °C",
                    figures.min_c, b.min_fluid_c
                )
            },
        ),
        Check::new(
            "borefield.max_fluid",
            figures.max_c <= b.max_fluid_c + tolerance,
            Some(figures.max_c),
            Some(b.max_fluid_c),
            "°C",
            if figures.max_c <= b.max_fluid_c + tolerance {
                format!(
                    "the warmest mean fluid temperature, {:.2} °C, meets the upper limit of {} °C",
                    figures.max_c, b.max_fluid_c
                )
            } else {
                format!(
                    "the warmest mean fluid temperature, {:.2} °C, is above the upper limit of {} °C",
                    figures.max_c, b.max_fluid_c
                )
            },
        ),
        Check::new(
            "borefield.antifreeze_margin",
            margin >= ANTIFREEZE_MARGIN_K,
            Some(margin),
            Some(ANTIFREEZE_MARGIN_K),
            "K",
            if margin >= ANTIFREEZE_MARGIN_K {
                format!(
                    "the coldest fluid stays {margin:.1} K above the freezing point of the {} (at least {ANTIFREEZE_MARGIN_K} K)",
                    fluid_name(&b.fluid)
                )
            } else {
                format!(
                    "the coldest fluid comes within {margin:.1} K of the freezing point of the {} (keep at least {ANTIFREEZE_MARGIN_K} K)",
                    fluid_name(&b.fluid)
                )
            },
        ),
    ];
    if !checks[2].passed {
        let message = if margin < 0.0 {
            format!(
                "the fluid would freeze: the coldest fluid, {coldest:.1} °C at the field inlet during the extraction peak, is {:.1} K below the freezing point of the {} ({freezing:.1} °C); raise the antifreeze concentration, lengthen the boreholes, add boreholes or lower the peak, so that the coldest fluid stays at least {ANTIFREEZE_MARGIN_K} K above freezing (common practice)",
                -margin,
                fluid_name(&b.fluid)
            )
        } else {
            format!(
                "the coldest fluid, {coldest:.1} °C at the field inlet during the extraction peak, is only {margin:.1} K above the freezing point of the {} ({freezing:.1} °C); keep at least {ANTIFREEZE_MARGIN_K} K (common practice): raise the antifreeze concentration, lengthen the boreholes or lower the peak",
                fluid_name(&b.fluid)
            )
        };
        warn(Level::Danger, "borefield.antifreeze_margin", message);
    }
    // Failing the study's own limit is a danger, not a caution.
    if !checks[0].passed {
        warn(
            Level::Danger,
            "borefield.limit_exceeded",
            format!(
                "the mean fluid temperature falls to {:.2} °C, {:.2} K below the lower limit of {} °C: lengthen the boreholes, add boreholes or lower the heat taken from the ground",
                figures.min_c,
                b.min_fluid_c - figures.min_c,
                b.min_fluid_c
            ),
        );
    }
    if !checks[1].passed {
        warn(
            Level::Danger,
            "borefield.limit_exceeded",
            format!(
                "the mean fluid temperature rises to {:.2} °C, {:.2} K above the upper limit of {} °C: lengthen the boreholes, add boreholes or lower the heat given to the ground",
                figures.max_c,
                figures.max_c - b.max_fluid_c,
                b.max_fluid_c
            ),
        );
    }
    if annual.netted_months > 0 {
        warn(
            Level::Info,
            "borefield.netted_months",
            format!(
                "in {} month(s) heat flows both from and to the ground; the monthly mean nets the two ({:.1} MWh from and {:.1} MWh to the ground in a year, gross; {:.1} and {:.1} MWh net), which is exact for the mean, and each direction's peak is superposed on the net base",
                annual.netted_months,
                annual.from_ground_mwh,
                annual.to_ground_mwh,
                annual.net_from_ground_mwh,
                annual.net_to_ground_mwh
            ),
        );
    }
    if hydraulic_t != coldest {
        warn(
            Level::Caution,
            "borefield.fluid_properties_out_of_range",
            format!(
                "the coldest fluid, {coldest:.1} °C, lies outside the range where the properties of the {} are valid ({lo:.1} to {hi:.1} °C): the pressure drop and the flow regime were taken at {hydraulic_t:.1} °C, the edge of that range, and are not reliable",
                fluid_name(&b.fluid)
            ),
        );
    }
    if hyd.reynolds < LAMINAR_LIMIT_RE {
        warn(
            Level::Caution,
            "borefield.laminar_flow",
            format!(
                "the flow is laminar at the coldest fluid (Re = {:.0}, below {LAMINAR_LIMIT_RE}): the film resistance is high and the borehole resistance with it; raise the flow per borehole, use a smaller pipe or less antifreeze",
                hyd.reynolds
            ),
        );
    }
    if let Some(s) = &sized
        && s.governing == "none"
    {
        warn(
            Level::Info,
            "borefield.shortest_length",
            format!(
                "the shortest length searched, {} m, already keeps the fluid within both limits; fewer boreholes may do",
                SIZING_RANGE_M.0
            ),
        );
    }
    let ts = characteristic_time_s(length, e.ground.diffusivity_m2_per_s());
    let result = BorefieldResult {
        layout: b.layout_description.clone(),
        boreholes: n,
        positions_m: b.positions_m.iter().map(|&(x, y)| [x, y]).collect(),
        monthly_loads: monthly_loads(&b.loads),
        wall_condition: match b.wall_condition {
            BoreholeWall::UniformTemperature => "uniform-temperature",
            BoreholeWall::UniformHeatFlux => "uniform-heat-flux",
        }
        .into(),
        g_function: curve
            .taus()
            .into_iter()
            .zip(&curve.g)
            .map(|(t, g)| GPoint {
                ln_t_over_ts: t,
                g: *g,
            })
            .collect(),
        characteristic_time_years: ts / crate::model::YEAR_S,
        borehole_resistance_m_k_per_w: e.resistance_m_k_per_w,
        borehole_resistance_source: if d.local.is_some() {
            "multipole"
        } else {
            "measured"
        }
        .into(),
        local_borehole_resistance_m_k_per_w: d.local.map(|l| l.borehole_m_k_per_w),
        internal_resistance_m_k_per_w: d.local.map(|l| l.internal_m_k_per_w),
        active_length_m: length,
        total_length_m: length * n as f64,
        top_depth_m: b.top_depth_m,
        ground: BorefieldGround {
            conductivity_w_per_m_k: e.ground.conductivity_w_per_m_k,
            conductivity_source: if b.ground_conductivity_w_per_m_k.is_some() {
                "measured"
            } else {
                "layers"
            }
            .into(),
            heat_capacity_j_per_m3_k: e.ground.heat_capacity_j_per_m3_k,
            diffusivity_m2_per_s: e.ground.diffusivity_m2_per_s(),
            undisturbed_c: e.ground.undisturbed_c,
        },
        fluid: BorefieldFluid {
            mixture: b.fluid.mixture.name().into(),
            mass_fraction: b.fluid.mass_fraction,
            property_temperature_c: t_p,
            density_kg_per_m3: b.fluid.density_kg_per_m3(t_p),
            specific_heat_j_per_kg_k: b.fluid.specific_heat_j_per_kg_k(t_p),
            flow_per_borehole_l_per_s: b.flow_per_borehole_m3_per_s * 1000.0,
            reynolds: hyd.reynolds,
            flow_regime: regime.into(),
        },
        fluid_freezing_point_c: freezing,
        fluid_temperature: figures,
        coldest_fluid_c: coldest,
        warmest_fluid_c: warmest,
        ground_temperature_drift_k: last.2 - first.2,
        pressure_drop_kpa: hyd.pressure_drop_pa / 1000.0,
        pumping_power_w: pumping,
        limits: FluidLimits {
            min_fluid_c: b.min_fluid_c,
            max_fluid_c: b.max_fluid_c,
        },
        decided_by: sized.as_ref().map(|s| s.governing.to_string()),
        decision: sized.as_ref().map(|s| decision(s.governing, months, b)),
        sizing: sized.map(|s| BorefieldSizing {
            range_m: [SIZING_RANGE_M.0, SIZING_RANGE_M.1],
            length_for_min_fluid_m: s.length_for_min_m,
            length_for_max_fluid_m: s.length_for_max_m,
            g_function_lengths_m: s.node_lengths_m,
        }),
        annual_loads: annual,
        design_life_years: b.design_life_months as f64 / 12.0,
        months: e.months.clone(),
        month_marks: e
            .months
            .iter()
            .map(|m| {
                if m.min_c < b.min_fluid_c || m.max_c > b.max_fluid_c {
                    LimitProximity::Beyond
                } else if m.min_c < b.min_fluid_c + NEAR_LIMIT_K || m.max_c > b.max_fluid_c - NEAR_LIMIT_K {
                    LimitProximity::Near
                } else {
                    LimitProximity::Within
                }
            })
            .collect(),
    };
    let mut assumptions = vec![
        Assumption::new(
            "least margin of the coldest fluid above the antifreeze's freezing point",
            ANTIFREEZE_MARGIN_K,
            "K",
            "common practice, no source",
        ),
        Assumption::new(
            "loss coefficient of the U-bend at the foot of a loop",
            U_BEND_LOSS_COEFFICIENT,
            "velocity heads",
            "common practice, no source",
        ),
        Assumption::new(
            "multipole order of the borehole resistance",
            DEFAULT_MULTIPOLE_ORDER as f64,
            "",
            "Bennet, Claesson & Hellström (1987); converged to better than 0.1 % at order 10",
        ),
        Assumption::new(
            "length of a model month",
            HOURS_PER_MONTH as f64,
            "h",
            "a 365-day year in twelve equal parts",
        ),
        Assumption::new(
            "flow laminar below the Reynolds number",
            LAMINAR_LIMIT_RE,
            "",
            "Gnielinski (2013), laminar–turbulent transition",
        ),
    ];
    if sized_run {
        assumptions.push(Assumption::new(
            "tolerance of a sized design on its limits",
            SIZED_LIMIT_TOLERANCE_K,
            "K",
            "burrow: the length search closes on the governing limit within 0.02 K",
        ));
    }
    Ok(Outcome {
        result,
        warnings,
        checks,
        assumptions,
    })
}

/// The sentence that says what decided a sized length: which limit, at which temperature, in
/// which month of which year of the design life.
fn decision(decided_by: &str, months: &[FluidMonth], b: &Borefield) -> String {
    use crate::calendar::MONTH_NAMES as MONTHS;
    let when = |m: &FluidMonth| {
        format!(
            "{} of year {}",
            MONTHS[(m.month - 1) % 12],
            (m.month - 1) / 12 + 1
        )
    };
    match decided_by {
        "cold-side" => {
            let m = months.iter().min_by(|a, b| a.min_c.total_cmp(&b.min_c));
            match m {
                Some(m) => format!(
                    "the mean fluid temperature at the extraction peak decides the length: {:.1} °C in {} against the lower limit of {} °C",
                    m.min_c,
                    when(m),
                    b.min_fluid_c
                ),
                None => "the lower limit decides the length".into(),
            }
        }
        "warm-side" => {
            let m = months.iter().max_by(|a, b| a.max_c.total_cmp(&b.max_c));
            match m {
                Some(m) => format!(
                    "the mean fluid temperature at the injection peak decides the length: {:.1} °C in {} against the upper limit of {} °C",
                    m.max_c,
                    when(m),
                    b.max_fluid_c
                ),
                None => "the upper limit decides the length".into(),
            }
        }
        _ => format!(
            "the shortest length searched, {} m, already keeps the fluid within both limits",
            SIZING_RANGE_M.0
        ),
    }
}

fn fluid_name(f: &Fluid) -> String {
    if f.mass_fraction > 0.0 {
        format!("{} at {:.0} %", f.mixture.name(), f.mass_fraction * 100.0)
    } else {
        f.mixture.name().to_string()
    }
}
