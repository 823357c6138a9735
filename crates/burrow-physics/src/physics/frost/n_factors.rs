//! n-factors: the ratio of the surface freezing (or thawing) index to the air index,
//! `F_surface = n·F_air` (TM 5-852-6 ch. 2; Lunardini 1978).
//!
//! Every value here is **from memory** of TM 5-852-6 (1988), table "n-factors for freezing and
//! thawing (ratios of surface index to air index)", and of V. J. Lunardini, *Theory of n-factors
//! and correlation of data*, Proc. 3rd Int. Conf. on Permafrost, 1978, without the page at hand.
//! Measured n-factors scatter widely with snow, wind, sun and surface wetness; the ranges below
//! show that scatter and a tolerance of at least ±0.1 should be assumed on any nominal value.
//! The nominal is the table's single value where it gives one and the middle of its range
//! otherwise.

/// One surface type's n-factors with their source.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NFactorPreset {
    /// Short key (kebab-case).
    pub key: &'static str,
    /// The surface described in words.
    pub surface: &'static str,
    /// Nominal freezing n-factor (surface/air freezing index).
    pub freezing: f64,
    /// Range of the freezing n-factor reported for this surface, (low, high).
    pub freezing_range: (f64, f64),
    /// Nominal thawing n-factor, `None` where the source gives none.
    pub thawing: Option<f64>,
    /// Range of the thawing n-factor, (low, high), `None` where the source gives none.
    pub thawing_range: Option<(f64, f64)>,
    /// Where the values come from.
    pub source: &'static str,
}

const TM: &str = "TM 5-852-6 (1988), table of n-factors for freezing and thawing; from memory";
const LUNARDINI: &str = "Lunardini (1978), Theory of n-factors and correlation of data; from memory";

const PRESETS: [NFactorPreset; 9] = [
    NFactorPreset {
        key: "snow-surface",
        surface: "surface of a snow cover (the snow itself is then modelled as a layer)",
        freezing: 1.0,
        freezing_range: (1.0, 1.0),
        thawing: None,
        thawing_range: None,
        source: TM,
    },
    NFactorPreset {
        key: "concrete-pavement",
        surface: "Portland cement concrete pavement kept free of snow and ice",
        freezing: 0.75,
        freezing_range: (0.75, 0.75),
        thawing: Some(1.5),
        thawing_range: Some((1.5, 1.5)),
        source: TM,
    },
    NFactorPreset {
        key: "asphalt-pavement",
        surface: "bituminous (asphalt) pavement kept free of snow and ice",
        freezing: 0.7,
        freezing_range: (0.7, 0.7),
        thawing: Some(1.8),
        thawing_range: Some((1.6, 2.0)),
        source: TM,
    },
    NFactorPreset {
        key: "bare-soil",
        surface: "bare soil kept free of snow",
        freezing: 0.7,
        freezing_range: (0.7, 0.7),
        thawing: Some(1.7),
        thawing_range: Some((1.4, 2.0)),
        source: TM,
    },
    NFactorPreset {
        key: "gravel",
        surface: "gravel road or yard kept free of snow",
        freezing: 0.9,
        freezing_range: (0.6, 1.0),
        thawing: Some(1.7),
        thawing_range: Some((1.3, 2.0)),
        source: LUNARDINI,
    },
    NFactorPreset {
        key: "shaded-surface",
        surface: "shaded surface kept free of snow",
        freezing: 0.9,
        freezing_range: (0.9, 0.9),
        thawing: Some(1.0),
        thawing_range: Some((1.0, 1.0)),
        source: TM,
    },
    NFactorPreset {
        key: "turf",
        surface: "turf (grass)",
        freezing: 0.5,
        freezing_range: (0.5, 0.5),
        thawing: Some(1.0),
        thawing_range: Some((1.0, 1.0)),
        source: TM,
    },
    NFactorPreset {
        key: "tree-covered",
        surface: "tree-covered ground",
        freezing: 0.3,
        freezing_range: (0.3, 0.3),
        thawing: Some(0.4),
        thawing_range: Some((0.4, 0.4)),
        source: TM,
    },
    NFactorPreset {
        key: "snow-covered-ground",
        surface: "natural ground under a seasonal snow cover (snow not modelled as a layer)",
        freezing: 0.35,
        freezing_range: (0.2, 0.5),
        thawing: None,
        thawing_range: None,
        source: LUNARDINI,
    },
];

/// All n-factor presets, in a fixed order.
pub fn n_factor_presets() -> &'static [NFactorPreset] {
    &PRESETS
}

/// The preset with key `key`, or an error naming the keys that exist.
pub fn n_factor_preset(key: &str) -> Result<&'static NFactorPreset, String> {
    PRESETS.iter().find(|p| p.key == key).ok_or_else(|| {
        let keys: Vec<&str> = PRESETS.iter().map(|p| p.key).collect();
        format!(
            "no n-factor preset is named '{key}'; the presets are {}",
            keys.join(", ")
        )
    })
}
