//! Boundary meshes written as files: ASCII PLY, and glTF 2.0 as JSON with an
//! embedded buffer (`.gltf`) or as a binary container (`.glb`). Vertices
//! carry the colour itself as sRGB would show it (clipped into sRGB).
//!
//! Axes: L* up. PLY uses CIELAB units with x = a*, y = L*, z = −b*; glTF uses
//! metres, one metre per 100 CIELAB units, on the same axes (glTF 2.0 §3.4:
//! right-handed, +Y up). Output is deterministic: fixed precision in PLY,
//! little-endian f32/u32 in glTF buffers.

use crate::color::spaces::srgb_to_linear;
use crate::precision::fixed;
use std::io::{self, Write};
use std::path::Path;

use lcms2::{PixelFormat, Profile};
use serde_json::json;

use super::mesh::Mesh;
use crate::icc::transform::{self, Shared, Side};
use crate::icc::RenderingIntent;

/// Which file format a path asks for, by its extension.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum MeshFormat {
    /// ASCII PLY (`.ply`).
    Ply,
    /// glTF 2.0, JSON with the data embedded (`.gltf`).
    Gltf,
    /// glTF 2.0, binary (`.glb`).
    Glb,
}

impl MeshFormat {
    /// The format that the path's extension (any case) asks for; `None` for another extension.
    pub fn from_path(path: &Path) -> Option<MeshFormat> {
        let ext = path.extension()?.to_str()?.to_ascii_lowercase();
        match ext.as_str() {
            "ply" => Some(MeshFormat::Ply),
            "gltf" => Some(MeshFormat::Gltf),
            "glb" => Some(MeshFormat::Glb),
            _ => None,
        }
    }
}

/// sRGB (encoded, 0..1) of each CIELAB D50 vertex through lcms2's sRGB
/// profile, relative colorimetric, clipped into 0..1.
pub fn srgb_colours(vertices: &[[f64; 3]]) -> Vec<[f64; 3]> {
    let srgb = Profile::new_srgb();
    let t: Result<Shared<[f64; 3], [f64; 3]>, _> = transform::shared(
        Side::Lab,
        Side::Profile(&srgb, PixelFormat::RGB_DBL),
        RenderingIntent::Relative,
        false,
    );
    let mut out = vec![[0.5; 3]; vertices.len()];
    if let Ok(t) = t {
        t.transform_pixels(vertices, &mut out);
    }
    out.into_iter()
        .map(|c| c.map(|v| if v.is_finite() { v.clamp(0.0, 1.0) } else { 0.0 }))
        .collect()
}

/// CIELAB [L*, a*, b*] → [a*, L*, −b*].
fn axes(p: [f64; 3]) -> [f64; 3] {
    [p[1], p[0], -p[2]]
}

/// ASCII PLY 1.0 with per-vertex 8-bit sRGB colour.
pub fn write_ply(w: &mut dyn Write, mesh: &Mesh, title: &str) -> io::Result<()> {
    let colours = srgb_colours(&mesh.vertices);
    writeln!(w, "ply")?;
    writeln!(w, "format ascii 1.0")?;
    writeln!(
        w,
        "comment inkfit gamut boundary of {}",
        title.replace(['\n', '\r'], " ")
    )?;
    writeln!(
        w,
        "comment CIELAB D50, relative colorimetric; x = a*, y = L* (up), z = -b*"
    )?;
    writeln!(w, "element vertex {}", mesh.vertices.len())?;
    writeln!(w, "property float x")?;
    writeln!(w, "property float y")?;
    writeln!(w, "property float z")?;
    writeln!(w, "property uchar red")?;
    writeln!(w, "property uchar green")?;
    writeln!(w, "property uchar blue")?;
    writeln!(w, "element face {}", mesh.triangles.len())?;
    writeln!(w, "property list uchar uint vertex_indices")?;
    writeln!(w, "end_header")?;
    for (p, c) in mesh.vertices.iter().zip(&colours) {
        let [x, y, z] = axes(*p);
        let [r, g, b] = c.map(|v| (v * 255.0).round() as u8);
        writeln!(w, "{} {} {} {r} {g} {b}", fixed(x, 4), fixed(y, 4), fixed(z, 4))?;
    }
    for t in &mesh.triangles {
        writeln!(w, "3 {} {} {}", t[0], t[1], t[2])?;
    }
    Ok(())
}

