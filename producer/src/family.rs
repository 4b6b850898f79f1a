//! Families of problems indexed by an integer parameter: `tubecert family TEMPLATE --param
//! p=1..8`. In a template, `{expr}` inside a string is replaced by the value of an integer
//! expression in the parameter (`+ - *`, parentheses); a string that is exactly `"{expr}"`
//! becomes a JSON integer. Each member is proved and gets its own certificate.

use serde_json::Value;

/// `NAME=LO..HI` (inclusive).
pub fn parse_param(text: &str) -> Result<(String, i64, i64), String> {
    let err = |why: &str| format!("--param \"{text}\": {why}; expected NAME=LO..HI, e.g. p=1..8");
    let (name, range) = text.split_once('=').ok_or_else(|| err("no '='"))?;
    let (lo, hi) = range.split_once("..").ok_or_else(|| err("no '..'"))?;
    let number = |s: &str, what: &str| s.trim().parse::<i64>().map_err(|_| err(&format!("{what} is not an integer")));
    let (lo, hi) = (number(lo, "LO")?, number(hi, "HI")?);
    if name.is_empty() || !name.chars().all(|c| c.is_ascii_alphabetic()) {
        return Err(err("NAME must be ASCII letters"));
    }
    if lo > hi {
        return Err(err("LO must be at most HI"));
    }
    if hi.checked_sub(lo).is_none_or(|n| n > 1000) {
        return Err(err("at most 1001 values in one run (split the range)"));
    }
    Ok((name.to_string(), lo, hi))
}

/// `I/N` with 1 ≤ I ≤ N: the shard that runs the members at positions I, I + N, I + 2N, … of the
/// parameter order (1-based), so a job array or a CI matrix can split a family with nothing of
/// ours doing the distributing.
pub fn parse_shard(text: &str) -> Result<(u64, u64), String> {
    let err = |why: &str| format!("--shard \"{text}\": {why}; expected I/N with 1 ≤ I ≤ N, e.g. 2/8");
    let (i, n) = text.split_once('/').ok_or_else(|| err("no '/'"))?;
    let number =
        |s: &str, what: &str| s.trim().parse::<u64>().map_err(|_| err(&format!("{what} is not a whole number")));
    let (i, n) = (number(i, "I")?, number(n, "N")?);
    if n == 0 {
        return Err(err("N must be at least 1"));
    }
    if i == 0 || i > n {
        return Err(err(&format!("I must be between 1 and {n}")));
    }
    Ok((i, n))
}

/// Evaluates an integer expression in one variable.
pub fn eval(expr: &str, name: &str, value: i64) -> Result<i64, String> {
    struct P<'a> {
        s: &'a [u8],
        i: usize,
        name: &'a str,
        value: i64,
    }
    impl P<'_> {
        fn ws(&mut self) {
            while self.i < self.s.len() && self.s[self.i] == b' ' {
                self.i += 1;
            }
        }
        fn sum(&mut self) -> Result<i64, String> {
            let mut v = self.product()?;
            loop {
                self.ws();
                match self.s.get(self.i) {
                    Some(b'+') => {
                        self.i += 1;
                        v = v.checked_add(self.product()?).ok_or("overflow")?;
                    }
                    Some(b'-') => {
                        self.i += 1;
                        v = v.checked_sub(self.product()?).ok_or("overflow")?;
                    }
                    _ => return Ok(v),
                }
            }
        }
        fn product(&mut self) -> Result<i64, String> {
            let mut v = self.atom()?;
            loop {
                self.ws();
                if self.s.get(self.i) == Some(&b'*') {
                    self.i += 1;
                    v = v.checked_mul(self.atom()?).ok_or("overflow")?;
                } else {
                    return Ok(v);
                }
            }
        }
        fn atom(&mut self) -> Result<i64, String> {
            self.ws();
            let rest = &self.s[self.i..];
            match rest.first() {
                Some(b'-') => {
                    self.i += 1;
                    self.atom()?.checked_neg().ok_or_else(|| "overflow".into())
                }
                Some(b'(') => {
                    self.i += 1;
                    let v = self.sum()?;
                    self.ws();
                    if self.s.get(self.i) != Some(&b')') {
                        return Err(format!("expected ')' at column {}", self.i + 1));
                    }
                    self.i += 1;
                    Ok(v)
                }
                Some(c) if c.is_ascii_digit() => {
                    let n = rest.iter().take_while(|c| c.is_ascii_digit()).count();
                    self.i += n;
                    std::str::from_utf8(&rest[..n]).expect("digits").parse().map_err(|_| "number too large".into())
                }
                _ if rest.starts_with(self.name.as_bytes()) => {
                    self.i += self.name.len();
                    Ok(self.value)
                }
                _ => Err(format!("expected a number, {} or '(' at column {}", self.name, self.i + 1)),
            }
        }
    }
    let mut p = P { s: expr.as_bytes(), i: 0, name, value };
    let v = p.sum()?;
    p.ws();
    if p.i != p.s.len() {
        return Err(format!("unexpected '{}' at column {}", expr[p.i..].chars().next().unwrap_or(' '), p.i + 1));
    }
    Ok(v)
}

