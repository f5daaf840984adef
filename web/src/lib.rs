//! The WebAssembly binding of rollcall for the page.
//!
//! It is deliberately thin: one stateful [`Checker`] built from the bytes of an
//! index file, whose methods take strings or plain JS objects and hand back
//! plain JS objects. The report is the core [`rollcall::Report`] serialised
//! as-is, so the page's JSON download has exactly the CLI's schema.
//!
//! Every core error goes through [`fail`], which turns it into a JS `Error`
//! with a readable message; nothing here panics on bad input.

use rollcall::list::Reading;
use rollcall::mixed::Primary;
use rollcall::{CheckOptions, Date, Index};
use serde::{Deserialize, Serialize};
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

pub mod site;

// The report types are written once, in web/static/report.d.ts, which the
// JavaScript API's declarations re-export.
#[wasm_bindgen(typescript_custom_section)]
const TS_TYPES: &'static str = include_str!("../static/report.d.ts");

#[wasm_bindgen]
extern "C" {
    #[wasm_bindgen(typescript_type = "IndexInfo")]
    pub type JsIndexInfo;
    #[wasm_bindgen(typescript_type = "CheckOptionsInput")]
    pub type JsCheckOptions;
    #[wasm_bindgen(typescript_type = "Report")]
    pub type JsReport;
    #[wasm_bindgen(typescript_type = "CategoryCoverage[]")]
    pub type JsCoverage;
    #[wasm_bindgen(typescript_type = "Span[] | null")]
    pub type JsTimeline;
    #[wasm_bindgen(typescript_type = "Timelines")]
    pub type JsTimelines;
    #[wasm_bindgen(typescript_type = "string[]")]
    pub type JsCodes;
    #[wasm_bindgen(typescript_type = "Edit[]")]
    pub type JsEdits;
    #[wasm_bindgen(typescript_type = "Card")]
    pub type JsCard;
}

/// The one error funnel: a JS `Error` whose message is `context: cause`.
fn fail(context: &str, cause: impl std::fmt::Display) -> JsValue {
    js_sys::Error::new(&format!("{context}: {cause}")).into()
}

/// Serialise a value the way `JSON.stringify` would see it (maps as plain
/// objects, 64-bit numbers as numbers), so it round-trips as JSON.
fn to_js<T: Serialize + ?Sized>(value: &T) -> Result<JsValue, JsValue> {
    value
        .serialize(&serde_wasm_bindgen::Serializer::json_compatible())
        .map_err(|e| fail("could not hand the result to the page", e))
}

fn install_panic_hook() {
    static ONCE: std::sync::Once = std::sync::Once::new();
    ONCE.call_once(|| {
        std::panic::set_hook(Box::new(|info| {
            web_sys::console::error_1(&format!("rollcall: internal error: {info}").into());
        }));
    });
}

/// What an index says about itself, plus the size and SHA-256 of its bytes.
/// The same shape is written to `index-manifest.json` at build time.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq, Eq)]
pub struct IndexInfo {
    pub vocabulary: String,
    pub title: String,
    pub release: String,
    pub coverage_from: String,
    pub coverage_to: String,
    pub sources: Vec<SourceInfo>,
    /// Credit the release's licence asks to show (HPO); empty when none.
    #[serde(default)]
    pub notice: String,
    pub byte_length: u64,
    /// SHA-256 of the index content (everything after the 56-byte header),
    /// as sealed in the header and verified on open.
    pub sha256: String,
}

/// One source file an index was built from.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq, Eq)]
pub struct SourceInfo {
    pub file: String,
    pub sha256: String,
    pub role: String,
}

/// Lower-case hex SHA-256 of `bytes`.
pub fn sha256_hex_of(bytes: &[u8]) -> String {
    rollcall::sha256::hex(&rollcall::sha256::digest(bytes))
}

/// Describe an opened index whose file has the given size and SHA-256.
pub fn describe_index<D: AsRef<[u8]>>(
    index: &Index<D>,
    byte_length: u64,
    sha256: String,
) -> IndexInfo {
    let meta = index.meta();
    IndexInfo {
        vocabulary: meta.vocabulary.clone(),
        title: meta.title.clone(),
        release: meta.release.clone(),
        coverage_from: meta.coverage_from.to_string(),
        coverage_to: meta.coverage_to.to_string(),
        sources: meta
            .sources
            .iter()
            .map(|s| SourceInfo {
                file: s.file.clone(),
                sha256: s.sha256.clone(),
                role: s.role.clone(),
            })
            .collect(),
        notice: meta.notice.clone(),
        byte_length,
        sha256,
    }
}

/// What a notes file says about itself (the index it belongs to), plus
/// its size and content SHA-256: the manifest the page fetches it by.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq, Eq)]
pub struct NotesInfo {
    /// Always `notes`.
    pub kind: String,
    pub vocabulary: String,
    pub release: String,
    /// Content SHA-256 of the index the notes belong to.
    pub index_sha256: String,
    pub byte_length: u64,
    /// SHA-256 of the notes file's content (everything after the header).
    pub sha256: String,
}

/// Describe an opened notes file of the given size.
pub fn describe_notes<D: AsRef<[u8]>>(
    notes: &rollcall::NotesFile<D>,
    byte_length: u64,
) -> NotesInfo {
    NotesInfo {
        kind: "notes".into(),
        vocabulary: notes.vocabulary().to_string(),
        release: notes.release().to_string(),
        index_sha256: notes.index_checksum(),
        byte_length,
        sha256: notes.checksum(),
    }
}

/// Check options as the page sends them.
#[derive(Deserialize, Default, Debug)]
#[serde(deny_unknown_fields)]
struct OptionsInput {
    #[serde(default)]
    on: Option<String>,
    #[serde(default)]
    from: Option<String>,
    #[serde(default)]
    to: Option<String>,
    #[serde(default)]
    billable: bool,
    #[serde(default)]
    reading: Option<String>,
}

