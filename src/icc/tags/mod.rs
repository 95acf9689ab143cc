//! Checks of the tags that lcms2 decodes, made on the profile's bytes before
//! lcms2 opens it: lookup tables (lut8, lut16, lutAToB, lutBToA and the
//! multiProcessElements header), tone curves, and the XYZ numbers and
//! adaptation matrix of matrix/TRC profiles.
//!
//! A table whose channel counts do not match the profile's colour spaces, or
//! whose declared parts do not fit in its tag, cannot be right; lcms2 may
//! still read it (as something else) and produce values that make later
//! work unbounded. Every check here is on sizes and counts read from the
//! tag, with checked arithmetic, so the checks themselves are bounded by the
//! tag table.
//!
//! Clause numbers are those of ICC.1:2010 (profile version 4.3): tag
//! definitions in 9.2, tag types in 10 (10.5 curveType, 10.8 lut16Type,
//! 10.9 lut8Type, 10.10 lutAToBType, 10.11 lutBToAType, 10.14
//! multiProcessElementsType, 10.16 parametricCurveType, 10.20
//! s15Fixed16ArrayType, 10.29 XYZType); the numbers of the individual tag
//! definitions in 9.2 are given from memory.

use super::header::{Header, Signature, SPACE_CMYK, SPACE_GRAY, SPACE_LAB, SPACE_RGB, SPACE_XYZ};

mod lut;

#[cfg(test)]
use lut::clut_values;
use lut::{curve, lut8_or_16, lut_ab, multi_process};

/// The most values (grid nodes × output channels) a CLUT may hold: 2²⁴,
/// 32 MiB once lcms2 holds them as 16-bit numbers. A 4-channel device link
/// with 33⁴ nodes has 4.7 Mi values, a CMYK → Lab table of 17⁴ nodes 0.25 Mi,
/// a six-channel table of 11⁶ nodes 10.6 Mi (counting).
pub const MAX_CLUT_VALUES: u64 = 1 << 24;

/// Bound on each component of the colorant and white XYZ numbers (Y of the
/// white = 1). The colorants of a matrix/TRC profile sum to the D50 white
/// (ICC.1:2010, F.3), so real primaries have components within 0…1; wide
/// encoding spaces with imaginary primaries go a little below 0 or above 1.
/// ±5 admits all of them with a wide margin and still refuses the values a
/// damaged s15Fixed16Number gives (up to ±32768).
pub const XYZ_LIMIT: f64 = 5.0;

