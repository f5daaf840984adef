//! Writes a [`Release`] as index bytes. Pure: bytes in memory, no files.
//!
//! Layout (all integers little-endian), documented for anyone writing a reader:
//! a 56-byte header (magic, format version, section count, total length,
//! SHA-256 of everything after the header), a directory of
//! `(tag, offset, length)` triples, then the sections, each 4-byte aligned.
//! A notes file ([`notes`]) is the same container with its own magic.

use super::bytes::Out;
use super::{FORMAT_VERSION, HEADER_LEN, MAGIC, NOTES_MAGIC, REC_BLOCK};
use crate::model::Release;
use crate::sha256;
use std::collections::HashMap;

/// Why a release could not be written.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum WriteError {
    /// Codes must be sorted, distinct, non-empty upper-case ASCII.
    OutOfOrder {
        /// The code before.
        previous: String,
        /// The code that is not after it.
        got: String,
    },
    /// A code has a character an index cannot hold.
    BadCode(String),
    /// A successor names a code that is not in the release.
    UnknownSuccessor {
        /// The retired code.
        code: String,
        /// The missing successor.
        successor: String,
    },
    /// The fst library refused the keys.
    Fst(String),
    /// A count or distance does not fit the format's field.
    TooLarge(String),
    /// A parent, alternate id or code to consider names no code, or the
    /// parent links form a cycle.
    Links(String),
    /// The notes were to name as their index bytes that are no index.
    NotAnIndex,
}

impl std::fmt::Display for WriteError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            WriteError::OutOfOrder { previous, got } => write!(
                f,
                "codes must be sorted and distinct: \"{got}\" comes after \"{previous}\""
            ),
            WriteError::BadCode(c) => write!(
                f,
                "\"{c}\" cannot be stored: codes are 1 to 32 characters of A-Z, 0-9, ':' or '-'"
            ),
            WriteError::UnknownSuccessor { code, successor } => write!(
                f,
                "{code} names successor {successor}, which is not a code of this release"
            ),
            WriteError::Fst(e) => write!(f, "building the code map failed: {e}"),
            WriteError::TooLarge(e) => write!(f, "the release does not fit the index format ({e})"),
            WriteError::Links(e) => write!(f, "{e}"),
            WriteError::NotAnIndex => write!(
                f,
                "a notes file names the index it belongs to: give the bytes of that index"
            ),
        }
    }
}

impl std::error::Error for WriteError {}

/// Descriptions are front-coded in blocks of this many records.
pub const DESC_BLOCK: usize = 16;

