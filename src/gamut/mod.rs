//! Gamut boundaries in CIELAB D50 (relative colorimetric): volume, lightness
//! range, largest chroma per hue sector, coverage between two gamuts, the
//! inside test and the distance (CIEDE2000) to the nearest printable colour.
//!
//! Two methods, one per kind of device:
//!
//! * **RGB** (matrix/TRC or table): the device → CIELAB map is one-to-one, so
//!   the gamut is the solid bounded by the image of the RGB cube's six faces.
//!   The faces are sampled through lcms2 on an n × n grid each, and the
//!   enclosed volume follows from the divergence theorem (Σ p0·(p1×p2)/6).
//!   The faces are smooth, so the error falls as 1/n²: n = 64 is within
//!   0.1 % (see `examples/gamut_convergence.rs`).
//! * **CMYK** (tables, four inks onto three dimensions): the map is
//!   many-to-one and the images of the 4-cube's faces overlap, so no signed
//!   surface integral gives the gamut. Every CIELAB colour the press can make
//!   is made by some ink combination on the boundary of the ink domain (the
//!   set of colours made by one CIELAB value is a curve in the domain, and a
//!   curve in a bounded domain reaches its boundary). The boundary consists
//!   of the eight 3-faces C, M, Y or K = 0 or 100 % cut by the total-ink
//!   limit, plus the 3-face where the total equals the limit. Each 3-face is
//!   sampled on a grid through lcms2, each grid cell is split into six
//!   tetrahedra, and every tetrahedron's image is filled into a voxel grid
//!   (voxel centre inside → set). The union of those images is the gamut;
//!   enclosed cavities are filled from outside, the boundary mesh is the
//!   voxel solid's isosurface (marching tetrahedra), and the volume is the
//!   count of set voxels times the voxel volume.
//!
//! Coverage of A by B rasterises both solids into one shared voxel grid and
//! counts: share = |A ∩ B| / |A|.

mod coverage;
pub mod export;
pub mod grid;
mod ink_domain;
mod locate;
pub mod mesh;
pub mod result;

use lcms2::PixelFormat;
use rayon::prelude::*;
use serde::Serialize;

use crate::color::delta::delta_e00;
use crate::color::LabD50;
pub use crate::conditions::GamutTest;
use crate::icc::header::{self, Signature};
use crate::icc::transform::{self, Shared, Side};
use crate::icc::{inspect, IccProfile, RenderingIntent};
pub use coverage::{coverage_all, coverage_pair, Coverage, COVERAGE_MAX_VOXELS};
use grid::{Grid, GridError, Solid};
pub use ink_domain::ink_domain_faces;
use locate::Locator;
use mesh::Mesh;

/// Why a profile's gamut cannot be computed. Each names the profile.
#[derive(Debug, thiserror::Error)]
pub enum GamutError {
    /// The profile is not an RGB or CMYK device profile.
    #[error("profile '{name}' is {found}; a gamut needs an RGB or CMYK device profile (not a link, abstract or named-colour profile)")]
    Unsupported {
        /// The profile's name.
        name: String,
        /// What the profile is, in words.
        found: String,
    },
    /// lcms2 cannot build the profile's device → CIELAB transform.
    #[error("profile '{name}': lcms2 cannot build its device → CIELAB transform, so its tables cannot be sampled")]
    Transform {
        /// The profile's name.
        name: String,
    },
    /// The device → CIELAB table gives unusable values.
    #[error("profile '{name}': its device → CIELAB table gives unusable values ({detail})")]
    Sampling {
        /// The profile's name.
        name: String,
        /// What is wrong with them, in words.
        detail: String,
    },
    /// The gamut computed is not plausible for a device.
    #[error("profile '{name}': its gamut is not plausible ({detail})")]
    Implausible {
        /// The profile's name.
        name: String,
        /// What is implausible, in words.
        detail: String,
    },
    /// No voxel grid can be laid over the profile's gamut.
    #[error("profile '{name}': {source}")]
    Grid {
        /// The profile's name.
        name: String,
        /// Why no grid fits.
        #[source]
        source: GridError,
    },
    /// No voxel grid covers both gamuts of a coverage.
    #[error("profiles '{a}' and '{b}': no shared grid for their coverage: {source}")]
    CoverageGrid {
        /// The first profile's name.
        a: String,
        /// The second profile's name.
        b: String,
        /// Why no grid fits.
        #[source]
        source: GridError,
    },
    /// No total-ink limit was given and the profile has no CIELAB → CMYK table to measure it from.
    #[error("profile '{name}': no CIELAB → CMYK table to measure the total-ink limit from; give --ink-limit")]
    NoInkLimit {
        /// The profile's name.
        name: String,
    },
    /// The total-ink limit given is outside 1..400 %.
    #[error("the total-ink limit must be between 1 and 400 %, not {value}")]
    InkLimit {
        /// The limit given, percent.
        value: f64,
    },
}

