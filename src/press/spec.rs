//! What a press condition is built from: the colorimetric aims of paper,
//! solids and overprints, tone value increase, Yule–Nielsen n, total area
//! coverage, the black generation curve, and the specs of the built-in
//! conditions. Plain data with its checks; the model (`model.rs`) evaluates
//! it and the inversion (`invert.rs`) uses its black generation.

use super::PressError;
use crate::color::LabD50;

/// Colorimetric aims of the unprinted paper, the four solids and the
/// chromatic overprints, all absolute CIELAB (D50).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Aims {
    /// The unprinted paper.
    pub paper: LabD50,
    /// Solid cyan.
    pub cyan: LabD50,
    /// Solid magenta.
    pub magenta: LabD50,
    /// Solid yellow.
    pub yellow: LabD50,
    /// Solid black.
    pub black: LabD50,
    /// Cyan + magenta (blue).
    pub cyan_magenta: LabD50,
    /// Cyan + yellow (green).
    pub cyan_yellow: LabD50,
    /// Magenta + yellow (red).
    pub magenta_yellow: LabD50,
    /// Cyan + magenta + yellow.
    pub cyan_magenta_yellow: LabD50,
}

/// The description of a press condition: everything the model is built from.
#[derive(Clone, Debug, PartialEq)]
pub struct PressSpec {
    /// Short machine name, e.g. `offset-coated`.
    pub name: String,
    /// One-line human description, written into the profile.
    pub description: String,
    /// The colorimetric aims the model is built to.
    pub aims: Aims,
    /// Designed tone value increase at 50 % nominal, per ink (C, M, Y, K),
    /// as a fraction (0.14 = 14 %). Allowed range 0..=0.25 so that the
    /// tone value curve stays monotone and inside 0..1.
    pub tvi50: [f64; 4],
    /// Yule–Nielsen n (≥ 1; 1 is the plain Neugebauer / Murray–Davies case).
    pub yule_nielsen_n: f64,
    /// Total area coverage limit in percent (sum of the four inks).
    pub tac_percent: f64,
    /// Black generation used when inverting the model.
    pub gcr: GcrCurve,
    /// Floor of the black-overprint rule as a fraction of the paper's
    /// tristimulus value (see [`super::model::black_overprint`]).
    pub black_overprint_floor: f64,
}

/// Black generation: the black amount aimed at for a target colour.
///
/// K_gcr(L*, C*) = t^γ / (1 + (C*/C_half)²),
/// t = clamp((L_start − L*) / (L_start − L_full), 0, 1),
///
/// with L*, C* media-relative. No black above L_start, rising to 100 % at
/// L_full (a power curve, γ > 1 keeps it gentle in the midtones), reduced
/// for chromatic colours by the factor 1/(1 + (C*/C_half)²), which halves it
/// at C* = C_half. The result is a fraction 0..1. It is an aim, not a
/// constraint: the solver leaves it where the colour cannot be printed with
/// that much (or that little) black.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct GcrCurve {
    /// L* at and above which no black is aimed at.
    pub l_start: f64,
    /// L* at and below which a neutral gets full black.
    pub l_full: f64,
    /// Exponent γ of the rise.
    pub exponent: f64,
    /// Chroma C*ab at which the black aim is halved.
    pub chroma_half: f64,
    /// Weight w of the pull towards the aim, in ΔE² per (full coverage)².
    pub weight: f64,
}

impl GcrCurve {
    /// A medium GCR for coated offset: black from L* 80 down, full black at
    /// L* 18 (about the media-relative lightness of the black solid of
    /// [`iso_coated_aims`]), γ = 1.4, halved at C* = 30;
    /// weight 1 (0.1 of black away from the aim costs as much as
    /// ΔE 0.1). Shape and numbers are a design choice in the range of
    /// medium GCR settings of common practice.
    pub fn medium() -> Self {
        GcrCurve {
            l_start: 80.0,
            l_full: 18.0,
            exponent: 1.4,
            chroma_half: 30.0,
            weight: 1.0,
        }
    }

