//! An independent oracle for the bordered claims (torus algebra, type D structures, type A
//! modules, type D morphisms, box tensor products, knot complements), written from the
//! mathematics over plain maps. It shares no code with the checker: not its parser, not its
//! algebra, not its statements. Source: Lipshitz–Ozsváth–Thurston, "Bordered Heegaard Floer
//! homology", Mem. AMS 254 (2018), §2 (type D structures, A∞ modules, box tensor products) and
//! §11 (torus boundary, knot complements). Facts recalled rather than re-derived are marked
//! "(memory)" and each is tested below.

use std::collections::{BTreeMap, BTreeSet};

/// The torus algebra A(T²) over F2 (LOT §11.1, memory), by its basis of 8 elements.
pub mod torus {
    /// A basis element: an idempotent or a Reeb element ρ_I.
    #[derive(Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Debug, Hash)]
    pub enum Alg {
        I0,
        I1,
        R1,
        R2,
        R3,
        R12,
        R23,
        R123,
    }
    use Alg::*;

    pub const ALL: [Alg; 8] = [I0, I1, R1, R2, R3, R12, R23, R123];
    pub const REEB: [Alg; 6] = [R1, R2, R3, R12, R23, R123];

    impl Alg {
        /// (left, right) idempotent: a = ι_left · a · ι_right. ρ_1 = ι_0ρ_1ι_1,
        /// ρ_2 = ι_1ρ_2ι_0, ρ_3 = ι_0ρ_3ι_1 (memory); the rest follows from the products.
        pub fn ends(self) -> (u8, u8) {
            match self {
                I0 | R12 => (0, 0),
                I1 | R23 => (1, 1),
                R1 | R3 | R123 => (0, 1),
                R2 => (1, 0),
            }
        }

        pub fn is_idempotent(self) -> bool {
            matches!(self, I0 | I1)
        }

        /// The product of two basis elements: a basis element or zero. The non-zero products of
        /// Reeb elements are exactly ρ_1ρ_2 = ρ_12, ρ_2ρ_3 = ρ_23, ρ_1ρ_23 = ρ_12ρ_3 = ρ_123 (memory).
        pub fn mul(self, b: Alg) -> Option<Alg> {
            if self.ends().1 != b.ends().0 {
                return None;
            }
            match (self, b) {
                (I0 | I1, _) => Some(b),
                (_, I0 | I1) => Some(self),
                (R1, R2) => Some(R12),
                (R2, R3) => Some(R23),
                (R1, R23) | (R12, R3) => Some(R123),
                _ => None,
            }
        }

        /// The Reeb chord as the interval [first, last] of {1, 2, 3}, for the derivation test.
        pub fn interval(self) -> Option<(u8, u8)> {
            match self {
                R1 => Some((1, 1)),
                R2 => Some((2, 2)),
                R3 => Some((3, 3)),
                R12 => Some((1, 2)),
                R23 => Some((2, 3)),
                R123 => Some((1, 3)),
                _ => None,
            }
        }

        /// The trade's name, for messages.
        pub fn name(self) -> &'static str {
            match self {
                I0 => "ι_0",
                I1 => "ι_1",
                R1 => "ρ_1",
                R2 => "ρ_2",
                R3 => "ρ_3",
                R12 => "ρ_12",
                R23 => "ρ_23",
                R123 => "ρ_123",
            }
        }
    }

    /// Reads an algebra element as a certificate may spell it: "rho_12", "ρ_12", "rho12", "12",
    /// "iota_0", "ι_0", "i0", "1" is refused (ambiguous with ρ_1? no: "1" alone is ρ_1).
    pub fn parse(s: &str) -> Option<Alg> {
        let t = s.trim();
        let idem = |d: &str| match d {
            "0" => Some(I0),
            "1" => Some(I1),
            _ => None,
        };
        for p in ["iota_", "ι_", "iota", "ι", "i_", "i"] {
            if let Some(d) = t.strip_prefix(p) {
                return idem(d);
            }
        }
        let digits = ["rho_", "ρ_", "rho", "ρ", "r_", "r"].iter().find_map(|p| t.strip_prefix(p)).unwrap_or(t);
        match digits {
            "1" => Some(R1),
            "2" => Some(R2),
            "3" => Some(R3),
            "12" => Some(R12),
            "23" => Some(R23),
            "123" => Some(R123),
            _ => None,
        }
    }
}

use torus::Alg;

/// An element of a free F2[U]-module: a set of U^n·g (sums mod 2 by toggling).
pub type UElem = BTreeSet<(u32, String)>;
/// An element of A ⊗ N for a type D structure N.
pub type AElem = BTreeSet<(Alg, String)>;

pub fn toggle<T: Ord>(s: &mut BTreeSet<T>, t: T) {
    if !s.remove(&t) {
        s.insert(t);
    }
}

/// A type D structure over A(T²): generators with an idempotent, and δ¹.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct DStructure {
    pub idem: BTreeMap<String, u8>,
    pub delta: BTreeMap<String, AElem>,
}

impl DStructure {
    pub fn add(&mut self, x: &str, a: Alg, y: &str) {
        toggle(self.delta.entry(x.to_string()).or_default(), (a, y.to_string()));
    }

