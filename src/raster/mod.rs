//! Image files for soft proofs: reading PNG, JPEG and TIFF (grey or RGB, 8 or
//! 16 bits per channel, optional alpha, embedded ICC profile; CMYK TIFF, 8 or
//! 16 bits, without alpha) into a plain pixel buffer, and encoding proof and
//! map images with an embedded profile.
//!
//! CMYK TIFF is decoded with the `tiff` crate directly: the image crate turns
//! CMYK into RGB by a profile-free formula, which would discard the press
//! data the proof needs.
//!
//! Samples are kept as bytes exactly as lcms2 reads them: 8-bit values, or
//! 16-bit values in native byte order (lcms2's `TYPE_*_16`). Alpha is split
//! off into its own plane so the colour transforms never see it.
//!
//! # Bounds
//!
//! A file's header says how many pixels it holds, and decoders allocate what
//! it says. Every read checks the declared width × height against
//! [`DecodeLimits::max_pixels`] before any pixel buffer exists, then hands
//! each decoder limits of its own so that a header that lies, or compressed
//! data that inflates past the declared size, fails instead of allocating:
//! - PNG: width and height at most the pixel limit, and at most
//!   [`METADATA_ALLOC`] for everything the decoder keeps besides the output
//!   (compressed profile and text chunks, line buffers);
//! - JPEG: the frame header (SOFn) is read from the file before the decoder
//!   loads it, since the decoder reads the whole file into memory: a file
//!   larger than [`JPEG_BYTES_PER_PIXEL`] per declared pixel plus
//!   [`METADATA_ALLOC`] is refused; the decoder gets the width and height
//!   limits;
//! - TIFF: the decoding buffer is the declared image, compressed chunks at
//!   most twice that; the embedded profile is read before these limits are
//!   set, because they apply to tag values too and would hide the profile of
//!   a small image. A JPEG-compressed TIFF has a JPEG frame header in every
//!   strip or tile that its decoder obeys; each must fit its strip or tile,
//!   and all of them together at most twice the pixel limit.

use std::fs::File;
use std::io::{BufReader, Cursor, Read, Seek, SeekFrom};
use std::path::Path;

use image::codecs::jpeg::{JpegDecoder, JpegEncoder};
use image::codecs::png::{PngDecoder, PngEncoder};
use image::codecs::tiff::{TiffDecoder, TiffEncoder};
use image::{ColorType, ExtendedColorType, ImageDecoder, ImageEncoder};

mod cmyk_tiff;
mod encode;
mod preview;

use cmyk_tiff::{cmyk_info, open_cmyk, read_cmyk};
pub use encode::{encode, RgbImage};
pub use preview::{preview_brightest, preview_mean};

/// Bytes a decoder may hold besides the pixels of the image (profiles, text,
/// line buffers): 64 MiB, the PNG decoder's own default, far above the
/// largest ICC profiles in use (a few MiB).
pub const METADATA_ALLOC: u64 = 64 << 20;

/// Largest JPEG file per declared pixel: 8 bytes, twice 16-bit RGBA and many
/// times what an 8-bit JPEG at the highest quality takes (about 1–3 bytes per
/// pixel, common practice).
pub const JPEG_BYTES_PER_PIXEL: u64 = 8;

/// How large an image inkfit agrees to decode.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct DecodeLimits {
    /// Largest declared width × height.
    pub max_pixels: u64,
}

impl DecodeLimits {
    /// The default pixel limit in megapixels: 100.
    pub const DEFAULT_MEGAPIXELS: f64 = 100.0;

    /// A limit of `mp` megapixels (10⁶ pixels), rounded to whole pixels; `None`
    /// unless `mp` is a finite number above 0.
    pub fn from_megapixels(mp: f64) -> Option<Self> {
        if mp.is_finite() && mp > 0.0 {
            Some(Self {
                max_pixels: ((mp * 1e6).round() as u64).max(1),
            })
        } else {
            None
        }
    }

    /// The pixel limit in megapixels (10⁶ pixels).
    pub fn megapixels(&self) -> f64 {
        self.max_pixels as f64 / 1e6
    }

    /// Refuses a declared size above the limit.
    pub fn check(&self, path: &Path, width: u32, height: u32) -> Result<(), RasterError> {
        let px = u64::from(width) * u64::from(height);
        if px > self.max_pixels {
            return Err(RasterError::TooManyPixels {
                path: path_text(path),
                width,
                height,
                declared: megapixel_text(px),
                limit: megapixel_text(self.max_pixels),
            });
        }
        Ok(())
    }

