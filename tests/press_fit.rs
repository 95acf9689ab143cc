//! `build-press --from`: a press profile fitted to measurement data.
//!
//! The data comes from a reference press written here, independently of
//! inkfit's printing model and of a different kind: Yule–Nielsen with a
//! different n in each tristimulus channel, an asymmetric tone value curve,
//! wet-on-wet trapping (an ink takes less well on ink already printed), and
//! black overprints by plain density additivity with a lower floor. Its
//! 16 primaries are invented but plausible coated-offset colours (demo data,
//! not aims of any standard). Patches carry Gaussian measurement noise of
//! 0.2 ΔE*ab mean size. The built profile is then compared with the
//! reference press itself at random ink combinations, through lcms2.

mod common;
use common::*;

use std::fmt::Write as _;
use std::path::Path;

use deltae::{DEMethod, DeltaE, LabValue};
use lcms2::{Intent, PixelFormat, Profile, Transform};

/// ICC PCS white D50 (ICC.1:2010, 6.3.4.3).
const D50: [f64; 3] = [0.9642, 1.0, 0.8249];

/// CIELAB → XYZ (CIE 015:2018, 8.2.1, inverse), white D50.
fn lab_to_xyz(lab: [f64; 3]) -> [f64; 3] {
    let fy = (lab[0] + 16.0) / 116.0;
    let fx = fy + lab[1] / 500.0;
    let fz = fy - lab[2] / 200.0;
    let inv = |f: f64| {
        if f > 6.0 / 29.0 {
            f * f * f
        } else {
            3.0 * (6.0f64 / 29.0).powi(2) * (f - 4.0 / 29.0)
        }
    };
    [D50[0] * inv(fx), D50[1] * inv(fy), D50[2] * inv(fz)]
}

/// XYZ → CIELAB (CIE 015:2018, 8.2.1), relative to `white`.
fn xyz_to_lab(xyz: [f64; 3], white: [f64; 3]) -> [f64; 3] {
    let f = |t: f64| {
        if t > (6.0f64 / 29.0).powi(3) {
            t.cbrt()
        } else {
            t / (3.0 * (6.0f64 / 29.0).powi(2)) + 4.0 / 29.0
        }
    };
    let (fx, fy, fz) = (f(xyz[0] / white[0]), f(xyz[1] / white[1]), f(xyz[2] / white[2]));
    [116.0 * fy - 16.0, 500.0 * (fx - fy), 200.0 * (fy - fz)]
}

fn de00(a: [f64; 3], b: [f64; 3]) -> f64 {
    let lv = |l: [f64; 3]| LabValue::new(l[0] as f32, l[1] as f32, l[2] as f32).unwrap();
    f64::from(*DeltaE::new(lv(a), lv(b), DEMethod::DE2000).value())
}

/// The reference press (see the file's head).
struct ReferencePress {
    /// Absolute XYZ of the 16 primaries, bit 0 = C, 1 = M, 2 = Y, 3 = K.
    primaries: [[f64; 3]; 16],
    /// Yule–Nielsen n per channel X, Y, Z.
    n: [f64; 3],
    /// Tone value gain per ink.
    gain: [f64; 4],
    /// Trapping: how much less an ink takes on each ink printed before it.
    trap: f64,
}

impl ReferencePress {
    fn new() -> Self {
        // Invented coated-offset colours (absolute CIELAB D50).
        let lab = [
            [94.5, 0.5, -2.5],    // paper
            [55.5, -36.0, -49.0], // C
            [48.5, 73.0, -4.0],   // M
            [24.0, 21.0, -45.0],  // C+M
            [88.5, -4.5, 91.0],   // Y
            [49.5, -64.0, 25.0],  // C+Y
            [47.5, 67.0, 46.0],   // M+Y
            [23.5, 1.0, -1.5],    // C+M+Y
        ];
        let mut p = [[0.0; 3]; 16];
        for (j, l) in lab.iter().enumerate() {
            p[j] = lab_to_xyz(*l);
        }
        let paper = p[0];
        let k = lab_to_xyz([17.0, 0.5, 1.0]);
        for j in 0..8 {
            for ch in 0..3 {
                // Density additivity with a floor at 0.4 % of paper.
                let r0 = 0.004 * paper[ch];
                p[8 + j][ch] = if j == 0 {
                    k[ch]
                } else {
                    r0 + (p[j][ch] - r0) * (k[ch] - r0) / (paper[ch] - r0)
                };
            }
        }
        ReferencePress {
            primaries: p,
            n: [1.7, 1.9, 2.15],
            gain: [0.50, 0.55, 0.45, 0.60],
            trap: 0.10,
        }
    }

