//! The xy and u′v′ chromaticity diagrams: spectral locus with wavelength
//! ticks, Planckian locus, white points, profile outlines and palette
//! markers with arrows from screen to print. [`chromaticity`] draws them as
//! a sequence of named layers, bottom to top.

use super::*;

/// Font size of the Planckian locus's temperature labels.
const PLANCK_FONT: f64 = FONT - 3.0;

/// The diagram's coordinates: the panel, and xy or u′v′.
struct Diagram {
    panel: Panel,
    uv: bool,
    /// The equal-energy point, the centre of the background fan.
    white: [f64; 2],
    step: [f64; 2],
}

impl Diagram {
    fn new(uv: bool) -> Self {
        let (xr, yr, step, scale) = if uv {
            ([0.0, 0.65], [0.0, 0.65], [0.1, 0.1], 800.0)
        } else {
            ([0.0, 0.8], [0.0, 0.9], [0.1, 0.1], 600.0)
        };
        let panel = Panel {
            x0: 80.0,
            y0: 60.0,
            w: (xr[1] - xr[0]) * scale,
            h: (yr[1] - yr[0]) * scale,
            xr,
            yr,
        };
        let mut d = Diagram {
            panel,
            uv,
            white: [0.3, 0.3],
            step,
        };
        d.white = d
            .map(Xy {
                x: 1.0 / 3.0,
                y: 1.0 / 3.0,
            })
            .unwrap_or([0.3, 0.3]);
        d
    }

    /// Diagram coordinates of a chromaticity.
    fn map(&self, c: Xy) -> Option<[f64; 2]> {
        if self.uv {
            uv_prime(c)
        } else {
            Some([c.x, c.y])
        }
    }

    /// The spectral locus in diagram coordinates, with wavelengths.
    fn locus(&self) -> Vec<(f64, [f64; 2])> {
        spectral_locus()
            .into_iter()
            .filter_map(|(nm, c)| self.map(c).map(|q| (nm, q)))
            .collect()
    }
}

pub(super) fn chromaticity(fig: &Figure) -> String {
    let d = Diagram::new(fig.kind == PlotKind::Uv);
    let p = d.panel;
    let legend_x = p.x0 + p.w + 30.0;
    let height = p.y0 + p.h + 110.0;
    let mut svg = page(legend_x, height, &[(s("plot-area"), p)]);
    let locus = d.locus();
    background(&mut svg, &d, &locus);
    axes(&mut svg, &p, d.step, axis_labels(d.uv), "main");
    spectral_locus_lines(&mut svg, &d, &locus);
    let mut fixed = wavelength_ticks(&mut svg, &d);
    fixed.extend(planckian_locus(&mut svg, &d));
    profile_outlines(&mut svg, &d, fig);
    fixed.extend(white_points(&mut svg, &d));
    collapsed_pairs(&mut svg, &d, fig);
    let left_off = palette(&mut svg, &d, fig, &fixed);
    legend(&mut svg, fig, legend_x, p.y0 + 10.0);
    title_and_captions(&mut svg, &d, fig, left_off);
    svg.finish()
}

fn axis_labels(uv: bool) -> [&'static str; 2] {
    if uv {
        ["u′ (CIE 1976 UCS, dimensionless)", "v′ (CIE 1976 UCS, dimensionless)"]
    } else {
        [
            "x (CIE 1931 chromaticity, dimensionless)",
            "y (CIE 1931 chromaticity, dimensionless)",
        ]
    }
}

/// A fan of pale tints from the equal-energy point to the locus.
fn background(svg: &mut Svg, d: &Diagram, locus: &[(f64, [f64; 2])]) {
    let p = &d.panel;
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
        let d = path_data(&p.pxs(&[d.white, a, b]), true);
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
}

/// The spectral locus and the purple line.
fn spectral_locus_lines(svg: &mut Svg, d: &Diagram, locus: &[(f64, [f64; 2])]) {
    let p = &d.panel;
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
}

