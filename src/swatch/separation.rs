//! Class separation of a palette: the CIEDE2000 between every pair of
//! entries on screen and in print, the closest pairs, and the pairs that
//! collapse in print.
//!
//! A pair is flagged when its printed ΔE00 falls below its floor, or when
//! printing loses more than half of its screen difference
//! (`print < screen / 2`). Without an adjacency every pair's floor is the
//! separation floor. With one (the classes of a map image, or an adjacency
//! file; [`super::adjacency`]) touching pairs keep the separation floor and
//! pairs that never touch get the lower legend floor: they are told apart
//! by matching each to its legend key, not across a shared border. ΔE00 is CIEDE2000 (CIE 142-2001, as in
//! [`crate::color::delta::delta_e00`]) on CIELAB D50; values are rounded to
//! 2 decimals in the result.

use crate::precision::round;
use serde::Serialize;

use super::adjacency::{Adjacency, AdjacencySource};
use crate::color::delta::delta_e00;
use crate::color::delta_batch::{at_least, below, LabSet, ABS, REL};
use crate::color::LabD50;

/// Default separation floor, ΔE00 10: map classes that must be told apart at
/// a glance, a rule of thumb (common practice), not a standard.
pub const DEFAULT_MIN_SEPARATION: f64 = 10.0;

/// Default legend floor, ΔE00 5, for pairs of map classes that never touch:
/// half the separation floor (our choice; the command line's default is half
/// of whatever `--min-separation` is). Two keys of a legend a reader
/// matches areas against must not be mistaken for each other, but need not
/// stand out across a border at a glance. Colours seen apart are harder to
/// tell than colours side by side, so the legend floor stays well above the
/// ΔE00 of about 1 that side-by-side comparison resolves.
pub const DEFAULT_MIN_LEGEND_SEPARATION: f64 = 5.0;

/// The floors pairs are held to.
#[derive(Clone, Copy, Debug)]
pub struct SeparationRule<'a> {
    /// The printed ΔE00 floor for every pair, or for touching pairs when
    /// `adjacency` is known.
    pub floor: f64,
    /// The printed ΔE00 floor for pairs that do not touch, when `adjacency`
    /// is known.
    pub legend_floor: f64,
    /// Which entries touch, when known.
    pub adjacency: Option<&'a Adjacency>,
}

impl SeparationRule<'_> {
    /// Every pair held to `floor`.
    pub fn all_pairs(floor: f64) -> SeparationRule<'static> {
        SeparationRule {
            floor,
            legend_floor: floor,
            adjacency: None,
        }
    }

    /// Whether entries `i` and `j` (0-based) touch, and the floor they are held to.
    fn of_pair(&self, i: usize, j: usize) -> (Option<bool>, f64) {
        match self.adjacency {
            None => (None, self.floor),
            // Where either entry's neighbours are unknown, the full floor.
            Some(a) if !(a.knows(i) && a.knows(j)) => (None, self.floor),
            Some(a) if a.touches(i, j) => (Some(true), self.floor),
            Some(_) => (Some(false), self.legend_floor),
        }
    }
}

/// Above this many entries only the flagged pairs are listed under `pairs`.
pub const MAX_ENTRIES_LISTING_ALL_PAIRS: usize = 64;

/// One pair of entries, numbered from 1 in file order.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Pair {
    /// The first entry of the pair.
    pub a: usize,
    /// The second entry of the pair.
    pub b: usize,
    /// ΔE00 on screen.
    pub screen: f64,
    /// ΔE00 as printed.
    pub print: f64,
    /// The two share a border on the map; absent when no adjacency is known.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub touching: Option<bool>,
    /// Their shared border in pixels, where known.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub border_px: Option<u64>,
}

