//! What was meant by a code that is not one: near codes (one or two edits,
//! swaps first), codes the label fits, every allowed 7th character, and the
//! other readings of a letter typed for a digit.

use super::*;

/// The suggestions for a code that is no code: codes one or two edits
/// away (see [`code::near`]), with the codes the label fits first.
pub(crate) struct NearSuggestions {
    pub(crate) suggestions: Vec<Suggestion>,
    /// The first suggestion is there because the label fits it.
    pub(crate) label_first: bool,
    /// Some code is within two edits.
    pub(crate) any_near: bool,
}

/// How many near codes a finding offers.
pub(crate) const NEAR_LIMIT: usize = 12;

pub(crate) fn near_suggestions(
    view: &View<'_>,
    c: &str,
    label: Option<&str>,
    period: &Period,
    memo: &mut Memo,
) -> NearSuggestions {
    let mut sugg = Vec::new();
    let near = code::rank_near(view, c, code::near(view, c), period, NEAR_LIMIT);
    let near_ords: Vec<u32> = near.iter().map(|(o, _)| *o).collect();
    let mut near_why: Vec<(u32, String)> = Vec::new();
    for (o, d) in near {
        let same = view.code(o).starts_with(c.get(..3).unwrap_or(c));
        let live = view.billable_in(o, period);
        let mut why = if code::is_swap(c, &view.code(o)) {
            "two neighbouring characters swapped"
        } else if d == 1 {
            "one character different"
        } else {
            "two characters different"
        }
        .to_string();
        if same {
            why.push_str(", same category");
        }
        if !live {
            why.push_str(", but not billable in the period");
        }
        near_why.push((o, why));
    }
    // Codes the label fits come first; a near code among them keeps both reasons.
    for (o, why) in label_candidates(view, label, c, period, &near_ords, memo) {
        match near_why.iter().position(|(n, _)| *n == o) {
            Some(i) => {
                let (_, near) = near_why.remove(i);
                let why = why.replace(", same category", "");
                sugg.push(suggestion(view, o, format!("{near}; {why}")));
            }
            None => sugg.push(suggestion(view, o, why)),
        }
    }
    let label_first = !sugg.is_empty();
    for (o, why) in near_why {
        sugg.push(suggestion(view, o, why));
    }
    sugg.truncate(NEAR_LIMIT);
    NearSuggestions {
        suggestions: sugg,
        label_first,
        any_near: !near_ords.is_empty(),
    }
}

/// When a letter was read as a digit or a digit as a letter (`I1O` as
/// I10), the other codes one character from what was written, in use in
/// the period, whose description the line's label fits clearly better than
/// the code read (`I1O` labelled "hypertensive heart disease": I11.9).
pub(crate) fn other_readings(
    view: &View<'_>,
    written: &str,
    read: u32,
    label: &str,
    period: &Period,
) -> Vec<Suggestion> {
    let typed: String = written
        .chars()
        .filter(|c| c.is_ascii_alphanumeric())
        .collect::<String>()
        .to_ascii_uppercase();
    let own = crate::search::fit(view, label, read).label;
    let mut better: Vec<(f32, u32)> = code::near(view, &typed)
        .into_iter()
        .filter(|&(o, d)| d == 1 && o != read)
        .flat_map(|(o, _)| {
            // A header one edit away stands for its billable codes.
            let under: Vec<u32> = if view.billable_in(o, period) {
                vec![o]
            } else {
                billable_under(view, o, period)
            };
            under.into_iter().take(NAMED_LIMIT)
        })
        .map(|o| (crate::search::fit(view, label, o).label, o))
        .filter(|&(f, _)| f >= 0.75 && f >= own + 0.25)
        .collect();
    better.sort_by(|a, b| b.0.total_cmp(&a.0).then(a.1.cmp(&b.1)));
    better.dedup_by_key(|b| b.1);
    better
        .into_iter()
        .take(3)
        .map(|(_, o)| {
            suggestion(
                view,
                o,
                format!("one character from \"{written}\"; the label fits it better"),
            )
        })
        .collect()
}

