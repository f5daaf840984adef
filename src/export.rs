//! What a checked list is handed on as: the cleaned list (CSV), the list as
//! a FHIR R4 ValueSet, and every billable code the list reaches in the study
//! period (CSV, a SQL `IN (...)` list, R and Python vectors). Entries with an
//! error-level finding are left out of every export, and each export names
//! them. The CLI (`--format fhir`, `codes-csv`, ...) and the page (through
//! the binding) write the same bytes from here.

use crate::check::Reach;
use crate::date::Date;
use crate::index::View;
use crate::model::Period;
use crate::render::csv_cell;
use crate::report::{Entry, Kind, Report, Severity, Status};
use crate::systems::{System, FHIR_URIS};
use std::collections::BTreeMap;

/// The ValueSet `url` used until the user gives the list's own canonical URL
/// (`example.org` is reserved for examples, RFC 2606).
pub const PLACEHOLDER_URL: &str = "https://example.org/fhir/ValueSet/code-list";

/// The extension holding the study period (`valuePeriod`) of a ValueSet:
/// FHIR R4's `UsageContext` has no period value, so the period goes in an
/// extension of our own, documented in the README.
pub const STUDY_PERIOD_EXTENSION: &str = "urn:rollcall:fhir:study-period";

/// The extension naming each index the codes were checked against
/// (`valueString`: system, release, coverage and SHA-256), one per system.
pub const CHECKED_AGAINST_EXTENSION: &str = "urn:rollcall:fhir:checked-against";

/// The formats of [`export`], by the names the CLI's `--format` takes.
pub const FORMATS: [&str; 6] = [
    "cleaned-csv",
    "fhir",
    "codes-csv",
    "codes-sql",
    "codes-r",
    "codes-python",
];

/// One row of the cleaned list: a usable code, once, in list order.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CleanRow {
    /// The code as the report reads it (dotted), or the pattern.
    pub code: String,
    /// The system it was checked in.
    pub system: String,
    /// The label written beside it.
    pub label: String,
    /// Its official description.
    pub description: String,
    /// What the entry is (`valid`, `header`, `pattern`, ...).
    pub status: Status,
    /// The line it was first written on.
    pub line: usize,
}

/// An entry left out of the exports for its error-level findings.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct LeftOut {
    /// Its line.
    pub line: usize,
    /// The code or text written there.
    pub code: String,
    /// The kinds of its error-level findings (`header`, `retired`, ...).
    pub kinds: Vec<Kind>,
}

/// The cleaned list and what was left out of it.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Cleaned {
    /// Usable codes and patterns, each once.
    pub rows: Vec<CleanRow>,
    /// Entries with error-level findings, in line order.
    pub left_out: Vec<LeftOut>,
}

/// Each usable code of a report once, in list order; entries with an
/// error-level finding (a header when billable codes are required, a
/// retired or unknown code...) are left out and listed. Blank lines,
/// comments, headings and codes of another system than any checked are
/// not entries of the list.
pub fn cleaned(report: &Report) -> Cleaned {
    let mut out = Cleaned::default();
    let mut seen = std::collections::HashSet::new();
    for e in &report.entries {
        if e.status.skipped() {
            continue;
        }
        let errors: Vec<Kind> = e
            .findings
            .iter()
            .filter(|f| f.severity == Severity::Error)
            .map(|f| f.kind)
            .collect();
        if !errors.is_empty() {
            out.left_out.push(LeftOut {
                line: e.line,
                code: written(e),
                kinds: errors,
            });
            continue;
        }
        // A code of another system than any checked belongs in a list of its own.
        if e.status == Status::OtherSystem {
            continue;
        }
        let Some(code) = &e.code else { continue };
        let system = e
            .system
            .clone()
            .unwrap_or_else(|| report.vocabulary.clone());
        if !seen.insert((system.clone(), code.clone())) {
            continue;
        }
        out.rows.push(CleanRow {
            code: code.clone(),
            system,
            label: e.label.clone().unwrap_or_default(),
            description: e.description.clone().unwrap_or_default(),
            status: e.status,
            line: e.line,
        });
    }
    out
}

fn written(e: &Entry) -> String {
    e.code.clone().unwrap_or_else(|| {
        let t = e.input.trim();
        t[..t.find(['\t', ',']).unwrap_or(t.len())]
            .trim()
            .to_string()
    })
}

/// The left-out entries in words: `line 3 E11 (header)`.
pub fn left_out_words(left: &[LeftOut]) -> Vec<String> {
    left.iter()
        .map(|l| {
            let kinds: Vec<&str> = l.kinds.iter().map(|k| k.name()).collect();
            format!("line {} {} ({})", l.line, l.code, kinds.join(", "))
        })
        .collect()
}