/// The reading the page asked for (`auto` when none).
fn reading_of(input: &OptionsInput) -> Result<Reading, String> {
    match input.reading.as_deref().map(str::trim) {
        None | Some("") => Ok(Reading::Auto),
        Some(name) => Reading::parse(name).ok_or_else(|| {
            format!(
                "\u{201c}{name}\u{201d} is not a way to read a list (known: auto, {})",
                Reading::FORCED.map(|r| r.name()).join(", ")
            )
        }),
    }
}

fn parse_day(what: &str, text: &str) -> Result<Date, String> {
    Date::parse(text.trim())
        .map_err(|e| format!("{what} \u{201c}{text}\u{201d} is not a date: {e}"))
}

fn blank(value: &Option<String>) -> bool {
    value.as_deref().is_none_or(|s| s.trim().is_empty())
}

/// Turn the page's options into core options the way the CLI does: a single
/// day, or a study period with both ends, or (nothing given) `default_day`
/// (the index's default day: today when the index covers it).
fn resolve_options(input: &OptionsInput, default_day: Date) -> Result<CheckOptions, String> {
    let on = (!blank(&input.on)).then(|| input.on.as_deref().unwrap_or(""));
    let from = (!blank(&input.from)).then(|| input.from.as_deref().unwrap_or(""));
    let to = (!blank(&input.to)).then(|| input.to.as_deref().unwrap_or(""));
    match (on, from, to) {
        (Some(_), Some(_), _) | (Some(_), _, Some(_)) => {
            Err("give either a single date or a study period, not both".into())
        }
        (Some(d), None, None) => Ok(CheckOptions::on(parse_day("date", d)?, input.billable)),
        (None, Some(f), Some(t)) => {
            let (from, to) = (
                parse_day("study period start", f)?,
                parse_day("study period end", t)?,
            );
            if from > to {
                return Err(format!(
                    "the study period starts ({from}) after it ends ({to})"
                ));
            }
            Ok(CheckOptions {
                from,
                to,
                billable: input.billable,
            })
        }
        (None, Some(_), None) | (None, None, Some(_)) => {
            Err("a study period needs both a start and an end".into())
        }
        (None, None, None) => Ok(CheckOptions::on(default_day, input.billable)),
    }
}

/// Today (UTC), as the CLI takes it when no date is given.
fn today() -> Date {
    Date::from_days((js_sys::Date::now() / 86_400_000.0).floor() as i32)
}

/// One change to the list, with line numbers of the list as it is now (1-based).
#[derive(Deserialize, Debug, Clone, PartialEq, Eq)]
#[serde(tag = "op", rename_all = "lowercase", deny_unknown_fields)]
pub enum Edit {
    /// Put `code` in place of the code written on `line` (at `column`, the
    /// code's 1-based column, when the line holds several codes).
    Replace {
        line: usize,
        code: String,
        #[serde(default)]
        column: Option<usize>,
    },
    /// Delete `line`.
    Remove { line: usize },
    /// Add a line with `code` (and `label`, in the label column) after `after`.
    Add {
        after: usize,
        code: String,
        label: Option<String>,
    },
}

/// Byte range of cell `col` of a CSV line (quote-aware, as the core splits it).
fn csv_cell_range(line: &str, col: usize) -> Option<(usize, usize)> {
    let mut start = 0;
    let mut quoted = false;
    let mut cell = 0;
    let bytes = line.as_bytes();
    let mut i = 0;
    while i < bytes.len() {
        match bytes[i] {
            b'"' => quoted = !quoted,
            b',' if !quoted => {
                if cell == col {
                    return Some((start, i));
                }
                cell += 1;
                start = i + 1;
            }
            _ => {}
        }
        i += 1;
    }
    (cell == col).then_some((start, line.len()))
}

/// The byte range of the words that make up `code` at the start of a plain
/// line (the core may have joined `E11 .9` into `E11.9`).
fn plain_code_range(line: &str, code: &str) -> Option<(usize, usize)> {
    let want: String = code.chars().filter(|c| !c.is_whitespace()).collect();
    let mut got = String::new();
    let mut start = None;
    let mut pos = 0;
    for word in line.split_whitespace() {
        let at = pos + line[pos..].find(word)?;
        start.get_or_insert(at);
        pos = at + word.len();
        got.push_str(word);
        if got == want {
            return Some((start.unwrap_or(0), pos));
        }
        if !want.starts_with(&got) {
            return None;
        }
    }
    None
}

/// A new line holding `code` and `label` laid out like the rest of the list.
fn new_line(layout: rollcall::list::Layout, code: &str, label: Option<&str>) -> String {
    use rollcall::list::Layout;
    let label = label.map(|l| l.replace(['\t', '\r', '\n'], " "));
    match layout {
        Layout::Plain => match label {
            Some(l) => format!("{code} {l}"),
            None => code.to_string(),
        },
        Layout::Tsv(c, l) | Layout::Csv(c, l) => {
            let csv = matches!(layout, Layout::Csv(..));
            let width = c.max(l.unwrap_or(0)) + 1;
            let mut cells = vec![String::new(); width];
            cells[c] = code.to_string();
            if let (Some(l), Some(text)) = (l, label) {
                cells[l] = if csv && text.contains([',', '"']) {
                    format!("\"{}\"", text.replace('"', "\"\""))
                } else {
                    text
                };
            }
            let line = cells.join(if csv { "," } else { "\t" });
            line.trim_end_matches([',', '\t']).to_string()
        }
    }
}

fn check_code(code: &str) -> Result<(), String> {
    if code.trim().is_empty() || code.contains(['\t', '\n', '\r', ',', '"']) {
        return Err(format!(
            "\u{201c}{code}\u{201d} cannot be written into the list"
        ));
    }
    Ok(())
}

