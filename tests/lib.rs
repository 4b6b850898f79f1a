//! Helpers shared by the integration tests: proving a problem given as JSON, and an
//! independent evaluator of the two defining identities (written without the checker's code),
//! used to decide whether a mutated witness is semantically neutral.

pub mod bordered_oracle;

use serde_json::Value;
use std::collections::BTreeMap;
use tubecert::prove::Proved;
use tubecert_format::Body;

/// The number of cases for a property test: `PROPTEST_CASES` when set (long local campaigns),
/// else the small default sized for the 2-core CI machine.
pub fn cases(default: u32) -> u32 {
    std::env::var("PROPTEST_CASES").ok().and_then(|v| v.parse().ok()).unwrap_or(default)
}

/// Proves a problem given as JSON; panics with the producer's messages on bad input.
pub fn prove_value(problem: &Value) -> Proved {
    let bytes = serde_json::to_vec(problem).unwrap();
    let p = tubecert::problem::parse_problem(&bytes, "test").unwrap_or_else(|e| panic!("{e:?}"));
    let ctx = tubecert::validate::validate(&p).unwrap_or_else(|e| panic!("{e:?}"));
    tubecert::prove::prove(p, &ctx, &bytes).unwrap_or_else(|e| panic!("{e}"))
}

/// The claims of a proved problem, re-verified from the certificate's bytes.
pub fn verified_claims(proved: &Proved) -> Vec<Value> {
    let bytes = tubecert::canonical_writer::file_bytes(&proved.certificate).unwrap();
    let report = tubecheck::check_bytes("test", &bytes).unwrap();
    assert!(report.ok(), "checker rejects: {report:?}");
    serde_json::to_value(&proved.certificate.body.claims).unwrap().as_array().unwrap().clone()
}