/// The cleaned list as CSV: `code,label,description,status`, one row per
/// usable code, then (when some entries were left out) one row per left-out
/// entry with the status `left out: KIND error`, so the file itself says
/// which entries it does not hold and why. Formula-like cells are
/// neutralised.
pub fn cleaned_csv(c: &Cleaned) -> String {
    let mut out = String::from("code,label,description,status\r\n");
    for r in &c.rows {
        let cells = [&r.code, &r.label, &r.description, r.status.name()];
        out.push_str(&cells.map(csv_cell).join(","));
        out.push_str("\r\n");
    }
    for l in &c.left_out {
        let kinds: Vec<&str> = l.kinds.iter().map(|k| k.name()).collect();
        let status = format!("left out: {} error", kinds.join(", "));
        let cells = [l.code.as_str(), "", "", status.as_str()];
        out.push_str(&cells.map(csv_cell).join(","));
        out.push_str("\r\n");
    }
    out
}

/// Who and when a ValueSet is written: its canonical URL and the day.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ValueSetMeta {
    /// The ValueSet's canonical URL ([`PLACEHOLDER_URL`] until the user sets one).
    pub url: String,
    /// The day it is written (`ValueSet.date`).
    pub date: Date,
}

impl ValueSetMeta {
    /// A ValueSet written on `date` at the canonical URL `url`, trimmed; an
    /// empty one gets [`PLACEHOLDER_URL`].
    pub fn new(url: &str, date: Date) -> ValueSetMeta {
        let url = url.trim();
        ValueSetMeta {
            url: if url.is_empty() { PLACEHOLDER_URL } else { url }.to_string(),
            date,
        }
    }
}

/// The FHIR R4 URI of a system, by rollcall's name for it.
pub fn fhir_uri(system: &str) -> Option<&'static str> {
    let s = System::parse(system)?;
    FHIR_URIS.iter().find(|(x, _)| *x == s).map(|(_, u)| *u)
}

fn title_of(system: &str) -> String {
    System::parse(system).map_or_else(|| system.to_string(), |s| s.title().to_string())
}

/// A FHIR R4 ValueSet (<http://hl7.org/fhir/R4/valueset.html>), the
/// elements rollcall writes, in the specification's order.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
#[serde(rename_all = "camelCase")]
pub struct ValueSet {
    /// Always `ValueSet`.
    pub resource_type: &'static str,
    /// The study period and the indexes checked against.
    pub extension: Vec<Extension>,
    /// Canonical identifier.
    pub url: String,
    /// Computer-friendly name.
    pub name: &'static str,
    /// Human-friendly name.
    pub title: &'static str,
    /// `draft`: a research list, not a published one.
    pub status: &'static str,
    /// For testing purposes, not real usage.
    pub experimental: bool,
    /// The day it was written.
    pub date: String,
    /// How the list was checked, and what was left out.
    pub description: String,
    /// The concepts, one include per system.
    pub compose: Compose,
}

/// `ValueSet.extension`: a URL and one value.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
#[serde(rename_all = "camelCase")]
pub struct Extension {
    /// What the extension means.
    pub url: &'static str,
    /// The study period.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub value_period: Option<FhirPeriod>,
    /// An index checked against, in words.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub value_string: Option<String>,
}

/// A FHIR `Period`: both days included.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
pub struct FhirPeriod {
    /// First day.
    pub start: String,
    /// Last day.
    pub end: String,
}

/// `ValueSet.compose`.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
pub struct Compose {
    /// One per system.
    pub include: Vec<Include>,
}

/// `ValueSet.compose.include`: a system and its concepts.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
pub struct Include {
    /// The system's URI.
    pub system: &'static str,
    /// The concepts.
    pub concept: Vec<Concept>,
}

/// `ValueSet.compose.include.concept`.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
pub struct Concept {
    /// The code.
    pub code: String,
    /// Its official description (or the list's label when it has none).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub display: Option<String>,
}

impl ValueSet {
    /// How many concepts it holds.
    pub fn concepts(&self) -> usize {
        self.compose.include.iter().map(|i| i.concept.len()).sum()
    }
}

