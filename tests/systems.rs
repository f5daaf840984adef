//! Shape and check-digit checks of the systems rollcall does not ship,
//! against the published rules and real codes.

use rollcall::systems::*;

fn fits(s: System, c: &str) -> String {
    match shape(s, c) {
        Shape::Fits { code, .. } => code,
        other => panic!("{c} as {}: {other:?}", s.name()),
    }
}

fn fails(s: System, c: &str) -> String {
    match shape(s, c) {
        Shape::Fails { reason } => reason,
        other => panic!("{c} as {} should fail: {other:?}", s.name()),
    }
}

/// Source: LOINC Users' Guide, "Calculating Mod 10 check digits" (worked
/// example 12345 -> 5); real codes from the LOINC table: 2345-7 (glucose,
/// serum or plasma), 718-7 (hemoglobin, blood), 2160-0 (creatinine, serum or
/// plasma), 4548-4 (hemoglobin A1c/hemoglobin total in blood).
#[test]
fn loinc_mod_10() {
    assert_eq!(loinc_check_digit("12345"), Some(5));
    for c in ["2345-7", "718-7", "2160-0", "4548-4"] {
        assert_eq!(fits(System::Loinc, c), c);
    }
    assert!(fails(System::Loinc, "2345-8").contains("should be 7"));
    assert!(
        fails(System::Loinc, "23457").contains("2345-7"),
        "hyphen missing"
    );
    fails(System::Loinc, "E11.9");
    fails(System::Loinc, "2345-77");
}

/// Source: SNOMED CT Technical Implementation Guide, SCTID data type (6-18
/// digits, partition identifier, Verhoeff check digit); real ids from the
/// International Edition: 22298006 (myocardial infarction), 138875005 (the
/// root concept), 73211009 (diabetes mellitus), 44054006 (type 2 diabetes).
#[test]
fn snomed_verhoeff_and_partitions() {
    for c in ["22298006", "138875005", "73211009", "44054006"] {
        assert_eq!(fits(System::Snomed, c), c);
        assert_eq!(snomed_partition(c), Some(Partition::Concept));
    }
    assert!(fails(System::Snomed, "22298007").contains("check digit"));
    assert!(
        fails(System::Snomed, "22928006").contains("check digit"),
        "swap caught"
    );
    assert!(fails(System::Snomed, "22298036").contains("partition identifier 03"));
    fails(System::Snomed, "12345"); // too short
    fails(System::Snomed, "022298006"); // leading zero
                                        // A description id in the 01 partition: 22298006 with 01 and its check digit.
    let body = "2229801";
    let d = format!("{body}{}", verhoeff_check_digit(body).unwrap());
    assert_eq!(snomed_partition(&d), Some(Partition::Description));
    assert!(fits(System::Snomed, &d).len() == 8);
}

/// Source: FDA National Drug Code Directory (10-digit NDCs in 4-4-2, 5-3-2 or
/// 5-4-1 segments; the 11-digit 5-4-2 billing form pads the short segment
/// with a leading zero: common practice).
#[test]
fn ndc_forms_and_the_ambiguous_ten_digits() {
    assert_eq!(fits(System::Ndc, "0002-1433-80"), "00002-1433-80");
    fails(System::Ndc, "50090-347-0"); // 5-3-1 is no NDC layout
    assert_eq!(fits(System::Ndc, "12345-678-90"), "12345-0678-90");
    assert_eq!(fits(System::Ndc, "12345-6789-0"), "12345-6789-00");
    assert_eq!(fits(System::Ndc, "12345-6789-01"), "12345-6789-01");
    assert_eq!(fits(System::Ndc, "12345678901"), "12345-6789-01");
    match shape(System::Ndc, "1234567890") {
        Shape::Ambiguous { readings, reason } => {
            assert_eq!(
                readings,
                ["01234-5678-90", "12345-0678-90", "12345-6789-00"]
            );
            assert!(reason.contains("without hyphens"));
        }
        other => panic!("{other:?}"),
    }
    fails(System::Ndc, "123-4567-890");
    fails(System::Ndc, "123456789");
}

/// Source: CMS HCPCS Level II quarterly files (a letter and four digits, e.g.
/// J1815 insulin, E0601 CPAP device); AMA CPT categories (Category I five
/// digits, e.g. 99213; Category II four digits and F, e.g. 3044F; Category
/// III four digits and T, e.g. 0042T).
#[test]
fn hcpcs_and_cpt_shapes() {
    assert_eq!(fits(System::Hcpcs, "j1815"), "J1815");
    fits(System::Hcpcs, "E0601");
    fails(System::Hcpcs, "99213");
    fits(System::Cpt, "99213");
    fits(System::Cpt, "3044F");
    fits(System::Cpt, "0042T");
    fails(System::Cpt, "3044X");
    fails(System::Cpt, "9921");
}

/// Source: ICD-10-PCS Official Guidelines (seven characters; the letters O
/// and I are not used); 0DTJ4ZZ (resection of appendix, percutaneous
/// endoscopic) from the FY2024 PCS code file.
#[test]
fn icd10pcs_shape() {
    assert_eq!(fits(System::Icd10pcs, "0dtj4zz"), "0DTJ4ZZ");
    assert!(fails(System::Icd10pcs, "ODTJ4ZZ").contains("0DTJ4ZZ"));
    fails(System::Icd10pcs, "0DTJ4Z");
}

/// Source: CMS ICD-9-CM version 32 code file (CMS32_DESC_LONG_DX.txt): 25000
/// (diabetes mellitus without complication, type II), V5867, E8800 written
/// dotted as 250.00, V58.67, E880.0.
#[test]
fn icd9cm_shape() {
    assert_eq!(fits(System::Icd9cm, "25000"), "250.00");
    assert_eq!(fits(System::Icd9cm, "V5867"), "V58.67");
    assert_eq!(fits(System::Icd9cm, "E8800"), "E880.0");
    assert_eq!(fits(System::Icd9cm, "401.9"), "401.9");
    fails(System::Icd9cm, "E88001");
    fails(System::Icd9cm, "E11.9");
}

/// Source: the HPO OBO release hp-2025-01-16 (term ids HP: and seven digits;
/// HP:0001250 is Seizure).
#[test]
fn hpo_shape_and_names() {
    assert_eq!(fits(System::Hpo, "hp_0001250"), "HP:0001250");
    fails(System::Hpo, "HP:123");
    assert_eq!(System::parse("ICD-10-CM"), Some(System::Icd10cm));
    for s in ALL {
        assert_eq!(System::parse(s.name()), Some(s));
    }
    assert_eq!(System::parse("icd11"), None);
}

/// A few codes fit only one system's shape; short numbers fit several (common
/// practice: the system column or the loaded index must decide).
#[test]
fn candidates_by_shape() {
    assert_eq!(candidates("HP:0001250"), [System::Hpo]);
    assert_eq!(candidates("2345-7"), [System::Loinc]);
    assert!(candidates("E11.9").contains(&System::Icd10cm));
    assert!(!candidates("E11.9").contains(&System::Loinc));
    let c = candidates("99213");
    assert!(c.contains(&System::Cpt) && c.contains(&System::Rxnorm) && c.contains(&System::Icd9cm));
    assert!(candidates("%%%").is_empty());
}
