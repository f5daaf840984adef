//! The card of one code: what it is on a day or over a period, its dated
//! timeline across the releases the index covers, where it sits (chapter,
//! section, ancestors, children and siblings in force), the tabular list's
//! notes that hold for it, its successors and predecessors, and the
//! mappings that name it. Facts only: [`crate::render::card`] writes the
//! English, the CLI and the page show them.
//!
//! The hierarchy on a day is the index's, restricted to the nodes in force
//! that day: a node's parent is its nearest ancestor in force, its children
//! the nearest nodes in force below it (for ICD-10-CM this is the tree the
//! order file of that release states by its codes).

use crate::check::CheckOptions;
use crate::code::{self, Resolved};
use crate::date::Date;
use crate::index::{Index, View};
use crate::model::{NoteKind, Period};
use crate::report::{IndexInfo, OptionsInfo, Suggestion};
use serde::Serialize;

/// The cards of one request, with the index and options they were made with.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Cards {
    /// Vocabulary id (`icd10cm`).
    pub vocabulary: String,
    /// The index used.
    pub index: IndexInfo,
    /// The day or period asked about.
    pub options: OptionsInfo,
    /// One card per code asked for, in the order asked.
    pub cards: Vec<Card>,
}

/// Everything known about one code, node or code start.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Card {
    /// The code (dotted), or the text as written when it is no code.
    pub code: String,
    /// The vocabulary (`icd10cm`).
    pub system: String,
    /// Its official description (empty when unknown).
    pub description: String,
    /// On the day, or over the whole period: `billable`, `header`,
    /// `not-in-use`; in a stated hierarchy (HPO) `in-use` or `obsolete`;
    /// `changes` when the period holds several of these (see `timeline`);
    /// `code-start` for the start of several codes; for text that is no
    /// code, the check's status (`unknown`, `malformed`, `other-system`).
    pub status: &'static str,
    /// What a check says of an unknown or malformed code, with its suggestions.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub problem: Option<Problem>,
    /// Its states across the index's coverage, oldest first, gap-free.
    pub timeline: Vec<Segment>,
    /// The chapter it is in.
    pub chapter: Option<Named>,
    /// The section (block) it is in.
    pub section: Option<Named>,
    /// Its ancestors in force on the day, from the category down to the
    /// parent (a stated hierarchy: along first parents, from the root).
    pub ancestors: Vec<Node>,
    /// Every parent (several in a stated hierarchy such as HPO).
    pub parents: Vec<Node>,
    /// Its direct children in force on the day (the last day of a period).
    pub children: Vec<Child>,
    /// The other children of its parents on that day (for a category: the
    /// other categories of its section).
    pub siblings: Vec<Child>,
    /// The tabular list's notes stated at it, then those it inherits, nearest first.
    pub notes: Vec<CardNote>,
    /// Whether `notes` could be read: `loaded` (the notes file is at hand),
    /// `not-loaded` (the system's notes are in a notes file not added to
    /// the index, so `notes` is empty for that reason alone) or `none`
    /// (rollcall keeps no notes for this vocabulary).
    pub notes_status: &'static str,
    /// The 7th-character rule in force at it, if any.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub seventh_character: Option<Seventh>,
    /// Conversion-table successors (HPO: `replaced_by`).
    pub successors: Vec<Link>,
    /// Codes whose successors include it.
    pub predecessors: Vec<Link>,
    /// Codes the release suggests considering in its place (HPO `consider`).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub consider: Vec<Node>,
    /// Alternate ids that stand for it (HPO `alt_id`).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub alternate_ids: Vec<String>,
    /// Its other wordings, as the release writes them and in its order (a
    /// stated hierarchy: HPO `synonym`); left out when there are none.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub synonyms: Vec<String>,
    /// The mapping rows that name it, as source or as target (the GEMs).
    pub mappings: Vec<MapLink>,
}

/// Why a card has no code behind it.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Problem {
    /// The check's sentence.
    pub message: String,
    /// What the check suggests.
    pub suggestions: Vec<Suggestion>,
}

/// A chapter or section.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Named {
    /// Chapter number (`4`) or category range (`E08-E13`).
    pub code: String,
    /// Title.
    pub title: String,
}

/// A code with its description.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Node {
    /// Dotted code.
    pub code: String,
    /// Description.
    pub description: String,
}

/// A child or sibling on the day.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Child {
    /// Dotted code.
    pub code: String,
    /// Description.
    pub description: String,
    /// `billable` or `header` (HPO: `in-use`) on the day.
    pub status: &'static str,
    /// Billable codes under it on the day, itself included (HPO: terms in use).
    pub billable_under: u32,
}

