//! Heat-carrier fluids: pure water and aqueous antifreeze mixtures.
//!
//! Concentration is always the MASS fraction of the additive (kg additive per
//! kg solution). Temperatures are in °C, properties in SI units.
//!
//! Sources (each table/correlation below carries its own comment):
//! - Pure water: Kell (1975) density equation; IAPWS-95 specific heat at
//!   0.1 MPa (tabulated, from memory); Ramires et al. (1995) conductivity;
//!   Kestin, Sokolov & Wakeham (1978) / ISO/TR 3666:1998 viscosity equation
//!   (0–40 °C) continued by IAPWS 2008 values (from memory) up to 90 °C.
//! - Propylene and ethylene glycol: freezing points from the ASHRAE
//!   Handbook—Fundamentals (2009) ch. 31 tables (from memory); density,
//!   specific heat, thermal conductivity and ln(viscosity) from the five-term
//!   correlations in ξ and 273.15/T of M. Conde, "Thermophysical properties
//!   of brines — Models", M. Conde Engineering, Zurich (2011).
//! - Ethanol: freezing points from Lange's Handbook of Chemistry, 15th ed.,
//!   Table 5.13; density at 20 °C from Osborne, McKelvey & Bearce (1913,
//!   Bull. Bur. Stand. 9, 327) with an ideal-mixing temperature correction;
//!   viscosity from Bingham & Jackson (1918, Bull. Bur. Stand. 14, 59);
//!   specific heat from International Critical Tables vol. V as reprinted in
//!   Perry's Chemical Engineers' Handbook (Table "Specific heats of aqueous
//!   solutions — ethyl alcohol"); conductivity by the Filippov mixing rule.
//!
//! None of these is the Melinder (2010) fit that the check data
//! (CoolProp's INCOMP::MPG, MEG, MEA) are computed from, so the comparison in
//! `tests/fluids.rs` is between independent sources.

/// 0 °C in kelvin.
const KELVIN_OFFSET: f64 = 273.15;

/// The liquids a buried circuit can be filled with.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Mixture {
    Water,
    PropyleneGlycol,
    EthyleneGlycol,
    Ethanol,
}

impl Mixture {
    /// Stable lower-case name used in inputs and data files.
    pub fn name(self) -> &'static str {
        match self {
            Mixture::Water => "water",
            Mixture::PropyleneGlycol => "propylene-glycol",
            Mixture::EthyleneGlycol => "ethylene-glycol",
            Mixture::Ethanol => "ethanol",
        }
    }

    /// Inverse of [`Mixture::name`].
    pub fn from_name(s: &str) -> Option<Self> {
        Self::all().into_iter().find(|m| m.name() == s)
    }

    /// Every mixture, in a fixed order.
    pub fn all() -> [Mixture; 4] {
        [
            Mixture::Water,
            Mixture::PropyleneGlycol,
            Mixture::EthyleneGlycol,
            Mixture::Ethanol,
        ]
    }

    /// Largest additive mass fraction the property sources cover.
    ///
    /// Glycols: the ASHRAE freezing-point values used here end at 50 %
    /// (Conde's 2011 property fits cover up to 60 %). Ethanol: the
    /// freezing-point table (Lange 5.13) ends at 39.0 wt %; 0.40 is reached by
    /// extending its last segment linearly by one percentage point.
    pub fn max_mass_fraction(self) -> f64 {
        match self {
            Mixture::Water => 0.0,
            Mixture::PropyleneGlycol | Mixture::EthyleneGlycol => 0.5,
            Mixture::Ethanol => 0.4,
        }
    }

    /// Upper end of the temperature range the property sources cover, °C.
    fn max_temperature_c(self) -> f64 {
        match self {
            // Water tables used here end at 90 °C; 80 °C keeps a margin.
            Mixture::Water | Mixture::PropyleneGlycol | Mixture::EthyleneGlycol => 80.0,
            // The ethanol specific-heat and density data end at 40–41 °C.
            Mixture::Ethanol => 40.0,
        }
    }
}

/// A heat-carrier fluid: a mixture at a fixed additive mass fraction.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Fluid {
    pub mixture: Mixture,
    pub mass_fraction: f64,
}

impl Fluid {
    /// Build a fluid, checking the mass fraction against the sources' range.
    ///
    /// `mass_fraction` is kg of additive per kg of solution; it must be 0 for
    /// water and within `0..=mixture.max_mass_fraction()` otherwise.
    pub fn new(mixture: Mixture, mass_fraction: f64) -> Result<Fluid, String> {
        if !mass_fraction.is_finite() {
            return Err(format!(
                "mass fraction {mass_fraction} is not a number; give a value between 0 and 1"
            ));
        }
        if mixture == Mixture::Water {
            if mass_fraction != 0.0 {
                return Err(format!(
                    "pure water takes mass fraction 0, not {mass_fraction}; choose an antifreeze mixture for other values"
                ));
            }
        } else if !(0.0..=mixture.max_mass_fraction()).contains(&mass_fraction) {
            return Err(format!(
                "mass fraction {mass_fraction} of {} is outside the covered range 0 to {}",
                mixture.name(),
                mixture.max_mass_fraction()
            ));
        }
        Ok(Fluid {
            mixture,
            mass_fraction,
        })
    }

