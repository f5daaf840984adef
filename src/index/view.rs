//! What a [`View`] answers of one code: its code and ordinal, display form,
//! description (front-coded in blocks), section and chapter, notes and mappings.

use super::*;

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

    pub(super) fn code_from_fst(&self, ord: u32) -> String {
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
    pub(super) fn column(&self, data: &[u8], ord: u32) -> u32 {
        let i = ord as usize;
        if self.wide {
            u32_entry(data, i).unwrap_or(0)
        } else {
            Self::u16_at(data, i) as u32
        }
    }

    pub(super) fn u16_at(data: &[u8], i: usize) -> u16 {
        u16_entry(data, i).unwrap_or(0)
    }

    #[inline]
    pub(super) fn count(&self, ord: u32, field: usize) -> usize {
        bytes::entry(self.cnts, ord as usize, 4)
            .and_then(|b| b.get(field))
            .copied()
            .unwrap_or(0) as usize
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

    pub(super) fn notes_table(&self) -> (&notes::NoteTable, &'a [u8]) {
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
}
