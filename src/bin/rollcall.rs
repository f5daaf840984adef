//! The rollcall command line: argument parsing, output and exit status only;
//! all checking is in the library.
//!
//! Exit status: 0 no error-level finding, 1 error-level findings, 2 usage or
//! input error.

use rollcall::list::{Draft, Reading};
use rollcall::mixed::{check_listed_draft, systems_named_in, Primary};
use rollcall::systems::System;
use rollcall::{render, CheckOptions, Date, Index, View};
use std::io::Read;
use std::process::ExitCode;

/// The bundled indexes, built by vocab-build from vocab-build/sources, with
/// the name `info` shows; the first is the default. Adding one is a line
/// here (and its system's `System::bundled`).
static BUNDLED_INDEXES: &[(System, &[u8], &str)] = &[
    (
        System::Icd10cm,
        include_bytes!("../../vocab/icd10cm.rcx"),
        "vocab/icd10cm.rcx (built into this binary)",
    ),
    (
        System::Icd10pcs,
        include_bytes!("../../vocab/icd10pcs.rcx"),
        "vocab/icd10pcs.rcx (built into this binary)",
    ),
    (
        System::Icd9cm,
        include_bytes!("../../vocab/icd9cm.rcx"),
        "vocab/icd9cm.rcx (built into this binary)",
    ),
    (
        System::Hpo,
        include_bytes!("../../vocab/hpo.rcx"),
        "vocab/hpo.rcx (built into this binary)",
    ),
];
static BUNDLED: &[u8] = BUNDLED_INDEXES[0].1;

/// The bundled notes files (the tabular list's notes, for `show`), each
/// written by vocab-build with the bundled index of its system (the file
/// `System::notes_file` names).
static BUNDLED_NOTES: &[(System, &[u8])] = &[(
    System::Icd10cm,
    include_bytes!("../../vocab/icd10cm-notes.rcx"),
)];

/// Adds the notes of `path` (`--notes`) to the index, or else the bundled
/// notes of its system when they were written for it (the bundled index,
/// or the same file given with `--index`).
fn add_notes(index: &mut Index<&'static [u8]>, path: Option<&str>) -> Result<(), String> {
    use rollcall::NotesFile;
    if let Some(p) = path {
        let bytes = std::fs::read(p).map_err(|e| format!("cannot read the notes {p}: {e}"))?;
        let bytes: &'static [u8] = Box::leak(bytes.into_boxed_slice());
        let notes = NotesFile::open(bytes).map_err(|e| format!("{p}: {e}"))?;
        notes.verify().map_err(|e| format!("{p}: {e}"))?;
        return index.add_notes(notes).map_err(|e| format!("{p}: {e}"));
    }
    let system = System::parse(&index.meta().vocabulary);
    let bundled = BUNDLED_NOTES.iter().find(|(s, _)| Some(*s) == system);
    if let Some((_, bytes)) = bundled {
        let notes = NotesFile::open(*bytes).map_err(|e| e.to_string())?;
        if notes.pairs_with(index).is_ok() {
            index.add_notes(notes).map_err(|e| e.to_string())?;
        }
    }
    Ok(())
}

/// The bundled index of `system`, opened (a header check; no copy).
fn bundled(system: System) -> Option<Result<Index<&'static [u8]>, String>> {
    BUNDLED_INDEXES
        .iter()
        .find(|(s, _, _)| *s == system)
        .map(|(_, bytes, _)| Index::open(*bytes).map_err(|e| e.to_string()))
}

const HELP: &str = "\
rollcall: check a clinical code list against dated releases (ICD-10-CM by default; ICD-10-PCS,
ICD-9-CM and HPO bundled; other systems by shape, or by an index a site builds)

