//! Statements say exactly what their claims' fields say, and names cannot imitate them.
//!
//! - A property: random claims over random legal names, rendered by the checker's own wording,
//!   are read back by a parser written here (not in the checker), which tries every way of
//!   reading a statement; exactly one reading must come back, and it must be the claim's fields
//!   (all but `surfaces`, which only selects a reading printed beside the statement).
//! - Each class of illegal name is refused with exit 2 and its code point, by `tubecheck` and
//!   by `tubecert check-input`.
//! - τ over a ring with two candidate Alexander gradings: the statement names the grading.

use proptest::prelude::*;
use serde_json::{json, Value};
use std::path::PathBuf;
use tubecert_format::{
    BasisWitness, Claim, DualWitness, EquivalenceWitness, HomotopyWitness, MapExpr, Ring, RingInfo, TorsionWitness,
    UniqueMap, CERTIFICATE_VERSION,
};
use tubecert_tests::wording::{canonical_monomial, name_ok};

// ---------- the reader: every way a statement can be read ----------

enum P<'a> {
    Lit(&'a str),
    Hole,
}

/// Every assignment of non-empty text to the holes that spells `s`.
fn spell<'s>(s: &'s str, pat: &[P]) -> Vec<Vec<&'s str>> {
    match pat {
        [] if s.is_empty() => vec![vec![]],
        [] => vec![],
        [P::Lit(l), rest @ ..] => s.strip_prefix(l).map_or(vec![], |r| spell(r, rest)),
        [P::Hole, rest @ ..] => {
            let mut out = Vec::new();
            for (end, _) in s.char_indices().skip(1).chain([(s.len(), ' ')]) {
                for mut tail in spell(&s[end..], rest) {
                    tail.insert(0, &s[..end]);
                    out.push(tail);
                }
            }
            out
        }
    }
}

/// Every way to cut `s` at occurrences of `sep` into at least two parts.
fn cuts<'s>(s: &'s str, sep: &str) -> Vec<Vec<&'s str>> {
    let at: Vec<usize> = s.match_indices(sep).map(|m| m.0).collect();
    let mut out = Vec::new();
    for mask in 1u32..(1 << at.len().min(12)) {
        let (mut parts, mut from) = (Vec::new(), 0);
        for (k, &i) in at.iter().enumerate() {
            if mask & (1 << k) != 0 {
                parts.push(&s[from..i]);
                from = i + sep.len();
            }
        }
        parts.push(&s[from..]);
        out.push(parts);
    }
    out
}

fn product(options: Vec<Vec<MapExpr>>) -> Vec<Vec<MapExpr>> {
    options.into_iter().fold(vec![vec![]], |acc, opts| {
        acc.iter().flat_map(|a| opts.iter().map(move |o| [a.clone(), vec![o.clone()]].concat())).collect()
    })
}

fn map_name_ok(n: &str) -> bool {
    name_ok(n) && !n.starts_with("id_")
}

fn composite(e: &MapExpr) -> bool {
    matches!(e, MapExpr::Compose(_) | MapExpr::Times(..))
}

/// Readings of a part that stands inside a composition or after `·`: plain, or bracketed.
fn operand(s: &str, vars: &[String], keep: fn(&MapExpr) -> bool) -> Vec<MapExpr> {
    let mut out: Vec<MapExpr> = exprs(s, vars).into_iter().filter(|e| !keep(e)).collect();
    if let Some(inner) = s.strip_prefix('(').and_then(|x| x.strip_suffix(')')) {
        out.extend(exprs(inner, vars).into_iter().filter(keep));
    }
    out
}

/// Every map expression whose statement form could be `s`.
fn exprs(s: &str, vars: &[String]) -> Vec<MapExpr> {
    let mut out = Vec::new();
    if map_name_ok(s) {
        out.push(MapExpr::Named(s.into()));
    }
    if let Some(c) = s.strip_prefix("id_").filter(|c| name_ok(c)) {
        out.push(MapExpr::Id(c.into()));
    }
    if let Some(inner) = s.strip_prefix('(').and_then(|x| x.strip_suffix(')')) {
        for parts in cuts(inner, " + ") {
            out.extend(product(parts.iter().map(|p| exprs(p, vars)).collect()).into_iter().map(MapExpr::Sum));
        }
    }
    for parts in cuts(s, "∘") {
        let options = parts.iter().map(|p| operand(p, vars, composite)).collect();
        out.extend(product(options).into_iter().map(MapExpr::Compose));
    }
    for (i, _) in s.match_indices('·') {
        if let Some(m) = canonical_monomial(&s[..i], vars) {
            let rest = &s[i + '·'.len_utf8()..];
            let inner = operand(rest, vars, |e| matches!(e, MapExpr::Compose(_)));
            out.extend(inner.into_iter().map(|e| MapExpr::Times(m.clone(), Box::new(e))));
        }
    }
    out
}