/// Serialises a release into index bytes (its notes go to a file of their
/// own: see [`notes`]).
pub fn write(release: &Release) -> Result<Vec<u8>, WriteError> {
    let codes = &release.codes;
    for pair in codes.windows(2) {
        if pair[0].code >= pair[1].code {
            return Err(WriteError::OutOfOrder {
                previous: pair[0].code.clone(),
                got: pair[1].code.clone(),
            });
        }
    }
    let ok_char = |b: u8| b.is_ascii_uppercase() || b.is_ascii_digit() || b == b':' || b == b'-';
    for c in codes {
        if c.code.is_empty() || c.code.len() > 32 || !c.code.bytes().all(ok_char) {
            return Err(WriteError::BadCode(c.code.clone()));
        }
    }
    let ordinal: HashMap<&str, u32> = codes
        .iter()
        .enumerate()
        .map(|(i, c)| (c.code.as_str(), i as u32))
        .collect();

    let mut sections: Vec<([u8; 4], Vec<u8>)> = Vec::new();

    // META
    let mut meta = Out::default();
    let m = &release.meta;
    meta.str(&m.vocabulary);
    meta.str(&m.title);
    meta.str(&m.release);
    meta.i32(m.coverage_from.days());
    meta.i32(m.coverage_to.days());
    meta.u8(m.dot_after);
    meta.varint(m.sources.len() as u32);
    for s in &m.sources {
        meta.str(&s.file);
        meta.str(&s.sha256);
        meta.str(&s.role);
    }
    meta.varint(m.shapes.len() as u32);
    for s in &m.shapes {
        meta.str(s);
    }
    // Optional trailing fields: files without dot rules (and notice) end here.
    if !m.dot_rules.is_empty() || !m.notice.is_empty() {
        meta.varint(m.dot_rules.len() as u32);
        for (c, n) in &m.dot_rules {
            meta.varint(*c as u32);
            meta.u8(*n);
        }
    }
    if !m.notice.is_empty() {
        meta.str(&m.notice);
    }
    sections.push((*b"META", meta.buf));

    // CFST: code -> ordinal
    let mut builder = fst::MapBuilder::memory();
    for (i, c) in codes.iter().enumerate() {
        builder
            .insert(c.code.as_bytes(), i as u64)
            .map_err(|e| WriteError::Fst(e.to_string()))?;
    }
    let fst_bytes = builder
        .into_inner()
        .map_err(|e| WriteError::Fst(e.to_string()))?;
    sections.push((*b"CFST", fst_bytes));

    // Columns by ordinal (the code itself is read back from the fst):
    // PARD parent distance, SUBT subtree size (both u16, or both u32 when a
    // distance or size needs it: the reader tells by the section's length),
    // CNTS counts per record,
    // SPBK/SCBK where each block of records starts in SPAN/SUCC, SPOF where
    // each record's spans start within its block (span lookups are hot).
    // A stated hierarchy goes in GRPH instead (see `extra`): no prefix links.
    let explicit = release.hierarchy == crate::model::Hierarchy::Explicit;
    let (parents, ends) = if explicit {
        (vec![u32::MAX; codes.len()], (1..=codes.len()).collect())
    } else {
        (
            parents(codes.iter().map(|c| c.code.as_str()), &ordinal),
            crate::model::subtree_ends(&codes.iter().map(|c| c.code.as_str()).collect::<Vec<_>>()),
        )
    };
    let mut pard = Out::default();
    let mut subt = Out::default();
    let mut cnts = Out::default();
    let mut spbk = Out::default();
    let mut spof = Out::default();
    let mut scbk = Out::default();
    let mut spans = Out::default();
    let mut succ = Out::default();
    let (mut n_spans, mut n_succ) = (0u32, 0u32);
    let too_many = |what: &str, c: &str| WriteError::TooLarge(format!("{c}: {what}"));
    let distance = |i: usize| {
        if parents[i] == u32::MAX {
            0
        } else {
            i as u32 - parents[i]
        }
    };
    let wide =
        (0..codes.len()).any(|i| distance(i) > u16::MAX as u32 || ends[i] - i > u16::MAX as usize);
    let column = |out: &mut Out, v: u32| {
        if wide {
            out.u32(v)
        } else {
            out.u16(v as u16)
        }
    };
    for (i, c) in codes.iter().enumerate() {
        if i % REC_BLOCK == 0 {
            spbk.u32(n_spans);
            scbk.u32(n_succ);
        }
        let block_start =
            u32::from_le_bytes(spbk.buf[spbk.buf.len() - 4..].try_into().unwrap_or([0; 4]));
        spof.u16(
            u16::try_from(n_spans - block_start)
                .map_err(|_| too_many("too many spans in a block", &c.code))?,
        );
        column(&mut pard, distance(i));
        column(
            &mut subt,
            u32::try_from(ends[i] - i).map_err(|_| too_many("subtree too large", &c.code))?,
        );
        let count = |n: usize, what| u8::try_from(n).map_err(|_| too_many(what, &c.code));
        cnts.u8(count(c.billable.len(), "too many billable spans")?);
        cnts.u8(count(c.header.len(), "too many header spans")?);
        cnts.u8(count(c.successors.len(), "too many successors")?);
        cnts.u8(match c.seventh {
            None => 0,
            Some(s) => u8::try_from(s + 1)
                .map_err(|_| too_many("too many 7th-character rules", &c.code))?,
        });
        for p in c.billable.iter().chain(&c.header) {
            spans.i32(p.from.days());
            spans.i32(p.to.days());
            n_spans += 1;
        }
        for s in &c.successors {
            let Some(&o) = ordinal.get(s.code.as_str()) else {
                return Err(WriteError::UnknownSuccessor {
                    code: c.code.clone(),
                    successor: s.code.clone(),
                });
            };
            succ.u32(o);
            succ.i32(s.effective.days());
            n_succ += 1;
        }
    }
    for (tag, out) in [
        (*b"PARD", pard),
        (*b"SUBT", subt),
        (*b"CNTS", cnts),
        (*b"SPBK", spbk),
        (*b"SPOF", spof),
        (*b"SCBK", scbk),
        (*b"SPAN", spans),
        (*b"SUCC", succ),
    ] {
        sections.push((tag, out.buf));
    }

    // DESC + DOFF: front-coded descriptions in blocks.
    let mut desc = Out::default();
    let mut doff = Out::default();
    let mut prev = "";
    for (i, c) in codes.iter().enumerate() {
        let d = c.description.as_str();
        if i % DESC_BLOCK == 0 {
            doff.u32(desc.buf.len() as u32);
            desc.str(d);
        } else {
            let shared = shared_prefix(prev, d);
            desc.varint(shared as u32);
            desc.str(&d[shared..]);
        }
        prev = d;
    }
    sections.push((*b"DOFF", doff.buf));
    sections.push((*b"DESC", desc.buf));

    // WFST + POST + WLEN: the word map.
    let (wfst, post, wlen) = word_map(release)?;
    sections.push((*b"WFST", wfst));
    sections.push((*b"POST", post));
    sections.push((*b"WLEN", wlen));

    // TREE: chapters, sections, 7th-character rules (small; decoded on open).
    let mut tree = Out::default();
    tree.varint(release.chapters.len() as u32);
    for ch in &release.chapters {
        tree.str(&ch.name);
        tree.str(&ch.title);
    }
    tree.varint(release.sections.len() as u32);
    for s in &release.sections {
        tree.str(&s.first);
        tree.str(&s.last);
        tree.str(&s.title);
        tree.u16(s.chapter);
    }
    tree.varint(release.seventh.len() as u32);
    for r in &release.seventh {
        tree.varint(r.extensions.len() as u32);
        for (ch, meaning) in &r.extensions {
            tree.varint(*ch as u32);
            tree.str(meaning);
        }
    }
    sections.push((*b"TREE", tree.buf));
    if !release.mappings.is_empty() {
        sections.push((
            *b"MAPS",
            super::maps::write(&release.mappings).map_err(WriteError::TooLarge)?,
        ));
    }
    sections.extend(super::extra::write(release, &ordinal).map_err(WriteError::Links)?);

    Ok(assemble(MAGIC, &sections))
}

