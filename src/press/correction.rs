//! A smooth correction of the printing model from measurements: a regular
//! lattice over C, M, Y, K carrying a CIELAB offset at each node, read by
//! multilinear interpolation, and fitted to the model's residuals on the
//! measured patches by regularised least squares (lattice regression; Garcia
//! and Gupta 2009, "Lattice regression", NIPS 22):
//!
//!   minimise  (1/N) Σ_p |Σ_v w_pv·c_v − r_p|²  +  λ·(1/D) Σ (second differences of c along each axis)²
//!
//! with w_pv the multilinear weights of patch p, r_p its residual, N the
//! patches and D the difference terms. The second-difference penalty keeps
//! the correction smooth where the data is sparse and averages measurement
//! noise away; the node of unprinted paper is held at zero so that paper
//! stays exactly what the model makes it. The normal equations are solved by
//! conjugate gradients (Hestenes and Stiefel 1952) without forming the matrix.

/// A lattice of CIELAB offsets over the four inks (fractions 0..1).
#[derive(Clone, Debug, PartialEq)]
pub struct Correction {
    /// Nodes per axis.
    nodes: usize,
    /// Offset (ΔL*, Δa*, Δb*) per node; index ((c·g + m)·g + y)·g + k.
    values: Vec<[f64; 3]>,
}

/// The 16 nodes around a point and their multilinear weights, with the
/// derivative of each weight along each ink.
struct Cell {
    index: [usize; 16],
    weight: [f64; 16],
    grad: [[f64; 4]; 16],
}

fn cell(nodes: usize, cmyk: [f64; 4], with_grad: bool) -> Cell {
    let g = nodes;
    let span = (g - 1) as f64;
    let mut base = [0usize; 4];
    let mut frac = [0.0f64; 4];
    let mut inside = [false; 4];
    for i in 0..4 {
        let x = cmyk[i];
        inside[i] = (0.0..=1.0).contains(&x);
        let t = if x > 0.0 { x.min(1.0) } else { 0.0 } * span;
        let b = (t.floor() as usize).min(g - 2);
        base[i] = b;
        frac[i] = t - b as f64;
    }
    let mut c = Cell {
        index: [0; 16],
        weight: [0.0; 16],
        grad: [[0.0; 4]; 16],
    };
    for corner in 0..16 {
        let mut idx = 0;
        let mut w = 1.0;
        let mut f = [0.0; 4];
        let mut s = [0.0; 4];
        for i in 0..4 {
            let up = corner & (1 << (3 - i)) != 0;
            idx = idx * g + base[i] + usize::from(up);
            f[i] = if up { frac[i] } else { 1.0 - frac[i] };
            s[i] = if up { span } else { -span };
            w *= f[i];
        }
        c.index[corner] = idx;
        c.weight[corner] = w;
        if !with_grad {
            continue;
        }
        for i in 0..4 {
            if inside[i] {
                let mut d = s[i];
                for (j, fj) in f.iter().enumerate() {
                    if j != i {
                        d *= fj;
                    }
                }
                c.grad[corner][i] = d;
            }
        }
    }
    c
}

