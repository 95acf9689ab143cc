//! Palette size: the whole check as `inkfit check --cvd protan,deutan,tritan`
//! runs it (profiles loaded, the press gamut built, every colour checked,
//! separation and three deficiencies), for the 9-colour demo palette, 256 and
//! 2,500 colours spread over the RGB cube; and the classes of a map image.
//! The goals compare each size with the demo in the same run.

mod common;
use common::palette_text;

use criterion::{black_box, criterion_group, criterion_main, Criterion};
use inkfit::color::cvd::Deficiency;
use inkfit::gamut::Gamut;
use inkfit::icc::transform::PressMapping;
use inkfit::icc::{IccProfile, RenderingIntent};
use inkfit::swatch::check::{check_against, CheckOptions};
use inkfit::swatch::map_raster::find_classes;
use inkfit::swatch::survival::{analyse_check, SurvivalOptions};
use inkfit::swatch::{Format, Palette};

fn whole_check(p: &Palette) {
    let screen = IccProfile::load("srgb").unwrap().require_screen().unwrap();
    let press = IccProfile::load("offset-coated").unwrap().require_press().unwrap();
    let gamut = Gamut::of_profile(&press, Default::default()).unwrap();
    let opts = CheckOptions {
        mapping: PressMapping {
            intent: RenderingIntent::Relative,
            bpc: true,
            paper_white: false,
        },
        tolerance: 3.0,
        ink_limit: gamut.ink_limit,
    };
    let r = check_against(p, &screen, &press, opts, Some(&gamut)).unwrap();
    let s = SurvivalOptions {
        cvd: Deficiency::ALL.to_vec(),
        ..SurvivalOptions::default()
    };
    black_box(analyse_check(&r, &s));
}

fn bench_sizes(c: &mut Criterion) {
    let mut g = c.benchmark_group("whole_check_3_deficiencies");
    g.sample_size(10);
    let demo = Palette::read("fixtures/demo/landuse.csv".as_ref()).unwrap();
    g.bench_function("demo_9", |b| b.iter(|| whole_check(&demo)));
    for n in [256, 2_500, 10_000] {
        let p = Palette::parse("bench", &palette_text(n, 0x2545_f491), Format::Text).unwrap();
        g.bench_function(format!("random_{n}"), |b| b.iter(|| whole_check(&p)));
    }
    g.finish();
}

fn bench_map(c: &mut Criterion) {
    // A 2,000 × 1,500 map of 40 × 30 parcels in 12 colours with one-pixel
    // anti-aliasing blends along every parcel edge.
    let (w, h) = (2_000usize, 1_500usize);
    let colour = |k: usize| [(k * 53 % 256) as u8, (k * 97 % 256) as u8, (k * 151 % 256) as u8];
    let mut rgb = Vec::with_capacity(w * h * 3);
    for y in 0..h {
        for x in 0..w {
            let k = ((x / 50) * 7 + (y / 50) * 3) % 12;
            let c = colour(k);
            if x % 50 == 0 && x > 0 {
                let l = colour(((x / 50 - 1) * 7 + (y / 50) * 3) % 12);
                rgb.extend((0..3).map(|i| ((u16::from(c[i]) + u16::from(l[i])) / 2) as u8));
            } else {
                rgb.extend(c);
            }
        }
    }
    let mut g = c.benchmark_group("map_classes");
    g.sample_size(10);
    g.bench_function("3_megapixels_12_classes", |b| {
        b.iter(|| black_box(find_classes(w, h, &rgb, &|_| Some(true), 0.0005).unwrap()))
    });
    g.finish();
}

criterion_group!(benches, bench_sizes, bench_map);
criterion_main!(benches);
