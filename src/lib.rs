//! inkfit: screen colours judged against an offset print condition.
//!
//! Data flows one way:
//!
//! ```text
//! files ──> icc (profiles) / color::css (colour text) / swatch (palettes)
//!       ──> analyses (swatch::check, color::delta, icc::inspect)
//!       ──> plain result structs (serde) ──> report (tables, JSON) ──> io (atomic writes)
//! ```
//!
//! Start reading at [`swatch::check`] for the main job, [`icc`] for profiles
//! and [`press`] for the built-in press condition.
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
pub mod gamut;
pub mod icc;
pub mod io;
pub mod plot;
pub mod precision;
pub mod press;
pub mod proof;
pub mod report;
pub mod swatch;
