//! Thermal properties of soils and rock: conductivity (Johansen 1975,
//! Kersten 1949), volumetric heat capacity from constituents, latent heat of
//! the pore water, and a small set of named presets computed from stated
//! compositions.
//!
//! Units: conductivities W/(m K), heat capacities J/(m³ K), densities kg/m³,
//! volume fractions dimensionless (m³ per m³ of soil).
//!
//! Sources:
//! - O. Johansen, "Thermal conductivity of soils", PhD thesis, Trondheim
//!   (1975); CRREL Draft Translation 637 (1977). Equations as summarised by
//!   D. T. Farouki, "Thermal properties of soils", CRREL Monograph 81-1 (1981),
//!   ch. 7 (from memory).
//! - M. S. Kersten, "Laboratory research for the determination of the thermal
//!   properties of soils", Univ. of Minnesota Engineering Experiment Station
//!   Bulletin 28 (1949); imperial forms as reproduced by Farouki (1981)
//!   (from memory).
//! - D. A. de Vries, "Thermal properties of soils", in W. R. van Wijk (ed.),
//!   Physics of Plant Environment, North-Holland (1963), Table 7.1 (from
//!   memory): heat capacities of soil constituents.

use crate::numerics::checks::positive as check_positive;
use std::sync::OnceLock;

// ---------------------------------------------------------------------------
// Constituent constants
// ---------------------------------------------------------------------------

/// Conductivity of quartz used by Johansen (1975), W/(m K).
pub const QUARTZ_CONDUCTIVITY_W_PER_M_K: f64 = 7.7;
/// Conductivity of non-quartz minerals used by Johansen (1975), W/(m K).
pub const OTHER_MINERALS_CONDUCTIVITY_W_PER_M_K: f64 = 2.0;
/// Johansen's (1975) non-quartz mineral conductivity for coarse soils whose
/// quartz fraction is at most 0.2, W/(m K).
pub const OTHER_MINERALS_LOW_QUARTZ_COARSE_W_PER_M_K: f64 = 3.0;
/// Conductivity of pore water used by Johansen (1975), W/(m K).
pub const WATER_CONDUCTIVITY_W_PER_M_K: f64 = 0.57;
/// Conductivity of pore ice used by Johansen (1975), W/(m K).
pub const ICE_CONDUCTIVITY_W_PER_M_K: f64 = 2.2;
/// Conductivity of soil organic matter, W/(m K) (de Vries 1963, Table 7.1,
/// from memory).
pub const ORGANIC_MATTER_CONDUCTIVITY_W_PER_M_K: f64 = 0.25;

/// One 15 °C calorie, J (unit of de Vries' 1963 table).
const CALORIE_15_J: f64 = 4.1855;
/// Volumetric heat capacity of soil minerals (quartz, clay minerals):
/// 0.48 cal/(cm³ K) in de Vries (1963) Table 7.1, J/(m³ K) (from memory).
pub const MINERAL_HEAT_CAPACITY_J_PER_M3_K: f64 = 0.48 * CALORIE_15_J * 1e6;
/// Volumetric heat capacity of soil organic matter: 0.60 cal/(cm³ K) in de
/// Vries (1963) Table 7.1, J/(m³ K) (from memory).
pub const ORGANIC_MATTER_HEAT_CAPACITY_J_PER_M3_K: f64 = 0.60 * CALORIE_15_J * 1e6;
/// Volumetric heat capacity of liquid water: 1.00 cal/(cm³ K) in de Vries
/// (1963) Table 7.1, J/(m³ K) (equals 998 kg/m³ × 4.19 kJ/(kg K)).
pub const WATER_HEAT_CAPACITY_J_PER_M3_K: f64 = 1.00 * CALORIE_15_J * 1e6;
/// Density of ice Ih at 0 °C and 0.1 MPa, kg/m³ (IAPWS R10-06, from memory).
pub const ICE_DENSITY_KG_PER_M3: f64 = 916.7;
/// Specific heat of ice Ih at 0 °C, J/(kg K) (IAPWS R10-06, from memory).
pub const ICE_SPECIFIC_HEAT_J_PER_KG_K: f64 = 2097.0;
/// Volumetric heat capacity of ice, J/(m³ K).
pub const ICE_HEAT_CAPACITY_J_PER_M3_K: f64 = ICE_DENSITY_KG_PER_M3 * ICE_SPECIFIC_HEAT_J_PER_KG_K;
/// Density of liquid water used to convert water volume to mass for the
/// latent heat, kg/m³ (nominal value; water at 0 °C is 999.84 kg/m³).
pub const WATER_DENSITY_NOMINAL_KG_PER_M3: f64 = 1000.0;
/// Specific latent heat of fusion of ice at 0 °C and 0.1 MPa, J/kg (IAPWS,
/// from memory).
pub const LATENT_HEAT_OF_FUSION_J_PER_KG: f64 = 333.55e3;

