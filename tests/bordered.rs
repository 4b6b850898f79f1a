//! Bordered claims through the whole pipeline: knot complements (LOT Thm 11.26), the core
//! pattern, box tensor products of complexes and maps, and what the checker rejects.
//! LOT = Lipshitz–Ozsváth–Thurston, "Bordered Heegaard Floer homology", Mem. AMS 254 (2018);
//! staircases: Ozsváth–Szabó 2005, "On knot Floer homology and lens space surgeries", Topology 44.

use serde_json::{json, Value};
use tubecert_format::{Body, Claim};
use tubecert_tests::{minus_ring, prove_value, seal};

fn problem(complexes: Value, extra: Value) -> Value {
    let mut p = json!({"format": "tubecert-problem", "version": 1, "ring": minus_ring(), "complexes": complexes});
    for (k, v) in extra.as_object().unwrap() {
        p[k] = v.clone();
    }
    p
}

fn body_of(p: &Value) -> Body {
    prove_value(p).certificate.body
}

/// (claim kind, outcome) for each claim.
type Outcomes = Vec<(String, Result<(), String>)>;

/// The checker's outcome per claim of a body (after sealing), or the refusal (exit 2).
fn outcomes(body: Body) -> Result<Outcomes, String> {
    let r = tubecheck::check_bytes("test", &seal(body))?;
    Ok(r.claims.into_iter().map(|c| (c.kind, c.outcome.map(|_| ()))).collect())
}

fn failed_kinds(body: Body) -> Vec<String> {
    outcomes(body).unwrap().into_iter().filter(|c| c.1.is_err()).map(|c| c.0).collect()
}

/// Companions over `F2[U,V]`: staircases (Ozsváth–Szabó 2005) and their duals (mirrors).
fn companions() -> Vec<(String, Value)> {
    let mut out = Vec::new();
    for pq in [[2, 3], [2, 5], [3, 4], [3, 5], [2, 7], [4, 5]] {
        let s = json!({"staircase": {"torus_knot": pq}});
        out.push((format!("T{pq:?}"), s.clone()));
        out.push((format!("mirror T{pq:?}"), json!({"dual": s})));
    }
    out.push(("unknot".into(), json!({"staircase": {"alexander": [0]}})));
    out.push(("staircase 4 3 0 -3 -4".into(), json!({"staircase": {"alexander": [4, 3, 0, -3, -4]}})));
    out.push(("shifted dual".into(), json!({"dual": {"staircase": {"alexander": [4, 3, 0, -3, -4]}}})));
    // ξ0 = η0 beside acyclic squares (the figure-eight's shape, τ = 0): LOT Thm 11.26's structure
    // has a cycle for t ≥ 0 and the complement is its bounded model. The second has a diagonal
    // arrow a2 → UV·d1 (homogeneous, ∂∂ = 0), which enters neither C/(U) nor C/(V).
    let square = |k: i64, m: i64| {
        let n = |g: &str| format!("{g}{k}");
        (
            [(n("a"), [m, m]), (n("b"), [m + 1, m - 1]), (n("c"), [m - 1, m + 1]), (n("d"), [m, m])],
            [
                [n("a"), "U".into(), n("b")],
                [n("a"), "V".into(), n("c")],
                [n("b"), "V".into(), n("d")],
                [n("c"), "U".into(), n("d")],
            ],
        )
    };
    let (mut gens, mut d) = (serde_json::Map::new(), Vec::new());
    gens.insert("x".into(), json!([0, 0]));
    for (k, m) in [(1, 0), (2, -1)] {
        let (g, t) = square(k, m);
        g.into_iter().for_each(|(n, gr)| drop(gens.insert(n, json!(gr))));
        d.extend(t.map(|t| json!(t)));
        let one = json!({"generators": gens.clone(), "differential": d.clone()});
        if k == 1 {
            out.push(("point beside a square".into(), one));
        }
    }
    d.push(json!(["a2", "U*V", "d1"]));
    out.push(("point beside two squares and a diagonal arrow".into(), json!({"generators": gens, "differential": d})));
    // Pieces with no arrow between them: a box a → U·b, a → V·c, b → V·d, c → U·d beside a
    // staircase. The unknot plus a box is the figure-eight's complex (recalled from memory).
    let square = json!({"generators": {"a": [0, 0], "b": [1, -1], "c": [-1, 1], "d": [0, 0]},
        "differential": [["a", "U", "b"], ["a", "V", "c"], ["b", "V", "d"], ["c", "U", "d"]]});
    out.push(("figure-eight".into(), json!({"direct_sum": [{"staircase": {"alexander": [0]}}, square]})));
    let far = json!({"shift": [square, [5, -7]]});
    let t23 = json!({"staircase": {"torus_knot": [2, 3]}});
    // The boxes far out at mirrored places, so that the Euler characteristic stays symmetric
    // (version 4 normalizes by it; the core's shift must be 0).
    out.push(("T(2,3) and two boxes".into(), json!({"direct_sum": [t23, {"direct_sum": [far, {"dual": far}]}]})));
    out
}

/// τ of each companion, for the framings around 2τ.
fn tau(source: &Value) -> i64 {
    let b = body_of(&problem(json!({"Q": {"quotient": [source, "V"]}}), json!({"goals": [{"tau": {"complex": "Q"}}]})));
    match &b.claims[0] {
        Claim::Tau { tau, .. } => *tau,
        c => panic!("{c:?}"),
    }
}

