//! The validated model of a `kind: borefield` study, in model units.

/// A field of vertical ground heat exchangers (boreholes) serving a heat pump: layout, borehole
/// and loop, antifreeze, ground loads over the design life, and the limits on the mean fluid
/// temperature.
#[derive(Clone, Debug, PartialEq)]
pub struct Borefield {
    /// Borehole positions (x, y), m.
    pub positions_m: Vec<(f64, f64)>,
    /// How the layout was given, for the report (e.g. "3 × 4 rectangle, 6 m spacing").
    pub layout_description: String,
    /// Active (heat-exchanging) length H of every borehole, m; the start of the search when
    /// `size` is set.
    pub active_length_m: f64,
    /// Depth D of the top of the active length below the surface, m.
    pub top_depth_m: f64,
    pub borehole_radius_m: f64,
    pub exchanger: HeatExchanger,
    pub grout_conductivity_w_per_m_k: f64,
    /// A measured effective borehole resistance (thermal response test), m K/W; replaces the
    /// calculated one.
    pub measured_resistance_m_k_per_w: Option<f64>,
    pub fluid: crate::materials::fluids::Fluid,
    /// Volume flow through one borehole (all its circuits together), m3/s.
    pub flow_per_borehole_m3_per_s: f64,
    pub loads: GroundLoads,
    /// Limits on the mean fluid temperature, °C.
    pub min_fluid_c: f64,
    pub max_fluid_c: f64,
    /// Design life in model months (730 h each).
    pub design_life_months: usize,
    pub wall_condition: BoreholeWall,
    /// Find the active length that meets the limits.
    pub size: bool,
    /// Segments per borehole for the uniform-wall-temperature g-function.
    pub segments: usize,
    /// Wire-to-water efficiency of the circulation pump, 0..1.
    pub pump_efficiency: f64,
    /// A measured ground conductivity (thermal response test), W/(m K); replaces the
    /// depth-averaged conductivity of the soil layers.
    pub ground_conductivity_w_per_m_k: Option<f64>,
}

/// The condition at the borehole walls for the g-function.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum BoreholeWall {
    UniformTemperature,
    UniformHeatFlux,
}

/// The loop inside a borehole.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum HeatExchanger {
    SingleU {
        pipe: LoopPipe,
        /// Centre-to-centre distance of the two legs, m.
        shank_spacing_m: f64,
    },
    /// Two U-tubes in parallel, sharing the flow equally.
    DoubleU {
        pipe: LoopPipe,
        /// Centre-to-centre distance of diagonally opposite legs, m.
        shank_spacing_m: f64,
        pairing: crate::physics::borehole::DoubleUPairing,
    },
    /// An inner pipe inside an outer pipe; one stream in each.
    Coaxial { inner: LoopPipe, outer: LoopPipe },
}

/// A plastic or metal pipe of a borehole loop.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LoopPipe {
    pub outer_diameter_m: f64,
    pub wall_m: f64,
    pub conductivity_w_per_m_k: f64,
    /// Absolute roughness of the inner surface, m.
    pub roughness_m: f64,
}

impl LoopPipe {
    pub fn inner_diameter_m(&self) -> f64 {
        self.outer_diameter_m - 2.0 * self.wall_m
    }
}

/// Heat exchanged with the ground by the whole field. Energies in J, powers in W; `from_ground`
/// is taken from the ground (heating), `to_ground` given to it (cooling).
#[derive(Clone, Debug, PartialEq)]
pub enum GroundLoads {
    /// Ground-side monthly energies and peaks, January first; repeated every year.
    Monthly {
        from_ground_j: [f64; 12],
        to_ground_j: [f64; 12],
        peak_from_ground_w: [f64; 12],
        peak_to_ground_w: [f64; 12],
        peak_duration_s: f64,
    },
    /// Building-side monthly energies and peaks, turned into ground loads with the heat pump's
    /// COP and EER.
    Building {
        heating_j: [f64; 12],
        cooling_j: [f64; 12],
        peak_heating_w: [f64; 12],
        peak_cooling_w: [f64; 12],
        cop: f64,
        eer: f64,
        peak_duration_s: f64,
    },
    /// 8760 hourly ground loads, W, positive = from the ground; repeated every year.
    Hourly { from_ground_w: Vec<f64>, source: String },
    /// One load for the whole design life, W, positive = from the ground.
    Constant { from_ground_w: f64 },
}
