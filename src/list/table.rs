//! Lists laid out as lists: plain lines (`code label`), and CSV or TSV with
//! a code column and optional label and system columns. Every input line
//! comes back, so the report can account for each one.

use super::{lines_of, InputLine, LineKind};
use std::borrow::Cow;

/// How the list was laid out.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Layout {
    /// One code per line, optionally followed by a label.
    Plain,
    /// Comma-separated with the code in this column (0-based) and maybe a label column.
    Csv(usize, Option<usize>),
    /// Tab-separated (a spreadsheet paste) with code and label columns.
    Tsv(usize, Option<usize>),
}

/// The layout and whether the first data row holds column names.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Detected {
    /// Plain, CSV or TSV, with the columns.
    pub layout: Layout,
    /// Whether the first row that is not blank or a comment is column names.
    pub headings: bool,
    /// The system column (0-based), when a heading names one.
    pub system: Option<usize>,
}

/// Column names that mark a row of headings (with [`LABEL_WORDS`]).
const HEADING_WORDS: &[&str] = &[
    "code",
    "codes",
    "icd",
    "icd10",
    "icd10cm",
    "icd-10",
    "icd-10-cm",
    "dx",
    "diagnosis",
    "concept",
    "category",
];
/// Headings of a system column (compared without case, spaces, `_` and `-`).
/// Never taken for the code column, even though a system's name such as
/// `ICD-10-CM` looks like a code.
pub(crate) const SYSTEM_WORDS: &[&str] = &[
    "system",
    "codesystem",
    "codingsystem",
    "vocabulary",
    "vocab",
    "terminology",
    "systemuri",
    "systemurl",
];
/// Headings of a column that groups the codes rather than describing each
/// one (common practice in code-list tables: a category, a code set, the
/// phenotype or study arm a code belongs to).
const GROUP_WORDS: &[&str] = &[
    "category",
    "group",
    "codeset",
    "phenotype",
    "domain",
    "cohort",
];

pub(crate) const LABEL_WORDS: &[&str] = &[
    "description",
    "desc",
    "label",
    "name",
    "term",
    "display",
    "title",
    "text",
];

pub(crate) fn is_skip(line: &str) -> Option<LineKind> {
    let t = line.trim();
    if t.is_empty() {
        Some(LineKind::Blank)
    } else if t.starts_with('#') || t.starts_with("//") {
        Some(LineKind::Comment)
    } else {
        None
    }
}

/// Whether a cell could be a code or a pattern: short, one token (or a
/// range), made of letters, digits, dots and pattern marks, with a digit.
pub fn code_like(cell: &str) -> bool {
    let t = cell.trim();
    !t.is_empty()
        && t.len() <= 24
        && t.chars().any(|c| c.is_ascii_digit())
        && t.chars().all(|c| {
            c.is_ascii_alphanumeric() || matches!(c, '.' | '*' | '%' | '-' | '–' | ' ' | ':' | '_')
        })
        && t.split_whitespace()
            .filter(|w| !matches!(*w, "-" | "–"))
            .count()
            <= 2
}

pub(crate) fn heading_word(cell: &str) -> Option<String> {
    let w = cell.trim().trim_matches('"').to_ascii_lowercase();
    let w = w.replace([' ', '_', '-'], "");
    if SYSTEM_WORDS.contains(&w.as_str()) {
        return Some(w);
    }
    HEADING_WORDS
        .iter()
        .chain(LABEL_WORDS)
        .any(|h| w == *h || w.starts_with(h) || w.ends_with("code"))
        .then_some(w)
}

/// Splits one CSV line (RFC 4180 quoting, on one line). `Err` for an
/// unterminated quote.
pub fn split_csv(line: &str) -> Result<Vec<String>, String> {
    csv_cells(line).map(|c| c.map(Cow::into_owned)).collect()
}