/// The notes file of a release (`None` when it has no notes), naming the
/// index `index` (the bytes [`write`] gave for the same release) as the
/// one it belongs to: its `PAIR` section, then `NOTE`.
pub fn notes(release: &Release, index: &[u8]) -> Result<Option<Vec<u8>>, WriteError> {
    if release.notes.is_empty() {
        return Ok(None);
    }
    let ordinal: HashMap<&str, u32> = release
        .codes
        .iter()
        .enumerate()
        .map(|(i, c)| (c.code.as_str(), i as u32))
        .collect();
    let sum = index
        .get(24..HEADER_LEN)
        .filter(|_| index.starts_with(MAGIC))
        .ok_or(WriteError::NotAnIndex)?;
    let pair = super::notes::pair(&release.meta.vocabulary, &release.meta.release, sum);
    let note = super::notes::write(&release.notes, &ordinal).map_err(WriteError::Links)?;
    Ok(Some(assemble(
        NOTES_MAGIC,
        &[(*b"PAIR", pair), (*b"NOTE", note)],
    )))
}

/// The `WFST`, `POST` and `WLEN` sections, in that order.
type WordMap = (Vec<u8>, Vec<u8>, Vec<u8>);

/// The word map of a release: `WFST` maps each normalised word (see
/// [`crate::words`]) of the descriptions and other wordings to the offset of
/// its posting list in `POST`; a posting list is the number of codes, then
/// their ordinals as varint gaps (the first from zero). `WLEN` holds each
/// number of distinct words of each code's description, capped at 255 (for
/// BM25's length norm: a code with many other wordings is not a longer text).
fn word_map(release: &Release) -> Result<WordMap, WriteError> {
    let mut postings: std::collections::BTreeMap<String, Vec<u32>> = Default::default();
    let mut wlen = Vec::with_capacity(release.codes.len());
    for (i, c) in release.codes.iter().enumerate() {
        let mut w = crate::words::distinct(&c.description);
        wlen.push(w.len().min(255) as u8);
        for t in &c.terms {
            w.extend(crate::words::words(t));
        }
        w.sort();
        w.dedup();
        for word in w {
            postings.entry(word).or_default().push(i as u32);
        }
    }
    let mut post = Out::default();
    let mut builder = fst::MapBuilder::memory();
    for (word, ords) in &postings {
        builder
            .insert(word.as_bytes(), post.buf.len() as u64)
            .map_err(|e| WriteError::Fst(e.to_string()))?;
        post.varint(ords.len() as u32);
        let mut prev = 0;
        for &o in ords {
            post.varint(o - prev);
            prev = o;
        }
    }
    let wfst = builder
        .into_inner()
        .map_err(|e| WriteError::Fst(e.to_string()))?;
    Ok((wfst, post.buf, wlen))
}

