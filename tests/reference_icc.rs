//! The built-in screen profiles, run through lcms2, against their published
//! definitions and against an independent colour library (`palette`).

use inkfit::color::delta::delta_e76;
use inkfit::color::{LabD50, Xyz};
use inkfit::icc::builtin;
use inkfit::icc::transform::lab_d50_profile;
use lcms2::{PixelFormat, Profile, Transform};
use palette::chromatic_adaptation::AdaptIntoUnclamped;
use palette::white_point::{D50, D65};
use palette::{FromColor, Lab, LinSrgb, Srgb};

fn to_lab(name: &str, rgb: &[[f64; 3]]) -> Vec<LabD50> {
    let bytes = builtin::bytes(name).unwrap().unwrap();
    let p = Profile::new_icc(&bytes).unwrap();
    let lab = lab_d50_profile();
    let t: Transform<[f64; 3], [f64; 3]> = Transform::new(
        &p,
        PixelFormat::RGB_DBL,
        &lab,
        PixelFormat::Lab_DBL,
        lcms2::Intent::RelativeColorimetric,
    )
    .unwrap();
    let mut out = vec![[0.0; 3]; rgb.len()];
    t.transform_pixels(rgb, &mut out);
    out.into_iter().map(LabD50::from_array).collect()
}

const SAMPLES: &[[f64; 3]] = &[
    [1.0, 1.0, 1.0],
    [1.0, 0.0, 0.0],
    [0.0, 1.0, 0.0],
    [0.0, 0.0, 1.0],
    [0.5, 0.5, 0.5],
    [0.2, 0.4, 0.6],
    [0.9, 0.7, 0.1],
    [0.05, 0.02, 0.03],
    [0.33, 0.8, 0.25],
];

/// sRGB through the built-in ICC profile against `palette` (sRGB decoding of
/// IEC 61966-2-1, Bradford to D50), within 0.05 ΔE*ab.
#[test]
fn srgb_profile_matches_independent_library() {
    let ours = to_lab("srgb", SAMPLES);
    for (rgb, lab) in SAMPLES.iter().zip(ours) {
        let lin: LinSrgb<f64> = Srgb::new(rgb[0], rgb[1], rgb[2]).into_linear();
        let xyz65 = palette::Xyz::<D65, f64>::from_color(lin);
        let xyz50: palette::Xyz<D50, f64> = xyz65.adapt_into_unclamped();
        let reference = Lab::<D50, f64>::from_color(xyz50);
        let reference = LabD50::new(reference.l, reference.a, reference.b);
        let d = delta_e76(lab, reference);
        assert!(
            d < 0.05,
            "rgb {rgb:?}: ours {lab:?}, palette {reference:?}, ΔE76 {d:.4}"
        );
    }
}

/// IEC 61966-2-1: white is D65, adapted to the D50 PCS white (L* 100, a* b* 0);
/// encoded 0.5 decodes to ((0.5 + 0.055)/1.055)^2.4 = 0.21404, so a neutral
/// at 0.5 has L* = 116·0.21404^(1/3) − 16 = 53.39 (CIE 015 L* formula).
#[test]
fn srgb_white_and_mid_grey_follow_the_standard() {
    let lab = to_lab("srgb", &[[1.0, 1.0, 1.0], [0.5, 0.5, 0.5]]);
    assert!(
        (lab[0].l - 100.0).abs() < 0.01 && lab[0].a.abs() < 0.01 && lab[0].b.abs() < 0.01,
        "{:?}",
        lab[0]
    );
    let y: f64 = ((0.5 + 0.055) / 1.055f64).powf(2.4);
    let l = 116.0 * y.cbrt() - 16.0;
    assert!((l - 53.389).abs() < 0.001);
    assert!((lab[1].l - l).abs() < 0.02, "{:?} vs {l}", lab[1]);
    assert!(lab[1].a.abs() < 0.02 && lab[1].b.abs() < 0.02);
}

