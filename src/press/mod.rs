//! The built-in press conditions: what each is built from (`spec.rs`), the
//! printing model, its inversion with black generation, and the writer of
//! the ICC output profile built from them. The committed profile bytes are
//! profiles like any other and live with the built-in profiles in
//! [`crate::icc::builtin`]; this module depends on `icc`, never the reverse.

pub mod cgats;
pub mod correction;
pub mod fit;
pub mod icc_writer;
pub mod invert;
pub mod mapping;
pub mod model;
pub mod spec;
pub mod tone;

pub use icc_writer::build_icc;
pub use invert::InkSolution;
pub use model::{newsprint_coldset, offset_coated, offset_uncoated, PrintCondition};
pub use spec::{Aims, GcrCurve, PressSpec};

/// Errors of the press module.
#[derive(Debug, thiserror::Error)]
pub enum PressError {
    /// A press spec with parameters outside their documented ranges.
    #[error("invalid press condition: {0}")]
    InvalidSpec(String),
    /// A Little CMS call failed (allocation, sampling, tag writing, saving).
    #[error("lcms2 call failed: {0}")]
    Lcms(&'static str),
    /// The saved profile did not read back as written.
    #[error("profile check after saving failed: {0}")]
    Verify(String),
}

/// Names of the built-in press conditions.
pub const BUILTIN_PRESS_NAMES: &[&str] = &["offset-coated", "offset-uncoated", "newsprint-coldset"];

/// The built-in press condition of that name.
pub fn builtin_press(name: &str) -> Option<PrintCondition> {
    match name {
        "offset-coated" => Some(offset_coated()),
        "offset-uncoated" => Some(offset_uncoated()),
        "newsprint-coldset" => Some(newsprint_coldset()),
        _ => None,
    }
}
