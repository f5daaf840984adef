//! The arguments of vocab-build: release files, each named by the flag of
//! its format (`readers::FORMATS`), and the options below. The parser and
//! the help both read the two lists.

use crate::assemble::{self, Vocabulary};
use crate::formats::{Builds, Format, Given, Options, Takes};
use crate::readers::{self, FORMATS};
use rollcall::{Date, Period};
use std::path::PathBuf;

/// What the command line asks for.
#[derive(Default)]
pub struct Parsed {
    /// The release files, in the order given.
    pub files: Vec<Given>,
    /// Where to write the index.
    pub out: Option<PathBuf>,
    /// The hierarchy of a dated release.
    pub vocabulary: Vocabulary,
    pub options: Options,
    /// Print the help instead.
    pub help: bool,
    /// The options given, by name.
    given: Vec<&'static str>,
}

/// An option besides the release files.
pub struct Opt {
    pub name: &'static str,
    pub value: &'static str,
    pub help: &'static str,
    set: fn(&mut Parsed, String) -> Result<(), String>,
}

/// The vocabularies a dated release can be built as (`--vocabulary`).
const VOCABULARIES: [Vocabulary; 3] = [assemble::ICD10CM, assemble::ICD10PCS, assemble::ICD9CM];

/// The options. `--out` goes with every build, `--vocabulary` with the
/// files of a dated release, the others with the formats of a release of
/// its own that name them (`Builds::Own::options`).
pub static OPTIONS: &[Opt] = &[
    Opt {
        name: "--out",
        value: "PATH",
        help: "the index file to write, and its notes file beside it (default: vocab/ID.rcx \
               for the files of a dated release, ID the --vocabulary; vocab/hpo.rcx for --hpo)",
        set: |p, v| {
            p.out = Some(v.into());
            Ok(())
        },
    },
    Opt {
        name: "--vocabulary",
        value: "icd10cm|icd10pcs|icd9cm",
        help: "the hierarchy of a dated release: icd10cm (default) from its tabular and order \
               files; icd10pcs with no dots, every prefix of a code a node above it (to the \
               body part); icd9cm by categories and subcategories",
        set: |p, v| {
            p.vocabulary = VOCABULARIES
                .into_iter()
                .find(|x| x.id == v)
                .ok_or_else(|| {
                    let ids: Vec<&str> = VOCABULARIES.iter().map(|x| x.id).collect();
                    format!(
                        "--vocabulary {v} is not known; use {}",
                        sentence(&ids, "or")
                    )
                })?;
            Ok(())
        },
    },
    Opt {
        name: "--loinc-map-to",
        value: "FILE",
        help: "the LOINC map-to file (MapTo.csv): replacements of deprecated terms",
        set: |p, v| {
            p.options.map_to = Some(v.into());
            Ok(())
        },
    },
    Opt {
        name: "--release",
        value: "TAG",
        help: "the release tag shown in reports (default: the release date)",
        set: |p, v| {
            p.options.release = Some(v);
            Ok(())
        },
    },
    Opt {
        name: "--release-date",
        value: "DAY",
        help: "the release's day, YYYY-MM-DD (required for imports)",
        set: |p, v| {
            p.options.day = Some(v);
            Ok(())
        },
    },
    Opt {
        name: "--id",
        value: "ID",
        help: "the vocabulary id of a --table import (e.g. local-labs)",
        set: |p, v| {
            p.options.id = Some(v);
            Ok(())
        },
    },
    Opt {
        name: "--title",
        value: "TITLE",
        help: "the vocabulary's name, for a --table import",
        set: |p, v| {
            p.options.title = Some(v);
            Ok(())
        },
    },
];

/// Names as a sentence: `a, b or c`.
fn sentence(names: &[&str], join: &str) -> String {
    match names {
        [] => String::new(),
        [one] => one.to_string(),
        [rest @ .., last] => format!("{} {join} {last}", rest.join(", ")),
    }
}

fn option(name: &str) -> Option<&'static Opt> {
    OPTIONS.iter().find(|o| o.name == name)
}

