//! The page of `check --html`: the verdict in words, every colour beside its
//! print, the xy figure, the separation matrix, lightness along an ordered
//! scale and the colour-vision rows.

use std::collections::HashSet;
use std::fmt::Write as _;

use super::{document, escape, inline_svg, patch, patch_compact, PageColour};
use crate::precision::fixed;
use crate::swatch::check::CheckReport;
use crate::swatch::order::Order;
use crate::swatch::separation::{PairsListed, Separation};
use crate::swatch::survival::{CvdReport, Survival, Verdict};

/// Most entries the separation matrix shows; a bigger palette's page lists
/// its flagged pairs instead (the JSON has them all).
pub const MAX_MATRIX_ENTRIES: usize = 64;

/// What the page is made of: the check, its palette analyses, the verdict
/// and the xy figure's SVG (as `plot` renders it), when there is one.
pub struct CheckPage<'a> {
    /// The per-colour check.
    pub check: &'a CheckReport,
    /// Separation, order and CVD.
    pub survival: &'a Survival,
    /// The one verdict.
    pub verdict: &'a Verdict,
    /// The xy chromaticity diagram as SVG.
    pub figure: Option<&'a str>,
}

/// The whole HTML document.
pub fn render(p: &CheckPage<'_>) -> String {
    let r = p.check;
    let mut b = String::new();
    let _ = writeln!(b, "<header>\n<h1>Print check of {}</h1>", escape(&r.palette));
    conditions(&mut b, r);
    let _ = writeln!(b, "</header>\n<main>");
    verdict(&mut b, p);
    let _ = writeln!(b, "<p class=\"caution\">{}</p>", escape(super::CAUTION));
    entries(&mut b, r);
    if let Some(svg) = p.figure {
        let alt = format!(
            "CIE 1931 xy chromaticity diagram: the screen and press gamut outlines and the {} palette colours by name, each with an arrow to where it prints.",
            r.entries.len()
        );
        let _ = writeln!(
            b,
            "<h2>Where the colours lie</h2>\n<figure>\n{}\n<figcaption>{}</figcaption>\n</figure>",
            inline_svg(svg, "xy", &alt),
            escape("Chromaticities relative to D50 (the ICC connection space). Diamonds lie outside the press gamut; arrows end where the colour prints.")
        );
    }
    separation(&mut b, r, &p.survival.separation);
    if let Some(o) = &p.survival.order {
        order(&mut b, r, o);
    }
    if let Some(c) = &p.survival.cvd {
        cvd(&mut b, r, c);
    }
    let _ = writeln!(b, "</main>");
    document(&format!("Print check of {}", r.palette), &b)
}

fn conditions(b: &mut String, r: &CheckReport) {
    let ink = match r.ink_limit {
        Some(l) => format!("{} % C+M+Y+K", fixed(l.percent, 1)),
        None => "none known".to_string(),
    };
    super::conditions_list(b, &r.conditions, "ΔE00", &[("Ink limit", ink)]);
}

fn verdict(b: &mut String, p: &CheckPage<'_>) {
    let s = &p.check.summary;
    let (cls, head) = if p.verdict.passes {
        ("pass", "Passes")
    } else {
        ("fail", "Fails")
    };
    let _ = writeln!(
        b,
        "<section class=\"verdict {cls}\" aria-label=\"Verdict\">\n<strong>{head}</strong>"
    );
    let counts = format!(
        "{} colour{}: {} outside the press gamut, {} shift beyond the tolerance{}; largest shift ΔE00 {} ({}), mean {}.",
        s.count,
        if s.count == 1 { "" } else { "s" },
        s.out_of_gamut,
        s.beyond_tolerance,
        if s.over_ink_limit > 0 {
            format!(", {} over the ink limit", s.over_ink_limit)
        } else {
            String::new()
        },
        fixed(s.max_delta_e00, 2),
        s.worst,
        fixed(s.mean_delta_e00, 2)
    );
    let _ = writeln!(b, "<p>{}</p>", escape(&counts));
    if p.verdict.passes {
        b.push_str("<p>Every colour prints within the tolerance and inside the press gamut, and every palette check holds.</p>\n");
    } else {
        b.push_str("<ul>\n");
        for f in &p.verdict.reasons {
            let _ = writeln!(b, "<li>{}</li>", escape(&f.detail));
        }
        b.push_str("</ul>\n");
    }
    b.push_str("</section>\n");
}

