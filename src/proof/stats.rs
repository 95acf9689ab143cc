//! Per-image CIEDE2000 statistics of a soft proof, gathered in one pass
//! through a fixed-width histogram so that chunks processed in parallel merge
//! exactly and the result does not depend on the order of the chunks.
//!
//! ΔE00 values are binned at 0.01 (rounded to the nearest bin, values of 100
//! and more share the last bin). Shares above a threshold and percentiles
//! are computed on those binned values; mean and maximum on the unbinned
//! values. Percentiles use the nearest-rank definition: the smallest value v
//! with at least ⌈p·N⌉ of the N values ≤ v (Hyndman & Fan 1996, definition 1).

use serde::Serialize;

/// Bin width in ΔE00.
pub const BIN: f64 = 0.01;
/// Number of bins: 0.00 ..= 100.00.
pub const BINS: usize = 10_001;
/// The thresholds reported as shares "above".
pub const THRESHOLDS: [f64; 5] = [1.0, 2.0, 3.0, 5.0, 10.0];

/// The histogram bin of a ΔE00 value (0.01 wide, rounded to nearest). A
/// value that is not a number (a difference that could not be computed)
/// falls in the last bin, with the largest differences, never in the first.
#[inline]
pub fn bin_of(de: f32) -> usize {
    if de.is_nan() {
        return BINS - 1;
    }
    let q = (de * 100.0 + 0.5) as usize; // `as` saturates
    q.min(BINS - 1)
}

/// The top of the ΔE00 scale, where a difference that is not a number is
/// counted in the mean and the maximum.
pub const TOP_DE00: f32 = ((BINS - 1) as f64 * BIN) as f32;

/// Running totals over some pixels; merge with [`Tally::merge`].
#[derive(Clone, Debug)]
pub struct Tally {
    /// Pixel counts per ΔE00 bin ([`BINS`] bins of [`BIN`]).
    pub hist: Vec<u32>,
    /// Sum of the unbinned ΔE00 values.
    pub sum: f64,
    /// The largest unbinned ΔE00.
    pub max: f32,
    /// Pixels that fail the gamut test.
    pub outside_gamut: u64,
    /// Pixels added.
    pub pixels: u64,
}

impl Default for Tally {
    fn default() -> Self {
        Self::new()
    }
}

impl Tally {
    /// An empty tally.
    pub fn new() -> Self {
        Self {
            hist: vec![0; BINS],
            sum: 0.0,
            max: 0.0,
            outside_gamut: 0,
            pixels: 0,
        }
    }

    /// Adds one pixel.
    #[inline]
    pub fn add(&mut self, de: f32, outside: bool) {
        let de = if de.is_nan() { TOP_DE00 } else { de };
        self.hist[bin_of(de)] += 1;
        self.sum += f64::from(de);
        self.max = self.max.max(de);
        self.outside_gamut += u64::from(outside);
        self.pixels += 1;
    }

    /// The totals of `self` and `other` together.
    pub fn merge(mut self, other: Tally) -> Tally {
        for (a, b) in self.hist.iter_mut().zip(&other.hist) {
            *a += b;
        }
        self.sum += other.sum;
        self.max = self.max.max(other.max);
        self.outside_gamut += other.outside_gamut;
        self.pixels += other.pixels;
        self
    }

    /// Nearest-rank percentile `p` in (0, 1] of the binned values.
    pub fn percentile(&self, p: f64) -> f64 {
        if self.pixels == 0 {
            return 0.0;
        }
        let rank = ((p * self.pixels as f64).ceil() as u64).clamp(1, self.pixels);
        let mut seen = 0u64;
        for (i, &c) in self.hist.iter().enumerate() {
            seen += u64::from(c);
            if seen >= rank {
                return i as f64 * BIN;
            }
        }
        (BINS - 1) as f64 * BIN
    }

    /// Share of pixels whose binned ΔE00 is above `t`.
    pub fn share_above(&self, t: f64) -> f64 {
        if self.pixels == 0 {
            return 0.0;
        }
        let first = ((t / BIN).round() as usize + 1).min(BINS);
        let n: u64 = self.hist[first..].iter().map(|&c| u64::from(c)).sum();
        n as f64 / self.pixels as f64
    }

