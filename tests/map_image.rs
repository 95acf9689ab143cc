//! Map images read as palettes: class colours, their shares and the borders
//! between them, on constructed rasters whose classes and borders are known
//! by construction; the map-aware separation rule, from a map image and from
//! an adjacency file; bad map input refused cleanly.

mod common;
use common::*;

use std::path::Path;

use image::codecs::png::PngEncoder;
use image::{ExtendedColorType, ImageEncoder};
use inkfit::swatch::adjacency::parse_adjacency;
use inkfit::swatch::map_raster::{find_classes, MapClasses, MIN_BORDER_PX};
use inkfit::swatch::{Format, Palette};

const A: [u8; 3] = [200, 40, 40];
const B: [u8; 3] = [40, 160, 60];
const C: [u8; 3] = [40, 60, 200];
const D: [u8; 3] = [230, 210, 60];

/// An image painted by `f(x, y)`.
fn paint(w: usize, h: usize, f: impl Fn(usize, usize) -> [u8; 3]) -> Vec<u8> {
    let mut v = Vec::with_capacity(w * h * 3);
    for y in 0..h {
        for x in 0..w {
            v.extend(f(x, y));
        }
    }
    v
}

fn mix(p: [u8; 3], q: [u8; 3], t: f64) -> [u8; 3] {
    [0, 1, 2].map(|i| (f64::from(p[i]) * (1.0 - t) + f64::from(q[i]) * t).round() as u8)
}

fn classes(w: usize, h: usize, rgb: &[u8]) -> MapClasses {
    find_classes(w, h, rgb, &|_| Some(true), 0.0005).unwrap()
}

fn index(m: &MapClasses, c: [u8; 3]) -> usize {
    m.classes
        .iter()
        .position(|k| k.rgb == c)
        .unwrap_or_else(|| panic!("{c:?} is no class"))
}

fn border(m: &MapClasses, p: [u8; 3], q: [u8; 3]) -> u64 {
    let (i, j) = (index(m, p), index(m, q));
    m.borders.get(&(i.min(j), i.max(j))).copied().unwrap_or(0)
}

fn write_png(path: &Path, w: u32, h: u32, data: &[u8], kind: ExtendedColorType) {
    let mut bytes = Vec::new();
    PngEncoder::new(&mut bytes).write_image(data, w, h, kind).unwrap();
    std::fs::write(path, bytes).unwrap();
}

#[test]
fn two_halves_share_a_border_as_long_as_the_image_is_high() {
    // By construction: columns 0..30 are A, 30..60 are B, 40 rows; the
    // border is 40 pixel edges and each class holds half.
    let (w, h) = (60, 40);
    let m = classes(w, h, &paint(w, h, |x, _| if x < 30 { A } else { B }));
    assert_eq!(m.classes.len(), 2);
    assert_eq!(border(&m, A, B), 40);
    for c in [A, B] {
        assert_eq!(m.share(index(&m, c)), 0.5);
    }
    assert_eq!(m.unclassified_share(), 0.0);
}

#[test]
fn anti_aliasing_blends_are_not_classes_and_split_between_their_classes() {
    // Stripes A | B | C, 20 columns each, with a one-pixel blend column
    // (50 % mix, as a renderer draws a border through a pixel's middle)
    // between A and B and between B and C. A and C never meet.
    let (w, h) = (62, 30);
    let img = paint(w, h, |x, _| match x {
        0..20 => A,
        20 => mix(A, B, 0.5),
        21..41 => B,
        41 => mix(B, C, 0.5),
        _ => C,
    });
    let m = classes(w, h, &img);
    assert_eq!(m.classes.len(), 3, "the blends are no classes: {:?}", m.classes);
    // The blend column goes to one of its two classes whole, so the border
    // stays one edge per row.
    assert_eq!(border(&m, A, B), 30);
    assert_eq!(border(&m, B, C), 30);
    assert_eq!(border(&m, A, C), 0);
    // Every pixel belongs to a class once the blends are shared out.
    assert_eq!(m.classes.iter().map(|c| c.pixels).sum::<u64>(), (w * h) as u64);
    assert_eq!(m.unclassified_share(), 0.0);
}

