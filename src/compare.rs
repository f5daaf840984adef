//! Comparing two lists over one study period: check each, expand each to the
//! billable codes it reaches in the period, then set arithmetic on the two
//! sets, with the differences grouped into whole subtrees, a tally per
//! chapter, entries written differently that reach the same codes, and the
//! nearest code of the other list for each difference. The rules are written
//! out in the README.

use crate::check::{check_with_reach_among, CheckOptions, EntryKey, Reach};
use crate::index::{Index, View};
use crate::model::Period;
use crate::report::{IndexInfo, OptionsInfo, Report, Summary};
use serde::Serialize;
use std::collections::{HashMap, HashSet};

/// Which list.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub enum Side {
    /// The first list.
    #[serde(rename = "a")]
    A,
    /// The second list.
    #[serde(rename = "b")]
    B,
}

impl Side {
    /// `a` or `b`.
    pub fn name(self) -> &'static str {
        match self {
            Side::A => "a",
            Side::B => "b",
        }
    }
    fn other(self) -> Side {
        match self {
            Side::A => Side::B,
            Side::B => Side::A,
        }
    }
}

/// One list of a comparison.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ListSide {
    /// The name the caller gave the list (a file name).
    pub name: String,
    /// The counts of its check.
    pub summary: Summary,
    /// Billable codes of the period it reaches.
    pub reaches: usize,
    /// Its full check report.
    pub report: Report,
}

/// Agreement over the two expanded sets.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Agreement {
    /// Codes reached by both lists.
    pub both: usize,
    /// Codes reached by the first list only.
    pub only_a: usize,
    /// Codes reached by the second list only.
    pub only_b: usize,
    /// Codes reached by either.
    pub union: usize,
    /// Jaccard index: both / union (1 when both lists reach nothing).
    pub jaccard: f64,
    /// Share of the first list's codes that the second reaches (1 when the
    /// first reaches nothing).
    pub a_in_b: f64,
    /// Share of the second list's codes that the first reaches.
    pub b_in_a: f64,
}

/// The tally of one chapter.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct ChapterTally {
    /// Chapter number as printed (`4`), or empty for codes outside every chapter.
    pub chapter: String,
    /// Chapter title with its range.
    pub title: String,
    /// Codes of the chapter reached by both lists.
    pub both: usize,
    /// By the first only.
    pub only_a: usize,
    /// By the second only.
    pub only_b: usize,
}

/// How the nearest code of the other list stands to a difference.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Relation {
    /// The other list has an ancestor of the difference.
    Parent,
    /// The other list has a code under the difference.
    Child,
    /// The other list has a code with the same parent.
    Sibling,
    /// The other list has a code under the same category, further off.
    SameCategory,
}

impl Relation {
    /// The relation's name in reports.
    pub fn name(self) -> &'static str {
        match self {
            Relation::Parent => "parent",
            Relation::Child => "child",
            Relation::Sibling => "sibling",
            Relation::SameCategory => "same-category",
        }
    }
}

/// The nearest code of the other list.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Nearest {
    /// The code (dotted).
    pub code: String,
    /// Its description.
    pub description: String,
    /// How it stands to the difference.
    pub relation: Relation,
}

/// A code and its description.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Named {
    /// The code (dotted).
    pub code: String,
    /// Its description.
    pub description: String,
}

/// A run of codes that one list reaches and the other does not: a whole
/// subtree when `all_of` is set, else a single code.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Difference {
    /// The list that reaches these codes.
    pub side: Side,
    /// The subtree (or single code) the run is, dotted.
    pub code: String,
    /// Its description.
    pub description: String,
    /// Whether the run is every billable code of the period under `code`
    /// (false for a single billable code).
    pub all_of: bool,
    /// The billable codes of the run.
    pub codes: Vec<Named>,
    /// The node just above the run (its parent), which the side only
    /// partly reaches; consecutive runs with the same `within` read as one
    /// group ("4 of the 6 billable codes under E11.4").
    pub within: Option<Named>,
    /// Billable codes of the period under `within` (itself included).
    pub within_total: usize,
    /// Of those, how many this side alone reaches.
    pub within_only: usize,
    /// The category (`E11`) the run lies in.
    pub category: String,
    /// The chapter number as printed.
    pub chapter: String,
    /// The closest code the other list reaches or names, if any within the category.
    pub nearest: Option<Nearest>,
}

