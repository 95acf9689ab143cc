//! Palette survival: colour-vision deficiency simulation against the
//! published matrices and a reference library, separation, order, repair
//! invariants, and the `check` / `repair` command lines.

mod common;
use common::*;

use std::path::Path;

use inkfit::color::cvd::{matrix, Deficiency, Simulator};
use inkfit::color::delta::delta_e00;
use inkfit::color::spaces::{css_rgb_to_lab_d50, CssRgbSpace};
use inkfit::gamut::Gamut;
use inkfit::icc::transform::PressMapping;
use inkfit::icc::{IccProfile, RenderingIntent};
use inkfit::swatch::order::Scheme;
use inkfit::swatch::repair::{repair, RepairOptions};
use inkfit::swatch::survival::SurvivalOptions;
use inkfit::swatch::{Format, Palette};

fn srgb_lab(r: f64, g: f64, b: f64) -> inkfit::color::LabD50 {
    css_rgb_to_lab_d50(CssRgbSpace::Srgb, [r, g, b])
}

#[test]
fn machado_matrices_at_full_severity_match_the_papers_table() {
    // Machado, Oliveira & Fernandes (2009), IEEE TVCG 15(6), Table 1,
    // severity 1.0 rows for protanopia, deuteranopia and tritanopia,
    // copied here independently of src/color/cvd.rs.
    let paper: [(Deficiency, [[f64; 3]; 3]); 3] = [
        (
            Deficiency::Protan,
            [
                [0.152286, 1.052583, -0.204868],
                [0.114503, 0.786281, 0.099216],
                [-0.003882, -0.048116, 1.051998],
            ],
        ),
        (
            Deficiency::Deutan,
            [
                [0.367322, 0.860646, -0.227968],
                [0.280085, 0.672501, 0.047413],
                [-0.011820, 0.042940, 0.968881],
            ],
        ),
        (
            Deficiency::Tritan,
            [
                [1.255528, -0.076749, -0.178779],
                [-0.078411, 0.930809, 0.147602],
                [0.004733, 0.691367, 0.303900],
            ],
        ),
    ];
    for (d, want) in paper {
        let got = matrix(d, 1.0).unwrap();
        for r in 0..3 {
            for c in 0..3 {
                assert!((got[r][c] - want[r][c]).abs() < 1e-9, "{d} [{r}][{c}]");
            }
        }
    }
}

/// IEC 61966-2-1 sRGB encoding, with the linear segment continued below 0
/// as the reference library does for negative values.
fn encode_piecewise(v: f64) -> f64 {
    if v <= 0.0031308 {
        12.92 * v
    } else {
        1.055 * v.powf(1.0 / 2.4) - 0.055
    }
}

fn decode(v: f64) -> f64 {
    if v <= 0.04045 {
        v / 12.92
    } else {
        ((v + 0.055) / 1.055).powf(2.4)
    }
}

#[test]
fn simulation_matches_the_reference_library_within_one_level() {
    // tests/data/cvd_colorspacious.csv: outputs of colorspacious 1.1.2
    // (a general-purpose Python colour library) for severities 1.0 and 0.5.
    let text = include_str!("data/cvd_colorspacious.csv");
    let mut n = 0;
    for line in text.lines().filter(|l| !l.starts_with('#')).skip(1) {
        let f: Vec<&str> = line.split(',').collect();
        let d = Deficiency::from_key(f[0]).unwrap();
        let v: Vec<f64> = f[1..].iter().map(|s| s.parse().unwrap()).collect();
        let sim = Simulator::new(d, v[0]).unwrap();
        let out = sim.linear_srgb([decode(v[1]), decode(v[2]), decode(v[3])]);
        for k in 0..3 {
            let ours = encode_piecewise(out[k]);
            assert!(
                (ours - v[4 + k]).abs() <= 1.0 / 255.0,
                "{line}: channel {k} {ours} vs {}",
                v[4 + k]
            );
        }
        n += 1;
    }
    assert_eq!(n, 30);
}

