//! What the fuzz targets share: the properties every accepted input must have
//! beyond "does not panic", and the scratch file the image target decodes
//! from.
//!
//! A property that fails panics with a message starting `property:`, so a
//! finding says which promise broke. A property can be switched off while a
//! known bug against it is open: `.ci/fuzz` passes the names listed in
//! `fuzz/known-issues.txt` in `INKFIT_FUZZ_KNOWN` (comma-separated).

use std::fs::File;
use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::OnceLock;

use inkfit::color::css::ColorInput;
use inkfit::swatch::{Format, Palette};

/// True when property `name` is listed in `INKFIT_FUZZ_KNOWN` as broken by an
/// open bug, and so is not checked.
pub fn known(name: &str) -> bool {
    static KNOWN: OnceLock<Vec<String>> = OnceLock::new();
    KNOWN
        .get_or_init(|| {
            std::env::var("INKFIT_FUZZ_KNOWN")
                .unwrap_or_default()
                .split(',')
                .map(|s| s.trim().to_string())
                .filter(|s| !s.is_empty())
                .collect()
        })
        .iter()
        .any(|k| k == name)
}

/// Every number in a parsed colour is finite, and screen RGB and press CMYK
/// lie in the ranges the parser clamps them to (0..1 and 0..100 percent).
/// CIELAB is only required to be finite: the CSS conversions may leave L*
/// slightly outside 0..100 (`oklch(0 0.2 255)`). Everything downstream (ICC
/// transforms, ΔE, sorting by distance) assumes finite numbers. Property
/// name: `nonfinite-lab`.
pub fn check_color(text: &str, c: &ColorInput) {
    match *c {
        ColorInput::ScreenRgb(rgb) => {
            assert!(
                rgb.iter().all(|v| (0.0..=1.0).contains(v)),
                "property: screen RGB outside 0..1 (or NaN) from {text:?}: {rgb:?}"
            );
        }
        ColorInput::Lab(lab) => {
            if known("nonfinite-lab") {
                return;
            }
            assert!(
                lab.l.is_finite() && lab.a.is_finite() && lab.b.is_finite(),
                "property: non-finite CIELAB from {text:?}: {lab:?}"
            );
        }
        ColorInput::DeviceCmyk(cmyk) => {
            assert!(
                cmyk.iter().all(|v| (0.0..=100.0).contains(v)),
                "property: device CMYK outside 0..100 % (or NaN) from {text:?}: {cmyk:?}"
            );
        }
    }
}

/// Parses `data` as a palette in `format`, then checks what an accepted
/// palette promises: at least one entry, 1-based line numbers (and a
/// plain-text entry's colour text found on its line), and every colour as
/// [`check_color`] says.
/// Error messages are rendered too, since the CLI prints them.
pub fn palette(data: &[u8], format: Format) {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    match Palette::parse("fuzz-input", text, format) {
        Ok(p) => {
            assert!(!p.entries.is_empty(), "property: an accepted palette is empty");
            let lines = text.lines().count().max(1);
            for e in &p.entries {
                check_color(&e.input, &e.color);
                assert!(e.line >= 1, "property: entry line numbers are 1-based: {e:?}");
                match format {
                    // The csv crate counts lines by '\n' alone, so a file with
                    // bare '\r' line ends numbers every record line 1.
                    Format::Csv => {}
                    // Plain text: the colour is a piece of its line.
                    Format::Text => {
                        assert!(e.line <= lines, "property: line {} of a {lines}-line text", e.line);
                        let line = text.lines().nth(e.line - 1).unwrap_or_default();
                        assert!(
                            line.contains(e.input.as_str()),
                            "property: colour text {:?} is not on its line {}",
                            e.input,
                            e.line
                        );
                    }
                    // JSON: the entry number.
                    Format::Json => {}
                    // SVG and map styles: the line of the first use, and how it is used.
                    Format::Svg | Format::Sld => {
                        assert!(e.line <= lines, "property: line {} of a {lines}-line SVG", e.line);
                        let u = e.usage.as_ref().expect("property: an artwork colour has its usage");
                        assert!(
                            u.uses >= 1 && u.opacity > 0.0 && u.opacity <= 1.0,
                            "property: usage {u:?}"
                        );
                    }
                    // Images are not parsed from text.
                    Format::MapImage | Format::Jpeg => panic!("property: an image format parsed as text"),
                }
            }
        }
        Err(e) => {
            let _ = e.to_string();
        }
    }
}

/// A file in a memory-backed directory (`/dev/shm` when it exists, else the
/// system temporary directory), one per process, rewritten for every input.
pub fn scratch_file(data: &[u8]) -> &'static Path {
    static PATH: OnceLock<PathBuf> = OnceLock::new();
    let path = PATH.get_or_init(|| {
        let shm = Path::new("/dev/shm");
        let dir = if shm.is_dir() {
            shm.to_path_buf()
        } else {
            std::env::temp_dir()
        };
        dir.join(format!("inkfit-fuzz-{}.img", std::process::id()))
    });
    let mut f = File::create(path).expect("the scratch file can be written");
    f.write_all(data).expect("the scratch file can be written");
    path
}

/// CGATS.17 measurement text: parsed or refused with a one-line error that
/// names the file; every accepted patch has finite CMYK in 0..100 %, finite
/// CIELAB, a 1-based line and at least one repeat.
pub fn cgats(data: &[u8]) {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    match inkfit::press::cgats::Measurements::parse("fuzz-input", text) {
        Ok(m) => {
            assert!(m.patches.len() <= m.rows, "property: no more patches than rows");
            for p in &m.patches {
                assert!(p.cmyk.iter().all(|v| (0.0..=100.0).contains(v)), "property: CMYK in range: {p:?}");
                assert!(
                    [p.lab.l, p.lab.a, p.lab.b, p.spread_de00].iter().all(|v| v.is_finite()),
                    "property: finite CIELAB: {p:?}"
                );
                assert!(p.line >= 1 && p.repeats >= 1, "property: line and repeats: {p:?}");
            }
        }
        Err(e) => {
            let msg = e.to_string();
            assert!(msg.starts_with("fuzz-input"), "property: the error names the file: {msg}");
            assert!(!msg.contains('\n'), "property: one line: {msg}");
        }
    }
}
