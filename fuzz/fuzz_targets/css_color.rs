//! Colour text in CSS syntax: `inkfit::color::css::parse_color`, and the
//! `FromStr` impl that the CLI's `--color` arguments go through.
#![no_main]

use inkfit::color::css::{parse_color, ColorInput};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    let parsed = parse_color(text);
    match &parsed {
        Ok(c) => inkfit_fuzz::check_color(text, c),
        Err(e) => {
            assert_eq!(e.input, text, "property: the error quotes the input");
            let _ = e.to_string();
        }
    }
    // Compared as text, so that NaN equals NaN (see `nonfinite-lab`).
    assert_eq!(
        format!("{:?}", text.parse::<ColorInput>()),
        format!("{parsed:?}"),
        "property: FromStr and parse_color agree"
    );
});
