//! Reading the LOINC table (`Loinc.csv`) and its map-to file (`MapTo.csv`)
//! into terms. Columns are found by name in the header row, so the many
//! other columns of the table may come in any order.

use super::csv::{column, records};
use crate::error::BuildError;
use crate::stated::Term;
use rollcall::systems::{shape, Shape, System};
use rollcall::{Date, Period};
use std::collections::HashMap;
use crate::formats::{Builds, Format, Options, Own, Takes};
use crate::provenance::load;
use crate::stated;
use std::path::Path;

/// The credit the LOINC licence asks for. The wording is from memory of
/// the notice the licence (http://loinc.org/license) requires; check it
/// against the licence of the release you build from.
pub const NOTICE: &str = "This material contains content from LOINC (http://loinc.org). LOINC is copyright © Regenstrief Institute, Inc. and the Logical Observation Identifiers Names and Codes (LOINC) Committee and is available at no cost under the license at http://loinc.org/license.";

/// What the table held.
pub struct Table {
    /// One term per LOINC_NUM.
    pub terms: Vec<Term>,
    /// How many terms are DEPRECATED (retired).
    pub deprecated: usize,
    /// How many are TRIAL or DISCOURAGED (in use, with a status word).
    pub qualified: usize,
    /// How many map-to rows were read.
    pub map_to: usize,
}

/// A LOINC number checked for its shape and mod 10 check digit.
fn loinc_num(name: &str, line: usize, what: &str, v: &str) -> Result<String, BuildError> {
    match shape(System::Loinc, v) {
        Shape::Fits { code, .. } => Ok(code),
        Shape::Fails { reason } | Shape::Ambiguous { reason, .. } => Err(BuildError::at(
            name,
            line,
            format!("{what} \"{v}\" is not a LOINC code: {reason}; use the file as released"),
        )),
    }
}

/// Reads `Loinc.csv`, and `MapTo.csv` when given, as of the release `day`.
pub fn read(
    name: &str,
    text: &str,
    map_to: Option<(&str, &str)>,
    day: Date,
) -> Result<Table, BuildError> {
    let rows = records(name, text)?;
    let Some((header, rows)) = rows.split_first() else {
        return Err(BuildError::file(
            name,
            "is empty; give the LOINC table Loinc.csv",
        ));
    };
    let col = |w: &str| column(&header.1, w);
    let need = |w: &str| {
        col(w).ok_or_else(|| {
            BuildError::at(
                name,
                header.0,
                format!("the header row has no {w} column; give the LOINC table Loinc.csv with its header row"),
            )
        })
    };
    let (num, status) = (need("LOINC_NUM")?, need("STATUS")?);
    let (long, component, short) = (col("LONG_COMMON_NAME"), col("COMPONENT"), col("SHORTNAME"));
    if long.is_none() && component.is_none() {
        return Err(BuildError::at(
            name,
            header.0,
            "the header row has neither LONG_COMMON_NAME nor COMPONENT; one of them names the terms",
        ));
    }
    let mut terms = Vec::with_capacity(rows.len());
    let (mut deprecated, mut qualified) = (0, 0);
    for (line, f) in rows {
        let line = *line;
        if f.len() != header.1.len() {
            return Err(BuildError::at(
                name,
                line,
                format!(
                    "has {} fields but the header row has {}; check for an unquoted comma",
                    f.len(),
                    header.1.len()
                ),
            ));
        }
        let get = |c: Option<usize>| c.map_or("", |c| f[c].trim());
        let code = loinc_num(name, line, "LOINC_NUM", get(Some(num)))?;
        let description = [get(long), get(component)]
            .into_iter()
            .find(|d| !d.is_empty())
            .ok_or_else(|| {
                BuildError::at(
                    name,
                    line,
                    format!("{code} has no LONG_COMMON_NAME or COMPONENT; every term needs a name"),
                )
            })?
            .to_string();
        let mut synonyms: Vec<String> = [get(component), get(short)]
            .into_iter()
            .filter(|s| !s.is_empty() && *s != description)
            .map(String::from)
            .collect();
        synonyms.dedup();
        let mut t = Term {
            code,
            description,
            synonyms,
            at: (name.to_string(), line),
            ..Term::default()
        };
        match get(Some(status)) {
            "ACTIVE" => t.billable = vec![Period::new(day, day)],
            w @ ("TRIAL" | "DISCOURAGED") => {
                t.billable = vec![Period::new(day, day)];
                t.status = w.to_string();
                qualified += 1;
            }
            "DEPRECATED" => deprecated += 1,
            w => {
                return Err(BuildError::at(
                    name,
                    line,
                    format!("STATUS \"{w}\" is not one of ACTIVE, TRIAL, DISCOURAGED, DEPRECATED; use the file as released"),
                ))
            }
        }
        terms.push(t);
    }
    let mut n_map = 0;
    if let Some((mname, mtext)) = map_to {
        let at: HashMap<String, usize> = terms
            .iter()
            .enumerate()
            .map(|(i, t)| (t.code.clone(), i))
            .collect();
        let rows = records(mname, mtext)?;
        let Some((header, rows)) = rows.split_first() else {
            return Err(BuildError::file(
                mname,
                "is empty; give the LOINC map-to file MapTo.csv",
            ));
        };
        let need = |w: &str| {
            column(&header.1, w).ok_or_else(|| {
                BuildError::at(
                    mname,
                    header.0,
                    format!(
                        "the header row has no {w} column; give the LOINC map-to file MapTo.csv"
                    ),
                )
            })
        };
        let (from, to) = (need("LOINC")?, need("MAP_TO")?);
        for (line, f) in rows {
            let line = *line;
            if f.len() != header.1.len() {
                return Err(BuildError::at(
                    mname,
                    line,
                    format!(
                        "has {} fields but the header row has {}; check for an unquoted comma",
                        f.len(),
                        header.1.len()
                    ),
                ));
            }
            let a = loinc_num(mname, line, "LOINC", f[from].trim())?;
            let b = loinc_num(mname, line, "MAP_TO", f[to].trim())?;
            let missing = |c: &str| {
                BuildError::at(
                    mname,
                    line,
                    format!("{c} is not a term of {name}; use the map-to file of the same release"),
                )
            };
            let i = *at.get(&a).ok_or_else(|| missing(&a))?;
            if !at.contains_key(&b) {
                return Err(missing(&b));
            }
            // A deprecated term's map-to is its replacement; a term still in
            // use (DISCOURAGED) keeps it as a code to consider.
            let t = &mut terms[i];
            if t.billable.is_empty() {
                t.replaced_by.push(b);
            } else {
                t.consider.push(b);
            }
            n_map += 1;
        }
    }
    Ok(Table {
        terms,
        deprecated,
        qualified,
        map_to: n_map,
    })
}

