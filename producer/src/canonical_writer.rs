//! RFC 8785 canonical JSON written straight from any `Serialize` value, without building a
//! `serde_json::Value` tree first: everything is streamed into one buffer, and an object whose
//! members arrived out of order (by the UTF-16 code units of their names) is rearranged in
//! place when it ends. Gives the same bytes as the checker's hash reads
//! (`tubecert_format::canonical`, tested), at a fraction of the memory for certificates of
//! millions of terms. Producer-side only: the checker keeps the simpler path.

use serde::ser::{self, Serialize};
use std::fmt::Display;

#[derive(Debug)]
pub struct Error(String);
impl Display for Error {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.0)
    }
}
impl std::error::Error for Error {}
impl ser::Error for Error {
    fn custom<T: Display>(msg: T) -> Self {
        Error(msg.to_string())
    }
}

/// The canonical bytes of a value.
pub fn to_canonical<T: Serialize + ?Sized>(value: &T) -> Result<Vec<u8>, String> {
    let mut out = Vec::new();
    append_canonical(value, &mut out)?;
    Ok(out)
}

/// Appends the canonical bytes of a value to `out`.
pub fn append_canonical<T: Serialize + ?Sized>(value: &T, out: &mut Vec<u8>) -> Result<(), String> {
    value.serialize(Writer { out }).map_err(|e| e.0)
}

struct Writer<'a> {
    out: &'a mut Vec<u8>,
}

/// A JSON string as RFC 8785 writes it: serde_json's escaping is exactly RFC 8785's; a string
/// with nothing to escape (no `"`, `\` or control character) is copied as it is.
fn string(out: &mut Vec<u8>, s: &str) {
    if s.bytes().all(|b| b >= 0x20 && b != b'"' && b != b'\\') {
        out.push(b'"');
        out.extend_from_slice(s.as_bytes());
        out.push(b'"');
    } else {
        serde_json::to_writer(out, s).expect("writing to a Vec cannot fail");
    }
}

fn integer(out: &mut Vec<u8>, v: i128) -> Result<(), Error> {
    if v.unsigned_abs() > 1 << 53 {
        return Err(Error(format!("number {v} is not an integer within ±2^53")));
    }
    std::io::Write::write_fmt(out, format_args!("{v}")).expect("writing to a Vec cannot fail");
    Ok(())
}

pub struct Seq<'a> {
    out: &'a mut Vec<u8>,
    first: bool,
    /// A tuple variant `{"name":[…]}`: close the object too.
    in_object: bool,
}

/// An object being written: its members go straight to `out`, each remembered with its name
/// and where its `"name":value` text lies, and are put in canonical order when it ends.
pub struct Object<'a> {
    out: &'a mut Vec<u8>,
    /// Where the members begin (just after the `{`).
    start: usize,
    members: Vec<(String, usize, usize)>,
    key: Option<String>,
    /// For `{"variant": {...}}`: close the outer object too.
    wrapped: bool,
}

fn utf16_order(a: &str, b: &str) -> std::cmp::Ordering {
    a.encode_utf16().cmp(b.encode_utf16())
}

impl<'a> Object<'a> {
    fn open(out: &'a mut Vec<u8>, wrap: Option<&str>) -> Object<'a> {
        if let Some(w) = wrap {
            out.push(b'{');
            string(out, w);
            out.push(b':');
        }
        out.push(b'{');
        Object { start: out.len(), out, members: Vec::new(), key: None, wrapped: wrap.is_some() }
    }

    fn member<T: Serialize + ?Sized>(&mut self, key: String, value: &T) -> Result<(), Error> {
        if !self.members.is_empty() {
            self.out.push(b',');
        }
        let begin = self.out.len();
        string(self.out, &key);
        self.out.push(b':');
        value.serialize(Writer { out: &mut *self.out })?;
        self.members.push((key, begin, self.out.len()));
        Ok(())
    }

    fn finish(mut self) -> Result<(), Error> {
        let in_order = self.members.windows(2).all(|w| utf16_order(&w[0].0, &w[1].0).is_le());
        if !in_order {
            let text = self.out.split_off(self.start);
            self.members.sort_by(|a, b| utf16_order(&a.0, &b.0));
            for (i, (_, begin, end)) in self.members.iter().enumerate() {
                if i > 0 {
                    self.out.push(b',');
                }
                self.out.extend_from_slice(&text[begin - self.start..end - self.start]);
            }
        }
        self.out.push(b'}');
        if self.wrapped {
            self.out.push(b'}');
        }
        Ok(())
    }
}

/// `fn serialize_iN(self, v: iN)` for each integer type, all through [`integer`].
macro_rules! serialize_integers {
    ($($name:ident: $ty:ty),*) => {
        $(fn $name(self, v: $ty) -> Result<(), Error> {
            integer(self.out, v as i128)
        })*
    };
}

impl<'a> ser::Serializer for Writer<'a> {
    type Ok = ();
    type Error = Error;
    type SerializeSeq = Seq<'a>;
    type SerializeTuple = Seq<'a>;
    type SerializeTupleStruct = Seq<'a>;
    type SerializeTupleVariant = Seq<'a>;
    type SerializeMap = Object<'a>;
    type SerializeStruct = Object<'a>;
    type SerializeStructVariant = Object<'a>;

