//! The one reader of lists and drafts. It finds the codes in any text a
//! person brings (a plain list, CSV or TSV, markdown, prose, SQL or R or
//! Python literals, JSON and FHIR resources, a spreadsheet workbook) and
//! keeps, for each code, its line (and column, or sheet and row), the text
//! that serves as its label, and a system when the text names one.
//!
//! Nothing is lost and nothing invented: every input line comes back, a line
//! may hold several codes (one [`InputLine`] each, sharing the number), and
//! a line with no code is [`LineKind::Text`], never an error.
//!
//! - [`table`]: plain lines and CSV/TSV, read exactly as rollcall always has;
//! - [`text`]: markdown, prose and code literals, a line at a time;
//! - [`json`]: any JSON, with its own small parser that keeps line numbers;
//! - [`tokens`]: which words have a code's shape;
//! - [`edit`]: edits that keep every other character of the list;
//! - `workbook` (behind the `workbook` feature): sheets of `.xlsx`, `.xls`,
//!   `.ods`, read as tables.

pub mod edit;
pub mod json;
pub mod table;
pub mod text;
pub mod tokens;
pub mod workbook;

pub use table::{code_like, detect, split_csv, Detected, Layout};

use serde::Serialize;

/// What a line of the input is.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum LineKind {
    /// Empty or whitespace only.
    Blank,
    /// Starts with `#` or `//` (in a plain list or a table).
    Comment,
    /// The row of column names of a CSV, TSV or markdown table.
    Headings,
    /// A line of a draft with no code on it: prose, a heading, a note.
    Text,
    /// A code (or pattern) to check, with the label written beside it.
    Entry {
        /// The code as written, trimmed.
        code: String,
        /// The label, if any and not empty.
        label: Option<String>,
        /// The system as written (a system column's cell, a JSON coding's
        /// `system`, a heading naming one) or the system the code's shape
        /// makes clear in a draft; read it with
        /// [`crate::systems::System::from_cell`].
        system: Option<String>,
    },
    /// A row that cannot be read; the message says why and what to do.
    Unreadable(String),
}

/// Where a code sits, beyond its line.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Place {
    /// Byte range of the code as written in the line's text, when the code
    /// was found inside a longer line (drafts): an edit replaces exactly this.
    pub span: Option<(usize, usize)>,
    /// The workbook sheet.
    pub sheet: Option<String>,
    /// The row within the sheet (1-based).
    pub row: Option<usize>,
}

/// One code, or one line without a code, of the input.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct InputLine {
    /// 1-based line number (several entries may share one).
    pub number: usize,
    /// The line as written, without its line ending.
    pub text: String,
    /// What the line (or this code of it) is.
    pub kind: LineKind,
    /// Where the code sits in the line, or in a workbook.
    pub place: Place,
}

impl InputLine {
    /// A line read whole.
    pub fn new(number: usize, text: &str, kind: LineKind) -> Self {
        InputLine {
            number,
            text: text.to_string(),
            kind,
            place: Place::default(),
        }
    }

    /// The 1-based column (in characters) where the code starts, when it was
    /// found inside a longer line.
    pub fn column(&self) -> Option<usize> {
        let (start, _) = self.place.span?;
        Some(self.text.get(..start)?.chars().count() + 1)
    }
}

/// How to read a list: guessed, or forced when the guess is wrong.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Reading {
    /// Guess from the text.
    #[default]
    Auto,
    /// One code per line, then its label (the first word is the code).
    Lines,
    /// CSV or TSV with a code column.
    Table,
    /// A draft: markdown, prose, code literals; several codes per line.
    Text,
    /// JSON of any shape (FHIR resources included).
    Json,
    /// A spreadsheet workbook.
    Workbook,
}

impl Reading {
    /// Every reading a user can force, in the order help texts list them.
    pub const FORCED: [Reading; 5] = [
        Reading::Lines,
        Reading::Table,
        Reading::Text,
        Reading::Json,
        Reading::Workbook,
    ];

