//! Sections of the CIELAB solids: a*b* slices at fixed lightness and a
//! lightness–chroma leaf at one hue, with the palette entries near each.

use super::*;

fn bound_of(lines: impl Iterator<Item = [f64; 2]>, f: impl Fn([f64; 2]) -> f64) -> f64 {
    lines.map(f).fold(0.0, f64::max)
}

/// Round `v` up to a multiple of `step`, at least `min`.
fn round_up(v: f64, step: f64, min: f64) -> f64 {
    ((v / step).ceil() * step).max(min)
}

pub(super) fn slices(fig: &Figure) -> String {
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
    let mut left_off = 0;
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
        let mut named = Vec::new();
        for sw in fig.swatches.iter().filter(|sw| near(sw, l)) {
            let at = p.px([sw.screen_lab[1], sw.screen_lab[2]]);
            let to = sw.printed_lab.map(|q| p.px([q[1], q[2]]));
            swatch(&mut svg, sw, at, to);
            named.push((at, sw.name.clone()));
        }
        svg.close();
        left_off += marker_names(&mut svg, p, &named, &[]);
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
    let mut caption = caption;
    if left_off > 0 {
        caption.push(names_left_off(left_off));
    }
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

pub(super) fn leaf(fig: &Figure) -> String {
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
    let mut named = Vec::new();
    for sw in fig.swatches.iter().filter(|sw| near(sw)) {
        let at = p.px(along(sw.screen_lab));
        let to = sw.printed_lab.map(|q| p.px(along(q)));
        swatch(&mut svg, sw, at, to);
        named.push((at, sw.name.clone()));
    }
    svg.close();
    let left_off = marker_names(&mut svg, &p, &named, &[]);
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
    let mut caption = caption;
    if left_off > 0 {
        caption.push(names_left_off(left_off));
    }
    title_and_caption(
        &mut svg,
        &format!("Hue leaf at {h:.0}°"),
        &caption,
        p.x0,
        p.y0 + p.h + 56.0,
    );
    svg.finish()
}
