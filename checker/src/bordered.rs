//! Checks of the bordered claims (torus algebra A(T²), LOT §11.1, and LOT ch. 2 for type D
//! structures, type A modules, morphisms and box tensor products; LOT Thm 11.26 for knot
//! complements). Plain arithmetic: relations are summed term by term, box tensor products are
//! recomputed by walking δ-paths and compared exactly. Work is counted before it is done and
//! bounded by a budget proportional to the size of the certificate.

use crate::algebra::{normalize, Vector};
use crate::load::{Complex, Context};
use crate::verify::{ensure, none_of};
use serde_json::json;
use std::cell::Cell;
use std::collections::{BTreeMap, BTreeSet};
use tubecert_format::bordered::{full_ring, Alg, Bordered, DGenerator, MorphismSpec, TypeASpec, TypeDSpec};
use tubecert_format::limits::{grading_in_bounds, MAX_EXPONENT};
use tubecert_format::{Claim, Grading, Mono, Term, UniqueMap};

/// Why a bordered claim does not verify: it is false (exit 1), or the checker refuses to
/// decide it (an infinite sum, or more work than the budget: exit 2).
#[derive(Debug)]
pub enum Failure {
    False(String),
    Refused(String),
}

impl From<String> for Failure {
    fn from(s: String) -> Failure {
        Failure::False(s)
    }
}

/// Work units allowed per written item (generator, term, family) of the certificate.
pub const WORK_PER_ITEM: u64 = 1 << 14;
/// A fixed allowance, once per certificate, for A∞ relations only: a small file may certify a
/// module on long words (a companion with one long step); nothing that builds objects gets it.
pub const WORK_FLOOR: u64 = 1 << 32;

/// For each source generator, its terms (coefficient, target).
pub type Arrows = Vec<Vec<(Alg, u32)>>;
/// For each generator of a box tensor product, its terms (target name, U-power).
pub type Rows = Vec<Vec<(String, u32)>>;
/// What a verified claim established (reported beside it).
pub type Facts = BTreeMap<String, serde_json::Value>;

/// A type D structure or a type A module, indexed: its generators (a structure's gradings are
/// optional), and δ¹ (a structure's, sorted) or the families of operations (a module's).
#[derive(Default)]
pub struct Object {
    pub names: Vec<String>,
    pub index: BTreeMap<String, u32>,
    pub idem: Vec<u8>,
    pub grading: Vec<Option<Grading>>,
    /// Version 3: gradings are elements of the grading group, `period` generates P_D (or P_A).
    pub group: bool,
    pub period: Gr,
    pub delta: Arrows,
    pub families: Vec<Family>,
    /// For each generator, the indices of the families from it.
    pub out: Vec<Vec<usize>>,
    /// The first term whose idempotents do not match, or (version 3) family that is not
    /// homogeneous (the claim fails on it; one kept, so many cannot fill memory with messages).
    pub defects: Vec<String>,
}

/// One family m(from, prefix, repeat^n, suffix) ∋ U^(a·n+b)·to; `pattern` = prefix ++ repeat ++ suffix.
pub struct Family {
    pub from: u32,
    pub pattern: Vec<Alg>,
    pub prefix: usize,
    pub repeat: usize,
    pub power: [u32; 2],
    pub to: u32,
    /// For each letter of the pattern, the positions holding it (a bit each).
    pub holds: BTreeMap<Alg, u64>,
}

/// A type D morphism: its terms and idempotent defects, as [`read_arrows`] reads them (its
/// source and target are those written, `Objects::spec`).
pub type Morphism = (Arrows, Vec<String>);

/// The loaded bordered section (`spec`: as written).
pub struct Objects<'a> {
    pub spec: &'a Bordered,
    pub full: Context,
    pub structures: BTreeMap<String, Object>,
    pub modules: BTreeMap<String, Object>,
    pub morphisms: BTreeMap<String, Morphism>,
    pub budget: Budget,
    /// (kind, object) of each `type_d_structure` and `type_a_module` claim, with the longest
    /// word length L a module's claims state (0 for a structure).
    pub claimed: BTreeMap<(&'static str, String), u32>,
}

/// Work units left: every check counts its work before doing it and refuses beyond. `longest`:
/// the longest input word that gave a term of a box tensor product (reported). The third cell:
/// what is left of [`WORK_FLOOR`], open to A∞ relation checks only.
pub struct Budget(pub Cell<u64>, pub Cell<usize>, pub Cell<u64>);

impl Budget {
    pub fn spend(&self, units: u64, what: &str) -> Result<(), Failure> {
        let why = || format!("{what}: more work than the budget ({WORK_PER_ITEM} units per written item) allows");
        self.0.set(self.0.get().checked_sub(units).ok_or_else(|| Failure::Refused(why()))?);
        Ok(())
    }
}

fn grading_ok(g: &Grading, group: bool, what: &str) -> Result<(), String> {
    let shape = |n| g.len() == n && g.iter().all(|&x| grading_in_bounds(x));
    match group {
        true => ensure(shape(4) && (g[1] - g[2]) % 2 == 0, || {
            format!("{what}: a grading is [2j, 2p, 2q, 2a] (twice the coordinates of (j; p, q; a), 2p and 2q of equal parity) within ±2^31")
        }),
        false => ensure(shape(2), || format!("{what}: a version-2 grading is [Maslov, Alexander] within ±2^31")),
    }
}

/// An element (j; p, q; a) of the grading group of A(T²) (LOT §11.1, Ch. 10) with the
/// Alexander coordinate a of a doubly pointed diagram, stored doubled: [2j, 2p, 2q, 2a].
/// Product (j1; v1; a1)(j2; v2; a2) = (j1 + j2 + det(v1, v2); v1 + v2; a1 + a2).
pub type Gr = [i128; 4];
/// λ = (1; 0, 0; 0): the differential lowers gradings by λ.
pub const LAMBDA: Gr = [2, 0, 0, 0];
/// gr(U) = (−2; 0, 0; −1).
pub const GR_U: Gr = [-4, 0, 0, -2];

pub fn gr_mul(g: Gr, h: Gr) -> Gr {
    // det in halves is (P1·Q2 − Q1·P2)/4; doubled, /2 (exact: P ≡ Q mod 2 for every element).
    [g[0] + h[0] + (g[1] * h[2] - g[2] * h[1]) / 2, g[1] + h[1], g[2] + h[2], g[3] + h[3]]
}

/// g^n (n·g coordinate-wise, since det(v, v) = 0); n = −1 is the inverse.
pub fn gr_pow(g: Gr, n: i128) -> Gr {
    g.map(|x| x * n)
}

/// gr(ρ1) = (−½; ½, −½), gr(ρ2) = (−½; ½, ½), gr(ρ3) = (−½; −½, ½), gr(ρ_I) the product
/// along I, gr(ι) = 1 (LOT §11.1).
pub fn gr_alg(a: Alg) -> Gr {
    const CHORD: [Gr; 3] = [[-1, 1, -1, 0], [-1, 1, 1, 0], [-1, -1, 1, 0]];
    let Alg::Reeb(lo, hi) = a else { return [0; 4] };
    (lo..=hi).fold([0; 4], |g, i| gr_mul(g, CHORD[i as usize - 1]))
}

/// A written grading as an element (none: the unit).
fn gr_of(g: Option<&Grading>) -> Gr {
    [0, 1, 2, 3].map(|i| g.and_then(|g| g.get(i)).map_or(0, |&x| x as i128))
}

