//! Soft proofs of images: how a screen image will look printed on the press,
//! the CIEDE2000 between the original and its print for every pixel, and
//! statistics of those differences.
//!
//! The chain, per pixel:
//! 1. input device values → press CMYK with the chosen rendering intent and
//!    black point compensation (BPC applies to this step only);
//! 2. press CMYK → screen, relative colorimetric (absolute colorimetric with
//!    `paper_white`, so the paper's own white and tint show), never BPC.
//!
//! The proof image is one lcms2 proofing transform
//! (`cmsCreateProofingTransform` with `cmsFLAGS_SOFTPROOFING`; without the flag
//! lcms2 builds a plain input → screen transform), in the image's own bit
//! depth, so lcms2 runs its optimised 8- or 16-bit path.
//!
//! ΔE00 and the gamut flag of a pixel depend on its input colour alone, for
//! fixed profiles and mapping. Instead of running double-precision
//! transforms for every pixel, inkfit evaluates them exactly ([`ExactModel`])
//! on the nodes of a grid over the input device space and interpolates
//! ([`DeltaTable`]: tetrahedral over 65³ nodes for RGB, linear over every
//! 8-bit value or 4097 nodes for 16-bit grey). The accuracy of that shortcut
//! against the exact per-pixel computation is tested in `tests/proof.rs`.
//!
//! The gamut test is the one [`crate::swatch::check`] uses: the round trip
//! CIELAB → press → CIELAB (relative colorimetric, no BPC) returns within
//! [`NOTICEABLE_DE00`] ΔE00.
//!
//! # CMYK images
//!
//! A CMYK image is already press data, described by its own CMYK output
//! profile (or the press). Its proof is the one step press → screen:
//! relative colorimetric, or absolute colorimetric with `paper_white`; the
//! rendering intent and BPC of the image → press step have nothing to act on.
//! What can still go wrong on the way to the page is the screen, not the
//! press: a saturated ink colour the screen cannot show is clipped, and the
//! proof then understates what the press prints. So for a CMYK image the
//! ΔE00 of a pixel is the CIEDE2000 between the press colour (CMYK → CIELAB,
//! in the rendering shown: relative, or absolute with `paper_white`) and what
//! the screen shows of it (that colour → screen device values clipped to the
//! screen's range → CIELAB, same intent): zero for colours the screen holds,
//! large where the screen clips. The outside-gamut share is 0 by definition,
//! since every CMYK value is printable. These are computed exactly for every
//! pixel (a run of equal pixels reuses the first result); there is no table
//! over the four-dimensional ink space.

pub mod heat;
pub mod raster;
pub mod result;
pub mod stats;

use lcms2::PixelFormat;
use rayon::prelude::*;

use crate::color::delta::delta_e00;
use crate::color::delta::NOTICEABLE_DE00;
use crate::color::LabD50;
use crate::icc::header::{CLASS_OUTPUT, SPACE_CMYK, SPACE_GRAY, SPACE_LAB, SPACE_RGB, SPACE_XYZ};
use crate::icc::transform::{self, PressMapping, Shared, Side};
use crate::icc::{IccError, IccProfile, RenderingIntent};
use heat::HeatScale;
use raster::Raster;
use stats::{bin_of, Tally};

/// The transforms of a proof run over bytes, shared by rayon workers.
pub type SharedTransform = Shared<u8, u8>;

/// Nodes per axis of the RGB table.
pub const RGB_GRID: usize = 65;
/// Pixels per parallel task.
const CHUNK: usize = 32 * 1024;

/// The lcms2 pixel format of `channels` (1 grey, 3 RGB or 4 CMYK) at `bits`
/// (8 or 16).
fn device_format(channels: usize, bits: u8) -> PixelFormat {
    match (channels, bits) {
        (1, 8) => PixelFormat::GRAY_8,
        (1, _) => PixelFormat::GRAY_16,
        (4, 8) => PixelFormat::CMYK_8,
        (4, _) => PixelFormat::CMYK_16,
        (_, 8) => PixelFormat::RGB_8,
        _ => PixelFormat::RGB_16,
    }
}

