//! Check-digit schemes: the mod 10 scheme LOINC uses (the Luhn algorithm)
//! and Verhoeff's dihedral-group scheme that SNOMED CT uses.

use super::all_digits;

/// The mod 10 check digit of a string of digits, as the LOINC Users' Guide
/// computes it (worked example there: 12345 gives 5): from the right, double
/// every other digit starting with the rightmost, add up the digits of all
/// the results, and take what is missing to the next multiple of 10.
/// `None` when `digits` is empty or holds anything but ASCII digits.
pub fn luhn_check_digit(digits: &str) -> Option<u8> {
    if !all_digits(digits) {
        return None;
    }
    let sum: u32 = digits
        .bytes()
        .rev()
        .enumerate()
        .map(|(i, b)| {
            let d = (b - b'0') as u32;
            if i % 2 == 0 {
                let x = d * 2;
                x / 10 + x % 10
            } else {
                d
            }
        })
        .sum();
    Some(((10 - sum % 10) % 10) as u8)
}

/// Verhoeff's multiplication table of the dihedral group D5.
const D: [[u8; 10]; 10] = [
    [0, 1, 2, 3, 4, 5, 6, 7, 8, 9],
    [1, 2, 3, 4, 0, 6, 7, 8, 9, 5],
    [2, 3, 4, 0, 1, 7, 8, 9, 5, 6],
    [3, 4, 0, 1, 2, 8, 9, 5, 6, 7],
    [4, 0, 1, 2, 3, 9, 5, 6, 7, 8],
    [5, 9, 8, 7, 6, 0, 4, 3, 2, 1],
    [6, 5, 9, 8, 7, 1, 0, 4, 3, 2],
    [7, 6, 5, 9, 8, 2, 1, 0, 4, 3],
    [8, 7, 6, 5, 9, 3, 2, 1, 0, 4],
    [9, 8, 7, 6, 5, 4, 3, 2, 1, 0],
];

/// Verhoeff's position permutations (the i-th is the base one applied i times).
const P: [[u8; 10]; 8] = [
    [0, 1, 2, 3, 4, 5, 6, 7, 8, 9],
    [1, 5, 7, 6, 2, 8, 3, 0, 9, 4],
    [5, 8, 0, 3, 7, 9, 6, 1, 4, 2],
    [8, 9, 1, 6, 0, 4, 3, 5, 2, 7],
    [9, 4, 5, 3, 1, 2, 6, 8, 7, 0],
    [4, 2, 8, 6, 5, 7, 3, 9, 0, 1],
    [2, 7, 9, 3, 8, 0, 6, 4, 1, 5],
    [7, 0, 4, 6, 9, 1, 3, 2, 5, 8],
];

/// Inverses in D5.
const INV: [u8; 10] = [0, 4, 3, 2, 1, 5, 6, 7, 8, 9];

fn verhoeff_run(digits: &str, offset: usize) -> Option<u8> {
    if !all_digits(digits) {
        return None;
    }
    let mut c = 0u8;
    for (i, b) in digits.bytes().rev().enumerate() {
        c = D[c as usize][P[(i + offset) % 8][(b - b'0') as usize] as usize];
    }
    Some(c)
}

/// Whether a string of digits ends in a correct Verhoeff check digit.
pub fn verhoeff_valid(digits: &str) -> bool {
    verhoeff_run(digits, 0) == Some(0)
}

/// The Verhoeff check digit to append to `digits`.
pub fn verhoeff_check_digit(digits: &str) -> Option<u8> {
    verhoeff_run(digits, 1).map(|c| INV[c as usize])
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn luhn_matches_the_loinc_worked_example() {
        // LOINC Users' Guide, "Calculating Mod 10 check digits": 12345 -> 5.
        assert_eq!(luhn_check_digit("12345"), Some(5));
        assert_eq!(luhn_check_digit("12a45"), None);
        assert_eq!(luhn_check_digit(""), None);
    }

    #[test]
    fn verhoeff_matches_the_textbook_example() {
        // Verhoeff (1969), the example repeated in most references: 236 -> 3.
        assert_eq!(verhoeff_check_digit("236"), Some(3));
        assert!(verhoeff_valid("2363"));
        assert!(!verhoeff_valid("2364"));
        // Every single-digit error and every adjacent swap is caught.
        let base = "138875005";
        for i in 0..base.len() {
            for d in b'0'..=b'9' {
                let mut v = base.as_bytes().to_vec();
                if v[i] == d {
                    continue;
                }
                v[i] = d;
                assert!(!verhoeff_valid(std::str::from_utf8(&v).unwrap()));
            }
        }
        for i in 0..base.len() - 1 {
            let mut v = base.as_bytes().to_vec();
            if v[i] == v[i + 1] {
                continue;
            }
            v.swap(i, i + 1);
            assert!(!verhoeff_valid(std::str::from_utf8(&v).unwrap()));
        }
    }
}
