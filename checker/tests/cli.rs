//! The command line as a referee or a CI job uses it: exit codes and what is printed.

use std::process::Command;

fn tubecheck(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_tubecheck")).args(args).output().unwrap();
    (
        out.status.code().unwrap(),
        String::from_utf8_lossy(&out.stdout).into(),
        String::from_utf8_lossy(&out.stderr).into(),
    )
}

fn certificates() -> String {
    format!("{}/../certificates", env!("CARGO_MANIFEST_DIR"))
}

fn tmp(name: &str, bytes: &[u8]) -> String {
    let dir = std::env::temp_dir().join(format!("tubecheck-cli-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let p = dir.join(name);
    std::fs::write(&p, bytes).unwrap();
    p.to_string_lossy().into()
}

#[test]
fn stored_certificates_pass() {
    let (code, out, _) = tubecheck(&[&certificates()]);
    assert_eq!(code, 0, "{out}");
    assert!(out.contains("✓ ord_U(F − G) = 2"));
    assert!(out.contains("Scope:"));
    // A dual witness with one source generator is shown in the familiar factored form.
    assert!(out.contains("witness: ψ ↦ c(ψ(o)) with c = (U·a)*; it is 1 on U·(F + G)"), "{out}");
    assert!(out.contains("0 failed"));
}

#[test]
fn removing_a_witness_term_fails_and_names_the_claim() {
    let path = format!("{}/disk-pair-p3.cert.json", certificates());
    let mut cert: tubecert_format::Certificate = serde_json::from_slice(&std::fs::read(path).unwrap()).unwrap();
    let tubecert_format::Claim::TorsionOrder { witness, .. } = &mut cert.body.claims[0] else { panic!() };
    witness.homotopy.pop();
    cert.sha256 = tubecert_format::canonical::canonical_sha256(&cert.body).unwrap();
    let (code, out, _) = tubecheck(&[&tmp("removed.json", &serde_json::to_vec(&cert).unwrap())]);
    assert_eq!(code, 1);
    assert!(out.contains("✗ [torsion_order] ord_U(F − G) = 3"), "{out}");
    assert!(out.contains("at generator o"), "{out}");
}

#[test]
fn expect_checks_the_hash() {
    let path = format!("{}/disk-pair-p2.cert.json", certificates());
    let cert: serde_json::Value = serde_json::from_slice(&std::fs::read(&path).unwrap()).unwrap();
    let good = cert["sha256"].as_str().unwrap();
    assert_eq!(tubecheck(&[&path, "--expect", good]).0, 0);
    let (code, _, err) = tubecheck(&[&path, "--expect", &"0".repeat(64)]);
    assert_eq!(code, 1);
    assert!(err.contains("not the hash"));
}

#[test]
fn malformed_input_exits_2_without_panic() {
    for (name, bytes) in
        [("trunc.json", &b"{\"format\": "[..]), ("list.json", b"[1, 2]"), ("bad-utf8.json", b"\xff\xfe")]
    {
        let (code, _, err) = tubecheck(&[&tmp(name, bytes)]);
        assert_eq!(code, 2, "{name}");
        assert!(err.contains("malformed") && !err.contains("panicked"), "{err}");
    }
    assert_eq!(tubecheck(&["/nonexistent/x.json"]).0, 2);
}

#[test]
fn json_report_carries_the_facts() {
    let (code, out, _) = tubecheck(&["--json", &certificates()]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let files = v.as_array().unwrap();
    let p4 = files.iter().find(|f| f["file"].as_str().unwrap().ends_with("disk-pair-p4.cert.json")).unwrap();
    assert_eq!(p4["ok"], true);
    let claims = p4["claims"].as_array().unwrap();
    assert!(claims.iter().any(|c| c["kind"] == "torsion_order" && c["order"] == 4));
    let h = claims.iter().find(|c| c["kind"] == "homology").unwrap();
    assert_eq!(h["free_rank"], 1);
    assert_eq!(h["torsion"], serde_json::json!([[4, [0, 0]]]));
}

#[test]
fn appendix_reports() {
    let path = format!("{}/stair-tower-p2.cert.json", certificates());
    let (code, md, _) = tubecheck(&["--report", "md", &path]);
    assert_eq!(code, 0);
    assert!(md.contains("1. ✓ ord_U(F − G) = 2 *(torsion_order; witness terms:"), "{md}");
    assert!(md.contains("Scope:") && md.contains("--expect"));
    // The witnesses written out: the homotopy as x ↦ Σ m·w, the dual in the factored form.
    assert!(md.contains("homotopy H with U^2·(F + G) = ∂H + H∂:\n      - `o ↦ "), "{md}");
    assert!(md.contains("dual witness y(ψ) = Σ_x c_x(ψ(x)): y = 1 on U·(F + G)") && md.contains("- `c_o = "), "{md}");
    assert!(md.contains("basis in which ∂ is in normal form"), "{md}");
    // A fragment to \input by default: no preamble, tables apart, grading names in text font.
    let (code, tex, _) = tubecheck(&["--report", "tex", &path]);
    assert_eq!(code, 0);
    assert!(!tex.contains("\\documentclass") && !tex.contains("\\begin{document}"), "{tex}");
    assert!(tex.contains("$\\operatorname{ord}_{U}(\\mathrm{F} - \\mathrm{G}) = 2$"), "{tex}");
    assert!(tex.contains("$\\tau(\\mathrm{K}) = 2$ (Alexander grading $\\textnormal{alexander}$)"), "{tex}");
    assert!(tex.contains("\\text{gradings } (\\textnormal{maslov}, \\textnormal{alexander})"), "{tex}");
    assert!(tex.matches("\\end{tabular}\n\\par\\medskip").count() == 2, "each table in a paragraph of its own");
    assert!(tex.contains("\\item[] $\\mathrm{o} \\mapsto "), "{tex}");
    assert!(tex.contains("\\item[] $c_{\\mathrm{o}} = "), "{tex}");
    // --standalone: one document around every file's fragment.
    let other = format!("{}/tower.cert.json", certificates());
    let (code, doc, _) = tubecheck(&["--report", "tex", "--standalone", &path, &other]);
    assert_eq!(code, 0);
    assert!(doc.starts_with("\\documentclass") && doc.trim_end().ends_with("\\end{document}"));
    assert_eq!(doc.matches("\\documentclass").count(), 1);
    assert_eq!(doc.matches("\\subsection*{Machine-checked certificate}").count(), 2);
    compiles(&doc);
}

/// A bordered certificate's reports show each module's period and gradings beside its claim and
/// the periods beside each pairing (the statements do not carry them), and its LaTeX compiles.
#[test]
fn bordered_reports_show_periods_and_gradings() {
    let path = format!("{}/cable-by-p3.cert.json", certificates());
    let module = "h_A(KC.pattern) = (11/2; 0, 1; 3); 5 generators (idempotent, grading): x1 ι0 (0; 0, 0; 0), y1 ι1 (-1/2; 1/2, -1/2; 0),";
    let periods = "periods: h_A(KC.pattern) = (11/2; 0, 1; 3), h_D(KC.complement) = (0; 1, -1; 0)";
    let (code, text, _) = tubecheck(&[&path]);
    assert_eq!(code, 0);
    let after = |claim: &str| text.lines().skip_while(|l| !l.contains(claim)).nth(1).unwrap_or("").to_string();
    assert!(after("✓ KC.pattern is a strictly unital").contains(module), "{text}");
    assert!(after("✓ KC = KC.pattern ⊠ KC.complement").contains(periods), "{text}");
    let (_, md, _) = tubecheck(&["--report", "md", &path]);
    assert!(md.contains(&format!("    - period and generators: {module}")) && md.contains(periods), "{md}");
    let (_, tex, _) = tubecheck(&["--report", "tex", "--standalone", &path]);
    assert!(tex.contains("\\item period and generators: $h_A(\\mathrm{KC.pattern}) = (11/2; 0, 1; 3)$"), "{tex}");
    assert!(
        tex.contains("with C's basis") && tex.contains("its period $h_A$ included") && tex.contains("CFD($X_K$)"),
        "{tex}"
    );
    compiles(&tex);
    let (_, json, _) = tubecheck(&["--json", &path]);
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    let claims = v[0]["claims"].as_array().unwrap();
    let a = claims.iter().find(|c| c["kind"] == "type_a_module").unwrap();
    assert_eq!(a["object"]["period"], serde_json::json!([11, 0, 2, 6]), "{a}");
    assert_eq!(a["object"]["generators"]["y1"], serde_json::json!({"grading": [-1, 1, -1, 0], "idempotent": 1}));
    let b = claims.iter().find(|c| c["kind"] == "box_tensor").unwrap();
    assert_eq!(b["periods"], serde_json::json!({"KC.pattern": [11, 0, 2, 6], "KC.complement": [0, 2, -2, 0]}));
    assert_eq!(b["bounded"], "structure", "the existing facts stay");
}

/// Beyond the size limit a witness shows its first rows and counts the rest.
#[test]
fn appendix_witnesses_are_cut_with_counts() {
    let path = format!("{}/stair-tower-p5.cert.json", certificates());
    let (code, md, _) = tubecheck(&["--report", "md", &path]);
    assert_eq!(code, 0);
    assert!(md.contains("more rows (") && md.contains("terms in all; the certificate holds every one)"), "{md}");
    // No witness shows more than 12 rows.
    let mut run = 0;
    for line in md.lines() {
        run = if line.starts_with("      - `") { run + 1 } else { 0 };
        assert!(run <= 12, "{md}");
    }
    let (_, tex, _) = tubecheck(&["--report", "tex", "--standalone", &path]);
    assert!(tex.contains("\\dots{} ") && tex.contains("more rows"), "{tex}");
    compiles(&tex);
}

/// pdflatex compiles a standalone appendix, where it is installed (CI installs it).
fn compiles(doc: &str) {
    if Command::new("pdflatex").arg("--version").output().is_err() {
        assert!(std::env::var("CI").is_err(), "CI must install pdflatex (texlive-latex-base)");
        eprintln!("pdflatex is not installed: the compilation check is skipped here");
        return;
    }
    let dir = std::env::temp_dir().join(format!("tubecheck-tex-{}-{}", std::process::id(), doc.len()));
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(dir.join("a.tex"), doc).unwrap();
    let out = Command::new("pdflatex")
        .args(["-interaction=nonstopmode", "-halt-on-error", "a.tex"])
        .current_dir(&dir)
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stdout));
    assert!(dir.join("a.pdf").exists());
}

/// `tubecheck … | head -1` in a CI script: the reader leaves early. The checker must neither
/// panic nor change its verdict; the exit code still says whether everything verified.
#[test]
fn a_closed_output_pipe_keeps_the_verdict() {
    let (reader, writer) = std::io::pipe().unwrap();
    drop(reader);
    let out = Command::new(env!("CARGO_BIN_EXE_tubecheck"))
        .arg(certificates())
        .stdout(writer)
        .stderr(std::process::Stdio::piped())
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(0), "{err}");
    assert!(!err.contains("panicked"), "{err}");
}

