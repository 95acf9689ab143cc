//! The page of `proof --html`: the verdict over all images at the top, then
//! per image the picture as on screen, its soft proof, the ΔE00 map with
//! its scale, and the statistics.
//!
//! Pictures are small copies (see [`crate::raster::preview_mean`]) embedded
//! as PNG data URIs with their ICC profile, so a colour-managed browser
//! shows them as the proof files do; the files themselves keep full size.

use std::fmt::Write as _;

use base64::Engine as _;

use super::{document, escape, inline_svg};
use crate::precision::fixed;
use crate::proof::result::{Channels, ImageReport, ProfileSource, ProofReport};

/// The pictures of one image on the page, each a PNG file's bytes.
#[derive(Clone, Debug)]
pub struct ImagePictures {
    /// Width and height of the pictures, pixels.
    pub size: (u32, u32),
    /// The image as on screen; `None` for press data (CMYK) and grey with a
    /// profile of its own, which the page does not convert.
    pub screen: Option<Vec<u8>>,
    /// The soft proof.
    pub proof: Vec<u8>,
    /// The ΔE00 map.
    pub delta: Vec<u8>,
    /// The map's scale as SVG.
    pub legend: String,
}

/// What the page is made of: the report and, per image in the report's
/// order, its pictures (`None` past the page's picture limit).
pub struct ProofPage<'a> {
    /// The proof report (the JSON of `proof`).
    pub report: &'a ProofReport,
    /// Pictures per image.
    pub pictures: &'a [Option<ImagePictures>],
}

/// Most images whose pictures a page holds; later ones get their statistics
/// only, so that a folder of hundreds makes a page a browser opens.
pub const MAX_PAGE_PICTURES: usize = 48;

/// The longest side of the pictures, pixels: larger for a few images.
pub fn picture_side(images: usize) -> u32 {
    if images <= 8 {
        720
    } else {
        360
    }
}

fn data_uri(png: &[u8]) -> String {
    format!(
        "data:image/png;base64,{}",
        base64::engine::general_purpose::STANDARD.encode(png)
    )
}

fn file_name(p: &str) -> &str {
    p.rsplit(['/', '\\']).next().unwrap_or(p)
}

/// The whole HTML document.
pub fn render(p: &ProofPage<'_>) -> String {
    let r = p.report;
    let title = match r.images.as_slice() {
        [one] => format!("Soft proof of {}", file_name(&one.input)),
        many => format!("Soft proofs of {} images", many.len()),
    };
    let mut b = String::new();
    let _ = writeln!(b, "<header>\n<h1>{}</h1>", escape(&title));
    conditions(&mut b, r);
    let _ = writeln!(b, "</header>\n<main>");
    verdict(&mut b, r);
    let _ = writeln!(b, "<p class=\"caution\">{}</p>", escape(super::CAUTION));
    overview(&mut b, r);
    for (k, img) in r.images.iter().enumerate() {
        image(
            &mut b,
            k,
            img,
            p.pictures.get(k).and_then(Option::as_ref),
            r.conditions.tolerance,
        );
    }
    if p.pictures.iter().any(Option::is_none) {
        let _ = writeln!(
            b,
            "<p class=\"muted\">Pictures are shown for the first {MAX_PAGE_PICTURES} images only; the table above has every image.</p>"
        );
    }
    let _ = writeln!(b, "</main>");
    document(&title, &b)
}

fn conditions(b: &mut String, r: &ProofReport) {
    super::conditions_list(b, &r.conditions, "95th-percentile ΔE00", &[]);
}

fn verdict(b: &mut String, r: &ProofReport) {
    let beyond: Vec<&ImageReport> = r.images.iter().filter(|i| !i.within_tolerance).collect();
    let n = r.images.len();
    let (cls, head) = if beyond.is_empty() {
        ("pass", "Within the tolerance")
    } else {
        ("fail", "Beyond the tolerance")
    };
    let _ = writeln!(
        b,
        "<section class=\"verdict {cls}\" aria-label=\"Verdict\">\n<strong>{head}</strong>"
    );
    let tol = fixed(r.conditions.tolerance, 1);
    let words = if let ([one], [_]) = (beyond.as_slice(), r.images.as_slice()) {
        format!(
            "The image shifts beyond {tol} in the 95th percentile of ΔE00: p95 {}.",
            fixed(one.stats.p95, 2)
        )
    } else if beyond.is_empty() {
        match n {
            1 => format!("The image prints with a 95th-percentile ΔE00 within {tol}."),
            _ => format!("All {n} images print with a 95th-percentile ΔE00 within {tol}."),
        }
    } else {
        let names: Vec<String> = beyond
            .iter()
            .map(|i| format!("{} (p95 {})", file_name(&i.input), fixed(i.stats.p95, 2)))
            .collect();
        format!(
            "{} of {n} image{} shift{} beyond {tol} in the 95th percentile of ΔE00: {}.",
            beyond.len(),
            if n == 1 { "" } else { "s" },
            if beyond.len() == 1 { "s" } else { "" },
            names.join(", ")
        )
    };
    let _ = writeln!(b, "<p>{}</p>\n</section>", escape(&words));
}