    fn paper(&self) -> [f64; 3] {
        self.primaries[0]
    }

    /// Absolute XYZ of `cmyk` (fractions 0..1).
    fn xyz(&self, cmyk: [f64; 4]) -> [f64; 3] {
        let mut e = [0.0; 4];
        for i in 0..4 {
            let a = cmyk[i].clamp(0.0, 1.0);
            e[i] = a + self.gain[i] * a * (1.0 - a) * (1.0 + 0.5 * (1.0 - 2.0 * a));
        }
        // Printing order K, C, M, Y: each ink takes less on those before.
        e[1] *= 1.0 - self.trap * e[0];
        e[2] *= (1.0 - self.trap * e[0]) * (1.0 - self.trap * e[1]);
        let mut out = [0.0; 3];
        for ch in 0..3 {
            let mut s = 0.0;
            for (j, prim) in self.primaries.iter().enumerate() {
                let mut w = 1.0;
                for (i, ei) in e.iter().enumerate() {
                    w *= if j & (1 << i) != 0 { *ei } else { 1.0 - ei };
                }
                s += w * prim[ch].powf(1.0 / self.n[ch]);
            }
            out[ch] = s.powf(self.n[ch]);
        }
        out
    }

    fn lab_absolute(&self, cmyk: [f64; 4]) -> [f64; 3] {
        xyz_to_lab(self.xyz(cmyk), D50)
    }

    /// ICC media-relative CIELAB (ICC.1:2010, D.3): XYZ scaled per channel
    /// by D50 / paper.
    fn lab_relative(&self, cmyk: [f64; 4]) -> [f64; 3] {
        xyz_to_lab(self.xyz(cmyk), self.paper())
    }
}

/// A characterisation chart in percent: single-ink ramps, the 16 corners,
/// a grid of C, M, Y by K, and random combinations; about 1,900 patches.
fn chart(rng: &mut Rng) -> Vec<[f64; 4]> {
    let mut v = Vec::new();
    let ramp = [
        3.0, 5.0, 7.0, 10.0, 15.0, 20.0, 25.0, 30.0, 40.0, 50.0, 60.0, 70.0, 80.0, 85.0, 90.0, 95.0,
    ];
    for ink in 0..4 {
        for &a in &ramp {
            let mut c = [0.0; 4];
            c[ink] = a;
            v.push(c);
        }
    }
    let levels = [0.0, 10.0, 20.0, 40.0, 70.0, 100.0];
    for &k in &[0.0, 20.0, 40.0, 60.0, 80.0, 100.0] {
        for &c in &levels {
            for &m in &levels {
                for &y in &levels {
                    v.push([c, m, y, k]);
                }
            }
        }
    }
    while v.len() < 1_900 {
        let c = [0, 1, 2, 3].map(|_| (rng.next() * 100.0).round());
        if c.iter().sum::<f64>() <= 400.0 {
            v.push(c);
        }
    }
    v
}

