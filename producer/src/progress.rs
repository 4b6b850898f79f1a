//! Progress of long searches on stderr, only when stderr is a terminal and `--quiet` was not
//! given; at most a few updates a second, overwritten in place.

use std::io::Write as _;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Mutex;
use std::time::{Duration, Instant};

static ENABLED: AtomicBool = AtomicBool::new(false);
static LAST: Mutex<Option<Instant>> = Mutex::new(None);

pub fn enable(on: bool) {
    ENABLED.store(on, Ordering::Relaxed);
}

/// Reports `done` of `total` for a stage (cheap when disabled or called often).
pub fn report(stage: &str, done: usize, total: usize) {
    if !ENABLED.load(Ordering::Relaxed) {
        return;
    }
    let mut last = LAST.lock().unwrap_or_else(|e| e.into_inner());
    if last.is_some_and(|t| t.elapsed() < Duration::from_millis(200)) {
        return;
    }
    *last = Some(Instant::now());
    let mut err = std::io::stderr().lock();
    let _ = write!(err, "\r\x1b[K{stage}: {done}/{total}");
    let _ = err.flush();
}

/// Clears the progress line.
pub fn done() {
    if ENABLED.load(Ordering::Relaxed) {
        let _ = write!(std::io::stderr(), "\r\x1b[K");
    }
}
