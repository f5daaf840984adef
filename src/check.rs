//! The check of one list for one study period: resolve every line, then
//! judge each entry against the period and the rest of the list, then run
//! the whole-list checks. The rules are written out in the README.

use crate::code::{self, Resolved};
use crate::date::Date;
use crate::index::{Index, View};
use crate::list::{Draft, LineKind, Reading};
use crate::listcheck;
use crate::model::{Period, Span, SpanKind};
use crate::pattern::{self, Pattern};
use crate::report::*;
use crate::systems::{self, Shape, System};
use serde::Serialize;
use std::collections::{HashMap, HashSet};

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

/// A hasher for ordinals (small integers chosen by us, not by an attacker):
/// one multiply instead of SipHash.
#[derive(Default, Clone, Copy)]
pub(crate) struct OrdHasher(u64);

impl std::hash::Hasher for OrdHasher {
    fn finish(&self) -> u64 {
        self.0
    }
    fn write(&mut self, bytes: &[u8]) {
        for &b in bytes {
            self.0 = (self.0.rotate_left(5) ^ b as u64).wrapping_mul(0x51_7c_c1_b7_27_22_0a_95);
        }
    }
    fn write_u32(&mut self, n: u32) {
        self.0 = (self.0 ^ n as u64).wrapping_mul(0x9e37_79b9_7f4a_7c15);
    }
}

/// Maps keyed by ordinal.
pub(crate) type OrdMap<V> = HashMap<u32, V, std::hash::BuildHasherDefault<OrdHasher>>;

/// A set of ordinals as a bitmap, remembering insertion order for iteration.
pub(crate) struct Marks {
    bits: Vec<u64>,
    list: Vec<u32>,
}

impl Marks {
    pub fn new(len: usize) -> Marks {
        Marks {
            bits: vec![0; len.div_ceil(64)],
            list: Vec::new(),
        }
    }
    pub fn insert(&mut self, o: u32) -> bool {
        let (w, b) = (o as usize / 64, 1u64 << (o % 64));
        match self.bits.get_mut(w) {
            Some(x) if *x & b == 0 => {
                *x |= b;
                self.list.push(o);
                true
            }
            _ => false,
        }
    }
    #[inline]
    pub fn contains(&self, o: &u32) -> bool {
        self.bits
            .get(*o as usize / 64)
            .is_some_and(|x| x & (1u64 << (o % 64)) != 0)
    }
}

impl<'a> IntoIterator for &'a Marks {
    type Item = &'a u32;
    type IntoIter = std::slice::Iter<'a, u32>;
    fn into_iter(self) -> Self::IntoIter {
        self.list.iter()
    }
}

/// The list as a whole, for judging each entry against the others.
pub(crate) struct ListContext {
    /// Explicit code entries: ordinal → lines.
    pub listed: OrdMap<Vec<usize>>,
    /// Billable-in-period codes reached by explicit entries or patterns.
    pub reached: Marks,
    /// Billable-in-period codes written explicitly.
    pub explicit: Marks,
    /// Codes matched by a pattern → the first pattern line.
    pub by_pattern: OrdMap<usize>,
    /// Whether any code of the list is written with a dot. A list written
    /// wholly without dots uses the official undotted form of the release
    /// files, so a missing dot is only worth a note in a list that mixes forms.
    pub dotted: bool,
}

/// The other systems whose shape a code that is no code of the index's
/// vocabulary fits, and a sentence saying so.
fn other_systems(view: &View<'_>, written: &str) -> Option<(Vec<System>, String)> {
    let own = view.meta().vocabulary.as_str();
    let fits: Vec<(System, String)> = systems::ALL
        .into_iter()
        .filter(|s| s.name() != own)
        .filter_map(|s| match systems::shape(s, written) {
            Shape::Fits { note, .. } => Some((s, note)),
            Shape::Ambiguous { reason, .. } => Some((s, reason)),
            Shape::Fails { .. } => None,
        })
        .collect();
    if fits.is_empty() {
        return None;
    }
    let title = &view.meta().title;
    let message = match fits.as_slice() {
        [(s, note)] => format!(
            "\"{written}\" is not {} {title} code; it {note}, so it looks like {} {} code. Check it in a list of its own with --system {}{}",
            article(title),
            s.article(),
            s.title(),
            s.name(),
            if s.bundled() {
                ", whose bundled index checks it fully"
            } else {
                "; rollcall checks that system by shape only"
            }
        ),
        many => format!(
            "\"{written}\" is not {article} {title} code; it has the shape of a code of {}. Say which system it is from (--system NAME) and check it in a list of its own",
            many.iter()
                .map(|(s, _)| format!("{} ({})", s.title(), s.name()))
                .collect::<Vec<_>>()
                .join(", "),
            article = article(title)
        ),
    };
    Some((fits.into_iter().map(|(s, _)| s).collect(), message))
}

/// When `code` is no code of `view` but a code of one of `others`: that
/// system's name, a sentence, and the targets of its mapping into `view`'s
/// vocabulary (the GEMs) with their flags in words and their status in
/// the period.
fn known_elsewhere(
    view: &View<'_>,
    others: &[View<'_>],
    code: &str,
    period: &Period,
) -> Option<(String, String, Vec<Suggestion>)> {
    let own = view.meta().vocabulary.as_str();
    for other in others {
        // A dot where the other system puts none (`E88.00` for E880.0) says
        // the code is not from there.
        let code::Resolved::Found { ord, changes } = code::resolve(other, code) else {
            continue;
        };
        if changes.contains(&"dot moved") {
            continue;
        }
        let meta = other.meta();
        let shown = other.display(&other.code(ord));
        let mut message = format!(
            "{shown} is not {} {} code; it is {} {} code ({}), valid {}",
            article(&view.meta().title),
            view.meta().title,
            article(&meta.title),
            meta.title,
            other.description_or_note(ord),
            other
                .billable(ord)
                .map(|p| format!("{} to {}", p.from, p.to))
                .collect::<Vec<_>>()
                .join(", ")
        );
        let mut sugg = Vec::new();
        // The mapping may live in either index (the GEMs of both directions
        // are kept with ICD-9-CM).
        let mapping = other
            .mapping(&meta.vocabulary, own)
            .or_else(|| view.mapping(&meta.vocabulary, own));
        match mapping {
            Some(m) => {
                let rows = m.lookup(&other.code(ord));
                let words = crate::translate::flag_words(&rows);
                message.push_str(&format!("; {}: {words}", m.title));
                for r in rows.iter().filter(|r| !r.flags.no_map) {
                    let Some(t) = view.ordinal(&r.target) else {
                        sugg.push(Suggestion {
                            code: r.target.clone(),
                            description: String::new(),
                            reason: format!(
                                "{} target, not in any {} release from {} on",
                                m.title,
                                view.meta().title,
                                view.meta().coverage_from
                            ),
                        });
                        continue;
                    };
                    let mut reason = crate::translate::row_words(&r.flags);
                    if !view.billable_in(t, period) {
                        reason.push_str(", but not billable in the period");
                    }
                    sugg.push(suggestion(view, t, reason));
                }
            }
            None => message.push_str(&format!(
                "; rollcall has no mapping from {} into {}",
                meta.title,
                view.meta().title
            )),
        }
        return Some((meta.vocabulary.clone(), message, sugg));
    }
    None
}

/// `a` or `an` before a system's title (`an ICD-10-CM`).
pub(crate) fn article(title: &str) -> &'static str {
    if title.starts_with(['I', 'H', 'N', 'R', 'A', 'E', 'O']) && !title.starts_with("HCPCS") {
        "an"
    } else {
        "a"
    }
}

