//! Twin pipes: two carriers (supply and return) inside one insulated casing.
//!
//! The heat rates split into a symmetric part (both carriers at the mean temperature) and an
//! antisymmetric part (carriers at ±half the difference) (Wallentén 1991, *Steady-state heat
//! loss from insulated pipes*, Lund; EN 15698-1 and EN 13941-1 use the same split):
//!
//! ```text
//! q_s = (T_m − T_g)/(2·R_sym) + (T_s − T_r)/R_a        T_m = (T_s + T_r)/2
//! q_r = (T_m − T_g)/(2·R_sym) − (T_s − T_r)/R_a
//! ```
//!
//! `R_sym` (m K/W) is the resistance between both carriers together (at `T_m`) and the undisturbed
//! ground: insulation (carriers to the mean temperature of the casing's inner face), plus casing
//! wall, plus ground of the casing. `R_a` (m K/W) is the resistance between the two carriers when one
//! gives what the other takes (`(T_1 − T_2)/q_1`); the ground enters it only through the
//! conductivity ratio `σ`. In Wallentén's dimensionless form, `q = 2πλ_i·[h_s·(T_m − T_g) ±
//! h_a·(T_s − T_r)/2]` with `h_s = 1/(4πλ_i·R_sym)` and `h_a = 1/(πλ_i·R_a)`.
//!
//! The insulation part comes from the multipole method for two cylinders in a circular region of
//! one conductivity inside an infinite region of another (Bennet, Claesson & Hellström 1987,
//! *Multipole method to compute the conductive heat flows to and between pipes in a composite
//! cylinder*, Lund; first-order closed forms in Claesson & Hellström 2011, HVAC&R Research
//! 17(6), eqs. for `R_b` and `R_a`; the same first-order forms are Wallentén's twin-pipe formulas
//! used by EN 15698-1). [`TwinMethod::FirstOrder`] is that closed form; [`TwinMethod::Multipole`]
//! carries the same expansion to a higher order, solved numerically. Against a boundary-
//! collocation reference (tests/reference/buried_pipe_mfs.py) the first order is within ~1 % on
//! the total loss but errs by up to ~4 % on the small return-pipe loss for carriers closer than
//! about a diameter; order 6 agrees to < 0.1 %.
//!
//! Left out: the ground surface's effect on the antisymmetric part (relative size ~(r_c/2H)²),
//! and the casing wall in the antisymmetric part (it is in series with the ground for the
//! symmetric part only).

use super::ground::ground_resistance_m_k_per_w;
use super::wall::shell_resistance_m_k_per_w;
use super::{GroundForm, Position, Soil, finite, not_negative, positive};
use std::f64::consts::PI;

/// A twin pipe.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct TwinPipe {
    /// Centre of the casing.
    pub centre: Position,
    /// Outer radius of the casing, m.
    pub casing_outer_radius_m: f64,
    /// Wall thickness of the casing, m.
    pub casing_thickness_m: f64,
    /// Conductivity of the casing, W/(m K).
    pub casing_conductivity_w_per_m_k: f64,
    /// Conductivity of the insulation around the carriers, W/(m K).
    pub insulation_conductivity_w_per_m_k: f64,
    /// Outer radius of each carrier pipe, m (`r_o` in EN 15698-1).
    pub carrier_outer_radius_m: f64,
    /// Distance between the two carrier centres, m (`2D`), placed symmetrically about the centre.
    pub carrier_spacing_m: f64,
    /// Resistance of each carrier's wall (steel) per metre, m K/W (0 to neglect it).
    pub carrier_wall_resistance_m_k_per_w: f64,
}

/// How the insulation resistances are computed.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum TwinMethod {
    /// First-order multipole closed forms (Wallentén 1991; EN 15698-1).
    FirstOrder,
    /// Multipole method of the given order (1–20), solved numerically.
    Multipole { order: usize },
}

/// The resistances of a twin pipe, m K/W.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct TwinResistances {
    /// Both carriers together (at one temperature) to the mean temperature of the casing's inner
    /// face, including the carriers' walls.
    pub insulation_symmetric_m_k_per_w: f64,
    /// The casing wall.
    pub casing_m_k_per_w: f64,
    /// The ground around the casing ([`ground_resistance_m_k_per_w`] with the casing's outer radius).
    pub ground_m_k_per_w: f64,
    /// Between the two carriers (`R_a`), carriers' walls included.
    pub antisymmetric_m_k_per_w: f64,
    /// Insulation conductivity, W/(m K), for the dimensionless coefficients.
    insulation_conductivity_w_per_m_k: f64,
}

