//! Palettes: reading palette files (CSV, JSON, plain text) into named colour
//! entries in file order, and the analyses over them.

pub mod adjacency;
pub mod check;
pub mod map_raster;
pub mod order;
pub mod repair;
pub mod rewrite;
pub mod separation;
pub mod sld;
pub mod survival;
pub mod svg;
#[cfg(feature = "render")]
pub mod svg_render;
pub mod xml;

use std::path::Path;

use crate::color::css::{parse_color, ColorInput, ColorParseError};

/// One palette entry as the designer wrote it.
#[derive(Clone, Debug, PartialEq)]
pub struct Entry {
    /// Its name; the colour text itself when the file gives none.
    pub name: String,
    /// The colour text exactly as given.
    pub input: String,
    /// The colour the text parses to.
    pub color: ColorInput,
    /// Where it was written: a line number (CSV, text, SVG) or entry number (JSON), 1-based.
    pub line: usize,
    /// How artwork uses the colour; `None` for a palette file.
    pub usage: Option<Usage>,
    /// The share of a map image the class covers (0..1); `None` elsewhere.
    pub share: Option<f64>,
}

/// How artwork uses one of its colours.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
pub struct Usage {
    /// How many paints use it.
    pub uses: usize,
    /// The properties it is painted with (`fill`, `stroke`, `stop-color` …).
    pub properties: Vec<String>,
    /// The lowest opacity it is painted with (group opacities multiplied
    /// in); below 1 the printed colour depends on what lies beneath.
    pub opacity: f64,
}

/// A palette: its entries in file order.
#[derive(Clone, Debug, PartialEq)]
pub struct Palette {
    /// The file it was read from, as named.
    pub source: String,
    /// The entries in file order.
    pub entries: Vec<Entry>,
    /// The kind of scheme the file's own shape says it is, if it says one
    /// (a style that is only a raster colour map is sequential); `--scheme`
    /// overrides it.
    pub scheme_hint: Option<order::Scheme>,
    /// Which entries touch on the map, for a map image.
    pub adjacency: Option<adjacency::Adjacency>,
    /// For a map image, the share of the map no class covers.
    pub unclassified_share: Option<f64>,
    /// What the reader noticed that the check should say (a map image's
    /// embedded profile, which its class colours are converted from).
    pub notes: Vec<String>,
}

/// Why a palette could not be read. Each names the file and, where it
/// applies, the line.
#[derive(Debug, thiserror::Error)]
pub enum PaletteError {
    /// The file could not be read.
    #[error("palette '{file}': cannot read: {source}")]
    Read {
        /// The palette file as named.
        file: String,
        /// The read error.
        #[source]
        source: std::io::Error,
    },
    /// A colour in a CSV or text palette does not parse.
    #[error("palette '{file}', line {line}: {source}")]
    Color {
        /// The palette file as named.
        file: String,
        /// The line, 1-based.
        line: usize,
        /// Why the colour does not parse.
        #[source]
        source: ColorParseError,
    },
    /// A colour in a JSON palette does not parse.
    #[error("palette '{file}', entry {entry}: {source}")]
    JsonColor {
        /// The palette file as named.
        file: String,
        /// The entry, 1-based.
        entry: usize,
        /// Why the colour does not parse.
        #[source]
        source: ColorParseError,
    },
    /// A line of a CSV or text palette is not well formed.
    #[error("palette '{file}', line {line}: {message}")]
    Syntax {
        /// The palette file as named.
        file: String,
        /// The line, 1-based.
        line: usize,
        /// What is wrong, in words.
        message: String,
    },
    /// The file as a whole does not have the shape of its format.
    #[error("palette '{file}': {message}")]
    Format {
        /// The palette file as named.
        file: String,
        /// What is wrong, in words.
        message: String,
    },
    /// The palette holds no colours.
    #[error("palette '{file}': no colours in it")]
    Empty {
        /// The palette file as named.
        file: String,
    },
    /// The file is larger than [`MAX_PALETTE_BYTES`].
    #[error("palette '{file}': larger than {limit} MiB; inkfit reads palettes up to that size")]
    TooLarge {
        /// The palette file as named.
        file: String,
        /// The largest size read, MiB.
        limit: u64,
    },
    /// The palette has more than [`MAX_ENTRIES`] entries.
    #[error("palette '{file}' has {count} entries; inkfit checks up to {limit} at a time")]
    TooMany {
        /// The palette file as named.
        file: String,
        /// Its entries.
        count: usize,
        /// The most entries checked at a time.
        limit: usize,
    },
    /// A line is not UTF-8.
    #[error("palette '{file}', line {line}: not UTF-8 text")]
    NotText {
        /// The palette file as named.
        file: String,
        /// The line, 1-based.
        line: usize,
    },
    /// The path names a folder.
    #[error("palette '{file}' is a folder, not a file")]
    Folder {
        /// The palette file as named.
        file: String,
    },
}

