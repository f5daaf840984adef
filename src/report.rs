//! The report a check returns: one entry per input line, findings per entry
//! and for the whole list, and a summary. Its JSON form (serde) is the stable
//! schema documented in the README; the field names are part of it.

use crate::date::Date;
use crate::model::Source;
use serde::Serialize;

/// How serious a finding is.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Severity {
    /// The list is wrong for the period; exit status 1.
    Error,
    /// Probably not what was meant; worth a look.
    Warning,
    /// Worth knowing; nothing to fix.
    Info,
}

impl Severity {
    /// The lower-case name used in every output.
    pub fn name(self) -> &'static str {
        match self {
            Severity::Error => "error",
            Severity::Warning => "warning",
            Severity::Info => "info",
        }
    }
}

/// The kinds of finding; the names are stable (see the README for each rule).
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Kind {
    /// Written differently from the official form, but clearly this code.
    Normalized,
    /// Cannot be a code of this vocabulary.
    Malformed,
    /// Well formed, but in no release the index covers.
    Unknown,
    /// Valid only before the period.
    Retired,
    /// Valid only after the period.
    NotYetValid,
    /// A header (not billable) throughout the period.
    Header,
    /// Billable for part of the period only.
    PartialPeriod,
    /// The same code on more than one line.
    Duplicate,
    /// Already covered by an ancestor or a pattern in the list.
    Redundant,
    /// Every billable code under a node is in the list.
    RollUp,
    /// Most, not all, billable codes under a node are in the list.
    SiblingGap,
    /// A pattern or range, with what it matches.
    Pattern,
    /// A pattern or range that matches nothing in the period.
    PatternEmpty,
    /// Not a code of the index's vocabulary, but shaped like a code of
    /// another system.
    OtherSystem,
    /// Checked by shape (and check digit) alone: the system's content is
    /// not bundled, so existence cannot be checked.
    ShapeOnly,
    /// Could be several codes of the system (a hyphen-less 10-digit NDC).
    Ambiguous,
    /// The label written beside a code does not fit its official description.
    LabelMismatch,
    /// The label beside a code fits no code well: rollcall does not
    /// understand it, so it cannot say the label contradicts the code.
    LabelUnrecognised,
    /// Valid, but the release qualifies its use (LOINC `DISCOURAGED`, `TRIAL`).
    ReleaseStatus,
    /// The period runs past the last day the index knows the vocabulary.
    BeyondCoverage,
    /// A code of the list's system that is also, written the same way, a
    /// code of another index at hand (ICD-9-CM's V10.3 beside ICD-10-CM's):
    /// checked in the list's system.
    TwoSystems,
}

impl Kind {
    /// The stable name (`not-yet-valid`).
    pub fn name(self) -> &'static str {
        match self {
            Kind::Normalized => "normalized",
            Kind::Malformed => "malformed",
            Kind::Unknown => "unknown",
            Kind::Retired => "retired",
            Kind::NotYetValid => "not-yet-valid",
            Kind::Header => "header",
            Kind::PartialPeriod => "partial-period",
            Kind::Duplicate => "duplicate",
            Kind::Redundant => "redundant",
            Kind::RollUp => "roll-up",
            Kind::SiblingGap => "sibling-gap",
            Kind::Pattern => "pattern",
            Kind::PatternEmpty => "pattern-empty",
            Kind::OtherSystem => "other-system",
            Kind::ShapeOnly => "shape-only",
            Kind::Ambiguous => "ambiguous",
            Kind::LabelMismatch => "label-mismatch",
            Kind::LabelUnrecognised => "label-unrecognised",
            Kind::ReleaseStatus => "release-status",
            Kind::BeyondCoverage => "beyond-coverage",
            Kind::TwoSystems => "two-systems",
        }
    }
}

/// What an entry turned out to be.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Status {
    /// Billable throughout the period.
    Valid,
    /// A header throughout the period.
    Header,
    /// Billable for part of the period.
    Partial,
    /// Valid only before the period.
    Retired,
    /// Valid only after the period.
    NotYetValid,
    /// Well formed, in no release.
    Unknown,
    /// Not a code of this vocabulary.
    Malformed,
    /// A pattern or range.
    Pattern,
    /// A code of another system than the one checked.
    OtherSystem,
    /// Has the system's shape; its content is not bundled.
    ShapeOnly,
    /// Could be several codes (a hyphen-less 10-digit NDC).
    Ambiguous,
    /// A blank line (skipped).
    Blank,
    /// A comment line (skipped).
    Comment,
    /// The column headings of a CSV or TSV (skipped).
    ColumnHeadings,
    /// A line of a draft with no code on it: prose, a heading (skipped).
    Text,
}

