//! The site file as written → the validated SI model. Every problem is collected, located and
//! worded for the user; values outside the usual engineering ranges are warnings.

use super::diagnostic::{Collector, KeyPath};
use super::doc::*;
use super::quantity::{Dim, Q};
use super::series_file;
use super::units::{Dimension, format_quantity};
use crate::materials::soils;
use crate::model::*;
use std::collections::HashMap;
use std::path::Path;

/// Default interval below 0 °C over which soil water freezes (see the engine for its reason).
pub use crate::engine::column::DEFAULT_FREEZING_INTERVAL_K;

pub struct Validator<'a, 'b> {
    pub out: &'b mut Collector<'a>,
    /// Folder of the site file: relative paths in it start here.
    pub base_dir: &'b Path,
}

impl Validator<'_, '_> {
    /// Converts a quantity to the model's unit, reporting a unit problem at its path.
    pub fn q<D: Dim>(&mut self, q: &Q<D>, path: &KeyPath) -> Option<f64> {
        match q.value() {
            Ok(v) => Some(v),
            Err(e) => {
                self.out.error(path, e.0);
                None
            }
        }
    }

    /// An optional quantity: `None` when absent, `Some(None)` when present but invalid.
    pub fn opt_q<D: Dim>(&mut self, q: &Option<Q<D>>, path: &KeyPath) -> Option<Option<f64>> {
        match q {
            None => Some(None),
            Some(q) => self.q(q, path).map(Some),
        }
    }

    /// A value that must be strictly positive.
    pub fn positive(&mut self, value: Option<f64>, path: &KeyPath, what: &str) -> Option<f64> {
        let v = value?;
        if v > 0.0 {
            Some(v)
        } else {
            self.out.error(
                path,
                format!("{what} must be greater than zero, but {} was given", round_sig(v)),
            );
            None
        }
    }

    /// A quantity that must be strictly positive.
    pub fn positive_q<D: Dim>(&mut self, q: &Q<D>, path: &KeyPath, what: &str) -> Option<f64> {
        let value = self.q(q, path);
        self.positive(value, path, what)
    }

    /// A value that must lie in `[lo, hi]`.
    pub fn within(
        &mut self,
        value: Option<f64>,
        (lo, hi): (f64, f64),
        path: &KeyPath,
        what: &str,
    ) -> Option<f64> {
        let v = value?;
        if (lo..=hi).contains(&v) {
            Some(v)
        } else {
            self.out.error(
                path,
                format!(
                    "{what} must lie between {} and {}, but {} was given",
                    round_sig(lo),
                    round_sig(hi),
                    round_sig(v)
                ),
            );
            None
        }
    }

    /// Holds a value (model units) to its key's plausible range `(lo, hi)`, also in model
    /// units. Inside: nothing. Outside, but inside after one of the slips listed for its
    /// dimension ([`slips`]: MJ read as J, hours or days read as seconds, l/s read as m³/s, kW
    /// or MWh read as W or kWh, kelvin or °F read as °C, per cent read as a fraction, mm read as
    /// m): an error naming the unit the user probably meant. Outside by more than a factor of
    /// 100 (or 100 K): an error. Otherwise a warning (a caution in the results).
    pub fn plausible(
        &mut self,
        value: Option<f64>,
        (lo, hi): (f64, f64),
        path: &KeyPath,
        what: &str,
        dim: Dimension,
    ) {
        let Some(v) = value else { return };
        if (lo..=hi).contains(&v) {
            return;
        }
        // The value as the site file's plain number would give it (a fraction as a fraction).
        let written = match dim {
            Dimension::Fraction => round_sig(v),
            _ => format_quantity(v, dim),
        };
        let number = written.split(' ').next().unwrap_or("").to_string();
        let range = format!("{}–{}", format_quantity(lo, dim), format_quantity(hi, dim));
        if let Some(meant) = slips(dim).iter().find(|s| (lo..=hi).contains(&(s.apply)(v))) {
            self.out.error(
                path,
                format!(
                    "{written} is not {what} (usually {range}); did you mean {number} {}?",
                    meant.unit
                ),
            );
            return;
        }
        let far = match dim {
            Dimension::Temperature => v < lo - 100.0 || v > hi + 100.0,
            _ => v.abs() > 100.0 * hi.abs().max(lo.abs()) || (lo > 0.0 && v.abs() < lo / 100.0),
        };
        if far {
            self.out.error(
                path,
                format!(
                    "{written} is far outside the range of {what} ({range}); check the value and its unit"
                ),
            );
        } else {
            self.out.warning(
                path,
                format!(
                    "{written} lies outside the usual range of {what} ({range}); check the value and its unit"
                ),
            );
        }
    }
}