/// The kind of device a gamut belongs to.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum DeviceKind {
    /// An RGB device (a screen).
    Rgb,
    /// A CMYK device (a press).
    Cmyk,
}

/// The total-ink limit a CMYK gamut was computed with.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct InkLimit {
    /// Percent, C + M + Y + K.
    pub percent: f64,
    /// True when measured from the profile's own CIELAB → CMYK table, false
    /// when given by the caller.
    pub measured: bool,
}

impl InkLimit {
    /// The limit measured from a CMYK output profile's own CIELAB → CMYK
    /// table ([`inspect::measure_max_ink`]), at most 400 %; `None` when there
    /// is no such table or it produces (almost) no ink.
    pub fn measure(p: &IccProfile) -> Option<InkLimit> {
        inspect::measure_max_ink(p)
            .map(|m| m.percent)
            .filter(|v| *v >= 1.0)
            .map(|v| InkLimit {
                percent: v.min(400.0),
                measured: true,
            })
    }
}

/// Sampling densities. The defaults meet the accuracy the tests ask for.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct GamutOptions {
    /// CMYK total-ink limit in percent; `None` measures it from the profile.
    pub ink_limit: Option<f64>,
    /// RGB: grid steps per cube edge on each face.
    pub rgb_steps: usize,
    /// CMYK: grid steps per edge of each 3-face of the ink domain.
    pub cmyk_steps: usize,
    /// Voxel edge of the solid, CIELAB units.
    pub voxel: f64,
}

impl Default for GamutOptions {
    fn default() -> Self {
        GamutOptions {
            ink_limit: None,
            rgb_steps: 64,
            cmyk_steps: 16,
            voxel: 1.0,
        }
    }
}

/// The largest chroma within one hue sector.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct HueSector {
    /// Hue angle h_ab in degrees, from (inclusive) …
    pub hue_from: f64,
    /// … to (exclusive).
    pub hue_to: f64,
    /// Largest C*ab among the sampled device colours in the sector.
    pub max_chroma: f64,
    /// L* of that colour.
    pub l_at_max: f64,
    /// Hue angle h_ab of that colour, degrees.
    pub h_at_max: f64,
}

/// Width of a hue sector, degrees; 12 sectors of 30°.
pub const SECTOR_DEGREES: f64 = 30.0;

/// How the shape is held so that it can be rasterised into any grid.
#[derive(Clone, Debug)]
enum Shape {
    /// A closed surface (RGB).
    Surface(Mesh),
    /// Tetrahedra of the ink domain's boundary 3-faces, CIELAB corners (CMYK).
    Cells(Vec<[[f64; 3]; 4]>),
}

