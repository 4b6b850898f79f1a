//! The bordered claims decided twice — by the checker and by the independent oracle of
//! `tests/bordered_oracle.rs` (which reads the certificate as plain JSON) — on certificates the
//! producer writes and on mutations of them: the two must agree on every verdict. Plus the
//! cross-check of the pairing with the core pattern against the V = 0 quotient, by homology
//! computed by the oracle, never through a box tensor product.
//!
//! Sources: LOT = Lipshitz–Ozsváth–Thurston, "Bordered Heegaard Floer homology", Mem. AMS 254
//! (2018); OS 2003 = Ozsváth–Szabó, "Knot Floer homology and the four-ball genus", Geom. Topol. 7
//! (τ); OS 2004 = Ozsváth–Szabó, "Holomorphic disks and knot invariants", Adv. Math. 186 (the
//! symmetry of CFK), and for HF-hat(S³) = F2 "Holomorphic disks and topological invariants for
//! closed three-manifolds", Ann. of Math. 159 (2004); OS 2005 = Ozsváth–Szabó, "On knot Floer
//! homology and lens space surgeries", Topology 44 (staircases).

use serde_json::{json, Value};
use std::collections::BTreeMap;
use tubecert_tests::bordered_oracle::{self as bo, cert, mutation};
use tubecert_tests::{minus_ring, oracle, prove_value, Rng};

fn certificate(problem: &Value) -> Value {
    let proved = prove_value(problem);
    serde_json::from_slice(&tubecert::canonical_writer::file_bytes(&proved.certificate).unwrap()).unwrap()
}

/// The checker's verdict on a certificate given as JSON.
fn checker_accepts(c: &Value) -> bool {
    tubecheck::check_bytes("mutant", &serde_json::to_vec(c).unwrap()).is_ok_and(|r| r.ok())
}

/// The oracle's verdict: the bordered arms over JSON, and the oracle of `tests/lib.rs` for the
/// ordinary objects (complexes, maps) and the statements.
fn oracle_accepts(body: &Value) -> Result<(), String> {
    cert::check_body(body)?;
    let typed: tubecert_format::Body = serde_json::from_value(body.clone()).map_err(|e| e.to_string())?;
    if !oracle::holds(&typed) {
        return Err("the oracle of tests/lib.rs refuses".into());
    }
    Ok(())
}

/// A mutated body sealed again: statements re-rendered (they are derived), hash recomputed.
/// None when the body no longer has the typed shape (then the checker refuses it at loading).
fn reseal(cert: &Value, body: Value) -> Option<Value> {
    let mut typed: tubecert_format::Body = serde_json::from_value(body).ok()?;
    let ring = tubecert_format::RingInfo::new(&typed.ring).ok()?;
    for c in typed.claims.iter_mut() {
        let text = tubecert_format::statement::render(c, &ring, tubecert_format::CERTIFICATE_VERSION);
        *tubecert::prove::statement_mut(c) = text;
    }
    let sha = tubecert_format::canonical::canonical_sha256(&typed).ok()?;
    let mut out = cert.clone();
    out["body"] = serde_json::to_value(&typed).unwrap();
    out["sha256"] = json!(sha);
    Some(out)
}

const TORUS: [(&str, i64); 3] = [("T23", 1), ("T34", 3), ("T25", 2)];

fn source(name: &str) -> Value {
    match name {
        "T23" => json!({"staircase": {"torus_knot": [2, 3]}}),
        "T34" => json!({"staircase": {"torus_knot": [3, 4]}}),
        "T25" => json!({"staircase": {"torus_knot": [2, 5]}}),
        "O" => json!({"staircase": {"alexander": [0]}}),
        _ => unreachable!(),
    }
}

/// An explicit complex over `F2[U,V]` with an isolated generator `x` at (0, 0) (so ξ_0 = η_0) and
/// a square a → U·b + V·c, b → V·d, c → U·d with a at (m, m): the shape of the figure-eight's
/// complex for m = 0 (recalled from memory), simultaneously simplified as written.
fn box_and_point(m: i64, stair: Option<&[i64]>) -> Value {
    let mut gens = json!({"a": [m, m], "b": [m + 1, m - 1], "c": [m - 1, m + 1], "d": [m, m]});
    let mut d = vec![json!(["a", "U", "b"]), json!(["a", "V", "c"]), json!(["b", "V", "d"]), json!(["c", "U", "d"])];
    match stair {
        None => gens["x"] = json!([0, 0]),
        // A staircase in place of the point (conventions sheet), names s0, s1, ….
        Some(a) => {
            let mut gu = 0;
            for i in 0..a.len() {
                if i > 0 {
                    gu += if i % 2 == 1 { 1 - 2 * (a[i - 1] - a[i]) } else { -1 };
                }
                gens[format!("s{i}")] = json!([gu, gu - 2 * a[i]]);
            }
            for i in (1..a.len()).step_by(2) {
                d.push(json!([format!("s{i}"), format!("U^{}", a[i - 1] - a[i]), format!("s{}", i - 1)]));
                d.push(json!([format!("s{i}"), format!("V^{}", a[i] - a[i + 1]), format!("s{}", i + 1)]));
            }
        }
    }
    json!({"generators": gens, "differential": d})
}

