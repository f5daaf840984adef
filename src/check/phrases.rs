//! Small pieces the findings share: a suggestion of a code, the codes a
//! message names, counts in words, and the billable codes under a node; and
//! the sentences of the findings whose rules return facts (a code retired
//! before the period, one billable on part of it).

use super::*;

pub(crate) fn suggestion(view: &View<'_>, ord: u32, reason: impl Into<String>) -> Suggestion {
    Suggestion {
        code: view.display(&view.code(ord)),
        description: view.description_or_note(ord),
        reason: reason.into(),
    }
}

/// The first three codes at `ords`, dotted: what a message names of them.
pub(crate) fn shown_codes(view: &View<'_>, ords: &[u32]) -> Vec<String> {
    ords.iter()
        .take(3)
        .map(|&o| view.display(&view.code(o)))
        .collect()
}

/// Names codes for a message: `E11.9`, `E11.9 and E11.65`, `E11.9, E11.65 and 3 more`.
pub(crate) fn name_codes(view: &View<'_>, ords: &[u32]) -> String {
    names(&shown_codes(view, ords), ords.len())
}

/// Names `count` codes of which `shown` are the first three.
fn names(shown: &[String], count: usize) -> String {
    match (count, shown) {
        (0, _) => "none".into(),
        (1, [a]) => a.clone(),
        (2, [a, b]) => format!("{a} and {b}"),
        (3, [a, b, c]) => format!("{a}, {b} and {c}"),
        (n, [a, b, ..]) => format!("{a}, {b} and {} more", n - 2),
        _ => String::new(),
    }
}

