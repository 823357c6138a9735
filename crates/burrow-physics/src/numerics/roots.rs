//! Bracketed root finding (Brent's method), the one root finder of the project. R. P. Brent,
//! *Algorithms for Minimization without Derivatives*, 1973, ch. 4 (inverse quadratic
//! interpolation and secant steps safeguarded by bisection: the bracket always holds a sign
//! change, and the search halves it whenever interpolation would not shrink it fast enough).
//!
//! [`try_brent_bracket`] is the core: a fallible function (an error of `f` ends the search and is
//! returned), a tolerance that may depend on the current estimate, and the final bracket as the
//! answer, so that a caller can report the end on a chosen side of the root. [`brent`] and
//! [`try_brent`] are its infallible and fallible forms that return the estimate only.

use std::convert::Infallible;

/// The final bracket of a Brent search: the estimate `best` (the end with the smaller |f|) and
/// the other end `other`, where f has the opposite sign (or `f_best` = 0). The two ends lie
/// within the tolerance asked for.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Bracket {
    pub best: f64,
    pub f_best: f64,
    pub other: f64,
    pub f_other: f64,
}

impl Bracket {
    /// The end of the bracket where `f ≥ 0`: for a margin that is met when it is not negative,
    /// the end that meets it.
    pub fn non_negative_end(&self) -> f64 {
        if self.f_best >= 0.0 { self.best } else { self.other }
    }
}

/// A root of `f` in `[a, b]` where `f(a)` and `f(b)` differ in sign, to an absolute tolerance
/// of about `4 ε |x| + tol`. Returns `None` when the bracket does not change sign or `f` is not
/// finite at a point it is evaluated.
pub fn brent<F: Fn(f64) -> f64>(f: F, a: f64, b: f64, tol: f64) -> Option<f64> {
    match try_brent(|x| Ok::<f64, Infallible>(f(x)), a, b, tol) {
        Ok(root) => root,
        Err(never) => match never {},
    }
}

/// [`brent`] for a fallible `f`: the first error of `f` is returned as `Err`; `Ok(None)` when the
/// bracket does not change sign or `f` is not finite.
pub fn try_brent<E>(
    f: impl FnMut(f64) -> Result<f64, E>,
    a: f64,
    b: f64,
    tol: f64,
) -> Result<Option<f64>, E> {
    Ok(try_brent_bracket(f, a, b, |_| tol)?.map(|bracket| bracket.best))
}

/// Brent's method on `[a, b]` for a fallible `f`, ending when the bracket is narrower than about
/// `4 ε |x| + tol(x)` at the current estimate `x` (absolute, in the units of `x`). Returns the
/// final [`Bracket`]; `Ok(None)` when `f(a)` and `f(b)` have the same sign or `f` is not finite at
/// a point it is evaluated; `Err` with the first error of `f`. At most 200 evaluations after the
/// two ends.
pub fn try_brent_bracket<E>(
    mut f: impl FnMut(f64) -> Result<f64, E>,
    mut a: f64,
    mut b: f64,
    tol: impl Fn(f64) -> f64,
) -> Result<Option<Bracket>, E> {
    let mut fa = f(a)?;
    let mut fb = f(b)?;
    if !(fa.is_finite() && fb.is_finite()) || fa * fb > 0.0 {
        return Ok(None);
    }
    if fa == 0.0 || fb == 0.0 {
        let (best, f_best, other, f_other) = if fa == 0.0 { (a, fa, b, fb) } else { (b, fb, a, fa) };
        return Ok(Some(Bracket {
            best,
            f_best,
            other,
            f_other,
        }));
    }
    // b is the estimate, c the contrapoint (f(b)·f(c) ≤ 0), a the previous estimate.
    let (mut c, mut fc) = (a, fa);
    let mut d = b - a;
    let mut e = d;
    for _ in 0..200 {
        if fb * fc > 0.0 {
            c = a;
            fc = fa;
            d = b - a;
            e = d;
        }
        if fc.abs() < fb.abs() {
            a = b;
            b = c;
            c = a;
            fa = fb;
            fb = fc;
            fc = fa;
        }
        let tol1 = 4.0 * f64::EPSILON * b.abs() + 0.5 * tol(b);
        let xm = 0.5 * (c - b);
        if xm.abs() <= tol1 || fb == 0.0 {
            break;
        }
        if e.abs() >= tol1 && fa.abs() > fb.abs() {
            let s = fb / fa;
            let (mut p, mut q);
            if a == c {
                p = 2.0 * xm * s;
                q = 1.0 - s;
            } else {
                let qa = fa / fc;
                let r = fb / fc;
                p = s * (2.0 * xm * qa * (qa - r) - (b - a) * (r - 1.0));
                q = (qa - 1.0) * (r - 1.0) * (s - 1.0);
            }
            if p > 0.0 {
                q = -q;
            }
            p = p.abs();
            if 2.0 * p < (3.0 * xm * q - (tol1 * q).abs()).min((e * q).abs()) {
                e = d;
                d = p / q;
            } else {
                d = xm;
                e = d;
            }
        } else {
            d = xm;
            e = d;
        }
        a = b;
        fa = fb;
        b += if d.abs() > tol1 { d } else { tol1.copysign(xm) };
        fb = f(b)?;
        if !fb.is_finite() {
            return Ok(None);
        }
    }
    if fb * fc > 0.0 {
        // The last step of an unfinished search kept the sign of the contrapoint.
        c = a;
        fc = fa;
    }
    Ok(Some(Bracket {
        best: b,
        f_best: fb,
        other: c,
        f_other: fc,
    }))
}