impl Status {
    /// The stable name used in every output (`not-yet-valid`).
    pub fn name(self) -> &'static str {
        match self {
            Status::Valid => "valid",
            Status::Header => "header",
            Status::Partial => "partial",
            Status::Retired => "retired",
            Status::NotYetValid => "not-yet-valid",
            Status::Unknown => "unknown",
            Status::Malformed => "malformed",
            Status::Pattern => "pattern",
            Status::OtherSystem => "other-system",
            Status::ShapeOnly => "shape-only",
            Status::Ambiguous => "ambiguous",
            Status::Blank => "blank",
            Status::Comment => "comment",
            Status::ColumnHeadings => "column-headings",
            Status::Text => "text",
        }
    }

    /// Whether the line was skipped rather than checked.
    pub fn skipped(self) -> bool {
        matches!(
            self,
            Status::Blank | Status::Comment | Status::ColumnHeadings | Status::Text
        )
    }
}

/// A code to consider instead, or in addition.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Suggestion {
    /// What to write (dotted code or a pattern).
    pub code: String,
    /// Its official description.
    pub description: String,
    /// Why it is suggested.
    pub reason: String,
}

/// A finding on one entry.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Finding {
    /// Kind.
    pub kind: Kind,
    /// Severity.
    pub severity: Severity,
    /// A sentence for people.
    pub message: String,
    /// Codes to consider.
    pub suggestions: Vec<Suggestion>,
}

/// One input line and what was found on it.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Entry {
    /// 1-based line number.
    pub line: usize,
    /// The line as written.
    pub input: String,
    /// The code it was read as (dotted), or the pattern, if any.
    pub code: Option<String>,
    /// The code system the entry was checked in (`icd10cm`, `loinc`, ...);
    /// for an `other-system` entry, the one system its shape fits, if only
    /// one; none for skipped lines.
    pub system: Option<String>,
    /// The label written beside the code.
    pub label: Option<String>,
    /// The official description of the code.
    pub description: Option<String>,
    /// What the entry is.
    pub status: Status,
    /// Findings, most severe first.
    pub findings: Vec<Finding>,
    /// The 1-based column (in characters) where the code starts, when it
    /// was found inside a longer line of a draft.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub column: Option<usize>,
    /// The workbook sheet the entry was read from.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub sheet: Option<String>,
    /// Its row in that sheet (1-based).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub row: Option<usize>,
}

impl Entry {
    /// The entry of one input line (or one code of it), before it is judged:
    /// `malformed` until a check says what it is.
    pub fn of(l: &crate::list::InputLine) -> Entry {
        Entry {
            line: l.number,
            input: l.text.clone(),
            code: None,
            system: None,
            label: match &l.kind {
                crate::list::LineKind::Entry { label, .. } => label.clone(),
                _ => None,
            },
            description: None,
            status: Status::Malformed,
            findings: Vec::new(),
            column: l.column(),
            sheet: l.place.sheet.clone(),
            row: l.place.row,
        }
    }
}

/// A finding about several lines together.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct ListFinding {
    /// Kind.
    pub kind: Kind,
    /// Severity.
    pub severity: Severity,
    /// The lines concerned.
    pub lines: Vec<usize>,
    /// The codes concerned (dotted).
    pub codes: Vec<String>,
    /// A sentence for people.
    pub message: String,
    /// Codes to consider.
    pub suggestions: Vec<Suggestion>,
    /// `beyond-coverage`: the last day the index knows (the period's end is
    /// the report's `options.to`). Absent for every other kind.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub coverage_to: Option<Date>,
}

/// The index a report was made against.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct IndexInfo {
    /// Release tag.
    pub release: String,
    /// First day covered.
    pub coverage_from: Date,
    /// Last day covered.
    pub coverage_to: Date,
    /// Source files.
    pub sources: Vec<Source>,
    /// Credit the release's licence asks to show (HPO); absent when none.
    #[serde(skip_serializing_if = "String::is_empty")]
    pub notice: String,
}

/// The options a report was made with.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct OptionsInfo {
    /// The single reference date, when one was given.
    pub on: Option<Date>,
    /// First day of the study period.
    pub from: Date,
    /// Last day of the study period.
    pub to: Date,
    /// Whether billable codes were required.
    pub billable: bool,
    /// The vocabulary is one release (HPO): codes were judged as of that
    /// release, `on`, whatever study period was asked for. Absent otherwise.
    #[serde(skip_serializing_if = "std::ops::Not::not")]
    pub single_release: bool,
}

/// Counts over the whole report.
#[derive(Clone, Debug, Default, PartialEq, Eq, Serialize)]
pub struct Summary {
    /// Input lines.
    pub lines: usize,
    /// Lines holding a code or pattern.
    pub entries: usize,
    /// Error-level findings.
    pub errors: usize,
    /// Warnings.
    pub warnings: usize,
    /// Infos.
    pub infos: usize,
    /// Entries per code system (`system` of each entry), in name order.
    pub systems: std::collections::BTreeMap<String, usize>,
    /// For a list with a system column: the rows of each system and what
    /// they were checked against; absent for a list of one system.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub by_system: Vec<SystemPart>,
}

