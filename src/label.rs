//! The label check: does the label written beside a code fit the code's
//! official wording, and which codes does the label itself point to? Used
//! for `label-mismatch` findings and for the label-driven suggestions of
//! unknown and malformed codes. The thresholds are in the README.

use crate::index::View;
use crate::model::Period;
use crate::report::Suggestion;
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
/// start), then search rank. `extra` are codes to consider besides the
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
    let key = |(o, f, rank): &(u32, Fit, usize)| {
        (
            std::cmp::Reverse((f.label * 10.0 + 1e-3).floor() as i32),
            std::cmp::Reverse(search::shared_start(near, &view.code(*o)).min(4)),
            std::cmp::Reverse((f.description * 10.0 + 1e-3).floor() as i32),
            *rank,
        )
    };
    c.sort_by_key(key);
    c.into_iter().map(|(o, f, _)| (o, f)).collect()
}

/// Why a code is suggested for a label, in words.
pub fn reason(view: &View<'_>, f: &Fit, near: &str, o: u32) -> String {
    let mut r = format!(
        "its description fits the label ({}% of the label's words)",
        (f.label * 100.0).round()
    );
    let code = view.code(o);
    // `near` is what the list holds: its first three bytes may split a character.
    if near.get(..3).is_some_and(|head| code.starts_with(head)) {
        r.push_str(", same category");
    }
    r
}

/// The label-mismatch message and suggestions, if the label does not fit
/// the code at `ord`. A search for better codes takes one of `searches_left`.
pub fn mismatch(
    view: &View<'_>,
    label: &str,
    ord: u32,
    period: &Period,
    searches_left: &mut usize,
) -> Option<(String, Vec<Suggestion>)> {
    // The common cases first, without weighing words: the label is the
    // description, or every one of its words is in it.
    let desc = view.description(ord);
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
    let given = search::fit(view, label, ord);
    if given.label >= FITS {
        return None;
    }
    let code = view.code(ord);
    let search = *searches_left > 0;
    *searches_left = searches_left.saturating_sub(1);
    let better: Vec<(u32, Fit)> = if search {
        candidates(view, label, &code, period, &[])
            .into_iter()
            .filter(|(o, f)| *o != ord && f.label > given.label)
            .collect()
    } else {
        Vec::new()
    };
    let best = better.first().map_or(0.0, |(_, f)| f.label);
    if given.label >= POOR && best < given.label + BETTER_BY && best < FITS {
        return None;
    }
    let shown = view.display(&code);
    let mut msg = format!(
        "the label \"{label}\" does not fit {shown}, whose description is \"{desc}\" ({}% of the label's words found in its wordings)",
        (given.label * 100.0).round()
    );
    if better.is_empty() {
        msg.push_str(if search {
            "; no code fits the label well, so none is suggested"
        } else {
            "; codes for the label were not searched (only the first labels of a long list are)"
        });
    } else {
        msg.push_str(&format!(
            "; it fits {} better",
            view.display(&view.code(better[0].0))
        ));
    }
    let sugg = better
        .iter()
        .take(SUGGESTED)
        .map(|(o, f)| crate::check::suggestion(view, *o, reason(view, f, &code, *o)))
        .collect();
    Some((msg, sugg))
}
