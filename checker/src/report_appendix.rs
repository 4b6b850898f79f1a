//! Appendix-ready reports of a verified certificate (`--report md`, `--report tex`).
//! Presentation only: everything shown was established by [`crate::verify`] — the statements
//! are the checker's own wording, and a witness is written out only for a claim that verified;
//! claims that failed are listed as failed, without their witnesses.
//!
//! LaTeX: [`latex`] is a fragment to `\input` (it needs `amsmath` and `amssymb`);
//! [`latex_document`] wraps fragments into a whole document (`--standalone`).

use crate::report_text::{
    caveat, objects, objects_line, paired, Notation, BORDERED_SCOPE, OBJECT_GENERATORS, PLAIN, SCOPE,
};
use crate::FileReport;
use tubecert_format::statement::{render_expr, render_grading, ring_name};
use tubecert_format::{Claim, MapExpr, Term};

/// Rows (source generators) of a witness written out; beyond, the rest are counted.
pub const WITNESS_ROWS: usize = 12;
/// Terms written out in one row; beyond, the rest are counted.
pub const ROW_TERMS: usize = 8;

/// The facts both formats show.
struct Summary {
    ring: String,
    conventions: Vec<String>,
    complexes: Vec<(String, usize, usize)>,
    maps: Vec<(String, String, String, usize)>,
    claims: Vec<Shown>,
}

/// One claim as shown: verified or not, kind, statement, the surfaces reading, the bordered
/// objects' periods and gradings, and witnesses.
struct Shown {
    ok: bool,
    kind: String,
    claim: Claim,
    /// The checker's wording of the claim's fields with its caveat, never the file's text.
    statement: String,
    /// What the checker's statement adds to the claim's wording (the format version's caveat).
    caveat: &'static str,
    reading: Option<String>,
    objects: Option<Title>,
    witnesses: Vec<Witness>,
}

/// How a witness's rows read.
#[derive(Clone, Copy, PartialEq)]
enum Rows {
    /// A map: x ↦ Σ m·w.
    Map,
    /// A functional on Hom(C, D): y(ψ) = Σ_x c_x(ψ(x)), each c_x = Σ (m·w)*.
    Functional,
    /// A change of basis: new generator = Σ m·old.
    Basis,
}

/// One row of a witness: its source, the source's grading when a basis, its terms (monomial,
/// target), in the file's order.
type Group = (String, Option<String>, Vec<(String, String)>);

/// A row as shown: source, grading, the terms written out, how many more there are.
type ShownRow<'a> = (&'a String, &'a Option<String>, &'a [(String, String)], usize);

/// A witness grouped by source generator, as the checker read it.
struct Witness {
    /// What it is, in words with a formula: the title line.
    title: Title,
    rows: Rows,
    groups: Vec<Group>,
    terms: usize,
}

/// A title in both notations.
struct Title {
    md: String,
    tex: String,
}

fn group(terms: &[Term]) -> Vec<Group> {
    let mut out: Vec<Group> = Vec::new();
    for [x, m, w] in terms {
        match out.last_mut() {
            Some((s, _, ts)) if s == x => ts.push((m.clone(), w.clone())),
            _ => out.push((x.clone(), None, vec![(m.clone(), w.clone())])),
        }
    }
    out
}

fn written(title: Title, rows: Rows, terms: &[Term]) -> Witness {
    Witness { title, rows, groups: group(terms), terms: terms.len() }
}

fn homotopy_title(phi: &MapExpr, h: &str) -> Title {
    Title {
        md: format!("homotopy {h} with {} = ∂{h} + {h}∂", render_expr(phi)),
        tex: format!("homotopy ${h}$ with ${} = \\partial {h} + {h}\\partial$", tex_expr(phi)),
    }
}

fn dual_title(phi: &MapExpr) -> Title {
    Title {
        md: format!(
            "dual witness y(ψ) = Σ_x c_x(ψ(x)): y = 1 on {} and y vanishes on every ∂H + H∂",
            render_expr(phi)
        ),
        tex: format!(
            "dual witness $y(\\psi) = \\sum_x c_x(\\psi(x))$: $y = 1$ on ${}$ and $y$ vanishes on every $\\partial H + H\\partial$",
            tex_expr(phi)
        ),
    }
}

