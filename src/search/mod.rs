//! Codes for words: BM25 over the index's word map (rare words weigh more),
//! the last word matched as a prefix while typing, misspelt words matched
//! through a Levenshtein automaton on the word map, then the best candidates
//! re-ranked by how well their official description fits the query (whole
//! phrases, few words left over; a category's general code first for a
//! short query). A query and a label are taken in each of their readings
//! ([`crate::synonyms`]: clinicians' words as the official wording), the
//! best one counting. [`fit`] scores one label against one code.

use crate::date::Date;
use crate::index::View;
use crate::model::Period;
use crate::{synonyms, words};
use fst::automaton::Str;
use fst::{Automaton, IntoStreamer, Streamer};
use serde::Serialize;

mod edits;
use edits::{allowed_edits, same_word, within_one_edit, Edits};

/// BM25 constants (the usual defaults, common practice).
const K1: f32 = 1.2;
const B: f32 = 0.75;
/// Weight of a word reached as a prefix of the typed one, or one or two edits away.
const PREFIX_WEIGHT: f32 = 0.85;
const EDIT1_WEIGHT: f32 = 0.7;
const EDIT2_WEIGHT: f32 = 0.5;
/// Most words of the map one query word may stand for.
const MAX_VARIANTS: usize = 40;
/// Candidates re-ranked by their description (100 keeps the evaluation's
/// accuracy and halves the time of 200).
const RERANK: usize = 100;

/// How to search.
#[derive(Clone, Debug, Default)]
pub struct SearchOptions {
    /// Most hits returned.
    pub limit: usize,
    /// Take the last word as the start of a word (search as you type).
    pub prefix_last: bool,
    /// Prefer codes in use on some day of this period.
    pub period: Option<Period>,
    /// Prefer codes near this one in the hierarchy (undotted; sharing a start).
    pub near: Option<String>,
}

/// One code found for a query.
#[derive(Clone, Debug, PartialEq)]
pub struct Hit {
    /// Its ordinal.
    pub ord: u32,
    /// The ranking score (higher is better; only comparable within one query).
    pub score: f32,
    /// How well its description fits the query ([`fit`]).
    pub fit: Fit,
}

/// How well a text fits a code's wording, each share weighted by the words' rarity.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct Fit {
    /// Share of the text's words found in the code's description or other
    /// official wordings (1.0: every word is there).
    pub label: f32,
    /// Share of the description's words found in the text.
    pub description: f32,
}

/// Inverse document frequency of a word found in `df` of `n` codes (BM25's).
fn idf(n: u32, df: u32) -> f32 {
    let (n, df) = (n as f32, df as f32);
    (1.0 + (n - df + 0.5) / (df + 0.5)).ln()
}

/// Words of the map a query word stands for, with their weight: itself,
/// words it starts (when typed last), else words an edit or two away.
fn variants(view: &View<'_>, w: &str, prefix: bool) -> Vec<(u64, f32)> {
    let map = view.words();
    let mut out = Vec::new();
    if let Some(off) = map.get(w) {
        out.push((off, 1.0));
    }
    if prefix {
        let mut s = map.search(Str::new(w).starts_with()).into_stream();
        while let Some((k, off)) = s.next() {
            if k != w.as_bytes() {
                out.push((off, PREFIX_WEIGHT));
            }
            if out.len() >= MAX_VARIANTS {
                break;
            }
        }
    }
    let d = allowed_edits(w);
    if out.is_empty() && d > 0 {
        let aut = Edits::new(w.as_bytes(), d);
        let mut s = map.search(aut).into_stream();
        while let Some((k, off)) = s.next() {
            let k = std::str::from_utf8(k).unwrap_or("");
            let weight = if within_one_edit(w, k) {
                EDIT1_WEIGHT
            } else {
                EDIT2_WEIGHT
            };
            out.push((off, weight));
            if out.len() >= MAX_VARIANTS {
                break;
            }
        }
    }
    out
}

/// The codes that best fit `query`, best first: each code scored by the
/// best of the query's readings searched.
///
/// ```no_run
/// let index = rollcall::Index::open(std::fs::read("vocab/icd10cm.rcx").unwrap()).unwrap();
/// let view = index.view();
/// let opts = rollcall::search::SearchOptions { limit: 3, ..Default::default() };
/// let hits = rollcall::search::search(&view, "type 2 diabetes with hyperglycemia", &opts);
/// assert_eq!(view.code(hits[0].ord), "E1165");
/// ```
pub fn search(view: &View<'_>, query: &str, opts: &SearchOptions) -> Vec<Hit> {
    search_within(view, query, opts, None)
}

