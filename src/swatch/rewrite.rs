//! Writing a palette back in the shape of the file it came from: every
//! column, key, comment and line of the original stays; only each entry's
//! colour value changes, and new data (the press CMYK) goes in a column, key
//! or trailing comment of its own.
//!
//! - CSV: the header and every record keep their fields and order; the
//!   colour field is replaced where the colour changed, and a `press_cmyk`
//!   column is added (or refilled when the file has one). Line endings
//!   follow the input's.
//! - JSON: each object keeps its keys in their order; `color` (or `colour`)
//!   is replaced and a `press_cmyk` key added or refilled.
//! - Text: each line stays as written (comments, blank lines, names); the
//!   colour text is replaced in place and a trailing `# press device-cmyk(…)`
//!   comment added or refilled. A first line saying what the file was
//!   repaired for is added or refilled.

use std::io::{self, Write};

use super::{colour_columns, palette_color, sniff_delimiter, ColourColumns, Format};
use crate::color::css::ColorInput;

/// One entry's new data, in file order.
#[derive(Clone, Debug, PartialEq)]
pub struct Rewrite {
    /// The new colour text, `None` when the colour stays as written.
    pub color: Option<String>,
    /// Press CMYK in percent.
    pub press_cmyk: [f64; 4],
}

/// The name of the added column or key.
pub const CMYK_FIELD: &str = "press_cmyk";

/// `device-cmyk(…)` with one decimal, as the palette parser reads it back.
pub fn cmyk_css(c: [f64; 4]) -> String {
    format!("device-cmyk({:.1}% {:.1}% {:.1}% {:.1}%)", c[0], c[1], c[2], c[3])
}

/// Writes `text` (a palette in `format` that parsed into exactly
/// `rewrites.len()` entries) with each entry's colour and press CMYK
/// replaced. `heading` is the first comment line of a text palette.
pub fn rewrite(w: &mut dyn Write, format: Format, text: &str, rewrites: &[Rewrite], heading: &str) -> io::Result<()> {
    // A byte order mark stays where it was, before everything else.
    let text = match text.strip_prefix('\u{feff}') {
        Some(rest) => {
            w.write_all("\u{feff}".as_bytes())?;
            rest
        }
        None => text,
    };
    match format {
        Format::Csv => rewrite_csv(w, text, rewrites),
        Format::Json => rewrite_json(w, text, rewrites),
        Format::Text => rewrite_text(w, text, rewrites, heading),
        Format::Svg | Format::Sld | Format::MapImage | Format::Jpeg => {
            Err(invalid("artwork, map styles and map images are not written back"))
        }
    }
}

fn invalid(msg: &str) -> io::Error {
    io::Error::new(io::ErrorKind::InvalidData, msg.to_string())
}

