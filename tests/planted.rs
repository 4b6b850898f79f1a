//! Planted answers: a tower ∂b = U^k·a beside a free generator z and random other blocks,
//! hidden by a random homogeneous change of basis, with maps O → C sending o to z and to
//! z + a. The producer must find ord_U = k exactly and the checker must accept; then every
//! single-term mutation of the witnesses must be rejected unless an independent evaluation
//! (tests/lib.rs, written without the checker's code) shows it still proves the claim.

use proptest::prelude::*;
use serde_json::{json, Value};
use tubecert::search::normal_form::{normal_form, Pivots};
use tubecert_format::{Body, Claim, Term};
use tubecert_tests::*;

fn block() -> impl Strategy<Value = Block> {
    prop_oneof![
        (-3i64..3, -2i64..2).prop_map(|(m, a)| Block::Free(m, a)),
        (-3i64..3, -2i64..2, 0u32..4).prop_map(|(m, a, k)| Block::Tower(m, a, k))
    ]
}

/// The planted element i of the hidden basis as map terms from o.
fn image_terms(p: &Planted, i: usize) -> Vec<Value> {
    p.planted_in_new[i]
        .iter()
        .map(|(g, e)| json!(["o", if *e == 0 { "1".to_string() } else { format!("U^{e}") }, g]))
        .collect()
}

fn problem(k: u32, others: &[Block], seed: u64) -> (Value, Planted) {
    // Block order fixes indices: z = 0, a = 1 (the tower's target), b = 2.
    let mut blocks = vec![Block::Free(0, 0), Block::Tower(0, 0, k)];
    blocks.extend_from_slice(others);
    let p = planted_complex(&blocks, seed);
    let (z, a) = (image_terms(&p, 0), image_terms(&p, 1));
    let f = z.clone();
    let mut g: Vec<Value> = z.into_iter().chain(a).collect();
    // z + a may share terms: cancel them in pairs.
    g.sort_by_key(|t| t.to_string());
    let mut kept: Vec<Value> = Vec::new();
    for t in g {
        if kept.last() == Some(&t) {
            kept.pop();
        } else {
            kept.push(t);
        }
    }
    let prob = json!({"format": "tubecert-problem", "version": 1, "ring": minus_ring(),
        "complexes": {"O": {"generators": {"o": [0, 0]}, "differential": []}, "C": p.complex},
        "maps": {"F": {"from": "O", "to": "C", "degree": [0, 0], "terms": f}, "G": {"from": "O", "to": "C", "degree": [0, 0], "terms": kept}},
        "goals": [{"torsion_order": {"maps": ["F", "G"], "variable": "U", "max_order": 8}}]});
    (prob, p)
}

/// Mutates one term of a term list: remove it, raise its exponent, or add a shifted copy.
fn mutate(terms: &mut Vec<Term>, choice: u64, gens: &[String]) {
    if terms.is_empty() {
        terms.push(["o".into(), "1".into(), gens[choice as usize % gens.len()].clone()]);
        return;
    }
    let i = (choice / 3) as usize % terms.len();
    match choice % 3 {
        0 => {
            terms.remove(i);
        }
        1 => terms[i][1] = format!("U*{}", terms[i][1]).replace("U*1", "U"),
        _ => {
            let mut t = terms[i].clone();
            t[2] = gens[(choice / 7) as usize % gens.len()].clone();
            if !terms.contains(&t) {
                terms.push(t);
            }
        }
    }
}

