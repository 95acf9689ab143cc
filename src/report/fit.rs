//! The report of `build-press --from`: how the condition was fitted and how
//! well it predicts the measurements, on the data and held out.

use std::io::{self, Write};

use super::lab3;
use super::table::{Align, Table, Tone};
use crate::precision::fixed;
use crate::press::fit::{ErrorStats, FitReport, PatchError};

fn stats_row(t: &mut Table, what: &str, s: &ErrorStats) {
    t.row(vec![
        (what.to_string(), Tone::Plain),
        (fixed(s.mean, 2), Tone::Plain),
        (fixed(s.p95, 2), Tone::Plain),
        (fixed(s.max, 2), Tone::Plain),
    ]);
}

fn patch_table(w: &mut dyn Write, rows: &[PatchError]) -> io::Result<()> {
    let mut t = Table::new(&[
        ("patch", Align::Left),
        ("line", Align::Right),
        ("C M Y K %", Align::Left),
        ("measured L* a* b*", Align::Left),
        ("fitted L* a* b*", Align::Left),
        ("ΔE00", Align::Right),
    ]);
    for e in rows {
        t.row(vec![
            (e.id.clone(), Tone::Plain),
            (e.line.to_string(), Tone::Plain),
            (
                e.cmyk.iter().map(|v| fixed(*v, 0)).collect::<Vec<_>>().join(" "),
                Tone::Plain,
            ),
            (lab3(e.measured), Tone::Plain),
            (lab3(e.predicted), Tone::Plain),
            (fixed(e.delta_e00, 2), Tone::Plain),
        ]);
    }
    t.write(w, false)
}

/// Writes the fit report as text.
pub fn render_fit(w: &mut dyn Write, r: &FitReport) -> io::Result<()> {
    writeln!(
        w,
        "data     {}: {} rows, {} distinct patches, {} of 16 corner patches measured",
        r.source, r.rows, r.patches, r.corners_measured
    )?;
    writeln!(w, "paper    L* a* b* {} (the media white)", lab3(r.paper_lab))?;
    writeln!(
        w,
        "model    Yule–Nielsen n {}; TVI at 50 % C {} M {} Y {} K {} %",
        fixed(r.yule_nielsen_n, 2),
        fixed(r.tvi50_percent[0], 1),
        fixed(r.tvi50_percent[1], 1),
        fixed(r.tvi50_percent[2], 1),
        fixed(r.tvi50_percent[3], 1)
    )?;
    writeln!(
        w,
        "correct  {}⁴ lattice, smoothing {} (chosen by cross-validation), largest offset ΔE*ab {}",
        r.correction_nodes,
        r.smoothing,
        fixed(r.largest_correction, 2)
    )?;
    writeln!(
        w,
        "ink      limit {} % C+M+Y+K, {} black generation",
        fixed(r.ink_limit_percent, 0),
        r.black.name()
    )?;
    writeln!(w)?;
    writeln!(w, "fit accuracy, CIEDE2000, media-relative")?;
    let mut t = Table::new(&[
        ("", Align::Left),
        ("mean", Align::Right),
        ("p95", Align::Right),
        ("max", Align::Right),
    ]);
    stats_row(&mut t, "model alone, on the data", &r.model_only);
    stats_row(&mut t, "fitted, on the data", &r.on_data);
    stats_row(
        &mut t,
        &format!("fitted, held out ({}-fold, {} patches)", r.folds, r.held_out),
        &r.cross_validated,
    );
    t.write(w, false)?;
    if !r.worst.is_empty() {
        writeln!(w)?;
        writeln!(w, "worst held-out patches")?;
        patch_table(w, &r.worst)?;
    }
    writeln!(w)?;
    if r.suspect.is_empty() {
        writeln!(w, "suspect  none: every patch agrees with what its neighbours predict")?;
    } else {
        writeln!(
            w,
            "suspect  {} patch(es) far from what their neighbours predict: measure them again",
            r.suspect.len()
        )?;
        patch_table(w, &r.suspect)?;
    }
    if r.inconsistent_repeats.is_empty() {
        writeln!(w, "repeats  consistent")?;
    } else {
        writeln!(
            w,
            "repeats  {} patch(es) whose repeats disagree:",
            r.inconsistent_repeats.len()
        )?;
        let mut t = Table::new(&[
            ("patch", Align::Left),
            ("line", Align::Right),
            ("repeats", Align::Right),
            ("spread ΔE00", Align::Right),
        ]);
        for s in &r.inconsistent_repeats {
            t.row(vec![
                (s.id.clone(), Tone::Plain),
                (s.line.to_string(), Tone::Plain),
                (s.repeats.to_string(), Tone::Plain),
                (fixed(s.spread_de00, 2), Tone::Plain),
            ]);
        }
        t.write(w, false)?;
    }
    Ok(())
}
