//! The card of a code start (`E11.6`, `E11.6-`): the topmost nodes in force
//! below it, and where they sit.

use super::blank;
use super::facts::{Card, Node};
use super::tree::{ancestors_on, child, in_force, place};
use crate::date::Date;
use crate::index::View;

/// The topmost nodes in force on `day` whose code starts with `start`
/// (undotted after normalising), if `start` is no code itself.
pub(super) fn code_start(view: &View<'_>, start: &str, day: Date) -> Option<Vec<u32>> {
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

pub(super) fn start_card(view: &View<'_>, start: &str, tops: &[u32], day: Date) -> Card {
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
