//! The result of a `proof` run as plain structs; the text table is
//! [`crate::report::proof`], JSON goes through [`crate::report::write_json`].

use serde::Serialize;

use super::stats::DeltaStats;
use crate::icc::RenderingIntent;

/// Where the profile describing an image's pixels came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum ProfileSource {
    /// The ICC profile embedded in the file.
    Embedded,
    /// None embedded: the `--screen` profile is assumed.
    Assumed,
}

#[derive(Clone, Debug, Serialize)]
pub struct ImageReport {
    pub input: String,
    pub output: String,
    pub delta_map: Option<String>,
    pub legend: Option<String>,
    pub width: u32,
    pub height: u32,
    pub bits: u8,
    /// "rgb", "grey" or "cmyk" (of the input; proofs are always RGB).
    pub channels: &'static str,
    pub alpha: bool,
    /// The profile the input pixels were read in.
    pub profile: String,
    pub profile_source: ProfileSource,
    pub stats: DeltaStats,
    /// p95 ΔE00 within the tolerance.
    pub within_tolerance: bool,
}

#[derive(Clone, Debug, Serialize)]
pub struct ProofReport {
    pub screen: String,
    pub press: String,
    pub intent: RenderingIntent,
    pub bpc: bool,
    pub paper_white: bool,
    pub tolerance: f64,
    pub gamut_test: String,
    pub notes: Vec<String>,
    pub images: Vec<ImageReport>,
}