/// Checks a list against an index for the period in `options`.
///
/// ```no_run
/// let index = rollcall::Index::open(std::fs::read("vocab/icd10cm.rcx").unwrap()).unwrap();
/// let day = rollcall::Date::parse("2026-01-01").unwrap();
/// let report = rollcall::check(&index, "E11.9\nE11.56\n", &rollcall::CheckOptions::on(day, true));
/// assert_eq!(report.summary.entries, 2);
/// ```
pub fn check<D: AsRef<[u8]>>(index: &Index<D>, text: &str, options: &CheckOptions) -> Report {
    run(index, text, options, Want::default()).0
}

/// [`check`], with the indexes of other systems at hand: an entry that is
/// no code of `index` but a code of one of `others` is reported as that
/// system's code, with the mapping's targets (the GEMs) as suggestions.
pub fn check_among<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    text: &str,
    options: &CheckOptions,
) -> Report {
    let want = Want {
        others,
        ..Want::default()
    };
    run(index, text, options, want).0
}

/// [`check`], plus how much of each category the list covers (for the
/// page's coverage bars), computed from the same pass over the list.
pub fn check_with_coverage<D: AsRef<[u8]>>(
    index: &Index<D>,
    text: &str,
    options: &CheckOptions,
) -> (Report, Vec<CategoryCoverage>) {
    check_among_with_coverage(index, &[], text, options)
}

/// [`check_among`], plus the coverage of [`check_with_coverage`], from one pass.
pub fn check_among_with_coverage<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    text: &str,
    options: &CheckOptions,
) -> (Report, Vec<CategoryCoverage>) {
    check_draft(
        index,
        others,
        &crate::list::read(text, Reading::Auto),
        options,
    )
}

/// What an entry reaches: the billable codes of the period it stands for.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Reach {
    /// The entry's line.
    pub line: usize,
    /// What the entry names, for telling entries written alike.
    pub key: EntryKey,
    /// How the entry reads in a report (dotted code or pattern).
    pub written: String,
    /// Ordinals of the billable codes of the period it reaches, ascending:
    /// a code itself when billable and the billable codes under it; a
    /// pattern's matches.
    pub ords: Vec<u32>,
}

/// What an entry names.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub enum EntryKey {
    /// A code of the index, by ordinal.
    Code(u32),
    /// A pattern, by its display.
    Pattern(String),
}

/// [`check`], plus what each code and pattern entry reaches (for comparing
/// lists), from the same pass over the list.
pub fn check_with_reach<D: AsRef<[u8]>>(
    index: &Index<D>,
    text: &str,
    options: &CheckOptions,
) -> (Report, Vec<Reach>) {
    check_with_reach_among(index, &[], text, options)
}

/// [`check_with_reach`] with other systems' indexes at hand, as in [`check_among`].
pub fn check_with_reach_among<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    text: &str,
    options: &CheckOptions,
) -> (Report, Vec<Reach>) {
    check_draft_with_reach(
        index,
        others,
        &crate::list::read(text, Reading::Auto),
        options,
    )
}

#[derive(Default, Clone, Copy)]
struct Want<'o, 'v> {
    coverage: bool,
    reach: bool,
    others: &'o [View<'v>],
}

#[derive(Default)]
struct Extras {
    coverage: Vec<CategoryCoverage>,
    reach: Vec<Reach>,
}

/// [`check_among_with_coverage`] of a list already read (see
/// [`crate::list::read`]): one entry per [`crate::list::InputLine`], in order.
pub fn check_draft<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    draft: &Draft,
    options: &CheckOptions,
) -> (Report, Vec<CategoryCoverage>) {
    let want = Want {
        coverage: true,
        others,
        ..Want::default()
    };
    let (report, extras) = run_draft(index, draft, options, want);
    (report, extras.coverage)
}

/// [`check_with_reach_among`] of a list already read (for the exports of
/// a draft or workbook: what each entry reaches).
pub fn check_draft_with_reach<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    draft: &Draft,
    options: &CheckOptions,
) -> (Report, Vec<Reach>) {
    let want = Want {
        reach: true,
        others,
        ..Want::default()
    };
    let (report, extras) = run_draft(index, draft, options, want);
    (report, extras.reach)
}

fn run<D: AsRef<[u8]>>(
    index: &Index<D>,
    text: &str,
    options: &CheckOptions,
    want: Want<'_, '_>,
) -> (Report, Extras) {
    run_draft(
        index,
        &crate::list::read(text, Reading::Auto),
        options,
        want,
    )
}

