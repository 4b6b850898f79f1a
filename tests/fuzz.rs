//! Fuzzing the checker's parser and verifier and the producer's reader: random byte-level and
//! JSON-level damage to stored certificates and problems, and work bombs (`bombs.rs`), must give a result or a clear error,
//! never a panic. Small by default (CI); for a long run:
//!
//!     PROPTEST_CASES=200000 cargo test --release -p tubecert-tests --test fuzz

use proptest::prelude::*;
use serde_json::{json, Value};
use std::path::PathBuf;

fn stored(suffix: &str) -> Vec<Vec<u8>> {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../certificates");
    let mut files: Vec<PathBuf> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.to_string_lossy().ends_with(suffix))
        .collect();
    files.sort();
    files.iter().map(|p| std::fs::read(p).unwrap()).collect()
}

/// Values that have broken parsers before: huge and negative numbers, floats, deep nesting,
/// odd strings, wrong types.
fn nasty(k: u64) -> Value {
    match k % 12 {
        0 => json!(u64::MAX),
        1 => json!(i64::MIN),
        2 => json!(1.5e300),
        3 => json!(null),
        4 => json!("U^99999999999999999999"),
        5 => json!("\u{0}\u{202e}\u{1F600}"),
        6 => json!([]),
        7 => json!({}),
        8 => {
            let mut v = json!("F");
            for _ in 0..200 {
                v = json!({"sum": [v]});
            }
            v
        }
        9 => json!(["a", "U^2 + U^2", "b"]),
        10 => json!({"times": ["U", {"compose": []}]}),
        _ => json!("x".repeat(5000)),
    }
}

/// Replaces the node at a pseudo-random position (pre-order index) by `new`.
fn replace_nth(v: &mut Value, n: &mut u64, new: &Value) -> bool {
    if *n == 0 {
        *v = new.clone();
        return true;
    }
    *n -= 1;
    match v {
        Value::Array(items) => items.iter_mut().any(|i| replace_nth(i, n, new)),
        Value::Object(m) => m.values_mut().any(|i| replace_nth(i, n, new)),
        _ => false,
    }
}

fn damage_bytes(mut b: Vec<u8>, ops: &[(u64, u8)]) -> Vec<u8> {
    for &(pos, byte) in ops {
        if b.is_empty() {
            break;
        }
        let i = (pos % b.len() as u64) as usize;
        match byte % 4 {
            0 => b[i] = byte,
            1 => {
                b.remove(i);
            }
            2 => b.insert(i, byte),
            _ => b.truncate(i),
        }
    }
    b
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(tubecert_tests::cases(64)))]

    #[test]
    fn checker_never_panics_on_damaged_bytes(which: usize, ops in prop::collection::vec((any::<u64>(), any::<u8>()), 1..6)) {
        let files = stored(".cert.json");
        let bytes = damage_bytes(files[which % files.len()].clone(), &ops);
        let _ = tubecheck::check_bytes("fuzz", &bytes);
    }

    #[test]
    fn checker_never_panics_on_damaged_structure(which: usize, at: u64, kind: u64, rehash: bool) {
        let files = stored(".cert.json");
        let mut v: Value = serde_json::from_slice(&files[which % files.len()]).unwrap();
        let mut n = at % 400;
        replace_nth(&mut v, &mut n, &nasty(kind));
        if rehash {
            if let Ok(body) = serde_json::from_value::<tubecert_format::Body>(v["body"].clone()) {
                v["sha256"] = json!(tubecert_format::canonical::canonical_sha256(&body).unwrap_or_default());
            }
        }
        if let Ok(report) = tubecheck::check_bytes("fuzz", &serde_json::to_vec(&v).unwrap()) {
            // Whatever was accepted must also satisfy the independent oracle.
            if report.ok() {
                let body: tubecert_format::Body = serde_json::from_value(v["body"].clone()).unwrap();
                prop_assert!(tubecert_tests::oracle::holds(&body));
            }
        }
    }

    #[test]
    fn producer_never_panics_on_damaged_problems(which: usize, at: u64, kind: u64, ops in prop::collection::vec((any::<u64>(), any::<u8>()), 0..3)) {
        let files = stored(".problem.json");
        let mut v: Value = serde_json::from_slice(&files[which % files.len()]).unwrap();
        let mut n = at % 300;
        replace_nth(&mut v, &mut n, &nasty(kind));
        let bytes = damage_bytes(serde_json::to_vec(&v).unwrap(), &ops);
        if let Ok(p) = tubecert::problem::parse_problem(&bytes, "fuzz") {
            if let Ok(ctx) = tubecert::validate::validate(&p) {
                let _ = tubecert::prove::prove(p, &ctx, &bytes);
            }
        }
    }
}

proptest! {
    // Each case builds a file of up to a few MB: few cases by default.
    #![proptest_config(ProptestConfig::with_cases(tubecert_tests::cases(8)))]

    /// Work bombs (`bombs.rs`) at random scales: refused or answered, quickly; whatever is
    /// accepted satisfies the oracle.
    #[test]
    fn work_bombs_are_refused_or_bounded(kind: usize, n in 1_000usize..40_000) {
        let bytes = tubecert_tests::bombs::certificate_bomb(kind, n);
        let start = std::time::Instant::now();
        let result = tubecheck::check_bytes("bomb", &bytes);
        prop_assert!(start.elapsed() < std::time::Duration::from_secs(10), "bomb {kind} at {n}: {:?}", start.elapsed());
        if let Ok(report) = result {
            if report.ok() {
                prop_assert!(tubecert_tests::oracle::holds(&report.body));
            }
        }
    }
}