/// Conductivity conversion: 1 Btu_IT·in/(h·ft²·°F) in W/(m K).
const BTU_IN_PER_H_FT2_F_IN_W_PER_M_K: f64 = 0.144_227_9;
/// Density conversion: 1 lb/ft³ in kg/m³.
const LB_FT3_IN_KG_PER_M3: f64 = 16.018_463;

// ---------------------------------------------------------------------------
// Soil description
// ---------------------------------------------------------------------------

/// Johansen's two soil classes for the Kersten number.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Texture {
    /// Sands and gravels (medium and coarse grained).
    Coarse,
    /// Silts and clays.
    Fine,
}

/// State of the pore water.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum WaterPhase {
    Unfrozen,
    /// All pore water frozen (no unfrozen film water is modelled).
    Frozen,
}

/// A soil's composition as Johansen's method needs it. Build with
/// [`SoilComposition::mineral`] or [`SoilComposition::with_solids`]; the
/// constructors check every input.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SoilComposition {
    texture: Texture,
    porosity: f64,
    saturation: f64,
    solids_density_kg_per_m3: f64,
    solids_conductivity_w_per_m_k: f64,
    solids_heat_capacity_j_per_m3_k: f64,
}

fn check_fraction(name: &str, value: f64, lo: f64, hi: f64) -> Result<(), String> {
    if value.is_finite() && value >= lo && value <= hi {
        Ok(())
    } else {
        Err(format!(
            "{name} {value} is outside the allowed range {lo} to {hi}"
        ))
    }
}

impl SoilComposition {
    /// A mineral soil. `porosity` (m³ voids per m³ soil, 0 < n < 1),
    /// `saturation` (fraction of the voids filled with water, 0–1),
    /// `quartz_fraction` (of the solids, 0–1) and `solids_density_kg_per_m3`
    /// (particle density, typically 2650–2750 kg/m³). Solids conductivity
    /// from [`johansen_solids_conductivity_w_per_m_k`], solids heat capacity
    /// [`MINERAL_HEAT_CAPACITY_J_PER_M3_K`].
    pub fn mineral(
        texture: Texture,
        porosity: f64,
        saturation: f64,
        quartz_fraction: f64,
        solids_density_kg_per_m3: f64,
    ) -> Result<Self, String> {
        check_fraction("quartz fraction", quartz_fraction, 0.0, 1.0)?;
        Self::with_solids(
            texture,
            porosity,
            saturation,
            solids_density_kg_per_m3,
            johansen_solids_conductivity_w_per_m_k(quartz_fraction, texture),
            MINERAL_HEAT_CAPACITY_J_PER_M3_K,
        )
    }

    /// A soil whose solids are described directly (e.g. organic soils, with
    /// [`ORGANIC_MATTER_CONDUCTIVITY_W_PER_M_K`] and
    /// [`ORGANIC_MATTER_HEAT_CAPACITY_J_PER_M3_K`]).
    pub fn with_solids(
        texture: Texture,
        porosity: f64,
        saturation: f64,
        solids_density_kg_per_m3: f64,
        solids_conductivity_w_per_m_k: f64,
        solids_heat_capacity_j_per_m3_k: f64,
    ) -> Result<Self, String> {
        if !(porosity.is_finite() && porosity > 0.0 && porosity < 1.0) {
            return Err(format!("porosity {porosity} must lie strictly between 0 and 1"));
        }
        check_fraction("saturation", saturation, 0.0, 1.0)?;
        check_positive("solids density (kg/m³)", solids_density_kg_per_m3)?;
        check_positive("solids conductivity (W/(m K))", solids_conductivity_w_per_m_k)?;
        check_positive("solids heat capacity (J/(m³ K))", solids_heat_capacity_j_per_m3_k)?;
        Ok(SoilComposition {
            texture,
            porosity,
            saturation,
            solids_density_kg_per_m3,
            solids_conductivity_w_per_m_k,
            solids_heat_capacity_j_per_m3_k,
        })
    }

