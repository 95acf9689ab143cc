//! Layout and drawing of each figure kind into SVG: axes, grid, locus,
//! outlines and contours, palette markers with shift arrows, legend, title
//! and caption. Everything is placed from the figure data alone, in a fixed
//! order, so the same input gives the same bytes.
//!
//! This file holds what every kind shares (panel, axes, legend, markers,
//! swatches, title); the chromaticity diagrams are in `chromaticity.rs`,
//! the CIELAB sections (a*b* slices, hue leaves) in `sections.rs`.

mod chromaticity;
mod sections;

use super::geometry::lab_to_xy;
use super::labels::{self, Rect};
use super::locus::{locus_at, planckian_xy, spectral_locus, uv_prime};
use super::svg::{num, path_data, Svg};
use super::{Figure, PlotKind, Swatch};
use crate::color::spaces::{clamp_unit, lab_d50_to_srgb_unclamped};
use crate::color::{LabD50, Xy};

/// Line colour and dash pattern per profile, in legend order: dark, muted
/// colours with distinct dashes so the figure reads in grey.
const STYLES: [(&str, &str); 6] = [
    ("#1f1f1f", "none"),
    ("#2b5d8a", "9 4"),
    ("#8a2b2b", "2 3"),
    ("#2f6e3f", "11 3 2 3"),
    ("#6b4a8a", "5 5"),
    ("#7a5c1e", "1 3"),
];

/// CIE illuminant chromaticities, 2° observer (CIE 015:2018, Table 11.3):
/// D50 (0.3457, 0.3585) and D65 (0.3127, 0.3290).
pub const D50_XY: Xy = Xy { x: 0.3457, y: 0.3585 };
/// See [`D50_XY`].
pub const D65_XY: Xy = Xy { x: 0.3127, y: 0.3290 };

/// Wavelengths labelled on the spectral locus, nm.
pub const LABELLED_NM: [f64; 9] = [460.0, 480.0, 500.0, 520.0, 540.0, 560.0, 580.0, 600.0, 620.0];
/// Temperatures marked on the Planckian locus, K.
pub const MARKED_KELVIN: [f64; 5] = [2000.0, 3000.0, 4000.0, 6500.0, 10000.0];

/// Palette colours within this many L* of a slice are drawn on it.
pub const SLICE_WINDOW_L: f64 = 5.0;
/// Palette colours within this many degrees of the leaf's hue (and with
/// C* of at least [`LEAF_MIN_CHROMA`]) are drawn on it.
pub const LEAF_WINDOW_DEG: f64 = 15.0;
/// See [`LEAF_WINDOW_DEG`].
pub const LEAF_MIN_CHROMA: f64 = 5.0;

const FONT: f64 = 12.0;
/// Narrowest page, px: room for the caption lines.
const MIN_WIDTH: f64 = 980.0;

/// Maps data coordinates to pixels in one rectangular panel (y up).
#[derive(Clone, Copy, Debug)]
struct Panel {
    x0: f64,
    y0: f64,
    w: f64,
    h: f64,
    xr: [f64; 2],
    yr: [f64; 2],
}

impl Panel {
    fn px(&self, p: [f64; 2]) -> [f64; 2] {
        [
            self.x0 + (p[0] - self.xr[0]) / (self.xr[1] - self.xr[0]) * self.w,
            self.y0 + self.h - (p[1] - self.yr[0]) / (self.yr[1] - self.yr[0]) * self.h,
        ]
    }
    fn pxs(&self, pts: &[[f64; 2]]) -> Vec<[f64; 2]> {
        pts.iter().map(|&p| self.px(p)).collect()
    }
}

fn s(v: &str) -> String {
    v.to_string()
}

fn style(k: usize) -> (&'static str, &'static str) {
    STYLES[k % STYLES.len()]
}

fn stroke_attrs(k: usize) -> Vec<(&'static str, String)> {
    let (c, d) = style(k);
    let mut a = vec![("fill", s("none")), ("stroke", s(c)), ("stroke-width", s("1.6"))];
    if d != "none" {
        a.push(("stroke-dasharray", s(d)));
    }
    a
}

