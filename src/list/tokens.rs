//! What a word of a draft is: a code (or a pattern, a range, a mistyped
//! code), or prose. Shapes only: no index is consulted, so the same words
//! are taken whatever vocabulary the list is checked against.
//!
//! Two strengths. A *strong* shape is taken anywhere, even inside a
//! sentence (`E11.9`, `E1165`, `HP:0001250`, `0DTJ4ZZ`, `E11.*`, `E08-E13`).
//! A *listed* shape is taken only where the writer set the word apart as a
//! code: first on a line or item, inside quotes or backticks, in bold, in a
//! table's code column, or in a run of codes (`250.00, 401.9`). Numbers
//! (ICD-9-CM `250.00`, LOINC `2345-7`) and lower-case undotted codes are
//! listed shapes, so "12 months", "type 2" or "100.4 F" stay prose.

/// How strongly a word looks like a code.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum Strength {
    /// Not a code.
    Prose,
    /// A code where the writer set it apart as one.
    Listed,
    /// A code anywhere.
    Strong,
}

/// Words of clinical prose that have a code's shape but, in running text,
/// name something else (vitamins, influenza subtypes, grant mechanisms,
/// lab names). Taken as codes only where set apart as codes. Common practice.
const PROSE_WORDS: &[&str] = &[
    "B12", "H1N1", "H3N2", "H5N1", "H7N9", "R01", "R21", "R03", "K23", "K24", "K99", "U01", "U54",
    "P30", "P50", "T32", "A1C", "P2Y12",
];

fn upper_alnum(b: u8) -> bool {
    b.is_ascii_uppercase() || b.is_ascii_digit()
}

fn digits(s: &str) -> usize {
    s.bytes().filter(u8::is_ascii_digit).count()
}

/// The ICD-10 head: a letter, a digit, a letter or digit (`E11`, `C4A`),
/// or two letters and a digit (`QA0`, and mistypes such as `SR2`).
fn icd10_head(h: &[u8], letters_ok: bool) -> bool {
    h.len() == 3
        && h[0].is_ascii_alphabetic()
        && h[2].is_ascii_alphanumeric()
        && (h[1].is_ascii_digit()
            || (letters_ok && h[1].is_ascii_alphabetic() && h[2].is_ascii_digit()))
}

/// A dotted ICD-10 shape (`E11.9`, `e11.65`, `G43.7O9`, `SR2.002B`,
/// `QA0.0101`): letters where digits belong are kept, for the check to
/// read or repair.
fn dotted_icd10(w: &str) -> bool {
    let Some((head, tail)) = w.split_once('.') else {
        return false;
    };
    let h = head.as_bytes();
    let two_letters = h.len() == 3 && h[1].is_ascii_alphabetic();
    icd10_head(h, true)
        && (1..=4).contains(&tail.len())
        && (!two_letters || tail.len() >= 2)
        && tail.bytes().all(|b| b.is_ascii_alphanumeric())
}

/// An undotted upper-case ICD-10 shape with at least two digits (`E1165`,
/// `I10`, `T360X1A`, `QA00101`).
fn undotted_icd10(w: &str) -> bool {
    let b = w.as_bytes();
    (3..=7).contains(&b.len())
        && b.iter().all(|&c| upper_alnum(c))
        && digits(w) >= 2
        && (icd10_head(&b[..3], false) || (b.len() == 7 && icd10_head(&b[..3], true)))
}

/// ICD-10-PCS: seven characters of its alphabet (no I or O), starting with
/// a digit (every medical and surgical section) or a section letter.
fn pcs(w: &str) -> bool {
    let b = w.as_bytes();
    b.len() == 7
        && b.iter()
            .all(|&c| c.is_ascii_digit() || (c.is_ascii_uppercase() && c != b'I' && c != b'O'))
        && (b[0].is_ascii_digit() || b"BCDFGHX".contains(&b[0]))
        && b.iter().any(u8::is_ascii_uppercase)
        && digits(w) >= 1
}

/// An HPO term id (`HP:0001250`, `HP_0001250`, any case).
fn hpo(w: &str) -> bool {
    let b = w.as_bytes();
    b.len() == 10
        && b[..2].eq_ignore_ascii_case(b"HP")
        && matches!(b[2], b':' | b'_')
        && b[3..].iter().all(u8::is_ascii_digit)
}

