//! Gamut boundaries checked against independent computations: dense CIELAB
//! grids judged by the closed-form inverse of matrix profiles, brute-force
//! searches over sampled ink combinations, the press's own round trip, and
//! the glTF 2.0 / PLY file structure; plus the `inkfit gamut` binary.

mod common;
use common::*;

use std::sync::OnceLock;

use inkfit::color::LabD50;
use inkfit::gamut::export::{write_glb, write_gltf, write_ply};
use inkfit::gamut::{coverage_pair, ink_domain_faces, nearest_brute_force, Gamut, GamutOptions};
use inkfit::icc::header::read_xyz;
use inkfit::icc::transform::{lab_d50_profile, PressMapping, PressTransforms};
use inkfit::icc::{IccProfile, RenderingIntent};
use lcms2::{PixelFormat, Transform};
use serde_json::Value;

fn profile(name: &str) -> IccProfile {
    IccProfile::load(name).unwrap_or_else(|e| panic!("{name}: {e}"))
}

fn srgb() -> &'static Gamut {
    static G: OnceLock<Gamut> = OnceLock::new();
    G.get_or_init(|| Gamut::of_profile(&profile("srgb"), GamutOptions::default()).unwrap())
}

fn press() -> &'static Gamut {
    static G: OnceLock<Gamut> = OnceLock::new();
    G.get_or_init(|| Gamut::of_profile(&profile("offset-coated"), GamutOptions::default()).unwrap())
}

/// CIELAB → XYZ relative to D50 (CIE 015:2018, 8.2.1, inverted), written out
/// here independently of the library.
fn lab_to_xyz_d50(l: f64, a: f64, b: f64) -> [f64; 3] {
    let (eps, kappa) = (216.0 / 24389.0, 24389.0 / 27.0);
    let fy = (l + 16.0) / 116.0;
    let fx = fy + a / 500.0;
    let fz = fy - b / 200.0;
    let inv = |f: f64| {
        if f * f * f > eps {
            f * f * f
        } else {
            (116.0 * f - 16.0) / kappa
        }
    };
    let yr = if l > kappa * eps { fy * fy * fy } else { l / kappa };
    [inv(fx) * 0.9642, yr, inv(fz) * 0.8249]
}

/// The closed-form inside test of a matrix/TRC profile (ICC.1:2010, F.3):
/// XYZ = M·rgb_linear with M's columns the rXYZ, gXYZ, bXYZ tags; a colour is
/// inside when M⁻¹·XYZ lies in the unit cube (the tone curves map [0, 1]
/// onto [0, 1], so they do not change the test).
struct MatrixInverse([[f64; 3]; 3]);
impl MatrixInverse {
    fn of(p: &IccProfile) -> MatrixInverse {
        let col = |s: &[u8; 4]| read_xyz(&p.bytes, p.header.tag(s).unwrap()).unwrap();
        let (r, g, b) = (col(b"rXYZ"), col(b"gXYZ"), col(b"bXYZ"));
        let m = [[r[0], g[0], b[0]], [r[1], g[1], b[1]], [r[2], g[2], b[2]]];
        let det = m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
            + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
        let mut inv = [[0.0; 3]; 3];
        for (i, row) in inv.iter_mut().enumerate() {
            for (j, v) in row.iter_mut().enumerate() {
                // Adjugate over determinant: cofactor of m[j][i].
                let (r0, r1, c0, c1) = ((j + 1) % 3, (j + 2) % 3, (i + 1) % 3, (i + 2) % 3);
                *v = (m[r0][c0] * m[r1][c1] - m[r0][c1] * m[r1][c0]) / det;
            }
        }
        MatrixInverse(inv)
    }
    fn inside(&self, l: f64, a: f64, b: f64) -> bool {
        let x = lab_to_xyz_d50(l, a, b);
        self.0
            .iter()
            .all(|row| (-1e-12..=1.0 + 1e-12).contains(&(row[0] * x[0] + row[1] * x[1] + row[2] * x[2])))
    }
}

