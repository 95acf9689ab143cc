//! CIEDE2000 of one colour against many, in single precision and with a
//! stated error bound: a screen that lets the pair analysis of a large
//! palette decide most pairs without the exact (double precision)
//! [`super::delta::delta_e00`], which it then evaluates only for the pairs
//! the bound cannot decide.
//!
//! The formula is that of Sharma, Wu and Dalal (Color Res. Appl. 30, 2005,
//! eqs. 1–22), rewritten without angles so that it runs branch-free over many
//! lanes at once:
//! - ΔH′ = 2·(a′₁b₂ − b₁a′₂)·√(C′₁C′₂) / |v|, with v = C′₂·(a′₁, b₁) +
//!   C′₁·(a′₂, b₂) the bisector of the two hues scaled by C′₁C′₂ (so
//!   |v| = 2C′₁C′₂·cos(Δh′/2)); algebraically equal to eq. 11, sign included.
//! - The mean hue h̄′ of eq. 14 is the direction of v whenever the hues are
//!   less than 180° apart: its sine and cosine are v/|v|, and T (eq. 15)
//!   follows by the multiple-angle identities.
//! - Δθ (eq. 17) needs φ = h̄′ − 275° as an angle: from the half-angle
//!   tangent, one reduction and the Taylor series of atan; e^(−x) as
//!   (e^(−x/16))¹⁶ with a Taylor polynomial; sin 2Δθ by its Taylor
//!   polynomial. eq. 17 takes h̄′ in [0°, 360°), so φ ∈ [−275°, 85°): where
//!   the wrapped angle lies at or beyond 85° (h̄′ just above 0°, Δθ below
//!   30°·e⁻⁵¹) or below −100° (Δθ below 30°·e⁻¹⁶), Δθ is taken as 0.
//! - Beyond 90° apart the bisector is taken perpendicular to u₂ − u₁ (the
//!   difference of the unit hue vectors), on the side the cross product
//!   names, and ΔH′ = ±|w|/√(C′₁C′₂) with w = C′₁C′₂·(u₂ − u₁): both well
//!   conditioned up to opposite hues, where dichromat simulations put many
//!   pairs.
//!
//! Lanes the rewriting does not hold for give NaN, and the caller decides
//! them exactly: hues within about 0.006° of opposite (|sin Δh′| < 10⁻⁴,
//! where the mean hue of eq. 14 jumps by 180° and the side is uncertain), a
//! chroma of 0 (eq. 14's special case), and colours with a component beyond
//! ±1,000 or not finite.
//!
//! # The bound
//! For every lane that is not NaN, the result D̂ and the exact ΔE00² =: D
//! satisfy |D̂ − D| ≤ [`REL`]·D + [`ABS`]. The sources of error, each far
//! below that: rounding the inputs to single precision (relative 6·10⁻⁸,
//! ≤ 10⁻⁵ absolute in CIELAB), the single-precision arithmetic of a formula
//! with no cancellation left but ΔL′ and ΔC′ (whose absolute error stays at
//! the inputs' rounding), the mean hue's direction (conditioned by
//! 1/max(|u₁ + u₂|, |u₁ − u₂|) ≤ √2), and the truncated series and cuts.
//! R_T enters D at most as 7.8·D·δe for an error δe in e = e^(−(φ/25°)²)
//! (|R_T′| ≤ (π/3)·R_C·δe with R_C ≤ 2, and |ΔC′ΔH′|/(S_C S_H) ≤ 3.7·D as
//! D ≥ (1 − √3/2)·((ΔC′/S_C)² + (ΔH′/S_H)²)), so e needs an absolute error
//! below 10⁻⁵: the Taylor polynomial of e^(−z) to z⁴ on z ≤ 1 raised to the
//! 16th power errs by at most 16·e^(−15x/16)·(x/16)⁵/5! ≤ 4·10⁻⁶; atan to u¹¹
//! on −0.42 ≤ u ≤ 0.09 errs by at most u¹³/13 < 10⁻⁶ rad (δe ≤ 2 δφ); sin
//! to x⁹ on x ≤ π/3 by at most 5·10⁻⁸; the cut below −100° by e⁻¹⁶ <
//! 2·10⁻⁷; the cut at 85° by e^(−11.6) < 10⁻⁵, the jump eq. 17 itself has
//! there. The unit tests measure the error over millions
//! of pairs, random and in the hard families (near-equal colours, greys,
//! near-opposite hues, blues, hues around 0°), against the exact function,
//! and require it below a tenth of the bound.