    pub fn texture(&self) -> Texture {
        self.texture
    }
    pub fn porosity(&self) -> f64 {
        self.porosity
    }
    pub fn saturation(&self) -> f64 {
        self.saturation
    }
    pub fn solids_density_kg_per_m3(&self) -> f64 {
        self.solids_density_kg_per_m3
    }
    pub fn solids_conductivity_w_per_m_k(&self) -> f64 {
        self.solids_conductivity_w_per_m_k
    }
    pub fn solids_heat_capacity_j_per_m3_k(&self) -> f64 {
        self.solids_heat_capacity_j_per_m3_k
    }
    /// Dry density ρd = (1 − n) ρs, kg/m³.
    pub fn dry_density_kg_per_m3(&self) -> f64 {
        (1.0 - self.porosity) * self.solids_density_kg_per_m3
    }
    /// Volumetric water content θ = n Sr (m³ water per m³ soil, counted as
    /// liquid water).
    pub fn water_content(&self) -> f64 {
        self.porosity * self.saturation
    }
    /// Gravimetric moisture content w = θ ρw / ρd in percent of dry mass
    /// (the quantity Kersten's correlations use).
    pub fn moisture_content_percent(&self) -> f64 {
        100.0 * self.water_content() * WATER_DENSITY_NOMINAL_KG_PER_M3 / self.dry_density_kg_per_m3()
    }
}

// ---------------------------------------------------------------------------
// Johansen (1975)
// ---------------------------------------------------------------------------

/// Conductivity of the solids, W/(m K): Johansen's geometric mean
/// k_s = k_q^q · k_o^(1−q), k_q = 7.7 W/(m K), k_o = 2.0 W/(m K), or 3.0 W/(m K)
/// for coarse soils with q ≤ 0.2 (Johansen 1975; Farouki 1981, eq. 7.19,
/// equation number from memory).
pub fn johansen_solids_conductivity_w_per_m_k(quartz_fraction: f64, texture: Texture) -> f64 {
    let k_other = if texture == Texture::Coarse && quartz_fraction <= 0.2 {
        OTHER_MINERALS_LOW_QUARTZ_COARSE_W_PER_M_K
    } else {
        OTHER_MINERALS_CONDUCTIVITY_W_PER_M_K
    };
    QUARTZ_CONDUCTIVITY_W_PER_M_K.powf(quartz_fraction) * k_other.powf(1.0 - quartz_fraction)
}

/// Dry conductivity of natural soils, W/(m K), from dry density ρd (kg/m³):
/// k_dry = (0.135 ρd + 64.7) / (2700 − 0.947 ρd), stated ±20 % (Johansen
/// 1975; Farouki 1981, eq. 7.16, equation number from memory).
pub fn johansen_dry_conductivity_w_per_m_k(dry_density_kg_per_m3: f64) -> f64 {
    (0.135 * dry_density_kg_per_m3 + 64.7) / (2700.0 - 0.947 * dry_density_kg_per_m3)
}

/// Saturated conductivity, W/(m K): geometric mean of solids and pore
/// filling, k_sat = k_s^(1−n) · k_f^n with k_f = 0.57 W/(m K) (water) or
/// 2.2 W/(m K) (ice) (Johansen 1975; Farouki 1981, eqs. 7.17–7.18).
pub fn johansen_saturated_conductivity_w_per_m_k(
    solids_conductivity_w_per_m_k: f64,
    porosity: f64,
    phase: WaterPhase,
) -> f64 {
    let k_fill = match phase {
        WaterPhase::Unfrozen => WATER_CONDUCTIVITY_W_PER_M_K,
        WaterPhase::Frozen => ICE_CONDUCTIVITY_W_PER_M_K,
    };
    solids_conductivity_w_per_m_k.powf(1.0 - porosity) * k_fill.powf(porosity)
}