    fn d(&self, x: &str) -> AElem {
        self.delta.get(x).cloned().unwrap_or_default()
    }

    /// Every term names known generators with matching idempotents: x →a y needs
    /// I(x) = left(a) and right(a) = I(y).
    pub fn check_idempotents(&self) -> Result<(), String> {
        for (x, e) in &self.delta {
            let ix = *self.idem.get(x).ok_or(format!("δ¹ from unknown generator {x}"))?;
            for (a, y) in e {
                let iy = *self.idem.get(y).ok_or(format!("δ¹({x}) names unknown generator {y}"))?;
                if a.ends() != (ix, iy) {
                    return Err(format!("δ¹({x}) ∋ {}⊗{y}: idempotents ι_{ix}, ι_{iy} do not match", a.name()));
                }
            }
        }
        Ok(())
    }

    /// (μ ⊗ id)(id ⊗ δ¹)δ¹ = 0, generator by generator.
    pub fn check_relation(&self) -> Result<(), String> {
        self.check_idempotents()?;
        for x in self.idem.keys() {
            let mut sum = AElem::new();
            for (a, y) in self.d(x) {
                for (b, z) in self.d(&y) {
                    if let Some(ab) = a.mul(b) {
                        toggle(&mut sum, (ab, z));
                    }
                }
            }
            if !sum.is_empty() {
                return Err(format!("(μ⊗id)(id⊗δ¹)δ¹({x}) = {} ≠ 0", show_aelem(&sum)));
            }
        }
        Ok(())
    }

    /// Every δ-sequence y →a_1 … →a_k z from y along which `alive` holds for each prefix,
    /// with its parity (sequences reached by several paths cancel mod 2). Errors when a path
    /// grows past `cap` (the structure is unbounded where the caller needs it bounded).
    pub fn sequences(
        &self,
        y: &str,
        alive: &dyn Fn(&[Alg]) -> bool,
        cap: usize,
    ) -> Result<BTreeSet<(Vec<Alg>, String)>, String> {
        let mut out = BTreeSet::new();
        let mut stack: Vec<(Vec<Alg>, String)> = vec![(vec![], y.to_string())];
        // Paths are enumerated one by one (not merged), so parities come out right.
        while let Some((seq, z)) = stack.pop() {
            if seq.len() > cap {
                return Err(format!("a δ-sequence from {y} longer than {cap} stays alive: unbounded"));
            }
            toggle(&mut out, (seq.clone(), z.clone()));
            for (a, w) in self.d(&z) {
                let mut s = seq.clone();
                s.push(a);
                if alive(&s) {
                    stack.push((s, w));
                }
            }
        }
        Ok(out)
    }
}

fn show_aelem(e: &AElem) -> String {
    e.iter().map(|(a, y)| format!("{}⊗{y}", a.name())).collect::<Vec<_>>().join(" + ")
}

pub fn show_uelem(e: &UElem) -> String {
    if e.is_empty() {
        return "0".into();
    }
    e.iter().map(|(n, y)| if *n == 0 { y.clone() } else { format!("U^{n}·{y}") }).collect::<Vec<_>>().join(" + ")
}

/// A right type A module over A(T²) with coefficients in F2[U]: `op(x, [a_1..a_k])` is
/// m_{k+1}(x, a_1, …, a_k) on composable Reeb sequences (k = 0 is m_1). Idempotent inputs
/// are handled once, by strict unitality, in [`m`].
pub trait Module {
    fn idem(&self, x: &str) -> Option<u8>;
    fn gens(&self) -> Vec<String>;
    fn op(&self, x: &str, a: &[Alg]) -> UElem;
    /// Can some non-zero operation m(x, a_1, …, a_k, …) start with these inputs? Used to prune
    /// δ-sequences in a box tensor product; `true` is always safe (only slower).
    fn prefix_alive(&self, x: &str, a: &[Alg]) -> bool;
}

/// m_{k+1}(x, a_1..a_k) including idempotent inputs (strict unitality: m_2(x, ι) = x when the
/// idempotents match, every longer operation with an idempotent input is zero) and the tensor
/// over the idempotent ring (a non-composable sequence gives zero).
pub fn m(module: &dyn Module, x: &str, a: &[Alg]) -> UElem {
    let Some(ix) = module.idem(x) else { return UElem::new() };
    if let Some(first) = a.first() {
        if first.ends().0 != ix || a.windows(2).any(|w| w[0].ends().1 != w[1].ends().0) {
            return UElem::new();
        }
    }
    if a.iter().any(|b| b.is_idempotent()) {
        let mut e = UElem::new();
        if a.len() == 1 {
            e.insert((0, x.to_string()));
        }
        return e;
    }
    module.op(x, a)
}

fn prefix_alive(module: &dyn Module, x: &str, a: &[Alg]) -> bool {
    if a.iter().any(|b| b.is_idempotent()) {
        return a.len() == 1;
    }
    module.prefix_alive(x, a)
}

/// m applied to a U-linear combination.
fn m_elem(module: &dyn Module, e: &UElem, a: &[Alg]) -> UElem {
    let mut out = UElem::new();
    for (n, y) in e {
        for (k, z) in m(module, y, a) {
            toggle(&mut out, (n + k, z));
        }
    }
    out
}

