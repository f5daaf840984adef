//! Reading one code as written: normalising case, spaces and dots, the
//! letters O and I typed for 0 and 1 (and the reverse), checking the shape
//! against the shapes the release data has, and finding near codes.

use crate::index::View;
use crate::model::{shape_of, Period};
use std::collections::BTreeSet;

/// What a code cell turned out to be.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Resolved {
    /// A code of the index (by ordinal), with what had to change to find it.
    Found {
        /// Ordinal in the index.
        ord: u32,
        /// Changes made to the written form, in words (empty when written officially).
        changes: Vec<&'static str>,
    },
    /// Well formed, but no release has it.
    Unknown {
        /// The code undotted, upper case.
        code: String,
    },
    /// Cannot be a code of this vocabulary; the reason is a sentence.
    Malformed {
        /// Why, and what would fit.
        reason: String,
    },
}

/// Reads a code cell. Never fails: every outcome is a [`Resolved`].
pub fn resolve(view: &View<'_>, cell: &str) -> Resolved {
    let written = cell.trim();
    if view.is_graph() {
        return resolve_stated(view, written);
    }
    let title = &view.meta().title;
    if let Some(bad) = written
        .chars()
        .find(|c| !(c.is_ascii_alphanumeric() || *c == '.' || c.is_whitespace()))
    {
        return Resolved::Malformed {
            reason: format!(
                "\"{written}\" contains \"{bad}\", which no {title} code has; {}",
                shape_hint(view)
            ),
        };
    }
    // One pass: the undotted upper-case code, and what differed from it.
    let mut code = String::with_capacity(written.len());
    let (mut spaces, mut lower, mut dots, mut dot_at) = (false, false, 0usize, None);
    for c in written.chars() {
        if c.is_whitespace() {
            spaces = true;
        } else if c == '.' {
            dots += 1;
            dot_at.get_or_insert(code.len());
        } else {
            lower |= c.is_ascii_lowercase();
            code.push(c.to_ascii_uppercase());
        }
    }
    let mut changes = Vec::new();
    if spaces {
        changes.push("spaces removed");
    }
    if lower {
        changes.push("upper case");
    }
    if code.is_empty() {
        return Resolved::Malformed {
            reason: format!(
                "\"{written}\" has no letters or digits; {}",
                shape_hint(view)
            ),
        };
    }
    let found = |code: &str, mut changes: Vec<&'static str>| {
        let ord = view.ordinal(code)?;
        view.note_code(ord, code);
        let dot_after = view.meta().dot_for(code);
        let dotted = dot_after > 0 && code.len() > dot_after;
        match (dots, dotted) {
            (2.., _) => changes.push("extra dots removed"),
            (0, true) => changes.push("dot added"),
            (1, true) if dot_at != Some(dot_after) => changes.push("dot moved"),
            (1, false) => changes.push("dot removed"),
            _ => {}
        }
        Some(Resolved::Found { ord, changes })
    };
    if let Some(r) = found(&code, changes.clone()) {
        return r;
    }
    if let Some((alt, what)) = letter_digit_swaps(view, &code) {
        let mut c = changes.clone();
        c.extend(what);
        if let Some(r) = found(&alt, c) {
            return r;
        }
    }
    if view.meta().shapes.contains(&shape_of(&code)) {
        Resolved::Unknown { code }
    } else {
        Resolved::Malformed {
            reason: format!(
                "\"{written}\" does not have the shape of any {title} code; {}",
                shape_hint(view)
            ),
        }
    }
}

/// [`resolve`] for a vocabulary that states its own hierarchy (HPO, and the
/// releases a site imports): codes are matched as written, then upper case,
/// then in the official form of the system's shape (`HP_0001250` is
/// `HP:0001250`); an alternate id is read as the code it stands for.
fn resolve_stated(view: &View<'_>, written: &str) -> Resolved {
    let title = &view.meta().title;
    if written.is_empty() {
        return Resolved::Malformed {
            reason: format!(
                "the code cell is empty; write {} {title} code",
                crate::report::article(title)
            ),
        };
    }
    let lookup = |code: &str, change: Option<&'static str>| {
        let mut changes: Vec<&'static str> = change.into_iter().collect();
        let ord = match view.ordinal(code) {
            Some(o) => {
                view.note_code(o, code);
                o
            }
            None => {
                let o = view.alias(code)?;
                changes.push("an alternate id, read as the code it stands for");
                o
            }
        };
        Some(Resolved::Found { ord, changes })
    };
    if let Some(r) = lookup(written, None) {
        return r;
    }
    let upper: String = written
        .chars()
        .filter(|c| !c.is_whitespace())
        .collect::<String>()
        .to_ascii_uppercase();
    if upper != written {
        let what = if upper.len() == written.len() {
            "upper case"
        } else {
            "spaces removed"
        };
        if let Some(r) = lookup(&upper, Some(what)) {
            return r;
        }
    }
    let system = crate::systems::System::parse(&view.meta().vocabulary);
    let code = match system.map(|s| crate::systems::shape(s, written)) {
        Some(crate::systems::Shape::Fits { code, .. }) => {
            if code != upper {
                if let Some(r) = lookup(&code, Some("written in the official form")) {
                    return r;
                }
            }
            code
        }
        Some(crate::systems::Shape::Fails { reason }) => {
            return Resolved::Malformed {
                reason: format!(
                    "\"{written}\" is not {} {title} code: {reason}",
                    crate::report::article(title)
                ),
            }
        }
        _ => upper,
    };
    Resolved::Unknown { code }
}