/// The rows of one system in a list with a system column.
#[derive(Clone, Debug, Default, PartialEq, Eq, Serialize)]
pub struct SystemPart {
    /// The system's name (`icd10pcs`).
    pub system: String,
    /// Its title (`ICD-10-PCS`).
    pub title: String,
    /// `index` (checked against a loaded index), `shape` (rollcall ships no
    /// content: shape and check digit only) or `not-loaded` (bundled, but
    /// its index was not loaded: shape only, with a warning per row).
    pub checked: String,
    /// The index's release, when checked against one.
    pub release: Option<String>,
    /// Credit that index's licence asks to show (HPO); absent when none.
    #[serde(skip_serializing_if = "String::is_empty")]
    pub notice: String,
    /// Rows holding a code or pattern.
    pub entries: usize,
    /// Error-level findings on these rows and in their list findings.
    pub errors: usize,
    /// Warnings, likewise.
    pub warnings: usize,
    /// Infos, likewise.
    pub infos: usize,
}

/// The result of checking one list.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Report {
    /// Vocabulary id (`icd10cm`).
    pub vocabulary: String,
    /// How the list was read; absent for a list read as plain lines or a
    /// table without being told to.
    #[serde(skip_serializing_if = "crate::list::ReadFacts::as_before")]
    pub reading: crate::list::ReadFacts,
    /// The index used.
    pub index: IndexInfo,
    /// The options used.
    pub options: OptionsInfo,
    /// One per input line.
    pub entries: Vec<Entry>,
    /// Findings about the list as a whole.
    pub list_findings: Vec<ListFinding>,
    /// Counts.
    pub summary: Summary,
}

impl Finding {
    /// A finding.
    pub fn new(
        kind: Kind,
        severity: Severity,
        message: String,
        suggestions: Vec<Suggestion>,
    ) -> Self {
        Finding {
            kind,
            severity,
            message,
            suggestions,
        }
    }
}

impl OptionsInfo {
    /// The options of a check over `period`.
    pub fn of(period: &crate::model::Period, billable: bool) -> Self {
        OptionsInfo {
            on: (period.from == period.to).then_some(period.from),
            from: period.from,
            to: period.to,
            billable,
            single_release: false,
        }
    }

    /// The options of a check over `period` against an index of `meta`
    /// (one release only, HPO, says so).
    pub fn against(
        meta: &crate::model::Meta,
        period: &crate::model::Period,
        billable: bool,
    ) -> Self {
        OptionsInfo {
            single_release: meta.snapshot(),
            ..OptionsInfo::of(period, billable)
        }
    }
}

impl IndexInfo {
    /// What a report says of the index of `meta`.
    pub fn of(meta: &crate::model::Meta) -> Self {
        IndexInfo {
            release: meta.release.clone(),
            coverage_from: meta.coverage_from,
            coverage_to: meta.coverage_to,
            sources: meta.sources.clone(),
            notice: meta.notice.clone(),
        }
    }
}

impl Summary {
    /// The counts of a finished report: lines, entries, findings by
    /// severity, entries per system.
    pub fn of(lines: usize, entries: &[Entry], list_findings: &[ListFinding]) -> Self {
        let mut summary = Summary {
            lines,
            ..Summary::default()
        };
        entries.iter().for_each(|e| summary.count_entry(e));
        list_findings
            .iter()
            .for_each(|f| summary.count_severity(f.severity));
        summary
    }

    /// Counts one more entry and its findings (for a report written entry
    /// by entry, whose entries are not kept).
    pub fn count_entry(&mut self, e: &Entry) {
        self.entries += usize::from(!e.status.skipped());
        if let Some(sys) = &e.system {
            match self.systems.get_mut(sys) {
                Some(n) => *n += 1,
                None => {
                    self.systems.insert(sys.clone(), 1);
                }
            }
        }
        e.findings
            .iter()
            .for_each(|f| self.count_severity(f.severity));
    }

    /// Counts one more finding of `severity`.
    pub fn count_severity(&mut self, severity: Severity) {
        match severity {
            Severity::Error => self.errors += 1,
            Severity::Warning => self.warnings += 1,
            Severity::Info => self.infos += 1,
        }
    }
}

impl Report {
    /// Whether any finding is an error (the CLI's exit status 1).
    pub fn has_errors(&self) -> bool {
        self.summary.errors > 0
    }
}

/// `a` or `an` before a system's title (`an ICD-10-CM`).
pub(crate) fn article(title: &str) -> &'static str {
    if title.starts_with(['I', 'H', 'N', 'R', 'A', 'E', 'O']) && !title.starts_with("HCPCS") {
        "an"
    } else {
        "a"
    }
}
