//! Type A modules CFA^- of patterns in the solid torus, computed from a genus-one doubly
//! pointed bordered Heegaard diagram (LOT = Lipshitz–Ozsváth–Thurston, *Bordered Heegaard
//! Floer homology*, Mem. AMS 2018, §11.4 for the doubly pointed modules).
//!
//! The diagram is the torus cut open along the two α arcs: the unit square, the vertical arc
//! (its sides x = 0 ≡ 1, idempotent ι0) and the horizontal arc (y = 0 ≡ 1, idempotent ι1), the
//! puncture at the corners. β is given as the cyclic word of its crossings with the α arcs;
//! between two crossings it is an arc of the square, so the word fixes β up to isotopy. The
//! corner regions of the puncture are labelled clockwise: the square's bottom-right corner 0
//! (the boundary basepoint z sits there), bottom-left 1, top-left 2, top-right 3.
//!
//! In genus one the rigid curves are embedded polygons in the universal cover (the plane, the
//! punctures at the lattice points; recalled from memory, and tested by the A∞ relations the
//! checker verifies and by the published facts on cables): one edge on a lift of β from y to x,
//! the other edges on the grid (α) from x to y, convex corners at x and y, no lattice point
//! inside, the domain on the left of its boundary. A lattice point on the α-edges is a Reeb
//! chord, the quadrants the domain covers there (never quadrant 0); the chords in boundary order
//! from x to y are the inputs, and m_{k+1}(x, ρ_{I1}, …, ρ_{Ik}) ∋ U^{n_w}·y. Operations of
//! every length come in families (prefix, repeat^n, suffix): they are enumerated up to a
//! length bound and recognized as families, which must reproduce the enumeration exactly.

use std::collections::{BTreeMap, BTreeSet, VecDeque};
use tubecert_format::bordered::{AGenerator, Alg, Family, TypeASpec};
use tubecert_format::UniqueMap;
use tubecheck::bordered::{gr_alg, gr_mul, gr_pow, Gr, GR_U, LAMBDA};

/// Which α arc a crossing lies on.
#[derive(Copy, Clone, Debug, PartialEq, Eq, PartialOrd, Ord)]
enum Arc {
    /// The vertical arc (sides of the square), generators in ι0.
    V,
    /// The horizontal arc (bottom and top), generators in ι1.
    H,
}

/// One crossing of β with an α arc: the arc, the rank along it (from the bottom for the
/// vertical arc, from the left for the horizontal one; 1-based) and the direction (+1: east
/// across the vertical arc, north across the horizontal one; −1: west, south).
#[derive(Copy, Clone, Debug)]
struct Crossing {
    arc: Arc,
    rank: usize,
    dir: i64,
}

/// A crossing lifted to the plane: (arc, rank, i, j); a vertical crossing lies on x = i between
/// (i, j) and (i, j + 1), a horizontal one on y = j between (i, j) and (i + 1, j).
type Lift = (Arc, usize, i64, i64);
type Cell = (i64, i64);

/// A genus-one doubly pointed bordered diagram, read and cut into regions.
pub struct Diagram {
    word: Vec<Crossing>,
    nv: usize,
    nh: usize,
    /// Chord k of the square (the β arc after crossing k): its ends as boundary positions.
    chords: Vec<(usize, usize)>,
    /// Region left and right of chord k (β oriented along the word).
    left: Vec<usize>,
    right: Vec<usize>,
    /// Region of each boundary interval (interval q runs from position q to q + 1).
    interval: Vec<usize>,
    nregions: usize,
    /// For each region: the chords on its boundary, and its boundary intervals.
    region_chords: Vec<Vec<usize>>,
    region_intervals: Vec<Vec<usize>>,
    z_region: usize,
    w_region: usize,
    /// Cell the β lift is in after crossing k (k < word length), crossing 0 entered from the
    /// cell (0, 0) minus its step.
    after: Vec<Cell>,
    /// Homology class of β: the cell shift after one turn.
    period: Cell,
}

/// The parsed input: the β word and the side interval holding w.
pub struct DiagramSpec {
    pub beta: Vec<String>,
    pub w: (String, usize),
}

impl Diagram {
    /// The number of crossings of β with the α arcs (the generators).
    pub fn crossings(&self) -> usize {
        self.word.len()
    }
    fn positions(&self) -> usize {
        2 * self.nh + 2 * self.nv + 4
    }
    fn tr(&self) -> usize {
        self.nh + self.nv + 2
    }
    fn tl(&self) -> usize {
        2 * self.nh + self.nv + 3
    }
    /// Boundary positions of the copies of a crossing: bottom/top for the horizontal arc,
    /// right/left side for the vertical one.
    fn copy(&self, arc: Arc, r: usize, second: bool) -> usize {
        match (arc, second) {
            (Arc::H, false) => r,                          // bottom
            (Arc::H, true) => self.tr() + self.nh + 1 - r, // top
            (Arc::V, false) => self.nh + 1 + r,            // right side
            (Arc::V, true) => self.tl() + self.nv + 1 - r, // left side
        }
    }
    /// (before, after) positions of a crossing: east across the vertical arc goes from the
    /// right side to the left side, north across the horizontal arc from the top to the bottom.
    fn ends(&self, c: Crossing) -> (usize, usize) {
        let (a, b) = (self.copy(c.arc, c.rank, false), self.copy(c.arc, c.rank, true));
        match (c.arc, c.dir > 0) {
            (Arc::V, true) | (Arc::H, false) => (a, b),
            (Arc::V, false) | (Arc::H, true) => (b, a),
        }
    }
    fn step(c: Crossing) -> Cell {
        match c.arc {
            Arc::V => (c.dir, 0),
            Arc::H => (0, c.dir),
        }
    }
    fn side_interval(&self, side: Side, s: usize) -> usize {
        match side {
            Side::Bottom => s,
            Side::Right => self.nh + 1 + s,
            Side::Top => self.tr() + self.nh - s,
            Side::Left => self.tl() + self.nv - s,
        }
    }

