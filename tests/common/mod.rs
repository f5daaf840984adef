//! Shared fixtures: the bundled index and the official source files.
#![allow(dead_code)]

use rollcall::{CheckOptions, Date, Index, NotesFile};
use std::io::Read;
use std::path::PathBuf;

pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// The bundled index, as committed in vocab/.
pub fn index() -> Index<Vec<u8>> {
    let bytes = std::fs::read(root().join("vocab/icd10cm.rcx"))
        .expect("vocab/icd10cm.rcx (run vocab-build)");
    let index = Index::open(bytes).expect("bundled index opens");
    index.verify().expect("bundled index checksum");
    index
}

/// The bundled notes file of the ICD-10-CM index (the April 2026 tabular
/// list's notes), as committed in vocab/.
pub fn notes_bytes() -> Vec<u8> {
    std::fs::read(root().join("vocab/icd10cm-notes.rcx"))
        .expect("vocab/icd10cm-notes.rcx (run vocab-build)")
}

/// The bundled index with its notes file added.
pub fn index_with_notes() -> Index<Vec<u8>> {
    let mut index = index();
    let notes = NotesFile::open(notes_bytes()).expect("bundled notes open");
    notes.verify().expect("bundled notes checksum");
    index
        .add_notes(notes)
        .expect("the bundled notes pair with the bundled index");
    index
}

/// The bundled ICD-9-CM index (with the GEMs), as committed in vocab/.
pub fn icd9_index() -> Index<Vec<u8>> {
    let bytes = std::fs::read(root().join("vocab/icd9cm.rcx")).expect("vocab/icd9cm.rcx");
    let index = Index::open(bytes).expect("ICD-9-CM index opens");
    index.verify().expect("ICD-9-CM index checksum");
    index
}

/// A gzip-compressed source file from vocab-build/sources or tests/data, as text.
pub fn source(name: &str) -> String {
    let path = [
        root().join("vocab-build/sources").join(name),
        root().join("tests/data").join(name),
    ]
    .into_iter()
    .find(|p| p.exists())
    .unwrap_or_else(|| panic!("source file {name} not found"));
    let raw = std::fs::read(&path).unwrap();
    let mut bytes = Vec::new();
    flate2::read::MultiGzDecoder::new(&raw[..])
        .read_to_end(&mut bytes)
        .unwrap();
    // The CMS ICD-9-CM files are ISO-8859-1.
    String::from_utf8(bytes)
        .unwrap_or_else(|e| e.into_bytes().into_iter().map(char::from).collect())
}

/// The undotted codes of `index` billable on the day, in code order.
pub fn billable_on_in(index: &Index<Vec<u8>>, d: &str) -> std::collections::BTreeSet<String> {
    let v = index.view();
    let p = rollcall::Period::new(day(d), day(d));
    (0..v.len() as u32)
        .filter(|&o| v.billable_in(o, &p))
        .map(|o| v.code(o))
        .collect()
}

/// Undotted nodes of `index`, not billable on the day, with 2 to 40
/// billable codes under them that day: places a roll-up can happen.
pub fn roll_up_nodes(index: &Index<Vec<u8>>, d: &str) -> Vec<String> {
    let v = index.view();
    let p = rollcall::Period::new(day(d), day(d));
    (0..v.len() as u32)
        .filter(|&o| {
            let n = (o + 1..v.subtree_end(o))
                .filter(|&c| v.billable_in(c, &p))
                .count();
            (2..=40).contains(&n) && !v.billable_in(o, &p)
        })
        .map(|o| v.code(o))
        .collect()
}

pub fn day(s: &str) -> Date {
    Date::parse(s).unwrap()
}

pub fn on(s: &str) -> CheckOptions {
    CheckOptions::on(day(s), false)
}

pub fn period(a: &str, b: &str) -> CheckOptions {
    CheckOptions {
        from: day(a),
        to: day(b),
        billable: false,
    }
}

/// The Elixhauser v2026.1 list (AHRQ), as shipped: category,icd10cm,description.
pub fn elixhauser() -> String {
    source("elixhauser-ahrq-v2026.1.csv.gz")
}
