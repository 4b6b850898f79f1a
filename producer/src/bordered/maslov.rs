//! The witness of a box tensor product's Maslov normalization (format version 5, checked by
//! `tubecheck::maslov`): X/(U − 1) over F2 is reduced by cancelling every arrow (over F2 every
//! coefficient is a unit: the cancellation lemma, `search::reduce`). Its homology is HF-hat(S³)
//! ≅ F2 for a knot in S³, so one generator t survives; ι(t) is a cycle, homogeneous in
//! M − 2A since each cancellation is, and the coefficient of t in π(g), as g runs over the
//! generators, is a cocycle (π is a chain map to a complex with ∂ = 0) with ⟨π*, ι(t)⟩ = 1
//! (π∘ι = id).

use crate::search::reduce::Reduction;
use tubecert_format::{HatWitness, Mono};
use tubecheck::algebra::{normalize, SparseMap};
use tubecheck::bordered::{Generator, Rows};
use tubecheck::load::{Complex, Gradings, NameIndex};

pub fn hat_witness(gens: &[Generator], rows: &Rows) -> Result<HatWitness, String> {
    let names: Vec<String> = gens.iter().map(|g| g.2.clone()).collect();
    let index = NameIndex::new(names.iter());
    let mut d = Vec::new();
    for row in rows {
        let mut v = row
            .iter()
            .map(|(t, _)| index.get(t).map(|j| (j, Mono::ONE)).ok_or(format!("{t} is not a generator")))
            .collect::<Result<Vec<_>, _>>()?;
        normalize(&mut v);
        d.push(v);
    }
    let gz: Vec<Vec<i64>> = gens.iter().map(|g| vec![g.3[0] - 2 * g.3[1]]).collect();
    let gradings = Gradings::new(1, gz.iter().map(|g| g.as_slice()));
    let hat = Complex { name: "X/(U − 1)".into(), names, index, gradings, d: SparseMap { rows: d }, defects: vec![] };
    let r = Reduction::new(&hat)?;
    if r.survivors.len() != 1 {
        return Err(format!(
            "the box tensor product at U = 1 has homology of rank {}, not 1 (HF-hat(S³) ≅ F2): not the complex of a knot in S³, so its Maslov grading cannot be normalized",
            r.survivors.len()
        ));
    }
    let name = |g: u32| hat.names[g as usize].clone();
    let mut cycle: Vec<String> = r.iota_for(0..1)?.rows[0].iter().map(|&(g, _)| name(g)).collect();
    let mut cocycle: Vec<String> = r.pi_into(&[0])?[&0].iter().map(|&(g, _)| name(g)).collect();
    cycle.sort();
    cocycle.sort();
    cocycle.dedup(); // one name per generator, whatever its terms
    Ok(HatWitness { cocycle, cycle })
}