/// A pair that does not survive print.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FlaggedPair {
    /// The first entry of the pair, numbered from 1.
    pub a: usize,
    /// The second entry of the pair, numbered from 1.
    pub b: usize,
    /// The first entry's name.
    pub a_name: String,
    /// The second entry's name.
    pub b_name: String,
    /// ΔE00 on screen.
    pub screen: f64,
    /// ΔE00 as printed.
    pub print: f64,
    /// The floor the pair is held to: the separation floor, or the legend
    /// floor for a pair that does not touch.
    pub floor: f64,
    /// The two share a border on the map; absent when no adjacency is known.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub touching: Option<bool>,
    /// Their shared border in pixels, where known.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub border_px: Option<u64>,
    /// Printed ΔE00 below the floor.
    pub below_floor: bool,
    /// Printing lost more than half of the screen ΔE00.
    pub lost_half: bool,
}

/// Which pairs a separation result lists.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum PairsListed {
    /// Every pair.
    All,
    /// Only the flagged pairs listed under `flagged` (palettes of more than 64 entries).
    Flagged,
}

/// How far apart every pair of entries stays, on screen and in print.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Separation {
    /// The printed ΔE00 floor every pair is held to, or every touching pair
    /// when an adjacency is known.
    pub min_separation: f64,
    /// The floor of pairs that do not touch, when an adjacency is known.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub min_legend_separation: Option<f64>,
    /// Where the adjacency comes from (`map`, `render` or `file`), when one is known.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub adjacency: Option<AdjacencySource>,
    /// How many pairs touch, when an adjacency is known.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub touching_pairs: Option<usize>,
    /// The smallest ΔE00 between two entries on screen (0 for fewer than two entries).
    pub min_screen: f64,
    /// The smallest ΔE00 between two entries as printed (0 for fewer than two entries).
    pub min_print: f64,
    /// The closest pair on screen and in print, numbered from 1.
    pub min_screen_pair: Option<[usize; 2]>,
    /// The closest pair in print, numbered from 1.
    pub min_print_pair: Option<[usize; 2]>,
    /// Which pairs `pairs` lists.
    pub pairs_listed: PairsListed,
    /// The pairs listed: every pair, or the flagged ones listed under
    /// `flagged` (see `pairs_listed`), in entry order.
    pub pairs: Vec<Pair>,
    /// How many pairs are flagged, all of them.
    pub flagged_count: usize,
    /// How many of them are below their floor.
    pub below_floor_count: usize,
    /// How many of them lost more than half their screen difference.
    pub lost_half_count: usize,
    /// Flagged pairs, smallest printed ΔE00 first; at most
    /// [`MAX_PAIRS_LISTED`] (`flagged_count` says how many there are).
    pub flagged: Vec<FlaggedPair>,
}

/// Whether a pair with these differences is flagged: `(below_floor, lost_half)`.
pub fn pair_flags(screen: f64, print: f64, floor: f64) -> (bool, bool) {
    (print < floor, print < 0.5 * screen)
}

/// A flagged pair as found, before it is named: ordered by printed ΔE00
/// (rounded, as listed), then by entry numbers.
#[derive(Clone, Copy, Debug)]
struct Found {
    print: f64,
    screen: f64,
    i: usize,
    j: usize,
    below_floor: bool,
    lost_half: bool,
}

impl Found {
    fn key(&self) -> (f64, usize, usize) {
        (self.print, self.i, self.j)
    }
}

impl PartialEq for Found {
    fn eq(&self, o: &Self) -> bool {
        self.cmp(o) == std::cmp::Ordering::Equal
    }
}
impl Eq for Found {}
impl PartialOrd for Found {
    fn partial_cmp(&self, o: &Self) -> Option<std::cmp::Ordering> {
        Some(self.cmp(o))
    }
}
impl Ord for Found {
    fn cmp(&self, o: &Self) -> std::cmp::Ordering {
        let (a, b) = (self.key(), o.key());
        a.0.total_cmp(&b.0).then((a.1, a.2).cmp(&(b.1, b.2)))
    }
}

/// What one stretch of rows of the pair triangle found.
struct Tally {
    min_s: Option<(f64, [usize; 2])>,
    min_p: Option<(f64, [usize; 2])>,
    /// The smallest flagged pairs, at most [`MAX_PAIRS_LISTED`] (a max-heap).
    smallest: std::collections::BinaryHeap<Found>,
    flagged: usize,
    below_floor: usize,
    lost_half: usize,
    /// Every pair in order, when every pair is listed.
    all: Vec<(usize, usize, f64, f64)>,
    /// Screened values above these cannot be the closest pair on screen,
    /// in print, or be listed (kept with the minima and the heap).
    min_s_cut: f64,
    min_p_cut: f64,
    listed_cut: f64,
}

