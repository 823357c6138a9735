//! Equivalent boreholes: orbits of the field under the symmetries of its layout.
//!
//! The candidate symmetries are the eight elements of the square's symmetry group (rotations by
//! multiples of 90° and reflections in the axes and diagonals) about the centroid of the borehole
//! positions, in the coordinate axes of the input. A candidate is a symmetry of the field when it
//! maps every borehole onto a borehole with the same length, buried depth and radius. Under the
//! uniform-wall-temperature condition the solution is unique, so it is invariant under every
//! symmetry and equivalent boreholes carry equal segment heat rates: the system can be written
//! for one representative per orbit. A rectangular field has four such symmetries, a square one
//! eight; fields symmetric only about other axes (rotated layouts, hexagonal patterns) are solved
//! with the symmetries found, at worst none.

use super::Borehole;
use std::collections::HashMap;

/// The orbits: `class_of[i]` is the class of borehole i, `members[c]` the boreholes of class c
/// (the first is its representative).
#[derive(Debug, Clone)]
pub(crate) struct Classes {
    pub class_of: Vec<usize>,
    pub members: Vec<Vec<usize>>,
}

/// The eight transforms of the square group acting on (x, y).
/// A map of the plane about the centroid.
type Transform = fn(f64, f64) -> (f64, f64);

const TRANSFORMS: [Transform; 8] = [
    |x, y| (x, y),
    |x, y| (-y, x),
    |x, y| (-x, -y),
    |x, y| (y, -x),
    |x, y| (-x, y),
    |x, y| (x, -y),
    |x, y| (y, x),
    |x, y| (-y, -x),
];

/// Groups the boreholes of `field` into classes of equivalent boreholes.
pub(crate) fn equivalence_classes(field: &[Borehole]) -> Classes {
    let n = field.len();
    let (cx, cy) = centroid(field);
    let extent = field
        .iter()
        .map(|b| (b.x_m - cx).abs().max((b.y_m - cy).abs()))
        .fold(0.0, f64::max);
    let tolerance = 1e-6 * (1.0 + extent);
    let index = PositionIndex::new(field, cx, cy, tolerance);

    let mut parent: Vec<usize> = (0..n).collect();
    for transform in TRANSFORMS.iter().skip(1) {
        let Some(image) = map_field(field, cx, cy, &index, *transform) else {
            continue;
        };
        for (i, j) in image.into_iter().enumerate() {
            union(&mut parent, i, j);
        }
    }
    let mut class_of = vec![usize::MAX; n];
    let mut members: Vec<Vec<usize>> = Vec::new();
    let mut root_class: HashMap<usize, usize> = HashMap::new();
    for (i, class) in class_of.iter_mut().enumerate() {
        let root = find(&mut parent, i);
        let c = *root_class.entry(root).or_insert_with(|| {
            members.push(Vec::new());
            members.len() - 1
        });
        *class = c;
        members[c].push(i);
    }
    Classes { class_of, members }
}

fn centroid(field: &[Borehole]) -> (f64, f64) {
    let n = field.len() as f64;
    let sx: f64 = field.iter().map(|b| b.x_m).sum();
    let sy: f64 = field.iter().map(|b| b.y_m).sum();
    (sx / n, sy / n)
}

/// The image of each borehole under `transform`, or None when the transform is not a symmetry.
fn map_field(
    field: &[Borehole],
    cx: f64,
    cy: f64,
    index: &PositionIndex,
    transform: Transform,
) -> Option<Vec<usize>> {
    field
        .iter()
        .map(|b| {
            let (x, y) = transform(b.x_m - cx, b.y_m - cy);
            index.find(x, y).filter(|&j| same_vertical(b, &field[j]))
        })
        .collect()
}

fn same_vertical(a: &Borehole, b: &Borehole) -> bool {
    let close = |u: f64, v: f64| (u - v).abs() <= 1e-9 * u.abs().max(v.abs()).max(1.0);
    close(a.length_m, b.length_m)
        && close(a.buried_depth_m, b.buried_depth_m)
        && close(a.radius_m, b.radius_m)
}

/// Positions relative to the centroid, bucketed on a grid of the matching tolerance.
struct PositionIndex<'a> {
    field: &'a [Borehole],
    cx: f64,
    cy: f64,
    tolerance: f64,
    buckets: HashMap<(i64, i64), Vec<usize>>,
}

impl<'a> PositionIndex<'a> {
    fn new(field: &'a [Borehole], cx: f64, cy: f64, tolerance: f64) -> Self {
        let mut buckets: HashMap<(i64, i64), Vec<usize>> = HashMap::new();
        for (i, b) in field.iter().enumerate() {
            let key = Self::cell(b.x_m - cx, b.y_m - cy, tolerance);
            buckets.entry(key).or_default().push(i);
        }
        Self {
            field,
            cx,
            cy,
            tolerance,
            buckets,
        }
    }

    fn cell(x: f64, y: f64, tolerance: f64) -> (i64, i64) {
        ((x / tolerance).round() as i64, (y / tolerance).round() as i64)
    }

    fn find(&self, x: f64, y: f64) -> Option<usize> {
        let (kx, ky) = Self::cell(x, y, self.tolerance);
        for dx in -1..=1 {
            for dy in -1..=1 {
                if let Some(list) = self.buckets.get(&(kx + dx, ky + dy)) {
                    for &j in list {
                        let b = &self.field[j];
                        if (b.x_m - self.cx - x).abs() <= self.tolerance
                            && (b.y_m - self.cy - y).abs() <= self.tolerance
                        {
                            return Some(j);
                        }
                    }
                }
            }
        }
        None
    }
}

fn find(parent: &mut [usize], mut i: usize) -> usize {
    while parent[i] != i {
        parent[i] = parent[parent[i]];
        i = parent[i];
    }
    i
}

fn union(parent: &mut [usize], a: usize, b: usize) {
    let (ra, rb) = (find(parent, a), find(parent, b));
    if ra != rb {
        parent[ra.max(rb)] = ra.min(rb);
    }
}

#[cfg(test)]
mod tests {
    use super::super::rectangle;
    use super::*;

    #[test]
    fn square_field_has_eightfold_orbits() {
        // A 4 × 4 square: corners (4), edge boreholes (8), inner (4) → 3 classes.
        let field = rectangle(4, 4, 5.0, 100.0, 2.0, 0.06);
        let classes = equivalence_classes(&field);
        let mut sizes: Vec<usize> = classes.members.iter().map(Vec::len).collect();
        sizes.sort();
        assert_eq!(sizes, vec![4, 4, 8]);
        // 10 × 10: 15 classes (the triangle i ≤ j of a 5 × 5 quarter).
        assert_eq!(
            equivalence_classes(&rectangle(10, 10, 6.0, 150.0, 4.0, 0.07))
                .members
                .len(),
            15
        );
    }

    #[test]
    fn rectangular_field_has_fourfold_orbits() {
        // 3 × 5: classes are quarter positions: rows {0,2},{1} × columns {0,4},{1,3},{2} → 6.
        let classes = equivalence_classes(&rectangle(3, 5, 5.0, 100.0, 2.0, 0.06));
        assert_eq!(classes.members.len(), 6);
    }

    #[test]
    fn a_different_borehole_breaks_the_symmetry() {
        let mut field = rectangle(2, 2, 5.0, 100.0, 2.0, 0.06);
        field[0].length_m = 120.0;
        let classes = equivalence_classes(&field);
        // Only the diagonal reflection through borehole 0 and its opposite survives.
        assert_eq!(classes.members.len(), 3);
    }
}