#[test]
fn the_core_pattern_gives_back_the_companions_minus_complex() {
    // LOT Thm 11.21 with the core of the solid torus: CFA^-(core) ⊠ CFD(X_K) ≃ CFK^-(K), so
    // cable 1 Q of C is C/(V), generator by generator, with the same (Maslov, Alexander) gradings
    // and the same homology, for every framing.
    for (name, src) in companions() {
        let t2 = 2 * tau(&src);
        for q in [t2 - 4, t2, t2 + 1, t2 + 2, t2 + 5, 1, -3] {
            let p = problem(
                json!({"K": {"cable": {"companion": src, "p": 1, "q": q}}, "Q": {"quotient": [src, "V"]}}),
                json!({"goals": [{"homology": {"complex": "K"}}, {"homology": {"complex": "Q"}}]}),
            );
            let proved = prove_value(&p);
            let body = &proved.certificate.body;
            let (k, qc) = (&body.complexes["K"], &body.complexes["Q"]);
            let renamed: Vec<(String, Vec<i64>)> =
                k.generators.iter().map(|(g, gr)| (g.strip_prefix("x⊗").unwrap().to_string(), gr.clone())).collect();
            let plain: Vec<(String, Vec<i64>)> = qc.generators.iter().map(|(g, gr)| (g.clone(), gr.clone())).collect();
            assert_eq!(renamed, plain, "{name}, q = {q}: generators and gradings");
            let mut kd: Vec<[String; 3]> = k
                .differential
                .iter()
                .map(|[a, c, b]| [a["x⊗".len()..].to_string(), c.clone(), b["x⊗".len()..].to_string()])
                .collect();
            let mut qd = qc.differential.clone();
            kd.sort();
            qd.sort();
            assert_eq!(kd, qd, "{name}, q = {q}: differential");
            let homology: Vec<_> = body.claims.iter().filter(|c| c.kind() == "homology").collect();
            match (homology[0], homology[1]) {
                (Claim::Homology { free: f1, torsion: t1, .. }, Claim::Homology { free: f2, torsion: t2, .. }) => {
                    assert_eq!((f1, t1), (f2, t2), "{name}, q = {q}: homology")
                }
                _ => unreachable!(),
            }
            assert!(outcomes(body.clone()).unwrap().iter().all(|c| c.1.is_ok()), "{name}, q = {q}");
        }
    }
}

#[test]
fn complements_satisfy_the_d_relation_and_have_the_unstable_chain_of_their_framing() {
    // LOT Thm 11.26 (recalled from memory): t < 2τ: ξ0 →ρ1 γ1, γ_{k+1} →ρ23 γ_k, η0 →ρ3 γ_m with m = 2τ − t;
    // t = 2τ: ξ0 →ρ12 η0; t > 2τ: ξ0 →ρ123 γ1 →ρ23 … →ρ2 η0 with m = t − 2τ.
    for (name, src) in companions() {
        let t2 = 2 * tau(&src);
        for t in [t2 - 3, t2 - 1, t2, t2 + 1, t2 + 4] {
            let p = problem(
                json!({}),
                json!({"type_d_structures": {"N": {"complement": {"companion": src, "framing": t}}}}),
            );
            let body = body_of(&p);
            assert!(failed_kinds(body.clone()).is_empty(), "{name}, t = {t}");
            let n = &body.bordered.as_ref().unwrap().type_d_structures["N"];
            let gammas = n.generators.keys().filter(|g| g.starts_with("gamma")).count() as i64;
            assert_eq!(gammas, (t - t2).abs(), "{name}, t = {t}");
            // ξ0 = η0 (the unknot here) and t ≥ 2τ: the bounded model, ξ0 →ρ12 ξ0 or
            // ξ0 →ρ123 γ1 split through the cancelling pair pair.x →1 pair.y.
            let split = (name == "unknot" || name == "figure-eight" || name.starts_with("point")) && t >= t2;
            assert_eq!(n.generators.contains_key("pair.x"), split, "{name}, t = {t}");
            let rho12 = n.differential.iter().filter(|d| d[1] == "rho12").count();
            assert_eq!(rho12, usize::from(t == t2 && !split), "{name}, t = {t}");
            // ι_0 generators are C's basis, ι_1 ones one per power of U or V in ∂ plus the chain.
            let iota0 = n.generators.values().filter(|g| g.idempotent == 0).count();
            let c = &body.bordered.as_ref().unwrap().full_complexes["N.companion"];
            assert_eq!(iota0, c.generators.len());
        }
    }
}

#[test]
fn the_trefoil_complement_has_the_recalled_shape() {
    // T(2,3): ∂x1 = U·x0 + V·x2, τ = 1, ξ0 = x0, η0 = x2 (Ozsváth–Szabó 2005; LOT Thm 11.26,
    // recalled from memory). Framing 0 < 2τ: m = 2.
    let p = problem(
        json!({}),
        json!({"type_d_structures": {"N": {"complement": {"companion": {"staircase": {"torus_knot": [2, 3]}}, "framing": 0}}}}),
    );
    let body = body_of(&p);
    let n = &body.bordered.as_ref().unwrap().type_d_structures["N"];
    let mut d: Vec<String> = n.differential.iter().map(|t| t.join(" ")).collect();
    d.sort();
    assert_eq!(
        d,
        [
            "gamma2 rho23 gamma1",
            "lambda1.x1.x0 rho2 x0",
            "x0 rho1 gamma1",
            "x1 rho1 kappa1.x1.x2",
            "x1 rho3 lambda1.x1.x0",
            "x2 rho123 kappa1.x1.x2",
            "x2 rho3 gamma2",
        ]
    );
    assert!(matches!(body.claims.iter().find(|c| c.kind() == "complement"), Some(Claim::Complement { tau: 1, .. })));
}

