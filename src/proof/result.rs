//! The result of a `proof` run as plain structs; the text table is
//! [`crate::report::proof`], JSON goes through [`crate::report::write_json`].

use serde::Serialize;

use super::stats::DeltaStats;
use crate::conditions::Conditions;

/// Where the profile describing an image's pixels came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum ProfileSource {
    /// The ICC profile embedded in the file.
    Embedded,
    /// None embedded: the `--screen` profile is assumed.
    Assumed,
}

/// The colour channels of an input image.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Channels {
    /// One grey channel.
    Grey,
    /// Red, green, blue.
    Rgb,
    /// Cyan, magenta, yellow, black: press data.
    Cmyk,
}

impl Channels {
    /// The layout of `n` device channels (1 grey, 4 CMYK, else RGB).
    pub fn of_count(n: usize) -> Self {
        match n {
            1 => Channels::Grey,
            4 => Channels::Cmyk,
            _ => Channels::Rgb,
        }
    }
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
    /// The input's colour channels (proofs are always RGB).
    pub channels: Channels,
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
    /// Profiles, mapping, tolerance (of the 95th percentile), gamut test
    /// and notes.
    #[serde(flatten)]
    pub conditions: Conditions,
    pub images: Vec<ImageReport>,
}
