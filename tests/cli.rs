//! The command line: exit status, options, formats and messages.

mod common;

use common::*;
use std::io::Write;
use std::process::{Command, Output, Stdio};

fn rollcall(args: &[&str], stdin: Option<&str>) -> Output {
    let mut c = Command::new(env!("CARGO_BIN_EXE_rollcall"));
    c.args(args).current_dir(root());
    c.stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped());
    let mut child = c.spawn().unwrap();
    if let Some(s) = stdin {
        // The process may exit before reading (a usage error): ignore a closed pipe.
        let _ = child.stdin.take().unwrap().write_all(s.as_bytes());
    }
    drop(child.stdin.take());
    child.wait_with_output().unwrap()
}

fn out(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).to_string()
}

fn err(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).to_string()
}

#[test]
fn exit_status_is_0_without_errors_and_1_with_errors() {
    let ok = rollcall(&["check", "-", "--on", "2026-01-01"], Some("E11.9\nI10\n"));
    assert_eq!(ok.status.code(), Some(0), "{}", err(&ok));
    let bad = rollcall(
        &["check", "-", "--on", "2026-01-01"],
        Some("E11.9\nE11.56\n"),
    );
    assert_eq!(bad.status.code(), Some(1));
    assert!(out(&bad).contains("E11.65"));
}

#[test]
fn usage_errors_exit_2_with_a_message() {
    for (args, says) in [
        (vec!["check", "-", "--on", "2026-13-01"], "not a date"),
        (
            vec!["check", "-", "--on", "2026-01-01", "--from", "2026-01-01"],
            "either --on",
        ),
        (
            vec!["check", "-", "--from", "2026-01-01"],
            "both --from and --to",
        ),
        (
            vec!["check", "-", "--from", "2026-02-01", "--to", "2026-01-01"],
            "before",
        ),
        (vec!["check", "-", "--format", "xml"], "--format"),
        (vec!["check", "no-such-file.txt"], "cannot read"),
        (
            vec!["check", "-", "--index", "no-such.rcx"],
            "cannot read the index",
        ),
        (vec!["frobnicate"], "unknown command"),
    ] {
        let o = rollcall(&args, Some("E11.9\n"));
        assert_eq!(o.status.code(), Some(2), "{args:?}");
        assert!(err(&o).contains(says), "{args:?}: {}", err(&o));
    }
}

