//! The printing model of a press condition: Yule–Nielsen modified Neugebauer
//! in CIE XYZ with Demichel weights, per-ink tone value curves calibrated so
//! that the Murray–Davies tone value of the model output follows the designed
//! curve, and the aims the model is built from.
//!
//! Units and conventions used throughout this file:
//! - ink amounts (`cmyk`) are fractions 0..1 of full coverage (1 = 100 %);
//! - XYZ is absolute colorimetry of the print as measured, D50 / 2°, with
//!   Y = 1 for the perfect reflecting diffuser (so paper white has Y < 1);
//! - CIELAB is relative to D50 (`LabD50`), either absolute (paper included)
//!   or ICC media-relative (XYZ scaled per channel by D50 / paper: the
//!   media-relative colorimetry of ICC.1:2010).

use std::sync::Arc;

use super::correction::Correction;
use super::spec::{newsprint_coldset_spec, offset_coated_spec, offset_uncoated_spec, PressSpec};
use super::tone::MonotoneCurve;
use super::PressError;
use crate::color::{LabD50, Xyz, D50};

/// Index of each ink in a CMYK quadruple.
pub const CYAN: usize = 0;
/// See [`CYAN`].
pub const MAGENTA: usize = 1;
/// See [`CYAN`].
pub const YELLOW: usize = 2;
/// See [`CYAN`].
pub const BLACK: usize = 3;

/// A press condition ready to evaluate: the spec plus the Neugebauer
/// primaries derived from it, or, for a condition fitted to measurements,
/// the measured primaries, measured tone curves and a smooth correction.
#[derive(Clone, Debug)]
pub struct PrintCondition {
    spec: PressSpec,
    /// Measured effective-coverage curves per ink (fractions in, fractions
    /// out); `None` for the designed curves of `spec.tvi50`.
    tone: Option<Arc<[MonotoneCurve; 4]>>,
    /// A media-relative CIELAB correction added to the model's output.
    correction: Option<Arc<Correction>>,
    /// Absolute XYZ of the 16 Neugebauer primaries; index bit 0 = C,
    /// bit 1 = M, bit 2 = Y, bit 3 = K.
    primaries: [[f64; 3]; 16],
    /// `primaries` raised to 1/n, per channel.
    primaries_root: [[f64; 3]; 16],
    paper: [f64; 3],
    /// Per ink: paper and solid tristimulus value in the ink's channel, and
    /// their 1/n roots, for the effective-coverage curve.
    ink_channel: [InkChannel; 4],
}

#[derive(Clone, Copy, Debug)]
struct InkChannel {
    paper: f64,
    solid: f64,
    paper_root: f64,
    solid_root: f64,
}

/// The tristimulus channel each ink absorbs most, used as the colorimetric
/// stand-in for the status density filter of that ink when measuring tone
/// value: cyan → X (red-weighted), magenta → Y (green), yellow → Z (blue),
/// black → Y (visual). Common practice when only colorimetry is at hand.
pub const MEASURING_CHANNEL: [usize; 4] = [0, 1, 2, 1];

/// The designed tone value curve: TV(a) = a + 4·T50·a·(1 − a).
///
/// A parabola through (0, 0), (0.5, 0.5 + T50) and (1, 1): the simplest
/// curve with the designed tone value increase T50 at 50 % (common practice
/// as an analytic stand-in for the tabulated curves of ISO 12647-2).
/// `a` and the result are fractions 0..1; monotone for T50 ≤ 0.25.
pub fn designed_tone_value(a: f64, tvi50: f64) -> f64 {
    a + 4.0 * tvi50 * a * (1.0 - a)
}

/// Murray–Davies tone value (ISO 12647-1 / ISO 13655 form):
/// TV = (R_paper − R_tint) / (R_paper − R_solid), with R any reflectance-
/// proportional quantity (here a tristimulus value). Returns a fraction.
/// `None` when paper and solid are equal.
pub fn murray_davies(paper: f64, tint: f64, solid: f64) -> Option<f64> {
    let span = paper - solid;
    (span.abs() > 1e-12).then(|| (paper - tint) / span)
}

