//! Rendered maps read as a palette: the class colours of a map image (PNG or
//! TIFF, grey or RGB), each with its share of the map, and which classes
//! touch, with the length of each shared border.
//!
//! A class is a colour that paints areas: it covers at least a given share
//! of the map, and some of its pixels are *interior* (all four neighbours
//! the same colour). The anti-aliasing blends a renderer draws where two
//! classes meet lie in bands one or two pixels wide, so they have almost no
//! interior pixels and are not taken for classes; nor are the blends of a
//! map's edge with a transparent background (alpha between 0 and full).
//! Smooth gradients (relief shading) have no interior pixels either, except
//! where 8-bit steps leave flat plateaus.
//!
//! Pixels that are no class's colour, up to [`BLEND_WIDTH`] pixels from a
//! class, are then given to the neighbouring class nearest in RGB, so a blend
//! band splits between the two classes it blends; each class's share counts
//! the pixels it then holds. Two classes touch where their pixels are
//! 4-neighbours; a border's length is the number of such pixel edges (a
//! diagonal border counts up to √2 its length). Borders shorter than
//! [`MIN_BORDER_PX`] are point contacts (four classes meeting at a corner, a
//! stray blend pixel), not borders.

use std::collections::HashMap;
use std::path::Path;

use super::adjacency::{Adjacency, AdjacencySource};
use super::{Entry, Palette, PaletteError, MAX_ENTRIES};
use crate::color::css::{parse_color, ColorInput};
use crate::color::LabD50;
use crate::icc::transform::{self, Side};
use crate::icc::{check_embedded, IccProfile, Origin, RenderingIntent};
use crate::raster::{self, DecodeLimits, Raster};

/// Default smallest share of the map a class covers: 0.05 %, about a
/// 22 × 22 pixel area on a one-megapixel map (our choice, small enough for
/// small classes, large enough to leave out stray colours).
pub const DEFAULT_MIN_CLASS_SHARE: f64 = 0.0005;

/// A class colour has at least this many interior pixels.
pub const MIN_INTERIOR_PX: u32 = 4;

/// How far from a class, in pixels, a pixel of another colour is taken for
/// a blend and given to a class: anti-aliasing draws bands one or two
/// pixels wide (common practice of renderers).
pub const BLEND_WIDTH: usize = 2;

/// Shortest shared border, in pixel edges, for two classes to touch.
pub const MIN_BORDER_PX: u64 = 3;

/// How map rasters are read.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct MapOptions {
    /// Smallest share of the map's pixels (0..1) a class covers.
    pub min_class_share: f64,
    /// Pixel limits for decoding.
    pub limits: DecodeLimits,
}

impl Default for MapOptions {
    fn default() -> Self {
        MapOptions {
            min_class_share: DEFAULT_MIN_CLASS_SHARE,
            limits: DecodeLimits::default(),
        }
    }
}

/// One class colour of a map.
#[derive(Clone, Debug, PartialEq)]
pub struct MapClass {
    /// Its colour.
    pub rgb: [u8; 3],
    /// Pixels of exactly this colour.
    pub exact_px: u64,
    /// Pixels it holds once the blends are shared out.
    pub pixels: u64,
}

/// The classes of a map and how they touch.
#[derive(Clone, Debug, PartialEq)]
pub struct MapClasses {
    /// Classes, largest share first.
    pub classes: Vec<MapClass>,
    /// Map pixels: all but the fully transparent ones.
    pub map_px: u64,
    /// Shared border length per pair of classes (0-based indices into
    /// `classes`, lower first), in pixel edges, every border counted.
    pub borders: HashMap<(usize, usize), u64>,
}

impl MapClasses {
    /// The share of the map class `i` holds.
    pub fn share(&self, i: usize) -> f64 {
        if self.map_px == 0 {
            0.0
        } else {
            self.classes[i].pixels as f64 / self.map_px as f64
        }
    }

    /// The share of the map no class holds (text, gradients, stray colours).
    pub fn unclassified_share(&self) -> f64 {
        let held: u64 = self.classes.iter().map(|c| c.pixels).sum();
        if self.map_px == 0 {
            0.0
        } else {
            (self.map_px - held) as f64 / self.map_px as f64
        }
    }
}

