//! Cancellation of arrows by change of basis: the graded Smith normal form over a PID, and,
//! restricted to unit arrows, the cancellation lemma that reduces any complex over `F2[U,V]`.
//!
//! An arrow a → m·b is cancelled when m divides every other coefficient into b and out of a:
//! other sources a' hitting b become a' + (c'/m)·a, and b becomes b + Σ (c''/m)·b'' over the
//! other terms of ∂a. Then R⟨a⟩ → R⟨b⟩ splits off as a direct summand: nothing else hits b,
//! ∂b = 0 and nothing hits a (both forced by ∂∂ = 0). Pivots are taken smallest coefficient
//! first (so divisibility holds over a PID), then fewest fill-in (Markowitz count).

use super::monomials::total_degree;
use std::cmp::Reverse;
use std::collections::BinaryHeap;
use tubecert_format::Mono;
use tubecheck::algebra::Vector;
use tubecheck::load::Complex;

/// Which arrows may be cancelled.
#[derive(Clone, Copy, PartialEq, Eq, Debug)]
pub enum Pivots {
    /// Any arrow, smallest first: the normal form over F2 or `F2[U]`.
    Minimal,
    /// Only arrows with coefficient 1: a homotopy-equivalent reduced complex over any ring.
    Units,
}

/// The result: a new basis, its inverse, and the arrows of ∂ in it.
pub struct NormalForm {
    /// New basis vector t written in the old generators (`Units`: empty for cancelled targets).
    pub basis: Vec<Vector>,
    /// Row t of B⁻¹: each old generator g with the coefficient of t in g (`Units`: empty for
    /// cancelled sources).
    pub inverse_rows: Vec<Vector>,
    /// Cancelled arrows a → m·b of ∂ in the new basis.
    pub pairs: Vec<(u32, u32, Mono)>,
    /// Uncancelled new basis vectors, and ∂ among them (`out[t]`, empty for cancelled t).
    pub survivors: Vec<u32>,
    pub out: Vec<Vector>,
}

/// The sources of the arrows into one generator: a small sorted set (a few entries each, so a
/// sorted vector beats a tree), iterated in increasing order.
#[derive(Clone, Default)]
struct Sources(Vec<u32>);

impl Sources {
    fn insert(&mut self, a: u32) {
        if let Err(i) = self.0.binary_search(&a) {
            self.0.insert(i, a);
        }
    }
    fn remove(&mut self, a: &u32) {
        if let Ok(i) = self.0.binary_search(a) {
            self.0.remove(i);
        }
    }
    fn len(&self) -> usize {
        self.0.len()
    }
    fn iter(&self) -> impl Iterator<Item = &u32> {
        self.0.iter()
    }
}

/// The terms of `row` into `b`.
fn terms_into(row: &[(u32, Mono)], b: u32) -> &[(u32, Mono)] {
    let start = row.partition_point(|t| t.0 < b);
    let len = row[start..].iter().take_while(|t| t.0 == b).count();
    &row[start..start + len]
}

/// `out = old + f·src`, by merging: both are sorted without repeats and multiplying by f keeps
/// the order, so this gives exactly what sorting would.
fn merge_one(old: &[(u32, Mono)], f: Mono, src: &[(u32, Mono)], out: &mut Vector) -> Result<(), String> {
    out.clear();
    out.reserve(old.len() + src.len());
    let mut t = old.iter().copied().peekable();
    for &(g, n) in src {
        let term = (g, f.checked_mul(n).ok_or_else(tubecheck::algebra::overflow)?);
        while let Some(&x) = t.peek() {
            if x >= term {
                break;
            }
            out.push(x);
            t.next();
        }
        if t.peek() == Some(&term) {
            t.next(); // 1 + 1 = 0
        } else {
            out.push(term);
        }
    }
    out.extend(t);
    Ok(())
}

/// Vectors reused as working space, so that adding rows allocates nothing in the common case.
#[derive(Default)]
struct Spare {
    out: Vector,
    step: Vector,
}