fn entries(b: &mut String, r: &CheckReport) {
    let shares = r.entries.iter().any(|e| e.share.is_some());
    b.push_str("<h2>Each colour on screen and in print</h2>\n<table class=\"entries\">\n");
    b.push_str(
        "<caption>The screen colour beside the printed colour, both as sRGB on this page</caption>\n<thead><tr>",
    );
    let mut head = vec![("#", true), ("Name", false)];
    if shares {
        head.push(("Share of map", true));
    }
    head.extend([
        ("Screen", false),
        ("Print", false),
        ("Input", false),
        ("C M Y K %", true),
        ("Ink %", true),
        ("ΔE00", true),
        ("Gamut", false),
        ("Verdict", false),
    ]);
    for (h, num) in head {
        super::th(b, h, num);
    }
    b.push_str("</tr></thead>\n<tbody>\n");
    for (i, e) in r.entries.iter().enumerate() {
        let _ = write!(
            b,
            "<tr data-entry=\"{}\"><td class=\"num\">{}</td><th scope=\"row\" class=\"name\">{}</th>",
            i + 1,
            i + 1,
            escape(&e.name)
        );
        if shares {
            let _ = write!(
                b,
                "<td class=\"num\">{}</td>",
                e.share.map_or(String::new(), |v| format!("{} %", fixed(100.0 * v, 1)))
            );
        }
        b.push_str("<td class=\"patches\">");
        patch(
            b,
            "screen",
            &PageColour::of_lab(e.screen_lab),
            &format!("{} on screen", e.name),
        );
        b.push_str("</td><td class=\"patches\">");
        patch(
            b,
            "print",
            &PageColour::of_lab(e.printed_lab),
            &format!("{} in print", e.name),
        );
        let cmyk: Vec<String> = e.press_cmyk.iter().map(|v| fixed(*v, 0)).collect();
        let gamut = match (e.in_gamut, e.outside_by) {
            (true, _) => "inside".to_string(),
            (false, Some(d)) => format!("out by {}", fixed(d, 1)),
            (false, None) => "outside".to_string(),
        };
        let (verdict, good) = if e.over_ink_limit {
            ("over the ink limit", false)
        } else if e.within_tolerance {
            ("holds", true)
        } else {
            ("shifts", false)
        };
        let _ = writeln!(
            b,
            "</td><td><code>{}</code></td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num{}\">{}</td><td{}>{}</td><td class=\"{}\">{}</td></tr>",
            escape(&e.input),
            cmyk.join(" "),
            fixed(e.ink_total, 0),
            if e.within_tolerance { "" } else { " bad" },
            fixed(e.delta_e00, 2),
            if e.in_gamut { "" } else { " class=\"bad\"" },
            gamut,
            if good { "good" } else { "bad" },
            verdict
        );
    }
    b.push_str("</tbody>\n</table>\n");
}

fn separation(b: &mut String, r: &CheckReport, s: &Separation) {
    let n = r.entries.len();
    b.push_str("<h2>Can the colours be told apart in print?</h2>\n");
    let floors = match s.min_legend_separation {
        Some(l) => format!(
            "Classes that touch must differ by at least ΔE00 {} in print; classes that never touch, told apart through the legend, by {}.",
            fixed(s.min_separation, 1),
            fixed(l, 1)
        ),
        None => format!(
            "Every pair must differ by at least ΔE00 {} in print, and keep at least half of its screen difference.",
            fixed(s.min_separation, 1)
        ),
    };
    let _ = writeln!(
        b,
        "<p>{} Closest pair: ΔE00 {} on screen, {} in print. {} pair{} flagged.</p>",
        escape(&floors),
        fixed(s.min_screen, 2),
        fixed(s.min_print, 2),
        s.flagged_count,
        if s.flagged_count == 1 { "" } else { "s" }
    );
    let flagged: HashSet<(usize, usize)> = s.flagged.iter().map(|f| (f.a, f.b)).collect();
    if n <= MAX_MATRIX_ENTRIES && s.pairs_listed == PairsListed::All {
        matrix(b, r, s, &flagged);
    } else if !s.flagged.is_empty() {
        b.push_str("<table class=\"pairs\">\n<caption>The closest flagged pairs (printed ΔE00)</caption>\n<thead><tr><th scope=\"col\">Pair</th><th scope=\"col\" class=\"num\">Screen ΔE00</th><th scope=\"col\" class=\"num\">Print ΔE00</th><th scope=\"col\" class=\"num\">Floor</th></tr></thead>\n<tbody>\n");
        for f in s.flagged.iter().take(200) {
            let _ = writeln!(
                b,
                "<tr><th scope=\"row\">{} · {}</th><td class=\"num\">{}</td><td class=\"num bad\">{}</td><td class=\"num\">{}</td></tr>",
                escape(&f.a_name),
                escape(&f.b_name),
                fixed(f.screen, 2),
                fixed(f.print, 2),
                fixed(f.floor, 1)
            );
        }
        b.push_str("</tbody>\n</table>\n");
    }
}