/// Hex sRGB of a CIELAB D50 colour, clipped to the sRGB cube (for marker
/// fills only: a hint, not a proof).
fn hex_of(lab: [f64; 3]) -> String {
    let rgb = clamp_unit(lab_d50_to_srgb_unclamped(LabD50::from_array(lab)));
    let b = rgb.map(|v| (v * 255.0).round() as u8);
    format!("#{:02x}{:02x}{:02x}", b[0], b[1], b[2])
}

/// Pale tint of a chromaticity for the background: the sRGB colour of that
/// chromaticity scaled to its largest channel, clipped, and mixed 18 : 82
/// with white. Not the colour itself, only a hint of its hue.
fn tint_of(c: Xy) -> String {
    // A chromaticity with y = 0 (or not a number) has no XYZ of Y = 1; it
    // gets the tint of the equal-energy point (XYZ 1, 1, 1) instead of a
    // black wedge.
    let xyz = match crate::color::Xyz::from_xy(c, 1.0) {
        Some(xyz) if c.y > 1e-9 && c.x.is_finite() => xyz,
        _ => crate::color::Xyz::new(1.0, 1.0, 1.0),
    };
    let lab = LabD50::from_xyz(xyz);
    let rgb = lab_d50_to_srgb_unclamped(lab);
    let m = rgb.iter().cloned().fold(f64::MIN, f64::max).max(1e-6);
    let rgb = clamp_unit(rgb.map(|v| v / m));
    let b = rgb.map(|v| ((0.18 * v + 0.82) * 255.0).round() as u8);
    format!("#{:02x}{:02x}{:02x}", b[0], b[1], b[2])
}

fn axes(svg: &mut Svg, p: &Panel, step: [f64; 2], labels: [&str; 2], id: &str) {
    svg.open(
        "g",
        &[
            ("id", format!("{id}-grid")),
            ("class", s("grid")),
            ("stroke", s("#d9d9d9")),
            ("stroke-width", s("0.6")),
        ],
    );
    let ticks = |r: [f64; 2], st: f64| {
        let mut v = Vec::new();
        let mut t = (r[0] / st).ceil() * st;
        while t <= r[1] + 1e-9 {
            v.push(t);
            t += st;
        }
        v
    };
    let xt = ticks(p.xr, step[0]);
    let yt = ticks(p.yr, step[1]);
    for &t in &xt {
        let a = p.px([t, p.yr[0]]);
        let b = p.px([t, p.yr[1]]);
        svg.empty(
            "line",
            &[
                ("x1", num(a[0])),
                ("y1", num(a[1])),
                ("x2", num(b[0])),
                ("y2", num(b[1])),
            ],
        );
    }
    for &t in &yt {
        let a = p.px([p.xr[0], t]);
        let b = p.px([p.xr[1], t]);
        svg.empty(
            "line",
            &[
                ("x1", num(a[0])),
                ("y1", num(a[1])),
                ("x2", num(b[0])),
                ("y2", num(b[1])),
            ],
        );
    }
    svg.close();
    svg.open(
        "g",
        &[
            ("id", format!("{id}-axes")),
            ("class", s("axes")),
            ("font-size", num(FONT - 2.0)),
            ("fill", s("#333333")),
        ],
    );
    svg.empty(
        "rect",
        &[
            ("x", num(p.x0)),
            ("y", num(p.y0)),
            ("width", num(p.w)),
            ("height", num(p.h)),
            ("fill", s("none")),
            ("stroke", s("#555555")),
            ("stroke-width", s("0.8")),
        ],
    );
    let dec = |st: f64| if st < 1.0 { 1 } else { 0 };
    for &t in &xt {
        let a = p.px([t, p.yr[0]]);
        svg.text(
            "text",
            &[("x", num(a[0])), ("y", num(a[1] + 14.0)), ("text-anchor", s("middle"))],
            &format!("{t:.*}", dec(step[0])),
        );
    }
    for &t in &yt {
        let a = p.px([p.xr[0], t]);
        svg.text(
            "text",
            &[
                ("x", num(a[0] - 5.0)),
                ("y", num(a[1] + 3.5)),
                ("text-anchor", s("end")),
            ],
            &format!("{t:.*}", dec(step[1])),
        );
    }
    svg.text(
        "text",
        &[
            ("class", s("axis-label")),
            ("x", num(p.x0 + p.w / 2.0)),
            ("y", num(p.y0 + p.h + 32.0)),
            ("text-anchor", s("middle")),
            ("font-size", num(FONT)),
        ],
        labels[0],
    );
    let (lx, ly) = (p.x0 - 42.0, p.y0 + p.h / 2.0);
    svg.text(
        "text",
        &[
            ("class", s("axis-label")),
            ("x", num(lx)),
            ("y", num(ly)),
            ("text-anchor", s("middle")),
            ("font-size", num(FONT)),
            ("transform", format!("rotate(-90 {} {})", num(lx), num(ly))),
        ],
        labels[1],
    );
    svg.close();
}

