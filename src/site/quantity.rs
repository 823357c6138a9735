//! The leaf type of every physical field in a site file: a plain number in the field's unit, or
//! a string with a unit. Parsing into the model's unit happens in validation, where the problem
//! can be reported with its location; deserialising a `Q` itself never fails on the value.

use super::units::{self, Dimension, UnitError};
use schemars::{JsonSchema, Schema, SchemaGenerator, json_schema};
use serde::{Deserialize, Deserializer};
use std::borrow::Cow;
use std::marker::PhantomData;

/// A dimension marker: ties a field's Rust type to the dimension its value must have.
pub trait Dim {
    const DIM: Dimension;
    const NAME: &'static str;
}

macro_rules! dims {
    ($($name:ident),* $(,)?) => {
        $(
            #[derive(Clone, Copy, Debug, PartialEq)]
            pub struct $name;
            impl Dim for $name {
                const DIM: Dimension = Dimension::$name;
                const NAME: &'static str = stringify!($name);
            }
        )*
    };
}

dims!(
    Length,
    Temperature,
    TemperatureDifference,
    Time,
    Conductivity,
    VolumetricHeatCapacity,
    SpecificHeatCapacity,
    Density,
    Power,
    LinearHeatRate,
    HeatFlux,
    Energy,
    VolumeFlow,
    MassFlow,
    Velocity,
    Pressure,
    LinearResistance,
    ArealResistance,
    DegreeDays,
    Fraction,
    Dimensionless,
);

/// What the user wrote for a quantity, before conversion.
#[derive(Clone, Debug, PartialEq)]
pub enum RawQuantity {
    Number(f64),
    Text(String),
}

/// A quantity of dimension `D` as written in the site file.
#[derive(Clone, Debug, PartialEq)]
pub struct Q<D> {
    pub raw: RawQuantity,
    _dim: PhantomData<D>,
}

impl<D: Dim> Q<D> {
    /// The value in the model's unit for this dimension (see [`Dimension::plain_unit`]).
    /// The value in the model's unit, refused when it cannot be read or lies beyond anything
    /// physical of its dimension ([`units::within_physical_bound`]).
    pub fn value(&self) -> Result<f64, UnitError> {
        match &self.raw {
            RawQuantity::Number(x) => units::plain_number(*x, D::DIM)
                .and_then(|v| units::within_physical_bound(v, &x.to_string(), D::DIM)),
            RawQuantity::Text(t) => {
                units::parse_quantity(t, D::DIM).and_then(|v| units::within_physical_bound(v, t, D::DIM))
            }
        }
    }

    /// True when the site file gives a bare number (in the key's plain unit), no unit.
    pub fn is_plain_number(&self) -> bool {
        matches!(self.raw, RawQuantity::Number(_))
    }

    pub fn dimension(&self) -> Dimension {
        D::DIM
    }
}

impl<'de, D> Deserialize<'de> for Q<D> {
    fn deserialize<De: Deserializer<'de>>(deserializer: De) -> Result<Self, De::Error> {
        #[derive(Deserialize)]
        #[serde(untagged)]
        enum Either {
            Number(f64),
            Text(String),
        }
        let raw = match Either::deserialize(deserializer)? {
            Either::Number(x) => RawQuantity::Number(x),
            Either::Text(t) => RawQuantity::Text(t),
        };
        Ok(Q {
            raw,
            _dim: PhantomData,
        })
    }
}

impl<D: Dim> JsonSchema for Q<D> {
    fn schema_name() -> Cow<'static, str> {
        Cow::Owned(format!("Quantity{}", D::NAME))
    }

    fn inline_schema() -> bool {
        true
    }

    fn json_schema(_: &mut SchemaGenerator) -> Schema {
        let unit = D::DIM.plain_unit();
        json_schema!({
            "type": ["number", "string"],
            "x-unit": unit,
            "x-dimension": D::DIM.describe(),
            "description": format!(
                "{}: a plain number in {unit}, or a string with a unit ({})",
                capitalise(D::DIM.describe()),
                D::DIM.examples()
            ),
        })
    }
}

fn capitalise(s: &str) -> String {
    let mut c = s.chars();
    match c.next() {
        Some(f) => f.to_uppercase().chain(c).collect(),
        None => String::new(),
    }
}
