//! Pattern modules from genus-one diagrams (producer: `tubecert::bordered::diagram`), re-checked
//! by the independent oracle of `bordered_oracle` (its own A∞ arithmetic, no checker code), and
//! the cables they give.

use tubecert_tests::bordered_oracle::{torus, Family, FamilyModule};

/// The oracle's reading of a module computed by the producer (gradings are not used here).
fn oracle_module(p: usize) -> FamilyModule {
    let spec = tubecert::bordered::diagram::cable_module(p).unwrap().module;
    let mut m = FamilyModule::default();
    for (g, gen) in spec.generators.iter() {
        m.idem.insert(g.clone(), gen.idempotent);
        m.gr.insert(g.clone(), (0, 0));
    }
    let word = |w: &[String]| -> Vec<torus::Alg> { w.iter().map(|a| torus::parse_reeb(a).unwrap()).collect() };
    for f in &spec.operations {
        m.families.push(Family {
            from: f.from.clone(),
            prefix: word(&f.prefix),
            repeat: word(&f.repeat),
            suffix: word(&f.suffix),
            a: f.power[0],
            b: f.power[1],
            to: f.to.clone(),
        });
    }
    m
}

// The A∞ relations of a right type A module over A(T²) (LOT = Lipshitz–Ozsváth–Thurston,
// Bordered Heegaard Floer homology, Mem. AMS 2018, §2.1) for the (p, 1) cable patterns,
// p = 1 … 5: every composable word up to length 7 by brute force and every candidate word up
// to length 20 (the oracle's own enumeration).
#[test]
fn cable_pattern_modules_satisfy_the_a_infinity_relations_by_the_oracle() {
    for p in 1..=5 {
        let m = oracle_module(p);
        m.check_idempotents().unwrap();
        m.check_ainf_up_to(20).unwrap_or_else(|e| panic!("p = {p}: {e}"));
    }
}

// Mutations the oracle must see: a family moved to another target or given one more U.
#[test]
fn the_oracle_rejects_mutated_pattern_modules() {
    let m = oracle_module(3);
    for k in 0..m.families.len() {
        let mut bad = m.clone();
        bad.families[k].b += 1;
        assert!(bad.check_ainf_up_to(12).is_err(), "family {k} with one more U passes");
    }
}

mod cables {
    use serde_json::{json, Value};
    use tubecert_format::{Body, Claim};
    use tubecert_tests::alexander::{self, mul, substitute_power, Poly};
    use tubecert_tests::{minus_ring, prove_value, seal};

    /// The certificate body of `cable p q of SOURCE` with a τ goal, all claims checked.
    fn cable(src: &Value, p: i64, q: i64) -> Body {
        let problem = json!({"format": "tubecert-problem", "version": 1, "ring": minus_ring(),
            "complexes": {"K": {"cable": {"companion": src, "p": p, "q": q}}},
            "goals": [{"tau": {"complex": "K"}}, {"homology": {"complex": "K"}}]});
        let body = prove_value(&problem).certificate.body;
        let r = tubecheck::check_bytes("test", &seal(body.clone())).unwrap();
        for c in r.claims {
            assert!(c.outcome.is_ok(), "cable {p} {q}: {} fails: {:?}", c.kind, c.outcome);
        }
        body
    }

    fn tau_of(b: &Body) -> i64 {
        b.claims.iter().find_map(|c| if let Claim::Tau { tau, .. } = c { Some(*tau) } else { None }).unwrap()
    }

    /// Σ (−1)^M t^A over the generators of the cable's complex: the graded Euler characteristic
    /// of its hat homology.
    fn euler(b: &Body) -> Poly {
        alexander::euler(b.complexes["K"].generators.values().map(|g| g.as_slice()))
    }

    /// (name, source, τ, ε, Δ) of the companions: the unknot (ε = 0), T(2,3) and T(3,4)
    /// (L-space knots with τ > 0, ε = 1), the mirror of T(2,3) (ε = −1) — ε from Hom 2014
    /// (recalled from memory), τ(T(p,q)) = (p−1)(q−1)/2 (Ozsváth–Szabó 2003), Δ computed by
    /// `tubecert_tests::alexander`.
    fn companions() -> Vec<(&'static str, Value, i64, i64, Poly)> {
        let t23 = json!({"staircase": {"torus_knot": [2, 3]}});
        vec![
            ("unknot", json!({"staircase": {"alexander": [0]}}), 0, 0, alexander::torus(2, 1)),
            ("T(2,3)", t23.clone(), 1, 1, alexander::torus(2, 3)),
            ("mirror T(2,3)", json!({"dual": t23}), -1, -1, alexander::torus(2, 3)),
            ("T(3,4)", json!({"staircase": {"torus_knot": [3, 4]}}), 3, 1, alexander::torus(3, 4)),
        ]
    }

