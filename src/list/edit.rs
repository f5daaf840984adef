//! Edits to a list that leave every other character as it was (labels,
//! other columns, line endings): replace a code where it stands, remove a
//! line, add a line laid out like the others. The page applies its
//! suggestions with them; line numbers are those of the list as given.

use super::{InputLine, Layout, LineKind, Reading};
use serde::Deserialize;

/// Why an edit cannot be made; [`std::fmt::Display`] says it.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum EditError {
    /// The list has no such line.
    NoLine(usize),
    /// The line holds no code at that column (1-based, in characters).
    NoCodeAt {
        /// The line.
        line: usize,
        /// The column asked for.
        column: usize,
    },
    /// The line holds no code.
    NoCode(usize),
    /// The new code is empty or holds a tab, a line break, a comma or a quote.
    Unwritable(String),
    /// Another edit of the same request removes the line.
    Removed(usize),
    /// The code read on the line could not be found in its text.
    NotInLine(usize),
}

impl std::fmt::Display for EditError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            EditError::NoLine(line) => write!(f, "the list has no line {line}"),
            EditError::NoCodeAt { line, column } => {
                write!(f, "line {line} holds no code at column {column}")
            }
            EditError::NoCode(line) => write!(f, "line {line} holds no code to replace"),
            EditError::Unwritable(code) => {
                write!(f, "\u{201c}{code}\u{201d} cannot be written into the list")
            }
            EditError::Removed(line) => write!(f, "line {line} is removed by another change"),
            EditError::NotInLine(line) => {
                write!(f, "the code on line {line} could not be found in the line")
            }
        }
    }
}

impl std::error::Error for EditError {}

/// One change to the list, with line numbers of the list as it is now (1-based).
#[derive(Deserialize, Debug, Clone, PartialEq, Eq)]
#[serde(tag = "op", rename_all = "lowercase", deny_unknown_fields)]
pub enum Edit {
    /// Put `code` in place of the code written on `line` (at `column`, the
    /// code's 1-based column, when the line holds several codes).
    Replace {
        /// The line (1-based).
        line: usize,
        /// The code to write.
        code: String,
        /// The column of the code to replace (1-based, in characters).
        #[serde(default)]
        column: Option<usize>,
    },
    /// Delete `line`.
    Remove {
        /// The line (1-based).
        line: usize,
    },
    /// Add a line with `code` (and `label`, in the label column) after `after`.
    Add {
        /// The line to add after (0: before the first).
        after: usize,
        /// The code to write.
        code: String,
        /// Its label, if any.
        label: Option<String>,
    },
}

/// Byte range of cell `col` of a CSV line (quote-aware, as the core splits it).
fn csv_cell_range(line: &str, col: usize) -> Option<(usize, usize)> {
    let mut start = 0;
    let mut quoted = false;
    let mut cell = 0;
    let bytes = line.as_bytes();
    let mut i = 0;
    while i < bytes.len() {
        match bytes[i] {
            b'"' => quoted = !quoted,
            b',' if !quoted => {
                if cell == col {
                    return Some((start, i));
                }
                cell += 1;
                start = i + 1;
            }
            _ => {}
        }
        i += 1;
    }
    (cell == col).then_some((start, line.len()))
}

/// The byte range of the words that make up `code` at the start of a plain
/// line (the core may have joined `E11 .9` into `E11.9`).
fn plain_code_range(line: &str, code: &str) -> Option<(usize, usize)> {
    let want: String = code.chars().filter(|c| !c.is_whitespace()).collect();
    let mut got = String::new();
    let mut start = None;
    let mut pos = 0;
    for word in line.split_whitespace() {
        let at = pos + line[pos..].find(word)?;
        start.get_or_insert(at);
        pos = at + word.len();
        got.push_str(word);
        if got == want {
            return Some((start.unwrap_or(0), pos));
        }
        if !want.starts_with(&got) {
            return None;
        }
    }
    None
}

/// A new line holding `code` and `label` laid out like the rest of the list.
fn new_line(layout: Layout, code: &str, label: Option<&str>) -> String {
    let label = label.map(|l| l.replace(['\t', '\r', '\n'], " "));
    match layout {
        Layout::Plain => match label {
            Some(l) => format!("{code} {l}"),
            None => code.to_string(),
        },
        Layout::Tsv(c, l) | Layout::Csv(c, l) => {
            let csv = matches!(layout, Layout::Csv(..));
            let width = c.max(l.unwrap_or(0)) + 1;
            let mut cells = vec![String::new(); width];
            cells[c] = code.to_string();
            if let (Some(l), Some(text)) = (l, label) {
                cells[l] = if csv && text.contains([',', '"']) {
                    format!("\"{}\"", text.replace('"', "\"\""))
                } else {
                    text
                };
            }
            let line = cells.join(if csv { "," } else { "\t" });
            line.trim_end_matches([',', '\t']).to_string()
        }
    }
}

