//! `tubecert bench`: a synthetic problem of a chosen size with a known answer, timed stage by
//! stage. The scenario is ours: over `F2[U]`, a small reduced model (a free generator z, a tower
//! ∂b = U^k·a, the staircase of T(3,4), and a few other towers) is inflated to N generators by
//! random cancelling pairs and rounds of random homogeneous changes of basis; two maps from a
//! one-generator complex send o to z and to z + a, so ord_U(F − G) = k whatever the inflation.
//! `--density D` runs rounds of basis change until ∂ has about D arrows per generator.
//!
//! The reduced cases time Hom questions between complexes that reduction cannot shrink: over
//! `F2[U,V]`, C = T(p, q)^⊗3 built from staircases, and φ = id_C or U·V·id_C, never
//! null-homotopic (after inverting U a knot complex has homology of rank one on which φ acts by
//! a unit; Ozsváth–Szabó 2004, "Holomorphic disks and knot invariants"), so the answer is known.

use crate::problem::{Goal, Problem, PROBLEM_FORMAT};
use std::time::{Duration, Instant};
use tubecert_format::{ComplexSpec, MapSpec, Mono, UniqueMap};
use tubecheck::algebra::{SparseMap, Vector};

/// Rounds of random basis change by default (about 4.4 arrows per generator at 10^5).
const ROUNDS: usize = 5;

/// Which synthetic problem the bench times.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum Case {
    /// ord_U(F − G) on an inflated complex (and, with a source size, between two).
    Inflated,
    // The help text is an attribute, not a doc comment: rustdoc would read [U,V] as a link
    // and clap would print a code span's backticks.
    #[value(help = "id of T(p,q)^⊗3 over F2[U,V] is not null-homotopic")]
    ReducedIdentity,
    #[value(help = "U·V·id of T(p,q)^⊗3 over F2[U,V] is not null-homotopic")]
    ReducedUv,
}

/// What `tubecert bench` runs.
pub struct Options {
    pub case: Case,
    pub generators: usize,
    pub source_generators: Option<usize>,
    /// Arrows per generator of the inflated complexes (default: five rounds of basis change).
    pub density: Option<f64>,
    pub seed: u64,
    /// The torus knot of the reduced cases (default T(13,14), or T(11,12) for U·V·id).
    pub torus: Option<(u32, u32)>,
}

/// The planted order of the bench's map pair.
pub const PLANTED_ORDER: u32 = 3;

struct Rng(u64);
impl Rng {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545F4914F6CDD1D)
    }
    fn below(&mut self, n: u64) -> u64 {
        self.next() % n
    }
}

/// A complex under construction: gradings and ∂ as rows.
struct Model {
    gr: Vec<Vec<i64>>,
    d: SparseMap,
}

impl Model {
    fn add(&mut self, g: Vec<i64>, row: Vector) -> u32 {
        self.gr.push(g);
        self.d.rows.push(row);
        (self.gr.len() - 1) as u32
    }

    /// Adds a tower ∂b = U^k·a with a at `g`; returns a.
    fn tower(&mut self, g: [i64; 2], k: u32) -> u32 {
        let a = self.add(g.to_vec(), vec![]);
        self.add(vec![g[0] + 1 - 2 * k as i64, g[1] - k as i64], vec![(a, Mono([k, 0]))]);
        a
    }

