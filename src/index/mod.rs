//! Index files: a cheap, zero-copy [`Index::open`] over bytes, an explicit
//! [`Index::verify`] of the checksum, and a [`View`] with the lookups the
//! checker needs (code to ordinal through an `fst` map, side tables by ordinal).
//! The tabular list's notes are a file of their own in the same container
//! ([`NotesFile`]), added to the index it was written for with
//! [`Index::add_notes`]: only the code card needs them.

mod bytes;
mod extra;
mod maps;
mod notes;
pub mod write;

pub use maps::MapView;
pub use notes::NotesFile;

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
/// Records per block of the span and successor offset tables.
pub(crate) const REC_BLOCK: usize = 64;

/// Why index bytes cannot be used. Each message says what to do.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum IndexError {
    /// Not an index file at all.
    NotAnIndex,
    /// A notes file where an index was expected.
    NotesNotIndex,
    /// Not a notes file (an index, or something else) where a notes file was expected.
    NotNotes,
    /// A notes file written for another index.
    NotesOfAnotherIndex {
        /// The vocabulary and release the notes file names.
        notes: String,
        /// The vocabulary and release of the index.
        index: String,
    },
    /// Written by another format version.
    Version {
        /// The version this build reads.
        expected: u32,
        /// The version in the file.
        got: u32,
    },
    /// Shorter than its header says.
    Truncated {
        /// Length stated in the header.
        expected: u64,
        /// Bytes present.
        got: u64,
    },
    /// A part of the file is missing or out of bounds.
    Corrupt(&'static str),
    /// The content does not match its checksum.
    ChecksumMismatch {
        /// Checksum in the header.
        expected: String,
        /// Checksum of the content.
        got: String,
    },
}

impl fmt::Display for IndexError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            IndexError::NotAnIndex => write!(
                f,
                "this is not a rollcall index file (its first bytes are wrong); \
                 point to a file written by vocab-build"
            ),
            IndexError::NotesNotIndex => write!(
                f,
                "this is a notes file (the tabular list's notes of an index), not an index; \
                 point to the index file itself"
            ),
            IndexError::NotNotes => write!(
                f,
                "this is not a rollcall notes file (its first bytes are wrong); \
                 point to the notes file vocab-build wrote beside the index"
            ),
            IndexError::NotesOfAnotherIndex { notes, index } => write!(
                f,
                "the notes file was written for {notes}, not for this index ({index}); \
                 use the notes file vocab-build wrote with this index"
            ),
            IndexError::Version { expected, got } => write!(
                f,
                "the index file has format version {got}, but this rollcall reads version \
                 {expected}; rebuild the index with the matching vocab-build"
            ),
            IndexError::Truncated { expected, got } => write!(
                f,
                "the index file is truncated: {got} of {expected} bytes are present; \
                 copy or download it again"
            ),
            IndexError::Corrupt(what) => write!(
                f,
                "the index file is damaged ({what}); rebuild it with vocab-build or copy it again"
            ),
            IndexError::ChecksumMismatch { expected, got } => write!(
                f,
                "the index file is corrupted: its checksum is {got} but should be {expected}; \
                 copy or download it again"
            ),
        }
    }
}

impl std::error::Error for IndexError {}

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

/// The sections of a file of the container format (see [`write`]): checks
/// the magic (`None` when it is not `magic`), the version and the length,
/// and reads the directory (tag to offset and length).
#[allow(clippy::type_complexity)]
fn container(
    bytes: &[u8],
    magic: &[u8; 8],
) -> Option<Result<std::collections::HashMap<Vec<u8>, Range>, IndexError>> {
    if bytes.len() < 12 || &bytes[..8] != magic {
        return None;
    }
    Some(directory(bytes))
}

