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

use std::fs::File;
use std::io::{BufReader, Cursor};
use std::path::Path;

use image::codecs::jpeg::{JpegDecoder, JpegEncoder};
use image::codecs::png::{PngDecoder, PngEncoder};
use image::codecs::tiff::{TiffDecoder, TiffEncoder};
use image::{ColorType, ExtendedColorType, ImageDecoder, ImageEncoder};

/// Errors reading or writing an image; each names the file.
#[derive(Debug, thiserror::Error)]
pub enum RasterError {
    #[error("'{path}': cannot read the file: {source}")]
    Read {
        path: String,
        #[source]
        source: std::io::Error,
    },
    #[error("'{path}': not a PNG, JPEG or TIFF image")]
    UnknownFormat { path: String },
    #[error("'{path}': cannot decode the image: {detail}")]
    Decode { path: String, detail: String },
    #[error("'{path}': {layout} images are not supported (grey or RGB, 8 or 16 bits per channel)")]
    Layout { path: String, layout: String },
    #[error("'{path}': cannot encode the image: {detail}")]
    Encode { path: String, detail: String },
}

/// The file formats read and written.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum FileKind {
    Png,
    Jpeg,
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
    pub kind: FileKind,
    pub width: u32,
    pub height: u32,
    /// 1 (grey), 3 (RGB) or 4 (CMYK, TIFF only) colour channels.
    pub channels: usize,
    /// 8 or 16 bits per channel.
    pub bits: u8,
    pub has_alpha: bool,
    /// The embedded ICC profile, if any.
    pub icc: Option<Vec<u8>>,
}

impl RasterInfo {
    pub fn pixels(&self) -> usize {
        self.width as usize * self.height as usize
    }

    pub fn bytes_per_sample(&self) -> usize {
        usize::from(self.bits / 8)
    }
}

/// A decoded image: colour samples interleaved (grey, RGB or CMYK), alpha apart.
#[derive(Clone, Debug)]
pub struct Raster {
    pub info: RasterInfo,
    /// Colour samples, `channels` per pixel, 1 or 2 bytes each (native order).
    pub color: Vec<u8>,
    /// One alpha sample per pixel, same depth as the colour, when present.
    pub alpha: Option<Vec<u8>>,
}

fn path_text(path: &Path) -> String {
    path.display().to_string()
}

