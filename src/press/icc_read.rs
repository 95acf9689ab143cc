//! Reads back the parts of an ICC profile that inkfit writes: the tag table
//! and the 16-bit CLUT of a lutAToBType / lutBToAType tag (ICC.1:2010, 7.3
//! and 10.10 / 10.11), for checks and reports on the built-in profiles.

use super::PressError;

/// One entry of the tag table (ICC.1:2010 7.3): signature, offset from
/// the start of the profile, size in bytes.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct TagEntry {
    pub signature: [u8; 4],
    pub offset: u32,
    pub size: u32,
}

/// A multidimensional table as stored in a lutAToB / lutBToA tag.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ClutTable {
    /// Grid points per input channel.
    pub grid: Vec<u8>,
    pub outputs: usize,
    /// Entries as stored: first input varies slowest, `outputs` values per
    /// node, normalised to 16-bit codes (8-bit tables are scaled by 257).
    pub values: Vec<u16>,
}

fn be32(b: &[u8], at: usize) -> Result<u32, PressError> {
    b.get(at..at + 4)
        .map(|s| u32::from_be_bytes([s[0], s[1], s[2], s[3]]))
        .ok_or_else(|| PressError::Verify(format!("truncated at byte {at}")))
}

/// The tag table of a profile.
pub fn read_tag_table(bytes: &[u8]) -> Result<Vec<TagEntry>, PressError> {
    let count = be32(bytes, 128)? as usize;
    if count > 1000 {
        return Err(PressError::Verify("implausible tag count".into()));
    }
    (0..count)
        .map(|i| {
            let at = 132 + 12 * i;
            let sig = be32(bytes, at)?.to_be_bytes();
            let offset = be32(bytes, at + 4)?;
            let size = be32(bytes, at + 8)?;
            if (offset as usize).saturating_add(size as usize) > bytes.len() {
                return Err(PressError::Verify("tag outside the profile".into()));
            }
            Ok(TagEntry {
                signature: sig,
                offset,
                size,
            })
        })
        .collect()
}

/// The CLUT of the lutAToBType or lutBToAType tag `signature`.
pub fn read_clut(bytes: &[u8], signature: &[u8; 4]) -> Result<ClutTable, PressError> {
    let tags = read_tag_table(bytes)?;
    let tag = tags
        .iter()
        .find(|t| &t.signature == signature)
        .ok_or_else(|| PressError::Verify(format!("no tag {}", String::from_utf8_lossy(signature))))?;
    let start = tag.offset as usize;
    let data = &bytes[start..start + tag.size as usize];
    let kind = data.get(0..4).ok_or_else(|| PressError::Verify("empty tag".into()))?;
    if kind != b"mAB " && kind != b"mBA " {
        return Err(PressError::Verify("tag is not lutAToB / lutBToA".into()));
    }
    let inputs = *data.get(8).ok_or_else(|| PressError::Verify("short tag".into()))? as usize;
    let outputs = *data.get(9).ok_or_else(|| PressError::Verify("short tag".into()))? as usize;
    let clut_at = be32(data, 24)? as usize;
    if clut_at == 0 || inputs == 0 || inputs > 15 || outputs == 0 {
        return Err(PressError::Verify("tag has no CLUT".into()));
    }
    let grid: Vec<u8> = data
        .get(clut_at..clut_at + inputs)
        .ok_or_else(|| PressError::Verify("short CLUT header".into()))?
        .to_vec();
    let precision = *data
        .get(clut_at + 16)
        .ok_or_else(|| PressError::Verify("short CLUT header".into()))?;
    let nodes: usize = grid.iter().map(|g| *g as usize).product();
    let count = nodes * outputs;
    let body = clut_at + 20;
    let values = match precision {
        2 => data
            .get(body..body + 2 * count)
            .ok_or_else(|| PressError::Verify("short CLUT".into()))?
            .chunks_exact(2)
            .map(|c| u16::from_be_bytes([c[0], c[1]]))
            .collect(),
        1 => data
            .get(body..body + count)
            .ok_or_else(|| PressError::Verify("short CLUT".into()))?
            .iter()
            .map(|v| *v as u16 * 257)
            .collect(),
        _ => return Err(PressError::Verify("CLUT precision not 1 or 2".into())),
    };
    Ok(ClutTable { grid, outputs, values })
}
