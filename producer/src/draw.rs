//! `tubecert draw`: a complex as an SVG picture, to scale.
//!
//! - Over `F2[U,V]`: the plane of the two filtration levels. An arrow x → U^a·V^b·y goes a units
//!   left and b units down, so U arrows are horizontal, V arrows vertical and mixed monomials
//!   diagonal, and a U^3 arrow is three times as long as a U arrow. Positions are solved along
//!   the arrows (each connected piece starts at (−gr_U/2, −gr_V/2) of its first generator); an
//!   arrow whose coefficient is a sum, or that no placement can draw to scale, is dashed.
//! - Otherwise: the lattice of the gradings to scale, the second grading (Alexander) across and
//!   the first (Maslov) up, one unit per grading step.
//!
//! Generators at one point are stacked (offset circles, with the count) and named in one label;
//! labels are placed where they collide with no other label and no circle. A legend explains
//! the colours and the highlighted witness. Above `max_generators` the picture is a summary:
//! how many generators sit in each cell, and the arrows counted by kind.

use crate::notation::parse_poly;
use std::collections::{BTreeMap, BTreeSet, VecDeque};
use std::fmt::Write as _;
use tubecert_format::{Claim, ComplexSpec, Ring, Term};

/// The default size above which `draw` writes a summary instead of every generator.
pub const DEFAULT_MAX_GENERATORS: usize = 400;

/// Pixels per unit of the plane or the lattice.
pub const UNIT: f64 = 40.0;
const RADIUS: f64 = 7.0;
const FONT: f64 = 11.0;
/// Width of a character at [`FONT`], generous so that boxes contain the rendered text.
const CHAR_W: f64 = 7.0;

/// The kind of an arrow, which sets its colour.
#[derive(Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Debug)]
enum Kind {
    Unit,
    First,
    Second,
    Mixed,
    Sum,
}

impl Kind {
    fn colour(self) -> &'static str {
        match self {
            Kind::Unit => "#555555",
            Kind::First => "#1a5fb4",
            Kind::Second => "#26a269",
            Kind::Mixed => "#9141ac",
            Kind::Sum => "#c64600",
        }
    }
}

/// Names of the generators of `complex` that a claim's witness involves.
pub fn support(claim: &Claim, complex: &str, body: &tubecert_format::Body) -> BTreeSet<String> {
    let mut out = BTreeSet::new();
    let mut take = |terms: &[Term], from: &str, to: &str| {
        for [x, _, y] in terms {
            if from == complex {
                out.insert(x.clone());
            }
            if to == complex {
                out.insert(y.clone());
            }
        }
    };
    let ends = |m: &str| body.maps.get(m).map(|s| (s.from.clone(), s.to.clone())).unwrap_or_default();
    match claim {
        Claim::TorsionOrder { maps, witness, .. } => {
            let (f, t) = ends(&maps[0]);
            take(&witness.homotopy, &f, &t);
            if let Some(y) = &witness.dual {
                take(y, &f, &t);
            }
        }
        Claim::NullHomotopic { map, witness, .. } => {
            let first = first_name(map);
            let (f, t) = ends(&first);
            take(&witness.homotopy, &f, &t);
        }
        Claim::NotNullHomotopic { map, witness, .. } => {
            let (f, t) = ends(&first_name(map));
            take(&witness.dual, &f, &t);
        }
        Claim::Homology { complex: c, witness, .. }
        | Claim::Tau { complex: c, witness, .. }
        | Claim::TorsionOrderOfComplex { complex: c, witness, .. } => {
            take(&witness.basis, "", c);
        }
        Claim::HomotopyEquivalence { maps, witness, .. } => {
            let (f, t) = ends(&maps[0]);
            take(&witness.source_homotopy, &f, &f);
            take(&witness.target_homotopy, &t, &t);
        }
        _ => {}
    }
    out
}