/// Largest palette file read, in bytes: 16 MiB holds several hundred
/// thousand CSV lines, far more than any palette; a larger file is refused
/// after reading one byte past the limit, so no input can make the read
/// unbounded (a FIFO or `/dev/zero` included).
pub const MAX_PALETTE_BYTES: u64 = 16 << 20;

/// Most entries in one palette. Every pair is compared (separation), so the
/// work grows with the square of the count, and each colour outside the
/// press gamut costs a nearest-point search: 10,000 random screen colours
/// with three deficiencies simulated take about 25 s on 2 cores and 73 MB
/// (measured, release build).
pub const MAX_ENTRIES: usize = 10_000;

/// The palette file formats inkfit reads.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Format {
    /// Comma-separated values with a header row.
    Csv,
    /// JSON.
    Json,
    /// Plain text, one colour a line.
    Text,
    /// SVG artwork: every paint it uses.
    Svg,
    /// A map style: OGC SLD 1.0 or SE 1.1.
    Sld,
    /// A rendered map: PNG or TIFF.
    MapImage,
    /// A JPEG image, refused: its lossy compression leaves no flat class colours.
    Jpeg,
}

impl Format {
    /// By extension: `.csv` or `.tsv` (delimited, the delimiter sniffed),
    /// `.json`, `.svg`, `.sld` or `.se`, `.png`, `.tif` or `.tiff` (a map
    /// image); anything else is plain text.
    pub fn of_path(path: &Path) -> Format {
        match path
            .extension()
            .and_then(|e| e.to_str())
            .map(str::to_ascii_lowercase)
            .as_deref()
        {
            Some("csv" | "tsv") => Format::Csv,
            Some("json") => Format::Json,
            Some("svg") => Format::Svg,
            Some("sld" | "se") => Format::Sld,
            Some("png" | "tif" | "tiff") => Format::MapImage,
            Some("jpg" | "jpeg") => Format::Jpeg,
            _ => Format::Text,
        }
    }
}

impl Palette {
    /// Reads a palette file, choosing the format by extension; a map image
    /// with the default [`map_raster::MapOptions`].
    pub fn read(path: &Path) -> Result<Palette, PaletteError> {
        Palette::read_with(path, &map_raster::MapOptions::default())
    }

    /// Reads a palette file, choosing the format by extension; a map image
    /// with `map`.
    pub fn read_with(path: &Path, map: &map_raster::MapOptions) -> Result<Palette, PaletteError> {
        match Format::of_path(path) {
            Format::MapImage => map_raster::read_map(path, map),
            _ => Palette::read_with_text(path).map(|(p, _)| p),
        }
    }

