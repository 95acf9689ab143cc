//! Colour values and the pure kernels over them: CIE XYZ and CIELAB with their
//! white points, LCh, chromaticities, colour-difference formulas and the CSS
//! colour syntax.
//!
//! Conventions that hold across inkfit:
//! - XYZ is scaled so that the reference white has Y = 1.
//! - `LabD50` is CIELAB relative to the ICC profile connection space white
//!   (D50, X = 0.9642, Y = 1, Z = 0.8249 as encoded by ICC.1:2010, 7.2.16).
//!   CIELAB relative to any other white gets its own name.

pub mod css;
pub mod cvd;
pub mod delta;
pub mod delta_batch;
pub mod named;
pub mod spaces;
pub mod spectral;

use serde::Serialize;

/// The ICC PCS illuminant D50 (ICC.1:2010, 7.2.16), Y = 1.
pub const D50: Xyz = Xyz {
    x: 0.9642,
    y: 1.0,
    z: 0.8249,
};

/// CIE D65 from its chromaticity (0.3127, 0.3290), the white of the CSS RGB
/// spaces and of the IEC/ITU display standards.
pub const D65: Xyz = Xyz {
    x: 0.3127 / 0.3290,
    y: 1.0,
    z: (1.0 - 0.3127 - 0.3290) / 0.3290,
};

/// CIE XYZ tristimulus values, Y = 1 for the reference white. The white the
/// values are relative to is carried by the caller's name or context.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Xyz {
    /// X.
    pub x: f64,
    /// Y, the luminance: 1 for the white.
    pub y: f64,
    /// Z.
    pub z: f64,
}

/// CIELAB relative to D50, the ICC connection space.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct LabD50 {
    /// L*, lightness: 0 black to 100 the D50 white.
    pub l: f64,
    /// a*: green (negative) to red (positive).
    pub a: f64,
    /// b*: blue (negative) to yellow (positive).
    pub b: f64,
}

/// CIE LCh(ab): lightness, chroma and hue angle in degrees [0, 360).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Lch {
    /// L*, lightness, 0..100.
    pub l: f64,
    /// C*ab, chroma: the distance from the neutral axis.
    pub c: f64,
    /// h_ab, hue angle in degrees, [0, 360).
    pub h: f64,
}

/// CIE 1931 xy chromaticity.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Xy {
    /// x chromaticity.
    pub x: f64,
    /// y chromaticity.
    pub y: f64,
}

impl Xyz {
    /// XYZ from its three components.
    pub const fn new(x: f64, y: f64, z: f64) -> Self {
        Self { x, y, z }
    }

    /// [X, Y, Z].
    pub fn to_array(self) -> [f64; 3] {
        [self.x, self.y, self.z]
    }

    /// Chromaticity; `None` for black (X + Y + Z = 0).
    pub fn chromaticity(self) -> Option<Xy> {
        let s = self.x + self.y + self.z;
        (s.abs() > 1e-12).then(|| Xy {
            x: self.x / s,
            y: self.y / s,
        })
    }

    /// XYZ (Y = 1) of a chromaticity at luminance `y`; `None` when xy.y is 0.
    pub fn from_xy(c: Xy, y: f64) -> Option<Self> {
        (c.y.abs() > 1e-12).then(|| Xyz {
            x: c.x * y / c.y,
            y,
            z: (1.0 - c.x - c.y) * y / c.y,
        })
    }
}

impl LabD50 {
    /// CIELAB D50 from L*, a*, b*.
    pub const fn new(l: f64, a: f64, b: f64) -> Self {
        Self { l, a, b }
    }

    /// [L*, a*, b*].
    pub fn to_array(self) -> [f64; 3] {
        [self.l, self.a, self.b]
    }

    /// CIELAB D50 from [L*, a*, b*].
    pub fn from_array(v: [f64; 3]) -> Self {
        Self::new(v[0], v[1], v[2])
    }

    /// CIELAB from XYZ relative to D50 (CIE 015:2018, 8.2.1).
    pub fn from_xyz(xyz: Xyz) -> Self {
        let [l, a, b] = xyz_to_lab(xyz, D50);
        Self { l, a, b }
    }

    /// XYZ relative to D50 (inverse of CIE 015:2018, 8.2.1).
    pub fn to_xyz(self) -> Xyz {
        lab_to_xyz([self.l, self.a, self.b], D50)
    }

    /// LCh(ab) of this colour: chroma and hue angle from a*, b*.
    pub fn to_lch(self) -> Lch {
        let c = self.a.hypot(self.b);
        let mut h = self.b.atan2(self.a).to_degrees();
        if h < 0.0 {
            h += 360.0;
        }
        Lch { l: self.l, c, h }
    }

    /// CIELAB from LCh(ab).
    pub fn from_lch(lch: Lch) -> Self {
        let (s, c) = lch.h.to_radians().sin_cos();
        Self {
            l: lch.l,
            a: lch.c * c,
            b: lch.c * s,
        }
    }
}

const EPSILON: f64 = 216.0 / 24389.0;
const KAPPA: f64 = 24389.0 / 27.0;

/// CIELAB of `xyz` relative to `white` (CIE 015:2018, 8.2.1, with the exact
/// rational constants 216/24389 and 24389/27).
pub fn xyz_to_lab(xyz: Xyz, white: Xyz) -> [f64; 3] {
    let f = |t: f64| {
        if t > EPSILON {
            t.cbrt()
        } else {
            (KAPPA * t + 16.0) / 116.0
        }
    };
    let fx = f(xyz.x / white.x);
    let fy = f(xyz.y / white.y);
    let fz = f(xyz.z / white.z);
    [116.0 * fy - 16.0, 500.0 * (fx - fy), 200.0 * (fy - fz)]
}

/// XYZ of CIELAB `lab` relative to `white` (inverse of CIE 015:2018, 8.2.1).
pub fn lab_to_xyz(lab: [f64; 3], white: Xyz) -> Xyz {
    let fy = (lab[0] + 16.0) / 116.0;
    let fx = fy + lab[1] / 500.0;
    let fz = fy - lab[2] / 200.0;
    let inv = |f: f64| {
        let f3 = f * f * f;
        if f3 > EPSILON {
            f3
        } else {
            (116.0 * f - 16.0) / KAPPA
        }
    };
    let yr = if lab[0] > KAPPA * EPSILON {
        fy * fy * fy
    } else {
        lab[0] / KAPPA
    };
    Xyz {
        x: inv(fx) * white.x,
        y: yr * white.y,
        z: inv(fz) * white.z,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lab_xyz_round_trip() {
        for &(l, a, b) in &[
            (0.0, 0.0, 0.0),
            (5.0, 20.0, -30.0),
            (50.0, 60.0, 40.0),
            (97.0, -5.0, 90.0),
        ] {
            let lab = LabD50::new(l, a, b);
            let back = LabD50::from_xyz(lab.to_xyz());
            assert!((back.l - l).abs() < 1e-9 && (back.a - a).abs() < 1e-9 && (back.b - b).abs() < 1e-9);
        }
    }

    #[test]
    fn white_is_l100() {
        let lab = LabD50::from_xyz(D50);
        assert!((lab.l - 100.0).abs() < 1e-12 && lab.a.abs() < 1e-12 && lab.b.abs() < 1e-12);
    }
}