    pub(crate) fn validate(&self) -> Result<(), PressError> {
        let ok = self.l_start > self.l_full
            && self.l_full >= 0.0
            && self.l_start <= 100.0
            && self.exponent > 0.0
            && self.exponent.is_finite()
            && self.chroma_half > 0.0
            && self.chroma_half.is_finite()
            && self.weight >= 0.0
            && self.weight.is_finite();
        if ok {
            Ok(())
        } else {
            Err(PressError::InvalidSpec("GCR curve parameters out of range".to_string()))
        }
    }

    /// The black aim (fraction 0..1) for a media-relative target colour.
    pub fn black_for(&self, target: LabD50) -> f64 {
        let t = ((self.l_start - target.l) / (self.l_start - self.l_full)).clamp(0.0, 1.0);
        let c = target.a.hypot(target.b) / self.chroma_half;
        let k = t.powf(self.exponent) / (1.0 + c * c);
        if k.is_finite() {
            k
        } else {
            0.0
        }
    }
}

/// The aims of ISO 12647-2:2004/Amd 1:2007 for paper types 1 and 2 (gloss
/// and matt coated), white backing, D50 / 2°, 0°/45° geometry, no UV
/// cut-off filter (M0 in ISO 13655:2009 terms). Values from memory; the
/// three-colour overprint C+M+Y is the value least certain.
pub fn iso_coated_aims() -> Aims {
    Aims {
        paper: LabD50::new(95.0, 0.0, -2.0),
        cyan: LabD50::new(55.0, -37.0, -50.0),
        magenta: LabD50::new(48.0, 74.0, -3.0),
        yellow: LabD50::new(89.0, -5.0, 93.0),
        black: LabD50::new(16.0, 0.0, 0.0),
        cyan_magenta: LabD50::new(24.0, 22.0, -46.0),
        cyan_yellow: LabD50::new(50.0, -65.0, 27.0),
        magenta_yellow: LabD50::new(47.0, 68.0, 48.0),
        cyan_magenta_yellow: LabD50::new(23.0, 0.0, 0.0),
    }
}

/// The spec of the built-in `offset-coated` condition.
///
/// - Aims: [`iso_coated_aims`].
/// - TVI at 50 %: 14 % for C, M, Y and 17 % for K: from memory, the
///   ISO 12647-2:2004/Amd 1 values for positive plates on paper types 1/2
///   at 60 /cm are in this region, with black a few points above the
///   chromatic inks.
/// - Yule–Nielsen n = 1.7: the values reported for AM-screened offset on
///   coated paper mostly lie between 1.5 and 2 (from memory); 1.7 sits in
///   the middle.
/// - TAC 330 %: common practice for coated sheet-fed offset.
/// - Black generation: [`GcrCurve::medium`].
pub fn offset_coated_spec() -> PressSpec {
    PressSpec {
        name: "offset-coated".to_string(),
        description: "inkfit offset-coated: coated offset model, ISO 12647-2 style aims".to_string(),
        aims: iso_coated_aims(),
        tvi50: [0.14, 0.14, 0.14, 0.17],
        yule_nielsen_n: 1.7,
        tac_percent: 330.0,
        gcr: GcrCurve::medium(),
        black_overprint_floor: 0.01,
    }
}

/// The aims of ISO 12647-2:2004/Amd 1:2007 for paper type 4 (uncoated
/// white, wood-free), white backing, D50 / 2°, 0°/45°, M0. Values from
/// memory; the overprints are the least certain.
pub fn iso_uncoated_aims() -> Aims {
    Aims {
        paper: LabD50::new(95.0, 0.0, -2.0),
        cyan: LabD50::new(58.0, -25.0, -43.0),
        magenta: LabD50::new(54.0, 58.0, -2.0),
        yellow: LabD50::new(86.0, -4.0, 75.0),
        black: LabD50::new(31.0, 1.0, 1.0),
        cyan_magenta: LabD50::new(39.0, 8.0, -30.0),
        cyan_yellow: LabD50::new(52.0, -42.0, 13.0),
        magenta_yellow: LabD50::new(52.0, 55.0, 26.0),
        cyan_magenta_yellow: LabD50::new(36.0, 0.0, 0.0),
    }
}

