//! From a validated problem to a certificate: each goal is decided by the search, turned into
//! claims with witnesses, and the body is sealed with its hash. Before anything is returned the
//! body is re-verified by the checker's own code, so the producer never writes a certificate
//! that `tubecheck` would reject.

use crate::notation::parse_mono;
use crate::problem::{Goal, Problem};
use crate::search::homotopy::{HomTerm, Solver, Verdict};
use crate::search::monomials::render_poly;
use crate::search::normal_form::{normal_form, Pivots};
use crate::search::torsion::{torsion_order, TorsionOutcome};
use std::time::{Duration, Instant};
use tubecert_format::canonical::sha256_hex;
use tubecert_format::statement::render;
use tubecert_format::{
    BasisWitness, Body, Certificate, Claim, ComplexSpec, DualWitness, EquivalenceWitness, HomotopyWitness, MapExpr,
    MapSpec, Mono, Provenance, Term, TorsionWitness, UniqueMap, CERTIFICATE_VERSION,
};
use tubecheck::algebra::SparseMap;
use tubecheck::load::Context;
use tubecheck::report_text::surface_reading;
use tubecheck::verify::Decomposition;

/// What proving a problem gave.
pub struct Proved {
    pub certificate: Certificate,
    /// The certificate file's bytes (`canonical_writer::file_bytes` of `certificate`, written
    /// with the body serialized once).
    pub file: Vec<u8>,
    /// One line per goal for the terminal.
    pub lines: Vec<String>,
    /// False when some goal was false and its opposite was proved instead.
    pub all_as_stated: bool,
    /// Time per stage (reduce, solve, transport, self-check with the SHA-256 beside it, the
    /// canonical body written), for the bench.
    pub timings: Vec<(&'static str, Duration)>,
}

/// The `statement` field of any claim, to be filled in with [`render`]'s wording (the checker
/// only reads it, so this lives here).
pub fn statement_mut(claim: &mut Claim) -> &mut String {
    match claim {
        Claim::Complex { statement, .. }
        | Claim::ChainMap { statement, .. }
        | Claim::NullHomotopic { statement, .. }
        | Claim::NotNullHomotopic { statement, .. }
        | Claim::HomotopyEquivalence { statement, .. }
        | Claim::Homology { statement, .. }
        | Claim::TorsionOrder { statement, .. }
        | Claim::TorsionOrderOfComplex { statement, .. }
        | Claim::Tau { statement, .. }
        | Claim::TypeDStructure { statement, .. }
        | Claim::TypeAModule { statement, .. }
        | Claim::TypeDMorphism { statement, .. }
        | Claim::BoxTensor { statement, .. }
        | Claim::BoxTensorMap { statement, .. }
        | Claim::Complement { statement, .. } => statement,
    }
}

/// Terms `[from, coefficient, to]` from triples, grouped into polynomial coefficients.
pub fn terms_of(mut triples: Vec<(u32, Mono, u32)>, from: &[String], to: &[String], vars: &[String]) -> Vec<Term> {
    triples.sort_unstable_by_key(|&(x, m, w)| (x, w, m));
    triples
        .chunk_by(|a, b| (a.0, a.2) == (b.0, b.2))
        .map(|run| {
            let monos: Vec<Mono> = run.iter().map(|t| t.1).collect();
            [from[run[0].0 as usize].clone(), render_poly(&monos, vars), to[run[0].2 as usize].clone()]
        })
        .collect()
}

/// Dual witnesses keep one monomial per triple.
fn dual_terms(triples: &[HomTerm], from: &[String], to: &[String], vars: &[String]) -> Vec<Term> {
    let mut t = triples.to_vec();
    t.sort_unstable_by_key(|&(x, m, w)| (x, w, m));
    t.iter().map(|&(x, m, w)| [from[x as usize].clone(), m.render(vars), to[w as usize].clone()]).collect()
}

/// A normal-form basis witness and the decomposition it shows.
pub fn homology_witness(ctx: &Context, c: usize) -> Result<(BasisWitness, Decomposition), String> {
    if ctx.ring.num_vars() > 1 {
        return Err("homology is computed over F2 or F2[U]; quotient by a variable first".into());
    }
    let cx = &ctx.complexes[c];
    let nf = normal_form(cx, Pivots::Minimal)?;
    let vars = &ctx.ring.variables;
    let basis = nf.basis.iter().enumerate().flat_map(|(t, v)| v.iter().map(move |&(g, m)| (t as u32, m, g))).collect();
    let inverse =
        nf.inverse_rows.iter().enumerate().flat_map(|(t, v)| v.iter().map(move |&(g, m)| (g, m, t as u32))).collect();
    let witness = BasisWitness {
        generators: UniqueMap(cx.names.iter().cloned().zip(cx.gradings.iter().map(|g| g.to_vec())).collect()),
        basis: terms_of(basis, &cx.names, &cx.names, vars),
        inverse: terms_of(inverse, &cx.names, &cx.names, vars),
    };
    let mut free: Vec<Vec<i64>> = nf.survivors.iter().map(|&t| cx.gradings[t as usize].to_vec()).collect();
    let mut torsion: Vec<(u32, Vec<i64>)> = nf
        .pairs
        .iter()
        .filter(|p| p.2 != tubecert_format::Mono::ONE)
        .map(|&(_, b, m)| (m.0[0], cx.gradings[b as usize].to_vec()))
        .collect();
    free.sort();
    torsion.sort();
    Ok((witness, Decomposition { free, torsion }))
}

/// The basis witness and τ of complex c: over `F2[U,V]` read on the V = 0 quotient with
/// A = (gr_U − gr_V)/2, as the checker reads it. Errors say why τ is not defined.
pub fn tau_witness(ctx: &Context, c: usize, alexander: &str) -> Result<(BasisWitness, i64), String> {
    let name = &ctx.complexes[c].name;
    let two = ctx.ring.num_vars() == 2;
    let quotient = if two { Some(ctx.quotient(c, &ctx.ring.variables[1])?) } else { None };
    let (hctx, hc) = quotient.as_ref().map_or((ctx, c), |q| (q, 0));
    let alex = tubecheck::verify::alexander_of(&ctx.ring, alexander)?;
    let (witness, Decomposition { free, .. }) = homology_witness(hctx, hc)?;
    let [gen] = free.as_slice() else {
        return Err(format!(
            "τ({name}) needs homology{} of free rank one (as for a knot in S^3); it has free rank {}",
            if two { " of the V = 0 quotient" } else { "" },
            free.len()
        ));
    };
    if two && (gen[0] - gen[1]) % 2 != 0 {
        return Err(format!("τ({name}): the free generator has gr_U − gr_V odd, so no Alexander grading"));
    }
    Ok((witness, -alex(gen)))
}

/// What `prove` would refuse beyond validation, found without the witness search: τ needs
/// homology of free rank one. `check-input` runs this so that it accepts exactly what `prove`
/// decides.
pub fn preconditions(problem: &Problem, ctx: &Context) -> Vec<String> {
    let tau = |c: &String, a: &String| ctx.complex_named(c).and_then(|c| tau_witness(ctx, c, a)).err();
    let found = problem.goals.iter().enumerate().filter_map(|(i, g)| match g {
        Goal::Tau { complex, alexander } => tau(complex, alexander).map(|e| format!("goal {}: {e}", i + 1)),
        _ => None,
    });
    found.collect()
}

/// The expression with each monomial in its written form (`U^2V` → `U^2*V`): a claim's
/// statement prints its monomials as they are, and the checker requires this form.
fn canonical_monomials(e: MapExpr, vars: &[String]) -> Result<MapExpr, String> {
    let all = |es: Vec<MapExpr>| es.into_iter().map(|e| canonical_monomials(e, vars)).collect::<Result<Vec<_>, _>>();
    Ok(match e {
        MapExpr::Sum(es) => MapExpr::Sum(all(es)?),
        MapExpr::Compose(es) => MapExpr::Compose(all(es)?),
        MapExpr::Times(m, e) => {
            MapExpr::Times(parse_mono(&m, vars)?.render(vars), Box::new(canonical_monomials(*e, vars)?))
        }
        named_or_id => named_or_id,
    })
}

struct Builder<'a> {
    ctx: &'a Context,
    solver: Solver<'a>,
    claims: Vec<Claim>,
}

