//! Freezing soil as an enthalpy material, shared by the 1-D column
//! ([`crate::engine::column`]) and the 2-D cross-section ([`crate::engine::section`]).
//!
//! # Model
//!
//! The volumetric enthalpy `H(T)` (J/m³, zero at 0 °C with all water liquid)
//! contains sensible and latent heat. Water freezes linearly between 0 °C and
//! `−freezing_interval_k`; above that range the unfrozen properties apply, below it
//! the frozen ones; inside it the conductivity is interpolated linearly in the
//! liquid fraction and the sensible capacity is the mean of the frozen and unfrozen
//! values. `H` is therefore continuous and piecewise linear in `T` (three pieces)
//! and is inverted exactly by [`Material::temperature_c`].
//!
//! # Linearised enthalpy update
//!
//! C. R. Swaminathan & V. R. Voller, "A general enthalpy method for modeling
//! solidification processes", Metallurgical Transactions B 23B (1992) 651–664
//! (from memory): an implicit step solves, per cell,
//! `V/Δt·[Hᵐ + Cᵐ(T* − Tᵐ) − Hⁿ] = net inflow(T*)` with `Cᵐ = dH/dT(Tᵐ)`, then sets
//! `Hᵐ⁺¹ = Hᵐ + Cᵐ(T* − Tᵐ)` and `Tᵐ⁺¹ = H⁻¹(Hᵐ⁺¹)` ([`Material::linearised_update`]).
//! The stored enthalpy changes by exactly the net inflow of the solved linear
//! system in every iteration, so energy is conserved to round-off whether or not
//! the iteration has converged. The linearisation was exact when no cell left its
//! piece of `H(T)` and none sits where `k` depends on `T`
//! ([`Material::linearisation_exact`]).

/// Default width (K) of the freezing range below 0 °C. Common practice, no source: enthalpy
/// schemes spread the latent heat over 0.5–1 K so that a cell freezes over several steps.
pub const DEFAULT_FREEZING_INTERVAL_K: f64 = 0.5;

/// The three linear pieces of the enthalpy curve H(T).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Piece {
    /// Below `−freezing_interval_k`: all water frozen.
    Frozen,
    /// Inside `[−freezing_interval_k, 0]` °C.
    Freezing,
    /// Above 0 °C: all water liquid.
    Unfrozen,
}

/// Thermal properties of a (possibly moist, freezing) material as functions of
/// temperature. Conductivities in W/(m·K), volumetric heat capacities in J/(m³·K).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Material {
    k_unfrozen: f64,
    k_frozen: f64,
    c_unfrozen: f64,
    c_frozen: f64,
    /// Sensible capacity inside the freezing range (mean of frozen and unfrozen).
    c_mushy: f64,
    latent: f64,
    interval: f64,
    /// Reciprocals of the unfrozen, mushy (apparent) and frozen capacities and
    /// `H` at full freezing, for the inverse of H(T) in the time loop.
    inv_c_unfrozen: f64,
    inv_c_apparent: f64,
    inv_c_frozen: f64,
    h_solidus: f64,
}

impl Material {
    /// A checked material: conductivities, capacities and the freezing interval
    /// positive and finite, `latent_heat_j_per_m3` (J/m³ of material: volumetric water
    /// content × 1000 kg/m³ × 333.55 kJ/kg, IAPWS) zero or positive.
    pub fn new(
        conductivity: f64,
        frozen_conductivity: f64,
        heat_capacity: f64,
        frozen_heat_capacity: f64,
        latent_heat_j_per_m3: f64,
        freezing_interval_k: f64,
    ) -> Result<Self, String> {
        let positive = [
            ("conductivity", conductivity),
            ("frozen conductivity", frozen_conductivity),
            ("heat capacity", heat_capacity),
            ("frozen heat capacity", frozen_heat_capacity),
            ("freezing interval", freezing_interval_k),
        ];
        for (name, value) in positive {
            if !(value.is_finite() && value > 0.0) {
                return Err(format!(
                    "the {name} is {value}; it must be a positive finite number"
                ));
            }
        }
        if !(latent_heat_j_per_m3.is_finite() && latent_heat_j_per_m3 >= 0.0) {
            return Err(format!(
                "the latent heat is {latent_heat_j_per_m3} J/m³; it must be zero or a positive finite number"
            ));
        }
        Ok(Self::from_parts(
            conductivity,
            frozen_conductivity,
            heat_capacity,
            frozen_heat_capacity,
            latent_heat_j_per_m3,
            freezing_interval_k,
        ))
    }

