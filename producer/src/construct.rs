//! Constructions of complexes and maps from pieces: staircases of L-space knots, tensor
//! products (connected sums), duals (mirrors), grading shifts, direct sums, mapping cones.
//! Each produces an explicit [`ComplexSpec`] / [`MapSpec`]; certificates only ever contain the
//! explicit result, so the checker needs none of this.

use crate::bordered::Built;
use crate::notation::parse_poly;
use crate::search::monomials::render_poly;
use serde_json::Value;
use std::collections::BTreeMap;
use tubecert_format::limits::{grading_in_bounds, MAX_GRADING_ABS};
use tubecert_format::{ComplexSpec, Grading, MapSpec, Mono, Ring, Term, UniqueMap};

pub type Complexes = BTreeMap<String, ComplexSpec>;

fn gens(pairs: impl IntoIterator<Item = (String, Grading)>) -> UniqueMap<Grading> {
    UniqueMap(pairs.into_iter().collect())
}

/// Generators of a product or sum, whose names are made from the pieces' names: a name made
/// twice (e.g. `a⊗b⊗c` from `a⊗b`, `c` and from `a`, `b⊗c`) is an error, never a merge.
fn distinct(pairs: Vec<(String, Grading)>) -> Result<UniqueMap<Grading>, String> {
    let n = pairs.len();
    let out = gens(pairs);
    if out.len() != n {
        return Err("two generators of the result get the same name; rename the pieces' generators".into());
    }
    Ok(out)
}

fn add(a: &[i64], b: &[i64]) -> Grading {
    a.iter().zip(b).map(|(x, y)| x + y).collect()
}

/// Symmetrized Alexander polynomial of T(p, q) as exponents a_0 > … > a_2n with alternating
/// signs, from Δ = t^{−(p−1)(q−1)/2}(t^{pq} − 1)(t − 1)/((t^p − 1)(t^q − 1)) (Ozsváth–Szabó 2005).
pub fn torus_knot_exponents(p: u32, q: u32) -> Result<Vec<i64>, String> {
    if p < 2 || q < 2 || gcd(p, q) != 1 || (p as u64) * (q as u64) > 100_000 {
        return Err(format!("T({p},{q}): need coprime p, q ≥ 2 with pq ≤ 100000"));
    }
    let (p, q) = (p as usize, q as usize);
    // numerator (t^{pq} − 1)(t − 1), coefficients by degree
    let mut num = vec![0i64; p * q + 2];
    num[p * q + 1] += 1;
    num[p * q] -= 1;
    num[1] -= 1;
    num[0] += 1;
    for d in [p, q] {
        // exact division by (t^d − 1), from the top: num = quo·(t^d − 1)
        let mut quo = vec![0i64; num.len() - d];
        for k in (d..num.len()).rev() {
            let c = num[k];
            quo[k - d] = c;
            num[k] -= c;
            num[k - d] += c;
        }
        if num.iter().any(|&c| c != 0) {
            return Err("internal: division left a remainder".into());
        }
        num = quo;
    }
    let shift = ((p - 1) * (q - 1) / 2) as i64;
    let terms: Vec<(i64, i64)> =
        num.iter().enumerate().filter(|t| *t.1 != 0).map(|(k, &c)| (k as i64 - shift, c)).collect();
    Ok(terms.iter().rev().map(|t| t.0).collect())
}

pub(crate) fn gcd(a: u32, b: u32) -> u32 {
    if b == 0 {
        a
    } else {
        gcd(b, a % b)
    }
}

