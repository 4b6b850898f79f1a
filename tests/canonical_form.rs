//! The canonical form: a certificate's hash is over exactly the RFC 8785 form of its body, so a
//! file with a `null` (the schemas have none) or a repeated key (which JSON readers resolve
//! differently) must be refused, at every depth, never read as something else. Problem files
//! follow the same rule.

use serde_json::Value;
use std::path::PathBuf;

fn stored(suffix: &str) -> Vec<(String, Value)> {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../certificates");
    let mut files: Vec<PathBuf> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.to_string_lossy().ends_with(suffix))
        .collect();
    files.sort();
    files
        .iter()
        .map(|p| (p.display().to_string(), serde_json::from_slice(&std::fs::read(p).unwrap()).unwrap()))
        .collect()
}

/// Every variant of `v` with one repeated key, for each object in it (same and other value).
fn repeated_key_variants(v: &Value) -> Vec<String> {
    let other = Value::Bool(true);
    let mut out = Vec::new();
    for second in [None, Some(&other)] {
        for n in 0.. {
            let (mut k, mut text) = (n, String::new());
            tubecert_tests::with_repeated_key(v, &mut k, second, &mut text);
            if k >= 0 {
                break;
            }
            out.push(text);
        }
    }
    out
}

/// Every variant of `v` with one node (below the root) replaced by `null`.
fn null_variants(v: &Value) -> Vec<Value> {
    fn count(v: &Value) -> usize {
        1 + match v {
            Value::Array(a) => a.iter().map(count).sum(),
            Value::Object(m) => m.values().map(count).sum(),
            _ => 0,
        }
    }
    fn replace(v: &mut Value, n: &mut usize) {
        if *n == 0 {
            *v = Value::Null;
        }
        *n = n.wrapping_sub(1);
        match v {
            Value::Array(a) => a.iter_mut().for_each(|x| replace(x, n)),
            Value::Object(m) => m.values_mut().for_each(|x| replace(x, n)),
            _ => {}
        }
    }
    (1..count(v))
        .map(|i| {
            let mut w = v.clone();
            let mut n = i;
            replace(&mut w, &mut n);
            w
        })
        .collect()
}

#[test]
fn a_repeated_key_at_any_depth_of_a_certificate_is_refused() {
    for (name, cert) in stored(".cert.json") {
        let variants = repeated_key_variants(&cert);
        assert!(variants.len() > 20, "{name}");
        for text in variants {
            let r = tubecheck::check_bytes("dup", text.as_bytes());
            assert!(r.is_err(), "{name}: accepted a repeated key: {text}");
        }
    }
}

#[test]
fn a_null_at_any_depth_of_a_certificate_is_refused() {
    for (name, cert) in stored(".cert.json") {
        for v in null_variants(&cert) {
            let text = serde_json::to_vec(&v).unwrap();
            let r = tubecheck::check_bytes("null", &text);
            assert!(r.is_err(), "{name}: accepted a null: {}", String::from_utf8_lossy(&text));
        }
    }
}

#[test]
fn an_absent_dual_is_not_the_same_file_as_a_null_one() {
    // The case that was hashed as if absent: an order-0 torsion claim with "dual": null.
    let problem = serde_json::json!({"format": "tubecert-problem", "version": 1, "ring": tubecert_tests::minus_ring(),
        "complexes": {"O": {"generators": {"o": [0, 0]}, "differential": []}},
        "maps": {"F": {"from": "O", "to": "O", "degree": [0, 0], "terms": [["o", "1", "o"]]}},
        "goals": [{"torsion_order": {"maps": ["F", "F"], "variable": "U"}}]});
    let proved = tubecert_tests::prove_value(&problem);
    let bytes = tubecert::canonical_writer::file_bytes(&proved.certificate).unwrap();
    assert!(tubecheck::check_bytes("absent", &bytes).unwrap().ok());
    let text = String::from_utf8(bytes).unwrap();
    assert!(text.contains("\"witness\":{\"homotopy\":[]}"), "{text}");
    let with_null = text.replace("\"witness\":{\"homotopy\":[]}", "\"witness\":{\"dual\":null,\"homotopy\":[]}");
    let e = tubecheck::check_bytes("null", with_null.as_bytes()).unwrap_err();
    assert!(e.contains("null"), "{e}");
}

#[test]
fn a_repeated_key_inside_a_map_expression_is_refused() {
    for (name, cert) in stored(".cert.json") {
        let text = serde_json::to_string(&cert).unwrap();
        if let Some(at) = text.find("\"map\":{\"sum\":") {
            // {"sum": [...]} becomes {"sum": ["F"], "sum": [...]}: last-wins readers see the second.
            let with_dup = format!("{}\"map\":{{\"sum\":[\"F\"],\"sum\":{}", &text[..at], &text[at + 13..]);
            let e = tubecheck::check_bytes("dup", with_dup.as_bytes()).unwrap_err();
            assert!(e.contains("sum"), "{name}: {e}");
        }
    }
}

#[test]
fn a_repeated_key_or_a_null_in_a_problem_is_refused() {
    for (name, problem) in stored(".problem.json") {
        for text in repeated_key_variants(&problem) {
            assert!(tubecert::problem::parse_problem(text.as_bytes(), "dup").is_err(), "{name}: {text}");
        }
        for v in null_variants(&problem) {
            let text = serde_json::to_vec(&v).unwrap();
            let r = tubecert::problem::parse_problem(&text, "null");
            assert!(r.is_err(), "{name}: accepted a null: {}", String::from_utf8_lossy(&text));
        }
    }
}
