//! Machine-readable report (`--json`). Presentation only.

use crate::report_text::{objects, paired};
use crate::FileReport;
use serde_json::{json, Map, Value};

pub fn render(r: &FileReport) -> Value {
    // An object's generators are listed beside the first claim that checks it; later ones give
    // its name and period: a file may hold thousands of claims about one large object.
    let mut listed = std::collections::BTreeSet::new();
    let b = r.body.bordered.as_ref();
    let claims: Vec<Value> = paired(r)
        .map(|(c, claim)| {
            let mut o =
                json!({"kind": c.kind, "ok": c.outcome.is_ok(), "statement": c.statement, "implicit": c.implicit});
            match &c.outcome {
                Ok(facts) => {
                    for (k, v) in facts {
                        o[k] = v.clone();
                    }
                    // The bordered data the gradings are read with, as the certificate writes it
                    // (doubled group elements from version 3 on); `null`: no period.
                    let first = |c| objects(c, b, 0).0.iter().any(|x| !listed.contains(x.name));
                    let (shown, with_generators) =
                        claim.map_or((vec![], false), |c| objects(c, b, if first(c) { usize::MAX } else { 0 }));
                    if with_generators {
                        for x in &shown {
                            let mut object = json!({"name": x.name, "period": x.period});
                            if listed.insert(x.name) {
                                let generators = x.generators.iter();
                                let generators: Map<String, Value> = generators
                                    .map(|(n, i, g)| (n.to_string(), json!({"idempotent": i, "grading": g})))
                                    .collect();
                                object["generators"] = json!(generators);
                            }
                            o["object"] = object;
                        }
                    } else if !shown.is_empty() {
                        o["periods"] = shown.iter().map(|x| (x.name.to_string(), json!(x.period))).collect();
                    }
                }
                Err(e) => o["error"] = json!(e),
            }
            o
        })
        .collect();
    json!({"file": r.file, "sha256": r.sha256, "stated_sha256": r.stated_sha256, "ok": r.ok(), "claims": claims})
}

pub fn unreadable(file: &str, error: &str) -> Value {
    json!({"file": file, "ok": false, "error": error, "claims": []})
}