/// Entries written differently in the two lists that reach the same codes.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Equivalent {
    /// Lines of the first list.
    pub a_lines: Vec<usize>,
    /// Their entries as written (dotted codes or patterns).
    pub a_entries: Vec<String>,
    /// Lines of the second list.
    pub b_lines: Vec<usize>,
    /// Their entries.
    pub b_entries: Vec<String>,
    /// How many billable codes both sides reach.
    pub codes: usize,
}

/// The result of comparing two lists.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Comparison {
    /// Vocabulary id.
    pub vocabulary: String,
    /// The index used.
    pub index: IndexInfo,
    /// The options used.
    pub options: OptionsInfo,
    /// The first list.
    pub a: ListSide,
    /// The second list.
    pub b: ListSide,
    /// Agreement figures.
    pub agreement: Agreement,
    /// Tallies of the chapters either list reaches, in chapter order.
    pub chapters: Vec<ChapterTally>,
    /// The differences, in code order.
    pub differences: Vec<Difference>,
    /// Entries written differently that reach the same codes.
    pub equivalents: Vec<Equivalent>,
}

impl Comparison {
    /// Whether the two lists reach exactly the same codes.
    pub fn same_codes(&self) -> bool {
        self.agreement.only_a == 0 && self.agreement.only_b == 0
    }
}

/// Compares two lists for the period in `options`. `names` are what the
/// lists are called in the result (file names, say).
pub fn compare<D: AsRef<[u8]>>(
    index: &Index<D>,
    a: (&str, &str),
    b: (&str, &str),
    options: &CheckOptions,
) -> Comparison {
    compare_among(index, &[], a, b, options)
}

/// [`compare`], with other systems' indexes at hand for the two checks (as
/// in [`crate::check_among`]).
pub fn compare_among<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    a: (&str, &str),
    b: (&str, &str),
    options: &CheckOptions,
) -> Comparison {
    let view = index.view();
    let period = options.period_for(index.meta());
    let (report_a, reach_a) = check_with_reach_among(index, others, a.1, options);
    let (report_b, reach_b) = check_with_reach_among(index, others, b.1, options);
    let set_a = union_of(&reach_a);
    let set_b = union_of(&reach_b);

    let (mut both, mut only_a, mut only_b) = (Vec::new(), Vec::new(), Vec::new());
    merge(&set_a, &set_b, &mut both, &mut only_a, &mut only_b);
    let union = both.len() + only_a.len() + only_b.len();
    let share = |n: usize, of: usize| if of == 0 { 1.0 } else { n as f64 / of as f64 };
    let agreement = Agreement {
        both: both.len(),
        only_a: only_a.len(),
        only_b: only_b.len(),
        union,
        jaccard: share(both.len(), union),
        a_in_b: share(both.len(), set_a.len()),
        b_in_a: share(both.len(), set_b.len()),
    };

    let touched_a = touched(&set_a, &reach_a);
    let touched_b = touched(&set_b, &reach_b);
    let mut grouper = Grouper::new(&view, &period);
    let mut differences = grouper.runs(Side::A, &only_a, &touched_b);
    differences.extend(grouper.runs(Side::B, &only_b, &touched_a));
    differences.sort_by(|x, y| {
        fn first(d: &Difference) -> Option<&str> {
            d.codes.first().map(|c| c.code.as_str())
        }
        first(x)
            .cmp(&first(y))
            .then(x.side.name().cmp(y.side.name()))
    });

    let chapters = tally(&view, &both, &only_a, &only_b);
    let mut equivalents = equivalents(&reach_a, &reach_b, false);
    equivalents.extend(self::equivalents(&reach_b, &reach_a, true));
    equivalents.sort_by_key(|e| (e.a_lines.first().copied(), e.b_lines.first().copied()));

    Comparison {
        vocabulary: report_a.vocabulary.clone(),
        index: report_a.index.clone(),
        options: report_a.options.clone(),
        a: ListSide {
            name: a.0.to_string(),
            summary: report_a.summary.clone(),
            reaches: set_a.len(),
            report: report_a,
        },
        b: ListSide {
            name: b.0.to_string(),
            summary: report_b.summary.clone(),
            reaches: set_b.len(),
            report: report_b,
        },
        agreement,
        chapters,
        differences,
        equivalents,
    }
}

