//! The name alphabet. Names of complexes, maps, generators and gradings are printed in
//! statements and reports, so they may hold nothing a statement uses as syntax and nothing
//! invisible: ASCII letters and digits, `_`, `.`, `'`, and `⊗` (which the tensor product puts
//! in generator names). An allow-list, so that whitespace, control and format characters
//! (U+200D and the like), and letters of other scripts that look like Latin ones, are all out.
//! Only generator names may hold `⊗`: an object (complex, map, grading, bordered object) named
//! `F⊗G` would read as a tensor product in a statement. Variables are stricter still (ASCII
//! letters, [`crate::ring`]); map names may not begin with `id_`, which is how statements write
//! an identity map.

use crate::limits::MAX_NAME_LEN;

/// Whether a character is in the alphabet; `⊗` is the one non-ASCII character, as the tensor
/// product writes it in `x⊗y`.
pub fn is_name_char(c: char) -> bool {
    c.is_ascii_alphanumeric() || matches!(c, '_' | '.' | '\'' | '⊗')
}

/// The alphabet in words, for messages.
const NAME_ALPHABET: &str = "ASCII letters and digits, _ . ' and ⊗";

/// The name with every character outside the alphabet shown as `<U+XXXX>`, so that a message
/// about an invisible character shows where it is.
pub fn visible(name: &str) -> String {
    name.chars().map(|c| if is_name_char(c) { c.to_string() } else { format!("<U+{:04X}>", c as u32) }).collect()
}

/// Checks a name against the alphabet; the error names the first offending character.
pub fn check_name(name: &str) -> Result<(), String> {
    if name.bytes().all(|b| b.is_ascii_alphanumeric() || b == b'_') && (1..=MAX_NAME_LEN).contains(&name.len()) {
        return Ok(()); // the common case, byte by byte
    }
    if name.is_empty() || name.len() > MAX_NAME_LEN {
        return Err(format!("name \"{}\" must have 1 to {MAX_NAME_LEN} bytes", visible(name)));
    }
    let Some(c) = name.chars().find(|&c| !is_name_char(c)) else { return Ok(()) };
    let what = match c {
        _ if c.is_control() => ", a control character",
        _ if c.is_whitespace() => ", whitespace",
        _ if c.is_ascii_graphic() => "",
        _ => " (shown as <U+…>)",
    };
    let (shown, code) = (visible(name), c as u32);
    Err(format!(
        "name \"{shown}\" contains U+{code:04X}{what}, which is not allowed in names (allowed: {NAME_ALPHABET})"
    ))
}

/// The name of an object (not a generator): the alphabet without `⊗`.
pub fn check_object_name(name: &str) -> Result<(), String> {
    check_name(name)?;
    match name.contains('⊗') {
        true => Err(format!("name \"{name}\" contains ⊗, which only generator names may hold (as x⊗y); a statement would read it as a tensor product")),
        false => Ok(()),
    }
}

/// A map name: an object name, and not `id_…`, which statements use for identity maps.
pub fn check_map_name(name: &str) -> Result<(), String> {
    check_object_name(name)?;
    if name.starts_with("id_") {
        return Err(format!("name \"{name}\" begins with \"id_\", which statements use for identity maps"));
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn the_alphabet() {
        for ok in ["K", "x0⊗z", "C'.x", "pi_C", "gr_U", "a.b"] {
            assert!(check_name(ok).is_ok(), "{ok}");
        }
        for (bad, cp) in
            [("U^3·F", "U+005E"), ("a\nb", "U+000A"), ("F\u{200d}", "U+200D"), ("a b", "U+0020"), ("Ϝ", "U+03DC")]
        {
            assert!(check_name(bad).unwrap_err().contains(cp), "{bad}");
        }
        assert!(check_name("").is_err());
        // Callers prefix the kind ("map …"): the message must not say "map" itself.
        assert!(check_map_name("id_K").unwrap_err().starts_with("name \"id_K\" begins with \"id_\""));
        assert!(check_object_name("F⊗G").unwrap_err().contains("only generator names"));
        assert!(check_map_name("F⊗G").is_err() && check_object_name("F.G").is_ok());
        assert_eq!(visible("F\u{200d}G"), "F<U+200D>G");
    }
}