/// `--loinc FILE`: a LOINC release a site is licensed for, an index of its own.
pub const FORMAT: Format = Format {
    flag: "--loinc",
    takes: Takes::File,
    reads: "the LOINC table (Loinc.csv): LOINC_NUM, LONG_COMMON_NAME or COMPONENT, SHORTNAME, \
            STATUS (TRIAL and DISCOURAGED warn, DEPRECATED is retired)",
    builds: Builds::Own {
        options: &[
            ("--loinc-map-to", false),
            ("--release-date", true),
            ("--release", false),
        ],
        default_out: None,
        read: read_release,
    },
};

fn read_release(file: &Path, o: &Options, _: Option<&str>) -> Result<Own, String> {
    let e = |e: BuildError| e.to_string();
    let (day, release) = o.release()?;
    let l = load(file, "terms, names and statuses", None).map_err(e)?;
    let m = match &o.map_to {
        Some(m) => Some(load(m, "replacements of deprecated terms", None).map_err(e)?),
        None => None,
    };
    let t = read(
        &l.name,
        &l.text,
        m.as_ref().map(|m| (m.name.as_str(), m.text.as_str())),
        day,
    )
    .map_err(e)?;
    eprintln!(
        "read {}: {} terms, {} deprecated, {} trial or discouraged; {} map-to rows",
        l.name,
        t.terms.len(),
        t.deprecated,
        t.qualified,
        t.map_to
    );
    let mut sources = vec![l.source];
    sources.extend(m.map(|m| m.source));
    let about = stated::About {
        id: "loinc".into(),
        title: "LOINC".into(),
        release,
        day,
        notice: NOTICE.into(),
        sources,
    };
    Ok(Own {
        about,
        terms: t.terms,
    })
}

#[cfg(test)]
mod tests {
    use super::read;
    use rollcall::Date;

    fn day() -> Date {
        Date::parse("2024-08-06").unwrap()
    }

    const HEAD: &str = "\"LOINC_NUM\",\"COMPONENT\",\"STATUS\",\"LONG_COMMON_NAME\"\r\n\"9900001-0\",\"A\",\"ACTIVE\",\"A in B\"\r\n";

    /// Each malformed row is refused with its line (line 3). 9900001-1 has
    /// a wrong check digit (LOINC Users' Guide mod 10: it should be 0).
    #[test]
    fn every_bad_row_names_its_line() {
        for (row, says) in [
            ("\"9900001-1\",\"A\",\"ACTIVE\",\"x\"", "check digit"),
            ("\"9900002\",\"A\",\"ACTIVE\",\"x\"", "LOINC"),
            ("\"9900002-8\",\"A\",\"ACTIVE\"", "fields"),
            ("\"9900002-8\",\"\",\"ACTIVE\",\"\"", "name"),
            ("\"9900002-8\",\"A\",\"RETIRED\",\"x\"", "STATUS"),
        ] {
            let text = format!("{HEAD}{row}\r\n");
            let e = read("Loinc.csv", &text, None, day()).err().expect(row);
            assert_eq!(e.line, Some(3), "{row}: {e}");
            assert!(e.message.contains(says), "{row}: {e}");
        }
        let e = read("Loinc.csv", "\"LOINC\",\"STATUS\"\n", None, day())
            .err()
            .unwrap();
        assert!(e.message.contains("LOINC_NUM"), "{e}");
    }

    #[test]
    fn bad_map_to_rows_name_their_line() {
        for (row, says) in [
            (
                "\"9900002-8\",\"9900001-0\",\"\"",
                "9900002-8 is not a term",
            ),
            (
                "\"9900001-0\",\"9900002-8\",\"\"",
                "9900002-8 is not a term",
            ),
            ("\"9900001-0\",\"x\",\"\"", "MAP_TO"),
        ] {
            let m = format!("\"LOINC\",\"MAP_TO\",\"COMMENT\"\n{row}\n");
            let e = read("Loinc.csv", HEAD, Some(("MapTo.csv", &m)), day())
                .err()
                .expect(row);
            assert_eq!((e.file.as_str(), e.line), ("MapTo.csv", Some(2)), "{e}");
            assert!(e.message.contains(says), "{row}: {e}");
        }
    }
}
