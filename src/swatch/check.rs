//! The palette-on-press check: for each entry, its CIELAB on the screen, the
//! press CMYK under the chosen rendering intent, the CIELAB of that CMYK as
//! printed, CIEDE2000 between the two, whether the colour is printable and
//! whether its CMYK needs more ink than the press allows.

use crate::color::delta::NOTICEABLE_DE00;
use crate::precision::{round, round_all};
use rayon::prelude::*;
use serde::Serialize;

use super::{Entry, Palette};
use crate::color::css::ColorInput;
use crate::color::delta::delta_e00;
use crate::color::LabD50;
use crate::conditions::{Conditions, GamutTest};
use crate::gamut::InkLimit;
use crate::icc::transform::{PressMapping, PressTransforms};
use crate::icc::{Direction, IccError, IccProfile};

/// Default tolerance: ΔE00 3.0, a rule of thumb for "visibly different but
/// acceptable" in design review (common practice), not a standard.
pub const DEFAULT_TOLERANCE: f64 = 3.0;

/// How far (percentage points) a CMYK total may exceed the press's ink limit
/// before it counts as over it. The limit is measured by sampling the press
/// profile's own CIELAB → CMYK table and rounded to 0.1 %, so it can fall a
/// little short of the largest total that table really gives; the CMYK it
/// gives carry 16-bit quantisation and interpolation, and `ink_total` is
/// reported to 0.1. Half a point absorbs all of that, so a colour the press
/// profile itself separated is never flagged for rounding, and stays well
/// below the whole-percent steps in which ink limits are set (common
/// practice).
pub const INK_LIMIT_MARGIN: f64 = 0.5;

/// True when a CMYK total `ink_total` (percent, C + M + Y + K) needs more ink
/// than the limit `limit_percent` allows, beyond [`INK_LIMIT_MARGIN`].
pub fn over_ink_limit(ink_total: f64, limit_percent: f64) -> bool {
    ink_total > limit_percent + INK_LIMIT_MARGIN
}

/// Why a palette could not be checked.
#[derive(Debug, thiserror::Error)]
pub enum CheckError {
    /// A profile could not be loaded or a transform built.
    #[error(transparent)]
    Icc(#[from] IccError),
    /// The press gamut for the boundary test could not be computed.
    #[error(transparent)]
    Gamut(#[from] crate::gamut::GamutError),
    /// A colour that the profiles turn into no finite number: no NaN or
    /// infinity may reach a table or JSON.
    #[error("palette '{file}', line {line}: \"{input}\" gives no finite {what} through these profiles")]
    NotFinite {
        /// The palette file as named.
        file: String,
        /// The entry's line (CSV, text) or entry number (JSON), 1-based.
        line: usize,
        /// The colour text as given.
        input: String,
        /// Which value is not finite ("press CMYK", "printed CIELAB", …).
        what: &'static str,
    },
}

/// How a palette is checked.
#[derive(Clone, Copy, Debug)]
pub struct CheckOptions {
    /// How screen colours are sent to the press, and how the print is shown.
    pub mapping: PressMapping,
    /// The largest ΔE00 from screen to print counted as within tolerance.
    pub tolerance: f64,
    /// The press's total-ink limit, normally the one its gamut was computed
    /// with ([`crate::gamut::Gamut::ink_limit`]) or [`InkLimit::measure`];
    /// `None` flags no colour.
    pub ink_limit: Option<InkLimit>,
}

/// One palette entry as checked (an element of `entries` in the JSON of `check`).
#[derive(Clone, Debug, Serialize)]
pub struct CheckedEntry {
    /// The entry's name.
    pub name: String,
    /// The colour text as given.
    pub input: String,
    /// The entry's line (CSV, text) or entry number (JSON), 1-based.
    pub line: usize,
    /// CIELAB D50 of the colour as the screen shows it.
    pub screen_lab: [f64; 3],
    /// Press CMYK in percent.
    pub press_cmyk: [f64; 4],
    /// C + M + Y + K of `press_cmyk`, percent.
    pub ink_total: f64,
    /// The press CMYK needs more ink than the press's limit (beyond
    /// [`INK_LIMIT_MARGIN`]); a press colour that does is not printable.
    pub over_ink_limit: bool,
    /// CIELAB D50 of that CMYK as printed (media-relative, or absolute with
    /// `paper_white`).
    pub printed_lab: [f64; 3],
    /// CIEDE2000 from `screen_lab` to `printed_lab`.
    pub delta_e00: f64,
    /// The colour can be printed: within the press gamut, and for a press colour not over the ink limit.
    pub in_gamut: bool,
    /// CIEDE2000 of the colorimetric round trip (behind `in_gamut` with the
    /// round-trip test).
    pub round_trip_delta_e00: f64,
    /// CIEDE2000 from the screen colour to the nearest colour of the press
    /// gamut (0 inside), with the boundary test; absent with the round-trip
    /// test, which measures no distance.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub outside_by: Option<f64>,
    /// `delta_e00` is no more than the tolerance.
    pub within_tolerance: bool,
    /// How the artwork uses the colour (uses, properties, lowest opacity);
    /// absent for a palette file.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub usage: Option<crate::swatch::Usage>,
    /// For a map image, the share of the map the class covers (0..1).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub share: Option<f64>,
}

/// Counts and ΔE00 figures over all entries of a check.
#[derive(Clone, Debug, Serialize)]
pub struct CheckSummary {
    /// Entries checked.
    pub count: usize,
    /// Entries whose ΔE00 exceeds the tolerance.
    pub beyond_tolerance: usize,
    /// Entries not in gamut.
    pub out_of_gamut: usize,
    /// Entries whose press CMYK is over the ink limit.
    pub over_ink_limit: usize,
    /// The largest ΔE00 of any entry.
    pub max_delta_e00: f64,
    /// The mean ΔE00 over all entries (0 for none).
    pub mean_delta_e00: f64,
    /// Name of the entry with the largest ΔE00.
    pub worst: String,
}

/// Where a check's ink limit came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum InkLimitSource {
    /// From the press profile's own CIELAB → CMYK table.
    Measured,
    /// From the caller.
    Given,
}

/// The press's total-ink limit as a check reports it.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct CheckInkLimit {
    /// Percent, C + M + Y + K.
    pub percent: f64,
    /// Where the limit came from: measured from the press profile or given.
    pub source: InkLimitSource,
}