    /// Temperature at which ice starts to form, °C.
    pub fn freezing_point_c(&self) -> f64 {
        match self.mixture {
            Mixture::Water => 0.0,
            Mixture::PropyleneGlycol => interpolate_linear(
                &GLYCOL_FREEZING_W,
                &PROPYLENE_GLYCOL_FREEZING_C,
                self.mass_fraction,
            ),
            Mixture::EthyleneGlycol => interpolate_linear(
                &GLYCOL_FREEZING_W,
                &ETHYLENE_GLYCOL_FREEZING_C,
                self.mass_fraction,
            ),
            Mixture::Ethanol => ethanol_freezing_point_c(self.mass_fraction),
        }
    }

    /// Density at `t_c` (°C), kg/m³.
    pub fn density_kg_per_m3(&self, t_c: f64) -> f64 {
        match self.mixture {
            Mixture::Water => water_density_kg_per_m3(t_c),
            Mixture::PropyleneGlycol => {
                conde_linear(&CONDE_PROPYLENE_GLYCOL.density_kg_per_m3, self.mass_fraction, t_c)
            }
            Mixture::EthyleneGlycol => {
                conde_linear(&CONDE_ETHYLENE_GLYCOL.density_kg_per_m3, self.mass_fraction, t_c)
            }
            Mixture::Ethanol => ethanol_density_kg_per_m3(self.mass_fraction, t_c),
        }
    }

    /// Isobaric specific heat at `t_c` (°C), J/(kg K).
    pub fn specific_heat_j_per_kg_k(&self, t_c: f64) -> f64 {
        match self.mixture {
            Mixture::Water => water_specific_heat_j_per_kg_k(t_c),
            Mixture::PropyleneGlycol => {
                1e3 * conde_linear(
                    &CONDE_PROPYLENE_GLYCOL.specific_heat_kj_kg_k,
                    self.mass_fraction,
                    t_c,
                )
            }
            Mixture::EthyleneGlycol => {
                1e3 * conde_linear(
                    &CONDE_ETHYLENE_GLYCOL.specific_heat_kj_kg_k,
                    self.mass_fraction,
                    t_c,
                )
            }
            Mixture::Ethanol => ethanol_specific_heat_j_per_kg_k(self.mass_fraction, t_c),
        }
    }

    /// Thermal conductivity at `t_c` (°C), W/(m K).
    pub fn conductivity_w_per_m_k(&self, t_c: f64) -> f64 {
        match self.mixture {
            Mixture::Water => water_conductivity_w_per_m_k(t_c),
            Mixture::PropyleneGlycol => conde_linear(
                &CONDE_PROPYLENE_GLYCOL.conductivity_w_per_m_k,
                self.mass_fraction,
                t_c,
            ),
            Mixture::EthyleneGlycol => conde_linear(
                &CONDE_ETHYLENE_GLYCOL.conductivity_w_per_m_k,
                self.mass_fraction,
                t_c,
            ),
            Mixture::Ethanol => ethanol_conductivity_w_per_m_k(self.mass_fraction, t_c),
        }
    }

    /// Dynamic viscosity at `t_c` (°C), Pa s.
    pub fn dynamic_viscosity_pa_s(&self, t_c: f64) -> f64 {
        match self.mixture {
            Mixture::Water => water_viscosity_pa_s(t_c),
            Mixture::PropyleneGlycol => {
                conde_linear(&CONDE_PROPYLENE_GLYCOL.ln_viscosity_pa_s, self.mass_fraction, t_c).exp()
            }
            Mixture::EthyleneGlycol => {
                conde_linear(&CONDE_ETHYLENE_GLYCOL.ln_viscosity_pa_s, self.mass_fraction, t_c).exp()
            }
            Mixture::Ethanol => ethanol_viscosity_pa_s(self.mass_fraction, t_c),
        }
    }

    /// Temperatures (°C) between which the property sources are used as
    /// published: from the freezing point up to 80 °C (water, glycols) or
    /// 40 °C (ethanol). Outside it the methods still return numbers, but they
    /// are extrapolations; use [`Fluid::check_temperature`] to refuse them.
    pub fn valid_temperature_range_c(&self) -> (f64, f64) {
        (self.freezing_point_c(), self.mixture.max_temperature_c())
    }

