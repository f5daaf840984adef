//! Spreadsheet workbooks (`.xlsx`, `.xls`, `.ods`): [`sheets`] takes the
//! cells out with calamine (behind the `workbook` feature), and
//! [`from_sheets`] reads each sheet as the text of its rows (cells
//! separated by tabs, as a spreadsheet paste is), with the same reader as
//! any pasted list; every entry keeps its sheet and row. The two halves are
//! apart so the browser can load the cell reader as a module of its own,
//! only when a workbook is dropped.

#[cfg(feature = "workbook")]
use super::ReadError;
use super::{read, Draft, InputLine, ReadFacts, Reading, SheetRead};
#[cfg(feature = "workbook")]
use calamine::{open_workbook_auto_from_rs, Data, Reader};
use serde::{Deserialize, Serialize};

/// One sheet's cells as text, row by row.
#[derive(Clone, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
pub struct Sheet {
    /// The sheet's name.
    pub name: String,
    /// The spreadsheet row number of the first row (1-based).
    pub first_row: usize,
    /// Rows of cells, trailing empty cells dropped.
    pub rows: Vec<Vec<String>>,
    /// Cells that held numbers (a spreadsheet drops their trailing zeros).
    pub numbers: usize,
}

/// A cell as its text: numbers as a spreadsheet shows them by default.
#[cfg(feature = "workbook")]
fn cell_text(d: &Data) -> String {
    match d {
        Data::Empty => String::new(),
        Data::String(s) => s.replace(['\t', '\n', '\r'], " "),
        Data::Float(f) if f.fract() == 0.0 && f.abs() < 1e15 => format!("{}", *f as i64),
        other => other.to_string(),
    }
}

/// The cells of every sheet of a workbook.
#[cfg(feature = "workbook")]
pub fn sheets(bytes: &[u8]) -> Result<Vec<Sheet>, ReadError> {
    let cursor = std::io::Cursor::new(bytes.to_vec());
    let mut book = open_workbook_auto_from_rs(cursor).map_err(|e| ReadError {
        message: format!(
            "this looks like a spreadsheet workbook but cannot be opened ({e}); save it again as .xlsx, or save the sheet as CSV UTF-8, and try again"
        ),
    })?;
    let mut out = Vec::new();
    for name in book.sheet_names() {
        let range = book.worksheet_range(&name).map_err(|e| ReadError {
            message: format!("the sheet \u{201c}{name}\u{201d} cannot be read ({e}); save the workbook again and try again"),
        })?;
        let mut numbers = 0;
        let rows = range
            .rows()
            .map(|r| {
                numbers += r.iter().filter(|c| matches!(c, Data::Float(_))).count();
                let mut cells: Vec<String> = r.iter().map(cell_text).collect();
                let n = cells
                    .iter()
                    .rposition(|c| !c.is_empty())
                    .map_or(0, |i| i + 1);
                cells.truncate(n);
                cells
            })
            .collect();
        out.push(Sheet {
            name,
            first_row: range.start().map_or(0, |(r, _)| r as usize) + 1,
            rows,
            numbers,
        });
    }
    Ok(out)
}

/// Reads every sheet of a workbook.
#[cfg(feature = "workbook")]
pub fn read_workbook(bytes: &[u8]) -> Result<Draft, ReadError> {
    Ok(from_sheets(&sheets(bytes)?))
}

/// Reads the sheets of a workbook as lists, one after the other: line
/// numbers run on across sheets, and each entry keeps its sheet and row.
pub fn from_sheets(sheets: &[Sheet]) -> Draft {
    let mut lines: Vec<InputLine> = Vec::new();
    let mut facts = ReadFacts {
        reading: Reading::Workbook,
        form: "workbook".into(),
        ..ReadFacts::default()
    };
    for sheet in sheets {
        let rows: Vec<String> = sheet
            .rows
            .iter()
            .map(|r| {
                r.iter()
                    .map(|c| c.replace(['\t', '\n', '\r'], " "))
                    .collect::<Vec<_>>()
                    .join("\t")
            })
            .collect();
        let read_sheet = read(&rows.join("\n"), Reading::Auto);
        let offset = facts.lines;
        facts.sheets.push(SheetRead {
            name: sheet.name.clone(),
            rows: rows.iter().filter(|r| !r.trim().is_empty()).count(),
            codes: read_sheet.facts.codes,
        });
        facts.codes += read_sheet.facts.codes;
        facts.lines_with_codes += read_sheet.facts.lines_with_codes;
        facts.lines += rows.len();
        for mut l in read_sheet.lines {
            l.place.sheet = Some(sheet.name.clone());
            l.place.row = Some(sheet.first_row + l.number - 1);
            l.number += offset;
            lines.push(l);
        }
    }
    if sheets.iter().any(|s| s.numbers > 0) {
        facts.notes.push(
            "some cells hold numbers rather than text, and a spreadsheet drops a number's trailing zeros (250.00 becomes 250); format code columns as text to keep codes as written".into(),
        );
    }
    Draft { lines, facts }
}

#[cfg(all(test, feature = "workbook"))]
mod tests {
    use super::*;

    #[test]
    fn a_zip_that_is_no_workbook_is_refused_with_a_message() {
        let err = read_workbook(b"PK\x03\x04not really a zip").unwrap_err();
        assert!(err.message.contains("cannot be opened"), "{}", err.message);
    }
}
