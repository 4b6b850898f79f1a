//! The absolute Maslov grading of a box tensor product X = M ⊠ N (format version 5), certified.
//! X is CFK^-(K) over F2\[U\] (∂ counts discs with n_z = 0, U counts n_w), so X/(U − 1) is
//! CF-hat(S³) with basepoint z, graded by gr_z = M − 2A (U has gr_z-degree 0), and HF-hat(S³)
//! ≅ F2 in degree 0 (Ozsváth–Szabó 2004, "Holomorphic disks and topological invariants for
//! closed three-manifolds"). A cycle c of X/(U − 1) homogeneous in gr_z and a cocycle c*
//! (c*∘∂ = 0) with ⟨c*, c⟩ = 1 show \[c\] ≠ 0 (c = ∂b would give ⟨c*, c⟩ = ⟨c*∘∂, b⟩ = 0), so the
//! degree of c is 0: every M moves by −gr_z(c). The Alexander shift along gr(U) (`symmetrize`)
//! keeps gr_z, so the two normalizations commute.

use crate::algebra::normalize;
use crate::bordered::{Budget, Failure, Generator, Rows};
use crate::verify::ensure;
use std::collections::BTreeMap;
use tubecert_format::HatWitness;

/// Checks the witness against X (generators with their gradings, ∂ as (target, U-power) rows)
/// and moves every Maslov grading by −gr_z(c). Version 5 needs a witness, earlier ones none.
pub fn certify(o: &Budget, gens: &mut [Generator], rows: &Rows, w: Option<&HatWitness>, v: u32) -> Result<(), Failure> {
    let w = match (w, v >= 5) {
        (None, false) => return Ok(()),
        (Some(w), true) => w,
        (Some(_), false) => Err(format!("version {v}: a Maslov witness is not a member"))?,
        (None, true) => Err(format!("version {v}: a Maslov witness is needed"))?,
    };
    let size = rows.iter().map(|r| r.len() + 1).sum::<usize>() + w.cycle.len() + w.cocycle.len();
    o.spend(size as u64, "Maslov witness")?;
    let index: BTreeMap<&str, usize> = gens.iter().enumerate().map(|(k, g)| (g.2.as_str(), k)).collect();
    let set = |names: &[String], what: &str| -> Result<Vec<bool>, String> {
        let mut s = vec![false; gens.len()];
        for n in names {
            let &k = index.get(n.as_str()).ok_or_else(|| format!("the witnessed {what} names {n}, not a generator"))?;
            ensure(!std::mem::replace(&mut s[k], true), || format!("the witnessed {what} lists {n} twice"))?;
        }
        Ok(s)
    };
    let (c, dual) = (set(&w.cycle, "cycle")?, set(&w.cocycle, "cocycle")?);
    let mut dc: Vec<&str> = (0..gens.len()).filter(|&k| c[k]).flat_map(|k| rows[k].iter().map(|t| &t.0[..])).collect();
    normalize(&mut dc);
    if let Some(t) = dc.first() {
        Err(format!("the witnessed cycle is not a cycle of X/(U − 1): its boundary contains {t}"))?;
    }
    let hits = |k: usize| rows[k].iter().filter(|t| index.get(&t.0[..]).is_some_and(|&j| dual[j])).count();
    if let Some(k) = (0..gens.len()).find(|&k| hits(k) % 2 == 1) {
        Err(format!("the witnessed cocycle is not a cocycle of X/(U − 1): it is 1 on ∂{}", gens[k].2))?;
    }
    let paired = (0..gens.len()).filter(|&k| c[k] && dual[k]).count() % 2 == 1;
    ensure(paired, || "the witnessed cocycle is 0 on the witnessed cycle (⟨c*, c⟩ must be 1)".into())?;
    let gz = |g: &Generator| g.3[0] - 2 * g.3[1];
    let d = gz(&gens[c.iter().position(|&x| x).expect("⟨c*, c⟩ = 1")]);
    if let Some((g, _)) = gens.iter().zip(&c).find(|(g, &x)| x && gz(g) != d) {
        Err(format!("the witnessed cycle is not homogeneous in M − 2A (at {})", g.2))?;
    }
    // No bound is checked here: in i64 the shift cannot overflow (|M|, |A| ≤ 2^31), and every
    // grading is then compared with the certificate's, which are within bounds (`compare`).
    gens.iter_mut().for_each(|g| g.3[0] -= d);
    Ok(())
}
