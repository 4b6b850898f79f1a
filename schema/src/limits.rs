//! Hard limits on input size. Each is checked where the input is read and reported as a clear
//! error (exit 2), so a hostile file cannot exhaust memory or overflow arithmetic.

/// Largest exponent of a variable in any monomial, written or computed.
pub const MAX_EXPONENT: u32 = 1 << 20;
/// Largest absolute value of a grading component or degree.
pub const MAX_GRADING_ABS: i64 = 1 << 40;
/// Largest file the tools read.
pub const MAX_FILE_BYTES: u64 = 4 << 30;
/// Largest number of generators in one complex.
pub const MAX_GENERATORS: usize = 20_000_000;
/// Largest number of terms in one differential, map or witness.
pub const MAX_TERMS: usize = 200_000_000;
/// Longest name of a generator, complex, map, variable or grading (bytes).
pub const MAX_NAME_LEN: usize = 200;
/// Deepest nesting of a map expression.
pub const MAX_EXPR_DEPTH: usize = 32;
/// How many validation errors are collected before giving up.
pub const MAX_REPORTED_ERRORS: usize = 25;
