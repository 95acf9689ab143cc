//! CMYK TIFF, read with the `tiff` crate directly (the image crate would turn
//! CMYK into RGB by a profile-free formula), and the checks of JPEG strips
//! and tiles inside any TIFF against the decode limits.

use std::fs::File;
use std::io::BufReader;
use std::path::Path;

use super::*;

pub(super) type TiffReader = tiff::decoder::Decoder<BufReader<File>>;

/// TIFF 6.0, section 22 (and TIFF Technical Note 2): Compression 7 is JPEG
/// with one JPEG stream per strip or tile.
const TIFF_COMPRESSION_JPEG: u16 = 7;

/// A `tiff` decoder when `path` is a TIFF whose first image is CMYK; `None`
/// for every other file, which the image crate reads. Every TIFF, CMYK or
/// not, has its JPEG strips or tiles checked here.
pub(super) fn open_cmyk(path: &Path, limits: &DecodeLimits) -> Result<Option<TiffReader>, RasterError> {
    if sniff_file(path)? != Some(FileKind::Tiff) {
        return Ok(None);
    }
    check_first_ifd(path)?;
    let reader = BufReader::new(File::open(path).map_err(read_err(path))?);
    let mut dec = tiff::decoder::Decoder::new(reader).map_err(tiff_err(path))?;
    let (w, h) = dec.dimensions().map_err(tiff_err(path))?;
    limits.check(path, w, h)?;
    let compression = dec
        .find_tag(tiff::tags::Tag::Compression)
        .map_err(tiff_err(path))?
        .and_then(|v| v.into_u16().ok());
    if compression == Some(TIFF_COMPRESSION_JPEG) {
        check_jpeg_chunks(path, &mut dec, limits)?;
    }
    let photometric = dec
        .find_tag(tiff::tags::Tag::PhotometricInterpretation)
        .map_err(tiff_err(path))?
        .and_then(|v| v.into_u16().ok());
    // TIFF 6.0, section 16: PhotometricInterpretation 5 = separated (CMYK
    // with the default InkSet).
    if photometric != Some(tiff::tags::PhotometricInterpretation::CMYK.to_u16()) {
        return Ok(None);
    }
    Ok(Some(dec))
}

/// Bytes per value of a TIFF field type (TIFF 6.0, section 2, types 1–12;
/// BigTIFF adds LONG8, SLONG8 and IFD8 = 16–18, 8 bytes each); `None` for a
/// type the decoder does not know (it refuses those).
fn tiff_type_size(t: u16) -> Option<u64> {
    Some(match t {
        1 | 2 | 6 | 7 => 1,
        3 | 8 => 2,
        4 | 9 | 11 | 13 => 4,
        5 | 10 | 12 | 16..=18 => 8,
        _ => return None,
    })
}

/// Refuses a first image directory (IFD) that declares more than the file
/// holds: entries past its end, or a field whose values, at its declared
/// count, would run past it. The `tiff` decoder reads this directory as it
/// opens the file, before any limit of ours applies, and reserves room for
/// a field's declared count (up to 256 MiB) before it reads a value; a
/// field the file can hold keeps that within a small multiple of the file's
/// size. Layout: TIFF 6.0 section 2 (classic: 8-byte header, 12-byte
/// entries) and the BigTIFF format (16-byte header, 20-byte entries).
fn check_first_ifd(path: &Path) -> Result<(), RasterError> {
    let mut f = File::open(path).map_err(read_err(path))?;
    let len = f.metadata().map_err(read_err(path))?.len();
    let bounds = |detail: String| RasterError::Bounds {
        path: path_text(path),
        detail,
    };
    let mut head = [0u8; 16];
    let got = read_up_to(&mut f, &mut head).map_err(read_err(path))?;
    if got < 8 {
        return Ok(()); // The decoder reports the truncation.
    }
    let le = &head[0..2] == b"II";
    let u16_at = |b: &[u8]| {
        if le {
            u16::from_le_bytes([b[0], b[1]])
        } else {
            u16::from_be_bytes([b[0], b[1]])
        }
    };
    let u32_at = |b: &[u8]| {
        let a = [b[0], b[1], b[2], b[3]];
        u64::from(if le {
            u32::from_le_bytes(a)
        } else {
            u32::from_be_bytes(a)
        })
    };
    let u64_at = |b: &[u8]| {
        let a: [u8; 8] = b[..8].try_into().unwrap_or([0; 8]);
        if le {
            u64::from_le_bytes(a)
        } else {
            u64::from_be_bytes(a)
        }
    };
    let big = match u16_at(&head[2..4]) {
        42 => false,
        43 if got == 16 => true,
        _ => return Ok(()),
    };
    let (ifd, count_len, entry_len, inline) = if big {
        (u64_at(&head[8..16]), 8u64, 20u64, 8u64)
    } else {
        (u32_at(&head[4..8]), 2, 12, 4)
    };
    let mut buf = [0u8; 8];
    f.seek(SeekFrom::Start(ifd)).map_err(read_err(path))?;
    if read_up_to(&mut f, &mut buf[..count_len as usize]).map_err(read_err(path))? < count_len as usize {
        return Ok(());
    }
    let entries = if big { u64_at(&buf) } else { u64::from(u16_at(&buf)) };
    let end = entries
        .checked_mul(entry_len)
        .and_then(|n| n.checked_add(ifd + count_len))
        .unwrap_or(u64::MAX);
    if end > len {
        return Err(bounds(format!(
            "its first image directory declares {entries} entries, more than the file's {len} bytes hold"
        )));
    }
    let mut e = [0u8; 20];
    for _ in 0..entries {
        f.read_exact(&mut e[..entry_len as usize]).map_err(read_err(path))?;
        let tag = u16_at(&e[0..2]);
        let Some(size) = tiff_type_size(u16_at(&e[2..4])) else {
            continue;
        };
        let (count, at) = if big {
            (u64_at(&e[4..12]), u64_at(&e[12..20]))
        } else {
            (u32_at(&e[4..8]), u32_at(&e[8..12]))
        };
        let bytes = count.saturating_mul(size);
        if bytes > inline && at.saturating_add(bytes) > len {
            return Err(bounds(format!(
                "its TIFF field {tag} declares {count} values ({bytes} bytes), more than the file's {len} bytes hold"
            )));
        }
    }
    Ok(())
}

