//! Bordered constructions: the core pattern module, type D structures of knot complements
//! (LOT Thm 11.26), box tensor products M ⊠ N and maps id_M ⊠ f, and `cable P Q`. The
//! arithmetic is the checker's own (`tubecheck::bordered`), so what is built here is exactly
//! what the checker recomputes; this module only resolves names, renders explicit objects and
//! records the claims that go with them.

pub mod diagram;
pub mod maslov;
pub mod simplify;

use serde_json::Value;
use std::cell::Cell;
use std::collections::BTreeMap;
use tubecert_format::bordered::{full_ring, AGenerator, Bordered, Family, MorphismSpec, TypeASpec, TypeDSpec};
use tubecert_format::{
    Claim, ComplexSpec, EquivalenceWitness, Grading, HatWitness, MapHatWitness, MapSpec, Ring, UniqueMap,
};
use tubecheck::bordered::{self as checked, Budget, Failure};

/// Work allowed for one construction (the checker's budget is proportional to the file).
const BUDGET: u64 = 1 << 32;

/// The bordered objects of a problem and the claims that come with them.
#[derive(Default, Debug, Clone)]
pub struct Built {
    pub full: BTreeMap<String, ComplexSpec>,
    /// Maps between full complexes: a change of basis and its inverse.
    pub full_maps: BTreeMap<String, MapSpec>,
    pub structures: BTreeMap<String, TypeDSpec>,
    pub modules: BTreeMap<String, TypeASpec>,
    pub morphisms: BTreeMap<String, MorphismSpec>,
    pub claims: Vec<Claim>,
    /// Longest input word of a module used by a box tensor product (its relations are
    /// certified on words of twice that length and more).
    pub longest: BTreeMap<String, usize>,
}

impl Built {
    /// The certificate section and all claims, `None` without bordered objects.
    pub fn finish(mut self) -> Option<(Bordered, Vec<Claim>)> {
        if self.full.is_empty() && self.structures.is_empty() && self.modules.is_empty() {
            return None;
        }
        let mut claims: Vec<Claim> = Vec::new();
        for n in self.structures.keys() {
            claims.push(Claim::TypeDStructure { structure: n.clone(), statement: String::new() });
        }
        for n in self.modules.keys() {
            let max_length = (2 * self.longest.get(n).copied().unwrap_or(0) + 2).max(8) as u32;
            claims.push(Claim::TypeAModule { module: n.clone(), max_length, statement: String::new() });
        }
        for n in self.morphisms.keys() {
            claims.push(Claim::TypeDMorphism { morphism: n.clone(), statement: String::new() });
        }
        claims.append(&mut self.claims);
        let section = Bordered {
            full_complexes: UniqueMap(self.full),
            full_maps: UniqueMap(self.full_maps),
            full_ring: full_ring(),
            type_a_modules: UniqueMap(self.modules),
            type_d_morphisms: UniqueMap(self.morphisms),
            type_d_structures: UniqueMap(self.structures),
        };
        Some((section, claims))
    }
}

/// The minus ring the bordered claims need: `F2[U]`, two gradings, deg U = (−2, −1), deg ∂ = (−1, 0).
fn is_minus_ring(r: &Ring) -> bool {
    r.variables == ["U"]
        && r.gradings.len() == 2
        && r.variable_degrees.get("U") == Some(&vec![-2, -1])
        && r.differential_degree == [-1, 0]
}

fn failure(f: Failure) -> String {
    match f {
        Failure::False(e) | Failure::Refused(e) => e,
    }
}

/// The core of the solid torus (the (1,1) cable pattern): one generator x in ι_0 and
/// m_{ℓ+2}(x, ρ3, ρ23^(ℓ−1), ρ2) = U^ℓ·x for ℓ ≥ 1 (LOT §11.4, recalled from memory), one family. Grading:
/// gr(x) = 1; the period is the grading of the periodic domain of m_3(x, ρ3, ρ2) = U·x,
/// gr(ρ3)·gr(ρ2)·λ·gr(U)⁻¹ = (3/2; 0, 1; 1), written doubled.
pub fn core_module() -> TypeASpec {
    let s = |v: &[&str]| v.iter().map(|x| x.to_string()).collect::<Vec<_>>();
    TypeASpec {
        generators: UniqueMap([("x".to_string(), AGenerator { grading: vec![0, 0, 0, 0], idempotent: 0 })].into()),
        operations: vec![Family {
            from: "x".into(),
            power: [1, 1],
            prefix: s(&["rho3"]),
            repeat: s(&["rho23"]),
            suffix: s(&["rho2"]),
            to: "x".into(),
        }],
        period: Some(vec![3, 0, 2, 2]),
    }
}

