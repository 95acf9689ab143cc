//! Number precision: the fixed decimals results are stored with and printed
//! with. A leaf module: analyses round their result structs here and
//! renderers format numbers here, so neither imports the other for it.

/// `v` rounded to `places` decimals, with negative zero made positive: the
/// fixed precision every result struct stores.
pub fn round(v: f64, places: i32) -> f64 {
    let f = 10f64.powi(places);
    let r = (v * f).round() / f;
    if r == 0.0 {
        0.0
    } else {
        r
    }
}

/// [`round`] of every component.
pub fn round_all<const N: usize>(v: [f64; N], places: i32) -> [f64; N] {
    v.map(|x| round(x, places))
}

/// Fixed-precision text; a value that rounds to zero prints without a sign.
pub fn fixed(v: f64, places: usize) -> String {
    let s = format!("{v:.places$}");
    if s.starts_with('-') && s[1..].chars().all(|c| c == '0' || c == '.') {
        s[1..].to_string()
    } else {
        s
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn negative_zero_is_made_positive() {
        // IEEE 754 keeps the sign of a product that rounds to zero; JSON and
        // tables must not show "-0" (a property, not a stored value).
        assert!(round(-0.0004, 2).is_sign_positive());
        assert_eq!(fixed(-0.0004, 2), "0.00");
        assert_eq!(fixed(-0.006, 2), "-0.01");
        assert_eq!(round(2.345_678, 4), 2.3457);
        assert_eq!(round_all([1.25, -0.001], 1), [1.3, 0.0]);
    }
}
