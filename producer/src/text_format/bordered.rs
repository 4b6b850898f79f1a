//! The text form of bordered objects and of complexes over `F2[U,V]` used as sources:
//!
//! ```text
//! complex C over F2[U,V]                     # a source, written out; gradings (gr_U, gr_V)
//!   a (-2, -2)
//!   a -> U^2 b + V^2 c
//! complex S over F2[U,V] = tensor C C        # a source made from sources
//! complex K = cable 1 0 of C                 # also: quotient V of C
//!
//! type_d_structure N                         # explicit: generators, period, δ¹
//!   period (1, 2, 2, 0)
//!   xi0 iota0 (0, 0, 0, 0)                   # idempotent, optional grading [2j, 2p, 2q, 2a]
//!   kappa1 iota1
//!   xi0 -> rho1 kappa1 + rho12 xi1           # ρ1, ρ_12, rho_12 are read too
//! type_d_structure N2 = complement framing -1 of C
//!
//! type_a_module M                            # explicit: generators, period, operations
//!   period (3, 0, 2, 2)
//!   x iota0 (0, 0, 0, 0)
//!   m(x, rho3, rho23^n, rho2) = U^(n+1) x    # a family, for every n ≥ 0
//! type_a_module P = cable_pattern 2          # also: diagram beta E1 S1 N2 w top 1
//!
//! type_d_morphism f : N -> N2
//!   xi0 -> z + rho23 kappa2.b.d
//! complex B = box_tensor M N
//! map F = box_tensor_map M f
//! ```
//! Each reads as the JSON problem member of the same meaning (README, "Bordered objects");
//! sources are written inline where they are used, as the JSON form has them.

use super::{grading, grading_text, targets, terms_text, Line};
use serde_json::{json, Map, Value};
use std::collections::BTreeMap;

/// The written name of an element of A(T²): `1`, `rho1` … `rho123`; `ρ12`, `ρ_12`, `rho_12`
/// and `rho_{12}` are read as `rho12`.
pub(super) fn algebra_element(s: &str) -> Option<&'static str> {
    const ALL: [&str; 6] = ["rho1", "rho2", "rho3", "rho12", "rho23", "rho123"];
    if s == "1" {
        return Some("1");
    }
    let rest = s.strip_prefix("rho").or_else(|| s.strip_prefix('ρ'))?;
    let rest = rest.strip_prefix('_').unwrap_or(rest);
    let digits = rest.strip_prefix('{').and_then(|r| r.strip_suffix('}')).unwrap_or(rest);
    ALL.iter().find(|a| a[3..] == *digits).copied()
}

const ALGEBRA: &str = "1, rho1, rho2, rho3, rho12, rho23, rho123 (ρ12 and rho_12 are read too)";

fn unknown_element(line: &Line, col: usize, obj: &str, s: &str) -> String {
    format!("{}:{col}: {obj}: \"{s}\" is not an element of the torus algebra A(T²): expected {ALGEBRA}", line.no)
}

/// `iota0`, `ι0`, `ι_0`, `iota_0` (and `1` for ι_1 …) → the idempotent's index.
fn idempotent(s: &str) -> Option<u8> {
    let rest = s.strip_prefix("iota").or_else(|| s.strip_prefix('ι'))?;
    match rest.strip_prefix('_').unwrap_or(rest) {
        "0" => Some(0),
        "1" => Some(1),
        _ => None,
    }
}

/// The column (1-based) of `needle` in the line, from `from` on, or `fallback`.
fn column(line: &Line, from: usize, needle: &str, fallback: usize) -> usize {
    line.text.get(from.saturating_sub(1)..).and_then(|t| t.find(needle)).map_or(fallback, |i| from + i)
}

