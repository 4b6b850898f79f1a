//! Human-readable report of verified results. Presentation only: it formats what
//! [`crate::verify`] established and decides nothing.

use crate::FileReport;
use std::fmt::Write as _;
use tubecert_format::statement::render_expr;
use tubecert_format::{Claim, MapExpr, Term};

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
    // The listed results are the body's claims, in order.
    let claims = std::iter::repeat_n(None, implicit.len()).chain(r.body.claims.iter().map(Some));
    let results = implicit.iter().chain(listed.iter()).zip(claims).filter(|(c, _)| !c.implicit || c.outcome.is_err());
    for (c, claim) in results {
        match &c.outcome {
            Ok(facts) => {
                let _ = writeln!(s, "  ✓ {}", c.statement);
                if let Some(reading) = facts.get("reading").and_then(|v| v.as_str()) {
                    let _ = writeln!(s, "      reading: {reading}");
                }
                if let Some(factored) = claim.and_then(dual_of).and_then(|(phi, y)| factored_dual(&phi, y)) {
                    let _ = writeln!(s, "      witness: {factored}");
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
That M is the type A module of a given pattern, that C is the complex of a given knot, and the pairing theorem CFK^-(P(K)) ≃ CFA^-(P) ⊠ CFD(X_K) (LOT Thm 11.21) are the paper's to argue and cite.";

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
}