/// The witnesses of a claim, in the order the checker used them.
fn witnesses(c: &Claim) -> Vec<Witness> {
    let named = |n: &str| MapExpr::Named(n.to_string());
    match c {
        Claim::NullHomotopic { map, witness, .. } => {
            vec![written(homotopy_title(map, "H"), Rows::Map, &witness.homotopy)]
        }
        Claim::NotNullHomotopic { map, witness, .. } => vec![written(dual_title(map), Rows::Functional, &witness.dual)],
        Claim::TorsionOrder { maps: [f, g], variable, order, witness, .. } => {
            let mut out = vec![written(
                homotopy_title(&MapExpr::scaled_difference(f, g, variable, *order), "H"),
                Rows::Map,
                &witness.homotopy,
            )];
            if let (Some(y), Some(k)) = (&witness.dual, order.checked_sub(1)) {
                out.push(written(dual_title(&MapExpr::scaled_difference(f, g, variable, k)), Rows::Functional, y));
            }
            out
        }
        Claim::HomotopyEquivalence { maps: [f, g], witness, .. } => {
            // g∘f + id_C and f∘g + id_D, with C and D the ends named by the homotopies' rows.
            let gf = MapExpr::Compose(vec![named(g), named(f)]);
            let fg = MapExpr::Compose(vec![named(f), named(g)]);
            let plus_id = |e: MapExpr, h: &str| Title {
                md: format!("homotopy {h} with {} + id = ∂{h} + {h}∂", render_expr(&e)),
                tex: format!("homotopy ${h}$ with ${} + \\mathrm{{id}} = \\partial {h} + {h}\\partial$", tex_expr(&e)),
            };
            vec![
                written(plus_id(gf, "H_C"), Rows::Map, &witness.source_homotopy),
                written(plus_id(fg, "H_D"), Rows::Map, &witness.target_homotopy),
            ]
        }
        Claim::Homology { witness, .. } | Claim::Tau { witness, .. } | Claim::TorsionOrderOfComplex { witness, .. } => {
            let mut w = written(
                Title {
                    md: "basis in which ∂ is in normal form (each new generator, with its grading, in the old ones)".into(),
                    tex: "basis in which $\\partial$ is in normal form (each new generator, with its grading, in the old ones)"
                        .into(),
                },
                Rows::Basis,
                &witness.basis,
            );
            for (x, grading, _) in &mut w.groups {
                *grading = witness.generators.get(x).map(render_grading);
            }
            vec![w]
        }
        _ => vec![],
    }
}

fn witness_size(c: &Claim) -> usize {
    match c {
        Claim::NullHomotopic { witness, .. } => witness.homotopy.len(),
        Claim::NotNullHomotopic { witness, .. } => witness.dual.len(),
        Claim::HomotopyEquivalence { witness, .. } => witness.source_homotopy.len() + witness.target_homotopy.len(),
        Claim::Homology { witness, .. } | Claim::Tau { witness, .. } | Claim::TorsionOrderOfComplex { witness, .. } => {
            witness.basis.len() + witness.inverse.len()
        }
        Claim::TorsionOrder { witness, .. } => witness.homotopy.len() + witness.dual.as_ref().map_or(0, |d| d.len()),
        _ => 0,
    }
}

fn summary(r: &FileReport) -> Summary {
    let b = &r.body;
    let vars = &b.ring.variables;
    let mut conventions = vec![format!("gradings ({})", b.ring.gradings.join(", "))];
    for v in vars {
        conventions.push(format!("deg {v} = {}", render_grading(&b.ring.variable_degrees[v])));
    }
    conventions.push(format!("deg ∂ = {}", render_grading(&b.ring.differential_degree)));
    Summary {
        ring: ring_name(vars),
        conventions,
        complexes: b.complexes.iter().map(|(n, c)| (n.clone(), c.generators.len(), c.differential.len())).collect(),
        maps: b.maps.iter().map(|(n, m)| (n.clone(), m.from.clone(), m.to.clone(), m.terms.len())).collect(),
        claims: paired(r)
            .filter_map(|(res, c)| Some((c?, res)))
            .map(|(c, res)| {
                let ok = res.outcome.is_ok();
                let reading = res
                    .outcome
                    .as_ref()
                    .ok()
                    .and_then(|f| f.get("reading"))
                    .and_then(|v| v.as_str())
                    .map(str::to_string);
                // Only what verified is written out.
                let witnesses = if ok { witnesses(c) } else { vec![] };
                let (shown, with_generators) =
                    if ok { objects(c, b.bordered.as_ref(), OBJECT_GENERATORS) } else { (vec![], false) };
                let objects = objects_line(&shown, with_generators, &PLAIN)
                    .map(|md| Title { md, tex: objects_line(&shown, with_generators, &TEX).unwrap_or_default() });
                Shown {
                    ok,
                    kind: c.kind().to_string(),
                    claim: c.clone(),
                    statement: res.statement.clone(),
                    caveat: caveat(c, r.version),
                    reading,
                    objects,
                    witnesses,
                }
            })
            .collect(),
    }
}

