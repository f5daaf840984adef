//! The one table of commands and flags. The parser (`args::parse`) asks it
//! which flags a command takes and how each stores its value, `main` which
//! function runs a command; `help()` writes the usage lines and the flag
//! list from it, so the two cannot drift apart.

use super::*;

/// A command: its name, what follows it, the formats it writes and what it does.
pub(crate) struct Command {
    pub(crate) name: &'static str,
    /// What follows the name before the flags, as the usage line writes it.
    pub(crate) operands: &'static str,
    /// The values `--format` takes with this command; the first is the default.
    pub(crate) formats: &'static [&'static str],
    /// Whether `--format` also takes the exports (`rollcall::export::FORMATS`).
    pub(crate) exports: bool,
    pub(crate) summary: &'static str,
    /// What it does with the arguments and the format asked for.
    pub(crate) run: fn(&Args, &str) -> Result<ExitCode, String>,
}

/// How a flag is written beside the one above it in the table, on a usage
/// line of a command taking both.
#[derive(Clone, Copy, PartialEq, Eq)]
pub(crate) enum Join {
    /// In brackets of its own.
    Alone,
    /// In the same brackets, as the other choice: `[--on DATE | --from DATE`.
    Or,
    /// In the same brackets, given with it: `--from DATE --to DATE]`.
    With,
}

/// A flag: its name, the placeholder of its value (none for a switch), the
/// commands taking it, how it stores its value and its help line.
pub(crate) struct Flag {
    pub(crate) name: &'static str,
    /// `FORMAT` stands for the command's formats.
    pub(crate) value: Option<&'static str>,
    pub(crate) commands: &'static [&'static str],
    pub(crate) join: Join,
    /// The commands taking it need it.
    pub(crate) required: bool,
    pub(crate) help: &'static str,
    /// Stores the value (`""` for a switch) in the arguments.
    pub(crate) set: fn(&mut Args, &str) -> Result<(), Usage>,
}

pub(crate) static COMMANDS: &[Command] = &[
    Command {
        name: "check",
        operands: "FILE|-",
        formats: &["text", "json", "csv"],
        exports: true,
        summary: "checks one list or draft against the release in force on the day or over the \
                  study period: each code's status and dates, headers, retired codes and what \
                  replaces them, near codes for unknown ones, labels that do not fit; or hands \
                  the list on as one of the exports (EXPORT)",
        run: check::run,
    },
    Command {
        name: "compare",
        operands: "A B",
        formats: &["text", "json", "csv"],
        exports: false,
        summary: "checks both lists, then compares the billable codes each reaches in the \
                  period; --format csv writes one row per code only one list reaches",
        run: compare::run,
    },
    Command {
        name: "translate",
        operands: "FILE|-",
        formats: &["text", "json", "csv"],
        exports: false,
        summary: "maps an ICD-9-CM list to ICD-10-CM, or back, with the 2015 GEMs, and judges \
                  each target for the period; the first list's system is the other one",
        run: translate::run,
    },
    Command {
        name: "info",
        operands: "",
        formats: &["text", "json"],
        exports: false,
        summary: "the indexes at hand (the bundled ones, or the --index file): release, \
                  coverage, path, size, checksum and source files, and the systems checked by \
                  shape only",
        run: info::run,
    },
    Command {
        name: "find",
        operands: "WORDS...|CODE [WORDS...]",
        formats: &["text", "json"],
        exports: false,
        summary: "codes whose descriptions fit the words (misspellings and abbreviations such \
                  as DM, HTN, w/o allowed); a code or code start first (E11.6) lists that node \
                  and what lies under it, and narrows the words after it to that part of the \
                  tree (E11.6 foot)",
        run: find::run,
    },
    Command {
        name: "show",
        operands: "CODE...",
        formats: &["text", "json"],
        exports: false,
        summary: "a card per code, node or code start: status and timeline across the \
                  releases, chapter, section and ancestors, children and siblings in force on \
                  the day (the last day of a period), the tabular list's notes, successors, \
                  predecessors and GEM mappings; an unknown code gets the check's suggestions",
        run: show::run,
    },
];

