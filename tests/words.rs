//! Labels and word search against the official descriptions: the label
//! check (`label-mismatch`, `label-unrecognised`, label-driven suggestions)
//! and `search::find`.

mod common;

use common::*;
use rollcall::report::Entry;
use rollcall::{check, Kind};
use std::collections::BTreeMap;

/// Code → description from the official CMS code-description file for FY2024
/// (vocab-build/sources/icd10cm-codes-FY2024.txt.gz: code, spaces, description).
fn fy2024() -> BTreeMap<String, String> {
    source("icd10cm-codes-FY2024.txt.gz")
        .lines()
        .filter_map(|l| {
            let (code, desc) = l.split_once(' ')?;
            Some((code.to_string(), desc.trim().to_string()))
        })
        .collect()
}

fn dotted(code: &str) -> String {
    if code.len() > 3 {
        format!("{}.{}", &code[..3], &code[3..])
    } else {
        code.to_string()
    }
}

fn mismatch(e: &Entry) -> Option<&rollcall::Finding> {
    e.findings.iter().find(|f| f.kind == Kind::LabelMismatch)
}

/// Source: the FY2024 code-description file: every 40th of its 74,044 codes
/// (1,852 codes), each with its own official description as the label, gets
/// no label-mismatch (the index's descriptions are newer, so some wording
/// has changed since; the older wording is still one of the code's wordings).
#[test]
fn official_descriptions_fit_their_codes() {
    let d = fy2024();
    assert_eq!(
        d.len(),
        74_044,
        "FY2024 codes (as tests/official.rs counts them)"
    );
    let list: String = d
        .iter()
        .step_by(40)
        .map(|(c, t)| format!("{}\t{t}\n", dotted(c)))
        .collect();
    let r = check(&index(), &list, &on("2024-01-01"));
    let bad: Vec<_> = r
        .entries
        .iter()
        .filter(|e| mismatch(e).is_some())
        .map(|e| e.input.clone())
        .collect();
    assert_eq!(r.summary.entries, 1_852);
    assert!(
        bad.is_empty(),
        "{} mismatches: {:?}",
        bad.len(),
        &bad[..bad.len().min(5)]
    );
}

/// Source: the FY2024 code-description file. Each pair is a code written
/// beside the official description of a sibling (same category); the check
/// names the mismatch and suggests the sibling first.
#[test]
fn a_sibling_s_description_suggests_the_sibling_first() {
    let d = fy2024();
    for (written, meant) in [
        ("E119", "E1165"),  // without complications / with hyperglycemia
        ("I5032", "I5022"), // chronic diastolic / chronic systolic heart failure
        ("J441", "J440"),   // COPD with exacerbation / with acute lower respiratory infection
        ("N183", "N184"),   // not billable in 2024 (N18.3 split); stage 3 / stage 4
        ("K5090", "K5190"), // Crohn's / ulcerative colitis, unspecified, another category
    ] {
        let label = &d[meant];
        let r = check(
            &index(),
            &format!("{}\t{label}\n", dotted(written)),
            &on("2024-01-01"),
        );
        let e = &r.entries[0];
        let f = mismatch(e).unwrap_or_else(|| panic!("{written} with \"{label}\": no mismatch"));
        assert_eq!(f.severity, rollcall::Severity::Warning);
        assert!(f.message.contains(label.as_str()), "{}", f.message);
        assert_eq!(
            f.suggestions.first().map(|s| s.code.clone()),
            Some(dotted(meant)),
            "{written} with \"{label}\": {:?}",
            f.suggestions
        );
    }
}

/// Common practice: a label of no clinical words fits nothing, so rollcall
/// cannot say it contradicts the code: a `label-unrecognised` note that
/// suggests no code rather than a wrong one.
#[test]
fn a_nonsense_label_gets_a_note_without_suggestions() {
    for label in [
        "purple monkey dishwasher",
        "lorem ipsum dolor sit amet",
        "qwzx vrbl",
    ] {
        let r = check(&index(), &format!("I10\t{label}\n"), &on("2024-01-01"));
        assert!(mismatch(&r.entries[0]).is_none(), "{label}");
        let f = r.entries[0]
            .findings
            .iter()
            .find(|f| f.kind == Kind::LabelUnrecognised)
            .expect("a label-unrecognised note");
        assert_eq!(f.severity, rollcall::Severity::Info);
        assert!(f.suggestions.is_empty(), "{label}: {:?}", f.suggestions);
        assert!(f.message.contains("no code fits it well"), "{}", f.message);
    }
}