/// `more` rows or terms left out, in words.
fn left_out(rows: usize, terms: usize, total_terms: usize) -> String {
    let mut parts = Vec::new();
    if rows > 0 {
        parts.push(format!("{rows} more row{}", if rows == 1 { "" } else { "s" }));
    }
    if terms > 0 {
        parts.push(format!("{terms} more term{} in the rows shown", if terms == 1 { "" } else { "s" }));
    }
    format!("… {} ({total_terms} terms in all; the certificate holds every one)", parts.join(", "))
}

/// The shown part of a witness: rows and terms within the limits, and what was left out.
fn shown_rows(w: &Witness) -> (Vec<ShownRow<'_>>, Option<String>) {
    let mut cut_terms = 0;
    let rows: Vec<_> = w
        .groups
        .iter()
        .take(WITNESS_ROWS)
        .map(|(x, g, ts)| {
            let k = ts.len().min(ROW_TERMS);
            cut_terms += ts.len() - k;
            (x, g, &ts[..k], ts.len() - k)
        })
        .collect();
    let cut_rows = w.groups.len().saturating_sub(WITNESS_ROWS);
    let note = (cut_rows > 0 || cut_terms > 0).then(|| left_out(cut_rows, cut_terms, w.terms));
    (rows, note)
}

/// `U^2·a + b`, or with `*` after each term for a functional: `(U^2·a)* + b*`.
fn md_terms(ts: &[(String, String)], star: bool, more: usize) -> String {
    let mut parts: Vec<String> = ts
        .iter()
        .map(|(m, w)| match (m.as_str(), star) {
            ("1", false) => w.clone(),
            ("1", true) => format!("{w}*"),
            (_, false) => format!("{m}·{w}"),
            (_, true) => format!("({m}·{w})*"),
        })
        .collect();
    if more > 0 {
        parts.push(format!("… ({more} more)"));
    }
    parts.join(" + ")
}

fn md_witness(w: &Witness) -> String {
    let mut o = format!("    - {}:\n", w.title.md);
    if w.groups.is_empty() {
        o += "      - `0` (no terms)\n";
    }
    let (rows, note) = shown_rows(w);
    for (x, g, ts, more) in rows {
        let line = match w.rows {
            Rows::Map => format!("{x} ↦ {}", md_terms(ts, false, more)),
            Rows::Functional => format!("c_{x} = {}", md_terms(ts, true, more)),
            Rows::Basis => format!("{x} {} = {}", g.as_deref().unwrap_or(""), md_terms(ts, false, more)),
        };
        o += &format!("      - `{line}`\n");
    }
    if let Some(n) = note {
        o += &format!("      - {n}\n");
    }
    o
}

