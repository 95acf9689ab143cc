//! Figures: the locus and Planckian curves against published values, the
//! outline and contour geometry against independent computations, the SVG
//! structure, regression pins of each kind, a render of every kind, and the command line.

mod common;
use common::*;

use std::path::{Path, PathBuf};
use std::sync::OnceLock;

use inkfit::color::Xy;
use inkfit::gamut::Gamut;
use inkfit::icc::IccProfile;
use inkfit::plot::geometry::{self, distance_to_polygon, point_in_polygon, polygon_area};
use inkfit::plot::locus::{cct_mccamy, cmf_table, planckian_xy, spectral_locus, uv_prime};
use inkfit::plot::{self, Figure, PlotKind, Swatch};

fn profile(name: &str) -> IccProfile {
    IccProfile::load(name).expect("built-in profile")
}

fn srgb_gamut() -> &'static Gamut {
    static G: OnceLock<Gamut> = OnceLock::new();
    G.get_or_init(|| Gamut::of_profile(&profile("srgb"), Default::default()).unwrap())
}

fn press_gamut() -> &'static Gamut {
    static G: OnceLock<Gamut> = OnceLock::new();
    G.get_or_init(|| Gamut::of_profile(&profile("offset-coated"), Default::default()).unwrap())
}

fn close(a: f64, b: f64, tol: f64, what: &str) {
    assert!((a - b).abs() <= tol, "{what}: expected {b}, got {a} (tolerance {tol})");
}

// ---------------------------------------------------------------- locus

#[test]
fn locus_points_match_cie_chromaticities() {
    let locus = spectral_locus();
    assert_eq!(locus.len(), 81);
    let at = |nm: f64| locus.iter().find(|(w, _)| *w == nm).map(|(_, c)| *c).unwrap();
    // Spectrum locus chromaticities, CIE 1931 2° (CIE 015:2018 Table 11.2 /
    // the CIE data set of spectrum-locus coordinates), from memory to 4 decimals.
    for (nm, x, y) in [
        (380.0, 0.1741, 0.0050),
        (460.0, 0.1440, 0.0297),
        (500.0, 0.0082, 0.5384),
        (520.0, 0.0743, 0.8338),
        (600.0, 0.6270, 0.3725),
        (700.0, 0.7347, 0.2653),
    ] {
        let c = at(nm);
        close(c.x, x, 6e-4, &format!("x at {nm} nm"));
        close(c.y, y, 6e-4, &format!("y at {nm} nm"));
    }
    // ȳ(555 nm) = 1 defines the photopic peak (CIE 015:2018).
    let t = cmf_table().unwrap();
    let row = t.iter().find(|r| r.nm == 555.0).unwrap();
    assert_eq!(row.y_bar, 1.0);
}

#[test]
fn equal_energy_white_sums_to_one_third() {
    // The CMFs are normalised so that the equal-energy stimulus E has
    // x = y = 1/3 (CIE 015:2018, 7.3); the 5 nm table holds this to 1e-3.
    let t = cmf_table().unwrap();
    let (x, y, z) = t
        .iter()
        .fold((0.0, 0.0, 0.0), |s, r| (s.0 + r.x_bar, s.1 + r.y_bar, s.2 + r.z_bar));
    close(x / (x + y + z), 1.0 / 3.0, 1e-3, "x of E");
    close(y / (x + y + z), 1.0 / 3.0, 1e-3, "y of E");
}

#[test]
fn d65_chromaticity_and_cct() {
    // D65 at (0.3127, 0.3290) (CIE 015:2018 Table 11.3), CCT 6504 K
    // (CIE 015:2018, 11.1); McCamy's cubic reproduces it within 5 K.
    let d65 = inkfit::plot::figure::D65_XY;
    close(cct_mccamy(d65).unwrap(), 6504.0, 5.0, "McCamy CCT of D65");
    // And D65 in u′v′ is (0.1978, 0.4683) (CIE 015:2018, from memory).
    let uv = uv_prime(d65).unwrap();
    close(uv[0], 0.1978, 2e-4, "D65 u′");
    close(uv[1], 0.4683, 2e-4, "D65 v′");
}