/// Each JPEG stream of a JPEG-compressed TIFF must declare no more than its
/// strip or tile holds, and all of them together at most twice the pixel
/// limit (tiles are padded past the image's edge): the decoder allocates
/// and decodes what each stream declares.
pub(super) fn check_jpeg_chunks(path: &Path, dec: &mut TiffReader, limits: &DecodeLimits) -> Result<(), RasterError> {
    use tiff::tags::Tag;
    let (w, h) = dec.dimensions().map_err(tiff_err(path))?;
    let u32_tag = |dec: &mut TiffReader, tag| -> Result<Option<u32>, RasterError> {
        Ok(dec
            .find_tag(tag)
            .map_err(tiff_err(path))?
            .and_then(|v| v.into_u32().ok()))
    };
    let (offsets_tag, counts_tag, chunk) = match dec.get_chunk_type() {
        tiff::decoder::ChunkType::Strip => {
            let rows = u32_tag(dec, Tag::RowsPerStrip)?.unwrap_or(h).min(h);
            (Tag::StripOffsets, Tag::StripByteCounts, (w, rows))
        }
        tiff::decoder::ChunkType::Tile => {
            let tw = u32_tag(dec, Tag::TileWidth)?.unwrap_or(0);
            let th = u32_tag(dec, Tag::TileLength)?.unwrap_or(0);
            (Tag::TileOffsets, Tag::TileByteCounts, (tw, th))
        }
    };
    let offsets = dec.get_tag_u64_vec(offsets_tag).map_err(tiff_err(path))?;
    let counts = dec.get_tag_u64_vec(counts_tag).map_err(tiff_err(path))?;
    let mut file = BufReader::with_capacity(4096, File::open(path).map_err(read_err(path))?);
    let budget = limits.max_pixels.saturating_mul(2);
    let mut decoded = 0u64;
    for (i, (&off, &count)) in offsets.iter().zip(&counts).enumerate() {
        file.seek(SeekFrom::Start(off)).map_err(read_err(path))?;
        let Some((jw, jh)) = jpeg_frame_size(&mut file, count).map_err(read_err(path))? else {
            // No frame header: the decoder reports the damage.
            continue;
        };
        if jw > chunk.0 || jh > chunk.1 {
            return Err(RasterError::Bounds {
                path: path_text(path),
                detail: format!(
                    "JPEG stream {i} declares {jw} × {jh} pixels in a strip or tile of {} × {}",
                    chunk.0, chunk.1
                ),
            });
        }
        decoded = decoded.saturating_add(u64::from(jw) * u64::from(jh));
        if decoded > budget {
            return Err(RasterError::Bounds {
                path: path_text(path),
                detail: format!(
                    "its JPEG streams declare more than {} megapixels together",
                    megapixel_text(budget)
                ),
            });
        }
    }
    Ok(())
}

pub(super) fn cmyk_info(path: &Path, dec: &mut TiffReader, limits: &DecodeLimits) -> Result<RasterInfo, RasterError> {
    let p = path_text(path);
    let (width, height) = dec.dimensions().map_err(tiff_err(path))?;
    limits.check(path, width, height)?;
    let bits = match dec.colortype().map_err(tiff_err(path))? {
        tiff::ColorType::CMYK(8) => 8,
        tiff::ColorType::CMYK(16) => 16,
        other => {
            return Err(RasterError::Layout {
                path: p,
                layout: format!("{other:?}"),
            })
        }
    };
    if width == 0 || height == 0 {
        return Err(RasterError::Layout {
            path: p,
            layout: "empty (0-pixel)".to_string(),
        });
    }
    // TIFF 6.0, section 8: PlanarConfiguration 2 stores each ink apart.
    let planar = dec
        .find_tag(tiff::tags::Tag::PlanarConfiguration)
        .map_err(tiff_err(path))?
        .and_then(|v| v.into_u16().ok());
    if planar == Some(2) {
        return Err(RasterError::Layout {
            path: p,
            layout: "planar CMYK".to_string(),
        });
    }
    // Read before any limits are set (they apply to tag values too).
    let icc = match dec.find_tag(tiff::tags::Tag::IccProfile).map_err(tiff_err(path))? {
        Some(v) => Some(v.into_u8_vec().map_err(tiff_err(path))?),
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

pub(super) fn read_cmyk(path: &Path, mut dec: TiffReader, limits: &DecodeLimits) -> Result<Raster, RasterError> {
    let info = cmyk_info(path, &mut dec, limits)?;
    let bytes = info.pixels() * 4 * info.bytes_per_sample();
    let mut l = tiff::decoder::Limits::default();
    l.decoding_buffer_size = bytes;
    l.intermediate_buffer_size = bytes.saturating_mul(2).saturating_add(1 << 20);
    let mut dec = dec.with_limits(l);
    let mut color = zeroed(path, bytes)?;
    // Samples straight into the buffer, 16-bit ones in native byte order.
    dec.read_image_bytes(&mut color).map_err(tiff_err(path))?;
    Ok(Raster {
        info,
        color,
        alpha: None,
    })
}
