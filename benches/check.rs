//! End-to-end palette check of 1,000 colours: profile load, transform build,
//! conversions and ΔE00, as `inkfit check` runs it.

mod common;
use common::palette_text;

use criterion::{black_box, criterion_group, criterion_main, Criterion};
use inkfit::icc::transform::PressMapping;
use inkfit::icc::{IccProfile, RenderingIntent};
use inkfit::swatch::check::{check, CheckOptions};
use inkfit::swatch::{Format, Palette};

fn bench_check(c: &mut Criterion) {
    let palette = Palette::parse("bench", &palette_text(1000, 0x2545_f491), Format::Text).unwrap();
    let opts = CheckOptions {
        mapping: PressMapping {
            intent: RenderingIntent::Relative,
            bpc: true,
            paper_white: false,
        },
        tolerance: 3.0,
        ink_limit: None,
    };
    c.bench_function("check_1000_colours_end_to_end", |b| {
        b.iter(|| {
            let screen = IccProfile::load("srgb").unwrap().require_screen().unwrap();
            let press = IccProfile::load("offset-coated").unwrap().require_press().unwrap();
            black_box(check(&palette, &screen, &press, opts).unwrap())
        })
    });
    let screen = IccProfile::load("srgb").unwrap();
    let press = IccProfile::load("offset-coated").unwrap();
    c.bench_function("check_1000_colours_profiles_loaded", |b| {
        b.iter(|| black_box(check(&palette, &screen, &press, opts).unwrap()))
    });
}

criterion_group!(benches, bench_check);
criterion_main!(benches);