#[test]
fn mutations_of_delta_m_and_the_box_tensor_are_rejected() {
    let src = json!({"staircase": {"torus_knot": [3, 4]}});
    let body = body_of(&problem(json!({"K": {"cable": {"companion": src, "p": 1, "q": 2}}}), json!({})));
    assert!(failed_kinds(body.clone()).is_empty());
    let n_terms = body.bordered.as_ref().unwrap().type_d_structures["K.complement"].differential.len();
    for i in 0..n_terms {
        // Drop a term of δ¹: the complement claim fails (and maybe the D relation).
        let mut b = body.clone();
        b.bordered.as_mut().unwrap().type_d_structures.0.get_mut("K.complement").unwrap().differential.remove(i);
        assert!(failed_kinds(b).contains(&"complement".to_string()), "δ¹ term {i} dropped");
        // Change its coefficient to another Reeb element.
        for other in ["rho1", "rho2", "rho3", "rho12", "rho23", "rho123"] {
            let mut b = body.clone();
            let d = &mut b.bordered.as_mut().unwrap().type_d_structures.0.get_mut("K.complement").unwrap().differential;
            if d[i][1] == other {
                continue;
            }
            d[i][1] = other.into();
            let failed = failed_kinds(b);
            assert!(failed.contains(&"complement".to_string()), "δ¹ term {i} → {other}: {failed:?}");
        }
    }
    // The D relation itself: ρ1 then ρ2 composes to ρ12 ≠ 0.
    let mut b = body.clone();
    let n = b.bordered.as_mut().unwrap().type_d_structures.0.get_mut("K.complement").unwrap();
    n.differential.push(["x2".into(), "rho1".into(), "lambda1.x1.x0".into()]);
    assert!(failed_kinds(b).contains(&"type_d_structure".to_string()));
    // The module's operation: a wrong power of U breaks the A∞ relations and the box tensor.
    for power in [[0, 1], [1, 0], [2, 1], [1, 2]] {
        let mut b = body.clone();
        b.bordered.as_mut().unwrap().type_a_modules.0.get_mut("K.pattern").unwrap().operations[0].power = power;
        let failed = failed_kinds(b);
        assert!(failed.contains(&"type_a_module".to_string()) || power == [1, 1], "{power:?}: {failed:?}");
        assert!(failed.contains(&"box_tensor".to_string()), "{power:?}: {failed:?}");
    }
    // A term of the box tensor complex removed, or its power changed.
    for i in 0..body.complexes["K"].differential.len() {
        let mut b = body.clone();
        b.complexes.0.get_mut("K").unwrap().differential.remove(i);
        assert!(failed_kinds(b).contains(&"box_tensor".to_string()));
        let mut b = body.clone();
        b.complexes.0.get_mut("K").unwrap().differential[i][1] += "*U";
        assert!(failed_kinds(b).contains(&"box_tensor".to_string()));
    }
    // A grading of the box tensor product changed.
    let mut b = body.clone();
    let g = b.complexes.0.get_mut("K").unwrap().generators.0.values_mut().next().unwrap();
    g[1] += 1;
    assert!(failed_kinds(b).contains(&"box_tensor".to_string()));
    // τ or the framing changed (with its statement).
    for (dt, df) in [(1, 0), (0, 1)] {
        let mut b = body.clone();
        for c in &mut b.claims {
            if let Claim::Complement { tau, framing, .. } = c {
                *tau += dt;
                *framing += df;
            }
        }
        restate(&mut b);
        assert!(failed_kinds(b).contains(&"complement".to_string()));
    }
}

/// Re-renders every statement (a mutation of a claim's fields that keeps it self-consistent).
/// A body restated as format `version` wrote it (before 5: no Maslov witnesses; statements in
/// that version's wording), sealed.
fn as_version(mut body: Body, version: u32) -> Value {
    for c in &mut body.claims {
        if let Claim::BoxTensor { witness, .. } = c {
            *witness = None;
        } else if let Claim::BoxTensorMap { witness, .. } = c {
            *witness = None;
        }
    }
    let ring = tubecert_format::RingInfo::new(&body.ring).unwrap();
    for c in &mut body.claims {
        *tubecert::prove::statement_mut(c) = tubecert_format::statement::render(c, &ring, version);
    }
    let mut cert: Value = serde_json::from_slice(&seal(body)).unwrap();
    cert["version"] = json!(version);
    cert
}

/// The kinds of the claims that fail in a sealed certificate.
fn failed_in(cert: &Value) -> Vec<String> {
    let r = tubecheck::check_bytes("restated", &serde_json::to_vec(cert).unwrap()).unwrap();
    r.claims.into_iter().filter(|c| c.outcome.is_err()).map(|c| c.kind).collect()
}

fn restate(b: &mut Body) {
    let ring = tubecert_format::RingInfo::new(&b.ring).unwrap();
    for c in &mut b.claims {
        *tubecert::prove::statement_mut(c) =
            tubecert_format::statement::render(c, &ring, tubecert_format::CERTIFICATE_VERSION);
    }
}

#[test]
fn a_pairing_with_no_bounded_side_is_refused() {
    // y0 →ρ3 y1 with a ρ23 loop at y1, paired with the core (operations of every length).
    let n = json!({"generators": {"y0": {"grading": [0, 0, 0, 0], "idempotent": 0}, "y1": {"idempotent": 1}},
        "differential": [["y0", "rho3", "y1"], ["y1", "rho23", "y1"]], "period": [1, 2, 0, 0]});
    let p = problem(
        json!({"K": {"box_tensor": ["M", "N"]}}),
        json!({"type_d_structures": {"N": n}, "type_a_modules": {"M": {"cable_pattern": {"p": 1}}}}),
    );
    let bytes = serde_json::to_vec(&p).unwrap();
    let err = tubecert::problem::parse_problem(&bytes, "loop").unwrap_err().join("\n");
    assert!(err.contains("neither side is bounded") && err.contains("LOT §2.4"), "{err}");
    // The unknot (ξ0 = η0, τ = 0): a ρ12 loop at t = 0, a cycle ξ0 →ρ123 γ1 → … →ρ2 ξ0 for
    // t > 0 in LOT Thm 11.26's structure; the cable pairs with the bounded model and gives the
    // unknot's complex, one generator.
    for q in [1, 2, 4] {
        let body = body_of(&problem(
            json!({"K": {"cable": {"companion": {"staircase": {"alexander": [0]}}, "p": 1, "q": q}}}),
            json!({}),
        ));
        assert!(failed_kinds(body.clone()).is_empty());
        assert_eq!(body.complexes["K"].generators.len(), 1);
    }
}

