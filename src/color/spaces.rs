//! The CSS-defined RGB spaces (sRGB, Display P3, Rec. 2020) and Oklab/Oklch,
//! with the conversions defined by CSS Color Module Level 4 (section 18,
//! "Sample code for color conversions", and section 10.7 for the Bradford
//! white-point adaptation), plus the CSS Color 4 HSL → sRGB algorithm.
//!
//! Units and ranges:
//! - encoded and linear RGB are unit-range components (0..1 inside the gamut);
//!   values outside 0..1 are accepted everywhere and the transfer functions are
//!   extended sign-symmetrically, as CSS Color 4 does for extended ranges;
//! - XYZ has Y = 1 for the white of its space (D65 for the RGB spaces and
//!   Oklab, D50 for CIELAB);
//! - Oklab L is 0..1 (white = 1), a/b roughly −0.4..0.4;
//! - CIELAB D50 as in [`LabD50`].
//!
//! CIELAB here is computed against the CSS D50 white, the chromaticity
//! (0.3457, 0.3585) at Y = 1 ([`D50_CSS`]), which is the white the CSS
//! Bradford matrix adapts D65 to. It differs from the ICC PCS white ([`D50`](super::D50),
//! the s15Fixed16 encoding 0.9642 / 0.8249) by less than 2.5·10⁻⁴ in X and Z;
//! white maps to white (L* = 100, a* = b* = 0) in both, which is what the
//! relative CIELAB numbers mean.

use super::{lab_to_xyz, xyz_to_lab, LabD50, Xyz};

/// A 3×3 matrix, row-major, applied to column vectors.
pub type Mat3 = [[f64; 3]; 3];

/// The CSS Color 4 D50 white: chromaticity (0.3457, 0.3585), Y = 1
/// (CSS Color 4, section 18, `D50` in the sample code).
pub const D50_CSS: Xyz = Xyz {
    x: 0.3457 / 0.3585,
    y: 1.0,
    z: (1.0 - 0.3457 - 0.3585) / 0.3585,
};

/// The RGB spaces of CSS Color 4 that inkfit accepts in `color()`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum CssRgbSpace {
    /// IEC 61966-2-1 sRGB (CSS `srgb`).
    Srgb,
    /// Display P3: DCI-P3 primaries, D65 white, sRGB transfer (CSS `display-p3`).
    DisplayP3,
    /// ITU-R BT.2020 primaries and transfer function (CSS `rec2020`).
    Rec2020,
}

// Matrices from CSS Color 4, section 18 (sample code `conversions.js`),
// kept as the rational numbers the specification gives.

