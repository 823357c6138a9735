//! Bracketed root finding (Brent's method) for the one-dimensional equations of the frost
//! module. R. P. Brent, *Algorithms for Minimization without Derivatives*, 1973, ch. 4
//! (inverse quadratic interpolation safeguarded by bisection).

/// A root of `f` in `[a, b]` where `f(a)` and `f(b)` differ in sign, to an absolute tolerance
/// of about `4 ε |x| + tol`. Returns `None` when the bracket does not change sign or `f` is not
/// finite at the ends.
pub fn brent<F: Fn(f64) -> f64>(f: F, mut a: f64, mut b: f64, tol: f64) -> Option<f64> {
    let mut fa = f(a);
    let mut fb = f(b);
    if !(fa.is_finite() && fb.is_finite()) || fa * fb > 0.0 {
        return None;
    }
    if fa == 0.0 {
        return Some(a);
    }
    if fb == 0.0 {
        return Some(b);
    }
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
        let tol1 = 4.0 * f64::EPSILON * b.abs() + 0.5 * tol;
        let xm = 0.5 * (c - b);
        if xm.abs() <= tol1 || fb == 0.0 {
            return Some(b);
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
        fb = f(b);
        if !fb.is_finite() {
            return None;
        }
    }
    Some(b)
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