    /// A material without water: the same properties frozen and unfrozen.
    pub fn dry(conductivity: f64, heat_capacity: f64) -> Result<Self, String> {
        Self::new(
            conductivity,
            conductivity,
            heat_capacity,
            heat_capacity,
            0.0,
            DEFAULT_FREEZING_INTERVAL_K,
        )
    }

    /// Unchecked constructor for callers that validated the values themselves.
    pub(crate) fn from_parts(
        conductivity: f64,
        frozen_conductivity: f64,
        heat_capacity: f64,
        frozen_heat_capacity: f64,
        latent_heat_j_per_m3: f64,
        freezing_interval_k: f64,
    ) -> Self {
        let c_mushy = 0.5 * (heat_capacity + frozen_heat_capacity);
        let c_apparent = c_mushy + latent_heat_j_per_m3 / freezing_interval_k;
        Self {
            k_unfrozen: conductivity,
            k_frozen: frozen_conductivity,
            c_unfrozen: heat_capacity,
            c_frozen: frozen_heat_capacity,
            c_mushy,
            latent: latent_heat_j_per_m3,
            interval: freezing_interval_k,
            inv_c_unfrozen: 1.0 / heat_capacity,
            inv_c_apparent: 1.0 / c_apparent,
            inv_c_frozen: 1.0 / frozen_heat_capacity,
            h_solidus: -freezing_interval_k * c_apparent,
        }
    }

    /// Unfrozen conductivity, W/(m·K).
    pub fn unfrozen_conductivity(&self) -> f64 {
        self.k_unfrozen
    }

    /// Frozen conductivity, W/(m·K).
    pub fn frozen_conductivity(&self) -> f64 {
        self.k_frozen
    }

    /// Unfrozen volumetric heat capacity, J/(m³·K).
    pub fn unfrozen_heat_capacity(&self) -> f64 {
        self.c_unfrozen
    }

    /// Frozen volumetric heat capacity, J/(m³·K).
    pub fn frozen_heat_capacity(&self) -> f64 {
        self.c_frozen
    }

    /// Latent heat per unit volume, J/m³.
    pub fn latent_heat_j_per_m3(&self) -> f64 {
        self.latent
    }

    /// Width of the freezing range below 0 °C, K.
    pub fn freezing_interval_k(&self) -> f64 {
        self.interval
    }

    /// True when H(T) is one straight line and k is constant (no water, equal
    /// frozen and unfrozen properties).
    pub fn is_linear(&self) -> bool {
        self.latent == 0.0 && self.k_unfrozen == self.k_frozen && self.c_unfrozen == self.c_frozen
    }

    /// Liquid fraction: 1 above 0 °C, 0 below −interval, linear between.
    pub fn liquid_fraction(&self, t_c: f64) -> f64 {
        ((t_c + self.interval) / self.interval).clamp(0.0, 1.0)
    }

    /// Apparent capacity of the freezing range: sensible + latent spread over it.
    fn c_apparent_mushy(&self) -> f64 {
        self.c_mushy + self.latent / self.interval
    }

    /// Enthalpy at full freezing (T = −interval), J/m³; H = 0 at 0 °C unfrozen.
    fn h_solidus(&self) -> f64 {
        -self.interval * self.c_apparent_mushy()
    }