/// Apply edits to a list, leaving every other character as it was (labels,
/// other columns, line endings). All line numbers refer to `text` as given.
pub fn edit_list(text: &str, edits: &[Edit]) -> Result<String, String> {
    edit_list_read(text, edits, Reading::Auto)
}

/// [`edit_list`] of a list read as `reading` says. A code found inside a
/// longer line (markdown, prose, SQL, JSON) is replaced where it stands,
/// so the draft keeps its form.
pub fn edit_list_read(text: &str, edits: &[Edit], reading: Reading) -> Result<String, String> {
    use rollcall::list::{Layout, LineKind};
    let draft = rollcall::list::read(text, reading);
    let layout = match draft.facts.reading {
        Reading::Table => rollcall::list::table::detect_table(text).layout,
        _ => Layout::Plain,
    };
    let lines = &draft.lines;
    let mut physical: Vec<Option<String>> = text.split('\n').map(|l| Some(l.to_string())).collect();
    let mut added: std::collections::BTreeMap<usize, Vec<String>> = Default::default();
    let count = draft.line_count();
    let entry_at =
        |line: usize, column: Option<usize>| -> Result<&rollcall::list::InputLine, String> {
            let mut on_line = lines.iter().filter(|l| l.number == line).peekable();
            if on_line.peek().is_none() {
                return Err(format!("the list has no line {line}"));
            }
            let found = on_line
                .filter(|l| matches!(l.kind, LineKind::Entry { .. }))
                .find(|l| column.is_none() || l.column() == column);
            found.ok_or_else(|| match column {
                Some(c) => format!("line {line} holds no code at column {c}"),
                None => format!("line {line} holds no code to replace"),
            })
        };
    for edit in edits {
        match edit {
            Edit::Remove { line } => {
                if *line == 0 || *line > count {
                    return Err(format!("the list has no line {line}"));
                }
                physical[line - 1] = None;
            }
            Edit::Add { after, code, label } => {
                check_code(code)?;
                if *after > count {
                    return Err(format!("the list has no line {after}"));
                }
                added
                    .entry(*after)
                    .or_default()
                    .push(new_line(layout, code, label.as_deref()));
            }
            Edit::Replace {
                line,
                code: new_code,
                column,
            } => {
                let input = entry_at(*line, *column)?;
                let LineKind::Entry { code: written, .. } = &input.kind else {
                    return Err(format!("line {line} holds no code to replace"));
                };
                check_code(new_code)?;
                let Some(raw) = physical.get_mut(line - 1).and_then(Option::as_mut) else {
                    return Err(format!("line {line} is removed by another change"));
                };
                let (body, cr) = match raw.strip_suffix('\r') {
                    Some(l) => (l.to_string(), "\r"),
                    None => (raw.clone(), ""),
                };
                if let Some((a, b)) = input
                    .place
                    .span
                    .filter(|&(a, b)| body.get(a..b) == Some(written.as_str()))
                {
                    *raw = format!("{}{}{}{}", &body[..a], new_code, &body[b..], cr);
                    continue;
                }
                let range = match layout {
                    Layout::Tsv(col, _) => {
                        let mut start = 0;
                        let mut found = None;
                        for (i, cell) in body.split('\t').enumerate() {
                            if i == col {
                                found = Some((start, start + cell.len()));
                                break;
                            }
                            start += cell.len() + 1;
                        }
                        found
                    }
                    Layout::Csv(col, _) => csv_cell_range(&body, col),
                    Layout::Plain => plain_code_range(&body, written.as_str()),
                };
                let Some((a, b)) = range else {
                    return Err(format!(
                        "the code on line {line} could not be found in the line"
                    ));
                };
                // Keep the cell's surrounding spaces.
                let cell = &body[a..b];
                let lead = cell.len() - cell.trim_start().len();
                let trail = cell.len() - cell.trim_end().len();
                *raw = format!(
                    "{}{}{}{}",
                    &body[..a + lead],
                    new_code,
                    &body[b - trail..],
                    cr
                );
            }
        }
    }
    // A list ending in a newline has one more piece than lines; added lines
    // go before that empty tail.
    let mut out: Vec<String> = Vec::with_capacity(physical.len());
    if let Some(first) = added.get(&0) {
        out.extend(first.iter().cloned());
    }
    for (i, line) in physical.into_iter().enumerate() {
        if let Some(l) = line {
            out.push(l);
        }
        if let Some(more) = added.get(&(i + 1)) {
            out.extend(more.iter().cloned());
        }
    }
    Ok(out.join("\n"))
}

/// A loaded, verified index and the last check made with it.
#[wasm_bindgen]
pub struct Checker {
    index: Index<Vec<u8>>,
    info: IndexInfo,
    /// Category coverage of the last checked list, from the same pass.
    last: Option<Vec<rollcall::CategoryCoverage>>,
    /// Indexes of other systems, for naming their codes in this one's lists
    /// (the ICD-9-CM index and its GEMs beside ICD-10-CM).
    companions: Vec<Index<Vec<u8>>>,
}

#[wasm_bindgen]
impl Checker {
    /// Open an index from its bytes and verify its internal checksum.
    /// Throws an `Error` saying what is wrong with a missing, truncated,
    /// corrupted or wrong-version file.
    #[wasm_bindgen(constructor)]
    pub fn new(bytes: Vec<u8>) -> Result<Checker, JsValue> {
        install_panic_hook();
        if bytes.is_empty() {
            return Err(fail("cannot open the index", "the file is empty"));
        }
        let len = bytes.len() as u64;
        let index = Index::open(bytes).map_err(|e| fail("cannot open the index", e))?;
        // One pass over the bytes: verify() hashes the content and compares
        // it with the header; the page then compares that checksum with the
        // manifest's.
        index
            .verify()
            .map_err(|e| fail("the index is damaged", e))?;
        let info = describe_index(&index, len, index.checksum());
        Ok(Checker {
            index,
            info,
            last: None,
            companions: Vec::new(),
        })
    }