fn uint(s: &str) -> Option<u32> {
    s.parse::<u32>().ok().filter(|k| k.to_string() == s)
}

fn int(s: &str) -> Option<i64> {
    s.parse::<i64>().ok().filter(|k| k.to_string() == s)
}

fn tuple(s: &str, n: usize) -> Option<Vec<i64>> {
    let inner = s.strip_prefix('(')?.strip_suffix(')')?;
    let v: Option<Vec<i64>> = inner.split(", ").map(int).collect();
    v.filter(|v| v.len() == n)
}

type Homology = (Vec<Vec<i64>>, Vec<(u32, Vec<i64>)>);

/// Every (free, torsion) the right-hand side of a homology statement could be.
fn homologies(s: &str, ring: &Ring) -> Vec<Homology> {
    let rn = ring_name(&ring.variables);
    let n = ring.gradings.len();
    let v = ring.variables.first().cloned().unwrap_or_default();
    let mut out = Vec::new();
    if s == "0" {
        out.push((vec![], vec![]));
    }
    let mut ways = cuts(s, " ⊕ ");
    ways.push(vec![s]);
    for parts in ways {
        let mut readings: Vec<Homology> = vec![(vec![], vec![])];
        for p in parts {
            let mut next = Vec::new();
            for r in &readings {
                for [g] in spell(p, &[P::Lit(&rn), P::Lit("⟨"), P::Hole, P::Lit("⟩")])
                    .iter()
                    .filter_map(|h| <[&str; 1]>::try_from(h.as_slice()).ok())
                {
                    if let Some(g) = tuple(g, n) {
                        next.push(([r.0.clone(), vec![g]].concat(), r.1.clone()));
                    }
                }
                let pat = [P::Lit(&rn), P::Lit("/("), P::Hole, P::Lit(")⟨"), P::Hole, P::Lit("⟩")];
                for h in spell(p, &pat) {
                    let k = if h[0] == v {
                        Some(1)
                    } else {
                        h[0].strip_prefix(&format!("{v}^")).and_then(uint).filter(|&k| k >= 2)
                    };
                    if let (Some(k), Some(g), false) = (k, tuple(h[1], n), v.is_empty()) {
                        next.push((r.0.clone(), [r.1.clone(), vec![(k, g)]].concat()));
                    }
                }
            }
            readings = next;
        }
        out.extend(readings);
    }
    out
}

fn ring_name(vars: &[String]) -> String {
    if vars.is_empty() {
        "F2".into()
    } else {
        format!("F2[{}]", vars.join(","))
    }
}

fn basis() -> BasisWitness {
    BasisWitness { generators: UniqueMap::default(), basis: vec![], inverse: vec![] }
}

