//! The text table of `inkfit repair`: original → repaired per entry, then
//! the closest printed pair before and after and what still fails.

use std::io::Write;

use super::table::{Align, Table, Tone};
use crate::precision::fixed;
use crate::swatch::repair::RepairReport;

/// The original → repaired table and what still fails.
pub fn render(w: &mut dyn Write, r: &RepairReport, out_name: &str) -> std::io::Result<()> {
    writeln!(w, "palette  {} → {}", r.palette, out_name)?;
    writeln!(w, "screen   {}   press {}", r.conditions.screen, r.conditions.press)?;
    writeln!(w, "method   {}", r.method)?;
    writeln!(w)?;
    if r.unchanged {
        writeln!(
            w,
            "already printable: every colour inside the press gamut and every check holds; written unchanged"
        )?;
        writeln!(w)?;
    }
    let mut t = Table::new(&[
        ("#", Align::Right),
        ("name", Align::Left),
        ("original", Align::Left),
        ("repaired", Align::Left),
        ("ΔE00 moved", Align::Right),
        ("screen L* a* b*", Align::Right),
        ("press CMYK %", Align::Right),
        ("printed L* a* b*", Align::Right),
    ]);
    for (i, e) in r.entries.iter().enumerate() {
        t.row(vec![
            ((i + 1).to_string(), Tone::Plain),
            (e.name.clone(), Tone::Plain),
            (e.original.clone(), Tone::Plain),
            (
                if e.changed {
                    e.repaired.clone()
                } else {
                    "(unchanged)".to_string()
                },
                Tone::Plain,
            ),
            (fixed(e.moved, 2), Tone::Plain),
            (lab_text(e.repaired_screen_lab), Tone::Plain),
            (
                format!(
                    "{} {} {} {}",
                    fixed(e.press_cmyk[0], 0),
                    fixed(e.press_cmyk[1], 0),
                    fixed(e.press_cmyk[2], 0),
                    fixed(e.press_cmyk[3], 0)
                ),
                Tone::Plain,
            ),
            (lab_text(e.printed_lab), Tone::Plain),
        ]);
    }
    t.write(w, false)?;
    writeln!(w)?;
    writeln!(
        w,
        "closest printed pair ΔE00: before {}, after {} (floor {})",
        fixed(r.before.separation.min_print, 2),
        fixed(r.after.separation.min_print, 2),
        fixed(r.after.separation.min_separation, 1)
    )?;
    if r.all_met() {
        writeln!(w, "every constraint holds")
    } else {
        writeln!(
            w,
            "could not meet every constraint; this is the best compromise found. Still failing:"
        )?;
        for u in &r.unmet {
            writeln!(w, "  - {u}")?;
        }
        Ok(())
    }
}

/// CIELAB as three numbers of one decimal, space-separated.
fn lab_text(v: [f64; 3]) -> String {
    format!("{} {} {}", fixed(v[0], 1), fixed(v[1], 1), fixed(v[2], 1))
}
