//! Comparing two lists, against the release history and a published list,
//! plus the demo pair (an invented study) and property tests.

mod common;

use common::*;
use proptest::prelude::*;
use rollcall::compare::{Relation, Side};
use rollcall::pattern::Pattern;
use rollcall::{check, compare, render, Kind};
use std::collections::{BTreeMap, BTreeSet};

/// Billable spans per undotted code, read straight from the release history
/// (icd10cm-history-FY2016-FY2027.tsv, CMS/CDC): code, valid_from, valid_to.
fn history() -> BTreeMap<String, Vec<(String, String)>> {
    let mut m: BTreeMap<String, Vec<(String, String)>> = BTreeMap::new();
    for line in source("icd10cm-history-FY2016-FY2027.tsv.gz")
        .lines()
        .skip(1)
    {
        let f: Vec<&str> = line.split('\t').collect();
        m.entry(f[0].to_string())
            .or_default()
            .push((f[1].to_string(), f[2].to_string()));
    }
    m
}

/// The Elixhauser codes of one category (AHRQ v2026.1), undotted.
fn elixhauser_category(cat: &str) -> Vec<String> {
    elixhauser()
        .lines()
        .skip(1)
        .filter_map(|l| {
            let f: Vec<&str> = l.split(',').collect();
            (f[0] == cat).then(|| f[1].to_string())
        })
        .collect()
}

/// What entries reach, derived from the history alone: every code that has
/// the entry as a prefix (ICD-10-CM subtrees are prefix extensions: common
/// practice, and how the tabular list builds codes) and is billable on some
/// day of `from..=to` (dates as YYYYMMDD).
fn reach_by_history(
    hist: &BTreeMap<String, Vec<(String, String)>>,
    entries: &[String],
    from: &str,
    to: &str,
) -> BTreeSet<String> {
    let mut out = BTreeSet::new();
    for e in entries {
        for (code, spans) in hist.range(e.clone()..) {
            if !code.starts_with(e.as_str()) {
                break;
            }
            if spans
                .iter()
                .any(|(f, t)| f.as_str() <= to && t.as_str() >= from)
            {
                out.insert(code.clone());
            }
        }
    }
    out
}

fn undotted(s: &str) -> String {
    s.replace('.', "")
}

/// Compares an Elixhauser category (AHRQ v2026.1) with the same category
/// less the codes `drop` picks from their history spans; the expected sets
/// come from the release history file directly.
fn category_against_subset(cat: &str, rows: usize, drop: fn(&[(String, String)]) -> bool) {
    let hist = history();
    let a = elixhauser_category(cat);
    assert_eq!(a.len(), rows, "{cat} rows in v2026.1");
    let b: Vec<String> = a.iter().filter(|c| !drop(&hist[*c])).cloned().collect();
    assert!(!b.is_empty() && b.len() < a.len());

    let (from, to) = ("20151001", "20260930");
    let reach_a = reach_by_history(&hist, &a, from, to);
    let reach_b = reach_by_history(&hist, &b, from, to);
    let only_a: BTreeSet<String> = reach_a.difference(&reach_b).cloned().collect();
    let only_b: BTreeSet<String> = reach_b.difference(&reach_a).cloned().collect();
    let both: BTreeSet<String> = reach_a.intersection(&reach_b).cloned().collect();
    assert!(only_b.is_empty(), "B's entries are a subset of A's");
    assert!(!only_a.is_empty() && !both.is_empty());

    let index = index();
    let text = |codes: &[String]| codes.join("\n") + "\n";
    let c = compare(
        &index,
        ("a", &text(&a)),
        ("b", &text(&b)),
        &period("2015-10-01", "2026-09-30"),
    );
    assert_eq!(c.agreement.both, both.len());
    assert_eq!(c.agreement.only_a, only_a.len());
    assert_eq!(c.agreement.only_b, 0);
    let union = reach_a.len();
    assert_eq!(c.agreement.union, union);
    assert!((c.agreement.jaccard - both.len() as f64 / union as f64).abs() < 1e-12);
    assert!((c.agreement.b_in_a - 1.0).abs() < 1e-12);

    // The differences name exactly the codes only A reaches, each once.
    let mut named: Vec<String> = c
        .differences
        .iter()
        .inspect(|d| assert_eq!(d.side, Side::A))
        .flat_map(|d| d.codes.iter().map(|n| undotted(&n.code)))
        .collect();
    let distinct: BTreeSet<String> = named.iter().cloned().collect();
    named.sort();
    assert_eq!(named.len(), distinct.len(), "no code in two runs");
    assert_eq!(distinct, only_a);
    // A whole-subtree run covers every billable code under it in the period.
    for d in c.differences.iter().filter(|d| d.all_of) {
        let under = reach_by_history(&hist, &[undotted(&d.code)], from, to);
        let got: BTreeSet<String> = d.codes.iter().map(|n| undotted(&n.code)).collect();
        assert_eq!(got, under, "run {}", d.code);
    }
    // The chapter tallies add up to the three parts.
    let sum =
        |f: fn(&rollcall::compare::ChapterTally) -> usize| c.chapters.iter().map(f).sum::<usize>();
    assert_eq!(sum(|t| t.both), both.len());
    assert_eq!(sum(|t| t.only_a), only_a.len());
}

