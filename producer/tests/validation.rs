//! One validation: whatever `check-input` accepts, `prove` decides (exit 0 or 3), whatever it
//! refuses, `prove` refuses too (exit 2); no input reaches exit 4. Text-format declarations and
//! construction errors are explained in the words of the format the user wrote.

use std::process::Command;

fn run(bin: &str, args: &[&str]) -> (i32, String, String) {
    let out = Command::new(bin).args(args).output().unwrap();
    (
        out.status.code().unwrap(),
        String::from_utf8_lossy(&out.stdout).into(),
        String::from_utf8_lossy(&out.stderr).into(),
    )
}

fn tubecert(args: &[&str]) -> (i32, String, String) {
    run(env!("CARGO_BIN_EXE_tubecert"), args)
}

fn write(name: &str, text: &str) -> String {
    let d = std::env::temp_dir().join(format!("tubecert-validation-{}", std::process::id()));
    std::fs::create_dir_all(&d).unwrap();
    let p = d.join(name);
    std::fs::write(&p, text).unwrap();
    p.to_string_lossy().into()
}

const MINUS: &str = "ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\n";
const FULL: &str = "ring F2[U,V]\ngradings gr_U gr_V\ndegree U (-2, 0)\ndegree V (0, -2)\ndegree d (-1, -1)\n";
const HAT: &str = "ring F2\ngradings maslov alexander\ndegree d (-1, 0)\n";

/// check-input's verdict, then prove's; they must agree, and prove never answers 4.
fn both(name: &str, text: &str) -> (i32, String, i32, String) {
    let p = write(name, text);
    let (check, _, check_err) = tubecert(&["check-input", &p]);
    let cert = format!("{p}.cert.json");
    let (prove, out, prove_err) = tubecert(&["prove", &p, "-o", &cert]);
    assert_ne!(prove, 4, "{name}: internal error: {prove_err}");
    match check {
        0 => assert!(prove == 0 || prove == 3, "{name}: check-input accepted, prove gave {prove}: {prove_err}"),
        _ => assert_eq!(prove, 2, "{name}: check-input refused ({check_err}) but prove gave {prove}"),
    }
    (check, check_err, prove, out)
}

#[test]
fn check_input_and_prove_agree_on_every_goal() {
    let cases = [
        ("uv-homology", format!("{FULL}complex T = staircase torus_knot 2 3\ngoal homology T\n")),
        ("tau-maslov", format!("{MINUS}complex T = staircase torus_knot 2 3\ngoal tau T alexander maslov\n")),
        ("tau-hat", format!("{HAT}complex T = staircase torus_knot 2 3\ngoal tau T\n")),
        ("tau-rank-two", format!("{MINUS}complex A\n  a (0, 0)\n  b (0, 0)\ngoal tau A\n")),
        ("torsion-order-mismatch", format!("{MINUS}complex A\n  a (0, 0)\ncomplex B\n  b (0, 0)\nmap F : A -> A degree (0, 0)\n  a -> a\nmap G : B -> B degree (0, 0)\n  b -> b\ngoal torsion_order F G U\n")),
        ("equivalent-wrong-ends", format!("{MINUS}complex A\n  a (0, 0)\ncomplex B\n  b (0, 0)\nmap F : A -> B degree (0, 0)\n  a -> b\nmap G : A -> B degree (0, 0)\n  a -> b\ngoal equivalent A B F G\n")),
        ("equivalent-shifted", format!("{MINUS}complex A\n  a (0, 0)\ncomplex B\n  b (-2, -1)\nmap F : A -> B degree (-2, -1)\n  a -> b\nmap G : B -> A degree (2, 1)\n  b -> a\ngoal equivalent A B F G\n")),
        ("uv-tau", format!("{FULL}complex T = staircase torus_knot 2 3\ngoal tau T\ngoal torsion_order_of_complex T U\n")),
    ];
    let mut refused = Vec::new();
    for (name, text) in &cases {
        let (check, err, _, _) = both(name, text);
        if check != 0 {
            refused.push((name.to_string(), err));
        }
    }
    let said = |n: &str| refused.iter().find(|r| r.0 == n).map(|r| r.1.clone()).unwrap_or_default();
    assert!(said("uv-homology").contains("quotient"), "{}", said("uv-homology"));
    assert!(said("uv-homology").contains(":7:"), "{}", said("uv-homology"));
    assert!(said("tau-maslov").contains("name the Alexander grading"), "{}", said("tau-maslov"));
    assert!(said("tau-hat").contains("over F2 (the hat version)"), "{}", said("tau-hat"));
    assert!(said("tau-rank-two").contains("free rank 2"), "{}", said("tau-rank-two"));
    assert!(said("torsion-order-mismatch").contains("goal 1"), "{}", said("torsion-order-mismatch"));
    assert!(said("equivalent-wrong-ends").contains("must map A → B and G map B → A"));
    assert!(said("equivalent-shifted").contains("F must have degree 0"), "{}", said("equivalent-shifted"));
    assert_eq!(refused.len(), 7, "{refused:?}");
}