    /// Inflates to about `n` generators: cancelling pairs p → q at random gradings, then rounds
    /// of random homogeneous basis changes P = I + N with N² = 0 (so P = P⁻¹), five, or until
    /// ∂ has about `density` arrows per generator (the last round touches only the fraction of
    /// generators that lands there). Returns (B, B⁻¹) = (P₁⋯P_r, P_r⋯P₁): the new basis in the
    /// old generators, and back.
    fn inflate(&mut self, n: usize, density: Option<f64>, rng: &mut Rng) -> Result<(SparseMap, SparseMap), String> {
        while self.gr.len() + 1 < n {
            let s = rng.below(2) as i64;
            let al = rng.below(41) as i64 - 20;
            let q = self.add(vec![s - 1 + 2 * al, al], vec![]);
            self.add(vec![s + 2 * al, al], vec![(q, Mono::ONE)]);
        }
        for r in &mut self.d.rows {
            r.sort_unstable();
        }
        let size = self.gr.len();
        // j ← j + U^e·i is homogeneous when gr(i) = gr(j) + e·(2, 1).
        let mut by_grading: std::collections::BTreeMap<(i64, i64), Vec<u32>> = std::collections::BTreeMap::new();
        for (i, g) in self.gr.iter().enumerate() {
            by_grading.entry((g[0], g[1])).or_default().push(i as u32);
        }
        let (mut forward, mut backward) = (SparseMap::identity(size), SparseMap::identity(size));
        let arrows = |d: &SparseMap| d.rows.iter().map(Vec::len).sum::<usize>() as f64;
        let mut growth: f64 = 1.5; // arrows after a round over before, re-measured each round
        for round in 0.. {
            let now = arrows(&self.d);
            let fraction = match density {
                None if round == ROUNDS => break,
                None => 1.0,
                Some(goal) if now >= 0.98 * goal * size as f64 || round == 30 => break,
                Some(goal) => ((goal * size as f64 / now - 1.0) / (growth - 1.0).max(0.05)).min(1.0),
            };
            let side: Vec<bool> = (0..size).map(|_| rng.below(2) == 0).collect();
            let mut nil = SparseMap::zero(size);
            for j in 0..size as u32 {
                if side[j as usize] || (fraction < 1.0 && rng.below(1 << 20) as f64 >= fraction * (1 << 20) as f64) {
                    continue;
                }
                let e = rng.below(3) as i64;
                let g = &self.gr[j as usize];
                if let Some(members) = by_grading.get(&(g[0] + 2 * e, g[1] + e)) {
                    let i = members[rng.below(members.len() as u64) as usize];
                    if side[i as usize] {
                        nil.rows[j as usize].push((i, Mono([e as u32, 0])));
                    }
                }
            }
            let p = SparseMap::identity(size).plus(&nil);
            self.d = p.after(&self.d.after(&p)?)?;
            if fraction == 1.0 {
                growth = arrows(&self.d) / now.max(1.0);
            }
            forward = forward.after(&p)?;
            backward = p.after(&backward)?;
        }
        Ok((forward, backward))
    }

    fn spec(&self, name: impl Fn(u32) -> String) -> ComplexSpec {
        let name = &name;
        let differential = self
            .d
            .rows
            .iter()
            .enumerate()
            .flat_map(|(x, r)| r.iter().map(move |&(y, m)| term(name(x as u32), m, name(y))))
            .collect();
        ComplexSpec {
            generators: UniqueMap(self.gr.iter().enumerate().map(|(i, g)| (name(i as u32), g.clone())).collect()),
            differential,
        }
    }
}

fn term(x: String, m: Mono, y: String) -> [String; 3] {
    [x, if m == Mono::ONE { "1".into() } else { format!("U^{}", m.0[0]) }, y]
}

/// The synthetic problem: maps O → K with K of about `n` generators, or, with `source_n`,
/// maps C → K between two inflated complexes; `density`: arrows per generator (see `inflate`).
pub fn synthetic_problem(
    n: usize,
    source_n: Option<usize>,
    density: Option<f64>,
    seed: u64,
) -> Result<Problem, String> {
    let mut rng = Rng(seed.wrapping_mul(0x9E3779B97F4A7C15) | 1);
    let mut k = Model { gr: vec![], d: SparseMap::zero(0) };
    let z = k.add(vec![0, 0], vec![]);
    let a = k.tower([0, 0], PLANTED_ORDER);
    // The staircase of T(3,4) (minus version), shifted away from the tower, and more towers.
    let ring = crate::demo::minus_ring();
    let stair = crate::construct::staircase(&ring, &crate::construct::torus_knot_exponents(3, 4)?)?;
    let base = k.gr.len() as u32;
    let names: Vec<&String> = stair.generators.keys().collect();
    for g in stair.generators.values() {
        k.add(vec![g[0] - 4, g[1] - 2], vec![]);
    }
    for [x, c, y] in &stair.differential {
        let e: u32 = c.trim_start_matches('U').trim_start_matches('^').parse().unwrap_or(1);
        let (xi, yi) =
            (names.iter().position(|n| *n == x).unwrap_or(0), names.iter().position(|n| *n == y).unwrap_or(0));
        k.d.rows[base as usize + xi].push((base + yi as u32, Mono([e, 0])));
    }
    for t in 0..4i64 {
        k.tower([2 * t - 6, t - 3], (t + 1) as u32);
    }
    let (_, k_back) = k.inflate(n, density, &mut rng)?;
    // The source: o alone, or o beside towers (sent to 0), inflated likewise.
    let mut c = Model { gr: vec![], d: SparseMap::zero(0) };
    let o = c.add(vec![0, 0], vec![]);
    if source_n.is_some() {
        c.tower([2, 1], 2);
        c.tower([-2, -1], 1);
    }
    let c_forward = match source_n {
        Some(m) => c.inflate(m, density, &mut rng)?.0,
        None => SparseMap::identity(1),
    };
    // F0(o) = z, G0(o) = z + a, zero elsewhere; in the new bases F = B_K⁻¹ ∘ F0 ∘ B_C.
    let mut f0 = SparseMap::zero(c.gr.len());
    f0.rows[o as usize] = vec![(z, Mono::ONE)];
    let mut g0 = f0.clone();
    g0.rows[o as usize] = vec![(z, Mono::ONE), (a, Mono::ONE)];
    let carry = |m: &SparseMap| k_back.after(&m.after(&c_forward)?);
    let (f, g) = (carry(&f0)?, carry(&g0)?);
    let (cname, kname) =
        (|i: u32| if source_n.is_some() { format!("c{i}") } else { "o".to_string() }, |i: u32| format!("g{i}"));
    let map = |m: &SparseMap| MapSpec {
        from: "C".into(),
        to: "K".into(),
        degree: vec![0, 0],
        terms: m
            .rows
            .iter()
            .enumerate()
            .flat_map(|(x, r)| r.iter().map(move |&(y, mm)| term(cname(x as u32), mm, kname(y))))
            .collect(),
    };
    Ok(Problem {
        format: PROBLEM_FORMAT.into(),
        version: 1,
        ring,
        complexes: UniqueMap([("C".to_string(), c.spec(cname)), ("K".to_string(), k.spec(kname))].into()),
        maps: UniqueMap([("F".to_string(), map(&f)), ("G".to_string(), map(&g))].into()),
        goals: vec![Goal::TorsionOrder {
            maps: ["F".into(), "G".into()],
            variable: "U".into(),
            surfaces: true,
            order: Some(PLANTED_ORDER),
            max_order: 16,
        }],
        bordered: None,
        bordered_claims: Vec::new(),
    })
}

