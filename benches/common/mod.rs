//! What several benches share.

/// `n` colours spread over the RGB cube deterministically from `seed` (a
/// linear congruential generator, Numerical Recipes constants), one
/// `#rrggbb cI` line each.
pub fn palette_text(n: usize, seed: u32) -> String {
    let mut s = seed;
    let mut out = String::new();
    for i in 0..n {
        s = s.wrapping_mul(1_664_525).wrapping_add(1_013_904_223);
        out.push_str(&format!("#{:06x} c{i}\n", s >> 8));
    }
    out
}