fn assemble(magic: &[u8; 8], sections: &[([u8; 4], Vec<u8>)]) -> Vec<u8> {
    let dir_len = sections.len() * 12;
    let mut offset = HEADER_LEN + dir_len;
    let mut dir = Out::default();
    let mut body = Vec::new();
    for (tag, data) in sections {
        let pad = (4 - offset % 4) % 4;
        body.resize(body.len() + pad, 0);
        offset += pad;
        dir.buf.extend_from_slice(tag);
        dir.u32(offset as u32);
        dir.u32(data.len() as u32);
        body.extend_from_slice(data);
        offset += data.len();
    }
    let mut out = Vec::with_capacity(offset);
    out.extend_from_slice(magic);
    out.extend_from_slice(&FORMAT_VERSION.to_le_bytes());
    out.extend_from_slice(&(sections.len() as u32).to_le_bytes());
    out.extend_from_slice(&(offset as u64).to_le_bytes());
    out.extend_from_slice(&[0u8; 32]);
    out.extend_from_slice(&dir.buf);
    out.extend_from_slice(&body);
    let sum = sha256::digest(&out[HEADER_LEN..]);
    out[24..56].copy_from_slice(&sum);
    out
}

fn shared_prefix(a: &str, b: &str) -> usize {
    let mut n = 0;
    for ((i, ca), cb) in a.char_indices().zip(b.chars()) {
        if ca != cb || n > u16::MAX as usize {
            return i;
        }
        n = i + ca.len_utf8();
    }
    n
}

/// Parent of each code: the longest proper prefix that is itself a code.
fn parents<'a>(codes: impl Iterator<Item = &'a str>, ordinal: &HashMap<&str, u32>) -> Vec<u32> {
    codes
        .map(|c| {
            (1..c.len())
                .rev()
                .find_map(|n| c.get(..n).and_then(|p| ordinal.get(p).copied()))
                .unwrap_or(u32::MAX)
        })
        .collect()
}
