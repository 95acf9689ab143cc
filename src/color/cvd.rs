//! Colour-vision deficiency simulation: the Machado, Oliveira and Fernandes
//! (2009) model for protan, deutan and tritan deficiencies, applied to CIELAB
//! colours through linear sRGB.
//!
//! Formula: `rgb_sim = M(severity) · rgb_lin`, with `rgb_lin` linear-light RGB
//! on the sRGB / ITU-R BT.709 primaries (white = 1, values outside 0..1 kept:
//! no clamping, so the map is linear and smooth) and `M` a 3×3 matrix from
//! the paper's table of matrices for severities 0.0, 0.1, …, 1.0. Between two
//! tabulated severities the matrix is interpolated linearly entry by entry, as
//! the paper suggests for intermediate severities.
//!
//! Source: G. M. Machado, M. M. Oliveira, L. A. F. Fernandes, "A
//! Physiologically-based Model for Simulation of Color Vision Deficiency",
//! IEEE TVCG 15(6), 2009, Table 1 (the matrices for the three deficiencies).
//! The matrices are defined for linear RGB with the sRGB primaries. inkfit
//! works in CIELAB D50, so a colour goes CIELAB D50 → XYZ D50 → Bradford to
//! D65 → linear sRGB (the CSS Color 4 chain of [`crate::color::spaces`]),
//! through `M`, and back the same way. For the built-in `srgb` screen this is
//! the screen's own linear RGB; for any other screen (wide-gamut, matrix or
//! table profiles) inkfit still simulates in linear sRGB, because the table
//! is only valid on those primaries: the colour's CIELAB is what the screen
//! shows, and that is converted to sRGB primaries without clamping, so
//! colours outside sRGB keep their (negative or > 1) components.

use serde::Serialize;

use super::spaces::{lab_d50_to_css_rgb, mat3_mul, CssRgbSpace, Mat3};
use super::LabD50;

/// The three deficiencies of the model.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Deficiency {
    /// Missing or anomalous L cones.
    Protan,
    /// Missing or anomalous M cones.
    Deutan,
    /// Missing or anomalous S cones.
    Tritan,
}

impl Deficiency {
    /// All three deficiencies, in the order protan, deutan, tritan.
    pub const ALL: [Deficiency; 3] = [Deficiency::Protan, Deficiency::Deutan, Deficiency::Tritan];

    /// Lower-case name as used on the command line and in JSON.
    pub fn key(self) -> &'static str {
        match self {
            Deficiency::Protan => "protan",
            Deficiency::Deutan => "deutan",
            Deficiency::Tritan => "tritan",
        }
    }

    /// The deficiency for a command-line name (case-insensitive).
    pub fn from_key(s: &str) -> Option<Deficiency> {
        Self::ALL.into_iter().find(|d| d.key().eq_ignore_ascii_case(s.trim()))
    }

    fn table(self) -> &'static [Mat3; 11] {
        match self {
            Deficiency::Protan => &PROTAN,
            Deficiency::Deutan => &DEUTAN,
            Deficiency::Tritan => &TRITAN,
        }
    }
}

impl std::fmt::Display for Deficiency {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.key())
    }
}

/// Machado et al. (2009), Table 1, protanomaly, severity 0.0 to 1.0 by 0.1.
pub const PROTAN: [Mat3; 11] = [
    [
        [1.000000, 0.000000, 0.000000],
        [0.000000, 1.000000, 0.000000],
        [0.000000, 0.000000, 1.000000],
    ],
    [
        [0.856167, 0.182038, -0.038205],
        [0.029342, 0.955115, 0.015544],
        [-0.002880, -0.001563, 1.004443],
    ],
    [
        [0.734766, 0.334872, -0.069637],
        [0.051840, 0.919198, 0.028963],
        [-0.004928, -0.004209, 1.009137],
    ],
    [
        [0.630323, 0.465641, -0.095964],
        [0.069181, 0.890046, 0.040773],
        [-0.006308, -0.007724, 1.014032],
    ],
    [
        [0.539009, 0.579343, -0.118352],
        [0.082546, 0.866121, 0.051332],
        [-0.007136, -0.011959, 1.019095],
    ],
    [
        [0.458064, 0.679578, -0.137642],
        [0.092785, 0.846313, 0.060902],
        [-0.007494, -0.016807, 1.024301],
    ],
    [
        [0.385450, 0.769005, -0.154455],
        [0.100526, 0.829802, 0.069673],
        [-0.007442, -0.022190, 1.029632],
    ],
    [
        [0.319627, 0.849633, -0.169261],
        [0.106241, 0.815969, 0.077790],
        [-0.007025, -0.028051, 1.035076],
    ],
    [
        [0.259411, 0.923008, -0.182420],
        [0.110296, 0.804340, 0.085364],
        [-0.006276, -0.034346, 1.040622],
    ],
    [
        [0.203876, 0.990338, -0.194214],
        [0.112975, 0.794542, 0.092483],
        [-0.005222, -0.041043, 1.046265],
    ],
    [
        [0.152286, 1.052583, -0.204868],
        [0.114503, 0.786281, 0.099216],
        [-0.003882, -0.048116, 1.051998],
    ],
];

