//! The hand-written problem format: one declaration per line, `#` starts a comment.
//!
//! ```text
//! ring `F2[U]`
//! gradings maslov alexander
//! degree U (-2, -1)
//! degree d (-1, 0)
//!
//! complex O
//!   o (0, 0)
//! complex K
//!   z (0, 0)
//!   a (0, 0)
//!   b (-3, -2)
//!   b -> U^2 a
//! complex T = staircase torus_knot 3 4      # also: alexander 3 2 0 -2 -3
//! complex S = tensor T K                    # dual T | shift T (1, 0) | direct_sum A B | cone f
//! complex Q = quotient V of staircase torus_knot 3 4   # the source is over `F2[U,V]`
//!
//! map F : O -> K degree (0, 0)
//!   o -> z
//! map G : O -> K degree (0, 0)
//!   o -> z + a                              # a polynomial coefficient: (U + V) x
//!
//! goal torsion_order F G U surfaces         # options: order K, max_order N
//! goal homotopic F G times U^2
//! goal distinct F G times U
//! goal homology K
//! ```
//! Other goals: `equivalent C D f g`, `tau K [alexander NAME]`, `torsion_order_of_complex K U`,
//! `null_homotopic EXPR` / `not_null_homotopic EXPR` with EXPR in the statements' notation
//! (`U^2·(F + G)`, `(U·F)∘id_O`; see `map_expression`); JSON there is still read.
//! Bordered objects (`type_d_structure`, `type_a_module`, `type_d_morphism`, `box_tensor`,
//! `box_tensor_map`) and sources over `F2[U,V]` (`complex C over F2[U,V]`) are read and written
//! in `bordered`.
//! It converts both ways with the JSON problem format ([`parse`], [`render`]).

use serde_json::{json, Map, Value};

mod bordered;

struct Line<'a> {
    no: usize,
    text: &'a str,
}

impl Line<'_> {
    fn err(&self, col: usize, expected: &str, found: &str) -> String {
        format!(
            "{}:{}: expected {expected}, found {}",
            self.no,
            col,
            if found.is_empty() { "end of line".into() } else { format!("\"{found}\"") }
        )
    }

    /// Tokens with their 1-based columns; a parenthesized group is one token.
    fn tokens(&self) -> Result<Vec<(usize, String)>, String> {
        let mut out = Vec::new();
        let b = self.text.as_bytes();
        let mut i = 0;
        while i < b.len() {
            if b[i].is_ascii_whitespace() {
                i += 1;
                continue;
            }
            let start = i;
            if b[i] == b'(' {
                let close =
                    self.text[i..].find(')').ok_or_else(|| self.err(i + 1, "a closing ')'", &self.text[i..]))?;
                i += close + 1;
            } else if b[i] == b'{' || b[i] == b'[' {
                out.push((start + 1, self.text[i..].to_string())); // JSON to the end of the line
                break;
            } else {
                // A word ends at '(' unless that begins the ASCII spelling of ⊗ inside it.
                let tensor = |i: usize| i > start && self.text[i..].starts_with(crate::problem::ASCII_TENSOR);
                while i < b.len() && !b[i].is_ascii_whitespace() && (b[i] != b'(' || tensor(i)) {
                    i += 1;
                }
            }
            out.push((start + 1, self.text[start..i].to_string()));
        }
        Ok(out)
    }
}

fn grading(line: &Line, col: usize, tok: &str) -> Result<Value, String> {
    let inner = tok
        .strip_prefix('(')
        .and_then(|t| t.strip_suffix(')'))
        .ok_or_else(|| line.err(col, "a grading like (0, -1)", tok))?;
    let v: Result<Vec<i64>, _> = inner.split(',').map(|x| x.trim().parse::<i64>()).collect();
    v.map(|v| json!(v)).map_err(|_| line.err(col, "integers separated by commas", tok))
}

/// `z + U^2 a + (U + V) b` → [(coefficient, target)].
fn targets(line: &Line, col: usize, text: &str) -> Result<Vec<(String, String)>, String> {
    let mut out = Vec::new();
    let mut rest = text.trim();
    while !rest.is_empty() {
        let (coef, after) = if let Some(r) = rest.strip_prefix('(') {
            let close = r.find(')').ok_or_else(|| line.err(col, "')'", rest))?;
            (r[..close].trim().to_string(), r[close + 1..].trim_start())
        } else {
            let term_end = rest.find(" + ").unwrap_or(rest.len());
            let term = &rest[..term_end];
            match term.rsplit_once(' ') {
                Some((c, _)) => (c.trim().to_string(), rest[c.len()..].trim_start()),
                None => ("1".to_string(), rest),
            }
        };
        let end = after.find(" + ").unwrap_or(after.len());
        let target = after[..end].trim();
        if target.is_empty() || target.contains(' ') {
            return Err(line.err(col, "a term like \"U^2 a\" or \"(U + V) b\"", rest));
        }
        out.push((if coef.is_empty() { "1".into() } else { coef }, target.to_string()));
        rest = after[end..].trim_start().strip_prefix('+').unwrap_or("").trim_start();
    }
    if out.is_empty() {
        return Err(line.err(col, "at least one term after \"->\"", ""));
    }
    Ok(out)
}

/// Parses the text format into the JSON value of a problem file.
pub fn parse(src: &str) -> Result<Value, Vec<String>> {
    parse_located(src).map(|(v, _)| v)
}

/// [`parse`], and what reading can tell of the written objects with their lines at hand: each
/// source over F2\[U,V\] validated (∂∂ = 0, homogeneous) and the idempotents of every explicit
/// δ¹ or morphism term (`bordered::check_written`). Used where a problem is read to be proved;
/// `convert` keeps to [`parse`], which only reads.
pub fn parse_checked(src: &str) -> Result<Value, Vec<String>> {
    read(src, true).map(|(v, _)| v)
}

/// Where things are declared in a text problem, so that a message about one ("complex K:",
/// "complex K, generator \"b\":", "map F, term 3:", "goal 2:", in the words of the checker,
/// the constructions and the prover) can point at its line.
#[derive(Debug, Default)]
pub struct SourceLines {
    /// "complex K", "map F", "complex K, generator \"b\"", "goal 2" → line.
    places: std::collections::BTreeMap<String, usize>,
    /// "complex K, differential", "map F" → the line of each term, in order.
    terms: std::collections::BTreeMap<String, Vec<usize>>,
    /// Complexes declared over F2[U,V] to stand as sources → line. Reading writes them inline
    /// where they are used, so elsewhere their names are unknown: a message saying so names them.
    sources: std::collections::BTreeMap<String, usize>,
}

impl SourceLines {
    /// Reads the lines of a text problem (none for JSON or unreadable input).
    pub fn of(bytes: &[u8]) -> SourceLines {
        std::str::from_utf8(bytes)
            .ok()
            .filter(|t| !crate::problem::is_json(t))
            .and_then(|t| parse_located(t).ok())
            .map_or_else(SourceLines::default, |(_, lines)| lines)
    }