/// Why a tag cannot be right. Each names the tag.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum TagError {
    /// The tag has a type it must not have.
    #[error("tag '{tag}' has type '{found}', but it must be {allowed} ({clause})")]
    WrongType {
        /// The tag's signature.
        tag: Signature,
        /// The type the tag has.
        found: Signature,
        /// The types allowed, in words.
        allowed: &'static str,
        /// The clause of the ICC specification that says so.
        clause: &'static str,
    },
    /// The tag is shorter than its type or contents need.
    #[error("tag '{tag}' ({kind}) needs {need} bytes, but the tag holds {size}")]
    TooShort {
        /// The tag's signature.
        tag: Signature,
        /// The tag's type, in words.
        kind: &'static str,
        /// The bytes it needs.
        need: u64,
        /// The bytes it holds.
        size: usize,
    },
    /// A lookup table's channel count does not match the profile.
    #[error("tag '{tag}': the table has {found} {side} channels, but {wanted_by} has {expected}")]
    Channels {
        /// The tag's signature.
        tag: Signature,
        /// Which side of the table: input or output.
        side: &'static str,
        /// The table's channel count.
        found: usize,
        /// What fixes the count: "the data colour space 'CMYK'", say.
        wanted_by: String,
        /// The channel count the profile asks for.
        expected: usize,
    },
    /// The header names a colour space that is not an ICC colour space.
    #[error("tag '{tag}': the profile's {role} '{space}' is not an ICC colour space, so the table's channels cannot be checked")]
    UnknownSpace {
        /// The tag's signature.
        tag: Signature,
        /// Which header field: the data colour space or the connection space.
        role: &'static str,
        /// The signature found there.
        space: Signature,
    },
    /// A CLUT has fewer than 2 grid points along one input.
    #[error("tag '{tag}': the CLUT has {points} grid points along {along}; a CLUT needs at least 2 ({clause})")]
    GridPoints {
        /// The tag's signature.
        tag: Signature,
        /// Which input, in words.
        along: String,
        /// The grid points along it.
        points: u8,
        /// The clause of the ICC specification that says so.
        clause: &'static str,
    },
    /// A CLUT holds more values than inkfit accepts.
    #[error("tag '{tag}': a CLUT of {grid} nodes × {outputs} outputs exceeds the limit of {limit} values")]
    ClutTooLarge {
        /// The tag's signature.
        tag: Signature,
        /// The grid, in words (nodes per input).
        grid: String,
        /// Output channels per node.
        outputs: usize,
        /// The most values accepted.
        limit: u64,
    },
    /// A part of the tag lies past the tag's end.
    #[error("tag '{tag}': {part} needs bytes {start}…{end}, but the tag has {size}")]
    OutOfTag {
        /// The tag's signature.
        tag: Signature,
        /// Which part, in words.
        part: String,
        /// Where the part starts, bytes from the start of the tag.
        start: u64,
        /// Where the part ends, bytes from the start of the tag.
        end: u64,
        /// The tag's size, bytes.
        size: usize,
    },
    /// The tag's contents do not fit together.
    #[error("tag '{tag}': {detail}")]
    Structure {
        /// The tag's signature.
        tag: Signature,
        /// What is wrong, in words.
        detail: String,
    },
    /// A decoded value is outside a plausible range.
    #[error("tag '{tag}': {what} is {value:.4}, outside the plausible range {lo}…{hi}")]
    Implausible {
        /// The tag's signature.
        tag: Signature,
        /// Which value, in words.
        what: String,
        /// The value found.
        value: f64,
        /// The lowest plausible value.
        lo: f64,
        /// The highest plausible value.
        hi: f64,
    },
}

/// Channels of a colour space signature (ICC.1:2010, 7.2.6, table 19).
pub fn channels_of(space: Signature) -> Option<usize> {
    let s = &space.0;
    Some(match s {
        _ if space == SPACE_GRAY => 1,
        _ if space == SPACE_CMYK => 4,
        _ if [SPACE_XYZ, SPACE_LAB, SPACE_RGB].contains(&space) => 3,
        b"Luv " | b"YCbr" | b"Yxy " | b"HSV " | b"HLS " | b"CMY " => 3,
        // 2CLR … 9CLR, ACLR … FCLR: 2 to 15 colours.
        [c, b'C', b'L', b'R'] => match c {
            b'2'..=b'9' => usize::from(c - b'0'),
            b'A'..=b'F' => usize::from(c - b'A') + 10,
            _ => return None,
        },
        _ => return None,
    })
}