impl TwinResistances {
    /// `R_sym`: insulation + casing + ground, m K/W.
    pub fn symmetric_m_k_per_w(&self) -> f64 {
        self.insulation_symmetric_m_k_per_w + self.casing_m_k_per_w + self.ground_m_k_per_w
    }

    /// Wallentén's `h_s = 1/(4πλ_i·R_sym)` (dimensionless).
    pub fn h_s(&self) -> f64 {
        1.0 / (4.0 * PI * self.insulation_conductivity_w_per_m_k * self.symmetric_m_k_per_w())
    }

    /// Wallentén's `h_a = 1/(πλ_i·R_a)` (dimensionless).
    pub fn h_a(&self) -> f64 {
        1.0 / (PI * self.insulation_conductivity_w_per_m_k * self.antisymmetric_m_k_per_w)
    }

    /// Heat rates `[q_supply, q_return]`, W/m, for fluid temperatures `supply_c`, `return_c`
    /// and the undisturbed ground temperature `ground_c` at the casing's depth (°C); see the
    /// module documentation for the formula.
    pub fn heat_rates_w_per_m(
        &self,
        supply_c: f64,
        return_c: f64,
        ground_c: f64,
    ) -> Result<[f64; 2], String> {
        finite("the supply temperature", supply_c, "°C")?;
        finite("the return temperature", return_c, "°C")?;
        finite("the ground temperature", ground_c, "°C")?;
        let sym = (0.5 * (supply_c + return_c) - ground_c) / (2.0 * self.symmetric_m_k_per_w());
        let anti = (supply_c - return_c) / self.antisymmetric_m_k_per_w;
        Ok([sym + anti, sym - anti])
    }
}

impl TwinPipe {
    /// Inner radius of the casing = outer radius of the insulation, m.
    pub fn insulation_outer_radius_m(&self) -> f64 {
        self.casing_outer_radius_m - self.casing_thickness_m
    }

    fn check(&self) -> Result<(), String> {
        positive("the casing's outer radius", self.casing_outer_radius_m, "m")?;
        not_negative("the casing thickness", self.casing_thickness_m, "m")?;
        positive(
            "the casing conductivity",
            self.casing_conductivity_w_per_m_k,
            "W/(m K)",
        )?;
        positive(
            "the insulation conductivity",
            self.insulation_conductivity_w_per_m_k,
            "W/(m K)",
        )?;
        positive("the carrier radius", self.carrier_outer_radius_m, "m")?;
        not_negative(
            "the carrier wall resistance",
            self.carrier_wall_resistance_m_k_per_w,
            "m K/W",
        )?;
        let r_p = self.carrier_outer_radius_m;
        let d = 0.5 * self.carrier_spacing_m;
        if d.is_nan() || d <= r_p {
            return Err(format!(
                "the carrier spacing {} m does not exceed a carrier diameter {} m; the carriers must not touch",
                self.carrier_spacing_m,
                2.0 * r_p
            ));
        }
        if d + r_p >= self.insulation_outer_radius_m() {
            return Err(format!(
                "the carriers reach {:.4} m from the centre, beyond the insulation's outer radius {:.4} m; \
                 they must lie inside the casing",
                d + r_p,
                self.insulation_outer_radius_m()
            ));
        }
        let beta = self.beta();
        if beta >= 1.0 {
            return Err("the carrier wall resistance is implausibly large against the insulation's".into());
        }
        Ok(())
    }

    /// `β = 2πλ_i·R_p` (Claesson & Hellström 2011): the carrier wall in insulation units.
    fn beta(&self) -> f64 {
        2.0 * PI * self.insulation_conductivity_w_per_m_k * self.carrier_wall_resistance_m_k_per_w
    }

    /// `σ = (λ_i − λ_g)/(λ_i + λ_g)` (Bennet, Claesson & Hellström 1987).
    fn sigma(&self, soil: &Soil) -> f64 {
        let (li, lg) = (
            self.insulation_conductivity_w_per_m_k,
            soil.conductivity_w_per_m_k,
        );
        (li - lg) / (li + lg)
    }