impl Builder<'_> {
    fn names(&self, c: usize) -> &[String] {
        &self.ctx.complexes[c].names
    }

    fn add(&mut self, mut claim: Claim) -> String {
        let text = render(&claim, &self.ctx.ring, CERTIFICATE_VERSION);
        *statement_mut(&mut claim) = text.clone();
        self.claims.push(claim);
        text
    }

    fn homotopy_terms(&self, from: usize, to: usize, h: Vec<HomTerm>) -> Vec<Term> {
        terms_of(h, self.names(from), self.names(to), &self.ctx.ring.variables)
    }

    /// Decides φ ≃ 0 and records the claim that holds; returns (holds, statement).
    fn decide_expr(&mut self, map: MapExpr) -> Result<(bool, String), String> {
        let phi = self.ctx.eval(&map)?;
        let map = canonical_monomials(map, &self.ctx.ring.variables)?;
        Ok(match self.solver.decide(&phi)? {
            Verdict::Null(h) => {
                let homotopy = self.homotopy_terms(phi.from, phi.to, h);
                (
                    true,
                    self.add(Claim::NullHomotopic {
                        map,
                        statement: String::new(),
                        witness: HomotopyWitness { homotopy },
                    }),
                )
            }
            Verdict::NotNull(y) => {
                let dual = dual_terms(&y, self.names(phi.from), self.names(phi.to), &self.ctx.ring.variables);
                (
                    false,
                    self.add(Claim::NotNullHomotopic { map, statement: String::new(), witness: DualWitness { dual } }),
                )
            }
        })
    }

    /// Proves one goal; returns (as stated, line to print).
    fn goal(&mut self, goal: &Goal) -> Result<(bool, String), String> {
        let ctx = self.ctx;
        match goal {
            Goal::TorsionOrder { maps: [f, g], variable, surfaces, order, max_order } => {
                let e = ctx.eval(&MapExpr::Named(f.clone()))?;
                match torsion_order(&self.solver, f, g, variable, *max_order)? {
                    TorsionOutcome::Order { k, homotopy, dual } => {
                        let homotopy = self.homotopy_terms(e.from, e.to, homotopy);
                        let dual =
                            dual.map(|y| dual_terms(&y, self.names(e.from), self.names(e.to), &ctx.ring.variables));
                        let witness = TorsionWitness { homotopy, dual };
                        let claim = Claim::TorsionOrder {
                            maps: [f.clone(), g.clone()],
                            variable: variable.clone(),
                            order: k,
                            surfaces: *surfaces,
                            statement: String::new(),
                            witness,
                        };
                        let mut line = self.add(claim);
                        if *surfaces {
                            line = format!("{line}\n      reading: {}", surface_reading(variable, k));
                        }
                        match order {
                            Some(want) if *want != k => {
                                Ok((false, format!("{line}\n      (the goal expected order {want})")))
                            }
                            _ => Ok((true, line)),
                        }
                    }
                    TorsionOutcome::NotTorsionUpTo { bound, dual } => {
                        let map = MapExpr::scaled_difference(f, g, variable, *max_order);
                        let dual = dual_terms(&dual, self.names(e.from), self.names(e.to), &ctx.ring.variables);
                        let line = self.add(Claim::NotNullHomotopic {
                            map,
                            statement: String::new(),
                            witness: DualWitness { dual },
                        });
                        Ok((false, format!("{line}: {f} − {g} is not {variable}-torsion up to {variable}^{bound}")))
                    }
                }
            }
            Goal::Homotopic { maps, times } => self.decide_expr(Goal::pair_expr(maps, times)),
            Goal::NullHomotopic { map } => self.decide_expr(map.clone()),
            Goal::Distinct { maps, times } => {
                self.decide_expr(Goal::pair_expr(maps, times)).map(|(held, l)| (!held, l))
            }
            Goal::NotNullHomotopic { map } => self.decide_expr(map.clone()).map(|(held, l)| (!held, l)),
            Goal::Homology { complex } => {
                let c = ctx.complex_named(complex)?;
                let (witness, Decomposition { free, torsion }) = homology_witness(ctx, c)?;
                Ok((
                    true,
                    self.add(Claim::Homology {
                        complex: complex.clone(),
                        free,
                        torsion,
                        statement: String::new(),
                        witness,
                    }),
                ))
            }
            Goal::TorsionOrderOfComplex { complex, variable } => {
                let c = ctx.complex_named(complex)?;
                // Over F2[U,V]: the quotient by the other variable, as the checker reads it.
                let other = ctx.ring.variables.iter().find(|v| *v != variable).filter(|_| ctx.ring.num_vars() == 2);
                let quotient = other.map(|o| ctx.quotient(c, o)).transpose()?;
                let (hctx, hc) = quotient.as_ref().map_or((ctx, c), |q| (q, 0));
                let (witness, Decomposition { torsion, .. }) = homology_witness(hctx, hc)?;
                let order = torsion.iter().map(|t| t.0).max().unwrap_or(0);
                let claim = Claim::TorsionOrderOfComplex {
                    complex: complex.clone(),
                    variable: variable.clone(),
                    order,
                    statement: String::new(),
                    witness,
                };
                Ok((true, self.add(claim)))
            }
            Goal::Tau { complex, alexander } => {
                let c = ctx.complex_named(complex)?;
                let (witness, tau) = tau_witness(ctx, c, alexander)?;
                let claim = Claim::Tau {
                    complex: complex.clone(),
                    alexander: alexander.clone(),
                    tau,
                    statement: String::new(),
                    witness,
                };
                Ok((true, self.add(claim)))
            }
            Goal::Equivalent { complexes: [c, d], maps: [f, g] } => {
                let (fe, ge) = (ctx.eval(&MapExpr::Named(f.clone()))?, ctx.eval(&MapExpr::Named(g.clone()))?);
                let (ci, di) = (ctx.complex_named(c)?, ctx.complex_named(d)?);
                if (fe.from, fe.to, ge.from, ge.to) != (ci, di, di, ci) {
                    return Err(format!("equivalent: {f} must map {c} → {d} and {g} map {d} → {c}"));
                }
                let round = |a: &str, b: &str, on: &str| {
                    MapExpr::Sum(vec![
                        MapExpr::Compose(vec![MapExpr::Named(b.into()), MapExpr::Named(a.into())]),
                        MapExpr::Id(on.into()),
                    ])
                };
                let source = self.solver.decide(&ctx.eval(&round(f, g, c))?)?;
                let target = self.solver.decide(&ctx.eval(&round(g, f, d))?)?;
                match (source, target) {
                    (Verdict::Null(hc), Verdict::Null(hd)) => {
                        let witness = EquivalenceWitness {
                            source_homotopy: self.homotopy_terms(ci, ci, hc),
                            target_homotopy: self.homotopy_terms(di, di, hd),
                        };
                        Ok((
                            true,
                            self.add(Claim::HomotopyEquivalence {
                                maps: [f.clone(), g.clone()],
                                statement: String::new(),
                                witness,
                            }),
                        ))
                    }
                    (Verdict::NotNull(_), _) => self.decide_expr(round(f, g, c)).map(|(_, l)| (false, l)),
                    (_, Verdict::NotNull(_)) => self.decide_expr(round(g, f, d)).map(|(_, l)| (false, l)),
                }
            }
        }
    }
}