/// Checks every tag entry lcms2 would decode (every entry, not only the
/// first of a signature, so that a duplicate cannot slip past).
pub fn validate(header: &Header, bytes: &[u8]) -> Result<(), TagError> {
    for &entry in &header.tags {
        let Some(data) = bytes.get(entry.offset..entry.offset + entry.size) else {
            // The header reader has already refused entries outside the profile.
            continue;
        };
        let tag = Tag { sig: entry.sig, data };
        match &entry.sig.0 {
            b"A2B0" | b"A2B1" | b"A2B2" => table(tag, header, Flow::ToPcs)?,
            b"B2A0" | b"B2A1" | b"B2A2" => table(tag, header, Flow::FromPcs)?,
            b"gamt" => table(tag, header, Flow::Gamut)?,
            b"pre0" | b"pre1" | b"pre2" => table(tag, header, Flow::Preview)?,
            b"D2B0" | b"D2B1" | b"D2B2" | b"D2B3" => multi_process(tag, header, Flow::ToPcs)?,
            b"B2D0" | b"B2D1" | b"B2D2" | b"B2D3" => multi_process(tag, header, Flow::FromPcs)?,
            b"rTRC" | b"gTRC" | b"bTRC" | b"kTRC" => {
                // ICC.1:2010, 9.2 (redTRCTag … grayTRCTag): curveType or
                // parametricCurveType.
                curve(tag, 0, "the tone curve")?;
            }
            b"rXYZ" | b"gXYZ" | b"bXYZ" => xyz(tag, -XYZ_LIMIT)?,
            // A white is a real colour: every component positive.
            b"wtpt" => xyz(tag, 0.0)?,
            b"chad" => adaptation_matrix(tag)?,
            _ => {}
        }
    }
    Ok(())
}

/// Which way a table converts, which fixes its channel counts.
#[derive(Clone, Copy, PartialEq, Eq)]
enum Flow {
    /// A2Bn (ICC.1:2010, 9.2.1–9.2.3), D2Bn: device → PCS.
    ToPcs,
    /// B2An (9.2.6–9.2.8), B2Dn: PCS → device.
    FromPcs,
    /// gamt (9.2.28): PCS → one channel, 0 in gamut.
    Gamut,
    /// pre0…pre2 (9.2.38–9.2.40): PCS → PCS.
    Preview,
}

/// A tag's data and signature.
#[derive(Clone, Copy)]
struct Tag<'a> {
    sig: Signature,
    data: &'a [u8],
}

impl Tag<'_> {
    fn need(&self, kind: &'static str, need: u64) -> Result<(), TagError> {
        if (self.data.len() as u64) < need {
            Err(TagError::TooShort {
                tag: self.sig,
                kind,
                need,
                size: self.data.len(),
            })
        } else {
            Ok(())
        }
    }

    /// Bytes `start..start + len` of the tag, or an error naming `part`.
    fn part(&self, part: impl Into<String>, start: u64, len: u64) -> Result<&[u8], TagError> {
        let end = start.checked_add(len);
        match end {
            Some(end) if end <= self.data.len() as u64 => Ok(&self.data[start as usize..end as usize]),
            _ => Err(TagError::OutOfTag {
                tag: self.sig,
                part: part.into(),
                start,
                end: end.unwrap_or(u64::MAX),
                size: self.data.len(),
            }),
        }
    }

    fn type_sig(&self) -> Option<Signature> {
        self.data.get(0..4).map(|b| Signature([b[0], b[1], b[2], b[3]]))
    }

    /// The tag is of type `sig`, else a wrong-type error naming `allowed`
    /// and the clause that requires it.
    fn require_type(&self, sig: [u8; 4], allowed: &'static str, clause: &'static str) -> Result<(), TagError> {
        match self.type_sig() {
            Some(found) if found == Signature(sig) => Ok(()),
            found => Err(TagError::WrongType {
                tag: self.sig,
                found: found.unwrap_or(Signature(*b"    ")),
                allowed,
                clause,
            }),
        }
    }

    fn structure(&self, detail: impl Into<String>) -> TagError {
        TagError::Structure {
            tag: self.sig,
            detail: detail.into(),
        }
    }
}

fn be_u16(b: &[u8], at: usize) -> u16 {
    u16::from_be_bytes([b[at], b[at + 1]])
}

fn be_u32(b: &[u8], at: usize) -> u32 {
    u32::from_be_bytes([b[at], b[at + 1], b[at + 2], b[at + 3]])
}

/// s15Fixed16Number (ICC.1:2010, 4.6).
fn s15f16(b: &[u8], at: usize) -> f64 {
    f64::from(be_u32(b, at) as i32) / 65536.0
}

/// One side of a table: the channel count it must have and what fixes it.
type Side = (usize, String);