/// The certificate body with K.complement's cancelling pair cancelled back (ξ0 →ρ1 pair.y,
/// pair.x →1 pair.y, pair.x →b z become ξ0 →ρ1·b z), no bounded_model, statements re-rendered:
/// LOT Thm 11.26's own structure, as the producer wrote it before bounded models.
fn unsplit(body: &Body) -> Body {
    let mut b = body.clone();
    let n = b.bordered.as_mut().unwrap().type_d_structures.0.get_mut("K.complement").unwrap();
    let find = |to: &str| n.differential.iter().find(|t| t[2] == to && t[0] != "pair.x").unwrap().clone();
    let xi = find("pair.y")[0].clone();
    let out = n.differential.iter().find(|t| t[0] == "pair.x" && t[1] != "1").unwrap().clone();
    let merged = if out[1] == "rho2" { "rho12" } else { "rho123" };
    n.differential.retain(|t| !t[0].starts_with("pair.") && !t[2].starts_with("pair."));
    n.differential.push([xi, merged.into(), out[2].clone()]);
    n.differential.sort();
    n.generators.0.retain(|g, _| !g.starts_with("pair."));
    for c in &mut b.claims {
        if let Claim::Complement { bounded_model, .. } = c {
            *bounded_model = None;
        }
    }
    restate(&mut b);
    b
}

#[test]
fn an_unbounded_structure_is_refused_even_where_every_term_vanishes() {
    // The unknot at t = 0 and t = 2: LOT Thm 11.26's structure has the loop x0 →ρ12 x0 or the
    // cycle x0 →ρ123 γ1 →ρ23 γ2 →ρ2 x0. The core's words all start with ρ3, so the walk dies at
    // once and the old checker accepted X = one generator; but an unbounded pairing can be wrong
    // (the surgery solid torus with the unknot's complement at t = 0 gives rank 0, not the 2 of
    // HF-hat(S¹×S²): the oracle's test), so the pairing is refused, and the producer pairs with
    // the bounded model instead.
    for (q, loop_terms) in
        [(1, vec![["x0", "rho12", "x0"]]), (3, vec![["x0", "rho123", "gamma1"], ["gamma2", "rho2", "x0"]])]
    {
        let body = body_of(&problem(
            json!({"K": {"cable": {"companion": {"staircase": {"alexander": [0]}}, "p": 1, "q": q}}}),
            json!({}),
        ));
        assert_eq!(
            body.bordered.as_ref().unwrap().full_complexes["K.companion"].generators.keys().collect::<Vec<_>>(),
            ["x0"]
        );
        assert!(failed_kinds(body.clone()).is_empty());
        assert!(body.claims.iter().any(|c| matches!(c, Claim::Complement { bounded_model: Some(true), .. })));
        let old = unsplit(&body);
        let d = &old.bordered.as_ref().unwrap().type_d_structures["K.complement"].differential;
        assert!(loop_terms.iter().all(|t| d.contains(&t.map(String::from))), "{d:?}");
        let e = outcomes(old.clone()).unwrap_err();
        assert!(e.contains("neither side is bounded"), "{e}");
        // Its complement claim alone (LOT Thm 11.26's structure itself) still verifies.
        let mut alone = old;
        alone.claims.retain(|c| c.kind() != "box_tensor");
        assert!(failed_kinds(alone).is_empty());
    }
}

#[test]
fn a_module_checked_on_too_short_words_is_refused() {
    // A horizontal arrow U^7 uses m_9(x, ρ3, ρ23^6, ρ2) = U^7·x: a word of length k = 8. ∂∂ = 0 on
    // the pairing rests on the A∞ relations on words of length ≤ 2k = 16; the old checker took
    // any stated length (8: the relations up to 8 hold, so the type_a_module claim itself is true).
    let body = body_of(&problem(
        json!({"K": {"cable": {"companion": {"staircase": {"alexander": [7, 0, -7]}}, "p": 1, "q": 2}}}),
        json!({}),
    ));
    assert!(failed_kinds(body.clone()).is_empty());
    for (l, ok) in [(8, false), (15, false), (16, true)] {
        let mut b = body.clone();
        for c in &mut b.claims {
            if let Claim::TypeAModule { max_length, .. } = c {
                *max_length = l;
            }
        }
        restate(&mut b);
        match outcomes(b) {
            Ok(o) => assert!(ok && o.iter().all(|c| c.1.is_ok()), "L = {l}"),
            Err(e) => assert!(
                !ok && e.contains("length 8") && e.contains("≤ 16") && e.contains(&format!("up to {l}")),
                "L = {l}: {e}"
            ),
        }
    }
    // Without any type_a_module claim the pairing is refused too.
    let mut b = body.clone();
    b.claims.retain(|c| c.kind() != "type_a_module");
    let e = outcomes(b).unwrap_err();
    assert!(e.contains("no type_a_module claim"), "{e}");
}

#[test]
fn a_map_pairing_needs_the_relations_its_source_and_target_pairings_use() {
    // id_M ⊠ f is a chain map between M ⊠ N and M ⊠ N′, so the module under the map's name must
    // be checked on twice the words those pairings use, not only the words of the map's walk.
    // In the demo's p = 4 member, N (a square of side 4) feeds words of length 5 to the core
    // module: relations up to 10 are needed; the old checker accepted 8.
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/../certificates/cabled-pair-p4.cert.json");
    let body = serde_json::from_slice::<tubecert_format::Certificate>(&std::fs::read(path).unwrap()).unwrap().body;
    assert!(failed_kinds(body.clone()).is_empty());
    let mut b = body;
    for c in &mut b.claims {
        if let Claim::TypeAModule { module, max_length, .. } = c {
            if module == "KO.pattern" {
                *max_length = 8;
            }
        }
    }
    restate(&mut b);
    let e = outcomes(b).unwrap_err();
    assert!(e.contains("id_KO.pattern ⊠ f") && e.contains("length 5") && e.contains("≤ 10"), "{e}");
}