impl Spare {
    /// `self.out = old + Σ_f f·src` for the monomials f of `factor`.
    fn plus_multiple(&mut self, old: &[(u32, Mono)], factor: &[Mono], src: &Vector) -> Result<(), String> {
        match factor.split_first() {
            None => {
                self.out.clear();
                self.out.extend_from_slice(old);
            }
            Some((&f, rest)) => {
                merge_one(old, f, src, &mut self.out)?;
                for &g in rest {
                    merge_one(&self.out, g, src, &mut self.step)?;
                    std::mem::swap(&mut self.out, &mut self.step);
                }
            }
        }
        Ok(())
    }

    /// `target += Σ_f f·src`.
    fn add_multiple(&mut self, target: &mut Vector, factor: &[Mono], src: &Vector) -> Result<(), String> {
        self.plus_multiple(target, factor, src)?;
        std::mem::swap(target, &mut self.out);
        Ok(())
    }
}

/// One addition to the basis vectors or the inverse rows, which choosing pivots never reads:
/// `rows[target] += f·rows[source]` (target ≠ source), or `rows[target]` emptied (a vector no
/// later addition reads, dropped to save memory).
#[derive(Clone, Copy)]
enum Add {
    Basis(u32, Mono, u32),
    Inverse(u32, Mono, u32),
    ClearBasis(u32),
    ClearInverse(u32),
}

/// The basis vectors and inverse rows, changed only by [`Add`]s applied in the order the
/// pivots make them: at once, or later from a record of them (a [`Replay`]) for only the rows
/// a question reads (the same vectors either way).
struct Additions {
    basis: Vec<Vector>,
    inverse_rows: Vec<Vector>,
    spare: Spare,
}

impl Additions {
    fn apply(&mut self, add: Add) -> Result<(), String> {
        let (rows, target, f, source) = match add {
            Add::Basis(t, f, s) => (&mut self.basis, t, f, s),
            Add::Inverse(t, f, s) => (&mut self.inverse_rows, t, f, s),
            Add::ClearBasis(t) | Add::ClearInverse(t) => {
                let rows = if matches!(add, Add::ClearBasis(_)) { &mut self.basis } else { &mut self.inverse_rows };
                rows[t as usize] = Vec::new();
                return Ok(());
            }
        };
        let src = std::mem::take(&mut rows[source as usize]);
        let done = self.spare.add_multiple(&mut rows[target as usize], &[f], &src);
        rows[source as usize] = src;
        done
    }
}

/// Where the pivot loop sends its [`Add`]s: applied at once, or recorded for a [`Replay`].
enum Sink {
    Here(Additions),
    Log(Vec<Add>),
}

impl Sink {
    fn add(&mut self, add: Add) -> Result<(), String> {
        match self {
            Sink::Here(a) => a.apply(add),
            Sink::Log(log) => {
                log.push(add);
                Ok(())
            }
        }
    }
}

/// The additions of a pivot loop with unit pivots, in their order. The basis vectors and
/// inverse rows they give are made only for the rows or columns a question reads, each the
/// vector that applying every addition gives: on a large complex most are never read, and
/// making them all cost as much as choosing the pivots.
pub struct Replay {
    adds: Vec<Add>,
    n: usize,
}