/// A device's gamut in CIELAB D50.
#[derive(Clone, Debug)]
pub struct Gamut {
    /// The profile's name.
    pub name: String,
    /// RGB or CMYK.
    pub kind: DeviceKind,
    /// The total-ink limit the solid was computed with; `None` for RGB.
    pub ink_limit: Option<InkLimit>,
    /// Cubic CIELAB units (ΔE*ab³).
    pub volume: f64,
    /// The smallest L* of the gamut's boundary (RGB) or sampled colours (CMYK).
    pub l_min: f64,
    /// The largest L* of the gamut's boundary (RGB) or sampled colours (CMYK).
    pub l_max: f64,
    /// The largest chroma in each hue sector, 0° upwards.
    pub hue_sectors: Vec<HueSector>,
    shape: Shape,
    solid: Solid,
    locator: Locator,
    lo: [f64; 3],
    hi: [f64; 3],
}

type Px3 = [f64; 3];
type Px4 = [f64; 4];

fn sampling_err(name: &str, detail: impl Into<String>) -> GamutError {
    GamutError::Sampling {
        name: name.to_string(),
        detail: detail.into(),
    }
}

/// Device → CIELAB D50, relative colorimetric, shareable across threads.
fn to_lab_transform<T: Copy + lcms2::Pod>(p: &IccProfile, format: PixelFormat) -> Result<Shared<T, Px3>, GamutError> {
    transform::shared(Side::of(p, format), Side::Lab, RenderingIntent::Relative, false)
        .map_err(|_| GamutError::Transform { name: p.name.clone() })
}

fn run<T: Copy + lcms2::Pod + Sync>(t: &Shared<T, Px3>, input: &[T]) -> Vec<Px3> {
    let mut out = vec![[0.0; 3]; input.len()];
    out.par_chunks_mut(4096)
        .zip(input.par_chunks(4096))
        .for_each(|(o, i)| t.transform_pixels(i, o));
    out
}

fn check_finite(name: &str, lab: &[Px3]) -> Result<(), GamutError> {
    if lab.iter().flatten().all(|v| v.is_finite()) {
        Ok(())
    } else {
        Err(sampling_err(name, "CIELAB that is not a finite number"))
    }
}

/// The CIELAB box (D50, relative colorimetric) that holds every device
/// colour, `[L*, a*, b*]` lower and upper bounds.
///
/// - L*: relative colorimetric maps the media white to L* = 100 and nothing
///   a device makes is lighter, except by rounding and encoding: the
///   built-in press re-saved as an ICC v2 profile (whose 16-bit CIELAB
///   encoding puts L* = 100 at FF00h, not FFFFh) reaches L* 100.39
///   (measured), so 101 leaves a margin. Below, a display whose primaries
///   are monochromatic lights (the edge of what is physical) reaches
///   L* −4 when its white is adapted to D50 (computed with the Bradford
///   transform from the CIE 1931 colour-matching functions in
///   `data/cie1931_2deg_5nm.csv`, primaries 700/510/400 nm, D65 white).
/// - a*, b*: the same monochromatic-primary displays reach |a*| 366 and
///   |b*| 174 (primaries 780/505/380 nm and 700/520/380 nm); ProPhoto
///   (ROMM) RGB reaches a* −187 and b* ±172, BT.2020 a* −161. ±400 holds
///   them all.
///
/// A profile whose colours leave this box describes no device: its tables
/// or colorants are damaged. (Encoding spaces with imaginary primaries,
/// whose colours can have negative luminance, fall outside as well.)
pub const PLAUSIBLE_LAB: ([f64; 3], [f64; 3]) = ([-5.0, -400.0, -400.0], [101.0, 400.0, 400.0]);

/// Refuses sampled device colours outside [`PLAUSIBLE_LAB`].
fn check_plausible(name: &str, lo: [f64; 3], hi: [f64; 3]) -> Result<(), GamutError> {
    let (min, max) = PLAUSIBLE_LAB;
    for (d, axis) in ["L*", "a*", "b*"].iter().enumerate() {
        if lo[d] < min[d] || hi[d] > max[d] {
            return Err(GamutError::Implausible {
                name: name.to_string(),
                detail: format!(
                    "its colours reach {axis} {:.1}…{:.1}, but a device's colours lie within {axis} {}…{} after relative colorimetric mapping",
                    lo[d], hi[d], min[d], max[d]
                ),
            });
        }
    }
    Ok(())
}