/// Source: AHRQ Elixhauser v2026.1, DIAB_CX (445 rows), less its 40 codes
/// whose last valid day in the release history is before 2018-10-01 (FY2019).
#[test]
fn elixhauser_diab_cx_without_its_pre_fy2019_codes() {
    category_against_subset("DIAB_CX", 445, |spans| {
        spans.iter().all(|(_, to)| to.as_str() < "20181001")
    });
}

/// Source: AHRQ Elixhauser v2026.1, DEMENTIA (93 rows), less every code
/// first valid before 2018-10-01 in the release history.
#[test]
fn elixhauser_dementia_without_codes_older_than_fy2019() {
    category_against_subset("DEMENTIA", 93, |spans| {
        spans.iter().any(|(from, _)| from.as_str() < "20181001")
    });
}

/// Source: AHRQ Elixhauser v2026.1 (all categories): a list compared with
/// itself agrees fully.
#[test]
fn elixhauser_compared_with_itself_agrees_fully() {
    let index = index();
    let list = elixhauser();
    let c = compare(
        &index,
        ("a", &list),
        ("b", &list),
        &period("2015-10-01", "2026-09-30"),
    );
    assert_eq!(c.agreement.jaccard, 1.0);
    assert!(c.differences.is_empty());
    assert!(c.equivalents.is_empty());
    assert!(c.same_codes());
    assert_eq!(c.a.summary, c.b.summary);
}

/// Source: the FY2026 tabular list (icd10cm-tabular-2026-04-01.xml): E11.2
/// has exactly the billable children E11.21, E11.22 and E11.29; E11.649 and
/// E11.641 are the two codes under E11.64.
#[test]
fn demo_pair_equivalents_and_near_misses() {
    let index = index();
    let read = |f: &str| std::fs::read_to_string(root().join("demo-data").join(f)).unwrap();
    let c = compare(
        &index,
        ("compare-draft.tsv", &read("compare-draft.tsv")),
        ("compare-expert.tsv", &read("compare-expert.tsv")),
        &period("2019-01-01", "2024-12-31"),
    );
    let eq = c
        .equivalents
        .iter()
        .find(|e| e.b_entries == ["E11.2"])
        .expect("E11.21, E11.22, E11.29 = E11.2");
    assert_eq!(eq.a_entries, ["E11.21", "E11.22", "E11.29"]);
    assert_eq!(eq.codes, 3);
    let d = c
        .differences
        .iter()
        .find(|d| d.code == "E11.641")
        .expect("B alone has E11.641");
    assert_eq!(d.side, Side::B);
    let n = d.nearest.as_ref().unwrap();
    assert_eq!(
        (n.code.as_str(), n.relation),
        ("E11.649", Relation::Sibling)
    );
    // A's unknown code is a finding of its check, not a difference.
    assert!(c
        .a
        .report
        .entries
        .iter()
        .any(|e| e.findings.iter().any(|f| f.kind == Kind::Unknown)));
    assert!(!c.differences.iter().any(|d| d.code == "E11.56"));
}