#[test]
fn red_green_pair_collapses_under_deutan_but_blue_yellow_does_not() {
    // A red and a green of similar lightness (values chosen here): far
    // apart for normal vision, close for a deuteranope (the confusion axis
    // of red–green deficiencies, common practice); a blue/yellow pair lies
    // across that axis and stays apart.
    let red = srgb_lab(0.80, 0.25, 0.20);
    let green = srgb_lab(0.35, 0.55, 0.20);
    let blue = srgb_lab(0.20, 0.35, 0.85);
    let yellow = srgb_lab(0.90, 0.85, 0.25);
    let deutan = Simulator::new(Deficiency::Deutan, 1.0).unwrap();
    let normal_rg = delta_e00(red, green);
    let deutan_rg = delta_e00(deutan.lab(red), deutan.lab(green));
    assert!(normal_rg > 30.0, "normal {normal_rg}");
    assert!(deutan_rg < 10.0, "deutan {deutan_rg}");
    let deutan_by = delta_e00(deutan.lab(blue), deutan.lab(yellow));
    assert!(deutan_by > 30.0, "blue/yellow under deutan {deutan_by}");
}

fn profiles() -> (IccProfile, IccProfile, Gamut) {
    let screen = IccProfile::load("srgb").unwrap().require_screen().unwrap();
    let press = IccProfile::load("offset-coated").unwrap().require_press().unwrap();
    let gamut = Gamut::of_profile(&press, Default::default()).unwrap();
    (screen, press, gamut)
}

fn options(scheme: Scheme) -> RepairOptions {
    RepairOptions {
        survival: SurvivalOptions {
            scheme,
            ..SurvivalOptions::default()
        },
        mapping: PressMapping {
            intent: RenderingIntent::Relative,
            bpc: true,
            paper_white: false,
        },
        iterations: 40,
    }
}

#[test]
fn repair_invariants_hold_on_the_demo_palettes() {
    let (screen, press, gamut) = profiles();
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("fixtures/demo");
    for (file, scheme) in [("soils.csv", Scheme::Qualitative), ("rainfall.txt", Scheme::Sequential)] {
        let palette = Palette::read(&root.join(file)).unwrap();
        let opts = options(scheme);
        let (r, repaired, after) = repair(&palette, &screen, &press, &gamut, &opts).unwrap();
        assert!(!r.before.passes, "{file}: the demo is meant to fail before");
        assert!(!r.unchanged);
        // Every repaired colour passes the gamut inside test.
        for e in &repaired.entries {
            let lab = after.entries.iter().find(|a| a.name == e.name).unwrap().screen_lab;
            let (inside, _) = gamut.judge(inkfit::color::LabD50::from_array(lab));
            assert!(inside, "{file}: {} outside", e.name);
        }
        // Repair must help: the closest printed pair moves apart and fewer
        // checks fail (a repair that changes nothing would fail here).
        println!(
            "{file}: closest printed pair {} → {}, problems {} → {}",
            r.before.separation.min_print,
            r.after.separation.min_print,
            r.before.problems.len(),
            r.after.problems.len()
        );
        assert!(
            r.after.separation.min_print > r.before.separation.min_print,
            "{file}: separation did not improve"
        );
        assert!(
            r.after.problems.len() < r.before.problems.len(),
            "{file}: no fewer failing checks"
        );
        // Every entry of the repaired palette prints inside the gamut by the
        // check's own test as well.
        assert!(after.entries.iter().all(|e| e.in_gamut), "{file}");
        // The floor holds, or the report says what does not.
        let floor_ok = r.after.separation.min_print >= opts.survival.min_separation;
        assert!(floor_ok || !r.unmet.is_empty(), "{file}");
        if let Some(o) = &r.after.order {
            assert!(o.holds() || !r.unmet.is_empty(), "{file}");
        }
        assert_eq!(
            r.unmet.is_empty(),
            r.after.passes && after.entries.iter().all(|e| e.in_gamut)
        );
        // Untouched entries keep their text; moved ones are reported with ΔE00.
        for e in &r.entries {
            assert_eq!(e.changed, e.moved > 0.0 || e.original != e.repaired);
        }
    }
}

