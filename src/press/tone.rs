//! Measured tone curves: a monotone, continuously differentiable curve
//! through measured points, by the piecewise cubic Hermite interpolation of
//! Fritsch and Carlson (1980, "Monotone piecewise cubic interpolation",
//! SIAM J. Numer. Anal. 17(2), 238–246): the slopes at the knots are limited
//! so that the curve never overshoots between monotone data.

/// A monotone non-decreasing curve on 0..1 through knots (x_k, y_k).
#[derive(Clone, Debug, PartialEq)]
pub struct MonotoneCurve {
    x: Vec<f64>,
    y: Vec<f64>,
    /// The slope at each knot.
    m: Vec<f64>,
}

impl MonotoneCurve {
    /// The curve through `points`, which must have strictly increasing x and
    /// non-decreasing y (at least two points); `None` otherwise.
    pub fn new(points: &[(f64, f64)]) -> Option<MonotoneCurve> {
        let n = points.len();
        if n < 2 {
            return None;
        }
        let ok = points.iter().all(|(x, y)| x.is_finite() && y.is_finite())
            && points.windows(2).all(|w| w[1].0 > w[0].0 && w[1].1 >= w[0].1);
        if !ok {
            return None;
        }
        let x: Vec<f64> = points.iter().map(|p| p.0).collect();
        let y: Vec<f64> = points.iter().map(|p| p.1).collect();
        let d: Vec<f64> = (0..n - 1).map(|k| (y[k + 1] - y[k]) / (x[k + 1] - x[k])).collect();
        // Step 1 of Fritsch–Carlson: three-point slopes inside, one-sided at
        // the ends; zero where the data is flat on either side.
        let mut m = vec![0.0; n];
        m[0] = d[0];
        m[n - 1] = d[n - 2];
        for k in 1..n - 1 {
            m[k] = if d[k - 1] == 0.0 || d[k] == 0.0 {
                0.0
            } else {
                0.5 * (d[k - 1] + d[k])
            };
        }
        // Step 2: limit (α, β) = (m_k, m_k+1)/Δ_k to the circle of radius 3,
        // which is sufficient for monotonicity (their section 4).
        for k in 0..n - 1 {
            if d[k] == 0.0 {
                m[k] = 0.0;
                m[k + 1] = 0.0;
                continue;
            }
            let a = m[k] / d[k];
            let b = m[k + 1] / d[k];
            let r = a.hypot(b);
            if r > 3.0 {
                let t = 3.0 / r;
                m[k] = t * a * d[k];
                m[k + 1] = t * b * d[k];
            }
        }
        Some(MonotoneCurve { x, y, m })
    }

    /// The knots the curve passes through.
    pub fn knots(&self) -> impl Iterator<Item = (f64, f64)> + '_ {
        self.x.iter().copied().zip(self.y.iter().copied())
    }

    /// The curve's value and slope at `t`, held constant (slope 0) outside
    /// the knots; at the end knots the slope is the one-sided one from
    /// inside. NaN counts as below the first knot.
    pub fn eval(&self, t: f64) -> (f64, f64) {
        let n = self.x.len();
        if t.is_nan() || t < self.x[0] {
            return (self.y[0], 0.0);
        }
        if t > self.x[n - 1] {
            return (self.y[n - 1], 0.0);
        }
        let k = (self.x.partition_point(|&v| v <= t).max(1) - 1).min(n - 2);
        let h = self.x[k + 1] - self.x[k];
        let s = (t - self.x[k]) / h;
        let (s2, s3) = (s * s, s * s * s);
        // Cubic Hermite basis on [x_k, x_k+1].
        let h00 = 2.0 * s3 - 3.0 * s2 + 1.0;
        let h10 = s3 - 2.0 * s2 + s;
        let h01 = -2.0 * s3 + 3.0 * s2;
        let h11 = s3 - s2;
        let v = h00 * self.y[k] + h10 * h * self.m[k] + h01 * self.y[k + 1] + h11 * h * self.m[k + 1];
        let d00 = (6.0 * s2 - 6.0 * s) / h;
        let d10 = 3.0 * s2 - 4.0 * s + 1.0;
        let d01 = (-6.0 * s2 + 6.0 * s) / h;
        let d11 = 3.0 * s2 - 2.0 * s;
        let dv = d00 * self.y[k] + d10 * self.m[k] + d01 * self.y[k + 1] + d11 * self.m[k + 1];
        (v, dv)
    }
}

