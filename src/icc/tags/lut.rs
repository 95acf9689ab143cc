//! The lookup-table tag types: lut8 and lut16 (10.8, 10.9), lutAToB and
//! lutBToA (10.10, 10.11) with their curves and CLUT, and the header of
//! multiProcessElements (10.14). Sizes and counts only, checked arithmetic.

use super::*;

/// Grid nodes × outputs of a CLUT with `points` per input, with checked
/// arithmetic and the [`MAX_CLUT_VALUES`] cap.
pub(super) fn clut_values(tag: Tag, points: &[u8], outputs: usize) -> Result<u64, TagError> {
    let too_large = || {
        let grid = if points.windows(2).all(|w| w[0] == w[1]) {
            format!("{}^{}", points[0], points.len())
        } else {
            points.iter().map(u8::to_string).collect::<Vec<_>>().join("×")
        };
        TagError::ClutTooLarge {
            tag: tag.sig,
            grid,
            outputs,
            limit: MAX_CLUT_VALUES,
        }
    };
    let mut values = outputs as u64;
    for &p in points {
        values = values.checked_mul(u64::from(p)).ok_or_else(too_large)?;
    }
    if values > MAX_CLUT_VALUES {
        return Err(too_large());
    }
    Ok(values)
}

/// lut8Type (ICC.1:2010, 10.9) and lut16Type (10.8): channels, grid points
/// and table entries, and a size that holds every table.
pub(super) fn lut8_or_16(tag: Tag, header: &Header, flow: Flow, wide: bool) -> Result<(), TagError> {
    let kind = if wide { "a lut16 table" } else { "a lut8 table" };
    let clause = if wide { "ICC.1:2010, 10.8" } else { "ICC.1:2010, 10.9" };
    // Bytes 8, 9, 10: input channels, output channels, grid points; 12..48
    // the 3 × 3 matrix; lut16 adds the entry counts at 48 and 50.
    tag.need(kind, if wide { 52 } else { 48 })?;
    let d = tag.data;
    let (inputs, outputs, points) = (usize::from(d[8]), usize::from(d[9]), d[10]);
    check_channels(tag, header, flow, (inputs, outputs))?;
    if points < 2 {
        return Err(TagError::GridPoints {
            tag: tag.sig,
            along: "every input".to_string(),
            points,
            clause,
        });
    }
    let values = clut_values(tag, &vec![points; inputs], outputs)?;
    let (n, m, unit, head) = if wide {
        let (n, m) = (u64::from(be_u16(d, 48)), u64::from(be_u16(d, 50)));
        // ICC.1:2010, 10.8: each table has 2 to 4096 entries.
        for (which, e) in [("input", n), ("output", m)] {
            if !(2..=4096).contains(&e) {
                return Err(tag.structure(format!(
                    "the lut16 {which} tables have {e} entries; 2 to 4096 are allowed ({clause})"
                )));
            }
        }
        (n, m, 2, 52)
    } else {
        // ICC.1:2010, 10.9: 256 entries of one byte per table.
        (256, 256, 1, 48)
    };
    // Input tables, CLUT, output tables, in that order. Each term is at most
    // 15·4096·2 or MAX_CLUT_VALUES·2, so the sums cannot overflow.
    let input_tables = inputs as u64 * n * unit;
    let clut = values * unit;
    let output_tables = outputs as u64 * m * unit;
    let mut at = head;
    for (part, len) in [
        ("the input tables", input_tables),
        ("the CLUT", clut),
        ("the output tables", output_tables),
    ] {
        tag.part(part, at, len)?;
        at += len;
    }
    Ok(())
}

