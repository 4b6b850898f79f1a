//! Reduction by cancelling unit arrows (the cancellation lemma / homological perturbation),
//! with the homotopy-equivalence data needed to carry witnesses back:
//! π: C → C′, ι: C′ → C, h: C → C with π∘ι = id and ι∘π + id = ∂h + h∂.
//!
//! In the new basis from [`normal_form`](super::normal_form) with unit pivots, C splits as
//! C′ ⊕ ⊕ (a → b); there h sends each b to its a. Back in the old basis: ι(t) = B(t), π(g) =
//! the survivor part of B⁻¹g, h(g) = Σ over cancelled pairs (a, b) of [coefficient of b in
//! B⁻¹g]·B(a).
//!
//! π, ι and h are made only where a question reads them (rows of π and ι, h of given vectors),
//! from the pivots' recorded additions ([`Replay`]): on a large complex a search reads a few
//! rows, and making them all cost as much as choosing the pivots. A row is the same vector
//! whichever others are asked for with it.

use super::normal_form::{unit_pivots, Replay};
use std::cell::RefCell;
use std::collections::HashMap;
use tubecert_format::Mono;
use tubecheck::algebra::{normalize, push_scaled, SparseMap, Vector};
use tubecheck::load::Complex;

pub struct Reduction {
    /// C′, with generators named after the original generators they replace.
    pub complex: Complex,
    /// Index in C of each generator of C′.
    pub survivors: Vec<u32>,
    /// Index in C′ of each generator of C (u32::MAX for the cancelled ones).
    new_index: Vec<u32>,
    replay: Replay,
    /// For a cancelled target b, its source a.
    source_of: HashMap<u32, u32>,
    /// B(t), each new basis vector in the old generators, and B⁻¹g, each old generator in the
    /// new basis: those made so far.
    basis: RefCell<Vec<Option<Vector>>>,
    expr: RefCell<Vec<Option<Vector>>>,
}

impl Reduction {
    pub fn new(c: &Complex) -> Result<Reduction, String> {
        let (pairs, survivors, out, replay) = unit_pivots(c)?;
        let n = c.names.len();
        let mut new_index = vec![u32::MAX; n];
        for (i, &t) in survivors.iter().enumerate() {
            new_index[t as usize] = i as u32;
        }
        let names: Vec<String> = survivors.iter().map(|&t| c.names[t as usize].clone()).collect();
        let complex = Complex {
            name: format!("{}_reduced", c.name),
            index: tubecheck::load::NameIndex::new(names.iter()),
            names,
            gradings: tubecheck::load::Gradings::new(
                c.gradings.iter().next().map_or(0, |g| g.len()),
                survivors.iter().map(|&t| &c.gradings[t as usize]),
            ),
            d: SparseMap { rows: survivors.iter().map(|&t| remap(&new_index, &out[t as usize])).collect() },
            defects: Vec::new(),
        };
        let source_of = pairs.iter().map(|&(a, b, _)| (b, a)).collect();
        Ok(Reduction {
            complex,
            survivors,
            new_index,
            replay,
            source_of,
            basis: RefCell::new(vec![None; n]),
            expr: RefCell::new(vec![None; n]),
        })
    }

    /// Whether anything was cancelled.
    pub fn is_identity(&self) -> bool {
        self.source_of.is_empty()
    }

    fn n(&self) -> usize {
        self.new_index.len()
    }

    /// Makes B(t) for each t of `ts` not made yet.
    fn make_basis(&self, ts: impl Iterator<Item = u32>) -> Result<(), String> {
        let mut missing: Vec<u32> = ts.filter(|&t| self.basis.borrow()[t as usize].is_none()).collect();
        missing.sort_unstable();
        missing.dedup();
        if !missing.is_empty() {
            let mut rows = self.replay.rows(true, &missing)?;
            let mut made = self.basis.borrow_mut();
            for t in missing {
                made[t as usize] = Some(std::mem::take(&mut rows[t as usize]));
            }
        }
        Ok(())
    }

