//! A code against the study period: billable, header or absent on each day,
//! retired before it, added during it, and the part past the index's coverage.

use super::*;

/// The part of `period` up to the index's last covered day (that day alone
/// when the whole period lies past it); see the `beyond-coverage` finding.
pub(crate) fn within_coverage(view: &View<'_>, period: &Period) -> Period {
    let last = view.meta().coverage_to;
    if period.to <= last || !view.meta().open_ended() {
        *period
    } else {
        Period::new(period.from.min(last), last)
    }
}

/// The code's status on each part of the period, in order.
pub(crate) fn segments(
    view: &View<'_>,
    ord: u32,
    period: &Period,
) -> Vec<(Period, Option<SpanKind>)> {
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

#[allow(clippy::too_many_arguments)]
pub(crate) fn judge_dates(
    view: &View<'_>,
    others: &[View<'_>],
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
                let last_valid = billable.iter().map(|p| p.to).max().unwrap_or(last);
                let facts = retired_before(view, others, period, ctx, ord, shown, last_valid);
                e.findings.push(facts.finding());
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
    e.findings
        .push(partial_period(view, others, ctx, ord, shown, &segs).finding());
}

/// A code retired before the period starts, as facts;
/// [`RetiredBefore::message`] writes the sentence.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct RetiredBefore {
    /// The code as the list shows it.
    pub code: String,
    /// Its last billable day.
    pub last_valid: Date,
    /// The first day of the period.
    pub period_from: Date,
    /// What replaces it: its successors billable in the period, else the
    /// codes under it billable then, else the nearest codes in use.
    pub replacements: Vec<Suggestion>,
    /// How many of the replacements the list already reaches.
    pub listed: usize,
    /// When its own release names nothing in use: its targets in another
    /// index at hand by a mapping (an ICD-9-CM code's ICD-10-CM targets in
    /// the GEMs), some of them billable in the period.
    pub mapped: Option<Mapped>,
}

/// The facts of a code at `ord` whose last billable day, `last_valid`,
/// lies before `period`; `others` are the indexes at hand.
pub(crate) fn retired_before(
    view: &View<'_>,
    others: &[View<'_>],
    period: &Period,
    ctx: &ListContext,
    ord: u32,
    shown: &str,
    last_valid: Date,
) -> RetiredBefore {
    let mut replacements: Vec<Suggestion> = view
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
    if replacements.is_empty() {
        let kids = billable_under(view, ord, period);
        for &o in kids.iter().take(NAMED_LIMIT) {
            replacements.push(suggestion(
                view,
                o,
                "a code under it, billable in the period",
            ));
        }
    }
    if replacements.is_empty() {
        replacements = nearest_in_use(view, &view.code(ord), ord, period);
    }
    let listed = replacements
        .iter()
        .filter(|s| {
            view.ordinal(&s.code.replace('.', ""))
                .is_some_and(|o| ctx.reached.contains(&o))
        })
        .count();
    let mapped = if replacements.is_empty() {
        mapped_in_use(view, others, ord, period)
    } else {
        None
    };
    RetiredBefore {
        code: shown.to_string(),
        last_valid,
        period_from: period.from,
        replacements,
        listed,
        mapped,
    }
}

/// The code at `ord` mapped into the first index at hand that has a
/// mapping from `view`'s vocabulary with a target billable in `within`
/// (ICD-9-CM into ICD-10-CM; never the reverse, whose targets all ended
/// in 2015, for a period after it).
pub(crate) fn mapped_in_use(
    view: &View<'_>,
    others: &[View<'_>],
    ord: u32,
    within: &Period,
) -> Option<Mapped> {
    let code = view.code(ord);
    others
        .iter()
        .filter_map(|o| mapped_into(view, &code, o, within))
        .find(|m| m.in_period > 0)
}

/// A code billable on part of the period only, as facts;
/// [`PartialPeriod::message`] writes the sentence.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct PartialPeriod {
    /// The code as the list shows it.
    pub code: String,
    /// The parts of the period, in order, each with the code's state.
    pub parts: Vec<Part>,
    /// Codes covering the parts the code does not, that the list lacks.
    pub suggestions: Vec<Suggestion>,
}

/// One part of the period and the code's state on it.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct Part {
    /// Its days.
    pub days: Period,
    /// The code's state on them.
    pub state: PartState,
}

/// What a code is on a part of the period.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) enum PartState {
    /// Billable.
    Billable,
    /// A header over these billable codes.
    Header(Named),
    /// Not valid yet; its data coded as these codes (none named by the release).
    NotYetValid(Named),
    /// Retired; its data coded as these codes.
    Retired(Named),
    /// Retired with nothing in its own release to code its data as; the
    /// mapping `title` (the GEMs) gives these targets in another index at
    /// hand (whose codes the list's count does not reach).
    Mapped {
        /// The mapping's title.
        title: String,
        /// Its targets.
        targets: Named,
    },
}

