//! Appendix-ready summaries of a verified certificate (`--report md`, `--report tex`).
//! Presentation only: everything shown was established by [`crate::verify`]; claims that
//! failed are listed as failed.

use crate::FileReport;
use tubecert_format::statement::{render_grading, ring_name, BORDERED_SCOPE, SCOPE};
use tubecert_format::{Claim, MapExpr};

/// The facts both formats show.
struct Summary {
    ring: String,
    conventions: Vec<String>,
    complexes: Vec<(String, usize, usize)>,
    maps: Vec<(String, String, String, usize)>,
    claims: Vec<(bool, String, String, usize)>,
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

fn summary(r: &FileReport, tex: bool) -> Summary {
    let b = &r.body;
    let vars = &b.ring.variables;
    let mut conventions = vec![format!("gradings ({})", b.ring.gradings.join(", "))];
    for v in vars {
        conventions.push(format!("deg {v} = {}", render_grading(&b.ring.variable_degrees[v])));
    }
    conventions.push(format!("deg ∂ = {}", render_grading(&b.ring.differential_degree)));
    let listed: Vec<_> = r.claims.iter().filter(|c| !c.implicit).collect();
    Summary {
        ring: ring_name(vars),
        conventions,
        complexes: b.complexes.iter().map(|(n, c)| (n.clone(), c.generators.len(), c.differential.len())).collect(),
        maps: b.maps.iter().map(|(n, m)| (n.clone(), m.from.clone(), m.to.clone(), m.terms.len())).collect(),
        claims: b
            .claims
            .iter()
            .zip(listed)
            .map(|(c, res)| {
                (
                    res.outcome.is_ok(),
                    c.kind().to_string(),
                    if tex { tex_claim(c, vars) } else { c.statement().to_string() },
                    witness_size(c),
                )
            })
            .collect(),
    }
}

pub fn markdown(r: &FileReport) -> String {
    let s = summary(r, false);
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
    o += "\n| | claim | kind | witness terms |\n|---|---|---|---|\n";
    for (ok, kind, text, w) in &s.claims {
        o += &format!("| {} | {text} | {kind} | {w} |\n", if *ok { "✓" } else { "✗ failed" });
    }
    o += &format!("\nEvery complex satisfies ∂∘∂ = 0 and every map is a homogeneous chain map (checked).\n\nRe-verify:\n\n```sh\ntubecheck {} --expect {}\n```\n", r.file, r.sha256);
    o
}

/// Escapes a name for LaTeX text inside \mathrm{}.
fn tex_name(n: &str) -> String {
    let mut out = String::new();
    for ch in n.chars() {
        match ch {
            '_' | '#' | '$' | '%' | '&' | '{' | '}' => out += &format!("\\{ch}"),
            '^' => out += "\\^{}",
            '~' => out += "\\~{}",
            '\\' => out += "\\textbackslash{}",
            '⊗' => out += "\\ensuremath{\\otimes}",
            c if c.is_ascii() => out.push(c),
            _ => out += "?",
        }
    }
    format!("\\mathrm{{{out}}}")
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
        MapExpr::Compose(es) => es.iter().map(tex_expr).collect::<Vec<_>>().join(" \\circ "),
        MapExpr::Times(m, e) => format!("{} \\cdot {}", tex_mono(m), tex_expr(e)),
    }
}

fn tex_grading(g: &[i64]) -> String {
    format!("({})", g.iter().map(|x| x.to_string()).collect::<Vec<_>>().join(","))
}

