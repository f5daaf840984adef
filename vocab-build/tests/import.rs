//! Imports of releases a site is licensed for, built from tiny invented
//! fixtures in the official layouts (`tests/data/import/`, described in its
//! README), then checked with the core as a user would.

use rollcall::{check, CheckOptions, Date, Index, Kind, Report, Status};
use std::path::{Path, PathBuf};
use std::process::Command;
use std::sync::atomic::{AtomicUsize, Ordering};

fn data(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/data/import")
        .join(name)
}

/// Runs vocab-build with `args` and `--out`, and opens the index it wrote.
fn build(tag: &str, args: &[&str]) -> (Index<Vec<u8>>, String) {
    // Tests run in parallel: each build writes a file of its own.
    static N: AtomicUsize = AtomicUsize::new(0);
    let n = N.fetch_add(1, Ordering::SeqCst);
    let out = std::env::temp_dir().join(format!(
        "rollcall-import-{tag}-{}-{n}.rcx",
        std::process::id()
    ));
    let o = Command::new(env!("CARGO_BIN_EXE_vocab-build"))
        .args(args)
        .arg("--out")
        .arg(&out)
        .output()
        .unwrap();
    let progress = String::from_utf8_lossy(&o.stderr).to_string();
    assert!(o.status.success(), "{progress}");
    let bytes = std::fs::read(&out).unwrap();
    let _ = std::fs::remove_file(&out);
    let idx = Index::open(bytes).unwrap();
    idx.verify().unwrap();
    (idx, progress)
}

fn day(s: &str) -> Date {
    Date::parse(s).unwrap()
}

fn entry<'a>(r: &'a Report, input: &str) -> &'a rollcall::Entry {
    r.entries
        .iter()
        .find(|e| e.input.trim() == input)
        .unwrap_or_else(|| panic!("no entry {input}"))
}

fn kinds(e: &rollcall::Entry) -> Vec<Kind> {
    e.findings.iter().map(|f| f.kind).collect()
}

/// The codes an entry's findings suggest, in order.
fn suggested(e: &rollcall::Entry) -> Vec<&str> {
    e.findings
        .iter()
        .flat_map(|f| &f.suggestions)
        .map(|s| s.code.as_str())
        .collect()
}

fn loinc() -> (Index<Vec<u8>>, String) {
    let (t, m) = (data("Loinc.csv"), data("MapTo.csv"));
    build(
        "loinc",
        &[
            "--loinc",
            t.to_str().unwrap(),
            "--loinc-map-to",
            m.to_str().unwrap(),
            "--release",
            "2.78",
            "--release-date",
            "2024-08-06",
        ],
    )
}

/// Every invented LOINC number of the fixture carries the check digit of
/// the mod 10 scheme of the LOINC Users' Guide (its appendix on
/// calculating check digits; from memory), as rollcall computes it; the
/// check digit of 2345 is 7, as in the published code 2345-7 (from memory).
#[test]
fn loinc_fixture_numbers_have_their_check_digits() {
    assert_eq!(rollcall::systems::loinc_check_digit("2345"), Some(7));
    let text = std::fs::read_to_string(data("Loinc.csv")).unwrap();
    let mut n = 0;
    for line in text.lines().skip(1).filter(|l| l.starts_with("\"99")) {
        let code = line.split(',').next().unwrap().trim_matches('"');
        let (num, check) = code.split_once('-').unwrap();
        assert_eq!(
            rollcall::systems::loinc_check_digit(num),
            Some(check.parse().unwrap()),
            "{code}"
        );
        n += 1;
    }
    assert_eq!(n, 10);
}

#[test]
fn loinc_table_builds_a_one_release_index() {
    let (idx, progress) = loinc();
    assert!(
        progress.contains("10 terms, 2 deprecated, 2 trial or discouraged; 3 map-to rows"),
        "{progress}"
    );
    let v = idx.view();
    assert_eq!(v.meta().vocabulary, "loinc");
    assert_eq!(v.meta().release, "2.78");
    assert!(v.meta().snapshot());
    assert!(v.meta().notice.contains("Regenstrief Institute"));
    // LONG_COMMON_NAME is the description; COMPONENT when it is empty.
    let o = v.ordinal("9900001-0").unwrap();
    assert_eq!(
        v.description(o),
        "Quellase [Mass/volume] in Serum or Plasma"
    );
    assert_eq!(
        v.description(v.ordinal("9900008-5").unwrap()),
        "Quellase panel"
    );
    // The quoted field with a line break did not split the record.
    assert_eq!(
        v.description(v.ordinal("9900007-7").unwrap()),
        "Larkfield walk distance in 6 minutes"
    );
}

