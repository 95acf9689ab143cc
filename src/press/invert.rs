//! Inversion of the printing model (media-relative CIELAB → CMYK) with
//! black generation (the condition's [`super::spec::GcrCurve`]) and the total
//! area coverage limit: the projection onto the printable ink set, the
//! bounded least-squares solver and the CIEDE2000 residual form used for the
//! final refinement.
//!
//! The problem solved per target t (media-relative CIELAB):
//!
//!   minimise  ‖D(Lab(x), t)‖² + w·(x_K − K_gcr(t))²
//!   subject to 0 ≤ x_i ≤ 1 and x_C + x_M + x_Y + x_K ≤ TAC,
//!
//! with x the nominal ink fractions, D first the CIELAB difference vector
//! (ΔE*ab, CIE 015:2018) and then the CIEDE2000 residual vector
//! (`color::delta::delta_e00_residuals`). For a target outside the gamut
//! the minimiser is the printable colour closest to it in CIEDE2000. The
//! tables do not rely on that far from the gamut: each intent first maps
//! the target into the gamut ([`super::mapping`], hue-preserving in OKLab)
//! and inverts the mapped colour, so the minimum-ΔE solution only settles
//! the last fraction of a unit that the gamut descriptor cannot resolve.
//! ΔE*ab least squares finds the basin (smooth and well-scaled everywhere);
//! CIEDE2000 picks the final point of a target just outside.

use super::mapping::{Mapper, Method};
use super::model::PrintCondition;
use crate::color::delta::delta_e00_residuals;
use crate::color::LabD50;
use rayon::prelude::*;

/// Euclidean projection of `y` onto {x : 0 ≤ x_i ≤ 1, Σ x_i ≤ cap}.
///
/// KKT conditions of the projection (any convex-optimisation text): the
/// solution is x_i = clamp(y_i − τ, 0, 1) with τ = 0 if that is feasible,
/// otherwise the τ > 0 at which Σ x_i = cap. Σ clamp(y_i − τ, 0, 1) is
/// continuous and non-increasing in τ, so τ is found by bisection.
/// NaN components count as 0; `cap` ≤ 0 gives all zeros.
pub fn project_ink(y: [f64; 4], cap: f64) -> [f64; 4] {
    let y = y.map(|v| if v.is_nan() { 0.0 } else { v });
    let clip = |tau: f64| y.map(|v| (v - tau).clamp(0.0, 1.0));
    let sum = |x: [f64; 4]| x.iter().sum::<f64>();
    if cap <= 0.0 {
        return [0.0; 4];
    }
    if sum(clip(0.0)) <= cap {
        return clip(0.0);
    }
    let mut lo = 0.0;
    let mut hi = y.iter().fold(0.0f64, |m, v| m.max(*v));
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi {
            break;
        }
        if sum(clip(mid)) > cap {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    clip(hi)
}

/// The colour difference a solve minimises.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Metric {
    E76,
    E00,
}

/// The result of inverting one target.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct InkSolution {
    /// Nominal ink fractions C, M, Y, K (each 0..1, sum ≤ TAC).
    pub cmyk: [f64; 4],
    /// Media-relative CIELAB the model prints for `cmyk`.
    pub printed: LabD50,
    /// CIEDE2000 between target and `printed`: the clip residual.
    pub delta_e00: f64,
}

/// Sampled ink combinations used as starting points: a regular grid of
/// step 1/6 per ink inside the TAC limit, with their printed colours, and
/// the coarser subset of step 1/3 ranked by the slower ΔE00.
pub struct StartTable {
    cmyk: Vec<[f64; 4]>,
    lab: Vec<[f64; 3]>,
    coarse: Vec<usize>,
}

const START_STEPS: usize = 6;

impl StartTable {
    /// The start points of `cond`: the grid within its TAC limit, printed through its model.
    pub fn new(cond: &PrintCondition) -> Self {
        let cap = cond.tac_percent() / 100.0 + 1e-9;
        let mut cmyk = Vec::new();
        let n = START_STEPS;
        for c in 0..=n {
            for m in 0..=n {
                for y in 0..=n {
                    for k in 0..=n {
                        let x = [c, m, y, k].map(|v| v as f64 / n as f64);
                        if x.iter().sum::<f64>() <= cap {
                            cmyk.push(x);
                        }
                    }
                }
            }
        }
        let lab = cmyk.iter().map(|x| cond.lab_relative(*x).to_array()).collect();
        let coarse = (0..cmyk.len())
            .filter(|&i| cmyk[i].iter().all(|v| ((v * n as f64).round() as usize) % 2 == 0))
            .collect();
        StartTable { cmyk, lab, coarse }
    }