/// The flags, in the order usage lines write them.
pub(crate) static FLAGS: &[Flag] = &[
    Flag {
        name: "--into",
        value: Some("icd10cm|icd9cm"),
        commands: &["translate"],
        join: Join::Alone,
        required: true,
        help: "the system translate maps the list into (from the other one)",
        set: |a, v| {
            a.into = Some(v.into());
            Ok(())
        },
    },
    Flag {
        name: "--on",
        value: Some("DATE"),
        commands: &["check", "compare", "translate", "show"],
        join: Join::Alone,
        required: false,
        help: "a single reference date (default: today, or the nearest day the index covers: \
               the ICD-9-CM index is checked on 2015-09-30)",
        set: |a, v| {
            a.on = Some(date("--on", v)?);
            Ok(())
        },
    },
    Flag {
        name: "--from",
        value: Some("DATE"),
        commands: &["check", "compare", "translate", "show"],
        join: Join::Or,
        required: false,
        help: "the first day of the study period, given with --to (both days included)",
        set: |a, v| {
            a.from = Some(date("--from", v)?);
            Ok(())
        },
    },
    Flag {
        name: "--to",
        value: Some("DATE"),
        commands: &["check", "compare", "translate", "show"],
        join: Join::With,
        required: false,
        help: "the last day of the study period, given with --from",
        set: |a, v| {
            a.to = Some(date("--to", v)?);
            Ok(())
        },
    },
    Flag {
        name: "--billable",
        value: None,
        commands: &["check", "compare", "translate"],
        join: Join::Alone,
        required: false,
        help: "headers (non-billable codes) are errors",
        set: |a, _| {
            a.billable = true;
            Ok(())
        },
    },
    Flag {
        name: "--date",
        value: Some("DATE"),
        commands: &["find"],
        join: Join::Alone,
        required: false,
        help: "find prefers codes in use that day (default: today)",
        set: |a, v| {
            a.date = Some(date("--date", v)?);
            Ok(())
        },
    },
    Flag {
        name: "--limit",
        value: Some("N"),
        commands: &["find"],
        join: Join::Alone,
        required: false,
        help: "how many codes find lists, 1 to 1000 (default 10)",
        set: |a, v| {
            let n = v.parse().ok().filter(|n| (1..=1000).contains(n));
            a.limit = Some(n.ok_or_else(|| {
                Usage(format!("--limit must be a number from 1 to 1000, not {v}"))
            })?);
            Ok(())
        },
    },
    Flag {
        name: "--format",
        value: Some("FORMAT"),
        commands: &["check", "compare", "translate", "info", "find", "show"],
        join: Join::Alone,
        required: false,
        help: "how the answer is written: the formats on the command's usage line, the first \
               the default",
        set: |a, v| {
            a.format = Some(v.into());
            Ok(())
        },
    },
    Flag {
        name: "--system",
        value: Some("NAME"),
        commands: &["check", "compare", "show"],
        join: Join::Alone,
        required: false,
        help: "icd10cm (default), icd10pcs, icd9cm or hpo: the bundled index of that system; \
               loinc, snomed, ndc, hcpcs, cpt or rxnorm: checks by shape and check digit only. \
               A CSV/TSV list may have a system column (see FILE): --system and --index set \
               the system of the rows whose cell is empty",
        set: |a, v| {
            a.system = Some(v.into());
            Ok(())
        },
    },
    Flag {
        name: "--index",
        value: Some("PATH"),
        commands: &["check", "compare", "info", "find", "show"],
        join: Join::Or,
        required: false,
        help: "an index file written by vocab-build (default: the bundled ICD-10-CM index)",
        set: |a, v| {
            a.index = Some(v.into());
            Ok(())
        },
    },
    Flag {
        name: "--read",
        value: Some("lines|table|text|json|workbook"),
        commands: &["check"],
        join: Join::Alone,
        required: false,
        help: "how to read the list when the guess is wrong: lines (one code per line), \
               table (CSV/TSV), text (a draft), json, workbook",
        set: |a, v| {
            a.reading = Reading::parse(v).ok_or_else(|| {
                Usage(format!(
                    "--read {v} is not a reading; use one of {}",
                    Reading::FORCED.map(|r| r.name()).join(", ")
                ))
            })?;
            Ok(())
        },
    },
    Flag {
        name: "--valueset-url",
        value: Some("URL"),
        commands: &["check"],
        join: Join::Alone,
        required: false,
        help: "with --format fhir: the ValueSet's canonical url (default: a placeholder)",
        set: |a, v| {
            a.valueset_url = Some(v.into());
            Ok(())
        },
    },
    Flag {
        name: "--notes",
        value: Some("PATH"),
        commands: &["show"],
        join: Join::Alone,
        required: false,
        help: "the notes file vocab-build wrote beside an --index (NAME-notes.rcx; the \
               bundled ICD-10-CM notes are built in)",
        set: |a, v| {
            a.notes = Some(v.into());
            Ok(())
        },
    },
];

