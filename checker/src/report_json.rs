//! Machine-readable report (`--json`). Presentation only.

use crate::report_text::{objects, paired};
use crate::FileReport;
use serde_json::{json, Map, Value};

pub fn render(r: &FileReport) -> Value {
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
                    let (shown, with_generators) =
                        claim.map_or((vec![], false), |c| objects(c, r.body.bordered.as_ref()));
                    if with_generators {
                        for x in &shown {
                            let generators: Map<String, Value> = x
                                .generators
                                .iter()
                                .map(|(n, i, g)| (n.to_string(), json!({"idempotent": i, "grading": g})))
                                .collect();
                            o["object"] = json!({"name": x.name, "period": x.period, "generators": generators});
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
