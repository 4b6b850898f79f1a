//! Bordered objects over the torus algebra A(T²) (LOT §11.1): the algebra's elements and
//! products, and the serde model of type D structures, type A modules and type D morphisms
//! (certificate format version 2 and later; layout in DEVELOPERS.md, "Bordered objects: layout").

use crate::model::{ComplexSpec, Grading, MapSpec, Ring, Term, UniqueMap};
use serde::{Deserialize, Serialize};

/// An element of A(T²) in a term: the idempotent of the context (`"1"`), or the Reeb element
/// ρ_I of the interval I = [lo, hi] ⊂ {1, 2, 3}.
#[derive(Copy, Clone, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Alg {
    One,
    Reeb(u8, u8),
}

const NAMES: [(&str, Alg); 7] = [
    ("1", Alg::One),
    ("rho1", Alg::Reeb(1, 1)),
    ("rho2", Alg::Reeb(2, 2)),
    ("rho3", Alg::Reeb(3, 3)),
    ("rho12", Alg::Reeb(1, 2)),
    ("rho23", Alg::Reeb(2, 3)),
    ("rho123", Alg::Reeb(1, 3)),
];

impl Alg {
    pub fn parse(s: &str) -> Result<Alg, String> {
        NAMES.iter().find(|n| n.0 == s).map(|n| n.1).ok_or_else(|| {
            format!("\"{s}\" is not an element of the torus algebra (1, rho1, rho2, rho3, rho12, rho23, rho123)")
        })
    }

    pub fn name(self) -> &'static str {
        NAMES.iter().find(|n| n.1 == self).map_or("?", |n| n.0)
    }

    /// (left, right) idempotent of a Reeb element: ρ1 = ι0ρ1ι1, ρ2 = ι1ρ2ι0, ρ3 = ι0ρ3ι1, so
    /// `ρ_[lo,hi]` starts in ι_((lo−1) mod 2) and ends in ι_(hi mod 2). `None` for the idempotent.
    pub fn idempotents(self) -> Option<(u8, u8)> {
        let Alg::Reeb(lo, hi) = self else { return None };
        Some(((lo - 1) % 2, hi % 2))
    }

    /// The product, `None` when it is zero: ρ_I·ρ_J = ρ_(I∪J) when J starts where I ends
    /// (ρ1ρ2 = ρ12, ρ2ρ3 = ρ23, ρ1ρ23 = ρ12ρ3 = ρ123), otherwise 0. Idempotents act as 1
    /// (the caller has matched them).
    pub fn times(self, other: Alg) -> Option<Alg> {
        match (self, other) {
            (Alg::One, x) | (x, Alg::One) => Some(x),
            (Alg::Reeb(a, b), Alg::Reeb(c, d)) => (c == b + 1).then_some(Alg::Reeb(a, d)),
        }
    }
}

/// A generator of a type D structure: its idempotent (0 or 1) and, optionally, its grading
/// (version 2: [Maslov, Alexander]; version 3: an element of the grading group, [2j, 2p, 2q, 2a]).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DGenerator {
    #[serde(default, skip_serializing_if = "Option::is_none", deserialize_with = "crate::model::present")]
    pub grading: Option<Grading>,
    pub idempotent: u8,
}

/// A type D structure: δ¹ as terms `[y, a, y′]` (a ⊗ y′ is a summand of δ¹(y)).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TypeDSpec {
    pub differential: Vec<Term>,
    pub generators: UniqueMap<DGenerator>,
    /// Version 3: the grading of the generator of the periodic domains (P_D = its powers).
    #[serde(default, skip_serializing_if = "Option::is_none", deserialize_with = "crate::model::present")]
    pub period: Option<Grading>,
}

/// A generator of a type A module (grading: version 2 [Maslov, Alexander], version 3 [2j, 2p, 2q, 2a]).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct AGenerator {
    pub grading: Grading,
    pub idempotent: u8,
}

/// A family of operations: m(from, prefix, repeat^n, suffix) ∋ U^(a·n + b)·to for every n ≥ 0,
/// with `power` = [a, b] (only n = 0 when `repeat` is empty).
#[derive(Clone, Debug, PartialEq, Eq, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Family {
    pub from: String,
    pub power: [u32; 2],
    pub prefix: Vec<String>,
    pub repeat: Vec<String>,
    pub suffix: Vec<String>,
    pub to: String,
}

/// A strictly unital right type A module over A(T²) with coefficients in `F2[U]`.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TypeASpec {
    pub generators: UniqueMap<AGenerator>,
    pub operations: Vec<Family>,
    /// Version 3: the grading of the generator of the periodic domains (P_A = its powers).
    #[serde(default, skip_serializing_if = "Option::is_none", deserialize_with = "crate::model::present")]
    pub period: Option<Grading>,
}