/// The reduced case: C = T(p,q)^⊗3 over `F2[U,V]` and one goal about φ = id_C or U·V·id_C.
pub fn reduced_problem(case: Case, (p, q): (u32, u32)) -> Result<Problem, String> {
    let goal = match case {
        Case::ReducedUv => "not_null_homotopic U*V·id_C",
        _ => "not_null_homotopic id_C",
    };
    let complexes = [format!("T = staircase torus_knot {p} {q}"), "A = tensor T T".into(), "C = tensor A T".into()];
    crate::text_format::from_command_line("F2[U,V]", &complexes, &[goal.to_string()])
        .and_then(|v| serde_json::from_value(v).map_err(|e| vec![e.to_string()]))
        .and_then(crate::problem::from_written)
        .map_err(|e| e.join("; "))
}

/// Runs `tubecert bench-check FILE` in a child process, then removes the file; returns
/// (plain parse, check) times.
fn measure_in_child(path: &std::path::Path) -> Result<(Duration, Duration), String> {
    let exe = std::env::current_exe().map_err(|e| e.to_string());
    let out = exe.and_then(|exe| {
        std::process::Command::new(exe).arg("bench-check").arg(path).output().map_err(|e| e.to_string())
    });
    let _ = std::fs::remove_file(path);
    let out = out?;
    let text = String::from_utf8_lossy(&out.stdout);
    let nums: Vec<f64> = text.split_whitespace().filter_map(|x| x.parse().ok()).collect();
    match (out.status.success(), nums.as_slice()) {
        (true, [p, c]) => Ok((Duration::from_secs_f64(*p), Duration::from_secs_f64(*c))),
        _ => Err(format!("bench: the checker run failed: {}", String::from_utf8_lossy(&out.stderr))),
    }
}

/// The child's side: best of five plain parses and five full checks (alternating) of one file.
pub fn check_timing(path: &std::path::Path) -> Result<(f64, f64), String> {
    let cert = tubecert_format::limits::read_file(path)?;
    let (mut parse_only, mut check) = (f64::MAX, f64::MAX);
    for _ in 0..5 {
        let t = Instant::now();
        let plain: tubecert_format::Certificate = serde_json::from_slice(&cert).map_err(|e| e.to_string())?;
        drop(plain); // the checker frees what it parsed too: time both the same way
        parse_only = parse_only.min(t.elapsed().as_secs_f64());
        let t = Instant::now();
        let report = tubecheck::check_bytes("bench", &cert)?;
        if !report.ok() {
            return Err("bench: the checker rejects the certificate".into());
        }
        drop(report);
        check = check.min(t.elapsed().as_secs_f64());
    }
    Ok((parse_only, check))
}

/// Peak resident memory of this process so far, in bytes (Linux; 0 elsewhere).
pub fn peak_memory() -> u64 {
    std::fs::read_to_string("/proc/self/status")
        .ok()
        .and_then(|s| {
            s.lines().find(|l| l.starts_with("VmHWM:")).and_then(|l| l.split_whitespace().nth(1)?.parse::<u64>().ok())
        })
        .map_or(0, |kb| kb * 1024)
}