/// The staircase complex of an L-space knot with Alexander exponents a_0 > … > a_2n, over the
/// declared ring: `F2[U,V]` with gradings (gr_U, gr_V); `F2[U]` with (Maslov, Alexander) as the
/// V = 0 quotient; or F2 with (Maslov, Alexander) as the hat version U = V = 0.
pub fn staircase(ring: &Ring, a: &[i64]) -> Result<ComplexSpec, String> {
    if a.len().is_multiple_of(2) || a.windows(2).any(|w| w[0] <= w[1]) {
        return Err("staircase: need an odd number of strictly decreasing Alexander exponents".into());
    }
    if (0..a.len()).any(|i| a[i] != -a[a.len() - 1 - i]) {
        return Err("staircase: the exponents must be symmetric (a_i = −a_{2n−i})".into());
    }
    let degs: Vec<&Grading> = ring.variables.iter().filter_map(|v| ring.variable_degrees.get(v)).collect();
    let full = match (ring.variables.len(), degs.as_slice()) {
        (2, [u, v]) if **u == [-2, 0] && **v == [0, -2] && ring.differential_degree == [-1, -1] => true,
        (1, [u]) if **u == [-2, -1] && ring.differential_degree == [-1, 0] => false,
        (0, []) if ring.gradings.len() == 2 && ring.differential_degree == [-1, 0] => false,
        _ => return Err("staircase: the ring must be F2[U,V] with U, V of degrees (−2,0), (0,−2), ∂ of (−1,−1), F2[U] with U of degree (−2,−1) and ∂ of (−1,0), or F2 with two gradings and ∂ of (−1,0)".into()),
    };
    let mut gr_u = vec![0i64; a.len()];
    for i in 1..a.len() {
        gr_u[i] = if i % 2 == 1 { gr_u[i - 1] + 1 - 2 * (a[i - 1] - a[i]) } else { gr_u[i - 1] - 1 };
    }
    let name = |i: usize| format!("x{i}");
    let pow = |v: &str, e: i64| if e == 1 { v.to_string() } else { format!("{v}^{e}") };
    let mut d = Vec::new();
    for i in (1..a.len()).step_by(2).filter(|_| !ring.variables.is_empty()) {
        d.push([name(i), pow("U", a[i - 1] - a[i]), name(i - 1)]);
        if full {
            d.push([name(i), pow("V", a[i] - a[i + 1]), name(i + 1)]);
        }
    }
    let generators = gens((0..a.len()).map(|i| {
        let g = if full { vec![gr_u[i], gr_u[i] - 2 * a[i]] } else { vec![gr_u[i], a[i]] };
        (name(i), g)
    }));
    Ok(ComplexSpec { generators, differential: d })
}

pub fn tensor_name(x: &str, y: &str) -> String {
    format!("{x}⊗{y}")
}

/// C ⊗_R D: generators x⊗y, gradings add, ∂(x⊗y) = ∂x⊗y + x⊗∂y (no signs over F2).
pub fn tensor(c: &ComplexSpec, d: &ComplexSpec) -> Result<ComplexSpec, String> {
    let mut diff = Vec::new();
    for [x, cf, x2] in &c.differential {
        for y in d.generators.keys() {
            diff.push([tensor_name(x, y), cf.clone(), tensor_name(x2, y)]);
        }
    }
    for [y, cf, y2] in &d.differential {
        for x in c.generators.keys() {
            diff.push([tensor_name(x, y), cf.clone(), tensor_name(x, y2)]);
        }
    }
    diff.sort();
    let generators = distinct(
        c.generators
            .iter()
            .flat_map(|(x, gx)| d.generators.iter().map(move |(y, gy)| (tensor_name(x, y), add(gx, gy))))
            .collect(),
    )?;
    Ok(ComplexSpec { generators, differential: diff })
}

/// f ⊗ g: x⊗y ↦ f(x)⊗g(y).
pub fn tensor_maps(f: &MapSpec, g: &MapSpec, from: &str, to: &str, vars: &[String]) -> Result<MapSpec, String> {
    let polys = |m: &MapSpec| m.terms.iter().map(|t| parse_poly(&t[1], vars)).collect::<Result<Vec<_>, _>>();
    let (pf, pg) = (polys(f)?, polys(g)?);
    let mut acc: BTreeMap<(String, String), Vec<Mono>> = BTreeMap::new();
    for ([x, _, x2], cf) in f.terms.iter().zip(&pf) {
        for ([y, _, y2], cg) in g.terms.iter().zip(&pg) {
            let entry = acc.entry((tensor_name(x, y), tensor_name(x2, y2))).or_default();
            for a in cf {
                for b in cg {
                    entry.push(a.checked_mul(*b).ok_or("exponent overflow")?);
                }
            }
        }
    }
    let mut terms = Vec::new();
    for ((x, y), mut monos) in acc {
        tubecheck::algebra::normalize(&mut monos);
        if !monos.is_empty() {
            terms.push([x, render_poly(&monos, vars), y]);
        }
    }
    Ok(MapSpec { from: from.into(), to: to.into(), degree: add(&f.degree, &g.degree), terms })
}

