//! A water main in frozen ground: how long stagnant water lasts, the bleed flow that keeps it
//! above a temperature, and the burial depth that keeps the crown below the frost.

use std::f64::consts::PI;

use super::{check_finite, check_non_negative, check_positive};

/// Default clearance between the frost depth and the pipe crown, m. `common practice, no
/// source`: water utilities commonly add 0.15–0.3 m below the predicted frost depth.
pub const DEFAULT_FROST_MARGIN_M: f64 = 0.2;

/// Water standing in a pipe with no flow, cooled by the ground around it.
///
/// Lumped heat balance of the water per metre (well mixed, one temperature T):
/// `m'c dT/dt = (T_g − T) / (R_wall + R_ground)` while liquid, and at `T = T_f` the heat flow
/// `(T_f − T_g)/R` freezes water at the rate `q / (ρ L_f)` per metre (Newton cooling of a lumped
/// body, e.g. Incropera & DeWitt, *Fundamentals of Heat and Mass Transfer*, §5.2, with the
/// phase change added as an enthalpy balance). The lumped model ignores the ice layer's extra
/// resistance and supercooling, so it freezes a pipe somewhat faster than reality once ice has
/// started (conservative), and the mean water temperature reaches T_f a little after the wall
/// does (the first ice at the wall can come slightly earlier).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StagnantPipe {
    /// Inner diameter of the pipe, m.
    pub inner_diameter_m: f64,
    /// Resistance of the pipe wall (and any insulation) per metre, m K/W.
    pub wall_resistance_m_k_per_w: f64,
    /// Resistance of the ground between the pipe's outer surface and the point where the ground
    /// temperature is given, per metre, m K/W (the caller's choice, e.g. a shape factor).
    pub ground_resistance_m_k_per_w: f64,
    /// Volumetric heat capacity of water, J/(m³ K) (about 4.22 MJ/(m³ K) near 0 °C).
    pub water_heat_capacity_j_m3k: f64,
    /// Volumetric latent heat of freezing of water, J/m³ (about 333.5 MJ/m³).
    pub water_latent_j_per_m3: f64,
    /// Freezing point of the water, °C (0 for drinking water).
    pub freezing_point_c: f64,
}

/// The history of a stagnant pipe under a series of ground temperatures.
#[derive(Debug, Clone, PartialEq)]
pub struct StagnantRun {
    /// Time (s from the start) when ice starts to form, `None` if it never does.
    pub first_ice_s: Option<f64>,
    /// Time (s) when the water is frozen through, `None` if it never is.
    pub fully_frozen_s: Option<f64>,
    /// Largest ice fraction (by mass, 0–1) reached.
    pub max_ice_fraction: f64,
    /// Water temperature (°C) at the end of each step (T_f while ice is present).
    pub water_c: Vec<f64>,
    /// Ice fraction (0–1) at the end of each step.
    pub ice_fraction: Vec<f64>,
}

/// One step's outcome: the new enthalpy and the times (from the step start) of first ice and of
/// complete freezing within the step.
struct Step {
    enthalpy_j_per_m: f64,
    ice_at_s: Option<f64>,
    frozen_at_s: Option<f64>,
}

impl StagnantPipe {
    fn check(&self) -> Result<(), String> {
        check_positive("the inner diameter (m)", self.inner_diameter_m)?;
        check_non_negative("the wall resistance (m K/W)", self.wall_resistance_m_k_per_w)?;
        check_non_negative("the ground resistance (m K/W)", self.ground_resistance_m_k_per_w)?;
        check_positive(
            "the total resistance wall + ground (m K/W)",
            self.resistance_m_k_per_w(),
        )?;
        check_positive(
            "the water heat capacity (J/(m³ K))",
            self.water_heat_capacity_j_m3k,
        )?;
        check_positive("the water latent heat (J/m³)", self.water_latent_j_per_m3)?;
        check_finite("the freezing point (°C)", self.freezing_point_c)
    }