    /// The index's release, coverage, sources, byte length and SHA-256.
    pub fn info(&self) -> Result<JsIndexInfo, JsValue> {
        Ok(to_js(&self.info)?.unchecked_into())
    }

    /// Check a list (one entry per line). Returns the report in the CLI's
    /// JSON schema and keeps it for [`Checker::coverage`].
    pub fn check(&mut self, text: &str, options: JsCheckOptions) -> Result<JsReport, JsValue> {
        let (opts, reading) = self.options_and_reading(options)?;
        let (report, coverage) = self.checked(&rollcall::list::read(text, reading), &opts);
        let out = to_js(&report)?;
        self.last = Some(coverage);
        Ok(out.unchecked_into())
    }

    /// The same as [`Checker::check`], with the report as JSON text: for a
    /// large report, `JSON.parse` of one string is much faster than building
    /// the objects across the boundary.
    #[wasm_bindgen(js_name = checkJson)]
    pub fn check_json(&mut self, text: &str, options: JsCheckOptions) -> Result<String, JsValue> {
        let (opts, reading) = self.options_and_reading(options)?;
        let (report, coverage) = self.checked(&rollcall::list::read(text, reading), &opts);
        let out = serde_json::to_string(&report)
            .map_err(|e| fail("could not hand the result to the page", e))?;
        self.last = Some(coverage);
        Ok(out)
    }

    /// Check a file as the CLI reads it (text in UTF-8 or UTF-16): the
    /// report as JSON text, as [`Checker::check_json`]. The page's checker is
    /// built without the cell reader, so a workbook here gets a message; the
    /// worker reads workbooks with the workbook module and
    /// [`Checker::check_sheets_json`].
    #[wasm_bindgen(js_name = checkBytesJson)]
    pub fn check_bytes_json(
        &mut self,
        bytes: &[u8],
        options: JsCheckOptions,
    ) -> Result<String, JsValue> {
        let (opts, reading) = self.options_and_reading(options)?;
        let draft = rollcall::list::read_bytes(bytes, reading)
            .map_err(|e| fail("cannot read the file", e))?;
        let (report, coverage) = self.checked(&draft, &opts);
        let out = serde_json::to_string(&report)
            .map_err(|e| fail("could not hand the result to the page", e))?;
        self.last = Some(coverage);
        Ok(out)
    }

    /// Check the sheets of a workbook as the CLI checks the workbook file:
    /// `sheets_json` is the JSON text of the sheets' cells (an array of
    /// `{ name, first_row, rows, numbers }`, as the page's workbook module
    /// `rollcall_workbook.sheets` gives them). The report as JSON text, as
    /// [`Checker::check_json`]; each entry names its sheet and row.
    #[wasm_bindgen(js_name = checkSheetsJson)]
    pub fn check_sheets_json(
        &mut self,
        sheets_json: &str,
        options: JsCheckOptions,
    ) -> Result<String, JsValue> {
        let (opts, reading) = self.options_and_reading(options)?;
        if !matches!(reading, Reading::Auto | Reading::Workbook) {
            return Err(fail(
                "bad check options",
                format!(
                    "the sheets of a workbook are read as a workbook, not as \u{201c}{}\u{201d}; give the reading auto or workbook",
                    reading.name()
                ),
            ));
        }
        let sheets: Vec<rollcall::list::workbook::Sheet> = serde_json::from_str(sheets_json)
            .map_err(|e| fail("cannot read the workbook's sheets", e))?;
        let draft = rollcall::list::workbook::from_sheets(&sheets);
        let (report, coverage) = self.checked(&draft, &opts);
        let out = serde_json::to_string(&report)
            .map_err(|e| fail("could not hand the result to the page", e))?;
        self.last = Some(coverage);
        Ok(out)
    }

    /// Check two lists and compare the billable codes each reaches in the
    /// period; returns the comparison (`Comparison`) as JSON text.
    #[wasm_bindgen(js_name = compareJson)]
    pub fn compare_json(
        &self,
        text_a: &str,
        text_b: &str,
        options: JsCheckOptions,
    ) -> Result<String, JsValue> {
        let opts = self.options(options)?;
        let views: Vec<_> = self.companions.iter().map(|c| c.view()).collect();
        let c = rollcall::compare::compare_among(
            &self.index,
            &views,
            ("A", text_a),
            ("B", text_b),
            &opts,
        );
        serde_json::to_string(&c).map_err(|e| fail("could not hand the result to the page", e))
    }

    /// Check a list whose rows with no system cell are in `system`, a system
    /// rollcall checks by shape only (`loinc`, `snomed`, ...): the same report
    /// as `rollcall check --system NAME --format json`, as JSON text. Rows
    /// whose system column names a loaded index's system are checked in it.
    #[wasm_bindgen(js_name = checkShapesJson)]
    pub fn check_shapes_json(
        &mut self,
        system: &str,
        text: &str,
        options: JsCheckOptions,
    ) -> Result<String, JsValue> {
        let opts = self.options_from(options, today())?;
        let Some(s) = rollcall::systems::System::parse(system) else {
            return Err(fail(
                "unknown code system",
                format!(
                    "\u{201c}{system}\u{201d} (known: {})",
                    rollcall::systems::ALL.map(|s| s.name()).join(", ")
                ),
            ));
        };
        if s.bundled() {
            return Err(fail(
                "not a shape-only system",
                format!(
                    "{} has a bundled index; open that index (its manifest is beside the page) to check {} lists",
                    s.title(),
                    s.name()
                ),
            ));
        }
        let mut loaded: Vec<&Index<Vec<u8>>> = vec![&self.index];
        loaded.extend(self.companions.iter());
        let report = rollcall::mixed::check_list(Primary::Shapes(s), &loaded, text, &opts);
        let out = serde_json::to_string(&report)
            .map_err(|e| fail("could not hand the result to the page", e))?;
        self.last = Some(Vec::new());
        Ok(out)
    }