    /// Reads a text palette file and also returns its text, for writing it
    /// back in its own shape ([`rewrite`]).
    pub fn read_with_text(path: &Path) -> Result<(Palette, String), PaletteError> {
        let file = path.display().to_string();
        if let Some(message) = match Format::of_path(path) {
            Format::MapImage => Some("a map image, not a text palette"),
            Format::Jpeg => Some(
                "a JPEG image: its lossy compression leaves no flat class colours to find; export the map as PNG or TIFF",
            ),
            _ => None,
        } {
            return Err(PaletteError::Format {
                file,
                message: message.to_string(),
            });
        }
        let text = read_bounded(path, &file)?;
        let p = Palette::parse(&file, &text, Format::of_path(path))?;
        Ok((p, text))
    }

    /// Parses palette text; `file` names it in errors. A byte order mark
    /// at the start is ignored in every format.
    pub fn parse(file: &str, text: &str, format: Format) -> Result<Palette, PaletteError> {
        let text = text.strip_prefix('\u{feff}').unwrap_or(text);
        let mut scheme_hint = None;
        let entries = match format {
            Format::Csv => parse_csv(file, text)?,
            Format::Json => parse_json(file, text)?,
            Format::Text => parse_text(file, text)?,
            Format::Svg => svg::parse_svg(file, text)?,
            Format::MapImage | Format::Jpeg => {
                return Err(PaletteError::Format {
                    file: file.to_string(),
                    message: "an image is read from its file, not as text".to_string(),
                })
            }
            Format::Sld => {
                let (e, hint) = sld::parse_sld(file, text)?;
                scheme_hint = hint;
                e
            }
        };
        if entries.is_empty() {
            return Err(PaletteError::Empty { file: file.to_string() });
        }
        if entries.len() > MAX_ENTRIES {
            return Err(PaletteError::TooMany {
                file: file.to_string(),
                count: entries.len(),
                limit: MAX_ENTRIES,
            });
        }
        Ok(Palette {
            source: file.to_string(),
            entries,
            scheme_hint,
            adjacency: None,
            unclassified_share: None,
            notes: Vec::new(),
        })
    }
}

/// The 1-based line of byte `pos` of `text` (a position past the end counts
/// as the end).
pub(crate) fn line_at(text: &[u8], pos: usize) -> usize {
    1 + text[..pos.min(text.len())].iter().filter(|&&b| b == b'\n').count()
}

/// The text of a palette file, read up to [`MAX_PALETTE_BYTES`].
fn read_bounded(path: &Path, file: &str) -> Result<String, PaletteError> {
    read_bounded_max(path, file, MAX_PALETTE_BYTES)
}

/// The text of a file, read up to `max` bytes.
fn read_bounded_max(path: &Path, file: &str, max: u64) -> Result<String, PaletteError> {
    use std::io::Read;
    let read_err = |source| PaletteError::Read {
        file: file.to_string(),
        source,
    };
    if path.is_dir() {
        return Err(PaletteError::Folder { file: file.to_string() });
    }
    let f = std::fs::File::open(path).map_err(read_err)?;
    let mut bytes = Vec::new();
    f.take(max + 1).read_to_end(&mut bytes).map_err(read_err)?;
    if bytes.len() as u64 > max {
        return Err(PaletteError::TooLarge {
            file: file.to_string(),
            limit: max >> 20,
        });
    }
    String::from_utf8(bytes).map_err(|e| {
        let good = &e.as_bytes()[..e.utf8_error().valid_up_to()];
        PaletteError::NotText {
            file: file.to_string(),
            line: line_at(good, good.len()),
        }
    })
}

const NAME_HEADERS: &[&str] = &["name", "label", "class", "title", "id"];
pub(crate) const COLOR_HEADERS: &[&str] = &["color", "colour", "value", "hex", "css"];
const RGB_HEADERS: [[&str; 2]; 3] = [["r", "red"], ["g", "green"], ["b", "blue"]];
const CMYK_HEADERS: [[&str; 2]; 4] = [["c", "cyan"], ["m", "magenta"], ["y", "yellow"], ["k", "black"]];

/// Where a delimited palette keeps its colours.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) enum ColourColumns {
    /// One column of colour text.
    Text(usize),
    /// R, G, B columns, 0–255.
    Rgb([usize; 3]),
    /// C, M, Y, K columns, 0–100 %.
    Cmyk([usize; 4]),
}

