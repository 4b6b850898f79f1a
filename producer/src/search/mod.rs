//! Witness search: exact linear algebra over F2 in finite-dimensional graded pieces.
//!
//! - [`elimination`]: sparse column reduction with the Fredholm alternative;
//! - [`homotopy`]: is φ null-homotopic? (a homotopy, or a dual witness);
//! - [`torsion`]: the least k with v^k·(F + G) null-homotopic;
//! - [`normal_form`]: cancellation of arrows (graded Smith normal form; reduction);
//! - [`reduce`]: reduced models with π, ι, h, used to solve small and transport witnesses back.

pub mod elimination;
pub mod homotopy;
pub mod monomials;
pub mod normal_form;
pub mod reduce;
pub mod torsion;