    /// The image crate's limits for a decoder: width and height each at most
    /// the pixel limit, and `max_alloc`.
    fn image_limits(&self, max_alloc: u64) -> image::Limits {
        let side = u32::try_from(self.max_pixels).unwrap_or(u32::MAX);
        let mut l = image::Limits::default();
        l.max_image_width = Some(side);
        l.max_image_height = Some(side);
        l.max_alloc = Some(max_alloc);
        l
    }
}

impl Default for DecodeLimits {
    fn default() -> Self {
        Self {
            max_pixels: (Self::DEFAULT_MEGAPIXELS * 1e6) as u64,
        }
    }
}

/// Megapixels for people: up to six decimals, trailing zeros dropped.
pub fn megapixel_text(pixels: u64) -> String {
    let t = format!("{:.6}", pixels as f64 / 1e6);
    t.trim_end_matches('0').trim_end_matches('.').to_string()
}

/// Errors reading or writing an image; each names the file.
#[derive(Debug, thiserror::Error)]
pub enum RasterError {
    /// The file could not be read.
    #[error("'{path}': cannot read the file: {source}")]
    Read {
        /// The image file as named.
        path: String,
        /// The read error.
        #[source]
        source: std::io::Error,
    },
    /// The file is not a PNG, JPEG or TIFF image.
    #[error("'{path}': not a PNG, JPEG or TIFF image")]
    UnknownFormat {
        /// The image file as named.
        path: String,
    },
    /// The image could not be decoded.
    #[error("'{path}': cannot decode the image: {detail}")]
    Decode {
        /// The image file as named.
        path: String,
        /// The decoder's message.
        detail: String,
    },
    /// The channels or bit depth are not supported.
    #[error("'{path}': {layout} images are not supported (grey or RGB, 8 or 16 bits per channel)")]
    Layout {
        /// The image file as named.
        path: String,
        /// The layout found, in words.
        layout: String,
    },
    /// The image declares more pixels than the limit.
    #[error(
        "'{path}': declares {width} × {height} pixels ({declared} megapixels), more than the limit of {limit} megapixels"
    )]
    TooManyPixels {
        /// The image file as named.
        path: String,
        /// Declared width, pixels.
        width: u32,
        /// Declared height, pixels.
        height: u32,
        /// Declared pixels, megapixels, as shown.
        declared: String,
        /// The limit, megapixels, as shown.
        limit: String,
    },
    /// The image breaks a bound inkfit sets on what it decodes.
    #[error("'{path}': refused: {detail}")]
    Bounds {
        /// The image file as named.
        path: String,
        /// Why it was refused.
        detail: String,
    },
    /// The image could not be encoded.
    #[error("'{path}': cannot encode the image: {detail}")]
    Encode {
        /// The image file as named.
        path: String,
        /// The encoder's message.
        detail: String,
    },
}

/// The file formats read and written.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum FileKind {
    /// PNG.
    Png,
    /// JPEG.
    Jpeg,
    /// TIFF.
    Tiff,
}

impl FileKind {
    /// The kind an output file name asks for, from its extension.
    pub fn from_extension(path: &Path) -> Option<FileKind> {
        let ext = path.extension()?.to_str()?.to_ascii_lowercase();
        match ext.as_str() {
            "png" => Some(FileKind::Png),
            "jpg" | "jpeg" => Some(FileKind::Jpeg),
            "tif" | "tiff" => Some(FileKind::Tiff),
            _ => None,
        }
    }

    /// The kind of a file from its first bytes (PNG signature, JPEG SOI
    /// marker, TIFF byte-order mark with 42).
    pub fn sniff(head: &[u8]) -> Option<FileKind> {
        if head.starts_with(&[0x89, b'P', b'N', b'G', 0x0d, 0x0a, 0x1a, 0x0a]) {
            Some(FileKind::Png)
        } else if head.starts_with(&[0xff, 0xd8, 0xff]) {
            Some(FileKind::Jpeg)
        } else if head.starts_with(b"II*\0") || head.starts_with(b"MM\0*") {
            Some(FileKind::Tiff)
        } else {
            None
        }
    }

    /// The format's name in capitals: "PNG", "JPEG" or "TIFF".
    pub fn name(self) -> &'static str {
        match self {
            FileKind::Png => "PNG",
            FileKind::Jpeg => "JPEG",
            FileKind::Tiff => "TIFF",
        }
    }
}

