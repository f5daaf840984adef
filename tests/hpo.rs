//! The bundled HPO index against the official release file it was built
//! from, `hp-2025-01-16.obo` (Human Phenotype Ontology release 2025-01-16,
//! OBO 1.2), read here by the test's own few lines, and the check's
//! hierarchy rules on HPO's `is_a` graph (several parents per term).

mod common;

use common::root;
use rollcall::{check, CheckOptions, Date, Index, Kind, Status};
use std::collections::{BTreeMap, BTreeSet};

fn hpo() -> Index<Vec<u8>> {
    let bytes = std::fs::read(root().join("vocab/hpo.rcx")).expect("vocab/hpo.rcx");
    let index = Index::open(bytes).expect("HPO index opens");
    index.verify().expect("HPO index checksum");
    index
}

/// One `[Term]` stanza of the OBO file, as the file writes it.
#[derive(Default, Debug)]
struct Stanza {
    id: String,
    name: String,
    is_a: BTreeSet<String>,
    obsolete: bool,
    replaced_by: Vec<String>,
    consider: Vec<String>,
    alt_ids: Vec<String>,
    /// The quoted text of each `synonym:` line, in file order.
    synonyms: Vec<String>,
}

/// The text between the first pair of unescaped quotes of a `synonym:`
/// value, with OBO's backslash escapes read as the character they escape.
fn quoted(v: &str) -> String {
    let mut out = String::new();
    let mut chars = v.strip_prefix('"').expect("a quoted synonym").chars();
    while let Some(c) = chars.next() {
        match c {
            '\\' => out.extend(chars.next()),
            '"' => return out,
            c => out.push(c),
        }
    }
    panic!("unterminated synonym: {v}")
}

/// The `[Term]` stanzas of the release file, by id.
fn stanzas() -> BTreeMap<String, Stanza> {
    let text = common::source("hp-2025-01-16.obo.gz");
    let mut out = BTreeMap::new();
    let mut cur: Option<Stanza> = None;
    let mut in_term = false;
    for line in text.lines() {
        if line.starts_with('[') {
            if let Some(s) = cur.take() {
                out.insert(s.id.clone(), s);
            }
            in_term = line == "[Term]";
            if in_term {
                cur = Some(Stanza::default());
            }
            continue;
        }
        let (Some(s), true) = (cur.as_mut(), in_term) else {
            continue;
        };
        let Some((tag, v)) = line.split_once(": ") else {
            continue;
        };
        let first = v.split(' ').next().unwrap_or("").to_string();
        match tag {
            "id" => s.id = first,
            "name" => s.name = v.to_string(),
            "is_a" => {
                s.is_a.insert(first);
            }
            "is_obsolete" => s.obsolete = v == "true",
            "replaced_by" => s.replaced_by.push(first),
            "consider" => s.consider.push(first),
            "alt_id" => s.alt_ids.push(first),
            "synonym" => s.synonyms.push(quoted(v)),
            _ => {}
        }
    }
    if let Some(s) = cur.take() {
        out.insert(s.id.clone(), s);
    }
    out
}

fn opts() -> CheckOptions {
    CheckOptions::on(Date::parse("2026-01-01").unwrap(), false)
}

