//! In-pipe convection and hydraulics of the heat-carrier fluid in borehole pipes.
//!
//! Numbers in, numbers out, in SI units: lengths in m, velocities in m/s, pressures in Pa,
//! heat-transfer coefficients in W/(m² K), resistances per metre of pipe in m K/W.
//!
//! Flow regimes of a straight circular tube (fully developed flow, which a borehole loop of
//! 100–400 m with diameters of 25–40 mm is over more than 99 % of its length):
//!
//! | Re                 | friction factor                                 | Nusselt number                  |
//! |--------------------|-------------------------------------------------|---------------------------------|
//! | < 2300             | 64/Re (Hagen–Poiseuille)                        | 3.66 or 4.36 ([`LaminarWall`])  |
//! | 2300 … 4000        | linear in Re between the two neighbours         | Gnielinski (2013) interpolation |
//! | ≥ 4000             | Colebrook (1939), or Haaland (1983) explicit    | Gnielinski (1976)               |
//!
//! The transition interpolation ends at Re = 4000, as in Gnielinski (2013), *On heat transfer in
//! tubes*, Int. J. Heat Mass Transfer 63, 134–140 (abstract: "a linear interpolation between the
//! Nusselt numbers at Re = 2300 and Re = 4000"). The VDI Heat Atlas (2010, ch. G1) form of the
//! same idea ends at Re = 10⁴ with a turbulent equation without the "−1000" term; it is not used
//! here so that the tube Nusselt number is continuous with the 1976 correlation.

use crate::materials::fluids::Fluid;
use crate::numerics::checks::{non_negative as check_non_negative, positive as check_positive};
use std::f64::consts::PI;

/// Reynolds number below which pipe flow is taken as laminar (common practice, no source).
pub const LAMINAR_LIMIT_RE: f64 = 2300.0;

/// Reynolds number from which the fully turbulent correlations are used; between
/// [`LAMINAR_LIMIT_RE`] and this value the tube values are interpolated linearly in Re
/// (Gnielinski 2013 for the Nusselt number; common practice, no source, for the friction factor).
pub const TURBULENT_FROM_RE: f64 = 4000.0;

/// Reynolds number from which the annulus correlation of Gnielinski (2009) is used as turbulent;
/// below it down to 2300 the annulus Nusselt number is interpolated linearly, as the VDI Heat
/// Atlas (2010, ch. G2) prescribes for annuli (from memory).
pub const ANNULUS_TURBULENT_FROM_RE: f64 = 1.0e4;

/// Loss coefficient of the U-bend at the foot of a borehole loop, in velocity heads.
///
/// Common practice, no source: an allowance of 1.5 velocity heads. For comparison, Crane
/// Technical Paper 410 gives K = 50 f_T for a close-pattern return bend (from memory), i.e.
/// about 1.1–1.3 for 25–40 mm pipes; 1.5 rounds that up for the tighter bends of borehole
/// feet and their welded joints.
pub const U_BEND_LOSS_COEFFICIENT: f64 = 1.5;

// ---------------------------------------------------------------------------------------------
// Dimensionless groups
// ---------------------------------------------------------------------------------------------

/// Reynolds number Re = ρ v d_h / μ of a flow with mean velocity `velocity_m_per_s` in a channel of
/// hydraulic diameter `hydraulic_diameter_m`; density in kg/m³, dynamic viscosity in Pa s.
pub fn reynolds_number(
    velocity_m_per_s: f64,
    hydraulic_diameter_m: f64,
    density_kg_per_m3: f64,
    viscosity_pa_s: f64,
) -> Result<f64, String> {
    check_non_negative("mean velocity (m/s)", velocity_m_per_s)?;
    check_positive("hydraulic diameter (m)", hydraulic_diameter_m)?;
    check_positive("density (kg/m³)", density_kg_per_m3)?;
    check_positive("dynamic viscosity (Pa s)", viscosity_pa_s)?;
    Ok(density_kg_per_m3 * velocity_m_per_s * hydraulic_diameter_m / viscosity_pa_s)
}

