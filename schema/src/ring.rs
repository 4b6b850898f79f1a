//! The checked form of a [`Ring`]: variable names, degrees of monomials, and the finiteness
//! condition that makes every graded piece of Hom(C, D) finite-dimensional.

use crate::limits::{grading_in_bounds, MAX_GRADING_ABS, MAX_NAME_LEN};
use crate::model::{Grading, Ring};
use crate::names::{check_object_name, visible};
use crate::poly::{Mono, MAX_VARIABLES};

/// A validated ring.
#[derive(Clone, Debug)]
pub struct RingInfo {
    pub variables: Vec<String>,
    pub gradings: Vec<String>,
    /// Degree vector of each variable, in declaration order.
    pub var_degrees: Vec<Grading>,
    pub differential_degree: Grading,
}

impl RingInfo {
    /// Checks a ring declaration; every problem is reported.
    pub fn new(ring: &Ring) -> Result<RingInfo, Vec<String>> {
        let mut errs = Vec::new();
        let (m, n) = (ring.gradings.len(), ring.variables.len());
        if !(1..=4).contains(&m) {
            errs.push(format!("ring: {m} gradings declared; between 1 and 4 are supported"));
        }
        if n > MAX_VARIABLES {
            errs.push(format!(
                "ring: {n} variables declared; F2, F2[U] and F2[U,V] (at most {MAX_VARIABLES}) are supported"
            ));
        }
        for (i, v) in ring.variables.iter().enumerate() {
            let bad = v.chars().find(|c| !c.is_ascii_alphabetic()).map(|c| format!(" (found U+{:04X})", c as u32));
            if v.is_empty() || v.len() > MAX_NAME_LEN || bad.is_some() {
                let (v, bad) = (visible(v), bad.unwrap_or_default());
                errs.push(format!("ring: variable name \"{v}\" must be 1 to {MAX_NAME_LEN} ASCII letters{bad}"));
            }
            if ring.variables[..i].contains(v) {
                errs.push(format!("ring: variable \"{v}\" declared twice"));
            }
        }
        for (i, g) in ring.gradings.iter().enumerate() {
            if let Err(e) = check_object_name(g) {
                errs.push(format!("ring: grading {e}"));
            }
            if ring.gradings[..i].contains(g) {
                errs.push(format!("ring: grading \"{g}\" declared twice"));
            }
        }
        let var_degrees: Vec<Grading> =
            ring.variables.iter().filter_map(|v| ring.variable_degrees.get(v).cloned()).collect();
        for v in &ring.variables {
            match ring.variable_degrees.get(v) {
                Some(d) => check_vector(&format!("ring: degree of {v}"), d, m, &mut errs),
                None => errs.push(format!("ring: variable \"{v}\" has no entry in variable_degrees")),
            }
        }
        for k in ring.variable_degrees.keys().filter(|k| !ring.variables.contains(k)) {
            errs.push(format!("ring: variable_degrees names \"{k}\", which is not a declared variable"));
        }
        check_vector("ring: differential_degree", &ring.differential_degree, m, &mut errs);
        if !errs.is_empty() {
            return Err(errs);
        }
        // Only now: `infinite_piece` reads the degree vectors as of one length.
        if let Some(why) = infinite_piece(&var_degrees) {
            return Err(vec![format!(
                "ring: graded pieces would be infinite-dimensional ({why}); every variable must strictly lower a fixed positive combination of the gradings"
            )]);
        }
        let Ring { variables, gradings, differential_degree, .. } = ring.clone();
        Ok(RingInfo { variables, gradings, var_degrees, differential_degree })
    }

    pub fn num_vars(&self) -> usize {
        self.variables.len()
    }

    /// Degree of a monomial (exponents are bounded, so this cannot overflow).
    pub fn degree(&self, m: Mono) -> Grading {
        (0..self.gradings.len()).map(|i| self.degree_at(m, i)).collect()
    }

    /// Component i of the degree of a monomial.
    pub fn degree_at(&self, m: Mono, i: usize) -> i64 {
        self.var_degrees.iter().enumerate().map(|(v, d)| d[i] * m.0[v] as i64).sum()
    }

    /// Position of a named grading.
    pub fn grading_index(&self, name: &str) -> Result<usize, String> {
        self.gradings.iter().position(|g| g == name).ok_or_else(|| format!("no grading named \"{name}\""))
    }

    pub fn var_index(&self, name: &str) -> Option<usize> {
        self.variables.iter().position(|v| v == name)
    }
}

fn check_vector(what: &str, v: &[i64], m: usize, errs: &mut Vec<String>) {
    if v.len() != m {
        errs.push(format!("{what} has {} entries, expected {m} (one per grading)", v.len()));
    }
    if !v.iter().all(|&x| grading_in_bounds(x)) {
        errs.push(format!("{what} has an entry beyond ±{MAX_GRADING_ABS}"));
    }
}

/// Why some graded piece is infinite, if it is: a non-trivial monomial of degree zero, i.e. a
/// non-negative combination of variable degrees that vanishes. By Gordan's alternative this
/// fails exactly when some functional is lowered by every variable. With at most two variables
/// that happens when a degree is zero or two degrees point in opposite directions.
fn infinite_piece(d: &[Grading]) -> Option<String> {
    if d.iter().any(|v| v.iter().all(|&x| x == 0)) {
        return Some("a variable has degree zero".into());
    }
    if let [d0, d1] = d {
        // Entries are at most 2^31, so products are below 2^62 but a sum of four may pass 2^63:
        // computed in 128 bits.
        let p = |i: usize, j: usize| i128::from(d0[i]) * i128::from(d1[j]);
        let parallel = (0..d0.len()).all(|i| (0..d0.len()).all(|j| p(i, j) == p(j, i)));
        let dot: i128 = (0..d0.len()).map(|i| p(i, i)).sum();
        if parallel && dot < 0 {
            return Some("a product of variables has degree zero".into());
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::UniqueMap;
    fn ring(vars: &[(&str, Vec<i64>)], d: Vec<i64>) -> Result<RingInfo, Vec<String>> {
        RingInfo::new(&Ring {
            variables: vars.iter().map(|v| v.0.to_string()).collect(),
            gradings: (0..d.len()).map(|i| format!("g{i}")).collect(),
            variable_degrees: UniqueMap(vars.iter().map(|v| (v.0.to_string(), v.1.clone())).collect()),
            differential_degree: d,
        })
    }
    #[test]
    fn finiteness_condition() {
        assert!(ring(&[("U", vec![-2, 0]), ("V", vec![0, -2])], vec![-1, -1]).is_ok());
        assert!(ring(&[("U", vec![-2, -1])], vec![-1, 0]).is_ok());
        // U·V of degree zero: infinitely many U^k V^k in one degree.
        assert!(ring(&[("U", vec![-2, 1]), ("V", vec![2, -1])], vec![-1, 0]).is_err());
        assert!(ring(&[("U", vec![0, 0])], vec![-1, 0]).is_err());
        // Parallel degrees pointing the same way are fine.
        assert!(ring(&[("U", vec![-2, 0]), ("V", vec![-4, 0])], vec![-1, 0]).is_ok());
        // deg U · deg V = −2^64 in 64 bits wraps to 0; U·V has degree zero all the same.
        let m = crate::limits::MAX_GRADING_ABS;
        assert!(ring(&[("U", vec![-m; 4]), ("V", vec![m; 4])], vec![-1, 0, 0, 0]).is_err());
        assert!(ring(&[("U", vec![i64::MIN, -1])], vec![-1, 0]).is_err());
    }
}