usage:
  rollcall check FILE|- [--on DATE | --from DATE --to DATE] [--billable]
                        [--format text|json|csv|EXPORT] [--system NAME | --index PATH]
                        [--read lines|table|text|json|workbook] [--valueset-url URL]
  rollcall compare A B [--on DATE | --from DATE --to DATE] [--billable]
                        [--format text|json|csv] [--system NAME | --index PATH]
  rollcall translate FILE|- --into icd10cm|icd9cm [--on DATE | --from DATE --to DATE]
                        [--format text|json|csv]
  rollcall info [--format text|json] [--index PATH]
  rollcall find WORDS...|CODE [WORDS...] [--date DATE] [--limit N] [--format text|json]
                        [--index PATH]
  rollcall show CODE... [--on DATE | --from DATE --to DATE] [--system NAME | --index PATH]
                        [--notes PATH] [--format text|json]

  FILE       any list or draft: plain lines (code, then an optional label), CSV or TSV
             with a code column, markdown, prose, SQL/R/Python literals, JSON or a FHIR
             resource, a spreadsheet workbook (.xlsx, .xls, .ods); several codes on a
             line are each checked; - reads standard input
  --read     how to read the list when the guess is wrong: lines (one code per line),
             table (CSV/TSV), text (a draft), json, workbook
  --on       a single reference date (default: today, or the nearest day the index
             covers: the ICD-9-CM index is checked on 2015-09-30)
  --from/--to  the study period, both days included
  --billable   headers (non-billable codes) are errors
  --system   icd10cm (default), icd10pcs, icd9cm or hpo: the bundled index of that system;
             loinc, snomed, ndc, hcpcs, cpt or rxnorm: checks by shape and check digit only
  --index    an index file written by vocab-build (default: the bundled ICD-10-CM index)
             A CSV/TSV list may have a system column (headed system, code system, coding
             system or vocabulary; values such as icd10pcs, ICD-10-PCS, LOINC or a FHIR
             system URI): its rows are checked in that system, the bundled index loaded
             when the column names one; --system and --index set the system of the rows
             whose cell is empty.
  EXPORT     what check hands on, entries with error-level findings left out and named:
             cleaned-csv (each usable code once), fhir (a FHIR R4 ValueSet; its url is
             --valueset-url, default a placeholder), codes-csv, codes-sql, codes-r,
             codes-python (every billable code the list reaches in the period, headers
             and patterns expanded, with its billable dates in codes-csv)
  translate  maps an ICD-9-CM list to ICD-10-CM, or back, with the 2015 GEMs, and judges each
             target for the period; the first list's system is the other one
  compare    checks both lists, then compares the billable codes each reaches in the
             period; --format csv writes one row per code only one list reaches
  find       codes whose descriptions fit the words (misspellings and abbreviations
             such as DM, HTN, w/o allowed); --date: prefer codes in use that day
             (default: today), --limit: how many (default 10); a code or code start
             first (E11.6) lists that node and what lies under it, and narrows the
             words after it to that part of the tree (E11.6 foot)
  show       a card per code, node or code start: status and timeline across the
             releases, chapter, section and ancestors, children and siblings in force
             on the day (the last day of a period), the tabular list's notes, successors,
             predecessors and GEM mappings; an unknown code gets the check's suggestions;
             --notes: the notes file vocab-build wrote beside an --index (NAME-notes.rcx;
             the bundled ICD-10-CM notes are built in)

exit status: 0 no errors found (compare: and both lists reach the same codes),
             1 error-level findings (compare: or the lists differ), 2 usage or input error.
rollcall helps assemble research code lists; it is not coding or billing advice.
Official coding guidelines and local policy prevail.
";

struct Usage(String);

fn today() -> Date {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs())
        .unwrap_or(0);
    Date::from_days((secs / 86_400) as i32)
}

#[derive(Default)]
struct Args {
    command: String,
    files: Vec<String>,
    on: Option<Date>,
    from: Option<Date>,
    to: Option<Date>,
    billable: bool,
    format: Option<String>,
    index: Option<String>,
    /// show: a notes file for the index.
    notes: Option<String>,
    system: Option<String>,
    /// translate: the target system.
    into: Option<String>,
    /// check --format fhir: the ValueSet's canonical URL.
    valueset_url: Option<String>,
    /// How to read the list.
    reading: Reading,
}

