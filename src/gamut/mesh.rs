//! Closed triangle meshes of gamut boundaries in CIELAB: the image of the RGB
//! cube's six faces, the isosurface of a voxel solid (marching tetrahedra),
//! enclosed volume by the divergence theorem, and the nearest boundary point
//! in CIEDE2000.

use std::collections::HashMap;

use super::grid::Solid;
use crate::color::delta::delta_e00;
use crate::color::LabD50;

/// A triangle mesh; vertices are CIELAB D50 [L*, a*, b*], triangles wind
/// counter-clockwise seen from outside.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Mesh {
    /// Vertices, CIELAB D50 [L*, a*, b*].
    pub vertices: Vec<[f64; 3]>,
    /// Triangles as three indices into `vertices`.
    pub triangles: Vec<[u32; 3]>,
}

impl Mesh {
    /// Signed enclosed volume by the divergence theorem: with F = x/3,
    /// V = ∮ F·n dA = Σ p0 · (p1 × p2) / 6 over the triangles (exact for a
    /// closed polyhedron). Positive when triangles wind outward.
    pub fn signed_volume(&self) -> f64 {
        self.triangles
            .iter()
            .map(|t| {
                let [p, q, r] = t.map(|i| self.vertices[i as usize]);
                let c = [
                    q[1] * r[2] - q[2] * r[1],
                    q[2] * r[0] - q[0] * r[2],
                    q[0] * r[1] - q[1] * r[0],
                ];
                p[0] * c[0] + p[1] * c[1] + p[2] * c[2]
            })
            .sum::<f64>()
            / 6.0
    }

    /// Reverses every triangle's winding.
    pub fn flip(&mut self) {
        for t in &mut self.triangles {
            t.swap(1, 2);
        }
    }

    /// Smallest and largest coordinate along each axis.
    pub fn bounds(&self) -> Option<([f64; 3], [f64; 3])> {
        bounds(&self.vertices)
    }
}

/// Smallest and largest coordinate of `points` along each axis; `None` when empty.
pub fn bounds(points: &[[f64; 3]]) -> Option<([f64; 3], [f64; 3])> {
    let first = *points.first()?;
    let mut lo = first;
    let mut hi = first;
    for p in points {
        for d in 0..3 {
            lo[d] = lo[d].min(p[d]);
            hi[d] = hi[d].max(p[d]);
        }
    }
    Some((lo, hi))
}

/// The device points of the surface of the unit cube on a grid of `n` steps
/// per edge (shared corners and edges appear once), and the triangles over
/// them, wound outward in device space. Indices follow the returned points.
pub fn cube_surface(n: usize) -> (Vec<[f64; 3]>, Vec<[u32; 3]>) {
    let n = n.max(1);
    let mut index: HashMap<[usize; 3], u32> = HashMap::new();
    let mut points = Vec::new();
    let mut id = |g: [usize; 3], points: &mut Vec<[f64; 3]>| -> u32 {
        *index.entry(g).or_insert_with(|| {
            points.push(g.map(|v| v as f64 / n as f64));
            (points.len() - 1) as u32
        })
    };
    let mut triangles = Vec::with_capacity(12 * n * n);
    for d in 0..3 {
        let (u, v) = ((d + 1) % 3, (d + 2) % 3);
        for side in [0, n] {
            for i in 0..n {
                for j in 0..n {
                    let at = |di: usize, dj: usize| {
                        let mut g = [0; 3];
                        g[d] = side;
                        g[u] = i + di;
                        g[v] = j + dj;
                        g
                    };
                    let a = id(at(0, 0), &mut points);
                    let b = id(at(1, 0), &mut points);
                    let c = id(at(1, 1), &mut points);
                    let e = id(at(0, 1), &mut points);
                    // e_u × e_v = e_d: counter-clockwise in (u, v) faces +e_d.
                    if side == n {
                        triangles.push([a, b, c]);
                        triangles.push([a, c, e]);
                    } else {
                        triangles.push([a, c, b]);
                        triangles.push([a, e, c]);
                    }
                }
            }
        }
    }
    (points, triangles)
}

