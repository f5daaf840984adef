//! Translating a list from one vocabulary to another through a mapping
//! both indexes agree on (the 2015 GEMs, kept in the ICD-9-CM index, in
//! both directions): per entry its targets, whether the match is exact,
//! approximate, a combination or none, and how each target stands in the
//! study period in the target vocabulary.

use crate::check::{check, CheckOptions};
use crate::code::{self, Resolved};
use crate::index::{Index, MapView};
use crate::list::LineKind;
use crate::mapping::outcome_of;
pub use crate::mapping::{flag_words, row_words, Outcome};
use crate::model::MapFlags;
use crate::report::{OptionsInfo, Status};
use serde::Serialize;
use std::collections::{BTreeMap, BTreeSet};

/// One target of an entry.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Target {
    /// The target code, in the target vocabulary's written form.
    pub code: String,
    /// Its description in the target index.
    pub description: String,
    /// The row's flags.
    pub flags: MapFlags,
    /// The target's status in the period (`valid`, `retired`, `header`,
    /// `unknown`, ...; the names of the check report).
    pub status: String,
    /// What the check of the target says, when it is not simply valid.
    pub note: String,
}

/// One translated line.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Translated {
    /// Input line number.
    pub line: usize,
    /// The line as written.
    pub input: String,
    /// The source code, written form, if the line has one.
    pub code: Option<String>,
    /// Its description in the source index.
    pub description: Option<String>,
    /// How it translates.
    pub outcome: Outcome,
    /// The outcome in words.
    pub note: String,
    /// The targets, in the mapping's order.
    pub targets: Vec<Target>,
}

/// Counts of a translation.
#[derive(Clone, Debug, Default, PartialEq, Eq, Serialize)]
pub struct TranslationSummary {
    /// Lines with a code.
    pub entries: usize,
    /// Entries per outcome name.
    pub outcomes: BTreeMap<String, usize>,
    /// Distinct targets.
    pub targets: usize,
    /// Distinct targets not billable throughout the period in the target.
    pub targets_not_valid: usize,
}

/// A translated list.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Translation {
    /// Source vocabulary.
    pub from: String,
    /// Target vocabulary.
    pub to: String,
    /// The mapping used.
    pub mapping: String,
    /// The period the targets were judged for.
    pub options: OptionsInfo,
    /// One per input line.
    pub entries: Vec<Translated>,
    /// Counts.
    pub summary: TranslationSummary,
}

/// Finds the mapping from `from` to `to` in either index.
fn find_mapping<'a>(
    a: &'a crate::View<'_>,
    b: &'a crate::View<'_>,
    from: &str,
    to: &str,
) -> Option<&'a MapView<'a>> {
    a.mapping(from, to).or_else(|| b.mapping(from, to))
}

/// Translates the codes of `text` (in `source`'s vocabulary) into
/// `target`'s vocabulary; targets are judged for the period in `options`.
/// An error when neither index carries a mapping between the two.
pub fn translate<A: AsRef<[u8]>, B: AsRef<[u8]>>(
    source: &Index<A>,
    target: &Index<B>,
    text: &str,
    options: &CheckOptions,
) -> Result<Translation, String> {
    let (sv, tv) = (source.view(), target.view());
    let (from, to) = (sv.meta().vocabulary.clone(), tv.meta().vocabulary.clone());
    let mapping = find_mapping(&sv, &tv, &from, &to).ok_or_else(|| {
        format!(
            "there is no mapping from {} to {} in these indexes",
            sv.meta().title,
            tv.meta().title
        )
    })?;
    let lines = crate::list::read(text, crate::list::Reading::Auto).lines;
    let mut entries = Vec::with_capacity(lines.len());
    let mut wanted: BTreeSet<String> = BTreeSet::new();
    for l in &lines {
        let mut t = Translated {
            line: l.number,
            input: l.text.clone(),
            code: None,
            description: None,
            outcome: Outcome::Skipped,
            note: String::new(),
            targets: Vec::new(),
        };
        if let LineKind::Entry { code: written, .. } = &l.kind {
            t.code = Some(written.trim().to_string());
            match code::resolve(&sv, written) {
                Resolved::Found { ord, .. } => {
                    let c = sv.code(ord);
                    t.code = Some(sv.display(&c));
                    t.description = Some(sv.description_or_note(ord));
                    let rows = mapping.lookup(&c);
                    let (outcome, note) = outcome_of(&rows);
                    t.outcome = outcome;
                    t.note = if outcome == Outcome::NotMapped {
                        format!(
                            "not-mapped: {} has no rows in the mapping ({} maps billable codes; list the codes under it)",
                            sv.display(&c),
                            mapping.title
                        )
                    } else {
                        note
                    };
                    for r in rows.iter().filter(|r| !r.flags.no_map) {
                        wanted.insert(r.target.clone());
                        t.targets.push(Target {
                            code: r.target.clone(),
                            description: String::new(),
                            flags: r.flags,
                            status: String::new(),
                            note: String::new(),
                        });
                    }
                }
                _ => {
                    t.outcome = Outcome::NotInSource;
                    t.note = format!(
                        "not-in-source: not {} {} code; check the list with the right system",
                        if sv.meta().title.starts_with('I') {
                            "an"
                        } else {
                            "a"
                        },
                        sv.meta().title
                    );
                }
            }
        }
        entries.push(t);
    }

    // Judge every distinct target once, with the target's own check.
    let list: String = wanted.iter().map(|c| format!("{c}\n")).collect();
    let report = check(target, &list, options);
    let mut judged: BTreeMap<String, (String, String, String, String)> = BTreeMap::new();
    for (c, e) in wanted.iter().zip(report.entries.iter()) {
        let note = e
            .findings
            .iter()
            .find(|f| f.kind != crate::Kind::Normalized)
            .map(|f| f.message.clone())
            .unwrap_or_default();
        judged.insert(
            c.clone(),
            (
                e.code.clone().unwrap_or_else(|| c.clone()),
                e.description.clone().unwrap_or_default(),
                e.status.name().to_string(),
                note,
            ),
        );
    }
    let mut summary = TranslationSummary {
        targets: wanted.len(),
        targets_not_valid: report
            .entries
            .iter()
            .filter(|e| e.status != Status::Valid)
            .count(),
        ..TranslationSummary::default()
    };
    for t in &mut entries {
        for x in &mut t.targets {
            if let Some((code, desc, status, note)) = judged.get(&x.code) {
                x.code = code.clone();
                x.description = desc.clone();
                x.status = status.clone();
                x.note = note.clone();
            }
        }
        if t.outcome != Outcome::Skipped {
            summary.entries += 1;
            *summary
                .outcomes
                .entry(t.outcome.name().to_string())
                .or_default() += 1;
        }
    }
    Ok(Translation {
        from,
        to,
        mapping: mapping.title.to_string(),
        options: report.options.clone(),
        entries,
        summary,
    })
}
