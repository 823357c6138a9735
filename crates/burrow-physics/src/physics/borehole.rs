//! Borehole thermal resistances: the local resistance R_b between the mean fluid temperature and
//! the mean borehole-wall temperature, the internal (short-circuit) resistance R_a between the
//! downward and upward channels, and the effective resistance R_b* over the borehole length.
//!
//! Units: radii and lengths in m, conductivities in W/(m K), resistances per metre of borehole
//! in m K/W, flow capacities ṁ c_p in W/K.
//!
//! # The cross-section (multipole method)
//!
//! Pipes of outer radius r_p sit at points z_n (complex, borehole centre at 0) of a grout disc
//! of radius r_b and conductivity λ_b; the ground around it, of conductivity λ, is infinite. The
//! fluid in pipe n has temperature T_fn; between it and the pipe's outer surface lies the pipe
//! resistance R_p (film plus wall), entering as β = 2π λ_b R_p. Steady conduction then gives
//! a linear relation between the fluid temperatures and the heat flows q_n (W/m) leaving the
//! pipes, T_f − T_b = R q, with T_b the mean temperature of the borehole wall. R is computed by
//! the multipole method of Bennet, Claesson & Hellström (1987), *Multipole method to compute
//! the conductive heat flows to and between pipes in a composite cylinder*, Notes on Heat
//! Transfer 3-1987, Lund, as summarised by Claesson & Hellström (2011), *Multipole method to
//! calculate borehole thermal resistances in a borehole heat exchanger*, HVAC&R Research 17(6)
//! 895–911. With σ = (λ_b − λ)/(λ_b + λ):
//!
//! - a line source q at z_n has in the grout the field
//!   (q/2πλ_b)[ln(r_b/|z − z_n|) + σ ln(r_b²/|r_b² − z z̄_n|)];
//! - a multipole of order k and complex strength P at z_n has the field
//!   Re[P (r_p/(z − z_n))^k + σ P̄ (r_p z/(r_b² − z z̄_n))^k];
//! - at the surface of pipe n the condition T_fn = T − β r_p ∂T/∂ρ, expanded in Fourier modes,
//!   gives P_nk + (1 − kβ)/(1 + kβ) · conj(F_nk) = 0, where F_nk is the k-th Taylor coefficient,
//!   in powers of (z − z_n)/r_p, of the field of everything except pipe n's own source and
//!   multipoles.
//!
//! Order J = 0 keeps the line sources only (the "line-source" or zeroth-order approximation);
//! each higher order adds one multipole per pipe. J = 1 reproduces the first-order closed
//! forms of Claesson & Hellström (2011) for a symmetric single U-tube (see
//! [`SingleU::first_order_closed_form`]). Orders of 6–10 converge to better than 1e-6 for
//! practical geometries.
//!
//! # Effective resistance
//!
//! Along the borehole the downward and upward channels exchange heat through R_a
//! ("thermal short circuit"). For a uniform heat flux along the depth,
//! R_b* = R_b + H²/(3 R_a (ṁ c_p)²) (Hellström 1991); for a uniform borehole-wall temperature and
//! two symmetric channels, R_b* = R_b η coth η with η = H/(ṁ c_p √(R_a R_b)). See
//! [`effective_resistance_uniform_flux`] and [`effective_resistance_uniform_wall_temperature`].

use crate::numerics::checks::positive;
use crate::numerics::dense::DenseLu;
use std::f64::consts::PI;

type C64 = faer::c64;

/// Highest multipole order accepted (higher orders gain nothing measurable in double precision).
pub const MAX_MULTIPOLE_ORDER: usize = 20;

/// Multipole order used by the convenience methods: converged to better than 1e-6 relative for
/// pipes not touching each other or the borehole wall (checked in the tests).
pub const DEFAULT_MULTIPOLE_ORDER: usize = 10;

/// One pipe of a borehole cross-section.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PipeInBorehole {
    /// Centre position from the borehole centre, m.
    pub x_m: f64,
    pub y_m: f64,
    /// Outer radius of the pipe, m.
    pub outer_radius_m: f64,
    /// Pipe resistance R_p from the fluid to the outer pipe surface (film plus wall), m K/W.
    pub pipe_resistance_m_k_per_w: f64,
}

/// A borehole cross-section: pipes in a grout disc inside infinite ground.
#[derive(Clone, Debug, PartialEq)]
pub struct CrossSection {
    pub borehole_radius_m: f64,
    /// Grout (backfill) conductivity λ_b, W/(m K).
    pub grout_conductivity_w_per_m_k: f64,
    /// Ground conductivity λ, W/(m K).
    pub ground_conductivity_w_per_m_k: f64,
    pub pipes: Vec<PipeInBorehole>,
}

