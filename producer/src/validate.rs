//! Validation of a problem before any search: everything the checker will check, reported
//! at once (up to a limit), plus the goals' references.

use crate::notation::parse_mono;
use crate::problem::{Goal, Problem};
use tubecert_format::limits::{work_limit, MAX_EXPONENT};
use tubecert_format::MapExpr;
use tubecheck::load::{load_lenient, Context, Errors, Work};
use tubecheck::verify::{check_chain_map, check_complex};

/// The size of a problem written out in full, in bytes (about): what its work limit is
/// measured by, as a certificate's is by its file size, so that constructions count at the
/// size they expand to (itself bounded by `construct::CONSTRUCTED_BASE`).
pub fn written_size(p: &Problem) -> u64 {
    let term = |t: &[String; 3]| 10 + t.iter().map(|s| s.len() as u64).sum::<u64>();
    let complexes = p.complexes.iter().map(|(n, c)| {
        let gens: u64 = c.generators.iter().map(|(g, gr)| 4 + g.len() as u64 + 3 * gr.len() as u64).sum();
        n.len() as u64 + gens + c.differential.iter().map(term).sum::<u64>()
    });
    let maps = p.maps.iter().map(|(n, m)| n.len() as u64 + m.terms.iter().map(term).sum::<u64>());
    complexes.chain(maps).sum()
}

