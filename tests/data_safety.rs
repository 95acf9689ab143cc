//! Regression tests for a user's files and for bad input: no writer replaces
//! an input or anything but a regular file, several outputs appear all or
//! none, repair keeps the palette's own shape, colours that convert to no
//! finite number are errors, every error is one line, and `check` has one
//! verdict that agrees with `--strict`.

mod common;

use std::fs;
use std::path::{Path, PathBuf};

use common::{assert_error, demo, json, listing, run, stderr, stdout, verdict_reasons};

fn copy_demo(dir: &Path, name: &str) -> PathBuf {
    let p = dir.join(name);
    fs::copy(demo(name), &p).unwrap();
    p
}

fn s(p: &Path) -> &str {
    p.to_str().unwrap()
}

#[test]
fn repair_out_onto_its_own_palette_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let p = copy_demo(dir.path(), "landuse.csv");
    let before = fs::read(&p).unwrap();
    let o = run(&["repair", s(&p), "--out", s(&p)]);
    assert_error(&o, &["landuse.csv", "overwrite the input"]);
    assert_eq!(fs::read(&p).unwrap(), before);
    // The same file by another path: a hard link.
    let link = dir.path().join("again.csv");
    fs::hard_link(&p, &link).unwrap();
    assert_error(
        &run(&["repair", s(&p), "--out", s(&link)]),
        &["again.csv", "overwrite the input"],
    );
    assert_eq!(fs::read(&p).unwrap(), before);
    assert_eq!(listing(dir.path()), ["again.csv", "landuse.csv"]);
}

#[test]
fn check_svg_onto_its_palette_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    // SVG artwork is a palette too: the figure may not replace it.
    let p = dir.path().join("palette.svg");
    let art = "<svg xmlns='http://www.w3.org/2000/svg'><rect width='1' height='1' fill='#2f6b3a'/></svg>\n";
    fs::write(&p, art).unwrap();
    assert_error(
        &run(&["check", s(&p), "--svg", s(&p)]),
        &["palette.svg", "overwrite the input"],
    );
    assert_eq!(fs::read_to_string(&p).unwrap(), art);
}

#[test]
fn plot_and_gamut_never_write_over_a_profile_they_read() {
    let dir = tempfile::tempdir().unwrap();
    let icc = dir.path().join("screen.svg");
    let bytes = lcms2::Profile::new_srgb().icc().unwrap();
    fs::write(&icc, &bytes).unwrap();
    assert_error(
        &run(&["plot", "xy", "--profile", s(&icc), "--out", s(&icc)]),
        &["screen.svg", "overwrite the input"],
    );
    let mesh = dir.path().join("screen.ply");
    fs::write(&mesh, &bytes).unwrap();
    assert_error(
        &run(&["gamut", s(&mesh), "--mesh", s(&mesh)]),
        &["screen.ply", "overwrite the input"],
    );
    assert_eq!(fs::read(&icc).unwrap(), bytes);
    assert_eq!(fs::read(&mesh).unwrap(), bytes);
}

#[test]
#[cfg(unix)]
fn only_regular_files_are_replaced() {
    let dir = tempfile::tempdir().unwrap();
    let p = copy_demo(dir.path(), "landuse.csv");
    // A character device: /dev/null must stay a device.
    assert_error(
        &run(&["repair", s(&p), "--out", "/dev/null"]),
        &["/dev/null", "character device"],
    );
    assert!(!fs::metadata("/dev/null").unwrap().is_file());
    // A FIFO.
    let fifo = dir.path().join("pipe.csv");
    let made = std::process::Command::new("mkfifo").arg(&fifo).status().unwrap();
    assert!(made.success());
    assert_error(&run(&["repair", s(&p), "--out", s(&fifo)]), &["pipe.csv", "FIFO"]);
    {
        use std::os::unix::fs::FileTypeExt;
        assert!(fs::symlink_metadata(&fifo).unwrap().file_type().is_fifo());
    }
    // A folder.
    let folder = dir.path().join("figures.svg");
    fs::create_dir(&folder).unwrap();
    assert_error(
        &run(&["check", s(&p), "--svg", s(&folder)]),
        &["figures.svg", "a folder"],
    );
}

