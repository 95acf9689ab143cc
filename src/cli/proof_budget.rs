//! The working memory of `inkfit proof`: what proofing one image costs, and
//! the budget that lets workers start an image only while the images in
//! progress fit in [`WORKING_BUDGET`].

use std::sync::{Condvar, Mutex};

use crate::raster::{FileKind, RasterInfo};

/// Estimated working memory of the images proofed at once: 1 GiB. An image
/// whose estimate alone is larger runs by itself.
pub const WORKING_BUDGET: u64 = 1 << 30;

/// Estimated peak bytes of proofing one image, stage by stage: decoding
/// (with what the decoder holds besides: the image crate's TIFF buffer, the
/// JPEG file and, for progressive JPEG, 2 bytes per sample of DCT
/// coefficients), splitting alpha off, grey → RGB, the proof (written over
/// the samples unless proof pixels are larger) and the map, encoding the map
/// and then the proof (alpha joined back), each encoded file counted at its
/// raw size. `proof_one` drops each buffer once its part is done.
pub fn working_bytes(info: &RasterInfo, file_len: u64, map: bool) -> u64 {
    let px = info.pixels() as u64;
    let bps = info.bytes_per_sample() as u64;
    let ch = info.channels as u64;
    let a = u64::from(info.has_alpha);
    let decoded = (ch + a) * bps;
    let (extra, file) = match info.kind {
        FileKind::Tiff if info.channels != 4 => (decoded, 0),
        FileKind::Jpeg => (2 * ch, file_len),
        _ => (0, 0),
    };
    let m = if map { 3 } else { 0 };
    let decode = decoded + extra + a * bps;
    let grey = info.channels == 1 && info.icc.is_none();
    let expand = if grey { ch * bps + 3 * bps + a * bps } else { 0 };
    let samples = if grey { 3 * bps } else { ch * bps };
    let apart = if 3 * bps > samples { 3 * bps } else { 0 };
    let run = samples + apart + a * bps + m;
    let proof = 3 * bps;
    let map_encode = proof + a * bps + 2 * m;
    let proof_encode = proof + a * bps + a * 4 * bps + (3 + a) * bps;
    let per_px = decode.max(expand).max(run).max(map_encode).max(proof_encode);
    px.saturating_mul(per_px).saturating_add(file)
}

/// Working memory handed out to the images in progress.
pub(super) struct Budget {
    limit: u64,
    /// Bytes and images in progress.
    used: Mutex<(u64, usize)>,
    freed: Condvar,
}

pub(super) struct Held<'a> {
    budget: &'a Budget,
    bytes: u64,
}

impl Budget {
    pub(super) fn new(limit: u64) -> Self {
        Self {
            limit,
            used: Mutex::new((0, 0)),
            freed: Condvar::new(),
        }
    }

    /// Waits until `bytes` fit beside the images in progress, or none is.
    pub(super) fn take(&self, bytes: u64) -> Held<'_> {
        let mut g = self.used.lock().unwrap_or_else(|e| e.into_inner());
        while g.1 > 0 && g.0.saturating_add(bytes) > self.limit {
            g = self.freed.wait(g).unwrap_or_else(|e| e.into_inner());
        }
        g.0 += bytes;
        g.1 += 1;
        Held { budget: self, bytes }
    }
}

impl Drop for Held<'_> {
    fn drop(&mut self) {
        let mut g = self.budget.used.lock().unwrap_or_else(|e| e.into_inner());
        g.0 -= self.bytes;
        g.1 -= 1;
        self.budget.freed.notify_all();
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::sync::mpsc;
    use std::time::Duration;

    #[test]
    fn budget_holds_back_what_does_not_fit_and_lets_a_large_image_run_alone() {
        let b = Budget::new(10);
        let first = b.take(6);
        let (tx, rx) = mpsc::channel();
        std::thread::scope(|s| {
            s.spawn(|| {
                let _second = b.take(6);
                tx.send(()).unwrap();
            });
            // 6 + 6 > 10: the second waits while the first is held.
            assert!(rx.recv_timeout(Duration::from_millis(200)).is_err());
            drop(first);
            rx.recv_timeout(Duration::from_secs(10))
                .expect("starts once the first is done");
        });
        // Larger than the whole budget, with nothing else in progress: runs.
        let big = b.take(25);
        assert_eq!(*b.used.lock().unwrap(), (25, 1));
        drop(big);
        assert_eq!(*b.used.lock().unwrap(), (0, 0));
        // Small ones share it.
        let (x, y) = (b.take(4), b.take(5));
        assert_eq!(*b.used.lock().unwrap(), (9, 2));
        drop((x, y));
    }

    #[test]
    fn working_estimate_counts_the_layouts_that_cost_more() {
        let info = |channels, bits, has_alpha, kind| RasterInfo {
            kind,
            width: 1000,
            height: 1000,
            channels,
            bits,
            has_alpha,
            icc: None,
        };
        let rgb8 = working_bytes(&info(3, 8, false, FileKind::Png), 0, false);
        // 8-bit RGB: the proof over the samples (3) plus its encoded file (3).
        assert_eq!(rgb8, 6_000_000);
        // A map adds its pixels, and its file while the proof is still held.
        assert_eq!(working_bytes(&info(3, 8, false, FileKind::Png), 0, true), 9_000_000);
        // 16 bits double it; alpha and the image crate's TIFF buffer add more.
        assert_eq!(working_bytes(&info(3, 16, false, FileKind::Png), 0, false), 12_000_000);
        assert!(working_bytes(&info(3, 8, true, FileKind::Png), 0, false) > rgb8);
        // A JPEG's file is held whole while it decodes.
        assert!(working_bytes(&info(3, 8, false, FileKind::Jpeg), 50_000_000, false) > 50_000_000);
    }
}