/// Source: the release file itself and the counts stated for it in the
/// shared sources' README (19,484 terms, 450 obsolete, 357 `replaced_by`,
/// 82 `consider`, 3,832 `alt_id`; the file's lines: 357 `replaced_by` lines
/// on 356 terms, 82 `consider` lines on 80, one of them in use).
#[test]
fn the_index_holds_every_term_of_the_release_with_its_counts() {
    let file = stanzas();
    assert_eq!(file.len(), 19_484);
    let i = hpo();
    let v = i.view();
    assert_eq!(v.len(), 19_484);
    assert_eq!(v.meta().release, "2025-01-16");
    assert!(v.is_graph());
    let obsolete: Vec<u32> = (0..v.len() as u32)
        .filter(|&o| v.billable(o).next().is_none())
        .collect();
    assert_eq!(obsolete.len(), 450);
    assert_eq!(file.values().filter(|s| s.obsolete).count(), 450);
    let replaced: usize = (0..v.len() as u32).map(|o| v.successors(o).count()).sum();
    assert_eq!(replaced, 357);
    let consider: usize = (0..v.len() as u32).map(|o| v.consider(o).count()).sum();
    assert_eq!(consider, 82);
    let terms = |f: fn(&Stanza) -> usize| file.values().filter(|s| f(s) > 0).count();
    assert_eq!(terms(|s| s.replaced_by.len()), 356);
    assert_eq!(terms(|s| s.consider.len()), 80);
    let alt_ids: usize = file.values().map(|s| s.alt_ids.len()).sum();
    assert_eq!(alt_ids, 3_832);
    for (id, s) in &file {
        let o = v.ordinal(id).unwrap_or_else(|| panic!("{id} missing"));
        assert_eq!(v.description(o), s.name, "{id}");
        assert_eq!(s.obsolete, obsolete.binary_search(&o).is_ok(), "{id}");
    }
}

/// Source: the `is_a` lines of the release file: the index's parents are
/// exactly the file's, for every term, and each child list is their inverse.
#[test]
fn parents_and_children_are_the_files_is_a_graph() {
    let file = stanzas();
    let i = hpo();
    let v = i.view();
    let mut several = 0;
    let mut kids: BTreeMap<&str, BTreeSet<String>> = BTreeMap::new();
    for (id, s) in &file {
        let o = v.ordinal(id).unwrap();
        let parents: BTreeSet<String> = v.parents(o).map(|p| v.code(p)).collect();
        assert_eq!(parents, s.is_a, "{id}");
        several += usize::from(s.is_a.len() > 1);
        for p in &s.is_a {
            kids.entry(p.as_str()).or_default().insert(id.clone());
        }
    }
    // From the file itself: thousands of terms have more than one parent.
    assert!(several > 1000, "{several} terms with several parents");
    for (p, want) in kids {
        let o = v.ordinal(p).unwrap();
        let got: BTreeSet<String> = v.children(o).map(|c| v.code(c)).collect();
        assert_eq!(got, want, "{p}");
    }
    // HP:0000001 "All" is the root; everything in use lies under it.
    let root = v.ordinal("HP:0000001").unwrap();
    let under = v.descendants(root).len();
    assert_eq!(under, 19_484 - 450 - 1);
}

/// Source: the release file's `replaced_by`, `alt_id` and `consider` lines:
/// an obsolete term is `retired`, with its replacement first, then the term
/// whose alternate id it is, then the terms to consider.
#[test]
fn obsolete_terms_are_retired_with_replacements_and_terms_to_consider() {
    let file = stanzas();
    let i = hpo();
    // From the file: HP:0001425 "obsolete Heterogeneous", replaced_by HP:0000005.
    let r = check(&i, "HP:0001425\n", &opts());
    let e = &r.entries[0];
    assert_eq!(e.status, Status::Retired);
    assert_eq!(e.findings[0].kind, Kind::Retired);
    assert_eq!(e.findings[0].suggestions[0].code, "HP:0000005");
    // Every obsolete term with replaced_by or consider: the suggestions are
    // the file's, in that order.
    let alt_of: BTreeMap<&str, &str> = file
        .values()
        .flat_map(|s| s.alt_ids.iter().map(|a| (a.as_str(), s.id.as_str())))
        .collect();
    let mut with_consider = 0;
    for s in file.values().filter(|s| s.obsolete) {
        let r = check(&i, &format!("{}\n", s.id), &opts());
        let e = &r.entries[0];
        assert_eq!(e.status, Status::Retired, "{}", s.id);
        let got: Vec<&str> = e.findings[0]
            .suggestions
            .iter()
            .map(|x| x.code.as_str())
            .collect();
        let mut want: Vec<&str> = s.replaced_by.iter().map(String::as_str).collect();
        let mut consider: Vec<&str> = s.consider.iter().map(String::as_str).collect();
        want.sort();
        consider.sort();
        // An obsolete id that is also another term's alt_id names that term next.
        if let Some(t) = alt_of.get(s.id.as_str()).filter(|t| !want.contains(t)) {
            want.push(t);
        }
        want.extend(consider);
        // Each once, in that order.
        let mut seen = BTreeSet::new();
        want.retain(|c| seen.insert(*c));
        assert_eq!(got, want, "{}", s.id);
        with_consider += s.consider.len();
    }
    // 82 less the one on a term still in use (HP:0041161 in the file).
    assert_eq!(with_consider, 81);
}