/// Codes the label of an unknown or malformed entry points to, with why.
pub(crate) fn label_candidates(
    view: &View<'_>,
    label: Option<&str>,
    written: &str,
    period: &Period,
    extra: &[u32],
    memo: &mut Memo,
) -> Vec<(u32, String)> {
    let Some(label) = label else {
        return Vec::new();
    };
    if memo.label_searches == 0 || crate::words::words(label).is_empty() {
        return Vec::new();
    }
    memo.label_searches -= 1;
    crate::check::labels::candidates(view, label, written, period, extra)
        .into_iter()
        .take(crate::check::labels::SUGGESTED)
        .map(|(o, f)| (o, crate::check::labels::reason(view, &f, written, o)))
        .collect()
}

/// Why an unknown code with a 7th character does not exist, when a rule says so.
/// Every code the tabular list allows at the node of a code whose 7th
/// character it does not allow, in the order of its rule.
pub(crate) fn seventh_codes(view: &View<'_>, code: &str) -> Vec<u32> {
    if code.len() != 7 || seventh_note(view, code).is_none() {
        return Vec::new();
    }
    let base = &code[..6];
    let stem = base.trim_end_matches('X');
    let Some(rule) = view
        .ordinal(base)
        .or_else(|| view.ordinal(stem))
        .and_then(|o| view.seventh_rule(o))
    else {
        return Vec::new();
    };
    rule.extensions
        .iter()
        .filter_map(|(c, _)| view.ordinal(&format!("{base}{c}")))
        .collect()
}

/// The near suggestions of a code with a 7th character its node does not
/// allow, with every allowed one among them (those already offered keep
/// their place and reasons).
pub(crate) fn with_every_seventh(
    view: &View<'_>,
    code: &str,
    near: Vec<Suggestion>,
) -> Vec<Suggestion> {
    let seventh = seventh_codes(view, code);
    if seventh.is_empty() {
        return near;
    }
    let shown: Vec<String> = seventh
        .iter()
        .map(|&o| view.display(&view.code(o)))
        .collect();
    let (mut out, rest): (Vec<Suggestion>, Vec<Suggestion>) =
        near.into_iter().partition(|s| shown.contains(&s.code));
    for (&o, c) in seventh.iter().zip(&shown) {
        if !out.iter().any(|s| &s.code == c) {
            out.push(suggestion(
                view,
                o,
                "a 7th character the tabular list allows here",
            ));
        }
    }
    let room = NEAR_LIMIT.max(out.len());
    out.extend(rest);
    out.truncate(room);
    out
}

pub(crate) fn seventh_note(view: &View<'_>, code: &str) -> Option<String> {
    if code.len() != 7 {
        return None;
    }
    let base = code.get(..6)?;
    let stem = base.trim_end_matches('X');
    let ord = view.ordinal(base).or_else(|| view.ordinal(stem))?;
    let rule = view.seventh_rule(ord)?;
    let ch = code.chars().last()?;
    if rule.extensions.iter().any(|(c, _)| *c == ch) {
        return None;
    }
    let allowed: Vec<String> = rule
        .extensions
        .iter()
        .map(|(c, m)| format!("{c} ({m})"))
        .collect();
    Some(format!(
        "the 7th character {ch} is not one the tabular list allows under {}: {}",
        view.display(&view.code(ord)),
        allowed.join(", ")
    ))
}

#[cfg(test)]
mod tests {
    use crate::check::testing::*;
    use crate::report::{Kind, Status};

    /// A code one character from a real one is unknown, with the real one
    /// offered.
    #[test]
    fn a_code_one_character_off_is_offered_the_real_one() {
        let r = check_ten("I11\n", "2020-01-01", "2020-12-31");
        let e = &r.entries[0];
        assert_eq!(e.status, Status::Unknown);
        let f = e.findings.iter().find(|f| f.kind == Kind::Unknown).unwrap();
        assert!(f.suggestions.iter().any(|s| s.code == "I10"), "{f:?}");
    }
}
