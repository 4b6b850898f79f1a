//! Monomials and polynomials over F2[v_1..v_n], n ≤ 2, and their written notation.
//!
//! Written forms: `1`, `U`, `U^2`, `U^2V`, `U*V^3`, `U^2 + V`. The canonical form printed
//! by [`Mono::render`] is `U^2*V^3`; the producer joins terms with ` + `.

use crate::limits::MAX_EXPONENT;
use std::fmt::Write as _;

/// Maximum number of ring variables the format supports (F2, `F2[U]`, `F2[U,V]`).
pub const MAX_VARIABLES: usize = 2;

/// A monomial v_1^e_1 v_2^e_2; unused variables have exponent 0.
#[derive(Copy, Clone, Debug, Default, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct Mono(pub [u32; MAX_VARIABLES]);

impl Mono {
    pub const ONE: Mono = Mono([0; MAX_VARIABLES]);

    /// The monomial v_i^e.
    pub fn power(var: usize, e: u32) -> Mono {
        let mut m = Mono::ONE;
        m.0[var] = e;
        m
    }

    /// Product, or `None` if an exponent would pass [`MAX_EXPONENT`] (a sum past `u32` saturates,
    /// so it is past the limit too).
    pub fn checked_mul(self, other: Mono) -> Option<Mono> {
        let m = Mono(std::array::from_fn(|i| self.0[i].saturating_add(other.0[i])));
        m.0.iter().all(|&e| e <= MAX_EXPONENT).then_some(m)
    }

    /// `self / other` when `other` divides `self`.
    pub fn checked_div(self, other: Mono) -> Option<Mono> {
        let divides = (0..MAX_VARIABLES).all(|i| other.0[i] <= self.0[i]);
        divides.then(|| Mono(std::array::from_fn(|i| self.0[i] - other.0[i])))
    }

    /// Canonical written form, e.g. `U^2*V`, or `1`.
    pub fn render(self, variables: &[String]) -> String {
        let mut s = String::new();
        for (v, e) in variables.iter().zip(self.0).filter(|f| f.1 > 0) {
            let sep = if s.is_empty() { "" } else { "*" };
            let _ = if e == 1 { write!(s, "{sep}{v}") } else { write!(s, "{sep}{v}^{e}") };
        }
        if s.is_empty() {
            "1".into()
        } else {
            s
        }
    }
}

/// Parses a polynomial over F2 in the declared variables. Returns distinct monomials (sorted);
/// a repeated monomial or the zero polynomial is an error, since either hides a typo.
pub fn parse_poly(text: &str, variables: &[String]) -> Result<Vec<Mono>, String> {
    let mut monos = Vec::new();
    let mut column = 1;
    for part in text.split('+') {
        monos.push(parse_factors(part, column, variables).map_err(|e| format!("coefficient \"{text}\": {e}"))?);
        column += part.len() + 1;
    }
    monos.sort();
    if let Some(w) = monos.windows(2).find(|w| w[0] == w[1]) {
        return Err(format!(
            "coefficient \"{text}\": the monomial {} appears twice (over F2 they cancel; write the sum out)",
            w[0].render(variables)
        ));
    }
    Ok(monos)
}

/// Parses a single monomial (no `+`).
pub fn parse_mono(text: &str, variables: &[String]) -> Result<Mono, String> {
    if text.contains('+') {
        return Err(format!("\"{text}\": expected a single monomial, found a sum"));
    }
    parse_factors(text, 1, variables).map_err(|e| format!("monomial \"{text}\": {e}"))
}