/// Least-squares monotone (non-decreasing) fit to `y` with weights `w`, by
/// pool-adjacent-violators (isotonic regression; Barlow, Bartholomew,
/// Bremner and Brunk 1972, "Statistical inference under order
/// restrictions"). The result has the length of `y`.
pub fn isotonic(y: &[f64], w: &[f64]) -> Vec<f64> {
    // Blocks of (mean, weight, count), merged while they violate the order.
    let mut blocks: Vec<(f64, f64, usize)> = Vec::with_capacity(y.len());
    for (&v, &wt) in y.iter().zip(w) {
        blocks.push((v, wt, 1));
        while blocks.len() > 1 {
            let (m1, w1, c1) = blocks[blocks.len() - 1];
            let (m0, w0, c0) = blocks[blocks.len() - 2];
            if m0 <= m1 {
                break;
            }
            blocks.pop();
            let wsum = w0 + w1;
            *blocks.last_mut().expect("two blocks") = ((m0 * w0 + m1 * w1) / wsum, wsum, c0 + c1);
        }
    }
    blocks.iter().flat_map(|&(m, _, c)| std::iter::repeat_n(m, c)).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn passes_through_its_knots_and_stays_monotone() {
        // Monotone data with a flat step and a sharp rise, the case
        // Fritsch and Carlson's limiter exists for: no overshoot anywhere.
        let pts = [(0.0, 0.0), (0.1, 0.3), (0.2, 0.3), (0.5, 0.35), (0.6, 0.9), (1.0, 1.0)];
        let c = MonotoneCurve::new(&pts).unwrap();
        for &(x, y) in &pts {
            assert!((c.eval(x).0 - y).abs() < 1e-12);
        }
        let mut last = -1.0;
        for i in 0..=1000 {
            let (v, d) = c.eval(i as f64 / 1000.0);
            assert!(v >= last - 1e-12 && d >= -1e-12, "at {i}: {v} after {last}, slope {d}");
            last = v;
        }
        // Flat between equal knots (their Lemma 2: zero slopes there).
        assert!((c.eval(0.15).0 - 0.3).abs() < 1e-12);
    }

    #[test]
    fn reproduces_a_straight_line_and_its_slope() {
        // Hermite interpolation is exact for data on a line (slopes equal
        // the secant), a property of any cubic Hermite scheme.
        let c = MonotoneCurve::new(&[(0.0, 1.0), (0.3, 1.6), (0.7, 2.4), (1.0, 3.0)]).unwrap();
        for i in 0..=20 {
            let t = i as f64 / 20.0;
            let (v, d) = c.eval(t);
            assert!((v - (1.0 + 2.0 * t)).abs() < 1e-12 && (d - 2.0).abs() < 1e-9);
        }
    }

    #[test]
    fn slope_matches_central_differences() {
        let c = MonotoneCurve::new(&[(0.0, 0.0), (0.2, 0.35), (0.5, 0.7), (1.0, 1.0)]).unwrap();
        let h = 1e-6;
        for t in [0.05, 0.3, 0.45, 0.8] {
            let num = (c.eval(t + h).0 - c.eval(t - h).0) / (2.0 * h);
            assert!((num - c.eval(t).1).abs() < 1e-6, "{t}");
        }
    }

    #[test]
    fn refuses_unordered_knots() {
        assert!(MonotoneCurve::new(&[(0.0, 0.0)]).is_none());
        assert!(MonotoneCurve::new(&[(0.0, 0.0), (0.0, 1.0)]).is_none());
        assert!(MonotoneCurve::new(&[(0.0, 1.0), (1.0, 0.0)]).is_none());
        assert!(MonotoneCurve::new(&[(0.0, 0.0), (f64::NAN, 1.0)]).is_none());
    }

    #[test]
    fn isotonic_pools_violators() {
        // Worked example: 1, 3, 2, 4 with equal weights pools 3 and 2 into
        // 2.5 (the least-squares non-decreasing fit).
        assert_eq!(isotonic(&[1.0, 3.0, 2.0, 4.0], &[1.0; 4]), vec![1.0, 2.5, 2.5, 4.0]);
        // Weighted: (3 × 1 + 1 × 3) / 4 = 1.5 for the first two.
        assert_eq!(isotonic(&[3.0, 1.0], &[1.0, 3.0]), vec![1.5, 1.5]);
        let y = [0.1, 0.2, 0.5, 0.9];
        assert_eq!(isotonic(&y, &[1.0; 4]), y.to_vec());
    }
}