fn check_code(code: &str) -> Result<(), EditError> {
    if code.trim().is_empty() || code.contains(['\t', '\n', '\r', ',', '"']) {
        return Err(EditError::Unwritable(code.to_string()));
    }
    Ok(())
}

/// Apply edits to a list, leaving every other character as it was (labels,
/// other columns, line endings). All line numbers refer to `text` as given,
/// read as `reading` says: a code found inside a longer line
/// (markdown, prose, SQL, JSON) is replaced where it stands, so the draft
/// keeps its form.
pub fn apply(text: &str, edits: &[Edit], reading: Reading) -> Result<String, EditError> {
    let draft = super::read(text, reading);
    let layout = match draft.facts.reading {
        Reading::Table => super::table::detect_table(text).layout,
        _ => Layout::Plain,
    };
    let lines = &draft.lines;
    let mut physical: Vec<Option<String>> = text.split('\n').map(|l| Some(l.to_string())).collect();
    let mut added: std::collections::BTreeMap<usize, Vec<String>> = Default::default();
    let count = draft.line_count();
    let entry_at = |line: usize, column: Option<usize>| -> Result<&InputLine, EditError> {
        let mut on_line = lines.iter().filter(|l| l.number == line).peekable();
        if on_line.peek().is_none() {
            return Err(EditError::NoLine(line));
        }
        let found = on_line
            .filter(|l| matches!(l.kind, LineKind::Entry { .. }))
            .find(|l| column.is_none() || l.column() == column);
        found.ok_or(match column {
            Some(column) => EditError::NoCodeAt { line, column },
            None => EditError::NoCode(line),
        })
    };
    for edit in edits {
        match edit {
            Edit::Remove { line } => {
                if *line == 0 || *line > count {
                    return Err(EditError::NoLine(*line));
                }
                physical[line - 1] = None;
            }
            Edit::Add { after, code, label } => {
                check_code(code)?;
                if *after > count {
                    return Err(EditError::NoLine(*after));
                }
                added
                    .entry(*after)
                    .or_default()
                    .push(new_line(layout, code, label.as_deref()));
            }
            Edit::Replace {
                line,
                code: new_code,
                column,
            } => {
                let input = entry_at(*line, *column)?;
                let LineKind::Entry { code: written, .. } = &input.kind else {
                    return Err(EditError::NoCode(*line));
                };
                check_code(new_code)?;
                let Some(raw) = physical.get_mut(line - 1).and_then(Option::as_mut) else {
                    return Err(EditError::Removed(*line));
                };
                let (body, cr) = match raw.strip_suffix('\r') {
                    Some(l) => (l.to_string(), "\r"),
                    None => (raw.clone(), ""),
                };
                if let Some((a, b)) = input
                    .place
                    .span
                    .filter(|&(a, b)| body.get(a..b) == Some(written.as_str()))
                {
                    *raw = format!("{}{}{}{}", &body[..a], new_code, &body[b..], cr);
                    continue;
                }
                let range = match layout {
                    Layout::Tsv(col, _) => {
                        let mut start = 0;
                        let mut found = None;
                        for (i, cell) in body.split('\t').enumerate() {
                            if i == col {
                                found = Some((start, start + cell.len()));
                                break;
                            }
                            start += cell.len() + 1;
                        }
                        found
                    }
                    Layout::Csv(col, _) => csv_cell_range(&body, col),
                    Layout::Plain => plain_code_range(&body, written.as_str()),
                };
                let Some((a, b)) = range else {
                    return Err(EditError::NotInLine(*line));
                };
                // Keep the cell's surrounding spaces.
                let cell = &body[a..b];
                let lead = cell.len() - cell.trim_start().len();
                let trail = cell.len() - cell.trim_end().len();
                *raw = format!(
                    "{}{}{}{}",
                    &body[..a + lead],
                    new_code,
                    &body[b - trail..],
                    cr
                );
            }
        }
    }
    // A list ending in a newline has one more piece than lines; added lines
    // go before that empty tail.
    let mut out: Vec<String> = Vec::with_capacity(physical.len());
    if let Some(first) = added.get(&0) {
        out.extend(first.iter().cloned());
    }
    for (i, line) in physical.into_iter().enumerate() {
        if let Some(l) = line {
            out.push(l);
        }
        if let Some(more) = added.get(&(i + 1)) {
            out.extend(more.iter().cloned());
        }
    }
    Ok(out.join("\n"))
}

