//! `tubecert diff A B`: what changed between two certificates — objects and claims added,
//! removed or changed, with a word diff of changed statements.

use similar::{ChangeTag, TextDiff};
use std::collections::BTreeSet;
use tubecert_format::{Body, Claim};

fn word_diff(a: &str, b: &str) -> String {
    TextDiff::from_words(a, b)
        .iter_all_changes()
        .map(|c| match c.tag() {
            ChangeTag::Equal => c.value().to_string(),
            ChangeTag::Delete => format!("[-{}-]", c.value()),
            ChangeTag::Insert => format!("{{+{}+}}", c.value()),
        })
        .collect()
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
    out
}

#[cfg(test)]
mod tests {
    use super::*;
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
        assert!(
            d.iter().any(|l| l.starts_with("~ claim [torsion_order]") && l.contains("[-2-]") && l.contains("{+3+}")),
            "{d:?}"
        );
        // Claims about other maps (U^2 vs U^3 multiples) are removed and added.
        assert!(d.iter().any(|l| l.starts_with("- claim [null_homotopic] U^2")), "{d:?}");
        assert!(d.iter().any(|l| l.starts_with("+ claim [null_homotopic] U^3")), "{d:?}");
    }
}