/// The boundary of a voxel solid by marching tetrahedra (Doi and Koide,
/// IEICE Trans. E74, 1991): each cube of eight neighbouring voxel centres is
/// cut into the six tetrahedra around its main diagonal, a triangulation that
/// neighbouring cubes share face for face, so the surface is closed. With 0/1
/// occupancy the iso-level 0.5 crosses each cut edge at its midpoint.
pub fn isosurface(solid: &Solid) -> Mesh {
    let g = &solid.grid;
    let [nl, na, nb] = g.dims;
    let mut mesh = Mesh::default();
    if nl < 2 || na < 2 || nb < 2 {
        return mesh;
    }
    let mut edge_vertex: HashMap<(usize, usize), u32> = HashMap::new();
    // The six tetrahedra: paths 000 → 111 adding the axes in each order.
    const ORDERS: [[usize; 3]; 6] = [[0, 1, 2], [0, 2, 1], [1, 0, 2], [1, 2, 0], [2, 0, 1], [2, 1, 0]];
    for ia in 0..na - 1 {
        for ib in 0..nb - 1 {
            for il in 0..nl - 1 {
                // Skip cubes that are all in or all out.
                let mut sum = 0;
                for c in 0..8 {
                    sum += solid.cells[g.index(il + (c & 1), ia + ((c >> 1) & 1), ib + ((c >> 2) & 1))];
                }
                if sum == 0 || sum == 8 {
                    continue;
                }
                for order in ORDERS {
                    let mut corner = [il, ia, ib];
                    let mut tet = [[0usize; 3]; 4];
                    tet[0] = corner;
                    for (k, &axis) in order.iter().enumerate() {
                        corner[axis] += 1;
                        tet[k + 1] = corner;
                    }
                    march_tetrahedron(solid, tet, &mut mesh, &mut edge_vertex);
                }
            }
        }
    }
    mesh
}

fn march_tetrahedron(
    solid: &Solid,
    tet: [[usize; 3]; 4],
    mesh: &mut Mesh,
    edge_vertex: &mut HashMap<(usize, usize), u32>,
) {
    let g = &solid.grid;
    let idx = tet.map(|c| g.index(c[0], c[1], c[2]));
    let inside = idx.map(|i| solid.cells[i] != 0);
    let (ins, outs): (Vec<usize>, Vec<usize>) = (0..4).partition(|&k| inside[k]);
    if ins.is_empty() || outs.is_empty() {
        return;
    }
    let pos = tet.map(|c| g.center(c[0], c[1], c[2]));
    let mut vertex = |a: usize, b: usize, mesh: &mut Mesh| -> u32 {
        let key = (idx[a].min(idx[b]), idx[a].max(idx[b]));
        *edge_vertex.entry(key).or_insert_with(|| {
            mesh.vertices.push([0, 1, 2].map(|d| 0.5 * (pos[a][d] + pos[b][d])));
            (mesh.vertices.len() - 1) as u32
        })
    };
    // Direction from the inside corners to the outside ones: the outward side.
    let centroid = |set: &[usize]| {
        let mut c = [0.0; 3];
        for &k in set {
            for d in 0..3 {
                c[d] += pos[k][d] / set.len() as f64;
            }
        }
        c
    };
    let (ci, co) = (centroid(&ins), centroid(&outs));
    let out_dir = [co[0] - ci[0], co[1] - ci[1], co[2] - ci[2]];
    let emit = |tri: [u32; 3], mesh: &mut Mesh| {
        let [p, q, r] = tri.map(|i| mesh.vertices[i as usize]);
        let u = [q[0] - p[0], q[1] - p[1], q[2] - p[2]];
        let v = [r[0] - p[0], r[1] - p[1], r[2] - p[2]];
        let n = [
            u[1] * v[2] - u[2] * v[1],
            u[2] * v[0] - u[0] * v[2],
            u[0] * v[1] - u[1] * v[0],
        ];
        let dot = n[0] * out_dir[0] + n[1] * out_dir[1] + n[2] * out_dir[2];
        mesh.triangles
            .push(if dot < 0.0 { [tri[0], tri[2], tri[1]] } else { tri });
    };
    match (ins.len(), outs.len()) {
        (1, 3) => {
            let a = ins[0];
            let t = [
                vertex(a, outs[0], mesh),
                vertex(a, outs[1], mesh),
                vertex(a, outs[2], mesh),
            ];
            emit(t, mesh);
        }
        (3, 1) => {
            let a = outs[0];
            let t = [
                vertex(a, ins[0], mesh),
                vertex(a, ins[1], mesh),
                vertex(a, ins[2], mesh),
            ];
            emit(t, mesh);
        }
        _ => {
            // Two in, two out: the cut is the quad through the four mixed edges,
            // in cyclic order i0o0, i0o1, i1o1, i1o0.
            let (i0, i1, o0, o1) = (ins[0], ins[1], outs[0], outs[1]);
            let q = [
                vertex(i0, o0, mesh),
                vertex(i0, o1, mesh),
                vertex(i1, o1, mesh),
                vertex(i1, o0, mesh),
            ];
            emit([q[0], q[1], q[2]], mesh);
            emit([q[0], q[2], q[3]], mesh);
        }
    }
}