    /// `Ok(())` when `t_c` lies in [`Fluid::valid_temperature_range_c`].
    pub fn check_temperature(&self, t_c: f64) -> Result<(), String> {
        let (lo, hi) = self.valid_temperature_range_c();
        if t_c.is_finite() && t_c >= lo && t_c <= hi {
            Ok(())
        } else {
            Err(format!(
                "temperature {t_c} °C is outside the range {lo:.1} to {hi:.1} °C covered for {} at mass fraction {}",
                self.mixture.name(),
                self.mass_fraction
            ))
        }
    }
}

// ---------------------------------------------------------------------------
// Interpolation helpers
// ---------------------------------------------------------------------------

/// Piecewise-linear interpolation of `ys` over ascending `xs`; beyond either
/// end the first/last segment is extended linearly.
fn interpolate_linear(xs: &[f64], ys: &[f64], x: f64) -> f64 {
    debug_assert!(xs.len() == ys.len() && xs.len() >= 2);
    let last = xs.len() - 2;
    let i = xs.windows(2).position(|w| x <= w[1]).unwrap_or(last).min(last);
    let (x0, x1, y0, y1) = (xs[i], xs[i + 1], ys[i], ys[i + 1]);
    y0 + (y1 - y0) * (x - x0) / (x1 - x0)
}

// ---------------------------------------------------------------------------
// Pure water at atmospheric pressure
// ---------------------------------------------------------------------------

/// Density of air-free water at 101.325 kPa, kg/m³, `t_c` in °C.
///
/// G. S. Kell, "Density, thermal expansivity, and compressibility of liquid
/// water from 0 to 150 °C", J. Chem. Eng. Data 20 (1975) 97–105, eq. (16)
/// (coefficients from memory; they reproduce 998.20 kg/m³ at 20 °C and agree
/// with IAPWS-95 to ~10 ppm over 0–100 °C). Also used slightly below 0 °C
/// for the water part of ethanol solutions (supercooled extrapolation).
pub fn water_density_kg_per_m3(t_c: f64) -> f64 {
    let t = t_c;
    let numerator = 999.839_52 + 16.945_176 * t - 7.987_040_1e-3 * t.powi(2) - 46.170_461e-6 * t.powi(3)
        + 105.563_02e-9 * t.powi(4)
        - 280.542_53e-12 * t.powi(5);
    numerator / (1.0 + 16.879_850e-3 * t)
}

/// Temperatures of [`WATER_CP_J_PER_KG_K`], °C.
const WATER_CP_T_C: [f64; 10] = [0.0, 10.0, 20.0, 30.0, 40.0, 50.0, 60.0, 70.0, 80.0, 90.0];
/// Isobaric specific heat of liquid water, J/(kg K), IAPWS-95 (Wagner & Pruss
/// 2002) at 0.1 MPa; the 0 °C entry is the 0.01 °C value. From memory
/// (values as printed in common IAPWS-95 tables, 5 significant figures).
const WATER_CP_J_PER_KG_K: [f64; 10] = [
    4219.9, 4195.5, 4184.4, 4180.1, 4179.6, 4181.5, 4185.1, 4190.2, 4196.9, 4205.3,
];

/// Isobaric specific heat of liquid water at 0.1 MPa, J/(kg K), `t_c` in °C:
/// linear interpolation in the IAPWS-95 table [`WATER_CP_J_PER_KG_K`].
pub fn water_specific_heat_j_per_kg_k(t_c: f64) -> f64 {
    interpolate_linear(&WATER_CP_T_C, &WATER_CP_J_PER_KG_K, t_c)
}

/// Thermal conductivity of liquid water at 0.1 MPa, W/(m K), `t_c` in °C.
///
/// M. L. V. Ramires et al., "Standard reference data for the thermal
/// conductivity of water", J. Phys. Chem. Ref. Data 24 (1995) 1377, eq. (4):
/// λ/λ* = −1.48445 + 4.12292 T/T* − 1.63866 (T/T*)², λ* = 0.6065 W/(m K),
/// T* = 298.15 K; stated range 274–370 K (from memory).
pub fn water_conductivity_w_per_m_k(t_c: f64) -> f64 {
    let tr = (t_c + KELVIN_OFFSET) / 298.15;
    0.6065 * (-1.48445 + 4.12292 * tr - 1.63866 * tr * tr)
}

