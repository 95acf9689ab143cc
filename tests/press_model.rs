//! Checks of the built-in `offset-coated` press profile as Little CMS reads
//! it: aims, tone value increase, ink limit, black generation, round trip,
//! reproducibility of the committed bytes and the tag structure.

use deltae::{DEMethod, DeltaE, LabValue};
use inkfit::icc::builtin::OFFSET_COATED_ICC;
use inkfit::icc::header::{read_clut, ClutTable, Header, TagEntry};
use inkfit::press::icc_writer::{ab_curve_inverse, B2A_GRID};
use inkfit::press::{builtin_press, BUILTIN_PRESS_NAMES};
use lcms2::{CIExyY, Flags, GlobalContext, Intent, PixelFormat, Profile, Tag, TagSignature, Transform};

/// The tag table of a profile, read by the library's strict header reader.
fn tag_table(bytes: &[u8]) -> Vec<TagEntry> {
    Header::parse(bytes).expect("header and tag table").tags
}

/// The CLUT of tag `sig` of the committed profile.
fn committed_clut(sig: &[u8; 4]) -> ClutTable {
    let header = Header::parse(OFFSET_COATED_ICC).expect("header");
    read_clut(OFFSET_COATED_ICC, header.tag(sig).expect("tag present")).expect("a CLUT")
}

/// ICC PCS illuminant D50 (ICC.1:2010, 7.2.16) as chromaticity, Y = 1.
fn d50_xyy() -> CIExyY {
    let (x, y, z) = (0.9642, 1.0, 0.8249);
    CIExyY {
        x: x / (x + y + z),
        y: y / (x + y + z),
        Y: 1.0,
    }
}

fn profile() -> Profile {
    Profile::new_icc(OFFSET_COATED_ICC).expect("committed profile loads")
}

fn lab4() -> Profile {
    Profile::new_lab4_context(GlobalContext::new(), &d50_xyy()).expect("Lab v4 profile")
}

/// CMYK (percent) → CIELAB through the profile's A2B with `intent`.
fn to_lab(cmyk: &[[f64; 4]], intent: Intent) -> Vec<[f64; 3]> {
    let t: Transform<[f64; 4], [f64; 3]> =
        Transform::new(&profile(), PixelFormat::CMYK_DBL, &lab4(), PixelFormat::Lab_DBL, intent).expect("transform");
    let mut out = vec![[0.0; 3]; cmyk.len()];
    t.transform_pixels(cmyk, &mut out);
    out
}

/// CIELAB → CMYK (percent) through the profile's B2A with `intent`.
fn to_cmyk(lab: &[[f64; 3]], intent: Intent) -> Vec<[f64; 4]> {
    let t: Transform<[f64; 3], [f64; 4]> =
        Transform::new(&lab4(), PixelFormat::Lab_DBL, &profile(), PixelFormat::CMYK_DBL, intent).expect("transform");
    let mut out = vec![[0.0; 4]; lab.len()];
    t.transform_pixels(lab, &mut out);
    out
}

/// CIEDE2000 by the independent `deltae` crate (CIE 142-2001).
fn de00(a: [f64; 3], b: [f64; 3]) -> f64 {
    let v = |l: [f64; 3]| LabValue {
        l: l[0] as f32,
        a: l[1] as f32,
        b: l[2] as f32,
    };
    *DeltaE::new(v(a), v(b), DEMethod::DE2000).value() as f64
}