/// The ring `F2[U]` with (Maslov, Alexander), U of degree (−2, −1).
pub fn minus_ring() -> Value {
    serde_json::json!({"variables": ["U"], "gradings": ["maslov", "alexander"],
        "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]})
}

pub fn seal(body: Body) -> Vec<u8> {
    tubecert::canonical_writer::file_bytes(&tubecert::canonical_writer::seal(body).unwrap()).unwrap()
}

/// An element of a free module over F2[U, V]: a set of (generator, (i, j)) for U^i V^j·g.
pub type Elem = std::collections::BTreeSet<(String, (u32, u32))>;

fn toggle(e: &mut Elem, k: (String, (u32, u32))) {
    if !e.remove(&k) {
        e.insert(k);
    }
}

/// The oracle's own reading of numbers, written without the format crate's parser: the bounds
/// (exponents ≤ 2^20, gradings within ±2^31) and the grammar of coefficients as the README
/// states them.
pub mod numbers {
    use std::cell::RefCell;

    pub const MAX_EXPONENT: u32 = 1 << 20;
    pub const MAX_GRADING: i64 = 1 << 31;

    thread_local! {
        /// The ring variables coefficients are read in, by position (`U`, `V` by default; the
        /// oracle sets the ring's own for the body it judges).
        static VARIABLES: RefCell<Vec<String>> = RefCell::new(vec!["U".into(), "V".into()]);
    }

    /// Reads coefficients in `vars` until the guard is dropped.
    pub struct InRing(Vec<String>);
    pub fn in_ring(vars: &[String]) -> InRing {
        InRing(VARIABLES.with(|v| std::mem::replace(&mut *v.borrow_mut(), vars.to_vec())))
    }
    impl Drop for InRing {
        fn drop(&mut self) {
            VARIABLES.with(|v| *v.borrow_mut() = std::mem::take(&mut self.0));
        }
    }

    /// A polynomial `m + m + …`, each monomial `1` or factors `VAR`, `VAR^e` with an optional
    /// `*` between them and blanks anywhere between tokens, as exponent pairs; `None` if it does
    /// not read, if an exponent (written, or summed over repeated factors) passes 2^20, or if a
    /// monomial repeats.
    pub fn read_poly(text: &str, vars: &[String]) -> Option<Vec<(u32, u32)>> {
        let mut out: Vec<(u32, u32)> = text.split('+').map(|m| read_mono(m, vars)).collect::<Option<_>>()?;
        out.sort();
        let n = out.len();
        out.dedup();
        (out.len() == n).then_some(out)
    }

    fn read_mono(text: &str, vars: &[String]) -> Option<(u32, u32)> {
        let b = text.as_bytes();
        let skip = |mut i: usize| {
            while i < b.len() && b[i] == b' ' {
                i += 1;
            }
            i
        };
        let mut i = skip(0);
        if text.trim() == "1" {
            return Some((0, 0));
        }
        let mut e = [0u64; 2];
        let mut first = true;
        while i < b.len() {
            if !first && b[i] == b'*' {
                i = skip(i + 1);
            }
            first = false;
            // The longest ring variable written here.
            let (v, name) = vars
                .iter()
                .enumerate()
                .filter(|(_, n)| text[i..].starts_with(n.as_str()))
                .max_by_key(|(_, n)| n.len())?;
            i = skip(i + name.len());
            let mut power = 1u64;
            if i < b.len() && b[i] == b'^' {
                i = skip(i + 1);
                let digits = b[i..].iter().take_while(|c| c.is_ascii_digit()).count();
                // More than seven digits is beyond 2^20 whatever they are: never parsed.
                if digits == 0 || digits > 7 {
                    return None;
                }
                power = text[i..i + digits].parse().ok()?;
                i = skip(i + digits);
            }
            e[v] += power;
            if e[v] > MAX_EXPONENT as u64 {
                return None;
            }
        }
        if first {
            return None; // an empty monomial
        }
        Some((e[0] as u32, e[1] as u32))
    }

    /// [`read_poly`] in the current ring; unreadable text is no monomial at all (the oracle
    /// refuses such a body before it computes, see [`readable`]).
    pub fn monomials(coef: &str) -> Vec<(u32, u32)> {
        VARIABLES.with(|v| read_poly(coef, &v.borrow())).unwrap_or_default()
    }

    /// One monomial in the current ring.
    pub fn monomial(text: &str) -> Option<(u32, u32)> {
        match VARIABLES.with(|v| read_poly(text, &v.borrow()))?.as_slice() {
            [m] if !text.contains('+') => Some(*m),
            _ => None,
        }
    }

    /// The written form of U^i V^j in the current ring.
    pub fn write_mono((i, j): (u32, u32)) -> String {
        let vars = VARIABLES.with(|v| v.borrow().clone());
        let factors: Vec<String> = [i, j]
            .iter()
            .zip(&vars)
            .filter(|(e, _)| **e > 0)
            .map(|(e, v)| if *e == 1 { v.clone() } else { format!("{v}^{e}") })
            .collect();
        if factors.is_empty() {
            "1".into()
        } else {
            factors.join("*")
        }
    }

    pub fn grading_ok(g: &[i64]) -> bool {
        g.iter().all(|x| (-MAX_GRADING..=MAX_GRADING).contains(x))
    }

    /// Every number of the body reads within the bounds: gradings, degrees, τ, orders and every
    /// coefficient (a single monomial in a dual witness). Then no computation of the oracle can
    /// overflow: degrees stay below 2^62.
    pub fn readable(body: &tubecert_format::Body) -> bool {
        use tubecert_format::Claim;
        let vars = &body.ring.variables;
        let coefs = |terms: &[[String; 3]]| terms.iter().all(|t| read_poly(&t[1], vars).is_some());
        let single =
            |terms: &[[String; 3]]| terms.iter().all(|t| !t[1].contains('+') && read_poly(&t[1], vars).is_some());
        let basis = |w: &tubecert_format::BasisWitness| {
            w.generators.values().all(|g| grading_ok(g)) && coefs(&w.basis) && coefs(&w.inverse)
        };
        let ring =
            body.ring.variable_degrees.values().all(|g| grading_ok(g)) && grading_ok(&body.ring.differential_degree);
        ring && body.complexes.values().all(|c| c.generators.values().all(|g| grading_ok(g)) && coefs(&c.differential))
            && body.maps.values().all(|m| grading_ok(&m.degree) && coefs(&m.terms))
            && body.claims.iter().all(|c| match c {
                Claim::NullHomotopic { witness, .. } => coefs(&witness.homotopy),
                Claim::NotNullHomotopic { witness, .. } => single(&witness.dual),
                Claim::HomotopyEquivalence { witness, .. } => {
                    coefs(&witness.source_homotopy) && coefs(&witness.target_homotopy)
                }
                Claim::TorsionOrder { order, witness, .. } => {
                    *order <= MAX_EXPONENT && coefs(&witness.homotopy) && witness.dual.as_deref().is_none_or(single)
                }
                Claim::TorsionOrderOfComplex { order, witness, .. } => *order <= MAX_EXPONENT && basis(witness),
                Claim::Homology { free, torsion, witness, .. } => {
                    free.iter().all(|g| grading_ok(g))
                        && torsion.iter().all(|(k, g)| *k <= MAX_EXPONENT && grading_ok(g))
                        && basis(witness)
                }
                Claim::Tau { tau, witness, .. } => grading_ok(&[*tau]) && basis(witness),
                _ => true, // the other kinds carry no numbers of their own
            })
    }
}

pub use numbers::monomials;

/// A map as generator → element, from `[from, coef, to]` terms.
pub fn map_of(terms: &[[String; 3]]) -> BTreeMap<String, Elem> {
    let mut out: BTreeMap<String, Elem> = BTreeMap::new();
    for [x, c, y] in terms {
        for m in monomials(c) {
            toggle(out.entry(x.clone()).or_default(), (y.clone(), m));
        }
    }
    out
}

fn apply(f: &BTreeMap<String, Elem>, v: &Elem) -> Elem {
    let mut out = Elem::new();
    for (g, (i, j)) in v {
        for (h, (a, b)) in f.get(g).into_iter().flatten() {
            toggle(&mut out, (h.clone(), (i + a, j + b)));
        }
    }
    out
}

/// Does ∂H + H∂ equal φ on every generator of the source?
pub fn is_homotopy(
    src_d: &[[String; 3]],
    dst_d: &[[String; 3]],
    sources: &[String],
    phi: &[[String; 3]],
    h: &[[String; 3]],
) -> bool {
    let (dc, dd, phi, h) = (map_of(src_d), map_of(dst_d), map_of(phi), map_of(h));
    sources.iter().all(|x| {
        let mut lhs = apply(&dd, h.get(x).unwrap_or(&Elem::new()));
        for k in apply(&h, dc.get(x).unwrap_or(&Elem::new())).into_iter() {
            toggle(&mut lhs, k);
        }
        lhs == phi.get(x).cloned().unwrap_or_default()
    })
}

/// Is y a dual witness for φ: ⟨y, φ⟩ = 1 and y(∂ψ + ψ∂) = 0 for every basis ψ = (x ↦ m·w)?
/// Checked by brute force over the ψ whose boundary can meet y.
pub fn is_dual_witness(src_d: &[[String; 3]], dst_d: &[[String; 3]], phi: &[[String; 3]], y: &[[String; 3]]) -> bool {
    let ys: Vec<(String, (u32, u32), String)> =
        y.iter().filter_map(|[x, m, w]| Some((x.clone(), numbers::monomial(m)?, w.clone()))).collect();
    if ys.len() != y.len() {
        return false;
    }
    let phi = map_of(phi);
    let pairing = ys.iter().filter(|(x, m, w)| phi.get(x).is_some_and(|e| e.contains(&(w.clone(), *m)))).count();
    if pairing % 2 != 1 {
        return false;
    }
    // Candidate ψ: for each y-triple, the ones whose boundary can reach it.
    let (dc, dd) = (map_of(src_d), map_of(dst_d));
    let mut cands = std::collections::BTreeSet::new();
    for (x, (i, j), w) in &ys {
        for (w2, e) in &dd {
            for (t, (a, b)) in e {
                if t == w && a <= i && b <= j {
                    cands.insert((x.clone(), (i - a, j - b), w2.clone()));
                }
            }
        }
        for (x2, (a, b)) in dc.get(x).into_iter().flatten() {
            if a <= i && b <= j {
                cands.insert((x2.clone(), (i - a, j - b), w.clone()));
            }
        }
    }
    cands.into_iter().all(|(x, m, w)| {
        // ∂ψ + ψ∂ for ψ = x ↦ m·w, as (source, element) pairs
        let mut img: Vec<(String, Elem)> = Vec::new();
        let mut single = Elem::new();
        single.insert((w.clone(), m));
        img.push((x.clone(), apply(&dd, &single)));
        for (x2, e) in &dc {
            for (t, (a, b)) in e {
                if *t == x {
                    let mut el = Elem::new();
                    el.insert((w.clone(), (m.0 + a, m.1 + b)));
                    img.push((x2.clone(), el));
                }
            }
        }
        // Count with multiplicity: the same triple may come from several images.
        let total: usize = ys
            .iter()
            .map(|(yx, ym, yw)| img.iter().filter(|(s, e)| s == yx && e.contains(&(yw.clone(), *ym))).count())
            .sum();
        total.is_multiple_of(2)
    })
}

/// A block of a planted complex over `F2[U]` with (Maslov, Alexander) gradings.
#[derive(Clone, Debug)]
pub enum Block {
    /// A free generator at (m, a).
    Free(i64, i64),
    /// ∂b = U^k·a with a at (m, a).
    Tower(i64, i64, u32),
}

/// A complex built from blocks and hidden by a random homogeneous change of basis.
pub struct Planted {
    pub complex: Value,
    /// Gradings of the free generators, sorted.
    pub free: Vec<Vec<i64>>,
    /// (k, grading of the tower's target) for k ≥ 1, sorted.
    pub torsion: Vec<(u32, Vec<i64>)>,
    /// Generator names in the hidden basis, and each planted generator written in it.
    pub planted_in_new: Vec<Vec<(String, u32)>>,
}

/// xorshift64*: a small deterministic generator for test data.
pub struct Rng(pub u64);
impl Rng {
    pub fn next_u64(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545F4914F6CDD1D)
    }
    pub fn below(&mut self, n: u64) -> u64 {
        self.next_u64() % n
    }
}

/// Builds the blocks, then replaces the basis by P (unitriangular in a random order, entries
/// U^e wherever homogeneity allows) and writes ∂' = P⁻¹∂P with named generators g0, g1, ….
pub fn planted_complex(blocks: &[Block], seed: u64) -> Planted {
    use tubecert_format::Mono;
    use tubecheck::algebra::SparseMap;
    let mut gr: Vec<Vec<i64>> = Vec::new();
    let mut d = SparseMap::zero(0);
    let (mut free, mut torsion) = (Vec::new(), Vec::new());
    for b in blocks {
        match *b {
            Block::Free(m, a) => {
                gr.push(vec![m, a]);
                d.rows.push(vec![]);
                free.push(vec![m, a]);
            }
            Block::Tower(m, a, k) => {
                let t = gr.len() as u32;
                gr.push(vec![m, a]);
                gr.push(vec![m + 1 - 2 * k as i64, a - k as i64]);
                d.rows.push(vec![]);
                d.rows.push(vec![(t, Mono([k, 0]))]);
                if k > 0 {
                    torsion.push((k, vec![m, a]));
                }
            }
        }
    }
    let n = gr.len();
    let mut rng = Rng(seed | 1);
    let mut order: Vec<usize> = (0..n).collect();
    for i in (1..n).rev() {
        order.swap(i, rng.below(i as u64 + 1) as usize);
    }
    // P.rows[j] = new j in the old basis; N = P − I is strictly triangular in `order`.
    let mut nil = SparseMap::zero(n);
    for x in 0..n {
        for y in x + 1..n {
            let (i, j) = (order[x], order[y]);
            let (dm, da) = (gr[i][0] - gr[j][0], gr[i][1] - gr[j][1]);
            if dm >= 0 && dm % 2 == 0 && da == dm / 2 && rng.below(2) == 0 {
                nil.rows[j].push((i as u32, Mono([(dm / 2) as u32, 0])));
            }
        }
    }
    for r in &mut nil.rows {
        r.sort();
    }
    let id = SparseMap::identity(n);
    let p = id.plus(&nil);
    let (mut pinv, mut power) = (id.clone(), nil.clone());
    for _ in 0..n {
        pinv = pinv.plus(&power);
        power = nil.after(&power).unwrap();
    }
    assert_eq!(pinv.after(&p).unwrap(), id, "P⁻¹P = I");
    let dnew = pinv.after(&d.after(&p).unwrap()).unwrap();
    let name = |i: u32| format!("g{i}");
    let mut terms = Vec::new();
    for (j, row) in dnew.rows.iter().enumerate() {
        for &(i, m) in row {
            let c = if m.0[0] == 0 { "1".to_string() } else { format!("U^{}", m.0[0]) };
            terms.push(serde_json::json!([name(j as u32), c, name(i)]));
        }
    }
    let gens: serde_json::Map<String, Value> = (0..n).map(|i| (name(i as u32), serde_json::json!(gr[i]))).collect();
    free.sort();
    torsion.sort();
    let planted_in_new = pinv.rows.iter().map(|r| r.iter().map(|&(i, m)| (name(i), m.0[0])).collect()).collect();
    Planted { complex: serde_json::json!({"generators": gens, "differential": terms}), free, torsion, planted_in_new }
}

/// An independent oracle for whole certificates (complexes, maps and the claim kinds the
/// stored certificates use), written with plain maps and none of the checker's code. Used to
/// explain every accepted mutation: the checker and the oracle must agree.
pub mod oracle {
    use super::{apply, map_of, monomials, toggle, Elem};
    use std::collections::BTreeMap;
    use tubecert_format::{Body, Claim, MapExpr, Term};

    type Map = BTreeMap<String, Elem>;
    type Decomposition = (Vec<Vec<i64>>, Vec<(u32, Vec<i64>)>);

    struct World<'a> {
        body: &'a Body,
        var_deg: Vec<Vec<i64>>,
        delta: Vec<i64>,
    }

    impl World<'_> {
        fn mono_deg(&self, (i, j): (u32, u32)) -> Vec<i64> {
            let mut g = vec![0; self.delta.len()];
            for (v, e) in [(0, i), (1, j)] {
                if let Some(d) = self.var_deg.get(v) {
                    for (k, x) in g.iter_mut().enumerate() {
                        *x += d[k] * e as i64;
                    }
                } else if e > 0 {
                    return vec![i64::MIN; self.delta.len()];
                }
            }
            g
        }

        fn gr(&self, complex: &str, g: &str) -> Option<Vec<i64>> {
            self.body.complexes.get(complex)?.generators.get(g).cloned()
        }

        /// Every term names known generators and is homogeneous of `degree`.
        fn homogeneous(&self, terms: &[Term], from: &str, to: &str, degree: &[i64]) -> bool {
            terms.iter().all(|[x, c, y]| {
                let (Some(gx), Some(gy)) = (self.gr(from, x), self.gr(to, y)) else { return false };
                monomials(c).into_iter().all(|m| {
                    let dm = self.mono_deg(m);
                    (0..gx.len()).all(|k| gy[k] + dm[k] == gx[k] + degree[k])
                })
            })
        }

        fn d(&self, c: &str) -> Map {
            map_of(&self.body.complexes[c].differential)
        }

        fn gens(&self, c: &str) -> Vec<String> {
            self.body.complexes[c].generators.keys().cloned().collect()
        }

        /// (from, to, degree, map) of an expression.
        fn eval(&self, e: &MapExpr) -> Option<(String, String, Vec<i64>, Map)> {
            Some(match e {
                MapExpr::Named(n) => {
                    let m = self.body.maps.get(n)?;
                    (m.from.clone(), m.to.clone(), m.degree.clone(), map_of(&m.terms))
                }
                MapExpr::Id(c) => {
                    let m = self.gens(c).into_iter().map(|g| {
                        let mut e = Elem::new();
                        e.insert((g.clone(), (0, 0)));
                        (g, e)
                    });
                    (c.clone(), c.clone(), vec![0; self.delta.len()], m.collect())
                }
                MapExpr::Sum(es) => {
                    let mut acc = self.eval(&es[0])?;
                    for e in &es[1..] {
                        let v = self.eval(e)?;
                        if (&v.0, &v.1, &v.2) != (&acc.0, &acc.1, &acc.2) {
                            return None;
                        }
                        for (x, el) in v.3 {
                            for k in el {
                                toggle(acc.3.entry(x.clone()).or_default(), k);
                            }
                        }
                    }
                    acc
                }
                MapExpr::Times(m, e) => {
                    let (i, j) = super::numbers::monomial(m)?;
                    let v = self.eval(e)?;
                    let deg = v.2.iter().zip(self.mono_deg((i, j))).map(|(a, b)| a + b).collect();
                    let scaled =
                        v.3.into_iter()
                            .map(|(x, el)| (x, el.into_iter().map(|(g, (a, b))| (g, (a + i, b + j))).collect()))
                            .collect();
                    (v.0, v.1, deg, scaled)
                }
                MapExpr::Compose(es) => {
                    let mut acc = self.eval(es.last()?)?;
                    for e in es.iter().rev().skip(1) {
                        let outer = self.eval(e)?;
                        if outer.0 != acc.1 {
                            return None;
                        }
                        let m = acc.3.iter().map(|(x, el)| (x.clone(), apply(&outer.3, el))).collect();
                        acc = (acc.0, outer.1, acc.2.iter().zip(&outer.2).map(|(a, b)| a + b).collect(), m);
                    }
                    acc
                }
            })
        }

        /// A map written back as terms, for the term-based checks above.
        fn as_terms(phi: &Map) -> Vec<Term> {
            phi.iter()
                .flat_map(|(x, el)| el.iter().map(move |(w, m)| [x.clone(), super::numbers::write_mono(*m), w.clone()]))
                .collect()
        }

        fn equal_on(&self, sources: &[String], a: &Map, b: &Map) -> bool {
            sources.iter().all(|x| a.get(x).cloned().unwrap_or_default() == b.get(x).cloned().unwrap_or_default())
        }

        fn null_homotopic(&self, e: &MapExpr, h: &[Term]) -> bool {
            let Some((from, to, deg, phi)) = self.eval(e) else { return false };
            let hdeg: Vec<i64> = deg.iter().zip(&self.delta).map(|(a, b)| a - b).collect();
            if !self.homogeneous(h, &from, &to, &hdeg) {
                return false;
            }
            let phi_terms = Self::as_terms(&phi);
            super::is_homotopy(
                &self.body.complexes[&from].differential,
                &self.body.complexes[&to].differential,
                &self.gens(&from),
                &phi_terms,
                h,
            )
        }

        fn not_null(&self, e: &MapExpr, y: &[Term]) -> bool {
            let Some((from, to, _, phi)) = self.eval(e) else { return false };
            if y.iter().any(|[x, _, w]| self.gr(&from, x).is_none() || self.gr(&to, w).is_none()) {
                return false;
            }
            let mut seen = std::collections::BTreeSet::new();
            if !y.iter().all(|t| seen.insert(t.clone())) {
                return false;
            }
            let phi_terms = Self::as_terms(&phi);
            super::is_dual_witness(
                &self.body.complexes[&from].differential,
                &self.body.complexes[&to].differential,
                &phi_terms,
                y,
            )
        }

        fn homology(&self, c: &str, w: &tubecert_format::BasisWitness) -> Option<Decomposition> {
            let zero = vec![0; self.delta.len()];
            // The new basis lives in a scratch complex "·new".
            let grn = |g: &str| w.generators.get(g).cloned();
            let homog = |terms: &[Term], from_new: bool| {
                terms.iter().all(|[x, cf, y]| {
                    let (gx, gy) = if from_new { (grn(x), self.gr(c, y)) } else { (self.gr(c, x), grn(y)) };
                    let (Some(gx), Some(gy)) = (gx, gy) else { return false };
                    monomials(cf).into_iter().all(|m| {
                        let dm = self.mono_deg(m);
                        (0..gx.len()).all(|k| gy[k] + dm[k] == gx[k] + zero[k])
                    })
                })
            };
            if !homog(&w.basis, true) || !homog(&w.inverse, false) {
                return None;
            }
            let (b, binv, d) = (map_of(&w.basis), map_of(&w.inverse), self.d(c));
            let unit = |g: &String| {
                let mut e = Elem::new();
                e.insert((g.clone(), (0, 0)));
                e
            };
            let empty = Elem::new();
            let new: Vec<String> = w.generators.keys().cloned().collect();
            if new.iter().any(|t| apply(&binv, b.get(t).unwrap_or(&empty)) != unit(t)) {
                return None;
            }
            if self.gens(c).iter().any(|g| apply(&b, binv.get(g).unwrap_or(&empty)) != unit(g)) {
                return None;
            }
            let (mut free, mut tors) = (Vec::new(), Vec::new());
            let dnew: BTreeMap<String, Elem> =
                new.iter().map(|t| (t.clone(), apply(&binv, &apply(&d, b.get(t).unwrap_or(&empty))))).collect();
            let mut hit: BTreeMap<String, usize> = BTreeMap::new();
            for el in dnew.values() {
                if el.len() > 1 {
                    return None;
                }
                for (t, _) in el {
                    *hit.entry(t.clone()).or_default() += 1;
                }
            }
            for t in &new {
                let el = &dnew[t];
                if hit.get(t).copied().unwrap_or(0) > 1 || (hit.contains_key(t) && !el.is_empty()) {
                    return None;
                }
                if let Some((tgt, (i, _))) = el.iter().next() {
                    if *i > 0 {
                        tors.push((*i, grn(tgt)?));
                    }
                } else if !hit.contains_key(t) {
                    free.push(grn(t)?);
                }
            }
            free.sort();
            tors.sort();
            Some((free, tors))
        }
    }

    /// ∂∂ = 0 and homogeneity of every complex of the world's body; every map homogeneous
    /// between declared complexes and a chain map.
    fn objects_hold(w: &World) -> bool {
        let body = w.body;
        for (name, c) in body.complexes.iter() {
            if !w.homogeneous(&c.differential, name, name, &w.delta) {
                return false;
            }
            let d = w.d(name);
            if w.gens(name).iter().any(|x| !apply(&d, d.get(x).unwrap_or(&Elem::new())).is_empty()) {
                return false;
            }
        }
        for m in body.maps.values() {
            if !body.complexes.contains_key(&m.from)
                || !body.complexes.contains_key(&m.to)
                || !w.homogeneous(&m.terms, &m.from, &m.to, &m.degree)
            {
                return false;
            }
            let (f, dc, dd) = (map_of(&m.terms), w.d(&m.from), w.d(&m.to));
            let lhs: Map =
                w.gens(&m.from).iter().map(|x| (x.clone(), apply(&dd, f.get(x).unwrap_or(&Elem::new())))).collect();
            let rhs: Map =
                w.gens(&m.from).iter().map(|x| (x.clone(), apply(&f, dc.get(x).unwrap_or(&Elem::new())))).collect();
            if !w.equal_on(&w.gens(&m.from), &lhs, &rhs) {
                return false;
            }
        }
        true
    }

    /// Does every implicit check and every claim of the body hold (the format version written)?
    pub fn holds(body: &Body) -> bool {
        holds_in(body, tubecert_format::CERTIFICATE_VERSION)
    }

    /// Does every implicit check and every claim of a body of format `version` hold?
    pub fn holds_in(body: &Body, version: u32) -> bool {
        // Bordered objects (full complexes, structures, modules, morphisms) have implicit checks.
        if crate::bordered_oracle::cert::read_bordered(&serde_json::to_value(body).unwrap(), version).is_err() {
            return false;
        }
        // Numbers first, read by the oracle's own reader in the body's ring.
        let _ring = super::numbers::in_ring(&body.ring.variables);
        if !super::numbers::readable(body) || !crate::wording::names_legal(body) {
            return false;
        }
        let vars = &body.ring.variables;
        let var_deg: Vec<Vec<i64>> = vars.iter().map(|v| body.ring.variable_degrees[v].clone()).collect();
        let w = World { body, var_deg, delta: body.ring.differential_degree.clone() };
        if !objects_hold(&w) {
            return false;
        }
        // The full complexes and the maps between them (changes of basis), over F2[U,V].
        let full_body = body.bordered.as_ref().map(|b| Body {
            bordered: None,
            ring: b.full_ring.clone(),
            complexes: b.full_complexes.clone(),
            maps: b.full_maps.clone(),
            claims: Vec::new(),
            provenance: body.provenance.clone(),
        });
        let full = full_body.as_ref().map(|fb| World {
            body: fb,
            var_deg: vec![vec![-2, 0], vec![0, -2]],
            delta: vec![-1, -1],
        });
        if full.as_ref().is_some_and(|f| !objects_hold(f)) {
            return false;
        }
        body.claims.iter().all(|claim| {
            if crate::wording::statement(claim, &body.ring, version).as_deref() != Some(claim.statement()) {
                return false;
            }
            match claim {
                Claim::HomotopyEquivalence { maps: [f, g], witness, .. } => {
                    // Over F2[U,V] when the maps are full maps, else over the body's ring.
                    let w = match &full {
                        Some(fw) if fw.body.maps.contains_key(f) => fw,
                        _ => &w,
                    };
                    let (Some(fm), Some(gm)) = (w.body.maps.get(f), w.body.maps.get(g)) else { return false };
                    // Degree 0 both ways: maps of opposite non-zero degrees would prove C ≃ D
                    // only up to a shift of gradings.
                    let degree_zero = fm.degree.iter().chain(&gm.degree).all(|&a| a == 0);
                    let round = |a: &str, b: &str, on: &str| {
                        MapExpr::Sum(vec![
                            MapExpr::Compose(vec![MapExpr::Named(b.into()), MapExpr::Named(a.into())]),
                            MapExpr::Id(on.into()),
                        ])
                    };
                    fm.to == gm.from
                        && gm.to == fm.from
                        && degree_zero
                        && w.null_homotopic(&round(f, g, &fm.from), &witness.source_homotopy)
                        && w.null_homotopic(&round(g, f, &fm.to), &witness.target_homotopy)
                }
                Claim::NullHomotopic { map, witness, .. } => w.null_homotopic(map, &witness.homotopy),
                Claim::NotNullHomotopic { map, witness, .. } => w.not_null(map, &witness.dual),
                Claim::TorsionOrder { maps: [f, g], variable, order, witness, .. } => {
                    let e = |k: u32| MapExpr::scaled_difference(f, g, variable, k);
                    w.null_homotopic(&e(*order), &witness.homotopy)
                        && match (order, &witness.dual) {
                            (0, None) => true,
                            (k, Some(y)) if *k > 0 => w.not_null(&e(k - 1), y),
                            _ => false,
                        }
                }
                Claim::Homology { complex, free, torsion, witness, .. } => {
                    w.homology(complex, witness).is_some_and(|(f, t)| (&f, &t) == (free, torsion))
                }
                Claim::Tau { complex, alexander, tau, witness, .. } => {
                    let a = body.ring.gradings.iter().position(|g| g == alexander);
                    let ok_ring = w.var_deg.len() == 1 && a.is_some_and(|a| w.var_deg[0][a] == -1);
                    // A version-1 statement names no grading: only "alexander", the one choice.
                    let unnamed_ok = body.ring.gradings.len() == 1
                        || (alexander == "alexander"
                            && w.var_deg.first().is_some_and(|d| d.iter().filter(|&&x| x == -1).count() == 1));
                    let ok_ring = ok_ring && (version >= 2 || unnamed_ok);
                    ok_ring
                        && w.homology(complex, witness).is_some_and(|(f, _)| f.len() == 1 && -f[0][a.unwrap()] == *tau)
                }
                Claim::TorsionOrderOfComplex { complex, variable, order, witness, .. } => {
                    vars.first() == Some(variable)
                        && w.homology(complex, witness)
                            .is_some_and(|(_, t)| t.iter().map(|x| x.0).max().unwrap_or(0) == *order)
                }
                // The bordered kinds are decided by their own oracle, over the body as JSON.
                c if crate::bordered_oracle::cert::KINDS.contains(&c.kind()) => {
                    let body = serde_json::to_value(body).unwrap();
                    let claim = serde_json::to_value(c).unwrap();
                    crate::bordered_oracle::cert::read_bordered(&body, version)
                        .and_then(|b| b.ok_or("no bordered member".into()))
                        .and_then(|b| crate::bordered_oracle::cert::claim(&body, &b, &claim, version))
                        .is_ok()
                }
                _ => panic!("the oracle covers the claim kinds of the stored certificates"),
            }
        })
    }
}

