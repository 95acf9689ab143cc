//! Will the palette still work in print: class separation, lightness order
//! and separation under colour-vision deficiencies, over the screen and
//! printed CIELAB of a palette check.

use serde::Serialize;

use super::adjacency::Adjacency;
use super::check::CheckReport;
use super::order::{order, Order, Scheme};
use super::separation::{separation_with, FlaggedPair, Separation, SeparationRule};
use crate::color::cvd::{Deficiency, Simulator};
use crate::color::LabD50;
use crate::precision::round;

/// What to check beyond the per-colour results.
#[derive(Clone, Debug, PartialEq)]
pub struct SurvivalOptions {
    /// The kind of palette, which decides whether the order checks apply.
    pub scheme: Scheme,
    /// ΔE00 floor for every pair in print, or for touching pairs when
    /// `adjacency` is known.
    pub min_separation: f64,
    /// ΔE00 floor for pairs that do not touch, when `adjacency` is known.
    pub min_legend_separation: f64,
    /// Which entries touch on the map, when known.
    pub adjacency: Option<Adjacency>,
    /// ΔE00 floor for neighbouring steps of ordered schemes.
    pub min_step: f64,
    /// Deficiencies to simulate (each at most once; reported in the order
    /// protan, deutan, tritan).
    pub cvd: Vec<Deficiency>,
    /// 0 (normal vision) to 1 (dichromacy).
    pub cvd_severity: f64,
}

impl Default for SurvivalOptions {
    fn default() -> Self {
        SurvivalOptions {
            scheme: Scheme::Qualitative,
            min_separation: super::separation::DEFAULT_MIN_SEPARATION,
            min_legend_separation: super::separation::DEFAULT_MIN_LEGEND_SEPARATION,
            adjacency: None,
            min_step: super::order::DEFAULT_MIN_STEP,
            cvd: Vec::new(),
            cvd_severity: 1.0,
        }
    }
}

/// Why the options cannot be used.
#[derive(Debug, thiserror::Error, PartialEq)]
pub enum SurvivalError {
    /// The separation floor is negative or not a number.
    #[error("--min-separation must be a ΔE00 of 0 or more, not {0}")]
    MinSeparation(f64),
    /// The legend floor is negative, not a number or above the separation floor.
    #[error("--min-legend-separation must be a ΔE00 from 0 to --min-separation ({1}), not {0}")]
    MinLegendSeparation(f64, f64),
    /// The minimum step is negative or not a number.
    #[error("--min-step must be a ΔE00 of 0 or more, not {0}")]
    MinStep(f64),
    /// The deficiency severity is outside 0..1 or not a number.
    #[error("--cvd-severity must be between 0 and 1, not {0}")]
    Severity(f64),
}

impl SurvivalOptions {
    /// Checks that the floors are finite and not negative and the severity lies in 0..1.
    pub fn validate(&self) -> Result<(), SurvivalError> {
        let ok = |v: f64| v.is_finite() && v >= 0.0;
        if !ok(self.min_separation) {
            return Err(SurvivalError::MinSeparation(self.min_separation));
        }
        if !(ok(self.min_legend_separation) && self.min_legend_separation <= self.min_separation) {
            return Err(SurvivalError::MinLegendSeparation(
                self.min_legend_separation,
                self.min_separation,
            ));
        }
        if !ok(self.min_step) {
            return Err(SurvivalError::MinStep(self.min_step));
        }
        if !(self.cvd_severity.is_finite() && (0.0..=1.0).contains(&self.cvd_severity)) {
            return Err(SurvivalError::Severity(self.cvd_severity));
        }
        Ok(())
    }

    /// The simulators asked for, in the fixed order protan, deutan, tritan.
    pub fn simulators(&self) -> Vec<Simulator> {
        Deficiency::ALL
            .into_iter()
            .filter(|d| self.cvd.contains(d))
            .filter_map(|d| Simulator::new(d, self.cvd_severity))
            .collect()
    }

    /// The floors pairs are held to.
    pub fn rule(&self) -> SeparationRule<'_> {
        SeparationRule {
            floor: self.min_separation,
            legend_floor: self.min_legend_separation,
            adjacency: self.adjacency.as_ref(),
        }
    }
}

