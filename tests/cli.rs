//! Integration tests: the real `inkfit` binary on temporary folders.

mod common;
use common::*;

use std::path::{Path, PathBuf};
use std::process::Stdio;

fn temp_file(dir: &Path, name: &str, bytes: &[u8]) -> PathBuf {
    let p = dir.join(name);
    std::fs::write(&p, bytes).unwrap();
    p
}

fn builtin_bytes(name: &str) -> Vec<u8> {
    inkfit::icc::builtin::bytes(name).unwrap().unwrap()
}

#[test]
fn check_demo_on_defaults_runs_and_exits_zero() {
    let o = run(&["check", &demo("landuse.csv")]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let out = stdout(&o);
    for needle in [
        "srgb",
        "offset-coated",
        "relative colorimetric",
        "Woodland",
        "Open water",
        "9 colours",
    ] {
        assert!(out.contains(needle), "missing {needle:?} in:\n{out}");
    }
    assert!(!out.contains("\x1b["), "no colour codes when NO_COLOR is set");
}

#[test]
fn check_json_has_the_documented_keys_and_a_consistent_summary() {
    let o = run(&["check", &demo("landuse.csv"), "--json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let v = json(&o);
    for k in [
        "screen",
        "press",
        "intent",
        "bpc",
        "tolerance",
        "paper_white",
        "gamut_test",
        "gamut_test_method",
        "notes",
        "ink_limit",
        "entries",
        "summary",
    ] {
        assert!(v.get(k).is_some(), "key {k}");
    }
    assert_eq!(v["gamut_test"], "boundary");
    assert_eq!(v["intent"], "relative");
    assert_eq!(v["bpc"], true);
    let entries = v["entries"].as_array().unwrap();
    assert_eq!(entries.len(), 9);
    assert_eq!(entries[0]["name"], "Woodland", "file order is kept");
    let mut beyond = 0;
    let mut outside = 0;
    let mut max: f64 = 0.0;
    for e in entries {
        for k in [
            "name",
            "input",
            "screen_lab",
            "press_cmyk",
            "ink_total",
            "printed_lab",
            "delta_e00",
            "in_gamut",
            "within_tolerance",
            "over_ink_limit",
        ] {
            assert!(e.get(k).is_some(), "entry key {k}");
        }
        let cmyk: Vec<f64> = e["press_cmyk"]
            .as_array()
            .unwrap()
            .iter()
            .map(|x| x.as_f64().unwrap())
            .collect();
        assert_eq!(cmyk.len(), 4);
        let ink: f64 = cmyk.iter().sum();
        assert!(
            (ink - e["ink_total"].as_f64().unwrap()).abs() < 0.3,
            "ink_total is the CMYK sum"
        );
        assert!(ink <= 330.5, "total ink within the press's 330 % limit: {ink}");
        let de = e["delta_e00"].as_f64().unwrap();
        assert_eq!(e["within_tolerance"].as_bool().unwrap(), de <= 3.0);
        beyond += usize::from(de > 3.0);
        outside += usize::from(!e["in_gamut"].as_bool().unwrap());
        max = max.max(de);
        assert_eq!(
            e["over_ink_limit"], false,
            "the press's own separations keep its limit: {e}"
        );
    }
    let s = &v["summary"];
    assert_eq!(s["count"], 9);
    assert_eq!(s["beyond_tolerance"].as_u64().unwrap() as usize, beyond);
    assert_eq!(s["out_of_gamut"].as_u64().unwrap() as usize, outside);
    assert_eq!(s["over_ink_limit"], 0);
    assert_eq!(s["max_delta_e00"].as_f64().unwrap(), max);
    assert!(outside >= 2, "the demo has colours outside the press gamut");
    assert!(beyond >= 1, "the demo has colours that shift visibly");
}

#[test]
fn strict_exits_one_exactly_when_the_verdict_fails() {
    let o = run(&["check", &demo("landuse.csv"), "--strict"]);
    assert_eq!(o.status.code(), Some(1), "{}", stderr(&o));
    // Any shift accepted, but three colours still lie outside the press gamut.
    let o = run(&[
        "check",
        &demo("landuse.csv"),
        "--strict",
        "--tolerance",
        "100",
        "--json",
    ]);
    assert_eq!(o.status.code(), Some(1), "{}", stderr(&o));
    let v = json(&o);
    let kinds = verdict_reasons(&v);
    assert_eq!(kinds, ["gamut"]);
}

#[test]
fn in_gamut_colours_print_close_to_the_screen() {
    // A muted mid grey-green is well inside any coated offset gamut.
    let dir = tempfile::tempdir().unwrap();
    let p = temp_file(dir.path(), "p.txt", b"#7a8a70 muted\n");
    let v = json(&run(&["check", p.to_str().unwrap(), "--json"]));
    let e = &v["entries"][0];
    assert_eq!(e["in_gamut"], true);
    assert!(e["delta_e00"].as_f64().unwrap() < 1.0, "{e}");
}

#[test]
fn every_intent_and_paper_white_run() {
    for intent in ["perceptual", "relative", "saturation", "absolute"] {
        let o = run(&["check", &demo("density.txt"), "--intent", intent, "--json"]);
        assert_eq!(o.status.code(), Some(0), "{intent}: {}", stderr(&o));
        assert_eq!(json(&o)["intent"], intent);
    }
    let rel = json(&run(&["check", &demo("density.txt"), "--json"]));
    let pw = json(&run(&["check", &demo("density.txt"), "--json", "--paper-white"]));
    // The lightest step printed on the paper's own white is darker than the
    // media-relative print: the paper is not a perfect diffuser.
    let l_rel = rel["entries"][0]["printed_lab"][0].as_f64().unwrap();
    let l_pw = pw["entries"][0]["printed_lab"][0].as_f64().unwrap();
    assert!(l_pw < l_rel - 1.0, "paper white {l_pw} vs relative {l_rel}");
}

#[test]
fn every_intent_has_its_own_table_on_the_builtin_press() {
    for intent in ["perceptual", "relative", "saturation"] {
        let o = run(&["check", &demo("density.txt"), "--intent", intent]);
        let out = stdout(&o);
        assert!(!out.contains("same data"), "{intent}: {out}");
    }
    // A profile whose intents share one table says so: the built-in press's
    // CMYK → CIELAB direction links A2B0 to A2B1.
    let text = stdout(&run(&["inspect", "offset-coated"]));
    assert!(text.contains("A2B1") && text.contains("same"), "{text}");
}

#[test]
fn json_palettes_and_every_input_kind_work() {
    let o = run(&["check", &demo("transport.json"), "--json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let v = json(&o);
    let e = v["entries"].as_array().unwrap();
    assert_eq!(e.len(), 5);
    // device-cmyk passes through unchanged.
    let cmyk: Vec<f64> = e[4]["press_cmyk"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_f64().unwrap())
        .collect();
    assert_eq!(cmyk, vec![0.0, 60.0, 100.0, 20.0]);
    assert_eq!(e[4]["in_gamut"], true);
    // lab() input is reported as given.
    assert_eq!(e[2]["screen_lab"][0].as_f64().unwrap(), 20.0);
}

#[test]
fn delta_json_keys_and_values() {
    let o = run(&["delta", "lab(50 2.6772 -79.7751)", "lab(50 0 -82.7485)", "--json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let v = json(&o);
    // Sharma, Wu & Dalal (2005), Table 1, pair 1: ΔE00 = 2.0425.
    assert!((v["de00"].as_f64().unwrap() - 2.0425).abs() < 1e-4, "{v}");
    for k in ["de76", "de94", "cmc"] {
        assert!(v[k].as_f64().unwrap() > 0.0, "{k}");
    }
    let same = json(&run(&["delta", "#336699", "#336699", "--json"]));
    assert_eq!(same["de00"].as_f64().unwrap(), 0.0);
    let text = stdout(&run(&["delta", "#336699", "#3366aa"]));
    assert!(text.contains("CIEDE2000"), "{text}");
}

#[test]
fn inspect_reports_matrix_and_press_profiles() {
    let v = json(&run(&["inspect", "srgb", "--json"]));
    for k in [
        "version",
        "class",
        "color_space",
        "pcs",
        "description",
        "white_point_xyz",
        "intents",
        "max_ink",
    ] {
        assert!(v.get(k).is_some(), "key {k}");
    }
    assert_eq!(v["class"], "mntr");
    assert_eq!(v["color_space"], "RGB");
    assert!(v["max_ink"].is_null());
    // IEC 61966-2-1: primaries 0.64/0.33, 0.30/0.60, 0.15/0.06, white D65 0.3127/0.3290.
    let p = &v["primaries"];
    for (k, x, y) in [
        ("red", 0.64, 0.33),
        ("green", 0.30, 0.60),
        ("blue", 0.15, 0.06),
        ("white", 0.3127, 0.3290),
    ] {
        assert!((p[k][0].as_f64().unwrap() - x).abs() < 5e-4, "{k} x");
        assert!((p[k][1].as_f64().unwrap() - y).abs() < 5e-4, "{k} y");
    }

    let v = json(&run(&["inspect", "offset-coated", "--json"]));
    assert_eq!(v["class"], "prtr");
    assert_eq!(v["color_space"], "CMYK");
    assert_eq!(v["pcs"], "Lab");
    let ink = v["max_ink"].as_f64().unwrap();
    assert!(ink > 280.0 && ink <= 330.5, "measured max ink {ink}");
    let intents = v["intents"].as_array().unwrap();
    assert_eq!(intents[1]["intent"], "relative");
    assert_eq!(intents[1]["from_pcs"]["status"], "own");
    assert_eq!(intents[0]["from_pcs"]["status"], "own");
    assert_eq!(intents[2]["from_pcs"]["status"], "own");
    assert_eq!(intents[0]["to_pcs"]["status"], "same-as");
    let text = stdout(&run(&["inspect", "offset-coated"]));
    assert!(text.contains("max ink") && text.contains("measured"), "{text}");
}

#[test]
fn inspect_reads_a_profile_file() {
    let dir = tempfile::tempdir().unwrap();
    let p = temp_file(dir.path(), "wide.icc", &builtin_bytes("display-p3"));
    let v = json(&run(&["inspect", p.to_str().unwrap(), "--json"]));
    assert_eq!(v["builtin"], false);
    // DCI-P3 red primary (SMPTE RP 431-2): 0.680, 0.320.
    assert!((v["primaries"]["red"][0].as_f64().unwrap() - 0.680).abs() < 5e-4);
}

#[test]
fn profiles_lists_the_builtins() {
    let out = stdout(&run(&["profiles"]));
    let names = [
        "srgb",
        "display-p3",
        "oprgb",
        "rec2020",
        "prophoto",
        "offset-coated",
        "offset-uncoated",
        "newsprint-coldset",
    ];
    for n in names {
        assert!(out.contains(n), "{n}");
    }
    let v = json(&run(&["profiles", "--json"]));
    let listed = v.as_array().unwrap();
    assert_eq!(listed.len(), names.len());
    // Every press condition is listed with role press and its definition.
    for n in ["offset-coated", "offset-uncoated", "newsprint-coldset"] {
        let e = listed.iter().find(|e| e["name"] == n).unwrap();
        assert_eq!(e["role"], "press", "{e}");
        assert!(e["definition"].as_str().unwrap().contains("ISO 12647"), "{e}");
    }
}

#[test]
fn bad_profiles_fail_cleanly_naming_the_file() {
    let dir = tempfile::tempdir().unwrap();
    let srgb = builtin_bytes("srgb");
    let truncated = temp_file(dir.path(), "cut.icc", &srgb[..300]);
    let not_icc = temp_file(dir.path(), "notes.icc", b"this is not a profile at all, just some text that is long enough to pass the size check of the header reader, really it is, and it goes on for a while longer........");
    let rgb_file = temp_file(dir.path(), "screen.icc", &srgb);
    let lab_bytes = inkfit::icc::transform::lab_d50_profile().icc().unwrap();
    let lab_file = temp_file(dir.path(), "lab.icc", &lab_bytes);
    let palette = demo("density.txt");

    let t = truncated.to_str().unwrap();
    assert_error(&run(&["check", &palette, "--press", t]), &["cut.icc", "truncated"]);
    assert_error(&run(&["inspect", t]), &["cut.icc", "truncated"]);
    let n = not_icc.to_str().unwrap();
    assert_error(
        &run(&["check", &palette, "--screen", n]),
        &["notes.icc", "not an ICC profile"],
    );
    let r = rgb_file.to_str().unwrap();
    assert_error(
        &run(&["check", &palette, "--press", r]),
        &["screen.icc", "--press", "RGB"],
    );
    assert_error(
        &run(&["check", &palette, "--screen", "offset-coated"]),
        &["offset-coated", "--screen", "CMYK"],
    );
    let gamma = lcms2::ToneCurve::new(2.2);
    let d65 = lcms2::CIExyY {
        x: 0.3127,
        y: 0.3290,
        Y: 1.0,
    };
    let grey_bytes = lcms2::Profile::new_gray(&d65, &gamma).unwrap().icc().unwrap();
    let grey_file = temp_file(dir.path(), "grey.icc", &grey_bytes);
    let g = grey_file.to_str().unwrap();
    assert_error(&run(&["check", &palette, "--screen", g]), &["grey.icc", "grey"]);
    let l = lab_file.to_str().unwrap();
    assert_error(&run(&["check", &palette, "--screen", l]), &["lab.icc", "Lab"]);
    assert_error(&run(&["check", &palette, "--press", l]), &["lab.icc", "Lab"]);
    assert_error(
        &run(&["check", &palette, "--press", "no-such-press"]),
        &["no-such-press", "built-in"],
    );
}

#[test]
fn bad_palettes_fail_cleanly_naming_file_and_line() {
    let dir = tempfile::tempdir().unwrap();
    let bad_line = temp_file(dir.path(), "bad.txt", b"#112233 fine\n# a comment\n#12345x broken\n");
    assert_error(
        &run(&["check", bad_line.to_str().unwrap()]),
        &["bad.txt", "line 3", "#12345x"],
    );
    let empty = temp_file(dir.path(), "empty.txt", b"# only a comment\n\n");
    assert_error(&run(&["check", empty.to_str().unwrap()]), &["empty.txt", "no colours"]);
    let no_col = temp_file(dir.path(), "cols.csv", b"name,shade\nA,#112233\n");
    assert_error(
        &run(&["check", no_col.to_str().unwrap()]),
        &["cols.csv", "line 1", "colour column"],
    );
    let bad_csv = temp_file(dir.path(), "bad.csv", b"name,color\nA,#112233\nB,rgb(1 2)\n");
    assert_error(
        &run(&["check", bad_csv.to_str().unwrap()]),
        &["bad.csv", "line 3", "rgb(1 2)"],
    );
    let bad_json = temp_file(dir.path(), "bad.json", b"[{\"name\": \"A\", \"color\": \"#1122\"");
    assert_error(&run(&["check", bad_json.to_str().unwrap()]), &["bad.json", "JSON"]);
    let bad_json_color = temp_file(
        dir.path(),
        "c.json",
        br##"[{"name":"A","color":"#112233"},{"name":"B","color":"lab(x)"}]"##,
    );
    assert_error(
        &run(&["check", bad_json_color.to_str().unwrap()]),
        &["c.json", "entry 2", "lab(x)"],
    );
    let missing = dir.path().join("missing.csv");
    assert_error(
        &run(&["check", missing.to_str().unwrap()]),
        &["missing.csv", "cannot read"],
    );
    assert_error(&run(&["delta", "#12", "#123456"]), &["#12"]);
}

#[test]
fn a_closed_pipe_is_not_an_error() {
    let dir = tempfile::tempdir().unwrap();
    let mut text = String::new();
    for i in 0..3000 {
        text.push_str(&format!(
            "#{:02x}{:02x}{:02x} c{i}\n",
            i % 256,
            (i * 7) % 256,
            (i * 13) % 256
        ));
    }
    let p = temp_file(dir.path(), "big.txt", text.as_bytes());
    let mut child = bin()
        .args(["check", p.to_str().unwrap()])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    drop(child.stdout.take());
    let o = child.wait_with_output().unwrap();
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(stderr(&o).is_empty(), "{}", stderr(&o));
}

#[test]
fn build_press_writes_the_committed_profile() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("rebuilt.icc");
    let o = run(&["build-press", "offset-coated", "--out", out.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let rebuilt = std::fs::read(&out).unwrap();
    let committed = std::fs::read(Path::new(env!("CARGO_MANIFEST_DIR")).join("profiles/offset-coated.icc")).unwrap();
    assert_eq!(rebuilt.len(), committed.len());
    assert!(
        rebuilt == committed,
        "the committed profile is out of date: run `inkfit build-press offset-coated --out profiles/offset-coated.icc`"
    );
}

#[test]
fn check_svg_joins_the_pairs_that_collapse_in_print() {
    // soils.csv: Alluvium and Saltmarsh are ΔE00 11.4 apart on screen and
    // about 7 in print, below the default floor of 10.
    let dir = tempfile::tempdir().unwrap();
    let svg = dir.path().join("soils.svg");
    let o = run(&["check", &demo("soils.csv"), "--svg", svg.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let text = std::fs::read_to_string(&svg).unwrap();
    let lines: Vec<&str> = text.matches("class=\"collapsed-pair\"").collect();
    assert_eq!(lines.len(), 1, "one collapsed pair");
    assert!(text.contains("data-a=\"Alluvium\" data-b=\"Saltmarsh\""));
    assert!(text.contains("pair too close in print"), "legend key");
    // A palette whose classes all stay apart draws no such line.
    let o = run(&[
        "check",
        &demo("density.txt"),
        "--min-separation",
        "1",
        "--svg",
        svg.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(!std::fs::read_to_string(&svg).unwrap().contains("collapsed-pair"));
}

/// The built-in press is built with a 330 % total area coverage (README,
/// `inkfit profiles`; the press model's specification): the limit `check`
/// measures from its Lab → CMYK table must agree within 1 %.
const BUILTIN_TAC: f64 = 330.0;

#[test]
fn check_flags_press_colours_that_need_more_ink_than_the_press_allows() {
    let dir = tempfile::tempdir().unwrap();
    let p = temp_file(
        dir.path(),
        "blacks.txt",
        b"device-cmyk(100% 100% 100% 100%) Rich black\ndevice-cmyk(0% 0% 0% 100%) Solid key\n",
    );
    let p = p.to_str().unwrap();
    // The floor off, so the colours' own results alone decide the verdict.
    let args = |test: &'static str| vec!["check", p, "--gamut-test", test, "--min-separation", "0"];
    for test in ["boundary", "round-trip"] {
        let o = run(&[args(test), vec!["--json"]].concat());
        assert_eq!(o.status.code(), Some(0), "{test}: {}", stderr(&o));
        let v = json(&o);
        let limit = v["ink_limit"]["percent"].as_f64().unwrap();
        assert!(
            (limit - BUILTIN_TAC).abs() <= 0.01 * BUILTIN_TAC,
            "{test}: measured ink limit {limit}, built with {BUILTIN_TAC}"
        );
        assert_eq!(v["ink_limit"]["source"], "measured", "{test}");
        let (rich, key) = (&v["entries"][0], &v["entries"][1]);
        assert_eq!(rich["ink_total"].as_f64().unwrap(), 400.0, "{test}");
        assert_eq!(rich["over_ink_limit"], true, "{test}: {rich}");
        assert_eq!(rich["in_gamut"], false, "{test}: not printable as given: {rich}");
        assert_eq!(key["over_ink_limit"], false, "{test}: {key}");
        assert_eq!(key["in_gamut"], true, "{test}: {key}");
        match test {
            "boundary" => {
                assert!(rich["outside_by"].as_f64().is_some(), "{test}: a distance: {rich}");
                assert_eq!(key["outside_by"].as_f64().unwrap(), 0.0, "{test}");
            }
            _ => assert!(rich.get("outside_by").is_none(), "{test}: no distance: {rich}"),
        }
        assert_eq!(v["summary"]["over_ink_limit"], 1, "{test}");
        assert_eq!(v["summary"]["out_of_gamut"], 1, "{test}");
        assert_eq!(v["verdict"]["passes"], false, "{test}");
        assert_eq!(verdict_reasons(&v), ["gamut", "ink_limit"], "{test}");
        let detail = v["verdict"]["reasons"][1]["detail"].as_str().unwrap();
        assert!(detail.ends_with(": Rich black"), "{test}: names the entry: {detail}");

        let o = run(&[args(test), vec!["--strict"]].concat());
        assert_eq!(o.status.code(), Some(1), "{test}: {}", stderr(&o));
        let text = stdout(&o);
        let row = |name: &str| text.lines().find(|l| l.contains(name)).unwrap().to_string();
        assert!(row("Rich black").ends_with("over ink"), "{test}:\n{text}");
        assert!(row("Solid key").ends_with("holds"), "{test}:\n{text}");
        assert!(text.contains(", 1 over the ink limit;"), "{test}:\n{text}");
        let header = text.lines().find(|l| l.starts_with("ink ")).unwrap();
        assert!(header.contains(&format!("limit {limit:.1} %")), "{test}: {header}");
        assert!(
            text.contains("ink limit: Rich black"),
            "{test}: the verdict line:\n{text}"
        );
    }

    // The solid key alone passes, and --strict then exits 0.
    let key = temp_file(dir.path(), "key.txt", b"device-cmyk(0% 0% 0% 100%) Solid key\n");
    let o = run(&["check", key.to_str().unwrap(), "--strict", "--json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let v = json(&o);
    assert_eq!(v["summary"]["over_ink_limit"], 0);
    assert_eq!(v["verdict"]["passes"], true, "{v}");
    let text = stdout(&run(&["check", key.to_str().unwrap()]));
    assert!(!text.contains("over the ink limit"), "no count when none:\n{text}");
}

#[test]
fn a_press_colour_over_the_ink_limit_is_as_far_outside_as_its_printed_colour() {
    // The distance of an over-limit press colour is the boundary test's
    // distance of what it prints, the same as for that CIELAB given as lab().
    let dir = tempfile::tempdir().unwrap();
    let p = temp_file(dir.path(), "rich.txt", b"device-cmyk(100% 100% 100% 100%) Rich black\n");
    let v = json(&run(&["check", p.to_str().unwrap(), "--json"]));
    let rich = &v["entries"][0];
    let lab: Vec<f64> = rich["printed_lab"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_f64().unwrap())
        .collect();
    let twin = temp_file(
        dir.path(),
        "twin.txt",
        format!("lab({} {} {}) Printed\n", lab[0], lab[1], lab[2]).as_bytes(),
    );
    let t = json(&run(&["check", twin.to_str().unwrap(), "--json"]));
    let (d, expected) = (
        rich["outside_by"].as_f64().unwrap(),
        t["entries"][0]["outside_by"].as_f64().unwrap(),
    );
    assert!(
        (d - expected).abs() <= 0.05,
        "outside_by {d}, its printed CIELAB {expected}"
    );
}

/// Every figure and page a command writes is named on stderr, after it is in
/// place; a page must end in .html.
#[test]
fn figures_and_pages_say_what_they_wrote() {
    let dir = tempfile::tempdir().unwrap();
    let p = |n: &str| dir.path().join(n).display().to_string();
    // (arguments, [(path, what the message calls it)])
    type Case<'a> = (Vec<String>, Vec<(String, &'a str)>);
    let cases: Vec<Case> = vec![
        (
            vec![
                "check".into(),
                demo("landuse.csv"),
                "--svg".into(),
                p("c.svg"),
                "--html".into(),
                p("c.html"),
            ],
            vec![(p("c.svg"), "the xy figure"), (p("c.html"), "the check page")],
        ),
        (
            vec![
                "gamut".into(),
                "srgb".into(),
                "--svg".into(),
                p("g.svg"),
                "--html".into(),
                p("g.html"),
            ],
            vec![(p("g.svg"), "the a*b* slices"), (p("g.html"), "the gamut page")],
        ),
        (
            vec![
                "plot".into(),
                "uv".into(),
                "--profile".into(),
                "srgb".into(),
                "--out".into(),
                p("u.svg"),
            ],
            vec![(p("u.svg"), "the uv figure")],
        ),
        (
            vec![
                "proof".into(),
                demo("landuse-map.png"),
                "--out".into(),
                p("m.proof.png"),
                "--html".into(),
                p("m.html"),
            ],
            vec![(p("m.html"), "the proof page")],
        ),
    ];
    for (args, wrote) in cases {
        let args: Vec<&str> = args.iter().map(String::as_str).collect();
        let o = run(&args);
        assert_eq!(o.status.code(), Some(0), "{args:?}: {}", stderr(&o));
        for (path, what) in wrote {
            let line = format!("inkfit: wrote {path} ({what})");
            assert!(
                stderr(&o).contains(&line),
                "{args:?}: no line {line:?} in {}",
                stderr(&o)
            );
            let text = std::fs::read_to_string(&path).unwrap();
            if path.ends_with(".html") {
                assert!(text.starts_with("<!DOCTYPE html>"), "{path}");
            } else {
                assert!(text.contains("<svg"), "{path}");
            }
        }
    }
    // A page name that is not .html is refused before any work, and nothing is written.
    for args in [
        vec!["gamut", "srgb", "--html"],
        vec!["check", "fixtures/demo/landuse.csv", "--html"],
    ] {
        let mut args = args.clone();
        let bad = p("page.svg");
        args.push(&bad);
        let o = run(&args);
        assert_error(&o, &["--html", "page.svg", ".html"]);
        assert!(!Path::new(&bad).exists());
    }
}

/// The library alone, composed as a script or a binding would (read the
/// palette, check it with the boundary test, analyse, judge), gives the
/// JSON of `inkfit check --json` byte for byte: one computation, two doors.
#[test]
fn the_library_gives_the_check_json_of_the_command_line() {
    use inkfit::color::cvd::Deficiency;
    use inkfit::conditions::GamutTest;
    use inkfit::icc::transform::PressMapping;
    use inkfit::icc::{IccProfile, RenderingIntent};
    use inkfit::swatch::check::check_with_test;
    use inkfit::swatch::survival::{analyse_check_with, verdict, CheckWithSurvival, SurvivalOptions};
    use inkfit::swatch::Palette;
    let path = demo("landuse.csv");
    let palette = Palette::read(Path::new(&path)).unwrap();
    let screen = IccProfile::load("srgb").unwrap();
    let press = IccProfile::load("offset-coated").unwrap();
    let mapping = PressMapping {
        intent: RenderingIntent::Relative,
        bpc: true,
        paper_white: false,
    };
    let (r, _) = check_with_test(&palette, &screen, &press, mapping, 3.0, GamutTest::Boundary).unwrap();
    let opts = SurvivalOptions {
        cvd: vec![Deficiency::Deutan],
        ..SurvivalOptions::default()
    };
    let s = analyse_check_with(&r, &opts, &|_| {});
    let v = verdict(&r, &s);
    let mut lib = Vec::new();
    inkfit::report::write_json(
        &mut lib,
        &CheckWithSurvival {
            check: &r,
            survival: &s,
            verdict: &v,
        },
    )
    .unwrap();
    let o = run(&["check", &path, "--cvd", "deutan", "--json"]);
    assert_eq!(String::from_utf8(lib).unwrap(), stdout(&o));
}