fn first_name(e: &tubecert_format::MapExpr) -> String {
    use tubecert_format::MapExpr::*;
    match e {
        Named(n) => n.clone(),
        Id(_) => String::new(),
        Sum(es) | Compose(es) => es.last().map(first_name).unwrap_or_default(),
        Times(_, e) => first_name(e),
    }
}

/// A picture and, when it is a summary, the sentence saying so (for the terminal too).
pub struct Drawing {
    pub svg: String,
    pub note: Option<String>,
}

/// Draws complex `name` of a problem or certificate file; `highlight` is a 1-based claim number
/// (certificates only); above `max_generators` generators a summary is drawn.
pub fn draw_file(
    path: &std::path::Path,
    name: &str,
    highlight: Option<usize>,
    max_generators: usize,
) -> Result<Drawing, Vec<String>> {
    let file = path.display().to_string();
    let bytes = tubecert_format::limits::read_file(path).map_err(|e| vec![format!("{file}: {e}")])?;
    let is_cert = serde_json::from_slice::<serde_json::Value>(&bytes)
        .is_ok_and(|v| v["format"] == tubecert_format::CERTIFICATE_FORMAT);
    let (ring, complexes, claims, body) = if is_cert {
        let cert = tubecheck::parse_certificate(&bytes).map_err(|e| vec![format!("{file}: {e}")])?;
        (cert.body.ring.clone(), cert.body.complexes.clone(), cert.body.claims.clone(), Some(cert.body))
    } else {
        let p = crate::problem::parse_problem(&bytes, &file)?;
        (p.ring, p.complexes, vec![], None)
    };
    let c = complexes.get(name).ok_or_else(|| {
        vec![format!("{file}: no complex \"{name}\"{}", tubecheck::report_terms::suggest(name, complexes.keys()))]
    })?;
    let (lit, caption) = match (highlight, &body) {
        (None, _) => (BTreeSet::new(), String::new()),
        (Some(k), Some(b)) => {
            let claim = claims
                .get(k.wrapping_sub(1))
                .ok_or_else(|| vec![format!("{file}: there is no claim {k} (it has {})", claims.len())])?;
            // A long statement (a big homology) is cut so that it does not set the picture's width.
            let statement: String = claim.statement().chars().take(80).collect();
            let cut = if statement.len() < claim.statement().len() { "…" } else { "" };
            (support(claim, name, b), format!("claim {k}, {statement}{cut}"))
        }
        (Some(_), None) => {
            return Err(vec![format!("{file}: --highlight needs a certificate (claims carry the witnesses)")])
        }
    };
    Ok(draw(&ring, name, c, &lit, &caption, max_generators))
}

fn esc(s: &str) -> String {
    s.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
}

/// One arrow of ∂ as drawn: its ends, exponents (when one monomial) and kind.
struct Arrow<'a> {
    from: &'a str,
    to: &'a str,
    coef: &'a str,
    exps: Option<[u32; 2]>,
    kind: Kind,
}

fn arrows<'a>(ring: &Ring, c: &'a ComplexSpec) -> Vec<Arrow<'a>> {
    c.differential
        .iter()
        .map(|[x, coef, y]| {
            let monos = parse_poly(coef, &ring.variables).unwrap_or_default();
            let exps = (monos.len() == 1).then(|| monos[0].0);
            let kind = match exps {
                None => Kind::Sum,
                Some([0, 0]) => Kind::Unit,
                Some([_, 0]) => Kind::First,
                Some([0, _]) => Kind::Second,
                Some(_) => Kind::Mixed,
            };
            Arrow { from: x, to: y, coef, exps, kind }
        })
        .collect()
}

/// Positions in units (y up), and which arrows are drawn to scale.
struct Placement<'a> {
    at: BTreeMap<&'a str, (f64, f64)>,
    to_scale: Vec<bool>,
    plane: bool,
}