/// Finds the root of a function that decreases through zero on `(0, ∞)`: starting from `guess`
/// it halves a lower end until `f > 0` and doubles an upper end until `f < 0`, then applies
/// [`brent`] with a relative tolerance of about 1e-14.
pub fn decreasing_root_on_positive_axis<F: Fn(f64) -> f64>(f: F, guess: f64) -> Option<f64> {
    let mut lo = guess;
    let mut hi = guess;
    for _ in 0..1100 {
        if f(lo) > 0.0 {
            break;
        }
        lo *= 0.5;
    }
    for _ in 0..1100 {
        if f(hi) < 0.0 {
            break;
        }
        hi *= 2.0;
    }
    if !(f(lo) > 0.0 && f(hi) < 0.0) {
        return None;
    }
    brent(&f, lo, hi, 1e-15 * hi)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn brent_finds_closed_form_roots_to_rounding() {
        // x³ = 2 has the root 2^(1/3) (f64::cbrt); x = cos x has the Dottie number
        // 0.739085133215160641655… (a fact of analysis, the fixed point of cos).
        let cbrt2 = brent(|x| x * x * x - 2.0, 0.0, 2.0, 0.0).unwrap();
        assert!((cbrt2 - 2.0_f64.cbrt()).abs() < 1e-15, "{cbrt2}");
        let dottie = brent(|x| x - x.cos(), 0.0, 1.0, 0.0).unwrap();
        assert!((dottie - 0.739_085_133_215_160_6).abs() < 1e-15, "{dottie}");
        assert_eq!(brent(|x| x * x + 1.0, -1.0, 1.0, 1e-12), None);
    }

    #[test]
    fn the_final_bracket_holds_the_sign_change_within_the_tolerance() {
        // A step-like margin: negative below 1.2345, positive from there on.
        let margin = |x: f64| (x - 1.2345).tanh();
        for tol in [1e-1, 1e-3, 1e-6] {
            let b = try_brent_bracket(|x| Ok::<_, ()>(margin(x)), 0.0, 10.0, |_| tol)
                .unwrap()
                .unwrap();
            assert!(b.f_best * b.f_other <= 0.0, "{b:?}");
            assert!((b.best - b.other).abs() <= tol * (1.0 + 1e-9), "{tol}: {b:?}");
            let met = b.non_negative_end();
            assert!(margin(met) >= 0.0 && met - 1.2345 <= tol, "{tol}: {met}");
        }
    }

    #[test]
    fn an_error_of_the_function_ends_the_search() {
        let mut calls = 0;
        let r = try_brent(
            |x: f64| {
                calls += 1;
                if calls > 3 {
                    Err(format!("failed at {x}"))
                } else {
                    Ok(x.exp() - 2.0)
                }
            },
            0.0,
            1.0,
            1e-12,
        );
        assert!(r.unwrap_err().starts_with("failed at"));
        let root = try_brent(|x| Ok::<_, String>(x - 0.3), 0.0, 1.0, 1e-14)
            .unwrap()
            .unwrap();
        assert!((root - 0.3).abs() < 1e-14, "{root}");
    }
}