/// The cleaned list as a FHIR R4 ValueSet: one `compose.include` per system
/// with its concepts, `url`, `date`, the study period (extension
/// [`STUDY_PERIOD_EXTENSION`]) and each index checked against (extension
/// [`CHECKED_AGAINST_EXTENSION`]). Patterns are not concepts (their codes are
/// in the codes exports) and are left out, as are entries with error-level
/// findings; the description names both. `include.version` is not set: a
/// study period spans several releases, and the extension names the index
/// that covers them all.
pub fn value_set(report: &Report, c: &Cleaned, meta: &ValueSetMeta) -> ValueSet {
    let mut by_system: Vec<(String, Vec<Concept>)> = vec![(report.vocabulary.clone(), Vec::new())];
    let mut patterns = Vec::new();
    for r in &c.rows {
        if r.status == Status::Pattern || fhir_uri(&r.system).is_none() {
            patterns.push(format!("line {} {}", r.line, r.code));
            continue;
        }
        let display = if r.description.is_empty() {
            &r.label
        } else {
            &r.description
        };
        let concept = Concept {
            code: r.code.clone(),
            display: (!display.is_empty()).then(|| display.clone()),
        };
        match by_system.iter_mut().find(|(s, _)| *s == r.system) {
            Some((_, list)) => list.push(concept),
            None => by_system.push((r.system.clone(), vec![concept])),
        }
    }
    let first = by_system[0].0.clone();
    let mut include: Vec<Include> = by_system
        .into_iter()
        .filter(|(_, c)| !c.is_empty())
        .map(|(s, concept)| Include {
            system: fhir_uri(&s).unwrap_or(""),
            concept,
        })
        .collect();
    if include.is_empty() {
        // R4 requires at least one include; an empty one holds no concepts.
        include.push(Include {
            system: fhir_uri(&first).unwrap_or(""),
            concept: Vec::new(),
        });
    }
    let o = &report.options;
    let when = if o.from == o.to {
        format!("on {}", o.from)
    } else {
        format!("from {} to {}", o.from, o.to)
    };
    let mut against = vec![format!(
        "{} index release {} (covers {} to {})",
        title_of(&report.vocabulary),
        report.index.release,
        report.index.coverage_from,
        report.index.coverage_to
    )];
    for p in &report.summary.by_system {
        if let (Some(release), true) = (&p.release, p.system != report.vocabulary) {
            against.push(format!("{} index release {release}", p.title));
        }
    }
    let mut description = format!(
        "{} codes checked {when}{}, against the {}.",
        title_of(&report.vocabulary),
        if o.billable {
            ", billable codes required"
        } else {
            ""
        },
        against.join(" and the ")
    );
    if !c.left_out.is_empty() {
        description.push_str(&format!(
            " Left out for error-level findings: {}.",
            left_out_words(&c.left_out).join("; ")
        ));
    }
    if !patterns.is_empty() {
        description.push_str(&format!(
            " Patterns are not concepts and are left out (their codes are in the codes export): {}.",
            patterns.join("; ")
        ));
    }
    let mut extension = vec![Extension {
        url: STUDY_PERIOD_EXTENSION,
        value_period: Some(FhirPeriod {
            start: o.from.to_string(),
            end: o.to.to_string(),
        }),
        value_string: None,
    }];
    for a in against {
        extension.push(Extension {
            url: CHECKED_AGAINST_EXTENSION,
            value_period: None,
            value_string: Some(a),
        });
    }
    ValueSet {
        resource_type: "ValueSet",
        extension,
        url: meta.url.clone(),
        name: "CheckedCodeList",
        title: "Code list checked with rollcall",
        status: "draft",
        experimental: true,
        date: meta.date.to_string(),
        description,
        compose: Compose { include },
    }
}

/// One billable code the list reaches in the period.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ReachedCode {
    /// The code, dotted.
    pub code: String,
    /// Its description.
    pub description: String,
    /// The spans it was billable in that overlap the period, in order.
    pub billable: Vec<Period>,
    /// The list lines that reach it (a code itself, a header or a pattern above it).
    pub lines: Vec<usize>,
}

/// Every billable code the entries reach in `period` (a header or a pattern
/// counts as the billable codes under it), in code order, leaving out the
/// entries of `left_out` (error-level findings) and those in `skip` (rows
/// checked in another system), each by line and code as the report writes it.
pub fn reached_codes(
    view: &View<'_>,
    reach: &[Reach],
    period: &Period,
    left_out: &[LeftOut],
    skip: &[(usize, String)],
) -> Vec<ReachedCode> {
    let mut lines: BTreeMap<u32, Vec<usize>> = BTreeMap::new();
    for r in reach {
        // A line of a draft may hold several entries: each is named by line and code.
        let named = |line: usize, code: &str| line == r.line && code == r.written;
        if left_out.iter().any(|l| named(l.line, &l.code)) || skip.iter().any(|(l, c)| named(*l, c))
        {
            continue;
        }
        for &o in &r.ords {
            let at = lines.entry(o).or_default();
            if !at.contains(&r.line) {
                at.push(r.line);
            }
        }
    }
    lines
        .into_iter()
        .map(|(o, lines)| ReachedCode {
            code: view.display(&view.code(o)),
            description: view.description_or_note(o),
            billable: view.billable(o).filter(|p| p.overlaps(period)).collect(),
            lines,
        })
        .collect()
}

