//! Helpers shared by the integration tests: proving a problem given as JSON, and an
//! independent evaluator of the two defining identities (written without the checker's code),
//! used to decide whether a mutated witness is semantically neutral.

use serde_json::Value;
use std::collections::BTreeMap;
use tubecert::prove::Proved;
use tubecert_format::Body;

/// Proves a problem given as JSON; panics with the producer's messages on bad input.
pub fn prove_value(problem: &Value) -> Proved {
    let bytes = serde_json::to_vec(problem).unwrap();
    let p = tubecert::problem::parse_problem(&bytes).unwrap_or_else(|e| panic!("{e:?}"));
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

/// The ring F2[U] with (Maslov, Alexander), U of degree (−2, −1).
pub fn minus_ring() -> Value {
    serde_json::json!({"variables": ["U"], "gradings": ["maslov", "alexander"],
        "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]})
}

pub fn seal(body: Body) -> Vec<u8> {
    tubecert::canonical_writer::file_bytes(&tubecert::canonical_writer::seal(body).unwrap()).unwrap()
}

/// An element of a free module over F2[U, V]: a set of (generator, (i, j)) for U^i V^j·g.
pub type Elem = BTreeMap<(String, (u32, u32)), ()>;

fn toggle(e: &mut Elem, k: (String, (u32, u32))) {
    if e.remove(&k).is_none() {
        e.insert(k, ());
    }
}

/// Parses "U^2*V + 1" style coefficients by hand (independent of the format crate).
pub fn monomials(coef: &str) -> Vec<(u32, u32)> {
    coef.split('+')
        .map(|t| {
            let t = t.trim();
            let (mut i, mut j) = (0, 0);
            if t != "1" {
                for f in t.split('*') {
                    let (v, e) = f.split_once('^').map_or((f, 1), |(v, e)| (v, e.parse().unwrap()));
                    if v == "U" {
                        i += e
                    } else {
                        j += e
                    }
                }
            }
            (i, j)
        })
        .collect()
}

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
    for ((g, (i, j)), _) in v {
        for ((h, (a, b)), _) in f.get(g).into_iter().flatten() {
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
        for k in apply(&h, dc.get(x).unwrap_or(&Elem::new())).into_keys() {
            toggle(&mut lhs, k);
        }
        lhs == phi.get(x).cloned().unwrap_or_default()
    })
}

/// Is y a dual witness for φ: ⟨y, φ⟩ = 1 and y(∂ψ + ψ∂) = 0 for every basis ψ = (x ↦ m·w)?
/// Checked by brute force over the ψ whose boundary can meet y.
pub fn is_dual_witness(src_d: &[[String; 3]], dst_d: &[[String; 3]], phi: &[[String; 3]], y: &[[String; 3]]) -> bool {
    let ys: Vec<(String, (u32, u32), String)> =
        y.iter().map(|[x, m, w]| (x.clone(), monomials(m)[0], w.clone())).collect();
    let phi = map_of(phi);
    let pairing = ys.iter().filter(|(x, m, w)| phi.get(x).is_some_and(|e| e.contains_key(&(w.clone(), *m)))).count();
    if pairing % 2 != 1 {
        return false;
    }
    // Candidate ψ: for each y-triple, the ones whose boundary can reach it.
    let (dc, dd) = (map_of(src_d), map_of(dst_d));
    let mut cands = std::collections::BTreeSet::new();
    for (x, (i, j), w) in &ys {
        for (w2, e) in &dd {
            for ((t, (a, b)), _) in e {
                if t == w && a <= i && b <= j {
                    cands.insert((x.clone(), (i - a, j - b), w2.clone()));
                }
            }
        }
        for ((x2, (a, b)), _) in dc.get(x).into_iter().flatten() {
            if a <= i && b <= j {
                cands.insert((x2.clone(), (i - a, j - b), w.clone()));
            }
        }
    }
    cands.into_iter().all(|(x, m, w)| {
        // ∂ψ + ψ∂ for ψ = x ↦ m·w, as (source, element) pairs
        let mut img: Vec<(String, Elem)> = Vec::new();
        let mut single = Elem::new();
        single.insert((w.clone(), m), ());
        img.push((x.clone(), apply(&dd, &single)));
        for (x2, e) in &dc {
            for ((t, (a, b)), _) in e {
                if *t == x {
                    let mut el = Elem::new();
                    el.insert((w.clone(), (m.0 + a, m.1 + b)), ());
                    img.push((x2.clone(), el));
                }
            }
        }
        // Count with multiplicity: the same triple may come from several images.
        let total: usize = ys
            .iter()
            .map(|(yx, ym, yw)| img.iter().filter(|(s, e)| s == yx && e.contains_key(&(yw.clone(), *ym))).count())
            .sum();
        total % 2 == 0
    })
}

/// A block of a planted complex over F2[U] with (Maslov, Alexander) gradings.
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
    pub fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545F4914F6CDD1D)
    }
    pub fn below(&mut self, n: u64) -> u64 {
        self.next() % n
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