#[test]
fn planckian_locus_matches_illuminant_a_and_mccamy() {
    // CIE illuminant A is a Planckian radiator at 2856 K with xy
    // (0.44757, 0.40745) (CIE 015:2018 Table 11.3); the 5 nm sum from
    // 380–780 nm stays within 5e-4 of it.
    let a = planckian_xy(2856.0).unwrap();
    close(a.x, 0.44757, 5e-4, "x of 2856 K");
    close(a.y, 0.40745, 5e-4, "y of 2856 K");
    // On the Planckian locus McCamy's cubic is accurate to a few kelvin from
    // 2856 to 6500 K (McCamy 1992 reports under 2 K there; 10 K allowed here
    // for the 5 nm integration).
    for t in [3000.0, 4000.0, 5000.0, 6500.0] {
        close(
            cct_mccamy(planckian_xy(t).unwrap()).unwrap(),
            t,
            10.0,
            &format!("CCT of {t} K"),
        );
    }
    assert!(planckian_xy(0.0).is_none() && planckian_xy(f64::NAN).is_none());
}

// ------------------------------------------------------------- geometry

#[test]
fn srgb_triangle_is_the_d50_adapted_primaries() {
    // The D50-adapted sRGB colorants of the ICC sRGB profile, rXYZ
    // (0.4361, 0.2225, 0.0139), gXYZ (0.3851, 0.7169, 0.0971), bXYZ
    // (0.1431, 0.0606, 0.7141) (common practice, from memory), as xy.
    let want = [
        [0.4361, 0.2225, 0.0139],
        [0.3851, 0.7169, 0.0971],
        [0.1431, 0.0606, 0.7141],
    ];
    let got = plot::primaries_xy(&profile("srgb")).unwrap();
    for (g, w) in got.iter().zip(want) {
        let s = w[0] + w[1] + w[2];
        close(g.x, w[0] / s, 1.5e-3, "primary x");
        close(g.y, w[1] / s, 1.5e-3, "primary y");
    }
}

fn xy_pts(v: &[Xy]) -> Vec<[f64; 2]> {
    v.iter().map(|c| [c.x, c.y]).collect()
}

#[test]
fn projected_outline_of_a_matrix_gamut_is_its_triangle() {
    // Independent check of the raster-and-trace method: for a matrix RGB
    // profile the projected solid is exactly the primaries' triangle.
    let tri = xy_pts(&plot::primaries_xy(&profile("srgb")).unwrap());
    let outline = xy_pts(&geometry::projected_outline(srgb_gamut().boundary(), geometry::XY_CELL));
    let (a_out, a_tri) = (polygon_area(&outline), polygon_area(&tri).abs());
    assert!(a_out > 0.0, "outline is counter-clockwise");
    close(a_out / a_tri, 1.0, 0.03, "area ratio outline / triangle");
    for c in &tri {
        assert!(
            distance_to_polygon(&outline, *c) < 0.006,
            "primary {c:?} off the outline"
        );
    }
}

#[test]
fn press_outline_holds_every_ink_combination_and_no_more() {
    // Sample the ink domain through lcms2 (an independent route: device
    // values, not the boundary mesh), within the measured ink limit.
    let p = profile("offset-coated");
    let g = press_gamut();
    let limit = g.ink_limit.unwrap().percent;
    let lab = inkfit::icc::transform::lab_d50_profile();
    let t: lcms2::Transform<[f64; 4], [f64; 3]> = lcms2::Transform::new(
        &p.lcms,
        lcms2::PixelFormat::CMYK_DBL,
        &lab,
        lcms2::PixelFormat::Lab_DBL,
        lcms2::Intent::RelativeColorimetric,
    )
    .unwrap();
    let steps: Vec<f64> = (0..=10).map(|k| k as f64 * 10.0).collect();
    let mut cmyk = Vec::new();
    for &c in &steps {
        for &m in &steps {
            for &y in &steps {
                for &k in &steps[..6] {
                    if c + m + y + k <= limit {
                        cmyk.push([c, m, y, k]);
                    }
                }
            }
        }
    }
    let mut out = vec![[0.0; 3]; cmyk.len()];
    t.transform_pixels(&cmyk, &mut out);
    let samples: Vec<[f64; 2]> = out
        .iter()
        .filter_map(|l| geometry::lab_to_xy(*l))
        .map(|c| [c.x, c.y])
        .collect();
    let outline = xy_pts(&geometry::projected_outline(g.boundary(), geometry::XY_CELL));
    assert!(outline.len() > 6, "a CMYK outline is not a triangle");
    for s in &samples {
        assert!(
            point_in_polygon(&outline, *s) || distance_to_polygon(&outline, *s) < 0.008,
            "sample {s:?} outside"
        );
    }
    // No more: every outline corner lies near some sampled colour.
    let far = outline
        .iter()
        .map(|o| {
            samples
                .iter()
                .map(|s| (s[0] - o[0]).hypot(s[1] - o[1]))
                .fold(f64::INFINITY, f64::min)
        })
        .fold(0.0, f64::max);
    assert!(far < 0.02, "outline reaches {far} beyond the sampled colours");
}