    /// Reads and checks a diagram: the β word (tokens `E3`, `W1`, `N2`, `S1`: direction letter
    /// and rank), each rank of each arc used exactly once, arcs of the square not crossing, β not
    /// null-homologous; w on a side interval of the square.
    pub fn read(spec: &DiagramSpec) -> Result<Diagram, String> {
        let mut word = Vec::new();
        for t in &spec.beta {
            let (d, r) = t.split_at(t.char_indices().nth(1).map_or(t.len(), |c| c.0));
            let (arc, dir) = match d {
                "E" => (Arc::V, 1),
                "W" => (Arc::V, -1),
                "N" => (Arc::H, 1),
                "S" => (Arc::H, -1),
                _ => return Err(format!("β crossing \"{t}\": expected E, W (the vertical α arc) or N, S (the horizontal one) and a rank, e.g. \"E1\"")),
            };
            let rank: usize = r
                .parse()
                .map_err(|_| format!("β crossing \"{t}\": the rank after the direction must be a positive integer"))?;
            word.push(Crossing { arc, rank, dir });
        }
        if word.is_empty() || word.len() > 64 {
            return Err("β must cross the α arcs between 1 and 64 times".into());
        }
        let count = |a: Arc| word.iter().filter(|c| c.arc == a).count();
        let (nv, nh) = (count(Arc::V), count(Arc::H));
        for a in [Arc::V, Arc::H] {
            let ranks: BTreeSet<usize> = word.iter().filter(|c| c.arc == a).map(|c| c.rank).collect();
            let n = count(a);
            if ranks.len() != n || ranks.iter().any(|&r| r == 0 || r > n) {
                let which = if a == Arc::V { "vertical (E/W)" } else { "horizontal (N/S)" };
                return Err(format!("β crossings of the {which} arc must have the ranks 1…{n}, each once"));
            }
        }
        let mut d = Diagram {
            word: word.clone(),
            nv,
            nh,
            chords: vec![],
            left: vec![],
            right: vec![],
            interval: vec![],
            nregions: 0,
            region_chords: vec![],
            region_intervals: vec![],
            z_region: 0,
            w_region: 0,
            after: vec![],
            period: (0, 0),
        };
        let l = word.len();
        d.chords = (0..l).map(|k| (d.ends(word[k]).1, d.ends(word[(k + 1) % l]).0)).collect();
        // Arcs of the square must not cross: no two chords with interleaved ends.
        let inside = |a: usize, b: usize, x: usize| if a < b { a < x && x < b } else { x > a || x < b };
        for i in 0..l {
            for j in i + 1..l {
                let (a, b) = d.chords[i];
                let (c, e) = d.chords[j];
                if inside(a, b, c) != inside(a, b, e) {
                    return Err(format!(
                        "β crosses itself: the arc from {} to {} crosses the arc from {} to {}",
                        spec.beta[i],
                        spec.beta[(i + 1) % l],
                        spec.beta[j],
                        spec.beta[(j + 1) % l]
                    ));
                }
            }
        }
        d.trace_regions();
        let mut cell = (0, 0);
        d.after = vec![(0, 0); l];
        for (k, &c) in word.iter().enumerate().skip(1) {
            let s = Self::step(c);
            cell = (cell.0 + s.0, cell.1 + s.1);
            d.after[k] = cell;
        }
        let s = Self::step(word[0]);
        d.period = (cell.0 + s.0, cell.1 + s.1);
        if d.period == (0, 0) {
            return Err("β is null-homologous in the torus (as many E as W and N as S crossings); it must be the meridian of the solid torus".into());
        }
        let side = match spec.w.0.as_str() {
            "bottom" => Side::Bottom,
            "top" => Side::Top,
            "left" => Side::Left,
            "right" => Side::Right,
            o => return Err(format!("w: side \"{o}\" is not bottom, top, left or right")),
        };
        let n = if matches!(side, Side::Bottom | Side::Top) { nh } else { nv };
        if spec.w.1 > n {
            return Err(format!("w: the {} side has intervals 0…{n}", spec.w.0));
        }
        d.w_region = d.interval[d.side_interval(side, spec.w.1)];
        d.z_region = d.interval[nh + 1]; // the corner after the bottom side: quadrant 0
        if d.w_region == d.z_region {
            return Err(
                "w lies in the region of z (the boundary basepoint, at the square's bottom-right corner)".into()
            );
        }
        Ok(d)
    }

    /// Regions of the square cut by the chords: walk the boundary counterclockwise, jumping
    /// along a chord at each of its ends.
    fn trace_regions(&mut self) {
        let n = self.positions();
        let mut other = vec![usize::MAX; n];
        for &(a, b) in &self.chords {
            other[a] = b;
            other[b] = a;
        }
        self.interval = vec![usize::MAX; n];
        let mut r = 0;
        for start in 0..n {
            if self.interval[start] != usize::MAX {
                continue;
            }
            let mut q = start;
            while self.interval[q] == usize::MAX {
                self.interval[q] = r;
                let end = (q + 1) % n;
                q = if other[end] == usize::MAX { end } else { other[end] };
            }
            r += 1;
        }
        self.nregions = r;
        // Chord P→Q: its left side holds the boundary from Q counterclockwise to P.
        self.left = self.chords.iter().map(|&(_, q)| self.interval[q]).collect();
        self.right = self.chords.iter().map(|&(p, _)| self.interval[p]).collect();
        self.region_chords = vec![vec![]; r];
        self.region_intervals = vec![vec![]; r];
        for k in 0..self.chords.len() {
            self.region_chords[self.left[k]].push(k);
            if self.right[k] != self.left[k] {
                self.region_chords[self.right[k]].push(k);
            }
        }
        for q in 0..n {
            self.region_intervals[self.interval[q]].push(q);
        }
    }