/// gr(y′) where a ⊗ y′ is a term of δ¹(y) (homogeneous: gr(a)·gr(y′) = λ⁻¹·gr(y)).
fn after(a: Alg, g: Gr) -> Gr {
    gr_mul(gr_mul(gr_pow(gr_alg(a), -1), gr_pow(LAMBDA, -1)), g)
}

/// Whether g is a power of the period h.
fn in_period(g: Gr, h: Gr) -> bool {
    h.iter().position(|&x| x != 0).map_or(g == [0; 4], |i| g[i] % h[i] == 0 && gr_pow(h, g[i] / h[i]) == g)
}

/// (Maslov, Alexander) of the double coset P_A·g·P_D: with m·v(h_A) + v(g) + n·v(h_D) = 0
/// ((p, q) parts; det = ±1, i.e. the glued manifold has H_1 = 0), h_A^m·g·h_D^n = (j; 0, 0; a).
pub fn read_grading(g: Gr, ha: Gr, hd: Gr) -> Result<Grading, String> {
    let det = ha[1] * hd[2] - ha[2] * hd[1];
    ensure(det.abs() == 4, || {
        format!("the periods' (p, q) parts have determinant {det}/4, not ±1: the pairing is not a knot in a homology sphere, so (Maslov, Alexander) cannot be read")
    })?;
    let (m, n) = ((g[2] * hd[1] - g[1] * hd[2]) / det, (ha[2] * g[1] - ha[1] * g[2]) / det);
    // Bounded so that no product below leaves i128 (entries of h^m stay under 2^62).
    let small = m.abs() <= 1 << 31 && n.abs() <= 1 << 31;
    ensure(small, || "the double coset needs a power of a period beyond 2^31".into())?;
    let r = gr_mul(gr_mul(gr_pow(ha, m), g), gr_pow(hd, n));
    let integral = r[1] == 0 && r[2] == 0 && r[0] % 2 == 0 && r[3] % 2 == 0;
    ensure(integral, || format!("the grading {g:?} (doubled) does not reduce to integral (Maslov, Alexander)"))?;
    written([r[0] / 2, r[3] / 2, 0, 0]).map(|g| g[..2].to_vec())
}

/// A grading element as written, within the bounds every grading obeys.
fn written(g: Gr) -> Result<Grading, String> {
    g.iter()
        .map(|&x| i64::try_from(x).ok().filter(|&x| grading_in_bounds(x)))
        .collect::<Option<Grading>>()
        .ok_or_else(|| format!("a grading {g:?} (doubled) is beyond ±2^31"))
}

/// The generators (name, idempotent, grading) and period of the structure or module `what`.
fn read_generators<'a>(
    what: &str,
    gens: impl Iterator<Item = (&'a String, u8, Option<&'a Grading>)>,
    period: &Option<Grading>,
    group: bool,
) -> Result<Object, String> {
    if let Some(p) = period {
        ensure(group, || format!("{what}: `period` is a version-3 member"))?;
        grading_ok(p, true, &format!("{what}, period"))?;
    }
    let mut o = Object { group, period: gr_of(period.as_ref()), ..Default::default() };
    for (g, idem, grading) in gens {
        let what = format!("{what}, generator \"{g}\"");
        tubecert_format::names::check_name(g).map_err(|e| format!("{what}: {e}"))?;
        ensure(idem <= 1, || format!("{what}: idempotent {idem} is not 0 or 1"))?;
        grading.map_or(Ok(()), |gr| grading_ok(gr, group, &what))?;
        o.index.insert(g.clone(), o.names.len() as u32);
        o.names.push(g.clone());
        o.idem.push(idem);
        o.grading.push(grading.cloned());
    }
    o.out = vec![vec![]; o.names.len()];
    Ok(o)
}

/// Generators of a type D structure and its δ¹.
pub fn read_structure(name: &str, spec: &TypeDSpec, group: bool) -> Result<Object, String> {
    let what = format!("type D structure {name}");
    let gens = spec.generators.iter().map(|(g, d)| (g, d.idempotent, d.grading.as_ref()));
    let mut d = read_generators(&what, gens, &spec.period, group)?;
    (d.delta, d.defects) = read_arrows(&format!("{what}, δ¹"), &d, &d, &spec.differential)?;
    Ok(d)
}

/// Terms [y, a, y′] from `src` to `dst`: unknown names and elements are errors, the first
/// idempotent mismatch a defect (the claim fails).
pub fn read_arrows(what: &str, src: &Object, dst: &Object, terms: &[Term]) -> Result<(Arrows, Vec<String>), String> {
    let (mut rows, mut defects) = (vec![Vec::new(); src.names.len()], Vec::new());
    for (k, [y, a, z]) in terms.iter().enumerate() {
        let at = |e: String| format!("{what}, term {} [{y}, {a}, {z}]: {e}", k + 1);
        let find = |d: &Object, n: &str| {
            d.index.get(n).copied().ok_or_else(|| at(format!("generator \"{n}\" is not declared")))
        };
        let (i, j, a) = (find(src, y)?, find(dst, z)?, Alg::parse(a).map_err(at)?);
        let (i0, j0) = (src.idem[i as usize], dst.idem[j as usize]);
        // ι_i as an element starts and ends in i.
        let matched = a.idempotents().unwrap_or((i0, i0)) == (i0, j0);
        defects.extend((!matched && defects.is_empty()).then(|| at("the idempotents do not match".into())));
        rows[i as usize].push((a, j));
    }
    for (r, y) in rows.iter_mut().zip(&src.names) {
        r.sort_unstable();
        let once = r.windows(2).all(|w| w[0] != w[1]);
        ensure(once, || format!("{what}: generator \"{y}\" has a repeated term (list each term once)"))?;
    }
    Ok((rows, defects))
}

/// Generators of a type A module and its families of operations.
pub fn read_module(name: &str, spec: &TypeASpec, group: bool) -> Result<Object, String> {
    let what = format!("type A module {name}");
    let gens = spec.generators.iter().map(|(g, a)| (g, a.idempotent, Some(&a.grading)));
    let (mut m, mut seen) = (read_generators(&what, gens, &spec.period, group)?, BTreeSet::new());
    for (k, f) in spec.operations.iter().enumerate() {
        let at = |e: &str| format!("{what}, operation {}: {e}", k + 1);
        ensure(seen.insert(f), || at("it is listed twice"))?;
        let inputs = f.prefix.iter().chain(&f.repeat).chain(&f.suffix).map(|a| Alg::parse(a).map_err(|e| at(&e)));
        let pattern: Vec<Alg> = inputs.collect::<Result<_, _>>()?;
        let powers = (!f.repeat.is_empty() || f.power[0] == 0) && f.power.iter().all(|&p| p <= MAX_EXPONENT);
        ensure(pattern.len() <= 60 && !pattern.contains(&Alg::One) && powers, || {
            at("at most 60 inputs written, Reeb elements (strict unitality covers the idempotents); power [a, b] within 2^20, a = 0 without a repeated block")
        })?;
        let find = |n: &str| m.index.get(n).copied().ok_or_else(|| at(&format!("generator \"{n}\" is not declared")));
        let (from, to) = (find(&f.from)?, find(&f.to)?);
        let mut holds = BTreeMap::new();
        pattern.iter().enumerate().for_each(|(k, &a)| *holds.entry(a).or_insert(0) |= 1 << k);
        let fam = Family { from, pattern, prefix: f.prefix.len(), repeat: f.repeat.len(), power: f.power, to, holds };
        // Idempotents along the word for n = 0, 1, 2 cover every junction.
        for n in 0..if fam.repeat > 0 { 3 } else { 1 } {
            let mut i = m.idem[from as usize];
            for a in fam.word(n) {
                let (l, r) = a.idempotents().expect("Reeb");
                m.defects.extend((l != i).then(|| at(&format!("{} does not start in ι{i}", a.name()))));
                i = r;
            }
            m.defects.extend((i != m.idem[to as usize]).then(|| at(&format!("the output {} is not in ι{i}", f.to))));
        }
        // Version 3: m(x, a_1, …, a_k) ∋ U^n·y needs gr(x)·gr(a_1)⋯gr(a_k)·λ^(k−1)·gr(U)^(−n)·gr(y)^(−1)
        // ∈ P_A; along a family this element is affine in the repeat count, so n = 0 and 1 cover all.
        for n in (0..if fam.repeat > 0 { 2 } else { 1 }).filter(|_| group) {
            let w = fam.word(n);
            let g = w.iter().fold(gr_of(m.grading[from as usize].as_ref()), |g, &a| gr_mul(g, gr_alg(a)));
            let u = (f.power[0] as usize * n) as i128 + f.power[1] as i128;
            let g = gr_mul(gr_mul(g, gr_pow(LAMBDA, w.len() as i128 - 1)), gr_pow(GR_U, -u));
            let e = gr_mul(g, gr_pow(gr_of(m.grading[to as usize].as_ref()), -1));
            if !in_period(e, m.period) {
                m.defects.push(at(&format!("it is not homogeneous (repeated block {n} times): gr(input)·λ^(k−1)·gr(U)^(−n)·gr(output)⁻¹ = {e:?} (doubled) is not a power of the period")));
            }
        }
        m.defects.truncate(1);
        m.out[from as usize].push(m.families.len());
        m.families.push(fam);
    }
    Ok(m)
}