/// The sorted, distinct ordinals reached by any entry.
fn union_of(reach: &[Reach]) -> Vec<u32> {
    let mut all: Vec<u32> = reach.iter().flat_map(|r| r.ords.iter().copied()).collect();
    all.sort_unstable();
    all.dedup();
    all
}

/// Reached codes plus the codes entries name (a retired or header code a
/// list names is still the nearest thing it says).
fn touched(set: &[u32], reach: &[Reach]) -> Vec<u32> {
    let mut all: Vec<u32> = set.to_vec();
    all.extend(reach.iter().filter_map(|r| match r.key {
        EntryKey::Code(o) => Some(o),
        EntryKey::Pattern(_) => None,
    }));
    all.sort_unstable();
    all.dedup();
    all
}

/// Splits two sorted sets into common and one-sided parts.
fn merge(a: &[u32], b: &[u32], both: &mut Vec<u32>, only_a: &mut Vec<u32>, only_b: &mut Vec<u32>) {
    let (mut i, mut j) = (0, 0);
    while i < a.len() && j < b.len() {
        match a[i].cmp(&b[j]) {
            std::cmp::Ordering::Equal => {
                both.push(a[i]);
                i += 1;
                j += 1;
            }
            std::cmp::Ordering::Less => {
                only_a.push(a[i]);
                i += 1;
            }
            std::cmp::Ordering::Greater => {
                only_b.push(b[j]);
                j += 1;
            }
        }
    }
    only_a.extend_from_slice(&a[i..]);
    only_b.extend_from_slice(&b[j..]);
}

/// How many of a sorted set lie in `lo..hi`.
fn count_in(set: &[u32], lo: u32, hi: u32) -> usize {
    set.partition_point(|&o| o < hi) - set.partition_point(|&o| o < lo)
}

/// Groups one-sided codes into the largest subtrees they fill.
struct Grouper<'v, 'a> {
    view: &'v View<'a>,
    period: &'v Period,
    /// Billable codes of the period in each node's subtree, itself included.
    size: HashMap<u32, usize>,
}

impl<'v, 'a> Grouper<'v, 'a> {
    fn new(view: &'v View<'a>, period: &'v Period) -> Self {
        Grouper {
            view,
            period,
            size: HashMap::new(),
        }
    }

    fn billable_size(&mut self, node: u32) -> usize {
        let (view, period) = (self.view, self.period);
        *self.size.entry(node).or_insert_with(|| {
            std::iter::once(node)
                .chain(view.descendants(node))
                .filter(|&o| view.billable_in(o, period))
                .count()
        })
    }

    /// The runs of `only` (sorted), each the highest node whose billable
    /// codes of the period all lie in `only`, with the nearest code of
    /// `other` (sorted).
    fn runs(&mut self, side: Side, only: &[u32], other: &[u32]) -> Vec<Difference> {
        let view = self.view;
        let mut out = Vec::new();
        let mut within_of: HashMap<u32, (usize, usize)> = HashMap::new();
        let mut categories = OtherByCategory::default();
        let mut i = 0;
        while i < only.len() {
            let mut node = only[i];
            // A graph's subtrees are not ranges of `only`: each code is its own run.
            while let Some(p) = view.parent(node).filter(|_| !view.is_graph()) {
                let end = view.subtree_end(p);
                if count_in(only, p, end) == self.billable_size(p) {
                    node = p;
                } else {
                    break;
                }
            }
            let end = view.subtree_end(node);
            let mut j = i + count_in(&only[i..], node, end);
            if j == i {
                // Only a damaged index gives a subtree that misses the
                // code it was climbed from: the code is its own run.
                node = only[i];
                j = i + 1;
            }
            let parent = view.parent(node);
            let (within_total, within_only) = match parent {
                // Siblings share a parent: its part of `only` is counted once.
                Some(p) if view.is_graph() => *within_of.entry(p).or_insert_with(|| {
                    let under = std::iter::once(p)
                        .chain(view.descendants(p))
                        .filter(|&o| view.billable_in(o, self.period));
                    under.fold((0, 0), |(all, have), o| {
                        (all + 1, have + usize::from(only.binary_search(&o).is_ok()))
                    })
                }),
                Some(p) => (
                    self.billable_size(p),
                    count_in(only, p, view.subtree_end(p)),
                ),
                None => (0, 0),
            };
            let within = parent.map(|p| Named {
                code: view.display(&view.code(p)),
                description: view.description_or_note(p),
            });
            let codes: Vec<Named> = only[i..j]
                .iter()
                .map(|&o| Named {
                    code: view.display(&view.code(o)),
                    description: view.description_or_note(o),
                })
                .collect();
            let code = view.display(&view.code(node));
            let category = view.display(&view.code(view.category(node)));
            let chapter = view
                .section_of(&view.code(node))
                .and_then(|(_, c)| c)
                .map(|c| c.name.clone())
                .unwrap_or_default();
            out.push(Difference {
                side,
                description: view.description_or_note(node),
                all_of: j - i > 1 || node != only[i],
                nearest: nearest(view, node, other, &mut categories),
                within,
                within_total,
                within_only,
                code,
                codes,
                category,
                chapter,
            });
            i = j.max(i + 1);
        }
        out
    }
}