/// Input and output channels a table of `flow` must have in this profile.
fn expected_channels(tag: Tag, header: &Header, flow: Flow) -> Result<(Side, Side), TagError> {
    let space = |role: &'static str, sig: Signature| match channels_of(sig) {
        Some(n) => Ok((n, format!("the profile's {role} '{sig}'"))),
        None => Err(TagError::UnknownSpace {
            tag: tag.sig,
            role,
            space: sig,
        }),
    };
    // For a device link the PCS field holds the output device's colour
    // space (ICC.1:2010, 7.2.7); the same rule then gives its channels.
    let device = || space("data colour space", header.color_space);
    let pcs = || space("connection space", header.pcs);
    Ok(match flow {
        Flow::ToPcs => (device()?, pcs()?),
        Flow::FromPcs => (pcs()?, device()?),
        // ICC.1:2010, 9.2.28: one output channel, 0 for in gamut.
        Flow::Gamut => (pcs()?, (1, "a gamut tag".to_string())),
        Flow::Preview => (pcs()?, pcs()?),
    })
}

fn check_channels(tag: Tag, header: &Header, flow: Flow, found: (usize, usize)) -> Result<(), TagError> {
    let (want_in, want_out) = expected_channels(tag, header, flow)?;
    for (side, f, (expected, wanted_by)) in [("input", found.0, want_in), ("output", found.1, want_out)] {
        if f != expected {
            return Err(TagError::Channels {
                tag: tag.sig,
                side,
                found: f,
                wanted_by,
                expected,
            });
        }
    }
    Ok(())
}

/// A lookup-table tag (A2Bn, B2An, gamt, pren): its type is allowed for the
/// tag, its channels match the profile and its parts fit.
fn table(tag: Tag, header: &Header, flow: Flow) -> Result<(), TagError> {
    let ty = tag.type_sig().ok_or(TagError::TooShort {
        tag: tag.sig,
        kind: "a lookup table",
        need: 4,
        size: tag.data.len(),
    })?;
    // ICC.1:2010, 9.2.1–9.2.3 (AToBn: lut8, lut16 or lutAToB), 9.2.6–9.2.8
    // (BToAn) and 9.2.28 (gamut: lut8, lut16 or lutBToA), 9.2.38–9.2.40
    // (preview: any of the four).
    let (allowed, clause, ok) = match flow {
        Flow::ToPcs => (
            "lut8, lut16 or lutAToB",
            "ICC.1:2010, 9.2.1",
            &[*b"mft1", *b"mft2", *b"mAB "][..],
        ),
        Flow::FromPcs => (
            "lut8, lut16 or lutBToA",
            "ICC.1:2010, 9.2.6",
            &[*b"mft1", *b"mft2", *b"mBA "][..],
        ),
        Flow::Gamut => (
            "lut8, lut16 or lutBToA",
            "ICC.1:2010, 9.2.28",
            &[*b"mft1", *b"mft2", *b"mBA "][..],
        ),
        Flow::Preview => (
            "lut8, lut16, lutAToB or lutBToA",
            "ICC.1:2010, 9.2.38",
            &[*b"mft1", *b"mft2", *b"mAB ", *b"mBA "][..],
        ),
    };
    if !ok.contains(&ty.0) {
        return Err(TagError::WrongType {
            tag: tag.sig,
            found: ty,
            allowed,
            clause,
        });
    }
    match &ty.0 {
        b"mft1" => lut8_or_16(tag, header, flow, false),
        b"mft2" => lut8_or_16(tag, header, flow, true),
        b"mAB " => lut_ab(tag, header, flow, true),
        _ => lut_ab(tag, header, flow, false),
    }
}