/// [`search`] among the codes of `within` only (ordinals, ascending): a
/// part of the tree, when the query starts with a code ([`crate::find`]).
pub fn search_within(
    view: &View<'_>,
    query: &str,
    opts: &SearchOptions,
    within: Option<&[u32]>,
) -> Vec<Hit> {
    let readings = synonyms::readings(&words::words(query));
    let mut hits: Vec<Hit> = Vec::new();
    let mut at: std::collections::HashMap<u32, usize> = std::collections::HashMap::new();
    // A long query is mostly official words already: its own reading alone
    // keeps its search within the time of one.
    let searched = if readings[0].len() > LONG_QUERY {
        1
    } else {
        SEARCHED_READINGS
    };
    for q in readings.iter().take(searched) {
        for h in search_words(view, q, opts, within) {
            match at.get(&h.ord) {
                Some(&i) if hits[i].score >= h.score => {}
                Some(&i) => hits[i] = h,
                None => {
                    at.insert(h.ord, hits.len());
                    hits.push(h);
                }
            }
        }
    }
    hits.sort_by(|a, b| b.score.total_cmp(&a.score).then(a.ord.cmp(&b.ord)));
    hits.truncate(opts.limit.max(1));
    hits
}

/// Readings of a query searched (its own words and the three with most
/// replaced): each costs a search.
const SEARCHED_READINGS: usize = 4;

/// A query of more words than this is searched in its own words only.
const LONG_QUERY: usize = 8;