/// Kersten number Ke(Sr) of Johansen (1975): unfrozen coarse soils
/// Ke = 0.7 log10 Sr + 1.0 (Sr > 0.05), unfrozen fine soils
/// Ke = log10 Sr + 1.0 (Sr > 0.1), frozen soils Ke = Sr. Values are kept in
/// [0, 1] (the logarithmic forms are negative below their stated ranges).
pub fn kersten_number(saturation: f64, texture: Texture, phase: WaterPhase) -> f64 {
    let ke = match (phase, texture) {
        (WaterPhase::Frozen, _) => saturation,
        (WaterPhase::Unfrozen, _) if saturation <= 0.0 => 0.0,
        (WaterPhase::Unfrozen, Texture::Coarse) => 0.7 * saturation.log10() + 1.0,
        (WaterPhase::Unfrozen, Texture::Fine) => saturation.log10() + 1.0,
    };
    ke.clamp(0.0, 1.0)
}

/// Thermal conductivity of a soil by Johansen's (1975) method, W/(m K):
/// k = (k_sat − k_dry) Ke + k_dry (Farouki 1981, eq. 7.15).
pub fn johansen_conductivity(soil: &SoilComposition, phase: WaterPhase) -> f64 {
    let k_dry = johansen_dry_conductivity_w_per_m_k(soil.dry_density_kg_per_m3());
    let k_sat =
        johansen_saturated_conductivity_w_per_m_k(soil.solids_conductivity_w_per_m_k, soil.porosity, phase);
    let ke = kersten_number(soil.saturation, soil.texture, phase);
    (k_sat - k_dry) * ke + k_dry
}

// ---------------------------------------------------------------------------
// Kersten (1949)
// ---------------------------------------------------------------------------

/// Kersten's two soil groups.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum KerstenSoil {
    /// Silt and clay soils.
    SiltClay,
    /// Sandy soils.
    Sandy,
}

impl KerstenSoil {
    /// Smallest moisture content (% of dry mass) Kersten's fits are stated
    /// for: 7 % for silt-clay, 1 % for sandy soils.
    pub fn min_moisture_content_percent(self) -> f64 {
        match self {
            KerstenSoil::SiltClay => 7.0,
            KerstenSoil::Sandy => 1.0,
        }
    }
}

/// Thermal conductivity by Kersten's (1949) correlations, W/(m K).
///
/// In Kersten's imperial form, k in Btu·in/(h·ft²·°F), γd dry density in
/// lb/ft³, w moisture content in % of dry mass:
/// - silt-clay, unfrozen: k = (0.9 log10 w − 0.2) · 10^(0.01 γd)
/// - sandy, unfrozen:     k = (0.7 log10 w + 0.4) · 10^(0.01 γd)
/// - silt-clay, frozen:   k = 0.01 · 10^(0.022 γd) + 0.085 · 10^(0.008 γd) · w
/// - sandy, frozen:       k = 0.076 · 10^(0.013 γd) + 0.032 · 10^(0.0146 γd) · w
///
/// (Kersten 1949; Farouki 1981, eqs. 7.1–7.4, from memory.) Inputs here are
/// SI (kg/m³) and the result is converted to W/(m K).
pub fn kersten_conductivity(
    soil: KerstenSoil,
    phase: WaterPhase,
    dry_density_kg_per_m3: f64,
    moisture_content_percent: f64,
) -> Result<f64, String> {
    check_positive("dry density (kg/m³)", dry_density_kg_per_m3)?;
    let w_min = soil.min_moisture_content_percent();
    if !(moisture_content_percent.is_finite() && moisture_content_percent >= w_min) {
        return Err(format!(
            "moisture content {moisture_content_percent} % is below the {w_min} % that Kersten's correlation for {soil:?} soils covers"
        ));
    }
    let gamma = dry_density_kg_per_m3 / LB_FT3_IN_KG_PER_M3;
    let w = moisture_content_percent;
    let k_imperial = match (soil, phase) {
        (KerstenSoil::SiltClay, WaterPhase::Unfrozen) => (0.9 * w.log10() - 0.2) * 10f64.powf(0.01 * gamma),
        (KerstenSoil::Sandy, WaterPhase::Unfrozen) => (0.7 * w.log10() + 0.4) * 10f64.powf(0.01 * gamma),
        (KerstenSoil::SiltClay, WaterPhase::Frozen) => {
            0.01 * 10f64.powf(0.022 * gamma) + 0.085 * 10f64.powf(0.008 * gamma) * w
        }
        (KerstenSoil::Sandy, WaterPhase::Frozen) => {
            0.076 * 10f64.powf(0.013 * gamma) + 0.032 * 10f64.powf(0.0146 * gamma) * w
        }
    };
    Ok(k_imperial * BTU_IN_PER_H_FT2_F_IN_W_PER_M_K)
}