/// The first two codes of the other list (in its order) in each category,
/// worked out once per list on first need: asking each code's category for
/// every difference made a compare on a graph quadratic.
#[derive(Default)]
struct OtherByCategory(Option<HashMap<u32, [Option<u32>; 2]>>);

impl OtherByCategory {
    /// The first code of `other` in `node`'s category that is not `node`.
    fn first(&mut self, view: &View<'_>, node: u32, other: &[u32]) -> Option<u32> {
        let by = self.0.get_or_insert_with(|| {
            let mut by: HashMap<u32, [Option<u32>; 2]> = HashMap::new();
            for &o in other {
                let two = by.entry(view.category(o)).or_default();
                if let Some(slot) = two.iter_mut().find(|s| s.is_none()) {
                    *slot = Some(o);
                }
            }
            by
        });
        by.get(&view.category(node))?
            .iter()
            .flatten()
            .copied()
            .find(|&o| o != node)
    }
}

/// The code of `other` (sorted) closest to `node` in the hierarchy, no
/// further off than the node's category.
fn nearest(
    view: &View<'_>,
    node: u32,
    other: &[u32],
    categories: &mut OtherByCategory,
) -> Option<Nearest> {
    let make = |o: u32, relation| Nearest {
        code: view.display(&view.code(o)),
        description: view.description_or_note(o),
        relation,
    };
    if let Some(a) = view
        .ancestors(node)
        .find(|a| other.binary_search(a).is_ok())
    {
        return Some(make(a, Relation::Parent));
    }
    if view.is_graph() {
        return nearest_in_graph(view, node, other, categories).map(|(o, r)| make(o, r));
    }
    let end = view.subtree_end(node);
    let under = other.partition_point(|&o| o <= node);
    if other.get(under).is_some_and(|&o| o < end) {
        return Some(make(other[under], Relation::Child));
    }
    for (depth, anc) in view.ancestors(node).enumerate() {
        let hi = view.subtree_end(anc);
        // The closest code of `other` in anc's subtree but outside node's.
        let before = other[..other.partition_point(|&o| o < node)]
            .last()
            .copied()
            .filter(|&o| o > anc);
        let after = other
            .get(other.partition_point(|&o| o < end))
            .copied()
            .filter(|&o| o < hi);
        let pick = match (before, after) {
            (Some(x), Some(y)) => Some(if node - x <= y - node { x } else { y }),
            (x, y) => x.or(y),
        };
        if let Some(o) = pick {
            let rel = if depth == 0 {
                Relation::Sibling
            } else {
                Relation::SameCategory
            };
            return Some(make(o, rel));
        }
    }
    None
}

/// [`nearest`] in a stated hierarchy, past the ancestors: a code below,
/// then one sharing a parent, then one of the same category.
fn nearest_in_graph(
    view: &View<'_>,
    node: u32,
    other: &[u32],
    categories: &mut OtherByCategory,
) -> Option<(u32, Relation)> {
    let has = |o: &u32| other.binary_search(o).is_ok();
    if let Some(c) = view.descendants(node).find(has) {
        return Some((c, Relation::Child));
    }
    for p in view.parents(node) {
        if let Some(s) = view.children(p).find(|c| *c != node && has(c)) {
            return Some((s, Relation::Sibling));
        }
    }
    categories
        .first(view, node, other)
        .map(|o| (o, Relation::SameCategory))
}

