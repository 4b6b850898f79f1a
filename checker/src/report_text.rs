//! Human-readable report of verified results. Presentation only: it formats what
//! [`crate::verify`] established and decides nothing.

use crate::FileReport;
use std::fmt::Write as _;

pub fn render(r: &FileReport) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "{}", r.file);
    if r.hash_ok() {
        let _ = writeln!(s, "  sha256 {}  (matches the body)", r.sha256);
    } else {
        let _ = writeln!(s, "  ✗ sha256 stated {} but the body hashes to {}", r.stated_sha256, r.sha256);
    }
    let (implicit, listed): (Vec<_>, Vec<_>) = r.claims.iter().partition(|c| c.implicit);
    if implicit.iter().all(|c| c.outcome.is_ok()) {
        let count = |k: &str| implicit.iter().filter(|c| c.kind == k).count();
        let _ = writeln!(
            s,
            "  ✓ objects: {} complexes satisfy ∂∘∂ = 0 and are homogeneous; {} maps are homogeneous chain maps",
            count("complex"),
            count("chain_map")
        );
    }
    for c in implicit.iter().filter(|c| c.outcome.is_err()).chain(listed.iter()) {
        match &c.outcome {
            Ok(facts) => {
                let _ = writeln!(s, "  ✓ {}", c.statement);
                if let Some(reading) = facts.get("reading").and_then(|v| v.as_str()) {
                    let _ = writeln!(s, "      reading: {reading}");
                }
            }
            Err(e) => {
                let _ = writeln!(s, "  ✗ [{}] {}\n      {}", c.kind, c.statement, e);
            }
        }
    }
    let failed = listed.iter().filter(|c| c.outcome.is_err()).count();
    let _ = writeln!(s, "  {} claims: {} verified, {} failed", listed.len(), listed.len() - failed, failed);
    s
}