/// The dual complex Hom_R(C, R): the dual basis (same names), negated gradings, transposed ∂.
pub fn dual(c: &ComplexSpec) -> ComplexSpec {
    let mut diff: Vec<Term> = c.differential.iter().map(|[x, cf, y]| [y.clone(), cf.clone(), x.clone()]).collect();
    diff.sort();
    ComplexSpec {
        generators: gens(c.generators.iter().map(|(x, g)| (x.clone(), g.iter().map(|v| -v).collect()))),
        differential: diff,
    }
}

pub fn shift(c: &ComplexSpec, s: &[i64]) -> ComplexSpec {
    ComplexSpec {
        generators: gens(c.generators.iter().map(|(x, g)| (x.clone(), add(g, s)))),
        differential: c.differential.clone(),
    }
}

fn prefixed(name: &str, x: &str) -> String {
    format!("{name}.{x}")
}

/// C ⊕ D with generators named `C.x`, `D.y` (`C.x`, `C'.y` for C ⊕ C); with `map` (f: C → D)
/// the cone, ∂x ↦ ∂x + f(x), C shifted by deg f − deg ∂ so the differential stays homogeneous.
pub fn direct_sum(
    cn: &str,
    c: &ComplexSpec,
    dn: &str,
    d: &ComplexSpec,
    map: Option<(&MapSpec, &Grading)>,
) -> Result<ComplexSpec, String> {
    let second = if cn == dn { format!("{dn}'") } else { dn.to_string() };
    let dn = second.as_str();
    let cshift: Grading = match map {
        Some((f, delta)) => f.degree.iter().zip(delta.iter()).map(|(a, b)| a - b).collect(),
        None => vec![0; c.generators.values().next().map_or(0, |g| g.len())],
    };
    let mut generators: Vec<(String, Grading)> =
        c.generators.iter().map(|(x, g)| (prefixed(cn, x), add(g, &cshift))).collect();
    generators.extend(d.generators.iter().map(|(y, g)| (prefixed(dn, y), g.clone())));
    let mut diff: Vec<Term> =
        c.differential.iter().map(|[x, cf, y]| [prefixed(cn, x), cf.clone(), prefixed(cn, y)]).collect();
    diff.extend(d.differential.iter().map(|[x, cf, y]| [prefixed(dn, x), cf.clone(), prefixed(dn, y)]));
    if let Some((f, _)) = map {
        diff.extend(f.terms.iter().map(|[x, cf, y]| [prefixed(cn, x), cf.clone(), prefixed(dn, y)]));
    }
    diff.sort();
    Ok(ComplexSpec { generators: distinct(generators)?, differential: diff })
}

/// Generators and terms that the constructions (staircase, tensor, dual, shift, sum, cone,
/// quotient, tensor of maps) may make in one problem: this many per generator or term written
/// out in the problem, plus [`CONSTRUCTED_BASE`]; checked before each is built.
pub const CONSTRUCTED_PER_ENTRY: u64 = 4;
pub const CONSTRUCTED_BASE: u64 = 4_000_000;

/// How many generators and terms constructions may still make ([`CONSTRUCTED_BASE`]):
/// each construction counts its result's size before building it, so a few lines cannot ask
/// for a tensor tower of 10^12 generators.
struct Made(u64);

impl Made {
    fn take(&mut self, n: u64, what: &str) -> Result<(), String> {
        self.0 = self.0.checked_sub(n).ok_or_else(|| {
            format!(
                "{what} would make {n} generators and terms, beyond what the constructions of this problem may make (construct::CONSTRUCTED_BASE {CONSTRUCTED_BASE} + {CONSTRUCTED_PER_ENTRY} per generator or term written out)"
            )
        })?;
        Ok(())
    }
}

fn size(c: &ComplexSpec) -> u64 {
    (c.generators.len() + c.differential.len()) as u64
}

/// Generators and terms written out in a problem's explicit complexes and maps.
fn written_entries(complexes: &BTreeMap<String, Value>, maps: &BTreeMap<String, Value>) -> u64 {
    let len = |v: &Value, k: &str| {
        v.get(k).map_or(0, |x| x.as_array().map_or(0, |a| a.len()) + x.as_object().map_or(0, |o| o.len()))
    };
    let c: usize = complexes.values().map(|v| len(v, "generators") + len(v, "differential")).sum();
    (c + maps.values().map(|v| len(v, "terms")).sum::<usize>()) as u64
}

