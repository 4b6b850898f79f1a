//! A change of basis of a complex over `F2[U,V]` to one that is simultaneously horizontally and
//! vertically simplified (LOT §11.5): every U-arrow U^ℓ·b (ℓ ≥ 1) and every V-arrow V^ℓ·b
//! touches each basis element at most once; mixed arrows U^a·V^b (a, b > 0), which neither the
//! vertical complex C/(U) nor the horizontal complex C/(V) sees, may remain.
//!
//! The search works on bits. In a homogeneous basis every homogeneous map of a fixed degree
//! between two generators is 0 or the one monomial of the right degree, so ∂ and every basis
//! change are F2 matrices, and composition is their product. An elementary change replaces z
//! by z′ = z + m·x (m the monomial of degree gr(z) − gr(x), when there is one); in matrices,
//! ∂′ = E∂E with E = I + e_{z,x}: row z of ∂ gains row x, then column x gains column z. A
//! change with m = U^a (a > 0) leaves C/(U) untouched, one with m = V^b leaves C/(V)
//! untouched, and a mixed m touches neither: only constant changes (m = 1) move both at once.
//! The search is greedy: it applies the change that lowers the defect most (the number of
//! arrows beyond the first at each generator, horizontal and vertical counted apart), the
//! first in a fixed order on ties, until the defect is 0 or no change lowers it; then mixed
//! changes remove what mixed arrows they can. It proves nothing: the certificate carries the
//! new complex and the two inverse basis changes, and the checker verifies them.

use crate::notation::parse_poly;
use tubecert_format::{ComplexSpec, Grading, MapSpec, Mono, Term, UniqueMap};

/// The result: the complex in the new basis (generator z′ keeps the name and grading of z),
/// f: C → C′ and g: C′ → C with g∘f = id and f∘g = id exactly.
#[derive(Debug, Clone)]
pub struct Simplified {
    pub complex: ComplexSpec,
    pub forward: MapSpec,
    pub backward: MapSpec,
    /// Elementary changes made (0: the basis as written was already simplified).
    pub changes: usize,
}

/// The monomial exponents (a, b) with U^a·V^b of degree `to − from` in (gr_U, gr_V), if any.
fn exponents(from: &[i64], to: &[i64]) -> Option<(u32, u32)> {
    let (du, dv) = (from[0] - to[0], from[1] - to[1]);
    (du >= 0 && dv >= 0 && du % 2 == 0 && dv % 2 == 0).then_some(((du / 2) as u32, (dv / 2) as u32))
}

#[derive(Copy, Clone, PartialEq, Eq, Debug)]
enum Kind {
    Unit,
    Horizontal,
    Vertical,
    Mixed,
}

fn kind((a, b): (u32, u32)) -> Kind {
    match (a > 0, b > 0) {
        (false, false) => Kind::Unit,
        (true, false) => Kind::Horizontal,
        (false, true) => Kind::Vertical,
        (true, true) => Kind::Mixed,
    }
}

struct State {
    gr: Vec<[i64; 2]>,
    /// ∂: d[x][y] = 1 when ∂x has the term (monomial)·y.
    d: Vec<Vec<bool>>,
    /// Arrow kind from x to y (None: no monomial of that degree).
    arrow: Vec<Vec<Option<Kind>>>,
    /// new = b·old and old = inv·new (rows: vectors).
    b: Vec<Vec<bool>>,
    inv: Vec<Vec<bool>>,
    changes: usize,
}

impl State {
    fn n(&self) -> usize {
        self.gr.len()
    }

    /// (horizontal, vertical) arrow counts at each generator, and the number of mixed arrows.
    fn counts(&self) -> (Vec<u32>, Vec<u32>, usize) {
        let n = self.n();
        let (mut h, mut v, mut mixed) = (vec![0; n], vec![0; n], 0);
        for x in 0..n {
            for y in 0..n {
                if self.d[x][y] {
                    match self.arrow[x][y] {
                        Some(Kind::Horizontal) => {
                            h[x] += 1;
                            h[y] += 1;
                        }
                        Some(Kind::Vertical) => {
                            v[x] += 1;
                            v[y] += 1;
                        }
                        _ => mixed += 1,
                    }
                }
            }
        }
        (h, v, mixed)
    }

