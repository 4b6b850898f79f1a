//! Each claim kind, accepted and rejected, on small hand-made certificates.
//! The complexes: O = ⟨o⟩; K = ⟨z, a, b⟩ with ∂b = U^2·a over `F2[U]` (Maslov, Alexander),
//! so a generates `F2[U]`/(U^2). F(o) = z, G(o) = z + a: ord_U(F − G) = 2.

use serde_json::{json, Value};
use tubecert_format::statement::render;
use tubecert_format::{Body, Certificate, Claim, RingInfo, CERTIFICATE_VERSION};
use tubecheck::verify::check_body;

fn base(claims: Vec<Value>) -> Value {
    json!({
        "ring": {"variables": ["U"], "gradings": ["maslov", "alexander"],
                 "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]},
        "complexes": {
            "O": {"generators": {"o": [0, 0]}, "differential": []},
            "K": {"generators": {"z": [0, 0], "a": [0, 0], "b": [-3, -2]}, "differential": [["b", "U^2", "a"]]},
            "P": {"generators": {"p": [1, 0], "q": [0, 0]}, "differential": [["p", "1", "q"]]},
            "KP": {"generators": {"z": [0, 0], "a": [0, 0], "b": [-3, -2], "p": [1, 0], "q": [0, 0]},
                   "differential": [["b", "U^2", "a"], ["p", "1", "q"]]}
        },
        "maps": {
            "F": {"from": "O", "to": "K", "degree": [0, 0], "terms": [["o", "1", "z"]]},
            "G": {"from": "O", "to": "K", "degree": [0, 0], "terms": [["o", "1", "z"], ["o", "1", "a"]]},
            "inc": {"from": "K", "to": "KP", "degree": [0, 0], "terms": [["z", "1", "z"], ["a", "1", "a"], ["b", "1", "b"]]},
            "proj": {"from": "KP", "to": "K", "degree": [0, 0], "terms": [["z", "1", "z"], ["a", "1", "a"], ["b", "1", "b"]]}
        },
        "claims": claims,
        "provenance": {"producer": "hand-made test", "problem_sha256": "0"}
    })
}

/// Fills in the statement the checker expects, so a test exercises the mathematics.
fn with_statement(mut claim: Value) -> Value {
    claim["statement"] = json!("");
    let c: Claim = serde_json::from_value(claim.clone()).expect("claim parses");
    let ring = RingInfo::new(&serde_json::from_value(base(vec![])["ring"].clone()).unwrap()).unwrap();
    claim["statement"] = json!(render(&c, &ring, CERTIFICATE_VERSION));
    claim
}

/// Verdicts of the listed (non-implicit) claims.
fn verdicts(claims: Vec<Value>) -> Vec<Result<(), String>> {
    let body: Body = serde_json::from_value(base(claims.into_iter().map(with_statement).collect())).expect("body");
    check_body(&body, CERTIFICATE_VERSION, u64::MAX)
        .expect("loads")
        .into_iter()
        .filter(|r| !r.implicit)
        .map(|r| r.outcome.map(|_| ()))
        .collect()
}

/// A certificate around a body, with the canonical hash (what the producer writes).
fn seal(body: Body) -> Certificate {
    let sha256 = tubecert_format::canonical::canonical_sha256(&body).unwrap();
    Certificate { format: "tubecert-certificate".into(), version: CERTIFICATE_VERSION, sha256, body }
}

fn one(claim: Value) -> Result<(), String> {
    verdicts(vec![claim]).remove(0)
}

#[test]
fn objects_are_checked_implicitly() {
    let body: Body = serde_json::from_value(base(vec![])).unwrap();
    assert!(check_body(&body, CERTIFICATE_VERSION, u64::MAX).unwrap().iter().all(|r| r.outcome.is_ok()));
    let mut bad = base(vec![]);
    bad["complexes"]["K"]["generators"]["c"] = json!([-1, 0]);
    bad["complexes"]["K"]["differential"] = json!([["b", "U^2", "a"], ["c", "1", "b"]]);
    // With c at (-1, 0), ∂c = b would need b at (-2, 0): not homogeneous. With c at (-2, -2)
    // it is homogeneous, and ∂∂c = U^2·a ≠ 0.
    let body: Body = serde_json::from_value(bad.clone()).unwrap();
    let r = check_body(&body, CERTIFICATE_VERSION, u64::MAX).unwrap();
    assert!(r.iter().any(|c| c.kind == "complex" && c.outcome.as_ref().is_err_and(|e| e.contains("not homogeneous"))));
    bad["complexes"]["K"]["generators"]["c"] = json!([-2, -2]);
    let body: Body = serde_json::from_value(bad).unwrap();
    let r = check_body(&body, CERTIFICATE_VERSION, u64::MAX).unwrap();
    assert!(r.iter().any(|c| c.kind == "complex" && c.outcome.as_ref().is_err_and(|e| e.contains("∂∂(c)"))));
}

#[test]
fn chain_map_rejected_when_it_does_not_commute() {
    let mut bad = base(vec![]);
    // o ↦ b does not commute: ∂(b) = U^2·a but o is a cycle. Degree: b at (-3,-2) needs a map
    // of degree (-3,-2).
    bad["maps"]["F"] = json!({"from": "O", "to": "K", "degree": [-3, -2], "terms": [["o", "1", "b"]]});
    let body: Body = serde_json::from_value(bad).unwrap();
    let r = check_body(&body, CERTIFICATE_VERSION, u64::MAX).unwrap();
    let f = r.iter().find(|c| c.statement.starts_with("F ")).unwrap();
    assert!(f.outcome.as_ref().unwrap_err().contains("at generator o"));
}

#[test]
fn null_homotopic() {
    let claim = |h: Value| json!({"kind": "null_homotopic", "map": {"times": ["U^2", {"sum": ["F", "G"]}]}, "witness": {"homotopy": h}});
    assert_eq!(one(claim(json!([["o", "1", "b"]]))), Ok(()));
    assert!(one(claim(json!([]))).unwrap_err().contains("at generator o"));
    // A homotopy term of the wrong degree is refused even where it would not matter.
    assert!(one(claim(json!([["o", "1", "b"], ["o", "1", "z"]]))).unwrap_err().contains("not homogeneous"));
}

#[test]
fn not_null_homotopic() {
    let claim = |times: &str, y: Value| json!({"kind": "not_null_homotopic", "map": {"times": [times, {"sum": ["F", "G"]}]}, "witness": {"dual": y}});
    assert_eq!(one(claim("U", json!([["o", "U", "a"]]))), Ok(()));
    // U^2·(F+G) is null-homotopic, so no functional may pass: this one has δy ≠ 0.
    assert!(one(claim("U^2", json!([["o", "U^2", "a"]]))).unwrap_err().contains("δy ≠ 0"));
    // A functional that does not see φ.
    assert!(one(claim("U", json!([["o", "1", "a"]]))).unwrap_err().contains("⟨y, φ⟩ = 0"));
}

#[test]
fn homotopy_equivalence() {
    let claim = |hd: Value| json!({"kind": "homotopy_equivalence", "maps": ["inc", "proj"], "witness": {"source_homotopy": [], "target_homotopy": hd}});
    assert_eq!(one(claim(json!([["q", "1", "p"]]))), Ok(()));
    assert!(one(claim(json!([]))).unwrap_err().contains("f∘g + id"));
}

#[test]
fn homology() {
    let ident = json!({"generators": {"z": [0, 0], "a": [0, 0], "b": [-3, -2]},
        "basis": [["z", "1", "z"], ["a", "1", "a"], ["b", "1", "b"]], "inverse": [["z", "1", "z"], ["a", "1", "a"], ["b", "1", "b"]]});
    let claim = |free: Value, torsion: Value, w: &Value| json!({"kind": "homology", "complex": "K", "free": free, "torsion": torsion, "witness": w});
    assert_eq!(one(claim(json!([[0, 0]]), json!([[2, [0, 0]]]), &ident)), Ok(()));
    assert!(one(claim(json!([[0, 0]]), json!([[1, [0, 0]]]), &ident)).is_err());
    // A basis change z' = z + a with an inverse that does not invert it.
    let mut bad = ident.clone();
    bad["basis"] = json!([["z", "1", "z"], ["z", "1", "a"], ["a", "1", "a"], ["b", "1", "b"]]);
    assert!(one(claim(json!([[0, 0]]), json!([[2, [0, 0]]]), &bad)).unwrap_err().contains("B⁻¹∘B ≠ id"));
    // ... and with the right inverse (a = a, z = z' + a) it is accepted.
    bad["inverse"] = json!([["z", "1", "z"], ["z", "1", "a"], ["a", "1", "a"], ["b", "1", "b"]]);
    assert_eq!(one(claim(json!([[0, 0]]), json!([[2, [0, 0]]]), &bad)), Ok(()));
}

#[test]
fn torsion_order() {
    let claim = |k: u32, dual: Option<Value>| {
        let mut w = json!({"homotopy": [["o", "1", "b"]]});
        if let Some(d) = dual {
            w["dual"] = d;
        }
        let h = if k == 2 { w["homotopy"].clone() } else { json!([["o", "U", "b"]]) };
        w["homotopy"] = h;
        json!({"kind": "torsion_order", "maps": ["F", "G"], "variable": "U", "order": k, "surfaces": true, "witness": w})
    };
    assert_eq!(one(claim(2, Some(json!([["o", "U", "a"]])))), Ok(()));
    assert!(one(claim(2, None)).unwrap_err().contains("dual"));
    // Order 3 is wrong: the dual for U^2·(F+G) cannot exist.
    assert!(one(claim(3, Some(json!([["o", "U^2", "a"]])))).is_err());
}

#[test]
fn statement_must_match_the_fields() {
    let mut c = with_statement(
        json!({"kind": "not_null_homotopic", "map": {"times": ["U", {"sum": ["F", "G"]}]}, "witness": {"dual": [["o", "U", "a"]]}}),
    );
    c["statement"] = json!("F and G are not homotopic at all");
    let body: Body = serde_json::from_value(base(vec![c])).unwrap();
    let r = check_body(&body, CERTIFICATE_VERSION, u64::MAX).unwrap();
    assert!(r.last().unwrap().outcome.as_ref().unwrap_err().contains("statement"));
}

#[test]
fn hash_is_checked_and_malformed_input_is_an_error() {
    let body: Body = serde_json::from_value(base(vec![])).unwrap();
    let cert = seal(body);
    let bytes = serde_json::to_vec(&cert).unwrap();
    assert!(tubecheck::check_bytes("t", &bytes).unwrap().ok());
    let mut tampered = cert.clone();
    tampered.sha256 = "00".repeat(32);
    assert!(!tubecheck::check_bytes("t", &serde_json::to_vec(&tampered).unwrap()).unwrap().hash_ok());
    assert!(tubecheck::check_bytes("t", b"{\"format\": ").is_err());
    assert!(tubecheck::check_bytes("t", b"[]").is_err());
    // Duplicate generator names are refused, not silently merged.
    let dup = String::from_utf8(bytes).unwrap().replace("\"o\":[0,0]", "\"o\":[0,0],\"o\":[1,1]");
    assert!(tubecheck::check_bytes("t", dup.as_bytes()).unwrap_err().contains("duplicate"));
}