/// Every claim (statement and witness left empty) whose statement over `ring` could be `s`.
fn readings(s: &str, ring: &Ring) -> Vec<Claim> {
    use P::{Hole, Lit};
    let st = String::new;
    let rn = ring_name(&ring.variables);
    // A variable is read as written (the claim may name one the ring lacks: then it fails).
    let is_var = |v: &str| !v.is_empty() && v.chars().all(|c| c.is_ascii_alphabetic());
    let mut out = Vec::new();
    let complex_over = format!(" is a chain complex over {rn} (∂∘∂ = 0, ∂ homogeneous)");
    for h in spell(s, &[Hole, Lit(&complex_over)]) {
        if name_ok(h[0]) {
            out.push(Claim::Complex { complex: h[0].into(), statement: st() });
        }
    }
    for h in spell(s, &[Hole, Lit(" is a homogeneous chain map")]) {
        if map_name_ok(h[0]) {
            out.push(Claim::ChainMap { map: h[0].into(), statement: st() });
        }
    }
    for h in spell(s, &[Hole, Lit(" ≃ 0 (null-homotopic)")]) {
        for map in exprs(h[0], &ring.variables) {
            out.push(Claim::NullHomotopic { map, statement: st(), witness: HomotopyWitness { homotopy: vec![] } });
        }
    }
    for h in spell(s, &[Hole, Lit(" is not null-homotopic")]) {
        for map in exprs(h[0], &ring.variables) {
            out.push(Claim::NotNullHomotopic { map, statement: st(), witness: DualWitness { dual: vec![] } });
        }
    }
    for h in spell(s, &[Hole, Lit(" and "), Hole, Lit(" are mutually inverse homotopy equivalences")]) {
        if map_name_ok(h[0]) && map_name_ok(h[1]) {
            let witness = EquivalenceWitness { source_homotopy: vec![], target_homotopy: vec![] };
            out.push(Claim::HomotopyEquivalence { maps: [h[0].into(), h[1].into()], statement: st(), witness });
        }
    }
    for h in spell(s, &[Lit("H_*("), Hole, Lit(") ≅ "), Hole]) {
        for (free, torsion) in homologies(h[1], ring).into_iter().filter(|_| name_ok(h[0])) {
            out.push(Claim::Homology { complex: h[0].into(), free, torsion, statement: st(), witness: basis() });
        }
    }
    for h in spell(s, &[Lit("ord_"), Hole, Lit("("), Hole, Lit(" − "), Hole, Lit(") = "), Hole]) {
        if let (true, true, true, Some(order)) = (is_var(h[0]), map_name_ok(h[1]), map_name_ok(h[2]), uint(h[3])) {
            let witness = TorsionWitness { homotopy: vec![], dual: None };
            let maps = [h[1].into(), h[2].into()];
            out.push(Claim::TorsionOrder {
                maps,
                variable: h[0].into(),
                order,
                surfaces: false,
                statement: st(),
                witness,
            });
        }
    }
    // Over two variables, Ord is read on the quotient by the variable the claim does not name.
    let two = ring.variables.len() == 2;
    let other = |v: &str| ring.variables.iter().find(|w| *w != v).filter(|_| two).cloned();
    let quotient = [
        Lit("Ord_"),
        Hole,
        Lit("(H_*("),
        Hole,
        Lit("/("),
        Hole,
        Lit("))) = "),
        Hole,
        Lit(" (read on the "),
        Hole,
        Lit(" = 0 quotient)"),
    ];
    for h in spell(s, &quotient) {
        let named = other(h[0]).is_some_and(|o| o == h[2] && o == h[4]);
        if let (true, true, true, Some(order)) = (named, is_var(h[0]), name_ok(h[1]), uint(h[3])) {
            let (complex, variable) = (h[1].into(), h[0].into());
            out.push(Claim::TorsionOrderOfComplex { complex, variable, order, statement: st(), witness: basis() });
        }
    }
    if two && ring.gradings.len() == 2 {
        let (g, v) = (&ring.gradings, &ring.variables[1]);
        let middle = format!(" = ({} − {})/2, read on ", g[0], g[1]);
        let end = format!("/({v}), the {v} = 0 quotient)");
        let pattern =
            [Lit("τ("), Hole, Lit(") = "), Hole, Lit(" (Alexander grading "), Hole, Lit(&middle), Hole, Lit(&end)];
        for h in spell(s, &pattern) {
            if let (true, true, Some(tau)) = (name_ok(h[0]) && h[0] == h[3], name_ok(h[2]), int(h[1])) {
                let (complex, alexander) = (h[0].into(), h[2].into());
                out.push(Claim::Tau { complex, alexander, tau, statement: st(), witness: basis() });
            }
        }
    }
    for h in spell(s, &[Lit("Ord_"), Hole, Lit("(H_*("), Hole, Lit(")) = "), Hole]).into_iter().filter(|_| !two) {
        if let (true, true, Some(order)) = (is_var(h[0]), name_ok(h[1]), uint(h[2])) {
            let (complex, variable) = (h[1].into(), h[0].into());
            out.push(Claim::TorsionOrderOfComplex { complex, variable, order, statement: st(), witness: basis() });
        }
    }
    // A τ statement that names no grading could be about any of the ring's gradings.
    for h in spell(s, &[Lit("τ("), Hole, Lit(") = "), Hole]) {
        for g in ring.gradings.iter().filter(|_| name_ok(h[0])) {
            if let Some(tau) = int(h[1]) {
                out.push(Claim::Tau {
                    complex: h[0].into(),
                    alexander: g.clone(),
                    tau,
                    statement: st(),
                    witness: basis(),
                });
            }
        }
    }
    for h in spell(s, &[Lit("τ("), Hole, Lit(") = "), Hole, Lit(" (Alexander grading "), Hole, Lit(")")]) {
        if let (true, Some(tau), true) = (name_ok(h[0]), int(h[1]), ring.gradings.iter().any(|g| g == h[2])) {
            out.push(Claim::Tau {
                complex: h[0].into(),
                alexander: h[2].into(),
                tau,
                statement: st(),
                witness: basis(),
            });
        }
    }
    out
}

