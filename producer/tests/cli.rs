//! `tubecert` on the command line: exit codes 0 / 3 / 2 and the messages a user sees.

use std::process::Command;

mod common;
use common::tubecert;

fn dir() -> std::path::PathBuf {
    common::scratch("cli")
}

const EXAMPLE: &str = include_str!("../../examples/tower.problem.json");

fn write(name: &str, text: &str) -> String {
    let p = dir().join(name);
    std::fs::write(&p, text).unwrap();
    p.to_string_lossy().into()
}

/// Writes a problem, validates it, asserts the refusal (exit 2) and returns the messages.
fn refused(name: &str, text: &str) -> String {
    let (code, _, err) = tubecert(&["check-input", &write(name, text)]);
    assert_eq!(code, 2, "{name} was accepted");
    err
}

#[test]
fn the_issue_example_reports_order_two() {
    let p = write("tower.problem.json", EXAMPLE);
    let out_path = dir().join("tower.cert.json");
    let (code, out, err) = tubecert(&["prove", &p, "-o", &out_path.to_string_lossy()]);
    assert_eq!(code, 0, "{out}{err}");
    assert!(out.contains("ord_U(F − G) = 2"));
    assert!(out.contains("stay distinct through 1 stabilization;"), "{out}");
    let report = tubecheck::check_bytes("t", &std::fs::read(out_path).unwrap()).unwrap();
    assert!(report.ok());
}

#[test]
fn a_false_goal_gives_exit_3_and_a_valid_certificate_of_the_opposite() {
    let p = write("false.problem.json", &EXAMPLE.replace("\"times\": \"U^2\"", "\"times\": \"U\""));
    let out_path = dir().join("false.cert.json");
    let (code, out, _) = tubecert(&["prove", &p, "-o", &out_path.to_string_lossy()]);
    assert_eq!(code, 3, "{out}");
    assert!(out.contains("goal 2 is false"));
    let report = tubecheck::check_bytes("t", &std::fs::read(out_path).unwrap()).unwrap();
    assert!(report.ok());
    assert!(report
        .claims
        .iter()
        .any(|c| c.kind == "not_null_homotopic" && c.statement == "U·(F + G) is not null-homotopic"));
}

#[test]
fn bad_inputs_are_reported_all_at_once_with_exit_2() {
    let bad = EXAMPLE
        .replace("[\"b\", \"U^2\", \"a\"]", "[\"b\", \"U^3\", \"a\"], [\"b\", \"U^\", \"z\"], [\"a\", \"1\", \"zz\"]")
        .replace(
            "\"to\": \"K\", \"degree\": [0, 0], \"terms\": [[\"o\", \"1\", \"z\"], [\"o\"",
            "\"to\": \"KK\", \"degree\": [0, 0], \"terms\": [[\"o\", \"1\", \"z\"], [\"o\"",
        )
        .replace("\"maps\": [\"F\", \"G\"], \"variable\"", "\"maps\": [\"F\", \"H\"], \"variable\"");
    let p = write("bad.problem.json", &bad);
    let (code, out, err) = tubecert(&["check-input", &p]);
    assert_eq!(code, 2, "{out}");
    assert!(err.contains("bad.problem.json"), "the file is named: {err}");
    assert!(err.contains("expected an exponent after '^'"), "{err}");
    assert!(err.contains("\"zz\" is not in complex K (did you mean \"z\"?)"), "{err}");
    assert!(err.contains("complex \"KK\" is not declared (did you mean \"K\"?)"), "{err}");
    assert!(err.contains("not homogeneous: U^3 · a has degree (-6, -3), expected (-4, -2)"), "{err}");
    assert!(err.contains("map \"H\" is not declared"), "{err}");
    assert_eq!(tubecert(&["prove", &p]).0, 2);
}

#[test]
fn dd_and_chain_map_failures_show_the_generator() {
    let bad = EXAMPLE
        .replace("\"b\": [-3, -2]}", "\"b\": [-3, -2], \"c\": [-2, -2]}")
        .replace("[\"b\", \"U^2\", \"a\"]", "[\"b\", \"U^2\", \"a\"], [\"c\", \"1\", \"b\"]");
    let err = refused("dd.problem.json", &bad);
    assert!(err.contains("∂∂(c) = U^2·a ≠ 0"), "{err}");
    let bad = EXAMPLE
        .replace("[[\"o\", \"1\", \"z\"]]}", "[[\"o\", \"1\", \"z\"], [\"o\", \"1\", \"b\"]]}")
        .replace("\"b\": [-3, -2]", "\"b\": [0, 0]");
    let bad = bad.replace("[\"b\", \"U^2\", \"a\"]", "[\"b\", \"1\", \"a\"]").replace("\"b\": [0, 0]", "\"b\": [1, 0]");
    let err = refused("cm.problem.json", &bad);
    assert!(err.contains("not homogeneous") || err.contains("not a chain map"), "{err}");
}