pub fn markdown(r: &FileReport) -> String {
    let s = summary(r);
    let mut o = String::new();
    o += &format!("## Certificate `{}`\n\n", r.file);
    o += &format!("SHA-256 (RFC 8785 canonical body): `{}`\n\n", r.sha256);
    o += &format!("> {SCOPE}\n\n");
    if r.body.bordered.is_some() {
        o += &format!("> {BORDERED_SCOPE}\n\n");
    }
    o += &format!("**Ring** {} — {}.\n\n", s.ring, s.conventions.join(", "));
    o += "| complex | generators | differential terms |\n|---|---|---|\n";
    for (n, g, t) in &s.complexes {
        o += &format!("| {n} | {g} | {t} |\n");
    }
    if !s.maps.is_empty() {
        o += "\n| map | from → to | terms |\n|---|---|---|\n";
        for (n, f, t, k) in &s.maps {
            o += &format!("| {n} | {f} → {t} | {k} |\n");
        }
    }
    o += "\nEvery complex satisfies ∂∘∂ = 0 and every map is a homogeneous chain map (checked).\n\n### Claims\n\n";
    for (i, c) in s.claims.iter().enumerate() {
        let status = if c.ok { "✓" } else { "✗ failed" };
        o +=
            &format!("{}. {status} {} *({}; witness terms: {})*\n", i + 1, c.statement, c.kind, witness_size(&c.claim));
        if let Some(reading) = &c.reading {
            o += &format!("    - reading: {reading}\n");
        }
        if let Some(objects) = &c.objects {
            o += &format!("    - {}\n", objects.md);
        }
        for w in &c.witnesses {
            o += &md_witness(w);
        }
    }
    o += &format!("\nRe-verify:\n\n```sh\ntubecheck {} --expect {}\n```\n", r.file, r.sha256);
    o
}

/// Escapes a name for LaTeX text inside \mathrm{}.
fn tex_name(n: &str) -> String {
    format!("\\mathrm{{{}}}", tex_text(n))
}

/// Escapes text for LaTeX's text mode (names, grading names).
fn tex_text(n: &str) -> String {
    let mut out = String::new();
    for ch in n.chars() {
        match ch {
            '_' | '#' | '$' | '%' | '&' | '{' | '}' => out += &format!("\\{ch}"),
            '^' => out += "\\^{}",
            '~' => out += "\\~{}",
            '\\' => out += "\\textbackslash{}",
            '⊗' => out += "\\ensuremath{\\otimes}",
            '⊠' => out += "\\ensuremath{\\boxtimes}",
            '≃' => out += "\\ensuremath{\\simeq}",
            'ι' => out += "\\ensuremath{\\iota}",
            '§' => out += "\\S{}",
            '\'' => out += "\\ensuremath{'}",
            'á' => out += "\\'a",
            '–' => out += "--",
            '−' => out += "-",
            '…' => out += "\\dots{}",
            c if c.is_ascii() => out.push(c),
            _ => out += "?",
        }
    }
    out
}

/// The scope paragraphs in LaTeX: text, with apostrophes kept (in names a ' is a prime) and the
/// few subscripts and superscripts they use set as mathematics.
fn tex_prose(s: &str) -> String {
    let t = tex_text(s).replace("\\ensuremath{'}", "'").replace("\\^{}-", "\\ensuremath{^-}");
    t.replace("h\\_A", "$h_A$").replace("X\\_K", "$X_K$")
}

/// A grading name in text font inside mathematics.
fn tex_grading_name(n: &str) -> String {
    format!("\\textnormal{{{}}}", tex_text(n))
}

/// `U^2*V` → `U^{2}V`.
fn tex_mono(m: &str) -> String {
    if m == "1" {
        return "1".into();
    }
    m.split('*')
        .map(|f| match f.split_once('^') {
            Some((v, e)) => format!("{v}^{{{e}}}"),
            None => f.to_string(),
        })
        .collect()
}

fn tex_expr(e: &MapExpr) -> String {
    match e {
        MapExpr::Named(n) => tex_name(n),
        MapExpr::Id(c) => format!("\\mathrm{{id}}_{{{}}}", tex_name(c)),
        MapExpr::Sum(es) => format!("({})", es.iter().map(tex_expr).collect::<Vec<_>>().join(" + ")),
        MapExpr::Compose(es) => es
            .iter()
            .map(|x| match x {
                MapExpr::Compose(_) | MapExpr::Times(..) => format!("({})", tex_expr(x)),
                _ => tex_expr(x),
            })
            .collect::<Vec<_>>()
            .join(" \\circ "),
        MapExpr::Times(m, e) => match **e {
            MapExpr::Compose(_) => format!("{} \\cdot ({})", tex_mono(m), tex_expr(e)),
            _ => format!("{} \\cdot {}", tex_mono(m), tex_expr(e)),
        },
    }
}