/// Prandtl number Pr = c_p μ / k; specific heat in J/(kg K), viscosity in Pa s, conductivity in
/// W/(m K).
pub fn prandtl_number(
    specific_heat_j_per_kg_k: f64,
    viscosity_pa_s: f64,
    conductivity_w_per_m_k: f64,
) -> Result<f64, String> {
    check_positive("specific heat (J/(kg K))", specific_heat_j_per_kg_k)?;
    check_positive("dynamic viscosity (Pa s)", viscosity_pa_s)?;
    check_positive("thermal conductivity (W/(m K))", conductivity_w_per_m_k)?;
    Ok(specific_heat_j_per_kg_k * viscosity_pa_s / conductivity_w_per_m_k)
}

// ---------------------------------------------------------------------------------------------
// Friction factor (Darcy)
// ---------------------------------------------------------------------------------------------

/// Darcy friction factor of fully developed laminar flow in a circular tube, f = 64/Re
/// (Hagen–Poiseuille).
pub fn darcy_friction_laminar(reynolds: f64) -> Result<f64, String> {
    check_positive("Reynolds number", reynolds)?;
    Ok(64.0 / reynolds)
}

/// Darcy friction factor of turbulent flow from the Colebrook (1939) equation,
/// 1/√f = −2 log10( (ε/d)/3.7 + 2.51/(Re √f) ),
/// C. F. Colebrook, J. Inst. Civil Eng. 11 (1939) 133–156, eq. (10). Solved by Newton's method
/// on x = 1/√f, started from Haaland, to a relative change below 1e-14.
/// `relative_roughness` is ε/d (0 for a hydraulically smooth plastic pipe).
pub fn darcy_friction_colebrook(reynolds: f64, relative_roughness: f64) -> Result<f64, String> {
    let start = darcy_friction_haaland(reynolds, relative_roughness)?;
    let a = relative_roughness / 3.7;
    let b = 2.51 / reynolds;
    let mut x = 1.0 / start.sqrt();
    for _ in 0..50 {
        let inner = a + b * x;
        let residual = x + 2.0 * inner.log10();
        let slope = 1.0 + 2.0 * b / (inner * std::f64::consts::LN_10);
        let step = residual / slope;
        x -= step;
        if (step / x).abs() < 1e-14 {
            return Ok(1.0 / (x * x));
        }
    }
    Err(format!(
        "the Colebrook equation did not converge for Re = {reynolds} and relative roughness {relative_roughness}; use Re above 2300"
    ))
}

/// Darcy friction factor of turbulent flow from the explicit Haaland (1983) equation,
/// 1/√f = −1.8 log10[ ((ε/d)/3.7)^1.11 + 6.9/Re ],
/// S. E. Haaland, J. Fluids Eng. 105 (1983) 89–90, eq. (9) (equation number from memory).
pub fn darcy_friction_haaland(reynolds: f64, relative_roughness: f64) -> Result<f64, String> {
    check_positive("Reynolds number", reynolds)?;
    check_relative_roughness(relative_roughness)?;
    let x = -1.8 * ((relative_roughness / 3.7).powf(1.11) + 6.9 / reynolds).log10();
    Ok(1.0 / (x * x))
}

/// Which turbulent friction equation [`darcy_friction_factor`] uses.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum TurbulentFriction {
    /// Colebrook (1939), solved iteratively.
    #[default]
    Colebrook,
    /// Haaland (1983), explicit.
    Haaland,
}

/// Darcy friction factor for any Re > 0: laminar 64/Re below [`LAMINAR_LIMIT_RE`], the chosen
/// turbulent equation from [`TURBULENT_FROM_RE`], and linear interpolation in Re between the
/// laminar value at 2300 and the turbulent value at 4000 (common practice, no source).
pub fn darcy_friction_factor(
    reynolds: f64,
    relative_roughness: f64,
    turbulent: TurbulentFriction,
) -> Result<f64, String> {
    check_positive("Reynolds number", reynolds)?;
    check_relative_roughness(relative_roughness)?;
    let turbulent_at = |re: f64| match turbulent {
        TurbulentFriction::Colebrook => darcy_friction_colebrook(re, relative_roughness),
        TurbulentFriction::Haaland => darcy_friction_haaland(re, relative_roughness),
    };
    if reynolds < LAMINAR_LIMIT_RE {
        darcy_friction_laminar(reynolds)
    } else if reynolds < TURBULENT_FROM_RE {
        let low = darcy_friction_laminar(LAMINAR_LIMIT_RE)?;
        let high = turbulent_at(TURBULENT_FROM_RE)?;
        Ok(interpolate_transition(
            reynolds,
            LAMINAR_LIMIT_RE,
            TURBULENT_FROM_RE,
            low,
            high,
        ))
    } else {
        turbulent_at(reynolds)
    }
}