    /// Companions that are not L-space knots, for τ and χ only: T(2,3) # T(2,3) as the T(2,5)
    /// staircase beside a square at (−2, −2) (its complex up to homotopy, recalled from memory;
    /// τ = 2, ε = 1 (Hom 2014), Δ = (t − 1 + t⁻¹)²), its mirror (ε = −1), and the figure-eight's
    /// shape, a square beside a point (τ = 0, ε = 0: the point splits off, as for K # mirror K,
    /// whose tensor basis is not simultaneously simplified and so is not reachable as a companion;
    /// Δ = −t + 3 − t⁻¹, the figure-eight's, recalled from memory).
    fn more_companions() -> Vec<(&'static str, Value, i64, i64, Poly)> {
        let square = |m: i64| {
            json!({"generators": {"a": [m, m], "b": [m + 1, m - 1], "c": [m - 1, m + 1], "d": [m, m]},
                   "differential": [["a", "U", "b"], ["a", "V", "c"], ["b", "V", "d"], ["c", "U", "d"]]})
        };
        let sum = json!({"direct_sum": [{"staircase": {"alexander": [2, 1, 0, -1, -2]}}, square(-2)]});
        let point = json!({"staircase": {"alexander": [0]}});
        let trefoil_squared = mul(&alexander::torus(2, 3), &alexander::torus(2, 3));
        vec![
            ("T(2,3) # T(2,3)", sum.clone(), 2, 1, trefoil_squared.clone()),
            ("mirror of T(2,3) # T(2,3)", json!({"dual": sum}), -2, -1, trefoil_squared),
            (
                "figure-eight shape",
                json!({"direct_sum": [point, square(0)]}),
                0,
                0,
                Poly::from([(-1, -1), (0, 3), (1, -1)]),
            ),
        ]
    }

    fn free_of(b: &Body) -> Vec<Vec<i64>> {
        b.claims
            .iter()
            .find_map(|c| if let Claim::Homology { free, .. } = c { Some(free.clone()) } else { None })
            .unwrap()
    }

    /// τ from Hom 2014 ("Bordered Heegaard Floer homology and the τ-invariant of cable knots",
    /// J. Topology): ε(K) = 1: τ(K_{p,q}) = pτ(K) + (p−1)(q−1)/2; ε(K) = −1:
    /// pτ(K) + (p−1)(q+1)/2; ε(K) = 0: τ(T(p,q)) (τ(T(p,q)) = (p−1)(q−1)/2 for q > 0,
    /// Ozsváth–Szabó 2003, and τ(mirror) = −τ).
    fn hom_tau(tau: i64, eps: i64, p: i64, q: i64) -> i64 {
        match eps {
            1 => p * tau + (p - 1) * (q - 1) / 2,
            -1 => p * tau + (p - 1) * (q + 1) / 2,
            _ if q > 0 => (p - 1) * (q - 1) / 2,
            _ => (p - 1) * (q + 1) / 2,
        }
    }

    // τ of cables (Hom 2014, `hom_tau`) at framings n = −2 … 2 (Q = Pn + 1, negative Q
    // included). The graded Euler characteristic of the cable's hat homology is
    // Δ_K(t^p)·Δ_{T(p,q)}(t) (Seifert 1950, "On the homology invariants of knots", Quart. J.
    // Math. Oxford; the formula for satellites), which tests every generator's
    // absolute (Maslov, Alexander) grading. HFK^- of a knot in S³ has one tower F2[U], generated
    // in grading (M, A) = (−2τ, −τ) (Ozsváth–Szabó 2003, τ from the tower; d(S³) = 0): on the
    // line M = 2A, which the symmetric normalization keeps (it moves by multiples of (2, 1)).
    /// The (p, q) cable of `companion` and `model`/(V) (the V = 0 quotient of an F2[U,V] model)
    /// have equal bigraded homology, both claims verified in one certificate.
    fn assert_cable_homology_is(companion: &Value, p: i64, q: i64, model: Value, what: &str) {
        let problem = json!({"format": "tubecert-problem", "version": 1,
            "ring": minus_ring(),
            "complexes": {
                "K": {"cable": {"companion": companion, "p": p, "q": q}},
                "S": {"quotient": [model, "V"]}},
            "goals": [{"homology": {"complex": "K"}}, {"homology": {"complex": "S"}}]});
        let proved = prove_value(&problem);
        let claims = tubecert_tests::verified_claims(&proved);
        let homology = |c: &str| {
            let h = claims.iter().find(|x| x["kind"] == "homology" && x["complex"] == c).unwrap();
            (h["free"].clone(), h["torsion"].clone())
        };
        assert_eq!(homology("K"), homology("S"), "{what}");
    }

