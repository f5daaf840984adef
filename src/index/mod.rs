//! Index files: a cheap, zero-copy [`Index::open`] over bytes, an explicit
//! [`Index::verify`] of the checksum, and a [`View`] with the lookups the
//! checker needs (code to ordinal through an `fst` map, side tables by ordinal).
//! The tabular list's notes are a file of their own in the same container
//! ([`NotesFile`]), added to the index it was written for with
//! [`Index::add_notes`]: only the code card needs them.

mod bytes;
mod dates;
mod error;
mod extra;
mod hierarchy;
mod maps;
mod notes;
mod open;
mod view;
mod words;
pub mod write;

pub use error::IndexError;
pub use hierarchy::{Ancestors, Descendants};
pub use maps::MapView;
pub use notes::NotesFile;
use open::*;
pub use words::Posting;

use crate::date::Date;
use crate::model::{
    Chapter, CodeEntry, Hierarchy, Mapping, Meta, Note, NoteKind, NoteOwner, Period, Release,
    Section, SeventhRule, Source, Successor,
};
use crate::sha256;
use bytes::{u16_entry, u32_at, u32_entry, In};
use std::fmt;

/// First bytes of every index file.
pub const MAGIC: &[u8; 8] = b"RCALLIX\x1a";
/// First bytes of a notes file (same container, other contents).
pub const NOTES_MAGIC: &[u8; 8] = b"RCALLNT\x1a";
/// The index format this build reads and writes.
pub const FORMAT_VERSION: u32 = 2;
pub(crate) const HEADER_LEN: usize = 56;

/// Where the content the header's checksum covers starts: every byte of the
/// file from here on (see [`Index::verify_digest`]).
pub const CONTENT_START: usize = HEADER_LEN;
/// Records per block of the span and successor offset tables.
pub(crate) const REC_BLOCK: usize = 64;

type Range = (usize, usize);

struct Layout {
    fst: Range,
    pard: Range,
    subt: Range,
    /// PARD and SUBT hold u32s (else u16s).
    wide: bool,
    cnts: Range,
    spbk: Range,
    spof: Range,
    scbk: Range,
    span: Range,
    succ: Range,
    doff: Range,
    desc: Range,
    wfst: Range,
    post: Range,
    wlen: Range,
    len: usize,
}

/// Chapters, sections and 7th-character rules, decoded on open (they are small).
struct Tree {
    chapters: Vec<Chapter>,
    sections: Vec<Section>,
    seventh: Vec<SeventhRule>,
}

/// An opened index over bytes the caller owns (`Vec<u8>`, `&[u8]`, a static).
///
/// ```no_run
/// let bytes = std::fs::read("vocab/icd10cm.rcx").unwrap();
/// let index = rollcall::Index::open(bytes).unwrap();
/// index.verify().unwrap();
/// let view = index.view();
/// let e119 = view.ordinal("E119").unwrap();
/// assert_eq!(view.display(&view.code(e119)), "E11.9");
/// ```
pub struct Index<D> {
    data: D,
    layout: Layout,
    meta: Meta,
    tree: Tree,
    /// Where the MAPS section is, if there is one.
    maps: Option<(usize, usize)>,
    /// Where the optional sections of [`extra`] are.
    extras: Vec<([u8; 4], (usize, usize))>,
    /// The tabular list's notes, once a notes file is added.
    notes: Option<NotesFile<D>>,
}

