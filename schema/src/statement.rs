//! The one wording of each claim. The producer writes it into the certificate; the checker
//! re-renders it from the claim's fields and refuses a claim whose statement differs, so the
//! sentence a reader sees is the one that was verified.

use crate::model::{Claim, Grading, MapExpr, CERTIFICATE_VERSION};
use crate::ring::RingInfo;

/// Mathematical notation for a map expression, e.g. `U^2·(F + G)`, as the current format
/// version writes it: every statement reads back as exactly one expression.
pub fn render_expr(e: &MapExpr) -> String {
    expr_in(e, CERTIFICATE_VERSION)
}

/// Version 1 wrote a composite inside a composition without parentheses (`U·F∘G` for both
/// U·(F∘G) and (U·F)∘G: the same map, two readings); version 2 brackets it.
fn expr_in(e: &MapExpr, version: u32) -> String {
    let inner = |e: &MapExpr| match e {
        MapExpr::Compose(_) | MapExpr::Times(..) if version >= 2 => format!("({})", expr_in(e, version)),
        _ => expr_in(e, version),
    };
    match e {
        MapExpr::Named(n) => n.clone(),
        MapExpr::Id(c) => format!("id_{c}"),
        MapExpr::Sum(es) => format!("({})", es.iter().map(|e| expr_in(e, version)).collect::<Vec<_>>().join(" + ")),
        MapExpr::Compose(es) => es.iter().map(inner).collect::<Vec<_>>().join("∘"),
        MapExpr::Times(m, e) if matches!(**e, MapExpr::Compose(_)) => format!("{m}·{}", inner(e)),
        MapExpr::Times(m, e) => format!("{m}·{}", expr_in(e, version)),
    }
}

pub fn render_grading(g: &Grading) -> String {
    format!("({})", g.iter().map(|x| x.to_string()).collect::<Vec<_>>().join(", "))
}

/// `R⟨g⟩ ⊕ R/(v^k)⟨g⟩ ⊕ …` for a homology decomposition over `ring_name`.
pub fn render_homology(ring_name: &str, var: &str, free: &[Grading], torsion: &[(u32, Grading)]) -> String {
    let mut parts: Vec<String> = free.iter().map(|g| format!("{ring_name}⟨{}⟩", render_grading(g))).collect();
    for (k, g) in torsion {
        let power = if *k == 1 { var.to_string() } else { format!("{var}^{k}") };
        parts.push(format!("{ring_name}/({power})⟨{}⟩", render_grading(g)));
    }
    if parts.is_empty() {
        "0".into()
    } else {
        parts.join(" ⊕ ")
    }
}

