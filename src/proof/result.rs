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

/// What one image's proof produced (an element of `images` in the JSON of `proof`).
#[derive(Clone, Debug, Serialize)]
pub struct ImageReport {
    /// The input image as named.
    pub input: String,
    /// The proof image written.
    pub output: String,
    /// The ΔE00 map written, when asked for.
    pub delta_map: Option<String>,
    /// The ΔE00 map's legend (SVG) written, with the map.
    pub legend: Option<String>,
    /// Width, pixels.
    pub width: u32,
    /// Height, pixels.
    pub height: u32,
    /// Bits per channel of the input: 8 or 16.
    pub bits: u8,
    /// The input's colour channels (proofs are always RGB).
    pub channels: Channels,
    /// The input has an alpha channel.
    pub alpha: bool,
    /// The profile the input pixels were read in.
    pub profile: String,
    /// Whether that profile was embedded in the input or assumed.
    pub profile_source: ProfileSource,
    /// Statistics of the per-pixel ΔE00 from the input colour to its print.
    pub stats: DeltaStats,
    /// p95 ΔE00 within the tolerance.
    pub within_tolerance: bool,
}

/// The result of a `proof` run (its JSON): the settings and every image.
#[derive(Clone, Debug, Serialize)]
pub struct ProofReport {
    /// Profiles, mapping, tolerance (of the 95th percentile), gamut test
    /// and notes.
    #[serde(flatten)]
    pub conditions: Conditions,
    /// Every image, in the order given.
    pub images: Vec<ImageReport>,
}
