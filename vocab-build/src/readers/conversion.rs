//! The CMS conversion table: `effective_date`, `current_code`,
//! `previous_code`. Data coded as `previous_code` up to the day before
//! `effective_date` is now coded as `current_code`.

use crate::error::BuildError;
use crate::formats::{Builds, Format, Takes};
use rollcall::Date;

/// One conversion pair.
#[derive(Debug, Clone, PartialEq)]
pub struct Row {
    pub effective: Date,
    pub current: String,
    pub previous: String,
}

/// Reads the TSV; the first line must be the column header.
pub fn parse(file: &str, text: &str) -> Result<Vec<Row>, BuildError> {
    let rows = super::csv::tab_rows(
        file,
        text,
        |h| h == ["effective_date", "current_code", "previous_code"],
        "effective_date<TAB>current_code<TAB>previous_code",
    )?;
    let mut out = Vec::new();
    for (n, f) in rows {
        if f.len() != 3 {
            return Err(BuildError::at(file, n, "expected 3 tab-separated columns"));
        }
        let effective = Date::parse(f[0]).map_err(|e| BuildError::at(file, n, e.to_string()))?;
        let code = |s: &str| s.trim().replace('.', "").to_ascii_uppercase();
        out.push(Row {
            effective,
            current: code(f[1]),
            previous: code(f[2]),
        });
    }
    Ok(out)
}

/// `--conversion FILE`: the successors of retired codes.
pub const FORMAT: Format = Format {
    flag: "--conversion",
    takes: Takes::File,
    reads: "CMS conversion table (effective_date, current_code, previous_code)",
    builds: Builds::Part {
        role: "successors of retired codes",
        add: |inp, l, _| {
            inp.conversion = parse(&l.name, &l.text).map_err(|e| e.to_string())?;
            Ok(format!("{} conversion pairs", inp.conversion.len()))
        },
    },
};
