// TEMP STUB
pub struct SoilPreset {
    pub name: &'static str,
    pub description: &'static str,
    pub conductivity_w_m_k: f64,
    pub frozen_conductivity_w_m_k: f64,
    pub heat_capacity_j_m3_k: f64,
    pub frozen_heat_capacity_j_m3_k: f64,
    pub water_content: f64,
    pub conductivity_range_w_m_k: (f64, f64),
    pub source: &'static str,
}
static P: [SoilPreset; 3] = [
    SoilPreset {
        name: "moist-sand",
        description: "",
        conductivity_w_m_k: 1.8,
        frozen_conductivity_w_m_k: 2.3,
        heat_capacity_j_m3_k: 2.3e6,
        frozen_heat_capacity_j_m3_k: 1.8e6,
        water_content: 0.2,
        conductivity_range_w_m_k: (1.0, 2.5),
        source: "stub",
    },
    SoilPreset {
        name: "clay",
        description: "",
        conductivity_w_m_k: 1.3,
        frozen_conductivity_w_m_k: 1.8,
        heat_capacity_j_m3_k: 2.8e6,
        frozen_heat_capacity_j_m3_k: 2.0e6,
        water_content: 0.35,
        conductivity_range_w_m_k: (0.8, 1.8),
        source: "stub",
    },
    SoilPreset {
        name: "crystalline-rock",
        description: "",
        conductivity_w_m_k: 3.0,
        frozen_conductivity_w_m_k: 3.0,
        heat_capacity_j_m3_k: 2.2e6,
        frozen_heat_capacity_j_m3_k: 2.2e6,
        water_content: 0.0,
        conductivity_range_w_m_k: (2.5, 4.0),
        source: "stub",
    },
];
pub fn presets() -> &'static [SoilPreset] {
    &P
}
pub fn preset(name: &str) -> Option<&'static SoilPreset> {
    P.iter().find(|p| p.name == name)
}
pub fn latent_heat_j_m3(w: f64) -> f64 {
    w * 1000.0 * 333.55e3
}
