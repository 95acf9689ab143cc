//! Lightness order of sequential and diverging schemes, on screen and in
//! print.
//!
//! Sequential: the palette in file order is one arm; L* (CIELAB D50, 0..100)
//! must change monotonically along it, in the direction from its first to its
//! last entry on screen. Each step between neighbours is measured in ΔE00
//! (CIEDE2000) and in ΔL*; a step reverses when its ΔL* has the wrong sign (or
//! is 0), and is too small when its ΔE00 is below the minimum step.
//! Unevenness is the largest step over the smallest (ΔE00; null when the
//! smallest is 0 or there is no step).
//!
//! Diverging: the middle class splits the palette into two arms, each
//! checked as a sequential scale running away from the middle (odd count:
//! both arms start at the middle entry; even count: the arms are the two
//! halves, each starting next to the centre). Symmetry compares the k-th
//! step of one arm with the k-th step of the other.

use serde::Serialize;

use crate::color::delta::delta_e00;
use crate::color::LabD50;
use crate::precision::round;

/// Default smallest acceptable step between neighbours of an ordered
/// scheme, ΔE00 5: a rule of thumb (common practice) for steps read against
/// a legend, not a standard.
pub const DEFAULT_MIN_STEP: f64 = 5.0;

/// The kind of palette, which decides the checks that apply.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Scheme {
    /// Unordered categories: no lightness order is checked.
    Qualitative,
    /// One scale from one end to the other: the lightness order applies.
    Sequential,
    /// Two arms from a middle entry out to each end: order on each arm, and symmetry.
    Diverging,
}

impl std::fmt::Display for Scheme {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(match self {
            Scheme::Qualitative => "qualitative",
            Scheme::Sequential => "sequential",
            Scheme::Diverging => "diverging",
        })
    }
}

/// Which run of a scheme a step or arm belongs to.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum ArmName {
    /// The whole of a sequential scheme.
    Scale,
    /// The arm of a diverging scheme that runs towards the first entry.
    Low,
    /// The arm of a diverging scheme that runs towards the last entry.
    High,
}

impl std::fmt::Display for ArmName {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(match self {
            ArmName::Scale => "scale",
            ArmName::Low => "low",
            ArmName::High => "high",
        })
    }
}

/// How lightness runs along an arm, on screen.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Trend {
    /// L* falls from the arm's start to its end.
    Darker,
    /// L* rises.
    Lighter,
}

impl std::fmt::Display for Trend {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(match self {
            Trend::Darker => "darker",
            Trend::Lighter => "lighter",
        })
    }
}

/// One step between neighbours, entries numbered from 1.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Step {
    /// The arm the step lies on.
    pub arm: ArmName,
    /// The entry the step starts at.
    pub from: usize,
    /// The entry the step ends at.
    pub to: usize,
    /// ΔE00 of the step on screen.
    pub screen: f64,
    /// ΔE00 of the step as printed.
    pub print: f64,
    /// Change in L* across the step on screen.
    pub screen_dl: f64,
    /// Change in L* across the step as printed.
    pub print_dl: f64,
    /// On screen the step runs against its arm's direction (or not at all).
    pub reverses_screen: bool,
    /// As printed the step runs against its arm's direction (or not at all).
    pub reverses_print: bool,
    /// The step's screen ΔE00 is below the minimum step.
    pub too_small_screen: bool,
    /// The step's printed ΔE00 is below the minimum step.
    pub too_small_print: bool,
}

/// One arm: its entries in order away from the start, and its direction.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Arm {
    /// Which arm.
    pub arm: ArmName,
    /// Its entries, numbered from 1, in order away from the start.
    /// The arm's entries, numbered from 1, in order away from its start.
    pub entries: Vec<usize>,
    /// How lightness runs along the arm, from the screen colours.
    pub direction: Trend,
}

/// Matching steps of the two arms of a diverging scheme.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SymmetryStep {
    /// The step's place along both arms, from 1 at the middle.
    pub step: usize,
    /// Printed ΔE00 of the step on the low arm.
    pub low: f64,
    /// Printed ΔE00 of the step on the high arm.
    pub high: f64,
    /// The absolute difference between `low` and `high`, ΔE00.
    pub difference: f64,
}