impl Default for Tally {
    fn default() -> Self {
        Tally {
            min_s: None,
            min_p: None,
            smallest: Default::default(),
            flagged: 0,
            below_floor: 0,
            lost_half: 0,
            all: Vec::new(),
            min_s_cut: f64::INFINITY,
            min_p_cut: f64::INFINITY,
            listed_cut: f64::INFINITY,
        }
    }
}

fn lesser(a: Option<(f64, [usize; 2])>, b: Option<(f64, [usize; 2])>) -> Option<(f64, [usize; 2])> {
    match (a, b) {
        (Some(x), Some(y)) => Some(if y.0 < x.0 || (y.0 == x.0 && y.1 < x.1) { y } else { x }),
        (x, None) => x,
        (None, y) => y,
    }
}

/// The tests on screened values (squared ΔE00, see [`crate::color::delta_batch`])
/// that decide a pair's flags for a given pair of floors.
#[derive(Clone, Copy, Debug)]
struct Cuts {
    /// Printed at least this: at or above every floor.
    above_floors: f64,
    /// Printed below this: below every floor.
    below_floors: f64,
    /// Printed at least `kept.0`·screen + `kept.1`: print ≥ screen / 2.
    kept: (f64, f64),
    /// Printed below `lost.0`·screen + `lost.1`: print < screen / 2.
    lost: (f64, f64),
}

impl Cuts {
    fn new(rule: &SeparationRule<'_>) -> Self {
        let (lo, hi) = (rule.floor.min(rule.legend_floor), rule.floor.max(rule.legend_floor));
        // D_p ≥ D_s / 4 when (D̂p − ABS)/(1 + REL) ≥ (D̂s + ABS)/(4(1 − REL));
        // D_p < D_s / 4 when (D̂p + ABS)/(1 − REL) < (D̂s − ABS)/(4(1 + REL)).
        let k = (1.0 + REL) / (4.0 * (1.0 - REL));
        let l = (1.0 - REL) / (4.0 * (1.0 + REL));
        Cuts {
            above_floors: at_least(hi * hi),
            below_floors: below(lo * lo),
            kept: (k, k * ABS + ABS),
            lost: (l, -l * ABS - ABS),
        }
    }
}

impl Tally {
    fn count(&mut self, below_floor: bool, lost_half: bool) {
        self.flagged += 1;
        self.below_floor += usize::from(below_floor);
        self.lost_half += usize::from(lost_half);
    }

    /// Takes a pair's exact screen and printed ΔE00 as candidates for the
    /// closest pairs.
    fn offer_minima(&mut self, s: f64, p: f64, pair: [usize; 2]) {
        self.min_s = lesser(self.min_s, Some((s, pair)));
        self.min_p = lesser(self.min_p, Some((p, pair)));
        self.refresh_cuts();
    }

    fn refresh_cuts(&mut self) {
        self.min_s_cut = self.min_s.map_or(f64::INFINITY, |(v, _)| at_least(v * v));
        self.min_p_cut = self.min_p.map_or(f64::INFINITY, |(v, _)| at_least(v * v));
        self.listed_cut = match self.smallest.peek() {
            // A listed pair's rounded print is at most the largest listed.
            Some(top) if self.smallest.len() >= MAX_PAIRS_LISTED => at_least((top.print + 0.006).powi(2)),
            _ => f64::INFINITY,
        };
    }

