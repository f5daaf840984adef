//! The label of each code on a line: the text that goes with it, cut from
//! around the code and cleaned of marks and filler words; and the system a
//! heading names.

use super::codes::{short_heading, Found};
use crate::list::tokens::names_system;

const FILLER: &[&str] = &[
    "please include",
    "please",
    "and",
    "or",
    "with",
    "including",
    "include",
    "includes",
    "e.g.",
    "eg",
    "i.e.",
    "ie",
    "such as",
    "like",
    "for",
    "the",
    "a",
    "an",
    "plus",
    "also",
    "use",
    "code",
    "codes",
    "patients with",
    "see",
    "see also",
    "is",
    "are",
    "as",
];

/// A label cut from the text around a code: marks, separators, comment
/// markers and filler words trimmed off both ends.
pub(super) fn clean_label(s: &str) -> Option<String> {
    let junk = |c: char| {
        c.is_whitespace()
            || matches!(
                c,
                '-' | '–'
                    | '—'
                    | ':'
                    | '|'
                    | '='
                    | ','
                    | ';'
                    | '*'
                    | '_'
                    | '`'
                    | '\''
                    | '"'
                    | '#'
                    | '/'
                    | '>'
                    | '<'
                    | '['
                    | ']'
                    | '{'
                    | '}'
                    | '“'
                    | '”'
                    | '‘'
                    | '’'
                    | '.'
                    | '•'
            )
    };
    let mut t = s.trim_matches(junk);
    // Unbalanced parentheses at the ends.
    loop {
        let before = t;
        if t.starts_with(')') {
            t = t[1..].trim_matches(junk);
        }
        if t.ends_with('(') {
            t = t[..t.len() - 1].trim_matches(junk);
        }
        if t.ends_with(')') && t.matches('(').count() < t.matches(')').count() {
            t = t[..t.len() - 1].trim_matches(junk);
        }
        if t.starts_with('(') && !t.contains(')') {
            t = t[1..].trim_matches(junk);
        }
        for f in FILLER {
            let b = t.as_bytes();
            let n = f.len();
            if b.len() > n && b[..n].eq_ignore_ascii_case(f.as_bytes()) && b[n] == b' ' {
                t = t[n..].trim_matches(junk);
            }
            let b = t.as_bytes();
            if b.len() > n
                && b[b.len() - n..].eq_ignore_ascii_case(f.as_bytes())
                && b[b.len() - n - 1] == b' '
            {
                t = t[..t.len() - n].trim_matches(junk);
            }
        }
        if t == before {
            break;
        }
    }
    let filler = FILLER.iter().any(|f| f.eq_ignore_ascii_case(t));
    (!filler && t.chars().filter(|c| c.is_alphabetic()).count() >= 2).then(|| t.to_string())
}

/// Where a label written after a code ends: the end of its clause.
fn clause_end(after: &str) -> usize {
    let mut end = after.len();
    for stop in [". ", "; ", "? ", "! "] {
        if let Some(i) = after.find(stop) {
            end = end.min(i);
        }
    }
    end
}

/// Where a label written before a code starts: after the last clause break.
fn clause_start(before: &str) -> usize {
    before
        .rfind([',', ';', '.', ':', '!', '?'])
        .map_or(0, |i| i + 1)
}

/// Comment markers of code literals (`'E11.9',  -- type 2 diabetes`).
const COMMENT_MARKS: &[&str] = &["--", "#", "//"];

