//! What the command line prints: per-file reports in the chosen style, errors, totals.
//! Presentation only; exit codes are decided in `main.rs` from the same outcomes.

use crate::{report_appendix, report_json, report_text, FileReport};
use tubecert_format::statement::SCOPE;

#[derive(Clone, Copy, PartialEq, Eq)]
pub enum Style {
    Text,
    Json,
    Markdown,
    Latex,
}

/// Prints the outcome of each file (a report, or why it could not be read) and the totals.
pub fn print(
    outcomes: &[(String, Result<FileReport, String>)],
    style: Style,
    missing_hashes: &[&String],
    expected: bool,
) {
    let mut json = Vec::new();
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
                    Style::Markdown => print!("{}", report_appendix::markdown(r)),
                    Style::Latex => print!("{}", report_appendix::latex(r)),
                    Style::Text => println!("{}", report_text::render(r)),
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
        Style::Json => println!("{}", serde_json::to_string_pretty(&json).expect("JSON values serialize")),
        Style::Text => {
            let expect = match (expected, missing_hashes.is_empty()) {
                (false, _) => "",
                (true, true) => "; expected hash found",
                (true, false) => "; expected hash NOT found",
            };
            println!("{SCOPE}");
            println!(
                "Total: {} file(s), {verified} claim(s) verified, {failed_claims} failed; {failed_files} file(s) failed, {unreadable} unreadable{expect}",
                outcomes.len()
            );
        }
        Style::Markdown | Style::Latex => {}
    }
}
