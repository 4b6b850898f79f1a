//! Monomials and polynomials over F2[v_1..v_n], n ≤ 2, and their written notation.
//!
//! Written forms: `1`, `U`, `U^2`, `U^2V`, `U*V^3`, `U^2 + V`. The canonical form printed
//! by [`Mono::render`] / [`render_poly`] is `U^2*V^3` with terms joined by ` + `.

use crate::limits::MAX_EXPONENT;
use std::fmt::Write as _;

/// Maximum number of ring variables the format supports (F2, F2[U], F2[U,V]).
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

    /// Product, or `None` if an exponent would pass [`MAX_EXPONENT`].
    pub fn checked_mul(self, other: Mono) -> Option<Mono> {
        let mut out = Mono::ONE;
        for i in 0..MAX_VARIABLES {
            let e = self.0[i].checked_add(other.0[i])?;
            if e > MAX_EXPONENT {
                return None;
            }
            out.0[i] = e;
        }
        Some(out)
    }

    /// `self / other` when `other` divides `self`.
    pub fn checked_div(self, other: Mono) -> Option<Mono> {
        let mut out = Mono::ONE;
        for i in 0..MAX_VARIABLES {
            out.0[i] = self.0[i].checked_sub(other.0[i])?;
        }
        Some(out)
    }

    pub fn is_one(self) -> bool {
        self == Mono::ONE
    }

    pub fn total_degree(self) -> u64 {
        self.0.iter().map(|&e| e as u64).sum()
    }

    /// Canonical written form, e.g. `U^2*V`, or `1`.
    pub fn render(self, variables: &[String]) -> String {
        let mut s = String::new();
        for (i, name) in variables.iter().enumerate() {
            let e = self.0[i];
            if e == 0 {
                continue;
            }
            if !s.is_empty() {
                s.push('*');
            }
            s.push_str(name);
            if e > 1 {
                let _ = write!(s, "^{e}");
            }
        }
        if s.is_empty() {
            s.push('1');
        }
        s
    }
}

/// Canonical written form of a polynomial given as distinct monomials.
pub fn render_poly(monos: &[Mono], variables: &[String]) -> String {
    let mut sorted = monos.to_vec();
    sorted.sort_by_key(|m| (m.total_degree(), *m));
    sorted.iter().map(|m| m.render(variables)).collect::<Vec<_>>().join(" + ")
}

/// Parses a polynomial over F2 in the declared variables. Returns distinct monomials (sorted);
/// a repeated monomial or the zero polynomial is an error, since either hides a typo.
pub fn parse_poly(text: &str, variables: &[String]) -> Result<Vec<Mono>, String> {
    if !text.contains('+') {
        return parse_mono(text, variables).map(|m| vec![m]);
    }
    let mut monos = Vec::new();
    for (k, part) in split_terms(text)?.into_iter().enumerate() {
        let m = parse_mono_at(part.0, part.1, variables)
            .map_err(|e| format!("coefficient \"{text}\", term {}: {e}", k + 1))?;
        monos.push(m);
    }
    monos.sort();
    for w in monos.windows(2) {
        if w[0] == w[1] {
            return Err(format!(
                "coefficient \"{text}\": the monomial {} appears twice (over F2 they cancel; write the sum out)",
                w[0].render(variables)
            ));
        }
    }
    Ok(monos)
}

/// Parses a single monomial (no `+`).
pub fn parse_mono(text: &str, variables: &[String]) -> Result<Mono, String> {
    if text == "1" {
        return Ok(Mono::ONE); // the common case, without allocating
    }
    let terms = split_terms(text)?;
    if terms.len() != 1 {
        return Err(format!("\"{text}\": expected a single monomial, found a sum"));
    }
    parse_mono_at(terms[0].0, terms[0].1, variables).map_err(|e| format!("monomial \"{text}\": {e}"))
}