fn directory(bytes: &[u8]) -> Result<std::collections::HashMap<Vec<u8>, Range>, IndexError> {
    let version = u32_at(bytes, 8).unwrap_or(0);
    if version != FORMAT_VERSION {
        return Err(IndexError::Version {
            expected: FORMAT_VERSION,
            got: version,
        });
    }
    let mut r = In::new(bytes);
    r.pos = 12;
    let count = r.u32().ok_or(IndexError::Corrupt("header"))? as usize;
    let total = r
        .take(8)
        .map(|b| u64::from_le_bytes(b.try_into().unwrap_or([0; 8])))
        .ok_or(IndexError::Truncated {
            expected: HEADER_LEN as u64,
            got: bytes.len() as u64,
        })?;
    if (bytes.len() as u64) < total || bytes.len() < HEADER_LEN {
        return Err(IndexError::Truncated {
            expected: total.max(HEADER_LEN as u64),
            got: bytes.len() as u64,
        });
    }
    if bytes.len() as u64 != total {
        return Err(IndexError::Corrupt("extra bytes after the end"));
    }
    r.pos = HEADER_LEN;
    let mut find = std::collections::HashMap::new();
    for _ in 0..count.min(64) {
        let tag = r.take(4).ok_or(IndexError::Corrupt("directory"))?;
        let off = r.u32().ok_or(IndexError::Corrupt("directory"))? as usize;
        let len = r.u32().ok_or(IndexError::Corrupt("directory"))? as usize;
        if off.checked_add(len).is_none_or(|end| end > bytes.len()) {
            return Err(IndexError::Corrupt("a section lies outside the file"));
        }
        find.insert(tag.to_vec(), (off, len));
    }
    Ok(find)
}

/// Recomputes the content checksum of a container file and compares it
/// with the header's.
fn verify_sum(bytes: &[u8]) -> Result<(), IndexError> {
    let got = sha256::digest(bytes.get(HEADER_LEN..).unwrap_or_default());
    let stated = bytes.get(24..HEADER_LEN).unwrap_or_default();
    if got[..] != *stated {
        return Err(IndexError::ChecksumMismatch {
            expected: sha256::hex(stated),
            got: sha256::hex(&got),
        });
    }
    Ok(())
}

/// The bytes of an optional section, if the directory has it.
fn slice_of<'b>(
    bytes: &'b [u8],
    at: &[([u8; 4], (usize, usize))],
    tag: &[u8; 4],
) -> Option<&'b [u8]> {
    at.iter()
        .find(|(t, _)| t == tag)
        .map(|(_, (o, n))| &bytes[*o..*o + *n])
}

fn read_meta(b: &[u8]) -> Option<Meta> {
    let mut r = In::new(b);
    let vocabulary = r.str()?.to_string();
    let title = r.str()?.to_string();
    let release = r.str()?.to_string();
    let coverage_from = Date::from_days(r.i32()?);
    let coverage_to = Date::from_days(r.i32()?);
    let dot_after = r.u8()?;
    let n = r.varint()?;
    let mut sources = Vec::new();
    for _ in 0..n.min(1000) {
        sources.push(Source {
            file: r.str()?.to_string(),
            sha256: r.str()?.to_string(),
            role: r.str()?.to_string(),
        });
    }
    let n = r.varint()?;
    let mut shapes = Vec::new();
    for _ in 0..n.min(10_000) {
        shapes.push(r.str()?.to_string());
    }
    let mut dot_rules = Vec::new();
    if r.pos < b.len() {
        let n = r.varint()?;
        for _ in 0..n.min(64) {
            let c = char::from_u32(r.varint()?)?;
            dot_rules.push((c, r.u8()?));
        }
    }
    let notice = if r.pos < b.len() {
        r.str()?.to_string()
    } else {
        String::new()
    };
    Some(Meta {
        vocabulary,
        title,
        release,
        coverage_from,
        coverage_to,
        sources,
        dot_after,
        dot_rules,
        shapes,
        notice,
    })
}

