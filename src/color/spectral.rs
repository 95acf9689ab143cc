//! Reflectance spectra to CIELAB D50, 2° observer, the colorimetry ISO 13655
//! asks of print measurements: tristimulus values by summation at 5 nm from
//! 380 to 780 nm (CIE 015:2018, 7.1),
//!
//!   X = k Σ S(λ) x̄(λ) R(λ),  k = 100 / Σ S(λ) ȳ(λ),
//!
//! with S the CIE illuminant D50 and x̄, ȳ, z̄ the CIE 1931 colour-matching
//! functions (both tables in `data/`, with their sources), then CIELAB
//! relative to the perfect diffuser computed the same way. A spectrum given at
//! 10 or 20 nm is interpolated linearly to 5 nm, and extended beyond its
//! ends with its end values (the nearest-value extrapolation CIE 015
//! recommends for the missing ends; common practice for 380–730 nm data).

use std::sync::OnceLock;

use super::{LabD50, Xyz, D50};

const D50_CSV: &str = include_str!("../../data/cie_d50_5nm.csv");
const CMF_CSV: &str = include_str!("../../data/cie1931_2deg_5nm.csv");

/// The 5 nm grid of the summation: 380, 385, …, 780 nm.
const FIRST_NM: u32 = 380;
const LAST_NM: u32 = 780;
const STEP_NM: u32 = 5;
const SAMPLES: usize = ((LAST_NM - FIRST_NM) / STEP_NM + 1) as usize;

/// Per 5 nm sample: S·x̄, S·ȳ, S·z̄ scaled by k, and the white they sum to.
struct Weights {
    w: [[f64; 3]; SAMPLES],
    white: [f64; 3],
}

fn table(csv: &str, columns: usize) -> Vec<(u32, Vec<f64>)> {
    csv.lines()
        .filter(|l| !l.starts_with('#'))
        .filter_map(|l| {
            let mut f = l.split(',');
            let nm = f.next()?.trim().parse::<u32>().ok()?;
            let v: Vec<f64> = f.filter_map(|x| x.trim().parse().ok()).collect();
            (v.len() == columns).then_some((nm, v))
        })
        .collect()
}

fn weights() -> &'static Weights {
    static W: OnceLock<Weights> = OnceLock::new();
    W.get_or_init(|| {
        let s = table(D50_CSV, 1);
        let cmf = table(CMF_CSV, 3);
        let mut w = [[0.0; 3]; SAMPLES];
        for (i, wi) in w.iter_mut().enumerate() {
            let nm = FIRST_NM + STEP_NM * i as u32;
            let s = s.iter().find(|r| r.0 == nm).map_or(0.0, |r| r.1[0]);
            let c = cmf.iter().find(|r| r.0 == nm).map_or(&[0.0; 3][..], |r| &r.1[..]);
            for ch in 0..3 {
                wi[ch] = s * c[ch];
            }
        }
        let k = 100.0 / w.iter().map(|v| v[1]).sum::<f64>();
        w.iter_mut().for_each(|v| v.iter_mut().for_each(|x| *x *= k));
        let mut white = [0.0; 3];
        for v in &w {
            for ch in 0..3 {
                white[ch] += v[ch];
            }
        }
        Weights { w, white }
    })
}

/// Why a spectrum cannot be used.
#[derive(Clone, Debug, PartialEq, Eq, thiserror::Error)]
pub enum SpectralError {
    /// The bands are not evenly spaced at 5, 10 or 20 nm.
    #[error("spectral bands must be evenly spaced at 5, 10 or 20 nm")]
    Spacing,
    /// The bands do not cover 400–700 nm.
    #[error("spectral bands must cover at least 400 to 700 nm (they cover {0} to {1} nm)")]
    Range(u32, u32),
}

/// Checks that bands at `wavelengths` (nm, ascending) can be integrated:
/// evenly spaced at 5, 10 or 20 nm, covering at least 400–700 nm (the
/// least ISO 13655 allows; common practice is 380–730 nm).
pub fn check_bands(wavelengths: &[u32]) -> Result<(), SpectralError> {
    let (Some(&first), Some(&last)) = (wavelengths.first(), wavelengths.last()) else {
        return Err(SpectralError::Spacing);
    };
    let step = wavelengths.get(1).map_or(0, |w| w.saturating_sub(first));
    if ![5, 10, 20].contains(&step) || wavelengths.windows(2).any(|p| p[1] != p[0] + step) {
        return Err(SpectralError::Spacing);
    }
    if first > 400 || last < 700 {
        return Err(SpectralError::Range(first, last));
    }
    Ok(())
}