/// Choices for one run of the prover.
#[derive(Clone, Copy, Debug)]
pub struct Options {
    /// Also certify each reduced model used: C ≃ C_reduced as a homotopy equivalence.
    pub emit_reduction: bool,
    /// Threads for independent blocks (1: everything in turn). Never changes the certificate.
    pub threads: usize,
}

impl Default for Options {
    fn default() -> Self {
        Options { emit_reduction: false, threads: 2 }
    }
}

/// Adds C_reduced, π: C → C_reduced, ι: C_reduced → C and the claim that they are inverse
/// homotopy equivalences (g∘f + id = ιπ + id = ∂h + h∂; f∘g + id = πι + id = 0).
fn emit_reductions(
    b: &mut Builder,
    complexes: &mut UniqueMap<ComplexSpec>,
    maps: &mut UniqueMap<MapSpec>,
) -> Result<Vec<String>, String> {
    let ctx = b.ctx;
    let vars = &ctx.ring.variables;
    let mut lines = Vec::new();
    let zero = vec![0; ctx.ring.gradings.len()];
    for (c, red) in b.solver.reductions() {
        if red.is_identity() {
            continue;
        }
        let orig = &ctx.complexes[c];
        let small = &red.complex;
        let (pi, iota) = (format!("pi_{}", orig.name), format!("iota_{}", orig.name));
        if complexes.contains_key(&small.name) || maps.contains_key(&pi) || maps.contains_key(&iota) {
            return Err(format!("--emit-reduction: the names {}, {pi} or {iota} are already taken", small.name));
        }
        let rows = |m: &SparseMap| -> Vec<(u32, Mono, u32)> {
            m.rows.iter().enumerate().flat_map(|(x, r)| r.iter().map(move |&(w, c)| (x as u32, c, w))).collect()
        };
        complexes.0.insert(
            small.name.clone(),
            ComplexSpec {
                generators: UniqueMap(
                    small.names.iter().cloned().zip(small.gradings.iter().map(|g| g.to_vec())).collect(),
                ),
                differential: terms_of(rows(&small.d), &small.names, &small.names, vars),
            },
        );
        maps.0.insert(
            pi.clone(),
            MapSpec {
                from: orig.name.clone(),
                to: small.name.clone(),
                degree: zero.clone(),
                terms: terms_of(rows(&red.pi()?), &orig.names, &small.names, vars),
            },
        );
        maps.0.insert(
            iota.clone(),
            MapSpec {
                from: small.name.clone(),
                to: orig.name.clone(),
                degree: zero.clone(),
                terms: terms_of(rows(&red.iota()?), &small.names, &orig.names, vars),
            },
        );
        let witness = EquivalenceWitness {
            source_homotopy: terms_of(rows(&red.homotopy()?), &orig.names, &orig.names, vars),
            target_homotopy: vec![],
        };
        let line = b.add(Claim::HomotopyEquivalence { maps: [pi, iota], statement: String::new(), witness });
        lines.push(format!(
            "✓ {line} ({} ≃ {}: {} → {} generators)",
            orig.name,
            small.name,
            orig.names.len(),
            small.names.len()
        ));
    }
    Ok(lines)
}

