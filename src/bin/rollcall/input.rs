//! Reading a list from a file or standard input, as bytes for the core's reader.

use super::*;

/// A list from a file, or from standard input for `-`, as text.
pub(crate) fn read_raw(file: &str) -> Result<Vec<u8>, String> {
    let mut raw = Vec::new();
    if file == "-" {
        std::io::stdin()
            .read_to_end(&mut raw)
            .map_err(|e| format!("cannot read standard input: {e}"))?;
    } else {
        raw = std::fs::read(file).map_err(|e| format!("cannot read {file}: {e}"))?;
    }
    Ok(raw)
}

/// A list's text (compare and translate read text lists).
pub(crate) fn read_list(file: &str) -> Result<String, String> {
    let raw = read_raw(file)?;
    if rollcall::list::is_workbook(&raw) {
        return Err(format!(
            "{file} is a spreadsheet workbook; this command reads text lists, so save the sheet as CSV (CSV UTF-8), or check the workbook with rollcall check"
        ));
    }
    rollcall::list::decode(&raw).map_err(|e| format!("{file}: {e}"))
}

/// A list read as `reading` says, kept as its text when it is a plain list
/// or a table (see [`rollcall::list::Listing`]).
pub(crate) fn read_listing(
    file: &str,
    reading: Reading,
) -> Result<rollcall::list::Listing, String> {
    let raw = read_raw(file)?;
    rollcall::list::read_listing(raw, reading).map_err(|e| format!("{file}: {e}"))
}
