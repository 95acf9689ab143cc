//! Measurement files in CGATS.17: `inkfit::press::cgats::Measurements::parse`.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    inkfit_fuzz::cgats(data);
});
