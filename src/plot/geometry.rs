//! Outlines drawn from a gamut: the chromaticity outline of a profile (the
//! primaries' triangle, or the traced boundary of the projected gamut), the
//! contours of a boundary mesh cut by a plane of constant L* (a*b* slices)
//! and by the plane through the neutral axis at one hue (hue leaves).

use std::collections::{BTreeMap, HashMap};

use crate::color::{LabD50, Xy};
use crate::gamut::mesh::Mesh;

/// A polyline or polygon in figure data units.
pub type Polyline = Vec<[f64; 2]>;

/// Edge of the chromaticity raster, xy units: 0.002 keeps the staircase of
/// the traced outline near one pixel at the figure's scale (common practice:
/// trace at about the output resolution).
pub const XY_CELL: f64 = 0.002;

/// Chromaticity of CIELAB D50 through XYZ; `None` for black (X + Y + Z
/// below 1e-6) or for a tristimulus value below −2 % of the sum (no real
/// colour has one; the small negative Z of a saturated red after chromatic
/// adaptation to D50 is kept).
pub fn lab_to_xy(lab: [f64; 3]) -> Option<Xy> {
    let xyz = LabD50::from_array(lab).to_xyz();
    let s = xyz.x + xyz.y + xyz.z;
    if s.is_nan() || s <= 1e-6 || [xyz.x, xyz.y, xyz.z].iter().any(|&v| v < -0.02 * s) {
        return None;
    }
    xyz.chromaticity()
}

/// Signed area of a closed polygon by the shoelace formula (positive when
/// counter-clockwise).
pub fn polygon_area(p: &[[f64; 2]]) -> f64 {
    let n = p.len();
    (0..n)
        .map(|i| {
            let (a, b) = (p[i], p[(i + 1) % n]);
            a[0] * b[1] - b[0] * a[1]
        })
        .sum::<f64>()
        / 2.0
}

/// True when `q` lies inside the closed polygon `p` (even–odd rule).
pub fn point_in_polygon(p: &[[f64; 2]], q: [f64; 2]) -> bool {
    let mut inside = false;
    let n = p.len();
    for i in 0..n {
        let (a, b) = (p[i], p[(i + 1) % n]);
        if (a[1] > q[1]) != (b[1] > q[1]) {
            let x = a[0] + (q[1] - a[1]) / (b[1] - a[1]) * (b[0] - a[0]);
            if q[0] < x {
                inside = !inside;
            }
        }
    }
    inside
}

/// Distance from `q` to the edges of the closed polygon `p`.
pub fn distance_to_polygon(p: &[[f64; 2]], q: [f64; 2]) -> f64 {
    let n = p.len();
    (0..n)
        .map(|i| {
            let (a, b) = (p[i], p[(i + 1) % n]);
            let d = [b[0] - a[0], b[1] - a[1]];
            let len2 = d[0] * d[0] + d[1] * d[1];
            let t = if len2 > 0.0 {
                (((q[0] - a[0]) * d[0] + (q[1] - a[1]) * d[1]) / len2).clamp(0.0, 1.0)
            } else {
                0.0
            };
            (q[0] - a[0] - t * d[0]).hypot(q[1] - a[1] - t * d[1])
        })
        .fold(f64::INFINITY, f64::min)
}

