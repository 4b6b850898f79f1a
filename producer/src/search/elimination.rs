//! Sparse Gaussian elimination over F2 on columns, as in persistent homology: each reduced
//! column is keyed by its lowest (largest) row, and remembers which original columns it sums.
//! Solving A·h = φ then either expresses φ through original columns, or yields a row vector y
//! with y·A = 0 and y·φ = 1 (the Fredholm alternative), found by back-substitution.

use std::collections::HashMap;

/// Symmetric difference of two sorted lists (addition of F2 vectors).
pub fn xor_sorted(a: &[u32], b: &[u32]) -> Vec<u32> {
    let mut out = Vec::with_capacity(a.len() + b.len());
    let (mut i, mut j) = (0, 0);
    while i < a.len() && j < b.len() {
        match a[i].cmp(&b[j]) {
            std::cmp::Ordering::Less => {
                out.push(a[i]);
                i += 1;
            }
            std::cmp::Ordering::Greater => {
                out.push(b[j]);
                j += 1;
            }
            std::cmp::Ordering::Equal => {
                i += 1;
                j += 1;
            }
        }
    }
    out.extend_from_slice(&a[i..]);
    out.extend_from_slice(&b[j..]);
    out
}

#[derive(Default)]
pub struct ColumnReducer {
    cols: Vec<Vec<u32>>,
    combos: Vec<Vec<u32>>,
    pivot_of_row: HashMap<u32, u32>,
}

/// Either a combination of original columns summing to the target, or a separating functional.
pub enum Solution {
    Combination(Vec<u32>),
    Functional(Vec<u32>),
}

impl ColumnReducer {
    /// Reduces `v` against the stored columns; returns the residual and the original columns used.
    fn reduce(&self, mut v: Vec<u32>, mut combo: Vec<u32>) -> (Vec<u32>, Vec<u32>) {
        while let Some(&low) = v.last() {
            let Some(&p) = self.pivot_of_row.get(&low) else { break };
            v = xor_sorted(&v, &self.cols[p as usize]);
            combo = xor_sorted(&combo, &self.combos[p as usize]);
        }
        (v, combo)
    }

    /// Adds original column `id` (sorted row indices).
    pub fn add_column(&mut self, col: Vec<u32>, id: u32) {
        let (v, combo) = self.reduce(col, vec![id]);
        if let Some(&low) = v.last() {
            self.pivot_of_row.insert(low, self.cols.len() as u32);
            self.cols.push(v);
            self.combos.push(combo);
        }
    }

    /// Solves for `target` (sorted row indices) in the column span.
    pub fn solve(&self, target: Vec<u32>) -> Solution {
        let (r, combo) = self.reduce(target, Vec::new());
        if r.is_empty() {
            return Solution::Combination(combo);
        }
        // y with y·col = 0 for every reduced column and y·r = 1: rows that are nobody's pivot
        // get y = 0; each pivot row's value is forced by its column, in increasing pivot order.
        let mut eqs: Vec<(u32, &[u32], bool)> =
            self.cols.iter().map(|c| (*c.last().expect("non-empty"), c.as_slice(), false)).collect();
        eqs.push((*r.last().expect("non-empty"), r.as_slice(), true));
        eqs.sort_unstable_by_key(|e| e.0);
        let mut y: HashMap<u32, bool> = HashMap::new();
        for (p, col, is_target) in eqs {
            let mut val = is_target;
            for i in &col[..col.len() - 1] {
                val ^= y.get(i).copied().unwrap_or(false);
            }
            y.insert(p, val);
        }
        let mut support: Vec<u32> = y.into_iter().filter(|e| e.1).map(|e| e.0).collect();
        support.sort_unstable();
        Solution::Functional(support)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    fn dot(a: &[u32], b: &[u32]) -> bool {
        a.iter().filter(|x| b.contains(x)).count() % 2 == 1
    }
    #[test]
    fn solves_or_separates() {
        let cols = [vec![0, 1], vec![1, 2], vec![0, 2]];
        let mut r = ColumnReducer::default();
        for (i, c) in cols.iter().enumerate() {
            r.add_column(c.clone(), i as u32);
        }
        match r.solve(vec![0, 2]) {
            Solution::Combination(ids) => {
                let sum = ids.iter().fold(vec![], |acc, &i| xor_sorted(&acc, &cols[i as usize]));
                assert_eq!(sum, vec![0, 2]);
            }
            _ => panic!("in the span"),
        }
        match r.solve(vec![0]) {
            Solution::Functional(y) => {
                assert!(dot(&y, &[0]));
                assert!(cols.iter().all(|c| !dot(&y, c)));
            }
            _ => panic!("not in the span"),
        }
    }
}
