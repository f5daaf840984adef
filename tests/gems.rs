//! The 2015 GEMs kept in the ICD-9-CM index, and translation, against the
//! official GEM files (CMS, icd9cm-to-icd10cm-gem-2015 and
//! icd10cm-to-icd9cm-gem-2015, as CSV).

mod common;

use common::*;
use rollcall::translate::{translate, Outcome};
use rollcall::{check_among, Kind, Status};
use std::collections::BTreeSet;

struct Row {
    source: String,
    target: String,
    flags: String,
}

fn gem_file(name: &str) -> Vec<Row> {
    source(name)
        .lines()
        .skip(1)
        .map(|l| {
            let f: Vec<String> = l
                .split(',')
                .map(|x| x.trim_matches('"').to_string())
                .collect();
            Row {
                source: f[0].clone(),
                target: f[1].clone(),
                flags: f[2].clone(),
            }
        })
        .collect()
}

fn flags_of(r: &rollcall::model::MapRow) -> String {
    let f = r.flags;
    format!(
        "{}{}{}{}{}",
        f.approximate as u8, f.no_map as u8, f.combination as u8, f.scenario, f.choice_list
    )
}

/// Every row of both official files is in the index, with its flags.
/// Source: ../shared/vocab/README.md row counts (23,912 forward, 78,838 backward).
#[test]
fn every_official_row_is_kept_with_its_flags() {
    let index = icd9_index();
    let v = index.view();
    for (file, from, to, n) in [
        (
            "icd9cm-to-icd10cm-gem-2015.csv.gz",
            "icd9cm",
            "icd10cm",
            23_912,
        ),
        (
            "icd10cm-to-icd9cm-gem-2015.csv.gz",
            "icd10cm",
            "icd9cm",
            78_838,
        ),
    ] {
        let rows = gem_file(file);
        assert_eq!(rows.len(), n, "{file}");
        let m = v.mapping(from, to).expect("mapping kept");
        let kept = m.rows();
        assert_eq!(kept.len(), n);
        let want: BTreeSet<(String, String, String)> = rows
            .into_iter()
            .map(|r| (r.source, r.target, r.flags))
            .collect();
        let got: BTreeSet<(String, String, String)> = kept
            .iter()
            .map(|r| (r.source.clone(), r.target.clone(), flags_of(r)))
            .collect();
        assert_eq!(got, want, "{file}");
    }
}

/// Source: ../shared/vocab/README.md: the 2015 GEMs name 9 ICD-10-CM codes
/// that were dropped before FY2016 (so no release from 2015-10-01 has them).
#[test]
fn nine_gem_targets_are_in_no_icd10cm_release() {
    let cm = index();
    let v = cm.view();
    let mut codes: BTreeSet<String> = gem_file("icd9cm-to-icd10cm-gem-2015.csv.gz")
        .into_iter()
        .map(|r| r.target)
        .collect();
    codes.extend(
        gem_file("icd10cm-to-icd9cm-gem-2015.csv.gz")
            .into_iter()
            .map(|r| r.source),
    );
    codes.remove("NoDx");
    let missing: Vec<&String> = codes.iter().filter(|c| v.ordinal(c).is_none()).collect();
    assert_eq!(missing.len(), 9, "{missing:?}");
}

/// Rows of the official forward file: 0020 -> A0100 approximate (10000);
/// V5867 -> Z794 exact (00000); a no-map row (flags 11000) and a combination
/// row (flags 1x1..), taken from the file itself.
#[test]
fn translation_follows_the_official_rows() {
    let (i9, cm) = (icd9_index(), index());
    let rows = gem_file("icd9cm-to-icd10cm-gem-2015.csv.gz");
    let no_map = rows
        .iter()
        .find(|r| r.flags == "11000")
        .expect("a no-map row");
    let comb = rows
        .iter()
        .find(|r| r.flags.as_bytes()[2] == b'1')
        .expect("a combination row");
    let comb_targets: Vec<&str> = rows
        .iter()
        .filter(|r| r.source == comb.source)
        .map(|r| r.target.as_str())
        .collect();
    let list = format!("0020\nV58.67\n{}\n{}\nE11.9\n", no_map.source, comb.source);
    let t = translate(&i9, &cm, &list, &period("2016-01-01", "2016-12-31")).unwrap();
    assert_eq!(t.entries[0].outcome, Outcome::Approximate);
    assert_eq!(t.entries[0].targets[0].code, "A01.00");
    assert_eq!(t.entries[1].outcome, Outcome::Exact);
    assert_eq!(t.entries[1].targets[0].code, "Z79.4");
    assert_eq!(t.entries[1].targets[0].status, "valid");
    assert_eq!(t.entries[2].outcome, Outcome::NoMap);
    assert!(t.entries[2].targets.is_empty());
    assert_eq!(t.entries[3].outcome, Outcome::Combination);
    let got: Vec<String> = t.entries[3]
        .targets
        .iter()
        .map(|x| x.code.replace('.', ""))
        .collect();
    assert_eq!(got, comb_targets);
    assert_eq!(t.entries[4].outcome, Outcome::NotInSource);

    // And back: E11.9 to 250.00 (backward file: E119 -> 25000).
    let back = translate(&cm, &i9, "E11.9\n", &on("2015-01-01")).unwrap();
    assert!(back.entries[0].targets.iter().any(|x| x.code == "250.00"));
}