fn matrix(b: &mut String, r: &CheckReport, s: &Separation, flagged: &HashSet<(usize, usize)>) {
    let n = r.entries.len();
    let mut cell = vec![None; n * n];
    let mut touching = vec![true; n * n];
    for p in &s.pairs {
        let (i, j) = (p.a - 1, p.b - 1);
        for (x, y) in [(i, j), (j, i)] {
            cell[x * n + y] = Some((p.print, flagged.contains(&(p.a, p.b))));
            touching[x * n + y] = p.touching != Some(false);
        }
    }
    let only_touching = s.min_legend_separation.is_some();
    let _ = writeln!(
        b,
        "<table class=\"matrix\">\n<caption>Printed ΔE00 between each pair{}; flagged pairs are marked “!”</caption>",
        if only_touching {
            " of classes that touch (pairs that never touch are left blank)"
        } else {
            ""
        }
    );
    b.push_str("<thead><tr><td></td>");
    for (j, e) in r.entries.iter().enumerate() {
        let _ = write!(b, "<th scope=\"col\" class=\"num\" title=\"{}\">", escape(&e.name));
        patch_compact(b, "matrix", &PageColour::of_lab(e.printed_lab), &e.name);
        let _ = write!(b, "<br>{}</th>", j + 1);
    }
    b.push_str("</tr></thead>\n<tbody>\n");
    for (i, e) in r.entries.iter().enumerate() {
        let _ = write!(b, "<tr><th scope=\"row\">{} {}</th>", i + 1, escape(&e.name));
        for j in 0..n {
            if i == j {
                b.push_str("<td class=\"self\">–</td>");
                continue;
            }
            match cell[i * n + j] {
                Some(_) if only_touching && !touching[i * n + j] => b.push_str("<td class=\"apart\"></td>"),
                Some((v, true)) => {
                    let _ = write!(b, "<td class=\"flag\">{}&nbsp;!</td>", fixed(v, 2));
                }
                Some((v, false)) => {
                    let _ = write!(b, "<td>{}</td>", fixed(v, 1));
                }
                None => b.push_str("<td class=\"apart\"></td>"),
            }
        }
        b.push_str("</tr>\n");
    }
    b.push_str("</tbody>\n</table>\n");
}

