//! The bundled ICD-10-PCS index against the official files.

mod common;

use common::*;
use rollcall::model::Period;
use rollcall::{check, Index, Kind, Status};
use std::collections::BTreeSet;

fn pcs() -> Index<Vec<u8>> {
    let bytes = std::fs::read(root().join("vocab/icd10pcs.rcx")).expect("vocab/icd10pcs.rcx");
    let index = Index::open(bytes).expect("opens");
    index.verify().expect("checksum");
    index
}

/// Source: the official CMS ICD-10-PCS code-description file for FY2024
/// (icd10pcs-codes-FY2024.txt, 78,603 codes), the October 1 2023 release;
/// codes added by the April 1 2024 update are billable later in FY2024.
#[test]
fn billable_set_on_2023_10_01_equals_the_fy2024_code_file() {
    let file: BTreeSet<String> = source("icd10pcs-codes-FY2024.txt.gz")
        .lines()
        .filter_map(|l| l.split_whitespace().next().map(str::to_string))
        .collect();
    assert_eq!(file.len(), 78_603);
    let index = pcs();
    let on_oct_1 = billable_on_in(&index, "2023-10-01");
    let differ = on_oct_1.symmetric_difference(&file).count();
    assert_eq!((on_oct_1.len(), differ), (78_603, 0));
    let later = billable_on_in(&index, "2024-09-30");
    assert!(
        later.len() > file.len(),
        "the April 2024 update added codes"
    );
    assert_eq!(index.meta().vocabulary, "icd10pcs");
}

/// Source: the release history (icd10pcs-history-FY2016-FY2027.tsv, 82,508
/// codes): every code of it is billable on its dates and nowhere else; all
/// are seven characters with no O or I (ICD-10-PCS Official Guidelines).
#[test]
fn every_history_code_is_billable_exactly_on_its_dates() {
    let index = pcs();
    let v = index.view();
    let hist = source("icd10pcs-history-FY2016-FY2027.tsv.gz");
    let mut n = 0;
    for line in hist.lines().skip(1) {
        let f: Vec<&str> = line.split('\t').collect();
        let code = f[0];
        assert!(code.len() == 7 && !code.contains(['O', 'I']), "{code}");
        let o = v
            .ordinal(code)
            .unwrap_or_else(|| panic!("{code} in the index"));
        let spans: Vec<Period> = v.billable(o).collect();
        assert_eq!(spans, [Period::new(day(f[1]), day(f[2]))], "{code}");
        n += 1;
    }
    assert_eq!(n, 82_508);
    let billable = (0..v.len() as u32)
        .filter(|&o| v.billable(o).next().is_some())
        .count();
    assert_eq!(billable, 82_508);
}

/// The hierarchy by position (ICD-10-PCS Official Guidelines A.2-A.4: the
/// first character is the section, then body system, root operation, body
/// part). 0DTJ4ZZ, Resection of Appendix, Percutaneous Endoscopic Approach
/// (FY2024 code file), lies under 0DTJ, 0DT, 0D and 0, which are headers.
#[test]
fn positional_hierarchy_and_descriptions() {
    let index = pcs();
    let opts = on("2024-01-01");
    let r = check(&index, "0DTJ4ZZ\n0DT\n0DTJ4Z\n", &opts);
    assert_eq!(r.entries[0].status, Status::Valid);
    assert_eq!(
        r.entries[0].description.as_deref(),
        Some("Resection of Appendix, Percutaneous Endoscopic Approach")
    );
    assert_eq!(r.entries[1].status, Status::Header);
    assert!(r.entries[0]
        .findings
        .iter()
        .any(|f| f.kind == Kind::Redundant));
    assert_eq!(r.entries[2].status, Status::Malformed);
    let v = index.view();
    let o = v.ordinal("0DTJ4ZZ").unwrap();
    let up: Vec<String> = v.ancestors(o).map(|a| v.code(a)).collect();
    assert_eq!(up, ["0DTJ", "0DT", "0D", "0"]);
    // A code the FY2024 file does not describe says so.
    let gone = (0..v.len() as u32)
        .find(|&o| v.code(o).len() == 7 && v.description(o).is_empty())
        .expect("a code valid only outside FY2024");
    assert!(v.description_or_note(gone).contains("no description"));
}

/// Source: the release history (icd10pcs-history-FY2016-FY2027.tsv):
/// 5A1D00Z (Performance of Urinary Filtration, Single) was valid until
/// 2017-09-30, and 5A1D70Z, 5A1D80Z and 5A1D90Z under the same body part
/// from 2017-10-01. ICD-10-PCS publishes no conversion table beside it, so
/// the check offers the codes in use that share the most characters, and
/// every one is a real seven-character code in use in the period (not the
/// table position 5A1D, which is no code: Official Guidelines A.1-A.2,
/// from memory).
#[test]
fn a_retired_code_is_offered_real_codes_in_use() {
    let index = pcs();
    let hist = source("icd10pcs-history-FY2016-FY2027.tsv.gz");
    let valid_on = |code: &str, d: &str| {
        hist.lines().skip(1).any(|l| {
            let f: Vec<&str> = l.split('\t').collect();
            f[0] == code && f[1] <= d && d <= f[2]
        })
    };
    assert!(!valid_on("5A1D00Z", "20190101"));
    let r = check(&index, "5A1D00Z\n", &on("2019-01-01"));
    let e = &r.entries[0];
    assert_eq!(e.status, Status::Retired);
    let f = e.findings.iter().find(|f| f.kind == Kind::Retired).unwrap();
    let offered: Vec<&str> = f.suggestions.iter().map(|s| s.code.as_str()).collect();
    assert_eq!(offered, ["5A1D70Z", "5A1D80Z", "5A1D90Z"]);
    for c in offered {
        assert!(c.len() == 7 && valid_on(c, "20190101"), "{c}");
    }
}
