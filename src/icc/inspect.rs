//! What a practitioner asks of a profile: its identity, white, the intents it
//! carries tables for, primaries of matrix RGB profiles, and the largest total
//! ink a CMYK output profile's Lab → CMYK table produces (measured by sampling).

use lcms2::{InfoType, Locale, PixelFormat};
use serde::Serialize;

use super::header::{self, read_matrix3, read_xyz};
use super::transform::{self, Local, Side};
use super::{Direction, IccProfile, RenderingIntent, TableUse};
use crate::color::{LabD50, Xy, Xyz, D50};

/// What `inspect` reports about one profile (the JSON of `inkfit inspect`).
#[derive(Clone, Debug, Serialize)]
pub struct ProfileReport {
    /// The name a user knows it by: the built-in name or the path as given.
    pub name: String,
    /// True for one of inkfit's built-ins.
    pub builtin: bool,
    /// ICC version from the header, "major.minor.bugfix".
    pub version: String,
    /// Device class signature from the header (`mntr`, `prtr`, …).
    pub class: String,
    /// The class and colour space in words: "an RGB display profile" etc.
    pub class_phrase: String,
    /// Colour space of the device data, from the header (`RGB `, `CMYK`, …).
    pub color_space: String,
    /// Profile connection space from the header (`XYZ ` or `Lab `).
    pub pcs: String,
    /// The profile's description text, if it has one that is not blank.
    pub description: Option<String>,
    /// The profile's copyright text, if it has one that is not blank.
    pub copyright: Option<String>,
    /// Creation date and time from the header, "YYYY-MM-DD hh:mm:ss".
    pub created: String,
    /// Profile size the header declares, bytes.
    pub size_bytes: usize,
    /// mediaWhitePoint tag, XYZ (Y = 1) as stored (D50-adapted in v4).
    pub white_point_xyz: Option<[f64; 3]>,
    /// The media white as CIELAB D50.
    pub white_point_lab: Option<[f64; 3]>,
    /// "matrix/TRC" for a matrix/TRC profile without an A2B0 tag, else "lookup tables".
    pub model: &'static str,
    /// Which table serves each of the four intents, both ways.
    pub intents: Vec<IntentTables>,
    /// Matrix RGB profiles: primaries and white as chromaticities before
    /// adaptation to D50 (undone with the chad tag, or Bradford from D50 to
    /// the media white for v2 profiles without one).
    pub primaries: Option<Primaries>,
    /// CMYK output profiles: largest C+M+Y+K (percent) that the Lab → CMYK
    /// table produces, found by sampling; null otherwise.
    pub max_ink: Option<f64>,
    /// How `max_ink` was found, in words; null when it was not measured.
    pub max_ink_method: Option<String>,
    /// Signatures of every tag, in tag-table order.
    pub tags: Vec<String>,
}

/// The tables that serve one intent.
#[derive(Clone, Debug, Serialize)]
pub struct IntentTables {
    /// The intent.
    pub intent: RenderingIntent,
    /// What converts device values to the connection space (A2Bn).
    pub to_pcs: TableReport,
    /// What converts connection-space values to device values (B2An).
    pub from_pcs: TableReport,
}

/// How an intent and direction is served by a profile.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum TableStatus {
    /// A table of its own.
    Own,
    /// A tag whose data is the same as another's (shared offsets).
    SameAs,
    /// No tag; lcms2 uses another intent's table.
    FallsBack,
    /// A matrix/TRC model, colorimetric.
    Matrix,
    /// Nothing serves it.
    Missing,
}

/// One intent and direction of a profile: its status and tags.
#[derive(Clone, Debug, Serialize)]
pub struct TableReport {
    /// How it is served.
    pub status: TableStatus,
    /// For "own" and "same-as": the intent's own tag.
    pub tag: Option<String>,
    /// For "same-as" and "falls-back": the tag that actually serves.
    pub served_by: Option<String>,
}