/// lutAToBType (ICC.1:2010, 10.10) and lutBToAType (10.11): channels, the
/// combination of elements the clauses permit, and each element inside
/// the tag.
pub(super) fn lut_ab(tag: Tag, header: &Header, flow: Flow, a_to_b: bool) -> Result<(), TagError> {
    let name = if a_to_b { "lutAToB" } else { "lutBToA" };
    tag.need(if a_to_b { "a lutAToB table" } else { "a lutBToA table" }, 32)?;
    let d = tag.data;
    let (inputs, outputs) = (usize::from(d[8]), usize::from(d[9]));
    check_channels(tag, header, flow, (inputs, outputs))?;
    // Offsets from the start of the tag at 12 (B curves), 16 (matrix),
    // 20 (M curves), 24 (CLUT), 28 (A curves); 0 means absent.
    let off = |at: usize| u64::from(be_u32(d, at));
    let (b, matrix, m, clut, a) = (off(12), off(16), off(20), off(24), off(28));
    for (part, o) in [
        ("the B curves", b),
        ("the matrix", matrix),
        ("the M curves", m),
        ("the CLUT", clut),
        ("the A curves", a),
    ] {
        if o != 0 && (o < 32 || o >= d.len() as u64) {
            return Err(TagError::OutOfTag {
                tag: tag.sig,
                part: format!("{part} (offset {o})"),
                start: o,
                end: o,
                size: d.len(),
            });
        }
    }
    // ICC.1:2010, 10.10 and 10.11: B alone; M, matrix, B; A, CLUT, B; or
    // all five. B is always present, A comes with the CLUT and M with the
    // matrix.
    if b == 0 || (a == 0) != (clut == 0) || (m == 0) != (matrix == 0) {
        return Err(tag.structure(format!(
            "its elements (A {}, CLUT {}, M {}, matrix {}, B {}) are not a combination {name} permits (ICC.1:2010, {})",
            present(a),
            present(clut),
            present(m),
            present(matrix),
            present(b),
            if a_to_b { "10.10" } else { "10.11" }
        )));
    }
    // Without a CLUT nothing changes the number of channels; the matrix is
    // 3 × 3.
    if clut == 0 && inputs != outputs {
        return Err(tag.structure(format!(
            "without a CLUT a {name} table cannot turn {inputs} channels into {outputs}"
        )));
    }
    // The matrix acts on the output side in lutAToB, on the input side in lutBToA.
    let matrix_channels = if a_to_b { outputs } else { inputs };
    if matrix != 0 && matrix_channels != 3 {
        return Err(tag.structure(format!("its 3 × 3 matrix acts on {matrix_channels} channels")));
    }
    if clut != 0 {
        clut_element(tag, clut, inputs, outputs)?;
    }
    if matrix != 0 {
        // Nine s15Fixed16 coefficients and three offsets.
        tag.part("the matrix", matrix, 48)?;
    }
    let (a_count, b_count) = if a_to_b { (inputs, outputs) } else { (outputs, inputs) };
    let m_count = b_count;
    for (part, o, n) in [
        ("the A curves", a, a_count),
        ("the M curves", m, m_count),
        ("the B curves", b, b_count),
    ] {
        if o != 0 {
            curve_set(tag, o, n, part)?;
        }
    }
    Ok(())
}

pub(super) fn present(offset: u64) -> &'static str {
    if offset == 0 {
        "absent"
    } else {
        "present"
    }
}

/// The CLUT of a lutAToB/lutBToA table (ICC.1:2010, 10.10.4 and 10.11.4,
/// from memory): 16 bytes of grid points (the first `inputs` used),
/// precision (1 or 2 bytes), 3 reserved bytes, then the values.
pub(super) fn clut_element(tag: Tag, at: u64, inputs: usize, outputs: usize) -> Result<(), TagError> {
    let head = tag.part("the CLUT header", at, 20)?;
    let points = &head[..inputs.min(16)];
    for (i, &p) in points.iter().enumerate() {
        if p < 2 {
            return Err(TagError::GridPoints {
                tag: tag.sig,
                along: format!("input {}", i + 1),
                points: p,
                clause: "ICC.1:2010, 10.10",
            });
        }
    }
    let precision = head[16];
    if precision != 1 && precision != 2 {
        return Err(tag.structure(format!(
            "the CLUT's precision is {precision} bytes; 1 or 2 are allowed (ICC.1:2010, 10.10)"
        )));
    }
    let values = clut_values(tag, points, outputs)?;
    tag.part("the CLUT values", at + 20, values * u64::from(precision))?;
    Ok(())
}

/// `count` curves from `at`, each curveType or parametricCurveType and each
/// starting on a 4-byte boundary (ICC.1:2010, 10.10: "padded to a 4-byte
/// boundary").
pub(super) fn curve_set(tag: Tag, at: u64, count: usize, part: &str) -> Result<(), TagError> {
    let mut pos = at;
    for i in 0..count {
        let len = curve(tag, pos, &format!("curve {} of {part}", i + 1))?;
        pos = (pos + len).next_multiple_of(4);
    }
    Ok(())
}

