//! The index and the checker against the official files and published counts.

mod common;

use common::*;
use rollcall::{check, Kind, Status};
use std::collections::{BTreeMap, BTreeSet};

fn billable_on(d: &str) -> BTreeSet<String> {
    billable_on_in(&index(), d)
}

fn headers_on(d: &str) -> BTreeSet<String> {
    let index = index();
    let v = index.view();
    let day = day(d);
    (0..v.len() as u32)
        .filter(|&o| v.header(o).any(|p| p.contains(day)))
        .map(|o| v.code(o))
        .collect()
}

/// Source: the official CMS/CDC order file, January 2021 update
/// (icd10cm-order-2021-01.txt): flag 1 rows are billable, flag 0 rows headers.
#[test]
fn billable_and_headers_on_2021_01_15_equal_the_january_2021_order_file() {
    let text = source("icd10cm-order-2021-01.txt.gz");
    let mut bill = BTreeSet::new();
    let mut head = BTreeSet::new();
    for line in text.lines() {
        let code = line[6..13].trim().to_string();
        match &line[14..15] {
            "1" => bill.insert(code),
            _ => head.insert(code),
        };
    }
    assert_eq!(
        bill.len(),
        72_621,
        "order file billable rows (published in the README of the sources)"
    );
    assert_eq!(head.len(), 22_737, "order file header rows");
    assert_eq!(billable_on("2021-01-15"), bill);
    let got = headers_on("2021-01-15");
    let extra: Vec<_> = got.difference(&head).collect();
    let missing: Vec<_> = head.difference(&got).collect();
    assert!(
        extra.is_empty() && missing.is_empty(),
        "extra {extra:?} missing {missing:?}"
    );
}

/// Source: the official CMS code-description file for FY2024
/// (icd10cm-codes-FY2024.txt, 74,044 billable codes).
#[test]
fn billable_set_throughout_fy2024_equals_the_fy2024_code_file() {
    let file: BTreeSet<String> = source("icd10cm-codes-FY2024.txt.gz")
        .lines()
        .filter_map(|l| l.split_whitespace().next().map(str::to_string))
        .collect();
    assert_eq!(file.len(), 74_044);
    assert_eq!(billable_on("2023-10-01"), file);
    assert_eq!(billable_on("2024-09-30"), file);
}

/// Source: ../shared/vocab/README.md, "Billable ICD-10-CM codes valid on a date":
/// 2026-12-01 → 74,879.
#[test]
fn billable_count_on_2026_12_01() {
    assert_eq!(billable_on("2026-12-01").len(), 74_879);
}

/// Source: the added/retired table in ../shared/vocab/README.md (derived from the
/// release history; FY2023 and FY2024 agree with the counts CMS announced).
#[test]
fn added_and_retired_counts_per_effective_date() {
    let expected: &[(&str, usize, usize)] = &[
        ("2016-10-01", 1974, 311),
        ("2017-10-01", 360, 142),
        ("2018-10-01", 279, 51),
        ("2019-10-01", 273, 21),
        ("2020-04-01", 2, 0),
        ("2020-10-01", 488, 58),
        ("2021-01-01", 6, 1),
        ("2021-10-01", 159, 32),
        ("2022-04-01", 3, 1),
        ("2022-10-01", 1176, 287),
        ("2023-04-01", 42, 7),
        ("2023-10-01", 395, 25),
        ("2024-10-01", 252, 36),
        ("2025-10-01", 487, 28),
        ("2026-10-01", 190, 30),
    ];
    let index = index();
    let v = index.view();
    let mut added: BTreeMap<String, usize> = BTreeMap::new();
    let mut retired: BTreeMap<String, usize> = BTreeMap::new();
    let first = v.meta().coverage_from;
    let last = v.meta().coverage_to;
    for o in 0..v.len() as u32 {
        for p in v.billable(o) {
            if p.from != first {
                *added.entry(p.from.to_string()).or_default() += 1;
            }
            if p.to != last {
                *retired.entry(p.to.succ().to_string()).or_default() += 1;
            }
        }
    }
    for &(d, a, r) in expected {
        assert_eq!(added.get(d).copied().unwrap_or(0), a, "added on {d}");
        assert_eq!(
            retired.get(d).copied().unwrap_or(0),
            r,
            "retired the day before {d}"
        );
    }
    assert_eq!(
        added.len(),
        expected.len(),
        "no other effective dates: {added:?}"
    );
}

/// Source: AHRQ Elixhauser Comorbidity Software Refined v2026.1 (as shipped in
/// elixhauser-ahrq 2026.1.3): 4,567 distinct codes, built to span FY2016-FY2026.
#[test]
fn elixhauser_over_its_whole_span_has_no_error() {
    let index = index();
    let r = check(&index, &elixhauser(), &period("2015-10-01", "2026-09-30"));
    let errors: Vec<_> = r
        .entries
        .iter()
        .filter(|e| {
            e.findings
                .iter()
                .any(|f| f.severity == rollcall::Severity::Error)
        })
        .map(|e| (e.line, e.input.clone()))
        .collect();
    assert!(errors.is_empty(), "{errors:?}");
    assert_eq!(r.summary.lines, 4_691);
    assert_eq!(r.entries[0].status, Status::ColumnHeadings);
    let distinct: BTreeSet<_> = r.entries.iter().filter_map(|e| e.code.clone()).collect();
    assert_eq!(distinct.len(), 4_567);
}

