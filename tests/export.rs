//! The exports of a checked list (src/export.rs): what they hold and leave
//! out, checked against the release history (icd10cm-history-FY2016-FY2027,
//! CMS/CDC) rather than against the checker itself.

mod common;

use common::*;
use rollcall::check::check_with_reach;
use rollcall::export::{self, Source, ValueSetMeta};
use rollcall::{Kind, Report};
use std::collections::BTreeMap;

/// Billable spans per undotted code, straight from the release history.
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

/// Undotted codes under `prefix` billable on some day of `from..=to`
/// (YYYYMMDD); ICD-10-CM subtrees are prefix extensions (common practice).
fn billable_under(
    hist: &BTreeMap<String, Vec<(String, String)>>,
    prefix: &str,
    from: &str,
    to: &str,
) -> Vec<String> {
    hist.range(prefix.to_string()..)
        .take_while(|(c, _)| c.starts_with(prefix))
        .filter(|(_, spans)| {
            spans
                .iter()
                .any(|(f, t)| f.as_str() <= to && t.as_str() >= from)
        })
        .map(|(c, _)| c.clone())
        .collect()
}

fn meta() -> ValueSetMeta {
    ValueSetMeta {
        url: "https://example.org/fhir/ValueSet/test".into(),
        date: day("2026-01-15"),
    }
}

fn exported(format: &str, text: &str, opts: &rollcall::CheckOptions) -> (Report, export::Export) {
    let index = index();
    let (report, reach) = check_with_reach(&index, text, opts);
    let view = index.view();
    let src = Source {
        report: &report,
        reach: &reach,
        view: Some(&view),
        meta: meta(),
    };
    let e = export::export(format, &src).unwrap();
    (report, e)
}

const LIST: &str = "E11\tType 2 diabetes\nE11.9\nI10\nE10.*\nZZZ99\n";

fn billable_period() -> rollcall::CheckOptions {
    let mut o = period("2019-01-01", "2024-12-31");
    o.billable = true;
    o
}

#[test]
fn billable_codes_required_leaves_headers_out_of_the_cleaned_list_and_names_them() {
    // E11 is a category (a header) in every release (FY2016-FY2027 code
    // files: only its subcodes are billable); ZZZ99 cannot be a code.
    let (report, e) = exported("cleaned-csv", LIST, &billable_period());
    assert!(report.entries[0]
        .findings
        .iter()
        .any(|f| f.kind == Kind::Header));
    let rows: Vec<&str> = e.text.lines().collect();
    assert_eq!(rows[0], "code,label,description,status");
    let kept: Vec<&str> = rows[1..]
        .iter()
        .filter(|r| !r.contains("left out"))
        .map(|r| r.split(',').next().unwrap())
        .collect();
    assert_eq!(kept, ["E11.9", "I10", "E10.*"]);
    assert!(rows.contains(&"E11,,,left out: header error"), "{rows:?}");
    assert!(rows.contains(&"ZZZ99,,,left out: malformed error"));
    assert_eq!(e.count, 3);
    assert_eq!(
        e.left_out,
        ["line 1 E11 (header)", "line 5 ZZZ99 (malformed)"]
    );
    // Without the requirement the header is a usable entry.
    let (_, e) = exported("cleaned-csv", LIST, &period("2019-01-01", "2024-12-31"));
    assert!(e.text.contains("E11,Type 2 diabetes,"));
}

