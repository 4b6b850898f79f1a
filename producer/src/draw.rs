//! `tubecert draw`: a complex as an SVG picture. Generators sit on the lattice of their
//! gradings — Alexander grading across, the first grading (Maslov, or gr_U) up; over `F2[U,V]`
//! with (gr_U, gr_V) the Alexander grading is (gr_U − gr_V)/2 — with several generators of one
//! bidegree side by side in their cell. Arrows of ∂ carry their coefficient when it is not 1.
//! With a claim to highlight, the generators in its witness's support are filled in colour.

use std::collections::{BTreeMap, BTreeSet};
use std::fmt::Write as _;
use tubecert_format::{Claim, ComplexSpec, Ring, Term};

/// The two plane coordinates of a grading vector.
fn position(ring: &Ring, g: &[i64]) -> (f64, f64) {
    match (ring.variables.len(), g) {
        (2, [a, b, ..]) => ((a - b) as f64 / 2.0, *a as f64),
        (_, [m, a, ..]) => (*a as f64, *m as f64),
        (_, [m]) => (0.0, *m as f64),
        _ => (0.0, 0.0),
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

/// Draws complex `name` of a problem or certificate file; `highlight` is a 1-based claim number
/// (certificates only).
pub fn draw_file(path: &std::path::Path, name: &str, highlight: Option<usize>) -> Result<String, Vec<String>> {
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
            (support(claim, name, b), format!("highlighted: the witness of claim {k}, {statement}{cut}"))
        }
        (Some(_), None) => {
            return Err(vec![format!("{file}: --highlight needs a certificate (claims carry the witnesses)")])
        }
    };
    Ok(svg(&ring, name, c, &lit, &caption))
}

fn esc(s: &str) -> String {
    s.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
}