impl From<InkLimit> for CheckInkLimit {
    fn from(l: InkLimit) -> Self {
        CheckInkLimit {
            percent: round(l.percent, 1),
            source: if l.measured {
                InkLimitSource::Measured
            } else {
                InkLimitSource::Given
            },
        }
    }
}

/// The result of checking one palette against one press (the JSON of `check`).
#[derive(Clone, Debug, Serialize)]
pub struct CheckReport {
    /// The palette file as named.
    pub palette: String,
    /// Profiles, mapping, tolerance, gamut test and notes.
    #[serde(flatten)]
    pub conditions: Conditions,
    /// The total-ink limit every entry's CMYK is held to; null when unknown.
    pub ink_limit: Option<CheckInkLimit>,
    /// Every entry, in palette order.
    pub entries: Vec<CheckedEntry>,
    /// Counts and ΔE00 figures over all entries.
    pub summary: CheckSummary,
    /// For a map image: the share of the map no class covers (text,
    /// gradients, stray colours).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub unclassified_share: Option<f64>,
}

/// The check as `inkfit check` runs it, with `test` deciding `in_gamut`:
/// for [`GamutTest::Boundary`] the press's gamut solid is computed first
/// (and returned, for figures). Entries are held to the ink limit that gamut
/// was computed with, or without one to the limit measured from the press
/// profile's CIELAB → CMYK table ([`InkLimit::measure`]).
pub fn check_with_test(
    palette: &Palette,
    screen: &IccProfile,
    press: &IccProfile,
    mapping: PressMapping,
    tolerance: f64,
    test: GamutTest,
) -> Result<(CheckReport, Option<crate::gamut::Gamut>), CheckError> {
    let gamut = match test {
        GamutTest::Boundary => Some(crate::gamut::Gamut::of_profile(press, Default::default())?),
        GamutTest::RoundTrip => None,
    };
    let ink_limit = match &gamut {
        Some(g) => g.ink_limit,
        None => InkLimit::measure(press),
    };
    let opts = CheckOptions {
        mapping,
        tolerance,
        ink_limit,
    };
    let r = check_against(palette, screen, press, opts, gamut.as_ref())?;
    Ok((r, gamut))
}

/// Runs the check of `palette` from `screen` onto `press` with the
/// round-trip gamut test.
pub fn check(
    palette: &Palette,
    screen: &IccProfile,
    press: &IccProfile,
    opts: CheckOptions,
) -> Result<CheckReport, CheckError> {
    check_against(palette, screen, press, opts, None)
}