/// Chromaticities (CIE 1931 x, y) of a matrix RGB profile's primaries and white.
#[derive(Clone, Debug, Serialize)]
pub struct Primaries {
    /// Red primary, x and y.
    pub red: [f64; 2],
    /// Green primary, x and y.
    pub green: [f64; 2],
    /// Blue primary, x and y.
    pub blue: [f64; 2],
    /// White point, x and y.
    pub white: [f64; 2],
    /// How the adaptation to D50 was undone: "chad tag" or Bradford to the media white.
    pub adapted_from: &'static str,
}

fn table_report(u: TableUse) -> TableReport {
    match u {
        TableUse::Own(t) => TableReport {
            status: TableStatus::Own,
            tag: Some(t.to_string()),
            served_by: None,
        },
        TableUse::SameAs { tag, other } => TableReport {
            status: TableStatus::SameAs,
            tag: Some(tag.to_string()),
            served_by: Some(other.to_string()),
        },
        TableUse::FallsBackTo(t) => TableReport {
            status: TableStatus::FallsBack,
            tag: None,
            served_by: Some(t.to_string()),
        },
        TableUse::Matrix => TableReport {
            status: TableStatus::Matrix,
            tag: None,
            served_by: None,
        },
        TableUse::Missing => TableReport {
            status: TableStatus::Missing,
            tag: None,
            served_by: None,
        },
    }
}

/// Inspects a loaded profile.
pub fn inspect(p: &IccProfile) -> ProfileReport {
    let h = &p.header;
    let text = |t| p.lcms.info(t, Locale::none()).filter(|s| !s.trim().is_empty());
    let white = h.tag(b"wtpt").and_then(|t| read_xyz(&p.bytes, t));
    let white_lab = white.map(|w| LabD50::from_xyz(Xyz::new(w[0], w[1], w[2])).to_array());
    let intents = RenderingIntent::ALL
        .iter()
        .map(|&intent| IntentTables {
            intent,
            to_pcs: table_report(p.table_use(intent, Direction::ToPcs)),
            from_pcs: table_report(p.table_use(intent, Direction::FromPcs)),
        })
        .collect();
    let max_ink = measure_max_ink(p);
    let c = h.created;
    ProfileReport {
        name: p.name.clone(),
        builtin: p.is_builtin(),
        version: h.version_string(),
        class: h.class.to_string(),
        class_phrase: p.kind_phrase(),
        color_space: h.color_space.to_string(),
        pcs: h.pcs.to_string(),
        description: text(InfoType::Description),
        copyright: text(InfoType::Copyright),
        created: format!("{:04}-{:02}-{:02} {:02}:{:02}:{:02}", c[0], c[1], c[2], c[3], c[4], c[5]),
        size_bytes: h.size,
        white_point_xyz: white,
        white_point_lab: white_lab,
        model: if p.is_matrix_shaper() && h.tag(b"A2B0").is_none() {
            "matrix/TRC"
        } else {
            "lookup tables"
        },
        intents,
        primaries: primaries(p),
        max_ink: max_ink.map(|m| m.percent),
        max_ink_method: max_ink.map(|m| {
            format!("measured: largest C+M+Y+K of {} CIELAB points, a grid then a local search around the heaviest, sent through the relative colorimetric Lab → CMYK table", m.samples)
        }),
        tags: h.tags.iter().map(|t| t.sig.to_string()).collect(),
    }
}

fn invert3(m: [[f64; 3]; 3]) -> Option<[[f64; 3]; 3]> {
    let det = m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
        + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
    if det.abs() < 1e-12 {
        return None;
    }
    let mut inv = [[0.0; 3]; 3];
    for (i, row) in inv.iter_mut().enumerate() {
        for (j, v) in row.iter_mut().enumerate() {
            // Cofactor of m[j][i] over the determinant.
            let (r0, r1) = ((j + 1) % 3, (j + 2) % 3);
            let (c0, c1) = ((i + 1) % 3, (i + 2) % 3);
            *v = (m[r0][c0] * m[r1][c1] - m[r0][c1] * m[r1][c0]) / det;
        }
    }
    Some(inv)
}

