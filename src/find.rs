//! `find` for codes as well as words: a query that starts with a code or a
//! code start (`E11.6`, `E11.6-`, `E1`) lists that node and what lies under
//! it, and narrows the words after it (`E11.6 foot`) to that part of the
//! tree; other queries go to the word search ([`crate::search`]) unchanged.

use crate::code::{self, Resolved};
use crate::date::Date;
use crate::index::View;
use crate::model::{shape_of, Period};
use crate::search::{self, Found, SearchOptions};
use serde::Serialize;

/// What a query found.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Finds {
    /// The code or code start the query began with (dotted), if it was one.
    pub within: Option<String>,
    /// Whether `within` is one node (else the start of several codes).
    pub node: bool,
    /// Set when the query began with a code start that no code of the
    /// index has (dotted, as read): nothing was searched.
    pub no_code: Option<String>,
    /// The codes, best first: without words, the node and then what lies
    /// under it in code order (those in use on the day when there are any).
    pub results: Vec<Found>,
}

/// How a query begins.
enum Start {
    /// A code of the index and the words after it.
    Node(u32, String),
    /// The start of several codes (ordinals, ascending) and the words after.
    Codes(String, Vec<u32>, String),
    /// Written like a code of this index, but no code starts so.
    Nothing(String),
    /// Words only.
    Words,
}

/// Codes for `query` as of `day`, best first (see the module docs); the
/// last word is taken as a prefix when `typing`.
pub fn find(view: &View<'_>, query: &str, day: Date, limit: usize, typing: bool) -> Finds {
    let day = view.meta().search_day(day);
    let limit = limit.max(1);
    let words_only = || Finds {
        within: None,
        node: false,
        no_code: None,
        results: search::find(view, query, day, limit, typing),
    };
    let (within, node, set, rest) = match start(view, query) {
        Start::Words => return words_only(),
        Start::Nothing(code) => {
            return Finds {
                within: None,
                node: false,
                no_code: Some(code),
                results: Vec::new(),
            }
        }
        Start::Node(ord, rest) => {
            let mut set: Vec<u32> = std::iter::once(ord).chain(view.descendants(ord)).collect();
            set.sort_unstable();
            (view.display(&view.code(ord)), Some(ord), set, rest)
        }
        Start::Codes(start, set, rest) => (start, None, set, rest),
    };
    let results = if crate::words::words(&rest).is_empty() {
        listing(view, node, &set, day, limit)
    } else {
        let opts = SearchOptions {
            limit,
            prefix_last: typing,
            period: Some(Period::new(day, day)),
            near: None,
        };
        search::search_within(view, &rest, &opts, Some(&set))
            .into_iter()
            .map(|h| search::found(view, h.ord, day, h.fit.label))
            .collect()
    };
    Finds {
        within: Some(within),
        node: node.is_some(),
        no_code: None,
        results,
    }
}

/// The node first, then the rest of `set` in code order: those in use on
/// the day, or all when none is.
fn listing(view: &View<'_>, node: Option<u32>, set: &[u32], day: Date, limit: usize) -> Vec<Found> {
    let in_use = |o: u32| crate::card::in_force(view, o, day);
    let any = set.iter().any(|&o| in_use(o));
    node.into_iter()
        .chain(
            set.iter()
                .copied()
                .filter(|&o| Some(o) != node && (!any || in_use(o))),
        )
        .take(limit)
        .map(|o| search::found(view, o, day, 0.0))
        .collect()
}

/// Reads the query's first word as a code or code start, if it is one.
fn start(view: &View<'_>, query: &str) -> Start {
    let mut parts = query.trim().splitn(2, char::is_whitespace);
    let first = parts.next().unwrap_or("");
    let rest = parts.next().unwrap_or("").trim().to_string();
    // Every code of the bundled vocabularies has a digit; words seldom do.
    if !first.chars().any(|c| c.is_ascii_digit()) {
        return Start::Words;
    }
    let bare = first.trim_end_matches(['-', '*']).trim_end_matches('.');
    if let Resolved::Found { ord, .. } = code::resolve(view, bare) {
        return Start::Node(ord, rest);
    }
    let key: String = bare
        .chars()
        .filter(|&c| c != '.')
        .collect::<String>()
        .to_ascii_uppercase();
    let set = starting_with(view, &key);
    if !set.is_empty() {
        return Start::Codes(view.display(&key), set, rest);
    }
    // Written like the start of a code of this index: say that none fits.
    let shape = shape_of(&key);
    let like_a_code = key.len() >= 2
        && key.chars().all(|c| c.is_ascii_alphanumeric() || c == ':')
        && view.meta().shapes.iter().any(|s| s.starts_with(&shape));
    if like_a_code {
        Start::Nothing(view.display(&key))
    } else {
        Start::Words
    }
}

/// Ordinals of the codes that start with `key`, ascending.
fn starting_with(view: &View<'_>, key: &str) -> Vec<u32> {
    use fst::automaton::{Automaton, Str};
    use fst::{IntoStreamer, Streamer};
    if key.is_empty() {
        return Vec::new();
    }
    let mut out = Vec::new();
    let mut s = view.map().search(Str::new(key).starts_with()).into_stream();
    while let Some((k, o)) = s.next() {
        view.note_code(o as u32, std::str::from_utf8(k).unwrap_or_default());
        out.push(o as u32);
    }
    out
}
