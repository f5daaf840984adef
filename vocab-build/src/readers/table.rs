//! Reading the plain table format for any other vocabulary a site holds:
//! tab-separated, a header row naming the columns `code`, `description`,
//! `parent`, `status`, `valid_from`, `valid_to`, `replaced_by` (`code` and
//! `description` are required, the rest optional, in any order). The
//! README gives the rules; every row that breaks one is an error naming
//! its line.

use crate::error::BuildError;
use crate::stated::Term;
use rollcall::{Date, Period};
use std::collections::HashMap;
use crate::formats::{Builds, Format, Options, Own, Takes};
use crate::provenance::load;
use crate::stated;
use std::path::Path;

/// The columns the format knows.
pub const COLUMNS: [&str; 7] = [
    "code",
    "description",
    "parent",
    "status",
    "valid_from",
    "valid_to",
    "replaced_by",
];

/// What the table held.
pub struct Table {
    /// One term per row.
    pub terms: Vec<Term>,
    /// Whether any row gave a date (a dated vocabulary).
    pub dated: bool,
}

/// A code as the index stores it: ASCII letters upper-cased; anything but
/// A-Z, 0-9, `:` and `-`, or more than 32 characters, is an error.
fn code(name: &str, n: usize, what: &str, v: &str) -> Result<String, BuildError> {
    let c = v.trim().to_ascii_uppercase();
    let bad = c
        .chars()
        .find(|ch| !(ch.is_ascii_uppercase() || ch.is_ascii_digit() || *ch == ':' || *ch == '-'));
    if c.is_empty() || c.len() > 32 || bad.is_some() {
        let why = match bad {
            Some(ch) => format!("has \"{ch}\""),
            None if c.is_empty() => "is empty".to_string(),
            None => "is longer than 32 characters".to_string(),
        };
        return Err(BuildError::at(
            name,
            n,
            format!("the {what} \"{}\" {why}; a code is 1 to 32 letters, digits, ':' or '-' (write E11.9 as E119)", v.trim()),
        ));
    }
    Ok(c)
}

fn codes(name: &str, n: usize, what: &str, v: &str) -> Result<Vec<String>, BuildError> {
    if v.trim().is_empty() {
        return Ok(Vec::new());
    }
    v.split('|').map(|c| code(name, n, what, c)).collect()
}

fn day(name: &str, n: usize, what: &str, v: &str) -> Result<Option<Date>, BuildError> {
    let v = v.trim();
    if v.is_empty() {
        return Ok(None);
    }
    if v.len() != 10 {
        return Err(BuildError::at(
            name,
            n,
            format!("{what} \"{v}\" is not a date; write YYYY-MM-DD, or leave it empty"),
        ));
    }
    Date::parse(v).map(Some).map_err(|_| {
        BuildError::at(
            name,
            n,
            format!("{what} \"{v}\" is not a date; write YYYY-MM-DD, or leave it empty"),
        )
    })
}

