/*
 * Coverage for the C code in the fuzz binaries (lcms2), when that code is
 * compiled by gcc with -fsanitize-coverage=trace-pc,trace-cmp.
 *
 * gcc's trace-pc calls __sanitizer_cov_trace_pc() at every basic block.
 * libFuzzer defines that symbol only to refuse it, so the link renames the
 * C code's references with `-Wl,--wrap=__sanitizer_cov_trace_pc` and the
 * calls land in __wrap___sanitizer_cov_trace_pc below. It hashes the caller's
 * address with the previous block's into a map of 8-bit counters (an edge
 * approximation), and registers that map with libFuzzer as one more module of
 * inline 8-bit counters, so libFuzzer sees those edges as coverage like the
 * Rust code's own counters. libFuzzer wants a PC table of the same length as
 * every counter module; the table here holds one synthetic entry per counter
 * (no function-entry flag, so libFuzzer never tries to symbolise them).
 *
 * gcc's trace-cmp also emits float and double comparison hooks that
 * libFuzzer lacks; they are accepted and ignored.
 *
 * Nothing here may itself be instrumented: every function carries
 * no_sanitize_coverage (gcc 12+, clang).
 */
#include <stddef.h>
#include <stdint.h>

#define MAP_BITS 16
#define MAP_SIZE (1u << MAP_BITS)

#if defined(__has_attribute)
#if __has_attribute(no_sanitize_coverage)
#define NO_COV __attribute__((no_sanitize_coverage))
#endif
#endif
#ifndef NO_COV
#error "the C coverage shim needs gcc 12+ or clang (no_sanitize_coverage attribute)"
#endif

#define NO_INSTR NO_COV __attribute__((no_sanitize_address))

void __sanitizer_cov_8bit_counters_init(uint8_t *start, uint8_t *stop);
void __sanitizer_cov_pcs_init(const uintptr_t *pcs_beg, const uintptr_t *pcs_end);

static uint8_t counters[MAP_SIZE] __attribute__((aligned(64)));
static uintptr_t pc_table[2 * MAP_SIZE];
static __thread uint32_t previous;

NO_INSTR void __wrap___sanitizer_cov_trace_pc(void) {
    uintptr_t pc = (uintptr_t)__builtin_return_address(0);
    /* Fibonacci hashing of the call site; the top MAP_BITS bits index the map. */
    uint32_t block = (uint32_t)(((uint64_t)pc * 0x9E3779B97F4A7C15ull) >> (64 - MAP_BITS));
    uint32_t at = (block ^ previous) & (MAP_SIZE - 1);
    uint8_t c = counters[at];
    counters[at] = (uint8_t)(c + 1 + (c == 255)); /* past 255 wraps to 1, never back to 0 */
    previous = block >> 1;
}

NO_INSTR void __sanitizer_cov_trace_cmpf(float a, float b) {
    (void)a;
    (void)b;
}

NO_INSTR void __sanitizer_cov_trace_cmpd(double a, double b) {
    (void)a;
    (void)b;
}

NO_INSTR __attribute__((constructor)) static void register_c_coverage(void) {
    for (size_t i = 0; i < MAP_SIZE; i++) {
        /* A distinct, never-executed address per counter. */
        pc_table[2 * i] = (uintptr_t)&counters[i];
        pc_table[2 * i + 1] = 0;
    }
    __sanitizer_cov_8bit_counters_init(counters, counters + MAP_SIZE);
    __sanitizer_cov_pcs_init(pc_table, pc_table + 2 * MAP_SIZE);
}

/* Lets a target report whether the C code is instrumented at all. */
NO_INSTR size_t inkfit_fuzz_c_coverage_map_size(void) {
    return MAP_SIZE;
}
