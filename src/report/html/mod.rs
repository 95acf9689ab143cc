//! Self-contained HTML pages: one file with its CSS and figures inline, no
//! script, no font or image from elsewhere, so it opens offline and prints.
//!
//! The page shell and the parts every page shares are here (escaping, the
//! document, colour patches, the caution); each result has its own module:
//! [`check`] for `check --html`, [`gamut`] for `gamut --html`, [`proof`]
//! for `proof --html`.
//!
//! Colours on the page are CSS sRGB, the colour space a browser assumes for
//! an untagged colour. A CIELAB colour becomes sRGB by CSS Color 4's
//! conversion (Bradford D50 → D65, the sRGB matrix and transfer of
//! IEC 61966-2-1); one outside the sRGB cube is clipped into it and marked,
//! so a patch never passes for a colour it is not.

pub mod check;
pub mod gamut;
pub mod proof;

use std::fmt::Write as _;

use crate::color::spaces::lab_d50_to_srgb_unclamped;
use crate::color::LabD50;

/// Text made safe for HTML content and attribute values: the SVG writer's
/// escaping, which HTML shares.
pub use crate::plot::svg::escape;

/// How far (in encoded sRGB, 0..1) a component may lie outside 0..1 before
/// the colour counts as clipped: half an 8-bit code value, so a colour that
/// rounds to a valid code is not marked.
const CLIP_MARGIN: f64 = 0.5 / 255.0;

/// A CIELAB D50 colour as the page shows it.
#[derive(Clone, Debug, PartialEq)]
pub struct PageColour {
    /// `#rrggbb`, clipped into the sRGB cube.
    pub hex: String,
    /// The colour lies outside sRGB (beyond half a code value) and is
    /// shown clipped.
    pub clipped: bool,
}

impl PageColour {
    /// The page colour of `lab`.
    pub fn of_lab(lab: [f64; 3]) -> Self {
        let rgb = lab_d50_to_srgb_unclamped(LabD50::from_array(lab));
        let clipped = rgb
            .iter()
            .any(|v| !v.is_finite() || *v < -CLIP_MARGIN || *v > 1.0 + CLIP_MARGIN);
        let code = rgb.map(|v| {
            let v = if v.is_finite() { v.clamp(0.0, 1.0) } else { 0.0 };
            (v * 255.0).round() as u8
        });
        PageColour {
            hex: format!("#{:02x}{:02x}{:02x}", code[0], code[1], code[2]),
            clipped,
        }
    }
}

/// A solid colour patch, with its role (`screen`, `print`, …) and hex as
/// data attributes, and a visible mark when clipped: the word "clipped", or
/// with `compact` an asterisk (for strips and headers, whose page explains
/// it).
pub fn patch(out: &mut String, role: &str, c: &PageColour, label: &str) {
    patch_marked(out, role, c, label, false);
}

/// [`patch`] with the compact mark.
pub fn patch_compact(out: &mut String, role: &str, c: &PageColour, label: &str) {
    patch_marked(out, role, c, label, true);
}

fn patch_marked(out: &mut String, role: &str, c: &PageColour, label: &str, compact: bool) {
    let _ = write!(
        out,
        r#"<span class="patch" role="img" aria-label="{}" data-role="{role}" data-rgb="{hex}" style="background:{hex}"></span>"#,
        escape(&format!(
            "{label}: {}{}",
            c.hex,
            if c.clipped { ", outside sRGB, shown clipped" } else { "" }
        )),
        hex = c.hex,
    );
    if c.clipped {
        out.push_str(if compact {
            r#"<span class="clip" title="outside sRGB: the page shows it clipped">*</span>"#
        } else {
            r#"<span class="clip" title="outside sRGB: the page shows it clipped">clipped</span>"#
        });
    }
}