impl Replay {
    /// The final basis vectors (`basis`) or inverse rows of `wanted`: walking back from the
    /// end, the additions that reach them (into a wanted row, or into a row that such an
    /// addition reads, before it reads it), then those additions in order. Returns n rows;
    /// the unwanted ones are meaningless (empty or partial).
    pub fn rows(&self, basis: bool, wanted: &[u32]) -> Result<Vec<Vector>, String> {
        let mut live = vec![false; self.n];
        let mut start = vec![false; self.n];
        for &t in wanted {
            (live[t as usize], start[t as usize]) = (true, true);
        }
        let mut needed = Vec::new();
        for (i, add) in self.adds.iter().enumerate().rev() {
            match (basis, *add) {
                (true, Add::Basis(t, _, s)) | (false, Add::Inverse(t, _, s)) if live[t as usize] => {
                    needed.push(i);
                    (live[s as usize], start[s as usize]) = (true, true);
                }
                // What the row held before it was emptied reaches nothing wanted.
                (true, Add::ClearBasis(t)) | (false, Add::ClearInverse(t)) if live[t as usize] => {
                    needed.push(i);
                    live[t as usize] = false;
                }
                _ => {}
            }
        }
        let rows = (0..self.n as u32).map(|t| if start[t as usize] { vec![(t, Mono::ONE)] } else { Vec::new() });
        let mut a = Additions { basis: Vec::new(), inverse_rows: Vec::new(), spare: Spare::default() };
        *(if basis { &mut a.basis } else { &mut a.inverse_rows }) = rows.collect();
        needed.iter().rev().try_for_each(|&i| a.apply(self.adds[i]))?;
        Ok(if basis { a.basis } else { a.inverse_rows })
    }

    /// Every inverse row restricted to the generators `columns` (row operations act on each
    /// column alone): from the unit rows of `columns`, the additions from a non-zero row.
    pub fn columns(&self, columns: &[u32]) -> Result<Vec<Vector>, String> {
        let mut a = Additions { basis: Vec::new(), inverse_rows: vec![Vec::new(); self.n], spare: Spare::default() };
        for &g in columns {
            a.inverse_rows[g as usize] = vec![(g, Mono::ONE)];
        }
        for &add in &self.adds {
            match add {
                Add::Inverse(_, _, s) if a.inverse_rows[s as usize].is_empty() => {}
                Add::Inverse(..) | Add::ClearInverse(_) => a.apply(add)?,
                _ => {}
            }
        }
        Ok(a.inverse_rows)
    }
}

/// The pivot loop of [`normal_form`] with [`Pivots::Units`], its additions recorded rather than
/// applied: (pairs, survivors, ∂ among survivors, the additions).
#[allow(clippy::type_complexity)]
pub fn unit_pivots(c: &Complex) -> Result<(Vec<(u32, u32, Mono)>, Vec<u32>, Vec<Vector>, Replay), String> {
    let mut sink = Sink::Log(Vec::new());
    let (pairs, survivors, out) = pivot(c, Pivots::Units, &mut sink)?;
    let Sink::Log(adds) = sink else { unreachable!("made here") };
    Ok((pairs, survivors, out, Replay { adds, n: c.names.len() }))
}

/// Calls `f(t, true)` for each generator t that occurs in `new` but not in `old`, and
/// `f(t, false)` for each in `old` but not in `new` (both sorted by generator).
fn each_change(old: &[(u32, Mono)], new: &[(u32, Mono)], mut f: impl FnMut(u32, bool)) {
    // The index after the run of terms into the generator at i; past the end, "generator" 2^32.
    let past = |v: &[(u32, Mono)], i: usize| i + v[i..].iter().take_while(|t| t.0 == v[i].0).count();
    let at = |v: &[(u32, Mono)], i: usize| v.get(i).map_or(1u64 << 32, |t| t.0 as u64);
    let (mut i, mut j) = (0, 0);
    loop {
        let (a, b) = (at(old, i), at(new, j));
        match a.cmp(&b) {
            std::cmp::Ordering::Equal if a == 1 << 32 => break,
            std::cmp::Ordering::Equal => (i, j) = (past(old, i), past(new, j)),
            std::cmp::Ordering::Less => {
                f(a as u32, false);
                i = past(old, i);
            }
            std::cmp::Ordering::Greater => {
                f(b as u32, true);
                j = past(new, j);
            }
        }
    }
}

/// Candidate pivots, smallest key first: the arrows present at the start, sorted once (a scan,
/// where a heap of all of them would cost a cache miss per level), merged with a heap of the
/// arrows pushed later. The order of pops is the order of one heap holding everything.
struct Candidates<K: Ord + Copy> {
    initial: Vec<K>,
    next: usize,
    later: BinaryHeap<Reverse<K>>,
}