/// The per-chapter tally of the three parts (per category in a stated hierarchy).
fn tally(view: &View<'_>, both: &[u32], only_a: &[u32], only_b: &[u32]) -> Vec<ChapterTally> {
    let mut by: Vec<(usize, ChapterTally)> = Vec::new();
    let chapters = view.chapters();
    for (part, set) in [both, only_a, only_b].into_iter().enumerate() {
        for &o in set {
            let code = view.code(o);
            let graph = view.is_graph().then(|| view.category(o));
            let (key, name, title) = match view.section_of(&code).map(|(s, _)| s.chapter as usize) {
                _ if graph.is_some() => {
                    let c = graph.unwrap_or(o);
                    (
                        c as usize,
                        view.display(&view.code(c)),
                        view.description_or_note(c),
                    )
                }
                Some(i) if i < chapters.len() => {
                    (i, chapters[i].name.clone(), chapters[i].title.clone())
                }
                _ => (
                    usize::MAX,
                    String::new(),
                    "Outside the chapters".to_string(),
                ),
            };
            let t = match by.iter().position(|(k, _)| *k == key) {
                Some(p) => &mut by[p].1,
                None => {
                    by.push((
                        key,
                        ChapterTally {
                            chapter: name,
                            title,
                            both: 0,
                            only_a: 0,
                            only_b: 0,
                        },
                    ));
                    &mut by.last_mut().expect("just pushed").1
                }
            };
            match part {
                0 => t.both += 1,
                1 => t.only_a += 1,
                _ => t.only_b += 1,
            }
        }
    }
    by.sort_by_key(|(k, _)| *k);
    by.into_iter().map(|(_, t)| t).collect()
}

/// For each entry of `one`, the entries of `two` that reach only codes of
/// it and together all of them, when that is not simply the same entry.
/// With `flipped`, `one` is the second list and the result's sides swap.
fn equivalents(one: &[Reach], two: &[Reach], flipped: bool) -> Vec<Equivalent> {
    let mut by_ord: HashMap<u32, Vec<usize>> = HashMap::new();
    for (k, r) in two.iter().enumerate() {
        for &o in &r.ords {
            by_ord.entry(o).or_default().push(k);
        }
    }
    let keys_one: HashSet<&EntryKey> = one.iter().map(|r| &r.key).collect();
    let keys_two: HashSet<&EntryKey> = two.iter().map(|r| &r.key).collect();
    let mut out = Vec::new();
    for e in one.iter().filter(|e| !e.ords.is_empty()) {
        let mut partners: Vec<usize> = e
            .ords
            .iter()
            .filter_map(|o| by_ord.get(o))
            .flatten()
            .copied()
            .collect();
        partners.sort_unstable();
        partners.dedup();
        if partners.is_empty() {
            continue;
        }
        // Only entries that one list writes and the other does not: where
        // both write a code, the lists agree on it already.
        if keys_two.contains(&e.key) || partners.iter().any(|&k| keys_one.contains(&two[k].key)) {
            continue;
        }
        // In the flipped pass only many-to-one is new (one-to-one pairs were
        // found in the first pass).
        if flipped && partners.len() < 2 {
            continue;
        }
        let inside = partners
            .iter()
            .all(|&k| two[k].ords.iter().all(|o| e.ords.binary_search(o).is_ok()));
        let mut covered: Vec<u32> = partners
            .iter()
            .flat_map(|&k| two[k].ords.iter().copied())
            .collect();
        covered.sort_unstable();
        covered.dedup();
        if !inside || covered != e.ords {
            continue;
        }
        let (lines, entries): (Vec<usize>, Vec<String>) = partners
            .iter()
            .map(|&k| (two[k].line, two[k].written.clone()))
            .unzip();
        let item = if flipped {
            Equivalent {
                a_lines: lines,
                a_entries: entries,
                b_lines: vec![e.line],
                b_entries: vec![e.written.clone()],
                codes: e.ords.len(),
            }
        } else {
            Equivalent {
                a_lines: vec![e.line],
                a_entries: vec![e.written.clone()],
                b_lines: lines,
                b_entries: entries,
                codes: e.ords.len(),
            }
        };
        out.push(item);
    }
    out
}

impl Difference {
    /// The list that does not reach these codes.
    pub fn missing_from(&self) -> Side {
        self.side.other()
    }
}