/// Companions with their τ (OS 2003: τ(T(p,q)) = (p−1)(q−1)/2, odd under mirror): staircases,
/// duals (mirrors), the unknot, a square beside a point (the figure-eight's shape, τ = 0,
/// ξ_0 = η_0), and the T(2,5) staircase beside a square at (−2, −2) — the complex of
/// T(2,3) # T(2,3) up to homotopy (recalled from memory), τ = 2 — together with its dual.
fn companions() -> Vec<(String, Value, i64)> {
    let mut out = vec![("unknot".to_string(), source("O"), 0)];
    for (k, tau) in TORUS {
        out.push((k.to_string(), source(k), tau));
        out.push((format!("dual {k}"), json!({"dual": source(k)}), -tau));
    }
    out.push(("square and point".into(), box_and_point(0, None), 0));
    out.push(("staircase 8 0 −8".into(), json!({"staircase": {"alexander": [8, 0, -8]}}), 8));
    let sum = box_and_point(-2, Some(&[2, 1, 0, -1, -2]));
    out.push(("T(2,5) staircase and square".into(), sum.clone(), 2));
    out.push(("dual of T(2,5) staircase and square".into(), json!({"dual": sum}), -2));
    out
}

/// One problem: the complement of SOURCE at framing t, the core, their box tensor product, the
/// same through `cable`, and the V = 0 quotient of SOURCE.
fn pairing_problem(src: &Value, t: i64) -> Value {
    json!({"format": "tubecert-problem", "version": 1, "ring": minus_ring(),
        "type_d_structures": {"N": {"complement": {"companion": src, "framing": t}}},
        "type_a_modules": {"M": {"cable_pattern": {"p": 1}}},
        "complexes": {
            "X": {"box_tensor": ["M", "N"]},
            "K": {"cable": {"companion": src, "p": 1, "q": t + 1}},
            "Q": {"quotient": [src, "V"]}
        },
        "goals": []})
}

fn framings(tau: i64) -> Vec<i64> {
    vec![2 * tau - 3, 2 * tau - 1, 2 * tau, 2 * tau + 1, 2 * tau + 4]
}

/// H_*(X/(U − 1)) of a complex of the body by degree of M − 2A (the oracle's ranks): for the
/// complex of a knot in S³, HF-hat(S³) = F2 in degree 0 (Ozsváth–Szabó 2004), i.e. [(0, 1)].
fn hat_homology_of(body: &Value, name: &str) -> Vec<(i64, usize)> {
    let (gr, d) = minus_of(body, name);
    cert::hat_homology(&gr, &d).unwrap()
}

/// The homology over `F2[U]` with (Maslov, Alexander) gradings of a complex of the body, by the
/// oracle's own cancellation.
fn homology_of(body: &Value, name: &str) -> bo::Homology {
    let (gr, d) = minus_of(body, name);
    bo::homology(&gr, &d).unwrap()
}

/// A complex of the body over `F2[U]`: gradings and ∂.
fn minus_of(body: &Value, name: &str) -> (BTreeMap<String, (i64, i64)>, bo::UComplex) {
    let c = &body["complexes"][name];
    let gr: BTreeMap<String, (i64, i64)> = c["generators"]
        .as_object()
        .unwrap()
        .iter()
        .map(|(g, v)| (g.clone(), (v[0].as_i64().unwrap(), v[1].as_i64().unwrap())))
        .collect();
    let mut d: bo::UComplex = gr.keys().map(|g| (g.clone(), Default::default())).collect();
    for t in c["differential"].as_array().unwrap() {
        for (i, _) in cert::coefficient(t[1].as_str().unwrap(), &["U"]).unwrap() {
            bo::toggle(d.get_mut(t[0].as_str().unwrap()).unwrap(), (i, t[2].as_str().unwrap().to_string()));
        }
    }
    (gr, d)
}

/// The homology of C/(V) for the full complex C of the body, computed by the oracle; with
/// `flip`, of C/(U) over F2[V] with gradings (gr_V, −A), which for the symmetric complex of a
/// knot (staircases, their duals and tensor products) is the same graded module
/// (Ozsváth–Szabó's symmetry of CFK, OS 2004; recalled from memory).
fn quotient_homology(body: &Value, full: &str, flip: bool) -> bo::Homology {
    let c = &body["bordered"]["full_complexes"][full];
    let gr: BTreeMap<String, (i64, i64)> = c["generators"]
        .as_object()
        .unwrap()
        .iter()
        .map(|(g, v)| {
            let (mut u, mut w) = (v[0].as_i64().unwrap(), v[1].as_i64().unwrap());
            if flip {
                (u, w) = (w, u);
            }
            (g.clone(), (u, (u - w) / 2))
        })
        .collect();
    let mut d: bo::UComplex = gr.keys().map(|g| (g.clone(), Default::default())).collect();
    for t in c["differential"].as_array().unwrap() {
        for (mut i, mut j) in cert::coefficient(t[1].as_str().unwrap(), &["U", "V"]).unwrap() {
            if flip {
                (i, j) = (j, i);
            }
            if j == 0 {
                bo::toggle(d.get_mut(t[0].as_str().unwrap()).unwrap(), (i, t[2].as_str().unwrap().to_string()));
            }
        }
    }
    bo::homology(&gr, &d).unwrap()
}