impl Correction {
    /// Fits the lattice (`nodes` per axis, at least 2) to `samples` of
    /// (CMYK fractions, CIELAB residual) with smoothing weight `lambda`.
    pub fn fit(samples: &[([f64; 4], [f64; 3])], nodes: usize, lambda: f64) -> Correction {
        let g = nodes.max(2);
        let m = g.pow(4);
        let cells: Vec<Cell> = samples.iter().map(|(c, _)| cell(g, *c, false)).collect();
        let n = samples.len().max(1) as f64;
        let terms = (4 * g.pow(3) * (g.saturating_sub(2))).max(1) as f64;
        let data_w = 1.0 / n;
        let smooth_w = lambda / terms;
        // WᵀW is sparse whatever the number of patches: a node meets only
        // the 3⁴ = 81 nodes of the cells around it. It is accumulated once,
        // keyed by node and neighbour offset, so that each product costs
        // O(nodes), not O(patches).
        let strides = [g * g * g, g * g, g, 1];
        let mut ata = vec![0.0f64; m * 81];
        for c in &cells {
            for a in 0..16 {
                for b in 0..16 {
                    let mut off = 0;
                    for i in 0..4 {
                        let bit = 1 << (3 - i);
                        let d = (b & bit != 0) as i32 - (a & bit != 0) as i32;
                        off = off * 3 + (d + 1) as usize;
                    }
                    ata[c.index[a] * 81 + off] += data_w * c.weight[a] * c.weight[b];
                }
            }
        }
        let delta: Vec<isize> = (0..81)
            .map(|off| {
                let mut o = off;
                let mut d = 0isize;
                for i in (0..4).rev() {
                    d += ((o % 3) as isize - 1) * strides[i] as isize;
                    o /= 3;
                }
                d
            })
            .collect();
        // A tiny ridge keeps the system positive definite where neither data
        // nor the penalty reaches (the multi-affine null space of second
        // differences with no data near it).
        let ridge = 1e-9;
        let apply = |v: &[f64], out: &mut [f64]| {
            for (a, o) in out.iter_mut().enumerate() {
                let row = &ata[a * 81..a * 81 + 81];
                let mut s = ridge * v[a];
                for (w, d) in row.iter().zip(&delta) {
                    if *w != 0.0 {
                        s += w * v[(a as isize + d) as usize];
                    }
                }
                *o = s;
            }
            second_differences_normal(g, v, smooth_w, out);
            out[0] = v[0];
        };
        let mut values = vec![[0.0; 3]; m];
        for ch in 0..3 {
            let mut rhs = vec![0.0; m];
            for (c, (_, r)) in cells.iter().zip(samples) {
                for (&i, &w) in c.index.iter().zip(&c.weight) {
                    rhs[i] += data_w * w * r[ch];
                }
            }
            rhs[0] = 0.0;
            let x = conjugate_gradients(&apply, &rhs, 4 * m);
            for (v, xi) in values.iter_mut().zip(x) {
                v[ch] = xi;
            }
        }
        values[0] = [0.0; 3];
        Correction { nodes: g, values }
    }

    /// Nodes per axis.
    pub fn nodes(&self) -> usize {
        self.nodes
    }

    /// The offset at `cmyk` (fractions, clamped to 0..1).
    pub fn eval(&self, cmyk: [f64; 4]) -> [f64; 3] {
        let c = cell(self.nodes, cmyk, false);
        let mut out = [0.0; 3];
        for (&i, &w) in c.index.iter().zip(&c.weight) {
            for (o, v) in out.iter_mut().zip(self.values[i]) {
                *o += w * v;
            }
        }
        out
    }

    /// The offset at `cmyk` and its derivative along each ink (rows ΔL*,
    /// Δa*, Δb*); zero along an ink outside 0..1.
    pub fn eval_with_gradient(&self, cmyk: [f64; 4]) -> ([f64; 3], [[f64; 4]; 3]) {
        let c = cell(self.nodes, cmyk, true);
        let mut out = [0.0; 3];
        let mut jac = [[0.0; 4]; 3];
        for k in 0..16 {
            let v = self.values[c.index[k]];
            for ((o, row), vc) in out.iter_mut().zip(jac.iter_mut()).zip(v) {
                *o += c.weight[k] * vc;
                for (j, g) in row.iter_mut().zip(c.grad[k]) {
                    *j += g * vc;
                }
            }
        }
        (out, jac)
    }

