//! Loading an ICC profile as inkfit does for `--screen`, `--press` and
//! `inkfit inspect`: the strict header check and lcms2's open
//! (`IccProfile::from_bytes`), the intent-table report and the inspection
//! (which for a CMYK output profile samples its Lab → CMYK table), then the
//! role checks. The gamut code is not called from here.
#![no_main]

use std::path::PathBuf;

use inkfit::icc::{inspect, Direction, IccProfile, Origin, RenderingIntent};
use libfuzzer_sys::fuzz_target;

fn open(data: &[u8]) -> Option<IccProfile> {
    match IccProfile::from_bytes("fuzz.icc", Origin::File(PathBuf::from("fuzz.icc")), data.to_vec()) {
        Ok(p) => Some(p),
        Err(e) => {
            let _ = e.to_string();
            None
        }
    }
}

fuzz_target!(|data: &[u8]| {
    let Some(p) = open(data) else { return };
    let _ = p.kind_phrase();
    for intent in RenderingIntent::ALL {
        for dir in [Direction::ToPcs, Direction::FromPcs] {
            let _ = p.table_use(intent, dir);
            let _ = p.intent_note(intent, dir);
        }
    }
    let report = inspect::inspect(&p);
    if let Some(ink) = report.max_ink {
        assert!(ink.is_finite(), "property: measured total ink is finite: {ink}");
    }
    let _ = format!("{report:?}");
    let press = p.header.color_space == inkfit::icc::header::SPACE_CMYK;
    let role = if press { p.require_press() } else { p.require_screen() };
    if let Err(e) = role {
        let _ = e.to_string();
    }
});