    /// The day a list is checked on when no day or period is given: today
    /// when the index covers it, else the nearest day it covers (ICD-9-CM:
    /// its last day), as the CLI does.
    #[wasm_bindgen(js_name = defaultDay)]
    pub fn default_day(&self) -> String {
        self.index.meta().default_day(today()).to_string()
    }

    /// One export of a checked list (`cleaned-csv`, `fhir`, `codes-csv`,
    /// `codes-sql`, `codes-r`, `codes-python`), as JSON text: `{ format,
    /// filename, mime, text, count, left_out }`, the bytes the CLI's
    /// `check --format NAME` writes. `system` is a shape-only system picked
    /// for the rows with no system cell, or empty; `url` the ValueSet's
    /// canonical URL (empty: a placeholder).
    #[wasm_bindgen(js_name = exportJson)]
    pub fn export_json(
        &self,
        text: &str,
        options: JsCheckOptions,
        format: &str,
        system: &str,
        url: &str,
    ) -> Result<String, JsValue> {
        use rollcall::export::{export, Source, ValueSetMeta, PLACEHOLDER_URL};
        let meta = ValueSetMeta {
            url: if url.trim().is_empty() {
                PLACEHOLDER_URL.to_string()
            } else {
                url.trim().to_string()
            },
            date: today(),
        };
        let made = if system.is_empty() {
            let (opts, reading) = self.options_and_reading(options)?;
            let draft = rollcall::list::read(text, reading);
            let (report, _) = self.checked(&draft, &opts);
            let views: Vec<_> = self.companions.iter().map(|c| c.view()).collect();
            let reach = if format.starts_with("codes-") {
                rollcall::check::check_draft_with_reach(&self.index, &views, &draft, &opts).1
            } else {
                Vec::new()
            };
            let view = self.index.view();
            export(
                format,
                &Source {
                    report: &report,
                    reach: &reach,
                    view: Some(&view),
                    meta,
                },
            )
        } else {
            let opts = self.options_from(options, today())?;
            let s = rollcall::systems::System::parse(system)
                .ok_or_else(|| fail("unknown code system", system))?;
            let mut loaded: Vec<&Index<Vec<u8>>> = vec![&self.index];
            loaded.extend(self.companions.iter());
            let report = rollcall::mixed::check_list(Primary::Shapes(s), &loaded, text, &opts);
            export(
                format,
                &Source {
                    report: &report,
                    reach: &[],
                    view: None,
                    meta,
                },
            )
        };
        let e = made.map_err(|e| fail("cannot export", e))?;
        serde_json::to_string(&e).map_err(|e| fail("could not hand the result to the page", e))
    }

    /// The systems whose indexes are loaded: this index's, then the
    /// companions' (fetched for lists that need them).
    pub fn loaded(&self) -> Vec<String> {
        std::iter::once(&self.index)
            .chain(self.companions.iter())
            .map(|i| i.meta().vocabulary.clone())
            .collect()
    }

    /// The manifest beside the page that lists this index's notes file (the
    /// tabular list's notes, for cards), or `undefined` when its system has
    /// none. The name is the core's (`System::notes_manifest`).
    #[wasm_bindgen(js_name = notesManifest)]
    pub fn notes_manifest(&self) -> Option<String> {
        rollcall::systems::System::parse(&self.index.meta().vocabulary)
            .and_then(|s| s.notes_manifest())
            .map(str::to_string)
    }

    /// Add the notes file of this index (the tabular list's notes, fetched
    /// the first time a card is opened): verified like an index, and refused
    /// unless it was written for this very index. Returns the release it
    /// names.
    #[wasm_bindgen(js_name = addNotes)]
    pub fn add_notes(&mut self, bytes: Vec<u8>) -> Result<String, JsValue> {
        let notes =
            rollcall::NotesFile::open(bytes).map_err(|e| fail("cannot open the notes", e))?;
        notes
            .verify()
            .map_err(|e| fail("the notes file is damaged", e))?;
        let release = notes.release().to_string();
        self.index
            .add_notes(notes)
            .map_err(|e| fail("cannot use the notes", e))?;
        Ok(release)
    }

    /// Add the index of another system (verified like the main one), so that
    /// its codes in a list are named with its mapping's targets, as the CLI
    /// does with the bundled ICD-9-CM index. Returns its vocabulary.
    #[wasm_bindgen(js_name = addCompanion)]
    pub fn add_companion(&mut self, bytes: Vec<u8>) -> Result<String, JsValue> {
        let index = Index::open(bytes).map_err(|e| fail("cannot open the index", e))?;
        index
            .verify()
            .map_err(|e| fail("the index is damaged", e))?;
        let name = index.meta().vocabulary.clone();
        self.companions.retain(|c| c.meta().vocabulary != name);
        self.companions.push(index);
        Ok(name)
    }

    fn checked(
        &self,
        draft: &rollcall::list::Draft,
        opts: &CheckOptions,
    ) -> (rollcall::Report, Vec<rollcall::CategoryCoverage>) {
        // Rows whose system column names a companion's system are checked
        // in it; a list without system cells is checked as before.
        let others: Vec<&Index<Vec<u8>>> = self.companions.iter().collect();
        rollcall::mixed::check_listed_draft(Primary::Index(&self.index), &others, draft, opts)
    }

    /// The check options the page sends; with no day or period, the index's
    /// default day (`Meta::default_day`), or today for a shape-only system.
    fn options(&self, options: JsCheckOptions) -> Result<CheckOptions, JsValue> {
        Ok(self.options_and_reading(options)?.0)
    }