    fn lift_of(&self, n: i64) -> Lift {
        let l = self.word.len() as i64;
        let (k, m) = (n.rem_euclid(l) as usize, n.div_euclid(l));
        let c = self.word[k];
        let a = (self.after[k].0 + m * self.period.0, self.after[k].1 + m * self.period.1);
        let s = Self::step(c);
        let b = (a.0 - s.0, a.1 - s.1);
        match c.arc {
            Arc::V => (Arc::V, c.rank, a.0.max(b.0), a.1),
            Arc::H => (Arc::H, c.rank, a.0, a.1.max(b.1)),
        }
    }

    /// The index along the β lift through index 0's lift… of `y`, if y lies on that lift.
    fn index_of(&self, y: Lift) -> Option<i64> {
        let k = self.word.iter().position(|c| c.arc == y.0 && c.rank == y.1)?;
        let base = self.lift_of(k as i64);
        let (dx, dy) = (y.2 - base.2, y.3 - base.3);
        let (px, py) = self.period;
        let m = if px != 0 { dx / px } else { dy / py };
        (dx == m * px && dy == m * py).then_some(k as i64 + m * self.word.len() as i64)
    }

    fn cell_after(&self, n: i64) -> Cell {
        let l = self.word.len() as i64;
        let (k, m) = (n.rem_euclid(l) as usize, n.div_euclid(l));
        (self.after[k].0 + m * self.period.0, self.after[k].1 + m * self.period.1)
    }

    fn name(c: Crossing) -> String {
        match c.arc {
            Arc::V => format!("x{}", c.rank),
            Arc::H => format!("y{}", c.rank),
        }
    }
}

#[derive(Copy, Clone, Debug)]
enum Side {
    Bottom,
    Right,
    Top,
    Left,
}

/// The boundary of a candidate domain: β chords (cell, chord) and α unit pieces
/// (vertical: (i, j, s) on x = i, +1 northward; horizontal: (i, j, s) on y = j, +1 eastward).
#[derive(Default, Clone)]
struct Boundary {
    chords: BTreeMap<(Cell, usize), i64>,
    vert: BTreeMap<(i64, i64, usize), i64>,
    horiz: BTreeMap<(i64, i64, usize), i64>,
}

/// One operation: m(from, word) ∋ U^power·to (generators as indices into the word).
type Op = (usize, Vec<Alg>, usize, u32);

/// Direction of travel along the grid.
#[derive(Copy, Clone, PartialEq, Eq, Debug)]
enum Dir {
    N,
    E,
    S,
    W,
}

struct Search<'a> {
    d: &'a Diagram,
    /// Cells visited by the β lift through the start within the index window.
    beta_cells: BTreeSet<Cell>,
    start: i64,
    window: i64,
    max_len: usize,
    from: usize,
    ops: Vec<Op>,
}

impl Search<'_> {
    /// Walks one unit segment of the grid: `seg` = (arc, i, j) as in `Lift`, `dir` ±1,
    /// starting at point `r0` (0: the low lattice point, n + 1: the high one, else a crossing).
    fn walk(&mut self, seg: (Arc, i64, i64), dir: i64, r0: usize, path: &mut Boundary, word: &mut Vec<Alg>) {
        let (arc, i, j) = seg;
        let n = if arc == Arc::V { self.d.nv } else { self.d.nh };
        let left: Cell = match (arc, dir > 0) {
            (Arc::V, true) => (i - 1, j),
            (Arc::V, false) => (i, j),
            (Arc::H, true) => (i, j),
            (Arc::H, false) => (i, j - 1),
        };
        if !self.beta_cells.contains(&left) {
            return;
        }
        // The region on the left of every α piece is in the domain, so it is not z's.
        let side = match (arc, dir > 0) {
            (Arc::V, true) => Side::Right,
            (Arc::V, false) => Side::Left,
            (Arc::H, true) => Side::Bottom,
            (Arc::H, false) => Side::Top,
        };
        let mut added = Vec::new();
        let mut r = r0;
        let mut reached = false;
        loop {
            // Traverse the piece from point r towards r ± 1.
            let s = if dir > 0 { r } else { r - 1 };
            if self.d.interval[self.d.side_interval(side, s)] == self.d.z_region {
                break;
            }
            let key = (i, j, s);
            let map = if arc == Arc::V { &mut path.vert } else { &mut path.horiz };
            map.insert(key, dir);
            added.push(key);
            r = if dir > 0 { r + 1 } else { r - 1 };
            if r == 0 || r == n + 1 {
                reached = true;
                break;
            }
            self.candidate((arc, r, i, j), path, word);
        }
        // At a lattice point.
        let (pi, pj) = match (arc, dir > 0) {
            (Arc::V, true) => (i, j + 1),
            (Arc::V, false) => (i, j),
            (Arc::H, true) => (i + 1, j),
            (Arc::H, false) => (i, j),
        };
        let arriving = match (arc, dir > 0) {
            (Arc::V, true) => Dir::N,
            (Arc::V, false) => Dir::S,
            (Arc::H, true) => Dir::E,
            (Arc::H, false) => Dir::W,
        };
        if reached && word.len() < self.max_len {
            let turns: &[(Dir, Alg)] = match arriving {
                Dir::N => &[(Dir::W, Alg::Reeb(3, 3))],
                Dir::E => &[],
                Dir::S => &[(Dir::E, Alg::Reeb(1, 1)), (Dir::S, Alg::Reeb(1, 2)), (Dir::W, Alg::Reeb(1, 3))],
                Dir::W => &[(Dir::S, Alg::Reeb(2, 2)), (Dir::W, Alg::Reeb(2, 3))],
            };
            for &(out, a) in turns {
                word.push(a);
                match out {
                    Dir::N => self.walk((Arc::V, pi, pj), 1, 0, path, word),
                    Dir::E => self.walk((Arc::H, pi, pj), 1, 0, path, word),
                    Dir::S => self.walk((Arc::V, pi, pj - 1), -1, self.d.nv + 1, path, word),
                    Dir::W => self.walk((Arc::H, pi - 1, pj), -1, self.d.nh + 1, path, word),
                }
                word.pop();
            }
        }
        let map = if arc == Arc::V { &mut path.vert } else { &mut path.horiz };
        for k in added {
            map.remove(&k);
        }
    }

    /// The α path has reached the crossing `y`: if y is on the β lift of the start, close the
    /// boundary along β and keep the domain if it is an embedded polygon of the right kind.
    fn candidate(&mut self, y: Lift, alpha: &Boundary, word: &[Alg]) {
        let Some(ny) = self.d.index_of(y) else { return };
        if ny == self.start || (ny - self.start).abs() > self.window {
            return;
        }
        let (lo, hi, sign) = if ny < self.start { (ny, self.start, 1) } else { (self.start, ny, -1) };
        // A simple boundary: β between y and x meets the α path nowhere else.
        for n in lo + 1..hi {
            let (arc, r, i, j) = self.d.lift_of(n);
            let pieces = if arc == Arc::V { &alpha.vert } else { &alpha.horiz };
            if pieces.contains_key(&(i, j, r - 1)) || pieces.contains_key(&(i, j, r)) {
                return;
            }
        }
        let mut b = alpha.clone();
        let l = self.d.word.len() as i64;
        for n in lo..hi {
            b.chords.insert((self.d.cell_after(n), n.rem_euclid(l) as usize), sign);
        }
        let x = self.d.lift_of(self.start);
        if let Some(nw) = domain(self.d, &b, x, y) {
            let to = ny.rem_euclid(l) as usize;
            self.ops.push((self.from, word.to_vec(), to, nw));
        }
    }
}