/// A curveType (ICC.1:2010, 10.5) or parametricCurveType (10.16) element at
/// byte `at` of the tag; returns its length in bytes.
pub(super) fn curve(tag: Tag, at: u64, part: &str) -> Result<u64, TagError> {
    let head = tag.part(part.to_string(), at, 12)?;
    match &head[0..4] {
        b"curv" => {
            // A u32 count of u16 entries (0: identity, 1: a gamma).
            let count = u64::from(be_u32(head, 8));
            let len = 12 + 2 * count;
            tag.part(format!("{part} ({count} entries)"), at, len)?;
            Ok(len)
        }
        b"para" => {
            // Function type 0 to 4 with 1, 3, 4, 5 or 7 s15Fixed16 parameters.
            let function = be_u16(head, 8);
            let params = match function {
                0 => 1,
                1 => 3,
                2 => 4,
                3 => 5,
                4 => 7,
                _ => {
                    return Err(tag.structure(format!(
                    "{part} is a parametric curve of function type {function}; types 0 to 4 exist (ICC.1:2010, 10.16)"
                )))
                }
            };
            let len = 12 + 4 * params;
            tag.part(format!("{part} (function type {function})"), at, len)?;
            Ok(len)
        }
        other => Err(TagError::WrongType {
            tag: tag.sig,
            found: Signature([other[0], other[1], other[2], other[3]]),
            allowed: "curveType or parametricCurveType",
            clause: "ICC.1:2010, 10.5 and 10.16",
        }),
    }
}

/// The multiProcessElementsType header (ICC.1:2010, 10.14): channels, and
/// a position table whose elements lie inside the tag, chained channel to
/// channel. The elements' own contents are lcms2's to decode, except the
/// size of a CLUT element, which is checked like any other CLUT.
pub(super) fn multi_process(tag: Tag, header: &Header, flow: Flow) -> Result<(), TagError> {
    // ICC.1:2010, 9.2.9–9.2.12 and 9.2.24–9.2.27 (BToDn, DToBn):
    // multiProcessElementsType.
    tag.require_type(*b"mpet", "multiProcessElements", "ICC.1:2010, 9.2.24")?;
    tag.need("a multiProcessElements table", 16)?;
    let d = tag.data;
    let (inputs, outputs) = (usize::from(be_u16(d, 8)), usize::from(be_u16(d, 10)));
    check_channels(tag, header, flow, (inputs, outputs))?;
    let count = u64::from(be_u32(d, 12));
    if count == 0 {
        return Err(tag.structure("it has no processing elements (ICC.1:2010, 10.14)"));
    }
    let table = tag.part("the position table", 16, count * 8)?;
    let mut channels = inputs;
    for (i, pos) in table.chunks_exact(8).enumerate() {
        let (offset, size) = (u64::from(be_u32(pos, 0)), u64::from(be_u32(pos, 4)));
        let part = format!("element {}", i + 1);
        let element = tag.part(part.clone(), offset, size)?;
        if element.len() < 12 {
            return Err(tag.structure(format!("{part} is {} bytes, too short for its header", element.len())));
        }
        let (e_in, e_out) = (usize::from(be_u16(element, 8)), usize::from(be_u16(element, 10)));
        if e_in != channels {
            return Err(tag.structure(format!("{part} takes {e_in} channels but receives {channels}")));
        }
        if &element[0..4] == b"clut" {
            // 16 grid-point bytes after the header, then float32 values.
            let sub = Tag {
                sig: tag.sig,
                data: element,
            };
            let head = sub.part(format!("the grid points of {part}"), 12, 16)?;
            let points = &head[..e_in.min(16)];
            if let Some(i) = points.iter().position(|&p| p < 2) {
                return Err(TagError::GridPoints {
                    tag: tag.sig,
                    along: format!("input {}", i + 1),
                    points: points[i],
                    clause: "ICC.1:2010, 10.14",
                });
            }
            let values = clut_values(tag, points, e_out)?;
            sub.part(format!("the CLUT values of {part}"), 28, values * 4)?;
        }
        channels = e_out;
    }
    if channels != outputs {
        return Err(tag.structure(format!(
            "its last element gives {channels} channels, not the {outputs} the table declares"
        )));
    }
    Ok(())
}