/// A likely slip of unit: reading a number in another unit of the same dimension gives
/// `apply(value)` in model units.
pub struct Slip {
    pub unit: &'static str,
    pub apply: fn(f64) -> f64,
}

/// The short list of slips checked for each dimension: the unit a number is easily meant in
/// when the plain unit is another (common practice, no source: the slips seen in use).
pub fn slips(dim: Dimension) -> &'static [Slip] {
    use Dimension as D;
    const HOUR: f64 = crate::numerics::time::HOUR_S;
    const DAY: f64 = crate::numerics::time::DAY_S;
    match dim {
        D::VolumetricHeatCapacity => &[
            Slip {
                unit: "MJ/(m3 K)",
                apply: |v| v * 1e6,
            },
            Slip {
                unit: "kJ/(m3 K)",
                apply: |v| v * 1e3,
            },
        ],
        D::SpecificHeatCapacity => &[Slip {
            unit: "kJ/(kg K)",
            apply: |v| v * 1e3,
        }],
        D::Time => &[
            Slip {
                unit: "h",
                apply: |v| v * HOUR,
            },
            Slip {
                unit: "d",
                apply: |v| v * DAY,
            },
        ],
        D::VolumeFlow => &[
            Slip {
                unit: "l/s",
                apply: |v| v * 1e-3,
            },
            Slip {
                unit: "l/min",
                apply: |v| v * 1e-3 / 60.0,
            },
            Slip {
                unit: "m3/h",
                apply: |v| v / HOUR,
            },
        ],
        D::Power => &[Slip {
            unit: "kW",
            apply: |v| v * 1e3,
        }],
        D::LinearHeatRate => &[Slip {
            unit: "kW/m",
            apply: |v| v * 1e3,
        }],
        D::Energy => &[Slip {
            unit: "MWh",
            apply: |v| v * 1e3,
        }],
        D::Temperature => &[
            Slip {
                unit: "K",
                apply: |v| v - 273.15,
            },
            Slip {
                unit: "°F",
                apply: |v| (v - 32.0) * 5.0 / 9.0,
            },
        ],
        D::TemperatureDifference => &[Slip {
            unit: "°F",
            apply: |v| v * 5.0 / 9.0,
        }],
        D::Fraction => &[Slip {
            unit: "%",
            apply: |v| v * 0.01,
        }],
        D::Length => &[
            Slip {
                unit: "mm",
                apply: |v| v * 1e-3,
            },
            Slip {
                unit: "cm",
                apply: |v| v * 1e-2,
            },
        ],
        _ => &[],
    }
}

/// A number for a message: six significant digits, the shortest form (no 0.0000015854895991…).
pub fn round_sig(v: f64) -> String {
    if !v.is_finite() || v == 0.0 {
        return format!("{v}");
    }
    let rounded: f64 = format!("{v:.5e}").parse().unwrap_or(v);
    format!("{rounded}")
}

/// Validates a whole site file. Returns the model when nothing is in error.
pub fn site(doc: &SiteDoc, v: &mut Validator) -> Option<Site> {
    let root = KeyPath::root();
    let climate = climate(&doc.climate, &root.key("climate"), v);
    let ground = ground(&doc.ground, &root.key("ground"), v);
    let studies = studies(&doc.studies, &root.key("studies"), v);
    if v.out.has_errors() {
        return None;
    }
    Some(Site {
        name: doc.site.name.clone(),
        description: doc.site.description.clone(),
        climate: climate?,
        ground: ground?,
        studies: studies?,
    })
}

fn n_factors(
    freezing: Option<f64>,
    thawing: Option<f64>,
    path: &KeyPath,
    v: &mut Validator,
) -> Option<NFactors> {
    let mut one = |n: Option<f64>, key: &str| -> Option<f64> {
        let p = path.key(key);
        let n = v.positive(Some(n.unwrap_or(1.0)), &p, "an n-factor");
        // TM 5-852-6 (1988) tables give n-factors between about 0.3 and 2.0 (from memory).
        v.plausible(n, (0.2, 2.5), &p, "an n-factor", Dimension::Dimensionless);
        n
    };
    let freezing = one(freezing, "n_factor_freezing");
    let thawing = one(thawing, "n_factor_thawing");
    Some(NFactors {
        freezing: freezing?,
        thawing: thawing?,
    })
}

