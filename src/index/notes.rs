//! The notes file: the tabular list's instructional notes (ICD-10-CM) in a
//! file of their own, since only the code card needs them and most uses of
//! the index never open one. Same container as an index (header with its
//! own magic [`NOTES_MAGIC`], format version, length and SHA-256, then a
//! directory) with two sections: `PAIR`, the index the notes belong to (its
//! vocabulary, release and content SHA-256: notes name codes by ordinal, so
//! they pair with that one build only), and `NOTE`, the notes.
//!
//! In `NOTE` the text is coded by words: notes repeat a small vocabulary ("diabetes",
//! "(E08.-)", "due to"), so each distinct space-separated token is stored
//! once, in byte order and front-coded (the bytes shared with the token
//! before, then the rest), and each note is a list of token numbers. On the
//! April 2026 tabular list the section is 0.57 MB against 1.14 MB of plain
//! text, 251 KB gzipped (a dictionary by frequency is smaller raw but
//! gzips worse, and so do owners interleaved with the texts). Layout:
//! the token count and per token the shared length (varint) and the rest
//! (`str`); the owner count; per owner a tag byte (0 chapter, 1 section,
//! 2 code), its index (a code's ordinal as the gap from the previous code
//! owner's), its note count and a kind byte per note ([`NoteKind::ALL`]);
//! then per note, in the same order, the token count and the token numbers
//! (varints).

use super::bytes::{In, Out};
use super::{container, verify_sum, Index, IndexError, HEADER_LEN, NOTES_MAGIC};
use crate::model::{Note, NoteKind, NoteOwner};
use crate::sha256;
use std::collections::HashMap;

/// An opened notes file over bytes the caller owns. [`open`](Self::open)
/// checks the header and the `PAIR` section; [`verify`](Self::verify) the
/// checksum; the notes are read when the card first asks for them.
pub struct NotesFile<D> {
    data: D,
    vocabulary: String,
    release: String,
    index_sha256: [u8; 32],
    note: (usize, usize),
}

impl<D: AsRef<[u8]>> NotesFile<D> {
    /// Checks the header, directory and `PAIR` section (no copy).
    pub fn open(data: D) -> Result<NotesFile<D>, IndexError> {
        let bytes = data.as_ref();
        let find = container(bytes, NOTES_MAGIC).ok_or(IndexError::NotNotes)??;
        let sec = |tag: &[u8; 4], what: &'static str| {
            find.get(&tag[..]).copied().ok_or(IndexError::Corrupt(what))
        };
        let (o, n) = sec(b"PAIR", "the index it belongs to is not named")?;
        let mut r = In::new(&bytes[o..o + n]);
        let (vocabulary, release, sum) = (|| {
            Some((
                r.str()?.to_string(),
                r.str()?.to_string(),
                <[u8; 32]>::try_from(r.take(32)?).ok()?,
            ))
        })()
        .ok_or(IndexError::Corrupt("the index it belongs to"))?;
        let note = sec(b"NOTE", "notes missing")?;
        Ok(NotesFile {
            data,
            vocabulary,
            release,
            index_sha256: sum,
            note,
        })
    }

    /// Recomputes the content checksum and compares it with the header's.
    pub fn verify(&self) -> Result<(), IndexError> {
        verify_sum(self.data.as_ref())
    }

    /// The content checksum stated in the header, lower-case hex.
    pub fn checksum(&self) -> String {
        sha256::hex(&self.data.as_ref()[24..HEADER_LEN])
    }

    /// The vocabulary of the index the notes belong to.
    pub fn vocabulary(&self) -> &str {
        &self.vocabulary
    }

    /// The release of the index the notes belong to.
    pub fn release(&self) -> &str {
        &self.release
    }

    /// The content SHA-256 of the index the notes belong to, lower-case hex.
    pub fn index_checksum(&self) -> String {
        sha256::hex(&self.index_sha256)
    }

    /// The raw bytes.
    pub fn bytes(&self) -> &[u8] {
        self.data.as_ref()
    }

    /// Whether these are the notes of `index` (the same build: its content
    /// SHA-256); the error names both releases.
    pub fn pairs_with<E: AsRef<[u8]>>(&self, index: &Index<E>) -> Result<(), IndexError> {
        if index.checksum() == self.index_checksum() {
            return Ok(());
        }
        let m = index.meta();
        let short = |h: String| h[..12.min(h.len())].to_string();
        Err(IndexError::NotesOfAnotherIndex {
            notes: format!(
                "{} release {} (index SHA-256 {}…)",
                self.vocabulary,
                self.release,
                short(self.index_checksum())
            ),
            index: format!(
                "{} release {}, SHA-256 {}…",
                m.vocabulary,
                m.release,
                short(index.checksum())
            ),
        })
    }

    /// The `NOTE` section's bytes.
    pub(super) fn section(&self) -> &[u8] {
        let (o, n) = self.note;
        &self.data.as_ref()[o..o + n]
    }
}

