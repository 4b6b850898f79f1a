//! `tubecert`: the producer. It reads problem files, validates them exactly as the checker
//! will, searches for witnesses and writes certificates.
//!
//! Layers, in the order data flows: [`problem`] (input) → [`validate`] → [`search`]
//! (linear algebra) → [`prove`] (claims, certificate). [`demo`] writes the demo scenario.

pub mod bench;
pub mod bordered;
pub mod canonical_writer;
pub mod construct;
pub mod demo;
pub mod diff;
pub mod draw;
pub mod family;
pub mod notation;
pub mod problem;
pub mod progress;
pub mod prove;
pub mod search;
pub mod text_format;
pub mod validate;

use std::path::Path;

/// Reads and validates a problem file; errors are prefixed with the file name.
pub fn load_problem(path: &Path) -> Result<(problem::Problem, tubecheck::load::Context, Vec<u8>), Vec<String>> {
    let name = path.display().to_string();
    let bytes = tubecert_format::limits::read_file(path).map_err(|e| vec![format!("{name}: {e}")])?;
    let p = problem::parse_problem(&bytes, &name)?;
    let ctx = validate::validate(&p).map_err(|es| {
        let lines = text_format::SourceLines::of(&bytes);
        es.iter().map(|e| lines.locate(&name, e)).collect::<Vec<_>>()
    })?;
    Ok((p, ctx, bytes))
}

/// `check-input`: everything [`load_problem`] checks and what `prove` would refuse before
/// searching ([`prove::preconditions`]), every error at once.
pub fn check_input(path: &Path) -> Result<(problem::Problem, tubecheck::load::Context), Vec<String>> {
    let (p, ctx, bytes) = load_problem(path)?;
    let errs = prove::preconditions(&p, &ctx);
    if errs.is_empty() {
        return Ok((p, ctx));
    }
    let lines = text_format::SourceLines::of(&bytes);
    Err(errs.iter().map(|e| lines.locate(&path.display().to_string(), e)).collect())
}

/// Lowers the calling thread's scheduling priority (Linux: nice 10 for this thread only), for
/// work beside the search whose result is needed only later: on two cores the search's
/// sequential pivot loop then keeps a core to itself. Scheduling only; results never change.
pub(crate) fn yield_to_search() {
    #[cfg(target_os = "linux")]
    {
        extern "C" {
            fn setpriority(
                which: std::os::raw::c_int,
                who: std::os::raw::c_uint,
                prio: std::os::raw::c_int,
            ) -> std::os::raw::c_int;
        }
        // PRIO_PROCESS (0) with who = 0 is the calling thread on Linux. A failure leaves the
        // priority as it was, which is harmless.
        // SAFETY: a plain system call with integer arguments, no memory is passed.
        let _ = unsafe { setpriority(0, 0, 10) };
    }
}