/// The two resistances of a borehole per metre of depth, m K/W.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct BoreholeResistances {
    /// R_b: mean fluid temperature (all channels equal) to mean borehole-wall temperature.
    pub borehole_m_k_per_w: f64,
    /// R_a: downward to upward channels, (T_down − T_up)/q_down when q_up = −q_down.
    pub internal_m_k_per_w: f64,
}

/// The steady resistance matrix of a cross-section: `T_f − T_b = R q`, m K/W.
#[derive(Clone, Debug, PartialEq)]
pub struct ResistanceMatrix {
    /// `matrix_m_k_per_w[i][j]` = R_ij, row i the fluid temperature of pipe i, column j the heat
    /// flow of pipe j.
    pub matrix_m_k_per_w: Vec<Vec<f64>>,
}

impl ResistanceMatrix {
    /// R_b with every pipe at the same fluid temperature: 1/(1ᵀ R⁻¹ 1).
    pub fn borehole_resistance_m_k_per_w(&self) -> Result<f64, String> {
        let n = self.matrix_m_k_per_w.len();
        let (a, _, _) = self.group_conductances(&(0..n).collect::<Vec<_>>(), &[])?;
        Ok(1.0 / a)
    }

    /// R_a between the pipes of `down` (all at one fluid temperature) and those of `up` (at
    /// another): the Δ-circuit of the two groups gives R_a = R₁₂ ∥ (R₁ + R₂), which equals
    /// (T_down − T_up)/Q_down when Q_up = −Q_down.
    pub fn internal_resistance_m_k_per_w(&self, down: &[usize], up: &[usize]) -> Result<f64, String> {
        let (a, b, c) = self.group_conductances(down, up)?;
        // Two-port: Q_d = a ΔT_d + c ΔT_u, Q_u = c ΔT_d + b ΔT_u (ΔT from the borehole wall).
        // With Q_u = −Q_d: ΔT_u = −(a + c)/(b + c) ΔT_d … solved directly:
        // (ΔT_d − ΔT_u)/Q_d = (a + b + 2c)/(a b − c²).
        let det = a * b - c * c;
        if det <= 0.0 {
            return Err("the two pipe groups are not thermally independent; check the pipe layout".into());
        }
        Ok((a + b + 2.0 * c) / det)
    }

    /// Conductances of two pipe groups: a = 1_Dᵀ K 1_D, b = 1_Uᵀ K 1_U, c = 1_Dᵀ K 1_U with
    /// K = R⁻¹ (R symmetrised), from the two solves K 1_D and K 1_U.
    fn group_conductances(&self, down: &[usize], up: &[usize]) -> Result<(f64, f64, f64), String> {
        let r = &self.matrix_m_k_per_w;
        let n = r.len();
        let mut seen = vec![false; n];
        for &i in down.iter().chain(up) {
            if i >= n || seen[i] {
                return Err(format!(
                    "pipe index {i} is out of range or repeated; give each of the {n} pipes at most once"
                ));
            }
            seen[i] = true;
        }
        if down.is_empty() {
            return Err("the downward group has no pipe; name at least one".into());
        }
        if r.iter().any(|row| row.len() != n) {
            return Err(format!(
                "the resistance matrix is not square; give {n} values in each of its {n} rows"
            ));
        }
        let symmetric: Vec<f64> = (0..n)
            .flat_map(|i| (0..n).map(move |j| 0.5 * (r[i][j] + r[j][i])))
            .collect();
        let lu = DenseLu::new(n, &symmetric)
            .ok_or("the resistance matrix is singular; check that the pipes do not overlap")?;
        let indicator = |g: &[usize]| {
            let mut v = vec![0.0; n];
            g.iter().for_each(|&i| v[i] = 1.0);
            v
        };
        let (k_down, k_up) = (lu.solve(&indicator(down)), lu.solve(&indicator(up)));
        let sum = |g: &[usize], k: &[f64]| g.iter().map(|&i| k[i]).sum::<f64>();
        Ok((sum(down, &k_down), sum(up, &k_up), sum(down, &k_up)))
    }
}