/// Reads the table. `release_day` is the day the table describes: the
/// coverage of a table without dates, and the end of an open `valid_to`.
pub fn read(name: &str, text: &str, release_day: Date) -> Result<Table, BuildError> {
    let mut lines = text
        .lines()
        .enumerate()
        .map(|(i, l)| (i + 1, l.trim_end_matches('\r')))
        .filter(|(_, l)| !l.trim().is_empty() && !l.starts_with('#'));
    let Some((hn, header)) = lines.next() else {
        return Err(BuildError::file(
            name,
            "is empty; the first row names the columns (code, description, ...)",
        ));
    };
    let header: Vec<&str> = header.split('\t').map(str::trim).collect();
    let mut at: HashMap<&str, usize> = HashMap::new();
    for (i, h) in header.iter().enumerate() {
        if !COLUMNS.contains(h) {
            return Err(BuildError::at(
                name,
                hn,
                format!(
                    "\"{h}\" is not a column of the format; use {}",
                    COLUMNS.join(", ")
                ),
            ));
        }
        if at.insert(h, i).is_some() {
            return Err(BuildError::at(
                name,
                hn,
                format!("the column {h} is given twice"),
            ));
        }
    }
    for need in ["code", "description"] {
        if !at.contains_key(need) {
            return Err(BuildError::at(
                name,
                hn,
                format!("the header row has no {need} column; it is required"),
            ));
        }
    }
    // Rows with their dates as written, before open ends are filled in.
    let mut rows: Vec<(Term, Option<Date>, Option<Date>, bool)> = Vec::new();
    for (n, line) in lines {
        let f: Vec<&str> = line.split('\t').collect();
        if f.len() != header.len() {
            return Err(BuildError::at(
                name,
                n,
                format!("has {} tab-separated fields but the header row has {}; give every column, empty where unknown", f.len(), header.len()),
            ));
        }
        let get = |c: &str| at.get(c).map_or("", |&i| f[i].trim());
        let mut t = Term {
            code: code(name, n, "code", get("code"))?,
            description: get("description").to_string(),
            parents: codes(name, n, "parent", get("parent"))?,
            replaced_by: codes(name, n, "replaced_by", get("replaced_by"))?,
            at: (name.to_string(), n),
            ..Term::default()
        };
        if t.description.is_empty() {
            return Err(BuildError::at(
                name,
                n,
                format!("{} has no description; every code needs one", t.code),
            ));
        }
        let (from, to) = (
            day(name, n, "valid_from", get("valid_from"))?,
            day(name, n, "valid_to", get("valid_to"))?,
        );
        if let (Some(a), Some(b)) = (from, to) {
            if b < a {
                return Err(BuildError::at(
                    name,
                    n,
                    format!("valid_to {b} is before valid_from {a}"),
                ));
            }
        }
        let retired = match get("status") {
            "" | "active" => false,
            "retired" => true,
            w if w
                .chars()
                .all(|c| c.is_alphanumeric() || c == '-' || c == '_' || c == ' ') =>
            {
                t.status = w.to_string();
                false
            }
            w => {
                return Err(BuildError::at(
                    name,
                    n,
                    format!(
                        "status \"{w}\" is not active, retired or a single word; write one of them"
                    ),
                ));
            }
        };
        if retired && from.is_some() && to.is_none() {
            return Err(BuildError::at(
                name,
                n,
                format!(
                    "{} is retired but has no valid_to; give the last day it was in use",
                    t.code
                ),
            ));
        }
        if !t.replaced_by.is_empty() && !retired && to.is_none() {
            return Err(BuildError::at(
                name,
                n,
                format!("{} names replaced_by but is in use with no valid_to; mark it retired or give its last day", t.code),
            ));
        }
        if t.parents.contains(&t.code) {
            return Err(BuildError::at(
                name,
                n,
                format!("{} is given as its own parent", t.code),
            ));
        }
        rows.push((t, from, to, retired));
    }
    let dated = rows.iter().any(|r| r.1.is_some() || r.2.is_some());
    let first = rows
        .iter()
        .flat_map(|r| [r.1, r.2])
        .flatten()
        .chain([release_day])
        .min()
        .unwrap_or(release_day);
    let mut terms = Vec::with_capacity(rows.len());
    for (mut t, from, to, retired) in rows {
        if dated {
            if from.is_some() || to.is_some() || !retired {
                let a = from.unwrap_or(first);
                let b = to.unwrap_or(release_day);
                if b < a {
                    return Err(BuildError::at(
                        &t.at.0,
                        t.at.1,
                        format!("{} is open-ended from {a}, after the release day {b}; give a valid_to or a later --release-date", t.code),
                    ));
                }
                t.billable = vec![Period::new(a, b)];
            }
        } else if !retired {
            t.billable = vec![Period::new(release_day, release_day)];
        }
        terms.push(t);
    }
    if let Some(t) = on_cycle(&terms) {
        return Err(BuildError::at(
            &t.at.0,
            t.at.1,
            format!(
                "{} is its own ancestor through the parent column; break the loop",
                t.code
            ),
        ));
    }
    Ok(Table { terms, dated })
}

/// A term on a loop of parent links, if any (depth-first search).
fn on_cycle(terms: &[Term]) -> Option<&Term> {
    let at: HashMap<&str, usize> = terms
        .iter()
        .enumerate()
        .map(|(i, t)| (t.code.as_str(), i))
        .collect();
    // 0 unseen, 1 on the current path, 2 done.
    let mut state = vec![0u8; terms.len()];
    for start in 0..terms.len() {
        if state[start] != 0 {
            continue;
        }
        let mut stack = vec![(start, 0usize)];
        state[start] = 1;
        while let Some(&mut (i, ref mut next)) = stack.last_mut() {
            let ps = &terms[i].parents;
            if *next == ps.len() {
                state[i] = 2;
                stack.pop();
                continue;
            }
            let p = &ps[*next];
            *next += 1;
            let Some(&j) = at.get(p.as_str()) else {
                continue;
            };
            match state[j] {
                0 => {
                    state[j] = 1;
                    stack.push((j, 0));
                }
                1 => return Some(&terms[j]),
                _ => {}
            }
        }
    }
    None
}