/// Black-overprint rule: the tristimulus value of colour X printed under a
/// black solid, per channel,
///
/// R(X+K) = r0 + (R(X) − r0)·(R(K) − r0) / (R(paper) − r0),  r0 = f·R(paper).
///
/// With f = 0 this is the film-filter (density additivity) rule: the black
/// film transmits the same fraction of light whatever lies under it (common
/// practice). The floor r0 stands for light scattered back before it passes
/// through the whole film stack, which keeps densities from adding up
/// without bound (additivity failure; common practice). f = 0.01 puts the
/// floor at relative density 2.0, about the highest density reached on
/// coated offset (from memory).
pub fn black_overprint(x: f64, k: f64, paper: f64, floor_fraction: f64) -> f64 {
    let r0 = floor_fraction * paper;
    r0 + (x - r0) * (k - r0) / (paper - r0)
}

/// The built-in `offset-coated` condition.
pub fn offset_coated() -> PrintCondition {
    // The built-in spec passes `PrintCondition::new` (checked by the test
    // `built_in_spec_is_valid`), so it is built without the fallible path.
    PrintCondition::build_unchecked(offset_coated_spec())
}

/// The built-in `offset-uncoated` condition (see [`offset_coated`] on why
/// it is built unchecked).
pub fn offset_uncoated() -> PrintCondition {
    PrintCondition::build_unchecked(offset_uncoated_spec())
}

/// The built-in `newsprint-coldset` condition (see [`offset_coated`]).
pub fn newsprint_coldset() -> PrintCondition {
    PrintCondition::build_unchecked(newsprint_coldset_spec())
}

fn xyz_array(lab: LabD50) -> [f64; 3] {
    lab.to_xyz().to_array()
}

impl PrintCondition {
    /// Validates a spec and derives the Neugebauer primaries.
    pub fn new(spec: PressSpec) -> Result<Self, PressError> {
        let bad = |m: &str| Err(PressError::InvalidSpec(m.to_string()));
        if !(spec.yule_nielsen_n >= 1.0 && spec.yule_nielsen_n <= 10.0) {
            return bad("Yule-Nielsen n must lie in 1..=10");
        }
        if spec.tvi50.iter().any(|t| !(*t >= 0.0 && *t <= 0.25)) {
            return bad("TVI at 50 % must lie in 0..=25 %");
        }
        if !(spec.tac_percent > 0.0 && spec.tac_percent <= 400.0) {
            return bad("TAC must lie in (0, 400] %");
        }
        if !(spec.black_overprint_floor >= 0.0 && spec.black_overprint_floor < 0.5) {
            return bad("black overprint floor must lie in 0..0.5");
        }
        spec.gcr.validate()?;
        let a = &spec.aims;
        let all = [
            a.paper,
            a.cyan,
            a.magenta,
            a.yellow,
            a.black,
            a.cyan_magenta,
            a.cyan_yellow,
            a.magenta_yellow,
            a.cyan_magenta_yellow,
        ];
        if all
            .iter()
            .any(|l| !(l.l > 0.0 && l.l <= 100.0 && l.a.is_finite() && l.b.is_finite()))
        {
            return bad("aims must have 0 < L* <= 100 and finite a*, b*");
        }
        let c = Self::build_unchecked(spec);
        // Every ink must darken the paper in its measuring channel, and every
        // primary must be positive, or the tone value curves are undefined.
        for (i, ch) in c.ink_channel.iter().enumerate() {
            if ch.solid.is_nan() || ch.solid >= ch.paper {
                return Err(PressError::InvalidSpec(format!(
                    "ink {i} does not darken paper in its measuring channel"
                )));
            }
        }
        if c.primaries.iter().flatten().any(|v| v.is_nan() || *v <= 0.0) {
            return bad("every overprint must have positive tristimulus values");
        }
        Ok(c)
    }

