//! Reading the ICC header and tag table straight from a profile's bytes
//! (ICC.1:2010, clauses 7.2 and 7.3), and decoding the few simple tag types
//! inkfit reports on (XYZType, s15Fixed16ArrayType) and the CLUT of the
//! lutAToB / lutBToA tables it writes (10.10 / 10.11).
//!
//! lcms2 opens profiles too, but it is lenient; this reader is the strict
//! gate that tells a user *why* a file is not a usable profile.

use std::fmt;

/// Why a byte string is not a well-formed ICC profile.
#[derive(Clone, Debug, PartialEq, Eq, thiserror::Error)]
pub enum HeaderError {
    /// Shorter than the 128-byte header plus the tag count.
    #[error("not an ICC profile: {len} bytes, shorter than the 128-byte header and tag count")]
    TooShort {
        /// The length of the data, bytes.
        len: usize,
    },
    /// No `acsp` signature at byte 36.
    #[error("not an ICC profile: no 'acsp' signature at byte 36")]
    NoSignature,
    /// The header declares more bytes than the data holds.
    #[error("truncated: the header declares {declared} bytes but the file has {actual}")]
    Truncated {
        /// The size the header declares, bytes.
        declared: usize,
        /// The size of the data, bytes.
        actual: usize,
    },
    /// A tag's data lies outside the profile.
    #[error("damaged tag table: tag '{sig}' at {offset}+{size} lies outside the {len}-byte profile")]
    TagOutOfBounds {
        /// The tag's signature.
        sig: Signature,
        /// Where the tag's data starts, bytes from the start of the profile.
        offset: usize,
        /// The tag's declared size, bytes.
        size: usize,
        /// The length of the profile, bytes.
        len: usize,
    },
    /// The tag table is longer than the profile.
    #[error("damaged tag table: {count} tags do not fit in the profile")]
    TagCount {
        /// The tag count the table declares.
        count: usize,
    },
    /// A tag declares more than [`MAX_TAG_BYTES`].
    #[error("damaged tag table: tag '{sig}' declares {size} bytes, more than the {limit} a tag may have")]
    TagTooLarge {
        /// The tag's signature.
        sig: Signature,
        /// The tag's declared size, bytes.
        size: usize,
        /// The largest size accepted, bytes.
        limit: usize,
    },
}

/// The largest tag accepted, bytes: 48 MiB. The largest lookup table
/// accepted (a CLUT of `tags::MAX_CLUT_VALUES` 16-bit values, 32 MiB) fits
/// with its curves; real tables are far smaller (a CMYK → Lab table of 17⁴
/// nodes is 0.5 MB, a CMYK device link of 33⁴ nodes 9.5 MB).
pub const MAX_TAG_BYTES: usize = 48 << 20;

/// A four-character ICC signature.
#[derive(Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct Signature(pub [u8; 4]);

impl Signature {
    /// The signature of four bytes, e.g. `Signature::new(b"prtr")`.
    pub const fn new(s: &[u8; 4]) -> Self {
        Self(*s)
    }

    /// The signature read as a big-endian number, as it is stored.
    pub fn as_u32(self) -> u32 {
        u32::from_be_bytes(self.0)
    }
}

impl fmt::Display for Signature {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        // Trailing spaces are part of signatures such as 'RGB '; show them trimmed.
        let text: String = self
            .0
            .iter()
            .map(|&b| {
                if b.is_ascii_graphic() || b == b' ' {
                    b as char
                } else {
                    '?'
                }
            })
            .collect();
        f.write_str(text.trim_end())
    }
}

impl fmt::Debug for Signature {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "'{self}'")
    }
}

/// One entry of the tag table.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct TagEntry {
    /// The tag's signature.
    pub sig: Signature,
    /// Where the tag's data starts, bytes from the start of the profile.
    pub offset: usize,
    /// The tag's size, bytes.
    pub size: usize,
}

/// The header fields inkfit uses, and the tag table.
#[derive(Clone, Debug, PartialEq)]
pub struct Header {
    /// The profile size the header declares, bytes.
    pub size: usize,
    /// Version as (major, minor, bugfix), e.g. (4, 3, 0).
    pub version: (u8, u8, u8),
    /// The profile or device class (`mntr`, `prtr`, …).
    pub class: Signature,
    /// The colour space of the device data (`RGB `, `CMYK`, …).
    pub color_space: Signature,
    /// The profile connection space (`XYZ ` or `Lab `).
    pub pcs: Signature,
    /// Creation date as (year, month, day, hour, minute, second).
    pub created: [u16; 6],
    /// The rendering intent field as stored (0 perceptual … 3 absolute colorimetric).
    pub rendering_intent: u32,
    /// PCS illuminant from the header, XYZ with Y = 1.
    pub illuminant: [f64; 3],
    /// The signature of the profile's creator.
    pub creator: Signature,
    /// The tag table in file order.
    pub tags: Vec<TagEntry>,
}