/// A new figure: wide enough for the legend that starts at `legend_x`, with
/// the shared definitions (arrowhead, a clip path per panel) and the white
/// page drawn.
fn page(legend_x: f64, height: f64, clips: &[(String, Panel)]) -> Svg {
    let width = (legend_x + 330.0).max(MIN_WIDTH);
    let mut svg = Svg::new(width, height);
    defs(&mut svg, clips);
    svg.empty(
        "rect",
        &[
            ("id", s("page")),
            ("x", s("0")),
            ("y", s("0")),
            ("width", num(width)),
            ("height", num(height)),
            ("fill", s("#ffffff")),
        ],
    );
    svg
}

fn defs(svg: &mut Svg, panels: &[(String, Panel)]) {
    svg.open("defs", &[]);
    svg.open(
        "marker",
        &[
            ("id", s("arrowhead")),
            ("viewBox", s("0 0 10 10")),
            ("refX", s("9")),
            ("refY", s("5")),
            ("markerWidth", s("7")),
            ("markerHeight", s("7")),
            ("orient", s("auto")),
        ],
    );
    svg.empty("path", &[("d", s("M0 0 L10 5 L0 10 Z")), ("fill", s("#222222"))]);
    svg.close();
    for (id, p) in panels {
        svg.open("clipPath", &[("id", id.clone())]);
        svg.empty(
            "rect",
            &[
                ("x", num(p.x0)),
                ("y", num(p.y0)),
                ("width", num(p.w)),
                ("height", num(p.h)),
            ],
        );
        svg.close();
    }
    svg.close();
}

fn legend(svg: &mut Svg, fig: &Figure, x: f64, y: f64) {
    svg.open(
        "g",
        &[
            ("id", s("legend")),
            ("font-size", num(FONT - 1.0)),
            ("fill", s("#222222")),
        ],
    );
    svg.text(
        "text",
        &[("x", num(x)), ("y", num(y)), ("font-weight", s("bold"))],
        "Profiles",
    );
    let mut yy = y + 18.0;
    for (k, l) in fig.layers.iter().enumerate() {
        svg.open("g", &[("class", s("legend-entry")), ("data-profile", l.name.clone())]);
        let mut a = stroke_attrs(k);
        a.extend([
            ("x1", num(x)),
            ("y1", num(yy - 4.0)),
            ("x2", num(x + 28.0)),
            ("y2", num(yy - 4.0)),
        ]);
        svg.empty("line", &a);
        svg.text("text", &[("x", num(x + 34.0)), ("y", num(yy))], &l.words);
        let how = match (fig.kind.is_chromaticity(), l.method) {
            (true, super::OutlineMethod::Primaries) => "triangle of its primaries",
            (true, super::OutlineMethod::ProjectedGamut) => "outline of all its colours' chromaticities",
            (false, _) => "boundary of its gamut solid",
        };
        svg.text(
            "text",
            &[
                ("x", num(x + 34.0)),
                ("y", num(yy + 13.0)),
                ("fill", s("#555555")),
                ("font-size", num(FONT - 2.0)),
            ],
            how,
        );
        svg.close();
        yy += 34.0;
    }
    if !fig.swatches.is_empty() {
        yy += 6.0;
        svg.text(
            "text",
            &[("x", num(x)), ("y", num(yy)), ("font-weight", s("bold"))],
            "Palette",
        );
        yy += 18.0;
        let keys: Vec<(&str, &str)> = if fig.mapping.is_some() {
            let mut k = vec![
                ("in", "inside the press gamut"),
                ("out", "outside the press gamut"),
                ("arrow", "arrow: as printed"),
            ];
            if !fig.collapsed.is_empty() {
                k.push(("collapsed", "dotted: pair too close in print"));
            }
            k
        } else {
            vec![("unchecked", "screen colour (no press given)")]
        };
        for (cls, text) in keys {
            svg.open("g", &[("class", s("legend-key")), ("data-key", s(cls))]);
            match cls {
                "collapsed" => svg.empty(
                    "line",
                    &[
                        vec![
                            ("x1", num(x + 2.0)),
                            ("y1", num(yy - 4.0)),
                            ("x2", num(x + 26.0)),
                            ("y2", num(yy - 4.0)),
                        ],
                        collapsed_stroke(),
                    ]
                    .concat(),
                ),
                "arrow" => svg.empty(
                    "line",
                    &[
                        ("x1", num(x + 2.0)),
                        ("y1", num(yy - 4.0)),
                        ("x2", num(x + 26.0)),
                        ("y2", num(yy - 4.0)),
                        ("stroke", s("#222222")),
                        ("stroke-width", s("1")),
                        ("marker-end", s("url(#arrowhead)")),
                    ],
                ),
                _ => marker(svg, [x + 14.0, yy - 4.0], cls, "#ffffff"),
            }
            svg.text("text", &[("x", num(x + 34.0)), ("y", num(yy))], text);
            svg.close();
            yy += 18.0;
        }
    }
    svg.close();
}