/// The codes of `within` (all when none) that best fit the normalised
/// words `q` (one reading).
fn search_words(
    view: &View<'_>,
    q: &[String],
    opts: &SearchOptions,
    within: Option<&[u32]>,
) -> Vec<Hit> {
    let mut q = q.to_vec();
    let mut seen = std::collections::HashSet::new();
    q.retain(|w| seen.insert(w.clone()));
    if q.is_empty() || view.is_empty() {
        return Vec::new();
    }
    let n = view.len() as u32;
    let avg = view.mean_word_count();
    // Per code: its score, the best score of the current word's variants, the
    // weight of the query words found in any of its wordings, and the best
    // weight of the current word's. Kept between searches, all zero (see
    // `Scratch`).
    let mut scratch = SCRATCH.with(|s| s.take());
    scratch.fit(view.len());
    let Scratch {
        score,
        best,
        cover,
        best_w,
    } = &mut scratch;
    let mut skipped = Vec::with_capacity(q.len());
    let mut touched: Vec<u32> = Vec::new();
    let mut any: Vec<u32> = Vec::new();
    let mut weights = Vec::with_capacity(q.len());
    let vs: Vec<Vec<(u64, f32)>> = q
        .iter()
        .enumerate()
        .map(|(i, w)| variants(view, w, opts.prefix_last && i + 1 == q.len()))
        .collect();
    // Words in more than a tenth of the codes (`encounter`, `unspecified`)
    // only pick candidates when the query has no rarer word; they still count
    // in the re-ranking below. Their long posting lists cost the most time.
    let common = n / 10;
    let df = |off: u64| view.posting(off).count;
    let is_common = |v: &Vec<(u64, f32)>| v.iter().all(|&(off, _)| df(off) > common);
    let any_rare = vs.iter().any(|v| !v.is_empty() && !is_common(v));
    for v in &vs {
        let skip = any_rare && is_common(v);
        skipped.push(skip);
        let mut wmax = 0f32;
        for &(off, weight) in v {
            let p = view.posting(off);
            let wi = weight * idf(n, p.count);
            wmax = wmax.max(wi);
            if skip {
                continue;
            }
            for o in p {
                let dl = view.word_count(o) as f32;
                let s = wi * (K1 + 1.0) / (1.0 + K1 * (1.0 - B + B * dl / avg));
                let b = &mut best[o as usize];
                if *b == 0.0 {
                    touched.push(o);
                }
                if s > *b {
                    *b = s;
                }
                let bw = &mut best_w[o as usize];
                *bw = bw.max(wi);
            }
        }
        weights.push(wmax.max(idf(n, 1) * 0.5));
        for &o in &touched {
            let s = &mut score[o as usize];
            if *s == 0.0 {
                any.push(o);
            }
            *s += best[o as usize];
            best[o as usize] = 0.0;
            cover[o as usize] += best_w[o as usize];
            best_w[o as usize] = 0.0;
        }
        touched.clear();
    }
    // The codes whose score and cover are set, to zero them again at the end.
    let set = any.clone();
    if let Some(w) = within {
        any.retain(|o| w.binary_search(o).is_ok());
    }
    // Keep the strongest candidates (by score, then ordinal: a total order,
    // so the set kept does not depend on how it is found), then re-rank them
    // by their description. Only the strongest are put in order.
    let stronger = |a: &u32, b: &u32| {
        score[*b as usize]
            .total_cmp(&score[*a as usize])
            .then(a.cmp(b))
    };
    let mut any = strongest(any, RERANK, &stronger);
    // A short query also re-ranks the codes of few words beyond the
    // strongest: the category's general code for it ("Pneumonia,
    // unspecified organism") is among them, however many rare codes
    // ("Gonococcal pneumonia") are shorter still.
    if q.len() <= SHORT_QUERY && any.len() > RERANK {
        let few: Vec<u32> = any
            .split_off(RERANK)
            .into_iter()
            .filter(|&o| view.word_count(o) as usize <= q.len() + 3)
            .collect();
        any.extend(strongest(few, RERANK, &stronger).into_iter().take(RERANK));
    } else {
        any.truncate(RERANK);
    }
    let total: f32 = weights.iter().sum();
    let mut idf_cache = std::collections::HashMap::new();
    let mut hits: Vec<Hit> = any
        .into_iter()
        .map(|o| {
            let desc = words::words(&view.description(o));
            let mut f = fit_words(view, &q, &weights, &desc, o, false, &mut idf_cache);
            // Words found in other wordings (inclusion terms) count too.
            let common_found: f32 = q
                .iter()
                .zip(&weights)
                .zip(&skipped)
                .filter(|((w, _), &sk)| sk && desc.iter().any(|d| same_word(w, d) > 0.0))
                .map(|((_, wt), _)| *wt)
                .sum();
            f.label = f
                .label
                .max(((cover[o as usize] + common_found) / total).min(1.0));
            let mut s = score[o as usize] / total.max(1e-6);
            s += 0.6 * f.label + 0.5 * f.description + 0.2 * phrase(&q, &desc);
            if f.label >= 0.99 && general(&q, &desc) {
                s += GENERAL_BONUS;
            }
            if first_encounter(&q, &desc) {
                s += INITIAL_BONUS;
            }
            s -= UNSAID_PENALTY * synonyms::unsaid(&q, &desc) as f32;
            if let Some(p) = &opts.period {
                if view.billable_in(o, p) {
                    s += 0.1;
                }
            }
            if let Some(near) = &opts.near {
                s += 0.05 * shared_start(near, &view.code(o)).min(4) as f32;
            }
            Hit {
                ord: o,
                score: s,
                fit: f,
            }
        })
        .collect();
    hits.sort_by(|a, b| b.score.total_cmp(&a.score).then(a.ord.cmp(&b.ord)));
    hits.truncate(opts.limit.max(1));
    for o in set {
        score[o as usize] = 0.0;
        cover[o as usize] = 0.0;
    }
    SCRATCH.with(|s| s.replace(scratch));
    hits
}

/// The per-code tables of [`search_words`], one `f32` per code each, kept
/// for the next search rather than allocated and zeroed per query (four
/// times the codes of the index, for every reading of every label). Every
/// value is zero between searches.
#[derive(Default)]
struct Scratch {
    score: Vec<f32>,
    best: Vec<f32>,
    cover: Vec<f32>,
    best_w: Vec<f32>,
}

impl Scratch {
    /// One value per code of an index of `len` codes.
    fn fit(&mut self, len: usize) {
        for v in [
            &mut self.score,
            &mut self.best,
            &mut self.cover,
            &mut self.best_w,
        ] {
            v.resize(len, 0.0);
        }
    }
}

