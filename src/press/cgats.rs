//! Measurement data of a print condition in the CGATS.17 ASCII exchange
//! format (ANSI CGATS.17, the open text format print measurements are
//! exchanged in): keyword lines, a data format naming the fields, and the
//! data rows.
//!
//! What is read:
//! - `SAMPLE_ID` (optional), `CMYK_C`, `CMYK_M`, `CMYK_Y`, `CMYK_K` in
//!   percent, and the colour as either `LAB_L`, `LAB_A`, `LAB_B` (CIELAB
//!   D50, 2°, as ISO 13655 measures prints) or `XYZ_X`, `XYZ_Y`, `XYZ_Z`
//!   (D50, scaled so the perfect diffuser has Y = 100);
//! - keyword lines (`ORIGINATOR "…"`, `NUMBER_OF_SETS 1617`, declared
//!   keywords), `#` comments outside quoted strings, tabs or spaces between
//!   values, CRLF or LF line ends and a byte order mark;
//! - without LAB or XYZ fields, reflectance spectra in `SPECTRAL_NM380` …
//!   `SPECTRAL_NM730` (5, 10 or 20 nm bands covering at least 400–700 nm,
//!   as fractions or in percent), turned into CIELAB D50 2° as ISO 13655
//!   asks ([`crate::color::spectral`]);
//! - other fields (densities, names, spectra beside LAB) are kept out of
//!   the way: they are skipped, not refused.
//!
//! Patches with the same CMYK (to 0.01 %) are averaged in CIELAB, and the
//! spread of each group is kept so outliers among repeats can be reported.
//! Every error names the file and, where there is one, the line.

use std::collections::BTreeMap;
use std::path::Path;

use crate::color::{LabD50, Xyz};

/// The largest measurement file read: 16 MiB (a 10,000-patch file with
/// spectral data is about 4 MB).
pub const MAX_CGATS_BYTES: u64 = 16 << 20;

/// The most data rows accepted (a printer's characterisation chart has a
/// few thousand patches; common practice).
pub const MAX_PATCHES: usize = 100_000;

/// The ink fields every measurement file must have, in C, M, Y, K order.
const CMYK_FIELDS: [&str; 4] = ["CMYK_C", "CMYK_M", "CMYK_Y", "CMYK_K"];

/// Why a measurement file cannot be used. Each names the file.
#[derive(Debug, thiserror::Error)]
pub enum CgatsError {
    /// The file cannot be read.
    #[error("{file}: cannot read: {source}")]
    Read {
        /// The file as named.
        file: String,
        /// The I/O error.
        source: std::io::Error,
    },
    /// The file is larger than [`MAX_CGATS_BYTES`].
    #[error("{file}: larger than {limit} MiB; not a measurement file inkfit reads")]
    TooLarge {
        /// The file as named.
        file: String,
        /// The limit in MiB.
        limit: u64,
    },
    /// The file is not UTF-8 text.
    #[error("{file}:{line}: not text (a byte that is not UTF-8)")]
    NotText {
        /// The file as named.
        file: String,
        /// The line of the first bad byte.
        line: usize,
    },
    /// A malformed line.
    #[error("{file}:{line}: {detail}")]
    Syntax {
        /// The file as named.
        file: String,
        /// The 1-based line.
        line: usize,
        /// What is wrong, in words.
        detail: String,
    },
    /// Something missing from the whole file.
    #[error("{file}: {detail}")]
    Missing {
        /// The file as named.
        file: String,
        /// What is missing, in words.
        detail: String,
    },
}

/// How the colour of each patch was given.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ColourFields {
    /// `LAB_L`, `LAB_A`, `LAB_B`.
    Lab,
    /// `XYZ_X`, `XYZ_Y`, `XYZ_Z` (Y = 100 for the perfect diffuser).
    Xyz,
    /// `SPECTRAL_NM380` … `SPECTRAL_NM730` (any even 5, 10 or 20 nm steps
    /// covering 400–700 nm), reflectance as a fraction or in percent,
    /// turned into CIELAB D50 2° ([`crate::color::spectral`]).
    Spectral,
}