/// Substitutes the parameter throughout a template.
pub fn instantiate(template: &Value, name: &str, value: i64) -> Result<Value, String> {
    Ok(match template {
        Value::String(s) => {
            let mut out = String::new();
            let mut rest = s.as_str();
            while let Some(start) = rest.find('{') {
                let end = rest[start..].find('}').ok_or_else(|| format!("\"{s}\": '{{' without '}}'"))? + start;
                let v = eval(&rest[start + 1..end], name, value).map_err(|e| format!("\"{s}\": {e}"))?;
                if start == 0 && end == rest.len() - 1 && out.is_empty() {
                    return Ok(Value::from(v));
                }
                out.push_str(&rest[..start]);
                out.push_str(&v.to_string());
                rest = &rest[end + 1..];
            }
            out.push_str(rest);
            Value::String(out)
        }
        Value::Array(items) => {
            Value::Array(items.iter().map(|i| instantiate(i, name, value)).collect::<Result<_, _>>()?)
        }
        Value::Object(m) => {
            let mut o = serde_json::Map::new();
            for (k, v) in m {
                o.insert(
                    instantiate(&Value::String(k.clone()), name, value)?
                        .as_str()
                        .map(String::from)
                        .unwrap_or_else(|| k.clone()),
                    instantiate(v, name, value)?,
                );
            }
            Value::Object(o)
        }
        other => other.clone(),
    })
}

/// Substitutes the parameter in a text template: each `{expr}` becomes its value.
pub fn instantiate_text(template: &str, name: &str, value: i64) -> Result<String, String> {
    let mut out = String::new();
    for (no, full) in template.lines().enumerate() {
        // Comments are copied as they are.
        let (line, comment) = full.split_at(full.find('#').unwrap_or(full.len()));
        let mut rest = line;
        while let Some(start) = rest.find('{') {
            let end = rest[start..].find('}').ok_or_else(|| format!("line {}: '{{' without '}}'", no + 1))? + start;
            let v = eval(&rest[start + 1..end], name, value).map_err(|e| format!("line {}: {e}", no + 1))?;
            out.push_str(&rest[..start]);
            out.push_str(&v.to_string());
            rest = &rest[end + 1..];
        }
        out.push_str(rest);
        out.push_str(comment);
        out.push('\n');
    }
    Ok(out)
}

