//! The text rendering of `inkfit gamut`: one table of profiles, one of the
//! largest chroma per hue sector, and the coverage of every pair as a table
//! and in words.

use std::io::{self, Write};

use super::table::{Align, Table, Tone};
use crate::gamut::result::{GamutReport, ProfileGamut};
use crate::gamut::DeviceKind;

/// Thousands separated by commas, no decimals.
pub(crate) fn grouped(v: f64) -> String {
    let n = v.round() as i64;
    let digits = n.unsigned_abs().to_string();
    let mut out = String::new();
    for (i, ch) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(ch);
    }
    if n < 0 {
        format!("-{out}")
    } else {
        out
    }
}

/// A share 0..1 in percent, one decimal.
pub(crate) fn pct(share: f64) -> String {
    format!("{:.1} %", share * 100.0)
}

/// A profile's total-ink limit in words, with where it comes from; `None`
/// for RGB.
pub(crate) fn ink_limit_words(p: &ProfileGamut) -> Option<String> {
    match (p.ink_limit, p.ink_limit_source) {
        (Some(l), Some("measured")) => Some(format!("{l:.1} % (measured from its CIELAB → CMYK table)")),
        (Some(l), _) => Some(format!("{l:.1} % (given)")),
        _ => None,
    }
}

/// Writes the `gamut` result as text.
pub fn render(w: &mut dyn Write, r: &GamutReport) -> io::Result<()> {
    let mut t = Table::new(&[
        ("profile", Align::Left),
        ("kind", Align::Left),
        ("volume (ΔE*ab³)", Align::Right),
        ("darkest L*", Align::Right),
        ("lightest L*", Align::Right),
        ("total-ink limit", Align::Left),
    ]);
    for p in &r.profiles {
        let plain = |s: String| (s, Tone::Plain);
        t.row(vec![
            plain(p.name.clone()),
            plain(match p.kind {
                DeviceKind::Rgb => "RGB".to_string(),
                DeviceKind::Cmyk => "CMYK".to_string(),
            }),
            plain(grouped(p.volume)),
            plain(format!("{:.2}", p.l_min)),
            plain(format!("{:.2}", p.l_max)),
            plain(ink_limit_words(p).unwrap_or_else(|| "-".to_string())),
        ]);
    }
    t.write(w, false)?;
    writeln!(w)?;
    writeln!(w, "largest chroma C*ab per hue sector, with the L* where it is reached")?;
    let mut heads: Vec<(String, Align)> = vec![("hue h_ab".to_string(), Align::Left)];
    for p in &r.profiles {
        heads.push((p.name.clone(), Align::Right));
    }
    let head_refs: Vec<(&str, Align)> = heads.iter().map(|(s, a)| (s.as_str(), *a)).collect();
    let mut t = Table::new(&head_refs);
    let sectors = r.profiles.first().map_or(0, |p| p.hue_sectors.len());
    for s in 0..sectors {
        let first = &r.profiles[0].hue_sectors[s];
        let mut row = vec![(format!("{:>3.0}–{:.0}°", first.hue_from, first.hue_to), Tone::Plain)];
        for p in &r.profiles {
            let h = &p.hue_sectors[s];
            row.push((format!("{:.1} at L* {:.1}", h.max_chroma, h.l_at_max), Tone::Plain));
        }
        t.row(row);
    }
    t.write(w, false)?;
    if !r.coverage.is_empty() {
        writeln!(w)?;
        let mut t = Table::new(&[
            ("A", Align::Left),
            ("B", Align::Left),
            ("share of A inside B", Align::Right),
            ("A ∩ B (ΔE*ab³)", Align::Right),
        ]);
        for c in &r.coverage {
            t.row(vec![
                (c.a.clone(), Tone::Plain),
                (c.b.clone(), Tone::Plain),
                (pct(c.a_inside_b), Tone::Plain),
                (grouped(c.intersection_volume), Tone::Plain),
            ]);
        }
        t.write(w, false)?;
        writeln!(w)?;
        for line in coverage_sentences(r) {
            writeln!(w, "{line}")?;
        }
    }
    for m in &r.meshes {
        writeln!(
            w,
            "mesh of {} written to {} ({} vertices, {} triangles)",
            m.profile, m.file, m.vertices, m.triangles
        )?;
    }
    for m in &r.method {
        writeln!(w, "method: {m}")?;
    }
    Ok(())
}

/// Each unordered pair's coverage in words, both ways when both were
/// measured: "B holds x % of A, and A holds y % of B."
pub(crate) fn coverage_sentences(r: &GamutReport) -> Vec<String> {
    let mut out = Vec::new();
    for (i, c) in r.coverage.iter().enumerate() {
        // Each unordered pair once, with its reverse.
        let reverse = r.coverage.iter().position(|d| d.a == c.b && d.b == c.a);
        if reverse.is_some_and(|j| j < i) {
            continue;
        }
        out.push(match reverse.map(|j| &r.coverage[j]) {
            Some(d) => format!(
                "{} holds {} of {}, and {} holds {} of {}.",
                c.b,
                pct(c.a_inside_b),
                c.a,
                d.b,
                pct(d.a_inside_b),
                d.a
            ),
            None => format!("{} holds {} of {}.", c.b, pct(c.a_inside_b), c.a),
        });
    }
    out
}

#[cfg(test)]
mod tests {
    use super::grouped;

    #[test]
    fn thousands_are_grouped() {
        assert_eq!(grouped(830123.4), "830,123");
        assert_eq!(grouped(999.0), "999");
        assert_eq!(grouped(1000.0), "1,000");
    }
}