fn read_tree(b: &[u8]) -> Option<Tree> {
    let mut r = In::new(b);
    let mut chapters = Vec::new();
    for _ in 0..r.varint()?.min(10_000) {
        chapters.push(Chapter {
            name: r.str()?.to_string(),
            title: r.str()?.to_string(),
        });
    }
    let mut sections = Vec::new();
    for _ in 0..r.varint()?.min(100_000) {
        sections.push(Section {
            first: r.str()?.to_string(),
            last: r.str()?.to_string(),
            title: r.str()?.to_string(),
            chapter: r.u16()?,
        });
    }
    let mut seventh = Vec::new();
    for _ in 0..r.varint()?.min(100_000) {
        let mut extensions = Vec::new();
        for _ in 0..r.varint()?.min(64) {
            let ch = char::from_u32(r.varint()?)?;
            extensions.push((ch, r.str()?.to_string()));
        }
        seventh.push(SeventhRule { extensions });
    }
    Some(Tree {
        chapters,
        sections,
        seventh,
    })
}

/// The nodes below a node, from [`View::descendants`].
pub enum Descendants {
    /// A prefix hierarchy's subtree: a range of ordinals.
    Range(std::ops::Range<u32>),
    /// A graph's, walked and sorted.
    Walked(std::vec::IntoIter<u32>),
}

impl Iterator for Descendants {
    type Item = u32;
    fn next(&mut self) -> Option<u32> {
        match self {
            Descendants::Range(r) => r.next(),
            Descendants::Walked(w) => w.next(),
        }
    }
    fn size_hint(&self) -> (usize, Option<usize>) {
        match self {
            Descendants::Range(r) => r.size_hint(),
            Descendants::Walked(w) => w.size_hint(),
        }
    }
}

impl ExactSizeIterator for Descendants {}

/// Ancestors of a node, from [`View::ancestors`].
pub struct Ancestors<'v, 'a> {
    view: &'v View<'a>,
    /// The next one on a prefix chain.
    cur: Option<u32>,
    guard: u32,
    /// Graph: nodes still to hand out, in order.
    queue: Vec<u32>,
    seen: std::collections::HashSet<u32>,
}

impl Iterator for Ancestors<'_, '_> {
    type Item = u32;
    fn next(&mut self) -> Option<u32> {
        if let Some((parents, _)) = &self.view.extra.graph {
            let i = self.guard as usize;
            let n = *self.queue.get(i)?;
            self.guard += 1;
            for p in parents.of(n) {
                if self.seen.insert(p) {
                    self.queue.push(p);
                }
            }
            return Some(n);
        }
        let c = self.cur?;
        self.guard += 1;
        self.cur = if self.guard > 64 {
            None
        } else {
            self.view.parent(c)
        };
        Some(c)
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

impl<'a> View<'a> {
    /// Number of codes and header nodes.
    pub fn len(&self) -> usize {
        self.len
    }

    /// Whether the index holds no codes.
    pub fn is_empty(&self) -> bool {
        self.len == 0
    }

    /// The index's header facts.
    pub fn meta(&self) -> &'a Meta {
        self.meta
    }

    /// The code map, for automaton searches.
    pub fn map(&self) -> &fst::Map<&'a [u8]> {
        &self.map
    }

    /// Ordinal of an undotted, upper-case code.
    #[inline]
    pub fn ordinal(&self, code: &str) -> Option<u32> {
        self.map
            .get(code)
            .filter(|&o| o < self.len as u64)
            .map(|o| o as u32)
    }

    /// The undotted code at an ordinal, read back from the fst: outputs are
    /// ranks, so at each node the path to take is the last transition whose
    /// output does not pass the ordinal.
    pub fn code(&self, ord: u32) -> String {
        if let Some(k) = self.known.borrow().get(&ord) {
            return k.to_string();
        }
        let key = self.code_from_fst(ord);
        self.known
            .borrow_mut()
            .insert(ord, key.clone().into_boxed_str());
        key
    }

    /// Remembers that `code` is at `ord` (from a lookup), so [`code`](Self::code)
    /// need not walk the fst for it.
    pub fn note_code(&self, ord: u32, code: &str) {
        self.known
            .borrow_mut()
            .entry(ord)
            .or_insert_with(|| code.into());
    }

