//! The monomials of a given degree: the finite set the graded pieces of Hom(C, D) are built
//! from (finite by the ring's finiteness condition, checked in `RingInfo::new`).

use tubecert_format::{Mono, RingInfo};

/// The sum of the exponents of a monomial.
pub fn total_degree(m: Mono) -> u64 {
    m.0.iter().map(|&e| e as u64).sum()
}

/// The written form of a polynomial given as distinct monomials, in a fixed order (by total
/// degree, then exponents) so that certificates are reproducible: `V + U^2`.
pub fn render_poly(monos: &[Mono], variables: &[String]) -> String {
    let mut sorted = monos.to_vec();
    sorted.sort_by_key(|&m| (total_degree(m), m));
    sorted.iter().map(|m| m.render(variables)).collect::<Vec<_>>().join(" + ")
}

/// Every monomial of degree exactly `g` (a finite set by the finiteness condition).
pub fn monomials_of_degree(ring: &RingInfo, g: &[i64]) -> Vec<Mono> {
    let d = &ring.var_degrees;
    match d.len() {
        0 => {
            if g.iter().all(|&x| x == 0) {
                vec![Mono::ONE]
            } else {
                vec![]
            }
        }
        1 => multiple_of(g, &d[0]).map(|a| vec![Mono([a, 0])]).unwrap_or_default(),
        _ => two_variable_solutions(g, &d[0], &d[1]),
    }
}

/// All (a, b) ≥ 0 with a·d0 + b·d1 = g, for a validated pair of degrees.
fn two_variable_solutions(g: &[i64], d0: &[i64], d1: &[i64]) -> Vec<Mono> {
    let n = g.len();
    // Independent degrees: at most one solution, by Cramer's rule on a non-zero 2×2 minor.
    for i in 0..n {
        for j in i + 1..n {
            let det = d0[i] * d1[j] - d0[j] * d1[i];
            if det == 0 {
                continue;
            }
            let (an, bn) = (g[i] * d1[j] - g[j] * d1[i], d0[i] * g[j] - d0[j] * g[i]);
            if an % det != 0 || bn % det != 0 {
                return vec![];
            }
            let (a, b) = (an / det, bn / det);
            let max = tubecert_format::limits::MAX_EXPONENT as i64;
            if a < 0 || b < 0 || a > max || b > max || (0..n).any(|k| a * d0[k] + b * d1[k] != g[k]) {
                return vec![];
            }
            return vec![Mono([a as u32, b as u32])];
        }
    }
    // Parallel degrees pointing the same way: a is bounded along a non-zero coordinate.
    let Some(i) = d0.iter().position(|&x| x != 0) else { return vec![] };
    let mut out = Vec::new();
    let mut a: i64 = 0;
    while a * d0[i].abs() <= g[i].abs() && a <= tubecert_format::limits::MAX_EXPONENT as i64 {
        let rest: Vec<i64> = g.iter().zip(d0).map(|(x, y)| x - a * y).collect();
        if let Some(b) = multiple_of(&rest, d1) {
            out.push(Mono([a as u32, b]));
        }
        a += 1;
    }
    out
}

/// `Some(a)` with a ≥ 0 and g = a·d, if there is one.
fn multiple_of(g: &[i64], d: &[i64]) -> Option<u32> {
    let i = d.iter().position(|&x| x != 0)?;
    if g[i] % d[i] != 0 {
        return None;
    }
    let a = g[i] / d[i];
    if a < 0 || a > tubecert_format::limits::MAX_EXPONENT as i64 || g.iter().zip(d).any(|(x, y)| *x != a * y) {
        return None;
    }
    Some(a as u32)
}

#[cfg(test)]
mod tests {
    use super::*;
    use tubecert_format::{Ring, UniqueMap};
    fn ring(vars: &[(&str, Vec<i64>)], d: Vec<i64>) -> RingInfo {
        RingInfo::new(&Ring {
            variables: vars.iter().map(|v| v.0.to_string()).collect(),
            gradings: (0..d.len()).map(|i| format!("g{i}")).collect(),
            variable_degrees: UniqueMap(vars.iter().map(|v| (v.0.to_string(), v.1.clone())).collect()),
            differential_degree: d,
        })
        .unwrap()
    }
    #[test]
    fn polynomials_are_written_in_a_fixed_order() {
        let v = vec!["U".to_string(), "V".to_string()];
        assert_eq!(render_poly(&[Mono([2, 0]), Mono([0, 1]), Mono([1, 1])], &v), "V + U*V + U^2");
    }

    #[test]
    fn monomials_of_a_degree() {
        let r = ring(&[("U", vec![-2, 0]), ("V", vec![-4, 0])], vec![-1, 0]);
        let mut ms = monomials_of_degree(&r, &[-8, 0]);
        ms.sort();
        assert_eq!(ms, vec![Mono([0, 2]), Mono([2, 1]), Mono([4, 0])]);
        let r = ring(&[("U", vec![-2, 0]), ("V", vec![0, -2])], vec![-1, -1]);
        assert_eq!(monomials_of_degree(&r, &[-4, -2]), vec![Mono([2, 1])]);
        assert!(monomials_of_degree(&r, &[-3, 0]).is_empty());
        assert!(monomials_of_degree(&r, &[2, 0]).is_empty());
    }
}
