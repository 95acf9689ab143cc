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
    /// Only the flagged pairs (palettes of more than 64 entries).
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
    /// Where the adjacency comes from (`map` or `file`), when one is known.
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
    /// The pairs listed: every pair, or only the flagged ones (see `pairs_listed`).
    pub pairs: Vec<Pair>,
    /// Flagged pairs, smallest printed ΔE00 first.
    pub flagged: Vec<FlaggedPair>,
}

/// Whether a pair with these differences is flagged: `(below_floor, lost_half)`.
pub fn pair_flags(screen: f64, print: f64, floor: f64) -> (bool, bool) {
    (print < floor, print < 0.5 * screen)
}

/// The separation analysis of `screen` and `print` (same length, file order;
/// `names` for the flagged list) against the floors of `rule`.
pub fn separation(names: &[String], screen: &[LabD50], print: &[LabD50], rule: &SeparationRule<'_>) -> Separation {
    let n = screen.len().min(print.len());
    let list_all = n <= MAX_ENTRIES_LISTING_ALL_PAIRS;
    let mut pairs = Vec::new();
    let mut flagged = Vec::new();
    let mut min_s: Option<(f64, [usize; 2])> = None;
    let mut min_p: Option<(f64, [usize; 2])> = None;
    for i in 0..n {
        for j in i + 1..n {
            let s = delta_e00(screen[i], screen[j]);
            let p = delta_e00(print[i], print[j]);
            let ids = [i + 1, j + 1];
            if min_s.is_none_or(|(v, _)| s < v) {
                min_s = Some((s, ids));
            }
            if min_p.is_none_or(|(v, _)| p < v) {
                min_p = Some((p, ids));
            }
            let (touching, floor) = rule.of_pair(i, j);
            let (below_floor, lost_half) = pair_flags(s, p, floor);
            let pair = Pair {
                a: i + 1,
                b: j + 1,
                screen: round(s, 2),
                print: round(p, 2),
                touching,
                border_px: rule.adjacency.and_then(|a| a.border_px(i, j)),
            };
            if below_floor || lost_half {
                flagged.push(FlaggedPair {
                    a: i + 1,
                    b: j + 1,
                    a_name: names.get(i).cloned().unwrap_or_default(),
                    b_name: names.get(j).cloned().unwrap_or_default(),
                    screen: pair.screen,
                    print: pair.print,
                    floor,
                    touching,
                    border_px: pair.border_px,
                    below_floor,
                    lost_half,
                });
                if !list_all {
                    pairs.push(pair.clone());
                }
            }
            if list_all {
                pairs.push(pair);
            }
        }
    }
    flagged.sort_by(|x, y| x.print.total_cmp(&y.print).then((x.a, x.b).cmp(&(y.a, y.b))));
    Separation {
        min_separation: rule.floor,
        min_legend_separation: rule.adjacency.map(|_| rule.legend_floor),
        adjacency: rule.adjacency.map(|a| a.source),
        touching_pairs: rule.adjacency.map(Adjacency::len),
        min_screen: min_s.map_or(0.0, |(v, _)| round(v, 2)),
        min_print: min_p.map_or(0.0, |(v, _)| round(v, 2)),
        min_screen_pair: min_s.map(|(_, p)| p),
        min_print_pair: min_p.map(|(_, p)| p),
        pairs_listed: if list_all {
            PairsListed::All
        } else {
            PairsListed::Flagged
        },
        pairs,
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
}
