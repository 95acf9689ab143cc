//! Gamut mapping for the CIELAB → CMYK tables of a built-in press: what a
//! colour the press cannot print is printed as, per rendering intent.
//!
//! All mapping happens in OKLab (Ottosson 2020, with the matrices of CSS
//! Color 4), whose lines of constant hue follow perceived hue much better
//! than CIELAB's, which bend in the blue region (Hung & Berns 1995): a clip
//! that keeps CIELAB h_ab turns saturated blues purple, one that keeps OKLab
//! hue does not. Distances inside a hue leaf are Euclidean in OKLab.
//! CIEDE2000 stays the difference inkfit *reports*; it is not what any
//! method below minimises, because far from the gamut its chroma and hue
//! weights make dropping chroma cheap.
//!
//! The gamut of the press is described per hue leaf (segment maxima over a
//! 1° × 1/200-of-lightness grid, Morovič & Luo 2000): for each OKLab hue and
//! lightness the largest chroma any printable ink combination reaches,
//! found by sampling the boundary of the ink domain (one ink at 0 or 100 %,
//! or the total-ink limit reached) through the printing model.
//!
//! - **Relative colorimetric** (B2A1): hue-preserving minimum-distance
//!   clipping, HPMINDE of CIE 156:2004: colours inside the gamut are left
//!   as they are; a colour outside goes to the nearest point of the gamut
//!   boundary within its own hue leaf, lightness differences weighted by
//!   one half ([`RELATIVE_LIGHTNESS_WEIGHT`]).
//! - **Perceptual** (B2A0): SGCK of CIE 156:2004: a chroma-dependent
//!   sigmoidal lightness compression from the source gamut's lightness range
//!   onto the press's, then a knee compression of the distance from the
//!   focal point on the grey axis at the lightness of the press's cusp
//!   (its most chromatic colour) in that hue leaf: distances up to 90 % of
//!   the press boundary are kept, the rest of the way out to the source
//!   boundary is squeezed linearly into the last 10 %.
//! - **Saturation** (B2A2): keep chroma first, a design choice of inkfit for maps and
//!   business graphics: the same hue-preserving clip with lightness weighted
//!   by a quarter ([`SATURATION_LIGHTNESS_WEIGHT`]), so an out-of-gamut
//!   colour gives up lightness before chroma and saturated screen colours
//!   print as the press's most saturated colours of the same hue. In-gamut
//!   colours are left as they are.
//!
//! The lightness range compressed from starts at the black of the ICC v4
//! perceptual reference medium ([`REFERENCE_BLACK_L`]).
//!
//! The **source gamut** of the perceptual mapping is ITU-R
//! BT.2020 RGB (D65 adapted to D50 by Bradford, as a screen profile hands it
//! to the connection space): it holds the gamut of every screen inkfit
//! knows (sRGB, Display P3, opRGB nearly), so no colour from a screen
//! arrives beyond it and has to be clipped, at the price of compressing
//! sRGB's saturated colours a little more than an sRGB source would. The
//! ICC v4 perceptual reference medium gamut is the other common choice; its
//! table is not at hand here, and a screen gamut matches what inkfit's
//! users send to press.

use rayon::prelude::*;

use super::model::PrintCondition;
use crate::color::spaces::{css_rgb_to_lab_d50, lab_d50_to_oklab, oklab_to_lab_d50, CssRgbSpace};
use crate::color::LabD50;

/// Hue bins of the boundary descriptor: one per degree of OKLab hue.
pub const HUE_BINS: usize = 360;
/// Lightness intervals of the boundary descriptor between its darkest and
/// lightest colour.
pub const LEVELS: usize = 200;

/// Weight of lightness differences against chroma differences in the
/// relative colorimetric clip. CIE 156's HPMINDE weighs them equally; with
/// equal weights a light saturated screen colour (sRGB cyan) slides down the
/// steep upper boundary of a press gamut to a pale tint and keeps a quarter
/// of its chroma. Weighting lightness by one half keeps at least a third of
/// the chroma of every saturated sRGB colour (measured on 36 hues at two
/// saturations, `examples/intent_survey.rs`) at a lightness shift designers
/// accept more readily than a washed-out colour (a design choice).
pub const RELATIVE_LIGHTNESS_WEIGHT: f64 = 0.5;