/// Viscosity of water at 20 °C and 0.1 MPa, Pa s (IAPWS recommended value, as
/// used by ISO/TR 3666:1998).
const WATER_VISCOSITY_20C_PA_S: f64 = 1.0016e-3;
/// Temperatures of [`WATER_VISCOSITY_HOT_PA_S`], °C.
const WATER_VISCOSITY_HOT_T_C: [f64; 6] = [40.0, 50.0, 60.0, 70.0, 80.0, 90.0];
/// Viscosity of liquid water at 0.1 MPa above 40 °C, Pa s, IAPWS 2008
/// formulation (Huber et al., J. Phys. Chem. Ref. Data 38 (2009) 101); values
/// from memory. The 40 °C entry equals the low-range equation's value there.
const WATER_VISCOSITY_HOT_PA_S: [f64; 6] = [0.6527e-3, 0.5465e-3, 0.4660e-3, 0.4035e-3, 0.3544e-3, 0.3145e-3];

/// Dynamic viscosity of liquid water at 0.1 MPa, Pa s, `t_c` in °C.
///
/// For t ≤ 40 °C: J. Kestin, M. Sokolov & W. A. Wakeham, J. Phys. Chem. Ref.
/// Data 7 (1978) 941, as adopted by ISO/TR 3666:1998:
/// log10(η/η20) = (20 − t)/(t + 96) · [1.2378 − 1.303e-3 (20 − t) +
/// 3.06e-6 (20 − t)² + 2.55e-8 (20 − t)³], η20 = 1.0016 mPa s (from memory).
///
/// Above 40 °C: ln η interpolated linearly in the IAPWS 2008 table
/// [`WATER_VISCOSITY_HOT_PA_S`].
pub fn water_viscosity_pa_s(t_c: f64) -> f64 {
    if t_c <= 40.0 {
        let d = 20.0 - t_c;
        let log_ratio = d / (t_c + 96.0) * (1.2378 - 1.303e-3 * d + 3.06e-6 * d * d + 2.55e-8 * d * d * d);
        WATER_VISCOSITY_20C_PA_S * 10f64.powf(log_ratio)
    } else {
        let ln: Vec<f64> = WATER_VISCOSITY_HOT_PA_S.iter().map(|v| v.ln()).collect();
        interpolate_linear(&WATER_VISCOSITY_HOT_T_C, &ln, t_c).exp()
    }
}

// ---------------------------------------------------------------------------
// Glycols: Conde (2011)
// ---------------------------------------------------------------------------

/// Coefficients of one Conde (2011) property correlation
/// P = A1 + A2 ξ + A3 (273.15/T) + A4 ξ (273.15/T) + A5 (273.15/T)².
type CondeCoefficients = [f64; 5];

/// The Conde (2011) model of one glycol–water solution.
struct CondeSolution {
    density_kg_per_m3: CondeCoefficients,
    specific_heat_kj_kg_k: CondeCoefficients,
    conductivity_w_per_m_k: CondeCoefficients,
    /// Correlates ln(μ / Pa s).
    ln_viscosity_pa_s: CondeCoefficients,
}

/// Monoethylene glycol–water, Conde (2011), table of MEG coefficients.
/// Transcribed from public transcriptions of the report; where two
/// transcriptions differed in a last digit (density A4: 232.72605 vs
/// 232.71643) the value shared by two of three copies is used — the
/// difference is < 0.01 kg/m³.
const CONDE_ETHYLENE_GLYCOL: CondeSolution = CondeSolution {
    density_kg_per_m3: [658.49825, -54.81501, 664.71643, 232.72605, -322.61661],
    specific_heat_kj_kg_k: [5.36449, 0.78863, -2.59001, -2.73187, 1.43759],
    conductivity_w_per_m_k: [0.83818, -1.37620, -0.07629, 1.07720, -0.20174],
    ln_viscosity_pa_s: [-4.63024, -2.14817, -12.70106, 5.40536, 10.98990],
};

/// Monopropylene glycol–water, Conde (2011), table of MPG coefficients
/// (density A5: −472.22510 in three of four transcriptions, −472.2551 in one;
/// the majority value is used, difference < 0.03 kg/m³).
const CONDE_PROPYLENE_GLYCOL: CondeSolution = CondeSolution {
    density_kg_per_m3: [508.41109, -182.40820, 965.76507, 280.29104, -472.22510],
    specific_heat_kj_kg_k: [4.47642, 0.60863, -0.71497, -1.93855, 0.47873],
    conductivity_w_per_m_k: [1.18886, -1.49110, -0.69682, 1.13633, 0.06735],
    ln_viscosity_pa_s: [-1.02798, -10.03298, -19.93497, 14.65802, 14.62050],
};

/// Conde (2011) property equation P(ξ, T) = A1 + A2 ξ + A3 θ + A4 ξ θ + A5 θ²
/// with θ = 273.15 K / T; `xi` is the glycol mass fraction, `t_c` in °C.
fn conde_linear(a: &CondeCoefficients, xi: f64, t_c: f64) -> f64 {
    let theta = KELVIN_OFFSET / (t_c + KELVIN_OFFSET);
    a[0] + a[1] * xi + a[2] * theta + a[3] * xi * theta + a[4] * theta * theta
}

