//! The voxel grid over CIELAB that holds gamut solids: rasterising device-face
//! tetrahedra and closed triangle meshes into it, filling enclosed cavities,
//! and the trilinear occupancy used by the inside test.
//!
//! Axes are CIELAB D50 in the order [L*, a*, b*]; the voxel size `h` is in
//! CIELAB units (ΔE*ab). Voxel (il, ia, ib) has its centre at
//! `origin + h·(il, ia, ib)`; storage runs L* fastest so that a column of
//! constant (a*, b*) is contiguous.

/// A regular grid of voxel centres over a box in CIELAB.
#[derive(Clone, Debug, PartialEq)]
pub struct Grid {
    /// Centre of voxel (0, 0, 0), CIELAB [L*, a*, b*].
    pub origin: [f64; 3],
    /// Edge length of a voxel, CIELAB units.
    pub h: f64,
    /// Voxel counts along [L*, a*, b*].
    pub dims: [usize; 3],
}

/// The most voxels a grid may hold: 2²⁷ (128 Mi, 128 MiB of cells). The
/// largest box a plausible device gamut spans (L* −5…101, a*, b* ±400; see
/// `gamut::PLAUSIBLE_LAB`) needs about 72 Mi voxels of 1 CIELAB unit with
/// the margins; real gamuts need 5 to 20 Mi. Indices then fit in `u32`.
pub const MAX_VOXELS: usize = 1 << 27;
const _: () = assert!(MAX_VOXELS <= u32::MAX as usize);

/// Why no grid covers a box.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum GridError {
    /// The box or voxel size cannot hold a grid.
    #[error(
        "cannot lay a voxel grid over the box {lo:?}…{hi:?} with voxels of {h} (not finite, inverted or not positive)"
    )]
    Degenerate {
        /// The box's low corner, CIELAB [L*, a*, b*].
        lo: [f64; 3],
        /// The box's high corner, CIELAB [L*, a*, b*].
        hi: [f64; 3],
        /// The voxel edge asked for, CIELAB units.
        h: f64,
    },
    /// The grid would have more voxels than the limit.
    #[error("a voxel grid of {dims} voxels of {h} CIELAB units would exceed the limit of {limit} voxels")]
    TooLarge {
        /// The voxel counts, "L × a × b".
        dims: String,
        /// The voxel edge, CIELAB units.
        h: f64,
        /// The most voxels allowed.
        limit: usize,
    },
}

/// Offsets (in voxels) that keep voxel centres off round CIELAB values, so
/// that mesh edges and vertices (the black point at a* = b* = 0, say) never
/// lie exactly on a column of centres. Any irrational-looking fractions do.
const JITTER: [f64; 3] = [0.137_921, 0.271_828, 0.314_159];

impl Grid {
    /// The grid of spacing `h` covering `lo..=hi` with two empty voxels of
    /// margin on every side. Refuses a box that is not finite and a grid of
    /// more than [`MAX_VOXELS`] voxels (the product is computed with checked
    /// arithmetic, so no size wraps around).
    pub fn covering(lo: [f64; 3], hi: [f64; 3], h: f64) -> Result<Grid, GridError> {
        let finite = lo.iter().chain(&hi).all(|v| v.is_finite());
        if !(finite && h.is_finite() && h > 0.0 && (0..3).all(|d| lo[d] <= hi[d])) {
            return Err(GridError::Degenerate { lo, hi, h });
        }
        let mut origin = [0.0; 3];
        let mut steps = [0.0; 3];
        for d in 0..3 {
            origin[d] = ((lo[d] / h).floor() - 2.0 + JITTER[d]) * h;
            steps[d] = ((hi[d] - origin[d]) / h).ceil() + 3.0;
        }
        let too_large = || GridError::TooLarge {
            dims: format!("{} × {} × {}", steps[0], steps[1], steps[2]),
            h,
            limit: MAX_VOXELS,
        };
        // Each count is finite and positive here; beyond the cap as a float,
        // it is refused before any conversion to an integer.
        if steps.iter().any(|&s| !(s >= 1.0 && s <= MAX_VOXELS as f64)) {
            return Err(too_large());
        }
        let dims = steps.map(|s| s as usize);
        dims[0]
            .checked_mul(dims[1])
            .and_then(|n| n.checked_mul(dims[2]))
            .filter(|&n| n <= MAX_VOXELS)
            .ok_or_else(too_large)?;
        Ok(Grid { origin, h, dims })
    }

