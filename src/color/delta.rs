//! Colour-difference formulas over CIELAB (D50 in inkfit, though the formulas
//! themselves do not depend on the white): CIE76, CIE94 (graphic arts),
//! CMC(l:c) and CIEDE2000. All inputs are CIELAB (L* 0..100, a*, b* unbounded)
//! and all results are in ΔE units of the respective formula. Pure functions;
//! non-finite inputs give non-finite results, never a panic.

use super::LabD50;

/// The edge of a noticeable difference, 1 ΔE00: about one just-noticeable
/// difference for side-by-side viewing (common practice). The one threshold
/// behind "printable": a colour within it of the press gamut's boundary
/// (`gamut`), or whose round trip CIELAB → press → CIELAB returns within it
/// (`swatch::check`, `proof`), and the press tables' gamut tag
/// (`press::icc_writer`). It lies above the boundary test's voxel
/// discretisation (half a voxel of 1 ΔE*ab) and the 16-bit table quantisation.
pub const NOTICEABLE_DE00: f64 = 1.0;

/// CIE 1976 ΔE*ab: the Euclidean distance in CIELAB (CIE 015:2018, 8.2.4).
pub fn delta_e76(a: LabD50, b: LabD50) -> f64 {
    let dl = a.l - b.l;
    let da = a.a - b.a;
    let db = a.b - b.b;
    (dl * dl + da * da + db * db).sqrt()
}

/// CIEDE2000 with parametric factors kL = kC = kH = 1 (CIE 142-2001;
/// implementation notes of Sharma, Wu and Dalal, Color Res. Appl. 30, 2005).
///
/// Symmetric in its arguments. Hue means are taken as in Sharma et al.,
/// eq. (14): when |h1' − h2'| ≤ 180° the mean is the plain mean; when the
/// hues are more than 180° apart the mean is shifted by 180° (+360° to the sum
/// when the sum is below 360°, −360° otherwise). At exactly 180° apart the
/// plain mean is taken, as eq. (14) reads; the two candidate means differ by
/// 180° there, so ΔE00 is discontinuous on that edge (Sharma et al., section
/// "Mathematical observations", and their test pairs 13–15).
pub fn delta_e00(lab1: LabD50, lab2: LabD50) -> f64 {
    let [tl, tc, th, rt] = de00_terms(lab1, lab2);
    (tl * tl + tc * tc + th * th + rt * tc * th).sqrt()
}

/// CIEDE2000 as three residuals whose squared norm is ΔE00², for least
/// squares: with u = ΔC'/S_C and v = ΔH'/S_H, completing the square
/// (|R_T| ≤ 2) gives ΔE00² = (ΔL'/S_L)² + (u + R_T·v/2)² + (1 − R_T²/4)·v².
/// Differences are `sample` − `reference`.
pub fn delta_e00_residuals(reference: LabD50, sample: LabD50) -> [f64; 3] {
    let [tl, u, v, rt] = de00_terms(reference, sample);
    [tl, u + 0.5 * rt * v, (1.0 - 0.25 * rt * rt).max(0.0).sqrt() * v]
}

/// cos and sin of the phases 30°, 6° and 63° in T (Sharma et al., eq. 15),
/// to double precision (a unit test compares them with `f64::cos`/`sin`).
const T_PHASES: [(f64, f64); 3] = [
    (0.8660254037844387, 0.5),
    (0.9945218953682733, 0.10452846326765347),
    (0.4539904997395468, 0.8910065241883678),
];

