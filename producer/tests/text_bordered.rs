//! The text form of bordered objects: every bordered problem of `examples/` and `certificates/`
//! has a text version that reads as the same JSON problem, the text renders back, and bad input
//! is refused with the file, the line, the object and what is wrong.

use serde_json::Value;
use std::path::{Path, PathBuf};
use tubecert::text_format::{parse, render};

mod common;
use common::tubecert;

fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("..")
}

fn read(path: &str) -> String {
    std::fs::read_to_string(root().join(path)).unwrap_or_else(|e| panic!("{path}: {e}"))
}

fn json(path: &str) -> Value {
    serde_json::from_str(&read(path)).unwrap_or_else(|e| panic!("{path}: {e}"))
}

/// A problem uses bordered objects, or an inline source over F2[U,V] (which the text format
/// writes as `complex NAME over F2[U,V]`).
fn bordered(v: &Value) -> bool {
    let text = v.to_string();
    ["type_d_structures", "type_a_modules", "type_d_morphisms", "\"cable\"", "\"box_tensor", "\"quotient\""]
        .iter()
        .any(|k| text.contains(k))
}

/// The text templates of the bordered families, with the JSON template each one stands beside.
/// (template, stem of the stored members before the parameter's value).
const FAMILIES: [(&str, &str); 2] = [("cabled-pair", "cabled-pair-p"), ("cable-by-p", "cable-by-p")];

#[test]
fn text_templates_read_as_the_stored_bordered_problems() {
    for (family, member) in FAMILIES {
        let text = read(&format!("examples/{family}.template.txt"));
        let template = json(&format!("examples/{family}.template.json"));
        for p in 1..=7 {
            let source = tubecert::family::instantiate_text(&text, "p", p).unwrap();
            let from_text = parse(&source).unwrap_or_else(|e| panic!("{family}, p = {p}: {e:?}"));
            let from_json = tubecert::family::instantiate(&template, "p", p).unwrap();
            assert_eq!(from_text, from_json, "{family}, p = {p}: the text template differs from the JSON one");
            let stored = format!("certificates/{member}{p}.problem.json");
            if root().join(&stored).exists() {
                assert_eq!(from_text, json(&stored), "{stored}");
            }
        }
    }
}

/// Every stored problem with bordered objects is a member of a family with a text template, so
/// none of them is JSON-only.
#[test]
fn every_stored_bordered_problem_has_a_text_version() {
    let mut seen = 0;
    for entry in std::fs::read_dir(root().join("certificates")).unwrap() {
        let path = entry.unwrap().path();
        let name = path.file_name().unwrap().to_string_lossy().to_string();
        let Some(stem) = name.strip_suffix(".problem.json") else { continue };
        if !bordered(&json(&format!("certificates/{name}"))) {
            continue;
        }
        seen += 1;
        let member = stem.trim_end_matches(|c: char| c.is_ascii_digit());
        assert!(
            FAMILIES.iter().any(|(_, m)| *m == member) || root().join(format!("examples/{stem}.problem.txt")).exists(),
            "certificates/{name} uses bordered objects but has no text version"
        );
    }
    assert!(seen >= 8, "only {seen} bordered problems found");
}

