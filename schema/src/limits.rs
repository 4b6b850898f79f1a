//! Hard limits on input size. Each is checked where the input is read and reported as a clear
//! error (exit 2), so a hostile file cannot exhaust memory or overflow arithmetic.

/// Largest exponent of a variable in any monomial, written or computed.
pub const MAX_EXPONENT: u32 = 1 << 20;
/// Largest absolute value of a grading component or degree. With the exponent and expression
/// limits this keeps every degree computed anywhere below 2^62: no overflow is possible.
pub const MAX_GRADING_ABS: i64 = 1 << 31;
/// Whether a grading entry, degree or τ is within ±[`MAX_GRADING_ABS`]. (A range test, not
/// `abs`, which overflows on the most negative integer.)
pub fn grading_in_bounds(x: i64) -> bool {
    (-MAX_GRADING_ABS..=MAX_GRADING_ABS).contains(&x)
}
/// Largest file the tools read.
pub const MAX_FILE_BYTES: u64 = 4 << 30;
/// Largest number of generators in one complex.
pub const MAX_GENERATORS: usize = 5_000_000;
/// Largest number of terms in one differential, map or witness.
pub const MAX_TERMS: usize = 20_000_000;
/// Longest name of a generator, complex, map, variable or grading (bytes).
pub const MAX_NAME_LEN: usize = 200;
/// Deepest nesting of a map expression.
pub const MAX_EXPR_DEPTH: usize = 32;
/// Most operations and names in one map expression.
pub const MAX_EXPR_NODES: usize = 1000;
/// Reads a file, refusing one larger than [`MAX_FILE_BYTES`] before reading it, and anything
/// but a regular file (a link to /dev/zero or a pipe is read without end: memory, or a hang).
pub fn read_file(path: &std::path::Path) -> Result<Vec<u8>, String> {
    let meta = std::fs::metadata(path).map_err(|e| format!("cannot read: {e}"))?;
    if !meta.is_file() {
        return Err("not a regular file (a device or a pipe is read without end)".into());
    }
    if meta.len() > MAX_FILE_BYTES {
        return Err(format!("file is {} bytes, above the limit {MAX_FILE_BYTES}", meta.len()));
    }
    std::fs::read(path).map_err(|e| format!("cannot read: {e}"))
}

/// How many validation errors are collected before giving up.
pub const MAX_REPORTED_ERRORS: usize = 25;

/// Work the checks of one file may do, per byte of the file. A unit is one term a check
/// touches or one row it allocates; every check counts its units before it starts, so time is
/// O(W log W) and memory O(W) for W ≤ [`work_limit`]. The stored certificates and the large
/// ones CI and the benchmark make use at most 0.3 units per byte.
pub const WORK_PER_BYTE: u64 = 2;
/// Work any file may do, whatever its size (small files with dense complexes).
pub const WORK_BASE: u64 = 1 << 24;
/// The work limit of a file of `bytes` bytes.
pub fn work_limit(bytes: u64) -> u64 {
    WORK_BASE.saturating_add(WORK_PER_BYTE.saturating_mul(bytes))
}
/// "Did you mean" is offered for the first this many unknown names of a file (and bounded
/// further in `tubecheck::report_terms`).
pub const MAX_SUGGESTIONS: usize = 10;