const NONE: u16 = u16::MAX;

fn key(p: &[u8]) -> usize {
    (usize::from(p[0]) << 16) | (usize::from(p[1]) << 8) | usize::from(p[2])
}

fn dist2(a: &[u8], b: [u8; 3]) -> u32 {
    (0..3)
        .map(|i| {
            let d = i32::from(a[i]) - i32::from(b[i]);
            (d * d) as u32
        })
        .sum()
}

/// The classes of an 8-bit RGB image (`rgb`: 3 bytes per pixel, rows top
/// down); `opacity` per pixel: `Some(true)` fully opaque, `Some(false)` partly
/// transparent, `None` fully transparent (not part of the map). An image of
/// more than [`MAX_ENTRIES`] classes is an error (the count).
pub fn find_classes(
    width: usize,
    height: usize,
    rgb: &[u8],
    opacity: &dyn Fn(usize) -> Option<bool>,
    min_class_share: f64,
) -> Result<MapClasses, usize> {
    let n = width * height;
    debug_assert_eq!(rgb.len(), n * 3);
    let px = |i: usize| &rgb[3 * i..3 * i + 3];
    // Per colour: all pixels and interior pixels.
    let mut counts = ColourCounts::new(n);
    let mut map_px = 0u64;
    let same = |i: usize, j: usize| opacity(j) == Some(true) && px(i) == px(j);
    for y in 0..height {
        for x in 0..width {
            let i = y * width + x;
            match opacity(i) {
                None => continue,
                Some(false) => {
                    map_px += 1;
                    continue;
                }
                Some(true) => map_px += 1,
            }
            // A neighbour outside the image counts as the same colour.
            let core = (x == 0 || same(i, i - 1))
                && (x + 1 == width || same(i, i + 1))
                && (y == 0 || same(i, i - width))
                && (y + 1 == height || same(i, i + width));
            counts.add(key(px(i)), core);
        }
    }
    let floor = (min_class_share * map_px as f64).ceil().max(1.0) as u32;
    let mut found = counts.classes(floor);
    if found.len() > MAX_ENTRIES {
        return Err(found.len());
    }
    // Largest first; equal counts in colour order, so the result is fixed.
    found.sort_by(|a, b| b.0.cmp(&a.0).then(a.1.cmp(&b.1)));
    let class_of: HashMap<usize, u16> = found.iter().enumerate().map(|(c, &(_, k))| (k, c as u16)).collect();
    let colours: Vec<[u8; 3]> = found
        .iter()
        .map(|&(_, k)| [(k >> 16) as u8, (k >> 8) as u8, k as u8])
        .collect();
    let mut label = vec![NONE; n];
    let mut last: Option<(usize, u16)> = None;
    for (i, l) in label.iter_mut().enumerate() {
        if opacity(i) == Some(true) {
            let k = key(px(i));
            // Neighbouring pixels mostly share a colour: look up once per run.
            let c = match last {
                Some((lk, c)) if lk == k => c,
                _ => {
                    let c = class_of.get(&k).copied().unwrap_or(NONE);
                    last = Some((k, c));
                    c
                }
            };
            *l = c;
        }
    }
    share_blends(width, height, rgb, opacity, &colours, &mut label);
    let mut pixels = vec![0u64; colours.len()];
    let mut borders: HashMap<(usize, usize), u64> = HashMap::new();
    for y in 0..height {
        for x in 0..width {
            let i = y * width + x;
            let a = label[i];
            if a == NONE {
                continue;
            }
            pixels[usize::from(a)] += 1;
            let mut edge = |j: usize| {
                let b = label[j];
                if b != NONE && b != a {
                    let (lo, hi) = if a < b { (a, b) } else { (b, a) };
                    *borders.entry((usize::from(lo), usize::from(hi))).or_insert(0) += 1;
                }
            };
            if x + 1 < width {
                edge(i + 1);
            }
            if y + 1 < height {
                edge(i + width);
            }
        }
    }
    let classes = found
        .iter()
        .zip(colours)
        .zip(pixels)
        .map(|((&(exact, _), rgb), pixels)| MapClass {
            rgb,
            exact_px: u64::from(exact),
            pixels,
        })
        .collect();
    Ok(MapClasses {
        classes,
        map_px,
        borders,
    })
}

