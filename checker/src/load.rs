//! From the data model to indexed sparse objects, with every structural problem reported:
//! unknown names (with a suggestion), malformed coefficients, wrong grading lengths, repeated
//! terms. Homogeneity failures are recorded per object as *defects*: they make the object's
//! implicit claim (complex / chain map) fail rather than the file unreadable.

use crate::algebra::SparseMap;
use crate::report_terms::suggest;
use std::collections::{BTreeMap, HashMap};
use tubecert_format::limits::{grading_in_bounds, MAX_GENERATORS, MAX_GRADING_ABS, MAX_REPORTED_ERRORS, MAX_TERMS};
use tubecert_format::names::{check_map_name, check_name};
use tubecert_format::poly::{parse_mono, parse_poly};
use tubecert_format::statement::render_grading;
use tubecert_format::{ComplexSpec, Grading, MapExpr, MapSpec, Mono, Ring, RingInfo, Term, UniqueMap};

/// Collected error messages, capped at [`MAX_REPORTED_ERRORS`].
#[derive(Debug, Default)]
pub struct Errors(pub Vec<String>);

impl Errors {
    pub fn push(&mut self, msg: String) {
        if self.0.len() < MAX_REPORTED_ERRORS {
            self.0.push(msg);
        } else if self.0.len() == MAX_REPORTED_ERRORS {
            self.0.push("… further errors not shown".into());
        }
    }
    pub fn into_result<T>(self, value: T) -> Result<T, Vec<String>> {
        if self.0.is_empty() {
            Ok(value)
        } else {
            Err(self.0)
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
    match s.len() {
        n @ 0..=22 => {
            let mut b = [0; 23];
            b[0] = n as u8;
            b[1..=n].copy_from_slice(s.as_bytes());
            NameKey::Short(b)
        }
        _ => NameKey::Long(s.to_string()),
    }
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
        let mut flat = Vec::new();
        for r in rows {
            flat.extend((0..width).map(|i| r.get(i).copied().unwrap_or(0)));
        }
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

#[derive(Debug)]
pub struct Map {
    pub from: usize,
    pub to: usize,
    pub degree: Grading,
    pub m: SparseMap,
    pub defects: Vec<String>,
}

#[derive(Debug)]
pub struct Context {
    pub ring: RingInfo,
    pub complexes: Vec<Complex>,
    pub complex_index: BTreeMap<String, usize>,
    pub maps: Vec<Map>,
    pub map_index: BTreeMap<String, usize>,
}

/// A map computed from an expression or a witness, with its source, target and degree.
#[derive(Debug, Clone)]
pub struct Evaluated {
    pub from: usize,
    pub to: usize,
    pub degree: Grading,
    pub m: SparseMap,
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

/// Resolves names and coefficients of `terms` (numbered from `offset` + 1 in messages):
/// the triples (from, to, monomial), structural errors, non-homogeneous terms.
#[allow(clippy::too_many_arguments, clippy::type_complexity)]
fn resolve(
    ring: &RingInfo,
    src: &Complex,
    dst: &Complex,
    degree: &[i64],
    terms: &[Term],
    offset: usize,
    what: &str,
    single_monomial: bool,
) -> (Vec<(u32, u32, Mono)>, Vec<String>, Vec<String>) {
    let (mut triples, mut errs, mut defects) = (Vec::with_capacity(terms.len()), Vec::new(), Vec::new());
    let lookup = |c: &Complex, n: &str, errs: &mut Vec<String>, pos: usize| {
        let found = c.index.get(n);
        if found.is_none() && errs.len() <= MAX_REPORTED_ERRORS {
            errs.push(format!(
                "{what}, term {pos}: generator \"{n}\" is not in complex {}{}",
                c.name,
                suggest(n, c.names.iter())
            ));
        }
        found
    };
    let mut last_from: Option<(&str, u32)> = None; // terms come grouped by source: look up once
    for (k, [from, coef, to]) in terms.iter().enumerate() {
        let pos = offset + k + 1;
        let x = match last_from {
            Some((name, i)) if name == from => Some(i),
            _ => lookup(src, from, &mut errs, pos),
        };
        last_from = x.map(|i| (from.as_str(), i));
        let y = lookup(dst, to, &mut errs, pos);
        // (first monomial, the rest): a single monomial, the common case, allocates nothing.
        let monos = if single_monomial || !coef.contains('+') {
            parse_mono(coef, &ring.variables).map(|m| (m, Vec::new()))
        } else {
            parse_poly(coef, &ring.variables).map(|v| (v[0], v[1..].to_vec()))
        };
        let (first, rest) = match monos {
            Ok(m) => m,
            Err(e) => {
                if errs.len() <= MAX_REPORTED_ERRORS {
                    errs.push(format!("{what}, term {pos} [{from}, {coef}, {to}]: {e}"));
                }
                continue;
            }
        };
        let (Some(x), Some(y)) = (x, y) else { continue };
        let (gx, gy) = (&src.gradings[x as usize], &dst.gradings[y as usize]);
        for m in std::iter::once(first).chain(rest) {
            // deg(to) + deg(m) = deg(from) + degree, compared without allocating (hot loop).
            let n = ring.gradings.len();
            let homogeneous = [gx.len(), gy.len(), degree.len()] == [n; 3]
                && (0..n).all(|i| gy[i] + ring.degree_at(m, i) == gx[i] + degree[i]);
            if !homogeneous && defects.len() < MAX_REPORTED_ERRORS {
                let (expected, found) = (grading_sum(gx, degree), grading_sum(gy, &ring.degree(m)));
                defects.push(format!(
                    "{what}, term {pos} [{from}, {coef}, {to}]: not homogeneous: {} · {to} has degree {}, expected {} (degree of {from} plus {})",
                    m.render(&ring.variables),
                    render_grading(&found),
                    render_grading(&expected),
                    render_grading(&degree.to_vec())
                ));
            }
            triples.push((x, y, m));
        }
    }
    (triples, errs, defects)
}

/// Reads sparse terms `[from, coefficient, to]` of a map `src → dst` of degree `degree`.
/// Structural errors go to `errs`; non-homogeneous terms are returned as defects.
/// With `single_monomial`, each coefficient must be one monomial (dual witnesses).
#[allow(clippy::too_many_arguments)]
pub fn read_terms(
    ring: &RingInfo,
    src: &Complex,
    dst: &Complex,
    degree: &[i64],
    terms: &[Term],
    what: &str,
    single_monomial: bool,
    errs: &mut Errors,
) -> (SparseMap, Vec<String>) {
    let mut map = SparseMap::zero(src.names.len());
    if terms.len() > MAX_TERMS {
        errs.push(format!("{what}: {} terms, above the limit {MAX_TERMS}", terms.len()));
        return (map, Vec::new());
    }
    // Name lookups dominate loading a large complex: two halves on the machine's two cores.
    let parts = in_two_halves(terms.len(), |r| {
        resolve(ring, src, dst, degree, &terms[r.clone()], r.start, what, single_monomial)
    });
    let mut defects = Vec::new();
    for (triples, part_errs, part_defects) in parts {
        part_errs.into_iter().for_each(|e| errs.push(e));
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

pub fn read_complex(ring: &RingInfo, name: &str, spec: &ComplexSpec, errs: &mut Errors) -> Complex {
    let empty = UniqueMap::default();
    let gens = if spec.generators.len() > MAX_GENERATORS {
        errs.push(format!("complex {name}: {} generators, above the limit {MAX_GENERATORS}", spec.generators.len()));
        &empty // read no further
    } else {
        &spec.generators
    };
    let mut c = Complex {
        name: name.to_string(),
        names: gens.keys().cloned().collect(),
        index: NameIndex::new(gens.keys()),
        gradings: Gradings::new(ring.gradings.len(), gens.values().map(|g| g.as_slice())),
        d: SparseMap::zero(0),
        defects: Vec::new(),
    };
    let mut well_graded = true;
    for (g, gr) in gens.iter() {
        if let Err(e) = check_name(g) {
            errs.push(format!("complex {name}, generator {e}"));
        }
        if !gr.iter().all(|&x| grading_in_bounds(x)) {
            well_graded = false;
            errs.push(format!("complex {name}, generator \"{g}\": a grading entry is beyond ±{MAX_GRADING_ABS}"));
        } else if gr.len() != ring.gradings.len() {
            well_graded = false;
            errs.push(format!(
                "complex {name}, generator \"{g}\": grading {} has {} entries, expected {} ({})",
                render_grading(gr),
                gr.len(),
                ring.gradings.len(),
                ring.gradings.join(", ")
            ));
        }
    }
    if well_graded {
        let what = format!("complex {name}, differential");
        let (d, defects) = read_terms(ring, &c, &c, &ring.differential_degree, &spec.differential, &what, false, errs);
        c.d = d;
        c.defects = defects;
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
    errs.into_result(ctx)
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
    let complex_names = complexes.keys().map(|n| check_name(n).map_err(|e| format!("complex {e}")));
    let map_names = maps.keys().map(|n| check_map_name(n).map_err(|e| format!("map {e}")));
    let bad: Vec<String> = complex_names.chain(map_names).filter_map(Result::err).collect();
    if !bad.is_empty() {
        return Err(bad);
    }
    let mut errs = Errors::default();
    let complexes: Vec<Complex> = complexes.iter().map(|(n, s)| read_complex(&ring, n, s, &mut errs)).collect();
    let complex_index: BTreeMap<String, usize> =
        complexes.iter().enumerate().map(|(i, c)| (c.name.clone(), i)).collect();
    let mut ctx = Context { ring, complexes, complex_index, maps: Vec::new(), map_index: BTreeMap::new() };
    for (name, spec) in maps.iter() {
        let mut side = |c: &str| ctx.complex_named(c).map_err(|e| errs.push(format!("map {name}: {e}"))).ok();
        let (Some(from), Some(to)) = (side(&spec.from), side(&spec.to)) else {
            continue;
        };
        if spec.degree.len() != ctx.ring.gradings.len() || !spec.degree.iter().all(|&x| grading_in_bounds(x)) {
            errs.push(format!(
                "map {name}: degree must have {} entries within ±{MAX_GRADING_ABS}, found {}",
                ctx.ring.gradings.len(),
                render_grading(&spec.degree)
            ));
            continue;
        }
        let what = format!("map {name}");
        let (c, d) = (&ctx.complexes[from], &ctx.complexes[to]);
        let (m, defects) = read_terms(&ctx.ring, c, d, &spec.degree, &spec.terms, &what, false, &mut errs);
        ctx.map_index.insert(name.clone(), ctx.maps.len());
        ctx.maps.push(Map { from, to, degree: spec.degree.clone(), m, defects });
    }
    Ok((ctx, errs))
}

impl Context {
    pub fn complex_named(&self, name: &str) -> Result<usize, String> {
        let found = self.complex_index.get(name).copied();
        found.ok_or_else(|| format!("complex \"{name}\" is not declared{}", suggest(name, self.complex_index.keys())))
    }

    /// Evaluates a map expression to an explicit map, checking sources, targets and degrees.
    pub fn eval(&self, e: &MapExpr) -> Result<Evaluated, String> {
        match e {
            MapExpr::Named(n) => {
                let &i = self
                    .map_index
                    .get(n)
                    .ok_or_else(|| format!("map \"{n}\" is not declared{}", suggest(n, self.map_index.keys())))?;
                let m = &self.maps[i];
                Ok(Evaluated { from: m.from, to: m.to, degree: m.degree.clone(), m: m.m.clone() })
            }
            MapExpr::Id(c) => {
                let c = self.complex_named(c)?;
                let n = self.complexes[c].names.len();
                Ok(Evaluated { from: c, to: c, degree: vec![0; self.ring.gradings.len()], m: SparseMap::identity(n) })
            }
            MapExpr::Times(mono, inner) => {
                let m = parse_mono(mono, &self.ring.variables)?;
                let v = self.eval(inner)?;
                Ok(Evaluated { degree: grading_sum(&v.degree, &self.ring.degree(m)), m: v.m.times(m)?, ..v })
            }
            MapExpr::Sum(es) => {
                let mut acc = self.eval(&es[0])?;
                for e in &es[1..] {
                    let v = self.eval(e)?;
                    if (v.from, v.to, &v.degree) != (acc.from, acc.to, &acc.degree) {
                        return Err(format!(
                            "sum of maps with different source, target or degree: {} vs {}",
                            self.signature(&acc),
                            self.signature(&v)
                        ));
                    }
                    acc.m = acc.m.plus(&v.m);
                }
                Ok(acc)
            }
            MapExpr::Compose(es) => {
                let mut acc = self.eval(es.last().expect("non-empty"))?;
                for e in es.iter().rev().skip(1) {
                    let outer = self.eval(e)?;
                    if outer.from != acc.to {
                        return Err(format!(
                            "composition {} after {}: target and source differ",
                            self.signature(&outer),
                            self.signature(&acc)
                        ));
                    }
                    acc = Evaluated {
                        from: acc.from,
                        to: outer.to,
                        degree: grading_sum(&acc.degree, &outer.degree),
                        m: outer.m.after(&acc.m)?,
                    };
                }
                Ok(acc)
            }
        }
    }

    pub fn signature(&self, v: &Evaluated) -> String {
        format!(
            "{} → {} of degree {}",
            self.complexes[v.from].name,
            self.complexes[v.to].name,
            render_grading(&v.degree)
        )
    }
}

impl Context {
    /// Complex c with the variable `var` set to `value`: 0 gives the quotient C/(var), 1 the
    /// localization C/(var − 1), over the ring in the other variable. Setting var to 1 keeps
    /// only the gradings var does not change (the others stop being gradings). A context of its
    /// own, holding just that complex, so every check on one complex applies to it unchanged.
    pub fn specialized(&self, c: usize, var: &str, value: u32) -> Result<Context, String> {
        let r = &self.ring;
        let v = r.var_index(var).ok_or_else(|| format!("variable {var} is not declared"))?;
        let keep: Vec<usize> = (0..r.gradings.len()).filter(|&i| value == 0 || r.var_degrees[v][i] == 0).collect();
        let others: Vec<usize> = (0..r.num_vars()).filter(|&i| i != v).collect();
        if keep.is_empty() || value > 1 {
            return Err(format!("{var} = {value} leaves no grading"));
        }
        let pick = |g: &[i64]| keep.iter().map(|&i| g[i]).collect::<Grading>();
        let ring = RingInfo {
            variables: others.iter().map(|&i| r.variables[i].clone()).collect(),
            gradings: keep.iter().map(|&i| r.gradings[i].clone()).collect(),
            var_degrees: others.iter().map(|&i| pick(&r.var_degrees[i])).collect(),
            differential_degree: pick(&r.differential_degree),
        };
        let relabel = |m: Mono| {
            let mut out = Mono::ONE;
            others.iter().enumerate().for_each(|(k, &i)| out.0[k] = m.0[i]);
            out
        };
        let cx = &self.complexes[c];
        let rows = cx.d.rows.iter().map(|row| {
            let mut out: Vec<(u32, Mono)> =
                row.iter().filter(|t| value == 1 || t.1 .0[v] == 0).map(|&(g, m)| (g, relabel(m))).collect();
            crate::algebra::normalize(&mut out);
            out
        });
        let gradings: Vec<Grading> = cx.gradings.iter().map(pick).collect();
        let name = format!("{}/({var}{})", cx.name, if value == 1 { " − 1" } else { "" });
        let complex = Complex {
            name: name.clone(),
            names: cx.names.clone(),
            index: NameIndex::new(cx.names.iter()),
            gradings: Gradings::new(keep.len(), gradings.iter().map(|g| g.as_slice())),
            d: SparseMap { rows: rows.collect() },
            defects: cx.defects.clone(),
        };
        let complex_index = BTreeMap::from([(name, 0)]);
        Ok(Context { ring, complexes: vec![complex], complex_index, maps: vec![], map_index: BTreeMap::new() })
    }
}