impl CrossSection {
    /// Check the geometry and properties: every radius and conductivity positive, every pipe
    /// inside the borehole and clear of every other pipe, R_p ≥ 0.
    pub fn validate(&self) -> Result<(), String> {
        positive("borehole radius (m)", self.borehole_radius_m)?;
        positive("grout conductivity (W/(m K))", self.grout_conductivity_w_per_m_k)?;
        positive(
            "ground conductivity (W/(m K))",
            self.ground_conductivity_w_per_m_k,
        )?;
        if self.pipes.is_empty() {
            return Err("the cross-section has no pipe; give at least one".into());
        }
        for (i, p) in self.pipes.iter().enumerate() {
            positive("pipe outer radius (m)", p.outer_radius_m)?;
            if !(p.x_m.is_finite() && p.y_m.is_finite()) {
                return Err(format!(
                    "pipe {i} has a position that is not a number; give finite coordinates"
                ));
            }
            if !(p.pipe_resistance_m_k_per_w.is_finite() && p.pipe_resistance_m_k_per_w >= 0.0) {
                return Err(format!(
                    "pipe {i} has pipe resistance {} m K/W; it must be finite and not below 0",
                    p.pipe_resistance_m_k_per_w
                ));
            }
            if p.x_m.hypot(p.y_m) + p.outer_radius_m >= self.borehole_radius_m {
                return Err(format!(
                    "pipe {i} reaches the borehole wall; its centre distance plus outer radius must stay below the borehole radius {} m",
                    self.borehole_radius_m
                ));
            }
            for (j, o) in self.pipes.iter().enumerate().skip(i + 1) {
                if (p.x_m - o.x_m).hypot(p.y_m - o.y_m) <= p.outer_radius_m + o.outer_radius_m {
                    return Err(format!(
                        "pipes {i} and {j} overlap or touch; their centre distance must exceed the sum of their outer radii"
                    ));
                }
            }
        }
        Ok(())
    }

    /// σ = (λ_b − λ)/(λ_b + λ).
    fn sigma(&self) -> f64 {
        (self.grout_conductivity_w_per_m_k - self.ground_conductivity_w_per_m_k)
            / (self.grout_conductivity_w_per_m_k + self.ground_conductivity_w_per_m_k)
    }

    /// β_n = 2π λ_b R_p,n.
    fn beta(&self, n: usize) -> f64 {
        2.0 * PI * self.grout_conductivity_w_per_m_k * self.pipes[n].pipe_resistance_m_k_per_w
    }

    fn centre(&self, n: usize) -> C64 {
        C64::new(self.pipes[n].x_m, self.pipes[n].y_m)
    }

    /// The resistance matrix R (T_f − T_b = R q) by the multipole method of order `order`
    /// (Bennet, Claesson & Hellström 1987; order 0 is the line-source approximation).
    pub fn resistance_matrix(&self, order: usize) -> Result<ResistanceMatrix, String> {
        self.validate()?;
        if order > MAX_MULTIPOLE_ORDER {
            return Err(format!(
                "multipole order {order} is too high; use 0 to {MAX_MULTIPOLE_ORDER}"
            ));
        }
        let n_pipes = self.pipes.len();
        let solver = MultipoleSystem::new(self, order)?;
        let mut r = vec![vec![0.0; n_pipes]; n_pipes];
        for j in 0..n_pipes {
            let mut q = vec![0.0; n_pipes];
            q[j] = 1.0;
            let multipoles = solver.solve(&q);
            for (i, row) in r.iter_mut().enumerate() {
                row[j] = self.fluid_temperature_rise(i, &q, &multipoles, order);
            }
        }
        Ok(ResistanceMatrix { matrix_m_k_per_w: r })
    }

    /// T_fn − T_b for heat flows `q` and solved multipoles: R_p q_n + (q_n/2πλ_b) ln(r_b/r_p)
    /// + Re F_n0.
    fn fluid_temperature_rise(&self, n: usize, q: &[f64], multipoles: &[C64], order: usize) -> f64 {
        let c = 1.0 / (2.0 * PI * self.grout_conductivity_w_per_m_k);
        let p = &self.pipes[n];
        let f0 = self.regular_coefficients(n, q, multipoles, order, 0)[0];
        p.pipe_resistance_m_k_per_w * q[n]
            + c * q[n] * (self.borehole_radius_m / p.outer_radius_m).ln()
            + f0.re
    }