/// A lower bound on the length of a body's canonical form: each term of a differential or a
/// map is written as at least `["a","1","b"]`, 13 bytes.
pub(crate) fn written_floor(body: &Body) -> u64 {
    floor_of(&body.complexes, &body.maps)
}

fn floor_of(complexes: &UniqueMap<ComplexSpec>, maps: &UniqueMap<MapSpec>) -> u64 {
    let terms = complexes.values().map(|c| c.differential.len()).sum::<usize>()
        + maps.values().map(|m| m.terms.len()).sum::<usize>();
    13 * terms as u64
}

/// The self-check's first half, which needs no claim: the problem's complexes and maps (the
/// body's, when the prover adds none) in the checker's loaded form, and its implicit checks
/// (∂∂ = 0, chain maps) run within the budget of a lower bound of the file's size.
type Objects = Result<(Context, Vec<tubecheck::verify::ClaimResult>), Vec<String>>;

/// The loaded form is copied from `ctx`, the validation of the same complexes and maps by the
/// checker's `load_lenient` without an error (which is what `load` returns), rather than loaded
/// again: resolving every term's names a second time was most of this half's work. Only the
/// work budget is new, so the checks spend exactly what the checker's will.
fn check_objects_of(problem: &Problem, ctx: &Context) -> Objects {
    let complexes = ctx.complexes.iter().map(|c| tubecheck::load::Complex {
        name: c.name.clone(),
        names: c.names.clone(),
        index: tubecheck::load::NameIndex::new(c.names.iter()),
        gradings: c.gradings.clone(),
        d: c.d.clone(),
        defects: c.defects.clone(),
    });
    let maps = ctx.maps.iter().map(|m| tubecheck::load::Map {
        from: m.from,
        to: m.to,
        degree: m.degree.clone(),
        m: m.m.clone(),
        defects: m.defects.clone(),
    });
    let limit = tubecert_format::limits::work_limit(floor_of(&problem.complexes, &problem.maps));
    let copy = Context {
        ring: ctx.ring.clone(),
        complexes: complexes.collect(),
        complex_index: ctx.complex_index.clone(),
        maps: maps.collect(),
        map_index: ctx.map_index.clone(),
        work: tubecheck::load::Work::new(limit),
        hints: std::sync::atomic::AtomicUsize::new(ctx.hints.load(std::sync::atomic::Ordering::Relaxed)),
    };
    let implicit = tubecheck::verify::check_objects(&copy);
    Ok((copy, implicit))
}

