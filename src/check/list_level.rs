//! Checks over the list as a whole: the same code twice (`duplicate`), every
//! billable code under a node present (`roll-up`), and most but not all of
//! them present (`sibling-gap`), and a period running past what the index
//! knows (`beyond-coverage`). `redundant` is judged per entry in `check`.

use super::{billable_under, name_codes, suggestion, ListContext, Marks, NAMED_LIMIT};
use crate::index::View;
use crate::model::Period;
use crate::pattern::Pattern;
use crate::report::{Kind, ListFinding, Severity, Suggestion};

/// Runs the whole-list checks.
pub(crate) fn run(view: &View<'_>, period: &Period, ctx: &ListContext) -> Vec<ListFinding> {
    let mut out: Vec<ListFinding> = beyond_coverage(view, period).into_iter().collect();
    out.extend(duplicates(view, ctx));
    out.extend(roll_ups(view, period, ctx));
    out.extend(sibling_gaps(view, period, ctx));
    out
}

/// Rule: the period runs past the last day the index covers. The index
/// cannot tell what happened after it (a release not yet out), so entries
/// are judged up to that day and this one finding says so. Not for a
/// vocabulary that ends there ([`crate::model::Meta::open_ended`]).
fn beyond_coverage(view: &View<'_>, period: &Period) -> Option<ListFinding> {
    let meta = view.meta();
    if !meta.open_ended() || period.to <= meta.coverage_to {
        return None;
    }
    Some(ListFinding {
        kind: Kind::BeyondCoverage,
        severity: Severity::Warning,
        lines: vec![],
        codes: vec![],
        message: format!(
            "the index knows {} until {}; the period runs past it, so codes are judged up to that day",
            meta.title, meta.coverage_to
        ),
        suggestions: vec![],
        coverage_to: Some(meta.coverage_to),
    })
}

fn lines_of(ctx: &ListContext, ords: &[u32]) -> Vec<usize> {
    let mut l: Vec<usize> = ords
        .iter()
        .flat_map(|o| {
            ctx.listed
                .get(o)
                .cloned()
                .or_else(|| ctx.by_pattern.get(o).map(|&l| vec![l]))
                .unwrap_or_default()
        })
        .collect();
    l.sort();
    l.dedup();
    l
}

fn codes_of(view: &View<'_>, ords: &[u32]) -> Vec<String> {
    ords.iter().map(|&o| view.display(&view.code(o))).collect()
}

/// Rule: a code (after normalisation) written on more than one line.
fn duplicates(view: &View<'_>, ctx: &ListContext) -> Vec<ListFinding> {
    let mut dups: Vec<(&u32, &Vec<usize>)> =
        ctx.listed.iter().filter(|(_, l)| l.len() > 1).collect();
    dups.sort_by_key(|(_, l)| l[0]);
    dups.into_iter()
        .map(|(&o, lines)| {
            let shown = view.display(&view.code(o));
            let l: Vec<String> = lines.iter().map(|n| n.to_string()).collect();
            ListFinding {
                coverage_to: None,
                kind: Kind::Duplicate,
                severity: Severity::Warning,
                lines: lines.clone(),
                codes: vec![shown.clone()],
                message: format!(
                    "{shown} is on lines {}; keep one of them",
                    match l.split_last() {
                        Some((last, rest)) if !rest.is_empty() =>
                            format!("{} and {last}", rest.join(", ")),
                        _ => l.join(", "),
                    }
                ),
                suggestions: vec![],
            }
        })
        .collect()
}

/// Every ancestor of the marked codes, sorted, once each.
fn ancestors_of(view: &View<'_>, marks: &Marks) -> Vec<u32> {
    let mut seen = Marks::new(view.len());
    for &o in marks {
        for a in view.ancestors(o) {
            // On a prefix chain, a node already in has its ancestors in too.
            if !seen.insert(a) && !view.is_graph() {
                break;
            }
        }
    }
    let mut v: Vec<u32> = seen.into_iter().copied().collect();
    v.sort_unstable();
    v
}

/// Counts billable-in-period codes under `n`: (all, marked). Stops early,
/// returning `None`, when `stop_on_unmarked` and an unmarked one is found.
fn count_under(
    view: &View<'_>,
    period: &Period,
    n: u32,
    marks: &Marks,
    stop_on_unmarked: bool,
) -> Option<(usize, usize)> {
    let (mut all, mut have) = (0, 0);
    for o in view.descendants(n) {
        if view.billable_in(o, period) {
            all += 1;
            if marks.contains(&o) {
                have += 1;
            } else if stop_on_unmarked {
                return None;
            }
        }
    }
    Some((all, have))
}

