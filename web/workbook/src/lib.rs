//! The page's workbook reader, a WebAssembly module of its own: the cells of
//! a spreadsheet workbook (`.xlsx`, `.xls`, `.ods`) taken out with the core's
//! [`rollcall::list::workbook::sheets`] and handed over as JSON text. The
//! checker reads them as lists with `Checker.checkSheetsJson`, so calamine
//! and its zip and encoding tables are fetched only when a workbook is
//! dropped, not with the checker every page load needs.

use wasm_bindgen::prelude::*;

/// The sheets of a workbook as JSON text: an array of
/// `{ name, first_row, rows, numbers }` ([`rollcall::list::workbook::Sheet`]).
/// Throws an `Error` saying what to do with a file that is no workbook or a
/// damaged one.
#[wasm_bindgen]
pub fn sheets(bytes: &[u8]) -> Result<String, JsError> {
    sheets_json(bytes).map_err(|m| JsError::new(&m))
}

/// [`sheets`] without the JavaScript error, for native callers and tests.
pub fn sheets_json(bytes: &[u8]) -> Result<String, String> {
    let sheets = rollcall::list::workbook::sheets(bytes)
        .map_err(|e| format!("cannot read the file: {}", e.message))?;
    serde_json::to_string(&sheets)
        .map_err(|e| format!("could not hand the sheets to the page: {e}"))
}

#[cfg(test)]
mod tests {
    use super::*;
    use rollcall::list::workbook::{from_sheets, read_workbook, Sheet};
    use std::io::Write;

    /// A workbook of one sheet in Office Open XML (ECMA-376 part 1: the
    /// content types, the package relationship, the workbook and its
    /// relationships, one worksheet with inline strings).
    fn one_sheet(name: &str, rows: &[&[&str]]) -> Vec<u8> {
        let mut buf = std::io::Cursor::new(Vec::new());
        let mut z = zip::ZipWriter::new(&mut buf);
        let opt = zip::write::SimpleFileOptions::default();
        let mut put = |path: &str, body: String| {
            z.start_file(path, opt).unwrap();
            z.write_all(body.as_bytes()).unwrap();
        };
        put("[Content_Types].xml", "<?xml version=\"1.0\" encoding=\"UTF-8\"?><Types xmlns=\"http://schemas.openxmlformats.org/package/2006/content-types\"><Default Extension=\"rels\" ContentType=\"application/vnd.openxmlformats-package.relationships+xml\"/><Default Extension=\"xml\" ContentType=\"application/xml\"/><Override PartName=\"/xl/workbook.xml\" ContentType=\"application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml\"/><Override PartName=\"/xl/worksheets/sheet1.xml\" ContentType=\"application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml\"/></Types>".into());
        put("_rels/.rels", "<?xml version=\"1.0\" encoding=\"UTF-8\"?><Relationships xmlns=\"http://schemas.openxmlformats.org/package/2006/relationships\"><Relationship Id=\"rId1\" Type=\"http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument\" Target=\"xl/workbook.xml\"/></Relationships>".into());
        put("xl/workbook.xml", format!("<?xml version=\"1.0\" encoding=\"UTF-8\"?><workbook xmlns=\"http://schemas.openxmlformats.org/spreadsheetml/2006/main\" xmlns:r=\"http://schemas.openxmlformats.org/officeDocument/2006/relationships\"><sheets><sheet name=\"{name}\" sheetId=\"1\" r:id=\"rId1\"/></sheets></workbook>"));
        put("xl/_rels/workbook.xml.rels", "<?xml version=\"1.0\" encoding=\"UTF-8\"?><Relationships xmlns=\"http://schemas.openxmlformats.org/package/2006/relationships\"><Relationship Id=\"rId1\" Type=\"http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet\" Target=\"worksheets/sheet1.xml\"/></Relationships>".into());
        let data: String = rows
            .iter()
            .enumerate()
            .map(|(r, cells)| {
                let cs: String = cells
                    .iter()
                    .enumerate()
                    .map(|(c, v)| {
                        let at = format!("{}{}", (b'A' + c as u8) as char, r + 1);
                        format!("<c r=\"{at}\" t=\"inlineStr\"><is><t>{v}</t></is></c>")
                    })
                    .collect();
                format!("<row r=\"{}\">{cs}</row>", r + 1)
            })
            .collect();
        put("xl/worksheets/sheet1.xml", format!("<?xml version=\"1.0\" encoding=\"UTF-8\"?><worksheet xmlns=\"http://schemas.openxmlformats.org/spreadsheetml/2006/main\"><sheetData>{data}</sheetData></worksheet>"));
        z.finish().unwrap();
        buf.into_inner()
    }

    #[test]
    fn the_sheets_handed_over_read_as_the_workbook_itself() {
        // Invented rows of the demo study; the codes' shapes only matter here.
        let book = one_sheet(
            "Codes",
            &[
                &["Code", "Label"],
                &["E11.9", "diabetes"],
                &["I10", "hypertension"],
            ],
        );
        let json = sheets_json(&book).unwrap();
        let sheets: Vec<Sheet> = serde_json::from_str(&json).unwrap();
        assert_eq!(sheets.len(), 1);
        assert_eq!(sheets[0].name, "Codes");
        assert_eq!(sheets[0].rows[1], ["E11.9", "diabetes"]);
        let direct = read_workbook(&book).unwrap();
        let through = from_sheets(&sheets);
        assert_eq!(through, direct);
    }

    #[test]
    fn a_file_that_is_no_workbook_gets_a_message() {
        let err = sheets_json(b"PK\x03\x04not really a zip").unwrap_err();
        assert!(err.starts_with("cannot read the file: "), "{err}");
        assert!(err.contains("save it again"), "{err}");
    }
}