/// Every composable sequence of Reeb elements of length 1..=len starting in idempotent i.
pub fn reeb_sequences(i: u8, len: usize) -> Vec<Vec<Alg>> {
    let mut out = Vec::new();
    let mut layer: Vec<Vec<Alg>> = vec![vec![]];
    for _ in 0..len {
        let mut next = Vec::new();
        for s in &layer {
            let at = s.last().map_or(i, |a| a.ends().1);
            for a in torus::REEB {
                if a.ends().0 == at {
                    let mut t = s.clone();
                    t.push(a);
                    next.push(t);
                }
            }
        }
        out.extend(next.iter().cloned());
        layer = next;
    }
    out
}

/// The A∞ relation at (x, a_1..a_k) (algebra differential zero):
/// Σ_i m(m(x, a_1..a_i), a_{i+1}..a_k) + Σ_j m(x, a_1, .., a_j a_{j+1}, .., a_k).
pub fn ainf_relation(module: &dyn Module, x: &str, a: &[Alg]) -> UElem {
    let mut sum = UElem::new();
    let mut unit = UElem::new();
    unit.insert((0, x.to_string()));
    for i in 0..=a.len() {
        let inner = m_elem(module, &unit, &a[..i]);
        for t in m_elem(module, &inner, &a[i..]) {
            toggle(&mut sum, t);
        }
    }
    for j in 0..a.len().saturating_sub(1) {
        if let Some(p) = a[j].mul(a[j + 1]) {
            let mut b = a[..j].to_vec();
            b.push(p);
            b.extend_from_slice(&a[j + 2..]);
            for t in m_elem(module, &unit, &b) {
                toggle(&mut sum, t);
            }
        }
    }
    sum
}

/// The A∞ relations for every generator and every composable Reeb sequence of length ≤ len
/// (and m_1∘m_1 = 0).
pub fn check_ainf(module: &dyn Module, len: usize) -> Result<(), String> {
    for x in module.gens() {
        let i = module.idem(&x).ok_or(format!("generator {x} has no idempotent"))?;
        for a in std::iter::once(vec![]).chain(reeb_sequences(i, len)) {
            let r = ainf_relation(module, &x, &a);
            if !r.is_empty() {
                let names: Vec<&str> = a.iter().map(|b| b.name()).collect();
                return Err(format!("A∞ relation at ({x}, {}) is {} ≠ 0", names.join(", "), show_uelem(&r)));
            }
        }
    }
    Ok(())
}

/// A module given by a finite table of operations.
#[derive(Clone, Debug, Default)]
pub struct TableModule {
    pub idem: BTreeMap<String, u8>,
    pub ops: BTreeMap<(String, Vec<Alg>), UElem>,
}

impl TableModule {
    pub fn add(&mut self, x: &str, a: &[Alg], n: u32, y: &str) {
        toggle(self.ops.entry((x.to_string(), a.to_vec())).or_default(), (n, y.to_string()));
    }
}

impl Module for TableModule {
    fn idem(&self, x: &str) -> Option<u8> {
        self.idem.get(x).copied()
    }
    fn gens(&self) -> Vec<String> {
        self.idem.keys().cloned().collect()
    }
    fn op(&self, x: &str, a: &[Alg]) -> UElem {
        self.ops.get(&(x.to_string(), a.to_vec())).cloned().unwrap_or_default()
    }
    fn prefix_alive(&self, x: &str, a: &[Alg]) -> bool {
        self.ops.keys().any(|(y, b)| y == x && b.starts_with(a) && !self.ops[&(y.clone(), b.clone())].is_empty())
    }
}

/// The core of the solid torus (memory): one generator in ι_0 with
/// m_{ℓ+2}(x, ρ_3, ρ_23, …, ρ_23, ρ_2) = U^ℓ·x (ℓ − 1 copies of ρ_23), ℓ ≥ 1; nothing else.
pub struct CoreModule(pub String);

impl Module for CoreModule {
    fn idem(&self, x: &str) -> Option<u8> {
        (x == self.0).then_some(0)
    }
    fn gens(&self) -> Vec<String> {
        vec![self.0.clone()]
    }
    fn op(&self, x: &str, a: &[Alg]) -> UElem {
        let mut e = UElem::new();
        let n = a.len();
        if x == self.0
            && n >= 2
            && a[0] == Alg::R3
            && a[n - 1] == Alg::R2
            && a[1..n - 1].iter().all(|&b| b == Alg::R23)
        {
            e.insert(((n - 1) as u32, x.to_string()));
        }
        e
    }
    fn prefix_alive(&self, x: &str, a: &[Alg]) -> bool {
        let n = a.len();
        x == self.0
            && match n {
                0 => true,
                1 => a[0] == Alg::R3,
                _ => {
                    a[0] == Alg::R3
                        && a[1..n - 1].iter().all(|&b| b == Alg::R23)
                        && matches!(a[n - 1], Alg::R23 | Alg::R2)
                }
            }
    }
}

/// A complex over F2[U]: ∂ as generator → element.
pub type UComplex = BTreeMap<String, UElem>;

