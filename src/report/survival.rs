//! Text rendering of the palette-survival section of `inkfit check`:
//! collapsed pairs first, then separation, order and colour-vision results.

use std::io::{self, Write};

use super::table::{Align, Table, Tone};
use crate::swatch::adjacency::AdjacencySource;
use crate::swatch::order::Order;
use crate::swatch::separation::{FlaggedPair, Separation};
use crate::swatch::survival::{CvdReport, Survival, Verdict};

use super::fixed as f;

fn why(p: &FlaggedPair) -> String {
    let floor = match p.touching {
        Some(false) => format!("legend floor {}", f(p.floor, 1)),
        _ => f(p.floor, 1),
    };
    match (p.below_floor, p.lost_half) {
        (true, true) => format!("below {floor} and lost over half"),
        (true, false) => format!("below {floor}"),
        _ => "lost over half".to_string(),
    }
}

/// How a pair lies on the map: "touch, 340 px", "touch" or "apart".
fn lies(p: &FlaggedPair) -> String {
    match p.touching {
        Some(true) => match p.border_px {
            Some(b) => format!("touch, {b} px"),
            None => "touch".to_string(),
        },
        Some(false) => "apart".to_string(),
        None => "unknown".to_string(),
    }
}

fn pair_table(w: &mut dyn Write, pairs: &[FlaggedPair], sep: &Separation, color: bool) -> io::Result<()> {
    let map = sep.adjacency.is_some();
    let mut head = vec![("pair", Align::Left), ("names", Align::Left)];
    if map {
        head.push(("on the map", Align::Left));
    }
    head.extend([("screen", Align::Right), ("print", Align::Right), ("why", Align::Left)]);
    let mut t = Table::new(&head);
    for p in pairs {
        let mut row = vec![
            (format!("{}–{}", p.a, p.b), Tone::Plain),
            (format!("{} / {}", p.a_name, p.b_name), Tone::Plain),
        ];
        if map {
            row.push((lies(p), Tone::Plain));
        }
        row.extend([
            (f(p.screen, 2), Tone::Plain),
            (f(p.print, 2), if p.below_floor { Tone::Bad } else { Tone::Plain }),
            (why(p), Tone::Bad),
        ]);
        t.row(row);
    }
    t.write(w, color)
}

/// Most rows of one pair table in the text report; the JSON lists more.
const TEXT_PAIR_ROWS: usize = 25;

/// The first [`TEXT_PAIR_ROWS`] of `pairs` (smallest printed ΔE00 first) of
/// `count` in all, and a line for the rest.
fn shown_pairs(
    w: &mut dyn Write,
    pairs: &[FlaggedPair],
    count: usize,
    sep: &Separation,
    color: bool,
) -> io::Result<()> {
    pair_table(w, &pairs[..pairs.len().min(TEXT_PAIR_ROWS)], sep, color)?;
    let shown = pairs.len().min(TEXT_PAIR_ROWS);
    if count > shown {
        writeln!(
            w,
            "  … and {} more, the closest shown first (--json lists up to {})",
            count - shown,
            crate::swatch::separation::MAX_PAIRS_LISTED
        )?;
    }
    Ok(())
}

/// The section after the per-colour table.
pub fn render_survival(w: &mut dyn Write, s: &Survival, names: &[String], color: bool) -> io::Result<()> {
    render_separation(w, s, names, color)?;
    if let Some(o) = &s.order {
        render_order(w, o, color)?;
    }
    if let Some(c) = &s.cvd {
        render_cvd(w, c, &s.separation, color)?;
    }
    render_palette_verdict(w, s)
}

/// The separation section: collapsed and halved pairs, closest pairs.
fn render_separation(w: &mut dyn Write, s: &Survival, names: &[String], color: bool) -> io::Result<()> {
    let sep = &s.separation;
    let name = |i: usize| names.get(i.wrapping_sub(1)).map_or("?", |n| n.as_str());
    let pair_words = |p: Option<[usize; 2]>| p.map_or(String::new(), |[a, b]| format!(" ({} / {})", name(a), name(b)));
    writeln!(w)?;
    match (sep.adjacency, sep.min_legend_separation, sep.touching_pairs) {
        (Some(source), Some(legend), Some(touching)) => writeln!(
            w,
            "separation  {} scheme, floor ΔE00 {} between the {touching} pair{} of classes that touch ({}), legend floor {} between the others",
            s.scheme,
            f(sep.min_separation, 1),
            if touching == 1 { "" } else { "s" },
            match source {
                AdjacencySource::Map => "found on the map",
                AdjacencySource::File => "as the adjacency file gives them",
                AdjacencySource::Render => "found by rendering the artwork; a colour that paints no areas there keeps the full floor",
            },
            f(legend, 1)
        )?,
        _ => writeln!(
            w,
            "separation  {} scheme, floor ΔE00 {} between every pair (a rule of thumb for classes told apart at a glance)",
            s.scheme,
            f(sep.min_separation, 1)
        )?,
    }
    let collapsed: Vec<FlaggedPair> = sep.flagged.iter().filter(|p| p.below_floor).cloned().collect();
    if sep.below_floor_count == 0 {
        writeln!(w, "  no pair collapses in print")?;
    } else {
        writeln!(
            w,
            "  {} COLLAPSE in print:",
            if sep.below_floor_count == 1 {
                "1 pair".to_string()
            } else {
                format!("{} pairs", sep.below_floor_count)
            }
        )?;
        shown_pairs(w, &collapsed, sep.below_floor_count, sep, color)?;
    }
    let halved: Vec<FlaggedPair> = sep.flagged.iter().filter(|p| !p.below_floor).cloned().collect();
    let halved_count = sep.flagged_count - sep.below_floor_count;
    if halved_count > 0 {
        writeln!(w, "  still above the floor but lost over half their screen difference:")?;
        shown_pairs(w, &halved, halved_count, sep, color)?;
    }
    writeln!(
        w,
        "  closest pair on screen ΔE00 {}{}, in print {}{}",
        f(sep.min_screen, 2),
        pair_words(sep.min_screen_pair),
        f(sep.min_print, 2),
        pair_words(sep.min_print_pair)
    )?;
    Ok(())
}