#[test]
fn refusals_say_what_is_missing() {
    let run = |p: Value| {
        let bytes = serde_json::to_vec(&p).unwrap();
        tubecert::problem::parse_problem(&bytes, "p").unwrap_err().join("\n")
    };
    let t23 = json!({"staircase": {"torus_knot": [2, 3]}});
    let e = run(problem(json!({"K": {"cable": {"companion": t23, "p": 2, "q": 4}}}), json!({})));
    assert!(e.contains("P and Q must be coprime") && e.contains("every coprime (P, Q) with 1 ≤ P ≤ 5"), "{e}");
    let e = run(problem(json!({"K": {"cable": {"companion": t23, "p": 7, "q": 3}}}), json!({})));
    assert!(e.contains("Q must be ≡ 1 mod P") && e.contains("-6, 1, 8"), "{e}");
    // Every coprime Q is reachable for P ≤ 5, negative Q too; Q ≡ 1 mod P beyond.
    for (p, q) in [(2, 3), (2, -1), (2, -3), (3, 2), (3, -2), (5, 3), (7, -13)] {
        let prob = problem(json!({"K": {"cable": {"companion": t23, "p": p, "q": q}}}), json!({}));
        assert!(tubecert::problem::parse_problem(&serde_json::to_vec(&prob).unwrap(), "p").is_ok(), "({p}, {q})");
    }
    // The tensor basis of T(2,3) ⊗ T(2,3) is not simultaneously simplified, but the producer
    // finds a basis that is (tests/bordered_agreement.rs); for T(3,5) ⊗ mirror T(3,4) its
    // search finds none, and says so.
    let (t35, t34) = (json!({"staircase": {"torus_knot": [3, 5]}}), json!({"staircase": {"torus_knot": [3, 4]}}));
    let src = json!({"tensor": [t35, {"dual": t34}]});
    let e = run(problem(json!({"K": {"cable": {"companion": src, "p": 1, "q": 1}}}), json!({})));
    assert!(e.contains("no simultaneously simplified basis was found") && e.contains("A.11"), "{e}");
    // A unit coefficient (a basis that is not reduced).
    let unit = json!({"generators": {"a": [0, 0], "b": [-1, -1], "c": [-2, -2]}, "differential": [["b", "1", "c"]]});
    let e = run(problem(json!({"K": {"cable": {"companion": unit, "p": 1, "q": 1}}}), json!({})));
    assert!(e.contains("reduced"), "{e}");
    // ∂∂ ≠ 0 in an inline source is refused even though V = 0 would hide the bad terms.
    let bad = json!({"generators": {"a": [0, 0], "b": [-1, 1], "c": [-2, 2]},
        "differential": [["a", "V", "b"], ["b", "V", "c"]]});
    let e = run(problem(json!({"Q": {"quotient": [bad, "V"]}}), json!({})));
    assert!(e.contains("∂∂"), "{e}");
}

#[test]
fn a_quotient_of_a_tensor_of_named_staircases_is_the_tensor_of_their_quotients() {
    // Quotienting and tensoring commute; the named source is rebuilt over F2[U,V] once, so its
    // gradings are converted once.
    let hat = json!({"variables": [], "gradings": ["maslov", "alexander"], "variable_degrees": {}, "differential_degree": [-1, 0]});
    let p = json!({"format": "tubecert-problem", "version": 1, "ring": hat, "complexes": {
        "A": {"staircase": {"torus_knot": [2, 3]}},
        "Q": {"quotient": [{"tensor": ["A", "A"]}, "U", "V"]},
        "T": {"tensor": ["A", "A"]}}});
    let b = body_of(&p);
    assert_eq!(b.complexes["Q"], b.complexes["T"]);
    let minus = problem(
        json!({"A": {"staircase": {"torus_knot": [3, 4]}}, "Q": {"quotient": [{"tensor": ["A", {"dual": "A"}]}, "V"]}, "D": {"dual": "A"}, "T": {"tensor": ["A", "D"]}}),
        json!({}),
    );
    let b = body_of(&minus);
    assert_eq!(b.complexes["Q"], b.complexes["T"]);
}