/// The chart measured on the reference press as CGATS.17 text, with noise
/// of σ = 0.125 per CIELAB axis (0.2 ΔE*ab mean size: 0.125·√(8/π)), the
/// paper measured three times.
fn measurement_file(press: &ReferencePress, rng: &mut Rng) -> String {
    let mut patches = chart(rng);
    patches.push([0.0; 4]);
    patches.push([0.0; 4]);
    let mut rows = String::new();
    for (i, c) in patches.iter().enumerate() {
        let lab = press.lab_absolute(c.map(|v| v / 100.0));
        let noisy = lab.map(|v| v + 0.125 * rng.normal());
        writeln!(
            rows,
            "{}\t{}\t{}\t{}\t{}\t{:.2}\t{:.2}\t{:.2}",
            i + 1,
            c[0],
            c[1],
            c[2],
            c[3],
            noisy[0],
            noisy[1],
            noisy[2]
        )
        .unwrap();
    }
    format!(
        "CGATS.17\r\nORIGINATOR \"inkfit tests\"\r\nDESCRIPTOR \"reference press, Tarrowmere Basin atlas proofing run\"\r\n\
         # measured D50 2 degrees, M0\r\nNUMBER_OF_FIELDS 8\r\nBEGIN_DATA_FORMAT\r\n\
         SAMPLE_ID\tCMYK_C\tCMYK_M\tCMYK_Y\tCMYK_K\tLAB_L\tLAB_A\tLAB_B\r\nEND_DATA_FORMAT\r\n\
         NUMBER_OF_SETS {}\r\nBEGIN_DATA\r\n{}END_DATA\r\n",
        patches.len(),
        rows.replace('\n', "\r\n")
    )
}

/// Runs `build-press --from DATA --out OUT` with `extra` options.
fn build_press(data: &str, out: &str, extra: &[&str]) -> std::process::Output {
    let mut args = vec!["build-press", "--from", data, "--out", out];
    args.extend_from_slice(extra);
    run(&args)
}

/// CMYK (percent) → media-relative CIELAB through the profile's A2B1.
fn profile_lab(path: &Path, cmyk: &[[f64; 4]]) -> Vec<[f64; 3]> {
    let p = Profile::new_file(path).unwrap();
    let lab = Profile::new_lab4_context(lcms2::GlobalContext::new(), &Default::default()).unwrap();
    let t: Transform<[f64; 4], [f64; 3]> = Transform::new(
        &p,
        PixelFormat::CMYK_DBL,
        &lab,
        PixelFormat::Lab_DBL,
        Intent::RelativeColorimetric,
    )
    .unwrap();
    let mut out = vec![[0.0; 3]; cmyk.len()];
    t.transform_pixels(cmyk, &mut out);
    out
}

/// Occupied 2-unit CIELAB voxels of dense samples of the ink domain up to
/// `limit` %, times the voxel volume: one estimator for both gamuts, so
/// that its sampling error largely cancels in their ratio.
fn voxel_volume(labs: &[[f64; 3]]) -> f64 {
    let mut cells = std::collections::HashSet::new();
    for l in labs {
        cells.insert((
            (l[0] / 2.0).floor() as i32,
            (l[1] / 2.0).floor() as i32,
            (l[2] / 2.0).floor() as i32,
        ));
    }
    cells.len() as f64 * 8.0
}

fn ink_domain(steps: usize, limit: f64) -> Vec<[f64; 4]> {
    let mut v = Vec::new();
    let f = |i: usize| 100.0 * i as f64 / steps as f64;
    for c in 0..=steps {
        for m in 0..=steps {
            for y in 0..=steps {
                for k in 0..=steps {
                    let p = [f(c), f(m), f(y), f(k)];
                    if p.iter().sum::<f64>() <= limit + 1e-9 {
                        v.push(p);
                    }
                }
            }
        }
    }
    v
}

