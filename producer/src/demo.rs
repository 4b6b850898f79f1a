//! The demo scenario (invented complexes and maps, ours):
//!
//! - `disk-pair-p{1..6}`: over `F2[U]`, a complex with a free generator z, a tower ∂b = U^p·a and
//!   a cancelling pair, and two maps from a one-generator complex that differ by a; their
//!   difference is U^p-torsion and non-zero, the shape of two disks at stabilization distance p;
//! - `box-uv`: over `F2[U,V]`, a square ∂a = U^2·b + V·c, ∂b = V·d, ∂c = U^2·d beside a free
//!   generator, with ord_U = 2 and ord_V = 1 for a pair of maps;
//! - `ext-class`: over `F2[U]`, two maps that agree on homology but are not homotopic (the
//!   difference lives in Ext, so only the dual witness can tell them apart);
//! - `cabled-pair-p{1..4}` (from `examples/cabled-pair.template.json`): the whole bordered
//!   workflow. An invented companion C over `F2[U,V]` (a point z beside a square of side p:
//!   a → U^p·b + V^p·c, b → V^p·d, c → U^p·d) and the unknot; their complements at framing −1
//!   (LOT Thm 11.26); their cables `cable 1 0` (the core pattern ⊠ the complement); two type D
//!   morphisms f, f2 from the unknot's complement to C's (f2 differs from f by o ↦ d and
//!   γ1 ↦ ρ23·κp); the maps id ⊠ f and id ⊠ f2 between the cables; and ord_U(F − G) = p with
//!   its two witnesses and the surfaces reading;
//! - `cable-by-p{1..4}` (from `examples/cable-by-p.template.json`): the same pair with the
//!   square's side fixed at 2 and the cable as the parameter: the (p, 1 − p) cables (the (p, 1)
//!   pattern module from its genus-one diagram, framing −1), the same morphisms, id ⊠ f and
//!   id ⊠ f2 between the cables, and their torsion order with the surfaces reading.

use crate::problem::{Goal, Problem, PROBLEM_FORMAT};
use std::path::Path;
use tubecert_format::{ComplexSpec, MapSpec, Ring, Term, UniqueMap};

fn t(a: &str, c: &str, b: &str) -> Term {
    [a.into(), c.into(), b.into()]
}

fn complex(gens: &[(&str, [i64; 2])], d: Vec<Term>) -> ComplexSpec {
    ComplexSpec {
        generators: UniqueMap(gens.iter().map(|(n, g)| (n.to_string(), g.to_vec())).collect()),
        differential: d,
    }
}

fn map(from: &str, to: &str, terms: Vec<Term>) -> MapSpec {
    MapSpec { from: from.into(), to: to.into(), degree: vec![0, 0], terms }
}

pub fn minus_ring() -> Ring {
    Ring {
        variables: vec!["U".into()],
        gradings: vec!["maslov".into(), "alexander".into()],
        variable_degrees: UniqueMap([("U".to_string(), vec![-2, -1])].into()),
        differential_degree: vec![-1, 0],
    }
}

fn problem(ring: Ring, complexes: Vec<(&str, ComplexSpec)>, maps: Vec<(&str, MapSpec)>, goals: Vec<Goal>) -> Problem {
    Problem {
        format: PROBLEM_FORMAT.into(),
        version: 1,
        ring,
        complexes: UniqueMap(complexes.into_iter().map(|(n, c)| (n.to_string(), c)).collect()),
        maps: UniqueMap(maps.into_iter().map(|(n, m)| (n.to_string(), m)).collect()),
        goals,
        bordered: None,
        bordered_claims: Vec::new(),
    }
}

fn pair() -> [String; 2] {
    ["F".into(), "G".into()]
}

fn power(p: u32) -> String {
    if p == 1 {
        "U".into()
    } else {
        format!("U^{p}")
    }
}

/// Two maps O → K_p whose difference is U^p-torsion.
pub fn disk_pair(p: u32) -> Problem {
    let pi = p as i64;
    let k = complex(
        &[("z", [0, 0]), ("a", [0, 0]), ("b", [1 - 2 * pi, -pi]), ("x0", [0, 0]), ("x1", [1, 0])],
        vec![t("b", &power(p), "a"), t("x1", "1", "x0")],
    );
    let mut goals = vec![
        Goal::TorsionOrder { maps: pair(), variable: "U".into(), surfaces: true, order: Some(p), max_order: 64 },
        Goal::Homotopic { maps: pair(), times: Some(power(p)) },
    ];
    goals.push(Goal::Distinct { maps: pair(), times: (p > 1).then(|| power(p - 1)) });
    goals.push(Goal::Homology { complex: "K".into() });
    problem(
        minus_ring(),
        vec![("O", complex(&[("o", [0, 0])], vec![])), ("K", k)],
        vec![
            ("F", map("O", "K", vec![t("o", "1", "z"), t("o", "1", "x0")])),
            ("G", map("O", "K", vec![t("o", "1", "z"), t("o", "1", "a")])),
        ],
        goals,
    )
}

