//! `tubecheck PATH...`: re-verifies certificates. Exit 0 iff everything verifies, 1 if a claim
//! or an expected hash fails, 2 if a file is unreadable or malformed or nothing was checked.

use clap::Parser;
use std::path::{Path, PathBuf};
use std::process::ExitCode;
use tubecheck::check_bytes;
use tubecheck::report_cli::{self, Style};

#[derive(Parser)]
#[command(
    name = "tubecheck",
    version,
    about = "Re-verify tubecert certificates by exact arithmetic over F2[U,V]",
    after_help = "Examples:\n  tubecheck certificates/\n  tubecheck paper.cert.json --expect 3f1c…(the hash printed in the paper)\n  tubecheck --json certificates/ > report.json\n  tubecheck --report tex paper.cert.json > appendix.tex     # \\input{appendix} in the paper\n  tubecheck --report tex --standalone paper.cert.json > a.tex && pdflatex a.tex\n\nExit codes: 0 all verified; 1 a claim or an expected hash failed; 2 a file is unreadable or malformed, or no certificate was found."
)]
struct Args {
    /// Certificate files, or folders (every *.json inside, recursively; problem files are skipped).
    #[arg(required = true)]
    paths: Vec<PathBuf>,
    /// A hash that must be among the verified files' hashes (repeatable).
    #[arg(long, value_name = "HEX", value_parser = whole_hash)]
    expect: Vec<String>,
    /// Print a machine-readable JSON report on stdout.
    #[arg(long)]
    json: bool,
    /// Print an appendix instead, with the claims' witnesses written out: Markdown (md) or a
    /// LaTeX fragment to \input (tex; needs amsmath and amssymb).
    #[arg(long, value_parser = ["md", "tex"])]
    report: Option<String>,
    /// With --report tex: a whole LaTeX document (one for all files) instead of a fragment.
    #[arg(long, requires = "report")]
    standalone: bool,
}

/// A prefix (as tables print) would match more than one file in principle: refuse it (exit 2).
fn whole_hash(h: &str) -> Result<String, String> {
    let h = h.trim();
    let whole = h.len() == 64 && h.chars().all(|c| c.is_ascii_hexdigit());
    let (digits, other) =
        (h.chars().filter(char::is_ascii_hexdigit).count(), h.chars().any(|c| !c.is_ascii_hexdigit()));
    let and_other = if other { " and other characters" } else { "" };
    let why = format!("a SHA-256 hash has all 64 hex digits ({digits} given{and_other}); copy the whole hash tubecheck prints, not a prefix");
    whole.then(|| h.to_string()).ok_or(why)
}

/// Files to check: named files as given, folders walked in sorted order.
fn collect(path: &Path, named: bool, out: &mut Vec<(PathBuf, bool)>) -> std::io::Result<()> {
    if !path.is_dir() {
        out.push((path.to_path_buf(), named));
        return Ok(());
    }
    let mut entries: Vec<PathBuf> = std::fs::read_dir(path)?.map(|e| e.map(|e| e.path())).collect::<Result<_, _>>()?;
    entries.sort();
    let wanted = entries.iter().filter(|e| e.is_dir() || e.extension().is_some_and(|x| x == "json"));
    // A link to a folder is followed only when named: two links to "." would make 2^40 paths.
    let (links, wanted): (Vec<_>, Vec<_>) = wanted.partition(|e| e.is_dir() && e.is_symlink());
    links.iter().for_each(|l| {
        eprintln!("tubecheck: skipped {}: a link to a folder", tubecheck::shown(&l.display().to_string()))
    });
    wanted.into_iter().try_for_each(|e| collect(e, false, out))
}

fn is_problem_file(bytes: &[u8]) -> bool {
    #[derive(serde::Deserialize)]
    struct Head {
        format: String,
    }
    serde_json::from_slice::<Head>(bytes).is_ok_and(|h| h.format == "tubecert-problem")
}

fn main() -> ExitCode {
    std::panic::set_hook(Box::new(|_| {})); // a panic is reported as the file's refusal below
    let args = Args::parse();
    let mut files = Vec::new();
    if let Some((p, e)) = args.paths.iter().find_map(|p| collect(p, true, &mut files).err().map(|e| (p, e))) {
        eprintln!("tubecheck: {}: {e}", p.display());
        return ExitCode::from(2);
    }
    let mut outcomes = Vec::new();
    for (path, named) in files {
        // Shown as refusals are: a name may hold line breaks or terminal escapes.
        let name = tubecheck::shown(&path.display().to_string());
        // Overflow checks are on in release: an overflow the bounds did not catch refuses the
        // file (exit 2) rather than giving a verdict, and is reported, never shown as a panic.
        let check = |b: &[u8]| {
            std::panic::catch_unwind(|| check_bytes(&name, b)).unwrap_or_else(|_| {
                Err("refused: an integer overflow while checking (a number beyond the format's bounds)".into())
            })
        };
        let outcome = match tubecert_format::limits::read_file(&path).map(|b| (check(&b), b)) {
            // Problem files sit beside their certificates: skipped in folders (and named, so a
            // certificate overwritten by its problem is noticed), explained if named.
            Ok((Err(_), bytes)) if is_problem_file(&bytes) => {
                if !named {
                    let odd = if name.ends_with(".cert.json") { " although its name is a certificate's" } else { "" };
                    eprintln!("tubecheck: skipped {name}: a problem file, not a certificate{odd}");
                    continue;
                }
                Err("a problem file, not a certificate (`tubecert prove` makes one from it)".into())
            }
            read => read.and_then(|(checked, _)| checked.map_err(|e| format!("malformed: {e}"))),
        };
        outcomes.push((name, outcome));
    }
    if outcomes.is_empty() {
        let paths: Vec<String> = args.paths.iter().map(|p| p.display().to_string()).collect();
        eprintln!("tubecheck: no certificate found in {}: nothing was checked", paths.join(", "));
        return ExitCode::from(2);
    }
    let verified =
        |h: &&String| outcomes.iter().any(|(_, o)| o.as_ref().is_ok_and(|r| r.sha256.eq_ignore_ascii_case(h)));
    let missing: Vec<&String> = args.expect.iter().filter(|h| !verified(h)).collect();
    let style = Style::of(args.json, args.report.as_deref(), args.standalone);
    report_cli::print(&outcomes, style, &missing, !args.expect.is_empty());
    let unreadable = outcomes.iter().any(|(_, o)| o.is_err());
    let failed = !missing.is_empty() || outcomes.iter().any(|(_, o)| o.as_ref().is_ok_and(|r| !r.ok()));
    ExitCode::from(if unreadable { 2 } else { failed as u8 })
}