/// One monomial starting at `column`: `1`, or factors `VAR` / `VAR^e`, optionally separated by
/// `*`. The longest declared variable name matching is taken.
fn parse_factors(part: &str, column: usize, variables: &[String]) -> Result<Mono, String> {
    let at = |rest: &str| column + part.len() - rest.len();
    let mut rest = part.trim_start();
    if rest.trim_end() == "1" {
        return Ok(Mono::ONE);
    }
    if rest.is_empty() {
        return Err(format!("empty term at column {column}"));
    }
    let mut m = Mono::ONE;
    loop {
        let var = variables.iter().enumerate().filter(|(_, v)| rest.starts_with(v.as_str())).max_by_key(|v| v.1.len());
        let Some((vi, name)) = var else {
            let expected = if variables.is_empty() {
                "only the constant 1 (the ring has no variables)".to_string()
            } else {
                format!("a variable ({}) or 1", variables.join(", "))
            };
            let found = rest.chars().next().map_or("the end".into(), |c| format!("'{c}'"));
            return Err(format!("at column {}: expected {expected}, found {found}", at(rest)));
        };
        rest = rest[name.len()..].trim_start();
        let mut e: u32 = 1;
        if let Some(after) = rest.strip_prefix('^') {
            let after = after.trim_start();
            let digits = after.len() - after.trim_start_matches(|c: char| c.is_ascii_digit()).len();
            if digits == 0 {
                return Err(format!("at column {}: expected an exponent after '^'", at(after)));
            }
            // Bounded at the token, before any arithmetic: no exponent can wrap.
            e = match after[..digits].parse::<u32>() {
                Ok(e) if e <= MAX_EXPONENT => e,
                _ => {
                    let shown = if digits > 20 { format!("{}…", &after[..20]) } else { after[..digits].to_string() };
                    return Err(format!("at column {}: exponent {shown} is above the limit {MAX_EXPONENT}", at(after)));
                }
            };
            rest = after[digits..].trim_start();
        }
        // Both at most 2^20: the sum cannot overflow.
        let total = m.0[vi] + e;
        if total > MAX_EXPONENT {
            return Err(format!("exponent of {name} is {total}, above the limit {MAX_EXPONENT}"));
        }
        m.0[vi] = total;
        match rest.strip_prefix('*') {
            _ if rest.is_empty() => return Ok(m),
            Some(after) => rest = after.trim_start(),
            None => {}
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    fn uv() -> Vec<String> {
        vec!["U".into(), "V".into()]
    }
    #[test]
    fn parses_the_documented_forms() {
        let v = uv();
        assert_eq!(parse_poly("1", &v).unwrap(), vec![Mono::ONE]);
        assert_eq!(parse_poly("U^2V", &v).unwrap(), vec![Mono([2, 1])]);
        assert_eq!(parse_poly("U*V^3", &v).unwrap(), vec![Mono([1, 3])]);
        assert_eq!(parse_poly("U^2 + V", &v).unwrap(), vec![Mono([0, 1]), Mono([2, 0])]);
        assert_eq!(Mono([2, 1]).render(&v), "U^2*V");
        assert_eq!(parse_poly(" U * V^ 2+1", &v).unwrap(), vec![Mono::ONE, Mono([1, 2])]);
    }
    #[test]
    fn rejects_bad_coefficients_with_position() {
        let v = uv();
        assert!(parse_poly("U^", &v).unwrap_err().contains("exponent"));
        assert!(parse_poly("W", &v).unwrap_err().contains("column 1"));
        assert!(parse_poly("U + U", &v).unwrap_err().contains("twice"));
        assert!(parse_poly("U^99999999999", &v).unwrap_err().contains("limit"));
        // 3 + (2^64 − 3) wraps to 0 in 64 bits: each exponent is bounded before it is added.
        assert!(parse_poly("U^3*U^18446744073709551613", &v).unwrap_err().contains("limit"));
        assert!(parse_poly("U^1048576*U", &v).unwrap_err().contains("limit"));
        assert_eq!(parse_poly("U^1048575*U", &v).unwrap(), vec![Mono([MAX_EXPONENT, 0])]);
        assert!(parse_poly("U +", &v).is_err());
        assert!(parse_poly("U", &[]).unwrap_err().contains("no variables"));
        assert!(parse_poly("U*", &v).unwrap_err().contains("column 3"));
        assert!(parse_poly("U + W", &v).unwrap_err().contains("column 5"));
        assert!(parse_mono("U + V", &v).unwrap_err().contains("single monomial"));
    }
    #[test]
    fn arithmetic_is_checked() {
        assert_eq!(Mono([1, 2]).checked_mul(Mono([3, 0])), Some(Mono([4, 2])));
        assert_eq!(Mono([MAX_EXPONENT, 0]).checked_mul(Mono([1, 0])), None);
        assert_eq!(Mono([1, 2]).checked_div(Mono([2, 0])), None);
        assert_eq!(Mono([3, 2]).checked_div(Mono([2, 2])), Some(Mono([1, 0])));
    }
}
