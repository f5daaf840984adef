//! The checker the page holds: one index opened from its bytes and
//! verified, the companions added beside it, its notes, and the checks of a
//! list, a file, a workbook's sheets and two lists compared.

use crate::js::{
    fail, install_panic_hook, json_text, to_js, today, JsCheckOptions, JsCoverage, JsIndexInfo,
    JsReport,
};
use crate::manifest::{describe_index, IndexInfo};
use crate::options::read_options;
use rollcall::list::Reading;
use rollcall::mixed::Primary;
use rollcall::{CheckOptions, Index};
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

/// A loaded, verified index and the last check made with it.
#[wasm_bindgen]
pub struct Checker {
    pub(crate) index: Index<Vec<u8>>,
    info: IndexInfo,
    /// Category coverage of the last checked list, from the same pass.
    pub(crate) last: Option<Vec<rollcall::CategoryCoverage>>,
    /// Indexes of other systems, for naming their codes in this one's lists
    /// (the ICD-9-CM index and its GEMs beside ICD-10-CM).
    pub(crate) companions: Vec<Index<Vec<u8>>>,
}

#[wasm_bindgen]
impl Checker {
    /// Open an index from its bytes and verify its internal checksum.
    /// Throws an `Error` saying what is wrong with a missing, truncated,
    /// corrupted or wrong-version file.
    #[wasm_bindgen(constructor)]
    pub fn new(bytes: Vec<u8>) -> Result<Checker, JsValue> {
        Checker::opened(bytes, None)
    }

    /// [`Checker::new`] with the SHA-256 of the index's content (its bytes
    /// from [`index_content_start`]) computed by the browser,
    /// which is several times faster than hashing here; the digest is held
    /// against the header's as the constructor's own would be.
    #[wasm_bindgen(js_name = withDigest)]
    pub fn with_digest(bytes: Vec<u8>, digest: Vec<u8>) -> Result<Checker, JsValue> {
        Checker::opened(bytes, Some(digest))
    }

    fn opened(bytes: Vec<u8>, digest: Option<Vec<u8>>) -> Result<Checker, JsValue> {
        install_panic_hook();
        if bytes.is_empty() {
            return Err(fail("cannot open the index", "the file is empty"));
        }
        let len = bytes.len() as u64;
        let index = Index::open(bytes).map_err(|e| fail("cannot open the index", e))?;
        // One pass over the bytes: the content's hash is compared with the
        // header's; the page then compares that checksum with the manifest's.
        match digest {
            Some(d) => index.verify_digest(&d),
            None => index.verify(),
        }
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
        let out = json_text(&report)?;
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
        let out = json_text(&report)?;
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
        let out = json_text(&report)?;
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
        let views = self.companion_views();
        let c = rollcall::compare::compare_among(
            &self.index,
            &views,
            ("A", text_a),
            ("B", text_b),
            &opts,
        );
        json_text(&c)
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
        let opts = self.shape_options(options)?;
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
        let report =
            rollcall::mixed::check_list(Primary::Shapes(s), &self.loaded_indexes(), text, &opts);
        let out = json_text(&report)?;
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

    /// For each category in the last checked list: billable codes included of
    /// all billable codes under it in the checked period.
    pub fn coverage(&self) -> Result<JsCoverage, JsValue> {
        let Some(cov) = &self.last else {
            return Err(fail("no coverage yet", "check a list first"));
        };
        Ok(to_js(cov)?.unchecked_into())
    }
}

/// What the other parts of the binding share: the check through the core's
/// one door, and the page's options with the right default day.
impl Checker {
    pub(crate) fn checked(
        &self,
        draft: &rollcall::list::Draft,
        opts: &CheckOptions,
    ) -> (rollcall::Report, Vec<rollcall::CategoryCoverage>) {
        // Rows whose system column names a companion's system are checked
        // in it; a list without system cells is checked as before.
        let others: Vec<&Index<Vec<u8>>> = self.companions.iter().collect();
        rollcall::mixed::check_listed_draft(Primary::Index(&self.index), &others, draft, opts)
    }

    /// This index and the companions, for a check by system column.
    pub(crate) fn loaded_indexes(&self) -> Vec<&Index<Vec<u8>>> {
        std::iter::once(&self.index)
            .chain(&self.companions)
            .collect()
    }

    /// The companions' views, for mappings and other systems' codes.
    pub(crate) fn companion_views(&self) -> Vec<rollcall::View<'_>> {
        self.companions.iter().map(|c| c.view()).collect()
    }

    /// The check options the page sends; with no day or period, the index's
    /// default day (`Meta::default_day`).
    pub(crate) fn options(&self, options: JsCheckOptions) -> Result<CheckOptions, JsValue> {
        Ok(self.options_and_reading(options)?.0)
    }

    /// The options and the reading the page sends, with the index's default day.
    pub(crate) fn options_and_reading(
        &self,
        options: JsCheckOptions,
    ) -> Result<(CheckOptions, Reading), JsValue> {
        read_options(options, self.index.meta().default_day(today()))
    }

    /// The options for a check by shape alone: with no day or period, today.
    pub(crate) fn shape_options(&self, options: JsCheckOptions) -> Result<CheckOptions, JsValue> {
        Ok(read_options(options, today())?.0)
    }
}

/// Where the bytes an index's checksum covers start (the rest of the file
/// from there), for [`Checker::with_digest`].
#[wasm_bindgen(js_name = indexContentStart)]
pub fn index_content_start() -> usize {
    rollcall::index::CONTENT_START
}
