//! Compiles the C coverage shim (see `shim/c_coverage.c`) into every fuzz
//! binary. It only has an effect when the C dependencies are compiled with
//! gcc's `-fsanitize-coverage=trace-pc` and linked with
//! `-Wl,--wrap=__sanitizer_cov_trace_pc`, as `.ci/fuzz` does.

fn main() {
    println!("cargo:rerun-if-changed=shim/c_coverage.c");
    cc::Build::new()
        .file("shim/c_coverage.c")
        .warnings(true)
        .cargo_metadata(false)
        .compile("inkfit_fuzz_c_coverage");
    let out = std::env::var("OUT_DIR").expect("cargo sets OUT_DIR");
    // Whole archive, given to every binary: the constructor that registers
    // the counters must be linked although no Rust code calls into the file.
    println!("cargo:rustc-link-arg-bins=-Wl,--whole-archive,{out}/libinkfit_fuzz_c_coverage.a,--no-whole-archive");
}
