//! The SHA-256 of a certificate body's canonical form (RFC 8785, the JSON Canonicalization
//! Scheme), written by serde_json itself: no white space; strings escaped as ECMAScript's
//! JSON.stringify does (exactly `"`, `\` and U+0000..U+001F, short forms `\b \t \n \f \r`,
//! otherwise `\u00xx` in lower case, RFC 8785 §3.2.2.2); integers as digits (the model holds only
//! integers, and the checks that read them keep every one within ±2^53, where RFC 8785's doubles
//! are exact); object members sorted by the bytes of their names (structs declare their fields
//! in that order or are written through a `Value`, whose map is sorted; maps are `BTreeMap`s).
//! RFC 8785 sorts by UTF-16 code units: the same order for names below U+E000, as every name the
//! checker accepts is ([`crate::names`]).

use serde::{Serialize, Serializer};
use sha2::{Digest, Sha256};

/// The canonical hash of a certificate body, streamed into the digest: no copy of a large body
/// is held in memory.
pub fn body_sha256(body: &crate::Body) -> Result<String, String> {
    let mut digest = std::io::BufWriter::with_capacity(1 << 16, Sha256::new());
    serde_json::to_writer(&mut digest, body).map_err(|e| e.to_string())?;
    Ok(hex(&digest.into_inner().map_err(|e| e.to_string())?.finalize()))
}

/// The canonical hash of any value whose names are in the alphabet, through a `Value`.
pub fn canonical_sha256<T: Serialize>(v: &T) -> Result<String, String> {
    let v = serde_json::to_value(v).map_err(|e| e.to_string())?;
    Ok(sha256_hex(&serde_json::to_vec(&v).map_err(|e| e.to_string())?))
}

/// Writes a value through a `Value`, whose map puts the members of structs declared out of
/// order, and the `kind` tag serde writes first, in sorted order.
pub(crate) fn sorted<T: Serialize, S: Serializer>(v: &T, s: S) -> Result<S::Ok, S::Error> {
    serde_json::to_value(v).map_err(serde::ser::Error::custom)?.serialize(s)
}

pub fn sha256_hex(bytes: &[u8]) -> String {
    hex(&Sha256::digest(bytes))
}

fn hex(bytes: &[u8]) -> String {
    bytes.iter().map(|b| format!("{b:02x}")).collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn body_hash_equals_the_value_path_and_the_stored_hash() {
        let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../certificates");
        for e in std::fs::read_dir(dir).unwrap() {
            let p = e.unwrap().path();
            if p.to_string_lossy().ends_with(".cert.json") {
                let c: crate::Certificate = serde_json::from_slice(&std::fs::read(&p).unwrap()).unwrap();
                assert_eq!(body_sha256(&c.body).unwrap(), canonical_sha256(&c.body).unwrap(), "{}", p.display());
                assert_eq!(body_sha256(&c.body).unwrap(), c.sha256);
            }
        }
    }
    #[test]
    fn escapes_and_sorts_like_rfc8785() {
        // Members sorted, no white space, control characters escaped in lower case, ⊗ as is.
        let v: serde_json::Value =
            serde_json::from_str(r#"{"b":[1,"\u0007\n\u001f\"\\"],"a⊗":{"y":-3,"x":true}}"#).unwrap();
        let bytes = serde_json::to_vec(&v).unwrap();
        assert_eq!(String::from_utf8(bytes).unwrap(), r#"{"a⊗":{"x":true,"y":-3},"b":[1,"\u0007\n\u001f\"\\"]}"#);
    }
    #[test]
    fn hash_of_known_input() {
        // SHA-256("abc"), FIPS 180-2 appendix B.1.
        assert_eq!(sha256_hex(b"abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    }
}
