//! Spatial and temporal superposition of the segment responses.
//!
//! Spatial: the mean temperature on segment p of representative borehole I caused by segment
//! heat rates `Q'_{J,q}` (W/m, the same on every borehole of class J) is
//! `Σ_J Σ_q H_IJ[p,q]·Q'_{J,q}` with `H_IJ[p,q] = Σ_d m_IJ(d)·h(d, pair(p,q))` (see `layout`).
//!
//! Temporal (uniform wall temperature): the variant of Cimmino & Bernier (2014) with segment
//! heat rates constant over each interval `(t_{k−1}, t_k]` of the requested times (t_0 = 0),
//! superposed exactly: at `t_k`
//!
//! ```text
//! T_b(t_k)·1 = Σ_{k'=1..k} H(t_k − t_{k'−1})·(Q'_{k'} − Q'_{k'−1}),   Q'_0 = 0
//! Σ_J n_J L_J Σ_q Q'_{J,q,k} = Σ_J n_J H_J            (mean heat rate 1 per metre)
//! ```
//!
//! with the response evaluated (not interpolated) at every difference `t_k − t_{k'−1}`. Step k
//! solves for `Q'_k` and the common wall temperature `T_b(t_k)`, which is the g-function
//! (temperatures in units of `q'/(2πk)`).

use super::dense::StepSolver;
use super::layout::Layout;
use super::response::ResponseTable;
use rayon::prelude::*;

/// The reduced response operator at one time: `Σ_d m_IJ(d)·h(d, key)` per class pair and local
/// segment-pair key, expanded on the fly.
struct Operator<'a> {
    layout: &'a Layout,
    table: &'a [f64],
    keys: usize,
    reach: usize,
}

impl<'a> Operator<'a> {
    fn new(layout: &'a Layout, table: &'a ResponseTable, m: usize) -> Self {
        Self {
            layout,
            table: table.at(m),
            keys: table.keys(),
            reach: table.reach(m),
        }
    }

    /// Fills `buffer` with `Σ_d m_IJ(d)·h(d, key)` for the local keys of class pair (I, J).
    /// Returns false when every response of the pair is negligible (the buffer is then zero).
    fn compress(&self, receiver: usize, source: usize, buffer: &mut Vec<f64>) -> bool {
        let pair = self.layout.pair_table(receiver, source);
        buffer.clear();
        buffer.resize(pair.keys.len(), 0.0);
        let nk = self.keys;
        // Occurrences are sorted by distance: stop where the responses become negligible.
        for occ in self.layout.block(receiver, source) {
            if occ.distance >= self.reach {
                break;
            }
            let row = &self.table[occ.distance * nk..(occ.distance + 1) * nk];
            if pair.identity {
                for (b, r) in buffer.iter_mut().zip(row) {
                    *b += occ.count * r;
                }
            } else {
                for (b, &key) in buffer.iter_mut().zip(&pair.keys) {
                    *b += occ.count * row[key];
                }
            }
        }
        self.layout
            .block(receiver, source)
            .first()
            .is_some_and(|occ| occ.distance < self.reach)
    }

    /// Rows of H for receiver class I, written into `rows` (segments × `width`, row-major, the
    /// first `unknowns` columns).
    fn rows_of(&self, receiver: usize, rows: &mut [f64], width: usize, buffer: &mut Vec<f64>) {
        let s = self.layout.segments;
        for j in 0..self.layout.classes() {
            self.compress(receiver, j, buffer);
            let pair = self.layout.pair_table(receiver, j);
            for p in 0..s {
                let row = &mut rows[p * width + j * s..p * width + (j + 1) * s];
                let (real, image) = (&pair.real[p * s..(p + 1) * s], &pair.image[p * s..(p + 1) * s]);
                for ((out, &r), &i) in row.iter_mut().zip(real).zip(image) {
                    *out = buffer[r as usize] + buffer[i as usize];
                }
            }
        }
    }

    /// `y += H·x` over all segments of the reduced field (receiver classes in parallel).
    fn apply_add(&self, x: &[f64], y: &mut [f64]) {
        let s = self.layout.segments;
        let nc = self.layout.classes();
        let reversed: Vec<f64> = x.chunks_exact(s).flat_map(|c| c.iter().rev().copied()).collect();
        y.par_chunks_mut(s).enumerate().for_each_init(
            || (Vec::new(), vec![0.0; 2 * s - 1], vec![0.0; 2 * s - 1]),
            |(buffer, toeplitz, hankel), (i, yi)| {
                for j in 0..nc {
                    if !self.compress(i, j, buffer) {
                        continue;
                    }
                    let pair = self.layout.pair_table(i, j);
                    let xj = &x[j * s..(j + 1) * s];
                    if let Some((t_keys, h_keys)) = &pair.structured {
                        // y_p = Σ_q T[p − q]·x_q + Σ_q G[p + q]·x_q as two contiguous dot products.
                        for (t, &k) in toeplitz.iter_mut().zip(t_keys) {
                            *t = buffer[k as usize];
                        }
                        for (h, &k) in hankel.iter_mut().zip(h_keys) {
                            *h = buffer[k as usize];
                        }
                        // Column by column (an axpy over p), which vectorises without
                        // reassociating sums.
                        let xr = &reversed[j * s..(j + 1) * s];
                        for (q, (&a, &b)) in xr.iter().zip(xj).enumerate() {
                            let (t, h) = (&toeplitz[q..q + s], &hankel[q..q + s]);
                            for ((out, tp), hp) in yi.iter_mut().zip(t).zip(h) {
                                *out += a * tp + b * hp;
                            }
                        }
                    } else {
                        for (p, out) in yi.iter_mut().enumerate() {
                            let (real, image) =
                                (&pair.real[p * s..(p + 1) * s], &pair.image[p * s..(p + 1) * s]);
                            let mut sum = 0.0;
                            for ((xq, &r), &im) in xj.iter().zip(real).zip(image) {
                                sum += (buffer[r as usize] + buffer[im as usize]) * xq;
                            }
                            *out += sum;
                        }
                    }
                }
            },
        );
    }

