//! Deciding whether a map φ: C → D is null-homotopic, with a witness either way.
//!
//! The unknown H lives in one graded piece of Hom_R(C, D), which is finite-dimensional with
//! basis the triples (x, m, w) meaning x ↦ m·w. The linear map H ↦ ∂H + H∂ sends that piece to
//! the piece of φ; elimination either writes φ as an image (a homotopy) or finds a functional
//! y that kills every image and has ⟨y, φ⟩ = 1 (a dual witness).

use super::elimination::{ColumnReducer, Solution};
use super::reduce::Reduction;
use std::cell::{Cell, RefCell};
use std::collections::{BTreeMap, HashMap};
use std::rc::Rc;
use std::time::{Duration, Instant};
use tubecert_format::{Grading, Mono, RingInfo};
use tubecheck::algebra::{normalize, SparseMap};
use tubecheck::load::{Complex, Context, Map};

/// A basis element (x, m, w) of Hom(C, D): x ↦ m·w.
pub type HomTerm = (u32, Mono, u32);

pub enum Verdict {
    /// H with φ = ∂H + H∂.
    Null(Vec<HomTerm>),
    /// y with δy = 0 and ⟨y, φ⟩ = 1.
    NotNull(Vec<HomTerm>),
}

/// Generators grouped by grading (deterministic order).
fn by_grading(c: &Complex) -> BTreeMap<&[i64], Vec<u32>> {
    let mut out: BTreeMap<&[i64], Vec<u32>> = BTreeMap::new();
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
            for m in super::monomials::monomials_of_degree(ring, &need) {
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
        out.push((x, m.checked_mul(cf).ok_or_else(tubecheck::algebra::overflow)?, w2));
    }
    for &(x2, cf) in &c_into[x as usize] {
        out.push((x2, m.checked_mul(cf).ok_or_else(tubecheck::algebra::overflow)?, w));
    }
    Ok(out)
}

/// Decides whether φ: C → D (given by its rows, of degree `degree`) is null-homotopic, by
/// elimination in Hom(C, D) directly.
pub fn decide_in(
    ring: &RingInfo,
    c: &Complex,
    d: &Complex,
    phi: &SparseMap,
    degree: &[i64],
) -> Result<Verdict, String> {
    let h_degree: Grading = degree.iter().zip(&ring.differential_degree).map(|(a, b)| a - b).collect();
    let columns = hom_basis(ring, c, d, &h_degree);
    let c_into = c.d.incoming_to(&vec![true; c.names.len()]);
    let mut images = Vec::with_capacity(columns.len());
    for &t in &columns {
        images.push(boundary_of(t, &c_into, d)?);
    }
    let target: Vec<HomTerm> =
        phi.rows.iter().enumerate().flat_map(|(x, r)| r.iter().map(move |&(w, m)| (x as u32, m, w))).collect();
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
        if i % 1024 == 0 {
            crate::progress::report("eliminating in Hom", i, images.len());
        }
    }
    crate::progress::done();
    Ok(match reducer.solve(to_rows(&target)) {
        Solution::Combination(ids) => Verdict::Null(ids.iter().map(|&i| columns[i as usize]).collect()),
        Solution::Functional(ys) => Verdict::NotNull(ys.iter().map(|&r| rows[r as usize]).collect()),
    })
}

/// How many cycle generators [`quick_dual`] tries, one at a time, before the whole Hom piece.
const CYCLE_TRIES: usize = 4;

