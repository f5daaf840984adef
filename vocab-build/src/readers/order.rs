//! The CMS/CDC order file (fixed width): order number in columns 1-5, code in
//! 7-13 (no dot), flag in 15 (`1` valid for submission, `0` header), short
//! description in 17-76, long description from 78.

use crate::error::BuildError;
use crate::formats::{in_force, Builds, Format, Takes};

/// One order-file row.
#[derive(Debug, Clone, PartialEq)]
pub struct Row {
    pub code: String,
    pub billable: bool,
    pub short: String,
    pub long: String,
}

/// Reads the order file.
pub fn parse(file: &str, text: &str) -> Result<Vec<Row>, BuildError> {
    let mut out = Vec::new();
    for (i, line) in text.lines().enumerate() {
        let line = line.trim_end_matches('\r');
        if line.trim().is_empty() {
            continue;
        }
        let b = line.as_bytes();
        if b.len() < 17 || !b[..5].iter().all(u8::is_ascii_digit) {
            return Err(BuildError::at(
                file,
                i + 1,
                "not an order-file row: expected a 5-digit order number, the code in columns 7-13 and the flag in column 15",
            ));
        }
        let billable = match b[14] {
            b'1' => true,
            b'0' => false,
            _ => {
                return Err(BuildError::at(
                    file,
                    i + 1,
                    "column 15 must be 1 (billable) or 0 (header)",
                ))
            }
        };
        let cut = |from: usize, to: usize| {
            line.get(from..to.min(line.len()))
                .unwrap_or("")
                .trim()
                .to_string()
        };
        out.push(Row {
            code: cut(6, 13).to_ascii_uppercase(),
            billable,
            short: cut(16, 76),
            long: cut(77, line.len()),
        });
    }
    Ok(out)
}

/// `--order FILE@PERIOD`: a tree and the billable flags in force for the period.
pub const FORMAT: Format = Format {
    flag: "--order",
    takes: Takes::Dated,
    reads: "CMS order file (fixed width; flag 1 billable, 0 header)",
    builds: Builds::Part {
        role: "hierarchy and billable flags",
        add: |inp, l, period| {
            let p = in_force(period, "--order")?;
            let rows = parse(&l.name, &l.text).map_err(|e| e.to_string())?;
            let b = rows.iter().filter(|r| r.billable).count();
            let said = format!(
                "{} rows, {b} billable, {} headers",
                rows.len(),
                rows.len() - b
            );
            inp.orders.push((p, rows));
            Ok(said)
        },
    },
};

#[cfg(test)]
mod tests {
    #[test]
    fn reads_fixed_columns() {
        // Rows in the layout of the January 2021 order file.
        let t = "00001 A00     0 Cholera                                                      Cholera\r\n\
                 00002 A000    1 Cholera due to Vibrio cholerae 01, biovar cholerae           Cholera due to Vibrio cholerae 01, biovar cholerae\r\n";
        let rows = super::parse("o.txt", t).unwrap();
        assert_eq!(rows[0].code, "A00");
        assert!(!rows[0].billable);
        assert!(rows[1].billable);
        assert_eq!(
            rows[1].long,
            "Cholera due to Vibrio cholerae 01, biovar cholerae"
        );
        assert!(super::parse("o.txt", "A00 x\n").is_err());
    }
}