/// Runs the check; with `press_gamut` (the press profile's gamut) `in_gamut`
/// and `outside_by` come from its boundary, without it from the round trip.
pub fn check_against(
    palette: &Palette,
    screen: &IccProfile,
    press: &IccProfile,
    opts: CheckOptions,
    press_gamut: Option<&crate::gamut::Gamut>,
) -> Result<CheckReport, CheckError> {
    let t = PressTransforms::new(screen, press, opts.mapping)?;
    let c = convert(palette, &t);
    let over: Vec<bool> = c
        .cmyk
        .iter()
        .map(|v| {
            opts.ink_limit
                .is_some_and(|l| over_ink_limit(v.iter().sum(), l.percent))
        })
        .collect();
    let judged = press_gamut.map(|g| judge_all(palette, &c.screen_lab, &over, g));
    let entries = palette
        .entries
        .iter()
        .enumerate()
        .map(|(i, e)| checked_entry(palette, i, e, &c, over[i], judged.as_deref(), opts.tolerance))
        .collect::<Result<Vec<_>, _>>()?;
    let gamut_test = if press_gamut.is_some() {
        GamutTest::Boundary
    } else {
        GamutTest::RoundTrip
    };
    let boundary_ink = press_gamut.and_then(|g| g.ink_limit).map(|l| l.percent);
    let mut notes = notes(screen, press, opts.mapping);
    notes.extend(palette.notes.iter().cloned());
    Ok(CheckReport {
        palette: palette.source.clone(),
        conditions: Conditions::new(
            screen,
            press,
            opts.mapping,
            opts.tolerance,
            gamut_test,
            boundary_ink,
            notes,
        ),
        ink_limit: opts.ink_limit.map(CheckInkLimit::from),
        summary: summarise(&entries),
        unclassified_share: palette.unclassified_share.map(|v| round(v, 4)),
        entries,
    })
}

/// Every entry's colours through the press, unrounded.
struct Converted {
    /// The colour as the screen shows it; for a press colour, its relative
    /// colorimetric printed CIELAB (the gamut's own frame).
    screen_lab: Vec<LabD50>,
    cmyk: Vec<[f64; 4]>,
    printed: Vec<LabD50>,
    round_trip: Vec<LabD50>,
}

/// Converts every entry, batched by input kind so each transform runs once
/// over a contiguous slice.
fn convert(palette: &Palette, t: &PressTransforms) -> Converted {
    let n = palette.entries.len();
    let mut screen_lab = vec![LabD50::new(0.0, 0.0, 0.0); n];
    let mut cmyk = vec![[0.0; 4]; n];
    let (mut rgb_idx, mut rgb) = (Vec::new(), Vec::new());
    let (mut lab_idx, mut lab) = (Vec::new(), Vec::new());
    let (mut cmyk_idx, mut cmyk_in) = (Vec::new(), Vec::new());
    for (i, e) in palette.entries.iter().enumerate() {
        match e.color {
            ColorInput::ScreenRgb(v) => {
                rgb_idx.push(i);
                rgb.push(v);
            }
            ColorInput::Lab(l) => {
                lab_idx.push(i);
                lab.push(l);
            }
            ColorInput::DeviceCmyk(c) => {
                cmyk_idx.push(i);
                cmyk_in.push(c);
            }
        }
    }
    for ((&i, l), c) in rgb_idx.iter().zip(t.screen_lab(&rgb)).zip(t.screen_to_press(&rgb)) {
        screen_lab[i] = l;
        cmyk[i] = c;
    }
    for ((&i, &l), c) in lab_idx.iter().zip(&lab).zip(t.lab_to_press(&lab)) {
        screen_lab[i] = l;
        cmyk[i] = c;
    }
    for ((&i, &c), l) in cmyk_idx.iter().zip(&cmyk_in).zip(t.press_lab_colorimetric(&cmyk_in)) {
        screen_lab[i] = l;
        cmyk[i] = c;
    }
    let printed = t.printed_lab(&cmyk);
    let round_trip = t.round_trip(&screen_lab);
    Converted {
        screen_lab,
        cmyk,
        printed,
        round_trip,
    }
}

/// A press colour is printable as given unless it needs more ink than the
/// press allows; any other colour is judged by the gamut test.
fn press_printable(e: &Entry, over: bool) -> bool {
    !(matches!(e.color, ColorInput::DeviceCmyk(_)) && over)
}

/// The boundary test and the distance to the gamut, in parallel: the
/// nearest-point search dominates a check of many out-of-gamut colours. A
/// press colour over the ink limit is measured by its relative colorimetric
/// printed CIELAB (held in `screen_lab`), the gamut's own frame.
fn judge_all(palette: &Palette, screen_lab: &[LabD50], over: &[bool], g: &crate::gamut::Gamut) -> Vec<(bool, f64)> {
    palette
        .entries
        .par_iter()
        .zip(screen_lab)
        .zip(over)
        .map(|((e, &l), &over)| match e.color {
            ColorInput::DeviceCmyk(_) if press_printable(e, over) => (true, 0.0),
            _ => g.judge(l),
        })
        .collect()
}