/// What an image holds, known without decoding its pixels.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct RasterInfo {
    /// The file format.
    pub kind: FileKind,
    /// Width, pixels.
    pub width: u32,
    /// Height, pixels.
    pub height: u32,
    /// 1 (grey), 3 (RGB) or 4 (CMYK, TIFF only) colour channels.
    pub channels: usize,
    /// 8 or 16 bits per channel.
    pub bits: u8,
    /// The image has an alpha channel.
    pub has_alpha: bool,
    /// The embedded ICC profile, if any.
    pub icc: Option<Vec<u8>>,
}

impl RasterInfo {
    /// Width × height.
    pub fn pixels(&self) -> usize {
        self.width as usize * self.height as usize
    }

    /// Bytes per sample: 1 or 2.
    pub fn bytes_per_sample(&self) -> usize {
        usize::from(self.bits / 8)
    }
}

/// A decoded image: colour samples interleaved (grey, RGB or CMYK), alpha apart.
#[derive(Clone, Debug)]
pub struct Raster {
    /// What the image holds.
    pub info: RasterInfo,
    /// Colour samples, `channels` per pixel, 1 or 2 bytes each (native order).
    pub color: Vec<u8>,
    /// One alpha sample per pixel, same depth as the colour, when present.
    pub alpha: Option<Vec<u8>>,
}

fn path_text(path: &Path) -> String {
    path.display().to_string()
}

fn read_err(path: &Path) -> impl Fn(std::io::Error) -> RasterError + '_ {
    move |source| RasterError::Read {
        path: path_text(path),
        source,
    }
}

/// A decoder's error; the image crate's limit errors say which bound held.
fn image_err(path: &Path) -> impl Fn(image::ImageError) -> RasterError + '_ {
    move |e| match e {
        image::ImageError::Limits(l) => RasterError::Bounds {
            path: path_text(path),
            detail: format!("decoding it needs more than its declared size allows ({l})"),
        },
        e => RasterError::Decode {
            path: path_text(path),
            detail: e.to_string(),
        },
    }
}

fn tiff_err(path: &Path) -> impl Fn(tiff::TiffError) -> RasterError + '_ {
    move |e| match e {
        tiff::TiffError::LimitsExceeded => RasterError::Bounds {
            path: path_text(path),
            detail: "decoding it needs more than its declared size allows (TIFF decoder limit)".to_string(),
        },
        e => RasterError::Decode {
            path: path_text(path),
            detail: e.to_string(),
        },
    }
}

/// A zero-filled buffer of `len` bytes, or an error naming the file when the
/// memory is not there.
fn zeroed(path: &Path, len: usize) -> Result<Vec<u8>, RasterError> {
    let mut v = Vec::new();
    v.try_reserve_exact(len).map_err(|_| RasterError::Bounds {
        path: path_text(path),
        detail: format!("cannot allocate {len} bytes for its pixels"),
    })?;
    v.resize(len, 0);
    Ok(v)
}

/// Reads until `buf` is full or the file ends; the bytes read.
fn read_up_to(f: &mut File, buf: &mut [u8]) -> std::io::Result<usize> {
    let mut n = 0;
    while n < buf.len() {
        match f.read(&mut buf[n..])? {
            0 => break,
            k => n += k,
        }
    }
    Ok(n)
}

fn sniff_file(path: &Path) -> Result<Option<FileKind>, RasterError> {
    let mut head = [0u8; 8];
    let mut f = File::open(path).map_err(read_err(path))?;
    let n = read_up_to(&mut f, &mut head).map_err(read_err(path))?;
    Ok(if n < 4 { None } else { FileKind::sniff(&head[..n]) })
}

