//! A list whose rows may name their code system (a system column): the rows
//! of each named system are checked in that system (against its loaded
//! index, by shape when rollcall ships no content for it), the rows with an
//! empty cell as before, and the reports are merged line by line.
//!
//! The list is read once; each sub-check sees the whole list with the other
//! rows blanked, so line numbers and column headings stay those of the list.
//! A system can be named by a column, by a JSON coding's `system`, by a
//! draft's heading, or by a code's shape in a draft (see [`crate::list`]).

use crate::check::{check_draft, CategoryCoverage, CheckOptions};
use crate::index::{Index, View};
use crate::list::{Draft, InputLine, LineKind};
use crate::report::*;
use crate::shapecheck::check_shapes_draft;
use crate::systems::System;

/// What the rows with no system cell are checked against.
pub enum Primary<'a, D: AsRef<[u8]>> {
    /// An index (the list's own vocabulary).
    Index(&'a Index<D>),
    /// A system's shape rules (no content bundled).
    Shapes(System),
}

impl<D: AsRef<[u8]>> Primary<'_, D> {
    fn system(&self) -> Option<System> {
        match self {
            Primary::Index(i) => System::parse(&i.meta().vocabulary),
            Primary::Shapes(s) => Some(*s),
        }
    }
}

/// The systems the list's system column names (valid names only, in the
/// order of [`crate::systems::ALL`]): which indexes a caller should load.
pub fn systems_named(text: &str) -> Vec<System> {
    systems_named_in(&crate::list::read(text, crate::list::Reading::Auto))
}

/// [`systems_named`] of a list already read.
pub fn systems_named_in(draft: &Draft) -> Vec<System> {
    let mut out: Vec<System> = draft
        .lines
        .iter()
        .filter_map(|l| match &l.kind {
            LineKind::Entry {
                system: Some(cell), ..
            } => System::from_cell(cell).ok().flatten(),
            _ => None,
        })
        .collect();
    out.sort();
    out.dedup();
    out
}

/// Where a line goes.
#[derive(Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
enum Group {
    /// The primary check (no cell, or a cell naming the primary system).
    Primary,
    /// Another system named by the cell.
    Named(System),
    /// A cell naming no known system.
    Refused,
}

/// Checks `text` with the rows of each system in that system: rows whose
/// system cell is empty, or names the primary's system, against `primary`
/// with `others` at hand (as [`check_among`]); rows naming a system with an
/// index in `others` against that index; rows naming any other system by
/// its shape (with a warning when the system is bundled but its index is
/// not loaded); rows naming no known system are `malformed`. Returns the
/// merged report and the category coverage of the primary's rows. A list
/// with no system cell gets exactly the report of the primary check.
pub fn check_listed<D: AsRef<[u8]>>(
    primary: Primary<'_, D>,
    others: &[&Index<D>],
    text: &str,
    options: &CheckOptions,
) -> (Report, Vec<CategoryCoverage>) {
    check_listed_draft(
        primary,
        others,
        &crate::list::read(text, crate::list::Reading::Auto),
        options,
    )
}

/// [`check_listed`] of a list already read (a workbook, or text read once
/// by a caller that also needs its readings).
pub fn check_listed_draft<D: AsRef<[u8]>>(
    primary: Primary<'_, D>,
    others: &[&Index<D>],
    draft: &Draft,
    options: &CheckOptions,
) -> (Report, Vec<CategoryCoverage>) {
    let lines = &draft.lines;
    let own = primary.system();
    let mut explicit = false;
    let groups: Vec<Group> = lines
        .iter()
        .map(|l| match &l.kind {
            LineKind::Entry {
                system: Some(cell), ..
            } => {
                explicit = true;
                match System::from_cell(cell) {
                    Ok(Some(s)) if Some(s) != own => Group::Named(s),
                    Ok(_) => Group::Primary,
                    Err(_) => Group::Refused,
                }
            }
            _ => Group::Primary,
        })
        .collect();
    let primary_name = own.map_or_else(
        || match &primary {
            Primary::Index(i) => i.meta().vocabulary.clone(),
            Primary::Shapes(s) => s.name().to_string(),
        },
        |s| s.name().to_string(),
    );
    let views = |skip: Option<&str>| -> Vec<View<'_>> {
        let mut v: Vec<View<'_>> = Vec::new();
        if let Primary::Index(i) = &primary {
            v.push(i.view());
        }
        v.extend(others.iter().map(|i| i.view()));
        v.retain(|x| Some(x.meta().vocabulary.as_str()) != skip);
        v
    };

    // A list with no system cell is checked as it is.
    let keep = |group: Group| draft.only(|i| groups[i] == group);
    let primary_draft: std::borrow::Cow<'_, Draft> = if explicit {
        std::borrow::Cow::Owned(keep(Group::Primary))
    } else {
        std::borrow::Cow::Borrowed(draft)
    };
    let (mut report, coverage) = match &primary {
        Primary::Index(i) => {
            let at_hand = views(Some(&i.meta().vocabulary));
            check_draft(*i, &at_hand, &primary_draft, options)
        }
        Primary::Shapes(s) => (check_shapes_draft(*s, &primary_draft, options), Vec::new()),
    };
    if !explicit {
        return (report, coverage);
    }

    let mut parts = vec![part(
        own,
        &primary_name,
        match &primary {
            Primary::Index(i) => Checked::Index(i.meta().release.clone()),
            Primary::Shapes(_) => Checked::Shapes,
        },
        &report,
        &groups,
        Group::Primary,
    )];
    let mut named: Vec<System> = groups
        .iter()
        .filter_map(|g| match g {
            Group::Named(s) => Some(*s),
            _ => None,
        })
        .collect();
    named.sort();
    named.dedup();
    for s in named {
        let sub_draft = keep(Group::Named(s));
        let index = others.iter().find(|i| i.meta().vocabulary == s.name());
        let (sub, how) = match index {
            Some(i) => (
                check_draft(*i, &views(Some(s.name())), &sub_draft, options).0,
                Checked::Index(i.meta().release.clone()),
            ),
            None if s.bundled() => (not_loaded(s, &sub_draft, options), Checked::NotLoaded),
            None => (check_shapes_draft(s, &sub_draft, options), Checked::Shapes),
        };
        parts.push(part(Some(s), s.name(), how, &sub, &groups, Group::Named(s)));
        for (at, (e, g)) in sub.entries.into_iter().zip(&groups).enumerate() {
            if *g == Group::Named(s) {
                report.entries[at] = e;
            }
        }
        report.list_findings.extend(sub.list_findings);
    }
    for (at, (l, g)) in lines.iter().zip(&groups).enumerate() {
        let e = &mut report.entries[at];
        match g {
            Group::Refused => *e = refused(l),
            Group::Named(s) => {
                if e.system.is_none() && !e.status.skipped() {
                    e.system = Some(s.name().to_string());
                }
            }
            Group::Primary => {
                let named_own = matches!(
                    &l.kind,
                    LineKind::Entry {
                        system: Some(_),
                        ..
                    }
                );
                if named_own && e.system.is_none() && !e.status.skipped() {
                    e.system = Some(primary_name.clone());
                }
            }
        }
    }
    report.summary = Summary::of(draft.line_count(), &report.entries, &report.list_findings);
    report.summary.by_system = parts;
    (report, coverage)
}