    /// The name used in options and outputs (`lines`, `table`...).
    pub fn name(self) -> &'static str {
        match self {
            Reading::Auto => "auto",
            Reading::Lines => "lines",
            Reading::Table => "table",
            Reading::Text => "text",
            Reading::Json => "json",
            Reading::Workbook => "workbook",
        }
    }

    /// The reading a name names.
    pub fn parse(name: &str) -> Option<Reading> {
        [Reading::Auto]
            .into_iter()
            .chain(Reading::FORCED)
            .find(|r| r.name() == name.trim().to_ascii_lowercase())
    }
}

/// A sheet of a workbook, as read.
#[derive(Clone, Debug, Default, PartialEq, Eq, Serialize)]
pub struct SheetRead {
    /// The sheet's name.
    pub name: String,
    /// Rows holding anything.
    pub rows: usize,
    /// Codes read from it.
    pub codes: usize,
}

/// How a list was read: the facts the report's heading is written from.
#[derive(Clone, Debug, Default, PartialEq, Eq, Serialize)]
pub struct ReadFacts {
    /// The reading used (`lines`, `table`, `text`, `json`, `workbook`).
    #[serde(rename = "as")]
    pub reading: Reading,
    /// What the text looked like: `plain lines`, `csv`, `tsv`, `markdown`,
    /// `prose`, `sql`, `r`, `code literals`, `fhir valueset`, `fhir
    /// bundle`, `json`, `workbook`.
    pub form: String,
    /// Whether the reading was forced rather than guessed.
    pub forced: bool,
    /// Codes (and patterns) read.
    pub codes: usize,
    /// Lines holding at least one code.
    pub lines_with_codes: usize,
    /// Lines of the input (rows of all sheets for a workbook).
    pub lines: usize,
    /// The sheets of a workbook, in order; those with no code included.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub sheets: Vec<SheetRead>,
    /// Things the reader saw and did not take (a FHIR `compose.exclude`,
    /// JSON that could not be parsed and was read as text).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub notes: Vec<String>,
}

impl ReadFacts {
    /// The facts of `lines` read as `reading` out of `count` input lines.
    fn of<'l>(
        lines: impl Iterator<Item = &'l InputLine>,
        reading: Reading,
        form: &str,
        forced: bool,
        count: usize,
    ) -> ReadFacts {
        let kinds = lines.map(|l| (l.number, matches!(l.kind, LineKind::Entry { .. })));
        ReadFacts::counted(kinds, reading, form, forced, count)
    }

    /// [`ReadFacts::of`] from each line's number and whether it holds a code.
    fn counted(
        lines: impl Iterator<Item = (usize, bool)>,
        reading: Reading,
        form: &str,
        forced: bool,
        count: usize,
    ) -> ReadFacts {
        let (mut codes, mut lines_with_codes, mut last) = (0, 0, None);
        for (number, _) in lines.filter(|(_, entry)| *entry) {
            codes += 1;
            // Several codes of one line are one line with codes.
            if last != Some(number) {
                lines_with_codes += 1;
            }
            last = Some(number);
        }
        ReadFacts {
            reading,
            form: form.to_string(),
            forced,
            codes,
            lines_with_codes,
            lines: count,
            sheets: Vec::new(),
            notes: Vec::new(),
        }
    }

    /// Whether the list was read as rollcall read lists before drafts
    /// (plain lines or a table), so reports need not say how.
    pub fn as_before(&self) -> bool {
        matches!(self.reading, Reading::Lines | Reading::Table) && !self.forced
    }
}

/// A list as read: its lines (one per code, or per line without one) and
/// how it was read.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Draft {
    /// In input order; several may share a line number.
    pub lines: Vec<InputLine>,
    /// How it was read.
    pub facts: ReadFacts,
}

impl Draft {
    fn finish(
        lines: Vec<InputLine>,
        reading: Reading,
        form: &str,
        forced: bool,
        count: usize,
    ) -> Draft {
        Draft {
            facts: ReadFacts::of(lines.iter(), reading, form, forced, count),
            lines,
        }
    }