fn climate(doc: &ClimateDoc, path: &KeyPath, v: &mut Validator) -> Option<Climate> {
    let surface_range = (-40.0, 40.0);
    match doc {
        ClimateDoc::AnnualWave {
            mean,
            amplitude,
            coldest_day,
        } => {
            let mean_c = v.q(mean, &path.key("mean"));
            v.plausible(
                mean_c,
                (-20.0, 35.0),
                &path.key("mean"),
                "a mean surface temperature",
                Dimension::Temperature,
            );
            let amp = v.q(amplitude, &path.key("amplitude"));
            let amp = match amp {
                Some(a) if a < 0.0 => {
                    v.out.error(&path.key("amplitude"), format!("the amplitude is half the annual swing and cannot be negative, but {a} K was given"));
                    None
                }
                a => a,
            };
            v.plausible(
                amp,
                (0.0, 30.0),
                &path.key("amplitude"),
                "an amplitude",
                Dimension::TemperatureDifference,
            );
            let day = v.within(
                Some(*coldest_day),
                (1.0, 366.0),
                &path.key("coldest_day"),
                "the day of the year",
            );
            Some(Climate::AnnualWave {
                mean_c: mean_c?,
                amplitude_k: amp?,
                coldest_day: day?,
            })
        }
        ClimateDoc::MonthlyAir {
            air,
            n_factor_freezing,
            n_factor_thawing,
        } => {
            let mut values = [0.0; 12];
            let mut ok = air.len() == 12;
            if !ok {
                v.out.error(
                    &path.key("air"),
                    format!(
                        "expected a list of exactly 12 monthly values, January first, but it has {}",
                        air.len()
                    ),
                );
            }
            for (i, q) in air.iter().enumerate() {
                let p = path.key("air").index(i);
                let t = v.q(q, &p);
                v.plausible(
                    t,
                    surface_range,
                    &p,
                    "a monthly mean air temperature",
                    Dimension::Temperature,
                );
                match t {
                    Some(t) if i < 12 => values[i] = t,
                    _ => ok = false,
                }
            }
            let n = n_factors(*n_factor_freezing, *n_factor_thawing, path, v);
            ok.then_some(())?;
            Some(Climate::MonthlyAir {
                air_c: values,
                n_factors: n?,
            })
        }
        ClimateDoc::Series {
            file,
            column,
            unit,
            n_factor_freezing,
            n_factor_thawing,
        } => {
            let n = n_factors(*n_factor_freezing, *n_factor_thawing, path, v);
            let unit = match unit.as_deref() {
                None => Some(series_file::TemperatureUnit::Celsius),
                Some(u) => match series_file::TemperatureUnit::parse(u) {
                    Some(u) => Some(u),
                    None => {
                        v.out.error(
                            &path.key("unit"),
                            format!("`{u}` is not a temperature unit for the file; use °C, °F or K"),
                        );
                        None
                    }
                },
            };
            let file_path = v.base_dir.join(file);
            let series = match series_file::read(&file_path, column.as_deref(), unit?) {
                Ok(s) => Some(s),
                Err(e) => {
                    v.out.error(&path.key("file"), e);
                    None
                }
            }?;
            for (i, t) in series.air_c.iter().enumerate() {
                if !(-70.0..=60.0).contains(t) {
                    v.out.warning(&path.key("file"), format!("record {} of `{file}` holds an air temperature of {t} °C, outside −70..60 °C; check the unit", i + 1));
                    break;
                }
            }
            Some(Climate::Series(AirSeries {
                start_year: series.start_year,
                start_day_of_year: series.start_day_of_year,
                step_s: series.step_s,
                air_c: series.air_c,
                n_factors: n?,
                source: file.clone(),
            }))
        }
        ClimateDoc::Constant { temperature } => {
            let t = v.q(temperature, &path.key("temperature"));
            v.plausible(
                t,
                surface_range,
                &path.key("temperature"),
                "a surface temperature",
                Dimension::Temperature,
            );
            Some(Climate::Constant { temperature_c: t? })
        }
    }
}

