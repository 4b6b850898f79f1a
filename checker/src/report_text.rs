//! Human-readable report of verified results. Presentation only: it formats what
//! [`crate::verify`] established and decides nothing.

use crate::verify::ClaimResult;
use crate::FileReport;
use std::fmt::Write as _;
use tubecert_format::bordered::Bordered;
use tubecert_format::statement::{render_expr, render_grading};
use tubecert_format::{Claim, Grading, MapExpr, Term};

/// Each result with the body's claim it checked (`None` for the implicit checks, listed first).
pub fn paired(r: &FileReport) -> impl Iterator<Item = (&ClaimResult, Option<&Claim>)> {
    let implicit = r.claims.iter().filter(|c| c.implicit).count();
    r.claims.iter().zip(std::iter::repeat_n(None, implicit).chain(r.body.claims.iter().map(Some)))
}

/// Generators of a bordered object written out beside its claim; beyond, they are counted.
pub const OBJECT_GENERATORS: usize = 24;

/// A bordered grading as the element it stands for: (j; p, q; a) of LOT's grading group from
/// the doubled [2j, 2p, 2q, 2a] (version 3 on), else as written (version 2: (Maslov, Alexander)).
pub fn group_element(g: &Grading) -> String {
    let half = |x: i64| if x % 2 == 0 { (x / 2).to_string() } else { format!("{x}/2") };
    match g.as_slice() {
        [j, p, q, a] => format!("({}; {}, {}; {})", half(*j), half(*p), half(*q), half(*a)),
        _ => render_grading(g),
    }
}

/// A bordered object beside a claim about it. Its period and its generators' gradings fix what
/// a box tensor product's gradings mean, and no statement carries them (they are hashed data).
pub struct Object<'a> {
    pub name: &'a str,
    /// `'A'`: a type A module, period h_A; `'D'`: a type D structure, period h_D.
    pub side: char,
    pub period: Option<&'a Grading>,
    /// The first generators asked for: name, idempotent, grading (a structure's may have none).
    pub generators: Vec<(&'a str, u8, Option<&'a Grading>)>,
    /// How many generators it has.
    pub count: usize,
}

/// The objects shown beside a claim: the one a `type_a_module` / `type_d_structure` claim checks,
/// generators included (`true`; the first `limit` of them), or the module and structures a box
/// tensor claim pairs, whose periods its gradings are read with (`false`: periods only). Only
/// what is shown is listed: a file may hold many claims about one large object.
pub fn objects<'a>(claim: &Claim, b: Option<&'a Bordered>, limit: usize) -> (Vec<Object<'a>>, bool) {
    let Some(b) = b else { return (vec![], false) };
    let all = matches!(claim, Claim::TypeAModule { .. } | Claim::TypeDStructure { .. });
    let limit = if all { limit } else { 0 };
    let module = |n: &str| {
        b.type_a_modules.get_key_value(n).map(|(name, m)| Object {
            name,
            side: 'A',
            period: m.period.as_ref(),
            generators: m
                .generators
                .iter()
                .take(limit)
                .map(|(x, g)| (x.as_str(), g.idempotent, Some(&g.grading)))
                .collect(),
            count: m.generators.len(),
        })
    };
    let structure = |n: &str| {
        b.type_d_structures.get_key_value(n).map(|(name, d)| Object {
            name,
            side: 'D',
            period: d.period.as_ref(),
            generators: d
                .generators
                .iter()
                .take(limit)
                .map(|(x, g)| (x.as_str(), g.idempotent, g.grading.as_ref()))
                .collect(),
            count: d.generators.len(),
        })
    };
    match claim {
        Claim::TypeAModule { module: m, .. } => (module(m).into_iter().collect(), true),
        Claim::TypeDStructure { structure: n, .. } => (structure(n).into_iter().collect(), true),
        Claim::BoxTensor { module: m, structure: n, .. } => {
            (module(m).into_iter().chain(structure(n)).collect(), false)
        }
        Claim::BoxTensorMap { module: m, morphism, .. } => {
            let ends = b.type_d_morphisms.get(morphism).map_or(vec![], |f| vec![structure(&f.from), structure(&f.to)]);
            (module(m).into_iter().chain(ends.into_iter().flatten()).collect(), false)
        }
        _ => (vec![], false),
    }
}

