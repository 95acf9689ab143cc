//! Renderers: result structs to text tables for people and JSON for scripts.
//! Every renderer writes to `impl Write` and is deterministic (fixed
//! precision, stable order).

pub mod fit;
pub mod gamut;
pub mod html;
pub mod proof;
pub mod repair;
pub mod survival;
pub mod table;

use std::io::{self, Write};

use serde::Serialize;

use crate::color::LabD50;
use crate::precision::fixed;

use crate::icc::builtin::BuiltinInfo;
use crate::icc::inspect::{ProfileReport, TableReport, TableStatus};
use crate::swatch::check::{CheckReport, InkLimitSource};
use table::{Align, Table, Tone};

/// Pretty JSON with a final newline.
pub fn write_json<T: Serialize>(w: &mut dyn Write, value: &T) -> io::Result<()> {
    serde_json::to_writer_pretty(&mut *w, value)?;
    writeln!(w)
}

/// CIELAB as three fixed-width numbers of one decimal, for tables.
pub fn lab3(v: [f64; 3]) -> String {
    format!("{:>5} {:>6} {:>6}", fixed(v[0], 1), fixed(v[1], 1), fixed(v[2], 1))
}

/// Writes the `check` result as text; with `color` the verdict cells are painted in ANSI colour.
pub fn render_check(w: &mut dyn Write, r: &CheckReport, color: bool) -> io::Result<()> {
    writeln!(w, "palette  {}", r.palette)?;
    writeln!(w, "screen   {}", r.conditions.screen)?;
    writeln!(w, "press    {}", r.conditions.press)?;
    writeln!(
        w,
        "mapping  {}, black point compensation {}{}",
        r.conditions.intent,
        if r.conditions.bpc { "on" } else { "off" },
        if r.conditions.paper_white {
            "; print shown on the paper's own white (absolute colorimetric)"
        } else {
            ""
        }
    )?;
    writeln!(
        w,
        "limit    ΔE00 {} (a rule of thumb, not a standard)",
        fixed(r.conditions.tolerance, 1)
    )?;
    writeln!(w, "gamut    {}", r.conditions.gamut_test_method)?;
    match r.ink_limit {
        Some(l) => writeln!(
            w,
            "ink      limit {} % C+M+Y+K ({}); a colour needing more is not printable",
            fixed(l.percent, 1),
            match l.source {
                InkLimitSource::Measured => "measured from the press profile's Lab → CMYK table",
                InkLimitSource::Given => "given",
            }
        )?,
        None => writeln!(w, "ink      no limit known; no colour is held to one")?,
    }
    for n in &r.conditions.notes {
        writeln!(w, "note     {n}")?;
    }
    writeln!(w)?;
    let shares = r.entries.iter().any(|e| e.share.is_some());
    let mut head = vec![("#", Align::Right), ("name", Align::Left)];
    if shares {
        head.push(("share", Align::Right));
    }
    head.extend([
        ("colour", Align::Left),
        ("screen L* a* b*", Align::Right),
        ("C", Align::Right),
        ("M", Align::Right),
        ("Y", Align::Right),
        ("K", Align::Right),
        ("ink", Align::Right),
        ("printed L* a* b*", Align::Right),
        ("ΔE00", Align::Right),
        ("gamut", Align::Left),
        ("verdict", Align::Left),
    ]);
    let mut t = Table::new(&head);
    for (i, e) in r.entries.iter().enumerate() {
        let plain = |s: String| (s, Tone::Plain);
        let mut row = vec![plain((i + 1).to_string()), plain(e.name.clone())];
        if shares {
            row.push(plain(
                e.share.map_or(String::new(), |v| format!("{} %", fixed(100.0 * v, 1))),
            ));
        }
        row.extend([
            plain(e.input.clone()),
            plain(lab3(e.screen_lab)),
            plain(fixed(e.press_cmyk[0], 0)),
            plain(fixed(e.press_cmyk[1], 0)),
            plain(fixed(e.press_cmyk[2], 0)),
            plain(fixed(e.press_cmyk[3], 0)),
            plain(fixed(e.ink_total, 0)),
            plain(lab3(e.printed_lab)),
            (
                fixed(e.delta_e00, 2),
                if e.within_tolerance { Tone::Plain } else { Tone::Bad },
            ),
            match (e.in_gamut, e.outside_by) {
                (true, _) => plain("inside".into()),
                (false, Some(d)) => (format!("out by {}", fixed(d, 1)), Tone::Bad),
                (false, None) => ("outside".into(), Tone::Bad),
            },
            if e.over_ink_limit {
                ("over ink".into(), Tone::Bad)
            } else if e.within_tolerance {
                ("holds".into(), Tone::Good)
            } else {
                ("shifts".into(), Tone::Bad)
            },
        ]);
        t.row(row);
    }
    t.write(w, color)?;
    let s = &r.summary;
    writeln!(w)?;
    writeln!(
        w,
        "{} colour{}: {} shift beyond ΔE00 {}, {} outside the press gamut{}; largest ΔE00 {} ({}), mean {}",
        s.count,
        if s.count == 1 { "" } else { "s" },
        s.beyond_tolerance,
        fixed(r.conditions.tolerance, 1),
        s.out_of_gamut,
        if s.over_ink_limit > 0 {
            format!(", {} over the ink limit", s.over_ink_limit)
        } else {
            String::new()
        },
        fixed(s.max_delta_e00, 2),
        s.worst,
        fixed(s.mean_delta_e00, 2)
    )?;
    if let Some(u) = r.unclassified_share {
        if u < 0.0005 {
            writeln!(
                w,
                "map      {} class colours; every pixel of the map belongs to one",
                s.count
            )?;
        } else {
            writeln!(
                w,
                "map      {} class colours hold {} % of the map; the other {} % is no class (text, lines, gradients, stray colours)",
                s.count,
                fixed(100.0 * (1.0 - u), 1),
                fixed(100.0 * u, 1)
            )?;
        }
    }
    render_usage(w, r)
}