/// The placeholders of the usage lines, explained.
static VALUES: &[(&str, &str)] = &[
    (
        "FILE",
        "any list or draft: plain lines (code, then an optional label), CSV or TSV with a \
         code column, markdown, prose, SQL/R/Python literals, JSON or a FHIR resource, a \
         spreadsheet workbook (.xlsx, .xls, .ods); several codes on a line are each checked; \
         - reads standard input. A CSV/TSV list may have a system column (headed system, code \
         system, coding system or vocabulary; values such as icd10pcs, ICD-10-PCS, LOINC or a \
         FHIR system URI): its rows are checked in that system, the bundled index loaded when \
         the column names one",
    ),
    (
        "EXPORT",
        "what check hands on, entries with error-level findings left out and named: \
         cleaned-csv (each usable code once), fhir (a FHIR R4 ValueSet; its url is \
         --valueset-url, default a placeholder), codes-csv, codes-sql, codes-r, codes-python \
         (every billable code the list reaches in the period, headers and patterns expanded, \
         with its billable dates in codes-csv)",
    ),
];

const TITLE: &str = "\
rollcall: check a clinical code list against dated releases (ICD-10-CM by default; ICD-10-PCS,
ICD-9-CM and HPO bundled; other systems by shape, or by an index a site builds)
";

const FOOTER: &str = "\
exit status: 0 no errors found (compare: and both lists reach the same codes),
             1 error-level findings (compare: or the lists differ), 2 usage or input error.
rollcall helps assemble research code lists; it is not coding or billing advice.
Official coding guidelines and local policy prevail.
";

/// The widest a help line is written.
const WIDTH: usize = 96;

/// The command named `name`.
pub(crate) fn command(name: &str) -> Option<&'static Command> {
    COMMANDS.iter().find(|c| c.name == name)
}

/// The flag named `name`.
pub(crate) fn flag(name: &str) -> Option<&'static Flag> {
    FLAGS.iter().find(|f| f.name == name)
}

/// The flags `command` takes, in table order.
pub(crate) fn flags_of(command: &str) -> impl Iterator<Item = &'static Flag> + '_ {
    FLAGS.iter().filter(move |f| f.commands.contains(&command))
}

/// Names as a sentence: `a, b or c` (`join` is "or" or "and").
pub(crate) fn sentence<S: AsRef<str>>(names: &[S], join: &str) -> String {
    match names {
        [] => String::new(),
        [one] => one.as_ref().to_string(),
        [rest @ .., last] => format!(
            "{} {join} {}",
            rest.iter()
                .map(AsRef::as_ref)
                .collect::<Vec<_>>()
                .join(", "),
            last.as_ref()
        ),
    }
}

/// Every command's name, as a sentence.
pub(crate) fn command_names() -> String {
    let names: Vec<&str> = COMMANDS.iter().map(|c| c.name).collect();
    sentence(&names, "and")
}

/// The flags `command` takes, as a sentence.
pub(crate) fn flag_names(command: &str) -> String {
    let names: Vec<&str> = flags_of(command).map(|f| f.name).collect();
    sentence(&names, "and")
}

/// The value placeholder `flag` has on the usage line of `command`.
fn placeholder(command: &Command, flag: &Flag) -> Option<String> {
    flag.value.map(|v| match v {
        "FORMAT" if command.exports => format!("{}|EXPORT", command.formats.join("|")),
        "FORMAT" => command.formats.join("|"),
        v => v.to_string(),
    })
}

/// A date given to `flag`.
fn date(flag: &str, v: &str) -> Result<Date, Usage> {
    Date::parse(v).map_err(|e| Usage(format!("{flag}: {e}")))
}

/// The usage line of a command: its operands, then its flags in brackets,
/// the ones written together sharing them.
pub(crate) fn usage(command: &Command) -> String {
    let mut groups: Vec<(String, bool)> = Vec::new();
    let mut above_taken = false;
    for f in FLAGS {
        let takes = f.commands.contains(&command.name);
        if takes {
            let item = match placeholder(command, f) {
                Some(v) => format!("{} {v}", f.name),
                None => f.name.to_string(),
            };
            match (f.join, above_taken, groups.last_mut()) {
                (Join::Or, true, Some((g, _))) => *g = format!("{g} | {item}"),
                (Join::With, true, Some((g, _))) => *g = format!("{g} {item}"),
                _ => groups.push((item, f.required)),
            }
        }
        above_taken = takes;
    }
    let mut units: Vec<String> = command
        .operands
        .split_whitespace()
        .map(String::from)
        .collect();
    units.extend(groups.into_iter().map(|(g, required)| match required {
        true => g,
        false => format!("[{g}]"),
    }));
    let mut out = String::new();
    wrap(
        &mut out,
        &format!("  rollcall {}", command.name),
        24,
        false,
        units,
    );
    out
}