fn run_draft<D: AsRef<[u8]>>(
    index: &Index<D>,
    draft: &Draft,
    options: &CheckOptions,
    want: Want<'_, '_>,
) -> (Report, Extras) {
    let view = index.view();
    let meta = index.meta();
    let period = options.period_for(meta);
    let lines = &draft.lines;

    // Pass 1: what each line is.
    let items: Vec<Item> = lines
        .iter()
        .map(|l| resolve_line(&view, &l.kind, &period))
        .collect();

    // The list context.
    let mut ctx = ListContext {
        listed: OrdMap::default(),
        reached: Marks::new(view.len()),
        explicit: Marks::new(view.len()),
        by_pattern: OrdMap::default(),
        dotted: false,
    };
    let mut extras = Extras::default();
    for (l, item) in lines.iter().zip(&items) {
        match item {
            Item::Code { ord, written, .. } => {
                ctx.dotted |= written.contains('.');
                ctx.listed.entry(*ord).or_default().push(l.number);
                let billable = view.billable_in(*ord, &period);
                if billable {
                    ctx.reached.insert(*ord);
                    ctx.explicit.insert(*ord);
                }
                if want.reach {
                    let mut ords = billable_under(&view, *ord, &period);
                    if billable {
                        ords.insert(0, *ord);
                    }
                    extras.reach.push(Reach {
                        line: l.number,
                        key: EntryKey::Code(*ord),
                        written: view.display(&view.code(*ord)),
                        ords,
                    });
                }
            }
            Item::Pattern(p, m) => {
                for &o in m {
                    ctx.reached.insert(o);
                    ctx.by_pattern.entry(o).or_insert(l.number);
                }
                if want.reach {
                    let written = p.display(&view);
                    let mut ords = m.clone();
                    ords.sort_unstable();
                    extras.reach.push(Reach {
                        line: l.number,
                        key: EntryKey::Pattern(written.clone()),
                        written,
                        ords,
                    });
                }
            }
            _ => {}
        }
    }

    // Pass 2: judge each entry.
    let mut suggestions_left = SUGGESTION_LIMIT;
    let mut memo = Memo::default();
    let mut entries = Vec::with_capacity(lines.len());
    for (l, item) in lines.iter().zip(items) {
        let mut e = Entry::of(l);
        judge(
            &view,
            options,
            &period,
            &ctx,
            item,
            l.number,
            &mut e,
            &mut suggestions_left,
            &mut memo,
            want.others,
        );
        if e.system.is_none()
            && !e.status.skipped()
            && !matches!(e.status, Status::Malformed | Status::OtherSystem)
        {
            e.system = Some(view.meta().vocabulary.clone());
        }
        e.findings.sort_by_key(|f| f.severity);
        entries.push(e);
    }

    // Pass 3: the whole list.
    let list_findings = listcheck::run(&view, &period, &ctx);
    if want.coverage {
        extras.coverage = coverage_of(&view, &period, &ctx.reached);
    }

    let summary = Summary::of(draft.line_count(), &entries, &list_findings);
    let report = Report {
        vocabulary: meta.vocabulary.clone(),
        reading: draft.facts.clone(),
        index: IndexInfo {
            release: meta.release.clone(),
            coverage_from: meta.coverage_from,
            coverage_to: meta.coverage_to,
            sources: meta.sources.clone(),
            notice: meta.notice.clone(),
        },
        options: OptionsInfo {
            single_release: meta.snapshot(),
            ..OptionsInfo::of(&period, options.billable)
        },
        entries,
        list_findings,
        summary,
    };
    (report, extras)
}

