//! A pre-scan of the raw XML for element nesting depth, before the tree is built.
//!
//! roxmltree 0.20 parses element content recursively (`tokenizer.rs`: `parse_element` calls
//! `parse_content`, which calls `parse_element`), so a file nested a hundred thousand deep
//! would overflow the stack inside the XML parser. This scan counts start and end tags without
//! recursion (skipping comments, CDATA, processing instructions, the DOCTYPE and quoted
//! attribute values) and refuses the file above `MAX_DEPTH`. Markup inside entity values can
//! nest further when expanded; roxmltree allows at most 10 levels of entity references
//! (`LoopDetector` in `parse.rs`), so each level adds at most the most start tags of any one
//! entity value, and the bound counts that too.

use crate::InputError;

use super::MAX_DEPTH;

/// Line and column (from 1, in characters) of a byte offset.
fn line_col(text: &str, at: usize) -> String {
    let before = &text[..at];
    let line = before.matches('\n').count() + 1;
    let col = before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
    format!("line {line}, column {col}")
}

/// The offset just past the first `pat` at or after `from` (or the end).
fn skip_past(b: &[u8], from: usize, pat: &[u8]) -> usize {
    b.get(from..)
        .and_then(|rest| rest.windows(pat.len()).position(|w| w == pat))
        .map_or(b.len(), |p| from + p + pat.len())
}

/// The offset of the closing quote of a quoted value starting at `from` (or the end).
fn closing_quote(b: &[u8], from: usize) -> usize {
    let q = b[from];
    b[from + 1..]
        .iter()
        .position(|&c| c == q)
        .map_or(b.len(), |p| from + 1 + p)
}

/// Skips a `<!...>` declaration (DOCTYPE with its internal subset); returns the end and the
/// most `<` found in any one quoted value inside it.
fn skip_declaration(b: &[u8], from: usize) -> (usize, usize) {
    let (mut j, mut brackets, mut most) = (from + 2, 0usize, 0usize);
    while j < b.len() {
        match b[j] {
            b'"' | b'\'' => {
                let end = closing_quote(b, j);
                most = most.max(b[j..end].iter().filter(|&&c| c == b'<').count());
                j = end + 1;
                continue;
            }
            b'<' if b[j..].starts_with(b"<!--") => {
                j = skip_past(b, j + 4, b"-->");
                continue;
            }
            b'[' => brackets += 1,
            b']' => brackets = brackets.saturating_sub(1),
            b'>' if brackets == 0 => return (j + 1, most),
            _ => {}
        }
        j += 1;
    }
    (b.len(), most)
}

/// Refuses text whose elements nest deeper than `MAX_DEPTH` (an over-estimate when entity
/// values hold markup).
pub(super) fn check_nesting(file: &str, text: &str) -> Result<(), InputError> {
    let b = text.as_bytes();
    let (mut i, mut depth, mut deepest, mut entity_tags, mut doctype_at) =
        (0, 0usize, 0usize, 0, 0);
    let too_deep = |at: usize| {
        InputError::at(
            file,
            line_col(text, at),
            format!("elements nested more than {MAX_DEPTH} deep: over the limit"),
        )
    };
    while i < b.len() {
        if b[i] != b'<' {
            i += 1;
            continue;
        }
        let rest = &b[i..];
        if rest.starts_with(b"<!--") {
            i = skip_past(b, i + 4, b"-->");
        } else if rest.starts_with(b"<![CDATA[") {
            i = skip_past(b, i + 9, b"]]>");
        } else if rest.starts_with(b"<?") {
            i = skip_past(b, i + 2, b"?>");
        } else if rest.starts_with(b"<!") {
            let (end, most) = skip_declaration(b, i);
            if most > entity_tags {
                entity_tags = most;
                doctype_at = i;
            }
            i = end;
        } else if rest.starts_with(b"</") {
            depth = depth.saturating_sub(1);
            i = skip_past(b, i + 2, b">");
        } else {
            let mut j = i + 1;
            while j < b.len() && b[j] != b'>' {
                if b[j] == b'"' || b[j] == b'\'' {
                    j = closing_quote(b, j);
                }
                j += 1;
            }
            if j <= b.len() && b.get(j.wrapping_sub(1)) != Some(&b'/') {
                depth += 1;
                if depth > MAX_DEPTH {
                    return Err(too_deep(i));
                }
                deepest = deepest.max(depth);
            }
            i = j + 1;
        }
    }
    if deepest + 10 * entity_tags > MAX_DEPTH {
        return Err(InputError::at(
            file,
            line_col(text, doctype_at),
            format!(
                "entity values hold markup that could nest elements more than {MAX_DEPTH} deep when expanded: refused"
            ),
        ));
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn counts_only_real_tags() {
        let deep = "<g>".repeat(MAX_DEPTH);
        let ok = format!(
            "<svg><!-- {deep} --><![CDATA[{deep}]]><g a=\"<g>\" b='x>'/>{}</svg>",
            "<g/>".repeat(1000)
        );
        assert!(check_nesting("f", &ok).is_ok());
        let bad = format!("<svg>\n {}", "<g>".repeat(MAX_DEPTH));
        let e = check_nesting("f", &bad).unwrap_err();
        assert_eq!(
            e.place.as_deref(),
            Some(&*format!("line 2, column {}", 2 + 3 * (MAX_DEPTH - 1)))
        );
    }

    #[test]
    fn entity_markup_counts() {
        let s = format!(
            "<!DOCTYPE svg [<!ENTITY e \"{}\">]><svg>&e;</svg>",
            "<g>".repeat(30)
        );
        assert!(check_nesting("f", &s).is_err());
        let s = "<!DOCTYPE svg [<!ENTITY ns \"http://www.w3.org/2000/svg\">]><svg/>";
        assert!(check_nesting("f", s).is_ok());
    }
}