#[test]
fn fitted_profile_agrees_with_the_press_it_was_measured_on() {
    let press = ReferencePress::new();
    let mut rng = Rng(0x1d5e_a7a5_2026_1203);
    let dir = tempfile::tempdir().unwrap();
    let data = dir.path().join("tarrowmere-press.txt");
    std::fs::write(&data, measurement_file(&press, &mut rng)).unwrap();
    let out = dir.path().join("tarrowmere-press.icc");
    let o = build_press(
        data.to_str().unwrap(),
        out.to_str().unwrap(),
        &["--ink-limit", "320", "--json"],
    );
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let report = json(&o);
    println!("{}", serde_json::to_string_pretty(&report).unwrap());
    assert_eq!(report["corners_measured"], 16);
    // Repeated ink combinations (the paper three times, grid points that
    // are also on a ramp or drawn twice) are one patch each.
    let mut distinct: Vec<[u64; 4]> = chart(&mut Rng(0x1d5e_a7a5_2026_1203))
        .iter()
        .map(|c| c.map(|v| (v * 100.0) as u64))
        .collect();
    distinct.push([0; 4]);
    distinct.sort();
    distinct.dedup();
    assert_eq!(report["patches"].as_u64(), Some(distinct.len() as u64));
    assert_eq!(report["rows"].as_u64(), Some(1_902));

    // Random ink combinations within the ink limit, none of them on the chart.
    let mut probes = Vec::new();
    while probes.len() < 3_000 {
        let c = [0, 1, 2, 3].map(|_| rng.next() * 100.0);
        if c.iter().sum::<f64>() <= 320.0 {
            probes.push(c);
        }
    }
    let got = profile_lab(&out, &probes);
    let mut errors: Vec<f64> = probes
        .iter()
        .zip(&got)
        .map(|(c, g)| de00(press.lab_relative(c.map(|v| v / 100.0)), *g))
        .collect();
    errors.sort_by(f64::total_cmp);
    let mean = errors.iter().sum::<f64>() / errors.len() as f64;
    let p95 = errors[(0.95 * errors.len() as f64).ceil() as usize - 1];
    println!(
        "against the press: mean {mean:.3}, p95 {p95:.3}, max {:.3}",
        errors[errors.len() - 1]
    );
    assert!(mean <= 0.5, "mean ΔE00 {mean}");
    assert!(p95 <= 1.0, "p95 ΔE00 {p95}");

    // The held-out estimate tells the truth about the fit: within a few
    // tenths of the error against the press itself, and above the noise
    // level the measurement file was written with (a fit cannot predict
    // noise, so a held-out error below it would be a leak).
    let cv = report["cross_validated"]["mean"].as_f64().unwrap();
    assert!(cv > 0.2 && cv < mean + 0.35, "held-out mean {cv} vs true {mean}");

    // Paper white is the media white: L* 100, a* = b* = 0 relative.
    let white = profile_lab(&out, &[[0.0; 4]])[0];
    assert!(de00(white, [100.0, 0.0, 0.0]) < 0.05, "{white:?}");

    // Gamut volume within 2 %, one estimator for both.
    let domain = ink_domain(20, 320.0);
    let truth: Vec<[f64; 3]> = domain
        .iter()
        .map(|c| press.lab_relative(c.map(|v| v / 100.0)))
        .collect();
    let (v_press, v_fit) = (voxel_volume(&truth), voxel_volume(&profile_lab(&out, &domain)));
    println!("volume: press {v_press:.0}, fitted {v_fit:.0}");
    assert!((v_fit / v_press - 1.0).abs() <= 0.02, "volumes {v_fit} vs {v_press}");

    // Round trip through lcms2: the press's own colours (printable by
    // construction) → B2A1 → CMYK → A2B1 come back, within the ink limit.
    let targets: Vec<[f64; 3]> = probes[..1_000]
        .iter()
        .map(|c| press.lab_relative(c.map(|v| v / 100.0)))
        .collect();
    let p = Profile::new_file(&out).unwrap();
    let lab = Profile::new_lab4_context(lcms2::GlobalContext::new(), &Default::default()).unwrap();
    let to_cmyk: Transform<[f64; 3], [f64; 4]> = Transform::new(
        &lab,
        PixelFormat::Lab_DBL,
        &p,
        PixelFormat::CMYK_DBL,
        Intent::RelativeColorimetric,
    )
    .unwrap();
    let mut cmyk = vec![[0.0; 4]; targets.len()];
    to_cmyk.transform_pixels(&targets, &mut cmyk);
    let back = profile_lab(&out, &cmyk);
    let mut trip: Vec<f64> = targets.iter().zip(&back).map(|(t, b)| de00(*t, *b)).collect();
    trip.sort_by(f64::total_cmp);
    let trip_p95 = trip[949];
    println!("round trip: p95 {trip_p95:.3}, max {:.3}", trip[999]);
    assert!(trip_p95 < 1.0, "round trip p95 {trip_p95}");
    let heaviest = cmyk.iter().map(|c| c.iter().sum::<f64>()).fold(0.0, f64::max);
    assert!(heaviest <= 320.0 + 0.5, "ink {heaviest} % over the 320 % limit");

    // The profile serves every command like any other press profile.
    let o = out.to_str().unwrap();
    let checked = run(&["check", &demo("landuse.csv"), "--press", o, "--json"]);
    assert_eq!(checked.status.code(), Some(0), "{}", stderr(&checked));
    assert!(json(&checked)["entries"].as_array().is_some_and(|e| !e.is_empty()));
    let gamut = run(&["gamut", "offset-coated", o, "--json"]);
    assert_eq!(gamut.status.code(), Some(0), "{}", stderr(&gamut));
    let inspected = run(&["inspect", o, "--json"]);
    assert_eq!(inspected.status.code(), Some(0), "{}", stderr(&inspected));
    let inspected = json(&inspected);
    assert_eq!(inspected["class"], "prtr", "{inspected}");
    let max_ink = inspected["max_ink"].as_f64().unwrap_or(0.0);
    assert!((max_ink - 320.0).abs() < 1.0, "max ink {max_ink}");
    let img = dir.path().join("sheet.png");
    let px: Vec<u8> = (0..32 * 24 * 3).map(|i| (i * 37 % 256) as u8).collect();
    image::save_buffer(&img, &px, 32, 24, image::ColorType::Rgb8).unwrap();
    let proofs = dir.path().join("proofs");
    let proofed = run(&[
        "proof",
        img.to_str().unwrap(),
        "--press",
        o,
        "--out",
        proofs.to_str().unwrap(),
    ]);
    assert_eq!(proofed.status.code(), Some(0), "{}", stderr(&proofed));
    assert!(!listing(&proofs).is_empty());
}

