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

/// A certificate of format `version` with this body, sealed with the canonical hash (as anyone
/// can), and the checker's report on its bytes (Err: refused).
fn sealed(version: u32, body: Body) -> Result<tubecheck::FileReport, String> {
    let sha256 = tubecert_format::canonical::canonical_sha256(&body).unwrap();
    let cert = Certificate { format: "tubecert-certificate".into(), version, sha256, body };
    tubecheck::check_bytes("hostile.cert.json", &serde_json::to_vec(&cert).unwrap())
}

/// The checker's verdict on a sealed certificate: Ok(true) verified, Ok(false) a claim failed,
/// Err refused.
fn verdict(version: u32, body: Body) -> Result<bool, String> {
    let r = sealed(version, body)?;
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

/// The file is refused for its work (the budget), within `seconds` (generous for a debug build
/// on a loaded machine; doing the work took far longer).
fn refused_for_work(version: u32, body: Body, seconds: u64, what: &str) {
    let start = std::time::Instant::now();
    let v = verdict(version, body);
    assert!(v.as_ref().is_err_and(|e| e.contains("budget")), "{what}: {v:?}");
    assert!(start.elapsed().as_secs() < seconds, "{what}: took {:?}", start.elapsed());
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
        ["type_a_module", "type_d_structure", "type_d_morphism"].contains(&kind)
            || (kind == "box_tensor_map" && c["map"] == "F")
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
    pairing_refused(bordered, claims, 20, "generator pairs");
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
    refused_for_work(version, serde_json::from_value(b).unwrap(), 20, "long arrows");
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

/// A module with one generator (a name of 200 bytes) and the family m(x, ρ12^n) = x, paired with
/// `structure`: the parts of a bordered section for the bombs below.
fn rho12_pairing(structure: Value, padding: usize) -> Value {
    let x = "x".repeat(200);
    let mut generators = serde_json::Map::new();
    generators.insert(x.clone(), json!({"grading": [0, 0], "idempotent": 0}));
    // ι1 generators pair with no generator of the structure: written items, nothing more.
    for k in 0..padding {
        generators.insert(format!("p{k}"), json!({"grading": [0, 0], "idempotent": 1}));
    }
    json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": generators, "operations": [
            {"from": x, "power": [0, 0], "prefix": [], "repeat": ["rho12"], "suffix": [], "to": x}
        ]}},
        "type_d_morphisms": {},
        "type_d_structures": {"N": structure}
    })
}

fn refused_quickly(bordered: Value, what: &str) {
    let claims = vec![
        json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}),
        json!({"kind": "type_a_module", "module": "M", "max_length": 2}),
    ];
    pairing_refused(bordered, claims, 10, what);
}

/// A complex C of 200 generators and no differential: larger than the products of the bombs
/// below before their walks, so that those, not the comparison, are what is tested.
fn padded_c() -> Value {
    let generators: serde_json::Map<String, Value> = (0..200).map(|i| (format!("c{i}"), json!([0, 0]))).collect();
    json!({"C": {"generators": generators, "differential": []}})
}

/// A version-2 body with this bordered section and these claims about a pairing into C
/// (`padded_c`) is refused for its work within `seconds`.
fn pairing_refused(bordered: Value, claims: Vec<Value>, seconds: u64, what: &str) {
    refused_for_work(2, body(2, padded_c(), json!({}), bordered, claims), seconds, what);
}

/// A chain y0 →ρ12 y1 →ρ12 … of k generators gives ∂(x⊗y_i) = Σ_{j ≥ i} x⊗y_j: k²/2 terms, each
/// a name of 200 bytes, from a file of 150 KB (k = 2000: 0.5 GB; k = 6000, 450 KB, passed
/// 3 GB). The terms are counted before they are made, like the generator pairs, so the file was
/// refused before memory filled; a 2.3 MB file (k = 30,000) still took 1.7 GB first. The names
/// the walk keeps are now at most the size of the complex they are compared with (the product
/// differs beyond it): this one fails at once.
#[test]
fn box_tensor_terms_are_counted_before_their_names_are_made() {
    let k = 2000;
    let names: Vec<String> = (0..k).map(|i| format!("y{i}")).collect();
    let generators: serde_json::Map<String, Value> =
        names.iter().map(|y| (y.clone(), json!({"grading": [0, 0], "idempotent": 0}))).collect();
    let differential: Vec<Value> = names.windows(2).map(|w| json!([w[0], "rho12", w[1]])).collect();
    let bordered = rho12_pairing(json!({"generators": generators, "differential": differential}), 0);
    let claims = vec![
        json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}),
        json!({"kind": "type_a_module", "module": "M", "max_length": 2}),
        json!({"kind": "type_d_structure", "structure": "N"}),
    ];
    let start = std::time::Instant::now();
    let r = sealed(2, body(2, padded_c(), json!({}), bordered, claims)).unwrap();
    let e = r.claims.iter().find(|c| c.kind == "box_tensor").unwrap().outcome.as_ref().unwrap_err();
    assert!(e.contains("M ⊠ N has more generators and terms than the 200 written"), "{e}");
    assert!(start.elapsed().as_secs() < 10, "took {:?}", start.elapsed());
}