fn tex_claim(c: &Claim, vars: &[String]) -> String {
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
            format!("$\\operatorname{{Ord}}_{{{variable}}}(H_*({})) = {order}$", tex_name(complex))
        }
        Claim::Tau { complex, tau, .. } => format!("$\\tau({}) = {tau}$", tex_name(complex)),
        Claim::TypeDStructure { structure, .. } => {
            format!("${}$ is a type $D$ structure over $\\mathcal{{A}}(T^2)$", tex_name(structure))
        }
        Claim::TypeAModule { module, max_length, .. } => format!(
            "${}$ is a strictly unital type $A$ module over $\\mathcal{{A}}(T^2)$ (relations on words of length $\\le {max_length}$)",
            tex_name(module)
        ),
        Claim::TypeDMorphism { morphism, .. } => format!("${}$ is a type $D$ morphism, $\\partial {} = 0$", tex_name(morphism), tex_name(morphism)),
        Claim::BoxTensor { complex, module, structure, .. } => {
            format!("${} = {} \\boxtimes {}$", tex_name(complex), tex_name(module), tex_name(structure))
        }
        Claim::BoxTensorMap { map, module, morphism, .. } => {
            format!("${} = \\mathrm{{id}}_{{{}}} \\boxtimes {}$", tex_name(map), tex_name(module), tex_name(morphism))
        }
        Claim::Complement { bounded_model, structure, complex, framing, tau, .. } => format!(
            "${}$ {} $\\widehat{{CFD}}$ of the complement of the knot with complex ${}$, framing ${framing}$ (LOT Thm 11.26{}), $\\tau = {tau}$",
            tex_name(structure),
            if bounded_model.is_some() { "is homotopy equivalent to" } else { "is" },
            tex_name(complex),
            if bounded_model.is_some() { "; its bounded model by the cancellation lemma, LOT \\S 2" } else { "" }
        ),
    }
}

/// A standalone LaTeX document (the body can be pasted into an appendix).
pub fn latex(r: &FileReport) -> String {
    let s = summary(r, true);
    let tt = |x: &str| tex_name(x).replace("\\mathrm", "\\texttt");
    let mut o = String::from("\\documentclass{article}\n\\usepackage{amsmath,amssymb}\n\\begin{document}\n");
    // Long paths and hashes may break across lines.
    let breakable = |x: &str| x.replace('/', "/\\allowbreak{}");
    let hash: Vec<String> = r.sha256.as_bytes().chunks(16).map(|c| String::from_utf8_lossy(c).into_owned()).collect();
    let hash = format!("\\texttt{{{}}}", hash.join("\\allowbreak{}"));
    o += "\\section*{Machine-checked certificate}\n";
    o += &format!("File {}.\\\\\nSHA-256 of the RFC~8785 canonical body: {hash}.\n\n", breakable(&tt(&r.file)));
    o += &format!("\\emph{{{}}}\n\n", SCOPE);
    if r.body.bordered.is_some() {
        o += &format!(
            "\\emph{{{}}}\n\n",
            BORDERED_SCOPE.replace('⊠', "$\\boxtimes$").replace('≃', "$\\simeq$").replace("^-", "$^-$")
        );
    }
    let conv: Vec<String> =
        s.conventions.iter().map(|c| c.replace("deg ∂", "\\deg\\partial").replace("deg ", "\\deg ")).collect();
    o += &format!(
        "\\subsection*{{Ring and conventions}} ${}$; ${}$.\n\n",
        s.ring.replace("F2", "\\mathbb{F}_2"),
        conv.join("$, $").replace("gradings (", "\\text{gradings } (")
    );
    o += "\\subsection*{Objects}\n\\begin{tabular}{lrr}\ncomplex & generators & terms of $\\partial$ \\\\\n\\hline\n";
    for (n, g, t) in &s.complexes {
        o += &format!("${}$ & {g} & {t} \\\\\n", tex_name(n));
    }
    o += "\\end{tabular}\n\n";
    if !s.maps.is_empty() {
        o += "\\begin{tabular}{llr}\nmap & & terms \\\\\n\\hline\n";
        for (n, f, t, k) in &s.maps {
            o += &format!("${}$ & ${} \\to {}$ & {k} \\\\\n", tex_name(n), tex_name(f), tex_name(t));
        }
        o += "\\end{tabular}\n\n";
    }
    o += "Every complex satisfies $\\partial\\circ\\partial = 0$ and every map is a homogeneous chain map.\n\n\\subsection*{Claims}\n\\begin{enumerate}\n";
    for (ok, kind, text, w) in &s.claims {
        let status = if *ok { "" } else { " \\textbf{(FAILED)}" };
        o += &format!("\\item {text}{status} \\hfill {{\\small {} witness terms: {w}}}\n", kind.replace('_', "\\_"));
    }
    o += "\\end{enumerate}\n";
    let file = tex_name(&r.file).replace("\\mathrm{", "").trim_end_matches('}').to_string();
    o += &format!("\\subsection*{{Re-verification}}\n\\texttt{{tubecheck {} -{{}}-expect}} {hash}\n", breakable(&file));
    o += "\\end{document}\n";
    o
}