/// Linear sRGB → XYZ D65.
pub const SRGB_TO_XYZ_D65: Mat3 = [
    [506752.0 / 1228815.0, 87881.0 / 245763.0, 12673.0 / 70218.0],
    [87098.0 / 409605.0, 175762.0 / 245763.0, 12673.0 / 175545.0],
    [7918.0 / 409605.0, 87881.0 / 737289.0, 1001167.0 / 1053270.0],
];
/// XYZ D65 → linear sRGB.
pub const XYZ_D65_TO_SRGB: Mat3 = [
    [12831.0 / 3959.0, -329.0 / 214.0, -1974.0 / 3959.0],
    [-851781.0 / 878810.0, 1648619.0 / 878810.0, 36519.0 / 878810.0],
    [705.0 / 12673.0, -2585.0 / 12673.0, 705.0 / 667.0],
];
/// Linear Display P3 → XYZ D65.
pub const P3_TO_XYZ_D65: Mat3 = [
    [608311.0 / 1250200.0, 189793.0 / 714400.0, 198249.0 / 1000160.0],
    [35783.0 / 156275.0, 247089.0 / 357200.0, 198249.0 / 2500400.0],
    [0.0, 32229.0 / 714400.0, 5220557.0 / 5000800.0],
];
/// XYZ D65 → linear Display P3.
pub const XYZ_D65_TO_P3: Mat3 = [
    [446124.0 / 178915.0, -333277.0 / 357830.0, -72051.0 / 178915.0],
    [-14852.0 / 17905.0, 63121.0 / 35810.0, 423.0 / 17905.0],
    [11844.0 / 330415.0, -50337.0 / 660830.0, 316169.0 / 330415.0],
];
/// Linear Rec. 2020 → XYZ D65.
pub const REC2020_TO_XYZ_D65: Mat3 = [
    [
        63426534.0 / 99577255.0,
        20160776.0 / 139408157.0,
        47086771.0 / 278816314.0,
    ],
    [
        26158966.0 / 99577255.0,
        472592308.0 / 697040785.0,
        8267143.0 / 139408157.0,
    ],
    [0.0, 19567812.0 / 697040785.0, 295819943.0 / 278816314.0],
];
/// XYZ D65 → linear Rec. 2020.
pub const XYZ_D65_TO_REC2020: Mat3 = [
    [
        30757411.0 / 17917100.0,
        -6372589.0 / 17917100.0,
        -4539589.0 / 17917100.0,
    ],
    [-19765991.0 / 29648200.0, 47925759.0 / 29648200.0, 467509.0 / 29648200.0],
    [792561.0 / 44930125.0, -1921689.0 / 44930125.0, 42328811.0 / 44930125.0],
];
/// Bradford chromatic adaptation XYZ D65 → XYZ D50 (CSS Color 4, section 18).
pub const D65_TO_D50: Mat3 = [
    [1.0479297925449969, 0.022946870601609652, -0.05019226628920524],
    [0.02962780877005599, 0.9904344267538799, -0.017073799063418826],
    [-0.009243040646204504, 0.015055191490298152, 0.7518742814281371],
];
/// Bradford chromatic adaptation XYZ D50 → XYZ D65 (CSS Color 4, section 18).
pub const D50_TO_D65: Mat3 = [
    [0.955473421488075, -0.02309845494876471, 0.06325924320057072],
    [-0.0283697093338637, 1.0099953980813041, 0.021041441191917323],
    [0.012314014864481998, -0.020507649298898964, 1.330365926242124],
];
/// XYZ D65 → Oklab LMS (CSS Color 4, section 18).
pub const XYZ_D65_TO_LMS: Mat3 = [
    [0.819022437996703, 0.3619062600528904, -0.1288737815209879],
    [0.0329836539323885, 0.9292868615863434, 0.0361446663506424],
    [0.0481771893596242, 0.2642395317527308, 0.6335478284694309],
];
/// Oklab LMS → XYZ D65 (CSS Color 4, section 18).
pub const LMS_TO_XYZ_D65: Mat3 = [
    [1.2268798758459243, -0.5578149944602171, 0.2813910456659647],
    [-0.0405757452148008, 1.112286803280317, -0.0717110580655164],
    [-0.0763729366746601, -0.4214933324022432, 1.5869240198367816],
];
/// Cube-rooted LMS → Oklab (CSS Color 4, section 18), digits as printed there.
#[allow(clippy::excessive_precision)]
pub const LMS_TO_OKLAB: Mat3 = [
    [0.210454268309314, 0.7936177747023054, -0.0040720430116193],
    [1.9779985324311684, -2.4285922420485799, 0.450593709617411],
    [0.0259040424655478, 0.7827717124575296, -0.8086757549230774],
];
/// Oklab → cube-rooted LMS (CSS Color 4, section 18).
pub const OKLAB_TO_LMS: Mat3 = [
    [1.0, 0.3963377773761749, 0.2158037573099136],
    [1.0, -0.1055613458156586, -0.0638541728258133],
    [1.0, -0.0894841775298119, -1.2914855480194092],
];

/// Rec. 2020 transfer constants α and β (ITU-R BT.2020-2, Table 4, as
/// written in CSS Color 4, section 18).
pub const REC2020_ALPHA: f64 = 1.09929682680944;
/// See [`REC2020_ALPHA`].
pub const REC2020_BETA: f64 = 0.018053968510807;

/// `m · v` for a column vector `v`.
pub fn mat3_mul(m: &Mat3, v: [f64; 3]) -> [f64; 3] {
    [
        m[0][0] * v[0] + m[0][1] * v[1] + m[0][2] * v[2],
        m[1][0] * v[0] + m[1][1] * v[1] + m[1][2] * v[2],
        m[2][0] * v[0] + m[2][1] * v[1] + m[2][2] * v[2],
    ]
}

