//! SVG figures: the CIE 1931 xy and CIE 1976 u′v′ chromaticity diagrams with
//! profile outlines, a*b* slices at fixed L* and hue leaves (L* against C*),
//! with palette colours and where the press puts them.
//!
//! Data flow: profiles and gamuts → [`ProfileLayer`] per profile (outline,
//! slice and leaf contours, computed in [`geometry`]) and [`Swatch`] per
//! palette entry → [`Figure`] → [`render`] (a string of deterministic SVG,
//! fixed precision, stable element order) → `io::write_atomic`.

pub mod figure;
pub mod geometry;
pub mod labels;
pub mod locus;
pub mod svg;

use lcms2::PixelFormat;

use crate::color::Xy;
use crate::gamut::Gamut;
use crate::icc::transform::{self, Local, Side};
use crate::icc::{IccProfile, RenderingIntent};
use crate::swatch::check::CheckReport;
use geometry::Polyline;

pub use figure::render;

/// The figures inkfit draws.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PlotKind {
    /// CIE 1931 xy chromaticity diagram.
    Xy,
    /// CIE 1976 u′v′ chromaticity diagram.
    Uv,
    /// a*b* slices at fixed L*.
    Ab,
    /// L* against C* at one hue angle.
    Leaf,
}

impl PlotKind {
    /// Every kind, in the order listed in messages.
    pub const ALL: [PlotKind; 4] = [PlotKind::Xy, PlotKind::Uv, PlotKind::Ab, PlotKind::Leaf];

    /// The name on the command line: "xy", "uv", "ab" or "leaf".
    pub fn key(self) -> &'static str {
        match self {
            PlotKind::Xy => "xy",
            PlotKind::Uv => "uv",
            PlotKind::Ab => "ab",
            PlotKind::Leaf => "leaf",
        }
    }

    /// The kind named `s`; an error for any other name.
    pub fn parse(s: &str) -> Result<PlotKind, PlotError> {
        PlotKind::ALL
            .into_iter()
            .find(|k| k.key() == s)
            .ok_or_else(|| PlotError::UnknownKind { kind: s.to_string() })
    }

    /// True for the chromaticity diagrams.
    pub fn is_chromaticity(self) -> bool {
        matches!(self, PlotKind::Xy | PlotKind::Uv)
    }
}

/// Why a figure cannot be made. Each names what was wrong.
#[derive(Debug, thiserror::Error)]
pub enum PlotError {
    /// The kind named is not one inkfit draws.
    #[error("unknown figure kind '{kind}': choose xy, uv, ab or leaf")]
    UnknownKind {
        /// The name given.
        kind: String,
    },
    /// No profile was given.
    #[error("no profile to draw: give at least one --profile")]
    NoProfiles,
    /// A `--lightness` value is not a list of L* values in 0..100.
    #[error("--lightness {value}: each L* must be between 0 and 100")]
    Lightness {
        /// The text given.
        value: String,
    },
    /// A `--hue` value is not an angle in 0..360.
    #[error("--hue {value}: the hue angle must be between 0 and 360 degrees")]
    Hue {
        /// The text given.
        value: String,
    },
    /// A profile cannot be drawn.
    #[error("profile '{name}': {detail}")]
    Profile {
        /// The profile's name.
        name: String,
        /// Why, in words.
        detail: String,
    },
    /// The output file does not end in `.svg`.
    #[error("--out '{path}': the figure is SVG, give a file ending in .svg")]
    OutExtension {
        /// The output path given.
        path: String,
    },
}

/// Parses `--lightness 30,50,70`: one or more L* values in 0–100, kept in
/// the order given.
pub fn parse_lightness(s: &str) -> Result<Vec<f64>, PlotError> {
    let err = || PlotError::Lightness { value: s.to_string() };
    let v: Vec<f64> = s
        .split(',')
        .map(|f| f.trim().parse::<f64>().map_err(|_| err()))
        .collect::<Result<_, _>>()?;
    if v.is_empty() || v.iter().any(|l| !(l.is_finite() && (0.0..=100.0).contains(l))) {
        return Err(err());
    }
    Ok(v)
}

/// Checks a hue angle in degrees, 0–360.
pub fn check_hue(h: f64) -> Result<f64, PlotError> {
    if h.is_finite() && (0.0..=360.0).contains(&h) {
        Ok(h)
    } else {
        Err(PlotError::Hue { value: h.to_string() })
    }
}

/// How a profile's chromaticity outline was found.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum OutlineMethod {
    /// Matrix RGB: the triangle of its primaries.
    Primaries,
    /// The traced boundary of the projected gamut solid.
    ProjectedGamut,
}

/// Longest profile label in a legend, characters: what fits beside the key
/// with the kind phrase in the legend's width.
pub const LEGEND_LABEL_CHARS: usize = 28;

/// What a figure draws for one profile.
#[derive(Clone, Debug)]
pub struct ProfileLayer {
    /// The profile's name.
    pub name: String,
    /// The legend text, e.g. "srgb — a display RGB profile".
    pub words: String,
    /// Chromaticity outline (closed, counter-clockwise), in xy; empty for
    /// figures that do not need it.
    pub outline: Vec<Xy>,
    /// How the outline was found.
    pub method: OutlineMethod,
    /// (L*, contours in a*b*) per requested lightness.
    pub slices: Vec<(f64, Vec<Polyline>)>,
    /// Contours in (signed chroma, L*) of the hue leaf.
    pub leaf: Vec<Polyline>,
}