/// The `PAIR` section: the vocabulary, release and content SHA-256 of the
/// index the notes belong to.
pub fn pair(vocabulary: &str, release: &str, index_sha256: &[u8]) -> Vec<u8> {
    let mut out = Out::default();
    out.str(vocabulary);
    out.str(release);
    out.buf.extend_from_slice(index_sha256);
    out.buf
}

const CHAPTER: u8 = 0;
const SECTION: u8 = 1;
const CODE: u8 = 2;

/// The `NOTE` section of `notes` (empty when there are none); codes are
/// given by ordinal. Notes are kept in owner order, stable within an owner.
pub fn write(notes: &[Note], ordinal: &HashMap<&str, u32>) -> Result<Vec<u8>, String> {
    if notes.is_empty() {
        return Ok(Vec::new());
    }
    let key = |n: &Note| -> Result<(u8, u32), String> {
        Ok(match &n.owner {
            NoteOwner::Chapter(i) => (CHAPTER, *i as u32),
            NoteOwner::Section(i) => (SECTION, *i as u32),
            NoteOwner::Code(c) => (
                CODE,
                *ordinal.get(c.as_str()).ok_or_else(|| {
                    format!("a tabular note is stated at {c}, which is not a code of this release")
                })?,
            ),
        })
    };
    let mut keyed: Vec<((u8, u32), &Note)> = notes
        .iter()
        .map(|n| key(n).map(|k| (k, n)))
        .collect::<Result<_, _>>()?;
    keyed.sort_by_key(|(k, _)| *k);
    let mut freq: std::collections::HashSet<&str> = Default::default();
    for (_, n) in &keyed {
        freq.extend(n.text.split(' '));
    }
    let mut tokens: Vec<&str> = freq.into_iter().collect();
    tokens.sort_unstable();
    let number: HashMap<&str, u32> = tokens
        .iter()
        .enumerate()
        .map(|(i, t)| (*t, i as u32))
        .collect();
    let mut out = Out::default();
    out.varint(tokens.len() as u32);
    let mut prev = "";
    for t in &tokens {
        let shared = prev
            .bytes()
            .zip(t.bytes())
            .take_while(|(a, b)| a == b)
            .count();
        // Whole characters only, so each stored rest is UTF-8.
        let shared = (0..=shared)
            .rev()
            .find(|&n| t.is_char_boundary(n))
            .unwrap_or(0);
        out.varint(shared as u32);
        out.str(&t[shared..]);
        prev = t;
    }
    // The owners and kinds first, then the texts: apart, each part
    // compresses better (gzip) than the two interleaved.
    let owners = keyed.chunk_by(|a, b| a.0 == b.0).count();
    out.varint(owners as u32);
    let mut prev_code = 0;
    for group in keyed.chunk_by(|a, b| a.0 == b.0) {
        let (tag, at) = group[0].0;
        out.u8(tag);
        if tag == CODE {
            out.varint(at - prev_code);
            prev_code = at;
        } else {
            out.varint(at);
        }
        out.varint(group.len() as u32);
        for (_, n) in group {
            out.u8(NoteKind::ALL.iter().position(|k| *k == n.kind).unwrap_or(0) as u8);
        }
    }
    for (_, n) in &keyed {
        let words: Vec<&str> = n.text.split(' ').collect();
        out.varint(words.len() as u32);
        for w in words {
            out.varint(number[w]);
        }
    }
    Ok(out.buf)
}

/// A read `NOTE` section's tables (no borrow: the section's bytes are
/// passed to each lookup): the tokens, each note's kind and where its
/// text starts, and each owner's first note and note count.
#[derive(Default)]
pub struct NoteTable {
    tokens: Vec<String>,
    notes: Vec<(NoteKind, usize)>,
    at: HashMap<(u8, u32), (usize, usize)>,
}

