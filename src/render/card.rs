//! The text form of code cards (`rollcall show`; JSON is their serde form).

use crate::card::{Card, Cards, Child, Segment};
use crate::model::NoteKind;
use std::fmt::Write;

/// Most siblings listed in text (the JSON has them all).
const SIBLINGS_SHOWN: usize = 12;

/// Cards for a terminal, one after another.
pub fn cards_text(c: &Cards) -> String {
    let mut s = String::new();
    let o = &c.options;
    let when = match o.on {
        _ if o.single_release => format!("as of release {}", c.index.release),
        Some(d) => format!("on {d}"),
        None => format!("over {} to {} (children as of {})", o.from, o.to, o.to),
    };
    let _ = writeln!(
        s,
        "rollcall: {} release {} (coverage {} to {}), {when}",
        c.vocabulary, c.index.release, c.index.coverage_from, c.index.coverage_to
    );
    for card in &c.cards {
        s.push('\n');
        card_text(&mut s, card);
    }
    if !c.index.notice.is_empty() {
        let _ = writeln!(s, "\n{}", c.index.notice);
    }
    s.push_str(
        "\nrollcall helps assemble research code lists; it is not coding or billing advice.\n\
         Official coding guidelines and local policy prevail.\n",
    );
    s
}

/// How a status reads.
pub fn status_words(status: &str) -> &str {
    match status {
        "billable" => "billable",
        "header" => "header (not billable: codes lie under it)",
        "not-in-use" => "not in use",
        "in-use" => "in use",
        "obsolete" => "obsolete",
        "changes" => "changes during the period (see the timeline)",
        "code-start" => "the start of several codes",
        "unknown" => "unknown",
        "malformed" => "not a code of this vocabulary",
        "other-system" => "a code of another system",
        other => other,
    }
}

/// How a kind of note reads in the tabular list.
pub fn note_words(kind: NoteKind) -> &'static str {
    match kind {
        NoteKind::Includes => "Includes",
        NoteKind::InclusionTerm => "Inclusion term",
        NoteKind::Excludes1 => "Excludes1",
        NoteKind::Excludes2 => "Excludes2",
        NoteKind::CodeFirst => "Code first",
        NoteKind::UseAdditionalCode => "Use additional code",
        NoteKind::CodeAlso => "Code also",
        NoteKind::Note => "Note",
        NoteKind::SeventhCharacter => "7th character",
    }
}

/// One timeline span in words.
pub fn segment_words(t: &Segment) -> String {
    let codes = t.codes.join(", ");
    let why = match t.reason {
        "first-release" => "in force from the first release covered".to_string(),
        "not-yet-added" => "not yet in the classification".to_string(),
        "in-release" => "in use in this release".to_string(),
        "added" => "added".to_string(),
        "subdivided" if codes.is_empty() => "subdivided".to_string(),
        "subdivided" => format!("subdivided into {codes}"),
        "merged" if codes.is_empty() => "its subdivisions were retired".to_string(),
        "merged" => format!("its subdivisions {codes} were retired"),
        "retired" if codes.is_empty() => "retired; the conversion table names no successor".into(),
        "retired" => format!("retired; successors {codes}"),
        "obsolete" if codes.is_empty() => "obsolete in this release".to_string(),
        "obsolete" => format!("obsolete; replaced by {codes}"),
        other => other.to_string(),
    };
    format!("{} to {}  {:<8}  {why}", t.from, t.to, t.state)
}

fn child_line(s: &mut String, c: &Child) {
    let under = match c.status {
        "billable" | "in-use" if c.billable_under <= 1 => String::new(),
        "in-use" => format!(", {} terms in use under it", c.billable_under),
        _ => format!(", {} billable under it", c.billable_under),
    };
    let _ = writeln!(
        s,
        "    {:<10} {}  ({}{under})",
        c.code, c.description, c.status
    );
}

