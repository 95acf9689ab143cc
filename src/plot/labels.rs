//! Placing the names of palette markers so that no two labels overlap, and
//! no label covers a marker, a fixed label (wavelengths, white points) or
//! leaves the panel.
//!
//! A greedy search, crowded markers first: each label tries positions
//! around its marker (eight directions, at growing distances) and takes the
//! first that is free; from the second ring on it is joined to its marker by
//! a leader line. A label that finds no free place is left off (the marker
//! keeps its `<title>`, and the figure says how many were left off).
//! Text extents are estimated from the character count at an average
//! advance of 0.58 em, which covers the sans-serif faces browsers and resvg
//! pick for digits and lower-case Latin (common practice for layout without
//! font metrics); a little margin around every box absorbs the rest.

/// An axis-aligned box in SVG pixels (y down).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Rect {
    /// Left edge.
    pub x0: f64,
    /// Top edge.
    pub y0: f64,
    /// Right edge.
    pub x1: f64,
    /// Bottom edge.
    pub y1: f64,
}

impl Rect {
    /// The box around a centre with half-sizes `hw`, `hh`.
    pub fn around(c: [f64; 2], hw: f64, hh: f64) -> Rect {
        Rect {
            x0: c[0] - hw,
            y0: c[1] - hh,
            x1: c[0] + hw,
            y1: c[1] + hh,
        }
    }

    /// True when the two boxes share interior area.
    pub fn overlaps(&self, o: &Rect) -> bool {
        self.x0 < o.x1 && o.x0 < self.x1 && self.y0 < o.y1 && o.y0 < self.y1
    }

    /// True when `self` lies wholly inside `o`.
    pub fn inside(&self, o: &Rect) -> bool {
        self.x0 >= o.x0 && self.x1 <= o.x1 && self.y0 >= o.y0 && self.y1 <= o.y1
    }

    /// The box grown by `m` on every side.
    pub fn grown(&self, m: f64) -> Rect {
        Rect {
            x0: self.x0 - m,
            y0: self.y0 - m,
            x1: self.x1 + m,
            y1: self.y1 + m,
        }
    }
}

/// Estimated width of `text` at font size `font` (see the module notes).
pub fn text_width(text: &str, font: f64) -> f64 {
    text.chars().count() as f64 * 0.58 * font
}

/// The box of a text drawn at (`x`, baseline `y`) with `text-anchor`
/// `anchor` ("start", "middle" or "end"): from the cap height above the
/// baseline to the descenders below it.
pub fn text_box(x: f64, y: f64, text: &str, font: f64, anchor: &str) -> Rect {
    let w = text_width(text, font);
    let x0 = match anchor {
        "end" => x - w,
        "middle" => x - w / 2.0,
        _ => x,
    };
    Rect {
        x0,
        y0: y - 0.8 * font,
        x1: x0 + w,
        y1: y + 0.25 * font,
    }
}

/// Where one label goes.
#[derive(Clone, Debug, PartialEq)]
pub struct Placed {
    /// The text's x and baseline y.
    pub x: f64,
    /// Baseline.
    pub y: f64,
    /// `text-anchor`: "start", "middle" or "end".
    pub anchor: &'static str,
    /// The box the label takes.
    pub rect: Rect,
    /// The label's end of a leader line from the marker, when it stands off.
    pub leader: Option<[f64; 2]>,
}

/// Distances (pixels from the marker's centre to the nearest edge of its
/// label) tried in turn; from the second on a leader line is drawn.
const RINGS: [f64; 6] = [8.0, 20.0, 34.0, 50.0, 70.0, 95.0];
/// Half-size of the box a marker keeps clear (its largest, the diamond).
const MARKER_HALF: f64 = 6.5;
/// Space kept between labels.
const GAP: f64 = 1.5;

/// Places `texts[k]` beside `points[k]` within `bounds`, clear of
/// `obstacles`, of every marker and of each other. `None` for a label left
/// off.
pub fn place(
    points: &[[f64; 2]],
    texts: &[String],
    font: f64,
    bounds: Rect,
    obstacles: &[Rect],
) -> Vec<Option<Placed>> {
    let n = points.len().min(texts.len());
    let markers: Vec<Rect> = points[..n]
        .iter()
        .map(|&p| Rect::around(p, MARKER_HALF, MARKER_HALF))
        .collect();
    // Crowded markers first: they have the fewest free places.
    let crowd: Vec<usize> = (0..n)
        .map(|k| {
            points[..n]
                .iter()
                .filter(|q| (q[0] - points[k][0]).hypot(q[1] - points[k][1]) < 60.0)
                .count()
        })
        .collect();
    let mut order: Vec<usize> = (0..n).collect();
    order.sort_by_key(|&k| (std::cmp::Reverse(crowd[k]), k));
    let mut taken: Vec<Rect> = Vec::new();
    let mut out = vec![None; n];
    for k in order {
        out[k] = candidates(points[k], &texts[k], font).into_iter().find(|c| {
            let r = c.rect.grown(GAP);
            c.rect.inside(&bounds)
                && !taken.iter().any(|t| t.overlaps(&r))
                && !obstacles.iter().any(|o| o.overlaps(&r))
                && !markers.iter().any(|m| m.overlaps(&r))
        });
        if let Some(c) = &out[k] {
            taken.push(c.rect);
        }
    }
    out
}