/// The conditions a page opens with, as a definition list: screen, press,
/// rendering intent and BPC with how the print is shown, the tolerance
/// (`tolerance_of` says of what: "ΔE00", "95th-percentile ΔE00"), the
/// gamut test, then `extra` rows and the notes.
pub fn conditions_list(
    b: &mut String,
    c: &crate::conditions::Conditions,
    tolerance_of: &str,
    extra: &[(&str, String)],
) {
    let rows = [
        ("Screen", c.screen.clone()),
        ("Press", c.press.clone()),
        (
            "Rendering intent",
            format!(
                "{}, black point compensation {}; print shown {}",
                c.intent,
                if c.bpc { "on" } else { "off" },
                if c.paper_white {
                    "on the paper's own white (absolute colorimetric)"
                } else {
                    "media-relative (relative colorimetric)"
                }
            ),
        ),
        (
            "Tolerance",
            format!(
                "{tolerance_of} {} (a rule of thumb, not a standard)",
                crate::precision::fixed(c.tolerance, 1)
            ),
        ),
        ("Gamut test", c.gamut_test_method.clone()),
    ];
    b.push_str("<dl class=\"conditions\">\n");
    for (k, v) in rows
        .iter()
        .map(|(k, v)| (*k, v))
        .chain(extra.iter().map(|(k, v)| (*k, v)))
    {
        let _ = writeln!(b, "<dt>{k}</dt><dd>{}</dd>", escape(v));
    }
    for n in &c.notes {
        let _ = writeln!(b, "<dt>Note</dt><dd>{}</dd>", escape(n));
    }
    b.push_str("</dl>\n");
}

/// A column header cell; `num` right-aligns it over numbers.
pub fn th(b: &mut String, h: &str, num: bool) {
    let _ = write!(
        b,
        "<th scope=\"col\"{}>{}</th>",
        if num { " class=\"num\"" } else { "" },
        escape(h)
    );
}

/// The caution every page carries.
pub const CAUTION: &str = "This page is a screen preview computed from ICC profiles, not a contract proof. \
Its patches are sRGB approximations shown on an unknown display. Contract proofs and press approval follow \
the printer's own proofing and the applicable standards.";