#[test]
fn self_consistency_the_profile_prints_the_aims_it_was_built_from() {
    // Self-consistency, not an outside check: the aims are the model's own
    // inputs; this shows the chain model → ICC tables → lcms2 keeps them.
    // ISO 12647-2:2004/Amd 1:2007, paper types 1/2 (coated), white backing,
    // D50/2°, M0 — values from memory (the C+M+Y value least certain).
    let aims: [(&str, [f64; 4], [f64; 3]); 9] = [
        ("paper", [0.0, 0.0, 0.0, 0.0], [95.0, 0.0, -2.0]),
        ("C", [100.0, 0.0, 0.0, 0.0], [55.0, -37.0, -50.0]),
        ("M", [0.0, 100.0, 0.0, 0.0], [48.0, 74.0, -3.0]),
        ("Y", [0.0, 0.0, 100.0, 0.0], [89.0, -5.0, 93.0]),
        ("K", [0.0, 0.0, 0.0, 100.0], [16.0, 0.0, 0.0]),
        ("C+M", [100.0, 100.0, 0.0, 0.0], [24.0, 22.0, -46.0]),
        ("C+Y", [100.0, 0.0, 100.0, 0.0], [50.0, -65.0, 27.0]),
        ("M+Y", [0.0, 100.0, 100.0, 0.0], [47.0, 68.0, 48.0]),
        ("C+M+Y", [100.0, 100.0, 100.0, 0.0], [23.0, 0.0, 0.0]),
    ];
    let cmyk: Vec<[f64; 4]> = aims.iter().map(|a| a.1).collect();
    let labs = to_lab(&cmyk, Intent::AbsoluteColorimetric);
    for ((name, _, aim), lab) in aims.iter().zip(labs) {
        let d = de00(*aim, lab);
        println!("aim {name}: profile {lab:.2?}, ΔE00 {d:.3}");
        assert!(d < 1.0, "{name}: ΔE00 {d} (profile {lab:?}, aim {aim:?})");
    }
}

#[test]
fn self_consistency_tone_value_increase_at_half_coverage_is_the_designed_one() {
    // Self-consistency: the curves are calibrated to the designed TVI; this
    // shows the calibration and the written tables hold it.
    // Murray–Davies tone value (ISO 12647-1 / ISO 13655) in the channel each
    // ink absorbs most (C → X, M → Y, Y → Z, K → Y; the colorimetric stand-in
    // for status densities, common practice); designed TVI at 50 %: 14 %
    // for C, M, Y and 17 % for K (ISO 12647-2 style, from memory).
    let xyz = Profile::new_xyz();
    let t: Transform<[f64; 4], [f64; 3]> = Transform::new(
        &profile(),
        PixelFormat::CMYK_DBL,
        &xyz,
        PixelFormat::XYZ_DBL,
        Intent::AbsoluteColorimetric,
    )
    .expect("transform");
    let channel = [0usize, 1, 2, 1];
    let designed = [14.0, 14.0, 14.0, 17.0];
    for ink in 0..4 {
        let mut half = [0.0; 4];
        half[ink] = 50.0;
        let mut solid = [0.0; 4];
        solid[ink] = 100.0;
        let src = [[0.0; 4], half, solid];
        let mut out = [[0.0; 3]; 3];
        t.transform_pixels(&src, &mut out);
        let ch = channel[ink];
        let (p, h, s) = (out[0][ch], out[1][ch], out[2][ch]);
        let tvi = 100.0 * (p - h) / (p - s) - 50.0;
        println!("ink {ink}: TVI at 50 % = {tvi:.2} %");
        assert!(
            (tvi - designed[ink]).abs() < 1.0,
            "ink {ink}: TVI {tvi} vs {}",
            designed[ink]
        );
    }
}

#[test]
fn every_b2a_node_respects_the_ink_limit() {
    // TAC 330 % (common practice for coated sheet-fed offset), checked on
    // every stored node of each intent's B2A table as written in the file.
    for sig in [b"B2A0", b"B2A1", b"B2A2"] {
        let clut = committed_clut(sig);
        assert_eq!(clut.grid, B2A_GRID.map(|g| g as u8).to_vec());
        assert_eq!(clut.outputs, 4);
        let max = clut
            .values
            .chunks_exact(4)
            .map(|n| n.iter().map(|v| *v as f64).sum::<f64>() * 100.0 / 65535.0)
            .fold(0.0, f64::max);
        println!("max {} ink: {max:.3} %", String::from_utf8_lossy(sig));
        assert!(max <= 330.0, "max ink {max}");
        assert!(max > 300.0, "the darkest nodes should use the ink limit, max {max}");
    }

    // The decoded table is what Little CMS uses: evaluate some grid nodes
    // through the profile (16-bit, no optimisation, so no resampling). The
    // PCS code of a node goes through the input curves first, and the 16-bit
    // path is not bit-exact at the nodes (a few codes); a misread layout
    // would be off by thousands.
    let clut = committed_clut(b"B2A1");
    let t: Transform<[u16; 3], [u16; 4]> = Transform::new_flags(
        &lab4(),
        PixelFormat::Lab_16,
        &profile(),
        PixelFormat::CMYK_16,
        Intent::RelativeColorimetric,
        Flags::NO_OPTIMIZE,
    )
    .expect("transform");
    let [nl, na, nb] = B2A_GRID.map(|g| g as usize);
    let l_code = |i: usize| ((i as f64 * 65535.0 / (nl - 1) as f64) + 0.5).floor() as u16;
    let ab_code = |i: usize| {
        let y = i as f64 / (na - 1) as f64;
        (ab_curve_inverse(y) * 65535.0).round() as u16
    };
    for &(l, a, b) in &[
        (0, 0, 0),
        (10, 26, 26),
        (20, 5, 30),
        (32, 51, 0),
        (5, 26, 27),
        (16, 40, 10),
    ] {
        let mut out = [[0u16; 4]];
        t.transform_pixels(&[[l_code(l), ab_code(a), ab_code(b)]], &mut out);
        let idx = ((l * na + a) * nb + b) * 4;
        for (k, (got, stored)) in out[0].iter().zip(&clut.values[idx..idx + 4]).enumerate() {
            let (got, stored) = (*got as i32, *stored as i32);
            assert!(
                (got - stored).abs() <= 40,
                "node {l},{a},{b} ink {k}: {got} vs {stored}"
            );
        }
    }
}