    /// All resistances of the twin pipe by `method`; the ground part by `form`.
    pub fn resistances(
        &self,
        soil: &Soil,
        form: GroundForm,
        method: TwinMethod,
    ) -> Result<TwinResistances, String> {
        self.check()?;
        let (sym, anti) = match method {
            TwinMethod::FirstOrder => self.first_order(soil),
            TwinMethod::Multipole { order } => {
                if !(1..=20).contains(&order) {
                    return Err(format!(
                        "the multipole order {order} is outside the allowed 1 to 20"
                    ));
                }
                self.multipole(soil, order)?
            }
        };
        let casing = if self.casing_thickness_m > 0.0 {
            shell_resistance_m_k_per_w(
                self.insulation_outer_radius_m(),
                self.casing_outer_radius_m,
                self.casing_conductivity_w_per_m_k,
            )?
        } else {
            0.0
        };
        Ok(TwinResistances {
            insulation_symmetric_m_k_per_w: sym,
            casing_m_k_per_w: casing,
            ground_m_k_per_w: ground_resistance_m_k_per_w(
                self.centre.depth_m,
                self.casing_outer_radius_m,
                soil,
                form,
            )?,
            antisymmetric_m_k_per_w: anti,
            insulation_conductivity_w_per_m_k: self.insulation_conductivity_w_per_m_k,
        })
    }

    /// First-order multipole closed forms (Claesson & Hellström 2011, first-order `R_b` and
    /// `R_a`; Wallentén 1991 / EN 15698-1 twin-pipe `h_s`, `h_a` without the ground term), with
    /// `r_c` the insulation's outer radius, `r_p` the carrier radius, `D` half the spacing:
    ///
    /// ```text
    /// p = r_p²/(4D²)
    /// 4πλ_i·R_sym,ins = β + ln(r_c²/(2D·r_p)) + σ·ln(r_c⁴/(r_c⁴ − D⁴))
    ///     − p·(1 − σ·4D⁴/(r_c⁴ − D⁴))² / ((1+β)/(1−β) + p·(1 + σ·16D⁴r_c⁴/(r_c⁴ − D⁴)²))
    /// πλ_i·R_a = β + ln(2D/r_p) + σ·ln((r_c² + D²)/(r_c² − D²))
    ///     − p·(1 + σ·4D²r_c²/(r_c⁴ − D⁴))² / ((1+β)/(1−β) − p·(1 − σ·8D²r_c²(r_c⁴ + D⁴)/(r_c⁴ − D⁴)²))
    /// ```
    ///
    /// The structure is recalled (`from memory`) and the first-order terms were re-derived for
    /// this code; [`TwinMethod::Multipole`] at order 1 reproduces them numerically (tested).
    fn first_order(&self, soil: &Soil) -> (f64, f64) {
        let r_c = self.insulation_outer_radius_m();
        let r_p = self.carrier_outer_radius_m;
        let d = 0.5 * self.carrier_spacing_m;
        let (beta, sigma) = (self.beta(), self.sigma(soil));
        let li = self.insulation_conductivity_w_per_m_k;
        let p = r_p * r_p / (4.0 * d * d);
        let (rc2, d2) = (r_c * r_c, d * d);
        let (rc4, d4) = (rc2 * rc2, d2 * d2);
        let wall = (1.0 + beta) / (1.0 - beta);
        let sym = beta + (rc2 / (2.0 * d * r_p)).ln() + sigma * (rc4 / (rc4 - d4)).ln()
            - p * (1.0 - sigma * 4.0 * d4 / (rc4 - d4)).powi(2)
                / (wall + p * (1.0 + sigma * 16.0 * d4 * rc4 / (rc4 - d4).powi(2)));
        let anti = beta + (2.0 * d / r_p).ln() + sigma * ((rc2 + d2) / (rc2 - d2)).ln()
            - p * (1.0 + sigma * 4.0 * d2 * rc2 / (rc4 - d4)).powi(2)
                / (wall - p * (1.0 - sigma * 8.0 * d2 * rc2 * (rc4 + d4) / (rc4 - d4).powi(2)));
        (sym / (4.0 * PI * li), anti / (PI * li))
    }