/// ICD-9-CM: `250.00`, `401.9`, `428`, `V45.81`, `E849.0`.
fn icd9(w: &str) -> bool {
    let (head, tail) = w.split_once('.').unwrap_or((w, ""));
    let h = head.as_bytes();
    let head_ok = match h.first() {
        Some(c) if c.is_ascii_digit() => h.len() == 3 && h.iter().all(u8::is_ascii_digit),
        Some(b'V' | b'v') => h.len() == 3 && h[1..].iter().all(u8::is_ascii_digit),
        Some(b'E' | b'e') => h.len() == 4 && h[1..].iter().all(u8::is_ascii_digit),
        _ => false,
    };
    head_ok
        && tail.len() <= 2
        && tail.bytes().all(|b| b.is_ascii_digit())
        && (w.contains('.') != tail.is_empty())
}

/// LOINC: one to seven digits, a hyphen and a check digit (`2345-7`).
fn loinc(w: &str) -> bool {
    let Some((n, d)) = w.split_once('-') else {
        return false;
    };
    (3..=7).contains(&n.len())
        && n.bytes().all(|b| b.is_ascii_digit())
        && d.len() == 1
        && d.as_bytes()[0].is_ascii_digit()
}

/// A code start followed by `*` or `%`, or `.-` (`E11.*`, `E11%`, `a40%`).
fn wildcard(w: &str) -> bool {
    let stem = w.trim_end_matches(['*', '%']);
    let stem = if stem.len() == w.len() {
        match w.strip_suffix(".-") {
            Some(s) => s,
            None => return false,
        }
    } else {
        stem
    };
    let stem = stem.strip_suffix('.').unwrap_or(stem);
    let b = stem.as_bytes();
    !b.is_empty()
        && b.len() <= 7
        && b[0].is_ascii_alphabetic()
        && stem.bytes().all(|c| c.is_ascii_alphanumeric() || c == b'.')
        && stem.bytes().any(|c| c.is_ascii_digit())
}

/// The strength of one word as written (already stripped of quotes and
/// markdown marks).
pub fn strength(w: &str) -> Strength {
    if w.is_empty() || w.len() > 24 {
        return Strength::Prose;
    }
    if let Some((a, b)) = w.split_once(['-', '–']) {
        let b = b.trim_start_matches('-');
        // A range of codes (`E08-E13`), or a LOINC code.
        if (dotted_icd10(a) || undotted_icd10(a) || icd10_head(a.as_bytes(), false))
            && (dotted_icd10(b) || undotted_icd10(b) || icd10_head(b.as_bytes(), false))
            && a.as_bytes()[0].is_ascii_uppercase()
        {
            return Strength::Strong;
        }
        if loinc(w) {
            // With four or more digits and a right check digit (LOINC's
            // mod 10 rule), a LOINC code even in prose.
            let (n, d) = w.split_once('-').unwrap_or_default();
            let right = crate::systems::terms::loinc_check_digit(n)
                .is_some_and(|c| d.as_bytes().first() == Some(&(b'0' + c)));
            return if n.len() >= 4 && right {
                Strength::Strong
            } else {
                Strength::Listed
            };
        }
        if w.ends_with(".-") && wildcard(w) {
            return Strength::Strong;
        }
        return Strength::Prose;
    }
    if hpo(w) || wildcard(w) && w.as_bytes()[0].is_ascii_uppercase() {
        return Strength::Strong;
    }
    if dotted_icd10(w) && !w.as_bytes()[0].is_ascii_digit() {
        return Strength::Strong;
    }
    if undotted_icd10(w) {
        return if PROSE_WORDS.contains(&w) {
            Strength::Listed
        } else {
            Strength::Strong
        };
    }
    if pcs(w) {
        // Letter sections (imaging, nuclear medicine...) share their shape
        // with gene names such as CYP2C19.
        return if w.as_bytes()[0].is_ascii_digit() {
            Strength::Strong
        } else {
            Strength::Listed
        };
    }
    let upper = w.to_ascii_uppercase();
    if icd9(w)
        || wildcard(w)
        || undotted_icd10(&upper)
        || icd10_head(upper.as_bytes(), false)
        || upper.len() == 7 && pcs(&upper)
    {
        return Strength::Listed;
    }
    Strength::Prose
}