/// Device class: display.
pub const CLASS_DISPLAY: Signature = Signature::new(b"mntr");
/// Device class: input.
pub const CLASS_INPUT: Signature = Signature::new(b"scnr");
/// Device class: output.
pub const CLASS_OUTPUT: Signature = Signature::new(b"prtr");
/// Device class: device link.
pub const CLASS_LINK: Signature = Signature::new(b"link");
/// Device class: abstract.
pub const CLASS_ABSTRACT: Signature = Signature::new(b"abst");
/// Device class: colour space.
pub const CLASS_COLORSPACE: Signature = Signature::new(b"spac");
/// Device class: named colour.
pub const CLASS_NAMED: Signature = Signature::new(b"nmcl");
/// Colour space: RGB.
pub const SPACE_RGB: Signature = Signature::new(b"RGB ");
/// Colour space: CMYK.
pub const SPACE_CMYK: Signature = Signature::new(b"CMYK");
/// Colour space: grey.
pub const SPACE_GRAY: Signature = Signature::new(b"GRAY");
/// Colour space: CIELAB.
pub const SPACE_LAB: Signature = Signature::new(b"Lab ");
/// Colour space: CIEXYZ.
pub const SPACE_XYZ: Signature = Signature::new(b"XYZ ");

fn be_u32(b: &[u8], at: usize) -> u32 {
    u32::from_be_bytes([b[at], b[at + 1], b[at + 2], b[at + 3]])
}

fn be_u16(b: &[u8], at: usize) -> u16 {
    u16::from_be_bytes([b[at], b[at + 1]])
}

fn sig_at(b: &[u8], at: usize) -> Signature {
    Signature([b[at], b[at + 1], b[at + 2], b[at + 3]])
}

/// s15Fixed16Number (ICC.1:2010, 4.6).
fn s15f16(b: &[u8], at: usize) -> f64 {
    f64::from(be_u32(b, at) as i32) / 65536.0
}

impl Header {
    /// Parses and validates the header and tag table of `bytes`.
    pub fn parse(bytes: &[u8]) -> Result<Self, HeaderError> {
        let len = bytes.len();
        if len < 132 {
            return Err(HeaderError::TooShort { len });
        }
        if &bytes[36..40] != b"acsp" {
            return Err(HeaderError::NoSignature);
        }
        let declared = be_u32(bytes, 0) as usize;
        if declared > len {
            return Err(HeaderError::Truncated { declared, actual: len });
        }
        let count = be_u32(bytes, 128) as usize;
        if count > (declared.saturating_sub(132)) / 12 {
            return Err(HeaderError::TagCount { count });
        }
        let mut tags = Vec::with_capacity(count);
        for i in 0..count {
            let at = 132 + 12 * i;
            let entry = TagEntry {
                sig: sig_at(bytes, at),
                offset: be_u32(bytes, at + 4) as usize,
                size: be_u32(bytes, at + 8) as usize,
            };
            if entry.size > MAX_TAG_BYTES {
                return Err(HeaderError::TagTooLarge {
                    sig: entry.sig,
                    size: entry.size,
                    limit: MAX_TAG_BYTES,
                });
            }
            if entry.offset.checked_add(entry.size).is_none_or(|end| end > declared) {
                return Err(HeaderError::TagOutOfBounds {
                    sig: entry.sig,
                    offset: entry.offset,
                    size: entry.size,
                    len: declared,
                });
            }
            tags.push(entry);
        }
        let v = bytes[8..12].to_vec();
        let mut created = [0u16; 6];
        for (i, c) in created.iter_mut().enumerate() {
            *c = be_u16(bytes, 24 + 2 * i);
        }
        Ok(Self {
            size: declared,
            version: (v[0], v[1] >> 4, v[1] & 0x0f),
            class: sig_at(bytes, 12),
            color_space: sig_at(bytes, 16),
            pcs: sig_at(bytes, 20),
            created,
            rendering_intent: be_u32(bytes, 64),
            illuminant: [s15f16(bytes, 68), s15f16(bytes, 72), s15f16(bytes, 76)],
            creator: sig_at(bytes, 80),
            tags,
        })
    }

