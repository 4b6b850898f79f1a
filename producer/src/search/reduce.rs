//! Reduction by cancelling unit arrows (the cancellation lemma / homological perturbation),
//! with the homotopy-equivalence data needed to carry witnesses back:
//! π: C → C′, ι: C′ → C, h: C → C with π∘ι = id and ι∘π + id = ∂h + h∂.
//!
//! In the new basis from [`normal_form`] with unit pivots, C splits as C′ ⊕ ⊕ (a → b); there h
//! sends each b to its a. Back in the old basis: ι(t) = B(t), π(g) = the survivor part of B⁻¹g,
//! h(g) = Σ over cancelled pairs (a, b) of [coefficient of b in B⁻¹g]·B(a).

use super::normal_form::{normal_form, Pivots};
use std::collections::HashMap;
use tubecert_format::Mono;
use tubecheck::algebra::{normalize, push_scaled, SparseMap, Vector};
use tubecheck::load::Complex;

pub struct Reduction {
    /// C′, with generators named after the original generators they replace.
    pub complex: Complex,
    /// Index in C of each generator of C′.
    pub survivors: Vec<u32>,
    pub iota: SparseMap,
    pub pi: SparseMap,
    /// B⁻¹g: each old generator in the new basis.
    expr: Vec<Vector>,
    /// B(t): each new basis vector in the old generators.
    basis: Vec<Vector>,
    /// For a cancelled target b, its source a.
    source_of: HashMap<u32, u32>,
}

impl Reduction {
    /// With `beside`, part of the work runs on a second thread (the same result).
    pub fn new(c: &Complex, beside: bool) -> Result<Reduction, String> {
        let nf = normal_form(c, Pivots::Units, beside)?;
        let n = c.names.len();
        let mut expr: Vec<Vector> = vec![Vec::new(); n];
        for (t, row) in nf.inverse_rows.iter().enumerate() {
            for &(g, m) in row {
                expr[g as usize].push((t as u32, m));
            }
        }
        let mut new_index = vec![u32::MAX; n];
        for (i, &t) in nf.survivors.iter().enumerate() {
            new_index[t as usize] = i as u32;
        }
        let remap = |v: &Vector| -> Vector {
            let mut r: Vector = v
                .iter()
                .filter(|e| new_index[e.0 as usize] != u32::MAX)
                .map(|&(t, m)| (new_index[t as usize], m))
                .collect();
            normalize(&mut r);
            r
        };
        let names: Vec<String> = nf.survivors.iter().map(|&t| c.names[t as usize].clone()).collect();
        let complex = Complex {
            name: format!("{}_reduced", c.name),
            index: tubecheck::load::NameIndex::new(names.iter()),
            names,
            gradings: tubecheck::load::Gradings::new(
                c.gradings.iter().next().map_or(0, |g| g.len()),
                nf.survivors.iter().map(|&t| &c.gradings[t as usize]),
            ),
            d: SparseMap { rows: nf.survivors.iter().map(|&t| remap(&nf.out[t as usize])).collect() },
            defects: Vec::new(),
        };
        let iota = SparseMap { rows: nf.survivors.iter().map(|&t| nf.basis[t as usize].clone()).collect() };
        let pi = SparseMap { rows: expr.iter().map(remap).collect() };
        let source_of = nf.pairs.iter().map(|&(a, b, _)| (b, a)).collect();
        Ok(Reduction { complex, survivors: nf.survivors, iota, pi, expr, basis: nf.basis, source_of })
    }

    /// Whether anything was cancelled.
    pub fn is_identity(&self) -> bool {
        self.source_of.is_empty()
    }

    /// h(v) for a vector of C.
    pub fn homotopy_of(&self, v: &[(u32, Mono)]) -> Result<Vector, String> {
        let mut out = Vec::new();
        for &(g, n) in v {
            for &(t, c) in &self.expr[g as usize] {
                if let Some(&a) = self.source_of.get(&t) {
                    push_scaled(
                        &mut out,
                        n.checked_mul(c).ok_or_else(tubecheck::algebra::overflow)?,
                        &self.basis[a as usize],
                    )?;
                }
            }
        }
        normalize(&mut out);
        Ok(out)
    }

    /// h as an explicit map C → C.
    pub fn homotopy(&self) -> Result<SparseMap, String> {
        let rows =
            (0..self.expr.len() as u32).map(|g| self.homotopy_of(&[(g, Mono::ONE)])).collect::<Result<_, _>>()?;
        Ok(SparseMap { rows })
    }
}