/// Machado et al. (2009), Table 1, deuteranomaly, severity 0.0 to 1.0 by 0.1.
pub const DEUTAN: [Mat3; 11] = [
    [
        [1.000000, 0.000000, 0.000000],
        [0.000000, 1.000000, 0.000000],
        [0.000000, 0.000000, 1.000000],
    ],
    [
        [0.866435, 0.177704, -0.044139],
        [0.049567, 0.939063, 0.011370],
        [-0.003453, 0.007233, 0.996220],
    ],
    [
        [0.760729, 0.319078, -0.079807],
        [0.090568, 0.889315, 0.020117],
        [-0.006027, 0.013325, 0.992702],
    ],
    [
        [0.675425, 0.433850, -0.109275],
        [0.125303, 0.847755, 0.026942],
        [-0.007950, 0.018572, 0.989378],
    ],
    [
        [0.605511, 0.528560, -0.134071],
        [0.155318, 0.812366, 0.032316],
        [-0.009376, 0.023176, 0.986200],
    ],
    [
        [0.547494, 0.607765, -0.155259],
        [0.181692, 0.781742, 0.036566],
        [-0.010410, 0.027275, 0.983136],
    ],
    [
        [0.498864, 0.674741, -0.173604],
        [0.205199, 0.754872, 0.039929],
        [-0.011131, 0.030969, 0.980162],
    ],
    [
        [0.457771, 0.731899, -0.189670],
        [0.226409, 0.731012, 0.042579],
        [-0.011595, 0.034333, 0.977261],
    ],
    [
        [0.422823, 0.781057, -0.203881],
        [0.245752, 0.709602, 0.044646],
        [-0.011843, 0.037423, 0.974421],
    ],
    [
        [0.392952, 0.823610, -0.216562],
        [0.263559, 0.690210, 0.046232],
        [-0.011910, 0.040281, 0.971630],
    ],
    [
        [0.367322, 0.860646, -0.227968],
        [0.280085, 0.672501, 0.047413],
        [-0.011820, 0.042940, 0.968881],
    ],
];

/// Machado et al. (2009), Table 1, tritanomaly, severity 0.0 to 1.0 by 0.1.
pub const TRITAN: [Mat3; 11] = [
    [
        [1.000000, 0.000000, 0.000000],
        [0.000000, 1.000000, 0.000000],
        [0.000000, 0.000000, 1.000000],
    ],
    [
        [0.926670, 0.092514, -0.019184],
        [0.021191, 0.964503, 0.014306],
        [0.008437, 0.054813, 0.936750],
    ],
    [
        [0.895720, 0.133330, -0.029050],
        [0.029997, 0.945400, 0.024603],
        [0.013027, 0.104707, 0.882266],
    ],
    [
        [0.905871, 0.127791, -0.033662],
        [0.026856, 0.941251, 0.031893],
        [0.013410, 0.148296, 0.838294],
    ],
    [
        [0.948035, 0.089490, -0.037526],
        [0.014364, 0.946792, 0.038844],
        [0.010853, 0.193991, 0.795156],
    ],
    [
        [1.017277, 0.027029, -0.044306],
        [-0.006113, 0.958479, 0.047634],
        [0.006379, 0.248708, 0.744913],
    ],
    [
        [1.104996, -0.046633, -0.058363],
        [-0.032137, 0.971635, 0.060503],
        [0.001336, 0.317922, 0.680742],
    ],
    [
        [1.193214, -0.109812, -0.083402],
        [-0.058496, 0.979410, 0.079086],
        [-0.002346, 0.403492, 0.598854],
    ],
    [
        [1.257728, -0.139648, -0.118081],
        [-0.078003, 0.975409, 0.102594],
        [-0.003316, 0.501214, 0.502102],
    ],
    [
        [1.278864, -0.125333, -0.153531],
        [-0.084748, 0.957674, 0.127074],
        [-0.000989, 0.601151, 0.399838],
    ],
    [
        [1.255528, -0.076749, -0.178779],
        [-0.078411, 0.930809, 0.147602],
        [0.004733, 0.691367, 0.303900],
    ],
];

