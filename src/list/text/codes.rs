//! Which words of a line are codes: strong shapes anywhere, listed shapes
//! where the writer set them apart, opened an item or continued a run.

use super::words::{in_run, words, Word};
use crate::list::tokens::{strength, Strength};

/// A code found on a line.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(super) struct Found {
    pub(super) start: usize,
    pub(super) end: usize,
    pub(super) code: String,
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
pub(super) fn short_heading(head: &str) -> bool {
    let Some(words) = head.strip_suffix([':', '–', '—', '-']) else {
        return false;
    };
    (1..=4).contains(&words.split_whitespace().count())
}

/// The codes of a line: strong shapes anywhere, listed shapes where set
/// apart, first in the item, or continuing a run of codes; with
/// `code_draft` (the draft holds codes elsewhere), dotted ICD-9-CM numbers
/// in sentences too.
pub(super) fn codes(line: &str, from: usize, all_listed: bool) -> Vec<Found> {
    codes_in(line, from, all_listed, false)
}

pub(super) fn codes_in(line: &str, from: usize, all_listed: bool, code_draft: bool) -> Vec<Found> {
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

/// Whether a cell or phrase holds a code of a strong shape (`A00.0)`).
pub(crate) fn has_strong_code(s: &str) -> bool {
    words(s, 0)
        .iter()
        .any(|w| strength(&s[w.start..w.end]) == Strength::Strong)
}

#[cfg(test)]
mod tests {
    use crate::list::text::tests::{e, got};

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

    #[test]
    fn prose_words_are_not_codes() {
        assert!(got("COVID-19 and HbA1c in type 2 diabetes over 12 months (ICD-10-CM, FY2024), eGFR < 60.\n").is_empty());
        assert!(got("Vitamin B12 deficiency and H1N1 vaccination were recorded.\n").is_empty());
    }
}