/// Source: as above; the 101 codes not billable on 2026-01-01 are 98 codes
/// subdivided earlier (e.g. C43.11 into C43.111 and C43.112 on 2018-10-01) and
/// I60.20-I60.22, retired 2016-09-30 with I60.2 as successor (conversion table).
#[test]
fn elixhauser_on_2026_01_01_headers_and_retired() {
    let index = index();
    let r = check(&index, &elixhauser(), &on("2026-01-01"));
    let with = |k: Kind| -> BTreeSet<String> {
        r.entries
            .iter()
            .filter(|e| e.findings.iter().any(|f| f.kind == k))
            .filter_map(|e| e.code.clone())
            .collect()
    };
    let headers = with(Kind::Header);
    assert_eq!(headers.len(), 98);
    assert!(headers.contains("C43.11"));
    let v = index.view();
    for h in &headers {
        let o = v.ordinal(&h.replace('.', "")).unwrap();
        assert!(v.billable(o).next().is_some(), "{h} was billable earlier");
    }
    let c4311 = r
        .entries
        .iter()
        .find(|e| e.code.as_deref() == Some("C43.11"))
        .unwrap();
    assert!(
        c4311.findings[0]
            .message
            .contains("billable until 2018-09-30"),
        "{}",
        c4311.findings[0].message
    );
    assert_eq!(
        with(Kind::Retired),
        BTreeSet::from(["I60.20".into(), "I60.21".into(), "I60.22".into()])
    );
    for e in r.entries.iter().filter(|e| e.status == Status::Retired) {
        let f = &e.findings[0];
        assert!(f.message.contains("2016-09-30"));
        assert_eq!(
            f.suggestions
                .iter()
                .map(|s| s.code.as_str())
                .collect::<Vec<_>>(),
            ["I60.2"]
        );
    }
    assert!(with(Kind::Unknown).is_empty() && with(Kind::Malformed).is_empty());
}

/// Source: ../shared/vocab/README.md: since 2025-10-01 codes such as QA00101
/// have a letter in the second place; shapes come from the data.
#[test]
fn codes_with_a_letter_second_are_known_from_2025_10_01() {
    let index = index();
    let v = index.view();
    let o = v.ordinal("QA00101").expect("QA00101 in the index");
    assert_eq!(v.billable(o).next().unwrap().from, day("2025-10-01"));
    let r = check(&index, "QA0.0101\nQA00101\n", &on("2026-01-01"));
    assert_eq!(r.entries[1].status, Status::Valid);
    assert_eq!(r.entries[1].code.as_deref(), Some("QA0.0101"));
}

/// Source: the CDC tabular XML (2026-04-01): `H21.1X` and `T36.0X` are real
/// headers (`<diag placeholder="true">` nodes), while in S00.00XA the X only
/// pads the code to six characters before the 7th (there is no S00.00X node).
#[test]
fn placeholder_headers_come_from_the_tabular_list() {
    let index = index();
    let v = index.view();
    let h211x = v.ordinal("H211X").expect("H21.1X is a node");
    assert!(v.header(h211x).any(|p| p.contains(day("2026-01-01"))));
    let t = v.ordinal("T360X1A").unwrap();
    let parent = v.parent(t).unwrap();
    assert_eq!(v.code(parent), "T360X1");
    assert_eq!(v.code(v.parent(parent).unwrap()), "T360X");
    let s = v.ordinal("S0000XA").unwrap();
    assert!(v.ordinal("S0000X").is_none());
    assert_eq!(v.code(v.parent(s).unwrap()), "S0000");
}

/// Source: the release history file, whose 190 codes new on 2026-10-01
/// have no description (its provenance notes say so). Each is described by
/// the wording of the nearest code above it, with the day it was added, so
/// no suggestion is a bare code.
#[test]
fn codes_without_wording_are_described_by_the_code_above_them() {
    let history = common::source("icd10cm-history-FY2016-FY2027.tsv.gz");
    let bare: Vec<&str> = history
        .lines()
        .skip(1)
        .filter_map(|l| {
            let f: Vec<&str> = l.split('\t').collect();
            (f.len() >= 4 && f[3].trim().is_empty()).then_some(f[0])
        })
        .collect();
    assert_eq!(bare.len(), 190);
    let index = common::index();
    let v = index.view();
    for code in bare {
        let ord = v.ordinal(code).expect("in the index");
        let d = v.description_or_note(ord);
        assert!(
            d.contains("new on 2026-10-01; its own wording is not in the bundled release files"),
            "{code}: {d}"
        );
        assert!(!d.starts_with('('), "{code}: {d}");
    }
}