/// A dual witness found without solving in the whole graded piece of Hom(C, D), when one of two
/// sufficient conditions holds; `None` means "undecided here", never "null-homotopic".
///
/// - Reduced complexes (no term of ∂_C or ∂_D has coefficient 1, i.e. ∂ lies in the maximal
///   ideal): every coefficient of ∂ψ + ψ∂ lies in that ideal too, so the single functional
///   y = (x, 1, w) vanishes on them, and it is 1 on φ when φ(x) has the term 1·w.
/// - A cycle generator x of C spans a subcomplex Z = R⟨x⟩, and if φ|_Z: Z → D is not
///   null-homotopic neither is φ (restrict a homotopy). Hom(Z, D) is a graded piece of D, about
///   |C| times smaller than the one of Hom(C, D); its witness y = x ⊗ c (c a cocycle of D with
///   c(φ(x)) = 1) is already a functional on Hom(C, D).
pub fn quick_dual(
    ring: &RingInfo,
    c: &Complex,
    d: &Complex,
    phi: &SparseMap,
    degree: &[i64],
) -> Result<Option<Vec<HomTerm>>, String> {
    let reduced = |k: &Complex| k.d.rows.iter().flatten().all(|t| t.1 != Mono::ONE);
    if reduced(c) && reduced(d) {
        let constant =
            phi.rows.iter().enumerate().find_map(|(x, r)| r.iter().find(|t| t.1 == Mono::ONE).map(|t| (x as u32, t.0)));
        if let Some((x, w)) = constant {
            return Ok(Some(vec![(x, Mono::ONE, w)]));
        }
    }
    if c.names.len() < 2 {
        return Ok(None); // the subcomplex would be C itself
    }
    let cycles = (0..c.names.len()).filter(|&x| c.d.rows[x].is_empty() && !phi.rows[x].is_empty());
    for x in cycles.take(CYCLE_TRIES) {
        let z = Complex {
            name: c.name.clone(),
            names: vec![c.names[x].clone()],
            index: tubecheck::load::NameIndex::new([&c.names[x]].into_iter()),
            gradings: tubecheck::load::Gradings::new(degree.len(), std::iter::once(&c.gradings[x])),
            d: SparseMap::zero(1),
            defects: Vec::new(),
        };
        let restricted = SparseMap { rows: vec![phi.rows[x].clone()] };
        if let Verdict::NotNull(y) = decide_in(ring, &z, d, &restricted, degree)? {
            return Ok(Some(y.into_iter().map(|(_, m, w)| (x as u32, m, w)).collect()));
        }
    }
    Ok(None)
}

/// A map given by Hom-basis triples, as rows.
pub fn to_map(triples: &[HomTerm], sources: usize) -> SparseMap {
    let mut m = SparseMap::zero(sources);
    for &(x, c, w) in triples {
        m.rows[x as usize].push((w, c));
    }
    for r in &mut m.rows {
        normalize(r);
    }
    m
}

/// Decides null-homotopy questions on the reduced models of the complexes involved and
/// carries the witnesses back to the original complexes. Reductions are computed once per
/// complex.
pub struct Solver<'a> {
    pub ctx: &'a Context,
    reductions: RefCell<BTreeMap<usize, Rc<Reduction>>>,
    parallel: bool,
    /// Time spent reducing and transporting, for the bench.
    pub reduce_time: Cell<Duration>,
    pub transport_time: Cell<Duration>,
}

impl<'a> Solver<'a> {
    /// With `parallel`, the reductions of a map's source and target run on two threads.
    pub fn new(ctx: &'a Context, parallel: bool) -> Self {
        Solver {
            ctx,
            parallel,
            reductions: RefCell::new(BTreeMap::new()),
            reduce_time: Cell::default(),
            transport_time: Cell::default(),
        }
    }

    pub fn reduction(&self, c: usize) -> Result<Rc<Reduction>, String> {
        if let Some(r) = self.reductions.borrow().get(&c) {
            return Ok(r.clone());
        }
        let start = Instant::now();
        let r = Rc::new(Reduction::new(&self.ctx.complexes[c])?);
        self.reduce_time.set(self.reduce_time.get() + start.elapsed());
        self.reductions.borrow_mut().insert(c, r.clone());
        Ok(r)
    }

    /// Reduces two complexes at once, on the machine's two cores when both are new and of
    /// comparable size (a quarter of the larger at least): the source and target of a map are
    /// independent blocks. Otherwise one after the other.
    fn reduction_pair(&self, c: usize, d: usize) -> Result<(Rc<Reduction>, Rc<Reduction>), String> {
        let known = |i: usize| self.reductions.borrow().contains_key(&i);
        let size = |i: usize| self.ctx.complexes[i].names.len();
        let comparable = 4 * size(c).min(size(d)) >= size(c).max(size(d));
        if self.parallel && c != d && !known(c) && !known(d) && comparable {
            let start = Instant::now();
            let complexes = &self.ctx.complexes;
            let (rc, rd) = std::thread::scope(|s| {
                let other = s.spawn(|| Reduction::new(&complexes[d]));
                (Reduction::new(&complexes[c]), other.join().unwrap_or_else(|_| Err("reduction failed".into())))
            });
            self.reduce_time.set(self.reduce_time.get() + start.elapsed());
            let mut cache = self.reductions.borrow_mut();
            cache.insert(c, Rc::new(rc?));
            cache.insert(d, Rc::new(rd?));
        }
        Ok((self.reduction(c)?, self.reduction(d)?))
    }

