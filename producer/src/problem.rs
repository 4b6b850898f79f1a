//! Problem files: the ring, complexes and maps (same shapes as in a certificate) and the goals
//! to prove.

use serde::{Deserialize, Serialize};
use tubecert_format::{ComplexSpec, MapExpr, MapSpec, Ring, UniqueMap};

pub const PROBLEM_FORMAT: &str = "tubecert-problem";

#[derive(Clone, Debug, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Problem {
    pub format: String,
    pub version: u32,
    pub ring: Ring,
    pub complexes: UniqueMap<ComplexSpec>,
    #[serde(default)]
    pub maps: UniqueMap<MapSpec>,
    #[serde(default)]
    pub goals: Vec<Goal>,
    /// Bordered objects built from the problem (written as their own sections, never typed here).
    #[serde(skip)]
    pub bordered: Option<tubecert_format::bordered::Bordered>,
    /// The claims that come with the bordered objects (relations, complements, box tensors).
    #[serde(skip)]
    pub bordered_claims: Vec<tubecert_format::Claim>,
}

fn default_bound() -> u32 {
    64
}

/// What to prove. Each goal is stated positively; when it is false the producer proves the
/// opposite and says so (exit 3).
#[derive(Clone, Debug, Serialize, Deserialize)]
#[serde(rename_all = "snake_case", deny_unknown_fields)]
pub enum Goal {
    /// ord_v(F − G): the least k with v^k·(F + G) ≃ 0.
    TorsionOrder {
        maps: [String; 2],
        variable: String,
        #[serde(default)]
        surfaces: bool,
        /// Expected order; a different answer makes the goal false.
        #[serde(default, skip_serializing_if = "Option::is_none")]
        order: Option<u32>,
        /// Largest k tried before concluding "not v-torsion up to this bound".
        #[serde(default = "default_bound")]
        max_order: u32,
    },
    /// times·(F + G) ≃ 0.
    Homotopic {
        maps: [String; 2],
        #[serde(default, skip_serializing_if = "Option::is_none")]
        times: Option<String>,
    },
    /// times·(F + G) is not null-homotopic.
    Distinct {
        maps: [String; 2],
        #[serde(default, skip_serializing_if = "Option::is_none")]
        times: Option<String>,
    },
    /// Any map expression ≃ 0.
    NullHomotopic { map: MapExpr },
    /// Any map expression not null-homotopic.
    NotNullHomotopic { map: MapExpr },
    /// H_*(C) over F2 or `F2[U]`.
    Homology { complex: String },
    /// f: C → D and g: D → C are inverse homotopy equivalences.
    Equivalent { complexes: [String; 2], maps: [String; 2] },
    /// The largest k with R/(v^k) a summand of H_*(C).
    TorsionOrderOfComplex { complex: String, variable: String },
    /// τ(C) = −A(free generator) in the (Maslov, Alexander) convention.
    Tau {
        complex: String,
        #[serde(default = "default_alexander")]
        alexander: String,
    },
}

fn default_alexander() -> String {
    "alexander".into()
}

impl Goal {
    /// The expression v·(F + G) (or F + G) that homotopic / distinct goals speak of.
    pub fn pair_expr(maps: &[String; 2], times: &Option<String>) -> MapExpr {
        let sum = MapExpr::Sum(vec![MapExpr::Named(maps[0].clone()), MapExpr::Named(maps[1].clone())]);
        match times {
            Some(m) => MapExpr::Times(m.clone(), Box::new(sum)),
            None => sum,
        }
    }
}

/// A problem as written: complexes and maps may be constructions ([`crate::construct`]).
#[derive(Clone, Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WrittenProblem {
    pub format: String,
    pub version: u32,
    pub ring: Ring,
    pub complexes: UniqueMap<serde_json::Value>,
    #[serde(default)]
    pub maps: UniqueMap<serde_json::Value>,
    #[serde(default)]
    pub goals: Vec<Goal>,
    #[serde(default)]
    pub type_d_structures: UniqueMap<serde_json::Value>,
    #[serde(default)]
    pub type_a_modules: UniqueMap<serde_json::Value>,
    #[serde(default)]
    pub type_d_morphisms: UniqueMap<serde_json::Value>,
    /// Written in the text format: messages then speak its notation.
    #[serde(skip)]
    pub text: bool,
}

