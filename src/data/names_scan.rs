// The line scan of a component file's names, shared with build.rs (which includes this file to precompute the
// names of the embedded files); std only.

/// The lines of a component file before its first table header (`[...]`).
fn names_header(text: &str) -> &str {
    let mut pos = 0;
    for line in text.split_inclusive('\n') {
        if line.trim_start().starts_with('[') {
            return &text[..pos];
        }
        pos += line.len();
    }
    text
}

/// `id` and `aliases` of a header whose lines are blank, comments or one-line `bare-key = value` pairs, with
/// `id` a basic string and `aliases` a one-line array of basic strings (no escapes); None for anything else (the
/// TOML parser then decides).
fn scan_names(header: &str) -> Option<(String, Vec<String>)> {
    /// A basic string without escapes at the start of `s`, and the rest after it.
    fn string(s: &str) -> Option<(&str, &str)> {
        let body = s.strip_prefix('"')?;
        let close = body.find('"')?;
        let value = &body[..close];
        (!value.contains('\\')).then_some((value, &body[close + 1..]))
    }
    /// Nothing but blanks or a comment.
    fn empty(rest: &str) -> bool {
        let rest = rest.trim();
        rest.is_empty() || rest.starts_with('#')
    }
    let mut id = None;
    let mut aliases = None;
    for line in header.lines() {
        let line = line.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        let (key, value) = line.split_once('=')?;
        let (key, value) = (key.trim(), value.trim());
        let bare = !key.is_empty() && key.bytes().all(|b| b.is_ascii_alphanumeric() || b == b'-' || b == b'_');
        let multi_line = value.as_bytes().windows(3).any(|w| w == b"\"\"\"" || w == b"'''");
        if !bare || multi_line {
            return None;
        }
        match key {
            "id" => {
                let (value, rest) = string(value)?;
                if id.is_some() || !empty(rest) {
                    return None;
                }
                id = Some(value.to_string());
            }
            "aliases" => {
                let mut rest = value.strip_prefix('[')?.trim_start();
                let mut list = vec![];
                while !rest.starts_with(']') {
                    let (item, after) = string(rest)?;
                    list.push(item.to_string());
                    rest = after.trim_start();
                    if let Some(after) = rest.strip_prefix(',') {
                        rest = after.trim_start();
                    } else if !rest.starts_with(']') {
                        return None;
                    }
                }
                if aliases.is_some() || !empty(&rest[1..]) {
                    return None;
                }
                aliases = Some(list);
            }
            _ => {}
        }
    }
    Some((id?, aliases.unwrap_or_default()))
}