/// Source: the release file's `alt_id` lines: each of the 3,832 alternate
/// ids reads as its term (a `normalized` note), or, for the 387 that the
/// file also keeps as obsolete stanzas of their own, is `retired` with that
/// term as its replacement.
#[test]
fn alternate_ids_resolve_to_their_term() {
    let file = stanzas();
    let i = hpo();
    let mut list = String::new();
    let mut want = Vec::new();
    for s in file.values() {
        for a in &s.alt_ids {
            list.push_str(a);
            list.push('\n');
            want.push((a.clone(), s.id.clone()));
        }
    }
    let r = check(&i, &list, &opts());
    assert_eq!(r.entries.len(), 3_832);
    let (mut as_stanza, mut unreplaced) = (0, 0);
    for (e, (alt, term)) in r.entries.iter().zip(&want) {
        if e.status == Status::Retired {
            as_stanza += 1;
            let f = e.findings.iter().find(|f| f.kind == Kind::Retired).unwrap();
            // The term is named, after the stanza's own replaced_by when
            // that differs (the file has such stanzas: HP:0010905 is an
            // alt_id of HP:0002927 and replaced_by HP:0010904).
            let named: Vec<&str> = f.suggestions.iter().map(|s| s.code.as_str()).collect();
            assert!(named.contains(&term.as_str()), "{alt}: {named:?}");
            if file[alt].replaced_by.iter().all(|r| r != term) {
                unreplaced += 1;
            }
        } else {
            assert_eq!(e.code.as_deref(), Some(term.as_str()), "{alt}");
            let f = e.findings.iter().find(|f| f.kind == Kind::Normalized);
            assert!(
                f.is_some_and(|f| f.message.contains("alternate id")),
                "{alt}"
            );
        }
    }
    assert_eq!(as_stanza, 387);
    eprintln!("{unreplaced} of them name another replacement, or none, in their stanza");
}

/// A term listed beside one of its ancestors through its second parent is
/// `redundant` (HPO's true-path rule: a term implies all its ancestors;
/// HPO documentation, from memory). The ancestor is chosen from the file:
/// a term with two parents, listed with the parent that comes second.
#[test]
fn redundancy_follows_every_parent() {
    let file = stanzas();
    let i = hpo();
    let v = i.view();
    let (id, s) = file.iter().find(|(_, s)| s.is_a.len() == 2).unwrap();
    // The second in code order: not the one `View::parent` gives.
    let second = s.is_a.iter().nth(1).unwrap();
    assert_ne!(
        v.parent(v.ordinal(id).unwrap()).map(|p| v.code(p)).as_ref(),
        Some(second)
    );
    let r = check(&i, &format!("{second}\n{id}\n"), &opts());
    let f = r.entries[1]
        .findings
        .iter()
        .find(|f| f.kind == Kind::Redundant)
        .unwrap_or_else(|| panic!("{id} under {second}: {:?}", r.entries[1]));
    assert!(f.message.contains(second.as_str()), "{}", f.message);
    // The parent alone, or the term alone, is not redundant.
    let r = check(&i, &format!("{id}\n"), &opts());
    assert!(r.entries[0]
        .findings
        .iter()
        .all(|f| f.kind != Kind::Redundant));
}