/// Volume by counting the centres of a dense CIELAB grid of step `s` that the
/// closed-form test puts inside (midpoint rule over the box).
fn dense_volume(inv: &MatrixInverse, s: f64) -> f64 {
    let n = |lo: f64, hi: f64| ((hi - lo) / s).ceil() as usize;
    let (a0, b0) = (-140.0, -140.0);
    let mut count = 0usize;
    for i in 0..n(0.0, 100.0) {
        let l = (i as f64 + 0.5) * s;
        for j in 0..n(a0, 140.0) {
            let a = a0 + (j as f64 + 0.5) * s;
            for k in 0..n(b0, 140.0) {
                if inv.inside(l, a, b0 + (k as f64 + 0.5) * s) {
                    count += 1;
                }
            }
        }
    }
    count as f64 * s * s * s
}

#[test]
fn matrix_screen_volumes_match_a_dense_closed_form_count() {
    // Independent reference: dense CIELAB grid judged by the closed-form
    // inverse of each matrix profile; the two must agree within 0.1 %.
    for name in ["srgb", "display-p3"] {
        let p = profile(name);
        let g = Gamut::of_profile(&p, GamutOptions::default()).unwrap();
        let reference = dense_volume(&MatrixInverse::of(&p), 0.8);
        let rel = g.volume / reference - 1.0;
        assert!(
            rel.abs() < 1e-3,
            "{name}: mesh {} vs dense count {reference} ({rel:+.5})",
            g.volume
        );
    }
}

#[test]
fn srgb_volume_is_the_well_known_figure() {
    // sRGB in CIELAB D50 is about 830,000 cubic units (from memory; figures
    // quoted range about 820,000–840,000 depending on white and method).
    let v = srgb().volume;
    assert!((v / 830_000.0 - 1.0).abs() < 0.03, "{v}");
    // sRGB spans L* 0..100: black and white are in every RGB cube (ICC relative colorimetric maps white to L* = 100).
    assert!(srgb().l_min.abs() < 0.01 && (srgb().l_max - 100.0).abs() < 0.01);
}

#[test]
fn coverage_of_two_matrix_gamuts_matches_dense_sampling() {
    // Independent reference: one dense CIELAB grid judged by both closed-form
    // inverses; shares within 0.5 percentage points.
    let (ps, pp) = (profile("srgb"), profile("display-p3"));
    let (is, ip) = (MatrixInverse::of(&ps), MatrixInverse::of(&pp));
    let gp = Gamut::of_profile(&pp, GamutOptions::default()).unwrap();
    let (s_in_p, p_in_s) = coverage_pair(srgb(), &gp, 1.0).unwrap();
    let step = 1.0;
    let (mut ns, mut np, mut nsp) = (0usize, 0usize, 0usize);
    let mut l = 0.5 * step;
    while l < 100.0 {
        let mut a = -140.0 + 0.37;
        while a < 140.0 {
            let mut b = -140.0 + 0.21;
            while b < 140.0 {
                let (x, y) = (is.inside(l, a, b), ip.inside(l, a, b));
                ns += usize::from(x);
                np += usize::from(y);
                nsp += usize::from(x && y);
                b += step;
            }
            a += step;
        }
        l += step;
    }
    let ref_s_in_p = nsp as f64 / ns as f64;
    let ref_p_in_s = nsp as f64 / np as f64;
    assert!(
        (s_in_p.a_inside_b - ref_s_in_p).abs() < 0.005,
        "{} vs {ref_s_in_p}",
        s_in_p.a_inside_b
    );
    assert!(
        (p_in_s.a_inside_b - ref_p_in_s).abs() < 0.005,
        "{} vs {ref_p_in_s}",
        p_in_s.a_inside_b
    );
    let ref_volume = nsp as f64 * step.powi(3);
    assert!((s_in_p.intersection_volume / ref_volume - 1.0).abs() < 0.005);
}

/// sRGB (encoded 0..1) → CIELAB D50 through the built-in profile, relative colorimetric.
fn srgb_lab(rgb: &[[f64; 3]]) -> Vec<[f64; 3]> {
    let t: Transform<[f64; 3], [f64; 3]> = Transform::new(
        &profile("srgb").lcms,
        PixelFormat::RGB_DBL,
        &lab_d50_profile(),
        PixelFormat::Lab_DBL,
        RenderingIntent::Relative.to_lcms(),
    )
    .unwrap();
    let mut out = vec![[0.0; 3]; rgb.len()];
    t.transform_pixels(rgb, &mut out);
    out
}