fn open_decoder(path: &Path) -> Result<(FileKind, Box<dyn ImageDecoder>), RasterError> {
    let p = path_text(path);
    let read_err = |source| RasterError::Read {
        path: p.clone(),
        source,
    };
    let mut head = [0u8; 8];
    {
        use std::io::Read;
        let mut f = File::open(path).map_err(read_err)?;
        let n = f.read(&mut head).map_err(read_err)?;
        if n < 4 {
            return Err(RasterError::UnknownFormat { path: p });
        }
    }
    let kind = FileKind::sniff(&head).ok_or_else(|| RasterError::UnknownFormat { path: p.clone() })?;
    let reader = BufReader::new(File::open(path).map_err(read_err)?);
    let dec_err = |e: image::ImageError| RasterError::Decode {
        path: p.clone(),
        detail: e.to_string(),
    };
    let decoder: Box<dyn ImageDecoder> = match kind {
        FileKind::Png => Box::new(PngDecoder::new(reader).map_err(dec_err)?),
        FileKind::Jpeg => Box::new(JpegDecoder::new(reader).map_err(dec_err)?),
        // Built directly and read before any limits are set: the limits meant
        // for pixel data otherwise hide the profile tag of small images.
        FileKind::Tiff => Box::new(TiffDecoder::new(reader).map_err(dec_err)?),
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

fn info_of(path: &Path, kind: FileKind, dec: &mut dyn ImageDecoder) -> Result<RasterInfo, RasterError> {
    let (channels, bits, has_alpha) = layout_of(path, dec)?;
    let (width, height) = dec.dimensions();
    if width == 0 || height == 0 {
        return Err(RasterError::Layout {
            path: path_text(path),
            layout: "empty (0-pixel)".to_string(),
        });
    }
    let icc = dec.icc_profile().map_err(|e| RasterError::Decode {
        path: path_text(path),
        detail: e.to_string(),
    })?;
    Ok(RasterInfo {
        kind,
        width,
        height,
        channels,
        bits,
        has_alpha,
        icc: icc.filter(|b| !b.is_empty()),
    })
}

/// Reads what an image holds without decoding its pixels.
pub fn probe(path: &Path) -> Result<RasterInfo, RasterError> {
    if let Some(mut dec) = open_cmyk(path)? {
        return cmyk_info(path, &mut dec);
    }
    let (kind, mut dec) = open_decoder(path)?;
    info_of(path, kind, dec.as_mut())
}

/// Decodes an image.
pub fn read(path: &Path) -> Result<Raster, RasterError> {
    if let Some(mut dec) = open_cmyk(path)? {
        return read_cmyk(path, &mut dec);
    }
    let (kind, mut dec) = open_decoder(path)?;
    let info = info_of(path, kind, dec.as_mut())?;
    let total = usize::try_from(dec.total_bytes()).map_err(|_| RasterError::Layout {
        path: path_text(path),
        layout: "too large".to_string(),
    })?;
    let mut buf = vec![0u8; total];
    dec.read_image_boxed(&mut buf).map_err(|e| RasterError::Decode {
        path: path_text(path),
        detail: e.to_string(),
    })?;
    let (color, alpha) = if info.has_alpha {
        let (c, a) = split_alpha(&buf, info.channels, info.bytes_per_sample());
        (c, Some(a))
    } else {
        (buf, None)
    };
    Ok(Raster { info, color, alpha })
}

type TiffReader = tiff::decoder::Decoder<BufReader<File>>;

/// A `tiff` decoder when `path` is a TIFF whose first image is CMYK; `None`
/// for every other file, which the image crate reads.
fn open_cmyk(path: &Path) -> Result<Option<TiffReader>, RasterError> {
    let p = path_text(path);
    let read_err = |source| RasterError::Read {
        path: p.clone(),
        source,
    };
    let mut head = [0u8; 4];
    {
        use std::io::Read;
        let mut f = File::open(path).map_err(read_err)?;
        let n = f.read(&mut head).map_err(read_err)?;
        if n < 4 || FileKind::sniff(&head) != Some(FileKind::Tiff) {
            return Ok(None);
        }
    }
    let reader = BufReader::new(File::open(path).map_err(read_err)?);
    let dec_err = |e: tiff::TiffError| RasterError::Decode {
        path: p.clone(),
        detail: e.to_string(),
    };
    let mut dec = tiff::decoder::Decoder::new(reader).map_err(dec_err)?;
    let photometric = dec
        .find_tag(tiff::tags::Tag::PhotometricInterpretation)
        .map_err(dec_err)?
        .and_then(|v| v.into_u16().ok());
    // TIFF 6.0, section 16: PhotometricInterpretation 5 = separated (CMYK
    // with the default InkSet).
    if photometric != Some(tiff::tags::PhotometricInterpretation::CMYK.to_u16()) {
        return Ok(None);
    }
    Ok(Some(dec))
}

fn cmyk_info(path: &Path, dec: &mut TiffReader) -> Result<RasterInfo, RasterError> {
    let p = path_text(path);
    let dec_err = |e: tiff::TiffError| RasterError::Decode {
        path: p.clone(),
        detail: e.to_string(),
    };
    let bits = match dec.colortype().map_err(dec_err)? {
        tiff::ColorType::CMYK(8) => 8,
        tiff::ColorType::CMYK(16) => 16,
        other => {
            return Err(RasterError::Layout {
                path: p,
                layout: format!("{other:?}"),
            })
        }
    };
    let (width, height) = dec.dimensions().map_err(dec_err)?;
    if width == 0 || height == 0 {
        return Err(RasterError::Layout {
            path: p,
            layout: "empty (0-pixel)".to_string(),
        });
    }
    let icc = match dec.find_tag(tiff::tags::Tag::IccProfile).map_err(dec_err)? {
        Some(v) => Some(v.into_u8_vec().map_err(dec_err)?),
        None => None,
    };
    Ok(RasterInfo {
        kind: FileKind::Tiff,
        width,
        height,
        channels: 4,
        bits,
        has_alpha: false,
        icc: icc.filter(|b| !b.is_empty()),
    })
}

fn read_cmyk(path: &Path, dec: &mut TiffReader) -> Result<Raster, RasterError> {
    let info = cmyk_info(path, dec)?;
    let p = path_text(path);
    let data = dec.read_image().map_err(|e| RasterError::Decode {
        path: p.clone(),
        detail: e.to_string(),
    })?;
    let color: Vec<u8> = match data {
        tiff::decoder::DecodingResult::U8(v) if info.bits == 8 => v,
        tiff::decoder::DecodingResult::U16(v) if info.bits == 16 => v.iter().flat_map(|x| x.to_ne_bytes()).collect(),
        _ => {
            return Err(RasterError::Decode {
                path: p,
                detail: "the samples do not match the declared bit depth".to_string(),
            })
        }
    };
    if color.len() != info.pixels() * 4 * info.bytes_per_sample() {
        return Err(RasterError::Decode {
            path: p,
            detail: "the pixel data is shorter or longer than the image".to_string(),
        });
    }
    Ok(Raster {
        info,
        color,
        alpha: None,
    })
}

/// Splits interleaved colour+alpha samples into a colour buffer and an alpha
/// plane.
fn split_alpha(buf: &[u8], channels: usize, bps: usize) -> (Vec<u8>, Vec<u8>) {
    let px = (channels + 1) * bps;
    let n = buf.len() / px;
    let mut color = Vec::with_capacity(n * channels * bps);
    let mut alpha = Vec::with_capacity(n * bps);
    for p in buf.chunks_exact(px) {
        color.extend_from_slice(&p[..channels * bps]);
        alpha.extend_from_slice(&p[channels * bps..]);
    }
    (color, alpha)
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

/// An RGB image to be written: samples as in [`Raster::color`], 3 per pixel.
pub struct RgbImage<'a> {
    pub width: u32,
    pub height: u32,
    pub bits: u8,
    pub rgb: &'a [u8],
    pub alpha: Option<&'a [u8]>,
}

/// Encodes an RGB image as `kind` with `icc` embedded (PNG iCCP chunk, JPEG
/// APP2 segments, TIFF tag 34675). `name` is the file named in errors.
/// JPEG takes 8 bits and no alpha; PNG and TIFF take 8 or 16 bits with alpha.
pub fn encode(name: &Path, kind: FileKind, img: &RgbImage<'_>, icc: &[u8]) -> Result<Vec<u8>, RasterError> {
    let err = |detail: String| RasterError::Encode {
        path: path_text(name),
        detail,
    };
    let bps = usize::from(img.bits / 8);
    let expected = img.width as usize * img.height as usize * 3 * bps;
    if img.rgb.len() != expected || !(img.bits == 8 || img.bits == 16) {
        return Err(err(format!(
            "internal: {} bytes for {}x{}",
            img.rgb.len(),
            img.width,
            img.height
        )));
    }
    let joined;
    let (data, color) = match img.alpha {
        Some(a) => {
            if a.len() * 3 != img.rgb.len() {
                return Err(err("internal: alpha plane size".to_string()));
            }
            joined = join_alpha(img.rgb, a, bps);
            let t = if bps == 1 {
                ExtendedColorType::Rgba8
            } else {
                ExtendedColorType::Rgba16
            };
            (&joined[..], t)
        }
        None => (
            img.rgb,
            if bps == 1 {
                ExtendedColorType::Rgb8
            } else {
                ExtendedColorType::Rgb16
            },
        ),
    };
    let mut out = Vec::new();
    let e = |x: image::ImageError| err(x.to_string());
    let u = |x: image::error::UnsupportedError| err(x.to_string());
    match kind {
        FileKind::Png => {
            let mut enc = PngEncoder::new(&mut out);
            enc.set_icc_profile(icc.to_vec()).map_err(u)?;
            enc.write_image(data, img.width, img.height, color).map_err(e)?;
        }
        FileKind::Jpeg => {
            if bps != 1 || img.alpha.is_some() {
                return Err(err("JPEG holds 8-bit RGB without alpha only".to_string()));
            }
            let mut enc = JpegEncoder::new_with_quality(&mut out, 95);
            enc.set_icc_profile(icc.to_vec()).map_err(u)?;
            enc.write_image(data, img.width, img.height, color).map_err(e)?;
        }
        FileKind::Tiff => {
            let mut enc = TiffEncoder::new(Cursor::new(&mut out));
            enc.set_icc_profile(icc.to_vec()).map_err(u)?;
            enc.write_image(data, img.width, img.height, color).map_err(e)?;
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn alpha_split_and_join_are_inverse() {
        // 2 pixels RGBA16 as bytes.
        let buf: Vec<u8> = (0u8..16).collect();
        let (c, a) = split_alpha(&buf, 3, 2);
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