    /// The entries of ∂ that the change z += x flips.
    fn flips(&self, z: usize, x: usize) -> Vec<(usize, usize)> {
        let n = self.n();
        let mut out = Vec::new();
        // Row z gains row x (entry (z, x) is handled below).
        for k in (0..n).filter(|&k| k != x && self.d[x][k]) {
            out.push((z, k));
        }
        // Column x gains column z of E∂: for w ≠ z that is ∂'s own column z.
        for w in (0..n).filter(|&w| w != z && self.d[w][z]) {
            out.push((w, x));
        }
        // Entry (z, x): d[z][x] + d[x][x] + d[z][z] + d[x][z], the diagonal being 0.
        if self.d[x][z] {
            out.push((z, x));
        }
        out
    }

    /// Change in defect (over the generators touched) and in mixed arrows if z += x were made.
    fn delta(&self, z: usize, x: usize, h: &[u32], v: &[u32]) -> (i64, i64) {
        let flips = self.flips(z, x);
        let mut touched: Vec<(usize, i64, i64)> = Vec::new();
        let mut mixed = 0i64;
        let bump = |g: usize, dh: i64, dv: i64, t: &mut Vec<(usize, i64, i64)>| match t.iter_mut().find(|e| e.0 == g) {
            Some(e) => {
                e.1 += dh;
                e.2 += dv;
            }
            None => t.push((g, dh, dv)),
        };
        for &(p, q) in &flips {
            let s = if self.d[p][q] { -1 } else { 1 };
            match self.arrow[p][q] {
                Some(Kind::Horizontal) => {
                    bump(p, s, 0, &mut touched);
                    bump(q, s, 0, &mut touched);
                }
                Some(Kind::Vertical) => {
                    bump(p, 0, s, &mut touched);
                    bump(q, 0, s, &mut touched);
                }
                _ => mixed += s,
            }
        }
        let excess = |c: i64| (c - 1).max(0);
        let mut dd = 0;
        for (g, dh, dv) in touched {
            let (h0, v0) = (h[g] as i64, v[g] as i64);
            dd += excess(h0 + dh) - excess(h0) + excess(v0 + dv) - excess(v0);
        }
        (dd, mixed)
    }

    fn apply(&mut self, z: usize, x: usize) {
        debug_assert!(
            exponents(&self.gr[x], &self.gr[z]).is_some(),
            "bad move {z} += {x}: {:?} {:?}",
            self.gr[z],
            self.gr[x]
        );
        for (p, q) in self.flips(z, x) {
            self.d[p][q] = !self.d[p][q];
        }
        let n = self.n();
        for k in 0..n {
            if self.b[x][k] {
                self.b[z][k] = !self.b[z][k];
            }
        }
        for j in 0..n {
            if self.inv[j][z] {
                self.inv[j][x] = !self.inv[j][x];
            }
        }
        self.changes += 1;
    }

    /// Every allowed change z += x whose monomial is of one of `kinds`, in a fixed order.
    fn moves(&self, kinds: &[Kind]) -> Vec<(usize, usize)> {
        let n = self.n();
        let mut out = Vec::new();
        for z in 0..n {
            for x in (0..n).filter(|&x| x != z) {
                if exponents(&self.gr[x], &self.gr[z]).is_some_and(|e| kinds.contains(&kind(e))) {
                    out.push((z, x));
                }
            }
        }
        out
    }
}

/// A generator's place in the vertical complex: the source of an arrow of length ℓ to its
/// partner, its target, or neither (the generator of vertical homology).
#[derive(Copy, Clone, Debug)]
enum Role {
    Source(u32, usize),
    Target(u32, usize),
    Alone,
}