/// The same weight for the saturation intent: a quarter, chroma first.
pub const SATURATION_LIGHTNESS_WEIGHT: f64 = 0.25;

/// OKLab distance beyond the descriptor that counts as clearly outside
/// (about one ΔE*ab); closer colours are tried as they are first.
pub const CLEARLY: f64 = 0.01;

/// The knee of SGCK: distances up to this share of the press boundary are
/// kept (CIE 156:2004 gives 90 %, from memory).
pub const SGCK_KNEE: f64 = 0.9;

/// Centre and width (CIELAB-like lightness 0..100) of the cumulative-normal
/// lightness curve of SGCK (Braun & Fairchild 1999). They tabulate both
/// against the destination's black; that table is not at hand, so a gentle
/// curve is used: centred on mid-grey and wide enough to stay close to a
/// linear compression (a design choice).
pub const SIGMOID_CENTRE: f64 = 50.0;
/// See [`SIGMOID_CENTRE`].
pub const SIGMOID_WIDTH: f64 = 50.0;

/// The gamut mapping of one rendering intent.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Method {
    /// Relative colorimetric: HPMINDE clipping.
    HueClip,
    /// Perceptual: SGCK compression from the source gamut.
    Compress,
    /// Saturation: the hue-preserving clip, chroma kept first.
    KeepChroma,
}

impl Method {
    /// Weight of lightness against chroma differences of a clipping
    /// method; `None` for the compression.
    fn clip_weight(self) -> Option<f64> {
        match self {
            Method::HueClip => Some(RELATIVE_LIGHTNESS_WEIGHT),
            Method::KeepChroma => Some(SATURATION_LIGHTNESS_WEIGHT),
            Method::Compress => None,
        }
    }
}

/// A point of a hue leaf: (OKLab L, chroma).
pub type LeafPoint = (f64, f64);

/// A gamut described by its largest chroma per OKLab hue and lightness.
#[derive(Clone, Debug)]
pub struct LeafGamut {
    /// OKLab lightness of the darkest colour.
    pub l_min: f64,
    /// OKLab lightness of the lightest colour.
    pub l_max: f64,
    /// Largest chroma at hue bin `h` and level `j`: `cmax[h * (LEVELS + 1) + j]`.
    cmax: Vec<f64>,
}

/// OKLab `[L, a, b]` as (L, C, h in degrees 0..360).
fn polar(ok: [f64; 3]) -> (f64, f64, f64) {
    let c = ok[1].hypot(ok[2]);
    let h = ok[2].atan2(ok[1]).to_degrees().rem_euclid(360.0);
    (ok[0], c, h)
}

fn rect(l: f64, c: f64, h: f64) -> [f64; 3] {
    let (s, co) = h.to_radians().sin_cos();
    [l, c * co, c * s]
}

impl LeafGamut {
    /// The descriptor of the colours `points` (OKLab): per bin the largest
    /// chroma found, the leaf closed on the grey axis at the darkest and
    /// lightest lightness, empty bins filled by interpolation, and dips
    /// between neighbouring bins (sampling gaps on a boundary that bulges
    /// outwards) filled from their neighbours.
    pub fn from_samples(points: &[[f64; 3]]) -> LeafGamut {
        Self::from_samples_above(points, f64::NEG_INFINITY)
    }