/// The size of what a construction from complexes already built will make (0 for the others,
/// which are counted once built: staircases, quotients and bordered constructions).
fn planned_size(v: &Value, done: &Complexes, maps: &BTreeMap<String, MapSpec>) -> u64 {
    let Some((op, arg)) = v.as_object().filter(|o| o.len() == 1).and_then(|o| o.iter().next()) else { return 0 };
    let get = |x: Option<&Value>| x.and_then(Value::as_str).and_then(|n| done.get(n));
    match op.as_str() {
        "tensor" => get(arg.get(0)).zip(get(arg.get(1))).map_or(0, |(c, d)| {
            let (gc, gd) = (c.generators.len() as u64, d.generators.len() as u64);
            let terms = (c.differential.len() as u64)
                .saturating_mul(gd)
                .saturating_add((d.differential.len() as u64).saturating_mul(gc));
            gc.saturating_mul(gd).saturating_add(terms)
        }),
        "direct_sum" => get(arg.get(0)).zip(get(arg.get(1))).map_or(0, |(c, d)| size(c) + size(d)),
        "dual" => get(Some(arg)).map_or(0, size),
        "shift" => get(arg.get(0)).map_or(0, size),
        "cone" => arg.as_str().and_then(|f| maps.get(f)).map_or(0, |m| {
            let (c, d) = (done.get(&m.from).map_or(0, size), done.get(&m.to).map_or(0, size));
            c + d + m.terms.len() as u64
        }),
        _ => 0,
    }
}

