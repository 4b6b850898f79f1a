//! The checks, one function per claim kind. Each re-computes both sides of an identity by
//! sparse arithmetic and compares them exactly; nothing is searched for.

use crate::algebra::{normalize, SparseMap};
use crate::load::{in_two_halves, read_complex, read_terms, Complex, Context, Errors, Map, Work};
use crate::report_terms::{compare, render_vector};
use crate::report_text::surface_reading;
use serde_json::{json, Value};
use std::collections::BTreeMap;
use tubecert_format::bordered::Bordered;
use tubecert_format::names::{check_name, check_object_name};
use tubecert_format::poly::parse_mono;
use tubecert_format::statement::{render, render_expr};
use tubecert_format::{BasisWitness, Body, Claim, Grading, MapExpr, Mono, RingInfo, Term, CERTIFICATE_VERSION};

/// The outcome of one claim: facts it established (for reports) or why it failed.
#[derive(Debug, Clone)]
pub struct ClaimResult {
    pub kind: String,
    pub statement: String,
    pub implicit: bool,
    pub outcome: Result<BTreeMap<String, Value>, String>,
}

/// Fails with `why()` unless `holds`.
pub fn ensure(holds: bool, why: impl FnOnce() -> String) -> Result<(), String> {
    holds.then_some(()).ok_or_else(why)
}

/// The first of `errors` as a failure, if there is one.
pub fn none_of(errors: &[String]) -> Result<(), String> {
    errors.first().map_or(Ok(()), |e| Err(e.clone()))
}

/// ∂∘∂ = 0 and ∂ homogeneous.
pub fn check_complex(ctx: &Context, c: usize) -> Result<(), String> {
    let cx = &ctx.complexes[c];
    none_of(&cx.defects)?;
    ctx.work.spend(cx.d.work_after(&cx.d), &format!("∂∂ of complex {}", cx.name))?;
    let check = |generators: std::ops::Range<usize>| {
        let mut dd = Vec::new();
        for x in generators {
            cx.d.apply_into(&cx.d.rows[x], &mut dd)?;
            ensure(dd.is_empty(), || format!("∂∂({}) = {} ≠ 0", cx.names[x], render_vector(ctx, c, &dd)))?;
        }
        Ok(())
    };
    in_two_halves(cx.d.rows.len(), check).into_iter().collect()
}

/// ∂_D∘f = f∘∂_C and f homogeneous.
pub fn check_chain_map(ctx: &Context, f: usize) -> Result<(), String> {
    let map = &ctx.maps[f];
    none_of(&map.defects)?;
    let (c, d) = (&ctx.complexes[map.from], &ctx.complexes[map.to]);
    let work = d.d.work_after(&map.m).saturating_add(map.m.work_after(&c.d));
    ctx.work.spend(work, &format!("∂f = f∂ for a map {} → {}", c.name, d.name))?;
    for (x, row) in map.m.rows.iter().enumerate() {
        compare(ctx, map.to, &c.names[x], "∂f", &d.d.apply(row)?, "f∂", &map.m.apply(&c.d.rows[x])?)?;
    }
    Ok(())
}

/// A witness's terms as a map c → d homogeneous of `degree` (of any degree, one monomial per
/// term, without: a dual witness), its reading counted first; any error fails the claim.
fn read_witness(
    ctx: &Context,
    c: &Complex,
    d: &Complex,
    degree: Option<&[i64]>,
    terms: &[Term],
    what: &str,
) -> Result<SparseMap, String> {
    ctx.work.spend(c.names.len() as u64 + terms.len() as u64, &format!("reading the {what}"))?;
    let mut errs = Errors::default();
    let (m, defects) = read_terms(&ctx.ring, c, d, degree, terms, what, &mut errs);
    none_of(&[errs.0, defects].concat()).map(|_| m)
}