    fn code_from_fst(&self, ord: u32) -> String {
        let fst = self.map.as_fst();
        let target = ord as u64;
        let mut node = fst.root();
        let mut acc = 0u64;
        let mut key = Vec::with_capacity(8);
        for _ in 0..64 {
            if node.is_final() && acc.saturating_add(node.final_output().value()) == target {
                return String::from_utf8(key).unwrap_or_default();
            }
            // Outputs grow with the input byte, so binary-search the transitions.
            let (mut lo, mut hi) = (0usize, node.len());
            while lo < hi {
                let mid = (lo + hi) / 2;
                if acc.saturating_add(node.transition(mid).out.value()) <= target {
                    lo = mid + 1;
                } else {
                    hi = mid;
                }
            }
            let pick = lo.checked_sub(1).map(|i| node.transition(i));
            let Some(t) = pick else { break };
            acc = acc.saturating_add(t.out.value());
            key.push(t.inp);
            node = fst.node(t.addr);
        }
        String::new()
    }

    /// The display form of an undotted code (`E119` → `E11.9`).
    pub fn display(&self, code: &str) -> String {
        let n = self.meta.dot_for(code);
        if n > 0 && code.len() > n && code.is_char_boundary(n) {
            let mut s = String::with_capacity(code.len() + 1);
            s.push_str(&code[..n]);
            s.push('.');
            s.push_str(&code[n..]);
            s
        } else {
            code.to_string()
        }
    }

    /// Entry `ord` of PARD or SUBT.
    #[inline]
    fn column(&self, data: &[u8], ord: u32) -> u32 {
        let i = ord as usize;
        if self.wide {
            u32_entry(data, i).unwrap_or(0)
        } else {
            Self::u16_at(data, i) as u32
        }
    }

    fn u16_at(data: &[u8], i: usize) -> u16 {
        u16_entry(data, i).unwrap_or(0)
    }

    #[inline]
    fn count(&self, ord: u32, field: usize) -> usize {
        bytes::entry(self.cnts, ord as usize, 4)
            .and_then(|b| b.get(field))
            .copied()
            .unwrap_or(0) as usize
    }

    /// Whether the hierarchy is the release's own parent links (a graph, as
    /// in HPO) rather than code prefixes.
    pub fn is_graph(&self) -> bool {
        self.extra.graph.is_some()
    }

    /// The parent node, if any (with several parents, the first in code order).
    pub fn parent(&self, ord: u32) -> Option<u32> {
        if let Some((parents, _)) = &self.extra.graph {
            return parents.of(ord).next();
        }
        let d = self.column(self.pard, ord);
        (d != 0 && d <= ord).then(|| ord - d)
    }