/// Resolves the complexes and maps of a problem whose entries may be constructions, in
/// dependency order. Explicit entries are taken as they are.
pub fn resolve(
    ring: &Ring,
    complexes: &BTreeMap<String, Value>,
    maps: &BTreeMap<String, Value>,
    sections: [&BTreeMap<String, Value>; 3],
    text: bool,
) -> Result<(Complexes, BTreeMap<String, MapSpec>, Built), Vec<String>> {
    // The ring's degrees enter the constructions' arithmetic (cones): checked first.
    tubecert_format::RingInfo::new(ring)?;
    use tubecert_format::limits::MAX_SUGGESTIONS;
    let mut made =
        Made(CONSTRUCTED_BASE.saturating_add(CONSTRUCTED_PER_ENTRY.saturating_mul(written_entries(complexes, maps))));
    let mut done: Complexes = BTreeMap::new();
    let mut done_maps: BTreeMap<String, MapSpec> = BTreeMap::new();
    let mut errs = Vec::new();
    // Bordered objects first: box tensor products and cables are made from them.
    let mut bordered = Built::default();
    let [structures, modules, morphisms] = sections;
    crate::bordered::resolve_sections(ring, structures, modules, morphisms, complexes, &mut bordered, &mut errs);
    // Explicit maps first: cones need them.
    for (name, v) in maps {
        if v.get("from").is_some() {
            match serde_json::from_value::<MapSpec>(v.clone()) {
                Ok(m) if !m.degree.iter().all(|&x| grading_in_bounds(x)) => {
                    errs.push(format!("map {name}: a degree entry is beyond ±{MAX_GRADING_ABS}"))
                }
                Ok(m) => {
                    done_maps.insert(name.clone(), m);
                }
                Err(e) => errs.push(format!("map {name}: {e}")),
            }
        }
    }
    // Dependency order: each complex is tried once, when the complexes it names are built.
    let mut dependents: BTreeMap<&str, Vec<&String>> = BTreeMap::new();
    let mut waiting: BTreeMap<&String, usize> = BTreeMap::new();
    let mut ready = std::collections::VecDeque::new();
    for (name, v) in complexes {
        let mut refs = referenced(v, &done_maps);
        refs.sort_unstable();
        refs.dedup();
        refs.retain(|r| complexes.contains_key(*r));
        refs.iter().for_each(|r| dependents.entry(r).or_default().push(name));
        waiting.insert(name, refs.len());
        if refs.is_empty() {
            ready.push_back(name);
        }
    }
    let mut failed = std::collections::BTreeSet::new();
    while let Some(name) = ready.pop_front() {
        match build_complex(ring, name, &complexes[name], &done, &done_maps, complexes, &mut bordered, &mut made) {
            Ok(Some(c)) => {
                done.insert(name.clone(), c);
                for d in dependents.get(name.as_str()).into_iter().flatten() {
                    let w = waiting.get_mut(d).expect("every complex waits");
                    *w -= 1;
                    if *w == 0 {
                        ready.push_back(d);
                    }
                }
            }
            Ok(None) => {}
            Err(e) => {
                failed.insert(name);
                errs.push(format!("complex {name}: {e}"));
            }
        }
    }
    let mut hints = MAX_SUGGESTIONS;
    for n in complexes.keys().filter(|n| !done.contains_key(*n) && !failed.contains(n)) {
        let refs = referenced(&complexes[n], &done_maps);
        errs.push(match refs.iter().find(|r| !complexes.contains_key(**r)) {
            Some(m) => {
                // A suggestion never names the complex being defined.
                let others = complexes.keys().filter(|k| *k != n);
                hints = hints.saturating_sub(1);
                let hint = if hints > 0 { tubecheck::report_terms::suggest(m, others) } else { String::new() };
                format!("complex {n}: complex \"{m}\" is not declared{hint}")
            }
            None => {
                let waiting: Vec<&str> = refs.into_iter().filter(|r| !done.contains_key(*r)).collect();
                match waiting.as_slice() {
                    [] => format!("complex {n}: its pieces could not be built (see the errors above)"),
                    w if w.contains(&n.as_str()) => format!("complex {n}: is built from itself"),
                    w => format!(
                        "complex {n}: is built from {} (which could not be built, or is built from {n} in turn)",
                        w.join(", ")
                    ),
                }
            }
        });
    }
    // A tensor_maps entry finds the tensor complexes of its source and target here.
    let mut tensors: BTreeMap<(&str, &str), &String> = BTreeMap::new();
    for (n, v) in complexes {
        if let Some([Value::String(a), Value::String(b)]) = v.get("tensor").and_then(Value::as_array).map(Vec::as_slice)
        {
            tensors.entry((a.as_str(), b.as_str())).or_insert(n);
        }
    }
    for (name, v) in maps {
        if let Some(arg) = v.get("box_tensor_map") {
            match crate::bordered::box_tensor_map_entry(name, arg, complexes, &done, &mut bordered) {
                Ok(m) => {
                    done_maps.insert(name.clone(), m);
                }
                Err(e) => errs.push(format!("map {name}: {e}")),
            }
        } else if let Some(arg) = v.get("tensor_maps") {
            match build_tensor_map(ring, arg, &tensors, &done_maps, text, &mut made) {
                Ok(m) => {
                    done_maps.insert(name.clone(), m);
                }
                Err(e) => errs.push(format!("map {name}: {e}")),
            }
        } else if v.get("from").is_none() {
            errs.push(format!(
                "map {name}: expected an explicit map {{from, to, degree, terms}}, {{\"tensor_maps\": [f, g]}} or {{\"box_tensor_map\": [M, f]}}"
            ));
        }
    }
    if errs.is_empty() {
        Ok((done, done_maps, bordered))
    } else {
        Err(errs)
    }
}

/// The complexes a construction is made from, by name.
fn referenced<'a>(v: &'a Value, maps: &'a BTreeMap<String, MapSpec>) -> Vec<&'a str> {
    let Some((op, arg)) = v.as_object().and_then(|o| o.iter().next()) else { return Vec::new() };
    match (op.as_str(), arg) {
        ("cone", Value::String(f)) => maps.get(f).map_or(vec![], |m| vec![m.from.as_str(), m.to.as_str()]),
        ("tensor" | "direct_sum", Value::Array(a)) => a.iter().filter_map(Value::as_str).collect(),
        ("dual", Value::String(c)) => vec![c.as_str()],
        ("shift", Value::Array(a)) => a.first().and_then(Value::as_str).into_iter().collect(),
        _ => Vec::new(),
    }
}