/// Where a line of an explicit bordered object goes.
pub(super) enum Body<'a> {
    Structure(&'a mut Value),
    Module(&'a mut Value),
    Morphism(&'a mut Value),
}

/// One indented line of `type_d_structure`, `type_a_module` or `type_d_morphism` NAME:
/// `period (…)`, `GEN IDEMPOTENT [(grading)]`, `GEN -> TERMS` or `m(…) = …`. Returns the
/// number of terms or operations it added and, for a generator, its name.
pub(super) fn body_line(
    line: &Line,
    toks: &[(usize, String)],
    obj: &str,
    body: Body,
) -> Result<(usize, Option<String>), String> {
    let text = line.text;
    let word = |k: usize| toks.get(k).map(|t| t.1.as_str()).unwrap_or("");
    let col = |k: usize| toks.get(k).map_or(text.len() + 1, |t| t.0);
    let (entry, kind) = match body {
        Body::Structure(e) => (e, "structure"),
        Body::Module(e) => (e, "module"),
        Body::Morphism(e) => (e, "morphism"),
    };
    let trimmed = text.trim_start();
    // `m(…)` or `m_3(…)`; a generator may still be named `m_1` (`m_1 iota0 (…)`).
    let subscripted = trimmed
        .strip_prefix("m_")
        .and_then(|r| r.find('(').map(|k| &r[..k]))
        .is_some_and(|sub| !sub.is_empty() && !sub.contains(char::is_whitespace));
    if kind == "module" && (trimmed.starts_with("m(") || subscripted) {
        let start = text.len() - trimmed.len() + 1;
        let ops = operations(line, start, obj)?;
        let n = ops.len();
        entry["operations"].as_array_mut().expect("an explicit module").extend(ops);
        return Ok((n, None));
    }
    if let Some(arrow) = text.find("->") {
        if kind == "module" {
            return Err(format!(
                "{}:{}: {obj}: a type A module's operations are written m(x, rho3, rho2) = U x, not with \"->\"",
                line.no,
                arrow + 1
            ));
        }
        let from = text[..arrow].trim();
        let key = if kind == "structure" { "differential" } else { "terms" };
        let mut n = 0;
        for (c, t) in targets(line, arrow + 3, &text[arrow + 2..])? {
            let a = algebra_element(&c)
                .ok_or_else(|| unknown_element(line, column(line, arrow + 3, &c, arrow + 3), obj, &c))?;
            entry[key].as_array_mut().expect("an explicit object").push(json!([from, a, t]));
            n += 1;
        }
        return Ok((n, None));
    }
    if kind == "morphism" {
        return Err(line.err(col(0), &format!("\"FROM -> TERMS\" (a term of {obj})"), text.trim()));
    }
    if word(0) == "period" && toks.len() == 2 && word(1).starts_with('(') {
        if entry.get("period").is_some() {
            return Err(format!("{}:{}: {obj}: the period is declared twice", line.no, col(0)));
        }
        entry["period"] = grading(line, col(1), word(1))?;
        return Ok((0, None));
    }
    let shape = if kind == "module" {
        "\"GENERATOR iota0|iota1 (grading)\", \"period (…)\" or \"m(x, …) = U^… y\""
    } else {
        "\"GENERATOR iota0|iota1 [(grading)]\", \"period (…)\" or \"FROM -> TERMS\""
    };
    if !(2..=3).contains(&toks.len()) {
        return Err(line.err(col(0), shape, text.trim()));
    }
    let i = idempotent(word(1)).ok_or_else(|| {
        format!(
            "{}:{}: {obj}, generator \"{}\": expected its idempotent iota0 or iota1 (ι0, ι1), found \"{}\"",
            line.no,
            col(1),
            word(0),
            word(1)
        )
    })?;
    let mut g = json!({ "idempotent": i });
    match toks.get(2) {
        Some((c, t)) => g["grading"] = grading(line, *c, t)?,
        None if kind == "module" => {
            return Err(format!(
                "{}:{}: {obj}, generator \"{}\": a module generator needs its grading (2j, 2p, 2q, 2a) after the idempotent",
                line.no,
                col(2),
                word(0)
            ))
        }
        None => {}
    }
    let gens = entry["generators"].as_object_mut().expect("an explicit object");
    if gens.insert(word(0).to_string(), g).is_some() {
        return Err(format!("{}:{}: {obj}: generator \"{}\" declared twice", line.no, col(0), word(0)));
    }
    Ok((0, Some(word(0).to_string())))
}

/// `m(x, a1, …, (b1, …)^n, …, ak) = U^(c·n + d) y + …`: families of operations, one per term
/// on the right. The block raised to a letter is repeated that many times, for every value
/// ≥ 0; that letter is the family's parameter and may appear in the powers of U (`U^(n+1)`,
/// `U^(2n)`, `U^n`); without a block every power is a constant (`U`, `U^3`, none for 1).
/// The empty block `()^n` only marks where the JSON form's `prefix` ends and its `suffix`
/// begins in a single operation (`repeat` empty), so that every JSON family has a text form.
fn operations(line: &Line, start: usize, obj: &str) -> Result<Vec<Value>, String> {
    let text = line.text;
    let at = |col: usize, msg: String| format!("{}:{col}: {obj}: {msg}", line.no);
    let rest = &text[start - 1..];
    // An optional subscript m_3 or m_{3}: checked against the length when there is no block.
    let (subscript, open) = match rest.strip_prefix("m_") {
        Some(r) => {
            let k = r.find('(').ok_or_else(|| at(start, "expected \"m(x, …) = …\"".into()))?;
            let s = r[..k].trim_start_matches('{').trim_end_matches('}');
            let n: usize = s
                .parse()
                .map_err(|_| at(start + 2, format!("the subscript \"{}\" of m is not a whole number", &r[..k])))?;
            (Some(n), start + 2 + k)
        }
        None => (None, start + 1),
    };
    // The input list: up to the matching ')'.
    let mut depth = 0usize;
    let mut close = None;
    for (i, ch) in text[open - 1..].char_indices() {
        match ch {
            '(' => depth += 1,
            ')' => {
                depth -= 1;
                if depth == 0 {
                    close = Some(open - 1 + i);
                    break;
                }
            }
            _ => {}
        }
    }
    let close = close.ok_or_else(|| at(open, "the input list of m has no closing ')'".into()))?;
    let inner = &text[open..close];
    // Split at top-level commas, keeping columns.
    let mut items: Vec<(usize, &str)> = Vec::new();
    let (mut depth, mut from) = (0usize, 0usize);
    for (i, ch) in inner.char_indices() {
        match ch {
            '(' => depth += 1,
            ')' => depth = depth.saturating_sub(1),
            ',' if depth == 0 => {
                items.push((from, &inner[from..i]));
                from = i + 1;
            }
            _ => {}
        }
    }
    items.push((from, &inner[from..]));
    let items: Vec<(usize, &str)> =
        items.into_iter().map(|(i, s)| (open + 1 + i + (s.len() - s.trim_start().len()), s.trim())).collect();
    let (gcol, from_gen) = items[0];
    if from_gen.is_empty() || from_gen.contains([' ', '(', '^']) {
        return Err(at(gcol, format!("expected the generator the operation starts from, found \"{from_gen}\"")));
    }
    let (mut prefix, mut repeat, mut suffix) = (Vec::new(), Vec::new(), Vec::new());
    let mut param: Option<(usize, String)> = None;
    let mut empty_block = false;
    let element = |c: usize, s: &str| -> Result<String, String> {
        match algebra_element(s) {
            Some("1") => {
                Err(at(c, "an input of an operation is a Reeb element, not 1 (strict unitality is built in)".into()))
            }
            Some(a) => Ok(a.to_string()),
            None => Err(unknown_element(line, c, obj, s)),
        }
    };
    for &(c, item) in &items[1..] {
        if item.is_empty() {
            return Err(at(c, "an empty input (two commas in a row?)".into()));
        }
        match item.rsplit_once('^') {
            Some((block, var)) => {
                if param.is_some() {
                    return Err(at(c, format!("a second repeated block \"{item}\": a family has at most one")));
                }
                let var = var.trim();
                if var.len() != 1 || !var.chars().all(|ch| ch.is_ascii_alphabetic()) || var == "U" {
                    return Err(at(
                        c,
                        format!("the repeated block \"{item}\" must be raised to one letter, the family's parameter (e.g. rho23^n)"),
                    ));
                }
                let block = block.trim();
                param = Some((c, var.to_string()));
                // `()^n`, the empty block: no repetition, only where the JSON form splits a
                // single operation's inputs into prefix and suffix.
                if block == "()" {
                    empty_block = true;
                    continue;
                }
                let parts: Vec<&str> = match block.strip_prefix('(').and_then(|b| b.strip_suffix(')')) {
                    Some(b) => b.split(',').map(str::trim).collect(),
                    None => vec![block],
                };
                if parts.iter().any(|p| p.is_empty()) {
                    return Err(at(c, format!("the repeated block \"{block}\" is empty or has an empty entry")));
                }
                for p in parts {
                    repeat.push(element(c, p)?);
                }
            }
            None if param.is_some() => suffix.push(element(c, item)?),
            None => prefix.push(element(c, item)?),
        }
    }
    let k = prefix.len() + suffix.len();
    if let Some(s) = subscript {
        if param.is_some() {
            return Err(at(start, "a family's length depends on its parameter: write m(…) without a subscript".into()));
        }
        if s != k + 1 {
            return Err(at(start, format!("m_{s} takes {} inputs after the generator, not {k}", s.saturating_sub(1))));
        }
    }
    // The right-hand side: terms joined by " + ".
    let after = &text[close + 1..];
    let eq = after
        .find('=')
        .filter(|i| after[..*i].trim().is_empty())
        .ok_or_else(|| at(close + 2, "expected \"= U^… y\" after the inputs".into()))?;
    let rhs_start = close + 1 + eq + 1;
    let rhs = &text[rhs_start..];
    if rhs.trim().is_empty() {
        return Err(at(rhs_start + 1, "expected the output after '=', e.g. \"U^(n+1) x\"".into()));
    }
    // Terms joined by '+' outside parentheses (`U^(2n + 1) x + y`).
    let mut terms: Vec<(usize, &str)> = Vec::new();
    let (mut depth, mut from) = (0usize, 0usize);
    for (i, ch) in rhs.char_indices() {
        match ch {
            '(' => depth += 1,
            ')' => depth = depth.saturating_sub(1),
            '+' if depth == 0 => {
                terms.push((from, &rhs[from..i]));
                from = i + 1;
            }
            _ => {}
        }
    }
    terms.push((from, &rhs[from..]));
    let mut out = Vec::new();
    for (offset, term) in terms {
        let c = rhs_start + 1 + offset + (term.len() - term.trim_start().len());
        let term = term.trim();
        if term.is_empty() {
            return Err(at(c, "an empty term on the right (a '+' too many?)".into()));
        }
        let (coef, to) = match term.rsplit_once([' ', '·', '*']) {
            Some((coef, to)) => (coef.trim().trim_end_matches(['·', '*']).trim_end(), to.trim()),
            None => ("", term),
        };
        if to.is_empty() || to.starts_with('U') && (to == "U" || to.starts_with("U^")) {
            return Err(at(c, format!("expected a power of U and a generator, e.g. \"U^(n+1) x\", found \"{term}\"")));
        }
        let var = param.as_ref().filter(|_| !empty_block).map(|p| p.1.as_str());
        let power = power_of_u(coef, var).map_err(|e| at(c, e))?;
        out.push(json!({
            "from": from_gen, "to": to, "power": power,
            "prefix": prefix, "repeat": repeat, "suffix": suffix,
        }));
    }
    Ok(out)
}

/// `""` (1), `U`, `U^3`, `U^n`, `U^(n+1)`, `U^(2n + 1)`, `U^(2*n)`, `U^(2·n+1)` → [a, b] with
/// U^(a·n + b); a = 0 unless the family has the parameter `var`.
fn power_of_u(coef: &str, var: Option<&str>) -> Result<[u32; 2], String> {
    let bad = || {
        format!(
            "\"{coef}\" is not a power of U with exponent a·{0} + b (whole a, b ≥ 0): e.g. U, U^3, U^{0}, U^({0}+1), U^(2{0}+1)",
            var.unwrap_or("n")
        )
    };
    if coef.is_empty() {
        return Ok([0, 0]);
    }
    let exp = match coef.strip_prefix('U') {
        Some("") => return Ok([0, 1]),
        Some(e) => e.strip_prefix('^').ok_or_else(bad)?,
        None => return Err(bad()),
    };
    let exp: String = exp.chars().filter(|c| !c.is_whitespace()).collect();
    let exp = exp.strip_prefix('(').and_then(|e| e.strip_suffix(')')).unwrap_or(&exp).to_string();
    let (mut a, mut b) = (0u64, 0u64);
    for part in exp.split('+') {
        let number = |s: &str| -> Result<u64, String> {
            if s.is_empty() {
                return Ok(1);
            }
            s.parse::<u64>().map_err(|_| bad())
        };
        let letter = part.chars().last().filter(|c| c.is_ascii_alphabetic());
        match letter {
            Some(l) => {
                let l = l.to_string();
                if var != Some(l.as_str()) {
                    return Err(match var {
                        Some(v) => format!("the power \"{coef}\" uses \"{l}\", but the family's parameter is \"{v}\""),
                        None => format!(
                            "the power \"{coef}\" uses \"{l}\", but the operation has no repeated block (write one as rho23^{l})"
                        ),
                    });
                }
                let head = &part[..part.len() - 1];
                let head = head.strip_suffix(['*', '·']).unwrap_or(head);
                a += number(head)?;
            }
            None if !part.is_empty() => b += number(part)?,
            None => return Err(bad()),
        }
    }
    let max = tubecert_format::limits::MAX_EXPONENT as u64;
    if a > max || b > max {
        return Err(format!("the power \"{coef}\" has a coefficient beyond 2^20"));
    }
    Ok([a as u32, b as u32])
}

/// `complement framing T of SOURCE`.
pub(super) fn structure_construction(line: &Line, toks: &[(usize, String)]) -> Result<Value, String> {
    let w = |k: usize| toks.get(k).map(|t| t.1.as_str()).unwrap_or("");
    let c = |k: usize| toks.get(k).map_or(line.text.len() + 1, |t| t.0);
    if w(0) != "complement" || w(1) != "framing" || w(3) != "of" || toks.len() < 5 {
        return Err(line.err(c(0), "\"complement framing T of SOURCE\"", &joined(toks)));
    }
    let t: i64 = w(2).parse().map_err(|_| line.err(c(2), "an integer framing", w(2)))?;
    Ok(json!({"complement": {"companion": super::source(line, &toks[4..])?, "framing": t}}))
}

/// `cable_pattern P` or `diagram beta CROSSINGS… w SIDE K`.
pub(super) fn module_construction(line: &Line, toks: &[(usize, String)]) -> Result<Value, String> {
    let w = |k: usize| toks.get(k).map(|t| t.1.as_str()).unwrap_or("");
    let c = |k: usize| toks.get(k).map_or(line.text.len() + 1, |t| t.0);
    match w(0) {
        "cable_pattern" if toks.len() == 2 => {
            let p: i64 = w(1).parse().map_err(|_| line.err(c(1), "an integer P ≥ 1", w(1)))?;
            Ok(json!({"cable_pattern": {"p": p}}))
        }
        "diagram" if w(1) == "beta" => {
            let wpos = toks.iter().position(|t| t.1 == "w").filter(|&k| k >= 2 && toks.len() == k + 3);
            let Some(k) = wpos else {
                return Err(line.err(
                    c(0),
                    "\"diagram beta CROSSING… w SIDE K\", e.g. diagram beta E1 S1 N2 w top 1",
                    &joined(toks),
                ));
            };
            let beta: Vec<&str> = toks[2..k].iter().map(|t| t.1.as_str()).collect();
            let interval: i64 = w(k + 2).parse().map_err(|_| line.err(c(k + 2), "a whole number", w(k + 2)))?;
            Ok(json!({"diagram": {"beta": beta, "w": [w(k + 1), interval]}}))
        }
        _ => Err(line.err(c(0), "\"cable_pattern P\" or \"diagram beta CROSSING… w SIDE K\"", &joined(toks))),
    }
}

fn joined(toks: &[(usize, String)]) -> String {
    toks.iter().map(|t| t.1.as_str()).collect::<Vec<_>>().join(" ")
}

/// Replaces the names of sources (`complex C over F2[U,V]`) by their definitions wherever a
/// source stands (after `of`, and inside the constructions there), as the JSON form writes
/// them; a source's name anywhere else is an error.
pub(super) fn inline_sources(
    v: &mut Value,
    sources: &BTreeMap<String, Value>,
    in_source: bool,
    depth: usize,
) -> Result<(), String> {
    if depth > 32 {
        return Err("sources nested deeper than 32 (or a source made from itself)".into());
    }
    let Some(obj) = v.as_object_mut().filter(|o| o.len() == 1) else { return Ok(()) };
    let (op, arg) = obj.iter_mut().next().expect("one key");
    let name = |x: &mut Value, source: bool| -> Result<(), String> {
        match x {
            Value::String(s) if sources.contains_key(s.as_str()) => {
                if !source {
                    return Err(format!(
                        "\"{s}\" is a complex over F2[U,V] (a source); it can stand only after \"of\" (cable, quotient, complement) or in a source"
                    ));
                }
                let mut def = sources[s.as_str()].clone();
                inline_sources(&mut def, sources, true, depth + 1).map_err(|e| format!("{s}: {e}"))?;
                *x = def;
                Ok(())
            }
            Value::Object(_) => inline_sources(x, sources, source, depth + 1),
            _ => Ok(()),
        }
    };
    match (op.as_str(), arg) {
        ("quotient", Value::Array(a)) if !a.is_empty() => name(&mut a[0], true),
        ("cable" | "complement", Value::Object(o)) => o.get_mut("companion").map_or(Ok(()), |s| name(s, true)),
        ("tensor" | "direct_sum", Value::Array(a)) => a.iter_mut().try_for_each(|x| name(x, in_source)),
        ("shift", Value::Array(a)) if !a.is_empty() => name(&mut a[0], in_source),
        ("dual", x) => name(x, in_source),
        _ => Ok(()),
    }
}

/// What reading alone can tell of explicit sources (∂∂ = 0 and homogeneity over `F2[U,V]`) and
/// of the terms of explicit type D structures and morphisms (the idempotents), in messages
/// that point at the line: "LINE: complex C, differential, term 2 […]: …".
pub(super) fn check_written(
    sources: &BTreeMap<String, Value>,
    structures: &Map<String, Value>,
    morphisms: &Map<String, Value>,
    lines: &super::SourceLines,
) -> Vec<String> {
    let at = |msg: String| match lines.locate("", &msg).strip_prefix(':') {
        Some(located) if !located.starts_with(' ') => located.to_string(),
        _ => format!("1: {msg}"),
    };
    let mut errs = Vec::new();
    let none = BTreeMap::new();
    for (name, v) in sources.iter().filter(|(_, v)| v.get("generators").is_some()) {
        if let Err(e) = crate::bordered::inline_source(&tubecert_format::bordered::full_ring(), v, &none, 0) {
            let e = e.replacen("complex source", &format!("complex {name}"), 1);
            errs.push(at(if e.starts_with("complex ") { e } else { format!("complex {name}: {e}") }));
        }
    }
    let idempotents = |v: &Value| -> BTreeMap<String, u64> {
        v["generators"]
            .as_object()
            .into_iter()
            .flatten()
            .filter_map(|(g, d)| Some((g.clone(), d["idempotent"].as_u64()?)))
            .collect()
    };
    let mut check = |obj: String, terms: &Value, from: &BTreeMap<String, u64>, to: &BTreeMap<String, u64>| {
        for (k, t) in terms.as_array().into_iter().flatten().enumerate() {
            let s = |i: usize| t[i].as_str().unwrap_or("");
            let (Some(&i), Some(&j)) = (from.get(s(0)), to.get(s(2))) else { continue };
            let why = match tubecert_format::bordered::Alg::parse(s(1)).ok().and_then(|a| a.idempotents()) {
                None if i != j => Some(format!(
                    "{} is in ι{i} and {} in ι{j}; a term without a Reeb element joins generators of one idempotent",
                    s(0),
                    s(2)
                )),
                Some((l, _)) if l as u64 != i => Some(format!("{} is in ι{i}, but {} starts in ι{l}", s(0), s(1))),
                Some((_, r)) if r as u64 != j => Some(format!("{} ends in ι{r}, but {} is in ι{j}", s(1), s(2))),
                _ => None,
            };
            if let Some(why) = why {
                errs.push(at(format!(
                    "{obj}, term {} [{}, {}, {}]: the idempotents do not match: {why}",
                    k + 1,
                    s(0),
                    s(1),
                    s(2)
                )));
            }
        }
    };
    for (name, v) in structures.iter().filter(|(_, v)| v.get("generators").is_some()) {
        let i = idempotents(v);
        check(format!("type D structure {name}, δ¹"), &v["differential"], &i, &i);
    }
    for (name, v) in morphisms {
        let side = |k: &str| v[k].as_str().and_then(|n| structures.get(n)).filter(|d| d.get("generators").is_some());
        if let (Some(a), Some(b)) = (side("from"), side("to")) {
            check(format!("type D morphism {name}"), &v["terms"], &idempotents(a), &idempotents(b));
        }
    }
    errs
}

/// Text of the bordered sections (and the sources they use), after the complexes.
pub(super) struct Render<'a> {
    /// Every name already used by the problem (new source names avoid them).
    pub taken: &'a mut std::collections::BTreeSet<String>,
    /// Source blocks hoisted out of constructions, in order.
    pub out: &'a mut Vec<String>,
    /// Sources already written, so that one used twice is written once.
    pub seen: &'a mut Vec<(Value, String)>,
}

impl Render<'_> {
    /// A fresh name for a source written out of `base`.
    fn fresh(&mut self, base: &str) -> String {
        let mut name = base.to_string();
        let mut k = 1;
        while self.taken.contains(&name) {
            k += 1;
            name = format!("{base}.{k}");
        }
        self.taken.insert(name.clone());
        name
    }

    /// A source argument in text: a name (of a complex of the problem), or a source block
    /// written above under a fresh name.
    pub(super) fn source(&mut self, v: &Value, base: &str) -> Result<String, String> {
        // After `of`, a construction of names (`staircase torus_knot 2 3`, `tensor T T`) stays
        // on its line; an argument of a construction must be a name.
        if let Ok(text) = super::construction_text(v) {
            return Ok(text);
        }
        self.named(v, base)
    }

    /// A name standing for `v`: its own, or that of a source block written above.
    fn named(&mut self, v: &Value, base: &str) -> Result<String, String> {
        if let Some(s) = v.as_str() {
            return Ok(s.to_string());
        }
        if let Some((_, name)) = self.seen.iter().find(|(w, _)| w == v) {
            return Ok(name.clone());
        }
        let name = self.fresh(base);
        self.seen.push((v.clone(), name.clone()));
        if v.get("generators").is_some() {
            let mut block = vec![String::new(), format!("complex {name} over F2[U,V]")];
            let gens = v["generators"].as_object().ok_or(format!("{name}: generators must be an object"))?;
            block.extend(gens.iter().map(|(g, gr)| format!("  {g} {}", grading_text(gr))));
            block.extend(terms_text(&v["differential"]));
            self.out.extend(block);
        } else {
            let text = self.construction(v, &name)?;
            self.out.extend([String::new(), format!("complex {name} over F2[U,V] = {text}")]);
        }
        Ok(name)
    }

    /// The text of a construction whose sources are written out as blocks named after `base`.
    pub(super) fn construction(&mut self, c: &Value, base: &str) -> Result<String, String> {
        let (op, arg) =
            c.as_object().filter(|o| o.len() == 1).and_then(|o| o.iter().next()).ok_or("not a construction")?;
        let args = |r: &mut Self, a: &[Value]| -> Result<String, String> {
            let many = a.len() > 1;
            let parts: Result<Vec<String>, String> = a
                .iter()
                .enumerate()
                .map(|(i, x)| r.named(x, &if many { format!("{base}.{}", i + 1) } else { format!("{base}.1") }))
                .collect();
            Ok(parts?.join(" "))
        };
        Ok(match (op.as_str(), arg) {
            ("quotient", Value::Array(a)) if !a.is_empty() => {
                let vars: Vec<&str> = a[1..].iter().filter_map(|x| x.as_str()).collect();
                format!("quotient {} of {}", vars.join(" "), self.source(&a[0], &format!("{base}.source"))?)
            }
            ("cable", a) => {
                let src = self.source(&a["companion"], &format!("{base}.companion"))?;
                format!("cable {} {} of {src}", a["p"], a["q"])
            }
            ("tensor" | "direct_sum", Value::Array(a)) => format!("{op} {}", args(self, a)?),
            ("dual", x) => format!("dual {}", args(self, std::slice::from_ref(x))?),
            ("shift", Value::Array(a)) if a.len() == 2 => {
                format!("shift {} {}", args(self, &a[..1])?, grading_text(&a[1]))
            }
            _ => super::construction_text(c)?,
        })
    }

    pub(super) fn structure(&mut self, name: &str, v: &Value) -> Result<(), String> {
        if let Some(c) = v.get("complement") {
            let src = self.source(&c["companion"], &format!("{name}.companion"))?;
            self.out.push(String::new());
            self.out.push(format!("type_d_structure {name} = complement framing {} of {src}", c["framing"]));
            return Ok(());
        }
        let mut block = vec![String::new(), format!("type_d_structure {name}")];
        if let Some(p) = v.get("period") {
            block.push(format!("  period {}", grading_text(p)));
        }
        block.extend(generators(v)?);
        block.extend(terms_text(&v["differential"]));
        self.out.extend(block);
        Ok(())
    }

    pub(super) fn module(&mut self, name: &str, v: &Value) -> Result<(), String> {
        self.out.push(String::new());
        if let Some(p) = v.get("cable_pattern") {
            self.out.push(format!("type_a_module {name} = cable_pattern {}", p["p"]));
            return Ok(());
        }
        if let Some(d) = v.get("diagram") {
            let beta: Vec<&str> = d["beta"].as_array().into_iter().flatten().filter_map(Value::as_str).collect();
            let side = d["w"][0].as_str().unwrap_or("");
            self.out.push(format!("type_a_module {name} = diagram beta {} w {side} {}", beta.join(" "), d["w"][1]));
            return Ok(());
        }
        self.out.push(format!("type_a_module {name}"));
        if let Some(p) = v.get("period") {
            self.out.push(format!("  period {}", grading_text(p)));
        }
        self.out.extend(generators(v)?);
        for f in v["operations"].as_array().into_iter().flatten() {
            self.out.push(format!("  {}", family_text(f)?));
        }
        Ok(())
    }

    pub(super) fn morphism(&mut self, name: &str, v: &Value) {
        self.out.push(String::new());
        let s = |k: &str| v[k].as_str().unwrap_or("").to_string();
        self.out.push(format!("type_d_morphism {name} : {} -> {}", s("from"), s("to")));
        self.out.extend(terms_text(&v["terms"]));
    }
}

