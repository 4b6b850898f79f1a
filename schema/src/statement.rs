//! The one wording of each claim. The producer writes it into the certificate; the checker
//! re-renders it from the claim's fields and refuses a claim whose statement differs, so the
//! sentence a reader sees is the one that was verified.

use crate::model::{Claim, Grading, MapExpr};

/// Mathematical notation for a map expression, e.g. `U^2·(F + G)`.
pub fn render_expr(e: &MapExpr) -> String {
    match e {
        MapExpr::Named(n) => n.clone(),
        MapExpr::Id(c) => format!("id_{c}"),
        MapExpr::Sum(es) => format!("({})", es.iter().map(render_expr).collect::<Vec<_>>().join(" + ")),
        MapExpr::Compose(es) => es.iter().map(render_expr).collect::<Vec<_>>().join("∘"),
        MapExpr::Times(m, e) => format!("{m}·{}", render_expr(e)),
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

/// The statement of a claim. `ring_name` is e.g. `F2[U]`; `variable` the ring's first variable
/// (used by homology).
pub fn render(claim: &Claim, ring_name: &str, first_variable: &str) -> String {
    match claim {
        Claim::Complex { complex, .. } => {
            format!("{complex} is a chain complex over {ring_name} (∂∘∂ = 0, ∂ homogeneous)")
        }
        Claim::ChainMap { map, .. } => format!("{map} is a homogeneous chain map"),
        Claim::NullHomotopic { map, .. } => format!("{} ≃ 0 (null-homotopic)", render_expr(map)),
        Claim::NotNullHomotopic { map, .. } => format!("{} is not null-homotopic", render_expr(map)),
        Claim::HomotopyEquivalence { maps: [f, g], .. } => {
            format!("{f} and {g} are mutually inverse homotopy equivalences")
        }
        Claim::Homology { complex, free, torsion, .. } => {
            format!("H_*({complex}) ≅ {}", render_homology(ring_name, first_variable, free, torsion))
        }
        Claim::TorsionOrder { maps: [f, g], variable, order, .. } => format!("ord_{variable}({f} − {g}) = {order}"),
        Claim::TorsionOrderOfComplex { complex, variable, order, .. } => match other_variable(ring_name, variable) {
            Some(o) => format!("Ord_{variable}(H_*({complex}/({o}))) = {order} (read on the {o} = 0 quotient)"),
            None => format!("Ord_{variable}(H_*({complex})) = {order}"),
        },
        Claim::Tau { complex, tau, .. } => match other_variable(ring_name, "U") {
            Some(_) => {
                format!("τ({complex}) = {tau} (read on {complex}/(V), the V = 0 quotient, with A = (gr_U − gr_V)/2)")
            }
            None => format!("τ({complex}) = {tau}"),
        },
    }
}

/// Over a ring of two variables, the one that is not `variable` (quotiented out to read homology).
fn other_variable<'a>(ring_name: &'a str, variable: &str) -> Option<&'a str> {
    let vars = ring_name.strip_prefix("F2[")?.strip_suffix(']')?;
    let (a, b) = vars.split_once(',')?;
    Some(if a == variable { b } else { a })
}

/// The reading of a torsion-order claim about maps induced by surfaces.
pub fn surface_reading(variable: &str, order: u32) -> String {
    if order == 0 {
        return "the two surfaces' induced maps are homotopic: this invariant does not tell them apart".into();
    }
    format!(
        "the surfaces stay distinct after {} stabilization{} (each internal stabilization multiplies the induced map by {variable}; Juhász–Zemke), and {order} is all this invariant can see",
        order - 1,
        if order == 2 { "" } else { "s" }
    )
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