/// The cells of one CSV line, as [`split_csv`] reads them, each borrowed
/// from the line unless unquoting changed it; an `Err` (an unterminated
/// quote) ends them.
fn csv_cells(line: &str) -> CsvCells<'_> {
    CsvCells {
        rest: Some(line),
        quotes: line.as_bytes().contains(&b'"'),
    }
}

struct CsvCells<'t> {
    /// What is left of the line; `None` once its last cell is read.
    rest: Option<&'t str>,
    /// Whether the line has a quote at all (else it splits at every comma).
    quotes: bool,
}

impl<'t> Iterator for CsvCells<'t> {
    type Item = Result<Cow<'t, str>, String>;

    fn next(&mut self) -> Option<Self::Item> {
        let rest = self.rest?;
        if self.quotes {
            let lead = rest.len() - rest.trim_start().len();
            if rest[lead..].starts_with('"') {
                return Some(match quoted(&rest[lead + 1..]) {
                    Ok((cell, after)) => {
                        self.rest = after;
                        Ok(cell)
                    }
                    Err(e) => {
                        self.rest = None;
                        Err(e)
                    }
                });
            }
        }
        // Cells are short: a plain loop finds the comma sooner than a
        // vectorised search would start.
        Some(Ok(Cow::Borrowed(
            match rest.bytes().position(|b| b == b',') {
                Some(c) => {
                    self.rest = Some(&rest[c + 1..]);
                    &rest[..c]
                }
                None => {
                    self.rest = None;
                    rest
                }
            },
        )))
    }
}

/// A quoted cell, `body` starting after its opening quote: up to the
/// closing quote, `""` standing for one quote, then what follows the quote
/// up to the next comma (trimmed); and the rest of the line after that
/// comma, if there is one.
fn quoted(body: &str) -> Result<(Cow<'_, str>, Option<&str>), String> {
    let unclosed =
        || "a quoted cell is not closed; add the closing \" or remove the opening one".to_string();
    let q = body.find('"').ok_or_else(unclosed)?;
    let mut cell = Cow::Borrowed(&body[..q]);
    let mut i = q + 1;
    if body[i..].starts_with('"') {
        // A doubled quote: the cell is written out.
        let mut s = String::new();
        i = 0;
        loop {
            let q = body[i..].find('"').ok_or_else(unclosed)?;
            s.push_str(&body[i..i + q]);
            i += q + 1;
            if body[i..].starts_with('"') {
                s.push('"');
                i += 1;
            } else {
                break;
            }
        }
        cell = Cow::Owned(s);
    }
    let after = &body[i..];
    let (tail, rest) = match after.find(',') {
        Some(c) => (after[..c].trim(), Some(&after[c + 1..])),
        None => (after.trim(), None),
    };
    if !tail.is_empty() {
        cell.to_mut().push_str(tail);
    }
    Ok((cell, rest))
}

/// The code, label and system cells of one row (the columns `want` names),
/// trimmed, borrowed from the line where they can be. The whole row is
/// read, so a bad quote in any cell makes it unreadable.
fn cells<'t>(
    layout: Layout,
    line: &'t str,
    want: [Option<usize>; 3],
) -> Result<[Option<Cow<'t, str>>; 3], String> {
    let mut got: [Option<Cow<'t, str>>; 3] = [None, None, None];
    let mut take = |i: usize, cell: Cow<'t, str>| {
        for (g, w) in got.iter_mut().zip(want) {
            if w == Some(i) {
                *g = Some(match cell {
                    Cow::Borrowed(c) => Cow::Borrowed(c.trim()),
                    Cow::Owned(ref c) => Cow::Owned(c.trim().to_string()),
                });
            }
        }
    };
    match layout {
        Layout::Tsv(..) => {
            let last = want.iter().flatten().max().copied().unwrap_or(0);
            for (i, cell) in line.split('\t').enumerate().take(last + 1) {
                take(i, Cow::Borrowed(cell));
            }
        }
        Layout::Csv(..) => {
            for (i, cell) in csv_cells(line).enumerate() {
                take(i, cell?);
            }
        }
        Layout::Plain => take(0, Cow::Borrowed(line)),
    }
    Ok(got)
}