impl Family {
    fn word(&self, n: usize) -> Vec<Alg> {
        let (prefix, rest) = self.pattern.split_at(self.prefix);
        let (repeat, suffix) = rest.split_at(self.repeat);
        [prefix, &repeat.repeat(n), suffix].concat()
    }

    /// A set of pattern positions closed under the junction: after the prefix and after each
    /// repeated block one may repeat or go on, so those two positions are one state.
    fn close(&self, mask: u64) -> u64 {
        let junction = 1 << self.prefix | 1 << (self.prefix + self.repeat);
        mask | if mask & junction != 0 { junction } else { 0 }
    }

    /// The positions after reading `a` from `mask` (0: the word read is no prefix of the family).
    fn step(&self, mask: u64, a: Alg) -> u64 {
        self.close((mask & self.holds.get(&a).unwrap_or(&0)) << 1)
    }

    /// The positions before `a` from which `a` leads into `mask` (reading backward).
    fn back(&self, mask: u64, a: Alg) -> u64 {
        self.close(mask >> 1 & self.holds.get(&a).unwrap_or(&0))
    }

    /// The positions from which the empty rest completes a word.
    fn end(&self) -> u64 {
        self.close(1 << self.pattern.len())
    }

    /// U-power of the output on the family's word of length `len`.
    fn power_at(&self, len: usize) -> u64 {
        let n = (len + self.repeat - self.pattern.len()).checked_div(self.repeat).unwrap_or(0);
        self.power[0] as u64 * n as u64 + self.power[1] as u64
    }

    /// The number of the family's words of length ≤ `room`.
    fn fitting(&self, room: usize) -> usize {
        let fixed = self.pattern.len() - self.repeat;
        room.checked_sub(fixed).map_or(0, |r| r.checked_div(self.repeat).map_or(1, |k| k + 1))
    }
}

