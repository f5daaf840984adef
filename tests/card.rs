//! Code cards (`rollcall show`, the page's side panel) against the official
//! files: the hierarchy on a day against the order file of that release,
//! the notes against the tabular list XML they come from.

mod common;

use common::*;
use rollcall::card::{self, Cards};
use rollcall::model::NoteKind;
use rollcall::{CheckOptions, Index, IndexError, NotesFile};
use std::collections::{BTreeMap, BTreeSet};

fn cards_of(codes: &[&str], opts: &CheckOptions) -> Cards {
    let index = index_with_notes();
    let icd9 = icd9_index();
    card::cards(&index, &[icd9.view()], codes, opts)
}

/// Source: the official CMS/CDC order file, January 2021 update
/// (icd10cm-order-2021-01.txt, code in columns 7-13). The file states the
/// tree by its codes: a node's parent is the longest code of the file that
/// is a proper prefix of it (common practice: an ICD-10-CM code extends
/// the code of the node above it). On 2021-01-15, for every node of the
/// file, not a sample, the card's ancestors (category down to parent) and
/// children are the ones the file implies.
#[test]
fn on_2021_01_15_every_nodes_ancestors_and_children_equal_the_january_2021_order_file() {
    let text = source("icd10cm-order-2021-01.txt.gz");
    let file: BTreeSet<String> = text.lines().map(|l| l[6..13].trim().to_string()).collect();
    assert_eq!(file.len(), 72_621 + 22_737, "order file rows");
    let parent_in_file = |c: &str| -> Option<String> {
        (1..c.len())
            .rev()
            .map(|n| &c[..n])
            .find(|p| file.contains(*p))
            .map(str::to_string)
    };
    let mut children: BTreeMap<String, Vec<String>> = BTreeMap::new();
    for c in &file {
        if let Some(p) = parent_in_file(c) {
            children.entry(p).or_default().push(c.clone());
        }
    }
    let index = index();
    let v = index.view();
    let day = day("2021-01-15");
    let mut checked = 0;
    for c in &file {
        let ord = v
            .ordinal(c)
            .unwrap_or_else(|| panic!("{c} of the order file is not in the index"));
        let mut chain = Vec::new();
        let mut cur = parent_in_file(c);
        while let Some(p) = cur {
            cur = parent_in_file(&p);
            chain.push(p);
        }
        chain.reverse();
        let got: Vec<String> = card::ancestors_on(&v, ord, day)
            .into_iter()
            .map(|o| v.code(o))
            .collect();
        assert_eq!(got, chain, "ancestors of {c}");
        let got: Vec<String> = card::children_on(&v, ord, day)
            .into_iter()
            .map(|o| v.code(o))
            .collect();
        let want = children.get(c).cloned().unwrap_or_default();
        assert_eq!(got, want, "children of {c}");
        checked += 1;
    }
    assert_eq!(checked, 95_358);
}

/// Source: as above, the January 2021 order file: it has no `H54512`
/// row, so `H54.512A` sits under `H54.51` that day (the April 2026 tabular
/// list has an `H54.512` node, not in force in January 2021).
#[test]
fn a_card_on_2021_01_15_skips_nodes_not_in_force_that_day() {
    let c = &cards_of(&["H54.512A", "H54.51"], &on("2021-01-15")).cards;
    let codes = |n: &[rollcall::card::Node]| -> Vec<String> {
        n.iter().map(|x| x.code.clone()).collect::<Vec<_>>()
    };
    assert_eq!(codes(&c[0].ancestors), ["H54", "H54.5", "H54.51"]);
    assert_eq!(c[0].status, "billable");
    let kids: Vec<&str> = c[1].children.iter().map(|x| x.code.as_str()).collect();
    assert_eq!(kids, ["H54.511", "H54.512A"]);
    // The same node in the April 2026 tree (the 2026 tabular list nests
    // H54.512A under H54.512).
    let later = &cards_of(&["H54.512A"], &on("2026-06-01")).cards[0];
    assert_eq!(
        codes(&later.ancestors),
        ["H54", "H54.5", "H54.51", "H54.512"]
    );
}

/// The notes of the April 2026 tabular list (icd10cm-tabular-2026-04-01.xml),
/// read here line by line: the note elements between a node's `<name>` and
/// its first child `<diag>` (or its end), in document order.
fn xml_notes(code: &str) -> Vec<(String, String)> {
    let text = source("icd10cm-tabular-2026-04-01.xml.gz");
    let open = format!("<name>{code}</name>");
    let mut lines = text.lines().skip_while(|l| l.trim() != open).skip(1);
    let mut out = Vec::new();
    let mut kind = String::new();
    for l in lines.by_ref() {
        let t = l.trim();
        if t.starts_with("<diag") || t == "</diag>" {
            break;
        }
        if let Some(n) = t.strip_prefix("<note>") {
            let n = n.trim_end_matches("</note>");
            let n = n
                .replace("&lt;", "<")
                .replace("&gt;", ">")
                .replace("&quot;", "\"")
                .replace("&apos;", "'")
                .replace("&amp;", "&");
            out.push((
                kind.clone(),
                n.split_whitespace().collect::<Vec<_>>().join(" "),
            ));
        } else if t.starts_with('<') && !t.starts_with("</") {
            kind = t
                .trim_start_matches('<')
                .split(['>', ' '])
                .next()
                .unwrap_or("")
                .to_string();
        }
    }
    out
}