    /// `FILE:LINE: message` when the message names something of this file, else `FILE: message`.
    pub fn locate(&self, file: &str, message: &str) -> String {
        let term = self.terms.iter().find_map(|(what, lines)| {
            let rest = message.strip_prefix(what.as_str())?;
            let rest = rest.strip_prefix(", term ").or_else(|| rest.strip_prefix(", operation "))?;
            let digits = rest.len() - rest.trim_start_matches(|c: char| c.is_ascii_digit()).len();
            lines.get(rest[..digits].parse::<usize>().ok()?.checked_sub(1)?)
        });
        // Otherwise the longest name of a place the message starts with.
        let place = || {
            let named = |k: &&String| message.strip_prefix(k.as_str()).is_some_and(|r| r.starts_with([':', ',', ' ']));
            self.places.keys().filter(named).max_by_key(|k| k.len()).map(|k| &self.places[k])
        };
        let source = self.sources.iter().find(|(n, _)| message.contains(&format!("complex \"{n}\" is not declared")));
        let hint = source.map_or(String::new(), |(n, l)| {
            format!(
                " ({n}, line {l}, is a complex over F2[U,V], which stands only after `of` or inside another source: \
                 use it through a complex over the problem's ring, e.g. `complex Q = quotient V of {n}`)"
            )
        });
        match term.or_else(place) {
            Some(l) => format!("{file}:{l}: {message}{hint}"),
            None => format!("{file}: {message}{hint}"),
        }
    }
}

/// [`parse`], with where everything is declared.
pub fn parse_located(src: &str) -> Result<(Value, SourceLines), Vec<String>> {
    read(src, false)
}

