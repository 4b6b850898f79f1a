//! The Künneth formula over the PID `F2[U]` for tensor products of random complexes: the
//! homology of C ⊗ D is ⊕ H(C) ⊗ H(D) ⊕ Tor(H(C), H(D)) shifted, summand by summand:
//! R⟨g⟩⊗R⟨h⟩ = R⟨g+h⟩; R⟨g⟩⊗R/(U^k)⟨h⟩ = R/(U^k)⟨g+h⟩; R/(U^a)⟨g⟩⊗R/(U^b)⟨h⟩ gives
//! R/(U^min)⟨g+h⟩ and, from Tor, R/(U^min)⟨g + h + max·deg U − deg ∂⟩
//! (Künneth formula for chain complexes of free modules over a PID: Hatcher, Algebraic Topology,
//! Cambridge University Press 2002, §3.B, Theorem 3B.5 — theorem number recalled from memory).
//! The Tor shift is derived here: for ∂s = U^a·b and ∂s′ = U^c·b′ with a ≤ c, the cycle
//! b⊗s′ + U^{c−a}·s⊗b′ sits in the grading of b⊗s′, i.e. g + h + c·deg U − deg ∂, and
//! ∂(s⊗s′) = U^a times it.

use proptest::prelude::*;
use serde_json::json;
use tubecert_tests::{minus_ring, planted_complex, prove_value, verified_claims, Block};

fn block() -> impl Strategy<Value = Block> {
    prop_oneof![
        (-3i64..3, -2i64..2).prop_map(|(m, a)| Block::Free(m, a)),
        (-3i64..3, -2i64..2, 0u32..4).prop_map(|(m, a, k)| Block::Tower(m, a, k))
    ]
}

type Decomp = (Vec<Vec<i64>>, Vec<(u32, Vec<i64>)>);

fn decomposition(claim: &serde_json::Value) -> Decomp {
    (serde_json::from_value(claim["free"].clone()).unwrap(), serde_json::from_value(claim["torsion"].clone()).unwrap())
}

fn kunneth(c: &Decomp, d: &Decomp) -> Decomp {
    let add = |a: &[i64], b: &[i64]| a.iter().zip(b).map(|(x, y)| x + y).collect::<Vec<i64>>();
    let (mut free, mut tors) = (Vec::new(), Vec::new());
    for g in &c.0 {
        free.extend(d.0.iter().map(|h| add(g, h)));
        tors.extend(d.1.iter().map(|(k, h)| (*k, add(g, h))));
    }
    for (k, g) in &c.1 {
        tors.extend(d.0.iter().map(|h| (*k, add(g, h))));
        for (l, h) in &d.1 {
            let (lo, hi) = ((*k).min(*l), (*k).max(*l) as i64);
            tors.push((lo, add(g, h)));
            // deg U = (−2, −1), deg ∂ = (−1, 0)
            tors.push((lo, add(&add(g, h), &[-2 * hi + 1, -hi])));
        }
    }
    free.sort();
    tors.sort();
    (free, tors)
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(tubecert_tests::cases(24)))]
    #[test]
    fn homology_of_tensor_products(c in prop::collection::vec(block(), 1..4), d in prop::collection::vec(block(), 1..4), s1: u64, s2: u64) {
        let (pc, pd) = (planted_complex(&c, s1), planted_complex(&d, s2));
        let p = json!({"format": "tubecert-problem", "version": 1, "ring": minus_ring(),
            "complexes": {"C": pc.complex, "D": pd.complex, "CD": {"tensor": ["C", "D"]}},
            "goals": [{"homology": {"complex": "C"}}, {"homology": {"complex": "D"}}, {"homology": {"complex": "CD"}}]});
        let claims = verified_claims(&prove_value(&p));
        let (hc, hd, hcd) = (decomposition(&claims[0]), decomposition(&claims[1]), decomposition(&claims[2]));
        prop_assert_eq!(&hc, &(pc.free.clone(), pc.torsion.clone()), "H(C) recovers the planted summands");
        prop_assert_eq!(&hd, &(pd.free.clone(), pd.torsion.clone()));
        prop_assert_eq!(hcd, kunneth(&hc, &hd));
    }
}
