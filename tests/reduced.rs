//! Hom questions between reduced complexes over `F2[U,V]` (∂ in the maximal ideal (U, V)): the
//! quick dual witnesses agree with the solve in the whole Hom piece, the checker accepts them,
//! and a null-homotopic map is never given one.

use tubecert::search::homotopy::{decide_in, quick_dual, Solver, Verdict};
use tubecert_format::MapExpr;

/// A problem in the text format, parsed and validated.
fn context(text: &str) -> (tubecert::problem::Problem, tubecheck::load::Context) {
    let p = tubecert::problem::parse_problem(text.as_bytes(), "t").unwrap();
    let ctx = tubecert::validate::validate(&p).unwrap();
    (p, ctx)
}

const RING: &str = "ring F2[U,V]\ngradings gr_U gr_V\ndegree U (-2, 0)\ndegree V (0, -2)\ndegree d (-1, -1)\n";

/// Every claim of the proved problem, after the checker has verified the certificate.
fn proved_claims(text: &str) -> Vec<String> {
    let (p, ctx) = context(text);
    let proved = tubecert::prove::prove(p, &ctx, text.as_bytes()).unwrap();
    let bytes = tubecert::canonical_writer::file_bytes(&proved.certificate).unwrap();
    let report = tubecheck::check_bytes("t", &bytes).unwrap();
    assert!(report.ok());
    let objects = ["complex", "chain_map"];
    report
        .claims
        .iter()
        .filter(|c| !objects.contains(&c.kind.as_str()))
        .map(|c| format!("{} {}", c.kind, c.statement))
        .collect()
}

#[test]
fn multiples_of_the_identity_of_a_tensor_product_of_staircases_are_not_null_homotopic() {
    // Each U^a·V^b·id_C is non-zero on homology after inverting U, where a knot complex has rank
    // one (Ozsváth–Szabó 2004, "Holomorphic disks and knot invariants"; recalled from memory), so none is
    // null-homotopic; the whole Hom piece agrees below, and the quick path must find each witness.
    let text = format!(
        "{RING}complex T = staircase torus_knot 3 4\ncomplex S = staircase torus_knot 2 5\ncomplex C = tensor T S\n\
         goal not_null_homotopic {{\"id\":\"C\"}}\ngoal not_null_homotopic {{\"times\":[\"U\",{{\"id\":\"C\"}}]}}\n\
         goal not_null_homotopic {{\"times\":[\"V\",{{\"id\":\"C\"}}]}}\ngoal not_null_homotopic {{\"times\":[\"U*V\",{{\"id\":\"C\"}}]}}\n\
         goal not_null_homotopic {{\"times\":[\"U^2*V^3\",{{\"id\":\"C\"}}]}}\n"
    );
    let (_, ctx) = context(&text);
    let c = &ctx.complexes[ctx.complex_index["C"]];
    assert_eq!(c.names.len(), 25);
    for (k, times) in ["1", "U", "V", "U*V", "U^2*V^3"].iter().enumerate() {
        let id = MapExpr::Id("C".into());
        let e = if k == 0 { id } else { MapExpr::Times(times.to_string(), Box::new(id)) };
        let phi = ctx.eval(&e).unwrap();
        let quick = quick_dual(&ctx.ring, c, c, &phi.m, &phi.degree).unwrap();
        let quick = quick.unwrap_or_else(|| panic!("no quick witness for {times}·id"));
        if k == 0 {
            assert_eq!(quick.len(), 1, "the identity is non-zero modulo (U, V): one triple (x, 1, x)");
            assert!(quick[0].1 == tubecert_format::Mono::ONE && quick[0].0 == quick[0].2);
        }
        assert!(quick.iter().all(|t| t.0 == quick[0].0), "a witness x ⊗ c at one generator");
        assert!(matches!(decide_in(&ctx.ring, c, c, &phi.m, &phi.degree).unwrap(), Verdict::NotNull(_)));
    }
    let claims = proved_claims(&text);
    assert_eq!(claims.len(), 5);
    assert!(claims.iter().all(|c| c.starts_with("not_null_homotopic")), "{claims:?}");
}

#[test]
fn a_null_homotopic_map_gets_no_quick_witness_and_a_homotopy() {
    // T(3,4): ∂x1 = U x0 + V^2 x2, ∂x3 = U^2 x2 + V x4. With H(x0) = x1 (degree (-1, 1)),
    // φ = ∂H + H∂ has φ(x0) = U x0 + V^2 x2 (a cycle is sent to a boundary) and φ(x1) = U x1.
    let text = format!(
        "{RING}complex T = staircase torus_knot 3 4\nmap P : T -> T degree (-2, 0)\n  x0 -> U x0 + V^2 x2\n  x1 -> U x1\n\
         goal null_homotopic P\n"
    );
    let (_, ctx) = context(&text);
    let t = &ctx.complexes[ctx.complex_index["T"]];
    let phi = ctx.eval(&MapExpr::Named("P".into())).unwrap();
    assert!(quick_dual(&ctx.ring, t, t, &phi.m, &phi.degree).unwrap().is_none());
    let solver = Solver::new(&ctx, false);
    assert!(matches!(solver.decide(&phi).unwrap(), Verdict::Null(_)));
    let claims = proved_claims(&text);
    assert_eq!(claims, vec!["null_homotopic P ≃ 0 (null-homotopic)".to_string()]);
}
