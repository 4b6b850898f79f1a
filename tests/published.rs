//! Published facts about torus knots and L-space knots, checked through the whole pipeline:
//! construction → search → certificate → checker. Sources, cited beside each check:
//! - OS 2003 = Ozsváth–Szabó, "Knot Floer homology and the four-ball genus", Geom. Topol. 7
//!   (2003): τ, τ(T(p,q)) = (p−1)(q−1)/2 for positive torus knots, τ additive and odd under
//!   mirroring.
//! - OS 2004 = Ozsváth–Szabó, "Holomorphic disks and knot invariants", Adv. Math. 186 (2004):
//!   the Künneth formula for connected sums, CFK(mirror K) ≃ CFK(K)^∨, and χ(HFK-hat) = Δ
//!   (the paper attribution recalled from memory).
//! - OS 2005 = Ozsváth–Szabó, "On knot Floer homology and lens space surgeries", Topology 44
//!   (2005): the staircase complex of an L-space knot; torus knots are L-space knots.
//! - JMZ 2020 = Juhász–Miller–Zemke, "Knot cobordisms, bridge index, and torsion in Floer
//!   homology", J. Topol. (2020): Ord_U(T(p,q)) = p − 1, Ord_U(K) ≤ br(K) − 1.
//!
//! Expected values come from the formulas (and, for Δ, from `tubecert_tests::alexander`, the
//! tests' own computation), never from the producer's constructions.

use serde_json::json;
use tubecert_tests::alexander::{self, Poly};
use tubecert_tests::{minus_ring, prove_value, verified_claims};

/// Proves goals about named complexes over `F2[U]` and returns the verified claims.
fn claims(complexes: serde_json::Value, goals: serde_json::Value) -> Vec<serde_json::Value> {
    let p = json!({"format": "tubecert-problem", "version": 1, "ring": minus_ring(), "complexes": complexes, "goals": goals});
    verified_claims(&prove_value(&p))
}

const TORUS_KNOTS: [(u32, u32); 9] = [(2, 3), (2, 5), (2, 7), (2, 9), (3, 4), (3, 5), (3, 7), (4, 5), (5, 6)];

#[test]
fn tau_of_positive_torus_knots() {
    // τ(T(p,q)) = (p−1)(q−1)/2 (OS 2003, "Knot Floer homology and the four-ball genus"); HFK^- is
    // F2[U] ⊕ torsion with the tower generated at (M, A) = (−2τ, −τ) (OS 2003, conventions sheet).
    for (p, q) in TORUS_KNOTS {
        let c = claims(
            json!({"T": {"staircase": {"torus_knot": [p, q]}}}),
            json!([{"tau": {"complex": "T"}}, {"homology": {"complex": "T"}}]),
        );
        let tau = (p - 1) * (q - 1) / 2;
        assert_eq!(c[0]["tau"], json!(tau), "T({p},{q})");
        let tau = i64::from(tau);
        assert_eq!(c[1]["free"], json!([[-2 * tau, -tau]]), "T({p},{q}): the one tower");
    }
}

#[test]
fn torsion_order_of_torus_knots() {
    // Ord_U(T(p,q)) = p − 1 for 2 ≤ p < q (JMZ 2020, "Knot cobordisms, bridge index, and torsion
    // in Floer homology").
    for (p, q) in TORUS_KNOTS {
        let c = claims(
            json!({"T": {"staircase": {"torus_knot": [p, q]}}}),
            json!([{"torsion_order_of_complex": {"complex": "T", "variable": "U"}}]),
        );
        assert_eq!(c[0]["order"], json!(p - 1), "T({p},{q})");
    }
}

#[test]
fn t34_from_its_alexander_polynomial() {
    // Δ_{T(3,4)} = t^3 − t^2 + 1 − t^−2 + t^−3 (the conventions sheet's formula, expanded by hand;
    // the staircase of an L-space knot, OS 2005): torsion order 2 = p − 1 (JMZ 2020) and the free
    // part generated in Alexander grading −3, i.e. τ = 3 (OS 2003).
    let c = claims(
        json!({"T": {"staircase": {"alexander": [3, 2, 0, -2, -3]}}}),
        json!([{"torsion_order_of_complex": {"complex": "T", "variable": "U"}}, {"homology": {"complex": "T"}}, {"tau": {"complex": "T"}}]),
    );
    assert_eq!(c[0]["order"], json!(2));
    assert_eq!(c[1]["free"].as_array().unwrap().len(), 1);
    assert_eq!(c[1]["free"][0][1], json!(-3));
    assert_eq!(c[2]["tau"], json!(3));
}

/// The hat homology's free generators (M, A) of the complex T over F2 (U = V = 0), among the
/// given complexes, checker-verified.
fn hat_homology(complexes: serde_json::Value) -> Vec<Vec<i64>> {
    let hat = json!({"variables": [], "gradings": ["maslov", "alexander"], "variable_degrees": {}, "differential_degree": [-1, 0]});
    let problem = json!({"format": "tubecert-problem", "version": 1, "ring": hat,
        "complexes": complexes, "goals": [{"homology": {"complex": "T"}}]});
    let c = verified_claims(&prove_value(&problem));
    serde_json::from_value(c[0]["free"].clone()).unwrap()
}

