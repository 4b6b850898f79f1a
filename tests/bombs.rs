//! Work bombs: small files that ask the checker or the producer for far more work than their
//! size (issue 10, class 4). Each takes a scale `n`; the work it asks for grows like n² (or
//! faster) while the file grows like n. Used by `work_bombs.rs` (each must be refused or
//! accepted within a bound) and by the fuzzer. Not part of the oracle: these build files with
//! the format crate's statement renderer and hash, so that only the work decides the outcome.

use serde_json::{json, Value};

/// The minus ring `F2[U]` with (Maslov, Alexander).
pub fn ring_u() -> Value {
    json!({"variables": ["U"], "gradings": ["maslov", "alexander"], "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]})
}

/// `F2[U,V]` with U and V of the same degree: many monomials share a degree.
pub fn ring_uv_same_degree() -> Value {
    json!({"variables": ["U", "V"], "gradings": ["g"], "variable_degrees": {"U": [-1], "V": [-1]}, "differential_degree": [-1]})
}

/// A certificate file with the given objects and claims (statements rendered, hash correct),
/// so that only the work it asks for can make the checker refuse it.
pub fn certificate(ring: Value, complexes: Value, maps: Value, claims: Vec<Value>) -> Vec<u8> {
    let version = tubecert_format::CERTIFICATE_VERSION;
    let info = tubecert_format::RingInfo::new(&serde_json::from_value(ring.clone()).unwrap()).unwrap();
    let claims: Vec<Value> = claims
        .into_iter()
        .map(|mut c| {
            c["statement"] = json!("");
            let parsed: tubecert_format::Claim = serde_json::from_value(c.clone()).unwrap();
            c["statement"] = json!(tubecert_format::statement::render(&parsed, &info, version));
            c
        })
        .collect();
    let body = json!({"ring": ring, "complexes": complexes, "maps": maps, "claims": claims,
                      "provenance": {"producer": "bomb", "problem_sha256": "0".repeat(64)}});
    let typed: tubecert_format::Body = serde_json::from_value(body.clone()).unwrap();
    let sha = tubecert_format::canonical::body_sha256(&typed).unwrap();
    serde_json::to_vec(&json!({"format": "tubecert-certificate", "version": version, "sha256": sha, "body": body}))
        .unwrap()
}

/// A problem file with the given objects and goals.
pub fn problem(ring: Value, complexes: Value, maps: Value, goals: Value) -> Vec<u8> {
    serde_json::to_vec(&json!({"format": "tubecert-problem", "version": 1, "ring": ring,
                               "complexes": complexes, "maps": maps, "goals": goals}))
    .unwrap()
}

fn gens(names: impl Iterator<Item = (String, [i64; 2])>) -> Value {
    Value::Object(names.map(|(n, g)| (n, json!(g))).collect())
}

/// n generators z_i → h + k → n generators y_j, all in one complex: ∂∂ = 0, but computing it
/// touches 2n² terms.
fn hub_complex(n: usize) -> Value {
    let mut g: Vec<(String, [i64; 2])> = vec![("h".into(), [0, 0]), ("k".into(), [0, 0])];
    g.extend((0..n).map(|i| (format!("z{i}"), [1, 0])));
    g.extend((0..n).map(|j| (format!("y{j}"), [-1, 0])));
    let mut d: Vec<Value> = Vec::new();
    for i in 0..n {
        d.push(json!([format!("z{i}"), "1", "h"]));
        d.push(json!([format!("z{i}"), "1", "k"]));
    }
    for hub in ["h", "k"] {
        d.extend((0..n).map(|j| json!([hub, "1", format!("y{j}")])));
    }
    json!({"generators": gens(g.into_iter()), "differential": d})
}

/// (a) δy of a dual witness: n triples (x, U^j, w) at a target w that n arrows enter.
pub fn dual_witness(n: usize) -> Vec<u8> {
    let mut g: Vec<(String, [i64; 2])> = vec![("w".into(), [0, 0])];
    g.extend((0..n).map(|i| (format!("z{i}"), [1, 0])));
    let d: Vec<Value> = (0..n).map(|i| json!([format!("z{i}"), "1", "w"])).collect();
    let complexes = json!({"P": {"generators": {"x": [0, 0]}, "differential": []},
                           "D": {"generators": gens(g.into_iter()), "differential": d}});
    let maps = json!({"F": {"from": "P", "to": "D", "degree": [0, 0], "terms": [["x", "1", "w"]]}});
    let dual: Vec<Value> =
        (0..n).map(|j| json!(["x", if j == 0 { "1".to_string() } else { format!("U^{j}") }, "w"])).collect();
    let claim = json!({"kind": "not_null_homotopic", "map": "F", "witness": {"dual": dual}});
    certificate(ring_u(), complexes, maps, vec![claim])
}

/// (b) ∂∂ over a ring where n + 1 monomials share a degree: x_i → p·y + p·y′, y, y′ → p·z with
/// p the sum of all U^a V^(n−a); ∂∂ = 0, but each ∂∂(x_i) is 2(n+1)² products.
pub fn shared_degree(n: usize) -> Vec<u8> {
    let p: Vec<String> = (0..=n).map(|a| format!("U^{a}*V^{}", n - a)).collect();
    let p = p.join(" + ");
    let k = n as i64;
    let mut g = serde_json::Map::new();
    g.insert("y".into(), json!([k - 1]));
    g.insert("y'".into(), json!([k - 1]));
    g.insert("z".into(), json!([2 * k - 2]));
    let mut d = vec![json!(["y", p, "z"]), json!(["y'", p, "z"])];
    for i in 0..2 {
        g.insert(format!("x{i}"), json!([0]));
        d.push(json!([format!("x{i}"), p, "y"]));
        d.push(json!([format!("x{i}"), p, "y'"]));
    }
    let complexes = json!({"K": {"generators": g, "differential": d}});
    certificate(ring_uv_same_degree(), complexes, json!({}), vec![])
}

/// (c) many generators pointing at one hub: ∂∂ is n² work.
pub fn hub(n: usize) -> Vec<u8> {
    certificate(ring_u(), json!({"K": hub_complex(n)}), json!({}), vec![])
}

/// (d) "did you mean" on long unknown names: k maps, each with 25 terms to unknown names of
/// 200 bytes, into a complex of n generators with 200-byte names.
pub fn suggestions(n: usize, k: usize) -> Vec<u8> {
    let long = |s: String| format!("{s:g>200}");
    let g = gens((0..n).map(|i| (long(format!("a{i}")), [0, 0])));
    let complexes = json!({"K": {"generators": g, "differential": []}});
    let mut maps = serde_json::Map::new();
    for m in 0..k {
        let terms: Vec<Value> = (0..25).map(|t| json!([long("a0".into()), "1", long(format!("b{m}x{t}"))])).collect();
        maps.insert(format!("F{m}"), json!({"from": "K", "to": "K", "degree": [0, 0], "terms": terms}));
    }
    certificate(ring_u(), complexes, Value::Object(maps), vec![])
}

/// A composition F∘G whose result is dense: G sends n generators to a hub, F sends the hub to
/// n generators; F∘G has n² terms.
pub fn dense_composition(n: usize) -> Vec<u8> {
    let mut g: Vec<(String, [i64; 2])> = vec![("h".into(), [0, 0])];
    g.extend((0..n).map(|i| (format!("s{i}"), [0, 0])));
    let complexes = json!({"K": {"generators": gens(g.into_iter()), "differential": []}});
    let into: Vec<Value> = (0..n).map(|i| json!([format!("s{i}"), "1", "h"])).collect();
    let out: Vec<Value> = (0..n).map(|i| json!(["h", "1", format!("s{i}")])).collect();
    let maps = json!({"G": {"from": "K", "to": "K", "degree": [0, 0], "terms": into},
                      "F": {"from": "K", "to": "K", "degree": [0, 0], "terms": out}});
    let claim = json!({"kind": "null_homotopic", "map": {"compose": ["F", "G"]}, "witness": {"homotopy": []}});
    certificate(ring_u(), complexes, maps, vec![claim])
}

/// k claims about a complex of n generators, each tiny in the file but each costing n.
pub fn many_claims(n: usize, k: usize) -> Vec<u8> {
    let g = gens((0..n).map(|i| (format!("a{i}"), [0, 0])));
    let complexes = json!({"K": {"generators": g, "differential": []}});
    let claim = json!({"kind": "null_homotopic", "map": {"times": ["U", {"id": "K"}]}, "witness": {"homotopy": []}});
    certificate(ring_u(), complexes, json!({}), vec![claim; k])
}

/// A sum of 900 copies of a map of n terms, in each of k claims.
pub fn wide_sum(n: usize, k: usize) -> Vec<u8> {
    let g = gens((0..n).map(|i| (format!("a{i}"), [0, 0])));
    let complexes = json!({"K": {"generators": g, "differential": []}});
    let terms: Vec<Value> = (0..n).map(|i| json!([format!("a{i}"), "1", format!("a{i}")])).collect();
    let maps = json!({"F": {"from": "K", "to": "K", "degree": [0, 0], "terms": terms}});
    let claim = json!({"kind": "null_homotopic", "map": {"sum": vec![json!("F"); 900]}, "witness": {"homotopy": []}});
    certificate(ring_u(), complexes, maps, vec![claim; k])
}

/// Producer: tensor powers of a staircase, each squaring the size: a few lines, 3^(2^k)
/// generators.
pub fn tensor_tower(k: usize) -> Vec<u8> {
    let mut text = String::from("ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\n");
    text += "complex T0 = staircase torus_knot 2 3\n";
    for i in 1..=k {
        text += &format!("complex T{i} = tensor T{} T{}\n", i - 1, i - 1);
    }
    text += &format!("goal homology T{k}\n");
    text.into_bytes()
}

/// Producer: f ⊗ f for a map of n terms (n² terms).
pub fn tensor_maps(n: usize) -> Vec<u8> {
    let g = gens((0..n).map(|i| (format!("a{i}"), [0, 0])));
    let complexes = json!({"K": {"generators": g, "differential": []}, "KK": {"tensor": ["K", "K"]}});
    let terms: Vec<Value> = (0..n).map(|i| json!([format!("a{i}"), "1", format!("a{}", (i + 1) % n)])).collect();
    let maps =
        json!({"F": {"from": "K", "to": "K", "degree": [0, 0], "terms": terms}, "FF": {"tensor_maps": ["F", "F"]}});
    problem(ring_u(), complexes, maps, json!([]))
}

/// Producer: a chain of n shifts, declared in the order that resolves one per pass, of a
/// complex of m generators (n·m copying, n² passes).
pub fn shift_chain(n: usize, m: usize) -> Vec<u8> {
    let mut text = String::from("ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\n");
    for i in (1..=n).rev() {
        text += &format!("complex S{i:07} = shift S{:07} (0, 0)\n", i - 1);
    }
    text += "complex S0000000\n";
    for j in 0..m {
        text += &format!("  a{j} (0, 0)\n");
    }
    text.into_bytes()
}

/// Producer: n goals each naming undeclared maps, among n declared maps with long names.
pub fn unknown_goal_names(n: usize) -> Vec<u8> {
    let complexes = json!({"K": {"generators": {"a": [0, 0]}, "differential": []}});
    let mut maps = serde_json::Map::new();
    for i in 0..n {
        maps.insert(format!("{i:g>150}"), json!({"from": "K", "to": "K", "degree": [0, 0], "terms": []}));
    }
    let goals: Vec<Value> =
        (0..n).map(|i| json!({"homotopic": {"maps": [format!("{i:h>150}"), format!("{i:k>150}")]}})).collect();
    problem(ring_u(), complexes, Value::Object(maps), json!(goals))
}

/// Producer: the hub complex of [`hub`] in a problem file (the validation's ∂∂).
pub fn hub_problem(n: usize) -> Vec<u8> {
    problem(ring_u(), json!({"K": hub_complex(n)}), json!({}), json!([]))
}

/// Every checker bomb at scale `n` (for the fuzzer).
pub fn certificate_bomb(kind: usize, n: usize) -> Vec<u8> {
    match kind % 7 {
        0 => dual_witness(n),
        1 => shared_degree(n / 4),
        2 => hub(n),
        3 => suggestions(n / 8, 4),
        4 => dense_composition(n),
        5 => many_claims(n, n / 50),
        _ => wide_sum(n, 10),
    }
}
