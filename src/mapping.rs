//! A mapping's rows for one source code (the GEMs), in words: how the
//! source translates (its outcome) and each row's flags. Below both the
//! check, which names another system's code with its targets, and
//! `translate`, which judges the targets.

use crate::model::{MapFlags, MapRow};
use serde::Serialize;
use std::collections::BTreeSet;

/// How an entry translates.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Outcome {
    /// One or more targets, none flagged approximate.
    Exact,
    /// Targets flagged approximate (not exact equivalents).
    Approximate,
    /// The source needs several targets together (one per choice list).
    Combination,
    /// The mapping has no target for the source.
    NoMap,
    /// The source code is in the source vocabulary but not in the mapping
    /// (a header: the GEMs map billable codes).
    NotMapped,
    /// Not a code of the source vocabulary.
    NotInSource,
    /// A blank, comment or headings line.
    Skipped,
}

impl Outcome {
    /// The stable name.
    pub fn name(self) -> &'static str {
        match self {
            Outcome::Exact => "exact",
            Outcome::Approximate => "approximate",
            Outcome::Combination => "combination",
            Outcome::NoMap => "no-map",
            Outcome::NotMapped => "not-mapped",
            Outcome::NotInSource => "not-in-source",
            Outcome::Skipped => "skipped",
        }
    }
}

/// One row's flags in words.
pub fn row_words(f: &MapFlags) -> String {
    if f.no_map {
        return "no target".into();
    }
    let mut w = String::from(if f.approximate {
        "approximate"
    } else {
        "exact"
    });
    if f.combination {
        w.push_str(&format!(
            ", combination: scenario {} choice list {}",
            f.scenario, f.choice_list
        ));
    }
    w
}

/// The flags of all rows of one source, in words.
pub fn flag_words(rows: &[MapRow]) -> String {
    outcome_of(rows).1
}

pub(crate) fn outcome_of(rows: &[MapRow]) -> (Outcome, String) {
    if rows.is_empty() {
        return (Outcome::NotMapped, "not in the mapping".into());
    }
    if rows.iter().all(|r| r.flags.no_map) {
        return (
            Outcome::NoMap,
            "no target: the mapping gives no equivalent code".into(),
        );
    }
    let n = rows.iter().filter(|r| !r.flags.no_map).count();
    if rows.iter().any(|r| r.flags.combination) {
        let scenarios: BTreeSet<u8> = rows.iter().map(|r| r.flags.scenario).collect();
        let lists: BTreeSet<(u8, u8)> = rows
            .iter()
            .map(|r| (r.flags.scenario, r.flags.choice_list))
            .collect();
        return (
            Outcome::Combination,
            format!(
                "combination: {} scenario{}, each needing one code from each of its choice lists ({} lists in all); the targets together, not each alone, match",
                scenarios.len(),
                if scenarios.len() == 1 { "" } else { "s" },
                lists.len()
            ),
        );
    }
    if rows.iter().any(|r| r.flags.approximate) {
        (
            Outcome::Approximate,
            format!(
                "approximate: {} target{} close to, but not the same as, the source; review {}",
                n,
                if n == 1 { "" } else { "s" },
                if n == 1 { "it" } else { "them" }
            ),
        )
    } else {
        (
            Outcome::Exact,
            format!(
                "exact: {} equivalent target{}",
                n,
                if n == 1 { "" } else { "s" }
            ),
        )
    }
}