/// Statements and names as the oracle reads them, written here without the format crate's
/// renderer or alphabet check: what each claim kind must say, in format version 1 or 2.
pub mod wording {
    use tubecert_format::{Body, Claim, MapExpr, Ring};

    /// ASCII letters and digits, `_`, `.`, `'` and `⊗`; 1 to 200 bytes.
    pub fn name_ok(n: &str) -> bool {
        (1..=200).contains(&n.len()) && n.chars().all(|c| c.is_ascii_alphanumeric() || "_.'⊗".contains(c))
    }

    /// Every declared name in the alphabet; map names not `id_…`; variables letters.
    pub fn names_legal(body: &Body) -> bool {
        let r = &body.ring;
        r.variables.iter().all(|v| !v.is_empty() && v.chars().all(|c| c.is_ascii_alphabetic()))
            && r.gradings.iter().all(|g| name_ok(g))
            && body.complexes.iter().all(|(c, s)| name_ok(c) && s.generators.keys().all(|g| name_ok(g)))
            && body.maps.keys().all(|m| name_ok(m) && !m.starts_with("id_"))
    }

    /// A monomial in the written form `U^2*V` (variables in ring order, exponents ≥ 2 written
    /// without leading zeros, `1` for the unit), or None.
    pub fn canonical_monomial(m: &str, vars: &[String]) -> Option<String> {
        if m == "1" {
            return Some(m.into());
        }
        let mut last = None;
        for f in m.split('*') {
            let (v, e) = f.split_once('^').map_or((f, None), |(v, e)| (v, Some(e)));
            let i = vars.iter().position(|x| x == v)?;
            if last.is_some_and(|l| l >= i) {
                return None;
            }
            last = Some(i);
            if let Some(e) = e {
                let k: u64 = e.parse().ok()?;
                if k < 2 || k.to_string() != e {
                    return None;
                }
            }
        }
        Some(m.into())
    }