#[test]
fn grey_ramp_black_grows_as_lightness_falls() {
    // Medium GCR (common practice): no black in light greys, black rising
    // monotonically towards the shadows.
    let labs: Vec<[f64; 3]> = (5..=95).rev().map(|l| [l as f64, 0.0, 0.0]).collect();
    let cmyk = to_cmyk(&labs, Intent::RelativeColorimetric);
    let mut last = -1.0;
    for (lab, c) in labs.iter().zip(&cmyk) {
        if (lab[0] as i32) % 10 == 5 {
            println!("grey L* {:.0}: CMYK {:.1?}", lab[0], c);
        }
        assert!(c[3] >= last - 1e-6, "K falls at L* {}: {} after {}", lab[0], c[3], last);
        last = c[3];
    }
    assert!(cmyk[0][3] < 1.0, "no black at L* 95: {:?}", cmyk[0]);
    assert!(cmyk.last().map_or(0.0, |c| c[3]) > 90.0, "near-full black at L* 5");
}

#[test]
fn round_trip_through_both_tables() {
    // CMYK inside the ink limit is printable, so its colour is in gamut:
    // A2B → B2A → A2B must come back to it (CLUT interpolation error only).
    let mut src = Vec::new();
    let steps = [0.0, 20.0, 40.0, 60.0, 80.0, 100.0];
    for c in steps {
        for m in steps {
            for y in steps {
                for k in [0.0, 30.0, 60.0, 90.0] {
                    if c + m + y + k <= 300.0 {
                        src.push([c, m, y, k]);
                    }
                }
            }
        }
    }
    let lab1 = to_lab(&src, Intent::RelativeColorimetric);
    let back = to_cmyk(&lab1, Intent::RelativeColorimetric);
    let lab2 = to_lab(&back, Intent::RelativeColorimetric);
    let d: Vec<f64> = lab1.iter().zip(&lab2).map(|(a, b)| de00(*a, *b)).collect();
    let mean = d.iter().sum::<f64>() / d.len() as f64;
    let mut sorted = d.clone();
    sorted.sort_by(f64::total_cmp);
    let p95 = sorted[(0.95 * (sorted.len() - 1) as f64) as usize];
    let max = sorted[sorted.len() - 1];
    println!(
        "round trip over {} samples: mean ΔE00 {mean:.3}, 95th pct {p95:.3}, max {max:.3}",
        d.len()
    );
    assert!(mean < 0.5, "mean {mean}");
    assert!(p95 < 1.5, "95th percentile {p95}");
    assert!(max < 3.0, "max {max}");
}