#[test]
fn a_wider_blend_band_is_shared_by_nearest_colour() {
    // A two-pixel band from A to B (¼ and ¾ mixes): the pixel nearer A in
    // colour goes to A, the other to B.
    let (w, h) = (42, 10);
    let img = paint(w, h, |x, _| match x {
        0..20 => A,
        20 => mix(A, B, 0.25),
        21 => mix(A, B, 0.75),
        _ => B,
    });
    let m = classes(w, h, &img);
    assert_eq!(m.classes.len(), 2);
    assert_eq!(m.classes[index(&m, A)].pixels, 21 * 10);
    assert_eq!(m.classes[index(&m, B)].pixels, 21 * 10);
    assert_eq!(border(&m, A, B), 10);
}

#[test]
fn a_diagonal_border_counts_its_pixel_edges() {
    // A below the diagonal y > x, B on and above it, N × N: the staircase
    // between them has N − 1 vertical and N − 1 horizontal edges, √2 times
    // the diagonal's length as 4-neighbour edges count it.
    let n = 50;
    let m = classes(n, n, &paint(n, n, |x, y| if y > x { A } else { B }));
    assert_eq!(border(&m, A, B), 2 * (n as u64 - 1));
}

#[test]
fn classes_meeting_at_a_corner_only_do_not_touch() {
    // Four quadrants A B / C D: A–B, A–C, B–D and C–D share borders of 20
    // edges; A–D and B–C meet at one point.
    let n = 40;
    let img = paint(n, n, |x, y| match (x < 20, y < 20) {
        (true, true) => A,
        (false, true) => B,
        (true, false) => C,
        (false, false) => D,
    });
    let m = classes(n, n, &img);
    for (p, q) in [(A, B), (A, C), (B, D), (C, D)] {
        assert_eq!(border(&m, p, q), 20);
    }
    assert!(border(&m, A, D) < MIN_BORDER_PX && border(&m, B, C) < MIN_BORDER_PX);
    let palette = inkfit::swatch::map_raster::palette_of("quadrants", &m).unwrap();
    let adj = palette.adjacency.unwrap();
    let at = |c: [u8; 3]| index(&m, c);
    assert!(adj.touches(at(A), at(B)) && !adj.touches(at(A), at(D)));
    assert_eq!(adj.border_px(at(C), at(D)), Some(20));
}

#[test]
fn thin_lines_and_specks_are_not_classes() {
    // A 1-pixel grid line of colour C has no interior pixel (its neighbours
    // across the line differ), and a 3 × 3 speck of D covers less than the
    // smallest class share (9 of 100 × 100 pixels is 0.09 %, under a 0.1 %
    // floor); neither is a class. Their pixels next to A are shared out.
    let n = 100;
    let img = paint(n, n, |x, y| {
        if x == 50 {
            C
        } else if (10..13).contains(&x) && (10..13).contains(&y) {
            D
        } else {
            A
        }
    });
    let m = find_classes(n, n, &img, &|_| Some(true), 0.001).unwrap();
    assert_eq!(m.classes.len(), 1);
    assert_eq!(m.classes[0].rgb, A);
    // The 3 × 3 speck's middle pixel lies 2 from A and is reached too.
    assert_eq!(m.classes[0].pixels, (n * n) as u64);
}

#[test]
fn transparent_pixels_are_not_map() {
    // The left half is fully transparent, a column of half-transparent
    // pixels (a map's anti-aliased edge) is map but no class.
    let (w, h) = (40, 10);
    let img = paint(w, h, |_, _| B);
    let opacity = |i: usize| match i % w {
        0..20 => None,
        20 => Some(false),
        _ => Some(true),
    };
    let m = find_classes(w, h, &img, &opacity, 0.0005).unwrap();
    // Columns 20..40 are map: 20 columns; 21..40 (19) are fully opaque.
    assert_eq!(m.map_px, 20 * 10);
    assert_eq!(m.classes.len(), 1);
    assert_eq!(m.classes[0].exact_px, 19 * 10);
    assert_eq!(m.classes[0].pixels, 20 * 10);
}