/// The walk keeps at most as many generators and terms as the complex compared with has: a
/// structure chain of k = 3000 generators (ρ12 arrows) paired with x of a 150-byte name has
/// k²/2 terms (4.5·10^6 names of 160 bytes, 0.7 GB), compared with a complex of the k
/// generators x⊗y_i and k − 1 terms (a file of 1 MB, which was refused for its work after
/// 0.1 GB of names): it fails once the terms kept pass 2k − 1.
#[test]
fn a_box_tensor_product_larger_than_its_complex_fails_before_it_is_named() {
    let k = 3000;
    let names: Vec<String> = (0..k).map(|i| format!("y{i}")).collect();
    let generators: serde_json::Map<String, Value> =
        names.iter().map(|y| (y.clone(), json!({"grading": [0, 0], "idempotent": 0}))).collect();
    let differential: Vec<Value> = names.windows(2).map(|w| json!([w[0], "rho12", w[1]])).collect();
    let mut bordered = rho12_pairing(json!({"generators": generators, "differential": differential}), 0);
    let x = "x".repeat(150);
    let m = &mut bordered["type_a_modules"]["M"];
    *m = serde_json::from_str(&m.to_string().replace(&"x".repeat(200), &x)).unwrap();
    let c: serde_json::Map<String, Value> = names.iter().map(|y| (format!("{x}⊗{y}"), json!([0, 0]))).collect();
    let d: Vec<Value> =
        names.windows(2).map(|w| json!([format!("{x}⊗{}", w[0]), "1", format!("{x}⊗{}", w[1])])).collect();
    let claims = vec![
        json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}),
        json!({"kind": "type_a_module", "module": "M", "max_length": 2}),
        json!({"kind": "type_d_structure", "structure": "N"}),
    ];
    let r = sealed(2, body(2, json!({"C": {"generators": c, "differential": d}}), json!({}), bordered, claims));
    let r = r.unwrap();
    let e = r.claims.iter().find(|c| c.kind == "box_tensor").unwrap().outcome.as_ref().unwrap_err();
    assert!(e.contains(&format!("more generators and terms than the {} written", 2 * k - 1)), "{e}");
}

/// A type D structure of d + 1 layers of two generators, each joined by ρ12 to both of the next
/// layer: 2^d δ-paths from the first layer.
fn layers(d: usize) -> Value {
    let mut generators = serde_json::Map::new();
    let mut differential = Vec::new();
    for l in 0..=d {
        for s in ["a", "b"] {
            generators.insert(format!("{s}{l}"), json!({"grading": [0, 0], "idempotent": 0}));
            if l < d {
                differential.extend([
                    json!([format!("{s}{l}"), "rho12", format!("a{}", l + 1)]),
                    json!([format!("{s}{l}"), "rho12", format!("b{}", l + 1)]),
                ]);
            }
        }
    }
    json!({"generators": generators, "differential": differential})
}

/// Two generators per layer, each joined by ρ12 to both of the next layer: 2^d δ-paths from the
/// first layer, every one a term of ∂(x⊗a0) (mod 2 they cancel in pairs, so the product is
/// small), paid for by 20,000 written ι1 generators of M that pair with nothing. Terms listed
/// before they cancel are counted too, else one generator's list grows to gigabytes.
#[test]
fn box_tensor_terms_before_cancellation_are_counted() {
    refused_quickly(rho12_pairing(layers(40), 20_000), "layers");
}

/// Every claim's statement rewritten in the wording of format `version` (the version is outside
/// the hash, so anyone can restate a body for another version).
fn restate(version: u32, b: &mut Value) {
    let info = RingInfo::new(&serde_json::from_value(b["ring"].clone()).unwrap()).unwrap();
    for c in b["claims"].as_array_mut().unwrap() {
        let parsed: Claim = serde_json::from_value(c.clone()).expect("claim parses");
        c["statement"] = json!(render(&parsed, &info, version));
    }
}

/// The checker's report of a certificate of format `version` with this body.
fn report(version: u32, b: Value) -> tubecheck::FileReport {
    sealed(version, serde_json::from_value(b).unwrap()).expect("read")
}

/// cable-by-p1 with its patterns' generators moved by `shift` (doubled (j; p, q; a), central, so
/// every operation stays homogeneous) and the products' gradings, τ witness and τ moved to match, the
/// Maslov witnesses dropped and every statement in the wording of `version`.
fn downgraded_cable(version: u32, shift: [i64; 4]) -> Value {
    let (_, mut b) = stored("cable-by-p1");
    for c in b["claims"].as_array_mut().unwrap() {
        if c["kind"] == "box_tensor" || c["kind"] == "box_tensor_map" {
            c.as_object_mut().unwrap().remove("witness");
        }
    }
    for m in b["bordered"]["type_a_modules"].as_object_mut().unwrap().values_mut() {
        for g in m["generators"].as_object_mut().unwrap().values_mut() {
            for (i, d) in shift.iter().enumerate() {
                g["grading"][i] = json!(g["grading"][i].as_i64().unwrap() + d);
            }
        }
    }
    // (Maslov, Alexander) moves by (j, a): the doubled shift halved.
    let (dm, da) = (shift[0] / 2, shift[3] / 2);
    let mv = |g: &mut Value| *g = json!([g[0].as_i64().unwrap() + dm, g[1].as_i64().unwrap() + da]);
    for c in b["complexes"].as_object_mut().unwrap().values_mut() {
        c["generators"].as_object_mut().unwrap().values_mut().for_each(mv);
    }
    for c in b["claims"].as_array_mut().unwrap().iter_mut().filter(|c| c["kind"] == "tau" && c["complex"] == "KC") {
        c["witness"]["generators"].as_object_mut().unwrap().values_mut().for_each(mv);
        c["tau"] = json!(c["tau"].as_i64().unwrap() - da);
    }
    restate(version, &mut b);
    b
}

