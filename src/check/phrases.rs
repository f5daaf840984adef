//! Small pieces the findings share: a suggestion of a code, the codes a
//! message names, counts in words, and the billable codes under a node.

use super::*;

pub(crate) fn suggestion(view: &View<'_>, ord: u32, reason: impl Into<String>) -> Suggestion {
    Suggestion {
        code: view.display(&view.code(ord)),
        description: view.description_or_note(ord),
        reason: reason.into(),
    }
}

/// Names codes for a message: `E11.9`, `E11.9 and E11.65`, `E11.9, E11.65 and 3 more`.
pub(crate) fn name_codes(view: &View<'_>, ords: &[u32]) -> String {
    let shown: Vec<String> = ords
        .iter()
        .take(3)
        .map(|&o| view.display(&view.code(o)))
        .collect();
    match (ords.len(), shown.as_slice()) {
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