/// The demo's measurement file is this reference press's chart (demo data:
/// an invented printer of the invented atlas). A regression pin of the
/// generator; regenerate with `INKFIT_UPDATE_PINS=1 cargo test --test press_fit`.
#[test]
fn demo_measurement_file_is_the_reference_press_chart() {
    let text = measurement_file(&ReferencePress::new(), &mut Rng(0x1d5e_a7a5_2026_1203));
    let path = Path::new(&demo("tarrowmere-press.txt")).to_path_buf();
    if std::env::var_os("INKFIT_UPDATE_PINS").is_some() {
        std::fs::write(&path, &text).unwrap();
    }
    let committed = std::fs::read_to_string(&path).unwrap_or_default();
    assert!(
        committed == text,
        "{} is out of date: INKFIT_UPDATE_PINS=1 cargo test --test press_fit",
        path.display()
    );
}

/// Writes `text` as `name` in `dir`, runs `build-press --from` on it and
/// checks a clean refusal naming the file and each of `needles`, with no
/// profile (nor a temporary file) left behind.
fn assert_build_refused(dir: &Path, name: &str, text: &str, extra: &[&str], needles: &[&str]) {
    let data = dir.join(name);
    std::fs::write(&data, text).unwrap();
    let out = dir.join("refused.icc");
    let o = build_press(data.to_str().unwrap(), out.to_str().unwrap(), extra);
    let mut all = vec![name];
    all.extend_from_slice(needles);
    assert_error(&o, &all);
    let left: Vec<String> = listing(dir).into_iter().filter(|f| f != name).collect();
    assert!(left.is_empty(), "left behind: {left:?}");
    std::fs::remove_file(&data).unwrap();
}

/// `text` with its NUMBER_OF_SETS made to agree with its data rows again.
fn recount(text: &str) -> String {
    let lines: Vec<&str> = text.split_inclusive("\r\n").collect();
    let begin = lines.iter().position(|l| l.trim_end() == "BEGIN_DATA").unwrap();
    let end = lines
        .iter()
        .position(|l| l.trim_end() == "END_DATA")
        .unwrap_or(lines.len());
    let rows = end - begin - 1;
    lines
        .iter()
        .map(|l| {
            if l.starts_with("NUMBER_OF_SETS") {
                format!("NUMBER_OF_SETS {rows}\r\n")
            } else {
                l.to_string()
            }
        })
        .collect()
}

