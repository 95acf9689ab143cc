//! Palette files as SVG artwork: `inkfit::swatch::Palette::parse`.
#![no_main]

use inkfit::swatch::Format;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    inkfit_fuzz::palette(data, Format::Svg);
});