fn element(kind: NoteKind) -> &'static str {
    match kind {
        NoteKind::Includes => "includes",
        NoteKind::InclusionTerm => "inclusionTerm",
        NoteKind::Excludes1 => "excludes1",
        NoteKind::Excludes2 => "excludes2",
        NoteKind::CodeFirst => "codeFirst",
        NoteKind::UseAdditionalCode => "useAdditionalCode",
        NoteKind::CodeAlso => "codeAlso",
        NoteKind::Note => "notes",
        NoteKind::SeventhCharacter => "sevenChrNote",
    }
}

/// Source: the official CDC ICD-10-CM Tabular List XML, April 1 2026 update
/// (icd10cm-tabular-2026-04-01.xml): a card's own notes are the node's
/// notes in that file, with their kinds, in its order.
#[test]
fn notes_of_named_nodes_equal_the_april_2026_tabular_xml() {
    let names = [
        "E11", "E11.621", "E11.9", "S06", "B03", "H54", "I10", "O24.4",
    ];
    let c = cards_of(&names, &on("2026-06-01"));
    for (code, card) in names.iter().zip(&c.cards) {
        let own: Vec<(String, String)> = card
            .notes
            .iter()
            .filter(|n| n.level == "code" && n.at == *code)
            .map(|n| (element(n.kind).to_string(), n.text.clone()))
            .collect();
        let want = xml_notes(code);
        assert!(!want.is_empty(), "{code} has notes in the file");
        assert_eq!(own, want, "notes of {code}");
    }
    // E11.621 inherits E11's notes (excludes1, use additional code), and
    // names the codes of its own: "code to identify site of ulcer (L97.4-, L97.5-)".
    let e11621 = &c.cards[1];
    assert!(e11621
        .notes
        .iter()
        .any(|n| n.at == "E11" && n.kind == NoteKind::Excludes1 && n.text.contains("(E08.-)")));
    let own = e11621.notes.iter().find(|n| n.at == "E11.621").unwrap();
    assert_eq!(own.codes, ["L97.4", "L97.5"]);
    // Inclusion terms are the node's own wordings: not inherited.
    assert!(!e11621
        .notes
        .iter()
        .any(|n| n.at != "E11.621" && n.kind == NoteKind::InclusionTerm));
    // S06 states its 7th-character rule (sevenChrDef: A initial encounter ...).
    let s06 = &c.cards[3];
    let rule = s06.seventh_character.as_ref().unwrap();
    assert_eq!(rule.at, "S06");
    assert_eq!(rule.extensions[0], ('A', "initial encounter".to_string()));
}

/// Source: the same April 2026 XML: E11 has notes there (an Excludes1 and a
/// Use additional code). Without the notes file the card says the notes
/// are not loaded instead of showing none; ICD-9-CM keeps no notes.
#[test]
fn without_the_notes_file_the_card_says_the_notes_are_not_loaded() {
    let index = index();
    let c = card::cards(&index, &[], &["E11"], &on("2026-06-01"));
    assert_eq!(c.cards[0].notes_status, "not-loaded");
    assert!(c.cards[0].notes.is_empty());
    let text = rollcall::render::cards_text(&c);
    assert!(
        text.contains("notes of the tabular list: not loaded"),
        "{text}"
    );
    let with = cards_of(&["E11"], &on("2026-06-01"));
    assert_eq!(with.cards[0].notes_status, "loaded");
    assert!(!xml_notes("E11").is_empty() && !with.cards[0].notes.is_empty());
    let icd9 = icd9_index();
    let c = card::cards(&icd9, &[], &["250.00"], &on("2015-06-01"));
    assert_eq!(c.cards[0].notes_status, "none");
}