fn press_lab(p: &IccProfile, cmyk: &[[f64; 4]]) -> Vec<[f64; 3]> {
    let lab = lab_d50_profile();
    let t: Transform<[f64; 4], [f64; 3]> = Transform::new(
        &p.lcms,
        PixelFormat::CMYK_DBL,
        &lab,
        PixelFormat::Lab_DBL,
        RenderingIntent::Relative.to_lcms(),
    )
    .unwrap();
    let mut out = vec![[0.0; 3]; cmyk.len()];
    t.transform_pixels(cmyk, &mut out);
    out
}

#[test]
fn every_sampled_device_colour_is_inside_its_own_gamut() {
    // Property: the gamut is everything the device can make, so random
    // device values (ink-limited for CMYK) must pass the inside test.
    let mut rng = Rng(0x9e37_79b9_7f4a_7c15);
    let p = profile("offset-coated");
    let g = press();
    let limit = g.ink_limit.unwrap().percent;
    let cmyk: Vec<[f64; 4]> = (0..1500)
        .map(|_| {
            let c = [0; 4].map(|_| 100.0 * rng.next());
            let s: f64 = c.iter().sum();
            if s > limit {
                c.map(|v| v * limit / s)
            } else {
                c
            }
        })
        .collect();
    let mut strictly = 0;
    for (c, lab) in cmyk.iter().zip(press_lab(&p, &cmyk)) {
        let (inside, d) = g.judge(LabD50::from_array(lab));
        assert!(inside, "CMYK {c:?} → {lab:?} judged outside by {d}");
        strictly += usize::from(g.contains(LabD50::from_array(lab)));
    }
    assert!(
        strictly as f64 >= 0.98 * cmyk.len() as f64,
        "only {strictly} strictly inside"
    );

    let rgb: Vec<[f64; 3]> = (0..1500).map(|_| [0; 3].map(|_| rng.next())).collect();
    let lab = srgb_lab(&rgb);
    for (c, l) in rgb.iter().zip(&lab) {
        assert!(srgb().judge(LabD50::from_array(*l)).0, "RGB {c:?} judged outside");
    }
}

#[test]
fn srgb_primaries_are_outside_offset_and_its_solids_inside() {
    // Common practice: offset on coated paper cannot print the sRGB red,
    // green and blue primaries; its own solid inks and overprints it can.
    let prim = [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]];
    let lab = srgb_lab(&prim);
    for (c, l) in prim.iter().zip(lab) {
        let d = press().outside_by(LabD50::from_array(l));
        assert!(d > 3.0, "sRGB {c:?} only {d} outside");
    }
    let solids = [
        [100.0, 0.0, 0.0, 0.0],
        [0.0, 100.0, 0.0, 0.0],
        [0.0, 0.0, 100.0, 0.0],
        [0.0, 0.0, 0.0, 100.0],
        [100.0, 100.0, 0.0, 0.0],
        [0.0, 100.0, 100.0, 0.0],
        [100.0, 0.0, 100.0, 0.0],
        [0.0, 0.0, 0.0, 0.0],
    ];
    for (c, l) in solids.iter().zip(press_lab(&profile("offset-coated"), &solids)) {
        let d = press().outside_by(LabD50::from_array(l));
        assert!(d <= 0.5, "solid {c:?} → {l:?} outside by {d}");
    }
}

