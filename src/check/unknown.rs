//! What was meant by a code that is not one: near codes (one or two edits,
//! swaps first), codes the label fits, every allowed 7th character, and the
//! other readings of a letter typed for a digit.

use super::*;

/// How a code offered for one that is no code differs from it.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) enum Edit {
    /// Two neighbouring characters swapped.
    Swap,
    /// One character different.
    One,
    /// Two characters different.
    Two,
}

/// A code one or two edits from one that is no code, as facts.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) struct NearBy {
    /// How it differs.
    pub edit: Edit,
    /// It starts with the same three characters (the same category).
    pub same_category: bool,
    /// It is billable on some day of the period.
    pub in_period: bool,
}

/// Why a code is offered for one that is no code, as facts;
/// [`Offered::reason`] writes the words.
#[derive(Clone, Debug, PartialEq)]
pub(crate) enum Offered {
    /// One or two edits away.
    Near(NearBy),
    /// Its description fits the line's label.
    Label(crate::check::labels::LabelFit),
    /// Both (the category said once, by the edit).
    Both(NearBy, crate::check::labels::LabelFit),
    /// A 7th character the tabular list allows at the code's node.
    Seventh,
    /// One character from what was written (a letter read as a digit or
    /// the reverse), the label fitting it clearly better than the code read.
    OtherReading {
        /// The cell as written.
        written: String,
    },
}

/// The codes offered for a code that is no code: codes one or two edits
/// away (see [`code::near`]), with the codes the label fits first.
pub(crate) struct NearSuggestions {
    /// Each code offered, with why, best first.
    pub(crate) offered: Vec<(u32, Offered)>,
    /// The first is there because the label fits it.
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
    let near = code::rank_near(view, c, code::near(view, c), period, NEAR_LIMIT);
    let near_ords: Vec<u32> = near.iter().map(|(o, _)| *o).collect();
    let mut near_why: Vec<(u32, NearBy)> = near
        .into_iter()
        .map(|(o, d)| {
            let edit = if code::is_swap(c, &view.code(o)) {
                Edit::Swap
            } else if d == 1 {
                Edit::One
            } else {
                Edit::Two
            };
            let near = NearBy {
                edit,
                same_category: view.code(o).starts_with(c.get(..3).unwrap_or(c)),
                in_period: view.billable_in(o, period),
            };
            (o, near)
        })
        .collect();
    // Codes the label fits come first; a near code among them keeps both reasons.
    let mut offered = Vec::new();
    for (o, fit) in label_candidates(view, label, c, period, &near_ords, memo) {
        match near_why.iter().position(|(n, _)| *n == o) {
            Some(i) => offered.push((o, Offered::Both(near_why.remove(i).1, fit))),
            None => offered.push((o, Offered::Label(fit))),
        }
    }
    let label_first = !offered.is_empty();
    offered.extend(near_why.into_iter().map(|(o, n)| (o, Offered::Near(n))));
    offered.truncate(NEAR_LIMIT);
    NearSuggestions {
        offered,
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
) -> Vec<(u32, Offered)> {
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
            let why = Offered::OtherReading {
                written: written.to_string(),
            };
            (o, why)
        })
        .collect()
}

/// Codes the label of an unknown or malformed entry points to, with how
/// well it fits each.
pub(crate) fn label_candidates(
    view: &View<'_>,
    label: Option<&str>,
    written: &str,
    period: &Period,
    extra: &[u32],
    memo: &mut Memo,
) -> Vec<(u32, crate::check::labels::LabelFit)> {
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
        .map(|(o, f)| (o, crate::check::labels::LabelFit::of(view, &f, written, o)))
        .collect()
}

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

/// The near codes offered for a code with a 7th character its node does
/// not allow, with every allowed one among them (those already offered
/// keep their place and reasons).
pub(crate) fn with_every_seventh(
    view: &View<'_>,
    code: &str,
    near: Vec<(u32, Offered)>,
) -> Vec<(u32, Offered)> {
    let seventh = seventh_codes(view, code);
    if seventh.is_empty() {
        return near;
    }
    let (mut out, rest): (Vec<_>, Vec<_>) =
        near.into_iter().partition(|(o, _)| seventh.contains(o));
    for &o in &seventh {
        if !out.iter().any(|(s, _)| *s == o) {
            out.push((o, Offered::Seventh));
        }
    }
    let room = NEAR_LIMIT.max(out.len());
    out.extend(rest);
    out.truncate(room);
    out
}

/// A 7th character the tabular list does not allow at a code's node, as
/// facts; [`SeventhNotAllowed::phrase`] writes the words.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct SeventhNotAllowed {
    /// The 7th character written.
    pub written: char,
    /// The node whose rule it is, shown.
    pub node: String,
    /// The characters the rule allows, with their meaning, in its order.
    pub allowed: Vec<(char, String)>,
}

/// When `code` has seven characters and its node's rule does not allow
/// its last: the rule's facts.
pub(crate) fn seventh_note(view: &View<'_>, code: &str) -> Option<SeventhNotAllowed> {
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
    Some(SeventhNotAllowed {
        written: ch,
        node: view.display(&view.code(ord)),
        allowed: rule.extensions.clone(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::check::testing::*;
    use crate::report::{Kind, Status};

    /// The codes offered for `c` on the ten codes, with no label.
    fn near_of(c: &str, from: &str, to: &str) -> Vec<(String, Offered)> {
        let index = index(ten());
        let view = index.view();
        let mut memo = Memo::default();
        near_suggestions(&view, c, None, &span(from, to), &mut memo)
            .offered
            .into_iter()
            .map(|(o, why)| (view.display(&view.code(o)), why))
            .collect()
    }

    /// I11 is one character from I10 (another three-character category)
    /// and in use.
    #[test]
    fn a_code_one_character_off_is_offered_the_real_one() {
        let got = near_of("I11", "2020-01-01", "2020-12-31");
        let near = NearBy {
            edit: Edit::One,
            same_category: false,
            in_period: true,
        };
        assert!(
            got.contains(&("I10".into(), Offered::Near(near))),
            "{got:?}"
        );
        // The whole check offers it too.
        let r = check_ten("I11\n", "2020-01-01", "2020-12-31");
        let e = &r.entries[0];
        assert_eq!(e.status, Status::Unknown);
        let f = e.findings.iter().find(|f| f.kind == Kind::Unknown).unwrap();
        assert!(f.suggestions.iter().any(|s| s.code == "I10"), "{f:?}");
    }

    /// E1191 has E11.9's last two characters swapped; U07.1 before its
    /// first day is offered as not billable in the period.
    #[test]
    fn a_swap_and_a_code_not_yet_in_use_are_told_apart() {
        let got = near_of("E191", "2020-01-01", "2020-12-31");
        let swap = NearBy {
            edit: Edit::Swap,
            same_category: false,
            in_period: true,
        };
        assert!(
            got.contains(&("E11.9".into(), Offered::Near(swap))),
            "{got:?}"
        );
        let got = near_of("U072", "2019-01-01", "2019-12-31");
        let later = NearBy {
            edit: Edit::One,
            same_category: true,
            in_period: false,
        };
        assert!(
            got.contains(&("U07.1".into(), Offered::Near(later))),
            "{got:?}"
        );
    }

    /// A code with no rule for a 7th character has nothing to say of one.
    #[test]
    fn no_seventh_character_rule_no_note() {
        let index = index(ten());
        assert_eq!(seventh_note(&index.view(), "E11659A"), None);
        assert!(seventh_codes(&index.view(), "E11659A").is_empty());
    }
}