fn tex_grading(g: &[i64]) -> String {
    format!("({})", g.iter().map(|x| x.to_string()).collect::<Vec<_>>().join(","))
}

/// The LaTeX notation of the objects line beside a claim.
const TEX: Notation = Notation {
    name: |n| format!("${}$", tex_name(n)),
    period: |side, o, v| match v {
        Some(v) => format!("$h_{side}({}) = {v}$", tex_name(o)),
        None => format!("$h_{side}({})$: none written", tex_name(o)),
    },
    generator: |i, g| format!("$\\iota_{i}${}", g.map_or(String::new(), |g| format!(" ${g}$"))),
    words: tex_text,
};

/// A claim in LaTeX, saying all its statement in format `version` says: for a box tensor
/// product, how its gradings were read and normalized.
fn tex_claim(c: &Claim, vars: &[String], gradings: &[String], version: u32) -> String {
    let ring =
        if vars.is_empty() { "\\mathbb{F}_2".to_string() } else { format!("\\mathbb{{F}}_2[{}]", vars.join(",")) };
    match c {
        Claim::Complex { complex, .. } => format!("${}$ is a chain complex over ${ring}$", tex_name(complex)),
        Claim::ChainMap { map, .. } => format!("${}$ is a homogeneous chain map", tex_name(map)),
        Claim::NullHomotopic { map, .. } => format!("${} \\simeq 0$", tex_expr(map)),
        Claim::NotNullHomotopic { map, .. } => format!("${} \\not\\simeq 0$", tex_expr(map)),
        Claim::HomotopyEquivalence { maps: [f, g], .. } => {
            format!("${}$ and ${}$ are mutually inverse homotopy equivalences", tex_name(f), tex_name(g))
        }
        Claim::Homology { complex, free, torsion, .. } => {
            let v = vars.first().map_or("U", |v| v.as_str());
            let mut parts: Vec<String> = free.iter().map(|g| format!("{ring}_{{{}}}", tex_grading(g))).collect();
            parts.extend(torsion.iter().map(|(k, g)| format!("({ring}/{v}^{{{k}}})_{{{}}}", tex_grading(g))));
            let rhs = if parts.is_empty() { "0".into() } else { parts.join(" \\oplus ") };
            format!("$H_*({}) \\cong {rhs}$", tex_name(complex))
        }
        Claim::TorsionOrder { maps: [f, g], variable, order, .. } => {
            format!("$\\operatorname{{ord}}_{{{variable}}}({} - {}) = {order}$", tex_name(f), tex_name(g))
        }
        Claim::TorsionOrderOfComplex { complex, variable, order, .. } => {
            match vars.iter().find(|v| *v != variable).filter(|_| vars.len() == 2) {
                Some(o) => format!(
                    "$\\operatorname{{Ord}}_{{{variable}}}(H_*({}/({o}))) = {order}$ (read on the ${o} = 0$ quotient)",
                    tex_name(complex)
                ),
                None => format!("$\\operatorname{{Ord}}_{{{variable}}}(H_*({})) = {order}$", tex_name(complex)),
            }
        }
        Claim::Tau { complex, tau, alexander, .. } => {
            let grading = if gradings.len() > 1 {
                format!(" (Alexander grading ${}$)", tex_grading_name(alexander))
            } else {
                String::new()
            };
            let quotient = match vars {
                [_, v] => format!(", read on ${}/({v})$, the ${v} = 0$ quotient", tex_name(complex)),
                _ => String::new(),
            };
            format!("$\\tau({}) = {tau}${grading}{quotient}", tex_name(complex))
        }
        Claim::TypeDStructure { structure, .. } => {
            format!("${}$ is a type $D$ structure over $\\mathcal{{A}}(T^2)$", tex_name(structure))
        }
        Claim::TypeAModule { module, max_length, .. } => format!(
            "${}$ is a strictly unital type $A$ module over $\\mathcal{{A}}(T^2)$ (relations on words of length $\\le {max_length}$)",
            tex_name(module)
        ),
        Claim::TypeDMorphism { morphism, .. } => {
            format!("${}$ is a type $D$ morphism, $\\partial {} = 0$", tex_name(morphism), tex_name(morphism))
        }
        Claim::BoxTensor { complex, module, structure, .. } => {
            let x = tex_name(complex);
            let read = "(Maslov, Alexander) read from $\\mathrm{gr}(x)\\cdot\\mathrm{gr}(y)$ in LOT's grading group";
            let symmetric = ", then shifted by $s\\cdot(2, 1)$ with the one $s$ making $\\sum(-1)^M t^A$ symmetric under $t \\leftrightarrow t^{-1}$";
            let how = match version {
                5.. => format!("{read}{symmetric}, and in $M$ alone so that a witnessed cycle of ${x}/(U - 1)$, non-zero in homology, has $M - 2A = 0$, the degree of $\\widehat{{HF}}(S^3) \\cong \\mathbb{{F}}_2$"),
                4 => format!("{read}{symmetric}"),
                3 => read.to_string(),
                _ => "gradings added".to_string(),
            };
            format!("${x} = {} \\boxtimes {}$ (box tensor product, {how})", tex_name(module), tex_name(structure))
        }
        Claim::BoxTensorMap { map, module, morphism, .. } => format!(
            "${} = \\mathrm{{id}}_{{{}}} \\boxtimes {}${}",
            tex_name(map),
            tex_name(module),
            tex_name(morphism),
            if version >= 5 {
                " (source and target graded as box tensor products, each with its own witnessed cycle in degree $M - 2A = 0$)"
            } else {
                ""
            }
        ),
        Claim::Complement { bounded_model, structure, complex, framing, tau, .. } => format!(
            "${}$ {} $\\widehat{{CFD}}$ of the complement of the knot with complex ${}$, framing ${framing}$ (LOT Thm 11.26{}), $\\tau = {tau}$",
            tex_name(structure),
            if bounded_model.is_some() { "is homotopy equivalent to" } else { "is" },
            tex_name(complex),
            if bounded_model.is_some() { "; its bounded model by the cancellation lemma, LOT \\S 2" } else { "" }
        ),
    }
}