/// One measured ink combination, averaged over its repeats.
#[derive(Clone, Debug, PartialEq)]
pub struct Patch {
    /// The first `SAMPLE_ID` of the group (or its row number).
    pub id: String,
    /// The line of the first row of the group.
    pub line: usize,
    /// C, M, Y, K in percent.
    pub cmyk: [f64; 4],
    /// Mean CIELAB D50 of the repeats (absolute: paper included).
    pub lab: LabD50,
    /// How many rows were averaged.
    pub repeats: usize,
    /// The largest CIEDE2000 of a repeat from the mean (0 for one row).
    pub spread_de00: f64,
}

/// A measurement file: its patches in first-seen order.
#[derive(Clone, Debug, PartialEq)]
pub struct Measurements {
    /// The file as named.
    pub source: String,
    /// How the colours were given.
    pub colour_fields: ColourFields,
    /// Data rows read.
    pub rows: usize,
    /// Patches after averaging repeats.
    pub patches: Vec<Patch>,
}

impl Measurements {
    /// Reads a CGATS.17 file, up to [`MAX_CGATS_BYTES`].
    pub fn read(path: &Path) -> Result<Self, CgatsError> {
        use std::io::Read;
        let file = path.display().to_string();
        let read_err = |source| CgatsError::Read {
            file: file.clone(),
            source,
        };
        let f = std::fs::File::open(path).map_err(read_err)?;
        let mut bytes = Vec::new();
        f.take(MAX_CGATS_BYTES + 1).read_to_end(&mut bytes).map_err(read_err)?;
        if bytes.len() as u64 > MAX_CGATS_BYTES {
            return Err(CgatsError::TooLarge {
                file,
                limit: MAX_CGATS_BYTES >> 20,
            });
        }
        let text = String::from_utf8(bytes).map_err(|e| {
            let good = &e.as_bytes()[..e.utf8_error().valid_up_to()];
            CgatsError::NotText {
                file: file.clone(),
                line: 1 + good.iter().filter(|&&b| b == b'\n').count(),
            }
        })?;
        Self::parse(&file, &text)
    }