    fn build_unchecked(spec: PressSpec) -> Self {
        let a = &spec.aims;
        let paper = xyz_array(a.paper);
        let mut p = [[0.0; 3]; 16];
        p[0] = paper;
        p[1] = xyz_array(a.cyan);
        p[2] = xyz_array(a.magenta);
        p[3] = xyz_array(a.cyan_magenta);
        p[4] = xyz_array(a.yellow);
        p[5] = xyz_array(a.cyan_yellow);
        p[6] = xyz_array(a.magenta_yellow);
        p[7] = xyz_array(a.cyan_magenta_yellow);
        let k = xyz_array(a.black);
        for j in 0..8 {
            for ch in 0..3 {
                p[8 + j][ch] = if j == 0 {
                    k[ch]
                } else {
                    black_overprint(p[j][ch], k[ch], paper[ch], spec.black_overprint_floor)
                };
            }
        }
        Self::from_primaries(spec, p, None)
    }

    /// A condition from measured primaries (absolute XYZ, index bits as in
    /// [`PrintCondition::primaries_xyz`]) and measured effective-coverage
    /// curves, without correction; `spec.tvi50` is then only a summary.
    /// The caller (the fit) has checked that every primary is positive and
    /// every ink darkens paper in its measuring channel.
    pub(crate) fn measured(spec: PressSpec, primaries: [[f64; 3]; 16], tone: [MonotoneCurve; 4]) -> Self {
        Self::from_primaries(spec, primaries, Some(Arc::new(tone)))
    }

    /// The same condition with a media-relative CIELAB correction added.
    pub(crate) fn with_correction(mut self, correction: Correction) -> Self {
        self.correction = Some(Arc::new(correction));
        self
    }

    /// The measured tone curves, if the condition was fitted.
    pub fn tone_curves(&self) -> Option<&[MonotoneCurve; 4]> {
        self.tone.as_deref()
    }

    /// The correction, if the condition was fitted with one.
    pub fn correction(&self) -> Option<&Correction> {
        self.correction.as_deref()
    }

    fn from_primaries(spec: PressSpec, p: [[f64; 3]; 16], tone: Option<Arc<[MonotoneCurve; 4]>>) -> Self {
        let paper = p[0];
        let inv_n = 1.0 / spec.yule_nielsen_n;
        let mut root = [[0.0; 3]; 16];
        for (r, q) in root.iter_mut().zip(p.iter()) {
            for ch in 0..3 {
                r[ch] = q[ch].max(0.0).powf(inv_n);
            }
        }
        let solid_index = [1usize, 2, 4, 8];
        let mut ink_channel = [InkChannel {
            paper: 0.0,
            solid: 0.0,
            paper_root: 0.0,
            solid_root: 0.0,
        }; 4];
        for (i, ic) in ink_channel.iter_mut().enumerate() {
            let ch = MEASURING_CHANNEL[i];
            *ic = InkChannel {
                paper: p[0][ch],
                solid: p[solid_index[i]][ch],
                paper_root: root[0][ch],
                solid_root: root[solid_index[i]][ch],
            };
        }
        PrintCondition {
            spec,
            tone,
            correction: None,
            primaries: p,
            primaries_root: root,
            paper,
            ink_channel,
        }
    }

    /// The spec the condition was built from.
    pub fn spec(&self) -> &PressSpec {
        &self.spec
    }

    /// The condition's short name, e.g. `offset-coated`.
    pub fn name(&self) -> &str {
        &self.spec.name
    }

    /// Total area coverage limit, percent.
    pub fn tac_percent(&self) -> f64 {
        self.spec.tac_percent
    }

    /// Absolute XYZ (D50, Y = 1 for the perfect diffuser) of the paper.
    pub fn paper_xyz(&self) -> Xyz {
        Xyz::new(self.paper[0], self.paper[1], self.paper[2])
    }

    /// Absolute XYZ of the 16 Neugebauer primaries (bit 0 = C, 1 = M,
    /// 2 = Y, 3 = K), the black overprints from [`black_overprint`].
    pub fn primaries_xyz(&self) -> [Xyz; 16] {
        self.primaries.map(|p| Xyz::new(p[0], p[1], p[2]))
    }