/// φ = ∂H + H∂ for the witness H.
pub fn check_null_homotopic(ctx: &Context, phi: &Map, h: &[Term]) -> Result<(), String> {
    let (c, d) = (&ctx.complexes[phi.from], &ctx.complexes[phi.to]);
    let degree: Grading = phi.degree.iter().zip(&ctx.ring.differential_degree).map(|(a, b)| a - b).collect();
    let h = read_witness(ctx, c, d, Some(&degree), h, "homotopy")?;
    let work = d.d.work_after(&h).saturating_add(h.work_after(&c.d)).saturating_add(phi.m.size());
    ctx.work.spend(work, "∂H + H∂")?;
    for (x, row) in phi.m.rows.iter().enumerate() {
        let mut rhs = d.d.apply(&h.rows[x])?;
        rhs.extend(h.apply(&c.d.rows[x])?);
        normalize(&mut rhs);
        compare(ctx, phi.to, &c.names[x], "φ", row, "∂H + H∂", &rhs)?;
    }
    Ok(())
}

/// ⟨y, φ⟩ = 1 and δy = 0 for the functional y = Σ (x, m, w).
pub fn check_not_null_homotopic(ctx: &Context, phi: &Map, y: &[Term]) -> Result<(), String> {
    let (c, d) = (&ctx.complexes[phi.from], &ctx.complexes[phi.to]);
    let ymap = read_witness(ctx, c, d, None, y, "dual")?;
    let terms = || ymap.rows.iter().enumerate().flat_map(|(x, r)| r.iter().map(move |&(w, m)| (x, w, m)));
    let pairing = terms().filter(|&(x, w, m)| phi.m.rows[x].binary_search(&(w, m)).is_ok()).count() % 2;
    ensure(pairing == 1, || "⟨y, φ⟩ = 0: the functional does not detect φ".into())?;
    // δy = transpose of ψ ↦ ∂ψ + ψ∂, as triples (x, w, m).
    ctx.work.spend(d.d.size(), "the arrows into a dual witness")?;
    let mut wanted = vec![false; d.names.len()];
    terms().for_each(|(_, w, _)| wanted[w as usize] = true);
    let into_w = d.d.incoming_to(&wanted);
    let work = terms().map(|(x, w, _)| (into_w[w as usize].len() + c.d.rows[x].len()) as u64);
    ctx.work.spend(work.fold(0, u64::saturating_add), "δy")?;
    let mut dy: Vec<(u32, u32, Mono)> = Vec::new();
    for (x, w, m) in terms() {
        for &(w2, cf) in &into_w[w as usize] {
            dy.extend(m.checked_div(cf).map(|q| (x as u32, w2, q)));
        }
        for &(x2, cf) in &c.d.rows[x] {
            dy.extend(m.checked_div(cf).map(|q| (x2, w, q)));
        }
    }
    normalize(&mut dy);
    let Some(&(x, w, m)) = dy.first() else { return Ok(()) };
    let (x, m, w) = (&c.names[x as usize], m.render(&ctx.ring.variables), &d.names[w as usize]);
    Err(format!("δy ≠ 0: the term ({x}, {m}, {w}) survives, so y does not vanish on all boundaries ∂H + H∂"))
}

/// The homology of a complex over a PID read off a normal-form basis, sorted.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Decomposition {
    pub free: Vec<Grading>,
    pub torsion: Vec<(u32, Grading)>,
}