#[test]
fn maps_id_box_f() {
    // f = id_N gives the identity of M ⊠ N; f(x1) = ρ3 ⊗ λ1 (a cycle: ρ3·ρ2 = 0 and nothing
    // maps into x1) gives x⊗x1 ↦ U·x⊗x0 through m_3(x, ρ3, ρ2) = U·x.
    let t23 = json!({"staircase": {"torus_knot": [2, 3]}});
    let sections = |terms: Value| {
        json!({"type_d_structures": {"N": {"complement": {"companion": t23, "framing": 1}}},
               "type_a_modules": {"M": {"cable_pattern": {"p": 1}}},
               "type_d_morphisms": {"f": {"from": "N", "to": "N", "terms": terms}}})
    };
    let complexes = json!({"K": {"box_tensor": ["M", "N"]}});
    let ids: Vec<Value> =
        ["x0", "x1", "x2", "kappa1.x1.x2", "lambda1.x1.x0", "gamma1"].iter().map(|g| json!([g, "1", g])).collect();
    let mut p = problem(complexes.clone(), sections(json!(ids)));
    p["maps"] = json!({"F": {"box_tensor_map": ["M", "f"]}});
    let body = body_of(&p);
    assert!(failed_kinds(body.clone()).is_empty());
    let mut f = body.maps["F"].terms.clone();
    f.sort();
    assert_eq!(f, [["x⊗x0", "1", "x⊗x0"], ["x⊗x1", "1", "x⊗x1"], ["x⊗x2", "1", "x⊗x2"]].map(|t| t.map(String::from)));
    let mut p = problem(complexes, sections(json!([["x1", "rho3", "lambda1.x1.x0"]])));
    p["maps"] = json!({"F": {"box_tensor_map": ["M", "f"]}});
    // Goals on the resulting map: x⊗x1 ↦ U·x⊗x0 is ∂H + H∂ with H(x⊗x1) = x⊗x1.
    p["goals"] = json!([{"null_homotopic": {"map": "F"}}]);
    let body = body_of(&p);
    let null = body.claims.iter().find(|c| c.kind() == "null_homotopic");
    assert!(matches!(null, Some(Claim::NullHomotopic { witness, .. }) if !witness.homotopy.is_empty()));
    assert!(failed_kinds(body.clone()).is_empty());
    assert_eq!(body.maps["F"].terms, [["x⊗x1", "U", "x⊗x0"]].map(|t| t.map(String::from)));
    // Mutations: a term of the map; a term of f (id ⊠ f is then 0); an added term ρ1 ⊗ λ1,
    // after which ∂f(x1) ∋ ρ1ρ2 ⊗ x0 = ρ12 ⊗ x0.
    let mut b = body.clone();
    b.maps.0.get_mut("F").unwrap().terms[0][2] = "x⊗x2".into();
    assert!(failed_kinds(b).contains(&"box_tensor_map".to_string()));
    let mut b = body.clone();
    b.bordered.as_mut().unwrap().type_d_morphisms.0.get_mut("f").unwrap().terms[0][1] = "rho1".into();
    let failed = failed_kinds(b);
    assert!(failed.contains(&"box_tensor_map".to_string()), "{failed:?}");
    let mut b = body.clone();
    b.bordered.as_mut().unwrap().type_d_morphisms.0.get_mut("f").unwrap().terms.push([
        "x1".into(),
        "rho1".into(),
        "lambda1.x1.x0".into(),
    ]);
    let failed = failed_kinds(b);
    assert!(failed.contains(&"type_d_morphism".to_string()), "{failed:?}");
}

#[test]
fn version_one_certificates_stay_readable_and_cannot_hold_bordered_objects() {
    let body = body_of(&problem(
        json!({"K": {"cable": {"companion": {"staircase": {"torus_knot": [2, 3]}}, "p": 1, "q": 2}}}),
        json!({}),
    ));
    let mut cert: Value = serde_json::from_slice(&seal(body)).unwrap();
    assert_eq!(cert["version"], json!(tubecert_format::CERTIFICATE_VERSION));
    cert["version"] = json!(1);
    let e = tubecheck::check_bytes("v1", &serde_json::to_vec(&cert).unwrap()).unwrap_err();
    assert!(e.contains("version-1"), "{e}");
}

/// A version-3 cable body rewritten as version 2 wrote it: module and ι_0 gradings
/// [Maslov, Alexander] (added in the box tensor product), ι_1 generators ungraded, no periods,
/// version 2's wording.
fn as_version_2(mut body: Body) -> Value {
    let b = body.bordered.as_mut().unwrap();
    for m in b.type_a_modules.0.values_mut() {
        m.period = None;
        m.generators.0.values_mut().for_each(|g| g.grading = vec![0, 0]);
    }
    let full = b.full_complexes.0.values().next().unwrap().clone();
    for n in b.type_d_structures.0.values_mut() {
        n.period = None;
        for (g, gen) in n.generators.0.iter_mut() {
            gen.grading = full.generators.get(g).map(|gr| vec![gr[0], (gr[0] - gr[1]) / 2]);
        }
    }
    as_version(body, 2)
}

#[test]
fn version_2_bordered_certificates_stay_verifiable_with_version_2_gradings() {
    let body = body_of(&problem(
        json!({"K": {"cable": {"companion": {"staircase": {"torus_knot": [3, 4]}}, "p": 1, "q": 3}}}),
        json!({}),
    ));
    let v2 = as_version_2(body.clone());
    let r = tubecheck::check_bytes("v2", &serde_json::to_vec(&v2).unwrap()).unwrap();
    assert!(
        r.claims.iter().all(|c| c.outcome.is_ok()),
        "{:?}",
        r.claims.iter().map(|c| &c.outcome).collect::<Vec<_>>()
    );
    assert!(tubecert_tests::oracle::holds_in(&serde_json::from_value::<Body>(v2["body"].clone()).unwrap(), 2));
    // A version-2 file cannot hold a period, nor four-entry gradings.
    let mut bad = v2.clone();
    bad["body"]["bordered"]["type_a_modules"]["K.pattern"]["period"] = json!([3, 0, 2, 2]);
    assert!(tubecheck::check_bytes("v2", &serde_json::to_vec(&bad).unwrap()).is_err());
    // The version-3 body under version 2's rules: four-entry gradings are refused.
    let mut cert = as_version(body, 3);
    cert["version"] = json!(2);
    assert!(tubecheck::check_bytes("v2", &serde_json::to_vec(&cert).unwrap()).is_err());
}

