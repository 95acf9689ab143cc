//! The colour scale of ΔE00 maps and its SVG legend.
//!
//! The scale is defined in CIELAB D50 and rendered to sRGB (8 bit) through
//! lcms2, relative colorimetric. Position along the scale:
//! `t = ln(1 + ΔE) / ln(1 + TOP)`, clamped to 0..1 (TOP = 20), so the
//! small differences that matter in print review get most of the range.
//! Along `t` (our own scale, "ink to sky"):
//! - L* = 6 + 90·t, strictly rising: dark means no change, and the map reads
//!   the same in greyscale;
//! - hue angle h_ab = 55° − 215°·t, turning backwards round the hue circle
//!   from a dark umber (55°) through madder (0°) and heather (310°) to a pale
//!   sky blue (200°), so that b* runs from positive to negative: the
//!   blue–yellow opponent axis, which protan and deutan readers keep, carries
//!   the scale as well as lightness does;
//! - C*ab = 9 + 33·sin(π·t)^0.9, low at both ends (where sRGB holds little
//!   chroma at those lightnesses) and strongest mid-scale.
//!
//! Tests check that L* rises, that the rendered colours' luminance rises
//! (greyscale), also under the three simulated deficiencies, and that
//! every point lies inside sRGB.
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
    let l = 6.0 + 90.0 * t;
    let c = 9.0 + 33.0 * (std::f64::consts::PI * t).sin().max(0.0).powf(0.9);
    let h = (55.0 - 215.0 * t).to_radians();
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

    /// Relative luminance of 8-bit sRGB (IEC 61966-2-1 decoding, Rec. 709
    /// weights).
    fn luminance(c: [f64; 3]) -> f64 {
        let lin = c.map(crate::color::spaces::srgb_to_linear);
        0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2]
    }

    // Property: lightness rises strictly along the scale (the definition
    // above), and every point lies inside sRGB, so rendering clips nothing.
    #[test]
    fn lightness_rises_and_the_scale_fits_srgb() {
        let mut last = -1.0;
        for i in 0..=1000 {
            let lab = lab_at(i as f64 / 1000.0);
            assert!(lab.l > last, "L* at {i}");
            last = lab.l;
            let rgb = crate::color::spaces::lab_d50_to_srgb_unclamped(lab);
            assert!(rgb.iter().all(|v| (-0.002..=1.002).contains(v)), "{i}: {rgb:?}");
        }
    }

    // Property: the rendered scale (the 8-bit colours a map gets) darkens
    // nowhere as ΔE00 grows: in greyscale, and as readers with each of the
    // three deficiencies see it (Machado, Oliveira & Fernandes 2009, full
    // severity, as `check --cvd` simulates).
    #[test]
    fn rendered_scale_brightens_in_grey_and_for_cvd_readers() {
        use crate::color::cvd::{Deficiency, Simulator};
        let h = HeatScale::new().unwrap();
        let colours: Vec<[f64; 3]> = (0..=2000)
            .map(|i| h.color(i as f64 * 0.01).map(|v| f64::from(v) / 255.0))
            .collect();
        let mut views: Vec<(String, Vec<f64>)> = vec![("grey".into(), colours.iter().map(|&c| luminance(c)).collect())];
        for d in [Deficiency::Protan, Deficiency::Deutan, Deficiency::Tritan] {
            let sim = Simulator::new(d, 1.0).expect("severity 1 is valid");
            views.push((
                d.to_string(),
                colours
                    .iter()
                    .map(|&c| {
                        let lin = sim.linear_srgb(c.map(crate::color::spaces::srgb_to_linear));
                        0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2]
                    })
                    .collect(),
            ));
        }
        for (name, y) in views {
            // 8-bit quantisation can hold a step level; it must never fall
            // by more than one code value's worth of luminance.
            for k in 1..y.len() {
                assert!(
                    y[k] >= y[k - 1] - 0.002,
                    "{name}: luminance falls at ΔE00 {}",
                    k as f64 * 0.01
                );
            }
            assert!(
                y[y.len() - 1] > y[0] + 0.7,
                "{name}: the scale must span light and dark"
            );
        }
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