    /// Taylor coefficients F_nk, k = 0..=k_max, in powers of (z − z_n)/r_pn, of the field of all
    /// line sources, multipoles and images except pipe n's own source and multipoles.
    /// `multipoles[m * order + (j − 1)]` is P_mj.
    fn regular_coefficients(
        &self,
        n: usize,
        q: &[f64],
        multipoles: &[C64],
        order: usize,
        k_max: usize,
    ) -> Vec<C64> {
        let rb2 = self.borehole_radius_m.powi(2);
        let c = 1.0 / (2.0 * PI * self.grout_conductivity_w_per_m_k);
        let sigma = self.sigma();
        let zn = self.centre(n);
        let rn = self.pipes[n].outer_radius_m;
        let mut f = vec![C64::new(0.0, 0.0); k_max + 1];
        for (m, pipe_m) in self.pipes.iter().enumerate() {
            let zm = self.centre(m);
            let rm = pipe_m.outer_radius_m;
            let image_denominator = C64::new(rb2, 0.0) - zn * zm.conj();
            // (a) line source of another pipe.
            if m != n {
                let d = zm - zn;
                f[0] += c * q[m] * (self.borehole_radius_m / d.norm()).ln();
                for (k, fk) in f.iter_mut().enumerate().skip(1) {
                    *fk += c * q[m] / k as f64 * (C64::new(rn, 0.0) / d).powi(k as i32);
                }
            }
            // (b) image of every line source (the pipe's own included).
            f[0] += sigma * c * q[m] * (rb2 / image_denominator.norm()).ln();
            let ratio = rn * zm.conj() / image_denominator;
            for (k, fk) in f.iter_mut().enumerate().skip(1) {
                *fk += sigma * c * q[m] / k as f64 * ratio.powi(k as i32);
            }
            for j in 1..=order {
                let pmj = multipoles[m * order + (j - 1)];
                // (c) multipole of another pipe, expanded about z_n.
                if m != n {
                    let w = zn - zm;
                    for (k, fk) in f.iter_mut().enumerate() {
                        let sign = if k % 2 == 0 { 1.0 } else { -1.0 };
                        *fk += pmj * sign * binomial(j + k - 1, k) * rm.powi(j as i32) * rn.powi(k as i32)
                            / w.powi((j + k) as i32);
                    }
                }
                // (d) image of every multipole: σ P̄ (r_m h(z))^j, h(z) = z/(r_b² − z z̄_m).
                for (k, fk) in f.iter_mut().enumerate() {
                    let taylor = image_power_taylor_coefficient(zn, zm.conj(), image_denominator, j, k);
                    *fk += sigma * pmj.conj() * rm.powi(j as i32) * rn.powi(k as i32) * taylor;
                }
            }
        }
        f
    }
}

/// Coefficient of t^k in the Taylor expansion of h(z_n + t)^j, h(z) = z/(r_b² − a z), with
/// D = r_b² − a z_n: Σ_i C(j,i) z_n^(j−i) C(j+k−i−1, k−i) a^(k−i) D^(−j−k+i).
fn image_power_taylor_coefficient(zn: C64, a: C64, d: C64, j: usize, k: usize) -> C64 {
    let mut sum = C64::new(0.0, 0.0);
    for i in 0..=j.min(k) {
        let l = k - i;
        sum += binomial(j, i) * zn.powi((j - i) as i32) * binomial(j + l - 1, l) * a.powi(l as i32)
            / d.powi((j + l) as i32);
    }
    sum
}

/// Binomial coefficient C(n, k) as a float.
fn binomial(n: usize, k: usize) -> f64 {
    if k > n {
        return 0.0;
    }
    (0..k).fold(1.0, |acc, i| acc * (n - i) as f64 / (i + 1) as f64)
}

/// The linear system for the multipoles of a cross-section, factorised once:
/// P_nk + κ_nk conj(F_nk(q, P)) = 0, κ_nk = (1 − kβ_n)/(1 + kβ_n), in real and imaginary parts.
struct MultipoleSystem<'a> {
    section: &'a CrossSection,
    order: usize,
    lu: Option<DenseLu>,
}

impl<'a> MultipoleSystem<'a> {
    fn new(section: &'a CrossSection, order: usize) -> Result<Self, String> {
        let n_pipes = section.pipes.len();
        let size = 2 * n_pipes * order;
        if order == 0 {
            return Ok(Self {
                section,
                order,
                lu: None,
            });
        }
        let zero_q = vec![0.0; n_pipes];
        // Row-major: row 2·(equation) + {0: real, 1: imaginary part}.
        let mut matrix = vec![0.0; size * size];
        let mut unit = vec![C64::new(0.0, 0.0); n_pipes * order];
        for col in 0..size {
            unit.iter_mut().for_each(|u| *u = C64::new(0.0, 0.0));
            unit[col / 2] = if col % 2 == 0 {
                C64::new(1.0, 0.0)
            } else {
                C64::new(0.0, 1.0)
            };
            let residual = Self::residual(section, order, &zero_q, &unit);
            for (row, value) in residual.iter().enumerate() {
                matrix[2 * row * size + col] = value.re;
                matrix[(2 * row + 1) * size + col] = value.im;
            }
        }
        let lu = DenseLu::new(size, &matrix)
            .ok_or("the multipole equations are singular for this layout; check the pipe geometry")?;
        Ok(Self {
            section,
            order,
            lu: Some(lu),
        })
    }