/// Entry `i`'s row: the gamut verdict, its numbers rounded, or an error when
/// a conversion gave no finite number.
fn checked_entry(
    palette: &Palette,
    i: usize,
    e: &Entry,
    c: &Converted,
    over: bool,
    judged: Option<&[(bool, f64)]>,
    tolerance: f64,
) -> Result<CheckedEntry, CheckError> {
    let (screen_lab, cmyk, printed) = (c.screen_lab[i], c.cmyk[i], c.printed[i]);
    let de = delta_e00(screen_lab, printed);
    let rt = match e.color {
        // A press colour needs no trip through the press's Lab → CMYK
        // table; whether it can print is the ink limit's question.
        ColorInput::DeviceCmyk(_) => 0.0,
        _ => delta_e00(screen_lab, c.round_trip[i]),
    };
    let (in_gamut, outside_by) = match judged {
        Some(j) => (j[i].0 && press_printable(e, over), Some(j[i].1)),
        None => (rt <= NOTICEABLE_DE00 && press_printable(e, over), None),
    };
    let finite = |v: &[f64]| v.iter().all(|x| x.is_finite());
    let not_finite = [
        (finite(&screen_lab.to_array()), "screen CIELAB"),
        (finite(&cmyk), "press CMYK"),
        (finite(&printed.to_array()) && de.is_finite(), "printed CIELAB"),
        (rt.is_finite(), "round trip"),
        (outside_by.is_none_or(f64::is_finite), "distance to the press gamut"),
    ]
    .into_iter()
    .find(|(ok, _)| !ok);
    if let Some((_, what)) = not_finite {
        return Err(CheckError::NotFinite {
            file: palette.source.clone(),
            line: e.line,
            input: e.input.clone(),
            what,
        });
    }
    Ok(CheckedEntry {
        name: e.name.clone(),
        input: e.input.clone(),
        line: e.line,
        screen_lab: round_all(screen_lab.to_array(), 2),
        press_cmyk: round_all(cmyk, 1),
        ink_total: round(cmyk.iter().sum(), 1),
        over_ink_limit: over,
        printed_lab: round_all(printed.to_array(), 2),
        delta_e00: round(de, 2),
        in_gamut,
        round_trip_delta_e00: round(rt, 2),
        outside_by: outside_by.map(|d| round(d, 2)),
        within_tolerance: de <= tolerance,
        usage: e.usage.clone(),
        share: e.share.map(|v| round(v, 4)),
    })
}

fn summarise(entries: &[CheckedEntry]) -> CheckSummary {
    let worst = entries.iter().fold(None::<&CheckedEntry>, |w, e| match w {
        Some(w) if w.delta_e00 >= e.delta_e00 => Some(w),
        _ => Some(e),
    });
    let sum: f64 = entries.iter().map(|e| e.delta_e00).sum();
    CheckSummary {
        count: entries.len(),
        beyond_tolerance: entries.iter().filter(|e| !e.within_tolerance).count(),
        out_of_gamut: entries.iter().filter(|e| !e.in_gamut).count(),
        over_ink_limit: entries.iter().filter(|e| e.over_ink_limit).count(),
        max_delta_e00: worst.map_or(0.0, |w| w.delta_e00),
        mean_delta_e00: if entries.is_empty() {
            0.0
        } else {
            round(sum / entries.len() as f64, 2)
        },
        worst: worst.map_or_else(String::new, |w| w.name.clone()),
    }
}

fn notes(screen: &IccProfile, press: &IccProfile, m: PressMapping) -> Vec<String> {
    let shown = m.shown();
    [
        screen.intent_note(m.intent, Direction::ToPcs),
        press.intent_note(m.intent, Direction::FromPcs),
        press.intent_note(shown, Direction::ToPcs),
    ]
    .into_iter()
    .flatten()
    .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ink_limit_rule_allows_the_rounding_margin_and_nothing_more() {
        // At the limit and within half a point of it: a total the press's own
        // table can give, up to its measurement and rounding.
        assert!(!over_ink_limit(330.0, 330.0));
        assert!(!over_ink_limit(330.4, 330.0));
        assert!(!over_ink_limit(330.5, 330.0));
        // Beyond the margin: more ink than the press allows.
        assert!(over_ink_limit(330.51, 330.0));
        assert!(over_ink_limit(331.0, 330.0));
        assert!(over_ink_limit(400.0, 330.0));
        // The margin is relative to the limit, not a fixed total.
        assert!(over_ink_limit(300.6, 300.0));
        assert!(!over_ink_limit(300.5, 300.0));
    }
}