    /// Total resistance between the water and the ground temperature, m K/W.
    pub fn resistance_m_k_per_w(&self) -> f64 {
        self.wall_resistance_m_k_per_w + self.ground_resistance_m_k_per_w
    }

    fn area_m2(&self) -> f64 {
        PI * self.inner_diameter_m.powi(2) / 4.0
    }

    /// Time constant of the water's cooling `τ = m'c·R` (s): heat capacity per metre times the
    /// total resistance.
    pub fn time_constant_s(&self) -> f64 {
        self.water_heat_capacity_j_m3k * self.area_m2() * self.resistance_m_k_per_w()
    }

    /// Latent heat of the water per metre of pipe, J/m.
    fn latent_per_m(&self) -> f64 {
        self.water_latent_j_per_m3 * self.area_m2()
    }

    /// Enthalpy per metre (J/m) relative to liquid water at T_f, of water at `t_c` (°C).
    fn enthalpy_of_water(&self, t_c: f64) -> f64 {
        self.water_heat_capacity_j_m3k * self.area_m2() * (t_c - self.freezing_point_c)
    }

    /// (water temperature °C, ice fraction) of enthalpy `h` (J/m).
    fn state(&self, h: f64) -> (f64, f64) {
        if h > 0.0 {
            (
                self.freezing_point_c + h / (self.water_heat_capacity_j_m3k * self.area_m2()),
                0.0,
            )
        } else {
            (self.freezing_point_c, (-h / self.latent_per_m()).min(1.0))
        }
    }

    /// Exact solution over `dt_s` at constant ground temperature `ground_c` from enthalpy `h`:
    /// exponential approach to T_g while liquid, constant heat flow `(T_f − T_g)/R` while ice and
    /// water coexist, held at fully frozen once all water is ice.
    fn advance(&self, h: f64, ground_c: f64, dt_s: f64) -> Step {
        let tau = self.time_constant_s();
        let full = -self.latent_per_m();
        // Heat flow leaving the water per metre while it sits at T_f, W/m.
        let q_freeze = (self.freezing_point_c - ground_c) / self.resistance_m_k_per_w();
        let liquid_after = |from_c: f64, dt: f64| ground_c + (from_c - ground_c) * (-dt / tau).exp();
        let mut step = Step {
            enthalpy_j_per_m: h,
            ice_at_s: None,
            frozen_at_s: None,
        };
        let (mut h, mut t) = (h, 0.0);
        // A step holds at most three phases (liquid → freezing → frozen, or melting → liquid).
        for _ in 0..4 {
            let left = dt_s - t;
            if left <= 0.0 {
                break;
            }
            if h > 0.0 {
                let (water_c, _) = self.state(h);
                let reach = if q_freeze > 0.0 {
                    tau * ((water_c - ground_c) / (self.freezing_point_c - ground_c)).ln()
                } else {
                    f64::INFINITY
                };
                if reach >= left {
                    // Stays liquid; when cooling towards T_g < T_f it cannot pass T_f here.
                    h = self
                        .enthalpy_of_water(liquid_after(water_c, left))
                        .max(f64::MIN_POSITIVE);
                    t = dt_s;
                } else {
                    h = 0.0;
                    t += reach;
                }
            } else if q_freeze > 0.0 {
                step.ice_at_s.get_or_insert(t);
                let to_full = (h - full) / q_freeze;
                if to_full >= left {
                    h -= q_freeze * left;
                    t = dt_s;
                } else {
                    if h > full {
                        step.frozen_at_s = Some(t + to_full);
                    }
                    h = full;
                    t = dt_s;
                }
            } else if q_freeze < 0.0 {
                let to_liquid = h / q_freeze;
                if to_liquid >= left {
                    h -= q_freeze * left;
                } else {
                    let warmed_c = liquid_after(self.freezing_point_c, left - to_liquid);
                    h = self.enthalpy_of_water(warmed_c).max(f64::MIN_POSITIVE);
                }
                t = dt_s;
            } else {
                t = dt_s;
            }
        }
        step.enthalpy_j_per_m = h;
        step
    }