/// The module of the (p, 1) cable pattern: p = 1 the core (`core_module`), p ≥ 2 computed from
/// its genus-one diagram (`diagram::cable_module`).
pub fn cable_pattern(p: i64) -> Result<TypeASpec, String> {
    match p {
        1 => Ok(core_module()),
        2..=12 => Ok(diagram::cable_module(p as usize)?.module),
        _ => Err(format!("the (p, 1) cable pattern is built for 1 ≤ p ≤ 12, not p = {p}")),
    }
}

/// The module of the (p, r) cable pattern, 1 ≤ r < p coprime (or p = r = 1): r = 1 by
/// `cable_pattern`, the others from their genus-one diagrams (`diagram::torus_pattern_module`).
pub fn torus_pattern(p: i64, r: i64) -> Result<TypeASpec, String> {
    if r == 1 || p == 1 {
        return cable_pattern(p);
    }
    if !(2..=12).contains(&p) || r < 1 || r >= p {
        return Err(format!("the (p, r) cable pattern is built for 1 ≤ r < p ≤ 12, not ({p}, {r})"));
    }
    Ok(diagram::torus_pattern_module(p as usize, r as usize)?.module)
}

/// `{"beta": ["E1", "S1", …], "w": [SIDE, K]}`: the module of a genus-one doubly pointed
/// bordered diagram (layout in `diagram`).
fn diagram_module(v: &Value) -> Result<TypeASpec, String> {
    let usage = "diagram takes {\"beta\": [crossings such as \"E1\", \"S1\", \"N2\"], \"w\": [\"top\" | \"bottom\" | \"left\" | \"right\", interval]}";
    let o = v.as_object().filter(|o| o.len() == 2).ok_or(usage)?;
    let beta: Vec<String> = o.get("beta").and_then(|b| serde_json::from_value(b.clone()).ok()).ok_or(usage)?;
    let w: (String, usize) = o.get("w").and_then(|b| serde_json::from_value(b.clone()).ok()).ok_or(usage)?;
    let d = diagram::Diagram::read(&diagram::DiagramSpec { beta, w }).map_err(|e| format!("diagram: {e}"))?;
    // Enumerate to twice the number of crossings and six more: the families of the diagrams
    // tried have fixed parts of at most that length.
    let len = 2 * d.crossings() + 6;
    Ok(diagram::module(&d, len).map_err(|e| format!("diagram: {e}"))?.module)
}

/// A source complex over `ring` written inline: explicit, `staircase`, or `tensor` / `dual` /
/// `shift` / `direct_sum` of inline sources; a bare name stands for that complex's definition in
/// the problem, rebuilt over `ring` (a complex written out in full over another ring cannot be).
/// The result is validated over `ring` (∂∂ = 0, homogeneous) with errors naming it.
pub fn inline_source(
    ring: &Ring,
    v: &Value,
    defs: &BTreeMap<String, Value>,
    depth: usize,
) -> Result<ComplexSpec, String> {
    use crate::construct as c;
    if depth > 32 {
        return Err("sources nested deeper than 32 (or a definition refers to itself)".into());
    }
    let sub = |x: &Value| inline_source(ring, x, defs, depth + 1);
    if let Some(name) = v.as_str() {
        let def = defs.get(name).ok_or(format!("complex \"{name}\" is not declared"))?;
        if def.get("generators").is_some() {
            return Err(format!(
                "complex \"{name}\" is written out over this problem's ring; a source over the larger ring must be a construction or written inline"
            ));
        }
        return sub(def).map_err(|e| format!("{name}: {e}"));
    }
    let spec = if v.get("generators").is_some() {
        let mut spec: ComplexSpec = serde_json::from_value(v.clone()).map_err(|e| e.to_string())?;
        crate::notation::write_terms(&mut spec.differential, &ring.variables)?;
        spec
    } else {
        let (op, arg) = v
            .as_object()
            .filter(|o| o.len() == 1)
            .and_then(|o| o.iter().next())
            .ok_or("expected a complex: {generators, differential} or a one-key construction")?;
        let pair = || arg.as_array().filter(|a| a.len() == 2).ok_or(format!("\"{op}\" takes two sources"));
        match op.as_str() {
            "staircase" => c::build_staircase(ring, arg)?,
            "tensor" => {
                let a = pair()?;
                c::tensor(&sub(&a[0])?, &sub(&a[1])?)?
            }
            "direct_sum" => {
                let a = pair()?;
                let label = |x: &Value, d: &str| x.as_str().unwrap_or(d).to_string();
                c::direct_sum(&label(&a[0], "L"), &sub(&a[0])?, &label(&a[1], "R"), &sub(&a[1])?, None)?
            }
            "dual" => c::dual(&sub(arg)?),
            "shift" => {
                let a = pair()?;
                let s: Vec<i64> = serde_json::from_value(a[1].clone()).map_err(|e| format!("shift: {e}"))?;
                if s.len() != ring.gradings.len() {
                    return Err(format!("shift has {} entries, expected {}", s.len(), ring.gradings.len()));
                }
                c::shift(&sub(&a[0])?, &s)
            }
            other => return Err(format!("\"{other}\" cannot be a source (staircase, tensor, dual, shift, direct_sum, or a complex written inline)")),
        }
    };
    validate_over(ring, &spec)?;
    Ok(spec)
}