/// The fields a statement must carry: the claim without statement, witness or `surfaces`.
fn fields(c: &Claim) -> Claim {
    let st = String::new;
    match c.clone() {
        Claim::Complex { complex, .. } => Claim::Complex { complex, statement: st() },
        Claim::ChainMap { map, .. } => Claim::ChainMap { map, statement: st() },
        Claim::NullHomotopic { map, .. } => {
            Claim::NullHomotopic { map, statement: st(), witness: HomotopyWitness { homotopy: vec![] } }
        }
        Claim::NotNullHomotopic { map, .. } => {
            Claim::NotNullHomotopic { map, statement: st(), witness: DualWitness { dual: vec![] } }
        }
        Claim::HomotopyEquivalence { maps, .. } => Claim::HomotopyEquivalence {
            maps,
            statement: st(),
            witness: EquivalenceWitness { source_homotopy: vec![], target_homotopy: vec![] },
        },
        Claim::Homology { complex, free, torsion, .. } => {
            Claim::Homology { complex, free, torsion, statement: st(), witness: basis() }
        }
        Claim::TorsionOrder { maps, variable, order, .. } => Claim::TorsionOrder {
            maps,
            variable,
            order,
            surfaces: false,
            statement: st(),
            witness: TorsionWitness { homotopy: vec![], dual: None },
        },
        Claim::TorsionOrderOfComplex { complex, variable, order, .. } => {
            Claim::TorsionOrderOfComplex { complex, variable, order, statement: st(), witness: basis() }
        }
        Claim::Tau { complex, alexander, tau, .. } => {
            Claim::Tau { complex, alexander, tau, statement: st(), witness: basis() }
        }
        // Bordered claims have no witness: every field but the statement is read.
        mut bordered => {
            *tubecert::prove::statement_mut(&mut bordered) = st();
            bordered
        }
    }
}

// ---------- random claims over random legal names ----------

/// An object name (complex, map, grading): the alphabet without ⊗, which only generator names
/// may hold.
fn name() -> impl Strategy<Value = String> {
    "[A-Za-z0-9_.']{1,5}"
}

fn map_name() -> impl Strategy<Value = String> {
    name().prop_filter("id_ is the identity's spelling", |n| !n.starts_with("id_"))
}

fn ring() -> impl Strategy<Value = Ring> {
    let vars = prop::collection::btree_set("[A-Za-z]{1,2}", 0..=2);
    let gradings = prop::collection::btree_set(name(), 1..=4);
    (vars, gradings).prop_map(|(v, g)| {
        let variables: Vec<String> = v.into_iter().collect();
        let gradings: Vec<String> = g.into_iter().collect();
        let deg = |i: usize| (0..gradings.len()).map(|j| if i == j % 2 { -1 } else { -2 }).collect::<Vec<i64>>();
        Ring {
            variable_degrees: UniqueMap(variables.iter().enumerate().map(|(i, v)| (v.clone(), deg(i))).collect()),
            differential_degree: vec![-1; gradings.len()],
            variables,
            gradings,
        }
    })
}

fn monomial(vars: Vec<String>) -> impl Strategy<Value = String> {
    prop::collection::vec(0u32..4, vars.len()).prop_map(move |es| {
        let f: Vec<String> = vars
            .iter()
            .zip(es)
            .filter(|x| x.1 > 0)
            .map(|(v, e)| if e == 1 { v.clone() } else { format!("{v}^{e}") })
            .collect();
        if f.is_empty() {
            "1".into()
        } else {
            f.join("*")
        }
    })
}