/// Proves every goal of a validated problem: `ctx` is `validate::validate(&problem)` (the
/// self-check reuses its loaded objects). `problem_bytes` is hashed into the provenance.
pub fn prove(problem: Problem, ctx: &Context, problem_bytes: &[u8]) -> Result<Proved, String> {
    prove_with(problem, ctx, problem_bytes, Options::default())
}

pub fn prove_with(problem: Problem, ctx: &Context, problem_bytes: &[u8], options: Options) -> Result<Proved, String> {
    let mut b = Builder { ctx, solver: Solver::new(ctx, options.threads > 1), claims: Vec::new() };
    let mut lines = Vec::new();
    for claim in problem.bordered_claims.iter().cloned() {
        lines.push(format!("✓ {}", b.add(claim)));
    }
    let mut all = true;
    // With a second thread, the first half of the self-check, the problem's hash and the
    // canonical text of the complexes and maps (most of the file) are done beside the search; not when the body gets objects the problem lacks (reductions emitted) or
    // bordered objects (their checks read the claims): then the whole check runs at the end.
    let early = options.threads > 1 && !options.emit_reduction && problem.bordered.is_none();
    let start = Instant::now();
    let (searched, beside, waited) = std::thread::scope(|s| {
        let beside = early.then(|| {
            s.spawn(|| {
                crate::yield_to_search();
                let written = crate::canonical_writer::write_objects(&problem.complexes, &problem.maps);
                (check_objects_of(&problem, ctx), sha256_hex(problem_bytes), written)
            })
        });
        let searched = problem.goals.iter().enumerate().try_for_each(|(i, goal)| {
            let (held, line) = b.goal(goal).map_err(|e| format!("goal {}: {e}", i + 1))?;
            all &= held;
            lines.push(if held {
                format!("✓ {line}")
            } else {
                format!("✗ goal {} is false; proved the opposite instead:\n  ✓ {line}", i + 1)
            });
            Ok::<(), String>(())
        });
        let search_time = start.elapsed();
        let beside = beside.map(|h| h.join().unwrap_or_else(|p| std::panic::resume_unwind(p)));
        (searched, beside, start.elapsed() - search_time)
    });
    searched?;
    let (reduce, transport) = (b.solver.reduce_time.get(), b.solver.transport_time.get());
    let solve = start.elapsed().saturating_sub(reduce + transport + waited);
    let (mut complexes, mut maps) = (problem.complexes, problem.maps);
    if options.emit_reduction {
        let emitted = emit_reductions(&mut b, &mut complexes, &mut maps)?;
        if emitted.is_empty() {
            lines.push("--emit-reduction: nothing to reduce (no complex had a unit arrow to cancel, or no goal needed a reduced model); no reduction claim added".into());
        }
        lines.extend(emitted);
    }
    let Builder { claims, solver, .. } = b;
    drop(solver); // the reductions are not needed any more: free them before the self-check
    let (objects, problem_sha256, written) = match beside {
        Some((objects, sha, written)) => (Some(objects), sha, Some(written?)),
        None => (None, sha256_hex(problem_bytes), None),
    };
    let body = Body {
        bordered: problem.bordered,
        ring: problem.ring,
        complexes,
        maps,
        claims,
        provenance: Provenance { producer: format!("tubecert {}", env!("CARGO_PKG_VERSION")), problem_sha256 },
    };
    // The body is written and hashed beside the self-check when there is a second thread. The
    // checker allows a file work in proportion to its size, known only once the body is
    // written, so the check meanwhile runs within the budget of a lower bound of that size:
    // when that is enough the outcome is the same (a budget only ever refuses, never changes a
    // result), and when it is not the check runs again within the exact budget.
    let start = Instant::now();
    let seal = || {
        let file = match &written {
            Some(w) => crate::canonical_writer::start_file_with(&body, w),
            None => crate::canonical_writer::start_file(&body),
        };
        file.map(|file| {
            let sha256 = tubecert_format::canonical::sha256_hex(crate::canonical_writer::body_of(&file));
            (file, sha256)
        })
    };
    let check = |size: u64| {
        tubecheck::verify::check_body(&body, CERTIFICATE_VERSION, tubecert_format::limits::work_limit(size))
    };
    let (sealed, early, self_check) = if options.threads > 1 {
        std::thread::scope(|s| {
            let sealing = s.spawn(seal);
            let early = match objects {
                Some(Ok((octx, implicit))) => {
                    tubecheck::verify::check_loaded(octx, Some(implicit), &body, CERTIFICATE_VERSION)
                }
                Some(Err(e)) => Err(e),
                None => check(written_floor(&body)),
            };
            let self_check = start.elapsed();
            (sealing.join().unwrap_or_else(|p| std::panic::resume_unwind(p)), Some(early), self_check)
        })
    } else {
        (seal(), None, Duration::ZERO)
    };
    let (file, sha256) = sealed?;
    let hash = start.elapsed() - self_check; // the part not hidden behind the self-check
    let start = Instant::now();
    let size = crate::canonical_writer::body_of(&file).len() as u64;
    let results = match early {
        Some(Ok(results)) => results,
        _ => check(size)
            .map_err(|e| format!("internal error: the checker cannot read the certificate: {}", e.join("; ")))?,
    };
    if let Some(bad) = results.iter().find(|r| r.outcome.is_err()) {
        return Err(format!(
            "internal error: the checker rejects claim \"{}\": {}",
            bad.statement,
            bad.outcome.as_ref().expect_err("is_err")
        ));
    }
    // The wait for the first half, if the search finished before it, counts as self-check.
    let self_check = self_check + start.elapsed() + waited;
    let certificate = crate::canonical_writer::certificate(body, sha256);
    let file = crate::canonical_writer::finish_file(file, &certificate)?;
    let timings = vec![
        ("reduce", reduce),
        ("solve", solve),
        ("transport", transport),
        ("self_check", self_check),
        ("hash", hash),
    ];
    Ok(Proved { certificate, file, lines, all_as_stated: all, timings })
}
