//! Linear solvers for the cell system of the cross-section engine.
//!
//! The cell system on an `nx × nz` rectilinear grid (cell `c = iz·nx + ix`) is
//!
//! ```text
//! (m_c + d_c + Σ g) T_c − Σ g·T_neighbour = f_c
//! ```
//!
//! with `m` the storage conductance `V·C/Δt` (W/K or W/(m·K); 0 in a steady solve),
//! `d` the diagonal boundary conductances (surface, pipe walls), and `g` the
//! conductances of the internal x faces (`gx`, `nz·(nx − 1)` of them, face
//! `iz·(nx − 1) + ix` between cells `ix` and `ix + 1`) and z faces (`gz`,
//! `(nz − 1)·nx`, face `iz·nx + ix` between rows `iz` and `iz + 1`). Cells that are
//! not part of the domain (inside a pipe) carry `m = 1`, no faces and a zero
//! right-hand side, so they solve to zero.
//!
//! Both solvers apply an (approximate) inverse of the matrix `K` to a residual:
//!
//! * [`DirectSolver`]: sparse Cholesky `K = LLᵀ` (crate `faer`); the symbolic
//!   factorisation (fill-reducing ordering, elimination tree) is computed once per
//!   grid and the numeric factor is redone only when the coefficients change.
//!   Exact to round-off.
//! * [`AdiSolver`]: the Douglas–Gunn alternating-direction scheme in delta form
//!   (J. Douglas & J. E. Gunn, "A general formulation of alternating direction
//!   methods", Numerische Mathematik 6 (1964) 428–453):
//!   with the whole diagonal `D = M + diag(d)` (storage and boundary terms) shared
//!   by both sweeps: `(D + A_x)·δ₁ = r`, `(D + A_z)·δ = D·δ₁`, i.e. `K` is replaced
//!   by `(D + A_x)·D⁻¹·(D + A_z) = K + A_x·D⁻¹·A_z`. Two sets of tridiagonal
//!   (Thomas) solves, O(cells) per application. `A_x` and `A_z` hold only internal
//!   faces, so their columns sum to zero: the splitting term `A_x·D⁻¹·A_z·δ` sums
//!   to zero over the cells and the scheme conserves energy exactly (see the
//!   `section` module docs). Sharing `D` matters next to a pipe wall, where the
//!   wall conductance dominates `D` and makes the splitting term vanish (putting it
//!   in one sweep only lets the other sweep spread an O(d/g) overshoot). A steady
//!   state (`r = 0`) is reproduced exactly; the splitting error is `O(Δt²)` per
//!   step and slows only modes that are short in both directions. Requires `D > 0`
//!   in every cell, so it is only used for transient steps.

use faer::Side;
use faer::linalg::solvers::Solve;
use faer::sparse::linalg::solvers::{Llt, SymbolicLlt};
use faer::sparse::{SparseColMatRef, SymbolicSparseColMat};

/// Coefficients of the cell system (see the module documentation).
#[derive(Debug, Clone)]
pub(crate) struct Coefficients {
    pub nx: usize,
    pub nz: usize,
    /// Storage conductance per cell (1 for cells outside the domain).
    pub m: Vec<f64>,
    /// Diagonal boundary conductance per cell.
    pub d: Vec<f64>,
    /// x-face conductances, `nz·(nx − 1)`.
    pub gx: Vec<f64>,
    /// z-face conductances, `(nz − 1)·nx`.
    pub gz: Vec<f64>,
}

impl Coefficients {
    pub fn new(nx: usize, nz: usize) -> Self {
        Self {
            nx,
            nz,
            m: vec![0.0; nx * nz],
            d: vec![0.0; nx * nz],
            gx: vec![0.0; nz * (nx - 1)],
            gz: vec![0.0; (nz - 1) * nx],
        }
    }

    /// `out = K·x`.
    pub fn multiply(&self, x: &[f64], out: &mut [f64]) {
        let (nx, nz) = (self.nx, self.nz);
        for c in 0..nx * nz {
            out[c] = (self.m[c] + self.d[c]) * x[c];
        }
        for iz in 0..nz {
            for ix in 0..nx - 1 {
                let g = self.gx[iz * (nx - 1) + ix];
                let c = iz * nx + ix;
                let flow = g * (x[c] - x[c + 1]);
                out[c] += flow;
                out[c + 1] -= flow;
            }
        }
        for iz in 0..nz - 1 {
            for ix in 0..nx {
                let g = self.gz[iz * nx + ix];
                let c = iz * nx + ix;
                let flow = g * (x[c] - x[c + nx]);
                out[c] += flow;
                out[c + nx] -= flow;
            }
        }
    }
}

/// Which linear solver a transient run uses.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SolverKind {
    /// ADI when no cell can freeze (every material linear), Direct otherwise:
    /// the ADI scheme passes every check without freezing but its splitting term
    /// is indefinite where the apparent capacity jumps between neighbouring cells
    /// (a freezing front next to a pipe) and the step then diverges.
    Auto,
    /// Sparse Cholesky, exact: the accuracy reference.
    Direct,
    /// Douglas–Gunn alternating-direction implicit, O(cells) per step.
    Adi,
}