/// `U^{2}\cdot a + b`, or for a functional `(U^{2}\cdot a)^* + b^*`.
fn tex_terms(ts: &[(String, String)], star: bool, more: usize) -> String {
    let mut parts: Vec<String> = ts
        .iter()
        .map(|(m, w)| match (m.as_str(), star) {
            ("1", false) => tex_name(w),
            ("1", true) => format!("{}^*", tex_name(w)),
            (_, false) => format!("{} \\cdot {}", tex_mono(m), tex_name(w)),
            (_, true) => format!("({} \\cdot {})^*", tex_mono(m), tex_name(w)),
        })
        .collect();
    if more > 0 {
        parts.push(format!("\\dots\\ (\\text{{{more} more}})"));
    }
    parts.join(" + ")
}

fn tex_witness(w: &Witness) -> String {
    let mut o = format!("\\item {}:\n\\begin{{itemize}}\n", w.title.tex);
    if w.groups.is_empty() {
        o += "\\item[] $0$ (no terms)\n";
    }
    let (rows, note) = shown_rows(w);
    for (x, g, ts, more) in rows {
        let line = match w.rows {
            Rows::Map => format!("{} \\mapsto {}", tex_name(x), tex_terms(ts, false, more)),
            Rows::Functional => format!("c_{{{}}} = {}", tex_name(x), tex_terms(ts, true, more)),
            Rows::Basis => format!(
                "{}\\ {} = {}",
                tex_name(x),
                g.as_deref().unwrap_or("").replace(' ', ""),
                tex_terms(ts, false, more)
            ),
        };
        o += &format!("\\item[] ${line}$\n");
    }
    if let Some(n) = note {
        o += &format!("\\item[] {}\n", tex_text(&n));
    }
    o += "\\end{itemize}\n";
    o
}