    /// Volumetric enthalpy H(T), J/m³, zero at 0 °C with all water liquid.
    pub fn enthalpy_j_per_m3(&self, t_c: f64) -> f64 {
        if t_c >= 0.0 {
            self.c_unfrozen * t_c
        } else if t_c >= -self.interval {
            self.c_apparent_mushy() * t_c
        } else {
            self.h_solidus() + self.c_frozen * (t_c + self.interval)
        }
    }

    /// Exact inverse of [`Self::enthalpy_j_per_m3`]: temperature (°C) for `h_j_per_m3`.
    pub fn temperature_c(&self, h_j_per_m3: f64) -> f64 {
        if h_j_per_m3 >= 0.0 {
            h_j_per_m3 * self.inv_c_unfrozen
        } else if h_j_per_m3 >= self.h_solidus {
            h_j_per_m3 * self.inv_c_apparent
        } else {
            -self.interval + (h_j_per_m3 - self.h_solidus) * self.inv_c_frozen
        }
    }

    /// The linear piece of H(T) that T lies in (0 °C counts as freezing).
    pub fn piece(&self, t_c: f64) -> Piece {
        if t_c > 0.0 {
            Piece::Unfrozen
        } else if t_c >= -self.interval {
            Piece::Freezing
        } else {
            Piece::Frozen
        }
    }

    /// dH/dT on the piece T lies in, J/(m³·K).
    pub fn capacity(&self, t_c: f64) -> f64 {
        match self.piece(t_c) {
            Piece::Unfrozen => self.c_unfrozen,
            Piece::Freezing => self.c_apparent_mushy(),
            Piece::Frozen => self.c_frozen,
        }
    }

    /// Conductivity (W/(m·K)), linear in the liquid fraction between frozen and unfrozen.
    pub fn conductivity(&self, t_c: f64) -> f64 {
        self.k_frozen + self.liquid_fraction(t_c) * (self.k_unfrozen - self.k_frozen)
    }

    /// Swaminathan & Voller (1992) linearised enthalpy update (see the module
    /// documentation): from the iterate `(h_j_per_m3, t_c)` and the solved temperature
    /// `t_star_c` of the linear system built with `capacity(t_c)`, returns the new
    /// `(H, T)`; `H` changes by exactly `capacity(t_c)·(t_star_c − t_c)`.
    pub fn linearised_update(&self, h_j_per_m3: f64, t_c: f64, t_star_c: f64) -> (f64, f64) {
        let h = h_j_per_m3 + self.capacity(t_c) * (t_star_c - t_c);
        (h, self.temperature_c(h))
    }

    /// True when the linear system built at `t_old_c` was exact for the update to
    /// `t_new_c`: the cell stayed on one piece of H(T) and its conductivity does not
    /// depend on temperature there.
    pub fn linearisation_exact(&self, t_old_c: f64, t_new_c: f64) -> bool {
        if self.is_linear() {
            return true;
        }
        let piece = self.piece(t_old_c);
        piece == self.piece(t_new_c) && (piece != Piece::Freezing || self.k_frozen == self.k_unfrozen)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn enthalpy_inverse_round_trips_through_all_three_ranges() {
        let m = Material::new(1.2, 2.0, 2.5e6, 1.9e6, 1.0e8, 0.5).unwrap();
        for &t in &[-12.0, -0.5, -0.3, -1e-9, 0.0, 1e-9, 4.0] {
            let back = m.temperature_c(m.enthalpy_j_per_m3(t));
            assert!((back - t).abs() < 1e-9, "{t} -> {back}");
        }
        // Latent heat plus mean sensible heat across the freezing range.
        let dh = m.enthalpy_j_per_m3(0.0) - m.enthalpy_j_per_m3(-0.5);
        assert!((dh - (1.0e8 + 0.5 * 2.2e6)).abs() < 1e-3);
    }

    #[test]
    fn material_rejects_non_positive_conductivity() {
        assert!(Material::dry(0.0, 2e6).is_err());
        assert!(Material::new(1.0, 1.0, 2e6, 2e6, -1.0, 0.5).is_err());
    }
}