impl NoteTable {
    /// Reads the section's tables (`None`: damaged).
    pub fn read(data: &[u8]) -> Option<NoteTable> {
        let mut r = In::new(data);
        let n = r.varint()? as usize;
        let mut tokens = Vec::with_capacity(n.min(data.len()));
        let mut prev = String::new();
        for _ in 0..n {
            let shared = r.varint()? as usize;
            let mut t = prev.get(..shared)?.to_string();
            t.push_str(r.str()?);
            tokens.push(t.clone());
            prev = t;
        }
        let mut at = HashMap::new();
        let mut kinds = Vec::new();
        let mut prev_code = 0u32;
        for _ in 0..r.varint()? {
            let tag = r.u8()?;
            let mut owner = r.varint()?;
            if tag == CODE {
                owner = prev_code.checked_add(owner)?;
                prev_code = owner;
            }
            let count = r.varint()? as usize;
            at.insert((tag, owner), (kinds.len(), count));
            for _ in 0..count {
                kinds.push(*NoteKind::ALL.get(r.u8()? as usize)?);
            }
        }
        let mut notes = Vec::with_capacity(kinds.len());
        for kind in kinds {
            notes.push((kind, r.pos));
            for _ in 0..r.varint()? {
                if r.varint()? as usize >= tokens.len() {
                    return None;
                }
            }
        }
        Some(NoteTable { tokens, notes, at })
    }

    fn of(&self, data: &[u8], tag: u8, owner: u32) -> Vec<(NoteKind, String)> {
        let Some(&(first, count)) = self.at.get(&(tag, owner)) else {
            return Vec::new();
        };
        let notes = self
            .notes
            .get(first..first.saturating_add(count))
            .unwrap_or_default();
        notes
            .iter()
            .map(|&(kind, pos)| {
                let mut r = In { data, pos };
                let n = r.varint().unwrap_or(0);
                let mut text = String::new();
                for i in 0..n {
                    let t = r
                        .varint()
                        .and_then(|k| self.tokens.get(k as usize))
                        .map_or("", String::as_str);
                    if i > 0 {
                        text.push(' ');
                    }
                    text.push_str(t);
                }
                (kind, text)
            })
            .collect()
    }

    /// The notes stated at a code (by ordinal), in tabular order.
    pub fn of_code(&self, data: &[u8], ord: u32) -> Vec<(NoteKind, String)> {
        self.of(data, CODE, ord)
    }

    /// The notes stated at a chapter.
    pub fn of_chapter(&self, data: &[u8], i: u16) -> Vec<(NoteKind, String)> {
        self.of(data, CHAPTER, i as u32)
    }

    /// The notes stated at a section.
    pub fn of_section(&self, data: &[u8], i: u16) -> Vec<(NoteKind, String)> {
        self.of(data, SECTION, i as u32)
    }

    /// Every note, in owner order, with its owner (codes by ordinal).
    pub fn all(&self, data: &[u8]) -> Vec<(u8, u32, NoteKind, String)> {
        let mut keys: Vec<(u8, u32)> = self.at.keys().copied().collect();
        keys.sort();
        keys.into_iter()
            .flat_map(|(t, o)| {
                self.of(data, t, o)
                    .into_iter()
                    .map(move |(k, s)| (t, o, k, s))
            })
            .collect()
    }

    /// The owner tag of a code.
    pub const CODE: u8 = CODE;
    /// The owner tag of a chapter.
    pub const CHAPTER: u8 = CHAPTER;
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn notes_read_back_as_written() {
        let notes = vec![
            Note {
                owner: NoteOwner::Code("E11".into()),
                kind: NoteKind::Excludes1,
                text: "diabetes mellitus due to underlying condition (E08.-)".into(),
            },
            Note {
                owner: NoteOwner::Chapter(0),
                kind: NoteKind::Includes,
                text: "diseases generally recognized as communicable".into(),
            },
            Note {
                owner: NoteOwner::Code("E11".into()),
                kind: NoteKind::UseAdditionalCode,
                text: "code to identify control using insulin (Z79.4)".into(),
            },
        ];
        let ordinal: HashMap<&str, u32> = [("E11", 7)].into_iter().collect();
        let bytes = write(&notes, &ordinal).unwrap();
        let n = NoteTable::read(&bytes).unwrap();
        assert_eq!(
            n.of_code(&bytes, 7),
            vec![
                (NoteKind::Excludes1, notes[0].text.clone()),
                (NoteKind::UseAdditionalCode, notes[2].text.clone())
            ]
        );
        assert_eq!(
            n.of_chapter(&bytes, 0),
            vec![(NoteKind::Includes, notes[1].text.clone())]
        );
        assert!(n.of_code(&bytes, 6).is_empty() && n.of_section(&bytes, 0).is_empty());
        assert!(write(&[], &ordinal).unwrap().is_empty());
        let unknown = Note {
            owner: NoteOwner::Code("Z99".into()),
            ..notes[0].clone()
        };
        assert!(write(&[unknown], &ordinal).is_err());
    }
}