#[test]
fn a_problem_file_named_by_mistake_is_explained() {
    let problem = format!("{}/disk-pair-p2.problem.json", certificates());
    let (code, _, err) = tubecheck(&[&problem]);
    assert_eq!(code, 2);
    assert!(err.contains("a problem file, not a certificate"), "{err}");
}

#[test]
fn expect_needs_the_whole_hash() {
    let cert = format!("{}/tower.cert.json", certificates());
    let (code, _, err) = tubecheck(&[&cert, "--expect", "3f1c"]);
    assert_eq!(code, 2);
    assert!(err.contains("all 64 hex digits (4 given)"), "{err}");
    // A prefix copied with its ellipsis: digits counted, not bytes, and the rest named.
    let (code, _, err) = tubecheck(&[&cert, "--expect", "3f1c…"]);
    assert_eq!(code, 2);
    assert!(err.contains("(4 given and other characters)"), "{err}");
}

#[test]
fn a_folder_with_nothing_to_check_exits_2() {
    let dir = std::env::temp_dir().join(format!("tubecheck-cli-empty-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let (code, out, err) = tubecheck(&[&dir.to_string_lossy()]);
    assert_eq!(code, 2, "{out}{err}");
    assert!(err.contains("no certificate"), "{err}");
}

#[test]
fn a_skipped_file_is_named_with_the_reason() {
    // A problem saved under a certificate's name, alone in a folder: nothing was checked.
    let dir = std::env::temp_dir().join(format!("tubecheck-cli-skip-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let problem = std::fs::read(format!("{}/tower.problem.json", certificates())).unwrap();
    std::fs::write(dir.join("tower.cert.json"), &problem).unwrap();
    let (code, out, err) = tubecheck(&[&dir.to_string_lossy()]);
    assert_eq!(code, 2, "{out}{err}");
    assert!(err.contains("tower.cert.json") && err.contains("problem file"), "{err}");
    // Beside a real certificate the skipped file is still named, and the verdict is the
    // certificate's.
    std::fs::copy(format!("{}/tower.cert.json", certificates()), dir.join("real.cert.json")).unwrap();
    let (code, out, err) = tubecheck(&[&dir.to_string_lossy()]);
    assert_eq!(code, 0, "{out}{err}");
    assert!(err.contains("skipped") && err.contains("tower.cert.json"), "{err}");
}

#[test]
fn a_homotopy_equivalence_beyond_the_work_budget_is_refused_not_failed() {
    // Full complexes C = ⟨x_0..x_{n−1}⟩ and D = ⟨y⟩ over F2[U,V], f(x_i) = y, g(y) = Σ x_i: the
    // file is about 65·n bytes, and g∘f costs n² units (each of f's n terms reaches g's row of
    // n terms), beyond limits::work_limit of that size. Checked in the full complexes' own
    // context, whose refusal must make the file unreadable (exit 2) like the body's.
    use serde_json::json;
    let n = 5000;
    let xs: Vec<String> = (0..n).map(|i| format!("x{i}")).collect();
    let generators: serde_json::Map<String, serde_json::Value> =
        xs.iter().map(|x| (x.clone(), json!([0, 0]))).collect();
    let f: Vec<_> = xs.iter().map(|x| json!([x, "1", "y"])).collect();
    let g: Vec<_> = xs.iter().map(|x| json!(["y", "1", x])).collect();
    let body = json!({
        "ring": {"variables": ["U"], "gradings": ["maslov", "alexander"],
                 "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]},
        "complexes": {}, "maps": {},
        "bordered": {
            "full_ring": serde_json::to_value(tubecert_format::bordered::full_ring()).unwrap(),
            "full_complexes": {"C": {"generators": generators, "differential": []},
                               "D": {"generators": {"y": [0, 0]}, "differential": []}},
            "full_maps": {"f": {"from": "C", "to": "D", "degree": [0, 0], "terms": f},
                          "g": {"from": "D", "to": "C", "degree": [0, 0], "terms": g}},
            "type_a_modules": {}, "type_d_morphisms": {}, "type_d_structures": {}},
        "claims": [{"kind": "homotopy_equivalence", "maps": ["f", "g"],
                    "statement": "f and g are mutually inverse homotopy equivalences",
                    "witness": {"source_homotopy": [], "target_homotopy": []}}],
        "provenance": {"producer": "hand-made test", "problem_sha256": "0"}
    });
    let body: tubecert_format::Body = serde_json::from_value(body).unwrap();
    let sha256 = tubecert_format::canonical::canonical_sha256(&body).unwrap();
    let cert = tubecert_format::Certificate {
        format: "tubecert-certificate".into(),
        version: tubecert_format::CERTIFICATE_VERSION,
        sha256,
        body,
    };
    let bytes = serde_json::to_vec(&cert).unwrap();
    assert!(n * n > tubecert_format::limits::work_limit(bytes.len() as u64) as usize);
    let (code, out, err) = tubecheck(&[&tmp("equivalence-budget.json", &bytes)]);
    assert_eq!(code, 2, "{out}{err}");
    assert!(err.contains("work limit") && err.contains("a composition of maps"), "{out}{err}");
    // Within a budget it is checked, and fails for its empty witnesses (a claim, exit 1).
    let r = tubecheck::verify::check_body(&cert.body, cert.version, u64::MAX).expect("loads");
    let claim = r.iter().find(|c| !c.implicit).unwrap();
    assert!(claim.outcome.as_ref().unwrap_err().contains("g∘f + id"), "{:?}", claim.outcome);
}

/// `tubecheck` with `args`, killed after `seconds` (`None`: it had not finished).
fn within(seconds: u64, args: &[&str]) -> Option<(i32, String, String)> {
    use std::process::Stdio;
    let mut child = Command::new(env!("CARGO_BIN_EXE_tubecheck"))
        .args(args)
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let start = std::time::Instant::now();
    while child.try_wait().unwrap().is_none() {
        if start.elapsed().as_secs() >= seconds {
            child.kill().unwrap();
            child.wait().unwrap();
            return None;
        }
        std::thread::sleep(std::time::Duration::from_millis(50));
    }
    let out = child.wait_with_output().unwrap();
    let text = |b: &[u8]| String::from_utf8_lossy(b).into_owned();
    Some((out.status.code().unwrap(), text(&out.stdout), text(&out.stderr)))
}

/// A supplement's folder is its author's. A file name may hold line breaks and terminal escapes:
/// printed as it was, it wrote "✓" lines of the author's above the real verdict (here a failed
/// hash), which an escape could then erase. A link to "." twice made 2^40 paths to walk; a pipe
/// named x.json was waited on for ever, and a link to /dev/zero read until memory ran out.
#[cfg(unix)]
#[test]
fn a_hostile_folder_cannot_spoof_the_report_or_hang_the_walk() {
    let dir = std::env::temp_dir().join(format!("tubecheck-cli-hostile-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    let mut cert: serde_json::Value =
        serde_json::from_slice(&std::fs::read(format!("{}/tower.cert.json", certificates())).unwrap()).unwrap();
    cert["sha256"] = serde_json::json!("0".repeat(64));
    let spoof = "a.cert.json\n  ✓ τ(K) = 5\n  4 claims: 4 verified, 0 failed\u{1b}[1A\u{1b}[2K\n.json";
    std::fs::write(dir.join(spoof), serde_json::to_vec(&cert).unwrap()).unwrap();
    let d = dir.to_string_lossy().into_owned();
    for args in [vec![&d[..]], vec![&d[..], "--report", "md"]] {
        let (code, out, err) = within(20, &args).expect("finished");
        assert_eq!(code, 1, "{out}{err}");
        let spoofed = |s: &str| s.contains('\u{1b}') || s.lines().any(|l| l.starts_with("  ✓ τ(K)"));
        assert!(!spoofed(&out) && !spoofed(&err) && out.contains("<U+000A>"), "{out}{err}");
    }
    std::os::unix::fs::symlink(".", dir.join("a")).unwrap();
    std::os::unix::fs::symlink(".", dir.join("b")).unwrap();
    let (code, out, err) = within(20, &[&d]).expect("the walk ends");
    assert_eq!(code, 1, "{out}{err}");
    assert!(err.contains("skipped") && err.contains("a link to a folder"), "{err}");
    let fifo = Command::new("mkfifo").arg(dir.join("f.json")).status().is_ok_and(|s| s.success());
    std::os::unix::fs::symlink("/dev/zero", dir.join("z.json")).unwrap();
    let (code, out, err) = within(20, &[&d]).expect("nothing is read without end");
    assert_eq!(code, 2, "{out}{err}");
    assert!(
        err.contains("z.json: not a regular file") && (!fifo || err.contains("f.json: not a regular file")),
        "{err}"
    );
    std::fs::remove_dir_all(&dir).unwrap();
}
