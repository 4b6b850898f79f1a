//! Mutation soundness campaign over stored certificates.
//!
//! Each mutation changes one semantic detail (a witness term removed, added, retargeted or with
//! another exponent; two generators swapped in a term list; a grading changed; a claimed order
//! or rank changed together with its statement; a map or differential term changed; a name
//! made hostile — statement syntax, line breaks, invisible, format, whitespace or control
//! characters — everywhere, statements restated; τ's grading changed or left out of its
//! statement, or the certificate relabelled as version 1 in version 1's wording), the hash
//! is recomputed, and the checker's verdict is compared with the independent oracle of
//! `tests/lib.rs`. An accepted mutation is *neutral* only when the oracle confirms that every
//! claim still holds; any other acceptance is *unexplained* and fails the run. Numbers at and
//! past the format's bounds (extreme gradings, exponents past 2^20, exponents that wrap 64 bits
//! inside a product) and file-level defects (`null`, a repeated key, at any depth) are among
//! the mutations; a file-level defect must always be refused.
//!
//! Usage: `mutation-campaign [--per-certificate N] [--seed S] [FOLDER]`

use std::path::PathBuf;
use tubecert_format::{Body, Certificate, Claim, Term};
use tubecert_tests::{oracle, Rng};

fn pick<'a, T>(rng: &mut Rng, xs: &'a [T]) -> Option<&'a T> {
    (!xs.is_empty()).then(|| &xs[rng.below(xs.len() as u64) as usize])
}

fn coefficient(rng: &mut Rng, two_vars: bool) -> String {
    let i = rng.below(4);
    let j = if two_vars { rng.below(3) } else { 0 };
    match (i, j) {
        (0, 0) => "1".into(),
        (i, 0) => format!("U^{i}"),
        (0, j) => format!("V^{j}"),
        (i, j) => format!("U^{i}*V^{j}"),
    }
}

/// Changes one term list in place; returns a description.
fn mutate_terms(
    rng: &mut Rng,
    terms: &mut Vec<Term>,
    from_gens: &[String],
    to_gens: &[String],
    two_vars: bool,
) -> &'static str {
    let n = terms.len() as u64;
    match rng.below(5) {
        0 if n > 0 => {
            terms.remove(rng.below(n) as usize);
            "remove a term"
        }
        1 if n > 0 => {
            let t = &mut terms[rng.below(n) as usize];
            t[1] = coefficient(rng, two_vars);
            "change a coefficient"
        }
        2 if n > 0 => {
            let t = &mut terms[rng.below(n) as usize];
            t[2] = pick(rng, to_gens).cloned().unwrap_or_default();
            "retarget a term"
        }
        3 if n > 0 && from_gens.len() > 1 => {
            let (a, b) =
                (pick(rng, from_gens).cloned().unwrap_or_default(), pick(rng, from_gens).cloned().unwrap_or_default());
            for t in terms.iter_mut() {
                for s in [0, 2] {
                    if t[s] == a {
                        t[s] = b.clone();
                    } else if t[s] == b {
                        t[s] = a.clone();
                    }
                }
            }
            "swap two generators"
        }
        _ => {
            let t = [
                pick(rng, from_gens).cloned().unwrap_or_default(),
                coefficient(rng, two_vars),
                pick(rng, to_gens).cloned().unwrap_or_default(),
            ];
            terms.push(t);
            "add a term"
        }
    }
}

fn gens(body: &Body, c: &str) -> Vec<String> {
    body.complexes.get(c).map(|x| x.generators.keys().cloned().collect()).unwrap_or_default()
}

/// Rewrites claim i's statement in the checker's wording for format `version` (when the ring
/// still reads).
fn restate(body: &mut Body, i: usize, version: u32) {
    if let Ok(ring) = tubecert_format::RingInfo::new(&body.ring) {
        let text = tubecert_format::statement::render(&body.claims[i], &ring, version);
        *tubecert::prove::statement_mut(&mut body.claims[i]) = text;
    }
}

/// Pieces a hostile name is made with: statement syntax, line breaks, invisible and format
/// characters (U+200D and other Cf), whitespace, control characters, a letter of another script.
const HOSTILE: [&str; 14] = [
    "U^3·F",
    " + G",
    "(",
    "∘",
    " = 7",
    "≃",
    "−",
    "\n✓ τ(K) = 9",
    "\u{200d}",
    "\u{2060}",
    "\u{202e}",
    "\u{a0}",
    "\u{7}",
    "С",
];

