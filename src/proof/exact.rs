//! The exact per-colour computation behind a proof's statistics (see the
//! module notes of [`super`]): double-precision transforms and CIEDE2000
//! for screen images and for press data.

use lcms2::PixelFormat;

use super::SharedTransform;
use crate::color::delta::delta_e00;
use crate::color::LabD50;
use crate::icc::transform::{self, PressMapping, Side};
use crate::icc::{IccError, IccProfile, RenderingIntent};

/// The profile to name when a transform from `source` (pixels in `format`)
/// to `dest` cannot be built: `source` when it cannot reach CIELAB by itself
/// with `intent`, else `dest`. A broken image profile is then blamed on the
/// image, not on the press or screen it was being joined to.
pub(super) fn at_fault<'p>(
    source: &'p IccProfile,
    format: PixelFormat,
    dest: &'p IccProfile,
    intent: RenderingIntent,
) -> &'p IccProfile {
    let alone: Result<SharedTransform, _> = transform::shared(Side::of(source, format), Side::Lab, intent, false);
    if alone.is_err() {
        source
    } else {
        dest
    }
}

fn to_bytes(v: &[f64]) -> Vec<u8> {
    v.iter().flat_map(|x| x.to_ne_bytes()).collect()
}

fn from_bytes(b: &[u8]) -> Vec<f64> {
    b.chunks_exact(8)
        .map(|c| f64::from_ne_bytes([c[0], c[1], c[2], c[3], c[4], c[5], c[6], c[7]]))
        .collect()
}

/// The exact per-colour computation in double precision: CIELAB of the
/// input colour (relative colorimetric through its profile), CIELAB of its
/// print (through the press, as in `check`), CIEDE2000 between them, and
/// the ΔE00 of the colorimetric round trip behind the gamut flag.
pub struct ExactModel {
    pub(super) channels: usize,
    chain: Chain,
}

enum Chain {
    /// Screen images (grey or RGB): input → press → shown.
    Screen(ScreenChain),
    /// Press data (CMYK): press → shown on the screen.
    Press(PressChain),
}

struct ScreenChain {
    to_lab: SharedTransform,
    to_press: SharedTransform,
    printed: SharedTransform,
    lab_to_press: SharedTransform,
    press_to_lab: SharedTransform,
}

struct PressChain {
    /// CMYK → CIELAB in the rendering shown.
    to_lab: SharedTransform,
    /// CMYK → screen device values in the rendering shown.
    to_screen: SharedTransform,
    /// Screen device values → CIELAB in the rendering shown.
    screen_to_lab: SharedTransform,
}