impl State {
    /// Length of the arrow x → y if it is of `k`.
    fn length(&self, x: usize, y: usize, k: Kind) -> Option<u32> {
        if !self.d[x][y] || self.arrow[x][y] != Some(k) {
            return None;
        }
        let target = [self.gr[x][0] - 1, self.gr[x][1] - 1];
        exponents(&self.gr[y], &target).map(|(a, b)| a.max(b))
    }

    fn roles(&self) -> Vec<Role> {
        let n = self.n();
        let mut r = vec![Role::Alone; n];
        for x in 0..n {
            for y in 0..n {
                if let Some(l) = self.length(x, y, Kind::Vertical) {
                    r[x] = Role::Source(l, y);
                    r[y] = Role::Target(l, x);
                }
            }
        }
        r
    }

    /// Pivot elimination of the arrows of kind `k` (Smith normal form over `F2[U]` or `F2[V]`),
    /// shortest arrows first. With `keep_vertical`, a constant change z += x is made only when
    /// it can keep a vertically simplified basis so (key(z) ≤ key(x)), with its repair.
    fn eliminate(&mut self, k: Kind, keep_vertical: bool, max_changes: usize) -> Result<(), String> {
        let n = self.n();
        loop {
            if self.changes >= max_changes {
                return Err(format!(
                    "no simultaneously simplified basis was found within {max_changes} changes of basis"
                ));
            }
            // Arrows of kind k, and how many touch each generator; an arrow whose two ends
            // have no other is done (a repair may undo that, so it is recomputed each round).
            let mut arrows = Vec::new();
            let mut touching = vec![0u32; n];
            for x in 0..n {
                for y in 0..n {
                    if let Some(l) = self.length(x, y, k) {
                        arrows.push((l, x, y));
                        touching[x] += 1;
                        touching[y] += 1;
                    }
                }
            }
            arrows.retain(|a| touching[a.1] > 1 || touching[a.2] > 1);
            let Some(&(l, _, _)) = arrows.iter().min() else { return Ok(()) };
            let roles = self.roles();
            let key = |g: usize| match roles[g] {
                Role::Source(l, _) => (0, l as i64),
                Role::Alone => (1, 0),
                Role::Target(l, _) => (2, -(l as i64)),
            };
            let shortest = arrows.iter().filter(|a| a.0 == l);
            let (x, y) = if keep_vertical {
                let x = shortest.clone().map(|a| a.1).max_by_key(|&x| (key(x), std::cmp::Reverse(x))).expect("one");
                let y = shortest.filter(|a| a.1 == x).map(|a| a.2).min_by_key(|&y| (key(y), y)).expect("one");
                (x, y)
            } else {
                let a = shortest.clone().next().expect("one");
                (a.1, a.2)
            };
            // Other arrows out of x: y absorbs their targets; other arrows into y: their
            // sources absorb x. Each is at least as long as x → y (none is done).
            let outs: Vec<usize> = (0..n).filter(|&y2| y2 != y && self.length(x, y2, k).is_some()).collect();
            let ins: Vec<usize> = (0..n).filter(|&w| w != x && self.length(w, y, k).is_some()).collect();
            for y2 in outs {
                self.change(y, y2, keep_vertical)?;
            }
            for w in ins {
                self.change(w, x, keep_vertical)?;
            }
        }
    }

    /// z += x, and when it is constant and the vertical form is to be kept, the repair.
    fn change(&mut self, z: usize, x: usize, keep_vertical: bool) -> Result<(), String> {
        let constant = exponents(&self.gr[x], &self.gr[z]).map(kind) == Some(Kind::Unit);
        if !(constant && keep_vertical) {
            self.apply(z, x);
            return Ok(());
        }
        let roles = self.roles();
        self.apply(z, x);
        match (roles[z], roles[x]) {
            (Role::Source(a, tz), Role::Source(b, tx)) if b >= a => self.apply(tz, tx),
            (Role::Target(a, sz), Role::Target(b, sx)) if a >= b => self.apply(sz, sx),
            (Role::Source(..), Role::Target(..) | Role::Alone) | (Role::Alone, Role::Target(..)) => {}
            _ => return Err("no simultaneously simplified basis was found: the horizontal simplification needs a change of basis that the vertical one does not allow".into()),
        }
        Ok(())
    }
}

