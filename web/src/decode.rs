//! A dropped file's bytes as the core reads files (a workbook, or text in
//! UTF-8 or UTF-16), and the SHA-256 a fetched file is checked by.

use crate::js::json_text;
use crate::manifest::sha256_hex_of;
use wasm_bindgen::prelude::*;

/// Whether a file's bytes are a spreadsheet workbook (a zip or OLE2
/// container), as the core tells them apart (`rollcall::list::is_workbook`).
#[wasm_bindgen(js_name = isWorkbook)]
pub fn is_workbook(bytes: &[u8]) -> bool {
    rollcall::list::is_workbook(bytes)
}

/// A dropped file as the core reads files (`rollcall check FILE` does the
/// same): `{"workbook": true}` for a spreadsheet workbook (its bytes are then
/// checked as sheets), else `{"workbook": false, "text": ...}`, the text in
/// UTF-8 or UTF-16 with its mark (the mark left out). An Error says what is wrong and what to do.
#[wasm_bindgen(js_name = decodeFile)]
pub fn decode_file(bytes: &[u8]) -> Result<String, JsValue> {
    let value = if rollcall::list::is_workbook(bytes) {
        serde_json::json!({ "workbook": true })
    } else {
        let text = rollcall::list::decode(bytes)
            .map_err(|e| JsValue::from(js_sys::Error::new(&e.message)))?;
        // A byte-order mark is no part of the list the user sees.
        let text = text.strip_prefix('\u{feff}').unwrap_or(&text);
        serde_json::json!({ "workbook": false, "text": text })
    };
    json_text(&value)
}

/// Lower-case hex SHA-256 of some bytes (to compare a fetched index with its
/// manifest).
#[wasm_bindgen(js_name = sha256Hex)]
pub fn sha256_hex(bytes: &[u8]) -> String {
    sha256_hex_of(bytes)
}