/// CIELAB (D50, 2°) of a reflectance spectrum: `reflectance[i]` (a fraction,
/// 1 for the perfect diffuser) at `first_nm + i · step_nm`. The bands must
/// pass [`check_bands`].
pub fn reflectance_to_lab(first_nm: u32, step_nm: u32, reflectance: &[f64]) -> LabD50 {
    let w = weights();
    let n = reflectance.len();
    let at = |nm: f64| -> f64 {
        let pos = (nm - f64::from(first_nm)) / f64::from(step_nm.max(1));
        if n == 0 {
            return 0.0;
        }
        if pos <= 0.0 {
            return reflectance[0];
        }
        if pos >= (n - 1) as f64 {
            return reflectance[n - 1];
        }
        let i = pos.floor() as usize;
        let f = pos - i as f64;
        reflectance[i] + f * (reflectance[i + 1] - reflectance[i])
    };
    let mut xyz = [0.0; 3];
    for (i, wi) in w.w.iter().enumerate() {
        let r = at(f64::from(FIRST_NM + STEP_NM * i as u32));
        for ch in 0..3 {
            xyz[ch] += wi[ch] * r;
        }
    }
    // Relative to the perfect diffuser of the same summation: scaled onto
    // the ICC D50 white that LabD50 uses.
    let white = [D50.x, D50.y, D50.z];
    LabD50::from_xyz(Xyz::new(
        xyz[0] / w.white[0] * white[0],
        xyz[1] / w.white[1] * white[1],
        xyz[2] / w.white[2] * white[2],
    ))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tables_are_complete() {
        assert_eq!(table(D50_CSV, 1).len(), SAMPLES);
        assert_eq!(table(CMF_CSV, 3).len(), SAMPLES);
        // The perfect diffuser under D50 with the 2° observer, summed at
        // 5 nm over 380–780 nm: X 96.4197, Y 100, Z 82.5123 (colour-science
        // 0.4.6, colour.sd_to_XYZ of a constant 1 with method 'Integration').
        let w = weights().white;
        assert!((w[0] - 96.4197).abs() < 1e-3 && (w[1] - 100.0).abs() < 1e-9 && (w[2] - 82.5123).abs() < 1e-3);
    }

    #[test]
    fn the_perfect_reflector_is_the_white() {
        // CIE 015:2018, 8.2.1: the perfect reflecting diffuser has L* 100,
        // a* = b* = 0 under the illuminant its white is computed for, for
        // any spacing of the bands.
        for (step, n) in [(5u32, 71usize), (10, 36), (20, 18)] {
            let lab = reflectance_to_lab(380, step, &vec![1.0; n]);
            assert!(
                (lab.l - 100.0).abs() < 1e-9 && lab.a.abs() < 1e-9 && lab.b.abs() < 1e-9,
                "{step}: {lab:?}"
            );
        }
    }

    #[test]
    fn a_flat_spectrum_is_neutral() {
        // A spectrally flat 50 % reflector is neutral (a* = b* = 0) with
        // L* = 116 · 0.5^(1/3) − 16 (CIE 015:2018, 8.2.1).
        let lab = reflectance_to_lab(380, 10, &[0.5; 36]);
        assert!((lab.l - (116.0 * 0.5f64.cbrt() - 16.0)).abs() < 1e-9);
        assert!(lab.a.abs() < 1e-9 && lab.b.abs() < 1e-9);
    }

    #[test]
    fn band_checks() {
        let ten: Vec<u32> = (380..=730).step_by(10).collect();
        assert_eq!(check_bands(&ten), Ok(()));
        assert_eq!(check_bands(&[400, 410, 430]), Err(SpectralError::Spacing));
        assert_eq!(check_bands(&[420, 430, 440]), Err(SpectralError::Range(420, 440)));
        let short: Vec<u32> = (400..=690).step_by(10).collect();
        assert_eq!(check_bands(&short), Err(SpectralError::Range(400, 690)));
    }
}
