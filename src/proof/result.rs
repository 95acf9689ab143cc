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
    /// "rgb", "grey" or "cmyk" (of the input; proofs are always RGB).
    pub channels: &'static str,
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
    /// The screen profile's name.
    pub screen: String,
    /// The press profile's name.
    pub press: String,
    /// The rendering intent from the image to the press.
    pub intent: RenderingIntent,
    /// Black point compensation from the image to the press.
    pub bpc: bool,
    /// The print is shown on the paper's own white (absolute colorimetric).
    pub paper_white: bool,
    /// The largest p95 ΔE00 for an image counted as within tolerance.
    pub tolerance: f64,
    /// The gamut test behind `outside_gamut`, in words.
    pub gamut_test: String,
    /// Caveats about the profiles, e.g. an intent without a table of its own.
    pub notes: Vec<String>,
    /// Every image, in the order given.
    pub images: Vec<ImageReport>,
}