/// Glycol mass fractions of the ASHRAE freezing-point tables.
const GLYCOL_FREEZING_W: [f64; 11] = [0.0, 0.05, 0.10, 0.15, 0.20, 0.25, 0.30, 0.35, 0.40, 0.45, 0.50];
/// Freezing points of ethylene glycol–water, °C, at [`GLYCOL_FREEZING_W`].
/// ASHRAE Handbook—Fundamentals (2009), ch. 31 "Physical properties of
/// secondary coolants", Table 3 (mass % column), from memory.
const ETHYLENE_GLYCOL_FREEZING_C: [f64; 11] = [
    0.0, -1.4, -3.2, -5.4, -7.8, -10.7, -14.1, -17.9, -22.3, -27.5, -33.8,
];
/// Freezing points of propylene glycol–water, °C, at [`GLYCOL_FREEZING_W`].
/// ASHRAE Handbook—Fundamentals (2009), ch. 31, Table 8 (mass % column), from
/// memory; the 20–40 % entries match a chiller maker's reprint of the table.
const PROPYLENE_GLYCOL_FREEZING_C: [f64; 11] = [
    0.0, -1.6, -3.3, -5.1, -7.1, -9.6, -12.7, -16.4, -21.1, -26.7, -33.5,
];

// ---------------------------------------------------------------------------
// Ethanol–water
// ---------------------------------------------------------------------------

/// Molar mass of ethanol, kg/mol (IUPAC atomic weights).
const ETHANOL_MOLAR_MASS_KG_MOL: f64 = 46.068e-3;
/// Molar mass of water, kg/mol (IUPAC atomic weights).
const WATER_MOLAR_MASS_KG_MOL: f64 = 18.015e-3;

/// Mass fraction of ethanol in a solution of ethanol mole fraction `x`.
fn ethanol_mass_fraction_from_mole_fraction(x: f64) -> f64 {
    let m_e = x * ETHANOL_MOLAR_MASS_KG_MOL;
    m_e / (m_e + (1.0 - x) * WATER_MOLAR_MASS_KG_MOL)
}

/// Ethanol mass fractions of [`ETHANOL_FREEZING_C`].
const ETHANOL_FREEZING_W: [f64; 16] = [
    0.0, 0.025, 0.048, 0.068, 0.113, 0.138, 0.164, 0.175, 0.188, 0.203, 0.221, 0.242, 0.267, 0.299, 0.338,
    0.390,
];
/// Freezing points of ethanol–water, °C. Lange's Handbook of Chemistry,
/// 15th ed. (1999), Table 5.13 "Freezing point of ethyl alcohol–water
/// mixtures" (% by weight column; the table prints the depression as a
/// positive number of degrees below 0 °C).
const ETHANOL_FREEZING_C: [f64; 16] = [
    0.0, -1.0, -2.0, -3.0, -5.0, -6.1, -7.5, -8.7, -9.4, -10.6, -12.2, -14.0, -16.0, -18.9, -23.6, -28.7,
];

/// Freezing point of ethanol–water at ethanol mass fraction `w`, °C: linear
/// interpolation in Lange Table 5.13 ([`ETHANOL_FREEZING_C`]); for
/// 0.390 < w ≤ 0.40 the last segment is extended.
fn ethanol_freezing_point_c(w: f64) -> f64 {
    interpolate_linear(&ETHANOL_FREEZING_W, &ETHANOL_FREEZING_C, w)
}

/// Mass fractions of [`ETHANOL_DENSITY_20C_KG_PER_M3`].
const ETHANOL_DENSITY_W: [f64; 11] = [0.0, 0.05, 0.10, 0.15, 0.20, 0.25, 0.30, 0.35, 0.40, 0.45, 0.50];
/// Density of ethanol–water at 20 °C, kg/m³: N. S. Osborne, E. C. McKelvey &
/// H. W. Bearce, Bull. Bur. Stand. 9 (1913) 327, as tabulated in the CRC
/// Handbook and Perry's Handbook (from memory; the 5 %, 10 %, 45 % and 50 %
/// entries were confirmed against reprints of the table, and the rest agree
/// with Lange Table 5.13's 20/4 °C specific gravities to 1e-4).
const ETHANOL_DENSITY_20C_KG_PER_M3: [f64; 11] = [
    998.23, 989.38, 981.87, 975.14, 968.64, 961.68, 953.82, 944.94, 935.18, 924.72, 913.84,
];

