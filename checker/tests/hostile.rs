//! Certificates written by a hostile author: each one is sealed with the canonical hash (as
//! anyone can) and must not verify while its printed statement is false.

use serde_json::{json, Value};
use tubecert_format::statement::render;
use tubecert_format::{Body, Certificate, Claim, RingInfo};

const MINUS: &str = r#"{"variables": ["U"], "gradings": ["maslov", "alexander"],
    "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]}"#;

fn full_ring() -> Value {
    json!({"variables": ["U", "V"], "gradings": ["gr_U", "gr_V"],
           "variable_degrees": {"U": [-2, 0], "V": [0, -2]}, "differential_degree": [-1, -1]})
}

/// A body of format `version` over the minus ring with these complexes, bordered section and
/// claims; each claim's statement is the checker's wording of its fields.
fn body(version: u32, complexes: Value, maps: Value, bordered: Value, claims: Vec<Value>) -> Body {
    let ring: Value = serde_json::from_str(MINUS).unwrap();
    let info = RingInfo::new(&serde_json::from_value(ring.clone()).unwrap()).unwrap();
    let claims: Vec<Value> = claims
        .into_iter()
        .map(|mut c| {
            c["statement"] = json!("");
            let parsed: Claim = serde_json::from_value(c.clone()).expect("claim parses");
            c["statement"] = json!(render(&parsed, &info, version));
            c
        })
        .collect();
    serde_json::from_value(json!({
        "ring": ring, "complexes": complexes, "maps": maps, "bordered": bordered, "claims": claims,
        "provenance": {"producer": "hostile test", "problem_sha256": "0"}
    }))
    .expect("body parses")
}

/// The certificate's bytes with the canonical hash, and the checker's verdict on them:
/// Ok(true) verified, Ok(false) a claim failed, Err refused.
fn verdict(version: u32, body: Body) -> Result<bool, String> {
    let sha256 = tubecert_format::canonical::canonical_sha256(&body).unwrap();
    let cert = Certificate { format: "tubecert-certificate".into(), version, sha256, body };
    let r = tubecheck::check_bytes("hostile.cert.json", &serde_json::to_vec(&cert).unwrap())?;
    for c in r.claims.iter().filter(|c| c.outcome.is_err()) {
        eprintln!("failed: {} — {:?}", c.statement, c.outcome);
    }
    Ok(r.ok())
}

/// Generator names x⊗y of M ⊠ N can collide when names contain ⊗: (a⊗b, c) and (a, b⊗c) both
/// name a⊗b⊗c. Then the complex could carry a generator the product does not have, never
/// compared with anything: here z with ∂z = a⊗c, so H(C) has rank 2 while M ⊠ N has rank 4.
#[test]
fn box_tensor_generator_names_that_collide_are_refused() {
    let gen = |i: u8| json!({"grading": [0, 0], "idempotent": i});
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": {"a⊗b": gen(0), "a": gen(0)}, "operations": []}},
        "type_d_morphisms": {},
        "type_d_structures": {"N": {"generators": {"c": gen(0), "b⊗c": gen(0)}, "differential": []}}
    });
    let complexes = json!({"C": {
        "generators": {"a⊗b⊗c": [0, 0], "a⊗b⊗b⊗c": [0, 0], "a⊗c": [0, 0], "z": [1, 0]},
        "differential": [["z", "1", "a⊗c"]]
    }});
    let claims = vec![
        json!({"kind": "type_a_module", "module": "M", "max_length": 2}),
        json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}),
    ];
    let v = verdict(2, body(2, complexes, json!({}), bordered, claims));
    assert!(!matches!(v, Ok(true)), "C = M ⊠ N verified with a generator z that M ⊠ N does not have: {v:?}");
    assert!(v.as_ref().is_err_and(|e| e.contains("a⊗b⊗c")), "{v:?}");
}

/// A stored certificate's body, as JSON to edit.
fn stored(name: &str) -> (u32, Value) {
    let path = format!("{}/../certificates/{name}.cert.json", env!("CARGO_MANIFEST_DIR"));
    let cert: Value = serde_json::from_slice(&std::fs::read(path).unwrap()).unwrap();
    (cert["version"].as_u64().unwrap() as u32, cert["body"].clone())
}

/// `F = id_M ⊠ f` says F maps M ⊠ N to M ⊠ N′; a map between complexes with the product's
/// generators but other differentials is not that map. Here KC (the target) loses its
/// differential and no box_tensor claim is left to notice.
#[test]
fn box_tensor_map_between_complexes_that_are_not_the_products_is_refused() {
    let (version, mut b) = stored("cable-by-p1");
    b["claims"].as_array_mut().unwrap().retain(|c| {
        let kind = c["kind"].as_str().unwrap();
        kind == "type_a_module" || (kind == "box_tensor_map" && c["map"] == "F")
    });
    assert_eq!(
        verdict(version, serde_json::from_value(b.clone()).unwrap()),
        Ok(true),
        "the trimmed certificate verifies"
    );
    b["complexes"]["KC"]["differential"] = json!([]);
    let v = verdict(version, serde_json::from_value(b).unwrap());
    assert_eq!(v, Ok(false), "F = id ⊠ f verified with a target that is not M ⊠ N′");
}

