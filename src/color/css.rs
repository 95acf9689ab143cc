//! TEMPORARY lead shim (replaced by the real parser at merge).
use super::LabD50;
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum ColorInput {
    ScreenRgb([f64; 3]),
    Lab(LabD50),
    DeviceCmyk([f64; 4]),
}
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
#[error("bad colour \"{input}\": {expected}")]
pub struct ColorParseError {
    pub input: String,
    pub expected: String,
}
pub fn parse_color(text: &str) -> Result<ColorInput, ColorParseError> {
    let t = text.trim();
    let err = || ColorParseError {
        input: text.to_string(),
        expected: "expected #rrggbb".into(),
    };
    if let Some(h) = t.strip_prefix('#') {
        if h.len() == 6 {
            let v = u32::from_str_radix(h, 16).map_err(|_| err())?;
            return Ok(ColorInput::ScreenRgb([
                ((v >> 16) & 255) as f64 / 255.0,
                ((v >> 8) & 255) as f64 / 255.0,
                (v & 255) as f64 / 255.0,
            ]));
        }
    }
    if let Some(r) = t.strip_prefix("lab(").and_then(|r| r.strip_suffix(')')) {
        let v: Vec<f64> = r
            .split_whitespace()
            .map(|x| x.parse().map_err(|_| err()))
            .collect::<Result<_, _>>()?;
        return Ok(ColorInput::Lab(LabD50::new(v[0], v[1], v[2])));
    }
    if let Some(r) = t.strip_prefix("device-cmyk(").and_then(|r| r.strip_suffix(')')) {
        let v: Vec<f64> = r
            .split_whitespace()
            .map(|x| x.trim_end_matches('%').parse().map_err(|_| err()))
            .collect::<Result<_, _>>()?;
        return Ok(ColorInput::DeviceCmyk([v[0], v[1], v[2], v[3]]));
    }
    Err(err())
}