fn parse(argv: &[String]) -> Result<Args, Usage> {
    let mut a = Args::default();
    let mut it = argv.iter();
    a.command = it.next().cloned().ok_or_else(|| {
        Usage("a command is needed: check, compare, translate, info, find or show".into())
    })?;
    while let Some(arg) = it.next() {
        let mut value = || {
            it.next()
                .cloned()
                .ok_or_else(|| Usage(format!("{arg} needs a value")))
        };
        let date = |v: String| Date::parse(&v).map_err(|e| Usage(format!("{arg}: {e}")));
        match arg.as_str() {
            "--on" => a.on = Some(date(value()?)?),
            "--from" => a.from = Some(date(value()?)?),
            "--to" => a.to = Some(date(value()?)?),
            "--billable" => a.billable = true,
            "--format" => a.format = Some(value()?),
            "--index" => a.index = Some(value()?),
            "--notes" => a.notes = Some(value()?),
            "--system" => a.system = Some(value()?),
            "--into" => a.into = Some(value()?),
            "--valueset-url" => a.valueset_url = Some(value()?),
            "--read" => {
                let v = value()?;
                a.reading = Reading::parse(&v).ok_or_else(|| {
                    Usage(format!(
                        "--read {v} is not a reading; use one of {}",
                        Reading::FORCED.map(|r| r.name()).join(", ")
                    ))
                })?;
            }
            s if s.starts_with("--") => return Err(Usage(format!("unknown option {s}"))),
            s => a.files.push(s.to_string()),
        }
    }
    Ok(a)
}

/// The check options asked for; with no day or period, the default day of
/// the index checked against (`Meta::default_day`), today for a shape check.
fn options(a: &Args, default_day: Date) -> Result<CheckOptions, Usage> {
    match (a.on, a.from, a.to) {
        (Some(_), Some(_), _) | (Some(_), _, Some(_)) => Err(Usage(
            "give either --on DATE or --from DATE --to DATE, not both".into(),
        )),
        (Some(d), None, None) => Ok(CheckOptions::on(d, a.billable)),
        (None, Some(f), Some(t)) if t < f => Err(Usage(format!("--to {t} is before --from {f}"))),
        (None, Some(f), Some(t)) => Ok(CheckOptions {
            from: f,
            to: t,
            billable: a.billable,
        }),
        (None, Some(_), None) | (None, None, Some(_)) => {
            Err(Usage("a study period needs both --from and --to".into()))
        }
        (None, None, None) => Ok(CheckOptions::on(default_day, a.billable)),
    }
}

enum Loaded {
    Bundled(Index<&'static [u8]>),
    /// An index file; its bytes live as long as the process, like the
    /// bundled ones, so both can be checked side by side.
    File(Index<&'static [u8]>, String),
}

impl Loaded {
    fn index(&self) -> &Index<&'static [u8]> {
        match self {
            Loaded::Bundled(i) | Loaded::File(i, _) => i,
        }
    }

    fn index_mut(&mut self) -> &mut Index<&'static [u8]> {
        match self {
            Loaded::Bundled(i) | Loaded::File(i, _) => i,
        }
    }
}

/// What a list is checked against: an index, or a system's shape rules.
#[allow(clippy::large_enum_variant)] // one value per run
enum Target {
    Index(Loaded),
    Shapes(System),
}

type Opened = std::sync::OnceLock<Result<Index<&'static [u8]>, String>>;

/// A bundled index, opened once into `cell`.
fn opened(cell: &'static Opened, system: System) -> Result<&'static Index<&'static [u8]>, String> {
    cell.get_or_init(|| {
        bundled(system).unwrap_or_else(|| Err(format!("{} is not bundled", system.name())))
    })
    .as_ref()
    .map_err(|e| e.clone())
}

/// The bundled ICD-9-CM index, opened once.
fn icd9() -> Result<&'static Index<&'static [u8]>, String> {
    static ONCE: Opened = std::sync::OnceLock::new();
    opened(&ONCE, System::Icd9cm)
}

