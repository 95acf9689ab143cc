//! SVG artwork rendered to find which colours touch (`check --render`):
//! `inkfit::swatch::svg_render::find_touching` on what
//! `Palette::parse` accepts. Properties: the touching pairs are pairs of
//! entries, and shares lie in 0..1 and add up to at most 1.
#![no_main]

use inkfit::swatch::{svg_render::find_touching, Format, Palette};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else { return };
    let Ok(mut p) = Palette::parse("fuzz.svg", text, Format::Svg) else { return };
    match find_touching("fuzz.svg", text, &mut p, 0.0005) {
        Ok(()) => {
            let adj = p.adjacency.as_ref().expect("property: a rendered palette has an adjacency");
            assert!(adj.pairs().iter().all(|&(a, b)| a < b && b < p.entries.len()), "property: pairs of entries");
            let shares: Vec<f64> = p.entries.iter().filter_map(|e| e.share).collect();
            assert!(shares.iter().all(|s| (0.0..=1.0).contains(s)), "property: shares in 0..1");
            assert!(shares.iter().sum::<f64>() <= 1.0 + 1e-9, "property: shares add up to at most 1");
        }
        Err(e) => {
            let _ = e.to_string();
        }
    }
});