/// Splits on `+`, keeping each part's starting column (1-based) for messages.
fn split_terms(text: &str) -> Result<Vec<(&str, usize)>, String> {
    let mut out = Vec::new();
    let mut start = 0;
    for (i, c) in text.char_indices().chain(std::iter::once((text.len(), '+'))) {
        if c == '+' {
            let part = &text[start..i];
            if part.trim().is_empty() {
                return Err(format!("coefficient \"{text}\": empty term at column {}", start + 1));
            }
            out.push((part, start + 1));
            start = i + 1;
        }
    }
    Ok(out)
}

fn parse_mono_at(part: &str, col0: usize, variables: &[String]) -> Result<Mono, String> {
    let bytes = part.as_bytes();
    let mut i = 0;
    let mut m = Mono::ONE;
    let mut seen_factor = false;
    let skip_ws = |i: &mut usize| {
        while *i < bytes.len() && bytes[*i].is_ascii_whitespace() {
            *i += 1;
        }
    };
    skip_ws(&mut i);
    if part.trim() == "1" {
        return Ok(Mono::ONE);
    }
    while i < bytes.len() {
        if seen_factor && bytes[i] == b'*' {
            i += 1;
            skip_ws(&mut i);
        }
        // Longest declared variable name matching here.
        let var = variables
            .iter()
            .enumerate()
            .filter(|(_, v)| part[i..].starts_with(v.as_str()))
            .max_by_key(|(_, v)| v.len());
        let Some((vi, name)) = var else {
            let found = part[i..].chars().next().unwrap_or(' ');
            let expected = if variables.is_empty() {
                "only the constant 1 (the ring has no variables)".to_string()
            } else {
                format!("a variable ({}) or 1", variables.join(", "))
            };
            return Err(format!("at column {}: expected {expected}, found '{found}'", col0 + i));
        };
        i += name.len();
        skip_ws(&mut i);
        let mut e: u64 = 1;
        if i < bytes.len() && bytes[i] == b'^' {
            i += 1;
            skip_ws(&mut i);
            let s = i;
            while i < bytes.len() && bytes[i].is_ascii_digit() {
                i += 1;
            }
            if s == i {
                return Err(format!("at column {}: expected an exponent after '^'", col0 + s));
            }
            e = part[s..i].parse::<u64>().unwrap_or(u64::MAX);
            skip_ws(&mut i);
        }
        let total = m.0[vi] as u64 + e;
        if total > MAX_EXPONENT as u64 {
            return Err(format!("exponent of {name} is {total}, above the limit {MAX_EXPONENT}"));
        }
        m.0[vi] = total as u32;
        seen_factor = true;
    }
    if !seen_factor {
        return Err(format!("at column {col0}: empty monomial"));
    }
    Ok(m)
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
        assert_eq!(render_poly(&[Mono([2, 0]), Mono([0, 1])], &v), "V + U^2");
    }
    #[test]
    fn rejects_bad_coefficients_with_position() {
        let v = uv();
        assert!(parse_poly("U^", &v).unwrap_err().contains("exponent"));
        assert!(parse_poly("W", &v).unwrap_err().contains("column 1"));
        assert!(parse_poly("U + U", &v).unwrap_err().contains("twice"));
        assert!(parse_poly("U^99999999999", &v).unwrap_err().contains("limit"));
        assert!(parse_poly("U +", &v).is_err());
        assert!(parse_poly("U", &[]).unwrap_err().contains("no variables"));
    }
    #[test]
    fn arithmetic_is_checked() {
        assert_eq!(Mono([1, 2]).checked_mul(Mono([3, 0])), Some(Mono([4, 2])));
        assert_eq!(Mono([MAX_EXPONENT, 0]).checked_mul(Mono([1, 0])), None);
        assert_eq!(Mono([1, 2]).checked_div(Mono([2, 0])), None);
        assert_eq!(Mono([3, 2]).checked_div(Mono([2, 2])), Some(Mono([1, 0])));
    }
}