/// Checks a change of basis B, B⁻¹ and that B⁻¹∂B is in normal form; returns H_*. With `var`,
/// of the quotient C/(var) (over `F2[U,V]`, a PID).
pub fn check_homology(ctx: &Context, c: usize, var: Option<&str>, w: &BasisWitness) -> Result<Decomposition, String> {
    if let Some(v) = var {
        let q = ctx.quotient(c, v)?;
        let found = check_homology(&q, 0, None, w);
        ctx.work.spend(q.work.spent().saturating_sub(ctx.work.spent()), "the homology of a quotient")?;
        return found;
    }
    ensure(ctx.ring.num_vars() <= 1, || "homology claims need a PID: F2 or F2[U]".into())?;
    let (old, zero) = (&ctx.complexes[c], Some(&vec![0; ctx.ring.gradings.len()][..]));
    ctx.work.spend(w.generators.len() as u64, "reading a basis")?;
    let mut errs = Errors::default();
    let new = read_complex(&ctx.ring, "(new basis)", &w.generators, &[], &mut errs);
    none_of(&errs.0)?;
    let b = read_witness(ctx, &new, old, zero, &w.basis, "basis")?;
    let binv = read_witness(ctx, old, &new, zero, &w.inverse, "inverse")?;
    let work = [binv.work_after(&b), b.work_after(&binv), old.d.work_after(&b), binv.size(), b.size()];
    ctx.work.spend(work.iter().fold(0, |s, &w| s.saturating_add(w)), "B⁻¹B, BB⁻¹ and ∂B")?;
    let inverse = "the inverse does not invert the basis change";
    ensure(binv.after(&b)? == SparseMap::identity(new.names.len()), || format!("B⁻¹∘B ≠ id: {inverse}"))?;
    ensure(b.after(&binv)? == SparseMap::identity(old.names.len()), || format!("B∘B⁻¹ ≠ id: {inverse}"))?;
    let db = old.d.after(&b)?;
    ctx.work.spend(binv.work_after(&db), "B⁻¹∂B")?;
    let dnew = binv.after(&db)?;
    let (nf, mut target) = ("∂ in the new basis is not in normal form", vec![false; new.names.len()]);
    for (a, row) in dnew.rows.iter().enumerate() {
        match row.as_slice() {
            [] => {}
            [(t, _)] if !target[*t as usize] => target[*t as usize] = true,
            _ => return Err(format!("{nf} at {}", new.names[a])),
        }
    }
    let mut dec = Decomposition { free: vec![], torsion: vec![] };
    for (a, row) in dnew.rows.iter().enumerate() {
        match row.as_slice() {
            [_] if target[a] => return Err(format!("{nf}: {} is both hit and not a cycle", new.names[a])),
            [(t, m)] if m.0[0] > 0 => dec.torsion.push((m.0[0], new.gradings[*t as usize].to_vec())),
            [] if !target[a] => dec.free.push(new.gradings[a].to_vec()),
            _ => {}
        }
    }
    dec.free.sort();
    dec.torsion.sort();
    Ok(dec)
}

/// The Alexander grading τ is read in: over `F2[U]` the named grading, which U must lower by 1;
/// over `F2[U,V]` (on the V = 0 quotient) A = (g_1 − g_2)/2, which U must lower by 1, V raise by
/// 1 and ∂ preserve, named by `alexander` (not one of the ring's gradings). Anything else has
/// no τ, and the error says why.
pub fn alexander_of(r: &RingInfo, alexander: &str) -> Result<impl Fn(&[i64]) -> i64, String> {
    let two = r.num_vars() == 2;
    let a = if r.num_vars() == 1 { r.grading_index(alexander)? } else { 0 };
    let alex = move |g: &[i64]| if two { (g[0] - g[1]).div_euclid(2) } else { g[a] };
    match r.num_vars() {
        1 if r.var_degrees[0][a] == -1 => Ok(alex),
        2 if r.gradings.len() == 2
            && !r.gradings.iter().any(|g| g == alexander)
            && alex(&r.var_degrees[0]) == -1
            && alex(&r.var_degrees[1]) == 1
            && r.differential_degree[0] == r.differential_degree[1] =>
        {
            Ok(alex)
        }
        0 => Err("τ is read from the U-tower of the homology over F2[U] (V = 0); over F2 (the hat version) the homology has no tower: write the problem over F2[U] or F2[U,V]".into()),
        1 => Err(format!("τ is read in the Alexander grading, which U lowers by 1; U changes \"{alexander}\" by {}: name the Alexander grading (tau K alexander NAME)", r.var_degrees[0][a])),
        _ => Err(format!("τ over F2[U,V] is read on the V = 0 quotient in A = (g_1 − g_2)/2, named \"{alexander}\": it needs two gradings, U lowering A by 1, V raising it by 1, ∂ preserving it, and a name that is not one of the ring's gradings")),
    }
}