/// The period and index a codes export is for, and what it left out.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CodesContext<'a> {
    /// The system's title (`ICD-10-CM`).
    pub title: &'a str,
    /// The index release.
    pub release: &'a str,
    /// The study period.
    pub period: Period,
    /// Entries left out for error-level findings.
    pub left_out: &'a [LeftOut],
    /// Rows of other systems, not expanded.
    pub other_rows: usize,
}

impl CodesContext<'_> {
    /// The lines that head a codes export, without comment marks.
    fn notes(&self, count: usize) -> Vec<String> {
        let p = &self.period;
        let mut notes = vec![format!(
            "{count} {} billable code{} reached by the list from {} to {} (rollcall, {} index release {}); headers and patterns expanded.",
            self.title,
            if count == 1 { "" } else { "s" },
            p.from,
            p.to,
            self.title,
            self.release
        )];
        if !self.left_out.is_empty() {
            notes.push(format!(
                "Left out for error-level findings: {}.",
                left_out_words(self.left_out).join("; ")
            ));
        }
        if self.other_rows > 0 {
            notes.push(format!(
                "{} row{} of other code systems not included.",
                self.other_rows,
                if self.other_rows == 1 { "" } else { "s" }
            ));
        }
        notes
    }
}

fn clean_comment(s: &str) -> String {
    s.replace(['\r', '\n'], " ")
}

/// The reached codes as CSV: `code,description,billable_from,billable_to,lines`
/// (the first and last billable day within the spans that overlap the period;
/// the list lines that reach the code, `;`-separated). The file ends with the
/// left-out entries as rows whose code cell is empty and whose description
/// says which line was left out and why.
pub fn codes_csv(codes: &[ReachedCode], ctx: &CodesContext<'_>) -> String {
    let mut out = String::from("code,description,billable_from,billable_to,lines\r\n");
    for c in codes {
        let from = c
            .billable
            .first()
            .map(|p| p.from.to_string())
            .unwrap_or_default();
        let to = c
            .billable
            .last()
            .map(|p| p.to.to_string())
            .unwrap_or_default();
        let lines: Vec<String> = c.lines.iter().map(|l| l.to_string()).collect();
        let cells = [
            c.code.clone(),
            c.description.clone(),
            from,
            to,
            lines.join(";"),
        ];
        out.push_str(
            &cells
                .iter()
                .map(|v| csv_cell(v))
                .collect::<Vec<_>>()
                .join(","),
        );
        out.push_str("\r\n");
    }
    for w in left_out_words(ctx.left_out) {
        let cells = ["", &format!("left out: {w}"), "", "", ""];
        out.push_str(&cells.map(csv_cell).join(","));
        out.push_str("\r\n");
    }
    out
}

fn quoted(code: &str, quote: char) -> String {
    let mut s = String::from(quote);
    for ch in code.chars() {
        match ch {
            '\\' if quote == '"' => s.push_str("\\\\"),
            c if c == quote && quote == '\'' => s.push_str("''"),
            c if c == quote => {
                s.push('\\');
                s.push(c);
            }
            c => s.push(c),
        }
    }
    s.push(quote);
    s
}

fn vector(codes: &[ReachedCode], ctx: &CodesContext<'_>, lang: Lang) -> String {
    let (comment, open, close, quote, indent) = match lang {
        Lang::Sql => ("--", "IN (", ")", '\'', "  "),
        Lang::R => ("#", "codes <- c(", ")", '"', "  "),
        Lang::Python => ("#", "codes = [", "]", '"', "    "),
    };
    let mut out = String::new();
    for n in ctx.notes(codes.len()) {
        out.push_str(&format!("{comment} {}\n", clean_comment(&n)));
    }
    out.push_str(open);
    out.push('\n');
    if codes.is_empty() && lang == Lang::Sql {
        // `IN ()` is not SQL; NULL matches nothing.
        out.push_str(&format!("{indent}NULL {comment} no codes\n"));
    }
    for (i, c) in codes.iter().enumerate() {
        let sep = if i + 1 < codes.len() || lang == Lang::Python {
            ","
        } else {
            ""
        };
        out.push_str(&format!(
            "{indent}{}{sep} {comment} {}\n",
            quoted(&c.code, quote),
            clean_comment(&c.description)
        ));
    }
    out.push_str(close);
    out.push('\n');
    out
}