#[test]
fn loinc_statuses_reach_the_check() {
    let (idx, _) = loinc();
    let list = "9900001-0\n9900004-4\n9900003-6\n9900005-1\n9900006-9\n";
    let r = check(&idx, list, &CheckOptions::on(day("2025-01-01"), true));
    // A hyphenated LOINC code is a code, not a range.
    let a = entry(&r, "9900001-0");
    assert_eq!(a.status, Status::Valid);
    assert!(a.findings.iter().all(|f| f.kind != Kind::Pattern), "{a:?}");
    // DISCOURAGED and TRIAL: valid, with a release-status warning.
    for c in ["9900004-4", "9900003-6"] {
        let e = entry(&r, c);
        assert_eq!(e.status, Status::Valid, "{e:?}");
        assert!(kinds(e).contains(&Kind::ReleaseStatus), "{e:?}");
    }
    // DISCOURAGED with a MAP_TO row (the fixture's MapTo.csv: 9900004-4 ->
    // 9900001-0): the map-to code is suggested in a note.
    let e = entry(&r, "9900004-4");
    let to: Vec<&str> = e
        .findings
        .iter()
        .filter(|f| f.kind == Kind::ReleaseStatus)
        .flat_map(|f| &f.suggestions)
        .map(|s| s.code.as_str())
        .collect();
    assert_eq!(to, ["9900001-0"], "{e:?}");
    // DEPRECATED with MAP_TO: retired, the map-to targets suggested.
    let d = entry(&r, "9900005-1");
    assert_eq!(d.status, Status::Retired);
    let sugg = suggested(d);
    assert!(
        sugg.contains(&"9900010-1") && sugg.contains(&"9900002-8"),
        "{d:?}"
    );
    // DEPRECATED without MAP_TO: retired, nothing suggested.
    let g = entry(&r, "9900006-9");
    assert_eq!(g.status, Status::Retired);
    assert!(suggested(g).is_empty(), "{g:?}");
    // A wrong check digit (LOINC Users' Guide, mod 10: 9900001 -> 0) is
    // named as such, not read as a range; an unknown number with a right
    // check digit (9900011 -> 9, computed the same way) is unknown.
    let r = check(
        &idx,
        "9900001-1\n9900011-9\n",
        &CheckOptions::on(day("2025-01-01"), true),
    );
    let bad = &r.entries[0];
    assert_eq!(bad.status, Status::Malformed, "{bad:?}");
    assert!(bad.findings[0].message.contains("check digit"), "{bad:?}");
    assert_eq!(r.entries[1].status, Status::Unknown, "{:?}", r.entries[1]);
}

fn rxnorm() -> (Index<Vec<u8>>, String) {
    let d = data("rxnorm");
    build(
        "rxnorm",
        &[
            "--rxnorm",
            d.to_str().unwrap(),
            "--release-date",
            "2025-01-06",
        ],
    )
}

#[test]
fn rxnorm_names_term_types_and_retired_concepts() {
    let (idx, progress) = rxnorm();
    assert!(
        progress.contains("7 RXNORM names, 5 concepts in use (1 with every name suppressed)"),
        "{progress}"
    );
    assert!(
        progress.contains("3 retired concepts, 2 remapped"),
        "{progress}"
    );
    let v = idx.view();
    assert_eq!(v.meta().vocabulary, "rxnorm");
    assert_eq!(v.meta().release, "2025-01-06");
    // The SCD name wins over the SY and PSN names; the term type is shown.
    assert_eq!(
        v.description(v.ordinal("99000002").unwrap()),
        "quellamine 10 MG Oral Tablet [SCD]"
    );
    // Only SAB=RXNORM rows make concepts.
    assert!(v.ordinal("99000006").is_none());
    let list = "99000002\n99000010\n99000011\n99000012\n99000005\n";
    let r = check(&idx, list, &CheckOptions::on(day("2025-02-01"), true));
    assert_eq!(entry(&r, "99000002").status, Status::Valid);
    let m = entry(&r, "99000010");
    assert_eq!(m.status, Status::Retired);
    assert!(suggested(m).contains(&"99000002"), "{m:?}");
    let s = entry(&r, "99000012");
    let sugg = suggested(s);
    assert!(
        sugg.contains(&"99000002") && sugg.contains(&"99000003"),
        "{s:?}"
    );
    let gone = entry(&r, "99000011");
    assert_eq!(gone.status, Status::Retired);
    assert!(
        gone.findings.iter().all(|f| f.suggestions.is_empty()),
        "{gone:?}"
    );
    // Every name suppressed: in use, with a warning.
    assert!(kinds(entry(&r, "99000005")).contains(&Kind::ReleaseStatus));
}