fn expr(vars: Vec<String>) -> impl Strategy<Value = MapExpr> {
    let leaf = prop_oneof![map_name().prop_map(MapExpr::Named), name().prop_map(MapExpr::Id)];
    leaf.prop_recursive(3, 12, 3, move |inner| {
        prop_oneof![
            prop::collection::vec(inner.clone(), 2..=3).prop_map(MapExpr::Sum),
            prop::collection::vec(inner.clone(), 2..=3).prop_map(MapExpr::Compose),
            (monomial(vars.clone()), inner).prop_map(|(m, e)| MapExpr::Times(m, Box::new(e))),
        ]
    })
}

fn claim(ring: Ring) -> impl Strategy<Value = Claim> {
    let n = ring.gradings.len();
    let vars = ring.variables.clone();
    let var = if vars.is_empty() { Just("U".to_string()).boxed() } else { prop::sample::select(vars.clone()).boxed() };
    let grading = prop::collection::vec(-9i64..9, n);
    let st = String::new;
    prop_oneof![
        name().prop_map(move |complex| Claim::Complex { complex, statement: st() }),
        map_name().prop_map(move |map| Claim::ChainMap { map, statement: st() }),
        expr(vars.clone()).prop_map(move |map| Claim::NullHomotopic {
            map,
            statement: st(),
            witness: HomotopyWitness { homotopy: vec![] }
        }),
        expr(vars.clone()).prop_map(move |map| Claim::NotNullHomotopic {
            map,
            statement: st(),
            witness: DualWitness { dual: vec![] }
        }),
        (map_name(), map_name()).prop_map(move |(f, g)| Claim::HomotopyEquivalence {
            maps: [f, g],
            statement: st(),
            witness: EquivalenceWitness { source_homotopy: vec![], target_homotopy: vec![] }
        }),
        (
            name(),
            prop::collection::vec(grading.clone(), 0..3),
            prop::collection::vec((1u32..5, grading), if vars.is_empty() { 0..1 } else { 0..3 })
        )
            .prop_map(move |(complex, free, torsion)| Claim::Homology {
                complex,
                free,
                torsion,
                statement: st(),
                witness: basis()
            }),
        (map_name(), map_name(), var.clone(), 0u32..70, any::<bool>()).prop_map(
            move |(f, g, variable, order, surfaces)| Claim::TorsionOrder {
                maps: [f, g],
                variable,
                order,
                surfaces,
                statement: st(),
                witness: TorsionWitness { homotopy: vec![], dual: None }
            }
        ),
        (name(), var, 0u32..70).prop_map(move |(complex, variable, order)| Claim::TorsionOrderOfComplex {
            complex,
            variable,
            order,
            statement: st(),
            witness: basis()
        }),
        (name(), prop::sample::select(ring.gradings.clone()), -50i64..50).prop_map(move |(complex, alexander, tau)| {
            Claim::Tau { complex, alexander, tau, statement: st(), witness: basis() }
        }),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(tubecert_tests::cases(256)))]

    #[test]
    fn every_statement_reads_back_as_exactly_its_fields((ring, claim) in ring().prop_flat_map(|r| (Just(r.clone()), claim(r)))) {
        let info = RingInfo::new(&ring).expect("a legal ring");
        let statement = tubecert_format::statement::render(&claim, &info, CERTIFICATE_VERSION);
        let found = readings(&statement, &ring);
        prop_assert_eq!(found, vec![fields(&claim)], "statement {:?}", statement);
    }
}

