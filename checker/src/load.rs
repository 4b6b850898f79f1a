//! From the data model to indexed sparse objects, with every structural problem reported:
//! unknown names (with a suggestion), malformed coefficients, wrong grading lengths, repeated
//! terms. Homogeneity failures are recorded per object as *defects*: they make the object's
//! implicit claim (complex / chain map) fail rather than the file unreadable.

use crate::algebra::SparseMap;
use crate::report_terms::suggest;
use std::collections::{BTreeMap, HashMap};
use std::sync::atomic::{AtomicU64, AtomicUsize, Ordering::Relaxed};
use std::sync::OnceLock;
use tubecert_format::limits::{
    self, grading_in_bounds, MAX_GENERATORS, MAX_GRADING_ABS, MAX_REPORTED_ERRORS, MAX_SUGGESTIONS, MAX_TERMS,
};
use tubecert_format::names::{check_map_name, check_name, check_object_name};
use tubecert_format::poly::{parse_mono, parse_poly};
use tubecert_format::statement::render_grading;
use tubecert_format::{ComplexSpec, Grading, MapExpr, MapSpec, Mono, Ring, RingInfo, Term, UniqueMap};

/// Collected error messages, capped at [`MAX_REPORTED_ERRORS`], and how many unknown names
/// may still get a "did you mean" (none by default: only a file's loading suggests).
#[derive(Debug, Default)]
pub struct Errors(pub Vec<String>, pub usize);

impl Errors {
    pub fn push(&mut self, msg: String) {
        match self.0.len() {
            n if n < MAX_REPORTED_ERRORS => self.0.push(msg),
            MAX_REPORTED_ERRORS => self.0.push("… further errors not shown".into()),
            _ => {}
        }
    }
}

/// Generator names → indices. Names of up to 22 bytes are kept inline in the table, so a
/// lookup in a large complex costs one memory access rather than two (the hot path of loading).
#[derive(Debug, Default)]
pub struct NameIndex(HashMap<NameKey, u32>);

/// A name of up to 22 bytes is stored as its length and bytes, in place.
#[derive(Debug, PartialEq, Eq, Hash)]
enum NameKey {
    Short([u8; 23]),
    Long(String),
}

fn name_key(s: &str) -> NameKey {
    if s.len() > 22 {
        return NameKey::Long(s.to_string());
    }
    let mut b = [0; 23];
    b[0] = s.len() as u8;
    b[1..=s.len()].copy_from_slice(s.as_bytes());
    NameKey::Short(b)
}

impl NameIndex {
    pub fn new<'a>(names: impl Iterator<Item = &'a String>) -> NameIndex {
        NameIndex(names.enumerate().map(|(i, n)| (name_key(n), i as u32)).collect())
    }
    pub fn get(&self, name: &str) -> Option<u32> {
        self.0.get(&name_key(name)).copied()
    }
}

/// The grading vectors of a complex's generators in one allocation (row i is generator i), so
/// that reading the grading of a random generator costs one memory access.
#[derive(Debug, Clone, Default)]
pub struct Gradings {
    width: usize,
    flat: Vec<i64>,
}

impl Gradings {
    /// Rows of the wrong length (already reported by the caller) are padded or cut to `width`.
    pub fn new<'a>(width: usize, rows: impl Iterator<Item = &'a [i64]>) -> Gradings {
        let flat = rows.flat_map(|r| (0..width).map(|i| r.get(i).copied().unwrap_or(0))).collect();
        Gradings { width, flat }
    }
    pub fn iter(&self) -> impl Iterator<Item = &[i64]> {
        self.flat.chunks_exact(self.width.max(1))
    }
}

impl std::ops::Index<usize> for Gradings {
    type Output = [i64];
    fn index(&self, i: usize) -> &[i64] {
        &self.flat[i * self.width..(i + 1) * self.width]
    }
}

#[derive(Debug)]
pub struct Complex {
    pub name: String,
    pub names: Vec<String>,
    pub index: NameIndex,
    pub gradings: Gradings,
    pub d: SparseMap,
    /// Terms of ∂ that are not homogeneous of the differential's degree.
    pub defects: Vec<String>,
}

impl Complex {
    pub fn new(name: String, names: Vec<String>, gradings: Gradings, d: SparseMap) -> Complex {
        Complex { name, index: NameIndex::new(names.iter()), names, gradings, d, defects: Vec::new() }
    }
}

