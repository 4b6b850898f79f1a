//! Fuzzing the checker's parser and verifier and the producer's reader: random byte-level and
//! JSON-level damage to stored certificates and problems, and work bombs (`bombs.rs`), must give a result or a clear error,
//! never a panic. Hostile names (statement syntax, invisible and control characters) must be
//! refused naming their code point, and changes to τ's grading or the format version must be
//! caught whenever the oracle's own wording disagrees. Small by default (CI); for a long run:
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

/// Names that imitate statements or hide characters: statement syntax, a line break with a
/// fake verdict, a zero-width joiner, another format character, a control character.
const HOSTILE_NAMES: [&str; 6] = ["U^3·F", "F\n✓ τ(K) = 9", "F\u{200d}", "\u{2060}K", "a\u{7}", " "];

/// Values that have broken parsers before: huge and negative numbers, floats, deep nesting,
/// odd strings, wrong types, hostile names, integers just past the format's bounds (gradings
/// ±2^31, exponents 2^20) and exponents that wrap 64 bits inside a product.
fn nasty(k: u64) -> Value {
    match k % 20 {
        12 | 13 => json!(HOSTILE_NAMES[(k / 20 % 6) as usize]),
        14 => json!((1i64 << 31) + 1),
        15 => json!(-(1i64 << 31) - 1),
        16 => json!(WRAPS_TO_ONE),
        17 => json!("U^1048577"),
        18 => json!("U*U^1048576"),
        19 => json!(i64::MIN + 1),
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

/// U^3·U^(2^64−3): the monomial 1 to a reader whose exponent sum wraps in 64 bits.
const WRAPS_TO_ONE: &str = "U^3*U^18446744073709551613";

/// The same coefficient to a wrapping reader, absurd to an honest one.
fn wrapped(coef: &str) -> String {
    if coef.trim() == "1" {
        WRAPS_TO_ONE.to_string()
    } else {
        format!("{WRAPS_TO_ONE}*{coef}")
    }
}

/// The number of terms `[from, coefficient, to]` in a document.
fn terms(v: &Value) -> usize {
    match v {
        Value::Array(items) if items.len() == 3 && items.iter().all(Value::is_string) => 1,
        Value::Array(items) => items.iter().map(terms).sum(),
        Value::Object(m) => m.values().map(terms).sum(),
        _ => 0,
    }
}

fn objects(v: &Value) -> u64 {
    match v {
        Value::Object(m) => 1 + m.values().map(objects).sum::<u64>(),
        Value::Array(a) => a.iter().map(objects).sum(),
        _ => 0,
    }
}

fn nodes(v: &Value) -> u64 {
    1 + match v {
        Value::Object(m) => m.values().map(nodes).sum::<u64>(),
        Value::Array(a) => a.iter().map(nodes).sum(),
        _ => 0,
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

/// Renames `old` to `new`: every key and string equal to it, or only keys.
fn rename(v: &mut Value, old: &str, new: &str, everywhere: bool) {
    match v {
        Value::String(s) if everywhere && s == old => *s = new.into(),
        Value::Array(xs) => xs.iter_mut().for_each(|x| rename(x, old, new, everywhere)),
        Value::Object(m) => {
            *m = std::mem::take(m)
                .into_iter()
                .map(|(k, mut x)| {
                    rename(&mut x, old, new, everywhere);
                    (if k == old { new.to_string() } else { k }, x)
                })
                .collect()
        }
        _ => {}
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
                let version = v["version"].as_u64().unwrap() as u32;
                prop_assert!(tubecert_tests::oracle::holds_in(&body, version));
            }
        }
    }

    /// A complex, map, generator or grading renamed to a hostile name (everywhere or only where
    /// declared), rehashed: refused as malformed, naming the code point.
    #[test]
    fn hostile_names_are_refused_with_their_code_point(which: usize, at: usize, kind: usize, everywhere: bool) {
        let files = stored(".cert.json");
        let mut v: Value = serde_json::from_slice(&files[which % files.len()]).unwrap();
        let body = &v["body"];
        let mut names: Vec<String> = ["complexes", "maps"].iter().flat_map(|k| body[k].as_object().unwrap().keys().cloned()).collect();
        for c in body["complexes"].as_object().unwrap().values() {
            names.extend(c["generators"].as_object().unwrap().keys().cloned());
        }
        names.extend(body["ring"]["gradings"].as_array().unwrap().iter().map(|g| g.as_str().unwrap().to_string()));
        let old = names[at % names.len()].clone();
        let hostile = HOSTILE_NAMES[kind % HOSTILE_NAMES.len()];
        let new = format!("{old}{hostile}");
        let before = v.clone();
        rename(&mut v["body"], &old, &new, everywhere);
        prop_assume!(v != before, "a grading is named in a list, not a key");
        if let Ok(body) = serde_json::from_value::<tubecert_format::Body>(v["body"].clone()) {
            v["sha256"] = json!(tubecert_format::canonical::canonical_sha256(&body).unwrap());
            let err = tubecheck::check_bytes("fuzz", &serde_json::to_vec(&v).unwrap()).err();
            prop_assert!(err.as_ref().is_some_and(|e| e.contains("U+")), "{new:?}: {err:?}");
        }
    }

    /// τ's grading changed, its statement restated or not, the version relabelled or not:
    /// whatever is accepted must hold for the oracle, in that version's wording.
    #[test]
    fn tau_grading_and_version_changes_are_caught(which: usize, grading: usize, restate: bool, version_one: bool) {
        let files = stored(".cert.json");
        let taus: Vec<&Vec<u8>> = files.iter().filter(|f| String::from_utf8_lossy(f).contains("\"kind\":\"tau\"")).collect();
        let mut cert: tubecert_format::Certificate = serde_json::from_slice(taus[which % taus.len()]).unwrap();
        cert.version = if version_one { 1 } else { cert.version };
        let ring = tubecert_format::RingInfo::new(&cert.body.ring).unwrap();
        for c in cert.body.claims.iter_mut() {
            if let tubecert_format::Claim::Tau { alexander, .. } = c {
                *alexander = ring.gradings[grading % ring.gradings.len()].clone();
            }
            if restate {
                *tubecert::prove::statement_mut(c) = tubecert_format::statement::render(c, &ring, cert.version);
            }
        }
        cert.sha256 = tubecert_format::canonical::canonical_sha256(&cert.body).unwrap();
        let accepted = tubecheck::check_bytes("fuzz", &serde_json::to_vec(&cert).unwrap()).is_ok_and(|r| r.ok());
        prop_assert_eq!(accepted, tubecert_tests::oracle::holds_in(&cert.body, cert.version));
    }

    #[test]
    fn an_exponent_that_wraps_64_bits_is_never_read_as_another(which: usize, at: usize) {
        let files = stored(".cert.json");
        let mut v: Value = serde_json::from_slice(&files[which % files.len()]).unwrap();
        if v["body"]["ring"]["variables"][0] != "U" {
            return Ok(());
        }
        let k = at % terms(&v);
        rewrite_nth_coefficient(&mut v, k, &mut 0);
        let body: tubecert_format::Body = serde_json::from_value(v["body"].clone()).unwrap();
        v["sha256"] = json!(tubecert_format::canonical::canonical_sha256(&body).unwrap());
        let accepted = tubecheck::check_bytes("fuzz", &serde_json::to_vec(&v).unwrap()).is_ok_and(|r| r.ok());
        prop_assert!(!accepted, "a wrapped exponent was read as a legal one");
        prop_assert!(!tubecert_tests::oracle::holds(&body));
    }

    #[test]
    fn a_null_or_a_repeated_key_anywhere_is_refused(which: usize, at: u64, problem: bool) {
        let files = stored(if problem { ".problem.json" } else { ".cert.json" });
        let v: Value = serde_json::from_slice(&files[which % files.len()]).unwrap();
        let refused = |bytes: &[u8]| {
            if problem {
                tubecert::problem::parse_problem(bytes, "fuzz").is_err()
            } else {
                tubecheck::check_bytes("fuzz", bytes).is_err()
            }
        };
        let mut n = (at % objects(&v)) as i64;
        let mut text = String::new();
        tubecert_tests::with_repeated_key(&v, &mut n, None, &mut text);
        prop_assert!(refused(text.as_bytes()), "a repeated key was accepted: {}", text);
        let mut w = v.clone();
        let mut n = 1 + at % (nodes(&v) - 1);
        replace_nth(&mut w, &mut n, &Value::Null);
        let bytes = serde_json::to_vec(&w).unwrap();
        prop_assert!(refused(&bytes), "a null was accepted: {}", String::from_utf8_lossy(&bytes));
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

/// Rewrites the coefficient of the `k`-th term (pre-order) into its wrapping twin.
fn rewrite_nth_coefficient(v: &mut Value, k: usize, i: &mut usize) {
    match v {
        Value::Array(items) if items.len() == 3 && items.iter().all(Value::is_string) => {
            if *i == k {
                items[1] = json!(wrapped(items[1].as_str().unwrap()));
            }
            *i += 1;
        }
        Value::Array(items) => items.iter_mut().for_each(|x| rewrite_nth_coefficient(x, k, i)),
        Value::Object(m) => m.values_mut().for_each(|x| rewrite_nth_coefficient(x, k, i)),
        _ => {}
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
