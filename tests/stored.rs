//! The stored certificates: each verifies, and proving its problem file again gives the
//! identical bytes (determinism: no hash-map order, no timestamps, no paths in the body).

use std::path::PathBuf;

fn stored() -> Vec<(PathBuf, PathBuf)> {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../certificates");
    let mut out: Vec<(PathBuf, PathBuf)> = std::fs::read_dir(&dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.to_string_lossy().ends_with(".problem.json"))
        .map(|p| {
            let cert = PathBuf::from(p.to_string_lossy().replace(".problem.json", ".cert.json"));
            (p, cert)
        })
        .collect();
    out.sort();
    assert!(out.len() >= 8, "the demo certificates are stored");
    out
}

#[test]
fn stored_certificates_verify() {
    for (_, cert) in stored() {
        let bytes = std::fs::read(&cert).unwrap();
        let report = tubecheck::check_bytes(&cert.to_string_lossy(), &bytes).unwrap();
        assert!(report.ok(), "{}", tubecheck::report_text::render(&report));
    }
}

#[test]
fn regenerating_gives_identical_bytes() {
    for (problem, cert) in stored() {
        let (p, ctx, bytes) = tubecert::load_problem(&problem).unwrap();
        let again = tubecert::prove::prove(p, &ctx, &bytes).unwrap().certificate;
        let again = tubecert::canonical_writer::file_bytes(&again).unwrap();
        assert!(again == std::fs::read(&cert).unwrap(), "{} differs from a fresh proof", cert.display());
    }
}

#[test]
fn demo_problems_are_the_stored_ones() {
    for (stem, p) in tubecert::demo::demo_problems() {
        let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join(format!("../certificates/{stem}.problem.json"));
        assert_eq!(tubecert::demo::problem_bytes(&p), std::fs::read(&path).unwrap(), "{stem}");
    }
}