/// Ticks and labels at [`LABELLED_NM`] on the locus, pointing away from white.
fn wavelength_ticks(svg: &mut Svg, d: &Diagram) -> Vec<Rect> {
    let mut rects = Vec::new();
    svg.open(
        "g",
        &[
            ("id", s("wavelengths")),
            ("font-size", num(FONT - 2.0)),
            ("fill", s("#222222")),
        ],
    );
    for t in wavelength_labels(d) {
        svg.open(
            "g",
            &[("class", s("wavelength-label")), ("data-nm", format!("{:.0}", t.nm))],
        );
        svg.empty(
            "line",
            &[
                ("x1", num(t.at[0])),
                ("y1", num(t.at[1])),
                ("x2", num(t.tick_end[0])),
                ("y2", num(t.tick_end[1])),
                ("stroke", s("#000000")),
                ("stroke-width", s("1")),
            ],
        );
        svg.text(
            "text",
            &[
                ("x", num(t.text[0])),
                ("y", num(t.text[1])),
                ("text-anchor", s("middle")),
            ],
            &t.label,
        );
        svg.close();
        rects.push(t.rect);
    }
    svg.close();
    rects
}

/// One wavelength's tick and label.
struct WavelengthLabel {
    nm: f64,
    /// The locus point.
    at: [f64; 2],
    tick_end: [f64; 2],
    /// The text's centre x and baseline y.
    text: [f64; 2],
    label: String,
    rect: Rect,
}

/// The labelled wavelengths: a tick pointing away from the equal-energy
/// point, the label beyond it; a label that would leave the plot area
/// (over the frame or an axis title) goes on the inner side of the locus.
fn wavelength_labels(d: &Diagram) -> Vec<WavelengthLabel> {
    let p = &d.panel;
    let font = FONT - 2.0;
    let area = Rect {
        x0: p.x0 + 2.0,
        y0: p.y0 + 2.0,
        x1: p.x0 + p.w - 2.0,
        y1: p.y0 + p.h - 2.0,
    };
    let wc = p.px(d.white);
    let mut out = Vec::new();
    for nm in LABELLED_NM {
        let Some(c) = locus_at(nm).and_then(|c| d.map(c)) else {
            continue;
        };
        let q = p.px(c);
        let v = [q[0] - wc[0], q[1] - wc[1]];
        let len = v[0].hypot(v[1]).max(1e-9);
        let u = [v[0] / len, v[1] / len];
        let label = format!("{nm:.0} nm");
        let at_side = |sign: f64| {
            let t1 = [q[0] + sign * 6.0 * u[0], q[1] + sign * 6.0 * u[1]];
            let lp = [q[0] + sign * 18.0 * u[0], q[1] + sign * 18.0 * u[1] + 0.3 * font];
            let rect = labels::text_box(lp[0], lp[1], &label, font, "middle");
            (t1, lp, rect)
        };
        let (mut t1, mut lp, mut rect) = at_side(1.0);
        if !rect.inside(&area) {
            (t1, lp, rect) = at_side(-1.0);
        }
        out.push(WavelengthLabel {
            nm,
            at: q,
            tick_end: t1,
            text: lp,
            label,
            rect,
        });
    }
    out
}