/// The stylesheet every page shares. Text colours keep a contrast of at
/// least 4.5 : 1 against their backgrounds (WCAG 2.1, 1.4.3): #1a1a1a and
/// #4a4a4a on white, the verdict colours on their tints.
const STYLE: &str = r#"
:root { color: #1a1a1a; background: #ffffff; font: 15px/1.45 system-ui, sans-serif; }
body { margin: 2rem auto; max-width: 70rem; padding: 0 1rem; }
h1 { font-size: 1.5rem; margin: 0 0 .3rem; }
h2 { font-size: 1.15rem; margin: 2rem 0 .5rem; border-bottom: 1px solid #cccccc; padding-bottom: .2rem; }
p, li { max-width: 52rem; }
.muted { color: #4a4a4a; }
dl.conditions { display: grid; grid-template-columns: max-content 1fr; gap: .1rem 1rem; margin: .5rem 0; }
dl.conditions dt { font-weight: 600; }
dl.conditions dd { margin: 0; }
.verdict { border-radius: 6px; padding: .8rem 1rem; margin: 1rem 0; border: 2px solid; }
.verdict.pass { background: #e8f4ea; color: #0f4a1c; border-color: #2e7d3f; }
.verdict.fail { background: #fbeaea; color: #6b0d0d; border-color: #b32626; }
.verdict strong { font-size: 1.2rem; display: block; }
.caution { background: #f3f3f3; padding: .6rem .9rem; border-left: 4px solid #666666; }
table { border-collapse: collapse; margin: .5rem 0; }
caption { text-align: left; font-weight: 600; padding: .3rem 0; }
th, td { padding: .25rem .55rem; border-bottom: 1px solid #dddddd; vertical-align: middle; }
th { text-align: left; background: #f5f5f5; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
.patch { display: inline-block; width: 32px; height: 32px; border: 1px solid #777777; vertical-align: middle;
  print-color-adjust: exact; -webkit-print-color-adjust: exact; }
.patches { white-space: nowrap; }
.patches .patch + .patch { margin-left: 4px; }
.strip-cell { display: inline-block; text-align: center; margin-right: 6px; font-size: .75rem; color: #4a4a4a; }
.strip-cell .clip { margin-left: 1px; }
.clip { font-size: .75rem; font-weight: 600; color: #8a1c1c; margin-left: .3rem; }
.bad { color: #a11212; font-weight: 600; }
.good { color: #1d5e2a; }
table.matrix td { text-align: right; font-variant-numeric: tabular-nums; padding: .2rem .4rem; }
table.matrix td.flag { background: #fbe3e3; color: #7a0c0c; font-weight: 700; }
table.matrix td.self, table.matrix td.apart { color: #4a4a4a; text-align: center; }
table.matrix th .patch, table.strip .patch { width: 24px; height: 24px; }
.bar { display: inline-block; width: 10rem; height: .8rem; background: #e6e6e6; border: 1px solid #8a8a8a; vertical-align: middle; }
.bar span { display: block; height: 100%; background: #3d5a80; print-color-adjust: exact; -webkit-print-color-adjust: exact; }
figure { margin: 1rem 0; }
.pictures { display: grid; grid-template-columns: repeat(auto-fit, minmax(18rem, 1fr)); gap: 1rem; align-items: start; }
.picture { margin: 0; }
.picture img { display: block; width: 100%; height: auto; border: 1px solid #8a8a8a; }
.picture.none p { border: 1px dashed #8a8a8a; padding: 1rem; color: #4a4a4a; margin: 0; }
.picture svg { display: block; margin-top: .4rem; max-width: 22rem; }
figure svg { max-width: 100%; height: auto; }
figcaption { color: #4a4a4a; font-size: .9rem; }
footer { margin-top: 3rem; color: #4a4a4a; font-size: .85rem; }
@media print {
  body { margin: 0; max-width: none; }
  h2 { break-after: avoid; }
  table, figure { break-inside: avoid; }
}
"#;

/// The whole document around `body` (HTML already escaped).
pub fn document(title: &str, body: &str) -> String {
    format!(
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n\
<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n\
<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'; img-src data:\">\n\
<title>{}</title>\n<style>{STYLE}</style>\n</head>\n<body>\n{body}\
<footer>Made by inkfit {} from ICC profiles; a screen preview, not a contract proof.</footer>\n</body>\n</html>\n",
        escape(title),
        env!("CARGO_PKG_VERSION"),
    )
}

/// An SVG document made fit to sit inside HTML: without its XML
/// declaration, its ids prefixed with `prefix` (so two figures on one page
/// cannot share one), and labelled for assistive technology by `alt`.
pub fn inline_svg(svg: &str, prefix: &str, alt: &str) -> String {
    let body = match svg.find("<svg") {
        Some(k) => &svg[k..],
        None => svg,
    };
    let body = body
        .replace("id=\"", &format!("id=\"{prefix}-"))
        .replace("url(#", &format!("url(#{prefix}-"))
        .replace("href=\"#", &format!("href=\"#{prefix}-"));
    body.replacen(
        "<svg ",
        &format!("<svg role=\"img\" aria-label=\"{}\" ", escape(alt)),
        1,
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    // Source: IEC 61966-2-1 (sRGB): D65 white is #ffffff; CIELAB D50
    // 100/0/0 is the D50 white, which Bradford adaptation (CSS Color 4)
    // takes to D65 white.
    #[test]
    fn white_is_white_and_not_clipped() {
        let c = PageColour::of_lab([100.0, 0.0, 0.0]);
        assert_eq!(c.hex, "#ffffff");
        assert!(!c.clipped);
    }

    // Property: a CIELAB colour far outside sRGB (a saturated print cyan
    // lies outside it, as every offset cyan does, common practice) is marked.
    #[test]
    fn colours_outside_srgb_are_marked() {
        let c = PageColour::of_lab([55.0, -37.0, -50.0]);
        assert!(c.clipped, "{c:?}");
        let c = PageColour::of_lab([50.0, 0.0, 0.0]);
        assert!(!c.clipped);
    }

    #[test]
    fn inline_svg_prefixes_ids_and_references() {
        let s = inline_svg(
            "<?xml version=\"1.0\"?>\n<svg a=\"1\"><clipPath id=\"c\"/><g clip-path=\"url(#c)\"/></svg>",
            "f",
            "alt",
        );
        assert!(s.starts_with("<svg role=\"img\" aria-label=\"alt\" a=\"1\">"), "{s}");
        assert!(s.contains("id=\"f-c\"") && s.contains("url(#f-c)"), "{s}");
    }
}