#[test]
fn slice_of_srgb_matches_dense_inside_test() {
    // The L* = 50 section of the sRGB mesh against an independent count:
    // a*b* grid points whose sRGB (CSS Color 4 conversion) lies in the cube.
    let contours = geometry::lightness_slice(srgb_gamut().boundary(), 50.0);
    assert_eq!(contours.len(), 1, "one closed loop at L* 50");
    let c = &contours[0];
    assert_eq!(c.first(), c.last(), "the loop closes");
    let area = polygon_area(c).abs();
    let mut count = 0;
    for i in -120..=120 {
        for j in -120..=120 {
            let lab = inkfit::color::LabD50::new(50.0, i as f64, j as f64);
            let rgb = inkfit::color::spaces::lab_d50_to_srgb_unclamped(lab);
            if rgb.iter().all(|v| (0.0..=1.0).contains(v)) {
                count += 1;
            }
        }
    }
    close(area / count as f64, 1.0, 0.03, "slice area / dense count");
}

#[test]
fn leaf_of_srgb_reaches_the_blue_primary() {
    // sRGB blue is CIELAB D50 (29.57, 68.30, −112.03) (CSS Color 4 sample
    // conversions, from memory): at its hue the leaf must pass near it.
    let lch = inkfit::color::LabD50::new(29.57, 68.30, -112.03).to_lch();
    let leaf = geometry::hue_leaf(srgb_gamut().boundary(), lch.h);
    let near = leaf
        .iter()
        .flatten()
        .map(|p| (p[0] - lch.c).hypot(p[1] - lch.l))
        .fold(f64::INFINITY, f64::min);
    assert!(near < 2.0, "leaf passes {near} from the blue primary");
}

// ------------------------------------------------------------------ SVG

fn demo_swatches() -> Vec<Swatch> {
    vec![
        // A colour outside the press: sRGB-like green; a neutral inside.
        Swatch {
            name: "Fen".into(),
            screen_lab: [60.0, -60.0, 50.0],
            printed_lab: Some([58.0, -48.0, 40.0]),
            in_gamut: Some(false),
        },
        Swatch {
            name: "Moor".into(),
            screen_lab: [50.0, 10.0, 12.0],
            printed_lab: Some([50.0, 10.0, 12.0]),
            in_gamut: Some(true),
        },
        Swatch {
            name: "Tarn".into(),
            screen_lab: [30.0, 10.0, -45.0],
            printed_lab: Some([31.0, 9.0, -40.0]),
            in_gamut: Some(true),
        },
    ]
}

fn figure(kind: PlotKind, names: &[&str]) -> Figure {
    let profiles: Vec<IccProfile> = names.iter().map(|n| profile(n)).collect();
    let layers = profiles
        .iter()
        .map(|p| {
            let g = match p.name.as_str() {
                "srgb" => Some(srgb_gamut()),
                "offset-coated" => Some(press_gamut()),
                _ => None,
            };
            plot::layer_for(kind, p, g, &[50.0, 70.0], 250.0).unwrap()
        })
        .collect();
    Figure {
        kind,
        layers,
        swatches: demo_swatches(),
        lightness: vec![50.0, 70.0],
        hue: 250.0,
        mapping: Some("relative colorimetric with black point compensation onto offset-coated".into()),
        collapsed: Vec::new(),
    }
}

fn parse(doc: &str) -> roxmltree::Document<'_> {
    roxmltree::Document::parse(doc).unwrap_or_else(|e| panic!("not XML: {e}"))
}

