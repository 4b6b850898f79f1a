//! The serde data model of certificates (and of the complexes and maps that problem files
//! share with them). Unknown fields are refused everywhere and duplicate object keys are an
//! error, so the typed value is a faithful copy of the file and its canonical hash is the hash
//! of what the file says.

use crate::limits::{MAX_EXPR_DEPTH, MAX_EXPR_NODES, MAX_NAME_LEN};
use serde::de::{self, Deserializer, MapAccess, Visitor};
use serde::{Deserialize, Serialize};
use std::collections::BTreeMap;
use std::fmt;

/// A grading vector, one integer per declared grading.
pub type Grading = Vec<i64>;

/// A sparse term `[from, coefficient, to]`: the map sends `from` to `coefficient · to`.
/// In a dual witness the middle entry is a single monomial.
pub type Term = [String; 3];

/// A JSON object whose keys must be distinct (serde_json would silently keep the last).
#[derive(Clone, Debug, Default, PartialEq, Eq, Serialize)]
#[serde(transparent)]
pub struct UniqueMap<V>(pub BTreeMap<String, V>);

impl<V> std::ops::Deref for UniqueMap<V> {
    type Target = BTreeMap<String, V>;
    fn deref(&self) -> &Self::Target {
        &self.0
    }
}

impl<'de, V: Deserialize<'de>> Deserialize<'de> for UniqueMap<V> {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        d.deserialize_map(UniqueMap(BTreeMap::new()))
    }
}

/// The map read so far is the visitor: each key is checked before its value is read.
impl<'de, V: Deserialize<'de>> Visitor<'de> for UniqueMap<V> {
    type Value = Self;
    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("an object with distinct keys")
    }
    fn visit_map<A: MapAccess<'de>>(mut self, mut a: A) -> Result<Self, A::Error> {
        while let Some(k) = a.next_key::<String>()? {
            if k.len() > MAX_NAME_LEN {
                let shown = &k[..k.char_indices().nth(20).map_or(k.len(), |c| c.0)];
                return Err(de::Error::custom(format!("name \"{shown}…\" is longer than {MAX_NAME_LEN} bytes")));
            }
            if self.0.contains_key(&k) {
                return Err(de::Error::custom(format!("duplicate name \"{k}\"")));
            }
            self.0.insert(k, a.next_value()?);
        }
        Ok(self)
    }
}

/// The ground ring F2[v_1..v_n] with its gradings.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Ring {
    pub variables: Vec<String>,
    pub gradings: Vec<String>,
    pub variable_degrees: UniqueMap<Grading>,
    pub differential_degree: Grading,
}

/// A free complex: named generators with gradings, and the differential as sparse terms.
/// (Fields in sorted order, so serde's output is already canonical: see [`crate::canonical`].)
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ComplexSpec {
    pub differential: Vec<Term>,
    pub generators: UniqueMap<Grading>,
}

/// An R-linear map between two declared complexes, homogeneous of `degree`.
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MapSpec {
    // Fields in sorted order, as in `ComplexSpec`.
    pub degree: Grading,
    pub from: String,
    pub terms: Vec<Term>,
    pub to: String,
}

/// A map expression: `"F"`, `{"id": C}`, `{"sum": [...]}`, `{"compose": [outer, ..., inner]}`,
/// `{"times": [monomial, e]}`.
/// Serialized by the derive (a name as a bare string, the rest as one-key objects); read by
/// `ExprVisitor`, which names what is wrong, then bounded in nesting and size.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum MapExpr {
    Id(String),
    Sum(Vec<MapExpr>),
    Compose(Vec<MapExpr>),
    Times(String, Box<MapExpr>),
    #[serde(untagged)]
    Named(String),
}

impl MapExpr {
    /// v^k·(F + G), the map whose null-homotopy class a torsion order is about.
    pub fn scaled_difference(f: &str, g: &str, var: &str, k: u32) -> MapExpr {
        let sum = MapExpr::Sum(vec![MapExpr::Named(f.into()), MapExpr::Named(g.into())]);
        match k {
            0 => sum,
            1 => MapExpr::Times(var.into(), Box::new(sum)),
            _ => MapExpr::Times(format!("{var}^{k}"), Box::new(sum)),
        }
    }