    /// The number of voxels.
    pub fn len(&self) -> usize {
        self.dims[0] * self.dims[1] * self.dims[2]
    }

    /// True for a grid of no voxels.
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Index of voxel (il, ia, ib) in a cell vector: L* varies fastest, then b*, then a*.
    #[inline]
    pub fn index(&self, il: usize, ia: usize, ib: usize) -> usize {
        (ia * self.dims[2] + ib) * self.dims[0] + il
    }

    /// The CIELAB [L*, a*, b*] centre of voxel (il, ia, ib).
    #[inline]
    pub fn center(&self, il: usize, ia: usize, ib: usize) -> [f64; 3] {
        [
            self.origin[0] + self.h * il as f64,
            self.origin[1] + self.h * ia as f64,
            self.origin[2] + self.h * ib as f64,
        ]
    }

    /// Index range of voxel centres within `lo..=hi` along axis `d`.
    fn span(&self, d: usize, lo: f64, hi: f64) -> Option<(usize, usize)> {
        if !(lo.is_finite() && hi.is_finite()) {
            return None;
        }
        let a = ((lo - self.origin[d]) / self.h).ceil().max(0.0);
        let b = ((hi - self.origin[d]) / self.h).floor().min(self.dims[d] as f64 - 1.0);
        (a <= b).then_some((a as usize, b as usize))
    }
}

/// Bounding box of `points`; `None` when there are none or a coordinate is
/// not finite.
fn finite_box(points: &[[f64; 3]]) -> Option<([f64; 3], [f64; 3])> {
    let first = *points.first()?;
    let (mut lo, mut hi) = (first, first);
    for p in points {
        for d in 0..3 {
            if !p[d].is_finite() {
                return None;
            }
            lo[d] = lo[d].min(p[d]);
            hi[d] = hi[d].max(p[d]);
        }
    }
    Some((lo, hi))
}

/// Index ranges along [L*, a*, b*] of the voxel centres inside the
/// bounding box of `points`; `None` when the box holds no centre.
fn box_spans(grid: &Grid, points: &[[f64; 3]]) -> Option<[(usize, usize); 3]> {
    let (lo, hi) = finite_box(points)?;
    Some([
        grid.span(0, lo[0], hi[0])?,
        grid.span(1, lo[1], hi[1])?,
        grid.span(2, lo[2], hi[2])?,
    ])
}

/// Index ranges along a* and b* of the (a*, b*) columns inside the bounding
/// box of `points`, whatever its extent in L*.
fn column_spans(grid: &Grid, points: &[[f64; 3]]) -> Option<[(usize, usize); 2]> {
    let (lo, hi) = finite_box(points)?;
    Some([grid.span(1, lo[1], hi[1])?, grid.span(2, lo[2], hi[2])?])
}

fn span_len(s: (usize, usize)) -> u64 {
    (s.1 - s.0 + 1) as u64
}

/// How many voxel centres [`fill_tetrahedron`] tests for all of `tets`: the
/// sum of their bounding boxes' voxel counts on `grid` (saturating). Lets a
/// caller refuse a fill whose cost is out of proportion to the grid before
/// starting it.
pub fn tetrahedra_work(grid: &Grid, tets: &[[[f64; 3]; 4]]) -> u64 {
    tets.iter()
        .filter_map(|t| box_spans(grid, t))
        .map(|s| span_len(s[0]) * span_len(s[1]) * span_len(s[2]))
        .fold(0u64, u64::saturating_add)
}