    /// The number of input lines (rows of every sheet for a workbook).
    pub fn line_count(&self) -> usize {
        self.facts.lines
    }

    /// A draft with every line outside `keep` blanked (column headings
    /// kept), for checking one part of a list on its own with the line
    /// numbers, layout and headings of the whole.
    pub fn only(&self, keep: impl Fn(usize) -> bool) -> Draft {
        Draft {
            lines: self
                .lines
                .iter()
                .enumerate()
                .map(|(i, l)| {
                    if keep(i) || l.kind == LineKind::Headings {
                        l.clone()
                    } else {
                        InputLine {
                            kind: LineKind::Blank,
                            ..l.clone()
                        }
                    }
                })
                .collect(),
            facts: self.facts.clone(),
        }
    }
}

/// The lines of `text`, split at `\n`, `\r\n` or a lone `\r` (old Mac
/// files), without a leading byte-order mark. A final line ending adds no
/// empty line. Each `\n` is found once with a fast byte search, and a `\r`
/// looked for only before it, so a file of lone `\r`s stays linear.
pub fn lines_of(text: &str) -> impl Iterator<Item = &str> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let bytes = text.as_bytes();
    let mut at = 0;
    // The next `\n` at or after `at` (the end of the text when none is left),
    // once found.
    let mut next_nl: Option<usize> = None;
    std::iter::from_fn(move || {
        if at >= bytes.len() {
            return None;
        }
        let nl = match next_nl {
            Some(n) if n >= at => n,
            _ => text[at..].find('\n').map_or(bytes.len(), |i| at + i),
        };
        next_nl = Some(nl);
        let before = &bytes[at..nl];
        let end = if before.contains(&b'\r') {
            before
                .iter()
                .position(|&b| b == b'\r')
                .map_or(nl, |i| at + i)
        } else {
            nl
        };
        let line = &text[at..end];
        at = if bytes.get(end) == Some(&b'\r') && bytes.get(end + 1) == Some(&b'\n') {
            end + 2
        } else {
            end + 1
        };
        Some(line)
    })
}

/// Reads a list (see the module docs): `reading` forces a reading, or
/// [`Reading::Auto`] guesses it. [`Reading::Workbook`] needs the file's
/// bytes ([`read_bytes`]); given text, it reads the text as a table.
pub fn read(text: &str, reading: Reading) -> Draft {
    match choose(text, reading) {
        Choice::Laid(laid) => {
            // One line read for each line of the text.
            let lines = table::read_laid_out(text, laid.detected);
            let count = lines.len();
            Draft::finish(lines, laid.reading, laid.form, laid.forced, count)
        }
        Choice::Read(draft) => draft,
    }
}

/// A reading as plain lines or a table: each line is read on its own.
struct Laid {
    detected: Detected,
    reading: Reading,
    form: &'static str,
    forced: bool,
}

/// How [`read`] reads a text: laid out (line by line), or read whole.
enum Choice {
    Laid(Laid),
    Read(Draft),
}

fn choose(text: &str, reading: Reading) -> Choice {
    let laid = |detected: Detected, reading, form, forced| {
        Choice::Laid(Laid {
            detected,
            reading,
            form,
            forced,
        })
    };
    match reading {
        Reading::Lines => {
            let detected = Detected {
                layout: Layout::Plain,
                headings: false,
                system: None,
            };
            laid(detected, Reading::Lines, "plain lines", true)
        }
        Reading::Table | Reading::Workbook => {
            let detected = table::detect_table(text);
            let form = form_of_layout(detected.layout);
            laid(detected, Reading::Table, form, true)
        }
        Reading::Text => Choice::Read(text::read(text, true)),
        Reading::Json => Choice::Read(json::read(text, true)),
        Reading::Auto => {
            let t = text.trim_start_matches('\u{feff}').trim_start();
            if t.starts_with(['{', '[']) {
                if let Some(d) = json::try_read(text) {
                    return Choice::Read(d);
                }
            }
            let detected = detect(text);
            if detected.layout != Layout::Plain {
                let form = form_of_layout(detected.layout);
                return laid(detected, Reading::Table, form, false);
            }
            if text::reads_as_lines(text) {
                return laid(detected, Reading::Lines, "plain lines", false);
            }
            let mut d = text::read(text, false);
            if t.starts_with(['{', '[']) {
                d.facts.notes.push(
                    "the text starts like JSON but is not valid JSON, so it was read as text"
                        .into(),
                );
            }
            Choice::Read(d)
        }
    }
}