#[test]
fn the_reader_sees_the_ambiguities_version_1_had() {
    // Version 1's τ over two gradings and its unbracketed composites read two ways: the reader
    // is able to see an omitted field.
    let ring: Ring = serde_json::from_value(json!({"variables": ["U"], "gradings": ["a", "b"],
        "variable_degrees": {"U": [-1, -1]}, "differential_degree": [-1, 0]}))
    .unwrap();
    let info = RingInfo::new(&ring).unwrap();
    let tau =
        Claim::Tau { complex: "T".into(), alexander: "b".into(), tau: -2, statement: String::new(), witness: basis() };
    assert_eq!(readings(&tubecert_format::statement::render(&tau, &info, 1), &ring).len(), 2);
    assert_eq!(readings(&tubecert_format::statement::render(&tau, &info, 2), &ring), vec![fields(&tau)]);
    let f = |n: &str| MapExpr::Named(n.into());
    let e = MapExpr::Times("U".into(), Box::new(MapExpr::Compose(vec![f("F"), f("G")])));
    let c = Claim::NullHomotopic { map: e, statement: String::new(), witness: HomotopyWitness { homotopy: vec![] } };
    let e2 = MapExpr::Compose(vec![MapExpr::Times("U".into(), Box::new(f("F"))), f("G")]);
    let c2 = Claim::NullHomotopic { map: e2, statement: String::new(), witness: HomotopyWitness { homotopy: vec![] } };
    let render = |c: &Claim, v: u32| tubecert_format::statement::render(c, &info, v);
    assert_eq!(render(&c, 1), render(&c2, 1), "version 1 wrote U·(F∘G) and (U·F)∘G alike");
    assert_eq!(readings(&render(&c, 2), &ring), vec![fields(&c)]);
    assert_eq!(readings(&render(&c2, 2), &ring), vec![fields(&c2)]);
}

// ---------- illegal names: exit 2 with the code point, from both tools ----------

fn exe(name: &str) -> PathBuf {
    let p = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../target/release").join(name);
    assert!(p.exists(), "build the release binaries first (the README's test command does)");
    p
}

fn stored(file: &str) -> Value {
    let p = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../certificates").join(file);
    serde_json::from_slice(&std::fs::read(p).unwrap()).unwrap()
}

/// Renames `old` to `new` in every key and string of `v`, except inside `skip` keys.
fn rename(v: &mut Value, old: &str, new: &str) {
    match v {
        Value::String(s) if s == old => *s = new.into(),
        Value::Array(xs) => xs.iter_mut().for_each(|x| rename(x, old, new)),
        Value::Object(m) => {
            *m = std::mem::take(m)
                .into_iter()
                .map(|(k, mut x)| {
                    rename(&mut x, old, new);
                    (if k == old { new.to_string() } else { k }, x)
                })
                .collect()
        }
        _ => {}
    }
}

/// Runs a tool on a file with the given content; returns (exit code, stdout + stderr).
fn run(tool: &str, args: &[&str], file: &str, content: &[u8]) -> (i32, String) {
    let path = std::env::temp_dir().join(format!("tubecert-names-{}-{file}", std::process::id()));
    std::fs::write(&path, content).unwrap();
    let out = std::process::Command::new(exe(tool)).args(args).arg(&path).output().unwrap();
    let _ = std::fs::remove_file(&path);
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).to_string() + &String::from_utf8_lossy(&out.stderr),
    )
}

/// (class, a name of that class, its first illegal code point)
const ILLEGAL: [(&str, &str, &str); 10] = [
    ("statement syntax", "U^3·F", "U+005E"),
    ("statement syntax", "F∘G", "U+2218"),
    ("statement syntax", "F(G", "U+0028"),
    ("line break", "F\n✓ τ(K) = 9", "U+000A"),
    ("zero-width joiner", "F\u{200d}", "U+200D"),
    ("other format character", "F\u{2060}", "U+2060"),
    ("other format character", "\u{202e}F", "U+202E"),
    ("whitespace", "F G", "U+0020"),
    ("whitespace", "F\u{a0}", "U+00A0"),
    ("control character", "F\u{7}", "U+0007"),
];

/// Every kind of name in the tower example, with what its certificate and problem call it.
const KINDS: [(&str, &str); 4] = [("map", "F"), ("complex", "K"), ("generator", "b"), ("grading", "alexander")];

#[test]
fn tubecheck_refuses_each_class_of_illegal_name_with_its_code_point() {
    for (kind, old) in KINDS {
        for (class, name, code) in ILLEGAL {
            let mut cert = stored("tower.cert.json");
            rename(&mut cert["body"], old, name);
            let body: tubecert_format::Body = serde_json::from_value(cert["body"].clone()).unwrap();
            cert["sha256"] = json!(tubecert_format::canonical::canonical_sha256(&body).unwrap());
            let (code_found, out) = run("tubecheck", &[], "c.cert.json", &serde_json::to_vec(&cert).unwrap());
            assert_eq!(code_found, 2, "{kind} with {class} {name:?}: {out}");
            assert!(out.contains(code), "{kind} with {class} {name:?}: {out}");
        }
    }
}