/// A sentence describing the shapes the data has (lengths, first character).
pub fn shape_hint(view: &View<'_>) -> String {
    let shapes = &view.meta().shapes;
    let min = shapes.iter().map(String::len).min().unwrap_or(0);
    let max = shapes.iter().map(String::len).max().unwrap_or(0);
    let letter_first = shapes.iter().all(|s| s.starts_with('A'));
    let digit_third = shapes.iter().all(|s| s.as_bytes().get(2) == Some(&b'9'));
    format!(
        "{} codes have {min} to {max} letters or digits{}{}{}",
        view.meta().title,
        if letter_first {
            ", starting with a letter"
        } else {
            ""
        },
        if digit_third {
            " and a digit in the third place"
        } else {
            ""
        },
        match view.meta().dot_after {
            0 => ", with no dot".to_string(),
            3 => ", with a dot after the third (E11.9)".to_string(),
            n => format!(", with a dot after character {n}"),
        }
    )
}

/// The letter O typed for zero and I for one (or, in the first place where
/// a letter belongs, 0 for O and 1 for I): the first substitution that yields
/// a real code, preferring the fewest changes.
fn letter_digit_swaps(view: &View<'_>, code: &str) -> Option<(String, Vec<&'static str>)> {
    let b = code.as_bytes();
    let spots: Vec<usize> = (0..b.len())
        .filter(|&i| match (i, b[i]) {
            (0, b'0' | b'1') => true,
            (0, _) => false,
            (_, b'O' | b'I') => true,
            _ => false,
        })
        .take(8)
        .collect();
    if spots.is_empty() {
        return None;
    }
    let mut masks: Vec<u32> = (1..1u32 << spots.len()).collect();
    masks.sort_by_key(|m| m.count_ones());
    for m in masks {
        let mut alt = b.to_vec();
        let mut what = BTreeSet::new();
        for (k, &i) in spots.iter().enumerate() {
            if m & (1 << k) != 0 {
                let (to, why) = match alt[i] {
                    b'O' => (b'0', "letter O read as zero"),
                    b'I' => (b'1', "letter I read as one"),
                    b'0' => (b'O', "zero read as letter O"),
                    _ => (b'I', "one read as letter I"),
                };
                alt[i] = to;
                what.insert(why);
            }
        }
        let alt = String::from_utf8(alt).ok()?;
        if view.ordinal(&alt).is_some() {
            return Some((alt, what.into_iter().collect()));
        }
    }
    None
}

const ALPHABET: &[u8] = b"0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ";

/// Codes one edit away (a character changed, dropped, added, or two
/// neighbours swapped), then, if there are none, two edits away.
/// Returns `(ordinal, distance)`.
pub fn near(view: &View<'_>, code: &str) -> Vec<(u32, u8)> {
    let b = code.as_bytes();
    let mut seen = BTreeSet::new();
    let probe = |cand: &[u8], seen: &mut BTreeSet<u32>| {
        if let Ok(s) = std::str::from_utf8(cand) {
            if let Some(o) = view.ordinal(s) {
                seen.insert(o);
            }
        }
    };
    let mut buf = Vec::with_capacity(b.len() + 1);
    for i in 0..b.len() {
        for &c in ALPHABET {
            if c != b[i] {
                buf.clear();
                buf.extend_from_slice(b);
                buf[i] = c;
                probe(&buf, &mut seen);
            }
        }
        buf.clear();
        buf.extend_from_slice(&b[..i]);
        buf.extend_from_slice(&b[i + 1..]);
        probe(&buf, &mut seen);
        if i + 1 < b.len() && b[i] != b[i + 1] {
            buf.clear();
            buf.extend_from_slice(b);
            buf.swap(i, i + 1);
            probe(&buf, &mut seen);
        }
    }
    for i in 0..=b.len() {
        for &c in ALPHABET {
            buf.clear();
            buf.extend_from_slice(&b[..i]);
            buf.push(c);
            buf.extend_from_slice(&b[i..]);
            probe(&buf, &mut seen);
        }
    }
    if !seen.is_empty() {
        return seen.into_iter().map(|o| (o, 1)).collect();
    }
    use fst::{IntoStreamer, Streamer};
    let Ok(lev) = fst::automaton::Levenshtein::new(code, 2) else {
        return Vec::new();
    };
    let mut stream = view.map().search(&lev).into_stream();
    let mut out = Vec::new();
    while let Some((_, o)) = stream.next() {
        out.push((o as u32, 2));
        if out.len() > 400 {
            break;
        }
    }
    out
}

/// Whether `b` is `a` with two neighbouring characters swapped (the most
/// common typing slip, so such codes are offered first).
pub fn is_swap(a: &str, b: &str) -> bool {
    let (a, b) = (a.as_bytes(), b.as_bytes());
    if a.len() != b.len() {
        return false;
    }
    let diff: Vec<usize> = (0..a.len()).filter(|&i| a[i] != b[i]).collect();
    matches!(diff[..], [i, j] if j == i + 1 && a[i] == b[j] && a[j] == b[i])
}

/// Ranks near codes for a suggestion list: same category first, then codes
/// billable in the period, then fewer edits (a swap of neighbours first),
/// then code order.
pub fn rank_near(
    view: &View<'_>,
    code: &str,
    near: Vec<(u32, u8)>,
    period: &Period,
    limit: usize,
) -> Vec<(u32, u8)> {
    let cat = code.get(..3).unwrap_or(code);
    let mut v: Vec<_> = near
        .into_iter()
        .map(|(o, d)| {
            let c = view.code(o);
            let same = c.starts_with(cat);
            let live = view.billable_in(o, period);
            ((!same, !live, d, !is_swap(code, &c), o), (o, d))
        })
        .collect();
    v.sort();
    v.into_iter().take(limit).map(|(_, x)| x).collect()
}