/// The bundled indexes a check of `text` needs beside its own vocabulary
/// `own`: every one the list's system column names, and ICD-9-CM (with the
/// GEMs) beside ICD-10-CM and the reverse, so a code of the other system
/// is named with its GEM targets.
fn at_hand(own: &str, draft: &Draft) -> Result<Vec<Index<&'static [u8]>>, String> {
    let mut want = systems_named_in(draft);
    // Each of the two with the GEMs beside the other (both directions are
    // kept in the ICD-9-CM index).
    match own {
        "icd10cm" => want.push(System::Icd9cm),
        "icd9cm" => want.push(System::Icd10cm),
        _ => {}
    }
    want.sort();
    want.dedup();
    want.into_iter()
        .filter(|s| s.name() != own)
        .filter_map(bundled)
        .collect()
}

/// Checks a list: the rows with no system cell against the target, the
/// others in the system their cell names.
fn check_draft(
    target: &Target,
    draft: &Draft,
    opts: &CheckOptions,
) -> Result<rollcall::Report, String> {
    let (primary, own) = match target {
        Target::Index(l) => (
            Primary::Index(l.index()),
            l.index().meta().vocabulary.clone(),
        ),
        Target::Shapes(s) => (Primary::Shapes(*s), s.name().to_string()),
    };
    let others = at_hand(&own, draft)?;
    let refs: Vec<&Index<&'static [u8]>> = others.iter().collect();
    Ok(check_listed_draft(primary, &refs, draft, opts).0)
}

/// Other indexes at hand for a check: ICD-9-CM (with the GEMs) beside an
/// ICD-10-CM list, so old codes in a new list are named with their targets.
fn companions<D: AsRef<[u8]>>(i: &Index<D>) -> Result<Vec<View<'static>>, String> {
    Ok(match i.meta().vocabulary.as_str() {
        "icd10cm" => vec![icd9()?.view()],
        // And the other way: an ICD-10-CM code in an ICD-9-CM list is named
        // with its backward GEM targets.
        "icd9cm" => vec![icd10cm()?.view()],
        _ => Vec::new(),
    })
}

/// The bundled ICD-10-CM index, opened once.
fn icd10cm() -> Result<&'static Index<&'static [u8]>, String> {
    static ONCE: Opened = std::sync::OnceLock::new();
    opened(&ONCE, System::Icd10cm)
}

/// The day checked when none is given: the index's own default (inside its
/// coverage), or today for a check by shape.
fn default_day(target: &Target) -> Date {
    match target {
        Target::Index(l) => {
            let meta = l.index().meta();
            let day = meta.default_day(today());
            if meta.default_day_moved(today()) && !meta.snapshot() {
                eprintln!(
                    "rollcall: no date given; the {} index covers {} to {}, so the list is checked on {day}",
                    meta.title, meta.coverage_from, meta.coverage_to
                );
            }
            day
        }
        Target::Shapes(_) => today(),
    }
}

/// One of the exports of `rollcall::export` for a checked list.
fn export_text(
    format: &str,
    target: &Target,
    report: &rollcall::Report,
    draft: &Draft,
    opts: &CheckOptions,
    url: Option<&str>,
) -> Result<String, String> {
    let meta = rollcall::export::ValueSetMeta {
        url: url.unwrap_or(rollcall::export::PLACEHOLDER_URL).to_string(),
        date: today(),
    };
    match target {
        Target::Index(l) => {
            let index = l.index();
            let reach = if format.starts_with("codes-") {
                rollcall::check::check_draft_with_reach(index, &companions(index)?, draft, opts).1
            } else {
                Vec::new()
            };
            let view = index.view();
            let src = rollcall::export::Source {
                report,
                reach: &reach,
                view: Some(&view),
                meta,
            };
            rollcall::export::export(format, &src).map(|e| e.text)
        }
        Target::Shapes(_) => {
            let src = rollcall::export::Source {
                report,
                reach: &[],
                view: None,
                meta,
            };
            rollcall::export::export(format, &src).map(|e| e.text)
        }
    }
}

