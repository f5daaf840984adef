//! Reading an RxNorm release (Rich Release Format, pipe-delimited): the
//! names and term types of `RXNCONSO.RRF`, and the retired and remapped
//! concepts of `RXNCUI.RRF`, into one term per RXCUI.
//!
//! Layouts, from memory of the RxNorm technical documentation:
//! `RXNCONSO.RRF` has 18 fields, RXCUI|LAT|TS|LUI|STT|SUI|ISPREF|RXAUI|SAUI|
//! SCUI|SDUI|SAB|TTY|CODE|STR|SRL|SUPPRESS|CVF|, and `RXNCUI.RRF` five,
//! CUI1|VER_START|VER_END|CARDINALITY|CUI2| (CUI2 is the concept CUI1 was
//! remapped to, or CUI1 itself when it was simply retired). Each line ends
//! with a `|`.

use crate::error::BuildError;
use crate::stated::Term;
use rollcall::{Date, Period};
use std::collections::{BTreeMap, HashSet};
use crate::formats::{Builds, Format, Options, Own, Takes};
use crate::provenance::load;
use crate::stated;
use std::path::Path;

/// Term types in the order their name is preferred as a concept's
/// description (an order of our own: clinical and branded drugs and packs
/// first, then their components and forms, then ingredients, brands and
/// dose forms, then the prescribable name and synonyms; from memory of the
/// RxNorm term types). Other term types follow, by name.
pub const TTY_ORDER: [&str; 22] = [
    "SCD", "SBD", "GPCK", "BPCK", "SCDG", "SBDG", "SCDC", "SBDC", "SCDF", "SBDF", "SCDFP", "SBDFP",
    "SCDGP", "IN", "PIN", "MIN", "BN", "DF", "DFG", "PSN", "SY", "TMSY",
];

/// The status word of a concept all of whose names are suppressed
/// (SUPPRESS other than N): it stays in use, and a check warns.
pub const SUPPRESSED: &str = "SUPPRESSED";

/// What the release held.
pub struct Concepts {
    /// One term per RXCUI, retired ones included.
    pub terms: Vec<Term>,
    /// Names read (SAB=RXNORM rows).
    pub names: usize,
    /// Concepts whose names are all suppressed.
    pub suppressed: usize,
    /// Retired concepts, and how many of them name a successor.
    pub retired: usize,
    /// How many of the retired have a successor.
    pub remapped: usize,
    /// RXNCUI rows naming a concept RXNCONSO still has (kept in use).
    pub still_current: usize,
    /// RXNCUI remap targets that are no concept of the release (left out).
    pub unknown_targets: usize,
}

/// The fields of one RRF line, or an error naming the line.
fn fields<'a>(
    name: &str,
    n: usize,
    line: &'a str,
    want: usize,
) -> Result<Vec<&'a str>, BuildError> {
    let f: Vec<&str> = line.split('|').collect();
    if f.len() != want + 1 || !f[want].is_empty() {
        return Err(BuildError::at(
            name,
            n,
            format!(
                "has {} fields; an RRF line of this file has {want}, each followed by |; use the file as released",
                f.len().saturating_sub(1)
            ),
        ));
    }
    Ok(f)
}

fn rxcui<'a>(name: &str, n: usize, what: &str, v: &'a str) -> Result<&'a str, BuildError> {
    if v.is_empty() || v.len() > 32 || !v.bytes().all(|b| b.is_ascii_digit()) {
        return Err(BuildError::at(
            name,
            n,
            format!("{what} \"{v}\" is not an RXCUI (digits only); use the file as released"),
        ));
    }
    Ok(v)
}

fn rank(tty: &str) -> (usize, String) {
    let i = TTY_ORDER
        .iter()
        .position(|t| *t == tty)
        .unwrap_or(TTY_ORDER.len());
    (i, tty.to_string())
}