/// A notes file names the release and build of the index it was written
/// with and pairs with that one only: the bundled notes are refused by the
/// ICD-9-CM index and by an ICD-10-CM index of another release (the
/// bundled release written again under the tag FY2026, a release of our
/// own making), and that release's notes by the bundled index.
#[test]
fn a_notes_file_of_another_release_is_refused() {
    let notes = || NotesFile::open(notes_bytes()).unwrap();
    assert_eq!(notes().release(), "FY2027");
    let mut icd9 = icd9_index();
    let e = icd9.add_notes(notes()).unwrap_err();
    assert!(matches!(e, IndexError::NotesOfAnotherIndex { .. }));
    assert!(e.to_string().contains("icd10cm release FY2027"), "{e}");
    assert!(!icd9.has_notes());

    let mut release = index_with_notes().to_release();
    assert!(!release.notes.is_empty());
    release.meta.release = "FY2026".into();
    let other = rollcall::index::write::write(&release).unwrap();
    let other_notes = rollcall::index::write::notes(&release, &other)
        .unwrap()
        .unwrap();
    let mut other = Index::open(other).unwrap();
    let e = other.add_notes(notes()).unwrap_err();
    assert!(
        e.to_string().contains("written for icd10cm release FY2027")
            && e.to_string().contains("icd10cm release FY2026"),
        "{e}"
    );
    let mut bundled = index();
    let e = bundled
        .add_notes(NotesFile::open(other_notes.clone()).unwrap())
        .unwrap_err();
    assert!(e.to_string().contains("release FY2026"), "{e}");
    assert!(!bundled.has_notes());
    // Its own notes pair, and give the same card as the bundled ones.
    other
        .add_notes(NotesFile::open(other_notes).unwrap())
        .unwrap();
    let a = card::cards(&other, &[], &["E11.621"], &on("2026-06-01"));
    let b = card::cards(&index_with_notes(), &[], &["E11.621"], &on("2026-06-01"));
    assert_eq!(a.cards[0].notes, b.cards[0].notes);
    // A notes file is no index, and an index no notes file.
    assert!(matches!(
        Index::open(notes_bytes()),
        Err(IndexError::NotesNotIndex)
    ));
    assert!(matches!(
        NotesFile::open(std::fs::read(root().join("vocab/icd10cm.rcx")).unwrap()),
        Err(IndexError::NotNotes)
    ));
}

/// Source: the same April 2026 XML, chapter 4's own notes (between its
/// `<desc>` and its section index): every E11 card carries them, at the chapter.
#[test]
fn chapter_notes_are_inherited() {
    let text = source("icd10cm-tabular-2026-04-01.xml.gz");
    let start = text.find("<name>4</name>").unwrap();
    let end = start + text[start..].find("<sectionIndex>").unwrap();
    let want: Vec<String> = text[start..end]
        .lines()
        .filter_map(|l| l.trim().strip_prefix("<note>"))
        // The index keeps a note's text with its runs of spaces collapsed.
        .map(|n| {
            n.trim_end_matches("</note>")
                .split_whitespace()
                .collect::<Vec<_>>()
                .join(" ")
        })
        .collect();
    assert!(!want.is_empty());
    let c = cards_of(&["E11.65"], &on("2026-06-01"));
    let got: Vec<String> = c.cards[0]
        .notes
        .iter()
        .filter(|n| n.level == "chapter")
        .map(|n| n.text.clone())
        .collect();
    assert_eq!(got, want);
    assert!(c.cards[0]
        .notes
        .iter()
        .all(|n| n.level != "chapter" || n.at == "4"));
}

/// Source: the CMS conversion table (icd10cm-conversion-FY2017-FY2026.tsv)
/// and the release history (icd10cm-history-FY2016-FY2027.tsv): T40.7X1A
/// was billable to 2021-09-30, and its data from 2021-10-01 is coded as
/// T40.711A or T40.721A. H54.51 was billable until it was subdivided on
/// 2017-10-01 (the FY2018 release).
#[test]
fn timelines_name_what_happened() {
    let c = cards_of(&["T40.7X1A", "H54.51"], &on("2026-06-01"));
    let t = &c.cards[0].timeline;
    assert_eq!(t.len(), 2);
    assert_eq!((t[0].state, t[0].reason), ("billable", "first-release"));
    assert_eq!(t[0].to, day("2021-09-30"));
    assert_eq!((t[1].state, t[1].reason), ("absent", "retired"));
    assert_eq!(t[1].codes, ["T40.711A", "T40.721A"]);
    assert_eq!(c.cards[0].status, "not-in-use");
    let h = &c.cards[1].timeline;
    assert_eq!((h[1].state, h[1].reason), ("header", "subdivided"));
    assert_eq!(h[1].from, day("2017-10-01"));
    assert_eq!(h[1].codes, ["H54.511", "H54.512"]);
    // Over a period spanning the change the status says so.
    let p = cards_of(&["H54.51"], &period("2017-01-01", "2018-01-01"));
    assert_eq!(p.cards[0].status, "changes");
}

/// Source: the 2015 GEMs (icd9cm-to-icd10cm-gem-2015.csv and
/// icd10cm-to-icd9cm-gem-2015.csv): E11.9 maps back to 250.00, and 250.00
/// maps forward to E11.9. An unknown code gets the check's suggestions.
#[test]
fn mappings_in_both_directions_and_unknown_codes() {
    let c = cards_of(&["E11.9", "E11.6xx"], &on("2026-06-01"));
    let m = &c.cards[0].mappings;
    assert!(m
        .iter()
        .any(|r| r.role == "source" && r.code == "250.00" && r.system == "icd9cm"));
    assert!(m
        .iter()
        .any(|r| r.role == "target" && r.code == "250.00" && r.mapping == "gem-icd9cm-icd10cm"));
    let u = &c.cards[1];
    assert_eq!(u.status, "unknown");
    let p = u.problem.as_ref().unwrap();
    assert!(p.suggestions.iter().any(|s| s.code == "E11.621"));
}