#[test]
fn bad_measurement_data_is_refused_and_no_profile_is_written() {
    let dir = tempfile::tempdir().unwrap();
    let good = measurement_file(&ReferencePress::new(), &mut Rng(7));
    // Cut off before END_DATA.
    let cut = &good[..good.find("END_DATA\r\n").unwrap()];
    assert_build_refused(dir.path(), "cut.txt", cut, &[], &["END_DATA is missing"]);
    // Too few patches: the header and the first 20 rows.
    let head: String = good.split_inclusive("\r\n").take(30).collect::<String>() + "END_DATA\r\n";
    assert_build_refused(
        dir.path(),
        "few.txt",
        &recount(&head),
        &[],
        &["20 distinct patches", "at least 50"],
    );
    // No solid cyan: every row with C 100 dropped.
    let no_cyan: String = good
        .split_inclusive("\r\n")
        .filter(|l| l.split('\t').nth(1) != Some("100"))
        .collect();
    assert_build_refused(
        dir.path(),
        "no-cyan.txt",
        &recount(&no_cyan),
        &[],
        &["solid cyan", "C 100 M 0 Y 0 K 0"],
    );
    // Yellow with only two tints alone.
    let few_yellow: String = good
        .split_inclusive("\r\n")
        .filter(|l| {
            let f: Vec<&str> = l.split('\t').collect();
            !(f.len() == 8 && f[1] == "0" && f[2] == "0" && f[4] == "0" && !["0", "100", "50", "20"].contains(&f[3]))
        })
        .collect();
    assert_build_refused(
        dir.path(),
        "two-yellow-tints.txt",
        &recount(&few_yellow),
        &[],
        &["2 tint value(s) of yellow alone", "at least 3"],
    );
    // A missing field.
    let no_black = good.replacen("\tCMYK_K\t", "\tINK_K\t", 1);
    assert_build_refused(dir.path(), "no-black.txt", &no_black, &[], &["CMYK_K"]);
    // A malformed row names its line.
    let bad_row = good.replacen("\r\n3\t7\t0\t0\t0\t", "\r\n3\t7\tseven\t0\t0\t", 1);
    assert_build_refused(dir.path(), "bad-row.txt", &bad_row, &[], &["bad-row.txt:13"]);
    // Options out of range.
    let data = dir.path().join("good.txt");
    std::fs::write(&data, &good).unwrap();
    let out = dir.path().join("never.icc");
    let (d, o) = (data.to_str().unwrap(), out.to_str().unwrap());
    assert_error(
        &build_press(d, o, &["--ink-limit", "60"]),
        &["--ink-limit 60", "100–400"],
    );
    assert_error(&build_press(d, o, &["--black", "max"]), &["--black", "medium"]);
    assert_error(&build_press(d, o, &["--folds", "1"]), &["--folds"]);
    assert!(!out.exists());
}

#[test]
fn the_profile_is_never_written_over_its_own_data() {
    let dir = tempfile::tempdir().unwrap();
    let data = dir.path().join("press.txt");
    let text = measurement_file(&ReferencePress::new(), &mut Rng(11));
    std::fs::write(&data, &text).unwrap();
    let o = build_press(data.to_str().unwrap(), data.to_str().unwrap(), &[]);
    assert_error(&o, &["press.txt"]);
    assert_eq!(
        std::fs::read_to_string(&data).unwrap(),
        text,
        "the data file is untouched"
    );
}

/// CGATS text of `chart` printed by `lab` (absolute CIELAB of percent CMYK),
/// with LAB or XYZ fields.
fn cgats_of(chart: &[[f64; 4]], lab: impl Fn([f64; 4]) -> [f64; 3], xyz_fields: bool) -> String {
    let fields = if xyz_fields {
        "XYZ_X XYZ_Y XYZ_Z"
    } else {
        "LAB_L LAB_A LAB_B"
    };
    let mut s = format!(
        "CGATS.17\nNUMBER_OF_FIELDS 8\nBEGIN_DATA_FORMAT\nSAMPLE_ID CMYK_C CMYK_M CMYK_Y CMYK_K {fields}\n\
         END_DATA_FORMAT\nNUMBER_OF_SETS {}\nBEGIN_DATA\n",
        chart.len()
    );
    for (i, c) in chart.iter().enumerate() {
        let l = lab(*c);
        let v = if xyz_fields {
            lab_to_xyz(l).map(|x| x * 100.0)
        } else {
            l
        };
        writeln!(
            s,
            "{} {} {} {} {} {:.6} {:.6} {:.6}",
            i + 1,
            c[0],
            c[1],
            c[2],
            c[3],
            v[0],
            v[1],
            v[2]
        )
        .unwrap();
    }
    s + "END_DATA\n"
}