/// Gives each unlabelled map pixel within [`BLEND_WIDTH`] of a class to the
/// labelled 4-neighbour whose class colour is nearest its own colour, one
/// ring at a time (so the result does not depend on scan order).
fn share_blends(
    width: usize,
    height: usize,
    rgb: &[u8],
    opacity: &dyn Fn(usize) -> Option<bool>,
    colours: &[[u8; 3]],
    label: &mut [u16],
) {
    let mut ring: Vec<(usize, u16)> = Vec::new();
    for _ in 0..BLEND_WIDTH {
        ring.clear();
        for y in 0..height {
            for x in 0..width {
                let i = y * width + x;
                if label[i] != NONE || opacity(i).is_none() {
                    continue;
                }
                let here = &rgb[3 * i..3 * i + 3];
                let mut best: Option<(u32, u16)> = None;
                let mut consider = |j: usize| {
                    let l = label[j];
                    if l != NONE {
                        let d = dist2(here, colours[usize::from(l)]);
                        if best.is_none_or(|(bd, bl)| (d, l) < (bd, bl)) {
                            best = Some((d, l));
                        }
                    }
                };
                if x > 0 {
                    consider(i - 1);
                }
                if x + 1 < width {
                    consider(i + 1);
                }
                if y > 0 {
                    consider(i - width);
                }
                if y + 1 < height {
                    consider(i + width);
                }
                if let Some((_, l)) = best {
                    ring.push((i, l));
                }
            }
        }
        if ring.is_empty() {
            break;
        }
        for &(i, l) in &ring {
            label[i] = l;
        }
    }
}

/// Pixel and interior-pixel counts per colour: a hash map for images up
/// to [`DENSE_FROM`] pixels, else two tables over all 2²⁴ colours (128 MiB
/// of address space whose pages the allocator hands out zeroed and lazily,
/// so only the colours present cost memory).
enum ColourCounts {
    Sparse(HashMap<usize, (u32, u32)>),
    Dense { all: Vec<u32>, interior: Vec<u32> },
}

/// Images of at least this many pixels count colours in dense tables.
const DENSE_FROM: usize = 4 << 20;

impl ColourCounts {
    fn new(pixels: usize) -> Self {
        if pixels < DENSE_FROM {
            ColourCounts::Sparse(HashMap::new())
        } else {
            ColourCounts::Dense {
                all: vec![0; 1 << 24],
                interior: vec![0; 1 << 24],
            }
        }
    }

    fn add(&mut self, k: usize, core: bool) {
        match self {
            ColourCounts::Sparse(m) => {
                let e = m.entry(k).or_insert((0, 0));
                e.0 += 1;
                e.1 += u32::from(core);
            }
            ColourCounts::Dense { all, interior } => {
                all[k] += 1;
                interior[k] += u32::from(core);
            }
        }
    }

    /// `(pixels, colour)` of every colour with at least `floor` pixels and
    /// [`MIN_INTERIOR_PX`] interior pixels.
    fn classes(&self, floor: u32) -> Vec<(u32, usize)> {
        let is_class = |all: u32, interior: u32| all >= floor && interior >= MIN_INTERIOR_PX;
        match self {
            ColourCounts::Sparse(m) => m
                .iter()
                .filter(|(_, &(a, i))| is_class(a, i))
                .map(|(&k, &(a, _))| (a, k))
                .collect(),
            ColourCounts::Dense { all, interior } => (0..1usize << 24)
                .filter(|&k| is_class(all[k], interior[k]))
                .map(|k| (all[k], k))
                .collect(),
        }
    }
}

/// An 8-bit sample from a decoded sample of `bytes` bytes (16-bit in native
/// order), rounded.
fn sample8(s: &[u8], bytes: usize) -> u8 {
    if bytes == 1 {
        s[0]
    } else {
        let v = u32::from(u16::from_ne_bytes([s[0], s[1]]));
        ((v * 255 + 32_767) / 65_535) as u8
    }
}