fn rewrite_csv(w: &mut dyn Write, text: &str, rewrites: &[Rewrite]) -> io::Result<()> {
    let crlf = text.contains("\r\n");
    let delimiter = sniff_delimiter(text);
    let mut reader = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .comment(None)
        .delimiter(delimiter)
        .from_reader(text.as_bytes());
    let mut records = reader.records();
    let header = match records.next() {
        Some(r) => r.map_err(io::Error::other)?,
        None => return Err(invalid("the palette has no header row")),
    };
    let clean = |h: &str| h.trim().trim_start_matches('\u{feff}').to_ascii_lowercase();
    let find = |names: &[&str]| header.iter().position(|h| names.iter().any(|n| clean(h) == *n));
    let columns = colour_columns(header.iter()).ok_or_else(|| invalid("no colour column in the header"))?;
    let mut header_out: Vec<String> = header.iter().map(str::to_string).collect();
    let cmyk_col = match find(&[CMYK_FIELD]) {
        Some(c) => c,
        None => {
            header_out.push(CMYK_FIELD.to_string());
            header_out.len() - 1
        }
    };
    let mut out = csv::WriterBuilder::new()
        .flexible(true)
        .delimiter(delimiter)
        .terminator(if crlf {
            csv::Terminator::CRLF
        } else {
            csv::Terminator::Any(b'\n')
        })
        .from_writer(w);
    out.write_record(&header_out)?;
    let mut next = rewrites.iter();
    for record in records {
        let record = record.map_err(io::Error::other)?;
        // The parser skips records whose fields are all empty; so does this.
        if record.iter().all(|f| f.trim().is_empty()) {
            continue;
        }
        let rw = next
            .next()
            .ok_or_else(|| invalid("the palette has more entries than were repaired"))?;
        let mut fields: Vec<String> = record.iter().map(str::to_string).collect();
        if fields.len() <= cmyk_col {
            fields.resize(cmyk_col + 1, String::new());
        }
        if let Some(c) = &rw.color {
            match columns {
                ColourColumns::Text(col) => fields[col] = c.clone(),
                ColourColumns::Rgb(cols) => {
                    let Ok(ColorInput::ScreenRgb(v)) = palette_color(c) else {
                        return Err(invalid("a repaired colour is not screen RGB"));
                    };
                    for (col, x) in cols.iter().zip(v) {
                        fields[*col] = format!("{}", (x * 255.0).round().clamp(0.0, 255.0) as u8);
                    }
                }
                ColourColumns::Cmyk(_) => {
                    return Err(invalid(
                        "a repaired screen colour cannot be written into C, M, Y, K columns",
                    ))
                }
            }
        }
        fields[cmyk_col] = cmyk_css(rw.press_cmyk);
        out.write_record(&fields)?;
    }
    if next.next().is_some() {
        return Err(invalid("the palette has fewer entries than were repaired"));
    }
    out.flush()
}

/// A JSON object with its keys in file order.
struct Ordered(Vec<(String, serde_json::Value)>);

impl<'de> serde::Deserialize<'de> for Ordered {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl<'de> serde::de::Visitor<'de> for V {
            type Value = Ordered;
            fn expecting(&self, f: &mut std::fmt::Formatter) -> std::fmt::Result {
                f.write_str("an object")
            }
            fn visit_map<A: serde::de::MapAccess<'de>>(self, mut m: A) -> Result<Ordered, A::Error> {
                let mut v = Vec::new();
                while let Some(kv) = m.next_entry()? {
                    v.push(kv);
                }
                Ok(Ordered(v))
            }
        }
        d.deserialize_map(V)
    }
}

impl serde::Serialize for Ordered {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        use serde::ser::SerializeMap;
        let mut m = s.serialize_map(Some(self.0.len()))?;
        for (k, v) in &self.0 {
            m.serialize_entry(k, v)?;
        }
        m.end()
    }
}

fn rewrite_json(w: &mut dyn Write, text: &str, rewrites: &[Rewrite]) -> io::Result<()> {
    let mut items: Vec<Ordered> = serde_json::from_str(text).map_err(io::Error::other)?;
    if items.len() != rewrites.len() {
        return Err(invalid("the palette's entries do not match the repaired ones"));
    }
    for (item, rw) in items.iter_mut().zip(rewrites) {
        if let Some(c) = &rw.color {
            match item.0.iter_mut().find(|(k, _)| k == "color" || k == "colour") {
                Some((_, v)) => *v = serde_json::Value::from(c.as_str()),
                None => return Err(invalid("an entry has no \"color\"")),
            }
        }
        let cmyk = serde_json::Value::from(rw.press_cmyk.to_vec());
        match item.0.iter_mut().find(|(k, _)| k == CMYK_FIELD) {
            Some((_, v)) => *v = cmyk,
            None => item.0.push((CMYK_FIELD.to_string(), cmyk)),
        }
    }
    // One entry a line, as palettes are usually written by hand.
    writeln!(w, "[")?;
    for (k, item) in items.iter().enumerate() {
        w.write_all(b"  ")?;
        let mut ser = serde_json::Serializer::with_formatter(&mut *w, OneLine);
        serde::Serialize::serialize(item, &mut ser)?;
        writeln!(w, "{}", if k + 1 < items.len() { "," } else { "" })?;
    }
    writeln!(w, "]")
}

