//! The release-history TSV: `code`, `valid_from`, `valid_to` (YYYYMMDD,
//! inclusive), `description`; one row per code that was ever billable.

use crate::error::BuildError;
use crate::formats::{Builds, Format, Takes};
use rollcall::{Date, Period};

/// One history row.
#[derive(Debug, Clone, PartialEq)]
pub struct Row {
    pub code: String,
    pub valid: Period,
    pub description: String,
}

/// Reads the TSV; the first line must be the column header.
pub fn parse(file: &str, text: &str) -> Result<Vec<Row>, BuildError> {
    let rows = super::csv::tab_rows(
        file,
        text,
        |h| h.get(..3) == Some(&["code", "valid_from", "valid_to"][..]),
        "code<TAB>valid_from<TAB>valid_to<TAB>description",
    )?;
    let mut out = Vec::new();
    for (n, f) in rows {
        if f.len() < 3 {
            return Err(BuildError::at(
                file,
                n,
                "expected at least 3 tab-separated columns",
            ));
        }
        let date = |s: &str| Date::parse(s).map_err(|e| BuildError::at(file, n, e.to_string()));
        let (from, to) = (date(f[1])?, date(f[2])?);
        if to < from {
            return Err(BuildError::at(file, n, "valid_to is before valid_from"));
        }
        out.push(Row {
            code: f[0].trim().replace('.', "").to_ascii_uppercase(),
            valid: Period::new(from, to),
            description: f.get(3).unwrap_or(&"").trim().to_string(),
        });
    }
    Ok(out)
}

/// `--history FILE`: the billable dates and descriptions of every code.
pub const FORMAT: Format = Format {
    flag: "--history",
    takes: Takes::File,
    reads: "release-history TSV (code, valid_from, valid_to, description)",
    builds: Builds::Part {
        role: "billable dates and descriptions",
        add: |inp, l, _| {
            inp.history = parse(&l.name, &l.text).map_err(|e| e.to_string())?;
            Ok(format!("{} history rows", inp.history.len()))
        },
    },
};

#[cfg(test)]
mod tests {
    #[test]
    fn reads_rows_and_names_bad_lines() {
        let t = "code\tvalid_from\tvalid_to\tdescription\nA000\t20151001\t20270331\tCholera\nB\t2015\t20160101\tx\n";
        let e = super::parse("h.tsv", t).unwrap_err();
        assert_eq!(e.line, Some(3));
        let ok = super::parse("h.tsv", &t.lines().take(2).collect::<Vec<_>>().join("\n")).unwrap();
        assert_eq!(ok[0].code, "A000");
        assert_eq!(ok[0].valid.to.to_string(), "2027-03-31");
    }
}