impl<D: AsRef<[u8]>> Index<D> {
    /// Checks the header, directory and code map, and decodes the small
    /// tables. No copy of the large tables; the checksum is left to [`verify`](Self::verify).
    pub fn open(data: D) -> Result<Index<D>, IndexError> {
        let bytes = data.as_ref();
        if bytes.starts_with(NOTES_MAGIC) {
            return Err(IndexError::NotesNotIndex);
        }
        let find = container(bytes, MAGIC).ok_or(IndexError::NotAnIndex)??;
        let sec = |tag: &[u8; 4], what: &'static str| {
            find.get(&tag[..]).copied().ok_or(IndexError::Corrupt(what))
        };
        let meta_at = sec(b"META", "header facts missing")?;
        let meta = read_meta(&bytes[meta_at.0..meta_at.0 + meta_at.1])
            .ok_or(IndexError::Corrupt("header facts"))?;
        // Mappings are optional; a damaged section is refused here.
        let maps = find.get(&b"MAPS"[..]).copied();
        if let Some((o, n)) = maps {
            maps::read(&bytes[o..o + n], true).ok_or(IndexError::Corrupt("mappings"))?;
        }
        let tree_at = sec(b"TREE", "chapters missing")?;
        let tree = read_tree(&bytes[tree_at.0..tree_at.0 + tree_at.1])
            .ok_or(IndexError::Corrupt("chapters"))?;
        let fst = sec(b"CFST", "code map missing")?;
        // Every fst is walked on trust (lookups, automata, reading a code
        // back from its rank): each one's own checksum (CRC-32C) is checked
        // here so a damaged one is refused, not followed.
        let map = fst::Map::new(&bytes[fst.0..fst.0 + fst.1])
            .ok()
            .filter(|m| m.as_fst().verify().is_ok())
            .ok_or(IndexError::Corrupt("code map"))?;
        let len = map.len();
        let pard = sec(b"PARD", "parents missing")?;
        let subt = sec(b"SUBT", "subtrees missing")?;
        let cnts = sec(b"CNTS", "counts missing")?;
        let spbk = sec(b"SPBK", "span blocks missing")?;
        let spof = sec(b"SPOF", "span offsets missing")?;
        let scbk = sec(b"SCBK", "successor blocks missing")?;
        let span = sec(b"SPAN", "date spans missing")?;
        let succ = sec(b"SUCC", "successors missing")?;
        let doff = sec(b"DOFF", "descriptions missing")?;
        let desc = sec(b"DESC", "descriptions missing")?;
        let wfst = sec(b"WFST", "word map missing")?;
        fst::Map::new(&bytes[wfst.0..wfst.0 + wfst.1])
            .ok()
            .filter(|m| m.as_fst().verify().is_ok())
            .ok_or(IndexError::Corrupt("word map"))?;
        let post = sec(b"POST", "word postings missing")?;
        let wlen = sec(b"WLEN", "word counts missing")?;
        let extras: Vec<([u8; 4], (usize, usize))> =
            [*b"GRPH", *b"CONS", *b"STAT", *b"ALTS", *b"SYNS"]
                .into_iter()
                .filter_map(|t| find.get(&t[..]).map(|&at| (t, at)))
                .collect();
        extra::read(|t| slice_of(bytes, &extras, t), len, true).map_err(IndexError::Corrupt)?;
        // The code map states how many records there are: every size derived
        // from it is computed without overflow (a damaged map may claim any).
        let times = |n: usize, w: usize| n.checked_mul(w);
        let rec_blocks = len.div_ceil(REC_BLOCK);
        let wide = times(len, 4) == Some(pard.1) && len > 0;
        let col = if wide { 4 } else { 2 };
        let sizes_agree = times(len, col) == Some(pard.1)
            && times(len, col) == Some(subt.1)
            && times(len, 4) == Some(cnts.1)
            && times(rec_blocks, 4) == Some(spbk.1)
            && times(len, 2) == Some(spof.1)
            && times(rec_blocks, 4) == Some(scbk.1)
            && span.1 % 8 == 0
            && succ.1 % 8 == 0
            && times(len.div_ceil(write::DESC_BLOCK), 4) == Some(doff.1)
            && wlen.1 == len
            && u32::try_from(len).is_ok();
        if !sizes_agree {
            return Err(IndexError::Corrupt("table sizes disagree"));
        }
        let layout = Layout {
            fst,
            pard,
            subt,
            wide,
            cnts,
            spbk,
            spof,
            scbk,
            span,
            succ,
            doff,
            desc,
            wfst,
            post,
            wlen,
            len,
        };
        Ok(Index {
            data,
            layout,
            meta,
            tree,
            maps,
            extras,
            notes: None,
        })
    }

    /// Adds the notes file written for this index (the tabular list's
    /// notes, for the code card). A notes file of another index, or of
    /// another build of the same release, is refused: its notes name codes
    /// by their place in the index they were written for.
    pub fn add_notes(&mut self, notes: NotesFile<D>) -> Result<(), IndexError> {
        notes.pairs_with(self)?;
        self.notes = Some(notes);
        Ok(())
    }

    /// Whether a notes file has been added.
    pub fn has_notes(&self) -> bool {
        self.notes.is_some()
    }

    /// Recomputes the content checksum and compares it with the header's.
    pub fn verify(&self) -> Result<(), IndexError> {
        verify_sum(self.data.as_ref())
    }

    /// [`verify`](Self::verify) with the SHA-256 of the content computed
    /// elsewhere (the browser's own, much faster than hashing in Wasm):
    /// `digest` is that of the file's bytes from [`CONTENT_START`], compared
    /// with the header's as `verify` compares its own.
    pub fn verify_digest(&self, digest: &[u8]) -> Result<(), IndexError> {
        verify_stated(self.data.as_ref(), digest)
    }

    /// The content checksum stated in the header, lower-case hex.
    pub fn checksum(&self) -> String {
        sha256::hex(&self.data.as_ref()[24..56])
    }

    /// What the index says about itself.
    pub fn meta(&self) -> &Meta {
        &self.meta
    }

    /// The raw bytes.
    pub fn bytes(&self) -> &[u8] {
        self.data.as_ref()
    }

    /// A borrowed view with all lookups.
    pub fn view(&self) -> View<'_> {
        let b = self.data.as_ref();
        let l = &self.layout;
        let s = |(o, n): (usize, usize)| &b[o..o + n];
        View {
            map: fst::Map::new(s(l.fst)).expect("checked on open"),
            pard: s(l.pard),
            subt: s(l.subt),
            wide: l.wide,
            cnts: s(l.cnts),
            spbk: s(l.spbk),
            spof: s(l.spof),
            scbk: s(l.scbk),
            spans: s(l.span),
            succ: s(l.succ),
            doff: s(l.doff),
            desc: s(l.desc),
            words: fst::Map::new(s(l.wfst)).expect("checked on open"),
            post: s(l.post),
            wlen: s(l.wlen),
            avg_words: std::cell::OnceCell::new(),
            len: l.len,
            meta: &self.meta,
            tree: &self.tree,
            mappings: self
                .maps
                .and_then(|m| maps::read(s(m), false))
                .unwrap_or_default(),
            predecessors: std::cell::OnceCell::new(),
            known: Default::default(),
            extra: extra::read(|t| slice_of(b, &self.extras, t), l.len, false).unwrap_or_default(),
            notes_at: self.notes.as_ref().map(NotesFile::section),
            notes: std::cell::OnceCell::new(),
        }
    }

    /// Reads the whole index back into a [`Release`] (for tests and tools).
    pub fn to_release(&self) -> Release {
        let v = self.view();
        let codes = (0..v.len() as u32)
            .map(|o| CodeEntry {
                code: v.code(o),
                description: v.description(o),
                billable: v.billable(o).collect(),
                header: v.header(o).collect(),
                successors: v
                    .successors(o)
                    .map(|(s, effective)| Successor {
                        code: v.code(s),
                        effective,
                    })
                    .collect(),
                seventh: v.own_seventh(o),
                terms: v.synonyms(o),
                parents: match v.extra.graph {
                    Some(_) => v.parents(o).map(|p| v.code(p)).collect(),
                    None => Vec::new(),
                },
                consider: v.consider(o).map(|c| v.code(c)).collect(),
                status: v.status(o).unwrap_or_default().to_string(),
            })
            .collect();
        Release {
            meta: self.meta.clone(),
            codes,
            chapters: self.tree.chapters.clone(),
            sections: self.tree.sections.clone(),
            seventh: self.tree.seventh.clone(),
            mappings: v
                .mappings()
                .iter()
                .map(|m| Mapping {
                    name: m.name.to_string(),
                    title: m.title.to_string(),
                    from: m.from.to_string(),
                    to: m.to.to_string(),
                    rows: m.rows(),
                })
                .collect(),
            hierarchy: if v.is_graph() {
                Hierarchy::Explicit
            } else {
                Hierarchy::Prefix
            },
            aliases: v.aliases(),
            notes: {
                let (t, data) = v.notes_table();
                t.all(data)
            }
            .into_iter()
            .map(|(tag, at, kind, text)| Note {
                owner: match tag {
                    notes::NoteTable::CODE => NoteOwner::Code(v.code(at)),
                    notes::NoteTable::CHAPTER => NoteOwner::Chapter(at as u16),
                    _ => NoteOwner::Section(at as u16),
                },
                kind,
                text,
            })
            .collect(),
        }
    }
}