/// The colour columns of a header row: a colour-text column if there is
/// one, else R, G, B, else C, M, Y, K (header names ASCII case-insensitive,
/// a byte order mark ignored).
pub(crate) fn colour_columns<'a>(headers: impl Iterator<Item = &'a str> + Clone) -> Option<ColourColumns> {
    let find = |names: &[&str]| {
        headers.clone().position(|h| {
            let h = h.trim().trim_start_matches('\u{feff}');
            names.iter().any(|n| h.eq_ignore_ascii_case(n))
        })
    };
    if let Some(c) = find(COLOR_HEADERS) {
        return Some(ColourColumns::Text(c));
    }
    if let [Some(r), Some(g), Some(b)] = RGB_HEADERS.map(|n| find(&n)) {
        return Some(ColourColumns::Rgb([r, g, b]));
    }
    if let [Some(c), Some(m), Some(y), Some(k)] = CMYK_HEADERS.map(|n| find(&n)) {
        return Some(ColourColumns::Cmyk([c, m, y, k]));
    }
    None
}

/// The delimiter of a delimited palette: whichever of comma, semicolon and
/// tab occurs most often outside quotes in its first line (comma on a tie
/// or when none occurs).
pub(crate) fn sniff_delimiter(text: &str) -> u8 {
    let first = text.lines().next().unwrap_or("");
    let mut counts = [0usize; 3];
    let mut quoted = false;
    for c in first.chars() {
        match c {
            '"' => quoted = !quoted,
            ',' if !quoted => counts[0] += 1,
            ';' if !quoted => counts[1] += 1,
            '\t' if !quoted => counts[2] += 1,
            _ => {}
        }
    }
    let best = (0..3).max_by_key(|&i| (counts[i], std::cmp::Reverse(i))).unwrap_or(0);
    if counts[best] == 0 {
        b','
    } else {
        [b',', b';', b'\t'][best]
    }
}

/// A colour as palettes write it: CSS colour text, or a hex colour without
/// its `#` (six or eight hex digits, as spreadsheets and GIS tables keep
/// them).
pub(crate) fn palette_color(input: &str) -> Result<ColorInput, ColorParseError> {
    parse_color(input).or_else(|e| {
        let t = input.trim();
        if matches!(t.len(), 6 | 8) && t.chars().all(|c| c.is_ascii_hexdigit()) {
            parse_color(&format!("#{t}"))
        } else {
            Err(e)
        }
    })
}

/// The colour text of a record: its colour-text field, or colour text made
/// from its channel fields; what is wrong otherwise.
fn record_color(record: &csv::StringRecord, cols: ColourColumns) -> Result<String, String> {
    let num = |c: usize, what: &str, max: f64| -> Result<f64, String> {
        let t = record.get(c).unwrap_or("").trim();
        let v: f64 = t.parse().map_err(|_| format!("{what} \"{t}\" is not a number"))?;
        if (0.0..=max).contains(&v) {
            Ok(v)
        } else {
            Err(format!("{what} {v} lies outside 0–{max}"))
        }
    };
    match cols {
        ColourColumns::Rgb([r, g, b]) => Ok(format!(
            "rgb({} {} {})",
            num(r, "R", 255.0)?,
            num(g, "G", 255.0)?,
            num(b, "B", 255.0)?
        )),
        ColourColumns::Cmyk([c, m, y, k]) => Ok(format!(
            "device-cmyk({}% {}% {}% {}%)",
            num(c, "C", 100.0)?,
            num(m, "M", 100.0)?,
            num(y, "Y", 100.0)?,
            num(k, "K", 100.0)?
        )),
        ColourColumns::Text(c) => record
            .get(c)
            .filter(|s| !s.is_empty())
            .map(str::to_string)
            .ok_or_else(|| "the colour field is empty".to_string()),
    }
}