/// The spec of the built-in `offset-uncoated` condition.
///
/// - Aims: [`iso_uncoated_aims`].
/// - TVI at 50 %: 20 % for C, M, Y and 22 % for K: uncoated paper spreads
///   ink further than coated; from memory, ISO 12647-2 puts paper type 4
///   on a steeper curve than types 1/2, with black above the chromatic inks.
/// - Yule–Nielsen n = 2.0: light scatters further in uncoated stock, so n
///   is higher than for coated paper (from memory, values around 2 are
///   reported).
/// - TAC 300 %: common practice for uncoated sheet-fed offset.
/// - Black generation: medium GCR with full black at L* 33, about the
///   media-relative lightness of this black solid.
/// - Black-overprint floor 2.5 % of paper (relative density 1.6, about the
///   highest density on uncoated offset, from memory).
pub fn offset_uncoated_spec() -> PressSpec {
    PressSpec {
        name: "offset-uncoated".to_string(),
        description: "inkfit offset-uncoated: uncoated offset model, ISO 12647-2 style aims".to_string(),
        aims: iso_uncoated_aims(),
        tvi50: [0.20, 0.20, 0.20, 0.22],
        yule_nielsen_n: 2.0,
        tac_percent: 300.0,
        gcr: GcrCurve {
            l_full: 33.0,
            ..GcrCurve::medium()
        },
        black_overprint_floor: 0.025,
    }
}

/// The aims of ISO 12647-3:2005 for coldset offset on standard newsprint,
/// D50 / 2°, 0°/45°, black backing as the standard measures newsprint.
/// Values from memory, the overprints least certain.
pub fn iso_newsprint_aims() -> Aims {
    Aims {
        paper: LabD50::new(82.0, 0.0, 3.0),
        cyan: LabD50::new(57.0, -23.0, -27.0),
        magenta: LabD50::new(54.0, 44.0, -2.0),
        yellow: LabD50::new(78.0, -3.0, 58.0),
        black: LabD50::new(36.0, 1.0, 4.0),
        cyan_magenta: LabD50::new(42.0, 8.0, -19.0),
        cyan_yellow: LabD50::new(53.0, -25.0, 14.0),
        magenta_yellow: LabD50::new(51.0, 41.0, 18.0),
        cyan_magenta_yellow: LabD50::new(40.0, 1.0, 2.0),
    }
}

/// The spec of the built-in `newsprint-coldset` condition.
///
/// - Aims: [`iso_newsprint_aims`].
/// - TVI at 50 %: 25 % for every ink, the largest the designed parabola
///   allows (it must stay monotone); ISO 12647-3 specifies about 26 % at
///   40 % (from memory), steeper than this curve near the middle.
/// - Yule–Nielsen n = 2.2: newsprint scatters light furthest of the three
///   papers (from memory, values above 2 are reported for newsprint).
/// - TAC 240 %: common practice for coldset newsprint.
/// - Black generation: strong GCR, common practice on newsprint to save ink
///   and dry faster: black from L* 85, full black at L* 46 (about the
///   media-relative lightness of this black solid), a gentler rise
///   (γ = 1.2) and halved only at C* = 40.
/// - Black-overprint floor 6 % of paper (relative density 1.2, about the
///   highest density coldset reaches, from memory).
pub fn newsprint_coldset_spec() -> PressSpec {
    PressSpec {
        name: "newsprint-coldset".to_string(),
        description: "inkfit newsprint-coldset: coldset newsprint model, ISO 12647-3 style aims".to_string(),
        aims: iso_newsprint_aims(),
        tvi50: [0.25, 0.25, 0.25, 0.25],
        yule_nielsen_n: 2.2,
        tac_percent: 240.0,
        gcr: GcrCurve {
            l_start: 85.0,
            l_full: 46.0,
            exponent: 1.2,
            chroma_half: 40.0,
            weight: 1.0,
        },
        black_overprint_floor: 0.06,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn gcr_curve_shape() {
        let g = GcrCurve::medium();
        assert_eq!(g.black_for(LabD50::new(90.0, 0.0, 0.0)), 0.0);
        assert!((g.black_for(LabD50::new(10.0, 0.0, 0.0)) - 1.0).abs() < 1e-12);
        let mut last = 0.0;
        for i in 0..=100 {
            let k = g.black_for(LabD50::new(100.0 - i as f64, 0.0, 0.0));
            assert!(k >= last);
            last = k;
        }
        assert!((g.black_for(LabD50::new(18.0, 30.0, 0.0)) - 0.5).abs() < 1e-12);
    }
}