    /// Up to `count` samples of the coarse grid with the lowest exact
    /// ΔE00² + black-aim penalty, each at least 0.3 (max-norm in ink) away
    /// from those already taken.
    fn best_de00(&self, target: LabD50, k_aim: f64, weight: f64, count: usize) -> Vec<([f64; 4], f64)> {
        let scored: Vec<(f64, usize)> = self
            .coarse
            .iter()
            .map(|&i| {
                let d = crate::color::delta::delta_e00(target, LabD50::from_array(self.lab[i]));
                (d * d + weight * (self.cmyk[i][3] - k_aim).powi(2), i)
            })
            .collect();
        let scored = smallest_sorted(scored, count);
        let picked = self.distinct(scored.iter().map(|(_, i)| *i), count);
        picked
            .into_iter()
            .filter_map(|x| scored.iter().find(|(_, i)| self.cmyk[*i] == x).map(|(c, _)| (x, *c)))
            .collect()
    }

    fn distinct(&self, order: impl Iterator<Item = usize>, count: usize) -> Vec<[f64; 4]> {
        let mut out: Vec<[f64; 4]> = Vec::with_capacity(count);
        for i in order {
            let x = self.cmyk[i];
            let far = out
                .iter()
                .all(|o| o.iter().zip(x.iter()).map(|(a, b)| (a - b).abs()).fold(0.0, f64::max) >= 0.3);
            if far {
                out.push(x);
                if out.len() == count {
                    break;
                }
            }
        }
        out
    }

    /// Up to `count` samples with the lowest ΔE*ab² + black-aim penalty,
    /// each at least 0.3 (max-norm in ink) away from those already taken.
    fn best(&self, target: [f64; 3], k_aim: f64, weight: f64, count: usize) -> Vec<[f64; 4]> {
        let scored: Vec<(f64, usize)> = self
            .lab
            .iter()
            .enumerate()
            .map(|(i, l)| {
                let d = (l[0] - target[0]).powi(2) + (l[1] - target[1]).powi(2) + (l[2] - target[2]).powi(2);
                (d + weight * (self.cmyk[i][3] - k_aim).powi(2), i)
            })
            .collect();
        let scored = smallest_sorted(scored, count);
        self.distinct(scored.into_iter().map(|(_, i)| i), count)
    }
}

/// The 32·`count` smallest (cost, index) pairs in ascending order (ties by
/// index). The cut set is unique under this total order, so the result does
/// not depend on the selection algorithm. Should fewer than `count` samples
/// 0.3 apart be among them, fewer starts are used.
fn smallest_sorted(mut scored: Vec<(f64, usize)>, count: usize) -> Vec<(f64, usize)> {
    let order = |a: &(f64, usize), b: &(f64, usize)| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1));
    let keep = 32 * count.max(1);
    if scored.len() > keep {
        scored.select_nth_unstable_by(keep - 1, order);
        scored.truncate(keep);
    }
    scored.sort_by(order);
    scored
}

struct Problem<'a> {
    cond: &'a PrintCondition,
    target: LabD50,
    k_aim: f64,
    reg: f64,
    cap: f64,
    metric: Metric,
}