/// Renames one name everywhere in the body (keys and strings) to a hostile one, restating.
fn rename_hostile(rng: &mut Rng, body: &mut Body, version: u32) -> &'static str {
    let mut names: Vec<String> = body.complexes.keys().chain(body.maps.keys()).cloned().collect();
    names.extend(body.complexes.values().flat_map(|c| c.generators.keys().cloned()));
    names.extend(body.ring.gradings.iter().cloned());
    let old = pick(rng, &names).cloned().unwrap();
    if old == "1" || body.ring.variables.contains(&old) {
        return "leave a name that is also a coefficient";
    }
    let piece = pick(rng, &HOSTILE).unwrap();
    let new = if rng.below(2) == 0 { format!("{old}{piece}") } else { format!("{piece}{old}") };
    fn walk(v: &mut serde_json::Value, old: &str, new: &str) {
        match v {
            serde_json::Value::String(s) if s == old => *s = new.to_string(),
            serde_json::Value::Array(xs) => xs.iter_mut().for_each(|x| walk(x, old, new)),
            serde_json::Value::Object(m) => {
                *m = std::mem::take(m)
                    .into_iter()
                    .map(|(k, mut x)| {
                        walk(&mut x, old, new);
                        (if k == old { new.to_string() } else { k }, x)
                    })
                    .collect()
            }
            _ => {}
        }
    }
    let mut v = serde_json::to_value(&*body).unwrap();
    walk(&mut v, &old, &new);
    match serde_json::from_value::<Body>(v) {
        Ok(b) => *body = b,
        Err(_) => return "leave a name the model cannot hold",
    }
    (0..body.claims.len()).for_each(|i| restate(body, i, version));
    "rename to a name with statement syntax or an invisible character"
}

/// Changes what a τ claim says about its grading: another grading, or the version-1 wording.
fn mutate_tau_grading(rng: &mut Rng, body: &mut Body, version: &mut u32) -> &'static str {
    let Some(i) = body.claims.iter().position(|c| matches!(c, Claim::Tau { .. })) else {
        return "leave a certificate without τ";
    };
    let gradings = body.ring.gradings.clone();
    match rng.below(3) {
        0 => {
            if let Claim::Tau { alexander, .. } = &mut body.claims[i] {
                *alexander = pick(rng, &gradings).cloned().unwrap();
            }
            "change τ's grading, statement kept"
        }
        1 => {
            restate(body, i, 1);
            "drop τ's grading from its statement"
        }
        _ => {
            *version = 1;
            (0..body.claims.len()).for_each(|j| restate(body, j, 1));
            "relabel as version 1 in version 1's wording"
        }
    }
}

/// Every term of a body: differentials, maps and witnesses.
fn all_terms(body: &mut Body) -> Vec<&mut Term> {
    let mut out: Vec<&mut Term> = Vec::new();
    body.complexes.0.values_mut().for_each(|c| out.extend(c.differential.iter_mut()));
    body.maps.0.values_mut().for_each(|m| out.extend(m.terms.iter_mut()));
    for c in body.claims.iter_mut() {
        match c {
            Claim::NullHomotopic { witness, .. } => out.extend(witness.homotopy.iter_mut()),
            Claim::NotNullHomotopic { witness, .. } => out.extend(witness.dual.iter_mut()),
            Claim::HomotopyEquivalence { witness, .. } => {
                out.extend(witness.source_homotopy.iter_mut().chain(witness.target_homotopy.iter_mut()))
            }
            Claim::TorsionOrder { witness, .. } => {
                out.extend(witness.homotopy.iter_mut().chain(witness.dual.iter_mut().flatten()))
            }
            Claim::Homology { witness, .. }
            | Claim::Tau { witness, .. }
            | Claim::TorsionOrderOfComplex { witness, .. } => {
                out.extend(witness.basis.iter_mut().chain(witness.inverse.iter_mut()))
            }
            _ => {}
        }
    }
    out
}

