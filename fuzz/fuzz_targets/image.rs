//! Image files for soft proofs: `inkfit::raster::probe_within` and
//! `read_within`, under a 4-megapixel limit so that every image the limit
//! admits decodes well inside the target's 256 MiB allocation limit: an
//! allocation beyond it is a bound that failed. They take a path, so each
//! input is written to a scratch file in memory first. An image that decodes must hold exactly the samples its info
//! declares, since the proof code indexes the buffers by pixel. An image
//! that decodes is also read as a map (`swatch::map_raster::read_map`):
//! its class shares and the rest add up to 1, and its touching pairs are
//! pairs of its entries.
#![no_main]

use inkfit::raster::{probe_within, read_within, DecodeLimits};
use inkfit::swatch::map_raster::{read_map, MapOptions};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let path = inkfit_fuzz::scratch_file(data);
    let limits = DecodeLimits { max_pixels: 4_000_000 };
    let probed = probe_within(path, &limits);
    if let Err(e) = &probed {
        let _ = e.to_string();
    }
    match read_within(path, &limits) {
        Ok(r) => {
            let info = &r.info;
            assert!(
                matches!(info.channels, 1 | 3 | 4) && matches!(info.bits, 8 | 16),
                "property: layout {info:?}"
            );
            let samples = info.pixels() * info.channels * info.bytes_per_sample();
            assert_eq!(r.color.len(), samples, "property: colour buffer size for {info:?}");
            if let Some(a) = &r.alpha {
                assert!(info.has_alpha, "property: alpha plane only when declared");
                assert_eq!(a.len(), info.pixels() * info.bytes_per_sample(), "property: alpha size");
            } else {
                assert!(!info.has_alpha, "property: declared alpha is present");
            }
            // probe reports what read decodes.
            let p = probed.expect("property: an image that reads also probes");
            assert_eq!(&p, info, "property: probe and read agree");
            // The same image read as a map: classes, shares and borders.
            let opts = MapOptions {
                min_class_share: 0.0005,
                limits,
            };
            match read_map(path, &opts) {
                Ok(p) => {
                    let held: f64 = p.entries.iter().filter_map(|e| e.share).sum();
                    let rest = p.unclassified_share.expect("property: a map has an unclassified share");
                    assert!((held + rest - 1.0).abs() < 1e-9, "property: shares add up to 1");
                    let adj = p.adjacency.expect("property: a map has an adjacency");
                    assert!(adj.pairs().iter().all(|&(a, b)| a < b && b < p.entries.len()), "property: pairs of entries");
                }
                Err(e) => {
                    let _ = e.to_string();
                }
            }
        }
        Err(e) => {
            let _ = e.to_string();
        }
    }
});
