//! The xy and u′v′ chromaticity diagrams: spectral locus with wavelength
//! ticks, Planckian locus, white points, profile outlines and palette
//! markers with arrows from screen to print.

use super::*;

pub(super) fn chromaticity(fig: &Figure) -> String {
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