/// How the pieces of an objects line are written: plainly ([`PLAIN`]) or in LaTeX.
pub struct Notation {
    pub name: fn(&str) -> String,
    /// The period h_A or h_D (side `'A'` or `'D'`) of an object, and its value if one is written.
    pub period: fn(char, &str, Option<&str>) -> String,
    /// A generator's idempotent and grading (if it has one).
    pub generator: fn(u8, Option<&str>) -> String,
    /// The words around them.
    pub words: fn(&str) -> String,
}

/// The text and Markdown reports' notation.
pub const PLAIN: Notation = Notation {
    name: str::to_string,
    period: |side, o, v| v.map_or(format!("h_{side}({o}): none written"), |v| format!("h_{side}({o}) = {v}")),
    generator: |i, g| format!("ι{i}{}", g.map_or(String::new(), |g| format!(" {g}"))),
    words: str::to_string,
};

/// The line shown beside a claim: the periods a box tensor product's gradings are read with
/// (those written; version 2 has none, its gradings are added), or the checked object with its
/// generators, the first [`OBJECT_GENERATORS`] written out.
pub fn objects_line(objects: &[Object], with_generators: bool, n: &Notation) -> Option<String> {
    let period = |o: &Object| (n.period)(o.side, o.name, o.period.map(group_element).as_deref());
    if !with_generators {
        let periods: Vec<String> = objects.iter().filter(|o| o.period.is_some()).map(period).collect();
        return (!periods.is_empty()).then(|| format!("{}{}", (n.words)("periods: "), periods.join(", ")));
    }
    let o = objects.first()?;
    let shown: Vec<String> = o
        .generators
        .iter()
        .take(OBJECT_GENERATORS)
        .map(|(x, i, g)| format!("{} {}", (n.name)(x), (n.generator)(*i, g.map(group_element).as_deref())))
        .collect();
    let (count, more) = (o.count, o.count.saturating_sub(OBJECT_GENERATORS));
    let words = format!("; {count} generator{} (idempotent, grading): ", if count == 1 { "" } else { "s" });
    let rest = if more > 0 { format!(", … ({more} more)") } else { String::new() };
    Some(format!(
        "{}{}{}{}{}",
        (n.words)("period and generators: "),
        period(o),
        (n.words)(&words),
        shown.join(", "),
        (n.words)(&rest)
    ))
}

/// A dual witness in the familiar form, when all its triples start at one generator x: the
/// functional ψ ↦ c(ψ(x)), with c = Σ (m·w)* a functional on the target ("y = x ⊗ c").
pub fn factored_dual(phi: &MapExpr, y: &[Term]) -> Option<String> {
    let x = &y.first()?[0];
    // Monomials are printed as written: only in their plain form (no spaces or line breaks).
    if y.iter().any(|t| &t[0] != x || t[1].chars().any(|c| c.is_whitespace() || c.is_control())) {
        return None;
    }
    let c: Vec<String> =
        y.iter().map(|[_, m, w]| if m == "1" { format!("{w}*") } else { format!("({m}·{w})*") }).collect();
    Some(format!(
        "ψ ↦ c(ψ({x})) with c = {}; it is 1 on {} and vanishes on every ∂H + H∂",
        c.join(" + "),
        render_expr(phi)
    ))
}

/// The map a claim's dual witness detects, and the witness.
fn dual_of(c: &Claim) -> Option<(MapExpr, &[Term])> {
    match c {
        Claim::NotNullHomotopic { map, witness, .. } => Some((map.clone(), &witness.dual)),
        Claim::TorsionOrder { maps: [f, g], variable, order, witness, .. } => {
            Some((MapExpr::scaled_difference(f, g, variable, order.checked_sub(1)?), witness.dual.as_deref()?))
        }
        _ => None,
    }
}

/// A failure message with control characters (which it may quote from the file, e.g. a
/// witness term naming no generator) shown as `<U+XXXX>`, so it cannot print lines of its own.
fn shown(e: &str) -> String {
    e.chars().map(|c| if c.is_control() { format!("<U+{:04X}>", c as u32) } else { c.to_string() }).collect()
}