fn mul(m: [[f64; 3]; 3], v: [f64; 3]) -> [f64; 3] {
    [
        m[0][0] * v[0] + m[0][1] * v[1] + m[0][2] * v[2],
        m[1][0] * v[0] + m[1][1] * v[1] + m[1][2] * v[2],
        m[2][0] * v[0] + m[2][1] * v[1] + m[2][2] * v[2],
    ]
}

/// Bradford chromatic adaptation matrix from white `src` to white `dst`
/// (Lam 1985; the form used in ICC.1:2010 Annex E).
pub fn bradford(src: [f64; 3], dst: [f64; 3]) -> [[f64; 3]; 3] {
    const B: [[f64; 3]; 3] = [
        [0.8951, 0.2664, -0.1614],
        [-0.7502, 1.7135, 0.0367],
        [0.0389, -0.0685, 1.0296],
    ];
    let bi = invert3(B).unwrap_or(B);
    let s = mul(B, src);
    let d = mul(B, dst);
    let scale = [
        [d[0] / s[0], 0.0, 0.0],
        [0.0, d[1] / s[1], 0.0],
        [0.0, 0.0, d[2] / s[2]],
    ];
    let mm = |a: [[f64; 3]; 3], b: [[f64; 3]; 3]| {
        let mut r = [[0.0; 3]; 3];
        for i in 0..3 {
            for j in 0..3 {
                r[i][j] = (0..3).map(|k| a[i][k] * b[k][j]).sum();
            }
        }
        r
    };
    mm(bi, mm(scale, B))
}

fn xy_of(v: [f64; 3]) -> [f64; 2] {
    let c = Xyz::new(v[0], v[1], v[2])
        .chromaticity()
        .unwrap_or(Xy { x: 0.0, y: 0.0 });
    [crate::precision::round(c.x, 6), crate::precision::round(c.y, 6)]
}

fn primaries(p: &IccProfile) -> Option<Primaries> {
    let h = &p.header;
    if h.color_space != header::SPACE_RGB || !p.is_matrix_shaper() {
        return None;
    }
    let col = |s: &[u8; 4]| h.tag(s).and_then(|t| read_xyz(&p.bytes, t));
    let (r, g, b) = (col(b"rXYZ")?, col(b"gXYZ")?, col(b"bXYZ")?);
    let wtpt = col(b"wtpt").unwrap_or(D50.to_array());
    // chad maps the actual illuminant to D50; its inverse undoes the adaptation.
    let (to_actual, from) = match h.tag(b"chad").and_then(|t| read_matrix3(&p.bytes, t)) {
        Some(chad) => (invert3(chad)?, "chad tag"),
        None => (
            bradford(D50.to_array(), wtpt),
            "Bradford to the media white (no chad tag)",
        ),
    };
    let white = match h.tag(b"chad") {
        Some(_) => mul(to_actual, wtpt),
        None => wtpt,
    };
    Some(Primaries {
        red: xy_of(mul(to_actual, r)),
        green: xy_of(mul(to_actual, g)),
        blue: xy_of(mul(to_actual, b)),
        white: xy_of(white),
        adapted_from: from,
    })
}

/// The largest total ink a CMYK output profile's Lab → CMYK table produces.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct MaxInk {
    /// C + M + Y + K in percent, rounded to 0.1.
    pub percent: f64,
    /// How many CIELAB points were sent through the table.
    pub samples: usize,
}