/// Numbers at and just past the format's bounds, and exponents that wrap 64 bits inside a
/// product (read as the original monomial by a reader that adds exponents in 64 bits).
fn mutate_numbers(rng: &mut Rng, body: &mut Body) -> &'static str {
    let var = body.ring.variables.first().cloned();
    let extreme = [i64::MIN, i64::MIN + 1, (1 << 31) + 1, -(1 << 31) - 1, i64::MAX];
    match (rng.below(3), var) {
        (0, Some(v)) => {
            let mut terms = all_terms(body);
            let n = terms.len() as u64;
            let Some(t) = terms.get_mut(rng.below(n.max(1)) as usize) else { return "leave the numbers unchanged" };
            let wrap = format!("{v}^3*{v}^18446744073709551613");
            t[1] = if t[1] == "1" { wrap } else { format!("{wrap}*{}", t[1]) };
            "wrap an exponent past 64 bits inside a product"
        }
        (1, Some(v)) => {
            let mut terms = all_terms(body);
            let n = terms.len() as u64;
            let Some(t) = terms.get_mut(rng.below(n.max(1)) as usize) else { return "leave the numbers unchanged" };
            t[1] = if rng.below(2) == 0 { format!("{v}^1048577") } else { format!("{v}*{v}^1048576") };
            "an exponent past 2^20"
        }
        _ => {
            let complexes: Vec<String> = body.complexes.keys().cloned().collect();
            let c = pick(rng, &complexes).cloned().unwrap();
            let g = pick(rng, &gens(body, &c)).cloned().unwrap();
            let x = *pick(rng, &extreme).unwrap();
            let v = body.complexes.0.get_mut(&c).unwrap().generators.0.get_mut(&g).unwrap();
            let k = rng.below(v.len() as u64) as usize;
            v[k] = x;
            "an extreme grading"
        }
    }
}

/// A file-level defect the typed body cannot hold, with the hash of the body as the typed
/// reader sees it: `"dual": null` beside a witness, a `null` anywhere, a repeated key anywhere.
/// Each must be refused.
fn mutate_text(rng: &mut Rng, cert: &Certificate) -> (Vec<u8>, &'static str) {
    let mut v = serde_json::to_value(cert).unwrap();
    match rng.below(3) {
        0 => {
            let witnesses: Vec<usize> = (0..cert.body.claims.len())
                .filter(|&i| v["body"]["claims"][i]["witness"].get("homotopy").is_some())
                .filter(|&i| v["body"]["claims"][i]["witness"].get("dual").is_none())
                .collect();
            if let Some(&i) = pick(rng, &witnesses) {
                v["body"]["claims"][i]["witness"]["dual"] = serde_json::Value::Null;
                return (serde_json::to_vec(&v).unwrap(), "write \"dual\": null beside a witness");
            }
            (serde_json::to_vec(&v).unwrap(), "leave the file unchanged")
        }
        1 => {
            let n = 1 + rng.below(nodes(&v) - 1);
            set_nth(&mut v, &mut n.clone(), serde_json::Value::Null);
            (serde_json::to_vec(&v).unwrap(), "write a null")
        }
        _ => {
            let mut n = rng.below(objects(&v)) as i64;
            let mut text = String::new();
            tubecert_tests::with_repeated_key(&v, &mut n, None, &mut text);
            // An empty object has no key to repeat (bordered bodies have some, e.g. no morphisms).
            let what =
                if text == serde_json::to_string(&v).unwrap() { "leave the file unchanged" } else { "repeat a key" };
            (text.into_bytes(), what)
        }
    }
}

fn nodes(v: &serde_json::Value) -> u64 {
    1 + match v {
        serde_json::Value::Object(m) => m.values().map(nodes).sum::<u64>(),
        serde_json::Value::Array(a) => a.iter().map(nodes).sum(),
        _ => 0,
    }
}

fn objects(v: &serde_json::Value) -> u64 {
    match v {
        serde_json::Value::Object(m) => 1 + m.values().map(objects).sum::<u64>(),
        serde_json::Value::Array(a) => a.iter().map(objects).sum(),
        _ => 0,
    }
}

fn set_nth(v: &mut serde_json::Value, n: &mut u64, new: serde_json::Value) -> bool {
    if *n == 0 {
        *v = new;
        return true;
    }
    *n -= 1;
    match v {
        serde_json::Value::Array(items) => items.iter_mut().any(|i| set_nth(i, n, new.clone())),
        serde_json::Value::Object(m) => m.values_mut().any(|i| set_nth(i, n, new.clone())),
        _ => false,
    }
}