/// Density of pure liquid ethanol, kg/m³, `t_c` in °C: quadratic through
/// Mendeleev's values 806.25 (0 °C), 793.67 (15 °C), 780.96 (30 °C) kg/m³
/// (as quoted by Simmonds, "Alcohol", 1919, ch. "Specific gravity").
fn pure_ethanol_density_kg_per_m3(t_c: f64) -> f64 {
    interpolate_quadratic([0.0, 15.0, 30.0], [806.25, 793.67, 780.96], t_c)
}

/// Value at `x` of the parabola through three points.
fn interpolate_quadratic(xs: [f64; 3], ys: [f64; 3], x: f64) -> f64 {
    let l0 = (x - xs[1]) * (x - xs[2]) / ((xs[0] - xs[1]) * (xs[0] - xs[2]));
    let l1 = (x - xs[0]) * (x - xs[2]) / ((xs[1] - xs[0]) * (xs[1] - xs[2]));
    let l2 = (x - xs[0]) * (x - xs[1]) / ((xs[2] - xs[0]) * (xs[2] - xs[1]));
    ys[0] * l0 + ys[1] * l1 + ys[2] * l2
}

/// Specific volume of an ideal (no volume change on mixing) ethanol–water
/// mixture, m³/kg.
fn ideal_mixture_specific_volume_m3_kg(w: f64, t_c: f64) -> f64 {
    w / pure_ethanol_density_kg_per_m3(t_c) + (1.0 - w) / water_density_kg_per_m3(t_c)
}

/// Temperatures of [`OSBORNE_EXPANSION_ROWS`], °C.
const OSBORNE_EXPANSION_T_C: [f64; 3] = [10.0, 20.0, 40.0];
/// Density of ethanol–water at 10, 20 and 40 °C for 45 % and 50 % by weight,
/// kg/m³ (Osborne, McKelvey & Bearce 1913, as reprinted in C. Simmonds,
/// "Alcohol", 1919). Used only for the temperature dependence of the excess
/// volume; their 15–35 °C columns are left for the check in the unit tests.
const OSBORNE_EXPANSION_ROWS: [(f64, [f64; 3]); 2] =
    [(0.45, [932.26, 924.72, 908.84]), (0.50, [921.62, 913.84, 897.50])];

/// Relative temperature dependence of the excess specific volume of
/// ethanol–water, v_E(T)/v_E(20 °C): for each Osborne row the excess volume
/// is computed at 10, 20 and 40 °C, the ratios are averaged over the rows (they
/// agree to 0.3 %), and a parabola through the three points is evaluated.
fn excess_volume_temperature_factor(t_c: f64) -> f64 {
    let mut ratios = [0.0; 3];
    for (w, rho) in OSBORNE_EXPANSION_ROWS {
        let excess_20 = 1.0 / rho[1] - ideal_mixture_specific_volume_m3_kg(w, 20.0);
        for (i, t) in OSBORNE_EXPANSION_T_C.iter().enumerate() {
            let excess = 1.0 / rho[i] - ideal_mixture_specific_volume_m3_kg(w, *t);
            ratios[i] += excess / excess_20 / OSBORNE_EXPANSION_ROWS.len() as f64;
        }
    }
    interpolate_quadratic(OSBORNE_EXPANSION_T_C, ratios, t_c)
}

/// Density of ethanol–water, kg/m³, mass fraction `w`, `t_c` in °C.
///
/// 1/ρ = v_ideal(w, T) + v_E(w, 20 °C) · f(T): the ideal part follows the
/// pure-component densities (Kell for water, Mendeleev for ethanol); the
/// excess volume v_E(w, 20 °C) = 1/ρ(w, 20 °C) − v_ideal(w, 20 °C) comes from
/// the Osborne et al. 20 °C table; its temperature factor f(T)
/// ([`excess_volume_temperature_factor`]) comes from their 45–50 % columns and
/// is assumed to hold at lower concentrations. Below 10 °C f(T) is an
/// extrapolation of this module.
fn ethanol_density_kg_per_m3(w: f64, t_c: f64) -> f64 {
    let rho_20 = interpolate_linear(&ETHANOL_DENSITY_W, &ETHANOL_DENSITY_20C_KG_PER_M3, w);
    let excess_20 = 1.0 / rho_20 - ideal_mixture_specific_volume_m3_kg(w, 20.0);
    1.0 / (ideal_mixture_specific_volume_m3_kg(w, t_c) + excess_20 * excess_volume_temperature_factor(t_c))
}

