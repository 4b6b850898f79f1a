//! Monomials and polynomials over F2[v_1..v_n], n ≤ 2, as certificates write them: a monomial
//! is `1` or factors `V` / `V^e` joined by `*`, a polynomial distinct monomials joined by `+`
//! (`U^2*V + 1`; [`Mono::render`] writes `U^2*V`, the form of a statement's monomials). Problem
//! files may write them more freely (`U^2V`); the producer rewrites them before anything is
//! checked.

use crate::limits::MAX_EXPONENT;
use std::fmt::Write as _;

/// Maximum number of ring variables the format supports (F2, `F2[U]`, `F2[U,V]`).
pub const MAX_VARIABLES: usize = 2;

/// A monomial v_1^e_1 v_2^e_2; unused variables have exponent 0.
#[derive(Copy, Clone, Debug, Default, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct Mono(pub [u32; MAX_VARIABLES]);

impl Mono {
    pub const ONE: Mono = Mono([0; MAX_VARIABLES]);

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

    /// The written form, e.g. `U^2*V`, or `1`.
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

/// Reads a polynomial: distinct monomials joined by `+`. Returns them sorted; a repeated
/// monomial is an error, since it hides a typo.
pub fn parse_poly(text: &str, variables: &[String]) -> Result<Vec<Mono>, String> {
    let monos = text.split('+').map(|t| parse_mono(t.trim_matches(' '), variables)).collect::<Result<Vec<_>, _>>();
    distinct(monos.map_err(|e| format!("coefficient {text:?}: {e}"))?, text, variables)
}

/// The monomials of the coefficient `text`, sorted; a repeated one is an error (over F2 the two
/// cancel, which hides a typo). Shared with the producer's free notation.
pub fn distinct(mut monos: Vec<Mono>, text: &str, variables: &[String]) -> Result<Vec<Mono>, String> {
    monos.sort();
    if let Some(w) = monos.windows(2).find(|w| w[0] == w[1]) {
        return Err(format!(
            "coefficient {text:?}: the monomial {} appears twice (over F2 they cancel; write the sum out)",
            w[0].render(variables)
        ));
    }
    Ok(monos)
}

/// Reads one monomial: `1`, or factors `V` / `V^e` joined by `*`. Allocates nothing: the
/// checker reads millions.
pub fn parse_mono(text: &str, variables: &[String]) -> Result<Mono, String> {
    let mut m = Mono::ONE;
    for factor in text.split('*').filter(|_| text != "1") {
        let (name, e) = factor.split_once('^').unwrap_or((factor, "1"));
        let Some(v) = variables.iter().position(|x| x == name) else {
            let expected = match variables {
                [] => "only the constant 1 (the ring has no variables)".to_string(),
                _ => format!("a variable ({}) or 1", variables.join(", ")),
            };
            let found = if text.contains('+') { "a sum".to_string() } else { format!("{name:?}") };
            return Err(format!("monomial {text:?}: expected {expected}, found {found}"));
        };
        // Bounded at the token, before any arithmetic: no exponent can wrap.
        let e = match e.parse::<u32>() {
            _ if e.is_empty() || !e.bytes().all(|b| b.is_ascii_digit()) => {
                return Err(format!("monomial {text:?}: expected an exponent after '^', found {e:?}"));
            }
            Ok(e) if e <= MAX_EXPONENT => e,
            _ => return Err(format!("monomial {text:?}: exponent {e} is above the limit {MAX_EXPONENT}")),
        };
        // Both at most 2^20: the sum cannot overflow.
        m.0[v] += e;
        if m.0[v] > MAX_EXPONENT {
            return Err(format!("monomial {text:?}: exponent of {name} is {}, above the limit {MAX_EXPONENT}", m.0[v]));
        }
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
    fn reads_the_written_form() {
        let v = uv();
        assert_eq!(parse_poly("1", &v).unwrap(), vec![Mono::ONE]);
        assert_eq!(parse_poly("U^2*V", &v).unwrap(), vec![Mono([2, 1])]);
        assert_eq!(parse_poly("V + U^2", &v).unwrap(), vec![Mono([0, 1]), Mono([2, 0])]);
        assert_eq!(parse_poly("U^0*V^1 + U^1048575*U", &v).unwrap(), vec![Mono([0, 1]), Mono([MAX_EXPONENT, 0])]);
        assert_eq!(Mono([2, 1]).render(&v), "U^2*V");
        for (text, why) in [
            ("U^2V", "found \"2V\""),
            ("U V", "found \"U V\""),
            ("U*", "found \"\""),
            ("", "found \"\""),
            ("1*U", "found \"1\""),
            ("U^", "expected an exponent after '^'"),
            ("U^+2", "expected an exponent after '^'"),
            ("U^1048577", "above the limit"),
            // 3 + (2^64 − 3) wraps to 0 in 64 bits: each exponent is bounded before it is added.
            ("U^3*U^18446744073709551613", "above the limit"),
            ("U*U^1048576", "exponent of U is 1048577"),
            ("U + V", "found a sum"),
        ] {
            let e = parse_mono(text, &v).unwrap_err();
            assert!(e.contains(why), "{text}: {e}");
        }
        assert!(parse_poly("U + U", &v).unwrap_err().contains("twice"));
        assert!(parse_poly("U +", &v).is_err());
        assert!(parse_poly("U + W", &v).unwrap_err().contains("found \"W\""));
        assert!(parse_mono("U", &[]).unwrap_err().contains("no variables"));
    }
    #[test]
    fn arithmetic_is_checked() {
        assert_eq!(Mono([1, 2]).checked_mul(Mono([3, 0])), Some(Mono([4, 2])));
        assert_eq!(Mono([MAX_EXPONENT, 0]).checked_mul(Mono([1, 0])), None);
        assert_eq!(Mono([1, 2]).checked_div(Mono([2, 0])), None);
        assert_eq!(Mono([3, 2]).checked_div(Mono([2, 2])), Some(Mono([1, 0])));
    }
}