    fn expr(e: &MapExpr, vars: &[String], version: u32) -> Option<String> {
        let composite = |e: &MapExpr| matches!(e, MapExpr::Compose(_) | MapExpr::Times(..));
        let bracket = |e: &MapExpr| -> Option<String> {
            let s = expr(e, vars, version)?;
            Some(if version >= 2 && composite(e) { format!("({s})") } else { s })
        };
        Some(match e {
            MapExpr::Named(n) => n.clone(),
            MapExpr::Id(c) => "id_".to_string() + c,
            MapExpr::Sum(es) => {
                let parts: Option<Vec<String>> = es.iter().map(|x| expr(x, vars, version)).collect();
                "(".to_string() + &parts?.join(" + ") + ")"
            }
            MapExpr::Compose(es) => {
                let parts: Option<Vec<String>> = es.iter().map(bracket).collect();
                parts?.join("∘")
            }
            MapExpr::Times(m, x) => {
                let inner = if matches!(**x, MapExpr::Compose(_)) { bracket(x)? } else { expr(x, vars, version)? };
                canonical_monomial(m, vars)? + "·" + &inner
            }
        })
    }

    fn tuple(g: &[i64]) -> String {
        let parts: Vec<String> = g.iter().map(|x| x.to_string()).collect();
        "(".to_string() + &parts.join(", ") + ")"
    }

