//! A fast reader for the plain TOML subset that `mixtures/tools/make_components.py` writes (the embedded
//! component and gas files): comments, `[table]` and `[table.sub]` headers, and one-line `bare-key = value`
//! pairs whose values are basic strings without escapes, literal strings, integers, floats, booleans and
//! one-line arrays and inline tables of those. Anything else (escapes, multi-line values, dotted or quoted keys,
//! dates, repeated keys or tables, control characters) returns None, and the caller parses the file with the
//! `toml` crate, which also gives the error messages. The full parser costs about 120 instructions per byte; a
//! start that needs 40 components spent 20 M instructions in it. A unit test compares both readers' tables for
//! every embedded file.

use toml::{Table, Value};

/// The document as a table, when every line is in the subset; None otherwise.
pub fn parse_table(text: &str) -> Option<Table> {
    if text.bytes().any(|b| b < 0x20 && b != b'\t' && b != b'\n') || text.contains('\u{7f}') {
        return None;
    }
    let mut root = Table::new();
    // the key path of the current table; headers seen (a repeated header is an error for the full parser)
    let mut path: Vec<String> = vec![];
    let mut headers: Vec<Vec<String>> = vec![];
    for line in text.split('\n') {
        let line = line.trim_matches(is_blank);
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        if let Some(rest) = line.strip_prefix('[') {
            if rest.starts_with('[') {
                return None;
            }
            let close = rest.find(']')?;
            if !comment_or_nothing(&rest[close + 1..]) {
                return None;
            }
            let keys: Vec<String> = rest[..close].split('.').map(|k| k.trim_matches(is_blank)).map(|k| bare_key(k).map(str::to_string)).collect::<Option<_>>()?;
            if headers.contains(&keys) {
                return None;
            }
            // a header names a new table; its parents may exist (as tables made by headers)
            let (last, parents) = keys.split_last()?;
            let parent = table_at(&mut root, parents)?;
            if parent.contains_key(last) {
                return None;
            }
            parent.insert(last.clone(), Value::Table(Table::new()));
            headers.push(keys.clone());
            path = keys;
            continue;
        }
        let (key, rest) = line.split_once('=')?;
        let key = bare_key(key.trim_matches(is_blank))?;
        let (value, rest) = value(rest.trim_start_matches(is_blank))?;
        if !comment_or_nothing(rest) {
            return None;
        }
        let table = table_at(&mut root, &path)?;
        if table.contains_key(key) {
            return None;
        }
        table.insert(key.to_string(), value);
    }
    Some(root)
}

/// The table at `path` below `root` (every step a table made by a header).
fn table_at<'a>(root: &'a mut Table, path: &[String]) -> Option<&'a mut Table> {
    let mut t = root;
    for k in path {
        t = match t.get_mut(k)? {
            Value::Table(inner) => inner,
            _ => return None,
        };
    }
    Some(t)
}

/// A TOML blank (space or tab).
#[inline]
fn is_blank(c: char) -> bool {
    c == ' ' || c == '\t'
}

/// Only blanks, or blanks and a comment.
fn comment_or_nothing(rest: &str) -> bool {
    let rest = rest.trim_start_matches(is_blank);
    rest.is_empty() || rest.starts_with('#')
}

/// A bare key (A-Z a-z 0-9 - _, not empty).
fn bare_key(key: &str) -> Option<&str> {
    (!key.is_empty() && key.bytes().all(|b| b.is_ascii_alphanumeric() || b == b'-' || b == b'_')).then_some(key)
}

/// One value at the start of `s`, and the rest of the line after it.
fn value(s: &str) -> Option<(Value, &str)> {
    let first = *s.as_bytes().first()?;
    match first {
        b'"' => {
            if s.starts_with("\"\"\"") {
                return None;
            }
            let body = &s[1..];
            let close = body.find('"')?;
            let text = &body[..close];
            if text.contains('\\') {
                return None;
            }
            Some((Value::String(text.to_string()), &body[close + 1..]))
        }
        b'\'' => {
            if s.starts_with("'''") {
                return None;
            }
            let body = &s[1..];
            let close = body.find('\'')?;
            Some((Value::String(body[..close].to_string()), &body[close + 1..]))
        }
        b'[' => {
            let mut items = vec![];
            let mut rest = s[1..].trim_start_matches(is_blank);
            loop {
                if let Some(after) = rest.strip_prefix(']') {
                    return Some((Value::Array(items), after));
                }
                let (v, after) = value(rest)?;
                items.push(v);
                rest = after.trim_start_matches(is_blank);
                if let Some(after) = rest.strip_prefix(',') {
                    rest = after.trim_start_matches(is_blank);
                } else if !rest.starts_with(']') {
                    return None;
                }
            }
        }
        b'{' => {
            let mut table = Table::new();
            let mut rest = s[1..].trim_start_matches(is_blank);
            if let Some(after) = rest.strip_prefix('}') {
                return Some((Value::Table(table), after));
            }
            loop {
                let (key, after) = rest.split_once('=')?;
                let key = bare_key(key.trim_matches(is_blank))?;
                let (v, after) = value(after.trim_start_matches(is_blank))?;
                if table.insert(key.to_string(), v).is_some() {
                    return None;
                }
                rest = after.trim_start_matches(is_blank);
                if let Some(after) = rest.strip_prefix('}') {
                    return Some((Value::Table(table), after));
                }
                // a trailing comma before `}` is left to the full parser
                rest = rest.strip_prefix(',')?.trim_start_matches(is_blank);
                if rest.starts_with('}') {
                    return None;
                }
            }
        }
        b't' if s.starts_with("true") => Some((Value::Boolean(true), &s[4..])),
        b'f' if s.starts_with("false") => Some((Value::Boolean(false), &s[5..])),
        _ => number(s),
    }
}

