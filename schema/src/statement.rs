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

/// The statement of a claim in a certificate of format `version` over `ring`. Every field that
/// changes what is proved appears in it (`surfaces` only selects a reading printed beside it,
/// derived from the variable and the order); version 1 left out τ's grading (DEVELOPERS.md,
/// "Format versions").
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
            let free = free.iter().map(|g| format!("{ring_name}⟨{}⟩", render_grading(g)));
            let power = |k: u32| if k == 1 { first_variable.to_string() } else { format!("{first_variable}^{k}") };
            let torsion = torsion.iter().map(|(k, g)| format!("{ring_name}/({})⟨{}⟩", power(*k), render_grading(g)));
            let parts: Vec<String> = free.chain(torsion).collect();
            format!("H_*({complex}) ≅ {}", if parts.is_empty() { "0".into() } else { parts.join(" ⊕ ") })
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
            let (g0, g1, v) = (&ring.gradings[0], &ring.gradings[1], &ring.variables[1]);
            format!(
                "τ({complex}) = {tau} (Alexander grading {alexander} = ({g0} − {g1})/2, read on {complex}/({v}), the {v} = 0 quotient)"
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

/// Written name of the ring, e.g. `F2[U,V]`.
pub fn ring_name(variables: &[String]) -> String {
    match variables {
        [] => "F2".into(),
        _ => format!("F2[{}]", variables.join(",")),
    }
}