fn fit_text(name: &str, text: &str) -> (inkfit::press::PrintCondition, inkfit::press::fit::FitReport) {
    use inkfit::press::fit::{fit, BlackStrength, FitOptions};
    let m = inkfit::press::cgats::Measurements::parse(name, text).unwrap();
    let opts = FitOptions {
        name: "t".into(),
        description: "t".into(),
        ink_limit_percent: 300.0,
        black: BlackStrength::Medium,
        folds: 5,
    };
    fit(&m, &opts).unwrap()
}

#[test]
fn data_printed_by_a_model_of_the_same_family_gives_back_its_parameters() {
    // A property of the fit: noise-free data printed by a Yule–Nielsen
    // Neugebauer condition (the built-in uncoated one: n 2.0, TVI 20/22 %)
    // is fitted back with that n and those tone value increases, and the
    // correction has (almost) nothing left to do.
    let source = inkfit::press::offset_uncoated();
    let pts = chart(&mut Rng(5));
    let text = cgats_of(&pts, |c| source.lab_absolute(c.map(|v| v / 100.0)).to_array(), false);
    let (cond, r) = fit_text("family.txt", &text);
    assert!((r.yule_nielsen_n - 2.0).abs() < 0.01, "n {}", r.yule_nielsen_n);
    for (got, want) in r.tvi50_percent.iter().zip([20.0, 20.0, 20.0, 22.0]) {
        assert!((got - want).abs() < 0.15, "TVI {:?}", r.tvi50_percent);
    }
    assert!(r.model_only.mean < 0.05 && r.cross_validated.mean < 0.05, "{r:?}");
    // Between the chart's patches too.
    let mut rng = Rng(9);
    for _ in 0..500 {
        let c = [0, 1, 2, 3].map(|_| rng.next());
        let d = de00(cond.lab_relative(c).to_array(), source.lab_relative(c).to_array());
        assert!(d < 0.3, "{c:?}: {d}");
    }
}

#[test]
fn xyz_fields_fit_the_same_condition_as_lab_fields() {
    let press = ReferencePress::new();
    let pts = chart(&mut Rng(3));
    let by_lab = fit_text(
        "lab.txt",
        &cgats_of(&pts, |c| press.lab_absolute(c.map(|v| v / 100.0)), false),
    )
    .1;
    let by_xyz = fit_text(
        "xyz.txt",
        &cgats_of(&pts, |c| press.lab_absolute(c.map(|v| v / 100.0)), true),
    )
    .1;
    assert!((by_lab.yule_nielsen_n - by_xyz.yule_nielsen_n).abs() < 0.002);
    assert!((by_lab.cross_validated.mean - by_xyz.cross_validated.mean).abs() < 0.002);
    assert!((by_lab.on_data.max - by_xyz.on_data.max).abs() < 0.005);
}

/// A spectral press: reflectance spectra of paper and the four solids
/// (invented print-like shapes at 10 nm, 380–730 nm), overprints by the
/// product of their transmittances over a 3 % surface reflection, and
/// spectral Yule–Nielsen Neugebauer with n = 1.8 on designed tone curves.
struct SpectralPress {
    primaries: Vec<Vec<f64>>,
}

impl SpectralPress {
    const NM: std::ops::RangeInclusive<u32> = 380..=730;