/// Reads `RXNCONSO.RRF`, and `RXNCUI.RRF` when given, as of the release `day`.
pub fn read(
    conso: (&str, &str),
    cui: Option<(&str, &str)>,
    day: Date,
) -> Result<Concepts, BuildError> {
    let (name, text) = conso;
    // RXCUI -> (first line, names as (suppressed, rank, name, tty)).
    type Names = (usize, Vec<(bool, (usize, String), String, String)>);
    let mut by_cui: BTreeMap<String, Names> = BTreeMap::new();
    let mut names = 0;
    for (i, raw) in text.lines().enumerate() {
        let n = i + 1;
        let line = raw.trim_end_matches('\r');
        if line.is_empty() {
            continue;
        }
        let f = fields(name, n, line, 18)?;
        if f[11] != "RXNORM" {
            continue;
        }
        let c = rxcui(name, n, "RXCUI", f[0])?;
        let (tty, str_, suppress) = (f[12], f[14].trim(), f[16]);
        if str_.is_empty() {
            return Err(BuildError::at(
                name,
                n,
                format!("the name (STR) of {c} is empty; use the file as released"),
            ));
        }
        let e = by_cui.entry(c.to_string()).or_insert((n, Vec::new()));
        e.1.push((
            suppress != "N" && !suppress.is_empty(),
            rank(tty),
            str_.to_string(),
            tty.to_string(),
        ));
        names += 1;
    }
    let mut suppressed = 0;
    let mut terms: Vec<Term> = by_cui
        .into_iter()
        .map(|(code, (line, mut ns))| {
            ns.sort();
            let all_suppressed = ns.iter().all(|n| n.0);
            let (_, _, best, tty) = &ns[0];
            let description = format!("{best} [{tty}]");
            let mut synonyms: Vec<String> = ns[1..]
                .iter()
                .map(|n| n.2.clone())
                .filter(|s| s != best)
                .collect();
            synonyms.sort();
            synonyms.dedup();
            let mut t = Term {
                code,
                description,
                synonyms,
                billable: vec![Period::new(day, day)],
                at: (name.to_string(), line),
                ..Term::default()
            };
            if all_suppressed {
                t.status = SUPPRESSED.to_string();
                suppressed += 1;
            }
            t
        })
        .collect();
    let (mut retired, mut remapped, mut still_current, mut unknown_targets) = (0, 0, 0, 0);
    if let Some((cname, ctext)) = cui {
        let current: HashSet<String> = terms.iter().map(|t| t.code.clone()).collect();
        // CUI1 -> (first line, remap targets).
        let mut gone: BTreeMap<String, (usize, Vec<String>)> = BTreeMap::new();
        for (i, raw) in ctext.lines().enumerate() {
            let n = i + 1;
            let line = raw.trim_end_matches('\r');
            if line.is_empty() {
                continue;
            }
            let f = fields(cname, n, line, 5)?;
            let a = rxcui(cname, n, "CUI1", f[0])?;
            let b = rxcui(cname, n, "CUI2", f[4])?;
            if current.contains(a) {
                // The concept is in RXNCONSO of the same release: it is in
                // use, whatever an older retirement row says.
                still_current += 1;
                continue;
            }
            let e = gone.entry(a.to_string()).or_insert((n, Vec::new()));
            if a != b {
                e.1.push(b.to_string());
            }
        }
        let known: HashSet<String> = current
            .iter()
            .cloned()
            .chain(gone.keys().cloned())
            .collect();
        for (code, (line, mut to)) in gone {
            let before = to.len();
            to.retain(|b| known.contains(b));
            unknown_targets += before - to.len();
            to.sort();
            to.dedup();
            retired += 1;
            remapped += usize::from(!to.is_empty());
            terms.push(Term {
                description: format!("retired RXCUI {code} (no name in this release)"),
                code,
                replaced_by: to,
                at: (cname.to_string(), line),
                ..Term::default()
            });
        }
    }
    Ok(Concepts {
        terms,
        names,
        suppressed,
        retired,
        remapped,
        still_current,
        unknown_targets,
    })
}

/// `--rxnorm DIR`: an RxNorm release a site holds, an index of its own.
pub const FORMAT: Format = Format {
    flag: "--rxnorm",
    takes: Takes::Dir,
    reads: "an RxNorm release's rrf/ folder: RXNCONSO.RRF (SAB=RXNORM names), RXNCUI.RRF when \
            present (retired and remapped RXCUIs)",
    builds: Builds::Own {
        options: &[("--release-date", true), ("--release", false)],
        default_out: None,
        read: read_release,
    },
};

