//! Argument checks shared by the numeric modules (materials, physics, engine): one predicate and
//! one wording for "must be positive", "must not be negative" and "must be finite". `what` names
//! the quantity with its unit, e.g. "the outer radius (m)".

/// Ok when `value` is finite and strictly positive.
pub fn positive(what: &str, value: f64) -> Result<(), String> {
    if value.is_finite() && value > 0.0 {
        Ok(())
    } else {
        Err(format!("{what} is {value}; it must be a positive finite number"))
    }
}

/// Ok when `value` is finite and zero or more.
pub fn non_negative(what: &str, value: f64) -> Result<(), String> {
    if value.is_finite() && value >= 0.0 {
        Ok(())
    } else {
        Err(format!(
            "{what} is {value}; it must be a finite number, zero or more"
        ))
    }
}

/// Ok when `value` is finite.
pub fn finite(what: &str, value: f64) -> Result<(), String> {
    if value.is_finite() {
        Ok(())
    } else {
        Err(format!("{what} is {value}; it must be a finite number"))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_predicates_refuse_exactly_what_they_name() {
        assert!(
            positive("x", 1e-300).is_ok() && positive("x", 0.0).is_err() && positive("x", f64::NAN).is_err()
        );
        assert!(non_negative("x", 0.0).is_ok() && non_negative("x", -1e-300).is_err());
        assert!(finite("x", -5.0).is_ok() && finite("x", f64::INFINITY).is_err());
        assert_eq!(
            positive("the radius (m)", -1.0).unwrap_err(),
            "the radius (m) is -1; it must be a positive finite number"
        );
    }
}