#[test]
fn outside_by_matches_a_brute_force_search() {
    // Independent reference: the smallest CIEDE2000 to dense samples of the
    // ink domain's boundary faces sent through lcms2 (every printable colour
    // is the image of such a face, so the minimum over them is the distance
    // to the gamut). Within 0.5 ΔE00. Queries are kept within ΔE00 8 of the
    // gamut, the range CIEDE2000 is made for (common practice); farther out
    // its hue terms can make an interior colour "nearer" than any boundary
    // point.
    let p = profile("offset-coated");
    let limit = press().ink_limit.unwrap().percent;
    let cmyk: Vec<[f64; 4]> = ink_domain_faces(limit, 28).into_iter().flatten().collect();
    let samples = press_lab(&p, &cmyk);
    let mut rng = Rng(12345);
    let mut tried = 0;
    while tried < 30 {
        let base = samples[(rng.next() * samples.len() as f64) as usize];
        let dir = [0; 3].map(|_| rng.next() - 0.5);
        let norm = (dir[0] * dir[0] + dir[1] * dir[1] + dir[2] * dir[2]).sqrt().max(1e-9);
        let step = 4.0 + 10.0 * rng.next();
        let lab = LabD50::from_array([0, 1, 2].map(|d| base[d] + step * dir[d] / norm));
        let d = press().outside_by(lab);
        if !(1.5..=8.0).contains(&d) {
            continue;
        }
        tried += 1;
        let brute = nearest_brute_force(lab, &samples);
        assert!((d - brute).abs() < 0.5, "{lab:?}: locator {d} vs brute force {brute}");
    }
}

#[test]
fn locator_finds_the_nearest_boundary_point_at_any_distance() {
    // Brute force over the boundary mesh itself (every vertex): the coarse-
    // to-fine search may only ever do better (by refining on triangles).
    let m = press().boundary();
    let mut rng = Rng(99);
    let mut tried = 0;
    while tried < 12 {
        let lab = LabD50::new(
            100.0 * rng.next(),
            -120.0 + 240.0 * rng.next(),
            -120.0 + 240.0 * rng.next(),
        );
        if press().contains(lab) {
            continue;
        }
        tried += 1;
        let brute = nearest_brute_force(lab, &m.vertices);
        let d = press().outside_by(lab);
        assert!(
            d <= brute + 1e-9 && d > brute - 0.5,
            "{lab:?}: locator {d} vs vertices {brute}"
        );
    }
}

#[test]
fn boundary_test_agrees_with_the_press_round_trip() {
    // The press's own tables: a colour that CIELAB → CMYK → CIELAB reproduces
    // within ΔE00 0.5 is printable, so the boundary test must call it inside.
    let (s, p) = (profile("srgb"), profile("offset-coated"));
    let t = PressTransforms::new(
        &s,
        &p,
        PressMapping {
            intent: RenderingIntent::Relative,
            bpc: false,
            paper_white: false,
        },
    )
    .unwrap();
    let mut rng = Rng(777);
    let labs: Vec<LabD50> = (0..3000)
        .map(|_| {
            LabD50::new(
                100.0 * rng.next(),
                -90.0 + 180.0 * rng.next(),
                -90.0 + 180.0 * rng.next(),
            )
        })
        .collect();
    let back = t.round_trip(&labs);
    let mut checked = 0;
    for (l, r) in labs.iter().zip(&back) {
        if inkfit::color::delta::delta_e00(*l, *r) <= 0.5 {
            checked += 1;
            let (inside, d) = press().judge(*l);
            assert!(inside, "{l:?} round-trips but is outside by {d}");
        }
    }
    assert!(checked > 100, "only {checked} colours round-tripped");
}

#[test]
fn press_boundary_mesh_is_closed_and_encloses_the_voxel_volume() {
    // A closed orientable surface uses every edge twice, once each way
    // (combinatorial topology); its divergence-theorem volume must match the
    // voxel count it was extracted from within 1 %.
    let m = press().boundary();
    let mut edges = std::collections::HashMap::new();
    for t in &m.triangles {
        for k in 0..3 {
            *edges.entry((t[k], t[(k + 1) % 3])).or_insert(0) += 1;
        }
    }
    for (&(a, b), &n) in &edges {
        assert_eq!(n, 1, "edge {a}-{b} used {n} times one way");
        assert_eq!(edges.get(&(b, a)), Some(&1), "edge {a}-{b} has no twin");
    }
    let v = m.signed_volume();
    assert!(
        (v / press().volume - 1.0).abs() < 0.01,
        "mesh {v} vs voxels {}",
        press().volume
    );
}

#[test]
fn a_lower_ink_limit_shrinks_the_gamut() {
    // A lower total-ink limit removes the darkest colours (common practice).
    let g = Gamut::of_profile(
        &profile("offset-coated"),
        GamutOptions {
            ink_limit: Some(240.0),
            ..GamutOptions::default()
        },
    )
    .unwrap();
    assert!(
        g.volume < press().volume && g.l_min > press().l_min + 0.5,
        "{} {}",
        g.volume,
        g.l_min
    );
    assert!(!g.ink_limit.unwrap().measured);
}

