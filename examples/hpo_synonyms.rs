//! Writes `src/synonyms/hpo.tsv`: the HPO release's exact synonyms that the
//! ICD-10-CM wording does not use, each paired with its term's name where
//! that name is ICD-10-CM wording ("Heart attack" → "Myocardial infarction").
//!
//! A pair is kept when the term is not obsolete, the synonym is marked
//! `EXACT`, both have at most four normalised words, the name's words stand
//! side by side in at least one ICD-10-CM description, the synonym's do not
//! (ICD-10-CM already reads those), and both have the same words of
//! `synonyms::OPPOSITES` (left, chronic, malignant...), but for an
//! abbreviation in capitals, which stands for all of its name's words. Sorted, one pair a line: synonym,
//! name, then the term's id as its source. The table is small enough to be
//! compiled into the core (`src/synonyms.rs`); `tests/synonyms.rs` rebuilds it
//! from the same files and compares. Run from the repository root:
//! `cargo run --profile fast --example hpo_synonyms > src/synonyms/hpo.tsv`.

use rollcall::{synonyms, words, Index, View};
use std::collections::{BTreeSet, HashSet};
use std::io::Read;

/// Most normalised words on either side of a pair.
const MOST_WORDS: usize = 4;

/// Word runs (one to [`MOST_WORDS`] words) found in the descriptions.
fn phrases(view: &View<'_>) -> HashSet<Vec<String>> {
    let mut set = HashSet::new();
    for o in 0..view.len() as u32 {
        let w = words::words(&view.description(o));
        for n in 1..=MOST_WORDS {
            for run in w.windows(n) {
                set.insert(run.to_vec());
            }
        }
    }
    set
}

/// The table's text from the OBO release text and the ICD-10-CM index.
pub fn derive(obo: &str, icd10cm: &View<'_>) -> String {
    let known = phrases(icd10cm);
    let mut rows = BTreeSet::new();
    let mut flush = |id: &str, name: &str, syns: &[String], obsolete: bool| {
        let nw = words::words(name);
        if obsolete || nw.is_empty() || nw.len() > MOST_WORDS || !known.contains(&nw) {
            return;
        }
        for s in syns {
            let sw = words::words(s);
            if sw.is_empty() || sw.len() > MOST_WORDS || sw == nw || known.contains(&sw) {
                continue;
            }
            // A synonym that adds or drops a word such as left, chronic or
            // malignant says something else than the name; an abbreviation
            // (one word in capitals: ARDS) stands for all of its name's words.
            let abbreviation = sw.len() == 1
                && s.chars()
                    .all(|c| c.is_ascii_uppercase() || c.is_ascii_digit())
                && synonyms::opposite_words(&sw).is_empty();
            if !abbreviation && synonyms::opposite_words(&sw) != synonyms::opposite_words(&nw) {
                continue;
            }
            let clean = |t: &str| t.replace(['\t', '\n'], " ");
            rows.insert(format!("{}\t{}\t{id}", clean(s), clean(name)));
        }
    };
    let (mut id, mut name, mut syns, mut obsolete) =
        (String::new(), String::new(), Vec::new(), false);
    let mut in_term = false;
    for line in obo.lines().chain(std::iter::once("[End]")) {
        let line = line.trim_end();
        if line.starts_with('[') {
            if in_term {
                flush(&id, &name, &syns, obsolete);
            }
            in_term = line == "[Term]";
            (id, name, obsolete) = (String::new(), String::new(), false);
            syns.clear();
            continue;
        }
        if let Some(v) = line.strip_prefix("id: ") {
            id = v.to_string();
        } else if let Some(v) = line.strip_prefix("name: ") {
            name = v.to_string();
        } else if line == "is_obsolete: true" {
            obsolete = true;
        } else if let Some(v) = line.strip_prefix("synonym: \"") {
            // `"text" EXACT [type] [xrefs]`; quotes inside are escaped as \".
            let mut text = String::new();
            let mut chars = v.chars();
            while let Some(c) = chars.next() {
                match c {
                    '\\' => text.extend(chars.next()),
                    '"' => break,
                    c => text.push(c),
                }
            }
            let rest: String = chars.collect();
            if rest.trim_start().starts_with("EXACT") {
                syns.push(text);
            }
        }
    }
    let mut out = String::from(
        "# HPO exact synonym\tname (ICD-10-CM wording)\tsource: hp-2025-01-16.obo term\n",
    );
    for r in rows {
        out.push_str(&r);
        out.push('\n');
    }
    out
}

/// The bundled HPO release, unpacked.
pub fn obo_text() -> String {
    let gz = std::fs::read("vocab-build/sources/hp-2025-01-16.obo.gz")
        .expect("run from the repository root");
    let mut s = String::new();
    flate2::read::GzDecoder::new(&gz[..])
        .read_to_string(&mut s)
        .expect("the bundled release unpacks");
    s
}

#[allow(dead_code)]
fn main() {
    let index =
        Index::open(std::fs::read("vocab/icd10cm.rcx").expect("run from the repository root"))
            .expect("the bundled index opens");
    print!("{}", derive(&obo_text(), &index.view()));
}
