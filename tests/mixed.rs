//! Lists with a system column: each row checked in the system it names,
//! against the official files the bundled indexes are built from.

mod common;

use common::*;
use rollcall::mixed::{check_list, systems_named, Primary};
use rollcall::systems::System;
use rollcall::{check, check_among, Index, Kind, Report, Severity, Status};

fn open(name: &str) -> Index<Vec<u8>> {
    let bytes = std::fs::read(root().join("vocab").join(name)).expect("bundled index");
    let index = Index::open(bytes).expect("opens");
    index.verify().expect("checksum");
    index
}

/// The description of `code` in an official code-description file
/// (code, spaces, description).
fn described(file: &str, code: &str) -> String {
    source(file)
        .lines()
        .find_map(|l| {
            let (c, d) = l.split_once(' ')?;
            (c == code).then(|| d.trim().to_string())
        })
        .unwrap_or_else(|| panic!("{code} is not in {file}"))
}

const LIST: &str = "# Larkfield Heart and Metabolism Study, mixed draft\n\
system\tcode\tlabel\n\
ICD-10-CM\tE11.9\t\n\
ICD-10-PCS\t02703ZZ\t\n\
ICD-9-CM\t250.00\t\n\
LOINC\t2345-7\t\n\
http://loinc.org\t2345-6\t\n\
ICD-11\t5A11\t\n\
\tI10\t\n\
\t0DTJ4ZZ\t\n\
http://www.cms.gov/Medicare/Coding/ICD10\t0DTJ4ZZ\t\n";

fn fy2024() -> rollcall::CheckOptions {
    // FY2024: the year of the code files icd10cm-codes-FY2024.txt and
    // icd10pcs-codes-FY2024.txt (October 1 2023 to September 30 2024).
    period("2023-10-01", "2024-09-30")
}

fn mixed(cm: &Index<Vec<u8>>, others: &[&Index<Vec<u8>>]) -> Report {
    check_list(Primary::Index(cm), others, LIST, &fy2024())
}

#[test]
fn each_row_is_checked_in_the_system_its_cell_names() {
    let (cm, pcs, icd9) = (index(), open("icd10pcs.rcx"), open("icd9cm.rcx"));
    let r = mixed(&cm, &[&pcs, &icd9]);
    assert_eq!(r.entries.len(), 11, "one entry per input line");
    let e = |line: usize| &r.entries[line - 1];
    let sys = |line: usize| e(line).system.as_deref();

    // Source: icd10cm-codes-FY2024.txt (CMS): E119 is a billable code of FY2024.
    assert_eq!((e(3).status, sys(3)), (Status::Valid, Some("icd10cm")));
    assert_eq!(
        e(3).description.as_deref(),
        Some(described("icd10cm-codes-FY2024.txt.gz", "E119").as_str())
    );
    // Source: icd10pcs-codes-FY2024.txt (CMS): 02703ZZ "Dilation of Coronary
    // Artery, One Artery, Percutaneous Approach" is a code of FY2024.
    assert_eq!((e(4).status, sys(4)), (Status::Valid, Some("icd10pcs")));
    assert_eq!(
        e(4).description.as_deref(),
        Some(described("icd10pcs-codes-FY2024.txt.gz", "02703ZZ").as_str())
    );
    // Source: CMS32_DESC_LONG_DX.txt (CMS, ICD-9-CM version 32): 25000 is a
    // code of the final release; ICD-9-CM was retired for services from
    // 2015-10-01 (HHS final rule, 79 FR 45128), so in FY2024 it is retired.
    assert_eq!((e(5).status, sys(5)), (Status::Retired, Some("icd9cm")));
    assert_eq!(
        e(5).description.as_deref(),
        Some(described("CMS32_DESC_LONG_DX.txt.gz", "25000").as_str())
    );
    assert!(e(5).findings[0].message.contains("2015-09-30"));
    // Source: LOINC Users' Guide, the mod 10 check digit: 2345-7 is right,
    // so 2345-6 is not a LOINC code; rollcall ships no LOINC content.
    assert_eq!((e(6).status, sys(6)), (Status::ShapeOnly, Some("loinc")));
    assert_eq!((e(7).status, sys(7)), (Status::Malformed, Some("loinc")));
    // A value that names no system: malformed, naming the line, the value
    // and the accepted names (common practice: ICD-11 is not bundled).
    assert_eq!((e(8).status, sys(8)), (Status::Malformed, None));
    let m = &e(8).findings[0];
    assert_eq!((m.kind, m.severity), (Kind::Malformed, Severity::Error));
    for part in ["line 8", "\"ICD-11\"", "icd10pcs", "rxnorm", "empty"] {
        assert!(m.message.contains(part), "{part}: {}", m.message);
    }
    // An empty cell: the system is told from the code, as without a column.
    // Source: icd10cm-codes-FY2024.txt: I10 is billable in FY2024.
    assert_eq!((e(9).status, sys(9)), (Status::Valid, Some("icd10cm")));
    // Source: icd10pcs-codes-FY2024.txt: 0DTJ4ZZ "Resection of Appendix,
    // Percutaneous Endoscopic Approach" — with no cell it is named as an
    // ICD-10-PCS code inside the ICD-10-CM rows; with the FHIR URI of
    // ICD-10-PCS it is checked there.
    assert_eq!(
        (e(10).status, sys(10)),
        (Status::OtherSystem, Some("icd10pcs"))
    );
    assert!(e(10).findings[0]
        .message
        .contains(&described("icd10pcs-codes-FY2024.txt.gz", "0DTJ4ZZ")));
    assert_eq!((e(11).status, sys(11)), (Status::Valid, Some("icd10pcs")));

    // The summary counts the merged entries.
    let s = &r.summary;
    assert_eq!(s.entries, 9);
    let counted = rollcall::Summary::of(11, &r.entries, &r.list_findings);
    assert_eq!(
        (s.errors, s.warnings, s.infos, &s.systems),
        (
            counted.errors,
            counted.warnings,
            counted.infos,
            &counted.systems
        )
    );
    let parts: Vec<(&str, &str, usize)> = s
        .by_system
        .iter()
        .map(|p| (p.system.as_str(), p.checked.as_str(), p.entries))
        .collect();
    assert_eq!(
        parts,
        [
            ("icd10cm", "index", 3),
            ("icd10pcs", "index", 2),
            ("icd9cm", "index", 1),
            ("loinc", "shape", 2)
        ]
    );
    assert_eq!(
        s.by_system.iter().map(|p| p.errors).sum::<usize>(),
        s.errors - 1,
        "every error but the refused row's belongs to a system"
    );
}