fn target(a: &Args) -> Result<Target, String> {
    let system = match a.system.as_deref() {
        None => None,
        Some(n) => Some(System::parse(n).ok_or_else(|| {
            format!(
                "--system {n} is not known; the names are {}",
                rollcall::systems::ALL.map(|s| s.name()).join(", ")
            )
        })?),
    };
    match (system, a.index.as_deref()) {
        (None, path) => load_index(path).map(Target::Index),
        (Some(s), Some(path)) => {
            let loaded = load_index(Some(path))?;
            let i = loaded.index();
            if i.meta().vocabulary != s.name() {
                return Err(format!(
                    "{path} is an {} index, not {}; drop --system or give an index of that system",
                    i.meta().vocabulary,
                    s.name()
                ));
            }
            Ok(Target::Index(loaded))
        }
        (Some(s), None) => match bundled(s) {
            Some(i) => i.map(|i| Target::Index(Loaded::Bundled(i))),
            None => Ok(Target::Shapes(s)),
        },
    }
}

fn load_index(path: Option<&str>) -> Result<Loaded, String> {
    match path {
        None => Index::open(BUNDLED)
            .map(Loaded::Bundled)
            .map_err(|e| e.to_string()),
        Some(p) => {
            let bytes = std::fs::read(p).map_err(|e| format!("cannot read the index {p}: {e}"))?;
            let bytes: &'static [u8] = Box::leak(bytes.into_boxed_slice());
            let idx = Index::open(bytes).map_err(|e| format!("{p}: {e}"))?;
            idx.verify().map_err(|e| format!("{p}: {e}"))?;
            Ok(Loaded::File(idx, p.to_string()))
        }
    }
}

