//! Deciding whether a map φ: C → D is null-homotopic, with a witness either way.
//!
//! The unknown H lives in one graded piece of Hom_R(C, D), which is finite-dimensional with
//! basis the triples (x, m, w) meaning x ↦ m·w. The linear map H ↦ ∂H + H∂ sends that piece to
//! the piece of φ; elimination either writes φ as an image (a homotopy) or finds a functional
//! y that kills every image and has ⟨y, φ⟩ = 1 (a dual witness).

use super::elimination::{ColumnReducer, Solution};
use std::collections::{BTreeMap, HashMap};
use tubecert_format::{Grading, Mono, RingInfo};
use tubecheck::algebra::normalize;
use tubecheck::load::{Complex, Context, Evaluated};

/// A basis element (x, m, w) of Hom(C, D): x ↦ m·w.
pub type HomTerm = (u32, Mono, u32);

pub enum Verdict {
    /// H with φ = ∂H + H∂.
    Null(Vec<HomTerm>),
    /// y with δy = 0 and ⟨y, φ⟩ = 1.
    NotNull(Vec<HomTerm>),
}

/// Generators grouped by grading (deterministic order).
fn by_grading(c: &Complex) -> BTreeMap<&Grading, Vec<u32>> {
    let mut out: BTreeMap<&Grading, Vec<u32>> = BTreeMap::new();
    for (i, g) in c.gradings.iter().enumerate() {
        out.entry(g).or_default().push(i as u32);
    }
    out
}

/// Every basis element of Hom(C, D) in `degree`.
pub fn hom_basis(ring: &RingInfo, c: &Complex, d: &Complex, degree: &[i64]) -> Vec<HomTerm> {
    let (cg, dg) = (by_grading(c), by_grading(d));
    let mut out = Vec::new();
    for (gx, xs) in &cg {
        for (gw, ws) in &dg {
            let need: Grading = (0..degree.len()).map(|i| gx[i] + degree[i] - gw[i]).collect();
            for m in ring.monomials_of_degree(&need) {
                for &x in xs {
                    for &w in ws {
                        out.push((x, m, w));
                    }
                }
            }
        }
    }
    out.sort_unstable();
    out
}

/// ∂ψ + ψ∂ for the basis element ψ = (x ↦ m·w), as triples; `into_x` lists the terms of ∂_C
/// that reach each generator.
fn boundary_of(t: HomTerm, c_into: &[Vec<(u32, Mono)>], d: &Complex) -> Result<Vec<HomTerm>, String> {
    let (x, m, w) = t;
    let mut out = Vec::new();
    for &(w2, cf) in &d.d.rows[w as usize] {
        out.push((x, m.mul(cf).ok_or_else(tubecheck::algebra::overflow)?, w2));
    }
    for &(x2, cf) in &c_into[x as usize] {
        out.push((x2, m.mul(cf).ok_or_else(tubecheck::algebra::overflow)?, w));
    }
    Ok(out)
}

/// Decides whether φ is null-homotopic.
pub fn decide(ctx: &Context, phi: &Evaluated) -> Result<Verdict, String> {
    let (c, d) = (&ctx.complexes[phi.from], &ctx.complexes[phi.to]);
    let h_degree: Grading = phi.degree.iter().zip(&ctx.ring.differential_degree).map(|(a, b)| a - b).collect();
    let columns = hom_basis(&ctx.ring, c, d, &h_degree);
    let c_into = c.d.incoming(c.names.len());
    let mut images = Vec::with_capacity(columns.len());
    for &t in &columns {
        images.push(boundary_of(t, &c_into, d)?);
    }
    let target: Vec<HomTerm> =
        phi.m.rows.iter().enumerate().flat_map(|(x, r)| r.iter().map(move |&(w, m)| (x as u32, m, w))).collect();
    if target.is_empty() {
        return Ok(Verdict::Null(Vec::new()));
    }
    // Rows: every triple that occurs, numbered in sorted order so that pivots are deterministic.
    let mut rows: Vec<HomTerm> = images.iter().flatten().chain(&target).copied().collect();
    rows.sort_unstable();
    rows.dedup();
    let index: HashMap<HomTerm, u32> = rows.iter().enumerate().map(|(i, &t)| (t, i as u32)).collect();
    let to_rows = |ts: &[HomTerm]| {
        let mut v: Vec<(u32, Mono)> = ts.iter().map(|t| (index[t], Mono::ONE)).collect();
        normalize(&mut v);
        v.into_iter().map(|e| e.0).collect::<Vec<u32>>()
    };
    let mut reducer = ColumnReducer::default();
    for (i, img) in images.iter().enumerate() {
        reducer.add_column(to_rows(img), i as u32);
    }
    Ok(match reducer.solve(to_rows(&target)) {
        Solution::Combination(ids) => Verdict::Null(ids.iter().map(|&i| columns[i as usize]).collect()),
        Solution::Functional(ys) => Verdict::NotNull(ys.iter().map(|&r| rows[r as usize]).collect()),
    })
}