/// A declared map, or one computed from an expression or a witness (then without defects).
#[derive(Debug, Clone)]
pub struct Map {
    pub from: usize,
    pub to: usize,
    pub degree: Grading,
    pub m: SparseMap,
    /// Terms that are not homogeneous of the map's degree.
    pub defects: Vec<String>,
}

#[derive(Debug)]
pub struct Context {
    pub ring: RingInfo,
    pub complexes: Vec<Complex>,
    pub complex_index: BTreeMap<String, usize>,
    pub maps: Vec<Map>,
    pub map_index: BTreeMap<String, usize>,
    /// The file's work budget; unlimited until the caller sets one.
    pub work: Work,
    /// "Did you mean" suggestions left for this file.
    pub hints: AtomicUsize,
}

/// The work budget of one file (`limits::work_limit`). Each check counts the units it is
/// about to spend (terms touched, rows allocated) and is refused before starting beyond it;
/// once refused, the file is unreadable (exit 2), never a failed claim.
#[derive(Debug)]
pub struct Work {
    pub limit: u64,
    used: AtomicU64,
    /// The first refusal, if the budget ran out.
    pub refused: OnceLock<String>,
}

impl Work {
    pub fn new(limit: u64) -> Work {
        Work { limit, used: AtomicU64::new(0), refused: OnceLock::new() }
    }
    /// Counts `units` for `what`; an error naming the limit if the file's work would pass it.
    pub fn spend(&self, units: u64, what: &str) -> Result<(), String> {
        let before = self.used.fetch_update(Relaxed, Relaxed, |u| Some(u.saturating_add(units))).unwrap_or(0);
        if before.saturating_add(units) <= self.limit {
            return Ok(());
        }
        let (limit, per_byte, base) = (self.limit, limits::WORK_PER_BYTE, limits::WORK_BASE);
        let msg = format!("work limit: {what} needs {units} units of work (terms touched, rows allocated), beyond the {limit} this file may use (limits::work_limit: {per_byte} per byte + {base})");
        Err(self.refused.get_or_init(|| msg).clone())
    }
    /// The units counted so far.
    pub fn spent(&self) -> u64 {
        self.used.load(Relaxed)
    }
}

pub fn grading_sum(a: &[i64], b: &[i64]) -> Grading {
    a.iter().zip(b).map(|(x, y)| x + y).collect()
}

/// `f` on 0..n, or, when n is large, on its two halves on the machine's two cores; the
/// results in order, so that what is reported does not depend on timing.
pub fn in_two_halves<T: Send>(n: usize, f: impl Fn(std::ops::Range<usize>) -> T + Sync) -> Vec<T> {
    if n < 100_000 {
        return vec![f(0..n)];
    }
    std::thread::scope(|s| {
        let second = s.spawn(|| f(n / 2..n));
        vec![f(0..n / 2), second.join().expect("the work of each half does not panic")]
    })
}

