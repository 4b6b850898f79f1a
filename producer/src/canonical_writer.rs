//! RFC 8785 canonical JSON written straight from any `Serialize` value, without building a
//! `serde_json::Value` tree first: object members are buffered per object and sorted by the
//! UTF-16 code units of their names, everything else is streamed. Gives the same bytes as
//! `tubecert_format::canonical::write_canonical` (tested), at a fraction of the memory for
//! certificates of millions of terms. Producer-side only: the checker keeps the simpler path.

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
    value.serialize(Writer { out: &mut out }).map_err(|e| e.0)?;
    Ok(out)
}

struct Writer<'a> {
    out: &'a mut Vec<u8>,
}

fn string(out: &mut Vec<u8>, s: &str) {
    serde_json::to_writer(out, s).expect("writing to a Vec cannot fail");
}

fn integer(out: &mut Vec<u8>, v: i128) -> Result<(), Error> {
    if v.unsigned_abs() > 1 << 53 {
        return Err(Error(format!("number {v} is not an integer within ±2^53")));
    }
    out.extend_from_slice(v.to_string().as_bytes());
    Ok(())
}

pub struct Seq<'a> {
    out: &'a mut Vec<u8>,
    first: bool,
    /// A tuple variant `{"name":[…]}`: close the object too.
    in_object: bool,
}

/// Members of one object, sorted when it ends.
pub struct Object<'a> {
    out: &'a mut Vec<u8>,
    members: Vec<(String, Vec<u8>)>,
    key: Option<String>,
    /// For `{"variant": {...}}`: the outer name.
    wrap: Option<&'static str>,
}

impl Object<'_> {
    fn member<T: Serialize + ?Sized>(&mut self, key: String, value: &T) -> Result<(), Error> {
        let mut buf = Vec::new();
        value.serialize(Writer { out: &mut buf })?;
        self.members.push((key, buf));
        Ok(())
    }

    fn finish(mut self) -> Result<(), Error> {
        self.members.sort_by(|a, b| a.0.encode_utf16().cmp(b.0.encode_utf16()));
        if let Some(w) = self.wrap {
            self.out.push(b'{');
            string(self.out, w);
            self.out.push(b':');
        }
        self.out.push(b'{');
        for (i, (k, v)) in self.members.iter().enumerate() {
            if i > 0 {
                self.out.push(b',');
            }
            string(self.out, k);
            self.out.push(b':');
            self.out.extend_from_slice(v);
        }
        self.out.push(b'}');
        if self.wrap.is_some() {
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
        let mut o = Object { out: self.out, members: Vec::new(), key: None, wrap: None };
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
        Ok(Object { out: self.out, members: Vec::new(), key: None, wrap: None })
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
        Ok(Object { out: self.out, members: Vec::new(), key: None, wrap: Some(variant) })
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

/// Wraps a body with the SHA-256 of its canonical form.
pub fn seal(body: tubecert_format::Body) -> Result<tubecert_format::Certificate, String> {
    seal_sized(body).map(|(c, _)| c)
}

/// [`seal`], and the size of the canonical body: a lower bound on the file's size, hence on
/// the work the checker allows it (`limits::work_limit`).
pub fn seal_sized(body: tubecert_format::Body) -> Result<(tubecert_format::Certificate, u64), String> {
    let canonical = to_canonical(&body)?;
    let sha256 = tubecert_format::canonical::sha256_hex(&canonical);
    let size = canonical.len() as u64;
    let certificate = tubecert_format::Certificate {
        format: tubecert_format::CERTIFICATE_FORMAT.into(),
        version: tubecert_format::CERTIFICATE_VERSION,
        sha256,
        body,
    };
    Ok((certificate, size))
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
            let cert = crate::prove::prove(p, &ctx, &bytes).unwrap().certificate;
            let mut expected = Vec::new();
            tubecert_format::canonical::write_canonical(&serde_json::to_value(&cert).unwrap(), &mut expected).unwrap();
            assert_eq!(String::from_utf8(to_canonical(&cert).unwrap()).unwrap(), String::from_utf8(expected).unwrap());
        }
        // Keys whose UTF-8 and UTF-16 orders differ, and escapes.
        let v: serde_json::Value =
            serde_json::from_str(r#"{"\ue000":1,"\ud83d\ude00":[true,null,"\u0001"],"a":{"b":-3}}"#).unwrap();
        let mut expected = Vec::new();
        tubecert_format::canonical::write_canonical(&v, &mut expected).unwrap();
        assert_eq!(to_canonical(&v).unwrap(), expected);
    }
}