/// Format version 3 reads box tensor gradings without any normalization, so the author of the
/// module fixes them: with the pattern moved by gr(U)^(−3) the cable's τ reads 3, and a version-3
/// certificate verifies that. The version is outside the hash, so a version-5 certificate can be
/// restated as version 3 to skip both normalizations; its reports must then say that the
/// gradings are not absolute, in every format, as they say of version 4's Maslov grading.
#[test]
fn a_restated_version_3_certificate_says_its_box_tensor_gradings_are_not_absolute() {
    let b = downgraded_cable(3, [-12, 0, 0, -6]);
    assert_eq!(b["claims"].as_array().unwrap().iter().find(|c| c["kind"] == "tau").unwrap()["tau"], json!(3));
    let r = report(3, b);
    assert!(
        r.ok(),
        "version 3 reads gradings as they come: {:?}",
        r.claims.iter().filter(|c| c.outcome.is_err()).collect::<Vec<_>>()
    );
    let boxes: Vec<_> = r.claims.iter().filter(|c| c.kind.starts_with("box_tensor")).collect();
    assert_eq!(boxes.len(), 4);
    for c in boxes {
        assert!(c.statement.contains("[format version 3:") && c.statement.contains("not certified"), "{}", c.statement);
    }
    let (md, tex) = (tubecheck::report_appendix::markdown(&r), tubecheck::report_appendix::latex(&r));
    assert_eq!(md.matches("[format version 3:").count(), 4, "{md}");
    assert_eq!(tex.matches("[format version 3:").count(), 4, "{tex}");
    normalization_said_alike(&r, 4);
    // What fixes those gradings here, the module's declared gradings and period, is shown beside
    // its claim and the periods beside each pairing, in every report.
    let text = tubecheck::report_text::render(&r);
    let json = tubecheck::report_json::render(&r).to_string();
    let line = "h_A(KC.pattern) = (3/2; 0, 1; 1); 1 generator (idempotent, grading): x ι0 (-6; 0, 0; -3)";
    assert_eq!(text.matches(line).count(), 1, "{text}");
    assert_eq!(md.matches(line).count(), 1, "{md}");
    assert_eq!(text.matches("periods: h_A(KO.pattern) = (3/2; 0, 1; 1), h_D(KO.complement)").count(), 3, "{text}");
    assert!(tex.contains("$h_A(\\mathrm{KC.pattern}) = (3/2; 0, 1; 1)$; 1 generator (idempotent, grading): $\\mathrm{x}$ $\\iota_0$ $(-6; 0, 0; -3)$"), "{tex}");
    let object = r#""object":{"generators":{"x":{"grading":[-12,0,0,-6],"idempotent":0}},"name":"KC.pattern","period":[3,0,2,2]}"#;
    assert!(json.contains(object), "{json}");
}

/// The LaTeX report says how each box tensor product's gradings were read and normalized
/// exactly where the checker's statement (text and Markdown) says it; `n` box tensor claims.
fn normalization_said_alike(r: &tubecheck::FileReport, n: usize) {
    let tex = tubecheck::report_appendix::latex(r);
    let claims: Vec<&str> = tex.lines().filter(|l| l.starts_with("\\item $") && l.contains("boxtimes")).collect();
    let statements: Vec<&str> =
        r.claims.iter().filter(|c| c.kind.starts_with("box_tensor")).map(|c| &c.statement[..]).collect();
    assert_eq!((claims.len(), statements.len()), (n, n), "{tex}");
    let phrases = [
        ("gradings added", "gradings added"),
        ("in LOT's grading group", "in LOT's grading group"),
        ("symmetric under t ↔ t⁻¹", "symmetric under $t \\leftrightarrow t^{-1}$"),
        ("witnessed cycle", "witnessed cycle"),
        ("HF-hat(S³) ≅ F2", "$\\widehat{HF}(S^3) \\cong \\mathbb{F}_2$"),
    ];
    for (statement, line) in statements.iter().zip(&claims) {
        for (text, latex) in phrases {
            assert_eq!(statement.contains(text), line.contains(latex), "{text}:\n{statement}\n{line}");
        }
    }
}

/// A version-5 certificate's LaTeX report says both normalizations, as its statements do.
#[test]
fn the_latex_report_says_how_box_tensor_gradings_were_normalized() {
    let (version, b) = stored("cable-by-p1");
    let r = report(version, b);
    assert!(r.ok());
    normalization_said_alike(&r, 4);
    let tex = tubecheck::report_appendix::latex(&r);
    assert_eq!(tex.matches("witnessed cycle of $\\mathrm{KC}/(U - 1)$, non-zero in homology").count(), 1, "{tex}");
}

/// A failed claim is shown in the checker's wording of its fields, never in the file's text,
/// which a hostile author may write to read as another result.
#[test]
fn a_failed_claim_is_shown_in_the_checkers_words_in_every_report() {
    let (version, mut b) = stored("disk-pair-p2");
    b["claims"][0]["statement"] = json!("ord_U(F − G) = 9, checked");
    let r = report(version, b);
    assert!(r.claims.iter().find(|c| !c.implicit).unwrap().outcome.is_err());
    let (md, tex) = (tubecheck::report_appendix::markdown(&r), tubecheck::report_appendix::latex(&r));
    let (text, json) = (tubecheck::report_text::render(&r), tubecheck::report_json::render(&r).to_string());
    for report in [&md, &tex, &text, &json] {
        assert!(!report.contains("= 9"), "{report}");
    }
    assert!(md.contains("1. ✗ failed ord_U(F − G) = 2 *(torsion_order;"), "{md}");
    assert!(text.contains("✗ [torsion_order] ord_U(F − G) = 2"), "{text}");
}

/// Version 4's Maslov grading is a convention: with the pattern moved by λ² (Maslov only) KC's
/// gradings all move by 2 and the symmetric Euler characteristic cannot tell. Every report must
/// carry the caveat, the appendix formats included.
#[test]
fn a_restated_version_4_certificate_carries_its_caveat_into_every_report() {
    let r = report(4, downgraded_cable(4, [4, 0, 0, 0]));
    assert!(
        r.ok(),
        "version 4 reads the Maslov grading by convention: {:?}",
        r.claims.iter().filter(|c| c.outcome.is_err()).collect::<Vec<_>>()
    );
    let caveat = "[format version 4: the Maslov normalization is by convention, not certified]";
    assert_eq!(r.claims.iter().filter(|c| c.statement.ends_with(caveat)).count(), 4);
    let (md, tex) = (tubecheck::report_appendix::markdown(&r), tubecheck::report_appendix::latex(&r));
    assert_eq!(md.matches(caveat).count(), 4, "{md}");
    assert_eq!(tex.matches(caveat).count(), 4, "{tex}");
    normalization_said_alike(&r, 4);
}

/// The same body restated as version 5 without its witnesses fails, and with the witnesses
/// of the unshifted certificate fails: the Maslov grading is certified there.
#[test]
fn a_shifted_maslov_grading_does_not_verify_in_version_5() {
    let mut b = downgraded_cable(5, [4, 0, 0, 0]);
    assert_eq!(verdict(5, serde_json::from_value(b.clone()).unwrap()), Ok(false));
    let (_, genuine) = stored("cable-by-p1");
    for (c, g) in b["claims"].as_array_mut().unwrap().iter_mut().zip(genuine["claims"].as_array().unwrap()) {
        if let Some(w) = g.get("witness") {
            c["witness"] = w.clone();
        }
    }
    assert_eq!(verdict(5, serde_json::from_value(b).unwrap()), Ok(false));
}

