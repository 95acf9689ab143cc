//! The colour scale of ΔE00 maps and its SVG legend.
//!
//! The scale is defined in CIELAB D50 and rendered to sRGB (8 bit) through
//! lcms2, relative colorimetric. Position along the scale:
//! `t = ln(1 + ΔE) / ln(1 + TOP)`, clamped to 0..1 (TOP = 20), so the
//! small differences that matter in print review get most of the range.
//! Along `t`: L* = 4 + 90·t (strictly rising: dark means no change),
//! C*ab = 58·t^0.8·(1 − t³/2) (narrowing at the light end to stay inside sRGB), hue angle 290° + 170°·t (violet through red and orange
//! to yellow). The lightness rise makes the map readable in greyscale and
//! for colour-blind readers.
//!
//! The legend is a separate SVG file beside the map rather than pixels burnt
//! into it: the map then stays pixel-for-pixel aligned with the original (it
//! can be laid over it as a layer), and the legend text stays sharp at any
//! size, even for maps only a few pixels wide.

use std::fmt::Write as _;

use lcms2::PixelFormat;

use super::stats::{BIN, BINS};
use crate::color::LabD50;
use crate::icc::transform::{self, Local, Side};
use crate::icc::{IccError, IccProfile, RenderingIntent};

/// ΔE00 at the top of the scale; larger values take its colour.
pub const TOP: f64 = 20.0;
/// Tick values on the legend.
pub const TICKS: [f64; 7] = [0.0, 1.0, 2.0, 3.0, 5.0, 10.0, 20.0];

/// Scale position 0..1 of a ΔE00 value.
pub fn position(de: f64) -> f64 {
    ((1.0 + de.max(0.0)).ln() / (1.0 + TOP).ln()).min(1.0)
}

/// The CIELAB D50 colour at scale position `t` (0..1).
pub fn lab_at(t: f64) -> LabD50 {
    let t = t.clamp(0.0, 1.0);
    let l = 4.0 + 90.0 * t;
    let c = 58.0 * t.powf(0.8) * (1.0 - 0.5 * t.powi(3));
    let h = (290.0 + 170.0 * t).to_radians();
    LabD50::new(l, c * h.cos(), c * h.sin())
}

/// The scale rendered for every ΔE00 bin from 0 to [`TOP`].
pub struct HeatScale {
    /// sRGB 8-bit colour per 0.01 bin, 0.00..=TOP.
    lut: Vec<[u8; 3]>,
    /// The sRGB profile the colours are encoded for (embedded in the map).
    pub srgb_icc: Vec<u8>,
}

impl HeatScale {
    /// Renders the scale through the built-in sRGB profile.
    pub fn new() -> Result<Self, IccError> {
        let srgb = IccProfile::load("srgb")?;
        let t: Local<[f64; 3], [u8; 3]> = transform::local(
            Side::Lab,
            Side::of(&srgb, PixelFormat::RGB_8),
            RenderingIntent::Relative,
            false,
        )
        .map_err(|_| IccError::Transform {
            name: srgb.name.clone(),
            what: "CIELAB → screen (map colours)",
            intent: RenderingIntent::Relative,
        })?;
        let n = (TOP / BIN).round() as usize + 1;
        let labs: Vec<[f64; 3]> = (0..n).map(|i| lab_at(position(i as f64 * BIN)).to_array()).collect();
        let mut lut = vec![[0u8; 3]; n];
        t.transform_pixels(&labs, &mut lut);
        Ok(Self {
            lut,
            srgb_icc: srgb.bytes,
        })
    }

    /// The colour of a histogram bin (see [`super::stats::bin_of`]).
    #[inline]
    pub fn color_of_bin(&self, bin: usize) -> [u8; 3] {
        self.lut[bin.min(self.lut.len() - 1)]
    }

    /// The colour of a ΔE00 value.
    pub fn color(&self, de: f64) -> [u8; 3] {
        self.color_of_bin(super::stats::bin_of(de as f32).min(BINS - 1))
    }

    /// The legend: a scale bar with ticks in ΔE00, as a standalone SVG.
    pub fn legend_svg(&self, title: &str) -> String {
        let (x0, w, y0, h) = (16.0, 320.0, 26.0, 18.0);
        let steps = 160;
        let mut s = String::new();
        let _ = writeln!(
            s,
            r#"<svg xmlns="http://www.w3.org/2000/svg" width="352" height="78" viewBox="0 0 352 78" font-family="sans-serif" font-size="11">"#
        );
        let _ = writeln!(s, r#"<rect width="352" height="78" fill="white"/>"#);
        let _ = writeln!(s, r#"<text x="{x0}" y="16">{}</text>"#, xml_escape(title));
        for i in 0..steps {
            // Each segment shows the colour at its centre position.
            let t = (i as f64 + 0.5) / steps as f64;
            let de = (t * (1.0 + TOP).ln()).exp() - 1.0;
            let [r, g, b] = self.color(de);
            let _ = writeln!(
                s,
                r##"<rect x="{:.2}" y="{y0}" width="{:.2}" height="{h}" fill="#{r:02x}{g:02x}{b:02x}"/>"##,
                x0 + w * i as f64 / steps as f64,
                w / steps as f64 + 0.05
            );
        }
        let _ = writeln!(
            s,
            r#"<rect x="{x0}" y="{y0}" width="{w}" height="{h}" fill="none" stroke="black" stroke-width="0.5"/>"#
        );
        for v in TICKS {
            let x = x0 + w * position(v);
            let label = if v >= TOP {
                format!("≥{v:.0}")
            } else {
                format!("{v:.0}")
            };
            let _ = writeln!(
                s,
                r#"<line class="tick" x1="{x:.2}" y1="{}" x2="{x:.2}" y2="{}" stroke="black" stroke-width="0.75"/>"#,
                y0 + h,
                y0 + h + 5.0
            );
            let _ = writeln!(
                s,
                r#"<text class="tick-label" x="{x:.2}" y="{}" text-anchor="middle">{label}</text>"#,
                y0 + h + 17.0
            );
        }
        let _ = writeln!(
            s,
            r#"<text x="{}" y="{}" text-anchor="end">ΔE00 (CIEDE2000)</text>"#,
            x0 + w,
            16
        );
        s.push_str("</svg>\n");
        s
    }
}

fn xml_escape(t: &str) -> String {
    t.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn scale_position_is_monotonic_and_bounded() {
        let mut last = -1.0;
        for i in 0..=300 {
            let p = position(i as f64 * 0.1);
            assert!(p > last || p == 1.0);
            assert!((0.0..=1.0).contains(&p));
            last = p;
        }
        assert_eq!(position(0.0), 0.0);
        assert_eq!(position(TOP), 1.0);
    }

    #[test]
    fn legend_has_every_tick() {
        let s = HeatScale::new().unwrap().legend_svg("test.png");
        assert_eq!(s.matches("class=\"tick\"").count(), TICKS.len());
        for l in ["0", "1", "2", "3", "5", "10", "≥20"] {
            assert!(s.contains(&format!(">{l}</text>")), "{l}");
        }
    }
}
