//! The bundled ICD-9-CM index against the final CMS code file.

mod common;

use common::*;
use rollcall::model::Period;
use rollcall::{check, Index, Kind, Status};

fn icd9() -> Index<Vec<u8>> {
    let bytes = std::fs::read(root().join("vocab/icd9cm.rcx")).expect("vocab/icd9cm.rcx");
    let index = Index::open(bytes).expect("opens");
    index.verify().expect("checksum");
    index
}

/// Source: CMS ICD-9-CM version 32 diagnosis file (CMS32_DESC_LONG_DX.txt):
/// 14,567 codes, in force for FY2015; ICD-9-CM was retired for services from
/// 2015-10-01 (HHS final rule, 79 FR 45128).
#[test]
fn every_code_of_the_final_file_is_billable_in_fy2015_only() {
    let index = icd9();
    let v = index.view();
    let p = Period::new(day("2015-01-01"), day("2015-01-01"));
    let file: Vec<String> = source("CMS32_DESC_LONG_DX.txt.gz")
        .lines()
        .filter_map(|l| l.split_whitespace().next().map(str::to_string))
        .collect();
    assert_eq!(file.len(), 14_567);
    for c in &file {
        let o = v.ordinal(c).unwrap_or_else(|| panic!("{c}"));
        assert!(v.billable_in(o, &p), "{c}");
    }
    let billable = (0..v.len() as u32)
        .filter(|&o| v.billable_in(o, &p))
        .count();
    assert_eq!(billable, 14_567);
    assert_eq!(index.meta().coverage_to.to_string(), "2015-09-30");
}

/// Source: the same file: 25000 "Diabetes mellitus without mention of
/// complication, type II or unspecified type, not stated as uncontrolled",
/// E8800 and V5867, written dotted as 250.00, E880.0 and V58.67 (E codes
/// take the dot after the fourth character: ICD-9-CM conventions).
#[test]
fn dotted_forms_hierarchy_and_retirement() {
    let index = icd9();
    let r = check(
        &index,
        "250.00\nE880.0\nV58.67\n250\nE8800\n",
        &on("2015-01-01"),
    );
    assert_eq!(r.entries[0].status, Status::Valid);
    assert!(r.entries[0]
        .description
        .as_deref()
        .unwrap()
        .starts_with("Diabetes mellitus without mention of complication, type II"));
    assert_eq!(r.entries[1].code.as_deref(), Some("E880.0"));
    assert_eq!(r.entries[2].code.as_deref(), Some("V58.67"));
    assert_eq!(r.entries[3].status, Status::Header);
    assert_eq!(r.entries[4].code.as_deref(), Some("E880.0"));
    let v = index.view();
    let o = v.ordinal("25000").unwrap();
    let up: Vec<String> = v.ancestors(o).map(|a| v.code(a)).collect();
    assert_eq!(up, ["2500", "250"]);
    let later = check(&index, "250.00\n", &on("2016-01-01"));
    let f = &later.entries[0].findings[0];
    assert_eq!(f.kind, Kind::Retired);
    assert!(f.message.contains("2015-09-30"), "{}", f.message);
}