/// The dotted line of a pair that collapses in print, in the figure and in
/// its legend key.
fn collapsed_stroke() -> Vec<(&'static str, String)> {
    vec![
        ("stroke", s("#b00020")),
        ("stroke-width", s("2.5")),
        ("stroke-dasharray", s("1 3")),
        ("stroke-linecap", s("round")),
    ]
}

fn marker(svg: &mut Svg, c: [f64; 2], cls: &str, fill: &str) {
    if cls == "out" {
        // A diamond with a heavy outline.
        let r = 6.0;
        let d = path_data(
            &[[c[0], c[1] - r], [c[0] + r, c[1]], [c[0], c[1] + r], [c[0] - r, c[1]]],
            true,
        );
        svg.empty(
            "path",
            &[
                ("class", format!("swatch-marker {cls}")),
                ("d", d),
                ("fill", s(fill)),
                ("stroke", s("#000000")),
                ("stroke-width", s("2")),
            ],
        );
    } else {
        svg.empty(
            "circle",
            &[
                ("class", format!("swatch-marker {cls}")),
                ("cx", num(c[0])),
                ("cy", num(c[1])),
                ("r", s("4.5")),
                ("fill", s(fill)),
                ("stroke", s("#000000")),
                ("stroke-width", s("1")),
            ],
        );
    }
}

/// One palette colour at `at`, with an arrow to `to` (as printed).
fn swatch(svg: &mut Svg, sw: &Swatch, at: [f64; 2], to: Option<[f64; 2]>) {
    let cls = match sw.in_gamut {
        Some(true) => "in",
        Some(false) => "out",
        None => "unchecked",
    };
    svg.open("g", &[("class", s("swatch")), ("data-name", sw.name.clone())]);
    if let Some(t) = to {
        if (t[0] - at[0]).hypot(t[1] - at[1]) > 3.0 {
            svg.empty(
                "line",
                &[
                    ("class", s("shift-arrow")),
                    ("x1", num(at[0])),
                    ("y1", num(at[1])),
                    ("x2", num(t[0])),
                    ("y2", num(t[1])),
                    ("stroke", s("#222222")),
                    ("stroke-width", s("1")),
                    ("marker-end", s("url(#arrowhead)")),
                ],
            );
        }
    }
    marker(svg, at, cls, &hex_of(sw.screen_lab));
    svg.text("title", &[], &sw.name);
    svg.close();
}

/// Most palette markers a figure names; a bigger palette's figure names
/// none (its markers keep their `<title>`), as its labels could only cover
/// the diagram.
pub const MAX_NAMED_MARKERS: usize = 60;

