//! The words of a draft's line: where an item's text starts after its
//! bullet or number, and each word with the marks that set it apart as a
//! code (quotes, backticks, bold).

/// A word of a line, with its byte range and whether the writer set it
/// apart as a code (quotes, backticks, bold, a table's code column).
#[derive(Clone, Debug, PartialEq, Eq)]
pub(super) struct Word {
    pub(super) start: usize,
    pub(super) end: usize,
    pub(super) apart: bool,
}

const SEPARATORS: &[char] = &[
    ',', ';', '/', '(', ')', '[', ']', '{', '}', '<', '>', '|', '=', '+', '!', '?', '\\', '&', '~',
    '^', '$', '@', '“', '”', '‘', '’', '«', '»', '·', '•',
];

fn is_sep(c: char) -> bool {
    c.is_whitespace() || SEPARATORS.contains(&c)
}

/// Where an item's text starts: after indentation, block quotes, a bullet
/// (`-`, `*`, `+`, `•`), a number (`1.`, `2)`, `(3)`) or a task box.
pub(super) fn item_start(line: &str) -> usize {
    let mut i = 0;
    let b = line.as_bytes();
    loop {
        let rest = &line[i..];
        let trimmed = rest.trim_start();
        i += rest.len() - trimmed.len();
        let t = trimmed;
        let marker = if t.starts_with("> ") || t == ">" {
            1
        } else if let Some(c) = t
            .chars()
            .next()
            .filter(|c| matches!(c, '-' | '*' | '+' | '•' | '·' | '–' | '—'))
        {
            let n = c.len_utf8();
            if t[n..].starts_with(' ') && !t.starts_with("--") {
                n
            } else {
                0
            }
        } else if t.starts_with("[ ] ") || t.starts_with("[x] ") || t.starts_with("[X] ") {
            3
        } else {
            let digits = t.bytes().take_while(u8::is_ascii_digit).count();
            let paren = t.starts_with('(');
            let d = if paren {
                t[1..].bytes().take_while(u8::is_ascii_digit).count()
            } else {
                digits
            };
            if (1..=3).contains(&d) {
                let after = if paren { 1 + d } else { d };
                let closer = t.as_bytes().get(after);
                let ok = if paren {
                    closer == Some(&b')')
                } else {
                    matches!(closer, Some(b'.') | Some(b')'))
                };
                if ok && t.as_bytes().get(after + 1) == Some(&b' ') {
                    after + 1
                } else {
                    0
                }
            } else {
                0
            }
        };
        if marker == 0 || i + marker > b.len() {
            return i;
        }
        i += marker;
    }
}

/// Trims markdown marks and sentence punctuation off a word. Returns the
/// trimmed range and whether marks set it apart (bold, italics).
fn trim_word(line: &str, mut s: usize, mut e: usize) -> (usize, usize, bool) {
    let mut apart = false;
    let mut lead_star = false;
    loop {
        let w = &line[s..e];
        if w.starts_with("**") || w.starts_with("__") {
            s += 2;
            apart = true;
            lead_star = true;
        } else if w.starts_with('*') || w.starts_with('_') {
            s += 1;
            apart = true;
            lead_star = true;
        } else if w.starts_with(['.', ':', '-', '–', '—', '#']) && w.len() > 1 {
            s += w.chars().next().map_or(1, char::len_utf8);
        } else {
            break;
        }
    }
    loop {
        let w = &line[s..e];
        if w.is_empty() {
            break;
        }
        if w.ends_with("**") || w.ends_with("__") {
            e -= 2;
            apart = true;
        } else if (w.ends_with('*') || w.ends_with('_')) && (lead_star || w.ends_with("_")) {
            e -= 1;
        } else if w.ends_with(".-") {
            break;
        } else if let Some(c) = w
            .chars()
            .last()
            .filter(|c| matches!(c, '.' | ':' | '-' | '–' | '—' | '…' | '*'))
        {
            if c == '*' && !lead_star {
                break;
            }
            e -= c.len_utf8();
        } else {
            break;
        }
    }
    (s, e.max(s), apart)
}