    /// Number of names and operations, and depth of nesting (0 for a name).
    fn extent(&self) -> (usize, usize) {
        let parts: &[MapExpr] = match self {
            MapExpr::Named(_) | MapExpr::Id(_) => &[],
            MapExpr::Sum(es) | MapExpr::Compose(es) => es,
            MapExpr::Times(_, e) => std::slice::from_ref(&**e),
        };
        parts.iter().map(MapExpr::extent).fold((1, 0), |(n, d), (m, e)| (n + m, d.max(e + 1)))
    }
}

impl<'de> Deserialize<'de> for MapExpr {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        d.deserialize_any(ExprVisitor)
    }
}

/// Reads a map expression from the file itself (not through a `Value`, which would silently
/// keep the last of a repeated key): an operation is an object with exactly one key.
struct ExprVisitor;

impl<'de> Visitor<'de> for ExprVisitor {
    type Value = MapExpr;
    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a map name or a one-key object (id, sum, compose, times)")
    }
    fn visit_str<E: de::Error>(self, s: &str) -> Result<MapExpr, E> {
        Ok(MapExpr::Named(s.into()))
    }
    fn visit_map<A: MapAccess<'de>>(self, mut a: A) -> Result<MapExpr, A::Error> {
        let fail = |e: String| Err(de::Error::custom(e));
        let Some(op) = a.next_key::<String>()? else { return Err(de::Error::invalid_length(0, &self)) };
        let e = match op.as_str() {
            "id" => MapExpr::Id(a.next_value()?),
            "times" => a.next_value().map(|(m, e)| MapExpr::Times(m, e))?,
            "sum" => MapExpr::Sum(a.next_value()?),
            "compose" => MapExpr::Compose(a.next_value()?),
            _ => return fail(format!("unknown map operation \"{op}\" (expected id, sum, compose or times)")),
        };
        match a.next_key::<String>()? {
            Some(k) if k == op => return fail(format!("the key \"{op}\" is written twice in one map operation")),
            Some(k) => return fail(format!("a map operation is a one-key object, found \"{op}\" and \"{k}\"")),
            None => {}
        }
        // One part would print like its own part (or a bracketed one): statements must read
        // back as one expression. Each nested expression is bounded when it is read; the file's
        // own nesting limit (serde_json's) bounds the recursion before that.
        let few = matches!(&e, MapExpr::Sum(es) | MapExpr::Compose(es) if es.len() < 2);
        match e.extent() {
            _ if few => fail(format!("\"{op}\" takes at least two map expressions")),
            (_, depth) if depth > MAX_EXPR_DEPTH => fail(format!("map expression nested deeper than {MAX_EXPR_DEPTH}")),
            (n, _) if n > MAX_EXPR_NODES => fail(format!("map expression has more than {MAX_EXPR_NODES} parts")),
            _ => Ok(e),
        }
    }
}

/// An optional field that, when written, holds a value: `null` is refused, as in the JSON
/// Schema (RFC 8785 would hash `"dual": null`, unlike an absent field, so reading it as absent
/// would make the hash differ from the file's).
pub(crate) fn present<'de, D: Deserializer<'de>, T: Deserialize<'de>>(d: D) -> Result<Option<T>, D::Error> {
    T::deserialize(d).map(Some)
}

/// Witness of a null-homotopy: φ = ∂H + H∂.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct HomotopyWitness {
    pub homotopy: Vec<Term>,
}

/// Witness of non-null-homotopy: a functional y on Hom(C, D), triples `[x, monomial, w]`.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DualWitness {
    pub dual: Vec<Term>,
}

/// Witness of a homotopy equivalence f: C → D, g: D → C.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct EquivalenceWitness {
    /// H_C with g∘f + id_C = ∂H_C + H_C∂.
    pub source_homotopy: Vec<Term>,
    /// H_D with f∘g + id_D = ∂H_D + H_D∂.
    pub target_homotopy: Vec<Term>,
}