    /// The statement a claim must carry, or None when a field holds something no statement
    /// may print (an illegal name, a monomial not in its written form).
    pub fn statement(claim: &Claim, ring: &Ring, version: u32) -> Option<String> {
        let vars = &ring.variables;
        let rn = if vars.is_empty() { "F2".to_string() } else { format!("F2[{}]", vars.join(",")) };
        let named = |ns: &[&String]| ns.iter().all(|n| name_ok(n));
        Some(match claim {
            Claim::Complex { complex, .. } if named(&[complex]) => {
                format!("{complex} is a chain complex over {rn} (∂∘∂ = 0, ∂ homogeneous)")
            }
            Claim::ChainMap { map, .. } if named(&[map]) => format!("{map} is a homogeneous chain map"),
            Claim::NullHomotopic { map, .. } => expr(map, vars, version)? + " ≃ 0 (null-homotopic)",
            Claim::NotNullHomotopic { map, .. } => expr(map, vars, version)? + " is not null-homotopic",
            Claim::HomotopyEquivalence { maps: [f, g], .. } if named(&[f, g]) => {
                format!("{f} and {g} are mutually inverse homotopy equivalences")
            }
            Claim::Homology { complex, free, torsion, .. } if named(&[complex]) => {
                let mut parts: Vec<String> = free.iter().map(|g| format!("{rn}⟨{}⟩", tuple(g))).collect();
                let v = vars.first().map_or("", |v| v.as_str());
                for (k, g) in torsion {
                    let p = if *k == 1 { v.to_string() } else { format!("{v}^{k}") };
                    parts.push(format!("{rn}/({p})⟨{}⟩", tuple(g)));
                }
                let h = if parts.is_empty() { "0".to_string() } else { parts.join(" ⊕ ") };
                format!("H_*({complex}) ≅ {h}")
            }
            Claim::TorsionOrder { maps: [f, g], variable, order, .. } if named(&[f, g, variable]) => {
                format!("ord_{variable}({f} − {g}) = {order}")
            }
            Claim::TorsionOrderOfComplex { complex, variable, order, .. } if named(&[complex, variable]) => {
                format!("Ord_{variable}(H_*({complex})) = {order}")
            }
            Claim::Tau { complex, alexander, tau, .. } if named(&[complex, alexander]) => {
                if version >= 2 && ring.gradings.len() > 1 {
                    format!("τ({complex}) = {tau} (Alexander grading {alexander})")
                } else {
                    format!("τ({complex}) = {tau}")
                }
            }
            // The bordered kinds: their wording lives with their oracle.
            c if version >= 2 => {
                return crate::bordered_oracle::cert::statement(&serde_json::to_value(c).ok()?, version)
            }
            _ => return None,
        })
    }
}