/// All the terms under a term, listed without it, are a `roll-up` naming
/// that term; all but one are a `sibling-gap` naming the one missing. The
/// terms are picked from the file's graph (descendants by `is_a`).
#[test]
fn roll_up_and_sibling_gaps_on_the_graph() {
    let file = stanzas();
    let mut kids: BTreeMap<&str, Vec<&str>> = BTreeMap::new();
    for (id, s) in &file {
        for p in &s.is_a {
            kids.entry(p.as_str()).or_default().push(id.as_str());
        }
    }
    let below = |t: &str| {
        let mut seen = BTreeSet::new();
        let mut stack = vec![t];
        while let Some(n) = stack.pop() {
            for &c in kids.get(n).map(Vec::as_slice).unwrap_or(&[]) {
                if seen.insert(c) {
                    stack.push(c);
                }
            }
        }
        seen
    };
    let i = hpo();
    // A term with four to six terms below it, some of them two levels down
    // and at least one below two parents.
    let (top, under) = file
        .keys()
        .map(|t| (t.as_str(), below(t)))
        .find(|(t, u)| {
            (4..=6).contains(&u.len()) && u.iter().any(|c| !kids.get(t).unwrap().contains(c))
        })
        .unwrap();
    let list: String = under.iter().map(|c| format!("{c}\n")).collect();
    let r = check(&i, &list, &opts());
    let roll: Vec<_> = r
        .list_findings
        .iter()
        .filter(|f| f.kind == Kind::RollUp)
        .collect();
    assert!(
        roll.iter().any(|f| f.suggestions[0].code == top),
        "{top} over {under:?}: {:?}",
        r.list_findings
    );
    // Leave out one leaf: the gap names it.
    let leaf = *under.iter().find(|c| !kids.contains_key(*c)).unwrap();
    let list: String = under
        .iter()
        .filter(|c| **c != leaf)
        .map(|c| format!("{c}\n"))
        .collect();
    let r = check(&i, &list, &opts());
    assert!(
        r.list_findings
            .iter()
            .any(|f| f.kind == Kind::SiblingGap && f.codes == [leaf.to_string()]),
        "{top} without {leaf}: {:?}",
        r.list_findings
    );
}

/// The report names the release and carries the credit the HPO licence asks
/// for (https://hpo.jax.org/app/license: credit the consortium, show the
/// release version); study dates do not apply to a one-release vocabulary.
#[test]
fn the_report_credits_hpo_and_names_its_release() {
    let i = hpo();
    let r = check(&i, "HP:0001250\tSeizure\nhp_0001250\nHP:12\n", &opts());
    assert!(r.index.notice.contains("Human Phenotype Ontology"));
    assert!(r.index.notice.contains("2025-01-16"));
    assert!(r.options.single_release);
    assert_eq!(r.entries[0].status, Status::Valid);
    assert_eq!(r.entries[0].system.as_deref(), Some("hpo"));
    assert_eq!(r.entries[1].code.as_deref(), Some("HP:0001250"));
    assert_eq!(r.entries[2].status, Status::Malformed);
    let text = rollcall::render::text(&r);
    assert!(text.contains("Human Phenotype Ontology (HPO), release 2025-01-16"));
    assert!(text.contains("study dates do not apply"));
}