    /// The reductions computed so far, by complex index.
    pub fn reductions(&self) -> Vec<(usize, Rc<Reduction>)> {
        self.reductions.borrow().iter().map(|(c, r)| (*c, r.clone())).collect()
    }

    /// Is φ null-homotopic? Witnesses refer to the original complexes.
    pub fn decide(&self, phi: &Map) -> Result<Verdict, String> {
        let (rc, rd) = self.reduction_pair(phi.from, phi.to)?;
        // π_D φ ι_C, with only the rows of π_D that φ ι_C reaches made.
        let iota_c = rc.iota()?;
        let through = phi.m.after(&iota_c)?;
        let small = rd.pi_for(targets(&through))?.after(&through)?;
        let verdict = match quick_dual(&self.ctx.ring, &rc.complex, &rd.complex, &small, &phi.degree)? {
            Some(y) => Verdict::NotNull(y),
            None => decide_in(&self.ctx.ring, &rc.complex, &rd.complex, &small, &phi.degree)?,
        };
        let start = Instant::now();
        let transported = match verdict {
            Verdict::Null(h_small) => {
                // H = ι_D H′ π_C + h_D φ ι_C π_C + φ h_C
                let h_small = to_map(&h_small, rc.complex.names.len());
                let pi_c = rc.pi()?;
                let outer = h_small.after(&pi_c)?;
                let mut h = rd.iota_for(targets(&outer))?.after(&outer)?;
                let through = phi.m.after(&iota_c.after(&pi_c)?)?;
                for (x, row) in rd.homotopy_rows(&through.rows)?.into_iter().enumerate() {
                    h.rows[x].extend(row);
                }
                if !rc.is_identity() {
                    let tail = phi.m.after(&rc.homotopy()?)?;
                    for (x, row) in tail.rows.into_iter().enumerate() {
                        h.rows[x].extend(row);
                    }
                }
                Verdict::Null(triples(&mut h))
            }
            Verdict::NotNull(y_small) => {
                // y = (ι_C ⊗ π_D^∨) y′: ⟨y, ψ⟩ = ⟨y′, π_D ψ ι_C⟩
                let mut ws: Vec<u32> = y_small.iter().map(|t| t.2).collect();
                ws.sort_unstable();
                ws.dedup();
                let pi_into = rd.pi_into(&ws)?;
                let mut y = Vec::new();
                for (x2, m, w2) in y_small {
                    for &(x, c) in &iota_c.rows[x2 as usize] {
                        for &(w, p) in &pi_into[&w2] {
                            if let Some(q) = c.checked_mul(p).and_then(|cp| m.checked_div(cp)) {
                                y.push((x, q, w));
                            }
                        }
                    }
                }
                normalize(&mut y);
                Verdict::NotNull(y)
            }
        };
        self.transport_time.set(self.transport_time.get() + start.elapsed());
        Ok(transported)
    }
}

/// The generators a map reaches, each once, in order.
fn targets(m: &SparseMap) -> impl Iterator<Item = u32> + Clone {
    let mut ts: Vec<u32> = m.rows.iter().flatten().map(|t| t.0).collect();
    ts.sort_unstable();
    ts.dedup();
    ts.into_iter()
}

/// Normalizes each row and lists the map's terms as triples.
fn triples(m: &mut SparseMap) -> Vec<HomTerm> {
    let mut out = Vec::new();
    for (x, row) in m.rows.iter_mut().enumerate() {
        normalize(row);
        out.extend(row.iter().map(|&(w, c)| (x as u32, c, w)));
    }
    out
}