impl<'a> Objects<'a> {
    /// `version` ≥ 3: gradings are elements of the grading group.
    pub fn load(b: &'a Bordered, items: u64, version: u32, claims: &[Claim]) -> Result<Objects<'a>, Vec<String>> {
        let group = version >= 3;
        if b.full_ring != full_ring() {
            return Err(vec!["bordered: full_ring must be F2[U,V] with (gr_U, gr_V), deg U = (−2, 0), deg V = (0, −2), deg ∂ = (−1, −1)".into()]);
        }
        let full = crate::load::load(&b.full_ring, &b.full_complexes, &b.full_maps)?;
        let one = |e: String| vec![e];
        let structures = b.type_d_structures.iter().map(|(n, s)| Ok((n.clone(), read_structure(n, s, group)?)));
        let structures: BTreeMap<_, _> = structures.collect::<Result<_, String>>().map_err(one)?;
        let modules = b.type_a_modules.iter().map(|(n, s)| Ok((n.clone(), read_module(n, s, group)?)));
        let modules = modules.collect::<Result<_, String>>().map_err(one)?;
        let morphism = |(n, f): (&String, &MorphismSpec)| {
            let what = format!("type D morphism {n}");
            let side = |s| structures.get(s).ok_or_else(|| format!("{what}: type D structure \"{s}\" is not declared"));
            Ok((n.clone(), read_arrows(&what, side(&f.from)?, side(&f.to)?, &f.terms)?))
        };
        let morphisms = b.type_d_morphisms.iter().map(morphism).collect::<Result<_, String>>().map_err(one)?;
        // What the pairings rest on: the D relations, ∂f = 0 and A∞ relations up to a length.
        let mut claimed = BTreeMap::new();
        for c in claims {
            let (name, length) = match c {
                Claim::TypeAModule { module, max_length, .. } => (module, *max_length),
                Claim::TypeDStructure { structure: n, .. } | Claim::TypeDMorphism { morphism: n, .. } => (n, 0),
                _ => continue,
            };
            claimed.entry((c.kind(), name.clone())).and_modify(|l: &mut u32| *l = length.max(*l)).or_insert(length);
        }
        let budget = Budget(Cell::new(items.saturating_mul(WORK_PER_ITEM)), Cell::new(0), Cell::new(WORK_FLOOR));
        Ok(Objects { spec: b, full, structures, modules, morphisms, budget, claimed })
    }
}

/// (μ ⊗ id)(id ⊗ δ¹)δ¹ = 0, and (version 3) every term homogeneous.
fn check_structure(o: &Budget, d: &Object) -> Result<(), Failure> {
    none_of(&d.defects)?;
    vanishes(o, "(μ ⊗ id)(id ⊗ δ¹)δ¹", d, &d.names, &[(&d.delta, &d.delta)])?;
    // a ⊗ y′ in δ¹(y) has grading λ^(−1)·gr(y) modulo P_D: gr(y)^(−1)·λ·gr(a)·gr(y′) ∈ P_D.
    for (y, row) in d.delta.iter().enumerate().filter(|_| d.group) {
        for &(a, y2) in row {
            let (g, g2) = (d.grading[y].as_ref(), d.grading[y2 as usize].as_ref());
            let e = gr_mul(gr_pow(after(a, gr_of(g)), -1), gr_of(g2));
            let homogeneous = g.is_none() || g2.is_none() || in_period(e, d.period);
            ensure(homogeneous, || {
                format!("the term {}⊗{} of δ¹({}) is not homogeneous: gr({0})⁻¹·λ·gr(ρ)·gr({1}) = {e:?} (doubled) is not a power of the period", a.name(), d.names[y2 as usize], d.names[y])
            })?;
        }
    }
    Ok(())
}

/// For each generator y of `d`: Σ over the pairs (first, second) of the
/// composites y →a y′ →b y″ (first step in `first`, second in `second`) of (a·b) ⊗ y″ is 0
/// (`names`: those of the y″). The D relation, and ∂f = 0 for a morphism. The composites are
/// counted before they are visited: k arrows into a generator and k out of it make k².
fn vanishes(o: &Budget, what: &str, d: &Object, names: &[String], pairs: &[(&Arrows, &Arrows)]) -> Result<(), Failure> {
    let visits = |(first, second): &(&Arrows, &Arrows)| {
        first.iter().flatten().map(|&(_, y1)| 1 + second[y1 as usize].len() as u64).sum::<u64>()
    };
    o.spend(d.names.len() as u64 + pairs.iter().map(visits).sum::<u64>(), what)?;
    for y in 0..d.names.len() {
        let mut acc = Vec::new();
        for (first, second) in pairs {
            for &(a, y1) in &first[y] {
                acc.extend(second[y1 as usize].iter().filter_map(|&(b, y2)| a.times(b).map(|c| (c, y2))));
            }
        }
        normalize(&mut acc);
        if !acc.is_empty() {
            // The first terms (a message per claim, and a file may hold many claims).
            let mut terms: Vec<String> =
                acc.iter().take(12).map(|(a, z)| format!("{}⊗{}", a.name(), names[*z as usize])).collect();
            terms.extend((acc.len() > 12).then(|| format!("… ({} terms)", acc.len())));
            return Err(format!("{what}({}) = {} ≠ 0", d.names[y], terms.join(" + ")).into());
        }
    }
    Ok(())
}

/// The A∞ relations on every word of length ≤ L on which a term can be non-zero.
pub fn check_module(o: &Budget, m: &Object, max_len: u32) -> Result<(), Failure> {
    // Idempotents and (version 3) homogeneity were checked once, when M was read.
    none_of(&m.defects)?;
    o.spend(m.families.len() as u64, "A∞ relations")?;
    // Which words can carry a non-zero relation. A term m(m(x, s₁), s₂) is non-zero only if
    // s₁ is the word of an operation from x to some y (the empty word: an m_1 term) and s₂ the
    // word of an operation from y; a term m(x, …, a_j·a_{j+1}, …) only if the merged word is
    // the word of an operation from x. So the relation at (x, s) is zero term by term unless
    // s = uv with u a word of a family from x to y and v one of a family from y, or s is the
    // word of a family from x with one input split as a product of two Reeb elements (the only
    // splits: ρ12 = ρ1ρ2, ρ23 = ρ2ρ3, ρ123 = ρ1ρ23 = ρ12ρ3). Exactly these words of length ≤ L
    // are checked, each with its work spent before it is written (a huge L is refused by the
    // budget, not attempted), so the work is (number of such words) × length × families.
    let l = max_len as usize;
    for f in &m.families {
        for n1 in 0..f.fitting(l) {
            let after = &m.out[f.to as usize];
            o.spend((f.pattern.len() + n1 * f.repeat + 1 + after.len()) as u64, "A∞ relations")?;
            let u = f.word(n1);
            for g in after.iter().map(|&g| &m.families[g]) {
                for n2 in 0..g.fitting(l - u.len()) {
                    relation(o, m, f.from, &[u.clone(), g.word(n2)].concat())?;
                }
            }
            for j in (0..u.len()).filter(|_| u.len() < l) {
                let Alg::Reeb(lo, hi) = u[j] else { continue };
                for cut in lo..hi {
                    let split = [Alg::Reeb(lo, cut), Alg::Reeb(cut + 1, hi)];
                    relation(o, m, f.from, &[&u[..j], &split, &u[j + 1..]].concat())?;
                }
            }
        }
    }
    Ok(())
}

/// The A∞ relation at (x, s): Σ_{s = s₁s₂} m(m(x, s₁), s₂) + Σ_j m(x, s₁…(s_j·s_{j+1})…s_k) = 0,
/// in time linear in |s|: for every family the positions from which each suffix of s completes
/// its word (read backward), and for each family from x the positions reached by each prefix,
/// so that s₁, s₂ and each merged word are recognized by one mask test.
fn relation(o: &Budget, m: &Object, x: u32, s: &[Alg]) -> Result<(), Failure> {
    let (k, work) = (s.len(), s.len() as u64 + 1);
    o.spend(work * 2, "A∞ relations")?;
    // back[g][i]: the positions of family g from which s[i..] completes its word (computed,
    // and its work spent, when first needed: for the families from x and from the outputs of
    // its prefixes).
    let mut back: BTreeMap<usize, Vec<u64>> = BTreeMap::new();
    let mut suffix = |g: usize, i: usize| -> Result<u64, Failure> {
        if let std::collections::btree_map::Entry::Vacant(e) = back.entry(g) {
            o.spend(work, "A∞ relations")?;
            let (f, mut b) = (&m.families[g], vec![m.families[g].end(); k + 1]);
            (0..k).rev().for_each(|j| b[j] = f.back(b[j + 1], s[j]));
            e.insert(b);
        }
        Ok(back[&g][i])
    };
    let merges: Vec<(usize, Alg)> = (1..k).filter_map(|j| s[j - 1].times(s[j]).map(|ab| (j - 1, ab))).collect();
    let mut acc: Vec<(u32, u64)> = Vec::new();
    for &fi in &m.out[x as usize] {
        let f = &m.families[fi];
        // fwd[i]: the positions of f reached by s[..i].
        o.spend(work, "A∞ relations")?;
        let mut fwd = vec![f.close(1)];
        s.iter().for_each(|&a| fwd.push(f.step(fwd[fwd.len() - 1], a)));
        // A word read to the end: s[..i] is one of f's, with output U^e.
        for (i, _) in fwd.iter().enumerate().filter(|(_, &mk)| mk & f.end() != 0) {
            let e = f.power_at(i);
            o.spend(m.out[f.to as usize].len() as u64, "A∞ relations")?;
            for &gi in &m.out[f.to as usize] {
                acc.extend((suffix(gi, i)? & 1 != 0).then(|| (m.families[gi].to, e + m.families[gi].power_at(k - i))));
            }
        }
        for &(j, ab) in &merges {
            acc.extend((f.step(fwd[j], ab) & suffix(fi, j + 2)? != 0).then(|| (f.to, f.power_at(k - 1))));
        }
    }
    normalize(&mut acc);
    if let Some(&(z, e)) = acc.first() {
        let mut word: Vec<String> = s.iter().take(40).map(|a| a.name().to_string()).collect();
        word.extend((k > 40).then(|| format!("… ({k} inputs)")));
        let (x, z) = (&m.names[x as usize], &m.names[z as usize]);
        return Err(format!("the A∞ relation fails on ({x}, {}): the term U^{e}·{z} survives", word.join(", ")).into());
    }
    Ok(())
}

/// A step of a δ-path: (coefficient, next node, whether the path may end after it).
type Step = (Alg, u32, bool);

/// Which side of a pairing is bounded (LOT §2.4: M ⊠ N is defined, and agrees with the
/// derived tensor product, only when one side is): "structure" when the δ-graph on nodes
/// 0..n (`steps`, ι-steps included) has no directed cycle (checked by peeling off nodes with
/// nothing left pointing into them), else "module" when every family of M is a single
/// operation; else the pairing is refused. Either way every walk below is finite.
fn bounded(o: &Budget, m: &Object, edges: &[Vec<Step>]) -> Result<&'static str, Failure> {
    let n = edges.len() as u32;
    o.spend(n as u64 + edges.iter().map(|e| e.len() as u64).sum::<u64>(), "box tensor")?;
    let mut into = vec![0u32; n as usize];
    edges.iter().flatten().for_each(|s| into[s.1 as usize] += 1);
    let mut ready: Vec<u32> = (0..n).filter(|&y| into[y as usize] == 0).collect();
    while let Some(y) = ready.pop() {
        for s in &edges[y as usize] {
            into[s.1 as usize] -= 1;
            ready.extend((into[s.1 as usize] == 0).then_some(s.1));
        }
    }
    // Every node peeled (no arrow left pointing into one) exactly when there is no cycle.
    match (into.iter().all(|&c| c == 0), m.families.iter().all(|f| f.repeat == 0)) {
        (true, _) => Ok("structure"),
        (_, true) => Ok("module"),
        _ => Err(Failure::Refused("neither side is bounded: the type D structure's δ¹ has a directed cycle and the module has operations of every length (a repeated block); the box tensor product is defined only when one side is bounded (LOT §2.4) — pair with a bounded model".into())),
    }
}