fn ground(doc: &GroundDoc, path: &KeyPath, v: &mut Validator) -> Option<Ground> {
    let init = v.opt_q(&doc.initial_temperature, &path.key("initial_temperature"));
    v.plausible(
        init.flatten(),
        (-30.0, 40.0),
        &path.key("initial_temperature"),
        "an initial ground temperature",
        Dimension::Temperature,
    );
    let flux = v.opt_q(&doc.geothermal_flux, &path.key("geothermal_flux"));
    // Continental heat flow is mostly 0.04–0.12 W/m2 (Pollack, Hurter & Johnson 1993, from memory).
    v.plausible(
        flux.flatten(),
        (0.0, 0.2),
        &path.key("geothermal_flux"),
        "a geothermal heat flux",
        Dimension::HeatFlux,
    );
    if doc.layers.is_empty() {
        v.out.error(
            &path.key("layers"),
            "at least one soil layer is needed; the last layer extends to the bottom of the model",
        );
        return None;
    }
    let n = doc.layers.len();
    let layers: Vec<Option<SoilLayer>> = doc
        .layers
        .iter()
        .enumerate()
        .map(|(i, l)| layer(l, i + 1 == n, &path.key("layers").index(i), v))
        .collect();
    let layers: Option<Vec<SoilLayer>> = layers.into_iter().collect();
    Some(Ground {
        initial_temperature_c: init?,
        geothermal_flux_w_per_m2: flux?.unwrap_or(0.0),
        layers: layers?,
    })
}

fn layer(doc: &LayerDoc, last: bool, path: &KeyPath, v: &mut Validator) -> Option<SoilLayer> {
    let preset = match &doc.soil {
        None => Some(None),
        Some(name) => match soils::preset(name) {
            Some(p) => Some(Some(p)),
            None => {
                let names: Vec<&str> = soils::presets().iter().map(|p| p.name).collect();
                v.out.error(
                    &path.key("soil"),
                    format!(
                        "`{name}` is not a soil preset; use one of: {} (or give the properties)",
                        names.join(", ")
                    ),
                );
                None
            }
        },
    };
    let preset = preset.flatten();
    let thickness = match &doc.thickness {
        Some(q) => {
            let t = v.q(q, &path.key("thickness"));
            v.positive(t, &path.key("thickness"), "a layer thickness")
                .map(Some)
        }
        None if last => Some(None),
        None => {
            v.out.error(&path.key("thickness"), "the required key `thickness` is missing; only the last layer may leave it out, as it extends downward");
            None
        }
    };
    let k = property(
        v,
        &doc.conductivity,
        preset.map(|p| p.conductivity_w_per_m_k),
        path,
        "conductivity",
        "the thermal conductivity",
    );
    let c = property(
        v,
        &doc.heat_capacity,
        preset.map(|p| p.heat_capacity_j_per_m3_k),
        path,
        "heat_capacity",
        "the volumetric heat capacity",
    );
    let k_f = match &doc.frozen_conductivity {
        Some(q) => v.positive_q(q, &path.key("frozen_conductivity"), "the frozen conductivity"),
        None => preset.map(|p| p.frozen_conductivity_w_per_m_k).or(k),
    };
    let c_f = match &doc.frozen_heat_capacity {
        Some(q) => v.positive_q(q, &path.key("frozen_heat_capacity"), "the frozen heat capacity"),
        None => preset.map(|p| p.frozen_heat_capacity_j_per_m3_k).or(c),
    };
    let w = match &doc.water_content {
        Some(q) => {
            let p = path.key("water_content");
            let w = v.q(q, &p);
            // Soils hold up to about 0.6 of their volume in water (peat more): common practice,
            // no source. A number past 1 is a slip of per cent, or an error.
            match w {
                Some(x) if x > 1.0 && q.is_plain_number() => {
                    v.plausible(
                        w,
                        (0.0, 0.6),
                        &p,
                        "a volumetric water content",
                        Dimension::Fraction,
                    );
                    None
                }
                _ => v.within(w, (0.0, 1.0), &p, "the volumetric water content"),
            }
        }
        None => Some(preset.map(|p| p.water_content).unwrap_or(0.0)),
    };
    let interval = match &doc.freezing_interval {
        Some(q) => v.positive_q(q, &path.key("freezing_interval"), "the freezing interval"),
        None => Some(DEFAULT_FREEZING_INTERVAL_K),
    };
    // Soils and rock span about 0.2 (dry peat) to 6 W/(m K) (quartzite); heat capacity about
    // 0.5–4.5 MJ/(m3 K) (common practice, no source).
    v.plausible(
        k,
        (0.2, 6.0),
        &path.key("conductivity"),
        "a soil conductivity",
        Dimension::Conductivity,
    );
    v.plausible(
        k_f,
        (0.2, 6.0),
        &path.key("frozen_conductivity"),
        "a frozen soil conductivity",
        Dimension::Conductivity,
    );
    v.plausible(
        c,
        (0.5e6, 4.5e6),
        &path.key("heat_capacity"),
        "a soil's volumetric heat capacity",
        Dimension::VolumetricHeatCapacity,
    );
    v.plausible(
        c_f,
        (0.5e6, 4.5e6),
        &path.key("frozen_heat_capacity"),
        "a frozen soil's volumetric heat capacity",
        Dimension::VolumetricHeatCapacity,
    );
    let w = w?;
    Some(SoilLayer {
        name: doc.name.clone(),
        thickness_m: thickness?,
        conductivity_w_per_m_k: k?,
        heat_capacity_j_per_m3_k: c?,
        frozen_conductivity_w_per_m_k: k_f?,
        frozen_heat_capacity_j_per_m3_k: c_f?,
        water_content: w,
        latent_heat_j_per_m3: soils::latent_heat_j_per_m3(w),
        freezing_interval_k: interval?,
        preset: doc.soil.clone(),
    })
}