/// Checks that an image's own profile can describe its pixels: a connection
/// space of CIEXYZ or CIELAB (ICC.1:2010, 7.2.7), and an RGB profile with a
/// table or matrix to it for RGB pixels, a grey one for grey pixels, a CMYK
/// output profile with a table to it for CMYK pixels.
pub fn check_embedded(profile: &IccProfile, channels: usize) -> Result<(), String> {
    let h = &profile.header;
    if h.pcs != SPACE_XYZ && h.pcs != SPACE_LAB {
        return Err(format!(
            "the embedded profile's connection space is '{}', neither XYZ nor Lab",
            h.pcs
        ));
    }
    let has = |s: &[u8; 4]| h.tag(s).is_some();
    let tables = has(b"A2B0") || has(b"A2B1") || has(b"A2B2");
    let (ok, layout, what) = match channels {
        1 => (
            h.color_space == SPACE_GRAY && (tables || profile.is_matrix_shaper()),
            "a grey",
            "a grey profile",
        ),
        4 => (
            h.color_space == SPACE_CMYK && h.class == CLASS_OUTPUT && tables,
            "a CMYK",
            "a CMYK output profile",
        ),
        _ => (
            h.color_space == SPACE_RGB && (tables || profile.is_matrix_shaper()),
            "an RGB",
            "an RGB profile",
        ),
    };
    if ok {
        Ok(())
    } else {
        Err(format!(
            "the embedded profile is {}; {layout} image needs {what}",
            profile.kind_phrase()
        ))
    }
}

/// The profile to name when a transform from `source` (pixels in `format`)
/// to `dest` cannot be built: `source` when it cannot reach CIELAB by itself
/// with `intent`, else `dest`. A broken image profile is then blamed on the
/// image, not on the press or screen it was being joined to.
fn at_fault<'p>(
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
    channels: usize,
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

/// `[ΔE00, round-trip ΔE00]` tabulated over the input device space.
pub struct DeltaTable {
    channels: usize,
    /// Nodes per axis.
    n: usize,
    /// Node values; RGB nodes in order (r·n + g)·n + b.
    nodes: Vec<[f32; 2]>,
}

impl DeltaTable {
    /// Evaluates `model` at `n` evenly spaced device values per axis
    /// (0, 1/(n−1), …, 1).
    pub fn build(model: &ExactModel, n: usize) -> Self {
        let n = n.max(2);
        let ch = model.channels;
        if ch == 4 {
            // CMYK is evaluated per pixel (see the module notes).
            return Self {
                channels: ch,
                n: 0,
                nodes: Vec::new(),
            };
        }
        let count = if ch == 1 { n } else { n * n * n };
        let step = 1.0 / (n - 1) as f64;
        let device: Vec<f64> = (0..count)
            .flat_map(|i| {
                if ch == 1 {
                    vec![i as f64 * step]
                } else {
                    vec![
                        (i / (n * n)) as f64 * step,
                        (i / n % n) as f64 * step,
                        (i % n) as f64 * step,
                    ]
                }
            })
            .collect();
        let nodes: Vec<[f32; 2]> = device
            .par_chunks(ch * 4096)
            .flat_map_iter(|c| model.evaluate(c))
            .collect();
        Self { channels: ch, n, nodes }
    }

    pub fn nodes_per_axis(&self) -> usize {
        self.n
    }

    /// Device channels of the table's input (1 grey, 3 RGB; 4 CMYK, which
    /// has no nodes).
    pub fn channels(&self) -> usize {
        self.channels
    }

    /// Interpolated values at grey sample `v` of `max` (255 or 65535): linear.
    #[inline(always)]
    pub fn grey(&self, v: u32, max: f32) -> [f32; 2] {
        let p = v as f32 * ((self.n - 1) as f32 / max);
        let i = (p as usize).min(self.n - 2);
        let f = p - i as f32;
        let (a, b) = (self.nodes[i], self.nodes[i + 1]);
        [a[0] + (b[0] - a[0]) * f, a[1] + (b[1] - a[1]) * f]
    }