/// The names of the markers at `named` (pixels), placed clear of each other,
/// of the markers and of `obstacles` within the panel, with leader lines
/// where they stand off. Returns how many were left off for want of room.
fn marker_names(svg: &mut Svg, p: &Panel, named: &[([f64; 2], String)], obstacles: &[Rect]) -> usize {
    if named.is_empty() || named.len() > MAX_NAMED_MARKERS {
        return 0;
    }
    let font = FONT - 1.0;
    let bounds = Rect {
        x0: p.x0 + 2.0,
        y0: p.y0 + 2.0,
        x1: p.x0 + p.w - 2.0,
        y1: p.y0 + p.h - 2.0,
    };
    let points: Vec<[f64; 2]> = named.iter().map(|n| n.0).collect();
    let texts: Vec<String> = named.iter().map(|n| n.1.clone()).collect();
    let placed = labels::place(&points, &texts, font, bounds, obstacles);
    svg.open(
        "g",
        &[
            ("id", s("palette-names")),
            ("font-size", num(font)),
            ("fill", s("#111111")),
        ],
    );
    for ((at, name), pl) in named.iter().zip(&placed) {
        let Some(pl) = pl else { continue };
        if let Some(end) = pl.leader {
            svg.empty(
                "line",
                &[
                    ("class", s("name-leader")),
                    ("x1", num(at[0])),
                    ("y1", num(at[1])),
                    ("x2", num(end[0])),
                    ("y2", num(end[1])),
                    ("stroke", s("#555555")),
                    ("stroke-width", s("0.8")),
                ],
            );
        }
        svg.text(
            "text",
            &[
                ("class", s("swatch-name")),
                ("data-name", name.clone()),
                ("x", num(pl.x)),
                ("y", num(pl.y)),
                ("text-anchor", s(pl.anchor)),
                ("stroke", s("#ffffff")),
                ("stroke-width", s("3")),
                ("stroke-linejoin", s("round")),
                ("paint-order", s("stroke")),
            ],
            name,
        );
    }
    svg.close();
    placed.iter().filter(|p| p.is_none()).count()
}

/// The caption line for names left off a crowded figure.
fn names_left_off(n: usize) -> String {
    format!(
        "{n} name{} left off where markers crowd; hover a marker for its name, or see the table.",
        if n == 1 { "" } else { "s" }
    )
}

fn title_and_caption(svg: &mut Svg, title: &str, caption: &[String], x: f64, y_caption: f64) {
    svg.text(
        "text",
        &[
            ("id", s("title")),
            ("x", num(x)),
            ("y", s("30")),
            ("font-size", num(FONT + 5.0)),
            ("font-weight", s("bold")),
            ("fill", s("#111111")),
        ],
        title,
    );
    svg.open(
        "g",
        &[
            ("id", s("caption")),
            ("font-size", num(FONT - 1.0)),
            ("fill", s("#333333")),
        ],
    );
    for (k, line) in caption.iter().filter(|l| !l.is_empty()).enumerate() {
        svg.text(
            "text",
            &[
                ("class", s("caption-line")),
                ("x", num(x)),
                ("y", num(y_caption + 16.0 * k as f64)),
            ],
            line,
        );
    }
    svg.close();
}

/// What the palette markers mean; empty without a palette.
fn mapping_line(fig: &Figure) -> String {
    if fig.swatches.is_empty() {
        return String::new();
    }
    match &fig.mapping {
        Some(m) => format!("Palette colours go to the press by {m}; arrows end at the colour as printed."),
        None => "Palette colours as the screen shows them (no press given).".to_string(),
    }
}

/// The figure as SVG text.
pub fn render(fig: &Figure) -> String {
    match fig.kind {
        PlotKind::Xy | PlotKind::Uv => chromaticity::chromaticity(fig),
        PlotKind::Ab => sections::slices(fig),
        PlotKind::Leaf => sections::leaf(fig),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tints_are_pale_and_defined_where_y_is_zero() {
        // Property: every tint is a valid pale colour (each channel at least
        // 0.82 of full scale by construction), also for y = 0, where
        // XYZ = (x/y, 1, (1−x−y)/y) is undefined.
        for c in [
            Xy { x: 0.3, y: 0.0 },
            Xy { x: f64::NAN, y: 0.3 },
            Xy { x: 0.17, y: 0.005 },
            Xy { x: 0.7, y: 0.29 },
        ] {
            let t = tint_of(c);
            assert_eq!(t.len(), 7, "{t}");
            for k in 0..3 {
                let v = u8::from_str_radix(&t[1 + 2 * k..3 + 2 * k], 16).unwrap();
                assert!(v >= 209, "{c:?}: {t}");
            }
        }
        assert_eq!(
            tint_of(Xy { x: 0.3, y: 0.0 }),
            tint_of(Xy {
                x: 1.0 / 3.0,
                y: 1.0 / 3.0
            })
        );
    }
}