/// How evenly the two arms of a diverging scheme step in print.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Symmetry {
    /// Printed ΔE00 of matching steps.
    pub steps: Vec<SymmetryStep>,
    /// The largest difference between matching printed steps, ΔE00.
    pub max_difference: f64,
    /// Total printed ΔE00 of the shorter-length parts of the arms, low / high.
    pub low_total: f64,
    /// The same total for the high arm.
    pub high_total: f64,
}

/// The lightness-order analysis of a sequential or diverging palette.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Order {
    /// The smallest ΔE00 a step may have.
    pub min_step: f64,
    /// No step runs against its arm's direction on screen.
    pub monotonic_screen: bool,
    /// No step runs against its arm's direction in print.
    pub monotonic_print: bool,
    /// The arms: one for a sequential scheme, two for a diverging one.
    pub arms: Vec<Arm>,
    /// Every step between neighbours, arm by arm.
    pub steps: Vec<Step>,
    /// Largest over smallest screen step ΔE00; null when there is no step or one is 0.
    pub unevenness_screen: Option<f64>,
    /// Largest over smallest printed step ΔE00; null when there is no step or one is 0.
    pub unevenness_print: Option<f64>,
    /// Diverging schemes only: how the two arms compare in print.
    pub symmetry: Option<Symmetry>,
}

impl Order {
    /// Whether the order holds: monotonic on screen and in print and no step
    /// below the minimum.
    pub fn holds(&self) -> bool {
        self.monotonic_screen
            && self.monotonic_print
            && self.steps.iter().all(|s| !s.too_small_screen && !s.too_small_print)
    }
}

/// The arms of `scheme` over `n` entries (0-based indices, in order away from
/// each arm's start); empty for qualitative schemes.
pub fn arms(scheme: Scheme, n: usize) -> Vec<(ArmName, Vec<usize>)> {
    match scheme {
        Scheme::Qualitative => Vec::new(),
        Scheme::Sequential => vec![(ArmName::Scale, (0..n).collect())],
        Scheme::Diverging => {
            let (low, high): (Vec<usize>, Vec<usize>) = if n % 2 == 1 {
                let m = n / 2;
                ((0..=m).rev().collect(), (m..n).collect())
            } else {
                ((0..n / 2).rev().collect(), (n / 2..n).collect())
            };
            vec![(ArmName::Low, low), (ArmName::High, high)]
        }
    }
}

/// +1 when L* rises along `arm` (first to last, on `screen`), −1 otherwise.
pub fn direction(arm: &[usize], screen: &[LabD50]) -> f64 {
    match (arm.first(), arm.last()) {
        (Some(&a), Some(&b)) if screen[b].l > screen[a].l => 1.0,
        _ => -1.0,
    }
}

fn unevenness(steps: &[f64]) -> Option<f64> {
    let max = steps.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let min = steps.iter().copied().fold(f64::INFINITY, f64::min);
    (!steps.is_empty() && min > 0.0).then(|| round(max / min, 2))
}