/// Multiplicities of the 2-chain with boundary `b` (flood fill from outside, +1 crossing a
/// boundary edge from its right to its left); `Some(n_w)` when it is an embedded polygon
/// (multiplicities 0 and 1) avoiding z, convex at x and y.
fn domain(d: &Diagram, b: &Boundary, x: Lift, y: Lift) -> Option<u32> {
    let cells = b
        .chords
        .keys()
        .map(|k| k.0)
        .chain(b.vert.keys().flat_map(|&(i, j, _)| [(i - 1, j), (i, j)]))
        .chain(b.horiz.keys().flat_map(|&(i, j, _)| [(i, j), (i, j - 1)]));
    let (mut x0, mut x1, mut y0, mut y1) = (i64::MAX, i64::MIN, i64::MAX, i64::MIN);
    for (i, j) in cells {
        (x0, x1, y0, y1) = (x0.min(i), x1.max(i), y0.min(j), y1.max(j));
    }
    let (x0, y0, w, h) = (x0 - 1, y0 - 1, (x1 - x0 + 3) as usize, (y1 - y0 + 3) as usize);
    let nr = d.nregions;
    let idx = |i: i64, j: i64, r: usize| ((j - y0) as usize * w + (i - x0) as usize) * nr + r;
    let mut mult: Vec<Option<i64>> = vec![None; w * h * nr];
    let mut queue = VecDeque::new();
    mult[idx(x0, y0, 0)] = Some(0);
    queue.push_back((x0, y0, 0usize));
    while let Some((i, j, r)) = queue.pop_front() {
        let m = mult[idx(i, j, r)].expect("set");
        let mut next: Vec<(i64, i64, usize, i64)> = Vec::new();
        for &k in &d.region_chords[r] {
            let s = b.chords.get(&((i, j), k)).copied().unwrap_or(0);
            if d.right[k] == r {
                next.push((i, j, d.left[k], s));
            }
            if d.left[k] == r {
                next.push((i, j, d.right[k], -s));
            }
        }
        for &q in &d.region_intervals[r] {
            let (nh, nv) = (d.nh, d.nv);
            if q <= nh {
                let s = q; // bottom: to the cell below, across y = j
                let e = b.horiz.get(&(i, j, s)).copied().unwrap_or(0);
                next.push((i, j - 1, d.interval[d.side_interval(Side::Top, s)], -e));
            } else if q <= nh + 1 + nv {
                let s = q - nh - 1; // right side: across x = i + 1
                let e = b.vert.get(&(i + 1, j, s)).copied().unwrap_or(0);
                next.push((i + 1, j, d.interval[d.side_interval(Side::Left, s)], -e));
            } else if q <= d.tr() + nh {
                let s = d.tr() + nh - q; // top: across y = j + 1
                let e = b.horiz.get(&(i, j + 1, s)).copied().unwrap_or(0);
                next.push((i, j + 1, d.interval[d.side_interval(Side::Bottom, s)], e));
            } else {
                let s = d.tl() + nv - q; // left side: across x = i
                let e = b.vert.get(&(i, j, s)).copied().unwrap_or(0);
                next.push((i - 1, j, d.interval[d.side_interval(Side::Right, s)], e));
            }
        }
        for (a, c, r2, delta) in next {
            if a < x0 || c < y0 || a >= x0 + w as i64 || c >= y0 + h as i64 {
                if m + delta != 0 {
                    return None; // cannot happen: the boundary lies inside the box
                }
                continue;
            }
            let slot = &mut mult[idx(a, c, r2)];
            match *slot {
                None => {
                    *slot = Some(m + delta);
                    queue.push_back((a, c, r2));
                }
                Some(v) if v != m + delta => return None, // not a cycle: cannot happen
                _ => {}
            }
        }
    }
    let get = |i: i64, j: i64, r: usize| mult[idx(i, j, r)].unwrap_or(0);
    let mut nw = 0i64;
    for j in y0..y0 + h as i64 {
        for i in x0..x0 + w as i64 {
            for r in 0..nr {
                let v = get(i, j, r);
                if !(0..=1).contains(&v) || (r == d.z_region && v != 0) {
                    return None;
                }
                if r == d.w_region {
                    nw += v;
                }
            }
        }
    }
    // Convex corners: the polygon fills exactly one of the four corners at x and at y.
    let corners = |p: Lift| -> i64 {
        let (arc, r, i, j) = p;
        let pieces = [r - 1, r];
        match arc {
            Arc::V => pieces
                .iter()
                .map(|&s| {
                    get(i - 1, j, d.interval[d.side_interval(Side::Right, s)])
                        + get(i, j, d.interval[d.side_interval(Side::Left, s)])
                })
                .sum(),
            Arc::H => pieces
                .iter()
                .map(|&s| {
                    get(i, j, d.interval[d.side_interval(Side::Bottom, s)])
                        + get(i, j - 1, d.interval[d.side_interval(Side::Top, s)])
                })
                .sum(),
        }
    };
    (corners(x) == 1 && corners(y) == 1).then_some(nw as u32)
}

