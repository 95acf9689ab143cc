//! The nearest boundary point of a gamut mesh in CIEDE2000, found by branch
//! and bound: the vertices are bucketed in cubes of `BUCKET` CIELAB units,
//! each split into cubes of `SUB_BUCKET`; buckets and, within them,
//! sub-buckets are searched vertex by vertex in the order of a lower bound
//! on their vertices' distance, until the bound passes the nearest vertex
//! found; the triangles around the best vertex are then sampled on a fine
//! barycentric grid.
//!
//! Distances to centroids and vertices are first screened many at a time
//! with the bounded single-precision ΔE00 of [`crate::color::delta_batch`]:
//! orders and cuts take the screen's lower bounds (so they keep every cell
//! the exact distances would keep), and a vertex gets its exact ΔE00 only
//! where the screen cannot show it farther than the nearest one found. The
//! nearest vertex is therefore the one the exact search finds (ties by
//! number), at a fraction of the cost.

use std::ops::Range;

use super::mesh::Mesh;
use crate::color::delta::{delta_e00, delta_e76};
use crate::color::delta_batch::{at_least, interval, LabSet};
use crate::color::LabD50;

/// Nearest boundary point in CIEDE2000 (see the module).
#[derive(Clone, Debug)]
pub struct Locator {
    mesh: Mesh,
    buckets: Vec<Cell>,
    /// Every bucket's sub-buckets, bucket by bucket (`Cell::inner` of a
    /// bucket ranges over them).
    subs: Vec<Cell>,
    /// Vertex numbers, sub-bucket by sub-bucket (`Cell::inner` of a
    /// sub-bucket ranges over them).
    order: Vec<u32>,
    bucket_set: LabSet,
    sub_set: LabSet,
    /// The vertices in `order`.
    vertex_set: LabSet,
    /// The largest bucket radius.
    bucket_radius: f64,
    /// The largest sub-bucket radius.
    sub_radius: f64,
    /// Triangles around each vertex.
    around: Vec<Vec<u32>>,
}

/// A bucket or sub-bucket.
#[derive(Clone, Debug)]
struct Cell {
    centroid: LabD50,
    /// The largest CIELAB distance from the centroid to a vertex.
    radius: f64,
    /// Its sub-buckets in `Locator::subs`, or its vertices in `Locator::order`.
    inner: Range<usize>,
}

fn centroid(vertices: &[u32], all: &[[f64; 3]]) -> LabD50 {
    let mut c = [0.0; 3];
    for &i in vertices {
        for (cd, v) in c.iter_mut().zip(all[i as usize]) {
            *cd += v / vertices.len() as f64;
        }
    }
    LabD50::from_array(c)
}

/// Groups `vertices` by the `edge`-unit cube they lie in, cubes in order
/// (sorted, not hashed: a mesh has some 10⁵ vertices).
fn cubes(vertices: impl Iterator<Item = u32>, all: &[[f64; 3]], edge: f64) -> Vec<Vec<u32>> {
    let mut keyed: Vec<([i64; 3], u32)> = vertices
        .map(|i| (all[i as usize].map(|c| (c / edge).floor() as i64), i))
        .collect();
    keyed.sort_unstable();
    keyed
        .chunk_by(|a, b| a.0 == b.0)
        .map(|run| run.iter().map(|&(_, i)| i).collect())
        .collect()
}