    /// P + κ conj(F(q, P)) for every pipe and order.
    fn residual(section: &CrossSection, order: usize, q: &[f64], multipoles: &[C64]) -> Vec<C64> {
        let mut out = Vec::with_capacity(multipoles.len());
        for n in 0..section.pipes.len() {
            let f = section.regular_coefficients(n, q, multipoles, order, order);
            let beta = section.beta(n);
            for k in 1..=order {
                let kappa = (1.0 - k as f64 * beta) / (1.0 + k as f64 * beta);
                out.push(multipoles[n * order + (k - 1)] + kappa * f[k].conj());
            }
        }
        out
    }

    /// Multipoles for heat flows `q` (W/m).
    fn solve(&self, q: &[f64]) -> Vec<C64> {
        let Some(lu) = &self.lu else {
            return Vec::new();
        };
        let zero = vec![C64::new(0.0, 0.0); q.len() * self.order];
        let constant = Self::residual(self.section, self.order, q, &zero);
        let rhs: Vec<f64> = constant.iter().flat_map(|c| [-c.re, -c.im]).collect();
        let x = lu.solve(&rhs);
        x.chunks(2).map(|c| C64::new(c[0], c[1])).collect()
    }
}

// ---------------------------------------------------------------------------------------------
// Single and double U-tubes
// ---------------------------------------------------------------------------------------------

/// A symmetric single U-tube: two equal pipes at ±s/2 from the borehole centre.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SingleU {
    pub borehole_radius_m: f64,
    pub pipe_outer_radius_m: f64,
    /// Shank spacing s, centre to centre of the two legs, m (x_c = s/2).
    pub shank_spacing_m: f64,
    pub grout_conductivity_w_per_m_k: f64,
    pub ground_conductivity_w_per_m_k: f64,
    /// R_p of one pipe (film plus wall), m K/W.
    pub pipe_resistance_m_k_per_w: f64,
}

impl SingleU {
    /// The cross-section: pipe 0 (downward) at (+s/2, 0), pipe 1 (upward) at (−s/2, 0).
    pub fn cross_section(&self) -> CrossSection {
        let pipe = |x: f64| PipeInBorehole {
            x_m: x,
            y_m: 0.0,
            outer_radius_m: self.pipe_outer_radius_m,
            pipe_resistance_m_k_per_w: self.pipe_resistance_m_k_per_w,
        };
        CrossSection {
            borehole_radius_m: self.borehole_radius_m,
            grout_conductivity_w_per_m_k: self.grout_conductivity_w_per_m_k,
            ground_conductivity_w_per_m_k: self.ground_conductivity_w_per_m_k,
            pipes: vec![
                pipe(0.5 * self.shank_spacing_m),
                pipe(-0.5 * self.shank_spacing_m),
            ],
        }
    }

    /// R_b and R_a by the multipole method of the given order.
    pub fn resistances(&self, order: usize) -> Result<BoreholeResistances, String> {
        let r = self.cross_section().resistance_matrix(order)?;
        Ok(BoreholeResistances {
            borehole_m_k_per_w: r.borehole_resistance_m_k_per_w()?,
            internal_m_k_per_w: r.internal_resistance_m_k_per_w(&[0], &[1])?,
        })
    }

    /// R_b and R_a from the first-order closed forms of Claesson & Hellström (2011), HVAC&R
    /// Research 17(6), eqs. (13) and (14) (equation numbers from memory; the formulas were
    /// re-derived here from the first-order multipole equations and agree with
    /// [`SingleU::resistances`] at order 1 to rounding), with x_c = s/2, p = r_p²/(4x_c²):
    ///
    /// R_b = 1/(4πλ_b) [β + ln(r_b/r_p) + ln(r_b/(2x_c)) + σ ln(r_b⁴/(r_b⁴ − x_c⁴))
    ///        − p (1 − σ 4x_c⁴/(r_b⁴ − x_c⁴))² / ((1+β)/(1−β) + p (1 + σ 16 x_c⁴ r_b⁴/(r_b⁴ − x_c⁴)²))]
    ///
    /// R_a = 1/(πλ_b) [β + ln(2x_c/r_p) + σ ln((r_b² + x_c²)/(r_b² − x_c²))
    ///        − p (1 + σ 4 r_b² x_c²/(r_b⁴ − x_c⁴))² / ((1+β)/(1−β) − p + σ 2 r_p² r_b² (r_b⁴ + x_c⁴)/(r_b⁴ − x_c⁴)²)]
    pub fn first_order_closed_form(&self) -> Result<BoreholeResistances, String> {
        self.cross_section().validate()?;
        let (rb, rp, xc) = (
            self.borehole_radius_m,
            self.pipe_outer_radius_m,
            0.5 * self.shank_spacing_m,
        );
        let (lb, beta, sigma) = self.grout_beta_sigma();
        let (rb2, xc2) = (rb * rb, xc * xc);
        let (rb4, xc4) = (rb2 * rb2, xc2 * xc2);
        let p = rp * rp / (4.0 * xc2);
        let ratio = (1.0 + beta) / (1.0 - beta);
        let zeroth = self.zeroth_order_closed_form_values();
        let rb_correction = p * (1.0 - sigma * 4.0 * xc4 / (rb4 - xc4)).powi(2)
            / (ratio + p * (1.0 + sigma * 16.0 * xc4 * rb4 / (rb4 - xc4).powi(2)));
        let ra_correction = p * (1.0 + sigma * 4.0 * rb2 * xc2 / (rb4 - xc4)).powi(2)
            / (ratio - p + sigma * 2.0 * rp * rp * rb2 * (rb4 + xc4) / (rb4 - xc4).powi(2));
        Ok(BoreholeResistances {
            borehole_m_k_per_w: zeroth.borehole_m_k_per_w - rb_correction / (4.0 * PI * lb),
            internal_m_k_per_w: zeroth.internal_m_k_per_w - ra_correction / (PI * lb),
        })
    }