impl Problem<'_> {
    /// Residual vector (3 colour + 1 black-aim) and its 4×4 Jacobian.
    fn eval(&self, x: [f64; 4], with_jacobian: bool) -> ([f64; 4], [[f64; 4]; 4]) {
        let mut jac = [[0.0; 4]; 4];
        let (lab, dlab) = if with_jacobian {
            self.cond.lab_relative_with_jacobian(x)
        } else {
            (self.cond.lab_relative(x), [[0.0; 4]; 3])
        };
        let sr = self.reg.sqrt();
        let colour = match self.metric {
            Metric::E76 => {
                if with_jacobian {
                    jac[..3].copy_from_slice(&dlab);
                }
                [lab.l - self.target.l, lab.a - self.target.a, lab.b - self.target.b]
            }
            Metric::E00 => {
                let r = delta_e00_residuals(self.target, lab);
                if with_jacobian {
                    // ∂r/∂Lab by forward differences (step 1e-6 in CIELAB
                    // units, ample for Gauss–Newton steps), chained with
                    // the analytic ∂Lab/∂x.
                    let h = 1e-6;
                    let base = lab.to_array();
                    let mut drl = [[0.0; 3]; 3];
                    for q in 0..3 {
                        let mut up = base;
                        up[q] += h;
                        let ru = delta_e00_residuals(self.target, LabD50::from_array(up));
                        for row in 0..3 {
                            drl[row][q] = (ru[row] - r[row]) / h;
                        }
                    }
                    for row in 0..3 {
                        for i in 0..4 {
                            jac[row][i] = (0..3).map(|q| drl[row][q] * dlab[q][i]).sum();
                        }
                    }
                }
                r
            }
        };
        jac[3] = [0.0, 0.0, 0.0, sr];
        ([colour[0], colour[1], colour[2], sr * (x[3] - self.k_aim)], jac)
    }

    fn cost(r: &[f64; 4]) -> f64 {
        r.iter().map(|v| v * v).sum()
    }

    /// Projected Levenberg–Marquardt from `x0`.
    ///
    /// Each step solves (JᵀJ + μI)d = −Jᵀr over the free variables (those
    /// not held at a bound by a gradient pointing outward); when the point
    /// lies on the TAC face and the step would leave it, the step is solved
    /// on the face (equality Σd = 0 by a Lagrange multiplier). The trial
    /// point is projected onto the feasible set ([`project_ink`]) and
    /// accepted only if the cost falls; otherwise μ grows, which turns the
    /// step into a short projected-gradient step, a descent direction for
    /// any point that is not stationary; if even that fails, a
    /// projected-gradient line search is tried. Stops when no descent is
    /// found or the cost no longer improves.
    fn solve(&self, x0: [f64; 4], max_iter: usize) -> ([f64; 4], f64) {
        let mut x = project_ink(x0, self.cap);
        let (mut r, mut jac) = self.eval(x, true);
        let mut cost = Self::cost(&r);
        let mut mu = 1e-3;
        for _ in 0..max_iter {
            let mut g = [0.0; 4];
            let mut a = [[0.0; 4]; 4];
            for i in 0..4 {
                g[i] = (0..4).map(|q| jac[q][i] * r[q]).sum();
                for j in 0..4 {
                    a[i][j] = (0..4).map(|q| jac[q][i] * jac[q][j]).sum();
                }
            }
            // On the TAC face a bound is held only if the gradient shifted by
            // the face's multiplier ν still points outward (KKT); ν is
            // estimated from the variables strictly inside their bounds,
            // whose shifted gradient must vanish at a stationary point.
            let on_face = x.iter().sum::<f64>() >= self.cap - 1e-9;
            let nu = if on_face {
                let inner: Vec<f64> = (0..4).filter(|i| x[*i] > 0.0 && x[*i] < 1.0).map(|i| g[i]).collect();
                if inner.is_empty() {
                    0.0
                } else {
                    (-inner.iter().sum::<f64>() / inner.len() as f64).max(0.0)
                }
            } else {
                0.0
            };
            let free: [bool; 4] =
                std::array::from_fn(|i| !((x[i] <= 0.0 && g[i] + nu > 0.0) || (x[i] >= 1.0 && g[i] + nu < 0.0)));
            let mut accepted = None;
            while mu < 1e12 {
                let Some(mut d) = lm_step(&a, &g, mu, &free, None) else {
                    mu *= 4.0;
                    continue;
                };
                if on_face && d.iter().sum::<f64>() > 0.0 {
                    match lm_step(&a, &g, mu, &free, Some(0.0)) {
                        Some(df) => d = df,
                        None => {
                            mu *= 4.0;
                            continue;
                        }
                    }
                }
                let trial = project_ink(std::array::from_fn(|i| x[i] + d[i]), self.cap);
                let (rt, _) = self.eval(trial, false);
                let ct = Self::cost(&rt);
                if ct < cost {
                    accepted = Some((trial, ct));
                    mu = (mu / 3.0).max(1e-9);
                    break;
                }
                mu *= 4.0;
            }
            if accepted.is_none() {
                accepted = self.gradient_step(x, &g, cost);
            }
            let Some((trial, ct)) = accepted else { break };
            let gain = cost - ct;
            let step: f64 = trial
                .iter()
                .zip(x.iter())
                .map(|(a, b)| (a - b).abs())
                .fold(0.0, f64::max);
            x = trial;
            cost = ct;
            (r, jac) = self.eval(x, true);
            if gain <= 1e-10 * (1.0 + cost) || step < 1e-9 {
                break;
            }
        }
        (x, cost)
    }

    /// Fallback when the Levenberg–Marquardt steps find no descent: the
    /// projected-gradient path P(x − αg) with α halved until the cost falls
    /// (a descent for any small enough α unless x is stationary on the
    /// feasible set; Bertsekas, Nonlinear Programming, 2.3).
    fn gradient_step(&self, x: [f64; 4], g: &[f64; 4], cost: f64) -> Option<([f64; 4], f64)> {
        let norm = g.iter().map(|v| v * v).sum::<f64>().sqrt();
        if norm.is_nan() || norm <= 0.0 {
            return None;
        }
        let mut alpha = 0.5 / norm;
        for _ in 0..30 {
            let trial = project_ink(std::array::from_fn(|i| x[i] - alpha * g[i]), self.cap);
            let (rt, _) = self.eval(trial, false);
            let ct = Self::cost(&rt);
            if ct < cost {
                return Some((trial, ct));
            }
            alpha *= 0.5;
        }
        None
    }
}