/// Separation as seen with one deficiency.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct CvdResult {
    /// The severity simulated, 0 (normal vision) to 1 (dichromacy).
    pub severity: f64,
    /// Simulated CIELAB D50 of each printed colour, in file order.
    pub simulated_lab: Vec<[f64; 3]>,
    /// Smallest ΔE00 between simulated screen colours and between simulated
    /// printed colours.
    pub min_screen: f64,
    /// The same for the simulated printed colours.
    pub min_print: f64,
    /// Pairs whose simulated printed ΔE00 is below the floor or lost more
    /// than half of the simulated screen ΔE00; smallest first.
    pub flagged: Vec<FlaggedPair>,
    /// How many pairs are flagged, all of them (`flagged` lists at most
    /// [`super::separation::MAX_PAIRS_LISTED`]).
    pub flagged_count: usize,
}

/// One object per deficiency asked for.
#[derive(Clone, Debug, Default, PartialEq, Serialize)]
pub struct CvdReport {
    /// The protan simulation, if asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub protan: Option<CvdResult>,
    /// The deutan simulation, if asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub deutan: Option<CvdResult>,
    /// The tritan simulation, if asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tritan: Option<CvdResult>,
}

impl CvdReport {
    /// The results present, in the order protan, deutan, tritan.
    pub fn iter(&self) -> impl Iterator<Item = (Deficiency, &CvdResult)> {
        [
            (Deficiency::Protan, &self.protan),
            (Deficiency::Deutan, &self.deutan),
            (Deficiency::Tritan, &self.tritan),
        ]
        .into_iter()
        .filter_map(|(d, r)| r.as_ref().map(|r| (d, r)))
    }
}

/// Which check a finding belongs to.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum CheckKind {
    /// A colour shifts beyond the tolerance.
    Tolerance,
    /// A colour lies outside the press gamut.
    Gamut,
    /// A colour's press CMYK needs more ink than the press's total-ink limit.
    InkLimit,
    /// Two entries come too close in print.
    Separation,
    /// The lightness order of an ordered scheme breaks, or a step is too small.
    Order,
    /// Two entries come too close under a simulated colour-vision deficiency.
    Cvd,
}

/// One failed check, in words.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Finding {
    /// Which check failed.
    pub check: CheckKind,
    /// What failed, in words.
    pub detail: String,
}

impl Finding {
    fn new(check: CheckKind, detail: String) -> Self {
        Finding { check, detail }
    }
}

/// The palette analysis beyond the per-colour results: separation, order and colour-vision deficiency.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Survival {
    /// The kind of palette.
    pub scheme: Scheme,
    /// How far apart the entries stay.
    pub separation: Separation,
    /// The lightness order, for sequential and diverging schemes.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub order: Option<Order>,
    /// Separation under each deficiency asked for; absent when none was.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub cvd: Option<CvdReport>,
    /// True when separation, order and every deficiency pass (the palette
    /// analysis only; the whole check's verdict is [`Verdict`]).
    #[serde(rename = "survival_passes")]
    pub passes: bool,
    /// One finding per failed palette check, most important first.
    #[serde(rename = "survival_problems")]
    pub problems: Vec<Finding>,
}

/// CVD separation: simulate both the screen and the printed colours;
/// `progress` is told the pairs compared.
pub fn cvd_separation(
    sim: &Simulator,
    names: &[String],
    screen: &[LabD50],
    print: &[LabD50],
    rule: &SeparationRule<'_>,
    progress: &(dyn Fn(u64) + Sync),
) -> CvdResult {
    let s: Vec<LabD50> = screen.iter().map(|&l| sim.lab(l)).collect();
    let p: Vec<LabD50> = print.iter().map(|&l| sim.lab(l)).collect();
    // The same pair analysis as for normal vision, on the simulated colours.
    let sep = separation_with(names, &s, &p, rule, progress);
    CvdResult {
        severity: sim.severity,
        simulated_lab: p.iter().map(|l| l.to_array().map(|v| round(v, 2))).collect(),
        min_screen: sep.min_screen,
        min_print: sep.min_print,
        flagged: sep.flagged,
        flagged_count: sep.flagged_count,
    }
}

