//! Layout and drawing of each figure kind into SVG: axes, grid, locus,
//! outlines and contours, palette markers with shift arrows, legend, title
//! and caption. Everything is placed from the figure data alone, in a fixed
//! order, so the same input gives the same bytes.

use super::geometry::lab_to_xy;
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
    let y = 1.0;
    let xyz = [c.x * y / c.y, y, (1.0 - c.x - c.y) * y / c.y];
    let lab = LabD50::from_xyz(crate::color::Xyz::new(xyz[0], xyz[1], xyz[2]));
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
        PlotKind::Xy | PlotKind::Uv => chromaticity(fig),
        PlotKind::Ab => slices(fig),
        PlotKind::Leaf => leaf(fig),
    }
}

fn chromaticity(fig: &Figure) -> String {
    let uv = fig.kind == PlotKind::Uv;
    let map = |c: Xy| -> Option<[f64; 2]> {
        if uv {
            uv_prime(c)
        } else {
            Some([c.x, c.y])
        }
    };
    let (xr, yr, step, scale) = if uv {
        ([0.0, 0.65], [0.0, 0.65], [0.1, 0.1], 800.0)
    } else {
        ([0.0, 0.8], [0.0, 0.9], [0.1, 0.1], 600.0)
    };
    let p = Panel {
        x0: 80.0,
        y0: 60.0,
        w: (xr[1] - xr[0]) * scale,
        h: (yr[1] - yr[0]) * scale,
        xr,
        yr,
    };
    let legend_x = p.x0 + p.w + 30.0;
    let height = p.y0 + p.h + 110.0;
    let mut svg = page(legend_x, height, &[(s("plot-area"), p)]);
    let locus: Vec<(f64, [f64; 2])> = spectral_locus()
        .into_iter()
        .filter_map(|(nm, c)| map(c).map(|q| (nm, q)))
        .collect();
    let white = map(Xy {
        x: 1.0 / 3.0,
        y: 1.0 / 3.0,
    })
    .unwrap_or([0.3, 0.3]);
    // Background: a fan of pale tints from the equal-energy point to the locus.
    svg.open("g", &[("id", s("background")), ("clip-path", s("url(#plot-area)"))]);
    let n = locus.len();
    for k in 0..n {
        let (a, b) = (locus[k].1, locus[(k + 1) % n].1);
        let mid_nm = if k + 1 < n {
            0.5 * (locus[k].0 + locus[k + 1].0)
        } else {
            0.0
        };
        let hint = if k + 1 < n {
            locus_at(mid_nm).unwrap_or(Xy { x: 0.33, y: 0.33 })
        } else {
            // The purple line: a mix of the two ends.
            let (e0, e1) = (locus_at(380.0), locus_at(780.0));
            match (e0, e1) {
                (Some(e0), Some(e1)) => Xy {
                    x: 0.5 * (e0.x + e1.x),
                    y: 0.5 * (e0.y + e1.y),
                },
                _ => Xy { x: 0.33, y: 0.33 },
            }
        };
        let tint = tint_of(hint);
        let d = path_data(&p.pxs(&[white, a, b]), true);
        svg.empty(
            "path",
            &[
                ("d", d),
                ("fill", tint.clone()),
                ("stroke", tint),
                ("stroke-width", s("0.6")),
            ],
        );
    }
    svg.close();
    let xlabel = if uv {
        "u′ (CIE 1976 UCS, dimensionless)"
    } else {
        "x (CIE 1931 chromaticity, dimensionless)"
    };
    let ylabel = if uv {
        "v′ (CIE 1976 UCS, dimensionless)"
    } else {
        "y (CIE 1931 chromaticity, dimensionless)"
    };
    axes(&mut svg, &p, step, [xlabel, ylabel], "main");
    // Spectral locus and purple line.
    let pts: Vec<[f64; 2]> = locus.iter().map(|l| l.1).collect();
    svg.empty(
        "path",
        &[
            ("id", s("spectral-locus")),
            ("class", s("locus")),
            ("d", path_data(&p.pxs(&pts), false)),
            ("fill", s("none")),
            ("stroke", s("#000000")),
            ("stroke-width", s("1.4")),
        ],
    );
    if let (Some(a), Some(b)) = (pts.first(), pts.last()) {
        let (a, b) = (p.px(*a), p.px(*b));
        svg.empty(
            "line",
            &[
                ("id", s("purple-line")),
                ("x1", num(a[0])),
                ("y1", num(a[1])),
                ("x2", num(b[0])),
                ("y2", num(b[1])),
                ("stroke", s("#000000")),
                ("stroke-width", s("1")),
                ("stroke-dasharray", s("3 3")),
            ],
        );
    }
    svg.open(
        "g",
        &[
            ("id", s("wavelengths")),
            ("font-size", num(FONT - 2.0)),
            ("fill", s("#222222")),
        ],
    );
    let wc = p.px(white);
    for nm in LABELLED_NM {
        let Some(c) = locus_at(nm).and_then(map) else { continue };
        let q = p.px(c);
        let d = [q[0] - wc[0], q[1] - wc[1]];
        let len = d[0].hypot(d[1]).max(1e-9);
        let u = [d[0] / len, d[1] / len];
        let t1 = [q[0] + 6.0 * u[0], q[1] + 6.0 * u[1]];
        let lp = [q[0] + 16.0 * u[0], q[1] + 16.0 * u[1] + 4.0];
        svg.open(
            "g",
            &[("class", s("wavelength-label")), ("data-nm", format!("{nm:.0}"))],
        );
        svg.empty(
            "line",
            &[
                ("x1", num(q[0])),
                ("y1", num(q[1])),
                ("x2", num(t1[0])),
                ("y2", num(t1[1])),
                ("stroke", s("#000000")),
                ("stroke-width", s("1")),
            ],
        );
        svg.text(
            "text",
            &[("x", num(lp[0])), ("y", num(lp[1])), ("text-anchor", s("middle"))],
            &format!("{nm:.0} nm"),
        );
        svg.close();
    }
    svg.close();
    // Planckian locus, 1667–25000 K on a logarithmic spacing of temperatures.
    let temps: Vec<f64> = (0..=60)
        .map(|k| 1667.0 * (25000.0f64 / 1667.0).powf(k as f64 / 60.0))
        .collect();
    let planck: Vec<[f64; 2]> = temps.iter().filter_map(|&t| planckian_xy(t).and_then(map)).collect();
    svg.open(
        "g",
        &[
            ("id", s("planckian")),
            ("font-size", num(FONT - 3.0)),
            ("fill", s("#222222")),
        ],
    );
    svg.empty(
        "path",
        &[
            ("id", s("planckian-locus")),
            ("d", path_data(&p.pxs(&planck), false)),
            ("fill", s("none")),
            ("stroke", s("#444444")),
            ("stroke-width", s("1")),
        ],
    );
    for t in MARKED_KELVIN {
        let Some(c) = planckian_xy(t).and_then(map) else {
            continue;
        };
        let q = p.px(c);
        svg.open("g", &[("class", s("cct-mark")), ("data-kelvin", format!("{t:.0}"))]);
        svg.empty(
            "circle",
            &[
                ("cx", num(q[0])),
                ("cy", num(q[1])),
                ("r", s("1.8")),
                ("fill", s("#444444")),
            ],
        );
        // Labels below the curve, away from the white points above it.
        svg.text(
            "text",
            &[
                ("x", num(q[0] + 3.0)),
                ("y", num(q[1] + 12.0)),
                ("text-anchor", s("start")),
            ],
            &format!("{t:.0} K"),
        );
        svg.close();
    }
    svg.close();
    // Profile outlines.
    svg.open("g", &[("id", s("outlines")), ("clip-path", s("url(#plot-area)"))]);
    for (k, l) in fig.layers.iter().enumerate() {
        let pts: Vec<[f64; 2]> = l.outline.iter().filter_map(|&c| map(c)).collect();
        let mut a = vec![
            ("class", s("profile-outline")),
            ("data-profile", l.name.clone()),
            ("d", path_data(&p.pxs(&pts), true)),
        ];
        a.extend(stroke_attrs(k));
        svg.empty("path", &a);
    }
    svg.close();
    // White points.
    svg.open(
        "g",
        &[
            ("id", s("whites")),
            ("font-size", num(FONT - 2.0)),
            ("fill", s("#111111")),
        ],
    );
    for (id, c, label, dx) in [("white-d50", D50_XY, "D50", -6.0), ("white-d65", D65_XY, "D65", -6.0)] {
        let Some(q) = map(c).map(|q| p.px(q)) else { continue };
        svg.open("g", &[("id", s(id)), ("class", s("white-point"))]);
        svg.empty(
            "path",
            &[
                (
                    "d",
                    format!(
                        "M{} {} L{} {} M{} {} L{} {}",
                        num(q[0] - 5.0),
                        num(q[1]),
                        num(q[0] + 5.0),
                        num(q[1]),
                        num(q[0]),
                        num(q[1] - 5.0),
                        num(q[0]),
                        num(q[1] + 5.0)
                    ),
                ),
                ("stroke", s("#000000")),
                ("stroke-width", s("1.4")),
            ],
        );
        let anchor = if dx > 0.0 { "start" } else { "end" };
        svg.text(
            "text",
            &[
                ("x", num(q[0] + dx)),
                ("y", num(q[1] - 4.0)),
                ("text-anchor", s(anchor)),
            ],
            label,
        );
        svg.close();
    }
    svg.close();
    // Pairs that collapse in print, joined where they print (drawn under
    // the markers): the separation problems of `check --svg`.
    if !fig.collapsed.is_empty() {
        let printed_at = |sw: &Swatch| {
            sw.printed_lab
                .or(Some(sw.screen_lab))
                .and_then(lab_to_xy)
                .and_then(map)
                .map(|q| p.px(q))
        };
        svg.open("g", &[("id", s("collapsed-pairs"))]);
        for &[i, j] in &fig.collapsed {
            let (Some(a), Some(b)) = (fig.swatches.get(i), fig.swatches.get(j)) else {
                continue;
            };
            let (Some(pa), Some(pb)) = (printed_at(a), printed_at(b)) else {
                continue;
            };
            svg.empty(
                "line",
                &[
                    vec![
                        ("class", s("collapsed-pair")),
                        ("data-a", a.name.clone()),
                        ("data-b", b.name.clone()),
                        ("x1", num(pa[0])),
                        ("y1", num(pa[1])),
                        ("x2", num(pb[0])),
                        ("y2", num(pb[1])),
                    ],
                    collapsed_stroke(),
                ]
                .concat(),
            );
        }
        svg.close();
    }
    // Palette.
    svg.open("g", &[("id", s("palette"))]);
    for sw in &fig.swatches {
        let Some(at) = lab_to_xy(sw.screen_lab).and_then(map).map(|q| p.px(q)) else {
            continue;
        };
        let to = sw.printed_lab.and_then(lab_to_xy).and_then(map).map(|q| p.px(q));
        swatch(&mut svg, sw, at, to);
    }
    svg.close();
    legend(&mut svg, fig, legend_x, p.y0 + 10.0);
    let title = if uv {
        "CIE 1976 u′v′ chromaticity diagram"
    } else {
        "CIE 1931 xy chromaticity diagram"
    };
    let mut caption = vec![
        "White: D50, the ICC connection space; outlines and palette are relative colorimetric chromaticities (D50-adapted), 2° observer.".to_string(),
        mapping_line(fig),
        "The background tints only hint at hue; they are not the colours of those chromaticities.".to_string(),
    ];
    if uv {
        caption.push(
            "u′v′ spaces colours more evenly than xy: equal distances are closer to equal visible differences."
                .to_string(),
        );
    }
    title_and_caption(&mut svg, title, &caption, p.x0, p.y0 + p.h + 56.0);
    svg.finish()
}

