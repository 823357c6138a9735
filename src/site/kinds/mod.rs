//! The site-file side of each study kind: its document type (keys, schema descriptions) and its
//! validation into the model. One file per kind.

pub mod borefield;
pub mod cross_section;
pub mod frost;
pub mod heat_loss;

use crate::model::Method;
use crate::site::diagnostic::KeyPath;
use crate::site::validate::Validator;
use schemars::JsonSchema;
use serde::Deserialize;

/// Which solution to use.
#[derive(Clone, Copy, Debug, Deserialize, JsonSchema, PartialEq, Eq)]
#[serde(rename_all = "kebab-case")]
pub enum MethodDoc {
    Analytic,
    Numerical,
    Both,
}

/// The method a study asked for, checked against those its kind offers.
pub fn method(
    doc: Option<MethodDoc>,
    default: Method,
    allowed: &[Method],
    path: &KeyPath,
    v: &mut Validator,
) -> Option<Method> {
    let m = match doc {
        None => default,
        Some(MethodDoc::Analytic) => Method::Analytic,
        Some(MethodDoc::Numerical) => Method::Numerical,
        Some(MethodDoc::Both) => Method::Both,
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