/// The `F2[U,V]` square beside a free generator.
pub fn box_uv() -> Problem {
    let ring = Ring {
        variables: vec!["U".into(), "V".into()],
        gradings: vec!["gr_U".into(), "gr_V".into()],
        variable_degrees: UniqueMap([("U".to_string(), vec![-2, 0]), ("V".to_string(), vec![0, -2])].into()),
        differential_degree: vec![-1, -1],
    };
    let k = complex(
        &[("x", [0, 0]), ("a", [-2, 0]), ("b", [1, -1]), ("c", [-3, 1]), ("d", [0, 0])],
        vec![t("a", "U^2", "b"), t("a", "V", "c"), t("b", "V", "d"), t("c", "U^2", "d")],
    );
    let goals = vec![
        Goal::TorsionOrder { maps: pair(), variable: "U".into(), surfaces: true, order: Some(2), max_order: 64 },
        Goal::TorsionOrder { maps: pair(), variable: "V".into(), surfaces: true, order: Some(1), max_order: 64 },
        Goal::Homotopic { maps: pair(), times: Some("U*V".into()) },
    ];
    problem(
        ring,
        vec![("O", complex(&[("o", [0, 0])], vec![])), ("K", k)],
        vec![
            ("F", map("O", "K", vec![t("o", "1", "x")])),
            ("G", map("O", "K", vec![t("o", "1", "x"), t("o", "1", "d")])),
        ],
        goals,
    )
}

/// Two maps equal on homology, not homotopic; their difference becomes null-homotopic after U.
pub fn ext_class() -> Problem {
    let c = complex(&[("z", [0, 0]), ("x", [0, 0]), ("y", [-1, -1])], vec![t("y", "U", "x")]);
    let d = complex(&[("z", [0, 0]), ("w", [-1, -1])], vec![]);
    let f = map("C", "D", vec![t("z", "1", "z"), t("y", "1", "w")]);
    let g = map("C", "D", vec![t("z", "1", "z")]);
    problem(
        minus_ring(),
        vec![("C", c), ("D", d)],
        vec![("F", f), ("G", g)],
        vec![
            Goal::Homology { complex: "C".into() },
            Goal::Homology { complex: "D".into() },
            Goal::Distinct { maps: pair(), times: None },
            Goal::TorsionOrder { maps: pair(), variable: "U".into(), surfaces: false, order: Some(1), max_order: 64 },
        ],
    )
}

/// Every demo problem with its file stem.
pub fn demo_problems() -> Vec<(String, Problem)> {
    let mut out: Vec<(String, Problem)> = (1..=6).map(|p| (format!("disk-pair-p{p}"), disk_pair(p))).collect();
    out.push(("box-uv".into(), box_uv()));
    out.push(("ext-class".into(), ext_class()));
    out
}

/// The bordered workflow's templates (see the module documentation): the square's side as the
/// parameter (core pattern), and the cable's P as the parameter ((P, 1 − P) cables, framing −1).
pub const CABLED_PAIR_TEMPLATE: &str = include_str!("../../examples/cabled-pair.template.json");
pub const CABLE_BY_P_TEMPLATE: &str = include_str!("../../examples/cable-by-p.template.json");

/// The written problems of the bordered workflow, p = 1 … 4 of each template: (file stem,
/// problem file bytes). They are kept as written (with their bordered sections), not as typed problems.
pub fn cabled_problems() -> Vec<(String, Vec<u8>)> {
    [(CABLED_PAIR_TEMPLATE, "cabled-pair-p"), (CABLE_BY_P_TEMPLATE, "cable-by-p")]
        .into_iter()
        .flat_map(|(text, stem)| {
            let template: serde_json::Value = serde_json::from_str(text).expect("the template is JSON");
            (1..=4).map(move |p| {
                let v = crate::family::instantiate(&template, "p", p).expect("the template instantiates");
                (format!("{stem}{p}"), written_bytes(&v))
            })
        })
        .collect()
}

/// Pretty JSON for a problem as written (constructions and bordered sections kept).
pub fn written_bytes(v: &serde_json::Value) -> Vec<u8> {
    let mut b = serde_json::to_vec_pretty(v).expect("JSON serializes");
    b.push(b'\n');
    b
}

/// Pretty JSON for a problem file (deterministic: maps are ordered).
pub fn problem_bytes(p: &Problem) -> Vec<u8> {
    let mut b = serde_json::to_vec_pretty(p).expect("problems serialize");
    b.push(b'\n');
    b
}

/// Writes `STEM.problem.json` and `STEM.cert.json` for each demo problem into `dir`.
pub fn write_demo(dir: &Path) -> Result<Vec<String>, String> {
    std::fs::create_dir_all(dir).map_err(|e| format!("{}: {e}", dir.display()))?;
    let mut lines = Vec::new();
    let typed = demo_problems().into_iter().map(|(stem, p)| (stem, problem_bytes(&p), Some(p)));
    let written = cabled_problems().into_iter().map(|(stem, b)| (stem, b, None));
    for (stem, bytes, p) in typed.chain(written) {
        let ppath = dir.join(format!("{stem}.problem.json"));
        std::fs::write(&ppath, &bytes).map_err(|e| format!("{}: {e}", ppath.display()))?;
        let p = match p {
            Some(p) => p,
            None => crate::problem::parse_problem(&bytes, &stem).map_err(|e| format!("{stem}: {}", e.join("; ")))?,
        };
        let ctx = crate::validate::validate(&p).map_err(|e| format!("{stem}: {}", e.join("; ")))?;
        let proved = crate::prove::prove(p, &ctx, &bytes)?;
        if !proved.all_as_stated {
            return Err(format!("{stem}: a demo goal came out false:\n{}", proved.lines.join("\n")));
        }
        let cpath = dir.join(format!("{stem}.cert.json"));
        std::fs::write(&cpath, &proved.file).map_err(|e| format!("{}: {e}", cpath.display()))?;
        lines.push(format!("{stem}: sha256 {}", proved.certificate.sha256));
        lines.extend(proved.lines.iter().map(|l| format!("  {l}")));
    }
    Ok(lines)
}
