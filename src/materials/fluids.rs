// TEMP STUB
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Mixture {
    Water,
    PropyleneGlycol,
    EthyleneGlycol,
    Ethanol,
}
impl Mixture {
    pub fn name(self) -> &'static str {
        "water"
    }
    pub fn all() -> [Mixture; 4] {
        [
            Mixture::Water,
            Mixture::PropyleneGlycol,
            Mixture::EthyleneGlycol,
            Mixture::Ethanol,
        ]
    }
    pub fn max_mass_fraction(self) -> f64 {
        0.5
    }
}
pub struct Fluid {
    pub mixture: Mixture,
    pub mass_fraction: f64,
}
impl Fluid {
    pub fn new(mixture: Mixture, mass_fraction: f64) -> Result<Fluid, String> {
        Ok(Fluid {
            mixture,
            mass_fraction,
        })
    }
    pub fn freezing_point_c(&self) -> f64 {
        0.0
    }
}