/// One span of the timeline.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Segment {
    /// First day.
    pub from: Date,
    /// Last day.
    pub to: Date,
    /// `billable`, `header` or `absent` (HPO: `in-use` or `obsolete`).
    pub state: &'static str,
    /// How it came to be: `first-release` (so at the start of the
    /// coverage), `in-release` (a one-release vocabulary), `not-yet-added`, `added`, `subdivided` (its children took
    /// over), `merged` (its children were retired), `retired`, `obsolete`.
    pub reason: &'static str,
    /// The codes the reason names: the children that took over, the
    /// successors of a retired code.
    pub codes: Vec<String>,
}

/// A tabular-list note that holds for the code.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct CardNote {
    /// What kind of note.
    pub kind: NoteKind,
    /// Its text as printed.
    pub text: String,
    /// The codes of this index it names (dotted; both ends of a range).
    pub codes: Vec<String>,
    /// Where it is stated: `code`, `section` or `chapter`.
    pub level: &'static str,
    /// The code, section range or chapter number that states it.
    pub at: String,
}

/// A 7th-character rule and where it is stated.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Seventh {
    /// The node that states it (dotted).
    pub at: String,
    /// Each allowed character and its meaning.
    pub extensions: Vec<(char, String)>,
}

/// A successor or predecessor.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Link {
    /// Dotted code.
    pub code: String,
    /// Description.
    pub description: String,
    /// The day the successor took over (absent for HPO `replaced_by`).
    pub effective: Option<Date>,
}

/// One mapping row naming the code.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct MapLink {
    /// The mapping (`gem-icd9cm-icd10cm`).
    pub mapping: String,
    /// Its title.
    pub title: String,
    /// Whether the code is the row's `source` or its `target`.
    pub role: &'static str,
    /// The other code of the row, dotted in its vocabulary (`NoDx` for none).
    pub code: String,
    /// Its vocabulary.
    pub system: String,
    /// Its description, when its index is at hand.
    pub description: String,
    /// The GEM flags of the row.
    pub flags: crate::model::MapFlags,
}