/// The whole analysis over screen and printed CIELAB in file order.
pub fn analyse(names: &[String], screen: &[LabD50], print: &[LabD50], opts: &SurvivalOptions) -> Survival {
    analyse_with(names, screen, print, opts, &|_| {})
}

/// How many pairs [`analyse_with`] compares in all: every pair once for
/// normal vision and once per deficiency.
pub fn pairs_compared(entries: usize, opts: &SurvivalOptions) -> u64 {
    let pairs = (entries * entries.saturating_sub(1) / 2) as u64;
    pairs * (1 + opts.simulators().len() as u64)
}

/// [`analyse`], telling `progress` the pairs compared as it goes (from
/// worker threads; [`pairs_compared`] in all).
pub fn analyse_with(
    names: &[String],
    screen: &[LabD50],
    print: &[LabD50],
    opts: &SurvivalOptions,
    progress: &(dyn Fn(u64) + Sync),
) -> Survival {
    let rule = opts.rule();
    let sep = separation_with(names, screen, print, &rule, progress);
    let ord = order(opts.scheme, screen, print, opts.min_step);
    let sims = opts.simulators();
    let cvd = (!sims.is_empty()).then(|| {
        let mut r = CvdReport::default();
        for s in &sims {
            let res = Some(cvd_separation(s, names, screen, print, &rule, progress));
            match s.deficiency {
                Deficiency::Protan => r.protan = res,
                Deficiency::Deutan => r.deutan = res,
                Deficiency::Tritan => r.tritan = res,
            }
        }
        r
    });
    let mut problems = Vec::new();
    if sep.flagged_count > 0 {
        let collapsed = sep.below_floor_count;
        problems.push(Finding::new(
            CheckKind::Separation,
            format!(
                "{} pair{} below ΔE00 {} in print, {} losing more than half their screen difference",
                collapsed,
                if collapsed == 1 { "" } else { "s" },
                opts.min_separation,
                sep.lost_half_count
            ),
        ));
    }
    if let Some(o) = &ord {
        if !o.monotonic_screen {
            problems.push(Finding::new(
                CheckKind::Order,
                "lightness order reverses on screen".to_string(),
            ));
        }
        if !o.monotonic_print {
            problems.push(Finding::new(
                CheckKind::Order,
                "lightness order reverses in print".to_string(),
            ));
        }
        let small = o
            .steps
            .iter()
            .filter(|s| s.too_small_print || s.too_small_screen)
            .count();
        if small > 0 {
            problems.push(Finding::new(
                CheckKind::Order,
                format!(
                    "{small} step{} below ΔE00 {}",
                    if small == 1 { "" } else { "s" },
                    opts.min_step
                ),
            ));
        }
    }
    if let Some(c) = &cvd {
        for (d, r) in c.iter() {
            if r.flagged_count > 0 {
                problems.push(Finding::new(
                    CheckKind::Cvd,
                    format!(
                        "{} {} under {d} simulation",
                        r.flagged_count,
                        if r.flagged_count == 1 {
                            "pair collapses"
                        } else {
                            "pairs collapse"
                        }
                    ),
                ));
            }
        }
    }
    Survival {
        scheme: opts.scheme,
        passes: problems.is_empty(),
        problems,
        separation: sep,
        order: ord,
        cvd,
    }
}

/// The analysis over the result of a palette check.
pub fn analyse_check(r: &CheckReport, opts: &SurvivalOptions) -> Survival {
    analyse_check_with(r, opts, &|_| {})
}

/// [`analyse_check`], telling `progress` the pairs compared.
pub fn analyse_check_with(r: &CheckReport, opts: &SurvivalOptions, progress: &(dyn Fn(u64) + Sync)) -> Survival {
    let names: Vec<String> = r.entries.iter().map(|e| e.name.clone()).collect();
    let screen: Vec<LabD50> = r.entries.iter().map(|e| LabD50::from_array(e.screen_lab)).collect();
    let print: Vec<LabD50> = r.entries.iter().map(|e| LabD50::from_array(e.printed_lab)).collect();
    analyse_with(&names, &screen, &print, opts, progress)
}