fn bound_of(lines: impl Iterator<Item = [f64; 2]>, f: impl Fn([f64; 2]) -> f64) -> f64 {
    lines.map(f).fold(0.0, f64::max)
}

/// Round `v` up to a multiple of `step`, at least `min`.
fn round_up(v: f64, step: f64, min: f64) -> f64 {
    ((v / step).ceil() * step).max(min)
}

fn slices(fig: &Figure) -> String {
    let near = |sw: &Swatch, l: f64| (sw.screen_lab[0] - l).abs() <= SLICE_WINDOW_L;
    let extent = fig
        .layers
        .iter()
        .flat_map(|l| l.slices.iter().flat_map(|(_, c)| c.iter().flatten().copied()))
        .chain(
            fig.swatches
                .iter()
                .filter(|sw| fig.lightness.iter().any(|&l| near(sw, l)))
                .map(|sw| [sw.screen_lab[1], sw.screen_lab[2]]),
        );
    let r = round_up(bound_of(extent, |p| p[0].abs().max(p[1].abs()) + 4.0), 20.0, 60.0);
    let step = if r > 100.0 { 40.0 } else { 20.0 };
    let size = 300.0;
    let gap = 70.0;
    let panels: Vec<Panel> = (0..fig.lightness.len())
        .map(|k| Panel {
            x0: 80.0 + k as f64 * (size + gap),
            y0: 80.0,
            w: size,
            h: size,
            xr: [-r, r],
            yr: [-r, r],
        })
        .collect();
    let legend_x = 80.0 + fig.lightness.len() as f64 * (size + gap) - gap + 30.0;
    let height = 80.0 + size + 120.0;
    let clips: Vec<(String, Panel)> = panels
        .iter()
        .enumerate()
        .map(|(k, p)| (format!("panel-{}", k + 1), *p))
        .collect();
    let mut svg = page(legend_x, height, &clips);
    for (k, (&l, p)) in fig.lightness.iter().zip(&panels).enumerate() {
        let id = format!("panel-{}", k + 1);
        svg.open(
            "g",
            &[
                ("id", format!("slice-{}", k + 1)),
                ("class", s("slice")),
                ("data-lightness", format!("{l:.1}")),
            ],
        );
        axes(&mut svg, p, [step, step], ["a* (CIELAB D50)", "b* (CIELAB D50)"], &id);
        svg.text(
            "text",
            &[
                ("class", s("panel-title")),
                ("x", num(p.x0 + p.w / 2.0)),
                ("y", num(p.y0 - 8.0)),
                ("text-anchor", s("middle")),
                ("font-size", num(FONT + 1.0)),
            ],
            &format!("L* = {l:.0}"),
        );
        svg.open("g", &[("class", s("contours")), ("clip-path", format!("url(#{id})"))]);
        for (j, layer) in fig.layers.iter().enumerate() {
            let Some((_, contours)) = layer.slices.iter().find(|(sl, _)| *sl == l) else {
                continue;
            };
            for c in contours {
                let mut a = vec![
                    ("class", s("slice-contour")),
                    ("data-profile", layer.name.clone()),
                    ("d", path_data(&p.pxs(c), false)),
                ];
                a.extend(stroke_attrs(j));
                svg.empty("path", &a);
            }
        }
        svg.close();
        svg.open("g", &[("class", s("palette"))]);
        for sw in fig.swatches.iter().filter(|sw| near(sw, l)) {
            let at = p.px([sw.screen_lab[1], sw.screen_lab[2]]);
            let to = sw.printed_lab.map(|q| p.px([q[1], q[2]]));
            swatch(&mut svg, sw, at, to);
        }
        svg.close();
        svg.close();
    }
    legend(&mut svg, fig, legend_x, 90.0);
    let levels: Vec<String> = fig.lightness.iter().map(|l| format!("{l:.0}")).collect();
    let caption = vec![
        format!("Gamut boundaries cut at L* = {} (CIELAB relative to D50, the ICC connection space; relative colorimetric).", levels.join(", ")),
        if fig.swatches.is_empty() {
            String::new()
        } else {
            format!("Palette colours within ±{SLICE_WINDOW_L:.0} L* of a slice are drawn on it.")
        },
        mapping_line(fig),
    ];
    title_and_caption(
        &mut svg,
        "Gamut slices in the a*b* plane",
        &caption,
        80.0,
        80.0 + size + 62.0,
    );
    svg.finish()
}