/// ∂∂ = 0 and homogeneity of a complex over `ring`, by the checker's code.
fn validate_over(ring: &Ring, spec: &ComplexSpec) -> Result<(), String> {
    let ctx =
        tubecheck::load::load(ring, &UniqueMap([("source".to_string(), spec.clone())].into()), &UniqueMap::default())
            .map_err(|e| e.join("; "))?;
    if let Some(d) = ctx.complexes[0].defects.first() {
        return Err(d.clone());
    }
    tubecheck::verify::check_complex(&ctx, 0)
}

/// The type D structure of the complement with framing t (LOT Thm 11.26, in its bounded model
/// where that one has a cycle), τ, and whether it is the bounded model.
pub fn complement_of(name: &str, c: &ComplexSpec, t: i64) -> Result<(TypeDSpec, i64, bool), String> {
    let ctx =
        tubecheck::load::load(&full_ring(), &UniqueMap([(name.to_string(), c.clone())].into()), &UniqueMap::default())
            .map_err(|e| e.join("; "))?;
    checked::complement(&ctx.complexes[0], t, true, true)
}

fn budget() -> Budget {
    Budget(Cell::new(BUDGET), Cell::new(0), Cell::new(0))
}

/// The complex M ⊠ N, the longest input word it used, and the witness of its Maslov
/// normalization (applied by the checker's own function).
pub fn box_tensor(m: &TypeASpec, n: &TypeDSpec) -> Result<(ComplexSpec, usize, HatWitness), String> {
    let (ma, nd) = (checked::read_module("M", m, true)?, checked::read_structure("N", n, true)?);
    let b = budget();
    let (mut gens, rows, _) = checked::tensor_map(&b, &ma, &nd, None, true, u64::MAX).map_err(failure)?;
    let w = maslov::hat_witness(&gens, &rows)?;
    let version = tubecert_format::CERTIFICATE_VERSION;
    tubecheck::maslov::certify(&b, &mut gens, &rows, Some(&w), version).map_err(failure)?;
    let mut differential = Vec::new();
    for ((_, _, name, _), row) in gens.iter().zip(&rows) {
        differential.extend(row.iter().map(|(t, p)| [name.clone(), power(*p), t.clone()]));
    }
    differential.sort();
    let generators = UniqueMap(gens.into_iter().map(|g| (g.2, g.3)).collect());
    Ok((ComplexSpec { generators, differential }, b.1.get(), w))
}

fn power(p: u32) -> String {
    match p {
        0 => "1".into(),
        1 => "U".into(),
        p => format!("U^{p}"),
    }
}

