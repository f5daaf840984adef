//! The check of one list for one study period: resolve every line, then
//! judge each entry against the period and the rest of the list, then run
//! the whole-list checks. The rules are written out in the README.

use crate::code::{self, Resolved};
use crate::date::Date;
use crate::index::{Index, View};
use crate::list::{Draft, LineKind, Reading};
use crate::model::{Period, Span, SpanKind};
use crate::pattern::{self, Pattern};
use crate::report::article;
use crate::report::*;
use crate::systems::{self, Shape, System};
use serde::Serialize;
use std::collections::{HashMap, HashSet};

mod context;
mod coverage;
mod dates;
mod entry;
pub mod labels;
mod list_level;
mod options;
mod other_systems;
mod phrases;
mod redundant;
mod resolve;
mod retired;
mod run;
#[cfg(test)]
mod testing;
mod unknown;

pub(crate) use context::*;
pub use coverage::*;
use dates::*;
use entry::*;
use list_level::{BeyondCoverage, Duplicate, RollUp, SiblingGap};
pub use options::*;
use other_systems::*;
pub(crate) use phrases::*;
use redundant::*;
use resolve::*;
use retired::*;
pub use run::Run;
use unknown::*;

/// Checks a list against an index for the period in `options`.
///
/// ```no_run
/// let index = rollcall::Index::open(std::fs::read("vocab/icd10cm.rcx").unwrap()).unwrap();
/// let day = rollcall::Date::parse("2026-01-01").unwrap();
/// let report = rollcall::check(&index, "E11.9\nE11.56\n", &rollcall::CheckOptions::on(day, true));
/// assert_eq!(report.summary.entries, 2);
/// ```
pub fn check<D: AsRef<[u8]>>(index: &Index<D>, text: &str, options: &CheckOptions) -> Report {
    run(index, text, options, Want::default()).0
}

/// [`check`], with the indexes of other systems at hand: an entry that is
/// no code of `index` but a code of one of `others` is reported as that
/// system's code, with the mapping's targets (the GEMs) as suggestions.
pub fn check_among<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    text: &str,
    options: &CheckOptions,
) -> Report {
    let want = Want {
        others,
        ..Want::default()
    };
    run(index, text, options, want).0
}

/// [`check`], plus how much of each category the list covers (for the
/// page's coverage bars), computed from the same pass over the list.
pub fn check_with_coverage<D: AsRef<[u8]>>(
    index: &Index<D>,
    text: &str,
    options: &CheckOptions,
) -> (Report, Vec<CategoryCoverage>) {
    check_among_with_coverage(index, &[], text, options)
}

/// [`check_among`], plus the coverage of [`check_with_coverage`], from one pass.
pub fn check_among_with_coverage<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    text: &str,
    options: &CheckOptions,
) -> (Report, Vec<CategoryCoverage>) {
    check_draft(
        index,
        others,
        &crate::list::read(text, Reading::Auto),
        options,
    )
}

/// What an entry reaches: the billable codes of the period it stands for.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Reach {
    /// The entry's line.
    pub line: usize,
    /// What the entry names, for telling entries written alike.
    pub key: EntryKey,
    /// How the entry reads in a report (dotted code or pattern).
    pub written: String,
    /// Ordinals of the billable codes of the period it reaches, ascending:
    /// a code itself when billable and the billable codes under it; a
    /// pattern's matches.
    pub ords: Vec<u32>,
}

/// What an entry names.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub enum EntryKey {
    /// A code of the index, by ordinal.
    Code(u32),
    /// A pattern, by its display.
    Pattern(String),
}

/// [`check`], plus what each code and pattern entry reaches (for comparing
/// lists), from the same pass over the list.
pub fn check_with_reach<D: AsRef<[u8]>>(
    index: &Index<D>,
    text: &str,
    options: &CheckOptions,
) -> (Report, Vec<Reach>) {
    check_with_reach_among(index, &[], text, options)
}

/// [`check_with_reach`] with other systems' indexes at hand, as in [`check_among`].
pub fn check_with_reach_among<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    text: &str,
    options: &CheckOptions,
) -> (Report, Vec<Reach>) {
    check_draft_with_reach(
        index,
        others,
        &crate::list::read(text, Reading::Auto),
        options,
    )
}

#[derive(Default, Clone, Copy)]
struct Want<'o, 'v> {
    coverage: bool,
    reach: bool,
    others: &'o [View<'v>],
}

#[derive(Default)]
struct Extras {
    coverage: Vec<CategoryCoverage>,
    reach: Vec<Reach>,
}

/// [`check_among_with_coverage`] of a list already read (see
/// [`crate::list::read`]): one entry per [`crate::list::InputLine`], in order.
pub fn check_draft<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    draft: &Draft,
    options: &CheckOptions,
) -> (Report, Vec<CategoryCoverage>) {
    let want = Want {
        coverage: true,
        others,
        ..Want::default()
    };
    let (report, extras) = run_draft(index, draft, options, want);
    (report, extras.coverage)
}

/// [`check_with_reach_among`] of a list already read (for the exports of
/// a draft or workbook: what each entry reaches).
pub fn check_draft_with_reach<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    draft: &Draft,
    options: &CheckOptions,
) -> (Report, Vec<Reach>) {
    let want = Want {
        reach: true,
        others,
        ..Want::default()
    };
    let (report, extras) = run_draft(index, draft, options, want);
    (report, extras.reach)
}

fn run<D: AsRef<[u8]>>(
    index: &Index<D>,
    text: &str,
    options: &CheckOptions,
    want: Want<'_, '_>,
) -> (Report, Extras) {
    run_draft(
        index,
        &crate::list::read(text, Reading::Auto),
        options,
        want,
    )
}

fn run_draft<'a, D: AsRef<[u8]>>(
    index: &'a Index<D>,
    lines: &'a dyn crate::list::Lines,
    options: &'a CheckOptions,
    want: Want<'a, 'a>,
) -> (Report, Extras) {
    let mut run = Run::with(index, lines, options, want);
    let mut report = run.heading();
    report.entries = run.by_ref().collect();
    let (list_findings, summary, extras) = run.end();
    report.list_findings = list_findings;
    report.summary = summary;
    (report, extras)
}