    /// The options and the reading the page sends, with the index's default day.
    fn options_and_reading(
        &self,
        options: JsCheckOptions,
    ) -> Result<(CheckOptions, Reading), JsValue> {
        self.options_and_reading_from(options, self.index.meta().default_day(today()))
    }

    /// The options with another default day (today, for a shape-only system).
    fn options_from(
        &self,
        options: JsCheckOptions,
        default_day: Date,
    ) -> Result<CheckOptions, JsValue> {
        Ok(self.options_and_reading_from(options, default_day)?.0)
    }

    fn options_and_reading_from(
        &self,
        options: JsCheckOptions,
        default_day: Date,
    ) -> Result<(CheckOptions, Reading), JsValue> {
        let options: JsValue = options.into();
        let input: OptionsInput = if options.is_undefined() || options.is_null() {
            OptionsInput::default()
        } else {
            // serde-wasm-bindgen reads only the fields it knows; name any other.
            if options.is_object() {
                let object: &js_sys::Object = options.unchecked_ref();
                for key in js_sys::Object::keys(object).iter() {
                    let key = key.as_string().unwrap_or_default();
                    if !matches!(key.as_str(), "on" | "from" | "to" | "billable" | "reading") {
                        return Err(fail(
                            "bad check options",
                            format!("unknown option \u{201c}{key}\u{201d} (known: on, from, to, billable, reading)"),
                        ));
                    }
                }
            }
            serde_wasm_bindgen::from_value(options).map_err(|e| fail("bad check options", e))?
        };
        let reading = reading_of(&input).map_err(|e| fail("bad check options", e))?;
        let opts =
            resolve_options(&input, default_day).map_err(|e| fail("bad check options", e))?;
        Ok((opts, reading))
    }

    /// For each category in the last checked list: billable codes included of
    /// all billable codes under it in the checked period.
    pub fn coverage(&self) -> Result<JsCoverage, JsValue> {
        let Some(cov) = &self.last else {
            return Err(fail("no coverage yet", "check a list first"));
        };
        Ok(to_js(cov)?.unchecked_into())
    }

    /// The billable and header spans of one code (any input form), or `null`
    /// for a code the index does not know.
    pub fn timeline(&self, code: &str) -> Result<JsTimeline, JsValue> {
        Ok(to_js(&rollcall::timeline(&self.index, code))?.unchecked_into())
    }

    /// The list with some edits applied (replace a line's code, remove a
    /// line, add a line), every other character kept. Used to apply suggestions.
    #[wasm_bindgen(js_name = editList)]
    pub fn edit_list(
        &self,
        text: &str,
        edits: JsEdits,
        reading: Option<String>,
    ) -> Result<String, JsValue> {
        let edits: Vec<Edit> =
            serde_wasm_bindgen::from_value(edits.into()).map_err(|e| fail("bad edits", e))?;
        let reading = reading_of(&OptionsInput {
            reading,
            ..OptionsInput::default()
        })
        .map_err(|e| fail("bad edits", e))?;
        edit_list_read(text, &edits, reading).map_err(|e| fail("cannot apply the change", e))
    }

    /// Spans for many codes at once, keyed by the code as given.
    pub fn timelines(&self, codes: JsCodes) -> Result<JsTimelines, JsValue> {
        let codes: Vec<String> = serde_wasm_bindgen::from_value(codes.into())
            .map_err(|e| fail("bad code list for timelines", e))?;
        let map: std::collections::BTreeMap<&str, Option<Vec<rollcall::Span>>> = codes
            .iter()
            .map(|c| (c.as_str(), rollcall::timeline(&self.index, c)))
            .collect();
        Ok(to_js(&map)?.unchecked_into())
    }

    /// Codes for words, best first, as JSON text: `{ query, date, within,
    /// no_code, results: [{ code, description, status, billable_from,
    /// billable_to, fit }] }` (the CLI's `find --format json`). A code or
    /// code start first lists that part of the tree (`within`), or names the
    /// start no code has (`no_code`). The last word counts as the start of a
    /// word, for suggestions while typing; codes in use on the index's
    /// default day (today when it covers it) come first.
    pub fn find(&self, query: &str, limit: u32) -> Result<String, JsValue> {
        // The index's default day: today, or the nearest day it covers.
        let day = self.index.meta().default_day(today());
        let limit = (limit as usize).clamp(1, 100);
        let f = rollcall::find::find(&self.index.view(), query, day, limit, true);
        let v = serde_json::json!({
            "query": query,
            "date": day,
            "within": f.within,
            "no_code": f.no_code,
            "results": f.results,
        });
        serde_json::to_string(&v).map_err(|e| fail("could not hand the result to the page", e))
    }

    /// The card of one code, node or code start (`Card`, one of the CLI's
    /// `show --format json` cards) for the options' day or period; the
    /// companions' mappings (the GEMs) included. Text that is no code gets a
    /// card with the check's message and suggestions.
    pub fn card(&self, code: &str, options: JsCheckOptions) -> Result<JsCard, JsValue> {
        let opts = self.options(options)?;
        let views: Vec<_> = self.companions.iter().map(|c| c.view()).collect();
        let mut cards = rollcall::card::cards(&self.index, &views, &[code], &opts);
        let card = cards
            .cards
            .pop()
            .ok_or_else(|| fail("no card", "give a code"))?;
        Ok(to_js(&card)?.unchecked_into())
    }
}