    /// Decides a pair from its screened squared screen and printed ΔE00
    /// (`floor`: the pair's own floor), counting it when flagged: true when
    /// decided, false when the pair needs its exact ΔE00 (the bound cannot
    /// decide a flag, or the pair may be the closest one or among the
    /// listed flagged ones). NaN values are never decided.
    #[inline]
    fn screen(&mut self, ds: f32, dp: f32, cuts: &Cuts, floor: impl Fn() -> f64) -> bool {
        let (s, p) = (f64::from(ds), f64::from(dp));
        if !(s > self.min_s_cut && p > self.min_p_cut) {
            return false;
        }
        let kept = p >= cuts.kept.0 * s + cuts.kept.1;
        if kept && p >= cuts.above_floors {
            // Most pairs: clear of every floor and of the lost-half edge.
            return true;
        }
        let below_floor = if p >= cuts.above_floors {
            false
        } else if p < cuts.below_floors {
            true
        } else {
            let f = floor();
            let f = f * f;
            if p >= at_least(f) {
                false
            } else if p < below(f) {
                true
            } else {
                return false;
            }
        };
        let lost_half = if kept {
            false
        } else if p < cuts.lost.0 * s + cuts.lost.1 {
            true
        } else {
            return false;
        };
        if below_floor || lost_half {
            if p <= self.listed_cut {
                return false;
            }
            self.count(below_floor, lost_half);
        }
        true
    }

    fn keep(&mut self, f: Found) {
        if self.smallest.len() < MAX_PAIRS_LISTED {
            self.smallest.push(f);
        } else if self.smallest.peek().is_some_and(|top| f < *top) {
            self.smallest.pop();
            self.smallest.push(f);
        } else {
            return;
        }
        self.refresh_cuts();
    }

    fn merge(mut self, o: Tally) -> Tally {
        self.min_s = lesser(self.min_s, o.min_s);
        self.min_p = lesser(self.min_p, o.min_p);
        self.flagged += o.flagged;
        self.below_floor += o.below_floor;
        self.lost_half += o.lost_half;
        for f in o.smallest {
            self.keep(f);
        }
        self.all.extend(o.all);
        self.refresh_cuts();
        self
    }
}

/// Most pairs listed under `flagged` (and under `pairs` above
/// [`MAX_ENTRIES_LISTING_ALL_PAIRS`] entries): the smallest printed ΔE00
/// first, as many as a 64-entry palette has pairs, so a small palette's
/// lists are whole; the counts cover every pair. Bounds the result's memory
/// whatever the palette: 1,500 random colours flag some 450,000 pairs.
pub const MAX_PAIRS_LISTED: usize = 2_016;

/// The separation analysis of `screen` and `print` (same length, file order;
/// `names` for the flagged list) against the floors of `rule`. Rows of the
/// pair triangle are shared among threads; the result does not depend on
/// how.
pub fn separation(names: &[String], screen: &[LabD50], print: &[LabD50], rule: &SeparationRule<'_>) -> Separation {
    separation_with(names, screen, print, rule, &|_| {})
}

/// [`separation`], telling `progress` how many pairs each finished row held
/// (from worker threads; the counts add up to n·(n − 1)/2).
///
/// Above [`MAX_ENTRIES_LISTING_ALL_PAIRS`] entries a pair is first screened
/// with the bounded single-precision ΔE00² of [`crate::color::delta_batch`]:
/// a pair whose flags the bound decides, and which cannot be the closest
/// pair or among the listed flagged ones, is only counted. Every other pair,
/// and every pair of a smaller palette, gets the exact ΔE00, so the result
/// equals that of the exact comparison of all pairs.
pub fn separation_with(
    names: &[String],
    screen: &[LabD50],
    print: &[LabD50],
    rule: &SeparationRule<'_>,
    progress: &(dyn Fn(u64) + Sync),
) -> Separation {
    let n = screen.len().min(print.len());
    let screened = n > MAX_ENTRIES_LISTING_ALL_PAIRS;
    tally(names, &screen[..n], &print[..n], rule, progress, screened)
}

