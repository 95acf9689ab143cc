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

pub mod cli;
pub mod color;
pub mod gamut;
pub mod icc;
pub mod io;
pub mod plot;
pub mod press;
pub mod proof;
pub mod report;
pub mod swatch;