fn xyz_of(v: [f64; 3]) -> Xyz {
    Xyz::new(v[0], v[1], v[2])
}

/// sRGB (and Display P3) decoding, IEC 61966-2-1 as written in CSS Color 4
/// (`lin_sRGB`): |v| ≤ 0.04045 → v/12.92, else sign(v)·((|v|+0.055)/1.055)^2.4.
pub fn srgb_to_linear(v: f64) -> f64 {
    let a = v.abs();
    if a <= 0.04045 {
        v / 12.92
    } else {
        ((a + 0.055) / 1.055).powf(2.4).copysign(v)
    }
}

/// sRGB (and Display P3) encoding, inverse of [`srgb_to_linear`] (CSS Color 4
/// `gam_sRGB`): |v| > 0.0031308 → sign(v)·(1.055·|v|^(1/2.4) − 0.055), else 12.92·v.
pub fn srgb_from_linear(v: f64) -> f64 {
    let a = v.abs();
    if a > 0.0031308 {
        (1.055 * a.powf(1.0 / 2.4) - 0.055).copysign(v)
    } else {
        12.92 * v
    }
}

/// Rec. 2020 decoding (CSS Color 4 `lin_2020`): |v| < 4.5·β → v/4.5, else
/// sign(v)·((|v| + α − 1)/α)^(1/0.45).
pub fn rec2020_to_linear(v: f64) -> f64 {
    let a = v.abs();
    if a < REC2020_BETA * 4.5 {
        v / 4.5
    } else {
        ((a + REC2020_ALPHA - 1.0) / REC2020_ALPHA).powf(1.0 / 0.45).copysign(v)
    }
}

/// Rec. 2020 encoding (CSS Color 4 `gam_2020`): |v| > β → sign(v)·(α·|v|^0.45 − (α − 1)),
/// else 4.5·v.
pub fn rec2020_from_linear(v: f64) -> f64 {
    let a = v.abs();
    if a > REC2020_BETA {
        (REC2020_ALPHA * a.powf(0.45) - (REC2020_ALPHA - 1.0)).copysign(v)
    } else {
        4.5 * v
    }
}

impl CssRgbSpace {
    /// The identifier CSS uses in `color()`.
    pub fn css_name(self) -> &'static str {
        match self {
            CssRgbSpace::Srgb => "srgb",
            CssRgbSpace::DisplayP3 => "display-p3",
            CssRgbSpace::Rec2020 => "rec2020",
        }
    }

    /// The space for a CSS `color()` identifier (ASCII case-insensitive).
    pub fn from_css_name(name: &str) -> Option<Self> {
        [Self::Srgb, Self::DisplayP3, Self::Rec2020]
            .into_iter()
            .find(|s| s.css_name().eq_ignore_ascii_case(name))
    }

    /// Decode one encoded component to linear light.
    pub fn to_linear(self, v: f64) -> f64 {
        match self {
            CssRgbSpace::Srgb | CssRgbSpace::DisplayP3 => srgb_to_linear(v),
            CssRgbSpace::Rec2020 => rec2020_to_linear(v),
        }
    }

    /// Encode one linear-light component.
    pub fn from_linear(self, v: f64) -> f64 {
        match self {
            CssRgbSpace::Srgb | CssRgbSpace::DisplayP3 => srgb_from_linear(v),
            CssRgbSpace::Rec2020 => rec2020_from_linear(v),
        }
    }

    /// Linear RGB → XYZ D65 matrix.
    pub fn to_xyz_d65_matrix(self) -> &'static Mat3 {
        match self {
            CssRgbSpace::Srgb => &SRGB_TO_XYZ_D65,
            CssRgbSpace::DisplayP3 => &P3_TO_XYZ_D65,
            CssRgbSpace::Rec2020 => &REC2020_TO_XYZ_D65,
        }
    }

    /// XYZ D65 → linear RGB matrix.
    pub fn from_xyz_d65_matrix(self) -> &'static Mat3 {
        match self {
            CssRgbSpace::Srgb => &XYZ_D65_TO_SRGB,
            CssRgbSpace::DisplayP3 => &XYZ_D65_TO_P3,
            CssRgbSpace::Rec2020 => &XYZ_D65_TO_REC2020,
        }
    }

    /// Linear RGB → XYZ relative to D65 (Y = 1 for white).
    pub fn linear_to_xyz_d65(self, linear: [f64; 3]) -> Xyz {
        xyz_of(mat3_mul(self.to_xyz_d65_matrix(), linear))
    }

    /// XYZ relative to D65 → linear RGB (unclamped).
    pub fn xyz_d65_to_linear(self, xyz: Xyz) -> [f64; 3] {
        mat3_mul(self.from_xyz_d65_matrix(), xyz.to_array())
    }

    /// Encoded RGB → linear RGB, component-wise.
    pub fn decode(self, encoded: [f64; 3]) -> [f64; 3] {
        encoded.map(|v| self.to_linear(v))
    }

    /// Linear RGB → encoded RGB, component-wise.
    pub fn encode(self, linear: [f64; 3]) -> [f64; 3] {
        linear.map(|v| self.from_linear(v))
    }
}

