//! A cell that is no code of the list's vocabulary but has the shape of
//! another system's code, or is a code of another index at hand (an ICD-9-CM
//! code in an ICD-10-CM list, with its GEM targets).

use super::*;

/// The other systems whose shape a code that is no code of the index's
/// vocabulary fits, and a sentence saying so.
pub(crate) fn other_systems(view: &View<'_>, written: &str) -> Option<(Vec<System>, String)> {
    let own = view.meta().vocabulary.as_str();
    let fits: Vec<(System, String)> = systems::ALL
        .into_iter()
        .filter(|s| s.name() != own)
        .filter_map(|s| match systems::shape(s, written) {
            Shape::Fits { note, .. } => Some((s, note)),
            Shape::Ambiguous { reason, .. } => Some((s, reason)),
            Shape::Fails { .. } => None,
        })
        .collect();
    if fits.is_empty() {
        return None;
    }
    let title = &view.meta().title;
    let message = match fits.as_slice() {
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
    };
    Some((fits.into_iter().map(|(s, _)| s).collect(), message))
}

/// When `code` is no code of `view` but a code of one of `others`: that
/// system's name, a sentence, and the targets of its mapping into `view`'s
/// vocabulary (the GEMs) with their flags in words and their status in
/// the period.
pub(crate) fn known_elsewhere(
    view: &View<'_>,
    others: &[View<'_>],
    code: &str,
    period: &Period,
) -> Option<(String, String, Vec<Suggestion>)> {
    for other in others {
        // A dot where the other system puts none (`E88.00` for E880.0) says
        // the code is not from there.
        let code::Resolved::Found { ord, changes } = code::resolve(other, code) else {
            continue;
        };
        if changes.contains(&"dot moved") {
            continue;
        }
        let meta = other.meta();
        let shown = other.display(&other.code(ord));
        let mut message = format!(
            "{shown} is not {} {} code; it is {} {} code ({}), valid {}",
            article(&view.meta().title),
            view.meta().title,
            article(&meta.title),
            meta.title,
            other.description_or_note(ord),
            other
                .billable(ord)
                .map(|p| format!("{} to {}", p.from, p.to))
                .collect::<Vec<_>>()
                .join(", ")
        );
        let mut sugg = Vec::new();
        match mapped_into(other, &other.code(ord), view, period) {
            Some(m) => {
                message.push_str(&format!("; {}: {}", m.title, m.words));
                sugg = m.targets;
            }
            None => message.push_str(&format!(
                "; rollcall has no mapping from {} into {}",
                meta.title,
                view.meta().title
            )),
        }
        return Some((meta.vocabulary.clone(), message, sugg));
    }
    None
}

/// A code's targets in another vocabulary by a mapping (the GEMs), as facts.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct Mapped {
    /// The mapping's title (`General Equivalence Mappings (2015), ICD-9-CM
    /// to ICD-10-CM`).
    pub title: String,
    /// The flags of the code's rows, in words.
    pub words: String,
    /// Each target the rows name, with its flags in words and its status
    /// in the period.
    pub targets: Vec<Suggestion>,
    /// How many of the targets are billable on some day of the period.
    pub in_period: usize,
}

/// `code`, a code of `from`, mapped into the vocabulary of `into`, when
/// either index keeps a mapping between the two (the GEMs of both
/// directions are kept with ICD-9-CM).
pub(crate) fn mapped_into(
    from: &View<'_>,
    code: &str,
    into: &View<'_>,
    period: &Period,
) -> Option<Mapped> {
    let (source, target) = (&from.meta().vocabulary, &into.meta().vocabulary);
    let m = from
        .mapping(source, target)
        .or_else(|| into.mapping(source, target))?;
    let rows = m.lookup(code);
    let mut targets = Vec::new();
    let mut in_period = 0;
    for r in rows.iter().filter(|r| !r.flags.no_map) {
        let Some(t) = into.ordinal(&r.target) else {
            targets.push(Suggestion {
                code: r.target.clone(),
                description: String::new(),
                reason: format!(
                    "{} target, not in any {} release from {} on",
                    m.title,
                    into.meta().title,
                    into.meta().coverage_from
                ),
            });
            continue;
        };
        let mut reason = crate::mapping::row_words(&r.flags);
        if into.billable_in(t, period) {
            in_period += 1;
        } else {
            reason.push_str(", but not billable in the period");
        }
        targets.push(suggestion(into, t, reason));
    }
    Some(Mapped {
        title: m.title.to_string(),
        words: crate::mapping::flag_words(&rows),
        targets,
        in_period,
    })
}

/// When `code`, a code of `view`, is also a code of another index at hand
/// written the same way (ICD-10-CM's V10.3, a transport accident header,
/// is ICD-9-CM's personal history of breast cancer): a note saying so, and
/// that the list's own system was used. A form the other system writes
/// with its dot elsewhere (`E88.0` against `E880`) is not the same code.
pub(crate) fn also_elsewhere(
    view: &View<'_>,
    others: &[View<'_>],
    code: &str,
    shown: &str,
) -> Option<Finding> {
    let own = &view.meta().title;
    others.iter().find_map(|other| {
        let ord = other.ordinal(code)?;
        if other.display(&other.code(ord)) != shown {
            return None;
        }
        let meta = other.meta();
        let spans = other
            .billable(ord)
            .chain(other.header(ord))
            .map(|p| format!("{} to {}", p.from, p.to))
            .collect::<Vec<_>>()
            .join(", ");
        Some(Finding::new(
            Kind::TwoSystems,
            Severity::Info,
            format!(
                "{shown} is also {} {} code ({}{}); it is checked as {} {own} code, the list's system. If the list meant the other, check it with that system",
                article(&meta.title),
                meta.title,
                other.description_or_note(ord),
                if spans.is_empty() { String::new() } else { format!(", valid {spans}") },
                article(own),
            ),
            vec![],
        ))
    })
}