/// `{"torus_knot": [p, q]}` or `{"alexander": [a_0, …, a_2n]}` over `ring`.
pub fn build_staircase(ring: &Ring, arg: &Value) -> Result<ComplexSpec, String> {
    let exps: Vec<i64> = if let Some(pq) = arg.get("torus_knot") {
        let pq: Vec<u32> = serde_json::from_value(pq.clone()).map_err(|e| format!("torus_knot: {e}"))?;
        let [p, q] = pq[..] else { return Err("torus_knot takes [p, q]".into()) };
        torus_knot_exponents(p, q)?
    } else if let Some(a) = arg.get("alexander") {
        bounded("alexander", a)?
    } else {
        return Err("staircase takes {\"torus_knot\": [p, q]} or {\"alexander\": [a_0, …, a_2n]}".into());
    };
    staircase(ring, &exps)
}

/// Builds one complex; `Ok(None)` when it depends on one not built yet. Its gradings must be
/// within the format's bounds, so the inputs of every construction are, and the sums a
/// construction makes (at most twice the bound) cannot overflow.
#[allow(clippy::too_many_arguments)]
fn build_complex(
    ring: &Ring,
    name: &str,
    v: &Value,
    done: &Complexes,
    maps: &BTreeMap<String, MapSpec>,
    defs: &BTreeMap<String, Value>,
    bordered: &mut Built,
    made: &mut Made,
) -> Result<Option<ComplexSpec>, String> {
    let what = v.as_object().and_then(|o| o.keys().next()).map_or("it".to_string(), |op| format!("the {op}"));
    let planned = planned_size(v, done, maps);
    made.take(planned, &what)?;
    let built = construct_complex(ring, name, v, done, maps, defs, bordered)?;
    if let Some(c) = built.as_ref().filter(|_| planned == 0 && v.get("generators").is_none()) {
        made.take(size(c), &what)?;
    }
    built.as_ref().map_or(Ok(()), check_bounds)?;
    Ok(built)
}

fn check_bounds(c: &ComplexSpec) -> Result<(), String> {
    for (g, gr) in c.generators.iter() {
        if let Some(x) = gr.iter().find(|&&x| !grading_in_bounds(x)) {
            return Err(format!("generator \"{g}\" has a grading entry {x}, beyond ±{MAX_GRADING_ABS}"));
        }
    }
    Ok(())
}

/// Integers written in a construction, bounded before any arithmetic.
fn bounded(what: &str, v: &Value) -> Result<Vec<i64>, String> {
    let xs: Vec<i64> = serde_json::from_value(v.clone()).map_err(|e| format!("{what}: {e}"))?;
    match xs.iter().find(|&&x| !grading_in_bounds(x)) {
        Some(x) => Err(format!("{what}: {x} is beyond ±{MAX_GRADING_ABS}")),
        None => Ok(xs),
    }
}