/// Applies an (approximate) inverse of `K`.
pub(crate) trait CellSolver {
    /// Prepares for new coefficients (the numeric factorisation of the direct solver).
    fn prepare(&mut self, k: &Coefficients) -> Result<(), String>;
    /// `out ≈ K⁻¹·r`, linear in `r`.
    fn apply(&mut self, k: &Coefficients, r: &[f64], out: &mut [f64]);
    /// Numeric factorisations so far.
    fn factorisations(&self) -> usize {
        0
    }
}

/// Sparse Cholesky with the symbolic factorisation reused.
pub(crate) struct DirectSolver {
    symbolic_matrix: SymbolicSparseColMat<usize>,
    symbolic: SymbolicLlt<usize>,
    values: Vec<f64>,
    /// Position in `values` of each column's diagonal, right and lower entries.
    diag_at: Vec<usize>,
    right_at: Vec<usize>,
    below_at: Vec<usize>,
    factor: Option<Llt<usize, f64>>,
    work: Vec<f64>,
    factorisations: usize,
}

impl DirectSolver {
    /// Builds the lower-triangular pattern (diagonal, right neighbour, lower
    /// neighbour per column) and its symbolic Cholesky factorisation.
    pub fn new(nx: usize, nz: usize) -> Result<Self, String> {
        let n = nx * nz;
        let mut col_ptr = Vec::with_capacity(n + 1);
        let mut row_idx = Vec::with_capacity(3 * n);
        let none = usize::MAX;
        let (mut diag_at, mut right_at, mut below_at) = (vec![0; n], vec![none; n], vec![none; n]);
        col_ptr.push(0);
        for c in 0..n {
            let ix = c % nx;
            diag_at[c] = row_idx.len();
            row_idx.push(c);
            if ix + 1 < nx {
                right_at[c] = row_idx.len();
                row_idx.push(c + 1);
            }
            if c + nx < n {
                below_at[c] = row_idx.len();
                row_idx.push(c + nx);
            }
            col_ptr.push(row_idx.len());
        }
        let nnz = row_idx.len();
        let symbolic_matrix = SymbolicSparseColMat::new_checked(n, n, col_ptr, None, row_idx);
        let symbolic = SymbolicLlt::try_new(symbolic_matrix.as_ref(), Side::Lower)
            .map_err(|e| format!("the symbolic Cholesky factorisation failed ({e:?})"))?;
        Ok(Self {
            symbolic_matrix,
            symbolic,
            values: vec![0.0; nnz],
            diag_at,
            right_at,
            below_at,
            factor: None,
            work: vec![0.0; n],
            factorisations: 0,
        })
    }

    fn fill_values(&mut self, k: &Coefficients) {
        let nx = k.nx;
        let n = k.nx * k.nz;
        for c in 0..n {
            self.values[self.diag_at[c]] = k.m[c] + k.d[c];
        }
        for c in 0..n {
            let (ix, iz) = (c % nx, c / nx);
            if ix + 1 < nx {
                let g = k.gx[iz * (nx - 1) + ix];
                self.values[self.right_at[c]] = -g;
                self.values[self.diag_at[c]] += g;
                self.values[self.diag_at[c + 1]] += g;
            }
            if c + nx < n {
                let g = k.gz[c];
                self.values[self.below_at[c]] = -g;
                self.values[self.diag_at[c]] += g;
                self.values[self.diag_at[c + nx]] += g;
            }
        }
    }
}

impl CellSolver for DirectSolver {
    fn prepare(&mut self, k: &Coefficients) -> Result<(), String> {
        self.fill_values(k);
        let matrix = SparseColMatRef::new(self.symbolic_matrix.as_ref(), &self.values);
        let factor = Llt::try_new_with_symbolic(self.symbolic.clone(), matrix, Side::Lower).map_err(|e| {
            format!(
                "the cell matrix is not positive definite ({e:?}); the domain needs a surface or pipe held at a temperature"
            )
        })?;
        self.factor = Some(factor);
        self.factorisations += 1;
        Ok(())
    }

    fn apply(&mut self, _k: &Coefficients, r: &[f64], out: &mut [f64]) {
        out.copy_from_slice(r);
        if let Some(factor) = &self.factor {
            let rhs = faer::MatMut::from_column_major_slice_mut(out, r.len(), 1);
            factor.solve_in_place(rhs);
        }
        let _ = &self.work;
    }

    fn factorisations(&self) -> usize {
        self.factorisations
    }
}

/// Douglas–Gunn ADI in delta form (see the module documentation).
pub(crate) struct AdiSolver {
    half: Vec<f64>,
    c_prime: Vec<f64>,
    rhs: Vec<f64>,
}