pub fn render(r: &FileReport) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "{}", r.file);
    if r.hash_ok() {
        let _ = writeln!(s, "  sha256 {}  (matches the body)", r.sha256);
    } else {
        let _ = writeln!(s, "  ✗ sha256 stated {} but the body hashes to {}", r.stated_sha256, r.sha256);
    }
    let (implicit, listed): (Vec<_>, Vec<_>) = r.claims.iter().partition(|c| c.implicit);
    if implicit.iter().all(|c| c.outcome.is_ok()) {
        let count = |k: &str| implicit.iter().filter(|c| c.kind == k).count();
        let _ = writeln!(
            s,
            "  ✓ objects: {} complexes satisfy ∂∘∂ = 0 and are homogeneous; {} maps are homogeneous chain maps",
            count("complex"),
            count("chain_map")
        );
    }
    for (c, claim) in paired(r).filter(|(c, _)| !c.implicit || c.outcome.is_err()) {
        match &c.outcome {
            Ok(facts) => {
                let _ = writeln!(s, "  ✓ {}", c.statement);
                if let Some(reading) = facts.get("reading").and_then(|v| v.as_str()) {
                    let _ = writeln!(s, "      reading: {reading}");
                }
                if let Some(factored) = claim.and_then(dual_of).and_then(|(phi, y)| factored_dual(&phi, y)) {
                    let _ = writeln!(s, "      witness: {factored}");
                }
                let (objects, with_generators) =
                    claim.map_or((vec![], false), |c| objects(c, r.body.bordered.as_ref(), OBJECT_GENERATORS));
                if let Some(line) = objects_line(&objects, with_generators, &PLAIN) {
                    let _ = writeln!(s, "      {line}");
                }
            }
            Err(e) => {
                let _ = writeln!(s, "  ✗ [{}] {}\n      {}", c.kind, c.statement, shown(e));
            }
        }
    }
    let failed = listed.iter().filter(|c| c.outcome.is_err()).count();
    let _ = writeln!(s, "  {} claims: {} verified, {} failed", listed.len(), listed.len() - failed, failed);
    s
}

/// What a claim's wording leaves out and a report must say: a version-4 box tensor product's
/// Maslov normalization was a convention, and versions 2 and 3 normalize nothing, so the module's
/// declared gradings fix the absolute ones (version 5 certifies both). The version is outside the
/// hash: a later certificate can be restated as an earlier one, and is then reported as such.
pub fn caveat(claim: &Claim, version: u32) -> &'static str {
    match claim {
        Claim::BoxTensor { .. } | Claim::BoxTensorMap { .. } => match version {
            4 => " [format version 4: the Maslov normalization is by convention, not certified]",
            3 => " [format version 3: the gradings are not normalized; their absolute values are not certified]",
            2 => " [format version 2: the gradings are added, not normalized; their absolute values are not certified]",
            _ => "",
        },
        _ => "",
    }
}

/// The reading of a torsion-order claim about maps induced by surfaces, printed beside the
/// statement (not part of it, so not hashed). With ord = k: U^(k−1)·(F − G) is not
/// null-homotopic and U^k·(F − G) is, and each stabilization multiplies an induced map by the
/// variable, so the maps differ through k − 1 stabilizations of each surface and agree from k on.
pub fn surface_reading(variable: &str, order: u32) -> String {
    const WHY: &str = "a stabilization multiplies the induced map by";
    match order {
        0 => "the two surfaces' induced maps are homotopic: this invariant does not tell them apart".into(),
        1 => format!(
            "the induced maps differ, so the surfaces are distinct; once each surface is stabilized, the maps agree up to homotopy ({WHY} {variable}; Juhász–Zemke), so this invariant cannot tell the stabilized surfaces apart"
        ),
        k => format!(
            "the induced maps still differ after each surface is stabilized {} time{} ({WHY} {variable}; Juhász–Zemke), so the surfaces stay distinct through {} stabilization{}; after {k} stabilizations of each the maps agree up to homotopy, so from then on this invariant cannot tell them apart",
            k - 1,
            if k == 2 { "" } else { "s" },
            k - 1,
            if k == 2 { "" } else { "s" },
        ),
    }
}

