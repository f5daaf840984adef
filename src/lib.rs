//! rollcall checks clinical code lists against dated vocabulary releases.
//!
//! The core knows nothing of files or browsers: it takes index bytes and list
//! text and returns a [`Report`].
//!
//! - [`Index`] opens an index file written by `vocab-build` (zero-copy; the
//!   large tables stay in the caller's bytes) and [`View`] answers lookups:
//!   code to ordinal through an `fst` map, then side tables by ordinal
//!   (billable and header spans, parent and subtree, successors, descriptions).
//! - [`list::read`] reads any list or draft (plain lines, CSV/TSV, markdown,
//!   prose, code literals, JSON and FHIR resources, workbooks) into entries,
//!   keeping every line; several codes on one line are each an entry.
//! - [`check`] runs the per-entry and whole-list checks for a study period.
//! - [`mixed::check_list`] checks a list with a system column, each row in the
//!   system it names (an index, or the shape rules of [`systems`]).
//! - [`compare`] checks two lists and compares the billable codes they reach.
//! - [`export`] writes a checked list on: the cleaned list, a FHIR ValueSet,
//!   and every billable code it reaches (CSV, SQL, R, Python).
//! - [`card`] gathers what is known of one code (timeline, place in the
//!   hierarchy on a day, notes, successors, mappings) for `show` and the page.
//! - [`words`] normalises description and label words; [`search`] ranks
//!   codes for words over the index's word map (BM25, prefix and edit-distance
//!   matching); [`find`] puts a code or code start before the words.
//! - [`synonyms`] reads clinicians' words as the official wording (shorthand,
//!   everyday words, HPO synonyms) for the label check and the search alike.
//! - [`model`] holds the owned release model that indexes are written from.
//!
//! Memory: an opened index borrows its bytes; the only allocations on open are
//! the header facts and the chapter/section tables (a few kilobytes).

#![deny(missing_docs)]

pub mod card;
pub mod check;
pub mod code;
pub mod compare;
pub mod date;
pub mod export;
pub mod find;
pub mod index;
pub mod list;
mod mapping;
pub mod mixed;
pub mod model;
pub mod pattern;
pub mod render;
pub mod report;
pub mod search;
pub mod sha256;
pub mod shapecheck;
pub mod synonyms;
pub mod systems;
pub mod translate;
pub mod words;

pub use check::{
    check, check_among, check_with_coverage, check_with_reach, timeline, CategoryCoverage,
    CheckOptions,
};
pub use compare::{compare, Comparison};
pub use date::{Date, DateError};
pub use index::{Index, IndexError, NotesFile, View};
pub use list::{parse_list, read, Draft, InputLine, LineKind, Reading};
pub use report::{
    Entry, Finding, Kind, ListFinding, Report, Severity, Status, Suggestion, Summary, SystemPart,
};

pub use model::{CodeEntry, Hierarchy, Meta, Period, Release, Source, Span, SpanKind};