    /// [`LeafGamut::from_samples`] without the colours darker than `floor`
    /// (OKLab L): the leaf then starts at the floor on the grey axis.
    pub fn from_samples_above(points: &[[f64; 3]], floor: f64) -> LeafGamut {
        let kept: Vec<[f64; 3]> = points.iter().copied().filter(|p| p[0] >= floor).collect();
        let points = &kept[..];
        let l_min = points.iter().map(|p| p[0]).fold(f64::INFINITY, f64::min).max(floor);
        let l_max = points.iter().map(|p| p[0]).fold(f64::NEG_INFINITY, f64::max);
        let step = (l_max - l_min) / LEVELS as f64;
        let w = LEVELS + 1;
        let mut cmax = vec![-1.0f64; HUE_BINS * w];
        for p in points {
            let (l, c, h) = polar(*p);
            let hb = (h.round() as usize) % HUE_BINS;
            let j = (((l - l_min) / step).round() as usize).min(LEVELS);
            let v = &mut cmax[hb * w + j];
            *v = v.max(c);
        }
        let mut empty_hues = Vec::new();
        for hb in 0..HUE_BINS {
            let row = &mut cmax[hb * w..(hb + 1) * w];
            row[0] = 0.0;
            row[LEVELS] = 0.0;
            if row[1..LEVELS].iter().all(|v| *v < 0.0) {
                empty_hues.push(hb);
            }
            fill_gaps(row);
        }
        // A hue without samples takes the mean of its nearest sampled neighbours.
        for &hb in &empty_hues {
            let find = |dir: isize| {
                (1..HUE_BINS as isize)
                    .map(|k| ((hb as isize + dir * k).rem_euclid(HUE_BINS as isize)) as usize)
                    .find(|h| !empty_hues.contains(h))
            };
            if let (Some(a), Some(b)) = (find(-1), find(1)) {
                for j in 0..w {
                    cmax[hb * w + j] = 0.5 * (cmax[a * w + j] + cmax[b * w + j]);
                }
            }
        }
        for _ in 0..2 {
            for hb in 0..HUE_BINS {
                for j in 1..LEVELS {
                    let i = hb * w + j;
                    let along_l = 0.5 * (cmax[i - 1] + cmax[i + 1]);
                    let prev = ((hb + HUE_BINS - 1) % HUE_BINS) * w + j;
                    let next = ((hb + 1) % HUE_BINS) * w + j;
                    let along_h = 0.5 * (cmax[prev] + cmax[next]);
                    cmax[i] = cmax[i].max(along_l).max(along_h);
                }
            }
        }
        LeafGamut { l_min, l_max, cmax }
    }

    fn step(&self) -> f64 {
        (self.l_max - self.l_min) / LEVELS as f64
    }

    /// The boundary of the leaf at hue `h` (degrees) as LEVELS + 1 points
    /// from the darkest to the lightest colour, both on the grey axis.
    pub fn leaf(&self, h: f64) -> Vec<LeafPoint> {
        let w = LEVELS + 1;
        let u = h.rem_euclid(360.0);
        let h0 = (u.floor() as usize) % HUE_BINS;
        let h1 = (h0 + 1) % HUE_BINS;
        let s = u - u.floor();
        let step = self.step();
        (0..w)
            .map(|j| {
                let c = (1.0 - s) * self.cmax[h0 * w + j] + s * self.cmax[h1 * w + j];
                (self.l_min + step * j as f64, c)
            })
            .collect()
    }

    /// The largest chroma at hue `h` and lightness `l`; 0 outside the
    /// lightness range.
    pub fn max_chroma(&self, h: f64, l: f64) -> f64 {
        if !(self.l_min..=self.l_max).contains(&l) {
            return 0.0;
        }
        chroma_on(&self.leaf(h), l, self.l_min, self.step())
    }

    /// Whether OKLab (l, c) at hue h lies inside.
    pub fn contains(&self, h: f64, l: f64, c: f64) -> bool {
        self.contains_on(&self.leaf(h), l, c)
    }

    /// [`LeafGamut::contains`] on the leaf of one hue, already built.
    fn contains_on(&self, leaf: &[LeafPoint], l: f64, c: f64) -> bool {
        (self.l_min..=self.l_max).contains(&l) && c <= chroma_on(leaf, l, self.l_min, self.step()) + 1e-12
    }

    /// The most chromatic point of the leaf at hue `h`.
    pub fn cusp(&self, h: f64) -> LeafPoint {
        cusp_of(&self.leaf(h))
    }
}

/// Fills negative (empty) entries of `row` by linear interpolation between
/// the nearest filled ones (both ends are filled).
fn fill_gaps(row: &mut [f64]) {
    let mut last = 0;
    for j in 1..row.len() {
        if row[j] >= 0.0 {
            for k in last + 1..j {
                let t = (k - last) as f64 / (j - last) as f64;
                row[k] = (1.0 - t) * row[last] + t * row[j];
            }
            last = j;
        }
    }
}

/// Chroma of the leaf polyline (evenly spaced in lightness from `l0`) at `l`.
fn chroma_on(leaf: &[LeafPoint], l: f64, l0: f64, step: f64) -> f64 {
    let x = ((l - l0) / step).clamp(0.0, (leaf.len() - 1) as f64);
    let j = (x.floor() as usize).min(leaf.len() - 2);
    let t = x - j as f64;
    (1.0 - t) * leaf[j].1 + t * leaf[j + 1].1
}