/// The names a claim holds are in the alphabet, and the monomials of its map expressions are
/// written canonically, so that its statement prints its fields and nothing else (exit 2).
pub fn check_claim_text(claim: &Claim, vars: &[String]) -> Result<(), String> {
    fn expr(e: &MapExpr, vars: &[String]) -> Result<(), String> {
        match e {
            MapExpr::Named(n) | MapExpr::Id(n) => check_object_name(n),
            MapExpr::Sum(es) | MapExpr::Compose(es) => es.iter().try_for_each(|e| expr(e, vars)),
            MapExpr::Times(m, e) => match parse_mono(m, vars)?.render(vars) {
                canonical if canonical == *m => expr(e, vars),
                canonical => Err(format!("monomial {m:?} must be written \"{canonical}\"")),
            },
        }
    }
    let (names, basis): (Vec<&String>, _) = match claim {
        Claim::Complex { complex, .. } => (vec![complex], None),
        Claim::ChainMap { map, .. } => (vec![map], None),
        Claim::NullHomotopic { map, .. } | Claim::NotNullHomotopic { map, .. } => return expr(map, vars),
        Claim::HomotopyEquivalence { maps, .. } => (maps.iter().collect(), None),
        Claim::TorsionOrder { maps: [f, g], variable, .. } => (vec![f, g, variable], None),
        Claim::Homology { complex, witness, .. } => (vec![complex], Some(witness)),
        Claim::TorsionOrderOfComplex { complex, variable, witness, .. } => (vec![complex, variable], Some(witness)),
        Claim::Tau { complex, alexander, witness, .. } => (vec![complex, alexander], Some(witness)),
        Claim::TypeDStructure { structure, .. } => (vec![structure], None),
        Claim::TypeAModule { module, .. } => (vec![module], None),
        Claim::TypeDMorphism { morphism, .. } => (vec![morphism], None),
        Claim::BoxTensor { complex, module, structure, .. } => (vec![complex, module, structure], None),
        Claim::BoxTensorMap { map, module, morphism, .. } => (vec![map, module, morphism], None),
        Claim::Complement { complex, structure, .. } => (vec![complex, structure], None),
    };
    let generators = basis.into_iter().flat_map(|w| w.generators.keys());
    names.into_iter().try_for_each(|n| check_object_name(n))?;
    generators.into_iter().try_for_each(|n| check_name(n))
}

/// The claim's statement is the checker's own wording of its fields.
pub fn check_statement(ctx: &Context, claim: &Claim, version: u32) -> Result<(), String> {
    let expected = render(claim, &ctx.ring, version);
    let why = || format!("the statement does not say what the claim's fields say; expected \"{expected}\"");
    ensure(claim.statement() == expected, why)
}