/// The lines of a list as a check walks them. A check walks them twice
/// (what the list holds, then each entry), so a list read line by line is
/// read again rather than held.
pub trait Lines {
    /// How the list was read.
    fn facts(&self) -> &ReadFacts;
    /// The lines, in input order.
    fn walk(&self) -> Box<dyn Iterator<Item = std::borrow::Cow<'_, InputLine>> + '_>;
    /// Whether the lines are held in memory, so that what a walk made of
    /// them is worth keeping for the next.
    fn held(&self) -> bool;
    /// Whether any line names its system (a system column's cell, a JSON
    /// coding's `system`, a heading naming one).
    fn names_systems(&self) -> bool {
        self.walk().any(|l| {
            matches!(
                l.kind,
                LineKind::Entry {
                    system: Some(_),
                    ..
                }
            )
        })
    }
}

impl Lines for Draft {
    fn facts(&self) -> &ReadFacts {
        &self.facts
    }
    fn walk(&self) -> Box<dyn Iterator<Item = std::borrow::Cow<'_, InputLine>> + '_> {
        Box::new(self.lines.iter().map(std::borrow::Cow::Borrowed))
    }
    fn held(&self) -> bool {
        true
    }
}

/// A list as read, kept as small as its reading allows: a plain list or a
/// table keeps only its text and layout and reads each line again when it
/// is walked (a million-line list is never a million [`InputLine`]s at
/// once); any other reading keeps its [`Draft`]. It reads the same lines as
/// [`read`].
pub struct Listing(Kept);

enum Kept {
    Laid {
        text: String,
        detected: Detected,
        facts: ReadFacts,
    },
    Read(Draft),
}

impl Listing {
    /// Reads `text` as [`read`] does, keeping the text.
    pub fn of(text: String, reading: Reading) -> Listing {
        Listing(match choose(&text, reading) {
            Choice::Laid(laid) => {
                // Lines are numbered from 1 without a gap: the last number is their count.
                let mut count = 0;
                let lines = table::entry_lines(&text, laid.detected).inspect(|&(n, _)| count = n);
                let mut facts = ReadFacts::counted(lines, laid.reading, laid.form, laid.forced, 0);
                facts.lines = count;
                Kept::Laid {
                    text,
                    detected: laid.detected,
                    facts,
                }
            }
            Choice::Read(draft) => Kept::Read(draft),
        })
    }

    /// The lines, all read (as [`read`] returns them).
    pub fn into_draft(self) -> Draft {
        match self.0 {
            Kept::Laid {
                text,
                detected,
                facts,
            } => Draft {
                lines: table::read_laid_out(&text, detected),
                facts,
            },
            Kept::Read(draft) => draft,
        }
    }
}

impl Lines for Listing {
    fn facts(&self) -> &ReadFacts {
        match &self.0 {
            Kept::Laid { facts, .. } => facts,
            Kept::Read(draft) => &draft.facts,
        }
    }
    fn walk(&self) -> Box<dyn Iterator<Item = std::borrow::Cow<'_, InputLine>> + '_> {
        match &self.0 {
            Kept::Laid { text, detected, .. } => {
                Box::new(table::laid_out(text, *detected).map(std::borrow::Cow::Owned))
            }
            Kept::Read(draft) => draft.walk(),
        }
    }
    fn held(&self) -> bool {
        matches!(self.0, Kept::Read(_))
    }
    fn names_systems(&self) -> bool {
        match &self.0 {
            // Only a system column gives a laid-out line a system.
            Kept::Laid { detected, .. } if detected.system.is_none() => false,
            Kept::Laid { .. } => self.walk().any(|l| {
                matches!(
                    l.kind,
                    LineKind::Entry {
                        system: Some(_),
                        ..
                    }
                )
            }),
            Kept::Read(draft) => draft.names_systems(),
        }
    }
}