/// The map id_M ⊠ f between the complexes `from` = M ⊠ N and `to` = M ⊠ N′.
#[allow(clippy::too_many_arguments)]
pub fn box_tensor_map(
    m: &TypeASpec,
    f: &MorphismSpec,
    n: &TypeDSpec,
    n2: &TypeDSpec,
    from: (&str, &ComplexSpec),
    to: (&str, &ComplexSpec),
) -> Result<(MapSpec, usize), String> {
    let (ma, nd, nd2) = (
        checked::read_module("M", m, true)?,
        checked::read_structure(&f.from, n, true)?,
        checked::read_structure(&f.to, n2, true)?,
    );
    let fm = checked::read_arrows("f", &nd, &nd2, &f.terms)?;
    let b = budget();
    let (gens, rows, _) = checked::tensor_map(&b, &ma, &nd, Some((&fm, &nd2)), true, u64::MAX).map_err(failure)?;
    let mut terms = Vec::new();
    let mut degree: Option<Grading> = None;
    for ((_, _, name, _), row) in gens.iter().zip(&rows) {
        // Gradings as the complexes have them (each normalized by its own witness).
        let gr = from.1.generators.get(name).ok_or(format!("{name} is not a generator of {}", from.0))?;
        for (t, p) in row {
            // deg f = gr(target) + p·deg U − gr(source); the chain-map check confirms it for every term.
            let gt = to.1.generators.get(t).ok_or(format!("{t} is not a generator of {}", to.0))?;
            degree.get_or_insert_with(|| vec![gt[0] - 2 * *p as i64 - gr[0], gt[1] - *p as i64 - gr[1]]);
            terms.push([name.clone(), power(*p), t.clone()]);
        }
    }
    terms.sort();
    Ok((MapSpec { from: from.0.into(), to: to.0.into(), degree: degree.unwrap_or(vec![0, 0]), terms }, b.1.get()))
}

/// Reads the problem's bordered sections: type D structures (explicit or `complement`),
/// type A modules (explicit or `cable_pattern`) and type D morphisms.
pub fn resolve_sections(
    ring: &Ring,
    structures: &BTreeMap<String, Value>,
    modules: &BTreeMap<String, Value>,
    morphisms: &BTreeMap<String, Value>,
    defs: &BTreeMap<String, Value>,
    out: &mut Built,
    errs: &mut Vec<String>,
) {
    let any = !(structures.is_empty() && modules.is_empty() && morphisms.is_empty());
    if any && !is_minus_ring(ring) {
        errs.push("bordered objects need the minus ring F2[U] with gradings (maslov, alexander), deg U = (−2, −1), deg ∂ = (−1, 0)".into());
        return;
    }
    for (name, v) in structures {
        let r = match v.get("complement") {
            Some(arg) => complement_entry(name, arg, defs, out),
            None => serde_json::from_value::<TypeDSpec>(v.clone())
                .map_err(|e| format!("expected {{generators, differential}} or {{\"complement\": …}}: {e}"))
                .map(|s| {
                    out.structures.insert(name.clone(), s);
                }),
        };
        if let Err(e) = r {
            errs.push(format!("type D structure {name}: {e}"));
        }
    }
    for (name, v) in modules {
        let r = match (v.get("cable_pattern"), v.get("diagram")) {
            (Some(arg), _) => arg
                .get("p")
                .and_then(Value::as_i64)
                .ok_or("cable_pattern takes {\"p\": P}, P ≥ 1".to_string())
                .and_then(cable_pattern),
            (None, Some(arg)) => diagram_module(arg),
            (None, None) => serde_json::from_value::<TypeASpec>(v.clone()).map_err(|e| {
                format!("expected {{generators, operations, period}}, {{\"cable_pattern\": {{\"p\": P}}}} or {{\"diagram\": …}}: {e}")
            }),
        };
        match r {
            Ok(m) => {
                out.modules.insert(name.clone(), m);
            }
            Err(e) => errs.push(format!("type A module {name}: {e}")),
        }
    }
    for (name, v) in morphisms {
        match serde_json::from_value::<MorphismSpec>(v.clone()) {
            Ok(f) => {
                out.morphisms.insert(name.clone(), f);
            }
            Err(e) => errs.push(format!("type D morphism {name}: expected {{from, to, terms}}: {e}")),
        }
    }
}

/// `{"companion": SOURCE, "framing": t}` as the structure `name`, with its source `name.companion`.
fn complement_entry(name: &str, arg: &Value, defs: &BTreeMap<String, Value>, out: &mut Built) -> Result<(), String> {
    let src = arg.get("companion").ok_or("complement takes {\"companion\": SOURCE, \"framing\": t}")?;
    let t = arg.get("framing").and_then(Value::as_i64).ok_or("complement: \"framing\" must be an integer")?;
    add_complement(name, &format!("{name}.companion"), src, t, defs, out).map(|_| ())
}

