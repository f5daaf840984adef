//! What a check is asked for: the day or the study period, whether billable
//! codes are required, and how many codes a message names.

use super::*;

/// Options of a check.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct CheckOptions {
    /// First day of the study period.
    pub from: Date,
    /// Last day of the study period (the same as `from` for a single date).
    pub to: Date,
    /// Whether only billable codes are acceptable (headers become errors).
    pub billable: bool,
}

impl CheckOptions {
    /// A single reference date.
    pub fn on(day: Date, billable: bool) -> CheckOptions {
        CheckOptions {
            from: day,
            to: day,
            billable,
        }
    }

    /// The period a check against an index of `meta` uses: one release
    /// only (HPO) is judged as of it, whatever the study period.
    pub fn period_for(&self, meta: &crate::model::Meta) -> Period {
        if meta.snapshot() {
            Period::new(meta.coverage_from, meta.coverage_to)
        } else {
            self.period()
        }
    }

    /// The study period as a [`Period`].
    pub fn period(&self) -> Period {
        Period::new(self.from.min(self.to), self.to.max(self.from))
    }
}

/// How many unknown codes get edit-distance suggestions in one list; beyond
/// this the finding says the search was skipped (keeps huge pastes fast).
pub const SUGGESTION_LIMIT: usize = 2000;

/// The most codes named in one message or suggestion list.
pub const NAMED_LIMIT: usize = 12;