    fn check_start(&self, initial_c: f64, ground_c: f64) -> Result<(), String> {
        self.check()?;
        check_finite("the ground temperature (°C)", ground_c)?;
        check_finite("the initial water temperature (°C)", initial_c)?;
        if initial_c < self.freezing_point_c {
            return Err(format!(
                "the initial water temperature {initial_c} °C is below the freezing point; start from liquid water"
            ));
        }
        Ok(())
    }

    /// Time (s) until ice starts to form in water at `initial_c` (°C, ≥ T_f) with the ground held
    /// at `ground_c` (°C): `t = τ ln((T_0 − T_g)/(T_f − T_g))` (the lumped exponential), `None`
    /// when the ground is not below the freezing point.
    pub fn time_to_first_ice_s(&self, initial_c: f64, ground_c: f64) -> Result<Option<f64>, String> {
        self.check_start(initial_c, ground_c)?;
        let step = self.advance(self.enthalpy_of_water(initial_c), ground_c, f64::INFINITY);
        Ok(step.ice_at_s)
    }

    /// Ice fraction (by mass, 0–1) after `t_s` seconds for water starting at `initial_c` (°C)
    /// with the ground held at `ground_c` (°C): 0 before the first ice, then
    /// `(T_f − T_g)(t − t_ice) / (R ρL_f A)`, capped at 1.
    pub fn ice_fraction_after(&self, initial_c: f64, ground_c: f64, t_s: f64) -> Result<f64, String> {
        self.check_start(initial_c, ground_c)?;
        check_non_negative("the time (s)", t_s)?;
        let step = self.advance(self.enthalpy_of_water(initial_c), ground_c, t_s);
        Ok(self.state(step.enthalpy_j_per_m).1)
    }

    /// Runs the pipe through a series of ground temperatures `ground_c` (°C), each held for
    /// `step_s` seconds, from water at `initial_c` (°C), solving every step exactly
    /// ([`Self::time_to_first_ice_s`] and [`Self::ice_fraction_after`] are its one-step case).
    pub fn run_series(&self, initial_c: f64, ground_c: &[f64], step_s: f64) -> Result<StagnantRun, String> {
        self.check_start(initial_c, ground_c.first().copied().unwrap_or(0.0))?;
        check_positive("the time step (s)", step_s)?;
        if let Some(g) = ground_c.iter().find(|g| !g.is_finite()) {
            return Err(format!(
                "a ground temperature is {g}; every value must be a finite number"
            ));
        }
        let mut h = self.enthalpy_of_water(initial_c);
        let mut run = StagnantRun {
            first_ice_s: None,
            fully_frozen_s: None,
            max_ice_fraction: 0.0,
            water_c: Vec::with_capacity(ground_c.len()),
            ice_fraction: Vec::with_capacity(ground_c.len()),
        };
        for (i, &g) in ground_c.iter().enumerate() {
            let start = i as f64 * step_s;
            let step = self.advance(h, g, step_s);
            if let (None, Some(t)) = (run.first_ice_s, step.ice_at_s) {
                run.first_ice_s = Some(start + t);
            }
            if let (None, Some(t)) = (run.fully_frozen_s, step.frozen_at_s) {
                run.fully_frozen_s = Some(start + t);
            }
            h = step.enthalpy_j_per_m;
            let (water_c, ice) = self.state(h);
            run.max_ice_fraction = run.max_ice_fraction.max(ice);
            run.water_c.push(water_c);
            run.ice_fraction.push(ice);
        }
        Ok(run)
    }
}