/// Source: the FY2024 code-description file. A label in other words than the
/// official ones (an abbreviation from the README's table, a shortened
/// label, an inclusion term of the CDC tabular 2026-04-01: "high blood
/// pressure" under I10) still fits.
#[test]
fn abbreviations_and_inclusion_terms_fit() {
    let text = "E11.9\tType 2 DM w/o complications\nI10\tHTN\nI10\thigh blood pressure\n\
                E11.65\tType 2 diabetes with hyperglycemia\nN18.4\tCKD stage 4\n";
    let r = check(&index(), text, &on("2024-01-01"));
    for e in &r.entries {
        assert!(mismatch(e).is_none(), "{}: {:?}", e.input, mismatch(e));
    }
}

/// Source: the FY2024 code-description file. A mistyped code (unknown, or
/// an ICD-9-CM code, reported as another system's code here) with the
/// official label of the code meant gets that code as its first suggestion.
#[test]
fn the_label_drives_suggestions_for_unknown_and_malformed_codes() {
    let d = fy2024();
    for (written, meant) in [
        ("E11.56", "E1165"),
        ("I50.99", "I5022"),
        ("250.00", "E119"),
        ("J44", "J449"),
    ] {
        let label = &d[meant];
        let r = check(
            &index(),
            &format!("{written}\t{label}\n"),
            &on("2024-01-01"),
        );
        let f = r.entries[0]
            .findings
            .iter()
            .find(|f| {
                matches!(
                    f.kind,
                    Kind::Unknown | Kind::Malformed | Kind::OtherSystem | Kind::Header
                )
            })
            .unwrap_or_else(|| panic!("{written}: {:?}", r.entries[0].findings));
        if f.kind == Kind::Header {
            // J44 is a header; its label names a billable code under it.
            let m = mismatch(&r.entries[0]).expect("a mismatch for the header");
            assert_eq!(m.suggestions[0].code, dotted(meant));
            continue;
        }
        assert_eq!(
            f.suggestions.first().map(|s| s.code.clone()),
            Some(dotted(meant)),
            "{written} with \"{label}\": {:?}",
            f.suggestions
        );
    }
}

/// Source: the FY2024 code-description file: for every 97th code, a search
/// with its official description finds it first or among the first three
/// (at least 95% of them; the README's evaluation has the full figures).
#[test]
fn a_search_for_an_official_description_finds_its_code() {
    let d = fy2024();
    let index = index();
    let v = index.view();
    let (mut first, mut top3, mut n) = (0, 0, 0);
    for (code, desc) in d.iter().step_by(97) {
        let found = rollcall::search::find(&v, desc, day("2024-01-01"), 3, false);
        let pos = found.iter().position(|f| f.code == dotted(code));
        first += usize::from(pos == Some(0));
        top3 += usize::from(pos.is_some());
        n += 1;
    }
    assert!(top3 * 100 >= n * 95, "top-3 {top3} of {n}");
    assert!(first * 100 >= n * 80, "top-1 {first} of {n}");
}

/// Source: AHRQ Elixhauser Comorbidity Software Refined v2026.1 (tests/data):
/// its description column holds official descriptions of FY2016-FY2026
/// releases, so the label check finds no mismatch in its 4,690 rows.
#[test]
fn the_elixhauser_descriptions_fit_their_codes() {
    let r = check(&index(), &elixhauser(), &period("2015-10-01", "2026-09-30"));
    let labelled = r.entries.iter().filter(|e| e.label.is_some()).count();
    assert_eq!(labelled, 4_690);
    let bad: Vec<_> = r
        .entries
        .iter()
        .filter(|e| mismatch(e).is_some())
        .map(|e| e.input.clone())
        .collect();
    assert!(bad.is_empty(), "{bad:?}");
}

/// Source: the CDC tabular XML 2026-04-01 (vocab-build/sources): I10
/// "Essential (primary) hypertension", E11.65 "Type 2 diabetes mellitus with
/// hyperglycemia", R73.9 "Hyperglycemia, unspecified". Misspelt words
/// (letters swapped, British spelling) and a half-typed last word still find them.
#[test]
fn misspelt_and_half_typed_words_find_the_code() {
    let index = index();
    let v = index.view();
    let first = |q: &str, typing: bool| {
        rollcall::search::find(&v, q, day("2026-01-01"), 5, typing)
            .first()
            .map(|f| f.code.clone())
    };
    assert_eq!(
        first("essential hypertensoin", false).as_deref(),
        Some("I10")
    );
    assert_eq!(
        first("hyperglycaemia unspecified", false).as_deref(),
        Some("R73.9")
    );
    assert_eq!(
        first("type 2 diabetes with hypergl", true).as_deref(),
        Some("E11.65")
    );
    // Without the prefix rule the half word matches nothing.
    assert_ne!(
        first("type 2 diabetes with hypergl", false).as_deref(),
        Some("E11.65")
    );
    assert!(rollcall::search::find(&v, "qqqq zzzz", day("2026-01-01"), 5, true).is_empty());
}