/// A family's output power a·n + b with a = 2^20 leaves u32 once a δ-path repeats the block
/// more than 4096 times: a chain of 4100 ρ23 arrows in a bounded structure (a few hundred
/// kilobytes). The term must be refused, not wrapped, saturated (two saturated powers would
/// cancel mod 2) or a panic.
#[test]
fn a_family_power_beyond_the_exponent_bound_is_refused() {
    let gen = |i: u8| json!({"grading": [0, 0], "idempotent": i});
    let n = 4100;
    let names: Vec<String> = (0..=n).map(|k| format!("y{k}")).collect();
    let generators: serde_json::Map<String, Value> = names.iter().map(|y| (y.clone(), gen(1))).collect();
    let differential: Vec<Value> = names.windows(2).map(|w| json!([w[0], "rho23", w[1]])).collect();
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": {"x": gen(1)}, "operations": [
            {"from": "x", "power": [1 << 20, 0], "prefix": [], "repeat": ["rho23"], "suffix": [], "to": "x"}
        ]}},
        "type_d_morphisms": {},
        "type_d_structures": {"N": {"generators": generators, "differential": differential}}
    });
    let cgens: serde_json::Map<String, Value> = names.iter().map(|y| (format!("x⊗{y}"), json!([0, 0]))).collect();
    let complexes = json!({"C": {"generators": cgens, "differential": []}});
    let claims = vec![
        json!({"kind": "type_a_module", "module": "M", "max_length": 2}),
        json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}),
    ];
    let v = verdict(2, body(2, complexes, json!({}), bordered, claims));
    assert!(v.as_ref().is_err_and(|e| e.contains("2^20")), "{v:?}");
}

/// |M|·|N| generators x⊗y from |M| + |N| written ones: 3000 + 3000 generators (about 200
/// kilobytes) ask for 9·10^6 named pairs. The pairs are counted against the budget before
/// they are made, so the file is refused quickly instead of filling memory.
#[test]
fn a_box_tensor_product_with_too_many_generators_is_refused_before_it_is_built() {
    let gen = json!({"grading": [0, 0], "idempotent": 0});
    let many =
        |p: &str| -> serde_json::Map<String, Value> { (0..3000).map(|k| (format!("{p}{k}"), gen.clone())).collect() };
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": many("x"), "operations": []}},
        "type_d_morphisms": {},
        "type_d_structures": {"N": {"generators": many("y"), "differential": []}}
    });
    let claims = vec![
        json!({"kind": "type_a_module", "module": "M", "max_length": 0}),
        json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}),
    ];
    let complexes = json!({"C": {"generators": {"c": [0, 0]}, "differential": []}});
    let start = std::time::Instant::now();
    let v = verdict(2, body(2, complexes, json!({}), bordered, claims));
    assert!(v.as_ref().is_err_and(|e| e.contains("budget")), "{v:?}");
    // Generous for a debug build on a loaded machine; building the pairs took far longer.
    assert!(start.elapsed().as_secs() < 20, "took {:?}", start.elapsed());
}

/// LOT Thm 11.26 gives an arrow U^l (or V^l) a chain of l generators: four arrows of length
/// 2^20 in a full complex of five generators (a file of 2 KB) ask for 4·2^20 of them. The
/// chains are counted against the budget before they are made.
#[test]
fn a_complement_with_long_arrows_is_refused_before_its_chains_are_built() {
    let (version, mut b) = stored("cable-by-p1");
    let l: i64 = 1 << 20;
    let (u, v) = (format!("U^{l}"), format!("V^{l}"));
    let s = 2 * l - 2;
    b["bordered"]["full_complexes"]["KC.companion"] = json!({
        "generators": {"a": [-s, -s], "b": [1, 1 - 2 * l], "c": [1 - 2 * l, 1], "d": [0, 0], "z": [0, 0]},
        "differential": [["a", u, "b"], ["a", v, "c"], ["b", v, "d"], ["c", u, "d"]]
    });
    b["claims"].as_array_mut().unwrap().retain(|c| c["kind"] == "complement" && c["complex"] == "KC.companion");
    let start = std::time::Instant::now();
    let v = verdict(version, serde_json::from_value(b).unwrap());
    assert!(v.as_ref().is_err_and(|e| e.contains("budget")), "{v:?}");
    assert!(start.elapsed().as_secs() < 20, "took {:?}", start.elapsed());
}

/// `max_length` is a u32: at 2^32 − 1 with two families that repeat a block, the count of
/// words to check passes u64 (4·10^9 words per family times 2·4·10^9 pairs). It must not
/// overflow.
#[test]
fn a_huge_max_length_is_refused_not_overflowed() {
    let gen = json!({"grading": [0, 0], "idempotent": 1});
    let family =
        |b: u32| json!({"from": "x", "power": [0, b], "prefix": [], "repeat": ["rho23"], "suffix": [], "to": "x"});
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": {"x": gen}, "operations": [family(0), family(1)]}},
        "type_d_morphisms": {}, "type_d_structures": {}
    });
    let claims = vec![json!({"kind": "type_a_module", "module": "M", "max_length": u32::MAX})];
    // Refused by the budget or failed on a relation (these families break one), never a panic.
    let v = verdict(2, body(2, json!({}), json!({}), bordered, claims));
    assert!(!matches!(v, Ok(true)), "{v:?}");
}

/// M ⊠ N is a complex only when N is a type D structure: a `box_tensor` claim whose N no
/// `type_d_structure` claim checks is refused (exit 2), as one whose M no `type_a_module`
/// claim covers.
#[test]
fn a_box_tensor_product_needs_its_structure_checked() {
    let (version, mut b) = stored("cable-by-p1");
    b["claims"]
        .as_array_mut()
        .unwrap()
        .retain(|c| c["kind"] != "type_d_structure" || c["structure"] != "KC.complement");
    let v = verdict(version, serde_json::from_value(b).unwrap());
    assert!(v.as_ref().is_err_and(|e| e.contains("KC.complement") && e.contains("type_d_structure claim")), "{v:?}");
}