    /// τ (Hom 2014, `hom_tau`), the graded Euler characteristic Δ_K(t^p)·Δ_{T(p,q)}(t) (Seifert)
    /// and the one tower of HFK^- at (−2τ, −τ) (Ozsváth–Szabó 2003) of the (p, q) cable.
    fn assert_cable_facts(name: &str, src: &Value, tau: i64, eps: i64, delta: &Poly, p: i64, q: i64) {
        let b = cable(src, p, q);
        let want = hom_tau(tau, eps, p, q);
        assert_eq!(tau_of(&b), want, "τ of the ({p},{q}) cable of {name}");
        let seifert = mul(&substitute_power(delta, p), &alexander::torus(p, q));
        assert_eq!(euler(&b), seifert, "Euler characteristic of the ({p},{q}) cable of {name}");
        assert_eq!(free_of(&b), vec![vec![-2 * want, -want]], "the tower of the ({p},{q}) cable of {name}");
    }

    #[test]
    fn tau_and_alexander_polynomials_of_cables() {
        for (name, src, tau, eps, delta) in companions().into_iter().chain(more_companions()) {
            for p in 2..=3i64 {
                for n in -2..=2i64 {
                    assert_cable_facts(name, &src, tau, eps, &delta, p, p * n + 1);
                }
            }
        }
    }

    // Cables with Q ≢ 1 mod P, from the (P, r) patterns' own diagrams (r = Q mod P in 2 … P − 1,
    // framing n = (Q − r)/P), positive and negative Q, companions with ε = 0, 1, −1: τ from Hom
    // 2014 (`hom_tau`), the graded Euler characteristic Δ_K(t^p)·Δ_{T(p,q)}(t) (Seifert's formula
    // for satellites), and the one tower F2[U] of HFK^- at (M, A) = (−2τ, −τ) (Ozsváth–Szabó 2003).
    #[test]
    fn tau_and_alexander_polynomials_of_cables_with_q_not_1_mod_p() {
        let pq = [(3, 2), (3, -1), (3, 5), (3, -4), (4, 3), (4, -1), (4, -5), (5, 2), (5, -3), (5, 4), (5, -7)];
        for (name, src, tau, eps, delta) in companions().into_iter().chain(more_companions().into_iter().take(2)) {
            for (p, q) in pq {
                if name != "T(2,3)" && p == 5 && q != 2 && q != -3 {
                    continue; // P = 5: all residues on T(2,3), two on the others (time)
                }
                assert_cable_facts(name, &src, tau, eps, &delta, p, q);
            }
        }
    }

    // Every cable of the unknot is a torus knot: the (P, Q) cable of the unknot is T(P, Q), whose
    // complex is the staircase of its Alexander polynomial for Q > 0 (an L-space knot,
    // Ozsváth–Szabó 2005) and the dual of that staircase for Q < 0 (the mirror, CFK(mirror K) ≃
    // CFK(K)^∨). Over F2[U] free complexes with equal bigraded homology are homotopy equivalent,
    // so equal homology claims in one certificate certify it.
    #[test]
    fn cables_of_the_unknot_are_torus_knots() {
        for (p, q) in [(3, 2), (3, 5), (3, -2), (4, 3), (4, -3), (5, 2), (5, 3), (5, -4)] {
            let delta = alexander::torus(p, q);
            let exponents: Vec<i64> = delta.keys().rev().copied().collect();
            let stair = json!({"staircase": {"alexander": exponents}});
            let model = if q > 0 { stair } else { json!({"dual": stair}) };
            let unknot = json!({"staircase": {"alexander": [0]}});
            assert_cable_homology_is(
                &unknot,
                p,
                q,
                model,
                &format!("({p},{q}) cable of the unknot against T({p},{q})"),
            );
        }
    }