#[test]
fn a_png_map_is_read_from_the_command_line_with_shares_and_touching_pairs() {
    // Three stripes A | B | C with alpha: a transparent margin column on
    // the left. Expected shares and borders by construction.
    let dir = tempfile::tempdir().unwrap();
    let (w, h) = (61u32, 20u32);
    let mut rgba = Vec::new();
    for _y in 0..h {
        for x in 0..w {
            let (c, a) = match x {
                0 => (A, 0),
                1..21 => (A, 255),
                21..41 => (B, 255),
                _ => (C, 255),
            };
            rgba.extend(c);
            rgba.push(a);
        }
    }
    let png = dir.path().join("stripes.png");
    write_png(&png, w, h, &rgba, ExtendedColorType::Rgba8);
    let o = run(&["check", png.to_str().unwrap(), "--json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let v = json(&o);
    let entries = v["entries"].as_array().unwrap();
    assert_eq!(entries.len(), 3);
    for e in entries {
        assert!((e["share"].as_f64().unwrap() - 1.0 / 3.0).abs() < 1e-4, "{e}");
    }
    assert_eq!(v["unclassified_share"], 0.0);
    let sep = &v["separation"];
    assert_eq!(sep["adjacency"], "map");
    assert_eq!(sep["touching_pairs"], 2);
    assert_eq!(sep["min_legend_separation"], 5.0);
    let name = |i: &serde_json::Value| {
        entries[i.as_u64().unwrap() as usize - 1]["name"]
            .as_str()
            .unwrap()
            .to_string()
    };
    let hex = |c: [u8; 3]| format!("#{:02x}{:02x}{:02x}", c[0], c[1], c[2]);
    for p in sep["pairs"].as_array().unwrap() {
        let names = [name(&p["a"]), name(&p["b"])];
        let apart = names.contains(&hex(A)) && names.contains(&hex(C));
        assert_eq!(p["touching"], !apart, "{p}");
        if apart {
            assert!(p.get("border_px").is_none());
        } else {
            assert_eq!(p["border_px"], 20);
        }
    }
    // The table shows the shares and the rule.
    let t = stdout(&run(&["check", png.to_str().unwrap()]));
    assert!(t.contains("33.3 %"), "{t}");
    assert!(
        t.contains("2 pairs of classes that touch (found on the map), legend floor 5.0"),
        "{t}"
    );
}

/// Two greens about ΔE00 7 apart: under the separation floor 10, above the
/// legend floor 5 (checked on the printed values below).
const NEAR_1: [u8; 3] = [120, 170, 90];
const NEAR_2: [u8; 3] = [100, 160, 95];
const FAR: [u8; 3] = [200, 60, 160];

fn near_pair(v: &serde_json::Value) -> &serde_json::Value {
    v["separation"]["pairs"]
        .as_array()
        .unwrap()
        .iter()
        .find(|p| {
            let n = |k: &str| {
                v["entries"][p[k].as_u64().unwrap() as usize - 1]["name"]
                    .as_str()
                    .unwrap()
                    .to_string()
            };
            let mut names = [n("a"), n("b")];
            names.sort();
            names == ["#64a05f", "#78aa5a"]
        })
        .unwrap()
}

#[test]
fn close_classes_fail_where_they_touch_and_pass_the_legend_floor_where_they_do_not() {
    let dir = tempfile::tempdir().unwrap();
    let (w, h) = (60u32, 20u32);
    // Apart: NEAR_1 | FAR | NEAR_2. Touching: NEAR_1 | NEAR_2 | FAR.
    for (file, order, touching) in [
        ("apart.png", [NEAR_1, FAR, NEAR_2], false),
        ("touching.png", [NEAR_1, NEAR_2, FAR], true),
    ] {
        let img = paint(w as usize, h as usize, |x, _| order[x / 20]);
        let png = dir.path().join(file);
        write_png(&png, w, h, &img, ExtendedColorType::Rgb8);
        let v = json(&run(&["check", png.to_str().unwrap(), "--json"]));
        let p = near_pair(&v);
        let print = p["print"].as_f64().unwrap();
        assert!(
            (5.0..10.0).contains(&print),
            "precondition: printed ΔE00 {print} between the floors"
        );
        assert_eq!(p["touching"], touching);
        let flagged = v["separation"]["flagged"].as_array().unwrap();
        assert_eq!(!flagged.is_empty(), touching, "{flagged:?}");
        if touching {
            assert_eq!(flagged[0]["floor"], 10.0);
        }
        // Without the map's adjacency (the same colours as a text palette)
        // every pair is held to the full floor and the pair fails.
        let txt = dir.path().join(format!("{file}.txt"));
        let hex: Vec<String> = order
            .iter()
            .map(|c| format!("#{:02x}{:02x}{:02x}\n", c[0], c[1], c[2]))
            .collect();
        std::fs::write(&txt, hex.concat()).unwrap();
        let plain = json(&run(&["check", txt.to_str().unwrap(), "--json"]));
        assert_eq!(plain["separation"]["flagged"].as_array().unwrap().len(), 1);
        assert!(plain["separation"].get("adjacency").is_none());
    }
}

#[test]
fn an_adjacency_file_gives_any_palette_the_map_rule() {
    // The demo soils palette: Alluvium and Saltmarsh collapse below 10 in
    // print, but the demo adjacency file says they never touch.
    let soils = demo("soils.csv");
    let touching = demo("soils-touching.txt");
    let all = json(&run(&["check", &soils, "--json"]));
    assert!(all["separation"]["flagged"]
        .as_array()
        .unwrap()
        .iter()
        .any(|f| f["a_name"] == "Alluvium" && f["b_name"] == "Saltmarsh"));
    let o = run(&["check", &soils, "--touching", &touching, "--json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let v = json(&o);
    assert_eq!(v["separation"]["adjacency"], "file");
    let pair = v["separation"]["pairs"]
        .as_array()
        .unwrap()
        .iter()
        .find(|p| p["a"] == 2 && p["b"] == 7)
        .unwrap();
    assert_eq!(pair["touching"], false);
    assert!(v["separation"]["flagged"]
        .as_array()
        .unwrap()
        .iter()
        .all(|f| !(f["a"] == 2 && f["b"] == 7)));
    // A stricter legend floor brings the pair back.
    let strict = json(&run(&[
        "check",
        &soils,
        "--touching",
        &touching,
        "--min-legend-separation",
        "10",
        "--json",
    ]));
    assert!(strict["separation"]["flagged"]
        .as_array()
        .unwrap()
        .iter()
        .any(|f| f["a"] == 2 && f["b"] == 7));
}

#[test]
fn adjacency_file_errors_name_the_file_and_line() {
    let p = Palette::parse(
        "p.txt",
        "#ff0000 Red\n#00ff00 Green\n#0000ff Blue\n#0000ff Blue\n",
        Format::Text,
    )
    .unwrap();
    let e = |t: &str| parse_adjacency("t.txt", t, &p.entries).unwrap_err().to_string();
    assert_eq!(
        e("# c\nRed | Green\nRed | Mauve\n"),
        "palette 't.txt', line 3: \"Mauve\" is no entry of the palette"
    );
    assert!(e("Red Green\n").starts_with("palette 't.txt', line 1: expected two classes separated by '|'"));
    assert!(e("Red | Red\n").contains("paired with itself"));
    assert!(e("Red | Blue\n").contains("names more than one entry of the palette; use its number"));
    assert!(e("Red | 9\n").contains("entry 9 is not in the palette, which has 4"));
    assert!(e("Red | 2 | wide\n").contains("border length \"wide\" is not a whole number"));
    // Numbers, names with spaces around them and a border length.
    let a = parse_adjacency("t.txt", "\u{feff} Red |  3 | 12\n\n1|2\n", &p.entries).unwrap();
    assert_eq!(a.pairs(), vec![(0, 1), (0, 2)]);
    assert_eq!(a.border_px(2, 0), Some(12));
    assert_eq!(a.border_px(0, 1), None);
    // From the command line: one line, the file named, exit 2.
    let dir = tempfile::tempdir().unwrap();
    let f = dir.path().join("adj.txt");
    std::fs::write(&f, "Woodland | Moorland\n").unwrap();
    let o = run(&["check", &demo("landuse.csv"), "--touching", f.to_str().unwrap()]);
    assert_error(&o, &["adj.txt", "line 1", "\"Moorland\" is no entry"]);
}

#[test]
fn grey_and_16_bit_maps_are_read() {
    // 16-bit samples become 8-bit by v × 255 / 65535, rounded: 0x8080 is 128.
    let dir = tempfile::tempdir().unwrap();
    let (w, h) = (20u32, 10u32);
    let mut data = Vec::new();
    for _ in 0..h {
        for x in 0..w {
            let v: u16 = if x < 10 { 0x8080 } else { 0xffff };
            data.extend(v.to_be_bytes());
        }
    }
    let png = dir.path().join("grey16.png");
    write_png(&png, w, h, &data, ExtendedColorType::L16);
    let v = json(&run(&["check", png.to_str().unwrap(), "--json"]));
    let names: Vec<&str> = v["entries"]
        .as_array()
        .unwrap()
        .iter()
        .map(|e| e["name"].as_str().unwrap())
        .collect();
    assert_eq!(names.len(), 2);
    assert!(names.contains(&"#808080") && names.contains(&"#ffffff"), "{names:?}");
}

#[test]
fn bad_map_images_are_refused_in_one_line() {
    let dir = tempfile::tempdir().unwrap();
    // Not an image at all.
    let fake = dir.path().join("map.png");
    std::fs::write(&fake, b"not a png").unwrap();
    assert_error(
        &run(&["check", fake.to_str().unwrap()]),
        &["map.png", "cannot read it as a map image"],
    );
    // JPEG: lossy, no flat colours.
    let jpg = dir.path().join("map.jpg");
    std::fs::write(&jpg, b"\xff\xd8\xff").unwrap();
    assert_error(
        &run(&["check", jpg.to_str().unwrap()]),
        &["map.jpg", "JPEG", "PNG or TIFF"],
    );
    // Only gradients: no colour with interior pixels.
    let grad = dir.path().join("gradient.png");
    let img = paint(64, 16, |x, y| [(x * 4) as u8, (y * 16) as u8, 0]);
    write_png(&grad, 64, 16, &img, ExtendedColorType::Rgb8);
    assert_error(
        &run(&["check", grad.to_str().unwrap()]),
        &["gradient.png", "no class colours"],
    );
    // A header declaring more pixels than the decoding limit is refused
    // before any pixel buffer exists: IHDR of 100,000 × 100,000.
    let mut huge = Vec::new();
    PngEncoder::new(&mut huge)
        .write_image(&[0, 0, 0], 1, 1, ExtendedColorType::Rgb8)
        .unwrap();
    huge[16..20].copy_from_slice(&100_000u32.to_be_bytes());
    huge[20..24].copy_from_slice(&100_000u32.to_be_bytes());
    let crc = crc32(&huge[12..29]);
    huge[29..33].copy_from_slice(&crc.to_be_bytes());
    let big = dir.path().join("huge.png");
    std::fs::write(&big, huge).unwrap();
    assert_error(&run(&["check", big.to_str().unwrap()]), &["huge.png", "megapixels"]);
    // The share option is checked.
    let o = run(&["check", grad.to_str().unwrap(), "--min-class-share", "0"]);
    assert_error(&o, &["--min-class-share"]);
    // repair does not rewrite a map image.
    let o = run(&[
        "repair",
        fake.to_str().unwrap(),
        "--out",
        dir.path().join("o.png").to_str().unwrap(),
    ]);
    assert_error(&o, &["map images are not rewritten"]);
}

#[test]
fn the_demo_map_finds_the_atlas_classes() {
    // The demo map is drawn with the nine land-use colours of
    // fixtures/demo/landuse.csv and rendered with anti-aliasing; its classes
    // are exactly those nine colours.
    let v = json(&run(&["check", &demo("landuse-map.png"), "--json"]));
    let mut got: Vec<String> = v["entries"]
        .as_array()
        .unwrap()
        .iter()
        .map(|e| e["input"].as_str().unwrap().to_string())
        .collect();
    got.sort();
    let text = std::fs::read_to_string(demo("landuse.csv")).unwrap();
    let mut want: Vec<String> = text
        .lines()
        .skip(1)
        .map(|l| l.split(',').nth(1).unwrap().to_string())
        .collect();
    want.sort();
    assert_eq!(got, want);
    let shares: f64 = v["entries"]
        .as_array()
        .unwrap()
        .iter()
        .map(|e| e["share"].as_f64().unwrap())
        .sum();
    assert!((shares + v["unclassified_share"].as_f64().unwrap() - 1.0).abs() < 1e-3);
}

fn tagged_png(path: &Path, w: u32, h: u32, data: &[u8], icc: Vec<u8>) {
    let mut bytes = Vec::new();
    let mut enc = PngEncoder::new(&mut bytes);
    enc.set_icc_profile(icc).unwrap();
    enc.write_image(data, w, h, ExtendedColorType::Rgb8).unwrap();
    std::fs::write(path, bytes).unwrap();
}

fn screen_labs(v: &serde_json::Value) -> Vec<[f64; 3]> {
    v["entries"]
        .as_array()
        .unwrap()
        .iter()
        .map(|e| {
            let l: Vec<f64> = e["screen_lab"]
                .as_array()
                .unwrap()
                .iter()
                .map(|x| x.as_f64().unwrap())
                .collect();
            [l[0], l[1], l[2]]
        })
        .collect()
}

#[test]
fn a_map_that_embeds_a_profile_is_read_in_that_profile() {
    // A map image made in a profile of its own holds that profile's RGB:
    // its class colours are converted from it, whatever --screen says.
    let dir = tempfile::tempdir().unwrap();
    let img = paint(20, 10, |x, _| if x < 10 { A } else { B });
    let builtin = |n: &str| inkfit::icc::builtin::bytes(n).unwrap().unwrap().to_vec();
    // Property: tagged sRGB reads as the untagged map does on the sRGB
    // screen, and the note says which profile was used.
    let (tagged, plain) = (dir.path().join("tagged.png"), dir.path().join("plain.png"));
    tagged_png(&tagged, 20, 10, &img, builtin("srgb"));
    write_png(&plain, 20, 10, &img, ExtendedColorType::Rgb8);
    let t = json(&run(&["check", tagged.to_str().unwrap(), "--json"]));
    let u = json(&run(&["check", plain.to_str().unwrap(), "--json"]));
    for (a, b) in screen_labs(&t).iter().zip(screen_labs(&u)) {
        assert!((0..3).all(|k| (a[k] - b[k]).abs() <= 0.02), "{a:?} against {b:?}");
    }
    assert!(
        t["notes"].to_string().contains("tagged.png embeds the ICC profile"),
        "{}",
        t["notes"]
    );
    assert!(!u["notes"].to_string().contains("embeds"));
    // A Display P3 map: its colours are those of CSS Color 4's
    // color(display-p3 …) (the CSS definition, computed by inkfit's colour
    // parser, a path apart from the ICC profile and lcms2), within 0.5 ΔE,
    // and the screen profile given does not change them.
    let p3 = dir.path().join("p3.png");
    tagged_png(&p3, 20, 10, &img, builtin("display-p3"));
    for screen in ["srgb", "rec2020"] {
        let v = json(&run(&["check", p3.to_str().unwrap(), "--screen", screen, "--json"]));
        for (e, lab) in v["entries"].as_array().unwrap().iter().zip(screen_labs(&v)) {
            let hex = e["input"].as_str().unwrap();
            let code = |k: usize| u8::from_str_radix(&hex[1 + 2 * k..3 + 2 * k], 16).unwrap() as f64 / 255.0;
            let css = format!("color(display-p3 {} {} {})", code(0), code(1), code(2));
            let d = json(&run(&[
                "delta",
                &css,
                &format!("lab({}% {} {})", lab[0], lab[1], lab[2]),
                "--json",
            ]));
            let de = d["de00"].as_f64().unwrap();
            assert!(de <= 0.5, "{hex} on --screen {screen}: ΔE00 {de} from {css}");
        }
    }
    // A profile that does not fit the pixels is an error naming the file.
    let cmyk = dir.path().join("cmyk-tagged.png");
    tagged_png(
        &cmyk,
        20,
        10,
        &img,
        std::fs::read("profiles/offset-coated.icc").unwrap(),
    );
    assert_error(
        &run(&["check", cmyk.to_str().unwrap()]),
        &["cmyk-tagged.png", "embedded ICC profile", "RGB"],
    );
}