#[test]
fn refuses_rings_with_infinite_graded_pieces() {
    let bad = EXAMPLE.replace("\"U\": [-2, -1]", "\"U\": [0, 0]");
    let err = refused("ring.problem.json", &bad);
    assert!(err.contains("infinite-dimensional"), "{err}");
}

#[test]
fn demo_writes_what_the_checker_accepts() {
    let out = dir().join("demo");
    let (code, text, err) = tubecert(&["demo", "--out", &out.to_string_lossy()]);
    assert_eq!(code, 0, "{err}");
    assert!(text.contains("tubecheck"));
    for f in std::fs::read_dir(&out).unwrap() {
        let p = f.unwrap().path();
        if p.to_string_lossy().ends_with(".cert.json") {
            assert!(tubecheck::check_bytes("d", &std::fs::read(&p).unwrap()).unwrap().ok());
        }
    }
}

#[test]
fn bench_runs_small_and_asserts_its_answer() {
    let (code, out, err) = tubecert(&["bench", "--generators", "3000", "--source-generators", "500", "--seed", "5"]);
    assert_eq!(code, 0, "{err}");
    let lines: Vec<&str> = out.lines().collect();
    assert!(lines[0].starts_with("source_gens\tgenerators\tarrows\tparse"));
    let row: Vec<&str> = lines[1].split('\t').collect();
    assert_eq!(row.len(), lines[0].split('\t').count());
    assert!(row[1].parse::<usize>().unwrap() >= 2999);
}