/// The pair rows, screened or all exact; then the result.
fn tally(
    names: &[String],
    screen: &[LabD50],
    print: &[LabD50],
    rule: &SeparationRule<'_>,
    progress: &(dyn Fn(u64) + Sync),
    screened: bool,
) -> Separation {
    use rayon::prelude::*;
    let n = screen.len();
    let list_all = n <= MAX_ENTRIES_LISTING_ALL_PAIRS;
    let exact = |t: &mut Tally, i: usize, j: usize| {
        let s = delta_e00(screen[i], screen[j]);
        let p = delta_e00(print[i], print[j]);
        t.offer_minima(s, p, [i + 1, j + 1]);
        let (_, floor) = rule.of_pair(i, j);
        let (below_floor, lost_half) = pair_flags(s, p, floor);
        let (s2, p2) = (round(s, 2), round(p, 2));
        if list_all {
            t.all.push((i, j, s2, p2));
        }
        if below_floor || lost_half {
            t.count(below_floor, lost_half);
            t.keep(Found {
                print: p2,
                screen: s2,
                i,
                j,
                below_floor,
                lost_half,
            });
        }
    };
    let sets = screened.then(|| (LabSet::new(screen), LabSet::new(print)));
    let cuts = Cuts::new(rule);
    let row = |(mut t, mut ds, mut dp): (Tally, Vec<f32>, Vec<f32>), i: usize| {
        match &sets {
            None => (i + 1..n).for_each(|j| exact(&mut t, i, j)),
            Some((ss, ps)) => {
                ss.squared_row(i, i + 1, &mut ds);
                ps.squared_row(i, i + 1, &mut dp);
                for (k, (&s, &p)) in ds.iter().zip(&dp).enumerate() {
                    let j = i + 1 + k;
                    if !t.screen(s, p, &cuts, || rule.of_pair(i, j).1) {
                        exact(&mut t, i, j);
                    }
                }
            }
        }
        progress((n - i - 1) as u64);
        (t, ds, dp)
    };
    let t = (0..n)
        .into_par_iter()
        .fold(|| (Tally::default(), Vec::new(), Vec::new()), row)
        .map(|(t, _, _)| t)
        .reduce(Tally::default, Tally::merge);
    let pair_of = |i: usize, j: usize, screen: f64, print: f64| Pair {
        a: i + 1,
        b: j + 1,
        screen,
        print,
        touching: rule.of_pair(i, j).0,
        border_px: rule.adjacency.and_then(|a| a.border_px(i, j)),
    };
    let smallest = t.smallest.into_sorted_vec();
    let flagged: Vec<FlaggedPair> = smallest
        .iter()
        .map(|f| {
            let (touching, floor) = rule.of_pair(f.i, f.j);
            FlaggedPair {
                a: f.i + 1,
                b: f.j + 1,
                a_name: names.get(f.i).cloned().unwrap_or_default(),
                b_name: names.get(f.j).cloned().unwrap_or_default(),
                screen: f.screen,
                print: f.print,
                floor,
                touching,
                border_px: rule.adjacency.and_then(|a| a.border_px(f.i, f.j)),
                below_floor: f.below_floor,
                lost_half: f.lost_half,
            }
        })
        .collect();
    let pairs = if list_all {
        t.all.into_iter().map(|(i, j, s, p)| pair_of(i, j, s, p)).collect()
    } else {
        let mut v: Vec<Pair> = smallest.iter().map(|f| pair_of(f.i, f.j, f.screen, f.print)).collect();
        v.sort_by_key(|p| (p.a, p.b));
        v
    };
    Separation {
        min_separation: rule.floor,
        min_legend_separation: rule.adjacency.map(|_| rule.legend_floor),
        adjacency: rule.adjacency.map(|a| a.source),
        touching_pairs: rule.adjacency.map(Adjacency::len),
        min_screen: t.min_s.map_or(0.0, |(v, _)| round(v, 2)),
        min_print: t.min_p.map_or(0.0, |(v, _)| round(v, 2)),
        min_screen_pair: t.min_s.map(|(_, p)| p),
        min_print_pair: t.min_p.map(|(_, p)| p),
        pairs_listed: if list_all {
            PairsListed::All
        } else {
            PairsListed::Flagged
        },
        pairs,
        flagged_count: t.flagged,
        below_floor_count: t.below_floor,
        lost_half_count: t.lost_half,
        flagged,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn names(n: usize) -> Vec<String> {
        (1..=n).map(|i| format!("c{i}")).collect()
    }

    #[test]
    fn flags_collapsed_and_halved_pairs() {
        // Pure lightness differences: for ΔL only, CIEDE2000 is
        // ΔL / S_L with S_L = 1 + 0.015 (L̄−50)² / sqrt(20 + (L̄−50)²)
        // (Sharma, Wu, Dalal 2005, eq. 10); at L̄ = 50, S_L = 1, so the
        // ΔE00 equals the L* difference, computed here by hand.
        let screen = [
            LabD50::new(40.0, 0.0, 0.0),
            LabD50::new(60.0, 0.0, 0.0),
            LabD50::new(45.0, 0.0, 0.0),
        ];
        let print = [
            LabD50::new(46.0, 0.0, 0.0),
            LabD50::new(54.0, 0.0, 0.0),
            LabD50::new(40.0, 0.0, 0.0),
        ];
        let s = separation(&names(3), &screen, &print, &SeparationRule::all_pairs(10.0));
        assert_eq!(s.pairs.len(), 3);
        assert_eq!(
            s.pairs[0],
            Pair {
                a: 1,
                b: 2,
                screen: 20.0,
                print: 8.0,
                touching: None,
                border_px: None,
            }
        );
        // Pair 1–2: 20 on screen, 8 in print: below 10 and lost more than half.
        let f = s.flagged.iter().find(|f| (f.a, f.b) == (1, 2)).unwrap();
        assert!(f.below_floor && f.lost_half);
        assert_eq!(s.min_print_pair, Some([1, 3]));
        assert!(s.flagged.windows(2).all(|w| w[0].print <= w[1].print));
    }

    #[test]
    fn lists_only_flagged_pairs_for_large_palettes() {
        let n = MAX_ENTRIES_LISTING_ALL_PAIRS + 1;
        let lab: Vec<LabD50> = (0..n).map(|i| LabD50::new(i as f64 * 1.5, 0.0, 0.0)).collect();
        let s = separation(&names(n), &lab, &lab, &SeparationRule::all_pairs(10.0));
        assert_eq!(s.pairs_listed, PairsListed::Flagged);
        assert_eq!(s.pairs.len(), s.flagged.len());
        assert!(s.pairs.len() < n * (n - 1) / 2);
    }

    /// The screened comparison gives the very result of comparing every
    /// pair exactly (the property the screen must hold), on a palette with
    /// duplicates, greys, near-equal and near-opposite colours, with and
    /// without an adjacency.
    #[test]
    fn screening_changes_nothing() {
        let mut state: u64 = 0x5eed;
        let mut unit = move || {
            state = state
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            (state >> 11) as f64 / (1u64 << 53) as f64
        };
        let mut screen = Vec::new();
        let mut print = Vec::new();
        for k in 0..400 {
            let s = LabD50::new(100.0 * unit(), 200.0 * unit() - 100.0, 200.0 * unit() - 100.0);
            let p = match k % 5 {
                // A print that keeps about half the screen difference, so
                // that many pairs sit near the lost-half edge.
                0 => LabD50::new(50.0 + 0.5 * (s.l - 50.0), 0.5 * s.a, 0.5 * s.b),
                1 => LabD50::new(s.l, 0.0, 0.0),
                2 if k > 10 => print[k - 5],
                3 => LabD50::new(s.l, -s.a, -s.b),
                _ => LabD50::new(s.l + unit(), s.a * 0.7, s.b * 0.7 + unit()),
            };
            screen.push(s);
            print.push(p);
        }
        let names = names(screen.len());
        let touching = (0..400).step_by(3).map(|i| ((i, i + 1), Some(4))).collect();
        let adjacency = Adjacency::new(AdjacencySource::File, touching);
        for rule in [
            SeparationRule::all_pairs(10.0),
            SeparationRule {
                floor: 12.0,
                legend_floor: 6.0,
                adjacency: Some(&adjacency),
            },
        ] {
            let exact = tally(&names, &screen, &print, &rule, &|_| {}, false);
            let screened = tally(&names, &screen, &print, &rule, &|_| {}, true);
            assert!(exact.flagged_count > MAX_PAIRS_LISTED, "{}", exact.flagged_count);
            assert_eq!(screened, exact);
        }
    }
}