/// `--table FILE`: a vocabulary a site keeps in the plain table format, an
/// index of its own.
pub const FORMAT: Format = Format {
    flag: "--table",
    takes: Takes::File,
    reads: "the plain table format (see README: code, description, parent, status, \
            valid_from, valid_to, replaced_by)",
    builds: Builds::Own {
        options: &[
            ("--id", true),
            ("--title", true),
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
    let (Some(id), Some(title)) = (&o.id, &o.title) else {
        return Err("a --table import needs --id (e.g. local-labs) and --title (the vocabulary's name)".into());
    };
    let l = load(file, "codes, parents, statuses and dates", None).map_err(e)?;
    let t = read(&l.name, &l.text, day).map_err(e)?;
    eprintln!(
        "read {}: {} codes ({})",
        l.name,
        t.terms.len(),
        if t.dated { "dated" } else { "one release" }
    );
    let about = stated::About {
        id: id.clone(),
        title: title.clone(),
        release,
        day,
        notice: String::new(),
        sources: vec![l.source],
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
        Date::parse("2025-06-30").unwrap()
    }

    const HEAD: &str =
        "code\tdescription\tparent\tstatus\tvalid_from\tvalid_to\treplaced_by\n# comment\n\nA1\tRoot\t\t\t\t\t\n";

    /// Each malformed row is refused with its line (line 5: after the
    /// header, a comment, a blank line and a good row).
    #[test]
    fn every_bad_row_names_its_line() {
        let bad = [
            ("A2\tx\tA1\t\t\t\n", "fields"),
            ("A.2\tx\tA1\t\t\t\t\n", "\".\""),
            ("\tx\t\t\t\t\t\n", "is empty"),
            ("A2345678901234567890123456789012X\tx\t\t\t\t\t\n", "32"),
            ("A2\t\tA1\t\t\t\t\n", "no description"),
            ("A2\tx\tA1\t\t2025-13-01\t\t\n", "valid_from"),
            ("A2\tx\tA1\t\t20250101\t\t\n", "YYYY-MM-DD"),
            ("A2\tx\tA1\t\t2025-02-01\t2025-01-01\t\n", "before"),
            ("A2\tx\tA1\tretired\t2024-01-01\t\t\n", "no valid_to"),
            ("A2\tx\tA1\t\t\t\tA1\n", "replaced_by"),
            ("A2\tx\tA1\tnot/ok\t\t\t\n", "status"),
            ("A2\tx\tA2\t\t\t\t\n", "own parent"),
            ("A2\tx\tA9\t\t\t\t\n", "A9"),
            ("A1\tagain\t\t\t\t\t\n", "twice"),
            ("A2\tx\tA1\t\t2026-01-01\t\t\n", "open-ended"),
        ];
        for (row, says) in bad {
            let text = format!("{HEAD}{row}");
            let e = read("t.tsv", &text, day())
                .and_then(|t| {
                    crate::stated::build(
                        crate::stated::About {
                            id: "t".into(),
                            title: "T".into(),
                            release: "r".into(),
                            day: day(),
                            notice: String::new(),
                            sources: Vec::new(),
                        },
                        t.terms,
                    )
                    .map(|_| ())
                })
                .expect_err(row);
            assert_eq!(e.line, Some(5), "{row:?}: {e}");
            assert!(e.message.contains(says), "{row:?}: {e}");
        }
    }

    #[test]
    fn a_loop_of_parents_is_refused() {
        let text = "code\tdescription\tparent\nA\ta\tB\nB\tb\tC\nC\tc\tA\n";
        let e = read("t.tsv", text, day()).err().unwrap();
        assert!(e.message.contains("own ancestor"), "{e}");
        assert!(e.line.is_some());
    }

    #[test]
    fn header_problems_name_the_header_line() {
        for (text, says) in [
            ("# c\ncode\tname\n", "\"name\" is not a column"),
            ("code\tcode\n", "twice"),
            ("code\tparent\n", "no description"),
        ] {
            let e = read("t.tsv", text, day()).err().unwrap();
            assert!(e.message.contains(says), "{text:?}: {e}");
            assert!(e.line.is_some());
        }
    }

    /// Without dates the table is one release: codes in use on the
    /// release day, retired ones on none; other status words are kept.
    #[test]
    fn a_table_without_dates_is_one_release() {
        let text =
            "code\tdescription\tstatus\treplaced_by\nA\ta\t\t\nB\tb\tretired\tA\nc\tc\ttrial\t\n";
        let t = read("t.tsv", text, day()).unwrap();
        assert!(!t.dated);
        assert_eq!(t.terms[0].billable.len(), 1);
        assert!(t.terms[1].billable.is_empty());
        assert_eq!(t.terms[2].code, "C");
        assert_eq!(t.terms[2].status, "trial");
    }
}