fn card_text(s: &mut String, c: &Card) {
    let _ = writeln!(
        s,
        "{}  {}\n  status: {}",
        c.code,
        if c.description.is_empty() {
            "-"
        } else {
            &c.description
        },
        status_words(c.status)
    );
    if let Some(p) = &c.problem {
        let _ = writeln!(s, "  {}", p.message);
        for x in &p.suggestions {
            let _ = writeln!(
                s,
                "    try {:<10} {}  ({})",
                x.code, x.description, x.reason
            );
        }
        return;
    }
    if !c.synonyms.is_empty() {
        let _ = writeln!(s, "  synonyms:");
        for w in &c.synonyms {
            let _ = writeln!(s, "    {w}");
        }
    }
    if !c.timeline.is_empty() {
        let _ = writeln!(s, "  timeline:");
        for t in &c.timeline {
            let _ = writeln!(s, "    {}", segment_words(t));
        }
    }
    if let Some(ch) = &c.chapter {
        let _ = writeln!(s, "  chapter {}: {}", ch.code, ch.title);
    }
    if let Some(sec) = &c.section {
        let _ = writeln!(s, "  section {}: {}", sec.code, sec.title);
    }
    for (depth, a) in c.ancestors.iter().enumerate() {
        let _ = writeln!(s, "  {}{} {}", "  ".repeat(depth), a.code, a.description);
    }
    if c.parents.len() > 1 {
        let _ = writeln!(s, "  parents:");
        for p in &c.parents {
            let _ = writeln!(s, "    {:<10} {}", p.code, p.description);
        }
    }
    if !c.children.is_empty() {
        let _ = writeln!(s, "  children ({}):", c.children.len());
        for ch in &c.children {
            child_line(s, ch);
        }
    }
    if !c.siblings.is_empty() {
        let _ = writeln!(s, "  siblings ({}):", c.siblings.len());
        for ch in c.siblings.iter().take(SIBLINGS_SHOWN) {
            child_line(s, ch);
        }
        if c.siblings.len() > SIBLINGS_SHOWN {
            let _ = writeln!(
                s,
                "    ... and {} more (--format json lists them all)",
                c.siblings.len() - SIBLINGS_SHOWN
            );
        }
    }
    // A code's card says so when the notes file was not given, rather than
    // showing no notes.
    let unloaded =
        c.notes_status == "not-loaded" && c.problem.is_none() && c.status != "code-start";
    if !c.notes.is_empty() || c.seventh_character.is_some() || unloaded {
        let _ = writeln!(
            s,
            "  notes of the tabular list:{}",
            if unloaded {
                " not loaded (they are in a notes file of their own, which was not given)"
            } else {
                ""
            }
        );
        for n in &c.notes {
            let from = if n.level == "code" && n.at == c.code {
                String::new()
            } else {
                format!("  [at {} {}]", n.level, n.at)
            };
            let _ = writeln!(s, "    {}: {}{from}", note_words(n.kind), n.text);
        }
        if let Some(r) = &c.seventh_character {
            let ext: Vec<String> = r
                .extensions
                .iter()
                .map(|(ch, m)| format!("{ch} {m}"))
                .collect();
            let _ = writeln!(s, "    7th character (at {}): {}", r.at, ext.join("; "));
        }
    }
    for (title, links) in [
        ("successors", &c.successors),
        ("predecessors", &c.predecessors),
    ] {
        if links.is_empty() {
            continue;
        }
        let _ = writeln!(s, "  {title}:");
        for l in links {
            let when = l
                .effective
                .map_or(String::new(), |d| format!("  (from {d})"));
            let _ = writeln!(s, "    {:<10} {}{when}", l.code, l.description);
        }
    }
    if !c.consider.is_empty() {
        let _ = writeln!(s, "  the release suggests considering:");
        for n in &c.consider {
            let _ = writeln!(s, "    {:<10} {}", n.code, n.description);
        }
    }
    if !c.alternate_ids.is_empty() {
        let _ = writeln!(s, "  alternate ids: {}", c.alternate_ids.join(", "));
    }
    let mut titles: Vec<(&str, &str)> = c
        .mappings
        .iter()
        .map(|m| (m.title.as_str(), m.role))
        .collect();
    titles.dedup();
    for (title, role) in titles {
        let _ = writeln!(
            s,
            "  {title} ({}):",
            if role == "source" {
                "this code maps to"
            } else {
                "these map to this code"
            }
        );
        for m in c
            .mappings
            .iter()
            .filter(|m| m.title == title && m.role == role)
        {
            let _ = writeln!(
                s,
                "    {:<10} {}  ({})",
                m.code,
                m.description,
                crate::translate::row_words(&m.flags)
            );
        }
    }
}