    /// Parses CGATS.17 text; `file` names it in errors.
    pub fn parse(file: &str, text: &str) -> Result<Self, CgatsError> {
        let syntax = |line: usize, detail: String| CgatsError::Syntax {
            file: file.to_string(),
            line,
            detail,
        };
        let text = text.strip_prefix('\u{feff}').unwrap_or(text);
        let mut fields: Option<Vec<String>> = None;
        let mut declared_sets: Option<(usize, usize)> = None;
        let mut rows: Vec<(usize, Vec<String>)> = Vec::new();
        let mut state = State::Header;
        for (i, raw) in text.lines().enumerate() {
            let line = i + 1;
            let tokens = tokens(raw).map_err(|d| syntax(line, d))?;
            let Some(first) = tokens.first() else { continue };
            match state {
                State::Header => match first.as_str() {
                    "BEGIN_DATA_FORMAT" => state = State::Format(Vec::new()),
                    "BEGIN_DATA" => {
                        if fields.is_none() {
                            return Err(syntax(line, "BEGIN_DATA before any BEGIN_DATA_FORMAT".into()));
                        }
                        state = State::Data;
                    }
                    "NUMBER_OF_SETS" => {
                        let n = tokens
                            .get(1)
                            .and_then(|t| t.parse::<usize>().ok())
                            .ok_or_else(|| syntax(line, "NUMBER_OF_SETS needs a whole number".into()))?;
                        declared_sets = Some((n, line));
                    }
                    "END_DATA" | "END_DATA_FORMAT" => {
                        return Err(syntax(line, format!("{first} without its BEGIN")));
                    }
                    // Any other keyword line (ORIGINATOR, CREATED,
                    // KEYWORD "X", a declared keyword, the CGATS.17 tag).
                    _ => {}
                },
                State::Format(ref mut names) => {
                    if first == "END_DATA_FORMAT" {
                        let names = std::mem::take(names);
                        if names.is_empty() {
                            return Err(syntax(line, "the data format names no fields".into()));
                        }
                        fields = Some(names);
                        state = State::Header;
                    } else {
                        names.extend(tokens.iter().map(|t| t.to_ascii_uppercase()));
                    }
                }
                State::Data => {
                    if first == "END_DATA" {
                        state = State::Done;
                        continue;
                    }
                    let n = fields.as_ref().map_or(0, Vec::len);
                    if tokens.len() != n {
                        return Err(syntax(
                            line,
                            format!("{} values where the data format names {n} fields", tokens.len()),
                        ));
                    }
                    if rows.len() == MAX_PATCHES {
                        return Err(syntax(line, format!("more than {MAX_PATCHES} data rows")));
                    }
                    rows.push((line, tokens));
                }
                // A second table, or trailing keywords: not used.
                State::Done => {}
            }
        }
        match state {
            State::Format(_) => return Err(missing(file, "END_DATA_FORMAT is missing")),
            State::Data => return Err(missing(file, "END_DATA is missing")),
            State::Header if fields.is_none() => return Err(missing(file, "no BEGIN_DATA_FORMAT … END_DATA_FORMAT")),
            State::Header => return Err(missing(file, "no BEGIN_DATA … END_DATA")),
            State::Done => {}
        }
        let fields = fields.unwrap_or_default();
        if let Some((n, line)) = declared_sets {
            if n != rows.len() {
                return Err(syntax(
                    line,
                    format!("NUMBER_OF_SETS says {n}, but the data has {} rows", rows.len()),
                ));
            }
        }
        let col = |name: &str| fields.iter().position(|f| f == name);
        let cmyk_cols = CMYK_FIELDS.map(col);
        let Some(cmyk_cols) = all(cmyk_cols) else {
            return Err(missing(file, "the data format lacks CMYK_C, CMYK_M, CMYK_Y and CMYK_K"));
        };
        let lab_cols = all(["LAB_L", "LAB_A", "LAB_B"].map(col));
        let xyz_cols = all(["XYZ_X", "XYZ_Y", "XYZ_Z"].map(col));
        let bands = spectral_bands(&fields);
        let (colour_fields, colour_cols) = match (lab_cols, xyz_cols) {
            (Some(c), _) => (ColourFields::Lab, Some(c)),
            (None, Some(c)) => (ColourFields::Xyz, Some(c)),
            (None, None) if !bands.is_empty() => {
                let nm: Vec<u32> = bands.iter().map(|b| b.0).collect();
                crate::color::spectral::check_bands(&nm).map_err(|e| missing(file, &e.to_string()))?;
                (ColourFields::Spectral, None)
            }
            (None, None) => {
                return Err(missing(
                    file,
                    "the data format lacks LAB_L, LAB_A, LAB_B (or XYZ_X, XYZ_Y, XYZ_Z, or SPECTRAL_NM bands)",
                ));
            }
        };
        // Reflectance in percent when any value is above 1.5 (a print
        // reflects at most about 100 % even with optical brighteners).
        let percent = colour_fields == ColourFields::Spectral
            && rows.iter().any(|(_, t)| {
                bands
                    .iter()
                    .any(|&(_, c)| t[c].parse::<f64>().is_ok_and(|v| v.is_finite() && v > 1.5))
            });
        let (first_nm, step_nm) = match bands.as_slice() {
            [a, b, ..] => (a.0, b.0 - a.0),
            _ => (0, 0),
        };
        let id_col = col("SAMPLE_ID");
        let mut groups: BTreeMap<[i64; 4], usize> = BTreeMap::new();
        let mut members: Vec<(String, usize, [f64; 4], Vec<LabD50>)> = Vec::new();
        for (k, (line, t)) in rows.iter().enumerate() {
            let num = |c: usize, what: &str| -> Result<f64, CgatsError> {
                t[c].parse::<f64>()
                    .ok()
                    .filter(|v| v.is_finite())
                    .ok_or_else(|| syntax(*line, format!("{what} \"{}\" is not a number", t[c])))
            };
            let mut cmyk = [0.0; 4];
            for (v, (&c, name)) in cmyk.iter_mut().zip(cmyk_cols.iter().zip(CMYK_FIELDS)) {
                *v = num(c, name)?;
                if !(0.0..=100.0).contains(v) {
                    return Err(syntax(*line, format!("{name} {v} lies outside 0..100 %")));
                }
            }
            let lab = match colour_cols {
                None => {
                    let mut r = Vec::with_capacity(bands.len());
                    for &(_, c) in &bands {
                        let v = num(c, &fields[c])?;
                        r.push(if percent { v / 100.0 } else { v });
                    }
                    crate::color::spectral::reflectance_to_lab(first_nm, step_nm, &r)
                }
                Some(cols) => {
                    let [a, b, z] = cols.map(|c| num(c, &fields[c]));
                    let (a, b, z) = (a?, b?, z?);
                    colour_of(colour_fields, a, b, z).map_err(|d| syntax(*line, d))?
                }
            };
            let key = cmyk.map(|v| (v * 100.0).round() as i64);
            let id = id_col.map_or_else(|| (k + 1).to_string(), |c| t[c].clone());
            match groups.get(&key) {
                Some(&g) => members[g].3.push(lab),
                None => {
                    groups.insert(key, members.len());
                    members.push((id, *line, cmyk, vec![lab]));
                }
            }
        }
        let patches = members
            .into_iter()
            .map(|(id, line, cmyk, labs)| {
                let n = labs.len() as f64;
                let mean = LabD50::new(
                    labs.iter().map(|l| l.l).sum::<f64>() / n,
                    labs.iter().map(|l| l.a).sum::<f64>() / n,
                    labs.iter().map(|l| l.b).sum::<f64>() / n,
                );
                let spread = labs
                    .iter()
                    .map(|l| crate::color::delta::delta_e00(*l, mean))
                    .fold(0.0, f64::max);
                Patch {
                    id,
                    line,
                    cmyk,
                    lab: mean,
                    repeats: labs.len(),
                    spread_de00: spread,
                }
            })
            .collect();
        Ok(Measurements {
            source: file.to_string(),
            colour_fields,
            rows: rows.len(),
            patches,
        })
    }