/// A term reaches itself and every term under it: comparing HP:0001638
/// (Cardiomyopathy) with the list of those terms agrees fully, and with
/// them all but itself differs by exactly it. The terms under it come from
/// the file's `is_a` lines.
#[test]
fn a_term_reaches_everything_under_it_in_a_comparison() {
    let file = stanzas();
    let mut under: BTreeSet<&str> = BTreeSet::from(["HP:0001638"]);
    loop {
        let more: Vec<&str> = file
            .values()
            .filter(|s| {
                !under.contains(s.id.as_str()) && s.is_a.iter().any(|p| under.contains(p.as_str()))
            })
            .map(|s| s.id.as_str())
            .collect();
        if more.is_empty() {
            break;
        }
        under.extend(more);
    }
    assert!(under.len() > 10, "{under:?}");
    let i = hpo();
    let all: String = under.iter().map(|c| format!("{c}\n")).collect();
    let c = rollcall::compare(&i, ("a", "HP:0001638\n"), ("b", &all), &opts());
    assert_eq!(c.agreement.both, under.len());
    assert_eq!(c.agreement.jaccard, 1.0);
    // Every term under it listed, but not the term itself: only it differs.
    let fewer: String = under
        .iter()
        .filter(|c| **c != "HP:0001638")
        .map(|c| format!("{c}\n"))
        .collect();
    let c = rollcall::compare(&i, ("a", "HP:0001638\n"), ("b", &fewer), &opts());
    assert_eq!((c.agreement.only_a, c.agreement.only_b), (1, 0));
    assert_eq!(c.differences[0].code, "HP:0001638");
}

/// HPO rows in an ICD-10-CM list with a system column are checked against
/// the HPO release (as of it), the ICD-10-CM rows over the study period;
/// the per-system part carries the HPO credit. E11.9 is billable in FY2024
/// (icd10cm-codes-FY2024.txt); HP:0001425 is obsolete (the OBO file).
#[test]
fn hpo_rows_of_a_mixed_list_are_checked_against_the_release() {
    use rollcall::mixed::{check_list, Primary};
    let cm = common::index();
    let h = hpo();
    let text = "system\tcode\nICD-10-CM\tE11.9\nHPO\tHP:0001250\nhttp://purl.obolibrary.org/obo/hp.owl\tHP:0001425\n";
    let opts = CheckOptions {
        from: Date::parse("2023-10-01").unwrap(),
        to: Date::parse("2024-09-30").unwrap(),
        billable: true,
    };
    let r = check_list(Primary::Index(&cm), &[&h], text, &opts);
    let status: Vec<(Option<&str>, Status)> = r.entries[1..]
        .iter()
        .map(|e| (e.system.as_deref(), e.status))
        .collect();
    assert_eq!(
        status,
        [
            (Some("icd10cm"), Status::Valid),
            (Some("hpo"), Status::Valid),
            (Some("hpo"), Status::Retired)
        ]
    );
    let part = r
        .summary
        .by_system
        .iter()
        .find(|p| p.system == "hpo")
        .unwrap();
    assert_eq!(part.release.as_deref(), Some("2025-01-16"));
    assert!(part.notice.contains("Human Phenotype Ontology"));
}

/// A term in use with a `consider` line (HP:0041161 in the file, consider
/// HP:0020110) gets a note suggesting it.
#[test]
fn a_term_in_use_with_a_term_to_consider_gets_a_note() {
    let file = stanzas();
    let s = &file["HP:0041161"];
    assert!(!s.obsolete);
    let r = check(&hpo(), "HP:0041161\n", &opts());
    let e = &r.entries[0];
    assert_eq!(e.status, Status::Valid);
    let f = e
        .findings
        .iter()
        .find(|f| f.kind == Kind::ReleaseStatus)
        .unwrap();
    let named: Vec<&str> = f.suggestions.iter().map(|x| x.code.as_str()).collect();
    assert_eq!(
        named,
        s.consider.iter().map(String::as_str).collect::<Vec<_>>()
    );
}

