//! Small copies of images for a page: each side at most a given length,
//! 8 bits per sample.
//!
//! An image is reduced by a whole factor k: each preview pixel stands for a
//! k × k block of image pixels (fewer at the right and bottom edges).

/// The whole factor that brings the longer side within `max_side`.
fn factor(width: u32, height: u32, max_side: u32) -> u32 {
    width.max(height).div_ceil(max_side.max(1)).max(1)
}

/// An 8-bit sample from sample `i` of `bits`-bit samples (16-bit samples in
/// native byte order, as in [`super::Raster::color`]).
fn sample8(s: &[u8], bits: u8, i: usize) -> u32 {
    if bits == 16 {
        let v = u16::from_ne_bytes([s[2 * i], s[2 * i + 1]]);
        (u32::from(v) * 255 + 32767) / 65535
    } else {
        u32::from(s[i])
    }
}

/// Reduces an image by the whole factor that fits `max_side`: `pick` gives
/// the colour of each preview pixel from the indices of the image pixels its
/// block holds. Returns the samples, width and height.
fn reduce(
    width: u32,
    height: u32,
    max_side: u32,
    mut pick: impl FnMut(&mut dyn Iterator<Item = usize>) -> [u8; 3],
) -> (Vec<u8>, u32, u32) {
    let k = factor(width, height, max_side);
    let (pw, ph) = (width.div_ceil(k), height.div_ceil(k));
    let (w, k) = (width as usize, k as usize);
    let mut out = Vec::with_capacity(pw as usize * ph as usize * 3);
    for py in 0..ph as usize {
        let rows = py * k..((py + 1) * k).min(height as usize);
        for px in 0..pw as usize {
            let cols = px * k..((px + 1) * k).min(w);
            let mut block = rows.clone().flat_map(|y| cols.clone().map(move |x| y * w + x));
            out.extend(pick(&mut block));
        }
    }
    (out, pw, ph)
}

/// A preview of an RGB image (3 samples a pixel, `bits` 8 or 16): the mean
/// of each block in the encoded values. Averaging encoded rather than
/// linear values darkens fine high-contrast detail a little; a preview shows
/// the picture, not its exact colours. Returns the samples, width and height.
pub fn preview_mean(rgb: &[u8], width: u32, height: u32, bits: u8, max_side: u32) -> (Vec<u8>, u32, u32) {
    reduce(width, height, max_side, |block| {
        let (mut sum, mut n) = ([0u32; 3], 0u32);
        for i in block {
            for (c, s) in sum.iter_mut().enumerate() {
                *s += sample8(rgb, bits, 3 * i + c);
            }
            n += 1;
        }
        sum.map(|s| ((s + n / 2) / n.max(1)) as u8)
    })
}

/// A preview of an 8-bit RGB image that keeps, of each block, the pixel of
/// highest luma (Rec. 601 weights). On a colour scale whose lightness rises
/// with the value shown, as the ΔE00 map's does, that is the block's largest
/// value: the preview hides no spot where the print changes most, and
/// shows no colour that is not on the scale (which a mean would).
pub fn preview_brightest(rgb: &[u8], width: u32, height: u32, max_side: u32) -> (Vec<u8>, u32, u32) {
    reduce(width, height, max_side, |block| {
        let luma = |p: &[u8; 3]| 299 * u32::from(p[0]) + 587 * u32::from(p[1]) + 114 * u32::from(p[2]);
        let mut best: Option<[u8; 3]> = None;
        for i in block {
            let p = [rgb[3 * i], rgb[3 * i + 1], rgb[3 * i + 2]];
            if best.is_none_or(|b| luma(&p) > luma(&b)) {
                best = Some(p);
            }
        }
        best.unwrap_or([0; 3])
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    // Property: a preview within the size keeps every pixel as it is.
    #[test]
    fn a_small_image_is_kept_whole() {
        let rgb: Vec<u8> = (0..2 * 3 * 3).map(|v| v as u8 * 10).collect();
        assert_eq!(preview_mean(&rgb, 3, 2, 8, 640), (rgb.clone(), 3, 2));
        assert_eq!(preview_brightest(&rgb, 3, 2, 640), (rgb, 3, 2));
    }

    // Independent computation: a 5 × 3 image reduced by 2 has 3 × 2 blocks;
    // the edge blocks hold fewer pixels and are averaged over those alone.
    #[test]
    fn blocks_are_averaged_and_edges_are_partial() {
        let (w, h) = (5u32, 3u32);
        let mut rgb = Vec::new();
        for y in 0..h {
            for x in 0..w {
                rgb.extend([(10 * x + y) as u8, 100, (x * y) as u8]);
            }
        }
        let (p, pw, ph) = preview_mean(&rgb, w, h, 8, 3);
        assert_eq!((pw, ph), (3, 2));
        // Block (0,0): x 0..2, y 0..2: R = (0+1+10+11)/4 = 5.5 → 6.
        assert_eq!(&p[0..3], &[6, 100, 0]);
        // Block (2,1): x 4, y 2 only: R = 42, B = 8.
        assert_eq!(&p[15..18], &[42, 100, 8]);
    }

    // Independent computation: 16-bit 65535 is 8-bit 255, 32896 is 128.
    #[test]
    fn sixteen_bit_samples_become_eight_bit() {
        let mut rgb = Vec::new();
        for v in [65535u16, 32896, 0] {
            rgb.extend(v.to_ne_bytes());
        }
        assert_eq!(preview_mean(&rgb, 1, 1, 16, 8).0, vec![255, 128, 0]);
    }

    // Property: the brightest pixel of each block is kept, whole.
    #[test]
    fn brightest_keeps_the_lightest_pixel_of_each_block() {
        let rgb = [10u8, 10, 10, 200, 30, 30, 20, 20, 20, 0, 0, 250];
        let (p, pw, ph) = preview_brightest(&rgb, 2, 2, 1);
        assert_eq!((pw, ph), (1, 1));
        assert_eq!(p, vec![200, 30, 30]);
    }
}
