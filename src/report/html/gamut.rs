//! The page of `gamut --html`: every profile's gamut volume and lightness
//! range, how much of each gamut another holds (in words, numbers and
//! bars), the a*b* slices figure and the most chromatic colour of every hue
//! sector as a patch.

use std::fmt::Write as _;

use super::{document, escape, inline_svg, patch_compact, th, PageColour};
use crate::gamut::result::GamutReport;
use crate::gamut::DeviceKind;
use crate::precision::fixed;
use crate::report::gamut::{grouped, ink_limit_words, pct};

/// What the page is made of: the report and the slices figure's SVG (as
/// `gamut --svg` writes it).
pub struct GamutPage<'a> {
    /// The gamut report (the JSON of `gamut`).
    pub report: &'a GamutReport,
    /// The a*b* slices as SVG.
    pub figure: &'a str,
    /// The L* of the slices, in the figure's order.
    pub slices: &'a [f64],
}

/// The whole HTML document.
pub fn render(p: &GamutPage<'_>) -> String {
    let r = p.report;
    let names: Vec<&str> = r.profiles.iter().map(|g| g.name.as_str()).collect();
    let title = format!("Gamuts of {}", names.join(", "));
    let mut b = String::new();
    let _ = writeln!(b, "<header>\n<h1>{}</h1>\n</header>\n<main>", escape(&title));
    summary(&mut b, r);
    let _ = writeln!(b, "<p class=\"caution\">{}</p>", escape(super::CAUTION));
    profiles(&mut b, r);
    coverage(&mut b, r);
    let ls: Vec<String> = p.slices.iter().map(|l| fixed(*l, 0)).collect();
    let alt = format!(
        "CIELAB a*b* slices of the gamuts of {} at L* {}: one outline per profile in each slice.",
        names.join(", "),
        ls.join(", ")
    );
    let _ = writeln!(
        b,
        "<h2>Slices at L* {}</h2>\n<figure>\n{}\n<figcaption>{}</figcaption>\n</figure>",
        escape(&ls.join(", ")),
        inline_svg(p.figure, "slices", &alt),
        escape(
            "Each panel cuts every gamut at one lightness; a colour prints or shows only inside its profile's outline."
        )
    );
    sectors(&mut b, r);
    if !r.method.is_empty() {
        b.push_str("<h2>Method</h2>\n<ul>\n");
        for m in &r.method {
            let _ = writeln!(b, "<li>{}</li>", escape(m));
        }
        b.push_str("</ul>\n");
    }
    let _ = writeln!(b, "</main>");
    document(&title, &b)
}

/// The comparison in words, at the top: each pair's coverage both ways.
fn summary(b: &mut String, r: &GamutReport) {
    b.push_str("<section class=\"summary\" aria-label=\"Summary\">\n");
    if r.coverage.is_empty() {
        let g = &r.profiles[0];
        let _ = writeln!(
            b,
            "<p>{} spans {} cubic CIELAB units, L* {} to {}.</p>",
            escape(&g.name),
            grouped(g.volume),
            fixed(g.l_min, 1),
            fixed(g.l_max, 1)
        );
    }
    for line in crate::report::gamut::coverage_sentences(r) {
        let _ = writeln!(b, "<p>{}</p>", escape(&line));
    }
    b.push_str("</section>\n");
}

fn profiles(b: &mut String, r: &GamutReport) {
    b.push_str("<h2>Volumes</h2>\n<table class=\"profiles\">\n<caption>Each gamut's volume and lightness range</caption>\n<thead><tr>");
    for (h, num) in [
        ("Profile", false),
        ("Kind", false),
        ("Volume (ΔE*ab³)", true),
        ("Darkest L*", true),
        ("Lightest L*", true),
        ("Total-ink limit", false),
    ] {
        th(b, h, num);
    }
    b.push_str("</tr></thead>\n<tbody>\n");
    for g in &r.profiles {
        let _ = writeln!(
            b,
            "<tr><th scope=\"row\">{}</th><td>{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td>{}</td></tr>",
            escape(&g.name),
            match g.kind {
                DeviceKind::Rgb => "RGB",
                DeviceKind::Cmyk => "CMYK",
            },
            grouped(g.volume),
            fixed(g.l_min, 2),
            fixed(g.l_max, 2),
            escape(&ink_limit_words(g).unwrap_or_else(|| "–".to_string()))
        );
    }
    b.push_str("</tbody>\n</table>\n");
}

fn coverage(b: &mut String, r: &GamutReport) {
    if r.coverage.is_empty() {
        return;
    }
    b.push_str("<h2>Coverage</h2>\n<table class=\"coverage\">\n<caption>How much of gamut A lies inside gamut B</caption>\n<thead><tr>");
    for (h, num) in [
        ("A", false),
        ("B", false),
        ("Share of A inside B", true),
        ("", false),
        ("A ∩ B (ΔE*ab³)", true),
    ] {
        th(b, h, num);
    }
    b.push_str("</tr></thead>\n<tbody>\n");
    for c in &r.coverage {
        let share = c.a_inside_b.clamp(0.0, 1.0);
        let _ = writeln!(
            b,
            "<tr><th scope=\"row\">{}</th><td>{}</td><td class=\"num\">{}</td>\
<td><span class=\"bar\" aria-hidden=\"true\"><span style=\"width:{}%\"></span></span></td><td class=\"num\">{}</td></tr>",
            escape(&c.a),
            escape(&c.b),
            pct(c.a_inside_b),
            fixed(share * 100.0, 1),
            grouped(c.intersection_volume)
        );
    }
    b.push_str("</tbody>\n</table>\n");
}

/// The most chromatic colour of every 30° hue sector, per profile, as a
/// patch with its C*ab and L*.
fn sectors(b: &mut String, r: &GamutReport) {
    let Some(first) = r.profiles.first() else {
        return;
    };
    b.push_str("<h2>Most chromatic colour per hue</h2>\n<table class=\"sectors\">\n<caption>The largest chroma C*ab in each hue sector, with the L* and hue where it is reached; patches of that colour in sRGB (* outside sRGB, shown clipped)</caption>\n<thead><tr>");
    th(b, "Hue h_ab", false);
    for g in &r.profiles {
        th(b, &g.name, false);
    }
    b.push_str("</tr></thead>\n<tbody>\n");
    for (s, sec) in first.hue_sectors.iter().enumerate() {
        let _ = write!(
            b,
            "<tr><th scope=\"row\">{}–{}°</th>",
            fixed(sec.hue_from, 0),
            fixed(sec.hue_to, 0)
        );
        for g in &r.profiles {
            let h = &g.hue_sectors[s];
            let hue = h.h_at_max.to_radians();
            let lab = [h.l_at_max, h.max_chroma * hue.cos(), h.max_chroma * hue.sin()];
            b.push_str("<td class=\"patches\">");
            patch_compact(
                b,
                "sector",
                &PageColour::of_lab(lab),
                &format!("{} at hue {}–{}°", g.name, fixed(h.hue_from, 0), fixed(h.hue_to, 0)),
            );
            let _ = write!(
                b,
                " C* {} at L* {}, h {}°</td>",
                fixed(h.max_chroma, 1),
                fixed(h.l_at_max, 1),
                fixed(h.h_at_max, 0)
            );
        }
        b.push_str("</tr>\n");
    }
    b.push_str("</tbody>\n</table>\n");
}
