//! Checks over the list as a whole: the same code twice (`duplicate`), every
//! billable code under a node present (`roll-up`), and most but not all of
//! them present (`sibling-gap`), and a period running past what the index
//! knows (`beyond-coverage`). `redundant` is judged per entry in `check`.

use super::{billable_under, ListContext, Marks, NAMED_LIMIT};
use crate::date::Date;
use crate::index::View;
use crate::model::Period;
use crate::pattern::Pattern;
use crate::report::ListFinding;

/// Runs the whole-list checks.
pub(crate) fn run(view: &View<'_>, period: &Period, ctx: &ListContext) -> Vec<ListFinding> {
    let mut out: Vec<ListFinding> = beyond_coverage(view, period)
        .map(BeyondCoverage::finding)
        .into_iter()
        .collect();
    out.extend(duplicates(view, ctx).into_iter().map(Duplicate::finding));
    out.extend(roll_ups(view, period, ctx).into_iter().map(RollUp::finding));
    out.extend(
        sibling_gaps(view, period, ctx)
            .into_iter()
            .map(SiblingGap::finding),
    );
    out
}

/// The period runs past the index's last covered day, as facts;
/// [`BeyondCoverage::message`] writes the sentence.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct BeyondCoverage {
    /// The vocabulary's title.
    pub title: String,
    /// The last day the index covers.
    pub coverage_to: Date,
}

/// A code written on more than one line, as facts.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct Duplicate {
    /// The code, as the index shows it.
    pub code: String,
    /// The lines it is on, in order.
    pub lines: Vec<usize>,
}

/// Every code under a node in the list, as facts.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct RollUp {
    /// The node, as the index shows it.
    pub node: String,
    /// Its description.
    pub description: String,
    /// The pattern matching exactly the codes under it; `None` in a stated
    /// hierarchy, where the node itself stands for them.
    pub pattern: Option<String>,
    /// The codes under it (billable in the period), shown.
    pub codes: Vec<String>,
    /// The lines that hold them.
    pub lines: Vec<usize>,
}

/// Most but not all of the codes under a node in the list, as facts.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct SiblingGap {
    /// The node, as the index shows it.
    pub node: String,
    /// How many codes under it the list reaches, of how many.
    pub have: usize,
    /// How many codes there are under it.
    pub of: usize,
    /// A stated hierarchy: codes, not billable codes.
    pub graph: bool,
    /// Judged in a period (not a one-release vocabulary as of its day).
    pub in_period: bool,
    /// The lines that reach the codes it has.
    pub lines: Vec<usize>,
    /// The codes missing, shown.
    pub missing: Vec<String>,
    /// The first of them, offered: code and description.
    pub offered: Vec<(String, String)>,
}

