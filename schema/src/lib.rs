//! `tubecert-format`: what the producer writes and the checker reads.
//!
//! - [`model`]: the serde data model (ring, complexes, maps, map expressions, claims,
//!   witnesses, certificate);
//! - [`poly`]: monomials over F2[v_1..v_n] and their written notation;
//! - [`ring`]: the checked ring, degrees of monomials, the finiteness condition;
//! - [`canonical`]: RFC 8785 canonical JSON and the body's SHA-256;
//! - [`statement`]: the one wording of each claim;
//! - [`limits`]: size limits on input;
//! - [`names`]: the alphabet of names;
//! - [`bordered`]: the torus algebra, type D structures, type A modules, type D morphisms.
#![forbid(unsafe_code)]

pub mod bordered;
pub mod canonical;
pub mod limits;
pub mod model;
pub mod names;
pub mod poly;
pub mod ring;
pub mod statement;

pub use model::*;
pub use poly::Mono;
pub use ring::RingInfo;
