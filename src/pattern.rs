//! Patterns and ranges in a list: `E11.*`, `E11*`, `E11%`, `E11.-` (every
//! code starting with E11) and `E08-E13` (every code from category E08 to
//! E13, inclusive of codes under E13). Expansion is to billable codes in the
//! study period.

use crate::index::View;
use crate::model::Period;
use fst::{IntoStreamer, Streamer};

/// A parsed pattern.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Pattern {
    /// Every code starting with this (undotted) prefix.
    Prefix(String),
    /// Every code from `lo` up to and including codes under `hi` (undotted).
    Range(String, String),
}

fn clean(s: &str) -> String {
    s.chars()
        .filter(|c| !c.is_whitespace() && *c != '.')
        .collect::<String>()
        .to_ascii_uppercase()
}

/// `None` when the cell is not a pattern; `Some(Err)` when it tries to be one
/// but cannot be read (the message says how to write it).
pub fn parse(cell: &str) -> Option<Result<Pattern, String>> {
    let t = cell.trim();
    let is_wild = t.ends_with('*') || t.ends_with('%') || t.ends_with(".-");
    let range = t.contains('-') || t.contains('–');
    if !is_wild && !range {
        return None;
    }
    let ok = |s: &str| !s.is_empty() && s.bytes().all(|b| b.is_ascii_alphanumeric());
    if is_wild {
        let stem = clean(t.trim_end_matches(['*', '%']).trim_end_matches(".-"));
        return Some(if ok(&stem) {
            Ok(Pattern::Prefix(stem))
        } else {
            Err(format!(
                "\"{t}\" is not a pattern rollcall reads; write a code start followed by * (E11.*, E11.6*)"
            ))
        });
    }
    let parts: Vec<&str> = t.split(['-', '–']).collect();
    let [lo, hi] = parts[..] else {
        return Some(Err(format!(
            "\"{t}\" is not a range; write FIRST-LAST, for example E08-E13"
        )));
    };
    let (lo, hi) = (clean(lo), clean(hi));
    if !ok(&lo) || !ok(&hi) {
        return Some(Err(format!(
            "\"{t}\" is not a range; write FIRST-LAST, for example E08-E13"
        )));
    }
    if lo > hi {
        return Some(Err(format!(
            "the range \"{t}\" starts after it ends; write the lower code first"
        )));
    }
    Some(Ok(Pattern::Range(lo, hi)))
}

impl Pattern {
    /// The pattern as rollcall writes it (`E11.6*`, `E08-E13`).
    pub fn display(&self, view: &View<'_>) -> String {
        match self {
            Pattern::Prefix(p) if p.len() == view.meta().dot_for(p) && !p.is_empty() => {
                format!("{p}.*")
            }
            Pattern::Prefix(p) => format!("{}*", view.display(p)),
            Pattern::Range(a, b) => format!("{}-{}", view.display(a), view.display(b)),
        }
    }

    /// Whether an undotted code falls under the pattern.
    pub fn matches(&self, code: &str) -> bool {
        match self {
            Pattern::Prefix(p) => code.starts_with(p.as_str()),
            Pattern::Range(lo, hi) => {
                // Bytes, not str: the cut may fall inside a character.
                code >= lo.as_str() && code.as_bytes()[..code.len().min(hi.len())] <= *hi.as_bytes()
            }
        }
    }

    /// Ordinals of the codes matched that are billable on some day of `period`.
    pub fn expand(&self, view: &View<'_>, period: &Period) -> Vec<u32> {
        let lo = match self {
            Pattern::Prefix(p) => p,
            Pattern::Range(lo, _) => lo,
        };
        let mut stream = view.map().range().ge(lo.as_bytes()).into_stream();
        let mut out = Vec::new();
        while let Some((k, o)) = stream.next() {
            let Ok(k) = std::str::from_utf8(k) else { break };
            if !self.matches(k) {
                break;
            }
            if view.billable_in(o as u32, period) {
                view.note_code(o as u32, k);
                out.push(o as u32);
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_the_pattern_forms() {
        let p = |s| parse(s).unwrap().unwrap();
        assert_eq!(p("E11.*"), Pattern::Prefix("E11".into()));
        assert_eq!(p("e11%"), Pattern::Prefix("E11".into()));
        assert_eq!(p("E11.-"), Pattern::Prefix("E11".into()));
        assert_eq!(p("E11.6*"), Pattern::Prefix("E116".into()));
        assert_eq!(p("E08 - E13"), Pattern::Range("E08".into(), "E13".into()));
        assert!(parse("E11.9").is_none());
        assert!(parse("E13-E08").unwrap().is_err());
        assert!(parse("E1-E2-E3").unwrap().is_err());
        let r = p("E08-E13");
        assert!(r.matches("E139") && r.matches("E08") && !r.matches("E14") && !r.matches("E079"));
    }
}