/// Decides the layout from the first lines that hold data.
pub fn detect(text: &str) -> Detected {
    let sample: Vec<&str> = lines_of(text)
        .filter(|l| is_skip(l).is_none())
        .take(200)
        .collect();
    let plain = Detected {
        layout: Layout::Plain,
        headings: false,
        system: None,
    };
    if sample.is_empty() {
        return plain;
    }
    // Bullets, numbered items and markdown table rows make a draft, not a
    // table, whatever commas its lines hold.
    if sample.iter().any(|l| super::text::is_markdown_item(l)) {
        return plain;
    }
    let tabs = sample.iter().filter(|l| l.contains('\t')).count();
    let (delim_tsv, rows): (bool, Vec<Vec<String>>) = if tabs * 2 >= sample.len() {
        (
            true,
            sample
                .iter()
                .map(|l| l.split('\t').map(str::to_string).collect())
                .collect(),
        )
    } else {
        let commas = sample.iter().filter(|l| l.contains(',')).count();
        if commas * 5 < sample.len() * 4 {
            return plain;
        }
        (
            false,
            sample.iter().filter_map(|l| split_csv(l).ok()).collect(),
        )
    };
    // Rows that cannot be split (an unclosed quote) are not evidence of
    // a table: they are reported on their own lines.
    let Some(first) = rows.first() else {
        return plain;
    };
    let width = rows.iter().map(Vec::len).max().unwrap_or(1);
    let has_headings = first.iter().any(|c| heading_word(c).is_some())
        && !first
            .iter()
            .any(|c| code_like(c) && heading_word(c).is_none());
    let body = if has_headings && rows.len() > 1 {
        &rows[1..]
    } else {
        &rows[..]
    };
    // A system column is named by its heading only.
    let system = has_headings
        .then(|| {
            (0..width).find(|&i| {
                first
                    .get(i)
                    .and_then(|c| heading_word(c))
                    .is_some_and(|w| SYSTEM_WORDS.contains(&w.as_str()))
            })
        })
        .flatten();
    // The code column: a heading that names codes, else the most code-like column.
    let score = |i: usize| {
        body.iter()
            .filter(|r| r.get(i).is_some_and(|c| code_like(c)))
            .count()
    };
    let named = has_headings
        .then(|| {
            (0..width).find(|&i| {
                Some(i) != system
                    && first.get(i).and_then(|c| heading_word(c)).is_some_and(|w| {
                        !LABEL_WORDS.iter().any(|l| w.starts_with(l)) && w != "category"
                    })
                    && score(i) * 2 >= body.len()
            })
        })
        .flatten();
    let code = named.unwrap_or_else(|| {
        (0..width)
            .filter(|&i| Some(i) != system)
            .max_by_key(|&i| (score(i), usize::MAX - i))
            .unwrap_or(0)
    });
    if score(code) * 2 < body.len() {
        return plain;
    }
    // Codes in other cells of most rows (`E11.9, E11.65, I10`): a run of
    // codes, not a code beside its label.
    let more_codes = body
        .iter()
        .filter(|r| {
            r.iter().enumerate().any(|(i, c)| {
                i != code
                    && Some(i) != system
                    && (super::tokens::strength(c.trim().trim_matches('"'))
                        >= super::tokens::Strength::Listed
                        || super::text::has_strong_code(c))
            })
        })
        .count();
    if more_codes * 2 >= body.len() && more_codes > 0 {
        return plain;
    }
    let label = if has_headings {
        (0..width).find(|&i| {
            i != code
                && Some(i) != system
                && first
                    .get(i)
                    .and_then(|c| heading_word(c))
                    .is_some_and(|w| LABEL_WORDS.iter().any(|l| w.starts_with(l)))
        })
    } else {
        None
    }
    .or_else(|| {
        // The column with the most letters that is not the code column,
        // nor one whose heading names a grouping of the codes (Elixhauser's
        // `category`: every code of a group shares it, so it is no label).
        (0..width)
            .filter(|&i| i != code && Some(i) != system)
            .filter(|&i| {
                !has_headings
                    || !first
                        .get(i)
                        .and_then(|c| heading_word(c))
                        .is_some_and(|w| GROUP_WORDS.iter().any(|g| w.starts_with(g)))
            })
            .max_by_key(|&i| {
                body.iter()
                    .map(|r| {
                        r.get(i)
                            .map_or(0, |c| c.chars().filter(|c| c.is_alphabetic()).count())
                    })
                    .sum::<usize>()
            })
    });
    Detected {
        layout: if delim_tsv {
            Layout::Tsv(code, label)
        } else {
            Layout::Csv(code, label)
        },
        headings: has_headings,
        system,
    }
}