    fn serialize_bool(self, v: bool) -> Result<(), Error> {
        self.out.extend_from_slice(if v { b"true" } else { b"false" });
        Ok(())
    }
    // Every integer type is written by one function.
    serialize_integers!(serialize_i8: i8, serialize_i16: i16, serialize_i32: i32, serialize_i64: i64,
        serialize_u8: u8, serialize_u16: u16, serialize_u32: u32, serialize_u64: u64);
    fn serialize_f32(self, _: f32) -> Result<(), Error> {
        Err(Error("floating-point numbers are not part of the format".into()))
    }
    fn serialize_f64(self, _: f64) -> Result<(), Error> {
        Err(Error("floating-point numbers are not part of the format".into()))
    }
    fn serialize_char(self, v: char) -> Result<(), Error> {
        string(self.out, v.encode_utf8(&mut [0; 4]));
        Ok(())
    }
    fn serialize_str(self, v: &str) -> Result<(), Error> {
        string(self.out, v);
        Ok(())
    }
    fn serialize_bytes(self, _: &[u8]) -> Result<(), Error> {
        Err(Error("byte strings are not part of the format".into()))
    }
    fn serialize_none(self) -> Result<(), Error> {
        self.out.extend_from_slice(b"null");
        Ok(())
    }
    fn serialize_some<T: Serialize + ?Sized>(self, v: &T) -> Result<(), Error> {
        v.serialize(self)
    }
    fn serialize_unit(self) -> Result<(), Error> {
        self.serialize_none()
    }
    fn serialize_unit_struct(self, _: &'static str) -> Result<(), Error> {
        self.serialize_none()
    }
    fn serialize_unit_variant(self, _: &'static str, _: u32, variant: &'static str) -> Result<(), Error> {
        self.serialize_str(variant)
    }
    fn serialize_newtype_struct<T: Serialize + ?Sized>(self, _: &'static str, v: &T) -> Result<(), Error> {
        v.serialize(self)
    }
    fn serialize_newtype_variant<T: Serialize + ?Sized>(
        self,
        _: &'static str,
        _: u32,
        variant: &'static str,
        v: &T,
    ) -> Result<(), Error> {
        let mut o = Object::open(self.out, None);
        o.member(variant.to_string(), v)?;
        o.finish()
    }
    fn serialize_seq(self, _: Option<usize>) -> Result<Seq<'a>, Error> {
        self.out.push(b'[');
        Ok(Seq { out: self.out, first: true, in_object: false })
    }
    fn serialize_tuple(self, len: usize) -> Result<Seq<'a>, Error> {
        self.serialize_seq(Some(len))
    }
    fn serialize_tuple_struct(self, _: &'static str, len: usize) -> Result<Seq<'a>, Error> {
        self.serialize_seq(Some(len))
    }
    fn serialize_tuple_variant(
        self,
        _: &'static str,
        _: u32,
        variant: &'static str,
        _: usize,
    ) -> Result<Seq<'a>, Error> {
        self.out.push(b'{');
        serde_json::to_writer(&mut *self.out, variant).map_err(|e| Error(e.to_string()))?;
        self.out.extend_from_slice(b":[");
        Ok(Seq { out: self.out, first: true, in_object: true })
    }
    fn serialize_map(self, _: Option<usize>) -> Result<Object<'a>, Error> {
        Ok(Object::open(self.out, None))
    }
    fn serialize_struct(self, _: &'static str, _: usize) -> Result<Object<'a>, Error> {
        self.serialize_map(None)
    }
    fn serialize_struct_variant(
        self,
        _: &'static str,
        _: u32,
        variant: &'static str,
        _: usize,
    ) -> Result<Object<'a>, Error> {
        Ok(Object::open(self.out, Some(variant)))
    }
}

