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
//! A pixel counts as outside the press gamut when the colorimetric round
//! trip CIELAB → press → CIELAB (relative colorimetric, no BPC) moves it by
//! more than [`NOTICEABLE_DE00`] ΔE00: the `round-trip` test of `check`, not
//! its default boundary test, since a boundary lookup per pixel would cost
//! far more than the table shortcut saves. A pixel whose round trip gives no
//! number counts as outside.
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

mod exact;
pub mod heat;

pub mod result;
pub mod stats;
mod table;

use lcms2::PixelFormat;
use rayon::prelude::*;

use crate::color::delta::NOTICEABLE_DE00;

use crate::icc::transform::{self, PressMapping, Shared, Side};
use crate::icc::{IccError, IccProfile};
use crate::raster::Raster;
use exact::at_fault;
pub use exact::ExactModel;
use heat::HeatScale;
use stats::{bin_of, Tally};
pub use table::DeltaTable;

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

pub use crate::icc::check_embedded;

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
    /// Running totals of the per-pixel ΔE00 and gamut flags.
    pub tally: Tally,
}

/// Everything needed to proof images of one colour space and layout.
pub struct ProofEngine {
    channels: usize,
    bits: u8,
    proof: SharedTransform,
    exact: ExactModel,
    /// `None` for CMYK images.
    table: Option<DeltaTable>,
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
            let table = None;
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

    /// The exact per-colour model behind the table.
    pub fn exact(&self) -> &ExactModel {
        &self.exact
    }

    /// The ΔE00 table; `None` for CMYK images, which are evaluated exactly.
    pub fn table(&self) -> Option<&DeltaTable> {
        self.table.as_ref()
    }

    /// Device channels of the images this engine proofs (1 grey, 3 RGB, 4 CMYK).
    pub fn channels(&self) -> usize {
        self.channels
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
        match (method, &self.table) {
            (Method::Exact, _) | (Method::Table, None) => self.exact.evaluate(&self.normalised(c)),
            (Method::Table, Some(table)) => {
                let max = if self.bits == 8 { 255.0 } else { 65535.0 };
                let v: Vec<u32> = if self.bits == 8 {
                    c.iter().map(|&x| u32::from(x)).collect()
                } else {
                    c.chunks_exact(2)
                        .map(|x| u32::from(u16::from_ne_bytes([x[0], x[1]])))
                        .collect()
                };
                if self.channels == 1 {
                    v.iter().map(|&g| table.grey(g, max)).collect()
                } else {
                    v.chunks_exact(3).map(|p| table.rgb(p[0], p[1], p[2], max)).collect()
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
        // CMYK engines have no table, so they always take the exact path
        // (`chunk_deltas` evaluates press data per run of equal pixels).
        match (method, &self.table) {
            (Method::Table, Some(table)) => match (self.channels, self.bits) {
                (1, 8) => self.fused::<1, 1>(table, s, m, heat, t),
                (1, _) => self.fused::<1, 2>(table, s, m, heat, t),
                (_, 8) => self.fused::<3, 1>(table, s, m, heat, t),
                _ => self.fused::<3, 2>(table, s, m, heat, t),
            },
            _ => {
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
        table: &DeltaTable,
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
                    table.grey(a, max)
                } else {
                    table.rgb(a, b, c, max)
                };
                de = v[0];
                bin = bin_of(de);
                outside = beyond(v[1], limit);
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

/// Whether a round-trip ΔE00 puts a pixel outside the gamut: beyond `limit`,
/// or not a number (no proof of printability).
#[inline(always)]
fn beyond(round_trip: f32, limit: f32) -> bool {
    round_trip > limit || round_trip.is_nan()
}

fn accumulate(v: &[[f32; 2]], mut map: Option<&mut [u8]>, heat: Option<&HeatScale>, t: &mut Tally) {
    let limit = NOTICEABLE_DE00 as f32;
    for (i, d) in v.iter().enumerate() {
        t.add(d[0], beyond(d[1], limit));
        if let (Some(m), Some(h)) = (map.as_deref_mut(), heat) {
            m[3 * i..3 * i + 3].copy_from_slice(&h.color_of_bin(bin_of(d[0])));
        }
    }
}