impl Diagram {
    /// Every operation whose input word has at most `max_len` elements, summed mod 2.
    fn operations(&self, max_len: usize) -> Vec<Op> {
        let l = self.word.len() as i64;
        let window = (max_len as i64 + 4) * l;
        let mut all: Vec<Op> = Vec::new();
        for k in 0..self.word.len() {
            let start = k as i64;
            let beta_cells: BTreeSet<Cell> =
                (start - window - l..start + window + l).map(|n| self.cell_after(n)).collect();
            let mut s = Search { d: self, beta_cells, start, window, max_len, from: k, ops: vec![] };
            let (arc, r, i, j) = self.lift_of(start);
            let mut path = Boundary::default();
            let mut word = Vec::new();
            s.walk((arc, i, j), 1, r, &mut path, &mut word);
            s.walk((arc, i, j), -1, r, &mut path, &mut word);
            all.append(&mut s.ops);
        }
        all.sort();
        let mut out: Vec<Op> = Vec::new();
        for op in all {
            if out.last() == Some(&op) {
                out.pop();
            } else {
                out.push(op);
            }
        }
        out
    }
}

/// A family: (from, prefix, repeat, suffix, to, [a, b]).
type Fam = (usize, Vec<Alg>, Vec<Alg>, Vec<Alg>, usize, [u32; 2]);

fn members(f: &Fam, max_len: usize) -> Vec<Op> {
    let (from, p, r, s, to, pw) = f;
    let mut out = Vec::new();
    for n in 0.. {
        let len = p.len() + n * r.len() + s.len();
        if len > max_len || (r.is_empty() && n > 0) {
            break;
        }
        let mut w = p.clone();
        (0..n).for_each(|_| w.extend_from_slice(r));
        w.extend_from_slice(s);
        out.push((*from, w, *to, pw[0] * n as u32 + pw[1]));
    }
    out
}

/// Groups operations enumerated up to `max_len` into families prefix·repeat^n·suffix with
/// U-power a·n + b: the shortest member of each family is split and the shortest repeated
/// block that extends it through every length up to `max_len` is taken. The families must give
/// back exactly the enumerated operations (else an error).
fn families(ops: &[Op], max_len: usize) -> Result<Vec<Fam>, String> {
    let set: BTreeSet<&Op> = ops.iter().collect();
    let mut by_ends: BTreeMap<(usize, usize), Vec<&Op>> = BTreeMap::new();
    for op in ops {
        by_ends.entry((op.0, op.2)).or_default().push(op);
    }
    let mut covered: BTreeSet<Op> = BTreeSet::new();
    let mut fams: Vec<Fam> = Vec::new();
    let mut sorted: Vec<&Op> = ops.iter().collect();
    sorted.sort_by_key(|o| (o.1.len(), o.0, o.2, o.1.clone(), o.3));
    for op in sorted {
        if covered.contains(op) {
            continue;
        }
        let (from, w, to, pw) = op;
        let mut found: Option<Fam> = None;
        'search: for rl in 1..=max_len.saturating_sub(w.len()) / 2 {
            for cut in 0..=w.len() {
                let (p, s) = (&w[..cut], &w[cut..]);
                // The member n = 1 fixes the repeated block and the step of the power.
                for o in &by_ends[&(*from, *to)] {
                    if o.1.len() != w.len() + rl || !o.1.starts_with(p) || !o.1.ends_with(s) || o.3 < *pw {
                        continue;
                    }
                    let f: Fam = (*from, p.to_vec(), o.1[cut..cut + rl].to_vec(), s.to_vec(), *to, [o.3 - pw, *pw]);
                    let m = members(&f, max_len);
                    if m.len() >= 3 && m.iter().all(|x| set.contains(x) && !covered.contains(x)) {
                        found = Some(f);
                        break 'search;
                    }
                }
            }
        }
        let f = found.unwrap_or((*from, w.clone(), vec![], vec![], *to, [0, *pw]));
        covered.extend(members(&f, max_len));
        fams.push(f);
    }
    let mut again: Vec<Op> = fams.iter().flat_map(|f| members(f, max_len)).collect();
    again.sort();
    let mut want = ops.to_vec();
    want.sort();
    if again != want {
        return Err("the operations found do not fall into families of one repeated block".into());
    }
    Ok(fams)
}

/// A pattern module as computed: the module (generator gradings in LOT's grading group G′,
/// written doubled, `[2j, 2p, 2q, 2a]`), and h_A, the grading of the generator of the
/// periodic domains (also doubled).
pub struct PatternModule {
    pub module: TypeASpec,
    pub period: Gr,
}

/// The module CFA^- of the diagram: generators named `x{rank}` (vertical arc, ι0) and
/// `y{rank}` (horizontal arc, ι1), operations as families, enumerated up to input words of
/// length `max_len`; gradings relative to the first generator of the word (the identity).
pub fn module(d: &Diagram, max_len: usize) -> Result<PatternModule, String> {
    let ops = d.operations(max_len);
    let fams = families(&ops, max_len)?;
    let (gr, period) = gradings(d, &ops, 0)?;
    let names: Vec<String> = d.word.iter().map(|&c| Diagram::name(c)).collect();
    let mut generators = BTreeMap::new();
    for (k, c) in d.word.iter().enumerate() {
        let idempotent = if c.arc == Arc::V { 0 } else { 1 };
        let grading =
            gr[k].iter().map(|&v| i64::try_from(v).map_err(|_| "grading out of range")).collect::<Result<_, _>>()?;
        generators.insert(names[k].clone(), AGenerator { grading, idempotent });
    }
    let s = |v: &[Alg]| v.iter().map(|a| a.name().to_string()).collect::<Vec<_>>();
    let mut operations: Vec<Family> = fams
        .iter()
        .map(|(from, p, r, sf, to, pw)| Family {
            from: names[*from].clone(),
            power: *pw,
            prefix: s(p),
            repeat: s(r),
            suffix: s(sf),
            to: names[*to].clone(),
        })
        .collect();
    operations.sort();
    let written = Some(period.iter().map(|&v| v as i64).collect());
    Ok(PatternModule { module: TypeASpec { generators: UniqueMap(generators), operations, period: written }, period })
}