/// Bradford D50 → `white`, used to undo the PCS adaptation (Lam 1985).
fn un_adapt(xyz: Xyz, white: [f64; 3]) -> [f64; 3] {
    let m = inkfit::icc::inspect::bradford([0.9642, 1.0, 0.8249], white);
    let v = xyz.to_array();
    [0, 1, 2].map(|i| m[i][0] * v[0] + m[i][1] * v[1] + m[i][2] * v[2])
}

/// Primary columns of the RGB → XYZ matrices published with each standard
/// (four decimals, from memory): opRGB in IEC 61966-2-5 (D65), ROMM RGB in
/// ISO 22028-2 (D50), sRGB in IEC 61966-2-1 (D65).
#[test]
fn primaries_match_the_published_matrices() {
    let d65 = [0.3127 / 0.3290, 1.0, (1.0 - 0.3127 - 0.3290) / 0.3290];
    type Case = (&'static str, Option<[f64; 3]>, [[f64; 3]; 3]);
    let cases: &[Case] = &[
        (
            "srgb",
            Some(d65),
            [
                [0.4124, 0.2126, 0.0193],
                [0.3576, 0.7152, 0.1192],
                [0.1805, 0.0722, 0.9505],
            ],
        ),
        (
            "oprgb",
            Some(d65),
            [
                [0.5767, 0.2973, 0.0270],
                [0.1856, 0.6274, 0.0707],
                [0.1882, 0.0753, 0.9911],
            ],
        ),
        (
            "prophoto",
            None,
            [
                [0.7977, 0.2880, 0.0000],
                [0.1352, 0.7119, 0.0000],
                [0.0313, 0.0001, 0.8249],
            ],
        ),
    ];
    for (name, white, columns) in cases {
        let lab = to_lab(name, &[[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]]);
        for (i, (l, expected)) in lab.iter().zip(columns).enumerate() {
            let xyz = l.to_xyz();
            let got = match white {
                Some(w) => un_adapt(xyz, *w),
                None => xyz.to_array(),
            };
            for k in 0..3 {
                assert!(
                    (got[k] - expected[k]).abs() < 2.5e-3,
                    "{name} primary {i} component {k}: expected {expected:?}, got {got:?}"
                );
            }
        }
    }
}

/// ITU-R BT.2020: the inverse OETF at V = 0.5 is ((0.5 + 0.0993)/1.0993)^(1/0.45),
/// and below 4.5β the curve is linear with slope 1/4.5.
#[test]
fn rec2020_transfer_function_follows_bt2020() {
    let alpha: f64 = 1.099_296_826_809_44;
    let y_mid: f64 = ((0.5 + alpha - 1.0) / alpha).powf(1.0 / 0.45);
    let y_low = 0.05 / 4.5;
    let lab = to_lab("rec2020", &[[0.5, 0.5, 0.5], [0.05, 0.05, 0.05]]);
    let l_of = |y: f64| LabD50::from_xyz(Xyz::new(0.9642 * y, y, 0.8249 * y)).l;
    assert!((lab[0].l - l_of(y_mid)).abs() < 0.02, "{:?} vs {}", lab[0], l_of(y_mid));
    assert!((lab[1].l - l_of(y_low)).abs() < 0.02, "{:?} vs {}", lab[1], l_of(y_low));
}

/// The built-in display-p3 and rec2020 ICC profiles against the CSS Color 4
/// definitions of `color(display-p3 …)` and `color(rec2020 …)` (its sample
/// matrices and transfer functions), within 0.05 ΔE*ab.
#[test]
fn wide_gamut_profiles_match_css_color_4() {
    use inkfit::color::spaces::{css_rgb_to_lab_d50, CssRgbSpace};
    for (name, space) in [
        ("display-p3", CssRgbSpace::DisplayP3),
        ("rec2020", CssRgbSpace::Rec2020),
        ("srgb", CssRgbSpace::Srgb),
    ] {
        let ours = to_lab(name, SAMPLES);
        for (rgb, lab) in SAMPLES.iter().zip(ours) {
            let css = css_rgb_to_lab_d50(space, *rgb);
            let d = delta_e76(lab, css);
            assert!(d < 0.05, "{name} {rgb:?}: ICC {lab:?}, CSS {css:?}, ΔE76 {d:.4}");
        }
    }
}