fn cusp_of(leaf: &[LeafPoint]) -> LeafPoint {
    leaf.iter()
        .copied()
        .fold((0.5, -1.0), |best, p| if p.1 > best.1 { p } else { best })
}

/// The point of the polyline `leaf` nearest to `p`, with lightness
/// differences weighted by `kl` (1: Euclidean): the nearest point in the
/// plane whose lightness axis is scaled by `kl`.
pub fn nearest_weighted(leaf: &[LeafPoint], p: LeafPoint, kl: f64) -> LeafPoint {
    let scale = |q: LeafPoint| (q.0 * kl, q.1);
    let p = scale(p);
    let mut best = scale(leaf[0]);
    let mut best_d = f64::INFINITY;
    for s in leaf.windows(2) {
        let (a, b) = (scale(s[0]), scale(s[1]));
        let (dx, dy) = (b.0 - a.0, b.1 - a.1);
        let len2 = dx * dx + dy * dy;
        let t = if len2 > 0.0 {
            (((p.0 - a.0) * dx + (p.1 - a.1) * dy) / len2).clamp(0.0, 1.0)
        } else {
            0.0
        };
        let q = (a.0 + t * dx, a.1 + t * dy);
        let d = (q.0 - p.0).powi(2) + (q.1 - p.1).powi(2);
        if d < best_d {
            best_d = d;
            best = q;
        }
    }
    (best.0 / kl, best.1)
}

/// Distance from `from` along the unit direction `u` to where the ray first
/// crosses the polyline `leaf`; `None` if it never does.
pub fn ray_exit(leaf: &[LeafPoint], from: LeafPoint, u: LeafPoint) -> Option<f64> {
    let mut best: Option<f64> = None;
    for s in leaf.windows(2) {
        let (a, b) = (s[0], s[1]);
        let e = (b.0 - a.0, b.1 - a.1);
        // from + t·u = a + v·e  →  solve for t, v (Cramer's rule).
        let det = u.0 * (-e.1) - u.1 * (-e.0);
        if det.abs() < 1e-15 {
            continue;
        }
        let r = (a.0 - from.0, a.1 - from.1);
        let t = (r.0 * (-e.1) - r.1 * (-e.0)) / det;
        let v = (u.0 * r.1 - u.1 * r.0) / det;
        if t > 1e-12 && (-1e-12..=1.0 + 1e-12).contains(&v) && best.is_none_or(|b| t < b) {
            best = Some(t);
        }
    }
    best
}

/// Samples of the boundary of the ink domain of `cond` (each 3-face where
/// one ink is 0 or 100 %, and the face where the total-ink limit is
/// reached), `n` steps per free ink, printed through the model and given
/// in OKLab.
pub fn press_boundary_samples(cond: &PrintCondition, n: usize) -> Vec<[f64; 3]> {
    let cap = cond.tac_percent() / 100.0;
    let m = n + 1;
    let mut inks: Vec<[f64; 4]> = Vec::new();
    let on_grid = |i: usize| i as f64 / n as f64;
    for fixed_ink in 0..4 {
        for fixed in [0.0, 1.0] {
            for idx in 0..m * m * m {
                let free = [idx / (m * m), (idx / m) % m, idx % m].map(on_grid);
                inks.push(place(fixed_ink, fixed, scale_to_cap(free, cap - fixed)));
            }
        }
    }
    if cap < 4.0 {
        // The total-ink face: three inks on the grid, the fourth making up
        // the limit where it can (0..1).
        for fourth in 0..4 {
            for idx in 0..m * m * m {
                let free = [idx / (m * m), (idx / m) % m, idx % m].map(on_grid);
                let rest = cap - free.iter().sum::<f64>();
                if (0.0..=1.0).contains(&rest) {
                    inks.push(place(fourth, rest, free));
                }
            }
        }
    }
    inks.par_iter()
        .map(|x| lab_d50_to_oklab(cond.lab_relative(*x)))
        .collect()
}

/// Scales three free inks down together so that their sum stays within `room`.
fn scale_to_cap(free: [f64; 3], room: f64) -> [f64; 3] {
    let s: f64 = free.iter().sum();
    if s > room && s > 0.0 {
        let k = room.max(0.0) / s;
        free.map(|v| v * k)
    } else {
        free
    }
}