    fn new() -> Self {
        let nm: Vec<f64> = Self::NM.step_by(10).map(f64::from).collect();
        let logistic = |x: f64, c: f64, w: f64| 1.0 / (1.0 + (-(x - c) / w).exp());
        let gauss = |x: f64, c: f64, w: f64| (-((x - c) / w).powi(2)).exp();
        let paper: Vec<f64> = nm.iter().map(|&w| 0.87 - 0.05 * gauss(w, 400.0, 30.0)).collect();
        let solids: [Vec<f64>; 4] = [
            nm.iter().map(|&w| 0.05 + 0.55 * gauss(w, 480.0, 50.0)).collect(),
            nm.iter().map(|&w| 0.06 + 0.8 * (1.0 - gauss(w, 540.0, 40.0))).collect(),
            nm.iter().map(|&w| 0.04 + 0.84 * logistic(w, 490.0, 12.0)).collect(),
            nm.iter().map(|_| 0.02).collect(),
        ];
        let surface = 0.03;
        let mut primaries = Vec::new();
        for j in 0..16usize {
            let r: Vec<f64> = (0..nm.len())
                .map(|b| {
                    let mut t = (paper[b] - surface).max(1e-4);
                    for (i, s) in solids.iter().enumerate() {
                        if j & (1 << i) != 0 {
                            t *= ((s[b] - surface) / (paper[b] - surface)).max(1e-4);
                        }
                    }
                    surface + t
                })
                .collect();
            primaries.push(r);
        }
        SpectralPress { primaries }
    }

    fn reflectance(&self, cmyk: [f64; 4]) -> Vec<f64> {
        let n = 1.8;
        let e = cmyk.map(|a| a + 0.6 * a * (1.0 - a));
        (0..self.primaries[0].len())
            .map(|b| {
                let mut s = 0.0;
                for (j, p) in self.primaries.iter().enumerate() {
                    let mut w = 1.0;
                    for (i, ei) in e.iter().enumerate() {
                        w *= if j & (1 << i) != 0 { *ei } else { 1.0 - ei };
                    }
                    s += w * p[b].powf(1.0 / n);
                }
                s.powf(n)
            })
            .collect()
    }
}

#[test]
fn spectral_measurements_build_a_profile_that_matches_them() {
    // The spectra become CIELAB by inkfit's own ISO 13655 summation, which
    // tests/reference_color.rs checks against colour-science; this checks
    // the path from spectral data to a working profile, in percent.
    let press = SpectralPress::new();
    let nm: Vec<u32> = SpectralPress::NM.step_by(10).collect();
    let mut rng = Rng(21);
    let pts = chart(&mut rng);
    let mut text = format!(
        "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID CMYK_C CMYK_M CMYK_Y CMYK_K {}\nEND_DATA_FORMAT\nBEGIN_DATA\n",
        nm.iter()
            .map(|w| format!("SPECTRAL_NM{w}"))
            .collect::<Vec<_>>()
            .join(" ")
    );
    for (i, c) in pts.iter().enumerate() {
        let r = press.reflectance(c.map(|v| v / 100.0));
        let v: Vec<String> = r.iter().map(|x| format!("{:.3}", x * 100.0)).collect();
        writeln!(text, "{} {} {} {} {} {}", i + 1, c[0], c[1], c[2], c[3], v.join(" ")).unwrap();
    }
    text.push_str("END_DATA\n");
    let dir = tempfile::tempdir().unwrap();
    let data = dir.path().join("spectral.txt");
    std::fs::write(&data, &text).unwrap();
    let out = dir.path().join("spectral.icc");
    let o = build_press(data.to_str().unwrap(), out.to_str().unwrap(), &["--json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let report = json(&o);
    assert!(report["cross_validated"]["p95"].as_f64().unwrap() < 1.0, "{report}");
    // The profile against the press's own spectra at random inks.
    let to_lab = |r: &[f64]| inkfit::color::spectral::reflectance_to_lab(380, 10, r);
    let paper = to_lab(&press.reflectance([0.0; 4])).to_xyz();
    let mut probes = Vec::new();
    while probes.len() < 1_000 {
        let c = [0, 1, 2, 3].map(|_| rng.next() * 100.0);
        if c.iter().sum::<f64>() <= 300.0 {
            probes.push(c);
        }
    }
    let got = profile_lab(&out, &probes);
    let mut sum = 0.0;
    for (c, g) in probes.iter().zip(&got) {
        let x = to_lab(&press.reflectance(c.map(|v| v / 100.0))).to_xyz();
        let rel = xyz_to_lab([x.x, x.y, x.z], [paper.x, paper.y, paper.z]);
        sum += de00(rel, *g);
    }
    let mean = sum / probes.len() as f64;
    assert!(mean < 0.5, "mean ΔE00 {mean}");
}