/// Builds the complement of an inline source with framing t under `name`, the source under
/// `cname`; returns τ. A source whose basis as written is not simultaneously horizontally and
/// vertically simplified is carried to one that is when the search finds it: the new complex
/// `cname.simplified` (same generator names, each now standing for a combination), the changes
/// of basis `cname.to_simplified` and `cname.from_simplified` with their `homotopy_equivalence`
/// claim (mutually inverse: both homotopies are zero), and the complement is that of the new
/// complex.
fn add_complement(
    name: &str,
    cname: &str,
    src: &Value,
    t: i64,
    defs: &BTreeMap<String, Value>,
    out: &mut Built,
) -> Result<i64, String> {
    let c = inline_source(&full_ring(), src, defs, 0).map_err(|e| format!("source: {e}"))?;
    let cname = cname.to_string();
    let n = c.generators.len();
    let limit = 10_000 + 8 * n.saturating_mul(n);
    let s = simplify::simplify(&c, limit).map_err(|why| {
        format!("complex {cname}: {why}; LOT Thm 11.26 needs a basis that is simultaneously horizontally and vertically simplified (the general form, LOT Thm A.11, is not implemented)")
    })?;
    let complex = if s.changes == 0 {
        cname.clone()
    } else {
        let (sname, f, g) =
            (format!("{cname}.simplified"), format!("{cname}.to_simplified"), format!("{cname}.from_simplified"));
        let to = |mut m: MapSpec, from: &str, to: &str| {
            (m.from, m.to) = (from.to_string(), to.to_string());
            m
        };
        out.full_maps.insert(f.clone(), to(s.forward, &cname, &sname));
        out.full_maps.insert(g.clone(), to(s.backward, &sname, &cname));
        out.full.insert(sname.clone(), s.complex);
        out.claims.push(Claim::HomotopyEquivalence {
            maps: [f, g],
            statement: String::new(),
            witness: EquivalenceWitness { source_homotopy: Vec::new(), target_homotopy: Vec::new() },
        });
        sname
    };
    out.full.insert(cname, c);
    let (d, tau, split) = complement_of(&complex, &out.full[&complex], t)?;
    out.structures.insert(name.to_string(), d);
    out.claims.push(Claim::Complement {
        bounded_model: split.then_some(true),
        complex,
        framing: t,
        statement: String::new(),
        structure: name.into(),
        tau,
    });
    Ok(tau)
}

/// `{"box_tensor": [M, N]}`.
pub fn box_tensor_complex(name: &str, arg: &Value, out: &mut Built) -> Result<ComplexSpec, String> {
    let [m, n]: [String; 2] =
        serde_json::from_value(arg.clone()).map_err(|_| "box_tensor takes [MODULE, STRUCTURE]")?;
    let module = out.modules.get(&m).ok_or(format!("type A module \"{m}\" is not declared"))?;
    let structure = out.structures.get(&n).ok_or(format!("type D structure \"{n}\" is not declared"))?;
    let (c, longest, w) = box_tensor(module, structure)?;
    note_longest(out, &m, longest);
    let witness = Some(w);
    out.claims.push(Claim::BoxTensor {
        complex: name.into(),
        module: m,
        statement: String::new(),
        structure: n,
        witness,
    });
    Ok(c)
}

fn note_longest(out: &mut Built, m: &str, len: usize) {
    let e = out.longest.entry(m.to_string()).or_default();
    *e = (*e).max(len);
}