    /// Interpolated values at RGB samples of `max` (255 or 65535):
    /// tetrahedral interpolation in the grid cell (the six-tetrahedron split
    /// along the main diagonal; Kasson, Nin, Plouffe & Hafner, J. Electronic
    /// Imaging 4(4), 1995).
    #[inline(always)]
    pub fn rgb(&self, r: u32, g: u32, b: u32, max: f32) -> [f32; 2] {
        let n = self.n;
        let s = (n - 1) as f32 / max;
        let (pr, pg, pb) = (r as f32 * s, g as f32 * s, b as f32 * s);
        let ir = (pr as usize).min(n - 2);
        let ig = (pg as usize).min(n - 2);
        let ib = (pb as usize).min(n - 2);
        let (fx, fy, fz) = (pr - ir as f32, pg - ig as f32, pb - ib as f32);
        let (dx, dy, dz) = (n * n, n, 1);
        let base = (ir * n + ig) * n + ib;
        // (second corner, third corner, weights of corners 0..3)
        let (c1, c2, w) = if fx >= fy {
            if fy >= fz {
                (dx, dx + dy, [1.0 - fx, fx - fy, fy - fz, fz])
            } else if fx >= fz {
                (dx, dx + dz, [1.0 - fx, fx - fz, fz - fy, fy])
            } else {
                (dz, dx + dz, [1.0 - fz, fz - fx, fx - fy, fy])
            }
        } else if fz >= fy {
            (dz, dy + dz, [1.0 - fz, fz - fy, fy - fx, fx])
        } else if fz >= fx {
            (dy, dy + dz, [1.0 - fy, fy - fz, fz - fx, fx])
        } else {
            (dy, dx + dy, [1.0 - fy, fy - fx, fx - fz, fz])
        };
        let v0 = self.nodes[base];
        let v1 = self.nodes[base + c1];
        let v2 = self.nodes[base + c2];
        let v3 = self.nodes[base + dx + dy + dz];
        [
            w[0] * v0[0] + w[1] * v1[0] + w[2] * v2[0] + w[3] * v3[0],
            w[0] * v0[1] + w[1] * v1[1] + w[2] * v2[1] + w[3] * v3[1],
        ]
    }
}

/// How per-pixel ΔE00 values are obtained.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Method {
    /// Double-precision transforms and CIEDE2000 for every pixel.
    Exact,
    /// Interpolation in the [`DeltaTable`].
    Table,
}

/// What one image's proof produced.
pub struct ProofOutput {
    /// The proof: RGB samples at the input's depth, in the screen profile.
    pub proof: Vec<u8>,
    /// The ΔE00 map: 8-bit sRGB samples, when asked for.
    pub map: Option<Vec<u8>>,
    pub tally: Tally,
}

/// Everything needed to proof images of one colour space and layout.
pub struct ProofEngine {
    channels: usize,
    bits: u8,
    proof: SharedTransform,
    exact: ExactModel,
    table: DeltaTable,
}