/// Is each homotopy term homogeneous of the degree the checker requires (deg φ − deg ∂)?
fn homogeneous(terms: &[Term], gr: &serde_json::Map<String, Value>, k: u32) -> bool {
    terms.iter().all(|[_, c, w]| {
        monomials(c).iter().all(|&(e, _)| {
            let g = &gr[w];
            // o at (0,0); H has degree k·(−2,−1) − (−1,0).
            g[0].as_i64().unwrap() - 2 * e as i64 == -2 * k as i64 + 1
                && g[1].as_i64().unwrap() - e as i64 == -(k as i64)
        })
    })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(tubecert_tests::cases(32)))]
    #[test]
    fn finds_the_planted_order_and_survives_mutation(k in 0u32..5, others in prop::collection::vec(block(), 0..4), seed: u64, choice: u64, on_dual: bool) {
        let (prob, planted) = problem(k, &others, seed);
        let proved = prove_value(&prob);
        let claims = verified_claims(&proved);
        prop_assert_eq!(&claims[0]["order"], &json!(k));

        // Mutate one witness term, reseal, and compare the checker with the independent math.
        let mut body: Body = proved.certificate.body.clone();
        let gens: Vec<String> = planted.complex["generators"].as_object().unwrap().keys().cloned().collect();
        let Claim::TorsionOrder { witness, .. } = &mut body.claims[0] else { panic!("torsion claim") };
        let mutate_dual = on_dual && witness.dual.is_some();
        if mutate_dual {
            mutate(witness.dual.as_mut().unwrap(), choice, &gens);
        } else {
            mutate(&mut witness.homotopy, choice, &gens);
        }
        let (h, y) = (witness.homotopy.clone(), witness.dual.clone());
        let report = tubecheck::check_bytes("mutant", &seal(body.clone())).unwrap();
        let accepted = report.ok();

        let cdiff: Vec<Term> = serde_json::from_value(planted.complex["differential"].clone()).unwrap();
        let phi = |e: u32| -> Vec<Term> {
            // U^e·(F + G)(o) = U^e·a, with a written in the hidden basis.
            planted.planted_in_new[1].iter().map(|(g, x)| ["o".to_string(), format!("U^{}", x + e), g.clone()]).collect()
        };
        let holds = homogeneous(&h, planted.complex["generators"].as_object().unwrap(), k)
            && is_homotopy(&[], &cdiff, &["o".to_string()], &phi(k), &h)
            && match (k, &y) {
                (0, None) => true,
                (0, Some(_)) | (_, None) => false,
                (_, Some(y)) => is_dual_witness(&[], &cdiff, &phi(k - 1), y),
            };
        prop_assert_eq!(accepted, holds, "mutation of the {} witness: checker {} but independent evaluation {}", if mutate_dual { "dual" } else { "homotopy" }, accepted, holds);
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(tubecert_tests::cases(32)))]
    /// The reduction data satisfy π∘ι = id, ι∘π + id = ∂h + h∂, and π, ι are chain maps; the
    /// emitted equivalence claim verifies; and the reduced model has no unit arrows left.
    #[test]
    fn reductions_are_homotopy_equivalences(blocks in prop::collection::vec(block(), 1..6), seed: u64) {
        let planted = planted_complex(&blocks, seed);
        let prob = json!({"format": "tubecert-problem", "version": 1, "ring": minus_ring(), "complexes": {"C": planted.complex}});
        let bytes = serde_json::to_vec(&prob).unwrap();
        let p = tubecert::problem::parse_problem(&bytes, "test").unwrap();
        let ctx = tubecert::validate::validate(&p).unwrap();
        let r = tubecert::search::reduce::Reduction::new(&ctx.complexes[0]).unwrap();
        let (c, small) = (&ctx.complexes[0], &r.complex);
        // Rows made alone from the recorded additions are those of the additions applied in
        // turn, whichever others are made with them.
        prop_assert!(rows_agree(c, &r));
        let (pi, iota) = (r.pi().unwrap(), r.iota().unwrap());
        let id = |n: usize| tubecheck::algebra::SparseMap::identity(n);
        prop_assert_eq!(pi.after(&iota).unwrap(), id(small.names.len()));
        let h = r.homotopy().unwrap();
        prop_assert_eq!(iota.after(&pi).unwrap().plus(&id(c.names.len())), c.d.after(&h).unwrap().plus(&h.after(&c.d).unwrap()));
        prop_assert_eq!(c.d.after(&iota).unwrap(), iota.after(&small.d).unwrap());
        prop_assert_eq!(small.d.after(&pi).unwrap(), pi.after(&c.d).unwrap());
        prop_assert!(small.d.rows.iter().flatten().all(|t| t.1 != tubecert_format::Mono::ONE), "reduced: no unit arrows");
        // Towers with k = 0 cancel; the rest survive.
        let expected = blocks.iter().map(|b| match b { Block::Free(..) => 1, Block::Tower(_, _, 0) => 0, _ => 2 }).sum::<usize>();
        prop_assert_eq!(small.names.len(), expected);
    }
}

/// ι and the terms of π into the survivors against the normal form's basis vectors and inverse
/// rows (every addition applied in turn); then a few rows of π, ι, π's transpose and h, each
/// asked for alone from a fresh reduction, against the whole maps.
fn rows_agree(c: &tubecheck::load::Complex, r: &tubecert::search::reduce::Reduction) -> bool {
    use tubecert::search::reduce::Reduction;
    let nf = normal_form(c, Pivots::Units).unwrap();
    let (n, s) = (c.names.len() as u32, r.survivors.len() as u32);
    let all_survivors: Vec<u32> = (0..s).collect();
    let whole = r.survivors == nf.survivors
        && r.iota().unwrap().rows.iter().zip(&nf.survivors).all(|(row, &t)| *row == nf.basis[t as usize])
        && r.pi_into(&all_survivors)
            .unwrap()
            .iter()
            .all(|(&w, v)| *v == nf.inverse_rows[nf.survivors[w as usize] as usize]);
    let some = |k: u32| -> Vec<u32> { (0..k.min(5)).map(|i| (i * 7919 + 3) % k).collect() };
    let fresh = || Reduction::new(c).unwrap();
    let (pi, iota, h) = (r.pi().unwrap(), r.iota().unwrap(), r.homotopy().unwrap());
    let into = pi.incoming_to(&vec![true; s as usize]);
    let alone_pi = fresh().pi_for(some(n).into_iter()).unwrap();
    let alone_iota = fresh().iota_for(some(s).into_iter()).unwrap();
    let alone_into = fresh().pi_into(&some(s)).unwrap();
    let units: Vec<_> = some(n).iter().map(|&g| vec![(g, tubecert_format::Mono::ONE)]).collect();
    let alone_h = fresh().homotopy_rows(&units).unwrap();
    whole
        && some(n).iter().all(|&g| alone_pi.rows[g as usize] == pi.rows[g as usize])
        && some(s).iter().all(|&t| alone_iota.rows[t as usize] == iota.rows[t as usize])
        && alone_into.iter().all(|(&w, v)| into[w as usize] == *v)
        && some(n).iter().zip(&alone_h).all(|(&g, hv)| h.rows[g as usize] == *hv)
}

/// On a large dense complex (many recorded additions, rows reached through long chains of
/// them), rows made alone are those of the additions applied in turn.
#[test]
fn rows_made_alone_agree_on_a_large_complex() {
    let p = tubecert::bench::synthetic_problem(6000, None, Some(9.0), 7).unwrap();
    let ctx = tubecert::validate::validate(&p).unwrap();
    let c = &ctx.complexes[ctx.complex_index["K"]];
    let r = tubecert::search::reduce::Reduction::new(c).unwrap();
    assert!(r.survivors.len() < c.names.len() / 10, "the complex reduces");
    assert!(rows_agree(c, &r), "rows made from the recorded additions differ");
}