/// A required, positive property: from the file, else from the preset, else an error naming both
/// ways to give it.
fn property<D: Dim>(
    v: &mut Validator,
    given: &Option<Q<D>>,
    from_preset: Option<f64>,
    path: &KeyPath,
    key: &str,
    what: &str,
) -> Option<f64> {
    let p = path.key(key);
    let value = match (v.opt_q(given, &p)?, from_preset) {
        (Some(x), _) | (None, Some(x)) => x,
        (None, None) => {
            v.out.error(
                &p,
                format!("the required key `{key}` is missing: give {what} or name a `soil` preset"),
            );
            return None;
        }
    };
    v.positive(Some(value), &p, what)
}

/// Longest study id: it names files in the bundle.
pub const MAX_ID_CHARS: usize = 64;

fn studies(docs: &[StudyDoc], path: &KeyPath, v: &mut Validator) -> Option<Vec<Study>> {
    let mut seen: HashMap<&str, usize> = HashMap::new();
    let mut ok = true;
    for (i, s) in docs.iter().enumerate() {
        let p = path.index(i);
        if s.id().trim().is_empty() {
            v.out.error(
                &p.key("id"),
                "a study id must not be empty; it names the study in the report and in file names",
            );
            ok = false;
        } else if !s
            .id()
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || matches!(c, '-' | '_' | '.'))
            || s.id().starts_with('.')
            || s.id().len() > MAX_ID_CHARS
        {
            v.out.error(
                &p.key("id"),
                format!("the study id `{}` names files in the bundle, so it may hold only letters, digits, `-`, `_` and `.` (not first), at most {MAX_ID_CHARS} of them", s.id()),
            );
            ok = false;
        } else if let Some(first) = seen.insert(s.id(), i) {
            v.out.error(
                &p.key("id"),
                format!(
                    "the study id `{}` is already used by studies[{first}]; ids must be unique",
                    s.id()
                ),
            );
            ok = false;
        }
    }
    let studies: Vec<Option<Study>> = docs
        .iter()
        .enumerate()
        .map(|(i, s)| s.validate(&path.index(i), v))
        .collect();
    let studies: Option<Vec<Study>> = studies.into_iter().collect();
    if ok { studies } else { None }
}

/// Validates cylindrical wall layers listed inside-out (each thickness positive, each
/// conductivity a value or an insulation law); `None` when any is in error (all are reported).
pub fn wall_layers(docs: &[WallLayerDoc], path: &KeyPath, v: &mut Validator) -> Option<Vec<WallLayer>> {
    let layers: Vec<Option<WallLayer>> = docs
        .iter()
        .enumerate()
        .map(|(i, l)| {
            let p = path.index(i);
            let t = v.positive_q(&l.thickness, &p.key("thickness"), "a wall-layer thickness");
            let (k, law) = layer_conductivity(&l.conductivity, &p.key("conductivity"), v)?;
            Some(WallLayer {
                name: l.name.clone(),
                thickness_m: t?,
                conductivity_w_per_m_k: k,
                insulation_law: law,
            })
        })
        .collect();
    layers.into_iter().collect()
}