/// Writes `lead`, then the units a space apart, across lines of at most
/// `WIDTH`, each new line indented by `indent`. A padded lead (a help
/// entry) puts the first unit at the indent too, or on the next line when
/// the lead is wider.
fn wrap(out: &mut String, lead: &str, indent: usize, pad: bool, units: Vec<String>) {
    let mut line = lead.to_string();
    let n = lead.chars().count();
    if pad && n < indent {
        line.push_str(&" ".repeat(indent - n));
    } else if pad {
        out.push_str(lead);
        out.push('\n');
        line = " ".repeat(indent);
    } else {
        line.push(' ');
    }
    let mut empty = true;
    for unit in units {
        if !empty && line.chars().count() + 1 + unit.chars().count() > WIDTH {
            out.push_str(&line);
            out.push('\n');
            line = " ".repeat(indent);
            empty = true;
        }
        if !empty {
            line.push(' ');
        }
        line.push_str(&unit);
        empty = false;
    }
    out.push_str(line.trim_end());
    out.push('\n');
}

fn words(text: &str) -> Vec<String> {
    text.split_whitespace().map(String::from).collect()
}

/// The help text, written from the tables.
pub(crate) fn help() -> String {
    let mut s = String::from(TITLE);
    s.push_str("\nusage:\n");
    for c in COMMANDS {
        s.push_str(&usage(c));
    }
    s.push_str("  rollcall --help | --version\n\ncommands:\n");
    for c in COMMANDS {
        wrap(&mut s, &format!("  {}", c.name), 13, true, words(c.summary));
    }
    s.push_str("\nvalues:\n");
    for (name, text) in VALUES {
        wrap(&mut s, &format!("  {name}"), 13, true, words(text));
    }
    s.push_str("\nflags:\n");
    for f in FLAGS {
        let lead = match f.value {
            Some(v) => format!("  {} {v}", f.name),
            None => format!("  {}", f.name),
        };
        let takers: Vec<&str> = f.commands.to_vec();
        let mut text = words(f.help);
        if takers.len() < COMMANDS.len() {
            text.push(format!("[{}]", takers.join(", ")));
        }
        wrap(&mut s, &lead, 22, true, text);
    }
    s.push('\n');
    s.push_str(FOOTER);
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    fn argv(words: &[&str]) -> Vec<String> {
        words.iter().map(|w| w.to_string()).collect()
    }

    /// A value each placeholder takes: the first of a choice, a date, a number.
    fn sample(command: &Command, flag: &Flag) -> Option<String> {
        placeholder(command, flag).map(|v| match v.as_str() {
            "DATE" => "2024-01-01".to_string(),
            "N" => "5".to_string(),
            v => v.split('|').next().unwrap_or(v).to_string(),
        })
    }

    #[test]
    fn every_flag_is_taken_by_each_command_it_names() {
        for f in FLAGS {
            for name in f.commands {
                let c = command(name).expect("a command of the table");
                let mut words = vec![c.name.to_string(), f.name.to_string()];
                words.extend(sample(c, f));
                if f.name != "--into" {
                    words.extend(
                        flags_of(c.name)
                            .filter(|r| r.required)
                            .flat_map(|r| [r.name.to_string(), sample(c, r).unwrap_or_default()]),
                    );
                }
                assert!(parse(&words).is_ok(), "{words:?} is refused");
            }
        }
    }

    #[test]
    fn every_flag_and_command_is_in_the_help() {
        let h = help();
        for c in COMMANDS {
            assert!(h.contains(&format!("rollcall {}", c.name)), "{}", c.name);
            assert!(
                h.contains(&format!("\n  {:<10} ", c.name)),
                "{} summary",
                c.name
            );
        }
        for f in FLAGS {
            assert!(h.contains(&format!("\n  {}", f.name)), "{} listed", f.name);
            for name in f.commands {
                let line = usage(command(name).unwrap());
                assert!(line.contains(f.name), "{} on the usage of {name}", f.name);
            }
        }
        // The EXPORT placeholder names every export, and --system every system.
        for e in rollcall::export::FORMATS {
            assert!(h.contains(e), "{e}");
        }
        for s in rollcall::systems::ALL {
            assert!(h.contains(s.name()), "{}", s.name());
        }
        assert!(h.lines().all(|l| l.chars().count() <= WIDTH), "{h}");
    }

    /// The --read placeholder is the core's list of readings, in its order.
    #[test]
    fn the_read_placeholder_is_the_cores_readings() {
        let names = Reading::FORCED.map(|r| r.name()).join("|");
        assert_eq!(flag("--read").unwrap().value, Some(names.as_str()));
    }

    #[test]
    fn usage_lines_join_the_choices() {
        let check = usage(command("check").unwrap());
        assert!(
            check.contains("[--on DATE | --from DATE --to DATE]"),
            "{check}"
        );
        assert!(check.contains("[--system NAME | --index PATH]"), "{check}");
        assert!(check.contains("[--format text|json|csv|EXPORT]"), "{check}");
        let find = usage(command("find").unwrap());
        assert!(find.contains("[--format text|json]"), "{find}");
        assert!(
            find.contains("[--index PATH]") && !find.contains("--system"),
            "{find}"
        );
        let translate = usage(command("translate").unwrap());
        assert!(
            translate.contains(" --into icd10cm|icd9cm [--on"),
            "{translate}"
        );
    }

    /// A flag or a command is named once.
    #[test]
    fn names_are_unique() {
        for (i, f) in FLAGS.iter().enumerate() {
            assert!(FLAGS[..i].iter().all(|g| g.name != f.name), "{}", f.name);
        }
        for (i, c) in COMMANDS.iter().enumerate() {
            assert!(COMMANDS[..i].iter().all(|d| d.name != c.name), "{}", c.name);
        }
    }

    #[test]
    fn an_unknown_command_names_every_command() {
        let Err(Usage(m)) = parse(&argv(&["frobnicate"])) else {
            panic!("an unknown command is refused")
        };
        for c in COMMANDS {
            assert!(m.contains(c.name), "{m}");
        }
        assert!(
            m.contains("check, compare, translate, info, find and show"),
            "{m}"
        );
    }

    #[test]
    fn an_unknown_flag_names_the_command_and_its_flags() {
        let Err(Usage(m)) = parse(&argv(&["info", "--colour"])) else {
            panic!("an unknown flag is refused")
        };
        assert!(m.contains("--colour") && m.contains("info"), "{m}");
        assert!(m.contains("--format and --index"), "{m}");
    }

    #[test]
    fn a_flag_of_another_command_names_the_commands_taking_it() {
        let Err(Usage(m)) = parse(&argv(&["check", "-", "--notes", "n.rcx"])) else {
            panic!("--notes is refused by check")
        };
        assert!(
            m.starts_with("--notes goes with show, not with check"),
            "{m}"
        );
        assert!(m.contains(&flag_names("check")), "{m}");
    }

    #[test]
    fn values_are_stored_and_checked() {
        let a = parse(&argv(&[
            "check",
            "x.tsv",
            "--from",
            "2020-01-01",
            "--to",
            "2020-12-31",
            "--billable",
            "--read",
            "table",
        ]))
        .unwrap_or_else(|Usage(m)| panic!("{m}"));
        assert_eq!(a.command, "check");
        assert_eq!(a.files, ["x.tsv"]);
        assert_eq!(a.from, Some(Date::parse("2020-01-01").unwrap()));
        assert!(a.billable);
        assert_eq!(a.reading, Reading::Table);
        let refused = |w: &[&str]| match parse(&argv(w)) {
            Err(Usage(m)) => m,
            Ok(_) => panic!("{w:?} is taken"),
        };
        assert!(refused(&["check", "-", "--on"]).contains("--on needs a value"));
        assert!(refused(&["check", "-", "--on", "2026-13-01"]).starts_with("--on: "));
        assert!(refused(&["find", "x", "--limit", "0"]).contains("from 1 to 1000"));
        assert!(refused(&["check", "-", "--read", "xml"]).contains("lines, table"));
        assert!(refused(&["show", "E11", "--format", "csv"]).contains("text or json"));
        assert!(refused(&["translate", "-"]).contains("--into"));
        let exports = refused(&["check", "-", "--format", "xml"]);
        assert!(exports.contains("fhir"), "{exports}");
    }
}
