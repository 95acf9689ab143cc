//! Closed triangle meshes of gamut boundaries in CIELAB: the image of the RGB
//! cube's six faces, the isosurface of a voxel solid (marching tetrahedra),
//! enclosed volume by the divergence theorem (the nearest boundary point is
//! [`super::locate`]).

use std::collections::HashMap;

use super::grid::Solid;

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
    isosurface_placed(solid, None)
}

/// [`isosurface`] with each vertex moved along its cut edge to where a
/// smoothed occupancy crosses one half, for figures: the 0/1 occupancy puts
/// every vertex at an edge midpoint, so a gently sloping boundary comes out
/// as steps of one voxel. The smoothed occupancy at a voxel centre is the
/// share of inside voxels among its 3 × 3 × 3 neighbourhood, a stand-in for
/// the signed distance to the boundary within a voxel and a half of it (for
/// a plane it rises linearly across it). Which edges are cut, and so the
/// triangles and the closed surface, stay those of [`isosurface`]; only the
/// vertex positions move, never past their edge.
pub fn smooth_isosurface(solid: &Solid) -> Mesh {
    let field = neighbourhood_share(solid);
    isosurface_placed(solid, Some(&field))
}

/// The share of inside voxels in each voxel's 3 × 3 × 3 neighbourhood
/// (voxels outside the grid count as outside), by three passes of a 3-tap
/// box sum.
fn neighbourhood_share(solid: &Solid) -> Vec<f32> {
    let g = &solid.grid;
    let dims = g.dims;
    let mut f: Vec<f32> = solid.cells.iter().map(|&c| f32::from(c)).collect();
    let mut next = vec![0f32; f.len()];
    for axis in 0..3 {
        for il in 0..dims[0] {
            for ia in 0..dims[1] {
                for ib in 0..dims[2] {
                    let c = [il, ia, ib];
                    let mut sum = f[g.index(il, ia, ib)];
                    if c[axis] > 0 {
                        let mut d = c;
                        d[axis] -= 1;
                        sum += f[g.index(d[0], d[1], d[2])];
                    }
                    if c[axis] + 1 < dims[axis] {
                        let mut d = c;
                        d[axis] += 1;
                        sum += f[g.index(d[0], d[1], d[2])];
                    }
                    next[g.index(il, ia, ib)] = sum / 3.0;
                }
            }
        }
        std::mem::swap(&mut f, &mut next);
    }
    f
}

fn isosurface_placed(solid: &Solid, field: Option<&[f32]>) -> Mesh {
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
                    march_tetrahedron(solid, field, tet, &mut mesh, &mut edge_vertex);
                }
            }
        }
    }
    mesh
}

fn march_tetrahedron(
    solid: &Solid,
    field: Option<&[f32]>,
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
            // Where the field crosses one half between the two ends (one
            // in, one out); the midpoint without a field, or when the
            // smoothed field does not fall from the inside end to the
            // outside one.
            let t = field.and_then(|f| {
                let (fa, fb) = (f64::from(f[idx[a]]), f64::from(f[idx[b]]));
                let (fin, fout, from_a) = if inside[a] { (fa, fb, true) } else { (fb, fa, false) };
                (fin > fout).then(|| {
                    let s = ((fin - 0.5) / (fin - fout)).clamp(0.0, 1.0);
                    if from_a {
                        s
                    } else {
                        1.0 - s
                    }
                })
            });
            mesh.vertices.push(match t {
                Some(t) => [0, 1, 2].map(|d| pos[a][d] + t * (pos[b][d] - pos[a][d])),
                None => [0, 1, 2].map(|d| 0.5 * (pos[a][d] + pos[b][d])),
            });
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