/// Temperatures of the Bingham & Jackson viscosity table, °C.
const ETHANOL_VISCOSITY_T_C: [f64; 5] = [0.0, 10.0, 20.0, 30.0, 40.0];
/// Ethanol mass fractions of the Bingham & Jackson viscosity table.
const ETHANOL_VISCOSITY_W: [f64; 6] = [0.0, 0.1, 0.2, 0.3, 0.4, 0.5];
/// Viscosity of ethanol–water, mPa s, rows over temperature, columns over
/// mass fraction. E. C. Bingham & R. F. Jackson, "Standard substances for the
/// calibration of viscometers", Bull. Bur. Stand. 14 (1918) 59, as abridged in
/// Simmonds, "Alcohol" (1919).
const ETHANOL_VISCOSITY_MPA_S: [[f64; 6]; 5] = [
    [1.792, 3.311, 5.319, 6.94, 7.14, 6.58],
    [1.308, 2.179, 3.165, 4.05, 4.39, 4.18],
    [1.005, 1.538, 2.183, 2.71, 2.91, 2.87],
    [0.801, 1.160, 1.553, 1.87, 2.02, 2.02],
    [0.656, 0.907, 1.160, 1.368, 1.482, 1.499],
];

/// ln(viscosity / mPa s) of ethanol–water at the table temperature `row`
/// and mass fraction `w` (linear in w).
fn ethanol_ln_viscosity_on_row(row: usize, w: f64) -> f64 {
    let ln: Vec<f64> = ETHANOL_VISCOSITY_MPA_S[row].iter().map(|v| v.ln()).collect();
    interpolate_linear(&ETHANOL_VISCOSITY_W, &ln, w)
}

/// Dynamic viscosity of ethanol–water, Pa s, mass fraction `w`, `t_c` °C.
///
/// Within 0–40 °C: ln μ interpolated bilinearly (in w and T) in the Bingham &
/// Jackson (1918) table. Below 0 °C the table has no data; there ln μ is
/// extended linearly in 1/T (Andrade/Arrhenius form ln μ = A + B/T) through
/// the table's 0 and 10 °C values at that w. This extrapolation is made by
/// this module, not by the source; liquids such as these are more
/// temperature-sensitive than Arrhenius below 0 °C, so it tends to
/// underestimate. (A three-point Vogel–Fulcher–Tammann extrapolation was
/// tried first and overshot by up to 75 % at −19 °C against CoolProp's MEA;
/// see tests/fluids.rs.)
fn ethanol_viscosity_pa_s(w: f64, t_c: f64) -> f64 {
    let ln_mu_mpa_s = if t_c >= 0.0 {
        let ln_rows: Vec<f64> = (0..ETHANOL_VISCOSITY_T_C.len())
            .map(|r| ethanol_ln_viscosity_on_row(r, w))
            .collect();
        interpolate_linear(&ETHANOL_VISCOSITY_T_C, &ln_rows, t_c)
    } else {
        let inverse_t = |t: f64| 1.0 / (t + KELVIN_OFFSET);
        let xs = [
            inverse_t(ETHANOL_VISCOSITY_T_C[1]),
            inverse_t(ETHANOL_VISCOSITY_T_C[0]),
        ];
        let ys = [
            ethanol_ln_viscosity_on_row(1, w),
            ethanol_ln_viscosity_on_row(0, w),
        ];
        interpolate_linear(&xs, &ys, inverse_t(t_c))
    };
    1e-3 * ln_mu_mpa_s.exp()
}

/// One calorie (15 °C calorie, the unit of the International Critical
/// Tables), J.
const CALORIE_15_J: f64 = 4.1855;
/// Temperatures of the ICT ethanol–water specific-heat table, °C.
const ETHANOL_CP_T_C: [f64; 3] = [3.0, 23.0, 41.0];
/// Ethanol mole fractions of the rows of [`ETHANOL_CP_CAL_G_K`].
const ETHANOL_CP_X: [f64; 3] = [0.0416, 0.115, 0.370];
/// Specific heat of ethanol–water, cal/(g K), rows over ethanol mole fraction
/// [`ETHANOL_CP_X`], columns over [`ETHANOL_CP_T_C`]. International Critical
/// Tables vol. V, as reprinted in Perry's Chemical Engineers' Handbook
/// ("Specific heats of aqueous solutions: ethyl alcohol"). The printed values
/// have 2–3 significant figures (≈ ±0.5–1 %).
const ETHANOL_CP_CAL_G_K: [[f64; 3]; 3] = [[1.05, 1.02, 1.02], [1.02, 1.03, 1.03], [0.805, 0.86, 0.875]];

