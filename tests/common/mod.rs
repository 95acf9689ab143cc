//! Helpers shared by the integration tests: running the real `inkfit`
//! binary, reading its output, and the demo files.
// Each test crate uses its own subset of these.
#![allow(dead_code)]

use std::path::Path;
use std::process::{Command, Output};

use serde_json::Value;

/// The `inkfit` binary with colour output off.
pub fn bin() -> Command {
    let mut c = Command::new(env!("CARGO_BIN_EXE_inkfit"));
    c.env("NO_COLOR", "1");
    c
}

pub fn run(args: &[&str]) -> Output {
    bin().args(args).output().expect("inkfit runs")
}

/// Path of a file of the demo scenario.
pub fn demo(name: &str) -> String {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("fixtures/demo")
        .join(name)
        .display()
        .to_string()
}

pub fn stdout(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).into_owned()
}

pub fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

pub fn json(o: &Output) -> Value {
    serde_json::from_slice(&o.stdout).unwrap_or_else(|e| panic!("not JSON ({e}):\n{}\n{}", stdout(o), stderr(o)))
}

/// A clean failure: exit 2, one line on stderr that mentions each of
/// `needles`, no panic.
pub fn assert_error(o: &Output, needles: &[&str]) {
    let err = stderr(o);
    assert_eq!(o.status.code(), Some(2), "exit code; stderr: {err}");
    assert_eq!(err.trim_end().lines().count(), 1, "one line expected:\n{err}");
    assert!(err.starts_with("inkfit: error: "), "{err}");
    for n in needles {
        assert!(err.contains(n), "stderr should mention {n:?}:\n{err}");
    }
    assert!(!err.contains("panicked"), "{err}");
}

/// The `check` of each reason of the JSON verdict, in order.
pub fn verdict_reasons(v: &Value) -> Vec<String> {
    v["verdict"]["reasons"]
        .as_array()
        .map(|a| {
            a.iter()
                .filter_map(|r| r["check"].as_str().map(str::to_string))
                .collect()
        })
        .unwrap_or_default()
}

/// The names of the entries of `dir`, sorted; empty when there is no such
/// folder. For checking that a run left nothing else behind.
pub fn listing(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = match std::fs::read_dir(dir) {
        Ok(rd) => rd
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .collect(),
        Err(_) => Vec::new(),
    };
    v.sort();
    v
}

/// A small deterministic generator (xorshift64*, Vigna 2016), for
/// repeatable samples, charts and noise.
pub struct Rng(pub u64);

impl Rng {
    /// Uniform in [0, 1).
    pub fn next(&mut self) -> f64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        (self.0.wrapping_mul(0x2545_f491_4f6c_dd1d) >> 11) as f64 / (1u64 << 53) as f64
    }

    /// A standard normal deviate (Box–Muller).
    pub fn normal(&mut self) -> f64 {
        let u = self.next().max(1e-300);
        let v = self.next();
        (-2.0 * u.ln()).sqrt() * (std::f64::consts::TAU * v).cos()
    }
}

/// CRC-32 as PNG uses it (ISO 3309 / ITU-T V.42 polynomial, reflected,
/// PNG spec annex D), bit by bit.
pub fn crc32(data: &[u8]) -> u32 {
    let mut c = 0xffff_ffffu32;
    for &b in data {
        c ^= u32::from(b);
        for _ in 0..8 {
            c = if c & 1 != 0 { 0xedb8_8320 ^ (c >> 1) } else { c >> 1 };
        }
    }
    !c
}