    /// Multipole method to `order` (Bennet, Claesson & Hellström 1987). Inside the insulation
    /// (radius `r_c`, centre 0) the temperature above the casing's mean inner-face temperature is
    ///
    /// ```text
    /// 2πλ_i·(T − T_c) = Σ_m q_m [ln(r_c/|w − w_m|) + σ ln(r_c²/|r_c² − w·w̄_m|)]
    ///                 + Σ_m Σ_j Re[P_mj (r_p/(w − w_m))^j + σ P̄_mj (r_p w/(r_c² − w·w̄_m))^j]
    /// ```
    ///
    /// (each term with its image in the circle, which makes temperature and flux continuous into
    /// the ground). On each carrier the Fourier modes k = 1..order of the condition
    /// `T_f − T = −β·r_p·∂T/∂ρ` must vanish; the regular part's modes are taken by a 64-point
    /// discrete Fourier transform on the carrier circle. Returns `(R_sym,ins, R_a)`.
    fn multipole(&self, soil: &Soil, order: usize) -> Result<(f64, f64), String> {
        let geometry = MultipoleGeometry {
            r_c: self.insulation_outer_radius_m(),
            r_p: self.carrier_outer_radius_m,
            centres: [0.5 * self.carrier_spacing_m, -0.5 * self.carrier_spacing_m],
            sigma: self.sigma(soil),
            beta: self.beta(),
            order,
        };
        let li = self.insulation_conductivity_w_per_m_k;
        let system = geometry.system();
        let sym = geometry.fluid_excess(&system, &[1.0, 1.0])?;
        let anti = geometry.fluid_excess(&system, &[1.0, -1.0])?;
        // sym: both carriers at one temperature, total heat 2 (units of 2πλ_i).
        Ok((
            sym[0] / (2.0 * 2.0 * PI * li),
            (anti[0] - anti[1]) / (2.0 * PI * li),
        ))
    }
}

/// Number of points of the discrete Fourier transform on each carrier circle.
const DFT_POINTS: usize = 64;

struct MultipoleGeometry {
    r_c: f64,
    r_p: f64,
    centres: [f64; 2],
    sigma: f64,
    beta: f64,
    order: usize,
}

/// The part of the multipole equations that does not depend on the heat rates.
struct MultipoleSystem {
    /// Sample points on each carrier circle.
    points: [Vec<(f64, f64)>; 2],
    /// `(cos, sin)` of `2π·i/DFT_POINTS`.
    twiddles: Vec<(f64, f64)>,
    /// Rows (carrier, mode, re/im) × columns (carrier, order, re/im).
    matrix: Vec<Vec<f64>>,
    /// Mean over carrier n's circle of each unknown's regular field.
    mean_weights: [Vec<f64>; 2],
}

impl MultipoleGeometry {
    /// Condition per carrier n and mode k = 1..order (complex):
    /// `conj(P_nk)·(1 + kβ) + (1 − kβ)·a_k = 0`, with `a_k = 2·DFT_k(regular part)`; the regular
    /// part on carrier n excludes carrier n's own logarithm and singular multipoles.
    fn system(&self) -> MultipoleSystem {
        let order = self.order;
        let n_unknown = 2 * 2 * order;
        let points = [self.circle(0), self.circle(1)];
        let twiddles: Vec<(f64, f64)> = (0..DFT_POINTS)
            .map(|i| {
                let a = 2.0 * PI * i as f64 / DFT_POINTS as f64;
                (a.cos(), a.sin())
            })
            .collect();
        let mut matrix = vec![vec![0.0; n_unknown]; n_unknown];
        let mut mean_weights = [vec![0.0; n_unknown], vec![0.0; n_unknown]];
        let mut values = vec![0.0; DFT_POINTS];
        for n in 0..2 {
            for m in 0..2 {
                for j in 1..=order {
                    for part in 0..2 {
                        let col = unknown_index(m, j, part, order);
                        for (v, &w) in values.iter_mut().zip(&points[n]) {
                            *v = self.multipole_field(w, m, j, part, m != n);
                        }
                        mean_weights[n][col] = dft(&values, 0, &twiddles).0;
                        for k in 1..=order {
                            let (re, im) = dft(&values, k, &twiddles);
                            let kb = k as f64 * self.beta;
                            matrix[unknown_index(n, k, 0, order)][col] += (1.0 - kb) * 2.0 * re;
                            matrix[unknown_index(n, k, 1, order)][col] += (1.0 - kb) * 2.0 * im;
                        }
                    }
                }
            }
            for k in 1..=order {
                // conj(P) = X − iY.
                let kb = k as f64 * self.beta;
                matrix[unknown_index(n, k, 0, order)][unknown_index(n, k, 0, order)] += 1.0 + kb;
                matrix[unknown_index(n, k, 1, order)][unknown_index(n, k, 1, order)] -= 1.0 + kb;
            }
        }
        MultipoleSystem {
            points,
            twiddles,
            matrix,
            mean_weights,
        }
    }

