//! A code's states across the releases the index covers, gap-free, with what
//! began each (added, subdivided, merged, retired), and its one status over
//! a period.

use super::facts::Segment;
use super::tree::children_on;
use crate::date::Date;
use crate::index::View;
use crate::model::Period;

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
pub(super) fn status_over(timeline: &[Segment], period: &Period) -> &'static str {
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