/// The one verdict of a check: every colour within tolerance, inside the
/// press gamut and within its ink limit, and every palette check passing.
/// `--strict` exits 1 exactly when `passes` is false.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Verdict {
    /// True when everything passes.
    pub passes: bool,
    /// What failed, per-colour checks first, then the palette checks.
    pub reasons: Vec<Finding>,
}

/// "3 colours … : A, B, C" for the entries that fail one per-colour test.
fn colour_finding(
    check: CheckKind,
    r: &CheckReport,
    fails: impl Fn(&super::check::CheckedEntry) -> bool,
    what: &str,
) -> Option<Finding> {
    let names: Vec<&str> = r.entries.iter().filter(|e| fails(e)).map(|e| e.name.as_str()).collect();
    (!names.is_empty()).then(|| {
        let n = names.len();
        Finding::new(
            check,
            format!(
                "{n} colour{} {what}: {}",
                if n == 1 { "" } else { "s" },
                names.join(", ")
            ),
        )
    })
}

/// The verdict over a check and its palette analysis.
pub fn verdict(r: &CheckReport, s: &Survival) -> Verdict {
    let tolerance = format!("beyond ΔE00 {}", crate::precision::fixed(r.conditions.tolerance, 1));
    let mut reasons: Vec<Finding> = [
        colour_finding(
            CheckKind::Tolerance,
            r,
            |e| !e.within_tolerance,
            &format!(
                "shift{} {tolerance}",
                if r.summary.beyond_tolerance == 1 { "s" } else { "" }
            ),
        ),
        colour_finding(CheckKind::Gamut, r, |e| !e.in_gamut, "outside the press gamut"),
        // Entries are only flagged against a known limit.
        r.ink_limit.and_then(|l| {
            colour_finding(
                CheckKind::InkLimit,
                r,
                |e| e.over_ink_limit,
                &format!("over the press's {} % ink limit", crate::precision::fixed(l.percent, 1)),
            )
        }),
    ]
    .into_iter()
    .flatten()
    .collect();
    reasons.extend(s.problems.iter().cloned());
    Verdict {
        passes: reasons.is_empty(),
        reasons,
    }
}

/// `inkfit check --json`: the check's keys followed by `scheme`,
/// `separation`, `order`, `cvd`, the palette analysis's own result, and the
/// one `verdict`.
#[derive(Serialize)]
pub struct CheckWithSurvival<'a> {
    /// The check's own result.
    #[serde(flatten)]
    pub check: &'a CheckReport,
    /// The palette analysis.
    #[serde(flatten)]
    pub survival: &'a Survival,
    /// The one verdict.
    pub verdict: &'a Verdict,
}

#[cfg(test)]
mod progress_tests {
    use super::*;
    use std::sync::atomic::{AtomicU64, Ordering};

    #[test]
    fn progress_counts_every_pair_of_every_set() {
        // Property: the counts reported add up to the pairs compared, once
        // for normal vision and once per deficiency.
        let n = 70;
        let lab: Vec<LabD50> = (0..n)
            .map(|i| LabD50::new(f64::from(i), f64::from(i % 7) * 9.0, -f64::from(i % 5) * 7.0))
            .collect();
        let names: Vec<String> = (0..n).map(|i| format!("c{i}")).collect();
        let opts = SurvivalOptions {
            cvd: vec![Deficiency::Deutan, Deficiency::Tritan],
            ..SurvivalOptions::default()
        };
        let done = AtomicU64::new(0);
        let s = analyse_with(&names, &lab, &lab, &opts, &|k| {
            done.fetch_add(k, Ordering::Relaxed);
        });
        assert_eq!(done.load(Ordering::Relaxed), pairs_compared(n as usize, &opts));
        assert_eq!(pairs_compared(n as usize, &opts), 3 * 70 * 69 / 2);
        // And the result is the one without progress.
        assert_eq!(s, analyse(&names, &lab, &lab, &opts));
    }
}
