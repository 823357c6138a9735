//! The one small dense solver of the project: LU factorisation with partial pivoting (faer's
//! `PartialPivLu`), factorised once and reused for any number of right-hand sides. Used by the
//! multipole borehole resistance (`physics::borehole`) and by the direct steps of the
//! uniform-wall-temperature g-function (`physics::gfunction::dense`). Matrices come in row by
//! row as one slice, so callers need no matrix type of their own.

use faer::Mat;
use faer::linalg::solvers::{PartialPivLu, Solve};

/// The LU factors of a square matrix, `P A = L U`.
pub struct DenseLu {
    lu: PartialPivLu<f64>,
    n: usize,
}

impl DenseLu {
    /// Factorises the `n × n` matrix `A` given row by row (`row_major[i * n + j]` = `a_ij`).
    /// `None` when the slice does not hold `n²` values or a pivot of `U` is zero or not finite
    /// (the matrix is singular, or holds values that are not numbers).
    pub fn new(n: usize, row_major: &[f64]) -> Option<Self> {
        if row_major.len() != n * n {
            return None;
        }
        let a = Mat::<f64>::from_fn(n, n, |i, j| row_major[i * n + j]);
        let lu = PartialPivLu::new(a.as_ref());
        let u = lu.U();
        if (0..n).all(|i| {
            let pivot = u[(i, i)];
            pivot.is_finite() && pivot != 0.0
        }) {
            Some(Self { lu, n })
        } else {
            None
        }
    }

    /// The order `n` of the matrix.
    pub fn dim(&self) -> usize {
        self.n
    }

    /// The solution `x` of `A x = rhs`.
    ///
    /// # Panics
    /// When `rhs` does not hold `n` values (a programming error of the caller).
    pub fn solve(&self, rhs: &[f64]) -> Vec<f64> {
        assert_eq!(
            rhs.len(),
            self.n,
            "the right-hand side has {} values for a matrix of order {}",
            rhs.len(),
            self.n
        );
        let b = Mat::<f64>::from_fn(self.n, 1, |i, _| rhs[i]);
        let x = self.lu.solve(&b);
        (0..self.n).map(|i| x[(i, 0)]).collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn solves_a_system_with_a_known_solution_that_needs_pivoting() {
        // a₁₁ = 0 forces a row exchange; the solution (1, 2, 3) is checked by substitution:
        // 0·1 + 2·2 + 1·3 = 7, 1·1 + 1·2 + 1·3 = 6, 2·1 + 1·2 + 3·3 = 13.
        let a = [0.0, 2.0, 1.0, 1.0, 1.0, 1.0, 2.0, 1.0, 3.0];
        let lu = DenseLu::new(3, &a).unwrap();
        let x = lu.solve(&[7.0, 6.0, 13.0]);
        for (xi, expected) in x.iter().zip([1.0, 2.0, 3.0]) {
            assert!((xi - expected).abs() < 1e-14, "{x:?}");
        }
        assert_eq!(lu.dim(), 3);
    }

    #[test]
    fn refuses_singular_and_malformed_matrices() {
        // The second row is twice the first.
        assert!(DenseLu::new(2, &[1.0, 2.0, 2.0, 4.0]).is_none());
        assert!(DenseLu::new(2, &[1.0, f64::NAN, 0.0, 1.0]).is_none());
        assert!(DenseLu::new(2, &[1.0, 0.0, 0.0]).is_none());
    }
}