/// JSON on one line with a space after each `:` and `,` and inside braces:
/// `{ "name": "A", "color": "#fff" }`.
struct OneLine;

impl serde_json::ser::Formatter for OneLine {
    fn begin_object<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        w.write_all(b"{ ")
    }
    fn end_object<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        w.write_all(b" }")
    }
    fn begin_object_key<W: ?Sized + Write>(&mut self, w: &mut W, first: bool) -> io::Result<()> {
        if first {
            Ok(())
        } else {
            w.write_all(b", ")
        }
    }
    fn begin_object_value<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        w.write_all(b": ")
    }
    fn begin_array_value<W: ?Sized + Write>(&mut self, w: &mut W, first: bool) -> io::Result<()> {
        if first {
            Ok(())
        } else {
            w.write_all(b", ")
        }
    }
}

/// The marker of the comment this module adds to a text palette's lines.
const TEXT_MARK: &str = "# press device-cmyk(";
/// The first line this module adds to a text palette.
const HEADING_MARK: &str = "# repaired for press ";

fn rewrite_text(w: &mut dyn Write, text: &str, rewrites: &[Rewrite], heading: &str) -> io::Result<()> {
    // The entries' lines, found the way the parser finds them.
    let lines = super::text_entry_lines(text);
    if lines.len() != rewrites.len() {
        return Err(invalid("the palette's entries do not match the repaired ones"));
    }
    let newline = if text.contains("\r\n") { "\r\n" } else { "\n" };
    let mut raw_lines: Vec<&str> = text.lines().collect();
    let replaces_heading = raw_lines.first().is_some_and(|l| l.starts_with(HEADING_MARK));
    if replaces_heading {
        raw_lines[0] = "";
    }
    write!(w, "{heading}{newline}")?;
    let mut entry = lines.iter().zip(rewrites).peekable();
    for (i, raw) in raw_lines.iter().enumerate() {
        if i == 0 && replaces_heading {
            continue;
        }
        let number = i + 1;
        match entry.peek() {
            Some(((n, input), rw)) if *n == number => {
                write!(w, "{}{newline}", rewrite_line(raw, input, rw))?;
                entry.next();
            }
            _ => write!(w, "{raw}{newline}")?,
        }
    }
    Ok(())
}

/// One entry line with the colour replaced in place and the press comment
/// added or refilled.
fn rewrite_line(raw: &str, input: &str, rw: &Rewrite) -> String {
    let start = raw.len() - raw.trim_start().len();
    let mut line = String::with_capacity(raw.len() + 40);
    line.push_str(&raw[..start]);
    match &rw.color {
        Some(c) => line.push_str(c),
        None => line.push_str(input),
    }
    line.push_str(&raw[start + input.len()..]);
    let comment = format!("{TEXT_MARK}{}", &cmyk_css(rw.press_cmyk)["device-cmyk(".len()..]);
    match line.find(TEXT_MARK) {
        Some(at) => {
            let end = line[at..].find(')').map_or(line.len(), |e| at + e + 1);
            line.replace_range(at..end, &comment);
        }
        None => {
            let body = line.trim_end().len();
            line.truncate(body);
            line.push_str("  ");
            line.push_str(&comment);
        }
    }
    line
}