fn by_class<'a>(d: &'a roxmltree::Document, class: &str) -> Vec<roxmltree::Node<'a, 'a>> {
    d.descendants()
        .filter(|n| n.attribute("class").is_some_and(|c| c.split(' ').any(|w| w == class)))
        .collect()
}

#[test]
fn xy_figure_structure() {
    let doc = plot::render(&figure(PlotKind::Xy, &["srgb", "offset-coated"]));
    let d = parse(&doc);
    let locus = d
        .descendants()
        .find(|n| n.attribute("id") == Some("spectral-locus"))
        .expect("locus path");
    // 81 table points: one M and 80 L commands.
    assert_eq!(locus.attribute("d").unwrap().matches('L').count(), 80);
    for id in [
        "purple-line",
        "planckian-locus",
        "white-d50",
        "white-d65",
        "title",
        "caption",
        "legend",
        "background",
    ] {
        assert!(d.descendants().any(|n| n.attribute("id") == Some(id)), "missing #{id}");
    }
    let legend: Vec<_> = by_class(&d, "legend-entry")
        .iter()
        .map(|n| n.attribute("data-profile").unwrap().to_string())
        .collect();
    assert_eq!(legend, ["srgb", "offset-coated"]);
    assert_eq!(by_class(&d, "profile-outline").len(), 2);
    let swatches: Vec<_> = by_class(&d, "swatch")
        .iter()
        .map(|n| n.attribute("data-name").unwrap().to_string())
        .collect();
    assert_eq!(
        swatches,
        ["Fen", "Moor", "Tarn"],
        "one marker per palette entry, in order"
    );
    assert_eq!(
        by_class(&d, "swatch-marker").len() - by_class(&d, "legend-key").len() + 1,
        3
    );
    let outs = d
        .descendants()
        .filter(|n| n.attribute("class") == Some("swatch-marker out"))
        .count();
    assert_eq!(outs, 2, "the out-of-gamut swatch and its legend key");
    assert!(by_class(&d, "shift-arrow").len() >= 2, "arrows for shifted colours");
    let labels: Vec<_> = by_class(&d, "wavelength-label")
        .iter()
        .map(|n| n.attribute("data-nm").unwrap().to_string())
        .collect();
    assert_eq!(labels, ["460", "480", "500", "520", "540", "560", "580", "600", "620"]);
    // Two different dash patterns for the two profiles.
    let dashes: Vec<_> = by_class(&d, "profile-outline")
        .iter()
        .map(|n| n.attribute("stroke-dasharray").unwrap_or("none").to_string())
        .collect();
    assert_ne!(dashes[0], dashes[1]);
    let caption: String = by_class(&d, "caption-line")
        .iter()
        .filter_map(|n| n.text())
        .collect::<Vec<_>>()
        .join(" ");
    assert!(
        caption.contains("D50") && caption.contains("relative colorimetric") && caption.contains("not the colours"),
        "{caption}"
    );
    // Deterministic.
    assert_eq!(doc, plot::render(&figure(PlotKind::Xy, &["srgb", "offset-coated"])));
}

#[test]
fn ab_and_leaf_structure() {
    let doc = plot::render(&figure(PlotKind::Ab, &["srgb", "offset-coated"]));
    let d = parse(&doc);
    let slices: Vec<_> = by_class(&d, "slice")
        .iter()
        .map(|n| n.attribute("data-lightness").unwrap().to_string())
        .collect();
    assert_eq!(slices, ["50.0", "70.0"]);
    for l in ["50.0", "70.0"] {
        for p in ["srgb", "offset-coated"] {
            assert!(
                by_class(&d, "slice-contour")
                    .iter()
                    .any(|n| n.attribute("data-profile") == Some(p)
                        && n.parent()
                            .and_then(|g| g.parent())
                            .and_then(|s| s.attribute("data-lightness"))
                            == Some(l)),
                "contour of {p} at L* {l}"
            );
        }
    }
    // Only the swatches within ±5 L* of a slice: Moor on L* 50.
    let names: Vec<_> = by_class(&d, "swatch")
        .iter()
        .map(|n| n.attribute("data-name").unwrap().to_string())
        .collect();
    assert_eq!(names, ["Moor"]);

    let doc = plot::render(&figure(PlotKind::Leaf, &["srgb", "offset-coated"]));
    let d = parse(&doc);
    assert_eq!(by_class(&d, "legend-entry").len(), 2);
    assert!(by_class(&d, "leaf-contour").len() >= 2);
    // Tarn (h ≈ 282.5°) is beyond ±15° of 250°; none of the demo swatches shows.
    let tarn_h = inkfit::color::LabD50::new(30.0, 10.0, -45.0).to_lch().h;
    assert!((tarn_h - 250.0).abs() > 15.0);
    assert!(by_class(&d, "swatch").is_empty());
}