/// Smooth-tube friction factor of Filonenko (1954) as used by Petukhov (1970) and Gnielinski
/// (1976): f = (0.790 ln Re − 1.64)⁻². B. S. Petukhov, Advances in Heat Transfer 6 (1970)
/// 503–564, eq. (3) (equation number from memory). Stated range 10⁴ ≤ Re ≤ 5·10⁶; used from
/// Re = 2300 in the Gnielinski correlation.
pub fn friction_factor_filonenko(reynolds: f64) -> Result<f64, String> {
    check_range("Reynolds number", reynolds, LAMINAR_LIMIT_RE, 5.0e6)?;
    let d = 0.790 * reynolds.ln() - 1.64;
    Ok(1.0 / (d * d))
}

// ---------------------------------------------------------------------------------------------
// Nusselt number, circular tube
// ---------------------------------------------------------------------------------------------

/// Thermal boundary condition assumed for fully developed laminar flow.
///
/// A U-tube leg in grout has neither an isothermal wall nor a uniform wall flux: the wall
/// temperature follows the fluid down the borehole and varies around the circumference. The
/// default, [`LaminarWall::UniformTemperature`] (Nu = 3.66), gives the lower heat-transfer
/// coefficient and hence the larger (conservative) pipe resistance, which lengthens the
/// designed borehole rather than shortening it; the difference between the two values changes
/// a typical R_b by 0.01–0.02 m K/W.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum LaminarWall {
    /// Uniform wall temperature: Nu = 3.657 (Graetz problem, fully developed).
    #[default]
    UniformTemperature,
    /// Uniform wall heat flux: Nu = 48/11 = 4.364.
    UniformHeatFlux,
}

/// Nusselt number of fully developed laminar flow in a circular tube: 3.657 for a uniform wall
/// temperature, 48/11 ≈ 4.364 for a uniform wall heat flux. R. K. Shah & A. L. London, *Laminar
/// flow forced convection in ducts*, Academic Press 1978, ch. V (values from memory; 48/11 is
/// the exact analytic result).
pub fn nusselt_laminar(wall: LaminarWall) -> f64 {
    match wall {
        LaminarWall::UniformTemperature => 3.657,
        LaminarWall::UniformHeatFlux => 48.0 / 11.0,
    }
}

/// Nusselt number of turbulent flow in a smooth tube (fully developed, d/L → 0), Gnielinski
/// (1976): Nu = (f/8)(Re − 1000) Pr / [1 + 12.7 √(f/8) (Pr^(2/3) − 1)], with f from
/// [`friction_factor_filonenko`]. V. Gnielinski, Int. Chem. Eng. 16 (1976) 359–368, eq. (8)
/// (equation number from memory); stated range 2300 ≤ Re ≤ 5·10⁶, 0.5 ≤ Pr ≤ 2000.
pub fn nusselt_gnielinski_1976(reynolds: f64, prandtl: f64) -> Result<f64, String> {
    check_range("Prandtl number", prandtl, 0.5, 2000.0)?;
    let f8 = friction_factor_filonenko(reynolds)? / 8.0;
    Ok(f8 * (reynolds - 1000.0) * prandtl / (1.0 + 12.7 * f8.sqrt() * (prandtl.powf(2.0 / 3.0) - 1.0)))
}