/// Rule: a node not in the list, with at least two billable codes under it
/// in the period, all of them written explicitly in the list. Only the
/// highest such node is reported; its suggestion, a pattern, matches
/// exactly the codes it replaces.
fn roll_ups(view: &View<'_>, period: &Period, ctx: &ListContext) -> Vec<ListFinding> {
    let candidates = ancestors_of(view, &ctx.explicit);
    let mut full = Marks::new(view.len());
    for &n in &candidates {
        if ctx.listed.contains_key(&n) {
            continue;
        }
        if let Some((all, _)) = count_under(view, period, n, &ctx.explicit, true) {
            if all >= 2 {
                full.insert(n);
            }
        }
    }
    let mut out = Vec::new();
    for &n in &candidates {
        if !full.contains(&n) || view.ancestors(n).any(|a| full.contains(&a)) {
            continue;
        }
        let u = billable_under(view, n, period);
        let shown = view.display(&view.code(n));
        let all = if u.len() == 2 {
            "both".to_string()
        } else {
            format!("all {}", u.len())
        };
        // A stated hierarchy: the node itself stands for everything under it.
        let (message, suggestion) = if view.is_graph() {
            (
                format!(
                    "{all} codes under {shown} are in the list; {shown} stands for them all (and for itself) where a query takes a code with everything under it"
                ),
                Suggestion {
                    code: shown.clone(),
                    description: view.description_or_note(n),
                    reason: format!("one code in place of {} lines", u.len()),
                },
            )
        } else {
            let pat = Pattern::Prefix(view.code(n)).display(view);
            (
                format!(
                    "{all} billable codes under {shown} in the period are in the list; {pat} matches exactly these"
                ),
                Suggestion {
                    code: pat.clone(),
                    description: view.description_or_note(n),
                    reason: format!("replaces the {} lines with one pattern", u.len()),
                },
            )
        };
        out.push(ListFinding {
            coverage_to: None,
            kind: Kind::RollUp,
            severity: Severity::Info,
            lines: lines_of(ctx, &u),
            codes: codes_of(view, &u),
            message,
            suggestions: vec![suggestion],
        });
    }
    out
}

/// Rule: a node not in the list with at least three billable codes under it
/// in the period, of which more than half but not all are in the list
/// (written or matched by a pattern). Reported at the lowest such node; a
/// higher node is reported only if it is missing codes the lower ones do not name.
fn sibling_gaps(view: &View<'_>, period: &Period, ctx: &ListContext) -> Vec<ListFinding> {
    let candidates = ancestors_of(view, &ctx.reached);
    let mut by_depth: Vec<(usize, u32)> = candidates
        .into_iter()
        .map(|n| (view.ancestors(n).count(), n))
        .collect();
    by_depth.sort_by(|a, b| b.0.cmp(&a.0).then(a.1.cmp(&b.1)));
    let mut named = Marks::new(view.len());
    let mut out = Vec::new();
    for (_, n) in by_depth {
        if ctx.listed.contains_key(&n) {
            continue;
        }
        let Some((all, have)) = count_under(view, period, n, &ctx.reached, false) else {
            continue;
        };
        if all < 3 || have < 2 || have == all || have * 2 <= all {
            continue;
        }
        let u = billable_under(view, n, period);
        let (have, missing): (Vec<u32>, Vec<u32>) = u.iter().partition(|o| ctx.reached.contains(o));
        if missing.iter().all(|o| named.contains(o)) {
            continue;
        }
        for &m in &missing {
            named.insert(m);
        }
        let shown = view.display(&view.code(n));
        out.push(ListFinding {
            coverage_to: None,
            kind: Kind::SiblingGap,
            severity: Severity::Info,
            lines: lines_of(ctx, &have),
            codes: codes_of(view, &missing),
            message: format!(
                "the list has {} of the {} {} under {shown}{}; missing: {}",
                have.len(),
                u.len(),
                if view.is_graph() {
                    "codes"
                } else {
                    "billable codes"
                },
                if view.meta().snapshot() {
                    ""
                } else {
                    " in the period"
                },
                name_codes(view, &missing)
            ),
            suggestions: missing
                .iter()
                .take(NAMED_LIMIT)
                .map(|&o| suggestion(view, o, format!("under {shown}, not in the list")))
                .collect(),
        });
    }
    out.sort_by_key(|f| f.lines.first().copied());
    out
}

#[cfg(test)]
mod tests {
    use crate::check::testing::*;
    use crate::report::Kind;

    /// Every billable code under E11 listed: the two lines can be one
    /// pattern (E11 itself is a header, so not a code of a billable list).
    #[test]
    fn every_billable_code_of_a_category_rolls_up() {
        let r = check_ten("E11.9\nE11.65\n", "2020-01-01", "2020-12-31");
        let up = r
            .list_findings
            .iter()
            .find(|f| f.kind == Kind::RollUp)
            .expect("roll-up");
        assert_eq!(up.lines, [1, 2]);
        assert_eq!(up.codes, ["E11.65", "E11.9"]);
        assert_eq!(up.suggestions[0].code, "E11.*", "{up:?}");
    }

    /// The same code twice is a duplicate.
    #[test]
    fn the_same_code_twice_is_a_duplicate() {
        let r = check_ten("I10\nI10\n", "2020-01-01", "2020-12-31");
        assert!(r.list_findings.iter().any(|f| f.kind == Kind::Duplicate));
    }
}