/// How many (a*, b*) columns [`fill_closed_mesh`] tests for all of
/// `triangles`, each of which may record one crossing: the sum of their
/// bounding boxes' column counts on `grid` (saturating).
pub fn mesh_work(grid: &Grid, vertices: &[[f64; 3]], triangles: &[[u32; 3]]) -> u64 {
    triangles
        .iter()
        .filter_map(|tri| {
            let p = tri.map(|i| vertices.get(i as usize).copied());
            column_spans(grid, &[p[0]?, p[1]?, p[2]?])
        })
        .map(|s| span_len(s[0]) * span_len(s[1]))
        .fold(0u64, u64::saturating_add)
}

/// Marks every voxel whose centre lies in the tetrahedron `t` (CIELAB).
/// Degenerate (flat) tetrahedra and those with a coordinate that is not
/// finite mark nothing. The loop runs over the tetrahedron's bounding box
/// clipped to the grid, so it never exceeds `grid.len()` steps.
pub fn fill_tetrahedron(grid: &Grid, cells: &mut [u8], t: [[f64; 3]; 4]) {
    let e = |i: usize| [t[i][0] - t[0][0], t[i][1] - t[0][1], t[i][2] - t[0][2]];
    let (e1, e2, e3) = (e(1), e(2), e(3));
    let Some(inv) = invert_columns(e1, e2, e3) else {
        return;
    };
    let Some([sl, sa, sb]) = box_spans(grid, &t) else {
        return;
    };
    const EPS: f64 = 1e-9;
    for ia in sa.0..=sa.1 {
        for ib in sb.0..=sb.1 {
            for il in sl.0..=sl.1 {
                let c = grid.center(il, ia, ib);
                let r = [c[0] - t[0][0], c[1] - t[0][1], c[2] - t[0][2]];
                let u = inv[0][0] * r[0] + inv[0][1] * r[1] + inv[0][2] * r[2];
                let v = inv[1][0] * r[0] + inv[1][1] * r[1] + inv[1][2] * r[2];
                let w = inv[2][0] * r[0] + inv[2][1] * r[1] + inv[2][2] * r[2];
                if u >= -EPS && v >= -EPS && w >= -EPS && u + v + w <= 1.0 + EPS {
                    cells[grid.index(il, ia, ib)] = 1;
                }
            }
        }
    }
}

/// Inverse of the matrix whose columns are `c1, c2, c3`; `None` when it is
/// (numerically) singular.
fn invert_columns(c1: [f64; 3], c2: [f64; 3], c3: [f64; 3]) -> Option<[[f64; 3]; 3]> {
    let m = [[c1[0], c2[0], c3[0]], [c1[1], c2[1], c3[1]], [c1[2], c2[2], c3[2]]];
    let det = m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
        + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
    let scale = (c1[0].abs() + c1[1].abs() + c1[2].abs())
        * (c2[0].abs() + c2[1].abs() + c2[2].abs())
        * (c3[0].abs() + c3[1].abs() + c3[2].abs());
    if !det.is_finite() || det.abs() <= 1e-12 * scale {
        return None;
    }
    let mut inv = [[0.0; 3]; 3];
    for (i, row) in inv.iter_mut().enumerate() {
        for (j, v) in row.iter_mut().enumerate() {
            let (r0, r1) = ((j + 1) % 3, (j + 2) % 3);
            let (k0, k1) = ((i + 1) % 3, (i + 2) % 3);
            *v = (m[r0][k0] * m[r1][k1] - m[r0][k1] * m[r1][k0]) / det;
        }
    }
    Some(inv)
}