/// The CIEDE2000 terms ΔL'/S_L, ΔC'/S_C, ΔH'/S_H and R_T (Sharma et al.,
/// eqs. 1–22), differences taken as `lab2` − `lab1`.
fn de00_terms(lab1: LabD50, lab2: LabD50) -> [f64; 4] {
    let (l1, a1, b1) = (lab1.l, lab1.a, lab1.b);
    let (l2, a2, b2) = (lab2.l, lab2.a, lab2.b);

    // Plain square roots rather than hypot: CIELAB values are far from
    // overflow, and hypot's scaling costs several times as much.
    let c1 = (a1 * a1 + b1 * b1).sqrt();
    let c2 = (a2 * a2 + b2 * b2).sqrt();
    let c_bar = 0.5 * (c1 + c2);
    let c_bar7 = c_bar.powi(7);
    let g = 0.5 * (1.0 - (c_bar7 / (c_bar7 + 25f64.powi(7))).sqrt());

    let a1p = (1.0 + g) * a1;
    let a2p = (1.0 + g) * a2;
    let c1p = (a1p * a1p + b1 * b1).sqrt();
    let c2p = (a2p * a2p + b2 * b2).sqrt();

    let hue = |b: f64, ap: f64| {
        if b == 0.0 && ap == 0.0 {
            0.0
        } else {
            let h = b.atan2(ap).to_degrees();
            if h < 0.0 {
                h + 360.0
            } else {
                h
            }
        }
    };
    let h1p = hue(b1, a1p);
    let h2p = hue(b2, a2p);

    let dlp = l2 - l1;
    let dcp = c2p - c1p;
    let dhp = if c1p * c2p == 0.0 {
        0.0
    } else {
        let d = h2p - h1p;
        if d > 180.0 {
            d - 360.0
        } else if d < -180.0 {
            d + 360.0
        } else {
            d
        }
    };
    let dhp_big = 2.0 * (c1p * c2p).sqrt() * (dhp.to_radians() / 2.0).sin();

    let l_bar_p = 0.5 * (l1 + l2);
    let c_bar_p = 0.5 * (c1p + c2p);
    let h_bar_p = if c1p * c2p == 0.0 {
        h1p + h2p
    } else if (h1p - h2p).abs() <= 180.0 {
        0.5 * (h1p + h2p)
    } else if h1p + h2p < 360.0 {
        0.5 * (h1p + h2p + 360.0)
    } else {
        0.5 * (h1p + h2p - 360.0)
    };

    // T (eq. 15) from one sine and cosine of h̄′: the multiple angles by
    // cos nh = 2 cos h · cos (n−1)h − cos (n−2)h and the same for sines, the
    // phase shifts by the angle-sum identities.
    let (s1, c1h) = h_bar_p.to_radians().sin_cos();
    let (c2h, s2h) = (2.0 * c1h * c1h - 1.0, 2.0 * s1 * c1h);
    let (c3h, s3h) = (2.0 * c1h * c2h - c1h, 2.0 * c1h * s2h - s1);
    let (c4h, s4h) = (2.0 * c1h * c3h - c2h, 2.0 * c1h * s3h - s2h);
    let [(c30, s30), (c6, s6), (c63, s63)] = T_PHASES;
    let t = 1.0 - 0.17 * (c1h * c30 + s1 * s30) + 0.24 * c2h + 0.32 * (c3h * c6 - s3h * s6)
        - 0.20 * (c4h * c63 + s4h * s63);
    let d_theta = 30.0 * (-((h_bar_p - 275.0) / 25.0).powi(2)).exp();
    let c_bar_p7 = c_bar_p.powi(7);
    let rc = 2.0 * (c_bar_p7 / (c_bar_p7 + 25f64.powi(7))).sqrt();
    let l50 = (l_bar_p - 50.0).powi(2);
    let sl = 1.0 + 0.015 * l50 / (20.0 + l50).sqrt();
    let sc = 1.0 + 0.045 * c_bar_p;
    let sh = 1.0 + 0.015 * c_bar_p * t;
    let rt = -(2.0 * d_theta).to_radians().sin() * rc;

    [dlp / sl, dcp / sc, dhp_big / sh, rt]
}

/// Chroma of (a, b), and the squared CIELAB hue difference ΔH*² between two
/// colours, computed as 2·(C1·C2 − a1·a2 − b1·b2) (algebraically equal to
/// Δa² + Δb² − ΔC², CIE 015:2018, 8.2.3, but free of the cancellation that
/// makes that form slightly negative for nearly equal hues), floored at 0.
fn chroma_and_hue_diff_sq(reference: LabD50, sample: LabD50) -> (f64, f64, f64) {
    let c1 = reference.a.hypot(reference.b);
    let c2 = sample.a.hypot(sample.b);
    let dh2 = 2.0 * (c1 * c2 - reference.a * sample.a - reference.b * sample.b);
    (c1, c2, dh2.max(0.0))
}

/// CIE94 colour difference (CIE 116-1995) with the graphic-arts parametric
/// factors kL = kC = kH = 1 and K1 = 0.045, K2 = 0.015:
///
/// ΔE94 = √[(ΔL*/(kL·SL))² + (ΔC*/(kC·SC))² + (ΔH*/(kH·SH))²],
/// SL = 1, SC = 1 + K1·C*, SH = 1 + K2·C*.
///
/// C* is the chroma of `reference` (the standard), as the graphic-arts use of
/// the formula specifies (CIE 116-1995 allows the geometric mean of the two
/// chromas when neither colour is a standard). The formula is therefore
/// **not symmetric**: swapping reference and sample changes SC and SH, and
/// hence the result, whenever the two chromas differ.
pub fn delta_e94(reference: LabD50, sample: LabD50) -> f64 {
    const K1: f64 = 0.045;
    const K2: f64 = 0.015;
    let (c1, c2, dh2) = chroma_and_hue_diff_sq(reference, sample);
    let dl = reference.l - sample.l;
    let dc = c1 - c2;
    let sc = 1.0 + K1 * c1;
    let sh = 1.0 + K2 * c1;
    let tc = dc / sc;
    (dl * dl + tc * tc + dh2 / (sh * sh)).sqrt()
}