/// Validates the pipes of a study's cross-section: sizes, wall layers, what drives each pipe, and
/// the geometry (no pipe above the surface, no two pipes overlapping).
pub fn pipes(docs: &[PipeDoc], path: &KeyPath, v: &mut Validator) -> Option<Vec<Pipe>> {
    let checked: Vec<Option<Pipe>> = docs
        .iter()
        .enumerate()
        .map(|(i, d)| pipe(d, &path.index(i), v))
        .collect();
    let mut ok = checked.iter().all(Option::is_some);
    let pipes: Vec<Pipe> = checked.into_iter().flatten().collect();
    let mut seen: HashMap<&str, usize> = HashMap::new();
    for (i, d) in docs.iter().enumerate() {
        if let Some(first) = seen.insert(d.id.as_str(), i) {
            v.out.error(
                &path.index(i).key("id"),
                format!(
                    "the pipe id `{}` is already used by pipe {first} of this study; ids must be unique",
                    d.id
                ),
            );
            ok = false;
        }
    }
    if ok {
        for (i, b) in pipes.iter().enumerate() {
            for a in &pipes[..i] {
                let gap = ((a.x_m - b.x_m).powi(2) + (a.depth_m - b.depth_m).powi(2)).sqrt();
                let touch = a.outer_radius_m() + b.outer_radius_m();
                if gap < touch {
                    v.out.error(
                        &path.index(i),
                        format!(
                            "pipe `{}` overlaps pipe `{}`: their centres are {} m apart but their outer radii add up to {} m; move them apart",
                            b.id,
                            a.id,
                            round_sig(gap),
                            round_sig(touch)
                        ),
                    );
                    ok = false;
                }
            }
        }
    }
    ok.then_some(pipes)
}

fn pipe(doc: &PipeDoc, path: &KeyPath, v: &mut Validator) -> Option<Pipe> {
    let x = match &doc.x {
        Some(q) => v.q(q, &path.key("x")),
        None => Some(0.0),
    };
    let diameter = v.positive_q(
        &doc.outer_diameter,
        &path.key("outer_diameter"),
        "the outer diameter",
    );
    let depth = centre_depth(&doc.depth, &doc.cover, diameter, path, v, "the pipe");
    // Buried pipes sit within about 0.3–6 m of the surface and measure up to about 2 m across
    // (common practice, no source).
    v.plausible(
        depth,
        (0.2, 10.0),
        &path.key("depth"),
        "a pipe depth",
        Dimension::Length,
    );
    v.plausible(
        diameter,
        (0.01, 2.0),
        &path.key("outer_diameter"),
        "a pipe diameter",
        Dimension::Length,
    );
    if let (Some(z), Some(d)) = (depth, diameter)
        && z - d / 2.0 <= 0.0
    {
        v.out.error(
            &path.key("depth"),
            format!(
                "the top of the pipe is {} m above the ground surface: the depth is measured to the pipe centre and must exceed half the outer diameter ({} m)",
                round_sig(d / 2.0 - z),
                round_sig(d / 2.0)
            ),
        );
    }
    let layers = wall_layers(&doc.layers, &path.key("layers"), v);
    if let (Some(layers), Some(d)) = (&layers, diameter) {
        let total: f64 = layers.iter().map(|l| l.thickness_m).sum();
        if total >= d / 2.0 {
            v.out.error(
                &path.key("layers"),
                format!(
                    "the wall layers add up to {} m, but the outer radius is only {} m; the layers must leave a bore",
                    round_sig(total),
                    round_sig(d / 2.0)
                ),
            );
        }
    }
    let drive = match (&doc.fluid, &doc.heat_to_ground) {
        (Some(f), None) => fluid_temperature(&f.temperature, &path.key("fluid").key("temperature"), v),
        (None, Some(q)) => v
            .q(q, &path.key("heat_to_ground"))
            .map(|w| PipeDrive::HeatToGround { w_per_m: w }),
        (Some(_), Some(_)) => {
            v.out.error(
                path,
                "give either `fluid` or `heat_to_ground` for a pipe, not both",
            );
            None
        }
        (None, None) => {
            v.out.error(
                path,
                "the pipe needs `fluid: {temperature: ...}` or `heat_to_ground` to say what drives it",
            );
            None
        }
    };
    if v.out.has_errors() {
        return None;
    }
    Some(Pipe {
        id: doc.id.clone(),
        x_m: x?,
        depth_m: depth?,
        outer_diameter_m: diameter?,
        layers: layers?,
        drive: drive?,
    })
}