#[derive(Clone, Copy, PartialEq, Eq)]
enum Lang {
    Sql,
    R,
    Python,
}

/// The reached codes as a SQL `IN (...)` list with comments.
pub fn codes_sql(codes: &[ReachedCode], ctx: &CodesContext<'_>) -> String {
    vector(codes, ctx, Lang::Sql)
}

/// The reached codes as an R character vector, `codes <- c(...)`.
pub fn codes_r(codes: &[ReachedCode], ctx: &CodesContext<'_>) -> String {
    vector(codes, ctx, Lang::R)
}

/// The reached codes as a Python list, `codes = [...]`.
pub fn codes_python(codes: &[ReachedCode], ctx: &CodesContext<'_>) -> String {
    vector(codes, ctx, Lang::Python)
}

/// One export, ready to save: the text, a file name and a media type, and
/// how many codes it holds and left out.
#[derive(Clone, Debug, PartialEq, Eq, serde::Serialize)]
pub struct Export {
    /// The format's name (one of [`FORMATS`]).
    pub format: String,
    /// A file name for it.
    pub filename: String,
    /// Its media type.
    pub mime: String,
    /// The text.
    pub text: String,
    /// Codes (or concepts, or rows) it holds.
    pub count: usize,
    /// Entries left out for error-level findings, in words.
    pub left_out: Vec<String>,
}

/// Everything an export needs: the report (all systems), what the primary
/// index's entries reach, that index, and the ValueSet's URL and day.
pub struct Source<'a, 'v> {
    /// The check's report.
    pub report: &'a Report,
    /// The reach of the list's entries in the primary index (empty when it
    /// was checked by shape only).
    pub reach: &'a [Reach],
    /// The primary index, when there is one.
    pub view: Option<&'a View<'v>>,
    /// The ValueSet's URL and day.
    pub meta: ValueSetMeta,
}

/// Writes one export by its format name; an unknown name gets a message
/// naming the known ones.
pub fn export(format: &str, src: &Source<'_, '_>) -> Result<Export, String> {
    let report = src.report;
    let c = cleaned(report);
    let left_out = left_out_words(&c.left_out);
    let made = |filename: &str, mime: &str, text: String, count: usize| Export {
        format: format.to_string(),
        filename: filename.to_string(),
        mime: mime.to_string(),
        text,
        count,
        left_out: left_out.clone(),
    };
    match format {
        "cleaned-csv" => Ok(made(
            "code-list.csv",
            "text/csv",
            cleaned_csv(&c),
            c.rows.len(),
        )),
        "fhir" => {
            let vs = value_set(report, &c, &src.meta);
            let count = vs.concepts();
            let text = serde_json::to_string_pretty(&vs).map_err(|e| e.to_string())? + "\n";
            Ok(made(
                "code-list.valueset.json",
                "application/fhir+json",
                text,
                count,
            ))
        }
        "codes-csv" | "codes-sql" | "codes-r" | "codes-python" => {
            let Some(view) = src.view else {
                return Err(format!(
                    "{} is checked by shape only here: without its content rollcall cannot list the codes a list reaches",
                    title_of(&report.vocabulary)
                ));
            };
            let period = Period::new(report.options.from, report.options.to);
            let others: Vec<&Entry> = report
                .entries
                .iter()
                .filter(|e| !e.status.skipped())
                .filter(|e| e.system.as_deref().is_some_and(|s| s != report.vocabulary))
                .collect();
            let skip: Vec<(usize, String)> = others.iter().map(|e| (e.line, written(e))).collect();
            let other_rows = others.len();
            let codes = reached_codes(view, src.reach, &period, &c.left_out, &skip);
            let title = view.meta().title.clone();
            let ctx = CodesContext {
                title: &title,
                release: &report.index.release,
                period,
                left_out: &c.left_out,
                other_rows,
            };
            let n = codes.len();
            Ok(match format {
                "codes-csv" => made("codes.csv", "text/csv", codes_csv(&codes, &ctx), n),
                "codes-sql" => made("codes.sql", "application/sql", codes_sql(&codes, &ctx), n),
                "codes-r" => made("codes.R", "text/plain", codes_r(&codes, &ctx), n),
                _ => made("codes.py", "text/x-python", codes_python(&codes, &ctx), n),
            })
        }
        other => Err(format!(
            "no export named {other}; the exports are {}",
            FORMATS.join(", ")
        )),
    }
}
