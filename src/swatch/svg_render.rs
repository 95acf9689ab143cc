//! Which colours of SVG artwork touch: the drawing rendered (resvg, with
//! anti-aliasing) and read as a map image ([`super::map_raster`]). Each
//! artwork colour that is a class of the rendering gets its share of the
//! drawing and its neighbours; colours seen only blended (painted with
//! opacity below 1), in gradients, or in lines too thin to paint areas are no
//! classes there, and pairs with them keep the full separation floor.
//! Text is not drawn (resvg is built without text support).

use super::adjacency::{Adjacency, AdjacencySource};
use super::map_raster::{code8, find_classes, MIN_BORDER_PX};
use super::{Palette, PaletteError};

/// The rendering's longer side, pixels: borders are counted at this size.
pub const RENDER_LONG_SIDE: f32 = 1024.0;

/// Renders the artwork `text` (already read into `palette`) and gives the
/// palette the shares and adjacency of the colours that paint areas.
pub fn find_touching(file: &str, text: &str, palette: &mut Palette, min_class_share: f64) -> Result<(), PaletteError> {
    let err = |message: String| PaletteError::Format {
        file: file.to_string(),
        message,
    };
    let tree = resvg::usvg::Tree::from_str(text, &resvg::usvg::Options::default())
        .map_err(|e| err(format!("cannot render it to find which colours touch: {e}")))?;
    let size = tree.size();
    let scale = RENDER_LONG_SIDE / size.width().max(size.height());
    let (w, h) = (
        (size.width() * scale).ceil().max(1.0) as u32,
        (size.height() * scale).ceil().max(1.0) as u32,
    );
    let mut pix =
        resvg::tiny_skia::Pixmap::new(w, h).ok_or_else(|| err("its size gives no image to render".to_string()))?;
    resvg::render(
        &tree,
        resvg::tiny_skia::Transform::from_scale(scale, scale),
        &mut pix.as_mut(),
    );
    // Premultiplied RGBA: a fully opaque pixel holds its colour as is.
    let data = pix.data();
    let rgb: Vec<u8> = data.chunks_exact(4).flat_map(|p| [p[0], p[1], p[2]]).collect();
    let opacity = |i: usize| match data[4 * i + 3] {
        0 => None,
        255 => Some(true),
        _ => Some(false),
    };
    let m = find_classes(w as usize, h as usize, &rgb, &opacity, min_class_share)
        .map_err(|n| err(format!("its rendering has {n} class colours, more than can be checked")))?;
    // Class → entry by colour (artwork entries are distinct colours).
    let entry_of: Vec<Option<usize>> = m
        .classes
        .iter()
        .map(|c| {
            palette
                .entries
                .iter()
                .position(|e| code8(&e.color) == Some(c.rgb.map(i64::from)))
        })
        .collect();
    let mut known = vec![false; palette.entries.len()];
    for (ci, e) in entry_of.iter().enumerate() {
        if let Some(e) = *e {
            known[e] = true;
            palette.entries[e].share = Some(m.share(ci));
        }
    }
    let touching = m
        .borders
        .iter()
        .filter(|(_, &len)| len >= MIN_BORDER_PX)
        .filter_map(|(&(a, b), &len)| match (entry_of[a], entry_of[b]) {
            (Some(x), Some(y)) => Some(((x.min(y), x.max(y)), Some(len))),
            _ => None,
        })
        .collect();
    palette.adjacency = Some(Adjacency::new(AdjacencySource::Render, touching).with_known(known));
    Ok(())
}