/// Edge of a search bucket, CIELAB units.
const BUCKET: f64 = 6.0;
/// At least this many buckets are searched, the lowest bounds first, and
/// then every bucket that may hold the nearest vertex.
const BUCKETS_SEARCHED: usize = 12;
/// The bounds rest on
/// f, the largest ratio ΔE00 / ΔE*ab over differences of a few units: a
/// vertex within r CIELAB units of its bucket's centroid is within f·r ΔE00
/// of it. ΔE00 is not bounded by ΔE*ab (Sharma, Wu and Dalal 2005, eqs. 2–3
/// and 19–22): a* is stretched by 1 + G with G = ½(1 − R_C),
/// R_C = √(C̄⁷/(C̄⁷ + 25⁷)), and the rotation term adds R_T·ΔC′ΔH′ with
/// |R_T| ≤ 2·sin 60°·R_C ≤ √3·R_C, at most (√3/2)·R_C·(ΔC′² + ΔH′²). With
/// S_L, S_C, S_H ≥ 1 this gives f ≤ (1.5 − 0.5·R_C)·√(1 + 0.866·R_C), whose
/// largest value over 0 ≤ R_C ≤ 1 is 1.52 (at R_C ≈ 0.25; 1.5 on the
/// neutral axis). The bounds use f = 1.55: a vertex of a cell (bucket or
/// sub-bucket) whose vertices lie within r CIELAB units of its centroid c is
/// at least d(c) − f·r from the colour searched for, taking the triangle
/// inequality to hold for CIEDE2000 over differences this small.
const F_DE00_PER_DE_AB: f64 = 1.55;
/// The branch and bound is trusted up to this ΔE00; a colour farther out is
/// searched again with the wide margins. Beyond CIEDE2000's range of a few
/// units the triangle inequality the bounds take fails more and more: on
/// 2,000 random CIELAB colours outside the built-in press gamut, the bound
/// missed the nearest vertex for 15 colours, all more than 13.8 out.
const TIGHT_SEARCH_UP_TO: f64 = 10.0;
/// Edge of a sub-bucket, CIELAB units.
const SUB_BUCKET: f64 = 2.0;
/// Barycentric steps per triangle edge in the final refinement.
const REFINE_STEPS: usize = 8;

impl Locator {
    /// Buckets the mesh's vertices for the search.
    pub fn new(mesh: Mesh) -> Locator {
        let all = &mesh.vertices;
        let cell = |v: &[u32], inner: Range<usize>| {
            let c = centroid(v, all);
            let radius = v
                .iter()
                .map(|&i| delta_e76(c, LabD50::from_array(all[i as usize])))
                .fold(0.0, f64::max);
            Cell {
                centroid: c,
                radius,
                inner,
            }
        };
        let (mut buckets, mut subs, mut order) = (Vec::new(), Vec::new(), Vec::new());
        for vertices in cubes(0..all.len() as u32, all, BUCKET) {
            let first_sub = subs.len();
            for v in cubes(vertices.iter().copied(), all, SUB_BUCKET) {
                subs.push(cell(&v, order.len()..order.len() + v.len()));
                order.extend(v);
            }
            buckets.push(cell(&vertices, first_sub..subs.len()));
        }
        let mut around = vec![Vec::new(); mesh.vertices.len()];
        for (t, tri) in mesh.triangles.iter().enumerate() {
            for &v in tri {
                around[v as usize].push(t as u32);
            }
        }
        let set = |cells: &[Cell]| LabSet::new(&cells.iter().map(|c| c.centroid).collect::<Vec<_>>());
        let vertices: Vec<LabD50> = order.iter().map(|&v| LabD50::from_array(all[v as usize])).collect();
        Locator {
            bucket_set: set(&buckets),
            sub_set: set(&subs),
            vertex_set: LabSet::new(&vertices),
            bucket_radius: buckets.iter().map(|b| b.radius).fold(0.0, f64::max),
            sub_radius: subs.iter().map(|b| b.radius).fold(0.0, f64::max),
            buckets,
            subs,
            order,
            around,
            mesh,
        }
    }

    /// The mesh searched.
    pub fn mesh(&self) -> &Mesh {
        &self.mesh
    }

    /// The boundary point nearest to `lab` in CIEDE2000 and its distance;
    /// `None` for an empty mesh.
    pub fn nearest(&self, lab: LabD50) -> Option<(LabD50, f64)> {
        let mut scratch = Scratch::default();
        let mut best = self.nearest_vertex_bounded(lab, &mut scratch)?;
        if best.0 > TIGHT_SEARCH_UP_TO {
            best = self.nearest_vertex_wide(lab, &mut scratch)?;
        }
        self.refine(lab, best)
    }