pub mod bombs;

/// JSON text of `v` with the first member of the `n`-th object (pre-order) written twice, the
/// second time with the value `second` (or the same value when `None`); `n` is left negative
/// once it was used. Shared by the fuzzer, the mutation campaign and the canonical-form tests.
pub fn with_repeated_key(v: &serde_json::Value, n: &mut i64, second: Option<&serde_json::Value>, out: &mut String) {
    match v {
        serde_json::Value::Object(m) => {
            let here = *n == 0;
            *n -= 1;
            out.push('{');
            for (i, (k, x)) in m.iter().enumerate() {
                let key = serde_json::to_string(k).unwrap();
                if i > 0 {
                    out.push(',');
                }
                let mut inner = String::new();
                with_repeated_key(x, n, second, &mut inner);
                out.push_str(&format!("{key}:{inner}"));
                if here && i == 0 {
                    let again = second.map_or(inner, |s| s.to_string());
                    out.push_str(&format!(",{key}:{again}"));
                }
            }
            out.push('}');
        }
        serde_json::Value::Array(items) => {
            out.push('[');
            for (i, x) in items.iter().enumerate() {
                if i > 0 {
                    out.push(',');
                }
                with_repeated_key(x, n, second, out);
            }
            out.push(']');
        }
        _ => out.push_str(&v.to_string()),
    }
}