/// `FROM..TO`, both days included.
pub fn period(s: &str) -> Result<Period, String> {
    let (a, b) = s.split_once("..").ok_or_else(|| {
        format!("\"{s}\" is not a period; write FROM..TO, e.g. 2025-10-01..2026-09-30")
    })?;
    let (a, b) = (
        Date::parse(a).map_err(|e| e.to_string())?,
        Date::parse(b).map_err(|e| e.to_string())?,
    );
    if b < a {
        return Err(format!("period {s} ends before it starts"));
    }
    Ok(Period::new(a, b))
}

/// Reads the command line, and checks that the options fit the files.
pub fn parse(args: &[String]) -> Result<Parsed, String> {
    let mut p = Parsed::default();
    let mut it = args.iter();
    while let Some(a) = it.next() {
        if a == "-h" || a == "--help" {
            p.help = true;
            return Ok(p);
        }
        let mut value = || {
            it.next()
                .cloned()
                .ok_or_else(|| format!("{a} needs a value"))
        };
        if let Some(format) = readers::format(a) {
            let v = value()?;
            let (path, period) = match format.takes {
                Takes::File | Takes::Dir => (PathBuf::from(v), None),
                Takes::Dated => {
                    let (f, d) = v.rsplit_once('@').ok_or_else(|| {
                        format!("{a} takes FILE@FROM..TO, e.g. order.txt@2024-10-01..2025-09-30")
                    })?;
                    (PathBuf::from(f), Some(period(d)?))
                }
            };
            p.files.push(Given {
                format,
                path,
                period,
            });
        } else if let Some(o) = option(a) {
            (o.set)(&mut p, value()?)?;
            p.given.push(o.name);
        } else {
            let flags: Vec<&str> = FORMATS.iter().map(|f| f.flag).collect();
            return Err(format!(
                "unknown argument \"{a}\"; the release formats are {}; see vocab-build --help",
                sentence(&flags, "and")
            ));
        }
    }
    fits(&p)?;
    Ok(p)
}

/// The formats an option goes with, as a sentence.
fn goes_with(name: &str) -> String {
    if name == "--vocabulary" {
        let parts: Vec<&str> = FORMATS
            .iter()
            .filter(|f| !f.is_own())
            .map(|f| f.flag)
            .collect();
        return format!("the files of a dated release ({})", sentence(&parts, "and"));
    }
    let own: Vec<&str> = FORMATS
        .iter()
        .filter(|f| takes_option(f, name))
        .map(|f| f.flag)
        .collect();
    sentence(&own, "or")
}

fn takes_option(f: &Format, name: &str) -> bool {
    match &f.builds {
        Builds::Own { options, .. } => options.iter().any(|(o, _)| *o == name),
        Builds::Part { .. } => name == "--vocabulary",
    }
}

/// Whether the options fit the files: a release of its own comes alone,
/// with the options its format takes and needs.
fn fits(p: &Parsed) -> Result<(), String> {
    let own = p.files.iter().find(|g| g.format.is_own()).map(|g| g.format);
    if let Some(f) = own {
        if p.files.len() > 1 {
            return Err(format!(
                "{} builds an index of its own; give it without other files",
                f.flag
            ));
        }
    }
    for name in p.given.iter().filter(|n| **n != "--out") {
        let fits = match own {
            Some(f) => takes_option(f, name),
            None => *name == "--vocabulary",
        };
        if !fits {
            return Err(format!("{name} goes with {}", goes_with(name)));
        }
    }
    if let Some(Format {
        flag,
        builds: Builds::Own {
            options,
            default_out,
            ..
        },
        ..
    }) = own
    {
        let missing = options
            .iter()
            .find(|(n, needed)| *needed && !p.given.contains(n));
        if let Some((name, _)) = missing {
            let value = option(name).map_or("", |o| o.value);
            return Err(format!("{flag} needs {name} {value}"));
        }
        if default_out.is_none() && p.out.is_none() {
            return Err(format!("{flag} needs --out PATH, the index file to write"));
        }
    }
    Ok(())
}