/// Nusselt number of fully developed flow in a circular tube for any Re > 0: laminar below 2300,
/// Gnielinski (1976) from 4000, and between them the linear interpolation of Gnielinski (2013),
/// Nu = (1 − γ) Nu_lam + γ Nu_turb(4000), γ = (Re − 2300)/(4000 − 2300).
pub fn nusselt_tube(reynolds: f64, prandtl: f64, wall: LaminarWall) -> Result<f64, String> {
    check_positive("Reynolds number", reynolds)?;
    check_range("Prandtl number", prandtl, 0.5, 2000.0)?;
    if reynolds < LAMINAR_LIMIT_RE {
        Ok(nusselt_laminar(wall))
    } else if reynolds < TURBULENT_FROM_RE {
        let high = nusselt_gnielinski_1976(TURBULENT_FROM_RE, prandtl)?;
        Ok(interpolate_transition(
            reynolds,
            LAMINAR_LIMIT_RE,
            TURBULENT_FROM_RE,
            nusselt_laminar(wall),
            high,
        ))
    } else {
        nusselt_gnielinski_1976(reynolds, prandtl)
    }
}

// ---------------------------------------------------------------------------------------------
// Nusselt number, concentric annulus
// ---------------------------------------------------------------------------------------------

/// Which wall of a concentric annulus transfers heat (the other taken as adiabatic), the case
/// for which the annulus correlations are stated. In a coaxial borehole the annulus fluid
/// exchanges heat with both walls; each wall's coefficient is taken from its own case.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum AnnulusWall {
    /// The outer surface of the inner pipe.
    Inner,
    /// The inner surface of the outer pipe.
    Outer,
}

/// Nusselt number (based on d_h = D_o − d_i) of fully developed laminar flow in a concentric
/// annulus with one wall isothermal and the other adiabatic: inner wall 3.66 + 1.2 a^(−0.8),
/// outer wall 3.66 + 1.2 a^(0.5), a = d_i/D_o. VDI Heat Atlas (2010), ch. G2, eqs. (4)–(5),
/// fitted to the exact solutions (form from memory). Both reduce to 4.86 at a = 1, the
/// parallel-plate value of Shah & London (1978) for one wall isothermal, the other insulated.
pub fn nusselt_annulus_laminar(diameter_ratio: f64, wall: AnnulusWall) -> Result<f64, String> {
    check_diameter_ratio(diameter_ratio)?;
    Ok(match wall {
        AnnulusWall::Inner => 3.66 + 1.2 * diameter_ratio.powf(-0.8),
        AnnulusWall::Outer => 3.66 + 1.2 * diameter_ratio.sqrt(),
    })
}

/// Nusselt number (based on d_h = D_o − d_i) of turbulent flow in a concentric annulus,
/// Gnielinski (2009), Heat Transfer Eng. 30(6) 431–436, as given in the VDI Heat Atlas (2010)
/// ch. G2 (form from memory), fully developed (d_h/L → 0), wall-to-bulk property ratio 1:
///
/// Nu = (ξ/8) Re Pr / [k₁ + 12.7 √(ξ/8) (Pr^(2/3) − 1)] · F_ann,
/// ξ = (1.8 log10 Re* − 1.5)⁻², Re* = Re [(1 + a²) ln a + (1 − a²)] / [(1 − a)² ln a],
/// k₁ = 1.07 + 900/Re − 0.63/(1 + 10 Pr),
/// F_ann = 0.75 a^(−0.17) (inner wall) or 0.9 − 0.15 a^(0.6) (outer wall).
///
/// Stated range 10⁴ ≤ Re ≤ 10⁶, 0.6 ≤ Pr ≤ 1000, 0 < a ≤ 1 (not checked below 10⁴ because
/// [`nusselt_annulus`] needs the value at Re = 10⁴ exactly).
pub fn nusselt_annulus_gnielinski(
    reynolds: f64,
    prandtl: f64,
    diameter_ratio: f64,
    wall: AnnulusWall,
) -> Result<f64, String> {
    check_range("Reynolds number", reynolds, ANNULUS_TURBULENT_FROM_RE, 1.0e6)?;
    check_range("Prandtl number", prandtl, 0.5, 2000.0)?;
    check_diameter_ratio(diameter_ratio)?;
    let a = diameter_ratio;
    let re_star = if a < 1.0 {
        let ln_a = a.ln();
        reynolds * ((1.0 + a * a) * ln_a + (1.0 - a * a)) / ((1.0 - a).powi(2) * ln_a)
    } else {
        // Limit a → 1 (parallel plates).
        reynolds * 2.0 / 3.0
    };
    let xi8 = 1.0 / (1.8 * re_star.log10() - 1.5).powi(2) / 8.0;
    let k1 = 1.07 + 900.0 / reynolds - 0.63 / (1.0 + 10.0 * prandtl);
    let f_ann = match wall {
        AnnulusWall::Inner => 0.75 * a.powf(-0.17),
        AnnulusWall::Outer => 0.9 - 0.15 * a.powf(0.6),
    };
    Ok(xi8 * reynolds * prandtl / (k1 + 12.7 * xi8.sqrt() * (prandtl.powf(2.0 / 3.0) - 1.0)) * f_ann)
}