/// Alexander polynomials computed by the tests themselves, never by the producer's
/// constructions: the reference side of the checks on torus knots and cables.
pub mod alexander {
    use std::collections::BTreeMap;

    /// A Laurent polynomial in t: exponent → non-zero coefficient.
    pub type Poly = BTreeMap<i64, i64>;

    pub fn mul(a: &Poly, b: &Poly) -> Poly {
        let mut out = Poly::new();
        for (i, x) in a {
            for (j, y) in b {
                *out.entry(i + j).or_default() += x * y;
            }
        }
        out.retain(|_, c| *c != 0);
        out
    }

    /// Δ(t^p).
    pub fn substitute_power(a: &Poly, p: i64) -> Poly {
        a.iter().map(|(k, c)| (k * p, *c)).collect()
    }

    /// Δ of the torus knot T(p, q) (p ≥ 1, q ≠ 0 coprime; T(p, −q) is the mirror, same Δ),
    /// symmetrized: t^{−(p−1)(|q|−1)/2}(t^{p|q|} − 1)(t − 1)/((t^p − 1)(t^{|q|} − 1)) (the
    /// conventions sheet's formula). Computed without polynomial division, through the semigroup
    /// S = pℕ + |q|ℕ: 1/((1 − t^p)(1 − t^q)) counts the representations n = ap + bq, and the
    /// factor 1 − t^{pq} leaves one per element of S, so Δ = (1 − t)·Σ_{s∈S} t^s up to the shift;
    /// every n ≥ c = (p−1)(|q|−1) lies in S and c − 1 does not, so only n ≤ c contribute.
    pub fn torus(p: i64, q: i64) -> Poly {
        let q = q.abs();
        assert!(p >= 1 && q >= 1, "T({p},{q})");
        let c = (p - 1) * (q - 1);
        let in_s = |n: i64| n >= 0 && (0..=n / p).any(|a| (n - a * p) % q == 0);
        let mut out = Poly::new();
        for n in 0..=c {
            let coefficient = i64::from(in_s(n)) - i64::from(in_s(n - 1));
            if coefficient != 0 {
                out.insert(n - c / 2, coefficient);
            }
        }
        out
    }