impl ProofEngine {
    /// `input` describes the image's pixels (`channels` 1 or 3, `bits` 8 or 16);
    /// the proof is shown on `screen`. With `channels` 4 the pixels are press
    /// data in `input`, a CMYK output profile, and `press` is not used.
    pub fn new(
        input: &IccProfile,
        channels: usize,
        bits: u8,
        screen: &IccProfile,
        press: &IccProfile,
        mapping: PressMapping,
    ) -> Result<Self, IccError> {
        let shown = mapping.shown();
        let (image, shown_on) = (
            Side::of(input, device_format(channels, bits)),
            Side::of(screen, device_format(3, bits)),
        );
        if channels == 4 {
            let proof = transform::shared(image, shown_on, shown, false).map_err(|_| IccError::Transform {
                name: at_fault(input, device_format(4, bits), screen, shown).name.clone(),
                what: "press → screen",
                intent: shown,
            })?;
            let exact = ExactModel::for_press_data(input, screen, mapping)?;
            let table = DeltaTable::build(&exact, 0);
            return Ok(Self {
                channels,
                bits,
                proof,
                exact,
                table,
            });
        }
        let proof = transform::shared_soft_proof(image, shown_on, &press.lcms, mapping.intent, shown, mapping.bpc)
            .map_err(|_| IccError::Transform {
                name: at_fault(input, device_format(channels, bits), press, mapping.intent)
                    .name
                    .clone(),
                what: "soft proof",
                intent: mapping.intent,
            })?;
        let exact = ExactModel::new(input, channels, press, mapping)?;
        let n = match (channels, bits) {
            (1, 8) => 256,
            (1, _) => 4097,
            _ => RGB_GRID,
        };
        let table = DeltaTable::build(&exact, n);
        Ok(Self {
            channels,
            bits,
            proof,
            exact,
            table,
        })
    }

    pub fn exact(&self) -> &ExactModel {
        &self.exact
    }

    pub fn table(&self) -> &DeltaTable {
        &self.table
    }

    fn in_px(&self) -> usize {
        self.channels * usize::from(self.bits / 8)
    }

    fn out_px(&self) -> usize {
        3 * usize::from(self.bits / 8)
    }

    /// Device values 0..1 of samples.
    fn normalised(&self, color: &[u8]) -> Vec<f64> {
        if self.bits == 8 {
            color.iter().map(|&v| f64::from(v) / 255.0).collect()
        } else {
            color
                .chunks_exact(2)
                .map(|c| f64::from(u16::from_ne_bytes([c[0], c[1]])) / 65535.0)
                .collect()
        }
    }

    /// The bare proof transform over `color`, in parallel chunks.
    pub fn proof_only(&self, color: &[u8]) -> Vec<u8> {
        let n = color.len() / self.in_px();
        let mut out = vec![0u8; n * self.out_px()];
        color
            .par_chunks(CHUNK * self.in_px())
            .zip(out.par_chunks_mut(CHUNK * self.out_px()))
            .for_each(|(s, d)| self.proof.transform_pixels(s, d));
        out
    }

    /// `[ΔE00, round-trip ΔE00]` of every pixel of `color`.
    pub fn deltas(&self, color: &[u8], method: Method) -> Vec<[f32; 2]> {
        color
            .par_chunks(CHUNK * self.in_px())
            .flat_map_iter(|c| self.chunk_deltas(c, method))
            .collect()
    }

    fn chunk_deltas(&self, c: &[u8], method: Method) -> Vec<[f32; 2]> {
        if self.channels == 4 {
            return self.press_deltas(c);
        }
        match method {
            Method::Exact => self.exact.evaluate(&self.normalised(c)),
            Method::Table => {
                let max = if self.bits == 8 { 255.0 } else { 65535.0 };
                let v: Vec<u32> = if self.bits == 8 {
                    c.iter().map(|&x| u32::from(x)).collect()
                } else {
                    c.chunks_exact(2)
                        .map(|x| u32::from(u16::from_ne_bytes([x[0], x[1]])))
                        .collect()
                };
                if self.channels == 1 {
                    v.iter().map(|&g| self.table.grey(g, max)).collect()
                } else {
                    v.chunks_exact(3)
                        .map(|p| self.table.rgb(p[0], p[1], p[2], max))
                        .collect()
                }
            }
        }
    }

    /// Exact values for CMYK pixels, evaluated once per run of equal pixels.
    fn press_deltas(&self, c: &[u8]) -> Vec<[f32; 2]> {
        let px = self.in_px();
        let mut starts = Vec::new();
        let mut prev: Option<&[u8]> = None;
        for (i, p) in c.chunks_exact(px).enumerate() {
            if prev != Some(p) {
                starts.push(i);
                prev = Some(p);
            }
        }
        let distinct: Vec<u8> = starts.iter().flat_map(|&i| &c[i * px..(i + 1) * px]).copied().collect();
        let values = self.exact.evaluate(&self.normalised(&distinct));
        let n = c.len() / px;
        let mut out = Vec::with_capacity(n);
        for (k, &start) in starts.iter().enumerate() {
            let end = starts.get(k + 1).copied().unwrap_or(n);
            out.extend(std::iter::repeat_n(values[k], end - start));
        }
        out
    }

