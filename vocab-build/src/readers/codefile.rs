//! The CMS code-description file: billable codes only, `code`, spaces,
//! description.

use crate::error::BuildError;
use crate::formats::{in_force, Builds, Format, Takes};

/// Reads `(code, description)` pairs.
pub fn parse(file: &str, text: &str) -> Result<Vec<(String, String)>, BuildError> {
    let mut out = Vec::new();
    for (i, line) in text.lines().enumerate() {
        let line = line.trim_end_matches('\r');
        if line.trim().is_empty() {
            continue;
        }
        let (code, desc) = line.split_once(char::is_whitespace).unwrap_or((line, ""));
        if code.is_empty() || !code.bytes().all(|b| b.is_ascii_alphanumeric()) {
            return Err(BuildError::at(
                file,
                i + 1,
                "expected a code (letters and digits, no dot) at the start of the line",
            ));
        }
        out.push((code.to_ascii_uppercase(), desc.trim().to_string()));
    }
    Ok(out)
}

/// `--codes FILE@PERIOD`: the billable codes of the period.
pub const FORMAT: Format = Format {
    flag: "--codes",
    takes: Takes::Dated,
    reads: "CMS code-description file (billable codes)",
    builds: Builds::Part {
        role: "billable codes",
        add: |inp, l, period| {
            let p = in_force(period, "--codes")?;
            let rows = parse(&l.name, &l.text).map_err(|e| e.to_string())?;
            let said = format!("{} billable codes", rows.len());
            inp.codefiles.push((p, rows));
            Ok(said)
        },
    },
};

#[cfg(test)]
mod tests {
    #[test]
    fn reads_code_and_description() {
        let rows = super::parse(
            "c.txt",
            "A000    Cholera due to Vibrio cholerae 01, biovar cholerae\n",
        )
        .unwrap();
        assert_eq!(rows[0].0, "A000");
        assert!(super::parse("c.txt", "A0.00 x\n").is_err());
    }
}