#[test]
fn emit_reduction_adds_a_verified_equivalence() {
    let p = format!("{}/../certificates/disk-pair-p3.problem.json", env!("CARGO_MANIFEST_DIR"));
    let out_path = dir().join("reduced.cert.json");
    let (code, out, err) = tubecert(&["prove", &p, "-o", &out_path.to_string_lossy(), "--emit-reduction"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("pi_K and iota_K are mutually inverse homotopy equivalences"), "{out}");
    let report = tubecheck::check_bytes("t", &std::fs::read(out_path).unwrap()).unwrap();
    assert!(report.ok());
    assert!(report.claims.iter().any(|c| c.kind == "homotopy_equivalence" && c.outcome.is_ok()));
}

#[test]
fn text_format_converts_both_ways_and_proves() {
    let json_path = write("conv.problem.json", EXAMPLE);
    let (code, text, err) = tubecert(&["convert", &json_path, "--to", "text"]);
    assert_eq!(code, 0, "{err}");
    assert!(
        text.contains("complex K\n")
            && text.contains("  b -> U^2 a")
            && text.contains("goal torsion_order F G U surfaces"),
        "{text}"
    );
    let text_path = write("conv.problem.txt", &text);
    let (code, back, _) = tubecert(&["convert", &text_path, "--to", "json"]);
    assert_eq!(code, 0);
    let (a, b): (serde_json::Value, serde_json::Value) =
        (serde_json::from_str(EXAMPLE).unwrap(), serde_json::from_str(&back).unwrap());
    assert_eq!(a, b, "JSON → text → JSON is the identity");
    let (code, out, _) = tubecert(&["prove", &text_path, "-o", &dir().join("conv.cert.json").to_string_lossy()]);
    assert_eq!(code, 0);
    assert!(out.contains("ord_U(F − G) = 2"));
}

#[test]
fn text_format_errors_name_file_line_and_column() {
    const RING: &str = "ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\n";
    let err = refused("bad.problem.txt", &format!("{RING}complex K\n  a (0, 0)\n  b (1; 0)\ngoal homotopy F G\n"));
    assert!(err.contains("bad.problem.txt:7:5: expected integers separated by commas, found \"(1; 0)\""), "{err}");
    assert!(err.contains("bad.problem.txt:8:6: expected torsion_order"), "{err}");
    // A malformed tuple in the ring's declarations is one error, at its column.
    let err = refused("ring.problem.txt", &RING.replace("degree U (-2, -1)", "degree U (-2 -1)"));
    assert_eq!(err.lines().count(), 1, "{err}");
    assert!(err
        .trim_end()
        .ends_with("ring.problem.txt:3:10: expected integers separated by commas, found \"(-2 -1)\""));
    // A source over F2[U,V] used where a complex over the ring is needed: the message says what
    // the name is and how to use it.
    let err = refused(
        "source.problem.txt",
        &format!("{RING}complex T over F2[U,V] = staircase torus_knot 2 3\ngoal tau T\n"),
    );
    assert!(
        err.contains(
            "source.problem.txt:6: goal 1: complex \"T\" is not declared (T, line 5, is a complex over F2[U,V]"
        ),
        "{err}"
    );
    assert!(err.contains("e.g. `complex Q = quotient V of T`"), "{err}");
    // A file that parses but does not validate: the message points at the line of the term…
    let err =
        refused("unknown.problem.txt", &format!("{RING}complex K\n  a (0, 0)\n  b (-1, 0)\n  b -> a\n  b -> c + a\n"));
    assert!(err.contains("unknown.problem.txt:9: complex K, differential, term 2: generator \"c\""), "{err}");
    // … of a construction, or of a generator …
    let graded = "complex K\n  a (0, 0)\n  b (-1, 0, 3)\n";
    let err = refused("graded.problem.txt", &format!("{RING}complex T = staircase torus_knot 2 4\n{graded}"));
    assert!(err.contains("graded.problem.txt:5: complex T: T(2,4)"), "{err}");
    let err = refused("graded.problem.txt", &format!("{RING}{graded}"));
    assert!(
        err.contains("graded.problem.txt:7: complex K, generator \"b\": grading (-1, 0, 3) has 3 entries"),
        "{err}"
    );
    // … and at the line of a goal that cannot be decided.
    let uv = write(
        "uv.problem.txt",
        "ring F2[U,V]\ngradings a b\ndegree U (-2, 0)\ndegree V (0, -2)\ndegree d (-1, -1)\ncomplex C\n  x (0, 0)\n\ngoal homology C\n",
    );
    let (code, _, err) = tubecert(&["prove", &uv]);
    assert_eq!(code, 2);
    assert!(
        err.contains("uv.problem.txt:9: goal 1: homology C: over F2[U,V], which is not a principal ideal domain"),
        "{err}"
    );
}

#[test]
fn draw_writes_an_svg_with_every_generator_and_the_highlight() {
    let cert = format!("{}/../certificates/stair-tower-p3.cert.json", env!("CARGO_MANIFEST_DIR"));
    let svg = dir().join("k.svg");
    let (code, _, err) = tubecert(&["draw", &cert, "--complex", "K", "--highlight", "1", "-o", &svg.to_string_lossy()]);
    assert_eq!(code, 0, "{err}");
    let text = std::fs::read_to_string(&svg).unwrap();
    // T(2,7) ⊗ tower: 7 × 3 generators, each named in a label (x_i⊗a and x_i⊗z share a point).
    for i in 0..7 {
        for g in ["a", "b", "z"] {
            assert!(text.contains(&format!("x{i}⊗{g}")), "x{i}⊗{g} is not named");
        }
    }
    assert_eq!(text.matches("2× ").count(), 7, "seven points hold two generators each");
    assert_eq!(text.matches("font-weight=\"bold\">x").count(), 2, "the witness of ord_U touches two generators of K");
    assert!(text.contains("orange: generators in the support of the witness of claim 1"));
    // Rendered to PNG by a standard converter where one is installed (CI installs librsvg2-bin).
    if std::process::Command::new("rsvg-convert").arg("--version").output().is_ok() {
        let png = dir().join("k.png");
        let st = std::process::Command::new("rsvg-convert").arg(&svg).arg("-o").arg(&png).status().unwrap();
        assert!(st.success());
        assert_eq!(&std::fs::read(png).unwrap()[..8], b"\x89PNG\r\n\x1a\n");
    } else {
        assert!(std::env::var("CI").is_err(), "CI must install rsvg-convert");
    }
    let (code, _, err) = tubecert(&["draw", &cert, "--complex", "Q", "-o", &svg.to_string_lossy()]);
    assert_eq!(code, 2);
    assert!(err.contains("no complex \"Q\""), "{err}");
}

#[test]
fn diff_exit_codes() {
    let c = |f: &str| format!("{}/../certificates/{f}", env!("CARGO_MANIFEST_DIR"));
    assert_eq!(tubecert(&["diff", &c("box-uv.cert.json"), &c("box-uv.cert.json")]).0, 0);
    let (code, out, _) = tubecert(&["diff", &c("disk-pair-p1.cert.json"), &c("disk-pair-p2.cert.json")]);
    assert_eq!(code, 1);
    assert!(out.contains("ord_U(F − G) = ⟦1 ⇒ 2⟧"), "{out}");
    assert!(out.contains(tubecert::diff::NOTATION), "{out}");
    assert_eq!(tubecert(&["diff", &c("box-uv.cert.json"), "/nonexistent.json"]).0, 2);
}

#[test]
fn a_generator_declared_twice_is_an_error() {
    let bad = EXAMPLE.replace("\"z\": [0, 0], \"a\": [0, 0]", "\"z\": [0, 0], \"a\": [0, 0], \"z\": [1, 0]");
    let err = refused("dup.problem.json", &bad);
    assert!(err.contains("\"z\" appears twice in one object"), "{err}");
}

/// `tubecert prove … | head -1`: the certificate is written and the exit code is unchanged
/// when the reader of standard output leaves early.
#[test]
fn a_closed_output_pipe_keeps_the_exit_code_and_the_certificate() {
    let p = write("piped.problem.json", EXAMPLE);
    let out_path = dir().join("piped.cert.json");
    let (reader, writer) = std::io::pipe().unwrap();
    drop(reader);
    let out = Command::new(env!("CARGO_BIN_EXE_tubecert"))
        .args(["prove", &p, "-o", &out_path.to_string_lossy()])
        .stdout(writer)
        .stderr(std::process::Stdio::piped())
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(0), "{err}");
    assert!(!err.contains("panicked"), "{err}");
    assert!(tubecheck::check_bytes("t", &std::fs::read(out_path).unwrap()).unwrap().ok());
}

