//! Optional sections for vocabularies that state their own hierarchy and
//! statuses (HPO, and the releases a site imports). Each is written only
//! when the release has something to put in it, so an ICD index is the same
//! bytes with or without this module.
//!
//! - `GRPH` (present for [`Hierarchy::Explicit`]): parents and children of
//!   each record as two adjacency tables. A table is a width byte (2 or 4),
//!   `n + 1` offsets and the ordinals, each of that width; the links of
//!   record `i` are `ords[off[i]..off[i + 1]]`, ascending.
//! - `CONS`: codes to consider in place of a retired one, one table as above.
//! - `STAT`: the release's own status words (a count, the words, then one
//!   byte per record: 0 for none, `k` for word `k - 1`).
//! - `ALTS`: an `fst` map from alternate id to the ordinal it stands for.
//! - `SYNS` (only for [`Hierarchy::Explicit`], when any record has one):
//!   each record's other wordings ([`CodeEntry::terms`]: HPO synonyms) as
//!   text, in the release's order, for the code card. A u32 per block of
//!   [`REC_BLOCK`] records gives where its first record starts in the text
//!   that follows; there each record is a varint count, then that many
//!   strings. A prefix hierarchy keeps its other wordings only as words (an
//!   ICD index stays the same bytes).
//!
//! [`Hierarchy::Explicit`]: crate::model::Hierarchy::Explicit
//! [`CodeEntry::terms`]: crate::model::CodeEntry::terms

use super::bytes::{u16_entry, u32_entry, In, Out};
use super::REC_BLOCK;
use crate::model::Release;
use std::collections::HashMap;

/// One adjacency table over the records, borrowed from the file: a width
/// byte (2 or 4), then `n + 1` offsets and the ordinals, each that wide
/// (2 when every offset and ordinal fits in 16 bits, as in HPO).
#[derive(Clone, Copy, Default)]
pub struct Links<'a> {
    off: &'a [u8],
    ords: &'a [u8],
    wide: bool,
}

/// The `i`-th number of a table of 2- or 4-byte numbers.
fn num(b: &[u8], i: usize, wide: bool) -> Option<u32> {
    if wide {
        u32_entry(b, i)
    } else {
        u16_entry(b, i).map(u32::from)
    }
}

impl<'a> Links<'a> {
    /// Splits a table of `n` records off the front of `b`; the rest follows.
    fn read(b: &'a [u8], n: usize, check: bool) -> Option<(Links<'a>, &'a [u8])> {
        let wide = match *b.first()? {
            2 => false,
            4 => true,
            _ => return None,
        };
        let w = if wide { 4 } else { 2 };
        let b = &b[1..];
        let off_len = n.checked_add(1)?.checked_mul(w)?;
        let off = b.get(..off_len)?;
        let total = num(off, n, wide)? as usize;
        let end = total.checked_mul(w)?.checked_add(off_len)?;
        let ords = b.get(off_len..end)?;
        let rest = &b[end..];
        let links = Links { off, ords, wide };
        if !check {
            return Some((links, rest));
        }
        let mut prev = 0;
        for i in 0..=n {
            let o = num(off, i, wide)?;
            if o < prev || o as usize > total {
                return None;
            }
            prev = o;
        }
        if (0..total).any(|i| num(ords, i, wide).is_none_or(|o| o as usize >= n)) {
            return None;
        }
        Some((links, rest))
    }

    /// The links of record `ord` (none for a record out of range).
    pub fn of(&self, ord: u32) -> impl Iterator<Item = u32> + 'a {
        let (i, wide) = (ord as usize, self.wide);
        let from = num(self.off, i, wide).unwrap_or(0) as usize;
        let to = i
            .checked_add(1)
            .and_then(|j| num(self.off, j, wide))
            .unwrap_or(0) as usize;
        let ords = self.ords;
        (from..to.max(from)).filter_map(move |k| num(ords, k, wide))
    }
}

fn write_links(out: &mut Out, lists: &[Vec<u32>]) {
    let total: usize = lists.iter().map(Vec::len).sum();
    let wide = total > u16::MAX as usize || lists.len() > u16::MAX as usize;
    out.u8(if wide { 4 } else { 2 });
    let put = |out: &mut Out, v: u32| {
        if wide {
            out.u32(v)
        } else {
            out.u16(v as u16)
        }
    };
    let mut at = 0u32;
    put(out, 0);
    for l in lists {
        at += l.len() as u32;
        put(out, at);
    }
    for l in lists {
        for &o in l {
            put(out, o);
        }
    }
}