fn small_mesh() -> inkfit::gamut::mesh::Mesh {
    let opts = GamutOptions {
        rgb_steps: 6,
        ..GamutOptions::default()
    };
    Gamut::of_profile(&profile("srgb"), opts).unwrap().boundary().clone()
}

/// Checks a glTF 2.0 document against its binary buffer (glTF 2.0 §3.6–3.7:
/// views inside the buffer, accessors inside their views, POSITION min/max
/// equal to the data, indices below the vertex count).
fn validate_gltf(doc: &Value, bin: &[u8], vertices: usize, triangles: usize) {
    assert_eq!(doc["asset"]["version"], "2.0");
    let blen = doc["buffers"][0]["byteLength"].as_u64().unwrap() as usize;
    assert!(
        blen <= bin.len() && bin.len() - blen < 4,
        "buffer {blen} vs {}",
        bin.len()
    );
    let views = doc["bufferViews"].as_array().unwrap();
    for v in views {
        let (o, l) = (
            v["byteOffset"].as_u64().unwrap() as usize,
            v["byteLength"].as_u64().unwrap() as usize,
        );
        assert!(o + l <= blen && o % 4 == 0);
    }
    let prim = &doc["meshes"][0]["primitives"][0];
    let acc = |i: &Value| &doc["accessors"][i.as_u64().unwrap() as usize];
    let f32_at = |o: usize| f32::from_le_bytes(bin[o..o + 4].try_into().unwrap());
    let pos = acc(&prim["attributes"]["POSITION"]);
    assert_eq!(pos["count"].as_u64().unwrap() as usize, vertices);
    let pv = &views[pos["bufferView"].as_u64().unwrap() as usize];
    let po = pv["byteOffset"].as_u64().unwrap() as usize;
    assert!(vertices * 12 <= pv["byteLength"].as_u64().unwrap() as usize);
    for d in 0..3 {
        let vals: Vec<f32> = (0..vertices).map(|i| f32_at(po + 12 * i + 4 * d)).collect();
        let lo = vals.iter().copied().fold(f32::INFINITY, f32::min);
        let hi = vals.iter().copied().fold(f32::NEG_INFINITY, f32::max);
        assert_eq!(pos["min"][d].as_f64().unwrap() as f32, lo);
        assert_eq!(pos["max"][d].as_f64().unwrap() as f32, hi);
    }
    // L* up: y spans 0..1 metre for a gamut from black to white.
    assert!(pos["min"][1].as_f64().unwrap().abs() < 1e-3 && (pos["max"][1].as_f64().unwrap() - 1.0).abs() < 1e-3);
    let col = acc(&prim["attributes"]["COLOR_0"]);
    let cv = &views[col["bufferView"].as_u64().unwrap() as usize];
    assert!(vertices * 12 <= cv["byteLength"].as_u64().unwrap() as usize);
    let co = cv["byteOffset"].as_u64().unwrap() as usize;
    assert!((0..vertices * 3).all(|i| (0.0..=1.0).contains(&f32_at(co + 4 * i))));
    let idx = acc(&prim["indices"]);
    assert_eq!(idx["count"].as_u64().unwrap() as usize, triangles * 3);
    assert_eq!(idx["componentType"], 5125);
    let iv = &views[idx["bufferView"].as_u64().unwrap() as usize];
    let io = iv["byteOffset"].as_u64().unwrap() as usize;
    assert!(triangles * 12 <= iv["byteLength"].as_u64().unwrap() as usize);
    let max = (0..triangles * 3)
        .map(|i| u32::from_le_bytes(bin[io + 4 * i..io + 4 * i + 4].try_into().unwrap()))
        .max()
        .unwrap();
    assert!((max as usize) < vertices);
    assert_eq!(idx["max"][0].as_u64().unwrap() as u32, max);
}