#[test]
fn the_codes_export_expands_headers_and_patterns_as_the_release_history_does() {
    let hist = history();
    let (from, to) = ("20190101", "20241231");
    // Without "billable required", E11 is expanded too.
    let opts = period("2019-01-01", "2024-12-31");
    let (_, e) = exported("codes-csv", LIST, &opts);
    let got: Vec<String> = e
        .text
        .lines()
        .skip(1)
        .filter(|l| !l.starts_with(','))
        .map(|l| l.split(',').next().unwrap().replace('.', ""))
        .collect();
    let mut want: Vec<String> = ["E10", "E11", "I10"]
        .iter()
        .flat_map(|p| billable_under(&hist, p, from, to))
        .collect();
    want.sort();
    want.dedup();
    assert_eq!(got, want);
    // Each row's billable dates are the history's span for the code.
    let e119 = e.text.lines().find(|l| l.starts_with("E11.9,")).unwrap();
    let span = &hist["E119"][0];
    let iso = |d: &str| format!("{}-{}-{}", &d[..4], &d[4..6], &d[6..]);
    assert!(
        e119.ends_with(&format!(",{},{},1;2", iso(&span.0), iso(&span.1))),
        "{e119}"
    );
    // With it, the header E11 is left out (an error), and named at the end.
    let (_, e) = exported("codes-csv", LIST, &billable_period());
    let under_e11 = billable_under(&hist, "E11", from, to).len();
    let rows = e.text.lines().count() - 1;
    let e10 = billable_under(&hist, "E10", from, to).len();
    // E11.9 (its own line) stays; the rest of E11 goes with line 1.
    assert_eq!(
        rows,
        e10 + 1 + 1 + 2,
        "E10.*, E11.9, I10 and two left-out rows"
    );
    assert!(under_e11 > 1);
    assert!(e.text.contains(",left out: line 1 E11 (header),"));
}

#[test]
fn sql_r_and_python_vectors_hold_the_same_codes() {
    let opts = billable_period();
    let (_, csv) = exported("codes-csv", LIST, &opts);
    let codes: Vec<&str> = csv
        .text
        .lines()
        .skip(1)
        .filter(|l| !l.starts_with(','))
        .map(|l| l.split(',').next().unwrap())
        .collect();
    for (format, quote, open, close) in [
        ("codes-sql", '\'', "IN (", ")"),
        ("codes-r", '"', "codes <- c(", ")"),
        ("codes-python", '"', "codes = [", "]"),
    ] {
        let (_, e) = exported(format, LIST, &opts);
        let body: Vec<&str> = e
            .text
            .lines()
            .skip_while(|l| *l != open)
            .skip(1)
            .take_while(|l| *l != close)
            .collect();
        let got: Vec<&str> = body
            .iter()
            .map(|l| l.trim().split(quote).nth(1).unwrap())
            .collect();
        assert_eq!(got, codes, "{format}");
        assert!(e
            .text
            .contains("Left out for error-level findings: line 1 E11 (header)"));
        assert!(e.text.contains("from 2019-01-01 to 2024-12-31"));
    }
    // An empty reach is still valid SQL.
    let (_, e) = exported("codes-sql", "ZZZ99\n", &opts);
    assert!(e.text.contains("IN (\n  NULL"), "{}", e.text);
}

#[test]
fn the_value_set_names_its_url_date_period_and_release() {
    let (report, e) = exported("fhir", LIST, &billable_period());
    let vs: serde_json::Value = serde_json::from_str(&e.text).unwrap();
    // FHIR R4 ValueSet (http://hl7.org/fhir/R4/valueset.html): resourceType,
    // url (uri), date (dateTime), status (PublicationStatus), compose.include
    // with system and concept.code. The full structure is checked against
    // the published R4 JSON schema in tests/e2e (export.test.mjs).
    assert_eq!(vs["resourceType"], "ValueSet");
    assert_eq!(vs["url"], "https://example.org/fhir/ValueSet/test");
    assert_eq!(vs["date"], "2026-01-15");
    let ext = vs["extension"].as_array().unwrap();
    assert_eq!(ext[0]["url"], export::STUDY_PERIOD_EXTENSION);
    assert_eq!(ext[0]["valuePeriod"]["start"], "2019-01-01");
    assert_eq!(ext[0]["valuePeriod"]["end"], "2024-12-31");
    assert!(ext[1]["valueString"]
        .as_str()
        .unwrap()
        .contains(&report.index.release));
    let inc = &vs["compose"]["include"][0];
    assert_eq!(inc["system"], "http://hl7.org/fhir/sid/icd-10-cm");
    assert!(inc.get("version").is_none());
    let codes: Vec<&str> = inc["concept"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| c["code"].as_str().unwrap())
        .collect();
    assert_eq!(codes, ["E11.9", "I10"]);
    let d = vs["description"].as_str().unwrap();
    assert!(d.contains("Left out for error-level findings: line 1 E11 (header)"));
    assert!(d.contains("line 4 E10.*"));
}