/// Witness of a homology computation: a new homogeneous basis (named generators with
/// gradings), `basis` expressing each new vector in the old generators (terms new → c·old) and
/// `inverse` expressing each old generator in the new basis (terms old → c·new).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BasisWitness {
    pub generators: UniqueMap<Grading>,
    pub basis: Vec<Term>,
    pub inverse: Vec<Term>,
}

/// Witness of the absolute Maslov grading of a box tensor product X (version 5): a cycle of
/// X/(U − 1), homogeneous in M − 2A, and a cocycle pairing with it to 1, each written as the
/// set of generators it sums (see `tubecheck::maslov`).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct HatWitness {
    pub cocycle: Vec<String>,
    pub cycle: Vec<String>,
}

/// The witnesses of the source (M ⊠ N) and target (M ⊠ N′) of id_M ⊠ f (version 5).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MapHatWitness {
    pub from: HatWitness,
    pub to: HatWitness,
}

/// Witness of a torsion order: the homotopy for v^k·(F+G), the dual for v^(k−1)·(F+G).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TorsionWitness {
    pub homotopy: Vec<Term>,
    #[serde(default, skip_serializing_if = "Option::is_none", deserialize_with = "present")]
    pub dual: Option<Vec<Term>>,
}

/// One claim of a certificate. `statement` must equal [`crate::statement::render`] of the
/// claim, so the words a reader sees are exactly what the checker verified.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case", deny_unknown_fields)]
pub enum Claim {
    Complex {
        complex: String,
        statement: String,
    },
    ChainMap {
        map: String,
        statement: String,
    },
    NullHomotopic {
        map: MapExpr,
        statement: String,
        witness: HomotopyWitness,
    },
    NotNullHomotopic {
        map: MapExpr,
        statement: String,
        witness: DualWitness,
    },
    HomotopyEquivalence {
        /// `[f, g]` with f: C → D and g: D → C.
        maps: [String; 2],
        statement: String,
        witness: EquivalenceWitness,
    },
    Homology {
        complex: String,
        /// Gradings of the free summands' generators, sorted.
        free: Vec<Grading>,
        /// `[k, grading]` for each summand R/(v^k), k ≥ 1, sorted.
        torsion: Vec<(u32, Grading)>,
        statement: String,
        witness: BasisWitness,
    },
    TorsionOrder {
        maps: [String; 2],
        variable: String,
        order: u32,
        /// The maps are read as maps induced by surfaces (adds the stabilization reading).
        surfaces: bool,
        statement: String,
        witness: TorsionWitness,
    },
    /// The torsion order of a complex: the largest k with R/(v^k) a summand of H_*(C).
    TorsionOrderOfComplex {
        complex: String,
        variable: String,
        order: u32,
        statement: String,
        witness: BasisWitness,
    },
    /// τ = −A(generator of the free part), for a complex whose homology has free rank one.
    Tau {
        complex: String,
        /// Name of the Alexander grading among the ring's gradings.
        alexander: String,
        tau: i64,
        statement: String,
        witness: BasisWitness,
    },
    /// (μ ⊗ id)(id ⊗ δ¹)δ¹ = 0 and the idempotents match.
    TypeDStructure {
        statement: String,
        structure: String,
    },
    /// The A∞ relations on every input word of length ≤ `max_length`.
    TypeAModule {
        max_length: u32,
        module: String,
        statement: String,
    },
    /// A type D morphism f with ∂f = 0.
    TypeDMorphism {
        morphism: String,
        statement: String,
    },
    /// A complex of the body equals M ⊠ N.
    BoxTensor {
        complex: String,
        module: String,
        statement: String,
        structure: String,
        /// Version 5 (required there, absent before): the Maslov normalization's witness.
        #[serde(default, deserialize_with = "present", skip_serializing_if = "Option::is_none")]
        witness: Option<HatWitness>,
    },
    /// A map of the body equals id_M ⊠ f.
    BoxTensorMap {
        map: String,
        module: String,
        morphism: String,
        statement: String,
        /// Version 5 (required there, absent before): the witnesses of its source and target.
        #[serde(default, deserialize_with = "present", skip_serializing_if = "Option::is_none")]
        witness: Option<MapHatWitness>,
    },
    /// A type D structure is the one LOT Thm 11.26 gives for a full complex and a framing.
    Complement {
        /// Written (as true) when the structure is the bounded model (see `statement::render`).
        #[serde(default, deserialize_with = "present", skip_serializing_if = "Option::is_none")]
        bounded_model: Option<bool>,
        complex: String,
        framing: i64,
        statement: String,
        structure: String,
        tau: i64,
    },
}