/// A generator x⊗y of a box tensor product: x, y, its name and grading.
pub type Generator = (u32, u32, String, Grading);

/// Generators x⊗y of M ⊠ N (idempotents equal) with their gradings: version 3 (Maslov,
/// Alexander) read from gr(x)·gr(y) in P_A\G/P_D (`read_grading`), version 2 gr(x) + gr(y);
/// `symmetric` (version 4): then normalized by `symmetrize`.
pub fn generators(m: &Object, n: &Object, symmetric: bool) -> Result<Vec<Generator>, Failure> {
    // N's generators by idempotent: pairs of unequal idempotents are not visited (uncounted).
    let (mut out, mut side) = (Vec::new(), [vec![], vec![]]);
    n.names.iter().enumerate().for_each(|(y, yn)| side[n.idem[y] as usize].push((y, yn)));
    for (x, xn) in m.names.iter().enumerate() {
        for &(y, yn) in &side[m.idem[x] as usize] {
            let (Some(gx), Some(gy)) = (&m.grading[x], &n.grading[y]) else {
                return Err(format!("generator {yn} has no grading, so {xn}⊗{yn} has none").into());
            };
            let gr = match m.group && n.group {
                true => read_grading(gr_mul(gr_of(Some(gx)), gr_of(Some(gy))), m.period, n.period)
                    .map_err(|e| format!("{xn}⊗{yn}: {e}"))?,
                false => crate::load::grading_sum(gx, gy),
            };
            out.push((x as u32, y as u32, format!("{xn}⊗{yn}"), gr));
        }
    }
    // Names may contain ⊗: (a⊗b, c) and (a, b⊗c) would both be a⊗b⊗c, and a complex could
    // then carry a generator the product lacks, compared with nothing.
    let mut seen = BTreeSet::new();
    if let Some(g) = out.iter().find(|g| !seen.insert(&g.2)) {
        let twice = format!("two generators of the box tensor product are both named {}", g.2);
        return Err(Failure::Refused(format!("{twice}: rename a generator whose name contains ⊗")));
    }
    if symmetric && m.group && n.group {
        symmetrize(&mut out)?;
    }
    Ok(out)
}

/// The absolute normalization of a knot's complex in S³ read from a pairing: χ = Σ(−1)^M t^A
/// over the generators is χ(HFK-hat) = Δ_K, symmetric under t ↔ t⁻¹ (Ozsváth–Szabó 2004,
/// "Holomorphic disks and knot invariants"); the one integer s making it so shifts every
/// (M, A) by s·(2, 1) = the grading of U^(−s), which keeps the line M = 2A of the U-tower.
fn symmetrize(gens: &mut [Generator]) -> Result<(), String> {
    let mut chi: BTreeMap<i64, i64> = BTreeMap::new();
    gens.iter().for_each(|g| *chi.entry(g.3[1]).or_default() += 1 - 2 * g.3[0].rem_euclid(2)); // (−1)^M
    chi.retain(|_, c| *c != 0);
    let (Some((&lo, _)), Some((&hi, _))) = (chi.first_key_value(), chi.last_key_value()) else {
        return Err("the graded Euler characteristic Σ(−1)^M t^A of the box tensor product is 0: no shift makes it symmetric, so no absolute grading is read".into());
    };
    let symmetric = (lo + hi) % 2 == 0 && chi.iter().all(|(a, c)| chi.get(&(lo + hi - a)) == Some(c));
    ensure(symmetric, || {
        format!("no shift of A makes the graded Euler characteristic Σ(−1)^M t^A of the box tensor product symmetric under t ↔ t⁻¹ (exponents {lo} to {hi}): it is not a knot's")
    })?;
    let s = -(lo + hi) / 2;
    for g in gens.iter_mut() {
        g.3 = written([(g.3[0] + 2 * s) as i128, (g.3[1] + s) as i128, 0, 0])?[..2].to_vec();
    }
    Ok(())
}

/// A complex or map of the certificate (its rows `actual`, from the complex `from` of `ctx` to
/// `to`) against the recomputed generators and terms.
fn compare(
    ctx: &Context,
    what: &str,
    (from, to): (usize, usize),
    gens: &[Generator],
    rows: &Rows,
    actual: &[Vector],
) -> Result<(), String> {
    let ((c, cn), d) = ((&ctx.complexes[from], &ctx.complexes[from].name), &ctx.complexes[to]);
    // Each claim reads the rows it compares (a failed row in full, for its message).
    let rows_read = actual.iter().map(|r| 1 + r.len() as u64).sum();
    ctx.work.spend(rows_read, &format!("comparing {cn} with a box tensor product"))?;
    // The names of `gens` are distinct (`generators`), so this is a bijection.
    let same = c.names.len() == gens.len() && gens.iter().all(|g| c.index.get(&g.2).is_some());
    ensure(same, || {
        format!("{what}: {cn} does not have exactly the generators x⊗y of the box tensor product (each spelled once)")
    })?;
    for ((_, _, name, gr), row) in gens.iter().zip(rows) {
        let i = c.index.get(name).expect("checked") as usize;
        let found = &c.gradings[i];
        ensure(found == gr, || format!("{what}: {name} has grading {found:?}, the box tensor product gives {gr:?}"))?;
        let mut want = Vec::new();
        for (t, p) in row {
            let j = d.index.get(t).ok_or_else(|| format!("{what}: {t} is not a generator of {}", d.name))?;
            want.push((j, Mono([*p, 0])));
        }
        normalize(&mut want);
        crate::report_terms::compare(ctx, to, name, "the certificate", &actual[i], "the box tensor product", &want)
            .map_err(|e| format!("{what}: {e}"))?;
    }
    Ok(())
}