/// L* of each entry of an ordered scheme on screen and in print, as a small
/// line chart, with the order's findings.
fn order(b: &mut String, r: &CheckReport, o: &Order) {
    b.push_str("<h2>Lightness along the scale</h2>\n");
    let _ = writeln!(
        b,
        "<p>Lightness order on screen: {}; in print: {}. Smallest printed step ΔE00 {}.</p>",
        if o.monotonic_screen {
            "holds"
        } else {
            "<span class=\"bad\">broken</span>"
        },
        if o.monotonic_print {
            "holds"
        } else {
            "<span class=\"bad\">broken</span>"
        },
        fixed(o.min_step, 2)
    );
    let (w, h, x0, y0, pw, ph) = (640.0, 310.0, 56.0, 16.0, 560.0, 240.0);
    let n = r.entries.len().max(2);
    let x = |k: usize| x0 + pw * k as f64 / (n - 1) as f64;
    let y = |l: f64| y0 + ph * (1.0 - l.clamp(0.0, 100.0) / 100.0);
    let mut svg = format!(
        "<svg role=\"img\" aria-label=\"L* of each entry in file order, on screen (solid line) and in print (dashed line)\" width=\"{w}\" height=\"{h}\" viewBox=\"0 0 {w} {h}\" font-family=\"sans-serif\" font-size=\"12\">\n"
    );
    for l in [0.0, 25.0, 50.0, 75.0, 100.0] {
        let _ = writeln!(
            svg,
            "<line x1=\"{x0}\" x2=\"{}\" y1=\"{yy:.1}\" y2=\"{yy:.1}\" stroke=\"#dddddd\"/><text x=\"{}\" y=\"{:.1}\" text-anchor=\"end\" fill=\"#1a1a1a\">{l:.0}</text>",
            x0 + pw,
            x0 - 6.0,
            y(l) + 4.0,
            yy = y(l)
        );
    }
    let _ = writeln!(
        svg,
        "<text x=\"14\" y=\"{:.1}\" transform=\"rotate(-90 14 {:.1})\" text-anchor=\"middle\" fill=\"#1a1a1a\">L* (CIELAB D50)</text>",
        y0 + ph / 2.0,
        y0 + ph / 2.0
    );
    for (role, get, dash) in [("screen", 0usize, ""), ("print", 1usize, " stroke-dasharray=\"6 4\"")] {
        let pts: Vec<String> = r
            .entries
            .iter()
            .enumerate()
            .map(|(k, e)| {
                let l = if get == 0 { e.screen_lab[0] } else { e.printed_lab[0] };
                format!("{:.1},{:.1}", x(k), y(l))
            })
            .collect();
        let _ = writeln!(
            svg,
            "<polyline class=\"lightness-{role}\" points=\"{}\" fill=\"none\" stroke=\"#1a1a1a\" stroke-width=\"1.6\"{dash}/>",
            pts.join(" ")
        );
        for (k, e) in r.entries.iter().enumerate() {
            let lab = if get == 0 { e.screen_lab } else { e.printed_lab };
            let _ = writeln!(
                svg,
                "<circle cx=\"{:.1}\" cy=\"{:.1}\" r=\"5\" fill=\"{}\" stroke=\"#1a1a1a\"><title>{} {role}: L* {}</title></circle>",
                x(k),
                y(lab[0]),
                PageColour::of_lab(lab).hex,
                escape(&e.name),
                fixed(lab[0], 1)
            );
        }
    }
    for (k, _) in r.entries.iter().enumerate() {
        let _ = writeln!(
            svg,
            "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\" fill=\"#1a1a1a\">{}</text>",
            x(k),
            y0 + ph + 18.0,
            k + 1
        );
    }
    let _ = writeln!(
        svg,
        "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\" fill=\"#1a1a1a\">entry (file order)</text>",
        x0 + pw / 2.0,
        y0 + ph + 38.0
    );
    svg.push_str("</svg>");
    let _ = writeln!(
        b,
        "<figure>\n{svg}\n<figcaption>L* of each entry in file order (numbers as in the table): solid on screen, dashed in print.</figcaption>\n</figure>"
    );
}

fn cvd(b: &mut String, r: &CheckReport, c: &CvdReport) {
    b.push_str("<h2>For readers with colour-vision deficiencies</h2>\n");
    b.push_str("<p>The printed colours as simulated for each deficiency (Machado, Oliveira and Fernandes 2009), numbered as in the table, and how close their closest pair comes. * marks a colour outside sRGB, shown clipped.</p>\n");
    b.push_str("<table class=\"strip\">\n<caption>Printed colours under each simulated deficiency</caption>\n<thead><tr><th scope=\"col\">Deficiency</th><th scope=\"col\">Printed colours as seen</th><th scope=\"col\" class=\"num\">Closest pair, screen ΔE00</th><th scope=\"col\" class=\"num\">In print</th><th scope=\"col\" class=\"num\">Pairs flagged</th><th scope=\"col\">Closest flagged pairs (printed ΔE00 as seen)</th></tr></thead>\n<tbody>\n");
    for (d, res) in c.iter() {
        let _ = write!(
            b,
            "<tr><th scope=\"row\">{d} (severity {})</th><td class=\"patches\">",
            fixed(res.severity, 2)
        );
        if r.entries.len() <= MAX_MATRIX_ENTRIES {
            for (k, (e, lab)) in r.entries.iter().zip(&res.simulated_lab).enumerate() {
                b.push_str("<span class=\"strip-cell\">");
                patch_compact(
                    b,
                    d.key(),
                    &PageColour::of_lab(*lab),
                    &format!("{} as seen with {d}", e.name),
                );
                let _ = write!(b, "<br>{}</span>", k + 1);
            }
        } else {
            let _ = write!(b, "(shown for palettes of up to {MAX_MATRIX_ENTRIES} colours)");
        }
        let mut pairs: Vec<String> = res
            .flagged
            .iter()
            .take(6)
            .map(|f| format!("{} · {} ({})", f.a_name, f.b_name, fixed(f.print, 1)))
            .collect();
        if res.flagged_count > pairs.len() {
            pairs.push(format!("and {} more", res.flagged_count - pairs.len()));
        }
        let _ = writeln!(
            b,
            "</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num{}\">{}</td><td>{}</td></tr>",
            fixed(res.min_screen, 2),
            fixed(res.min_print, 2),
            if res.flagged_count > 0 { " bad" } else { "" },
            res.flagged_count,
            escape(&pairs.join("; "))
        );
    }
    b.push_str("</tbody>\n</table>\n");
}
