//! Encoding proof and map images (PNG, JPEG, TIFF) with an embedded profile.

use std::path::Path;

use super::*;

/// An RGB image to be written: samples as in [`Raster::color`], 3 per pixel.
pub struct RgbImage<'a> {
    /// Width, pixels.
    pub width: u32,
    /// Height, pixels.
    pub height: u32,
    /// Bits per sample: 8 or 16.
    pub bits: u8,
    /// The RGB samples, width × height × 3 of them.
    pub rgb: &'a [u8],
    /// One alpha sample per pixel, same depth as the colour, when present.
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