/// Solves (A + μI)_ff d_f = −g_f over the free set, optionally with the
/// equality Σ d_f = `sum`. Small dense Gaussian elimination with partial
/// pivoting; `None` if singular.
fn lm_step(a: &[[f64; 4]; 4], g: &[f64; 4], mu: f64, free: &[bool; 4], sum: Option<f64>) -> Option<[f64; 4]> {
    let idx: Vec<usize> = (0..4).filter(|i| free[*i]).collect();
    let m = idx.len();
    if m == 0 {
        return None;
    }
    let size = m + usize::from(sum.is_some());
    let mut mat = [[0.0f64; 6]; 5];
    for (p, &i) in idx.iter().enumerate() {
        for (q, &j) in idx.iter().enumerate() {
            mat[p][q] = a[i][j] + if i == j { mu * (1.0 + a[i][i]) } else { 0.0 };
        }
        mat[p][size] = -g[i];
        if sum.is_some() {
            mat[p][m] = 1.0;
            mat[m][p] = 1.0;
        }
    }
    if let Some(s) = sum {
        mat[m][size] = s;
    }
    for col in 0..size {
        let piv = (col..size).max_by(|r1, r2| mat[*r1][col].abs().total_cmp(&mat[*r2][col].abs()))?;
        if mat[piv][col].abs() < 1e-300 {
            return None;
        }
        mat.swap(col, piv);
        let pivot_row = mat[col];
        for (row, line) in mat.iter_mut().enumerate().take(size) {
            if row != col {
                let f = line[col] / pivot_row[col];
                for (v, p) in line.iter_mut().zip(pivot_row.iter()).take(size + 1).skip(col) {
                    *v -= f * p;
                }
            }
        }
    }
    let mut d = [0.0; 4];
    for (p, &i) in idx.iter().enumerate() {
        d[i] = mat[p][size] / mat[p][p];
        if !d[i].is_finite() {
            return None;
        }
    }
    Some(d)
}