/// The glTF document (JSON) and its binary buffer for `mesh`.
fn gltf_parts(mesh: &Mesh, title: &str, uri: Option<String>) -> (serde_json::Value, Vec<u8>) {
    let colours = srgb_colours(&mesh.vertices);
    let nv = mesh.vertices.len();
    let mut bin = Vec::with_capacity(nv * 24 + mesh.triangles.len() * 12);
    let mut lo = [f32::INFINITY; 3];
    let mut hi = [f32::NEG_INFINITY; 3];
    for p in &mesh.vertices {
        let q = axes(*p).map(|v| (v / 100.0) as f32);
        for d in 0..3 {
            lo[d] = lo[d].min(q[d]);
            hi[d] = hi[d].max(q[d]);
            bin.extend_from_slice(&q[d].to_le_bytes());
        }
    }
    let colour_offset = bin.len();
    for c in &colours {
        for v in c {
            // COLOR_0 is linear RGB (glTF 2.0 §3.7.2.1).
            bin.extend_from_slice(&(srgb_to_linear(*v) as f32).to_le_bytes());
        }
    }
    let index_offset = bin.len();
    let mut max_index = 0u32;
    for t in &mesh.triangles {
        for &i in t {
            max_index = max_index.max(i);
            bin.extend_from_slice(&i.to_le_bytes());
        }
    }
    let total = bin.len();
    let mut buffer = json!({ "byteLength": total });
    if let Some(u) = uri {
        buffer["uri"] = json!(u);
    }
    let doc = json!({
        "asset": { "version": "2.0", "generator": "inkfit" },
        "scene": 0,
        "scenes": [ { "nodes": [0] } ],
        "nodes": [ { "mesh": 0, "name": title } ],
        "meshes": [ {
            "name": title,
            "primitives": [ {
                "attributes": { "POSITION": 0, "COLOR_0": 1 },
                "indices": 2,
                "mode": 4
            } ]
        } ],
        "buffers": [ buffer ],
        "bufferViews": [
            { "buffer": 0, "byteOffset": 0, "byteLength": colour_offset, "target": 34962 },
            { "buffer": 0, "byteOffset": colour_offset, "byteLength": index_offset - colour_offset, "target": 34962 },
            { "buffer": 0, "byteOffset": index_offset, "byteLength": total - index_offset, "target": 34963 }
        ],
        "accessors": [
            { "bufferView": 0, "componentType": 5126, "count": nv, "type": "VEC3",
              "min": lo.map(f64::from), "max": hi.map(f64::from) },
            { "bufferView": 1, "componentType": 5126, "count": nv, "type": "VEC3" },
            { "bufferView": 2, "componentType": 5125, "count": mesh.triangles.len() * 3, "type": "SCALAR",
              "min": [0], "max": [max_index] }
        ]
    });
    (doc, bin)
}

/// glTF 2.0 JSON with the buffer embedded as a base64 data URI.
pub fn write_gltf(w: &mut dyn Write, mesh: &Mesh, title: &str) -> io::Result<()> {
    let (_, bin) = gltf_parts(mesh, title, None);
    let uri = format!("data:application/octet-stream;base64,{}", base64(&bin));
    let (doc, _) = gltf_parts(mesh, title, Some(uri));
    serde_json::to_writer_pretty(&mut *w, &doc)?;
    writeln!(w)
}

/// glTF 2.0 binary container (GLB): 12-byte header, a JSON chunk padded
/// with spaces and a BIN chunk padded with zeros to 4 bytes (glTF 2.0 §4.4).
pub fn write_glb(w: &mut dyn Write, mesh: &Mesh, title: &str) -> io::Result<()> {
    let (doc, mut bin) = gltf_parts(mesh, title, None);
    let mut text = serde_json::to_vec(&doc)?;
    while text.len() % 4 != 0 {
        text.push(b' ');
    }
    while bin.len() % 4 != 0 {
        bin.push(0);
    }
    let total = 12 + 8 + text.len() + 8 + bin.len();
    let too_big = || io::Error::new(io::ErrorKind::InvalidInput, "mesh too large for GLB");
    let u32_of = |n: usize| u32::try_from(n).map_err(|_| too_big());
    w.write_all(b"glTF")?;
    w.write_all(&2u32.to_le_bytes())?;
    w.write_all(&u32_of(total)?.to_le_bytes())?;
    w.write_all(&u32_of(text.len())?.to_le_bytes())?;
    w.write_all(b"JSON")?;
    w.write_all(&text)?;
    w.write_all(&u32_of(bin.len())?.to_le_bytes())?;
    w.write_all(b"BIN\0")?;
    w.write_all(&bin)
}

/// Writes `mesh` in `format`.
pub fn write_mesh(w: &mut dyn Write, mesh: &Mesh, title: &str, format: MeshFormat) -> io::Result<()> {
    match format {
        MeshFormat::Ply => write_ply(w, mesh, title),
        MeshFormat::Gltf => write_gltf(w, mesh, title),
        MeshFormat::Glb => write_glb(w, mesh, title),
    }
}

/// Base64 with padding (RFC 4648, §4).
pub fn base64(data: &[u8]) -> String {
    const ALPHABET: &[u8; 64] = b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
    let mut out = String::with_capacity(data.len().div_ceil(3) * 4);
    for chunk in data.chunks(3) {
        let b = [chunk[0], *chunk.get(1).unwrap_or(&0), *chunk.get(2).unwrap_or(&0)];
        let n = (u32::from(b[0]) << 16) | (u32::from(b[1]) << 8) | u32::from(b[2]);
        for k in 0..4 {
            if k <= chunk.len() {
                out.push(ALPHABET[((n >> (18 - 6 * k)) & 63) as usize] as char);
            } else {
                out.push('=');
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn base64_matches_rfc4648_test_vectors() {
        // RFC 4648, section 10.
        for (plain, coded) in [
            ("", ""),
            ("f", "Zg=="),
            ("fo", "Zm8="),
            ("foo", "Zm9v"),
            ("foob", "Zm9vYg=="),
            ("fooba", "Zm9vYmE="),
            ("foobar", "Zm9vYmFy"),
        ] {
            assert_eq!(base64(plain.as_bytes()), coded, "{plain:?}");
        }
    }

    #[test]
    fn srgb_white_and_red_come_back() {
        // D50 white is sRGB white under relative colorimetric; sRGB red
        // (1, 0, 0) is CIELAB D50 ≈ 54.29, 80.80, 69.89 (from memory, Bradford-adapted).
        let c = srgb_colours(&[[100.0, 0.0, 0.0], [54.29, 80.80, 69.89]]);
        assert!(c[0].iter().all(|v| (v - 1.0).abs() < 0.01), "{c:?}");
        assert!(
            (c[1][0] - 1.0).abs() < 0.01 && c[1][1] < 0.03 && c[1][2] < 0.03,
            "{c:?}"
        );
    }
}