fn read(src: &str, check: bool) -> Result<(Value, SourceLines), Vec<String>> {
    let mut lines = SourceLines::default();
    let mut errs = Vec::new();
    let (mut variables, mut gradings) = (Vec::<String>::new(), Vec::<String>::new());
    let (mut var_degrees, mut complexes, mut maps, mut goals) = (Map::new(), Map::new(), Map::new(), Vec::new());
    // Bordered sections, and complexes over F2[U,V] written to stand as sources (with their lines).
    let (mut structures, mut modules, mut morphisms) = (Map::new(), Map::new(), Map::new());
    let mut sources: std::collections::BTreeMap<String, Value> = Default::default();
    let mut source_lines: std::collections::BTreeMap<String, usize> = Default::default();
    let mut diff_degree = Value::Null;
    let mut header = Header::default();
    // The block that indented lines belong to: ("complex"|"source"|"map"|"type_d_structure"|
    // "type_a_module"|"type_d_morphism", name).
    let mut block: Option<(&str, String)> = None;
    for (i, raw) in src.lines().enumerate() {
        let text = raw.split('#').next().unwrap_or("");
        if text.trim().is_empty() {
            continue;
        }
        let line = Line { no: i + 1, text };
        let result: Result<(), String> = (|| {
            let toks = line.tokens()?;
            let word = |k: usize| toks.get(k).map(|t| t.1.as_str()).unwrap_or("");
            let col = |k: usize| toks.get(k).map_or(text.len() + 1, |t| t.0);
            let indented = text.starts_with(' ') || text.starts_with('\t');
            if indented {
                let Some((kind, name)) = &block else {
                    return Err(line.err(
                        col(0),
                        "a declaration (ring, gradings, degree, complex, map, goal)",
                        word(0),
                    ));
                };
                if let Some(body) = match *kind {
                    "type_d_structure" => structures.get_mut(name).map(bordered::Body::Structure),
                    "type_a_module" => modules.get_mut(name).map(bordered::Body::Module),
                    "type_d_morphism" => morphisms.get_mut(name).map(bordered::Body::Morphism),
                    _ => None,
                } {
                    let obj = match *kind {
                        "type_d_structure" => format!("type D structure {name}"),
                        "type_a_module" => format!("type A module {name}"),
                        _ => format!("type D morphism {name}"),
                    };
                    let (terms, generator) = bordered::body_line(&line, &toks, &obj, body)?;
                    let what = match *kind {
                        "type_d_structure" => format!("{obj}, δ¹"),
                        _ => obj.clone(),
                    };
                    lines.terms.entry(what).or_default().extend(std::iter::repeat_n(line.no, terms));
                    if let Some(g) = generator {
                        lines.places.insert(format!("{obj}, generator \"{g}\""), line.no);
                    }
                    return Ok(());
                }
                let (entry, what, explicit) = match *kind {
                    "complex" => (
                        complexes.get_mut(name).expect("block exists"),
                        format!("complex {name}"),
                        "a term or generator of an explicit complex (this one is a construction)",
                    ),
                    "source" => (
                        sources.get_mut(name).expect("block exists"),
                        format!("complex {name}"),
                        "a term or generator of an explicit complex (this source is a construction)",
                    ),
                    _ => (
                        maps.get_mut(name).expect("block exists"),
                        format!("map {name}"),
                        "a term of an explicit map (this one is a construction)",
                    ),
                };
                let complex = *kind != "map";
                if let Some(arrow) = text.find("->") {
                    let from = text[..arrow].trim();
                    let (key, what) =
                        if complex { ("differential", format!("{what}, differential")) } else { ("terms", what) };
                    let list = entry[key].as_array_mut().ok_or_else(|| line.err(col(0), explicit, from))?;
                    for (c, t) in targets(&line, arrow + 3, &text[arrow + 2..])? {
                        lines.terms.entry(what.clone()).or_default().push(line.no);
                        list.push(json!([from, c, t]));
                    }
                } else if complex && toks.len() == 2 {
                    let g = grading(&line, col(1), word(1))?;
                    let gens =
                        entry["generators"].as_object_mut().ok_or_else(|| line.err(col(0), explicit, word(0)))?;
                    lines.places.insert(format!("complex {name}, generator \"{}\"", word(0)), line.no);
                    if gens.insert(word(0).to_string(), g).is_some() {
                        return Err(format!("{}:{}: generator \"{}\" declared twice", line.no, col(0), word(0)));
                    }
                } else {
                    return Err(line.err(
                        col(0),
                        if complex { "\"NAME (gradings)\" or \"FROM -> TERMS\"" } else { "\"FROM -> TERMS\"" },
                        text.trim(),
                    ));
                }
                return Ok(());
            }
            block = None;
            header.check(&line, &toks, &variables, gradings.len())?;
            match word(0) {
                "ring" => {
                    let r = word(1);
                    let inner = r.strip_prefix("F2").ok_or_else(|| line.err(col(1), "F2, F2[U] or F2[U,V]", r))?;
                    variables = match inner.strip_prefix('[').and_then(|x| x.strip_suffix(']')) {
                        Some(vs) => vs.split(',').map(|v| v.trim().to_string()).collect(),
                        None if inner.is_empty() => vec![],
                        None => return Err(line.err(col(1), "F2, F2[U] or F2[U,V]", r)),
                    };
                }
                "gradings" => gradings = toks[1..].iter().map(|t| t.1.clone()).collect(),
                "degree" if word(1) == "d" => diff_degree = grading(&line, col(2), word(2))?,
                "degree" => {
                    var_degrees.insert(word(1).to_string(), grading(&line, col(2), word(2))?);
                }
                "complex" => {
                    let name = word(1).to_string();
                    if name.is_empty() {
                        return Err(line.err(col(1), "a complex name", ""));
                    }
                    // `complex C over F2[U,V]`: a source, inlined where it is used.
                    let over = word(2) == "over";
                    if over && (word(3) != "F2[U,V]" || !(toks.len() == 4 || word(4) == "=")) {
                        return Err(line.err(
                            col(3),
                            "\"complex NAME over F2[U,V]\" (a source, with gradings (gr_U, gr_V)) or \"… over F2[U,V] = CONSTRUCTION\"",
                            word(3),
                        ));
                    }
                    let eq = if over { 4 } else { 2 };
                    let def = if word(eq) == "=" {
                        construction(&line, &toks[eq + 1..])?
                    } else if toks.len() == eq {
                        json!({"generators": {}, "differential": []})
                    } else {
                        return Err(line.err(col(eq), "\"=\" or the end of the line", word(eq)));
                    };
                    if complexes.contains_key(&name) || sources.contains_key(&name) {
                        return Err(format!("{}:{}: complex \"{name}\" declared twice", line.no, col(1)));
                    }
                    lines.places.insert(format!("complex {name}"), line.no);
                    if over {
                        source_lines.insert(name.clone(), line.no);
                        sources.insert(name.clone(), def);
                        block = Some(("source", name));
                    } else {
                        complexes.insert(name.clone(), def);
                        block = Some(("complex", name));
                    }
                }
                "map" => {
                    let name = word(1).to_string();
                    let def = if word(2) == "=" {
                        if !matches!(word(3), "tensor_maps" | "box_tensor_map") || toks.len() != 6 {
                            return Err(line.err(
                                col(3),
                                "\"tensor_maps F G\" or \"box_tensor_map MODULE MORPHISM\"",
                                word(3),
                            ));
                        }
                        json!({ word(3): [word(4), word(5)] })
                    } else {
                        if word(2) != ":" || word(4) != "->" || word(6) != "degree" {
                            return Err(line.err(
                                col(2),
                                "\"map NAME : FROM -> TO degree (…)\"",
                                &text[col(2).min(text.len() + 1) - 1..],
                            ));
                        }
                        json!({"from": word(3), "to": word(5), "degree": grading(&line, col(7), word(7))?, "terms": []})
                    };
                    lines.places.insert(format!("map {name}"), line.no);
                    if maps.insert(name.clone(), def).is_some() {
                        return Err(format!("{}:{}: map \"{name}\" declared twice", line.no, col(1)));
                    }
                    block = Some(("map", name));
                }
                "type_d_structure" | "type_a_module" | "type_d_morphism" => {
                    let kind: &'static str = match word(0) {
                        "type_d_structure" => "type_d_structure",
                        "type_a_module" => "type_a_module",
                        _ => "type_d_morphism",
                    };
                    let name = word(1).to_string();
                    if name.is_empty() {
                        return Err(line.err(col(1), &format!("a name for the {}", kind.replace('_', " ")), ""));
                    }
                    let (label, def) = match kind {
                        "type_d_structure" => (
                            format!("type D structure {name}"),
                            if word(2) == "=" {
                                bordered::structure_construction(&line, &toks[3..])?
                            } else if toks.len() == 2 {
                                json!({"generators": {}, "differential": []})
                            } else {
                                return Err(line.err(col(2), "\"=\" or the end of the line", word(2)));
                            },
                        ),
                        "type_a_module" => (
                            format!("type A module {name}"),
                            if word(2) == "=" {
                                bordered::module_construction(&line, &toks[3..])?
                            } else if toks.len() == 2 {
                                json!({"generators": {}, "operations": []})
                            } else {
                                return Err(line.err(col(2), "\"=\" or the end of the line", word(2)));
                            },
                        ),
                        _ => {
                            if word(2) != ":" || word(4) != "->" || toks.len() != 6 {
                                return Err(line.err(
                                    col(2),
                                    "\"type_d_morphism NAME : FROM -> TO\" (FROM, TO type D structures)",
                                    &text[col(2).min(text.len() + 1) - 1..],
                                ));
                            }
                            (format!("type D morphism {name}"), json!({"from": word(3), "to": word(5), "terms": []}))
                        }
                    };
                    let section = match kind {
                        "type_d_structure" => &mut structures,
                        "type_a_module" => &mut modules,
                        _ => &mut morphisms,
                    };
                    if section.insert(name.clone(), def).is_some() {
                        return Err(format!("{}:{}: {label} declared twice", line.no, col(1)));
                    }
                    lines.places.insert(label, line.no);
                    block = Some((kind, name));
                }
                "goal" => {
                    goals.push(goal(&line, &toks)?);
                    lines.places.insert(format!("goal {}", goals.len()), line.no);
                }
                other => return Err(line.err(
                    col(0),
                    "ring, gradings, degree, complex, map, type_d_structure, type_a_module, type_d_morphism or goal",
                    other,
                )),
            }
            Ok(())
        })();
        if let Err(e) = result {
            errs.push(e);
        }
    }
    if header.body.is_none() {
        header.complete(src.lines().count() + 1, "the end of the file", &variables, gradings.len());
    }
    errs.extend(header.errs);
    // Sources are written inline where they stand, as the JSON form has them.
    for (name, v) in complexes.iter_mut() {
        if let Err(e) = bordered::inline_sources(v, &sources, false, 0) {
            errs.push(format!("{}:1: complex {name}: {e}", lines.places[&format!("complex {name}")]));
        }
    }
    for (name, v) in structures.iter_mut() {
        if let Err(e) = bordered::inline_sources(v, &sources, false, 0) {
            errs.push(format!("{}:1: type D structure {name}: {e}", lines.places[&format!("type D structure {name}")]));
        }
    }
    for (name, v) in &sources {
        if let Err(e) = bordered::inline_sources(&mut v.clone(), &sources, true, 0) {
            errs.push(format!("{}:1: complex {name}: {e}", source_lines[name]));
        }
    }
    // Explicit sources and bordered objects: checked here, where their lines are known.
    if check && errs.is_empty() {
        errs.extend(bordered::check_written(&sources, &structures, &morphisms, &lines));
    }
    if !errs.is_empty() {
        return Err(errs);
    }
    let mut problem = json!({
        "format": "tubecert-problem", "version": 1,
        "ring": {"variables": variables, "gradings": gradings, "variable_degrees": var_degrees, "differential_degree": diff_degree},
        "complexes": complexes, "maps": maps, "goals": goals
    });
    for (key, section) in
        [("type_d_structures", structures), ("type_a_modules", modules), ("type_d_morphisms", morphisms)]
    {
        if !section.is_empty() {
            problem[key] = Value::Object(section);
        }
    }
    lines.sources = source_lines;
    Ok((problem, lines))
}

/// Where the ring's declarations were seen, so that a missing, repeated, misplaced or
/// mismatched one is reported in the text format's own words at its line.
#[derive(Default)]
struct Header {
    /// Declaration ("ring", "gradings", "degree d", "degree U") → (its line, entries; `None`
    /// when the tuple is malformed, which is reported where it is read).
    seen: std::collections::BTreeMap<String, (usize, Option<usize>)>,
    /// The first complex, map or goal: (line, what it declares).
    body: Option<(usize, String)>,
    /// Errors found when the body starts (or at the end of the file).
    errs: Vec<String>,
}

