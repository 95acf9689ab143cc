//! Gamut computation speed: a matrix RGB gamut at its default (0.1 %)
//! density, the ink-limited CMYK gamut of the built-in press, and the inside
//! test for 1,000 colours once the boundary exists.

use criterion::{black_box, criterion_group, criterion_main, Criterion};
use inkfit::color::LabD50;
use inkfit::gamut::{Gamut, GamutOptions};
use inkfit::icc::IccProfile;

fn benches(c: &mut Criterion) {
    let srgb = IccProfile::load("srgb").expect("built-in srgb");
    let press = IccProfile::load("offset-coated").expect("built-in press");
    c.bench_function("gamut srgb (64 steps per face)", |b| {
        b.iter(|| Gamut::of_profile(black_box(&srgb), GamutOptions::default()).expect("gamut"))
    });
    let limited = GamutOptions {
        ink_limit: Some(330.0),
        ..GamutOptions::default()
    };
    c.bench_function("gamut offset-coated (ink limit 330 %)", |b| {
        b.iter(|| Gamut::of_profile(black_box(&press), limited).expect("gamut"))
    });
    let g = Gamut::of_profile(&press, limited).expect("gamut");
    let colours: Vec<LabD50> = (0..1000)
        .map(|i| {
            let t = i as f64;
            LabD50::new(
                5.0 + (t * 7.3) % 95.0,
                -90.0 + (t * 13.7) % 180.0,
                -90.0 + (t * 29.1) % 180.0,
            )
        })
        .collect();
    c.bench_function("inside test, 1000 colours", |b| {
        b.iter(|| colours.iter().filter(|&&l| g.contains(black_box(l))).count())
    });
    c.bench_function("outside_by, 1000 colours", |b| {
        b.iter(|| colours.iter().map(|&l| g.outside_by(black_box(l))).sum::<f64>())
    });
}

criterion_group!(gamut, benches);
criterion_main!(gamut);