fn hue_distance(a: f64, b: f64) -> f64 {
    let d = (a - b).rem_euclid(360.0);
    d.min(360.0 - d)
}

fn leaf(fig: &Figure) -> String {
    let h = fig.hue;
    let (sh, ch) = h.to_radians().sin_cos();
    let along = |lab: [f64; 3]| [lab[1] * ch + lab[2] * sh, lab[0]];
    let near = |sw: &Swatch| {
        let lch = LabD50::from_array(sw.screen_lab).to_lch();
        lch.c >= LEAF_MIN_CHROMA && hue_distance(lch.h, h) <= LEAF_WINDOW_DEG
    };
    let extent = fig
        .layers
        .iter()
        .flat_map(|l| l.leaf.iter().flatten().copied())
        .chain(fig.swatches.iter().filter(|sw| near(sw)).map(|sw| along(sw.screen_lab)));
    let cmax = round_up(bound_of(extent, |p| p[0] + 4.0), 20.0, 40.0);
    let size = 420.0;
    let p = Panel {
        x0: 80.0,
        y0: 70.0,
        w: size * (cmax / 100.0).clamp(0.6, 1.6),
        h: size,
        xr: [0.0, cmax],
        yr: [0.0, 100.0],
    };
    let legend_x = p.x0 + p.w + 30.0;
    let height = p.y0 + p.h + 110.0;
    let mut svg = page(legend_x, height, &[(s("plot-area"), p)]);
    axes(
        &mut svg,
        &p,
        [20.0, 10.0],
        ["C*ab (CIELAB D50, chroma)", "L* (CIELAB D50, lightness)"],
        "main",
    );
    svg.open("g", &[("id", s("contours")), ("clip-path", s("url(#plot-area)"))]);
    for (j, layer) in fig.layers.iter().enumerate() {
        for c in &layer.leaf {
            let mut a = vec![
                ("class", s("leaf-contour")),
                ("data-profile", layer.name.clone()),
                ("d", path_data(&p.pxs(c), false)),
            ];
            a.extend(stroke_attrs(j));
            svg.empty("path", &a);
        }
    }
    svg.close();
    svg.open("g", &[("id", s("palette"))]);
    for sw in fig.swatches.iter().filter(|sw| near(sw)) {
        let at = p.px(along(sw.screen_lab));
        let to = sw.printed_lab.map(|q| p.px(along(q)));
        swatch(&mut svg, sw, at, to);
    }
    svg.close();
    legend(&mut svg, fig, legend_x, p.y0 + 10.0);
    let caption = vec![
        format!("Hue leaf at h = {h:.0}°: the gamut boundaries in the half-plane of that hue (CIELAB relative to D50, relative colorimetric)."),
        if fig.swatches.is_empty() {
            String::new()
        } else {
            format!("Palette colours within ±{LEAF_WINDOW_DEG:.0}° of the hue and C* ≥ {LEAF_MIN_CHROMA:.0} are drawn, at their chroma along the hue.")
        },
        mapping_line(fig),
    ];
    title_and_caption(
        &mut svg,
        &format!("Hue leaf at {h:.0}°"),
        &caption,
        p.x0,
        p.y0 + p.h + 56.0,
    );
    svg.finish()
}
