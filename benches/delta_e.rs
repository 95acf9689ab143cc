//! Per-pair cost of the colour-difference kernels: CIEDE2000 against CIE76
//! (plus CIE94 and CMC for context), over a fixed pseudo-random set of 10,000
//! CIELAB pairs. Each iteration evaluates one pair, cycling through the set,
//! so criterion's time per iteration is the time per pair.

use criterion::{black_box, criterion_group, criterion_main, Criterion};
use inkfit::color::delta::{delta_e00, delta_e76, delta_e94, delta_e_cmc};
use inkfit::color::delta_batch::LabSet;
use inkfit::color::LabD50;

const PAIRS: usize = 10_000;

/// Deterministic 64-bit LCG, uniform in [0, 1).
fn pairs() -> Vec<(LabD50, LabD50)> {
    let mut state: u64 = 0x00de_2000;
    let mut unit = move || {
        state = state
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (state >> 11) as f64 / (1u64 << 53) as f64
    };
    let mut lab = || LabD50::new(100.0 * unit(), 254.0 * unit() - 127.0, 254.0 * unit() - 127.0);
    (0..PAIRS).map(|_| (lab(), lab())).collect()
}

fn bench_one(c: &mut Criterion, name: &str, pairs: &[(LabD50, LabD50)], f: impl Fn(LabD50, LabD50) -> f64) {
    c.bench_function(name, |b| {
        let mut i = 0;
        b.iter(|| {
            let (p, q) = pairs[i];
            i = (i + 1) % pairs.len();
            f(black_box(p), black_box(q))
        })
    });
}

fn delta_e(c: &mut Criterion) {
    let pairs = pairs();
    bench_one(c, "delta_e00 per pair", &pairs, delta_e00);
    bench_one(c, "delta_e76 per pair", &pairs, delta_e76);
    bench_one(c, "delta_e94 per pair", &pairs, delta_e94);
    bench_one(c, "delta_e_cmc(2:1) per pair", &pairs, |p, q| {
        delta_e_cmc(p, q, 2.0, 1.0)
    });
}

/// The screening ΔE00² of one colour against 10,000 (one row of a large
/// palette's pair triangle): criterion's time per iteration / 10,000 is the
/// time per pair.
fn screened_row(c: &mut Criterion) {
    let labs: Vec<LabD50> = pairs().into_iter().map(|(p, _)| p).collect();
    let set = LabSet::new(&labs);
    let mut out = Vec::new();
    c.bench_function("screened ΔE00² row of 10,000", |b| {
        b.iter(|| {
            set.squared_row(black_box(0), 1, &mut out);
            black_box(out[5])
        })
    });
}

criterion_group!(benches, delta_e, screened_row);
criterion_main!(benches);