impl Claim {
    /// The `kind` member (serde's tag) and the statement, in one match.
    fn parts(&self) -> (&'static str, &str) {
        match self {
            Claim::Complex { statement, .. } => ("complex", statement),
            Claim::ChainMap { statement, .. } => ("chain_map", statement),
            Claim::NullHomotopic { statement, .. } => ("null_homotopic", statement),
            Claim::NotNullHomotopic { statement, .. } => ("not_null_homotopic", statement),
            Claim::HomotopyEquivalence { statement, .. } => ("homotopy_equivalence", statement),
            Claim::Homology { statement, .. } => ("homology", statement),
            Claim::TorsionOrder { statement, .. } => ("torsion_order", statement),
            Claim::TorsionOrderOfComplex { statement, .. } => ("torsion_order_of_complex", statement),
            Claim::Tau { statement, .. } => ("tau", statement),
            Claim::TypeDStructure { statement, .. } => ("type_d_structure", statement),
            Claim::TypeAModule { statement, .. } => ("type_a_module", statement),
            Claim::TypeDMorphism { statement, .. } => ("type_d_morphism", statement),
            Claim::BoxTensor { statement, .. } => ("box_tensor", statement),
            Claim::BoxTensorMap { statement, .. } => ("box_tensor_map", statement),
            Claim::Complement { statement, .. } => ("complement", statement),
        }
    }

    pub fn kind(&self) -> &'static str {
        self.parts().0
    }

    pub fn statement(&self) -> &str {
        self.parts().1
    }
}

/// Where a certificate came from. No timestamps or paths: the body must be reproducible.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Provenance {
    pub problem_sha256: String,
    pub producer: String,
}

/// The hashed part of a certificate. Serde writes it in its canonical form (see
/// [`crate::canonical`]): fields in sorted order, the parts whose own fields are not (the
/// claims, whose `kind` comes first, and the rings) written through a sorted `Value`.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Body {
    /// Version 2 and later: complexes over `F2[U,V]` and the bordered objects (`null` is refused).
    #[serde(default, deserialize_with = "present", skip_serializing_if = "Option::is_none")]
    #[serde(serialize_with = "crate::canonical::sorted")]
    pub bordered: Option<crate::bordered::Bordered>,
    #[serde(serialize_with = "crate::canonical::sorted")]
    pub claims: Vec<Claim>,
    pub complexes: UniqueMap<ComplexSpec>,
    pub maps: UniqueMap<MapSpec>,
    pub provenance: Provenance,
    #[serde(serialize_with = "crate::canonical::sorted")]
    pub ring: Ring,
}

pub const CERTIFICATE_FORMAT: &str = "tubecert-certificate";
/// The version written. Version 2 names τ's grading, brackets composites inside a composition
/// and may hold a `bordered` section; version-1 certificates are still read, with version 1's
/// wording (and without a `bordered` section). Version 3 grades bordered objects by elements
/// of LOT's grading group (`period` members, four-entry gradings); version-2 bordered sections
/// are still read with version 2's rule (gradings added). Version 4 normalizes the gradings of
/// a box tensor product by the symmetry of its graded Euler characteristic (version-3
/// certificates keep version 3's reading and wording). Version 5 certifies the Maslov part of
/// that normalization (`witness` of `box_tensor` and `box_tensor_map`: HF-hat(S³) ≅ F2 in
/// degree 0); version-4 certificates are read as before, and reported as normalized by
/// convention.
pub const CERTIFICATE_VERSION: u32 = 5;

/// A certificate file: `{"format", "version", "sha256", "body"}`.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Certificate {
    pub format: String,
    pub version: u32,
    pub sha256: String,
    pub body: Body,
}