/// Golden comparison after normalising: line endings and trailing space
/// are ignored, and numbers may differ by up to 0.15 (one step of the 0.1 px
/// precision, so a last-digit rounding flip on another platform passes).
fn tokens(line: &str) -> Vec<Result<f64, String>> {
    let mut out = Vec::new();
    let mut cur = String::new();
    let mut in_num = false;
    for ch in line.chars() {
        let numeric = ch.is_ascii_digit() || ch == '.' || (ch == '-' && !in_num);
        if numeric != in_num && !cur.is_empty() {
            out.push(if in_num {
                cur.parse::<f64>().map_err(|_| cur.clone())
            } else {
                Err(cur.clone())
            });
            cur.clear();
        }
        in_num = numeric;
        cur.push(ch);
    }
    if !cur.is_empty() {
        out.push(if in_num {
            cur.parse::<f64>().map_err(|_| cur.clone())
        } else {
            Err(cur)
        });
    }
    out
}

fn same_line(a: &str, b: &str) -> bool {
    let (ta, tb) = (tokens(a.trim_end()), tokens(b.trim_end()));
    ta.len() == tb.len()
        && ta.iter().zip(&tb).all(|(x, y)| match (x, y) {
            (Ok(x), Ok(y)) => (x - y).abs() <= 0.15,
            (x, y) => x == y,
        })
}

/// Compares `doc` with the regression pin `tests/regression-pins/NAME`: the
/// program's own earlier output, kept so that a change to a figure is seen
/// and looked at, not a reference from outside. After a deliberate change,
/// regenerate every pin with
/// `INKFIT_UPDATE_PINS=1 cargo test --test plot regression_pins`, render the
/// SVGs to PNG and look at them before committing.
fn regression_pin(name: &str, doc: &str) {
    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/regression-pins")
        .join(name);
    if std::env::var_os("INKFIT_UPDATE_PINS").is_some() {
        std::fs::create_dir_all(path.parent().unwrap()).unwrap();
        std::fs::write(&path, doc).unwrap();
    }
    let want = std::fs::read_to_string(&path)
        .unwrap_or_else(|e| panic!("{}: {e} (set INKFIT_UPDATE_PINS=1 to create)", path.display()));
    let (w, g): (Vec<&str>, Vec<&str>) = (want.lines().collect(), doc.lines().collect());
    if let Some(k) = (0..w.len().max(g.len())).find(|&k| match (w.get(k), g.get(k)) {
        (Some(a), Some(b)) => !same_line(a, b),
        _ => true,
    }) {
        panic!(
            "{name} differs from its regression pin at line {}:\n  want: {}\n  got:  {}",
            k + 1,
            w.get(k).unwrap_or(&"<end>"),
            g.get(k).unwrap_or(&"<end>")
        );
    }
}

#[test]
fn regression_pin_comparison_tolerates_only_last_digit_flips() {
    assert!(same_line(
        "<line x1=\"12.3\" y1=\"-4.5\"/>",
        "<line x1=\"12.4\" y1=\"-4.5\"/>  "
    ));
    assert!(!same_line("<line x1=\"12.3\"/>", "<line x1=\"12.6\"/>"));
    assert!(!same_line("<line x1=\"12.3\"/>", "<path x1=\"12.3\"/>"));
    assert!(!same_line("M1.0 2.0", "M1.0 2.0 L3.0 4.0"));
}

fn small_figure(kind: PlotKind) -> Figure {
    // Matrix RGB only (fast: the xy outlines need no gamut solid), and for
    // the slice and the leaf one profile and one level.
    if kind.is_chromaticity() {
        figure(kind, &["srgb", "display-p3"])
    } else {
        let mut f = figure(kind, &["srgb"]);
        f.lightness.truncate(1);
        for l in &mut f.layers {
            l.slices.truncate(1);
        }
        f
    }
}