/// HFK-hat of T(p, q) as the sorted (M, A) of its basis: one generator per non-zero term of Δ,
/// at the gradings of the staircase (L-space knots, OS 2005; the conventions sheet's rule
/// gr_U(x_0) = 0, gr_U(x_i) = gr_U(x_{i−1}) + 1 − 2(a_{i−1} − a_i) for odd i, gr_U(x_{i+1}) =
/// gr_U(x_i) − 1, with M = gr_U); Δ from the tests' own computation.
fn torus_knot_hat(p: i64, q: i64) -> Vec<Vec<i64>> {
    let a: Vec<i64> = alexander::torus(p, q).keys().rev().copied().collect();
    let mut m = 0;
    let mut out = vec![vec![0, a[0]]];
    for i in 1..a.len() {
        m += if i % 2 == 1 { 1 - 2 * (a[i - 1] - a[i]) } else { -1 };
        out.push(vec![m, a[i]]);
    }
    out.sort();
    out
}

/// Checks HFK-hat of T(p, q) given as (M, A) of its basis: the rank is the number of non-zero
/// terms of Δ and the gradings are the staircase's (`torus_knot_hat`), and Σ(−1)^M t^A =
/// Δ_{T(p,q)} (χ(HFK-hat) = Δ, OS 2004).
fn assert_hat_is_that_of_torus_knot(free: &[Vec<i64>], p: i64, q: i64) {
    let delta: Poly = alexander::torus(p, q);
    assert_eq!(free.len(), delta.len(), "T({p},{q}): rank of HFK-hat");
    assert_eq!(alexander::euler(free.iter().map(|g| g.as_slice())), delta, "T({p},{q}): χ(HFK-hat)");
    let mut got = free.to_vec();
    got.sort();
    assert_eq!(got, torus_knot_hat(p, q), "T({p},{q}): (M, A) of HFK-hat");
}

#[test]
fn hat_rank_counts_alexander_terms() {
    for (p, q) in TORUS_KNOTS {
        let free = hat_homology(json!({"T": {"staircase": {"torus_knot": [p, q]}}}));
        assert_hat_is_that_of_torus_knot(&free, p.into(), q.into());
    }
}

#[test]
fn tau_is_additive_and_odd_under_mirroring() {
    // τ(K1 # K2) = τ(K1) + τ(K2), τ(mirror K) = −τ(K) (OS 2003), with connected sum as tensor
    // product and mirror as dual (OS 2004, Künneth formula and duality; recalled from memory).
    // τ(T(2,5)) = 2, τ(T(3,4)) = 3 by (p−1)(q−1)/2.
    let c = claims(
        json!({"A": {"staircase": {"torus_knot": [2, 5]}}, "B": {"staircase": {"torus_knot": [3, 4]}},
               "AB": {"tensor": ["A", "B"]}, "mA": {"dual": "A"}, "ABmA": {"tensor": ["AB", "mA"]}}),
        json!([{"tau": {"complex": "AB"}}, {"tau": {"complex": "mA"}}, {"tau": {"complex": "ABmA"}}]),
    );
    assert_eq!(c[0]["tau"], json!(2 + 3));
    assert_eq!(c[1]["tau"], json!(-2));
    assert_eq!(c[2]["tau"], json!(3));
}

#[test]
fn full_staircase_of_the_trefoil() {
    // CONVENTIONS: T(2,3) over F2[U,V]: x_0 (0,−2), x_1 (−1,−1), x_2 (−2,0), ∂x_1 = U x_0 + V x_2.
    let ring = json!({"variables": ["U", "V"], "gradings": ["gr_U", "gr_V"], "variable_degrees": {"U": [-2, 0], "V": [0, -2]}, "differential_degree": [-1, -1]});
    let w = tubecert::problem::from_written(
        serde_json::from_value(json!({"format": "tubecert-problem", "version": 1, "ring": ring, "complexes": {"T": {"staircase": {"torus_knot": [2, 3]}}}})).unwrap(),
    )
    .unwrap();
    let t = &w.complexes["T"];
    assert_eq!(t.generators["x0"], vec![0, -2]);
    assert_eq!(t.generators["x1"], vec![-1, -1]);
    assert_eq!(t.generators["x2"], vec![-2, 0]);
    assert_eq!(
        t.differential,
        vec![["x1".to_string(), "U".into(), "x0".into()], ["x1".into(), "V".into(), "x2".into()]]
    );
}