/// Specific heat of ethanol–water, J/(kg K), mass fraction `w`, `t_c` °C.
///
/// Rows of the ICT table are converted to mass fractions; the pure-water row
/// is [`water_specific_heat_j_per_kg_k`]. Each row is interpolated linearly in
/// temperature (extended linearly outside 3–41 °C), then the rows are
/// interpolated linearly in mass fraction.
fn ethanol_specific_heat_j_per_kg_k(w: f64, t_c: f64) -> f64 {
    let mut ws = vec![0.0];
    let mut cps = vec![water_specific_heat_j_per_kg_k(t_c)];
    for (x, row) in ETHANOL_CP_X.iter().zip(ETHANOL_CP_CAL_G_K.iter()) {
        ws.push(ethanol_mass_fraction_from_mole_fraction(*x));
        cps.push(1e3 * CALORIE_15_J * interpolate_linear(&ETHANOL_CP_T_C, row, t_c));
    }
    interpolate_linear(&ws, &cps, w)
}

/// Thermal conductivity of pure liquid ethanol, W/(m K), `t_c` in °C:
/// 0.168 W/(m K) at 20 °C falling 2.5e-4 W/(m K) per kelvin (from memory,
/// ±3 %, consistent with the Assael et al. reference correlation).
fn pure_ethanol_conductivity_w_per_m_k(t_c: f64) -> f64 {
    0.168 - 2.5e-4 * (t_c - 20.0)
}

/// Thermal conductivity of ethanol–water, W/(m K), mass fraction `w`.
///
/// Filippov's mixing rule for liquid mixtures, λm = w1 λ1 + w2 λ2
/// − 0.72 w1 w2 |λ2 − λ1| (B. E. Poling, J. M. Prausnitz & J. P. O'Connell,
/// The Properties of Gases and Liquids, 5th ed., 2001, Sec. 10-12, eq.
/// 10-12.1; equation number from memory), with water from Ramires et al.
/// (1995) and ethanol from [`pure_ethanol_conductivity_w_per_m_k`].
fn ethanol_conductivity_w_per_m_k(w: f64, t_c: f64) -> f64 {
    filippov_mixture_conductivity(
        w,
        pure_ethanol_conductivity_w_per_m_k(t_c),
        water_conductivity_w_per_m_k(t_c),
    )
}

/// Filippov's rule for a binary liquid mixture: `w1` is the mass fraction
/// of component 1 with conductivity `k1`; component 2 makes up the rest.
fn filippov_mixture_conductivity(w1: f64, k1: f64, k2: f64) -> f64 {
    let w2 = 1.0 - w1;
    w1 * k1 + w2 * k2 - 0.72 * w1 * w2 * (k2 - k1).abs()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn interpolation_hits_nodes_and_extends_linearly() {
        let xs = [0.0, 1.0, 3.0];
        let ys = [0.0, 10.0, 30.0];
        assert_eq!(interpolate_linear(&xs, &ys, 1.0), 10.0);
        assert!((interpolate_linear(&xs, &ys, 2.0) - 20.0).abs() < 1e-12);
        assert!((interpolate_linear(&xs, &ys, -1.0) + 10.0).abs() < 1e-12);
        assert!((interpolate_linear(&xs, &ys, 4.0) - 40.0).abs() < 1e-12);
    }

    /// Osborne, McKelvey & Bearce (1913) density table, the 15, 25, 30 and
    /// 35 °C columns for 45 % and 50 % by weight (as reprinted in Simmonds,
    /// "Alcohol", 1919), kg/m³. The model uses only the 10, 20 and 40 °C
    /// columns, so these check its temperature dependence between them; the
    /// printed values have 5 digits, the model is asked for 0.02 %.
    #[test]
    fn ethanol_density_follows_osborne_columns_not_used_in_the_model() {
        let published = [
            (0.45, 15.0, 928.52),
            (0.45, 25.0, 920.85),
            (0.45, 30.0, 916.92),
            (0.45, 35.0, 912.91),
            (0.50, 15.0, 917.76),
            (0.50, 25.0, 909.85),
            (0.50, 30.0, 905.80),
            (0.50, 35.0, 901.68),
        ];
        for (w, t, rho) in published {
            let ours = ethanol_density_kg_per_m3(w, t);
            assert!(
                (ours / rho - 1.0).abs() < 2e-4,
                "w={w} t={t}: ours {ours:.2}, Osborne {rho}"
            );
        }
    }

    #[test]
    fn ethanol_density_reproduces_its_20c_table() {
        for (w, rho) in ETHANOL_DENSITY_W.iter().zip(ETHANOL_DENSITY_20C_KG_PER_M3) {
            assert!((ethanol_density_kg_per_m3(*w, 20.0) - rho).abs() < 1e-9);
        }
    }

    #[test]
    fn mole_fraction_conversion_matches_hand_value() {
        // 4.16 mol % ethanol: 0.0416*46.068 / (0.0416*46.068 + 0.9584*18.015) = 0.09993
        assert!((ethanol_mass_fraction_from_mole_fraction(0.0416) - 0.09993).abs() < 1e-4);
    }
}