/// The widest a help line is written, and where help texts start.
const WIDTH: usize = 96;
const COLUMN: usize = 31;

/// Writes `lead` and `text` on lines of at most `WIDTH`, the text from `COLUMN`.
fn entry(out: &mut String, lead: &str, text: &str) {
    let mut line = format!("{lead:<width$}", width = COLUMN - 1);
    if lead.chars().count() >= COLUMN - 1 {
        out.push_str(lead);
        out.push('\n');
        line = " ".repeat(COLUMN - 1);
    }
    for word in text.split_whitespace() {
        if line.chars().count() + 1 + word.chars().count() > WIDTH && !line.trim().is_empty() {
            out.push_str(line.trim_end());
            out.push('\n');
            line = " ".repeat(COLUMN - 1);
        }
        line.push(' ');
        line.push_str(word);
    }
    out.push_str(line.trim_end());
    out.push('\n');
}

/// The usage line of a release of its own.
fn own_usage(f: &Format) -> String {
    let mut s = format!("  vocab-build {} {}", f.flag, f.takes.placeholder());
    if let Builds::Own {
        options,
        default_out,
        ..
    } = &f.builds
    {
        for (name, needed) in *options {
            let value = option(name).map_or("", |o| o.value);
            s.push_str(&match needed {
                true => format!(" {name} {value}"),
                false => format!(" [{name} {value}]"),
            });
        }
        s.push_str(match default_out {
            Some(_) => " [--out PATH]",
            None => " --out PATH",
        });
    }
    s.push('\n');
    s
}