/// Reads a problem file, JSON or the text format ([`crate::text_format`]), and resolves its
/// constructions into explicit complexes and maps. Errors are prefixed with `name`.
pub fn parse_problem(bytes: &[u8], name: &str) -> Result<Problem, Vec<String>> {
    let prefix = |es: Vec<String>| es.into_iter().map(|e| format!("{name}:{e}")).collect::<Vec<_>>();
    let text = std::str::from_utf8(bytes).map_err(|e| prefix(vec![format!(" not UTF-8 text: {e}")]))?;
    let json = is_json(text);
    let value = if json {
        // The common large case, a problem written out in full, is read typed in one pass,
        // with the repeated-key walk beside it on the other core. Anything else (constructions,
        // errors) goes on through the written form, which resolves constructions and gives the
        // precise messages.
        let (walk, typed) = std::thread::scope(|s| {
            let walk = s.spawn(|| refuse_repeated_keys(text));
            (walk.join().unwrap_or_else(|_| Err("reading failed".into())), serde_json::from_str::<Problem>(text))
        });
        walk.map_err(|e| prefix(vec![e]))?;
        match typed {
            Ok(mut p) if p.format == PROBLEM_FORMAT && p.version == 1 && !text.contains(ASCII_TENSOR) => {
                crate::notation::rewrite(&mut p);
                return Ok(p);
            }
            _ => serde_json::from_str(text).map_err(|e| prefix(vec![json_error(&e)]))?,
        }
    } else {
        crate::text_format::parse_checked(text).map_err(|es| prefix(capped(es)))?
    };
    let mut w: WrittenProblem =
        serde_json::from_value(value).map_err(|e| vec![format!("{name}: not a problem file: {e}")])?;
    w.text = !json;
    let mut p = from_written(w).map_err(|es| {
        let lines = crate::text_format::SourceLines::of(bytes);
        capped(es).iter().map(|e| lines.locate(name, e)).collect::<Vec<_>>()
    })?;
    crate::notation::rewrite(&mut p);
    Ok(p)
}

/// The first errors only (locating each one reads the whole file's table of places).
fn capped(mut es: Vec<String>) -> Vec<String> {
    if es.len() > tubecert_format::limits::MAX_REPORTED_ERRORS {
        es.truncate(tubecert_format::limits::MAX_REPORTED_ERRORS);
        es.push("… further errors not shown".into());
    }
    es
}

/// A problem file in JSON rather than the text format.
pub fn is_json(text: &str) -> bool {
    text.trim_start().starts_with('{')
}

/// "LINE:COL: message" for a JSON error.
fn json_error(e: &serde_json::Error) -> String {
    let text = e.to_string();
    let suffix = format!(" at line {} column {}", e.line(), e.column());
    format!("{}:{}: {}", e.line(), e.column(), text.strip_suffix(&suffix).unwrap_or(&text))
}

/// A JSON object keeps only the last of repeated keys: refuse them, so that a generator declared
/// twice is an error rather than silently dropped. `null` is refused too: the format has none,
/// and reading it as an absent field would make two different files mean the same.
pub fn refuse_repeated_keys(json: &str) -> Result<(), String> {
    serde_json::from_str::<NoRepeatedKeys>(json).map(|_| ()).map_err(|e| json_error(&e))
}

/// Walks a JSON document and fails on an object with a repeated key or on a `null`.
struct NoRepeatedKeys;

impl<'de> Deserialize<'de> for NoRepeatedKeys {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl<'de> serde::de::Visitor<'de> for V {
            type Value = NoRepeatedKeys;
            fn expecting(&self, f: &mut std::fmt::Formatter) -> std::fmt::Result {
                f.write_str("JSON")
            }
            fn visit_map<A: serde::de::MapAccess<'de>>(self, mut a: A) -> Result<NoRepeatedKeys, A::Error> {
                let mut seen = std::collections::HashSet::new();
                while let Some(k) = a.next_key::<String>()? {
                    a.next_value::<NoRepeatedKeys>()?;
                    if !seen.insert(k.clone()) {
                        return Err(serde::de::Error::custom(format!("\"{k}\" appears twice in one object")));
                    }
                }
                Ok(NoRepeatedKeys)
            }
            fn visit_seq<A: serde::de::SeqAccess<'de>>(self, mut a: A) -> Result<NoRepeatedKeys, A::Error> {
                while a.next_element::<NoRepeatedKeys>()?.is_some() {}
                Ok(NoRepeatedKeys)
            }
            fn visit_bool<E>(self, _: bool) -> Result<NoRepeatedKeys, E> {
                Ok(NoRepeatedKeys)
            }
            fn visit_i64<E>(self, _: i64) -> Result<NoRepeatedKeys, E> {
                Ok(NoRepeatedKeys)
            }
            fn visit_u64<E>(self, _: u64) -> Result<NoRepeatedKeys, E> {
                Ok(NoRepeatedKeys)
            }
            fn visit_f64<E>(self, _: f64) -> Result<NoRepeatedKeys, E> {
                Ok(NoRepeatedKeys)
            }
            fn visit_str<E>(self, _: &str) -> Result<NoRepeatedKeys, E> {
                Ok(NoRepeatedKeys)
            }
            fn visit_unit<E: serde::de::Error>(self) -> Result<NoRepeatedKeys, E> {
                // The format has no null (see the JSON Schema): leave an optional field out.
                Err(E::custom("null is not a value of the format (leave an optional field out)"))
            }
        }
        d.deserialize_any(V)
    }
}