/// The positions a label tries, nearest first: east, west, the four
/// diagonals, north and south, on each ring.
fn candidates(p: [f64; 2], text: &str, font: f64) -> Vec<Placed> {
    let (up, down) = (0.8 * font, 0.25 * font);
    let mut v = Vec::with_capacity(RINGS.len() * 8);
    for (ring, &d) in RINGS.iter().enumerate() {
        let diag = d * std::f64::consts::FRAC_1_SQRT_2;
        // (x, baseline y, anchor) for each direction.
        let spots: [(f64, f64, &'static str); 8] = [
            (p[0] + d, p[1] + (up - down) / 2.0, "start"),
            (p[0] - d, p[1] + (up - down) / 2.0, "end"),
            (p[0] + diag, p[1] - diag, "start"),
            (p[0] - diag, p[1] - diag, "end"),
            (p[0] + diag, p[1] + diag + up, "start"),
            (p[0] - diag, p[1] + diag + up, "end"),
            (p[0], p[1] - d - down, "middle"),
            (p[0], p[1] + d + up, "middle"),
        ];
        for (x, y, anchor) in spots {
            let rect = text_box(x, y, text, font, anchor);
            let leader = (ring > 0).then(|| nearest_on(&rect, p));
            v.push(Placed {
                x,
                y,
                anchor,
                rect,
                leader,
            });
        }
    }
    v
}

/// The point of `r`'s outline nearest to `p` (outside it).
fn nearest_on(r: &Rect, p: [f64; 2]) -> [f64; 2] {
    [p[0].clamp(r.x0, r.x1), p[1].clamp(r.y0, r.y1)]
}

#[cfg(test)]
mod tests {
    use super::*;

    fn bounds() -> Rect {
        Rect {
            x0: 0.0,
            y0: 0.0,
            x1: 600.0,
            y1: 500.0,
        }
    }

    // Property: whatever is placed lies inside the bounds and overlaps no
    // other label, no marker and no obstacle.
    #[test]
    fn placed_labels_never_collide() {
        let mut seed = 0x9e37_79b9_7f4a_7c15_u64;
        let mut rnd = move || {
            seed ^= seed << 13;
            seed ^= seed >> 7;
            seed ^= seed << 17;
            (seed >> 11) as f64 / (1u64 << 53) as f64
        };
        for case in 0..200 {
            let n = 1 + case % 40;
            let pts: Vec<[f64; 2]> = (0..n).map(|_| [80.0 + 300.0 * rnd(), 80.0 + 300.0 * rnd()]).collect();
            let names: Vec<String> = (0..n).map(|k| format!("class {k} {}", "x".repeat(k % 9))).collect();
            let obstacles = [Rect::around([200.0, 200.0], 30.0, 8.0)];
            let placed = place(&pts, &names, 11.0, bounds(), &obstacles);
            let rects: Vec<(usize, Rect)> = placed
                .iter()
                .enumerate()
                .filter_map(|(k, p)| p.as_ref().map(|p| (k, p.rect)))
                .collect();
            for (k, r) in &rects {
                assert!(r.inside(&bounds()), "case {case}: label {k} leaves the bounds");
                assert!(!r.overlaps(&obstacles[0]), "case {case}: label {k} covers the obstacle");
                for (m, p) in pts.iter().enumerate() {
                    assert!(
                        !r.overlaps(&Rect::around(*p, MARKER_HALF, MARKER_HALF)),
                        "case {case}: label {k} covers marker {m}"
                    );
                }
                for (m, o) in &rects {
                    assert!(k == m || !r.overlaps(o), "case {case}: labels {k} and {m} overlap");
                }
            }
        }
    }

    // Property: a lone marker in open space gets its label on the first ring,
    // without a leader, to its right.
    #[test]
    fn a_lone_marker_is_labelled_beside_it() {
        let placed = place(&[[300.0, 250.0]], &["meadow".to_string()], 11.0, bounds(), &[]);
        let p = placed[0].as_ref().expect("placed");
        assert_eq!(p.anchor, "start");
        assert!(p.leader.is_none());
        assert!((p.x - 308.0).abs() < 1e-9);
    }

    // Property: ten markers on one spot still get ten distinct, non-overlapping
    // labels (with leaders) when there is room around them.
    #[test]
    fn a_cluster_spreads_out_with_leaders() {
        let pts = vec![[300.0, 250.0]; 10];
        let names: Vec<String> = (0..10).map(|k| format!("c{k}")).collect();
        let placed = place(&pts, &names, 11.0, bounds(), &[]);
        assert!(placed.iter().all(Option::is_some));
        assert!(placed.iter().flatten().filter(|p| p.leader.is_some()).count() >= 2);
    }
}