/// The A∞ allowance (`WORK_FLOOR`) joins the budget for a `type_a_module` check only. A claim
/// about a module that is not declared must not leave it there: 40 such claims (6 KB) would
/// add 40·2^32 units for what follows, here 2^40 δ-paths of a layered structure.
#[test]
fn the_a_infinity_allowance_is_not_left_behind_by_a_claim_about_an_undeclared_module() {
    let bordered = rho12_pairing(layers(40), 0);
    let mut claims: Vec<Value> =
        (0..40).map(|_| json!({"kind": "type_a_module", "module": "Z", "max_length": 2})).collect();
    claims.push(json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}));
    pairing_refused(bordered, claims, 10, "undeclared module");
}

/// A framing of −2^53 (the most negative integer a file holds): nothing may overflow (a panic); the
/// chains it asks for are counted first, so the file is refused.
#[test]
fn a_framing_at_the_end_of_the_integers_is_refused() {
    let (version, mut b) = stored("cable-by-p1");
    b["claims"].as_array_mut().unwrap().retain(|c| c["kind"] == "complement" && c["complex"] == "KC.companion");
    b["claims"][0]["framing"] = json!(-(1i64 << 53));
    restate(version, &mut b);
    refused_for_work(version, serde_json::from_value(b).unwrap(), 20, "framing");
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

/// id_M ⊠ f is a chain map only when f is a type D morphism between type D structures: a
/// `box_tensor_map` claim is refused (exit 2) unless `type_d_structure` claims check N and N′
/// and a `type_d_morphism` claim checks f, each named in the refusal when it is missing.
#[test]
fn a_box_tensor_map_needs_its_structures_and_morphism_checked() {
    let (version, full) = stored("cable-by-p1");
    let f = full["claims"].as_array().unwrap().iter().find(|c| c["kind"] == "box_tensor_map" && c["map"] == "F");
    let f = f.unwrap()["morphism"].as_str().unwrap().to_string();
    let (n, n2) = (
        full["bordered"]["type_d_morphisms"][&f]["from"].clone(),
        full["bordered"]["type_d_morphisms"][&f]["to"].clone(),
    );
    for (kind, key, name) in [
        ("type_d_structure", "structure", n),
        ("type_d_structure", "structure", n2),
        ("type_d_morphism", "morphism", json!(f)),
    ] {
        let mut b = full.clone();
        b["claims"].as_array_mut().unwrap().retain(|c| {
            let k = c["kind"].as_str().unwrap();
            (k != "box_tensor" && k != "box_tensor_map" || c["map"] == "F") && !(k == kind && c[key] == name)
        });
        let v = verdict(version, serde_json::from_value(b).unwrap());
        let named = |e: &String| e.contains(name.as_str().unwrap()) && e.contains(&format!("{kind} claim"));
        assert!(v.as_ref().is_err_and(named), "{kind} {name}: {v:?}");
    }
}

/// A hub: k generators s_i →ρ3 h and h →ρ2 t_j (ρ3ρ2 = 0, so the D relation holds) has 2k
/// arrows and k² composites to visit. 600 claims about it (80 KB) asked for 600·k² of them
/// (k = 30,000 took 12 s a claim); they are counted against the budget first.
fn hub(k: usize) -> Value {
    let mut generators = serde_json::Map::new();
    generators.insert("h".into(), json!({"grading": [0, 0], "idempotent": 1}));
    let mut differential = Vec::new();
    for i in 0..k {
        for (g, term) in [("s", json!([format!("s{i}"), "rho3", "h"])), ("t", json!(["h", "rho2", format!("t{i}")]))] {
            generators.insert(format!("{g}{i}"), json!({"grading": [0, 0], "idempotent": 0}));
            differential.push(term);
        }
    }
    json!({"generators": generators, "differential": differential})
}

#[test]
fn the_d_relation_of_a_hub_is_counted_before_it_is_checked() {
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(), "type_a_modules": {},
        "type_d_morphisms": {"f": {"from": "N", "to": "N", "terms": (0..3000).map(|i| json!([format!("s{i}"), "rho3", "h"])).collect::<Vec<_>>()}},
        "type_d_structures": {"N": hub(3000)}
    });
    for claim in
        [json!({"kind": "type_d_structure", "structure": "N"}), json!({"kind": "type_d_morphism", "morphism": "f"})]
    {
        let what = claim["kind"].to_string();
        refused_for_work(2, body(2, json!({}), json!({}), bordered.clone(), vec![claim; 600]), 10, &what);
    }
}

/// Strict unitality: an idempotent δ¹ step is a whole path (m_2(x, ι) = x); a path with ι among
/// two or more inputs gives nothing (m_3(x, ι, ρ12) = m_3(x, ρ12, ι) = 0). A product that adds
/// the term such a path would give is not M ⊠ N.
#[test]
fn an_idempotent_step_inside_a_longer_path_gives_no_term() {
    let gen = |i: u8| json!({"grading": [0, 0], "idempotent": i});
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": {"x": gen(0)}, "operations": [
            {"from": "x", "power": [0, 1], "prefix": ["rho12"], "repeat": [], "suffix": [], "to": "x"}
        ]}},
        "type_d_morphisms": {},
        "type_d_structures": {"N": {"generators": {"a": gen(0), "b": gen(0), "c": gen(0), "d": gen(0)},
            "differential": [["a", "1", "b"], ["b", "rho12", "c"], ["c", "1", "d"]]}}
    });
    let claims = || {
        vec![
            json!({"kind": "type_a_module", "module": "M", "max_length": 2}),
            json!({"kind": "type_d_structure", "structure": "N"}),
            json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}),
        ]
    };
    let outcome = |extra: Vec<Value>| {
        let mut d = vec![json!(["x⊗a", "1", "x⊗b"]), json!(["x⊗b", "U", "x⊗c"]), json!(["x⊗c", "1", "x⊗d"])];
        d.extend(extra);
        let gens = json!({"x⊗a": [0, 0], "x⊗b": [0, 0], "x⊗c": [0, 0], "x⊗d": [0, 0]});
        let b = body(2, json!({"C": {"generators": gens, "differential": d}}), json!({}), bordered.clone(), claims());
        let r = sealed(2, b).expect("read");
        r.claims.iter().find(|c| c.kind == "box_tensor").unwrap().outcome.clone()
    };
    assert!(outcome(vec![]).is_ok(), "{:?}", outcome(vec![]));
    for extra in [json!(["x⊗a", "U", "x⊗c"]), json!(["x⊗b", "U", "x⊗d"]), json!(["x⊗a", "U", "x⊗d"])] {
        assert!(outcome(vec![extra.clone()]).is_err(), "{extra} accepted");
    }
}