fn parse_csv(file: &str, text: &str) -> Result<Vec<Entry>, PaletteError> {
    let syntax = |line: usize, message: String| PaletteError::Syntax {
        file: file.to_string(),
        line,
        message,
    };
    let mut reader = csv::ReaderBuilder::new()
        .has_headers(true)
        .flexible(true)
        .trim(csv::Trim::All)
        .comment(None)
        .delimiter(sniff_delimiter(text))
        .from_reader(text.as_bytes());
    let headers = reader
        .headers()
        .map_err(|e| syntax(1, format!("cannot read the header row: {e}")))?
        .clone();
    let find = |names: &[&str]| {
        headers.iter().position(|h| {
            names
                .iter()
                .any(|n| h.trim_start_matches('\u{feff}').eq_ignore_ascii_case(n))
        })
    };
    let columns = colour_columns(headers.iter()).ok_or_else(|| {
        syntax(
            1,
            format!(
                "no colour column in the header (expected one of: {}; or R, G, B; or C, M, Y, K)",
                COLOR_HEADERS.join(", ")
            ),
        )
    })?;
    let name_col = find(NAME_HEADERS);
    let mut entries = Vec::new();
    for record in reader.records() {
        let record = record.map_err(|e| {
            let line = e.position().map_or(0, |p| p.line() as usize);
            syntax(line, format!("not valid CSV: {e}"))
        })?;
        let line = record.position().map_or(0, |p| p.line() as usize);
        if record.iter().all(str::is_empty) {
            continue;
        }
        let input = record_color(&record, columns).map_err(|m| syntax(line, m))?;
        let color = palette_color(&input).map_err(|source| PaletteError::Color {
            file: file.to_string(),
            line,
            source,
        })?;
        let name = name_col
            .and_then(|c| record.get(c))
            .filter(|s| !s.is_empty())
            .unwrap_or(&input);
        entries.push(Entry {
            name: name.to_string(),
            input: input.clone(),
            color,
            line,
            usage: None,
            share: None,
        });
    }
    Ok(entries)
}

fn parse_json(file: &str, text: &str) -> Result<Vec<Entry>, PaletteError> {
    let value: serde_json::Value = serde_json::from_str(text).map_err(|e| PaletteError::Syntax {
        file: file.to_string(),
        line: e.line(),
        message: format!("not valid JSON: {e}"),
    })?;
    let format_err = |message: String| PaletteError::Format {
        file: file.to_string(),
        message,
    };
    let items = value
        .as_array()
        .ok_or_else(|| format_err("expected a JSON array of {\"name\", \"color\"} objects".to_string()))?;
    let mut entries = Vec::new();
    for (i, item) in items.iter().enumerate() {
        let n = i + 1;
        let obj = item
            .as_object()
            .ok_or_else(|| format_err(format!("entry {n} is not an object with \"name\" and \"color\"")))?;
        let input = obj
            .get("color")
            .or_else(|| obj.get("colour"))
            .and_then(|v| v.as_str())
            .ok_or_else(|| format_err(format!("entry {n} has no \"color\" string")))?;
        let color = palette_color(input).map_err(|source| PaletteError::JsonColor {
            file: file.to_string(),
            entry: n,
            source,
        })?;
        let name = match obj.get("name") {
            None | Some(serde_json::Value::Null) => input.to_string(),
            Some(serde_json::Value::String(s)) => s.clone(),
            Some(other) => other.to_string(),
        };
        entries.push(Entry {
            name,
            input: input.to_string(),
            color,
            line: n,
            usage: None,
            share: None,
        });
    }
    Ok(entries)
}

/// Splits a plain-text line into the colour text and the rest. A colour is a
/// function call `name( … )`, or a run of non-space characters.
fn split_color(line: &str) -> Result<(&str, &str), String> {
    let ident_end = line
        .find(|c: char| !(c.is_ascii_alphanumeric() || c == '-' || c == '_'))
        .unwrap_or(line.len());
    if ident_end > 0 && line[ident_end..].starts_with('(') {
        let close = line
            .find(')')
            .ok_or_else(|| format!("\"{line}\": the colour function is not closed with ')'"))?;
        Ok((&line[..=close], line[close + 1..].trim()))
    } else {
        let end = line.find(char::is_whitespace).unwrap_or(line.len());
        Ok((&line[..end], line[end..].trim()))
    }
}