/// Samples CIELAB through the relative colorimetric Lab → CMYK table of a
/// CMYK output profile and returns the largest total ink found; `None` for
/// any other kind of profile or when lcms2 cannot use the table. The one
/// measurement behind `inspect`'s `max_ink` and the ink limit of `gamut` and
/// `check`.
pub fn measure_max_ink(p: &IccProfile) -> Option<MaxInk> {
    let h = &p.header;
    if h.color_space != header::SPACE_CMYK || h.class != header::CLASS_OUTPUT {
        return None;
    }
    let t: Local<[f64; 3], [f64; 4]> = transform::local(
        Side::Lab,
        Side::of(p, PixelFormat::CMYK_DBL),
        RenderingIntent::Relative,
        false,
    )
    .ok()?;
    // A damaged table can give CMYK outside 0–100 % or no finite number at
    // all: a channel holds at most 100 % ink, and a sample that is no
    // finite number counts as no ink found, never as the heaviest.
    let ink = |lab: &[[f64; 3]]| -> Vec<f64> {
        let mut out = vec![[0.0; 4]; lab.len()];
        t.transform_pixels(lab, &mut out);
        out.iter()
            .map(|c| {
                if c.iter().all(|v| v.is_finite()) {
                    c.iter().map(|v| v.clamp(0.0, 100.0)).sum::<f64>()
                } else {
                    f64::NEG_INFINITY
                }
            })
            .collect()
    };
    let samples = max_ink_samples();
    let totals = ink(&samples);
    let mut count = samples.len();
    // Refine around the 16 heaviest samples by a compass search (halving
    // steps from 4 to 1/8 CIELAB units): table nodes rarely fall on the grid.
    let mut order: Vec<usize> = (0..samples.len()).collect();
    order.sort_by(|&a, &b| totals[b].total_cmp(&totals[a]).then(a.cmp(&b)));
    let mut max = totals.iter().copied().fold(0.0, f64::max);
    for &start in order.iter().take(16) {
        let (mut p, mut best) = (samples[start], totals[start]);
        let mut step = 4.0;
        while step >= 0.125 {
            let moves: Vec<[f64; 3]> = (0..6)
                .map(|m| {
                    let mut q = p;
                    q[m / 2] += if m % 2 == 0 { step } else { -step };
                    q[0] = q[0].clamp(0.0, 100.0);
                    q
                })
                .collect();
            let totals = ink(&moves);
            count += moves.len();
            match totals.iter().enumerate().max_by(|a, b| a.1.total_cmp(b.1)) {
                Some((i, &v)) if v > best => {
                    best = v;
                    p = moves[i];
                }
                _ => step /= 2.0,
            }
        }
        max = max.max(best);
    }
    let percent = (max * 10.0).round() / 10.0;
    percent.is_finite().then_some(MaxInk {
        percent,
        samples: count,
    })
}

/// A coarse grid over the whole CIELAB cube plus a dense one over the
/// shadows, where the total ink peaks.
fn max_ink_samples() -> Vec<[f64; 3]> {
    let mut v = Vec::new();
    for i in 0..=16 {
        for j in 0..=16 {
            for k in 0..=16 {
                v.push([
                    100.0 * f64::from(i) / 16.0,
                    -128.0 + 16.0 * f64::from(j),
                    -128.0 + 16.0 * f64::from(k),
                ]);
            }
        }
    }
    for l in 0..=40 {
        for j in 0..=16 {
            for k in 0..=16 {
                v.push([f64::from(l), -64.0 + 8.0 * f64::from(j), -64.0 + 8.0 * f64::from(k)]);
            }
        }
    }
    v
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bradford_d65_to_d50_matches_published_matrix() {
        // Bradford D65 → D50 as the CSS Color 4 sample code gives it (from
        // memory): first row 1.0478, 0.0229, -0.0501; [2][2] 0.7521.
        let d65 = [0.95047, 1.0, 1.08883];
        let m = bradford(d65, [0.96422, 1.0, 0.82521]);
        assert!((m[0][0] - 1.0478112).abs() < 1e-4, "{m:?}");
        assert!((m[0][1] - 0.0228866).abs() < 1e-4, "{m:?}");
        assert!((m[0][2] + 0.0501270).abs() < 1e-4, "{m:?}");
        assert!((m[2][2] - 0.7521316).abs() < 1e-4, "{m:?}");
    }
}