    /// Writes H into the leading n × n block of the row-major `matrix` of width `width`.
    fn expand(&self, matrix: &mut [f64], width: usize) {
        let s = self.layout.segments;
        let n = self.layout.unknowns();
        matrix[..n * width]
            .par_chunks_mut(s * width)
            .enumerate()
            .for_each_init(Vec::new, |buffer, (i, rows)| self.rows_of(i, rows, width, buffer));
    }
}

/// Uniform heat flux: every borehole carries q' = 1 along its length; g is the length-weighted
/// mean borehole-wall temperature (Eskilson 1987's mean-temperature definition; Claesson & Javed
/// 2011 for one borehole). `layout` must have one segment.
pub(crate) fn uniform_heat_flux(layout: &Layout, table: &ResponseTable, times: usize) -> Vec<f64> {
    let nc = layout.classes();
    let ones = vec![1.0; nc];
    let total = layout.total_length_m();
    (0..times)
        .map(|m| {
            let op = Operator::new(layout, table, m);
            let mut t = vec![0.0; nc];
            op.apply_add(&ones, &mut t);
            t.iter()
                .enumerate()
                .map(|(i, ti)| {
                    layout.class_size[i] as f64 * layout.verticals[layout.class_vertical[i]].length_m * ti
                })
                .sum::<f64>()
                / total
        })
        .collect()
}

/// Where each response time `t_k − t_{k'−1}` sits in the sorted list of distinct differences.
pub(crate) struct Differences {
    pub taus_s: Vec<f64>,
    /// `index[k][k']` for 0 ≤ k' ≤ k: the difference `t_k − t_{k'−1}` (t_{−1} = 0).
    pub index: Vec<Vec<usize>>,
}

impl Differences {
    pub(crate) fn new(times_s: &[f64]) -> Self {
        let start = |k: usize| if k == 0 { 0.0 } else { times_s[k - 1] };
        let mut all: Vec<f64> = Vec::new();
        for (k, &t) in times_s.iter().enumerate() {
            all.extend((0..=k).map(|kp| t - start(kp)));
        }
        all.sort_by(f64::total_cmp);
        let mut taus: Vec<f64> = Vec::new();
        for tau in all {
            match taus.last() {
                Some(&last) if tau - last <= 1e-12 * tau => {}
                _ => taus.push(tau),
            }
        }
        let locate = |tau: f64| {
            taus.partition_point(|&x| x < tau * (1.0 - 1e-12))
                .min(taus.len() - 1)
        };
        let index = times_s
            .iter()
            .enumerate()
            .map(|(k, &t)| (0..=k).map(|kp| locate(t - start(kp))).collect())
            .collect();
        Self { taus_s: taus, index }
    }
}

/// Uniform borehole-wall temperature by the time stepping in the module documentation.
pub(crate) fn uniform_wall_temperature(
    layout: &Layout,
    table: &ResponseTable,
    differences: &Differences,
) -> Result<Vec<f64>, String> {
    let s = layout.segments;
    let n = layout.unknowns();
    let width = n + 1;
    let mut weights = vec![0.0; n];
    for i in 0..layout.classes() {
        let v = &layout.verticals[layout.class_vertical[i]];
        let segment = v.length_m / s as f64;
        weights[i * s..(i + 1) * s].fill(layout.class_size[i] as f64 * segment);
    }
    let total = layout.total_length_m();
    let mut solver = StepSolver::new();
    let mut matrix = vec![0.0; width * width];
    let mut previous = vec![0.0; n];
    let mut increments: Vec<Vec<f64>> = Vec::new();
    let mut g = Vec::with_capacity(differences.index.len());
    for (k, row) in differences.index.iter().enumerate() {
        let current = Operator::new(layout, table, row[k]);
        current.expand(&mut matrix, width);
        for i in 0..n {
            matrix[i * width + n] = -1.0;
        }
        matrix[n * width..n * width + n].copy_from_slice(&weights);
        matrix[n * width + n] = 0.0;
        let mut rhs = vec![0.0; width];
        for (i, r) in rhs.iter_mut().take(n).enumerate() {
            *r = matrix[i * width..i * width + n]
                .iter()
                .zip(&previous)
                .map(|(a, b)| a * b)
                .sum();
        }
        let mut history = vec![0.0; n];
        for (kp, increment) in increments.iter().enumerate() {
            Operator::new(layout, table, row[kp]).apply_add(increment, &mut history);
        }
        for (r, h) in rhs.iter_mut().zip(&history) {
            *r -= h;
        }
        rhs[n] = total;
        let x = solver.solve(&matrix, &rhs)?;
        let heat = &x[..n];
        increments.push(heat.iter().zip(&previous).map(|(a, b)| a - b).collect());
        previous.copy_from_slice(heat);
        g.push(x[n]);
    }
    Ok(g)
}