/// A wall layer's conductivity: the value, and the EN 253 law when given (the value is then the
/// aged λ50).
pub fn layer_conductivity(
    doc: &crate::site::doc::LayerConductivityDoc,
    path: &KeyPath,
    v: &mut Validator,
) -> Option<(f64, Option<crate::model::InsulationLaw>)> {
    use crate::site::doc::LayerConductivityDoc as D;
    match doc {
        D::Value(q) => v
            .positive_q(q, path, "a wall-layer conductivity")
            .map(|k| (k, None)),
        D::Insulation(d) => {
            let fresh = v.positive_q(&d.lambda_50, &path.key("lambda_50"), "the λ50 of the insulation");
            // Polyurethane foams lie near 0.02–0.03 W/(m K) at 50 °C (EN 253 asks at most 0.029
            // fresh, from memory); other insulations up to about 0.1 (common practice, no source).
            v.plausible(
                fresh,
                (0.01, 0.1),
                &path.key("lambda_50"),
                "an insulation λ50",
                Dimension::Conductivity,
            );
            let slope = v.within(
                Some(d.slope.unwrap_or(0.0)),
                (-1e-3, 1e-3),
                &path.key("slope"),
                "the conductivity slope in W/(m K2)",
            );
            let ageing = match &d.ageing {
                None => Some(0.0),
                Some(q) => {
                    let a = v.q(q, &path.key("ageing"));
                    v.within(a, (0.0, 2.0), &path.key("ageing"), "the ageing allowance")
                }
            };
            let law = crate::model::InsulationLaw {
                lambda_50_w_per_m_k: fresh?,
                slope_w_per_m_k2: slope?,
                ageing: ageing?,
            };
            Some((law.lambda_50_w_per_m_k * (1.0 + law.ageing), Some(law)))
        }
    }
}

pub fn fluid_temperature(t: &OneOrMonthly, path: &KeyPath, v: &mut Validator) -> Option<PipeDrive> {
    let values: Vec<Option<f64>> = match t {
        OneOrMonthly::One(q) => vec![v.q(q, path); 12],
        OneOrMonthly::Monthly(list) => {
            if list.len() != 12 {
                v.out.error(
                    path,
                    format!(
                        "expected one temperature or exactly 12 monthly values, but the list has {}",
                        list.len()
                    ),
                );
                return None;
            }
            list.iter()
                .enumerate()
                .map(|(i, q)| v.q(q, &path.index(i)))
                .collect()
        }
    };
    let mut monthly_c = [0.0; 12];
    for (m, value) in values.into_iter().enumerate() {
        let t = value?;
        if !(-50.0..=200.0).contains(&t) {
            v.plausible(
                Some(t),
                (-50.0, 200.0),
                path,
                "a fluid temperature",
                Dimension::Temperature,
            );
        }
        monthly_c[m] = t;
    }
    Some(PipeDrive::FluidTemperature { monthly_c })
}

/// The method a study asked for, checked against those its kind offers.
pub fn method(
    doc: Option<super::doc::MethodDoc>,
    default: Method,
    allowed: &[Method],
    path: &KeyPath,
    v: &mut Validator,
) -> Option<Method> {
    let m = match doc {
        None => default,
        Some(super::doc::MethodDoc::Analytic) => Method::Analytic,
        Some(super::doc::MethodDoc::Numerical) => Method::Numerical,
        Some(super::doc::MethodDoc::Both) => Method::Both,
    };
    if allowed.contains(&m) {
        Some(m)
    } else {
        let names: Vec<&str> = allowed.iter().map(|m| m.name()).collect();
        v.out.error(
            path,
            format!(
                "this study kind offers the method(s) {}, not `{}`",
                names.join(", "),
                m.name()
            ),
        );
        None
    }
}