/// Bradford adaptation of XYZ from D65 to D50 with the CSS Color 4 matrix.
pub fn d65_to_d50(xyz: Xyz) -> Xyz {
    xyz_of(mat3_mul(&D65_TO_D50, xyz.to_array()))
}

/// Bradford adaptation of XYZ from D50 to D65 with the CSS Color 4 matrix.
pub fn d50_to_d65(xyz: Xyz) -> Xyz {
    xyz_of(mat3_mul(&D50_TO_D65, xyz.to_array()))
}

/// XYZ D65 → Oklab `[L, a, b]` (CSS Color 4 `XYZ_to_OKLab`): LMS = M1·XYZ,
/// Oklab = M2·∛LMS.
pub fn xyz_d65_to_oklab(xyz: Xyz) -> [f64; 3] {
    let lms = mat3_mul(&XYZ_D65_TO_LMS, xyz.to_array());
    mat3_mul(&LMS_TO_OKLAB, lms.map(f64::cbrt))
}

/// Oklab `[L, a, b]` → XYZ D65 (CSS Color 4 `OKLab_to_XYZ`), inverse of
/// [`xyz_d65_to_oklab`].
pub fn oklab_to_xyz_d65(oklab: [f64; 3]) -> Xyz {
    let lms_nl = mat3_mul(&OKLAB_TO_LMS, oklab);
    xyz_of(mat3_mul(&LMS_TO_XYZ_D65, lms_nl.map(|v| v * v * v)))
}

/// Polar → rectangular for Oklch or LCh: `[L, C·cos h, C·sin h]`, h in degrees.
pub fn polar_to_rect(l: f64, c: f64, h_deg: f64) -> [f64; 3] {
    let (s, co) = h_deg.to_radians().sin_cos();
    [l, c * co, c * s]
}

/// CSS Color 4 `hslToRgb` (section 7.1): hue in degrees (any value, taken
/// modulo 360), saturation and lightness as fractions (1 = 100%). Returns
/// encoded sRGB; within 0..1 whenever s and l are within 0..1.
pub fn hsl_to_srgb(hue_deg: f64, sat: f64, light: f64) -> [f64; 3] {
    let hue = hue_deg.rem_euclid(360.0);
    let f = |n: f64| {
        let k = (n + hue / 30.0).rem_euclid(12.0);
        let a = sat * light.min(1.0 - light);
        light - a * (k - 3.0).min(9.0 - k).clamp(-1.0, 1.0)
    };
    [f(0.0), f(8.0), f(4.0)]
}

/// CIELAB (against [`D50_CSS`]) of XYZ D50.
fn lab_of_xyz_d50(xyz: Xyz) -> LabD50 {
    LabD50::from_array(xyz_to_lab(xyz, D50_CSS))
}