/// The example with every bordered form reads as its JSON twin, and both prove to the same
/// certificate, byte for byte.
#[test]
fn the_bordered_example_reads_as_its_json_twin_and_proves_the_same() {
    let text = read("examples/bordered.problem.txt");
    let twin = json("examples/bordered.problem.json");
    assert_eq!(parse(&text).unwrap(), twin);
    let out = common::scratch("text-bordered");
    let mut certs = Vec::new();
    for file in ["examples/bordered.problem.txt", "examples/bordered.problem.json"] {
        let cert = out.join(format!("{}.cert.json", certs.len()));
        let (code, stdout, err) =
            tubecert(&["prove", &root().join(file).to_string_lossy(), "-o", &cert.to_string_lossy()]);
        assert_eq!(code, 0, "{file}: {stdout}{err}");
        assert_eq!(stdout.matches('✓').count(), 23, "{stdout}");
        // The same certificate but for the hash of the problem file's bytes it records.
        let mut c: Value = serde_json::from_slice(&std::fs::read(cert).unwrap()).unwrap();
        c["body"]["provenance"]["problem_sha256"] = Value::Null;
        c["sha256"] = Value::Null;
        certs.push(c);
    }
    assert!(certs[0] == certs[1], "the text and the JSON problem prove to different certificates");
    // `convert` writes the twin exactly.
    let (code, converted, err) =
        tubecert(&["convert", &root().join("examples/bordered.problem.txt").to_string_lossy(), "--to", "json"]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(converted, read("examples/bordered.problem.json"));
}

/// JSON → text → JSON is the identity for every problem of `examples/` and `certificates/`,
/// sources written inline included (each becomes a `complex NAME over F2[U,V]` block).
#[test]
fn every_problem_renders_to_text_and_reads_back() {
    let mut files: Vec<String> = Vec::new();
    for folder in ["examples", "certificates"] {
        for entry in std::fs::read_dir(root().join(folder)).unwrap() {
            let name = entry.unwrap().file_name().to_string_lossy().to_string();
            if name.ends_with(".problem.json") {
                files.push(format!("{folder}/{name}"));
            }
        }
    }
    assert!(files.len() > 20);
    for f in files {
        let mut v = json(&f);
        // `"surfaces": false` is the default, which the text format writes by leaving it out.
        for g in v["goals"].as_array_mut().into_iter().flatten() {
            if let Some(o) = g.get_mut("torsion_order").and_then(Value::as_object_mut) {
                if o.get("surfaces") == Some(&Value::Bool(false)) {
                    o.remove("surfaces");
                }
            }
        }
        let text = render(&v).unwrap_or_else(|e| panic!("{f}: {e}"));
        assert!(!text.contains('{'), "{f}: JSON left in the text:\n{text}");
        assert_eq!(parse(&text).unwrap_or_else(|e| panic!("{f}: {e:?}\n{text}")), v, "{f}:\n{text}");
    }
}

#[test]
fn nested_and_written_out_sources_round_trip() {
    let explicit = serde_json::json!({"generators": {"x0": [0, -2], "x1": [-1, -1], "x2": [-2, 0]},
                                      "differential": [["x1", "U", "x0"], ["x1", "V", "x2"]]});
    let problem = serde_json::json!({
        "format": "tubecert-problem", "version": 1,
        "ring": {"variables": ["U"], "gradings": ["maslov", "alexander"],
                 "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]},
        "complexes": {
            "Q": {"quotient": [explicit.clone(), "V"]},
            "S": {"quotient": [{"tensor": [explicit.clone(), {"dual": {"shift": [explicit.clone(), [2, 2]]}}]}, "V"]},
            "L": {"quotient": [{"direct_sum": [{"staircase": {"torus_knot": [2, 3]}}, "T"]}, "V"]},
            "T": {"staircase": {"torus_knot": [2, 5]}},
            "K": {"cable": {"companion": {"tensor": ["T", explicit.clone()]}, "p": 2, "q": 3}}
        },
        "type_d_structures": {"N": {"complement": {"companion": {"dual": "T"}, "framing": -3}}},
        "maps": {}, "goals": []
    });
    let text = render(&problem).unwrap();
    // Written out once, under the name of its first use, however often it is used.
    assert_eq!(text.matches("  x1 -> U x0 + V x2\n").count(), 1, "{text}");
    assert!(text.contains("complex K.companion.2 over F2[U,V]\n  x0 (0, -2)"), "{text}");
    assert!(text.contains("complex Q = quotient V of K.companion.2\n"), "{text}");
    assert!(text.contains("type_d_structure N = complement framing -3 of dual T"), "{text}");
    assert_eq!(parse(&text).unwrap(), problem, "{text}");
    // And the problem builds: every source is validated over F2[U,V].
    let p = tubecert::problem::parse_problem(text.as_bytes(), "sources.txt").unwrap();
    assert_eq!(p.complexes["Q"].generators.len(), 3);
}

#[test]
fn families_of_every_shape_read_and_render() {
    let head = "ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\ntype_a_module M\n  period (3, 0, 2, 2)\n  x iota0 (0, 0, 0, 0)\n  y ι1 (0, 0, 0, 0)\n";
    let ops = |line: &str| -> Value {
        let v = parse(&format!("{head}  {line}\n")).unwrap_or_else(|e| panic!("{line}: {e:?}"));
        v["type_a_modules"]["M"]["operations"].clone()
    };
    let family = |prefix: &[&str], repeat: &[&str], suffix: &[&str], power: [u32; 2], to: &str| serde_json::json!({"from": "x", "prefix": prefix, "repeat": repeat, "suffix": suffix, "power": power, "to": to});
    assert_eq!(
        ops("m(x, rho3, rho23^n, rho2) = U^(n+1) x"),
        serde_json::json!([family(&["rho3"], &["rho23"], &["rho2"], [1, 1], "x")])
    );
    assert_eq!(
        ops("m(x, ρ_3, ρ23^k, ρ2) = U^(k+1)·x"),
        serde_json::json!([family(&["rho3"], &["rho23"], &["rho2"], [1, 1], "x")])
    );
    assert_eq!(
        ops("m(x, rho3, rho23^n, rho2) = U^(n + 1) · x"),
        serde_json::json!([family(&["rho3"], &["rho23"], &["rho2"], [1, 1], "x")])
    );
    // A generator may be named like a subscripted m.
    let v = parse(&format!("{head}  m_1 iota0 (0, 0, 0, 0)\n  m(m_1, rho3, rho2) = U x\n")).unwrap();
    assert_eq!(v["type_a_modules"]["M"]["generators"]["m_1"]["idempotent"], 0);
    assert_eq!(v["type_a_modules"]["M"]["operations"][0]["from"], "m_1");
    assert_eq!(ops("m_3(x, rho3, rho2) = U x"), serde_json::json!([family(&["rho3", "rho2"], &[], &[], [0, 1], "x")]));
    // The empty block marks the JSON form's split of a single operation into prefix and suffix.
    assert_eq!(
        ops("m(x, rho3, ()^n, rho2) = U x"),
        serde_json::json!([family(&["rho3"], &[], &["rho2"], [0, 1], "x")])
    );
    assert_eq!(
        ops("m(x, (rho12, rho12)^n) = U^(2n) x"),
        serde_json::json!([family(&[], &["rho12", "rho12"], &[], [2, 0], "x")])
    );
    assert_eq!(ops("m(x) = y"), serde_json::json!([family(&[], &[], &[], [0, 0], "y")]));
    assert_eq!(
        ops("m(x, rho1, rho23^n) = U^(2n + 1) y + U^n y"),
        serde_json::json!([
            family(&["rho1"], &["rho23"], &[], [2, 1], "y"),
            family(&["rho1"], &["rho23"], &[], [1, 0], "y")
        ])
    );
    // Each renders in the same notation and reads back.
    for line in [
        "m(x, rho3, rho23^n, rho2) = U^(n+1) x",
        "m(x, rho3, rho2) = U x",
        "m(x, rho3, ()^n, rho2) = U x",
        "m(x, (rho12, rho12)^n) = U^(2n) x",
        "m(x) = y",
        "m(x, rho1, rho23^n) = U^(2n+1) y",
        "m(x, rho1, rho23^n) = U^n y",
        "m(x, rho1, rho23^n) = U^3 y",
    ] {
        let v = parse(&format!("{head}  {line}\n")).unwrap();
        let text = render(&v).unwrap();
        assert!(text.contains(&format!("\n  {line}\n")), "{line} rendered as\n{text}");
    }
}

/// `convert` only reads; the checks that need the objects (idempotents, sources over F2[U,V])
/// are made where a problem is read to be proved.
#[test]
fn convert_reads_what_check_input_refuses() {
    let text = "ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\ntype_d_structure N\n  a iota0\n  a -> rho1 a\n";
    let dir = common::scratch("text-bordered-convert");
    let path = dir.join("n.problem.txt");
    std::fs::write(&path, text).unwrap();
    let (code, json, err) = tubecert(&["convert", &path.to_string_lossy(), "--to", "json"]);
    assert_eq!(code, 0, "{err}");
    assert!(json.contains("\"rho1\""), "{json}");
    let (code, _, err) = tubecert(&["check-input", &path.to_string_lossy()]);
    assert_eq!(code, 2);
    assert!(
        err.contains("n.problem.txt:7: type D structure N, δ¹, term 1 [a, rho1, a]: the idempotents do not match"),
        "{err}"
    );
}

/// Writes a text problem, runs `check-input`, expects exit 2 and returns stderr.
fn refused(body: &str) -> String {
    let head = "ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\n";
    let dir = common::scratch("text-bordered-errors");
    let path = dir.join("bad.problem.txt");
    std::fs::write(&path, format!("{head}{body}")).unwrap();
    let (code, out, err) = tubecert(&["check-input", &path.to_string_lossy()]);
    assert_eq!(code, 2, "accepted:\n{body}\n{out}");
    assert!(!err.contains("panicked"), "{err}");
    err
}

#[test]
fn bad_bordered_input_names_the_line_the_object_and_the_fault() {
    let structure = "type_d_structure N\n  a iota0\n  b iota1\n";
    let module = "type_a_module M\n  period (3, 0, 2, 2)\n  x iota0 (0, 0, 0, 0)\n";
    let cases: [(String, &str); 17] = [
        // An unknown Reeb element, in δ¹, in a morphism and in an operation.
        (format!("{structure}  a -> rho13 b\n"), "bad.problem.txt:8:8: type D structure N: \"rho13\" is not an element of the torus algebra"),
        (format!("{structure}type_d_morphism f : N -> N\n  a -> rho4 b\n"), "bad.problem.txt:9:8: type D morphism f: \"rho4\" is not an element"),
        (format!("{module}  m(x, rho3, rho32) = U x\n"), "bad.problem.txt:8:14: type A module M: \"rho32\" is not an element"),
        (format!("{module}  m(x, 1, rho2) = U x\n"), "bad.problem.txt:8:8: type A module M: an input of an operation is a Reeb element, not 1"),
        // A wrong idempotent: of a generator, of a δ¹ term, of a morphism term, of a family.
        (format!("{structure}  c iota2\n"), "bad.problem.txt:8:5: type D structure N, generator \"c\": expected its idempotent iota0 or iota1"),
        (format!("{structure}  a -> rho2 b\n"), "bad.problem.txt:8: type D structure N, δ¹, term 1 [a, rho2, b]: the idempotents do not match: a is in ι0, but rho2 starts in ι1"),
        (format!("{structure}  a -> rho12 b\n"), "bad.problem.txt:8: type D structure N, δ¹, term 1 [a, rho12, b]: the idempotents do not match: rho12 ends in ι0, but b is in ι1"),
        (format!("{structure}type_d_morphism f : N -> N\n  a -> b\n"), "bad.problem.txt:9: type D morphism f, term 1 [a, 1, b]: the idempotents do not match: a is in ι0 and b in ι1"),
        (format!("{module}  m(x, rho3, rho2^n, rho2) = U^(n+1) x\n"), "bad.problem.txt:8: type A module M, operation 1: rho2 does not start in ι0"),
        // A family with a bad parameter.
        (format!("{module}  m(x, rho3, rho23^n, rho2) = U^(k+1) x\n"), "bad.problem.txt:8:31: type A module M: the power \"U^(k+1)\" uses \"k\", but the family's parameter is \"n\""),
        (format!("{module}  m(x, rho3, rho2) = U^n x\n"), "bad.problem.txt:8:22: type A module M: the power \"U^n\" uses \"n\", but the operation has no repeated block"),
        (format!("{module}  m(x, rho3, rho23^2, rho2) = U x\n"), "bad.problem.txt:8:14: type A module M: the repeated block \"rho23^2\" must be raised to one letter"),
        (format!("{module}  m(x, rho3^n, rho23^n, rho2) = U x\n"), "bad.problem.txt:8:16: type A module M: a second repeated block \"rho23^n\""),
        (format!("{module}  m(x, rho3, rho23^n, rho2) = U^(n-1) x\n"), "bad.problem.txt:8:31: type A module M: \"U^(n-1)\" is not a power of U with exponent a·n + b"),
        (format!("{module}  m_4(x, rho3, rho2) = U x\n"), "bad.problem.txt:8:3: type A module M: m_4 takes 3 inputs after the generator, not 2"),
        // A source in the wrong place, and a source that is not a complex.
        ("complex C over F2[U,V]\n  c (0, 0)\ncomplex K = tensor C C\n".into(), "bad.problem.txt:7:1: complex K: \"C\" is a complex over F2[U,V] (a source); it can stand only after \"of\""),
        ("complex C over F2[U,V]\n  c (0, 0)\n  e (-1, -1)\n  e -> U c\ncomplex K = cable 1 0 of C\n".into(), "bad.problem.txt:8: complex C, differential, term 1 [e, U, c]: not homogeneous"),
    ];
    for (body, expected) in &cases {
        let err = refused(body);
        assert!(err.contains(expected), "expected\n  {expected}\nin\n  {err}\nfor\n{body}");
    }
    // Names that are not declared: said by the checker's loading, at the line of the term.
    let err = refused(&format!("{structure}  a -> rho1 q\n"));
    assert!(
        err.contains("bad.problem.txt:8: type D structure N, δ¹, term 1 [a, rho1, q]: generator \"q\" is not declared"),
        "{err}"
    );
    let err = refused(&format!("{structure}type_d_morphism f : N -> N9\n  a -> b\n"));
    assert!(err.contains("bad.problem.txt:8") && err.contains("type D structure \"N9\" is not declared"), "{err}");
    let err = refused("type_d_structure N = complement framing x of staircase torus_knot 2 3\n");
    assert!(err.contains("bad.problem.txt:5:41: expected an integer framing, found \"x\""), "{err}");
    let err = refused("type_a_module P = diagram beta E1 S1 N2 w top\n");
    assert!(err.contains("bad.problem.txt:5:19: expected \"diagram beta CROSSING… w SIDE K\""), "{err}");
    let err = refused(&format!("{module}  z iota1\n"));
    assert!(
        err.contains("bad.problem.txt:8:10: type A module M, generator \"z\": a module generator needs its grading"),
        "{err}"
    );
    let err = refused(&format!("{structure}  a -> rho1 b\n  b -> rho2 a\n"));
    assert!(err.contains("bad.problem.txt:5: type D structure N: (μ ⊗ id)(id ⊗ δ¹)δ¹(a) = rho12⊗a ≠ 0"), "{err}");
}

/// The README's table of text forms: each example is a line of `examples/bordered.problem.txt`,
/// which the twin test above reads and proves.
#[test]
fn every_text_form_in_the_readme_is_in_the_example() {
    let readme = read("README.md");
    let example = read("examples/bordered.problem.txt");
    let section = readme.split("### Bordered objects in the text format").nth(1).unwrap();
    let table = section.split("\n\n").find(|p| p.starts_with("| object | text | JSON |")).unwrap();
    let mut n = 0;
    for row in table.lines().skip(2) {
        let text = row.split(" | ").nth(1).unwrap();
        let first = text.split('`').nth(1).unwrap();
        assert!(example.lines().any(|l| l.trim() == first), "README text form `{first}` is not a line of the example");
        n += 1;
    }
    assert!(n >= 15, "{n} rows");
}

/// A family run from the text template writes the same files, byte for byte, as from the JSON one.
#[test]
fn family_runs_from_text_and_json_templates_write_the_same_files() {
    let out = common::scratch("text-bordered-family");
    for ext in ["txt", "json"] {
        let template = root().join(format!("examples/cabled-pair.template.{ext}"));
        let dir = out.join(ext);
        let (code, stdout, err) =
            tubecert(&["family", &template.to_string_lossy(), "--param", "p=1..2", "--out", &dir.to_string_lossy()]);
        assert_eq!(code, 0, "{stdout}{err}");
    }
    let mut names: Vec<_> = std::fs::read_dir(out.join("json")).unwrap().map(|e| e.unwrap().file_name()).collect();
    names.sort();
    assert_eq!(names.len(), 4);
    for n in names {
        let (a, b) =
            (std::fs::read(out.join("txt").join(&n)).unwrap(), std::fs::read(out.join("json").join(&n)).unwrap());
        assert!(a == b, "{n:?} differs between the text and the JSON template");
    }
}
