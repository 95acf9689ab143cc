//! The palette-on-press check: for each entry, its CIELAB on the screen, the
//! press CMYK under the chosen rendering intent, the CIELAB of that CMYK as
//! printed, CIEDE2000 between the two, and whether the colour is printable.

use crate::report::round;
use rayon::prelude::*;
use serde::Serialize;

use super::Palette;
use crate::color::css::ColorInput;
use crate::color::delta::delta_e00;
use crate::color::LabD50;
use crate::icc::transform::{PressMapping, PressTransforms};
use crate::icc::{Direction, IccError, IccProfile, RenderingIntent};

/// The round-trip in-gamut test: a colour is printable when CIELAB → press →
/// CIELAB (relative colorimetric, no BPC) returns within this CIEDE2000.
/// 1.0 is about a just-noticeable difference for side-by-side viewing
/// (common practice), and well above the 16-bit table quantisation.
pub const ROUND_TRIP_THRESHOLD: f64 = 1.0;

/// Default tolerance: ΔE00 3.0, a rule of thumb for "visibly different but
/// acceptable" in design review (common practice), not a standard.
pub const DEFAULT_TOLERANCE: f64 = 3.0;

/// Why a palette could not be checked.
#[derive(Debug, thiserror::Error)]
pub enum CheckError {
    #[error(transparent)]
    Icc(#[from] IccError),
    /// A colour that the profiles turn into no finite number: no NaN or
    /// infinity may reach a table or JSON.
    #[error("palette '{file}', line {line}: \"{input}\" gives no finite {what} through these profiles")]
    NotFinite {
        file: String,
        line: usize,
        input: String,
        what: &'static str,
    },
}

#[derive(Clone, Copy, Debug)]
pub struct CheckOptions {
    pub mapping: PressMapping,
    pub tolerance: f64,
}

#[derive(Clone, Debug, Serialize)]
pub struct CheckedEntry {
    pub name: String,
    pub input: String,
    pub line: usize,
    /// CIELAB D50 of the colour as the screen shows it.
    pub screen_lab: [f64; 3],
    /// Press CMYK in percent.
    pub press_cmyk: [f64; 4],
    pub ink_total: f64,
    /// CIELAB D50 of that CMYK as printed (media-relative, or absolute with
    /// `paper_white`).
    pub proof_lab: [f64; 3],
    pub delta_e00: f64,
    pub in_gamut: bool,
    /// CIEDE2000 of the colorimetric round trip (behind `in_gamut` with the
    /// round-trip test).
    pub round_trip_delta_e00: f64,
    /// CIEDE2000 from the screen colour to the nearest colour of the press
    /// gamut (0 inside), with the boundary test; absent with the round-trip
    /// test, which measures no distance.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub outside_by: Option<f64>,
    pub within_tolerance: bool,
}

#[derive(Clone, Debug, Serialize)]
pub struct CheckSummary {
    pub count: usize,
    pub beyond_tolerance: usize,
    pub out_of_gamut: usize,
    pub max_delta_e00: f64,
    pub mean_delta_e00: f64,
    /// Name of the entry with the largest ΔE00.
    pub worst: String,
}

#[derive(Clone, Debug, Serialize)]
pub struct CheckReport {
    pub palette: String,
    pub screen: String,
    pub press: String,
    pub intent: RenderingIntent,
    pub bpc: bool,
    pub paper_white: bool,
    pub tolerance: f64,
    pub gamut_test: String,
    /// Caveats about the profiles, e.g. an intent without a table of its own.
    pub notes: Vec<String>,
    pub entries: Vec<CheckedEntry>,
    pub summary: CheckSummary,
}

fn round_all<const N: usize>(v: [f64; N], places: i32) -> [f64; N] {
    v.map(|x| round(x, places))
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
    let n = palette.entries.len();

    // Batch by input kind so each transform runs once over a contiguous slice.
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

    // The boundary test and the distance to the gamut, in parallel: the
    // nearest-point search dominates a check of many out-of-gamut colours.
    // Press colours are printable by definition.
    let judged: Option<Vec<(bool, f64)>> = press_gamut.map(|g| {
        palette
            .entries
            .par_iter()
            .zip(&screen_lab)
            .map(|(e, &l)| match e.color {
                ColorInput::DeviceCmyk(_) => (true, 0.0),
                _ => g.judge(l),
            })
            .collect()
    });
    let mut entries = Vec::with_capacity(n);
    for (i, e) in palette.entries.iter().enumerate() {
        let de = delta_e00(screen_lab[i], printed[i]);
        let rt = match e.color {
            // A press colour is printable by definition.
            ColorInput::DeviceCmyk(_) => 0.0,
            _ => delta_e00(screen_lab[i], round_trip[i]),
        };
        let (in_gamut, outside_by) = match &judged {
            Some(j) => (j[i].0, Some(j[i].1)),
            None => (rt <= ROUND_TRIP_THRESHOLD, None),
        };
        let finite = |v: &[f64]| v.iter().all(|x| x.is_finite());
        let not_finite = [
            (finite(&screen_lab[i].to_array()), "screen CIELAB"),
            (finite(&cmyk[i]), "press CMYK"),
            (finite(&printed[i].to_array()) && de.is_finite(), "printed CIELAB"),
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
        let outside_by = outside_by.map(|d| round(d, 2));
        entries.push(CheckedEntry {
            name: e.name.clone(),
            input: e.input.clone(),
            line: e.line,
            screen_lab: round_all(screen_lab[i].to_array(), 2),
            press_cmyk: round_all(cmyk[i], 1),
            ink_total: round(cmyk[i].iter().sum(), 1),
            proof_lab: round_all(printed[i].to_array(), 2),
            delta_e00: round(de, 2),
            in_gamut,
            round_trip_delta_e00: round(rt, 2),
            outside_by,
            within_tolerance: de <= opts.tolerance,
        });
    }
    let summary = summarise(&entries);
    Ok(CheckReport {
        palette: palette.source.clone(),
        screen: screen.name.clone(),
        press: press.name.clone(),
        intent: opts.mapping.intent,
        bpc: opts.mapping.bpc,
        paper_white: opts.mapping.paper_white,
        tolerance: opts.tolerance,
        gamut_test: match press_gamut {
            Some(g) => format!(
                "press gamut boundary in CIELAB{}: inside, or within ΔE00 {:.1} of it",
                g.ink_limit
                    .map(|l| format!(" (total ink {:.1} %)", l.percent))
                    .unwrap_or_default(),
                crate::gamut::EDGE_TOLERANCE
            ),
            None => format!(
                "round trip CIELAB → press → CIELAB (relative colorimetric, no BPC) within ΔE00 {ROUND_TRIP_THRESHOLD:.1}"
            ),
        },
        notes: notes(screen, press, opts.mapping),
        entries,
        summary,
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
    let shown = if m.paper_white {
        RenderingIntent::Absolute
    } else {
        RenderingIntent::Relative
    };
    [
        screen.intent_note(m.intent, Direction::ToPcs),
        press.intent_note(m.intent, Direction::FromPcs),
        press.intent_note(shown, Direction::ToPcs),
    ]
    .into_iter()
    .flatten()
    .collect()
}
