//! The label check: does the label written beside a code fit the code's
//! official wording, and which codes does the label itself point to? Used
//! for `label-mismatch` and `label-unrecognised` findings and for the
//! label-driven suggestions of unknown and malformed codes. A label is read
//! through the synonym layer (`crate::synonyms`). The thresholds are in the README.

use crate::index::View;
use crate::model::Period;
use crate::report::{Finding, Kind, Severity, Suggestion};
use crate::search::{self, Fit, SearchOptions};

/// A label with every word (this share, by rarity) in the code's wordings
/// fits: no finding, and no search.
pub const FITS: f32 = 0.99;
/// Below this share the label does not fit, whatever else fits it.
pub const POOR: f32 = 0.5;
/// From [`POOR`] up to [`FITS`], the label does not fit when another code
/// fits it by at least this much more, or has every word of it.
pub const BETTER_BY: f32 = 0.25;
/// A code is suggested for a label only when the label fits it at least this well.
pub const CONFIDENT: f32 = 0.75;
/// How many labels of one list are searched (keeps huge pastes fast).
pub const SEARCH_LIMIT: usize = 1000;
/// Most codes suggested for a label.
pub const SUGGESTED: usize = 5;

/// Codes the label fits well, best first: by fit (in steps of a tenth),
/// then nearness to `near` in the hierarchy (characters shared at the
/// start), then fewest words the label does not mean
/// ([`crate::synonyms::unsaid`]), then the share of the description the
/// label has (in tenths), then search rank. `extra` are codes to consider besides the
/// search's (the near codes of a mistyped one).
pub fn candidates(
    view: &View<'_>,
    label: &str,
    near: &str,
    period: &Period,
    extra: &[u32],
) -> Vec<(u32, Fit)> {
    let opts = SearchOptions {
        limit: 20,
        prefix_last: false,
        period: Some(*period),
        near: Some(near.to_string()),
    };
    let hits = search::search(view, label, &opts);
    let mut c: Vec<(u32, Fit, usize)> = Vec::new();
    let pool = hits.iter().map(|h| h.ord).chain(extra.iter().copied());
    for (rank, o) in pool.enumerate() {
        if c.iter().any(|(x, _, _)| *x == o) {
            continue;
        }
        let f = search::fit(view, label, o);
        if f.label >= CONFIDENT {
            c.push((o, f, rank));
        }
    }
    // A code that adds what a plain label does not mean (secondary, open,
    // subsequent encounter) comes after those that do not: "lung cancer"
    // is the primary malignant neoplasm first.
    let said = crate::words::words(label);
    let unsaid =
        |o: u32| crate::synonyms::unsaid(&said, &crate::words::words(&view.description(o)));
    let mut c: Vec<(u32, Fit, usize, usize)> = c
        .into_iter()
        .map(|(o, f, r)| (o, f, r, unsaid(o)))
        .collect();
    let key = |(o, f, rank, extra): &(u32, Fit, usize, usize)| {
        (
            std::cmp::Reverse((f.label * 10.0 + 1e-3).floor() as i32),
            std::cmp::Reverse(search::shared_start(near, &view.code(*o)).min(4)),
            *extra,
            std::cmp::Reverse((f.description * 10.0 + 1e-3).floor() as i32),
            *rank,
        )
    };
    c.sort_by_key(key);
    c.into_iter().map(|(o, f, _, _)| (o, f)).collect()
}

/// Whether the code at `o` is for "other" forms and the label does not
/// say so: a label naming a condition plainly does not name its "Other ..."
/// code (those are the specified forms classified nowhere else).
fn names_other(view: &View<'_>, o: u32, reading: &[String]) -> bool {
    let other = "other".to_string();
    !reading.contains(&other) && crate::words::words(&view.description(o)).contains(&other)
}

/// How well a code suggested for a label fits it, as facts; [`LabelFit::reason`]
/// writes the words.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LabelFit {
    /// The share of the label's words (by rarity) its description has, 0 to 1.
    pub fit: f32,
    /// It starts with the same three characters as what the list holds.
    pub same_category: bool,
}