#[test]
fn group_gradings_are_checked_against_every_arrow_operation_and_complement() {
    let body = body_of(&problem(
        json!({"K": {"cable": {"companion": {"staircase": {"torus_knot": [2, 5]}}, "p": 1, "q": 2}}}),
        json!({}),
    ));
    let failed_after = |edit: &dyn Fn(&mut tubecert_format::bordered::Bordered)| {
        let mut b = body.clone();
        edit(b.bordered.as_mut().unwrap());
        outcomes(b).map(|o| o.into_iter().filter(|c| c.1.is_err()).map(|c| c.0).collect::<Vec<_>>())
    };
    assert_eq!(failed_after(&|_| {}), Ok(vec![]));
    // A ι_1 generator's grading moved by λ: the D structure's arrows are no longer homogeneous.
    let f = failed_after(&|b| {
        let n = b.type_d_structures.0.get_mut("K.complement").unwrap();
        let g = n.generators.0.iter_mut().find(|(k, _)| k.starts_with("lambda1.")).unwrap().1;
        g.grading.as_mut().unwrap()[0] += 2;
    })
    .unwrap();
    assert!(f.contains(&"type_d_structure".to_string()) && f.contains(&"complement".to_string()), "{f:?}");
    // The same generator moved by the period: still homogeneous (gradings live in G/P_D), but
    // not the representative LOT Thm 11.26's recomputation writes.
    let f = failed_after(&|b| {
        let n = b.type_d_structures.0.get_mut("K.complement").unwrap();
        let h = n.period.clone().unwrap();
        let g = n.generators.0.get_mut("gamma1").unwrap().grading.as_mut().unwrap();
        // g·h: j gains h_j + det(v_g, v_h), written doubled.
        let (j, p, q) = (g[0] + h[0] + (g[1] * h[2] - g[2] * h[1]) / 2, g[1] + h[1], g[2] + h[2]);
        *g = vec![j, p, q, g[3] + h[3]];
    })
    .unwrap();
    assert_eq!(f, vec!["complement".to_string()]);
    // Another period for the structure: the complement claim fails.
    let f = failed_after(&|b| {
        b.type_d_structures.0.get_mut("K.complement").unwrap().period = Some(vec![5, 2, 4, 0]);
    });
    assert!(f.is_err() || f.as_ref().unwrap().contains(&"complement".to_string()), "{f:?}");
    // A period whose (p, q) part is twice a primitive class: the glued manifold is not a homology
    // sphere, (Maslov, Alexander) cannot be read and the box tensor claim fails, saying so.
    let mut b = body.clone();
    b.bordered.as_mut().unwrap().type_d_structures.0.get_mut("K.complement").unwrap().period = Some(vec![1, 4, 0, 0]);
    let r = tubecheck::check_bytes("det", &seal(b)).unwrap();
    let bt = r.claims.iter().find(|c| c.kind == "box_tensor").unwrap();
    assert!(format!("{:?}", bt.outcome).contains("determinant"), "{:?}", bt.outcome);
    // The module's period or its generator's grading changed: its operations are not homogeneous.
    let f =
        failed_after(&|b| b.type_a_modules.0.get_mut("K.pattern").unwrap().period = Some(vec![1, 0, 2, 2])).unwrap();
    assert!(f.contains(&"type_a_module".to_string()), "{f:?}");
    // A module generator moved by λ (central: its operations stay homogeneous) moves LOT's
    // reading of every x⊗y by (1, 0), which the symmetric Euler characteristic cannot see. In
    // version 5 the witnessed Maslov normalization brings back the same gradings (the witness
    // is the same cycle, now of raw degree 1): every claim holds. Under version 4's convention
    // the box_tensor claim fails: the complex's gradings are the right ones, the convention's
    // are off by one — the gap version 5 closes.
    let moved = |b: &mut tubecert_format::bordered::Bordered| {
        b.type_a_modules.0.get_mut("K.pattern").unwrap().generators.0.get_mut("x").unwrap().grading[0] += 2
    };
    assert_eq!(failed_after(&moved), Ok(vec![]));
    let mut b = body.clone();
    moved(b.bordered.as_mut().unwrap());
    assert_eq!(failed_in(&as_version(b, 4)), vec!["box_tensor".to_string()]);
    // A grading that is not a group element (2p, 2q of different parity) makes the file unreadable.
    let f = failed_after(&|b| {
        b.type_a_modules.0.get_mut("K.pattern").unwrap().generators.0.get_mut("x").unwrap().grading[1] = 1
    });
    assert!(f.is_err(), "{f:?}");
}

#[test]
fn work_beyond_the_budget_is_refused_before_it_is_done() {
    // A stated length of 4·10^9 would mean about 10^19 words: the checker counts them first and
    // refuses the file (exit 2) instead of trying.
    let mut body = body_of(&problem(
        json!({"K": {"cable": {"companion": {"staircase": {"torus_knot": [2, 3]}}, "p": 1, "q": 2}}}),
        json!({}),
    ));
    for c in &mut body.claims {
        if let Claim::TypeAModule { max_length, .. } = c {
            *max_length = 4_000_000_000;
        }
    }
    restate(&mut body);
    let e = outcomes(body).unwrap_err();
    assert!(e.contains("budget"), "{e}");
}

// Version 4 normalizes box tensor gradings by the symmetric Euler characteristic; a version-3
// file keeps version 3's raw reading. The raw reading of the (2, 3) cable of T(2,3) (the (2, 1)
// pattern at framing 1) is off by (2, 1) (DEVELOPERS.md, Gradings), so its version-4 body
// restated as version 3 fails `box_tensor` and nothing else; the core (no shift) passes in both.
#[test]
fn version_3_reads_box_tensor_gradings_without_the_normalization() {
    let as_v3 = |body: Body| as_version(body, 3);
    let failed = failed_in;
    let t23 = json!({"staircase": {"torus_knot": [2, 3]}});
    let core = body_of(&problem(json!({"K": {"cable": {"companion": t23, "p": 1, "q": 3}}}), json!({})));
    assert!(failed_kinds(core.clone()).is_empty());
    assert!(failed(&as_v3(core)).is_empty());
    let cable = body_of(&problem(json!({"K": {"cable": {"companion": t23, "p": 2, "q": 3}}}), json!({})));
    assert!(failed_kinds(cable.clone()).is_empty());
    assert_eq!(failed(&as_v3(cable)), vec!["box_tensor".to_string()]);
}