/// A palette colour in a figure.
#[derive(Clone, Debug, PartialEq)]
pub struct Swatch {
    /// The entry's name.
    pub name: String,
    /// CIELAB D50 as the screen shows it.
    pub screen_lab: [f64; 3],
    /// CIELAB D50 as printed, when a press was given.
    pub printed_lab: Option<[f64; 3]>,
    /// Whether the press gamut holds it, when a press was given.
    pub in_gamut: Option<bool>,
}

impl Swatch {
    /// The swatches of a palette check: screen and printed colour, gamut verdict.
    pub fn from_check(r: &CheckReport) -> Vec<Swatch> {
        r.entries
            .iter()
            .map(|e| Swatch {
                name: e.name.clone(),
                screen_lab: e.screen_lab,
                printed_lab: Some(e.printed_lab),
                in_gamut: Some(e.in_gamut),
            })
            .collect()
    }
}

/// Everything one figure shows.
#[derive(Clone, Debug)]
pub struct Figure {
    /// Which figure.
    pub kind: PlotKind,
    /// One layer per profile, in the order given.
    pub layers: Vec<ProfileLayer>,
    /// The palette colours drawn; empty without a palette.
    pub swatches: Vec<Swatch>,
    /// L* of the a*b* slices.
    pub lightness: Vec<f64>,
    /// Hue angle of the leaf, degrees.
    pub hue: f64,
    /// How palette colours reach the press, in words, e.g. "relative
    /// colorimetric with black point compensation onto offset-coated";
    /// `None` without a press.
    pub mapping: Option<String>,
    /// Pairs of swatches (0-based) whose printed CIEDE2000 falls below the
    /// separation floor: joined by a line in the chromaticity diagrams.
    pub collapsed: Vec<[usize; 2]>,
}

/// Default slice levels of `--lightness`.
pub const DEFAULT_LIGHTNESS: [f64; 3] = [30.0, 50.0, 70.0];
/// Levels of the figure `gamut --svg` writes.
pub const GAMUT_LIGHTNESS: [f64; 3] = [25.0, 50.0, 75.0];
/// Default hue of `--hue`, degrees (a blue).
pub const DEFAULT_HUE: f64 = 250.0;

fn profile_err(p: &IccProfile, detail: impl Into<String>) -> PlotError {
    PlotError::Profile {
        name: p.name.clone(),
        detail: detail.into(),
    }
}

/// True when the profile's gamut in chromaticity is the triangle of its
/// primaries: a matrix/TRC RGB profile without device → PCS tables.
pub fn is_matrix_rgb(p: &IccProfile) -> bool {
    p.header.color_space == crate::icc::header::SPACE_RGB && p.is_matrix_shaper() && p.header.tag(b"A2B0").is_none()
}

/// xy of the full red, green and blue of an RGB profile through lcms2
/// (relative colorimetric, so D50-adapted as in the ICC connection space).
pub fn primaries_xy(p: &IccProfile) -> Result<[Xy; 3], PlotError> {
    let t: Local<[f64; 3], [f64; 3]> = transform::local(
        Side::of(p, PixelFormat::RGB_DBL),
        Side::Lab,
        RenderingIntent::Relative,
        false,
    )
    .map_err(|_| profile_err(p, "lcms2 cannot build its RGB → CIELAB transform"))?;
    let rgb = [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]];
    let mut out = [[0.0; 3]; 3];
    t.transform_pixels(&rgb, &mut out);
    let mut xy = [Xy { x: 0.0, y: 0.0 }; 3];
    for (k, lab) in out.iter().enumerate() {
        xy[k] = geometry::lab_to_xy(*lab).ok_or_else(|| profile_err(p, "a primary has no chromaticity"))?;
    }
    Ok(xy)
}

/// Builds what `kind` draws for one profile. A chromaticity diagram of a
/// matrix RGB profile needs no gamut; everything else needs `gamut`, the
/// profile's gamut solid.
pub fn layer_for(
    kind: PlotKind,
    p: &IccProfile,
    gamut: Option<&Gamut>,
    lightness: &[f64],
    hue: f64,
) -> Result<ProfileLayer, PlotError> {
    let need_gamut = || gamut.ok_or_else(|| profile_err(p, "its gamut is needed for this figure"));
    let mut layer = ProfileLayer {
        name: p.name.clone(),
        words: format!("{} — {}", p.legend_label(LEGEND_LABEL_CHARS), p.kind_phrase()),
        outline: Vec::new(),
        method: OutlineMethod::Primaries,
        slices: Vec::new(),
        leaf: Vec::new(),
    };
    match kind {
        PlotKind::Xy | PlotKind::Uv => {
            if is_matrix_rgb(p) {
                layer.outline = primaries_xy(p)?.to_vec();
                let pts: Vec<[f64; 2]> = layer.outline.iter().map(|c| [c.x, c.y]).collect();
                if geometry::polygon_area(&pts) < 0.0 {
                    layer.outline.reverse();
                }
            } else {
                layer.method = OutlineMethod::ProjectedGamut;
                layer.outline = geometry::projected_outline(need_gamut()?.boundary(), geometry::XY_CELL);
                if layer.outline.len() < 3 {
                    return Err(profile_err(p, "its gamut has no chromaticity outline"));
                }
            }
        }
        PlotKind::Ab => {
            let m = need_gamut()?.figure_boundary();
            let m = &*m;
            layer.slices = lightness
                .iter()
                .map(|&l| (l, geometry::lightness_slice(m, l)))
                .collect();
        }
        PlotKind::Leaf => {
            layer.leaf = geometry::hue_leaf(&need_gamut()?.figure_boundary(), hue);
        }
    }
    Ok(layer)
}

/// Whether `kind` needs the gamut solid of profile `p`.
pub fn needs_gamut(kind: PlotKind, p: &IccProfile) -> bool {
    !(kind.is_chromaticity() && is_matrix_rgb(p))
}