/// The pairing of cable-by-p1 uses words of length k; a `type_a_module` claim stating a length
/// below 2k does not cover it, whatever else the certificate says (exit 2).
#[test]
fn a_module_certified_on_too_short_words_does_not_cover_the_pairing() {
    let (version, mut b) = stored("cable-by-p1");
    for c in b["claims"].as_array_mut().unwrap().iter_mut().filter(|c| c["kind"] == "type_a_module") {
        c["max_length"] = json!(3);
    }
    restate(version, &mut b);
    let v = verdict(version, serde_json::from_value(b).unwrap());
    assert!(v.as_ref().is_err_and(|e| e.contains("only up to 3")), "{v:?}");
}

/// A body of format `version` over `ring` (JSON) with these complexes, bordered section and
/// claims, each claim's statement in the checker's wording of its fields.
fn body_over(version: u32, ring: Value, complexes: Value, bordered: Option<Value>, claims: Vec<Value>) -> Body {
    let info = RingInfo::new(&serde_json::from_value(ring.clone()).unwrap()).unwrap();
    let mut b = json!({
        "ring": ring, "complexes": complexes, "maps": {}, "claims": claims,
        "provenance": {"producer": "hostile test", "problem_sha256": "0"}
    });
    if let Some(bordered) = bordered {
        b["bordered"] = bordered;
    }
    for c in b["claims"].as_array_mut().unwrap() {
        c["statement"] = json!("");
        let parsed: Claim = serde_json::from_value(c.clone()).expect("claim parses");
        c["statement"] = json!(render(&parsed, &info, version));
    }
    serde_json::from_value(b).expect("body parses")
}

/// The verdict on a sealed certificate (failed claims not printed: there are many) and how
/// long the checker took.
fn timed(version: u32, body: Body) -> (Result<bool, String>, std::time::Duration) {
    let start = std::time::Instant::now();
    let v = sealed(version, body).map(|r| r.ok());
    (v, start.elapsed())
}

/// τ over F2[U,V] is read on C/(V), which the checker makes itself: a copy of C for each
/// claim, never counted, and each copy's checks got the whole budget again. 1000 claims of
/// 250 bytes about one complex of 40,000 arrows asked for 4·10^7 copied terms (a file of 1 MB;
/// 20,000 claims about 10^6 arrows: 2·10^10). The copies and their checks are the file's work.
#[test]
fn quotients_read_by_tau_claims_are_counted_against_the_file() {
    let n = 200;
    let mut generators = serde_json::Map::new();
    for i in 0..n {
        generators.insert(format!("a{i}"), json!([1, 1]));
        generators.insert(format!("b{i}"), json!([0, 0]));
    }
    let differential: Vec<Value> =
        (0..n).flat_map(|i| (0..n).map(move |j| json!([format!("a{i}"), "1", format!("b{j}")]))).collect();
    let complexes = json!({"C": {"generators": generators, "differential": differential}});
    let witness = json!({"generators": {}, "basis": [], "inverse": []});
    let claims: Vec<Value> = (0..1000)
        .map(|k| {
            let kind = if k % 2 == 0 {
                json!({"kind": "tau", "complex": "C", "alexander": "A", "tau": 0})
            } else {
                json!({"kind": "torsion_order_of_complex", "complex": "C", "variable": "U", "order": 0})
            };
            let mut c = kind;
            c["witness"] = witness.clone();
            c
        })
        .collect();
    let (v, took) = timed(5, body_over(5, full_ring(), complexes, None, claims));
    assert!(v.as_ref().is_err_and(|e| e.contains("work limit")), "{v:?}");
    assert!(took.as_secs() < 10, "took {took:?}");
}

/// A complement claim compares the structure with the one LOT Thm 11.26 gives, which is
/// counted before it is made; the structure's own δ¹ was copied and sorted for each claim,
/// however long. 100,000 extra terms between the γ's (4 MB) and 300 claims (75 KB) asked for
/// 3·10^7 copied terms (2000 claims and 200,000 terms: five minutes). Only as many terms as
/// LOT's structure has, plus one, need be read to find one that differs.
#[test]
fn a_complement_claim_reads_no_more_of_the_structure_than_lot_gives() {
    let (version, mut b) = stored("cable-by-p1");
    let full: tubecert_format::bordered::Bordered = serde_json::from_value(b["bordered"].clone()).unwrap();
    let ctx = tubecheck::load::load(&full.full_ring, &full.full_complexes, &full.full_maps).unwrap();
    let c = &ctx.complexes[ctx.complex_named("KC.companion").unwrap()];
    let t = 2000;
    let (mut spec, tau, _) = tubecheck::bordered::complement(c, t, true, false).unwrap();
    let gammas = spec.generators.keys().filter(|g| g.starts_with("gamma")).count();
    assert!(gammas > 1000, "{gammas}");
    let extra =
        (1..=gammas).flat_map(|i| (1..i).map(move |j| [format!("gamma{i}"), "rho23".into(), format!("gamma{j}")]));
    spec.differential.extend(extra.take(100_000));
    b["bordered"]["type_d_structures"]["KC.complement"] = serde_json::to_value(&spec).unwrap();
    let claim = json!({"kind": "complement", "complex": "KC.companion", "framing": t, "structure": "KC.complement",
        "tau": tau, "statement": ""});
    b["claims"] = json!(vec![claim; 300]);
    restate(version, &mut b);
    let (v, took) = timed(version, serde_json::from_value(b).unwrap());
    assert!(!matches!(v, Ok(true)), "{v:?}");
    assert!(took.as_secs() < 10, "took {took:?}");
}