/// The Planckian locus with marks at [`MARKED_KELVIN`].
fn planckian_locus(svg: &mut Svg, d: &Diagram) -> Vec<Rect> {
    let mut rects = Vec::new();
    let p = &d.panel;
    // Planckian locus, 1667–25000 K on a logarithmic spacing of temperatures.
    let temps: Vec<f64> = (0..=60)
        .map(|k| 1667.0 * (25000.0f64 / 1667.0).powf(k as f64 / 60.0))
        .collect();
    let planck: Vec<[f64; 2]> = temps
        .iter()
        .filter_map(|&t| planckian_xy(t).and_then(|c| d.map(c)))
        .collect();
    svg.open(
        "g",
        &[
            ("id", s("planckian")),
            ("font-size", num(PLANCK_FONT)),
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
        let Some(c) = planckian_xy(t).and_then(|c| d.map(c)) else {
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
        let label = format!("{t:.0} K");
        rects.push(labels::text_box(q[0] + 3.0, q[1] + 12.0, &label, PLANCK_FONT, "start"));
        rects.push(Rect::around(q, 2.0, 2.0));
        svg.text(
            "text",
            &[
                ("x", num(q[0] + 3.0)),
                ("y", num(q[1] + 12.0)),
                ("text-anchor", s("start")),
            ],
            &label,
        );
        svg.close();
    }
    svg.close();
    rects
}

/// The outline of each profile's gamut.
fn profile_outlines(svg: &mut Svg, d: &Diagram, fig: &Figure) {
    let p = &d.panel;
    // Profile outlines.
    svg.open("g", &[("id", s("outlines")), ("clip-path", s("url(#plot-area)"))]);
    for (k, l) in fig.layers.iter().enumerate() {
        let pts: Vec<[f64; 2]> = l.outline.iter().filter_map(|&c| d.map(c)).collect();
        let mut a = vec![
            ("class", s("profile-outline")),
            ("data-profile", l.name.clone()),
            ("d", path_data(&p.pxs(&pts), true)),
        ];
        a.extend(stroke_attrs(k));
        svg.empty("path", &a);
    }
    svg.close();
}

/// D50 and D65.
fn white_points(svg: &mut Svg, d: &Diagram) -> Vec<Rect> {
    let mut rects = Vec::new();
    let p = &d.panel;
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
        let Some(q) = d.map(c).map(|q| p.px(q)) else { continue };
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
        rects.push(labels::text_box(q[0] + dx, q[1] - 4.0, label, FONT - 2.0, anchor));
        rects.push(Rect::around(q, 5.0, 5.0));
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
    rects
}

/// Pairs that collapse in print, joined where they print.
fn collapsed_pairs(svg: &mut Svg, d: &Diagram, fig: &Figure) {
    let p = &d.panel;
    // Pairs that collapse in print, joined where they print (drawn under
    // the markers): the separation problems of `check --svg`.
    if !fig.collapsed.is_empty() {
        let printed_at = |sw: &Swatch| {
            sw.printed_lab
                .or(Some(sw.screen_lab))
                .and_then(lab_to_xy)
                .and_then(|c| d.map(c))
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
}

/// Each palette colour with its arrow from screen to print, and its name.
fn palette(svg: &mut Svg, d: &Diagram, fig: &Figure, fixed: &[Rect]) -> usize {
    let p = &d.panel;
    svg.open("g", &[("id", s("palette"))]);
    let mut named: Vec<([f64; 2], String)> = Vec::new();
    for sw in &fig.swatches {
        let Some(at) = lab_to_xy(sw.screen_lab).and_then(|c| d.map(c)).map(|q| p.px(q)) else {
            continue;
        };
        let to = sw
            .printed_lab
            .and_then(lab_to_xy)
            .and_then(|c| d.map(c))
            .map(|q| p.px(q));
        swatch(svg, sw, at, to);
        named.push((at, sw.name.clone()));
    }
    svg.close();
    marker_names(svg, p, &named, fixed)
}

/// Title and the caption lines.
fn title_and_captions(svg: &mut Svg, d: &Diagram, fig: &Figure, left_off: usize) {
    let p = &d.panel;
    let title = if d.uv {
        "CIE 1976 u′v′ chromaticity diagram"
    } else {
        "CIE 1931 xy chromaticity diagram"
    };
    let mut caption = vec![
        "White: D50, the ICC connection space; outlines and palette are relative colorimetric chromaticities (D50-adapted), 2° observer.".to_string(),
        mapping_line(fig),
        "The background tints only hint at hue; they are not the colours of those chromaticities.".to_string(),
    ];
    if left_off > 0 {
        caption.push(names_left_off(left_off));
    }
    if d.uv {
        caption.push(
            "u′v′ spaces colours more evenly than xy: equal distances are closer to equal visible differences."
                .to_string(),
        );
    }
    title_and_caption(svg, title, &caption, p.x0, p.y0 + p.h + 56.0);
}