pub fn pair_name(x: &str, y: &str) -> String {
    format!("{x}⊗{y}")
}

/// The longest δ-sequence the oracle follows before declaring a pairing unbounded.
pub const CAP: usize = 4096;

/// M ⊠ N: generators x ⊗ y with I(x) = I(y), ∂(x ⊗ y) = Σ_k (m_{k+1} ⊗ id)(x ⊗ δ^k(y)), with
/// the δ-sequences pruned where no operation of M can start with them.
pub fn box_tensor(module: &dyn Module, n: &DStructure) -> Result<UComplex, String> {
    let mut out = UComplex::new();
    for x in module.gens() {
        let ix = module.idem(&x);
        for (y, iy) in &n.idem {
            if ix != Some(*iy) {
                continue;
            }
            let seqs = n.sequences(y, &|s| prefix_alive(module, &x, s), CAP)?;
            let mut e = UElem::new();
            for (a, z) in seqs {
                for (k, w) in m(module, &x, &a) {
                    toggle(&mut e, (k, pair_name(&w, &z)));
                }
            }
            out.insert(pair_name(&x, y), e);
        }
    }
    Ok(out)
}

/// A type D morphism f: N → A ⊗ N′, as generator → element of A ⊗ N′.
pub type DMorphism = BTreeMap<String, AElem>;

/// f satisfies the morphism relation (μ⊗id)(id⊗δ′)f + (μ⊗id)(id⊗f)δ = 0, idempotents
/// matching on every term.
pub fn check_morphism(f: &DMorphism, n: &DStructure, n2: &DStructure) -> Result<(), String> {
    for (x, e) in f {
        let ix = *n.idem.get(x).ok_or(format!("f from unknown generator {x}"))?;
        for (a, y) in e {
            let iy = *n2.idem.get(y).ok_or(format!("f({x}) names unknown generator {y}"))?;
            if a.ends() != (ix, iy) {
                return Err(format!("f({x}) ∋ {}⊗{y}: idempotents do not match", a.name()));
            }
        }
    }
    let empty = AElem::new();
    for x in n.idem.keys() {
        let mut sum = AElem::new();
        for (a, y) in f.get(x).unwrap_or(&empty) {
            for (b, z) in n2.delta.get(y).unwrap_or(&empty) {
                if let Some(ab) = a.mul(*b) {
                    toggle(&mut sum, (ab, z.clone()));
                }
            }
        }
        for (a, y) in n.delta.get(x).unwrap_or(&empty) {
            for (b, z) in f.get(y).unwrap_or(&empty) {
                if let Some(ab) = a.mul(*b) {
                    toggle(&mut sum, (ab, z.clone()));
                }
            }
        }
        if !sum.is_empty() {
            return Err(format!("morphism relation at {x}: {} ≠ 0", show_aelem(&sum)));
        }
    }
    Ok(())
}

/// id_M ⊠ f: x ⊗ y ↦ Σ m(x, a_1..a_i, b, c_1..c_j) ⊗ z over δ-sequences of N from y, one term
/// of f, and δ-sequences of N′ (an idempotent term b enters only as m_2(x, ι) = x).
pub fn box_tensor_map(
    module: &dyn Module,
    n: &DStructure,
    f: &DMorphism,
    n2: &DStructure,
) -> Result<UComplex, String> {
    let mut out = UComplex::new();
    for x in module.gens() {
        let ix = module.idem(&x);
        for (y, iy) in &n.idem {
            if ix != Some(*iy) {
                continue;
            }
            let mut e = UElem::new();
            for (a, y1) in n.sequences(y, &|s| prefix_alive(module, &x, s), CAP)? {
                for (b, y2) in f.get(&y1).into_iter().flatten() {
                    let mut ab = a.clone();
                    ab.push(*b);
                    if !prefix_alive(module, &x, &ab) {
                        continue;
                    }
                    let alive = |s: &[Alg]| {
                        let mut t = ab.clone();
                        t.extend_from_slice(s);
                        prefix_alive(module, &x, &t)
                    };
                    for (c, z) in n2.sequences(y2, &alive, CAP)? {
                        let mut seq = ab.clone();
                        seq.extend(c);
                        for (k, w) in m(module, &x, &seq) {
                            toggle(&mut e, (k, pair_name(&w, &z)));
                        }
                    }
                }
            }
            out.insert(pair_name(&x, y), e);
        }
    }
    Ok(out)
}

/// ∂∂ = 0 over F2[U].
pub fn is_complex(d: &UComplex) -> bool {
    d.keys().all(|x| {
        let mut s = UElem::new();
        for (n, y) in &d[x] {
            for (k, z) in d.get(y).into_iter().flatten() {
                toggle(&mut s, (n + k, z.clone()));
            }
        }
        s.is_empty()
    })
}

/// A complex over F2[U, V] with (gr_U, gr_V) gradings: generator → set of (i, j, y) for U^i V^j·y.
#[derive(Clone, Debug, Default)]
pub struct UVComplex {
    pub gr: BTreeMap<String, (i64, i64)>,
    pub d: BTreeMap<String, BTreeSet<(u32, u32, String)>>,
}