/// A type D morphism f: N → A(T²) ⊗ N′, terms `[y, a, y′]`.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MorphismSpec {
    pub from: String,
    pub terms: Vec<Term>,
    pub to: String,
}

/// The bordered part of a body (format version 2 and later).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Bordered {
    pub full_complexes: UniqueMap<ComplexSpec>,
    /// Maps between full complexes (a change of basis and its inverse), absent when empty.
    #[serde(default, skip_serializing_if = "std::collections::BTreeMap::is_empty", deserialize_with = "some_maps")]
    pub full_maps: UniqueMap<MapSpec>,
    pub full_ring: Ring,
    pub type_a_modules: UniqueMap<TypeASpec>,
    pub type_d_morphisms: UniqueMap<MorphismSpec>,
    pub type_d_structures: UniqueMap<TypeDSpec>,
}

/// An empty `full_maps` is left out, never written `{}`: else two bodies would share a hash.
fn some_maps<'de, D: serde::Deserializer<'de>>(d: D) -> Result<UniqueMap<MapSpec>, D::Error> {
    let maps = UniqueMap::<MapSpec>::deserialize(d)?;
    match maps.is_empty() {
        true => Err(serde::de::Error::custom("`full_maps` is left out when there are none, never written {}")),
        false => Ok(maps),
    }
}

/// `F2[U,V]` with (gr_U, gr_V), deg U = (−2, 0), deg V = (0, −2), deg ∂ = (−1, −1).
pub fn full_ring() -> Ring {
    Ring {
        variables: vec!["U".into(), "V".into()],
        gradings: vec!["gr_U".into(), "gr_V".into()],
        variable_degrees: UniqueMap([("U".to_string(), vec![-2, 0]), ("V".to_string(), vec![0, -2])].into()),
        differential_degree: vec![-1, -1],
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    const ALL: [Alg; 7] = [
        Alg::One,
        Alg::Reeb(1, 1),
        Alg::Reeb(2, 2),
        Alg::Reeb(3, 3),
        Alg::Reeb(1, 2),
        Alg::Reeb(2, 3),
        Alg::Reeb(1, 3),
    ];

    /// (left, right) idempotent, the idempotent ι_i as (i, i).
    fn ends(a: Alg, i: u8) -> (u8, u8) {
        a.idempotents().unwrap_or((i, i))
    }

    #[test]
    fn idempotents_and_products_are_those_of_lot_section_11_1() {
        // LOT §11.1 (memory): ρ1 = ι0ρ1ι1, ρ2 = ι1ρ2ι0, ρ3 = ι0ρ3ι1.
        let p = |s: &str| Alg::parse(s).unwrap();
        assert_eq!(p("rho1").idempotents(), Some((0, 1)));
        assert_eq!(p("rho2").idempotents(), Some((1, 0)));
        assert_eq!(p("rho3").idempotents(), Some((0, 1)));
        assert_eq!(p("rho12").idempotents(), Some((0, 0)));
        assert_eq!(p("rho23").idempotents(), Some((1, 1)));
        assert_eq!(p("rho123").idempotents(), Some((0, 1)));
        // The non-zero products of two Reeb elements are exactly these four (LOT §11.1, memory).
        let mut nonzero = Vec::new();
        for a in &ALL[1..] {
            for b in &ALL[1..] {
                if let Some(c) = a.times(*b) {
                    nonzero.push(format!("{}·{}={}", a.name(), b.name(), c.name()));
                }
            }
        }
        nonzero.sort();
        assert_eq!(nonzero, ["rho12·rho3=rho123", "rho1·rho23=rho123", "rho1·rho2=rho12", "rho2·rho3=rho23"]);
        for a in ALL {
            assert_eq!(Alg::parse(a.name()), Ok(a));
        }
        assert!(Alg::parse("rho13").is_err());
    }

    #[test]
    fn the_algebra_is_associative_and_products_respect_idempotents() {
        // Every triple of elements with matching idempotents (each idempotent ι0, ι1 included).
        for i in 0..2u8 {
            for a in ALL {
                for b in ALL {
                    for c in ALL {
                        let (a0, a1) = ends(a, i);
                        let (b0, b1) = ends(b, a1);
                        let (c0, _) = ends(c, b1);
                        if a0 != i || b0 != a1 || c0 != b1 {
                            continue;
                        }
                        let left = a.times(b).and_then(|ab| ab.times(c));
                        let right = b.times(c).and_then(|bc| a.times(bc));
                        assert_eq!(
                            left,
                            right,
                            "({}·{})·{} vs {}·({}·{})",
                            a.name(),
                            b.name(),
                            c.name(),
                            a.name(),
                            b.name(),
                            c.name()
                        );
                        // A non-zero product goes from the left idempotent of a to the right one of b.
                        if let Some(ab) = a.times(b) {
                            assert_eq!(ends(ab, i), (a0, b1));
                        }
                    }
                }
            }
        }
    }
}