    /// The aims with their nominal CMYK (fractions) and absolute CIELAB,
    /// labelled "paper", "C", "M", "Y", "K", "C+M", "C+Y", "M+Y", "C+M+Y".
    pub fn aims(&self) -> Vec<(String, [f64; 4], LabD50)> {
        let a = &self.spec.aims;
        [
            ("paper", [0.0, 0.0, 0.0, 0.0], a.paper),
            ("C", [1.0, 0.0, 0.0, 0.0], a.cyan),
            ("M", [0.0, 1.0, 0.0, 0.0], a.magenta),
            ("Y", [0.0, 0.0, 1.0, 0.0], a.yellow),
            ("K", [0.0, 0.0, 0.0, 1.0], a.black),
            ("C+M", [1.0, 1.0, 0.0, 0.0], a.cyan_magenta),
            ("C+Y", [1.0, 0.0, 1.0, 0.0], a.cyan_yellow),
            ("M+Y", [0.0, 1.0, 1.0, 0.0], a.magenta_yellow),
            ("C+M+Y", [1.0, 1.0, 1.0, 0.0], a.cyan_magenta_yellow),
        ]
        .into_iter()
        .map(|(n, c, l)| (n.to_string(), c, l))
        .collect()
    }

    /// Effective (optical-gain-free) coverage of ink `ink` at nominal
    /// coverage `a` (fraction, clamped to 0..1).
    ///
    /// Chosen so that a single-ink tint, evaluated by the Yule–Nielsen
    /// model, has the Murray–Davies tone value TV(a) of
    /// [`designed_tone_value`] in the ink's measuring channel:
    /// R_t = R_p − TV(a)·(R_p − R_s), and solving
    /// R_t^(1/n) = (1 − e)·R_p^(1/n) + e·R_s^(1/n) for e gives
    /// e = (R_p^(1/n) − R_t^(1/n)) / (R_p^(1/n) − R_s^(1/n)).
    pub fn effective_coverage(&self, ink: usize, a: f64) -> f64 {
        let Some(ch) = self.ink_channel.get(ink) else {
            return 0.0;
        };
        let a = clamp01(a);
        if let Some(t) = &self.tone {
            return clamp01(t[ink].eval(a).0);
        }
        let tv = designed_tone_value(a, self.spec.tvi50[ink]);
        let rt = ch.paper - tv * (ch.paper - ch.solid);
        let root = rt.max(0.0).powf(1.0 / self.spec.yule_nielsen_n);
        let e = (ch.paper_root - root) / (ch.paper_root - ch.solid_root);
        clamp01(e)
    }

    /// Absolute XYZ of the print of `cmyk` (fractions, each clamped to
    /// 0..1; NaN counts as 0).
    ///
    /// Yule–Nielsen modified Neugebauer, applied per tristimulus channel:
    /// X^(1/n) = Σ_j w_j · X_j^(1/n) (same for Y, Z), w_j the Demichel
    /// weights of the effective coverages (Demichel 1924: products of
    /// e_i or 1 − e_i). Applying n to tristimulus values instead of
    /// spectral reflectances is an approximation, common practice when only
    /// colorimetric aims of the primaries are known.
    pub fn xyz_absolute(&self, cmyk: [f64; 4]) -> Xyz {
        if self.correction.is_none() {
            return self.model_xyz_absolute(cmyk);
        }
        let r = self.xyz_relative(cmyk);
        Xyz::new(
            r.x * self.paper[0] / D50.x,
            r.y * self.paper[1] / D50.y,
            r.z * self.paper[2] / D50.z,
        )
    }

    /// The printing model alone (no correction), absolute XYZ.
    fn model_xyz_absolute(&self, cmyk: [f64; 4]) -> Xyz {
        let e = [
            self.effective_coverage(CYAN, cmyk[0]),
            self.effective_coverage(MAGENTA, cmyk[1]),
            self.effective_coverage(YELLOW, cmyk[2]),
            self.effective_coverage(BLACK, cmyk[3]),
        ];
        let mut s = [0.0f64; 3];
        for (j, prim) in self.primaries_root.iter().enumerate() {
            let mut w = 1.0;
            for (i, ei) in e.iter().enumerate() {
                w *= if j & (1 << i) != 0 { *ei } else { 1.0 - *ei };
            }
            if w != 0.0 {
                for ch in 0..3 {
                    s[ch] += w * prim[ch];
                }
            }
        }
        let n = self.spec.yule_nielsen_n;
        Xyz::new(s[0].max(0.0).powf(n), s[1].max(0.0).powf(n), s[2].max(0.0).powf(n))
    }