/// Verifies one claim of a certificate of format `version`; returns the facts it established.
pub fn check_claim(ctx: &Context, claim: &Claim, version: u32) -> Result<BTreeMap<String, Value>, String> {
    let vars = &ctx.ring.variables;
    check_statement(ctx, claim, version)?;
    let mut facts = BTreeMap::new();
    match claim {
        Claim::Complex { complex, .. } => check_complex(ctx, ctx.complex_named(complex)?)?,
        Claim::ChainMap { map, .. } => check_chain_map(ctx, ctx.map_named(map)?)?,
        Claim::NullHomotopic { map, witness, .. } => check_null_homotopic(ctx, &ctx.eval(map)?, &witness.homotopy)?,
        Claim::NotNullHomotopic { map, witness, .. } => check_not_null_homotopic(ctx, &ctx.eval(map)?, &witness.dual)?,
        Claim::HomotopyEquivalence { maps: [f, g], witness, .. } => {
            let named = |n: &String| MapExpr::Named(n.clone());
            // That f: C → D and g: D → C have opposite degrees is checked by evaluating g∘f + id_C;
            // of degree 0, since the statement reads as C ≃ D, which maps of degrees d and −d
            // prove only up to a shift by d (under which τ moves).
            let fe = &ctx.maps[ctx.map_named(f)?];
            ensure(fe.degree.iter().all(|&x| x == 0), || format!("{f} and {g} are not maps of degree 0"))?;
            let sides =
                [(f, g, fe.from, &witness.source_homotopy, "g∘f"), (g, f, fe.to, &witness.target_homotopy, "f∘g")];
            for (a, b, on, h, what) in sides {
                let id = MapExpr::Id(ctx.complexes[on].name.clone());
                let round_trip = MapExpr::Sum(vec![MapExpr::Compose(vec![named(b), named(a)]), id]);
                check_null_homotopic(ctx, &ctx.eval(&round_trip)?, h).map_err(|e| format!("{what} + id: {e}"))?;
            }
        }
        Claim::Homology { complex, free, torsion, witness, .. } => {
            let Decomposition { free: f, torsion: t } =
                check_homology(ctx, ctx.complex_named(complex)?, None, witness)?;
            let why = || format!("the basis shows free part {f:?} and torsion {t:?}, not what is claimed");
            ensure((&f, &t) == (free, torsion), why)?;
            facts.insert("free_rank".into(), json!(f.len()));
            facts.insert("free".into(), json!(f));
            facts.insert("torsion".into(), json!(t));
        }
        Claim::TorsionOrderOfComplex { complex, variable, order, witness, .. } => {
            let c = ctx.complex_named(complex)?;
            ensure(vars.contains(variable), || format!("variable {variable} is not the ring's variable"))?;
            // Over F2[U,V]: the homology of the quotient by the other variable, a PID.
            let dec = check_homology(ctx, c, vars.iter().find(|v| *v != variable).map(|v| &v[..]), witness)?;
            let found = dec.torsion.iter().map(|t| t.0).max().unwrap_or(0);
            ensure(found == *order, || format!("the basis shows torsion order {found}, not {order}"))?;
            facts.insert("order".into(), json!(order));
        }
        Claim::Tau { complex, alexander, tau, witness, .. } => {
            let c = ctx.complex_named(complex)?;
            let alex = alexander_of(&ctx.ring, alexander)?;
            // Version 1 did not name the grading: read it only where the words cannot mislead.
            let choices = ctx.ring.var_degrees.first().map_or(0, |d| d.iter().filter(|&&d| d == -1).count());
            let unnamed = version < 2 && vars.len() < 2 && ctx.ring.gradings.len() > 1;
            ensure(!unnamed || (alexander == "alexander" && choices <= 1), || {
                format!("a version-1 τ statement does not name its grading ({alexander}), and this ring has another: prove it again to name it")
            })?;
            let dec = check_homology(ctx, c, vars.get(1).map(|v| &v[..]), witness)?;
            let [g] = dec.free.as_slice() else {
                return Err(format!("τ needs free rank one; the basis shows free rank {}", dec.free.len()));
            };
            let odd = vars.len() == 2 && (g[0] - g[1]) % 2 != 0;
            ensure(!odd, || "the free generator has gr_U − gr_V odd: no Alexander grading".into())?;
            let a = alex(g);
            ensure(-a == *tau, || format!("the free generator has Alexander grading {a}, so τ = {}, not {tau}", -a))?;
            facts.insert("tau".into(), json!(tau));
        }
        Claim::TorsionOrder { maps: [f, g], variable, order, surfaces, witness, .. } => {
            ensure(vars.contains(variable), || format!("variable {variable} is not declared"))?;
            let at = |k: u32| MapExpr::scaled_difference(f, g, variable, k);
            check_null_homotopic(ctx, &ctx.eval(&at(*order))?, &witness.homotopy)
                .map_err(|e| format!("{} ≃ 0: {e}", render_expr(&at(*order))))?;
            match (order, &witness.dual) {
                (0, None) => {}
                (0, Some(_)) => return Err("order 0 takes no dual witness".into()),
                (k, Some(y)) => check_not_null_homotopic(ctx, &ctx.eval(&at(k - 1))?, y)
                    .map_err(|e| format!("{} ≄ 0: {e}", render_expr(&at(k - 1))))?,
                (_, None) => return Err("order ≥ 1 needs a dual witness for the order below".into()),
            }
            facts.insert("order".into(), json!(order));
            if *surfaces {
                facts.insert("reading".into(), json!(surface_reading(variable, *order)));
            }
        }
        _ => return Err("a bordered claim is checked by crate::bordered".into()),
    }
    Ok(facts)
}

