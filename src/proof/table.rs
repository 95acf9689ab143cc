//! The ΔE00 table shortcut: [`ExactModel`] evaluated on a grid over the
//! input device space and interpolated per pixel.

use rayon::prelude::*;

use super::ExactModel;

/// `[ΔE00, round-trip ΔE00]` tabulated over the input device space.
pub struct DeltaTable {
    channels: usize,
    /// Nodes per axis.
    n: usize,
    /// Node values; RGB nodes in order (r·n + g)·n + b.
    nodes: Vec<[f32; 2]>,
}

impl DeltaTable {
    /// Evaluates `model` at `n` evenly spaced device values per axis
    /// (0, 1/(n−1), …, 1).
    /// At least 2 nodes per axis, so every lookup has a cell. `None` for a
    /// CMYK model: CMYK is evaluated per pixel (see the module notes).
    pub fn build(model: &ExactModel, n: usize) -> Option<Self> {
        let n = n.max(2);
        let ch = model.channels;
        if ch == 4 {
            return None;
        }
        let count = if ch == 1 { n } else { n * n * n };
        let step = 1.0 / (n - 1) as f64;
        let device: Vec<f64> = (0..count)
            .flat_map(|i| {
                if ch == 1 {
                    vec![i as f64 * step]
                } else {
                    vec![
                        (i / (n * n)) as f64 * step,
                        (i / n % n) as f64 * step,
                        (i % n) as f64 * step,
                    ]
                }
            })
            .collect();
        let nodes: Vec<[f32; 2]> = device
            .par_chunks(ch * 4096)
            .flat_map_iter(|c| model.evaluate(c))
            .collect();
        Some(Self { channels: ch, n, nodes })
    }

    /// Nodes along each input axis of the grid.
    pub fn nodes_per_axis(&self) -> usize {
        self.n
    }

    /// Device channels of the table's input (1 grey, 3 RGB).
    pub fn channels(&self) -> usize {
        self.channels
    }

    /// Interpolated values at grey sample `v` of `max` (255 or 65535): linear.
    #[inline(always)]
    pub fn grey(&self, v: u32, max: f32) -> [f32; 2] {
        let p = v as f32 * ((self.n - 1) as f32 / max);
        let i = (p as usize).min(self.n - 2);
        let f = p - i as f32;
        let (a, b) = (self.nodes[i], self.nodes[i + 1]);
        [a[0] + (b[0] - a[0]) * f, a[1] + (b[1] - a[1]) * f]
    }

    /// Interpolated values at RGB samples of `max` (255 or 65535):
    /// tetrahedral interpolation in the grid cell (the six-tetrahedron split
    /// along the main diagonal; Kasson, Nin, Plouffe & Hafner, J. Electronic
    /// Imaging 4(4), 1995).
    #[inline(always)]
    pub fn rgb(&self, r: u32, g: u32, b: u32, max: f32) -> [f32; 2] {
        let n = self.n;
        let s = (n - 1) as f32 / max;
        let (pr, pg, pb) = (r as f32 * s, g as f32 * s, b as f32 * s);
        let ir = (pr as usize).min(n - 2);
        let ig = (pg as usize).min(n - 2);
        let ib = (pb as usize).min(n - 2);
        let (fx, fy, fz) = (pr - ir as f32, pg - ig as f32, pb - ib as f32);
        let (dx, dy, dz) = (n * n, n, 1);
        let base = (ir * n + ig) * n + ib;
        // (second corner, third corner, weights of corners 0..3)
        let (c1, c2, w) = if fx >= fy {
            if fy >= fz {
                (dx, dx + dy, [1.0 - fx, fx - fy, fy - fz, fz])
            } else if fx >= fz {
                (dx, dx + dz, [1.0 - fx, fx - fz, fz - fy, fy])
            } else {
                (dz, dx + dz, [1.0 - fz, fz - fx, fx - fy, fy])
            }
        } else if fz >= fy {
            (dz, dy + dz, [1.0 - fz, fz - fy, fy - fx, fx])
        } else if fz >= fx {
            (dy, dy + dz, [1.0 - fy, fy - fz, fz - fx, fx])
        } else {
            (dy, dx + dy, [1.0 - fy, fy - fx, fx - fz, fz])
        };
        let v0 = self.nodes[base];
        let v1 = self.nodes[base + c1];
        let v2 = self.nodes[base + c2];
        let v3 = self.nodes[base + dx + dy + dz];
        [
            w[0] * v0[0] + w[1] * v1[0] + w[2] * v2[0] + w[3] * v3[0],
            w[0] * v0[1] + w[1] * v1[1] + w[2] * v2[1] + w[3] * v3[1],
        ]
    }
}
