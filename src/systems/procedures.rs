//! Procedure code shapes: ICD-10-PCS, HCPCS Level II and CPT.

use super::{all_digits, fails, fits, Shape};

/// ICD-10-PCS: exactly seven characters, each a digit or a letter other
/// than O and I, which the system leaves out so they are not read as zero
/// and one (ICD-10-PCS Official Guidelines and the CMS reference manual).
/// Each position has its own meaning: section, body system, root
/// operation, body part, approach, device, qualifier.
pub(super) fn icd10pcs(c: &str) -> Shape {
    let u = c.to_ascii_uppercase();
    if u.len() != 7 || !u.bytes().all(|b| b.is_ascii_alphanumeric()) {
        return fails(
            "an ICD-10-PCS code is exactly seven letters or digits, with no dot (0DTJ4ZZ)",
        );
    }
    if u.contains(['O', 'I']) {
        let meant: String = u
            .chars()
            .map(|ch| match ch {
                'O' => '0',
                'I' => '1',
                x => x,
            })
            .collect();
        return fails(format!(
            "ICD-10-PCS never uses the letters O and I; {meant}, with zero and one, may be meant"
        ));
    }
    fits(u, "has the ICD-10-PCS shape (seven characters, no O or I)")
}

/// HCPCS Level II: one letter and four digits (the layout of the CMS
/// HCPCS quarterly update files; common practice).
pub(super) fn hcpcs(c: &str) -> Shape {
    let u = c.to_ascii_uppercase();
    let b = u.as_bytes();
    if b.len() == 5 && b[0].is_ascii_uppercase() && all_digits(&u[1..]) {
        return fits(u, "has the HCPCS Level II shape (a letter and four digits)");
    }
    fails("a HCPCS Level II code is one letter and four digits (J1815, E0601)")
}

/// CPT: five digits for Category I; four digits and F for Category II;
/// four digits and T for Category III (AMA CPT code categories; common
/// practice). From memory: four digits and U are Proprietary Laboratory
/// Analyses codes, and four digits and M multianalyte assays.
pub(super) fn cpt(c: &str) -> Shape {
    let u = c.to_ascii_uppercase();
    if u.len() != 5 {
        return fails(
            "a CPT code has five characters: five digits (99213), or four digits and F, T, U or M",
        );
    }
    if all_digits(&u) {
        return fits(u, "has the CPT Category I shape (five digits)");
    }
    // `u` has five bytes, but not necessarily five characters.
    if !u.get(..4).is_some_and(all_digits) {
        return fails(
            "a CPT code has five characters: five digits (99213), or four digits and F, T, U or M",
        );
    }
    let what = match u.as_bytes()[4] {
        b'F' => "CPT Category II (performance measure)",
        b'T' => "CPT Category III (emerging technology)",
        b'U' => "CPT Proprietary Laboratory Analyses",
        b'M' => "CPT multianalyte assay with algorithmic analyses",
        _ => return fails(
            "a CPT code has five characters: five digits (99213), or four digits and F, T, U or M",
        ),
    };
    fits(u, format!("has the {what} shape"))
}