/// The generators of M ⊠ N, the bounded side, and for each generator its terms: for `f` = None,
/// of ∂(x⊗y) = Σ_k (m_{k+1} ⊗ id)(x ⊗ δ^k(y)) over paths of δ¹-steps in N; for `f` =
/// Some((f, N′)), of (id_M ⊠ f)(x⊗y) in M ⊠ N′, over paths of δ¹-steps in N, one f-step,
/// δ¹-steps in N′. `most`: the size (rows and terms) of what it is compared with: beyond, it
/// differs, and is refused before its names (hundreds of bytes each) fill memory.
pub fn tensor_map(
    o: &Budget,
    m: &Object,
    n: &Object,
    f: Option<(&Morphism, &Object)>,
    symmetric: bool,
    most: u64,
) -> Result<(Vec<Generator>, Rows, &'static str), Failure> {
    let more = f.into_iter().flat_map(|(f, n2)| [&n2.defects, &f.1]);
    [&m.defects, &n.defects].into_iter().chain(more).try_for_each(|d| none_of(d))?;
    // The |M|·|N| pairs made from |M| + |N| written generators, counted each at 1/64 of an
    // item's allowance before they are made (a named pair is a few hundred bytes; a true
    // product lists every pair in its complex, so it has far fewer pairs than written items · 64).
    let count = |idem: &[u8], i: u8| idem.iter().filter(|&&j| j == i).count() as u64;
    let pairs: u64 = (0..2).map(|i| count(&m.idem, i) * count(&n.idem, i)).sum();
    let read = (m.names.len() + n.names.len()) as u64; // read to pair them, even if none pair
    o.spend(pairs.saturating_mul(WORK_PER_ITEM / 64).saturating_add(read), "box tensor generators")?;
    let (mut kept, beyond) = (pairs, || format!("M ⊠ N has more generators and terms than the {most} written"));
    ensure(kept <= most, beyond)?;
    let gens = generators(m, n, symmetric)?;
    // The δ-graph: nodes 0..|N| are N's generators, |N|.. those of N′ (after the one f step);
    // a step (a, node′, whether the path may end after it).
    let k = n.names.len() as u32;
    let shift = |arrows: &Arrows, by: u32, end: bool| -> Vec<Vec<Step>> {
        arrows.iter().map(|r| r.iter().map(|&(a, z)| (a, z + by, end)).collect()).collect()
    };
    let mut edges = shift(&n.delta, 0, f.is_none());
    let mut names = n.names.clone();
    if let Some((f, n2)) = f {
        edges.iter_mut().zip(shift(&f.0, k, true)).for_each(|(e, t)| e.extend(t));
        edges.extend(shift(&n2.delta, k, true));
        names.extend_from_slice(&n2.names);
    }
    let side = bounded(o, m, &edges)?;
    // For each x⊗y, Σ_k m_{k+1}(x, a_1, …, a_k) ⊗ node over the paths from y (the empty one
    // too for ∂: m_1 ⊗ id). A path is followed only while its word is a prefix of a family's
    // word. Finite because `bounded` held: no cycle of nodes, or every family's word has a
    // fixed length; the budget bounds it all the same.
    let (mut rows, empty) = (Vec::new(), f.is_none());
    for &(x, start, _, _) in &gens {
        // An idempotent step is a whole path of length one: m_2(x, ι) = x (strict unitality).
        let ends = edges[start as usize].iter().filter(|s| s.0 == Alg::One && s.2);
        let mut out: Vec<(u32, u32, u32)> = ends.map(|s| (x, s.1, 0)).collect();
        for f in m.out[x as usize].iter().map(|&i| &m.families[i]) {
            // Depth-first over (node, positions in the word, path length, whether it may end
            // here); the work of entering a node (its steps) is spent before it is done. An
            // idempotent step leads nowhere: no family's word holds ι.
            let mut todo = vec![(start, f.close(1), 0, empty)];
            while let Some((y, mask, len, can_end)) = todo.pop() {
                let next = &edges[y as usize];
                o.spend(1 + (f.pattern.len() + next.len()) as u64, "box tensor")?;
                if can_end && mask & f.end() != 0 {
                    // A term is kept until the sums mod 2 and then named: counted like a pair.
                    o.spend(WORK_PER_ITEM / 64, "box tensor terms")?;
                    o.1.set(o.1.get().max(len));
                    let p = u32::try_from(f.power_at(len)).ok().filter(|&p| p <= MAX_EXPONENT).ok_or_else(|| {
                        Failure::Refused("a term of the box tensor product has a U-power beyond 2^20".into())
                    })?;
                    out.push((f.to, y, p));
                }
                let steps = next.iter().map(|&(a, y2, end)| (y2, f.step(mask, a), len + 1, end));
                todo.extend(steps.filter(|s| s.1 != 0));
            }
        }
        // Sums mod 2: a term reached by an even number of paths cancels (before it is named).
        normalize(&mut out);
        kept += out.len() as u64;
        ensure(kept <= most, beyond)?;
        rows.push(out.iter().map(|&(x, y, p)| (format!("{}⊗{}", m.names[x as usize], names[y as usize]), p)).collect());
    }
    Ok((gens, rows, side))
}

