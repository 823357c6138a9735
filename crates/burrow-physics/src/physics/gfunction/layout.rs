//! The bookkeeping that lets one table of FLS responses serve the whole field: classes of
//! equivalent boreholes, the distinct horizontal distances, the distinct segment pairs, and for
//! each pair of classes how often each distance occurs.
//!
//! The segment-to-segment response is `h = ∫ exp(−d²s²)·K(s) ds` (see `fls`): it depends on the
//! horizontal distance `d` only through `exp(−d²s²)` and on the vertical geometry only through
//! the segment part `K`. So a response table indexed by (distance, segment pair) holds every
//! response in the field, and the response of representative borehole `I` to class `J` is
//! `Σ_d m_IJ(d)·h(d, pair)`, with `m_IJ(d)` the number of boreholes of class J at distance d
//! from I.

use super::Borehole;
use super::fls::SegmentPair;
use super::symmetry::{Classes, equivalence_classes};
use std::collections::HashMap;

/// One vertical geometry: length, buried depth and radius, m.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Vertical {
    pub length_m: f64,
    pub depth_m: f64,
    pub radius_m: f64,
}

/// For one ordered pair of vertical geometries (receiver, source): which table keys its segment
/// pairs use. `real[p*S + q]` and `image[p*S + q]` index into `keys` (local indices), for
/// receiver segment p and source segment q.
#[derive(Debug, Clone)]
pub(crate) struct PairTable {
    pub keys: Vec<usize>,
    pub real: Vec<u16>,
    pub image: Vec<u16>,
    /// True when `keys` is `0, 1, 2, …` over all keys of the layout (one vertical geometry).
    pub identity: bool,
    /// With equal segment lengths the real part depends on p − q only and the image part on
    /// p + q only (Toeplitz and Hankel blocks): local keys by `p − q + S − 1` and by `p + q`.
    pub structured: Option<(Vec<u16>, Vec<u16>)>,
}

impl PairTable {
    fn find_structure(&mut self, segments: usize) {
        let s = segments;
        let mut toeplitz: Vec<Option<u16>> = vec![None; 2 * s - 1];
        let mut hankel: Vec<Option<u16>> = vec![None; 2 * s - 1];
        for p in 0..s {
            for q in 0..s {
                let (t, h) = (&mut toeplitz[p + s - 1 - q], &mut hankel[p + q]);
                let (r, i) = (self.real[p * s + q], self.image[p * s + q]);
                if *t.get_or_insert(r) != r || *h.get_or_insert(i) != i {
                    return;
                }
            }
        }
        self.structured = Some((
            toeplitz.into_iter().map(|v| v.unwrap_or(0)).collect(),
            hankel.into_iter().map(|v| v.unwrap_or(0)).collect(),
        ));
    }
}

/// A distance index and how many source boreholes of a class lie at that distance.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Occurrence {
    pub distance: usize,
    pub count: f64,
}

/// The segment's own response at its own radius, where the cylinder-source correction applies.
#[derive(Debug, Clone, Copy)]
pub(crate) struct SelfTerm {
    pub distance: usize,
    pub key: usize,
    pub radius_m: f64,
}

#[derive(Debug, Clone)]
pub(crate) struct Layout {
    pub segments: usize,
    /// Number of boreholes in each class.
    pub class_size: Vec<usize>,
    /// Vertical geometry index of each class.
    pub class_vertical: Vec<usize>,
    pub verticals: Vec<Vertical>,
    /// Distinct horizontal distances, ascending, m (a borehole's own radius for its own segments).
    pub distances_m: Vec<f64>,
    pub keys: Vec<SegmentPair>,
    /// Indexed `receiver_vertical * verticals.len() + source_vertical`.
    pub pair_tables: Vec<PairTable>,
    /// For class pair (I, J) at `I * classes + J`: the range of `occurrences`.
    pub blocks: Vec<(usize, usize)>,
    pub occurrences: Vec<Occurrence>,
    pub self_terms: Vec<SelfTerm>,
}

impl Layout {
    pub(crate) fn classes(&self) -> usize {
        self.class_size.len()
    }

    /// Number of unknown segment heat rates of the reduced system.
    pub(crate) fn unknowns(&self) -> usize {
        self.classes() * self.segments
    }

    pub(crate) fn pair_table(&self, receiver_class: usize, source_class: usize) -> &PairTable {
        let nv = self.verticals.len();
        &self.pair_tables[self.class_vertical[receiver_class] * nv + self.class_vertical[source_class]]
    }

    pub(crate) fn block(&self, receiver_class: usize, source_class: usize) -> &[Occurrence] {
        let (a, b) = self.blocks[receiver_class * self.classes() + source_class];
        &self.occurrences[a..b]
    }

    /// Total active length of the field, m.
    pub(crate) fn total_length_m(&self) -> f64 {
        self.class_size
            .iter()
            .zip(&self.class_vertical)
            .map(|(&n, &v)| n as f64 * self.verticals[v].length_m)
            .sum()
    }

    pub(crate) fn build(field: &[Borehole], segments: usize) -> Self {
        let classes = equivalence_classes(field);
        let (verticals, class_vertical) = verticals_of(field, &classes);
        let (keys, pair_tables) = segment_keys(&verticals, segments);
        let (distances_m, blocks, occurrences) = distance_occurrences(field, &classes);
        let self_terms = self_terms(&verticals, &keys, &pair_tables, &distances_m);
        Self {
            segments,
            class_size: classes.members.iter().map(Vec::len).collect(),
            class_vertical,
            verticals,
            distances_m,
            keys,
            pair_tables,
            blocks,
            occurrences,
            self_terms,
        }
    }
}