#[test]
fn a_system_s_rows_get_the_report_of_a_list_of_their_own() {
    let (cm, pcs, icd9) = (index(), open("icd10pcs.rcx"), open("icd9cm.rcx"));
    let r = mixed(&cm, &[&pcs, &icd9]);
    // The PCS rows alone, at their own line numbers.
    let alone: String = LIST
        .lines()
        .enumerate()
        .map(|(i, l)| {
            if i == 1 || [3, 10].contains(&i) {
                l
            } else {
                ""
            }
        })
        .collect::<Vec<_>>()
        .join("\n");
    let own = check(&pcs, &alone, &fy2024());
    for line in [4, 11] {
        assert_eq!(r.entries[line - 1], own.entries[line - 1], "line {line}");
    }
}

#[test]
fn a_bundled_system_without_its_index_is_checked_by_shape_with_a_warning() {
    let cm = index();
    let r = mixed(&cm, &[]);
    let e = &r.entries[3];
    assert_eq!(
        (e.status, e.system.as_deref()),
        (Status::ShapeOnly, Some("icd10pcs"))
    );
    let f = &e.findings[0];
    assert_eq!(f.severity, Severity::Warning);
    assert!(
        f.message.contains("no ICD-10-PCS index is loaded"),
        "{}",
        f.message
    );
    let p = r
        .summary
        .by_system
        .iter()
        .find(|p| p.system == "icd10pcs")
        .unwrap();
    assert_eq!(p.checked, "not-loaded");
}

#[test]
fn a_list_without_system_cells_gets_the_report_of_before() {
    let (cm, icd9) = (index(), icd9_index());
    let text = std::fs::read_to_string(root().join("demo-data/demo-list.tsv")).unwrap();
    let opts = period("2019-01-01", "2024-12-31");
    let before = check_among(&cm, &[icd9.view()], &text, &opts);
    assert_eq!(
        check_list(Primary::Index(&cm), &[&icd9], &text, &opts),
        before
    );
    assert!(before.summary.by_system.is_empty());
    assert!(systems_named(&text).is_empty());
    assert_eq!(
        systems_named(LIST),
        [
            System::Icd10cm,
            System::Icd10pcs,
            System::Icd9cm,
            System::Loinc
        ]
    );
}

/// The cell wins over the primary system: with LOINC as the primary (as
/// `--system loinc`), rows naming ICD-10-CM are still checked in ICD-10-CM
/// and rows with no cell by the LOINC shape.
#[test]
fn a_row_s_cell_wins_over_the_primary_system() {
    let cm = index();
    let text = "system,code\nICD-10-CM,E11.9\n,2345-7\n,E11.9\n";
    let r = check_list(Primary::Shapes(System::Loinc), &[&cm], text, &fy2024());
    let got: Vec<(Status, Option<&str>)> = r.entries[1..]
        .iter()
        .map(|e| (e.status, e.system.as_deref()))
        .collect();
    assert_eq!(
        got,
        [
            (Status::Valid, Some("icd10cm")),
            (Status::ShapeOnly, Some("loinc")),
            (Status::Malformed, None),
        ]
    );
}
