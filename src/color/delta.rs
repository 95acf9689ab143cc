//! Colour-difference formulas over CIELAB (D50 in inkfit, though the formulas
//! themselves do not depend on the white).

use super::LabD50;

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
/// eq. (14): where the hues differ by more than 180° the mean is shifted by
/// 180°; at exactly 180° apart this implementation takes the branch
/// `h̄' = (h1' + h2' + 360°)/2` when the sum is below 360°.
pub fn delta_e00(lab1: LabD50, lab2: LabD50) -> f64 {
    let (l1, a1, b1) = (lab1.l, lab1.a, lab1.b);
    let (l2, a2, b2) = (lab2.l, lab2.a, lab2.b);

    let c1 = a1.hypot(b1);
    let c2 = a2.hypot(b2);
    let c_bar = 0.5 * (c1 + c2);
    let c_bar7 = c_bar.powi(7);
    let g = 0.5 * (1.0 - (c_bar7 / (c_bar7 + 25f64.powi(7))).sqrt());

    let a1p = (1.0 + g) * a1;
    let a2p = (1.0 + g) * a2;
    let c1p = a1p.hypot(b1);
    let c2p = a2p.hypot(b2);

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

    let t = 1.0 - 0.17 * (h_bar_p - 30.0).to_radians().cos()
        + 0.24 * (2.0 * h_bar_p).to_radians().cos()
        + 0.32 * (3.0 * h_bar_p + 6.0).to_radians().cos()
        - 0.20 * (4.0 * h_bar_p - 63.0).to_radians().cos();
    let d_theta = 30.0 * (-((h_bar_p - 275.0) / 25.0).powi(2)).exp();
    let c_bar_p7 = c_bar_p.powi(7);
    let rc = 2.0 * (c_bar_p7 / (c_bar_p7 + 25f64.powi(7))).sqrt();
    let l50 = (l_bar_p - 50.0).powi(2);
    let sl = 1.0 + 0.015 * l50 / (20.0 + l50).sqrt();
    let sc = 1.0 + 0.045 * c_bar_p;
    let sh = 1.0 + 0.015 * c_bar_p * t;
    let rt = -(2.0 * d_theta).to_radians().sin() * rc;

    let tl = dlp / sl;
    let tc = dcp / sc;
    let th = dhp_big / sh;
    (tl * tl + tc * tc + th * th + rt * tc * th).sqrt()
}
// TEMPORARY lead shim, replaced at merge.
pub fn delta_e94(a: LabD50, b: LabD50) -> f64 {
    delta_e76(a, b)
}
pub fn delta_e_cmc(a: LabD50, b: LabD50, _l: f64, _c: f64) -> f64 {
    delta_e76(a, b)
}
