//! The CMS conversion table: `effective_date`, `current_code`,
//! `previous_code`. Data coded as `previous_code` up to the day before
//! `effective_date` is now coded as `current_code`.

use crate::error::BuildError;
use rollcall::Date;
use crate::formats::{Builds, Format, Takes};

/// One conversion pair.
#[derive(Debug, Clone, PartialEq)]
pub struct Row {
    pub effective: Date,
    pub current: String,
    pub previous: String,
}

/// Reads the TSV; the first line must be the column header.
pub fn parse(file: &str, text: &str) -> Result<Vec<Row>, BuildError> {
    let mut lines = text.lines().enumerate();
    let header = lines
        .next()
        .map(|(_, l)| l.trim_end_matches('\r'))
        .unwrap_or("");
    if header.split('\t').collect::<Vec<_>>() != ["effective_date", "current_code", "previous_code"]
    {
        return Err(BuildError::at(
            file,
            1,
            "expected the header `effective_date<TAB>current_code<TAB>previous_code`",
        ));
    }
    let mut out = Vec::new();
    for (i, line) in lines {
        let line = line.trim_end_matches('\r');
        if line.is_empty() {
            continue;
        }
        let f: Vec<&str> = line.split('\t').collect();
        if f.len() != 3 {
            return Err(BuildError::at(
                file,
                i + 1,
                "expected 3 tab-separated columns",
            ));
        }
        let effective =
            Date::parse(f[0]).map_err(|e| BuildError::at(file, i + 1, e.to_string()))?;
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