/// Version 3: every family of a module must be homogeneous, which was checked again for each
/// `type_a_module` claim, uncounted (with `max_length` 0 nothing else is done): 2000 families of
/// 60 inputs and 5000 claims (about 2 MB) took 25 s. It is a property of the module, read once.
#[test]
fn the_homogeneity_of_a_module_is_checked_once_not_per_claim() {
    let gen = |g: [i64; 4]| json!({"grading": g, "idempotent": 1});
    let mut generators = serde_json::Map::new();
    generators.insert("x".into(), gen([0, 0, 0, 0]));
    // gr(ρ23)^60·λ^59 = (29; 0, 60; 0): the output's grading makes each family homogeneous.
    let families: Vec<Value> = (0..2000)
        .map(|i| {
            generators.insert(format!("y{i}"), gen([58, 0, 120, 0]));
            json!({"from": "x", "power": [0, 0], "prefix": vec!["rho23"; 60], "repeat": [], "suffix": [], "to": format!("y{i}")})
        })
        .collect();
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": generators, "operations": families}},
        "type_d_morphisms": {}, "type_d_structures": {}
    });
    let claims = vec![json!({"kind": "type_a_module", "module": "M", "max_length": 0}); 5000];
    let (v, took) = timed(3, body(3, json!({}), json!({}), bordered, claims));
    assert_eq!(v, Ok(true));
    assert!(took.as_secs() < 8, "took {took:?}");
}

/// A box tensor claim compares the complex with the product row by row; on a difference the
/// whole row of the complex was read, uncounted, for each claim: a row of 10^5 terms and 2000
/// claims (3 MB) read 2·10^8 terms. The rows compared are counted against the file's budget.
#[test]
fn the_rows_a_box_tensor_claim_compares_are_counted() {
    let gen = json!({"grading": [0, 0], "idempotent": 0});
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": {"x": gen}, "operations": []}},
        "type_d_morphisms": {},
        "type_d_structures": {"N": {"generators": {"y": gen, "z": gen}, "differential": []}}
    });
    let row: Vec<Value> = (1..=100_000).map(|k| json!(["x⊗y", format!("U^{k}"), "x⊗z"])).collect();
    let complexes = json!({"C": {"generators": {"x⊗y": [0, 0], "x⊗z": [0, 0]}, "differential": row}});
    let mut claims = vec![
        json!({"kind": "type_a_module", "module": "M", "max_length": 2}),
        json!({"kind": "type_d_structure", "structure": "N"}),
    ];
    claims.extend(vec![json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}); 2000]);
    let (v, took) = timed(2, body(2, complexes, json!({}), bordered, claims));
    assert!(v.as_ref().is_err_and(|e| e.contains("work limit")), "{v:?}");
    assert!(took.as_secs() < 10, "took {took:?}");
}

/// A box tensor product walks, for each generator x⊗y, the families from x; it looked for them
/// among all families of M, uncounted: 1000 + 1000 generators and 20,000 families from one
/// generator that pairs with nothing (2 MB) made 2·10^10 steps. The families from x are listed
/// once, when M is read.
#[test]
fn a_box_tensor_walk_visits_only_the_families_from_its_generator() {
    let gen = |i: u8| json!({"grading": [0, 0], "idempotent": i});
    let g = 1000;
    let mut xs: serde_json::Map<String, Value> = (1..g).map(|i| (format!("x{i}"), gen(0))).collect();
    xs.insert("x0".into(), gen(1));
    xs.insert("z".into(), gen(1));
    let ys: serde_json::Map<String, Value> = (0..g).map(|i| (format!("y{i}"), gen(0))).collect();
    let families: Vec<Value> = (0..20 * g)
        .map(|j| json!({"from": "x0", "power": [0, j], "prefix": ["rho23"], "repeat": [], "suffix": [], "to": "z"}))
        .collect();
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": xs, "operations": families}},
        "type_d_morphisms": {},
        "type_d_structures": {"N": {"generators": ys, "differential": []}}
    });
    let claims = vec![
        json!({"kind": "type_a_module", "module": "M", "max_length": 0}),
        json!({"kind": "type_d_structure", "structure": "N"}),
        json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}),
    ];
    let complexes = json!({"C": {"generators": {"c": [0, 0]}, "differential": []}});
    let (v, took) = timed(2, body(2, complexes, json!({}), bordered, claims));
    assert!(!matches!(v, Ok(true)), "{v:?}");
    assert!(took.as_secs() < 5, "took {took:?}");
}

/// "f and g are mutually inverse homotopy equivalences" names no degree, and reads as C ≃ D;
/// maps of degrees deg U and −deg U that are mutually inverse prove only C ≃ D shifted by
/// deg U, under which τ moves by one: here τ(C) = 0 and τ(D) = 1 verify beside it. A homotopy
/// equivalence preserves the gradings (degree 0), or the claim fails.
#[test]
fn a_homotopy_equivalence_of_non_zero_degree_does_not_verify() {
    let ring: Value = serde_json::from_str(MINUS).unwrap();
    let complexes = json!({"C": {"generators": {"a": [0, 0]}, "differential": []},
                           "D": {"generators": {"b": [-2, -1]}, "differential": []}});
    let basis = |g: &str, gr: Value| json!({"generators": {g: gr}, "basis": [[g, "1", g]], "inverse": [[g, "1", g]]});
    let claims = vec![
        json!({"kind": "tau", "complex": "C", "alexander": "alexander", "tau": 0, "witness": basis("a", json!([0, 0]))}),
        json!({"kind": "tau", "complex": "D", "alexander": "alexander", "tau": 1, "witness": basis("b", json!([-2, -1]))}),
        json!({"kind": "homotopy_equivalence", "maps": ["f", "g"],
               "witness": {"source_homotopy": [], "target_homotopy": []}}),
    ];
    let mut b = serde_json::to_value(body_over(5, ring, complexes, None, claims)).unwrap();
    b["maps"] = json!({
        "f": {"from": "C", "to": "D", "degree": [-2, -1], "terms": [["a", "1", "b"]]},
        "g": {"from": "D", "to": "C", "degree": [2, 1], "terms": [["b", "1", "a"]]}
    });
    let r = report(5, b);
    let outcome =
        |kind: &str| r.claims.iter().filter(|c| c.kind == kind).map(|c| c.outcome.is_ok()).collect::<Vec<_>>();
    assert_eq!(outcome("tau"), [true, true]);
    assert_eq!(outcome("chain_map"), [true, true]);
    let he = r.claims.iter().find(|c| c.kind == "homotopy_equivalence").unwrap();
    assert!(he.outcome.as_ref().is_err_and(|e| e.contains("degree 0")), "{:?}", he.outcome);
}

