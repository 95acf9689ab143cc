//! A small deterministic SVG writer: elements with attributes in the order
//! given, text escaped, numbers at a fixed precision.

use std::fmt::Write as _;

/// Decimals of every coordinate written (0.1 px).
pub const DECIMALS: usize = 1;

/// A number at the fixed precision, without a negative zero.
pub fn num(v: f64) -> String {
    let s = format!("{v:.DECIMALS$}");
    if s.trim_start_matches('-').chars().all(|c| c == '0' || c == '.') {
        s.trim_start_matches('-').to_string()
    } else {
        s
    }
}

/// Escapes text for element content and attribute values.
pub fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            c if (c as u32) < 0x20 && c != '\n' && c != '\t' => {}
            c => out.push(c),
        }
    }
    out
}

/// Path data "M x y L x y …" for a polyline, closed with "Z" when asked.
pub fn path_data(points: &[[f64; 2]], close: bool) -> String {
    let mut d = String::new();
    for (k, p) in points.iter().enumerate() {
        if k > 0 {
            d.push(' ');
        }
        let _ = write!(d, "{}{} {}", if k == 0 { 'M' } else { 'L' }, num(p[0]), num(p[1]));
    }
    if close && !points.is_empty() {
        d.push_str(" Z");
    }
    d
}

/// An SVG document being written into a string, one element per line.
#[derive(Debug, Default)]
pub struct Svg {
    out: String,
    depth: usize,
    open: Vec<&'static str>,
}

fn attrs(out: &mut String, a: &[(&str, String)]) {
    for (k, v) in a {
        let _ = write!(out, " {k}=\"{}\"", escape(v));
    }
}

impl Svg {
    /// Starts a document of `width` × `height` px.
    pub fn new(width: f64, height: f64) -> Svg {
        let mut s = Svg::default();
        s.out.push_str("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
        s.open(
            "svg",
            &[
                ("xmlns", "http://www.w3.org/2000/svg".into()),
                ("width", num(width)),
                ("height", num(height)),
                ("viewBox", format!("0 0 {} {}", num(width), num(height))),
                ("font-family", "sans-serif".into()),
            ],
        );
        s
    }

    fn indent(&mut self) {
        for _ in 0..self.depth {
            self.out.push_str("  ");
        }
    }

    /// Opens an element that will hold others.
    pub fn open(&mut self, tag: &'static str, a: &[(&str, String)]) {
        self.indent();
        let _ = write!(self.out, "<{tag}");
        attrs(&mut self.out, a);
        self.out.push_str(">\n");
        self.depth += 1;
        self.open.push(tag);
    }

    /// Closes the innermost open element.
    pub fn close(&mut self) {
        if let Some(tag) = self.open.pop() {
            self.depth -= 1;
            self.indent();
            let _ = writeln!(self.out, "</{tag}>");
        }
    }

    /// An element without content.
    pub fn empty(&mut self, tag: &str, a: &[(&str, String)]) {
        self.indent();
        let _ = write!(self.out, "<{tag}");
        attrs(&mut self.out, a);
        self.out.push_str("/>\n");
    }

    /// An element holding text.
    pub fn text(&mut self, tag: &str, a: &[(&str, String)], content: &str) {
        self.indent();
        let _ = write!(self.out, "<{tag}");
        attrs(&mut self.out, a);
        let _ = writeln!(self.out, ">{}</{tag}>", escape(content));
    }

    /// Closes everything still open and returns the document.
    pub fn finish(mut self) -> String {
        while !self.open.is_empty() {
            self.close();
        }
        self.out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_have_fixed_precision_and_no_negative_zero() {
        assert_eq!(num(1.26), "1.3");
        assert_eq!(num(-0.04), "0.0");
        assert_eq!(num(-3.06), "-3.1");
        assert_eq!(num(12.0), "12.0");
    }

    #[test]
    fn text_and_attributes_are_escaped() {
        let mut s = Svg::new(10.0, 10.0);
        s.text("text", &[("data-name", "a\"b".into())], "x < y & z");
        let doc = s.finish();
        assert!(doc.contains("data-name=\"a&quot;b\""), "{doc}");
        assert!(doc.contains(">x &lt; y &amp; z</text>"), "{doc}");
        assert!(doc.trim_end().ends_with("</svg>"));
    }
}