fn raster_err(file: &str, e: raster::RasterError) -> PaletteError {
    PaletteError::Format {
        file: file.to_string(),
        message: format!(
            "cannot read it as a map image: {}",
            e.to_string().trim_start_matches(&format!("'{file}': "))
        ),
    }
}

/// Reads a rendered map (PNG or TIFF, grey or RGB, 8 or 16 bits, alpha
/// allowed) as a palette: one entry per class colour, largest share first,
/// named by its hex code, with its share and the map's adjacency.
pub fn read_map(path: &Path, opts: &MapOptions) -> Result<Palette, PaletteError> {
    let file = path.display().to_string();
    if path.is_dir() {
        return Err(PaletteError::Folder { file });
    }
    let r: Raster = raster::read_within(path, &opts.limits).map_err(|e| raster_err(&file, e))?;
    let info = &r.info;
    if info.channels == 4 {
        return Err(PaletteError::Format {
            file,
            message: "a CMYK image; map images are read as RGB or grey, the colours a screen shows".to_string(),
        });
    }
    let (w, h) = (info.width as usize, info.height as usize);
    let bytes = info.bytes_per_sample();
    let ch = info.channels;
    let mut rgb = Vec::new();
    rgb.try_reserve_exact(w * h * 3).map_err(|_| PaletteError::Format {
        file: file.clone(),
        message: "not enough memory for its pixels".to_string(),
    })?;
    for p in r.color.chunks_exact(ch * bytes) {
        if ch == 1 {
            let v = sample8(p, bytes);
            rgb.extend_from_slice(&[v, v, v]);
        } else {
            rgb.extend((0..3).map(|c| sample8(&p[c * bytes..], bytes)));
        }
    }
    drop(r.color);
    let full = if bytes == 1 { 0xff } else { 0xffff };
    let alpha = r.alpha;
    let opacity = |i: usize| -> Option<bool> {
        match &alpha {
            None => Some(true),
            Some(a) => {
                let v = if bytes == 1 {
                    u32::from(a[i])
                } else {
                    u32::from(u16::from_ne_bytes([a[2 * i], a[2 * i + 1]]))
                };
                match v {
                    0 => None,
                    v => Some(v == full),
                }
            }
        }
    };
    let m = find_classes(w, h, &rgb, &opacity, opts.min_class_share).map_err(|count| PaletteError::TooMany {
        file: file.clone(),
        count,
        limit: MAX_ENTRIES,
    })?;
    let mut p = palette_of(&file, &m)?;
    if let Some(icc) = &info.icc {
        in_embedded_profile(&file, path, icc, ch, &mut p)?;
    }
    Ok(p)
}

/// A map image that embeds an ICC profile was made in that profile's
/// colours: each class colour (its 8-bit code, the entry's input) is
/// converted from it to CIELAB D50, relative colorimetric as a check's
/// screen side is, so the check starts from the colours of the map and the
/// screen profile does not apply to them. The profile must fit the pixels
/// (as `proof` requires); one that cannot be used is an error naming the file.
fn in_embedded_profile(
    file: &str,
    path: &Path,
    icc: &[u8],
    channels: usize,
    p: &mut Palette,
) -> Result<(), PaletteError> {
    let bad = |detail: String| PaletteError::Format {
        file: file.to_string(),
        message: format!("its embedded ICC profile cannot be used: {detail}"),
    };
    let name = format!("{file} (embedded profile)");
    let prof = IccProfile::from_bytes(&name, Origin::File(path.to_path_buf()), icc.to_vec())
        .map_err(|e| bad(e.to_string()))?;
    check_embedded(&prof, channels).map_err(bad)?;
    // The classes' colours as read: their 8-bit codes as screen RGB.
    let colours: Vec<ColorInput> = p.entries.iter().map(|e| e.color).collect();
    let lab: Vec<LabD50> = if channels == 1 {
        let t = transform::local::<f64, [f64; 3]>(
            Side::of(&prof, lcms2::PixelFormat::GRAY_DBL),
            Side::Lab,
            RenderingIntent::Relative,
            false,
        )
        .map_err(|e| bad(e.to_string()))?;
        let grey: Vec<f64> = colours
            .iter()
            .map(|c| match c {
                ColorInput::ScreenRgb(rgb) => rgb[0],
                _ => 0.0,
            })
            .collect();
        let mut out = vec![[0.0; 3]; grey.len()];
        t.transform_pixels(&grey, &mut out);
        out.into_iter().map(LabD50::from_array).collect()
    } else {
        // RGB in the embedded profile, as screen RGB goes through --screen.
        transform::resolve_lab(&colours, &prof, None).map_err(|e| bad(e.to_string()))?
    };
    for (e, l) in p.entries.iter_mut().zip(lab) {
        e.color = ColorInput::Lab(l);
    }
    let what = prof
        .description()
        .map_or_else(|| "an ICC profile".to_string(), |d| format!("the ICC profile \"{d}\""));
    p.notes.push(format!(
        "{file} embeds {what}: its class colours are converted from it to CIELAB, so --screen does not apply to them"
    ));
    Ok(())
}