/// Codes a finding names: the first three as a message shows them, how
/// many there are, and how many of them the list reaches.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub(crate) struct Named {
    /// The first three, dotted.
    pub shown: Vec<String>,
    /// How many there are.
    pub count: usize,
    /// How many of them the list reaches.
    pub listed: usize,
}

impl Named {
    /// The codes at `ords`, those the list reaches counted.
    pub(crate) fn of(view: &View<'_>, ctx: &ListContext, ords: &[u32]) -> Named {
        Named {
            shown: shown_codes(view, ords),
            count: ords.len(),
            listed: ords.iter().filter(|o| ctx.reached.contains(o)).count(),
        }
    }
}

/// The facts of a code at `ord` over the segments `segs` of the period,
/// billable on some of them only.
pub(crate) fn partial_period(
    view: &View<'_>,
    others: &[View<'_>],
    ctx: &ListContext,
    ord: u32,
    shown: &str,
    segs: &[(Period, Option<SpanKind>)],
) -> PartialPeriod {
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
    for &(p, k) in segs {
        let state = match k {
            Some(SpanKind::Billable) => PartState::Billable,
            Some(SpanKind::Header) => {
                let kids = billable_under(view, ord, &p);
                offer(
                    &mut sugg,
                    &kids,
                    format!("covers {} to {} under it", p.from, p.to),
                );
                PartState::Header(Named::of(view, ctx, &kids))
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
                    .filter(|o| view.billable_in(*o, &p) && *o != ord)
                    .collect();
                offer(
                    &mut sugg,
                    &cover,
                    format!("{}: covers {} to {}", successor_source(view), p.from, p.to),
                );
                let mapped = (!before && cover.is_empty())
                    .then(|| mapped_in_use(view, others, ord, &p))
                    .flatten();
                let named = Named::of(view, ctx, &cover);
                match mapped {
                    Some(m) => {
                        for t in &m.targets {
                            if sugg.len() < NAMED_LIMIT && !sugg.iter().any(|s| s.code == t.code) {
                                sugg.push(t.clone());
                            }
                        }
                        let codes: Vec<String> = m.targets.iter().map(|t| t.code.clone()).collect();
                        PartState::Mapped {
                            title: m.title,
                            targets: Named {
                                shown: codes.iter().take(3).cloned().collect(),
                                count: codes.len(),
                                listed: 0,
                            },
                        }
                    }
                    None if before => PartState::NotYetValid(named),
                    None => PartState::Retired(named),
                }
            }
        };
        parts.push(Part { days: p, state });
    }
    PartialPeriod {
        code: shown.to_string(),
        parts,
        suggestions: sugg,
    }
}

#[cfg(test)]
mod tests {
    use super::{partial_period, retired_before, segments, within_coverage};
    use super::{Named, Part, PartState, PartialPeriod};
    use crate::check::testing::*;
    use crate::report::{Kind, Status};
    use crate::View;

    /// The facts of a code over `from`..`to` billable on part of it only.
    fn partial(
        view: &View<'_>,
        code: &str,
        from: &str,
        to: &str,
        reached: &[&str],
    ) -> PartialPeriod {
        let ord = view.ordinal(code).unwrap();
        let segs = segments(view, ord, &within_coverage(view, &span(from, to)));
        let ctx = context(view, reached);
        partial_period(view, &[], &ctx, ord, &view.display(code), &segs)
    }

    fn named(shown: &[&str], count: usize, listed: usize) -> Named {
        Named {
            shown: shown.iter().map(|s| s.to_string()).collect(),
            count,
            listed,
        }
    }

    // The facts of `ten`: R00.1 billable until 2019-09-30, R00.11 its
    // successor from 2019-10-01 (invented codes and days, in the shape of
    // the CMS conversion table's rows).
    #[test]
    fn retired_before_the_period_holds_its_last_day_replacements_and_how_many_are_listed() {
        let index = index(ten());
        let view = index.view();
        let ord = view.ordinal("R001").unwrap();
        let period = span("2020-01-01", "2020-12-31");
        let facts = |reached: &[&str]| {
            let ctx = context(&view, reached);
            retired_before(&view, &[], &period, &ctx, ord, "R00.1", day("2019-09-30"))
        };
        let alone = facts(&[]);
        assert_eq!(alone.last_valid, day("2019-09-30"));
        assert_eq!(alone.period_from, day("2020-01-01"));
        let codes: Vec<&str> = alone.replacements.iter().map(|s| s.code.as_str()).collect();
        assert_eq!(codes, ["R00.11"]);
        assert_eq!(alone.listed, 0);
        assert_eq!(
            alone.message(),
            "R00.1 was retired: its last valid day was 2019-09-30, before the period starts (2020-01-01); its replacement is R00.11"
        );
        let beside = facts(&["R0011"]);
        assert_eq!(beside.listed, 1);
        assert!(
            beside.message().ends_with("R00.11 (1 already in the list)"),
            "{}",
            beside.message()
        );
    }

    #[test]
    fn a_code_retired_during_the_period_has_a_billable_part_then_a_retired_one() {
        let index = index(ten());
        let view = index.view();
        let facts = partial(&view, "R001", "2019-01-01", "2020-12-31", &[]);
        assert_eq!(
            facts.parts,
            [
                Part {
                    days: span("2019-01-01", "2019-09-30"),
                    state: PartState::Billable
                },
                Part {
                    days: span("2019-10-01", "2020-12-31"),
                    state: PartState::Retired(named(&["R00.11"], 1, 0)),
                },
            ]
        );
        let offered: Vec<&str> = facts.suggestions.iter().map(|s| s.code.as_str()).collect();
        assert_eq!(offered, ["R00.11"]);
        assert_eq!(
            facts.message(),
            "R00.1 is billable for part of the period only: billable from 2019-01-01 to 2019-09-30; from 2019-10-01 to 2020-12-31 retired, its data coded as R00.11 (not in the list)"
        );
        // With its successor listed, nothing is offered and the count says so.
        let listed = partial(&view, "R001", "2019-01-01", "2020-12-31", &["R0011"]);
        assert_eq!(
            listed.parts[1].state,
            PartState::Retired(named(&["R00.11"], 1, 1))
        );
        assert!(listed.suggestions.is_empty());
    }

    #[test]
    fn a_code_added_during_the_period_is_not_yet_valid_first() {
        let index = index(ten());
        let view = index.view();
        let facts = partial(&view, "U071", "2020-01-01", "2020-12-31", &[]);
        assert_eq!(
            facts.parts,
            [
                Part {
                    days: span("2020-01-01", "2020-03-31"),
                    state: PartState::NotYetValid(Named::default()),
                },
                Part {
                    days: span("2020-04-01", "2020-12-31"),
                    state: PartState::Billable
                },
            ]
        );
        assert_eq!(
            facts.message(),
            "U07.1 is billable for part of the period only: from 2020-01-01 to 2020-03-31 not yet valid; billable from 2020-04-01 to 2020-12-31"
        );
    }

    // A billable code that becomes a header over new codes (the shape of
    // ICD-10-CM I48.2 in FY2020, whose I48.20 and I48.21 began 2019-10-01).
    #[test]
    fn a_code_that_becomes_a_header_names_the_codes_under_it() {
        let mut codes = ten();
        let mut i482 = billable(
            "I482",
            "Chronic atrial fibrillation",
            &[span("2015-10-01", "2019-09-30")],
        );
        i482.header = vec![span("2019-10-01", "2027-03-31")];
        let new = span("2019-10-01", "2027-03-31");
        codes.extend([
            i482,
            billable("I4820", "Chronic atrial fibrillation, unspecified", &[new]),
            billable("I4821", "Permanent atrial fibrillation", &[new]),
        ]);
        let index = index(codes);
        let view = index.view();
        let facts = partial(&view, "I482", "2019-01-01", "2024-12-31", &["I4821"]);
        assert_eq!(
            facts.parts[1].state,
            PartState::Header(named(&["I48.20", "I48.21"], 2, 1))
        );
        let offered: Vec<&str> = facts.suggestions.iter().map(|s| s.code.as_str()).collect();
        assert_eq!(offered, ["I48.20"]);
        assert_eq!(
            facts.message(),
            "I48.2 is billable for part of the period only: billable from 2019-01-01 to 2019-09-30; from 2019-10-01 to 2024-12-31 a header over 2 billable codes (I48.20 and I48.21), 1 of them in the list"
        );
    }

    /// A code of "old" (ended 2015-09-30, `testing::old`) retired before
    /// the period, with "tiny" at hand: its targets by the mapping, one of
    /// them billable in the period; alone, nothing.
    #[test]
    fn a_code_of_an_ended_vocabulary_is_offered_its_mapped_targets() {
        let (old, tiny) = (old(), index(ten()));
        let view = old.view();
        let ord = view.ordinal("4280").unwrap();
        let period = span("2020-01-01", "2020-12-31");
        let ctx = context(&view, &[]);
        let last = day("2015-09-30");
        let facts = retired_before(&view, &[tiny.view()], &period, &ctx, ord, "428.0", last);
        assert!(facts.replacements.is_empty());
        let mapped = facts.mapped.expect("mapped into tiny");
        assert_eq!(
            (mapped.title.as_str(), mapped.in_period),
            ("Old to Tiny", 1)
        );
        let alone = retired_before(&view, &[], &period, &ctx, ord, "428.0", last);
        assert_eq!(alone.mapped, None);
        // Cut by its last day, the part after it is mapped (the whole
        // period, as for a vocabulary whose last release the index holds:
        // "old" is no known system, so the check would stop at its coverage).
        let segs = segments(&view, ord, &span("2015-01-01", "2016-12-31"));
        let facts = partial_period(&view, &[tiny.view()], &ctx, ord, "428.0", &segs);
        assert_eq!(
            facts.parts[1].state,
            PartState::Mapped {
                title: "Old to Tiny".into(),
                targets: named(&["I10", "R00.1"], 2, 0),
            }
        );
    }

    /// A code retired before the period: its last valid day and its
    /// successor are the finding's facts (the entries of `ten`).
    #[test]
    fn a_code_retired_before_the_period_names_its_last_day_and_successor() {
        let r = check_ten("R00.1\n", "2020-01-01", "2020-12-31");
        let e = &r.entries[0];
        assert_eq!(e.status, Status::Retired);
        let f = e.findings.iter().find(|f| f.kind == Kind::Retired).unwrap();
        assert!(f.message.contains("2019-09-30"), "{}", f.message);
        let offered: Vec<&str> = f.suggestions.iter().map(|s| s.code.as_str()).collect();
        assert_eq!(offered, ["R00.11"]);
    }

    /// A code retired during the period is valid for part of it only.
    #[test]
    fn a_code_retired_during_the_period_covers_part_of_it() {
        let r = check_ten("R00.1\n", "2019-01-01", "2020-12-31");
        let kinds: Vec<Kind> = r.entries[0].findings.iter().map(|f| f.kind).collect();
        assert!(kinds.contains(&Kind::PartialPeriod), "{kinds:?}");
    }

    /// A code added after the day checked is not yet valid; one added
    /// during the period covers part of it.
    #[test]
    fn a_code_added_later_is_not_yet_valid_and_one_added_during_is_partial() {
        let r = check_ten("U07.1\n", "2019-06-01", "2019-06-01");
        assert_eq!(r.entries[0].status, Status::NotYetValid);
        let r = check_ten("U07.1\n", "2020-01-01", "2020-12-31");
        let f = r.entries[0]
            .findings
            .iter()
            .find(|f| f.kind == Kind::PartialPeriod)
            .expect("partial-period");
        assert!(f.message.contains("2020-04-01"), "{}", f.message);
    }

    /// A code in use on every day of the period has no date finding.
    #[test]
    fn a_code_in_use_throughout_has_no_date_finding() {
        let r = check_ten("I10\n", "2016-01-01", "2026-12-31");
        assert_eq!(r.entries[0].status, Status::Valid);
        assert!(
            r.entries[0].findings.is_empty(),
            "{:?}",
            r.entries[0].findings
        );
    }
}
