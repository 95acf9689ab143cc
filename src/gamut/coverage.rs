//! Coverage: how much of one gamut solid lies inside another, on a shared
//! voxel grid.

use serde::Serialize;

use super::*;

/// How much of gamut `a` lies inside gamut `b`.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Coverage {
    /// The name of the profile whose gamut is measured.
    pub a: String,
    /// The name of the profile whose gamut it is measured against.
    pub b: String,
    /// |A ∩ B| / |A|, 0..1.
    pub a_inside_b: f64,
    /// |A ∩ B| in cubic CIELAB units.
    pub intersection_volume: f64,
}

/// Largest number of voxels in a shared coverage grid; beyond it the voxel
/// grows (wide gamuts such as ROMM RGB span a large box).
pub const COVERAGE_MAX_VOXELS: f64 = 8.0e6;

/// Coverage both ways between two gamuts, counted on one shared voxel grid
/// of edge at least `voxel`.
pub fn coverage_pair(a: &Gamut, b: &Gamut, voxel: f64) -> Result<(Coverage, Coverage), GamutError> {
    let lo = [0, 1, 2].map(|d| a.lo[d].min(b.lo[d]));
    let hi = [0, 1, 2].map(|d| a.hi[d].max(b.hi[d]));
    let box_volume: f64 = (0..3).map(|d| hi[d] - lo[d] + 4.0 * voxel).product();
    let h = voxel.max((box_volume / COVERAGE_MAX_VOXELS).cbrt());
    let grid = Grid::covering(lo, hi, h).map_err(|source| GamutError::CoverageGrid {
        a: a.name.clone(),
        b: b.name.clone(),
        source,
    })?;
    let (sa, sb) = rayon::join(|| a.rasterise_on(grid.clone()), || b.rasterise_on(grid.clone()));
    let (mut na, mut nb, mut nab) = (0usize, 0usize, 0usize);
    for (x, y) in sa.cells.iter().zip(&sb.cells) {
        na += usize::from(*x != 0);
        nb += usize::from(*y != 0);
        nab += usize::from(*x != 0 && *y != 0);
    }
    let v = h.powi(3);
    let share = |n: usize| if n == 0 { 0.0 } else { nab as f64 / n as f64 };
    Ok((
        Coverage {
            a: a.name.clone(),
            b: b.name.clone(),
            a_inside_b: share(na),
            intersection_volume: nab as f64 * v,
        },
        Coverage {
            a: b.name.clone(),
            b: a.name.clone(),
            a_inside_b: share(nb),
            intersection_volume: nab as f64 * v,
        },
    ))
}

/// Every ordered pair (A, B) with A ≠ B, A in input order, then B.
pub fn coverage_all(gamuts: &[Gamut], voxel: f64) -> Result<Vec<Coverage>, GamutError> {
    let n = gamuts.len();
    let mut table: Vec<Option<Coverage>> = vec![None; n * n];
    for i in 0..n {
        for j in i + 1..n {
            let (ab, ba) = coverage_pair(&gamuts[i], &gamuts[j], voxel)?;
            table[i * n + j] = Some(ab);
            table[j * n + i] = Some(ba);
        }
    }
    Ok(table.into_iter().flatten().collect())
}
