//! The site file as written → the validated SI model. Every problem is collected, located and
//! worded for the user; values outside the usual engineering ranges are warnings.

use super::diagnostic::{Collector, KeyPath};
use super::doc::*;
use super::quantity::{Dim, Q};
use super::series_file;
use crate::materials::soils;
use crate::model::*;
use std::collections::HashMap;
use std::path::Path;

/// Default interval below 0 °C over which soil water freezes. Common practice, no source: enthalpy
/// schemes smear the latent heat over 0.5–1 K so that a grid cell freezes over several steps.
pub const DEFAULT_FREEZING_INTERVAL_K: f64 = 0.5;

/// Study kinds this version can run.
pub const SUPPORTED_KINDS: &[&str] = &[];
/// Study kinds that the product defines; those not in [`SUPPORTED_KINDS`] are refused as "not
/// supported yet".
pub const PLANNED_KINDS: &[&str] = &["heat-loss", "borefield", "frost", "cross-section"];

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
                format!("{what} must be greater than zero, but {v} was given"),
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
                format!("{what} must lie between {lo} and {hi}, but {v} was given"),
            );
            None
        }
    }

    /// Warns when a value lies outside its usual engineering range.
    pub fn plausible(
        &mut self,
        value: Option<f64>,
        (lo, hi): (f64, f64),
        path: &KeyPath,
        what: &str,
        unit: &str,
    ) {
        if let Some(v) = value
            && !(lo..=hi).contains(&v)
        {
            self.out.warning(
                path,
                format!("{what} of {} {unit} lies outside the usual range {lo}–{hi} {unit}; check the value and its unit", round_sig(v)),
            );
        }
    }
}

fn round_sig(v: f64) -> String {
    format!("{}", (v * 1e6).round() / 1e6)
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
        v.plausible(n, (0.2, 2.5), &p, "an n-factor", "");
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
                "°C",
            );
            let amp = v.q(amplitude, &path.key("amplitude"));
            let amp = match amp {
                Some(a) if a < 0.0 => {
                    v.out.error(&path.key("amplitude"), format!("the amplitude is half the annual swing and cannot be negative, but {a} K was given"));
                    None
                }
                a => a,
            };
            v.plausible(amp, (0.0, 30.0), &path.key("amplitude"), "an amplitude", "K");
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
                v.plausible(t, surface_range, &p, "a monthly mean air temperature", "°C");
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
                "°C",
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
        "°C",
    );
    let flux = v.opt_q(&doc.geothermal_flux, &path.key("geothermal_flux"));
    // Continental heat flow is mostly 0.04–0.12 W/m2 (Pollack, Hurter & Johnson 1993, from memory).
    v.plausible(
        flux.flatten(),
        (0.0, 0.2),
        &path.key("geothermal_flux"),
        "a geothermal heat flux",
        "W/m2",
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
        geothermal_flux_w_m2: flux?.unwrap_or(0.0),
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
        preset.map(|p| p.conductivity_w_m_k),
        path,
        "conductivity",
        "the thermal conductivity",
    );
    let c = property(
        v,
        &doc.heat_capacity,
        preset.map(|p| p.heat_capacity_j_m3_k),
        path,
        "heat_capacity",
        "the volumetric heat capacity",
    );
    let k_f = match &doc.frozen_conductivity {
        Some(q) => v.positive_q(q, &path.key("frozen_conductivity"), "the frozen conductivity"),
        None => preset.map(|p| p.frozen_conductivity_w_m_k).or(k),
    };
    let c_f = match &doc.frozen_heat_capacity {
        Some(q) => v.positive_q(q, &path.key("frozen_heat_capacity"), "the frozen heat capacity"),
        None => preset.map(|p| p.frozen_heat_capacity_j_m3_k).or(c),
    };
    let w = match &doc.water_content {
        Some(q) => {
            let w = v.q(q, &path.key("water_content"));
            v.within(
                w,
                (0.0, 1.0),
                &path.key("water_content"),
                "the volumetric water content",
            )
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
        "W/(m K)",
    );
    v.plausible(
        k_f,
        (0.2, 6.0),
        &path.key("frozen_conductivity"),
        "a frozen soil conductivity",
        "W/(m K)",
    );
    v.plausible(
        c.map(|c| c / 1e6),
        (0.5, 4.5),
        &path.key("heat_capacity"),
        "a volumetric heat capacity",
        "MJ/(m3 K)",
    );
    v.plausible(
        c_f.map(|c| c / 1e6),
        (0.5, 4.5),
        &path.key("frozen_heat_capacity"),
        "a frozen volumetric heat capacity",
        "MJ/(m3 K)",
    );
    let w = w?;
    Some(SoilLayer {
        name: doc.name.clone(),
        thickness_m: thickness?,
        conductivity_w_m_k: k?,
        heat_capacity_j_m3_k: c?,
        frozen_conductivity_w_m_k: k_f?,
        frozen_heat_capacity_j_m3_k: c_f?,
        water_content: w,
        latent_heat_j_m3: soils::latent_heat_j_m3(w),
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

fn studies(docs: &[StudyDoc], path: &KeyPath, v: &mut Validator) -> Option<Vec<Study>> {
    let mut seen: HashMap<&str, usize> = HashMap::new();
    let mut ok = true;
    for (i, s) in docs.iter().enumerate() {
        let p = path.index(i);
        if s.id.trim().is_empty() {
            v.out.error(
                &p.key("id"),
                "a study id must not be empty; it names the study in the report and in file names",
            );
            ok = false;
        } else if let Some(first) = seen.insert(s.id.as_str(), i) {
            v.out.error(
                &p.key("id"),
                format!(
                    "the study id `{}` is already used by studies[{first}]; ids must be unique",
                    s.id
                ),
            );
            ok = false;
        }
        if !SUPPORTED_KINDS.contains(&s.kind.as_str()) {
            let supported = if SUPPORTED_KINDS.is_empty() {
                "none yet (an empty `studies: []` reports the undisturbed ground)".to_string()
            } else {
                SUPPORTED_KINDS.join(", ")
            };
            let what = if PLANNED_KINDS.contains(&s.kind.as_str()) {
                format!("the study kind `{}` is not supported yet", s.kind)
            } else {
                format!("`{}` is not a study kind", s.kind)
            };
            v.out.error(
                &p.key("kind"),
                format!("{what}; this version supports: {supported}"),
            );
            ok = false;
        }
    }
    ok.then(Vec::new)
}
