//! Machine-readable report (`--json`). Presentation only.

use crate::FileReport;
use serde_json::{json, Value};

pub fn render(r: &FileReport) -> Value {
    let claims: Vec<Value> = r
        .claims
        .iter()
        .map(|c| {
            let mut o =
                json!({"kind": c.kind, "ok": c.outcome.is_ok(), "statement": c.statement, "implicit": c.implicit});
            match &c.outcome {
                Ok(facts) => {
                    for (k, v) in facts {
                        o[k] = v.clone();
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
