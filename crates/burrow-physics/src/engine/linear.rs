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
//!   in every cell, so it is only used for transient steps. Both Thomas
//!   factorisations are stored at `prepare` (x factors only for rows whose
//!   coefficients changed), so an application is four multiply-add passes.
//!   As the solver of the freezing iteration it is a stationary iteration whose
//!   error can grow where the apparent capacity jumps between neighbours; over a
//!   freezing year it diverged in the benchmark, so freezing uses:
//! * [`PcgSolver`]: conjugate gradients preconditioned by a modified incomplete
//!   Cholesky factor (no fill), iterated to a relative residual, then shifted
//!   uniformly so that the residual sums to zero (`K·1 = m + d`): energy is
//!   conserved to round-off whatever the tolerance. The preconditioner is
//!   refactored only when a solve needed many iterations; callers may pass a
//!   starting guess (`apply_from`). Pipe walls behind a resistance (or with a
//!   given heat rate) are eliminated into its operator as rank-one terms
//!   ([`WallNode`]; the preconditioner ignores them), so the caller needs no
//!   wall responses and a freezing iteration costs one solve.

#![allow(clippy::needless_range_loop)] // index loops over cells mirror the stencil formulas

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
    /// Cells of the domain (`false` inside pipes: `m = 1`, no faces, `r = 0`).
    pub active: Vec<bool>,
    /// Pipe-wall nodes eliminated into the system (only for solvers whose
    /// [`CellSolver::eliminates_walls`] is true; empty otherwise).
    pub nodes: Vec<WallNode>,
}

/// A pipe-wall temperature eliminated from the cell system. The wall node obeys
/// `a·T_w − Σ g_c·T_c = b` (`a = Σ g_c + 1/R_wall` behind a wall resistance,
/// `a = Σ g_c` for a given heat rate), so `T_w = (Σ g_c·T_c + b)/a` and the cell
/// rows gain the symmetric rank-one term `−g·gᵀ/a` (a Schur complement of the
/// symmetric positive definite system with the wall node, hence itself SPD).
#[derive(Debug, Clone, Default)]
pub(crate) struct WallNode {
    /// `(cell, link conductance g_c)`.
    pub links: Vec<(usize, f64)>,
    /// `1/a`.
    pub inv_a: f64,
}

impl WallNode {
    /// `Σ g_c·x_c`.
    pub fn link_sum(&self, x: &[f64]) -> f64 {
        self.links.iter().map(|&(c, g)| g * x[c]).sum()
    }

    /// `Σ g_c`.
    pub fn conductance(&self) -> f64 {
        self.links.iter().map(|&(_, g)| g).sum()
    }
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
            active: vec![true; nx * nz],
            nodes: Vec::new(),
        }
    }

    /// `out = (K − M)·x`: the boundary and conduction terms (and the eliminated
    /// wall nodes) only.
    pub fn multiply_conduction(&self, x: &[f64], out: &mut [f64]) {
        self.multiply_stencil(x, out);
        for node in &self.nodes {
            let s = node.link_sum(x) * node.inv_a;
            for &(c, g) in &node.links {
                out[c] -= g * s;
            }
        }
    }

    /// `Σ_c (K·1_active)_c = Σ_active (m + d) − Σ_nodes (Σ g)²/a`: the faces
    /// cancel in the sum (faces to cells outside the domain are zero).
    pub fn total_weight(&self) -> f64 {
        let diagonal: f64 = (self.m.iter().zip(&self.d).zip(&self.active))
            .filter(|(_, a)| **a)
            .map(|((m, d), _)| m + d)
            .sum();
        let nodes: f64 = self.nodes.iter().map(|n| n.conductance().powi(2) * n.inv_a).sum();
        diagonal - nodes
    }

    /// The 5-point stencil part of `(K − M)·x`, row by row in gather form (each
    /// output written once, vectorisable).
    fn multiply_stencil(&self, x: &[f64], out: &mut [f64]) {
        let (nx, nz) = (self.nx, self.nz);
        for iz in 0..nz {
            let row = iz * nx..(iz + 1) * nx;
            let (xr, o) = (&x[row.clone()], &mut out[row.clone()]);
            for ((o, d), xv) in o.iter_mut().zip(&self.d[row.clone()]).zip(xr) {
                *o = d * xv;
            }
            let g = &self.gx[iz * (nx - 1)..(iz + 1) * (nx - 1)];
            // Face ix between cells ix and ix + 1.
            for ix in 0..nx - 1 {
                o[ix] += g[ix] * (xr[ix] - xr[ix + 1]);
            }
            for ix in 1..nx {
                o[ix] += g[ix - 1] * (xr[ix] - xr[ix - 1]);
            }
            if iz > 0 {
                let up = &x[row.start - nx..row.start];
                let gu = &self.gz[row.start - nx..row.start];
                for (((o, g), xv), u) in o.iter_mut().zip(gu).zip(xr).zip(up) {
                    *o += g * (xv - u);
                }
            }
            if iz + 1 < nz {
                let down = &x[row.end..row.end + nx];
                let gd = &self.gz[row.clone()];
                for (((o, g), xv), dn) in o.iter_mut().zip(gd).zip(xr).zip(down) {
                    *o += g * (xv - dn);
                }
            }
        }
    }

    /// `out = K·x`.
    #[cfg_attr(not(test), allow(dead_code))]
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
    /// ADI when no cell can freeze (every material linear), Iterative otherwise:
    /// the ADI scheme passes every check without freezing, but as the linear
    /// solver of the freezing iteration it is a stationary iteration whose
    /// splitting term is indefinite where the apparent capacity jumps between
    /// neighbouring cells, and over a freezing year it diverges.
    Auto,
    /// Sparse Cholesky, exact: the accuracy reference.
    Direct,
    /// Douglas–Gunn alternating-direction implicit, O(cells) per step.
    Adi,
    /// Conjugate gradients with an incomplete Cholesky preconditioner, iterated
    /// to a relative residual of 1e-10: the direct solver's result at O(cells)
    /// per iteration, stable with freezing next to pipes.
    Iterative,
}

