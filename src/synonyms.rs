//! Clinicians' words read as the official wording: the one synonym layer
//! the label check, the label-driven suggestions and the word search share.
//! A label or query has *readings*: its own words, and the same words with
//! a phrase the tables know replaced by the official words it stands for
//! ("heart attack" → "myocardial infarction"). A label fits a code when one
//! of its readings does; a search ranks codes by their best reading.
//!
//! Two tables, compiled in, each row naming its source: `synonyms/clinical.tsv`
//! (shorthand and everyday words written for the project) and
//! `synonyms/hpo.tsv` (HPO exact synonyms of terms whose names are ICD-10-CM
//! wording, made by `examples/hpo_synonyms.rs`). The tabular list's inclusion
//! terms are the third source; they are in each index's word map already.
//! [`OPPOSITES`] names the words that, written in a label, contradict a code.

use crate::words;
use std::collections::HashMap;
use std::sync::OnceLock;

/// The shorthand table, written for the project (see its header lines).
pub const CLINICAL: &str = include_str!("synonyms/clinical.tsv");
/// The HPO table (generated; see `examples/hpo_synonyms.rs`).
pub const HPO: &str = include_str!("synonyms/hpo.tsv");

/// Most readings of one text (its own words included): a label has few
/// phrases the tables know, and each reading costs a fit or a search.
pub const MOST_READINGS: usize = 12;

/// Texts of more words than this are read in their own words only.
pub const MOST_WORDS: usize = 60;

/// Pairs of words or phrases (normalised) that tell codes apart in a way a
/// label must not get wrong: a label with one and a description with the
/// other (and neither with both) contradict each other (common practice:
/// the axes along which ICD-10-CM subdivides a category).
pub const OPPOSITES: &[(&str, &str)] = &[
    ("acute", "chronic"),
    ("benign", "malignant"),
    ("closed", "open"),
    ("diastolic", "systolic"),
    ("displaced", "nondisplaced"),
    ("female", "male"),
    ("hyperglycemia", "hypoglycemia"),
    ("hyperkalemia", "hypokalemia"),
    ("hypernatremia", "hyponatremia"),
    ("hypertension", "hypotension"),
    ("hyperthyroidism", "hypothyroidism"),
    ("initial", "sequela"),
    ("initial", "subsequent"),
    ("left", "right"),
    ("lower", "upper"),
    ("primary", "secondary"),
    ("recurrent", "single"),
    ("subsequent", "sequela"),
    ("type 1", "type 2"),
    ("with", "without"),
];

/// The side of a pair of [`OPPOSITES`] a text that says neither means, where
/// the classification has such a default (first the default, then the
/// other): a malignant neoplasm not stated as secondary is primary, a
/// fracture not stated as open is closed and one not stated as displaced or
/// not is displaced, diabetes of no stated type is type 2, an encounter not
/// stated is the initial one, a depressive episode not stated as recurrent
/// is single (ICD-10-CM conventions and Official Guidelines, from memory).
pub const DEFAULTS: &[(&str, &str)] = &[
    ("closed fracture", "open fracture"),
    ("displaced", "nondisplaced"),
    ("initial", "sequela"),
    ("initial", "subsequent"),
    ("primary", "secondary"),
    ("single", "recurrent"),
    ("type 2", "type 1"),
];

/// The words of `desc` that are the non-default side of a pair of
/// [`DEFAULTS`] of which `label` says neither side: what a code adds that a
/// plain label does not mean.
pub fn unsaid(label: &[String], desc: &[String]) -> usize {
    DEFAULTS
        .iter()
        .filter(|(d, other)| !has(label, d) && !has(label, other) && has(desc, other))
        .count()
}

/// One row of a table: a phrase as written, the official words it is read
/// as (both normalised), and where the pair comes from.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Synonym {
    /// The words as clinicians write them.
    pub written: Vec<String>,
    /// The official words they stand for.
    pub read_as: Vec<String>,
    /// The row's source, as the table gives it.
    pub source: &'static str,
}

/// Every row of both tables, by first written word, longest phrase first.
struct Table {
    by_first: HashMap<String, Vec<Synonym>>,
}

/// The rows of a table's text: `written`, `read as`, `source` separated by
/// tabs; `#` lines are comments. A row that normalises to nothing, or reads
/// as itself, is left out.
pub fn rows(text: &'static str) -> impl Iterator<Item = Synonym> {
    text.lines().filter_map(|line| {
        if line.starts_with('#') || line.trim().is_empty() {
            return None;
        }
        let mut cols = line.splitn(3, '\t');
        let written = words::words(cols.next()?);
        let read_as = words::words(cols.next()?);
        let source = cols.next().unwrap_or("").trim();
        (!written.is_empty() && !read_as.is_empty() && written != read_as).then_some(Synonym {
            written,
            read_as,
            source,
        })
    })
}

fn table() -> &'static Table {
    static TABLE: OnceLock<Table> = OnceLock::new();
    TABLE.get_or_init(|| {
        let mut by_first: HashMap<String, Vec<Synonym>> = HashMap::new();
        for s in rows(CLINICAL).chain(rows(HPO)) {
            let list = by_first.entry(s.written[0].clone()).or_default();
            // The first row for a pair wins (the shorthand table comes first).
            if !list
                .iter()
                .any(|x| x.written == s.written && x.read_as == s.read_as)
            {
                list.push(s);
            }
        }
        for list in by_first.values_mut() {
            list.sort_by_key(|s| std::cmp::Reverse(s.written.len()));
        }
        Table { by_first }
    })
}