thread_local! {
    static SCRATCH: std::cell::RefCell<Scratch> = std::cell::RefCell::default();
}

/// `items` with its `k` first by `order` moved to the front and sorted
/// (the rest after them, in no order): a full sort's first `k`, without
/// sorting thousands of weak candidates.
fn strongest<F>(mut items: Vec<u32>, k: usize, order: &F) -> Vec<u32>
where
    F: Fn(&u32, &u32) -> std::cmp::Ordering,
{
    if items.len() > k && k > 0 {
        items.select_nth_unstable_by(k - 1, order);
    }
    let end = k.min(items.len());
    items[..end].sort_unstable_by(order);
    items
}

/// Words that leave a description as general as the query it fits
/// ("Pneumonia, unspecified organism" for `pneumonia`; "Type 2 diabetes
/// mellitus without complications" for `type 2 diabetes mellitus`): the
/// ICD-10-CM wording of a category's residual code (common practice).
const GENERAL_WORDS: &[&str] = &[
    "achieved",
    "complication",
    "having",
    "nos",
    "not",
    "organism",
    "remission",
    "site",
    "uncomplicated",
    "unspecified",
    "without",
];

/// Queries of at most this many words prefer the general code.
const SHORT_QUERY: usize = 2;

/// Score added to a code whose description is the query's words and
/// [`GENERAL_WORDS`] alone: a short query ranks the common code above the
/// rare specific ones, unless its other words point to them.
const GENERAL_BONUS: f32 = 0.3;

/// Whether every word of `desc` is a query word or one of [`GENERAL_WORDS`].
fn general(q: &[String], desc: &[String]) -> bool {
    desc.iter()
        .all(|d| GENERAL_WORDS.contains(&d.as_str()) || q.iter().any(|w| same_word(w, d) > 0.0))
}

/// Score added to an injury code for the initial encounter when the query
/// names no encounter: of the 7th characters A, D and S the initial encounter
/// is the one a search for the injury means first (common practice).
const INITIAL_BONUS: f32 = 0.1;

/// Score taken from a code per word it adds that a query saying neither
/// side does not mean ([`synonyms::unsaid`]: "lung cancer" is the primary
/// malignant neoplasm before the secondary one).
const UNSAID_PENALTY: f32 = 0.15;

/// Whether `desc` is an initial encounter and `q` names no encounter.
fn first_encounter(q: &[String], desc: &[String]) -> bool {
    desc.windows(2)
        .any(|w| w[0] == "initial" && w[1] == "encounter")
        && !q.iter().any(|w| {
            matches!(
                w.as_str(),
                "initial" | "subsequent" | "sequela" | "encounter"
            )
        })
}

/// Characters two codes share at the start.
pub fn shared_start(a: &str, b: &str) -> usize {
    a.bytes().zip(b.bytes()).take_while(|(x, y)| x == y).count()
}

/// Share of neighbouring query word pairs that also stand side by side in
/// the description (a whole-phrase match scores 1).
fn phrase(q: &[String], desc: &[String]) -> f32 {
    if q.len() < 2 {
        return 0.0;
    }
    let pairs = q
        .windows(2)
        .filter(|p| desc.windows(2).any(|d| d[0] == p[0] && d[1] == p[1]))
        .count();
    pairs as f32 / (q.len() - 1) as f32
}

fn fit_words(
    view: &View<'_>,
    q: &[String],
    weights: &[f32],
    desc: &[String],
    ord: u32,
    other_wordings: bool,
    idf_cache: &mut std::collections::HashMap<String, f32>,
) -> Fit {
    let n = view.len() as u32;
    let mut have = 0f32;
    let mut all = 0f32;
    for (w, &wt) in q.iter().zip(weights) {
        all += wt;
        let mut got = desc.iter().map(|d| same_word(w, d)).fold(0.0, f32::max);
        if got < 1.0 && other_wordings && in_posting(view, w, ord) {
            got = 1.0;
        }
        have += wt * got;
    }
    let mut dhave = 0f32;
    let mut dall = 0f32;
    let mut dseen = std::collections::HashSet::new();
    for d in desc {
        if !dseen.insert(d) {
            continue;
        }
        let wt = match idf_cache.get(d.as_str()) {
            Some(&w) => w,
            None => {
                let w = idf(n, view.word_codes(d).max(1));
                idf_cache.insert(d.clone(), w);
                w
            }
        };
        dall += wt;
        dhave += wt * q.iter().map(|w| same_word(w, d)).fold(0.0, f32::max);
    }
    Fit {
        label: if all > 0.0 { have / all } else { 0.0 },
        description: if dall > 0.0 { dhave / dall } else { 0.0 },
    }
}