#[test]
fn tau_and_torsion_order_over_the_full_ring_are_read_on_the_v_zero_quotient() {
    // τ(T(3,4)) = (3−1)(4−1)/2 = 3 (Ozsváth–Szabó 2003, "Knot Floer homology and the four-ball
    // genus"); Ord_U(T(3,4)) = 3 − 1 = 2 (Juhász–Miller–Zemke 2020).
    let text = format!("{FULL}complex T = staircase torus_knot 3 4\ncomplex M = dual T\ngoal tau T\ngoal torsion_order_of_complex T U\ngoal tau M\n");
    let (check, err, prove, out) = both("uv-t34", &text);
    assert_eq!((check, prove), (0, 0), "{err}");
    assert!(
        out.contains("τ(T) = 3 (Alexander grading alexander = (gr_U − gr_V)/2, read on T/(V), the V = 0 quotient)"),
        "{out}"
    );
    assert!(out.contains("Ord_U(H_*(T/(V))) = 2"), "{out}");
    // τ(mirror K) = −τ(K) (same paper).
    assert!(out.contains("τ(M) = -3 (Alexander"), "{out}");
    let cert = format!("{}.cert.json", write("uv-t34", &text));
    let report = tubecheck::check_bytes("t", &std::fs::read(cert).unwrap()).unwrap();
    assert!(report.ok());
}

#[test]
fn a_forged_tau_over_the_full_ring_is_rejected() {
    let text = format!("{FULL}complex T = staircase torus_knot 2 3\ngoal tau T\n");
    let (_, _, prove, _) = both("uv-forged", &text);
    assert_eq!(prove, 0);
    let cert = format!("{}.cert.json", write("uv-forged", &text));
    let mut c: serde_json::Value = serde_json::from_slice(&std::fs::read(&cert).unwrap()).unwrap();
    let claim = &mut c["body"]["claims"][0];
    claim["tau"] = serde_json::json!(2);
    let forged = claim["statement"].as_str().unwrap().replace("τ(T) = 1", "τ(T) = 2");
    claim["statement"] = serde_json::json!(forged);
    let body: tubecert_format::Body = serde_json::from_value(c["body"].clone()).unwrap();
    let results = tubecheck::verify::check_body(&body, tubecert_format::CERTIFICATE_VERSION, u64::MAX).unwrap();
    let r = results.iter().find(|r| r.kind == "tau").unwrap();
    assert!(r.outcome.as_ref().unwrap_err().contains("τ = 1, not 2"), "{:?}", r.outcome);
}

#[test]
fn every_missing_or_misplaced_declaration_is_explained_at_its_line() {
    let body = "complex T = staircase torus_knot 2 3\ngoal tau T\n";
    let without =
        |word: &str| MINUS.lines().filter(|l| !l.starts_with(word)).map(|l| format!("{l}\n")).collect::<String>();
    let cases = [
        (without("degree d"), "4:1: the ring is not fully declared before \"complex T\": missing \"degree d (…)\""),
        (without("ring"), "missing \"ring F2|F2[U]|F2[U,V]\""),
        (without("gradings"), "missing \"gradings NAMES…\""),
        (without("degree U"), "missing \"degree U (…)\""),
    ];
    for (head, want) in cases {
        let (code, _, err) = tubecert(&["check-input", &write("decl.txt", &format!("{head}{body}"))]);
        assert_eq!(code, 2);
        assert!(err.contains(want), "{err}");
        for json_word in ["invalid type", "variable_degrees", "differential_degree", "expected a sequence"] {
            assert!(!err.contains(json_word), "{err}");
        }
    }
    let misplaced = format!("{MINUS}{body}ring F2\ndegree W (0, 1)\n");
    let (_, _, err) = tubecert(&["check-input", &write("late.txt", &misplaced)]);
    assert!(err.contains("late.txt:7:1: \"ring\" is declared twice (first at line 1)"), "{err}");
    assert!(err.contains("late.txt:8:1: \"degree W\" must come before the complexes"), "{err}");
    let wrong = MINUS.replace("degree U (-2, -1)", "degree W (-2, -1)\ndegree U (-2, -1, 0)");
    let (_, _, err) = tubecert(&["check-input", &write("wrong.txt", &format!("{wrong}{body}"))]);
    assert!(err.contains("wrong.txt:3:1: \"degree W\": W is not a variable of the ring (U)"), "{err}");
    assert!(err.contains("wrong.txt:4:1: \"degree U\" has 3 entries; line 2 declares 2 gradings"), "{err}");
}