/// The JSON value of a problem file in either format (errors: "LINE:COL: …" or " …").
pub fn written_value(bytes: &[u8]) -> Result<serde_json::Value, Vec<String>> {
    let text = std::str::from_utf8(bytes).map_err(|e| vec![format!(" not UTF-8 text: {e}")])?;
    if is_json(text) {
        refuse_repeated_keys(text).map_err(|e| vec![e])?;
        serde_json::from_str(text).map_err(|e| vec![json_error(&e)])
    } else {
        crate::text_format::parse(text)
    }
}

/// The ASCII spelling of `⊗` in names: `x0(x)z` is read as `x0⊗z`. (Parentheses are not in the
/// name alphabet, so the spelling cannot clash with a name; certificates hold `⊗`.)
pub const ASCII_TENSOR: &str = "(x)";

/// Every string and key of a problem's objects and goals with `(x)` read as `⊗` (the ring holds
/// none: its names are letters and words).
fn read_ascii_tensor(v: &mut serde_json::Value) -> Result<(), String> {
    use serde_json::Value;
    let spell = |s: &str| s.replace(ASCII_TENSOR, "⊗");
    match v {
        Value::String(s) if s.contains(ASCII_TENSOR) => *s = spell(s),
        Value::Array(items) => items.iter_mut().try_for_each(read_ascii_tensor)?,
        Value::Object(m) => {
            let mut out = serde_json::Map::new();
            for (k, mut x) in std::mem::take(m) {
                read_ascii_tensor(&mut x)?;
                if out.insert(spell(&k), x).is_some() {
                    return Err(format!("\"{k}\" and another name both read as \"{}\"", spell(&k)));
                }
            }
            *m = out;
        }
        _ => {}
    }
    Ok(())
}

pub fn from_written(mut w: WrittenProblem) -> Result<Problem, Vec<String>> {
    let mut objects = serde_json::json!([w.complexes.0, w.maps.0, w.goals]);
    if objects.to_string().contains(ASCII_TENSOR) {
        read_ascii_tensor(&mut objects).map_err(|e| vec![e])?;
        let [c, m, g] = serde_json::from_value::<[serde_json::Value; 3]>(objects).expect("three parts");
        let e = |e: serde_json::Error| vec![format!("{e}")];
        w.complexes = UniqueMap(serde_json::from_value(c).map_err(e)?);
        w.maps = UniqueMap(serde_json::from_value(m).map_err(e)?);
        w.goals = serde_json::from_value(g).map_err(e)?;
    }
    if w.format != PROBLEM_FORMAT || w.version != 1 {
        return Err(vec![format!(
            "format \"{}\" version {} is not \"{PROBLEM_FORMAT}\" version 1",
            w.format, w.version
        )]);
    }
    let sections = [&w.type_d_structures.0, &w.type_a_modules.0, &w.type_d_morphisms.0];
    let (complexes, maps, built) = crate::construct::resolve(&w.ring, &w.complexes, &w.maps, sections, w.text)?;
    let (bordered, mut bordered_claims) = built.finish().map_or((None, Vec::new()), |(b, c)| (Some(b), c));
    if let Ok(ring) = tubecert_format::RingInfo::new(&w.ring) {
        for c in &mut bordered_claims {
            *crate::prove::statement_mut(c) =
                tubecert_format::statement::render(c, &ring, tubecert_format::CERTIFICATE_VERSION);
        }
    }
    Ok(Problem {
        format: w.format,
        version: w.version,
        ring: w.ring,
        complexes: UniqueMap(complexes),
        maps: UniqueMap(maps),
        goals: w.goals,
        bordered,
        bordered_claims,
    })
}

/// JSON for reading: objects and arrays of arrays one entry per line, and an array of plain
/// values (a term `[x, coefficient, y]`, a grading) on one line.
pub fn json_for_reading(v: &serde_json::Value) -> String {
    use serde_json::Value;
    fn write(v: &Value, indent: usize, out: &mut String) {
        let pad = "  ".repeat(indent + 1);
        let flat = |v: &Value| serde_json::to_string(v).expect("values serialize");
        match v {
            Value::Array(a) if a.iter().all(|x| !x.is_array() && !x.is_object()) => {
                out.push_str(&format!("[{}]", a.iter().map(flat).collect::<Vec<_>>().join(", ")))
            }
            Value::Array(a) => {
                out.push_str("[\n");
                for (i, x) in a.iter().enumerate() {
                    out.push_str(&pad);
                    write(x, indent + 1, out);
                    out.push_str(if i + 1 < a.len() { ",\n" } else { "\n" });
                }
                out.push_str(&"  ".repeat(indent));
                out.push(']');
            }
            Value::Object(o) if !o.is_empty() => {
                out.push_str("{\n");
                for (i, (k, x)) in o.iter().enumerate() {
                    out.push_str(&format!("{pad}{}: ", flat(&Value::String(k.clone()))));
                    write(x, indent + 1, out);
                    out.push_str(if i + 1 < o.len() { ",\n" } else { "\n" });
                }
                out.push_str(&"  ".repeat(indent));
                out.push('}');
            }
            other => out.push_str(&flat(other)),
        }
    }
    let mut out = String::new();
    write(v, 0, &mut out);
    out + "\n"
}
