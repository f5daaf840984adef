//! Calendar dates as the releases use them: whole days, no time zone.
//!
//! A [`Date`] is stored as days since 1970-01-01 so that "the day before" and
//! spans are plain arithmetic; it prints and parses as `YYYY-MM-DD`.

use std::fmt;

/// A calendar day (proleptic Gregorian), ordered and copyable.
///
/// ```
/// use rollcall::Date;
/// let d = Date::parse("2018-10-01").unwrap();
/// assert_eq!(d.pred().to_string(), "2018-09-30");
/// ```
#[derive(Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Debug)]
pub struct Date(i32);

/// A date string that could not be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct DateError {
    /// The text that was given.
    pub input: String,
}

impl fmt::Display for DateError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "\"{}\" is not a date; write it as YYYY-MM-DD, for example 2026-01-01",
            self.input
        )
    }
}

impl std::error::Error for DateError {}

impl Date {
    /// The day with this year, month (1-12) and day of month, if it exists.
    pub fn from_ymd(year: i32, month: u32, day: u32) -> Option<Date> {
        if !(1..=12).contains(&month) || day == 0 || day > days_in_month(year, month) {
            return None;
        }
        Some(Date(days_from_civil(year, month, day)))
    }

    /// Reads `YYYY-MM-DD` or the releases' `YYYYMMDD`.
    pub fn parse(text: &str) -> Result<Date, DateError> {
        let t = text.trim();
        let err = || DateError {
            input: text.to_string(),
        };
        let digits: String = match t.len() {
            10 if t.as_bytes()[4] == b'-' && t.as_bytes()[7] == b'-' => {
                [&t[0..4], &t[5..7], &t[8..10]].concat()
            }
            8 => t.to_string(),
            _ => return Err(err()),
        };
        if !digits.bytes().all(|b| b.is_ascii_digit()) {
            return Err(err());
        }
        let y = digits[0..4].parse().map_err(|_| err())?;
        let m = digits[4..6].parse().map_err(|_| err())?;
        let d = digits[6..8].parse().map_err(|_| err())?;
        Date::from_ymd(y, m, d).ok_or_else(err)
    }

    /// Days since 1970-01-01, the form stored in index files.
    pub fn days(self) -> i32 {
        self.0
    }

    /// The date `days` days after 1970-01-01.
    pub fn from_days(days: i32) -> Date {
        Date(days)
    }

    /// The day before.
    pub fn pred(self) -> Date {
        // Saturating: days read from a damaged index may be at the ends of i32.
        Date(self.0.saturating_sub(1))
    }

    /// The day after.
    pub fn succ(self) -> Date {
        Date(self.0.saturating_add(1))
    }

    /// Year, month and day.
    pub fn ymd(self) -> (i32, u32, u32) {
        let (y, m, d) = civil_from_days(self.0);
        (y as i32, m, d)
    }
}

impl fmt::Display for Date {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let (y, m, d) = self.ymd();
        write!(f, "{y:04}-{m:02}-{d:02}")
    }
}

impl serde::Serialize for Date {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_str(self)
    }
}

fn is_leap(y: i32) -> bool {
    (y % 4 == 0 && y % 100 != 0) || y % 400 == 0
}

fn days_in_month(y: i32, m: u32) -> u32 {
    match m {
        2 if is_leap(y) => 29,
        2 => 28,
        4 | 6 | 9 | 11 => 30,
        _ => 31,
    }
}

// Howard Hinnant's days-from-civil algorithm (public domain).
fn days_from_civil(y: i32, m: u32, d: u32) -> i32 {
    let y = if m <= 2 { y - 1 } else { y };
    let era = if y >= 0 { y } else { y - 399 } / 400;
    let yoe = y - era * 400;
    let mp = (m + 9) % 12;
    let doy = (153 * mp + 2) / 5 + d - 1;
    let doe = yoe * 365 + yoe / 4 - yoe / 100 + doy as i32;
    era * 146097 + doe - 719468
}

// In i64: any i32 day (a damaged index may hold one) stays in range.
fn civil_from_days(z: i32) -> (i64, u32, u32) {
    let z = z as i64 + 719468;
    let era = if z >= 0 { z } else { z - 146096 } / 146097;
    let doe = z - era * 146097;
    let yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365;
    let y = yoe + era * 400;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let m = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    (if m <= 2 { y + 1 } else { y }, m, d)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn round_trips_and_neighbours() {
        // 1970-01-01 is day 0 by definition of the Unix epoch.
        assert_eq!(Date::parse("1970-01-01").unwrap().days(), 0);
        let d = Date::parse("20161001").unwrap();
        assert_eq!(d.pred().to_string(), "2016-09-30");
        assert_eq!(
            Date::parse("2024-02-28").unwrap().succ().to_string(),
            "2024-02-29"
        );
        assert_eq!(
            Date::parse("2023-02-28").unwrap().succ().to_string(),
            "2023-03-01"
        );
        for n in -1000..30000 {
            let d = Date::from_days(n);
            assert_eq!(Date::parse(&d.to_string()).unwrap(), d);
        }
    }

    #[test]
    fn rejects_impossible_dates() {
        assert!(Date::parse("2023-02-29").is_err());
        assert!(Date::parse("2023-13-01").is_err());
        assert!(Date::parse("01/02/2023").is_err());
        assert!(Date::parse("2023-1-01").is_err());
    }
}
