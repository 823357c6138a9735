//! Graded one-dimensional cell axes; a 2-D rectilinear grid is the tensor product of
//! two of them (x or r across, z down).
//!
//! # Construction
//!
//! The wanted cell size at a coordinate `s` is
//! `h(s) = min(h_max, min over zones of (h_zone + (g − 1)·distance(s, zone)))`:
//! inside a refinement [`Zone`] cells are at most `h_zone`, and away from it they grow
//! linearly with distance, which is geometric growth by the ratio `g` from cell to
//! cell. Between consecutive required lines (domain ends, layer interfaces,
//! inclusion edges, faces around a pipe) the faces are placed at equal steps of the
//! stretched coordinate `σ(s) = ∫ ds/h(s)`, rounded up to a whole number of cells,
//! so every cell is about `h(s)` or smaller (a cell is at most the wanted size at
//! its smaller end times the growth ratio) and every required line is a face,
//! exactly.
//! Rounding can make a short interval's cells much smaller than their neighbours;
//! where two neighbours differ by more than `g` (with 5 % slack), the smaller cell
//! becomes a new zone and the axis is rebuilt, which bounds the ratio of adjacent
//! cells by about `g` everywhere.
//!
//! Invariants: faces strictly increase from `lo` to `hi`; every required line inside
//! `[lo, hi]` is a face (to round-off 1e-12 of the length); no cell exceeds `h_max`;
//! a cell inside a zone is at most `size·g`.

/// A refinement zone `[lo_m, hi_m]` (a point when equal) inside which cells are at
/// most `size_m`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Zone {
    /// Start of the zone, m.
    pub lo_m: f64,
    /// End of the zone, m.
    pub hi_m: f64,
    /// Largest cell inside the zone, m.
    pub size_m: f64,
}

/// How an axis grades its cells.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Grading {
    /// Largest cell anywhere, m.
    pub max_cell_m: f64,
    /// Largest ratio of neighbouring cell sizes (1 < g ≤ 1.5; 1.1–1.2 is usual).
    pub growth_ratio: f64,
}

/// Refuse axes with more cells than this.
const MAX_AXIS_CELLS: usize = 20_000;
/// Rebuild passes used to bound the neighbour ratio.
const RATIO_PASSES: usize = 30;

/// Cell faces, centres and widths along one coordinate, m.
#[derive(Debug, Clone, PartialEq)]
pub struct Axis {
    faces_m: Vec<f64>,
    centres_m: Vec<f64>,
    widths_m: Vec<f64>,
}

impl Axis {
    /// An axis from explicit faces (strictly increasing, at least two).
    pub fn from_faces(faces_m: Vec<f64>) -> Result<Self, String> {
        if faces_m.len() < 2 || faces_m.iter().any(|f| !f.is_finite()) {
            return Err("an axis needs at least two finite faces".into());
        }
        if faces_m.windows(2).any(|w| w[1] <= w[0]) {
            return Err("axis faces must increase strictly".into());
        }
        let centres_m = faces_m.windows(2).map(|w| 0.5 * (w[0] + w[1])).collect();
        let widths_m = faces_m.windows(2).map(|w| w[1] - w[0]).collect();
        Ok(Self {
            faces_m,
            centres_m,
            widths_m,
        })
    }

    /// A graded axis on `[lo_m, hi_m]` with faces on `required_m` (values outside
    /// the range are ignored) and cells refined in `zones` (see the module docs).
    pub fn graded(
        lo_m: f64,
        hi_m: f64,
        required_m: &[f64],
        zones: &[Zone],
        grading: Grading,
    ) -> Result<Self, String> {
        if !(lo_m.is_finite() && hi_m.is_finite() && hi_m > lo_m) {
            return Err(format!(
                "the axis range [{lo_m}, {hi_m}] m is empty or not finite"
            ));
        }
        if !(grading.max_cell_m.is_finite() && grading.max_cell_m > 0.0) {
            return Err(format!(
                "the largest cell is {} m; it must be a positive length",
                grading.max_cell_m
            ));
        }
        if !(grading.growth_ratio > 1.0 && grading.growth_ratio <= 1.5) {
            return Err(format!(
                "the growth ratio is {}; it must be above 1 and at most 1.5",
                grading.growth_ratio
            ));
        }
        for z in zones {
            if !(z.size_m.is_finite() && z.size_m > 0.0 && z.lo_m <= z.hi_m) {
                return Err(format!(
                    "a refinement zone [{}, {}] m with cell size {} m is invalid; the size must be positive",
                    z.lo_m, z.hi_m, z.size_m
                ));
            }
        }
        let span = hi_m - lo_m;
        let mut lines: Vec<f64> = required_m
            .iter()
            .copied()
            .filter(|&s| s.is_finite() && s > lo_m && s < hi_m)
            .collect();
        lines.push(lo_m);
        lines.push(hi_m);
        lines.sort_by(f64::total_cmp);
        lines.dedup_by(|a, b| (*a - *b).abs() <= 1e-12 * span);

        let mut zones = zones.to_vec();
        for _ in 0..RATIO_PASSES {
            let faces = place_faces(&lines, &zones, grading)?;
            let widths: Vec<f64> = faces.windows(2).map(|w| w[1] - w[0]).collect();
            let limit = grading.growth_ratio * 1.05;
            let mut added = false;
            for (i, pair) in widths.windows(2).enumerate() {
                let (small, large) = (pair[0].min(pair[1]), pair[0].max(pair[1]));
                if large > limit * small {
                    let at = faces[i + 1];
                    zones.push(Zone {
                        lo_m: at,
                        hi_m: at,
                        size_m: small,
                    });
                    added = true;
                }
            }
            if !added {
                return Self::from_faces(faces);
            }
        }
        Self::from_faces(place_faces(&lines, &zones, grading)?)
    }