#[test]
fn an_already_printable_palette_comes_back_unchanged() {
    let (screen, press, gamut) = profiles();
    // Muted colours well inside the press gamut and far apart (chosen here).
    let text = "#d8c8a0 sand\n#7a9a6a sage\n#4a5a8a slate\n#a05a4a brick\n";
    let palette = Palette::parse("muted.txt", text, Format::Text).unwrap();
    let (r, repaired, _) = repair(&palette, &screen, &press, &gamut, &options(Scheme::Qualitative)).unwrap();
    assert!(r.before.passes, "{:?}", r.before.problems);
    assert!(r.unchanged && r.all_met());
    assert_eq!(repaired, palette);
    assert!(r.entries.iter().all(|e| !e.changed && e.moved == 0.0));
}

#[test]
fn check_json_has_separation_order_and_cvd_keys() {
    let o = bin()
        .args([
            "check",
            &demo("rainfall.txt"),
            "--scheme",
            "sequential",
            "--cvd",
            "deutan,tritan",
            "--json",
        ])
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(0), "{}", String::from_utf8_lossy(&o.stderr));
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    let sep = &v["separation"];
    for k in ["min_screen", "min_print", "pairs"] {
        assert!(sep.get(k).is_some(), "separation.{k}");
    }
    let pairs = sep["pairs"].as_array().unwrap();
    assert_eq!(pairs.len(), 8 * 7 / 2, "every pair for a small palette");
    for k in ["a", "b", "screen", "print"] {
        assert!(pairs[0].get(k).is_some(), "pair key {k}");
    }
    let order = &v["order"];
    for k in ["monotonic_screen", "monotonic_print", "steps"] {
        assert!(order.get(k).is_some(), "order.{k}");
    }
    assert_eq!(order["steps"].as_array().unwrap().len(), 7);
    let cvd = &v["cvd"];
    assert!(cvd.get("protan").is_none());
    for d in ["deutan", "tritan"] {
        assert_eq!(cvd[d]["simulated_lab"].as_array().unwrap().len(), 8);
        assert!(cvd[d].get("min_print").is_some() && cvd[d].get("flagged").is_some());
    }
    // The demo's darkest steps merge in print: the closest pair is 7–8.
    assert_eq!(sep["min_print_pair"], serde_json::json!([7, 8]));
    let strict = bin()
        .args([
            "check",
            &demo("rainfall.txt"),
            "--scheme",
            "sequential",
            "--strict",
            "--tolerance",
            "50",
        ])
        .output()
        .unwrap();
    assert_eq!(strict.status.code(), Some(1), "separation failure under --strict");
}

#[test]
fn bad_survival_options_are_one_line_errors() {
    for args in [["--cvd-severity", "1.5"], ["--min-separation=-1", "--min-step=0"]] {
        let o = bin().arg("check").arg(demo("soils.csv")).args(args).output().unwrap();
        let err = String::from_utf8_lossy(&o.stderr);
        assert_eq!(o.status.code(), Some(2), "{err}");
        assert_eq!(err.trim_end().lines().count(), 1, "{err}");
        assert!(!err.contains("panicked"));
    }
}

#[test]
fn repair_writes_the_input_format_and_it_reads_back() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("soils-print.csv");
    let o = bin()
        .args(["repair", &demo("soils.csv"), "--out"])
        .arg(&out)
        .output()
        .unwrap();
    let stdout = String::from_utf8_lossy(&o.stdout);
    assert_eq!(o.status.code(), Some(0), "{}", String::from_utf8_lossy(&o.stderr));
    assert!(stdout.contains("ΔE00 moved"), "{stdout}");
    let back = Palette::read(&out).unwrap();
    assert_eq!(back.entries.len(), 8);
    let text = std::fs::read_to_string(&out).unwrap();
    // The input's header, with the press CMYK column added.
    let header = std::fs::read_to_string(demo("soils.csv"))
        .unwrap()
        .lines()
        .next()
        .unwrap()
        .to_string();
    assert!(text.starts_with(&format!("{header},press_cmyk\n")), "{text}");
    assert!(text.lines().skip(1).all(|l| l.contains("device-cmyk(")), "{text}");
    // The repaired file passes the check it was repaired for.
    let c = bin()
        .arg("check")
        .arg(&out)
        .args(["--strict", "--tolerance", "50"])
        .output()
        .unwrap();
    assert_eq!(c.status.code(), Some(0), "{}", String::from_utf8_lossy(&c.stdout));
}