/// The label of each code found on a line: the words in parentheses right
/// after it; the words before it when it stands in parentheses; the rest of
/// the item when the code opens it, or after a dash or colon; a comment
/// after a code literal; the words before a lone code ending in a colon or
/// a dash (`Hypertension: I10`).
pub(super) fn labels(line: &str, from: usize, found: &[Found], prose: bool) -> Vec<Option<String>> {
    let n = found.len();
    let marks: &[char] = &['*', '`', '\'', '"', ' ', '_'];
    (0..n)
        .map(|k| {
            let f = &found[k];
            let next = found.get(k + 1).map_or(line.len(), |g| g.start);
            let prev = if k == 0 { from } else { found[k - 1].end };
            let after = &line[f.end..next];
            let before = &line[prev..f.start];
            let after_t = after.trim_start_matches(marks);
            // `E11.9 (Type 2 diabetes)`
            if let Some(inner) = after_t.strip_prefix('(') {
                if let Some(close) = inner.find(')') {
                    if let Some(l) = clean_label(&inner[..close]) {
                        return Some(l);
                    }
                }
            }
            // `Type 2 diabetes (E11.9)`
            let b = before.trim_end_matches(marks);
            if b.ends_with('(') && after_t.starts_with(')') {
                let b = &b[..b.len() - 1];
                return clean_label(&b[clause_start(b)..]);
            }
            // `E11.9 - Type 2 diabetes`, `**E11.9**: Type 2`, or the code
            // opening its item (`E11.9 Type 2 diabetes`).
            // In prose a line may start anywhere in a sentence: only a
            // bullet or a number makes an item.
            let item = !prose || from > line.len() - line.trim_start().len();
            let opens_item = item && k == 0 && line[from..f.start].trim_matches(marks).is_empty();
            let dashed = after_t.starts_with(['-', '–', '—', ':', '|', '=']);
            // `Hypertension – I1O essential hypertension`: the code opens
            // what follows a short heading.
            let after_heading = k == 0 && {
                let head = line[from..f.start].trim_end_matches(marks);
                system_named(head).is_none() && short_heading(head)
            };
            if opens_item || dashed || after_heading {
                if let Some(l) = clean_label(&after[..clause_end(after)]) {
                    return Some(l);
                }
            }
            // `'E11.9',  -- type 2 diabetes`: a comment after the literal.
            if k + 1 == n {
                let rest = after.trim_start_matches(|c: char| {
                    matches!(c, '\'' | '"' | ',' | ')' | ']' | ' ' | ';')
                });
                if let Some(m) = COMMENT_MARKS.iter().find(|m| rest.starts_with(**m)) {
                    return clean_label(&rest[m.len()..]);
                }
            }
            // `Hypertension: I10`, the only code on the line; a heading
            // that names a system (`Procedures (ICD-10-PCS): ...`) says
            // which system, not what the code is.
            if n == 1 {
                let b = before.trim_end_matches(marks);
                if b.ends_with([':', '-', '–', '—', '=']) && system_named(b).is_none() {
                    return clean_label(b);
                }
            }
            None
        })
        .collect()
}

/// The system named by a line that holds no code (a heading, a note):
/// the one system it names, if exactly one.
pub(super) fn system_named(line: &str) -> Option<crate::systems::System> {
    let mut named: Vec<crate::systems::System> = line
        .split(|c: char| {
            c.is_whitespace() || matches!(c, '(' | ')' | ',' | ';' | '[' | ']' | '*' | '`')
        })
        .filter_map(names_system)
        .collect();
    named.dedup();
    (named.len() == 1).then(|| named[0])
}

#[cfg(test)]
mod tests {
    use crate::list::text::read;
    use crate::list::text::tests::{e, got};
    use crate::list::LineKind;

    #[test]
    fn prose_labels_come_from_around_the_code() {
        assert_eq!(
            got("Patients with type 2 diabetes (E11.9) or essential hypertension (I10) were included.\n"),
            [e(1, "E11.9", Some("type 2 diabetes")), e(1, "I10", Some("essential hypertension"))]
        );
        assert_eq!(
            got("Hypertension: I10\n"),
            [e(1, "I10", Some("Hypertension"))]
        );
    }

    /// A heading that names a system says which system, not what the code
    /// is: it is no label.
    #[test]
    fn a_system_heading_is_no_label() {
        let r = read(
            "Procedures (ICD-10-PCS): 02HA0QZ for the LVAD patients.\n",
            false,
        );
        let LineKind::Entry { label, system, .. } = &r.lines[0].kind else {
            panic!("an entry");
        };
        assert_eq!(label.as_deref(), None);
        assert_eq!(system.as_deref(), Some("ICD-10-PCS"));
    }
}