    /// The patch of unprinted paper (all inks 0), if measured.
    pub fn paper(&self) -> Option<&Patch> {
        self.patches.iter().find(|p| p.cmyk.iter().all(|v| *v == 0.0))
    }

    /// Groups of repeats whose members lie more than `limit` ΔE00 from
    /// their mean, largest spread first: measurement outliers.
    pub fn inconsistent_repeats(&self, limit: f64) -> Vec<&Patch> {
        let mut v: Vec<&Patch> = self
            .patches
            .iter()
            .filter(|p| p.repeats > 1 && p.spread_de00 > limit)
            .collect();
        v.sort_by(|a, b| b.spread_de00.total_cmp(&a.spread_de00));
        v
    }
}

enum State {
    Header,
    Format(Vec<String>),
    Data,
    Done,
}

/// The CIELAB of one row's LAB or XYZ fields, or what is wrong with them.
fn colour_of(fields: ColourFields, a: f64, b: f64, z: f64) -> Result<LabD50, String> {
    match fields {
        ColourFields::Xyz => {
            if a < 0.0 || b < 0.0 || z < 0.0 {
                return Err("a negative tristimulus value".into());
            }
            Ok(LabD50::from_xyz(Xyz::new(a / 100.0, b / 100.0, z / 100.0)))
        }
        _ => {
            if !(0.0..=101.0).contains(&a) {
                return Err(format!("LAB_L {a} lies outside 0..100"));
            }
            Ok(LabD50::new(a, b, z))
        }
    }
}

/// The spectral fields (`SPECTRAL_NM380`, also written `SPECTRAL_NM_380`)
/// as (wavelength in nm, column), by wavelength.
fn spectral_bands(fields: &[String]) -> Vec<(u32, usize)> {
    let mut v: Vec<(u32, usize)> = fields
        .iter()
        .enumerate()
        .filter_map(|(c, f)| {
            let rest = f.strip_prefix("SPECTRAL_NM")?;
            let digits = rest.strip_prefix('_').unwrap_or(rest);
            digits
                .parse::<u32>()
                .ok()
                .filter(|nm| (300..=830).contains(nm))
                .map(|nm| (nm, c))
        })
        .collect();
    v.sort_unstable();
    v
}

fn missing(file: &str, detail: &str) -> CgatsError {
    CgatsError::Missing {
        file: file.to_string(),
        detail: detail.to_string(),
    }
}

/// Every column, or `None` when one is missing.
fn all<const N: usize>(v: [Option<usize>; N]) -> Option<[usize; N]> {
    let mut out = [0; N];
    for (o, x) in out.iter_mut().zip(v) {
        *o = x?;
    }
    Some(out)
}