impl LabelFit {
    /// The fit `f` of the code at `o`, suggested for `near`, what the list holds.
    pub fn of(view: &View<'_>, f: &Fit, near: &str, o: u32) -> LabelFit {
        let code = view.code(o);
        LabelFit {
            fit: f.label,
            // `near` is what the list holds: its first three bytes may split a character.
            same_category: near.get(..3).is_some_and(|head| code.starts_with(head)),
        }
    }

    /// `its description fits the label (80% of the label's words)`, and
    /// `, same category` when `category` and it is.
    pub fn words(&self, category: bool) -> String {
        let mut r = format!(
            "its description fits the label ({}% of the label's words)",
            (self.fit * 100.0).round()
        );
        if category && self.same_category {
            r.push_str(", same category");
        }
        r
    }

    /// Why the code is suggested, in words.
    pub fn reason(&self) -> String {
        self.words(true)
    }
}

/// Why a code is suggested for a label, in words.
pub fn reason(view: &View<'_>, f: &Fit, near: &str, o: u32) -> String {
    LabelFit::of(view, f, near, o).reason()
}

/// What the label check found beside one code, as facts; [`Judgement::finding`]
/// writes the sentence.
#[derive(Clone, Debug, PartialEq)]
pub struct Judgement {
    /// The label as written.
    pub label: String,
    /// The code, dotted.
    pub code: String,
    /// Its official description.
    pub description: String,
    /// How well the label fits the code (its best reading; 0 to 1).
    pub fit: f32,
    /// What rollcall concludes.
    pub verdict: Verdict,
    /// Codes the label fits well, best first.
    pub suggestions: Vec<Suggestion>,
}

/// The conclusion of the label check on a label that does not plainly fit.
#[derive(Clone, Debug, PartialEq)]
pub enum Verdict {
    /// The label says one side of [`crate::synonyms::OPPOSITES`] and the
    /// description the other (`label` as the label reads, `official` as the
    /// description says).
    Contradicts {
        /// The label's word (`diastolic`).
        label: &'static str,
        /// The description's word (`systolic`).
        official: &'static str,
    },
    /// Another code (dotted) fits the label clearly better.
    FitsAnother(String),
    /// No code fits the label well, or the label was not searched
    /// (`searched` false): rollcall cannot say the label contradicts the code.
    Unrecognised {
        /// Whether codes for the label were searched.
        searched: bool,
    },
}

impl Judgement {
    /// `label-mismatch` (a warning) when the label contradicts the code or
    /// fits another clearly better; `label-unrecognised` (a note) when
    /// rollcall does not understand the label.
    pub fn kind(&self) -> Kind {
        match self.verdict {
            Verdict::Unrecognised { .. } => Kind::LabelUnrecognised,
            _ => Kind::LabelMismatch,
        }
    }

    /// The finding's severity (see [`kind`](Self::kind)).
    pub fn severity(&self) -> Severity {
        match self.verdict {
            Verdict::Unrecognised { .. } => Severity::Info,
            _ => Severity::Warning,
        }
    }

    /// The sentence for people.
    pub fn message(&self) -> String {
        let (label, code, desc) = (&self.label, &self.code, &self.description);
        let pct = (self.fit * 100.0).round();
        match &self.verdict {
            Verdict::Contradicts { label: l, official } => {
                let mut m = format!(
                    "the label \"{label}\" does not fit {code}, whose description is \"{desc}\": the label reads \"{l}\" where the description says \"{official}\""
                );
                if let Some(s) = self.suggestions.first() {
                    m.push_str(&format!("; it fits {} better", s.code));
                }
                m
            }
            Verdict::FitsAnother(other) => format!(
                "the label \"{label}\" does not fit {code}, whose description is \"{desc}\" ({pct}% of the label's words found in its wordings); it fits {other} better"
            ),
            Verdict::Unrecognised { searched: true } => format!(
                "rollcall does not recognise the label \"{label}\" ({pct}% of its words found in the wordings of {code}, \"{desc}\", and no code fits it well), so it cannot say whether the label fits the code"
            ),
            Verdict::Unrecognised { searched: false } => format!(
                "rollcall does not recognise the label \"{label}\" ({pct}% of its words found in the wordings of {code}, \"{desc}\"; codes for it were not searched, as only the first labels of a long list are), so it cannot say whether the label fits the code"
            ),
        }
    }