/// Marks the voxels whose centres lie inside a closed triangle mesh, by the
/// parity of its crossings along each L* column (Jordan–Brouwer: a ray from a
/// point inside a closed surface crosses it an odd number of times).
pub fn fill_closed_mesh(grid: &Grid, cells: &mut [u8], vertices: &[[f64; 3]], triangles: &[[u32; 3]]) {
    let (na, nb) = (grid.dims[1], grid.dims[2]);
    let mut hits: Vec<(u32, f64)> = Vec::new();
    for tri in triangles {
        let [p, q, r] = tri.map(|i| vertices[i as usize]);
        let Some([sa, sb]) = column_spans(grid, &[p, q, r]) else {
            continue;
        };
        // 2D barycentric coordinates in the (a*, b*) plane.
        let det = (q[1] - p[1]) * (r[2] - p[2]) - (r[1] - p[1]) * (q[2] - p[2]);
        if det == 0.0 || !det.is_finite() {
            continue;
        }
        for ia in sa.0..=sa.1 {
            for ib in sb.0..=sb.1 {
                let c = grid.center(0, ia, ib);
                let (x, y) = (c[1] - p[1], c[2] - p[2]);
                let s = (x * (r[2] - p[2]) - (r[1] - p[1]) * y) / det;
                let t = ((q[1] - p[1]) * y - x * (q[2] - p[2])) / det;
                if s >= 0.0 && t >= 0.0 && s + t <= 1.0 {
                    let l = p[0] + s * (q[0] - p[0]) + t * (r[0] - p[0]);
                    hits.push(((ia * nb + ib) as u32, l));
                }
            }
        }
    }
    hits.sort_by(|x, y| x.0.cmp(&y.0).then(x.1.total_cmp(&y.1)));
    let mut i = 0;
    while i < hits.len() {
        let col = hits[i].0;
        let mut j = i;
        while j < hits.len() && hits[j].0 == col {
            j += 1;
        }
        let (ia, ib) = (col as usize / nb, col as usize % nb);
        debug_assert!(ia < na);
        let mut k = i;
        while k + 1 < j {
            if let Some((l0, l1)) = grid.span(0, hits[k].1, hits[k + 1].1) {
                for il in l0..=l1 {
                    cells[grid.index(il, ia, ib)] = 1;
                }
            }
            k += 2;
        }
        i = j;
    }
}

/// Sets every empty voxel that cannot be reached from the grid's border
/// through empty voxels (6-connected): cavities enclosed by the solid.
/// `grid` holds at most [`MAX_VOXELS`] voxels, as every grid from
/// [`Grid::covering`] does.
pub fn fill_cavities(grid: &Grid, cells: &mut [u8]) {
    const OUTSIDE: u8 = 2;
    debug_assert!(grid.len() <= MAX_VOXELS);
    let [nl, na, nb] = grid.dims;
    let mut stack = Vec::new();
    // Indices fit in u32 (a grid holds at most MAX_VOXELS < 2³² voxels),
    // which halves the stack's worst case (every voxel empty).
    let push = |cells: &mut [u8], stack: &mut Vec<u32>, i: usize| {
        if cells[i] == 0 {
            cells[i] = OUTSIDE;
            stack.push(i as u32);
        }
    };
    for ia in 0..na {
        for ib in 0..nb {
            for il in 0..nl {
                if il == 0 || il == nl - 1 || ia == 0 || ia == na - 1 || ib == 0 || ib == nb - 1 {
                    push(cells, &mut stack, grid.index(il, ia, ib));
                }
            }
        }
    }
    let col = nl;
    let plane = nl * nb;
    while let Some(i) = stack.pop() {
        let i = i as usize;
        let il = i % nl;
        let ib = (i / nl) % nb;
        let ia = i / plane;
        if il > 0 {
            push(cells, &mut stack, i - 1);
        }
        if il + 1 < nl {
            push(cells, &mut stack, i + 1);
        }
        if ib > 0 {
            push(cells, &mut stack, i - col);
        }
        if ib + 1 < nb {
            push(cells, &mut stack, i + col);
        }
        if ia > 0 {
            push(cells, &mut stack, i - plane);
        }
        if ia + 1 < na {
            push(cells, &mut stack, i + plane);
        }
    }
    for c in cells.iter_mut() {
        *c = u8::from(*c != OUTSIDE);
    }
}