/// Rule: the period runs past the last day the index covers. The index
/// cannot tell what happened after it (a release not yet out), so entries
/// are judged up to that day and this one finding says so. Not for a
/// vocabulary that ends there ([`crate::model::Meta::open_ended`]).
fn beyond_coverage(view: &View<'_>, period: &Period) -> Option<BeyondCoverage> {
    let meta = view.meta();
    if !meta.open_ended() || period.to <= meta.coverage_to {
        return None;
    }
    Some(BeyondCoverage {
        title: meta.title.clone(),
        coverage_to: meta.coverage_to,
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
fn duplicates(view: &View<'_>, ctx: &ListContext) -> Vec<Duplicate> {
    let mut dups: Vec<(&u32, &Vec<usize>)> =
        ctx.listed.iter().filter(|(_, l)| l.len() > 1).collect();
    dups.sort_by_key(|(_, l)| l[0]);
    dups.into_iter()
        .map(|(&o, lines)| Duplicate {
            code: view.display(&view.code(o)),
            lines: lines.clone(),
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
fn roll_ups(view: &View<'_>, period: &Period, ctx: &ListContext) -> Vec<RollUp> {
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
        out.push(RollUp {
            node: view.display(&view.code(n)),
            description: view.description_or_note(n),
            // A stated hierarchy: the node itself stands for everything under it.
            pattern: (!view.is_graph()).then(|| Pattern::Prefix(view.code(n)).display(view)),
            codes: codes_of(view, &u),
            lines: lines_of(ctx, &u),
        });
    }
    out
}

/// Rule: a node not in the list with at least three billable codes under it
/// in the period, of which more than half but not all are in the list
/// (written or matched by a pattern). Reported at the lowest such node; a
/// higher node is reported only if it is missing codes the lower ones do not name.
fn sibling_gaps(view: &View<'_>, period: &Period, ctx: &ListContext) -> Vec<SiblingGap> {
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
        out.push(SiblingGap {
            have: have.len(),
            of: u.len(),
            graph: view.is_graph(),
            in_period: !view.meta().snapshot(),
            lines: lines_of(ctx, &have),
            missing: codes_of(view, &missing),
            offered: missing
                .iter()
                .take(NAMED_LIMIT)
                .map(|&o| (view.display(&view.code(o)), view.description_or_note(o)))
                .collect(),
            node: shown,
        });
    }
    out.sort_by_key(|f| f.lines.first().copied());
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::check::testing::*;

    // The facts of `ten` (invented codes in the shape of ICD-10-CM's): E11
    // a header over E11.65 (under E11.6) and E11.9, R00 over R00.1 (retired
    // 2019-09-30) and R00.11 (from 2019-10-01), U07 over U07.1 (from
    // 2020-04-01); the index covers 2015-10-01 to 2027-03-31.

    /// Every billable code under E11 listed: the node, the pattern that
    /// matches exactly them, and their lines (E11 itself is a header).
    #[test]
    fn every_billable_code_of_a_category_rolls_up_to_its_pattern() {
        let index = index(ten());
        let view = index.view();
        let ctx = context(&view, &["E119", "E1165"]);
        let ups = roll_ups(&view, &span("2020-01-01", "2020-12-31"), &ctx);
        assert_eq!(
            ups,
            [RollUp {
                node: "E11".into(),
                description: "Type 2 diabetes mellitus".into(),
                pattern: Some("E11.*".into()),
                codes: vec!["E11.65".into(), "E11.9".into()],
                lines: vec![0, 1],
            }]
        );
    }

    /// One code under a node of two is no roll-up; the node itself listed
    /// is none either.
    #[test]
    fn a_node_half_listed_or_listed_itself_does_not_roll_up() {
        let index = index(ten());
        let view = index.view();
        let period = span("2020-01-01", "2020-12-31");
        assert!(roll_ups(&view, &period, &context(&view, &["E119"])).is_empty());
        let listed = context(&view, &["E11", "E119", "E1165"]);
        assert!(roll_ups(&view, &period, &listed).is_empty());
    }

    /// The same code on two lines: the code and both lines.
    #[test]
    fn the_same_code_twice_is_a_duplicate_with_its_lines() {
        let r = check_ten("I10\nE11.9\nI10\n", "2020-01-01", "2020-12-31");
        let index = index(ten());
        let view = index.view();
        let mut ctx = context(&view, &[]);
        let i10 = view.ordinal("I10").unwrap();
        ctx.listed.insert(i10, vec![1, 3]);
        assert_eq!(
            duplicates(&view, &ctx),
            [Duplicate {
                code: "I10".into(),
                lines: vec![1, 3]
            }]
        );
        // The whole check finds it on the same lines.
        let f = r.list_findings.iter().find(|f| f.lines == [1, 3]);
        assert!(f.is_some(), "{:?}", r.list_findings);
    }

    /// A period past the last covered day: the day and the vocabulary; none
    /// for a period inside the coverage.
    #[test]
    fn a_period_past_the_coverage_names_the_last_day() {
        let index = index(ten());
        let view = index.view();
        assert_eq!(
            beyond_coverage(&view, &span("2026-01-01", "2027-12-31")),
            Some(BeyondCoverage {
                title: "Tiny".into(),
                coverage_to: day("2027-03-31"),
            })
        );
        assert_eq!(
            beyond_coverage(&view, &span("2026-01-01", "2027-03-31")),
            None
        );
    }

    /// Two of three billable codes under a node: a gap naming the third.
    #[test]
    fn two_of_three_codes_under_a_node_leave_a_gap() {
        let mut codes = ten();
        let a = always();
        codes.push(billable(
            "E1110",
            "Type 2 diabetes mellitus with ketoacidosis",
            &[a],
        ));
        let index = index(codes);
        let view = index.view();
        let ctx = context(&view, &["E119", "E1165"]);
        let gaps = sibling_gaps(&view, &span("2020-01-01", "2020-12-31"), &ctx);
        assert_eq!(
            gaps,
            [SiblingGap {
                node: "E11".into(),
                have: 2,
                of: 3,
                graph: false,
                in_period: true,
                lines: vec![0, 1],
                missing: vec!["E11.10".into()],
                offered: vec![(
                    "E11.10".into(),
                    "Type 2 diabetes mellitus with ketoacidosis".into()
                )],
            }]
        );
        // One of three is no gap: not more than half.
        assert!(sibling_gaps(
            &view,
            &span("2020-01-01", "2020-12-31"),
            &context(&view, &["E119"])
        )
        .is_empty());
    }
}