fn read_release(dir: &Path, o: &Options, _: Option<&str>) -> Result<Own, String> {
    let e = |e: BuildError| e.to_string();
    let (day, release) = o.release()?;
    let conso = load(
        &dir.join("RXNCONSO.RRF"),
        "concept names and term types",
        None,
    )
    .map_err(e)?;
    let cui_path = dir.join("RXNCUI.RRF");
    let cui = if cui_path.exists() {
        Some(load(&cui_path, "retired and remapped concepts", None).map_err(e)?)
    } else {
        eprintln!(
            "note: {} is not there; no retired concepts",
            cui_path.display()
        );
        None
    };
    let c = read(
        (&conso.name, &conso.text),
        cui.as_ref().map(|c| (c.name.as_str(), c.text.as_str())),
        day,
    )
    .map_err(e)?;
    eprintln!(
        "read {}: {} RXNORM names, {} concepts in use ({} with every name suppressed)",
        conso.name,
        c.names,
        c.terms.len() - c.retired,
        c.suppressed
    );
    if cui.is_some() {
        eprintln!(
            "read RXNCUI.RRF: {} retired concepts, {} remapped; {} rows name a concept still in RXNCONSO (kept in use); {} remap targets are no concept of the release (left out)",
            c.retired, c.remapped, c.still_current, c.unknown_targets
        );
    }
    let mut sources = vec![conso.source];
    sources.extend(cui.map(|c| c.source));
    let about = stated::About {
        id: "rxnorm".into(),
        title: "RxNorm".into(),
        release,
        day,
        notice: String::new(),
        sources,
    };
    Ok(Own {
        about,
        terms: c.terms,
    })
}

#[cfg(test)]
mod tests {
    use super::read;
    use rollcall::Date;

    fn day() -> Date {
        Date::parse("2025-01-06").unwrap()
    }

    const GOOD: &str = "99000001|ENG||||||99100001||||RXNORM|IN|99000001|quellamine||N|4096|\n";

    /// Each malformed line is refused with its line (line 2).
    #[test]
    fn every_bad_line_names_its_line() {
        for (line, says) in [
            (
                "99000002|ENG||||||99100002||||RXNORM|SCD|99000002|x||N|",
                "fields",
            ),
            (
                "99000002|ENG||||||99100002||||RXNORM|SCD|99000002|x||N|4096|extra",
                "fields",
            ),
            (
                "RX2|ENG||||||99100002||||RXNORM|SCD|RX2|x||N|4096|",
                "RXCUI",
            ),
            (
                "99000002|ENG||||||99100002||||RXNORM|SCD|99000002|||N|4096|",
                "STR",
            ),
        ] {
            let text = format!("{GOOD}{line}\n");
            let e = read(("RXNCONSO.RRF", &text), None, day())
                .err()
                .expect(line);
            assert_eq!(e.line, Some(2), "{line}: {e}");
            assert!(e.message.contains(says), "{line}: {e}");
        }
        for (line, says) in [("99000010|a|b|1|", "fields"), ("99000010|a|b|1|x|", "CUI2")] {
            let text = format!("99000011|a|b|1|99000011|\n{line}\n");
            let e = read(("RXNCONSO.RRF", GOOD), Some(("RXNCUI.RRF", &text)), day())
                .err()
                .expect(line);
            assert_eq!((e.file.as_str(), e.line), ("RXNCUI.RRF", Some(2)), "{e}");
            assert!(e.message.contains(says), "{line}: {e}");
        }
    }

    /// A retired concept that RXNCONSO still lists stays in use and is
    /// counted; a remap to no concept of the release is left out and counted.
    #[test]
    fn rows_not_used_are_counted() {
        let cui = "99000001|a|b|1|99000001|\n99000009|a|b|1|99000123|\n";
        let c = read(("RXNCONSO.RRF", GOOD), Some(("RXNCUI.RRF", cui)), day()).unwrap();
        assert_eq!(
            (c.still_current, c.unknown_targets, c.retired, c.remapped),
            (1, 1, 1, 0)
        );
        assert_eq!(c.terms.len(), 2);
    }
}