/// The cards of `codes` for the day or period of `options`; `others` are
/// indexes at hand for mappings and for the check of an unknown code
/// (the ICD-9-CM index with the GEMs beside ICD-10-CM, and the reverse).
pub fn cards<D: AsRef<[u8]>>(
    index: &Index<D>,
    others: &[View<'_>],
    codes: &[&str],
    options: &CheckOptions,
) -> Cards {
    let view = index.view();
    let meta = index.meta();
    let period = options.period_for(meta);
    let cards = codes
        .iter()
        .map(|c| card_in(index, &view, others, c, options, &period))
        .collect();
    Cards {
        vocabulary: meta.vocabulary.clone(),
        index: IndexInfo::of(meta),
        options: OptionsInfo::against(meta, &period, false),
        cards,
    }
}

fn card_in<D: AsRef<[u8]>>(
    index: &Index<D>,
    view: &View<'_>,
    others: &[View<'_>],
    written: &str,
    options: &CheckOptions,
    period: &Period,
) -> Card {
    let trimmed = written.trim();
    // `E11.6-` and `E11.6*` are written for the node and what is under it.
    let bare = trimmed.trim_end_matches(['-', '*']).trim_end_matches('.');
    match code::resolve(view, bare) {
        Resolved::Found { ord, .. } => card_of(view, others, ord, period),
        _ => match code_start(view, bare, period.to) {
            Some(tops) => start_card(view, bare, &tops, period.to),
            None => unknown_card(index, view, others, trimmed, options),
        },
    }
}

fn blank(view: &View<'_>, code: String, status: &'static str) -> Card {
    Card {
        code,
        system: view.meta().vocabulary.clone(),
        description: String::new(),
        status,
        problem: None,
        timeline: Vec::new(),
        chapter: None,
        section: None,
        ancestors: Vec::new(),
        parents: Vec::new(),
        children: Vec::new(),
        siblings: Vec::new(),
        notes: Vec::new(),
        notes_status: notes_status(view),
        seventh_character: None,
        successors: Vec::new(),
        predecessors: Vec::new(),
        consider: Vec::new(),
        alternate_ids: Vec::new(),
        synonyms: Vec::new(),
        mappings: Vec::new(),
    }
}

/// The card of a code of the index.
pub fn card_of(view: &View<'_>, others: &[View<'_>], ord: u32, period: &Period) -> Card {
    let code = view.code(ord);
    let day = period.to;
    let node = |o: u32| Node {
        code: view.display(&view.code(o)),
        description: view.description_or_note(o),
    };
    let timeline = timeline(view, ord);
    let mut card = blank(view, view.display(&code), status_over(&timeline, period));
    card.description = view.description(ord);
    let (chapter, section) = place(view, &code);
    card.chapter = chapter;
    card.section = section;
    card.ancestors = ancestors_on(view, ord, day).into_iter().map(node).collect();
    card.parents = parents_on(view, ord, day).into_iter().map(node).collect();
    card.children = children_on(view, ord, day)
        .into_iter()
        .map(|c| child(view, c, day))
        .collect();
    card.siblings = siblings_on(view, ord, day)
        .into_iter()
        .map(|c| child(view, c, day))
        .collect();
    card.notes = notes_of(view, ord, &code);
    card.seventh_character = view.seventh_rule_at(ord).map(|(o, rule)| Seventh {
        at: view.display(&view.code(o)),
        extensions: rule.extensions.clone(),
    });
    card.successors = view
        .successors(ord)
        .map(|(s, d)| Link {
            code: view.display(&view.code(s)),
            description: view.description_or_note(s),
            effective: (!view.is_graph()).then_some(d),
        })
        .collect();
    card.predecessors = view
        .predecessors(ord)
        .into_iter()
        .map(|(p, d)| Link {
            code: view.display(&view.code(p)),
            description: view.description_or_note(p),
            effective: (!view.is_graph()).then_some(d),
        })
        .collect();
    card.consider = view.consider(ord).map(node).collect();
    if view.is_graph() {
        card.alternate_ids = view
            .aliases()
            .into_iter()
            .filter(|(_, c)| *c == code)
            .map(|(a, _)| a)
            .collect();
        card.synonyms = view.synonyms(ord);
    }
    card.timeline = timeline;
    card.mappings = mappings(view, others, &code);
    card
}

/// Whether a node is in force on `day` (billable or a header; in a stated
/// hierarchy, in use).
pub fn in_force(view: &View<'_>, ord: u32, day: Date) -> bool {
    view.billable(ord).any(|p| p.contains(day)) || view.header(ord).any(|p| p.contains(day))
}

/// The ancestors of `ord` in force on `day`, from the category down to the
/// parent. In a stated hierarchy: the chain of first parents, from the root.
pub fn ancestors_on(view: &View<'_>, ord: u32, day: Date) -> Vec<u32> {
    let mut up: Vec<u32> = if view.is_graph() {
        let mut chain = Vec::new();
        let mut cur = view.parent(ord);
        while let Some(p) = cur {
            if chain.len() > 64 || chain.contains(&p) {
                break;
            }
            chain.push(p);
            cur = view.parent(p);
        }
        chain
    } else {
        view.ancestors(ord)
            .filter(|&a| in_force(view, a, day))
            .collect()
    };
    up.reverse();
    up
}

/// Every parent of `ord` on `day`: the release's parents in a stated
/// hierarchy, else the nearest ancestor in force.
pub fn parents_on(view: &View<'_>, ord: u32, day: Date) -> Vec<u32> {
    if view.is_graph() {
        view.parents(ord).collect()
    } else {
        view.ancestors(ord)
            .find(|&a| in_force(view, a, day))
            .into_iter()
            .collect()
    }
}

/// The direct children of `ord` on `day`: the nearest nodes in force below
/// it (a child not in force that day hands over its own children). In a
/// stated hierarchy, the release's children.
pub fn children_on(view: &View<'_>, ord: u32, day: Date) -> Vec<u32> {
    if view.is_graph() {
        return view.children(ord).collect();
    }
    // The walk is a preorder of the subtree, so it meets nodes in ascending
    // order: a node below the last one handled, or outside the subtree, can
    // only come from a damaged index, whose overlapping subtrees would
    // otherwise be walked again and again (found by fuzzing: a card took
    // minutes). So each node is handled at most once.
    let end = view.subtree_end(ord);
    let mut next = ord.saturating_add(1);
    let mut out = Vec::new();
    let mut stack: Vec<u32> = view.children(ord).collect();
    stack.reverse();
    while let Some(c) = stack.pop() {
        if c < next || c >= end {
            continue;
        }
        if in_force(view, c, day) {
            out.push(c);
            next = view.subtree_end(c);
        } else {
            next = c + 1;
            let mut below: Vec<u32> = view.children(c).collect();
            below.reverse();
            stack.extend(below);
        }
    }
    out
}

/// The other children of the node's parents on `day`; for a node with no
/// parent that day, the other such nodes of its section.
pub fn siblings_on(view: &View<'_>, ord: u32, day: Date) -> Vec<u32> {
    let mut out: Vec<u32> = if view.is_graph() {
        view.parents(ord)
            .flat_map(|p| view.children(p).collect::<Vec<_>>())
            .collect()
    } else {
        match ancestors_on(view, ord, day).last() {
            Some(&p) => children_on(view, p, day),
            None => roots_of_section(view, ord, day),
        }
    };
    out.sort_unstable();
    out.dedup();
    out.retain(|&o| o != ord);
    out
}

/// The nodes of `ord`'s section that are in force on `day` with no
/// ancestor in force (its categories, in ICD-10-CM).
fn roots_of_section(view: &View<'_>, ord: u32, day: Date) -> Vec<u32> {
    use fst::{IntoStreamer, Streamer};
    let code = view.code(ord);
    let Some((section, _)) = view.section_of(&code) else {
        return Vec::new();
    };
    let mut out = Vec::new();
    let mut s = view
        .map()
        .range()
        .ge(section.first.as_bytes())
        .le(section.last.as_bytes())
        .into_stream();
    while let Some((_, o)) = s.next() {
        let o = o as u32;
        if in_force(view, o, day) && !view.ancestors(o).any(|a| in_force(view, a, day)) {
            out.push(o);
        }
    }
    out
}

fn child(view: &View<'_>, o: u32, day: Date) -> Child {
    let billable = |x: u32| view.billable(x).any(|p| p.contains(day));
    Child {
        code: view.display(&view.code(o)),
        description: view.description_or_note(o),
        status: if view.is_graph() {
            if billable(o) {
                "in-use"
            } else {
                "obsolete"
            }
        } else if billable(o) {
            "billable"
        } else if view.header(o).any(|p| p.contains(day)) {
            "header"
        } else {
            "not-in-use"
        },
        billable_under: std::iter::once(o)
            .chain(view.descendants(o))
            .filter(|&x| billable(x))
            .count() as u32,
    }
}

/// The chapter and section of a code (ICD-10-CM).
fn place(view: &View<'_>, code: &str) -> (Option<Named>, Option<Named>) {
    match view.section_of(code) {
        Some((s, ch)) => (
            ch.map(|c| Named {
                code: c.name.clone(),
                title: c.title.clone(),
            }),
            Some(Named {
                code: if s.first == s.last {
                    s.first.clone()
                } else {
                    format!("{}-{}", s.first, s.last)
                },
                title: s.title.clone(),
            }),
        ),
        None => (None, None),
    }
}

/// The states of a code across the coverage, gap-free, with what began each.
pub fn timeline(view: &View<'_>, ord: u32) -> Vec<Segment> {
    let meta = view.meta();
    let (start, end) = (meta.coverage_from, meta.coverage_to);
    let names = |ords: Vec<u32>| -> Vec<String> {
        ords.into_iter()
            .map(|o| view.display(&view.code(o)))
            .collect()
    };
    if view.is_graph() {
        let in_use = view.billable(ord).next().is_some();
        return vec![Segment {
            from: start,
            to: end,
            state: if in_use { "in-use" } else { "obsolete" },
            reason: if in_use { "in-release" } else { "obsolete" },
            codes: names(view.successors(ord).map(|(s, _)| s).collect()),
        }];
    }
    let mut spans: Vec<(Period, &'static str)> = view
        .billable(ord)
        .map(|p| (p, "billable"))
        .chain(view.header(ord).map(|p| (p, "header")))
        .collect();
    spans.sort_by_key(|(p, _)| p.from);
    let mut out: Vec<Segment> = Vec::new();
    let mut at = start;
    let push_absent = |out: &mut Vec<Segment>, from: Date, to: Date| {
        let first = out.is_empty();
        let successors: Vec<u32> = view
            .successors(ord)
            .filter(|(_, d)| *d == from)
            .map(|(s, _)| s)
            .collect();
        let all: Vec<u32> = view.successors(ord).map(|(s, _)| s).collect();
        out.push(Segment {
            from,
            to,
            state: "absent",
            reason: if first { "not-yet-added" } else { "retired" },
            codes: if first {
                Vec::new()
            } else if successors.is_empty() {
                names(all)
            } else {
                names(successors)
            },
        });
    };
    for (p, state) in spans {
        if p.from > at {
            push_absent(&mut out, at, p.from.pred());
        }
        let (reason, codes) = match out.last() {
            None if p.from <= start => ("first-release", Vec::new()),
            None => ("added", Vec::new()),
            Some(prev) if prev.state == "absent" => ("added", Vec::new()),
            Some(prev) if prev.state == "billable" && state == "header" => {
                ("subdivided", names(children_on(view, ord, p.from)))
            }
            Some(prev) if prev.state == "header" && state == "billable" => {
                ("merged", names(children_on(view, ord, prev.to)))
            }
            Some(_) => ("added", Vec::new()),
        };
        out.push(Segment {
            from: p.from.max(start),
            to: p.to,
            state,
            reason,
            codes,
        });
        at = p.to.succ();
    }
    if at <= end {
        push_absent(&mut out, at, end);
    }
    out
}

/// The status over a period: the one state of the timeline on every day
/// of it, or `changes`.
fn status_over(timeline: &[Segment], period: &Period) -> &'static str {
    let states: Vec<&'static str> = timeline
        .iter()
        .filter(|s| Period::new(s.from, s.to).overlaps(period))
        .map(|s| s.state)
        .collect();
    match states.as_slice() {
        [one] if *one == "absent" => "not-in-use",
        [one] => one,
        [] => "not-in-use",
        _ => "changes",
    }
}

/// Whether the notes of the view's vocabulary are at hand (see
/// [`Card::notes_status`]); which systems have notes is
/// [`crate::systems::System::notes_file`]'s to say.
pub fn notes_status(view: &View<'_>) -> &'static str {
    let has_file = crate::systems::System::parse(&view.meta().vocabulary)
        .and_then(|s| s.notes_file())
        .is_some();
    if view.has_notes() {
        "loaded"
    } else if has_file {
        "not-loaded"
    } else {
        "none"
    }
}

/// The notes stated at the code, then the inherited ones of each ancestor,
/// its section and its chapter (nearest first).
fn notes_of(view: &View<'_>, ord: u32, code: &str) -> Vec<CardNote> {
    if !view.has_notes() {
        return Vec::new();
    }
    let mut out = Vec::new();
    let mut add = |kind: NoteKind, text: String, level: &'static str, at: String| {
        out.push(CardNote {
            codes: codes_named(view, &text),
            kind,
            text,
            level,
            at,
        });
    };
    for (k, t) in view.notes(ord) {
        add(k, t, "code", view.display(code));
    }
    for a in view.ancestors(ord) {
        for (k, t) in view.notes(a) {
            if k.inherited() {
                add(k, t, "code", view.display(&view.code(a)));
            }
        }
    }
    if let Some((s, _)) = view.section_of(code) {
        let si = view
            .sections()
            .iter()
            .position(|x| std::ptr::eq(x, s))
            .unwrap_or(usize::MAX);
        let range = format!("{}-{}", s.first, s.last);
        for (k, t) in view.section_notes(si) {
            add(k, t, "section", range.clone());
        }
        let ci = s.chapter as usize;
        let chapter = view.chapters().get(ci).map(|c| c.name.clone());
        for (k, t) in view.chapter_notes(ci) {
            add(k, t, "chapter", chapter.clone().unwrap_or_default());
        }
    }
    out
}

/// The codes of the index a note names, dotted, in order of appearance:
/// `(E08.-)`, `(L97.1-L97.9, L98.41-L98.49)` (both ends of a range), `E11.649`.
pub fn codes_named(view: &View<'_>, text: &str) -> Vec<String> {
    let mut out: Vec<String> = Vec::new();
    let sep = |c: char| !(c.is_ascii_alphanumeric() || c == '.' || c == '-');
    for token in text.split(sep) {
        for part in token.split('-') {
            let part = part.trim_end_matches('.');
            let ok = part.len() >= 3
                && part.starts_with(|c: char| c.is_ascii_uppercase())
                && part[1..2].chars().all(|c| c.is_ascii_digit());
            if !ok {
                continue;
            }
            let bare: String = part.chars().filter(|&c| c != '.').collect();
            if let Some(o) = view.ordinal(&bare) {
                let shown = view.display(&view.code(o));
                if !out.contains(&shown) {
                    out.push(shown);
                }
            }
        }
    }
    out
}

/// The mapping rows of every index at hand that name `code` of this
/// index's vocabulary, as source or as target.
fn mappings(view: &View<'_>, others: &[View<'_>], code: &str) -> Vec<MapLink> {
    let own = view.meta().vocabulary.as_str();
    let mut out = Vec::new();
    let all = std::iter::once(view).chain(others.iter());
    for holder in all {
        for m in holder.mappings() {
            let other_system = if m.from == own {
                m.to
            } else if m.to == own {
                m.from
            } else {
                continue;
            };
            let other = std::iter::once(view)
                .chain(others.iter())
                .find(|v| v.meta().vocabulary == other_system);
            let shown = |c: &str| match other {
                Some(v) => (
                    v.display(c),
                    v.ordinal(c).map(|o| v.description(o)).unwrap_or_default(),
                ),
                None => (c.to_string(), String::new()),
            };
            let rows = if m.from == own {
                m.lookup(code)
                    .into_iter()
                    .map(|r| ("source", r.target, r.flags))
                    .collect::<Vec<_>>()
            } else {
                m.rows()
                    .into_iter()
                    .filter(|r| r.target == code)
                    .map(|r| ("target", r.source, r.flags))
                    .collect()
            };
            for (role, c, flags) in rows {
                let (code, description) = shown(&c);
                out.push(MapLink {
                    mapping: m.name.to_string(),
                    title: m.title.to_string(),
                    role,
                    code,
                    system: other_system.to_string(),
                    description,
                    flags,
                });
            }
        }
    }
    out
}