fn run(argv: &[String]) -> Result<ExitCode, String> {
    if argv.is_empty() || argv.iter().any(|a| a == "-h" || a == "--help") {
        print!("{HELP}");
        return Ok(ExitCode::SUCCESS);
    }
    if argv[0] == "--version" {
        println!("rollcall {}", env!("CARGO_PKG_VERSION"));
        return Ok(ExitCode::SUCCESS);
    }
    if argv[0] == "find" {
        return find_command(&argv[1..]).map_err(|Usage(m)| format!("{m}\n(see rollcall --help)"));
    }
    let a = parse(argv).map_err(|Usage(m)| format!("{m}\n(see rollcall --help)"))?;
    let format = a.format.clone().unwrap_or_else(|| "text".into());
    if a.notes.is_some() && a.command != "show" {
        return Err(format!(
            "--notes goes with show (the notes are for code cards), not with {}",
            a.command
        ));
    }
    match a.command.as_str() {
        "check" => {
            let export = rollcall::export::FORMATS.contains(&format.as_str());
            if !matches!(format.as_str(), "text" | "json" | "csv") && !export {
                return Err(format!(
                    "--format must be text, json, csv or one of the exports ({}), not {format}",
                    rollcall::export::FORMATS.join(", ")
                ));
            }
            if a.valueset_url.is_some() && format != "fhir" {
                return Err("--valueset-url goes with --format fhir".into());
            }
            let target = target(&a)?;
            let opts = options(&a, default_day(&target)).map_err(|Usage(m)| m)?;
            let file = match a.files.as_slice() {
                [one] => one.as_str(),
                [] => return Err("check needs a list: a FILE, or - for standard input".into()),
                [_, second, ..] => {
                    return Err(format!(
                        "only one list can be checked at a time (got a second: {second}); to set two lists side by side use rollcall compare A B"
                    ))
                }
            };
            let draft = read_draft(file, a.reading)?;
            let report = check_draft(&target, &draft, &opts)?;
            let out = match format.as_str() {
                "json" => serde_json::to_string_pretty(&report).map_err(|e| e.to_string())? + "\n",
                "csv" => render::csv(&report),
                f if export => export_text(f, &target, &report, &draft, &opts, a.valueset_url.as_deref())?,
                _ => render::text(&report),
            };
            write_out(&out);
            let status = if report.has_errors() {
                ExitCode::from(1)
            } else {
                ExitCode::SUCCESS
            };
            // The process ends here; freeing thousands of small strings first
            // would only cost time (about a tenth of a run on a large list).
            std::mem::forget(report);
            std::mem::forget(out);
            std::mem::forget(draft);
            Ok(status)
        }
        "compare" => {
            if !matches!(format.as_str(), "text" | "json" | "csv") {
                return Err(format!("--format must be text, json or csv, not {format}"));
            }
            let target = target(&a)?;
            let opts = options(&a, default_day(&target)).map_err(|Usage(m)| m)?;
            let [fa, fb] = a.files.as_slice() else {
                return Err(format!(
                    "compare needs two lists, A and B (got {}); - reads one of them from standard input",
                    a.files.len()
                ));
            };
            if fa == "-" && fb == "-" {
                return Err("only one of the two lists can come from standard input".into());
            }
            let (ta, tb) = (read_list(fa)?, read_list(fb)?);
            let c = match target {
                Target::Index(l) => {
                    let i = l.index();
                    rollcall::compare::compare_among(i, &companions(i)?, (fa, &ta), (fb, &tb), &opts)
                }
                Target::Shapes(s) => {
                    return Err(format!(
                        "compare needs the content of the system; rollcall has no {} index (bundled: icd10cm, icd10pcs)",
                        s.title()
                    ))
                }
            };
            let out = match format.as_str() {
                "json" => serde_json::to_string_pretty(&c).map_err(|e| e.to_string())? + "\n",
                "csv" => render::comparison_csv(&c),
                _ => render::comparison_text(&c),
            };
            write_out(&out);
            let clean = c.same_codes() && !c.a.report.has_errors() && !c.b.report.has_errors();
            Ok(if clean {
                ExitCode::SUCCESS
            } else {
                ExitCode::from(1)
            })
        }
        "translate" => {
            if !matches!(format.as_str(), "text" | "json" | "csv") {
                return Err(format!("--format must be text, json or csv, not {format}"));
            }
            let [file] = a.files.as_slice() else {
                return Err("translate needs one list: a FILE, or - for standard input".into());
            };
            let text = read_list(file)?;
            let cm = Index::open(BUNDLED).map_err(|e| e.to_string())?;
            // Targets are judged for the period: the default day is the target index's.
            let day = match a.into.as_deref() {
                Some("icd9cm") => icd9()?.meta().default_day(today()),
                _ => cm.meta().default_day(today()),
            };
            let opts = options(&a, day).map_err(|Usage(m)| m)?;
            let t = match a.into.as_deref() {
                Some("icd10cm") => rollcall::translate::translate(icd9()?, &cm, &text, &opts)?,
                Some("icd9cm") => rollcall::translate::translate(&cm, icd9()?, &text, &opts)?,
                Some(other) => {
                    return Err(format!(
                        "translate --into {other}: the bundled mappings go to icd10cm (from ICD-9-CM) or to icd9cm (from ICD-10-CM)"
                    ))
                }
                None => return Err("translate needs --into icd10cm or --into icd9cm".into()),
            };
            let out = match format.as_str() {
                "json" => serde_json::to_string_pretty(&t).map_err(|e| e.to_string())? + "\n",
                "csv" => render::translation_csv(&t),
                _ => render::translation_text(&t),
            };
            write_out(&out);
            Ok(ExitCode::SUCCESS)
        }
        "info" => {
            if !a.files.is_empty()
                || a.on.is_some()
                || a.from.is_some()
                || a.to.is_some()
                || a.billable
            {
                return Err("info takes only --format and --index".into());
            }
            let loaded: Vec<Loaded> = match a.index.as_deref() {
                Some(p) => vec![load_index(Some(p))?],
                None => BUNDLED_INDEXES
                    .iter()
                    .map(|(_, bytes, _)| {
                        Index::open(*bytes)
                            .map(Loaded::Bundled)
                            .map_err(|e| e.to_string())
                    })
                    .collect::<Result<_, _>>()?,
            };
            let described: Vec<_> = loaded
                .iter()
                .map(|l| match l {
                    Loaded::Bundled(i) => (
                        i.meta(),
                        BUNDLED_INDEXES
                            .iter()
                            .find(|(s, _, _)| s.name() == i.meta().vocabulary)
                            .map_or(String::new(), |(_, _, name)| name.to_string()),
                        i.bytes().len(),
                        i.checksum(),
                    ),
                    Loaded::File(i, p) => (i.meta(), p.clone(), i.bytes().len(), i.checksum()),
                })
                .collect();
            let out = match format.as_str() {
                "json" => {
                    let list: Vec<serde_json::Value> = described
                        .iter()
                        .map(|(meta, path, size, sum)| {
                            serde_json::json!({
                                "vocabulary": meta.vocabulary,
                                "title": meta.title,
                                "release": meta.release,
                                "coverage_from": meta.coverage_from,
                                "coverage_to": meta.coverage_to,
                                "sources": meta.sources,
                                "notice": meta.notice,
                                "path": path,
                                "bytes": size,
                                "sha256": sum,
                            })
                        })
                        .collect();
                    let v = serde_json::json!({ "indexes": list });
                    serde_json::to_string_pretty(&v).map_err(|e| e.to_string())? + "\n"
                }
                "text" => {
                    let mut s = String::new();
                    for (meta, path, size, sum) in &described {
                        s.push_str(&format!(
                            "{} ({}) release {}, coverage {} to {}\n  path: {path}\n  size: {size} bytes\n  checksum (SHA-256): {sum}\n  sources:\n",
                            meta.title, meta.vocabulary, meta.release, meta.coverage_from, meta.coverage_to
                        ));
                        for src in &meta.sources {
                            s.push_str(&format!(
                                "    {}  {}\n      sha256 {}\n",
                                src.file, src.role, src.sha256
                            ));
                        }
                        if !meta.notice.is_empty() {
                            s.push_str(&format!("  notice: {}\n", meta.notice));
                        }
                    }
                    s.push_str("checked by shape and check digit only (no content bundled): loinc, snomed, ndc, hcpcs, cpt, rxnorm\n");
                    s
                }
                f => return Err(format!("--format must be text or json for info, not {f}")),
            };
            write_out(&out);
            Ok(ExitCode::SUCCESS)
        }
        "show" => {
            if !matches!(format.as_str(), "text" | "json") {
                return Err(format!(
                    "--format must be text or json for show, not {format}"
                ));
            }
            if a.billable || a.into.is_some() {
                return Err("show takes codes, --on or --from/--to, --system, --index, --notes and --format".into());
            }
            if a.files.is_empty() {
                return Err("show needs one or more codes, e.g. rollcall show E11.6".into());
            }
            let target = target(&a)?;
            let opts = options(&a, default_day(&target)).map_err(|Usage(m)| m)?;
            let codes: Vec<&str> = a.files.iter().map(String::as_str).collect();
            let cards = match target {
                Target::Index(mut l) => {
                    add_notes(l.index_mut(), a.notes.as_deref())?;
                    let i = l.index();
                    rollcall::card::cards(i, &companions(i)?, &codes, &opts)
                }
                Target::Shapes(s) => {
                    return Err(format!(
                        "show needs the content of the system; rollcall has no {} index (bundled: icd10cm, icd10pcs, icd9cm, hpo)",
                        s.title()
                    ))
                }
            };
            let out = match format.as_str() {
                "json" => serde_json::to_string_pretty(&cards).map_err(|e| e.to_string())? + "\n",
                _ => render::cards_text(&cards),
            };
            write_out(&out);
            let known = cards.cards.iter().all(|c| c.problem.is_none());
            Ok(if known {
                ExitCode::SUCCESS
            } else {
                ExitCode::from(1)
            })
        }
        other => Err(format!(
            "unknown command \"{other}\"; the commands are check, compare, translate, info, find and show (see rollcall --help)"
        )),
    }
}