    /// Proofs a decoded image: the proof, the ΔE00 map when `heat` is given,
    /// and the statistics. `method` chooses how ΔE00 is obtained.
    pub fn run(&self, raster: &Raster, heat: Option<&HeatScale>, method: Method) -> ProofOutput {
        self.run_samples(&raster.color, heat, method)
    }

    fn run_samples(&self, color: &[u8], heat: Option<&HeatScale>, method: Method) -> ProofOutput {
        let n = color.len() / self.in_px();
        let mut proof = vec![0u8; n * self.out_px()];
        let mut map = heat.map(|_| vec![0u8; n * 3]);
        let src: Vec<&[u8]> = color.chunks(CHUNK * self.in_px()).collect();
        let dst: Vec<&mut [u8]> = proof.chunks_mut(CHUNK * self.out_px()).collect();
        let maps = map_chunks(map.as_deref_mut(), src.len());
        let tally = src
            .into_par_iter()
            .zip(dst)
            .zip(maps)
            .fold(Tally::new, |mut t, ((s, d), m)| {
                self.proof.transform_pixels(s, d);
                self.measure(s, m, heat, method, &mut t);
                t
            })
            .reduce(Tally::new, Tally::merge);
        ProofOutput { proof, map, tally }
    }

    /// [`ProofEngine::run`] on colour samples it takes over: when a proof
    /// pixel is no larger than an image pixel (RGB, CMYK) the proof is
    /// written over the samples, so the image is held once, not twice. The
    /// results are those of `run`.
    pub fn run_owned(&self, mut color: Vec<u8>, heat: Option<&HeatScale>, method: Method) -> ProofOutput {
        let (ip, op) = (self.in_px(), self.out_px());
        if op > ip {
            return self.run_samples(&color, heat, method);
        }
        let n = color.len() / ip;
        let mut map = heat.map(|_| vec![0u8; n * 3]);
        let tally = if op == ip {
            let chunks = n.div_ceil(CHUNK);
            let maps = map_chunks(map.as_deref_mut(), chunks);
            color
                .par_chunks_mut(CHUNK * ip)
                .zip(maps)
                .fold(Tally::new, |mut t, (s, m)| {
                    self.measure(s, m, heat, method, &mut t);
                    self.proof.transform_in_place(s);
                    t
                })
                .reduce(Tally::new, Tally::merge)
        } else {
            // Smaller proof pixels: a wave of chunks is proofed in parallel
            // into small buffers, which are then copied down to where the
            // proof pixels go. Pixel i lands at i·op < i·ip, so a wave only
            // overwrites samples already read (its own or earlier ones).
            let wave = CHUNK * 2 * rayon::current_num_threads().max(1);
            let mut tally = Tally::new();
            let mut start = 0;
            while start < n {
                let end = (start + wave).min(n);
                let src = &color[start * ip..end * ip];
                let chunks = (end - start).div_ceil(CHUNK);
                let maps = map_chunks(map.as_mut().map(|m| &mut m[start * 3..end * 3]), chunks);
                let parts: Vec<(Vec<u8>, Tally)> = src
                    .par_chunks(CHUNK * ip)
                    .zip(maps)
                    .map(|(s, m)| {
                        let mut d = vec![0u8; s.len() / ip * op];
                        let mut t = Tally::new();
                        self.proof.transform_pixels(s, &mut d);
                        self.measure(s, m, heat, method, &mut t);
                        (d, t)
                    })
                    .collect();
                let mut at = start * op;
                for (d, t) in parts {
                    color[at..at + d.len()].copy_from_slice(&d);
                    at += d.len();
                    tally = tally.merge(t);
                }
                start = end;
            }
            tally
        };
        color.truncate(n * op);
        color.shrink_to_fit();
        ProofOutput {
            proof: color,
            map,
            tally,
        }
    }