/// A decimal integer or float at the start of `s` (no underscores, hex, inf or nan: those go to the full parser).
fn number(s: &str) -> Option<(Value, &str)> {
    let end = s.bytes().position(|b| !(b.is_ascii_digit() || matches!(b, b'+' | b'-' | b'.' | b'e' | b'E'))).unwrap_or(s.len());
    let (text, rest) = s.split_at(end);
    let unsigned = text.strip_prefix(['+', '-']).unwrap_or(text);
    let int_part_end = unsigned.bytes().position(|b| !b.is_ascii_digit()).unwrap_or(unsigned.len());
    let int_part = &unsigned[..int_part_end];
    // digits first, no leading zero (except a lone 0)
    if int_part.is_empty() || (int_part.len() > 1 && int_part.starts_with('0')) {
        return None;
    }
    let tail = &unsigned[int_part_end..];
    if tail.is_empty() {
        return Some((Value::Integer(text.parse().ok()?), rest));
    }
    // a fraction needs digits on both sides of the point; an exponent needs digits after its optional sign
    let mut t = tail;
    if let Some(frac) = t.strip_prefix('.') {
        let n = frac.bytes().position(|b| !b.is_ascii_digit()).unwrap_or(frac.len());
        if n == 0 {
            return None;
        }
        t = &frac[n..];
    }
    if let Some(exp) = t.strip_prefix(['e', 'E']) {
        let exp = exp.strip_prefix(['+', '-']).unwrap_or(exp);
        if exp.is_empty() || !exp.bytes().all(|b| b.is_ascii_digit()) {
            return None;
        }
        t = "";
    }
    if !t.is_empty() {
        return None;
    }
    let v: f64 = text.parse().ok()?;
    v.is_finite().then_some((Value::Float(v), rest))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every embedded TOML file that the subset reader accepts gives the table the `toml` crate gives, and it
    /// accepts every component and gas file.
    #[test]
    fn subset_tables_equal_the_full_parse_for_every_embedded_file() {
        let mut read = 0;
        for (path, text) in super::super::library::EMBEDDED_FILES {
            let full: Table = toml::from_str(text).unwrap_or_else(|e| panic!("{path}: {e}"));
            match parse_table(text) {
                Some(t) => {
                    assert_eq!(t, full, "{path}");
                    read += 1;
                }
                None => assert!(!(path.starts_with("components/") || *path == "gases.toml"), "{path}: not read by the subset reader"),
            }
        }
        assert!(read >= 60, "{read}");
    }

    /// Texts outside the subset are left to the full parser; inside it, both agree.
    #[test]
    fn outside_the_subset_is_left_to_the_full_parser() {
        for text in [
            "a = \"x\\ty\"\n",
            "a = \"\"\"\nx\"\"\"\n",
            "a.b = 1\n",
            "\"a\" = 1\n",
            "a = [\n1]\n",
            "a = 1\na = 2\n",
            "[t]\n[t]\n",
            "[[t]]\n",
            "a = 1_000\n",
            "a = 0x10\n",
            "a = inf\n",
            "a = 1.\n",
            "a = .5\n",
            "a = 01\n",
            "a = 1979-05-27\n",
            "a = { b = 1, }\n",
            "a = 1 b\n",
            "a = \"x\"\r\n",
            "a = 1e\n",
            "[t]\nx = 1\n[t.x]\n",
        ] {
            assert!(parse_table(text).is_none(), "{text:?}");
        }
        for text in [
            "a = 1\nb = -2.5e-3 # c\n[t]\nc = [1, 2.0, \"x\", 'y', true]\n[t.u]\nd = { e = 1, f = \"g\" }\n",
            "a = []\nb = {}\nc = [ ]\nd = +3\ne = 0\nf = 0.0\ng = 1E5\nh = [1, 2,]\n",
        ] {
            let full: Table = toml::from_str(text).unwrap();
            assert_eq!(parse_table(text), Some(full), "{text:?}");
        }
    }
}