/// The rows whose written phrase starts at `words[i]`, longest first.
fn at<'t>(t: &'t Table, words: &[String], i: usize) -> Vec<&'t Synonym> {
    let list = t.by_first.get(&words[i]).map_or(&[][..], |l| &l[..]);
    list.iter()
        .filter(|s| words[i..].starts_with(&s.written))
        .collect()
}

/// The readings of normalised `words`: the words themselves first, then
/// each way of replacing known phrases by their official words (at most
/// [`MOST_READINGS`] in all; readings with more replaced come first).
///
/// ```
/// use rollcall::{synonyms, words};
/// let r = synonyms::readings(&words::words("heart attack"));
/// assert_eq!(r[0], ["heart", "attack"]);
/// assert!(r.contains(&words::words("myocardial infarction")));
/// ```
pub fn readings(words: &[String]) -> Vec<Vec<String>> {
    let t = table();
    let mut out = vec![words.to_vec()];
    // A paragraph pasted as a label is read in its own words (the walk
    // below goes one word deep per step).
    if words.len() > MOST_WORDS || (0..words.len()).all(|i| at(t, words, i).is_empty()) {
        return out;
    }
    let mut cur = Vec::new();
    walk(t, words, 0, &mut cur, &mut out);
    // A reading that says both sides of a pair the text does not (the
    // default "type 2" of `diabetes` beside a written "type 1") is no
    // reading of it.
    let both = |w: &[String]| {
        OPPOSITES
            .iter()
            .filter(|(a, b)| has(w, a) && has(w, b))
            .count()
    };
    let own = both(words);
    out.retain(|r| both(r) <= own);
    out
}

fn walk(t: &Table, words: &[String], i: usize, cur: &mut Vec<String>, out: &mut Vec<Vec<String>>) {
    if out.len() >= MOST_READINGS {
        return;
    }
    if i == words.len() {
        if !out.contains(cur) {
            out.push(cur.clone());
        }
        return;
    }
    let len = cur.len();
    for s in at(t, words, i) {
        cur.extend(s.read_as.iter().cloned());
        walk(t, words, i + s.written.len(), cur, out);
        cur.truncate(len);
    }
    cur.push(words[i].clone());
    walk(t, words, i + 1, cur, out);
    cur.truncate(len);
}

/// Whether the phrase `p` (normalised words, space-separated) stands in `words`.
fn has(words: &[String], p: &str) -> bool {
    let p: Vec<&str> = p.split(' ').collect();
    words
        .windows(p.len())
        .any(|w| w.iter().zip(&p).all(|(a, b)| a == b))
}

/// The first pair of [`OPPOSITES`] on which `label` (a reading) and `desc`
/// (a description's words) disagree: the label's word, then the
/// description's.
pub fn contradiction(label: &[String], desc: &[String]) -> Option<(&'static str, &'static str)> {
    OPPOSITES.iter().find_map(|&(a, b)| {
        for (x, y) in [(a, b), (b, a)] {
            if has(label, x) && !has(label, y) && has(desc, y) && !has(desc, x) {
                return Some((x, y));
            }
        }
        None
    })
}

/// Whether a word of `words` is one of [`OPPOSITES`]' (a synonym that adds
/// or drops one would change what a label says).
pub fn opposite_words(words: &[String]) -> Vec<&'static str> {
    let mut v: Vec<&'static str> = OPPOSITES
        .iter()
        .flat_map(|&(a, b)| [a, b])
        .filter(|p| has(words, p))
        .collect();
    v.sort_unstable();
    v.dedup();
    v
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_row_of_both_tables_reads() {
        for text in [CLINICAL, HPO] {
            let rows_in = text
                .lines()
                .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
                .count();
            assert_eq!(rows(text).count(), rows_in, "a row normalises to nothing");
            assert!(
                rows(text).all(|s| !s.source.is_empty()),
                "a row without its source"
            );
        }
    }

    #[test]
    fn readings_replace_known_phrases() {
        let w = |s: &str| words::words(s);
        let r = readings(&w("pancreatic cancer"));
        assert_eq!(r[0], w("pancreatic cancer"));
        assert!(r.contains(&w("pancreas malignant neoplasm")), "{r:?}");
        assert_eq!(readings(&w("asthma")), [w("asthma")]);
        assert!(readings(&w("T2DM, poorly controlled"))
            .contains(&w("type 2 diabetes mellitus hyperglycemia")));
    }

    #[test]
    fn a_long_text_is_read_in_its_own_words() {
        let long = "ca ".repeat(5000);
        let w = words::words(&long);
        assert_eq!(readings(&w), std::slice::from_ref(&w));
        let some = words::words(&"ca ".repeat(MOST_WORDS));
        assert!(readings(&some).len() <= MOST_READINGS);
    }

    #[test]
    fn contradictions() {
        let w = |s: &str| words::words(s);
        let d = w("Unspecified systolic (congestive) heart failure");
        assert_eq!(
            contradiction(&w("diastolic heart failure"), &d),
            Some(("diastolic", "systolic"))
        );
        assert_eq!(contradiction(&w("heart failure"), &d), None);
        let d = w("Type 2 diabetes mellitus without complications");
        assert_eq!(
            contradiction(&w("type 1 diabetes"), &d),
            Some(("type 1", "type 2"))
        );
        assert_eq!(
            contradiction(&w("acute on chronic"), &w("Chronic systolic heart failure")),
            None
        );
    }
}