// ---------------------------------------------------------------------------
// Heat capacity and latent heat
// ---------------------------------------------------------------------------

/// C = Σ x_i C_i over solids, liquid water and ice, J/(m³ K) (de Vries 1963,
/// eq. 7.1); air is neglected (≈1.2e3 J/(m³ K)).
fn constituent_heat_capacity_j_per_m3_k(
    solids_volume_fraction: f64,
    solids_heat_capacity_j_per_m3_k: f64,
    water_volume_fraction: f64,
    ice_volume_fraction: f64,
) -> f64 {
    solids_volume_fraction * solids_heat_capacity_j_per_m3_k
        + water_volume_fraction * WATER_HEAT_CAPACITY_J_PER_M3_K
        + ice_volume_fraction * ICE_HEAT_CAPACITY_J_PER_M3_K
}

/// Volumetric heat capacity of a soil as the volume-weighted sum of its
/// constituents (de Vries 1963, eq. 7.1): C = Σ x_i C_i, J/(m³ K). Air is
/// neglected (≈1.2e3 J/(m³ K)). Fractions are m³ per m³ of soil, each in
/// 0–1. Because ice takes 9 % more room than the water it froze from, the
/// check on the total counts ice by the volume of its melt water:
/// solids + water + ice·ρi/ρw must not exceed 1.
pub fn volumetric_heat_capacity(
    solids_volume_fraction: f64,
    solids_heat_capacity_j_per_m3_k: f64,
    water_volume_fraction: f64,
    ice_volume_fraction: f64,
) -> Result<f64, String> {
    check_fraction("solids volume fraction", solids_volume_fraction, 0.0, 1.0)?;
    check_fraction("water volume fraction", water_volume_fraction, 0.0, 1.0)?;
    check_fraction("ice volume fraction", ice_volume_fraction, 0.0, 1.0)?;
    check_positive("solids heat capacity (J/(m³ K))", solids_heat_capacity_j_per_m3_k)?;
    let total = solids_volume_fraction
        + water_volume_fraction
        + ice_volume_fraction * ICE_DENSITY_KG_PER_M3 / WATER_DENSITY_NOMINAL_KG_PER_M3;
    if total > 1.0 + 1e-12 {
        return Err(format!(
            "solids, water and ice (as melt water) add up to {total} of the volume; at most 1 fits"
        ));
    }
    Ok(constituent_heat_capacity_j_per_m3_k(
        solids_volume_fraction,
        solids_heat_capacity_j_per_m3_k,
        water_volume_fraction,
        ice_volume_fraction,
    ))
}

/// Volume fraction of ice formed when a volume fraction `water_content` of
/// liquid water freezes (mass conserved: θ_i = θ_w ρ_w / ρ_i).
pub fn ice_fraction_from_water_content(water_content: f64) -> f64 {
    water_content * WATER_DENSITY_NOMINAL_KG_PER_M3 / ICE_DENSITY_KG_PER_M3
}