#[test]
fn quotients_of_the_full_staircase() {
    // Setting V = 0 in CFK over F2[U,V] gives the minus version, and U = V = 0 the hat version
    // (conventions sheet): τ from the quotient agrees with τ(T(p,q)) = (p−1)(q−1)/2 (OS 2003),
    // and the hat homology has the rank and Euler characteristic of Δ (OS 2005, OS 2004).
    for (p, q) in [(2, 5), (3, 4), (3, 5)] {
        let c = claims(
            json!({"T": {"quotient": [{"staircase": {"torus_knot": [p, q]}}, "V"]}}),
            json!([{"tau": {"complex": "T"}}]),
        );
        assert_eq!(c[0]["tau"], json!((p - 1) * (q - 1) / 2), "T({p},{q})");
        let free = hat_homology(json!({"T": {"quotient": [{"staircase": {"torus_knot": [p, q]}}, "U", "V"]}}));
        assert_hat_is_that_of_torus_knot(&free, p.into(), q.into());
    }
}

#[test]
fn mirrors_as_duals_commute_with_setting_v_to_zero() {
    // Quotienting by V and dualizing commute for free complexes (conventions sheet), so the mirror
    // read both ways has one homology; τ(mirror T(p,q)) = −(p−1)(q−1)/2 (OS 2003).
    for (p, q) in [(2, 3), (3, 4), (3, 5)] {
        let stair = json!({"staircase": {"torus_knot": [p, q]}});
        let c = claims(
            json!({"A": {"quotient": [{"dual": stair}, "V"]}, "Q": {"quotient": [stair, "V"]}, "B": {"dual": "Q"}}),
            json!([{"homology": {"complex": "A"}}, {"homology": {"complex": "B"}}, {"tau": {"complex": "A"}}, {"tau": {"complex": "B"}}]),
        );
        assert_eq!((&c[0]["free"], &c[0]["torsion"]), (&c[1]["free"], &c[1]["torsion"]), "T({p},{q})");
        let tau = -i64::from((p - 1) * (q - 1) / 2);
        assert_eq!((&c[2]["tau"], &c[3]["tau"]), (&json!(tau), &json!(tau)), "T({p},{q})");
    }
}

#[test]
fn torsion_order_of_connected_sums_of_torus_knots() {
    // By the Künneth formula over F2[U] (kunneth.rs) HFK^-(K1 # K2) holds the torsion summands of
    // each factor (tensored with the other's tower), and torsion ⊗ torsion or Tor gives orders
    // min(a, b): so Ord_U(K1 # K2) = max(Ord_U(K1), Ord_U(K2)) (derived here), with Ord_U(T(p,q))
    // = p − 1 (JMZ 2020). It stays within JMZ 2020's bound Ord_U(K) ≤ br(K) − 1
    // (recalled from memory), with br(T(p,q)) = min(p, q) and br(K1 # K2) = br(K1) + br(K2) − 1
    // (Schubert 1954, "Über eine numerische Knoteninvariante", Math. Z.; recalled from memory).
    for [(p1, q1), (p2, q2)] in [[(2u32, 5u32), (3, 4)], [(3, 4), (2, 3)], [(3, 4), (4, 5)], [(2, 3), (2, 5)]] {
        let c = claims(
            json!({"A": {"staircase": {"torus_knot": [p1, q1]}}, "B": {"staircase": {"torus_knot": [p2, q2]}},
                   "AB": {"tensor": ["A", "B"]}}),
            json!([{"torsion_order_of_complex": {"complex": "AB", "variable": "U"}}]),
        );
        let order = c[0]["order"].as_u64().unwrap();
        assert_eq!(order, u64::from((p1 - 1).max(p2 - 1)), "T({p1},{q1}) # T({p2},{q2})");
        assert!(order < u64::from(p1.min(q1) + p2.min(q2) - 1), "T({p1},{q1}) # T({p2},{q2}): bridge bound");
    }
}

#[test]
fn hat_homology_of_connected_sums_of_torus_knots() {
    // HFK-hat(K1 # K2) ≅ HFK-hat(K1) ⊗ HFK-hat(K2) over F2, gradings adding (OS 2004, Künneth
    // formula for connected sums; recalled from memory), so the basis gradings are the pairwise
    // sums of the factors' staircase gradings, and χ = Δ_{K1}·Δ_{K2} (Δ multiplicative under
    // connected sum; e.g. Rolfsen, "Knots and Links", 1976; recalled from memory).
    for [(p1, q1), (p2, q2)] in [[(2, 3), (2, 3)], [(2, 5), (3, 4)], [(3, 4), (3, 5)]] {
        let free = hat_homology(json!({"A": {"staircase": {"torus_knot": [p1, q1]}},
            "B": {"staircase": {"torus_knot": [p2, q2]}}, "T": {"tensor": ["A", "B"]}}));
        let mut want: Vec<Vec<i64>> = Vec::new();
        for g in torus_knot_hat(p1, q1) {
            want.extend(torus_knot_hat(p2, q2).iter().map(|h| vec![g[0] + h[0], g[1] + h[1]]));
        }
        want.sort();
        let mut got = free.clone();
        got.sort();
        assert_eq!(got, want, "T({p1},{q1}) # T({p2},{q2}): (M, A) of HFK-hat");
        let delta = alexander::mul(&alexander::torus(p1, q1), &alexander::torus(p2, q2));
        assert_eq!(alexander::euler(free.iter().map(|g| g.as_slice())), delta, "T({p1},{q1}) # T({p2},{q2}): χ");
    }
}