fn construct_complex(
    ring: &Ring,
    name: &str,
    v: &Value,
    done: &Complexes,
    maps: &BTreeMap<String, MapSpec>,
    defs: &BTreeMap<String, Value>,
    bordered: &mut Built,
) -> Result<Option<ComplexSpec>, String> {
    if v.get("generators").is_some() {
        return serde_json::from_value(v.clone()).map(Some).map_err(|e| e.to_string());
    }
    let obj = v
        .as_object()
        .filter(|o| o.len() == 1)
        .ok_or("expected {generators, differential} or a one-key construction")?;
    let (op, arg) = obj.iter().next().expect("one key");
    let names = |n: usize| -> Result<Vec<String>, String> {
        let a = arg.as_array().filter(|a| a.len() >= n).ok_or(format!("\"{op}\" takes an array"))?;
        a.iter()
            .take(n)
            .map(|x| x.as_str().map(String::from).ok_or(format!("\"{op}\": expected complex names")))
            .collect()
    };
    let get = |n: &str| done.get(n);
    Ok(match op.as_str() {
        "staircase" => Some(build_staircase(ring, arg)?),
        "tensor" | "direct_sum" => {
            let n = names(2)?;
            let (Some(c), Some(d)) = (get(&n[0]), get(&n[1])) else { return Ok(None) };
            Some(if op == "tensor" { tensor(c, d)? } else { direct_sum(&n[0], c, &n[1], d, None)? })
        }
        "dual" => {
            let n = arg.as_str().ok_or("\"dual\" takes a complex name")?;
            get(n).map(dual)
        }
        "shift" => {
            let a = arg.as_array().filter(|a| a.len() == 2).ok_or("\"shift\" takes [complex, [shift…]]")?;
            let n = a[0].as_str().ok_or("shift: expected a complex name")?;
            let s = bounded("shift", &a[1])?;
            if s.len() != ring.gradings.len() {
                return Err(format!("shift has {} entries, expected {}", s.len(), ring.gradings.len()));
            }
            get(n).map(|c| shift(c, &s))
        }
        "cone" => {
            let f = arg.as_str().ok_or("\"cone\" takes a map name")?;
            let m = maps.get(f).ok_or(format!("cone: map \"{f}\" must be an explicit declared map"))?;
            let (Some(c), Some(d)) = (get(&m.from), get(&m.to)) else { return Ok(None) };
            Some(direct_sum(&m.from, c, &m.to, d, Some((m, &ring.differential_degree)))?)
        }
        "quotient" => {
            let a = arg.as_array().filter(|a| a.len() >= 2).ok_or("\"quotient\" takes [complex, variable…]")?;
            let zeroed: Vec<String> = a[1..]
                .iter()
                .map(|v| v.as_str().map(String::from).ok_or("quotient: variables are names"))
                .collect::<Result<_, _>>()?;
            let source_ring = quotient_source(ring, &zeroed)?;
            // The source lives over the larger ring: it is given inline, and names in it stand
            // for their definitions, rebuilt and validated over that ring.
            if a[0].is_string() {
                return Err("quotient: give the complex inline, e.g. [{\"staircase\": {\"torus_knot\": [3, 4]}}, \"V\"]: it lives over the larger ring".into());
            }
            let src = crate::bordered::inline_source(&source_ring, &a[0], defs, 0).map_err(|e| format!("quotient source: {e}"))?;
            check_bounds(&src)?;
            Some(quotient(&source_ring, ring, &src)?)
        }
        "cable" => Some(crate::bordered::cable(name, arg, ring, defs, bordered)?),
        "box_tensor" => Some(crate::bordered::box_tensor_complex(name, arg, bordered)?),
        other => {
            return Err(format!(
                "unknown construction \"{other}\" (staircase, tensor, dual, shift, direct_sum, cone, quotient, cable, box_tensor)"
            ))
        }
    })
}

/// The ring a quotient's source lives over: the full `F2[U,V]` with (gr_U, gr_V) for the minus
/// version (V = 0) or the hat version (U = V = 0); the minus `F2[U]` for hat from minus (U = 0).
fn quotient_source(target: &Ring, zeroed: &[String]) -> Result<Ring, String> {
    let minus = target.variables == ["U"]
        && target.variable_degrees.get("U") == Some(&vec![-2, -1])
        && target.differential_degree == [-1, 0];
    let hat = target.variables.is_empty() && target.gradings.len() == 2 && target.differential_degree == [-1, 0];
    let full = || Ring {
        variables: vec!["U".into(), "V".into()],
        gradings: vec!["gr_U".into(), "gr_V".into()],
        variable_degrees: UniqueMap([("U".to_string(), vec![-2, 0]), ("V".to_string(), vec![0, -2])].into()),
        differential_degree: vec![-1, -1],
    };
    let z: Vec<&str> = zeroed.iter().map(|s| s.as_str()).collect();
    match (minus, hat, z.as_slice()) {
        (true, _, ["V"]) => Ok(full()),
        (_, true, ["U", "V"] | ["V", "U"]) => Ok(full()),
        (_, true, ["U"]) => Ok(Ring {
            variables: vec!["U".into()],
            gradings: target.gradings.clone(),
            variable_degrees: UniqueMap([("U".to_string(), vec![-2, -1])].into()),
            differential_degree: vec![-1, 0],
        }),
        _ => Err("quotient: supported are [C, \"V\"] into F2[U] with U of degree (−2,−1) (the minus version), and [C, \"U\", \"V\"] or [C, \"U\"] into F2 (the hat version), gradings (Maslov, Alexander)".into()),
    }
}