/// The first line of a repaired text palette.
pub fn text_heading(press: &str, screen: &str) -> String {
    format!("{HEADING_MARK}{press} (screen {screen}); press CMYK in the comments")
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::swatch::Palette;

    fn rw(color: Option<&str>) -> Rewrite {
        Rewrite {
            color: color.map(str::to_string),
            press_cmyk: [1.0, 2.0, 3.0, 4.5],
        }
    }

    fn run(format: Format, text: &str, rewrites: &[Rewrite]) -> String {
        let mut out = Vec::new();
        rewrite(&mut out, format, text, rewrites, &text_heading("P", "S")).unwrap();
        String::from_utf8(out).unwrap()
    }

    #[test]
    fn csv_keeps_columns_order_and_extra_fields() {
        let text = "class,color,note\nWood,#2f6b3a,\"dense, old\"\nWater,#1a8cf0,lakes\n";
        let out = run(Format::Csv, text, &[rw(None), rw(Some("#2080e0"))]);
        assert_eq!(
            out,
            "class,color,note,press_cmyk\n\
             Wood,#2f6b3a,\"dense, old\",device-cmyk(1.0% 2.0% 3.0% 4.5%)\n\
             Water,#2080e0,lakes,device-cmyk(1.0% 2.0% 3.0% 4.5%)\n"
        );
        // Repairing a repaired file refills the column instead of adding one.
        let again = run(Format::Csv, &out, &[rw(None), rw(None)]);
        assert_eq!(again, out);
        let back = Palette::parse("t.csv", &out, Format::Csv).unwrap();
        assert_eq!(back.entries[1].input, "#2080e0");
        assert_eq!(back.entries[0].name, "Wood");
    }

    #[test]
    fn semicolon_csv_with_rgb_channels_stays_in_its_shape() {
        // The delimiter and the R, G, B columns are kept; a BOM stays first.
        let text = "\u{feff}name;R;G;B\nWood;47;107;58\nWater;26;140;240\n";
        let out = run(Format::Csv, text, &[rw(None), rw(Some("#2080e0"))]);
        assert_eq!(
            out,
            "\u{feff}name;R;G;B;press_cmyk\n\
             Wood;47;107;58;device-cmyk(1.0% 2.0% 3.0% 4.5%)\n\
             Water;32;128;224;device-cmyk(1.0% 2.0% 3.0% 4.5%)\n"
        );
        let back = Palette::parse("t.csv", &out, Format::Csv).unwrap();
        assert_eq!(back.entries[1].input, "rgb(32 128 224)");
    }

    #[test]
    fn csv_keeps_crlf_line_endings() {
        let out = run(Format::Csv, "name,color\r\nA,#fff\r\n", &[rw(Some("#eee"))]);
        assert_eq!(
            out,
            "name,color,press_cmyk\r\nA,#eee,device-cmyk(1.0% 2.0% 3.0% 4.5%)\r\n"
        );
    }

    #[test]
    fn json_keeps_keys_in_order() {
        let text = r##"[{"zone": 3, "name": "A", "color": "#fff", "note": "x"}]"##;
        let out = run(Format::Json, text, &[rw(Some("#eee"))]);
        let keys: Vec<&str> = ["zone", "name", "color", "note", "press_cmyk"].to_vec();
        let mut at = 0;
        for k in keys {
            let p = out[at..]
                .find(&format!("\"{k}\""))
                .unwrap_or_else(|| panic!("{k} missing or out of order in {out}"));
            at += p;
        }
        assert!(out.contains("\"#eee\""), "{out}");
    }

    #[test]
    fn text_keeps_comments_blank_lines_and_names() {
        let text = "# land use\n\n#2f6b3a Woodland   # old growth\nlab(50 10 -20) Lake\n";
        let out = run(Format::Text, text, &[rw(None), rw(Some("#778899"))]);
        assert_eq!(
            out,
            "# repaired for press P (screen S); press CMYK in the comments\n\
             # land use\n\
             \n\
             #2f6b3a Woodland   # old growth  # press device-cmyk(1.0% 2.0% 3.0% 4.5%)\n\
             #778899 Lake  # press device-cmyk(1.0% 2.0% 3.0% 4.5%)\n"
        );
        let again = run(Format::Text, &out, &[rw(None), rw(None)]);
        assert_eq!(again, out, "a second repair refills, it does not pile up");
        let back = Palette::parse("t.txt", &out, Format::Text).unwrap();
        assert_eq!(back.entries[1].name, "Lake");
        assert_eq!(back.entries[1].input, "#778899");
    }
}