fn verticals_of(field: &[Borehole], classes: &Classes) -> (Vec<Vertical>, Vec<usize>) {
    let mut verticals: Vec<Vertical> = Vec::new();
    let class_vertical = classes
        .members
        .iter()
        .map(|m| {
            let b = &field[m[0]];
            let v = Vertical {
                length_m: b.length_m,
                depth_m: b.buried_depth_m,
                radius_m: b.radius_m,
            };
            match verticals.iter().position(|w| *w == v) {
                Some(i) => i,
                None => {
                    verticals.push(v);
                    verticals.len() - 1
                }
            }
        })
        .collect();
    (verticals, class_vertical)
}

/// Quantised identity of a segment pair (to 1 nm), so equal pairs share a table entry.
fn key_of(pair: &SegmentPair) -> (u8, i64, i64, i64) {
    let q = |x: f64| (x * 1e9).round() as i64;
    (
        pair.part as u8,
        q(pair.offset_m),
        q(pair.receiver_m),
        q(pair.source_m),
    )
}

fn segment_keys(verticals: &[Vertical], segments: usize) -> (Vec<SegmentPair>, Vec<PairTable>) {
    let mut keys: Vec<SegmentPair> = Vec::new();
    let mut index: HashMap<(u8, i64, i64, i64), usize> = HashMap::new();
    let mut tables = Vec::new();
    for receiver in verticals {
        for source in verticals {
            let lr = receiver.length_m / segments as f64;
            let ls = source.length_m / segments as f64;
            let mut local: Vec<usize> = Vec::new();
            let mut local_of = |global: usize| -> u16 {
                match local.iter().position(|&g| g == global) {
                    Some(i) => i as u16,
                    None => {
                        local.push(global);
                        (local.len() - 1) as u16
                    }
                }
            };
            let mut real = Vec::with_capacity(segments * segments);
            let mut image = Vec::with_capacity(segments * segments);
            for p in 0..segments {
                for q in 0..segments {
                    let pairs = SegmentPair::both(
                        source.depth_m + q as f64 * ls,
                        ls,
                        receiver.depth_m + p as f64 * lr,
                        lr,
                    );
                    let globals = pairs.map(|pair| {
                        *index.entry(key_of(&pair)).or_insert_with(|| {
                            keys.push(pair);
                            keys.len() - 1
                        })
                    });
                    real.push(local_of(globals[0]));
                    image.push(local_of(globals[1]));
                }
            }
            tables.push(PairTable {
                keys: local,
                real,
                image,
                identity: false,
                structured: None,
            });
        }
    }
    let total = keys.len();
    for t in &mut tables {
        t.identity = t.keys.len() == total && t.keys.iter().enumerate().all(|(i, &k)| i == k);
        t.find_structure(segments);
    }
    (keys, tables)
}

type Blocks = (Vec<f64>, Vec<(usize, usize)>, Vec<Occurrence>);

/// Distinct distances (relative tolerance 1e-9) and, per class pair, the count of each.
fn distance_occurrences(field: &[Borehole], classes: &Classes) -> Blocks {
    let nc = classes.members.len();
    let distance = |i: usize, j: usize| -> f64 {
        if i == j {
            field[i].radius_m
        } else {
            (field[i].x_m - field[j].x_m).hypot(field[i].y_m - field[j].y_m)
        }
    };
    let mut all: Vec<f64> = Vec::new();
    for m in &classes.members {
        let r = m[0];
        all.extend((0..field.len()).map(|j| distance(r, j)));
    }
    all.sort_by(f64::total_cmp);
    let mut distances: Vec<f64> = Vec::new();
    for d in all {
        match distances.last() {
            Some(&last) if d - last <= 1e-9 * d => {}
            _ => distances.push(d),
        }
    }
    let locate = |d: f64| -> usize {
        let i = distances.partition_point(|&x| x < d * (1.0 - 1e-9));
        i.min(distances.len() - 1)
    };
    let mut blocks = vec![(0, 0); nc * nc];
    let mut occurrences = Vec::new();
    for (ci, m) in classes.members.iter().enumerate() {
        let r = m[0];
        let mut per_class: Vec<Vec<(usize, f64)>> = vec![Vec::new(); nc];
        for j in 0..field.len() {
            per_class[classes.class_of[j]].push((locate(distance(r, j)), 1.0));
        }
        for (cj, mut list) in per_class.into_iter().enumerate() {
            list.sort_by_key(|e| e.0);
            let start = occurrences.len();
            for (d, c) in list {
                let merge = occurrences.len() > start
                    && occurrences.last().map(|o: &Occurrence| o.distance) == Some(d);
                if merge {
                    if let Some(last) = occurrences.last_mut() {
                        last.count += c;
                    }
                } else {
                    occurrences.push(Occurrence {
                        distance: d,
                        count: c,
                    });
                }
            }
            blocks[ci * nc + cj] = (start, occurrences.len());
        }
    }
    (distances, blocks, occurrences)
}

fn self_terms(
    verticals: &[Vertical],
    keys: &[SegmentPair],
    tables: &[PairTable],
    distances: &[f64],
) -> Vec<SelfTerm> {
    let nv = verticals.len();
    let mut out: Vec<SelfTerm> = Vec::new();
    for (v, vertical) in verticals.iter().enumerate() {
        let table = &tables[v * nv + v];
        let distance = distances
            .iter()
            .position(|&d| (d - vertical.radius_m).abs() <= 1e-9 * d)
            .unwrap_or(0);
        // The diagonal (p = q) real pairs: offset 0, equal lengths — one key per geometry.
        let key = table.keys[table.real[0] as usize];
        debug_assert_eq!(keys[key].offset_m, 0.0);
        if !out.iter().any(|t| t.distance == distance && t.key == key) {
            out.push(SelfTerm {
                distance,
                key,
                radius_m: vertical.radius_m,
            });
        }
    }
    out
}