/// The SVG picture of a complex.
pub fn svg(ring: &Ring, name: &str, c: &ComplexSpec, highlight: &BTreeSet<String>, caption: &str) -> String {
    // Cells by position; generators within a cell in name order.
    let mut cells: BTreeMap<(i64, i64), Vec<&String>> = BTreeMap::new();
    for (g, gr) in c.generators.iter() {
        let (x, y) = position(ring, gr);
        cells.entry(((x * 2.0) as i64, (y * 2.0) as i64)).or_default().push(g);
    }
    // Only gradings that occur get a column or a row, so sparse complexes stay compact.
    let (xs, ys): (BTreeSet<i64>, BTreeSet<i64>) = cells.keys().map(|&(x, y)| (x, y)).unzip();
    let col: BTreeMap<i64, usize> = xs.iter().enumerate().map(|(i, &x)| (x, i)).collect();
    let row: BTreeMap<i64, usize> = ys.iter().rev().enumerate().map(|(i, &y)| (y, i)).collect();
    let slot = 52.0; // horizontal room per generator in a cell
    let (margin, top) = (60.0, 56.0);
    // Each column is as wide as its most crowded cell; `left[i]` is where column i starts.
    let mut widths = vec![70.0f64; xs.len()];
    for (&(x, _), gens) in &cells {
        widths[col[&x]] = widths[col[&x]].max(slot * gens.len() as f64);
    }
    let left: Vec<f64> = widths
        .iter()
        .scan(0.0, |acc, w| {
            let l = *acc;
            *acc += w;
            Some(l)
        })
        .collect();
    let centre = |i: usize| margin + left[i] + widths[i] / 2.0;
    let cell_h = 70.0;
    let plural = |n: usize, word: &str| format!("{n} {word}{}", if n == 1 { "" } else { "s" });
    let title =
        format!("{name}: {}, {}", plural(c.generators.len(), "generator"), plural(c.differential.len(), "arrow"));
    // Wide enough for the title and the caption (about 7 px a character at these sizes).
    let text_width = 7.0 * title.chars().count().max(caption.chars().count()) as f64;
    let width = (margin * 2.0 + widths.iter().sum::<f64>()).max(text_width + margin);
    let height = top + margin + cell_h * ys.len() as f64;
    // Position of each generator, and whether its label goes above (alternating in a cell).
    let mut at: BTreeMap<&String, (f64, f64)> = BTreeMap::new();
    let mut label_above: BTreeSet<&String> = BTreeSet::new();
    for (&(x, y), gens) in &cells {
        let cx = centre(col[&x]);
        let cy = top + cell_h * (row[&y] as f64 + 0.5);
        for (k, g) in gens.iter().enumerate() {
            let off = (k as f64 - (gens.len() as f64 - 1.0) / 2.0) * slot;
            at.insert(g, (cx + off, cy));
            if k % 2 == 1 {
                label_above.insert(g);
            }
        }
    }
    let mut s = String::new();
    let _ = writeln!(
        s,
        r#"<svg xmlns="http://www.w3.org/2000/svg" width="{width:.0}" height="{height:.0}" viewBox="0 0 {width:.0} {height:.0}" font-family="sans-serif">"#
    );
    let _ = writeln!(
        s,
        r##"<defs><marker id="tip" viewBox="0 0 10 10" refX="10" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse"><path d="M0,0 L10,5 L0,10 z" fill="#444"/></marker></defs>"##
    );
    let _ = writeln!(s, r#"<rect width="100%" height="100%" fill="white"/>"#);
    let (across, up) = match ring.variables.len() {
        2 => ("Alexander (gr_U − gr_V)/2".to_string(), ring.gradings.first().cloned().unwrap_or_default()),
        _ => (ring.gradings.get(1).cloned().unwrap_or_default(), ring.gradings.first().cloned().unwrap_or_default()),
    };
    let _ = writeln!(s, r#"<text x="{margin}" y="20" font-size="15" font-weight="bold">{}</text>"#, esc(&title));
    let _ = writeln!(s, r##"<text x="{margin}" y="38" font-size="12" fill="#b06000">{}</text>"##, esc(caption));
    // Grid: one line per grading in use, labelled with its value.
    for (&x, &i) in &col {
        let px = centre(i);
        let _ = writeln!(
            s,
            r##"<line x1="{px:.1}" y1="{top}" x2="{px:.1}" y2="{:.1}" stroke="#eee"/><text x="{px:.1}" y="{:.1}" font-size="11" text-anchor="middle" fill="#888">{}</text>"##,
            height - margin,
            height - margin + 16.0,
            x as f64 / 2.0
        );
    }
    for (&y, &i) in &row {
        let py = top + cell_h * (i as f64 + 0.5);
        let _ = writeln!(
            s,
            r##"<line x1="{margin}" y1="{py:.1}" x2="{:.1}" y2="{py:.1}" stroke="#eee"/><text x="{:.1}" y="{:.1}" font-size="11" text-anchor="end" fill="#888">{}</text>"##,
            width - margin,
            margin - 8.0,
            py + 4.0,
            y as f64 / 2.0
        );
    }
    let _ = writeln!(
        s,
        r##"<text x="{:.1}" y="{:.1}" font-size="12" text-anchor="middle" fill="#555">{} →</text>"##,
        width / 2.0,
        height - 12.0,
        esc(&across)
    );
    let _ = writeln!(
        s,
        r##"<text x="14" y="{:.1}" font-size="12" fill="#555" transform="rotate(-90 14 {:.1})" text-anchor="middle">{} →</text>"##,
        height / 2.0,
        height / 2.0,
        esc(&up)
    );
    for [x, coef, y] in &c.differential {
        let (Some(&(ax, ay)), Some(&(bx, by))) = (at.get(x), at.get(y)) else { continue };
        // Stop short of the circles.
        let (dx, dy) = (bx - ax, by - ay);
        let len = (dx * dx + dy * dy).sqrt().max(1e-6);
        let r = 9.0;
        let (sx, sy, ex, ey) = (ax + dx / len * r, ay + dy / len * r, bx - dx / len * r, by - dy / len * r);
        let _ = writeln!(
            s,
            r##"<line x1="{sx:.1}" y1="{sy:.1}" x2="{ex:.1}" y2="{ey:.1}" stroke="#444" stroke-width="1.2" marker-end="url(#tip)"/>"##
        );
        if coef != "1" {
            let _ = writeln!(
                s,
                r##"<text x="{:.1}" y="{:.1}" font-size="11" fill="#1a5fb4" text-anchor="middle">{}</text>"##,
                (sx + ex) / 2.0,
                (sy + ey) / 2.0 - 4.0,
                esc(coef)
            );
        }
    }
    for (g, &(px, py)) in &at {
        let fill = if highlight.contains(*g) { "#f5a623" } else { "#ffffff" };
        let _ = writeln!(
            s,
            r##"<circle cx="{px:.1}" cy="{py:.1}" r="8" fill="{fill}" stroke="#222" stroke-width="1.3"/><text x="{px:.1}" y="{:.1}" font-size="11" text-anchor="middle">{}</text>"##,
            if label_above.contains(g) { py - 13.0 } else { py + 21.0 },
            esc(g)
        );
    }
    s.push_str("</svg>\n");
    s
}
