//! Where a code sits on a day: the index's hierarchy restricted to the nodes
//! in force that day (ancestors, parents, children, siblings), the
//! children's counts of billable codes, and its chapter and section.

use super::facts::{Child, Named};
use crate::date::Date;
use crate::index::View;

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

pub(super) fn child(view: &View<'_>, o: u32, day: Date) -> Child {
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
pub(super) fn place(view: &View<'_>, code: &str) -> (Option<Named>, Option<Named>) {
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