/// What a certificate does and does not prove; printed by every report.
pub const SCOPE: &str = "Scope: a certificate proves algebraic identities about the complexes and maps it contains. \
It does not prove that they are the knot Floer complexes or the surface-induced maps of particular knots and surfaces.";

/// What a certificate with bordered claims does and does not prove; printed when it has one.
pub const BORDERED_SCOPE: &str = "Bordered claims: a box_tensor claim proves X = M ⊠ N exactly, with one side bounded (LOT §2.4), a complement claim that N is the type D structure LOT Thm 11.26 assigns to the complex C and the framing (with C's basis simultaneously simplified), or its bounded model where that one has a cycle (homotopy equivalent by the cancellation lemma, LOT §2), and the type_d_structure / type_a_module claims the structure relations. \
That M is the type A module of a given pattern (its generators' gradings and its period h_A included: declared by the certificate and used as written, and shown beside its claim), that C is the complex of a given knot, and the pairing theorem CFK^-(P(K)) ≃ CFA^-(P) ⊠ CFD(X_K) (LOT Thm 11.21) are the paper's to argue and cite.";

#[cfg(test)]
mod tests {
    #[test]
    fn each_order_reads_plainly() {
        let one = surface_reading("U", 1);
        assert!(one.starts_with("the induced maps differ, so the surfaces are distinct;"), "{one}");
        assert!(!one.contains("0 stabilization") && !one.contains("all this invariant"), "{one}");
        let two = surface_reading("U", 2);
        assert!(two.contains("stabilized 1 time (") && two.contains("through 1 stabilization;"), "{two}");
        assert!(two.contains("after 2 stabilizations of each the maps agree"), "{two}");
        let five = surface_reading("V", 5);
        assert!(five.contains("stabilized 4 times (") && five.contains("by V;"), "{five}");
        assert!(surface_reading("U", 0).contains("homotopic"));
    }

    use super::*;

    #[test]
    fn only_a_witness_with_one_source_generator_is_factored() {
        let phi = MapExpr::Named("F".into());
        let t = |x: &str, m: &str, w: &str| [x.to_string(), m.to_string(), w.to_string()];
        let one = [t("x", "1", "a"), t("x", "U", "b")];
        assert_eq!(
            factored_dual(&phi, &one).unwrap(),
            "ψ ↦ c(ψ(x)) with c = a* + (U·b)*; it is 1 on F and vanishes on every ∂H + H∂"
        );
        assert!(factored_dual(&phi, &[t("x", "1", "a"), t("z", "1", "a")]).is_none());
        assert!(factored_dual(&phi, &[]).is_none());
        assert!(factored_dual(&phi, &[t("x", "U \n U", "a")]).is_none());
        assert_eq!(shown("generator \"a\n✓ b\""), "generator \"a<U+000A>✓ b\"");
    }

    /// A large structure is summarized: its first OBJECT_GENERATORS generators, then a count.
    #[test]
    fn a_large_object_is_summarized() {
        let names: Vec<String> = (0..30).map(|k| format!("y{k:02}")).collect();
        let g = vec![1, -1, 1, 0];
        let o = Object {
            name: "N",
            side: 'D',
            period: None,
            generators: names.iter().map(|n| (n.as_str(), 1, Some(&g))).collect(),
            count: 30,
        };
        let line = objects_line(std::slice::from_ref(&o), true, &PLAIN).unwrap();
        assert!(line.starts_with("period and generators: h_D(N): none written; 30 generators (idempotent, grading): y00 ι1 (1/2; -1/2, 1/2; 0), "), "{line}");
        assert!(line.contains("y23 ι1") && !line.contains("y24") && line.ends_with(", … (6 more)"), "{line}");
        // Beside a pairing only the periods written are shown, and nothing when there are none.
        assert_eq!(objects_line(std::slice::from_ref(&o), false, &PLAIN), None);
        assert_eq!(group_element(&vec![11, 0, 2, 6]), "(11/2; 0, 1; 3)");
        assert_eq!(group_element(&vec![3, -2]), "(3, -2)");
    }
}