impl Header {
    fn check(
        &mut self,
        line: &Line,
        toks: &[(usize, String)],
        variables: &[String],
        gradings: usize,
    ) -> Result<(), String> {
        let word = |k: usize| toks.get(k).map(|t| t.1.as_str()).unwrap_or("");
        let key = match word(0) {
            "ring" | "gradings" => word(0).to_string(),
            "degree" => format!("degree {}", word(1)),
            _ => {
                if self.body.is_none() {
                    self.body = Some((line.no, format!("{} {}", word(0), word(1)).trim_end().to_string()));
                    self.complete(line.no, &format!("\"{} {}\"", word(0), word(1)), variables, gradings);
                }
                return Ok(());
            }
        };
        let at = |msg: String| format!("{}:1: {msg}", line.no);
        if let Some((first, _)) = self.seen.get(&key) {
            return Err(at(format!("\"{key}\" is declared twice (first at line {first})")));
        }
        if let Some((l, what)) = &self.body {
            return Err(at(format!(
                "\"{key}\" must come before the complexes, maps and goals (line {l} declares {what}); move it to the top"
            )));
        }
        if key == "gradings" && toks.len() < 2 {
            return Err(at("\"gradings\" needs at least one name, e.g. \"gradings maslov alexander\"".into()));
        }
        // A malformed tuple already has its own error; counting its commas would add a second,
        // misleading one on the same line.
        let entries = match toks.get(2) {
            Some((col, tok)) if key.starts_with("degree") => {
                grading(line, *col, tok).ok().map(|v| v.as_array().map_or(0, Vec::len))
            }
            _ => Some(0),
        };
        self.seen.insert(key, (line.no, entries));
        Ok(())
    }

    /// Every ring declaration present and consistent, checked when `what` at line `no` starts
    /// the complexes, maps and goals.
    fn complete(&mut self, no: usize, what: &str, variables: &[String], gradings: usize) {
        let mut missing = Vec::new();
        if !self.seen.contains_key("ring") {
            missing.push("\"ring F2|F2[U]|F2[U,V]\"".to_string());
        }
        if !self.seen.contains_key("gradings") {
            missing.push("\"gradings NAMES…\" (e.g. maslov alexander)".into());
        }
        for v in variables.iter().filter(|v| !self.seen.contains_key(&format!("degree {v}"))) {
            missing.push(format!("\"degree {v} (…)\" (the degree of {v}, one entry per grading)"));
        }
        if !self.seen.contains_key("degree d") {
            missing.push("\"degree d (…)\" (the degree of the differential)".into());
        }
        for (key, &(l, entries)) in self.seen.iter().filter(|(k, _)| k.starts_with("degree ")) {
            let var = &key["degree ".len()..];
            if var != "d" && self.seen.contains_key("ring") && !variables.iter().any(|v| v == var) {
                let has = if variables.is_empty() { "F2 has none".to_string() } else { variables.join(", ") };
                self.errs.push(format!(
                    "{l}:1: \"{key}\": {var} is not a variable of the ring ({has}); \"degree d\" is the differential's"
                ));
            } else if let Some(entries) = entries.filter(|&e| self.seen.contains_key("gradings") && e != gradings) {
                let g = self.seen["gradings"].0;
                self.errs.push(format!(
                    "{l}:1: \"{key}\" has {entries} entries; line {g} declares {gradings} grading{} (one entry each)",
                    if gradings == 1 { "" } else { "s" }
                ));
            }
        }
        if !missing.is_empty() {
            self.errs
                .push(format!("{no}:1: the ring is not fully declared before {what}: missing {}", missing.join(", ")));
        }
    }
}

fn construction(line: &Line, toks: &[(usize, String)]) -> Result<Value, String> {
    let w = |k: usize| toks.get(k).map(|t| t.1.as_str()).unwrap_or("");
    let c = |k: usize| toks.get(k).map_or(line.text.len() + 1, |t| t.0);
    let ints = |from: usize| -> Result<Vec<i64>, String> {
        toks[from..].iter().map(|(col, t)| t.parse().map_err(|_| line.err(*col, "an integer", t))).collect()
    };
    Ok(match w(0) {
        "staircase" if w(1) == "torus_knot" && toks.len() == 4 => json!({"staircase": {"torus_knot": ints(2)?}}),
        "staircase" if w(1) == "alexander" => json!({"staircase": {"alexander": ints(2)?}}),
        "tensor" | "direct_sum" | "box_tensor" if toks.len() == 3 => json!({ w(0): [w(1), w(2)] }),
        "dual" | "cone" if toks.len() == 2 => json!({ w(0): w(1) }),
        "shift" if toks.len() == 3 => json!({"shift": [w(1), grading(line, c(2), w(2))?]}),
        // The source lives over the larger ring, so it is written inline after `of`.
        "quotient" => match toks.iter().position(|t| t.1 == "of") {
            Some(k) if k >= 2 => {
                let mut args = vec![source(line, &toks[k + 1..])?];
                args.extend(toks[1..k].iter().map(|t| json!(t.1)));
                json!({ "quotient": args })
            }
            _ => return Err(line.err(c(1), "quotient VARIABLE… of CONSTRUCTION", w(1))),
        },
        // `cable P Q of SOURCE`: the source is over F2[U,V], written inline like a quotient's.
        "cable" => match (toks.get(3).map(|t| t.1.as_str()), toks.len() > 4) {
            (Some("of"), true) => {
                let int = |k: usize| w(k).parse::<i64>().map_err(|_| line.err(c(k), "an integer", w(k)));
                json!({"cable": {"companion": source(line, &toks[4..])?, "p": int(1)?, "q": int(2)?}})
            }
            _ => return Err(line.err(c(1), "cable P Q of CONSTRUCTION", w(1))),
        },
        _ => return Err(line.err(c(0), "staircase torus_knot P Q | staircase alexander A… | tensor A B | direct_sum A B | dual A | shift A (…) | cone F | quotient V of SOURCE | cable P Q of SOURCE | box_tensor MODULE STRUCTURE", &toks.iter().map(|t| t.1.as_str()).collect::<Vec<_>>().join(" "))),
    })
}

/// What follows `of`: a construction, or one name (a complex of the problem, rebuilt over the
/// larger ring, or a source declared `complex NAME over F2[U,V]`, inlined after reading).
fn source(line: &Line, toks: &[(usize, String)]) -> Result<Value, String> {
    const KEYWORDS: [&str; 10] =
        ["staircase", "tensor", "direct_sum", "dual", "shift", "cone", "quotient", "cable", "box_tensor", "of"];
    match toks {
        [(_, name)] if !KEYWORDS.contains(&name.as_str()) => Ok(json!(name)),
        _ => construction(line, toks),
    }
}

/// The ring declaration lines of the conventions the constructions use: `F2[U,V]` with
/// (gr_U, gr_V); `F2[U]` with (Maslov, Alexander), the V = 0 minus version; F2, the hat version.
pub fn standard_ring(ring: &str) -> Result<&'static str, String> {
    match ring {
        "F2[U,V]" => Ok("ring F2[U,V]\ngradings gr_U gr_V\ndegree U (-2, 0)\ndegree V (0, -2)\ndegree d (-1, -1)"),
        "F2[U]" => Ok("ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)"),
        "F2" => Ok("ring F2\ngradings maslov alexander\ndegree d (-1, 0)"),
        other => Err(format!("ring \"{other}\": expected F2, F2[U] or F2[U,V]")),
    }
}