#[test]
fn check_input_refuses_each_class_of_illegal_name_with_its_code_point() {
    for (kind, old) in KINDS {
        for (class, name, code) in ILLEGAL {
            let mut problem = stored("tower.problem.json");
            rename(&mut problem, old, name);
            let (code_found, out) =
                run("tubecert", &["check-input"], "p.problem.json", &serde_json::to_vec(&problem).unwrap());
            assert_eq!(code_found, 2, "{kind} with {class} {name:?}: {out}");
            assert!(out.contains(code), "{kind} with {class} {name:?}: {out}");
        }
    }
}

#[test]
fn variables_and_identity_look_alikes_are_refused_too() {
    let mut problem = stored("tower.problem.json");
    rename(&mut problem["ring"], "U", "U\u{200d}");
    let (code, out) = run("tubecert", &["check-input"], "v.problem.json", &serde_json::to_vec(&problem).unwrap());
    assert!(code == 2 && out.contains("U+200D"), "{out}");
    let mut cert = stored("tower.cert.json");
    rename(&mut cert["body"], "F", "id_K");
    let body: tubecert_format::Body = serde_json::from_value(cert["body"].clone()).unwrap();
    cert["sha256"] = json!(tubecert_format::canonical::canonical_sha256(&body).unwrap());
    let (code, out) = run("tubecheck", &[], "i.cert.json", &serde_json::to_vec(&cert).unwrap());
    assert!(code == 2 && out.contains("id_"), "{out}");
}

#[test]
fn a_monomial_with_a_line_break_cannot_print_a_second_line() {
    // "U \n U" would print a line " U·(F + G) ≃ 0" that is not what was proved: it is not a
    // monomial as certificates write them (factors joined by *).
    let mut cert = stored("tower.cert.json");
    let claims = cert["body"]["claims"].as_array_mut().unwrap();
    let c = claims.iter_mut().find(|c| c["kind"] == "null_homotopic").unwrap();
    c["map"]["times"][0] = json!("U \n U");
    c["statement"] = json!("U \n U·(F + G) ≃ 0 (null-homotopic)");
    let body: tubecert_format::Body = serde_json::from_value(cert["body"].clone()).unwrap();
    cert["sha256"] = json!(tubecert_format::canonical::canonical_sha256(&body).unwrap());
    let (code, out) = run("tubecheck", &[], "m.cert.json", &serde_json::to_vec(&cert).unwrap());
    assert!(code == 2 && out.contains("found \"U \\n U\""), "{out}");
}

// ---------- τ names its grading ----------

/// A one-generator complex over `F2[U]` where U lowers both gradings by 1, so either could be
/// read as the Alexander grading: τ is 0 in grading a and −2 in grading b.
fn two_candidates(alexander: &str) -> Value {
    json!({"format": "tubecert-problem", "version": 1,
        "ring": {"variables": ["U"], "gradings": ["a", "b"], "variable_degrees": {"U": [-1, -1]}, "differential_degree": [-1, 0]},
        "complexes": {"T": {"generators": {"x": [0, 2]}, "differential": []}},
        "goals": [{"tau": {"complex": "T", "alexander": alexander}}]})
}

#[test]
fn tau_names_its_grading_when_the_ring_has_another() {
    let (a, b) = (tubecert_tests::prove_value(&two_candidates("a")), tubecert_tests::prove_value(&two_candidates("b")));
    let (sa, sb) = (a.certificate.body.claims[0].statement(), b.certificate.body.claims[0].statement());
    assert_eq!(sa, "τ(T) = 0 (Alexander grading a)");
    assert_eq!(sb, "τ(T) = -2 (Alexander grading b)");
    tubecert_tests::verified_claims(&a);
    tubecert_tests::verified_claims(&b);
    // The version-1 wording "τ(T) = -2" names no grading: over this ring it is refused.
    let mut old = b.certificate.clone();
    old.version = 1;
    *tubecert::prove::statement_mut(&mut old.body.claims[0]) = "τ(T) = -2".into();
    let bytes = serde_json::to_vec(&old).unwrap();
    let report = tubecheck::check_bytes("v1", &bytes).unwrap();
    assert!(!report.ok(), "a version-1 τ statement that names no grading verified over two candidates");
    // Nor may a version-2 statement leave it out.
    let mut short = b.certificate.clone();
    *tubecert::prove::statement_mut(&mut short.body.claims[0]) = "τ(T) = -2".into();
    short.sha256 = tubecert_format::canonical::canonical_sha256(&short.body).unwrap();
    assert!(!tubecheck::check_bytes("v2", &serde_json::to_vec(&short).unwrap()).unwrap().ok());
}

