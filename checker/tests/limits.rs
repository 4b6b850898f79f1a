//! Each input limit gives a clear error (exit 2 on the command line), never a panic or an
//! overflow.

use serde_json::{json, Value};
use std::process::Command;
use tubecert_format::limits::*;

fn body(generators: Value, differential: Value, claims: Value) -> Value {
    json!({"format": "tubecert-certificate", "version": 1, "sha256": "0".repeat(64), "body": {
        "ring": {"variables": ["U"], "gradings": ["maslov", "alexander"], "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]},
        "complexes": {"K": {"generators": generators, "differential": differential}},
        "maps": {"F": {"from": "K", "to": "K", "degree": [0, 0], "terms": [["a", "1", "a"]]}},
        "claims": claims,
        "provenance": {"producer": "test", "problem_sha256": "0"}}})
}

fn check(v: &Value) -> Result<tubecheck::FileReport, String> {
    tubecheck::check_bytes("limits", &serde_json::to_vec(v).unwrap())
}

#[test]
fn exponent_limit() {
    let v = body(
        json!({"a": [0, 0], "b": [1, 0]}),
        json!([["b", format!("U^{}", MAX_EXPONENT as u64 + 1), "a"]]),
        json!([]),
    );
    let e = check(&v).unwrap_err();
    assert!(e.contains("above the limit"), "{e}");
}

#[test]
fn exponent_overflow_in_products_is_an_error() {
    // U^(MAX)·F composed with a coefficient U overflows: reported, not wrapped.
    let mut v = body(json!({"a": [0, 0], "b": [1, 0]}), json!([]), json!([]));
    v["body"]["maps"]["F"]["terms"] = json!([["a", "U", "a"]]);
    v["body"]["maps"]["F"]["degree"] = json!([-2, -1]);
    let statement = format!("U^{MAX_EXPONENT}·F ≃ 0 (null-homotopic)");
    v["body"]["claims"] = json!([{"kind": "null_homotopic", "map": {"times": [format!("U^{MAX_EXPONENT}"), "F"]}, "statement": statement, "witness": {"homotopy": []}}]);
    let r = check(&v).unwrap();
    let claim = r.claims.iter().find(|c| c.kind == "null_homotopic").unwrap();
    assert!(claim.outcome.as_ref().unwrap_err().contains("exponent overflow"), "{:?}", claim.outcome);
}

#[test]
fn nesting_depth_and_size_of_expressions() {
    let mut e = json!("F");
    for _ in 0..(MAX_EXPR_DEPTH + 2) {
        e = json!({"sum": [e, "F"]});
    }
    let v = body(
        json!({"a": [0, 0]}),
        json!([]),
        json!([{"kind": "null_homotopic", "map": e, "statement": "", "witness": {"homotopy": []}}]),
    );
    assert!(check(&v).unwrap_err().contains("nested deeper"));
    let wide = json!({"sum": vec![json!("F"); MAX_EXPR_NODES + 1]});
    let v = body(
        json!({"a": [0, 0]}),
        json!([]),
        json!([{"kind": "null_homotopic", "map": wide, "statement": "", "witness": {"homotopy": []}}]),
    );
    assert!(check(&v).unwrap_err().contains("more than"));
}

#[test]
fn name_length() {
    let long = "g".repeat(MAX_NAME_LEN + 1);
    let v = body(json!({long: [0, 0], "a": [0, 0]}), json!([]), json!([]));
    assert!(check(&v).unwrap_err().contains("longer than"));
}

#[test]
fn grading_size() {
    let v = body(json!({"a": [0, 0], "b": [MAX_GRADING_ABS + 1, 0]}), json!([]), json!([]));
    assert!(check(&v).unwrap_err().contains("beyond"));
}

#[test]
fn file_size_is_refused_before_reading() {
    // A sparse file: its length passes the limit without using the disk.
    let path = std::env::temp_dir().join(format!("tubecheck-huge-{}.json", std::process::id()));
    let f = std::fs::File::create(&path).unwrap();
    f.set_len(MAX_FILE_BYTES + 1).unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_tubecheck")).arg(&path).output().unwrap();
    std::fs::remove_file(&path).unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("above the limit"));
}