    /// The statistics of the pixels added, rounded for output.
    pub fn summary(&self) -> DeltaStats {
        let share = |t| round(self.share_above(t), 6);
        DeltaStats {
            pixels: self.pixels,
            share_above: ShareAbove {
                above_1: share(1.0),
                above_2: share(2.0),
                above_3: share(3.0),
                above_5: share(5.0),
                above_10: share(10.0),
            },
            mean: round(
                if self.pixels == 0 {
                    0.0
                } else {
                    self.sum / self.pixels as f64
                },
                2,
            ),
            p50: round(self.percentile(0.50), 2),
            p95: round(self.percentile(0.95), 2),
            p99: round(self.percentile(0.99), 2),
            max: round(f64::from(self.max), 2),
            outside_gamut: round(
                if self.pixels == 0 {
                    0.0
                } else {
                    self.outside_gamut as f64 / self.pixels as f64
                },
                6,
            ),
        }
    }
}

use crate::precision::round;

/// Shares (0..1) of pixels with ΔE00 above 1, 2, 3, 5 and 10.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct ShareAbove {
    /// Share with ΔE00 above 1.
    pub above_1: f64,
    /// Share with ΔE00 above 2.
    pub above_2: f64,
    /// Share with ΔE00 above 3.
    pub above_3: f64,
    /// Share with ΔE00 above 5.
    pub above_5: f64,
    /// Share with ΔE00 above 10.
    pub above_10: f64,
}

/// The statistics of one proof. ΔE00 to 2 decimals, shares to 6.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct DeltaStats {
    /// Pixels counted.
    pub pixels: u64,
    /// Shares of pixels above each threshold.
    pub share_above: ShareAbove,
    /// Mean ΔE00.
    pub mean: f64,
    /// Median ΔE00 (nearest rank, binned).
    pub p50: f64,
    /// 95th percentile ΔE00 (nearest rank, binned).
    pub p95: f64,
    /// 99th percentile ΔE00 (nearest rank, binned).
    pub p99: f64,
    /// The largest ΔE00.
    pub max: f64,
    /// Share of pixels whose colour fails the round-trip gamut test.
    pub outside_gamut: f64,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_difference_that_is_not_a_number_counts_as_the_largest() {
        // Property: NaN must never read as "no difference" (bin 0).
        assert_eq!(bin_of(f32::NAN), BINS - 1);
        assert_eq!(bin_of(0.004), 0);
        assert_eq!(bin_of(1e9), BINS - 1);
        let mut t = Tally::new();
        t.add(0.5, false);
        t.add(f32::NAN, false);
        let s = t.summary();
        assert_eq!(s.max, 100.0);
        assert_eq!(s.mean, 50.25);
        assert_eq!(t.percentile(1.0), 100.0);
    }

    #[test]
    fn percentiles_match_a_sorted_nearest_rank() {
        // Reference: nearest-rank percentile computed independently by sorting
        // (Hyndman & Fan 1996, definition 1).
        let vals: Vec<f32> = (0..997).map(|i| ((i * 37) % 1000) as f32 * 0.013).collect();
        let mut t = Tally::new();
        for &v in &vals {
            t.add(v, false);
        }
        let mut binned: Vec<f64> = vals.iter().map(|&v| bin_of(v) as f64 * BIN).collect();
        binned.sort_by(f64::total_cmp);
        for p in [0.5, 0.95, 0.99, 1.0] {
            let rank = (p * binned.len() as f64).ceil() as usize;
            assert!((t.percentile(p) - binned[rank - 1]).abs() < 1e-9, "p{p}");
        }
        let above3 = binned.iter().filter(|&&v| v > 3.0 + 1e-9).count() as f64 / binned.len() as f64;
        assert!((t.share_above(3.0) - above3).abs() < 1e-12);
    }

    #[test]
    fn merging_is_the_same_as_one_pass() {
        let mut a = Tally::new();
        let mut b = Tally::new();
        let mut all = Tally::new();
        for i in 0..500 {
            let v = (i as f32) * 0.05;
            let o = i % 7 == 0;
            all.add(v, o);
            if i % 2 == 0 {
                a.add(v, o)
            } else {
                b.add(v, o)
            }
        }
        assert_eq!(a.merge(b).summary(), all.summary());
    }

    #[test]
    fn empty_tally_summarises_to_zero() {
        let s = Tally::new().summary();
        assert_eq!(s.pixels, 0);
        assert_eq!(s.p95, 0.0);
    }
}