/// [`check_listed`] without the coverage.
pub fn check_list<D: AsRef<[u8]>>(
    primary: Primary<'_, D>,
    others: &[&Index<D>],
    text: &str,
    options: &CheckOptions,
) -> Report {
    check_listed(primary, others, text, options).0
}

enum Checked {
    Index(String),
    Shapes,
    NotLoaded,
}

/// The counts of one system's rows.
fn part(
    system: Option<System>,
    name: &str,
    how: Checked,
    report: &Report,
    groups: &[Group],
    group: Group,
) -> SystemPart {
    let mine: Vec<&Entry> = report
        .entries
        .iter()
        .zip(groups)
        .filter(|(e, g)| **g == group && !e.status.skipped())
        .map(|(e, _)| e)
        .collect();
    let mut p = SystemPart {
        system: name.to_string(),
        title: system.map_or_else(|| name.to_string(), |s| s.title().to_string()),
        checked: match &how {
            Checked::Index(_) => "index",
            Checked::Shapes => "shape",
            Checked::NotLoaded => "not-loaded",
        }
        .to_string(),
        release: match how {
            Checked::Index(r) => Some(r),
            _ => None,
        },
        notice: report.index.notice.clone(),
        entries: mine.len(),
        errors: 0,
        warnings: 0,
        infos: 0,
    };
    let sevs = mine
        .iter()
        .flat_map(|e| e.findings.iter().map(|f| f.severity))
        .chain(report.list_findings.iter().map(|f| f.severity));
    for s in sevs {
        match s {
            Severity::Error => p.errors += 1,
            Severity::Warning => p.warnings += 1,
            Severity::Info => p.infos += 1,
        }
    }
    p
}

/// Rows of a bundled system whose index is not loaded: their shape only,
/// with a warning saying how to check them fully.
fn not_loaded(system: System, draft: &Draft, options: &CheckOptions) -> Report {
    let mut r = check_shapes_draft(system, draft, options);
    let title = system.title();
    for e in &mut r.entries {
        for f in &mut e.findings {
            if f.kind == Kind::ShapeOnly {
                f.severity = Severity::Warning;
                f.message = format!(
                    "{} has the {title} shape, but no {title} index is loaded here, so it was not checked against the release; check these rows with rollcall check --system {} (the command line has every bundled index built in) or on the served page, which fetches the index when a list needs it",
                    e.code.as_deref().unwrap_or(""),
                    system.name()
                );
            }
        }
        e.findings.sort_by_key(|f| f.severity);
    }
    r
}

/// The entry of a row whose system cell names no known system.
fn refused(l: &InputLine) -> Entry {
    let (code, label, cell) = match &l.kind {
        LineKind::Entry {
            code,
            label,
            system,
        } => (
            code.clone(),
            label.clone(),
            system.clone().unwrap_or_default(),
        ),
        _ => (String::new(), None, String::new()),
    };
    let why = System::from_cell(&cell).err().unwrap_or_default();
    Entry {
        code: Some(code),
        label,
        findings: vec![Finding::new(
            Kind::Malformed,
            Severity::Error,
            format!("line {}: {why}", l.number),
            vec![],
        )],
        ..Entry::of(l)
    }
}