    /// R_b and R_a of the zeroth-order (line-source) approximation, Claesson & Hellström (2011)
    /// eqs. (8)–(9) (numbers from memory):
    /// R_b = 1/(4πλ_b)[β + ln(r_b/r_p) + ln(r_b/(2x_c)) + σ ln(r_b⁴/(r_b⁴ − x_c⁴))],
    /// R_a = 1/(πλ_b)[β + ln(2x_c/r_p) + σ ln((r_b² + x_c²)/(r_b² − x_c²))].
    pub fn zeroth_order_closed_form(&self) -> Result<BoreholeResistances, String> {
        self.cross_section().validate()?;
        Ok(self.zeroth_order_closed_form_values())
    }

    fn zeroth_order_closed_form_values(&self) -> BoreholeResistances {
        let (rb, rp, xc) = (
            self.borehole_radius_m,
            self.pipe_outer_radius_m,
            0.5 * self.shank_spacing_m,
        );
        let (lb, beta, sigma) = self.grout_beta_sigma();
        let (rb2, xc2) = (rb * rb, xc * xc);
        BoreholeResistances {
            borehole_m_k_per_w: (beta
                + (rb / rp).ln()
                + (rb / (2.0 * xc)).ln()
                + sigma * (rb2 * rb2 / (rb2 * rb2 - xc2 * xc2)).ln())
                / (4.0 * PI * lb),
            internal_m_k_per_w: (beta + (2.0 * xc / rp).ln() + sigma * ((rb2 + xc2) / (rb2 - xc2)).ln())
                / (PI * lb),
        }
    }

    fn grout_beta_sigma(&self) -> (f64, f64, f64) {
        let lb = self.grout_conductivity_w_per_m_k;
        let beta = 2.0 * PI * lb * self.pipe_resistance_m_k_per_w;
        let sigma = (lb - self.ground_conductivity_w_per_m_k) / (lb + self.ground_conductivity_w_per_m_k);
        (lb, beta, sigma)
    }
}

/// How the four legs of a double U-tube are joined into two parallel circuits.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum DoubleUPairing {
    /// Each U joins diagonally opposite pipes (0–2 and 1–3), so the two downward legs (0, 1) sit
    /// side by side, as do the two upward legs (2, 3). The usual factory layout (common practice,
    /// no source); it gives the larger R_a.
    #[default]
    Diagonal,
    /// Each U joins neighbouring pipes (0–1 and 2–3); the downward legs (0, 2) are opposite and
    /// every downward leg has two upward neighbours: the smaller R_a.
    Adjacent,
}

/// A symmetric double U-tube: four equal pipes at 90° on a circle of radius x_c, two parallel
/// circuits.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct DoubleU {
    pub borehole_radius_m: f64,
    pub pipe_outer_radius_m: f64,
    /// Centre-to-centre distance between diagonally opposite pipes, m (x_c = s/2; neighbours are
    /// √2 x_c apart).
    pub shank_spacing_m: f64,
    pub grout_conductivity_w_per_m_k: f64,
    pub ground_conductivity_w_per_m_k: f64,
    /// R_p of one pipe (film plus wall), m K/W, with the flow of one circuit.
    pub pipe_resistance_m_k_per_w: f64,
    pub pairing: DoubleUPairing,
}