#[test]
fn a_corrupted_index_file_is_refused_with_a_reason() {
    let mut b = std::fs::read(root().join("vocab/icd10cm.rcx")).unwrap();
    let n = b.len();
    b[n - 5] ^= 1;
    let dir = std::env::temp_dir().join(format!("rollcall-cli-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let p = dir.join("bad.rcx");
    std::fs::write(&p, &b).unwrap();
    let o = rollcall(
        &["check", "-", "--index", p.to_str().unwrap()],
        Some("E11.9\n"),
    );
    assert_eq!(o.status.code(), Some(2));
    assert!(err(&o).contains("corrupted"), "{}", err(&o));
}

#[test]
fn json_output_has_the_documented_shape() {
    let o = rollcall(
        &[
            "check",
            "demo-data/demo-list.tsv",
            "--from",
            "2019-01-01",
            "--to",
            "2024-12-31",
            "--format",
            "json",
        ],
        None,
    );
    assert_eq!(o.status.code(), Some(1));
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    for k in [
        "vocabulary",
        "index",
        "options",
        "entries",
        "list_findings",
        "summary",
    ] {
        assert!(v.get(k).is_some(), "{k}");
    }
    for k in ["release", "coverage_from", "coverage_to", "sources"] {
        assert!(v["index"].get(k).is_some(), "index.{k}");
    }
    assert_eq!(v["options"]["on"], serde_json::Value::Null);
    assert_eq!(v["options"]["from"], "2019-01-01");
    let e = &v["entries"][6];
    for k in [
        "line",
        "input",
        "code",
        "label",
        "description",
        "status",
        "findings",
    ] {
        assert!(e.get(k).is_some(), "entries[].{k}");
    }
    assert_eq!(e["findings"][0]["kind"], "unknown");
    for k in ["kind", "severity", "message", "suggestions"] {
        assert!(e["findings"][0].get(k).is_some());
    }
    for k in ["code", "description", "reason"] {
        assert!(e["findings"][0]["suggestions"][0].get(k).is_some());
    }
    let lf = &v["list_findings"][0];
    for k in [
        "kind",
        "severity",
        "lines",
        "codes",
        "message",
        "suggestions",
    ] {
        assert!(lf.get(k).is_some(), "list_findings[].{k}");
    }
    for k in ["lines", "entries", "errors", "warnings", "infos"] {
        assert!(v["summary"][k].is_u64(), "summary.{k}");
    }
}

#[test]
fn text_output_matches_the_library_snapshot() {
    let o = rollcall(
        &[
            "check",
            "demo-data/demo-list.tsv",
            "--from",
            "2019-01-01",
            "--to",
            "2024-12-31",
        ],
        None,
    );
    let want = std::fs::read_to_string(root().join("tests/snapshots/demo.txt")).unwrap();
    assert_eq!(out(&o), want);
}

#[test]
fn csv_output_keeps_every_line_and_neutralises_formulas() {
    let o = rollcall(
        &["check", "-", "--on", "2026-01-01", "--format", "csv"],
        Some("=E11.9\n\nI10\n"),
    );
    let s = out(&o);
    let rows: Vec<&str> = s.lines().collect();
    assert_eq!(
        rows[0],
        "lines,input,code,status,kind,severity,message,suggestions"
    );
    assert!(rows.iter().any(|r| r.starts_with("1,'=E11.9")), "{s}");
    assert!(rows.iter().any(|r| r.starts_with("2,,,blank")), "{s}");
    assert!(rows.iter().any(|r| r.starts_with("3,I10,I10,valid")), "{s}");
}

#[test]
fn on_is_the_same_as_a_one_day_period() {
    let a = rollcall(
        &[
            "check",
            "demo-data/demo-list.tsv",
            "--on",
            "2020-06-01",
            "--format",
            "json",
        ],
        None,
    );
    let b = rollcall(
        &[
            "check",
            "demo-data/demo-list.tsv",
            "--from",
            "2020-06-01",
            "--to",
            "2020-06-01",
            "--format",
            "json",
        ],
        None,
    );
    assert_eq!(out(&a), out(&b));
}

#[test]
fn info_lists_the_bundled_index_with_size_and_sources() {
    let o = rollcall(&["info", "--format", "json"], None);
    assert_eq!(o.status.code(), Some(0));
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    let i = &v["indexes"][0];
    assert_eq!(i["vocabulary"], "icd10cm");
    let size = std::fs::metadata(root().join("vocab/icd10cm.rcx"))
        .unwrap()
        .len();
    assert_eq!(i["bytes"].as_u64(), Some(size));
    assert_eq!(i["coverage_from"], "2015-10-01");
    assert!(i["sources"].as_array().unwrap().len() >= 5);
}

/// Exit status of compare: 0 when both lists reach the same billable codes
/// and neither has an error-level finding, 1 otherwise, 2 for usage errors.
/// E11.6 has twelve billable codes on 2026-01-01 (FY2026 tabular list), so
/// listing them all reaches the same codes as E11.6*.
#[test]
fn compare_exit_status_and_formats() {
    let a = std::env::temp_dir().join(format!("rollcall-cmp-{}.txt", std::process::id()));
    std::fs::write(&a, "E11.6*\nI10\n").unwrap();
    let a = a.to_str().unwrap();
    let twelve = "E11.610\nE11.618\nE11.620\nE11.621\nE11.622\nE11.628\nE11.630\nE11.638\nE11.641\nE11.649\nE11.65\nE11.69\nI10\n";
    let same = rollcall(&["compare", a, "-", "--on", "2026-01-01"], Some(twelve));
    assert_eq!(same.status.code(), Some(0), "{}{}", out(&same), err(&same));
    assert!(
        out(&same).contains("reach the same billable codes"),
        "{}",
        out(&same)
    );
    assert!(
        out(&same).contains("WRITTEN DIFFERENTLY, SAME CODES"),
        "{}",
        out(&same)
    );

    let differ = rollcall(
        &["compare", a, "-", "--on", "2026-01-01", "--format", "json"],
        Some("E11.65\nI10\n"),
    );
    assert_eq!(differ.status.code(), Some(1));
    let v: serde_json::Value = serde_json::from_str(&out(&differ)).unwrap();
    for key in [
        "vocabulary",
        "index",
        "options",
        "a",
        "b",
        "agreement",
        "chapters",
        "differences",
        "equivalents",
    ] {
        assert!(v.get(key).is_some(), "JSON has {key}");
    }
    assert_eq!(v["agreement"]["only_a"], 11);
    assert_eq!(v["agreement"]["both"], 2);
    assert_eq!(v["b"]["name"], "-");
    assert_eq!(v["differences"][0]["side"], "a");

    let csv = rollcall(
        &["compare", a, "-", "--on", "2026-01-01", "--format", "csv"],
        Some("E11.65\nI10\n"),
    );
    assert_eq!(out(&csv).lines().count(), 1 + 11);

    for (args, says) in [
        (vec!["compare", a], "two lists"),
        (vec!["compare", "-", "-"], "standard input"),
        (vec!["compare", a, a, a], "two lists"),
        (vec!["check", a, a], "rollcall compare"),
    ] {
        let o = rollcall(&args, Some("E11.9\n"));
        assert_eq!(o.status.code(), Some(2), "{args:?}");
        assert!(err(&o).contains(says), "{args:?}: {}", err(&o));
    }
    std::fs::remove_file(a).unwrap();
}

/// --system: the bundled ICD-10-PCS index (0DTJ4ZZ, FY2024 PCS code file), HPO,
/// shape-only systems (LOINC 2345-7 and its mod 10 check digit, LOINC
/// Users' Guide), and names that are not systems.
#[test]
fn system_option_picks_the_index_or_the_shape_rules() {
    let pcs = rollcall(
        &[
            "check",
            "-",
            "--system",
            "icd10pcs",
            "--on",
            "2024-01-01",
            "--format",
            "json",
        ],
        Some("0DTJ4ZZ\n0DTJ\n"),
    );
    assert_eq!(pcs.status.code(), Some(0), "{}", err(&pcs));
    let v: serde_json::Value = serde_json::from_str(&out(&pcs)).unwrap();
    assert_eq!(v["vocabulary"], "icd10pcs");
    assert_eq!(v["entries"][0]["status"], "valid");
    assert_eq!(v["entries"][0]["system"], "icd10pcs");
    assert_eq!(v["entries"][1]["status"], "header");

    let loinc = rollcall(
        &["check", "-", "--system", "LOINC", "--format", "json"],
        Some("2345-7\n2345-8\n"),
    );
    assert_eq!(loinc.status.code(), Some(1));
    let v: serde_json::Value = serde_json::from_str(&out(&loinc)).unwrap();
    assert_eq!(v["entries"][0]["status"], "shape-only");
    assert!(v["entries"][0]["findings"][0]["message"]
        .as_str()
        .unwrap()
        .contains("cannot say whether 2345-7 exists"));
    assert_eq!(v["entries"][1]["status"], "malformed");
    assert_eq!(v["summary"]["systems"]["loinc"], 1);

    // The bundled HPO index (hp-2025-01-16.obo: HP:0001250 Seizure; HP:0001425
    // obsolete, replaced_by HP:0000005).
    let hpo = rollcall(
        &["check", "-", "--system", "hpo", "--format", "json"],
        Some("HP:0001250\nHP:0001425\n"),
    );
    assert_eq!(hpo.status.code(), Some(1));
    let v: serde_json::Value = serde_json::from_str(&out(&hpo)).unwrap();
    assert_eq!(v["vocabulary"], "hpo");
    assert_eq!(v["entries"][0]["status"], "valid");
    assert_eq!(v["entries"][1]["status"], "retired");
    assert_eq!(
        v["entries"][1]["findings"][0]["suggestions"][0]["code"],
        "HP:0000005"
    );

    for (args, says) in [
        (vec!["check", "-", "--system", "icd11"], "not known"),
        (
            vec![
                "check",
                "-",
                "--system",
                "icd10pcs",
                "--index",
                "vocab/icd10cm.rcx",
            ],
            "not icd10pcs",
        ),
        (
            vec![
                "compare",
                "-",
                "vocab/../demo-data/compare-expert.tsv",
                "--system",
                "loinc",
            ],
            "compare needs",
        ),
    ] {
        let o = rollcall(&args, Some("E11.9\n"));
        assert_eq!(o.status.code(), Some(2), "{args:?}");
        assert!(err(&o).contains(says), "{args:?}: {}", err(&o));
    }
    let info = rollcall(&["info", "--format", "json"], None);
    let v: serde_json::Value = serde_json::from_str(&out(&info)).unwrap();
    let names: Vec<&str> = v["indexes"]
        .as_array()
        .unwrap()
        .iter()
        .map(|i| i["vocabulary"].as_str().unwrap())
        .collect();
    assert_eq!(names, ["icd10cm", "icd10pcs", "icd9cm", "hpo"]);
}

/// Source: the CDC tabular XML 2026-04-01 (vocab-build/sources): E11.65 is
/// "Type 2 diabetes mellitus with hyperglycemia", billable since 2015-10-01;
/// N18.3 was split into N18.30-N18.32 on 2020-10-01 (release history).
#[test]
fn find_lists_codes_for_words() {
    let o = rollcall(
        &[
            "find",
            "type",
            "2",
            "DM",
            "w/",
            "hyperglycemia",
            "--date",
            "2026-01-01",
            "--limit",
            "3",
        ],
        None,
    );
    assert_eq!(o.status.code(), Some(0), "{}", err(&o));
    let first = out(&o).lines().next().unwrap_or_default().to_string();
    assert!(first.starts_with("E11.65 "), "{first}");
    assert!(
        first.contains("Type 2 diabetes mellitus with hyperglycemia"),
        "{first}"
    );
    assert!(first.contains("billable 2015-10-01"), "{first}");
    assert_eq!(out(&o).lines().count(), 3);

    let j = rollcall(
        &[
            "find",
            "chronic",
            "kidney",
            "disease",
            "stage",
            "3",
            "--date",
            "2019-01-01",
            "--format",
            "json",
        ],
        None,
    );
    let v: serde_json::Value = serde_json::from_str(&out(&j)).unwrap();
    let results = v["results"].as_array().unwrap();
    let n183 = results
        .iter()
        .find(|r| r["code"] == "N18.3")
        .expect("N18.3 found");
    assert_eq!(n183["status"], "billable");
    assert_eq!(n183["billable_to"], "2020-09-30");
}

#[test]
fn find_without_words_or_with_a_bad_limit_is_a_usage_error() {
    let o = rollcall(&["find", "of", "the"], None);
    assert_eq!(o.status.code(), Some(2));
    assert!(err(&o).contains("find needs words"), "{}", err(&o));
    let o = rollcall(&["find", "diabetes", "--limit", "zero"], None);
    assert_eq!(o.status.code(), Some(2));
    assert!(err(&o).contains("--limit must be a number"), "{}", err(&o));
}

/// translate: the 2015 GEMs (forward file: V5867 -> Z794 exact, 25000 ->
/// E119 approximate); usage errors exit 2.
#[test]
fn translate_maps_a_list_and_names_its_outcomes() {
    let o = rollcall(
        &[
            "translate",
            "-",
            "--into",
            "icd10cm",
            "--on",
            "2016-01-01",
            "--format",
            "json",
        ],
        Some("V58.67\n250.00\n"),
    );
    assert_eq!(o.status.code(), Some(0), "{}", err(&o));
    let v: serde_json::Value = serde_json::from_str(&out(&o)).unwrap();
    assert_eq!(v["entries"][0]["outcome"], "exact");
    assert_eq!(v["entries"][0]["targets"][0]["code"], "Z79.4");
    assert_eq!(v["entries"][1]["outcome"], "approximate");
    let csv = rollcall(
        &["translate", "-", "--into", "icd10cm", "--format", "csv"],
        Some("V58.67\n"),
    );
    assert!(out(&csv).starts_with("line,source,"));
    for (args, says) in [
        (vec!["translate", "-"], "--into"),
        (vec!["translate", "-", "--into", "loinc"], "--into loinc"),
    ] {
        let o = rollcall(&args, Some("V58.67\n"));
        assert_eq!(o.status.code(), Some(2), "{args:?}");
        assert!(err(&o).contains(says), "{args:?}: {}", err(&o));
    }
}

/// A list with a system column (demo-data/mixed-list.tsv): the bundled
/// index each row names is loaded; the JSON gives each entry's system and the
/// per-system parts. Sources: icd10pcs-codes-FY2024.txt (CMS) holds 02703ZZ
/// and 02100Z9; CMS32_DESC_LONG_DX.txt holds 25000, retired for services
/// from 2015-10-01 (79 FR 45128); LOINC Users' Guide: 2345-7's check digit.
#[test]
fn a_system_column_checks_each_row_in_its_system() {
    let args = [
        "check",
        "demo-data/mixed-list.tsv",
        "--from",
        "2019-01-01",
        "--to",
        "2024-12-31",
        "--format",
        "json",
    ];
    let o = rollcall(&args, None);
    assert_eq!(o.status.code(), Some(1), "{}", err(&o));
    let v: serde_json::Value = serde_json::from_str(&out(&o)).unwrap();
    let row = |code: &str| {
        v["entries"]
            .as_array()
            .unwrap()
            .iter()
            .find(|e| e["code"] == code)
            .unwrap_or_else(|| panic!("{code}"))
            .clone()
    };
    for (code, status, system) in [
        ("E11.9", "valid", "icd10cm"),
        ("I10", "valid", "icd10cm"),
        ("02703ZZ", "valid", "icd10pcs"),
        ("02100Z9", "valid", "icd10pcs"),
        ("250.00", "retired", "icd9cm"),
        ("2345-7", "shape-only", "loinc"),
    ] {
        let e = row(code);
        assert_eq!(
            (e["status"].as_str(), e["system"].as_str()),
            (Some(status), Some(system)),
            "{code}"
        );
    }
    let refused = row("5A11");
    assert_eq!(refused["status"], "malformed");
    assert!(refused["system"].is_null());
    assert!(refused["findings"][0]["message"]
        .as_str()
        .unwrap()
        .contains("\"ICD-11\""));
    let parts: Vec<(&str, &str)> = v["summary"]["by_system"]
        .as_array()
        .unwrap()
        .iter()
        .map(|p| {
            (
                p["system"].as_str().unwrap(),
                p["checked"].as_str().unwrap(),
            )
        })
        .collect();
    assert_eq!(
        parts,
        [
            ("icd10cm", "index"),
            ("icd10pcs", "index"),
            ("icd9cm", "index"),
            ("loinc", "shape")
        ]
    );
    // The text report names the systems.
    let text = rollcall(&args[..6], None);
    assert!(
        out(&text).contains("ICD-10-PCS (icd10pcs)"),
        "{}",
        out(&text)
    );

    // --system sets the system of the rows with no cell; the cells still win.
    let mut forced = args.to_vec();
    forced.extend(["--system", "icd9cm"]);
    let v: serde_json::Value = serde_json::from_str(&out(&rollcall(&forced, None))).unwrap();
    assert_eq!(v["vocabulary"], "icd9cm");
    let at = |line: usize| {
        let e = &v["entries"][line - 1];
        (e["status"].clone(), e["system"].clone())
    };
    // Line 5: E11.9 with the cell ICD-10-CM; line 7: I10 with an empty cell.
    assert_eq!(at(5), ("valid".into(), "icd10cm".into()));
    assert_eq!(at(7), ("other-system".into(), "icd10cm".into()));
}

#[test]
fn an_icd9cm_list_with_no_date_is_checked_on_a_day_its_index_covers() {
    // 250.00 and 401.9: billable in the FY2015 ICD-9-CM release
    // (CMS32_DESC_LONG_DX.txt), the last one, in force until ICD-10-CM
    // replaced it on 2015-10-01. Checked on "today" every code would be retired.
    let o = rollcall(
        &["check", "-", "--system", "icd9cm", "--format", "json"],
        Some("250.00\n401.9\n"),
    );
    assert_eq!(o.status.code(), Some(0), "{}", err(&o));
    let v: serde_json::Value = serde_json::from_str(&out(&o)).unwrap();
    assert_eq!(v["options"]["on"], "2015-09-30");
    assert_eq!(v["entries"][0]["status"], "valid");
    assert!(err(&o).contains("checked on 2015-09-30"), "{}", err(&o));
}

#[test]
fn check_writes_the_exports_and_refuses_an_unknown_one() {
    let list = "E11\nE11.9\n";
    let args = [
        "check",
        "-",
        "--from",
        "2019-01-01",
        "--to",
        "2024-12-31",
        "--billable",
    ];
    let run = |format: &str, extra: &[&str]| {
        let mut a = args.to_vec();
        a.extend(["--format", format]);
        a.extend(extra);
        rollcall(&a, Some(list))
    };
    let fhir = run("fhir", &["--valueset-url", "https://example.org/vs/1"]);
    // Exit status 1: E11 is a header, an error with billable codes required.
    assert_eq!(fhir.status.code(), Some(1), "{}", err(&fhir));
    let vs: serde_json::Value = serde_json::from_str(&out(&fhir)).unwrap();
    assert_eq!(vs["url"], "https://example.org/vs/1");
    let sql = out(&run("codes-sql", &[]));
    assert!(
        sql.contains("'E11.9'") && sql.contains("line 1 E11 (header)"),
        "{sql}"
    );
    let bad = run("codes-xml", &[]);
    assert_eq!(bad.status.code(), Some(2));
    assert!(err(&bad).contains("codes-python"));
    let misplaced = rollcall(&["check", "-", "--valueset-url", "x"], Some(list));
    assert!(err(&misplaced).contains("--format fhir"));
}

/// `show` gives a card per code. Source for the facts: the CDC tabular list
/// (April 2026 XML: E11.6 "Type 2 diabetes mellitus with other specified
/// complications" in section E08-E13 of chapter 4, its children E11.61 to
/// E11.69; E11's Excludes1 note naming E08.-) and the 2015 GEMs (E11.9 maps
/// back to 250.00).
#[test]
fn show_prints_a_card_in_text_and_json() {
    let o = rollcall(&["show", "E11.6", "--on", "2026-06-01"], None);
    assert_eq!(o.status.code(), Some(0), "{}", err(&o));
    let t = out(&o);
    for says in [
        "E11.6  Type 2 diabetes mellitus with other specified complications",
        "section E08-E13: Diabetes mellitus",
        "children (6):",
        "E11.62     Type 2 diabetes mellitus with skin complications  (header, 4 billable under it)",
        "Excludes1: diabetes mellitus due to underlying condition (E08.-)  [at code E11]",
        "not coding or billing advice",
    ] {
        assert!(t.contains(says), "{says} in:\n{t}");
    }
    let o = rollcall(
        &[
            "show",
            "E11.9",
            "E11.65",
            "--on",
            "2026-06-01",
            "--format",
            "json",
        ],
        None,
    );
    assert_eq!(o.status.code(), Some(0), "{}", err(&o));
    let v: serde_json::Value = serde_json::from_str(&out(&o)).unwrap();
    assert_eq!(v["vocabulary"], "icd10cm");
    assert_eq!(v["options"]["on"], "2026-06-01");
    let cards = v["cards"].as_array().unwrap();
    assert_eq!(cards.len(), 2);
    let e119 = &cards[0];
    assert_eq!(e119["code"], "E11.9");
    assert_eq!(e119["status"], "billable");
    assert_eq!(e119["chapter"]["code"], "4");
    assert_eq!(e119["section"]["code"], "E08-E13");
    assert_eq!(e119["ancestors"][0]["code"], "E11");
    assert_eq!(e119["timeline"][0]["state"], "billable");
    assert!(e119["siblings"]
        .as_array()
        .unwrap()
        .iter()
        .any(|s| s["code"] == "E11.8"));
    assert!(e119["mappings"]
        .as_array()
        .unwrap()
        .iter()
        .any(|m| m["code"] == "250.00" && m["role"] == "source"));
}

#[test]
fn show_an_unknown_code_exits_1_with_suggestions_and_bad_options_exit_2() {
    let o = rollcall(&["show", "E11.66", "--on", "2026-06-01"], None);
    assert_eq!(o.status.code(), Some(1));
    assert!(out(&o).contains("status: unknown"), "{}", out(&o));
    assert!(out(&o).contains("try E11.65"), "{}", out(&o));
    let o = rollcall(&["show"], None);
    assert_eq!(o.status.code(), Some(2));
    assert!(err(&o).contains("show needs one or more codes"));
    let o = rollcall(&["show", "E11.9", "--format", "csv"], None);
    assert_eq!(o.status.code(), Some(2));
    assert!(rollcall(&["--help"], None)
        .stdout
        .windows(13)
        .any(|w| w == b"rollcall show"));
}

/// `find E11.6` answers with that node, then what lies under it (the CDC
/// tabular list: E11.61 Type 2 diabetes mellitus with diabetic arthropathy
/// comes next, E11.621 "with foot ulcer" lies under it); words after the
/// code search that part of the tree only.
#[test]
fn find_takes_a_code_first() {
    let o = rollcall(&["find", "E11.6", "--date", "2026-06-01"], None);
    assert_eq!(o.status.code(), Some(0), "{}", err(&o));
    let t = out(&o);
    let firsts: Vec<&str> = t
        .lines()
        .map(|l| l.split_whitespace().next().unwrap())
        .collect();
    assert_eq!(&firsts[..3], ["E11.6", "E11.61", "E11.610"], "{t}");
    assert!(firsts.iter().all(|c| c.starts_with("E11.6")), "{t}");
    let o = rollcall(
        &[
            "find",
            "E11.6",
            "foot",
            "--date",
            "2026-06-01",
            "--format",
            "json",
        ],
        None,
    );
    let v: serde_json::Value = serde_json::from_str(&out(&o)).unwrap();
    assert_eq!(v["within"], "E11.6");
    let results = v["results"].as_array().unwrap();
    assert_eq!(results[0]["code"], "E11.621");
    assert!(results
        .iter()
        .all(|r| r["code"].as_str().unwrap().starts_with("E11.6")));
    let o = rollcall(&["find", "E11.7", "--date", "2026-06-01"], None);
    assert_eq!(o.status.code(), Some(0));
    assert!(out(&o).contains("no code starts with E11.7"), "{}", out(&o));
    // Words alone still search every code.
    let o = rollcall(
        &[
            "find", "type", "2", "diabetes", "foot", "ulcer", "--limit", "1",
        ],
        None,
    );
    assert!(out(&o).starts_with("E11.621"), "{}", out(&o));
}

/// `show --index` of the bundled index's file gets the bundled notes
/// (they were written for it: same SHA-256); `--notes` gives a notes file
/// and is refused by an index of another release or vocabulary. Source
/// for the note: the CDC tabular list XML, April 2026 (E11: "Includes:
/// diabetes NOS").
#[test]
fn show_takes_the_notes_file_written_with_its_index_only() {
    let root = env!("CARGO_MANIFEST_DIR");
    let index = format!("{root}/vocab/icd10cm.rcx");
    let notes = format!("{root}/vocab/icd10cm-notes.rcx");
    let o = rollcall(
        &["show", "E11", "--on", "2026-06-01", "--index", &index],
        None,
    );
    assert_eq!(o.status.code(), Some(0), "{}", err(&o));
    assert!(out(&o).contains("Includes: diabetes NOS"), "{}", out(&o));
    let o = rollcall(
        &["show", "E11", "--on", "2026-06-01", "--notes", &notes],
        None,
    );
    assert!(out(&o).contains("Includes: diabetes NOS"), "{}", out(&o));
    let icd9 = format!("{root}/vocab/icd9cm.rcx");
    let o = rollcall(
        &["show", "250.00", "--index", &icd9, "--notes", &notes],
        None,
    );
    assert_eq!(o.status.code(), Some(2));
    assert!(
        err(&o).contains("the notes file was written for icd10cm release FY2027"),
        "{}",
        err(&o)
    );
    let o = rollcall(&["show", "E11", "--index", &notes], None);
    assert_eq!(o.status.code(), Some(2));
    assert!(err(&o).contains("this is a notes file"), "{}", err(&o));
    let o = rollcall(&["check", "-", "--notes", &notes], Some("E11.9\n"));
    assert_eq!(o.status.code(), Some(2));
    assert!(err(&o).contains("--notes goes with show"), "{}", err(&o));
}

fn rollcall_bytes(args: &[&str], stdin: &[u8]) -> Output {
    let mut c = Command::new(env!("CARGO_BIN_EXE_rollcall"));
    c.args(args).current_dir(root());
    c.stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped());
    let mut child = c.spawn().unwrap();
    let _ = child.stdin.take().unwrap().write_all(stdin);
    child.wait_with_output().unwrap()
}

/// UTF-16 with its byte order mark (FF FE little-endian, FE FF big-endian:
/// the Unicode Standard, section 23.8), as spreadsheets save "Unicode text".
fn utf16(text: &str, big_endian: bool) -> Vec<u8> {
    let mut b = if big_endian {
        vec![0xFE, 0xFF]
    } else {
        vec![0xFF, 0xFE]
    };
    for u in text.encode_utf16() {
        b.extend(if big_endian {
            u.to_be_bytes()
        } else {
            u.to_le_bytes()
        });
    }
    b
}

#[test]
fn utf16_big_endian_lists_are_read_like_little_endian_ones() {
    let list = "E11.9\tType 2 diabetes mellitus without complications\nI10\n";
    let args = ["check", "-", "--on", "2026-01-01", "--format", "json"];
    let plain = rollcall(&args, Some(list));
    let le = rollcall_bytes(&args, &utf16(list, false));
    let be = rollcall_bytes(&args, &utf16(list, true));
    assert_eq!(be.status.code(), Some(0), "{}", err(&be));
    assert_eq!(out(&le), out(&plain));
    assert_eq!(out(&be), out(&plain));
}

#[test]
fn a_utf16_list_with_an_odd_last_byte_is_refused_not_cut_short() {
    let mut bytes = utf16("E11.9\nI10\n", false);
    bytes.push(b'E');
    let o = rollcall_bytes(&["check", "-", "--on", "2026-01-01"], &bytes);
    assert_eq!(o.status.code(), Some(2));
    assert!(err(&o).contains("odd number of bytes"), "{}", err(&o));
}

#[test]
fn a_nul_byte_is_no_code_and_its_line_is_kept() {
    // A NUL character in a cell is no character of any code: the line is
    // reported (never dropped), and the message does not end blank where
    // the NUL was.
    let o = rollcall_bytes(
        &["check", "-", "--on", "2026-01-01", "--format", "json"],
        b"E11.9\nI1\x000\n",
    );
    let v: serde_json::Value = serde_json::from_str(&out(&o)).unwrap_or_default();
    let lines: Vec<u64> = v["entries"]
        .as_array()
        .map(|a| a.iter().filter_map(|e| e["line"].as_u64()).collect())
        .unwrap_or_default();
    if o.status.code() == Some(2) {
        assert!(err(&o).contains("line 2"), "{}", err(&o));
    } else {
        assert!(lines.contains(&2), "{}", out(&o));
    }
}

#[test]
fn a_lone_surrogate_in_utf16_is_refused() {
    let mut bytes = utf16("E11.9\n", false);
    bytes.extend([0x00, 0xD8, b'\n', 0]);
    let o = rollcall_bytes(&["check", "-", "--on", "2026-01-01"], &bytes);
    assert_eq!(o.status.code(), Some(2));
    assert!(err(&o).contains("UTF-16"), "{}", err(&o));
    assert!(err(&o).contains("line 2"), "{}", err(&o));
}

// The README's usage block is the help's usage section, line for line, so
// the two cannot drift apart (the help is written from the flag table).
#[test]
fn the_readme_usage_block_is_the_help_usage_section() {
    let help = out(&rollcall(&["--help"], None));
    let section: Vec<&str> = help
        .lines()
        .skip_while(|l| *l != "usage:")
        .take_while(|l| !l.is_empty())
        .collect();
    assert!(section.len() > 6, "no usage section in the help:\n{help}");
    let readme = std::fs::read_to_string(root().join("README.md")).unwrap();
    let block: Vec<&str> = readme
        .split("```text\n")
        .find(|b| b.starts_with("usage:\n"))
        .and_then(|b| b.split("\n```").next())
        .expect("README.md has a ```text block starting with usage:")
        .lines()
        .collect();
    assert_eq!(
        block, section,
        "README.md's usage block differs from rollcall --help"
    );
}

#[test]
fn a_report_read_only_in_part_still_ends_with_the_exit_status_of_its_findings() {
    // `rollcall check LIST | head`: the report is written as the list is
    // checked, and a reader that stops early is no error; the status is
    // still 1 when the list has errors. The Elixhauser list v2026.1
    // (AHRQ's CSV) holds codes added after FY2016 (C43.111, first valid
    // on 2018-10-01 in the CMS code history), not yet valid on 2016-01-01,
    // and each format's report is longer than a pipe holds.
    for format in ["json", "csv", "text"] {
        let mut child = Command::new(env!("CARGO_BIN_EXE_rollcall"))
            .args(["check", "-", "--on", "2016-01-01"])
            .args(["--format", format])
            .current_dir(root())
            .stdin(Stdio::piped())
            .stdout(Stdio::piped())
            .stderr(Stdio::piped())
            .spawn()
            .unwrap();
        let list = elixhauser();
        let mut stdin = child.stdin.take().unwrap();
        let writer = std::thread::spawn(move || {
            let _ = stdin.write_all(list.as_bytes());
        });
        let mut first = [0u8; 100];
        let mut stdout = child.stdout.take().unwrap();
        std::io::Read::read_exact(&mut stdout, &mut first).unwrap();
        drop(stdout);
        writer.join().unwrap();
        let o = child.wait_with_output().unwrap();
        assert_eq!(o.status.code(), Some(1), "{format}: {}", err(&o));
        assert!(err(&o).is_empty(), "{format}: {}", err(&o));
    }
}

/// The ICD-9-CM index ends on 2015-09-30 (its last release, FY2015): with
/// no day given the list is checked on that day, and the CLI says so; with
/// a study period given there is nothing to say.
#[test]
fn the_day_moved_into_the_coverage_is_told_only_when_no_day_is_given() {
    let none = rollcall(&["check", "-", "--system", "icd9cm"], Some("428.0\n"));
    assert!(err(&none).contains("no date given"), "{}", err(&none));
    let period = rollcall(
        &[
            "check",
            "-",
            "--system",
            "icd9cm",
            "--from",
            "2019-10-01",
            "--to",
            "2024-09-30",
        ],
        Some("428.0\n"),
    );
    assert!(!err(&period).contains("no date given"), "{}", err(&period));
}