impl Gamut {
    /// Computes the gamut of an RGB or CMYK profile.
    pub fn of_profile(p: &IccProfile, opts: GamutOptions) -> Result<Gamut, GamutError> {
        let h = &p.header;
        let unsupported = || GamutError::Unsupported {
            name: p.name.clone(),
            found: p.kind_phrase(),
        };
        let bad_class: [Signature; 3] = [header::CLASS_LINK, header::CLASS_ABSTRACT, header::CLASS_NAMED];
        if bad_class.contains(&h.class) {
            return Err(unsupported());
        }
        if !(opts.voxel.is_finite() && opts.voxel > 0.0) {
            return Err(sampling_err(
                &p.name,
                format!("voxel size {} is not positive", opts.voxel),
            ));
        }
        if h.color_space == header::SPACE_RGB {
            Self::rgb(p, opts)
        } else if h.color_space == header::SPACE_CMYK {
            Self::cmyk(p, opts)
        } else {
            Err(unsupported())
        }
    }

    fn rgb(p: &IccProfile, opts: GamutOptions) -> Result<Gamut, GamutError> {
        let t = to_lab_transform::<Px3>(p, PixelFormat::RGB_DBL)?;
        let (device, triangles) = mesh::cube_surface(opts.rgb_steps.max(2));
        let lab = run(&t, &device);
        check_finite(&p.name, &lab)?;
        let mut surface = Mesh {
            vertices: lab,
            triangles,
        };
        let signed = surface.signed_volume();
        if signed < 0.0 {
            surface.flip();
        }
        let volume = signed.abs();
        if volume.is_nan() || volume <= 1.0 {
            return Err(sampling_err(&p.name, "the RGB cube maps to (almost) no volume"));
        }
        let (lo, hi) = surface.bounds().ok_or_else(|| sampling_err(&p.name, "no samples"))?;
        check_plausible(&p.name, lo, hi)?;
        let grid = own_grid(&p.name, lo, hi, opts.voxel)?;
        let work = grid::mesh_work(&grid, &surface.vertices, &surface.triangles);
        check_work(&p.name, work, grid.dims[1] * grid.dims[2], "the RGB cube's faces")?;
        let shape = Shape::Surface(surface.clone());
        let solid = rasterise(&shape, grid);
        Ok(Gamut {
            name: p.name.clone(),
            kind: DeviceKind::Rgb,
            ink_limit: None,
            volume,
            l_min: lo[0],
            l_max: hi[0],
            hue_sectors: hue_sectors(&surface.vertices),
            shape,
            solid,
            locator: Locator::new(surface),
            lo,
            hi,
        })
    }

