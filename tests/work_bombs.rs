//! Work a small file can demand (issue 10, class 4): each bomb of `bombs.rs` must be refused
//! with exit 2 naming the limit, within 20 s and 2 GiB, or give its answer within the same
//! bounds. The tools run as processes under `ulimit -v` and `timeout`, so a regression fails
//! the test instead of exhausting the machine. Needs the release build (`cargo build --release`).

use std::path::PathBuf;
use std::process::Command;
use std::time::{Duration, Instant};
use tubecert_tests::bombs;

fn exe(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../target/release").join(name)
}

/// Runs a tool on `bytes` written to a file, capped at 2 GiB of address space and 20 s:
/// (exit code, stdout + stderr, time taken).
fn run(tool: &str, args: &[&str], file: &str, bytes: &[u8]) -> (i32, String, Duration) {
    let dir = std::env::temp_dir().join(format!("tubecert-bombs-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join(file);
    std::fs::write(&path, bytes).unwrap();
    let start = Instant::now();
    let out = Command::new("sh")
        .arg("-c")
        .arg("ulimit -v 2097152; exec timeout 20 \"$@\"")
        .arg("sh")
        .arg(exe(tool))
        .args(args)
        .arg(&path)
        .output()
        .unwrap();
    let took = start.elapsed();
    std::fs::remove_file(&path).unwrap();
    let text = String::from_utf8_lossy(&out.stdout).to_string() + &String::from_utf8_lossy(&out.stderr);
    (out.status.code().unwrap_or(-1), text, took)
}

fn refused(tool: &str, args: &[&str], file: &str, bytes: &[u8], limit: &str) {
    let (code, text, took) = run(tool, args, file, bytes);
    assert_eq!(code, 2, "{file} ({} bytes): exit {code} after {took:?}: {text}", bytes.len());
    assert!(text.contains(limit), "{file}: the message does not name \"{limit}\": {text}");
    assert!(took < Duration::from_secs(15), "{file}: refused only after {took:?}");
}

fn check_refused(file: &str, bytes: &[u8]) {
    refused("tubecheck", &[], file, bytes, "limits::work_limit");
}

#[test]
fn dual_witness_at_a_busy_target_is_refused() {
    check_refused("dual.cert.json", &bombs::dual_witness(20_000));
    // A small one is worked out: the functional does not vanish on boundaries (exit 1).
    let (code, text, _) = run("tubecheck", &[], "dual-small.cert.json", &bombs::dual_witness(300));
    assert_eq!(code, 1, "{text}");
    assert!(text.contains("δy ≠ 0"), "{text}");
}

#[test]
fn shared_degree_products_are_refused() {
    check_refused("shared.cert.json", &bombs::shared_degree(4_000));
    let (code, text, _) = run("tubecheck", &[], "shared-small.cert.json", &bombs::shared_degree(100));
    assert_eq!(code, 0, "{text}");
}

#[test]
fn a_hub_is_refused_when_large_and_checked_when_small() {
    check_refused("hub.cert.json", &bombs::hub(10_000));
    let (code, text, _) = run("tubecheck", &[], "hub-small.cert.json", &bombs::hub(1_000));
    assert_eq!(code, 0, "{text}");
}

#[test]
fn suggestions_for_long_unknown_names_are_bounded() {
    let (code, text, took) = run("tubecheck", &[], "names.cert.json", &bombs::suggestions(2_500, 10));
    assert_eq!(code, 2, "{text}");
    assert!(text.contains("is not in complex K"), "{text}");
    assert!(took < Duration::from_secs(5), "{took:?}");
}

#[test]
fn dense_compositions_many_claims_and_wide_sums_are_refused() {
    check_refused("compose.cert.json", &bombs::dense_composition(20_000));
    check_refused("claims.cert.json", &bombs::many_claims(100_000, 2_000));
    check_refused("sum.cert.json", &bombs::wide_sum(20_000, 20));
}

#[test]
fn producer_validation_and_constructions_are_bounded() {
    let check_input = |file: &str, bytes: &[u8], limit: &str| refused("tubecert", &["check-input"], file, bytes, limit);
    check_input("hub.problem.json", &bombs::hub_problem(10_000), "limits::work_limit");
    check_input("tower.problem.txt", &bombs::tensor_tower(5), "construct::CONSTRUCTED_BASE");
    check_input("maps.problem.json", &bombs::tensor_maps(20_000), "construct::CONSTRUCTED_BASE");
    let (code, text, took) = run("tubecert", &["check-input"], "goals.problem.json", &bombs::unknown_goal_names(3_000));
    assert_eq!(code, 2, "{text}");
    assert!(took < Duration::from_secs(5), "{took:?}");
    // A chain of shifts declared backwards resolves in one pass: linear, and accepted.
    let (code, text, took) = run("tubecert", &["check-input"], "chain.problem.txt", &bombs::shift_chain(50_000, 1));
    assert_eq!(code, 0, "{text}");
    assert!(took < Duration::from_secs(10), "{took:?}");
}

/// Writes every bomb at full scale into `$BOMBS_DIR` (for running the tools on them by hand).
#[test]
#[ignore]
fn write_bombs() {
    let dir = PathBuf::from(std::env::var("BOMBS_DIR").unwrap_or("/tmp/bombs".into()));
    std::fs::create_dir_all(&dir).unwrap();
    let files: Vec<(&str, Vec<u8>)> = vec![
        ("a-dual-witness.cert.json", bombs::dual_witness(40_000)),
        ("b-shared-degree.cert.json", bombs::shared_degree(12_000)),
        ("c-hub.cert.json", bombs::hub(30_000)),
        ("d-suggestions.cert.json", bombs::suggestions(2_500, 10)),
        ("e-dense-composition.cert.json", bombs::dense_composition(40_000)),
        ("f-many-claims.cert.json", bombs::many_claims(100_000, 20_000)),
        ("g-wide-sum.cert.json", bombs::wide_sum(50_000, 100)),
        ("p1-tensor-tower.problem.txt", bombs::tensor_tower(5)),
        ("p2-tensor-maps.problem.json", bombs::tensor_maps(20_000)),
        ("p3-shift-chain.problem.txt", bombs::shift_chain(50_000, 1)),
        ("p4-unknown-goal-names.problem.json", bombs::unknown_goal_names(3_000)),
        ("p5-hub.problem.json", bombs::hub_problem(30_000)),
    ];
    for (name, bytes) in files {
        std::fs::write(dir.join(name), bytes).unwrap();
    }
}