/// The type D structure of LOT Thm 11.26 for a complex C over `F2[U,V]` in a simultaneously
/// simplified basis and framing t, τ = A(ξ_0), and whether it was made bounded. `group`
/// (version 3): ξ with C-grading (M, A) = (gr_U, (gr_U − gr_V)/2) gets (M − 3A/2; 0, −A; 0),
/// each chain of ι_1 generators the gradings its arrows force from the ξ it starts at, and the
/// period is the grading (t/2 + ½; 1, t; 0) of the periodic domain (derived in DEVELOPERS.md,
/// "Gradings"). With `bounded`, where ξ_0 = η_0 and t ≥ 2τ (the only case with a cycle) the
/// arrow ξ_0 →ρ12 ξ_0 (t = 2τ) or ξ_0 →ρ123 γ1 (t > 2τ) is split through a new cancelling pair
/// x →1 y: ξ_0 →ρ1 y, x →ρ2 ξ_0 (or x →ρ23 γ1). Cancelling x →1 y gives the arrow back
/// (ρ1ρ2 = ρ12, ρ1ρ23 = ρ123), so the two are homotopy equivalent (the cancellation lemma,
/// LOT §2); the D relation holds since ρ2ρ1 = ρ23ρ23 = ρ23ρ2 = 0, and the new graph has no
/// cycle. Gradings: gr(y) = gr(ρ1)⁻¹·λ⁻¹·gr(ξ_0), gr(x) = λ·gr(y), which leaves γ1's as it was.
pub fn complement(c: &Complex, t: i64, group: bool, bounded: bool) -> Result<(TypeDSpec, i64, bool), String> {
    let refuse = |why: String| {
        format!("complex {}: {why}; LOT Thm 11.26 needs a basis that is simultaneously horizontally and vertically simplified (the general form, LOT Thm A.11, is not implemented)", c.name)
    };
    let n = c.names.len();
    // Arrows (kind, a, b, ℓ) of kind 0 (horizontal: U^ℓ, chains lambda…) and 1 (vertical:
    // V^ℓ, chains kappa…).
    let mut arrows = Vec::new();
    for (a, row) in c.d.rows.iter().enumerate() {
        for &(b, m) in row {
            let ([u, v], b) = (m.0, b as usize);
            let (an, bn) = (&c.names[a], &c.names[b]);
            ensure(u + v > 0, || refuse(format!("∂{an} has the term {bn} with coefficient 1 (not reduced)")))?;
            // A diagonal term U^i·V^j (i, j ≥ 1) vanishes in both C/(U) and C/(V), whose
            // arrows are all LOT Thm 11.26 reads: it does not enter the structure.
            arrows.extend((u == 0 || v == 0).then_some(((u == 0) as usize, a, b, u.max(v))));
        }
    }
    // The one generator with no arrow of a kind (η_0: horizontal, ξ_0: vertical); none has two.
    let lone = |kind: usize| -> Result<usize, String> {
        let (mut count, what) = (vec![0; n], ["horizontal", "vertical"][kind]);
        arrows.iter().filter(|r| r.0 == kind).flat_map(|r| [r.1, r.2]).for_each(|x| count[x] += 1);
        if let Some(x) = (0..n).find(|&x| count[x] > 1) {
            return Err(refuse(format!("{} has {} {what} arrows", c.names[x], count[x])));
        }
        let free: Vec<usize> = (0..n).filter(|&x| count[x] == 0).collect();
        ensure(free.len() == 1, || refuse(format!("{} generators have no {what} arrow, not one", free.len())))?;
        Ok(free[0])
    };
    let (eta0, xi0) = (lone(0)?, lone(1)?);
    let alexander = |x: usize| {
        let d = c.gradings[x][0] - c.gradings[x][1];
        (d % 2 == 0).then_some(d / 2).ok_or_else(|| format!("{}: gr_U − gr_V is odd", c.names[x]))
    };
    let (tau, eta_a, xn, en) = (alexander(xi0)?, alexander(eta0)?, &c.names[xi0], &c.names[eta0]);
    ensure(eta_a == -tau, || {
        format!("complex {}: A(ξ_0 = {xn}) = {tau} but A(η_0 = {en}) = {eta_a}, not −{tau}: not the complex of a knot in S^3", c.name)
    })?;
    let (mut gens, mut terms, mut gr0) = (BTreeMap::new(), Vec::new(), Vec::new());
    for x in 0..n {
        let (m, a) = (c.gradings[x][0], alexander(x)?);
        gr0.push([2 * m as i128 - 3 * a as i128, 0, -2 * a as i128, 0]);
        let grading = if group { written(gr0[x])? } else { vec![m, a] };
        gens.insert(c.names[x].clone(), DGenerator { grading: Some(grading), idempotent: 0 });
    }
    // A chain of ι_1 generators from a generator of C: each step (ρ, name, forward) writes the
    // term [previous, ρ, name] (forward) or [name, ρ, previous] and gives `name` the grading
    // that term forces, gr(ρ)⁻¹·λ⁻¹·gr(previous) or λ·gr(ρ)·gr(previous); the last step lands
    // on a generator of C.
    let mut walk = |from: usize, steps: Vec<(Alg, String, bool)>| -> Result<(), String> {
        let (mut previous, mut g, last) = (c.names[from].clone(), gr0[from], steps.len() - 1);
        for (k, (rho, name, forward)) in steps.into_iter().enumerate() {
            let (hi, lo) = if forward { (previous, name.clone()) } else { (name.clone(), previous) };
            terms.push([hi, rho.name().into(), lo]);
            g = if forward { after(rho, g) } else { gr_mul(gr_mul(LAMBDA, gr_alg(rho)), g) };
            if k < last {
                let grading = if group { Some(written(g)?) } else { None };
                let new = gens.insert(name.clone(), DGenerator { grading, idempotent: 1 }).is_none();
                ensure(new, || {
                    format!("complex {}: the name {name} is made twice (C's generators and the complement's chains kappa…, lambda…, gamma…, pair.x, pair.y share one namespace); rename a generator", c.name)
                })?;
            }
            previous = name;
        }
        Ok(())
    };
    // The steps from →first c_1, then ρ23 between c_k and c_{k+1} (c_{k+1} → c_k when `down`),
    // then last between c_ℓ and `to` (to → c_ℓ when `down`; from → to when ℓ = 0).
    let r23 = Alg::Reeb(2, 3);
    let chain = |first: Alg, names: Vec<String>, down: bool, last: Alg, to: &String| {
        let inner = names.into_iter().enumerate().map(|(k, n)| (if k == 0 { first } else { r23 }, n, k == 0 || !down));
        inner.chain([(last, to.clone(), !down)]).collect::<Vec<_>>()
    };
    // Each horizontal arrow a → U^ℓ·b: a →ρ3 λ1 →ρ23 … λℓ →ρ2 b; each vertical one a → V^ℓ·b:
    // a →ρ1 κ1, κ_{k+1} →ρ23 κ_k, b →ρ123 κℓ.
    for &(kind, a, b, l) in &arrows {
        let (an, bn) = (&c.names[a], &c.names[b]);
        let names = (1..=l).map(|k| format!("{}{k}.{an}.{bn}", ["lambda", "kappa"][kind])).collect();
        let (first, last) = [(Alg::Reeb(3, 3), Alg::Reeb(2, 2)), (Alg::Reeb(1, 1), Alg::Reeb(1, 3))][kind];
        walk(a, chain(first, names, kind == 1, last, bn))?;
    }
    let m = (t - 2 * tau).unsigned_abs();
    ensure(m <= MAX_EXPONENT as u64, || format!("framing {t}: |t − 2τ| is beyond 2^20"))?;
    // The unstable chain from ξ_0 to η_0 through γ1 … γm; in the bounded model it starts
    // ξ_0 →ρ1 pair.y, pair.x →1 pair.y and goes on from pair.x.
    let split = bounded && xi0 == eta0 && t >= 2 * tau;
    let (first, last) = match (t < 2 * tau, split, m) {
        (true, ..) => (Alg::Reeb(1, 1), Alg::Reeb(3, 3)),
        (_, true, _) => (r23, Alg::Reeb(2, 2)),
        (_, _, 0) => (r23, Alg::Reeb(1, 2)),
        _ => (Alg::Reeb(1, 3), Alg::Reeb(2, 2)),
    };
    let pair = [(Alg::Reeb(1, 1), "pair.y".into(), true), (Alg::One, "pair.x".into(), false)];
    let gammas = (1..=m).map(|k| format!("gamma{k}")).collect();
    let unstable = chain(first, gammas, t < 2 * tau, last, en);
    walk(xi0, pair.into_iter().filter(|_| split).chain(unstable).collect())?;
    terms.sort();
    let period = if group { Some(written([t as i128 + 1, 2, 2 * t as i128, 0])?) } else { None };
    Ok((TypeDSpec { differential: terms, generators: UniqueMap(gens), period }, tau, split))
}