/// The numbers a claim states are read under the bounds every other number is read under
/// (orders are exponents; gradings and τ are gradings), so no claim speaks of a number that
/// the arithmetic could not represent.
fn numbers_in_bounds(claim: &Claim) -> Result<(), String> {
    use tubecert_format::limits::{grading_in_bounds, MAX_EXPONENT, MAX_GRADING_ABS};
    let in_bounds = match claim {
        Claim::Homology { free, torsion, .. } => {
            let gradings = free.iter().chain(torsion.iter().map(|t| &t.1)).flatten();
            torsion.iter().all(|t| t.0 <= MAX_EXPONENT) && gradings.copied().all(grading_in_bounds)
        }
        Claim::TorsionOrder { order, .. } | Claim::TorsionOrderOfComplex { order, .. } => *order <= MAX_EXPONENT,
        Claim::Tau { tau, .. } => grading_in_bounds(*tau),
        _ => true,
    };
    let limits = format!("orders at most {MAX_EXPONENT}, gradings and τ within ±{MAX_GRADING_ABS}");
    ensure(in_bounds, || format!("a number of this {} claim is beyond the limits ({limits})", claim.kind()))
}

/// The implicit checks: every declared complex and map.
pub fn check_objects(ctx: &Context) -> Vec<ClaimResult> {
    let implicit = |claim: Claim, suffix: String, outcome: Result<(), String>| {
        let statement = render(&claim, &ctx.ring, CERTIFICATE_VERSION) + &suffix;
        ClaimResult { kind: claim.kind().into(), statement, implicit: true, outcome: outcome.map(|_| BTreeMap::new()) }
    };
    let complexes = ctx.complexes.iter().enumerate().map(|(i, c)| {
        let claim = Claim::Complex { complex: c.name.clone(), statement: String::new() };
        implicit(claim, String::new(), check_complex(ctx, i))
    });
    let maps = ctx.map_index.iter().map(|(name, &i)| {
        let (from, to) = (&ctx.complexes[ctx.maps[i].from].name, &ctx.complexes[ctx.maps[i].to].name);
        let claim = Claim::ChainMap { map: name.clone(), statement: String::new() };
        implicit(claim, format!(" {from} → {to}"), check_chain_map(ctx, i))
    });
    complexes.chain(maps).collect()
}

/// Verifies a whole body of a certificate of format `version` within `work_limit` units of
/// work (`limits::work_limit` of the file's size): implicit object checks, then each claim. A
/// file whose checks need more is refused (`Err`), not failed.
pub fn check_body(body: &Body, version: u32, work_limit: u64) -> Result<Vec<ClaimResult>, Vec<String>> {
    let mut ctx = crate::load::load(&body.ring, &body.complexes, &body.maps)?;
    ctx.work = Work::new(work_limit);
    check_loaded(ctx, None, body, version)
}