/// Constructions from the command line: T(2,5) # T(2,5) has τ = 2 + 2 (τ(T(p,q)) = (p−1)(q−1)/2
/// and additivity, Ozsváth–Szabó 2003); the problem written by `build` proves it.
#[test]
fn build_writes_explicit_complexes_that_prove() {
    let out = dir().join("built.problem.json");
    let (code, _, err) = tubecert(&[
        "build",
        "--complex",
        "T = staircase torus_knot 2 5",
        "--complex",
        "S = tensor T T",
        "--goal",
        "tau S",
        "-o",
        &out.to_string_lossy(),
    ]);
    assert_eq!(code, 0, "{err}");
    let written: serde_json::Value = serde_json::from_slice(&std::fs::read(&out).unwrap()).unwrap();
    assert_eq!(written["complexes"]["S"]["generators"].as_object().unwrap().len(), 25, "explicit 5 × 5 generators");
    let (code, stdout, err) = tubecert(&["prove", &out.to_string_lossy()]);
    assert_eq!(code, 0, "{err}");
    assert!(stdout.contains("✓ τ(S) = 4"), "{stdout}");
    let (code, _, err) = tubecert(&["build", "--ring", "F2[W]", "--complex", "T = dual X"]);
    assert_eq!(code, 2);
    assert!(err.contains("expected F2, F2[U] or F2[U,V]"), "{err}");
    let (code, _, err) =
        tubecert(&["build", "--complex", "T = staircase torus_knot 2 3", "--complex", "S = tensor T X"]);
    assert_eq!(code, 2);
    assert!(err.contains("complex S: complex \"X\" is not declared"), "{err}");
    let (_, _, err) = tubecert(&["build", "--complex", "A = dual B", "--complex", "B = dual A"]);
    assert!(err.contains("complex A: is built from B"), "{err}");
    // A goal is validated as `check-input` would: no problem file naming maps it lacks.
    let (code, stdout, err) =
        tubecert(&["build", "--complex", "T = staircase torus_knot 2 3", "--goal", "torsion_order F G U"]);
    assert_eq!(code, 2, "{stdout}");
    assert!(err.contains("map \"F\" is not declared"), "{err}");
    assert!(stdout.is_empty(), "nothing written: {stdout}");
}

/// Every file of a folder, by name.
fn folder(d: &std::path::Path) -> std::collections::BTreeMap<String, Vec<u8>> {
    std::fs::read_dir(d)
        .unwrap()
        .map(|f| f.unwrap().path())
        .map(|p| (p.file_name().unwrap().to_string_lossy().into(), std::fs::read(&p).unwrap()))
        .collect()
}