    /// ΔE00 from `lab` to each cell of `cells` (`set` their centroids) as
    /// [lo, hi] bounds, exact where the screen gives none.
    fn distances(
        &self,
        lab: LabD50,
        cells: &[Cell],
        set: &LabSet,
        range: Range<usize>,
        out: &mut Vec<f32>,
    ) -> Vec<(f64, f64)> {
        set.squared_to(lab, range.clone(), out);
        out.iter()
            .zip(&cells[range])
            .map(|(&d, c)| {
                interval(d).unwrap_or_else(|| {
                    let e = delta_e00(lab, c.centroid);
                    (e, e)
                })
            })
            .collect()
    }

    /// The nearest vertex by branch and bound: buckets in the order of a
    /// lower bound on their vertices' distance, until the bound passes the
    /// nearest vertex found.
    fn nearest_vertex_bounded(&self, lab: LabD50, scratch: &mut Scratch) -> Option<(f64, u32)> {
        // A vertex of a cell with centroid c and radius r lies at least
        // d(c) − f·r from `lab`.
        let f = F_DE00_PER_DE_AB;
        let d = self.distances(
            lab,
            &self.buckets,
            &self.bucket_set,
            0..self.buckets.len(),
            &mut scratch.screened,
        );
        let keys: Vec<(f64, f64)> = d
            .iter()
            .zip(&self.buckets)
            .map(|(&(lo, hi), b)| (lo - f * b.radius, hi - f * b.radius))
            .collect();
        // The exact search's first BUCKETS_SEARCHED buckets have keys at
        // most the BUCKETS_SEARCHED-th smallest upper bound.
        let forced = kth_smallest(keys.iter().map(|k| k.1), BUCKETS_SEARCHED);
        let mut best: Option<(f64, u32)> = None;
        // Lowest keys first (ties by position), taken from a heap as the
        // search goes: it mostly stops after a few of many buckets.
        let mut ranked: std::collections::BinaryHeap<Ranked> =
            keys.iter().enumerate().map(|(i, k)| Ranked(k.0, i)).collect();
        while let Some(Ranked(low, bi)) = ranked.pop() {
            if low > forced && best.is_some_and(|(bd, _)| low > bd) {
                break;
            }
            let inner = self.buckets[bi].inner.clone();
            let d = self.distances(lab, &self.subs, &self.sub_set, inner.clone(), &mut scratch.screened);
            let mut subs: Vec<(f64, usize)> = d
                .iter()
                .zip(inner)
                .map(|(&(lo, _), s)| (lo - f * self.subs[s].radius, s))
                .collect();
            subs.sort_by(|a, b| a.0.total_cmp(&b.0));
            for &(low_sub, s) in &subs {
                if best.is_some_and(|(bd, _)| low_sub > bd) {
                    break;
                }
                self.search_vertices(lab, self.subs[s].inner.clone(), &mut best, scratch);
            }
        }
        best
    }

    /// The nearest vertex with wide margins: every bucket whose centroid may
    /// be within 2·f·r of the nearest bucket centroid, and in them every
    /// sub-bucket that may be within 2·f·r of the nearest sub-bucket
    /// centroid (and at least the BUCKETS_SEARCHED nearest buckets).
    fn nearest_vertex_wide(&self, lab: LabD50, scratch: &mut Scratch) -> Option<(f64, u32)> {
        let f = F_DE00_PER_DE_AB;
        let d = self.distances(
            lab,
            &self.buckets,
            &self.bucket_set,
            0..self.buckets.len(),
            &mut scratch.screened,
        );
        let nearest_hi = d.iter().map(|x| x.1).fold(f64::INFINITY, f64::min);
        let cut =
            (nearest_hi + 2.0 * f * self.bucket_radius).max(kth_smallest(d.iter().map(|x| x.1), BUCKETS_SEARCHED));
        let mut subs: Vec<((f64, f64), usize)> = Vec::new();
        for (bi, _) in d.iter().enumerate().filter(|(_, x)| x.0 <= cut) {
            let inner = self.buckets[bi].inner.clone();
            let ds = self.distances(lab, &self.subs, &self.sub_set, inner.clone(), &mut scratch.screened);
            subs.extend(ds.into_iter().zip(inner));
        }
        let sub_cut = subs.iter().map(|s| s.0 .1).fold(f64::INFINITY, f64::min) + 2.0 * f * self.sub_radius;
        let mut best = None;
        for (_, s) in subs.iter().filter(|s| s.0 .0 <= sub_cut) {
            self.search_vertices(lab, self.subs[*s].inner.clone(), &mut best, scratch);
        }
        best
    }