/// Sets the variables missing from `target` to zero: terms whose coefficient involves them are
/// dropped; (gr_U, gr_V) become (Maslov, Alexander) = (gr_U, (gr_U − gr_V)/2).
pub fn quotient(source: &Ring, target: &Ring, c: &ComplexSpec) -> Result<ComplexSpec, String> {
    let from_full = source.variables.len() == 2;
    let mut generators = Vec::new();
    for (g, gr) in c.generators.iter() {
        let converted = match (from_full, gr.as_slice()) {
            (true, [u, v]) if (u - v) % 2 == 0 => vec![*u, (u - v) / 2],
            (true, _) => return Err(format!("quotient: generator {g} has gradings {gr:?}; gr_U − gr_V must be even")),
            (false, _) => gr.clone(),
        };
        generators.push((g.clone(), converted));
    }
    let mut differential = Vec::new();
    for [x, coef, y] in &c.differential {
        let kept: Vec<Mono> = parse_poly(coef, &source.variables)?
            .into_iter()
            .filter(|m| (target.variables.len()..source.variables.len()).all(|i| m.0[i] == 0))
            .collect();
        if !kept.is_empty() {
            differential.push([x.clone(), render_poly(&kept, &target.variables), y.clone()]);
        }
    }
    Ok(ComplexSpec { generators: gens(generators), differential })
}

fn build_tensor_map(
    ring: &Ring,
    arg: &Value,
    tensors: &BTreeMap<(&str, &str), &String>,
    maps: &BTreeMap<String, MapSpec>,
    text: bool,
    made: &mut Made,
) -> Result<MapSpec, String> {
    let pair: [String; 2] =
        serde_json::from_value(arg.clone()).map_err(|e| format!("tensor_maps takes [f, g]: {e}"))?;
    let (f, g) = (
        maps.get(&pair[0]).ok_or(format!("tensor_maps: map \"{}\" not declared explicitly", pair[0]))?,
        maps.get(&pair[1]).ok_or(format!("tensor_maps: map \"{}\" not declared explicitly", pair[1]))?,
    );
    let find = |a: &str, b: &str| {
        tensors.get(&(a, b)).map(|n| n.to_string()).ok_or(match text {
            true => {
                format!("tensor_maps: declare the tensor product of {a} and {b} first: complex NAME = tensor {a} {b}")
            }
            false => format!(
                "tensor_maps: declare the tensor product of {a} and {b} first: {{\"tensor\": [\"{a}\", \"{b}\"]}}"
            ),
        })
    };
    // Each pair of terms makes the products of their monomials.
    let monomials = |m: &MapSpec| m.terms.iter().map(|t| 1 + t[1].matches('+').count() as u64).sum::<u64>();
    made.take(monomials(f).saturating_mul(monomials(g)), "the tensor product of maps")?;
    tensor_maps(f, g, &find(&f.from, &g.from)?, &find(&f.to, &g.to)?, &ring.variables)
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn torus_knot_polynomials() {
        // Δ_{T(2,3)} = t − 1 + t^{−1}; Δ_{T(3,4)} = t^3 − t^2 + 1 − t^{−2} + t^{−3} (Ozsváth–Szabó 2005).
        assert_eq!(torus_knot_exponents(2, 3).unwrap(), vec![1, 0, -1]);
        assert_eq!(torus_knot_exponents(3, 4).unwrap(), vec![3, 2, 0, -2, -3]);
        assert!(torus_knot_exponents(2, 4).is_err());
    }

    fn complex(gens: &[&str], d: &[[&str; 3]]) -> ComplexSpec {
        ComplexSpec {
            generators: super::gens(gens.iter().map(|g| (g.to_string(), vec![0, 0]))),
            differential: d.iter().map(|t| t.map(String::from)).collect(),
        }
    }

    #[test]
    fn a_sum_of_a_complex_with_itself_keeps_both_copies() {
        let c = complex(&["a", "b"], &[["b", "1", "a"]]);
        let s = direct_sum("C", &c, "C", &c, None).unwrap();
        assert_eq!(s.generators.keys().collect::<Vec<_>>(), ["C'.a", "C'.b", "C.a", "C.b"]);
        assert_eq!(s.differential.len(), 2);
    }

    #[test]
    fn a_name_made_twice_is_an_error_not_a_merge() {
        // a⊗b ⊗ c and a ⊗ b⊗c are both named a⊗b⊗c.
        let c = complex(&["a⊗b", "a"], &[]);
        let d = complex(&["c", "b⊗c"], &[]);
        assert!(tensor(&c, &d).unwrap_err().contains("same name"));
    }
}