impl<K: Ord + Copy> Candidates<K> {
    fn pop(&mut self) -> Option<K> {
        match (self.initial.get(self.next), self.later.peek()) {
            (Some(&i), Some(&Reverse(l))) if l < i => self.later.pop().map(|r| r.0),
            (Some(&i), _) => {
                self.next += 1;
                Some(i)
            }
            (None, _) => self.later.pop().map(|r| r.0),
        }
    }
}

/// The monomial of the only term of `row` into `b`, if there is exactly one.
fn only_term(row: &Vector, b: u32) -> Option<Mono> {
    let i = row.partition_point(|t| t.0 < b);
    let first = row.get(i).filter(|t| t.0 == b)?;
    row.get(i + 1).is_none_or(|t| t.0 != b).then_some(first.1)
}

/// A candidate pivot a → m·b: (degree of m, fill-in cost, a, b, m) packed as
/// (degree·2^42 + cost, a·2^32 + b, m), the same order in 24 bytes (degrees stay below 2^22; a
/// cost past 2^42 is capped). The cost is the Markowitz count (sources of b − 1)·(terms of ∂a − 1).
type Key = (u64, u64, Mono);

fn key(a: u32, b: u32, m: Mono, row_len: usize, sources_of_b: usize) -> Key {
    let cost = (sources_of_b.saturating_sub(1) * row_len.saturating_sub(1)) as u64;
    ((total_degree(m) << 42) | cost.min((1 << 42) - 1), ((a as u64) << 32) | b as u64, m)
}

/// Pivots are popped smallest key first. With [`Pivots::Minimal`] every candidate of a row is
/// pushed again whenever the row changes (a pivot refused for divisibility gets its next
/// chance then). With [`Pivots::Units`] any order gives a valid reduction and the key only
/// steers fill-in, so a row change pushes only the arrows that became candidates, and a popped
/// key that has grown stale (a longer row, more sources) is pushed again with its present cost
/// instead of being used: far fewer heap entries on dense complexes, each candidate present at
/// least once. Only what a [`Reduction`](super::reduce::Reduction) reads is kept for `Units`:
/// the basis vectors of cancelled targets and the inverse rows of cancelled sources are left
/// empty.
pub fn normal_form(c: &Complex, pivots: Pivots) -> Result<NormalForm, String> {
    let n = c.names.len();
    let unit = |t: u32| vec![(t, Mono::ONE)];
    let mut sink = Sink::Here(Additions {
        basis: (0..n as u32).map(unit).collect(),
        inverse_rows: (0..n as u32).map(unit).collect(),
        spare: Spare::default(),
    });
    let (pairs, survivors, out) = pivot(c, pivots, &mut sink)?;
    let Sink::Here(Additions { basis, inverse_rows, .. }) = sink else { unreachable!("made here") };
    Ok(NormalForm { basis, inverse_rows, pairs, survivors, out })
}

