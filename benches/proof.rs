//! Soft-proof throughput: the bare lcms2 proofing transform, the whole proof
//! (transform + ΔE00 table lookup + map + statistics), and the exact
//! per-pixel computation the table replaces.

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use inkfit::icc::transform::PressMapping;
use inkfit::icc::{IccProfile, RenderingIntent};
use inkfit::proof::heat::HeatScale;
use inkfit::proof::{Method, ProofEngine};
use inkfit::raster::{FileKind, Raster, RasterInfo};

/// Half smooth ramps (many colours), half flat areas (few colours).
fn sample(w: u32, h: u32) -> Raster {
    let mut px = Vec::with_capacity(w as usize * h as usize * 3);
    for y in 0..h {
        for x in 0..w {
            if x < w / 2 {
                let fx = x as f64 / (w / 2) as f64;
                let fy = y as f64 / h as f64;
                px.extend_from_slice(&[
                    (255.0 * fx) as u8,
                    (255.0 * fy) as u8,
                    (255.0 * (1.0 - fx * fy)) as u8 ^ ((x * 7 + y * 13) % 8) as u8,
                ]);
            } else {
                let cell = (x / 97 + (y / 89) * 7) % 40;
                px.extend_from_slice(&[
                    (cell * 37 % 256) as u8,
                    (cell * 91 % 256) as u8,
                    (cell * 53 % 256) as u8,
                ]);
            }
        }
    }
    Raster {
        info: RasterInfo {
            kind: FileKind::Png,
            width: w,
            height: h,
            channels: 3,
            bits: 8,
            has_alpha: false,
            icc: None,
        },
        color: px,
        alpha: None,
    }
}

fn bench(c: &mut Criterion) {
    let screen = IccProfile::load("srgb").unwrap();
    let press = IccProfile::load("offset-coated").unwrap();
    let mapping = PressMapping {
        intent: RenderingIntent::Relative,
        bpc: true,
        paper_white: false,
    };
    let engine = ProofEngine::new(&screen, 3, 8, &screen, &press, mapping).unwrap();
    let heat = HeatScale::new().unwrap();
    let big = sample(2000, 2000);
    let small = sample(500, 500);

    let mut g = c.benchmark_group("proof_4mp");
    g.sample_size(10);
    g.throughput(Throughput::Elements(4_000_000));
    g.bench_function("bare_transform", |b| b.iter(|| engine.proof_only(&big.color)));
    g.bench_function("table_proof_map_stats", |b| {
        b.iter(|| engine.run(&big, Some(&heat), Method::Table))
    });
    g.finish();

    let mut g = c.benchmark_group("proof_250k");
    g.sample_size(10);
    g.throughput(Throughput::Elements(250_000));
    g.bench_function("exact_proof_map_stats", |b| {
        b.iter(|| engine.run(&small, Some(&heat), Method::Exact))
    });
    g.bench_function("table_proof_map_stats", |b| {
        b.iter(|| engine.run(&small, Some(&heat), Method::Table))
    });
    g.bench_function("engine_build", |b| {
        b.iter(|| ProofEngine::new(&screen, 3, 8, &screen, &press, mapping).unwrap())
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