/// The table layout of `text`, even where [`detect`] would read plain
/// lines (a table forced by the user): tab-separated when any line has a
/// tab, else comma-separated, the code first and its label second.
pub fn detect_table(text: &str) -> Detected {
    let d = detect(text);
    if d.layout != Layout::Plain {
        return d;
    }
    let tsv = lines_of(text).any(|l| l.contains('\t'));
    Detected {
        layout: if tsv {
            Layout::Tsv(0, Some(1))
        } else {
            Layout::Csv(0, Some(1))
        },
        headings: false,
        system: None,
    }
}

/// Reads a whole list laid out as `detected` says. Every line of `text`
/// is returned, in order.
pub fn read_laid_out(text: &str, detected: Detected) -> Vec<InputLine> {
    laid_out(text, detected).collect()
}

/// The lines of [`read_laid_out`], each read when it is asked for.
pub fn laid_out(text: &str, detected: Detected) -> impl Iterator<Item = InputLine> + '_ {
    rows(text, detected).map(|(number, line, row)| InputLine::new(number, line, row.into_kind()))
}

/// Each line of [`laid_out`] by its number, and whether it holds a code,
/// without the line being written out.
pub(crate) fn entry_lines(
    text: &str,
    detected: Detected,
) -> impl Iterator<Item = (usize, bool)> + '_ {
    rows(text, detected).map(|(number, _, row)| (number, row.is_entry()))
}

/// A line of a laid-out list as read, its cells borrowed from the text.
enum Row<'t> {
    /// What the line is, read whole (a plain line; no code in a table's row).
    Kind(LineKind),
    /// A table's row with a code: the code, label and system cells, trimmed
    /// (label and system not empty).
    Cells {
        code: Cow<'t, str>,
        label: Option<Cow<'t, str>>,
        system: Option<Cow<'t, str>>,
    },
}

impl Row<'_> {
    fn is_entry(&self) -> bool {
        matches!(self, Row::Cells { .. } | Row::Kind(LineKind::Entry { .. }))
    }

    fn into_kind(self) -> LineKind {
        match self {
            Row::Kind(k) => k,
            Row::Cells {
                code,
                label,
                system,
            } => LineKind::Entry {
                code: code.into_owned(),
                label: label.map(Cow::into_owned),
                system: system.map(Cow::into_owned),
            },
        }
    }
}