    /// Σ (−1)^M t^A over (Maslov, Alexander) gradings: a graded Euler characteristic.
    pub fn euler<'a>(gradings: impl IntoIterator<Item = &'a [i64]>) -> Poly {
        let mut out = Poly::new();
        for g in gradings {
            *out.entry(g[1]).or_default() += if g[0].rem_euclid(2) == 0 { 1 } else { -1 };
        }
        out.retain(|_, c| *c != 0);
        out
    }

    #[test]
    fn torus_knot_polynomials_by_hand() {
        // Δ_{T(2,3)} = t − 1 + t⁻¹ and Δ_{T(3,4)} = t³ − t² + 1 − t⁻² + t⁻³, expanded by hand from
        // the formula; the unknot T(p, ±1) has Δ = 1.
        assert_eq!(torus(2, 3), Poly::from([(-1, 1), (0, -1), (1, 1)]));
        assert_eq!(torus(3, 4), Poly::from([(-3, 1), (-2, -1), (0, 1), (2, -1), (3, 1)]));
        assert_eq!(torus(3, -4), torus(3, 4));
        assert_eq!(torus(5, 1), Poly::from([(0, 1)]));
        // (t^{pq} − 1)(t − 1) = Δ·(t^p − 1)(t^q − 1) after the shift, for a few more.
        let binomial = |d: i64| Poly::from([(0, -1), (d, 1)]);
        for (p, q) in [(2, 5), (3, 5), (4, 7), (5, 6)] {
            let lhs = mul(&binomial(p * q), &binomial(1));
            let rhs = mul(&mul(&torus(p, q), &binomial(p)), &binomial(q));
            let shift = (p - 1) * (q - 1) / 2;
            assert_eq!(lhs, rhs.iter().map(|(k, c)| (k + shift, *c)).collect::<Poly>(), "T({p},{q})");
        }
    }
}