// A product whose Euler characteristic has no centre is refused: two cores, the second moved by
// one Alexander unit, give χ = (1 + t)·Δ_{T(2,3)}.
#[test]
fn a_box_tensor_product_without_a_symmetric_euler_characteristic_is_refused() {
    let core = |x: &str| json!({"from": x, "power": [1, 1], "prefix": ["rho3"], "repeat": ["rho23"], "suffix": ["rho2"], "to": x});
    let m = json!({"generators": {"x": {"grading": [0, 0, 0, 0], "idempotent": 0}, "y": {"grading": [0, 0, 0, 2], "idempotent": 0}},
                   "period": [3, 0, 2, 2], "operations": [core("x"), core("y")]});
    let n = json!({"complement": {"companion": {"staircase": {"torus_knot": [2, 3]}}, "framing": 0}});
    let p = problem(
        json!({"X": {"box_tensor": ["M", "N"]}}),
        json!({"type_a_modules": {"M": m}, "type_d_structures": {"N": n}}),
    );
    let e = tubecert::problem::parse_problem(&serde_json::to_vec(&p).unwrap(), "p").unwrap_err().join("\n");
    assert!(e.contains("symmetric under t ↔ t⁻¹"), "{e}");
}

// A companion with long steps (the staircase of t^16 − 1 + t^−16, steps U^16 and V^16; and one
// with steps of 30): the pairing uses module words of length about 18 (32), so the module's
// relations are certified on words up to twice that. The A∞ check enumerates only the words
// made of the operations' own words, each checked in time linear in its length; checking every
// candidate by its splits (quadratic per word) exceeded these files' work budgets. τ by Hom
// 2014 ("Bordered Heegaard Floer homology and the τ-invariant of cable knots"): ε = 1 for a
// staircase with τ > 0 (recalled from memory), so τ(K_{p,1}) = p·τ(K) + (p − 1)(1 − 1)/2 = p·τ(K).
#[test]
fn cables_of_companions_with_long_steps_prove_and_verify() {
    for (step, p) in [(16, 3), (30, 2), (60, 2)] {
        let src = json!({"staircase": {"alexander": [step, 0, -step]}});
        let proved = prove_value(&problem(
            json!({"K": {"cable": {"companion": src, "p": p, "q": 1}}}),
            json!({"goals": [{"tau": {"complex": "K"}}]}),
        ));
        let claims = tubecert_tests::verified_claims(&proved);
        let tau = claims.iter().find(|c| c["kind"] == "tau").unwrap()["tau"].as_i64().unwrap();
        assert_eq!(tau, p * step, "step {step}, p = {p}");
        let length = claims.iter().find(|c| c["kind"] == "type_a_module").unwrap()["max_length"].as_i64().unwrap();
        assert!(length >= 2 * step, "step {step}, p = {p}: relations up to {length}");
    }
}

// Names may contain ⊗, so two pairs can spell one x⊗y: module generators x, x⊗p and structure
// generators p⊗q, q give x⊗p⊗q twice. A complex with that name once and an arbitrary `junk`
// generator in place of the other has as many generators as M ⊠ N and holds every name the
// pairing spells, yet is not M ⊠ N: the checker must refuse it.
#[test]
fn a_box_tensor_name_spelled_by_two_pairs_is_not_accepted() {
    let g = json!({"grading": [0, 0, 0, 0], "idempotent": 0});
    let complex =
        json!({"generators": {"x⊗p⊗q": [0, 0], "x⊗q": [0, 0], "x⊗p⊗p⊗q": [0, 0], "junk": [0, 0]}, "differential": []});
    let mut body = serde_json::to_value(body_of(&problem(json!({}), json!({})))).unwrap();
    body["complexes"] = json!({"X": complex});
    body["bordered"] = json!({"full_ring": {"variables": ["U", "V"], "gradings": ["gr_U", "gr_V"],
                "variable_degrees": {"U": [-2, 0], "V": [0, -2]}, "differential_degree": [-1, -1]},
            "full_complexes": {}, "type_d_morphisms": {},
            "type_a_modules": {"M": {"generators": {"x": g, "x⊗p": g}, "operations": [], "period": [3, 0, 2, 2]}},
            "type_d_structures": {"N": {"generators": {"p⊗q": g, "q": g}, "differential": [], "period": [1, 2, 0, 0]}}});
    body["claims"] = json!([{"kind": "type_a_module", "module": "M", "max_length": 0, "statement": ""},
                   {"kind": "box_tensor", "complex": "X", "module": "M", "structure": "N", "statement": ""}]);
    let mut body: Body = serde_json::from_value(body).unwrap();
    restate(&mut body);
    // Refused when the pairing is built (exit 2), or failed when compared: never accepted.
    let e = match outcomes(body) {
        Err(e) => e,
        Ok(out) => out.into_iter().find(|c| c.0 == "box_tensor").unwrap().1.unwrap_err(),
    };
    assert!(e.contains("both named") || e.contains("each spelled once"), "{e}");
}

#[test]
fn bounded_model_is_asked_for_only_as_true_and_only_where_there_is_a_cycle() {
    // `true` where LOT Thm 11.26's structure has no cycle (T(2,3) at t = 0 < 2τ = 2), and
    // `false` where it has one (the unknot at t = 2): both refused, each saying which.
    let cases = [
        (json!({"torus_knot": [2, 3]}), 1, Some(true), "here there is none"),
        (json!({"alexander": [0]}), 3, Some(false), "it is false"),
    ];
    for (stair, q, written, why) in cases {
        let body =
            body_of(&problem(json!({"K": {"cable": {"companion": {"staircase": stair}, "p": 1, "q": q}}}), json!({})));
        assert!(failed_kinds(body.clone()).is_empty());
        let mut b = body;
        for c in &mut b.claims {
            if let Claim::Complement { bounded_model, .. } = c {
                *bounded_model = written;
            }
        }
        restate(&mut b);
        let out = outcomes(b).unwrap();
        let e = out.iter().find(|c| c.0 == "complement").unwrap().1.clone().unwrap_err();
        assert!(e.contains("bounded_model is written only as true") && e.contains(why), "{e}");
    }
}