impl DoubleU {
    /// Pipes 0..4 at angles 0°, 90°, 180°, 270°.
    pub fn cross_section(&self) -> CrossSection {
        let xc = 0.5 * self.shank_spacing_m;
        let pipes = [(xc, 0.0), (0.0, xc), (-xc, 0.0), (0.0, -xc)]
            .into_iter()
            .map(|(x, y)| PipeInBorehole {
                x_m: x,
                y_m: y,
                outer_radius_m: self.pipe_outer_radius_m,
                pipe_resistance_m_k_per_w: self.pipe_resistance_m_k_per_w,
            })
            .collect();
        CrossSection {
            borehole_radius_m: self.borehole_radius_m,
            grout_conductivity_w_per_m_k: self.grout_conductivity_w_per_m_k,
            ground_conductivity_w_per_m_k: self.ground_conductivity_w_per_m_k,
            pipes,
        }
    }

    /// The downward and upward legs for the pairing.
    pub fn legs(&self) -> ([usize; 2], [usize; 2]) {
        match self.pairing {
            DoubleUPairing::Diagonal => ([0, 1], [2, 3]),
            DoubleUPairing::Adjacent => ([0, 2], [1, 3]),
        }
    }

    /// R_b (all four legs at one temperature) and R_a between the two downward and the two upward
    /// legs, by the multipole method of the given order. Used with the total flow capacity of both
    /// circuits in the effective-resistance formulas.
    pub fn resistances(&self, order: usize) -> Result<BoreholeResistances, String> {
        let r = self.cross_section().resistance_matrix(order)?;
        let (down, up) = self.legs();
        Ok(BoreholeResistances {
            borehole_m_k_per_w: r.borehole_resistance_m_k_per_w()?,
            internal_m_k_per_w: r.internal_resistance_m_k_per_w(&down, &up)?,
        })
    }
}

// ---------------------------------------------------------------------------------------------
// Coaxial
// ---------------------------------------------------------------------------------------------

/// A coaxial borehole: an inner pipe inside an outer pipe, both concentric with the borehole;
/// one fluid stream in the inner pipe, the other in the annulus. Film coefficients come from
/// [`crate::physics::pipe_flow`] (tube and annulus correlations).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Coaxial {
    pub borehole_radius_m: f64,
    pub inner_pipe_inner_radius_m: f64,
    pub inner_pipe_outer_radius_m: f64,
    pub inner_pipe_conductivity_w_per_m_k: f64,
    pub outer_pipe_inner_radius_m: f64,
    pub outer_pipe_outer_radius_m: f64,
    pub outer_pipe_conductivity_w_per_m_k: f64,
    pub grout_conductivity_w_per_m_k: f64,
    /// Film coefficient inside the inner pipe, W/(m² K).
    pub h_inner_pipe_w_m2_k: f64,
    /// Annulus film coefficient on the inner pipe's outer surface, W/(m² K).
    pub h_annulus_inner_wall_w_m2_k: f64,
    /// Annulus film coefficient on the outer pipe's inner surface, W/(m² K).
    pub h_annulus_outer_wall_w_m2_k: f64,
}

impl Coaxial {
    /// Concentric resistances per metre, one cylindrical layer after another (Carslaw & Jaeger
    /// 1959 §7.2, section number from memory):
    ///
    /// R_a = 1/(2π r₁ h_i) + ln(r₂/r₁)/(2π k_i) + 1/(2π r₂ h_ai)   (inner fluid to annulus fluid)
    /// R_b = 1/(2π r₃ h_ao) + ln(r₄/r₃)/(2π k_o) + ln(r_b/r₄)/(2π λ_b)   (annulus fluid to wall)
    ///
    /// with r₁, r₂ the inner pipe's radii and r₃, r₄ the outer pipe's. Only the annulus fluid
    /// touches the borehole side, so R_b here is the local annulus-to-wall resistance; the
    /// effective resistance over the depth follows from
    /// [`effective_resistance_uniform_flux`] with these two values (see its derivation).
    pub fn resistances(&self) -> Result<BoreholeResistances, String> {
        let r = [
            self.inner_pipe_inner_radius_m,
            self.inner_pipe_outer_radius_m,
            self.outer_pipe_inner_radius_m,
            self.outer_pipe_outer_radius_m,
            self.borehole_radius_m,
        ];
        positive("inner pipe inner radius (m)", r[0])?;
        if !r.windows(2).all(|w| w[1].is_finite() && w[1] > w[0]) {
            return Err(
                "the coaxial radii must increase strictly: inner pipe inner < inner pipe outer < outer pipe inner < outer pipe outer < borehole"
                    .into(),
            );
        }
        for (what, v) in [
            (
                "inner pipe conductivity (W/(m K))",
                self.inner_pipe_conductivity_w_per_m_k,
            ),
            (
                "outer pipe conductivity (W/(m K))",
                self.outer_pipe_conductivity_w_per_m_k,
            ),
            ("grout conductivity (W/(m K))", self.grout_conductivity_w_per_m_k),
            ("inner pipe film coefficient (W/(m² K))", self.h_inner_pipe_w_m2_k),
            (
                "annulus inner-wall film coefficient (W/(m² K))",
                self.h_annulus_inner_wall_w_m2_k,
            ),
            (
                "annulus outer-wall film coefficient (W/(m² K))",
                self.h_annulus_outer_wall_w_m2_k,
            ),
        ] {
            positive(what, v)?;
        }
        let film = |radius: f64, h: f64| 1.0 / (2.0 * PI * radius * h);
        let layer = |inner: f64, outer: f64, k: f64| (outer / inner).ln() / (2.0 * PI * k);
        Ok(BoreholeResistances {
            internal_m_k_per_w: film(r[0], self.h_inner_pipe_w_m2_k)
                + layer(r[0], r[1], self.inner_pipe_conductivity_w_per_m_k)
                + film(r[1], self.h_annulus_inner_wall_w_m2_k),
            borehole_m_k_per_w: film(r[2], self.h_annulus_outer_wall_w_m2_k)
                + layer(r[2], r[3], self.outer_pipe_conductivity_w_per_m_k)
                + layer(r[3], r[4], self.grout_conductivity_w_per_m_k),
        })
    }
}