fn generators(v: &Value) -> Result<Vec<String>, String> {
    let gens: &Map<String, Value> = v["generators"].as_object().ok_or("generators must be an object")?;
    Ok(gens
        .iter()
        .map(|(g, d)| {
            let grading = d.get("grading").map(|gr| format!(" {}", grading_text(gr))).unwrap_or_default();
            format!("  {g} iota{}{grading}", d["idempotent"])
        })
        .collect())
}

/// `m(x, rho3, rho23^n, rho2) = U^(n+1) x` for a family.
fn family_text(f: &Value) -> Result<String, String> {
    let list = |k: &str| -> Vec<String> {
        f[k].as_array().into_iter().flatten().filter_map(Value::as_str).map(String::from).collect()
    };
    let (prefix, repeat, suffix) = (list("prefix"), list("repeat"), list("suffix"));
    let mut inputs = vec![f["from"].as_str().ok_or("an operation without \"from\"")?.to_string()];
    inputs.extend(prefix);
    let power: [u64; 2] = serde_json::from_value(f["power"].clone()).map_err(|e| format!("power: {e}"))?;
    let exponent = match (repeat.is_empty(), power) {
        (_, [0, 0]) => String::new(),
        (_, [0, 1]) => "U ".into(),
        (_, [0, b]) => format!("U^{b} "),
        (true, _) => return Err("a family without a repeated block has power [0, b]".into()),
        (false, [a, b]) => {
            let an = if a == 1 { "n".to_string() } else { format!("{a}n") };
            match b {
                0 if a == 1 => "U^n ".into(),
                0 => format!("U^({an}) "),
                b => format!("U^({an}+{b}) "),
            }
        }
    };
    match repeat.len() {
        0 if !suffix.is_empty() => inputs.push("()^n".into()),
        0 => {}
        1 => inputs.push(format!("{}^n", repeat[0])),
        _ => inputs.push(format!("({})^n", repeat.join(", "))),
    }
    inputs.extend(suffix);
    Ok(format!("m({}) = {exponent}{}", inputs.join(", "), f["to"].as_str().unwrap_or("")))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn algebra_elements_in_every_spelling() {
        for (s, a) in [("rho12", "rho12"), ("ρ12", "rho12"), ("ρ_12", "rho12"), ("rho_{123}", "rho123"), ("1", "1")] {
            assert_eq!(algebra_element(s), Some(a), "{s}");
        }
        for s in ["rho13", "rho", "rho0", "r12", "ρ", "12"] {
            assert_eq!(algebra_element(s), None, "{s}");
        }
        assert_eq!(idempotent("ι_1"), Some(1));
        assert_eq!(idempotent("iota2"), None);
    }

    proptest::proptest! {
        /// Every explicit bordered object the JSON form can hold reads back from its text.
        #[test]
        fn explicit_bordered_objects_round_trip(p in problem()) {
            let text = crate::text_format::render(&p).unwrap();
            proptest::prop_assert_eq!(crate::text_format::parse(&text).unwrap(), p, "{}", text);
        }
    }

    fn problem() -> impl proptest::strategy::Strategy<Value = Value> {
        use proptest::prelude::*;
        let names = || prop::sample::select(vec!["x", "y", "z2", "kappa1.a.b", "x⊗y", "m_1", "period", "g'"]);
        let reeb = || prop::sample::select(vec!["rho1", "rho2", "rho3", "rho12", "rho23", "rho123"]);
        let element = prop_oneof![Just("1"), reeb()];
        let grading = prop::collection::vec(-9i64..9, 4);
        let generators = prop::collection::btree_map(names(), (0u8..2, prop::option::of(grading.clone())), 1..4);
        let terms = prop::collection::vec((names(), element, names()), 0..5);
        let structure =
            (generators.clone(), terms.clone(), prop::option::of(grading.clone())).prop_map(|(g, t, period)| {
                let mut v = json!({
                    "generators": g.into_iter().map(|(n, (i, gr))| {
                        let mut d = json!({"idempotent": i});
                        if let Some(gr) = gr { d["grading"] = json!(gr); }
                        (n.to_string(), d)
                    }).collect::<Map<String, Value>>(),
                    "differential": t.into_iter().map(|(a, b, c)| json!([a, b, c])).collect::<Vec<_>>(),
                });
                if let Some(p) = period {
                    v["period"] = json!(p);
                }
                v
            });
        let words = || prop::collection::vec(reeb(), 0..3);
        let family =
            (names(), words(), words(), words(), 0u32..3, 0u32..4, names()).prop_map(|(f, pre, rep, suf, a, b, to)| {
                let a = if rep.is_empty() { 0 } else { a };
                json!({"from": f, "prefix": pre, "repeat": rep, "suffix": suf, "power": [a, b], "to": to})
            });
        let module = (prop::collection::btree_map(names(), (0u8..2, grading.clone()), 1..3), prop::collection::vec(family, 0..4), prop::option::of(grading))
            .prop_map(|(g, ops, period)| {
                let mut v = json!({
                    "generators": g.into_iter().map(|(n, (i, gr))| (n.to_string(), json!({"idempotent": i, "grading": gr}))).collect::<Map<String, Value>>(),
                    "operations": ops,
                });
                if let Some(p) = period { v["period"] = json!(p); }
                v
            });
        let morphism = terms.prop_map(|t| json!({"from": "N", "to": "N2", "terms": t.into_iter().map(|(a, b, c)| json!([a, b, c])).collect::<Vec<_>>()}));
        (structure, module, morphism).prop_map(|(d, a, f)| json!({
            "format": "tubecert-problem", "version": 1,
            "ring": {"variables": ["U"], "gradings": ["maslov", "alexander"],
                     "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]},
            "complexes": {}, "maps": {}, "goals": [],
            "type_d_structures": {"N": d, "N2": {"complement": {"companion": {"staircase": {"torus_knot": [2, 3]}}, "framing": -1}}},
            "type_a_modules": {"M": a, "P": {"cable_pattern": {"p": 3}}},
            "type_d_morphisms": {"f": f},
        }))
    }

    #[test]
    fn powers_of_u_with_a_parameter() {
        let n = Some("n");
        assert_eq!(power_of_u("", None), Ok([0, 0]));
        assert_eq!(power_of_u("U", None), Ok([0, 1]));
        assert_eq!(power_of_u("U^3", n), Ok([0, 3]));
        assert_eq!(power_of_u("U^n", n), Ok([1, 0]));
        assert_eq!(power_of_u("U^(n+1)", n), Ok([1, 1]));
        assert_eq!(power_of_u("U^(2n + 1)", n), Ok([2, 1]));
        assert_eq!(power_of_u("U^(1+2*n)", n), Ok([2, 1]));
        assert_eq!(power_of_u("U^(3·n)", n), Ok([3, 0]));
        assert!(power_of_u("U^(n-1)", n).is_err());
        assert!(power_of_u("U^k", n).unwrap_err().contains("parameter is \"n\""));
        assert!(power_of_u("U^n", None).unwrap_err().contains("no repeated block"));
        assert!(power_of_u("V^2", n).is_err());
        assert!(power_of_u("U^2097152", n).unwrap_err().contains("2^20"));
    }
}