#[test]
fn family_accepts_text_templates_and_agrees_with_the_json_template() {
    let root = concat!(env!("CARGO_MANIFEST_DIR"), "/../examples/");
    let d = std::env::temp_dir().join(format!("tubecert-family-text-{}", std::process::id()));
    let (t, j) = (d.join("text"), d.join("json"));
    let (code, out, err) = tubecert(&[
        "family",
        &format!("{root}stair-tower.template.txt"),
        "--param",
        "p=1..2",
        "--out",
        &t.to_string_lossy(),
    ]);
    assert_eq!(code, 0, "{out}{err}");
    assert!(out.contains("τ(K) = 2"), "{out}");
    tubecert(&[
        "family",
        &format!("{root}stair-tower.template.json"),
        "--param",
        "p=1..2",
        "--out",
        &j.to_string_lossy(),
    ]);
    for p in [1, 2] {
        let name = format!("stair-tower-p{p}.cert.json");
        assert_eq!(std::fs::read(t.join(&name)).unwrap(), std::fs::read(j.join(&name)).unwrap());
    }
    // Errors in a text template keep their line.
    let bad = write("bad.template.txt", &format!("{MINUS}complex T = staircase torus_knot 2 {{2*p}}\n"));
    let (code, _, err) = tubecert(&["family", &bad, "--param", "p=1..1"]);
    assert_eq!(code, 2);
    assert!(err.contains("with p = 1:5: complex T: T(2,2)"), "{err}");
}

#[test]
fn construction_errors_name_real_complexes_and_speak_the_users_format() {
    let (_, _, err) = tubecert(&[
        "check-input",
        &write("q.txt", &format!("{MINUS}complex T = staircase torus_knot 2 3\ncomplex S = tensor T Q\n")),
    ]);
    assert!(err.contains("complex \"Q\" is not declared (did you mean \"T\"?)"), "{err}");
    let (_, _, err) = tubecert(&["check-input", &write("w.txt", &format!("{MINUS}complex T = staircase torus_knot 2 4\ncomplex S = dual T\ncomplex C = cone f\ncomplex A\n  a (0, 0)\nmap f : A -> C degree (0, 0)\n"))]);
    assert!(!err.contains("  ("), "an empty name: {err}");
    assert!(err.contains("complex S: is built from T"), "{err}");
    assert!(err.contains("complex C: is built from itself"), "{err}");
    let tm = format!("{MINUS}complex P\n  p (0, 0)\nmap f : P -> P degree (0, 0)\n  p -> p\nmap g = tensor_maps f f\n");
    let (_, _, err) = tubecert(&["check-input", &write("tm.txt", &tm)]);
    assert!(err.contains("complex NAME = tensor P P"), "{err}");
    assert!(!err.contains('{'), "JSON told to a text user: {err}");
}

#[test]
fn emit_reduction_says_when_there_was_nothing_to_reduce() {
    let p = write(
        "small.txt",
        &format!("{MINUS}complex A\n  a (0, 0)\nmap F : A -> A degree (0, 0)\n  a -> a\ngoal homotopic F F\n"),
    );
    let (code, out, err) = tubecert(&["prove", &p, "-o", &format!("{p}.cert.json"), "--emit-reduction"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("--emit-reduction: nothing to reduce"), "{out}");
}

#[test]
fn the_test_script_installs_python_packages_into_a_virtual_environment() {
    let script = include_str!("../../scripts/test.sh");
    assert!(script.contains("python3 -m venv"), "{script}");
    assert!(!script.lines().any(|l| l.starts_with("python3 -m pip")), "a system-wide install: {script}");
    let ci = include_str!("../../.ci/run");
    assert!(ci.contains("python3-venv"));
}

#[test]
fn convert_to_json_writes_one_term_per_line() {
    let root = concat!(env!("CARGO_MANIFEST_DIR"), "/../examples/pair.problem.txt");
    let (code, out, err) = tubecert(&["convert", root, "--to", "json"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.lines().any(|l| l.trim() == "[\"b\", \"U^3\", \"a\"]"), "{out}");
    assert!(out.lines().any(|l| l.trim() == "\"b\": [-5, -3],"), "{out}");
    // Same problem as before, read back.
    let back = write("pair-back.problem.json", &out);
    let (code, _, err) = tubecert(&["check-input", &back]);
    assert_eq!(code, 0, "{err}");
    let value: serde_json::Value = serde_json::from_str(&out).unwrap();
    let text = std::fs::read_to_string(root).unwrap();
    assert_eq!(value, tubecert::text_format::parse(&text).unwrap());
}