/// True when `#` starts a colour rather than a comment: a colour's `#` is
/// followed at once by a letter or digit (`#2f6b3a`, and typos such as
/// `#12345x`, which then get a parse error); a comment's by a space, another
/// `#`, punctuation or the end of the line.
fn is_hex_color(s: &str) -> bool {
    s.strip_prefix('#')
        .and_then(|rest| rest.chars().next())
        .is_some_and(|c| c.is_ascii_alphanumeric())
}

/// The entries of a plain-text palette as (line number, colour text, name
/// text): comments and blank lines skipped, a trailing comment cut off.
fn text_entries(text: &str) -> impl Iterator<Item = (usize, Result<(&str, &str), String>)> {
    text.lines().enumerate().filter_map(|(i, raw)| {
        let mut s = raw.trim();
        if s.is_empty() || (s.starts_with('#') && !is_hex_color(s)) {
            return None;
        }
        // A comment after the entry: whitespace then '#' not starting a hex colour.
        if let Some(pos) = s.char_indices().find_map(|(p, c)| {
            (c == '#' && p > 0 && s[..p].ends_with(char::is_whitespace) && !is_hex_color(&s[p..])).then_some(p)
        }) {
            s = s[..pos].trim_end();
        }
        Some((i + 1, split_color(s)))
    })
}

/// Line number and colour text of each entry of a plain-text palette that
/// parses, for writing it back ([`rewrite`]).
pub(crate) fn text_entry_lines(text: &str) -> Vec<(usize, String)> {
    text_entries(text)
        .filter_map(|(line, r)| r.ok().map(|(input, _)| (line, input.to_string())))
        .collect()
}