/// An XYZType tag (ICC.1:2010, 10.29) of one number, each component in
/// `lo…XYZ_LIMIT`.
fn xyz(tag: Tag, lo: f64) -> Result<(), TagError> {
    tag.require_type(*b"XYZ ", "XYZType", "ICC.1:2010, 10.29")?;
    tag.need("an XYZ number", 20)?;
    for (i, c) in ["X", "Y", "Z"].iter().enumerate() {
        let v = s15f16(tag.data, 8 + 4 * i);
        let inside = if lo == 0.0 { v > 0.0 } else { v >= lo } && v <= XYZ_LIMIT;
        if !inside {
            return Err(TagError::Implausible {
                tag: tag.sig,
                what: c.to_string(),
                value: v,
                lo,
                hi: XYZ_LIMIT,
            });
        }
    }
    Ok(())
}

/// The chromaticAdaptationTag (ICC.1:2010, 9.2.15): an s15Fixed16ArrayType
/// (10.20) of nine numbers. An adaptation between real illuminants has
/// coefficients near the identity's; each within ±XYZ_LIMIT.
fn adaptation_matrix(tag: Tag) -> Result<(), TagError> {
    tag.require_type(*b"sf32", "s15Fixed16ArrayType", "ICC.1:2010, 9.2.15")?;
    tag.need("a 3 × 3 matrix", 8 + 36)?;
    for i in 0..9 {
        let v = s15f16(tag.data, 8 + 4 * i);
        if v.abs() > XYZ_LIMIT {
            return Err(TagError::Implausible {
                tag: tag.sig,
                what: format!("coefficient {} of row {}", i % 3 + 1, i / 3 + 1),
                value: v,
                lo: -XYZ_LIMIT,
                hi: XYZ_LIMIT,
            });
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A CMYK → Lab output profile holding one tag, `body`, as A2B0.
    fn profile_with_a2b0(body: &[u8]) -> Vec<u8> {
        let mut b = vec![0u8; 144];
        b[12..16].copy_from_slice(b"prtr");
        b[16..20].copy_from_slice(b"CMYK");
        b[20..24].copy_from_slice(b"Lab ");
        b[36..40].copy_from_slice(b"acsp");
        b[128..132].copy_from_slice(&1u32.to_be_bytes());
        b[132..136].copy_from_slice(b"A2B0");
        b[136..140].copy_from_slice(&144u32.to_be_bytes());
        b[140..144].copy_from_slice(&(body.len() as u32).to_be_bytes());
        b.extend_from_slice(body);
        let len = b.len() as u32;
        b[0..4].copy_from_slice(&len.to_be_bytes());
        b
    }

    /// A lut16Type body (ICC.1:2010, 10.8) with `n`-entry tables, zeros.
    fn lut16(inputs: u8, outputs: u8, points: u8, n: u16) -> Vec<u8> {
        let mut t = vec![0u8; 52];
        t[0..4].copy_from_slice(b"mft2");
        t[8] = inputs;
        t[9] = outputs;
        t[10] = points;
        t[48..50].copy_from_slice(&n.to_be_bytes());
        t[50..52].copy_from_slice(&n.to_be_bytes());
        let clut = u64::from(points).pow(u32::from(inputs)) * u64::from(outputs);
        let len = 2 * (u64::from(inputs) * u64::from(n) + clut + u64::from(outputs) * u64::from(n));
        t.resize(52 + len as usize, 0);
        t
    }

    fn check(body: &[u8]) -> Result<(), TagError> {
        let b = profile_with_a2b0(body);
        validate(&Header::parse(&b).unwrap(), &b)
    }

    #[test]
    fn channels_follow_the_colour_space_signatures() {
        // ICC.1:2010, table 19.
        let n = |s: &[u8; 4]| channels_of(Signature(*s));
        assert_eq!(n(b"GRAY"), Some(1));
        assert_eq!(n(b"RGB "), Some(3));
        assert_eq!(n(b"CMYK"), Some(4));
        assert_eq!(n(b"2CLR"), Some(2));
        assert_eq!(n(b"9CLR"), Some(9));
        assert_eq!(n(b"ACLR"), Some(10));
        assert_eq!(n(b"FCLR"), Some(15));
        assert_eq!(n(b"GCLR"), None);
        assert_eq!(n(b"\0\0\0\0"), None);
    }

    #[test]
    fn lut16_that_fits_exactly_passes_and_one_byte_less_does_not() {
        let t = lut16(4, 3, 2, 2);
        assert_eq!(check(&t), Ok(()));
        let short = &t[..t.len() - 1];
        assert!(matches!(check(short), Err(TagError::OutOfTag { ref part, .. }) if part == "the output tables"));
    }

    #[test]
    fn lut16_counts_are_checked() {
        assert!(matches!(
            check(&lut16(3, 3, 2, 2)),
            Err(TagError::Channels {
                found: 3,
                expected: 4,
                ..
            })
        ));
        assert!(matches!(
            check(&lut16(4, 4, 2, 2)),
            Err(TagError::Channels {
                found: 4,
                expected: 3,
                ..
            })
        ));
        assert!(matches!(
            check(&lut16(4, 3, 1, 2)),
            Err(TagError::GridPoints { points: 1, .. })
        ));
        assert!(matches!(check(&lut16(4, 3, 2, 1)), Err(TagError::Structure { .. })));
        // 255⁴ × 3 values is over the cap; the header alone is enough to say so.
        let mut t = lut16(4, 3, 2, 2);
        t[10] = 255;
        assert!(matches!(check(&t), Err(TagError::ClutTooLarge { ref grid, .. }) if grid == "255^4"));
    }

    #[test]
    fn clut_value_count_cannot_overflow() {
        let tag = Tag {
            sig: Signature(*b"A2B0"),
            data: &[],
        };
        // 255^15 × 15 is far beyond u64; checked multiplication reports it.
        assert!(matches!(
            clut_values(tag, &[255; 15], 15),
            Err(TagError::ClutTooLarge { .. })
        ));
        assert_eq!(clut_values(tag, &[17; 4], 3), Ok(17u64.pow(4) * 3));
    }

    #[test]
    fn lut_ab_combinations_follow_the_clauses() {
        // lutAToB with only B curves needs as many inputs as outputs
        // (ICC.1:2010, 10.10): 4 → 3 without a CLUT cannot be.
        let mut t = vec![0u8; 32 + 3 * 12];
        t[0..4].copy_from_slice(b"mAB ");
        t[8] = 4;
        t[9] = 3;
        t[12..16].copy_from_slice(&32u32.to_be_bytes());
        for i in 0..3 {
            t[32 + 12 * i..36 + 12 * i].copy_from_slice(b"curv");
        }
        assert!(matches!(check(&t), Err(TagError::Structure { .. })));
        // A CLUT without A curves is not a permitted combination either.
        t[24..28].copy_from_slice(&32u32.to_be_bytes());
        assert!(matches!(check(&t), Err(TagError::Structure { .. })));
    }

    #[test]
    fn colorants_outside_the_plausible_range_are_refused() {
        let xyz = |x: i32| {
            let mut t = vec![0u8; 20];
            t[0..4].copy_from_slice(b"XYZ ");
            for i in 0..3 {
                t[8 + 4 * i..12 + 4 * i].copy_from_slice(&x.to_be_bytes());
            }
            t
        };
        fn tag(data: &[u8]) -> Tag<'_> {
            Tag {
                sig: Signature(*b"rXYZ"),
                data,
            }
        }
        // s15Fixed16: 0x10000 is 1.0 (ICC.1:2010, 4.6).
        assert_eq!(super::xyz(tag(&xyz(0x10000)), -XYZ_LIMIT), Ok(()));
        assert_eq!(super::xyz(tag(&xyz(-0x10000)), -XYZ_LIMIT), Ok(()));
        assert!(super::xyz(tag(&xyz(6 << 16)), -XYZ_LIMIT).is_err());
        // A white must be positive.
        assert!(super::xyz(tag(&xyz(0)), 0.0).is_err());
    }
}
