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