/// A problem from command-line pieces: the ring's name, complex definitions `NAME = …` and
/// goals, each one line of the text format. Errors name the argument and the column in it.
pub fn from_command_line(ring: &str, complexes: &[String], goals: &[String]) -> Result<Value, Vec<String>> {
    let header = standard_ring(ring).map_err(|e| vec![e])?;
    // (argument as given, its keyword); each becomes one line after the header.
    let pieces: Vec<(&String, &str)> =
        complexes.iter().map(|c| (c, "complex")).chain(goals.iter().map(|g| (g, "goal"))).collect();
    let mut doc = header.to_string();
    for (text, keyword) in &pieces {
        if text.contains(['\n', '#']) {
            return Err(vec![format!("--{keyword} \"{text}\": one line, without '#'")]);
        }
        doc += &format!("\n{keyword} {text}");
    }
    let first = header.lines().count() + 1;
    parse(&doc).map_err(|errs| {
        let at = |e: &String| -> Option<String> {
            let (line, rest) = e.split_once(':')?;
            let (col, msg) = rest.split_once(':')?;
            let (text, keyword) = pieces.get(line.parse::<usize>().ok()?.checked_sub(first)?)?;
            let col = col.parse::<usize>().ok()?.saturating_sub(keyword.len() + 1);
            Some(format!("--{keyword} \"{text}\", column {col}:{msg}"))
        };
        errs.iter().map(|e| at(e).unwrap_or_else(|| e.clone())).collect()
    })
}

/// The text form `op args…` of a construction (the inverse of [`construction`]).
fn construction_text(c: &Value) -> Result<String, String> {
    let (op, arg) = c.as_object().filter(|o| o.len() == 1).and_then(|o| o.iter().next()).ok_or("not a construction")?;
    let numbers = |v: &Value| v.as_array().into_iter().flatten().map(|x| x.to_string()).collect::<Vec<_>>().join(" ");
    let args = match (op.as_str(), arg) {
        ("staircase", a) => match (a.get("torus_knot"), a.get("alexander")) {
            (Some(pq), _) => format!("torus_knot {}", numbers(pq)),
            (_, Some(e)) => format!("alexander {}", numbers(e)),
            _ => return Err("staircase of what?".into()),
        },
        ("shift", a) => {
            format!("{} {}", a[0].as_str().ok_or("the shifted complex is not a name")?, grading_text(&a[1]))
        }
        (_, Value::String(s)) => s.clone(),
        (_, Value::Array(a)) => {
            a.iter().map(|x| x.as_str().ok_or("an argument is not a name")).collect::<Result<Vec<_>, _>>()?.join(" ")
        }
        _ => return Err("unknown construction".into()),
    };
    Ok(format!("{op} {args}"))
}

fn goal(line: &Line, toks: &[(usize, String)]) -> Result<Value, String> {
    let w = |k: usize| toks.get(k).map(|t| t.1.as_str()).unwrap_or("");
    let c = |k: usize| toks.get(k).map_or(line.text.len() + 1, |t| t.0);
    // Options after the fixed arguments: flags and `key value` pairs.
    let options = |from: usize, allowed: &[&str]| -> Result<Map<String, Value>, String> {
        let mut o = Map::new();
        let mut k = from;
        while k < toks.len() {
            match w(k) {
                "surfaces" if allowed.contains(&"surfaces") => {
                    o.insert("surfaces".into(), json!(true));
                    k += 1;
                }
                key @ ("order" | "max_order") if allowed.contains(&key) => {
                    let n: u32 = w(k + 1).parse().map_err(|_| line.err(c(k + 1), "a whole number", w(k + 1)))?;
                    o.insert(key.into(), json!(n));
                    k += 2;
                }
                key @ ("times" | "alexander") if allowed.contains(&key) && !w(k + 1).is_empty() => {
                    o.insert(key.into(), json!(w(k + 1)));
                    k += 2;
                }
                other => return Err(line.err(c(k), &format!("one of: {}", allowed.join(", ")), other)),
            }
        }
        Ok(o)
    };
    let need = |n: usize, shape: &str| if toks.len() < n { Err(line.err(c(toks.len()), shape, "")) } else { Ok(()) };
    let mut body = Map::new();
    match w(1) {
        "torsion_order" => {
            need(5, "\"goal torsion_order F G VARIABLE\"")?;
            body.insert("maps".into(), json!([w(2), w(3)]));
            body.insert("variable".into(), json!(w(4)));
            body.extend(options(5, &["surfaces", "order", "max_order"])?);
        }
        "homotopic" | "distinct" => {
            need(4, "\"goal homotopic F G [times MONOMIAL]\"")?;
            body.insert("maps".into(), json!([w(2), w(3)]));
            body.extend(options(4, &["times"])?);
        }
        "homology" => {
            need(3, "\"goal homology COMPLEX\"")?;
            body.insert("complex".into(), json!(w(2)));
        }
        "tau" => {
            need(3, "\"goal tau COMPLEX\"")?;
            body.insert("complex".into(), json!(w(2)));
            body.extend(options(3, &["alexander"])?);
        }
        "torsion_order_of_complex" => {
            need(4, "\"goal torsion_order_of_complex COMPLEX VARIABLE\"")?;
            body.insert("complex".into(), json!(w(2)));
            body.insert("variable".into(), json!(w(3)));
        }
        "equivalent" => {
            need(6, "\"goal equivalent C D f g\"")?;
            body.insert("complexes".into(), json!([w(2), w(3)]));
            body.insert("maps".into(), json!([w(4), w(5)]));
        }
        "null_homotopic" | "not_null_homotopic" => {
            need(3, "\"goal null_homotopic EXPRESSION\", e.g. \"U^2·(F + G)\"")?;
            // A JSON expression (as older files wrote it) stays readable.
            let e = match serde_json::from_str::<Value>(w(2)) {
                Ok(v) if w(2).starts_with(['{', '[']) => v,
                _ => map_expression(line, c(2), &line.text[c(2) - 1..])?,
            };
            body.insert("map".into(), e);
        }
        other => return Err(line.err(c(1), "torsion_order, homotopic, distinct, homology, equivalent, tau, torsion_order_of_complex, null_homotopic or not_null_homotopic", other)),
    }
    Ok(json!({ w(1): body }))
}

