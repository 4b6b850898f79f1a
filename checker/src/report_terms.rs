//! Formatting of terms for messages: vectors written out, the difference of the two sides of
//! a failed identity, and "did you mean" suggestions. Presentation only: the decisions are made
//! by the callers (an identity fails exactly when its two sides differ).

use crate::algebra::{normalize, Vector};
use crate::load::Context;
use tubecert_format::Mono;

/// "Did you mean": for names of at most this many characters, among at most
/// [`MAX_SUGGESTION_CANDIDATES`] known names.
pub const MAX_SUGGESTED_NAME: usize = 32;
pub const MAX_SUGGESTION_CANDIDATES: usize = 10_000;

/// A close known name, for "did you mean". Bounded work: only for names of at most
/// [`MAX_SUGGESTED_NAME`] characters, among at most [`MAX_SUGGESTION_CANDIDATES`] known names
/// (else no suggestion), comparing only names of a similar length; callers also bound how many
/// unknown names get one (`limits::MAX_SUGGESTIONS` per file).
pub fn suggest<'a>(name: &str, known: impl Iterator<Item = &'a String> + Clone) -> String {
    let a: Vec<char> = name.chars().collect();
    if a.len() > MAX_SUGGESTED_NAME || known.clone().nth(MAX_SUGGESTION_CANDIDATES).is_some() {
        return String::new();
    }
    let limit = 2.max(a.len() / 3);
    let (mut prev, mut cur) = (Vec::new(), Vec::new());
    let mut dist = |b: &str| {
        let b: Vec<char> = b.chars().take(a.len() + limit + 1).collect();
        if b.len().abs_diff(a.len()) > limit {
            return usize::MAX;
        }
        prev.clear();
        prev.extend(0..=b.len());
        for (i, ca) in a.iter().enumerate() {
            cur.clear();
            cur.push(i + 1);
            for (j, cb) in b.iter().enumerate() {
                cur.push((prev[j] + (ca != cb) as usize).min(prev[j + 1] + 1).min(cur[j] + 1));
            }
            std::mem::swap(&mut prev, &mut cur);
        }
        prev[b.len()]
    };
    let best = known.map(|k| (dist(k), k)).min();
    match best {
        Some((d, k)) if d <= limit => format!(" (did you mean \"{}\"?)", crate::shown(k)),
        _ => String::new(),
    }
}

/// Written form of a vector in complex `c`, e.g. `U^2·a + b`.
pub fn render_vector(ctx: &Context, c: usize, v: &[(u32, Mono)]) -> String {
    if v.is_empty() {
        return "0".into();
    }
    let names = &ctx.complexes[c].names;
    let term = |&(g, m): &(u32, Mono)| {
        if m == Mono::ONE {
            names[g as usize].clone()
        } else {
            format!("{}·{}", m.render(&ctx.ring.variables), names[g as usize])
        }
    };
    let shown: Vec<String> = v.iter().take(12).map(term).collect();
    let more = if v.len() > 12 { format!(" + … ({} terms)", v.len()) } else { String::new() };
    format!("{}{more}", shown.join(" + "))
}

/// Compares two vectors of complex `c`; on difference, both sides and the terms in which
/// they differ.
#[allow(clippy::too_many_arguments)]
pub fn compare(
    ctx: &Context,
    c: usize,
    at: &str,
    lhs_name: &str,
    lhs: &Vector,
    rhs_name: &str,
    rhs: &Vector,
) -> Result<(), String> {
    if lhs == rhs {
        return Ok(());
    }
    let only =
        |a: &Vector, b: &Vector| -> Vector { a.iter().filter(|t| b.binary_search(t).is_err()).copied().collect() };
    let mut diff = only(lhs, rhs);
    diff.extend(only(rhs, lhs));
    normalize(&mut diff);
    Err(format!(
        "at generator {at}:\n      {lhs_name} = {}\n      {rhs_name} = {}\n      they differ by {}",
        render_vector(ctx, c, lhs),
        render_vector(ctx, c, rhs),
        render_vector(ctx, c, &diff)
    ))
}

#[cfg(test)]
mod tests {
    #[test]
    fn a_suggested_name_shows_invisible_characters() {
        // A declared name with a joiner is refused elsewhere, but may still be suggested.
        let known = ["a\u{200d}".to_string()];
        assert_eq!(super::suggest("a", known.iter()), " (did you mean \"a<U+200D>\"?)");
    }
}