fn form_of_layout(layout: Layout) -> &'static str {
    match layout {
        Layout::Plain => "plain lines",
        Layout::Csv(..) => "csv",
        Layout::Tsv(..) => "tsv",
    }
}

/// Why a file could not be read at all.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ReadError {
    /// What went wrong and what to do, as a sentence.
    pub message: String,
}

impl std::fmt::Display for ReadError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.message)
    }
}

impl std::error::Error for ReadError {}

/// Whether the bytes are a spreadsheet workbook (a zip container, as
/// `.xlsx` and `.ods` are, or an OLE2 file, as `.xls` is).
pub fn is_workbook(bytes: &[u8]) -> bool {
    bytes.starts_with(b"PK\x03\x04")
        || bytes.starts_with(&[0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1])
}

/// Reads a list from a file's bytes: a workbook (when built with the
/// `workbook` feature), or text in UTF-8 (with or without a byte-order
/// mark) or UTF-16 (with its mark).
pub fn read_bytes(bytes: &[u8], reading: Reading) -> Result<Draft, ReadError> {
    if reading == Reading::Workbook || (reading == Reading::Auto && is_workbook(bytes)) {
        #[cfg(feature = "workbook")]
        return workbook::read_workbook(bytes);
        #[cfg(not(feature = "workbook"))]
        return Err(ReadError {
            message: "this is a spreadsheet workbook, and this build of rollcall reads no workbooks; save the sheet as CSV (CSV UTF-8) and try again".into(),
        });
    }
    let text = decode(bytes)?;
    Ok(read(&text, reading))
}

/// [`read_bytes`] into a [`Listing`]: a plain list or a table is kept as
/// its text (the bytes themselves when they are UTF-8), not as its lines.
pub fn read_listing(bytes: Vec<u8>, reading: Reading) -> Result<Listing, ReadError> {
    if reading == Reading::Workbook || (reading == Reading::Auto && is_workbook(&bytes)) {
        return read_bytes(&bytes, reading).map(|d| Listing(Kept::Read(d)));
    }
    let text = if bytes.starts_with(&[0xFF, 0xFE]) || bytes.starts_with(&[0xFE, 0xFF]) {
        decode(&bytes)?
    } else {
        String::from_utf8(bytes).map_err(|e| not_utf8(e.as_bytes(), e.utf8_error()))?
    };
    Ok(Listing::of(text, reading))
}

/// The error of bytes that are not UTF-8, naming the first bad line.
fn not_utf8(bytes: &[u8], e: std::str::Utf8Error) -> ReadError {
    let at = e.valid_up_to();
    let line = bytes[..at].iter().filter(|&&b| b == b'\n').count() + 1;
    ReadError {
        message: format!(
            "line {line} is not UTF-8 text; save the list as UTF-8 (in a spreadsheet: CSV UTF-8) and try again"
        ),
    }
}

/// Text from bytes: UTF-8, or UTF-16 in either byte order with its mark.
pub fn decode(bytes: &[u8]) -> Result<String, ReadError> {
    let utf16 = |le: bool| -> Result<String, ReadError> {
        let body = &bytes[2..];
        let units: Vec<u16> = body
            .chunks_exact(2)
            .map(|c| {
                if le {
                    u16::from_le_bytes([c[0], c[1]])
                } else {
                    u16::from_be_bytes([c[0], c[1]])
                }
            })
            .collect();
        if body.len() % 2 == 1 {
            return Err(ReadError {
                message: "the file is UTF-16 text with an odd number of bytes, so its last character is cut; save it again (in a spreadsheet: CSV UTF-8) and try again".into(),
            });
        }
        let mut out = String::with_capacity(units.len());
        let mut line = 1;
        for c in char::decode_utf16(units.iter().copied()) {
            match c {
                Ok(c) => {
                    line += usize::from(c == '\n');
                    out.push(c);
                }
                Err(_) => {
                    return Err(ReadError {
                        message: format!(
                            "line {line} is not UTF-16 text, though the file says it is (a lone surrogate); save the list again as UTF-8 and try again"
                        ),
                    })
                }
            }
        }
        Ok(out)
    };
    if bytes.starts_with(&[0xFF, 0xFE]) {
        return utf16(true);
    }
    if bytes.starts_with(&[0xFE, 0xFF]) {
        return utf16(false);
    }
    match std::str::from_utf8(bytes) {
        Ok(t) => Ok(t.to_string()),
        Err(e) => Err(not_utf8(bytes, e)),
    }
}