/// An ICD-9-CM code in an ICD-10-CM list: other-system, with the GEM
/// targets as suggestions (forward file: 25000 -> E119, approximate).
#[test]
fn an_old_code_in_a_new_list_gets_its_gem_targets() {
    let (i9, cm) = (icd9_index(), index());
    let r = check_among(&cm, &[i9.view()], "250.00\nE88.00\n", &on("2020-01-01"));
    let e = &r.entries[0];
    assert_eq!(e.status, Status::OtherSystem);
    assert_eq!(e.system.as_deref(), Some("icd9cm"));
    let f = &e.findings[0];
    assert_eq!(f.kind, Kind::OtherSystem);
    assert_eq!(f.suggestions[0].code, "E11.9");
    assert!(f.suggestions[0].reason.contains("approximate"));
    // E88.00 is dotted the ICD-10-CM way: not read as the ICD-9-CM E880.0.
    assert_ne!(r.entries[1].system.as_deref(), Some("icd9cm"));
}

/// A code written the same way in both systems: V10.3 is an ICD-10-CM
/// header (pedal cycle rider boarding or alighting, injured in a collision
/// with a pedestrian or animal; FY2024 code file: V10.3XXA) and the
/// ICD-9-CM code V10.3, "Personal history of malignant neoplasm of breast"
/// (CMS32_DESC_LONG_DX.txt, V103). It is checked as ICD-10-CM, the list's
/// system, with a note naming the other reading; E11.9, no ICD-9-CM code,
/// gets none.
#[test]
fn a_code_of_both_systems_is_checked_in_the_lists_and_the_other_named() {
    let (i9, cm) = (icd9_index(), index());
    let r = check_among(&cm, &[i9.view()], "V10.3\nE11.9\n", &on("2024-01-01"));
    let e = &r.entries[0];
    assert_eq!(e.status, Status::Header);
    let f = e
        .findings
        .iter()
        .find(|f| f.kind == Kind::TwoSystems)
        .expect("a two-systems note");
    assert!(f.message.contains("ICD-9-CM"), "{}", f.message);
    assert!(
        f.message
            .contains("Personal history of malignant neoplasm of breast"),
        "{}",
        f.message
    );
    assert!(!r.entries[1]
        .findings
        .iter()
        .any(|f| f.kind == Kind::TwoSystems));
}

/// The reverse: an ICD-10-CM code in an ICD-9-CM list, with the ICD-10-CM
/// index at hand, gets its backward GEM targets, which live in the ICD-9-CM
/// index (2015 backward GEMs: "E119","25000","10000", approximate).
#[test]
fn a_new_code_in_an_old_list_gets_its_backward_gem_targets() {
    let (i9, cm) = (icd9_index(), index());
    let r = check_among(&i9, &[cm.view()], "E11.9\n", &on("2014-12-01"));
    let e = &r.entries[0];
    assert_eq!(e.status, Status::OtherSystem);
    assert_eq!(e.system.as_deref(), Some("icd10cm"));
    let f = &e.findings[0];
    assert!(f.message.contains("ICD-10-CM to ICD-9-CM"), "{}", f.message);
    assert_eq!(f.suggestions[0].code, "250.00");
    assert!(f.suggestions[0].reason.contains("approximate"));
}

/// compare names an old code in either list as check does (2015 GEMs:
/// 25000 -> E119), and such a line reaches nothing in ICD-10-CM.
#[test]
fn compare_checks_with_the_icd9_index_at_hand() {
    let (i9, cm) = (icd9_index(), index());
    let c = rollcall::compare::compare_among(
        &cm,
        &[i9.view()],
        ("a", "250.00\n"),
        ("b", "E11.9\n"),
        &on("2020-01-01"),
    );
    assert_eq!(c.a.report.entries[0].status, Status::OtherSystem);
    assert_eq!(
        c.a.report.entries[0].findings[0].suggestions[0].code,
        "E11.9"
    );
    assert_eq!((c.agreement.only_a, c.agreement.only_b), (0, 1));
}

/// The targets the official forward file gives a source code, undotted.
fn forward_targets(source: &str) -> Vec<String> {
    gem_file("icd9cm-to-icd10cm-gem-2015.csv.gz")
        .into_iter()
        .filter(|r| r.source == source)
        .map(|r| r.target)
        .collect()
}