fn table() -> (Index<Vec<u8>>, String) {
    let t = data("larkfield-findings.tsv");
    build(
        "table",
        &[
            "--table",
            t.to_str().unwrap(),
            "--id",
            "lhm-findings",
            "--title",
            "Larkfield findings",
            "--release-date",
            "2025-06-30",
        ],
    )
}

#[test]
fn table_builds_a_dated_graph() {
    let (idx, progress) = table();
    assert!(progress.contains("9 codes (dated)"), "{progress}");
    let v = idx.view();
    assert_eq!(v.meta().coverage_from.to_string(), "2018-01-01");
    assert_eq!(v.meta().coverage_to.to_string(), "2025-06-30");
    // Lower-case codes are stored upper-cased.
    assert!(v.ordinal("LHM-24").is_some());
    let opts = CheckOptions {
        from: day("2023-01-01"),
        to: day("2023-12-31"),
        billable: false,
    };
    // A child listed under its listed parent is redundant (here through the
    // second parent of LHM-21).
    let r = check(&idx, "LHM-20\nLHM-21\n", &opts);
    assert!(
        kinds(entry(&r, "LHM-21")).contains(&Kind::Redundant),
        "{r:?}"
    );
    // Every code under LHM-10 in the period listed: roll up to LHM-10.
    let r = check(&idx, "LHM-11\nLHM-12\nLHM-21\n", &opts);
    let up = r
        .list_findings
        .iter()
        .find(|f| f.kind == Kind::RollUp)
        .unwrap_or_else(|| panic!("{r:?}"));
    assert!(up.suggestions.iter().any(|s| s.code == "LHM-10"), "{up:?}");
    // Retired before the study period, with its replacement suggested.
    let r = check(&idx, "LHM-23\nLHM-24\n", &opts);
    let old = entry(&r, "LHM-23");
    assert_eq!(old.status, Status::Retired);
    assert!(suggested(old).contains(&"LHM-22"), "{old:?}");
    // Not yet in use in 2023.
    assert_eq!(entry(&r, "LHM-24").status, Status::NotYetValid);
    // Written in lower case, a hyphenated code is still that code, not a
    // range.
    let r = check(&idx, "lhm-24\n", &opts);
    assert_eq!(entry(&r, "lhm-24").status, Status::NotYetValid, "{r:?}");
}

/// A malformed row stops the build with the file and line, and nothing is
/// written.
#[test]
fn a_bad_table_row_names_its_line() {
    let dir = std::env::temp_dir().join(format!("rollcall-import-bad-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let t = dir.join("bad.tsv");
    std::fs::write(
        &t,
        "code\tdescription\tparent\n# a comment\nA1\tFirst\t\nA2\tSecond\tA9\n",
    )
    .unwrap();
    let out = dir.join("bad.rcx");
    let o = Command::new(env!("CARGO_BIN_EXE_vocab-build"))
        .args([
            "--table",
            t.to_str().unwrap(),
            "--id",
            "x",
            "--title",
            "X",
            "--release-date",
            "2025-01-01",
            "--out",
            out.to_str().unwrap(),
        ])
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(2));
    let msg = String::from_utf8_lossy(&o.stderr);
    assert!(
        msg.contains("bad.tsv line 4") && msg.contains("A9"),
        "{msg}"
    );
    assert!(!out.exists());
    let _ = std::fs::remove_dir_all(&dir);
}

/// The example table in the README builds as it is printed.
#[test]
fn the_readme_table_example_builds() {
    let readme =
        std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join("../README.md"))
            .unwrap();
    let start = readme
        .find("```text\ncode\tdescription")
        .expect("the README example")
        + 8;
    let end = start + readme[start..].find("```").unwrap();
    let dir = std::env::temp_dir().join(format!("rollcall-import-readme-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let t = dir.join("example.tsv");
    std::fs::write(&t, &readme[start..end]).unwrap();
    let (idx, progress) = build(
        "readme",
        &[
            "--table",
            t.to_str().unwrap(),
            "--id",
            "lhm-findings",
            "--title",
            "Larkfield findings",
            "--release-date",
            "2025-06-30",
        ],
    );
    assert!(progress.contains("6 codes (dated)"), "{progress}");
    assert_eq!(idx.view().meta().vocabulary, "lhm-findings");
    let _ = std::fs::remove_dir_all(&dir);
}
