//! Spreadsheet workbooks (`.xlsx`, `.xls`, `.ods`, read with calamine):
//! each sheet is read as the text of its rows (cells separated by tabs, as
//! a spreadsheet paste is), with the same reader as any pasted list, and
//! every entry keeps its sheet and row.

use super::{read, Draft, InputLine, ReadError, ReadFacts, Reading, SheetRead};
use calamine::{open_workbook_auto_from_rs, Data, Reader};

/// A cell as its text: numbers as a spreadsheet shows them by default.
fn cell_text(d: &Data) -> String {
    match d {
        Data::Empty => String::new(),
        Data::String(s) => s.replace(['\t', '\n', '\r'], " "),
        Data::Float(f) if f.fract() == 0.0 && f.abs() < 1e15 => format!("{}", *f as i64),
        other => other.to_string(),
    }
}

/// Reads every sheet of a workbook.
pub fn read_workbook(bytes: &[u8]) -> Result<Draft, ReadError> {
    let cursor = std::io::Cursor::new(bytes.to_vec());
    let mut book = open_workbook_auto_from_rs(cursor).map_err(|e| ReadError {
        message: format!(
            "this looks like a spreadsheet workbook but cannot be opened ({e}); save it again as .xlsx, or save the sheet as CSV UTF-8, and try again"
        ),
    })?;
    let mut lines: Vec<InputLine> = Vec::new();
    let mut facts = ReadFacts {
        reading: Reading::Workbook,
        form: "workbook".into(),
        ..ReadFacts::default()
    };
    let mut numbers = 0usize;
    for name in book.sheet_names() {
        let range = book.worksheet_range(&name).map_err(|e| ReadError {
            message: format!("the sheet \u{201c}{name}\u{201d} cannot be read ({e}); save the workbook again and try again"),
        })?;
        let first_row = range.start().map_or(0, |(r, _)| r as usize);
        let rows: Vec<String> = range
            .rows()
            .map(|r| {
                numbers += r.iter().filter(|c| matches!(c, Data::Float(_))).count();
                let cells: Vec<String> = r.iter().map(cell_text).collect();
                let n = cells
                    .iter()
                    .rposition(|c| !c.is_empty())
                    .map_or(0, |i| i + 1);
                cells[..n].join("\t")
            })
            .collect();
        let text = rows.join("\n");
        let sheet = read(&text, Reading::Auto);
        let offset = facts.lines;
        let filled = rows.iter().filter(|r| !r.trim().is_empty()).count();
        facts.sheets.push(SheetRead {
            name: name.clone(),
            rows: filled,
            codes: sheet.facts.codes,
        });
        facts.codes += sheet.facts.codes;
        facts.lines_with_codes += sheet.facts.lines_with_codes;
        facts.lines += rows.len();
        for mut l in sheet.lines {
            let row = first_row + l.number;
            l.place.sheet = Some(name.clone());
            l.place.row = Some(row);
            l.number += offset;
            lines.push(l);
        }
    }
    if numbers > 0 {
        facts.notes.push(
            "some cells hold numbers rather than text, and a spreadsheet drops a number's trailing zeros (250.00 becomes 250); format code columns as text to keep codes as written".into(),
        );
    }
    Ok(Draft { lines, facts })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_zip_that_is_no_workbook_is_refused_with_a_message() {
        let err = read_workbook(b"PK\x03\x04not really a zip").unwrap_err();
        assert!(err.message.contains("cannot be opened"), "{}", err.message);
    }
}