    fn cmyk(p: &IccProfile, opts: GamutOptions) -> Result<Gamut, GamutError> {
        let limit = match opts.ink_limit {
            Some(v) if (1.0..=400.0).contains(&v) => InkLimit {
                percent: v,
                measured: false,
            },
            Some(value) => return Err(GamutError::InkLimit { value }),
            None => InkLimit::measure(p).ok_or_else(|| GamutError::NoInkLimit { name: p.name.clone() })?,
        };
        let t = to_lab_transform::<Px4>(p, PixelFormat::CMYK_DBL)?;
        let n = opts.cmyk_steps.max(2);
        let faces = ink_domain_faces(limit.percent, n);
        let device: Vec<Px4> = faces.iter().flatten().copied().collect();
        let lab = run(&t, &device);
        check_finite(&p.name, &lab)?;
        let m = n + 1;
        let mut tets = Vec::with_capacity(faces.len() * n * n * n * 6);
        for f in 0..faces.len() {
            let base = f * m * m * m;
            let at = |i: usize, j: usize, k: usize| lab[base + (i * m + j) * m + k];
            for i in 0..n {
                for j in 0..n {
                    for k in 0..n {
                        let c = |b: usize| at(i + (b & 1), j + ((b >> 1) & 1), k + ((b >> 2) & 1));
                        // Six tetrahedra around the cell diagonal 0 → 7.
                        for path in [[1, 3], [1, 5], [2, 3], [2, 6], [4, 5], [4, 6]] {
                            tets.push([c(0), c(path[0]), c(path[1]), c(7)]);
                        }
                    }
                }
            }
        }
        let (lo, hi) = mesh::bounds(&lab).ok_or_else(|| sampling_err(&p.name, "no samples"))?;
        check_plausible(&p.name, lo, hi)?;
        let grid = own_grid(&p.name, lo, hi, opts.voxel)?;
        check_work(
            &p.name,
            grid::tetrahedra_work(&grid, &tets),
            grid.len(),
            "the ink domain's cells",
        )?;
        let shape = Shape::Cells(tets);
        let solid = rasterise(&shape, grid);
        let volume = solid.volume();
        if volume.is_nan() || volume <= 1.0 {
            return Err(sampling_err(&p.name, "the ink domain maps to (almost) no volume"));
        }
        let cubes = solid.boundary_cubes();
        if cubes > MAX_BOUNDARY_CUBES {
            return Err(GamutError::Implausible {
                name: p.name.clone(),
                detail: format!(
                    "its solid is scattered: its boundary passes through {cubes} voxel cubes, more than the {MAX_BOUNDARY_CUBES} a device's gamut needs"
                ),
            });
        }
        let surface = mesh::isosurface(&solid);
        Ok(Gamut {
            name: p.name.clone(),
            kind: DeviceKind::Cmyk,
            ink_limit: Some(limit),
            volume,
            l_min: lo[0],
            l_max: hi[0],
            hue_sectors: hue_sectors(&lab),
            shape,
            solid,
            locator: Locator::new(surface),
            lo,
            hi,
        })
    }

    /// The closed boundary mesh (CIELAB D50), wound outward.
    pub fn boundary(&self) -> &Mesh {
        self.locator.mesh()
    }

    /// The boundary as figures draw it: the RGB surface itself; for CMYK
    /// the voxel solid's surface with its vertices placed within their
    /// voxels ([`mesh::smooth_isosurface`]), so that slices and leaves show
    /// no one-unit steps. The inside test and distances keep [`Self::boundary`].
    pub fn figure_boundary(&self) -> std::borrow::Cow<'_, Mesh> {
        match self.kind {
            DeviceKind::Rgb => std::borrow::Cow::Borrowed(self.boundary()),
            DeviceKind::Cmyk => std::borrow::Cow::Owned(mesh::smooth_isosurface(&self.solid)),
        }
    }

    /// The voxel solid behind the inside test.
    pub fn solid(&self) -> &Solid {
        &self.solid
    }

    /// Bounding box of the sampled colours, CIELAB [L*, a*, b*].
    pub fn bounds(&self) -> ([f64; 3], [f64; 3]) {
        (self.lo, self.hi)
    }

    /// The inside test: the solid's trilinear occupancy at `lab` is at least
    /// one half, i.e. `lab` is inside the boundary mesh. Constant time.
    pub fn contains(&self, lab: LabD50) -> bool {
        self.solid.occupancy(lab.to_array()) >= 0.5
    }

    /// CIEDE2000 from `lab` to the nearest colour of the gamut: 0 inside,
    /// else to the nearest point of the boundary mesh. (Far outside, beyond
    /// the ΔE00 ≈ 10 that CIEDE2000 is made for, its hue terms can rate an
    /// interior colour nearer than any boundary point; the boundary value is
    /// the one reported.)
    pub fn outside_by(&self, lab: LabD50) -> f64 {
        if self.contains(lab) {
            return 0.0;
        }
        self.locator.nearest(lab).map_or(f64::INFINITY, |(_, d)| d)
    }

    /// This gamut's solid on `grid`.
    pub fn rasterise_on(&self, grid: Grid) -> Solid {
        rasterise(&self.shape, grid)
    }
}