/// The pivot loop of [`normal_form`]: returns (pairs, survivors, ∂ among survivors), the
/// additions to the basis and inverse rows going to `sink`.
#[allow(clippy::type_complexity)]
fn pivot(
    c: &Complex,
    pivots: Pivots,
    sink: &mut Sink,
) -> Result<(Vec<(u32, u32, Mono)>, Vec<u32>, Vec<Vector>), String> {
    let units = pivots == Pivots::Units;
    let n = c.names.len();
    let mut out: Vec<Vector> = c.d.rows.clone();
    let mut inc: Vec<Sources> = vec![Sources::default(); n];
    for (a, row) in out.iter().enumerate() {
        for &(b, _) in row {
            inc[b as usize].insert(a as u32);
        }
    }
    let mut done = vec![false; n];
    let mut pairs = Vec::new();
    // The candidates of row a, except those that were candidates of `old` already.
    let arrows = |a: u32, row: &Vector, old: Option<&Vector>, inc: &[Sources], into: &mut dyn FnMut(Key)| {
        for (i, &(b, m)) in row.iter().enumerate() {
            let single = (i == 0 || row[i - 1].0 != b) && row.get(i + 1).is_none_or(|t| t.0 != b);
            if single && a != b && (!units || m == Mono::ONE) && old.is_none_or(|o| only_term(o, b) != Some(m)) {
                into(key(a, b, m, row.len(), inc[b as usize].len()));
            }
        }
    };
    let mut initial = Vec::new();
    for (a, row) in out.iter().enumerate() {
        arrows(a as u32, row, None, &inc, &mut |k| initial.push(k));
    }
    initial.sort_unstable();
    let mut heap = Candidates { initial, next: 0, later: BinaryHeap::new() };
    let (mut spare, mut others, mut factor) = (Spare::default(), Vec::new(), Vec::new());
    while let Some((k, ab, m)) = heap.pop() {
        let (a, b) = ((ab >> 32) as u32, ab as u32);
        let (au, bu) = (a as usize, b as usize);
        if done[au] || done[bu] || only_term(&out[au], b) != Some(m) {
            continue;
        }
        if units {
            let now = key(a, b, m, out[au].len(), inc[bu].len());
            if now.0 > k {
                heap.later.push(Reverse(now));
                continue;
            }
        }
        others.clear();
        others.extend(inc[bu].iter().copied().filter(|&x| x != a));
        let divides = |row: &[(u32, Mono)]| row.iter().all(|t| t.1.checked_div(m).is_some());
        if m != Mono::ONE && (!divides(&out[au]) || others.iter().any(|&x| !divides(terms_into(&out[x as usize], b)))) {
            continue;
        }
        // Taken out while the other rows change (a is none of them), put back below.
        let mut row_a = std::mem::take(&mut out[au]);
        for &a2 in &others {
            let a2u = a2 as usize;
            factor.clear();
            factor.extend(terms_into(&out[a2u], b).iter().map(|c| c.1.checked_div(m).expect("checked")));
            let before = std::mem::take(&mut out[a2u]);
            spare.plus_multiple(&before, &factor, &row_a)?;
            let after = std::mem::replace(&mut spare.out, before);
            let before = &spare.out;
            // Only the generators that enter or leave the row change their sources.
            each_change(before, &after, |t, entered| match entered {
                true => inc[t as usize].insert(a2),
                false => inc[t as usize].remove(&a2),
            });
            arrows(a2, &after, units.then_some(before), &inc, &mut |k| heap.later.push(Reverse(k)));
            out[a2u] = after;
            for &f in &factor {
                sink.add(Add::Basis(a2, f, a))?;
            }
            if !units {
                for &f in &factor {
                    sink.add(Add::Inverse(a, f, a2))?;
                }
            }
        }
        if units {
            sink.add(Add::ClearInverse(a))?;
        }
        // Nothing hits a any more (∂∂ = 0 forces the true row of a to vanish).
        for x in std::mem::take(&mut inc[au]).0 {
            out[x as usize].retain(|t| t.0 != a);
        }
        // b ← b + Σ (c''/m)·b'' absorbs the rest of ∂a.
        for &(b2, c2) in row_a.iter().filter(|t| t.0 != b) {
            let f = c2.checked_div(m).expect("checked");
            if !units {
                sink.add(Add::Basis(b, f, b2))?;
            }
            sink.add(Add::Inverse(b2, f, b))?;
            inc[b2 as usize].remove(&a);
        }
        if units {
            sink.add(Add::ClearBasis(b))?;
        }
        row_a.clear();
        row_a.push((b, m));
        out[au] = row_a;
        // ∂b = 0 in the new basis.
        for (t, _) in std::mem::take(&mut out[bu]) {
            inc[t as usize].remove(&b);
        }
        done[au] = true;
        done[bu] = true;
        pairs.push((a, b, m));
        if pairs.len() % 4096 == 0 {
            crate::progress::report(&format!("cancelling arrows in {}", c.name), 2 * pairs.len(), n);
        }
    }
    crate::progress::done();
    let survivors = (0..n as u32).filter(|&t| !done[t as usize]).collect();
    for (a, _, _) in &pairs {
        out[*a as usize].clear();
    }
    Ok((pairs, survivors, out))
}