/// The simulation matrix for `d` at `severity` (0 = normal vision, 1 = the
/// dichromat), or `None` when the severity is not a number within 0..1.
/// Tabulated severities return the table's matrix exactly; others are
/// interpolated linearly between the two neighbours.
pub fn matrix(d: Deficiency, severity: f64) -> Option<Mat3> {
    if !(severity.is_finite() && (0.0..=1.0).contains(&severity)) {
        return None;
    }
    let table = d.table();
    let s = severity * 10.0;
    let nearest = s.round();
    if (s - nearest).abs() < 1e-9 {
        return Some(table[nearest as usize]);
    }
    let lo = s.floor() as usize;
    let t = s - lo as f64;
    let (a, b) = (&table[lo], &table[lo + 1]);
    let mut m = [[0.0; 3]; 3];
    for r in 0..3 {
        for c in 0..3 {
            m[r][c] = a[r][c] + (b[r][c] - a[r][c]) * t;
        }
    }
    Some(m)
}

/// A ready simulator for one deficiency and severity.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Simulator {
    /// The deficiency simulated.
    pub deficiency: Deficiency,
    /// Its severity, 0 (normal vision) to 1 (dichromacy).
    pub severity: f64,
    m: Mat3,
}

impl Simulator {
    /// `None` when the severity is outside 0..1.
    pub fn new(deficiency: Deficiency, severity: f64) -> Option<Simulator> {
        matrix(deficiency, severity).map(|m| Simulator {
            deficiency,
            severity,
            m,
        })
    }

    /// Simulated linear sRGB of linear sRGB (unclamped).
    pub fn linear_srgb(&self, rgb: [f64; 3]) -> [f64; 3] {
        mat3_mul(&self.m, rgb)
    }

    /// The simulated appearance of a CIELAB D50 colour, as CIELAB D50.
    pub fn lab(&self, lab: LabD50) -> LabD50 {
        let space = CssRgbSpace::Srgb;
        let enc = lab_d50_to_css_rgb(space, lab);
        let sim = self.linear_srgb(space.decode(enc));
        super::spaces::css_rgb_to_lab_d50(space, space.encode(sim))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn severity_zero_is_identity_and_rows_keep_white() {
        // The model maps the achromatic axis onto itself: every tabulated
        // matrix row sums to 1 within the table's 6-decimal rounding
        // (Machado et al. 2009, Table 1; checked here, not assumed).
        for d in Deficiency::ALL {
            assert_eq!(
                matrix(d, 0.0).unwrap(),
                [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]]
            );
            for m in d.table() {
                for row in m {
                    let s: f64 = row.iter().sum();
                    assert!((s - 1.0).abs() < 2e-6, "{d}: row sum {s}");
                }
            }
        }
    }

    #[test]
    fn interpolates_between_tabulated_severities() {
        let m = matrix(Deficiency::Deutan, 0.45).unwrap();
        // Halfway between the 0.4 and 0.5 rows of the table, computed by hand.
        assert!((m[0][0] - (0.605511 + 0.547494) / 2.0).abs() < 1e-12);
        assert!(matrix(Deficiency::Tritan, 1.2).is_none());
        assert!(matrix(Deficiency::Tritan, f64::NAN).is_none());
    }

    #[test]
    fn grey_stays_grey() {
        let s = Simulator::new(Deficiency::Protan, 1.0).unwrap();
        let g = s.lab(LabD50::new(50.0, 0.0, 0.0));
        assert!(
            (g.l - 50.0).abs() < 0.01 && g.a.abs() < 0.05 && g.b.abs() < 0.05,
            "{g:?}"
        );
    }
}
