//! The torsion order of a pair of maps: the least k with v^k·(F + G) null-homotopic.
//! Null-homotopy is monotone in k, so the search brackets k by bisection and keeps the
//! witnesses at both ends of the bracket.

use super::homotopy::{HomTerm, Solver, Verdict};
use tubecert_format::MapExpr;

pub enum TorsionOutcome {
    /// ord = k: the homotopy for v^k·(F+G) and, for k ≥ 1, the dual for v^(k−1)·(F+G).
    Order { k: u32, homotopy: Vec<HomTerm>, dual: Option<Vec<HomTerm>> },
    /// v^bound·(F+G) is still not null-homotopic; the dual at the bound covers every k ≤ bound.
    NotTorsionUpTo { bound: u32, dual: Vec<HomTerm> },
}

pub fn torsion_order(solver: &Solver, f: &str, g: &str, var: &str, bound: u32) -> Result<TorsionOutcome, String> {
    let at = |k: u32| -> Result<Verdict, String> {
        solver.decide(&solver.ctx.eval(&MapExpr::scaled_difference(f, g, var, k))?)
    };
    let mut low = match at(0)? {
        Verdict::Null(h) => return Ok(TorsionOutcome::Order { k: 0, homotopy: h, dual: None }),
        Verdict::NotNull(y) => (0, y),
    };
    let mut high = match at(bound)? {
        Verdict::NotNull(y) => return Ok(TorsionOutcome::NotTorsionUpTo { bound, dual: y }),
        Verdict::Null(h) => (bound, h),
    };
    while high.0 - low.0 > 1 {
        let mid = low.0 + (high.0 - low.0) / 2;
        match at(mid)? {
            Verdict::Null(h) => high = (mid, h),
            Verdict::NotNull(y) => low = (mid, y),
        }
    }
    Ok(TorsionOutcome::Order { k: high.0, homotopy: high.1, dual: Some(low.1) })
}
