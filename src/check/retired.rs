//! What replaces a code no longer in use: its successors, the codes under it,
//! or the nearest codes in use; an obsolete term of a stated hierarchy.

use super::*;

/// Where an index's successors come from, in words: the CMS conversion table
/// for ICD-10-CM, the release's own replacement links otherwise.
pub(crate) fn successor_source(view: &View<'_>) -> &'static str {
    if view.is_graph() {
        "the release's replacement"
    } else {
        "conversion table"
    }
}

/// What to offer for a retired code with no successor and nothing in use
/// under it: the nearest node above it with codes in use, where such nodes
/// are codes ([`System::nodes_are_codes`]); elsewhere (ICD-10-PCS, whose
/// nodes are table positions) the codes in use under that node that share
/// the most leading characters with the retired one, so every suggestion
/// is a real code.
pub(crate) fn nearest_in_use(
    view: &View<'_>,
    code: &str,
    ord: u32,
    period: &Period,
) -> Vec<Suggestion> {
    let Some((a, under)) = view.ancestors(ord).find_map(|a| {
        let under = billable_under(view, a, period);
        (!under.is_empty()).then_some((a, under))
    }) else {
        return Vec::new();
    };
    let nodes_are_codes =
        System::parse(&view.meta().vocabulary).is_none_or(|s| s.nodes_are_codes());
    if nodes_are_codes {
        return vec![suggestion(
            view,
            a,
            "the nearest code above it still in use; review its codes",
        )];
    }
    let shared = |o: u32| {
        view.code(o)
            .bytes()
            .zip(code.bytes())
            .take_while(|(x, y)| x == y)
            .count()
    };
    let scored: Vec<(u32, usize)> = under.into_iter().map(|o| (o, shared(o))).collect();
    let most = scored.iter().map(|&(_, n)| n).max().unwrap_or(0);
    let node = view.display(&view.code(a));
    scored
        .into_iter()
        .filter(|&(_, n)| n == most)
        .take(NAMED_LIMIT)
        .map(|(o, _)| {
            suggestion(
                view,
                o,
                format!(
                    "a code in use under {node} with the first {most} characters of the retired code; review"
                ),
            )
        })
        .collect()
}

/// A code the release keeps only as retired (obsolete), with its successors
/// (HPO `replaced_by`) and the codes it suggests to consider.
pub(crate) fn obsolete(view: &View<'_>, ctx: &ListContext, ord: u32, shown: &str, e: &mut Entry) {
    e.status = Status::Retired;
    let meta = view.meta();
    let replaced: Vec<u32> = view.successors(ord).map(|(s, _)| s).collect();
    // Also an alternate id of a term in use (HPO): that term too.
    let alias_of = view
        .alias(&view.code(ord))
        .filter(|a| !replaced.contains(a));
    let consider: Vec<u32> = view
        .consider(ord)
        .filter(|c| !replaced.contains(c) && Some(*c) != alias_of)
        .collect();
    let considered_alias = alias_of.is_some_and(|a| view.consider(ord).any(|c| c == a));
    let mut sugg: Vec<Suggestion> = replaced
        .iter()
        .map(|&s| suggestion(view, s, "its replacement, named by the release"))
        .collect();
    if let Some(a) = alias_of {
        sugg.push(suggestion(
            view,
            a,
            if considered_alias {
                "the release gives it as an alternate id of this term and suggests considering it"
            } else {
                "the release also gives it as an alternate id of this term"
            },
        ));
    }
    sugg.extend(consider.iter().map(|&c| {
        suggestion(
            view,
            c,
            "the release suggests considering it; review whether it fits",
        )
    }));
    let names = |ords: &[u32]| name_codes(view, ords);
    let mut msg = format!(
        "{shown} is obsolete in {} release {}",
        meta.title, meta.release
    );
    if !replaced.is_empty() {
        msg.push_str(&format!("; it was replaced by {}", names(&replaced)));
        let have = replaced
            .iter()
            .filter(|s| ctx.listed.contains_key(s))
            .count();
        if have > 0 {
            msg.push_str(&format!(" ({})", in_list(have, replaced.len())));
        }
    }
    if let Some(a) = alias_of {
        msg.push_str(&format!(
            "; the release also gives it as an alternate id of {}{}",
            names(&[a]),
            if considered_alias {
                " and suggests considering that term"
            } else {
                ""
            }
        ));
        if ctx.listed.contains_key(&a) {
            msg.push_str(" (in the list)");
        }
    }
    if !consider.is_empty() {
        msg.push_str(&format!(
            "; the release suggests considering {}",
            names(&consider)
        ));
    }
    if sugg.is_empty() {
        msg.push_str("; the release names no replacement");
    }
    sugg.truncate(NAMED_LIMIT);
    e.findings
        .push(Finding::new(Kind::Retired, Severity::Error, msg, sugg));
}
