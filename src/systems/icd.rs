//! ICD-10-CM and ICD-9-CM diagnosis code shapes.

use super::{fails, fits, Shape};

fn undot(c: &str) -> String {
    c.chars()
        .filter(|&ch| ch != '.')
        .collect::<String>()
        .to_ascii_uppercase()
}

/// ICD-10-CM: a letter, then a digit (or a letter, for the few categories
/// such as QA0 added from FY2026), a third character, then up to four more
/// characters, with a dot after the third (ICD-10-CM Official Guidelines,
/// section I.A: codes have 3 to 7 characters).
pub(super) fn icd10cm(c: &str) -> Shape {
    let u = undot(c);
    let b = u.as_bytes();
    let ok = (3..=7).contains(&b.len())
        && b[0].is_ascii_uppercase()
        && b.iter().all(|x| x.is_ascii_alphanumeric())
        && (b[1].is_ascii_digit() || b[2].is_ascii_digit());
    if !ok {
        return fails("an ICD-10-CM code is a letter, a digit, then 1 to 5 more letters or digits (E11, E11.9, S52.521A)");
    }
    let dotted = if u.len() > 3 {
        format!("{}.{}", &u[..3], &u[3..])
    } else {
        u
    };
    fits(dotted, "has the ICD-10-CM shape")
}

/// ICD-9-CM diagnoses: three digits (001-999) with up to two more after a
/// dot; V codes, V and two digits with up to two more; E codes, E and three
/// digits with at most one more, the dot after the fourth character (ICD-9-CM
/// Official Guidelines for Coding and Reporting, and the layout of the CMS
/// version 32 code file: codes of 3 to 5 characters).
pub(super) fn icd9cm(c: &str) -> Shape {
    let u = undot(c);
    let b = u.as_bytes();
    let digits = |s: &[u8]| s.iter().all(|x| x.is_ascii_digit());
    let (head, max) = match b.first() {
        Some(b'E') => (4, 5),
        Some(b'V') => (3, 5),
        Some(x) if x.is_ascii_digit() => (3, 5),
        _ => return fails("an ICD-9-CM diagnosis code is three digits (250), a V and two digits (V58), or an E and three digits (E880), each with up to two more digits (one for E codes)"),
    };
    let body_ok = match b[0] {
        b'E' | b'V' => digits(&b[1..]),
        _ => digits(b),
    };
    let dot_ok = match c.find('.') {
        None => true,
        Some(at) => at == head && c.matches('.').count() == 1 && c.len() > head + 1,
    };
    if !dot_ok {
        return fails(format!(
            "in ICD-9-CM the dot comes after the {} character ({})",
            if head == 4 { "fourth" } else { "third" },
            if head == 4 { "E880.0" } else { "250.00" }
        ));
    }
    if !body_ok || b.len() < head || b.len() > max {
        return fails("an ICD-9-CM diagnosis code is three digits (250), a V and two digits (V58), or an E and three digits (E880), each with up to two more digits (one for E codes)");
    }
    let dotted = if u.len() > head {
        format!("{}.{}", &u[..head], &u[head..])
    } else {
        u
    };
    fits(dotted, "has the ICD-9-CM diagnosis shape")
}