/// An ICD-9-CM code reads alike on a line of a plain list, in a CSV and in
/// markdown drafts: a code of another system in the list's ICD-10-CM, with
/// its GEM targets (icd9cm-to-icd10cm-gem-2015.csv, line 5848:
/// "4280","I509","10000", approximate), not a code checked in ICD-9-CM's
/// own index, where it would be only retired.
#[test]
fn an_icd9_code_reads_alike_in_a_plain_list_a_table_and_a_draft() {
    let (i9, cm) = (icd9_index(), index());
    assert_eq!(forward_targets("4280"), ["I509"]);
    let read = |text: &str| {
        rollcall::mixed::check_list(
            rollcall::mixed::Primary::Index(&cm),
            &[&i9],
            text,
            &period("2019-01-01", "2024-12-31"),
        )
    };
    let plain = read("428.0\n");
    let e = &plain.entries[0];
    assert_eq!(e.status, Status::OtherSystem);
    assert_eq!(e.system.as_deref(), Some("icd9cm"));
    let f = &e.findings[0];
    let offered: Vec<&str> = f.suggestions.iter().map(|s| s.code.as_str()).collect();
    assert_eq!(offered, ["I50.9"]);
    assert!(f.suggestions[0].reason.contains("approximate"));
    for text in [
        "code,label\n428.0,\"Congestive heart failure, unspecified\"\n",
        "- 428.0 Congestive heart failure, unspecified\n",
        "## Heart failure\n\n1. **428.0** (Congestive heart failure, unspecified)\n",
    ] {
        let r = read(text);
        let e = r
            .entries
            .iter()
            .find(|e| e.code.is_some())
            .expect("an entry");
        assert_eq!(e.status, Status::OtherSystem, "{text}");
        assert_eq!(e.system.as_deref(), Some("icd9cm"), "{text}");
        assert_eq!(e.findings, plain.entries[0].findings, "{text}");
        assert!(r.summary.by_system.is_empty(), "{text}");
    }
}

/// A retired ICD-9-CM code checked in ICD-9-CM, with ICD-10-CM at hand,
/// is offered its GEM targets, whose rows say what to code its data as
/// after 2015-09-30 (icd9cm-to-icd10cm-gem-2015.csv, line 5848: 4280 to
/// I509, approximate); without ICD-10-CM at hand nothing is offered, as
/// the final ICD-9-CM release has no code in use after that day.
#[test]
fn a_retired_icd9_code_is_offered_its_gem_targets() {
    let (i9, cm) = (icd9_index(), index());
    let check = |others: &[&rollcall::Index<Vec<u8>>], from: &str, to: &str| {
        rollcall::mixed::check_list(
            rollcall::mixed::Primary::Index(&i9),
            others,
            "428.0\n",
            &period(from, to),
        )
    };
    let r = check(&[&cm], "2019-01-01", "2024-12-31");
    let e = &r.entries[0];
    assert_eq!(e.status, Status::Retired);
    let f = &e.findings[0];
    assert_eq!(f.kind, Kind::Retired);
    assert!(
        f.message.contains("2015-09-30") && f.message.contains("ICD-9-CM to ICD-10-CM"),
        "{}",
        f.message
    );
    let offered: Vec<String> = f
        .suggestions
        .iter()
        .map(|s| s.code.replace('.', ""))
        .collect();
    assert_eq!(offered, forward_targets("4280"));
    assert!(f.suggestions[0].reason.contains("approximate"));
    // A period that ICD-9-CM's last day cuts: its retired part is mapped.
    let r = check(&[&cm], "2015-01-01", "2016-12-31");
    let f = &r.entries[0].findings[0];
    assert_eq!(f.kind, Kind::PartialPeriod);
    assert!(f.message.contains("mapped to I50.9"), "{}", f.message);
    assert_eq!(f.suggestions[0].code, "I50.9");
    // Alone, the ICD-9-CM index names nothing.
    let r = check(&[], "2019-01-01", "2024-12-31");
    assert!(r.entries[0].findings[0].suggestions.is_empty());
}

/// A combination row's targets are all offered for a retired ICD-9-CM
/// code, each as the official forward file lists them (the first source
/// with a combination flag, taken from the file itself).
#[test]
fn a_retired_icd9_code_with_a_combination_is_offered_every_target() {
    let (i9, cm) = (icd9_index(), index());
    let rows = gem_file("icd9cm-to-icd10cm-gem-2015.csv.gz");
    let comb = rows
        .iter()
        .find(|r| r.flags.as_bytes()[2] == b'1')
        .expect("a combination row");
    let r = rollcall::mixed::check_list(
        rollcall::mixed::Primary::Index(&i9),
        &[&cm],
        &format!("{}\n", comb.source),
        &period("2019-01-01", "2024-12-31"),
    );
    let f = &r.entries[0].findings[0];
    assert!(f.message.contains("combination"), "{}", f.message);
    let offered: Vec<String> = f
        .suggestions
        .iter()
        .map(|s| s.code.replace('.', ""))
        .collect();
    assert_eq!(offered, forward_targets(&comb.source));
}