/// For artwork: how many paints the colours come from, and the colours
/// painted with opacity below 1, whose print depends on what lies beneath.
fn render_usage(w: &mut dyn Write, r: &CheckReport) -> io::Result<()> {
    let used: Vec<_> = r
        .entries
        .iter()
        .filter_map(|e| e.usage.as_ref().map(|u| (e, u)))
        .collect();
    if used.is_empty() {
        return Ok(());
    }
    let paints: usize = used.iter().map(|(_, u)| u.uses).sum();
    if paints > used.len() {
        writeln!(w, "artwork  {} distinct colours from {paints} paints", used.len())?;
    }
    let see_through: Vec<String> = used
        .iter()
        .filter(|(_, u)| u.opacity < 1.0)
        .map(|(e, u)| format!("{} (opacity {})", e.name, fixed(u.opacity, 2)))
        .collect();
    if !see_through.is_empty() {
        writeln!(
            w,
            "         painted with opacity below 1, so printed over what lies beneath (the table shows them opaque): {}",
            see_through.join(", ")
        )?;
    }
    Ok(())
}

/// The four colour differences between two colours.
#[derive(Clone, Debug, Serialize)]
pub struct DeltaReport {
    /// The first colour.
    pub a: DeltaColor,
    /// The second colour.
    pub b: DeltaColor,
    /// ΔE*ab (CIE 1976).
    pub de76: f64,
    /// ΔE*94 (CIE 1994), with `a` as the reference.
    pub de94: f64,
    /// ΔE00 (CIEDE2000).
    pub de00: f64,
    /// ΔE CMC (l:c 2:1), with `a` as the reference.
    pub cmc: f64,
}