/// The pieces of LOT Thm 11.26 read off a simultaneously horizontally and vertically simplified
/// basis: vertical arrows (ξ_i, ℓ, ξ_j) for ξ_i → V^ℓ·ξ_j, horizontal arrows likewise with U, the
/// generators ξ_0 of vertical and η_0 of horizontal homology, and 2τ = A(ξ_0) − A(η_0).
#[derive(Clone, Debug, PartialEq)]
pub struct Simplified {
    pub vertical: Vec<(String, u32, String)>,
    pub horizontal: Vec<(String, u32, String)>,
    pub xi0: String,
    pub eta0: String,
    pub two_tau: i64,
}

/// Alexander grading A = (gr_U − gr_V)/2.
fn alexander(g: (i64, i64)) -> i64 {
    (g.0 - g.1).div_euclid(2)
}

/// Reads the arrows of C and checks that its basis is simultaneously horizontally and
/// vertically simplified: every generator lies on at most one horizontal arrow (as source or
/// target) and exactly one lies on none; the same for vertical arrows. Arrows are the terms
/// U^ℓ (horizontal) and V^ℓ (vertical), ℓ ≥ 1; diagonal terms U^aV^b (a, b ≥ 1) are ignored by
/// the theorem; a term of coefficient 1 means C is not reduced, which the theorem excludes.
pub fn simplified(c: &UVComplex) -> Result<Simplified, String> {
    let (mut h, mut v) = (Vec::new(), Vec::new());
    for (x, e) in &c.d {
        for (i, j, y) in e {
            match (i, j) {
                (0, 0) => return Err(format!("∂{x} ∋ {y} with coefficient 1: the complex is not reduced")),
                (i, 0) => h.push((x.clone(), *i, y.clone())),
                (0, j) => v.push((x.clone(), *j, y.clone())),
                _ => {}
            }
        }
    }
    let lone = |arrows: &[(String, u32, String)], what: &str| -> Result<String, String> {
        let mut seen: BTreeMap<&str, u32> = BTreeMap::new();
        for (x, _, y) in arrows {
            *seen.entry(x).or_default() += 1;
            *seen.entry(y).or_default() += 1;
        }
        if let Some((g, _)) = seen.iter().find(|(_, &k)| k > 1) {
            return Err(format!("generator {g} lies on more than one {what} arrow: the basis is not {what}ly simplified"));
        }
        let free: Vec<&String> = c.gr.keys().filter(|g| !seen.contains_key(g.as_str())).collect();
        match free.as_slice() {
            [g] => Ok((*g).clone()),
            _ => Err(format!("{} generators lie on no {what} arrow (need exactly one)", free.len())),
        }
    };
    let eta0 = lone(&h, "horizontal")?;
    let xi0 = lone(&v, "vertical")?;
    let two_tau = alexander(c.gr[&xi0]) - alexander(c.gr[&eta0]);
    Ok(Simplified { vertical: v, horizontal: h, xi0, eta0, two_tau })
}

/// Names of the ι_1 generators of a complement, in the oracle's own scheme (comparison with a
/// certificate goes through [`isomorphic_fixing_iota0`], so the scheme never has to agree).
#[derive(Clone, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum Iota1 {
    Vertical(String, String, u32),
    Horizontal(String, String, u32),
    Unstable(u32),
}

fn iota1_name(k: &Iota1) -> String {
    match k {
        Iota1::Vertical(x, y, i) => format!("κ[{x}→{y}]{i}"),
        Iota1::Horizontal(x, y, i) => format!("λ[{x}→{y}]{i}"),
        Iota1::Unstable(i) => format!("γ{i}"),
    }
}

/// The type D structure LOT Thm 11.26 assigns to C and framing t (memory, derived in the
/// module comment at the end of this file):
/// - ι_0: the basis ξ_i of C;
/// - a vertical arrow ξ_i → V^ℓ·ξ_j: κ_1 … κ_ℓ with ξ_i →ρ_1 κ_1, κ_{k+1} →ρ_23 κ_k, ξ_j →ρ_123 κ_ℓ;
/// - a horizontal arrow ξ_i → U^ℓ·ξ_j: ξ_i →ρ_3 λ_1 →ρ_23 … →ρ_23 λ_ℓ →ρ_2 ξ_j;
/// - the unstable chain from ξ_0 to η_0: t < 2τ: ξ_0 →ρ_1 γ_1, γ_{k+1} →ρ_23 γ_k, η_0 →ρ_3 γ_m,
///   m = 2τ − t; t = 2τ: ξ_0 →ρ_12 η_0; t > 2τ: ξ_0 →ρ_123 γ_1 →ρ_23 … γ_m →ρ_2 η_0, m = t − 2τ.
pub fn complement(c: &UVComplex, t: i64) -> Result<DStructure, String> {
    use Alg::*;
    let s = simplified(c)?;
    let mut n = DStructure::default();
    for g in c.gr.keys() {
        n.idem.insert(g.clone(), 0);
    }
    let chain = |n: &mut DStructure, keys: Vec<Iota1>| -> Vec<String> {
        let names: Vec<String> = keys.iter().map(iota1_name).collect();
        for nm in &names {
            n.idem.insert(nm.clone(), 1);
        }
        names
    };
    for (x, l, y) in &s.vertical {
        let k = chain(&mut n, (1..=*l).map(|i| Iota1::Vertical(x.clone(), y.clone(), i)).collect());
        n.add(x, R1, &k[0]);
        for i in 1..k.len() {
            n.add(&k[i], R23, &k[i - 1]);
        }
        n.add(y, R123, &k[k.len() - 1]);
    }
    for (x, l, y) in &s.horizontal {
        let k = chain(&mut n, (1..=*l).map(|i| Iota1::Horizontal(x.clone(), y.clone(), i)).collect());
        n.add(x, R3, &k[0]);
        for i in 1..k.len() {
            n.add(&k[i - 1], R23, &k[i]);
        }
        n.add(&k[k.len() - 1], R2, y);
    }
    let (xi0, eta0) = (&s.xi0, &s.eta0);
    let m = (t - s.two_tau).unsigned_abs() as u32;
    if t < s.two_tau {
        let g = chain(&mut n, (1..=m).map(Iota1::Unstable).collect());
        n.add(xi0, R1, &g[0]);
        for i in 1..g.len() {
            n.add(&g[i], R23, &g[i - 1]);
        }
        n.add(eta0, R3, &g[g.len() - 1]);
    } else if t == s.two_tau {
        n.add(xi0, R12, eta0);
    } else {
        let g = chain(&mut n, (1..=m).map(Iota1::Unstable).collect());
        n.add(xi0, R123, &g[0]);
        for i in 1..g.len() {
            n.add(&g[i - 1], R23, &g[i]);
        }
        n.add(&g[g.len() - 1], R2, eta0);
    }
    Ok(n)
}