/// The outline of the chromaticities of every colour of a solid, from its
/// closed boundary mesh in CIELAB D50.
///
/// Every chromaticity of the solid is met on its boundary (the colours of
/// one chromaticity lie on a ray from black in XYZ, and a ray that enters a
/// solid crosses its boundary), so the set of chromaticities is the union of
/// the boundary triangles projected to xy. The projected triangles are
/// filled into a raster of `cell`-sized squares (a square is set when its
/// centre lies in a triangle or a corner of a triangle lies in it, so thin
/// slivers are kept), and the outer contour of the set squares is traced
/// along square edges: a concave outline, as exact as the raster. Triangles
/// with a corner at black or with negative XYZ have no chromaticity and are
/// skipped. Returns the outline counter-clockwise with collinear points
/// removed; empty for an empty mesh.
pub fn projected_outline(mesh: &Mesh, cell: f64) -> Vec<Xy> {
    if !(cell.is_finite() && cell > 0.0) {
        return Vec::new();
    }
    let xy: Vec<Option<[f64; 2]>> = mesh
        .vertices
        .iter()
        .map(|v| lab_to_xy(*v).map(|c| [c.x, c.y]))
        .collect();
    let (mut lo, mut hi) = ([f64::INFINITY; 2], [f64::NEG_INFINITY; 2]);
    for p in xy.iter().flatten() {
        for d in 0..2 {
            lo[d] = lo[d].min(p[d]);
            hi[d] = hi[d].max(p[d]);
        }
    }
    if !(lo[0].is_finite() && hi[0].is_finite()) {
        return Vec::new();
    }
    // Two empty squares of margin on every side.
    let origin = [lo[0] - 2.0 * cell, lo[1] - 2.0 * cell];
    let nx = ((hi[0] - origin[0]) / cell).ceil() as usize + 3;
    let ny = ((hi[1] - origin[1]) / cell).ceil() as usize + 3;
    let mut filled = vec![false; nx * ny];
    let to_cell = |p: [f64; 2]| [(p[0] - origin[0]) / cell, (p[1] - origin[1]) / cell];
    for t in &mesh.triangles {
        let Some(c) = t
            .iter()
            .map(|&i| xy[i as usize].map(to_cell))
            .collect::<Option<Vec<_>>>()
        else {
            continue;
        };
        for p in &c {
            let (i, j) = (p[0].floor() as usize, p[1].floor() as usize);
            if i < nx && j < ny {
                filled[j * nx + i] = true;
            }
        }
        let min = |d: usize| c.iter().map(|p| p[d]).fold(f64::INFINITY, f64::min);
        let max = |d: usize| c.iter().map(|p| p[d]).fold(f64::NEG_INFINITY, f64::max);
        let (i0, i1) = ((min(0) - 0.5).ceil().max(0.0) as usize, (max(0) - 0.5).floor());
        let (j0, j1) = ((min(1) - 0.5).ceil().max(0.0) as usize, (max(1) - 0.5).floor());
        if i1 < 0.0 || j1 < 0.0 {
            continue;
        }
        let (i1, j1) = ((i1 as usize).min(nx - 1), (j1 as usize).min(ny - 1));
        let edge =
            |a: [f64; 2], b: [f64; 2], q: [f64; 2]| (b[0] - a[0]) * (q[1] - a[1]) - (b[1] - a[1]) * (q[0] - a[0]);
        for j in j0..=j1 {
            for i in i0..=i1 {
                let q = [i as f64 + 0.5, j as f64 + 0.5];
                let e = [edge(c[0], c[1], q), edge(c[1], c[2], q), edge(c[2], c[0], q)];
                if e.iter().all(|&v| v >= 0.0) || e.iter().all(|&v| v <= 0.0) {
                    filled[j * nx + i] = true;
                }
            }
        }
    }
    let outline = trace_outer(&filled, nx, ny);
    outline
        .into_iter()
        .map(|[i, j]| Xy {
            x: origin[0] + i as f64 * cell,
            y: origin[1] + j as f64 * cell,
        })
        .collect()
}

/// The outer contour of the set squares of a raster (`filled[j·nx + i]`),
/// as square corners (i, j), counter-clockwise, collinear corners dropped.
/// Of several separate regions the one of largest area is returned. Square
/// edges are directed with the set square on their left; where two set
/// squares touch only at a corner the trace turns left, so each loop is
/// simple.
fn trace_outer(filled: &[bool], nx: usize, ny: usize) -> Vec<[i64; 2]> {
    let at = |i: i64, j: i64| {
        i >= 0 && j >= 0 && (i as usize) < nx && (j as usize) < ny && filled[j as usize * nx + i as usize]
    };
    // Directed edges keyed by their start corner, in a stable order.
    let mut out: BTreeMap<[i64; 2], Vec<[i64; 2]>> = BTreeMap::new();
    for j in 0..ny as i64 {
        for i in 0..nx as i64 {
            if !at(i, j) {
                continue;
            }
            if !at(i, j - 1) {
                out.entry([i, j]).or_default().push([i + 1, j]);
            }
            if !at(i + 1, j) {
                out.entry([i + 1, j]).or_default().push([i + 1, j + 1]);
            }
            if !at(i, j + 1) {
                out.entry([i + 1, j + 1]).or_default().push([i, j + 1]);
            }
            if !at(i - 1, j) {
                out.entry([i, j + 1]).or_default().push([i, j]);
            }
        }
    }
    let mut best: Vec<[i64; 2]> = Vec::new();
    let mut best_area = 0.0;
    while let Some((&start, _)) = out.iter().find(|(_, v)| !v.is_empty()) {
        let mut loop_pts = vec![start];
        let mut cur = start;
        let mut dir = [0i64, 0];
        while let Some(ends) = out.get_mut(&cur) {
            if ends.is_empty() {
                break;
            }
            // Prefer the left turn, then straight on, then right.
            let pick = (0..ends.len())
                .max_by_key(|&k| {
                    let d = [ends[k][0] - cur[0], ends[k][1] - cur[1]];
                    let cross = dir[0] * d[1] - dir[1] * d[0];
                    let dot = dir[0] * d[0] + dir[1] * d[1];
                    (cross, dot, std::cmp::Reverse(k))
                })
                .unwrap_or(0);
            let next = ends.remove(pick);
            dir = [next[0] - cur[0], next[1] - cur[1]];
            cur = next;
            if cur == start {
                break;
            }
            loop_pts.push(cur);
        }
        let pts: Vec<[f64; 2]> = loop_pts.iter().map(|p| [p[0] as f64, p[1] as f64]).collect();
        let area = polygon_area(&pts);
        if area > best_area {
            best_area = area;
            best = loop_pts;
        }
    }
    drop_collinear(best)
}