#[test]
fn version_1_tau_certificates_still_verify() {
    let p = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("fixtures/v1/stair-tower-p1.cert.json");
    let bytes = std::fs::read(p).unwrap();
    let report = tubecheck::check_bytes("v1", &bytes).unwrap();
    assert!(report.ok(), "{}", tubecheck::report_text::render(&report));
    assert!(report.claims.iter().any(|c| c.statement == "τ(K) = 1"));
}

#[test]
fn tensor_generators_can_be_written_in_ascii() {
    let problem = |to: &str| {
        json!({"format": "tubecert-problem", "version": 1, "ring": tubecert_tests::minus_ring(),
            "complexes": {"A": {"generators": {"x": [0, 0]}, "differential": []},
                          "B": {"generators": {"y": [0, 0]}, "differential": []},
                          "P": {"generators": {"p": [0, 0]}, "differential": []},
                          "T": {"tensor": ["A", "B"]}},
            "maps": {"f": {"from": "P", "to": "T", "degree": [0, 0], "terms": [["p", "1", to]]}},
            "goals": [{"not_null_homotopic": {"map": "f"}}]})
    };
    let ascii = tubecert_tests::prove_value(&problem("x(x)y"));
    let unicode = tubecert_tests::prove_value(&problem("x⊗y"));
    assert_eq!(ascii.certificate.body.maps, unicode.certificate.body.maps, "x(x)y is read as x⊗y");
    assert!(ascii.certificate.body.complexes["T"].generators.contains_key("x⊗y"));
    tubecert_tests::verified_claims(&ascii);
}

#[test]
fn a_failure_message_cannot_print_a_verdict_of_its_own() {
    // A witness term naming a generator with a line break: the claim fails, and the message
    // quoting the name shows the break as <U+000A> instead of printing a fake "✓" line.
    let mut cert = stored("tower.cert.json");
    let claims = cert["body"]["claims"].as_array_mut().unwrap();
    let c = claims.iter_mut().find(|c| c["kind"] == "not_null_homotopic").unwrap();
    c["witness"]["dual"][0][2] = json!("a\n  ✓ τ(K) = 9");
    let body: tubecert_format::Body = serde_json::from_value(cert["body"].clone()).unwrap();
    cert["sha256"] = json!(tubecert_format::canonical::canonical_sha256(&body).unwrap());
    let (code, out) = run("tubecheck", &[], "w.cert.json", &serde_json::to_vec(&cert).unwrap());
    assert_eq!(code, 1, "{out}");
    assert!(out.contains("<U+000A>") && !out.lines().any(|l| l.trim_start().starts_with("✓ τ")), "{out}");
}

#[test]
fn the_text_format_reads_the_ascii_tensor_and_claims_write_monomials_canonically() {
    let text = "ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\n\
        complex A\n  x (0, 0)\ncomplex B\n  y (0, 0)\ncomplex P\n  p (0, 0)\ncomplex T = tensor A B\n\
        map f : P -> T degree (0, 0)\n  p -> x(x)y\nmap g : P -> T degree (0, 0)\n  p -> x⊗y\n\
        goal homotopic f g times UU\n";
    let p = tubecert::problem::parse_problem(text.as_bytes(), "t.problem.txt").unwrap();
    assert_eq!(p.maps["f"].terms, p.maps["g"].terms, "x(x)y is read as x⊗y in the text format");
    let ctx = tubecert::validate::validate(&p).unwrap();
    let proved = tubecert::prove::prove(p, &ctx, text.as_bytes()).unwrap();
    assert_eq!(proved.certificate.body.claims[0].statement(), "U^2·(f + g) ≃ 0 (null-homotopic)");
}