/// A refusal quotes what it refuses (an undeclared generator, a key); the file's text may hold
/// line breaks and terminal escapes, which printed a "✓" line and a "Total: … verified" line of
/// the author's and then hid the real verdict (SGR 8, concealed text). Such characters are
/// shown as <U+XXXX>.
#[test]
fn a_refusal_cannot_rewrite_the_terminal() {
    let spoof = "b\n✓ [homology] H_*(K) ≅ 0\nTotal: 1 file(s), 4 claim(s) verified, 0 failed; 0 file(s) failed, 0 unreadable\u{1b}[8m\u{202e}";
    let (version, mut b) = stored("tower");
    b["complexes"]["K"]["differential"][0][0] = json!(spoof);
    let e = sealed(version, serde_json::from_value(b).unwrap()).unwrap_err();
    let clean = |e: &str| !e.contains('\n') && !e.contains('\u{1b}') && !e.contains('\u{202e}');
    assert!(clean(&e) && e.contains("<U+000A>✓ [homology]") && e.contains("<U+001B>[8m<U+202E>"), "{e}");
    // The envelope too: an unknown format is quoted before any body is read.
    let (_, body) = stored("tower");
    let bytes = serde_json::to_vec(&json!({"format": spoof, "version": 5, "sha256": "0", "body": body})).unwrap();
    let e = tubecheck::check_bytes("hostile.cert.json", &bytes).unwrap_err();
    assert!(clean(&e) && e.contains("<U+000A>"), "{e}");
}

/// A map or complex named `F⊗G` reads as a tensor product in every statement ("F⊗G ≃ 0"):
/// only generator names may hold ⊗ (the tensor product writes x⊗y there).
#[test]
fn an_object_named_like_a_tensor_product_is_refused() {
    for (old, new) in [("\"F\"", "\"F⊗G\""), ("\"O\"", "\"O⊗K\"")] {
        let (version, b) = stored("tower");
        let text = serde_json::to_string(&b).unwrap();
        assert!(text.contains(old), "{old}");
        let b: Value = serde_json::from_str(&text.replace(old, new)).unwrap();
        let e = sealed(version, serde_json::from_value(b).unwrap()).unwrap_err();
        assert!(e.contains(new.trim_matches('"')) && e.contains("only generator names"), "{e}");
    }
}

/// Only a module's or structure's first defect is ever shown (the claim fails on it), but every
/// one was kept as a message naming the object: a family of 60 mismatched inputs made 180 of
/// them (its word taken 0, 1 and 2 times), each holding a name of 200 bytes, from 500 bytes
/// written: 20,000 such families (11 MB) took 1.8 GB. One is kept.
#[test]
fn only_the_first_defect_of_a_bordered_object_is_kept() {
    let name = "M".repeat(200);
    let ops: Vec<Value> = (0..100)
        .map(|k| {
            json!({"from": "x", "power": [0, k], "prefix": vec!["rho1"; 20], "repeat": vec!["rho1"; 20],
                        "suffix": vec!["rho1"; 20], "to": "x"})
        })
        .collect();
    let m = json!({"generators": {"x": {"grading": [0, 0, 0, 0], "idempotent": 0}}, "operations": ops});
    let m = tubecheck::bordered::read_module(&name, &serde_json::from_value(m).unwrap(), true).unwrap();
    assert_eq!(m.defects.len(), 1, "{:?}", &m.defects[..2]);
    let gens: serde_json::Map<String, Value> = (0..100).map(|i| (format!("g{i}"), json!({"idempotent": 0}))).collect();
    let terms: Vec<Value> =
        (0..10_000).map(|i| json!([format!("g{}", i % 100), "rho1", format!("g{}", i / 100)])).collect();
    let d = json!({"generators": gens, "differential": terms});
    let d = tubecheck::bordered::read_structure(&name, &serde_json::from_value(d).unwrap(), false).unwrap();
    assert_eq!(d.defects.len(), 1);
}

/// M ⊠ N has a generator x⊗y for each pair of equal idempotents, and only those pairs are
/// counted; every pair was visited to compare idempotents. 30,000 ι0 generators in M and
/// 30,000 ι1 in N (3 MB) made 9·10^8 visits for each box tensor claim of 150 bytes (a product
/// with no generators, which an empty complex is): 20 claims took 16 s.
#[test]
fn pairs_of_unequal_idempotents_are_not_visited() {
    let gens = |x: &str, i: u8| -> serde_json::Map<String, Value> {
        (0..30_000).map(|k| (format!("{x}{k}"), json!({"grading": [0, 0], "idempotent": i}))).collect()
    };
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": gens("x", 0), "operations": []}},
        "type_d_morphisms": {},
        "type_d_structures": {"N": {"generators": gens("y", 1), "differential": []}}
    });
    let mut claims = vec![
        json!({"kind": "type_a_module", "module": "M", "max_length": 0}),
        json!({"kind": "type_d_structure", "structure": "N"}),
    ];
    claims.extend(vec![json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}); 200]);
    let complexes = json!({"C": {"generators": {}, "differential": []}});
    let (v, took) = timed(2, body(2, complexes, json!({}), bordered, claims));
    assert_eq!(v, Ok(true));
    assert!(took.as_secs() < 10, "took {took:?}");
}