/// The codes the reader finds in a list, for marking them in the page's
/// text area: JSON text `{ reading, tokens: [{ line, column, start, end, code }] }`
/// (`column` as the report's entries have it, when the code sits in a longer line),
/// with `start` and `end` in UTF-16 units from the start of the text (as a
/// textarea's selection counts); codes read whole from a line of a plain
/// list or a table cover the code as written.
#[wasm_bindgen(js_name = readDraft)]
pub fn read_draft(text: &str, reading: Option<String>) -> Result<String, JsValue> {
    let reading = reading_of(&OptionsInput {
        reading,
        ..OptionsInput::default()
    })
    .map_err(|e| fail("bad reading", e))?;
    let draft = rollcall::list::read(text, reading);
    serde_json::to_string(&serde_json::json!({
        "reading": draft.facts,
        "tokens": tokens_of(text, &draft),
    }))
    .map_err(|e| fail("could not hand the result to the page", e))
}

/// UTF-16 start of each line of `text` (lines split as the reader splits them).
fn line_starts16(text: &str) -> Vec<usize> {
    let mut starts = vec![0];
    let mut units = 0;
    let mut chars = text.chars().peekable();
    while let Some(c) = chars.next() {
        units += c.len_utf16();
        if c == '\r' && chars.peek() == Some(&'\n') {
            chars.next();
            units += 1;
            starts.push(units);
        } else if c == '\n' || c == '\r' {
            starts.push(units);
        }
    }
    starts
}

fn tokens_of(text: &str, draft: &rollcall::list::Draft) -> Vec<serde_json::Value> {
    use rollcall::list::LineKind;
    let bom = usize::from(text.starts_with('\u{feff}'));
    let starts = line_starts16(text);
    draft
        .lines
        .iter()
        .filter_map(|l| {
            let LineKind::Entry { code, .. } = &l.kind else {
                return None;
            };
            let base = *starts.get(l.number - 1)? + if l.number == 1 { bom } else { 0 };
            let (a, b) = match l.place.span {
                Some(span) => span,
                None => {
                    let at = l.text.find(code.as_str())?;
                    (at, at + code.len())
                }
            };
            let u16_at = |i: usize| l.text.get(..i).map(|t| t.encode_utf16().count());
            Some(serde_json::json!({
                "line": l.number,
                "column": l.column(),
                "start": base + u16_at(a)?,
                "end": base + u16_at(b)?,
                "code": code,
            }))
        })
        .collect()
}

/// The name of the manifest beside the page for the bundled index of the
/// system `name` (`index-manifest.json` for ICD-10-CM), or `undefined` when
/// it has none: the core's `System::index_manifest`.
#[wasm_bindgen(js_name = indexManifest)]
pub fn index_manifest(name: &str) -> Option<String> {
    rollcall::systems::System::parse(name).and_then(|s| s.index_manifest())
}

/// The bundled index kept at hand beside a list of the system `name`
/// (ICD-9-CM beside ICD-10-CM and back, for the GEMs), or `undefined`: the
/// core's `System::companion`.
#[wasm_bindgen(js_name = companionOf)]
pub fn companion_of(name: &str) -> Option<String> {
    rollcall::systems::System::parse(name)
        .and_then(|s| s.companion())
        .map(|s| s.name().to_string())
}

/// Whether a file's bytes are a spreadsheet workbook (a zip or OLE2
/// container), as the core tells them apart (`rollcall::list::is_workbook`).
#[wasm_bindgen(js_name = isWorkbook)]
pub fn is_workbook(bytes: &[u8]) -> bool {
    rollcall::list::is_workbook(bytes)
}

/// A dropped file as the core reads files (`rollcall check FILE` does the
/// same): `{"workbook": true}` for a spreadsheet workbook (its bytes are then
/// checked as sheets), else `{"workbook": false, "text": ...}`, the text in
/// UTF-8 or UTF-16 with its mark (the mark left out). An Error says what is wrong and what to do.
#[wasm_bindgen(js_name = decodeFile)]
pub fn decode_file(bytes: &[u8]) -> Result<String, JsValue> {
    let value = if rollcall::list::is_workbook(bytes) {
        serde_json::json!({ "workbook": true })
    } else {
        let text = rollcall::list::decode(bytes)
            .map_err(|e| JsValue::from(js_sys::Error::new(&e.message)))?;
        // A byte-order mark is no part of the list the user sees.
        let text = text.strip_prefix('\u{feff}').unwrap_or(&text);
        serde_json::json!({ "workbook": false, "text": text })
    };
    serde_json::to_string(&value).map_err(|e| fail("could not hand the result to the page", e))
}