    /// The largest offset at any node, in ΔE*ab.
    pub fn largest_offset(&self) -> f64 {
        self.values
            .iter()
            .map(|v| (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt())
            .fold(0.0, f64::max)
    }
}

/// Adds w·DᵀD·v to `out`, D the second differences along each of the four
/// axes of a g⁴ lattice.
fn second_differences_normal(g: usize, v: &[f64], w: f64, out: &mut [f64]) {
    if g < 3 || w == 0.0 {
        return;
    }
    let strides = [g * g * g, g * g, g, 1];
    for &st in &strides {
        for idx in 0..v.len() {
            let pos = (idx / st) % g;
            if pos == 0 || pos == g - 1 {
                continue;
            }
            let (a, b, c) = (idx - st, idx, idx + st);
            let d = v[a] - 2.0 * v[b] + v[c];
            out[a] += w * d;
            out[b] -= 2.0 * w * d;
            out[c] += w * d;
        }
    }
}

/// Solves A·x = b for a symmetric positive definite A given as a product,
/// by conjugate gradients from x = 0, to a relative residual of 1e-10 or
/// `max_iter` steps.
fn conjugate_gradients(apply: &dyn Fn(&[f64], &mut [f64]), b: &[f64], max_iter: usize) -> Vec<f64> {
    let n = b.len();
    let mut x = vec![0.0; n];
    let mut r = b.to_vec();
    let mut p = r.clone();
    let mut ap = vec![0.0; n];
    let dot = |a: &[f64], b: &[f64]| a.iter().zip(b).map(|(x, y)| x * y).sum::<f64>();
    let b2 = dot(b, b);
    if b2 == 0.0 {
        return x;
    }
    let mut rr = b2;
    for _ in 0..max_iter {
        apply(&p, &mut ap);
        let pap = dot(&p, &ap);
        if pap <= 0.0 || !pap.is_finite() {
            break;
        }
        let alpha = rr / pap;
        for i in 0..n {
            x[i] += alpha * p[i];
            r[i] -= alpha * ap[i];
        }
        let rr_new = dot(&r, &r);
        if rr_new <= 1e-20 * b2 {
            break;
        }
        let beta = rr_new / rr;
        for i in 0..n {
            p[i] = r[i] + beta * p[i];
        }
        rr = rr_new;
    }
    x
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A smooth test field, zero at paper.
    fn field(c: [f64; 4]) -> [f64; 3] {
        [
            1.5 * c[0] * c[1] - 0.8 * c[3] * c[3],
            0.6 * (c[2] * 2.0).sin() * c[0],
            -0.9 * c[1] * c[2] + 0.3 * c[3],
        ]
    }

    fn grid(n: usize) -> Vec<[f64; 4]> {
        let mut v = Vec::new();
        for a in 0..n {
            for b in 0..n {
                for c in 0..n {
                    for d in 0..n {
                        let f = |i: usize| i as f64 / (n - 1) as f64;
                        v.push([f(a), f(b), f(c), f(d)]);
                    }
                }
            }
        }
        v
    }

    #[test]
    fn interpolation_reproduces_multilinear_functions() {
        // Multilinear interpolation is exact for functions that are affine
        // along each axis (its defining property); fit with no smoothing on
        // the nodes themselves, then read between them.
        let f = |c: [f64; 4]| [c[0] * c[1] + 0.5 * c[3], c[2] - c[0] * c[2] * c[3], 0.25 * c[1] * c[3]];
        let samples: Vec<_> = grid(5).into_iter().map(|c| (c, f(c))).collect();
        let corr = Correction::fit(&samples, 5, 0.0);
        for c in [[0.13, 0.71, 0.4, 0.9], [0.5, 0.5, 0.5, 0.5], [1.0, 0.0, 0.33, 0.66]] {
            let got = corr.eval(c);
            let want = f(c);
            for ch in 0..3 {
                assert!(
                    (got[ch] - want[ch]).abs() < 1e-6,
                    "{c:?} {ch}: {} vs {}",
                    got[ch],
                    want[ch]
                );
            }
        }
    }

    #[test]
    fn smoothing_averages_noise_away() {
        // Dense samples of a smooth field with ±0.5 alternating noise: the
        // fitted lattice lies much closer to the field than the noise.
        let pts = grid(9);
        let samples: Vec<_> = pts
            .iter()
            .enumerate()
            .map(|(i, &c)| {
                let mut r = field(c);
                let s = if i % 2 == 0 { 0.5 } else { -0.5 };
                r.iter_mut().for_each(|v| *v += s);
                (c, r)
            })
            .collect();
        let corr = Correction::fit(&samples, 5, 0.1);
        let mut worst: f64 = 0.0;
        for c in grid(7) {
            let (got, want) = (corr.eval(c), field(c));
            for ch in 0..3 {
                worst = worst.max((got[ch] - want[ch]).abs());
            }
        }
        assert!(worst < 0.25, "worst {worst}");
        // Paper stays exactly uncorrected.
        assert_eq!(corr.eval([0.0; 4]), [0.0; 3]);
    }

    #[test]
    fn gradient_matches_central_differences() {
        let samples: Vec<_> = grid(6).into_iter().map(|c| (c, field(c))).collect();
        let corr = Correction::fit(&samples, 6, 0.01);
        let h = 1e-7;
        for c in [[0.31, 0.52, 0.13, 0.77], [0.05, 0.95, 0.5, 0.21]] {
            let (_, jac) = corr.eval_with_gradient(c);
            for i in 0..4 {
                let (mut up, mut dn) = (c, c);
                up[i] += h;
                dn[i] -= h;
                let (u, d) = (corr.eval(up), corr.eval(dn));
                for ch in 0..3 {
                    let num = (u[ch] - d[ch]) / (2.0 * h);
                    assert!(
                        (num - jac[ch][i]).abs() < 1e-5,
                        "{c:?} {ch} {i}: {num} vs {}",
                        jac[ch][i]
                    );
                }
            }
        }
    }
}
