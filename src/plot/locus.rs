//! The CIE 1931 2° observer as data, and the curves drawn from it: the
//! spectral locus, the Planckian locus, CIE 1976 u′v′ and a correlated colour
//! temperature estimate.

use std::sync::OnceLock;

use crate::color::{Xy, Xyz};

/// The CIE 1931 2° colour-matching functions, 380–780 nm every 5 nm
/// (CIE 015:2018, Table 11.2), as shipped in `data/`.
const CMF_CSV: &str = include_str!("../../data/cie1931_2deg_5nm.csv");

/// Second radiation constant c2 = h·c/k in m·K, the value CIE 015:2018
/// (Annex) prescribes for colorimetry (ITS-90).
pub const C2: f64 = 1.4388e-2;

/// One row of the colour-matching-function table.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CmfRow {
    /// Wavelength in nm.
    pub nm: f64,
    /// x̄(λ).
    pub x_bar: f64,
    /// ȳ(λ).
    pub y_bar: f64,
    /// z̄(λ).
    pub z_bar: f64,
}

fn parse_cmf(text: &str) -> Result<Vec<CmfRow>, String> {
    let mut rows = Vec::new();
    for (k, line) in text.lines().enumerate() {
        let line = line.trim();
        if line.is_empty() || line.starts_with('#') || line.starts_with("wavelength") {
            continue;
        }
        let v: Vec<f64> = line
            .split(',')
            .map(|f| f.trim().parse::<f64>())
            .collect::<Result<_, _>>()
            .map_err(|e| format!("line {}: {e}", k + 1))?;
        if v.len() != 4 {
            return Err(format!("line {}: expected 4 fields, found {}", k + 1, v.len()));
        }
        rows.push(CmfRow {
            nm: v[0],
            x_bar: v[1],
            y_bar: v[2],
            z_bar: v[3],
        });
    }
    if rows.len() < 2 || rows.windows(2).any(|w| w[1].nm <= w[0].nm) {
        return Err("wavelengths must rise".to_string());
    }
    Ok(rows)
}

/// The parsed table; `None` only if the shipped data were damaged (a test
/// guards that it parses to 81 rows).
pub fn cmf_table() -> Option<&'static [CmfRow]> {
    static TABLE: OnceLock<Result<Vec<CmfRow>, String>> = OnceLock::new();
    TABLE.get_or_init(|| parse_cmf(CMF_CSV)).as_deref().ok()
}

/// Chromaticity of a tristimulus triple ([`Xyz::chromaticity`]); `None`
/// when X + Y + Z is not positive.
pub fn xy_of(x: f64, y: f64, z: f64) -> Option<Xy> {
    (x + y + z > 0.0).then(|| Xyz::new(x, y, z).chromaticity()).flatten()
}

/// The spectral locus: (wavelength nm, xy) of each monochromatic stimulus in
/// the table, x = x̄/(x̄+ȳ+z̄), y = ȳ/(x̄+ȳ+z̄) (CIE 015:2018, 7.3).
pub fn spectral_locus() -> Vec<(f64, Xy)> {
    cmf_table()
        .unwrap_or(&[])
        .iter()
        .filter_map(|r| xy_of(r.x_bar, r.y_bar, r.z_bar).map(|c| (r.nm, c)))
        .collect()
}

/// Chromaticity of a monochromatic stimulus at `nm`, linear between table
/// rows; `None` outside 380–780 nm.
pub fn locus_at(nm: f64) -> Option<Xy> {
    let t = cmf_table()?;
    let k = t.windows(2).position(|w| w[0].nm <= nm && nm <= w[1].nm)?;
    let (a, b) = (t[k], t[k + 1]);
    let f = (nm - a.nm) / (b.nm - a.nm);
    let lerp = |p: f64, q: f64| p + f * (q - p);
    xy_of(lerp(a.x_bar, b.x_bar), lerp(a.y_bar, b.y_bar), lerp(a.z_bar, b.z_bar))
}

/// Chromaticity of a Planckian (black-body) radiator at `kelvin`: Planck's
/// law M(λ, T) ∝ λ⁻⁵ / (exp(c2/(λT)) − 1) summed against the CMFs at the
/// table's 5 nm steps (CIE 015:2018, 7.1 and 7.3). Valid for T > 0; `None`
/// otherwise. The constant c1 cancels in the chromaticity.
pub fn planckian_xy(kelvin: f64) -> Option<Xy> {
    if !(kelvin.is_finite() && kelvin > 0.0) {
        return None;
    }
    let (mut x, mut y, mut z) = (0.0, 0.0, 0.0);
    for r in cmf_table()? {
        let lambda = r.nm * 1e-9;
        let m = lambda.powi(-5) / ((C2 / (lambda * kelvin)).exp() - 1.0);
        x += m * r.x_bar;
        y += m * r.y_bar;
        z += m * r.z_bar;
    }
    xy_of(x, y, z)
}

/// CIE 1976 UCS: u′ = 4x / (−2x + 12y + 3), v′ = 9y / (−2x + 12y + 3)
/// (CIE 015:2018, 8.1). `None` where the denominator vanishes.
pub fn uv_prime(c: Xy) -> Option<[f64; 2]> {
    let d = -2.0 * c.x + 12.0 * c.y + 3.0;
    (d.abs() > 1e-12).then(|| [4.0 * c.x / d, 9.0 * c.y / d])
}

/// Correlated colour temperature in kelvin by McCamy's cubic (C. S. McCamy,
/// "Correlated color temperature as an explicit function of chromaticity
/// coordinates", Color Res. Appl. 17, 1992): n = (x − 0.3320)/(0.1858 − y),
/// CCT = 449 n³ + 3525 n² + 6823.3 n + 5520.33. Meant for about 2000–12500 K
/// near the Planckian locus; `None` where y = 0.1858.
pub fn cct_mccamy(c: Xy) -> Option<f64> {
    let d = 0.1858 - c.y;
    if d.abs() < 1e-12 {
        return None;
    }
    let n = (c.x - 0.3320) / d;
    Some(449.0 * n.powi(3) + 3525.0 * n * n + 6823.3 * n + 5520.33)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn shipped_table_parses_to_81_rows() {
        let t = cmf_table().expect("table parses");
        assert_eq!(t.len(), 81);
        assert_eq!(t[0].nm, 380.0);
        assert_eq!(t[80].nm, 780.0);
    }

    #[test]
    fn damaged_table_is_an_error() {
        assert!(parse_cmf("380,1,2\n").is_err());
        assert!(parse_cmf("385,1,2,3\n380,1,2,3\n").is_err());
        assert!(parse_cmf("380,a,2,3\n").is_err());
    }
}