/// The text notation of a map expression, the notation statements are written in:
/// `F`, `id_C`, `F + G` (also `F - G` or `F − G`: over F2 the same map), `F∘G` (ASCII `F @ G`;
/// F after G), `U^2·F` (or `U^2 F`, like a term), parentheses to group: `U·(F + G)`,
/// `(U·F)∘G`. A multiple binds tightest, then composition, then sums. Returns the JSON form
/// of the goal (`{"sum": …}`, `{"compose": [outer, …, inner]}`, `{"times": [m, e]}`, `{"id": C}`).
fn map_expression(line: &Line, col: usize, text: &str) -> Result<Value, String> {
    #[derive(Clone, PartialEq)]
    enum Tok {
        Word(String),
        Open,
        Close,
        Plus,
        After,
        Times,
    }
    // Tokens with their columns (1-based, in the line).
    let mut toks: Vec<(usize, Tok)> = Vec::new();
    let mut chars = text.char_indices().peekable();
    while let Some(&(i, ch)) = chars.peek() {
        let at = col + text[..i].chars().count();
        let single = match ch {
            // `(x)` inside a word spells ⊗ (read below); a '(' that starts a token opens a group.
            '(' => Some(Tok::Open),
            ')' => Some(Tok::Close),
            '+' | '-' | '−' => Some(Tok::Plus),
            '∘' | '@' => Some(Tok::After),
            '·' => Some(Tok::Times),
            c if c.is_whitespace() => {
                chars.next();
                continue;
            }
            _ => None,
        };
        if let Some(t) = single {
            toks.push((at, t));
            chars.next();
            continue;
        }
        // A word: up to blank space or an operator; `(x)` right after a letter is part of it (⊗).
        let mut end = i;
        while end < text.len() {
            let c = text[end..].chars().next().expect("inside the text");
            if text[end..].starts_with(crate::problem::ASCII_TENSOR) && end > i {
                end += crate::problem::ASCII_TENSOR.len();
                continue;
            }
            if c.is_whitespace() || "()+-−∘@·".contains(c) {
                break;
            }
            end += c.len_utf8();
        }
        toks.push((at, Tok::Word(text[i..end].to_string())));
        while chars.peek().is_some_and(|&(k, _)| k < end) {
            chars.next();
        }
    }
    let end_col = col + text.chars().count();
    struct P<'a> {
        toks: Vec<(usize, Tok)>,
        k: usize,
        line: &'a Line<'a>,
        end_col: usize,
    }
    impl P<'_> {
        fn peek(&self) -> Option<&Tok> {
            self.toks.get(self.k).map(|t| &t.1)
        }
        fn fail(&self, expected: &str) -> String {
            let (c, found) = match self.toks.get(self.k) {
                Some((c, Tok::Word(w))) => (*c, w.clone()),
                Some((c, t)) => (
                    *c,
                    match t {
                        Tok::Open => "(",
                        Tok::Close => ")",
                        Tok::Plus => "+",
                        Tok::After => "∘",
                        _ => "·",
                    }
                    .to_string(),
                ),
                None => (self.end_col, String::new()),
            };
            self.line.err(c, expected, &found)
        }
        fn sum(&mut self) -> Result<Value, String> {
            self.chain(Tok::Plus, "sum", Self::composition)
        }
        fn composition(&mut self) -> Result<Value, String> {
            self.chain(Tok::After, "compose", Self::factor)
        }
        /// `part (op part)*`: one part alone, or `{key: [parts]}` (a flat list, as the format has).
        fn chain(&mut self, op: Tok, key: &str, part: fn(&mut Self) -> Result<Value, String>) -> Result<Value, String> {
            let mut parts = vec![part(self)?];
            while self.peek() == Some(&op) {
                self.k += 1;
                parts.push(part(self)?);
            }
            Ok(if parts.len() == 1 { parts.pop().expect("one part") } else { json!({ key: parts }) })
        }
        fn factor(&mut self) -> Result<Value, String> {
            match self.peek().cloned() {
                Some(Tok::Open) => {
                    self.k += 1;
                    let e = self.sum()?;
                    if self.peek() != Some(&Tok::Close) {
                        return Err(self.fail("')' or an operator (+, ∘, ·)"));
                    }
                    self.k += 1;
                    Ok(e)
                }
                Some(Tok::Word(w)) => {
                    self.k += 1;
                    match self.peek() {
                        // A monomial times what follows: `U^2·F`, `U^2 F`, `U (F + G)`.
                        Some(Tok::Times) => {
                            self.k += 1;
                            Ok(json!({"times": [w, self.factor()?]}))
                        }
                        Some(Tok::Word(_) | Tok::Open) => Ok(json!({"times": [w, self.factor()?]})),
                        _ => Ok(match w.strip_prefix("id_") {
                            Some(c) if !c.is_empty() => json!({ "id": c }),
                            _ => json!(w),
                        }),
                    }
                }
                _ => Err(self.fail("a map name, id_COMPLEX, a monomial or '('")),
            }
        }
    }
    let mut p = P { toks, k: 0, line, end_col };
    let e = p.sum()?;
    if p.k < p.toks.len() {
        return Err(p.fail("an operator (+, ∘ or @, ·) or the end of the line"));
    }
    Ok(e)
}

/// The text form of a map expression (the statements' notation), or its JSON when the text
/// would not read back as the same expression (e.g. a sum of one part, which validation refuses
/// with its own message).
fn map_expression_text(e: &Value) -> String {
    let text = <tubecert_format::MapExpr as serde::Deserialize>::deserialize(e)
        .ok()
        .map(|m| tubecert_format::statement::render_expr(&m));
    match text {
        Some(t) if map_expression(&Line { no: 0, text: &t }, 1, &t).as_ref() == Ok(e) => t,
        _ => e.to_string(),
    }
}

fn grading_text(v: &Value) -> String {
    let items: Vec<String> = v.as_array().map(|a| a.iter().map(|x| x.to_string()).collect()).unwrap_or_default();
    format!("({})", items.join(", "))
}

fn terms_text(terms: &Value) -> Vec<String> {
    // Group consecutive terms by source: "x -> U a + b".
    let mut lines: Vec<(String, Vec<String>)> = Vec::new();
    for t in terms.as_array().into_iter().flatten() {
        let (x, c, y) = (t[0].as_str().unwrap_or(""), t[1].as_str().unwrap_or(""), t[2].as_str().unwrap_or(""));
        let term = if c == "1" {
            y.to_string()
        } else if c.contains('+') {
            format!("({c}) {y}")
        } else {
            format!("{c} {y}")
        };
        match lines.last_mut() {
            Some((from, ts)) if from == x => ts.push(term),
            _ => lines.push((x.to_string(), vec![term])),
        }
    }
    lines.into_iter().map(|(x, ts)| format!("  {x} -> {}", ts.join(" + "))).collect()
}