fn open_decoder(path: &Path, limits: &DecodeLimits) -> Result<(FileKind, Box<dyn ImageDecoder>), RasterError> {
    let kind = sniff_file(path)?.ok_or_else(|| RasterError::UnknownFormat { path: path_text(path) })?;
    let mut reader = BufReader::new(File::open(path).map_err(read_err(path))?);
    if kind == FileKind::Png {
        // PNG spec 11.2.2: IHDR is the first chunk; its width and height
        // follow the signature, chunk length and type (bytes 16..24).
        let mut head = [0u8; 24];
        if reader.read_exact(&mut head).is_ok() && &head[12..16] == b"IHDR" {
            let be = |i: usize| u32::from_be_bytes([head[i], head[i + 1], head[i + 2], head[i + 3]]);
            limits.check(path, be(16), be(20))?;
        }
        check_png_palette(path)?;
        reader.seek(SeekFrom::Start(0)).map_err(read_err(path))?;
    }
    let decoder: Box<dyn ImageDecoder> = match kind {
        // The PNG decoder reads the header and checks the width and height
        // limits before it reads any other chunk; `max_alloc` then bounds
        // what it keeps of the chunks before the pixel data.
        FileKind::Png => {
            Box::new(PngDecoder::with_limits(reader, limits.image_limits(METADATA_ALLOC)).map_err(image_err(path))?)
        }
        FileKind::Jpeg => {
            let len = reader.get_ref().metadata().map_err(read_err(path))?.len();
            let (w, h) = jpeg_frame_size(&mut reader, len)
                .map_err(read_err(path))?
                .ok_or_else(|| RasterError::Decode {
                    path: path_text(path),
                    detail: "no JPEG frame header (SOFn) before the image data".to_string(),
                })?;
            limits.check(path, w, h)?;
            let most = (u64::from(w) * u64::from(h))
                .saturating_mul(JPEG_BYTES_PER_PIXEL)
                .saturating_add(METADATA_ALLOC);
            if len > most {
                return Err(RasterError::Bounds {
                    path: path_text(path),
                    detail: format!(
                        "{len} bytes is far more than a JPEG of {w} × {h} pixels needs (at most {most}), \
                         and the JPEG decoder reads the whole file into memory"
                    ),
                });
            }
            reader.seek(SeekFrom::Start(0)).map_err(read_err(path))?;
            let mut d = JpegDecoder::new(reader).map_err(image_err(path))?;
            d.set_limits(limits.image_limits(METADATA_ALLOC))
                .map_err(image_err(path))?;
            Box::new(d)
        }
        // Built without limits and read before any are set: the limits meant
        // for pixel data otherwise hide the profile tag of small images.
        FileKind::Tiff => Box::new(TiffDecoder::new(reader).map_err(image_err(path))?),
    };
    Ok((kind, decoder))
}

fn layout_of(path: &Path, dec: &dyn ImageDecoder) -> Result<(usize, u8, bool), RasterError> {
    let p = path_text(path);
    if matches!(
        dec.original_color_type(),
        ExtendedColorType::Cmyk8 | ExtendedColorType::Cmyk16
    ) {
        // Reached only for CMYK that is not a plain separated TIFF.
        return Err(RasterError::Layout {
            path: p,
            layout: format!("{:?}", dec.original_color_type()),
        });
    }
    Ok(match dec.color_type() {
        ColorType::L8 => (1, 8, false),
        ColorType::La8 => (1, 8, true),
        ColorType::Rgb8 => (3, 8, false),
        ColorType::Rgba8 => (3, 8, true),
        ColorType::L16 => (1, 16, false),
        ColorType::La16 => (1, 16, true),
        ColorType::Rgb16 => (3, 16, false),
        ColorType::Rgba16 => (3, 16, true),
        other => {
            return Err(RasterError::Layout {
                path: p,
                layout: format!("{other:?}"),
            })
        }
    })
}

fn info_of(
    path: &Path,
    kind: FileKind,
    dec: &mut dyn ImageDecoder,
    limits: &DecodeLimits,
) -> Result<RasterInfo, RasterError> {
    let (width, height) = dec.dimensions();
    limits.check(path, width, height)?;
    let (channels, bits, has_alpha) = layout_of(path, dec)?;
    if width == 0 || height == 0 {
        return Err(RasterError::Layout {
            path: path_text(path),
            layout: "empty (0-pixel)".to_string(),
        });
    }
    let icc = dec.icc_profile().map_err(image_err(path))?.filter(|b| !b.is_empty());
    // The PNG decoder drops a profile chunk it cannot read (damaged, or over
    // its allowance once inflated) as if there were none; the pixels would
    // then be taken to be in the screen profile.
    if kind == FileKind::Png && icc.is_none() && png_chunk_before_data(path, b"iCCP")?.is_some() {
        return Err(RasterError::Bounds {
            path: path_text(path),
            detail: format!(
                "its embedded ICC profile (iCCP chunk) cannot be read: damaged, or larger than {} MiB inflated",
                METADATA_ALLOC >> 20
            ),
        });
    }
    Ok(RasterInfo {
        kind,
        width,
        height,
        channels,
        bits,
        has_alpha,
        icc,
    })
}

