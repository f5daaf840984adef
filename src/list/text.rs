//! Drafts read a line at a time: markdown (bullets, numbered items, bold and
//! backticks, tables, headings), prose with codes in sentences, and code
//! literals (SQL `IN (...)` and `LIKE`, R `c(...)`, Python and JavaScript
//! lists). Every code on a line is an entry of its own; the label of each is
//! the text that goes with it (in parentheses after it, after a dash or a
//! colon, or before it when it stands in parentheses).

use super::table::{heading_word, is_skip, plain_entry, LABEL_WORDS, SYSTEM_WORDS};
use super::tokens::{names_system, strength, system_by_shape, Strength};
use super::{lines_of, Draft, InputLine, LineKind, Place, Reading};

/// A word of a line, with its byte range and whether the writer set it
/// apart as a code (quotes, backticks, bold, a table's code column).
#[derive(Clone, Debug, PartialEq, Eq)]
struct Word {
    start: usize,
    end: usize,
    apart: bool,
}

/// A code found on a line.
#[derive(Clone, Debug, PartialEq, Eq)]
struct Found {
    start: usize,
    end: usize,
    code: String,
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
fn item_start(line: &str) -> usize {
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
fn words(line: &str, from: usize) -> Vec<Word> {
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
fn in_run(between: &str) -> bool {
    between
        .split(|c: char| is_sep(c) || matches!(c, '\'' | '"' | '`' | '*' | '-' | '–' | ':'))
        .all(|w| {
            matches!(
                w.to_ascii_lowercase().as_str(),
                "" | "and" | "or" | "og" | "und" | "et"
            )
        })
}

/// Words after a number that make it a measurement, not a code
/// (`100.4 F`, `250.0 mg`). Common practice.
const UNITS: &[&str] = &[
    "f", "c", "°", "°f", "°c", "mg", "g", "kg", "mcg", "µg", "ug", "lb", "lbs", "ml", "l", "dl",
    "mmol", "mmol/l", "mg/dl", "mmhg", "cm", "mm", "m", "units", "u", "iu", "bpm", "%", "ms", "s",
    "min", "h", "hours", "days", "weeks", "months", "years", "patients", "people", "cases",
    "percent",
];

/// Whether a number (`428.0`) in a sentence of a draft that holds codes is
/// one too: an ICD-9-CM shape with a dot and no unit after it.
fn number_in_code_draft(line: &str, w: &Word) -> bool {
    let text = &line[w.start..w.end];
    let next = line[w.end..]
        .split_whitespace()
        .next()
        .unwrap_or("")
        .trim_matches(|c: char| matches!(c, ',' | ';' | ')' | '.'))
        .to_ascii_lowercase();
    text.contains('.')
        && text.as_bytes()[0].is_ascii_digit()
        && !UNITS.contains(&next.as_str())
        && !next.starts_with('%')
}

/// Whether a line that opens with a listed shape reads as a list line
/// (`250.00 Diabetes mellitus`) rather than a sentence that wrapped onto it
/// (`365 days, with two or more outpatient encounters between`): a bullet
/// or a number before it, a dash, colon or tab after it, or a short line.
fn list_line(line: &str, from: usize, w: &Word) -> bool {
    let bullet = from > line.len() - line.trim_start().len();
    let after = line[w.end..].trim_start_matches([' ', '*', '`', '\'', '"']);
    let marked = line[w.end..].starts_with('\t')
        || after.starts_with(['-', '–', '—', ':', '|', '(', ',', ';'])
        || after.is_empty();
    bullet || marked || line[w.end..].split_whitespace().count() <= 8
}

/// Whether a listed shape with a letter O or I after its first character (a
/// code typed with a letter for a digit) comes right after a short heading
/// and a colon or dash on its line (`Hypertension: I1O essential
/// hypertension`, `**Hypertension** – I1O ...`): the heading names what the
/// code is for, as a bullet would set it apart. Other listed shapes there
/// (`Note: B2B contracts`) stay prose.
fn after_heading(line: &str, from: usize, w: &Word) -> bool {
    let text = &line[w.start..w.end];
    let letter_for_digit = text.as_bytes()[0].is_ascii_alphabetic()
        && text[1..].bytes().any(|b| matches!(b, b'O' | b'I'));
    if !letter_for_digit {
        return false;
    }
    short_heading(line[from..w.start].trim_end())
}

/// Whether `head`, the text of a line before a code, is a short heading
/// ended by a colon or dash (`Hypertension:`, `**Hypertension** –`): one to
/// four words.
fn short_heading(head: &str) -> bool {
    let Some(words) = head.strip_suffix([':', '–', '—', '-']) else {
        return false;
    };
    (1..=4).contains(&words.split_whitespace().count())
}

/// The codes of a line: strong shapes anywhere, listed shapes where set
/// apart, first in the item, or continuing a run of codes; with
/// `code_draft` (the draft holds codes elsewhere), dotted ICD-9-CM numbers
/// in sentences too.
fn codes(line: &str, from: usize, all_listed: bool) -> Vec<Found> {
    codes_in(line, from, all_listed, false)
}

fn codes_in(line: &str, from: usize, all_listed: bool, code_draft: bool) -> Vec<Found> {
    let ws = words(line, from);
    let mut out: Vec<Found> = Vec::new();
    for (k, w) in ws.iter().enumerate() {
        let text = &line[w.start..w.end];
        let s = strength(text);
        let take = match s {
            Strength::Strong => true,
            Strength::Listed => {
                all_listed
                    || w.apart
                    || k == 0 && w.start == from && list_line(line, from, w)
                    || after_heading(line, from, w)
                    || out.last().is_some_and(|p| in_run(&line[p.end..w.start]))
                    || code_draft && number_in_code_draft(line, w)
            }
            Strength::Prose => false,
        };
        if !take {
            continue;
        }
        // `E08 - E13`: a range written with spaces.
        if let Some(prev) = out.last_mut() {
            let between = &line[prev.end..w.start];
            if matches!(between.trim(), "-" | "–" | "to")
                && !prev.code.contains(['-', '–', '*', '%'])
            {
                let range = format!("{}-{}", prev.code, text);
                if strength(&range) == Strength::Strong {
                    prev.code = range;
                    prev.end = w.end;
                    continue;
                }
            }
        }
        out.push(Found {
            start: w.start,
            end: w.end,
            code: text.to_string(),
        });
    }
    out
}

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
fn clean_label(s: &str) -> Option<String> {
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
fn labels(line: &str, from: usize, found: &[Found], prose: bool) -> Vec<Option<String>> {
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
fn system_named(line: &str) -> Option<crate::systems::System> {
    let mut named: Vec<crate::systems::System> = line
        .split(|c: char| {
            c.is_whitespace() || matches!(c, '(' | ')' | ',' | ';' | '[' | ']' | '*' | '`')
        })
        .filter_map(names_system)
        .collect();
    named.dedup();
    (named.len() == 1).then(|| named[0])
}

fn markdown_table_row(line: &str) -> bool {
    let t = line.trim();
    t.starts_with('|') && t.matches('|').count() >= 2
}

fn separator_row(line: &str) -> bool {
    let t = line.trim();
    t.contains('-') && t.chars().all(|c| matches!(c, '|' | '-' | ':' | ' ' | '\t'))
}

/// The cells of a markdown table row, with their byte ranges.
fn cells(line: &str) -> Vec<(usize, usize)> {
    let mut out = Vec::new();
    let t_start = line.len() - line.trim_start().len();
    let t_end = line.trim_end().len();
    let inner_s = t_start + 1;
    let inner_e = if line[..t_end].ends_with('|') && t_end > inner_s {
        t_end - 1
    } else {
        t_end
    };
    let mut s = inner_s;
    for (i, c) in line[inner_s..inner_e].char_indices() {
        if c == '|' && !line[..inner_s + i].ends_with('\\') {
            out.push((s, inner_s + i));
            s = inner_s + i + 1;
        }
    }
    out.push((s, inner_e.max(s)));
    out
}

/// A markdown table's columns.
struct TableColumns {
    code: Option<usize>,
    label: Option<usize>,
    system: Option<usize>,
}

fn table_columns(lines: &[&str], head: usize, body: &[usize]) -> TableColumns {
    let hc = cells(lines[head]);
    let name = |i: usize| -> Option<String> {
        let (s, e) = hc[i];
        heading_word(lines[head][s..e].trim().trim_matches(['*', '_', '`']))
    };
    let system =
        (0..hc.len()).find(|&i| name(i).is_some_and(|w| SYSTEM_WORDS.contains(&w.as_str())));
    let count = |i: usize| {
        body.iter()
            .filter(|&&r| {
                let c = cells(lines[r]);
                c.get(i).is_some_and(|&(s, e)| {
                    !codes(&lines[r][..e], s, true).is_empty() && {
                        let cell = lines[r][s..e].trim();
                        cell.split_whitespace().count() <= 6
                    }
                })
            })
            .count()
    };
    let named = (0..hc.len()).find(|&i| {
        Some(i) != system
            && name(i)
                .is_some_and(|w| !LABEL_WORDS.iter().any(|l| w.starts_with(l)) && w != "category")
            && count(i) > 0
    });
    let code = named.or_else(|| {
        (0..hc.len())
            .filter(|&i| Some(i) != system)
            .max_by_key(|&i| (count(i), usize::MAX - i))
            .filter(|&i| count(i) > 0)
    });
    let label = (0..hc.len())
        .find(|&i| {
            Some(i) != code
                && Some(i) != system
                && name(i).is_some_and(|w| LABEL_WORDS.iter().any(|l| w.starts_with(l)))
        })
        .or_else(|| {
            (0..hc.len())
                .filter(|&i| Some(i) != code && Some(i) != system)
                .max_by_key(|&i| {
                    body.iter()
                        .map(|&r| {
                            cells(lines[r]).get(i).map_or(0, |&(s, e)| {
                                lines[r][s..e].chars().filter(|c| c.is_alphabetic()).count()
                            })
                        })
                        .sum::<usize>()
                })
        });
    TableColumns {
        code,
        label,
        system,
    }
}

/// Whether a line is a markdown bullet, numbered item or table row.
pub(crate) fn is_markdown_item(line: &str) -> bool {
    item_start(line) > line.len() - line.trim_start().len() || markdown_table_row(line)
}

/// Whether a cell or phrase holds a code of a strong shape (`A00.0)`).
pub(crate) fn has_strong_code(s: &str) -> bool {
    words(s, 0)
        .iter()
        .any(|w| strength(&s[w.start..w.end]) == Strength::Strong)
}

/// Whether a whole text reads as a plain list, one code per line as
/// rollcall has always read it: every line that is not blank or a comment
/// starts with a code-like word (or with a mistyped one), and no line holds
/// a second code or markdown.
pub fn reads_as_lines(text: &str) -> bool {
    lines_of(text).filter(|l| is_skip(l).is_none()).all(|line| {
        if item_start(line) != line.len() - line.trim_start().len() || markdown_table_row(line) {
            return false;
        }
        let first = line.split_whitespace().next().unwrap_or("");
        let lead = line.len() - line.trim_start().len();
        let found = codes(line, lead, false);
        let LineKind::Entry { code, label, .. } = plain_entry(line) else {
            return false;
        };
        let starts_code = super::code_like(&code) || found.first().is_some_and(|f| f.start == lead);
        if !starts_code {
            // A mistyped code (`E11,9`) still starts with something a code
            // could be; a sentence does not.
            return !found.is_empty() && first.chars().any(|c| c.is_ascii_digit());
        }
        label.is_none_or(|l| codes(&l, 0, false).is_empty())
    })
}

/// The forms a draft takes, for the report's heading: each of SQL, R, code
/// literals and markdown it shows, in that order (`markdown and sql` for an
/// email with bullets and a query), else prose.
fn form_of(lines: &[&str]) -> String {
    let has = |f: &dyn Fn(&str) -> bool| lines.iter().any(|l| f(l));
    let lower: Vec<String> = lines.iter().map(|l| l.to_ascii_lowercase()).collect();
    let any_lower = |p: &str| lower.iter().any(|l| l.contains(p));
    let sql = any_lower(" in ('")
        || any_lower(" in (\"")
        || any_lower(" like '")
        || any_lower("select ") && any_lower(" from ");
    let r = any_lower("c(\"") || any_lower("c('") || any_lower("<- c(");
    let literals = !r && has(&|l| l.contains("['") || l.contains("[\"") || l.contains("= ["));
    let markdown = has(&|l| {
        markdown_table_row(l)
            || item_start(l) > l.len() - l.trim_start().len()
            || l.contains("**")
            || l.trim_start().starts_with('#')
            || l.contains('`')
    });
    // Beside a query or script, only bold or a table says markdown: a
    // script's own comments (`#`, `--`) and quotes look like markdown too.
    let code = sql || r || literals;
    let plainly_markdown = has(&|l| markdown_table_row(l) || l.contains("**"));
    let forms: Vec<&str> = [
        (markdown && (!code || plainly_markdown), "markdown"),
        (sql, "sql"),
        (r, "r"),
        (literals, "code literals"),
    ]
    .into_iter()
    .filter_map(|(on, name)| on.then_some(name))
    .collect();
    match forms.as_slice() {
        [] => "prose".into(),
        [one] => (*one).into(),
        [first @ .., last] => format!("{} and {last}", first.join(", ")),
    }
}

/// Reads a draft (see the module docs).
pub fn read(text: &str, forced: bool) -> Draft {
    let lines: Vec<&str> = lines_of(text).collect();
    let code_draft = lines
        .iter()
        .any(|l| !codes(l, item_start(l), false).is_empty());
    let form = form_of(&lines);
    let prose = form == "prose";
    let mut out: Vec<InputLine> = Vec::with_capacity(lines.len());
    let mut context: Option<crate::systems::System> = None;
    let mut i = 0;
    while i < lines.len() {
        let line = lines[i];
        // A markdown table: a block of rows starting with `|`.
        if markdown_table_row(line) {
            let mut j = i;
            while j < lines.len() && markdown_table_row(lines[j]) {
                j += 1;
            }
            read_table(&lines, i, j, context, &mut out);
            i = j;
            continue;
        }
        read_line_in(line, i + 1, &mut context, code_draft, prose, &mut out);
        i += 1;
    }
    Draft::finish(out, Reading::Text, &form, forced, lines.len())
}

/// The system a heading named, for a code whose shape fits it (a closing
/// sentence about diagnoses under a procedures heading keeps its own).
fn in_context(context: Option<crate::systems::System>, code: &str) -> Option<String> {
    let s = context?;
    crate::systems::shape(s, code)
        .fits()
        .then(|| s.title().to_string())
}

fn entry(
    number: usize,
    line: &str,
    f: &Found,
    label: Option<String>,
    system: Option<String>,
) -> InputLine {
    let system = system.or_else(|| system_by_shape(&f.code).map(|s| s.title().to_string()));
    InputLine {
        number,
        text: line.to_string(),
        kind: LineKind::Entry {
            code: f.code.clone(),
            label,
            system,
        },
        place: Place {
            span: Some((f.start, f.end)),
            ..Place::default()
        },
    }
}

/// Reads one line of a draft into `out`: its codes, or one line of text.
pub(crate) fn read_line(
    line: &str,
    number: usize,
    context: &mut Option<crate::systems::System>,
    out: &mut Vec<InputLine>,
) {
    read_line_in(line, number, context, false, false, out)
}

fn read_line_in(
    line: &str,
    number: usize,
    context: &mut Option<crate::systems::System>,
    code_draft: bool,
    prose: bool,
    out: &mut Vec<InputLine>,
) {
    let t = line.trim();
    if t.is_empty() {
        out.push(InputLine::new(number, line, LineKind::Blank));
        return;
    }
    if t.starts_with("//") || t.starts_with("--") || t.starts_with("/*") {
        out.push(InputLine::new(number, line, LineKind::Comment));
        return;
    }
    let heading = t.starts_with('#');
    let from = item_start(line);
    let found = codes_in(line, from, false, code_draft);
    if found.is_empty() {
        if let Some(s) = system_named(line) {
            *context = Some(s);
        } else if heading {
            *context = None;
        }
        out.push(InputLine::new(number, line, LineKind::Text));
        return;
    }
    for (f, label) in found.iter().zip(labels(line, from, &found, prose)) {
        out.push(entry(number, line, f, label, in_context(*context, &f.code)));
    }
}

/// Reads the rows `start..end` of a markdown table.
fn read_table(
    lines: &[&str],
    start: usize,
    end: usize,
    context: Option<crate::systems::System>,
    out: &mut Vec<InputLine>,
) {
    let rows: Vec<usize> = (start..end).collect();
    // The heading row: the first, when the second is the `|---|` row.
    let has_head = end - start >= 2 && separator_row(lines[start + 1]);
    let body: Vec<usize> = rows
        .iter()
        .copied()
        .filter(|&r| !(separator_row(lines[r]) || has_head && r == start))
        .collect();
    let cols = has_head.then(|| table_columns(lines, start, &body));
    let mut ctx = context;
    for r in rows {
        let line = lines[r];
        let number = r + 1;
        if has_head && r == start {
            out.push(InputLine::new(number, line, LineKind::Headings));
            continue;
        }
        if separator_row(line) {
            out.push(InputLine::new(number, line, LineKind::Text));
            continue;
        }
        let cs = cells(line);
        let Some(TableColumns {
            code: Some(code),
            label,
            system,
        }) = cols.as_ref().map(|c| TableColumns {
            code: c.code,
            label: c.label,
            system: c.system,
        })
        else {
            read_line(line, number, &mut ctx, out);
            continue;
        };
        let Some(&(s, e)) = cs.get(code) else {
            out.push(InputLine::new(number, line, LineKind::Text));
            continue;
        };
        let found = codes(&line[..e], s, true);
        if found.is_empty() {
            out.push(InputLine::new(number, line, LineKind::Text));
            continue;
        }
        let label = label
            .and_then(|l| cs.get(l))
            .and_then(|&(s, e)| clean_label(&line[s..e]));
        let sys = system
            .and_then(|c| cs.get(c))
            .map(|&(s, e)| line[s..e].trim().trim_matches(['*', '`']).to_string())
            .filter(|s| !s.is_empty());
        for f in &found {
            let sys = sys.clone().or_else(|| in_context(ctx, &f.code));
            out.push(entry(number, line, f, label.clone(), sys));
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn got(text: &str) -> Vec<(usize, String, Option<String>)> {
        read(text, false)
            .lines
            .into_iter()
            .filter_map(|l| match l.kind {
                LineKind::Entry { code, label, .. } => Some((l.number, code, label)),
                _ => None,
            })
            .collect()
    }

    fn e(n: usize, c: &str, l: Option<&str>) -> (usize, String, Option<String>) {
        (n, c.to_string(), l.map(str::to_string))
    }

    #[test]
    fn several_codes_on_one_line_are_each_an_entry() {
        assert_eq!(
            got("E11.9, E11.65, I10, I50.22\n"),
            [
                e(1, "E11.9", None),
                e(1, "E11.65", None),
                e(1, "I10", None),
                e(1, "I50.22", None)
            ]
        );
        assert_eq!(got("E11.9; E11.65 / I10 and I50.22 or E78.5\n").len(), 5);
        assert_eq!(got("250.00, 401.9, 428.0\n").len(), 3);
    }

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

    #[test]
    fn markdown_table_uses_its_code_and_description_columns() {
        let d = "| # | Code | Description |\n|---|------|-------------|\n| 1 | **E11.9** | Type 2 diabetes mellitus |\n| 2 | I10 | Essential hypertension |\n";
        assert_eq!(
            got(d),
            [
                e(3, "E11.9", Some("Type 2 diabetes mellitus")),
                e(4, "I10", Some("Essential hypertension"))
            ]
        );
        let r = read(d, false);
        assert_eq!(r.lines[0].kind, LineKind::Headings);
    }

    #[test]
    fn a_heading_names_the_system_of_what_follows() {
        let r = read(
            "## Procedures (ICD-10-PCS)\n- 0DTJ4ZZ Resection of appendix\n## Diagnoses\n- K35.80\n",
            false,
        );
        let systems: Vec<Option<String>> = r
            .lines
            .iter()
            .filter_map(|l| match &l.kind {
                LineKind::Entry { system, .. } => Some(system.clone()),
                _ => None,
            })
            .collect();
        assert_eq!(systems, [Some("ICD-10-PCS".to_string()), None]);
    }

    /// A code typed with a letter for a digit after a short heading and a
    /// colon or dash is a code (the core then reads `I1O` as I10); other
    /// code-like words there stay prose. Common practice in drafts.
    #[test]
    fn a_mistyped_code_after_a_heading_is_a_code() {
        assert_eq!(
            got("Hypertension: I1O essential hypertension\n"),
            [e(1, "I1O", Some("essential hypertension"))]
        );
        assert_eq!(
            got("**Hypertension** – I1O essential hypertension, I11.0 (hypertensive heart disease)\n"),
            [
                e(1, "I1O", Some("essential hypertension")),
                e(1, "I11.0", Some("hypertensive heart disease"))
            ]
        );
        assert!(got("Note: B2B contracts apply\n").is_empty());
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

    /// An email with bullets and a warehouse query reads as both.
    #[test]
    fn a_draft_of_several_forms_names_them_all() {
        let r = read(
            "**Heart failure**\n- I50.22 Chronic systolic heart failure\nWHERE dx IN ('I50.20', 'I50.21')\n",
            false,
        );
        assert_eq!(r.facts.form, "markdown and sql");
        let r = read("WHERE dx IN ('I50.20', 'I50.21') -- heart failure\n", false);
        assert_eq!(r.facts.form, "sql");
    }

    #[test]
    fn prose_words_are_not_codes() {
        assert!(got("COVID-19 and HbA1c in type 2 diabetes over 12 months (ICD-10-CM, FY2024), eGFR < 60.\n").is_empty());
        assert!(got("Vitamin B12 deficiency and H1N1 vaccination were recorded.\n").is_empty());
    }

    #[test]
    fn lists_read_as_lines_stay_lines() {
        assert!(reads_as_lines("E11.9 Type 2 diabetes\nT2DM Type 2 diabetes mellitus\nE11 .65\nE08 - E13 diabetes\n# note\n"));
        assert!(!reads_as_lines("E11.9, E11.65, I10\n"));
        assert!(!reads_as_lines("- E11.9\n"));
        assert!(!reads_as_lines("Here are the codes:\nE11.9\n"));
    }

    #[test]
    fn spans_point_at_the_code() {
        let r = read("- **E11.9** – diabetes\n", false);
        let l = &r.lines[0];
        let (s, e) = l.place.span.unwrap();
        assert_eq!(&l.text[s..e], "E11.9");
        assert_eq!(l.column(), Some(5));
    }
}