use super::LabD50;

/// The bound's relative part, on ΔE00².
pub const REL: f64 = 1e-3;
/// The bound's absolute part, on ΔE00² (ΔE00 units squared).
pub const ABS: f64 = 1e-3;

/// Colours as single-precision columns for [`LabSet::squared_row`]:
/// L*, a*, b* and the chroma C*ab.
#[derive(Clone, Debug, Default)]
pub struct LabSet {
    l: Vec<f32>,
    a: Vec<f32>,
    b: Vec<f32>,
    c: Vec<f32>,
}

/// Components beyond this (or not finite) make a colour's lanes NaN.
const LIMIT: f64 = 1_000.0;

impl LabSet {
    /// The columns of `labs`, in order.
    pub fn new(labs: &[LabD50]) -> Self {
        let mut s = LabSet::default();
        for lab in labs {
            let [l, a, b, c] = lane(*lab);
            s.l.push(l);
            s.a.push(a);
            s.b.push(b);
            s.c.push(c);
        }
        s
    }

    /// How many colours.
    pub fn len(&self) -> usize {
        self.l.len()
    }

    /// True when there are none.
    pub fn is_empty(&self) -> bool {
        self.l.is_empty()
    }

    /// ΔE00² (within the bound, or NaN) between colour `i` and each colour
    /// from `from` on, into `out` (cleared first; `len − from` values).
    pub fn squared_row(&self, i: usize, from: usize, out: &mut Vec<f32>) {
        let x = [self.l[i], self.a[i], self.b[i], self.c[i]];
        self.squared(x, from.min(self.len())..self.len(), out);
    }

    /// ΔE00² (within the bound, or NaN) between `lab` and each colour of
    /// `range`, into `out` (cleared first).
    pub fn squared_to(&self, lab: LabD50, range: std::ops::Range<usize>, out: &mut Vec<f32>) {
        self.squared(lane(lab), range, out);
    }

    fn squared(&self, x: [f32; 4], range: std::ops::Range<usize>, out: &mut Vec<f32>) {
        out.clear();
        out.resize(range.len(), 0.0);
        #[cfg(target_arch = "x86_64")]
        {
            if std::arch::is_x86_feature_detected!("avx512f") {
                // SAFETY: the CPU has the feature the function is compiled for.
                unsafe { row_avx512(self, x, range, out) };
                return;
            }
            if std::arch::is_x86_feature_detected!("avx2") {
                // SAFETY: as above.
                unsafe { row_avx2(self, x, range, out) };
                return;
            }
        }
        row::<Plain>(self, x, range, out);
    }
}