/// Source: the `is_a`, `replaced_by`, `consider` and `alt_id` lines of the
/// release file: for every term, a card's parents are the file's `is_a`
/// and its children their inverse; an obsolete term's card names its
/// replacement and the terms to consider, a term's card its alternate ids.
#[test]
fn cards_give_the_files_parents_children_and_obsolete_links() {
    use rollcall::card;
    let file = stanzas();
    let i = hpo();
    let v = i.view();
    let day = v.meta().coverage_from;
    let mut kids: BTreeMap<&str, BTreeSet<String>> = BTreeMap::new();
    for (id, s) in &file {
        for p in &s.is_a {
            kids.entry(p.as_str()).or_default().insert(id.clone());
        }
    }
    for (id, s) in &file {
        let o = v.ordinal(id).unwrap();
        let parents: BTreeSet<String> = card::parents_on(&v, o, day)
            .into_iter()
            .map(|p| v.code(p))
            .collect();
        assert_eq!(parents, s.is_a, "parents of {id}");
        let children: BTreeSet<String> = card::children_on(&v, o, day)
            .into_iter()
            .map(|c| v.code(c))
            .collect();
        assert_eq!(
            children,
            kids.remove(id.as_str()).unwrap_or_default(),
            "children of {id}"
        );
    }
    // Whole cards of a few terms. From the file: HP:0001425 "obsolete
    // Heterogeneous", replaced_by HP:0000005, which lists it as an alt_id.
    let c = card::cards(
        &i,
        &[],
        &["HP:0001425", "HP:0000005", "HP:0001250"],
        &opts(),
    );
    let obsolete = &c.cards[0];
    assert_eq!(obsolete.status, "obsolete");
    let replaced: Vec<&str> = obsolete
        .successors
        .iter()
        .map(|s| s.code.as_str())
        .collect();
    let want: Vec<&str> = file["HP:0001425"]
        .replaced_by
        .iter()
        .map(String::as_str)
        .collect();
    assert_eq!(replaced, want);
    let consider: Vec<&str> = obsolete.consider.iter().map(|s| s.code.as_str()).collect();
    let want: Vec<&str> = file["HP:0001425"]
        .consider
        .iter()
        .map(String::as_str)
        .collect();
    assert_eq!(consider, want);
    let alts: BTreeSet<&str> = c.cards[1]
        .alternate_ids
        .iter()
        .map(String::as_str)
        .collect();
    let want: BTreeSet<&str> = file["HP:0000005"]
        .alt_ids
        .iter()
        .map(String::as_str)
        .collect();
    assert_eq!(alts, want);
    // Seizure (HP:0001250): its parents are the file's is_a, in a card.
    let seizure = &c.cards[2];
    assert_eq!(seizure.status, "in-use");
    let parents: BTreeSet<String> = seizure.parents.iter().map(|p| p.code.clone()).collect();
    assert_eq!(parents, file["HP:0001250"].is_a);
}

/// Source: the `synonym:` lines of the release file: every term's
/// synonyms in the index are the quoted text of its lines, in file order
/// (23,519 lines in the file), and the card of HP:0001658 "Myocardial
/// infarction" shows its two, "Heart attack" and "MI".
#[test]
fn every_terms_synonyms_are_the_files_synonym_lines() {
    use rollcall::card;
    let file = stanzas();
    let total: usize = file.values().map(|s| s.synonyms.len()).sum();
    assert_eq!(total, 23_519);
    let i = hpo();
    let v = i.view();
    for (id, s) in &file {
        let o = v.ordinal(id).unwrap();
        assert_eq!(v.synonyms(o), s.synonyms, "{id}");
    }
    let want = &file["HP:0001658"].synonyms;
    assert_eq!(want, &["Heart attack", "MI"]);
    let c = card::cards(&i, &[], &["HP:0001658"], &opts());
    let mi = &c.cards[0];
    assert_eq!(&mi.synonyms, want);
    let json = serde_json::to_value(mi).unwrap();
    assert_eq!(json["synonyms"], serde_json::json!(["Heart attack", "MI"]));
    let text = rollcall::render::card::cards_text(&c);
    assert!(
        text.contains("  synonyms:\n    Heart attack\n    MI\n"),
        "{text}"
    );
}