/// Are two type D structures equal after renaming the ι_1 generators, the ι_0 generators kept?
/// The renaming is propagated along δ¹ from the ι_0 generators (in a complement every ι_1
/// generator lies on a chain that starts or ends at an ι_0 generator); then δ¹ is compared
/// term by term. Any leftover ι_1 generator or a clash means "not equal".
pub fn isomorphic_fixing_iota0(a: &DStructure, b: &DStructure) -> Result<(), String> {
    let zeros = |n: &DStructure| -> BTreeSet<String> {
        n.idem.iter().filter(|(_, &i)| i == 0).map(|(g, _)| g.clone()).collect()
    };
    if zeros(a) != zeros(b) {
        return Err("the ι_0 generators differ".into());
    }
    if a.idem.len() != b.idem.len() {
        return Err(format!("{} generators against {}", a.idem.len(), b.idem.len()));
    }
    let mut map: BTreeMap<String, String> = zeros(a).into_iter().map(|g| (g.clone(), g)).collect();
    let rev = |n: &DStructure| -> BTreeMap<String, AElem> {
        let mut r: BTreeMap<String, AElem> = BTreeMap::new();
        for (x, e) in &n.delta {
            for (al, y) in e {
                r.entry(y.clone()).or_default().insert((*al, x.clone()));
            }
        }
        r
    };
    let (ra, rb) = (rev(a), rev(b));
    let empty = AElem::new();
    loop {
        let mut grew = false;
        let known: Vec<(String, String)> = map.iter().map(|(x, y)| (x.clone(), y.clone())).collect();
        for (x, y) in known {
            for (ea, eb) in [
                (a.delta.get(&x).unwrap_or(&empty), b.delta.get(&y).unwrap_or(&empty)),
                (ra.get(&x).unwrap_or(&empty), rb.get(&y).unwrap_or(&empty)),
            ] {
                for (al, g) in ea {
                    if map.contains_key(g) {
                        continue;
                    }
                    let cands: Vec<&String> =
                        eb.iter().filter(|(be, h)| be == al && !map.values().any(|v| v == h)).map(|(_, h)| h).collect();
                    let ours: usize = ea.iter().filter(|(be, h)| be == al && !map.contains_key(h)).count();
                    if cands.len() == 1 && ours == 1 {
                        map.insert(g.clone(), cands[0].clone());
                        grew = true;
                    }
                }
            }
        }
        if !grew {
            break;
        }
    }
    if map.len() != a.idem.len() {
        return Err("some ι_1 generators could not be matched along δ¹".into());
    }
    for (x, y) in &map {
        if a.idem[x] != b.idem[y] {
            return Err(format!("{x} and {y} have different idempotents"));
        }
        let renamed: AElem = a.delta.get(x).unwrap_or(&empty).iter().map(|(al, g)| (*al, map[g].clone())).collect();
        let theirs = b.delta.get(y).cloned().unwrap_or_default();
        if renamed != theirs {
            return Err(format!("δ¹({y}) is {} but LOT Thm 11.26 gives {}", show_aelem(&theirs), show_aelem(&renamed)));
        }
    }
    Ok(())
}

/// Homology of a graded complex over F2[U] with gradings (M, A), deg U = (−2, −1):
/// (gradings of free generators, (k, grading) of each F2[U]/U^k, k ≥ 1), both sorted.
/// By cancellation of the arrow of least U-power: with x → U^k·y of least k, y* = ∂x / U^k is a
/// basis element (coefficient 1 on y), every other arrow into y* has power ≥ k and is removed
/// by z ↦ z + U^{j−k}x, and nothing reaches x since ∂∂ = 0; so (x, y*) splits off.
pub type Homology = (Vec<(i64, i64)>, Vec<(u32, (i64, i64))>);