/// Renders the JSON value of a problem file in the text format.
pub fn render(p: &Value) -> Result<String, String> {
    let mut out = Vec::new();
    let ring = &p["ring"];
    let vars: Vec<&str> =
        ring["variables"].as_array().ok_or("ring.variables missing")?.iter().filter_map(|v| v.as_str()).collect();
    out.push(if vars.is_empty() { "ring F2".to_string() } else { format!("ring F2[{}]", vars.join(",")) });
    out.push(format!(
        "gradings {}",
        ring["gradings"]
            .as_array()
            .ok_or("ring.gradings missing")?
            .iter()
            .filter_map(|v| v.as_str())
            .collect::<Vec<_>>()
            .join(" ")
    ));
    for v in &vars {
        out.push(format!("degree {v} {}", grading_text(&ring["variable_degrees"][v])));
    }
    out.push(format!("degree d {}", grading_text(&ring["differential_degree"])));
    // Names in use: sources written out of constructions get new ones.
    let section = |k: &str| p[k].as_object().into_iter().flatten();
    let mut taken: std::collections::BTreeSet<String> =
        ["complexes", "maps", "type_d_structures", "type_a_modules", "type_d_morphisms"]
            .iter()
            .flat_map(|k| section(k).map(|(n, _)| n.clone()))
            .collect();
    let mut seen = Vec::new();
    for (name, c) in section("complexes") {
        out.push(String::new());
        if let Some(gens) = c.get("generators").and_then(|g| g.as_object()) {
            out.push(format!("complex {name}"));
            out.extend(gens.iter().map(|(g, gr)| format!("  {g} {}", grading_text(gr))));
            out.extend(terms_text(&c["differential"]));
            continue;
        }
        let mut sources = Vec::new();
        let text = bordered::Render { taken: &mut taken, out: &mut sources, seen: &mut seen }
            .construction(c, name)
            .map_err(|e| format!("complex {name}: {e}"))?;
        out.extend(sources.into_iter().skip_while(String::is_empty));
        if out.last().is_some_and(|l| !l.is_empty()) {
            out.push(String::new());
        }
        out.push(format!("complex {name} = {text}"));
    }
    let mut r = bordered::Render { taken: &mut taken, out: &mut out, seen: &mut seen };
    for (name, v) in section("type_d_structures") {
        r.structure(name, v).map_err(|e| format!("type D structure {name}: {e}"))?;
    }
    for (name, v) in section("type_a_modules") {
        r.module(name, v).map_err(|e| format!("type A module {name}: {e}"))?;
    }
    for (name, v) in section("type_d_morphisms") {
        r.morphism(name, v);
    }
    for (name, m) in section("maps") {
        out.push(String::new());
        if let Some((op, tm)) = ["tensor_maps", "box_tensor_map"].iter().find_map(|k| Some((k, m.get(*k)?))) {
            out.push(format!("map {name} = {op} {} {}", tm[0].as_str().unwrap_or(""), tm[1].as_str().unwrap_or("")));
            continue;
        }
        out.push(format!(
            "map {name} : {} -> {} degree {}",
            m["from"].as_str().unwrap_or(""),
            m["to"].as_str().unwrap_or(""),
            grading_text(&m["degree"])
        ));
        out.extend(terms_text(&m["terms"]));
    }
    if p["goals"].as_array().is_some_and(|g| !g.is_empty()) {
        out.push(String::new());
    }
    for g in p["goals"].as_array().into_iter().flatten() {
        let (kind, b) = g.as_object().and_then(|o| o.iter().next()).ok_or("goal: expected one key")?;
        let s = |k: &str| b.get(k).and_then(|v| v.as_str()).unwrap_or("").to_string();
        let pair = |k: &str| {
            b[k].as_array()
                .map(|a| a.iter().filter_map(|x| x.as_str()).collect::<Vec<_>>().join(" "))
                .unwrap_or_default()
        };
        let mut line = format!("goal {kind}");
        match kind.as_str() {
            "torsion_order" => {
                line += &format!(" {} {}", pair("maps"), s("variable"));
                if b.get("surfaces") == Some(&json!(true)) {
                    line += " surfaces";
                }
                for k in ["order", "max_order"] {
                    if let Some(n) = b.get(k) {
                        line += &format!(" {k} {n}");
                    }
                }
            }
            "homotopic" | "distinct" => {
                line += &format!(" {}", pair("maps"));
                if b.get("times").is_some() {
                    line += &format!(" times {}", s("times"));
                }
            }
            "homology" => line += &format!(" {}", s("complex")),
            "tau" => {
                line += &format!(" {}", s("complex"));
                if b.get("alexander").is_some() {
                    line += &format!(" alexander {}", s("alexander"));
                }
            }
            "torsion_order_of_complex" => line += &format!(" {} {}", s("complex"), s("variable")),
            "equivalent" => line += &format!(" {} {}", pair("complexes"), pair("maps")),
            _ => line += &format!(" {}", map_expression_text(&b["map"])),
        }
        out.push(line);
    }
    out.push(String::new());
    Ok(out.join("\n"))
}

#[cfg(test)]
mod tests {
    use super::*;
    const EXAMPLE: &str = "ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\n\ncomplex O\n  o (0, 0)\ncomplex K\n  z (0, 0)\n  a (0, 0)\n  b (-3, -2)\n  b -> U^2 a\n\nmap F : O -> K degree (0, 0)\n  o -> z\nmap G : O -> K degree (0, 0)\n  o -> z + a\n\ngoal torsion_order F G U surfaces\ngoal homotopic F G times U^2\ngoal homology K\n";

    #[test]
    fn parses_and_round_trips() {
        let v = parse(EXAMPLE).unwrap();
        assert_eq!(v["complexes"]["K"]["differential"], json!([["b", "U^2", "a"]]));
        assert_eq!(v["maps"]["G"]["terms"], json!([["o", "1", "z"], ["o", "1", "a"]]));
        assert_eq!(v["goals"][0], json!({"torsion_order": {"maps": ["F", "G"], "variable": "U", "surfaces": true}}));
        assert_eq!(parse(&render(&v).unwrap()).unwrap(), v);
        let poly = parse("ring F2[U,V]\ngradings a b\ndegree U (-2, 0)\ndegree V (0, -2)\ndegree d (-1, -1)\ncomplex C\n  x (0, 0)\n  y (0, 0)\n  x -> (U + V) y + U*V y2\n").unwrap();
        assert_eq!(poly["complexes"]["C"]["differential"], json!([["x", "U + V", "y"], ["x", "U*V", "y2"]]));
    }

    #[test]
    fn command_line_pieces_make_a_problem_and_errors_name_the_argument() {
        let v = from_command_line("F2[U]", &["T = staircase torus_knot 2 3".into()], &["tau T".into()]).unwrap();
        assert_eq!(v["complexes"]["T"], json!({"staircase": {"torus_knot": [2, 3]}}));
        assert_eq!(v["ring"]["variable_degrees"]["U"], json!([-2, -1]));
        assert_eq!(v["goals"][0], json!({"tau": {"complex": "T"}}));
        let e = from_command_line("F2[U]", &["T = staircase torus_knot 2 x".into()], &[]).unwrap_err();
        assert_eq!(e[0], "--complex \"T = staircase torus_knot 2 x\", column 28: expected an integer, found \"x\"");
        assert!(from_command_line("Z[U]", &[], &[]).unwrap_err()[0].contains("F2, F2[U] or F2[U,V]"));
    }

    #[test]
    fn cables_round_trip_and_build() {
        let text = "ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\ncomplex K = cable 1 5 of staircase torus_knot 2 3\ngoal tau K\n";
        let v = parse(text).unwrap();
        assert_eq!(
            v["complexes"]["K"],
            json!({"cable": {"companion": {"staircase": {"torus_knot": [2, 3]}}, "p": 1, "q": 5}})
        );
        assert!(render(&v).unwrap().contains("complex K = cable 1 5 of staircase torus_knot 2 3"));
        assert!(parse("ring F2[U]\ncomplex K = cable 1 5 staircase torus_knot 2 3\n").unwrap_err()[0]
            .contains("cable P Q of"));
    }

    #[test]
    fn quotients_of_inline_staircases_round_trip_and_build() {
        let text = "ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\ncomplex Q = quotient V of staircase torus_knot 3 4\ngoal tau Q\n";
        let v = parse(text).unwrap();
        assert_eq!(v["complexes"]["Q"], json!({"quotient": [{"staircase": {"torus_knot": [3, 4]}}, "V"]}));
        assert_eq!(parse(&render(&v).unwrap()).unwrap(), v);
        // Resolved to the explicit minus complex of T(3,4): five generators (a staircase of
        // three steps for Δ = t^3 − t^2 + 1 − t^-2 + t^-3).
        let p = crate::problem::parse_problem(text.as_bytes(), "q.txt").unwrap();
        assert_eq!(p.complexes["Q"].generators.len(), 5);
        let e = parse("ring F2[U]\ncomplex Q = quotient V staircase torus_knot 3 4\n").unwrap_err();
        assert!(e[0].contains("quotient VARIABLE… of CONSTRUCTION"), "{e:?}");
        // A source written out in full is written as a block of its own, over F2[U,V].
        let mut explicit = v.clone();
        explicit["complexes"]["Q"] = json!({"quotient": [{"generators": {"x": [0, 0]}, "differential": []}, "V"]});
        let text = render(&explicit).unwrap();
        assert!(
            text.contains("complex Q.source over F2[U,V]\n  x (0, 0)\n\ncomplex Q = quotient V of Q.source"),
            "{text}"
        );
        assert_eq!(parse(&text).unwrap(), explicit);
    }

