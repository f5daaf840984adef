//! The arguments: the help text, the options every command shares and the
//! check options they give.

use super::*;

pub(crate) const HELP: &str = "\
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

pub(crate) struct Usage(pub(crate) String);

pub(crate) fn today() -> Date {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs())
        .unwrap_or(0);
    Date::from_days((secs / 86_400) as i32)
}

#[derive(Default)]
pub(crate) struct Args {
    pub(crate) command: String,
    pub(crate) files: Vec<String>,
    pub(crate) on: Option<Date>,
    pub(crate) from: Option<Date>,
    pub(crate) to: Option<Date>,
    pub(crate) billable: bool,
    pub(crate) format: Option<String>,
    pub(crate) index: Option<String>,
    /// show: a notes file for the index.
    pub(crate) notes: Option<String>,
    pub(crate) system: Option<String>,
    /// translate: the target system.
    pub(crate) into: Option<String>,
    /// check --format fhir: the ValueSet's canonical URL.
    pub(crate) valueset_url: Option<String>,
    /// How to read the list.
    pub(crate) reading: Reading,
}

pub(crate) fn parse(argv: &[String]) -> Result<Args, Usage> {
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
pub(crate) fn options(a: &Args, default_day: Date) -> Result<CheckOptions, Usage> {
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