/// The pairing just walked gave terms on input words of length ≤ k (`budget.1`); the relations
/// that ∂∂ = 0 (or the chain-map property) of M ⊠ N rest on are those on δ-path words with a
/// non-zero term: concatenations of two such words or one with an adjacent pair multiplied,
/// so of length ≤ 2k. A `type_a_module` claim of M must state at least that length, and each
/// of `needs` (kind, name) must be claimed: the D relation of every structure paired, ∂f = 0
/// of a morphism.
fn covered(o: &Objects, module: &str, needs: &[(&'static str, &str)]) -> Result<(), Failure> {
    if let Some((kind, n)) = needs.iter().find(|(kind, n)| !o.claimed.contains_key(&(*kind, n.to_string()))) {
        let what = if *kind == "type_d_morphism" { "∂f = 0" } else { "its D relation (δ¹∘δ¹ = 0)" };
        return Err(Failure::Refused(format!(
            "the pairing uses {n}, but no {kind} claim checks {what}, which the box tensor product rests on"
        )));
    }
    let k = o.budget.1.get();
    match o.claimed.get(&("type_a_module", module.to_string())) {
        Some(&l) if l as usize >= 2 * k => Ok(()),
        l => Err(Failure::Refused(format!(
            "the pairing uses operations of {module} on input words of length {k}, so its A∞ relations are needed on words of length ≤ {}, but {}",
            2 * k,
            l.map_or("no type_a_module claim checks them".into(), |l| format!("its type_a_module claim checks them only up to {l}"))
        ))),
    }
}

/// Checks one bordered claim; `None` for the other kinds.
pub fn check(ctx: &Context, o: Option<&Objects>, claim: &Claim, version: u32) -> Option<Result<Facts, Failure>> {
    const KINDS: [&str; 6] =
        ["type_d_structure", "type_a_module", "type_d_morphism", "box_tensor", "box_tensor_map", "complement"];
    KINDS.contains(&claim.kind()).then(|| check_bordered(ctx, o, claim, version))
}

fn check_bordered(ctx: &Context, o: Option<&Objects>, claim: &Claim, version: u32) -> Result<Facts, Failure> {
    crate::verify::check_statement(ctx, claim, version)?;
    let o = o.ok_or_else(|| "a bordered claim in a certificate without a bordered section".to_string())?;
    let r = &ctx.ring;
    let minus = r.variables == ["U"] && r.var_degrees == [vec![-2, -1]] && r.differential_degree == [-1, 0];
    let pairing = matches!(claim, Claim::BoxTensor { .. } | Claim::BoxTensorMap { .. });
    let why = "box tensor products live in the minus ring F2[U], deg U = (−2, −1), deg ∂ = (−1, 0)";
    ensure(!pairing || minus && r.gradings.len() == 2, || why.into())?;
    let structure = |n: &str| o.structures.get(n).ok_or_else(|| format!("type D structure \"{n}\" is not declared"));
    let module = |n: &str| o.modules.get(n).ok_or_else(|| format!("type A module \"{n}\" is not declared"));
    let morphism = |n: &str| o.morphisms.get(n).ok_or_else(|| format!("type D morphism \"{n}\" is not declared"));
    let (b, mut facts) = (&o.budget, BTreeMap::new());
    match claim {
        Claim::TypeDStructure { structure: n, .. } => check_structure(b, structure(n)?)?,
        Claim::TypeAModule { module: n, max_length, .. } => {
            // The allowance left (b.2) joins the budget for this check only; what it does
            // not use is kept for the next module, and the shared budget never grows. (The
            // module is found first: an early return here would leave the allowance in.)
            let (m, before) = (module(n)?, b.0.get());
            b.0.set(before.saturating_add(b.2.get()));
            let checked = check_module(b, m, *max_length);
            b.2.set(b.0.get().saturating_sub(before));
            b.0.set(b.0.get().min(before));
            checked?
        }
        Claim::TypeDMorphism { morphism: n, .. } => {
            // The terms as read (`t`), their source and target as written (`f`).
            let (t, f) = (morphism(n)?, &o.spec.type_d_morphisms[n]);
            let (n, n2) = (structure(&f.from)?, structure(&f.to)?);
            none_of(&t.1)?;
            vanishes(b, "∂f", n, &n2.names, &[(&t.0, &n2.delta), (&n.delta, &t.0)])?
        }
        Claim::BoxTensor { complex, module: mn, structure: sn, witness, .. } => {
            let c = ctx.complex_named(complex)?;
            b.1.set(0);
            let (m, n, size) = (module(mn)?, structure(sn)?, ctx.complexes[c].d.size());
            let (mut gens, rows, side) = tensor_map(b, m, n, None, version >= 4, size)?;
            covered(o, mn, &[("type_d_structure", sn)])?;
            crate::maslov::certify(b, &mut gens, &rows, witness.as_ref(), version)?;
            compare(ctx, &format!("{complex} = {mn} ⊠ {sn}"), (c, c), &gens, &rows, &ctx.complexes[c].d.rows)?;
            facts.insert("generators".into(), json!(gens.len()));
            facts.insert("bounded".into(), json!(side));
        }
        Claim::BoxTensorMap { map, module: mn, morphism: fname, witness, .. } => {
            let (m, t, fm) = (module(mn)?, morphism(fname)?, &ctx.maps[ctx.map_named(map)?]);
            let f = &o.spec.type_d_morphisms[fname];
            let what = format!("{map} = id_{mn} ⊠ {fname}");
            b.1.set(0);
            // id_M ⊠ f is a chain map between M ⊠ N and M ⊠ N′: its source and target are
            // those complexes (differentials included, each graded with its own Maslov
            // witness), and the words of those pairings count toward the relations this module
            // must have been checked on, too.
            let (w, mut source) = (witness.as_ref(), Vec::new());
            for (c, dn, w) in [(fm.from, &f.from, w.map(|w| &w.from)), (fm.to, &f.to, w.map(|w| &w.to))] {
                let size = ctx.complexes[c].d.size();
                let (mut gens, rows, _) = tensor_map(b, m, structure(dn)?, None, version >= 4, size)?;
                crate::maslov::certify(b, &mut gens, &rows, w, version)?;
                let cx = &ctx.complexes[c];
                compare(ctx, &format!("{what}: {} = {mn} ⊠ {dn}", cx.name), (c, c), &gens, &rows, &cx.d.rows)?;
                source.push(gens);
            }
            let (n, n2) = (structure(&f.from)?, structure(&f.to)?);
            let (_, rows, side) = tensor_map(b, m, n, Some((t, n2)), version >= 4, fm.m.size())?;
            covered(o, mn, &[("type_d_structure", &f.from), ("type_d_structure", &f.to), ("type_d_morphism", fname)])?;
            compare(ctx, &what, (fm.from, fm.to), &source[0], &rows, &fm.m.rows)?;
            facts.insert("bounded".into(), json!(side));
        }
        Claim::Complement { bounded_model, structure: sn, complex, framing, tau, .. } => {
            let c = &o.full.complexes[o.full.complex_named(complex)?];
            // The structure has a chain of l generators per arrow of length l and |t − 2τ|
            // more (≤ |t| + max |gr_U − gr_V|): counted before they are made, each at 1/64
            // of an item's allowance (the structure compared with them lists them all).
            let arrows: u64 = c.d.rows.iter().flatten().map(|(_, m)| 1 + m.0[0].max(m.0[1]) as u64).sum();
            let alex = c.gradings.iter().map(|g| (g[0] - g[1]).unsigned_abs()).max().unwrap_or(0);
            let made = arrows + c.names.len() as u64 + framing.unsigned_abs().saturating_add(alex);
            b.spend(made.saturating_mul(WORK_PER_ITEM / 64), "complement")?;
            let (want, found_tau, split) = complement(c, *framing, version >= 3, *bounded_model == Some(true))?;
            // Left out, the structure is LOT's own (cycle or not); `true` asks for the bounded model.
            ensure(*bounded_model == split.then_some(true), || {
                let why = if *bounded_model == Some(false) { "it is false" } else { "here there is none" };
                format!("bounded_model is written only as true, asking for the bounded model, which exists only when ξ_0 = η_0 and t ≥ 2τ (where LOT Thm 11.26's structure has a cycle); {why}")
            })?;
            structure(sn)?;
            let given = &o.spec.type_d_structures[sn];
            ensure(found_tau == *tau, || format!("the basis gives τ = A(ξ_0) = {found_tau}, not {tau}"))?;
            let same = given.generators == want.generators && given.period == want.period;
            ensure(same, || {
                format!("{sn}: its generators (names, idempotents, gradings) or its period differ from those LOT Thm 11.26 gives")
            })?;
            // LOT's terms (sorted, counted in `made`) and as many of the structure's plus one:
            // if it has more, one of those is not LOT's. (Each claim reads no more than that.)
            let w: Vec<&Term> = want.differential.iter().collect();
            let mut d: Vec<&Term> = given.differential.iter().take(w.len() + 1).collect();
            d.sort_unstable();
            let differs = d.iter().chain(&w).find(|t| d.binary_search(t).is_err() || w.binary_search(t).is_err());
            if let Some([y, a, z]) = differs {
                return Err(format!("{sn}: δ¹ differs from LOT Thm 11.26 at the term [{y}, {a}, {z}]").into());
            }
            facts.insert("tau".into(), json!(tau));
        }
        _ => unreachable!("bordered kinds only"),
    }
    Ok(facts)
}