#[test]
fn family_shards_write_exactly_what_a_whole_run_writes() {
    let template = format!("{}/../examples/stair-tower.template.json", env!("CARGO_MANIFEST_DIR"));
    let run = |out: &std::path::Path, shard: Option<&str>| {
        let out = out.to_string_lossy().to_string();
        let mut args = vec!["family", &template, "--param", "p=1..5", "--out", &out];
        if let Some(s) = shard {
            args.extend(["--shard", s]);
        }
        let (code, text, err) = tubecert(&args);
        assert_eq!(code, 0, "{text}{err}");
        text
    };
    let whole = dir().join("family-whole");
    run(&whole, None);
    let whole = folder(&whole);
    assert_eq!(whole.len(), 10, "a problem and a certificate per member");
    for n in [1, 2, 3, 7] {
        let mut gathered = std::collections::BTreeMap::new();
        for i in 1..=n {
            let part = dir().join(format!("family-{i}-of-{n}"));
            let text = run(&part, Some(&format!("{i}/{n}")));
            let files = folder(&part);
            // Shard i runs the members at positions i, i + n, …: p = i, i + n, … here (p starts at 1).
            let mut expected: Vec<i64> = (1..=5).filter(|p| (p - 1) % n == i - 1).collect();
            let mut got: Vec<i64> = files
                .keys()
                .filter_map(|f| f.strip_prefix("stair-tower-p")?.strip_suffix(".cert.json")?.parse().ok())
                .collect();
            got.sort();
            expected.sort();
            assert_eq!(got, expected, "shard {i}/{n}");
            if expected.is_empty() {
                assert!(text.contains("no members"), "{text}");
            }
            for (name, bytes) in files {
                assert!(gathered.insert(name, bytes).is_none(), "two shards of {n} wrote the same file");
            }
        }
        assert!(gathered == whole, "the union of {n} shards differs from the whole run");
    }
    for (name, bytes) in &whole {
        if name.ends_with(".cert.json") {
            assert!(tubecheck::check_bytes(name, bytes).unwrap().ok(), "{name}");
        }
    }
}

/// A family of bordered objects: each member's problem file keeps its bordered sections (the
/// explicit form has none), so proving it again gives its certificate; the JSON and the text
/// template write the same files, those of the demo stored in `certificates/`; the table shows
/// what the goals proved and counts the claims on the bordered objects.
#[test]
fn a_bordered_family_writes_problems_that_prove_to_its_certificates() {
    let root = std::path::PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    for ext in ["json", "txt"] {
        let template = root.join(format!("examples/cabled-pair.template.{ext}"));
        let out = dir().join(format!("cabled-{ext}"));
        let (code, table, err) =
            tubecert(&["family", &template.to_string_lossy(), "--param", "p=1..2", "--out", &out.to_string_lossy()]);
        assert_eq!(code, 0, "{table}{err}");
        assert!(table.contains("| 2 | ord_U(F − G) = 2; U^2·(F + G) ≃ 0 (null-homotopic);"), "{table}");
        assert!(table.contains("; and 12 claims on the bordered objects (in the certificate) |"), "{table}");
        assert!(!table.contains("type D structure"), "{table}");
        for p in 1..=2 {
            for kind in ["problem", "cert"] {
                let name = format!("cabled-pair-p{p}.{kind}.json");
                let stored = std::fs::read(root.join("certificates").join(&name)).unwrap();
                assert!(std::fs::read(out.join(&name)).unwrap() == stored, "{ext}: {name} differs from the stored one");
            }
            let again = out.join(format!("again-p{p}.cert.json"));
            let problem = out.join(format!("cabled-pair-p{p}.problem.json"));
            let (code, _, err) = tubecert(&["prove", &problem.to_string_lossy(), "-o", &again.to_string_lossy()]);
            assert_eq!(code, 0, "{err}");
            assert!(
                std::fs::read(&again).unwrap()
                    == std::fs::read(out.join(format!("cabled-pair-p{p}.cert.json"))).unwrap(),
                "{ext}: proving member {p}'s problem again gives another certificate"
            );
        }
    }
}

#[test]
fn a_bad_shard_is_refused_with_exit_2() {
    let template = format!("{}/../examples/stair-tower.template.json", env!("CARGO_MANIFEST_DIR"));
    let out = dir().join("family-bad-shard");
    for bad in ["0/4", "5/4", "2/0", "2", "two/4"] {
        let (code, _, err) =
            tubecert(&["family", &template, "--param", "p=1..3", "--shard", bad, "--out", &out.to_string_lossy()]);
        assert_eq!(code, 2, "{bad}");
        assert!(err.contains(&format!("--shard \"{bad}\"")) && err.contains("1 ≤ I ≤ N"), "{err}");
        assert!(!out.exists(), "nothing is written for a bad shard");
    }
}

