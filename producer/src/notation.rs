//! The free notation of polynomials in problem files: `1`, `U`, `U^2`, `U^2V`, `U * V^3`,
//! `U^2 + V` (factors optionally separated by `*`, spaces anywhere), read with the column of
//! any error; and the rewriting of a problem's coefficients and monomials into the written form
//! (`U^2*V`) when a problem is read, since the checker reads only factors joined by `*`
//! ([`tubecert_format::poly`]).

use crate::problem::{Goal, Problem};
use tubecert_format::limits::MAX_EXPONENT;
use tubecert_format::{MapExpr, Mono, Term};

/// The written form of a coefficient; `None` when the checker reads it as it is (stored
/// problems then give the same certificates byte for byte).
fn written(text: &str, variables: &[String]) -> Result<Option<String>, String> {
    if tubecert_format::poly::parse_poly(text, variables).is_ok() {
        return Ok(None);
    }
    Ok(Some(crate::search::monomials::render_poly(&parse_poly(text, variables)?, variables)))
}

/// Rewrites every coefficient of terms in the written form; the first that cannot be read is
/// the error.
pub fn write_terms(terms: &mut [Term], variables: &[String]) -> Result<(), String> {
    for (pos, t) in (1..).zip(terms.iter_mut()) {
        match written(&t[1], variables) {
            Ok(Some(w)) => t[1] = w,
            Ok(None) => {}
            Err(e) => return Err(format!("term {pos} [{}, {}, {}]: {e}", t[0], t[1], t[2])),
        }
    }
    Ok(())
}

/// Rewrites the coefficients of a problem's complexes and maps and the monomials of its goals
/// in the written form. What cannot be read is left as it is: validation reports it, and
/// [`explain`] puts the free notation's message in place of the checker's.
pub fn rewrite(p: &mut Problem) {
    let vars = &p.ring.variables;
    let differentials = p.complexes.0.values_mut().flat_map(|c| c.differential.iter_mut());
    for t in differentials.chain(p.maps.0.values_mut().flat_map(|m| m.terms.iter_mut())) {
        if let Ok(Some(w)) = written(&t[1], vars) {
            t[1] = w;
        }
    }
    // Only what the checker cannot read is rewritten: a problem file written out from the
    // typed problem (`family`) keeps its text.
    fn monomial(m: &mut String, vars: &[String]) {
        if let (Err(_), Ok(x)) = (tubecert_format::poly::parse_mono(m, vars), parse_mono(m, vars)) {
            *m = x.render(vars);
        }
    }
    fn expr(e: &mut MapExpr, vars: &[String]) {
        match e {
            MapExpr::Times(m, e) => {
                monomial(m, vars);
                expr(e, vars);
            }
            MapExpr::Sum(es) | MapExpr::Compose(es) => es.iter_mut().for_each(|e| expr(e, vars)),
            MapExpr::Named(_) | MapExpr::Id(_) => {}
        }
    }
    for g in &mut p.goals {
        match g {
            Goal::Homotopic { times: Some(m), .. } | Goal::Distinct { times: Some(m), .. } => monomial(m, vars),
            Goal::NullHomotopic { map } | Goal::NotNullHomotopic { map } => expr(map, vars),
            _ => {}
        }
    }
}

/// For each coefficient that not even the free notation reads, the checker's message about its
/// term (which knows only the written form) is replaced by the free notation's, column and all.
pub fn explain(p: &Problem, errs: &mut [String]) {
    if errs.is_empty() {
        return;
    }
    let complexes = p.complexes.iter().map(|(n, c)| (format!("complex {n}, differential"), &c.differential));
    for (what, terms) in complexes.chain(p.maps.iter().map(|(n, m)| (format!("map {n}"), &m.terms))) {
        for (pos, [from, coef, to]) in (1..).zip(terms.iter()) {
            if let Err(e) = written(coef, &p.ring.variables) {
                let at = format!("{what}, term {pos} [");
                if let Some(message) = errs.iter_mut().find(|m| m.starts_with(&at)) {
                    *message = format!("{at}{from}, {coef}, {to}]: {e}");
                }
            }
        }
    }
}

/// Reads a polynomial in the free notation. Returns distinct monomials (sorted);
/// a repeated monomial or the zero polynomial is an error, since either hides a typo.
pub fn parse_poly(text: &str, variables: &[String]) -> Result<Vec<Mono>, String> {
    let mut monos = Vec::new();
    let mut column = 1;
    for part in text.split('+') {
        monos.push(parse_factors(part, column, variables).map_err(|e| format!("coefficient \"{text}\": {e}"))?);
        column += part.len() + 1;
    }
    tubecert_format::poly::distinct(monos, text, variables)
}

/// Reads a single monomial (no `+`) in the free notation.
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
    fn rewrites_into_the_written_form_and_keeps_it() {
        let v = uv();
        assert_eq!(written("U^2V", &v), Ok(Some("U^2*V".into())));
        assert_eq!(written("V * U", &v), Ok(Some("U*V".into())));
        assert_eq!(written("U^2V + V", &v), Ok(Some("V + U^2*V".into())));
        assert_eq!(written("U^2*V + 1", &v), Ok(None));
        assert!(written("U^", &v).unwrap_err().contains("column 3"));
        let mut terms = [["a".to_string(), "UV".to_string(), "b".to_string()]];
        write_terms(&mut terms, &v).unwrap();
        assert_eq!(terms[0][1], "U*V");
    }
}