/// The module of the (p, 1) cable pattern, p ≥ 1, from its genus-one diagram (`cable_diagram`).
/// Operations are enumerated up to length 2p + 6, which holds every family's fixed part and
/// three of its members (the family check needs them).
pub fn cable_module(p: usize) -> Result<PatternModule, String> {
    if p == 0 || p > 12 {
        return Err(format!("the (p, 1) cable pattern is built for 1 ≤ p ≤ 12, not p = {p}"));
    }
    module(&Diagram::read(&cable_diagram(p))?, 2 * p + 6)
}

/// g(B) of the domain of an operation m_{k+1}(x, a1, …, ak) ∋ U^n·y:
/// gr(a1)⋯gr(ak)·λ^(k−1)·gr(U)^(−n), so that gr(y) = gr(x)·g(B) modulo the periodic domains.
fn op_grading(word: &[Alg], n: u32) -> Gr {
    let g = word.iter().fold([0; 4], |g, &a| gr_mul(g, gr_alg(a)));
    let g = gr_mul(g, gr_pow(LAMBDA, word.len() as i128 - 1));
    gr_mul(g, gr_pow(GR_U, -(n as i128)))
}

/// Gradings of the generators relative to the base generator (grading identity), read from the
/// domains of the operations, and the generator h_A of the periodic domains' gradings (its
/// (p, q) part (0, 1)): every operation's domain must agree modulo the powers of h_A.
pub fn gradings(d: &Diagram, ops: &[Op], base: usize) -> Result<(Vec<Gr>, Gr), String> {
    let n = d.word.len();
    let mut gr: Vec<Option<Gr>> = vec![None; n];
    gr[base] = Some([0; 4]);
    let edges: Vec<(usize, usize, Gr)> = ops.iter().map(|(x, w, y, p)| (*x, *y, op_grading(w, *p))).collect();
    let mut changed = true;
    while changed {
        changed = false;
        for &(x, y, g) in &edges {
            match (gr[x], gr[y]) {
                (Some(a), None) => {
                    gr[y] = Some(gr_mul(a, g));
                    changed = true;
                }
                (None, Some(b)) => {
                    gr[x] = Some(gr_mul(b, gr_pow(g, -1)));
                    changed = true;
                }
                _ => {}
            }
        }
    }
    let names: Vec<String> = d.word.iter().map(|&c| Diagram::name(c)).collect();
    let gr: Vec<Gr> = gr
        .iter()
        .zip(&names)
        .map(|(g, nm)| g.ok_or(format!("generator {nm} is joined to {} by no operation found", names[base])))
        .collect::<Result<_, _>>()?;
    // Each operation closes a loop: gr(x)·g·gr(y)^(−1) must be a power of h_A.
    let loops: Vec<Gr> = edges.iter().map(|&(x, y, g)| gr_mul(gr_mul(gr[x], g), gr_pow(gr[y], -1))).collect();
    let k = loops.iter().filter(|c| c[2] != 0).map(|c| c[2].abs()).min().ok_or("no periodic domain found")?;
    let c = loops.iter().find(|c| c[2].abs() == k).expect("found");
    let s = c[2].signum() * k / 2; // q of c is s·1: h_A = c / s, q(h_A) = 1
    if k % 2 != 0 || c.iter().any(|v| v % s != 0) {
        return Err("the periodic domains' gradings are not powers of one element with (p, q) = (0, 1)".into());
    }
    let h: Gr = [c[0] / s, c[1] / s, c[2] / s, c[3] / s];
    for c in &loops {
        if c[2] % 2 != 0 || *c != gr_pow(h, c[2] / 2) {
            return Err(format!("an operation's domain has grading {c:?}, not a power of h_A = {h:?}"));
        }
    }
    Ok((gr, h))
}

/// The β word and w of the diagram of the (p, 1) cable pattern: β crosses the vertical arc once
/// (E1), then the horizontal arc p − 1 times southward and p − 1 times northward at ranks
/// 1 … 2p − 2 from the left; w in the cup between ranks p − 1 and p under the top side (for
/// p = 1, β is parallel to the horizontal arc and w above it).
pub fn cable_diagram(p: usize) -> DiagramSpec {
    let mut beta = vec!["E1".to_string()];
    beta.extend((1..p).map(|r| format!("S{r}")));
    beta.extend((p..2 * p - 1).map(|r| format!("N{r}")));
    let w = if p == 1 { ("top".to_string(), 0) } else { ("top".to_string(), p - 1) };
    DiagramSpec { beta, w }
}

/// A rational number num/den (den > 0), for the exact positions of crossings.
#[derive(Copy, Clone, Debug)]
struct Q(i128, i128);

impl Q {
    fn new(num: i128, den: i128) -> Q {
        if den < 0 {
            Q(-num, -den)
        } else {
            Q(num, den)
        }
    }
    fn cmp(self, o: Q) -> std::cmp::Ordering {
        (self.0 * o.1).cmp(&(o.0 * self.1))
    }
    /// The value modulo m (an integer), in [0, m).
    fn modulo(self, m: i128) -> Q {
        Q(self.0.rem_euclid(m * self.1), self.1)
    }
}