/// CMC(l:c) colour difference (Clarke, McDonald and Rigg 1984; BS 6923:1988;
/// ISO 105-J03):
///
/// ΔE = √[(ΔL*/(l·SL))² + (ΔC*/(c·SC))² + (ΔH*/SH)²], with, from the
/// reference (standard) colour L1, C1, h1 (h1 in degrees, 0..360):
/// - SL = 0.511 if L1 < 16, else 0.040975·L1 / (1 + 0.01765·L1);
/// - SC = 0.0638·C1 / (1 + 0.0131·C1) + 0.638;
/// - F = √(C1⁴ / (C1⁴ + 1900)), SH = SC·(F·T + 1 − F);
/// - T = 0.56 + |0.2·cos(h1 + 168°)| if 164° ≤ h1 ≤ 345°, else
///   0.36 + |0.4·cos(h1 + 35°)|.
///
/// `l` and `c` are the lightness and chroma weights (inkfit uses 2:1 for
/// acceptability; 1:1 is the perceptibility form). Like CIE94 the formula is
/// not symmetric: the weights come from `reference`.
pub fn delta_e_cmc(reference: LabD50, sample: LabD50, l: f64, c: f64) -> f64 {
    let (c1, c2, dh2) = chroma_and_hue_diff_sq(reference, sample);
    let l1 = reference.l;
    let dl = l1 - sample.l;
    let dc = c1 - c2;
    let sl = if l1 < 16.0 {
        0.511
    } else {
        0.040975 * l1 / (1.0 + 0.01765 * l1)
    };
    let sc = 0.0638 * c1 / (1.0 + 0.0131 * c1) + 0.638;
    let mut h1 = reference.b.atan2(reference.a).to_degrees();
    if h1 < 0.0 {
        h1 += 360.0;
    }
    let t = if (164.0..=345.0).contains(&h1) {
        0.56 + (0.2 * (h1 + 168.0).to_radians().cos()).abs()
    } else {
        0.36 + (0.4 * (h1 + 35.0).to_radians().cos()).abs()
    };
    let c1_4 = c1 * c1 * c1 * c1;
    let f = (c1_4 / (c1_4 + 1900.0)).sqrt();
    let sh = sc * (f * t + 1.0 - f);
    let tl = dl / (l * sl);
    let tc = dc / (c * sc);
    (tl * tl + tc * tc + dh2 / (sh * sh)).sqrt()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn t_phases_are_the_cosines_and_sines_of_their_angles() {
        for ((c, s), deg) in T_PHASES.into_iter().zip([30.0f64, 6.0, 63.0]) {
            assert!((c - deg.to_radians().cos()).abs() < 1e-15 && (s - deg.to_radians().sin()).abs() < 1e-15);
        }
    }

    #[test]
    fn t_from_multiple_angles_is_eq_15_as_written() {
        // Property: through ΔE00 of pure hue differences (ΔH′/S_H with
        // S_H = 1 + 0.015·C̄′·T), T equals Sharma et al.'s eq. 15 evaluated
        // with four cosines, to rounding, at mean hues around the circle.
        let textbook = |h: f64| {
            1.0 - 0.17 * (h - 30.0).to_radians().cos()
                + 0.24 * (2.0 * h).to_radians().cos()
                + 0.32 * (3.0 * h + 6.0).to_radians().cos()
                - 0.20 * (4.0 * h - 63.0).to_radians().cos()
        };
        for k in 0..720 {
            let h = f64::from(k) * 0.5;
            // Two colours of chroma 30, 4° apart in hue; their primed
            // chromas and hues are computed below as eqs. 2–7 define them.
            let at = |deg: f64| {
                let (s, c) = deg.to_radians().sin_cos();
                LabD50::new(50.0, 30.0 * c, 30.0 * s)
            };
            let (p, q) = (at(h - 2.0), at(h + 2.0));
            let [_, _, th, _] = de00_terms(p, q);
            let g = 0.5 * (1.0 - (30f64.powi(7) / (30f64.powi(7) + 25f64.powi(7))).sqrt());
            let prime = |l: LabD50| {
                let ap = (1.0 + g) * l.a;
                (
                    (ap * ap + l.b * l.b).sqrt(),
                    l.b.atan2(ap).to_degrees().rem_euclid(360.0),
                )
            };
            let ((cp, hp), (cq, hq)) = (prime(p), prime(q));
            let mut dh = hq - hp;
            if dh > 180.0 {
                dh -= 360.0;
            } else if dh < -180.0 {
                dh += 360.0;
            }
            let mut hbar = 0.5 * (hp + hq);
            if (hp - hq).abs() > 180.0 {
                hbar += if hp + hq < 360.0 { 180.0 } else { -180.0 };
            }
            let dhp_big = 2.0 * (cp * cq).sqrt() * (dh.to_radians() / 2.0).sin();
            let sh = 1.0 + 0.015 * 0.5 * (cp + cq) * textbook(hbar);
            assert!((th - dhp_big / sh).abs() < 1e-12, "h̄ {h}: {th} vs {}", dhp_big / sh);
        }
    }
}
