//! Palette survival speed: the whole check with separation and three
//! deficiencies for 256 entries, and the repair of a 12-entry palette.

mod common;
use common::palette_text;

use criterion::{black_box, criterion_group, criterion_main, Criterion};
use inkfit::color::cvd::Deficiency;
use inkfit::gamut::Gamut;
use inkfit::icc::transform::PressMapping;
use inkfit::icc::{IccProfile, RenderingIntent};
use inkfit::swatch::check::{check_against, CheckOptions};
use inkfit::swatch::order::Scheme;
use inkfit::swatch::repair::{repair, RepairOptions};
use inkfit::swatch::survival::{analyse_check, SurvivalOptions};
use inkfit::swatch::{Format, Palette};

fn bench_survival(c: &mut Criterion) {
    let mapping = PressMapping {
        intent: RenderingIntent::Relative,
        bpc: true,
        paper_white: false,
    };
    let screen = IccProfile::load("srgb").unwrap();
    let press = IccProfile::load("offset-coated").unwrap();
    let gamut = Gamut::of_profile(&press, Default::default()).unwrap();
    let sopts = SurvivalOptions {
        cvd: Deficiency::ALL.to_vec(),
        ..SurvivalOptions::default()
    };
    let big = Palette::parse("bench", &palette_text(256, 0x2545_f491), Format::Text).unwrap();
    let copts = CheckOptions {
        mapping,
        tolerance: 3.0,
        ink_limit: gamut.ink_limit,
    };
    c.bench_function("check_256_separation_3_deficiencies", |b| {
        b.iter(|| {
            let r = check_against(&big, &screen, &press, copts, Some(&gamut)).unwrap();
            black_box(analyse_check(&r, &sopts))
        })
    });
    let checked = check_against(&big, &screen, &press, copts, Some(&gamut)).unwrap();
    c.bench_function("survival_256_3_deficiencies_after_check", |b| {
        b.iter(|| black_box(analyse_check(&checked, &sopts)))
    });
    let small = Palette::parse("bench", &palette_text(12, 0x1234_5678), Format::Text).unwrap();
    let ropts = RepairOptions {
        survival: SurvivalOptions {
            scheme: Scheme::Qualitative,
            cvd: vec![Deficiency::Deutan],
            ..SurvivalOptions::default()
        },
        mapping,
        iterations: 40,
    };
    c.bench_function("repair_12_entries_deutan", |b| {
        b.iter(|| black_box(repair(&small, &screen, &press, &gamut, &ropts).unwrap()))
    });
}

criterion_group! {
    name = benches;
    config = Criterion::default().sample_size(10);
    targets = bench_survival
}
criterion_main!(benches);