/// A colour as the kernel takes it: L*, a*, b*, C*ab in single precision;
/// a NaN L* (which makes every lane of the colour NaN, as ΔL′ enters the
/// sum) for a component beyond [`LIMIT`] or not finite.
fn lane(lab: LabD50) -> [f32; 4] {
    let ok = [lab.l, lab.a, lab.b].iter().all(|v| v.abs() <= LIMIT);
    [
        if ok { lab.l as f32 } else { f32::NAN },
        lab.a as f32,
        lab.b as f32,
        (lab.a * lab.a + lab.b * lab.b).sqrt() as f32,
    ]
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx512f")]
fn row_avx512(s: &LabSet, x: [f32; 4], range: std::ops::Range<usize>, out: &mut [f32]) {
    row::<Fused>(s, x, range, out)
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2,fma")]
fn row_avx2(s: &LabSet, x: [f32; 4], range: std::ops::Range<usize>, out: &mut [f32]) {
    row::<Fused>(s, x, range, out)
}

/// a·b + c: fused where the instruction set has it (a plain `mul_add`
/// elsewhere would call the C library).
trait Mad {
    fn mad(a: f32, b: f32, c: f32) -> f32;
}

struct Fused;
impl Mad for Fused {
    #[inline(always)]
    fn mad(a: f32, b: f32, c: f32) -> f32 {
        a.mul_add(b, c)
    }
}

struct Plain;
impl Mad for Plain {
    #[inline(always)]
    fn mad(a: f32, b: f32, c: f32) -> f32 {
        a * b + c
    }
}

/// The loop the wrappers compile for their instruction sets: one lane per
/// colour, no branches, so the compiler vectorises it.
#[inline(always)]
fn row<M: Mad>(s: &LabSet, x: [f32; 4], range: std::ops::Range<usize>, out: &mut [f32]) {
    let r = range;
    let cols = s.l[r.clone()]
        .iter()
        .zip(&s.a[r.clone()])
        .zip(&s.b[r.clone()])
        .zip(&s.c[r]);
    for (o, (((&l, &a), &b), &c)) in out.iter_mut().zip(cols) {
        *o = squared::<M>(x, [l, a, b, c]);
    }
}

/// 25⁷, from eq. 4 and 17.
const P25_7: f32 = 6_103_515_625.0;
/// cos and sin of 275° (eq. 17), of 30°, 6° and 63° (eq. 15).
const COS_275: f32 = 0.087_155_74;
const SIN_275: f32 = -0.996_194_7;
const COS_30: f32 = 0.866_025_4;
const SIN_30: f32 = 0.5;
const COS_6: f32 = 0.994_521_9;
const SIN_6: f32 = 0.104_528_46;
const COS_63: f32 = 0.453_990_5;
const SIN_63: f32 = 0.891_006_5;
/// cos 85° and cos 100°: the ends of the range where Δθ is computed.
const COS_85: f32 = 0.087_155_74;
const COS_100: f32 = -0.173_648_18;
/// tan 22.5°.
const TAN_PI_8: f32 = 0.414_213_57;

/// The hue geometry of a pair: cos and sin of the mean hue h̄′, ΔH′ (NaN
/// where the rewriting does not hold, see the module), ΔC′ and C̄′.
struct Hue {
    ch: f32,
    sh: f32,
    dhp: f32,
    dcp: f32,
    c_bar_p: f32,
}

/// ΔE00² of two colours given as [L*, a*, b*, C*ab], or NaN (see the
/// module).
#[inline(always)]
fn squared<M: Mad>(x: [f32; 4], y: [f32; 4]) -> f32 {
    let h = hue::<M>(x, y);
    sum::<M>(x[0], y[0], &h, rotation::<M>(&h))
}

/// eqs. 2–14 without angles.
#[inline(always)]
fn hue<M: Mad>(x: [f32; 4], y: [f32; 4]) -> Hue {
    let m = M::mad;
    let [_, a1, b1, c1] = x;
    let [_, a2, b2, c2] = y;
    let c_bar = 0.5 * (c1 + c2);
    let c_bar7 = pow7(c_bar);
    let g = 0.5 * (1.0 - (c_bar7 / (c_bar7 + P25_7)).sqrt());
    let a1p = (1.0 + g) * a1;
    let a2p = (1.0 + g) * a2;
    let c1p = m(a1p, a1p, b1 * b1).sqrt();
    let c2p = m(a2p, a2p, b2 * b2).sqrt();
    let cc = c1p * c2p;

    // The bisector of the two hues: from the sum of the unit hue vectors
    // u₁ + u₂ while the hues are less than 90° apart, else from their
    // difference, to which it is perpendicular (better conditioned there).
    // Both scaled by C′₁C′₂.
    let cross = m(a1p, b2, -b1 * a2p); // C′₁C′₂·sin Δh′
    let near = m(a1p, a2p, b1 * b2) >= 0.0; // cos Δh′ ≥ 0
    let (vx, vy) = (m(a1p, c2p, a2p * c1p), m(b1, c2p, b2 * c1p)); // ∝ u₁ + u₂
    let (wx, wy) = (m(a2p, c1p, -a1p * c2p), m(b2, c1p, -b1 * c2p)); // ∝ u₂ − u₁
    let sign = 1.0f32.copysign(cross);
    let (bx, by) = if near { (vx, vy) } else { (sign * wy, -sign * wx) };
    // |v| = 2C′₁C′₂·cos(Δh′/2), |w| = 2C′₁C′₂·|sin(Δh′/2)|: the one taken.
    let bb = if near { m(vx, vx, vy * vy) } else { m(wx, wx, wy * wy) };
    let bn = bb.sqrt();
    let root = cc.sqrt();
    // One division for 1/|b| = r·√(C′₁C′₂) and 1/√(C′₁C′₂) = r·|b|.
    let r = 1.0 / (bn * root);
    let (ch, sh) = (bx * r * root, by * r * root);
    // ΔH′ = 2√(C′₁C′₂)·sin(Δh′/2): 2·cross·√(C′₁C′₂)/|v| while the hues are
    // near, ±|w|/√(C′₁C′₂) (the side from the cross product) beyond.
    let dhp = if near { 2.0 * cross * cc * r } else { sign * bb * r };
    // Hues within about 0.006° of opposite are on the edge of eq. 14 (which
    // side the mean falls on); a zero chroma is its special case.
    let ok = cc > 0.0 && (near || cross.abs() > 1e-4 * cc);
    Hue {
        ch,
        sh,
        dhp: if ok { dhp } else { f32::NAN },
        dcp: c2p - c1p,
        c_bar_p: 0.5 * (c1p + c2p),
    }
}

/// T (eq. 15) and R_T (eqs. 16–19), from the mean hue.
#[inline(always)]
fn rotation<M: Mad>(h: &Hue) -> (f32, f32) {
    let m = M::mad;
    let (ch, sh, c_bar_p) = (h.ch, h.sh, h.c_bar_p);
    // T from cos h̄′ and sin h̄′.
    let ch2 = 2.0 * ch;
    let (c2h, s2h) = (m(ch2, ch, -1.0), ch2 * sh);
    let (c3h, s3h) = (m(ch2, c2h, -ch), m(ch2, s2h, -sh));
    let (c4h, s4h) = (m(ch2, c3h, -c2h), m(ch2, s3h, -s2h));
    // 1 − 0.17 cos(h − 30°) + 0.24 cos 2h + 0.32 cos(3h + 6°) − 0.20 cos(4h − 63°)
    let t = m(-0.17 * COS_30, ch, m(-0.17 * SIN_30, sh, 1.0));
    let t = m(0.24, c2h, m(0.32 * COS_6, c3h, m(-0.32 * SIN_6, s3h, t)));
    let t = m(-0.20 * COS_63, c4h, m(-0.20 * SIN_63, s4h, t));

    // Δθ from φ = h̄′ − 275°.
    let cp = m(ch, COS_275, sh * SIN_275);
    let sp = m(sh, COS_275, -ch * SIN_275);
    let in_range = cp > COS_100 && !(sp > 0.0 && cp <= COS_85);
    let phi = 2.0 * atan_ratio::<M>(sp, 1.0 + cp); // radians
    let x = phi * (180.0 / 25.0 / std::f32::consts::PI);
    let e = exp_neg::<M>(x * x);
    // 2Δθ in radians: 2 · 30° · e.
    let two_theta = if in_range { std::f32::consts::FRAC_PI_3 * e } else { 0.0 };
    let c_bar_p7 = pow7(c_bar_p);
    let rc = 2.0 * (c_bar_p7 / (c_bar_p7 + P25_7)).sqrt();
    (t, -sin_small::<M>(two_theta) * rc)
}

/// The weights (eqs. 20–21) and the sum (eq. 22), squared.
#[inline(always)]
fn sum<M: Mad>(l1: f32, l2: f32, h: &Hue, (t, rt): (f32, f32)) -> f32 {
    let m = M::mad;
    let c_bar_p = h.c_bar_p;

    let l50 = {
        let d = 0.5 * (l1 + l2) - 50.0;
        d * d
    };
    // S_L = n / q with q = √(20 + (L̄′ − 50)²), n = q + 0.015·(L̄′ − 50)²;
    // one division for the three quotients.
    let q = (20.0 + l50).sqrt();
    let n = q + 0.015 * l50;
    let sc = 1.0 + 0.045 * c_bar_p;
    let shh = 1.0 + 0.015 * c_bar_p * t;
    let k = 1.0 / (n * sc * shh);
    let tl = (l2 - l1) * q * sc * shh * k;
    let tc = h.dcp * n * shh * k;
    let th = h.dhp * n * sc * k;
    m(tl, tl, m(tc, tc, m(th, th, rt * tc * th)))
}

#[inline(always)]
fn pow7(x: f32) -> f32 {
    let x2 = x * x;
    x2 * x2 * x2 * x
}

/// atan(y / x) for x > 0 and |y/x| ≤ tan 50° (the half-angle tangent of
/// |φ| ≤ 100°; larger ratios come out wrong and are cut by the caller):
/// reduced by atan t = π/4 + atan((t − 1)/(t + 1)) above tan 22.5°, so that
/// −0.42 ≤ u ≤ 0.09, then the Taylor series to u¹¹.
#[inline(always)]
fn atan_ratio<M: Mad>(y: f32, x: f32) -> f32 {
    let m = M::mad;
    use std::f32::consts::FRAC_PI_4;
    let ay = y.abs();
    let shift = ay > TAN_PI_8 * x;
    let u = if shift { ay - x } else { ay } / if shift { ay + x } else { x };
    let u2 = u * u;
    let p = m(u2, -1.0 / 11.0, 1.0 / 9.0);
    let p = m(u2, m(u2, p, -1.0 / 7.0), 1.0 / 5.0);
    let p = m(u2, m(u2, p, -1.0 / 3.0), 1.0);
    let series = u * p;
    let r = if shift { FRAC_PI_4 + series } else { series };
    r.copysign(y)
}

/// e⁻ˣ for 0 ≤ x ≤ 16 to an absolute 4·10⁻⁶: (e^(−x/16))¹⁶, the inner
/// value by its Taylor polynomial to the 4th power.
#[inline(always)]
fn exp_neg<M: Mad>(x: f32) -> f32 {
    let m = M::mad;
    let z = -x * (1.0 / 16.0);
    let mut p = 1.0 / 24.0;
    for c in [1.0 / 6.0, 0.5, 1.0, 1.0] {
        p = m(p, z, c);
    }
    for _ in 0..4 {
        p *= p;
    }
    p
}

/// sin x for 0 ≤ x ≤ π/3, Taylor to x⁹.
#[inline(always)]
fn sin_small<M: Mad>(x: f32) -> f32 {
    let m = M::mad;
    let x2 = x * x;
    let p = m(
        m(m(x2, 1.0 / 362_880.0, -1.0 / 5040.0), x2, 1.0 / 120.0),
        x2,
        -1.0 / 6.0,
    );
    x * m(p, x2, 1.0)
}

/// The interval [lo, hi] of ΔE00 (not squared) that holds the exact value
/// of a lane that gave `d`; `None` for a NaN lane.
pub fn interval(d: f32) -> Option<(f64, f64)> {
    let d = f64::from(d);
    (!d.is_nan()).then(|| {
        (
            ((d - ABS) / (1.0 + REL)).max(0.0).sqrt(),
            ((d + ABS) / (1.0 - REL)).max(0.0).sqrt(),
        )
    })
}

/// A screened ΔE00² of at least this shows the exact ΔE00² is at least
/// `x`: D ≥ (D̂ − ABS)/(1 + REL) ≥ x. NaN passes no test built on it.
pub fn at_least(x: f64) -> f64 {
    x * (1.0 + REL) + ABS
}

/// A screened ΔE00² below this shows the exact ΔE00² is below `x`:
/// D ≤ (D̂ + ABS)/(1 − REL) < x.
pub fn below(x: f64) -> f64 {
    x * (1.0 - REL) - ABS
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::color::delta::delta_e00;

    /// Deterministic 64-bit LCG, uniform in [0, 1).
    struct Lcg(u64);
    impl Lcg {
        fn unit(&mut self) -> f64 {
            self.0 = self
                .0
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            (self.0 >> 11) as f64 / (1u64 << 53) as f64
        }
        fn range(&mut self, lo: f64, hi: f64) -> f64 {
            lo + (hi - lo) * self.unit()
        }
    }

    fn lch(l: f64, c: f64, h_deg: f64) -> LabD50 {
        let h = h_deg.to_radians();
        LabD50::new(l, c * h.cos(), c * h.sin())
    }

    /// Checks every pair of `pairs` (as first colour, rest) and returns the
    /// share of lanes left undecided (NaN) and the largest error in units of
    /// the bound.
    fn worst(pairs: &[(LabD50, LabD50)]) -> (f64, f64) {
        let mut nan = 0usize;
        let mut worst: f64 = 0.0;
        let mut out = Vec::new();
        for &(p, q) in pairs {
            let set = LabSet::new(&[p, q]);
            set.squared_row(0, 1, &mut out);
            let d_hat = out[0];
            if d_hat.is_nan() {
                nan += 1;
                continue;
            }
            let d = delta_e00(p, q).powi(2);
            let err = (f64::from(d_hat) - d).abs() / (REL * d + ABS);
            assert!(err < 0.1, "{p:?} {q:?}: {d_hat} against {d}");
            worst = worst.max(err);
        }
        (nan as f64 / pairs.len() as f64, worst)
    }

    #[test]
    fn within_the_bound_on_random_pairs() {
        // Independent reference: the double-precision delta_e00, itself
        // checked against the Sharma, Wu and Dalal (2005) test pairs.
        let mut r = Lcg(0x00de_2000);
        let pairs: Vec<_> = (0..400_000)
            .map(|_| {
                let mut lab = || LabD50::new(r.range(0.0, 100.0), r.range(-130.0, 130.0), r.range(-130.0, 130.0));
                (lab(), lab())
            })
            .collect();
        let (nan, w) = worst(&pairs);
        eprintln!("random: undecided {nan}, worst error {w} of the bound");
        // Hues on the edge of opposite, and zero chromas, are rare.
        assert!(nan < 1e-4, "{nan}");
    }

    #[test]
    fn within_the_bound_in_the_hard_families() {
        let mut r = Lcg(7);
        let mut pairs = Vec::new();
        for _ in 0..100_000 {
            let base = LabD50::new(r.range(0.0, 100.0), r.range(-130.0, 130.0), r.range(-130.0, 130.0));
            // Near-equal colours, down to a thousandth.
            let s = 10f64.powf(r.range(-3.0, 0.5));
            pairs.push((
                base,
                LabD50::new(
                    base.l + s * r.range(-1.0, 1.0),
                    base.a + s * r.range(-1.0, 1.0),
                    base.b + s * r.range(-1.0, 1.0),
                ),
            ));
            // Greys and near-greys.
            pairs.push((
                LabD50::new(r.range(0.0, 100.0), r.range(-0.5, 0.5), r.range(-0.5, 0.5)),
                LabD50::new(r.range(0.0, 100.0), r.range(-3.0, 3.0), r.range(-3.0, 3.0)),
            ));
            // Hues near opposite: 170°–190° apart, and within 0.01°.
            let h = r.range(0.0, 360.0);
            pairs.push((
                lch(r.range(0.0, 100.0), r.range(1.0, 100.0), h),
                lch(r.range(0.0, 100.0), r.range(1.0, 100.0), h + r.range(170.0, 190.0)),
            ));
            pairs.push((
                lch(r.range(0.0, 100.0), r.range(1.0, 100.0), h),
                lch(
                    r.range(0.0, 100.0),
                    r.range(1.0, 100.0),
                    h + 180.0 + r.range(-0.01, 0.01),
                ),
            ));
            // Blues, where R_T acts, and mean hues around 0° (the edge of eq. 17).
            let hb = r.range(215.0, 335.0);
            pairs.push((
                lch(r.range(0.0, 100.0), r.range(0.0, 120.0), hb + r.range(-20.0, 20.0)),
                lch(r.range(0.0, 100.0), r.range(0.0, 120.0), hb + r.range(-20.0, 20.0)),
            ));
            let h0 = r.range(-15.0, 15.0);
            pairs.push((
                lch(r.range(0.0, 100.0), r.range(0.0, 120.0), h0 + r.range(-10.0, 10.0)),
                lch(r.range(0.0, 100.0), r.range(0.0, 120.0), h0 + r.range(-10.0, 10.0)),
            ));
        }
        let (nan, w) = worst(&pairs);
        eprintln!("hard families: undecided {nan}, worst error {w} of the bound");
        // Exact zeros of chroma are left to the exact formula.
        let set = LabSet::new(&[LabD50::new(50.0, 0.0, 0.0), LabD50::new(60.0, 10.0, 0.0)]);
        let mut out = Vec::new();
        set.squared_row(0, 1, &mut out);
        assert!(out[0].is_nan());
    }

    #[test]
    fn the_plain_loop_meets_the_bound_too() {
        // The loop without fused multiply-adds, which CPUs without AVX2 run
        // (this machine's dispatch takes a wider one).
        let mut r = Lcg(11);
        let labs: Vec<LabD50> = (0..20_000)
            .map(|_| LabD50::new(r.range(0.0, 100.0), r.range(-130.0, 130.0), r.range(-130.0, 130.0)))
            .collect();
        let set = LabSet::new(&labs);
        let mut out = vec![0.0; labs.len() - 1];
        row::<Plain>(&set, lane(labs[0]), 1..labs.len(), &mut out);
        for (d_hat, q) in out.iter().zip(&labs[1..]) {
            if !d_hat.is_nan() {
                let d = delta_e00(labs[0], *q).powi(2);
                assert!((f64::from(*d_hat) - d).abs() < 0.1 * (REL * d + ABS), "{q:?}");
            }
        }
    }

    #[test]
    fn odd_values_are_left_to_the_exact_formula() {
        let set = LabSet::new(&[
            LabD50::new(50.0, 10.0, 10.0),
            LabD50::new(f64::NAN, 0.0, 0.0),
            LabD50::new(50.0, 1e30, 0.0),
            LabD50::new(50.0, f64::INFINITY, 0.0),
        ]);
        let mut out = Vec::new();
        set.squared_row(0, 1, &mut out);
        assert!(out.iter().all(|d| d.is_nan()), "{out:?}");
    }

    #[test]
    fn the_series_meet_their_remainders() {
        // Reference values from the standard library's double-precision
        // functions; the stated remainders from the series' next terms.
        for k in 0..=2_000 {
            let tan50 = 50f64.to_radians().tan();
            let y = tan50 * (-1.0 + 2.0 * k as f64 / 2_000.0);
            let got = f64::from(atan_ratio::<Plain>(y as f32, 1.0));
            assert!((got - y.atan()).abs() < 2e-6, "atan {y}");
            let x = 16.0 * k as f64 / 2_000.0;
            let got = f64::from(exp_neg::<Plain>(x as f32));
            // Remainder 16·e^(−15x/16)·(x/16)⁵/5! ≤ 3.7·10⁻⁶, plus rounding.
            assert!((got - (-x).exp()).abs() <= 4e-6, "exp {x}: {}", got - (-x).exp());
            let s = std::f64::consts::FRAC_PI_3 * k as f64 / 2_000.0;
            assert!(
                (f64::from(sin_small::<Plain>(s as f32)) - s.sin()).abs() < 2e-7,
                "sin {s}"
            );
        }
    }
}
