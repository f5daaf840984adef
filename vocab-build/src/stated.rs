//! Assembling a vocabulary that states its own hierarchy and statuses (HPO,
//! and the releases a site imports: LOINC, RxNorm, a plain table) into a
//! [`Release`]: every code with its parents, its days in use, its
//! successors and alternate ids. The readers of each format hand over
//! [`Term`]s; this module checks that they fit together.

use crate::error::BuildError;
use rollcall::model::{shape_of, CodeEntry, Hierarchy, Meta, Release, Source, Successor};
use rollcall::{Date, Period};
use std::collections::{BTreeMap, BTreeSet, HashMap};

/// One code as a release states it.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Term {
    /// The code exactly as the release writes it (`HP:0001250`, `2345-7`).
    pub code: String,
    /// The preferred name.
    pub description: String,
    /// Other names (synonyms), searched by words.
    pub synonyms: Vec<String>,
    /// Parent codes.
    pub parents: Vec<String>,
    /// Days in use. For a release with no dates, [`release_day`](Meta)
    /// for a code in use and none for a retired one.
    pub billable: Vec<Period>,
    /// Codes replacing it, when retired.
    pub replaced_by: Vec<String>,
    /// Codes to consider in its place, when retired.
    pub consider: Vec<String>,
    /// Other ids the release gives it.
    pub alt_ids: Vec<String>,
    /// The release's status word when it qualifies use (`DISCOURAGED`).
    pub status: String,
    /// Where the term was read, for messages: file and 1-based line.
    pub at: (String, usize),
}

/// What the index says about the vocabulary.
#[derive(Clone, Debug)]
pub struct About {
    /// Vocabulary id (`hpo`, `loinc`).
    pub id: String,
    /// Display name (`HPO`).
    pub title: String,
    /// Release tag (`2025-01-16`).
    pub release: String,
    /// The release's day: coverage of a release without dates.
    pub day: Date,
    /// Credit the licence asks to show.
    pub notice: String,
    /// Files read.
    pub sources: Vec<Source>,
}

/// Checks the terms against each other and builds the release. Errors name
/// the file and line of the term at fault and what to do.
pub fn build(about: About, mut terms: Vec<Term>) -> Result<Release, BuildError> {
    terms.sort_by(|a, b| a.code.cmp(&b.code));
    for w in terms.windows(2) {
        if w[0].code == w[1].code {
            return Err(BuildError::at(
                &w[1].at.0,
                w[1].at.1,
                format!(
                    "{} is given twice (also line {}); keep one row per code",
                    w[1].code, w[0].at.1
                ),
            ));
        }
    }
    let known: HashMap<&str, &Term> = terms.iter().map(|t| (t.code.as_str(), t)).collect();
    let mut aliases: BTreeMap<String, String> = BTreeMap::new();
    for t in &terms {
        let bad = |what: &str, c: &str| {
            BuildError::at(
                &t.at.0,
                t.at.1,
                format!(
                    "{} names {what} {c}, which is not a code of the release; add it or remove the link",
                    t.code
                ),
            )
        };
        for p in &t.parents {
            if !known.contains_key(p.as_str()) {
                return Err(bad("the parent", p));
            }
        }
        for s in &t.replaced_by {
            if !known.contains_key(s.as_str()) {
                return Err(bad("the replacement", s));
            }
        }
        for c in &t.consider {
            if !known.contains_key(c.as_str()) {
                return Err(bad("the code to consider", c));
            }
        }
        for a in &t.alt_ids {
            // An alternate id may also be kept as a retired code of its own
            // (HPO keeps 387 such stanzas, obsolete, mostly replaced by the
            // term whose alt_id they are): the code reads as itself, and the
            // check names the term too.
            match known.get(a.as_str()) {
                Some(other) if other.billable.is_empty() => {}
                Some(_) => {
                    return Err(BuildError::at(
                        &t.at.0,
                        t.at.1,
                        format!(
                            "{} gives {a} as an alternate id, but {a} is a code in use of its own; remove one of them",
                            t.code
                        ),
                    ))
                }
                None => {}
            }
            if let Some(other) = aliases.insert(a.clone(), t.code.clone()) {
                if other != t.code {
                    return Err(BuildError::at(
                        &t.at.0,
                        t.at.1,
                        format!(
                            "the alternate id {a} is given to both {other} and {}",
                            t.code
                        ),
                    ));
                }
            }
        }
    }
    let days: Vec<Date> = terms
        .iter()
        .flat_map(|t| t.billable.iter().flat_map(|p| [p.from, p.to]))
        .collect();
    let from = days.iter().min().copied().unwrap_or(about.day);
    let to = days.iter().max().copied().unwrap_or(about.day);
    let shapes: BTreeSet<String> = terms.iter().map(|t| shape_of(&t.code)).collect();
    let codes = terms
        .into_iter()
        .map(|t| {
            let retired_on = t
                .billable
                .iter()
                .map(|p| p.to.succ())
                .max()
                .unwrap_or(about.day);
            let mut e = CodeEntry::new(t.code, t.description);
            e.billable = crate::assemble::merge(t.billable);
            e.successors = t
                .replaced_by
                .into_iter()
                .map(|code| Successor {
                    code,
                    effective: retired_on,
                })
                .collect();
            e.successors.sort();
            e.successors.dedup();
            e.terms = t.synonyms;
            e.parents = t.parents;
            e.parents.sort();
            e.parents.dedup();
            e.consider = t.consider;
            e.status = t.status;
            e
        })
        .collect();
    Ok(Release {
        meta: Meta {
            vocabulary: about.id,
            title: about.title,
            release: about.release,
            coverage_from: from,
            coverage_to: to,
            sources: about.sources,
            dot_after: 0,
            dot_rules: Vec::new(),
            shapes: shapes.into_iter().collect(),
            notice: about.notice,
        },
        codes,
        chapters: Vec::new(),
        sections: Vec::new(),
        seventh: Vec::new(),
        mappings: Vec::new(),
        hierarchy: Hierarchy::Explicit,
        aliases: aliases.into_iter().collect(),
        notes: Vec::new(),
    })
}
