//! `tubecheck PATH...`: re-verifies certificates. Exit 0 iff everything verifies, 1 if a claim
//! or an expected hash fails, 2 if a file is unreadable or malformed.

use clap::Parser;
use std::path::{Path, PathBuf};
use std::process::ExitCode;
use tubecert_format::statement::SCOPE;
use tubecheck::{check_bytes, report_appendix, report_json, report_text};

#[derive(Parser)]
#[command(
    name = "tubecheck",
    version,
    about = "Re-verify tubecert certificates by exact arithmetic over F2[U,V]",
    after_help = "Examples:\n  tubecheck certificates/\n  tubecheck paper.cert.json --expect 3f1c…(the hash printed in the paper)\n  tubecheck --json certificates/ > report.json\n\nExit codes: 0 all verified; 1 a claim or an expected hash failed; 2 a file is unreadable or malformed."
)]
struct Args {
    /// Certificate files, or folders (every *.json inside, recursively; problem files are skipped).
    #[arg(required = true)]
    paths: Vec<PathBuf>,
    /// A hash that must be among the verified files' hashes (repeatable).
    #[arg(long, value_name = "HEX")]
    expect: Vec<String>,
    /// Print a machine-readable JSON report on stdout.
    #[arg(long)]
    json: bool,
    /// Print an appendix-ready summary instead: Markdown (md) or a LaTeX document (tex).
    #[arg(long, value_parser = ["md", "tex"])]
    report: Option<String>,
}

/// Files to check: named files as given, folders walked in sorted order.
fn collect(path: &Path, named: bool, out: &mut Vec<(PathBuf, bool)>) -> std::io::Result<()> {
    if path.is_dir() {
        let mut entries: Vec<PathBuf> =
            std::fs::read_dir(path)?.map(|e| e.map(|e| e.path())).collect::<Result<_, _>>()?;
        entries.sort();
        for e in entries {
            if e.is_dir() || e.extension().is_some_and(|x| x == "json") {
                collect(&e, false, out)?;
            }
        }
    } else {
        out.push((path.to_path_buf(), named));
    }
    Ok(())
}

fn is_problem_file(bytes: &[u8]) -> bool {
    #[derive(serde::Deserialize)]
    struct Head {
        format: String,
    }
    serde_json::from_slice::<Head>(bytes).is_ok_and(|h| h.format == "tubecert-problem")
}

fn main() -> ExitCode {
    let args = Args::parse();
    let mut files = Vec::new();
    for p in &args.paths {
        if let Err(e) = collect(p, true, &mut files) {
            eprintln!("tubecheck: {}: {e}", p.display());
            return ExitCode::from(2);
        }
    }
    let (mut failed, mut unreadable, mut verified_claims, mut failed_claims) = (0, 0, 0, 0);
    let mut hashes = Vec::new();
    let mut json_out = Vec::new();
    for (path, named) in files {
        let name = path.display().to_string();
        let bytes = match tubecert_format::limits::read_file(&path) {
            Ok(b) => b,
            Err(e) => {
                unreadable += 1;
                eprintln!("tubecheck: {name}: {e}");
                json_out.push(report_json::unreadable(&name, &e));
                continue;
            }
        };
        if !named && is_problem_file(&bytes) {
            continue;
        }
        match check_bytes(&name, &bytes) {
            Ok(r) => {
                let listed = r.claims.iter().filter(|c| !c.implicit);
                verified_claims += listed.clone().filter(|c| c.outcome.is_ok()).count();
                failed_claims += listed.filter(|c| c.outcome.is_err()).count();
                if !r.ok() {
                    failed += 1;
                }
                hashes.push(r.sha256.clone());
                if args.json {
                    json_out.push(report_json::render(&r));
                } else if let Some(kind) = &args.report {
                    print!("{}", if kind == "md" { report_appendix::markdown(&r) } else { report_appendix::latex(&r) });
                } else {
                    println!("{}", report_text::render(&r));
                }
            }
            Err(e) => {
                unreadable += 1;
                eprintln!("tubecheck: {name}: malformed: {e}");
                json_out.push(report_json::unreadable(&name, &e));
            }
        }
    }
    let mut expect_failed = false;
    for h in &args.expect {
        if !hashes.iter().any(|x| x.eq_ignore_ascii_case(h.trim())) {
            expect_failed = true;
            eprintln!("tubecheck: expected hash {h} is not the hash of any verified file");
        }
    }
    if args.json {
        println!("{}", serde_json::to_string_pretty(&json_out).expect("JSON values serialize"));
    } else if args.report.is_none() {
        println!("{SCOPE}");
        println!(
            "Total: {} file(s), {verified_claims} claim(s) verified, {failed_claims} failed; {failed} file(s) failed, {unreadable} unreadable{}",
            hashes.len() + unreadable,
            if args.expect.is_empty() { String::new() } else if expect_failed { "; expected hash NOT found".into() } else { "; expected hash found".into() }
        );
    }
    if unreadable > 0 {
        ExitCode::from(2)
    } else if failed > 0 || expect_failed {
        ExitCode::from(1)
    } else {
        ExitCode::SUCCESS
    }
}