/// Nusselt number of one wall of a concentric annulus for any Re > 0: laminar
/// ([`nusselt_annulus_laminar`]) below 2300, Gnielinski (2009) from 10⁴, linear in Re between
/// (VDI Heat Atlas 2010 ch. G2, from memory).
pub fn nusselt_annulus(
    reynolds: f64,
    prandtl: f64,
    diameter_ratio: f64,
    wall: AnnulusWall,
) -> Result<f64, String> {
    check_positive("Reynolds number", reynolds)?;
    let laminar = nusselt_annulus_laminar(diameter_ratio, wall)?;
    if reynolds < LAMINAR_LIMIT_RE {
        check_range("Prandtl number", prandtl, 0.5, 2000.0)?;
        Ok(laminar)
    } else if reynolds < ANNULUS_TURBULENT_FROM_RE {
        let high = nusselt_annulus_gnielinski(ANNULUS_TURBULENT_FROM_RE, prandtl, diameter_ratio, wall)?;
        Ok(interpolate_transition(
            reynolds,
            LAMINAR_LIMIT_RE,
            ANNULUS_TURBULENT_FROM_RE,
            laminar,
            high,
        ))
    } else {
        nusselt_annulus_gnielinski(reynolds, prandtl, diameter_ratio, wall)
    }
}

// ---------------------------------------------------------------------------------------------
// Resistances
// ---------------------------------------------------------------------------------------------

/// Heat-transfer coefficient h = Nu k / d_h, W/(m² K).
pub fn heat_transfer_coefficient_w_m2_k(
    nusselt: f64,
    fluid_conductivity_w_per_m_k: f64,
    hydraulic_diameter_m: f64,
) -> Result<f64, String> {
    check_positive("Nusselt number", nusselt)?;
    check_positive("fluid conductivity (W/(m K))", fluid_conductivity_w_per_m_k)?;
    check_positive("hydraulic diameter (m)", hydraulic_diameter_m)?;
    Ok(nusselt * fluid_conductivity_w_per_m_k / hydraulic_diameter_m)
}

/// Convective (film) resistance per metre of a wall of diameter `wall_diameter_m`,
/// R = 1/(π d h), m K/W.
pub fn film_resistance_m_k_per_w(h_w_m2_k: f64, wall_diameter_m: f64) -> Result<f64, String> {
    check_positive("heat-transfer coefficient (W/(m² K))", h_w_m2_k)?;
    check_positive("wall diameter (m)", wall_diameter_m)?;
    Ok(1.0 / (PI * wall_diameter_m * h_w_m2_k))
}

/// Conduction resistance per metre of a cylindrical wall, R = ln(r_o/r_i)/(2π k), m K/W
/// (Carslaw & Jaeger 1959, §7.2, section number from memory).
pub fn cylinder_wall_resistance_m_k_per_w(
    inner_radius_m: f64,
    outer_radius_m: f64,
    conductivity_w_per_m_k: f64,
) -> Result<f64, String> {
    // The project's one cylindrical-shell formula (Carslaw & Jaeger §7.2).
    crate::physics::buried_pipe::wall::shell_resistance_m_k_per_w(
        inner_radius_m,
        outer_radius_m,
        conductivity_w_per_m_k,
    )
}