#[test]
fn profile_structure() {
    let p = profile();
    // ICC.1:2010 7.2: v4 output profile, CMYK data, Lab PCS.
    assert_eq!(&OFFSET_COATED_ICC[36..40], b"acsp");
    assert_eq!(&OFFSET_COATED_ICC[12..24], b"prtrCMYKLab ");
    assert_eq!(OFFSET_COATED_ICC[8], 4);
    // Fixed creation date 2024-01-01 00:00:00 (ICC.1:2010 dateTimeNumber:
    // six big-endian u16, year first).
    assert_eq!(&OFFSET_COATED_ICC[24..36], &[0x07, 0xE8, 0, 1, 0, 1, 0, 0, 0, 0, 0, 0]);
    // Profile ID: MD5 per ICC.1:2010 7.2.18, recomputed by Little CMS.
    let stored = p.profile_id();
    let mut again = profile();
    again.set_default_profile_id();
    assert_eq!(stored, again.profile_id());
    assert!(OFFSET_COATED_ICC[84..100].iter().any(|b| *b != 0));
    // The device → PCS direction is colorimetric for every intent (links);
    // each intent has a PCS → device table of its own.
    let tags = tag_table(OFFSET_COATED_ICC);
    let find = |s: &[u8; 4]| tags.iter().find(|t| &t.sig.0 == s).copied().expect("tag present");
    for (link, target) in [(b"A2B0", b"A2B1"), (b"A2B2", b"A2B1")] {
        assert_eq!(
            (find(link).offset, find(link).size),
            (find(target).offset, find(target).size)
        );
    }
    for (own, other) in [(b"B2A0", b"B2A1"), (b"B2A2", b"B2A1"), (b"B2A0", b"B2A2")] {
        assert_ne!(find(own).offset, find(other).offset);
    }
    for sig in [b"desc", b"cprt", b"wtpt", b"gamt"] {
        find(sig);
    }
    for sig in [
        TagSignature::AToB0Tag,
        TagSignature::BToA0Tag,
        TagSignature::AToB2Tag,
        TagSignature::GamutTag,
    ] {
        assert!(matches!(p.read_tag(sig), Tag::Pipeline(_)), "{sig:?}");
    }
    // mediaWhitePoint = paper XYZ of the aim L* 95, a* 0, b* −2 (CIE 015
    // inverse CIELAB; the tag is s15Fixed16, ±1/65536).
    match p.read_tag(TagSignature::MediaWhitePointTag) {
        Tag::CIEXYZ(w) => {
            let fy = (95.0f64 + 16.0) / 116.0;
            let fz = fy + 2.0 / 200.0;
            let (x, y, z) = (0.9642 * fy.powi(3), fy.powi(3), 0.8249 * fz.powi(3));
            assert!(
                (w.X - x).abs() < 1e-4 && (w.Y - y).abs() < 1e-4 && (w.Z - z).abs() < 1e-4,
                "{w:?}"
            );
        }
        _ => panic!("no media white point"),
    }
    let desc = p
        .info(lcms2::InfoType::Description, lcms2::Locale::none())
        .unwrap_or_default();
    assert!(desc.contains("offset-coated"), "{desc}");
}

#[test]
fn gamut_tag_marks_in_and_out_of_gamut() {
    // A colour printed with ≤ 330 % ink is inside (0); a far-off Lab node
    // (L* 100, a* −128, b* 127) is outside (non-zero), ICC.1:2010 9.2.28.
    let clut = committed_clut(b"gamt");
    assert_eq!(clut.outputs, 1);
    let [_, na, nb] = B2A_GRID.map(|g| g as usize);
    let node = |l: usize, a: usize, b: usize| clut.values[(l * na + a) * nb + b];
    assert_ne!(node(32, 0, 51), 0);
    assert_eq!(node(32, 26, 26), 0, "paper white is printable");
    let inside = clut.values.iter().filter(|v| **v == 0).count();
    println!("gamut tag: {inside} of {} nodes inside", clut.values.len());
    assert!(inside > 500 && inside < clut.values.len() / 2);
}

#[test]
fn builtin_names_resolve() {
    for name in BUILTIN_PRESS_NAMES {
        let c = builtin_press(name).expect("known");
        assert_eq!(c.name(), *name);
        // Common practice: coated sheet-fed 330 %, uncoated 300 %, coldset
        // newsprint 240 %.
        let tac = match *name {
            "offset-coated" => 330.0,
            "offset-uncoated" => 300.0,
            _ => 240.0,
        };
        assert_eq!(c.tac_percent(), tac);
    }
    assert!(builtin_press("no-such-press").is_none());
}
