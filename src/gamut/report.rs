//! The `inkfit gamut` result as plain values (rounded for stable output) and
//! its text rendering: one table of profiles, one of the largest chroma per
//! hue sector, and the coverage of every pair as a table and in words.

use crate::precision::round;
use std::io::{self, Write};

use serde::Serialize;

use super::{Coverage, DeviceKind, Gamut};
use crate::report::table::{Align, Table, Tone};

#[derive(Clone, Debug, Serialize)]
pub struct GamutReport {
    pub profiles: Vec<ProfileGamut>,
    pub coverage: Vec<Coverage>,
    /// How the solids were computed, in words.
    pub method: Vec<String>,
    /// Mesh files written, in profile order.
    pub meshes: Vec<MeshFile>,
}

#[derive(Clone, Debug, Serialize)]
pub struct ProfileGamut {
    pub name: String,
    pub kind: DeviceKind,
    /// Cubic CIELAB units, rounded to a whole number.
    pub volume: f64,
    pub l_min: f64,
    pub l_max: f64,
    /// Total-ink limit in percent for CMYK, null for RGB.
    pub ink_limit: Option<f64>,
    /// "measured" (from the profile's CIELAB → CMYK table) or "given".
    pub ink_limit_source: Option<&'static str>,
    pub hue_sectors: Vec<super::HueSector>,
}

#[derive(Clone, Debug, Serialize)]
pub struct MeshFile {
    pub profile: String,
    pub file: String,
    pub vertices: usize,
    pub triangles: usize,
}

impl GamutReport {
    pub fn new(gamuts: &[Gamut], coverage: Vec<Coverage>, meshes: Vec<MeshFile>) -> GamutReport {
        let profiles = gamuts
            .iter()
            .map(|g| ProfileGamut {
                name: g.name.clone(),
                kind: g.kind,
                volume: round(g.volume, 0),
                l_min: round(g.l_min, 2),
                l_max: round(g.l_max, 2),
                ink_limit: g.ink_limit.map(|l| round(l.percent, 1)),
                ink_limit_source: g.ink_limit.map(|l| if l.measured { "measured" } else { "given" }),
                hue_sectors: g
                    .hue_sectors
                    .iter()
                    .map(|s| super::HueSector {
                        hue_from: s.hue_from,
                        hue_to: s.hue_to,
                        max_chroma: round(s.max_chroma, 2),
                        l_at_max: round(s.l_at_max, 2),
                    })
                    .collect(),
            })
            .collect();
        let coverage = coverage
            .into_iter()
            .map(|c| Coverage {
                a_inside_b: round(c.a_inside_b, 4),
                intersection_volume: round(c.intersection_volume, 0),
                ..c
            })
            .collect();
        let mut method = Vec::new();
        if gamuts.iter().any(|g| g.kind == DeviceKind::Rgb) {
            method.push(
                "RGB: the six faces of the RGB cube sent through the profile (relative colorimetric) and the enclosed volume by the divergence theorem"
                    .to_string(),
            );
        }
        if gamuts.iter().any(|g| g.kind == DeviceKind::Cmyk) {
            method.push(
                "CMYK: the boundary 3-faces of the ink-limited ink domain sent through the profile (relative colorimetric) and filled into a voxel grid of 1 CIELAB unit"
                    .to_string(),
            );
        }
        if !gamuts.is_empty() && gamuts.len() > 1 {
            method.push("coverage: both solids counted on one shared voxel grid".to_string());
        }
        GamutReport {
            profiles,
            coverage,
            method,
            meshes,
        }
    }
}

/// Thousands separated by commas, no decimals.
fn grouped(v: f64) -> String {
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

fn pct(share: f64) -> String {
    format!("{:.1} %", share * 100.0)
}

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
            plain(match (p.ink_limit, p.ink_limit_source) {
                (Some(l), Some("measured")) => format!("{l:.1} % (measured from its CIELAB → CMYK table)"),
                (Some(l), _) => format!("{l:.1} % (given)"),
                _ => "-".to_string(),
            }),
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
        for (i, c) in r.coverage.iter().enumerate() {
            // Each unordered pair once, with its reverse.
            let reverse = r.coverage.iter().position(|d| d.a == c.b && d.b == c.a);
            if reverse.is_some_and(|j| j < i) {
                continue;
            }
            match reverse.map(|j| &r.coverage[j]) {
                Some(d) => writeln!(
                    w,
                    "{} holds {} of {}, and {} holds {} of {}.",
                    c.b,
                    pct(c.a_inside_b),
                    c.a,
                    d.b,
                    pct(d.a_inside_b),
                    d.a
                )?,
                None => writeln!(w, "{} holds {} of {}.", c.b, pct(c.a_inside_b), c.a)?,
            }
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