/// The diagram of the torus knot pattern of slope (−r, p), built by pushing (see
/// `torus_pattern_diagram`): the straight closed curve c of direction (−r, p) through the point
/// z = (d − e, e) next to the corner (1, 0) (units of 1/d) is cut at W = z + T·(−r, p) into
/// c2 (z to W, inside the square) and c1 (W to z + d·(−r, p), in the universal cover); β is the
/// horizontal circle y = h dragged along c1 by the point W: each crossing of c1 with y ≡ h
/// becomes a finger of β that follows c1 back to W and goes around it (the finger of the
/// crossing nearest W outermost).
fn pushed_diagram(p: i64, r: i64, d: i64, e: i64, t: i64, h: i64) -> DiagramSpec {
    let (p, r, d, e, t, h) = (p as i128, r as i128, d as i128, e as i128, t as i128, h as i128);
    let (wx, wy) = (d - e - r * t, e + p * t);
    let (ux, uy) = (-r * (d - t), p * (d - t));
    let a = -r;
    // Crossings of c1 with the α lines: (s along c1, arc, position along the arc mod d).
    let mut events: Vec<(Q, Arc, Q)> = Vec::new();
    let ks: Vec<i128> = (1 + a..=0).collect();
    for k in ks {
        let s = Q::new(k * d - wx, ux);
        events.push((s, Arc::V, Q::new(wy * ux + (k * d - wx) * uy, ux).modulo(d)));
    }
    for k in 1..=p {
        let s = Q::new(k * d - wy, uy);
        events.push((s, Arc::H, Q::new(wx * uy + (k * d - wy) * ux, uy).modulo(d)));
    }
    events.sort_by(|x, y| x.0.cmp(y.0));
    // Fingers: c1 meets y = h + jd at s_j; ordered along β (eastward) by x mod d.
    let mut fingers: Vec<(Q, Q)> = Vec::new();
    for j in 0..p + 1 {
        let y = h + j * d;
        if y > wy && y < p * d + e {
            let s = Q::new(y - wy, uy);
            fingers.push((s, Q::new(wx * uy + (y - wy) * ux, uy).modulo(d)));
        }
    }
    // Nesting depth: the finger with the smallest s is the outermost.
    let mut by_s: Vec<usize> = (0..fingers.len()).collect();
    by_s.sort_by(|&i, &j| fingers[i].0.cmp(fingers[j].0));
    let depth = |f: usize| (fingers.len() - by_s.iter().position(|&g| g == f).expect("finger")) as i128;
    let mut order: Vec<usize> = (0..fingers.len()).collect();
    order.sort_by(|&i, &j| fingers[i].1.cmp(fingers[j].1));
    // Crossings of β in order: (arc, position, offset along the arc, direction +1/−1).
    let left_sign = if ux > 0 { 1 } else { -1 }; // offset of c1's left side along α_V
    let mut beta: Vec<(Arc, Q, i128, i64)> = vec![(Arc::V, Q::new(h, 1), 0, 1)];
    let mut w_pair = None;
    for &f in &order {
        let (s, _) = fingers[f];
        let on: Vec<&(Q, Arc, Q)> = events.iter().filter(|e| e.0.cmp(s).is_lt()).collect();
        let dp = depth(f);
        let (ldir, rdir) = if ux > 0 { (-1, 1) } else { (1, -1) };
        let start = beta.len();
        for e in on.iter().rev() {
            match e.1 {
                Arc::V => beta.push((Arc::V, e.2, left_sign * dp, ldir)),
                Arc::H => beta.push((Arc::H, e.2, -dp, -1)),
            }
        }
        let mid = beta.len();
        for e in &on {
            match e.1 {
                Arc::V => beta.push((Arc::V, e.2, -left_sign * dp, rdir)),
                Arc::H => beta.push((Arc::H, e.2, dp, 1)),
            }
        }
        // The innermost finger's crossings next to W: the last of the way out, the first back.
        if dp == 1 && mid > start {
            w_pair = Some((mid - 1, mid));
        }
    }
    // Ranks along each arc.
    let mut rank = vec![0usize; beta.len()];
    for arc in [Arc::V, Arc::H] {
        let mut idx: Vec<usize> = (0..beta.len()).filter(|&i| beta[i].0 == arc).collect();
        idx.sort_by(|&i, &j| beta[i].1.cmp(beta[j].1).then(beta[i].2.cmp(&beta[j].2)));
        for (r, &i) in idx.iter().enumerate() {
            rank[i] = r + 1;
        }
    }
    let tokens = beta
        .iter()
        .zip(&rank)
        .map(|(c, r)| {
            let l = match (c.0, c.3 > 0) {
                (Arc::V, true) => "E",
                (Arc::V, false) => "W",
                (Arc::H, true) => "N",
                (Arc::H, false) => "S",
            };
            format!("{l}{r}")
        })
        .collect();
    let side = match events.first().map(|e| e.1) {
        Some(Arc::H) => "top",
        _ if ux > 0 => "right",
        _ => "left",
    };
    let interval = w_pair.map_or(0, |(i, j)| rank[i].min(rank[j]));
    DiagramSpec { beta: tokens, w: (side.to_string(), interval) }
}

/// The largest p for which the (p, r) patterns with r ≢ 1 mod p are built (their diagrams have
/// about p² crossings, and the enumeration of their operations grows quickly with it).
pub const MAX_P_TORUS: usize = 5;

/// The diagram of the (p, r) cable pattern, 2 ≤ r ≤ p − 1, gcd(p, r) = 1, by pushing
/// (`pushed_diagram`): the torus knot of slope (−r, p) on the Heegaard torus, z next to the corner
/// (1, 0) at (1 − 1/d, 1/d), W halfway up the square on the line of c, β at half W's height.
/// Any such generic choice gives the same knot (c stays one straight closed curve missing the
/// punctures); these numbers only fix one diagram. Derivation in DEVELOPERS.md, "Torus-knot
/// patterns by pushing".
pub fn torus_pattern_diagram(p: usize, r: usize) -> Result<DiagramSpec, String> {
    if p < 2 || r == 0 || r >= p || crate::construct::gcd(p as u32, r as u32) != 1 {
        return Err(format!("the (p, r) torus pattern diagram needs 1 ≤ r < p with gcd(p, r) = 1, not ({p}, {r})"));
    }
    let (p, r) = (p as i64, r as i64);
    let d = 1000;
    let t = d / 2 / p;
    Ok(pushed_diagram(p, r, d, 1, t, (1 + p * t) / 2))
}