/// The order analysis, or `None` for a qualitative scheme.
pub fn order(scheme: Scheme, screen: &[LabD50], print: &[LabD50], min_step: f64) -> Option<Order> {
    let n = screen.len().min(print.len());
    let arm_list = arms(scheme, n);
    if arm_list.is_empty() {
        return None;
    }
    let mut steps = Vec::new();
    let mut arms_out = Vec::new();
    let mut per_arm_print: Vec<Vec<f64>> = Vec::new();
    for (name, idx) in &arm_list {
        let d = direction(idx, screen);
        arms_out.push(Arm {
            arm: *name,
            entries: idx.iter().map(|i| i + 1).collect(),
            direction: if d > 0.0 { Trend::Lighter } else { Trend::Darker },
        });
        let mut printed = Vec::new();
        for w in idx.windows(2) {
            let (i, j) = (w[0], w[1]);
            let s = delta_e00(screen[i], screen[j]);
            let p = delta_e00(print[i], print[j]);
            let sdl = screen[j].l - screen[i].l;
            let pdl = print[j].l - print[i].l;
            printed.push(p);
            steps.push(Step {
                arm: *name,
                from: i + 1,
                to: j + 1,
                screen: round(s, 2),
                print: round(p, 2),
                screen_dl: round(sdl, 2),
                print_dl: round(pdl, 2),
                reverses_screen: d * sdl <= 0.0,
                reverses_print: d * pdl <= 0.0,
                too_small_screen: s < min_step,
                too_small_print: p < min_step,
            });
        }
        per_arm_print.push(printed);
    }
    let screen_steps: Vec<f64> = steps.iter().map(|s| s.screen).collect();
    let print_steps: Vec<f64> = steps.iter().map(|s| s.print).collect();
    let symmetry = (scheme == Scheme::Diverging && per_arm_print.len() == 2).then(|| {
        let (lo, hi) = (&per_arm_print[0], &per_arm_print[1]);
        let k = lo.len().min(hi.len());
        let st: Vec<SymmetryStep> = (0..k)
            .map(|s| SymmetryStep {
                step: s + 1,
                low: round(lo[s], 2),
                high: round(hi[s], 2),
                difference: round((lo[s] - hi[s]).abs(), 2),
            })
            .collect();
        Symmetry {
            max_difference: st.iter().map(|s| s.difference).fold(0.0, f64::max),
            low_total: round(lo[..k].iter().sum(), 2),
            high_total: round(hi[..k].iter().sum(), 2),
            steps: st,
        }
    });
    Some(Order {
        min_step,
        monotonic_screen: steps.iter().all(|s| !s.reverses_screen),
        monotonic_print: steps.iter().all(|s| !s.reverses_print),
        arms: arms_out,
        unevenness_screen: unevenness(&screen_steps),
        unevenness_print: unevenness(&print_steps),
        steps,
        symmetry,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn greys(l: &[f64]) -> Vec<LabD50> {
        l.iter().map(|&v| LabD50::new(v, 0.0, 0.0)).collect()
    }

    #[test]
    fn sequential_finds_reversal_and_small_step() {
        let screen = greys(&[90.0, 70.0, 50.0, 30.0]);
        // In print the two darkest swap: a reversal at step 3 → 4.
        let print = greys(&[88.0, 69.0, 40.0, 42.0]);
        let o = order(Scheme::Sequential, &screen, &print, 5.0).unwrap();
        assert!(o.monotonic_screen && !o.monotonic_print);
        let last = o.steps.last().unwrap();
        assert!(last.reverses_print && last.too_small_print, "{last:?}");
        assert_eq!(o.arms[0].direction, Trend::Darker);
        assert!(!o.holds());
    }

    #[test]
    fn diverging_arms_run_away_from_the_middle() {
        // A pure ΔL* step of 10 at L̄ = 45 or 55 has ΔE00 = 10 / S_L with
        // S_L = 1 + 0.015·25 / sqrt(20 + 25) = 1.0559 (CIEDE2000, Sharma,
        // Wu, Dalal 2005, eq. 10; computed by hand): 9.47 on both arms.
        let lab = greys(&[30.0, 40.0, 50.0, 60.0, 70.0]);
        let o = order(Scheme::Diverging, &lab, &lab, 5.0).unwrap();
        assert_eq!(o.arms[0].entries, vec![3, 2, 1]);
        assert_eq!(o.arms[1].entries, vec![3, 4, 5]);
        assert!(o.holds());
        let s = o.symmetry.unwrap();
        assert_eq!(s.steps[0].low, 9.47);
        assert_eq!(s.steps[0].high, 9.47);
        assert_eq!(s.max_difference, 0.0);
        assert_eq!(order(Scheme::Qualitative, &lab, &lab, 5.0), None);
        let even = arms(Scheme::Diverging, 4);
        assert_eq!(even[0].1, vec![1, 0]);
        assert_eq!(even[1].1, vec![2, 3]);
    }
}