pub fn validate(p: &Problem) -> Result<Context, Vec<String>> {
    let (mut ctx, mut errs) = load_lenient(&p.ring, &p.complexes, &p.maps)?;
    crate::notation::explain(p, &mut errs.0);
    ctx.work = Work::new(work_limit(written_size(p)));
    // ∂∂ and chain-map checks are meaningful only when every term resolved.
    let complete = errs.0.is_empty();
    for (i, c) in ctx.complexes.iter().enumerate() {
        for d in &c.defects {
            errs.push(d.clone());
        }
        if complete && c.defects.is_empty() {
            if let Err(e) = check_complex(&ctx, i) {
                errs.push(format!("complex {}: {e}", c.name));
            }
        }
    }
    for (name, &i) in &ctx.map_index {
        let m = &ctx.maps[i];
        for d in &m.defects {
            errs.push(d.clone());
        }
        if complete
            && m.defects.is_empty()
            && ctx.complexes[m.from].defects.is_empty()
            && ctx.complexes[m.to].defects.is_empty()
        {
            if let Err(e) = check_chain_map(&ctx, i) {
                errs.push(format!("map {name} is not a chain map: {e}"));
            }
        }
    }
    if let Some(b) = &p.bordered {
        // The bordered claims are decided by construction; a written object that breaks its
        // relations is an input error, said here rather than by the final self-check.
        match tubecheck::bordered::Objects::load(b, 1 << 30, tubecert_format::CERTIFICATE_VERSION, &p.bordered_claims) {
            Err(es) => es.into_iter().for_each(|e| errs.push(e)),
            Ok(o) => {
                for claim in &p.bordered_claims {
                    if let Some(Err(
                        tubecheck::bordered::Failure::False(e) | tubecheck::bordered::Failure::Refused(e),
                    )) = tubecheck::bordered::check(&ctx, Some(&o), claim, tubecert_format::CERTIFICATE_VERSION)
                    {
                        // Said of the object, so that a text problem's message points at its line.
                        use tubecert_format::Claim::{TypeAModule, TypeDMorphism, TypeDStructure};
                        let object = match claim {
                            TypeDStructure { structure, .. } => Some(format!("type D structure {structure}")),
                            TypeAModule { module, .. } => Some(format!("type A module {module}")),
                            TypeDMorphism { morphism, .. } => Some(format!("type D morphism {morphism}")),
                            _ => None,
                        };
                        errs.push(match object {
                            Some(o) if e.starts_with(&o) => e,
                            Some(o) => format!("{o}: {e} ({})", claim.statement()),
                            None => format!("{}: {e}", claim.statement()),
                        });
                    }
                }
            }
        }
    }
    for (k, goal) in p.goals.iter().enumerate() {
        let at = format!("goal {}", k + 1);
        let map = |n: &String, errs: &mut Errors| {
            if !ctx.map_index.contains_key(n) {
                errs.push(format!("{at}: map \"{n}\" is not declared{}", ctx.hint(n, ctx.map_index.keys())));
            }
        };
        let complex = |n: &String, errs: &mut Errors| {
            if !ctx.complex_index.contains_key(n) {
                errs.push(format!("{at}: complex \"{n}\" is not declared{}", ctx.hint(n, ctx.complex_index.keys())));
            }
        };
        let variable = |v: &String, errs: &mut Errors| {
            if ctx.ring.var_index(v).is_none() {
                errs.push(format!("{at}: variable \"{v}\" is not declared (the ring has {:?})", ctx.ring.variables));
            }
        };
        let expr = |e: &MapExpr, errs: &mut Errors| {
            if let Err(msg) = ctx.eval(e) {
                errs.push(format!("{at}: {msg}"));
            }
        };
        let ring = &ctx.ring;
        match goal {
            Goal::TorsionOrder { maps, variable: v, order, max_order, .. } => {
                maps.iter().for_each(|m| map(m, &mut errs));
                variable(v, &mut errs);
                // Orders are exponents: bounded like every exponent, before the search uses them.
                if order.iter().chain([max_order]).any(|&k| k > MAX_EXPONENT) {
                    errs.push(format!("{at}: order and max_order are exponents, at most {MAX_EXPONENT}"));
                }
                if maps.iter().all(|m| ctx.map_index.contains_key(m)) {
                    expr(&Goal::pair_expr(maps, &None), &mut errs);
                }
            }
            Goal::Homotopic { maps, times } | Goal::Distinct { maps, times } => {
                maps.iter().for_each(|m| map(m, &mut errs));
                if let Some(t) = times {
                    if let Err(e) = parse_mono(t, &ring.variables) {
                        errs.push(format!("{at}: times: {e}"));
                    }
                }
                if maps.iter().all(|m| ctx.map_index.contains_key(m)) {
                    expr(&Goal::pair_expr(maps, times), &mut errs);
                }
            }
            Goal::NullHomotopic { map: e } | Goal::NotNullHomotopic { map: e } => expr(e, &mut errs),
            Goal::Homology { complex: c } => {
                complex(c, &mut errs);
                if ring.num_vars() > 1 {
                    errs.push(format!(
                        "{at}: homology {c}: over F2[U,V], which is not a principal ideal domain, H_* has no decomposition into towers and torsion; quotient first (a problem over F2[U] with complex Q = quotient V of …), or ask for tau / torsion_order_of_complex, which read the V = 0 quotient themselves"
                    ));
                }
            }
            Goal::Tau { complex: c, alexander } => {
                complex(c, &mut errs);
                if let Err(e) = tubecheck::verify::alexander_of(ring, alexander) {
                    errs.push(format!("{at}: tau {c}: {e}"));
                }
            }
            Goal::TorsionOrderOfComplex { complex: c, variable: v } => {
                complex(c, &mut errs);
                variable(v, &mut errs);
            }
            Goal::Equivalent { complexes, maps } => {
                complexes.iter().for_each(|c| complex(c, &mut errs));
                maps.iter().for_each(|m| map(m, &mut errs));
                // A homotopy equivalence preserves gradings: maps of degrees d and −d prove C ≃ D only
                // up to a shift (the checker refuses them).
                for m in maps
                    .iter()
                    .filter(|m| ctx.map_index.get(*m).is_some_and(|&i| ctx.maps[i].degree.iter().any(|&x| x != 0)))
                {
                    errs.push(format!(
                        "{at}: equivalent: {m} must have degree 0 (a homotopy equivalence preserves the gradings)"
                    ));
                }
                let ends = |m: &String| ctx.map_index.get(m).map(|&i| (ctx.maps[i].from, ctx.maps[i].to));
                let ids = (ctx.complex_index.get(&complexes[0]), ctx.complex_index.get(&complexes[1]));
                if let (Some(f), Some(g), (Some(&c), Some(&d))) = (ends(&maps[0]), ends(&maps[1]), ids) {
                    if (f, g) != ((c, d), (d, c)) {
                        let [cn, dn] = complexes;
                        errs.push(format!(
                            "{at}: equivalent: {} must map {cn} → {dn} and {} map {dn} → {cn}",
                            maps[0], maps[1]
                        ));
                    }
                }
            }
        }
    }
    ctx.work = Work::new(u64::MAX); // the budget bounds validation; the search is the prover's
    errs.0.is_empty().then_some(ctx).ok_or(errs.0)
}