fn resolve_line(view: &View<'_>, kind: &LineKind, period: &Period) -> Item {
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

/// Where an index's successors come from, in words: the CMS conversion table
/// for ICD-10-CM, the release's own replacement links otherwise.
fn successor_source(view: &View<'_>) -> &'static str {
    if view.is_graph() {
        "the release's replacement"
    } else {
        "conversion table"
    }
}

fn code_item(view: &View<'_>, code: &str) -> Item {
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

/// The suggestions for a code that is no code: codes one or two edits
/// away (see [`code::near`]), with the codes the label fits first.
struct NearSuggestions {
    suggestions: Vec<Suggestion>,
    /// The first suggestion is there because the label fits it.
    label_first: bool,
    /// Some code is within two edits.
    any_near: bool,
}

/// How many near codes a finding offers.
const NEAR_LIMIT: usize = 12;

fn near_suggestions(
    view: &View<'_>,
    c: &str,
    label: Option<&str>,
    period: &Period,
    memo: &mut Memo,
) -> NearSuggestions {
    let mut sugg = Vec::new();
    let near = code::rank_near(view, c, code::near(view, c), period, NEAR_LIMIT);
    let near_ords: Vec<u32> = near.iter().map(|(o, _)| *o).collect();
    let mut near_why: Vec<(u32, String)> = Vec::new();
    for (o, d) in near {
        let same = view.code(o).starts_with(c.get(..3).unwrap_or(c));
        let live = view.billable_in(o, period);
        let mut why = if code::is_swap(c, &view.code(o)) {
            "two neighbouring characters swapped"
        } else if d == 1 {
            "one character different"
        } else {
            "two characters different"
        }
        .to_string();
        if same {
            why.push_str(", same category");
        }
        if !live {
            why.push_str(", but not billable in the period");
        }
        near_why.push((o, why));
    }
    // Codes the label fits come first; a near code among them keeps both reasons.
    for (o, why) in label_candidates(view, label, c, period, &near_ords, memo) {
        match near_why.iter().position(|(n, _)| *n == o) {
            Some(i) => {
                let (_, near) = near_why.remove(i);
                let why = why.replace(", same category", "");
                sugg.push(suggestion(view, o, format!("{near}; {why}")));
            }
            None => sugg.push(suggestion(view, o, why)),
        }
    }
    let label_first = !sugg.is_empty();
    for (o, why) in near_why {
        sugg.push(suggestion(view, o, why));
    }
    sugg.truncate(NEAR_LIMIT);
    NearSuggestions {
        suggestions: sugg,
        label_first,
        any_near: !near_ords.is_empty(),
    }
}

/// When a letter was read as a digit or a digit as a letter (`I1O` as
/// I10), the other codes one character from what was written, in use in
/// the period, whose description the line's label fits clearly better than
/// the code read (`I1O` labelled "hypertensive heart disease": I11.9).
fn other_readings(
    view: &View<'_>,
    written: &str,
    read: u32,
    label: &str,
    period: &Period,
) -> Vec<Suggestion> {
    let typed: String = written
        .chars()
        .filter(|c| c.is_ascii_alphanumeric())
        .collect::<String>()
        .to_ascii_uppercase();
    let own = crate::search::fit(view, label, read).label;
    let mut better: Vec<(f32, u32)> = code::near(view, &typed)
        .into_iter()
        .filter(|&(o, d)| d == 1 && o != read)
        .flat_map(|(o, _)| {
            // A header one edit away stands for its billable codes.
            let under: Vec<u32> = if view.billable_in(o, period) {
                vec![o]
            } else {
                billable_under(view, o, period)
            };
            under.into_iter().take(NAMED_LIMIT)
        })
        .map(|o| (crate::search::fit(view, label, o).label, o))
        .filter(|&(f, _)| f >= 0.75 && f >= own + 0.25)
        .collect();
    better.sort_by(|a, b| b.0.total_cmp(&a.0).then(a.1.cmp(&b.1)));
    better.dedup_by_key(|b| b.1);
    better
        .into_iter()
        .take(3)
        .map(|(_, o)| {
            suggestion(
                view,
                o,
                format!("one character from \"{written}\"; the label fits it better"),
            )
        })
        .collect()
}

/// What to offer for a retired code with no successor and nothing in use
/// under it: the nearest node above it with codes in use, where such nodes
/// are codes ([`System::nodes_are_codes`]); elsewhere (ICD-10-PCS, whose
/// nodes are table positions) the codes in use under that node that share
/// the most leading characters with the retired one, so every suggestion
/// is a real code.
fn nearest_in_use(view: &View<'_>, code: &str, ord: u32, period: &Period) -> Vec<Suggestion> {
    let Some((a, under)) = view.ancestors(ord).find_map(|a| {
        let under = billable_under(view, a, period);
        (!under.is_empty()).then_some((a, under))
    }) else {
        return Vec::new();
    };
    let nodes_are_codes =
        System::parse(&view.meta().vocabulary).is_none_or(|s| s.nodes_are_codes());
    if nodes_are_codes {
        return vec![suggestion(
            view,
            a,
            "the nearest code above it still in use; review its codes",
        )];
    }
    let shared = |o: u32| {
        view.code(o)
            .bytes()
            .zip(code.bytes())
            .take_while(|(x, y)| x == y)
            .count()
    };
    let most = under.iter().map(|&o| shared(o)).max().unwrap_or(0);
    let node = view.display(&view.code(a));
    under
        .into_iter()
        .filter(|&o| shared(o) == most)
        .take(NAMED_LIMIT)
        .map(|o| {
            suggestion(
                view,
                o,
                format!(
                    "a code in use under {node} with the first {most} characters of the retired code; review"
                ),
            )
        })
        .collect()
}

pub(crate) fn suggestion(view: &View<'_>, ord: u32, reason: impl Into<String>) -> Suggestion {
    Suggestion {
        code: view.display(&view.code(ord)),
        description: view.description_or_note(ord),
        reason: reason.into(),
    }
}

/// Names codes for a message: `E11.9`, `E11.9 and E11.65`, `E11.9, E11.65 and 3 more`.
pub(crate) fn name_codes(view: &View<'_>, ords: &[u32]) -> String {
    let shown: Vec<String> = ords
        .iter()
        .take(3)
        .map(|&o| view.display(&view.code(o)))
        .collect();
    match (ords.len(), shown.as_slice()) {
        (0, _) => "none".into(),
        (1, [a]) => a.clone(),
        (2, [a, b]) => format!("{a} and {b}"),
        (3, [a, b, c]) => format!("{a}, {b} and {c}"),
        (n, [a, b, ..]) => format!("{a}, {b} and {} more", n - 2),
        _ => String::new(),
    }
}

/// "none of them", "2 of them", "all of them" in the list.
fn in_list(have: usize, of: usize) -> String {
    match (have, of) {
        (0, 1) => "not in the list".into(),
        (0, _) => "none of them in the list".into(),
        (1, 1) => "in the list".into(),
        (_, 2) if have == 2 => "both in the list".into(),
        (h, n) if h == n => "all of them in the list".into(),
        (h, _) => format!("{h} of them in the list"),
    }
}

/// Billable codes under a node on some day of `within`.
pub(crate) fn billable_under(view: &View<'_>, ord: u32, within: &Period) -> Vec<u32> {
    view.descendants(ord)
        .filter(|&o| view.billable_in(o, within))
        .collect()
}

/// The part of `period` up to the index's last covered day (that day alone
/// when the whole period lies past it); see the `beyond-coverage` finding.
fn within_coverage(view: &View<'_>, period: &Period) -> Period {
    let last = view.meta().coverage_to;
    if period.to <= last || !view.meta().open_ended() {
        *period
    } else {
        Period::new(period.from.min(last), last)
    }
}

/// The code's status on each part of the period, in order.
fn segments(view: &View<'_>, ord: u32, period: &Period) -> Vec<(Period, Option<SpanKind>)> {
    let mut spans: Vec<(Period, SpanKind)> = view
        .billable(ord)
        .map(|p| (p, SpanKind::Billable))
        .chain(view.header(ord).map(|p| (p, SpanKind::Header)))
        .filter_map(|(p, k)| p.intersect(period).map(|p| (p, k)))
        .collect();
    spans.sort_by_key(|(p, _)| p.from);
    let mut out = Vec::new();
    let mut day = period.from;
    for (p, k) in spans {
        if p.from > day {
            out.push((Period::new(day, p.from.pred()), None));
        }
        out.push((p, Some(k)));
        day = p.to.succ();
    }
    if day <= period.to {
        out.push((Period::new(day, period.to), None));
    }
    out
}

/// Findings already made in this check, by code: a list that repeats a code
/// gets the same judgement for each line without redoing it.
/// A malformed cell's (or another system's code's) status, system and finding.
type Judged = (Status, Option<String>, Finding);

struct Memo {
    dates: OrdMap<(Status, Vec<Finding>)>,
    unknown: HashMap<(String, Option<String>), Finding>,
    /// Malformed cells (and other systems' codes) already judged, with their label.
    malformed: HashMap<(String, Option<String>), Judged>,
    /// The label check of a code and label already judged.
    labels: HashMap<(u32, String), Option<Finding>>,
    /// Labels that may still be searched for codes ([`crate::label::SEARCH_LIMIT`]).
    label_searches: usize,
}

impl Default for Memo {
    fn default() -> Memo {
        Memo {
            dates: OrdMap::default(),
            unknown: HashMap::new(),
            malformed: HashMap::new(),
            labels: HashMap::new(),
            label_searches: crate::label::SEARCH_LIMIT,
        }
    }
}

/// Codes the label of an unknown or malformed entry points to, with why.
fn label_candidates(
    view: &View<'_>,
    label: Option<&str>,
    written: &str,
    period: &Period,
    extra: &[u32],
    memo: &mut Memo,
) -> Vec<(u32, String)> {
    let Some(label) = label else {
        return Vec::new();
    };
    if memo.label_searches == 0 || crate::words::words(label).is_empty() {
        return Vec::new();
    }
    memo.label_searches -= 1;
    crate::label::candidates(view, label, written, period, extra)
        .into_iter()
        .take(crate::label::SUGGESTED)
        .map(|(o, f)| (o, crate::label::reason(view, &f, written, o)))
        .collect()
}

#[allow(clippy::too_many_arguments)]
fn judge(
    view: &View<'_>,
    options: &CheckOptions,
    period: &Period,
    ctx: &ListContext,
    item: Item,
    line: usize,
    e: &mut Entry,
    suggestions_left: &mut usize,
    memo: &mut Memo,
    others: &[View<'_>],
) {
    let title = &view.meta().title;
    let cov = Period::new(view.meta().coverage_from, view.meta().coverage_to);
    // A code of another system at hand (ICD-9-CM beside ICD-10-CM).
    if let Item::Malformed { written, .. } | Item::Unknown { written, .. } = &item {
        if let Some((system, message, sugg)) = known_elsewhere(view, others, written, period) {
            e.status = Status::OtherSystem;
            e.system = Some(system);
            if matches!(item, Item::Malformed { .. }) {
                e.code = Some(written.clone());
            }
            e.findings.push(Finding::new(
                Kind::OtherSystem,
                Severity::Warning,
                message,
                sugg,
            ));
            return;
        }
    }
    match item {
        Item::Skip(s) => e.status = s,
        Item::Unreadable(m) => {
            e.status = Status::Malformed;
            e.findings
                .push(Finding::new(Kind::Malformed, Severity::Error, m, vec![]));
        }
        Item::Malformed { reason, written } => {
            let undotted = written.to_ascii_uppercase().replace('.', "");
            // The same cell and label on many lines is judged once.
            let key = (format!("malformed {undotted}"), e.label.clone());
            if let Some((status, system, f)) = memo.malformed.get(&key) {
                e.status = *status;
                e.system = system.clone();
                e.findings.push(f.clone());
                return;
            }
            // The label may still name the code that was meant; a code
            // mistyped out of shape (`SR2.002B`, `436.810D`) gets the codes
            // within two edits of it, as an unknown code does.
            let other = other_systems(view, &written);
            let typed = (3..=10).contains(&undotted.len())
                && undotted.bytes().all(|b| b.is_ascii_alphanumeric())
                && undotted.bytes().filter(u8::is_ascii_digit).count() >= 2
                && !view.is_graph();
            let sugg: Vec<Suggestion> = if other.is_none() && typed && *suggestions_left > 0 {
                *suggestions_left -= 1;
                near_suggestions(view, &undotted, e.label.as_deref(), period, memo).suggestions
            } else {
                label_candidates(view, e.label.as_deref(), &undotted, period, &[], memo)
                    .into_iter()
                    .map(|(o, why)| suggestion(view, o, why))
                    .collect()
            };
            let f = match other {
                Some((systems, message)) => {
                    e.status = Status::OtherSystem;
                    if let [one] = systems.as_slice() {
                        e.system = Some(one.name().to_string());
                    }
                    Finding::new(Kind::OtherSystem, Severity::Warning, message, sugg)
                }
                None => {
                    e.status = Status::Malformed;
                    Finding::new(Kind::Malformed, Severity::Error, reason, sugg)
                }
            };
            memo.malformed
                .insert(key, (e.status, e.system.clone(), f.clone()));
            e.findings.push(f);
        }
        Item::Pattern(p, matched) => {
            let shown = p.display(view);
            e.status = Status::Pattern;
            e.code = Some(shown.clone());
            if matched.is_empty() {
                e.findings.push(Finding::new(
                    Kind::PatternEmpty,
                    Severity::Error,
                    format!(
                        "{shown} matches no billable {title} code in the period {} to {}; check the start of the pattern or the period",
                        period.from, period.to
                    ),
                    vec![],
                ));
            } else {
                e.findings.push(Finding::new(
                    Kind::Pattern,
                    Severity::Info,
                    format!(
                        "{shown} matches {} billable code{} in the period ({})",
                        matched.len(),
                        if matched.len() == 1 { "" } else { "s" },
                        name_codes(view, &matched)
                    ),
                    vec![],
                ));
            }
        }
        Item::Unknown { code: c, .. } => {
            e.status = Status::Unknown;
            e.code = Some(view.display(&c));
            let mut msg = if cov.from == cov.to {
                format!(
                    "{} is not {} {title} code of release {}",
                    view.display(&c),
                    article(title),
                    view.meta().release
                )
            } else {
                format!(
                    "{} is not {} {title} code in any release from {} to {}",
                    view.display(&c),
                    article(title),
                    cov.from,
                    cov.to
                )
            };
            if let Some(extra) = seventh_note(view, &c) {
                msg.push_str("; ");
                msg.push_str(&extra);
            }
            let mut sugg = Vec::new();
            let key = (c.clone(), e.label.clone());
            if let Some(f) = memo.unknown.get(&key) {
                e.findings.push(f.clone());
                return;
            }
            if *suggestions_left > 0 {
                *suggestions_left -= 1;
                let near = near_suggestions(view, &c, e.label.as_deref(), period, memo);
                sugg = with_every_seventh(view, &c, near.suggestions);
                if near.label_first {
                    msg.push_str(&format!("; its label fits {} best", sugg[0].code));
                }
                if !near.any_near {
                    msg.push_str("; no code is within two characters of it");
                }
            } else {
                msg.push_str(&format!(
                    "; near codes were not searched (only the first {SUGGESTION_LIMIT} unknown codes of a list are)"
                ));
            }
            let f = Finding::new(Kind::Unknown, Severity::Error, msg, sugg);
            memo.unknown.insert(key, f.clone());
            e.findings.push(f);
        }
        Item::Code {
            ord,
            mut changes,
            written,
        } => {
            if !ctx.dotted {
                changes.retain(|c| *c != "dot added");
            }
            let code = view.code(ord);
            let shown = view.display(&code);
            e.code = Some(shown.clone());
            e.description = Some(view.description_or_note(ord));
            if !changes.is_empty() {
                let mut sugg = vec![suggestion(view, ord, "the official form")];
                let letter_read = changes.iter().any(|c| c.contains(" read as "));
                if let (true, Some(label)) = (letter_read, e.label.as_deref()) {
                    sugg.extend(other_readings(view, &written, ord, label, period));
                }
                e.findings.push(Finding::new(
                    Kind::Normalized,
                    Severity::Info,
                    format!("\"{written}\" read as {shown} ({})", changes.join(", ")),
                    sugg,
                ));
            }
            // The same code on many lines is judged once.
            if let Some((status, found)) = memo.dates.get(&ord) {
                e.status = *status;
                e.findings.extend(found.iter().cloned());
            } else {
                let before = e.findings.len();
                judge_dates(view, options, period, ctx, ord, &shown, e);
                memo.dates
                    .insert(ord, (e.status, e.findings[before..].to_vec()));
            }
            if let Some(f) = redundant(view, period, ctx, ord, line) {
                e.findings.push(f);
            }
            if let Some(label) = e.label.clone() {
                let key = (ord, label);
                let f = match memo.labels.get(&key) {
                    Some(f) => f.clone(),
                    None => {
                        let left = &mut memo.label_searches;
                        let f = crate::label::judge(view, &key.1, ord, period, left)
                            .map(crate::label::Judgement::finding);
                        memo.labels.insert(key, f.clone());
                        f
                    }
                };
                e.findings.extend(f);
            }
        }
    }
}

/// Why an unknown code with a 7th character does not exist, when a rule says so.
/// Every code the tabular list allows at the node of a code whose 7th
/// character it does not allow, in the order of its rule.
fn seventh_codes(view: &View<'_>, code: &str) -> Vec<u32> {
    if code.len() != 7 || seventh_note(view, code).is_none() {
        return Vec::new();
    }
    let base = &code[..6];
    let stem = base.trim_end_matches('X');
    let Some(rule) = view
        .ordinal(base)
        .or_else(|| view.ordinal(stem))
        .and_then(|o| view.seventh_rule(o))
    else {
        return Vec::new();
    };
    rule.extensions
        .iter()
        .filter_map(|(c, _)| view.ordinal(&format!("{base}{c}")))
        .collect()
}

/// The near suggestions of a code with a 7th character its node does not
/// allow, with every allowed one among them (those already offered keep
/// their place and reasons).
fn with_every_seventh(view: &View<'_>, code: &str, near: Vec<Suggestion>) -> Vec<Suggestion> {
    let seventh = seventh_codes(view, code);
    if seventh.is_empty() {
        return near;
    }
    let shown: Vec<String> = seventh
        .iter()
        .map(|&o| view.display(&view.code(o)))
        .collect();
    let (mut out, rest): (Vec<Suggestion>, Vec<Suggestion>) =
        near.into_iter().partition(|s| shown.contains(&s.code));
    for (&o, c) in seventh.iter().zip(&shown) {
        if !out.iter().any(|s| &s.code == c) {
            out.push(suggestion(
                view,
                o,
                "a 7th character the tabular list allows here",
            ));
        }
    }
    let room = NEAR_LIMIT.max(out.len());
    out.extend(rest);
    out.truncate(room);
    out
}

fn seventh_note(view: &View<'_>, code: &str) -> Option<String> {
    if code.len() != 7 {
        return None;
    }
    let base = code.get(..6)?;
    let stem = base.trim_end_matches('X');
    let ord = view.ordinal(base).or_else(|| view.ordinal(stem))?;
    let rule = view.seventh_rule(ord)?;
    let ch = code.chars().last()?;
    if rule.extensions.iter().any(|(c, _)| *c == ch) {
        return None;
    }
    let allowed: Vec<String> = rule
        .extensions
        .iter()
        .map(|(c, m)| format!("{c} ({m})"))
        .collect();
    Some(format!(
        "the 7th character {ch} is not one the tabular list allows under {}: {}",
        view.display(&view.code(ord)),
        allowed.join(", ")
    ))
}

fn judge_dates(
    view: &View<'_>,
    options: &CheckOptions,
    period: &Period,
    ctx: &ListContext,
    ord: u32,
    shown: &str,
    e: &mut Entry,
) {
    // The common case first: billable on every day of the period.
    if view.billable(ord).any(|p| p.covers(period)) {
        e.status = Status::Valid;
        // A code in use that the release nonetheless points elsewhere from
        // (LOINC MAP_TO on a term still in use, HPO consider).
        let consider: Vec<u32> = view.consider(ord).collect();
        if !consider.is_empty() {
            e.findings.push(Finding::new(
                Kind::ReleaseStatus,
                Severity::Info,
                format!(
                    "{shown} is valid; {} {} suggests considering {} in its place",
                    view.meta().title,
                    view.meta().release,
                    name_codes(view, &consider)
                ),
                consider
                    .iter()
                    .take(NAMED_LIMIT)
                    .map(|&c| suggestion(view, c, "the release suggests considering it"))
                    .collect(),
            ));
        }
        if let Some(word) = view.status(ord) {
            e.findings.push(Finding::new(
                Kind::ReleaseStatus,
                Severity::Warning,
                format!(
                    "{shown} is valid, but {} marks it {word}; see the release's notes on that status before using it",
                    view.meta().title
                ),
                vec![],
            ));
        }
        return;
    }
    // In no span at all: a term the release keeps only as obsolete (HPO).
    if view.billable(ord).next().is_none() && view.header(ord).next().is_none() {
        obsolete(view, ctx, ord, shown, e);
        return;
    }
    // Past the last covered day the index knows nothing (the next release
    // is not out): a code in use on that day is not retired for it.
    let segs = segments(view, ord, &within_coverage(view, period));
    let billable: Vec<Period> = view.billable(ord).collect();
    let header: Vec<Period> = view.header(ord).collect();
    let all: Vec<Period> = billable.iter().chain(&header).copied().collect();
    let span_text = if period.from == period.to {
        format!("on {}", period.from)
    } else {
        format!("in the period {} to {}", period.from, period.to)
    };
    let only = |k| segs.len() == 1 && segs[0].1 == k;
    if only(Some(SpanKind::Billable)) {
        e.status = Status::Valid;
        return;
    }
    if only(Some(SpanKind::Header)) {
        e.status = Status::Header;
        // Up to the last covered day, as the segments: a period wholly past
        // it would otherwise count no codes under a header in use that day.
        let under = billable_under(view, ord, &within_coverage(view, period));
        let have = under
            .iter()
            .filter(|o| ctx.reached.contains(o) || ctx.listed.contains_key(o))
            .count();
        let mut msg = format!(
            "{shown} is a header, not a billable code, {span_text}; it covers {} billable code{}, {}",
            under.len(),
            if under.len() == 1 { "" } else { "s" },
            in_list(have, under.len())
        );
        if let Some(last) = billable
            .iter()
            .filter(|p| p.to < period.from)
            .map(|p| p.to)
            .max()
        {
            msg.push_str(&format!(
                "; it was billable until {last} and has been a header since {}",
                last.succ()
            ));
        }
        let mut sugg = Vec::new();
        if have < under.len() {
            let p = Pattern::Prefix(view.code(ord)).display(view);
            sugg.push(Suggestion {
                code: p.clone(),
                description: view.description_or_note(ord),
                reason: format!(
                    "{p} matches its {} billable codes in the period",
                    under.len()
                ),
            });
            if under.len() <= 5 {
                for &o in under.iter().filter(|o| !ctx.reached.contains(o)) {
                    sugg.push(suggestion(
                        view,
                        o,
                        "a billable code under it, not in the list",
                    ));
                }
            }
        }
        let sev = if options.billable {
            Severity::Error
        } else {
            Severity::Info
        };
        e.findings.push(Finding::new(Kind::Header, sev, msg, sugg));
        return;
    }
    if only(None) {
        let first = all.iter().map(|p| p.from).min();
        let last = all.iter().map(|p| p.to).max();
        match (first, last) {
            (_, Some(last)) if last < period.from => {
                e.status = Status::Retired;
                let last_b = billable.iter().map(|p| p.to).max().unwrap_or(last);
                let mut sugg: Vec<Suggestion> = view
                    .successors(ord)
                    .filter(|(s, _)| view.billable_in(*s, period))
                    .map(|(s, d)| {
                        suggestion(
                            view,
                            s,
                            format!(
                                "{}: its data from {d} is coded as this",
                                successor_source(view)
                            ),
                        )
                    })
                    .collect();
                if sugg.is_empty() {
                    let kids = billable_under(view, ord, period);
                    for &o in kids.iter().take(NAMED_LIMIT) {
                        sugg.push(suggestion(
                            view,
                            o,
                            "a code under it, billable in the period",
                        ));
                    }
                }
                if sugg.is_empty() {
                    sugg = nearest_in_use(view, &view.code(ord), ord, period);
                }
                let listed: Vec<&Suggestion> = sugg
                    .iter()
                    .filter(|s| {
                        view.ordinal(&s.code.replace('.', ""))
                            .is_some_and(|o| ctx.reached.contains(&o))
                    })
                    .collect();
                let mut msg = format!(
                    "{shown} was retired: its last valid day was {last_b}, before the period starts ({})",
                    period.from
                );
                if !sugg.is_empty() {
                    msg.push_str(&format!(
                        "; {} {}",
                        if sugg.len() == 1 {
                            "its replacement is"
                        } else {
                            "replacements are"
                        },
                        sugg.iter()
                            .map(|s| s.code.as_str())
                            .take(NAMED_LIMIT)
                            .collect::<Vec<_>>()
                            .join(", ")
                    ));
                    if !listed.is_empty() {
                        msg.push_str(&format!(" ({} already in the list)", listed.len()));
                    }
                }
                e.findings
                    .push(Finding::new(Kind::Retired, Severity::Error, msg, sugg));
            }
            (Some(first), _) if first > period.to => {
                e.status = Status::NotYetValid;
                let sugg: Vec<Suggestion> = view
                    .predecessors(ord)
                    .into_iter()
                    .filter(|(p, _)| view.billable_in(*p, period))
                    .map(|(p, d)| {
                        suggestion(
                            view,
                            p,
                            format!(
                                "{}: coded as this until {}",
                                successor_source(view),
                                d.pred()
                            ),
                        )
                    })
                    .collect();
                let mut msg =
                    format!("{shown} is not valid yet {span_text}: its first valid day is {first}");
                if !sugg.is_empty() {
                    let have = view
                        .predecessors(ord)
                        .iter()
                        .filter(|(p, _)| view.billable_in(*p, period) && ctx.reached.contains(p))
                        .count();
                    msg.push_str(&format!(
                        "; before that its data was coded as {} ({})",
                        sugg.iter()
                            .map(|s| s.code.as_str())
                            .collect::<Vec<_>>()
                            .join(", "),
                        in_list(have, sugg.len())
                    ));
                }
                e.findings
                    .push(Finding::new(Kind::NotYetValid, Severity::Error, msg, sugg));
            }
            _ => {
                e.status = Status::Retired;
                e.findings.push(Finding::new(
                    Kind::Retired,
                    Severity::Error,
                    format!("{shown} is not in use {span_text}"),
                    vec![],
                ));
            }
        }
        return;
    }
    // Mixed: billable on part of the period.
    e.status = Status::Partial;
    let mut parts = Vec::new();
    let mut sugg = Vec::new();
    let mut seen = HashSet::new();
    // Codes covering a part of the period that the list lacks, each once.
    let mut offer = |sugg: &mut Vec<Suggestion>, codes: &[u32], why: String| {
        for &o in codes.iter().filter(|o| !ctx.reached.contains(o)) {
            if seen.insert(o) && sugg.len() < NAMED_LIMIT {
                sugg.push(suggestion(view, o, why.clone()));
            }
        }
    };
    for (p, k) in &segs {
        match k {
            Some(SpanKind::Billable) => parts.push(format!("billable from {} to {}", p.from, p.to)),
            Some(SpanKind::Header) => {
                let kids = billable_under(view, ord, p);
                let have = kids.iter().filter(|o| ctx.reached.contains(o)).count();
                parts.push(format!(
                    "from {} to {} a header over {} billable code{} ({}), {}",
                    p.from,
                    p.to,
                    kids.len(),
                    if kids.len() == 1 { "" } else { "s" },
                    name_codes(view, &kids),
                    in_list(have, kids.len())
                ));
                offer(
                    &mut sugg,
                    &kids,
                    format!("covers {} to {} under it", p.from, p.to),
                );
            }
            None => {
                let before = p.to
                    < segs
                        .iter()
                        .find(|(_, k)| k.is_some())
                        .map_or(p.from, |s| s.0.from);
                let cover: Vec<(u32, Date)> = if before {
                    view.predecessors(ord)
                } else {
                    view.successors(ord).collect()
                };
                let cover: Vec<u32> = cover
                    .into_iter()
                    .map(|(o, _)| o)
                    .filter(|o| view.billable_in(*o, p) && *o != ord)
                    .collect();
                let have = cover.iter().filter(|o| ctx.reached.contains(o)).count();
                let what = if before { "not yet valid" } else { "retired" };
                if cover.is_empty() {
                    parts.push(format!("from {} to {} {what}", p.from, p.to));
                } else {
                    parts.push(format!(
                        "from {} to {} {what}, its data coded as {} ({})",
                        p.from,
                        p.to,
                        name_codes(view, &cover),
                        in_list(have, cover.len())
                    ));
                }
                offer(
                    &mut sugg,
                    &cover,
                    format!("{}: covers {} to {}", successor_source(view), p.from, p.to),
                );
            }
        }
    }
    e.findings.push(Finding::new(
        Kind::PartialPeriod,
        Severity::Warning,
        format!(
            "{shown} is billable for part of the period only: {}",
            parts.join("; ")
        ),
        sugg,
    ));
}

/// A code the release keeps only as retired (obsolete), with its successors
/// (HPO `replaced_by`) and the codes it suggests to consider.
fn obsolete(view: &View<'_>, ctx: &ListContext, ord: u32, shown: &str, e: &mut Entry) {
    e.status = Status::Retired;
    let meta = view.meta();
    let replaced: Vec<u32> = view.successors(ord).map(|(s, _)| s).collect();
    // Also an alternate id of a term in use (HPO): that term too.
    let alias_of = view
        .alias(&view.code(ord))
        .filter(|a| !replaced.contains(a));
    let consider: Vec<u32> = view
        .consider(ord)
        .filter(|c| !replaced.contains(c) && Some(*c) != alias_of)
        .collect();
    let considered_alias = alias_of.is_some_and(|a| view.consider(ord).any(|c| c == a));
    let mut sugg: Vec<Suggestion> = replaced
        .iter()
        .map(|&s| suggestion(view, s, "its replacement, named by the release"))
        .collect();
    if let Some(a) = alias_of {
        sugg.push(suggestion(
            view,
            a,
            if considered_alias {
                "the release gives it as an alternate id of this term and suggests considering it"
            } else {
                "the release also gives it as an alternate id of this term"
            },
        ));
    }
    sugg.extend(consider.iter().map(|&c| {
        suggestion(
            view,
            c,
            "the release suggests considering it; review whether it fits",
        )
    }));
    let names = |ords: &[u32]| name_codes(view, ords);
    let mut msg = format!(
        "{shown} is obsolete in {} release {}",
        meta.title, meta.release
    );
    if !replaced.is_empty() {
        msg.push_str(&format!("; it was replaced by {}", names(&replaced)));
        let have = replaced
            .iter()
            .filter(|s| ctx.listed.contains_key(s))
            .count();
        if have > 0 {
            msg.push_str(&format!(" ({})", in_list(have, replaced.len())));
        }
    }
    if let Some(a) = alias_of {
        msg.push_str(&format!(
            "; the release also gives it as an alternate id of {}{}",
            names(&[a]),
            if considered_alias {
                " and suggests considering that term"
            } else {
                ""
            }
        ));
        if ctx.listed.contains_key(&a) {
            msg.push_str(" (in the list)");
        }
    }
    if !consider.is_empty() {
        msg.push_str(&format!(
            "; the release suggests considering {}",
            names(&consider)
        ));
    }
    if sugg.is_empty() {
        msg.push_str("; the release names no replacement");
    }
    sugg.truncate(NAMED_LIMIT);
    e.findings
        .push(Finding::new(Kind::Retired, Severity::Error, msg, sugg));
}

/// A code already covered by a header ancestor (a header throughout the
/// period) or by a pattern elsewhere in the list.
fn redundant(
    view: &View<'_>,
    period: &Period,
    ctx: &ListContext,
    ord: u32,
    line: usize,
) -> Option<Finding> {
    let shown = || view.display(&view.code(ord));
    for a in view.ancestors(ord) {
        let Some(lines) = ctx.listed.get(&a) else {
            continue;
        };
        // A stated hierarchy (HPO): a term stands for everything under it
        // (the true-path rule), so any listed ancestor in use covers it.
        let covers = if view.is_graph() {
            view.billable(a).any(|p| p.covers(period))
        } else {
            view.header(a).any(|p| p.covers(period))
        };
        if covers {
            return Some(Finding::new(
                Kind::Redundant,
                Severity::Warning,
                format!(
                    "{} is under {} (line {}), which the list already has; if the query takes codes with everything under them, this line adds nothing",
                    shown(),
                    view.display(&view.code(a)),
                    lines[0]
                ),
                vec![],
            ));
        }
    }
    match ctx.by_pattern.get(&ord) {
        Some(&pl) if pl != line => Some(Finding::new(
            Kind::Redundant,
            Severity::Warning,
            format!("{} is already matched by the pattern on line {pl}", shown()),
            vec![],
        )),
        _ => None,
    }
}

/// The days a code was billable and a header, in order (for pictures).
pub fn timeline<D: AsRef<[u8]>>(index: &Index<D>, code: &str) -> Option<Vec<Span>> {
    let view = index.view();
    let Resolved::Found { ord, .. } = code::resolve(&view, code) else {
        return None;
    };
    let mut spans: Vec<Span> = view
        .billable(ord)
        .map(|p| Span {
            kind: SpanKind::Billable,
            from: p.from,
            to: p.to,
        })
        .chain(view.header(ord).map(|p| Span {
            kind: SpanKind::Header,
            from: p.from,
            to: p.to,
        }))
        .collect();
    spans.sort_by_key(|s| s.from);
    Some(spans)
}

/// How much of one category a list covers in the period.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct CategoryCoverage {
    /// The category (`E11`).
    pub category: String,
    /// Its description.
    pub description: String,
    /// Billable codes under it in the period that the list reaches.
    pub included: u32,
    /// Billable codes under it in the period.
    pub total: u32,
}

/// Coverage of every category the reached codes fall in, in code order.
fn coverage_of(view: &View<'_>, period: &Period, reached: &Marks) -> Vec<CategoryCoverage> {
    let mut cats: Vec<u32> = reached
        .into_iter()
        .map(|&o| view.category(o))
        .collect::<HashSet<_>>()
        .into_iter()
        .collect();
    cats.sort();
    cats.into_iter()
        .map(|c| {
            let all: Vec<u32> = std::iter::once(c)
                .chain(view.descendants(c))
                .filter(|&o| view.billable_in(o, period))
                .collect();
            CategoryCoverage {
                category: view.display(&view.code(c)),
                description: view.description_or_note(c),
                included: all.iter().filter(|o| reached.contains(o)).count() as u32,
                total: all.len() as u32,
            }
        })
        .collect()
}
