//! Words of descriptions and labels, normalised the same way for the index
//! (built by `vocab-build`) and for a query or a label in a list: lower case,
//! accents folded to ASCII, split on anything that is not a letter or digit,
//! a short stop-word list dropped, a few clinical abbreviations expanded, and
//! a plural `s` taken off. The two tables below are the whole of it (see the README);
//! clinicians' phrases are read as the official wording later, at query time,
//! by `crate::synonyms`, so that the index's words stay as the releases give them.

/// Words that carry no meaning for matching (common practice for English
/// text search; `with`, `without`, `other` and `unspecified` are kept, as they
/// tell ICD-10-CM codes apart).
pub const STOP_WORDS: &[&str] = &[
    "a", "an", "and", "are", "as", "at", "be", "by", "for", "from", "in", "into", "is", "of", "on",
    "or", "the", "to",
];

/// Abbreviations common in clinical text, each expanded into the words the
/// official descriptions use (common practice; chosen from the wording of
/// ICD-10-CM titles). `w/` and `w/o` are handled before splitting.
pub const ABBREVIATIONS: &[(&str, &str)] = &[
    ("afib", "atrial fibrillation"),
    ("ami", "acute myocardial infarction"),
    ("cad", "coronary artery disease"),
    ("chf", "congestive heart failure"),
    ("ckd", "chronic kidney disease"),
    ("copd", "chronic obstructive pulmonary disease"),
    ("cva", "cerebral infarction"),
    ("dm", "diabetes mellitus"),
    ("dvt", "deep vein thrombosis"),
    ("esrd", "end stage renal disease"),
    ("gerd", "gastro esophageal reflux disease"),
    ("hf", "heart failure"),
    ("htn", "hypertension"),
    ("mi", "myocardial infarction"),
    ("pe", "pulmonary embolism"),
    ("t1dm", "type 1 diabetes mellitus"),
    ("t2dm", "type 2 diabetes mellitus"),
    ("uti", "urinary tract infection"),
    ("w", "with"),
    ("wo", "without"),
];

/// The normalised words of `text`, in order (repeats kept).
///
/// ```
/// use rollcall::words::words;
/// assert_eq!(words("Type 2 DM w/o complications"),
///            ["type", "2", "diabete", "mellitus", "without", "complication"]);
/// ```
pub fn words(text: &str) -> Vec<String> {
    let mut out = Vec::new();
    // Folded text is ASCII and lower case; ASCII text is lowered as it is read.
    let folded = if text.is_ascii() {
        std::borrow::Cow::Borrowed(text)
    } else {
        std::borrow::Cow::Owned(fold(text))
    };
    let b = folded.as_bytes();
    let lower = |k: usize| b.get(k).map(u8::to_ascii_lowercase);
    let mut raw = String::new();
    let mut i = 0;
    while i < b.len() {
        if !b[i].is_ascii_alphanumeric() {
            i += 1;
            continue;
        }
        // `w/o` and `w/` at the start of a word are spelt out, before the
        // slash is taken as a separator.
        let start = i == 0 || !b[i - 1].is_ascii_alphanumeric();
        if start && lower(i) == Some(b'w') && b.get(i + 1) == Some(&b'/') {
            let without = lower(i + 2) == Some(b'o')
                && b.get(i + 3).is_none_or(|c| !c.is_ascii_alphanumeric());
            push_word(&mut out, if without { "without" } else { "with" });
            i += if without { 3 } else { 2 };
            continue;
        }
        let end = b[i..]
            .iter()
            .position(|c| !c.is_ascii_alphanumeric())
            .map_or(b.len(), |n| i + n);
        raw.clear();
        raw.extend(b[i..end].iter().map(|c| c.to_ascii_lowercase() as char));
        push_word(&mut out, &raw);
        i = end;
    }
    out
}

/// One word as split (lower case, ASCII): left out when a stop word,
/// expanded when an abbreviation, else its plural `s` taken off.
fn push_word(out: &mut Vec<String>, raw: &str) {
    if STOP_WORDS.contains(&raw) {
        return;
    }
    match ABBREVIATIONS.binary_search_by(|(a, _)| (*a).cmp(raw)) {
        Ok(i) => out.extend(ABBREVIATIONS[i].1.split(' ').map(stem)),
        Err(_) => out.push(stem(raw)),
    }
}