/// `{"cable": {"companion": SOURCE, "p": P, "q": Q}}`: the (P, r) pattern ⊠ the complement of
/// SOURCE with framing t = (Q − r)/P, r = 1 when Q ≡ 1 mod P, else Q mod P (the (p, r) pattern
/// with framing t gives the (p, pt + r) cable, recalled from memory; the tests check it against
/// torus knots and L-space cables), stored as `K.pattern`, `K.complement`, `K.companion`. r ≠ 1
/// is built for P ≤ `diagram::MAX_P_TORUS` only. Absolute gradings by the `box_tensor` claim's
/// normalization.
pub fn cable(
    name: &str,
    arg: &Value,
    ring: &Ring,
    defs: &BTreeMap<String, Value>,
    out: &mut Built,
) -> Result<ComplexSpec, String> {
    if !is_minus_ring(ring) {
        return Err("cable: the problem's ring must be the minus ring F2[U] with (maslov, alexander), deg U = (−2, −1), deg ∂ = (−1, 0)".into());
    }
    let src = arg.get("companion").ok_or("cable takes {\"companion\": SOURCE, \"p\": P, \"q\": Q}")?;
    let (p, q) = (arg.get("p").and_then(Value::as_i64), arg.get("q").and_then(Value::as_i64));
    let (Some(p), Some(q)) = (p, q) else { return Err("cable: \"p\" and \"q\" must be integers".into()) };
    if arg.as_object().is_some_and(|o| o.len() != 3) {
        return Err("cable takes exactly {\"companion\", \"p\", \"q\"}".into());
    }
    if p < 1 {
        return Err(format!("cable {p} {q}: P must be at least 1"));
    }
    // The (p, r) pattern with framing t of the complement gives the (p, pt + r) cable: r = 1 for
    // Q ≡ 1 mod P (and P = 1), else the residue of Q in 2 … P − 1.
    let r = if p == 1 || q.rem_euclid(p) == 1 { 1 } else { q.rem_euclid(p) };
    let max = diagram::MAX_P_TORUS as i64;
    if p >= 2 && crate::construct::gcd(p.min(u32::MAX as i64) as u32, q.rem_euclid(p) as u32) != 1 {
        return Err(format!(
            "cable {p} {q}: P and Q must be coprime (the (P, Q) cable of a knot is a knot only then); reachable: every coprime (P, Q) with 1 ≤ P ≤ {max}, and Q ≡ 1 mod P for {} ≤ P ≤ 12",
            max + 1
        ));
    }
    if r != 1 && p > max {
        return Err(format!(
            "cable {p} {q}: for P > {max} only the (P, PN + 1) cables are reachable (the (P, 1) pattern with framing N), so Q must be ≡ 1 mod P: for P = {p}, Q = …, {}, 1, {}, …; every coprime Q is reachable for P ≤ {max}",
            1 - p,
            1 + p
        ));
    }
    let t = (q - r) / p;
    let pattern = torus_pattern(p, r).map_err(|e| format!("cable {p} {q}: {e}"))?;
    let (mn, nn) = (format!("{name}.pattern"), format!("{name}.complement"));
    add_complement(&nn, &format!("{name}.companion"), src, t, defs, out)?;
    out.modules.insert(mn.clone(), pattern);
    box_tensor_complex(name, &serde_json::json!([mn, nn]), out)
}

/// `{"box_tensor_map": [M, f]}` between the complexes declared `{"box_tensor": [M, f.from]}` and
/// `{"box_tensor": [M, f.to]}`.
pub fn box_tensor_map_entry(
    name: &str,
    arg: &Value,
    defs: &BTreeMap<String, Value>,
    built: &BTreeMap<String, ComplexSpec>,
    out: &mut Built,
) -> Result<MapSpec, String> {
    let [m, f]: [String; 2] =
        serde_json::from_value(arg.clone()).map_err(|_| "box_tensor_map takes [MODULE, MORPHISM]")?;
    let module = out.modules.get(&m).ok_or(format!("type A module \"{m}\" is not declared"))?;
    let mor = out.morphisms.get(&f).ok_or(format!("type D morphism \"{f}\" is not declared"))?;
    let get = |s: &str| out.structures.get(s).ok_or(format!("type D structure \"{s}\" is not declared"));
    let (n, n2) = (get(&mor.from)?, get(&mor.to)?);
    // M ⊠ s: a complex declared {"box_tensor": [M, s]}, or a cable K whose complement is s
    // (`K.complement`) and whose pattern module is M's (the same module, under K's name).
    let find = |s: &str| -> Result<(&str, &ComplexSpec), String> {
        let want = serde_json::json!({"box_tensor": [m, s]});
        let cable = |k: &str, v: &Value| {
            v.get("cable").is_some()
                && s == format!("{k}.complement")
                && out.modules.get(&format!("{k}.pattern")).is_some_and(|p| p == module)
        };
        let (k, _) = defs.iter().find(|(k, v)| **v == want || cable(k, v)).ok_or(format!(
            "box_tensor_map: declare a complex {want} first, or a cable whose complement is {s} and whose pattern is {m}"
        ))?;
        Ok((k.as_str(), built.get(k).ok_or(format!("complex {k} was not built"))?))
    };
    let (map, longest) = box_tensor_map(module, mor, n, n2, find(&mor.from)?, find(&mor.to)?)?;
    // The checker also counts the words of M ⊠ N and M ⊠ N′ (what id_M ⊠ f maps between).
    // The same construction as the complexes: the same witnesses of their normalizations.
    let ((_, k1, from), (_, k2, to)) = (box_tensor(module, n)?, box_tensor(module, n2)?);
    note_longest(out, &m, longest.max(k1).max(k2));
    let witness = Some(MapHatWitness { from, to });
    out.claims.push(Claim::BoxTensorMap {
        map: name.into(),
        module: m,
        morphism: f,
        statement: String::new(),
        witness,
    });
    Ok(map)
}