#[test]
fn gltf_and_glb_are_structurally_valid() {
    let m = small_mesh();
    let mut text = Vec::new();
    write_gltf(&mut text, &m, "srgb").unwrap();
    let doc: Value = serde_json::from_slice(&text).unwrap();
    let uri = doc["buffers"][0]["uri"].as_str().unwrap();
    let b64 = uri.strip_prefix("data:application/octet-stream;base64,").unwrap();
    let bin = decode_base64(b64);
    validate_gltf(&doc, &bin, m.vertices.len(), m.triangles.len());

    let mut glb = Vec::new();
    write_glb(&mut glb, &m, "srgb").unwrap();
    // GLB layout (glTF 2.0 §4.4): magic, version 2, total length, then chunks.
    assert_eq!(&glb[0..4], b"glTF");
    let u32_at = |o: usize| u32::from_le_bytes(glb[o..o + 4].try_into().unwrap()) as usize;
    assert_eq!(u32_at(4), 2);
    assert_eq!(u32_at(8), glb.len());
    let jlen = u32_at(12);
    assert_eq!(&glb[16..20], b"JSON");
    assert_eq!(jlen % 4, 0);
    let doc: Value = serde_json::from_slice(&glb[20..20 + jlen]).unwrap();
    let blen = u32_at(20 + jlen);
    assert_eq!(&glb[24 + jlen..28 + jlen], b"BIN\0");
    assert_eq!(28 + jlen + blen, glb.len());
    validate_gltf(&doc, &glb[28 + jlen..], m.vertices.len(), m.triangles.len());
}

/// Base64 decoding (RFC 4648 §4), written here independently of the encoder.
fn decode_base64(s: &str) -> Vec<u8> {
    let val = |c: u8| match c {
        b'A'..=b'Z' => c - b'A',
        b'a'..=b'z' => c - b'a' + 26,
        b'0'..=b'9' => c - b'0' + 52,
        b'+' => 62,
        b'/' => 63,
        _ => panic!("bad base64 {c}"),
    };
    let mut out = Vec::new();
    for chunk in s.as_bytes().chunks(4) {
        let pad = chunk.iter().filter(|&&c| c == b'=').count();
        let mut n = 0u32;
        for &c in chunk {
            n = (n << 6) | u32::from(if c == b'=' { 0 } else { val(c) });
        }
        let bytes = [(n >> 16) as u8, (n >> 8) as u8, n as u8];
        out.extend_from_slice(&bytes[..3 - pad]);
    }
    out
}

#[test]
fn ply_header_counts_match_the_body() {
    // PLY 1.0 (ASCII): the element counts in the header give the lines that follow.
    let m = small_mesh();
    let mut out = Vec::new();
    write_ply(&mut out, &m, "srgb").unwrap();
    let text = String::from_utf8(out).unwrap();
    let (head, body) = text.split_once("end_header\n").unwrap();
    assert!(head.starts_with("ply\nformat ascii 1.0\n"));
    assert!(head.contains(&format!("element vertex {}\n", m.vertices.len())));
    assert!(head.contains(&format!("element face {}\n", m.triangles.len())));
    let lines: Vec<&str> = body.lines().collect();
    assert_eq!(lines.len(), m.vertices.len() + m.triangles.len());
    assert_eq!(lines[0].split(' ').count(), 6);
    assert!(lines[m.vertices.len()].starts_with("3 "));
}