/// The grid of a gamut's own solid.
fn own_grid(name: &str, lo: [f64; 3], hi: [f64; 3], voxel: f64) -> Result<Grid, GamutError> {
    Grid::covering(lo, hi, voxel).map_err(|source| GamutError::Grid {
        name: name.to_string(),
        source,
    })
}

/// How many times over the rasterisation of a gamut may examine its grid
/// (voxels for the ink domain's tetrahedra, (a*, b*) columns for the RGB
/// cube's faces, see [`grid::tetrahedra_work`] and [`grid::mesh_work`]).
///
/// A real device's samples are smooth: neighbouring samples are close, so
/// the cells' bounding boxes overlap only where the faces' images do.
/// Measured: RGB 0.5 to 3.4 (the built-in screens, 8 to 512 steps per face),
/// CMYK 4.7 to 5.8 (offset-coated, 12 to 36 steps, voxels of 0.5 to 2). A
/// damaged table whose neighbouring samples jump across the CIELAB box
/// makes every cell span much of it (a lut16 table read as lut8 measured
/// 12,700) and would take hours; 32 leaves a margin of five or more.
pub const MAX_WORK_RATIO: u64 = 32;

/// Most boundary cubes (see [`Solid::boundary_cubes`]) a CMYK solid's
/// boundary mesh may be made from: 2²⁰, at most 12 Mi triangles. The
/// built-in press has 56 k at voxels of 1 CIELAB unit and 227 k at 0.5; a
/// solid with far more is dust from a damaged table, and its mesh would
/// take gigabytes.
pub const MAX_BOUNDARY_CUBES: usize = 1 << 20;

/// Refuses a rasterisation that would examine its grid (`size` voxels or
/// columns) more than [`MAX_WORK_RATIO`] times over.
fn check_work(name: &str, work: u64, size: usize, what: &str) -> Result<(), GamutError> {
    let size = size.max(1) as u64;
    if work <= MAX_WORK_RATIO.saturating_mul(size) {
        return Ok(());
    }
    Err(GamutError::Implausible {
        name: name.to_string(),
        detail: format!(
            "neighbouring samples of {what} lie far apart: filling them would sweep the CIELAB grid {} times over, a device's tables at most {MAX_WORK_RATIO}",
            work / size
        ),
    })
}

/// Memory the parallel fill of tetrahedra may spend on private copies of
/// the cells, bytes (one byte per voxel per copy). 256 MiB: a real gamut's
/// grid (5 to 20 Mi voxels) still gets a copy per thread on 12 or more
/// threads, and a grid at the cap gets a single copy.
const RASTER_COPY_BYTES: usize = 256 << 20;

fn rasterise(shape: &Shape, grid: Grid) -> Solid {
    let mut cells = vec![0u8; grid.len()];
    match shape {
        Shape::Surface(m) => grid::fill_closed_mesh(&grid, &mut cells, &m.vertices, &m.triangles),
        Shape::Cells(tets) => {
            // One private copy of the cells per part, so the parts are
            // bounded by memory as well as by threads.
            let copies = (RASTER_COPY_BYTES / grid.len().max(1)).max(1);
            let parts = rayon::current_num_threads().clamp(1, copies);
            let chunk = tets.len().div_ceil(parts).max(1);
            let partial: Vec<Vec<u8>> = tets
                .par_chunks(chunk)
                .map(|ts| {
                    let mut c = vec![0u8; grid.len()];
                    for &t in ts {
                        grid::fill_tetrahedron(&grid, &mut c, t);
                    }
                    c
                })
                .collect();
            for p in partial {
                for (c, v) in cells.iter_mut().zip(p) {
                    *c |= v;
                }
            }
            grid::fill_cavities(&grid, &mut cells);
        }
    }
    Solid { grid, cells }
}