    /// The finding.
    pub fn finding(self) -> Finding {
        Finding::new(
            self.kind(),
            self.severity(),
            self.message(),
            self.suggestions,
        )
    }
}

/// The label check of `label` beside the code at `ord`: nothing when the
/// label fits (one of its readings has every word in the code's wordings,
/// or fits it as well as any other code), else what rollcall concludes. A
/// search for better codes takes one of `searches_left`.
pub fn judge(
    view: &View<'_>,
    label: &str,
    ord: u32,
    period: &Period,
    searches_left: &mut usize,
) -> Option<Judgement> {
    // No description (an ICD-10-PCS node above the body part): nothing to
    // compare with.
    let desc = view.description(ord);
    if desc.trim().is_empty() {
        return None;
    }
    // The common cases first, without weighing words: the label is the
    // description, or every one of its words is in it.
    if label.trim().eq_ignore_ascii_case(desc.trim()) {
        return None;
    }
    let words = crate::words::words(label);
    if words.is_empty() {
        return None;
    }
    let desc_words = crate::words::words(&desc);
    if words.iter().all(|w| desc_words.contains(w)) {
        return None;
    }
    let (given, reading) = search::best_fit(view, label, ord);
    if given.label >= FITS {
        return None;
    }
    // A header's wordings speak for the codes under it (the tabular list
    // gives an inclusion term such as "Hyperthyroidism NOS" at E05.9, whose
    // codes E05.90 and E05.91 tell a crisis apart): a label that fits an
    // ancestor fits the code. The label's words the code's own description
    // has (a 7th character's "initial encounter") need not be in the ancestor's.
    let rest: Vec<&str> = words
        .iter()
        .filter(|w| !desc_words.contains(w))
        .map(String::as_str)
        .collect();
    let rest = rest.join(" ");
    let via_ancestor = view
        .ancestors(ord)
        .any(|a| search::fit(view, &rest, a).label >= FITS);
    let contra = crate::synonyms::contradiction(&reading, &desc_words);
    let code = view.code(ord);
    let search = *searches_left > 0;
    *searches_left = searches_left.saturating_sub(1);
    let better: Vec<(u32, Fit)> = if search {
        candidates(view, label, &code, period, &[])
            .into_iter()
            .filter(|(o, f)| {
                *o != ord && f.label > given.label && !view.ancestors(ord).any(|a| a == *o)
            })
            .collect()
    } else {
        Vec::new()
    };
    let better: Vec<(u32, Fit)> = if via_ancestor {
        // The label fits through an ancestor: only a code the label names
        // outright (every word, and most of its description) is better.
        better
            .into_iter()
            .filter(|(o, f)| {
                f.label >= FITS
                    && f.description >= CONFIDENT
                    && f.description > given.description
                    && !names_other(view, *o, &reading)
            })
            .collect()
    } else {
        better
    };
    let best = better.first().map_or(0.0, |(_, f)| f.label);
    let clearly_better =
        !better.is_empty() && (via_ancestor || best >= given.label + BETTER_BY || best >= FITS);
    let verdict = match contra {
        Some((l, official)) => Verdict::Contradicts { label: l, official },
        None if clearly_better => Verdict::FitsAnother(view.display(&view.code(better[0].0))),
        None if via_ancestor => return None,
        None if given.label < POOR => Verdict::Unrecognised { searched: search },
        None => return None,
    };
    let suggestions = better
        .iter()
        .take(SUGGESTED)
        .map(|(o, f)| super::suggestion(view, *o, reason(view, f, &code, *o)))
        .collect();
    Some(Judgement {
        label: label.to_string(),
        code: view.display(&code),
        description: desc,
        fit: given.label,
        verdict,
        suggestions,
    })
}
