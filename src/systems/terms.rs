//! LOINC, SNOMED CT and HPO identifier shapes.

use super::digits::{luhn_check_digit, verhoeff_valid};
use super::{all_digits, fails, fits, Shape};

/// The LOINC check digit of the numeric part of a code (the mod 10 scheme
/// of the LOINC Users' Guide).
pub fn loinc_check_digit(number: &str) -> Option<u8> {
    luhn_check_digit(number)
}

/// LOINC: a number, a hyphen and its mod 10 check digit (`2345-7`; LOINC
/// Users' Guide). From memory: the numbers issued so far have at most five
/// digits; up to seven are accepted here.
pub(super) fn loinc(c: &str) -> Shape {
    let Some((num, check)) = c.split_once('-') else {
        if all_digits(c) && c.len() >= 2 {
            let (n, d) = c.split_at(c.len() - 1);
            if loinc_check_digit(n) == Some(d.as_bytes()[0] - b'0') {
                return fails(format!(
                    "a LOINC code is written with a hyphen before its check digit: {n}-{d}"
                ));
            }
        }
        return fails("a LOINC code is a number, a hyphen and a check digit (2345-7)");
    };
    if !all_digits(num) || num.len() > 7 || check.len() != 1 || !all_digits(check) {
        return fails("a LOINC code is a number, a hyphen and a check digit (2345-7)");
    }
    let num = num.trim_start_matches('0');
    let num = if num.is_empty() { "0" } else { num };
    let want = loinc_check_digit(num).expect("digits");
    let got = check.as_bytes()[0] - b'0';
    if want != got {
        return fails(format!(
            "the check digit of {num}-{got} should be {want} (LOINC mod 10): a digit may be mistyped"
        ));
    }
    fits(
        format!("{num}-{got}"),
        "has the LOINC shape and a correct check digit",
    )
}

/// What a SNOMED CT identifier identifies, from its partition identifier
/// (the two digits before the check digit; SNOMED CT Technical
/// Implementation Guide, "SCTID" data type).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Partition {
    /// `00`: a concept, in the short (international) format.
    Concept,
    /// `01`: a description.
    Description,
    /// `02`: a relationship.
    Relationship,
    /// `10`: a concept of an extension, with a namespace.
    ExtensionConcept,
    /// `11`: a description of an extension.
    ExtensionDescription,
    /// `12`: a relationship of an extension.
    ExtensionRelationship,
}

impl Partition {
    /// In words.
    pub fn words(self) -> &'static str {
        match self {
            Partition::Concept => "a concept identifier",
            Partition::Description => "a description identifier",
            Partition::Relationship => "a relationship identifier",
            Partition::ExtensionConcept => "a concept identifier of an extension",
            Partition::ExtensionDescription => "a description identifier of an extension",
            Partition::ExtensionRelationship => "a relationship identifier of an extension",
        }
    }
}

/// The partition of a SNOMED CT identifier (digits only, at least three).
pub fn snomed_partition(id: &str) -> Option<Partition> {
    if id.len() < 3 || !all_digits(id) {
        return None;
    }
    match &id[id.len() - 3..id.len() - 1] {
        "00" => Some(Partition::Concept),
        "01" => Some(Partition::Description),
        "02" => Some(Partition::Relationship),
        "10" => Some(Partition::ExtensionConcept),
        "11" => Some(Partition::ExtensionDescription),
        "12" => Some(Partition::ExtensionRelationship),
        _ => None,
    }
}

/// SNOMED CT identifiers: 6 to 18 digits, no leading zero, a partition
/// identifier and a Verhoeff check digit last (SNOMED CT Technical
/// Implementation Guide, "SCTID" data type).
pub(super) fn snomed(c: &str) -> Shape {
    if !all_digits(c) || !(6..=18).contains(&c.len()) || c.starts_with('0') {
        return fails("a SNOMED CT identifier is 6 to 18 digits with no leading zero (22298006)");
    }
    let Some(part) = snomed_partition(c) else {
        return fails(format!(
            "{c} has the partition identifier {}, which SNOMED CT does not use (00, 01, 02, 10, 11, 12)",
            &c[c.len() - 3..c.len() - 1]
        ));
    };
    if !verhoeff_valid(c) {
        return fails(format!(
            "{c} fails the SNOMED CT (Verhoeff) check digit: a digit may be mistyped or two swapped"
        ));
    }
    let mut note = format!(
        "has a correct SNOMED CT check digit; it is {}",
        part.words()
    );
    if matches!(
        part,
        Partition::ExtensionConcept
            | Partition::ExtensionDescription
            | Partition::ExtensionRelationship
    ) && c.len() >= 10
    {
        note.push_str(&format!(" (namespace {})", &c[c.len() - 10..c.len() - 3]));
    }
    fits(c, note)
}

/// HPO terms: `HP:` and seven digits (the HPO OBO file's term ids); the
/// forms `HP_0001250` and lower case are read as the same term.
pub(super) fn hpo(c: &str) -> Shape {
    let u = c.to_ascii_uppercase();
    let rest = u
        .strip_prefix("HP:")
        .or_else(|| u.strip_prefix("HP_"))
        .unwrap_or("");
    if rest.len() == 7 && all_digits(rest) {
        return fits(format!("HP:{rest}"), "has the HPO term shape");
    }
    fails("an HPO term is HP: and seven digits (HP:0001250)")
}