#[test]
fn bench_reduced_cases_and_density() {
    for case in ["reduced-identity", "reduced-uv"] {
        let (code, out, err) = tubecert(&["bench", "--case", case, "--torus", "3,4"]);
        assert_eq!(code, 0, "{case}: {err}");
        let row: Vec<&str> = out.lines().nth(1).unwrap().split('\t').collect();
        assert_eq!(&row[..2], ["125", "125"], "C = T(3,4)^⊗3 has 5^3 generators");
    }
    let (code, _, err) = tubecert(&["bench", "--case", "reduced-uv", "--torus", "1,4"]);
    assert_eq!(code, 2);
    assert!(err.contains("expected P,Q"), "{err}");
    // A density asked for is the density built (within a few percent), on the same generators.
    let per_generator = |density: &[&str]| {
        let args = [&["bench", "--generators", "4000", "--no-header"], density].concat();
        let (code, out, err) = tubecert(&args);
        assert_eq!(code, 0, "{err}");
        let row: Vec<f64> = out.split('\t').take(3).map(|x| x.trim().parse().unwrap()).collect();
        row[2] / row[1]
    };
    let (default, dense) = (per_generator(&[]), per_generator(&["--density", "9.4"]));
    assert!((3.0..6.0).contains(&default), "{default}");
    assert!((9.0..10.5).contains(&dense), "{dense}");
    assert_eq!(tubecert(&["bench", "--density", "0.5"]).0, 2);
}

/// A minus-version problem with the given complexes (JSON members) and goals.
fn minus_problem(complexes: &str, goals: &str) -> String {
    format!(
        r#"{{"format": "tubecert-problem", "version": 1,
  "ring": {{"variables": ["U"], "gradings": ["maslov", "alexander"], "variable_degrees": {{"U": [-2, -1]}}, "differential_degree": [-1, 0]}},
  "complexes": {{ "A": {{"generators": {{"a": [0, 0]}}, "differential": []}}, {complexes} }},
  "maps": {{"F": {{"from": "A", "to": "A", "degree": [0, 0], "terms": [["a", "1", "a"]]}}}},
  "goals": [{goals}]}}"#
    )
}