/// Whether the code's words (description and other wordings) include `w`.
fn in_posting(view: &View<'_>, w: &str, ord: u32) -> bool {
    let Some(off) = view.words().get(w) else {
        return false;
    };
    view.posting(off)
        .take_while(|&o| o <= ord)
        .any(|o| o == ord)
}

/// How well `label` fits the code at `ord`: its words against the official
/// description and, for the label's share, the code's other official
/// wordings too (inclusion terms, older descriptions); the best of the
/// label's readings ([`synonyms::readings`]).
pub fn fit(view: &View<'_>, label: &str, ord: u32) -> Fit {
    best_fit(view, label, ord).0
}

/// [`fit`], with the reading that fits best (the label's own words when
/// none fits better).
pub fn best_fit(view: &View<'_>, label: &str, ord: u32) -> (Fit, Vec<String>) {
    let desc = words::words(&view.description(ord));
    let mut best: Option<(Fit, Vec<String>)> = None;
    for r in synonyms::readings(&words::words(label)) {
        let f = fit_reading(view, &r, &desc, ord);
        if best.as_ref().is_none_or(|(b, _)| f.label > b.label) {
            best = Some((f, r));
        }
    }
    best.unwrap_or_default()
}

fn fit_reading(view: &View<'_>, reading: &[String], desc: &[String], ord: u32) -> Fit {
    let mut q = reading.to_vec();
    let mut seen = std::collections::HashSet::new();
    q.retain(|w| seen.insert(w.clone()));
    let n = view.len() as u32;
    let weights: Vec<f32> = q
        .iter()
        .map(|w| idf(n, view.word_codes(w).max(1)))
        .collect();
    fit_words(view, &q, &weights, desc, ord, true, &mut Default::default())
}

/// A code found by [`find`], ready to show (its JSON form is part of the
/// `rollcall find --format json` output and the page's search results).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Found {
    /// The code, dotted (`E11.65`).
    pub code: String,
    /// Its official description.
    pub description: String,
    /// On the day asked about: `billable`, `header`, or `not-in-use`; in a
    /// stated hierarchy (HPO) `in-use` or `retired`.
    pub status: &'static str,
    /// First day it was billable, if ever.
    pub billable_from: Option<Date>,
    /// Last day it was billable, if ever (the end of the index's coverage
    /// when it still is).
    pub billable_to: Option<Date>,
    /// Share of the query's words found in its description (0 to 1, two decimals).
    pub fit: f64,
}

/// Codes for the words of `query` as of `day`, best first; the last word is
/// taken as a prefix when `typing` (search as you type). Codes in use on
/// `day` are preferred.
pub fn find(view: &View<'_>, query: &str, day: Date, limit: usize, typing: bool) -> Vec<Found> {
    let day = view.meta().search_day(day);
    let opts = SearchOptions {
        limit,
        prefix_last: typing,
        period: Some(Period::new(day, day)),
        near: None,
    };
    search(view, query, &opts)
        .into_iter()
        .map(|h| found(view, h.ord, day, h.fit.label))
        .collect()
}

/// The code at `ord` as [`find`] shows it, as of `day`, with the share of
/// the query's words its description has.
pub fn found(view: &View<'_>, o: u32, day: Date, fit: f32) -> Found {
    // A stated hierarchy has no headers: a code is in use or retired.
    let status = if view.is_graph() {
        if view.billable(o).any(|p| p.contains(day)) {
            "in-use"
        } else {
            "retired"
        }
    } else if view.billable(o).any(|p| p.contains(day)) {
        "billable"
    } else if view.header(o).any(|p| p.contains(day)) {
        "header"
    } else {
        "not-in-use"
    };
    Found {
        code: view.display(&view.code(o)),
        description: view.description(o),
        status,
        billable_from: view.billable(o).map(|p| p.from).min(),
        billable_to: view.billable(o).map(|p| p.to).max(),
        fit: (fit as f64 * 100.0).round() / 100.0,
    }
}
