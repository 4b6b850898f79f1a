//! Published facts about torus knots and L-space knots, checked through the whole pipeline:
//! construction → search → certificate → checker.

use serde_json::json;
use tubecert_tests::{minus_ring, prove_value, verified_claims};

/// Proves goals about named complexes over `F2[U]` and returns the verified claims.
fn claims(complexes: serde_json::Value, goals: serde_json::Value) -> Vec<serde_json::Value> {
    let p = json!({"format": "tubecert-problem", "version": 1, "ring": minus_ring(), "complexes": complexes, "goals": goals});
    verified_claims(&prove_value(&p))
}

const TORUS_KNOTS: [(u32, u32); 9] = [(2, 3), (2, 5), (2, 7), (2, 9), (3, 4), (3, 5), (3, 7), (4, 5), (5, 6)];

#[test]
fn tau_of_positive_torus_knots() {
    // τ(T(p,q)) = (p−1)(q−1)/2 (Ozsváth–Szabó 2003, "Knot Floer homology and the four-ball genus").
    for (p, q) in TORUS_KNOTS {
        let c = claims(json!({"T": {"staircase": {"torus_knot": [p, q]}}}), json!([{"tau": {"complex": "T"}}]));
        assert_eq!(c[0]["tau"], json!((p - 1) * (q - 1) / 2), "T({p},{q})");
    }
}

#[test]
fn torsion_order_of_torus_knots() {
    // Ord_U(T(p,q)) = p − 1 for 2 ≤ p < q (Juhász–Miller–Zemke 2020, "Knot cobordisms, bridge
    // index, and torsion in Floer homology").
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
    // Δ_{T(3,4)} = t^3 − t^2 + 1 − t^−2 + t^−3 (Ozsváth–Szabó 2005, L-space knots): torsion
    // order 2 = p − 1 (Juhász–Miller–Zemke 2020) and the free part generated in Alexander
    // grading −3, i.e. τ = 3 (Ozsváth–Szabó 2003).
    let c = claims(
        json!({"T": {"staircase": {"alexander": [3, 2, 0, -2, -3]}}}),
        json!([{"torsion_order_of_complex": {"complex": "T", "variable": "U"}}, {"homology": {"complex": "T"}}, {"tau": {"complex": "T"}}]),
    );
    assert_eq!(c[0]["order"], json!(2));
    assert_eq!(c[1]["free"].as_array().unwrap().len(), 1);
    assert_eq!(c[1]["free"][0][1], json!(-3));
    assert_eq!(c[2]["tau"], json!(3));
}

#[test]
fn hat_rank_counts_alexander_terms() {
    // For an L-space knot, rank HFK-hat = number of non-zero terms of Δ (Ozsváth–Szabó 2005).
    let hat = json!({"variables": [], "gradings": ["maslov", "alexander"], "variable_degrees": {}, "differential_degree": [-1, 0]});
    for (p, q) in TORUS_KNOTS {
        let terms = tubecert::construct::torus_knot_exponents(p, q).unwrap().len();
        let problem = json!({"format": "tubecert-problem", "version": 1, "ring": hat,
            "complexes": {"T": {"staircase": {"torus_knot": [p, q]}}}, "goals": [{"homology": {"complex": "T"}}]});
        let c = verified_claims(&prove_value(&problem));
        assert_eq!(c[0]["free"].as_array().unwrap().len(), terms, "T({p},{q})");
    }
}

#[test]
fn tau_is_additive_and_odd_under_mirroring() {
    // τ(K1 # K2) = τ(K1) + τ(K2), τ(mirror K) = −τ(K) (Ozsváth–Szabó 2003), with connected sum
    // as tensor product and mirror as dual (Ozsváth–Szabó, Künneth and duality).
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
    // (Ozsváth–Szabó; CONVENTIONS): τ from the quotient agrees with τ(T(p,q)) = (p−1)(q−1)/2,
    // and the hat rank with the number of terms of Δ (Ozsváth–Szabó 2005).
    for (p, q) in [(2, 5), (3, 4), (3, 5)] {
        let c = claims(
            json!({"T": {"quotient": [{"staircase": {"torus_knot": [p, q]}}, "V"]}}),
            json!([{"tau": {"complex": "T"}}]),
        );
        assert_eq!(c[0]["tau"], json!((p - 1) * (q - 1) / 2), "T({p},{q})");
        let hat = json!({"variables": [], "gradings": ["maslov", "alexander"], "variable_degrees": {}, "differential_degree": [-1, 0]});
        let problem = json!({"format": "tubecert-problem", "version": 1, "ring": hat,
            "complexes": {"T": {"quotient": [{"staircase": {"torus_knot": [p, q]}}, "U", "V"]}}, "goals": [{"homology": {"complex": "T"}}]});
        let c = verified_claims(&prove_value(&problem));
        let terms = tubecert::construct::torus_knot_exponents(p, q).unwrap().len();
        assert_eq!(c[0]["free"].as_array().unwrap().len(), terms, "T({p},{q})");
    }
}