impl ser::SerializeSeq for Seq<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_element<T: Serialize + ?Sized>(&mut self, v: &T) -> Result<(), Error> {
        if !self.first {
            self.out.push(b',');
        }
        self.first = false;
        v.serialize(Writer { out: self.out })
    }
    fn end(self) -> Result<(), Error> {
        self.out.extend_from_slice(if self.in_object { b"]}" } else { b"]" });
        Ok(())
    }
}

/// Tuples, tuple structs and tuple variants are written as sequences.
macro_rules! as_sequence {
    ($($trait:ident :: $method:ident),*) => {$(
        impl ser::$trait for Seq<'_> {
            type Ok = ();
            type Error = Error;
            fn $method<T: Serialize + ?Sized>(&mut self, v: &T) -> Result<(), Error> {
                ser::SerializeSeq::serialize_element(self, v)
            }
            fn end(self) -> Result<(), Error> {
                ser::SerializeSeq::end(self)
            }
        }
    )*};
}

as_sequence!(
    SerializeTuple::serialize_element,
    SerializeTupleStruct::serialize_field,
    SerializeTupleVariant::serialize_field
);

impl ser::SerializeMap for Object<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_key<T: Serialize + ?Sized>(&mut self, key: &T) -> Result<(), Error> {
        let v = serde_json::to_value(key).map_err(|e| Error(e.to_string()))?;
        let serde_json::Value::String(k) = v else { return Err(Error("object keys must be strings".into())) };
        self.key = Some(k);
        Ok(())
    }
    fn serialize_value<T: Serialize + ?Sized>(&mut self, v: &T) -> Result<(), Error> {
        let key = self.key.take().ok_or_else(|| Error("value without key".into()))?;
        self.member(key, v)
    }
    fn end(self) -> Result<(), Error> {
        self.finish()
    }
}

impl ser::SerializeStruct for Object<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_field<T: Serialize + ?Sized>(&mut self, key: &'static str, v: &T) -> Result<(), Error> {
        self.member(key.to_string(), v)
    }
    fn end(self) -> Result<(), Error> {
        self.finish()
    }
}

impl ser::SerializeStructVariant for Object<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_field<T: Serialize + ?Sized>(&mut self, key: &'static str, v: &T) -> Result<(), Error> {
        self.member(key.to_string(), v)
    }
    fn end(self) -> Result<(), Error> {
        self.finish()
    }
}

/// How a certificate file begins: its members in sorted order start with `body`.
const FILE_START: &[u8] = b"{\"body\":";

/// A certificate file begun: `{"body":` and the body's canonical bytes, so that the hash is
/// taken of [`body_of`] and the file finished by [`finish_file`] without writing the body twice.
pub fn start_file(body: &tubecert_format::Body) -> Result<Vec<u8>, String> {
    let mut file = FILE_START.to_vec();
    append_canonical(body, &mut file)?;
    Ok(file)
}

/// The canonical text of a body's complexes and maps, which can be written before its claims
/// exist (the prover writes it beside the search).
pub struct WrittenObjects {
    complexes: Vec<u8>,
    maps: Vec<u8>,
}

pub fn write_objects(
    complexes: &tubecert_format::UniqueMap<tubecert_format::ComplexSpec>,
    maps: &tubecert_format::UniqueMap<tubecert_format::MapSpec>,
) -> Result<WrittenObjects, String> {
    Ok(WrittenObjects { complexes: to_canonical(complexes)?, maps: to_canonical(maps)? })
}

/// [`start_file`] for a body whose complexes and maps `written` holds (written from the same
/// values): the other members written around them in canonical order, the same bytes (tested).
pub fn start_file_with(body: &tubecert_format::Body, written: &WrittenObjects) -> Result<Vec<u8>, String> {
    // Every member named, so that one added to the format cannot be left out silently.
    let tubecert_format::Body { bordered, ring, complexes: _, maps: _, claims, provenance } = body;
    let mut file = FILE_START.to_vec();
    file.reserve(written.complexes.len() + written.maps.len() + 4096);
    file.push(b'{');
    if let Some(b) = bordered {
        file.extend_from_slice(b"\"bordered\":");
        append_canonical(b, &mut file)?;
        file.push(b',');
    }
    file.extend_from_slice(b"\"claims\":");
    append_canonical(claims, &mut file)?;
    file.extend_from_slice(b",\"complexes\":");
    file.extend_from_slice(&written.complexes);
    file.extend_from_slice(b",\"maps\":");
    file.extend_from_slice(&written.maps);
    file.extend_from_slice(b",\"provenance\":");
    append_canonical(provenance, &mut file)?;
    file.extend_from_slice(b",\"ring\":");
    append_canonical(ring, &mut file)?;
    file.push(b'}');
    Ok(file)
}