/// One row per image: the statistics table of the whole run.
fn overview(b: &mut String, r: &ProofReport) {
    b.push_str("<h2>Statistics</h2>\n<table class=\"stats\">\n<caption>CIEDE2000 between each pixel as on screen and as printed: its mean and percentiles, the share of pixels beyond 1, 2, 3, 5 and 10, and the share outside the press gamut (shares in percent of pixels)</caption>\n<thead><tr>");
    for (h, num) in [
        ("Image", false),
        ("Profile", false),
        ("Pixels", true),
        ("Mean", true),
        ("p50", true),
        ("p95", true),
        ("p99", true),
        ("Max", true),
        ("> 1 %", true),
        ("> 2 %", true),
        ("> 3 %", true),
        ("> 5 %", true),
        ("> 10 %", true),
        ("Outside gamut %", true),
    ] {
        super::th(b, h, num);
    }
    b.push_str("</tr></thead>\n<tbody>\n");
    let pct = |v: f64| fixed(100.0 * v, 1);
    for i in &r.images {
        let s = &i.stats;
        let profile = match i.profile_source {
            ProfileSource::Embedded => "embedded".to_string(),
            ProfileSource::Assumed => format!("{} (assumed)", i.profile),
        };
        let _ = writeln!(
            b,
            "<tr><th scope=\"row\">{}</th><td>{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td>\
<td class=\"num {}\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td>\
<td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td></tr>",
            escape(file_name(&i.input)),
            escape(&profile),
            s.pixels,
            fixed(s.mean, 2),
            fixed(s.p50, 2),
            if i.within_tolerance { "good" } else { "bad" },
            fixed(s.p95, 2),
            fixed(s.p99, 2),
            fixed(s.max, 2),
            pct(s.share_above.above_1),
            pct(s.share_above.above_2),
            pct(s.share_above.above_3),
            pct(s.share_above.above_5),
            pct(s.share_above.above_10),
            pct(s.outside_gamut),
        );
    }
    b.push_str("</tbody>\n</table>\n");
}

fn image(b: &mut String, k: usize, i: &ImageReport, pics: Option<&ImagePictures>, tolerance: f64) {
    let name = file_name(&i.input);
    let _ = writeln!(b, "<section class=\"image\" data-image=\"{}\">", k + 1);
    let _ = writeln!(b, "<h2>{}</h2>", escape(name));
    let kind = match i.channels {
        Channels::Grey => "grey",
        Channels::Rgb => "RGB",
        Channels::Cmyk => "CMYK press data",
    };
    let _ = writeln!(
        b,
        "<p class=\"muted\">{} × {} pixels, {}-bit {}{}; proof written to {}{}.</p>",
        i.width,
        i.height,
        i.bits,
        kind,
        if i.alpha { " with alpha" } else { "" },
        escape(&i.output),
        i.delta_map
            .as_ref()
            .map_or(String::new(), |m| format!(", ΔE00 map to {}", escape(m)))
    );
    let Some(p) = pics else {
        b.push_str("</section>\n");
        return;
    };
    let (w, h) = p.size;
    b.push_str("<div class=\"pictures\">\n");
    let picture = |b: &mut String, role: &str, png: &[u8], alt: String, caption: &str| {
        let _ = writeln!(
            b,
            "<figure class=\"picture\"><img data-role=\"{role}\" src=\"{}\" width=\"{w}\" height=\"{h}\" alt=\"{}\">\
<figcaption>{}</figcaption></figure>",
            data_uri(png),
            escape(&alt),
            escape(caption)
        );
    };
    match &p.screen {
        Some(png) => picture(
            b,
            "screen",
            png,
            format!("{name} as designed on screen"),
            "On screen, as designed",
        ),
        None => {
            let _ = writeln!(
                b,
                "<figure class=\"picture none\"><p>{}</p></figure>",
                escape(match i.channels {
                    Channels::Cmyk => "This image is press data: the soft proof is what the screen shows of it.",
                    _ => "This grey image has a profile of its own: see its soft proof.",
                })
            );
        }
    }
    picture(
        b,
        "proof",
        &p.proof,
        format!("Soft proof of {name}: as it prints, shown on screen"),
        "Soft proof: as printed",
    );
    let _ = writeln!(
        b,
        "<figure class=\"picture\"><img data-role=\"delta\" src=\"{}\" width=\"{w}\" height=\"{h}\" alt=\"{}\">\
<figcaption>{}</figcaption>\n{}</figure>",
        data_uri(&p.delta),
        escape(&format!(
            "ΔE00 map of {name}: 95th percentile {}, largest {}",
            fixed(i.stats.p95, 2),
            fixed(i.stats.max, 2)
        )),
        if (w, h) == (i.width, i.height) {
            "ΔE00 map: lighter where the print moves further from the screen."
        } else {
            "ΔE00 map: lighter where the print moves further from the screen; in this small copy each pixel shows the largest ΔE00 of the pixels it stands for."
        },
        inline_svg(
            &p.legend,
            &format!("legend{}", k + 1),
            "ΔE00 scale of the map, 0 to 10 and above"
        )
    );
    b.push_str("</div>\n");
    let s = &i.stats;
    let _ = writeln!(
        b,
        "<p>Half the pixels shift by less than ΔE00 {}, 95 % by less than {} ({} the tolerance {}), and {} % of the pixels lie outside the press gamut.</p>",
        fixed(s.p50, 2),
        fixed(s.p95, 2),
        if i.within_tolerance { "within" } else { "beyond" },
        fixed(tolerance, 1),
        fixed(100.0 * s.outside_gamut, 1)
    );
    b.push_str("</section>\n");
}