/// Applies one random semantic mutation (some also change the format version).
fn mutate(rng: &mut Rng, body: &mut Body, version: &mut u32) -> &'static str {
    let two = body.ring.variables.len() == 2;
    let complexes: Vec<String> = body.complexes.keys().cloned().collect();
    match rng.below(13) {
        10 => rename_hostile(rng, body, *version),
        11 => mutate_tau_grading(rng, body, version),
        12 => mutate_numbers(rng, body),
        0 => {
            // A grading of one generator.
            let c = pick(rng, &complexes).cloned().unwrap();
            let g = pick(rng, &gens(body, &c)).cloned().unwrap();
            let v = body.complexes.0.get_mut(&c).unwrap().generators.0.get_mut(&g).unwrap();
            let k = rng.below(v.len() as u64) as usize;
            v[k] += if rng.below(2) == 0 { 1 } else { -2 };
            "change a grading"
        }
        1 => {
            let c = pick(rng, &complexes).cloned().unwrap();
            let g = gens(body, &c);
            mutate_terms(rng, &mut body.complexes.0.get_mut(&c).unwrap().differential, &g, &g, two)
        }
        2 if !body.maps.is_empty() => {
            let names: Vec<String> = body.maps.keys().cloned().collect();
            let m = pick(rng, &names).cloned().unwrap();
            let (from, to) = (body.maps[&m].from.clone(), body.maps[&m].to.clone());
            let (fg, tg) = (gens(body, &from), gens(body, &to));
            mutate_terms(rng, &mut body.maps.0.get_mut(&m).unwrap().terms, &fg, &tg, two)
        }
        4 if serde_json::to_value(&*body).is_ok_and(|v| v.get("bordered").is_some_and(|b| !b.is_null())) => {
            // A bordered object or claim (tests/bordered_oracle.rs), statements re-rendered.
            let mut v = serde_json::to_value(&*body).unwrap();
            let what = tubecert_tests::bordered_oracle::mutation::mutate(rng, &mut v);
            match serde_json::from_value::<Body>(v) {
                Ok(b) => {
                    *body = b;
                    for i in 0..body.claims.len() {
                        restate(body, i, *version);
                    }
                    what
                }
                Err(_) => "leave a bordered object unchanged",
            }
        }
        3 => {
            // A claimed order or rank, with the statement kept consistent.
            let i = rng.below(body.claims.len() as u64) as usize;
            let up = rng.below(2) == 0;
            let what = match &mut body.claims[i] {
                Claim::TorsionOrder { order, .. } => {
                    *order = if up { *order + 1 } else { order.saturating_sub(1) };
                    "change a claimed order"
                }
                Claim::Tau { tau, .. } => {
                    *tau += if up { 1 } else { -1 };
                    "change a claimed tau"
                }
                Claim::Homology { free, torsion, .. } => {
                    if up || torsion.is_empty() {
                        free.pop();
                    } else {
                        torsion[0].0 += 1;
                    }
                    "change a claimed rank or exponent"
                }
                _ => "leave a claim unchanged",
            };
            restate(body, i, *version);
            what
        }
        _ => {
            // A witness term.
            let i = rng.below(body.claims.len() as u64) as usize;
            let claim = body.claims[i].clone();
            let (from, to) = match &claim {
                Claim::TorsionOrder { maps, .. } => {
                    let m = &body.maps[&maps[0]];
                    (m.from.clone(), m.to.clone())
                }
                Claim::NullHomotopic { .. } | Claim::NotNullHomotopic { .. } => {
                    let first = body.maps.values().next().unwrap();
                    (first.from.clone(), first.to.clone())
                }
                Claim::Homology { complex, .. }
                | Claim::Tau { complex, .. }
                | Claim::TorsionOrderOfComplex { complex, .. } => (complex.clone(), complex.clone()),
                _ => return "leave a witness unchanged",
            };
            let (fg, tg) = (gens(body, &from), gens(body, &to));
            match &mut body.claims[i] {
                Claim::TorsionOrder { witness, .. } => match (&mut witness.dual, rng.below(2)) {
                    (Some(y), 0) => mutate_terms(rng, y, &fg, &tg, two),
                    _ => mutate_terms(rng, &mut witness.homotopy, &fg, &tg, two),
                },
                Claim::NullHomotopic { witness, .. } => mutate_terms(rng, &mut witness.homotopy, &fg, &tg, two),
                Claim::NotNullHomotopic { witness, .. } => mutate_terms(rng, &mut witness.dual, &fg, &tg, two),
                Claim::Homology { witness, .. }
                | Claim::Tau { witness, .. }
                | Claim::TorsionOrderOfComplex { witness, .. } => {
                    if rng.below(2) == 0 {
                        mutate_terms(rng, &mut witness.basis, &fg, &fg, two)
                    } else {
                        mutate_terms(rng, &mut witness.inverse, &fg, &fg, two)
                    }
                }
                _ => "leave a witness unchanged",
            }
        }
    }
}

