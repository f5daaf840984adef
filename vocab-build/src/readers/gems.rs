//! The CMS General Equivalence Mappings as CSV: a header naming the source
//! and target vocabularies (`icd9cm`, `icd10cm`), then `source`, `target`,
//! `flags` (five digits: approximate, no map, combination, scenario, choice
//! list) and the same five flags as columns.

use crate::error::BuildError;
use rollcall::model::{MapFlags, MapRow, Mapping};
use crate::formats::{Builds, Format, Takes};

fn unquote(s: &str) -> &str {
    s.trim().trim_matches('"')
}

/// Reads one GEM file into a mapping, rows sorted by source (file order
/// kept within a source).
pub fn parse(file: &str, text: &str) -> Result<Mapping, BuildError> {
    let mut lines = text.lines().enumerate();
    let header = lines.next().map(|(_, l)| l).unwrap_or("");
    let cols: Vec<&str> = header.split(',').map(unquote).collect();
    let known = ["icd9cm", "icd10cm"];
    if cols.len() < 8
        || !known.contains(&cols[0])
        || !known.contains(&cols[1])
        || cols[2] != "flags"
    {
        return Err(BuildError::at(
            file,
            1,
            "expected the header \"icd9cm\",\"icd10cm\",\"flags\",... (or icd10cm first for the backward GEMs)",
        ));
    }
    let (from, to) = (cols[0].to_string(), cols[1].to_string());
    let mut rows = Vec::new();
    for (i, line) in lines {
        let line = line.trim_end_matches('\r');
        if line.is_empty() {
            continue;
        }
        let f: Vec<&str> = line.split(',').map(unquote).collect();
        let bad = |m: &str| BuildError::at(file, i + 1, m.to_string());
        if f.len() < 3 {
            return Err(bad("expected source, target and flags"));
        }
        let flags = f[2].as_bytes();
        if flags.len() != 5 || !flags.iter().all(|b| b.is_ascii_digit()) {
            return Err(bad("the flags column must be five digits (approximate, no map, combination, scenario, choice list)"));
        }
        let source = f[0].to_ascii_uppercase();
        if source.is_empty() || !source.bytes().all(|b| b.is_ascii_alphanumeric()) {
            return Err(bad(
                "the source code must be letters and digits, with no dot",
            ));
        }
        rows.push(MapRow {
            source,
            target: f[1].to_string(),
            flags: MapFlags {
                approximate: flags[0] == b'1',
                no_map: flags[1] == b'1',
                combination: flags[2] == b'1',
                scenario: flags[3] - b'0',
                choice_list: flags[4] - b'0',
            },
        });
    }
    rows.sort_by(|a, b| a.source.cmp(&b.source));
    let title = |v: &str| {
        if v == "icd9cm" {
            "ICD-9-CM"
        } else {
            "ICD-10-CM"
        }
    };
    Ok(Mapping {
        name: format!("gem-{from}-{to}"),
        title: format!(
            "General Equivalence Mappings (2015), {} to {}",
            title(&from),
            title(&to)
        ),
        from,
        to,
        rows,
    })
}

/// `--gems FILE`: a mapping kept in the index (a release may have several).
pub const FORMAT: Format = Format {
    flag: "--gems",
    takes: Takes::File,
    reads: "a General Equivalence Mappings CSV (either direction), kept in the index",
    builds: Builds::Part {
        role: "mapping to or from another vocabulary",
        add: |inp, l, _| {
            let m = parse(&l.name, &l.text).map_err(|e| e.to_string())?;
            let said = format!("{} ({} rows)", m.title, m.rows.len());
            inp.mappings.push(m);
            Ok(said)
        },
    },
};

#[cfg(test)]
mod tests {
    #[test]
    fn reads_rows_in_the_official_layout() {
        // Rows as in the 2015 ICD-9-CM to ICD-10-CM GEM file.
        let t = "\"icd9cm\",\"icd10cm\",\"flags\",\"approximate\",\"no_map\",\"combination\",\"scenario\",\"choice_list\"\n\
                 \"0020\",\"A0100\",\"10000\",1,0,0,0,0\n\
                 \"0010\",\"A000\",\"00000\",0,0,0,0,0\n";
        let m = super::parse("g.csv", t).unwrap();
        assert_eq!((m.from.as_str(), m.to.as_str()), ("icd9cm", "icd10cm"));
        assert_eq!(m.rows[0].source, "0010");
        assert!(m.rows[1].flags.approximate);
        let e = super::parse("g.csv", &t.replace("\"10000\"", "\"1x000\"")).unwrap_err();
        assert_eq!(e.line, Some(2));
    }
}