/// The statement of a claim in a certificate of format `version` over `ring`. Every field that
/// changes what is proved appears in it (`surfaces` only selects a reading printed beside it,
/// derived from the variable and the order); version 1 left out τ's grading (see DEVELOPERS.md).
pub fn render(claim: &Claim, ring: &RingInfo, version: u32) -> String {
    let ring_name = &ring_name(&ring.variables);
    let first_variable = ring.variables.first().map_or("", |v| v.as_str());
    let expr = |e: &MapExpr| expr_in(e, version);
    match claim {
        Claim::Complex { complex, .. } => {
            format!("{complex} is a chain complex over {ring_name} (∂∘∂ = 0, ∂ homogeneous)")
        }
        Claim::ChainMap { map, .. } => format!("{map} is a homogeneous chain map"),
        Claim::NullHomotopic { map, .. } => format!("{} ≃ 0 (null-homotopic)", expr(map)),
        Claim::NotNullHomotopic { map, .. } => format!("{} is not null-homotopic", expr(map)),
        Claim::HomotopyEquivalence { maps: [f, g], .. } => {
            format!("{f} and {g} are mutually inverse homotopy equivalences")
        }
        Claim::Homology { complex, free, torsion, .. } => {
            format!("H_*({complex}) ≅ {}", render_homology(ring_name, first_variable, free, torsion))
        }
        Claim::TorsionOrder { maps: [f, g], variable, order, .. } => format!("ord_{variable}({f} − {g}) = {order}"),
        Claim::TorsionOrderOfComplex { complex, variable, order, .. } => {
            match ring.variables.iter().find(|v| *v != variable).filter(|_| ring.variables.len() == 2) {
                Some(o) => format!("Ord_{variable}(H_*({complex}/({o}))) = {order} (read on the {o} = 0 quotient)"),
                None => format!("Ord_{variable}(H_*({complex})) = {order}"),
            }
        }
        // Over F2[U,V] τ is read on the V = 0 quotient, in the grading A = (g_1 − g_2)/2, which
        // the claim's `alexander` names (checked by `verify::alexander_of`).
        Claim::Tau { complex, tau, alexander, .. } if ring.variables.len() == 2 && ring.gradings.len() == 2 => {
            let (g, v) = (&ring.gradings, &ring.variables[1]);
            format!(
                "τ({complex}) = {tau} (Alexander grading {alexander} = ({} − {})/2, read on {complex}/({v}), the {v} = 0 quotient)",
                g[0], g[1]
            )
        }
        Claim::Tau { complex, tau, alexander, .. } if version >= 2 && ring.gradings.len() > 1 => {
            format!("τ({complex}) = {tau} (Alexander grading {alexander})")
        }
        Claim::Tau { complex, tau, .. } => format!("τ({complex}) = {tau}"),
        Claim::TypeDStructure { structure, .. } => {
            format!("{structure} is a type D structure over A(T²) ((μ ⊗ id)(id ⊗ δ¹)δ¹ = 0, idempotents match)")
        }
        Claim::TypeAModule { module, max_length, .. } => format!(
            "{module} is a strictly unital type A module over A(T²) with coefficients in F2[U] (A∞ relations on every input word of length ≤ {max_length})"
        ),
        Claim::TypeDMorphism { morphism, .. } => format!("{morphism} is a type D morphism with ∂{morphism} = 0"),
        Claim::BoxTensor { complex, module, structure, .. } if version >= 5 => format!(
            "{complex} = {module} ⊠ {structure} (box tensor product, (Maslov, Alexander) read from gr(x)·gr(y) in LOT's grading group, then shifted by s·(2, 1) with the one s making Σ(−1)^M t^A symmetric under t ↔ t⁻¹, and in M alone so that a witnessed cycle of {complex}/(U − 1), non-zero in homology, has M − 2A = 0, the degree of HF-hat(S³) ≅ F2)"
        ),
        Claim::BoxTensor { complex, module, structure, .. } if version >= 4 => format!(
            "{complex} = {module} ⊠ {structure} (box tensor product, (Maslov, Alexander) read from gr(x)·gr(y) in LOT's grading group, then shifted by s·(2, 1) with the one s making Σ(−1)^M t^A symmetric under t ↔ t⁻¹)"
        ),
        Claim::BoxTensor { complex, module, structure, .. } if version >= 3 => format!(
            "{complex} = {module} ⊠ {structure} (box tensor product, (Maslov, Alexander) read from gr(x)·gr(y) in LOT's grading group)"
        ),
        Claim::BoxTensor { complex, module, structure, .. } => {
            format!("{complex} = {module} ⊠ {structure} (box tensor product, gradings added)")
        }
        Claim::BoxTensorMap { map, module, morphism, .. } if version >= 5 => format!(
            "{map} = id_{module} ⊠ {morphism} (source and target graded as box tensor products, each with its own witnessed cycle in degree M − 2A = 0)"
        ),
        Claim::BoxTensorMap { map, module, morphism, .. } => format!("{map} = id_{module} ⊠ {morphism}"),
        Claim::Complement { bounded_model: None, structure, complex, framing, tau, .. } => format!(
            "{structure} = CFD of the complement of the knot with complex {complex}, framing {framing} (LOT Thm 11.26), τ = {tau}"
        ),
        Claim::Complement { structure, complex, framing, tau, .. } => format!(
            "{structure} ≃ CFD of the complement of the knot with complex {complex}, framing {framing}: the bounded model (LOT Thm 11.26's structure with ξ_0's unstable arrow split through a cancelling pair, homotopy equivalent by the cancellation lemma, LOT §2), τ = {tau}"
        ),
    }
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

/// Written name of the ring, e.g. `F2[U,V]`.
pub fn ring_name(variables: &[String]) -> String {
    if variables.is_empty() {
        "F2".into()
    } else {
        format!("F2[{}]", variables.join(","))
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
    use super::surface_reading;

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
}