#[test]
fn cli_gamut_json_and_mesh() {
    let dir = tempfile::tempdir().unwrap();
    let mesh = dir.path().join("g.glb");
    let o = bin()
        .args(["gamut", "srgb", "offset-coated", "--json", "--mesh"])
        .arg(&mesh)
        .output()
        .unwrap();
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let v: Value = serde_json::from_slice(&o.stdout).unwrap();
    let p = v["profiles"].as_array().unwrap();
    assert_eq!(p.len(), 2);
    assert_eq!(p[0]["name"], "srgb");
    assert!(p[0]["ink_limit"].is_null());
    assert!(p[1]["ink_limit"].as_f64().unwrap() > 250.0);
    assert_eq!(p[1]["ink_limit_source"], "measured");
    assert_eq!(p[1]["hue_sectors"].as_array().unwrap().len(), 12);
    for k in ["volume", "l_min", "l_max"] {
        assert!(p[1][k].is_number(), "{k}");
    }
    let s = &p[1]["hue_sectors"][0];
    for k in ["hue_from", "hue_to", "max_chroma", "l_at_max"] {
        assert!(s[k].is_number(), "{k}");
    }
    let c = v["coverage"].as_array().unwrap();
    assert_eq!(c.len(), 2);
    assert_eq!(
        (c[0]["a"].as_str(), c[0]["b"].as_str()),
        (Some("srgb"), Some("offset-coated"))
    );
    let share = c[1]["a_inside_b"].as_f64().unwrap();
    assert!(
        (0.0..=1.0).contains(&share) && share > 0.8,
        "offset inside srgb {share}"
    );
    assert!(dir.path().join("g-1.glb").exists() && dir.path().join("g-2.glb").exists());

    let o = bin()
        .args(["gamut", "offset-coated", "--ink-limit", "280"])
        .output()
        .unwrap();
    let text = String::from_utf8_lossy(&o.stdout);
    assert!(text.contains("280.0 % (given)"), "{text}");
}

#[test]
fn cli_gamut_bad_input_is_one_line_naming_the_file() {
    let dir = tempfile::tempdir().unwrap();
    // An abstract CIELAB profile has no device to take a gamut of.
    let abst = dir.path().join("abstract-lab.icc");
    std::fs::write(&abst, lab_d50_profile().icc().unwrap()).unwrap();
    let broken = dir.path().join("broken.icc");
    std::fs::write(&broken, b"not a profile at all, just some bytes").unwrap();
    for (file, needle) in [(&abst, "abstract"), (&broken, "not an ICC profile")] {
        let o = bin().arg("gamut").arg(file).output().unwrap();
        let err = String::from_utf8_lossy(&o.stderr);
        assert_eq!(o.status.code(), Some(2), "{err}");
        assert_eq!(err.trim_end().lines().count(), 1, "{err}");
        assert!(
            err.contains(&file.display().to_string()) && err.contains(needle),
            "{err}"
        );
        assert!(!err.contains("panicked"));
    }
    let o = bin()
        .args(["gamut", "offset-coated", "--ink-limit", "0"])
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(2));
    let o = bin().args(["gamut", "srgb", "--mesh", "x.obj"]).output().unwrap();
    assert_eq!(o.status.code(), Some(2));
}

#[test]
fn check_reports_outside_by_and_keeps_the_round_trip() {
    let demo = concat!(env!("CARGO_MANIFEST_DIR"), "/fixtures/demo/landuse.csv");
    let o = bin().args(["check", demo, "--json"]).output().unwrap();
    assert!(o.status.success());
    let v: Value = serde_json::from_slice(&o.stdout).unwrap();
    for e in v["entries"].as_array().unwrap() {
        let d = e["outside_by"].as_f64().unwrap();
        assert_eq!(
            e["in_gamut"].as_bool().unwrap(),
            d <= inkfit::color::delta::NOTICEABLE_DE00,
            "{e}"
        );
        // `outside_by` is the CIEDE2000 distance to the nearest printable
        // colour, so no printed colour, the round trip's hue-preserving clip
        // included, can be nearer (up to the boundary's 1-unit voxels).
        let rt = e["round_trip_delta_e00"].as_f64().unwrap();
        assert!(d <= rt + 0.5, "{e}");
        if d == 0.0 {
            assert!(rt <= 1.0, "inside but the round trip moves it: {e}");
        }
    }
    let o = bin()
        .args(["check", demo, "--json", "--gamut-test", "round-trip"])
        .output()
        .unwrap();
    let v: Value = serde_json::from_slice(&o.stdout).unwrap();
    assert!(v["entries"][0]["outside_by"].is_null());
    assert_eq!(v["gamut_test"], "round-trip");
    assert!(v["gamut_test_method"].as_str().unwrap().contains("round trip"));
}