/// Applies an (approximate) inverse of `K`.
pub(crate) trait CellSolver {
    /// Prepares for new coefficients (the numeric factorisation of the direct solver).
    fn prepare(&mut self, k: &Coefficients) -> Result<(), String>;
    /// `out ≈ K⁻¹·r`, linear in `r`.
    fn apply(&mut self, k: &Coefficients, r: &[f64], out: &mut [f64]);
    /// `out ≈ K⁻¹·r` starting from the guess in `out` (iterative solvers); the
    /// others ignore the guess.
    fn apply_from(&mut self, k: &Coefficients, r: &[f64], out: &mut [f64]) {
        self.apply(k, r, out);
    }
    /// Whether [`Self::apply_from`] uses the guess.
    fn uses_guess(&self) -> bool {
        false
    }
    /// Numeric factorisations so far.
    fn factorisations(&self) -> usize {
        0
    }
    /// Iterations of an iterative solver so far (0 for the others).
    fn iterations(&self) -> usize {
        0
    }
    /// Whether the solver takes pipe-wall nodes eliminated into the system
    /// ([`Coefficients::nodes`]) instead of wall responses computed by the caller.
    fn eliminates_walls(&self) -> bool {
        false
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

/// Rows swept together in the x direction: independent Thomas recurrences are
/// interleaved so that their latencies overlap.
const ROW_BLOCK: usize = 8;

/// Douglas–Gunn ADI in delta form (see the module documentation). The Thomas
/// factorisations of both sweeps depend only on the coefficients, so they are
/// computed in [`CellSolver::prepare`] and each application is four
/// multiply-add passes over the cells.
pub(crate) struct AdiSolver {
    nx: usize,
    nz: usize,
    /// x sweep: `half[c] = r[c]·xa[c] + xb[c]·half[c − 1]`, then
    /// `half[c] −= xc[c]·half[c + 1]`.
    xa: Vec<f64>,
    xb: Vec<f64>,
    xc: Vec<f64>,
    /// z sweep: `out[c] = half[c]·za[c] + zb[c]·out[c − nx]`, then
    /// `out[c] −= zc[c]·out[c + nx]` (`za` includes the factor D of `D·δ₁`).
    za: Vec<f64>,
    zb: Vec<f64>,
    zc: Vec<f64>,
    half: Vec<f64>,
    /// `m + d` and `gx` the x factors were computed from.
    diagonal: Vec<f64>,
    gx: Vec<f64>,
    factored: bool,
    zero_row: Vec<f64>,
}

impl AdiSolver {
    pub fn new(nx: usize, nz: usize) -> Self {
        let n = nx * nz;
        Self {
            nx,
            nz,
            xa: vec![0.0; n],
            xb: vec![0.0; n],
            xc: vec![0.0; n],
            za: vec![0.0; n],
            zb: vec![0.0; n],
            zc: vec![0.0; n],
            half: vec![0.0; n],
            diagonal: vec![0.0; n],
            gx: vec![0.0; nz * (nx - 1)],
            factored: false,
            zero_row: vec![0.0; nx],
        }
    }

    /// `out ≈ K⁻¹·r` with the stored factors.
    fn solve(&mut self, r: &[f64], out: &mut [f64]) {
        let (nx, nz) = (self.nx, self.nz);
        let (xa, xb, xc) = (&self.xa, &self.xb, &self.xc);
        let half = &mut self.half;
        // x sweep: (D + A_x)·δ₁ = r, ROW_BLOCK rows at a time.
        for first in (0..nz).step_by(ROW_BLOCK) {
            let rows = ROW_BLOCK.min(nz - first);
            for j in 0..rows {
                let c = (first + j) * nx;
                half[c] = r[c] * xa[c];
            }
            for ix in 1..nx {
                for j in 0..rows {
                    let c = (first + j) * nx + ix;
                    half[c] = r[c] * xa[c] + xb[c] * half[c - 1];
                }
            }
            for ix in (0..nx - 1).rev() {
                for j in 0..rows {
                    let c = (first + j) * nx + ix;
                    half[c] -= xc[c] * half[c + 1];
                }
            }
        }
        // z sweep: (D + A_z)·δ = D·δ₁, all columns of a row at once (vectorisable).
        let (za, zb, zc) = (&self.za, &self.zb, &self.zc);
        for ix in 0..nx {
            out[ix] = half[ix] * za[ix];
        }
        for iz in 1..nz {
            let (done, rest) = out.split_at_mut(iz * nx);
            let above = &done[(iz - 1) * nx..];
            let row = iz * nx..(iz + 1) * nx;
            for (((o, h), (a, b)), up) in rest[..nx]
                .iter_mut()
                .zip(&half[row.clone()])
                .zip(za[row.clone()].iter().zip(&zb[row]))
                .zip(above)
            {
                *o = h * a + b * up;
            }
        }
        for iz in (0..nz - 1).rev() {
            let (head, below) = out.split_at_mut((iz + 1) * nx);
            let row = iz * nx..(iz + 1) * nx;
            for ((o, c), b) in head[row.clone()].iter_mut().zip(&zc[row]).zip(&below[..nx]) {
                *o -= c * b;
            }
        }
    }
}

impl CellSolver for AdiSolver {
    fn prepare(&mut self, k: &Coefficients) -> Result<(), String> {
        let (nx, nz) = (self.nx, self.nz);
        // x sweep factors of the rows whose coefficients changed since the last
        // prepare (a freezing front changes a few rows only).
        for iz in 0..nz {
            let row = iz * nx..(iz + 1) * nx;
            let faces = iz * (nx - 1)..(iz + 1) * (nx - 1);
            let same = self.factored
                && self.diagonal[row.clone()]
                    .iter()
                    .zip(k.m[row.clone()].iter().zip(&k.d[row.clone()]))
                    .all(|(s, (m, d))| *s == m + d)
                && self.gx[faces.clone()] == k.gx[faces.clone()];
            if same {
                continue;
            }
            for c in row.clone() {
                self.diagonal[c] = k.m[c] + k.d[c];
            }
            self.gx[faces.clone()].copy_from_slice(&k.gx[faces]);
            let g = &k.gx[iz * (nx - 1)..(iz + 1) * (nx - 1)];
            let mut west = 0.0;
            let mut prev_c = 0.0;
            for ix in 0..nx {
                let c = iz * nx + ix;
                let east = if ix + 1 < nx { g[ix] } else { 0.0 };
                let inv = 1.0 / (self.diagonal[c] + west + east + west * prev_c);
                self.xa[c] = inv;
                self.xb[c] = west * inv;
                self.xc[c] = -east * inv;
                prev_c = self.xc[c];
                west = east;
            }
        }
        self.factored = true;
        // z sweep factors, all columns of a row at once (vectorisable).
        for iz in 0..nz {
            let row = iz * nx..(iz + 1) * nx;
            let (done_c, rest_c) = self.zc.split_at_mut(row.start);
            let zc_row = &mut rest_c[..nx];
            let za_row = &mut self.za[row.clone()];
            let zb_row = &mut self.zb[row.clone()];
            let diag = &self.diagonal[row.clone()];
            let down: &[f64] = if iz + 1 < nz {
                &k.gz[row.clone()]
            } else {
                &self.zero_row
            };
            if iz == 0 {
                for ix in 0..nx {
                    let inv = 1.0 / (diag[ix] + down[ix]);
                    za_row[ix] = diag[ix] * inv;
                    zb_row[ix] = 0.0;
                    zc_row[ix] = -down[ix] * inv;
                }
            } else {
                let up = &k.gz[row.start - nx..row.start];
                let prev = &done_c[row.start - nx..];
                for ix in 0..nx {
                    let inv = 1.0 / (diag[ix] + up[ix] + down[ix] + up[ix] * prev[ix]);
                    za_row[ix] = diag[ix] * inv;
                    zb_row[ix] = up[ix] * inv;
                    zc_row[ix] = -down[ix] * inv;
                }
            }
        }
        Ok(())
    }

    fn apply(&mut self, _k: &Coefficients, r: &[f64], out: &mut [f64]) {
        self.solve(r, out);
    }
}

/// Preconditioned conjugate gradients on `K·x = r` with a diagonal incomplete
/// Cholesky preconditioner `P = (Q + L)·Q⁻¹·(Q + Lᵀ)` (`L` the strictly lower part
/// of `K`, `Q` the pivots with `diag(P) = diag(K)`: the no-fill IC(0) of a 5-point
/// matrix; M. R. Hestenes & E. Stiefel, "Methods of conjugate gradients for solving
/// linear systems", J. Res. NBS 49 (1952) 409–436; J. A. Meijerink & H. A. van der
/// Vorst, "An iterative solution method for linear systems of which the
/// coefficient matrix is a symmetric M-matrix", Math. Comp. 31 (1977) 148–162).
///
/// The preconditioner is recomputed whenever the coefficients change (it costs
/// about one CG iteration). A stale one would be stale exactly at the cells that
/// just changed their piece of H(T), which is where the residual of a
/// freezing-iteration correction lives: in the benchmark such corrections took
/// about 20 iterations with the stale factor and 8 with a fresh one. Every solve
/// iterates until `‖r − K·x‖₂ ≤ tolerance·‖r‖₂`.
pub(crate) struct PcgSolver {
    nx: usize,
    nz: usize,
    /// `1/Q` per cell.
    inv_q: Vec<f64>,
    /// Forward sweep factor `g_west/Q` per cell and backward `g_east/Q`.
    west_q: Vec<f64>,
    east_q: Vec<f64>,
    /// `m + d` per cell (the diagonal without the faces) of the prepared coefficients.
    diagonal: Vec<f64>,
    /// Coefficients the factor was computed from (`m + d`, `gx`, `gz`), to refactor
    /// only from the first row that changed.
    factored_diagonal: Vec<f64>,
    factored_gx: Vec<f64>,
    factored_gz: Vec<f64>,
    factored: bool,
    /// Pivots to recompute in a local update, and the changed cells found.
    marked: Vec<bool>,
    marked_cells: Vec<usize>,
    seeds: Vec<usize>,
    /// Local updates of the factor (windows around changed cells).
    local_updates: usize,
    /// A row of zeros (the missing neighbour row at the top and bottom).
    zero_row: Vec<f64>,
    /// `Σ K·1` of the prepared coefficients.
    weight: f64,
    tolerance: f64,
    residual: Vec<f64>,
    z: Vec<f64>,
    p: Vec<f64>,
    q: Vec<f64>,
    /// CG iterations of all solves so far.
    pub iterations: usize,
    factorisations: usize,
}

impl PcgSolver {
    /// Share of the dropped fill-in added back to the pivots (0: IC(0), 1: MIC(0)).
    const MODIFIED: f64 = 0.99;
    /// Rows and columns downstream of a changed entry whose pivots a local update
    /// recomputes.
    const WINDOW: usize = 4;

    pub fn new(nx: usize, nz: usize, tolerance: f64) -> Self {
        let n = nx * nz;
        Self {
            nx,
            nz,
            inv_q: vec![0.0; n],
            west_q: vec![0.0; n],
            east_q: vec![0.0; n],
            diagonal: vec![0.0; n],
            factored_diagonal: vec![f64::NAN; n],
            factored_gx: vec![f64::NAN; nz * (nx - 1)],
            factored_gz: vec![f64::NAN; (nz - 1) * nx],
            factored: false,
            marked: vec![false; n],
            marked_cells: Vec::new(),
            seeds: Vec::new(),
            local_updates: 0,
            zero_row: vec![0.0; nx],
            weight: 1.0,
            tolerance,
            residual: vec![0.0; n],
            z: vec![0.0; n],
            p: vec![0.0; n],
            q: vec![0.0; n],
            iterations: 0,
            factorisations: 0,
        }
    }

    /// Where the coefficients differ from those of the last factor: marks the
    /// pivots that depend on them directly and their downstream window
    /// ([`Self::WINDOW`] rows and columns) in `self.marked`, and records the new
    /// values. Returns how many entries changed (`usize::MAX` before the first factor).
    fn mark_changes(&mut self, k: &Coefficients) -> usize {
        let (nx, nz) = (self.nx, self.nz);
        if !self.factored {
            self.factored_diagonal.copy_from_slice(&self.diagonal);
            self.factored_gx.copy_from_slice(&k.gx);
            self.factored_gz.copy_from_slice(&k.gz);
            self.factored = true;
            return usize::MAX;
        }
        self.marked_cells.clear();
        let mut seeds = std::mem::take(&mut self.seeds);
        seeds.clear();
        for (c, (new, old)) in self
            .diagonal
            .iter()
            .zip(self.factored_diagonal.iter_mut())
            .enumerate()
        {
            if new != old {
                *old = *new;
                seeds.push(c);
            }
        }
        for (f, (new, old)) in k.gx.iter().zip(self.factored_gx.iter_mut()).enumerate() {
            if new != old {
                *old = *new;
                let c = (f / (nx - 1)) * nx + f % (nx - 1);
                seeds.extend([c, c + 1]);
            }
        }
        for (f, (new, old)) in k.gz.iter().zip(self.factored_gz.iter_mut()).enumerate() {
            if new != old {
                *old = *new;
                seeds.extend([f, f + nx]);
            }
        }
        let changed = seeds.len();
        if changed < nx * nz / 8 {
            for &c in &seeds {
                let (ix, iz) = (c % nx, c / nx);
                // A changed entry of cell c enters the pivots of c, its east and south
                // neighbours and (through the fill) the south-west one.
                for jz in iz..(iz + Self::WINDOW).min(nz) {
                    for jx in ix.saturating_sub(1)..(ix + Self::WINDOW).min(nx) {
                        let j = jz * nx + jx;
                        if !self.marked[j] {
                            self.marked[j] = true;
                            self.marked_cells.push(j);
                        }
                    }
                }
            }
        }
        self.seeds = seeds;
        changed
    }

    /// The IC pivot of cell `c` from `K` and the pivots of its west and north
    /// neighbours; stores `1/Q` and the sweep factors.
    fn pivot(&mut self, k: &Coefficients, c: usize) {
        let (nx, nz) = (self.nx, self.nz);
        let (ix, iz) = (c % nx, c / nx);
        let west = if ix > 0 { k.gx[iz * (nx - 1) + ix - 1] } else { 0.0 };
        let east = if ix + 1 < nx {
            k.gx[iz * (nx - 1) + ix]
        } else {
            0.0
        };
        let north = if iz > 0 { k.gz[c - nx] } else { 0.0 };
        let south = if iz + 1 < nz { k.gz[c] } else { 0.0 };
        let mut q = self.diagonal[c] + west + east + north + south;
        // Modified IC: the dropped fill of the west and north pivots is
        // moved to the diagonal (weight MODIFIED), keeping row sums.
        if ix > 0 {
            let fill = if iz + 1 < nz { k.gz[c - 1] } else { 0.0 };
            q -= west * (west + Self::MODIFIED * fill) * self.inv_q[c - 1];
        }
        if iz > 0 {
            let fill = if ix + 1 < nx {
                k.gx[(iz - 1) * (nx - 1) + ix]
            } else {
                0.0
            };
            q -= north * (north + Self::MODIFIED * fill) * self.inv_q[c - nx];
        }
        let inv = 1.0 / q;
        self.inv_q[c] = inv;
        self.west_q[c] = west * inv;
        self.east_q[c] = east * inv;
    }

    /// IC(0) pivots: `Q_c = K_cc − g_w²/Q_west − g_n²/Q_north`. When only a few
    /// entries changed (a freezing front moves through a few cells a step), only
    /// the pivots in a window downstream of each change are recomputed: a change
    /// of a pivot reaches the next one damped by about `(g/Q)²`, so the window
    /// holds the exact new pivots to about 1e-3 and the preconditioner is fresh
    /// where the coefficients changed (any SPD preconditioner leaves CG exact).
    /// Otherwise every pivot is recomputed.
    fn factor(&mut self, k: &Coefficients) {
        let (nx, nz) = (self.nx, self.nz);
        for ((d, m), dd) in self.diagonal.iter_mut().zip(&k.m).zip(&k.d) {
            *d = m + dd;
        }
        let changed = self.mark_changes(k);
        if changed == 0 {
            return;
        }
        if self.marked_cells.is_empty() || self.marked_cells.len() > nx * nz / 2 {
            for &c in &self.marked_cells {
                self.marked[c] = false;
            }
            self.marked_cells.clear();
            for c in 0..nx * nz {
                self.pivot(k, c);
            }
            self.factorisations += 1;
        } else {
            let mut cells = std::mem::take(&mut self.marked_cells);
            cells.sort_unstable();
            for &c in &cells {
                self.pivot(k, c);
                self.marked[c] = false;
            }
            cells.clear();
            self.marked_cells = cells;
            self.local_updates += 1;
        }
    }

    /// `z = P⁻¹·residual`; returns `residual·z`.
    fn precondition(&mut self, k: &Coefficients) -> f64 {
        let (nx, nz) = (self.nx, self.nz);
        let (r, out) = (&self.residual, &mut self.z);
        // (Q + L)·y = r, row by row: the north term for a whole row first.
        for iz in 0..nz {
            let row = iz * nx..(iz + 1) * nx;
            if iz == 0 {
                for c in row.clone() {
                    out[c] = r[c] * self.inv_q[c];
                }
            } else {
                let (done, rest) = out.split_at_mut(row.start);
                let above = &done[row.start - nx..];
                let north = &k.gz[row.start - nx..row.start];
                for (((o, r), (g, up)), iq) in rest[..nx]
                    .iter_mut()
                    .zip(&r[row.clone()])
                    .zip(north.iter().zip(above))
                    .zip(&self.inv_q[row.clone()])
                {
                    *o = (r + g * up) * iq;
                }
            }
            let o = &mut out[row.clone()];
            let w = &self.west_q[row];
            let mut carry = o[0];
            for (o, w) in o[1..].iter_mut().zip(&w[1..]) {
                carry = *o + w * carry;
                *o = carry;
            }
        }
        // (Q + Lᵀ)·x = Q·y: x = y + Q⁻¹·(g_e·x_east + g_s·x_south).
        let mut rz = 0.0;
        for iz in (0..nz).rev() {
            let row = iz * nx..(iz + 1) * nx;
            if iz + 1 < nz {
                let (head, below) = out.split_at_mut(row.end);
                let south = &k.gz[row.clone()];
                for (((o, g), dn), iq) in head[row.clone()]
                    .iter_mut()
                    .zip(south)
                    .zip(&below[..nx])
                    .zip(&self.inv_q[row.clone()])
                {
                    *o += g * dn * iq;
                }
            }
            let o = &mut out[row.clone()];
            let e = &self.east_q[row.clone()];
            let mut carry = o[nx - 1];
            for (o, e) in o[..nx - 1].iter_mut().zip(&e[..nx - 1]).rev() {
                carry = *o + e * carry;
                *o = carry;
            }
            rz += dot(&r[row], o);
        }
        rz
    }

    /// `out = K·x` in one pass over the cells (the diagonal `m + d` prepared),
    /// returning `x·K·x`.
    fn multiply(&self, k: &Coefficients, x: &[f64], out: &mut [f64]) -> f64 {
        let (nx, nz) = (self.nx, self.nz);
        let mut xkx = 0.0;
        for iz in 0..nz {
            let row = iz * nx..(iz + 1) * nx;
            let (up_x, up_g) = if iz > 0 {
                (&x[row.start - nx..row.start], &k.gz[row.start - nx..row.start])
            } else {
                (&x[row.clone()], &self.zero_row[..])
            };
            let (down_x, down_g) = if iz + 1 < nz {
                (&x[row.end..row.end + nx], &k.gz[row.clone()])
            } else {
                (&x[row.clone()], &self.zero_row[..])
            };
            stencil_row(
                &x[row.clone()],
                &self.diagonal[row.clone()],
                &k.gx[iz * (nx - 1)..(iz + 1) * (nx - 1)],
                (up_x, up_g),
                (down_x, down_g),
                &mut out[row.clone()],
            );
            xkx += dot(&x[row.clone()], &out[row]);
        }
        for node in &k.nodes {
            let s = node.link_sum(x) * node.inv_a;
            for &(c, g) in &node.links {
                out[c] -= g * s;
            }
            xkx -= s * s / node.inv_a;
        }
        xkx
    }
}

/// One row of the 5-point product: `o = diag·x + Σ g·(x − x_neighbour)` with the
/// x faces `gx` of the row (`nx − 1`) and the rows above and below with their
/// face conductances (zeros where there is none).
fn stencil_row(
    x: &[f64],
    diag: &[f64],
    gx: &[f64],
    (up_x, up_g): (&[f64], &[f64]),
    (down_x, down_g): (&[f64], &[f64]),
    o: &mut [f64],
) {
    let nx = x.len();
    let vertical = |i: usize| up_g[i] * (x[i] - up_x[i]) + down_g[i] * (x[i] - down_x[i]);
    if nx == 1 {
        o[0] = diag[0] * x[0] + vertical(0);
        return;
    }
    o[0] = diag[0] * x[0] + gx[0] * (x[0] - x[1]) + vertical(0);
    let last = nx - 1;
    o[last] = diag[last] * x[last] + gx[last - 1] * (x[last] - x[last - 1]) + vertical(last);
    // Interior cells: equal-length slices so that the loop has no bounds checks.
    let n = nx - 2;
    let (xc, xw, xe) = (&x[1..1 + n], &x[..n], &x[2..2 + n]);
    let (gw, ge) = (&gx[..n], &gx[1..1 + n]);
    let (ux, ug, dx, dg) = (
        &up_x[1..1 + n],
        &up_g[1..1 + n],
        &down_x[1..1 + n],
        &down_g[1..1 + n],
    );
    let (dc, oc) = (&diag[1..1 + n], &mut o[1..1 + n]);
    for i in 0..n {
        let v = xc[i];
        oc[i] =
            dc[i] * v + gw[i] * (v - xw[i]) + ge[i] * (v - xe[i]) + ug[i] * (v - ux[i]) + dg[i] * (v - dx[i]);
    }
}

/// `a·b` with four partial sums (so that the loop vectorises).
fn dot(a: &[f64], b: &[f64]) -> f64 {
    let n = a.len().min(b.len());
    let (a, b) = (&a[..n], &b[..n]);
    let mut acc = [0.0; 4];
    let (a4, b4) = (a.chunks_exact(4), b.chunks_exact(4));
    let (ra, rb) = (a4.remainder(), b4.remainder());
    for (x, y) in a4.zip(b4) {
        for j in 0..4 {
            acc[j] += x[j] * y[j];
        }
    }
    let tail: f64 = ra.iter().zip(rb).map(|(x, y)| x * y).sum();
    (acc[0] + acc[1]) + (acc[2] + acc[3]) + tail
}

/// `x += α·p`, `r −= α·q`; returns `r·r` (four partial sums).
fn update_and_norm(alpha: f64, x: &mut [f64], r: &mut [f64], p: &[f64], q: &[f64]) -> f64 {
    let n = x.len();
    let (r, p, q) = (&mut r[..n], &p[..n], &q[..n]);
    for i in 0..n {
        x[i] += alpha * p[i];
    }
    for i in 0..n {
        r[i] -= alpha * q[i];
    }
    dot(r, r)
}

impl CellSolver for PcgSolver {
    fn prepare(&mut self, k: &Coefficients) -> Result<(), String> {
        self.factor(k);
        self.weight = k.total_weight();
        Ok(())
    }

    fn factorisations(&self) -> usize {
        self.factorisations_done()
    }

    fn uses_guess(&self) -> bool {
        true
    }

    fn iterations(&self) -> usize {
        self.iterations
    }

    fn eliminates_walls(&self) -> bool {
        true
    }

    fn apply(&mut self, k: &Coefficients, r: &[f64], out: &mut [f64]) {
        out.iter_mut().for_each(|x| *x = 0.0);
        self.apply_from(k, r, out);
    }

    fn apply_from(&mut self, k: &Coefficients, r: &[f64], out: &mut [f64]) {
        let target = self.tolerance * dot(r, r).sqrt();
        if target == 0.0 {
            out.iter_mut().for_each(|x| *x = 0.0);
            return;
        }
        let mut residual = std::mem::take(&mut self.residual);
        self.multiply(k, out, &mut residual);
        self.residual = residual;
        for (res, r) in self.residual.iter_mut().zip(r) {
            *res = r - *res;
        }
        if dot(&self.residual, &self.residual).sqrt() > target {
            self.iterate(k, out, target);
        }
        // Global balance: Σ K·1 = Σ (m + d) − Σ g²/a over the domain's cells (the
        // faces cancel), so a uniform shift γ = Σ residual / Σ K·1 of the domain's
        // cells makes their residual sum to zero exactly and the step conserves
        // energy to round-off whatever the tolerance.
        let left: f64 = (self.residual.iter().zip(&k.active))
            .filter(|(_, a)| **a)
            .map(|(r, _)| r)
            .sum();
        let shift = left / self.weight;
        for (x, a) in out.iter_mut().zip(&k.active) {
            if *a {
                *x += shift;
            }
        }
    }
}

impl PcgSolver {
    /// CG iterations from `out` (residual in `self.residual`) until `‖residual‖₂ ≤ target`.
    fn iterate(&mut self, k: &Coefficients, out: &mut [f64], target: f64) {
        let mut rz = self.precondition(k);
        self.p.copy_from_slice(&self.z);
        let limit = 20 * (self.nx + self.nz);
        let mut used = 0;
        let (mut p, mut q) = (std::mem::take(&mut self.p), std::mem::take(&mut self.q));
        for _ in 0..limit {
            used += 1;
            let pkp = self.multiply(k, &p, &mut q);
            let alpha = rz / pkp;
            let norm2 = update_and_norm(alpha, out, &mut self.residual, &p, &q);
            if norm2.sqrt() <= target {
                break;
            }
            let rz_new = self.precondition(k);
            let beta = rz_new / rz;
            rz = rz_new;
            for (p, z) in p.iter_mut().zip(&self.z) {
                *p = z + beta * *p;
            }
        }
        (self.p, self.q) = (p, q);
        self.iterations += used;
    }
}

impl PcgSolver {
    /// Preconditioner set-ups: full factors and local updates.
    fn factorisations_done(&self) -> usize {
        self.factorisations + self.local_updates
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
        solver.prepare(&k).unwrap();
        let mut y = vec![0.0; nx * nz];
        solver.apply(&k, &r, &mut y);
        for (a, b) in x.iter().zip(&y) {
            assert!((a - b).abs() < 1e-12, "{a} {b}");
        }
    }

    #[test]
    fn preconditioned_cg_after_a_local_preconditioner_update_matches_cholesky() {
        // Reference: the sparse Cholesky solution of the same system (faer), to
        // 1e-8 K. The coefficients of a few cells change as a freezing front's do
        // (capacity ×40, conductivity of their faces), so the preconditioner is
        // updated only in windows downstream of them, then a larger change makes it
        // refactor fully; CG must solve each system to the Cholesky answer.
        let (nx, nz) = (40, 30);
        let mut k = sample(nx, nz);
        let r: Vec<f64> = (0..nx * nz).map(|i| (i as f64 * 0.37).sin() * 10.0).collect();
        let mut pcg = PcgSolver::new(nx, nz, 1e-13);
        let mut direct = DirectSolver::new(nx, nz).unwrap();
        let check = |k: &Coefficients, pcg: &mut PcgSolver, direct: &mut DirectSolver| {
            direct.prepare(k).unwrap();
            pcg.prepare(k).unwrap();
            let (mut x, mut y) = (vec![0.0; nx * nz], vec![0.0; nx * nz]);
            direct.apply(k, &r, &mut x);
            pcg.apply(k, &r, &mut y);
            let worst = x.iter().zip(&y).map(|(a, b)| (a - b).abs()).fold(0.0, f64::max);
            assert!(worst < 1e-8, "CG differs from Cholesky by {worst} K");
        };
        check(&k, &mut pcg, &mut direct);
        for &c in &[5 * nx + 7, 5 * nx + 8, 17 * nx + 30] {
            k.m[c] *= 40.0;
            let (ix, iz) = (c % nx, c / nx);
            k.gx[iz * (nx - 1) + ix] *= 1.3;
            k.gz[c] *= 0.7;
        }
        check(&k, &mut pcg, &mut direct);
        assert_eq!((pcg.factorisations, pcg.local_updates), (1, 1));
        for m in k.m.iter_mut() {
            *m *= 0.5;
        }
        check(&k, &mut pcg, &mut direct);
        assert_eq!((pcg.factorisations, pcg.local_updates), (2, 1));
    }

    #[test]
    fn preconditioned_cg_with_a_wall_node_matches_the_augmented_direct_solve() {
        // K_eff = K − g·gᵀ/a against the Cholesky solve of the system with the wall
        // node as one more unknown, eliminated by hand: x = K⁻¹(r + g·T_w) with
        // T_w = (gᵀx + b)/a, i.e. T_w = (gᵀK⁻¹r + b)/(a − gᵀK⁻¹g).
        let (nx, nz) = (9, 7);
        let mut k = sample(nx, nz);
        let links = vec![(31, 0.7), (32, 0.4), (40, 0.9)];
        let (a, b) = (2.0 + 2.0, 3.0);
        let mut direct = DirectSolver::new(nx, nz).unwrap();
        // The node's link conductances sit on the diagonal of K.
        for &(c, g) in &links {
            k.d[c] += g;
        }
        direct.prepare(&k).unwrap();
        let r: Vec<f64> = (0..nx * nz).map(|i| (i as f64 * 0.61).cos()).collect();
        let mut kr = vec![0.0; nx * nz];
        direct.apply(&k, &r, &mut kr);
        let mut g = vec![0.0; nx * nz];
        for &(c, v) in &links {
            g[c] = v;
        }
        let mut kg = vec![0.0; nx * nz];
        direct.apply(&k, &g, &mut kg);
        let t_w = (dot(&g, &kr) + b) / (a - dot(&g, &kg));
        let expected: Vec<f64> = kr.iter().zip(&kg).map(|(x, y)| x + t_w * y).collect();

        k.nodes = vec![WallNode {
            links,
            inv_a: 1.0 / a,
        }];
        let rhs: Vec<f64> = r.iter().zip(&g).map(|(r, g)| r + g * b / a).collect();
        let mut pcg = PcgSolver::new(nx, nz, 1e-12);
        pcg.prepare(&k).unwrap();
        let mut x = vec![0.0; nx * nz];
        pcg.apply(&k, &rhs, &mut x);
        for (e, x) in expected.iter().zip(&x) {
            assert!((e - x).abs() < 1e-9, "{e} {x}");
        }
    }
}