/// A gamut solid: which voxel centres of `grid` lie inside (1) or not (0).
#[derive(Clone, Debug)]
pub struct Solid {
    /// The grid the cells lie on.
    pub grid: Grid,
    /// 1 for a voxel centre inside, 0 outside, indexed by [`Grid::index`].
    pub cells: Vec<u8>,
}

impl Solid {
    /// The number of voxel centres inside.
    pub fn count(&self) -> usize {
        self.cells.iter().filter(|&&c| c != 0).count()
    }

    /// Volume in cubic CIELAB units: inside voxel centres times h³.
    pub fn volume(&self) -> f64 {
        self.count() as f64 * self.grid.h.powi(3)
    }

    /// How many 2 × 2 × 2 blocks of neighbouring voxels are neither all
    /// inside nor all outside: the cubes the boundary mesh passes through,
    /// each giving at most 12 triangles (marching tetrahedra, 6 per cube).
    pub fn boundary_cubes(&self) -> usize {
        let [nl, na, nb] = self.grid.dims;
        if nl < 2 || na < 2 || nb < 2 {
            return 0;
        }
        let g = &self.grid;
        let mut n = 0;
        for ia in 0..na - 1 {
            for ib in 0..nb - 1 {
                for il in 0..nl - 1 {
                    let mut sum = 0;
                    for c in 0..8 {
                        sum += self.cells[g.index(il + (c & 1), ia + ((c >> 1) & 1), ib + ((c >> 2) & 1))];
                    }
                    n += usize::from(sum != 0 && sum != 8);
                }
            }
        }
        n
    }

    fn at(&self, il: isize, ia: isize, ib: isize) -> f64 {
        let [nl, na, nb] = self.grid.dims;
        if il < 0 || ia < 0 || ib < 0 || il as usize >= nl || ia as usize >= na || ib as usize >= nb {
            return 0.0;
        }
        f64::from(self.cells[self.grid.index(il as usize, ia as usize, ib as usize)])
    }

