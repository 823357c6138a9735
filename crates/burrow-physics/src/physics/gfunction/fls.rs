//! The finite line source (FLS) between two coaxial-parallel vertical line segments, with the
//! mirror image above the ground surface, in the one-integral form.
//!
//! For a source segment of length `H1` whose top is at depth `D1` and a receiver segment of length
//! `H2` whose top is at depth `D2`, at horizontal distance `d`, the mean temperature rise along the
//! receiver after a time `t` of a constant heat rate `q'` (W/m) on the source is
//! `ΔT = q'/(2πk) · h(t)` with
//!
//! ```text
//! h(t) = 1/(2 H2) ∫_{1/√(4αt)}^∞ exp(−d² s²) / s² · [I_real(s) + I_image(s)] ds
//! I_real  = ierf((D2−D1+H2)s) − ierf((D2−D1)s) + ierf((D2−D1−H1)s) − ierf((D2−D1+H2−H1)s)
//! I_image = ierf((D1+D2+H2)s) − ierf((D1+D2)s) + ierf((D1+D2+H1)s) − ierf((D1+D2+H1+H2)s)
//! ierf(x) = x·erf(x) − (1 − exp(−x²))/√π
//! ```
//!
//! Sources: Claesson & Javed (2011), "An analytical method to calculate borehole fluid
//! temperatures for time-scales from minutes to decades", ASHRAE Trans. 117(2), the mean
//! borehole-wall single integral for one borehole (their f(Hs, Ds) with ierf; equation number
//! not checked here, from memory); Cimmino & Bernier (2014), Int. J. Heat Mass Transfer 70,
//! 641–650, the segment-to-segment generalisation (real and image parts; equation number from
//! memory, not checked). The form was re-derived for this module from the point source
//! `erfc(ρ/√(4αt))/(4πkρ)` using `erfc(x)/x = (2/√π)∫_{1/√(4αt)}^∞ exp(−ρ²s²) ds·…` and the
//! double integral of `exp(−(z−z')²s²)` over the two segments, which gives exactly the
//! combinations above; the reference script tests/reference/gfunction_reference.py checks it
//! against a direct double integral of the point source.
//!
//! The integrand factors into a distance part `exp(−d²s²)` and a segment part `I(s)/(2 H2 s²)`:
//! [`SegmentPair::kernel`] is the segment part.

use std::f64::consts::PI;

/// ∫₀ˣ erf(x') dx' = x·erf(x) − (1 − exp(−x²))/√π (Abramowitz & Stegun 1964, eq. 7.4.35 with
/// erf(0) = 0); an even function of x.
pub(crate) fn ierf(x: f64) -> f64 {
    x * crate::numerics::special::erf(x) + libm::expm1(-x * x) / PI.sqrt()
}

/// Which of the two parts of the FLS a [`SegmentPair`] is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub(crate) enum Part {
    /// The real source below ground.
    Real,
    /// The mirror image above the surface (negative strength), which keeps the surface at the
    /// undisturbed temperature.
    Image,
}

/// The vertical geometry of one source–receiver segment pair, reduced to what its FLS segment
/// part depends on.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct SegmentPair {
    pub part: Part,
    /// `D2 − D1` for the real part, `D1 + D2` for the image part, m.
    pub offset_m: f64,
    /// Receiver length `H2`, m.
    pub receiver_m: f64,
    /// Source length `H1`, m.
    pub source_m: f64,
}

impl SegmentPair {
    /// The real and image pairs of a source segment (top `source_top_m`, length `source_m`) and a
    /// receiver segment (top `receiver_top_m`, length `receiver_m`). The real part is even in
    /// `D2 − D1` when the lengths are equal, so the offset is then stored as its absolute value
    /// (which lets equal pairs share one entry).
    pub(crate) fn both(
        source_top_m: f64,
        source_m: f64,
        receiver_top_m: f64,
        receiver_m: f64,
    ) -> [SegmentPair; 2] {
        let mut difference = receiver_top_m - source_top_m;
        if source_m == receiver_m {
            difference = difference.abs();
        }
        [
            SegmentPair {
                part: Part::Real,
                offset_m: difference,
                receiver_m,
                source_m,
            },
            SegmentPair {
                part: Part::Image,
                offset_m: receiver_top_m + source_top_m,
                receiver_m,
                source_m,
            },
        ]
    }

    /// The segment part of the FLS integrand, `I(s)/(2 H2 s²)`, in 1/m (s in 1/m). Multiply by
    /// `exp(−d²s²)` and integrate over s (1/m) to get the dimensionless response `h`.
    pub(crate) fn kernel(&self, s: f64) -> f64 {
        let (a, h2, h1) = (self.offset_m, self.receiver_m, self.source_m);
        let i = match self.part {
            Part::Real => ierf((a + h2) * s) - ierf(a * s) + ierf((a - h1) * s) - ierf((a + h2 - h1) * s),
            Part::Image => ierf((a + h2) * s) - ierf(a * s) + ierf((a + h1) * s) - ierf((a + h1 + h2) * s),
        };
        i / (2.0 * h2 * s * s)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ierf_is_the_integral_of_erf() {
        // d/dx ierf(x) = erf(x), checked by a central difference; ierf(0) = 0.
        assert_eq!(ierf(0.0), 0.0);
        for x in [0.01, 0.3, 1.0, 2.5, 7.0] {
            let h = 1e-5;
            let derivative = (ierf(x + h) - ierf(x - h)) / (2.0 * h);
            assert!((derivative - crate::numerics::special::erf(x)).abs() < 1e-8);
        }
    }
}