/// What the optional sections hold, decoded on open.
#[derive(Clone, Copy, Default)]
pub struct Extra<'a> {
    /// Parents and children (present only for an explicit hierarchy).
    pub graph: Option<(Links<'a>, Links<'a>)>,
    /// Codes to consider for each record.
    pub consider: Links<'a>,
    /// The status words and one byte per record.
    pub status: Option<(&'a [u8], &'a [u8])>,
    /// Alternate ids.
    pub aliases: Option<&'a [u8]>,
    /// Other wordings: the block starts and the text.
    pub synonyms: Option<(&'a [u8], &'a [u8])>,
}

/// Why a code of a section named no record.
fn unknown(section: &str, code: &str, what: &str) -> String {
    format!("{code} names {what} that is not a code of this release ({section})")
}

/// Tagged section bytes, in file order.
pub type Sections = Vec<([u8; 4], Vec<u8>)>;

/// The optional sections of a release, as `(tag, bytes)`.
pub fn write(release: &Release, ordinal: &HashMap<&str, u32>) -> Result<Sections, String> {
    let codes = &release.codes;
    let ords_of = |list: &[String], code: &str, what: &str| -> Result<Vec<u32>, String> {
        let mut v = list
            .iter()
            .map(|c| {
                ordinal
                    .get(c.as_str())
                    .copied()
                    .ok_or_else(|| unknown(what, code, c))
            })
            .collect::<Result<Vec<u32>, String>>()?;
        v.sort_unstable();
        v.dedup();
        Ok(v)
    };
    let mut out = Vec::new();
    if release.hierarchy == crate::model::Hierarchy::Explicit {
        let mut parents = Vec::with_capacity(codes.len());
        let mut children = vec![Vec::new(); codes.len()];
        for (i, c) in codes.iter().enumerate() {
            let p = ords_of(&c.parents, &c.code, "a parent")?;
            for &q in &p {
                if q as usize == i {
                    return Err(format!("{} names itself as its parent", c.code));
                }
                children[q as usize].push(i as u32);
            }
            parents.push(p);
        }
        if let Some(c) = cycle(&parents) {
            return Err(format!(
                "the parent links go round in a circle through {}",
                codes[c as usize].code
            ));
        }
        let mut g = Out::default();
        write_links(&mut g, &parents);
        write_links(&mut g, &children);
        out.push((*b"GRPH", g.buf));
    }
    if codes.iter().any(|c| !c.consider.is_empty()) {
        let lists = codes
            .iter()
            .map(|c| ords_of(&c.consider, &c.code, "a code to consider"))
            .collect::<Result<Vec<_>, String>>()?;
        let mut o = Out::default();
        write_links(&mut o, &lists);
        out.push((*b"CONS", o.buf));
    }
    if codes.iter().any(|c| !c.status.is_empty()) {
        let mut words: Vec<&str> = codes
            .iter()
            .map(|c| c.status.as_str())
            .filter(|s| !s.is_empty())
            .collect();
        words.sort_unstable();
        words.dedup();
        if words.len() > 255 {
            return Err("more than 255 distinct status words".into());
        }
        let mut o = Out::default();
        o.varint(words.len() as u32);
        for w in &words {
            o.str(w);
        }
        for c in codes {
            let k = words
                .iter()
                .position(|w| *w == c.status)
                .map_or(0, |k| k + 1);
            o.u8(k as u8);
        }
        out.push((*b"STAT", o.buf));
    }
    if !release.aliases.is_empty() {
        let mut b = fst::MapBuilder::memory();
        for (alt, code) in &release.aliases {
            let &o = ordinal
                .get(code.as_str())
                .ok_or_else(|| unknown("alternate ids", alt, code))?;
            // A retired code may also be an alternate id (HPO keeps such
            // stanzas); one in use may not.
            if let Some(&a) = ordinal.get(alt.as_str()) {
                if !codes[a as usize].billable.is_empty() {
                    return Err(format!(
                        "{alt} is both a code in use and an alternate id of {code}"
                    ));
                }
            }
            b.insert(alt.as_bytes(), o as u64)
                .map_err(|e| format!("alternate ids: {e} (they must be sorted and distinct)"))?;
        }
        out.push((*b"ALTS", b.into_inner().map_err(|e| e.to_string())?));
    }
    if release.hierarchy == crate::model::Hierarchy::Explicit
        && codes.iter().any(|c| !c.terms.is_empty())
    {
        let mut text = Out::default();
        let mut blocks = Out::default();
        for (i, c) in codes.iter().enumerate() {
            if i % REC_BLOCK == 0 {
                let at = u32::try_from(text.buf.len())
                    .map_err(|_| "the other wordings pass 4 GiB".to_string())?;
                blocks.u32(at);
            }
            text.varint(c.terms.len() as u32);
            for t in &c.terms {
                text.str(t);
            }
        }
        blocks.buf.extend_from_slice(&text.buf);
        out.push((*b"SYNS", blocks.buf));
    }
    Ok(out)
}

