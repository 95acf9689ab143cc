//! The built-in press conditions: the printing model, its inversion with
//! black generation, and the writer of the ICC output profile built from
//! them. Owns the committed profile bytes of each built-in condition.

pub mod icc_read;
pub mod icc_writer;
pub mod invert;
pub mod mapping;
pub mod model;

pub use icc_writer::build_icc;
pub use invert::{GcrCurve, InkSolution};
pub use model::{offset_coated, Aims, PressSpec, PrintCondition};

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

/// The committed ICC output profile of `offset-coated`
/// (rebuilt by `inkfit build-press offset-coated --out profiles/offset-coated.icc`).
pub static OFFSET_COATED_ICC: &[u8] = include_bytes!("../../profiles/offset-coated.icc");

/// Names of the built-in press conditions.
pub const BUILTIN_PRESS_NAMES: &[&str] = &["offset-coated"];

/// The built-in press condition of that name.
pub fn builtin_press(name: &str) -> Option<PrintCondition> {
    match name {
        "offset-coated" => Some(offset_coated()),
        _ => None,
    }
}

/// The committed ICC profile bytes of the built-in press of that name.
pub fn builtin_press_icc(name: &str) -> Option<&'static [u8]> {
    match name {
        "offset-coated" => Some(OFFSET_COATED_ICC),
        _ => None,
    }
}