fn defect(h: &[u32], v: &[u32]) -> i64 {
    h.iter().chain(v).map(|&c| (c as i64 - 1).max(0)).sum()
}

/// Looks for a simultaneously simplified basis of `c` (a complex over `F2[U,V]` with gradings
/// (gr_U, gr_V), already validated). `Err` says why none was found.
pub fn simplify(c: &ComplexSpec, max_changes: usize) -> Result<Simplified, String> {
    let names: Vec<&String> = c.generators.keys().collect();
    let index = |g: &str| names.binary_search_by(|n| n.as_str().cmp(g)).map_err(|_| format!("unknown generator {g}"));
    let gr: Vec<[i64; 2]> = c.generators.values().map(|g| [g[0], g[1]]).collect();
    let n = gr.len();
    let mut d = vec![vec![false; n]; n];
    let vars = ["U".to_string(), "V".to_string()];
    for [x, coef, y] in &c.differential {
        let (i, j) = (index(x)?, index(y)?);
        for _ in parse_poly(coef, &vars)? {
            d[i][j] = !d[i][j];
        }
    }
    let mut arrow = vec![vec![None; n]; n];
    for x in 0..n {
        for y in 0..n {
            // ∂ lowers (gr_U, gr_V) by (1, 1): U^a·V^b·y has the grading gr(x) − (1, 1).
            let target = [gr[x][0] - 1, gr[x][1] - 1];
            arrow[x][y] = exponents(&gr[y], &target).map(kind);
        }
    }
    let id = |n: usize| (0..n).map(|i| (0..n).map(|j| i == j).collect()).collect::<Vec<Vec<bool>>>();
    let mut s = State { gr, d, arrow, b: id(n), inv: id(n), changes: 0 };
    let units: Vec<(usize, usize)> = (0..n)
        .flat_map(|x| (0..n).map(move |y| (x, y)))
        .filter(|&(x, y)| s.d[x][y] && s.arrow[x][y] == Some(Kind::Unit))
        .collect();
    if let Some(&(x, y)) = units.first() {
        return Err(format!(
            "∂{} has the term 1·{}: the complex is not reduced (cancel its unit arrows first)",
            names[x], names[y]
        ));
    }
    // Vertical first (any change), then horizontal keeping the vertical form; the greedy
    // search below finishes what they leave, or gives the reason none was found.
    let start = (s.d.clone(), s.b.clone(), s.inv.clone(), s.changes);
    let eliminated =
        s.eliminate(Kind::Vertical, false, max_changes).and_then(|_| s.eliminate(Kind::Horizontal, true, max_changes));
    if eliminated.is_err() {
        (s.d, s.b, s.inv, s.changes) = start;
    }
    let main = s.moves(&[Kind::Unit, Kind::Horizontal, Kind::Vertical]);
    loop {
        let (h, v, _) = s.counts();
        if defect(&h, &v) == 0 {
            break;
        }
        if s.changes >= max_changes {
            return Err(format!("no simultaneously simplified basis was found within {max_changes} changes of basis"));
        }
        let best =
            main.iter().map(|&(z, x)| (s.delta(z, x, &h, &v), (z, x))).filter(|(d, _)| d.0 < 0).min_by_key(|(d, _)| *d);
        match best {
            Some((_, (z, x))) => s.apply(z, x),
            None => {
                let (k, g) = (0..n)
                    .find_map(|g| (h[g] > 1).then_some(("horizontal", g)).or((v[g] > 1).then_some(("vertical", g))))
                    .expect("a positive defect has a generator with two arrows of one kind");
                return Err(format!(
                    "no simultaneously simplified basis was found: no change of basis the search tries lowers the count of arrows beyond one per generator (in the best basis found, {} has {} {k} arrows)",
                    names[g],
                    if k == "horizontal" { h[g] } else { v[g] }
                ));
            }
        }
    }
    // Mixed arrows: changes by mixed monomials touch neither C/(U) nor C/(V).
    let mixed_moves = s.moves(&[Kind::Mixed]);
    loop {
        let (h, v, m) = s.counts();
        if m == 0 || s.changes >= max_changes {
            break;
        }
        let best = mixed_moves
            .iter()
            .map(|&(z, x)| (s.delta(z, x, &h, &v).1, (z, x)))
            .filter(|(d, _)| *d < 0)
            .min_by_key(|(d, _)| *d);
        match best {
            Some((_, (z, x))) => s.apply(z, x),
            None => break,
        }
    }
    Ok(render(c, &names, &s))
}