/// Reads a list with the guessed reading (see [`read`]) and says how it was
/// laid out when it was read as plain lines or a table. Kept for callers of
/// the table reader; new code uses [`read`].
pub fn parse_list(text: &str) -> (Layout, Vec<InputLine>) {
    let d = read(text, Reading::Auto);
    let layout = if d.facts.reading == Reading::Table {
        detect(text).layout
    } else {
        Layout::Plain
    };
    (layout, d.lines)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The splitting as first written (find the next `\n` or `\r`), the
    /// oracle for the quicker one on every text of up to eight characters
    /// over `a`, `\r`, `\n` and a byte-order mark.
    #[test]
    fn lines_are_split_as_by_the_plain_rule() {
        fn plain(text: &str) -> Vec<&str> {
            let mut rest = text.strip_prefix('\u{feff}').unwrap_or(text);
            let mut out = Vec::new();
            while !rest.is_empty() {
                match rest.find(['\n', '\r']) {
                    None => {
                        out.push(rest);
                        rest = "";
                    }
                    Some(i) => {
                        out.push(&rest[..i]);
                        let skip = if rest[i..].starts_with("\r\n") { 2 } else { 1 };
                        rest = &rest[i + skip..];
                    }
                }
            }
            out
        }
        let alphabet = ["a", "\r", "\n", "\u{feff}"];
        for len in 0..=8u32 {
            for n in 0..4usize.pow(len) {
                let mut text = String::new();
                let mut k = n;
                for _ in 0..len {
                    text.push_str(alphabet[k % 4]);
                    k /= 4;
                }
                let got: Vec<&str> = lines_of(&text).collect();
                assert_eq!(got, plain(&text), "{text:?}");
            }
        }
    }

    #[test]
    fn lone_carriage_returns_end_lines() {
        let got: Vec<&str> = lines_of("\u{feff}E11.9 a\rI10 b\r\nE78.5\r").collect();
        assert_eq!(got, ["E11.9 a", "I10 b", "E78.5"]);
        let d = read(
            "E11.9 Type 2 diabetes\rI10 Essential hypertension\rE78.5\r",
            Reading::Auto,
        );
        assert_eq!(d.lines.len(), 3);
    }

    #[test]
    fn readings_have_names() {
        for r in Reading::FORCED {
            assert_eq!(Reading::parse(r.name()), Some(r));
        }
        assert_eq!(Reading::parse("JSON"), Some(Reading::Json));
        assert_eq!(Reading::parse("xml"), None);
    }

    #[test]
    fn utf16_in_both_orders() {
        let le: Vec<u8> = [0xFF, 0xFE]
            .into_iter()
            .chain("E11.9\n".encode_utf16().flat_map(u16::to_le_bytes))
            .collect();
        let be: Vec<u8> = [0xFE, 0xFF]
            .into_iter()
            .chain("E11.9\n".encode_utf16().flat_map(u16::to_be_bytes))
            .collect();
        assert_eq!(decode(&le).unwrap(), "E11.9\n");
        assert_eq!(decode(&be).unwrap(), "E11.9\n");
        assert!(decode(&le[..le.len() - 1])
            .unwrap_err()
            .message
            .contains("odd number"));
    }
}