/// The depth of a pipe's centre from `depth` (to the centre) or `cover` (to the crown, plus half
/// the outer diameter): exactly one of the two must be given.
pub fn centre_depth(
    depth: &Option<Q<super::quantity::Length>>,
    cover: &Option<Q<super::quantity::Length>>,
    outer_diameter_m: Option<f64>,
    path: &KeyPath,
    v: &mut Validator,
    what: &str,
) -> Option<f64> {
    match (depth, cover) {
        (Some(_), Some(_)) => {
            v.out.error(
                &path.key("cover"),
                format!("give either `depth` (to the centre of {what}) or `cover` (to its crown), not both"),
            );
            None
        }
        (None, None) => {
            v.out.error(
                path,
                format!("the required key `depth` is missing: give `depth` (to the centre of {what}) or `cover` (to its crown)"),
            );
            None
        }
        (Some(d), None) => v.positive_q(
            d,
            &path.key("depth"),
            &format!("the depth of the centre of {what}"),
        ),
        (None, Some(c)) => {
            let cover = v.q(c, &path.key("cover"))?;
            if cover < 0.0 {
                v.out.error(
                    &path.key("cover"),
                    format!("the cover of {what} is {} m; it is measured down from the surface to the crown and must be zero or more", round_sig(cover)),
                );
                return None;
            }
            Some(cover + outer_diameter_m? / 2.0)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::site::{diagnostic::Collector, schema, yaml};

    /// Validates a YAML list of pipes as a study would; returns the pipes or the messages.
    fn check_pipes(text: &str) -> Result<Vec<Pipe>, Vec<String>> {
        let tree = yaml::parse(text).unwrap();
        let docs: Vec<PipeDoc> = serde_json::from_value(schema::to_json(&tree)).unwrap();
        let mut out = Collector::new("t.yaml", &tree);
        let mut v = Validator {
            out: &mut out,
            base_dir: Path::new("."),
        };
        let pipes = pipes(&docs, &KeyPath::root().key("pipes"), &mut v);
        match pipes {
            Some(p) if !out.has_errors() => Ok(p),
            _ => Err(out.items.iter().map(ToString::to_string).collect()),
        }
    }

    const PAIR: &str = "
- {id: supply, x: -0.2 m, depth: 0.95 m, outer_diameter: 225 mm, fluid: {temperature: 80 °C},
   layers: [{name: steel, thickness: 3.6 mm, conductivity: 50}, {name: pur, thickness: 50 mm, conductivity: 0.026}]}
- {id: return, x: 0.2 m, depth: 0.95 m, outer_diameter: 225 mm, fluid: {temperature: [50, 50, 50, 50, 45, 45, 45, 45, 45, 50, 50, 50]}}
";

    #[test]
    fn a_sound_pipe_pair_is_accepted_in_si_units() {
        let p = check_pipes(PAIR).unwrap();
        assert_eq!(p.len(), 2);
        assert!((p[0].outer_radius_m() - 0.1125).abs() < 1e-12);
        assert!((p[0].inner_radius_m() - (0.1125 - 0.0036 - 0.050)).abs() < 1e-12);
        assert!((p[0].cover_m() - (0.95 - 0.1125)).abs() < 1e-12);
        assert_eq!(
            p[1].drive,
            PipeDrive::FluidTemperature {
                monthly_c: [
                    50.0, 50.0, 50.0, 50.0, 45.0, 45.0, 45.0, 45.0, 45.0, 50.0, 50.0, 50.0
                ]
            }
        );
    }

    #[test]
    fn a_pipe_whose_top_is_above_the_surface_is_refused() {
        let e =
            check_pipes("- {id: a, depth: 0.1 m, outer_diameter: 250 mm, heat_to_ground: 20}").unwrap_err();
        assert!(
            e.iter().any(
                |m| m.contains("error: pipes[0].depth") && m.contains("0.025 m above the ground surface")
            ),
            "{e:?}"
        );
    }

    #[test]
    fn overlapping_pipes_are_refused() {
        let text = PAIR.replace("x: 0.2 m", "x: 0.0 m");
        let e = check_pipes(&text).unwrap_err();
        assert!(
            e.iter()
                .any(|m| m.contains("pipes[1]") && m.contains("overlaps pipe `supply`")),
            "{e:?}"
        );
    }

    #[test]
    fn wall_layers_thicker_than_the_radius_are_refused() {
        let text = "- {id: a, depth: 1 m, outer_diameter: 100 mm, heat_to_ground: 5, layers: [{name: w, thickness: 60 mm, conductivity: 0.4}]}";
        let e = check_pipes(text).unwrap_err();
        assert!(
            e[0].contains("pipes[0].layers") && e[0].contains("leave a bore"),
            "{e:?}"
        );
    }

    #[test]
    fn a_pipe_needs_exactly_one_drive_and_a_unique_id() {
        let e = check_pipes("- {id: a, depth: 1 m, outer_diameter: 0.1}\n- {id: a, x: 1, depth: 1 m, outer_diameter: 0.1, heat_to_ground: 3, fluid: {temperature: 5}}").unwrap_err();
        assert!(e.iter().any(|m| m.contains("pipes[0]: the pipe needs")), "{e:?}");
        assert!(e.iter().any(|m| m.contains("pipes[1]: give either")), "{e:?}");
        assert!(
            e.iter()
                .any(|m| m.contains("pipes[1].id: the pipe id `a` is already used")),
            "{e:?}"
        );
    }
}
