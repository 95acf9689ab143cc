//! inkfit: screen colours judged against an offset print condition.
//!
//! Data flows one way; a module only uses modules above it in this list:
//!
//! ```text
//! color, precision        pure kernels: colour spaces, ΔE formulas, CSS colour, CVD; rounding
//! icc                     profiles (bounded reads, strict tag checks, built-ins), the one lcms2
//!                         transform factory (icc::transform), inspection
//! conditions              the header every check, proof and repair report opens with
//! raster                  image files: bounded PNG/JPEG/TIFF reading and encoding
//! gamut                   gamut solids, boundary meshes, nearest-point search, coverage, export
//! press                   the built-in press conditions: spec, printing model, gamut mapping,
//!                         inversion, ICC writer (the committed bytes live in icc::builtin)
//! swatch                  palette files, artwork, map styles and map rasters, and palette
//!                         analyses: check, separation, order, survival, repair, rewriting
//! proof                   soft proofs of images: exact model, ΔE00 table, statistics
//! plot                    SVG figures: loci, outlines, sections, layout per kind
//! report                  text tables, JSON and self-contained HTML pages for every result struct
//! io                      the output guard: atomic, all-or-nothing writes, never over an input
//! cli                     (feature `cli`) the command line over all of the above
//! ```
//!
//! Start reading at [`swatch::check`] for the main job, [`icc`] for
//! profiles, [`press`] for the built-in press condition, [`gamut`] for gamut
//! solids, [`proof`] for images and [`plot`] for figures.
//!
//! As a library, without the command line (`default-features = false`):
//!
//! ```
//! # fn main() -> Result<(), Box<dyn std::error::Error>> {
//! use inkfit::gamut::InkLimit;
//! use inkfit::icc::transform::PressMapping;
//! use inkfit::icc::{IccProfile, RenderingIntent};
//! use inkfit::swatch::check::{check_against, CheckOptions};
//! use inkfit::swatch::Palette;
//!
//! let palette = Palette::read("fixtures/demo/landuse.csv".as_ref())?;
//! let screen = IccProfile::load("srgb")?.require_screen()?;
//! let press = IccProfile::load("offset-coated")?.require_press()?;
//! let opts = CheckOptions {
//!     mapping: PressMapping { intent: RenderingIntent::Relative, bpc: true, paper_white: false },
//!     tolerance: 2.0,
//!     ink_limit: InkLimit::measure(&press),
//! };
//! let report = check_against(&palette, &screen, &press, opts, None)?;
//! assert_eq!(report.entries.len(), palette.entries.len());
//! for e in &report.entries {
//!     println!("{}: ΔE00 {:.2}, in gamut {}", e.name, e.delta_e00, e.in_gamut);
//! }
//! # Ok(())
//! # }
//! ```

#![warn(missing_docs)]

#[cfg(feature = "cli")]
pub mod cli;
pub mod color;
pub mod conditions;
pub mod gamut;
pub mod icc;
pub mod io;
pub mod plot;
pub mod precision;
pub mod press;
pub mod proof;
pub mod raster;
pub mod report;
pub mod swatch;
