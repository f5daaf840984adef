//! How written forms are read. The forms are common practice in hand-made
//! lists (no outside source); the codes are real ones of the bundled index.

mod common;

use common::*;
use rollcall::{check, Kind, Status};

fn read(text: &str) -> Vec<(Option<String>, Vec<String>)> {
    let index = index();
    let r = check(&index, text, &on("2026-01-01"));
    r.entries
        .iter()
        .map(|e| {
            let notes = e
                .findings
                .iter()
                .filter(|f| f.kind == Kind::Normalized)
                .map(|f| f.message.clone())
                .collect();
            (e.code.clone(), notes)
        })
        .collect()
}

#[test]
fn case_dots_and_letters_for_digits() {
    let got = read("e11.9\nE119\nE1.19\nE11..9\nI1O\nE11.9\n0IO\n");
    let want = [
        ("E11.9", "upper case"),
        ("E11.9", "dot added"),
        ("E11.9", "dot moved"),
        ("E11.9", "extra dots removed"),
        ("I10", "letter O read as zero"),
    ];
    for (i, (code, note)) in want.iter().enumerate() {
        assert_eq!(got[i].0.as_deref(), Some(*code), "line {}", i + 1);
        assert!(
            got[i].1.iter().any(|m| m.contains(note)),
            "line {}: {:?}",
            i + 1,
            got[i].1
        );
    }
    assert!(got[5].1.is_empty(), "the official form gets no note");
    // O10 (pre-existing hypertension in pregnancy) written with a zero and an I.
    assert_eq!(got[6].0.as_deref(), Some("O10"));
}

#[test]
fn an_undotted_list_is_not_told_about_dots() {
    let got = read("E119\nI10\nE1165\n");
    assert!(got.iter().all(|(_, n)| n.is_empty()), "{got:?}");
}

#[test]
fn impossible_characters_and_shapes_are_malformed() {
    let index = index();
    let r = check(&index, "E11/9\nT2DM\nE11.9\n250.00\n", &on("2026-01-01"));
    assert_eq!(r.entries[0].status, Status::Malformed);
    assert!(r.entries[0].findings[0].message.contains("\"/\""));
    assert_eq!(r.entries[1].status, Status::Malformed);
    assert_eq!(r.entries[2].status, Status::Valid);
    // 250.00 has the ICD-9-CM shape (CMS version 32 code file: 25000,
    // diabetes mellitus without complication): another system, not malformed.
    assert_eq!(r.entries[3].status, Status::OtherSystem);
    assert_eq!(r.entries[3].system.as_deref(), Some("icd9cm"));
    assert_eq!(r.summary.systems.get("icd10cm"), Some(&1));
}

/// Source: the FY2024 ICD-10-CM code file's descriptions: I10 "Essential
/// (primary) hypertension", I11.9 "Hypertensive heart disease without heart
/// failure". "I1O" is read as I10 (a letter O for a zero, common practice),
/// and when the label names what I11.9 is, the code one character from what
/// was typed is offered beside the reading; a label that fits I10 gets the
/// reading alone.
#[test]
fn a_letter_read_as_a_digit_still_offers_the_code_the_label_names() {
    let index = index();
    let r = check(
        &index,
        "I1O\thypertensive heart disease without heart failure\nI1O\tessential hypertension\n",
        &on("2024-01-01"),
    );
    let offered = |i: usize| -> Vec<String> {
        let f = r.entries[i]
            .findings
            .iter()
            .find(|f| f.kind == Kind::Normalized)
            .expect("a normalized note");
        f.suggestions.iter().map(|s| s.code.clone()).collect()
    };
    assert_eq!(r.entries[0].code.as_deref(), Some("I10"));
    let first = offered(0);
    assert_eq!(first[0], "I10");
    assert!(first.contains(&"I11.9".to_string()), "{first:?}");
    assert_eq!(offered(1), ["I10"]);
}