/// A LaTeX fragment for `\input` (needs `amsmath` and `amssymb`): the certificate, its ring,
/// its objects in separate tables, and each claim with its witnesses written out.
pub fn latex(r: &FileReport) -> String {
    let s = summary(r);
    let tt = |x: &str| format!("\\texttt{{{}}}", tex_text(x));
    let mut o = String::from("% tubecheck appendix fragment: \\input it; needs \\usepackage{amsmath,amssymb}.\n");
    // Long paths and hashes may break across lines.
    let breakable = |x: &str| x.replace('/', "/\\allowbreak{}");
    let hash: Vec<String> = r.sha256.as_bytes().chunks(16).map(|c| String::from_utf8_lossy(c).into_owned()).collect();
    let hash = format!("\\texttt{{{}}}", hash.join("\\allowbreak{}"));
    o += "\\subsection*{Machine-checked certificate}\n";
    o += &format!("File {}.\\\\\nSHA-256 of the RFC~8785 canonical body: {hash}.\n\n", breakable(&tt(&r.file)));
    o += &format!("\\emph{{{}}}\n\n", tex_prose(SCOPE));
    if r.body.bordered.is_some() {
        o += &format!("\\emph{{{}}}\n\n", tex_prose(BORDERED_SCOPE));
    }
    let ring = &r.body.ring;
    let gradings: Vec<String> = ring.gradings.iter().map(|g| tex_grading_name(g)).collect();
    let mut conv = vec![format!("\\text{{gradings }} ({})", gradings.join(", "))];
    for v in &ring.variables {
        conv.push(format!("\\deg {v} = {}", tex_grading(&ring.variable_degrees[v])));
    }
    conv.push(format!("\\deg\\partial = {}", tex_grading(&ring.differential_degree)));
    o += &format!(
        "\\paragraph{{Ring and conventions.}} ${}$; ${}$.\n\n",
        s.ring.replace("F2", "\\mathbb{F}_2"),
        conv.join("$, $")
    );
    o += "\\paragraph{Objects.}\n\\par\\medskip\\noindent\n\\begin{tabular}{lrr}\ncomplex & generators & terms of $\\partial$ \\\\\n\\hline\n";
    for (n, g, t) in &s.complexes {
        o += &format!("${}$ & {g} & {t} \\\\\n", tex_name(n));
    }
    o += "\\end{tabular}\n\\par\\medskip\n";
    if !s.maps.is_empty() {
        o += "\\noindent\n\\begin{tabular}{llr}\nmap & & terms \\\\\n\\hline\n";
        for (n, f, t, k) in &s.maps {
            o += &format!("${}$ & ${} \\to {}$ & {k} \\\\\n", tex_name(n), tex_name(f), tex_name(t));
        }
        o += "\\end{tabular}\n\\par\\medskip\n";
    }
    o += "\\noindent Every complex satisfies $\\partial\\circ\\partial = 0$ and every map is a homogeneous chain map.\n\n\\paragraph{Claims.}\n\\begin{enumerate}\n";
    for c in &s.claims {
        let status = if c.ok { "" } else { " \\textbf{(FAILED)}" };
        o += &format!(
            "\\item {}{}{status} \\hfill {{\\small {}; witness terms: {}}}\n",
            tex_claim(&c.claim, &ring.variables, &ring.gradings, r.version),
            tex_text(c.caveat),
            c.kind.replace('_', "\\_"),
            witness_size(&c.claim)
        );
        if c.reading.is_some() || c.objects.is_some() || !c.witnesses.is_empty() {
            o += "\\begin{itemize}\n";
            if let Some(reading) = &c.reading {
                o += &format!("\\item Reading: {}.\n", tex_text(reading));
            }
            if let Some(objects) = &c.objects {
                o += &format!("\\item {}\n", objects.tex);
            }
            for w in &c.witnesses {
                o += &tex_witness(w);
            }
            o += "\\end{itemize}\n";
        }
    }
    o += "\\end{enumerate}\n";
    o += &format!(
        "\\paragraph{{Re-verification.}}\n\\texttt{{tubecheck {} -{{}}-expect}} {hash}\n",
        breakable(&tex_text(&r.file))
    );
    o
}

/// A whole LaTeX document around the fragments of one or more certificates (`--standalone`).
pub fn latex_document(fragments: &[String]) -> String {
    let mut o = String::from(
        "\\documentclass{article}\n\\usepackage{amsmath,amssymb}\n\\usepackage[margin=2.5cm]{geometry}\n\\begin{document}\n\\section*{Machine-checked certificates}\n",
    );
    for f in fragments {
        o += f;
        o += "\n";
    }
    o += "\\end{document}\n";
    o
}