/// Reads sparse terms `[from, coefficient, to]` of a map `src → dst` homogeneous of `degree`.
/// Structural errors go to `errs`; non-homogeneous terms are returned as defects. Without a
/// degree (dual witnesses), each coefficient must be one monomial, of any degree.
pub fn read_terms(
    ring: &RingInfo,
    src: &Complex,
    dst: &Complex,
    degree: Option<&[i64]>,
    terms: &[Term],
    what: &str,
    errs: &mut Errors,
) -> (SparseMap, Vec<String>) {
    let mut map = SparseMap::zero(src.names.len());
    if terms.len() > MAX_TERMS {
        errs.push(format!("{what}: {} terms, above the limit {MAX_TERMS}", terms.len()));
        return (map, Vec::new());
    }
    let (n, hints) = (ring.gradings.len(), errs.1);
    // The terms of `range`: the triples (from, to, monomial), structural errors, non-homogeneous
    // terms. Name lookups dominate loading a large complex: two halves on the machine's two cores.
    let resolve = |range: std::ops::Range<usize>| {
        let (mut triples, mut errs, mut defects) = (Vec::with_capacity(range.len()), Errors(vec![], hints), vec![]);
        let lookup = |c: &Complex, name: &str, errs: &mut Errors, pos: usize| {
            let found = c.index.get(name);
            if found.is_none() {
                let hint = if errs.0.len() < errs.1 { suggest(name, c.names.iter()) } else { String::new() };
                errs.push(format!("{what}, term {pos}: generator \"{name}\" is not in complex {}{hint}", c.name));
            }
            found
        };
        let mut last_from: Option<(&str, u32)> = None; // terms come grouped by source: look up once
        for (pos, [from, coef, to]) in (range.start + 1..).zip(&terms[range]) {
            let x = match last_from {
                Some((name, i)) if name == from => Some(i),
                _ => lookup(src, from, &mut errs, pos),
            };
            last_from = x.map(|i| (from.as_str(), i));
            let y = lookup(dst, to, &mut errs, pos);
            // (first monomial, the rest): a single monomial, the common case, allocates nothing.
            let monos = match degree.is_none() || !coef.contains('+') {
                true => parse_mono(coef, &ring.variables).map(|m| (m, Vec::new())),
                false => parse_poly(coef, &ring.variables).map(|v| (v[0], v[1..].to_vec())),
            };
            let monos = monos.map_err(|e| errs.push(format!("{what}, term {pos} [{from}, {coef}, {to}]: {e}")));
            let (Ok((first, rest)), Some(x), Some(y)) = (monos, x, y) else { continue };
            let (gx, gy) = (&src.gradings[x as usize], &dst.gradings[y as usize]);
            for m in std::iter::once(first).chain(rest) {
                triples.push((x, y, m));
                let Some(degree) = degree else { continue };
                // deg(to) + deg(m) = deg(from) + degree, compared without allocating (hot loop).
                let homogeneous = [gx.len(), gy.len(), degree.len()] == [n; 3]
                    && (0..n).all(|i| gy[i] + ring.degree_at(m, i) == gx[i] + degree[i]);
                if !homogeneous && defects.len() < MAX_REPORTED_ERRORS {
                    defects.push(format!(
                        "{what}, term {pos} [{from}, {coef}, {to}]: not homogeneous: {} · {to} has degree {}, expected {} (degree of {from} plus {})",
                        m.render(&ring.variables),
                        render_grading(&grading_sum(gy, &ring.degree(m))),
                        render_grading(&grading_sum(gx, degree)),
                        render_grading(&degree.to_vec())
                    ));
                }
            }
        }
        (triples, errs, defects)
    };
    let mut defects = Vec::new();
    for (triples, part_errs, part_defects) in in_two_halves(terms.len(), resolve) {
        errs.1 = errs.1.saturating_sub(part_errs.0.len());
        part_errs.0.into_iter().for_each(|e| errs.push(e));
        defects.extend(part_defects);
        for (x, y, m) in triples {
            map.rows[x as usize].push((y, m));
        }
    }
    defects.truncate(MAX_REPORTED_ERRORS);
    for (x, row) in map.rows.iter_mut().enumerate() {
        let before = row.len();
        row.sort_unstable();
        row.dedup();
        if row.len() != before {
            errs.push(format!("{what}: generator \"{}\" has a repeated term (list each term once)", src.names[x]));
        }
    }
    (map, defects)
}

/// The complex `name` with generators `gens` (name → grading) and differential `d`.
pub fn read_complex(ring: &RingInfo, name: &str, gens: &UniqueMap<Grading>, d: &[Term], errs: &mut Errors) -> Complex {
    let n = ring.gradings.len();
    if gens.len() > MAX_GENERATORS {
        errs.push(format!("complex {name}: {} generators, above the limit {MAX_GENERATORS}", gens.len()));
        return Complex::new(name.into(), vec![], Gradings::default(), SparseMap::zero(0));
        // read no further
    }
    let mut graded = true; // every grading readable: then the differential's degrees are
    for (g, gr) in gens.iter() {
        if let Err(e) = check_name(g) {
            errs.push(format!("complex {name}, generator {e}"));
        }
        let wrong = if !gr.iter().all(|&x| grading_in_bounds(x)) {
            format!("a grading entry is beyond ±{MAX_GRADING_ABS}")
        } else if gr.len() != n {
            let expected = ring.gradings.join(", ");
            format!("grading {} has {} entries, expected {n} ({expected})", render_grading(gr), gr.len())
        } else {
            continue;
        };
        errs.push(format!("complex {name}, generator \"{g}\": {wrong}"));
        graded = false;
    }
    let gradings = Gradings::new(n, gens.values().map(|g| &g[..]));
    let mut c = Complex::new(name.to_string(), gens.keys().cloned().collect(), gradings, SparseMap::zero(0));
    if graded {
        let what = format!("complex {name}, differential");
        (c.d, c.defects) = read_terms(ring, &c, &c, Some(&ring.differential_degree), d, &what, errs);
    }
    c
}