/// Whether the word names a code system (`ICD-10-PCS`, `LOINC`, a FHIR URI).
pub fn names_system(w: &str) -> Option<crate::systems::System> {
    let w = w.trim_matches(|c: char| !c.is_ascii_alphanumeric() && c != ':' && c != '/');
    if w.len() < 3 || w.len() > 60 {
        return None;
    }
    crate::systems::System::from_cell(w).ok().flatten()
}

/// The system a code's shape alone makes clear among the bundled systems,
/// for a draft checked as ICD-10-CM: an HPO term, or an ICD-10-PCS code
/// (seven characters starting with a digit, which no ICD-10-CM code does).
///
/// An ICD-9-CM number is left to the check: it is a code of another system
/// in the list's own, named with its GEM targets where the ICD-9-CM index is
/// at hand, as the same code on a line of a plain list is (checked in
/// ICD-9-CM's own index it would be only "retired", since that whole system
/// was).
pub fn system_by_shape(w: &str) -> Option<crate::systems::System> {
    use crate::systems::System;
    if hpo(w) {
        Some(System::Hpo)
    } else if pcs(&w.to_ascii_uppercase()) && w.as_bytes()[0].is_ascii_digit() {
        Some(System::Icd10pcs)
    } else {
        None
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn codes_are_strong_anywhere() {
        // Shapes from the code files: ICD-10-CM (FY2024 code file, and
        // QA00101 from the FY2026 history), ICD-10-PCS, HPO.
        for w in [
            "E11.9",
            "e11.65",
            "E1165",
            "I10",
            "T36.0X1A",
            "QA0.0101",
            "QA00101",
            "0DTJ4ZZ",
            "HP:0001250",
            "hp_0001250",
            "E11.*",
            "E11%",
            "E08-E13",
            "E11.-",
            "C4A.0",
            "2345-7",
            "V45.81",
        ] {
            assert_eq!(strength(w), Strength::Strong, "{w}");
        }
    }

    #[test]
    fn mistyped_codes_are_still_codes() {
        for w in ["G43.7O9", "SR2.002B", "I5O.22", "E1l.9"] {
            assert_eq!(strength(w), Strength::Strong, "{w}");
        }
    }

    #[test]
    fn numbers_and_lowercase_need_a_listed_place() {
        // 2345-8 has a wrong check digit (LOINC's mod 10 rule gives 7).
        for w in [
            "250.00", "401.9", "428", "E849.0", "P2Y12", "2345-8", "718-7", "e1165", "e11", "a40%",
            "CYP2C19", "GZ3ZZZZ",
        ] {
            assert_eq!(strength(w), Strength::Listed, "{w}");
        }
    }

    #[test]
    fn prose_words_are_prose() {
        for w in [
            "COVID-19",
            "HbA1c",
            "2",
            "12",
            "ICD-10-CM",
            "FY2024",
            "T2DM",
            "eGFR",
            "60",
            "2019-2024",
            "1-2",
            "CD4",
            "G6PD",
            "L4-L5",
            "C5-C6",
            "BRCA1",
            "PM2.5",
            "2024-01-01",
            "mg/dL",
            "SARS-CoV-2",
            "NT-proBNP",
            "v2",
            "COVID19",
        ] {
            assert_eq!(strength(w), Strength::Prose, "{w}");
        }
        // In prose these name vitamins and influenza subtypes.
        assert_eq!(strength("B12"), Strength::Listed);
        assert_eq!(strength("H1N1"), Strength::Listed);
    }

    #[test]
    fn systems_by_shape() {
        use crate::systems::System;
        assert_eq!(system_by_shape("0DTJ4ZZ"), Some(System::Icd10pcs));
        assert_eq!(system_by_shape("HP:0001250"), Some(System::Hpo));
        assert_eq!(system_by_shape("250.00"), None);
        assert_eq!(system_by_shape("E11.9"), None);
        assert_eq!(names_system("(ICD-10-PCS)"), Some(System::Icd10pcs));
        assert_eq!(names_system("Procedures"), None);
    }
}