/// The words of a line from byte `from`, with quoted and backticked
/// literals set apart.
pub(super) fn words(line: &str, from: usize) -> Vec<Word> {
    let mut out = Vec::new();
    let mut i = from;
    let mut start: Option<usize> = None;
    let push = |out: &mut Vec<Word>, s: usize, e: usize, apart: bool| {
        let (s, e, marked) = trim_word(line, s, e);
        if e > s {
            out.push(Word {
                start: s,
                end: e,
                apart: apart || marked,
            });
        }
    };
    while i < line.len() {
        let c = line[i..].chars().next().unwrap_or(' ');
        let n = c.len_utf8();
        if matches!(c, '\'' | '"' | '`') {
            let opens =
                start.is_none() && (i == 0 || !line[..i].ends_with(|p: char| p.is_alphanumeric()));
            if opens {
                if let Some(close) = line[i + n..].find(c) {
                    let inner_s = i + n;
                    let inner_e = inner_s + close;
                    // The literal's words, each set apart.
                    let mut j = inner_s;
                    let mut ws: Option<usize> = None;
                    while j < inner_e {
                        let d = line[j..].chars().next().unwrap_or(' ');
                        if is_sep(d) {
                            if let Some(s) = ws.take() {
                                push(&mut out, s, j, true);
                            }
                        } else if ws.is_none() {
                            ws = Some(j);
                        }
                        j += d.len_utf8();
                    }
                    if let Some(s) = ws {
                        push(&mut out, s, inner_e, true);
                    }
                    i = inner_e + n;
                    continue;
                }
            }
            if let Some(s) = start.take() {
                push(&mut out, s, i, false);
            }
        } else if is_sep(c) {
            if let Some(s) = start.take() {
                push(&mut out, s, i, false);
            }
        } else if start.is_none() {
            start = Some(i);
        }
        i += n;
    }
    if let Some(s) = start {
        push(&mut out, s, line.len(), false);
    }
    out
}

/// Whether only separators, conjunctions and quotes stand between two
/// byte offsets: the second code continues a run of codes.
pub(super) fn in_run(between: &str) -> bool {
    between
        .split(|c: char| is_sep(c) || matches!(c, '\'' | '"' | '`' | '*' | '-' | '–' | ':'))
        .all(|w| {
            matches!(
                w.to_ascii_lowercase().as_str(),
                "" | "and" | "or" | "og" | "und" | "et"
            )
        })
}

#[cfg(test)]
mod tests {
    use crate::list::text::read;
    use crate::list::text::tests::{e, got};
    use crate::list::LineKind;

    #[test]
    fn markdown_bullets_bold_and_backticks() {
        let d = "## Diabetes\n\n- **E11.9** – Type 2 diabetes mellitus without complications\n1. `E11.65`: Type 2 diabetes mellitus with hyperglycemia\n* *I10* (Essential hypertension)\n";
        assert_eq!(
            got(d),
            [
                e(
                    3,
                    "E11.9",
                    Some("Type 2 diabetes mellitus without complications")
                ),
                e(
                    4,
                    "E11.65",
                    Some("Type 2 diabetes mellitus with hyperglycemia")
                ),
                e(5, "I10", Some("Essential hypertension")),
            ]
        );
        let r = read(d, false);
        assert_eq!(r.facts.form, "markdown");
        assert_eq!(r.lines[0].kind, LineKind::Text);
    }

    #[test]
    fn code_literals() {
        assert_eq!(
            got("WHERE dx IN ('A41.9', 'A40.0') OR dx LIKE 'A40%' AND d >= '2019-01-01'\n")
                .into_iter()
                .map(|x| x.1)
                .collect::<Vec<_>>(),
            ["A41.9", "A40.0", "A40%"]
        );
        assert_eq!(got("dx <- c(\"250.00\", \"E11.9\")  # diabetes\n").len(), 2);
        assert_eq!(got("codes = ['e11.9', 'i10']\n").len(), 2);
    }
}
