//! `tubecert diff A B`: what changed between two certificates — objects and claims added,
//! removed or changed; a changed statement is written once, each changed stretch of words as
//! `⟦old ⇒ new⟧` (`—` for nothing), e.g. `ord_U(F − G) = ⟦2 ⇒ 3⟧`.

use similar::{ChangeTag, TextDiff};
use std::collections::BTreeSet;
use tubecert_format::{Body, Claim};

/// What the notation of changed statements means, printed after them.
pub const NOTATION: &str = "⟦a ⇒ b⟧: the first certificate says a where the second says b (— : nothing)";

/// One stretch of change, in our notation; blank space at its edges stays outside the marker.
fn marker(old: &str, new: &str) -> String {
    let side = |s: &str| if s.trim().is_empty() { "—".to_string() } else { s.trim().to_string() };
    let edge = |f: fn(&str) -> bool| if f(old) || f(new) { " " } else { "" };
    let lead = edge(|s| s.starts_with(char::is_whitespace));
    let trail = edge(|s| s.ends_with(char::is_whitespace));
    format!("{lead}⟦{} ⇒ {}⟧{trail}", side(old), side(new))
}

/// `a` with each changed stretch of words replaced by `⟦old ⇒ new⟧`. Spaces between two
/// changed words belong to the stretch, so a phrase that changed reads as one marker.
fn word_diff(a: &str, b: &str) -> String {
    let diff = TextDiff::from_words(a, b);
    let changes: Vec<(ChangeTag, &str)> = diff.iter_all_changes().map(|c| (c.tag(), c.value())).collect();
    let (mut out, mut old, mut new) = (String::new(), String::new(), String::new());
    // Blank space met inside a stretch, waiting for the next word of each side.
    let (mut old_gap, mut new_gap) = (String::new(), String::new());
    let mut open = false;
    for (i, &(tag, value)) in changes.iter().enumerate() {
        match tag {
            ChangeTag::Delete => {
                old += &std::mem::take(&mut old_gap);
                old += value;
                open = true;
            }
            ChangeTag::Insert => {
                new += &std::mem::take(&mut new_gap);
                new += value;
                open = true;
            }
            ChangeTag::Equal => {
                // Blank space inside a stretch: kept in it when another change follows at once.
                let next_changes = changes.get(i + 1).is_some_and(|c| c.0 != ChangeTag::Equal);
                if open && value.trim().is_empty() && next_changes {
                    if !old.is_empty() {
                        old_gap = value.to_string();
                    }
                    if !new.is_empty() {
                        new_gap = value.to_string();
                    }
                    continue;
                }
                if open {
                    out += &marker(&old, &new);
                    old.clear();
                    new.clear();
                    open = false;
                }
                old_gap.clear();
                new_gap.clear();
                out += value;
            }
        }
    }
    if open {
        out += &marker(&old, &new);
    }
    // A space both inside the stretch's edge and beside it is written once.
    out.replace("⟧  ", "⟧ ").replace("  ⟦", " ⟦")
}

/// Lines describing the differences (empty when the bodies are equal).
pub fn diff(a: &Body, b: &Body) -> Vec<String> {
    let mut out = Vec::new();
    if a.ring != b.ring {
        out.push("ring: changed".into());
    }
    let objects = |what: &str,
                   ka: BTreeSet<&String>,
                   kb: BTreeSet<&String>,
                   same: &dyn Fn(&String) -> bool,
                   out: &mut Vec<String>| {
        for k in ka.difference(&kb) {
            out.push(format!("- {what} {k}"));
        }
        for k in kb.difference(&ka) {
            out.push(format!("+ {what} {k}"));
        }
        for k in ka.intersection(&kb) {
            if !same(k) {
                out.push(format!("~ {what} {k} changed"));
            }
        }
    };
    objects(
        "complex",
        a.complexes.keys().collect(),
        b.complexes.keys().collect(),
        &|k| a.complexes[k] == b.complexes[k],
        &mut out,
    );
    objects("map", a.maps.keys().collect(), b.maps.keys().collect(), &|k| a.maps[k] == b.maps[k], &mut out);
    // Claims are matched by what they speak of: kind and objects, not by position or wording.
    let key = |c: &Claim| {
        let mut v = serde_json::to_value(c).unwrap_or_default();
        if let Some(o) = v.as_object_mut() {
            for k in ["statement", "witness", "order", "free", "torsion", "tau"] {
                o.remove(k);
            }
        }
        v.to_string()
    };
    let mut matched_b = vec![false; b.claims.len()];
    for ca in &a.claims {
        match b.claims.iter().enumerate().position(|(j, cb)| !matched_b[j] && key(cb) == key(ca)) {
            Some(j) => {
                matched_b[j] = true;
                let cb = &b.claims[j];
                if ca.statement() != cb.statement() {
                    out.push(format!("~ claim [{}] {}", ca.kind(), word_diff(ca.statement(), cb.statement())));
                } else if ca != cb {
                    out.push(format!("~ claim [{}] {}: same statement, different witness", ca.kind(), ca.statement()));
                }
            }
            None => out.push(format!("- claim [{}] {}", ca.kind(), ca.statement())),
        }
    }
    for (j, cb) in b.claims.iter().enumerate() {
        if !matched_b[j] {
            out.push(format!("+ claim [{}] {}", cb.kind(), cb.statement()));
        }
    }
    if a.provenance.producer != b.provenance.producer {
        out.push(format!("~ producer: {} → {}", a.provenance.producer, b.provenance.producer));
    }
    if a.provenance.problem_sha256 != b.provenance.problem_sha256 {
        out.push("~ made from a different problem file".into());
    }
    if out.iter().any(|l| l.contains('⟦')) {
        out.push(NOTATION.to_string());
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn changed_stretches_are_marked_in_our_notation() {
        assert_eq!(word_diff("ord_U(F − G) = 2", "ord_U(F − G) = 3"), "ord_U(F − G) = ⟦2 ⇒ 3⟧");
        assert_eq!(word_diff("F is not null-homotopic", "F is null-homotopic"), "F is ⟦not ⇒ —⟧ null-homotopic");
        assert_eq!(word_diff("τ(K) = 1", "τ(K) = 1 (Alexander grading a)"), "τ(K) = 1 ⟦— ⇒ (Alexander grading a)⟧");
        assert_eq!(word_diff("a b c d", "a x y d"), "a ⟦b c ⇒ x y⟧ d");
    }

    #[test]
    fn reports_added_removed_and_changed_claims() {
        let read = |f: &str| -> Body {
            let p = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../certificates").join(f);
            serde_json::from_slice::<tubecert_format::Certificate>(&std::fs::read(p).unwrap()).unwrap().body
        };
        let (p2, p3) = (read("disk-pair-p2.cert.json"), read("disk-pair-p3.cert.json"));
        assert!(diff(&p2, &p2).is_empty());
        let d = diff(&p2, &p3);
        assert!(d.contains(&"~ complex K changed".to_string()), "{d:?}");
        assert!(d.iter().any(|l| l.starts_with("~ claim [torsion_order]") && l.ends_with("= ⟦2 ⇒ 3⟧")), "{d:?}");
        assert!(!d.iter().any(|l| l.contains("[-") || l.contains("{+")), "{d:?}");
        assert_eq!(d.last().map(String::as_str), Some(NOTATION));
        // Claims about other maps (U^2 vs U^3 multiples) are removed and added.
        assert!(d.iter().any(|l| l.starts_with("- claim [null_homotopic] U^2")), "{d:?}");
        assert!(d.iter().any(|l| l.starts_with("+ claim [null_homotopic] U^3")), "{d:?}");
    }
}