pub fn homology(gr: &BTreeMap<String, (i64, i64)>, d: &UComplex) -> Result<Homology, String> {
    if !is_complex(d) {
        return Err("∂∂ ≠ 0".into());
    }
    let mut d: BTreeMap<String, UElem> = gr.keys().map(|g| (g.clone(), d.get(g).cloned().unwrap_or_default())).collect();
    let mut tors = Vec::new();
    loop {
        let Some((k, x, y)) =
            d.iter().flat_map(|(x, e)| e.iter().map(move |(k, y)| (*k, x.clone(), y.clone()))).min()
        else {
            break;
        };
        // y* = ∂x / U^k replaces y in the basis: every other generator's coefficient of y is
        // rewritten. Writing old y = y* + Σ_{w≠y} U^{a_w − k} w, each term U^j·y elsewhere becomes
        // U^j·y* + Σ U^{j+a_w−k}·w; and the terms U^j·y* are then cleared with z + U^{j−k}x.
        let dx: Vec<(u32, String)> = d[&x].iter().cloned().collect();
        let others: Vec<(u32, String)> = dx.iter().filter(|(_, w)| *w != y).map(|(a, w)| (a - k, w.clone())).collect();
        let names: Vec<String> = d.keys().cloned().collect();
        for z in &names {
            if *z == x {
                continue;
            }
            let hits: Vec<u32> = d[z].iter().filter(|(_, w)| *w == y).map(|(j, _)| *j).collect();
            for j in hits {
                // U^j·y = U^j·y* + Σ U^{j+a}·w; then add U^{j−k}·∂x = U^j·y* to cancel y*.
                let e = d.get_mut(z).unwrap();
                e.remove(&(j, y.clone()));
                for (a, w) in &others {
                    toggle(e, (j + a, w.clone()));
                }
            }
        }
        if gr.get(&x).is_none() || gr.get(&y).is_none() {
            return Err(format!("an arrow {x} → {y} leaves the generators"));
        }
        if k > 0 {
            tors.push((k, gr[&y]));
        }
        d.remove(&x);
        d.remove(&y);
        // In the new basis nothing reaches x (∂∂ = 0, checked by the caller): drop those terms.
        for e in d.values_mut() {
            e.retain(|(_, w)| *w != x);
            if e.iter().any(|(_, w)| *w == y) {
                return Err(format!("∂∂ ≠ 0 near {x} → U^{k}·{y}"));
            }
        }
    }
    let mut free: Vec<(i64, i64)> = d.keys().map(|g| gr[g]).collect();
    free.sort();
    tors.sort();
    Ok((free, tors))
}

#[cfg(test)]
mod tests {
    use super::torus::*;
    use super::*;
    use Alg::*;

    // LOT §11.1 (memory): the multiplication table is associative, idempotents are orthogonal
    // and sum to 1, and the Reeb products agree with concatenation of chords on {1, 2, 3}.
    #[test]
    fn torus_algebra_is_associative_and_matches_chord_concatenation() {
        for a in ALL {
            for b in ALL {
                for c in ALL {
                    let l = a.mul(b).and_then(|ab| ab.mul(c));
                    let r = b.mul(c).and_then(|bc| a.mul(bc));
                    assert_eq!(l, r, "({a:?}{b:?}){c:?} vs {a:?}({b:?}{c:?})");
                }
            }
        }
        for a in ALL {
            let (l, r) = a.ends();
            let (il, ir) = ([I0, I1][l as usize], [I0, I1][r as usize]);
            assert_eq!(il.mul(a), Some(a));
            assert_eq!(a.mul(ir), Some(a));
            assert_eq!([I0, I1][1 - l as usize].mul(a), None);
            assert_eq!(a.mul([I0, I1][1 - r as usize]), None);
        }
        // Chord model: ρ_[i,j] ρ_[j+1,k] = ρ_[i,k]; left idempotent of a chord starting at i is
        // (i − 1) mod 2, right idempotent of one ending at j is j mod 2.
        for a in REEB {
            let (i, j) = a.interval().unwrap();
            assert_eq!(a.ends(), ((i - 1) % 2, j % 2), "{a:?}");
            for b in REEB {
                let (k, l) = b.interval().unwrap();
                let concat = REEB.into_iter().find(|c| c.interval() == Some((i, l)));
                assert_eq!(a.mul(b), if j + 1 == k { concat } else { None }, "{a:?}·{b:?}");
            }
        }
        let nonzero = REEB.iter().flat_map(|&a| REEB.map(move |b| (a, b))).filter(|(a, b)| a.mul(*b).is_some());
        assert_eq!(nonzero.count(), 4, "exactly ρ_1ρ_2, ρ_2ρ_3, ρ_1ρ_23, ρ_12ρ_3");
        for (s, a) in [("rho_12", R12), ("ρ_3", R3), ("iota_1", I1), ("123", R123), ("ι_0", I0)] {
            assert_eq!(parse(s), Some(a));
        }
        assert_eq!(parse("rho_13"), None);
    }

