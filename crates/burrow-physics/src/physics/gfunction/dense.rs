//! Solution of the dense bordered systems of the uniform-wall-temperature g-function.
//!
//! Each time step has its own matrix (the step lengths differ), but consecutive matrices are
//! close. Small systems are factorised (`numerics::dense`, LU with partial pivoting) at every step. Larger
//! ones are solved by GMRES (Saad & Schultz 1986, with modified Gram–Schmidt and Givens
//! rotations) right-preconditioned by the LU factors of an earlier step's matrix; the factors
//! are renewed when GMRES needs many iterations, and a direct solve is the fallback when it
//! does not converge.

use crate::numerics::dense::DenseLu;
use rayon::prelude::*;

/// Below this size every step is factorised directly.
const DIRECT_BELOW: usize = 300;
/// GMRES iterations allowed before the current matrix is factorised instead.
const MAX_ITERATIONS: usize = 60;
/// After a solve needing more iterations than this, the factors are renewed for later steps.
const RENEW_AFTER: usize = 25;
/// Relative residual asked of GMRES.
const TOLERANCE: f64 = 1e-12;
/// The error when a step's matrix cannot be factorised.
const SINGULAR: &str = "the segment system of the uniform-wall-temperature g-function is singular; check that no two boreholes coincide";

pub(crate) struct StepSolver {
    factors: Option<DenseLu>,
    /// Number of LU factorisations and GMRES iterations done (for the benchmark's report).
    pub factorisations: usize,
    pub iterations: usize,
}

impl StepSolver {
    pub(crate) fn new() -> Self {
        Self {
            factors: None,
            factorisations: 0,
            iterations: 0,
        }
    }

    /// Solves `matrix · x = rhs` for the n × n row-major `matrix`.
    pub(crate) fn solve(&mut self, matrix: &[f64], rhs: &[f64]) -> Result<Vec<f64>, String> {
        let n = rhs.len();
        if n >= DIRECT_BELOW && self.factors.is_some() {
            let (x, iterations, converged) = self.gmres(matrix, rhs);
            self.iterations += iterations;
            if converged {
                if iterations > RENEW_AFTER {
                    self.factorise(matrix, n)?;
                }
                return Ok(x);
            }
        }
        self.factorise(matrix, n)?;
        let x = self.precondition(rhs);
        if x.iter().all(|v| v.is_finite()) {
            Ok(x)
        } else {
            Err(SINGULAR.into())
        }
    }

    fn factorise(&mut self, matrix: &[f64], n: usize) -> Result<(), String> {
        self.factorisations += 1;
        self.factors = Some(DenseLu::new(n, matrix).ok_or(SINGULAR)?);
        Ok(())
    }

    fn precondition(&self, v: &[f64]) -> Vec<f64> {
        match &self.factors {
            Some(lu) => lu.solve(v),
            None => v.to_vec(),
        }
    }

    /// Right-preconditioned GMRES from x0 = P⁻¹·rhs; returns (x, iterations, converged).
    fn gmres(&self, matrix: &[f64], rhs: &[f64]) -> (Vec<f64>, usize, bool) {
        let n = rhs.len();
        let x0 = self.precondition(rhs);
        let r0: Vec<f64> = multiply(matrix, &x0)
            .iter()
            .zip(rhs)
            .map(|(ax, b)| b - ax)
            .collect();
        let scale = norm(rhs).max(f64::MIN_POSITIVE);
        let beta = norm(&r0);
        if beta <= TOLERANCE * scale {
            return (x0, 0, true);
        }
        let mut basis: Vec<Vec<f64>> = vec![r0.iter().map(|v| v / beta).collect()];
        let mut directions: Vec<Vec<f64>> = Vec::new();
        let mut hessenberg: Vec<Vec<f64>> = Vec::new();
        let mut rotations: Vec<(f64, f64)> = Vec::new();
        let mut g = vec![beta];
        let mut converged = false;
        for j in 0..MAX_ITERATIONS.min(n) {
            let z = self.precondition(&basis[j]);
            let mut w = multiply(matrix, &z);
            directions.push(z);
            let mut column = vec![0.0; j + 2];
            for (i, v) in basis.iter().enumerate() {
                let hij = dot(&w, v);
                column[i] = hij;
                for (wk, vk) in w.iter_mut().zip(v) {
                    *wk -= hij * vk;
                }
            }
            let wn = norm(&w);
            column[j + 1] = wn;
            for (i, &(c, s)) in rotations.iter().enumerate() {
                let (a, b) = (column[i], column[i + 1]);
                column[i] = c * a + s * b;
                column[i + 1] = -s * a + c * b;
            }
            let (a, b) = (column[j], column[j + 1]);
            let r = a.hypot(b);
            let (c, s) = if r == 0.0 { (1.0, 0.0) } else { (a / r, b / r) };
            column[j] = r;
            column[j + 1] = 0.0;
            rotations.push((c, s));
            g.push(-s * g[j]);
            g[j] *= c;
            hessenberg.push(column);
            if g[j + 1].abs() <= TOLERANCE * scale || wn == 0.0 {
                converged = true;
                break;
            }
            basis.push(w.iter().map(|v| v / wn).collect());
        }
        let k = hessenberg.len();
        let mut y = vec![0.0; k];
        for i in (0..k).rev() {
            let mut sum = g[i];
            for (l, yl) in y.iter().enumerate().skip(i + 1) {
                sum -= hessenberg[l][i] * yl;
            }
            y[i] = sum / hessenberg[i][i];
        }
        let mut x = x0;
        for (yi, z) in y.iter().zip(&directions) {
            for (xk, zk) in x.iter_mut().zip(z) {
                *xk += yi * zk;
            }
        }
        (x, k, converged)
    }
}

fn multiply(matrix: &[f64], v: &[f64]) -> Vec<f64> {
    let mut out = vec![0.0; v.len()];
    out.par_iter_mut()
        .zip(matrix.par_chunks_exact(v.len()))
        .for_each(|(o, row)| *o = dot(row, v));
    out
}

/// Dot product with eight independent partial sums (so that it vectorises).
#[inline]
fn dot(a: &[f64], b: &[f64]) -> f64 {
    let mut partial = [0.0; 8];
    let (ca, cb) = (a.chunks_exact(8), b.chunks_exact(8));
    let tail: f64 = ca
        .remainder()
        .iter()
        .zip(cb.remainder())
        .map(|(x, y)| x * y)
        .sum();
    for (x, y) in ca.zip(cb) {
        for k in 0..8 {
            partial[k] += x[k] * y[k];
        }
    }
    partial.iter().sum::<f64>() + tail
}

fn norm(a: &[f64]) -> f64 {
    dot(a, a).sqrt()
}