/// Builds the indexed context of a ring with its complexes and maps; any structural error
/// makes it fail.
pub fn load(
    ring: &Ring,
    complexes: &UniqueMap<ComplexSpec>,
    maps: &UniqueMap<MapSpec>,
) -> Result<Context, Vec<String>> {
    let (ctx, errs) = load_lenient(ring, complexes, maps)?;
    errs.0.is_empty().then_some(ctx).ok_or(errs.0)
}

/// Like [`load`], but returns the context together with its structural errors (terms that did
/// not resolve are left out), so that a validator can go on to report everything else.
pub fn load_lenient(
    ring: &Ring,
    complexes: &UniqueMap<ComplexSpec>,
    maps: &UniqueMap<MapSpec>,
) -> Result<(Context, Errors), Vec<String>> {
    let ring = RingInfo::new(ring)?;
    // Names first: later messages print them.
    let complex_names = complexes.keys().map(|n| check_object_name(n).map_err(|e| format!("complex {e}")));
    let map_names = maps.keys().map(|n| check_map_name(n).map_err(|e| format!("map {e}")));
    let bad: Vec<String> = complex_names.chain(map_names).filter_map(Result::err).collect();
    bad.is_empty().then_some(()).ok_or(bad)?;
    let mut errs = Errors(Vec::new(), MAX_SUGGESTIONS);
    let complexes =
        complexes.iter().map(|(n, s)| read_complex(&ring, n, &s.generators, &s.differential, &mut errs)).collect();
    let mut ctx = Context::new(ring, complexes, Work::new(u64::MAX), errs.1);
    for (name, spec) in maps.iter() {
        let mut side = |c: &str| ctx.complex_named(c).map_err(|e| errs.push(format!("map {name}: {e}"))).ok();
        let (Some(from), Some(to)) = (side(&spec.from), side(&spec.to)) else { continue };
        let n = ctx.ring.gradings.len();
        if spec.degree.len() != n || !spec.degree.iter().all(|&x| grading_in_bounds(x)) {
            let found = render_grading(&spec.degree);
            errs.push(format!("map {name}: degree must have {n} entries within ±{MAX_GRADING_ABS}, found {found}"));
            continue;
        }
        let (what, c, d) = (format!("map {name}"), &ctx.complexes[from], &ctx.complexes[to]);
        errs.1 = ctx.hints.load(Relaxed);
        let (m, defects) = read_terms(&ctx.ring, c, d, Some(&spec.degree), &spec.terms, &what, &mut errs);
        ctx.hints.store(errs.1, Relaxed);
        ctx.map_index.insert(name.clone(), ctx.maps.len());
        ctx.maps.push(Map { from, to, degree: spec.degree.clone(), m, defects });
    }
    Ok((ctx, errs))
}

impl Context {
    /// The context of `complexes` over `ring`, without maps.
    fn new(ring: RingInfo, complexes: Vec<Complex>, work: Work, hints: usize) -> Context {
        let complex_index = complexes.iter().enumerate().map(|(i, c)| (c.name.clone(), i)).collect();
        let (maps, map_index, hints) = (Vec::new(), BTreeMap::new(), AtomicUsize::new(hints));
        Context { ring, complexes, complex_index, maps, map_index, work, hints }
    }