#[test]
fn locator_finds_the_nearest_boundary_point_near_neutrals() {
    // Near the neutral axis CIEDE2000 weighs a* up to 1.5 times (the G
    // factor of Sharma, Wu and Dalal 2005, eq. 2–3), so ΔE00 can exceed
    // ΔE*ab there and a bucket margin argued in ΔE*ab alone could skip the
    // nearest vertex. Brute force over every boundary vertex is the check.
    let m = press().boundary();
    let mut worst: f64 = 0.0;
    for l in [0.5, 2.0, 4.0, 8.0] {
        for (a, b) in [
            (0.0, 0.0),
            (1.5, -1.0),
            (-2.0, 2.0),
            (3.0, 0.5),
            (-0.5, -3.0),
            (5.0, 5.0),
        ] {
            let lab = LabD50::new(l, a, b);
            if press().contains(lab) {
                continue;
            }
            let brute = nearest_brute_force(lab, &m.vertices);
            let d = press().outside_by(lab);
            worst = worst.max(d - brute);
            assert!(d <= brute + 1e-9, "{lab:?}: locator {d} vs vertices {brute}");
        }
    }
    println!("locator minus brute force, worst: {worst}");
}

/// A ball of radius `r` about `c`, voxelised on a grid of edge 1: a voxel
/// is inside when its centre is.
fn voxel_ball(c: [f64; 3], r: f64) -> inkfit::gamut::grid::Solid {
    use inkfit::gamut::grid::{Grid, Solid};
    let grid = Grid::covering([c[0] - r, c[1] - r, c[2] - r], [c[0] + r, c[1] + r, c[2] + r], 1.0).unwrap();
    let mut cells = vec![0u8; grid.len()];
    let [nl, na, nb] = grid.dims;
    for il in 0..nl {
        for ia in 0..na {
            for ib in 0..nb {
                let p = grid.center(il, ia, ib);
                let d = ((p[0] - c[0]).powi(2) + (p[1] - c[1]).powi(2) + (p[2] - c[2]).powi(2)).sqrt();
                cells[grid.index(il, ia, ib)] = u8::from(d <= r);
            }
        }
    }
    Solid { grid, cells }
}

#[test]
fn figure_surface_lies_closer_to_the_true_boundary_than_the_voxel_steps() {
    // A voxelised ball has a known true surface (property: the distance of
    // a vertex from it is |‖v − c‖ − r|). The plain isosurface puts every
    // vertex at an edge midpoint, up to half a voxel off: one-unit steps in
    // a slice. The figure surface must keep every triangle, keep each vertex
    // on its edge (within half a voxel of the midpoint), and lie closer to
    // the true sphere: half the RMS error or better.
    use inkfit::gamut::mesh::{isosurface, smooth_isosurface};
    let (c, r) = ([50.3, 0.17, -0.41], 17.3);
    let solid = voxel_ball(c, r);
    let plain = isosurface(&solid);
    let smooth = smooth_isosurface(&solid);
    // The same triangles over the same vertices (winding follows the moved
    // vertices' normals, so compare each triangle's vertex set).
    let sets = |m: &inkfit::gamut::mesh::Mesh| -> Vec<[u32; 3]> {
        m.triangles
            .iter()
            .map(|t| {
                let mut t = *t;
                t.sort_unstable();
                t
            })
            .collect()
    };
    assert!(sets(&plain) == sets(&smooth), "not the same triangles");
    assert_eq!(plain.vertices.len(), smooth.vertices.len());
    let off = |v: &[f64; 3]| (((v[0] - c[0]).powi(2) + (v[1] - c[1]).powi(2) + (v[2] - c[2]).powi(2)).sqrt() - r).abs();
    let rms = |m: &inkfit::gamut::mesh::Mesh| {
        (m.vertices.iter().map(|v| off(v).powi(2)).sum::<f64>() / m.vertices.len() as f64).sqrt()
    };
    for (p, s) in plain.vertices.iter().zip(&smooth.vertices) {
        let moved = ((p[0] - s[0]).powi(2) + (p[1] - s[1]).powi(2) + (p[2] - s[2]).powi(2)).sqrt();
        assert!(moved <= 0.5 * 3f64.sqrt() + 1e-9, "a vertex left its edge: {moved}");
    }
    let (e_plain, e_smooth) = (rms(&plain), rms(&smooth));
    assert!(
        e_smooth <= 0.5 * e_plain,
        "RMS off the sphere: plain {e_plain:.3}, figure {e_smooth:.3}"
    );
}