/// Runs the bench; returns the header and the row.
pub fn run(o: &Options, out: Option<&std::path::Path>) -> Result<(String, String), String> {
    let (problem, source, target) = match o.case {
        Case::Inflated => (synthetic_problem(o.generators, o.source_generators, o.density, o.seed)?, "C", "K"),
        Case::ReducedIdentity => (reduced_problem(o.case, o.torus.unwrap_or((13, 14)))?, "C", "C"),
        Case::ReducedUv => (reduced_problem(o.case, o.torus.unwrap_or((11, 12)))?, "C", "C"),
    };
    let bytes = crate::demo::problem_bytes(&problem);
    let arrows = problem.complexes[target].differential.len();
    drop(problem); // only its bytes are the input
    let mut times: Vec<(&str, Duration)> = Vec::new();
    let t = Instant::now();
    let parsed = crate::problem::parse_problem(&bytes, "bench").map_err(|e| e.join("; "))?;
    times.push(("parse", t.elapsed()));
    let t = Instant::now();
    let ctx = crate::validate::validate(&parsed).map_err(|e| e.join("; "))?;
    times.push(("validate", t.elapsed()));
    let proved = crate::prove::prove(parsed, &ctx, &bytes)?;
    times.extend(proved.timings.iter().cloned());
    let claims = &proved.certificate.body.claims;
    let answer_ok = match o.case {
        Case::Inflated => {
            matches!(claims.first(), Some(tubecert_format::Claim::TorsionOrder { order, .. }) if *order == PLANTED_ORDER)
        }
        _ => matches!(claims.first(), Some(tubecert_format::Claim::NotNullHomotopic { .. })),
    };
    if !answer_ok {
        let expected = match o.case {
            Case::Inflated => format!("ord_U = {PLANTED_ORDER}"),
            _ => "not null-homotopic".into(),
        };
        return Err(format!("bench: expected {expected}, got {:?}", claims.first().map(|c| c.statement())));
    }
    let cert = &proved.file;
    if let Some(dir) = out {
        std::fs::create_dir_all(dir).map_err(|e| e.to_string())?;
        let stem = match o.case {
            Case::Inflated => format!("bench-{}", o.generators),
            _ => format!("bench-{:?}", o.case).to_lowercase(),
        };
        std::fs::write(dir.join(format!("{stem}.problem.json")), &bytes).map_err(|e| e.to_string())?;
        std::fs::write(dir.join(format!("{stem}.cert.json")), cert).map_err(|e| e.to_string())?;
    }
    // Written as `prove` writes it, to the file the checker's child process reads.
    let t = Instant::now();
    let cert_path = std::env::temp_dir().join(format!("tubecert-bench-{}.cert.json", std::process::id()));
    std::fs::write(&cert_path, &proved.file).map_err(|e| format!("{}: {e}", cert_path.display()))?;
    times.push(("write", t.elapsed()));
    let producer_peak = peak_memory(); // before the checker runs in this process
    let total: Duration = times.iter().map(|t| t.1).sum();
    // The checker's cost next to a plain parse, measured in a fresh process (as a referee runs
    // it), best of five each, so that neither inherits this process's heap.
    let cert_bytes = cert.len();
    drop(proved);
    let (parse_only, check) = measure_in_child(&cert_path)?;
    let secs = |d: Duration| format!("{:.3}", d.as_secs_f64());
    let mut header = vec!["source_gens", "generators", "arrows"];
    let size = |c: &str| ctx.complexes[ctx.complex_index[c]].names.len().to_string();
    let mut row = vec![size(source), size(target), arrows.to_string()];
    for (name, d) in &times {
        header.push(name);
        row.push(secs(*d));
    }
    // `check-input` does exactly the parse and validation `prove` starts with.
    let input: Duration = times.iter().filter(|t| t.0 == "parse" || t.0 == "validate").map(|t| t.1).sum();
    header.extend(["total", "prove/check_input", "peak_MiB", "cert_bytes", "check_s", "cert_parse_s", "check/parse"]);
    row.extend([
        secs(total),
        format!("{:.2}", total.as_secs_f64() / input.as_secs_f64().max(1e-9)),
        format!("{:.0}", producer_peak as f64 / (1 << 20) as f64),
        cert_bytes.to_string(),
        secs(check),
        secs(parse_only),
        format!("{:.2}", check.as_secs_f64() / parse_only.as_secs_f64().max(1e-9)),
    ]);
    Ok((header.join("\t"), row.join("\t")))
}
