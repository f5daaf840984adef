//! The tabular list's notes that hold for a code (stated at it, inherited
//! from its ancestors, section and chapter), the codes each note names, and
//! whether the notes are at hand at all.

use super::facts::CardNote;
use crate::index::View;
use crate::model::NoteKind;

/// Whether the notes of the view's vocabulary are at hand (see
/// [`Card::notes_status`]); which systems have notes is
/// [`crate::systems::System::notes_file`]'s to say.
pub fn notes_status(view: &View<'_>) -> &'static str {
    let has_file = crate::systems::System::parse(&view.meta().vocabulary)
        .and_then(|s| s.notes_file())
        .is_some();
    if view.has_notes() {
        "loaded"
    } else if has_file {
        "not-loaded"
    } else {
        "none"
    }
}

/// The notes stated at the code, then the inherited ones of each ancestor,
/// its section and its chapter (nearest first).
pub(super) fn notes_of(view: &View<'_>, ord: u32, code: &str) -> Vec<CardNote> {
    if !view.has_notes() {
        return Vec::new();
    }
    let mut out = Vec::new();
    let mut add = |kind: NoteKind, text: String, level: &'static str, at: String| {
        out.push(CardNote {
            codes: codes_named(view, &text),
            kind,
            text,
            level,
            at,
        });
    };
    for (k, t) in view.notes(ord) {
        add(k, t, "code", view.display(code));
    }
    for a in view.ancestors(ord) {
        for (k, t) in view.notes(a) {
            if k.inherited() {
                add(k, t, "code", view.display(&view.code(a)));
            }
        }
    }
    if let Some((s, _)) = view.section_of(code) {
        let si = view
            .sections()
            .iter()
            .position(|x| std::ptr::eq(x, s))
            .unwrap_or(usize::MAX);
        let range = format!("{}-{}", s.first, s.last);
        for (k, t) in view.section_notes(si) {
            add(k, t, "section", range.clone());
        }
        let ci = s.chapter as usize;
        let chapter = view.chapters().get(ci).map(|c| c.name.clone());
        for (k, t) in view.chapter_notes(ci) {
            add(k, t, "chapter", chapter.clone().unwrap_or_default());
        }
    }
    out
}

/// The codes of the index a note names, dotted, in order of appearance:
/// `(E08.-)`, `(L97.1-L97.9, L98.41-L98.49)` (both ends of a range), `E11.649`.
pub fn codes_named(view: &View<'_>, text: &str) -> Vec<String> {
    let mut out: Vec<String> = Vec::new();
    let sep = |c: char| !(c.is_ascii_alphanumeric() || c == '.' || c == '-');
    for token in text.split(sep) {
        for part in token.split('-') {
            let part = part.trim_end_matches('.');
            let ok = part.len() >= 3
                && part.starts_with(|c: char| c.is_ascii_uppercase())
                && part[1..2].chars().all(|c| c.is_ascii_digit());
            if !ok {
                continue;
            }
            let bare: String = part.chars().filter(|&c| c != '.').collect();
            if let Some(o) = view.ordinal(&bare) {
                let shown = view.display(&view.code(o));
                if !out.contains(&shown) {
                    out.push(shown);
                }
            }
        }
    }
    out
}