    /// Makes B⁻¹g for each g of `gs` not made yet (the columns g of the inverse rows).
    fn make_expr(&self, gs: impl Iterator<Item = u32>) -> Result<(), String> {
        let mut missing: Vec<u32> = gs.filter(|&g| self.expr.borrow()[g as usize].is_none()).collect();
        missing.sort_unstable();
        missing.dedup();
        if !missing.is_empty() {
            let rows = self.replay.columns(&missing)?;
            let mut made = self.expr.borrow_mut();
            for &g in &missing {
                made[g as usize] = Some(Vec::new());
            }
            for (t, row) in rows.iter().enumerate() {
                for &(g, m) in row {
                    made[g as usize].as_mut().expect("a column asked for").push((t as u32, m));
                }
            }
        }
        Ok(())
    }

    /// ι with the rows of the survivors `rows` (numbered in C′) made, the others empty.
    pub fn iota_for(&self, rows: impl Iterator<Item = u32> + Clone) -> Result<SparseMap, String> {
        self.make_basis(rows.clone().map(|i| self.survivors[i as usize]))?;
        let mut iota = SparseMap::zero(self.survivors.len());
        let made = self.basis.borrow();
        for i in rows {
            iota.rows[i as usize] = made[self.survivors[i as usize] as usize].clone().expect("made");
        }
        Ok(iota)
    }

    /// π with the rows of the generators `rows` of C made, the others empty.
    pub fn pi_for(&self, rows: impl Iterator<Item = u32> + Clone) -> Result<SparseMap, String> {
        self.make_expr(rows.clone())?;
        let mut pi = SparseMap::zero(self.n());
        let made = self.expr.borrow();
        for g in rows {
            pi.rows[g as usize] = remap(&self.new_index, made[g as usize].as_ref().expect("made"));
        }
        Ok(pi)
    }

    pub fn iota(&self) -> Result<SparseMap, String> {
        self.iota_for(0..self.survivors.len() as u32)
    }

    pub fn pi(&self) -> Result<SparseMap, String> {
        self.pi_for(0..self.n() as u32)
    }

    /// The terms of π into each survivor of `targets` (numbered in C′): (g, m) for each term
    /// m·t of π(g), in the order of g.
    pub fn pi_into(&self, targets: &[u32]) -> Result<HashMap<u32, Vector>, String> {
        let wanted: Vec<u32> = targets.iter().map(|&w| self.survivors[w as usize]).collect();
        let mut rows = self.replay.rows(false, &wanted)?;
        Ok(targets.iter().zip(&wanted).map(|(&w, &t)| (w, std::mem::take(&mut rows[t as usize]))).collect())
    }

    /// h(v) for each vector v of C.
    pub fn homotopy_rows(&self, vs: &[Vector]) -> Result<Vec<Vector>, String> {
        self.make_expr(vs.iter().flatten().map(|t| t.0))?;
        let expr = self.expr.borrow();
        let terms = |g: u32| expr[g as usize].as_deref().expect("made");
        self.make_basis(
            vs.iter().flatten().flat_map(|t| terms(t.0)).filter_map(|t| self.source_of.get(&t.0).copied()),
        )?;
        let basis = self.basis.borrow();
        let mut rows = Vec::with_capacity(vs.len());
        for v in vs {
            let mut out = Vec::new();
            for &(g, n) in v {
                for &(t, c) in terms(g) {
                    if let Some(&a) = self.source_of.get(&t) {
                        let b = basis[a as usize].as_ref().expect("made");
                        push_scaled(&mut out, n.checked_mul(c).ok_or_else(tubecheck::algebra::overflow)?, b)?;
                    }
                }
            }
            normalize(&mut out);
            rows.push(out);
        }
        Ok(rows)
    }

    /// h as an explicit map C → C.
    pub fn homotopy(&self) -> Result<SparseMap, String> {
        let units: Vec<Vector> = (0..self.n() as u32).map(|g| vec![(g, Mono::ONE)]).collect();
        Ok(SparseMap { rows: self.homotopy_rows(&units)? })
    }
}

/// A vector in the new basis restricted to the survivors, numbered as in C′.
fn remap(new_index: &[u32], v: &Vector) -> Vector {
    let mut r: Vector =
        v.iter().filter(|e| new_index[e.0 as usize] != u32::MAX).map(|&(t, m)| (new_index[t as usize], m)).collect();
    normalize(&mut r);
    r
}