/// Lookups over an opened index. Every accessor tolerates a damaged file
/// (out-of-range reads give empty answers), so an unverified index cannot panic.
pub struct View<'a> {
    map: fst::Map<&'a [u8]>,
    pard: &'a [u8],
    subt: &'a [u8],
    wide: bool,
    cnts: &'a [u8],
    spbk: &'a [u8],
    spof: &'a [u8],
    scbk: &'a [u8],
    spans: &'a [u8],
    succ: &'a [u8],
    doff: &'a [u8],
    desc: &'a [u8],
    words: fst::Map<&'a [u8]>,
    post: &'a [u8],
    wlen: &'a [u8],
    avg_words: std::cell::OnceCell<f32>,
    len: usize,
    meta: &'a Meta,
    tree: &'a Tree,
    mappings: Vec<MapView<'a>>,
    predecessors: std::cell::OnceCell<std::collections::HashMap<u32, Vec<(u32, Date)>>>,
    /// Codes already known by ordinal (reading one back from the fst costs
    /// a walk; a check notes the codes it looked up).
    known: std::cell::RefCell<std::collections::HashMap<u32, Box<str>>>,
    /// The optional sections (stated hierarchy, statuses, alternate ids).
    extra: extra::Extra<'a>,
    /// The `NOTE` section's bytes (of the added notes file), read into
    /// [`notes`](Self::notes) on first use.
    notes_at: Option<&'a [u8]>,
    notes: std::cell::OnceCell<notes::NoteTable>,
}