fn drop_collinear(p: Vec<[i64; 2]>) -> Vec<[i64; 2]> {
    let n = p.len();
    if n < 3 {
        return p;
    }
    (0..n)
        .filter(|&k| {
            let (a, b, c) = (p[(k + n - 1) % n], p[k], p[(k + 1) % n]);
            (b[0] - a[0]) * (c[1] - b[1]) - (b[1] - a[1]) * (c[0] - b[0]) != 0
        })
        .map(|k| p[k])
        .collect()
}

/// The section of a closed mesh by the surface `side(v) = 0`, as chained
/// polylines in the coordinates `coord(v)`.
///
/// A vertex is on the positive side when `side ≥ 0`, so every edge is
/// either cut once or not at all; a triangle with corners on both sides is
/// cut along the segment joining its two cut edges, at the linearly
/// interpolated points. Segments are chained through their shared cut edges;
/// on a closed mesh the chains close into loops (returned with the first
/// point repeated at the end), otherwise they stay open. Output order
/// follows the mesh's triangle order, so it is deterministic.
pub fn mesh_section(
    mesh: &Mesh,
    side: impl Fn([f64; 3]) -> f64,
    coord: impl Fn([f64; 3]) -> [f64; 2],
) -> Vec<Polyline> {
    let s: Vec<f64> = mesh.vertices.iter().map(|&v| side(v)).collect();
    let key = |a: u32, b: u32| (a.min(b), a.max(b));
    let cut = |a: u32, b: u32| {
        let (sa, sb) = (s[a as usize], s[b as usize]);
        let t = sa / (sa - sb);
        let (pa, pb) = (mesh.vertices[a as usize], mesh.vertices[b as usize]);
        coord([0, 1, 2].map(|d| pa[d] + t * (pb[d] - pa[d])))
    };
    // Segments as pairs of cut edges; neighbours of each cut edge.
    let mut segments: Vec<[(u32, u32); 2]> = Vec::new();
    for t in &mesh.triangles {
        let pos = t.map(|i| s[i as usize] >= 0.0);
        let mut edges = Vec::with_capacity(2);
        for k in 0..3 {
            let (a, b) = (t[k], t[(k + 1) % 3]);
            if pos[k] != pos[(k + 1) % 3] {
                edges.push(key(a, b));
            }
        }
        if edges.len() == 2 {
            segments.push([edges[0], edges[1]]);
        }
    }
    let mut by_edge: HashMap<(u32, u32), Vec<usize>> = HashMap::new();
    for (k, seg) in segments.iter().enumerate() {
        for e in seg {
            by_edge.entry(*e).or_default().push(k);
        }
    }
    let mut used = vec![false; segments.len()];
    let mut lines = Vec::new();
    for first in 0..segments.len() {
        if used[first] {
            continue;
        }
        used[first] = true;
        // Walk forward from the segment's second edge, then backward from its first.
        let walk = |start_edge: (u32, u32), used: &mut Vec<bool>| {
            let mut edges = Vec::new();
            let mut e = start_edge;
            loop {
                let next = by_edge.get(&e).and_then(|v| v.iter().copied().find(|&k| !used[k]));
                let Some(k) = next else { break };
                used[k] = true;
                let seg = segments[k];
                e = if seg[0] == e { seg[1] } else { seg[0] };
                edges.push(e);
            }
            edges
        };
        let [e0, e1] = segments[first];
        let fwd = walk(e1, &mut used);
        let closed = fwd.last() == Some(&e0);
        let mut chain: Vec<(u32, u32)> = Vec::new();
        if !closed {
            let mut back = walk(e0, &mut used);
            back.reverse();
            chain.extend(back);
        }
        chain.push(e0);
        chain.push(e1);
        // When closed, the walk ends at e0 again: the loop repeats its first point.
        chain.extend(fwd);
        let line: Polyline = chain.iter().map(|&(a, b)| cut(a, b)).collect();
        if line.len() >= 2 {
            lines.push(line);
        }
    }
    lines
}