/// Billable codes of the index on the day, dotted, in code order.
fn billable_codes(day_: &str) -> Vec<String> {
    let index = index();
    let v = index.view();
    billable_on_in(&index, day_)
        .iter()
        .map(|c| v.display(c))
        .collect()
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(32))]

    /// Comparing a list with itself gives Jaccard 1 and no differences.
    #[test]
    fn a_list_compared_with_itself(picks in proptest::collection::vec(0usize..1_000_000, 1..60)) {
        let all = billable_codes("2026-01-01");
        let text: String = picks.iter().map(|p| all[p % all.len()].clone() + "\n").collect();
        let index = index();
        let c = compare(&index, ("a", &text), ("b", &text), &on("2026-01-01"));
        prop_assert_eq!(c.agreement.jaccard, 1.0);
        prop_assert!(c.differences.is_empty());
        prop_assert!(c.equivalents.is_empty());
    }

    /// Comparing A with its roll-up (the check's own roll-up suggestions
    /// applied) gives no differences, and the rolled-up lines read as
    /// equivalent to the pattern that replaced them.
    #[test]
    fn a_list_compared_with_its_roll_up(pick in 0usize..1_000_000, extra in proptest::collection::vec(0usize..1_000_000, 0..20)) {
        let nodes = roll_up_nodes(&index(), "2026-01-01");
        let node = &nodes[pick % nodes.len()];
        let index = index();
        let v = index.view();
        let opts = on("2026-01-01");
        let p = opts.period();
        let under: Vec<String> = Pattern::Prefix(node.clone())
            .expand(&v, &p)
            .into_iter()
            .map(|o| v.display(&v.code(o)))
            .collect();
        let all = billable_codes("2026-01-01");
        let others: Vec<String> = extra
            .iter()
            .map(|e| all[e % all.len()].clone())
            .filter(|c| !undotted(c).starts_with(node.as_str()))
            .collect();
        let lines: Vec<String> = under.iter().chain(&others).cloned().collect();
        let a = lines.join("\n") + "\n";

        // Apply every roll-up the check suggests.
        let r = check(&index, &a, &opts);
        let mut rolled: Vec<Option<String>> = lines.iter().cloned().map(Some).collect();
        for f in r.list_findings.iter().filter(|f| f.kind == Kind::RollUp) {
            for (k, l) in f.lines.iter().enumerate() {
                rolled[l - 1] = (k == 0).then(|| f.suggestions[0].code.clone());
            }
        }
        let b: String = rolled.into_iter().flatten().map(|l| l + "\n").collect();
        prop_assert_ne!(&a, &b, "a roll-up was suggested for {}", node);

        let c = compare(&index, ("a", &a), ("b", &b), &opts);
        prop_assert!(c.differences.is_empty(), "{:?}", c.differences);
        prop_assert_eq!(c.agreement.jaccard, 1.0);
        prop_assert!(!c.equivalents.is_empty());
    }
}

/// Source: the FY2026 tabular list (icd10cm-tabular-2026-04-01.xml): E11.6
/// holds E11.65 and E11.69 among its twelve billable codes; I10 is a
/// category of its own.
#[test]
fn text_and_csv_name_every_difference() {
    let index = index();
    let a = "E11.9\nE11.65\nI10\n";
    let b = "E11.9\nE11.6\n";
    let c = compare(&index, ("a.txt", a), ("b.txt", b), &on("2026-01-01"));
    let text = render::comparison_text(&c);
    assert!(text.contains("ONLY IN A"), "{text}");
    assert!(text.contains("I10"), "{text}");
    assert!(text.contains("not coding or billing advice"));
    let csv = render::comparison_csv(&c);
    let rows: Vec<&str> = csv.lines().skip(1).collect();
    assert_eq!(rows.len(), c.agreement.only_a + c.agreement.only_b);
    assert!(rows.iter().any(|r| r.starts_with("a,I10,")), "{csv}");
    // B has all of E11.6 but E11.65 (which A has): its other codes are B's.
    assert!(rows.iter().any(|r| r.starts_with("b,E11.69,")), "{csv}");
}
