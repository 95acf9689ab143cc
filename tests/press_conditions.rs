//! The built-in press conditions as a family: each committed profile is
//! exactly what the build makes, keeps its ink limit on every stored node of
//! every intent, leaves paper white unprinted, and the gamut volumes come
//! out in the order paper and process dictate.

use inkfit::gamut::{Gamut, GamutOptions};
use inkfit::icc::builtin::press_icc;
use inkfit::icc::header::{read_clut, Header};
use inkfit::icc::IccProfile;
use inkfit::press::{build_icc, builtin_press, BUILTIN_PRESS_NAMES};
use lcms2::{CIExyY, GlobalContext, Intent, PixelFormat, Profile, Transform};

/// The total area coverage each condition is defined with (its spec; the
/// values are common practice for the process: coated sheet-fed 330 %,
/// uncoated 300 %, coldset newsprint 240 %).
fn tac(name: &str) -> f64 {
    builtin_press(name).expect("built-in").spec().tac_percent
}

#[test]
fn every_committed_press_profile_is_exactly_what_the_build_makes() {
    // One rule for every committed profile: its exact bytes. After a
    // deliberate change, regenerate with
    // `cargo run --release -- build-press NAME --out profiles/NAME.icc`.
    for name in BUILTIN_PRESS_NAMES {
        let rebuilt = build_icc(&builtin_press(name).expect("built-in")).expect("build");
        let committed = press_icc(name).expect("committed bytes");
        let first = rebuilt.iter().zip(committed).position(|(a, b)| a != b);
        assert!(
            rebuilt.len() == committed.len() && first.is_none(),
            "profiles/{name}.icc is not what the build makes (sizes {} and {}, first difference at byte {first:?}); \
             regenerate it with `cargo run --release -- build-press {name} --out profiles/{name}.icc`",
            rebuilt.len(),
            committed.len()
        );
    }
}

#[test]
fn every_b2a_node_of_every_condition_keeps_its_ink_limit() {
    for name in BUILTIN_PRESS_NAMES {
        let bytes = press_icc(name).unwrap();
        let header = Header::parse(bytes).unwrap();
        let limit = tac(name);
        for sig in [b"B2A0", b"B2A1", b"B2A2"] {
            let clut = read_clut(bytes, header.tag(sig).unwrap()).unwrap();
            let max = clut
                .values
                .chunks_exact(4)
                .map(|n| n.iter().map(|v| *v as f64).sum::<f64>() * 100.0 / 65535.0)
                .fold(0.0, f64::max);
            println!("{name} {}: max ink {max:.3} %", String::from_utf8_lossy(sig));
            assert!(max <= limit, "{name} {sig:?}: {max} > {limit}");
            assert!(
                max > limit - 30.0,
                "{name}: the darkest nodes should use the limit, max {max}"
            );
        }
    }
}

#[test]
fn paper_white_is_left_unprinted_on_every_condition() {
    // A press profile leaves the paper white without ink (common practice):
    // CIELAB 100/0/0 (media-relative white) → CMYK 0/0/0/0 within half a
    // percent in every intent. Little CMS evaluates the committed tables.
    let white = CIExyY {
        x: 0.9642 / (0.9642 + 1.0 + 0.8249),
        y: 1.0 / (0.9642 + 1.0 + 0.8249),
        Y: 1.0,
    };
    let lab = Profile::new_lab4_context(GlobalContext::new(), &white).unwrap();
    for name in BUILTIN_PRESS_NAMES {
        let press = Profile::new_icc(press_icc(name).unwrap()).unwrap();
        for intent in [Intent::Perceptual, Intent::RelativeColorimetric, Intent::Saturation] {
            let t: Transform<[f64; 3], [f64; 4]> =
                Transform::new(&lab, PixelFormat::Lab_DBL, &press, PixelFormat::CMYK_DBL, intent).unwrap();
            let mut out = [[0.0; 4]];
            t.transform_pixels(&[[100.0, 0.0, 0.0]], &mut out);
            assert!(out[0].iter().all(|v| v.abs() < 0.5), "{name} {intent:?}: {:?}", out[0]);
        }
    }
}

#[test]
fn gamut_volumes_follow_paper_and_process() {
    // Coated paper holds ink on its surface and prints the largest gamut,
    // uncoated paper absorbs and scatters more, coldset newsprint (grey
    // paper, low density, 240 % ink) far less (common practice: the order
    // of the ISO 12647-2 and -3 print conditions). "Far" is taken as less
    // than half of coated.
    let volume = |name: &str| {
        let p = IccProfile::load(name).unwrap();
        Gamut::of_profile(&p, GamutOptions::default()).unwrap().volume
    };
    let (coated, uncoated, news) = (
        volume("offset-coated"),
        volume("offset-uncoated"),
        volume("newsprint-coldset"),
    );
    println!("volumes: coated {coated:.0}, uncoated {uncoated:.0}, newsprint {news:.0}");
    assert!(coated > uncoated && uncoated > news, "{coated} {uncoated} {news}");
    assert!(news < 0.5 * coated, "{news} vs {coated}");
}