// ---------------------------------------------------------------------------------------------
// A fluid flowing in a pipe or an annulus
// ---------------------------------------------------------------------------------------------

/// The hydraulic state of a fluid flowing through one channel.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct ChannelFlow {
    pub hydraulic_diameter_m: f64,
    pub flow_area_m2: f64,
    pub velocity_m_per_s: f64,
    pub reynolds: f64,
    pub prandtl: f64,
    pub density_kg_per_m3: f64,
    pub conductivity_w_per_m_k: f64,
    pub specific_heat_j_per_kg_k: f64,
}

/// Flow of `fluid` at `t_c` (°C) with mass flow `mass_flow_kg_per_s` through a circular tube of inner
/// diameter `inner_diameter_m`.
pub fn tube_flow(
    fluid: &Fluid,
    t_c: f64,
    mass_flow_kg_per_s: f64,
    inner_diameter_m: f64,
) -> Result<ChannelFlow, String> {
    check_positive("pipe inner diameter (m)", inner_diameter_m)?;
    channel_flow(
        fluid,
        t_c,
        mass_flow_kg_per_s,
        inner_diameter_m,
        PI / 4.0 * inner_diameter_m.powi(2),
    )
}

/// Flow of `fluid` at `t_c` (°C) with mass flow `mass_flow_kg_per_s` through the concentric annulus
/// between an inner pipe of outer diameter `inner_pipe_outer_diameter_m` and an outer pipe of inner
/// diameter `outer_pipe_inner_diameter_m`; d_h = D_o − d_i.
pub fn annulus_flow(
    fluid: &Fluid,
    t_c: f64,
    mass_flow_kg_per_s: f64,
    inner_pipe_outer_diameter_m: f64,
    outer_pipe_inner_diameter_m: f64,
) -> Result<ChannelFlow, String> {
    check_positive("inner pipe outer diameter (m)", inner_pipe_outer_diameter_m)?;
    if !(outer_pipe_inner_diameter_m.is_finite() && outer_pipe_inner_diameter_m > inner_pipe_outer_diameter_m)
    {
        return Err(format!(
            "the outer pipe's inner diameter {outer_pipe_inner_diameter_m} m must exceed the inner pipe's outer diameter {inner_pipe_outer_diameter_m} m"
        ));
    }
    let area = PI / 4.0 * (outer_pipe_inner_diameter_m.powi(2) - inner_pipe_outer_diameter_m.powi(2));
    channel_flow(
        fluid,
        t_c,
        mass_flow_kg_per_s,
        outer_pipe_inner_diameter_m - inner_pipe_outer_diameter_m,
        area,
    )
}

fn channel_flow(
    fluid: &Fluid,
    t_c: f64,
    mass_flow_kg_per_s: f64,
    hydraulic_diameter_m: f64,
    flow_area_m2: f64,
) -> Result<ChannelFlow, String> {
    fluid.check_temperature(t_c)?;
    check_positive("mass flow (kg/s)", mass_flow_kg_per_s)?;
    let density = fluid.density_kg_per_m3(t_c);
    let viscosity = fluid.dynamic_viscosity_pa_s(t_c);
    let conductivity = fluid.conductivity_w_per_m_k(t_c);
    let specific_heat = fluid.specific_heat_j_per_kg_k(t_c);
    let velocity = mass_flow_kg_per_s / (density * flow_area_m2);
    Ok(ChannelFlow {
        hydraulic_diameter_m,
        flow_area_m2,
        velocity_m_per_s: velocity,
        reynolds: reynolds_number(velocity, hydraulic_diameter_m, density, viscosity)?,
        prandtl: prandtl_number(specific_heat, viscosity, conductivity)?,
        density_kg_per_m3: density,
        conductivity_w_per_m_k: conductivity,
        specific_heat_j_per_kg_k: specific_heat,
    })
}