#[test]
fn core_pattern_pairs_back_to_the_quotient_for_many_companions_and_framings() {
    for (what, src, tau) in companions() {
        for t in framings(tau) {
            let c = certificate(&pairing_problem(&src, t));
            assert!(checker_accepts(&c), "{what}, t = {t}: the checker refuses the producer's certificate");
            oracle_accepts(&c["body"]).unwrap_or_else(|e| panic!("{what}, t = {t}: {e}"));
            let body = &c["body"];
            let kinds: Vec<&str> =
                body["claims"].as_array().unwrap().iter().map(|x| x["kind"].as_str().unwrap()).collect();
            for k in ["complement", "type_d_structure", "type_a_module", "box_tensor"] {
                assert!(kinds.contains(&k), "{what}, t = {t}: no {k} claim");
            }
            cert::truncation_covers_pairings(body).unwrap_or_else(|e| panic!("{what}, t = {t}: {e}"));
            // τ as the complement claim states it (OS 2003, recalled from memory: torus knots, sums, mirrors).
            let comp = body["claims"].as_array().unwrap().iter().find(|x| x["kind"] == "complement").unwrap();
            assert_eq!(comp["tau"], json!(tau), "{what}");
            // Pairing theorem for knots (LOT Thm 11.21) with the core: CFK^-(K) itself; compared
            // with the quotient, through homology only (no box tensor code involved).
            let hx = homology_of(body, "X");
            assert_eq!(hx, homology_of(body, "K"), "{what}, t = {t}: cable 1 (t+1) against the box tensor product");
            assert_eq!(hx, homology_of(body, "Q"), "{what}, t = {t}: against quotient V of SOURCE");
            let full = comp["complex"].as_str().unwrap();
            assert_eq!(
                hx,
                quotient_homology(body, full, false),
                "{what}, t = {t}: against C/(V) of the certificate's C"
            );
            // The vertical arrows of the certificate's C (which make the κ chains) are checked
            // against the source by symmetry: C/(U) must look like C/(V).
            assert_eq!(hx, quotient_homology(body, full, true), "{what}, t = {t}: C/(U) of the certificate's C");
            // HFK^- = F2[U] ⊕ torsion with the tower at (−2τ, −τ) (conventions sheet).
            assert_eq!(hx.0, vec![(-2 * tau, -tau)], "{what}, t = {t}");
            assert_eq!(hat_homology_of(body, "X"), vec![(0, 1)], "{what}, t = {t}: HF-hat(S³)");
        }
    }
}

/// Mutates every certificate `per` times and compares verdicts; returns the disagreements.
fn campaign(certs: &[(String, Value)], per: usize, seed: u64) -> Vec<String> {
    let mut bad = Vec::new();
    let mut rng = Rng(seed);
    let (mut tried, mut rejected) = (0, 0);
    for (what, c) in certs {
        for _ in 0..per {
            let mut body = c["body"].clone();
            let how = mutation::mutate(&mut rng, &mut body);
            if body == c["body"] {
                continue;
            }
            tried += 1;
            let sealed = reseal(c, body.clone());
            let checker = sealed.as_ref().is_some_and(checker_accepts);
            let ours = match &sealed {
                Some(s) => oracle_accepts(&s["body"]),
                None => Err("no longer the typed shape".into()),
            };
            if !checker {
                rejected += 1;
            }
            if checker != ours.is_ok() {
                bad.push(format!("{what}: after \"{how}\" the checker says {checker}, the oracle {ours:?}"));
            }
        }
    }
    eprintln!("bordered mutations: {tried} tried, {rejected} rejected, {} disagreements", bad.len());
    bad
}