/// The data length of the first chunk of type `kind` before a PNG's image
/// data, if there is one, walking the chunk headers (PNG spec 5.3) without
/// reading their contents.
fn png_chunk_before_data(path: &Path, kind: &[u8; 4]) -> Result<Option<u32>, RasterError> {
    let mut r = BufReader::new(File::open(path).map_err(read_err(path))?);
    r.seek(SeekFrom::Start(8)).map_err(read_err(path))?;
    let mut head = [0u8; 8];
    while r.read_exact(&mut head).is_ok() {
        let len = u32::from_be_bytes([head[0], head[1], head[2], head[3]]);
        let ty = &head[4..8];
        if ty == kind {
            return Ok(Some(len));
        }
        if ty == b"IDAT" || ty == b"IEND" {
            break;
        }
        r.seek_relative(i64::from(len) + 4).map_err(read_err(path))?;
    }
    Ok(None)
}

/// Refuses a PNG whose palette is not a whole number of RGB entries (PNG
/// spec 11.2.3: "a chunk length not divisible by 3 is an error"). The PNG
/// decoder keeps such a palette as it is and then reads past its end while
/// expanding indexed pixels, which panics.
fn check_png_palette(path: &Path) -> Result<(), RasterError> {
    match png_chunk_before_data(path, b"PLTE")? {
        Some(len) if len % 3 != 0 => Err(RasterError::Decode {
            path: path_text(path),
            detail: format!("its palette (PLTE chunk) is {len} bytes, not a whole number of 3-byte RGB entries"),
        }),
        _ => Ok(()),
    }
}

/// Reads what an image holds without decoding its pixels, under the default
/// [`DecodeLimits`].
pub fn probe(path: &Path) -> Result<RasterInfo, RasterError> {
    probe_within(path, &DecodeLimits::default())
}

/// Reads what an image holds without decoding its pixels; an image larger
/// than `limits` is an error.
pub fn probe_within(path: &Path, limits: &DecodeLimits) -> Result<RasterInfo, RasterError> {
    if let Some(mut dec) = open_cmyk(path, limits)? {
        return cmyk_info(path, &mut dec, limits);
    }
    let (kind, mut dec) = open_decoder(path, limits)?;
    info_of(path, kind, dec.as_mut(), limits)
}

/// Decodes an image under the default [`DecodeLimits`].
pub fn read(path: &Path) -> Result<Raster, RasterError> {
    read_within(path, &DecodeLimits::default())
}

/// Decodes an image; an image larger than `limits` is refused from its header,
/// before any pixel buffer is allocated.
pub fn read_within(path: &Path, limits: &DecodeLimits) -> Result<Raster, RasterError> {
    if let Some(dec) = open_cmyk(path, limits)? {
        return read_cmyk(path, dec, limits);
    }
    let (kind, mut dec) = open_decoder(path, limits)?;
    let info = info_of(path, kind, dec.as_mut(), limits)?;
    let total = dec.total_bytes();
    // TIFF: the decoding buffer is the image itself and compressed chunks may
    // take twice that (the image crate splits `max_alloc` so); the others
    // need their metadata allowance only.
    let alloc = match kind {
        FileKind::Tiff => total.saturating_mul(3).saturating_add(1 << 20),
        FileKind::Png | FileKind::Jpeg => total.saturating_add(METADATA_ALLOC),
    };
    dec.set_limits(limits.image_limits(alloc)).map_err(image_err(path))?;
    let total = usize::try_from(total).map_err(|_| RasterError::Bounds {
        path: path_text(path),
        detail: format!("{total} bytes of pixels do not fit in memory"),
    })?;
    let mut buf = zeroed(path, total)?;
    dec.read_image_boxed(&mut buf).map_err(image_err(path))?;
    let (color, alpha) = if info.has_alpha {
        let (c, a) = split_alpha(buf, info.channels, info.bytes_per_sample());
        (c, Some(a))
    } else {
        (buf, None)
    };
    Ok(Raster { info, color, alpha })
}