/// Lower-case hex SHA-256 of some bytes (to compare a fetched index with its
/// manifest).
#[wasm_bindgen(js_name = sha256Hex)]
pub fn sha256_hex(bytes: &[u8]) -> String {
    sha256_hex_of(bytes)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn day(s: &str) -> Date {
        Date::parse(s).unwrap()
    }

    #[test]
    fn options_resolve_like_the_cli() {
        let today = day("2025-03-04");
        let none = resolve_options(&OptionsInput::default(), today).unwrap();
        assert_eq!((none.from, none.to, none.billable), (today, today, false));

        let on = OptionsInput {
            on: Some("2020-01-01".into()),
            ..Default::default()
        };
        let o = resolve_options(&on, today).unwrap();
        assert_eq!((o.from, o.to), (day("2020-01-01"), day("2020-01-01")));

        let period = OptionsInput {
            from: Some("2019-01-01".into()),
            to: Some("2020-12-31".into()),
            billable: true,
            ..Default::default()
        };
        let p = resolve_options(&period, today).unwrap();
        assert_eq!(
            (p.from, p.to, p.billable),
            (day("2019-01-01"), day("2020-12-31"), true)
        );

        // Blank strings count as not given.
        let blanks = OptionsInput {
            on: Some(" ".into()),
            from: Some(String::new()),
            ..Default::default()
        };
        assert_eq!(resolve_options(&blanks, today).unwrap().from, today);
    }

    #[test]
    fn bad_options_give_messages() {
        let today = day("2025-03-04");
        let both = OptionsInput {
            on: Some("2020-01-01".into()),
            from: Some("2019-01-01".into()),
            ..Default::default()
        };
        assert!(resolve_options(&both, today)
            .unwrap_err()
            .contains("not both"));
        let bad = OptionsInput {
            on: Some("2020-13-01".into()),
            ..Default::default()
        };
        assert!(resolve_options(&bad, today)
            .unwrap_err()
            .contains("not a date"));
        let backwards = OptionsInput {
            from: Some("2021-01-01".into()),
            to: Some("2020-01-01".into()),
            ..Default::default()
        };
        assert!(resolve_options(&backwards, today)
            .unwrap_err()
            .contains("after it ends"));
        let half = OptionsInput {
            from: Some("2021-01-01".into()),
            ..Default::default()
        };
        assert!(resolve_options(&half, today)
            .unwrap_err()
            .contains("both a start and an end"));
    }

    fn replace(line: usize, code: &str) -> Edit {
        Edit::Replace {
            line,
            code: code.into(),
            column: None,
        }
    }

    #[test]
    fn a_code_in_a_draft_is_replaced_where_it_stands() {
        let md = "## Heart failure\n- **I5O.9** (Heart failure, unspecified)\n- I50.22, I50.99 and I10\n";
        let fixed = edit_list(md, &[replace(2, "I50.9")]).unwrap();
        assert_eq!(fixed, "## Heart failure\n- **I50.9** (Heart failure, unspecified)\n- I50.22, I50.99 and I10\n");
        let second = Edit::Replace {
            line: 3,
            code: "I50.9".into(),
            column: Some(11),
        };
        let fixed = edit_list(md, &[second]).unwrap();
        assert!(fixed.ends_with("- I50.22, I50.9 and I10\n"), "{fixed}");
        let sql = "WHERE dx IN ('E11.9', 'E1l.65')\n";
        let fixed = edit_list(
            sql,
            &[Edit::Replace {
                line: 1,
                code: "E11.65".into(),
                column: Some(24),
            }],
        )
        .unwrap();
        assert_eq!(fixed, "WHERE dx IN ('E11.9', 'E11.65')\n");
    }

    #[test]
    fn tokens_are_in_utf16_offsets() {
        let text = "é E11.9\n- I10 €\n";
        let v: serde_json::Value = serde_json::from_str(&serde_json::to_string(&serde_json::json!({"t": tokens_of(text, &rollcall::list::read(text, Reading::Auto))})).unwrap()).unwrap();
        let t = &v["t"];
        assert_eq!(t[0]["start"], 2);
        assert_eq!(t[0]["end"], 7);
        assert_eq!(t[1]["start"], 10);
        assert_eq!(t[1]["code"], "I10");
    }

    #[test]
    fn replacing_keeps_labels_and_columns() {
        let tsv = "code\tlabel\ne119\tType 2\r\nI10\thypertension\n";
        assert_eq!(
            edit_list(tsv, &[replace(2, "E11.9")]).unwrap(),
            "code\tlabel\nE11.9\tType 2\r\nI10\thypertension\n"
        );
        let csv = "label,code\n\"Diabetes, type 2\", e119 \nHypertension,I10\n";
        assert_eq!(
            edit_list(csv, &[replace(2, "E11.9")]).unwrap(),
            "label,code\n\"Diabetes, type 2\", E11.9 \nHypertension,I10\n"
        );
        let plain = "  E11 .9 diabetes\nI10 hypertension";
        assert_eq!(
            edit_list(plain, &[replace(1, "E11.9"), replace(2, "I10.0")]).unwrap(),
            "  E11.9 diabetes\nI10.0 hypertension"
        );
    }

    #[test]
    fn removing_and_adding_lines_follow_the_layout() {
        let plain = "E11.0\nE11.1\nE11.9\n";
        let edits = [
            replace(1, "E11.*"),
            Edit::Remove { line: 2 },
            Edit::Remove { line: 3 },
        ];
        assert_eq!(edit_list(plain, &edits).unwrap(), "E11.*\n");
        let add = |after, code: &str, label: Option<&str>| Edit::Add {
            after,
            code: code.into(),
            label: label.map(Into::into),
        };
        assert_eq!(
            edit_list(
                "label,code\nDiabetes,E11.9\n",
                &[add(2, "E10.9", Some("Type 1, other"))]
            )
            .unwrap(),
            "label,code\nDiabetes,E11.9\n\"Type 1, other\",E10.9\n"
        );
        assert_eq!(
            edit_list(
                "E11.9\tdiabetes\nI10\thypertension",
                &[add(1, "E10.9", Some("type 1"))]
            )
            .unwrap(),
            "E11.9\tdiabetes\nE10.9\ttype 1\nI10\thypertension"
        );
        assert_eq!(
            edit_list("E11.9 diabetes", &[add(1, "E10.9", None)]).unwrap(),
            "E11.9 diabetes\nE10.9"
        );
    }

    #[test]
    fn edits_refuse_what_they_cannot_do() {
        assert!(edit_list("E11.9\n# note\n", &[replace(2, "E10.9")])
            .unwrap_err()
            .contains("no code"));
        assert!(edit_list("E11.9", &[replace(5, "E10.9")])
            .unwrap_err()
            .contains("no line 5"));
        assert!(edit_list("E11.9", &[replace(1, "E10.9\tx")])
            .unwrap_err()
            .contains("cannot be written"));
        assert!(
            edit_list("E11.9", &[Edit::Remove { line: 1 }, replace(1, "E10.9")])
                .unwrap_err()
                .contains("removed")
        );
        assert!(edit_list("E11.9", &[Edit::Remove { line: 0 }])
            .unwrap_err()
            .contains("no line 0"));
    }

    #[test]
    fn sha256_hex_is_lower_case_hex() {
        assert_eq!(
            sha256_hex_of(b"abc"),
            "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
        );
    }
}