/// "none of them", "2 of them", "all of them" in the list.
pub(crate) fn in_list(have: usize, of: usize) -> String {
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

impl Named {
    /// `E11.9, E11.65 and 3 more`.
    fn names(&self) -> String {
        names(&self.shown, self.count)
    }

    /// `2 of them in the list`.
    fn in_list(&self) -> String {
        in_list(self.listed, self.count)
    }
}

impl RetiredBefore {
    /// The sentence for people.
    pub(crate) fn message(&self) -> String {
        let mut msg = format!(
            "{} was retired: its last valid day was {}, before the period starts ({})",
            self.code, self.last_valid, self.period_from
        );
        if !self.replacements.is_empty() {
            let codes: Vec<&str> = self
                .replacements
                .iter()
                .map(|s| s.code.as_str())
                .take(NAMED_LIMIT)
                .collect();
            msg.push_str(&format!(
                "; {} {}",
                if self.replacements.len() == 1 {
                    "its replacement is"
                } else {
                    "replacements are"
                },
                codes.join(", ")
            ));
            if self.listed > 0 {
                msg.push_str(&format!(" ({} already in the list)", self.listed));
            }
        }
        if let Some(m) = &self.mapped {
            msg.push_str(&format!("; {}: {}", m.title, m.words));
        }
        msg
    }

    /// The `retired` finding, an error.
    pub(crate) fn finding(self) -> Finding {
        let message = self.message();
        let offered = match self.mapped {
            Some(m) if self.replacements.is_empty() => m.targets,
            _ => self.replacements,
        };
        Finding::new(Kind::Retired, Severity::Error, message, offered)
    }
}

impl PartialPeriod {
    /// The sentence for people.
    pub(crate) fn message(&self) -> String {
        let parts: Vec<String> = self.parts.iter().map(Part::phrase).collect();
        format!(
            "{} is billable for part of the period only: {}",
            self.code,
            parts.join("; ")
        )
    }

    /// The `partial-period` finding, a warning.
    pub(crate) fn finding(self) -> Finding {
        let message = self.message();
        Finding::new(
            Kind::PartialPeriod,
            Severity::Warning,
            message,
            self.suggestions,
        )
    }
}

impl Part {
    /// `from 2019-10-01 to 2020-12-31 retired, its data coded as R00.11 (in the list)`.
    fn phrase(&self) -> String {
        let (from, to) = (self.days.from, self.days.to);
        let (what, named) = match &self.state {
            PartState::Billable => return format!("billable from {from} to {to}"),
            PartState::Header(under) => {
                return format!(
                    "from {from} to {to} a header over {} billable code{} ({}), {}",
                    under.count,
                    if under.count == 1 { "" } else { "s" },
                    under.names(),
                    under.in_list()
                )
            }
            PartState::Mapped { title, targets } => {
                return format!(
                    "from {from} to {to} retired, mapped to {} by the {title}",
                    targets.names()
                )
            }
            PartState::NotYetValid(named) => ("not yet valid", named),
            PartState::Retired(named) => ("retired", named),
        };
        if named.count == 0 {
            format!("from {from} to {to} {what}")
        } else {
            format!(
                "from {from} to {to} {what}, its data coded as {} ({})",
                named.names(),
                named.in_list()
            )
        }
    }
}

impl BeyondCoverage {
    /// The sentence for people.
    pub(crate) fn message(&self) -> String {
        format!(
            "the index knows {} until {}; the period runs past it, so codes are judged up to that day",
            self.title, self.coverage_to
        )
    }

    /// The `beyond-coverage` finding, a warning on the whole list.
    pub(crate) fn finding(self) -> ListFinding {
        ListFinding {
            kind: Kind::BeyondCoverage,
            severity: Severity::Warning,
            lines: vec![],
            codes: vec![],
            message: self.message(),
            suggestions: vec![],
            coverage_to: Some(self.coverage_to),
        }
    }
}

impl Duplicate {
    /// The sentence for people: `E11.9 is on lines 1, 4 and 7; keep one of them`.
    pub(crate) fn message(&self) -> String {
        let l: Vec<String> = self.lines.iter().map(|n| n.to_string()).collect();
        let lines = match l.split_last() {
            Some((last, rest)) if !rest.is_empty() => format!("{} and {last}", rest.join(", ")),
            _ => l.join(", "),
        };
        format!("{} is on lines {lines}; keep one of them", self.code)
    }

    /// The `duplicate` finding, a warning.
    pub(crate) fn finding(self) -> ListFinding {
        ListFinding {
            coverage_to: None,
            kind: Kind::Duplicate,
            severity: Severity::Warning,
            message: self.message(),
            codes: vec![self.code],
            lines: self.lines,
            suggestions: vec![],
        }
    }
}

impl RollUp {
    /// The sentence for people.
    pub(crate) fn message(&self) -> String {
        let all = if self.codes.len() == 2 {
            "both".to_string()
        } else {
            format!("all {}", self.codes.len())
        };
        let node = &self.node;
        match &self.pattern {
            None => format!(
                "{all} codes under {node} are in the list; {node} stands for them all (and for itself) where a query takes a code with everything under it"
            ),
            Some(pat) => format!(
                "{all} billable codes under {node} in the period are in the list; {pat} matches exactly these"
            ),
        }
    }

    /// The `roll-up` finding, a note, offering the pattern (or the node).
    pub(crate) fn finding(self) -> ListFinding {
        let message = self.message();
        let n = self.codes.len();
        let suggestion = match self.pattern {
            None => Suggestion {
                code: self.node,
                description: self.description,
                reason: format!("one code in place of {n} lines"),
            },
            Some(pat) => Suggestion {
                code: pat,
                description: self.description,
                reason: format!("replaces the {n} lines with one pattern"),
            },
        };
        ListFinding {
            coverage_to: None,
            kind: Kind::RollUp,
            severity: Severity::Info,
            lines: self.lines,
            codes: self.codes,
            message,
            suggestions: vec![suggestion],
        }
    }
}

impl SiblingGap {
    /// The sentence for people.
    pub(crate) fn message(&self) -> String {
        let shown: Vec<String> = self.missing.iter().take(3).cloned().collect();
        format!(
            "the list has {} of the {} {} under {}{}; missing: {}",
            self.have,
            self.of,
            if self.graph {
                "codes"
            } else {
                "billable codes"
            },
            self.node,
            if self.in_period { " in the period" } else { "" },
            names(&shown, self.missing.len())
        )
    }

    /// The `sibling-gap` finding, a note, offering the first missing codes.
    pub(crate) fn finding(self) -> ListFinding {
        let message = self.message();
        let reason = format!("under {}, not in the list", self.node);
        ListFinding {
            coverage_to: None,
            kind: Kind::SiblingGap,
            severity: Severity::Info,
            lines: self.lines,
            codes: self.missing,
            message,
            suggestions: self
                .offered
                .into_iter()
                .map(|(code, description)| Suggestion {
                    code,
                    description,
                    reason: reason.clone(),
                })
                .collect(),
        }
    }
}

/// `2014-10-01 to 2015-09-30, ...`: days a message names.
fn spans(periods: &[Period]) -> String {
    periods
        .iter()
        .map(|p| format!("{} to {}", p.from, p.to))
        .collect::<Vec<_>>()
        .join(", ")
}

impl OtherShape {
    /// The sentence for people.
    pub(crate) fn message(&self) -> String {
        let (written, title) = (&self.written, &self.own);
        match self.fits.as_slice() {
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
        }
    }
}

impl KnownElsewhere {
    /// The sentence for people.
    pub(crate) fn message(&self) -> String {
        let mut message = format!(
            "{} is not {} {} code; it is {} {} code ({}), valid {}",
            self.code,
            article(&self.own),
            self.own,
            article(&self.title),
            self.title,
            self.description,
            spans(&self.valid)
        );
        match &self.mapped {
            Some(m) => message.push_str(&format!("; {}: {}", m.title, m.words)),
            None => message.push_str(&format!(
                "; rollcall has no mapping from {} into {}",
                self.title, self.own
            )),
        }
        message
    }

    /// The `other-system` finding, a warning, offering the mapping's targets.
    pub(crate) fn finding(self) -> Finding {
        let message = self.message();
        let targets = self.mapped.map(|m| m.targets).unwrap_or_default();
        Finding::new(Kind::OtherSystem, Severity::Warning, message, targets)
    }
}

impl AlsoElsewhere {
    /// The sentence for people.
    pub(crate) fn message(&self) -> String {
        let valid = if self.spans.is_empty() {
            String::new()
        } else {
            format!(", valid {}", spans(&self.spans))
        };
        format!(
            "{} is also {} {} code ({}{valid}); it is checked as {} {} code, the list's system. If the list meant the other, check it with that system",
            self.code,
            article(&self.title),
            self.title,
            self.description,
            article(&self.own),
            self.own,
        )
    }

    /// The `two-systems` finding, a note.
    pub(crate) fn finding(self) -> Finding {
        Finding::new(Kind::TwoSystems, Severity::Info, self.message(), vec![])
    }
}

impl NearBy {
    /// `one character different, same category, but not billable in the period`.
    pub(crate) fn words(&self) -> String {
        let mut why = match self.edit {
            Edit::Swap => "two neighbouring characters swapped",
            Edit::One => "one character different",
            Edit::Two => "two characters different",
        }
        .to_string();
        if self.same_category {
            why.push_str(", same category");
        }
        if !self.in_period {
            why.push_str(", but not billable in the period");
        }
        why
    }
}

impl Offered {
    /// Why the code is offered, in words.
    pub(crate) fn reason(&self) -> String {
        match self {
            Offered::Near(near) => near.words(),
            Offered::Label(fit) => fit.reason(),
            Offered::Both(near, fit) => format!("{}; {}", near.words(), fit.words(false)),
            Offered::Seventh => "a 7th character the tabular list allows here".into(),
            Offered::OtherReading { written } => {
                format!("one character from \"{written}\"; the label fits it better")
            }
        }
    }
}

/// The codes offered, each with why, as suggestions.
pub(crate) fn offer(view: &View<'_>, offered: &[(u32, Offered)]) -> Vec<Suggestion> {
    offered
        .iter()
        .map(|(o, why)| suggestion(view, *o, why.reason()))
        .collect()
}

impl SeventhNotAllowed {
    /// `the 7th character Z is not one the tabular list allows under S52.5: A (initial encounter), ...`.
    pub(crate) fn phrase(&self) -> String {
        let allowed: Vec<String> = self
            .allowed
            .iter()
            .map(|(c, m)| format!("{c} ({m})"))
            .collect();
        format!(
            "the 7th character {} is not one the tabular list allows under {}: {}",
            self.written,
            self.node,
            allowed.join(", ")
        )
    }
}