fn place<'a>(ring: &Ring, c: &'a ComplexSpec, arrows: &[Arrow<'a>]) -> Placement<'a> {
    let g = |x: &str, i: usize| c.generators.get(x).and_then(|g| g.get(i)).copied().unwrap_or(0) as f64;
    if ring.variables.len() != 2 {
        let at: BTreeMap<&str, (f64, f64)> = c
            .generators
            .keys()
            .map(|x| (x.as_str(), if ring.gradings.len() >= 2 { (g(x, 1), g(x, 0)) } else { (0.0, g(x, 0)) }))
            .collect();
        return Placement { at, to_scale: vec![true; arrows.len()], plane: false };
    }
    // The plane: solve p(y) = p(x) − (a, b) along a spanning forest, in name order.
    let mut adj: BTreeMap<&str, Vec<(&str, f64, f64)>> = BTreeMap::new();
    for a in arrows {
        if let Some([u, v]) = a.exps {
            adj.entry(a.from).or_default().push((a.to, -(u as f64), -(v as f64)));
            adj.entry(a.to).or_default().push((a.from, u as f64, v as f64));
        }
    }
    let mut at: BTreeMap<&str, (f64, f64)> = BTreeMap::new();
    for root in c.generators.keys() {
        if at.contains_key(root.as_str()) {
            continue;
        }
        at.insert(root, (-g(root, 0) / 2.0, -g(root, 1) / 2.0));
        let mut queue = VecDeque::from([root.as_str()]);
        while let Some(x) = queue.pop_front() {
            let p = at[x];
            for &(y, dx, dy) in adj.get(x).into_iter().flatten() {
                if !at.contains_key(y) && c.generators.contains_key(y) {
                    at.insert(y, (p.0 + dx, p.1 + dy));
                    queue.push_back(y);
                }
            }
        }
    }
    let to_scale = arrows
        .iter()
        .map(|a| match (a.exps, at.get(a.from), at.get(a.to)) {
            (Some([u, v]), Some(p), Some(q)) => {
                (p.0 - q.0 - u as f64).abs() < 1e-9 && (p.1 - q.1 - v as f64).abs() < 1e-9
            }
            _ => false,
        })
        .collect();
    Placement { at, to_scale, plane: true }
}

/// Axis-aligned boxes already taken, for placing labels where nothing else is.
#[derive(Default)]
struct Taken(Vec<[f64; 4]>);

impl Taken {
    fn free(&self, b: [f64; 4]) -> bool {
        self.0.iter().all(|o| b[2] <= o[0] || o[2] <= b[0] || b[3] <= o[1] || o[3] <= b[1])
    }

    /// A free spot for a text of `w` × `h` near (x, y): rings of candidates, nearest first.
    fn spot(&mut self, x: f64, y: f64, w: f64, h: f64) -> (f64, f64) {
        let dirs =
            [(1.0, 0.0), (1.0, -1.0), (1.0, 1.0), (-1.0, 0.0), (-1.0, -1.0), (-1.0, 1.0), (0.0, -1.0), (0.0, 1.0)];
        for ring in 1..200 {
            let d = RADIUS + 3.0 + (ring - 1) as f64 * 9.0;
            for (dx, dy) in dirs {
                // The box beside the point in direction (dx, dy), d away.
                let left = if dx > 0.0 {
                    x + d
                } else if dx < 0.0 {
                    x - d - w
                } else {
                    x - w / 2.0
                };
                let top = if dy > 0.0 {
                    y + d * 0.7
                } else if dy < 0.0 {
                    y - d * 0.7 - h
                } else {
                    y - h / 2.0
                };
                let b = [left, top, left + w, top + h];
                if self.free(b) {
                    self.0.push(b);
                    return (left, top);
                }
            }
        }
        // Unreachable in practice (rings grow without bound); stack below everything.
        let bottom = self.0.iter().map(|b| b[3]).fold(y, f64::max);
        self.0.push([x, bottom, x + w, bottom + h]);
        (x, bottom)
    }
}

/// Text width at [`FONT`].
fn width(s: &str) -> f64 {
    CHAR_W * s.chars().count() as f64
}

/// The SVG picture of a complex (a summary above `max_generators`).
pub fn draw(
    ring: &Ring,
    name: &str,
    c: &ComplexSpec,
    highlight: &BTreeSet<String>,
    caption: &str,
    max_generators: usize,
) -> Drawing {
    let arrows = arrows(ring, c);
    let placed = place(ring, c, &arrows);
    if c.generators.len() > max_generators {
        return summary(ring, name, c, &arrows, &placed, max_generators);
    }
    // Points (in half units) and the generators at each, in name order.
    let key = |p: (f64, f64)| ((p.0 * 2.0).round() as i64, (p.1 * 2.0).round() as i64);
    let mut points: BTreeMap<(i64, i64), Vec<&str>> = BTreeMap::new();
    for (&x, &p) in &placed.at {
        points.entry(key(p)).or_default().push(x);
    }
    let (min_x, max_x, min_y, max_y) = bounds(points.keys());
    let top = 70.0;
    let left = 70.0;
    // Pixel position of a point given in units.
    let px = |p: (f64, f64)| (left + (p.0 - min_x) * UNIT, top + (max_y - p.1) * UNIT);
    let mut body = String::new();
    let mut taken = Taken::default();
    // Circles of every stack first, so labels avoid them all.
    let stack_step = 3.0;
    for (&k, gens) in &points {
        let (cx, cy) = px((k.0 as f64 / 2.0, k.1 as f64 / 2.0));
        let n = gens.len().min(4) as f64;
        taken.0.push([
            cx - RADIUS,
            cy - RADIUS - stack_step * (n - 1.0),
            cx + RADIUS + stack_step * (n - 1.0),
            cy + RADIUS,
        ]);
    }
    // Arrows too: small boxes along each, so that no label is written across one.
    for a in &arrows {
        if let (Some(&p), Some(&q)) = (placed.at.get(a.from), placed.at.get(a.to)) {
            let ((ax, ay), (bx, by)) = (px(p), px(q));
            let steps = ((bx - ax).hypot(by - ay) / 6.0).ceil().max(1.0) as usize;
            for i in 1..steps {
                let t = i as f64 / steps as f64;
                let (x, y) = (ax + (bx - ax) * t, ay + (by - ay) * t);
                taken.0.push([x - 2.0, y - 2.0, x + 2.0, y + 2.0]);
            }
        }
    }
    // Grid: integer lines over the range, labelled.
    let (x0, x1, y0, y1) = (min_x.floor(), max_x.ceil(), min_y.floor(), max_y.ceil());
    let tick = |span: f64| if span > 40.0 { (span / 20.0).ceil() } else { 1.0 };
    let (tx, ty) = (tick(x1 - x0), tick(y1 - y0));
    let mut grid = String::new();
    let mut v = x0;
    while v <= x1 {
        let (gx, _) = px((v, 0.0));
        let (_, ga) = px((0.0, y1));
        let (_, gb) = px((0.0, y0));
        let _ = writeln!(
            grid,
            r##"<line x1="{gx:.1}" y1="{:.1}" x2="{gx:.1}" y2="{:.1}" stroke="#e8e8e8"/><text x="{gx:.1}" y="{:.1}" font-size="10" text-anchor="middle" fill="#888">{}</text>"##,
            ga - UNIT / 2.0,
            gb + UNIT / 2.0,
            gb + UNIT / 2.0 + 13.0,
            fmt_num(v)
        );
        v += tx;
    }
    let mut v = y0;
    while v <= y1 {
        let (_, gy) = px((0.0, v));
        let (ga, _) = px((x0, 0.0));
        let (gb, _) = px((x1, 0.0));
        let _ = writeln!(
            grid,
            r##"<line x1="{:.1}" y1="{gy:.1}" x2="{:.1}" y2="{gy:.1}" stroke="#e8e8e8"/><text x="{:.1}" y="{:.1}" font-size="10" text-anchor="end" fill="#888">{}</text>"##,
            ga - UNIT / 2.0,
            gb + UNIT / 2.0,
            ga - UNIT / 2.0 - 4.0,
            gy + 3.5,
            fmt_num(v)
        );
        v += ty;
    }
    let grid_box = {
        let (a, b) = px((x0, y1));
        let (cc, d) = px((x1, y0));
        [a - UNIT / 2.0 - 30.0, b - UNIT / 2.0, cc + UNIT / 2.0, d + UNIT / 2.0 + 16.0]
    };
    // Arrows, centre to centre; the tip stops at the target's circle (marker refX).
    let mut kinds = BTreeSet::new();
    let mut not_to_scale = 0;
    for (a, &scaled) in arrows.iter().zip(&placed.to_scale) {
        let (Some(&p), Some(&q)) = (placed.at.get(a.from), placed.at.get(a.to)) else { continue };
        let ((ax, ay), (bx, by)) = (px(p), px(q));
        let kind = if scaled || a.kind == Kind::Sum { a.kind } else { Kind::Sum };
        kinds.insert(kind);
        not_to_scale += usize::from(!scaled);
        let dash = if scaled { "" } else { r#" stroke-dasharray="5,3""# };
        let _ = writeln!(
            body,
            r##"<line class="arrow" data-from="{}" data-to="{}" data-coef="{}" x1="{ax:.2}" y1="{ay:.2}" x2="{bx:.2}" y2="{by:.2}" stroke="{}" stroke-width="1.4"{dash} marker-end="url(#tip-{})"/>"##,
            esc(a.from),
            esc(a.to),
            esc(a.coef),
            kind.colour(),
            kind as u8
        );
        if a.coef != "1" {
            let (w, h) = (width(a.coef), FONT + 2.0);
            let (lx, ly) = taken.spot((ax + bx) / 2.0, (ay + by) / 2.0, w, h);
            let _ = writeln!(
                body,
                r##"<text class="coef" x="{:.1}" y="{:.1}" font-size="{FONT}" fill="{}" text-anchor="middle">{}</text>"##,
                lx + w / 2.0,
                ly + h - 3.0,
                kind.colour(),
                esc(a.coef)
            );
        }
    }
    // Stacks and their labels.
    for (&k, gens) in &points {
        let (cx, cy) = px((k.0 as f64 / 2.0, k.1 as f64 / 2.0));
        let lit = gens.iter().any(|g| highlight.contains(*g));
        let fill = if lit { "#f5a623" } else { "#ffffff" };
        let shown = gens.len().min(4);
        for i in (0..shown).rev() {
            let o = stack_step * i as f64;
            let _ = writeln!(
                body,
                r##"<circle class="generator" cx="{:.2}" cy="{:.2}" r="{RADIUS}" fill="{fill}" stroke="#222" stroke-width="1.2"/>"##,
                cx + o,
                cy - o
            );
        }
        // The label: every name at the point (the first eight, then how many more).
        let mut names: Vec<String> = gens.iter().take(8).map(|g| g.to_string()).collect();
        if gens.len() > 8 {
            names.push(format!("+{} more", gens.len() - 8));
        }
        let count = if gens.len() > 1 { format!("{}× ", gens.len()) } else { String::new() };
        let plain = format!("{count}{}", names.join(", "));
        let (w, h) = (width(&plain), FONT + 2.0);
        let (lx, ly) = taken.spot(cx, cy, w, h);
        let mut spans = esc(&count);
        for (i, n) in names.iter().enumerate() {
            if i > 0 {
                spans += ", ";
            }
            if highlight.contains(n) {
                let _ = write!(spans, r##"<tspan fill="#b35900" font-weight="bold">{}</tspan>"##, esc(n));
            } else {
                spans += &esc(n);
            }
        }
        let _ = writeln!(
            body,
            r#"<text class="label" x="{lx:.1}" y="{:.1}" font-size="{FONT}" data-w="{w:.1}">{spans}</text>"#,
            ly + h - 3.0
        );
    }
    // Legend and axis names below the picture.
    let (across, up) = axis_names(ring, placed.plane);
    let mut legend: Vec<(Option<(Kind, bool)>, String)> = Vec::new();
    let var = |i: usize| ring.variables.get(i).cloned().unwrap_or_default();
    for k in &kinds {
        let text = match (k, placed.plane) {
            (Kind::Unit, _) => "coefficient 1".to_string(),
            (Kind::First, true) => format!("{0}^a: horizontal, a units left", var(0)),
            (Kind::Second, true) => format!("{0}^b: vertical, b units down", var(1)),
            (Kind::Mixed, true) => format!("{}^a·{}^b: diagonal, a left and b down", var(0), var(1)),
            (Kind::First, false) => format!("{0}^a: a units right, 2a − 1 up (to scale)", var(0)),
            (Kind::Second | Kind::Mixed, false) => "a monomial".into(),
            (Kind::Sum, _) => {
                "dashed: a sum of monomials, or not drawable to scale (no placement fits every arrow)".into()
            }
        };
        legend.push((Some((*k, *k == Kind::Sum)), text));
    }
    legend.push((None, "circle: a generator; offset circles with k×: k generators at one point, all named".into()));
    if !caption.is_empty() {
        legend.push((None, format!("orange: generators in the support of the witness of {caption}")));
    }
    if placed.plane {
        legend.push((None, format!("position: filtration levels; an arrow x → {}^a·{}^b·y goes a left and b down; each connected piece starts at (−gr_U/2, −gr_V/2)", var(0), var(1))));
    }
    if not_to_scale > 0 {
        legend.push((None, format!("{not_to_scale} arrow(s) dashed: not to scale")));
    }
    // Everything's extent, then the frame around it.
    let all = taken.0.iter().chain(std::iter::once(&grid_box));
    let (mut l, mut t, mut r, mut b) = (f64::MAX, f64::MAX, f64::MIN, f64::MIN);
    for bx in all {
        l = l.min(bx[0]);
        t = t.min(bx[1]);
        r = r.max(bx[2]);
        b = b.max(bx[3]);
    }
    let plural = |n: usize, word: &str| format!("{n} {word}{}", if n == 1 { "" } else { "s" });
    let title =
        format!("{name}: {}, {}", plural(c.generators.len(), "generator"), plural(c.differential.len(), "arrow"));
    finish(Frame { l, t, r, b }, &title, &across, &up, &grid, &body, &legend)
}

struct Frame {
    l: f64,
    t: f64,
    r: f64,
    b: f64,
}

fn axis_names(ring: &Ring, plane: bool) -> (String, String) {
    let g = |i: usize| ring.gradings.get(i).cloned().unwrap_or_default();
    if plane {
        let v = |i: usize| ring.variables.get(i).cloned().unwrap_or_default();
        (
            format!("{} filtration level (one unit per power of {})", v(0), v(0)),
            format!("{} filtration level (one unit per power of {})", v(1), v(1)),
        )
    } else if ring.gradings.len() >= 2 {
        (format!("{} (one unit per step)", g(1)), format!("{} (one unit per step)", g(0)))
    } else {
        (String::new(), format!("{} (one unit per step)", g(0)))
    }
}

fn fmt_num(v: f64) -> String {
    if v.fract() == 0.0 {
        format!("{}", v as i64)
    } else {
        format!("{v}")
    }
}

fn bounds<'a>(keys: impl Iterator<Item = &'a (i64, i64)>) -> (f64, f64, f64, f64) {
    let (mut a, mut b, mut c, mut d) = (f64::MAX, f64::MIN, f64::MAX, f64::MIN);
    for &(x, y) in keys {
        let (x, y) = (x as f64 / 2.0, y as f64 / 2.0);
        a = a.min(x);
        b = b.max(x);
        c = c.min(y);
        d = d.max(y);
    }
    if a > b {
        return (0.0, 0.0, 0.0, 0.0);
    }
    (a, b, c, d)
}

/// The document: title above, the picture in its frame, axis names and the legend below.
fn finish(
    f: Frame,
    title: &str,
    across: &str,
    up: &str,
    grid: &str,
    body: &str,
    legend: &[(Option<(Kind, bool)>, String)],
) -> Drawing {
    let margin = 20.0;
    let head = 48.0;
    let legend_h = 18.0 * legend.len() as f64 + 40.0;
    let text_w = legend.iter().map(|(_, t)| width(t) + 40.0).fold(width(title), f64::max);
    let width_px = (f.r - f.l + 2.0 * margin + 24.0).max(text_w + 2.0 * margin);
    let height_px = f.b - f.t + head + legend_h + 2.0 * margin;
    // Translate the picture so that its frame starts below the title.
    let (dx, dy) = (margin + 24.0 - f.l, margin + head - f.t);
    let mut s = String::new();
    let _ = writeln!(
        s,
        r#"<svg xmlns="http://www.w3.org/2000/svg" width="{width_px:.0}" height="{height_px:.0}" viewBox="0 0 {width_px:.0} {height_px:.0}" font-family="sans-serif">"#
    );
    s += "<defs>";
    for k in [Kind::Unit, Kind::First, Kind::Second, Kind::Mixed, Kind::Sum] {
        // Tip drawn RADIUS + 1 before the line's end, so it touches the target's circle.
        let _ = write!(
            s,
            r##"<marker id="tip-{}" viewBox="0 0 10 10" refX="{:.1}" refY="5" markerUnits="userSpaceOnUse" markerWidth="9" markerHeight="9" orient="auto"><path d="M0,0 L10,5 L0,10 z" fill="{}"/></marker>"##,
            k as u8,
            10.0 + (RADIUS + 1.0) * 10.0 / 9.0,
            k.colour()
        );
    }
    s += "</defs>\n";
    let _ = writeln!(s, r#"<rect width="100%" height="100%" fill="white"/>"#);
    let _ = writeln!(
        s,
        r#"<text x="{margin}" y="{:.0}" font-size="15" font-weight="bold">{}</text>"#,
        margin + 12.0,
        esc(title)
    );
    let _ = writeln!(s, r#"<g class="picture" transform="translate({dx:.2},{dy:.2})">"#);
    s += grid;
    s += body;
    s += "</g>\n";
    let below = f.b + dy + 8.0;
    if !across.is_empty() {
        let _ = writeln!(
            s,
            r##"<text x="{:.1}" y="{:.1}" font-size="12" text-anchor="middle" fill="#444">{} →</text>"##,
            (f.l + f.r) / 2.0 + dx,
            below + 10.0,
            esc(across)
        );
    }
    let mid = (f.t + f.b) / 2.0 + dy;
    let _ = writeln!(
        s,
        r##"<text x="{:.1}" y="{mid:.1}" font-size="12" fill="#444" transform="rotate(-90 {:.1} {mid:.1})" text-anchor="middle">{} →</text>"##,
        margin,
        margin,
        esc(up)
    );
    let mut y = below + 34.0;
    let _ = writeln!(
        s,
        r#"<g class="legend"><text x="{margin}" y="{y:.1}" font-size="12" font-weight="bold">Legend</text>"#
    );
    for (kind, text) in legend {
        y += 18.0;
        if let Some((k, dashed)) = kind {
            let dash = if *dashed { r#" stroke-dasharray="5,3""# } else { "" };
            let _ = write!(
                s,
                r##"<line x1="{margin}" y1="{:.1}" x2="{:.1}" y2="{:.1}" stroke="{}" stroke-width="2"{dash}/>"##,
                y - 4.0,
                margin + 26.0,
                y - 4.0,
                k.colour()
            );
        }
        let _ = writeln!(s, r#"<text x="{:.1}" y="{y:.1}" font-size="{FONT}">{}</text>"#, margin + 34.0, esc(text));
    }
    s += "</g>\n</svg>\n";
    Drawing { svg: s, note: None }
}

/// Above the size limit: generators counted per cell (one unit, or larger so that there are at
/// most 60 cells a side), arrows counted by kind.
fn summary(ring: &Ring, name: &str, c: &ComplexSpec, arrows: &[Arrow], placed: &Placement, limit: usize) -> Drawing {
    let (min_x, max_x, min_y, max_y) = {
        let mut b = (f64::MAX, f64::MIN, f64::MAX, f64::MIN);
        for &(x, y) in placed.at.values() {
            b = (b.0.min(x), b.1.max(x), b.2.min(y), b.3.max(y));
        }
        if b.0 > b.1 {
            (0.0, 0.0, 0.0, 0.0)
        } else {
            b
        }
    };
    let cell = ((max_x - min_x).max(max_y - min_y) / 60.0).ceil().max(1.0);
    let mut counts: BTreeMap<(i64, i64), usize> = BTreeMap::new();
    for &(x, y) in placed.at.values() {
        *counts.entry((((x - min_x) / cell).floor() as i64, ((y - min_y) / cell).floor() as i64)).or_default() += 1;
    }
    let most = counts.values().copied().max().unwrap_or(1) as f64;
    let size = 28.0;
    let rows = ((max_y - min_y) / cell).floor() as i64;
    let mut body = String::new();
    let mut taken = Taken::default();
    for (&(i, j), &n) in &counts {
        let (cx, cy) = (i as f64 * size, (rows - j) as f64 * size);
        let r = (size * 0.45 * (n as f64 / most).sqrt()).max(2.5);
        let _ = writeln!(
            body,
            r##"<circle class="cell" data-count="{n}" cx="{cx:.1}" cy="{cy:.1}" r="{r:.1}" fill="#9ec5ee" stroke="#1a5fb4" stroke-width="0.8"/>"##
        );
        if counts.len() <= 900 {
            let _ = writeln!(
                body,
                r#"<text x="{cx:.1}" y="{:.1}" font-size="8" text-anchor="middle">{n}</text>"#,
                cy + 3.0
            );
        }
        taken.0.push([cx - size / 2.0, cy - size / 2.0, cx + size / 2.0, cy + size / 2.0]);
    }
    let mut by_kind: BTreeMap<Kind, usize> = BTreeMap::new();
    for a in arrows {
        *by_kind.entry(a.kind).or_default() += 1;
    }
    let var = |i: usize| ring.variables.get(i).cloned().unwrap_or_default();
    let kind_name = |k: Kind| match k {
        Kind::Unit => "coefficient 1".to_string(),
        Kind::First => format!("powers of {}", var(0)),
        Kind::Second => format!("powers of {}", var(1)),
        Kind::Mixed => "mixed monomials".into(),
        Kind::Sum => "sums of monomials".into(),
    };
    let note = format!(
        "{name} has {} generators, more than the drawing limit of {limit} (--max-generators): drawn as a summary",
        c.generators.len()
    );
    let mut legend: Vec<(Option<(Kind, bool)>, String)> = vec![(None, note.clone())];
    legend.push((
        None,
        format!("each disc: the generators in a cell of {cell}×{cell} units (area ∝ count; largest {most})"),
    ));
    legend.push((
        None,
        format!(
            "arrows ({}), not drawn: {}",
            arrows.len(),
            by_kind.iter().map(|(k, n)| format!("{n} {}", kind_name(*k))).collect::<Vec<_>>().join(", ")
        ),
    ));
    let f = taken.0.iter().fold(Frame { l: f64::MAX, t: f64::MAX, r: f64::MIN, b: f64::MIN }, |f, b| Frame {
        l: f.l.min(b[0]),
        t: f.t.min(b[1]),
        r: f.r.max(b[2]),
        b: f.b.max(b[3]),
    });
    let f = if f.l > f.r { Frame { l: 0.0, t: 0.0, r: 1.0, b: 1.0 } } else { f };
    let (across, up) = axis_names(ring, placed.plane);
    let title = format!("{name}: summary of {} generators, {} arrows", c.generators.len(), arrows.len());
    let mut d = finish(f, &title, &across, &up, "", &body, &legend);
    d.note = Some(note);
    d
}