/// The canonical body inside a file begun by [`start_file`].
pub fn body_of(file: &[u8]) -> &[u8] {
    &file[FILE_START.len()..]
}

/// Finishes a file begun by [`start_file`] for `cert` (whose body it holds): the other members
/// in sorted order and a newline, the same bytes as [`file_bytes`] (tested).
pub fn finish_file(mut file: Vec<u8>, cert: &tubecert_format::Certificate) -> Result<Vec<u8>, String> {
    #[derive(serde::Serialize)]
    struct Rest<'a> {
        format: &'a str,
        sha256: &'a str,
        version: u32,
    }
    let rest = to_canonical(&Rest { format: &cert.format, sha256: &cert.sha256, version: cert.version })?;
    file.push(b',');
    file.extend_from_slice(&rest[1..]);
    file.push(b'\n');
    Ok(file)
}

/// The certificate of a body whose canonical form has SHA-256 `sha256`.
pub fn certificate(body: tubecert_format::Body, sha256: String) -> tubecert_format::Certificate {
    tubecert_format::Certificate {
        format: tubecert_format::CERTIFICATE_FORMAT.into(),
        version: tubecert_format::CERTIFICATE_VERSION,
        sha256,
        body,
    }
}

/// Wraps a body with the SHA-256 of its canonical form.
pub fn seal(body: tubecert_format::Body) -> Result<tubecert_format::Certificate, String> {
    let sha256 = tubecert_format::canonical::sha256_hex(&to_canonical(&body)?);
    Ok(certificate(body, sha256))
}

/// A certificate file's bytes: its canonical form and a newline, so the same body always
/// gives the same file.
pub fn file_bytes(cert: &tubecert_format::Certificate) -> Result<Vec<u8>, String> {
    let mut out = to_canonical(cert)?;
    out.push(b'\n');
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn agrees_with_the_value_based_canonical_form() {
        for (_, p) in crate::demo::demo_problems() {
            let bytes = crate::demo::problem_bytes(&p);
            let ctx = crate::validate::validate(&p).unwrap();
            let proved = crate::prove::prove(p, &ctx, &bytes).unwrap();
            assert_eq!(proved.file, file_bytes(&proved.certificate).unwrap(), "one serialization, same file");
            let body_len = to_canonical(&proved.certificate.body).unwrap().len() as u64;
            assert!(crate::prove::written_floor(&proved.certificate.body) <= body_len, "a lower bound");
            // Names in the alphabet: a `Value` (sorted maps) written compactly is canonical.
            let expected = serde_json::to_vec(&serde_json::to_value(&proved.certificate).unwrap()).unwrap();
            assert_eq!(
                String::from_utf8(to_canonical(&proved.certificate).unwrap()).unwrap(),
                String::from_utf8(expected).unwrap()
            );
        }
        // Stored certificates, with and without a bordered section: the body written around
        // its complexes and maps written first is the same bytes.
        for name in ["cable-by-p2", "disk-pair-p2"] {
            let path = format!("{}/../certificates/{name}.cert.json", env!("CARGO_MANIFEST_DIR"));
            let cert: tubecert_format::Certificate = serde_json::from_slice(&std::fs::read(path).unwrap()).unwrap();
            let written = write_objects(&cert.body.complexes, &cert.body.maps).unwrap();
            assert_eq!(start_file_with(&cert.body, &written).unwrap(), start_file(&cert.body).unwrap(), "{name}");
        }
        // Keys whose UTF-8 and UTF-16 orders differ (U+1F600 is the surrogate pair D83D DE00,
        // before E000 in UTF-16, after it in UTF-8), and escapes.
        let v: serde_json::Value =
            serde_json::from_str(r#"{"\ue000":1,"\ud83d\ude00":[true,null,"\u0001"],"a":{"b":-3}}"#).unwrap();
        let expected = "{\"a\":{\"b\":-3},\"\u{1f600}\":[true,null,\"\\u0001\"],\"\u{e000}\":1}";
        assert_eq!(String::from_utf8(to_canonical(&v).unwrap()).unwrap(), expected);
    }
}