/// Inverts one media-relative target with the given start table.
///
/// Three ΔE*ab solves from the three best distinct grid samples; when the
/// target is not matched (ΔE*ab above 0.01, out of gamut) CIEDE2000 solves
/// from the ΔE*ab solution and from up to two of the best distinct coarse
/// samples by ΔE00, of which the lowest cost wins. The result depends only on `cond`, `table` and `target`.
pub fn invert_with(cond: &PrintCondition, table: &StartTable, target: LabD50) -> InkSolution {
    let gcr = cond.spec().gcr;
    let k_aim = gcr.black_for(target);
    let mut prob = Problem {
        cond,
        target,
        k_aim,
        reg: gcr.weight,
        cap: cond.tac_percent() / 100.0,
        metric: Metric::E76,
    };
    let mut best: Option<([f64; 4], f64)> = None;
    for start in table.best(target.to_array(), k_aim, gcr.weight, 3) {
        let (x, c) = prob.solve(start, 60);
        if best.is_none_or(|(_, bc)| c < bc) {
            best = Some((x, c));
        }
    }
    let (mut x, _) = best.unwrap_or(([0.0; 4], f64::INFINITY));
    let lab76 = cond.lab_relative(x);
    if crate::color::delta::delta_e76(lab76, target) > IN_GAMUT_E76 {
        // Out of gamut: the CIEDE2000 optimum may lie in another basin than
        // the ΔE*ab one, so start from that and from the two best distinct
        // samples by ΔE00, and keep the lowest ΔE00 cost.
        // A sample start is tried only when the sample itself is within a
        // factor 2 of the cost reached so far: a basin whose sampled point is
        // further off than that is taken as not lower (the coarse grid's
        // step keeps samples of a basin well inside that factor).
        prob.metric = Metric::E00;
        let cost00 = |x: [f64; 4]| Problem::cost(&prob.eval(x, false).0);
        let mut best00 = prob.solve(x, 40);
        for (start, c_start) in table.best_de00(target, k_aim, gcr.weight, 2) {
            if c_start < 2.0 * best00.1 {
                let (x00, c00) = prob.solve(start, 40);
                if c00 < best00.1 {
                    best00 = (x00, c00);
                }
            }
        }
        if best00.1 > cost00(x) {
            best00.0 = x;
        }
        x = best00.0;
    }
    let printed = cond.lab_relative(x);
    InkSolution {
        cmyk: x,
        printed,
        delta_e00: crate::color::delta::delta_e00(printed, target),
    }
}

/// Inverts one target for a rendering intent: the target is first mapped
/// into the press gamut by `method` ([`super::mapping`]), then inverted.
/// For the colorimetric clip an in-gamut target is inverted as it is, and a
/// target the descriptor counts as inside but the model cannot quite reach
/// keeps the minimum-ΔE solution of [`invert_with`] (a distance within the
/// descriptor's resolution, where CIEDE2000 is the right measure).
/// `delta_e00` is always between the printed colour and the original target.
pub fn invert_mapped(
    cond: &PrintCondition,
    table: &StartTable,
    mapper: &Mapper,
    method: Method,
    target: LabD50,
) -> InkSolution {
    let solve_for = |goal: LabD50| {
        let s = invert_with(cond, table, goal);
        InkSolution {
            delta_e00: crate::color::delta::delta_e00(s.printed, target),
            ..s
        }
    };
    match method {
        Method::HueClip => {
            if mapper.clearly_outside(target) {
                return solve_for(mapper.map(method, target));
            }
            let direct = invert_with(cond, table, target);
            if crate::color::delta::delta_e76(direct.printed, target) <= IN_GAMUT_E76 {
                return direct;
            }
            let goal = mapper.map(method, target);
            if goal == target {
                direct
            } else {
                solve_for(goal)
            }
        }
        Method::Compress | Method::KeepChroma => solve_for(mapper.map(method, target)),
    }
}

/// A target printed within this ΔE*ab counts as matched (in gamut).
pub const IN_GAMUT_E76: f64 = 0.01;

/// Inverts many targets in parallel for one rendering intent's mapping.
/// Each target is solved independently of the others, so the result does
/// not depend on the thread schedule.
pub fn invert_all_mapped(
    cond: &PrintCondition,
    mapper: &Mapper,
    method: Method,
    targets: &[LabD50],
) -> Vec<InkSolution> {
    let table = StartTable::new(cond);
    targets
        .par_iter()
        .map(|t| invert_mapped(cond, &table, mapper, method, *t))
        .collect()
}