fn parse_text(file: &str, text: &str) -> Result<Vec<Entry>, PaletteError> {
    let mut entries = Vec::new();
    for (line, split) in text_entries(text) {
        let (input, name) = split.map_err(|message| PaletteError::Syntax {
            file: file.to_string(),
            line,
            message,
        })?;
        let color = palette_color(input).map_err(|source| PaletteError::Color {
            file: file.to_string(),
            line,
            source,
        })?;
        entries.push(Entry {
            name: if name.is_empty() {
                input.to_string()
            } else {
                name.to_string()
            },
            input: input.to_string(),
            color,
            line,
            usage: None,
            share: None,
        });
    }
    Ok(entries)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn delimiters_are_sniffed_from_the_header() {
        assert_eq!(sniff_delimiter("name;colour\nA;#fff\n"), b';');
        assert_eq!(sniff_delimiter("name\tcolour\n"), b'\t');
        assert_eq!(sniff_delimiter("\"a;b\",colour\n"), b',');
        assert_eq!(sniff_delimiter("colour\n"), b',');
        let p = Palette::parse(
            "t.csv",
            "Name;Colour\nWood;2f6b3a\nWater;rgb(26 140 240)\n",
            Format::Csv,
        )
        .unwrap();
        assert_eq!(p.entries.len(), 2);
        assert_eq!(p.entries[0].color, parse_color("#2f6b3a").unwrap());
        let t = Palette::parse("t.tsv", "class\thex\nWood\t2F6B3A\n", Format::Csv).unwrap();
        assert_eq!(t.entries[0].name, "Wood");
    }

    #[test]
    fn channel_columns_are_colours() {
        let rgb = Palette::parse("t.csv", "name,red,green,blue\nWood,47,107,58\n", Format::Csv).unwrap();
        assert_eq!(rgb.entries[0].color, parse_color("#2f6b3a").unwrap());
        let cmyk = Palette::parse("t.csv", "class,C,M,Y,K\nWood,80,20,90,10\n", Format::Csv).unwrap();
        assert_eq!(
            cmyk.entries[0].color,
            parse_color("device-cmyk(80% 20% 90% 10%)").unwrap()
        );
        let e = Palette::parse("t.csv", "class,R,G,B\nA,1,2,3\nB,300,0,0\n", Format::Csv).unwrap_err();
        assert_eq!(e.to_string(), "palette 't.csv', line 3: R 300 lies outside 0–255");
        let e = Palette::parse("t.csv", "class,C,M,Y,K\nA,x,0,0,0\n", Format::Csv).unwrap_err();
        assert_eq!(e.to_string(), "palette 't.csv', line 2: C \"x\" is not a number");
    }

    #[test]
    fn byte_order_marks_and_named_colours_in_every_format() {
        let text = Palette::parse("t.txt", "\u{feff}forestgreen Wood\n1f6f3a Marsh\n", Format::Text).unwrap();
        assert_eq!(text.entries[0].name, "Wood");
        assert_eq!(text.entries[0].color, parse_color("#228b22").unwrap());
        assert_eq!(text.entries[1].color, parse_color("#1f6f3a").unwrap());
        let json = Palette::parse(
            "t.json",
            "\u{feff}[{\"name\": \"Water\", \"color\": \"SteelBlue\"}]",
            Format::Json,
        )
        .unwrap();
        assert_eq!(json.entries[0].color, parse_color("#4682b4").unwrap());
        // Three hex digits without '#' stay an error: "100" is no colour.
        assert!(Palette::parse("t.txt", "100 Wood\n", Format::Text).is_err());
    }

    #[test]
    fn csv_finds_columns_by_header_and_reads_quoted_fields() {
        let p = Palette::parse(
            "t.csv",
            "note,Colour,Name\nx,\"rgb(10, 20, 30)\",Deep\ny,#ffffff,\n",
            Format::Csv,
        )
        .unwrap();
        assert_eq!(p.entries.len(), 2);
        assert_eq!(p.entries[0].name, "Deep");
        assert_eq!(p.entries[0].input, "rgb(10, 20, 30)");
        assert_eq!(p.entries[0].line, 2);
        assert_eq!(
            p.entries[1].name, "#ffffff",
            "a missing name falls back to the colour text"
        );
    }

    #[test]
    fn text_lines_take_functions_names_and_comments() {
        let text = "# header comment\n\nlab(50 10 -20) Lake shore  # trailing\n#abc\n  oklch(0.5 0.1 30)\n";
        let p = Palette::parse("t.txt", text, Format::Text).unwrap();
        let names: Vec<&str> = p.entries.iter().map(|e| e.name.as_str()).collect();
        assert_eq!(names, ["Lake shore", "#abc", "oklch(0.5 0.1 30)"]);
        assert_eq!(p.entries[0].line, 3);
        assert_eq!(p.entries[2].line, 5);
    }

    #[test]
    fn text_reports_the_line_of_a_bad_colour() {
        let err = Palette::parse("t.txt", "#112233\n#12345x typo\n", Format::Text).unwrap_err();
        let msg = err.to_string();
        assert!(
            msg.contains("t.txt") && msg.contains("line 2") && msg.contains("#12345x"),
            "{msg}"
        );
    }

    #[test]
    fn json_needs_an_array_of_objects() {
        let p = Palette::parse("t.json", r#"[{"name": null, "color": "lab(40 0 0)"}]"#, Format::Json).unwrap();
        assert_eq!(p.entries[0].name, "lab(40 0 0)");
        for bad in [r##"{"color": "#fff"}"##, r##"["#fff"]"##, r##"[{"name": "A"}]"##] {
            assert!(matches!(
                Palette::parse("t.json", bad, Format::Json),
                Err(PaletteError::Format { .. })
            ));
        }
        assert!(matches!(
            Palette::parse("t.json", "[]", Format::Json),
            Err(PaletteError::Empty { .. })
        ));
    }
}