    /// "Did you mean" for an unknown name, while this file has suggestions left.
    pub fn hint<'a>(&self, name: &str, known: impl Iterator<Item = &'a String> + Clone) -> String {
        let left = self.hints.fetch_update(Relaxed, Relaxed, |h| h.checked_sub(1));
        left.map_or(String::new(), |_| suggest(name, known))
    }

    /// The index of the complex or map `name` in `index`, or why there is none.
    fn named(&self, kind: &str, index: &BTreeMap<String, usize>, name: &str) -> Result<usize, String> {
        let found = index.get(name).copied();
        found.ok_or_else(|| format!("{kind} \"{name}\" is not declared{}", self.hint(name, index.keys())))
    }

    pub fn complex_named(&self, name: &str) -> Result<usize, String> {
        self.named("complex", &self.complex_index, name)
    }

    pub fn map_named(&self, name: &str) -> Result<usize, String> {
        self.named("map", &self.map_index, name)
    }

    /// Evaluates a map expression to an explicit map, checking sources, targets and degrees.
    pub fn eval(&self, e: &MapExpr) -> Result<Map, String> {
        match e {
            MapExpr::Named(n) => {
                let m = &self.maps[self.map_named(n)?];
                self.work.spend(m.m.size(), &format!("a copy of map {n}"))?;
                Ok(Map { defects: Vec::new(), ..m.clone() })
            }
            MapExpr::Id(c) => {
                let c = self.complex_named(c)?;
                let n = self.complexes[c].names.len();
                self.work.spend(n as u64, "an identity map")?;
                let degree = vec![0; self.ring.gradings.len()];
                Ok(Map { from: c, to: c, degree, m: SparseMap::identity(n), defects: Vec::new() })
            }
            MapExpr::Times(mono, inner) => {
                let m = parse_mono(mono, &self.ring.variables)?;
                let v = self.eval(inner)?;
                self.work.spend(v.m.size(), "a multiple of a map")?;
                Ok(Map { degree: grading_sum(&v.degree, &self.ring.degree(m)), m: v.m.times(m)?, ..v })
            }
            MapExpr::Sum(es) => {
                let mut acc = self.eval(&es[0])?;
                for e in &es[1..] {
                    let v = self.eval(e)?;
                    if (v.from, v.to, &v.degree) != (acc.from, acc.to, &acc.degree) {
                        let (a, b) = (self.signature(&acc), self.signature(&v));
                        return Err(format!("sum of maps with different source, target or degree: {a} vs {b}"));
                    }
                    self.work.spend(acc.m.size().saturating_add(v.m.size()), "a sum of maps")?;
                    acc.m = acc.m.plus(&v.m);
                }
                Ok(acc)
            }
            MapExpr::Compose(es) => {
                let mut acc = self.eval(es.last().expect("non-empty"))?;
                for e in es.iter().rev().skip(1) {
                    let outer = self.eval(e)?;
                    if outer.from != acc.to {
                        let (a, b) = (self.signature(&outer), self.signature(&acc));
                        return Err(format!("composition {a} after {b}: target and source differ"));
                    }
                    self.work.spend(outer.m.work_after(&acc.m), "a composition of maps")?;
                    let degree = grading_sum(&acc.degree, &outer.degree);
                    acc = Map { to: outer.to, degree, m: outer.m.after(&acc.m)?, ..acc };
                }
                Ok(acc)
            }
        }
    }

    pub fn signature(&self, v: &Map) -> String {
        let (from, to) = (&self.complexes[v.from].name, &self.complexes[v.to].name);
        format!("{from} → {to} of degree {}", render_grading(&v.degree))
    }

    /// Complex c with the variable `var` set to 0: the quotient C/(var), over the ring in the
    /// other variable, with the same gradings. A context of its own, holding just that complex,
    /// so every check on one complex applies to it unchanged (∂∂ = 0 and homogeneity are checked
    /// on C itself).
    pub fn quotient(&self, c: usize, var: &str) -> Result<Context, String> {
        let v = self.ring.var_index(var).ok_or_else(|| format!("variable {var} is not declared"))?;
        let mut ring = self.ring.clone();
        ring.variables.remove(v);
        ring.var_degrees.remove(v);
        // The terms kept have exponent 0 in var, which moves to the last, unused place: the
        // order of the terms and their distinctness are kept.
        let relabel = |Mono(mut e): Mono| {
            e[v..].rotate_left(1);
            Mono(e)
        };
        let cx = &self.complexes[c];
        self.work.spend(cx.d.size(), &format!("the quotient {}/({var})", cx.name))?;
        let rows =
            cx.d.rows.iter().map(|r| r.iter().filter(|t| t.1 .0[v] == 0).map(|&(g, m)| (g, relabel(m))).collect());
        let d = SparseMap { rows: rows.collect() };
        let complex = Complex::new(format!("{}/({var})", cx.name), cx.names.clone(), cx.gradings.clone(), d);
        // Its checks go on counting where this context's stand (the caller adds what they
        // spend back here, `verify::check_homology`): one budget per file, however many claims.
        let work = Work::new(self.work.limit);
        work.used.store(self.work.spent(), Relaxed);
        Ok(Context::new(ring, vec![complex], work, 0))
    }
}