// ---------------------------------------------------------------------------------------------
// Effective borehole resistance
// ---------------------------------------------------------------------------------------------

/// Effective borehole resistance for a uniform heat flux along the depth,
/// R_b* = R_b + H²/(3 R_a (ṁ c_p)²), m K/W. G. Hellström, *Ground heat storage: thermal analyses
/// of duct storage systems*, PhD thesis, Lund 1991 (as restated by Claesson & Hellström 2011).
///
/// `flow_capacity_w_per_k` is ṁ c_p of the whole borehole (both circuits of a double U in
/// parallel). Derivation (Δ-circuit of two channels, uniform flux q'): the channel temperature
/// difference falls linearly to zero at the foot, so the mean fluid temperature exceeds the
/// depth-mean channel temperature by q' H²/(3 R_a C²). The same algebra holds when only one
/// channel touches the borehole wall, so the form applies to single-U, double-U (with R_a
/// between the downward and upward pairs) and coaxial boreholes (with the local R_b and R_a of
/// [`Coaxial::resistances`]).
pub fn effective_resistance_uniform_flux(
    borehole_m_k_per_w: f64,
    internal_m_k_per_w: f64,
    length_m: f64,
    flow_capacity_w_per_k: f64,
) -> Result<f64, String> {
    check_effective_inputs(
        borehole_m_k_per_w,
        internal_m_k_per_w,
        length_m,
        flow_capacity_w_per_k,
    )?;
    Ok(borehole_m_k_per_w + length_m.powi(2) / (3.0 * internal_m_k_per_w * flow_capacity_w_per_k.powi(2)))
}

/// Effective borehole resistance for a uniform borehole-wall temperature and two symmetric
/// channels (single U, or double U grouped into downward and upward pairs):
/// R_b* = R_b η coth η, η = H/(ṁ c_p √(R_a R_b)), m K/W (Hellström 1991). Its expansion for small
/// η is the uniform-flux form. Not for coaxial boreholes, whose channels are not symmetric.
pub fn effective_resistance_uniform_wall_temperature(
    borehole_m_k_per_w: f64,
    internal_m_k_per_w: f64,
    length_m: f64,
    flow_capacity_w_per_k: f64,
) -> Result<f64, String> {
    check_effective_inputs(
        borehole_m_k_per_w,
        internal_m_k_per_w,
        length_m,
        flow_capacity_w_per_k,
    )?;
    let eta = length_m / (flow_capacity_w_per_k * (internal_m_k_per_w * borehole_m_k_per_w).sqrt());
    if eta < 1e-4 {
        // η coth η = 1 + η²/3 − η⁴/45 + …
        return Ok(borehole_m_k_per_w * (1.0 + eta * eta / 3.0));
    }
    Ok(borehole_m_k_per_w * eta / eta.tanh())
}

fn check_effective_inputs(rb: f64, ra: f64, length_m: f64, capacity: f64) -> Result<(), String> {
    positive("borehole resistance R_b (m K/W)", rb)?;
    positive("internal resistance R_a (m K/W)", ra)?;
    positive("borehole length (m)", length_m)?;
    positive("flow capacity ṁ c_p (W/K)", capacity)
}
