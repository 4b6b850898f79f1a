//! Sparse arithmetic in free modules over `F2[U,V]`.
//!
//! An element of a free module is a [`Vector`]: the set of its terms (generator, monomial),
//! sorted, each at most once (coefficients are in F2, so a repeated term cancels). A map is a
//! [`SparseMap`]: the image of each source generator.

use tubecert_format::Mono;

/// Σ m·g over the listed terms; sorted by (generator, monomial), no repeats.
pub type Vector = Vec<(u32, Mono)>;

/// Sorts and cancels repeated terms in pairs (addition mod 2); for any kind of term.
pub fn normalize<T: Ord + Copy>(v: &mut Vec<T>) {
    v.sort_unstable();
    // A stack: a term equal to the one on top cancels it (sorted, so equal terms are adjacent).
    let mut out = 0;
    for i in 0..v.len() {
        if out > 0 && v[out - 1] == v[i] {
            out -= 1;
        } else {
            v[out] = v[i];
            out += 1;
        }
    }
    v.truncate(out);
}

/// The error raised when a product's exponent passes the limit.
pub fn overflow() -> String {
    format!("exponent overflow (beyond {})", tubecert_format::limits::MAX_EXPONENT)
}

/// Appends m·v to `acc` (unnormalized).
pub fn push_scaled(acc: &mut Vector, m: Mono, v: &[(u32, Mono)]) -> Result<(), String> {
    for &(g, n) in v {
        acc.push((g, m.checked_mul(n).ok_or_else(overflow)?));
    }
    Ok(())
}

/// A homogeneous R-linear map given by the image of each source generator.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SparseMap {
    pub rows: Vec<Vector>,
}

impl SparseMap {
    pub fn zero(n: usize) -> SparseMap {
        SparseMap { rows: vec![Vec::new(); n] }
    }

    pub fn identity(n: usize) -> SparseMap {
        SparseMap { rows: (0..n as u32).map(|i| vec![(i, Mono::ONE)]).collect() }
    }

    /// The image of a vector.
    pub fn apply(&self, v: &[(u32, Mono)]) -> Result<Vector, String> {
        let mut acc = Vec::new();
        self.apply_into(v, &mut acc)?;
        Ok(acc)
    }

    /// The image of a vector, written into `acc` (cleared first): reuses one buffer in loops.
    pub fn apply_into(&self, v: &[(u32, Mono)], acc: &mut Vector) -> Result<(), String> {
        acc.clear();
        for &(g, m) in v {
            push_scaled(acc, m, &self.rows[g as usize])?;
        }
        normalize(acc);
        Ok(())
    }

    /// `self ∘ inner`.
    pub fn after(&self, inner: &SparseMap) -> Result<SparseMap, String> {
        Ok(SparseMap { rows: inner.rows.iter().map(|r| self.apply(r)).collect::<Result<_, _>>()? })
    }

    pub fn plus(&self, other: &SparseMap) -> SparseMap {
        let sum = |(a, b): (&Vector, &Vector)| {
            let mut v: Vector = a.iter().chain(b).copied().collect();
            normalize(&mut v);
            v
        };
        SparseMap { rows: self.rows.iter().zip(&other.rows).map(sum).collect() }
    }

    pub fn times(&self, m: Mono) -> Result<SparseMap, String> {
        // Multiplying by a monomial keeps terms distinct and sorted.
        let row = |r: &Vector| {
            r.iter().map(|&(g, n)| Ok((g, m.checked_mul(n).ok_or_else(overflow)?))).collect::<Result<_, String>>()
        };
        Ok(SparseMap { rows: self.rows.iter().map(row).collect::<Result<_, _>>()? })
    }

    /// Rows and terms: the work of copying the map.
    pub fn size(&self) -> u64 {
        self.rows.iter().fold(0u64, |n, r| n.saturating_add(1 + r.len() as u64))
    }

    /// The work of `self ∘ inner` (and the most terms it can have): one per row, plus for each
    /// term of `inner` the length of the row of `self` it reaches.
    pub fn work_after(&self, inner: &SparseMap) -> u64 {
        let row = |r: &Vector| r.iter().fold(1u64, |n, &(y, _)| n.saturating_add(self.rows[y as usize].len() as u64));
        inner.rows.iter().fold(0u64, |n, r| n.saturating_add(row(r)))
    }

    /// For each target generator marked in `wanted`, the (source, monomial) terms that reach it.
    pub fn incoming_to(&self, wanted: &[bool]) -> Vec<Vector> {
        let mut inc = vec![Vec::new(); wanted.len()];
        for (x, r) in self.rows.iter().enumerate() {
            for &(y, m) in r.iter().filter(|t| wanted[t.0 as usize]) {
                inc[y as usize].push((x as u32, m));
            }
        }
        inc
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn addition_cancels_in_pairs() {
        let u = Mono([1, 0]);
        let mut v = vec![(2, u), (1, Mono::ONE), (2, u), (2, u)];
        normalize(&mut v);
        assert_eq!(v, vec![(1, Mono::ONE), (2, u)]);
    }
    #[test]
    fn composition_multiplies_coefficients() {
        let u = Mono([1, 0]);
        let f = SparseMap { rows: vec![vec![(0, u), (1, Mono::ONE)]] };
        let g = SparseMap { rows: vec![vec![(0, u)], vec![(0, Mono([2, 0]))]] };
        // g(f(x)) = U·U·y + U^2·y = 0.
        assert_eq!(g.after(&f).unwrap().rows, vec![vec![]]);
    }
}