/// The help text, written from the formats and the options.
pub fn help() -> String {
    let mut s =
        String::from("vocab-build: write a rollcall index from official release files\n\nusage:\n");
    entry(
        &mut s,
        "  vocab-build",
        &format!(
            "build the bundled indexes (vocab-build/sources -> vocab/{}, and \
             icd10cm-notes.rcx, the tabular notes)",
            crate::recipes::OUTS.join(", ")
        ),
    );
    s.push_str(&format!(
        "  vocab-build [--vocabulary {}] [FILES...] [--out PATH]\n",
        option("--vocabulary").map_or("", |o| o.value)
    ));
    for f in FORMATS.iter().filter(|f| f.is_own()) {
        s.push_str(&own_usage(f));
    }
    s.push_str(
        "\nFILES, the files of a dated release (plain or .gz; PERIOD is FROM..TO in YYYY-MM-DD,\n\
         the days the file was in force):\n",
    );
    for f in FORMATS.iter().filter(|f| !f.is_own()) {
        entry(
            &mut s,
            &format!("  {} {}", f.flag, f.takes.placeholder()),
            f.reads,
        );
    }
    s.push_str(
        "\nreleases that state their own hierarchy, each an index of its own (LOINC, RxNorm and\n\
         the plain table are imports of releases a site is licensed for):\n",
    );
    for f in FORMATS.iter().filter(|f| f.is_own()) {
        entry(
            &mut s,
            &format!("  {} {}", f.flag, f.takes.placeholder()),
            f.reads,
        );
    }
    s.push_str("\noptions:\n");
    for o in OPTIONS {
        entry(&mut s, &format!("  {} {}", o.name, o.value), o.help);
    }
    s.push_str(
        "\nWithout --history, billable dates come from the order and code files' periods.\n\
         The notes of the newest --tabular go to a notes file beside the index (PATH's name\n\
         with -notes: icd10cm-notes.rcx for icd10cm.rcx), which pairs with that index only.\n",
    );
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    fn args(words: &[&str]) -> Vec<String> {
        words.iter().map(|w| w.to_string()).collect()
    }

    fn refused(words: &[&str]) -> String {
        match parse(&args(words)) {
            Err(m) => m,
            Ok(_) => panic!("{words:?} is taken"),
        }
    }

    #[test]
    fn every_format_and_option_is_in_the_help() {
        let h = help();
        for f in FORMATS {
            assert!(
                h.contains(&format!("\n  {} {}", f.flag, f.takes.placeholder())),
                "{}",
                f.flag
            );
        }
        for o in OPTIONS {
            assert!(
                h.contains(&format!("\n  {} {}", o.name, o.value)),
                "{}",
                o.name
            );
        }
        assert!(h.lines().all(|l| l.chars().count() <= WIDTH), "{h}");
    }

    #[test]
    fn every_format_flag_is_parsed_into_its_format() {
        for f in FORMATS {
            let value = match f.takes {
                Takes::Dated => "f.txt@2024-10-01..2025-09-30",
                _ => "f.txt",
            };
            let mut words = vec![f.flag, value];
            if let Builds::Own { options, .. } = &f.builds {
                for (name, needed) in *options {
                    if *needed {
                        words.extend([*name, "2025-01-01"]);
                    }
                }
                words.extend(["--out", "x.rcx"]);
            }
            let p = parse(&args(&words)).unwrap_or_else(|m| panic!("{words:?}: {m}"));
            assert_eq!(p.files.len(), 1);
            assert_eq!(p.files[0].format.flag, f.flag);
            assert_eq!(p.files[0].period.is_some(), f.takes == Takes::Dated);
        }
    }

    /// A flag names one format or one option, never two.
    #[test]
    fn flags_are_unique() {
        let mut names: Vec<&str> = FORMATS.iter().map(|f| f.flag).collect();
        names.extend(OPTIONS.iter().map(|o| o.name));
        let n = names.len();
        names.sort();
        names.dedup();
        assert_eq!(names.len(), n);
    }

    /// Every option a format names is in the option list.
    #[test]
    fn the_options_a_format_names_exist() {
        for f in FORMATS {
            if let Builds::Own { options, .. } = &f.builds {
                for (name, _) in *options {
                    assert!(option(name).is_some(), "{} names {name}", f.flag);
                }
            }
        }
    }

    #[test]
    fn the_vocabulary_placeholder_names_each_vocabulary() {
        let ids: Vec<&str> = VOCABULARIES.iter().map(|v| v.id).collect();
        assert_eq!(option("--vocabulary").unwrap().value, ids.join("|"));
        let p = parse(&args(&["--vocabulary", "icd9cm"])).unwrap();
        assert_eq!(p.vocabulary, assemble::ICD9CM);
        assert!(refused(&["--vocabulary", "icd11"]).contains("icd10cm, icd10pcs or icd9cm"));
    }

    #[test]
    fn options_that_do_not_fit_the_files_are_refused() {
        assert_eq!(
            refused(&[
                "--codes",
                "c.txt@2024-10-01..2025-09-30",
                "--loinc-map-to",
                "m.csv"
            ]),
            "--loinc-map-to goes with --loinc"
        );
        assert_eq!(
            refused(&["--release", "x"]),
            "--release goes with --loinc, --rxnorm or --table"
        );
        assert!(refused(&["--hpo", "h.obo", "--history", "h.tsv"])
            .starts_with("--hpo builds an index of its own"));
        assert_eq!(
            refused(&[
                "--loinc",
                "l.csv",
                "--release-date",
                "2025-01-01",
                "--id",
                "x"
            ]),
            "--id goes with --table"
        );
        assert!(refused(&["--rxnorm", "rrf", "--out", "r.rcx"]).contains("--release-date"));
        assert!(refused(&[
            "--table",
            "t.tsv",
            "--release-date",
            "2025-01-01",
            "--id",
            "a",
            "--title",
            "A"
        ])
        .contains("--out PATH"));
        assert!(refused(&["--order", "o.txt"]).contains("FILE@FROM..TO"));
        assert!(refused(&["--order", "o.txt@2025-01-01..2024-01-01"]).contains("ends before"));
        assert!(refused(&["--frobnicate"]).contains("--history, --tabular"));
        assert!(parse(&args(&["--hpo", "h.obo"])).is_ok());
    }
}
