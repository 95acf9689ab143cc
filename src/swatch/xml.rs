//! What the XML readers of artwork and map styles share: the parser's
//! options and bounds, and a depth guard the parser needs in front of it.

use super::{line_at, PaletteError};

/// Most XML nodes read from one file (a large map export has some hundred
/// thousand).
pub const MAX_XML_NODES: u32 = 2_000_000;

/// Deepest element nesting read (map exports and styles nest a few dozen
/// deep). The XML parser recurses once per level, so a file nested hundreds
/// of thousands deep would overflow the stack inside it; so would the SVG
/// reader's own walk of the tree.
pub const MAX_XML_DEPTH: usize = 512;

/// The XML document of `text`, without a DTD (no entity expansion), within
/// [`MAX_XML_NODES`] and [`MAX_XML_DEPTH`]; `what` names the kind of file in
/// the error ("an SVG file").
pub(crate) fn document<'i>(file: &str, text: &'i str, what: &str) -> Result<roxmltree::Document<'i>, PaletteError> {
    if let Some(pos) = too_deep(text, MAX_XML_DEPTH) {
        return Err(PaletteError::Syntax {
            file: file.to_string(),
            line: line_at(text.as_bytes(), pos),
            message: format!("elements nested deeper than {MAX_XML_DEPTH}; not {what} inkfit reads"),
        });
    }
    let opts = roxmltree::ParsingOptions {
        allow_dtd: false,
        nodes_limit: MAX_XML_NODES,
    };
    roxmltree::Document::parse_with_options(text, opts).map_err(|e| PaletteError::Syntax {
        file: file.to_string(),
        line: e.pos().row as usize,
        message: format!("not {what} inkfit reads: {e}"),
    })
}

/// Where the element nesting of XML text first goes deeper than `limit`,
/// if it does: a scan of the tags alone (XML 1.0, 2.5, 2.7, 2.8, 3.1:
/// comments, CDATA sections, processing instructions and declarations are
/// skipped; a `>` inside a quoted attribute value does not end a tag; `/>`
/// closes its own tag). A guard only: the XML parser checks everything
/// else.
fn too_deep(text: &str, limit: usize) -> Option<usize> {
    let b = text.as_bytes();
    let find = |from: usize, pat: &[u8]| {
        b[from.min(b.len())..]
            .windows(pat.len())
            .position(|w| w == pat)
            .map_or(b.len(), |p| from + p + pat.len())
    };
    let mut depth = 0usize;
    let mut i = 0;
    while i < b.len() {
        if b[i] != b'<' {
            i += 1;
            continue;
        }
        let rest = &b[i..];
        if rest.starts_with(b"<!--") {
            i = find(i + 4, b"-->");
        } else if rest.starts_with(b"<![CDATA[") {
            i = find(i + 9, b"]]>");
        } else if rest.starts_with(b"<?") {
            i = find(i + 2, b"?>");
        } else if rest.starts_with(b"<!") || rest.starts_with(b"</") {
            if rest.starts_with(b"</") {
                depth = depth.saturating_sub(1);
            }
            i = find(i + 2, b">");
        } else {
            let start = i;
            let mut quote = None;
            let mut j = i + 1;
            while j < b.len() {
                match (quote, b[j]) {
                    (None, q @ (b'"' | b'\'')) => quote = Some(q),
                    (Some(q), c) if c == q => quote = None,
                    (None, b'>') => break,
                    _ => {}
                }
                j += 1;
            }
            if j < b.len() && b[j - 1] != b'/' {
                depth += 1;
                if depth > limit {
                    return Some(start);
                }
            }
            i = j + 1;
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn nesting_is_measured_from_the_tags() {
        // Self-closing tags, end tags, comments, CDATA, processing
        // instructions and quoted '>' do not deepen (XML 1.0, 2.5–3.1).
        let t = "<?xml version='1.0'?><a><!-- <b><b> --><b x='>' y=\"/>\"/><![CDATA[<c><c>]]><c><d/></c></a>";
        assert_eq!(too_deep(t, 2), None);
        assert_eq!(too_deep(t, 1), Some(t.find("<c>").unwrap() + "<c><c>]]>".len()));
        assert_eq!(too_deep(&"<g>".repeat(10), 9), Some(27));
    }
}