/// The topmost nodes in force on `day` whose code starts with `start`
/// (undotted after normalising), if `start` is no code itself.
fn code_start(view: &View<'_>, start: &str, day: Date) -> Option<Vec<u32>> {
    use fst::automaton::{Automaton, Str};
    use fst::{IntoStreamer, Streamer};
    let bare: String = start
        .chars()
        .filter(|c| !c.is_whitespace() && *c != '.')
        .collect::<String>()
        .to_ascii_uppercase();
    if bare.is_empty() || view.is_graph() {
        return None;
    }
    let mut s = view
        .map()
        .search(Str::new(&bare).starts_with())
        .into_stream();
    let mut tops = Vec::new();
    while let Some((k, o)) = s.next() {
        let o = o as u32;
        view.note_code(o, std::str::from_utf8(k).unwrap_or_default());
        let above_in = view
            .ancestors(o)
            .any(|a| view.code(a).starts_with(&bare) && in_force(view, a, day));
        if in_force(view, o, day) && !above_in {
            tops.push(o);
        }
    }
    (!tops.is_empty()).then_some(tops)
}

fn start_card(view: &View<'_>, start: &str, tops: &[u32], day: Date) -> Card {
    let bare: String = start
        .chars()
        .filter(|c| !c.is_whitespace() && *c != '.')
        .collect::<String>()
        .to_ascii_uppercase();
    let mut card = blank(view, view.display(&bare), "code-start");
    card.children = tops.iter().map(|&o| child(view, o, day)).collect();
    if let Some(&first) = tops.first() {
        let code = view.code(first);
        let (chapter, section) = place(view, &code);
        let last = view.code(*tops.last().unwrap_or(&first));
        if place(view, &last).1 == section {
            card.section = section;
        }
        if place(view, &last).0 == chapter {
            card.chapter = chapter;
        }
        card.ancestors = ancestors_on(view, first, day)
            .into_iter()
            .filter(|&a| !view.code(a).starts_with(&bare))
            .map(|a| Node {
                code: view.display(&view.code(a)),
                description: view.description_or_note(a),
            })
            .collect();
    }
    card
}

/// A card for text that is no code: what a check of it says.
fn unknown_card<D: AsRef<[u8]>>(
    index: &Index<D>,
    view: &View<'_>,
    others: &[View<'_>],
    written: &str,
    options: &CheckOptions,
) -> Card {
    let report = crate::check::check_among(index, others, written, options);
    let entry = report.entries.into_iter().find(|e| !e.status.skipped());
    let status = entry.as_ref().map_or("malformed", |e| e.status.name());
    let mut card = blank(view, written.to_string(), status);
    let finding = entry.and_then(|e| e.findings.into_iter().next());
    card.problem = Some(match finding {
        Some(f) => Problem {
            message: f.message,
            suggestions: f.suggestions,
        },
        None if written.is_empty() => Problem {
            message: format!(
                "the code is empty; give {} {} code",
                crate::report::article(&view.meta().title),
                view.meta().title
            ),
            suggestions: Vec::new(),
        },
        None => Problem {
            message: format!("\"{written}\" is not a code of this index"),
            suggestions: Vec::new(),
        },
    });
    card
}