    /// Media-relative XYZ (ICC.1:2010 media-relative colorimetry): absolute XYZ scaled per
    /// channel by D50 / paper, so paper maps to the PCS white D50.
    pub fn xyz_relative(&self, cmyk: [f64; 4]) -> Xyz {
        if self.correction.is_some() {
            return self.lab_relative(cmyk).to_xyz();
        }
        self.model_xyz_relative(cmyk)
    }

    fn model_xyz_relative(&self, cmyk: [f64; 4]) -> Xyz {
        let x = self.model_xyz_absolute(cmyk);
        Xyz::new(
            x.x * D50.x / self.paper[0],
            x.y * D50.y / self.paper[1],
            x.z * D50.z / self.paper[2],
        )
    }

    /// Absolute CIELAB (D50) of the print of `cmyk` (fractions 0..1),
    /// paper included, as a measurement on white backing would read it.
    pub fn lab_absolute(&self, cmyk: [f64; 4]) -> LabD50 {
        LabD50::from_xyz(self.xyz_absolute(cmyk))
    }

    /// ICC media-relative CIELAB of the print of `cmyk` (fractions 0..1):
    /// paper is L* = 100, a* = b* = 0.
    pub fn lab_relative(&self, cmyk: [f64; 4]) -> LabD50 {
        let lab = LabD50::from_xyz(self.model_xyz_relative(cmyk));
        match &self.correction {
            None => lab,
            Some(c) => {
                let d = c.eval(cmyk.map(clamp01));
                LabD50::new(lab.l + d[0], lab.a + d[1], lab.b + d[2])
            }
        }
    }