/// Largest C*ab per 30° hue sector over `samples` (CIELAB).
fn hue_sectors(samples: &[Px3]) -> Vec<HueSector> {
    let count = (360.0 / SECTOR_DEGREES) as usize;
    let mut best: Vec<Option<(f64, f64, f64)>> = vec![None; count];
    for s in samples {
        let lch = LabD50::from_array(*s).to_lch();
        let sector = ((lch.h / SECTOR_DEGREES).floor() as usize).min(count - 1);
        if best[sector].is_none_or(|(c, _, _)| lch.c > c) {
            best[sector] = Some((lch.c, lch.l, lch.h));
        }
    }
    best.into_iter()
        .enumerate()
        .map(|(i, b)| {
            let from = i as f64 * SECTOR_DEGREES;
            let (c, l, h) = b.unwrap_or((0.0, 0.0, from + SECTOR_DEGREES / 2.0));
            HueSector {
                hue_from: from,
                hue_to: from + SECTOR_DEGREES,
                max_chroma: c,
                l_at_max: l,
                h_at_max: h,
            }
        })
        .collect()
}

impl Gamut {
    /// The boundary test behind `inkfit check`: the distance to the gamut in
    /// CIEDE2000 (0 inside) and whether it is within [`NOTICEABLE_DE00`](crate::color::delta::NOTICEABLE_DE00).
    pub fn judge(&self, lab: LabD50) -> (bool, f64) {
        let d = self.outside_by(lab);
        (d <= crate::color::delta::NOTICEABLE_DE00, d)
    }
}

/// CIEDE2000 from `lab` to the nearest of `points` (brute force); used to
/// check the locator and by callers with their own samples.
pub fn nearest_brute_force(lab: LabD50, points: &[Px3]) -> f64 {
    points
        .iter()
        .map(|p| delta_e00(lab, LabD50::from_array(*p)))
        .fold(f64::INFINITY, f64::min)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn plausible_box_admits_real_gamuts_and_refuses_wider() {
        // sRGB and ProPhoto bounds as the sampling gives them (computed).
        assert!(check_plausible("s", [0.0, -79.0, -112.0], [100.0, 94.0, 93.0]).is_ok());
        assert!(check_plausible("p", [0.0, -187.0, -172.0], [100.0, 145.0, 172.0]).is_ok());
        // The v2 CIELAB encoding's white.
        assert!(check_plausible("v2", [9.4, -40.0, -50.0], [100.39, 70.0, 90.0]).is_ok());
        for (lo, hi) in [
            ([0.0, 0.0, 0.0], [101.5, 10.0, 10.0]),
            ([-6.0, 0.0, 0.0], [100.0, 10.0, 10.0]),
            ([0.0, -401.0, 0.0], [100.0, 10.0, 10.0]),
            ([0.0, 0.0, 0.0], [100.0, 10.0, 15850.0]),
        ] {
            let e = check_plausible("x.icc", lo, hi).unwrap_err().to_string();
            assert!(e.contains("x.icc") && e.contains("not plausible"), "{e}");
        }
    }

    #[test]
    fn work_beyond_the_ratio_is_refused() {
        assert!(check_work("x", 32 * 1000, 1000, "cells").is_ok());
        let e = check_work("x", 32 * 1000 + 1, 1000, "cells").unwrap_err().to_string();
        assert!(e.contains("not plausible") && e.contains("32"), "{e}");
        // The budget saturates instead of wrapping.
        assert!(check_work("x", u64::MAX, 1 << 40, "cells").is_err());
        assert!(check_work("x", u64::MAX, usize::MAX, "cells").is_ok());
    }
}