/// Inverts one media-relative target (builds its own start table; for many
/// targets use [`invert_all_mapped`]).
pub fn invert(cond: &PrintCondition, target: LabD50) -> InkSolution {
    invert_with(cond, &StartTable::new(cond), target)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::color::delta::delta_e00;
    use crate::press::model::offset_coated;

    #[test]
    fn de00_residuals_square_to_ciede2000() {
        // Pairs and ΔE00 from the test data of Sharma, Wu and Dalal (2005),
        // Table 1 (values from memory): three of its pairs.
        let cases = [
            ((50.0, 2.6772, -79.7751), (50.0, 0.0, -82.7485), 2.0425),
            ((50.0, 0.0, 0.0), (50.0, -1.0, 2.0), 2.3669),
            ((50.0, 2.5, 0.0), (73.0, 25.0, -18.0), 27.1492),
        ];
        for (a, b, want) in cases {
            let (p, q) = (LabD50::new(a.0, a.1, a.2), LabD50::new(b.0, b.1, b.2));
            let r = delta_e00_residuals(p, q);
            let de = (r[0] * r[0] + r[1] * r[1] + r[2] * r[2]).sqrt();
            assert!((de - want).abs() < 1e-4, "{de} vs {want}");
            assert!((de - delta_e00(p, q)).abs() < 1e-9);
        }
    }

    #[test]
    fn projection_is_nearest_feasible_point() {
        // Optimality of a Euclidean projection onto a convex set (variational
        // inequality, any convex-analysis text): for every feasible z,
        // (y − p)·(z − p) ≤ 0.
        let ys = [
            [1.4, 0.9, 1.2, 0.3],
            [0.9, 0.9, 0.9, 0.9],
            [-0.2, 2.0, 0.5, 0.95],
            [0.2, 0.1, 0.3, 0.4],
        ];
        let cap = 3.3;
        for y in ys {
            let p = project_ink(y, cap);
            assert!(p.iter().all(|v| (0.0..=1.0).contains(v)) && p.iter().sum::<f64>() <= cap + 1e-12);
            for zi in 0..625 {
                let z: [f64; 4] = std::array::from_fn(|k| ((zi / 5usize.pow(k as u32)) % 5) as f64 / 4.0);
                if z.iter().sum::<f64>() > cap {
                    continue;
                }
                let ip: f64 = (0..4).map(|k| (y[k] - p[k]) * (z[k] - p[k])).sum();
                assert!(ip <= 1e-9, "{y:?} -> {p:?}, z {z:?}: {ip}");
            }
        }
    }

    #[test]
    fn in_gamut_targets_are_matched() {
        // Forward model then inversion: colours printed with ≤ 330 % ink are
        // in the gamut, so the minimum-ΔE solution must reproduce them.
        let c = offset_coated();
        let table = StartTable::new(&c);
        for x in [
            [0.2, 0.4, 0.6, 0.1],
            [0.7, 0.1, 0.05, 0.3],
            [0.5, 0.45, 0.45, 0.6],
            [0.0, 0.9, 0.8, 0.0],
        ] {
            let t = c.lab_relative(x);
            let s = invert_with(&c, &table, t);
            assert!(s.delta_e00 < 0.02, "{x:?}: {}", s.delta_e00);
            assert!(s.cmyk.iter().sum::<f64>() <= 3.3 + 1e-12);
        }
    }

    #[test]
    fn clip_is_no_worse_than_any_sample() {
        // A minimum-ΔE clip must not be beaten by any printable ink
        // combination; compare against a dense grid (step 1/10, TAC-limited).
        let c = offset_coated();
        let table = StartTable::new(&c);
        let targets = [
            LabD50::new(60.0, 90.0, 0.0),
            LabD50::new(30.0, -70.0, -60.0),
            LabD50::new(2.0, 0.0, 0.0),
            LabD50::new(95.0, -60.0, 100.0),
            LabD50::new(40.0, 0.0, -90.0),
            LabD50::new(20.0, 60.0, 60.0),
            LabD50::new(100.0, -128.0, 127.0),
            LabD50::new(0.0, 127.0, -128.0),
        ];
        // Plus 24 targets spread over the whole v4 Lab encoding range by a
        // fixed linear congruential sequence (Numerical Recipes constants).
        let mut seed: u32 = 12345;
        let mut next = || {
            seed = seed.wrapping_mul(1664525).wrapping_add(1013904223);
            seed as f64 / u32::MAX as f64
        };
        let mut targets = targets.to_vec();
        for _ in 0..24 {
            let (l, a, b) = (100.0 * next(), 255.0 * next() - 128.0, 255.0 * next() - 128.0);
            targets.push(LabD50::new(l, a, b));
        }
        let mut grid = Vec::new();
        for i in 0..11usize.pow(4) {
            let x: [f64; 4] = std::array::from_fn(|k| ((i / 11usize.pow(k as u32)) % 11) as f64 / 10.0);
            if x.iter().sum::<f64>() <= 3.3 + 1e-9 {
                grid.push(c.lab_relative(x));
            }
        }
        for t in targets {
            let s = invert_with(&c, &table, t);
            let best00 = grid.iter().map(|l| delta_e00(*l, t)).fold(f64::INFINITY, f64::min);
            assert!(
                s.delta_e00 <= best00 + 0.05,
                "{t:?}: {} vs grid {}",
                s.delta_e00,
                best00
            );
        }
    }
}