/// The distinct words of `text`, sorted.
pub fn distinct(text: &str) -> Vec<String> {
    let mut w = words(text);
    w.sort();
    w.dedup();
    w
}

/// Takes a plural `s` off (`fractures` → `fracture`), leaving `-ss`, `-us`
/// and `-is` endings and short words alone; the same rule on both sides of a
/// match is all that matters.
fn stem(w: &str) -> String {
    let b = w.as_bytes();
    if b.len() > 3
        && b[b.len() - 1] == b's'
        && !matches!(b[b.len() - 2], b's' | b'u' | b'i')
        && !b[b.len() - 2].is_ascii_digit()
    {
        w[..w.len() - 1].to_string()
    } else {
        w.to_string()
    }
}

/// Lower case with accented Latin letters folded to ASCII (`Sjögren` →
/// `sjogren`); other non-ASCII characters become separators.
fn fold(text: &str) -> String {
    let mut s = String::with_capacity(text.len());
    for c in text.chars() {
        if c.is_ascii() {
            s.push(c.to_ascii_lowercase());
            continue;
        }
        let f = match c.to_lowercase().next().unwrap_or(c) {
            'à' | 'á' | 'â' | 'ã' | 'ä' | 'å' | 'ā' => "a",
            'æ' => "ae",
            'ç' | 'č' => "c",
            'è' | 'é' | 'ê' | 'ë' | 'ē' => "e",
            'ì' | 'í' | 'î' | 'ï' => "i",
            'ñ' => "n",
            'ò' | 'ó' | 'ô' | 'õ' | 'ö' | 'ø' => "o",
            'œ' => "oe",
            'ß' => "ss",
            'ù' | 'ú' | 'û' | 'ü' => "u",
            'ý' | 'ÿ' => "y",
            _ => " ",
        };
        s.push_str(f);
    }
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tables_are_sorted_for_lookup() {
        assert!(ABBREVIATIONS.windows(2).all(|w| w[0].0 < w[1].0));
    }

    #[test]
    fn folds_splits_and_expands() {
        assert_eq!(words("Sjögren syndrome"), ["sjogren", "syndrome"]);
        assert_eq!(
            words("HTN w/ CKD"),
            ["hypertension", "with", "chronic", "kidney", "disease"]
        );
        assert_eq!(
            words("Fracture of the femur, closed"),
            ["fracture", "femur", "closed"]
        );
        assert_eq!(words("Abscess; diabetes"), ["abscess", "diabete"]);
        assert_eq!(words("DM w/o"), ["diabete", "mellitus", "without"]);
    }

    /// The words as first written (fold, spell out `w/` and `w/o`, then
    /// split), the oracle for the one-pass reading: on every text of up to
    /// five characters over a small alphabet, and on both synonym tables.
    #[test]
    fn one_pass_reads_as_the_plain_rule() {
        fn slashed(text: &str) -> String {
            let b = text.as_bytes();
            let mut s = String::new();
            let mut i = 0;
            while i < b.len() {
                let start = i == 0 || !b[i - 1].is_ascii_alphanumeric();
                if start
                    && b[i..].starts_with(b"w/o")
                    && b.get(i + 3).is_none_or(|c| !c.is_ascii_alphanumeric())
                {
                    s.push_str(" without ");
                    i += 3;
                } else if start && b[i..].starts_with(b"w/") {
                    s.push_str(" with ");
                    i += 2;
                } else {
                    s.push(b[i] as char);
                    i += 1;
                }
            }
            s
        }
        fn plain(text: &str) -> Vec<String> {
            let mut out = Vec::new();
            for raw in slashed(&fold(text)).split(|c: char| !c.is_ascii_alphanumeric()) {
                if !raw.is_empty() {
                    push_word(&mut out, raw);
                }
            }
            out
        }
        let alphabet = ["w", "W", "/", "o", "O", "s", " ", "é", "1", "dm"];
        for len in 0..=5u32 {
            for n in 0..alphabet.len().pow(len) {
                let mut text = String::new();
                let mut k = n;
                for _ in 0..len {
                    text.push_str(alphabet[k % alphabet.len()]);
                    k /= alphabet.len();
                }
                assert_eq!(words(&text), plain(&text), "{text:?}");
            }
        }
        for line in crate::synonyms::CLINICAL
            .lines()
            .chain(crate::synonyms::HPO.lines())
        {
            assert_eq!(words(line), plain(line), "{line:?}");
        }
    }
}