/// Every line of `text` (numbered from 1, as written) and what it holds.
fn rows(text: &str, detected: Detected) -> impl Iterator<Item = (usize, &str, Row<'_>)> + '_ {
    let Detected {
        layout,
        headings,
        system: system_column,
    } = detected;
    let mut seen_data = false;
    lines_of(text).enumerate().map(move |(i, line)| {
        let row = if let Some(k) = is_skip(line) {
            Row::Kind(k)
        } else {
            let first_data = !seen_data;
            seen_data = true;
            match layout {
                Layout::Plain => Row::Kind(plain_entry(line)),
                Layout::Csv(c, l) | Layout::Tsv(c, l) => match cells(layout, line, [Some(c), l, system_column]) {
                    Err(msg) => Row::Kind(LineKind::Unreadable(msg)),
                    Ok([code, label, system]) => {
                        let code = code.unwrap_or_default();
                        if first_data && headings {
                            Row::Kind(LineKind::Headings)
                        } else if code.is_empty() {
                            Row::Kind(LineKind::Unreadable(format!(
                                "the code column (column {}) is empty on this row; put the code there or delete the row",
                                c + 1
                            )))
                        } else {
                            Row::Cells {
                                code,
                                label: label.filter(|s| !s.is_empty()),
                                system: system.filter(|s| !s.is_empty()),
                            }
                        }
                    }
                },
            }
        };
        (i + 1, line, row)
    })
}

/// A plain line: the code is the first word (words are joined when the code
/// was written with spaces, as in `E11 .9`, `E 11.9` or a range `E08 - E13`),
/// the rest is the label.
pub(crate) fn plain_entry(line: &str) -> LineKind {
    let words: Vec<&str> = line.split_whitespace().collect();
    let mut n = 1;
    let joins = |a: &str, b: &str| {
        b.starts_with('.')
            || a.ends_with('.')
            || (a.len() == 1
                && a.chars().all(|c| c.is_ascii_alphabetic())
                && b.starts_with(|c: char| c.is_ascii_digit()))
    };
    while n < words.len() && n < 4 && joins(words[n - 1], words[n]) {
        n += 1;
    }
    if words.len() >= n + 2 && matches!(words[n], "-" | "–") && code_like(words[n + 1]) {
        n += 2;
    }
    let code = words[..n].join(if n >= 3 && matches!(words[n - 2], "-" | "–") {
        " "
    } else {
        ""
    });
    let code = if code.contains(" - ") || code.contains(" – ") {
        code.replace(' ', "")
    } else {
        code
    };
    let label = words[n..].join(" ");
    let label = label
        .trim_start_matches(['-', '–', ':', '|'])
        .trim()
        .to_string();
    LineKind::Entry {
        code,
        label: (!label.is_empty()).then_some(label),
        system: None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::list::parse_list;

    fn entries(text: &str) -> Vec<(String, Option<String>)> {
        parse_list(text)
            .1
            .into_iter()
            .filter_map(|l| match l.kind {
                LineKind::Entry { code, label, .. } => Some((code, label)),
                _ => None,
            })
            .collect()
    }

    #[test]
    fn plain_lines_with_labels_and_spaces() {
        let e = entries("E11.9 Type 2 diabetes mellitus, without complications\nE11 .65\nE 10.9\nE08 - E13 diabetes\n");
        assert_eq!(e[0].0, "E11.9");
        assert_eq!(
            e[0].1.as_deref(),
            Some("Type 2 diabetes mellitus, without complications")
        );
        assert_eq!(e[1].0, "E11.65");
        assert_eq!(e[2].0, "E10.9");
        assert_eq!(e[3], ("E08-E13".to_string(), Some("diabetes".to_string())));
    }

    #[test]
    fn csv_with_headings_finds_code_and_label_columns() {
        let (layout, lines) = parse_list(
            "category,icd10cm,description\nAUTOIMMUNE,A1801,Tuberculosis of spine\nVALVE,A1884,\"Tuberculosis of heart, x\"\n",
        );
        assert_eq!(layout, Layout::Csv(1, Some(2)));
        assert_eq!(lines[0].kind, LineKind::Headings);
        assert_eq!(
            lines[2].kind,
            LineKind::Entry {
                code: "A1884".into(),
                label: Some("Tuberculosis of heart, x".into()),
                system: None,
            }
        );
    }

    #[test]
    fn spreadsheet_paste_is_tsv_and_every_line_is_kept() {
        let (layout, lines) =
            parse_list("# my list\nE11.9\tType 2 DM\n\n\tno code\nI10\tHypertension\n");
        assert_eq!(layout, Layout::Tsv(0, Some(1)));
        assert_eq!(lines.len(), 5);
        assert_eq!(lines[0].kind, LineKind::Comment);
        assert_eq!(lines[2].kind, LineKind::Blank);
        assert!(matches!(lines[3].kind, LineKind::Unreadable(_)));
    }

    /// RFC 4180, section 2, rules 5 to 7: a quoted cell may hold commas,
    /// and a doubled quote inside it stands for one.
    #[test]
    fn quoted_cells_as_rfc_4180_writes_them() {
        assert_eq!(
            split_csv(r#"E11.9,"Type 2, no ""complications""",x"#).unwrap(),
            ["E11.9", r#"Type 2, no "complications""#, "x"]
        );
        // Beyond the RFC (the reader's own rule): text after a closing quote
        // joins the cell, trimmed.
        assert_eq!(split_csv(r#" "a" b ,"c""#).unwrap(), ["ab", "c"]);
        assert_eq!(split_csv("a,,b,").unwrap(), ["a", "", "b", ""]);
        // An unclosed quote in a cell after the code still makes the row unreadable.
        let (_, lines) = parse_list("code,label,note\nE11.9,DM,\"open\nI10,HTN,\n");
        assert!(matches!(lines[1].kind, LineKind::Unreadable(ref m) if m.contains("quoted")));
    }

    #[test]
    fn unterminated_quote_is_reported_on_its_line() {
        let (_, lines) = parse_list("code,label\nE11.9,\"open\nI10,Hypertension\n");
        assert!(matches!(lines[1].kind, LineKind::Unreadable(ref m) if m.contains("quoted")));
    }

    #[test]
    fn a_system_column_is_read_and_never_taken_for_the_code() {
        // The system cells look like codes (`ICD-10-CM` has digits and hyphens).
        for (text, layout) in [
            (
                "system\tcode\tdescription\nICD-10-CM\tE11.9\tType 2 DM\nICD-10-PCS\t0DTJ4ZZ\t\n",
                Layout::Tsv(1, Some(2)),
            ),
            (
                "Code System,Code,Display\nICD-10-CM,E11.9,Type 2 DM\n,I10,Hypertension\n",
                Layout::Csv(1, Some(2)),
            ),
            (
                "code\tcoding_system\nE11.9\tICD-10-CM\n0DTJ4ZZ\tICD-10-PCS\n",
                Layout::Tsv(0, None),
            ),
        ] {
            let d = detect(text);
            assert_eq!(d.layout, layout, "{text}");
            assert!(d.headings && d.system.is_some(), "{text}");
            let (_, lines) = parse_list(text);
            match &lines[1].kind {
                LineKind::Entry { code, system, .. } => {
                    assert_eq!(code, "E11.9");
                    assert_eq!(system.as_deref(), Some("ICD-10-CM"));
                }
                k => panic!("{k:?}"),
            }
        }
        // An empty cell is no system: the code decides.
        let (_, lines) = parse_list("Code System,Code\nICD-10-CM,E11.9\n,I10\n");
        assert!(matches!(
            &lines[2].kind,
            LineKind::Entry { system: None, .. }
        ));
        // Without headings there is no system column.
        assert_eq!(detect("E11.9\tType 2 DM\n").system, None);
    }

    /// A column headed `category` groups the codes: with no description
    /// column beside it, the list has no labels (the Elixhauser layout
    /// without its description column).
    #[test]
    fn a_grouping_column_is_not_a_label() {
        let labels: Vec<_> = entries("category,icd10cm\nAUTOIMMUNE,A1801\nAUTOIMMUNE,A1802\n")
            .into_iter()
            .map(|(_, l)| l)
            .collect();
        assert_eq!(labels, [None, None]);
        let with =
            entries("category,icd10cm,description\nAUTOIMMUNE,A1801,Tuberculosis of spine\n");
        assert_eq!(with[0].1.as_deref(), Some("Tuberculosis of spine"));
    }
}