    /// Number of cells.
    pub fn cells(&self) -> usize {
        self.widths_m.len()
    }

    /// Cell faces, m (one more than cells).
    pub fn faces_m(&self) -> &[f64] {
        &self.faces_m
    }

    /// Cell centres, m.
    pub fn centres_m(&self) -> &[f64] {
        &self.centres_m
    }

    /// Cell widths, m.
    pub fn widths_m(&self) -> &[f64] {
        &self.widths_m
    }

    /// Index of the cell containing `s_m` (clamped to the axis).
    pub fn cell_of(&self, s_m: f64) -> usize {
        let i = self.faces_m.partition_point(|&f| f <= s_m);
        i.clamp(1, self.cells()) - 1
    }

    /// Linear interpolation weights between cell centres: `(i, i + 1, w)` with
    /// the value `(1 − w)·v[i] + w·v[i + 1]`; clamped to the first and last centre.
    pub fn interpolation(&self, s_m: f64) -> (usize, usize, f64) {
        let c = &self.centres_m;
        let n = c.len();
        if n == 1 || s_m <= c[0] {
            return (0, 0, 0.0);
        }
        if s_m >= c[n - 1] {
            return (n - 1, n - 1, 0.0);
        }
        let hi = c.partition_point(|&x| x <= s_m).clamp(1, n - 1);
        let lo = hi - 1;
        (lo, hi, (s_m - c[lo]) / (c[hi] - c[lo]))
    }

    /// Largest ratio between neighbouring cell widths.
    pub fn max_neighbour_ratio(&self) -> f64 {
        self.widths_m
            .windows(2)
            .map(|w| w[0].max(w[1]) / w[0].min(w[1]))
            .fold(1.0, f64::max)
    }
}

/// Wanted cell size at `s`: the nearest zone's size grown linearly with distance.
fn wanted_size(s: f64, zones: &[Zone], grading: Grading) -> f64 {
    zones
        .iter()
        .map(|z| {
            let distance = (z.lo_m - s).max(s - z.hi_m).max(0.0);
            z.size_m + (grading.growth_ratio - 1.0) * distance
        })
        .fold(grading.max_cell_m, f64::min)
}

/// Faces between consecutive required lines at equal steps of σ(s) = ∫ ds/h(s).
fn place_faces(lines: &[f64], zones: &[Zone], grading: Grading) -> Result<Vec<f64>, String> {
    let smallest = zones.iter().map(|z| z.size_m).fold(grading.max_cell_m, f64::min);
    let mut faces = vec![lines[0]];
    for pair in lines.windows(2) {
        let (a, b) = (pair[0], pair[1]);
        // σ sampled on a fine sub-grid (8 samples per smallest cell, at least 64).
        let samples = (((b - a) / smallest * 8.0).ceil() as usize).clamp(64, 2_000_000);
        let ds = (b - a) / samples as f64;
        let mut sigma = Vec::with_capacity(samples + 1);
        sigma.push(0.0);
        for k in 0..samples {
            let mid = a + (k as f64 + 0.5) * ds;
            let last = sigma[k];
            sigma.push(last + ds / wanted_size(mid, zones, grading));
        }
        let total = sigma[samples];
        let n = ((total - 1e-9).ceil() as usize).max(1);
        if faces.len() + n > MAX_AXIS_CELLS {
            return Err(format!(
                "the grid would need more than {MAX_AXIS_CELLS} cells along one axis; use larger cells"
            ));
        }
        let mut k = 0;
        for j in 1..n {
            let target = total * j as f64 / n as f64;
            while sigma[k + 1] < target {
                k += 1;
            }
            let w = (target - sigma[k]) / (sigma[k + 1] - sigma[k]);
            faces.push(a + (k as f64 + w) * ds);
        }
        faces.push(b);
    }
    Ok(faces)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn required_lines_are_faces_and_growth_is_bounded() {
        let grading = Grading {
            max_cell_m: 1.0,
            growth_ratio: 1.2,
        };
        let zones = [
            Zone {
                lo_m: 0.0,
                hi_m: 0.0,
                size_m: 0.01,
            },
            Zone {
                lo_m: 0.9,
                hi_m: 1.1,
                size_m: 0.02,
            },
        ];
        let axis = Axis::graded(0.0, 20.0, &[0.45, 0.5, 3.0], &zones, grading).unwrap();
        for line in [0.0, 0.45, 0.5, 3.0, 20.0] {
            assert!(axis.faces_m().iter().any(|&f| (f - line).abs() < 1e-12), "{line}");
        }
        // The 50 mm board between 0.45 and 0.5 m keeps its thickness exactly.
        assert!(
            axis.max_neighbour_ratio() <= 1.2 * 1.05 + 1e-9,
            "{}",
            axis.max_neighbour_ratio()
        );
        assert!(axis.widths_m().iter().all(|&w| w <= 1.0 + 1e-9));
        assert!(axis.widths_m()[0] <= 0.01 * 1.2 + 1e-12);
    }
}
