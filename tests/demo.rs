//! The demo list (an invented study, demo-data/demo-list.tsv) has one example of
//! every finding kind; its text and JSON reports are pinned as snapshots.
//! Set UPDATE_SNAPSHOTS=1 to rewrite them after an intended change, then
//! read the diff before committing.

mod common;

use common::*;
use rollcall::{check, render, CheckOptions, Kind};
use std::collections::BTreeSet;

fn demo() -> String {
    std::fs::read_to_string(root().join("demo-data/demo-list.tsv")).unwrap()
}

fn demo_options() -> CheckOptions {
    period("2019-01-01", "2024-12-31")
}

/// The demo report as the CLI makes it: with the ICD-9-CM index (and its
/// GEMs) at hand for the old code on line 12.
fn demo_report(index: &rollcall::Index<Vec<u8>>) -> rollcall::Report {
    let icd9 = icd9_index();
    rollcall::check_among(index, &[icd9.view()], &demo(), &demo_options())
}

fn snapshot(name: &str, got: &str) {
    let path = root().join("tests/snapshots").join(name);
    if std::env::var_os("UPDATE_SNAPSHOTS").is_some() {
        std::fs::write(&path, got).unwrap();
        return;
    }
    let want = std::fs::read_to_string(&path).unwrap_or_default();
    if want != got {
        let first = want
            .lines()
            .zip(got.lines())
            .position(|(a, b)| a != b)
            .unwrap_or(want.lines().count().min(got.lines().count()));
        panic!(
            "{name} differs from the snapshot at line {}:\n  want: {:?}\n  got:  {:?}\n(UPDATE_SNAPSHOTS=1 rewrites it)",
            first + 1,
            want.lines().nth(first),
            got.lines().nth(first)
        );
    }
}

#[test]
fn demo_list_has_every_finding_kind() {
    let index = index();
    let r = check(&index, &demo(), &demo_options());
    let kinds: BTreeSet<Kind> = r
        .entries
        .iter()
        .flat_map(|e| e.findings.iter().map(|f| f.kind))
        .chain(r.list_findings.iter().map(|f| f.kind))
        .collect();
    let all = [
        Kind::Normalized,
        Kind::Malformed,
        Kind::Unknown,
        Kind::Retired,
        Kind::NotYetValid,
        Kind::Header,
        Kind::PartialPeriod,
        Kind::Duplicate,
        Kind::Redundant,
        Kind::RollUp,
        Kind::SiblingGap,
        Kind::Pattern,
        Kind::PatternEmpty,
        Kind::LabelMismatch,
    ];
    for k in all {
        assert!(
            kinds.contains(&k),
            "the demo list has no {} finding",
            k.name()
        );
    }
    assert_eq!(r.summary.lines, demo().lines().count());
    assert_eq!(
        r.entries.len(),
        r.summary.lines,
        "every line is accounted for"
    );
}

#[test]
fn demo_text_report_snapshot() {
    let index = index();
    snapshot("demo.txt", &render::text(&demo_report(&index)));
}

#[test]
fn demo_json_report_snapshot() {
    let index = index();
    let r = demo_report(&index);
    snapshot(
        "demo.json",
        &(serde_json::to_string_pretty(&r).unwrap() + "\n"),
    );
}

#[test]
fn demo_with_billable_required_makes_headers_errors() {
    let index = index();
    let mut o = demo_options();
    o.billable = true;
    let r = check(&index, &demo(), &o);
    let header = r
        .entries
        .iter()
        .find(|e| e.code.as_deref() == Some("I50.2"))
        .unwrap();
    assert_eq!(header.findings[0].severity, rollcall::Severity::Error);
    let plain = check(&index, &demo(), &demo_options());
    assert_eq!(r.summary.errors, plain.summary.errors + 1);
}

#[test]
fn coverage_comes_from_the_same_check() {
    let index = index();
    let opts = on("2026-01-01");
    let text = "I11.0\nI11.9\nE11.9\nE78.*\n";
    let (report, cov) = rollcall::check_with_coverage(&index, text, &opts);
    assert_eq!(report, check(&index, text, &opts));
    let v = index.view();
    let p = opts.period();
    let all = |cat: &str| {
        rollcall::pattern::Pattern::Prefix(cat.into())
            .expand(&v, &p)
            .len() as u32
    };
    let get = |c: &str| cov.iter().find(|x| x.category == c).unwrap();
    assert_eq!((get("I11").included, get("I11").total), (2, 2));
    assert_eq!((get("E11").included, get("E11").total), (1, all("E11")));
    assert_eq!(
        (get("E78").included, get("E78").total),
        (all("E78"), all("E78"))
    );
    assert_eq!(cov.len(), 3);
}

fn demo_pair() -> rollcall::Comparison {
    let read = |f: &str| std::fs::read_to_string(root().join("demo-data").join(f)).unwrap();
    rollcall::compare(
        &index(),
        ("compare-draft.tsv", &read("compare-draft.tsv")),
        ("compare-expert.tsv", &read("compare-expert.tsv")),
        &demo_options(),
    )
}

#[test]
fn demo_comparison_text_snapshot() {
    snapshot("demo-compare.txt", &render::comparison_text(&demo_pair()));
}

#[test]
fn demo_comparison_json_snapshot() {
    snapshot(
        "demo-compare.json",
        &(serde_json::to_string_pretty(&demo_pair()).unwrap() + "\n"),
    );
}

/// The invented genetics-substudy list of HPO terms (demo-data/hpo-phenotypes.tsv)
/// against the bundled HPO release: what each line shows is checked against
/// the release file hp-2025-01-16.obo (HP:0005130 obsolete, replaced_by
/// HP:0001723; HP:0008356 obsolete, an alt_id of HP:0003077 and its consider;
/// HP:0001639 is_a HP:0001638; HP:0004908 an alt_id of HP:0000819, the parent
/// of HP:0005978; HP:0000822 is Hypertension), and the text is pinned.
#[test]
fn hpo_demo_list_snapshot() {
    let bytes = std::fs::read(root().join("vocab/hpo.rcx")).unwrap();
    let index = rollcall::Index::open(bytes).unwrap();
    let text = std::fs::read_to_string(root().join("demo-data/hpo-phenotypes.tsv")).unwrap();
    let r = rollcall::check(&index, &text, &demo_options());
    let kinds = |line: usize| -> Vec<&str> {
        let e = r.entries.iter().find(|e| e.line == line).unwrap();
        e.findings.iter().map(|f| f.kind.name()).collect()
    };
    assert_eq!(kinds(7), ["retired"]);
    assert_eq!(kinds(8), ["retired"]);
    assert_eq!(kinds(6), ["redundant"]);
    assert_eq!(kinds(10), ["redundant"]);
    assert_eq!(kinds(11), ["normalized"]);
    assert_eq!(kinds(12), ["normalized"]);
    assert_eq!(kinds(14), ["label-mismatch"]);
    assert_eq!(r.summary.entries, 11);
    snapshot("demo-hpo.txt", &render::text(&r));
}