/// The palette of a map's classes.
pub fn palette_of(file: &str, m: &MapClasses) -> Result<Palette, PaletteError> {
    if m.classes.is_empty() {
        return Err(PaletteError::Format {
            file: file.to_string(),
            message: "no class colours in it: no colour paints areas covering the smallest class share".to_string(),
        });
    }
    let entries = m
        .classes
        .iter()
        .enumerate()
        .map(|(i, c)| {
            let hex = format!("#{:02x}{:02x}{:02x}", c.rgb[0], c.rgb[1], c.rgb[2]);
            let color = parse_color(&hex).map_err(|source| PaletteError::Color {
                file: file.to_string(),
                line: i + 1,
                source,
            })?;
            Ok(Entry {
                name: hex.clone(),
                input: hex,
                color,
                line: i + 1,
                usage: None,
                share: Some(m.share(i)),
            })
        })
        .collect::<Result<Vec<_>, PaletteError>>()?;
    let touching = m
        .borders
        .iter()
        .filter(|(_, &len)| len >= MIN_BORDER_PX)
        .map(|(&pair, &len)| (pair, Some(len)))
        .collect();
    Ok(Palette {
        source: file.to_string(),
        entries,
        scheme_hint: None,
        adjacency: Some(Adjacency::new(AdjacencySource::Map, touching)),
        unclassified_share: Some(m.unclassified_share()),
        notes: Vec::new(),
    })
}

/// A screen colour's 8-bit codes, unclamped (so a colour outside 0–255
/// matches no pixel); `None` for a press colour.
pub(crate) fn code8(c: &crate::color::css::ColorInput) -> Option<[i64; 3]> {
    match c {
        crate::color::css::ColorInput::ScreenRgb(v) => Some(v.map(|x| (x * 255.0).round() as i64)),
        _ => None,
    }
}

/// Names a map's classes from a legend palette: a class whose colour is,
/// to the 8-bit code, the colour of a legend entry takes that entry's name
/// (the first such entry). Returns how many classes were named.
pub fn name_classes(map: &mut Palette, legend: &Palette) -> usize {
    let mut named = 0;
    for e in &mut map.entries {
        // A class's 8-bit code is its input text (its colour may have been
        // converted from the map's own profile).
        let Some(k) = parse_color(&e.input).ok().as_ref().and_then(code8) else {
            continue;
        };
        if let Some(l) = legend.entries.iter().find(|l| code8(&l.color) == Some(k)) {
            e.name = l.name.clone();
            named += 1;
        }
    }
    named
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dense_and_sparse_counts_agree() {
        // The same counts through both tables (property: the choice of table
        // is a matter of memory only).
        let mut sparse = ColourCounts::new(0);
        let mut dense = ColourCounts::new(DENSE_FROM);
        let mut s = 12_345u32;
        for _ in 0..20_000 {
            s = s.wrapping_mul(1_664_525).wrapping_add(1_013_904_223);
            let k = (s >> 8) as usize % 50 * 0x3_0507;
            let core = s & 3 == 0;
            sparse.add(k, core);
            dense.add(k, core);
        }
        let mut a = sparse.classes(300);
        let mut b = dense.classes(300);
        a.sort_unstable();
        b.sort_unstable();
        assert!(!a.is_empty());
        assert_eq!(a, b);
    }
}