    /// The nearest of the vertices at `range` of `order` to `lab`, against
    /// `best` (ties to the lower vertex number): exact ΔE00 only where the
    /// screen cannot show a vertex farther than `best`.
    fn search_vertices(&self, lab: LabD50, range: Range<usize>, best: &mut Option<(f64, u32)>, scratch: &mut Scratch) {
        self.vertex_set.squared_to(lab, range.clone(), &mut scratch.vertices);
        for (&dh, k) in scratch.vertices.iter().zip(range) {
            if best.is_some_and(|(bd, _)| f64::from(dh) > at_least(bd * bd)) {
                continue;
            }
            let v = self.order[k];
            let d = delta_e00(lab, LabD50::from_array(self.mesh.vertices[v as usize]));
            if best.is_none_or(|(bd, bv)| d < bd || (d == bd && v < bv)) {
                *best = Some((d, v));
            }
        }
    }

    /// Samples the triangles around the best vertex on a fine barycentric grid.
    fn refine(&self, lab: LabD50, best: (f64, u32)) -> Option<(LabD50, f64)> {
        let (mut best_d, v) = best;
        let mut best_p = LabD50::from_array(self.mesh.vertices[v as usize]);
        for &t in &self.around[v as usize] {
            let [p, q, r] = self.mesh.triangles[t as usize].map(|i| self.mesh.vertices[i as usize]);
            for i in 0..=REFINE_STEPS {
                for j in 0..=REFINE_STEPS - i {
                    let (s, u) = (i as f64 / REFINE_STEPS as f64, j as f64 / REFINE_STEPS as f64);
                    let x = LabD50::from_array([0, 1, 2].map(|d| p[d] + s * (q[d] - p[d]) + u * (r[d] - p[d])));
                    let d = delta_e00(lab, x);
                    if d < best_d {
                        best_d = d;
                        best_p = x;
                    }
                }
            }
        }
        Some((best_p, best_d))
    }
}

/// Buffers of one search.
#[derive(Default)]
struct Scratch {
    screened: Vec<f32>,
    vertices: Vec<f32>,
}

/// A key and its position, ordered so that a max-heap yields the smallest
/// key first (ties: the lower position first).
#[derive(Clone, Copy, Debug)]
struct Ranked(f64, usize);

impl PartialEq for Ranked {
    fn eq(&self, o: &Self) -> bool {
        self.cmp(o) == std::cmp::Ordering::Equal
    }
}
impl Eq for Ranked {}
impl PartialOrd for Ranked {
    fn partial_cmp(&self, o: &Self) -> Option<std::cmp::Ordering> {
        Some(self.cmp(o))
    }
}
impl Ord for Ranked {
    fn cmp(&self, o: &Self) -> std::cmp::Ordering {
        o.0.total_cmp(&self.0).then(o.1.cmp(&self.1))
    }
}

/// The `k`-th smallest of `values` (1-based; the largest when there are
/// fewer, −∞ when there are none).
fn kth_smallest(values: impl Iterator<Item = f64>, k: usize) -> f64 {
    let mut v: Vec<f64> = values.collect();
    if v.is_empty() {
        return f64::NEG_INFINITY;
    }
    let k = k.clamp(1, v.len()) - 1;
    *v.select_nth_unstable_by(k, f64::total_cmp).1
}