    /// Media-relative CIELAB of `cmyk` together with its Jacobian
    /// ∂(L*, a*, b*)/∂(c, m, y, k) (rows L*, a*, b*; per unit coverage).
    ///
    /// Analytic chain rule through the same formulas as
    /// [`PrintCondition::lab_relative`]: the tone value curve, the
    /// effective-coverage inversion, the multilinear Demichel sum, the power
    /// n and the CIELAB function f (CIE 015:2018, 8.2.1). At a bound (0 or 1)
    /// the derivative is the one-sided one from inside; a coverage outside
    /// 0..1 is clamped and has zero derivative.
    pub(crate) fn lab_relative_with_jacobian(&self, cmyk: [f64; 4]) -> (LabD50, [[f64; 4]; 3]) {
        let n = self.spec.yule_nielsen_n;
        let inv_n = 1.0 / n;
        let mut e = [0.0; 4];
        let mut de = [0.0; 4];
        for i in 0..4 {
            let ch = self.ink_channel[i];
            let inside = (0.0..=1.0).contains(&cmyk[i]);
            let a = clamp01(cmyk[i]);
            if let Some(t) = &self.tone {
                let (v, d) = t[i].eval(a);
                e[i] = clamp01(v);
                de[i] = if inside { d } else { 0.0 };
                continue;
            }
            let t50 = self.spec.tvi50[i];
            let tv = designed_tone_value(a, t50);
            let dtv = 1.0 + 4.0 * t50 * (1.0 - 2.0 * a);
            let rt = (ch.paper - tv * (ch.paper - ch.solid)).max(1e-12);
            let root = rt.powf(inv_n);
            let span = ch.paper_root - ch.solid_root;
            e[i] = clamp01((ch.paper_root - root) / span);
            // d root / da = (1/n)·rt^(1/n − 1)·(−dtv·(R_p − R_s))
            let droot = inv_n * root / rt * (-dtv * (ch.paper - ch.solid));
            de[i] = if inside { -droot / span } else { 0.0 };
        }
        let mut s = [0.0f64; 3];
        let mut ds = [[0.0f64; 4]; 3];
        for (j, prim) in self.primaries_root.iter().enumerate() {
            let mut f = [0.0; 4];
            let mut sign = [0.0; 4];
            for i in 0..4 {
                if j & (1 << i) != 0 {
                    f[i] = e[i];
                    sign[i] = 1.0;
                } else {
                    f[i] = 1.0 - e[i];
                    sign[i] = -1.0;
                }
            }
            let w = f[0] * f[1] * f[2] * f[3];
            let partial = [
                sign[0] * f[1] * f[2] * f[3],
                sign[1] * f[0] * f[2] * f[3],
                sign[2] * f[0] * f[1] * f[3],
                sign[3] * f[0] * f[1] * f[2],
            ];
            for ch in 0..3 {
                s[ch] += w * prim[ch];
                for i in 0..4 {
                    ds[ch][i] += partial[i] * prim[ch];
                }
            }
        }
        // t_c = R_c / paper_c is the media-relative value normalised by the
        // PCS white, i.e. the argument of the CIELAB function f.
        let mut fv = [0.0; 3];
        let mut dfv = [[0.0; 4]; 3];
        for ch in 0..3 {
            let sc = s[ch].max(0.0);
            let r = sc.powf(n);
            let t = r / self.paper[ch];
            let dr_ds = if sc > 0.0 { n * r / sc } else { 0.0 };
            let (f, df) = lab_f(t);
            fv[ch] = f;
            for i in 0..4 {
                dfv[ch][i] = df * dr_ds * ds[ch][i] * de[i] / self.paper[ch];
            }
        }
        let mut lab = LabD50::new(116.0 * fv[1] - 16.0, 500.0 * (fv[0] - fv[1]), 200.0 * (fv[1] - fv[2]));
        let mut jac = [[0.0; 4]; 3];
        for i in 0..4 {
            jac[0][i] = 116.0 * dfv[1][i];
            jac[1][i] = 500.0 * (dfv[0][i] - dfv[1][i]);
            jac[2][i] = 200.0 * (dfv[1][i] - dfv[2][i]);
        }
        if let Some(c) = &self.correction {
            // The correction reads clamped inks; along an ink outside 0..1
            // its gradient is zero, as the model's is.
            let clamped = cmyk.map(clamp01);
            let (d, dj) = c.eval_with_gradient(clamped);
            lab = LabD50::new(lab.l + d[0], lab.a + d[1], lab.b + d[2]);
            for row in 0..3 {
                for i in 0..4 {
                    if (0.0..=1.0).contains(&cmyk[i]) {
                        jac[row][i] += dj[row][i];
                    }
                }
            }
        }
        (lab, jac)
    }

    /// Murray–Davies tone value (fraction) of a single-ink tint of `ink` at
    /// nominal coverage `a`, measured on the model's absolute output in the
    /// ink's [`MEASURING_CHANNEL`].
    pub fn tone_value(&self, ink: usize, a: f64) -> Option<f64> {
        let ch = *MEASURING_CHANNEL.get(ink)?;
        let mut tint = [0.0; 4];
        tint[ink] = a;
        let mut solid = [0.0; 4];
        solid[ink] = 1.0;
        let r = |c: [f64; 4]| self.xyz_absolute(c).to_array()[ch];
        murray_davies(self.paper[ch], r(tint), r(solid))
    }
}

/// The CIELAB function f(t) and its derivative (CIE 015:2018, 8.2.1, with
/// the exact constants ε = 216/24389, κ = 24389/27).
fn lab_f(t: f64) -> (f64, f64) {
    const EPSILON: f64 = 216.0 / 24389.0;
    const KAPPA: f64 = 24389.0 / 27.0;
    if t > EPSILON {
        let c = t.cbrt();
        (c, 1.0 / (3.0 * c * c))
    } else {
        ((KAPPA * t + 16.0) / 116.0, KAPPA / 116.0)
    }
}