/// Proves every member of a family; writes `STEM-NAMEv.problem.json` (the explicit instance, or
/// the instance as written when it has bordered objects) and its certificate into `out`;
/// returns the table as Markdown lines and whether every goal held as stated. With `shard = Some((i, n))` only the members at positions i, i + n, … (1-based,
/// in parameter order) are proved; each writes exactly what a whole run writes for it.
pub fn run(
    template_path: &std::path::Path,
    param: &str,
    shard: Option<(u64, u64)>,
    out: &std::path::Path,
    options: crate::prove::Options,
) -> Result<(Vec<String>, bool), Vec<String>> {
    let (name, lo, hi) = parse_param(param).map_err(|e| vec![e])?;
    let (shard_i, shard_n) = shard.unwrap_or((1, 1));
    let file = template_path.display().to_string();
    let bytes = tubecert_format::limits::read_file(template_path).map_err(|e| vec![format!("{file}: {e}")])?;
    let text = String::from_utf8_lossy(&bytes);
    let json = crate::problem::is_json(&text);
    let template: Value = if json {
        crate::problem::refuse_repeated_keys(&text).map_err(|e| vec![format!("{file}:{e}")])?;
        serde_json::from_str(&text).map_err(|e| vec![format!("{file}: {e}")])?
    } else {
        Value::Null
    };
    let base = template_path.file_name().map(|n| n.to_string_lossy().to_string()).unwrap_or_default();
    let stem = [".template.json", ".template.txt", ".json", ".txt"]
        .iter()
        .find_map(|s| base.strip_suffix(s))
        .unwrap_or(&base)
        .to_string();
    std::fs::create_dir_all(out).map_err(|e| vec![format!("{}: {e}", out.display())])?;
    let mut rows = Vec::new();
    let mut all = true;
    for (position, v) in (1u64..).zip(lo..=hi) {
        if (position - 1) % shard_n != shard_i - 1 {
            continue;
        }
        let at = |e: String| format!("{file} with {name} = {v}: {e}");
        // The member as written (constructions and bordered sections kept), and as read.
        let (written, problem) = if json {
            let written = instantiate(&template, &name, v).map_err(|e| vec![at(e)])?;
            let typed = serde_json::from_value(written.clone()).map_err(|e| vec![at(e.to_string())])?;
            (written, crate::problem::from_written(typed).map_err(|es| es.into_iter().map(at).collect::<Vec<_>>())?)
        } else {
            // A text template: substitute in the source, then read it as any text problem, so
            // messages keep their line numbers.
            let source = instantiate_text(&text, &name, v).map_err(|e| vec![at(e)])?;
            let problem = crate::problem::parse_problem(source.as_bytes(), &format!("{file} with {name} = {v}"))?;
            let written = match problem.bordered {
                Some(_) => crate::problem::written_value(source.as_bytes()).map_err(|es| {
                    es.into_iter().map(|e| format!("{file} with {name} = {v}:{e}")).collect::<Vec<_>>()
                })?,
                None => Value::Null,
            };
            (written, problem)
        };
        // The explicit instance, unless the member has bordered objects: the explicit form holds
        // only complexes and maps, and proving it again would lose their claims. Such a member
        // is written as the template makes it (JSON either way), the file `demo` writes.
        let instance = match problem.bordered {
            Some(_) => crate::demo::written_bytes(&written),
            None => crate::demo::problem_bytes(&problem),
        };
        let ctx = crate::validate::validate(&problem).map_err(|es| es.into_iter().map(at).collect::<Vec<_>>())?;
        let objects = problem.bordered_claims.len();
        let proved = crate::prove::prove_with(problem, &ctx, &instance, options).map_err(|e| vec![at(e)])?;
        all &= proved.all_as_stated;
        let member = format!("{stem}-{name}{v}");
        let write = |path: std::path::PathBuf, b: &[u8]| {
            std::fs::write(&path, b).map_err(|e| vec![format!("{}: {e}", path.display())])
        };
        write(out.join(format!("{member}.problem.json")), &instance)?;
        write(out.join(format!("{member}.cert.json")), &proved.file)?;
        // The claims that come with bordered objects (relations, complements, pairings) come
        // first; the table shows what the goals proved and counts the others.
        let claims = &proved.certificate.body.claims;
        let mut cell: Vec<String> = claims.iter().skip(objects).map(|c| c.statement().to_string()).collect();
        if objects > 0 {
            cell.push(format!("and {objects} claims on the bordered objects (in the certificate)"));
        }
        if rows.is_empty() {
            rows.push(format!("| {name} | claims | certificate sha256 |"));
            rows.push("|---|---|---|".into());
        }
        rows.push(format!("| {v} | {} | `{}…` |", cell.join("; "), &proved.certificate.sha256[..16]));
    }
    Ok((rows, all))
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn expressions_and_substitution() {
        assert_eq!(eval("2*p+1", "p", 3), Ok(7));
        assert_eq!(eval("-(p - 4) * 2", "p", 1), Ok(6));
        assert!(eval("p +", "p", 1).is_err());
        assert!(eval("q", "p", 1).is_err());
        let t = serde_json::json!({"x{p}": ["{1-2*p}", "U^{p}", 5]});
        assert_eq!(instantiate(&t, "p", 3).unwrap(), serde_json::json!({"x3": [-5, "U^3", 5]}));
        assert_eq!(parse_param("p=1..8"), Ok(("p".into(), 1, 8)));
        assert!(parse_param("p=3..1").is_err());
        assert_eq!(parse_shard("2/8"), Ok((2, 8)));
        assert_eq!(parse_shard("1/1"), Ok((1, 1)));
        for bad in ["0/3", "4/3", "1/0", "3", "a/3", "1/-2", "-1/3", ""] {
            let e = parse_shard(bad).unwrap_err();
            assert!(e.contains(&format!("\"{bad}\"")) && e.contains("1 ≤ I ≤ N"), "{bad}: {e}");
        }
    }
}