/// A record on a cycle of parent links, if there is one.
fn cycle(parents: &[Vec<u32>]) -> Option<u32> {
    // 0 unvisited, 1 on the current path, 2 done.
    let mut state = vec![0u8; parents.len()];
    for start in 0..parents.len() {
        if state[start] != 0 {
            continue;
        }
        let mut stack: Vec<(u32, usize)> = vec![(start as u32, 0)];
        state[start] = 1;
        while let Some((n, k)) = stack.pop() {
            if let Some(&p) = parents[n as usize].get(k) {
                stack.push((n, k + 1));
                match state[p as usize] {
                    0 => {
                        state[p as usize] = 1;
                        stack.push((p, 0));
                    }
                    1 => return Some(p),
                    _ => {}
                }
            } else {
                state[n as usize] = 2;
            }
        }
    }
    None
}

/// Decodes the optional sections found in the directory (`Err` names a
/// damaged one). With `check`, every offset and ordinal is checked (done once,
/// when the index is opened); without, only the table sizes.
pub fn read<'a>(
    find: impl Fn(&[u8; 4]) -> Option<&'a [u8]>,
    n: usize,
    check: bool,
) -> Result<Extra<'a>, &'static str> {
    let mut extra = Extra::default();
    if let Some(b) = find(b"GRPH") {
        let (parents, rest) = Links::read(b, n, check).ok_or("parent links")?;
        let (children, _) = Links::read(rest, n, check).ok_or("child links")?;
        extra.graph = Some((parents, children));
    }
    if let Some(b) = find(b"CONS") {
        extra.consider = Links::read(b, n, check).ok_or("codes to consider")?.0;
    }
    if let Some(b) = find(b"STAT") {
        let mut r = In::new(b);
        let k = r.varint().ok_or("status words")?;
        for _ in 0..k {
            r.str().ok_or("status words")?;
        }
        let words = &b[..r.pos];
        let bytes = r.take(n).ok_or("status words")?;
        if bytes.iter().any(|&x| x as u32 > k) {
            return Err("status words");
        }
        extra.status = Some((words, bytes));
    }
    if let Some(b) = find(b"ALTS") {
        let m = fst::Map::new(b).map_err(|_| "alternate ids")?;
        if check && m.as_fst().verify().is_err() {
            return Err("alternate ids");
        }
        extra.aliases = Some(b);
    }
    if let Some(b) = find(b"SYNS") {
        let head = n
            .div_ceil(REC_BLOCK)
            .checked_mul(4)
            .filter(|&h| h <= b.len())
            .ok_or("other wordings")?;
        let (blocks, text) = b.split_at(head);
        if check {
            let mut prev = 0;
            for i in 0..head / 4 {
                let at = u32_entry(blocks, i).ok_or("other wordings")?;
                if at < prev || at as usize > text.len() {
                    return Err("other wordings");
                }
                prev = at;
            }
        }
        extra.synonyms = Some((blocks, text));
    }
    Ok(extra)
}

/// Skips one record's wordings in `r`; `None` when the text ends first.
fn skip_wordings(r: &mut In) -> Option<()> {
    let k = r.varint()?;
    for _ in 0..k {
        let len = r.varint()?;
        r.take(len as usize)?;
    }
    Some(())
}

/// The other wordings of record `ord`, in the release's order: none for a
/// record out of range or an index without them, and in a damaged section
/// those read before the damage.
pub fn synonyms_of(synonyms: Option<(&[u8], &[u8])>, ord: u32) -> Vec<String> {
    let mut out = Vec::new();
    let Some((blocks, text)) = synonyms else {
        return out;
    };
    let i = ord as usize;
    let Some(at) = u32_entry(blocks, i / REC_BLOCK) else {
        return out;
    };
    let mut r = In::new(text);
    r.pos = at as usize;
    for _ in 0..i % REC_BLOCK {
        if skip_wordings(&mut r).is_none() {
            return out;
        }
    }
    let Some(k) = r.varint() else {
        return out;
    };
    for _ in 0..k {
        match r.str() {
            Some(t) => out.push(t.to_string()),
            None => break,
        }
    }
    out
}

/// The status word of record `ord`, if the release gave one.
pub fn status_of<'a>(status: Option<(&'a [u8], &'a [u8])>, ord: u32) -> Option<&'a str> {
    let (words, bytes) = status?;
    let k = *bytes.get(ord as usize)?;
    if k == 0 {
        return None;
    }
    let mut r = In::new(words);
    r.varint()?;
    let mut w = None;
    for _ in 0..k {
        w = r.str();
    }
    w
}
