//! Building press profiles: the gamut descriptor, the mapped inversion of
//! every B2A node for the three intents and the ICC writer, for the
//! built-in coated condition; and fitting a condition to 2,500 measured
//! patches (with its 5-fold cross-validation), alone and with the profile
//! built from it. About 20 s of CPU per build, so ten samples:
//! `cargo bench --bench press_build`.

use std::fmt::Write as _;

use criterion::{criterion_group, criterion_main, Criterion};
use inkfit::press::cgats::Measurements;
use inkfit::press::fit::{fit, BlackStrength, FitOptions};
use inkfit::press::mapping::Mapper;
use inkfit::press::{build_icc, offset_coated, offset_uncoated};

/// 2,500 patches printed by the built-in uncoated model: ramps of each ink,
/// a C, M, Y by K grid and pseudo-random combinations (an LCG).
fn measurements() -> Measurements {
    let cond = offset_uncoated();
    let mut pts: Vec<[f64; 4]> = Vec::new();
    for ink in 0..4 {
        for a in [
            3.0, 5.0, 10.0, 15.0, 20.0, 25.0, 30.0, 40.0, 50.0, 60.0, 70.0, 80.0, 90.0, 95.0,
        ] {
            let mut c = [0.0; 4];
            c[ink] = a;
            pts.push(c);
        }
    }
    let lv = [0.0, 10.0, 20.0, 40.0, 70.0, 100.0];
    for k in lv {
        for c in lv {
            for m in lv {
                for y in lv {
                    pts.push([c, m, y, k]);
                }
            }
        }
    }
    let mut s = 0x2545_f491_u32;
    while pts.len() < 2_500 {
        let mut c = [0.0; 4];
        for v in &mut c {
            s = s.wrapping_mul(1_664_525).wrapping_add(1_013_904_223);
            *v = f64::from(s >> 24) * 100.0 / 255.0;
        }
        pts.push(c);
    }
    let mut text = String::from(
        "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID CMYK_C CMYK_M CMYK_Y CMYK_K LAB_L LAB_A LAB_B\nEND_DATA_FORMAT\nBEGIN_DATA\n",
    );
    for (i, c) in pts.iter().enumerate() {
        let l = cond.lab_absolute(c.map(|v| v / 100.0));
        writeln!(
            text,
            "{i} {} {} {} {} {:.2} {:.2} {:.2}",
            c[0], c[1], c[2], c[3], l.l, l.a, l.b
        )
        .unwrap();
    }
    text.push_str("END_DATA\n");
    Measurements::parse("bench", &text).expect("bench data")
}

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
    let m = measurements();
    let opts = FitOptions {
        name: "bench".into(),
        description: "bench".into(),
        ink_limit_percent: 300.0,
        black: BlackStrength::Medium,
        folds: 5,
    };
    g.bench_function("fit 2,500 patches with 5-fold cross-validation", |b| {
        b.iter(|| fit(&m, &opts).expect("fit"))
    });
    g.bench_function("fit 2,500 patches and build the profile", |b| {
        b.iter(|| build_icc(&fit(&m, &opts).expect("fit").0).expect("build"))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