    fn goal_map(line: &str) -> Result<Value, Vec<String>> {
        let head = "ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\n";
        parse(&format!("{head}goal {line}\n"))
            .map(|v| v["goals"][0].as_object().unwrap().values().next().unwrap()["map"].clone())
    }

    #[test]
    fn map_expressions_have_a_text_notation() {
        assert_eq!(goal_map("null_homotopic F").unwrap(), json!("F"));
        assert_eq!(goal_map("null_homotopic id_K").unwrap(), json!({"id": "K"}));
        assert_eq!(goal_map("null_homotopic F + G").unwrap(), json!({"sum": ["F", "G"]}));
        // Over F2 a difference is a sum.
        assert_eq!(goal_map("null_homotopic F − G - H").unwrap(), json!({"sum": ["F", "G", "H"]}));
        assert_eq!(goal_map("not_null_homotopic F∘G").unwrap(), json!({"compose": ["F", "G"]}));
        assert_eq!(goal_map("not_null_homotopic F @ G @ id_K").unwrap(), json!({"compose": ["F", "G", {"id": "K"}]}));
        let scaled = json!({"times": ["U^2", {"sum": ["F", "G"]}]});
        assert_eq!(goal_map("null_homotopic U^2·(F + G)").unwrap(), scaled);
        assert_eq!(goal_map("null_homotopic U^2 (F + G)").unwrap(), scaled);
        // A multiple binds tightest, then composition, then sums.
        assert_eq!(
            goal_map("null_homotopic U F∘G + id_K").unwrap(),
            json!({"sum": [{"compose": [{"times": ["U", "F"]}, "G"]}, {"id": "K"}]})
        );
        assert_eq!(goal_map("null_homotopic U·V·F").unwrap(), json!({"times": ["U", {"times": ["V", "F"]}]}));
        assert_eq!(goal_map("null_homotopic U*V F").unwrap(), json!({"times": ["U*V", "F"]}));
        // `(x)` inside a name spells ⊗ as everywhere in the text format.
        assert_eq!(goal_map("null_homotopic f(x)g + h").unwrap(), json!({"sum": ["f(x)g", "h"]}));
        // JSON, as older files wrote it, is still read.
        assert_eq!(goal_map(r#"null_homotopic {"sum": ["F", "G"]}"#).unwrap(), json!({"sum": ["F", "G"]}));
        // Errors name the line and the column.
        assert_eq!(goal_map("null_homotopic (F + G").unwrap_err()[0], "5:21: expected a closing ')', found \"(F + G\"");
        assert_eq!(
            goal_map("null_homotopic ((F + G)∘H").unwrap_err()[0],
            "5:31: expected ')' or an operator (+, ∘, ·), found end of line"
        );
        assert_eq!(
            goal_map("null_homotopic F + + G").unwrap_err()[0],
            "5:25: expected a map name, id_COMPLEX, a monomial or '(', found \"+\""
        );
        assert_eq!(
            goal_map("null_homotopic F G)").unwrap_err()[0],
            "5:24: expected an operator (+, ∘ or @, ·) or the end of the line, found \")\""
        );
        assert!(goal_map("null_homotopic").unwrap_err()[0].contains("goal null_homotopic EXPRESSION"));
    }

    #[test]
    fn map_expressions_print_and_read_back() {
        let cases = [
            json!("F"),
            json!({"id": "K"}),
            json!({"sum": ["F", "G"]}),
            json!({"sum": ["F", {"sum": ["G", "H"]}]}),
            json!({"compose": ["F", "G", "H"]}),
            json!({"compose": [{"compose": ["F", "G"]}, "H"]}),
            json!({"compose": [{"times": ["U", "F"]}, "G"]}),
            json!({"times": ["U^2", {"compose": ["F", "G"]}]}),
            json!({"times": ["U^2*V", {"sum": ["F", {"id": "K"}]}]}),
            json!({"times": ["U", {"times": ["V", "F"]}]}),
            json!({"compose": [{"sum": ["F", "G"]}, {"id": "K"}, {"times": ["U", {"sum": ["x⊗y", "G"]}]}]}),
        ];
        for e in cases {
            let text = map_expression_text(&e);
            assert!(!text.starts_with(['{', '"']), "{e} printed as JSON: {text}");
            assert_eq!(goal_map(&format!("null_homotopic {text}")).unwrap(), e, "{text}");
        }
        assert_eq!(map_expression_text(&json!({"times": ["U^2", {"sum": ["F", "G"]}]})), "U^2·(F + G)");
        // What the text cannot say exactly stays JSON, so the file still reads back the same.
        assert_eq!(map_expression_text(&json!({"sum": ["F"]})), r#"{"sum":["F"]}"#);
        // A whole problem round-trips with its expression goals in text.
        let v =
            parse(&format!("{EXAMPLE}goal null_homotopic U^2·(F + G)\ngoal not_null_homotopic (U·F)∘id_O\n")).unwrap();
        let text = render(&v).unwrap();
        assert!(text.contains("goal null_homotopic U^2·(F + G)\ngoal not_null_homotopic (U·F)∘id_O"), "{text}");
        assert_eq!(parse(&text).unwrap(), v);
    }

    proptest::proptest! {
        #[test]
        fn random_expressions_round_trip(e in expression()) {
            let text = map_expression_text(&e);
            proptest::prop_assert!(!text.starts_with('{'), "{} printed as JSON", e);
            proptest::prop_assert_eq!(goal_map(&format!("null_homotopic {text}")).unwrap(), e);
        }
    }

    fn expression() -> impl proptest::strategy::Strategy<Value = Value> {
        use proptest::prelude::*;
        let leaf = prop_oneof![
            prop::sample::select(vec!["F", "G", "h_1", "x⊗y", "f'"]).prop_map(|n| json!(n)),
            prop::sample::select(vec!["K", "C.x"]).prop_map(|c| json!({ "id": c })),
        ];
        leaf.prop_recursive(4, 24, 3, |inner| {
            prop_oneof![
                prop::collection::vec(inner.clone(), 2..4).prop_map(|v| json!({ "sum": v })),
                prop::collection::vec(inner.clone(), 2..4).prop_map(|v| json!({ "compose": v })),
                (prop::sample::select(vec!["U", "U^2", "V", "U*V^3"]), inner)
                    .prop_map(|(m, e)| json!({"times": [m, e]})),
            ]
        })
    }

    #[test]
    fn errors_say_where_and_what() {
        let e = parse("ring F2[U]\ncomplex K\n  z (0, x)\n  b => a\ngoal homotopy F G\n").unwrap_err();
        assert!(e[0].starts_with("3:5: expected integers"), "{e:?}");
        assert!(e[1].starts_with("4:3: expected"), "{e:?}");
        assert!(e[2].starts_with("5:6: expected torsion_order"), "{e:?}");
    }
}