impl ExactModel {
    /// For a CMYK image: `input` is its CMYK profile (its own, or the press),
    /// shown on `screen`; `mapping.paper_white` picks the rendering shown.
    pub fn for_press_data(input: &IccProfile, screen: &IccProfile, mapping: PressMapping) -> Result<Self, IccError> {
        let shown = mapping.shown();
        let err = |p: &IccProfile, what: &'static str| IccError::Transform {
            name: p.name.clone(),
            what,
            intent: shown,
        };
        let t = |from: Side, to: Side| transform::shared(from, to, shown, false);
        let (ink, rgb) = (
            Side::of(input, PixelFormat::CMYK_DBL),
            Side::of(screen, PixelFormat::RGB_DBL),
        );
        Ok(Self {
            channels: 4,
            chain: Chain::Press(PressChain {
                to_lab: t(ink, Side::Lab).map_err(|_| err(input, "press → CIELAB"))?,
                to_screen: t(ink, rgb)
                    .map_err(|_| err(at_fault(input, PixelFormat::CMYK_DBL, screen, shown), "press → screen"))?,
                screen_to_lab: t(rgb, Side::Lab).map_err(|_| err(screen, "screen → CIELAB"))?,
            }),
        })
    }

    /// For a grey (`channels` 1) or RGB screen image in profile `input`, proofed on `press` under `mapping`.
    pub fn new(
        input: &IccProfile,
        channels: usize,
        press: &IccProfile,
        mapping: PressMapping,
    ) -> Result<Self, IccError> {
        let in_fmt = if channels == 1 {
            PixelFormat::GRAY_DBL
        } else {
            PixelFormat::RGB_DBL
        };
        let rel = RenderingIntent::Relative;
        let shown = mapping.shown();
        let err = |p: &IccProfile, what: &'static str, intent| IccError::Transform {
            name: p.name.clone(),
            what,
            intent,
        };
        let (image, ink) = (Side::of(input, in_fmt), Side::of(press, PixelFormat::CMYK_DBL));
        let to_press = transform::shared(image, ink, mapping.intent, mapping.bpc).map_err(|_| {
            err(
                at_fault(input, in_fmt, press, mapping.intent),
                "image → press",
                mapping.intent,
            )
        })?;
        Ok(Self {
            channels,
            chain: Chain::Screen(ScreenChain {
                to_lab: transform::shared(image, Side::Lab, rel, false)
                    .map_err(|_| err(input, "image → CIELAB", rel))?,
                to_press,
                printed: transform::shared(ink, Side::Lab, shown, false)
                    .map_err(|_| err(press, "press → CIELAB", shown))?,
                lab_to_press: transform::shared(Side::Lab, ink, rel, false)
                    .map_err(|_| err(press, "CIELAB → press", rel))?,
                press_to_lab: transform::shared(ink, Side::Lab, rel, false)
                    .map_err(|_| err(press, "press → CIELAB", rel))?,
            }),
        })
    }

    fn run(t: &SharedTransform, input: &[f64], out_channels: usize, n: usize) -> Vec<f64> {
        let src = to_bytes(input);
        let mut dst = vec![0u8; n * out_channels * 8];
        t.transform_pixels(&src, &mut dst);
        from_bytes(&dst)
    }

    /// For device values (0..1, `channels` per colour): per colour
    /// `[ΔE00 original ↔ print, ΔE00 of the colorimetric round trip]`. For
    /// CMYK: `[ΔE00 press colour ↔ its display, 0]` (see the module notes).
    pub fn evaluate(&self, device: &[f64]) -> Vec<[f32; 2]> {
        let n = device.len() / self.channels;
        match &self.chain {
            Chain::Screen(c) => {
                let lab = Self::run(&c.to_lab, device, 3, n);
                let cmyk = Self::run(&c.to_press, device, 4, n);
                let printed = Self::run(&c.printed, &cmyk, 3, n);
                let rt_cmyk = Self::run(&c.lab_to_press, &lab, 4, n);
                let rt = Self::run(&c.press_to_lab, &rt_cmyk, 3, n);
                (0..n)
                    .map(|i| {
                        let o = lab_at(&lab, i);
                        [
                            delta_e00(o, lab_at(&printed, i)) as f32,
                            delta_e00(o, lab_at(&rt, i)) as f32,
                        ]
                    })
                    .collect()
            }
            Chain::Press(_) => {
                let (o, shown) = (self.original_lab(device), self.printed_lab(device));
                o.iter()
                    .zip(&shown)
                    .map(|(a, b)| [delta_e00(*a, *b) as f32, 0.0])
                    .collect()
            }
        }
    }

    /// CIELAB D50 of device values through the input profile (relative; for
    /// CMYK in the rendering shown).
    pub fn original_lab(&self, device: &[f64]) -> Vec<LabD50> {
        let n = device.len() / self.channels;
        let v = match &self.chain {
            Chain::Screen(c) => Self::run(&c.to_lab, device, 3, n),
            Chain::Press(c) => Self::run(&c.to_lab, &ink_percent(device), 3, n),
        };
        (0..n).map(|i| lab_at(&v, i)).collect()
    }

    /// CIELAB D50 of device values as the proof shows them: printed, or for
    /// CMYK as the screen can show them (device values clipped to 0..1).
    pub fn printed_lab(&self, device: &[f64]) -> Vec<LabD50> {
        let n = device.len() / self.channels;
        let v = match &self.chain {
            Chain::Screen(c) => {
                let cmyk = Self::run(&c.to_press, device, 4, n);
                Self::run(&c.printed, &cmyk, 3, n)
            }
            Chain::Press(c) => {
                // Floating-point lcms2 transforms are unbounded; the screen
                // shows only 0..1.
                let rgb: Vec<f64> = Self::run(&c.to_screen, &ink_percent(device), 3, n)
                    .iter()
                    .map(|x| if x.is_nan() { 0.0 } else { x.clamp(0.0, 1.0) })
                    .collect();
                Self::run(&c.screen_to_lab, &rgb, 3, n)
            }
        };
        (0..n).map(|i| lab_at(&v, i)).collect()
    }
}

fn lab_at(v: &[f64], i: usize) -> LabD50 {
    LabD50::new(v[3 * i], v[3 * i + 1], v[3 * i + 2])
}

/// lcms2's floating-point CMYK is ink in percent (0..100).
fn ink_percent(device: &[f64]) -> Vec<f64> {
    device.iter().map(|v| v * 100.0).collect()
}