/// Why two colours could not be compared.
#[derive(Debug, thiserror::Error)]
pub enum DeltaError {
    /// A colour text that does not parse.
    #[error(transparent)]
    Colour(#[from] crate::color::css::ColorParseError),
    /// A profile that cannot be loaded or used.
    #[error(transparent)]
    Icc(#[from] crate::icc::IccError),
    /// A colour that the profiles turn into no finite CIELAB.
    #[error("\"{input}\" gives no finite CIELAB through these profiles")]
    NotFinite {
        /// The colour text as given.
        input: String,
    },
}

impl DeltaReport {
    /// The differences between two colour texts, as `inkfit delta` gives
    /// them: the texts parsed first, then RGB through the profile `screen`
    /// loads, device CMYK through the one `press` loads, which is asked for
    /// only when a colour is CMYK.
    pub fn between(
        a: &str,
        b: &str,
        screen: impl FnOnce() -> Result<crate::icc::IccProfile, crate::icc::IccError>,
        press: impl FnOnce() -> Result<crate::icc::IccProfile, crate::icc::IccError>,
    ) -> Result<Self, DeltaError> {
        use crate::color::css::{parse_color, ColorInput};
        let colours = [parse_color(a)?, parse_color(b)?];
        let screen = screen()?;
        let press = if colours.iter().any(|c| matches!(c, ColorInput::DeviceCmyk(_))) {
            Some(press()?)
        } else {
            None
        };
        let lab = crate::icc::transform::resolve_lab(&colours, &screen, press.as_ref())?;
        for (text, l) in [(a, lab[0]), (b, lab[1])] {
            if !l.to_array().iter().all(|v| v.is_finite()) {
                return Err(DeltaError::NotFinite {
                    input: text.to_string(),
                });
            }
        }
        Ok(Self::of(a, lab[0], b, lab[1]))
    }

    /// The differences between `a` (colour text `a_text`) and `b`, rounded
    /// for output (CIELAB and ΔE to 4 decimals).
    pub fn of(a_text: &str, a: LabD50, b_text: &str, b: LabD50) -> Self {
        use crate::color::delta::{delta_e00, delta_e76, delta_e94, delta_e_cmc};
        let r = |v: f64| crate::precision::round(v, 4);
        DeltaReport {
            a: DeltaColor {
                input: a_text.to_string(),
                lab: a.to_array().map(r),
            },
            b: DeltaColor {
                input: b_text.to_string(),
                lab: b.to_array().map(r),
            },
            de76: r(delta_e76(a, b)),
            de94: r(delta_e94(a, b)),
            de00: r(delta_e00(a, b)),
            cmc: r(delta_e_cmc(a, b, 2.0, 1.0)),
        }
    }
}

/// One colour of a `delta` comparison.
#[derive(Clone, Debug, Serialize)]
pub struct DeltaColor {
    /// The colour text as given.
    pub input: String,
    /// CIELAB D50.
    pub lab: [f64; 3],
}

/// Writes the `delta` result as text.
pub fn render_delta(w: &mut dyn Write, r: &DeltaReport) -> io::Result<()> {
    for (label, c) in [("A", &r.a), ("B", &r.b)] {
        writeln!(
            w,
            "{label}  {:<28} L*a*b* (D50) {} {} {}",
            c.input,
            fixed(c.lab[0], 2),
            fixed(c.lab[1], 2),
            fixed(c.lab[2], 2)
        )?;
    }
    writeln!(w)?;
    let mut t = Table::new(&[("formula", Align::Left), ("ΔE", Align::Right)]);
    for (name, v) in [
        ("CIE 1976 ΔE*ab", r.de76),
        ("CIE 1994 ΔE*94 (graphic arts, A as reference)", r.de94),
        ("CIEDE2000 ΔE00", r.de00),
        ("CMC(2:1) (A as reference)", r.cmc),
    ] {
        t.row(vec![(name.to_string(), Tone::Plain), (fixed(v, 4), Tone::Plain)]);
    }
    t.write(w, false)
}

fn table_words(t: &TableReport) -> String {
    match t.status {
        TableStatus::Own => format!("own table ({})", t.tag.as_deref().unwrap_or("?")),
        TableStatus::SameAs => format!(
            "{} holds the same data as {}",
            t.tag.as_deref().unwrap_or("?"),
            t.served_by.as_deref().unwrap_or("?")
        ),
        TableStatus::FallsBack => format!("no table; falls back to {}", t.served_by.as_deref().unwrap_or("?")),
        TableStatus::Matrix => "matrix/TRC model (colorimetric)".to_string(),
        TableStatus::Missing => "none".to_string(),
    }
}

/// Writes the `inspect` result as text.
pub fn render_inspect(w: &mut dyn Write, r: &ProfileReport) -> io::Result<()> {
    let opt = |o: &Option<String>| o.clone().unwrap_or_else(|| "(none)".to_string());
    writeln!(
        w,
        "profile      {}{}",
        r.name,
        if r.builtin { " (built-in)" } else { "" }
    )?;
    writeln!(w, "description  {}", opt(&r.description))?;
    writeln!(w, "copyright    {}", opt(&r.copyright))?;
    writeln!(w, "ICC version  {}", r.version)?;
    writeln!(
        w,
        "kind         {} (class '{}', data '{}', PCS '{}')",
        r.class_phrase, r.class, r.color_space, r.pcs
    )?;
    writeln!(w, "model        {}", r.model)?;
    writeln!(w, "created      {}   size {} bytes", r.created, r.size_bytes)?;
    match (r.white_point_xyz, r.white_point_lab) {
        (Some(x), Some(l)) => writeln!(
            w,
            "media white  XYZ {} {} {}   L*a*b* (D50) {} {} {}",
            fixed(x[0], 4),
            fixed(x[1], 4),
            fixed(x[2], 4),
            fixed(l[0], 2),
            fixed(l[1], 2),
            fixed(l[2], 2)
        )?,
        _ => writeln!(w, "media white  (no wtpt tag)")?,
    }
    if let Some(p) = &r.primaries {
        writeln!(
            w,
            "primaries    red {:.4} {:.4}  green {:.4} {:.4}  blue {:.4} {:.4}  white {:.4} {:.4}  (xy, {})",
            p.red[0], p.red[1], p.green[0], p.green[1], p.blue[0], p.blue[1], p.white[0], p.white[1], p.adapted_from
        )?;
    }
    if let (Some(m), Some(how)) = (r.max_ink, &r.max_ink_method) {
        writeln!(w, "max ink      {m:.1} % ({how})")?;
    }
    writeln!(w)?;
    let mut t = Table::new(&[
        ("intent", Align::Left),
        ("device → PCS", Align::Left),
        ("PCS → device", Align::Left),
    ]);
    for i in &r.intents {
        t.row(vec![
            (i.intent.to_string(), Tone::Plain),
            (table_words(&i.to_pcs), Tone::Plain),
            (table_words(&i.from_pcs), Tone::Plain),
        ]);
    }
    t.write(w, false)?;
    writeln!(w)?;
    writeln!(w, "tags         {}", r.tags.join(" "))
}

/// Writes the list of built-in profiles as a table.
pub fn render_profiles(w: &mut dyn Write, list: &[BuiltinInfo]) -> io::Result<()> {
    let mut t = Table::new(&[
        ("name", Align::Left),
        ("role", Align::Left),
        ("what", Align::Left),
        ("defined by", Align::Left),
    ]);
    for b in list {
        let role = match b.role {
            crate::icc::builtin::Role::Screen => "screen",
            crate::icc::builtin::Role::Press => "press",
        };
        t.row(vec![
            (b.name.to_string(), Tone::Plain),
            (role.to_string(), Tone::Plain),
            (b.summary.to_string(), Tone::Plain),
            (b.definition.to_string(), Tone::Plain),
        ]);
    }
    t.write(w, false)
}