/// A list from a file, or from standard input for `-`, as text.
fn read_raw(file: &str) -> Result<Vec<u8>, String> {
    let mut raw = Vec::new();
    if file == "-" {
        std::io::stdin()
            .read_to_end(&mut raw)
            .map_err(|e| format!("cannot read standard input: {e}"))?;
    } else {
        raw = std::fs::read(file).map_err(|e| format!("cannot read {file}: {e}"))?;
    }
    Ok(raw)
}

/// A list's text (compare and translate read text lists).
fn read_list(file: &str) -> Result<String, String> {
    let raw = read_raw(file)?;
    if rollcall::list::is_workbook(&raw) {
        return Err(format!(
            "{file} is a spreadsheet workbook; this command reads text lists, so save the sheet as CSV (CSV UTF-8), or check the workbook with rollcall check"
        ));
    }
    rollcall::list::decode(&raw).map_err(|e| format!("{file}: {e}"))
}

/// A list read as `reading` says (a workbook, or text in any form).
fn read_draft(file: &str, reading: Reading) -> Result<Draft, String> {
    let raw = read_raw(file)?;
    rollcall::list::read_bytes(&raw, reading).map_err(|e| format!("{file}: {e}"))
}

/// `rollcall find WORDS...`: codes for words, best first.
fn find_command(argv: &[String]) -> Result<ExitCode, Usage> {
    let mut words = Vec::new();
    let (mut day, mut limit, mut format, mut index) = (None, 10usize, "text".to_string(), None);
    let mut it = argv.iter();
    while let Some(arg) = it.next() {
        let mut value = || {
            it.next()
                .cloned()
                .ok_or_else(|| Usage(format!("{arg} needs a value")))
        };
        match arg.as_str() {
            "--date" => {
                day = Some(Date::parse(&value()?).map_err(|e| Usage(format!("--date: {e}")))?)
            }
            "--limit" => {
                let v = value()?;
                limit = v
                    .parse()
                    .ok()
                    .filter(|n| (1..=1000).contains(n))
                    .ok_or_else(|| {
                        Usage(format!("--limit must be a number from 1 to 1000, not {v}"))
                    })?;
            }
            "--format" => format = value()?,
            "--index" => index = Some(value()?),
            s if s.starts_with("--") => return Err(Usage(format!("unknown option {s} for find"))),
            s => words.push(s.to_string()),
        }
    }
    if !matches!(format.as_str(), "text" | "json") {
        return Err(Usage(format!(
            "--format must be text or json for find, not {format}"
        )));
    }
    let query = words.join(" ");
    if rollcall::words::words(&query).is_empty() {
        return Err(Usage(
            "find needs words to look for, e.g. rollcall find type 2 diabetes".into(),
        ));
    }
    let day = day.unwrap_or_else(today);
    let loaded = load_index(index.as_deref()).map_err(Usage)?;
    let finds = rollcall::find::find(&loaded.index().view(), &query, day, limit, true);
    let found = &finds.results;
    let out = if format == "json" {
        let v = serde_json::json!({
            "query": query,
            "date": day,
            "within": finds.within,
            "no_code": finds.no_code,
            "results": found,
        });
        serde_json::to_string_pretty(&v).map_err(|e| Usage(e.to_string()))? + "\n"
    } else if let Some(start) = &finds.no_code {
        format!("no code starts with {start}; check the code, or search by words\n")
    } else if found.is_empty() {
        match &finds.within {
            Some(w) => format!(
                "no code under {w} fits \"{}\"\n",
                query
                    .trim()
                    .split_once(char::is_whitespace)
                    .map_or("", |x| x.1.trim())
            ),
            None => format!("no code fits \"{query}\"\n"),
        }
    } else {
        let mut s = String::new();
        for f in found {
            let span = match (f.status, f.billable_from, f.billable_to) {
                ("in-use", Some(a), Some(b)) if a == b => format!("in use in release {a}"),
                ("in-use", Some(a), Some(b)) => format!("in use {a} to {b}"),
                ("retired", None, _) => "obsolete: never in use in this release".into(),
                (_, Some(a), Some(b)) => format!("billable {a} to {b}"),
                _ => "never billable".into(),
            };
            s.push_str(&format!(
                "{:<9} {:<10} {}  ({span})\n",
                f.code, f.status, f.description
            ));
        }
        s
    };
    write_out(&out);
    Ok(ExitCode::SUCCESS)
}

fn write_out(s: &str) {
    use std::io::Write;
    let mut out = std::io::stdout().lock();
    // A closed pipe (rollcall ... | head) is not an error worth a message.
    let _ = out.write_all(s.as_bytes());
}

fn main() -> ExitCode {
    let argv: Vec<String> = std::env::args().skip(1).collect();
    match run(&argv) {
        Ok(code) => code,
        Err(msg) => {
            eprintln!("rollcall: {msg}");
            ExitCode::from(2)
        }
    }
}
