//! Palette files as OGC map styles (SLD 1.0, SE 1.1): `inkfit::swatch::Palette::parse`.
#![no_main]

use inkfit::swatch::Format;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    inkfit_fuzz::palette(data, Format::Sld);
});