/// Volumetric heat capacity of a composition, J/(m³ K), with all pore water
/// liquid (`Unfrozen`) or all frozen (`Frozen`).
pub fn composition_heat_capacity_j_per_m3_k(soil: &SoilComposition, phase: WaterPhase) -> f64 {
    let solids = 1.0 - soil.porosity;
    let theta = soil.water_content();
    let (water, ice) = match phase {
        WaterPhase::Unfrozen => (theta, 0.0),
        WaterPhase::Frozen => (0.0, ice_fraction_from_water_content(theta)),
    };
    constituent_heat_capacity_j_per_m3_k(solids, soil.solids_heat_capacity_j_per_m3_k, water, ice)
}

/// Latent heat released when the pore water of one cubic metre of soil
/// freezes, J/m³: L = θ · ρw · L_f with θ the volumetric water content,
/// ρw = 1000 kg/m³ and L_f = 333.55 kJ/kg. Meaningful for θ in 0–1.
pub fn latent_heat_j_per_m3(water_content: f64) -> f64 {
    water_content * WATER_DENSITY_NOMINAL_KG_PER_M3 * LATENT_HEAT_OF_FUSION_J_PER_KG
}

// ---------------------------------------------------------------------------
// Presets
// ---------------------------------------------------------------------------

/// A named ground type with properties computed from a stated composition.
#[derive(Clone, Debug, PartialEq)]
pub struct SoilPreset {
    pub name: &'static str,
    pub description: &'static str,
    /// Johansen conductivity, pore water liquid.
    pub conductivity_w_per_m_k: f64,
    /// Johansen conductivity, pore water frozen.
    pub frozen_conductivity_w_per_m_k: f64,
    pub heat_capacity_j_per_m3_k: f64,
    pub frozen_heat_capacity_j_per_m3_k: f64,
    /// Volumetric water content (m³/m³).
    pub water_content: f64,
    /// Typical published range of the unfrozen conductivity.
    pub conductivity_range_w_per_m_k: (f64, f64),
    /// Where the range comes from.
    pub source: &'static str,
    /// The inputs the values above are computed from.
    pub composition: SoilComposition,
}

/// Recipe for one preset (its inputs, not its results).
struct PresetRecipe {
    name: &'static str,
    description: &'static str,
    composition: fn() -> Result<SoilComposition, String>,
    conductivity_range_w_per_m_k: (f64, f64),
    source: &'static str,
}

const SAND_POROSITY: f64 = 0.38;
const SAND_QUARTZ: f64 = 0.65;
const MINERAL_SOLIDS_DENSITY_KG_PER_M3: f64 = 2650.0;
const CLAY_SOLIDS_DENSITY_KG_PER_M3: f64 = 2700.0;
/// Particle density of organic matter, kg/m³ (de Vries 1963, from memory).
const ORGANIC_SOLIDS_DENSITY_KG_PER_M3: f64 = 1300.0;

