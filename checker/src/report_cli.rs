//! What the command line prints: per-file reports in the chosen style, errors, totals.
//! Presentation only; exit codes are decided in `main.rs` from the same outcomes.

use crate::report_text::{BORDERED_SCOPE, SCOPE};
use crate::{report_appendix, report_json, report_text, FileReport};
use std::io::{ErrorKind, Write};

/// Writes `text` to standard output. A reader that went away early (`| head -1`) is not an
/// error: the exit code still carries the verdict, so printing just stops. Any other write
/// failure (a full disk under `> report.json`) must not pass silently: exit 2.
pub fn emit(text: &str) {
    if let Err(e) = std::io::stdout().lock().write_all(text.as_bytes()) {
        if e.kind() != ErrorKind::BrokenPipe {
            eprintln!("cannot write to standard output: {e}");
            std::process::exit(2);
        }
    }
}

/// `println!` through [`emit`].
#[macro_export]
macro_rules! say {
    ($($arg:tt)*) => { $crate::report_cli::emit(&format!("{}\n", format_args!($($arg)*))) };
}

#[derive(Clone, Copy, PartialEq, Eq)]
pub enum Style {
    Text,
    Json,
    Markdown,
    /// A LaTeX fragment per file, to `\input`.
    Latex,
    /// One whole LaTeX document around every file's fragment (`--standalone`).
    LatexDocument,
}

impl Style {
    /// The style the flags `--json`, `--report md|tex` and `--standalone` ask for.
    pub fn of(json: bool, report: Option<&str>, standalone: bool) -> Style {
        match (json, report) {
            (true, _) => Style::Json,
            (_, None) => Style::Text,
            (_, Some("md")) => Style::Markdown,
            _ if standalone => Style::LatexDocument,
            _ => Style::Latex,
        }
    }
}

/// Prints the outcome of each file (a report, or why it could not be read) and the totals.
pub fn print(
    outcomes: &[(String, Result<FileReport, String>)],
    style: Style,
    missing_hashes: &[&String],
    expected: bool,
) {
    let mut json = Vec::new();
    let mut fragments = Vec::new();
    let (mut verified, mut failed_claims, mut failed_files, mut unreadable) = (0, 0, 0, 0);
    for (name, outcome) in outcomes {
        match outcome {
            Ok(r) => {
                let listed = r.claims.iter().filter(|c| !c.implicit);
                verified += listed.clone().filter(|c| c.outcome.is_ok()).count();
                failed_claims += listed.filter(|c| c.outcome.is_err()).count();
                failed_files += usize::from(!r.ok());
                match style {
                    Style::Json => json.push(report_json::render(r)),
                    Style::Markdown => emit(&report_appendix::markdown(r)),
                    Style::Latex => emit(&report_appendix::latex(r)),
                    Style::LatexDocument => fragments.push(report_appendix::latex(r)),
                    Style::Text => crate::say!("{}", report_text::render(r)),
                }
            }
            Err(e) => {
                unreadable += 1;
                eprintln!("tubecheck: {name}: {e}");
                json.push(report_json::unreadable(name, e));
            }
        }
    }
    for h in missing_hashes {
        eprintln!("tubecheck: expected hash {h} is not the hash of any verified file");
    }
    match style {
        Style::Json => crate::say!("{}", serde_json::to_string_pretty(&json).expect("JSON values serialize")),
        Style::Text => {
            let expect = match (expected, missing_hashes.is_empty()) {
                (false, _) => "",
                (true, true) => "; expected hash found",
                (true, false) => "; expected hash NOT found",
            };
            crate::say!("{SCOPE}");
            if outcomes.iter().any(|(_, o)| o.as_ref().is_ok_and(|r| r.body.bordered.is_some())) {
                crate::say!("{BORDERED_SCOPE}");
            }
            crate::say!(
                "Total: {} file(s), {verified} claim(s) verified, {failed_claims} failed; {failed_files} file(s) failed, {unreadable} unreadable{expect}",
                outcomes.len()
            );
        }
        Style::LatexDocument => emit(&report_appendix::latex_document(&fragments)),
        Style::Markdown | Style::Latex => {}
    }
}