/// Width and height from the first JPEG frame header (SOFn, ITU T.81 B.2.2)
/// in the `len` bytes from the reader's position, walking the marker
/// segments; `None` when the scan data or the end comes first.
fn jpeg_frame_size<R: Read + Seek>(r: &mut R, len: u64) -> std::io::Result<Option<(u32, u32)>> {
    let mut byte = [0u8; 1];
    let mut pos = 0u64;
    let mut next = |r: &mut R, pos: &mut u64| -> std::io::Result<Option<u8>> {
        if *pos >= len {
            return Ok(None);
        }
        match r.read(&mut byte)? {
            0 => Ok(None),
            _ => {
                *pos += 1;
                Ok(Some(byte[0]))
            }
        }
    };
    loop {
        // A marker is 0xFF (any number of fill bytes) and a code; bytes that
        // are not part of one are skipped, as lenient decoders do.
        let Some(b) = next(r, &mut pos)? else {
            return Ok(None);
        };
        if b != 0xff {
            continue;
        }
        let mut code = 0xff;
        while code == 0xff {
            match next(r, &mut pos)? {
                Some(c) => code = c,
                None => return Ok(None),
            }
        }
        match code {
            // Byte stuffing, SOI, RSTn, TEM: no segment follows.
            0x00 | 0xd8 | 0xd0..=0xd7 | 0x01 => continue,
            // EOI or SOS before any frame header.
            0xd9 | 0xda => return Ok(None),
            _ => {}
        }
        let mut seg = [0u8; 2];
        for s in &mut seg {
            match next(r, &mut pos)? {
                Some(c) => *s = c,
                None => return Ok(None),
            }
        }
        let seg_len = u16::from_be_bytes(seg);
        if seg_len < 2 {
            return Ok(None);
        }
        let is_frame = matches!(code, 0xc0..=0xcf) && !matches!(code, 0xc4 | 0xc8 | 0xcc);
        if is_frame {
            // Lf (read), P, Y, X.
            let mut f = [0u8; 5];
            for s in &mut f {
                match next(r, &mut pos)? {
                    Some(c) => *s = c,
                    None => return Ok(None),
                }
            }
            let height = u32::from(u16::from_be_bytes([f[1], f[2]]));
            let width = u32::from(u16::from_be_bytes([f[3], f[4]]));
            return Ok(Some((width, height)));
        }
        let skip = u64::from(seg_len) - 2;
        if pos + skip >= len {
            return Ok(None);
        }
        r.seek(SeekFrom::Current(skip as i64))?;
        pos += skip;
    }
}

/// Splits interleaved colour+alpha samples into a colour buffer (the input's,
/// compacted in place) and an alpha plane.
fn split_alpha(mut buf: Vec<u8>, channels: usize, bps: usize) -> (Vec<u8>, Vec<u8>) {
    let px = (channels + 1) * bps;
    let c = channels * bps;
    let n = buf.len() / px;
    let mut alpha = Vec::with_capacity(n * bps);
    for p in buf.chunks_exact(px) {
        alpha.extend_from_slice(&p[c..]);
    }
    // Pixel i moves from i·px to i·c ≤ i·px: it never overwrites a pixel
    // not yet moved.
    for i in 1..n {
        buf.copy_within(i * px..i * px + c, i * c);
    }
    buf.truncate(n * c);
    buf.shrink_to_fit();
    (buf, alpha)
}

/// Interleaves RGB samples with an alpha plane.
fn join_alpha(rgb: &[u8], alpha: &[u8], bps: usize) -> Vec<u8> {
    let mut out = Vec::with_capacity(rgb.len() + alpha.len());
    for (c, a) in rgb.chunks_exact(3 * bps).zip(alpha.chunks_exact(bps)) {
        out.extend_from_slice(c);
        out.extend_from_slice(a);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn alpha_split_and_join_are_inverse() {
        // 2 pixels RGBA16 as bytes.
        let buf: Vec<u8> = (0u8..16).collect();
        let (c, a) = split_alpha(buf.clone(), 3, 2);
        assert_eq!(c, vec![0, 1, 2, 3, 4, 5, 8, 9, 10, 11, 12, 13]);
        assert_eq!(a, vec![6, 7, 14, 15]);
        assert_eq!(join_alpha(&c, &a, 2), buf);
    }

    #[test]
    fn sniffing_follows_the_format_signatures() {
        // Signatures: PNG spec 5.2, JPEG (ITU T.81) SOI marker, TIFF 6.0 header.
        assert_eq!(
            FileKind::sniff(&[0x89, b'P', b'N', b'G', 13, 10, 26, 10]),
            Some(FileKind::Png)
        );
        assert_eq!(FileKind::sniff(&[0xff, 0xd8, 0xff, 0xe0]), Some(FileKind::Jpeg));
        assert_eq!(FileKind::sniff(b"II*\0xxxx"), Some(FileKind::Tiff));
        assert_eq!(FileKind::sniff(b"MM\0*xxxx"), Some(FileKind::Tiff));
        assert_eq!(FileKind::sniff(b"GIF89a.."), None);
    }
}