/// The lightness order section of a sequential or diverging scheme.
fn render_order(w: &mut dyn Write, o: &Order, color: bool) -> io::Result<()> {
    writeln!(w)?;
    writeln!(
        w,
        "order       lightness along {}; smallest step ΔE00 {}",
        o.arms
            .iter()
            .map(|a| format!(
                "{} arm {} ({})",
                a.arm,
                a.direction,
                a.entries.iter().map(|e| e.to_string()).collect::<Vec<_>>().join("→")
            ))
            .collect::<Vec<_>>()
            .join(", "),
        f(o.min_step, 1)
    )?;
    writeln!(
        w,
        "  monotonic on screen: {}, in print: {}; unevenness (largest / smallest step) screen {}, print {}",
        if o.monotonic_screen { "yes" } else { "NO" },
        if o.monotonic_print { "yes" } else { "NO" },
        o.unevenness_screen.map_or("-".to_string(), |v| f(v, 2)),
        o.unevenness_print.map_or("-".to_string(), |v| f(v, 2)),
    )?;
    let mut t = Table::new(&[
        ("arm", Align::Left),
        ("step", Align::Left),
        ("screen ΔE00", Align::Right),
        ("print ΔE00", Align::Right),
        ("screen ΔL*", Align::Right),
        ("print ΔL*", Align::Right),
        ("problem", Align::Left),
    ]);
    for st in &o.steps {
        let mut p = Vec::new();
        if st.reverses_screen {
            p.push("reverses on screen");
        }
        if st.reverses_print {
            p.push("reverses in print");
        }
        if st.too_small_screen {
            p.push("small on screen");
        }
        if st.too_small_print {
            p.push("small in print");
        }
        t.row(vec![
            (st.arm.to_string(), Tone::Plain),
            (format!("{}→{}", st.from, st.to), Tone::Plain),
            (f(st.screen, 2), Tone::Plain),
            (f(st.print, 2), if st.too_small_print { Tone::Bad } else { Tone::Plain }),
            (f(st.screen_dl, 2), Tone::Plain),
            (
                f(st.print_dl, 2),
                if st.reverses_print { Tone::Bad } else { Tone::Plain },
            ),
            (p.join(", "), Tone::Bad),
        ]);
    }
    t.write(w, color)?;
    if let Some(sym) = &o.symmetry {
        writeln!(
            w,
            "  symmetry: matching printed steps differ by at most ΔE00 {}; arm totals low {} / high {}",
            f(sym.max_difference, 2),
            f(sym.low_total, 2),
            f(sym.high_total, 2)
        )?;
    }
    Ok(())
}

/// The colour-vision deficiency section.
fn render_cvd(w: &mut dyn Write, c: &CvdReport, sep: &Separation, color: bool) -> io::Result<()> {
    writeln!(w)?;
    writeln!(
        w,
        "colour-vision deficiency  printed colours simulated (Machado, Oliveira & Fernandes 2009, in linear sRGB)"
    )?;
    for (d, r) in c.iter() {
        writeln!(
            w,
            "  {d} (severity {}): closest pair ΔE00 {} on screen, {} in print; {} pair{} flagged",
            f(r.severity, 2),
            f(r.min_screen, 2),
            f(r.min_print, 2),
            r.flagged_count,
            if r.flagged_count == 1 { "" } else { "s" }
        )?;
        if r.flagged_count > 0 {
            shown_pairs(w, &r.flagged, r.flagged_count, sep, color)?;
        }
    }
    Ok(())
}

/// The last line of the palette checks, in words.
fn render_palette_verdict(w: &mut dyn Write, s: &Survival) -> io::Result<()> {
    writeln!(w)?;
    if s.passes {
        let (what, verb) = if s.order.is_some() {
            ("separation and lightness order", "hold")
        } else {
            ("separation", "holds")
        };
        let cvd = if s.cvd.is_some() {
            ", also under the simulated deficiencies"
        } else {
            ""
        };
        writeln!(w, "palette checks: {what} {verb}{cvd}")?;
    } else {
        let details: Vec<&str> = s.problems.iter().map(|p| p.detail.as_str()).collect();
        writeln!(w, "palette checks: {}", details.join("; "))?;
    }
    Ok(())
}

/// The last line of `inkfit check`: the one verdict, in plain words.
pub fn render_verdict(w: &mut dyn Write, v: &Verdict) -> io::Result<()> {
    if v.passes {
        writeln!(
            w,
            "verdict: passes (every colour within tolerance and printable, every palette check holds)"
        )
    } else {
        let details: Vec<&str> = v.reasons.iter().map(|p| p.detail.as_str()).collect();
        writeln!(w, "verdict: fails ({})", details.join("; "))
    }
}