#[test]
fn extreme_integers_in_constructions_are_refused_where_they_are_written() {
    // Each would overflow 64-bit arithmetic in a construction (a shift, a staircase's
    // gradings, a quotient's (gr_U − gr_V)/2, a tensor's sums): refused at the number, with
    // the construction named, before any arithmetic.
    let min = i64::MIN;
    for (what, complex) in [
        ("shift", format!(r#""S": {{"shift": ["A", [{min}, 0]]}}"#)),
        ("shift", r#""S": {"shift": ["A", [2147483649, 0]]}"#.to_string()),
        (
            "alexander",
            r#""S": {"staircase": {"alexander": [9223372036854775807, 0, -9223372036854775807]}}"#.to_string(),
        ),
        ("beyond", format!(r#""Q": {{"quotient": [{{"generators": {{"x": [0, {min}]}}, "differential": []}}, "V"]}}"#)),
        (
            "beyond",
            r#""B": {"generators": {"b": [2147483648, 0]}, "differential": []}, "T": {"tensor": ["B", "B"]}"#
                .to_string(),
        ),
    ] {
        let err = refused("extreme.problem.json", &minus_problem(&complex, ""));
        assert!(err.contains(what) && err.contains("2147483648"), "{complex}: {err}");
        assert!(!err.contains("panicked"), "{err}");
    }
}

#[test]
fn orders_beyond_the_exponent_limit_are_refused_before_the_search() {
    for goal in [
        r#"{"torsion_order": {"maps": ["F", "F"], "variable": "U", "max_order": 1048577}}"#,
        r#"{"torsion_order": {"maps": ["F", "F"], "variable": "U", "order": 4294967295}}"#,
    ] {
        let err = refused("order.problem.json", &minus_problem(r#""B": {"generators": {}, "differential": []}"#, goal));
        assert!(err.contains("1048576"), "{goal}: {err}");
    }
}

#[test]
fn family_parameters_do_not_overflow() {
    // hi − lo wraps to −1 for the extreme range, which passed the "at most 1000 members" test.
    assert!(tubecert::family::parse_param("p=-9223372036854775808..9223372036854775807").is_err());
    assert!(tubecert::family::parse_param("p=1..1002").unwrap_err().contains("at most 1001 values"));
    assert!(tubecert::family::parse_param("p=3..1").unwrap_err().contains("LO must be at most HI"));
    assert!(tubecert::family::parse_param("p1=1..3").unwrap_err().contains("NAME must be ASCII letters"));
    assert!(tubecert::family::parse_param("p=1").unwrap_err().contains("no '..'"));
    assert!(tubecert::family::parse_param("p=1..1001").is_ok());
    // −p for the most negative p has no 64-bit value.
    assert!(tubecert::family::eval("-p", "p", i64::MIN).is_err());
    assert_eq!(tubecert::family::eval("-p", "p", 5), Ok(-5));
}

/// The README's goal table: each example is a line of `examples/goals.problem.txt`, which
/// proves as stated, and is shown by `prove --help`; and the README's table of where the
/// staircase of T(3,4) sits is what `build` writes.
#[test]
fn every_goal_form_is_documented_and_proved() {
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
    let readme = std::fs::read_to_string(root.join("README.md")).unwrap();
    let goals = std::fs::read_to_string(root.join("examples/goals.problem.txt")).unwrap();
    let (_, help, _) = tubecert(&["prove", "--help"]);
    let examples: Vec<&str> = readme
        .lines()
        .filter_map(|l| l.strip_prefix("| `")?.split("` | `").nth(1)?.split('`').next())
        .filter(|e| e.starts_with("goal "))
        .collect();
    let forms = ["torsion_order", "homotopic", "distinct", "null_homotopic", "not_null_homotopic", "equivalent"];
    for form in forms.iter().chain(&["homology", "tau", "torsion_order_of_complex"]) {
        assert!(examples.iter().any(|e| e.split(' ').nth(1) == Some(form)), "no README example of {form}");
    }
    for e in &examples {
        assert!(goals.lines().any(|l| l == *e), "README example `{e}` is not in examples/goals.problem.txt");
        assert!(help.contains(e), "README example `{e}` is not in prove --help");
    }
    let out = dir().join("goals.cert.json");
    let (code, stdout, err) =
        tubecert(&["prove", &root.join("examples/goals.problem.txt").to_string_lossy(), "-o", &out.to_string_lossy()]);
    assert_eq!(code, 0, "{stdout}{err}");
    assert_eq!(stdout.matches('✓').count(), 10, "{stdout}");
    // The staircase table: | x1 | (−1, −5) | (−1, 2) | (−1, 2) | … as build writes it.
    let number = |t: &str| t.trim().replace('−', "-");
    for (ring, column) in [("F2[U,V]", 1), ("F2[U]", 2), ("F2", 3)] {
        let (code, text, err) =
            tubecert(&["build", "--ring", ring, "--complex", "T = staircase torus_knot 3 4", "--to", "text"]);
        assert_eq!(code, 0, "{err}");
        for i in 0..5 {
            let row = readme.lines().find(|l| l.starts_with(&format!("| x{i} | ("))).unwrap();
            let cell = number(row.split('|').nth(column + 1).unwrap());
            assert!(text.contains(&format!("  x{i} {cell}\n")), "{ring}: x{i} {cell} is not in\n{text}");
        }
    }
}

/// The README's fenced block after `heading`, of the given language.
fn readme_block(readme: &str, heading: &str, lang: &str) -> String {
    let section = readme.split(heading).nth(1).unwrap_or_else(|| panic!("no README section {heading}"));
    let body = section.split(&format!("```{lang}\n")).nth(1).unwrap_or_else(|| panic!("no {lang} block"));
    body.split("```").next().unwrap().to_string()
}

/// The worked session as the README shows it: the problem it prints is `examples/pair.problem.txt`
/// (and the JSON problem `examples/tower.problem.json`), `prove` writes `pair.cert.json` beside it
/// with the order the comment says, and the two mistakes it describes give the messages it quotes.
#[test]
fn the_readme_worked_session_runs_as_shown() {
    let root = std::path::PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    let readme = std::fs::read_to_string(root.join("README.md")).unwrap();
    let pair = std::fs::read_to_string(root.join("examples/pair.problem.txt")).unwrap();
    assert_eq!(readme_block(&readme, "## A worked session", "text"), pair);
    let tower = std::fs::read_to_string(root.join("examples/tower.problem.json")).unwrap();
    assert_eq!(readme_block(&readme, "## Problem files", "json"), tower);
    let session = dir().join("session");
    std::fs::create_dir_all(&session).unwrap();
    let at = |name: &str| session.join(name).to_string_lossy().to_string();
    std::fs::write(at("pair.problem.txt"), &pair).unwrap();
    let (code, out, err) = tubecert(&["prove", &at("pair.problem.txt")]);
    assert_eq!(code, 0, "{err}");
    assert!(
        readme.contains("tubecert prove pair.problem.txt                # ✓ ord_U(F − G) = 3 …; writes pair.cert.json")
    );
    assert!(out.starts_with("✓ ord_U(F − G) = 3\n"), "{out}");
    assert!(tubecheck::check_bytes("pair", &std::fs::read(at("pair.cert.json")).unwrap()).unwrap().ok());
    // The mistakes: each quoted message (up to its "…") is what check-input prints.
    for (from, to) in [("b -> U^3 a", "b -> U^3 q"), ("p -> z + a", "p -> z + U a")] {
        let mistake = format!("`{to}`) gives `");
        let flat = readme.replace('\n', " ");
        let quoted = flat.split(&mistake).nth(1).unwrap_or_else(|| panic!("README quotes no message for {to}"));
        let quoted = quoted.split('`').next().unwrap();
        let quoted = quoted.trim_end_matches(" …").trim_end_matches('…');
        std::fs::write(at("pair.problem.txt"), pair.replace(from, to)).unwrap();
        let (code, _, err) = tubecert(&["check-input", &at("pair.problem.txt")]);
        assert_eq!(code, 2);
        let err = err.replace(&format!("{}/", session.display()), "");
        assert!(err.contains(quoted), "README: {quoted}\ntool: {err}");
    }
}

/// The README's performance tables at the sizes small enough for a test: each row's problem,
/// made again by `bench` with the arguments the README names, has the row's generators and
/// arrows (the synthetic problems are fixed by their seed, so these columns are not
/// measurements).
#[test]
fn the_readme_bench_rows_describe_the_problems_bench_makes() {
    let root = std::path::PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    let readme = std::fs::read_to_string(root.join("README.md")).unwrap();
    let cases: [(&str, &[&str]); 4] = [
        ("| 1 | 10000 |", &["--generators", "10000"]),
        ("| 19999 | 20000 |", &["--generators", "20000", "--source-generators", "20000"]),
        ("| 15625 | 15625 |", &["--case", "reduced-identity"]),
        ("| 9261 | 9261 |", &["--case", "reduced-uv"]),
    ];
    for (start, args) in cases {
        let row = readme.lines().find(|l| l.starts_with(start)).unwrap_or_else(|| panic!("no README row {start}"));
        let cells: Vec<&str> = row.trim_matches('|').split('|').map(str::trim).collect();
        let (code, out, err) = tubecert(&[&["bench", "--no-header"], args].concat());
        assert_eq!(code, 0, "{err}");
        let got: Vec<&str> = out.trim().split('\t').collect();
        // source_gens, generators, arrows.
        for i in 0..3 {
            assert_eq!(cells[i], got[i], "README row {start}, column {i}: bench {args:?} gives {out}");
        }
    }
}

/// What the README quotes of `tubecheck`'s report is what it prints: the dual witness in the
/// cycle-and-cocycle form (the tower example) and a module's period and generators (the core
/// written out in `examples/bordered.problem.txt`).
#[test]
fn the_readme_quotes_of_the_checker_are_its_report() {
    let root = std::path::PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    let readme = std::fs::read_to_string(root.join("README.md")).unwrap().replace('\n', " ");
    let quote = |before: &str| -> String {
        let rest = readme.split(before).nth(1).unwrap_or_else(|| panic!("the README no longer says {before}"));
        rest.split('`').next().unwrap().to_string()
    };
    for (problem, before) in [
        (
            "examples/tower.problem.json",
            "prints it in the familiar form — the cycle-and-cocycle argument `ψ ↦ c(ψ(x))`, e.g. `",
        ),
        ("examples/bordered.problem.txt", "(`period and generators: "),
    ] {
        let cert = dir().join("quoted.cert.json");
        let (code, _, err) = tubecert(&["prove", &root.join(problem).to_string_lossy(), "-o", &cert.to_string_lossy()]);
        assert_eq!(code, 0, "{err}");
        let report = tubecheck::check_bytes("q", &std::fs::read(&cert).unwrap()).unwrap();
        let text = tubecheck::report_text::render(&report).replace('\n', " ");
        let quoted = quote(before);
        let quoted = if before.contains("period") { format!("period and generators: {quoted}") } else { quoted };
        assert!(text.contains(&quoted), "README: {quoted}\ntubecheck: {text}");
    }
}