/// Outlet temperature (°C) of water entering a pipe of length `length_m` (m) at `inlet_c` (°C)
/// with flow `flow_m3_per_s` (m³/s), surrounded by ground at `ground_c` (°C) through a resistance
/// `resistance_m_k_per_w` (m K/W, wall + ground per metre):
/// `T(L) = T_g + (T_in − T_g) exp(−L / (Q ρc_p R'))`. Steady heat balance of the flowing water,
/// Incropera & DeWitt, *Fundamentals of Heat and Mass Transfer*, §8.3.3 (the overall-resistance
/// form of eq. 8.46, equation number from memory).
pub fn outlet_temperature_c(
    inlet_c: f64,
    ground_c: f64,
    length_m: f64,
    flow_m3_per_s: f64,
    water_heat_capacity_j_m3k: f64,
    resistance_m_k_per_w: f64,
) -> Result<f64, String> {
    check_finite("the inlet temperature (°C)", inlet_c)?;
    check_finite("the ground temperature (°C)", ground_c)?;
    check_non_negative("the pipe length (m)", length_m)?;
    check_positive("the flow (m³/s)", flow_m3_per_s)?;
    check_positive("the water heat capacity (J/(m³ K))", water_heat_capacity_j_m3k)?;
    check_positive("the resistance per metre (m K/W)", resistance_m_k_per_w)?;
    let decay = length_m / (flow_m3_per_s * water_heat_capacity_j_m3k * resistance_m_k_per_w);
    Ok(ground_c + (inlet_c - ground_c) * (-decay).exp())
}

/// Bleed flow (m³/s) that keeps water entering at `inlet_c` (°C) at or above `min_outlet_c` (°C)
/// over `length_m` (m) of pipe in ground at `ground_c` (°C) through `resistance_m_k_per_w`
/// (m K/W): [`outlet_temperature_c`] solved for the flow,
/// `Q = L / (ρc_p R' ln((T_in − T_g)/(T_min − T_g)))`. Zero when the ground is not colder than
/// `min_outlet_c`; an error when the inlet is not warmer than it.
pub fn bleed_flow_m3_per_s(
    inlet_c: f64,
    ground_c: f64,
    min_outlet_c: f64,
    length_m: f64,
    water_heat_capacity_j_m3k: f64,
    resistance_m_k_per_w: f64,
) -> Result<f64, String> {
    check_finite("the inlet temperature (°C)", inlet_c)?;
    check_finite("the ground temperature (°C)", ground_c)?;
    check_finite("the lowest allowed temperature (°C)", min_outlet_c)?;
    check_non_negative("the pipe length (m)", length_m)?;
    check_positive("the water heat capacity (J/(m³ K))", water_heat_capacity_j_m3k)?;
    check_positive("the resistance per metre (m K/W)", resistance_m_k_per_w)?;
    if ground_c >= min_outlet_c || length_m == 0.0 {
        return Ok(0.0);
    }
    if inlet_c <= min_outlet_c {
        return Err(format!(
            "the inlet water at {inlet_c} °C is not warmer than the lowest allowed {min_outlet_c} °C, so no flow can keep it there"
        ));
    }
    let ratio = ((inlet_c - ground_c) / (min_outlet_c - ground_c)).ln();
    Ok(length_m / (water_heat_capacity_j_m3k * resistance_m_k_per_w * ratio))
}

/// Burial that keeps a pipe's crown below the frost.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PipeCover {
    /// Shallowest depth of the pipe centre, m.
    pub centre_depth_m: f64,
    /// Cover to the crown (centre depth − outer diameter/2), m.
    pub cover_m: f64,
}

/// Shallowest pipe centre depth (m) whose crown (centre − D/2) lies at least `margin_m` (m)
/// below the free-field frost depth `frost_depth_m` (m), for a pipe of outer diameter
/// `outer_diameter_m` (m): `cover = X + margin`, `centre = cover + D/2`. The margin is an
/// engineering allowance ([`DEFAULT_FROST_MARGIN_M`], `common practice, no source`).
pub fn required_cover(frost_depth_m: f64, outer_diameter_m: f64, margin_m: f64) -> Result<PipeCover, String> {
    check_non_negative("the frost depth (m)", frost_depth_m)?;
    check_positive("the outer diameter (m)", outer_diameter_m)?;
    check_non_negative("the margin (m)", margin_m)?;
    let cover = frost_depth_m + margin_m;
    Ok(PipeCover {
        centre_depth_m: cover + outer_diameter_m / 2.0,
        cover_m: cover,
    })
}