#[test]
fn an_output_that_cannot_be_written_leaves_no_other_output() {
    let dir = tempfile::tempdir().unwrap();
    let blocker = dir.path().join("file");
    fs::write(&blocker, "x").unwrap();
    let mesh = dir.path().join("m.ply");
    // The mesh could be written, the figure cannot (its folder is a file).
    let bad_svg = blocker.join("slices.svg");
    let o = run(&["gamut", "srgb", "--mesh", s(&mesh), "--svg", s(&bad_svg)]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert_eq!(stderr(&o).lines().count(), 1, "{}", stderr(&o));
    assert_eq!(listing(dir.path()), ["file"], "the mesh was left behind");
}

#[test]
fn repair_keeps_columns_extra_fields_and_comments() {
    let dir = tempfile::tempdir().unwrap();
    let p = copy_demo(dir.path(), "landuse.csv");
    let out = dir.path().join("fixed.csv");
    let o = run(&["repair", s(&p), "--out", s(&out)]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let original = fs::read_to_string(&p).unwrap();
    let fixed = fs::read_to_string(&out).unwrap();
    let mut rows = fixed.lines();
    assert_eq!(rows.next(), Some("class,color,note,press_cmyk"));
    // Every original row keeps its class and note; only the colour changes.
    for (orig, new) in original.lines().skip(1).zip(rows) {
        let a: Vec<&str> = orig.split(',').collect();
        let b: Vec<&str> = new.split(',').collect();
        assert_eq!((a[0], a[2]), (b[0], b[2]), "{orig} → {new}");
        assert!(b[3].starts_with("device-cmyk("), "{new}");
    }
    // A text palette keeps its comments, blank lines and names.
    let t = copy_demo(dir.path(), "density.txt");
    let tout = dir.path().join("fixed.txt");
    assert_eq!(run(&["repair", s(&t), "--out", s(&tout)]).status.code(), Some(0));
    let orig_text = fs::read_to_string(&t).unwrap();
    let fixed_text = fs::read_to_string(&tout).unwrap();
    for line in orig_text.lines().filter(|l| l.trim().is_empty() || l.starts_with("# ")) {
        assert!(
            fixed_text.lines().any(|f| f == line),
            "lost line {line:?}:\n{fixed_text}"
        );
    }
    // What repair wrote reads back as a palette.
    let back = run(&["check", s(&tout), "--json"]);
    assert_eq!(back.status.code(), Some(0), "{}", stderr(&back));
}

#[test]
fn colours_that_convert_to_no_finite_number_are_errors() {
    let dir = tempfile::tempdir().unwrap();
    for (k, bad) in [
        "lab(1e308 1e308 0)",
        "oklch(1 1e308 1e308)",
        "color(srgb 1e200 0 0)",
        "lch(50 1e300 30)",
    ]
    .into_iter()
    .enumerate()
    {
        let p = dir.path().join(format!("huge{k}.txt"));
        fs::write(&p, format!("#336699 fine\n{bad} huge\n")).unwrap();
        let o = run(&["check", s(&p)]);
        assert_error(&o, &[&format!("huge{k}.txt"), "line 2"]);
        assert!(!stdout(&o).contains("NaN"));
        assert_error(&run(&["delta", bad, "#336699"]), &["describe no colour"]);
    }
}

#[test]
fn outside_by_is_a_number_with_the_boundary_test_and_absent_with_the_round_trip() {
    let v = json(&run(&["check", &demo("landuse.csv"), "--json"]));
    for e in v["entries"].as_array().unwrap() {
        let d = e["outside_by"].as_f64().expect("a number for every entry");
        assert!(d.is_finite() && d >= 0.0);
        // Inside means within ΔE00 1.0 of the gamut (the README's edge tolerance).
        assert_eq!(e["in_gamut"].as_bool().unwrap(), d <= 1.0, "{e}");
    }
    let v = json(&run(&[
        "check",
        &demo("landuse.csv"),
        "--json",
        "--gamut-test",
        "round-trip",
    ]));
    for e in v["entries"].as_array().unwrap() {
        assert!(e.get("outside_by").is_none(), "{e}");
    }
}

#[test]
fn option_errors_are_one_line() {
    let p = demo("landuse.csv");
    assert_error(&run(&["check", &p, "--tolerance", "-1"]), &["--tolerance", "-1"]);
    assert_error(&run(&["check", &p, "--intent", "sideways"]), &["sideways", "relative"]);
    assert_error(&run(&["check"]), &["PALETTE", "inkfit check --help"]);
    assert_error(&run(&["check", &p, "--no-such-option"]), &["--no-such-option"]);
    assert_error(&run(&["no-such-command"]), &["no-such-command"]);
    assert_error(&run(&["check", &p, "--min-separation", "-3"]), &["--min-separation"]);
    let help = run(&["check", "--help"]);
    assert_eq!(help.status.code(), Some(0));
    assert!(stdout(&help).contains("--tolerance"));
}

#[test]
fn check_has_one_verdict_that_agrees_with_strict() {
    // The demo land-use palette separates well but three colours shift
    // beyond ΔE00 3.0: the palette analysis passes, the verdict does not.
    let p = demo("landuse.csv");
    let v = json(&run(&["check", &p, "--json"]));
    assert_eq!(v["survival_passes"], true);
    assert_eq!(v["verdict"]["passes"], false);
    assert!(v.get("passes").is_none(), "no unqualified 'passes' key");
    let kinds = verdict_reasons(&v);
    assert!(kinds.iter().any(|k| k == "tolerance"), "{kinds:?}");
    assert_eq!(run(&["check", &p, "--strict"]).status.code(), Some(1));
    let text = stdout(&run(&["check", &p]));
    assert!(
        text.trim_end().lines().last().unwrap().starts_with("verdict: fails"),
        "{text}"
    );

    // A palette that passes everything: verdict passes, --strict exits 0.
    let dir = tempfile::tempdir().unwrap();
    let good = dir.path().join("good.txt");
    fs::write(&good, "#98c46a Pasture\n#a68a78 Heath\n#f2e27a Arable\n").unwrap();
    let v = json(&run(&["check", s(&good), "--json"]));
    assert_eq!(v["verdict"]["passes"], true, "{}", v["verdict"]);
    assert_eq!(run(&["check", s(&good), "--strict"]).status.code(), Some(0));
    let text = stdout(&run(&["check", s(&good)]));
    assert!(text.trim_end().ends_with("every palette check holds)"), "{text}");
}

#[test]
fn palettes_are_read_within_bounds() {
    let dir = tempfile::tempdir().unwrap();
    assert_error(&run(&["check", "/dev/zero"]), &["/dev/zero", "larger than"]);
    assert_error(&run(&["check", s(dir.path())]), &["folder"]);
    let many = dir.path().join("many.txt");
    let text: String = (0..10_001).map(|i| format!("#{:06x}\n", i * 1_000)).collect();
    fs::write(&many, text).unwrap();
    assert_error(
        &run(&["check", s(&many)]),
        &["many.txt", "10001 entries", "up to 10000"],
    );
    let bad_utf8 = dir.path().join("bytes.txt");
    fs::write(&bad_utf8, b"#112233\n#445566 \xff\xfe\n").unwrap();
    assert_error(&run(&["check", s(&bad_utf8)]), &["bytes.txt", "line 2", "UTF-8"]);
}