/// The module of the (p, r) cable pattern (1 ≤ r < p, gcd(p, r) = 1, or p = r = 1): r = 1 by
/// `cable_module`, the others from `torus_pattern_diagram` (p ≤ `MAX_P_TORUS`), enumerated up to
/// length 2p + 8 (every family's fixed part and three of its members).
pub fn torus_pattern_module(p: usize, r: usize) -> Result<PatternModule, String> {
    if r == 1 || p == 1 {
        return cable_module(p);
    }
    if p > MAX_P_TORUS {
        return Err(format!("the (p, r) cable patterns with r ≢ 1 mod p are built for p ≤ {MAX_P_TORUS}, not p = {p}"));
    }
    module(&Diagram::read(&torus_pattern_diagram(p, r)?)?, 2 * p + 8)
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::cell::Cell;
    use tubecheck::bordered as checked;

    fn a_infinity(m: &TypeASpec, len: u32) -> Result<(), String> {
        let a = checked::read_module("M", m, true)?;
        let b = checked::Budget(Cell::new(1 << 40), Cell::new(0), Cell::new(0));
        checked::check_module(&b, &a, len).map_err(|(checked::Failure::False(e) | checked::Failure::Refused(e))| e)
    }

    // The A∞ relations (LOT ch. 2) of the (p, 1) cable pattern modules, p = 1 … 5, by the checker.
    #[test]
    fn cable_pattern_modules_satisfy_the_a_infinity_relations() {
        for p in 1..=5 {
            let m = cable_module(p).unwrap();
            // 2p − 1 generators: one in ι0, 2p − 2 in ι1 (the diagram's crossings).
            assert_eq!(m.module.generators.len(), 2 * p - 1);
            a_infinity(&m.module, 24).unwrap_or_else(|e| panic!("p = {p}: {e}"));
            // One more power of U on any one family breaks a relation.
            for k in 0..m.module.operations.len() {
                let mut bad = m.module.clone();
                bad.operations[k].power[1] += 1;
                assert!(a_infinity(&bad, 24).is_err(), "p = {p}: family {k} with one more U still passes");
            }
        }
    }

    // The (p, r) patterns with r ≢ 1 mod p (their diagrams by pushing): the A∞ relations (LOT
    // ch. 2) by the checker, and one more U on a family breaks them.
    #[test]
    fn torus_pattern_modules_satisfy_the_a_infinity_relations() {
        for (p, r) in [(3, 2), (4, 3), (5, 2)] {
            let m = torus_pattern_module(p, r).unwrap();
            a_infinity(&m.module, 14).unwrap_or_else(|e| panic!("({p}, {r}): {e}"));
            let mut bad = m.module.clone();
            bad.operations[0].power[1] += 1;
            assert!(a_infinity(&bad, 14).is_err(), "({p}, {r}): a family with one more U still passes");
        }
        assert!(torus_pattern_diagram(4, 2).err().unwrap().contains("gcd"));
        assert!(torus_pattern_module(6, 5).err().unwrap().contains("p ≤ 5"));
    }

    // p = 1 is the core of the solid torus: the same module as `core_module` up to the name of
    // its generator, grading identity and h_A = (3/2; 0, 1; 1).
    #[test]
    fn the_diagram_of_p_1_gives_the_core_module() {
        let m = cable_module(1).unwrap();
        let core = super::super::core_module();
        assert_eq!(m.module.operations.len(), 1);
        let (f, g) = (&m.module.operations[0], &core.operations[0]);
        assert_eq!((&f.prefix, &f.repeat, &f.suffix, f.power), (&g.prefix, &g.repeat, &g.suffix, g.power));
        assert_eq!(m.module.generators.get("x1").unwrap().grading, vec![0, 0, 0, 0]);
        assert_eq!(m.period, [3, 0, 2, 2]);
    }

    // The group law: gr(ρ1)·gr(ρ2) = gr(ρ12), gr(ρ2)·gr(ρ3) = gr(ρ23), gr(ρ12)·gr(ρ3) =
    // gr(ρ1)·gr(ρ23) = gr(ρ123) = (−½; ½, ½) (LOT §11.1, recalled from memory).
    #[test]
    fn reeb_gradings_multiply() {
        assert_eq!(gr_alg(Alg::Reeb(1, 2)), [-1, 2, 0, 0]);
        assert_eq!(gr_alg(Alg::Reeb(2, 3)), [-1, 0, 2, 0]);
        assert_eq!(gr_alg(Alg::Reeb(1, 3)), [-1, 1, 1, 0]);
        assert_eq!(gr_mul(gr_alg(Alg::Reeb(1, 1)), gr_alg(Alg::Reeb(2, 3))), gr_alg(Alg::Reeb(1, 3)));
    }

    #[test]
    fn bad_diagrams_are_refused_with_a_reason() {
        let spec = |b: &[&str], w: (&str, usize)| DiagramSpec {
            beta: b.iter().map(|s| s.to_string()).collect(),
            w: (w.0.to_string(), w.1),
        };
        let err = |b: &[&str], w: (&str, usize)| Diagram::read(&spec(b, w)).err().unwrap();
        assert!(err(&["E2"], ("top", 0)).contains("ranks 1…1"));
        assert!(err(&["Q1"], ("top", 0)).contains("expected E, W"));
        assert!(err(&["E1", "W2"], ("top", 0)).contains("null-homologous"));
        assert!(err(&["E1"], ("bottom", 0)).contains("region of z"));
        assert!(err(&["E1"], ("top", 3)).contains("intervals 0…0"));
        // S1 then N2 with the arcs drawn crossing: E1 S2 N1 makes the arc from S2 to N1 cross.
        assert!(err(&["E1", "S2", "N1"], ("top", 1)).contains("crosses itself"));
    }
}
