//! What every check, proof and repair report states before its results: the
//! profiles, how colours go to the press, the tolerance, the gamut test and
//! notes about the profiles. One struct, [`Conditions`], flattened into each
//! report's JSON so the keys and their meaning are the same everywhere.

use serde::Serialize;

use crate::color::delta::NOTICEABLE_DE00;
use crate::icc::transform::PressMapping;
use crate::icc::{IccProfile, RenderingIntent};

/// Which test decides whether a colour is printable.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum GamutTest {
    /// Inside the press gamut's boundary in CIELAB, or within
    /// [`NOTICEABLE_DE00`] of it.
    Boundary,
    /// CIELAB → press → CIELAB (relative colorimetric, no BPC) returns
    /// within [`NOTICEABLE_DE00`].
    RoundTrip,
}

impl GamutTest {
    /// The test in words; `ink_limit` (percent) is the total ink the
    /// boundary was computed with, when known.
    pub fn describe(self, ink_limit: Option<f64>) -> String {
        match self {
            GamutTest::Boundary => format!(
                "press gamut boundary in CIELAB{}: inside, or within ΔE00 {:.1} of it",
                ink_limit.map(|l| format!(" (total ink {l:.1} %)")).unwrap_or_default(),
                NOTICEABLE_DE00
            ),
            GamutTest::RoundTrip => format!(
                "round trip CIELAB → press → CIELAB (relative colorimetric, no BPC) within ΔE00 {NOTICEABLE_DE00:.1}"
            ),
        }
    }
}

/// The conditions a report's results hold under.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Conditions {
    /// The screen profile's name (built-in name or file).
    pub screen: String,
    /// The press profile's name (built-in name or file).
    pub press: String,
    /// Rendering intent from the screen (or image) to the press.
    pub intent: RenderingIntent,
    /// Black point compensation on that step.
    pub bpc: bool,
    /// The print is shown on the paper's own white (absolute colorimetric).
    pub paper_white: bool,
    /// Largest acceptable CIEDE2000 between screen and print (a rule of
    /// thumb, not a standard); for proofs it applies to the 95th percentile.
    pub tolerance: f64,
    /// Which test decides "in gamut".
    pub gamut_test: GamutTest,
    /// That test in words, with its threshold.
    pub gamut_test_method: String,
    /// Caveats about the profiles and inputs, e.g. an intent without a table
    /// of its own.
    pub notes: Vec<String>,
}

impl Conditions {
    /// The conditions of a run from `screen` onto `press` with `mapping`.
    /// `ink_limit` is the total ink (percent) a boundary test's gamut was
    /// computed with.
    pub fn new(
        screen: &IccProfile,
        press: &IccProfile,
        mapping: PressMapping,
        tolerance: f64,
        gamut_test: GamutTest,
        ink_limit: Option<f64>,
        notes: Vec<String>,
    ) -> Self {
        Conditions {
            screen: screen.name.clone(),
            press: press.name.clone(),
            intent: mapping.intent,
            bpc: mapping.bpc,
            paper_white: mapping.paper_white,
            tolerance,
            gamut_test,
            gamut_test_method: gamut_test.describe(ink_limit),
            notes,
        }
    }
}