    /// The tag table entry for `sig`, if the profile has one.
    pub fn tag(&self, sig: &[u8; 4]) -> Option<TagEntry> {
        self.tags.iter().copied().find(|t| t.sig.0 == *sig)
    }

    /// The version as "major.minor.bugfix", e.g. "4.3.0".
    pub fn version_string(&self) -> String {
        let (a, b, c) = self.version;
        format!("{a}.{b}.{c}")
    }
}

/// Decodes an XYZType tag (ICC.1:2010, 10.29): the first XYZ number.
pub fn read_xyz(bytes: &[u8], tag: TagEntry) -> Option<[f64; 3]> {
    let body = bytes.get(tag.offset..tag.offset + tag.size)?;
    if body.len() < 20 || &body[0..4] != b"XYZ " {
        return None;
    }
    Some([s15f16(body, 8), s15f16(body, 12), s15f16(body, 16)])
}

/// Decodes an s15Fixed16ArrayType tag of nine numbers (the chromaticAdaptation
/// matrix, ICC.1:2010, 9.2.15), row-major.
pub fn read_matrix3(bytes: &[u8], tag: TagEntry) -> Option<[[f64; 3]; 3]> {
    let body = bytes.get(tag.offset..tag.offset + tag.size)?;
    if body.len() < 8 + 36 || &body[0..4] != b"sf32" {
        return None;
    }
    let mut m = [[0.0; 3]; 3];
    for (i, row) in m.iter_mut().enumerate() {
        for (j, v) in row.iter_mut().enumerate() {
            *v = s15f16(body, 8 + 4 * (3 * i + j));
        }
    }
    Some(m)
}

/// The tag type signature (first four bytes of the tag's data).
pub fn tag_type(bytes: &[u8], tag: TagEntry) -> Option<Signature> {
    let body = bytes.get(tag.offset..tag.offset + 4)?;
    Some(Signature([body[0], body[1], body[2], body[3]]))
}

/// A multidimensional table as stored in a lutAToB / lutBToA tag.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ClutTable {
    /// Grid points per input channel.
    pub grid: Vec<u8>,
    /// Output channels: values per grid node.
    pub outputs: usize,
    /// Entries as stored: first input varies slowest, `outputs` values per
    /// node, normalised to 16-bit codes (8-bit tables are scaled by 257).
    pub values: Vec<u16>,
}

/// The CLUT of the lutAToBType or lutBToAType tag `sig` (ICC.1:2010, 10.10
/// and 10.11); `None` when the tag is missing, of another type, has no CLUT
/// or is shorter than its CLUT.
pub fn read_clut(bytes: &[u8], tag: TagEntry) -> Option<ClutTable> {
    let data = bytes.get(tag.offset..tag.offset.checked_add(tag.size)?)?;
    let kind = data.get(0..4)?;
    if kind != b"mAB " && kind != b"mBA " {
        return None;
    }
    let (inputs, outputs) = (*data.get(8)? as usize, *data.get(9)? as usize);
    let clut_at = data.get(24..28).map(|_| be_u32(data, 24) as usize)?;
    if clut_at == 0 || inputs == 0 || inputs > 15 || outputs == 0 {
        return None;
    }
    let grid = data.get(clut_at..clut_at + inputs)?.to_vec();
    let precision = *data.get(clut_at + 16)?;
    let count = grid.iter().map(|g| *g as usize).product::<usize>() * outputs;
    let body = clut_at + 20;
    let values = match precision {
        2 => data
            .get(body..body + 2 * count)?
            .chunks_exact(2)
            .map(|c| u16::from_be_bytes([c[0], c[1]]))
            .collect(),
        1 => data.get(body..body + count)?.iter().map(|v| *v as u16 * 257).collect(),
        _ => return None,
    };
    Some(ClutTable { grid, outputs, values })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn rejects_short_and_unsigned_data() {
        assert_eq!(Header::parse(&[0u8; 10]), Err(HeaderError::TooShort { len: 10 }));
        assert_eq!(Header::parse(&[0u8; 200]), Err(HeaderError::NoSignature));
    }

    #[test]
    fn s15fixed16_decodes_negative_values() {
        // ICC.1:2010, 4.6: 0xFFFF0000 is -1.0, 0x00010000 is 1.0.
        assert_eq!(s15f16(&[0xff, 0xff, 0, 0], 0), -1.0);
        assert_eq!(s15f16(&[0, 1, 0, 0], 0), 1.0);
        assert_eq!(s15f16(&[0, 0, 0x80, 0], 0), 0.5);
    }
}