    /// Every parent, in code order.
    pub fn parents(&self, ord: u32) -> impl Iterator<Item = u32> + 'a {
        let (graph, single) = match &self.extra.graph {
            Some((parents, _)) => (Some(parents.of(ord)), None),
            None => (None, self.parent(ord)),
        };
        graph.into_iter().flatten().chain(single)
    }

    /// Ancestors, each once, nearest first (breadth first in a graph).
    pub fn ancestors(&self, ord: u32) -> Ancestors<'_, 'a> {
        match &self.extra.graph {
            None => Ancestors {
                view: self,
                cur: self.parent(ord),
                guard: 0,
                queue: Vec::new(),
                seen: Default::default(),
            },
            Some(_) => {
                let queue: Vec<u32> = self.parents(ord).collect();
                let seen = queue.iter().copied().collect();
                Ancestors {
                    view: self,
                    cur: None,
                    guard: 0,
                    queue,
                    seen,
                }
            }
        }
    }

    /// One past the last descendant by code order: for a prefix hierarchy
    /// the subtree of `ord` is `ord..end`. A graph's descendants are not a
    /// range (see [`descendants`](Self::descendants)); there it is `ord + 1`.
    pub fn subtree_end(&self, ord: u32) -> u32 {
        let next = ord.saturating_add(1);
        if self.extra.graph.is_some() {
            return next;
        }
        let size = self.column(self.subt, ord).max(1);
        ord.saturating_add(size).min(self.len as u32).max(next)
    }

    /// The category a node belongs to, for tallies: in a prefix hierarchy
    /// its topmost ancestor (`E11` for `E11.9`); in a stated hierarchy the
    /// ancestor two levels below the root along first parents (HPO: the
    /// organ-system branches under "Phenotypic abnormality"), or the node
    /// itself when it is that high.
    pub fn category(&self, ord: u32) -> u32 {
        if self.extra.graph.is_none() {
            return self.ancestors(ord).last().unwrap_or(ord);
        }
        let mut chain = vec![ord];
        while let Some(p) = self.parent(*chain.last().unwrap_or(&ord)) {
            if chain.len() > 64 {
                break;
            }
            chain.push(p);
        }
        chain[chain.len().saturating_sub(3).min(chain.len() - 1)]
    }

    /// Every node below `ord`, each once, ascending: a range of ordinals in
    /// a prefix hierarchy (no allocation), a walk of the children in a graph.
    pub fn descendants(&self, ord: u32) -> Descendants {
        let Some((_, children)) = &self.extra.graph else {
            return Descendants::Range(ord.saturating_add(1)..self.subtree_end(ord));
        };
        let mut seen = std::collections::HashSet::new();
        let mut stack: Vec<u32> = children.of(ord).collect();
        let mut out = Vec::new();
        while let Some(n) = stack.pop() {
            if seen.insert(n) {
                out.push(n);
                stack.extend(children.of(n));
            }
        }
        out.sort_unstable();
        Descendants::Walked(out.into_iter())
    }

    /// Direct children, in code order.
    pub fn children(&self, ord: u32) -> impl Iterator<Item = u32> + '_ {
        let graph = self.extra.graph.as_ref().map(|(_, c)| c.of(ord));
        let end = if graph.is_some() {
            ord
        } else {
            self.subtree_end(ord)
        };
        let mut next = ord.saturating_add(1);
        let tree = std::iter::from_fn(move || {
            if next >= end {
                return None;
            }
            let c = next;
            next = self.subtree_end(c);
            Some(c)
        });
        graph.into_iter().flatten().chain(tree)
    }

    /// Codes the release suggests considering in place of a retired one.
    pub fn consider(&self, ord: u32) -> impl Iterator<Item = u32> + 'a {
        self.extra.consider.of(ord)
    }

    /// The release's own status word for a code still in use (`DISCOURAGED`).
    pub fn status(&self, ord: u32) -> Option<&'a str> {
        extra::status_of(self.extra.status, ord)
    }

    /// The other wordings the release gives a record (HPO synonyms), as
    /// written and in its order. Kept only for a stated hierarchy: empty for
    /// a prefix hierarchy, whose other wordings are search words alone.
    pub fn synonyms(&self, ord: u32) -> Vec<String> {
        extra::synonyms_of(self.extra.synonyms, ord)
    }

    /// The code an alternate id stands for (HPO `alt_id`), written exactly.
    pub fn alias(&self, alt: &str) -> Option<u32> {
        let m = fst::Map::new(self.extra.aliases?).ok()?;
        m.get(alt.as_bytes())
            .map(|o| o as u32)
            .filter(|&o| (o as usize) < self.len)
    }

    /// Every alternate id with its code, sorted by alternate id.
    pub fn aliases(&self) -> Vec<(String, String)> {
        use fst::Streamer;
        let Some(b) = self.extra.aliases else {
            return Vec::new();
        };
        let Ok(m) = fst::Map::new(b) else {
            return Vec::new();
        };
        let mut out = Vec::new();
        let mut s = m.stream();
        while let Some((k, o)) = s.next() {
            out.push((String::from_utf8_lossy(k).into_owned(), self.code(o as u32)));
        }
        out
    }

    /// Start of this record's run in a table whose block starts are in
    /// `blocks`, given the run length of each record.
    fn run_start(&self, blocks: &[u8], ord: u32, len_of: impl Fn(u32) -> usize) -> usize {
        let block = ord as usize / REC_BLOCK;
        let first = (block * REC_BLOCK) as u32;
        let base = u32_entry(blocks, block).unwrap_or(0) as usize;
        (first..ord).map(len_of).fold(base, usize::saturating_add)
    }

    fn spans_of(&self, ord: u32) -> (usize, usize, usize) {
        let nb = self.count(ord, 0);
        let nh = self.count(ord, 1);
        let start = (u32_entry(self.spbk, ord as usize / REC_BLOCK).unwrap_or(0) as usize)
            .saturating_add(Self::u16_at(self.spof, ord as usize) as usize);
        let total = self.spans.len() / 8;
        let s = start.min(total);
        let m = s.saturating_add(nb).min(total);
        (s, m, m.saturating_add(nh).min(total))
    }

    fn period_at(&self, i: usize) -> Period {
        let pair = bytes::entry(self.spans, i, 8).unwrap_or(&[]);
        let f = u32_at(pair, 0).unwrap_or(0) as i32;
        let t = u32_at(pair, 4).unwrap_or(0) as i32;
        Period::new(Date::from_days(f), Date::from_days(t))
    }

    /// Periods in which the code was billable.
    pub fn billable(&self, ord: u32) -> impl Iterator<Item = Period> + '_ {
        let (s, m, _) = self.spans_of(ord);
        (s..m).map(move |i| self.period_at(i))
    }

    /// Periods in which the code was a header.
    pub fn header(&self, ord: u32) -> impl Iterator<Item = Period> + '_ {
        let (_, m, e) = self.spans_of(ord);
        (m..e).map(move |i| self.period_at(i))
    }

    /// Whether the code was billable on any day of `period`.
    #[inline]
    pub fn billable_in(&self, ord: u32, period: &Period) -> bool {
        self.billable(ord).any(|p| p.overlaps(period))
    }

    fn succ_of(&self, ord: u32) -> (usize, usize) {
        let start = self.run_start(self.scbk, ord, |o| self.count(o, 2));
        let total = self.succ.len() / 8;
        let s = start.min(total);
        (s, s.saturating_add(self.count(ord, 2)).min(total))
    }

    /// Successors and the day each took over.
    pub fn successors(&self, ord: u32) -> impl Iterator<Item = (u32, Date)> + '_ {
        let (start, end) = self.succ_of(ord);
        (start..end).map(move |i| {
            let pair = bytes::entry(self.succ, i, 8).unwrap_or(&[]);
            (
                u32_at(pair, 0)
                    .unwrap_or(0)
                    .min(self.len.saturating_sub(1) as u32),
                Date::from_days(u32_at(pair, 4).unwrap_or(0) as i32),
            )
        })
    }

    /// Codes whose successors include `ord`, with the day each handed over.
    /// The reverse table is built on first use (one pass over the records).
    pub fn predecessors(&self, ord: u32) -> Vec<(u32, Date)> {
        let map = self.predecessors.get_or_init(|| {
            let mut m: std::collections::HashMap<u32, Vec<(u32, Date)>> = Default::default();
            for o in 0..self.len as u32 {
                if self.count(o, 2) > 0 {
                    for (s, d) in self.successors(o) {
                        m.entry(s).or_default().push((o, d));
                    }
                }
            }
            m
        });
        map.get(&ord).cloned().unwrap_or_default()
    }

    /// The official description (empty when the release gave none).
    pub fn description(&self, ord: u32) -> String {
        if ord as usize >= self.len {
            return String::new();
        }
        let block = ord as usize / write::DESC_BLOCK;
        let Some(off) = u32_entry(self.doff, block) else {
            return String::new();
        };
        let mut r = In::new(self.desc);
        r.pos = off as usize;
        let Some(n) = r.varint() else {
            return String::new();
        };
        let Some(first) = r.take(n as usize) else {
            return String::new();
        };
        let mut cur = first.to_vec();
        for _ in 0..ord as usize % write::DESC_BLOCK {
            let (Some(shared), Some(n)) = (r.varint(), r.varint()) else {
                return String::new();
            };
            let Some(rest) = r.take(n as usize) else {
                return String::new();
            };
            cur.truncate((shared as usize).min(cur.len()));
            cur.extend_from_slice(rest);
        }
        String::from_utf8(cur).unwrap_or_default()
    }

    fn own_seventh(&self, ord: u32) -> Option<u16> {
        (self.count(ord, 3) as u16).checked_sub(1)
    }

    /// The 7th-character rule in force at this node (its own or an ancestor's).
    pub fn seventh_rule(&self, ord: u32) -> Option<&'a SeventhRule> {
        std::iter::once(ord)
            .chain(self.ancestors(ord))
            .find_map(|o| self.own_seventh(o))
            .and_then(|i| self.tree.seventh.get(i as usize))
    }

    /// The 7th-character rule in force at this node and the node that
    /// states it (itself or its nearest ancestor with a rule).
    pub fn seventh_rule_at(&self, ord: u32) -> Option<(u32, &'a SeventhRule)> {
        std::iter::once(ord)
            .chain(self.ancestors(ord))
            .find_map(|o| Some((o, self.own_seventh(o)?)))
            .and_then(|(o, i)| Some((o, self.tree.seventh.get(i as usize)?)))
    }

    /// The section whose category range holds this code, and its chapter.
    pub fn section_of(&self, code: &str) -> Option<(&'a Section, Option<&'a Chapter>)> {
        let cat = code.get(..3.min(code.len()))?;
        let i = self
            .tree
            .sections
            .partition_point(|s| s.first.as_str() <= cat);
        let s = self.tree.sections.get(i.checked_sub(1)?)?;
        (cat <= s.last.as_str()).then(|| (s, self.tree.chapters.get(s.chapter as usize)))
    }

    /// The description, or a note saying the bundled release files have
    /// none for this code (ICD-10-PCS codes not valid in the FY2024 code
    /// file, headers of positional hierarchies).
    pub fn description_or_note(&self, ord: u32) -> String {
        let d = self.description(ord);
        if !d.is_empty() {
            return d;
        }
        // A code new in the latest release may come before its wording does:
        // say what is known, the nearest ancestor's wording and the day.
        let since = self.billable(ord).map(|p| p.from).min();
        let above = self
            .ancestors(ord)
            .find(|&a| !self.description(a).is_empty());
        match (above, since) {
            (Some(a), Some(day)) => format!(
                "{} (a code under {}, new on {day}; its own wording is not in the bundled release files)",
                self.description(a),
                self.display(&self.code(a))
            ),
            (Some(a), None) => format!(
                "{} (a code under {}; its own wording is not in the bundled release files)",
                self.description(a),
                self.display(&self.code(a))
            ),
            // A new category: the section it falls in, or follows in code
            // order when the bundled tabular predates it.
            (None, since) => {
                let code = self.code(ord);
                let cat = code.get(..3).unwrap_or(&code);
                let i = self
                    .tree
                    .sections
                    .partition_point(|s| s.first.as_str() <= cat);
                match (i.checked_sub(1).and_then(|i| self.tree.sections.get(i)), since) {
                    (Some(sec), Some(day)) => format!(
                        "{} (a category {} the section {}-{}, new on {day}; its own wording is not in the bundled release files)",
                        sec.title,
                        if cat <= sec.last.as_str() { "of" } else { "after" },
                        self.display(&sec.first),
                        self.display(&sec.last)
                    ),
                    _ => "(no description in the bundled release files)".to_string(),
                }
            }
        }
    }

    fn notes_table(&self) -> (&notes::NoteTable, &'a [u8]) {
        let data = self.notes_at.unwrap_or_default();
        let table = self
            .notes
            .get_or_init(|| notes::NoteTable::read(data).unwrap_or_default());
        (table, data)
    }

    /// Whether the tabular list's notes are at hand (a notes file was
    /// added to the index, see [`Index::add_notes`]).
    pub fn has_notes(&self) -> bool {
        self.notes_at.is_some()
    }

    /// The tabular list's notes stated at a code, in tabular order.
    pub fn notes(&self, ord: u32) -> Vec<(NoteKind, String)> {
        let (t, data) = self.notes_table();
        t.of_code(data, ord)
    }

    /// The notes stated at a chapter (index into [`chapters`](Self::chapters)).
    pub fn chapter_notes(&self, i: usize) -> Vec<(NoteKind, String)> {
        let (t, data) = self.notes_table();
        t.of_chapter(data, i as u16)
    }

    /// The notes stated at a section (index into [`sections`](Self::sections)).
    pub fn section_notes(&self, i: usize) -> Vec<(NoteKind, String)> {
        let (t, data) = self.notes_table();
        t.of_section(data, i as u16)
    }

    /// The mappings the index carries (the GEMs, in the ICD-9-CM index).
    pub fn mappings(&self) -> &[MapView<'a>] {
        &self.mappings
    }

    /// The mapping from vocabulary `from` to `to`, if the index has one.
    pub fn mapping(&self, from: &str, to: &str) -> Option<&MapView<'a>> {
        self.mappings.iter().find(|m| m.from == from && m.to == to)
    }

    /// All chapters.
    pub fn chapters(&self) -> &'a [Chapter] {
        &self.tree.chapters
    }

    /// All sections.
    pub fn sections(&self) -> &'a [Section] {
        &self.tree.sections
    }

    /// The word map (normalised word → posting offset), for automaton searches.
    pub fn words(&self) -> &fst::Map<&'a [u8]> {
        &self.words
    }

    /// The posting list at `offset` (a value of the word map): how many codes
    /// have the word, and their ordinals in order. A damaged list ends early.
    pub fn posting(&self, offset: u64) -> Posting<'a> {
        let mut r = In::new(self.post);
        r.pos = usize::try_from(offset).unwrap_or(usize::MAX);
        let n = r.varint().unwrap_or(0).min(self.len as u32);
        Posting {
            r,
            left: n,
            count: n,
            prev: 0,
            len: self.len as u32,
        }
    }

    /// How many codes have `word` (a normalised word) among their words.
    pub fn word_codes(&self, word: &str) -> u32 {
        self.words.get(word).map_or(0, |o| self.posting(o).count)
    }

    /// Number of distinct words of a code's description.
    pub fn word_count(&self, ord: u32) -> u32 {
        self.wlen.get(ord as usize).copied().unwrap_or(0) as u32
    }

    /// Mean [`word_count`](Self::word_count) over all codes.
    pub fn mean_word_count(&self) -> f32 {
        *self.avg_words.get_or_init(|| {
            let sum: u64 = self.wlen.iter().map(|&b| b as u64).sum();
            (sum as f32 / self.wlen.len().max(1) as f32).max(1.0)
        })
    }
}

/// The ordinals of one posting list, in order; see [`View::posting`].
pub struct Posting<'a> {
    r: In<'a>,
    left: u32,
    prev: u32,
    len: u32,
    /// How many codes the list holds (as its header says).
    pub count: u32,
}

impl Iterator for Posting<'_> {
    type Item = u32;
    fn next(&mut self) -> Option<u32> {
        if self.left == 0 {
            return None;
        }
        self.left -= 1;
        let gap = self.r.varint()?;
        let o = self.prev.checked_add(gap).filter(|&o| o < self.len);
        match o {
            Some(o) => {
                self.prev = o;
                Some(o)
            }
            None => {
                self.left = 0;
                None
            }
        }
    }
}