#[test]
fn regression_pins_per_kind() {
    for kind in PlotKind::ALL {
        regression_pin(&format!("{}.svg", kind.key()), &plot::render(&small_figure(kind)));
    }
}

#[test]
fn every_kind_renders_to_a_non_empty_png() {
    let dump = std::env::var_os("INKFIT_PLOT_PNG_DIR").map(PathBuf::from);
    for kind in PlotKind::ALL {
        let doc = plot::render(&figure(kind, &["srgb", "offset-coated"]));
        let tree = resvg::usvg::Tree::from_str(&doc, &resvg::usvg::Options::default())
            .unwrap_or_else(|e| panic!("{}: {e}", kind.key()));
        let size = tree.size().to_int_size();
        let mut pix = resvg::tiny_skia::Pixmap::new(size.width(), size.height()).unwrap();
        resvg::render(&tree, resvg::tiny_skia::Transform::default(), &mut pix.as_mut());
        // Non-empty: some pixels are dark (lines), some tinted or white.
        let data = pix.data();
        let dark = data
            .chunks(4)
            .filter(|p| p[3] > 200 && p[0] < 80 && p[1] < 80 && p[2] < 80)
            .count();
        let light = data.chunks(4).filter(|p| p[3] > 200 && p[0] > 200).count();
        assert!(
            dark > 300 && light > 10000,
            "{}: dark {dark}, light {light}",
            kind.key()
        );
        if let Some(dir) = &dump {
            pix.save_png(dir.join(format!("{}.png", kind.key()))).unwrap();
        }
    }
}

// ------------------------------------------------------------------ CLI

#[test]
fn cli_plot_writes_each_kind() {
    let dir = tempfile::tempdir().unwrap();
    let palette = demo("landuse.csv");
    for kind in ["xy", "uv", "ab", "leaf"] {
        let out = dir.path().join(format!("{kind}.svg"));
        let o = run(&[
            "plot",
            kind,
            "--out",
            out.to_str().unwrap(),
            "--profile",
            "srgb",
            "--profile",
            "offset-coated",
            "--palette",
            &palette,
            "--press",
            "offset-coated",
            "--lightness",
            "40,60",
            "--hue",
            "150",
        ]);
        assert_eq!(
            o.status.code(),
            Some(0),
            "{kind}: {}",
            String::from_utf8_lossy(&o.stderr)
        );
        let doc = std::fs::read_to_string(&out).unwrap();
        let d = parse(&doc);
        assert_eq!(by_class(&d, "legend-entry").len(), 2, "{kind}");
        if kind == "xy" || kind == "uv" {
            // Nine land-use classes in the demo palette.
            assert_eq!(by_class(&d, "swatch").len(), 9, "{kind}");
        }
    }
    let names: Vec<_> = std::fs::read_dir(dir.path())
        .unwrap()
        .map(|e| e.unwrap().file_name().into_string().unwrap())
        .collect();
    assert_eq!(names.len(), 4, "no temporary files left: {names:?}");
}

#[test]
fn cli_plot_bad_input_is_exit_2() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("f.svg");
    let o = out.to_str().unwrap();
    assert_error(
        &run(&["plot", "pie", "--out", o, "--profile", "srgb"]),
        &["pie", "xy, uv, ab or leaf"],
    );
    assert_error(&run(&["plot", "xy", "--out", o]), &["--profile"]);
    assert_error(
        &run(&["plot", "ab", "--out", o, "--profile", "srgb", "--lightness", "50,120"]),
        &["--lightness", "0 and 100"],
    );
    assert_error(
        &run(&["plot", "ab", "--out", o, "--profile", "srgb", "--lightness", "x"]),
        &["--lightness"],
    );
    assert_error(
        &run(&["plot", "leaf", "--out", o, "--profile", "srgb", "--hue", "400"]),
        &["--hue", "360"],
    );
    assert_error(
        &run(&["plot", "leaf", "--out", o, "--profile", "srgb", "--hue=-5"]),
        &["--hue"],
    );
    assert_error(
        &run(&["plot", "xy", "--out", o, "--profile", "no-such.icc"]),
        &["no-such.icc"],
    );
    assert_error(
        &run(&[
            "plot",
            "xy",
            "--out",
            dir.path().join("f.png").to_str().unwrap(),
            "--profile",
            "srgb",
        ]),
        &["f.png", ".svg"],
    );
    assert!(!out.exists(), "nothing written on bad input");
}