/// The tokens of a line: runs of non-blank characters or double-quoted
/// strings (quotes removed); a `#` outside quotes starts a comment.
fn tokens(line: &str) -> Result<Vec<String>, String> {
    let mut out = Vec::new();
    let mut chars = line.chars().peekable();
    while let Some(&c) = chars.peek() {
        if c.is_whitespace() {
            chars.next();
        } else if c == '#' {
            break;
        } else if c == '"' {
            chars.next();
            let mut s = String::new();
            loop {
                match chars.next() {
                    Some('"') => break,
                    Some(ch) => s.push(ch),
                    None => return Err("a quoted string is not closed".into()),
                }
            }
            out.push(s);
        } else {
            let mut s = String::new();
            while let Some(&ch) = chars.peek() {
                if ch.is_whitespace() {
                    break;
                }
                s.push(ch);
                chars.next();
            }
            out.push(s);
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    const SAMPLE: &str = "\u{feff}CGATS.17\r\n\
ORIGINATOR \"Tarrowmere Basin atlas print test # 3\"\r\n\
KEYWORD \"SHEET\"\r\n\
SHEET 7\r\n\
# a comment line\r\n\
NUMBER_OF_FIELDS 8\r\n\
BEGIN_DATA_FORMAT\r\n\
SAMPLE_ID\tCMYK_C CMYK_M CMYK_Y CMYK_K\r\n\
LAB_L LAB_A LAB_B\r\n\
END_DATA_FORMAT\r\n\
NUMBER_OF_SETS 4\r\n\
BEGIN_DATA\r\n\
1\t0 0 0 0 95.0 0.0 -2.0\r\n\
2\t100 0 0 0 55.0 -37.0 -50.0 # solid cyan\r\n\
3\t0 0 0 0 95.2 0.2 -2.2\r\n\
\"A 4\" 0 100 0 0 48 74 -3\r\n\
END_DATA\r\n";

    #[test]
    fn reads_keywords_comments_quotes_tabs_crlf_and_averages_repeats() {
        let m = Measurements::parse("t.txt", SAMPLE).unwrap();
        assert_eq!(m.rows, 4);
        assert_eq!(m.colour_fields, ColourFields::Lab);
        assert_eq!(m.patches.len(), 3);
        let paper = m.paper().unwrap();
        assert_eq!(paper.repeats, 2);
        assert_eq!(paper.id, "1");
        // The mean of the two paper rows, by hand: (95.0 + 95.2) / 2 etc.
        assert!((paper.lab.l - 95.1).abs() < 1e-12);
        assert!((paper.lab.a - 0.1).abs() < 1e-12);
        assert!((paper.lab.b + 2.1).abs() < 1e-12);
        assert!(paper.spread_de00 > 0.0);
        assert_eq!(m.patches[2].id, "A 4");
        assert_eq!(m.patches[1].cmyk, [100.0, 0.0, 0.0, 0.0]);
    }

    #[test]
    fn xyz_data_becomes_cielab_d50() {
        // XYZ of the D50 white itself (ICC.1:2010, 7.2.16: 96.42, 100, 82.49)
        // is L* 100, a* = b* = 0 by the definition of CIELAB.
        let text = "CGATS.17\nBEGIN_DATA_FORMAT\nCMYK_C CMYK_M CMYK_Y CMYK_K XYZ_X XYZ_Y XYZ_Z\nEND_DATA_FORMAT\n\
                    BEGIN_DATA\n0 0 0 0 96.42 100 82.49\nEND_DATA\n";
        let m = Measurements::parse("x.txt", text).unwrap();
        let l = m.patches[0].lab;
        assert!(
            (l.l - 100.0).abs() < 1e-3 && l.a.abs() < 0.02 && l.b.abs() < 0.02,
            "{l:?}"
        );
    }

    #[test]
    fn malformed_files_name_the_line() {
        let cases = [
            (SAMPLE.replace("END_DATA\r\n", ""), "END_DATA is missing"),
            (SAMPLE.replace("95.2", "9x.2"), ":15: LAB_L \"9x.2\" is not a number"),
            (
                SAMPLE.replace("48 74 -3", "48 74"),
                ":16: 7 values where the data format names 8 fields",
            ),
            (
                SAMPLE.replace("LAB_L LAB_A LAB_B", "LAB_L LAB_A DENSITY"),
                "lacks LAB_L",
            ),
            (
                SAMPLE.replace("NUMBER_OF_SETS 4", "NUMBER_OF_SETS 5"),
                ":11: NUMBER_OF_SETS says 5",
            ),
            (SAMPLE.replace("\"A 4\"", "\"A 4"), ":16: a quoted string is not closed"),
            (SAMPLE.replace("2\t100 0", "2\t140 0"), ":14: CMYK_C 140 lies outside"),
        ];
        for (text, want) in cases {
            let e = Measurements::parse("bad.txt", &text).unwrap_err().to_string();
            assert!(e.starts_with("bad.txt"), "{e}");
            assert!(e.contains(want), "{e} (want {want})");
            assert!(!e.contains('\n'), "{e}");
        }
    }

    #[test]
    fn inconsistent_repeats_are_reported_largest_first() {
        let text = SAMPLE.replace("95.2 0.2 -2.2", "90.0 0.2 -2.2");
        let m = Measurements::parse("t.txt", &text).unwrap();
        let bad = m.inconsistent_repeats(1.0);
        assert_eq!(bad.len(), 1);
        assert_eq!(bad[0].id, "1");
        assert!(m.inconsistent_repeats(10.0).is_empty());
    }

    /// A data file with spectral bands `nm` and one row per spectrum.
    fn spectral_file(nm: &[u32], rows: &[Vec<f64>], with_underscore: bool) -> String {
        let names: Vec<String> = nm
            .iter()
            .map(|w| {
                if with_underscore {
                    format!("SPECTRAL_NM_{w}")
                } else {
                    format!("SPECTRAL_NM{w}")
                }
            })
            .collect();
        let mut t = format!(
            "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID CMYK_C CMYK_M CMYK_Y CMYK_K {}\nEND_DATA_FORMAT\nBEGIN_DATA\n",
            names.join(" ")
        );
        for (i, r) in rows.iter().enumerate() {
            let v: Vec<String> = r.iter().map(|x| format!("{x}")).collect();
            t.push_str(&format!("{} {} 0 0 0 {}\n", i + 1, i * 10, v.join(" ")));
        }
        t + "END_DATA\n"
    }

    #[test]
    fn spectral_data_becomes_cielab_in_fractions_or_percent() {
        let nm: Vec<u32> = (380..=730).step_by(10).collect();
        let flat: Vec<f64> = vec![0.5; nm.len()];
        let ramp: Vec<f64> = (0..nm.len()).map(|i| 0.1 + 0.02 * i as f64).collect();
        let a = Measurements::parse("f.txt", &spectral_file(&nm, &[flat.clone(), ramp.clone()], false)).unwrap();
        assert_eq!(a.colour_fields, ColourFields::Spectral);
        // A flat 50 % reflector: neutral, L* = 116 · 0.5^(1/3) − 16 (CIE 015:2018, 8.2.1).
        let p = &a.patches[0].lab;
        assert!((p.l - (116.0 * 0.5f64.cbrt() - 16.0)).abs() < 1e-9 && p.a.abs() < 1e-9 && p.b.abs() < 1e-9);
        // The same spectra in percent, with the other way of naming bands.
        let pct = |r: &Vec<f64>| r.iter().map(|v| v * 100.0).collect::<Vec<f64>>();
        let b = Measurements::parse("p.txt", &spectral_file(&nm, &[pct(&flat), pct(&ramp)], true)).unwrap();
        for (x, y) in a.patches.iter().zip(&b.patches) {
            assert!(crate::color::delta::delta_e00(x.lab, y.lab) < 1e-9);
        }
        // A red-rising ramp is yellowish red: a* > 0, b* > 0.
        let r = &a.patches[1].lab;
        assert!(r.a > 0.0 && r.b > 0.0, "{r:?}");
    }

    #[test]
    fn spectral_bands_must_cover_the_visible() {
        let nm: Vec<u32> = (420..=700).step_by(10).collect();
        let e = Measurements::parse("n.txt", &spectral_file(&nm, &[vec![0.5; nm.len()]], false)).unwrap_err();
        assert_eq!(
            e.to_string(),
            "n.txt: spectral bands must cover at least 400 to 700 nm (they cover 420 to 700 nm)"
        );
        let uneven = [380, 390, 410, 420];
        let e = Measurements::parse("u.txt", &spectral_file(&uneven, &[vec![0.5; 4]], false)).unwrap_err();
        assert!(e.to_string().contains("evenly spaced"), "{e}");
    }
}