    // The (P, 1) cables of the unknot, and its (2, −1) cable, are T(P, ±1) = the unknot: HFK^- is
    // one tower F2[U] in (0, 0), no torsion, χ = 1 (the other Q ≡ 1 mod P give T(P, Q), above).
    #[test]
    fn the_p_plus_minus_one_cables_of_the_unknot_are_the_unknot() {
        let unknot = json!({"staircase": {"alexander": [0]}});
        for (p, q) in [(2, 1), (3, 1), (4, 1), (5, 1), (2, -1)] {
            let b = cable(&unknot, p, q);
            let torsion = b.claims.iter().find_map(|c| {
                if let Claim::Homology { torsion, .. } = c {
                    Some(torsion.len())
                } else {
                    None
                }
            });
            assert_eq!((free_of(&b), torsion), (vec![vec![0, 0]], Some(0)), "({p},{q}) cable of the unknot");
            assert_eq!(euler(&b), Poly::from([(0, 1)]), "({p},{q}) cable of the unknot");
        }
    }

    // Cross-check of the normalization by the mathematics of the pattern: pairing the (p, 1)
    // pattern with the complement at framing t adds t full twists on p strands, and the raw
    // reading from the double coset is off by exactly c·(2, 1), c = t·p(p−1)/2 (derived here:
    // a full twist on p strands has p(p−1) crossings, half of them raising A; zero for the
    // core and t = 0). The symmetric normalization must remove exactly that.
    #[test]
    fn the_normalization_removes_the_twisting_offset() {
        use tubecert::bordered as bd;
        use tubecheck::bordered as ck;
        let full = tubecert_format::bordered::full_ring();
        for (name, src, ..) in companions() {
            let c = bd::inline_source(&full, &src, &Default::default(), 0).unwrap();
            for p in 1..=4usize {
                for t in -3..=3i64 {
                    let (d, _, _) = bd::complement_of("C", &c, t).unwrap();
                    let m = bd::cable_pattern(p as i64).unwrap();
                    let (ma, nd) =
                        (ck::read_module("M", &m, true).unwrap(), ck::read_structure("N", &d, true).unwrap());
                    let (raw, norm) =
                        (ck::generators(&ma, &nd, false).unwrap(), ck::generators(&ma, &nd, true).unwrap());
                    let off = t * (p * (p - 1) / 2) as i64;
                    for (r, n) in raw.iter().zip(&norm) {
                        assert_eq!(r.2, n.2);
                        assert_eq!(
                            (r.3[0] - n.3[0], r.3[1] - n.3[1]),
                            (2 * off, off),
                            "{name}, p = {p}, t = {t}, {}",
                            r.2
                        );
                    }
                }
            }
        }
    }

    /// The raw pairing (P, 1) pattern ⊠ complement at framing n (the (p, pn + 1) cable) by the
    /// producer's library: its hat rank (U = 0) over F2, and its rank over F2[U, U⁻¹] (towers).
    fn raw_ranks(src: &Value, p: usize, n: i64) -> (usize, usize) {
        use tubecert::bordered as b;
        let full = tubecert_format::bordered::full_ring();
        let c = b::inline_source(&full, src, &Default::default(), 0).unwrap();
        let (d, _, _) = b::complement_of("C", &c, n).unwrap();
        let m = b::diagram::cable_module(p).unwrap().module;
        let (k, _, _) = b::box_tensor(&m, &d).unwrap();
        let names: Vec<&String> = k.generators.keys().collect();
        let at = |x: &String| names.iter().position(|y| *y == x).unwrap();
        let rank = |keep: &dyn Fn(&str) -> bool| {
            let mut rows = vec![vec![false; names.len()]; names.len()];
            for [a, pw, b] in &k.differential {
                if keep(pw) {
                    rows[at(a)][at(b)] ^= true;
                }
            }
            let mut r = 0;
            for col in 0..names.len() {
                if let Some(i) = (r..names.len()).find(|&i| rows[i][col]) {
                    rows.swap(r, i);
                    let pivot = rows[r].clone();
                    for (i2, row) in rows.iter_mut().enumerate() {
                        if i2 != r && row[col] {
                            row.iter_mut().zip(&pivot).for_each(|(x, y)| *x ^= *y);
                        }
                    }
                    r += 1;
                }
            }
            names.len() - 2 * r
        };
        // Over F2[U, U⁻¹] every power of U is a unit: the rank of ∂ with all terms, for a
        // complex whose U-powers are homogeneous, equals the rank over F2 with U = 1.
        (rank(&|pw: &str| pw == "1"), rank(&|_: &str| true))
    }