    /// Fluid temperature excesses over the casing's mean inner-face temperature, in units of
    /// 1/(2πλ_i), for carrier heat rates `q` (W/m).
    fn fluid_excess(&self, system: &MultipoleSystem, q: &[f64; 2]) -> Result<[f64; 2], String> {
        let order = self.order;
        let mut rhs = vec![0.0; 2 * 2 * order];
        let mut mean = [0.0; 2];
        for n in 0..2 {
            let known: Vec<f64> = system.points[n]
                .iter()
                .map(|&w| self.source_field(w, q, n))
                .collect();
            mean[n] =
                dft(&known, 0, &system.twiddles).0 + q[n] * (self.r_c / self.r_p).ln() + self.beta * q[n];
            for k in 1..=order {
                let (re, im) = dft(&known, k, &system.twiddles);
                let kb = k as f64 * self.beta;
                rhs[unknown_index(n, k, 0, order)] = -(1.0 - kb) * 2.0 * re;
                rhs[unknown_index(n, k, 1, order)] = -(1.0 - kb) * 2.0 * im;
            }
        }
        let x = super::system::solve_small(system.matrix.clone(), rhs)?;
        let mut out = [0.0; 2];
        for n in 0..2 {
            out[n] = mean[n]
                + system.mean_weights[n]
                    .iter()
                    .zip(&x)
                    .map(|(w, x)| w * x)
                    .sum::<f64>();
        }
        Ok(out)
    }

    fn circle(&self, n: usize) -> Vec<(f64, f64)> {
        (0..DFT_POINTS)
            .map(|i| {
                let phi = 2.0 * PI * i as f64 / DFT_POINTS as f64;
                (self.centres[n] + self.r_p * phi.cos(), self.r_p * phi.sin())
            })
            .collect()
    }

    /// Σ_m q_m [ln(r_c/|w − w_m|) + σ ln(r_c²/|r_c² − w·w̄_m|)] without carrier `own`'s
    /// logarithm (on its own circle that is the constant ln(r_c/r_p), added by the caller).
    fn source_field(&self, w: (f64, f64), q: &[f64; 2], own: usize) -> f64 {
        let mut s = 0.0;
        for (m, (&wm, &qm)) in self.centres.iter().zip(q).enumerate() {
            if m != own {
                s += qm * (self.r_c / (w.0 - wm).hypot(w.1)).ln();
            }
            let img = (self.r_c * self.r_c - w.0 * wm, -w.1 * wm);
            s += qm * self.sigma * (self.r_c * self.r_c / img.0.hypot(img.1)).ln();
        }
        s
    }

    /// Field of unit coefficient `part` (0: Re P, 1: Im P) of multipole `(m, j)`; the direct
    /// (singular) term only when `with_direct`.
    fn multipole_field(&self, w: (f64, f64), m: usize, j: usize, part: usize, with_direct: bool) -> f64 {
        let wm = self.centres[m];
        let f1 = if with_direct {
            cpow(cdiv((self.r_p, 0.0), (w.0 - wm, w.1)), j)
        } else {
            (0.0, 0.0)
        };
        let f2 = cpow(
            cdiv(
                (self.r_p * w.0, self.r_p * w.1),
                (self.r_c * self.r_c - w.0 * wm, -w.1 * wm),
            ),
            j,
        );
        let s = self.sigma;
        // Re(P f1 + σ conj(P) f2) with P = X + iY.
        if part == 0 {
            f1.0 + s * f2.0
        } else {
            -f1.1 + s * f2.1
        }
    }
}

fn unknown_index(carrier: usize, j: usize, part: usize, order: usize) -> usize {
    (carrier * order + (j - 1)) * 2 + part
}

/// `(1/N) Σ v_i e^{−i k φ_i}` as (re, im), `φ_i = 2π i/N`.
fn dft(values: &[f64], k: usize, twiddles: &[(f64, f64)]) -> (f64, f64) {
    let n = values.len();
    let (re, im) = values.iter().enumerate().fold((0.0, 0.0), |(re, im), (i, &v)| {
        let (c, s) = twiddles[(k * i) % n];
        (re + v * c, im - v * s)
    });
    (re / n as f64, im / n as f64)
}

fn cdiv(a: (f64, f64), b: (f64, f64)) -> (f64, f64) {
    let d = b.0 * b.0 + b.1 * b.1;
    ((a.0 * b.0 + a.1 * b.1) / d, (a.1 * b.0 - a.0 * b.1) / d)
}

fn cpow(a: (f64, f64), j: usize) -> (f64, f64) {
    (1..j).fold(a, |acc, _| (acc.0 * a.0 - acc.1 * a.1, acc.0 * a.1 + acc.1 * a.0))
}