/// The rest of [`check_body`], on `ctx` loaded from the body's ring, complexes and maps with
/// its work budget set. `implicit`: [`check_objects`] of `ctx` already run within that budget
/// (a producer runs it before its claims exist), else it is run here.
pub fn check_loaded(
    ctx: Context,
    implicit: Option<Vec<ClaimResult>>,
    body: &Body,
    version: u32,
) -> Result<Vec<ClaimResult>, Vec<String>> {
    use crate::bordered::{Failure, Objects};
    for (i, claim) in body.claims.iter().enumerate() {
        let sound = check_claim_text(claim, &ctx.ring.variables).and_then(|_| numbers_in_bounds(claim));
        sound.map_err(|e| vec![format!("claim {}: {e}", i + 1)])?;
    }
    let b = body.bordered.as_ref();
    let mut objects = b.map(|b| Objects::load(b, written_items(body, b), version, &body.claims)).transpose()?;
    if let Some(b) = b {
        let mut names: Vec<&String> = body.complexes.keys().chain(b.full_complexes.keys()).collect();
        // Full maps share the namespace, and are never named like a map of the body.
        names.extend(b.full_maps.keys().chain(b.full_maps.keys().filter(|m| body.maps.contains_key(*m))));
        names.extend(b.type_d_structures.keys().chain(b.type_a_modules.keys()).chain(b.type_d_morphisms.keys()));
        names.sort();
        names.iter().try_for_each(|n| check_object_name(n)).map_err(|e| vec![format!("bordered object: {e}")])?;
        if let Some([n, _]) = names.windows(2).find(|w| w[0] == w[1]) {
            let why = "complexes and bordered objects share one namespace";
            return Err(vec![format!("the name \"{n}\" is used by two objects ({why})")]);
        }
    }
    let mut out = implicit.unwrap_or_else(|| check_objects(&ctx));
    if let Some(o) = objects.as_mut() {
        o.full.work = Work::new(ctx.work.limit);
        out.extend(check_objects(&o.full));
    }
    let full = objects.as_ref().map(|o| &o.full);
    // Work beyond a budget, in either context, makes the file unreadable, never a claim false.
    let first_refusal = || [Some(&ctx), full].into_iter().flatten().find_map(|c| c.work.refused.get());
    let refused = || first_refusal().map_or(Ok(()), |e| Err(vec![e.clone()]));
    for claim in &body.claims {
        refused()?;
        // A homotopy equivalence between full complexes is checked over F2[U,V].
        let on = match (claim, full) {
            (Claim::HomotopyEquivalence { maps, .. }, Some(f)) if f.map_index.contains_key(&maps[0]) => f,
            _ => &ctx,
        };
        let outcome = match crate::bordered::check(&ctx, objects.as_ref(), claim, version) {
            None => check_claim(on, claim, version),
            Some(Err(Failure::Refused(e))) => return Err(vec![format!("claim \"{}\": {e}", claim.statement())]),
            Some(Err(Failure::False(e))) => Err(e),
            Some(Ok(facts)) => Ok(facts),
        };
        out.push(ClaimResult {
            kind: claim.kind().into(),
            // What the fields say: a statement that differs is not shown as if it were checked.
            statement: render(claim, &ctx.ring, version) + crate::report_text::caveat(claim, version),
            implicit: false,
            outcome,
        });
    }
    refused().map(|_| out)
}

/// The number of written items (generators, terms, families, claims) of a body with a bordered
/// section `b`: the work budget of the bordered checks is proportional to it.
fn written_items(body: &Body, b: &Bordered) -> u64 {
    let complexes = body.complexes.values().chain(b.full_complexes.values());
    let maps = body.maps.values().chain(b.full_maps.values()).map(|m| m.terms.len());
    let d = b.type_d_structures.values().map(|d| d.generators.len() + d.differential.len());
    let a = b.type_a_modules.values().map(|m| m.generators.len() + m.operations.len());
    let f = b.type_d_morphisms.values().map(|f| f.terms.len());
    let items = complexes.map(|c| c.generators.len() + c.differential.len()).chain(maps).chain(d).chain(a).chain(f);
    (body.claims.len() + items.sum::<usize>()) as u64 + 1
}