#[test]
fn checker_and_oracle_agree_on_mutated_pairings() {
    let mut certs = Vec::new();
    for (what, src, tau) in companions() {
        for t in [2 * tau - 2, 2 * tau, 2 * tau + 2] {
            certs.push((format!("{what}, t = {t}"), certificate(&pairing_problem(&src, t))));
        }
    }
    let bad = campaign(&certs, tubecert_tests::cases(40) as usize, 0x05EE_DB0D);
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

/// A structure written out in the problem (the oracle's own complement of T(3,4) at framing t,
/// staircase names as the producer's), a renamed copy, and morphisms between them: the renaming
/// (ι coefficients), and δ¹ itself into N and into the copy (a sum of the two kinds would not
/// be homogeneous).
fn morphism_problem(t: i64) -> Value {
    let mut c = bo::UVComplex::default();
    // T(3,4): a = (3, 2, 0, −2, −3) (OS 2005); staircase as on the conventions sheet.
    let a = [3i64, 2, 0, -2, -3];
    let mut gu = 0;
    for i in 0..5 {
        if i > 0 {
            gu += if i % 2 == 1 { 1 - 2 * (a[i - 1] - a[i]) } else { -1 };
        }
        c.gr.insert(format!("x{i}"), (gu, gu - 2 * a[i]));
    }
    for i in [1usize, 3] {
        let e = c.d.entry(format!("x{i}")).or_default();
        e.insert(((a[i - 1] - a[i]) as u32, 0, format!("x{}", i - 1)));
        e.insert((0, (a[i] - a[i + 1]) as u32, format!("x{}", i + 1)));
    }
    let n = bo::complement(&c, t, false).unwrap();
    let write = |n: &bo::DStructure, suffix: &str| -> Value {
        let gens: serde_json::Map<String, Value> = n
            .idem
            .iter()
            .map(|(g, i)| {
                let mut o = json!({"idempotent": i});
                if let Some(h) = n.grp.get(g) {
                    o["grading"] = json!(h.written().unwrap());
                }
                (format!("{g}{suffix}"), o)
            })
            .collect();
        let terms: Vec<Value> = n
            .delta
            .iter()
            .flat_map(|(x, e)| {
                e.iter().map(move |(al, y)| json!([format!("{x}{suffix}"), alg_name(*al), format!("{y}{suffix}")]))
            })
            .collect();
        json!({"generators": gens, "differential": terms, "period": n.period.unwrap().written().unwrap()})
    };
    let rename: Vec<Value> = n.idem.keys().map(|g| json!([g, "1", format!("{g}'")])).collect();
    let delta: Vec<Value> =
        n.delta.iter().flat_map(|(x, e)| e.iter().map(move |(al, y)| json!([x, alg_name(*al), y]))).collect();
    let delta2: Vec<Value> = n
        .delta
        .iter()
        .flat_map(|(x, e)| e.iter().map(move |(al, y)| json!([x, alg_name(*al), format!("{y}'")])))
        .collect();
    json!({"format": "tubecert-problem", "version": 1, "ring": minus_ring(),
        "type_d_structures": {"N": write(&n, ""), "N2": write(&n, "'")},
        "type_a_modules": {"M": {"cable_pattern": {"p": 1}}, "M2": two_cores()},
        "type_d_morphisms": {"f": {"from": "N", "to": "N2", "terms": rename},
                             "g": {"from": "N", "to": "N", "terms": delta},
                             "k": {"from": "N", "to": "N2", "terms": delta2}},
        "complexes": {"X": {"box_tensor": ["M", "N"]}, "X2": {"box_tensor": ["M", "N2"]},
                      "Y": {"box_tensor": ["M2", "N"]}, "Y2": {"box_tensor": ["M2", "N2"]}},
        "maps": {"F": {"box_tensor_map": ["M", "f"]}, "G": {"box_tensor_map": ["M", "g"]},
                 "H": {"box_tensor_map": ["M", "k"]}, "FY": {"box_tensor_map": ["M2", "f"]}},
        "goals": []})
}

/// Two copies of the core with m_1(x) = x′ (a module with a differential), and a third copy x″
/// on its own: the A∞ relations hold since m(x′, w) = U^ℓ·x′ = m_1(m(x, w)) for every core word
/// w. The pair x, x′ cancels in the Euler characteristic, so the product's is the companion's
/// (symmetric, with shift 0, as version 4's normalization needs; without x″ it would be 0).
fn two_cores() -> Value {
    let core = |x: &str| json!({"from": x, "power": [1, 1], "prefix": ["rho3"], "repeat": ["rho23"], "suffix": ["rho2"], "to": x});
    // gr(x′) = gr(m_1(x)) = λ⁻¹·gr(x); the core's period (DEVELOPERS.md, Gradings).
    json!({"generators": {"x": {"grading": [0, 0, 0, 0], "idempotent": 0}, "x'": {"grading": [-2, 0, 0, 0], "idempotent": 0},
                          "x''": {"grading": [0, 0, 0, 0], "idempotent": 0}},
           "period": [3, 0, 2, 2], "operations": [core("x"), core("x'"), core("x''"),
                          {"from": "x", "power": [0, 0], "prefix": [], "repeat": [], "suffix": [], "to": "x'"}]})
}

fn alg_name(a: bo::torus::Alg) -> String {
    if a.is_idempotent() {
        "1".into()
    } else {
        a.name().replace("ρ_", "rho")
    }
}

#[test]
fn morphisms_and_their_maps_agree_and_mutations_too() {
    let mut certs = Vec::new();
    for t in [3, 6, 9] {
        let c = certificate(&morphism_problem(t));
        assert!(checker_accepts(&c), "t = {t}");
        oracle_accepts(&c["body"]).unwrap_or_else(|e| panic!("t = {t}: {e}"));
        let kinds: Vec<&str> =
            c["body"]["claims"].as_array().unwrap().iter().map(|x| x["kind"].as_str().unwrap()).collect();
        assert!(kinds.contains(&"type_d_morphism") && kinds.contains(&"box_tensor_map"), "{kinds:?}");
        certs.push((format!("morphisms, t = {t}"), c));
    }
    let bad = campaign(&certs, tubecert_tests::cases(60) as usize, 0xF00D);
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

/// Tensor products of sources (connected sums; τ additive, OS 2003): in the product basis they
/// are not simplified, and the producer must either find a simultaneously simplified basis —
/// then the certificate passes both deciders and pairs back to the quotient — or refuse
/// saying which theorem needs it.
#[test]
fn tensor_product_companions_are_paired_or_refused_by_name() {
    let t23 = source("T23");
    for (what, src, tau) in [
        ("T23 # T23", json!({"tensor": [t23, t23]}), 2),
        ("T23 # mirror T23", json!({"tensor": [t23, {"dual": t23}]}), 0),
        ("T34 # mirror T23", json!({"tensor": [source("T34"), {"dual": t23}]}), 2),
    ] {
        for t in [2 * tau - 1, 2 * tau, 2 * tau + 2] {
            let problem = pairing_problem(&src, t);
            let bytes = serde_json::to_vec(&problem).unwrap();
            let checked = tubecert::problem::parse_problem(&bytes, "test")
                .map_err(|e| format!("{e:?}"))
                .and_then(|p| tubecert::validate::validate(&p).map(|_| ()).map_err(|e| format!("{e:?}")));
            match checked {
                Err(e) => {
                    let msg = format!("{e:?}");
                    assert!(msg.contains("simultaneously") && msg.contains("11.26"), "{what}: {msg}");
                }
                Ok(_) => {
                    let c = certificate(&problem);
                    assert!(checker_accepts(&c), "{what}, t = {t}");
                    oracle_accepts(&c["body"]).unwrap_or_else(|e| panic!("{what}, t = {t}: {e}"));
                    assert_eq!(homology_of(&c["body"], "X"), homology_of(&c["body"], "Q"), "{what}, t = {t}");
                }
            }
        }
    }
}

/// The τ and Alexander-grading rules of `complement` probed on a grid: the unknot's generator
/// moved to (g_U, g_V), the structure's and the box tensor product's gradings and the claimed τ
/// set to every nearby value; the two deciders must agree on each (LOT Thm 11.26 speaks of
/// knots, where A(ξ_0) = τ = −A(η_0) is an integer).
#[test]
fn complement_grading_rules_agree_on_a_grid() {
    let c = certificate(&pairing_problem(&source("O"), 0));
    let body = &c["body"];
    let comp = body["claims"].as_array().unwrap().iter().find(|x| x["kind"] == "complement").unwrap().clone();
    let (full, n) = (comp["complex"].as_str().unwrap().to_string(), comp["structure"].as_str().unwrap().to_string());
    let x0 = mutation::keys(&body["bordered"]["full_complexes"][&full]["generators"])[0].clone();
    let (mut tried, mut accepted, mut bad) = (0, 0, Vec::new());
    for gu in -2i64..=2 {
        for gv in -2i64..=2 {
            for a in -1i64..=1 {
                for tau in -1i64..=1 {
                    let mut b = body.clone();
                    b["bordered"]["full_complexes"][&full]["generators"][&x0] = json!([gu, gv]);
                    // (M − 3A/2; 0, −A; 0) written doubled (DEVELOPERS.md, Gradings).
                    b["bordered"]["type_d_structures"][&n]["generators"][&x0]["grading"] =
                        json!([2 * gu - 3 * a, 0, -2 * a, 0]);
                    for (cx, g) in [("X", format!("x⊗{x0}"))] {
                        if b["complexes"][cx]["generators"].get(&g).is_some() {
                            b["complexes"][cx]["generators"][&g] = json!([gu, a]);
                        }
                    }
                    let claims = b["claims"].as_array_mut().unwrap();
                    for cl in claims.iter_mut() {
                        if cl["kind"] == "complement" && cl["structure"] == json!(n) {
                            cl["tau"] = json!(tau);
                        }
                    }
                    let Some(sealed) = reseal(&c, b) else { continue };
                    tried += 1;
                    let checker = checker_accepts(&sealed);
                    let ours = oracle_accepts(&sealed["body"]);
                    accepted += checker as u32;
                    if checker != ours.is_ok() {
                        bad.push(format!(
                            "C at ({gu}, {gv}), grading A = {a}, τ = {tau}: checker {checker}, oracle {ours:?}"
                        ));
                    }
                }
            }
        }
    }
    eprintln!("grading grid: {tried} tried, {accepted} accepted");
    assert!(accepted >= 1, "the unmoved certificate is among the grid");
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

/// Tensor products (connected sums) as companions: the producer carries each to a
/// simultaneously simplified basis, and the certificate shows the new complex and the two
/// changes of basis (`homotopy_equivalence` over F2[U,V], both homotopies zero). Then `cable 1
/// Q` equals `quotient V` of the source as written, by homology with gradings, at several
/// framings; τ is additive (OS 2003) and odd under mirroring, so K # mirror K has τ = 0.
#[test]
fn tensor_product_companions_are_carried_to_a_simplified_basis() {
    let (t23, t25, t34) = (source("T23"), source("T25"), source("T34"));
    for (what, src, tau) in [
        ("T23 # T23", json!({"tensor": [t23, t23]}), 2),
        ("T23 # T25", json!({"tensor": [t23, t25]}), 3),
        ("T34 # mirror T34", json!({"tensor": [t34, {"dual": t34}]}), 0),
        ("T23 # mirror T23", json!({"tensor": [t23, {"dual": t23}]}), 0),
        ("T23 # T23 # T23", json!({"tensor": [{"tensor": [t23, t23]}, t23]}), 3),
        ("mirror (T23 # T25)", json!({"dual": {"tensor": [t23, t25]}}), -3),
    ] {
        for t in framings(tau) {
            let c = certificate(&pairing_problem(&src, t));
            assert!(checker_accepts(&c), "{what}, t = {t}: the checker refuses the producer's certificate");
            oracle_accepts(&c["body"]).unwrap_or_else(|e| panic!("{what}, t = {t}: {e}"));
            let body = &c["body"];
            let claims = body["claims"].as_array().unwrap();
            let eq = claims.iter().find(|x| x["kind"] == "homotopy_equivalence").expect("a change of basis");
            let comp = claims.iter().find(|x| x["kind"] == "complement").unwrap();
            assert_eq!(comp["complex"], json!("N.companion.simplified"), "{what}");
            assert_eq!(eq["maps"], json!(["N.companion.to_simplified", "N.companion.from_simplified"]), "{what}");
            assert_eq!(comp["tau"], json!(tau), "{what}");
            let hx = homology_of(body, "X");
            assert_eq!(hx, homology_of(body, "K"), "{what}, t = {t}");
            assert_eq!(hx, homology_of(body, "Q"), "{what}, t = {t}: cable 1 (t+1) against quotient V");
            assert_eq!(hx, quotient_homology(body, "N.companion", false), "{what}, t = {t}: C/(V) as written");
            assert_eq!(hx.0, vec![(-2 * tau, -tau)], "{what}, t = {t}");
        }
    }
}

/// A change of basis in a certificate is checked: a term of either map removed, or of the new
/// complex's differential, and both deciders refuse.
#[test]
fn changes_of_basis_are_checked_by_both_deciders() {
    let t23 = source("T23");
    let c = certificate(&pairing_problem(&json!({"tensor": [t23, t23]}), 3));
    for (section, name) in [
        ("full_maps", "N.companion.to_simplified"),
        ("full_maps", "N.companion.from_simplified"),
        ("full_complexes", "N.companion.simplified"),
    ] {
        let list = if section == "full_maps" { "terms" } else { "differential" };
        let n = c["body"]["bordered"][section][name][list].as_array().unwrap().len();
        for i in 0..n {
            let mut body = c["body"].clone();
            body["bordered"][section][name][list].as_array_mut().unwrap().remove(i);
            let Some(m) = reseal(&c, body) else { continue };
            assert!(!checker_accepts(&m), "{section} {name}: term {i} removed, the checker accepts");
            assert!(oracle_accepts(&m["body"]).is_err(), "{section} {name}: term {i} removed, the oracle accepts");
        }
    }
}

/// The demo's bordered workflow (examples/cabled-pair.template.json): cables of an invented
/// companion and of the unknot, the maps id ⊠ f and id ⊠ f2 between them, and ord_U(F − G) = p
/// with both witnesses, in one certificate; both deciders accept it and refuse its mutations
/// alike.
#[test]
fn cabled_maps_of_the_demo_carry_their_torsion_order() {
    let mut certs = Vec::new();
    for (stem, bytes) in tubecert::demo::cabled_problems() {
        // The square's side is the order in the first family (the square is a summand); the
        // cable family (P = p) is checked for agreement only.
        let side: Option<i64> = stem.strip_prefix("cabled-pair-p").map(|p| p.parse().unwrap());
        let c = certificate(&serde_json::from_slice(&bytes).unwrap());
        assert!(checker_accepts(&c), "{stem}");
        oracle_accepts(&c["body"]).unwrap_or_else(|e| panic!("{stem}: {e}"));
        let claims = c["body"]["claims"].as_array().unwrap();
        let kinds: Vec<&str> = claims.iter().map(|x| x["kind"].as_str().unwrap()).collect();
        for k in ["box_tensor_map", "type_d_morphism", "torsion_order", "not_null_homotopic"] {
            assert!(kinds.contains(&k), "{stem}: no {k} claim in {kinds:?}");
        }
        // Every box tensor product of the demo: HF-hat(S³) = F2 in degree 0 once normalized.
        for x in claims.iter().filter(|x| x["kind"] == "box_tensor") {
            let name = x["complex"].as_str().unwrap();
            assert_eq!(hat_homology_of(&c["body"], name), vec![(0, 1)], "{stem}: {name}");
        }
        let ord = claims.iter().find(|x| x["kind"] == "torsion_order").unwrap();
        if let Some(p) = side {
            assert_eq!(ord["order"], json!(p), "{stem}");
        }
        certs.push((stem, c));
    }
    let bad = campaign(&certs, tubecert_tests::cases(40) as usize, 0xCAB1E);
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

/// ∂ of a complex of the body at U = 1 (each term U^n·y counted as y, mod 2), and M − 2A.
fn hat_of(body: &Value, name: &str) -> (BTreeMap<String, Vec<String>>, BTreeMap<String, i64>) {
    let c = &body["complexes"][name];
    let gens = c["generators"].as_object().unwrap();
    let deg = gens.iter().map(|(g, v)| (g.clone(), v[0].as_i64().unwrap() - 2 * v[1].as_i64().unwrap())).collect();
    let mut d: BTreeMap<String, std::collections::BTreeSet<String>> =
        gens.keys().map(|g| (g.clone(), Default::default())).collect();
    for t in c["differential"].as_array().unwrap() {
        bo::toggle(d.get_mut(t[0].as_str().unwrap()).unwrap(), t[2].as_str().unwrap().to_string());
    }
    (d.into_iter().map(|(g, s)| (g, s.into_iter().collect())).collect(), deg)
}

/// Toggles a name in a witness list (a set of generators, kept sorted).
fn toggled(list: &Value, g: &str) -> Value {
    let mut s: std::collections::BTreeSet<String> =
        list.as_array().unwrap().iter().map(|v| v.as_str().unwrap().to_string()).collect();
    bo::toggle(&mut s, g.to_string());
    json!(s)
}

/// Both verdicts on a mutated body (statements re-rendered, hash recomputed): true when both
/// accept, false when both refuse, a panic when they disagree.
fn both(c: &Value, body: Value, what: &str) -> bool {
    let sealed = reseal(c, body).unwrap_or_else(|| panic!("{what}: no longer the typed shape"));
    let (checker, ours) = (checker_accepts(&sealed), oracle_accepts(&sealed["body"]));
    assert_eq!(checker, ours.is_ok(), "{what}: the checker says {checker}, the oracle {ours:?}");
    checker
}

#[test]
fn wrong_maslov_witnesses_and_moved_maslov_gradings_are_refused_by_both() {
    // DEVELOPERS.md, Gradings ("Maslov, certified"): X/(U − 1) is CF-hat(S³), whose homology is
    // F2 in degree M − 2A = 0 (Ozsváth–Szabó 2004). T(3,4) at framing 2: several degrees.
    let c = certificate(&pairing_problem(&source("T34"), 2));
    assert!(both(&c, c["body"].clone(), "the producer's certificate"));
    let claims = c["body"]["claims"].as_array().unwrap();
    let k = claims.iter().position(|x| x["kind"] == "box_tensor" && x["complex"] == "X").unwrap();
    let w = claims[k]["witness"].clone();
    let (hat, deg) = hat_of(&c["body"], "X");
    let cycle: Vec<&str> = w["cycle"].as_array().unwrap().iter().map(|v| v.as_str().unwrap()).collect();
    let d = deg[cycle[0]];
    let with = |key: &str, v: Value| {
        let mut body = c["body"].clone();
        body["claims"][k]["witness"][key] = v;
        body
    };
    // c + g with ∂g ≠ 0: not a cycle.
    let g = hat.iter().find(|(g, b)| !b.is_empty() && !cycle.contains(&g.as_str())).unwrap().0;
    assert!(!both(&c, with("cycle", toggled(&w["cycle"], g)), "c + g, ∂g ≠ 0"));
    // c* + t with t in some ∂g: not a cocycle.
    let t = &hat.values().find(|b| !b.is_empty()).unwrap()[0];
    assert!(!both(&c, with("cocycle", toggled(&w["cocycle"], t)), "c* + t"));
    // ⟨c*, c⟩ = 0.
    assert!(!both(&c, with("cocycle", json!([])), "c* = 0"));
    // c + ∂g with ∂g ≠ 0 in another degree: still a cycle paired to 1, but not homogeneous.
    let (g, b) = hat.iter().find(|(g, b)| !b.is_empty() && deg[*g] - 1 != d).expect("a boundary in another degree");
    let mut mixed = w["cycle"].clone();
    b.iter().for_each(|t| mixed = toggled(&mixed, t));
    assert!(!both(&c, with("cycle", mixed), &format!("c + ∂{g}")));
    // A boundary in place of the cycle: homogeneous and a cycle, but zero in homology.
    assert!(!both(&c, with("cycle", json!(b)), &format!("∂{g} as the cycle")));
    // A generator that does not exist, or one named twice.
    assert!(!both(&c, with("cycle", json!([cycle.clone(), vec!["nobody"]].concat())), "an unknown name"));
    assert!(!both(&c, with("cycle", json!([cycle.clone(), vec![cycle[0]]].concat())), "a repeated name"));
    // No witness: version 5 needs one.
    let mut body = c["body"].clone();
    body["claims"][k].as_object_mut().unwrap().remove("witness");
    assert!(!both(&c, body, "no witness"));
    // Every Maslov grading of X moved by 2 (Alexander kept): Σ(−1)^M t^A stays symmetric, so
    // only the witness's degree can tell, and it does.
    let mut body = c["body"].clone();
    for v in body["complexes"]["X"]["generators"].as_object_mut().unwrap().values_mut() {
        v[0] = json!(v[0].as_i64().unwrap() + 2);
    }
    assert!(!both(&c, body, "gradings moved by (2, 0)"));
}

#[test]
fn wrong_witnesses_of_a_box_tensor_map_are_refused_by_both() {
    let dir = std::path::PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../certificates/cable-by-p2.cert.json");
    let c: Value = serde_json::from_slice(&std::fs::read(dir).unwrap()).unwrap();
    assert!(both(&c, c["body"].clone(), "the stored certificate"));
    let k = c["body"]["claims"].as_array().unwrap().iter().position(|x| x["kind"] == "box_tensor_map").unwrap();
    for side in ["from", "to"] {
        let mut body = c["body"].clone();
        body["claims"][k]["witness"][side]["cocycle"] = json!([]);
        assert!(!both(&c, body, &format!("{side}: c* = 0")));
    }
    // The source's and the target's witnesses exchanged: each is a set of generators of the
    // other complex (or not a cycle there).
    let mut body = c["body"].clone();
    let w = body["claims"][k]["witness"].clone();
    body["claims"][k]["witness"] = json!({"from": w["to"], "to": w["from"]});
    assert!(!both(&c, body, "from and to exchanged"));
}

#[test]
fn a_pattern_whose_raw_maslov_reading_is_off_by_one_is_normalized_by_its_witness() {
    // The core with gr(x) = λ instead of 1: λ is central, so every operation stays homogeneous,
    // and LOT's reading of x⊗ξ moves by (1, 0) — not a multiple of gr(U) = (−2, −1), so the
    // symmetry of Σ(−1)^M t^A cannot see it. The witness must bring back the core's gradings:
    // the pairing is CFK^-(K) itself (LOT Thm 11.21), i.e. the V = 0 quotient of the companion.
    let core = json!({"generators": {"x": {"grading": [2, 0, 0, 0], "idempotent": 0}}, "period": [3, 0, 2, 2],
        "operations": [{"from": "x", "power": [1, 1], "prefix": ["rho3"], "repeat": ["rho23"], "suffix": ["rho2"], "to": "x"}]});
    for (what, src, tau) in companions().into_iter().step_by(2) {
        for t in [2 * tau - 1, 2 * tau + 1] {
            let mut problem = pairing_problem(&src, t);
            problem["type_a_modules"]["M"] = core.clone();
            problem["complexes"].as_object_mut().unwrap().remove("K");
            let c = certificate(&problem);
            assert!(both(&c, c["body"].clone(), &format!("{what}, t = {t}")));
            let (x, q) = (&c["body"]["complexes"]["X"]["generators"], &c["body"]["complexes"]["Q"]["generators"]);
            for (g, gr) in x.as_object().unwrap() {
                assert_eq!(gr, &q[g.strip_prefix("x⊗").unwrap()], "{what}, t = {t}: {g}");
            }
            assert_eq!(homology_of(&c["body"], "X"), homology_of(&c["body"], "Q"), "{what}, t = {t}");
            // HFK^- = F2[U] ⊕ torsion with the tower at (−2τ, −τ) (conventions sheet).
            assert_eq!(homology_of(&c["body"], "X").0, vec![(-2 * tau, -tau)], "{what}, t = {t}");
            assert_eq!(hat_homology_of(&c["body"], "X"), vec![(0, 1)], "{what}, t = {t}: HF-hat(S³)");
        }
    }
}

/// A wrong operation deep in a long family — the (2, 1) pattern's m(x1, ρ3, ρ23^20, ρ2) =
/// U^42·x1 cancelled by a single entry, which keeps every family homogeneous — is seen by no
/// relation on words of length ≤ 22 (the word itself has no second operation or product inside
/// it: ρ3ρ23 = ρ23ρ23 = ρ23ρ2 = 0) and by the relation on ρ3ρ23^aρ2·ρ3ρ23^bρ2, a + b = 19, of
/// length 23 (one ρ23 split as ρ2ρ3): m∘m gives U^{2a+2}·U^{2b+2}·x1 = U^42·x1 and the merged
/// term is gone. Checker (candidate words from the operations) and oracle (its own candidates,
/// and every word up to length 7) must both find exactly that threshold.
#[test]
fn a_wrong_operation_deep_in_a_long_family_is_found_by_both_at_the_same_length() {
    let problem = json!({"format": "tubecert-problem", "version": 1, "ring": minus_ring(), "complexes": {},
        "type_a_modules": {"M": {"cable_pattern": {"p": 2}}}, "goals": []});
    let c = certificate(&problem);
    let ops = c["body"]["bordered"]["type_a_modules"]["M"]["operations"].as_array().unwrap();
    let long = ops.iter().find(|f| f["from"] == "x1" && f["to"] == "x1").expect("the (2, 1) pattern's x1 → x1 family");
    assert_eq!(
        (long["prefix"].clone(), long["repeat"].clone(), long["suffix"].clone(), long["power"].clone()),
        (json!(["rho3"]), json!(["rho23"]), json!(["rho2"]), json!([2, 2]))
    );
    let mut word = vec![json!("rho3")];
    word.extend(std::iter::repeat_n(json!("rho23"), 20));
    word.push(json!("rho2"));
    for (length, holds) in [(22, true), (23, false), (40, false)] {
        let mut body = c["body"].clone();
        body["bordered"]["type_a_modules"]["M"]["operations"]
            .as_array_mut()
            .unwrap()
            .push(json!({"from": "x1", "power": [0, 42], "prefix": word, "repeat": [], "suffix": [], "to": "x1"}));
        body["claims"][0]["max_length"] = json!(length);
        let sealed = reseal(&c, body).unwrap();
        assert_eq!(checker_accepts(&sealed), holds, "checker, length {length}");
        assert_eq!(oracle_accepts(&sealed["body"]).is_ok(), holds, "oracle, length {length}");
    }
}

/// A pairing without the claims it rests on (LOT §2.3–2.4: ∂² = 0 on M ⊠ N needs the D
/// relation on N; id ⊠ f is a chain map only when f satisfies the morphism relation) is refused
/// by both deciders, whichever supporting claim is dropped.
#[test]
fn pairings_without_their_supporting_claims_are_refused_by_both() {
    let c = certificate(&morphism_problem(6));
    let claims = c["body"]["claims"].as_array().unwrap();
    let mut dropped = 0;
    for (k, x) in claims.iter().enumerate() {
        if x["kind"] == "type_d_structure" || x["kind"] == "type_d_morphism" {
            let mut body = c["body"].clone();
            body["claims"].as_array_mut().unwrap().remove(k);
            let what = format!("without claim {k} ({})", x["kind"]);
            let sealed = reseal(&c, body).unwrap();
            assert!(!checker_accepts(&sealed), "{what}: the checker accepts");
            let why = oracle_accepts(&sealed["body"]).expect_err(&what);
            assert!(why.contains("rests on"), "{what}: {why}");
            dropped += 1;
        }
    }
    assert!(dropped >= 3, "the morphism problem should have two structures and a morphism claimed");
}