/// The a*b* contour of a CIELAB boundary mesh at lightness `l`: the section
/// by the plane L* = l, in (a*, b*).
pub fn lightness_slice(mesh: &Mesh, l: f64) -> Vec<Polyline> {
    mesh_section(mesh, |v| v[0] - l, |v| [v[1], v[2]])
}

/// The hue leaf of a CIELAB boundary mesh at hue angle `hue_deg`: the
/// section by the plane through the neutral axis containing that hue, in
/// (t, L*) where t = a*·cos h + b*·sin h is the signed chroma along the hue
/// (t ≥ 0 is the leaf at `hue_deg`, t < 0 the opposite leaf at h + 180°;
/// a figure clips to t ≥ 0).
pub fn hue_leaf(mesh: &Mesh, hue_deg: f64) -> Vec<Polyline> {
    let (s, c) = hue_deg.to_radians().sin_cos();
    mesh_section(
        mesh,
        move |v| -v[1] * s + v[2] * c,
        move |v| [v[1] * c + v[2] * s, v[0]],
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::gamut::mesh::cube_surface;

    fn unit_cube() -> Mesh {
        let (vertices, triangles) = cube_surface(4);
        Mesh { vertices, triangles }
    }

    #[test]
    fn section_of_the_unit_cube_is_the_unit_square() {
        // A plane across the unit cube cuts a unit square (geometry: area 1,
        // perimeter 4), whatever the triangulation.
        let m = unit_cube();
        for level in [0.3, 0.5, 0.9] {
            let loops = mesh_section(&m, |v| v[0] - level, |v| [v[1], v[2]]);
            assert_eq!(loops.len(), 1);
            let l = &loops[0];
            assert_eq!(l.first(), l.last(), "closed");
            assert!((polygon_area(l).abs() - 1.0).abs() < 1e-12, "{}", polygon_area(l));
            let perimeter: f64 = l.windows(2).map(|w| (w[1][0] - w[0][0]).hypot(w[1][1] - w[0][1])).sum();
            assert!((perimeter - 4.0).abs() < 1e-12);
        }
        assert!(mesh_section(&m, |v| v[0] - 2.0, |v| [v[1], v[2]]).is_empty());
    }

    #[test]
    fn raster_trace_keeps_the_outer_loop_of_the_largest_region() {
        // A 4 × 4 block with a hole, and a lone square elsewhere: the outer
        // loop is the block's square of area 16 (counted by hand).
        let (nx, ny) = (10, 8);
        let mut f = vec![false; nx * ny];
        for j in 1..5 {
            for i in 1..5 {
                f[j * nx + i] = !(i == 2 && j == 2);
            }
        }
        f[6 * nx + 8] = true;
        let l = trace_outer(&f, nx, ny);
        let pts: Vec<[f64; 2]> = l.iter().map(|p| [p[0] as f64, p[1] as f64]).collect();
        assert_eq!(pts.len(), 4, "{pts:?}");
        assert_eq!(polygon_area(&pts), 16.0);
    }

    #[test]
    fn polygon_helpers() {
        let sq = [[0.0, 0.0], [2.0, 0.0], [2.0, 2.0], [0.0, 2.0]];
        assert_eq!(polygon_area(&sq), 4.0);
        assert!(point_in_polygon(&sq, [1.0, 1.0]) && !point_in_polygon(&sq, [3.0, 1.0]));
        assert!((distance_to_polygon(&sq, [3.0, 1.0]) - 1.0).abs() < 1e-12);
    }

    #[test]
    fn black_has_no_chromaticity_and_white_is_d50() {
        assert!(lab_to_xy([0.0, 0.0, 0.0]).is_none());
        // D50 white (ICC.1:2010 PCS illuminant 0.9642, 1, 0.8249) as xy.
        let c = lab_to_xy([100.0, 0.0, 0.0]).unwrap();
        let s = 0.9642 + 1.0 + 0.8249;
        assert!((c.x - 0.9642 / s).abs() < 1e-9 && (c.y - 1.0 / s).abs() < 1e-9);
    }
}