const RECIPES: [PresetRecipe; 7] = [
    PresetRecipe {
        name: "dry-sand",
        description: "air-dry quartz sand: porosity 0.38, saturation 0.05, quartz 0.65 of solids",
        composition: || {
            SoilComposition::mineral(
                Texture::Coarse,
                SAND_POROSITY,
                0.05,
                SAND_QUARTZ,
                MINERAL_SOLIDS_DENSITY_KG_PER_M3,
            )
        },
        conductivity_range_w_per_m_k: (0.3, 0.8),
        source: "VDI 4640 Part 1 (2010) Table 1, sand dry (from memory)",
    },
    PresetRecipe {
        name: "moist-sand",
        description: "moist quartz sand above the water table: porosity 0.38, saturation 0.40, quartz 0.65",
        composition: || {
            SoilComposition::mineral(
                Texture::Coarse,
                SAND_POROSITY,
                0.40,
                SAND_QUARTZ,
                MINERAL_SOLIDS_DENSITY_KG_PER_M3,
            )
        },
        conductivity_range_w_per_m_k: (1.0, 2.5),
        source: "Farouki (1981) ch. 4, moist sands (from memory)",
    },
    PresetRecipe {
        name: "saturated-sand",
        description: "quartz sand below the water table: porosity 0.38, saturation 1.0, quartz 0.65",
        composition: || {
            SoilComposition::mineral(
                Texture::Coarse,
                SAND_POROSITY,
                1.0,
                SAND_QUARTZ,
                MINERAL_SOLIDS_DENSITY_KG_PER_M3,
            )
        },
        conductivity_range_w_per_m_k: (1.7, 5.0),
        source: "VDI 4640 Part 1 (2010) Table 1, sand water-saturated (from memory)",
    },
    PresetRecipe {
        name: "silt",
        description: "moist silt: porosity 0.45, saturation 0.80, quartz 0.35, particle density 2680 kg/m³",
        composition: || SoilComposition::mineral(Texture::Fine, 0.45, 0.80, 0.35, 2680.0),
        conductivity_range_w_per_m_k: (0.9, 2.3),
        source: "VDI 4640 Part 1 (2010) Table 1, clay/silt moist (from memory)",
    },
    PresetRecipe {
        name: "clay",
        description: "near-saturated clay: porosity 0.50, saturation 0.90, quartz 0.15, particle density 2700 kg/m³",
        composition: || {
            SoilComposition::mineral(Texture::Fine, 0.50, 0.90, 0.15, CLAY_SOLIDS_DENSITY_KG_PER_M3)
        },
        conductivity_range_w_per_m_k: (0.9, 2.3),
        source: "VDI 4640 Part 1 (2010) Table 1, clay/silt moist (from memory)",
    },
    PresetRecipe {
        name: "peat",
        description: "wet peat: porosity 0.85, saturation 0.90, organic solids (0.25 W/(m K), 1300 kg/m³); Johansen's method is an approximation for organic soils",
        composition: || {
            SoilComposition::with_solids(
                Texture::Fine,
                0.85,
                0.90,
                ORGANIC_SOLIDS_DENSITY_KG_PER_M3,
                ORGANIC_MATTER_CONDUCTIVITY_W_PER_M_K,
                ORGANIC_MATTER_HEAT_CAPACITY_J_PER_M3_K,
            )
        },
        conductivity_range_w_per_m_k: (0.2, 0.7),
        source: "VDI 4640 Part 1 (2010) Table 1, peat (from memory)",
    },
    PresetRecipe {
        name: "crystalline-rock",
        description: "granitic rock: porosity 0.01, water-saturated, quartz 0.30 of minerals",
        composition: || {
            SoilComposition::mineral(Texture::Coarse, 0.01, 1.0, 0.30, MINERAL_SOLIDS_DENSITY_KG_PER_M3)
        },
        conductivity_range_w_per_m_k: (2.5, 4.0),
        source: "handbook range for granite/gneiss, e.g. VDI 4640 Part 1 (2010) Table 1 (from memory)",
    },
];

fn build_preset(recipe: &PresetRecipe) -> Result<SoilPreset, String> {
    let composition = (recipe.composition)()?;
    Ok(SoilPreset {
        name: recipe.name,
        description: recipe.description,
        conductivity_w_per_m_k: johansen_conductivity(&composition, WaterPhase::Unfrozen),
        frozen_conductivity_w_per_m_k: johansen_conductivity(&composition, WaterPhase::Frozen),
        heat_capacity_j_per_m3_k: composition_heat_capacity_j_per_m3_k(&composition, WaterPhase::Unfrozen),
        frozen_heat_capacity_j_per_m3_k: composition_heat_capacity_j_per_m3_k(
            &composition,
            WaterPhase::Frozen,
        ),
        water_content: composition.water_content(),
        conductivity_range_w_per_m_k: recipe.conductivity_range_w_per_m_k,
        source: recipe.source,
        composition,
    })
}

/// All presets, computed once from their stated compositions. (Every recipe
/// is a fixed in-range constant; `tests/soils.rs` checks that all of them
/// are present, so none is dropped by the `ok()` below.)
pub fn presets() -> &'static [SoilPreset] {
    static PRESETS: OnceLock<Vec<SoilPreset>> = OnceLock::new();
    PRESETS.get_or_init(|| RECIPES.iter().filter_map(|r| build_preset(r).ok()).collect())
}

/// Names of all presets, in order.
pub fn preset_names() -> [&'static str; 7] {
    RECIPES.map(|r| r.name)
}

/// The preset called `name`, if any.
pub fn preset(name: &str) -> Option<&'static SoilPreset> {
    presets().iter().find(|p| p.name == name)
}
