//! Pass 1: what a line's cell is in the index (a code, after reading its
//! written form; a pattern and its matches; unknown; malformed).

use super::*;

/// What pass 1 made of a line.
pub(crate) enum Item {
    Skip(Status),
    Unreadable(String),
    Code {
        ord: u32,
        changes: Vec<&'static str>,
        written: String,
    },
    Unknown {
        code: String,
        written: String,
    },
    Malformed {
        reason: String,
        written: String,
    },
    Pattern(Pattern, Vec<u32>),
}

pub(crate) fn resolve_line(view: &View<'_>, kind: &LineKind, period: &Period) -> Item {
    match kind {
        LineKind::Blank => Item::Skip(Status::Blank),
        LineKind::Comment => Item::Skip(Status::Comment),
        LineKind::Headings => Item::Skip(Status::ColumnHeadings),
        LineKind::Text => Item::Skip(Status::Text),
        LineKind::Unreadable(m) => Item::Unreadable(m.clone()),
        // A range (`E08-E13`) runs in code order, which only a prefix
        // hierarchy gives meaning to: in a stated one (LOINC `2345-7`, an
        // imported `LHM-24`) a hyphen is part of a code, and only `*` and `%`
        // make a pattern.
        LineKind::Entry { code, .. } if view.is_graph() && !code.trim().ends_with(['*', '%']) => {
            code_item(view, code)
        }
        LineKind::Entry { code, .. } => match pattern::parse(code) {
            Some(Ok(p)) => {
                let m = p.expand(view, period);
                // `2345-7` reads as a range but is a LOINC code.
                if m.is_empty() && other_systems(view, code.trim()).is_some() {
                    Item::Malformed {
                        reason: String::new(),
                        written: code.trim().to_string(),
                    }
                } else {
                    Item::Pattern(p, m)
                }
            }
            Some(Err(m)) => Item::Malformed {
                reason: m,
                written: code.trim().to_string(),
            },
            None => code_item(view, code),
        },
    }
}

pub(crate) fn code_item(view: &View<'_>, code: &str) -> Item {
    match code::resolve(view, code) {
        Resolved::Found { ord, changes } => Item::Code {
            ord,
            changes,
            written: code.trim().to_string(),
        },
        Resolved::Unknown { code: c } => Item::Unknown {
            code: c,
            written: code.trim().to_string(),
        },
        Resolved::Malformed { reason } => Item::Malformed {
            reason,
            written: code.trim().to_string(),
        },
    }
}