impl AdiSolver {
    pub fn new(nx: usize, nz: usize) -> Self {
        let n = nx * nz;
        Self {
            half: vec![0.0; n],
            c_prime: vec![0.0; n],
            rhs: vec![0.0; n],
        }
    }
}

impl CellSolver for AdiSolver {
    fn prepare(&mut self, _k: &Coefficients) -> Result<(), String> {
        Ok(())
    }

    fn apply(&mut self, k: &Coefficients, r: &[f64], out: &mut [f64]) {
        let (nx, nz) = (k.nx, k.nz);
        // x sweep: (D + A_x)·δ₁ = r, one Thomas solve per row.
        for iz in 0..nz {
            let row = iz * nx;
            let g = &k.gx[iz * (nx - 1)..(iz + 1) * (nx - 1)];
            let cp = &mut self.c_prime[row..row + nx];
            let x = &mut self.half[row..row + nx];
            let m = &k.m[row..row + nx];
            let d = &k.d[row..row + nx];
            let rr = &r[row..row + nx];
            let mut west = 0.0;
            for ix in 0..nx {
                let east = if ix + 1 < nx { g[ix] } else { 0.0 };
                let (prev_c, prev_x) = if ix > 0 {
                    (cp[ix - 1], x[ix - 1])
                } else {
                    (0.0, 0.0)
                };
                let inv = 1.0 / (m[ix] + d[ix] + west + east + west * prev_c);
                cp[ix] = -east * inv;
                x[ix] = (rr[ix] + west * prev_x) * inv;
                west = east;
            }
            for ix in (0..nx - 1).rev() {
                x[ix] -= cp[ix] * x[ix + 1];
            }
        }
        // z sweep: (D + A_z)·δ = D·δ₁, all columns at once (row-major, vectorisable).
        for c in 0..nx * nz {
            self.rhs[c] = (k.m[c] + k.d[c]) * self.half[c];
        }
        for iz in 0..nz {
            let row = iz * nx;
            for ix in 0..nx {
                let c = row + ix;
                let up = if iz > 0 { k.gz[c - nx] } else { 0.0 };
                let down = if iz + 1 < nz { k.gz[c] } else { 0.0 };
                let (prev_c, prev_x) = if iz > 0 {
                    (self.c_prime[c - nx], out[c - nx])
                } else {
                    (0.0, 0.0)
                };
                let inv = 1.0 / (k.m[c] + k.d[c] + up + down + up * prev_c);
                self.c_prime[c] = -down * inv;
                out[c] = (self.rhs[c] + up * prev_x) * inv;
            }
        }
        for iz in (0..nz - 1).rev() {
            let row = iz * nx;
            for ix in 0..nx {
                let c = row + ix;
                out[c] -= self.c_prime[c] * out[c + nx];
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sample(nx: usize, nz: usize) -> Coefficients {
        let mut k = Coefficients::new(nx, nz);
        for (i, m) in k.m.iter_mut().enumerate() {
            *m = 1.0 + (i % 7) as f64 * 0.3;
        }
        for (i, g) in k.gx.iter_mut().enumerate() {
            *g = 2.0 + (i % 5) as f64;
        }
        for (i, g) in k.gz.iter_mut().enumerate() {
            *g = 1.0 + (i % 3) as f64;
        }
        for ix in 0..nx {
            k.d[ix] = 4.0;
        }
        k
    }

    #[test]
    fn direct_solver_inverts_the_cell_matrix() {
        let (nx, nz) = (7, 5);
        let k = sample(nx, nz);
        let x: Vec<f64> = (0..nx * nz).map(|i| (i as f64 * 0.37).sin()).collect();
        let mut r = vec![0.0; nx * nz];
        k.multiply(&x, &mut r);
        let mut solver = DirectSolver::new(nx, nz).unwrap();
        solver.prepare(&k).unwrap();
        let mut y = vec![0.0; nx * nz];
        solver.apply(&k, &r, &mut y);
        for (a, b) in x.iter().zip(&y) {
            assert!((a - b).abs() < 1e-10);
        }
    }

    #[test]
    fn adi_is_exact_for_a_field_uniform_along_x() {
        // With A_x·δ = 0 the Douglas–Gunn factorisation equals K exactly.
        let (nx, nz) = (4, 6);
        let mut k = sample(nx, nz);
        for c in 0..nx * nz {
            k.m[c] = 1.0 + (c / nx) as f64;
        }
        for iz in 0..nz - 1 {
            for ix in 0..nx {
                k.gz[iz * nx + ix] = 1.0 + iz as f64;
            }
        }
        let x: Vec<f64> = (0..nx * nz).map(|c| ((c / nx) as f64).cos()).collect();
        let mut r = vec![0.0; nx * nz];
        k.multiply(&x, &mut r);
        let mut solver = AdiSolver::new(nx, nz);
        let mut y = vec![0.0; nx * nz];
        solver.apply(&k, &r, &mut y);
        for (a, b) in x.iter().zip(&y) {
            assert!((a - b).abs() < 1e-12, "{a} {b}");
        }
    }
}