/// Nearest boundary point in CIEDE2000, found by branch and bound: the
/// vertices are bucketed in cubes of `BUCKET` CIELAB units, each split into
/// cubes of `SUB_BUCKET`; buckets and, within them, sub-buckets are searched
/// vertex by vertex in the order of a lower bound on their vertices'
/// distance, until the bound passes the nearest vertex found; the triangles
/// around the best vertex are then sampled on a fine barycentric grid.
#[derive(Clone, Debug)]
pub struct Locator {
    mesh: Mesh,
    buckets: Vec<Bucket>,
    /// The largest bucket radius.
    bucket_radius: f64,
    /// Triangles around each vertex.
    around: Vec<Vec<u32>>,
}

#[derive(Clone, Debug)]
struct Bucket {
    centroid: LabD50,
    /// The largest CIELAB distance from the centroid to a vertex.
    radius: f64,
    subs: Vec<Sub>,
}

/// A sub-bucket: a `SUB_BUCKET` cube's vertices and their centroid.
#[derive(Clone, Debug)]
struct Sub {
    centroid: LabD50,
    /// The largest CIELAB distance from the centroid to a vertex.
    radius: f64,
    vertices: Vec<u32>,
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
        let radius = |c: LabD50, v: &[u32]| {
            v.iter()
                .map(|&i| crate::color::delta::delta_e76(c, LabD50::from_array(all[i as usize])))
                .fold(0.0, f64::max)
        };
        let buckets = cubes(0..all.len() as u32, all, BUCKET)
            .into_iter()
            .map(|vertices| {
                let c = centroid(&vertices, all);
                Bucket {
                    centroid: c,
                    radius: radius(c, &vertices),
                    subs: cubes(vertices.into_iter(), all, SUB_BUCKET)
                        .into_iter()
                        .map(|v| {
                            let sc = centroid(&v, all);
                            Sub {
                                centroid: sc,
                                radius: radius(sc, &v),
                                vertices: v,
                            }
                        })
                        .collect(),
                }
            })
            .collect::<Vec<Bucket>>();
        let mut around = vec![Vec::new(); mesh.vertices.len()];
        for (t, tri) in mesh.triangles.iter().enumerate() {
            for &v in tri {
                around[v as usize].push(t as u32);
            }
        }
        let bucket_radius = buckets.iter().map(|b| b.radius).fold(0.0, f64::max);
        Locator {
            mesh,
            buckets,
            bucket_radius,
            around,
        }
    }

    /// The mesh searched.
    pub fn mesh(&self) -> &Mesh {
        &self.mesh
    }

    /// The boundary point nearest to `lab` in CIEDE2000 and its distance;
    /// `None` for an empty mesh.
    pub fn nearest(&self, lab: LabD50) -> Option<(LabD50, f64)> {
        let mut best = self.nearest_vertex_bounded(lab)?;
        if best.0 > TIGHT_SEARCH_UP_TO {
            best = self.nearest_vertex_wide(lab)?;
        }
        self.refine(lab, best)
    }

    /// The nearest vertex by branch and bound: cells in the order of a lower
    /// bound on their vertices' distance, until the bound passes the nearest
    /// vertex found.
    fn nearest_vertex_bounded(&self, lab: LabD50) -> Option<(f64, u32)> {
        // A vertex of a cell with centroid c and radius r lies at least
        // d(c) − f·r from `lab`.
        let f = F_DE00_PER_DE_AB;
        let ranked = self.ranked(|b| delta_e00(lab, b.centroid) - f * b.radius);
        let mut best: Option<(f64, u32)> = None;
        let mut subs: Vec<(f64, &Sub)> = Vec::new();
        for (k, &(low, bi)) in ranked.iter().enumerate() {
            if k >= BUCKETS_SEARCHED && best.is_some_and(|(bd, _)| low > bd) {
                break;
            }
            subs.clear();
            subs.extend(
                self.buckets[bi]
                    .subs
                    .iter()
                    .map(|s| (delta_e00(lab, s.centroid) - f * s.radius, s)),
            );
            subs.sort_by(|a, b| a.0.total_cmp(&b.0));
            for &(low_sub, sub) in &subs {
                if best.is_some_and(|(bd, _)| low_sub > bd) {
                    break;
                }
                self.search_vertices(lab, &sub.vertices, &mut best);
            }
        }
        best
    }

    /// The nearest vertex with wide margins: every bucket whose centroid is
    /// within 2·f·r of the nearest bucket centroid, and in them every
    /// sub-bucket within 2·f·r of the nearest sub-bucket centroid.
    fn nearest_vertex_wide(&self, lab: LabD50) -> Option<(f64, u32)> {
        let f = F_DE00_PER_DE_AB;
        let ranked = self.ranked(|b| delta_e00(lab, b.centroid));
        let cut = ranked.first().map_or(0.0, |r| r.0) + 2.0 * f * self.bucket_radius;
        let subs: Vec<(f64, &Sub)> = ranked
            .iter()
            .enumerate()
            .take_while(|(k, r)| *k < BUCKETS_SEARCHED || r.0 <= cut)
            .flat_map(|(_, r)| self.buckets[r.1].subs.iter().map(|s| (delta_e00(lab, s.centroid), s)))
            .collect();
        let sub_radius = subs.iter().map(|s| s.1.radius).fold(0.0, f64::max);
        let sub_cut = subs.iter().map(|s| s.0).fold(f64::INFINITY, f64::min) + 2.0 * f * sub_radius;
        let mut best = None;
        for (_, sub) in subs.iter().filter(|s| s.0 <= sub_cut) {
            self.search_vertices(lab, &sub.vertices, &mut best);
        }
        best
    }

    /// The buckets by `key`, smallest first (ties by position), with it.
    fn ranked(&self, key: impl Fn(&Bucket) -> f64) -> Vec<(f64, usize)> {
        let mut r: Vec<(f64, usize)> = self.buckets.iter().enumerate().map(|(i, b)| (key(b), i)).collect();
        r.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)));
        r
    }

    fn search_vertices(&self, lab: LabD50, vertices: &[u32], best: &mut Option<(f64, u32)>) {
        for &v in vertices {
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn unit_cube_surface_encloses_volume_one() {
        // The unit cube's volume is 1 (definition); the divergence theorem is
        // exact for polyhedra.
        let (points, triangles) = cube_surface(5);
        let m = Mesh {
            vertices: points,
            triangles,
        };
        assert!((m.signed_volume() - 1.0).abs() < 1e-12, "{}", m.signed_volume());
        // A closed surface of 6·5² quads: 6·25·2 triangles, 6·25 + 2 vertices (Euler: V − E + F = 2).
        assert_eq!(m.triangles.len(), 300);
        assert_eq!(m.vertices.len(), 152);
    }
}
