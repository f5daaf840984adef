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

    /// The options for the days a front end was given: a single day, or a
    /// study period with both ends, or (nothing given) `default_day` (the
    /// index's default day, [`crate::model::Meta::default_day`], or today
    /// for a check by shape alone).
    pub fn asked(
        on: Option<Date>,
        from: Option<Date>,
        to: Option<Date>,
        billable: bool,
        default_day: Date,
    ) -> Result<CheckOptions, DaysError> {
        match (on, from, to) {
            (Some(_), Some(_), _) | (Some(_), _, Some(_)) => Err(DaysError::DayAndPeriod),
            (Some(day), None, None) => Ok(CheckOptions::on(day, billable)),
            (None, Some(from), Some(to)) if from > to => Err(DaysError::Backwards { from, to }),
            (None, Some(from), Some(to)) => Ok(CheckOptions { from, to, billable }),
            (None, Some(_), None) | (None, None, Some(_)) => Err(DaysError::HalfPeriod),
            (None, None, None) => Ok(CheckOptions::on(default_day, billable)),
        }
    }

    /// The study period as a [`Period`].
    pub fn period(&self) -> Period {
        Period::new(self.from.min(self.to), self.to.max(self.from))
    }
}

/// Why the days given are neither one day nor a whole study period. The
/// CLI words these with its flags; [`std::fmt::Display`] says them without.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum DaysError {
    /// A single day and (an end of) a study period were both given.
    DayAndPeriod,
    /// One end of a study period was given without the other.
    HalfPeriod,
    /// The study period starts after it ends.
    Backwards {
        /// Its first day.
        from: Date,
        /// Its last day.
        to: Date,
    },
}

impl std::fmt::Display for DaysError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            DaysError::DayAndPeriod => {
                f.write_str("give either a single date or a study period, not both")
            }
            DaysError::HalfPeriod => f.write_str("a study period needs both a start and an end"),
            DaysError::Backwards { from, to } => {
                write!(f, "the study period starts ({from}) after it ends ({to})")
            }
        }
    }
}

impl std::error::Error for DaysError {}

/// How many unknown codes get edit-distance suggestions in one list; beyond
/// this the finding says the search was skipped (keeps huge pastes fast).
pub const SUGGESTION_LIMIT: usize = 2000;

/// The most codes named in one message or suggestion list.
pub const NAMED_LIMIT: usize = 12;

#[cfg(test)]
mod tests {
    use super::*;

    fn day(s: &str) -> Date {
        Date::parse(s).unwrap()
    }

    // Common practice: a check is of one day or of a whole period, never
    // both, and a period runs forwards.
    #[test]
    fn days_give_one_day_or_a_period() {
        let today = day("2025-03-04");
        let none = CheckOptions::asked(None, None, None, false, today).unwrap();
        assert_eq!((none.from, none.to, none.billable), (today, today, false));
        let on = CheckOptions::asked(Some(day("2020-01-01")), None, None, false, today).unwrap();
        assert_eq!((on.from, on.to), (day("2020-01-01"), day("2020-01-01")));
        let (f, t) = (day("2019-01-01"), day("2020-12-31"));
        let p = CheckOptions::asked(None, Some(f), Some(t), true, today).unwrap();
        assert_eq!((p.from, p.to, p.billable), (f, t, true));
    }

    #[test]
    fn days_that_do_not_fit_are_named() {
        let today = day("2025-03-04");
        let (a, b) = (day("2020-01-01"), day("2021-01-01"));
        let err = |on, from, to| CheckOptions::asked(on, from, to, false, today).unwrap_err();
        assert_eq!(err(Some(a), Some(a), None), DaysError::DayAndPeriod);
        assert_eq!(err(Some(a), None, Some(b)), DaysError::DayAndPeriod);
        assert_eq!(err(None, Some(a), None), DaysError::HalfPeriod);
        assert_eq!(err(None, None, Some(a)), DaysError::HalfPeriod);
        let back = err(None, Some(b), Some(a));
        assert_eq!(back, DaysError::Backwards { from: b, to: a });
        assert!(back.to_string().contains("after it ends"), "{back}");
    }
}