/// CMYK with ink `fixed_ink` at `value` and the others from `free` in order.
fn place(fixed_ink: usize, value: f64, free: [f64; 3]) -> [f64; 4] {
    let mut x = [0.0; 4];
    let mut f = free.iter();
    for (ink, v) in x.iter_mut().enumerate() {
        *v = if ink == fixed_ink {
            value
        } else {
            *f.next().unwrap_or(&0.0)
        };
    }
    x
}

/// Samples of the surface of the ITU-R BT.2020 RGB cube in OKLab (the source
/// gamut), `n` steps per face edge.
pub fn source_boundary_samples(n: usize) -> Vec<[f64; 3]> {
    let mut out = Vec::with_capacity(6 * (n + 1) * (n + 1));
    for axis in 0..3 {
        for fixed in [0.0, 1.0] {
            for i in 0..=n {
                for j in 0..=n {
                    let (u, v) = (i as f64 / n as f64, j as f64 / n as f64);
                    let mut rgb = [0.0; 3];
                    rgb[axis] = fixed;
                    rgb[(axis + 1) % 3] = u;
                    rgb[(axis + 2) % 3] = v;
                    out.push(lab_d50_to_oklab(css_rgb_to_lab_d50(CssRgbSpace::Rec2020, rgb)));
                }
            }
        }
    }
    out
}

/// CIELAB L* of the black of the ICC v4 perceptual reference medium
/// (ICC.1:2010, the perceptual intent's PCS black; from memory). Colour
/// management systems send perceptual colours to an output profile with
/// their black there (Little CMS applies black point compensation to every
/// v4 perceptual transform), so the perceptual table compresses lightness
/// from this black, not from L* 0: from L* 0 the shadows would be lifted
/// twice.
pub const REFERENCE_BLACK_L: f64 = 3.1373;

/// OKLab L of [`REFERENCE_BLACK_L`].
fn reference_black() -> f64 {
    lab_d50_to_oklab(LabD50::new(REFERENCE_BLACK_L, 0.0, 0.0))[0]
}

/// The cumulative normal Φ((x − centre)/width), by the complementary error
/// function (Abramowitz & Stegun 7.1.26, |error| < 1.5e-7).
fn sigmoid(x: f64) -> f64 {
    let z = (x - SIGMOID_CENTRE) / (SIGMOID_WIDTH * std::f64::consts::SQRT_2);
    let t = 1.0 / (1.0 + 0.327_591_1 * z.abs());
    let poly =
        t * (0.254_829_592 + t * (-0.284_496_736 + t * (1.421_413_741 + t * (-1.453_152_027 + t * 1.061_405_429))));
    let erf = 1.0 - poly * (-z * z).exp();
    0.5 * (1.0 + if z >= 0.0 { erf } else { -erf })
}

/// The gamut mappings of one press, with its boundary and the source's.
#[derive(Clone, Debug)]
pub struct Mapper {
    /// The press's boundary, from its darkest neutral up.
    pub press: LeafGamut,
    /// The boundary of the source colours: the surface of the BT.2020 RGB cube.
    pub source: LeafGamut,
}

/// Samples per free ink of the press boundary, and per face edge of the
/// source cube: dense enough that every 1° × 1/200 bin along the boundary
/// holds samples (checked by the descriptor tests).
pub const PRESS_SAMPLES: usize = 48;
/// See [`PRESS_SAMPLES`].
pub const SOURCE_SAMPLES: usize = 256;

impl Mapper {
    /// The mappings onto `cond`. The press's leaves start at its darkest
    /// neutral (the print of CIELAB 0/0/0), not at its darkest colour: some
    /// dark chromatic ink combinations (blue-black) print darker than any
    /// neutral, and a leaf reaching down to them would print a dark ramp
    /// that gains chroma darker than its neutral start, a lightness reversal.
    pub fn new(cond: &PrintCondition) -> Mapper {
        let black = super::invert::invert(cond, LabD50::new(0.0, 0.0, 0.0)).printed;
        let floor = lab_d50_to_oklab(black)[0];
        Mapper {
            press: LeafGamut::from_samples_above(&press_boundary_samples(cond, PRESS_SAMPLES), floor),
            source: LeafGamut::from_samples(&source_boundary_samples(SOURCE_SAMPLES)),
        }
    }

