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
//!
//! `facts` holds the card's shape; `tree` the hierarchy on a day, `timeline`
//! a code's states across the releases, `notes` the tabular list's notes,
//! `mappings` the rows that name a code, `start` the card of a code start.

mod facts;
mod mappings;
mod notes;
mod start;
mod timeline;
mod tree;

pub use facts::{
    Card, CardNote, Cards, Child, Link, MapLink, Named, Node, Problem, Segment, Seventh,
};
pub use notes::{codes_named, notes_status};
pub use timeline::timeline;
pub use tree::{ancestors_on, children_on, in_force, parents_on, siblings_on};

use crate::check::CheckOptions;
use crate::code::{self, Resolved};
use crate::index::{Index, View};
use crate::model::Period;
use crate::report::{IndexInfo, OptionsInfo};
use mappings::mappings;
use notes::notes_of;
use start::{code_start, start_card};
use timeline::status_over;
use tree::{child, place};

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

pub(super) fn blank(view: &View<'_>, code: String, status: &'static str) -> Card {
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
