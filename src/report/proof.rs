//! The text table of a `proof` run: one row per image, shares in percent of
//! pixels.

use std::io::{self, Write};

use super::table::{Align, Table, Tone};
use crate::precision::fixed as f;
use crate::proof::result::{ProfileSource, ProofReport};

fn pct(share: f64) -> String {
    format!("{:.1}", share * 100.0)
}

/// The table: one row per image; shares in percent of pixels.
pub fn render(w: &mut dyn Write, r: &ProofReport, color: bool) -> io::Result<()> {
    writeln!(w, "screen   {}", r.conditions.screen)?;
    writeln!(w, "press    {}", r.conditions.press)?;
    writeln!(
        w,
        "mapping  {}, BPC {}, shown {}",
        r.conditions.intent,
        if r.conditions.bpc { "on" } else { "off" },
        if r.conditions.paper_white {
            "on paper white (absolute colorimetric)"
        } else {
            "media-relative (relative colorimetric)"
        }
    )?;
    writeln!(w)?;
    let mut t = Table::new(&[
        ("image", Align::Left),
        ("profile", Align::Left),
        (">1 %", Align::Right),
        (">2 %", Align::Right),
        (">3 %", Align::Right),
        (">5 %", Align::Right),
        (">10 %", Align::Right),
        ("mean", Align::Right),
        ("p50", Align::Right),
        ("p95", Align::Right),
        ("p99", Align::Right),
        ("max", Align::Right),
        ("out of gamut %", Align::Right),
    ]);
    for i in &r.images {
        let s = &i.stats;
        let plain = |x: String| (x, Tone::Plain);
        let profile = match i.profile_source {
            ProfileSource::Embedded => "embedded".to_string(),
            ProfileSource::Assumed => format!("{} (assumed)", i.profile),
        };
        t.row(vec![
            plain(i.input.clone()),
            plain(profile),
            plain(pct(s.share_above.above_1)),
            plain(pct(s.share_above.above_2)),
            plain(pct(s.share_above.above_3)),
            plain(pct(s.share_above.above_5)),
            plain(pct(s.share_above.above_10)),
            plain(f(s.mean, 2)),
            plain(f(s.p50, 2)),
            (f(s.p95, 2), if i.within_tolerance { Tone::Good } else { Tone::Bad }),
            plain(f(s.p99, 2)),
            plain(f(s.max, 2)),
            plain(pct(s.outside_gamut)),
        ]);
    }
    t.write(w, color)?;
    writeln!(w)?;
    writeln!(
        w,
        "ΔE00 is CIEDE2000 between each pixel and its print; tolerance (p95) {:.2}",
        r.conditions.tolerance
    )?;
    writeln!(w, "gamut test: {}", r.conditions.gamut_test_method)?;
    for i in &r.images {
        write!(w, "{} → {}", i.input, i.output)?;
        if let Some(m) = &i.delta_map {
            write!(w, ", map {m}")?;
        }
        writeln!(w)?;
    }
    for n in &r.conditions.notes {
        writeln!(w, "note: {n}")?;
    }
    Ok(())
}