    /// Trilinear interpolation of the 0/1 occupancy at `lab` (0 outside the
    /// grid). The surface `occupancy = 0.5` is the one the boundary mesh
    /// approximates.
    pub fn occupancy(&self, lab: [f64; 3]) -> f64 {
        let g = &self.grid;
        let u = [0, 1, 2].map(|d| (lab[d] - g.origin[d]) / g.h);
        if u.iter().any(|v| !v.is_finite()) {
            return 0.0;
        }
        let i0 = u.map(|v| v.floor());
        let f = [u[0] - i0[0], u[1] - i0[1], u[2] - i0[2]];
        let i = i0.map(|v| v.clamp(-2.0, 1e9) as isize);
        let mut sum = 0.0;
        for dl in 0..2 {
            for da in 0..2 {
                for db in 0..2 {
                    let w = (if dl == 1 { f[0] } else { 1.0 - f[0] })
                        * (if da == 1 { f[1] } else { 1.0 - f[1] })
                        * (if db == 1 { f[2] } else { 1.0 - f[2] });
                    if w > 0.0 {
                        sum += w * self.at(i[0] + dl, i[1] + da, i[2] + db);
                    }
                }
            }
        }
        sum
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tetrahedron_fill_matches_its_volume() {
        // Volume of a tetrahedron: |det(e1, e2, e3)| / 6 (elementary geometry).
        let t = [
            [10.0, 0.0, 0.0],
            [40.0, 5.0, 2.0],
            [15.0, 30.0, -3.0],
            [20.0, 4.0, 35.0],
        ];
        let e = |i: usize| [t[i][0] - t[0][0], t[i][1] - t[0][1], t[i][2] - t[0][2]];
        let (a, b, c) = (e(1), e(2), e(3));
        let det: f64 = a[0] * (b[1] * c[2] - b[2] * c[1]) - a[1] * (b[0] * c[2] - b[2] * c[0])
            + a[2] * (b[0] * c[1] - b[1] * c[0]);
        let exact = det.abs() / 6.0;
        let grid = Grid::covering([10.0, 0.0, -3.0], [40.0, 30.0, 35.0], 0.25).unwrap();
        let mut cells = vec![0; grid.len()];
        fill_tetrahedron(&grid, &mut cells, t);
        let v = cells.iter().filter(|&&c| c == 1).count() as f64 * 0.25f64.powi(3);
        assert!((v / exact - 1.0).abs() < 0.01, "voxel {v} vs exact {exact}");
    }

    #[test]
    fn cavity_fill_closes_a_hollow_box_only() {
        let grid = Grid::covering([0.0; 3], [10.0; 3], 1.0).unwrap();
        let mut cells = vec![0; grid.len()];
        let [nl, na, nb] = grid.dims;
        for ia in 3..na - 3 {
            for ib in 3..nb - 3 {
                for il in 3..nl - 3 {
                    let shell = [il, ia, ib]
                        .iter()
                        .zip([nl, na, nb])
                        .any(|(&i, n)| i == 3 || i == n - 4);
                    if shell {
                        cells[grid.index(il, ia, ib)] = 1;
                    }
                }
            }
        }
        let before = cells.iter().filter(|&&c| c == 1).count();
        fill_cavities(&grid, &mut cells);
        let after = cells.iter().filter(|&&c| c == 1).count();
        // A cube shell of side s encloses (s − 2)³ voxels (counting).
        let s = [nl - 6, na - 6, nb - 6];
        assert_eq!(after - before, (s[0] - 2) * (s[1] - 2) * (s[2] - 2));
    }

    #[test]
    fn covering_refuses_boxes_beyond_the_cap_and_not_finite() {
        assert!(matches!(
            Grid::covering([0.0; 3], [1e4; 3], 1.0),
            Err(GridError::TooLarge { .. })
        ));
        assert!(matches!(
            Grid::covering([0.0; 3], [f64::INFINITY, 1.0, 1.0], 1.0),
            Err(GridError::Degenerate { .. })
        ));
        assert!(matches!(
            Grid::covering([0.0; 3], [1.0; 3], 0.0),
            Err(GridError::Degenerate { .. })
        ));
        // One axis beyond usize as a float must not wrap to a small count.
        assert!(matches!(
            Grid::covering([0.0; 3], [1e300, 1.0, 1.0], 1.0),
            Err(GridError::TooLarge { .. })
        ));
        let g = Grid::covering([0.0, -100.0, -100.0], [100.0, 100.0, 100.0], 1.0).unwrap();
        assert!(g.len() <= MAX_VOXELS);
    }

    #[test]
    fn work_is_the_sum_of_bounding_boxes() {
        let grid = Grid::covering([0.0; 3], [20.0; 3], 1.0).unwrap();
        // A box of 10 × 10 × 10 CIELAB units holds 10 voxel centres per axis
        // (the centres are offset from whole numbers by the jitter).
        let t = [[5.0, 5.0, 5.0], [15.0, 5.0, 5.0], [5.0, 15.0, 5.0], [5.0, 5.0, 15.0]];
        assert_eq!(tetrahedra_work(&grid, &[t]), 1000);
        assert_eq!(tetrahedra_work(&grid, &[t, t]), 2000);
        let nan = [[f64::NAN; 3], t[1], t[2], t[3]];
        assert_eq!(tetrahedra_work(&grid, &[nan]), 0);
        // Columns are counted in the (a*, b*) plane only.
        let v = vec![t[1], t[2], t[3]];
        assert_eq!(mesh_work(&grid, &v, &[[0, 1, 2]]), 100);
        // Flat in L* it still crosses columns; flat in b* it crosses none.
        let level = vec![[5.0, 5.0, 5.0], [5.0, 15.0, 5.0], [5.0, 5.0, 15.0]];
        assert_eq!(mesh_work(&grid, &level, &[[0, 1, 2]]), 100);
        let flat = vec![t[0], t[1], t[2]];
        assert_eq!(mesh_work(&grid, &flat, &[[0, 1, 2]]), 0);
    }
}