#[derive(Default)]
struct Counts {
    tried: u64,
    rejected: u64,
    neutral: u64,
    stricter: u64,
    unexplained: u64,
}

fn main() {
    let mut args = std::env::args().skip(1);
    let (mut per, mut seed, mut folder) = (10_000u64, 1u64, PathBuf::from("certificates"));
    while let Some(a) = args.next() {
        match a.as_str() {
            "--per-certificate" => per = args.next().and_then(|x| x.parse().ok()).expect("--per-certificate N"),
            "--seed" => seed = args.next().and_then(|x| x.parse().ok()).expect("--seed S"),
            other => folder = PathBuf::from(other),
        }
    }
    let mut files: Vec<PathBuf> = std::fs::read_dir(&folder)
        .expect("certificate folder")
        .map(|e| e.unwrap().path())
        .filter(|p| p.to_string_lossy().ends_with(".cert.json"))
        .collect();
    files.sort();
    let mut total = Counts::default();
    println!("certificate\ttried\trejected\tneutral\tstricter\tunexplained");
    for f in &files {
        let cert: Certificate = serde_json::from_slice(&std::fs::read(f).unwrap()).unwrap();
        assert!(oracle::holds_in(&cert.body, cert.version), "the oracle accepts the unmutated {}", f.display());
        let mut rng = Rng(seed ^ 0x51ED_2701 ^ (f.to_string_lossy().len() as u64) << 7);
        let mut c = Counts::default();
        for _ in 0..per {
            c.tried += 1;
            // One in twelve is a file-level defect (null, repeated key): refused by definition.
            let (bytes, what, holds) = if rng.below(12) == 0 {
                let (bytes, what) = mutate_text(&mut rng, &cert);
                (bytes, what, what == "leave the file unchanged")
            } else {
                // Only mutations that change the body count.
                let (mut body, mut what, mut version) = (cert.body.clone(), "", cert.version);
                while body == cert.body && version == cert.version {
                    what = mutate(&mut rng, &mut body, &mut version);
                }
                // The fast hash: it takes numbers beyond ±2^53 in complexes (refused later).
                let sha256 = tubecert_format::canonical::body_sha256(&body).unwrap_or_default();
                let mutant = Certificate { sha256, version, body: body.clone(), ..cert.clone() };
                (serde_json::to_vec(&mutant).unwrap(), what, oracle::holds_in(&body, version))
            };
            let accepted = tubecheck::check_bytes("mutant", &bytes).is_ok_and(|r| r.ok());
            match (accepted, holds) {
                (false, false) => c.rejected += 1,
                (true, true) => c.neutral += 1,
                (false, true) => {
                    c.stricter += 1;
                    let why = tubecheck::check_bytes("mutant", &bytes).err().unwrap_or_default();
                    eprintln!(
                        "stricter in {} after \"{what}\": {}",
                        f.display(),
                        why.lines().next().unwrap_or("a claim fails")
                    );
                }
                (true, false) => {
                    c.unexplained += 1;
                    eprintln!("UNEXPLAINED acceptance in {} after \"{what}\"", f.display());
                }
            }
        }
        println!(
            "{}\t{}\t{}\t{}\t{}\t{}",
            f.file_name().unwrap().to_string_lossy(),
            c.tried,
            c.rejected,
            c.neutral,
            c.stricter,
            c.unexplained
        );
        total.tried += c.tried;
        total.rejected += c.rejected;
        total.neutral += c.neutral;
        total.stricter += c.stricter;
        total.unexplained += c.unexplained;
    }
    println!(
        "total\t{}\t{}\t{}\t{}\t{}",
        total.tried, total.rejected, total.neutral, total.stricter, total.unexplained
    );
    println!("(stricter: rejected by the checker for a malformation the oracle tolerates, e.g. a repeated term)");
    std::process::exit(if total.unexplained == 0 { 0 } else { 1 });
}