#[cfg(test)]
mod tests {
    use super::*;

    // The page's own cases (common practice: each edit keeps every other
    // character of the line and the list).
    fn edit_list(text: &str, edits: &[Edit]) -> Result<String, String> {
        apply(text, edits, Reading::Auto).map_err(|e| e.to_string())
    }

    fn replace(line: usize, code: &str) -> Edit {
        Edit::Replace {
            line,
            code: code.into(),
            column: None,
        }
    }

    #[test]
    fn a_code_in_a_draft_is_replaced_where_it_stands() {
        let md = "## Heart failure\n- **I5O.9** (Heart failure, unspecified)\n- I50.22, I50.99 and I10\n";
        let fixed = edit_list(md, &[replace(2, "I50.9")]).unwrap();
        assert_eq!(fixed, "## Heart failure\n- **I50.9** (Heart failure, unspecified)\n- I50.22, I50.99 and I10\n");
        let second = Edit::Replace {
            line: 3,
            code: "I50.9".into(),
            column: Some(11),
        };
        let fixed = edit_list(md, &[second]).unwrap();
        assert!(fixed.ends_with("- I50.22, I50.9 and I10\n"), "{fixed}");
        let sql = "WHERE dx IN ('E11.9', 'E1l.65')\n";
        let fixed = edit_list(
            sql,
            &[Edit::Replace {
                line: 1,
                code: "E11.65".into(),
                column: Some(24),
            }],
        )
        .unwrap();
        assert_eq!(fixed, "WHERE dx IN ('E11.9', 'E11.65')\n");
    }

    #[test]
    fn replacing_keeps_labels_and_columns() {
        let tsv = "code\tlabel\ne119\tType 2\r\nI10\thypertension\n";
        assert_eq!(
            edit_list(tsv, &[replace(2, "E11.9")]).unwrap(),
            "code\tlabel\nE11.9\tType 2\r\nI10\thypertension\n"
        );
        let csv = "label,code\n\"Diabetes, type 2\", e119 \nHypertension,I10\n";
        assert_eq!(
            edit_list(csv, &[replace(2, "E11.9")]).unwrap(),
            "label,code\n\"Diabetes, type 2\", E11.9 \nHypertension,I10\n"
        );
        let plain = "  E11 .9 diabetes\nI10 hypertension";
        assert_eq!(
            edit_list(plain, &[replace(1, "E11.9"), replace(2, "I10.0")]).unwrap(),
            "  E11.9 diabetes\nI10.0 hypertension"
        );
    }

    #[test]
    fn removing_and_adding_lines_follow_the_layout() {
        let plain = "E11.0\nE11.1\nE11.9\n";
        let edits = [
            replace(1, "E11.*"),
            Edit::Remove { line: 2 },
            Edit::Remove { line: 3 },
        ];
        assert_eq!(edit_list(plain, &edits).unwrap(), "E11.*\n");
        let add = |after, code: &str, label: Option<&str>| Edit::Add {
            after,
            code: code.into(),
            label: label.map(Into::into),
        };
        assert_eq!(
            edit_list(
                "label,code\nDiabetes,E11.9\n",
                &[add(2, "E10.9", Some("Type 1, other"))]
            )
            .unwrap(),
            "label,code\nDiabetes,E11.9\n\"Type 1, other\",E10.9\n"
        );
        assert_eq!(
            edit_list(
                "E11.9\tdiabetes\nI10\thypertension",
                &[add(1, "E10.9", Some("type 1"))]
            )
            .unwrap(),
            "E11.9\tdiabetes\nE10.9\ttype 1\nI10\thypertension"
        );
        assert_eq!(
            edit_list("E11.9 diabetes", &[add(1, "E10.9", None)]).unwrap(),
            "E11.9 diabetes\nE10.9"
        );
    }

    #[test]
    fn edits_refuse_what_they_cannot_do() {
        assert!(edit_list("E11.9\n# note\n", &[replace(2, "E10.9")])
            .unwrap_err()
            .contains("no code"));
        assert!(edit_list("E11.9", &[replace(5, "E10.9")])
            .unwrap_err()
            .contains("no line 5"));
        assert!(edit_list("E11.9", &[replace(1, "E10.9\tx")])
            .unwrap_err()
            .contains("cannot be written"));
        assert!(
            edit_list("E11.9", &[Edit::Remove { line: 1 }, replace(1, "E10.9")])
                .unwrap_err()
                .contains("removed")
        );
        assert!(edit_list("E11.9", &[Edit::Remove { line: 0 }])
            .unwrap_err()
            .contains("no line 0"));
    }
}