    /// ΔE00 of the pixels of chunk `s` into the tally and the map chunk `m`.
    fn measure(&self, s: &[u8], m: Option<&mut [u8]>, heat: Option<&HeatScale>, method: Method, t: &mut Tally) {
        match method {
            _ if self.channels == 4 => {
                let v = self.press_deltas(s);
                accumulate(&v, m, heat, t);
            }
            Method::Table => match (self.channels, self.bits) {
                (1, 8) => self.fused::<1, 1>(s, m, heat, t),
                (1, _) => self.fused::<1, 2>(s, m, heat, t),
                (_, 8) => self.fused::<3, 1>(s, m, heat, t),
                _ => self.fused::<3, 2>(s, m, heat, t),
            },
            Method::Exact => {
                let v = self.chunk_deltas(s, Method::Exact);
                accumulate(&v, m, heat, t);
            }
        }
    }

    /// Table lookup, map colour and tally in one pass; a pixel equal to the
    /// one before reuses its result.
    #[inline(always)]
    fn fused<const CH: usize, const BPS: usize>(
        &self,
        src: &[u8],
        mut map: Option<&mut [u8]>,
        heat: Option<&HeatScale>,
        t: &mut Tally,
    ) {
        let max = if BPS == 1 { 255.0 } else { 65535.0 };
        let limit = NOTICEABLE_DE00 as f32;
        let mut prev_key = u64::MAX;
        let (mut de, mut bin, mut outside, mut rgb) = (0f32, 0usize, false, [0u8; 3]);
        for (i, px) in src.chunks_exact(CH * BPS).enumerate() {
            let sample = |k: usize| -> u32 {
                if BPS == 1 {
                    u32::from(px[k])
                } else {
                    u32::from(u16::from_ne_bytes([px[2 * k], px[2 * k + 1]]))
                }
            };
            let (a, b, c) = if CH == 1 {
                (sample(0), 0, 0)
            } else {
                (sample(0), sample(1), sample(2))
            };
            let key = u64::from(a) | (u64::from(b) << 16) | (u64::from(c) << 32);
            if key != prev_key {
                prev_key = key;
                let v = if CH == 1 {
                    self.table.grey(a, max)
                } else {
                    self.table.rgb(a, b, c, max)
                };
                de = v[0];
                bin = bin_of(de);
                outside = v[1] > limit;
                if let Some(h) = heat {
                    rgb = h.color_of_bin(bin);
                }
            }
            t.hist[bin] += 1;
            t.sum += f64::from(de);
            t.max = t.max.max(de);
            t.outside_gamut += u64::from(outside);
            if let Some(m) = map.as_deref_mut() {
                m[3 * i..3 * i + 3].copy_from_slice(&rgb);
            }
        }
        t.pixels += (src.len() / (CH * BPS)) as u64;
    }
}

/// The map, when there is one, cut into the chunks of `CHUNK` pixels; else
/// `count` times `None`.
fn map_chunks(map: Option<&mut [u8]>, count: usize) -> Vec<Option<&mut [u8]>> {
    match map {
        Some(m) => m.chunks_mut(CHUNK * 3).map(Some).collect(),
        None => (0..count).map(|_| None).collect(),
    }
}

fn accumulate(v: &[[f32; 2]], mut map: Option<&mut [u8]>, heat: Option<&HeatScale>, t: &mut Tally) {
    let limit = NOTICEABLE_DE00 as f32;
    for (i, d) in v.iter().enumerate() {
        t.add(d[0], d[1] > limit);
        if let (Some(m), Some(h)) = (map.as_deref_mut(), heat) {
            m[3 * i..3 * i + 3].copy_from_slice(&h.color_of_bin(bin_of(d[0])));
        }
    }
}
