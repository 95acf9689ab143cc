//! Building the built-in press profile: the gamut descriptor, the mapped
//! inversion of every B2A node for the three intents, and the ICC writer.
//! About 20 s of CPU per build, so ten samples:
//! `cargo bench --bench press_build`.

use criterion::{criterion_group, criterion_main, Criterion};
use inkfit::press::mapping::Mapper;
use inkfit::press::{build_icc, offset_coated};

fn bench(c: &mut Criterion) {
    let cond = offset_coated();
    let mut g = c.benchmark_group("press");
    g.sample_size(10);
    g.bench_function("gamut descriptor (press + BT.2020 source)", |b| {
        b.iter(|| Mapper::new(&cond))
    });
    g.bench_function("build offset-coated profile", |b| {
        b.iter(|| build_icc(&cond).expect("build"))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