#[test]
fn cli_check_and_gamut_write_their_figures() {
    let dir = tempfile::tempdir().unwrap();
    let xy = dir.path().join("check.svg");
    let o = run(&["check", &demo("landuse.csv"), "--svg", xy.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(0), "{}", String::from_utf8_lossy(&o.stderr));
    let doc = std::fs::read_to_string(&xy).unwrap();
    let d = parse(&doc);
    let legend: Vec<_> = by_class(&d, "legend-entry")
        .iter()
        .map(|n| n.attribute("data-profile").unwrap().to_string())
        .collect();
    assert_eq!(legend, ["srgb", "offset-coated"]);
    assert_eq!(by_class(&d, "swatch").len(), 9, "one marker per land-use class");
    // The demo's industrial magenta is out of the press gamut (README demo).
    let industry = by_class(&d, "swatch")
        .into_iter()
        .find(|n| n.attribute("data-name") == Some("Industry"))
        .unwrap();
    assert!(industry
        .descendants()
        .any(|n| n.attribute("class") == Some("swatch-marker out")));
    assert!(industry
        .descendants()
        .any(|n| n.attribute("class") == Some("shift-arrow")));

    let ab = dir.path().join("gamut.svg");
    let o = run(&["gamut", "srgb", "display-p3", "--svg", ab.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(0), "{}", String::from_utf8_lossy(&o.stderr));
    let doc = std::fs::read_to_string(&ab).unwrap();
    let d = parse(&doc);
    let slices: Vec<_> = by_class(&d, "slice")
        .iter()
        .map(|n| n.attribute("data-lightness").unwrap().to_string())
        .collect();
    assert_eq!(slices, ["25.0", "50.0", "75.0"]);
    assert_eq!(by_class(&d, "legend-entry").len(), 2);

    let bad = dir.path().join("gamut.txt");
    assert_error(
        &run(&["gamut", "srgb", "--svg", bad.to_str().unwrap()]),
        &["gamut.txt", ".svg"],
    );
    assert_error(
        &run(&["check", &demo("landuse.csv"), "--svg", bad.to_str().unwrap()]),
        &["gamut.txt", ".svg"],
    );
}

#[test]
fn legends_name_a_profile_file_by_its_description_not_its_path() {
    // A profile file deep in folders: the legend shows the profile's own
    // description (its desc tag, as `inspect` prints it), shortened in the
    // middle, never the path.
    let dir = tempfile::tempdir().unwrap();
    let deep = dir.path().join("clients/tarrowmere/atlas-2026/press-profiles");
    std::fs::create_dir_all(&deep).unwrap();
    let icc = deep.join("offset-coated-copy.icc");
    std::fs::copy("profiles/offset-coated.icc", &icc).unwrap();
    let out = dir.path().join("xy.svg");
    let o = run(&[
        "plot",
        "xy",
        "--profile",
        &icc.display().to_string(),
        "--out",
        &out.display().to_string(),
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let svg = std::fs::read_to_string(&out).unwrap();
    let desc = stdout(&run(&["inspect", &icc.display().to_string(), "--json"]));
    let desc: serde_json::Value = serde_json::from_str(&desc).unwrap();
    let desc = desc["description"]
        .as_str()
        .or_else(|| desc[0]["description"].as_str())
        .unwrap()
        .to_string();
    let legend = &svg[svg.find("id=\"legend\"").unwrap()..];
    let entry = &legend[legend.find("legend-entry").unwrap()..];
    let first_text = &entry[entry.find("<text").unwrap()..];
    let shown = &first_text[first_text.find('>').unwrap() + 1..first_text.find("</text>").unwrap()];
    assert!(!shown.contains("clients/"), "the legend shows the path: {shown}");
    let label = shown.split(" — ").next().unwrap();
    assert!(label.chars().count() <= inkfit::plot::LEGEND_LABEL_CHARS, "{label}");
    let (head, tail) = label.split_once('…').expect("a long description is cut in the middle");
    assert!(
        desc.starts_with(head) && desc.ends_with(tail),
        "{label} is not {desc} shortened"
    );
}