    #[test]
    fn core_module_satisfies_the_ainf_relations_and_a_wrong_one_does_not() {
        // LOT §11.4 (memory): the core of the solid torus.
        check_ainf(&CoreModule("x".into()), 9).unwrap();
        // The same operations with the wrong U-power (U^{ℓ+1}) break the relation at
        // (ρ_3, ρ_2, ρ_3, ρ_2): U^{2}·U^{2} ≠ U^{3} from the merged ρ_23.
        let mut t = TableModule::default();
        t.idem.insert("x".into(), 0);
        for l in 1..6u32 {
            let mut a = vec![R3];
            a.extend(std::iter::repeat_n(R23, l as usize - 1));
            a.push(R2);
            t.add("x", &a, l + 1, "x");
        }
        assert!(check_ainf(&t, 4).is_err());
        // Truncating the family is caught by a relation longer than the table: with ℓ ≤ 2 only,
        // (ρ_3, ρ_23, ρ_2, ρ_3, ρ_2) needs m(x, ρ_3, ρ_23, ρ_23, ρ_2) = U^3·x.
        let mut t = TableModule::default();
        t.idem.insert("x".into(), 0);
        t.add("x", &[R3, R2], 1, "x");
        t.add("x", &[R3, R23, R2], 2, "x");
        assert!(check_ainf(&t, 4).is_ok());
        assert!(check_ainf(&t, 5).is_err());
    }

    fn staircase(a: &[i64]) -> UVComplex {
        // Conventions sheet (Ozsváth–Szabó 2005): ∂x_i = U^{a_{i−1}−a_i}x_{i−1} + V^{a_i−a_{i+1}}x_{i+1}.
        let mut c = UVComplex::default();
        let mut gu = 0i64;
        for i in 0..a.len() {
            if i > 0 {
                gu += if i % 2 == 1 { 1 - 2 * (a[i - 1] - a[i]) } else { -1 };
            }
            c.gr.insert(format!("x{i}"), (gu, gu - 2 * a[i]));
        }
        for i in (1..a.len()).step_by(2) {
            let e = c.d.entry(format!("x{i}")).or_default();
            e.insert(((a[i - 1] - a[i]) as u32, 0, format!("x{}", i - 1)));
            e.insert((0, (a[i] - a[i + 1]) as u32, format!("x{}", i + 1)));
        }
        c
    }

    fn quotient_v(c: &UVComplex) -> UComplex {
        c.gr.keys()
            .map(|x| {
                let e = c.d.get(x).into_iter().flatten().filter(|(_, j, _)| *j == 0).map(|(i, _, y)| (*i, y.clone()));
                (x.clone(), e.collect())
            })
            .collect()
    }

    fn minus_gradings(c: &UVComplex) -> BTreeMap<String, (i64, i64)> {
        c.gr.iter().map(|(g, &(u, v))| (g.clone(), (u, (u - v) / 2))).collect()
    }

    #[test]
    fn complements_satisfy_the_d_relation_and_pair_back_to_the_minus_complex() {
        let core = CoreModule("x".into());
        // T(2,3), T(3,4), T(2,5) staircases (Ozsváth–Szabó 2005), and the unknot.
        for a in [vec![1, 0, -1], vec![3, 2, 0, -2, -3], vec![2, 1, 0, -1, -2], vec![0]] {
            let c = staircase(&a);
            let s = simplified(&c).unwrap();
            assert_eq!(s.two_tau, 2 * a[0], "τ of an L-space knot is its genus (OS 2003)");
            for t in -3..=8 {
                let n = complement(&c, t).unwrap();
                n.check_relation().unwrap();
                let x = box_tensor(&core, &n).unwrap();
                let expected: UComplex = quotient_v(&c).into_iter().map(|(g, e)| {
                    (pair_name("x", &g), e.into_iter().map(|(k, y)| (k, pair_name("x", &y))).collect())
                }).collect();
                assert_eq!(x, expected, "core ⊠ CFD(X_K, {t}) = C/(V) for {a:?}");
                let gr = minus_gradings(&c);
                let h = homology(&gr, &quotient_v(&c)).unwrap();
                assert_eq!(h.0, vec![(-2 * a[0], -a[0])], "HFK^- tower at (−2τ, −τ) (conventions sheet, OS 2003)");
            }
        }
    }

    #[test]
    fn homology_by_cancellation_on_a_hidden_basis() {
        // ∂b = U^2 a, ∂c = U a + ... : b ↦ U^2 a, c ↦ U a (c − U·? ): H = F2[U]/U ⊕ F2[U]
        let mut gr = BTreeMap::new();
        gr.insert("a".to_string(), (0, 0));
        gr.insert("b".to_string(), (-3, -2));
        gr.insert("c".to_string(), (-1, -1));
        let mut d = UComplex::new();
        d.insert("b".into(), [(2, "a".to_string())].into());
        d.insert("c".into(), [(1, "a".to_string())].into());
        let (free, tors) = homology(&gr, &d).unwrap();
        // c → U a splits F2[U]/U at a; b + U c is a cycle at (−3, −2).
        assert_eq!(tors, vec![(1, (0, 0))]);
        assert_eq!(free, vec![(-3, -2)]);
    }
}