/// Encoded RGB in a CSS space → CIELAB D50 (CSS Color 4 conversion chain:
/// decode, linear → XYZ D65, Bradford → D50, XYZ → Lab). Unclamped: values
/// outside 0..1 are decoded with the sign-symmetric extension.
pub fn css_rgb_to_lab_d50(space: CssRgbSpace, encoded: [f64; 3]) -> LabD50 {
    let xyz65 = space.linear_to_xyz_d65(space.decode(encoded));
    lab_of_xyz_d50(d65_to_d50(xyz65))
}

/// CIELAB D50 → encoded RGB in a CSS space, unclamped (may leave 0..1 for
/// colours outside the space's gamut).
pub fn lab_d50_to_css_rgb(space: CssRgbSpace, lab: LabD50) -> [f64; 3] {
    let xyz50 = lab_to_xyz(lab.to_array(), D50_CSS);
    space.encode(space.xyz_d65_to_linear(d50_to_d65(xyz50)))
}

/// CIELAB D50 → encoded sRGB, unclamped (components may leave 0..1).
pub fn lab_d50_to_srgb_unclamped(lab: LabD50) -> [f64; 3] {
    lab_d50_to_css_rgb(CssRgbSpace::Srgb, lab)
}

/// Oklab (L 0..1) → CIELAB D50: Oklab → XYZ D65 → Bradford → Lab.
pub fn oklab_to_lab_d50(l: f64, a: f64, b: f64) -> LabD50 {
    lab_of_xyz_d50(d65_to_d50(oklab_to_xyz_d65([l, a, b])))
}

/// CIELAB D50 → Oklab `[L, a, b]`, inverse of [`oklab_to_lab_d50`].
pub fn lab_d50_to_oklab(lab: LabD50) -> [f64; 3] {
    xyz_d65_to_oklab(d50_to_d65(lab_to_xyz(lab.to_array(), D50_CSS)))
}

/// Each component clamped to 0..1 (NaN becomes 0).
pub fn clamp_unit(rgb: [f64; 3]) -> [f64; 3] {
    rgb.map(|v| if v.is_nan() { 0.0 } else { v.clamp(0.0, 1.0) })
}

#[cfg(test)]
mod tests {
    use super::*;

    // Round trips only: the reference checks live in tests/reference_color.rs.
    #[test]
    fn transfer_round_trips_including_extended_range() {
        for space in [CssRgbSpace::Srgb, CssRgbSpace::DisplayP3, CssRgbSpace::Rec2020] {
            for &v in &[-1.2, -0.5, -0.01, 0.0, 0.003, 0.02, 0.08, 0.5, 1.0, 1.3] {
                let back = space.from_linear(space.to_linear(v));
                assert!((back - v).abs() < 1e-12, "{space:?} {v} -> {back}");
            }
        }
    }

    #[test]
    fn css_matrices_are_mutual_inverses() {
        for space in [CssRgbSpace::Srgb, CssRgbSpace::DisplayP3, CssRgbSpace::Rec2020] {
            let rgb = [0.2, 0.7, 0.4];
            let back = space.xyz_d65_to_linear(space.linear_to_xyz_d65(rgb));
            for i in 0..3 {
                assert!((back[i] - rgb[i]).abs() < 1e-12, "{space:?}");
            }
        }
        let x = Xyz::new(0.3, 0.4, 0.5);
        let back = d50_to_d65(d65_to_d50(x));
        assert!((back.x - x.x).abs() < 1e-12 && (back.z - x.z).abs() < 1e-12);
    }

    #[test]
    fn lab_and_oklab_round_trip() {
        let lab = LabD50::new(40.0, 30.0, -20.0);
        let rgb = lab_d50_to_srgb_unclamped(lab);
        let back = css_rgb_to_lab_d50(CssRgbSpace::Srgb, rgb);
        assert!((back.l - lab.l).abs() < 1e-9 && (back.a - lab.a).abs() < 1e-9);
        let ok = lab_d50_to_oklab(lab);
        let back = oklab_to_lab_d50(ok[0], ok[1], ok[2]);
        assert!((back.b - lab.b).abs() < 1e-9);
    }

    #[test]
    fn clamp_unit_handles_nan() {
        assert_eq!(clamp_unit([-0.5, f64::NAN, 1.5]), [0.0, 0.0, 1.0]);
    }
}
