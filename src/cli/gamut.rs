//! `inkfit gamut`: load every profile first, then compute each gamut, the
//! coverage of every pair and any boundary meshes, then render.

use std::io::Write;
use std::path::{Path, PathBuf};

use clap::Args;

use super::{Error, Outcome};
use crate::gamut::export::{write_mesh, MeshFormat};
use crate::gamut::result::{GamutReport, MeshFile};
use crate::gamut::{coverage_all, Gamut, GamutError, GamutOptions};
use crate::icc::IccProfile;

/// The options of `gamut`.
#[derive(Args, Debug)]
pub struct GamutArgs {
    /// Profiles (built-in names or ICC files): RGB screens or CMYK presses.
    #[arg(required = true, value_name = "PROFILE")]
    pub profiles: Vec<String>,
    /// Write JSON instead of tables.
    #[arg(long)]
    pub json: bool,
    /// Write each boundary as a triangle mesh: .ply, .gltf or .glb (several profiles: FILE-1.ext, FILE-2.ext, …).
    #[arg(long, value_name = "FILE")]
    pub mesh: Option<PathBuf>,
    /// Total-ink limit for CMYK profiles in percent (default: measured from each profile's CIELAB → CMYK table).
    #[arg(long, allow_negative_numbers = true, value_name = "PERCENT")]
    pub ink_limit: Option<f64>,
    /// Also write a*b* slices of every gamut at L* 25, 50 and 75 as SVG.
    #[arg(long, value_name = "FILE.svg")]
    pub svg: Option<PathBuf>,
    /// Also write one self-contained HTML page: volumes, coverage, the slices and the most chromatic colour per hue.
    #[arg(long, value_name = "FILE.html")]
    pub html: Option<PathBuf>,
}

/// Voxel edge of the shared coverage grid, CIELAB units.
const COVERAGE_VOXEL: f64 = 1.0;

/// Where the mesh of profile `k` (0-based) of `count` goes: the path itself
/// for one profile, else `<stem>-<k+1>.<ext>` beside it.
fn mesh_path(base: &Path, k: usize, count: usize) -> PathBuf {
    if count == 1 {
        return base.to_path_buf();
    }
    let stem = base
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default();
    let ext = base
        .extension()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default();
    base.with_file_name(format!("{stem}-{}.{ext}", k + 1))
}

pub fn run_gamut(a: GamutArgs, out: &mut dyn Write) -> Result<Outcome, Error> {
    // The plan: options and every profile checked before any work.
    if let Some(v) = a.ink_limit {
        if !(v.is_finite() && (1.0..=400.0).contains(&v)) {
            return Err(GamutError::InkLimit { value: v }.into());
        }
    }
    if let Some(p) = &a.svg {
        super::plot::check_svg_path(p)?;
    }
    if let Some(p) = &a.html {
        super::check_html_path(p)?;
    }
    let format = match &a.mesh {
        Some(p) => Some(
            MeshFormat::from_path(p)
                .ok_or_else(|| format!("--mesh '{}': give a file ending in .ply, .gltf or .glb", p.display()))?,
        ),
        None => None,
    };
    let profiles = a
        .profiles
        .iter()
        .map(|s| IccProfile::load(s))
        .collect::<Result<Vec<_>, _>>()?;
    let refs: Vec<&IccProfile> = profiles.iter().collect();
    let mut outputs = super::guarded_outputs(&[], &refs);
    if let Some(base) = &a.mesh {
        for k in 0..profiles.len() {
            outputs.claim(&mesh_path(base, k, profiles.len()))?;
        }
    }
    for p in [&a.svg, &a.html].into_iter().flatten() {
        outputs.claim(p)?;
    }
    let opts = GamutOptions {
        ink_limit: a.ink_limit,
        ..GamutOptions::default()
    };
    let gamuts = profiles
        .iter()
        .map(|p| Gamut::of_profile(p, opts))
        .collect::<Result<Vec<_>, _>>()?;
    let coverage = coverage_all(&gamuts, COVERAGE_VOXEL)?;
    let mut meshes = Vec::new();
    if let (Some(base), Some(format)) = (&a.mesh, format) {
        for (k, g) in gamuts.iter().enumerate() {
            let path = mesh_path(base, k, gamuts.len());
            let m = g.boundary();
            outputs.stage(&path, |w| write_mesh(w, m, &g.name, format))?;
            meshes.push(MeshFile {
                profile: g.name.clone(),
                file: path.display().to_string(),
                vertices: m.vertices.len(),
                triangles: m.triangles.len(),
            });
        }
    }
    let r = GamutReport::new(&gamuts, coverage, meshes);
    let mut wrote = Vec::new();
    if a.svg.is_some() || a.html.is_some() {
        let fig = super::plot::gamut_figure(&profiles, &gamuts)?;
        let svg = crate::plot::render(&fig);
        if let Some(p) = &a.svg {
            outputs.stage_bytes(p, svg.as_bytes())?;
            wrote.push((p, "the a*b* slices"));
        }
        if let Some(p) = &a.html {
            let page = crate::report::html::gamut::render(&crate::report::html::gamut::GamutPage {
                report: &r,
                figure: &svg,
                slices: &fig.lightness,
            });
            outputs.stage_bytes(p, page.as_bytes())?;
            wrote.push((p, "the gamut page"));
        }
    }
    outputs.commit()?;
    for (p, what) in wrote {
        super::said_wrote(p, what);
    }
    if a.json {
        crate::report::write_json(out, &r)?;
    } else {
        crate::report::gamut::render(out, &r)?;
    }
    Ok(Outcome::Done)
}
