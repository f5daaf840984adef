//! A check as it goes: pass 1 when it starts, each entry judged when it is
//! asked for, then the whole list. A report of a large list can be written
//! entry by entry, without its entries ever being held together.

use super::*;
use crate::list::{InputLine, Lines};
use std::borrow::Cow;

/// A check under way: an iterator of the report's entries, in input order,
/// each judged when it is asked for; then [`Run::finish`] for the findings
/// on the list as a whole and the summary. Collecting every entry into a
/// [`Report`] gives what [`check_draft`] returns.
///
/// ```no_run
/// # let index = rollcall::Index::open(std::fs::read("vocab/icd10cm.rcx").unwrap()).unwrap();
/// # let day = rollcall::Date::parse("2026-01-01").unwrap();
/// let draft = rollcall::read("E11.9\nE11.56\n", rollcall::Reading::Auto);
/// let options = rollcall::CheckOptions::on(day, true);
/// let mut run = rollcall::check::Run::new(&index, &[], &draft, &options);
/// let judged = run.by_ref().count();
/// let (list_findings, summary) = run.finish();
/// assert_eq!((judged, summary.entries), (2, 2));
/// ```
pub struct Run<'a> {
    view: View<'a>,
    options: &'a CheckOptions,
    period: Period,
    others: &'a [View<'a>],
    lines: &'a dyn Lines,
    walk: Box<dyn Iterator<Item = Cow<'a, InputLine>> + 'a>,
    /// What pass 1 made of each line, for pass 2.
    items: Kept,
    ctx: ListContext,
    memo: Memo,
    suggestions_left: usize,
    summary: Summary,
    want_coverage: bool,
    extras: Extras,
}

/// What pass 1 keeps for pass 2.
enum Kept {
    /// Every line's reading, when the lines are held anyway.
    Items(std::vec::IntoIter<Item>),
    /// For a list read line by line: a code found (the most lines of a
    /// long list) by its ordinal and how it was read (an index into the
    /// distinct readings' changes); any other line is resolved again.
    Codes(
        std::vec::IntoIter<Option<(u32, u32)>>,
        Vec<Vec<&'static str>>,
    ),
}

impl<'a> Run<'a> {
    /// Starts the check of `lines` against `index`, with the indexes of
    /// other systems at hand as in [`check_among`]: reads and resolves
    /// every line once (pass 1).
    pub fn new<D: AsRef<[u8]>>(
        index: &'a Index<D>,
        others: &'a [View<'a>],
        lines: &'a dyn Lines,
        options: &'a CheckOptions,
    ) -> Run<'a> {
        let want = Want {
            others,
            ..Want::default()
        };
        Run::with(index, lines, options, want)
    }

    pub(super) fn with<D: AsRef<[u8]>>(
        index: &'a Index<D>,
        lines: &'a dyn Lines,
        options: &'a CheckOptions,
        want: Want<'a, 'a>,
    ) -> Run<'a> {
        let view = index.view();
        let period = options.period_for(index.meta());
        let held = lines.held();
        let (mut kept, mut codes) = (Vec::new(), Vec::new());
        let mut changes_seen: Vec<Vec<&'static str>> = Vec::new();

        // Pass 1: what each line is, and the list context.
        let mut ctx = ListContext {
            listed: OrdMap::default(),
            reached: Marks::new(view.len()),
            explicit: Marks::new(view.len()),
            by_pattern: OrdMap::default(),
            dotted: false,
        };
        let mut extras = Extras::default();
        for l in lines.walk() {
            let item = resolve_line(&view, &l.kind, &period);
            match &item {
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
            if held {
                kept.push(item);
            } else {
                codes.push(match item {
                    Item::Code { ord, changes, .. } => {
                        // A list repeats a handful of ways of writing a code.
                        let at = match changes_seen.iter().position(|c| *c == changes) {
                            Some(at) => at,
                            None => {
                                changes_seen.push(changes);
                                changes_seen.len() - 1
                            }
                        };
                        Some((ord, at as u32))
                    }
                    _ => None,
                });
            }
        }
        Run {
            view,
            options,
            period,
            others: want.others,
            lines,
            walk: lines.walk(),
            items: if held {
                Kept::Items(kept.into_iter())
            } else {
                Kept::Codes(codes.into_iter(), changes_seen)
            },
            ctx,
            memo: Memo::default(),
            suggestions_left: SUGGESTION_LIMIT,
            summary: Summary::default(),
            want_coverage: want.coverage,
            extras,
        }
    }

    /// The report's heading: its vocabulary, how the list was read, the
    /// index and the options; no entries, list findings or counts yet.
    pub fn heading(&self) -> Report {
        let meta = self.view.meta();
        Report {
            vocabulary: meta.vocabulary.clone(),
            reading: self.lines.facts().clone(),
            index: IndexInfo::of(meta),
            options: OptionsInfo::against(meta, &self.period, self.options.billable),
            entries: Vec::new(),
            list_findings: Vec::new(),
            summary: Summary::default(),
        }
    }

    /// Pass 3, once every entry has been judged (those not yet asked for
    /// are judged and counted first): the findings on the list as a whole
    /// and the report's summary.
    pub fn finish(self) -> (Vec<ListFinding>, Summary) {
        let (list_findings, summary, _) = self.end();
        (list_findings, summary)
    }

    /// [`Run::finish`] with the category coverage of the list (as
    /// [`check_draft`] gives it): for each category the list reaches, the
    /// billable codes it includes of all under it in the period.
    pub fn finish_with_coverage(mut self) -> (Vec<ListFinding>, Summary, Vec<CategoryCoverage>) {
        self.want_coverage = true;
        let (list_findings, summary, extras) = self.end();
        (list_findings, summary, extras.coverage)
    }

    pub(super) fn end(mut self) -> (Vec<ListFinding>, Summary, Extras) {
        for _ in self.by_ref() {}
        let list_findings = list_level::run(&self.view, &self.period, &self.ctx);
        if self.want_coverage {
            self.extras.coverage = coverage_of(&self.view, &self.period, &self.ctx.reached);
        }
        let mut summary = std::mem::take(&mut self.summary);
        summary.lines = self.lines.facts().lines;
        for f in &list_findings {
            summary.count_severity(f.severity);
        }
        (list_findings, summary, self.extras)
    }
}

impl Iterator for Run<'_> {
    type Item = Entry;

    /// Pass 2 for the next entry.
    fn next(&mut self) -> Option<Entry> {
        let l = self.walk.next()?;
        let item = match &mut self.items {
            Kept::Items(items) => items.next()?,
            Kept::Codes(codes, changes) => match (codes.next()?, &l.kind) {
                // What resolving the cell again would give.
                (Some((ord, at)), LineKind::Entry { code, .. }) => Item::Code {
                    ord,
                    changes: changes.get(at as usize).cloned().unwrap_or_default(),
                    written: code.trim().to_string(),
                },
                _ => resolve_line(&self.view, &l.kind, &self.period),
            },
        };
        let mut e = Entry::of(&l);
        judge(
            &self.view,
            self.options,
            &self.period,
            &self.ctx,
            item,
            l.number,
            &mut e,
            &mut self.suggestions_left,
            &mut self.memo,
            self.others,
        );
        if e.system.is_none()
            && !e.status.skipped()
            && !matches!(e.status, Status::Malformed | Status::OtherSystem)
        {
            e.system = Some(self.view.meta().vocabulary.clone());
        }
        e.findings.sort_by_key(|f| f.severity);
        self.summary.count_entry(&e);
        Some(e)
    }
}
