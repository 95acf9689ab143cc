//! The `inkfit gamut` result as plain values, rounded for stable output; the
//! text table is [`crate::report::gamut`].

use crate::precision::round;

use serde::Serialize;

use super::{Coverage, DeviceKind, Gamut};

/// The result of `gamut` (its JSON): every profile's gamut and the coverages between them.
#[derive(Clone, Debug, Serialize)]
pub struct GamutReport {
    /// One entry per profile, in the order given.
    pub profiles: Vec<ProfileGamut>,
    /// How much of one gamut lies inside another, per pair asked for.
    pub coverage: Vec<Coverage>,
    /// How the solids were computed, in words.
    pub method: Vec<String>,
    /// Mesh files written, in profile order.
    pub meshes: Vec<MeshFile>,
}

/// One profile's gamut as reported.
#[derive(Clone, Debug, Serialize)]
pub struct ProfileGamut {
    /// The profile's name.
    pub name: String,
    /// RGB or CMYK.
    pub kind: DeviceKind,
    /// Cubic CIELAB units, rounded to a whole number.
    pub volume: f64,
    /// The smallest L*, 2 decimals.
    pub l_min: f64,
    /// The largest L*, 2 decimals.
    pub l_max: f64,
    /// Total-ink limit in percent for CMYK, null for RGB.
    pub ink_limit: Option<f64>,
    /// "measured" (from the profile's CIELAB → CMYK table) or "given".
    pub ink_limit_source: Option<&'static str>,
    /// The largest chroma in each hue sector (C*ab and L* to 2 decimals).
    pub hue_sectors: Vec<super::HueSector>,
}

/// One mesh file written.
#[derive(Clone, Debug, Serialize)]
pub struct MeshFile {
    /// The profile whose gamut it holds.
    pub profile: String,
    /// The file's path as written.
    pub file: String,
    /// Vertices in the mesh.
    pub vertices: usize,
    /// Triangles in the mesh.
    pub triangles: usize,
}

impl GamutReport {
    /// The report of these gamuts, coverages and mesh files, with the numbers rounded for output.
    pub fn new(gamuts: &[Gamut], coverage: Vec<Coverage>, meshes: Vec<MeshFile>) -> GamutReport {
        let profiles = gamuts
            .iter()
            .map(|g| ProfileGamut {
                name: g.name.clone(),
                kind: g.kind,
                volume: round(g.volume, 0),
                l_min: round(g.l_min, 2),
                l_max: round(g.l_max, 2),
                ink_limit: g.ink_limit.map(|l| round(l.percent, 1)),
                ink_limit_source: g.ink_limit.map(|l| if l.measured { "measured" } else { "given" }),
                hue_sectors: g
                    .hue_sectors
                    .iter()
                    .map(|s| super::HueSector {
                        hue_from: s.hue_from,
                        hue_to: s.hue_to,
                        max_chroma: round(s.max_chroma, 2),
                        l_at_max: round(s.l_at_max, 2),
                        h_at_max: round(s.h_at_max, 2),
                    })
                    .collect(),
            })
            .collect();
        let coverage = coverage
            .into_iter()
            .map(|c| Coverage {
                a_inside_b: round(c.a_inside_b, 4),
                intersection_volume: round(c.intersection_volume, 0),
                ..c
            })
            .collect();
        let mut method = Vec::new();
        if gamuts.iter().any(|g| g.kind == DeviceKind::Rgb) {
            method.push(
                "RGB: the six faces of the RGB cube sent through the profile (relative colorimetric) and the enclosed volume by the divergence theorem"
                    .to_string(),
            );
        }
        if gamuts.iter().any(|g| g.kind == DeviceKind::Cmyk) {
            method.push(
                "CMYK: the boundary 3-faces of the ink-limited ink domain sent through the profile (relative colorimetric) and filled into a voxel grid of 1 CIELAB unit"
                    .to_string(),
            );
        }
        if !gamuts.is_empty() && gamuts.len() > 1 {
            method.push("coverage: both solids counted on one shared voxel grid".to_string());
        }
        GamutReport {
            profiles,
            coverage,
            method,
            meshes,
        }
    }
}