    // L-space cables: K_{p,q} is an L-space knot when K is one and q ≥ p(2g(K) − 1) (Hedden 2009,
    // "On knot Floer homology and cabling II", IMRN; Hom 2011, "A note on cabling and L-space
    // surgeries", Algebr. Geom. Topol. 11); an L-space knot's hat homology has rank
    // the number of terms of its Alexander polynomial (Ozsváth–Szabó 2005), and HFK^- has one
    // tower F2[U]. The cables of the unknot are the torus knots T(p, q): L-space knots for
    // q > 0, mirrors of them for q < 0 (same rank). Ranks of the raw pairing at every framing.
    #[test]
    fn l_space_cables_have_the_rank_of_their_alexander_polynomial() {
        for (name, src, _, eps, delta) in companions() {
            // g(K) is Δ's top exponent for these L-space knots (their staircase, Ozsváth–Szabó
            // 2005; knot Floer homology detects the genus, Ozsváth–Szabó 2004, "Holomorphic disks
            // and genus bounds", Geom. Topol. 8).
            let g = delta.keys().max().copied().unwrap_or(0);
            for p in 2..=4i64 {
                for n in -2..=2i64 {
                    let q = p * n + 1;
                    let l_space = match eps {
                        0 => true,
                        1 => q >= p * (2 * g - 1),
                        _ => -q >= p * (2 * g - 1),
                    };
                    let (hat, towers) = raw_ranks(&src, p as usize, n);
                    assert_eq!(towers, 1, "towers of the ({p},{q}) cable of {name}");
                    if l_space {
                        let terms = mul(&substitute_power(&delta, p), &alexander::torus(p, q)).len();
                        assert_eq!(hat, terms, "hat rank of the ({p},{q}) cable of {name}");
                    }
                }
            }
        }
    }

    #[test]
    fn l_space_cables_have_the_staircase_of_their_alexander_polynomial() {
        // Hedden 2009 ("On knot Floer homology and cabling II") and Hom 2011: for a non-trivial L-space
        // knot K and q ≥ p(2g(K) − 1), K_{p,q} is an L-space knot, so its complex is the staircase of
        // Δ_K(t^p)·Δ_{T(p,q)}(t) (Seifert 1950; staircases: Ozsváth–Szabó 2005). Over F2[U] (a graded
        // PID) free complexes with the same bigraded homology are homotopy equivalent, so equal
        // homology claims on the cable and the staircase's V = 0 quotient, in one certificate, certify it.
        for (k, g, p, q) in
            [((2, 3), 1, 2, 3), ((2, 3), 1, 2, 5), ((2, 3), 1, 3, 4), ((2, 3), 1, 3, 7), ((3, 4), 3, 2, 11)]
                .into_iter()
                // Q ≢ 1 mod P, from the (P, r) patterns' own diagrams.
                .chain([((2, 3), 1, 3, 5), ((2, 3), 1, 4, 7), ((2, 3), 1, 5, 7), ((2, 3), 1, 5, 8), ((3, 4), 3, 3, 17)])
        {
            assert!(q >= p * (2 * g - 1));
            let delta = mul(&substitute_power(&alexander::torus(k.0, k.1), p), &alexander::torus(p, q));
            assert!(delta.values().all(|c| c.abs() == 1), "an L-space knot's Δ has coefficients ±1");
            let exponents: Vec<i64> = delta.keys().rev().copied().collect();
            let companion = json!({"staircase": {"torus_knot": [k.0, k.1]}});
            let model = json!({"staircase": {"alexander": exponents}});
            assert_cable_homology_is(
                &companion,
                p,
                q,
                model,
                &format!("({p},{q}) cable of T{k:?}: Δ exponents {exponents:?}"),
            );
        }
    }
}