#[test]
fn generator_and_term_counts() {
    // Built in memory (a file this large would only slow the test down); the loader refuses
    // them with the limit named. The limits stay above what the scale targets need.
    const { assert!(MAX_GENERATORS >= 2_000_000 && MAX_TERMS >= 10_000_000) };
    let ring: tubecert_format::Ring = serde_json::from_value(json!({"variables": ["U"], "gradings": ["m", "a"], "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]})).unwrap();
    let many: std::collections::BTreeMap<String, Vec<i64>> =
        (0..=MAX_GENERATORS).map(|i| (format!("g{i}"), vec![0, 0])).collect();
    let big = tubecert_format::ComplexSpec { differential: vec![], generators: tubecert_format::UniqueMap(many) };
    let complexes = tubecert_format::UniqueMap([("K".to_string(), big)].into());
    let e = tubecheck::load::load(&ring, &complexes, &Default::default()).unwrap_err();
    assert!(e[0].contains("generators, above the limit"), "{e:?}");
    drop(complexes);
    let small = tubecert_format::ComplexSpec {
        differential: vec![[String::new(), String::new(), String::new()]; MAX_TERMS + 1],
        generators: tubecert_format::UniqueMap([("a".to_string(), vec![0, 0])].into()),
    };
    let e = tubecheck::load::load(
        &ring,
        &tubecert_format::UniqueMap([("K".to_string(), small)].into()),
        &Default::default(),
    )
    .unwrap_err();
    assert!(e[0].contains("terms, above the limit"), "{e:?}");
}

/// The ring of [`body`] with other variable degrees.
fn with_ring(mut v: Value, ring: Value) -> Value {
    v["body"]["ring"] = ring;
    v
}

#[test]
fn an_exponent_beyond_64_bits_inside_a_product_is_refused() {
    // U^3·U^(2^64) must not wrap to U^3 (or to anything else): the token itself is refused.
    for coef in ["U^3*U^18446744073709551616", "U^3*U^18446744073709551613", "U*U^1048576", "U^1048577"] {
        let v = body(json!({"a": [0, 0], "b": [1, 0]}), json!([["b", coef, "a"]]), json!([]));
        let e = check(&v).unwrap_err();
        assert!(e.contains("above the limit"), "{coef}: {e}");
    }
    // At the limit exactly, a product is read (and then found not homogeneous, not wrapped).
    let v = body(json!({"a": [0, 0], "b": [1, 0]}), json!([["b", "U^1048575*U", "a"]]), json!([]));
    let r = check(&v).unwrap();
    assert!(!r.ok());
}

#[test]
fn the_most_negative_grading_is_refused() {
    // |i64::MIN| overflows: a check written as |x| ≤ 2^31 must not let it through.
    for bad in [i64::MIN, i64::MIN + 1, i64::MAX, -MAX_GRADING_ABS - 1, MAX_GRADING_ABS + 1] {
        let v = body(json!({"a": [0, 0], "b": [bad, 0]}), json!([]), json!([]));
        assert!(check(&v).unwrap_err().contains("beyond"), "generator grading {bad}");
        let mut v = body(json!({"a": [0, 0]}), json!([]), json!([]));
        v["body"]["maps"]["F"]["degree"] = json!([0, bad]);
        assert!(check(&v).unwrap_err().contains("within"), "map degree {bad}");
        let ring = json!({"variables": ["U"], "gradings": ["m", "a"], "variable_degrees": {"U": [bad, -1]}, "differential_degree": [-1, 0]});
        // (Beyond ±2^53 the canonical hash refuses the number first.)
        let e = check(&with_ring(body(json!({"a": [0, 0]}), json!([]), json!([])), ring)).unwrap_err();
        assert!(e.contains("beyond") || e.contains("within ±2^53"), "{bad}: {e}");
        let ring = json!({"variables": ["U"], "gradings": ["m", "a"], "variable_degrees": {"U": [-2, -1]}, "differential_degree": [bad, 0]});
        let e = check(&with_ring(body(json!({"a": [0, 0]}), json!([]), json!([])), ring)).unwrap_err();
        assert!(e.contains("beyond") || e.contains("within ±2^53"), "{bad}: {e}");
    }
    // The bounds themselves are legal.
    let v = body(json!({"a": [0, 0], "b": [MAX_GRADING_ABS, -MAX_GRADING_ABS]}), json!([]), json!([]));
    assert!(check(&v).is_ok());
}

#[test]
fn the_finiteness_test_does_not_overflow() {
    // deg U = −deg V with entries ±2^31 in four gradings: U·V has degree zero, so the ring has
    // infinite-dimensional graded pieces. The dot product deg U · deg V = −2^64 must not wrap to 0.
    let (lo, hi) = (-MAX_GRADING_ABS, MAX_GRADING_ABS);
    let ring = json!({"variables": ["U", "V"], "gradings": ["a", "b", "c", "d"],
        "variable_degrees": {"U": [lo, lo, lo, lo], "V": [hi, hi, hi, hi]}, "differential_degree": [-1, 0, 0, 0]});
    let mut v = with_ring(body(json!({"a": [0, 0, 0, 0]}), json!([]), json!([])), ring);
    v["body"]["maps"]["F"]["degree"] = json!([0, 0, 0, 0]);
    let e = check(&v).unwrap_err();
    assert!(e.contains("infinite"), "{e}");
}

#[test]
fn numbers_in_claims_are_bounded() {
    // τ, orders and torsion exponents are read under the same bounds as gradings and exponents.
    let basis = json!({"generators": {"a": [0, 0]}, "basis": [["a", "1", "a"]], "inverse": [["a", "1", "a"]]});
    for claim in [
        json!({"kind": "tau", "complex": "K", "alexander": "alexander", "tau": -(1i64 << 40), "statement": format!("τ(K) = {}", -(1i64 << 40)), "witness": basis}),
        json!({"kind": "torsion_order_of_complex", "complex": "K", "variable": "U", "order": MAX_EXPONENT as u64 + 1, "statement": format!("Ord_U(H_*(K)) = {}", MAX_EXPONENT as u64 + 1), "witness": basis}),
        json!({"kind": "homology", "complex": "K", "free": [[1i64 << 40, 0]], "torsion": [], "statement": format!("H_*(K) ≅ F2[U]⟨({}, 0)⟩", 1i64 << 40), "witness": basis}),
    ] {
        let v = body(json!({"a": [0, 0]}), json!([]), json!([claim.clone()]));
        let e = check(&v).unwrap_err();
        assert!(e.contains("limit") || e.contains("beyond"), "{claim}: {e}");
    }
}