/// Clamps to 0..1, mapping NaN to 0.
pub(crate) fn clamp01(v: f64) -> f64 {
    if v > 0.0 {
        v.min(1.0)
    } else {
        0.0
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::color::delta::delta_e00;

    #[test]
    fn solids_reproduce_their_aims() {
        // The primaries are the aims themselves (ISO 12647-2 aims, from
        // memory); check the model returns them at the corners.
        let c = offset_coated();
        for (name, cmyk, aim) in c.aims() {
            let de = delta_e00(c.lab_absolute(cmyk), aim);
            assert!(de < 1e-9, "{name}: {de}");
        }
    }

    #[test]
    fn tone_value_follows_design() {
        // Murray–Davies tone value (ISO 12647-1 definition) of the model
        // output equals the designed parabola at every coverage.
        let c = offset_coated();
        for ink in 0..4 {
            for i in 0..=20 {
                let a = i as f64 / 20.0;
                let tv = c.tone_value(ink, a).unwrap();
                let want = designed_tone_value(a, c.spec().tvi50[ink]);
                assert!((tv - want).abs() < 1e-9, "ink {ink} a {a}: {tv} vs {want}");
            }
        }
    }

    #[test]
    fn yule_nielsen_one_is_murray_davies() {
        // With n = 1 and no tone value increase the model is plain
        // Neugebauer: a 50 % cyan tint is the arithmetic mean of paper and
        // solid XYZ (Murray–Davies, 1936).
        let mut spec = offset_coated_spec();
        spec.yule_nielsen_n = 1.0;
        spec.tvi50 = [0.0; 4];
        let c = PrintCondition::new(spec).unwrap();
        let half = c.xyz_absolute([0.5, 0.0, 0.0, 0.0]);
        let p = c.paper_xyz();
        let s = c.xyz_absolute([1.0, 0.0, 0.0, 0.0]);
        assert!((half.x - 0.5 * (p.x + s.x)).abs() < 1e-12);
        assert!((half.z - 0.5 * (p.z + s.z)).abs() < 1e-12);
    }

    #[test]
    fn black_rule_is_filter_without_floor() {
        // Density additivity (common practice): with no floor the overprint
        // density is the sum of the densities relative to paper.
        let (x, k, p) = (0.2, 0.03, 0.85);
        let mixed = black_overprint(x, k, p, 0.0);
        let d = |r: f64| -(r / p).log10();
        assert!((d(mixed) - (d(x) + d(k))).abs() < 1e-12);
    }

    #[test]
    fn jacobian_matches_central_differences() {
        // Central differences (O(h²), any numerical-analysis handbook) against
        // the analytic chain rule, away from the clamping bounds.
        let c = offset_coated();
        let h = 1e-6;
        for cmyk in [[0.3, 0.6, 0.1, 0.2], [0.9, 0.05, 0.5, 0.7], [0.5, 0.5, 0.5, 0.5]] {
            let (lab, jac) = c.lab_relative_with_jacobian(cmyk);
            let plain = c.lab_relative(cmyk);
            assert!((lab.l - plain.l).abs() < 1e-9 && (lab.a - plain.a).abs() < 1e-9);
            for i in 0..4 {
                let mut up = cmyk;
                up[i] += h;
                let mut dn = cmyk;
                dn[i] -= h;
                let (u, d) = (c.lab_relative(up).to_array(), c.lab_relative(dn).to_array());
                for row in 0..3 {
                    let num = (u[row] - d[row]) / (2.0 * h);
                    assert!(
                        (num - jac[row][i]).abs() < 1e-4 * (1.0 + num.abs()),
                        "{cmyk:?} {row} {i}: {num} vs {}",
                        jac[row][i]
                    );
                }
            }
        }
    }

    #[test]
    fn rejects_bad_spec() {
        let mut spec = offset_coated_spec();
        spec.tvi50[2] = 0.4;
        assert!(PrintCondition::new(spec).is_err());
        let mut spec = offset_coated_spec();
        spec.yule_nielsen_n = f64::NAN;
        assert!(PrintCondition::new(spec).is_err());
    }

    #[test]
    fn built_in_spec_is_valid() {
        assert!(PrintCondition::new(offset_coated_spec()).is_ok());
        assert!(PrintCondition::new(offset_uncoated_spec()).is_ok());
        assert!(PrintCondition::new(newsprint_coldset_spec()).is_ok());
    }
}