/// Pipe resistance R_p per metre of one pipe, fluid to outer pipe surface: film
/// 1/(π d_i h) plus wall ln(r_o/r_i)/(2π k_p), m K/W. This is the R_p that enters the multipole
/// method through β = 2π λ_b R_p.
pub fn pipe_resistance_m_k_per_w(
    flow: &ChannelFlow,
    wall: LaminarWall,
    inner_radius_m: f64,
    outer_radius_m: f64,
    pipe_conductivity_w_per_m_k: f64,
) -> Result<f64, String> {
    let nu = nusselt_tube(flow.reynolds, flow.prandtl, wall)?;
    let h = heat_transfer_coefficient_w_m2_k(nu, flow.conductivity_w_per_m_k, flow.hydraulic_diameter_m)?;
    Ok(film_resistance_m_k_per_w(h, 2.0 * inner_radius_m)?
        + cylinder_wall_resistance_m_k_per_w(inner_radius_m, outer_radius_m, pipe_conductivity_w_per_m_k)?)
}

// ---------------------------------------------------------------------------------------------
// Hydraulics
// ---------------------------------------------------------------------------------------------

/// Pressure drop of a loop, Darcy–Weisbach plus local losses:
/// Δp = (f L/d_h + K) ρ v²/2, Pa. `length_m` is the developed length of the flow path
/// (2 H for a U-tube of depth H), `local_loss_coefficient` the sum of local losses in velocity
/// heads (for example [`U_BEND_LOSS_COEFFICIENT`]).
pub fn loop_pressure_drop_pa(
    flow: &ChannelFlow,
    darcy_friction: f64,
    length_m: f64,
    local_loss_coefficient: f64,
) -> Result<f64, String> {
    check_positive("Darcy friction factor", darcy_friction)?;
    check_non_negative("loop length (m)", length_m)?;
    check_non_negative("local loss coefficient", local_loss_coefficient)?;
    let dynamic_pressure = 0.5 * flow.density_kg_per_m3 * flow.velocity_m_per_s.powi(2);
    Ok((darcy_friction * length_m / flow.hydraulic_diameter_m + local_loss_coefficient) * dynamic_pressure)
}

/// Hydraulic power the pump must supply, P = Δp V̇ / η, W; `efficiency` is the overall
/// (wire-to-water) efficiency in (0, 1].
pub fn pumping_power_w(
    pressure_drop_pa: f64,
    volume_flow_m3_per_s: f64,
    efficiency: f64,
) -> Result<f64, String> {
    check_non_negative("pressure drop (Pa)", pressure_drop_pa)?;
    check_non_negative("volume flow (m³/s)", volume_flow_m3_per_s)?;
    if !(efficiency.is_finite() && efficiency > 0.0 && efficiency <= 1.0) {
        return Err(format!(
            "the pump efficiency {efficiency} is not allowed; give a fraction above 0 and at most 1"
        ));
    }
    Ok(pressure_drop_pa * volume_flow_m3_per_s / efficiency)
}

// ---------------------------------------------------------------------------------------------
// Helpers
// ---------------------------------------------------------------------------------------------

fn interpolate_transition(re: f64, re_low: f64, re_high: f64, low: f64, high: f64) -> f64 {
    let gamma = (re - re_low) / (re_high - re_low);
    (1.0 - gamma) * low + gamma * high
}

fn check_range(what: &str, value: f64, low: f64, high: f64) -> Result<(), String> {
    if value.is_finite() && (low..=high).contains(&value) {
        Ok(())
    } else {
        Err(format!(
            "the {what} is {value}; the correlation covers {low} to {high}"
        ))
    }
}

fn check_relative_roughness(value: f64) -> Result<(), String> {
    if value.is_finite() && (0.0..=0.05).contains(&value) {
        Ok(())
    } else {
        Err(format!(
            "the relative roughness ε/d is {value}; give a value from 0 (smooth) to 0.05, the Moody chart's range"
        ))
    }
}

fn check_diameter_ratio(value: f64) -> Result<(), String> {
    if value.is_finite() && value > 0.0 && value <= 1.0 {
        Ok(())
    } else {
        Err(format!(
            "the annulus diameter ratio d_i/D_o is {value}; it must lie above 0 and at most 1"
        ))
    }
}