    /// Where `method` sends the media-relative CIELAB `target`; inside the
    /// press gamut (up to the descriptor's resolution).
    pub fn map(&self, method: Method, target: LabD50) -> LabD50 {
        let (l, c, h) = polar(lab_d50_to_oklab(target));
        let (l2, c2) = match method.clip_weight() {
            Some(kl) => self.clip(h, l, c, kl),
            None => self.compress(h, l, c, target.a.hypot(target.b)),
        };
        if l2 == l && c2 == c {
            return target;
        }
        let ok = rect(l2, c2, h);
        oklab_to_lab_d50(ok[0], ok[1], ok[2])
    }

    /// The clip of relative colorimetric (HPMINDE) and, with its own
    /// weight, of saturation: unchanged inside, else the boundary point of
    /// the leaf nearest with lightness weighted by `kl`.
    pub fn clip(&self, h: f64, l: f64, c: f64, kl: f64) -> LeafPoint {
        let leaf = self.press.leaf(h);
        if self.press.contains_on(&leaf, l, c) {
            return (l, c);
        }
        nearest_weighted(&leaf, (l, c), kl)
    }

    /// Whether a media-relative CIELAB colour lies clearly outside the press
    /// gamut: more than [`CLEARLY`] beyond the descriptor in OKLab.
    pub fn clearly_outside(&self, target: LabD50) -> bool {
        let (l, c, h) = polar(lab_d50_to_oklab(target));
        l < self.press.l_min - CLEARLY || l > self.press.l_max + CLEARLY || c > self.press.max_chroma(h, l) + CLEARLY
    }

    /// The chroma-dependent sigmoidal lightness compression of SGCK: with
    /// p_C = 1 − √(C³/(C³ + 5·10⁵)) (C = CIELAB chroma), the lightness moves
    /// by the share p_C of the way to its sigmoidally compressed value.
    pub fn compress_lightness(&self, l: f64, c_ab: f64) -> f64 {
        let (s0, s1) = (reference_black(), self.source.l_max);
        let (d0, d1) = (self.press.l_min, self.press.l_max);
        let (a, b) = (sigmoid(100.0 * s0), sigmoid(100.0 * s1));
        let x = l.clamp(s0, s1);
        let l_sig = d0 + (d1 - d0) * (sigmoid(100.0 * x) - a) / (b - a);
        let c3 = c_ab.powi(3);
        let p_c = 1.0 - (c3 / (c3 + 5e5)).sqrt();
        (1.0 - p_c) * l + p_c * l_sig
    }

    /// SGCK: lightness compression, then the knee compression along the
    /// line from the press cusp's lightness on the grey axis.
    pub fn compress(&self, h: f64, l: f64, c: f64, c_ab: f64) -> LeafPoint {
        let lr = self.compress_lightness(l, c_ab);
        let press_leaf = self.press.leaf(h);
        let focal = (cusp_of(&press_leaf).0, 0.0);
        let dir = (lr - focal.0, c);
        let d = dir.0.hypot(dir.1);
        if d < 1e-12 {
            return (lr, c);
        }
        let u = (dir.0 / d, dir.1 / d);
        let Some(d_r) = ray_exit(&press_leaf, focal, u) else {
            return nearest_weighted(&press_leaf, (lr, c), 1.0);
        };
        // The source boundary after the same lightness compression.
        let source_leaf: Vec<LeafPoint> = self
            .source
            .leaf(h)
            .into_iter()
            .map(|(sl, sc)| {
                let ok = rect(sl, sc, h);
                let lab = oklab_to_lab_d50(ok[0], ok[1], ok[2]);
                (self.compress_lightness(sl, lab.a.hypot(lab.b)), sc)
            })
            .collect();
        let d_o = ray_exit(&source_leaf, focal, u).unwrap_or(d_r);
        let knee = SGCK_KNEE * d_r;
        let d2 = if d <= knee {
            d
        } else if d_o > d_r {
            if d >= d_o {
                d_r
            } else {
                knee + (d - knee) * (d_r - knee) / (d_o - knee)
            }
        } else {
            d.min(d_r)
        };
        (focal.0 + d2 * u.0, d2 * u.1)
    }
}