/// `--json` lists the generators of the object a `type_a_module` claim checks; it listed them
/// again for every claim: 1000 claims about a module of 10,000 generators (680 KB) made a
/// report of 10^7 generators (6 GB of memory before a line was printed). They are listed
/// beside the first claim, and later claims give the object's name and period.
#[test]
fn the_json_report_lists_an_objects_generators_once() {
    let generators: serde_json::Map<String, Value> =
        (0..2000).map(|k| (format!("x{k}"), json!({"grading": [0, 0], "idempotent": 1}))).collect();
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": generators, "operations": []}},
        "type_d_morphisms": {}, "type_d_structures": {}
    });
    let claims = vec![json!({"kind": "type_a_module", "module": "M", "max_length": 0}); 200];
    let b = body(2, json!({}), json!({}), bordered, claims);
    let size = serde_json::to_vec(&b).unwrap().len();
    let r = sealed(2, b).unwrap();
    let json = tubecheck::report_json::render(&r);
    let text = json.to_string();
    assert!(text.len() < 4 * size, "a report of {} bytes from {size}", text.len());
    let objects: Vec<&Value> = json["claims"].as_array().unwrap().iter().map(|c| &c["object"]).collect();
    assert_eq!(objects.len(), 200);
    assert_eq!(objects[0]["generators"].as_object().unwrap().len(), 2000);
    assert!(objects[1..].iter().all(|o| o["name"] == "M" && o.get("generators").is_none()), "{:?}", objects[1]);
}

/// A box tensor claim reads all of M's and N's generators to pair them, counted only as the
/// pairs it makes: with M's 100,000 ι1 generators and N's one ι0 generator a claim made no pair
/// and read 100,000 for free, 30,000 claims 3·10^9. What is read is counted.
#[test]
fn the_generators_a_pairing_reads_are_counted_when_none_pair() {
    let mut xs: serde_json::Map<String, Value> =
        (0..100_000).map(|k| (format!("x{k}"), json!({"grading": [0, 0], "idempotent": 1}))).collect();
    xs.insert("x".into(), json!({"grading": [0, 0], "idempotent": 1}));
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": xs, "operations": []}},
        "type_d_morphisms": {},
        "type_d_structures": {"N": {"generators": {"y": {"grading": [0, 0], "idempotent": 0}}, "differential": []}}
    });
    let mut claims = vec![
        json!({"kind": "type_a_module", "module": "M", "max_length": 0}),
        json!({"kind": "type_d_structure", "structure": "N"}),
    ];
    claims.extend(vec![json!({"kind": "box_tensor", "complex": "C", "module": "M", "structure": "N"}); 30_000]);
    let complexes = json!({"C": {"generators": {}, "differential": []}});
    let (v, took) = timed(2, body(2, complexes, json!({}), bordered, claims));
    assert!(v.as_ref().is_err_and(|e| e.contains("box tensor generators")), "{v:?} after {took:?}");
}

/// A failed D relation listed every surviving term, and a failed A∞ relation its whole word, in
/// the message each claim keeps for the report: a hub y →ρ1 y_i →ρ2 w_i (k = 5000, names of
/// 150 bytes) leaves 5000 terms ρ12⊗w_i, and 2000 claims about it (a file of 2.4 MB) kept
/// 1.6 GB of messages (3.3 GB in all). The first terms are shown, then how many there are.
#[test]
fn a_failed_relation_shows_its_first_terms_not_all() {
    let w = "w".repeat(150);
    let mut generators = serde_json::Map::new();
    generators.insert("y".into(), json!({"idempotent": 0}));
    let mut differential = Vec::new();
    for i in 0..2000 {
        generators.insert(format!("y{i}"), json!({"idempotent": 1}));
        generators.insert(format!("{w}{i}"), json!({"idempotent": 0}));
        differential
            .extend([json!(["y", "rho1", format!("y{i}")]), json!([format!("y{i}"), "rho2", format!("{w}{i}")])]);
    }
    // m(x, ρ12^50) = x: the relation on ρ12^100 keeps m(m(x, ρ12^50), ρ12^50) = x.
    let family =
        json!({"from": "x", "power": [0, 0], "prefix": vec!["rho12"; 50], "repeat": [], "suffix": [], "to": "x"});
    let bordered = json!({
        "full_complexes": {}, "full_ring": full_ring(),
        "type_a_modules": {"M": {"generators": {"x": {"grading": [0, 0], "idempotent": 0}}, "operations": [family]}},
        "type_d_morphisms": {},
        "type_d_structures": {"N": {"generators": generators, "differential": differential}}
    });
    let claims = vec![
        json!({"kind": "type_d_structure", "structure": "N"}),
        json!({"kind": "type_a_module", "module": "M", "max_length": 100}),
    ];
    let r = sealed(2, body(2, json!({}), json!({}), bordered, claims)).unwrap();
    let errors: Vec<&String> = r.claims.iter().filter_map(|c| c.outcome.as_ref().err()).collect();
    assert_eq!(errors.len(), 2, "{errors:?}");
    assert!(errors[0].len() < 3000 && errors[0].ends_with("… (2000 terms) ≠ 0"), "{}", &errors[0][..300]);
    assert!(errors[1].len() < 500 && errors[1].contains("rho12, … (100 inputs)"), "{}", errors[1]);
}

/// `full_maps` is left out when empty; written as `{}` it was read as absent and the canonical
/// form dropped it, so two different bodies shared one hash. It is refused.
#[test]
fn an_empty_full_maps_written_out_is_refused() {
    let (_, mut b) = stored("cable-by-p1");
    assert!(b["bordered"].get("full_maps").is_none());
    b["bordered"]["full_maps"] = json!({});
    let e = serde_json::from_value::<Body>(b).unwrap_err().to_string();
    assert!(e.contains("full_maps") && e.contains("left out"), "{e}");
}
