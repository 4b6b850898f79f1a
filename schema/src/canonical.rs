//! RFC 8785 (JSON Canonicalization Scheme) serialization and the SHA-256 hash of a certificate
//! body. The format holds no floating-point numbers, so only integers are accepted; everything
//! else follows RFC 8785: object members sorted by the UTF-16 code units of their names, no
//! white space, strings escaped as ECMAScript's JSON.stringify does.

use serde_json::Value;
use sha2::{Digest, Sha256};
use std::io::Write;

/// Appends the canonical form of `value` to `out`.
pub fn write_canonical(value: &Value, out: &mut Vec<u8>) -> Result<(), String> {
    match value {
        Value::Null => out.extend_from_slice(b"null"),
        Value::Bool(b) => out.extend_from_slice(if *b { b"true" } else { b"false" }),
        Value::Number(n) => {
            // RFC 8785 numbers are IEEE doubles: integers beyond 2^53 would not round-trip.
            match n.as_i64() {
                Some(i) if i.unsigned_abs() <= 1 << 53 => out.extend_from_slice(i.to_string().as_bytes()),
                _ => return Err(format!("number {n} is not an integer within ±2^53")),
            }
        }
        // serde_json escapes exactly ", \, and U+0000..U+001F (short forms \b \t \n \f \r,
        // otherwise \u00xx in lower case), as RFC 8785 §3.2.2.2 requires.
        Value::String(s) => serde_json::to_writer(&mut *out, s).map_err(|e| e.to_string())?,
        Value::Array(items) => {
            out.push(b'[');
            for (i, item) in items.iter().enumerate() {
                if i > 0 {
                    out.push(b',');
                }
                write_canonical(item, out)?;
            }
            out.push(b']');
        }
        Value::Object(map) => {
            let mut keys: Vec<&String> = map.keys().collect();
            keys.sort_by(|a, b| a.encode_utf16().cmp(b.encode_utf16()));
            out.push(b'{');
            for (i, k) in keys.into_iter().enumerate() {
                if i > 0 {
                    out.push(b',');
                }
                serde_json::to_writer(&mut *out, k).map_err(|e| e.to_string())?;
                out.push(b':');
                write_canonical(&map[k], out)?;
            }
            out.push(b'}');
        }
    }
    Ok(())
}

/// Lower-case hex SHA-256 of the canonical form of any serializable value.
pub fn canonical_sha256<T: serde::Serialize>(v: &T) -> Result<String, String> {
    Ok(sha256_hex(&value(v)?))
}

/// The canonical hash of a certificate body, fast: complexes and maps (the bulk of a large
/// certificate) are written by serde directly, which is canonical for them because their
/// fields are declared in sorted order, their maps are sorted (BTreeMap, byte order) and
/// numbers are integers; byte order equals UTF-16 order unless a name has a character at or
/// above U+E000, in which case everything goes through [`write_canonical`].
pub fn body_sha256(body: &crate::Body) -> Result<String, String> {
    let odd = |n: &String| n.chars().any(|c| c >= '\u{e000}');
    let names = body.complexes.iter().flat_map(|(n, c)| std::iter::once(n).chain(c.generators.keys()));
    if names.chain(body.maps.keys()).any(odd) {
        return canonical_sha256(body);
    }
    // Streamed into the digest: no copy of a large body is held in memory.
    let mut digest = std::io::BufWriter::with_capacity(1 << 16, Sha256::new());
    write_body(body, &mut digest).map_err(|e| e.to_string())?;
    Ok(hex(&digest.into_inner().map_err(|e| e.to_string())?.finalize()))
}

/// The canonical form of a body, complexes and maps straight from serde (see [`body_sha256`]).
fn write_body(body: &crate::Body, w: &mut impl Write) -> Result<(), Box<dyn std::error::Error>> {
    w.write_all(b"{")?;
    if let Some(b) = &body.bordered {
        w.write_all(b"\"bordered\":")?;
        w.write_all(&value(b)?)?;
        w.write_all(b",")?;
    }
    w.write_all(b"\"claims\":")?;
    w.write_all(&value(&body.claims)?)?;
    w.write_all(b",\"complexes\":")?;
    serde_json::to_writer(&mut *w, &body.complexes)?;
    w.write_all(b",\"maps\":")?;
    serde_json::to_writer(&mut *w, &body.maps)?;
    w.write_all(b",\"provenance\":")?;
    w.write_all(&value(&body.provenance)?)?;
    w.write_all(b",\"ring\":")?;
    w.write_all(&value(&body.ring)?)?;
    w.write_all(b"}")?;
    Ok(())
}

/// Canonical bytes through a `Value`, for the small or irregular parts.
fn value<T: serde::Serialize>(v: &T) -> Result<Vec<u8>, String> {
    let mut out = Vec::new();
    write_canonical(&serde_json::to_value(v).map_err(|e| e.to_string())?, &mut out)?;
    Ok(out)
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
    fn fast_body_hash_equals_the_value_path() {
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
    fn sorts_by_utf16_and_escapes_like_rfc8785() {
        // U+1F600 sorts after U+E000 in UTF-8 (F0.. > EE..) but before it in UTF-16
        // (surrogate D83D < E000): RFC 8785 §3.2.3 wants the UTF-16 order.
        let v: Value = serde_json::from_str(r#"{"b":[1,"\u0007\n"],"a":{"\ud83d\ude00":1,"\ue000":2}}"#).unwrap();
        let mut out = Vec::new();
        write_canonical(&v, &mut out).unwrap();
        assert_eq!(
            String::from_utf8(out).unwrap(),
            "{\"a\":{\"\u{1f600}\":1,\"\u{e000}\":2},\"b\":[1,\"\\u0007\\n\"]}"
        );
    }
    #[test]
    fn refuses_floats() {
        let v: Value = serde_json::from_str("[1.5]").unwrap();
        assert!(write_canonical(&v, &mut Vec::new()).is_err());
    }
    #[test]
    fn hash_of_known_input() {
        // SHA-256("abc"), FIPS 180-2 appendix B.1.
        assert_eq!(sha256_hex(b"abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    }
}