fn render(c: &ComplexSpec, names: &[&String], s: &State) -> Simplified {
    let n = s.n();
    let vars = ["U".to_string(), "V".to_string()];
    let mono = |from: usize, to: usize, shift: i64| -> String {
        let target = [s.gr[from][0] - shift, s.gr[from][1] - shift];
        let (a, b) = exponents(&s.gr[to], &target).expect("a set bit has its monomial");
        Mono([a, b]).render(&vars)
    };
    let terms = |m: &Vec<Vec<bool>>, shift: i64| -> Vec<Term> {
        let mut t = Vec::new();
        for i in 0..n {
            for j in 0..n {
                if m[i][j] {
                    t.push([names[i].clone(), mono(i, j, shift), names[j].clone()]);
                }
            }
        }
        t.sort();
        t
    };
    let generators: UniqueMap<Grading> = c.generators.clone();
    let complex = ComplexSpec { differential: terms(&s.d, 1), generators };
    let map =
        |m: &Vec<Vec<bool>>| MapSpec { degree: vec![0, 0], from: String::new(), terms: terms(m, 0), to: String::new() };
    // g: C′ → C sends new_i to Σ b[i][j]·old_j; f: C → C′ sends old_j to Σ inv[j][k]·new_k.
    Simplified { complex, forward: map(&s.inv), backward: map(&s.b), changes: s.changes }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::construct::{dual, staircase, tensor, torus_knot_exponents};
    use tubecert_format::bordered::full_ring;

    fn torus(p: u32, q: u32) -> ComplexSpec {
        staircase(&full_ring(), &torus_knot_exponents(p, q).unwrap()).unwrap()
    }

    fn report(name: &str, c: &ComplexSpec) -> Result<Simplified, String> {
        let r = simplify(c, 20_000);
        match &r {
            Ok(s) => {
                let mixed = s.complex.differential.iter().filter(|t| t[1].contains('U') && t[1].contains('V')).count();
                eprintln!("{name}: {} generators, {} changes, {} mixed", c.generators.len(), s.changes, mixed);
            }
            Err(e) => eprintln!("{name}: {e}"),
        }
        r
    }

    #[test]
    fn tensor_products_of_staircases() {
        let (t23, t25, t34) = (torus(2, 3), torus(2, 5), torus(3, 4));
        report("T23xT23", &tensor(&t23, &t23).unwrap()).unwrap();
        report("T23xT25", &tensor(&t23, &t25).unwrap()).unwrap();
        report("T34xT34v", &tensor(&t34, &dual(&t34)).unwrap()).unwrap();
        report("T23xT23v", &tensor(&t23, &dual(&t23)).unwrap()).unwrap();
        report("T34xT25", &tensor(&t34, &t25).unwrap()).unwrap();
        report("T23^3", &tensor(&tensor(&t23, &t23).unwrap(), &t23).unwrap()).unwrap();
        report("T34xT23v", &tensor(&t34, &dual(&t23)).unwrap()).unwrap();
        // Not found by this search (refused with the message, not a wrong answer).
        let e = report("T35xT34v", &tensor(&torus(3, 5), &dual(&t34)).unwrap()).unwrap_err();
        assert!(e.starts_with("no simultaneously simplified basis was found"), "{e}");
    }
}
