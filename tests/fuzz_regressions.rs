//! Inputs that once crashed or stalled a reader of outside bytes, replayed
//! on plain stable without cargo-fuzz: every file kept in
//! `fuzz/regressions/<target>/` through the same harness body the fuzz
//! target runs (`fuzz/harness.rs`), and each known case as a named test of
//! the behaviour that now holds. The harness renders every output and
//! checks that no input line is lost; a panic is the failure.

#[path = "../fuzz/harness.rs"]
mod harness;

use rollcall::report::{Kind, Status};
use rollcall::{CheckOptions, Date, Index, IndexError};

fn replay(target: &str, body: fn(&[u8])) {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("fuzz/regressions")
        .join(target);
    let Ok(files) = std::fs::read_dir(&dir) else {
        return;
    };
    let mut n = 0;
    let mut failed = Vec::new();
    for f in files {
        let path = f.unwrap().path();
        let data = std::fs::read(&path).unwrap();
        if std::panic::catch_unwind(|| body(&data)).is_err() {
            failed.push(path.display().to_string());
        }
        n += 1;
    }
    eprintln!("{target}: {n} inputs replayed");
    assert!(failed.is_empty(), "these fail again: {failed:#?}");
}

#[test]
fn kept_list_inputs_run_clean() {
    replay("check_text", harness::check_text);
}

#[test]
fn kept_index_inputs_run_clean() {
    replay("index_bytes", harness::index_bytes);
}

#[test]
fn kept_mixed_list_inputs_run_clean() {
    replay("mixed_list", harness::mixed_list);
}

#[test]
fn kept_comparison_inputs_run_clean() {
    replay("compare_lists", harness::compare_lists);
}

#[test]
fn kept_search_inputs_run_clean() {
    replay("search_words", harness::search_words);
}

fn day(s: &str) -> Date {
    Date::parse(s).unwrap()
}

fn icd10cm() -> Index<&'static [u8]> {
    Index::open(harness::ICD10CM).unwrap()
}

fn on(s: &str) -> CheckOptions {
    CheckOptions::on(day(s), false)
}

/// The entry of line `n` (the first, if the line holds several).
fn line(r: &rollcall::Report, n: usize) -> &rollcall::Entry {
    r.entries.iter().find(|e| e.line == n).unwrap()
}

#[test]
fn a_multibyte_character_in_the_first_three_bytes_of_a_code_with_a_label() {
    // `é` and `€` are two and three bytes in UTF-8: the third byte of the
    // written code falls inside them. The label check says why it suggests
    // a code, comparing the written code's first three bytes.
    let index = icd10cm();
    let view = index.view();
    let e10 = view.ordinal("E10").unwrap();
    let fit = rollcall::search::Fit {
        label: 1.0,
        description: 1.0,
    };
    for near in ["E1é", "I1€0", "é", "€", "E€"] {
        let why = rollcall::check::labels::reason(&view, &fit, near, e10);
        assert!(!why.contains("same category"), "{near}: {why}");
    }
    assert!(rollcall::check::labels::reason(&view, &fit, "E109", e10).contains("same category"));
    // The lines as a list, in each form a list may take.
    for text in [
        "E1é diabetes\nI1€0 hypertension\n",
        "code\tlabel\nE11.9\tdiabetes\nE1é\tdiabetes\nI1€0\thypertension\n",
        "code,label\nE1é,diabetes\nE11.9,diabetes\n",
    ] {
        harness::check_text(text.as_bytes());
    }
}

#[test]
fn a_multibyte_character_in_a_five_byte_cell_read_for_other_systems_shapes() {
    // `123é` and `E1€` are five bytes: the CPT shape (five characters) is
    // tried on them when they are no code of the index.
    use rollcall::systems::{shape, System, ALL};
    for code in ["123é", "E1€", "1234é", "é1234", "€€"] {
        for system in ALL {
            let _ = shape(system, code);
        }
        assert!(!shape(System::Cpt, code).fits(), "{code}");
    }
    assert!(shape(System::Cpt, "99213").fits());
    for text in ["123é\nE1€\n", "code\nE11.9\n123é\nE1€\n"] {
        harness::check_text(text.as_bytes());
        for k in 0..ALL.len() as u8 {
            let mut data = vec![k];
            data.extend_from_slice(text.as_bytes());
            harness::mixed_list(&data);
        }
    }
}

/// The bytes of a bundled index with one byte changed and the SHA-256
/// written again, as a damaged copy that passes `verify` would be.
fn damaged(file: &[u8], at: usize, value: u8) -> Vec<u8> {
    let mut b = file.to_vec();
    b[at] = value;
    harness::reseal(&mut b);
    b
}

#[test]
fn a_damaged_code_map_under_a_valid_checksum_is_refused_on_open() {
    // Byte 19098 of the HPO index lies inside its code map (CFST).
    let (off, len) = harness::section(harness::HPO, b"CFST").unwrap();
    assert!((off..off + len).contains(&19098));
    let b = damaged(harness::HPO, 19098, 0xFF);
    Index::open(b.as_slice()).map(|_| ()).unwrap_err();
    assert_eq!(
        Index::open(b.as_slice()).err(),
        Some(IndexError::Corrupt("code map"))
    );
    // The harness: open refused, nothing else is reached; no panic.
    let mut data = vec![0x80 | 3];
    // Set (kind 0), anywhere (0xF0), at 19098, to 0xFF.
    data.extend([0, 0xF0]);
    data.extend(19098u32.to_le_bytes());
    data.push(0xFF);
    harness::index_bytes(&data);
}

#[test]
fn every_fst_section_is_checked_on_open() {
    // The alternate ids of HPO are an fst of their own.
    let (off, len) = harness::section(harness::HPO, b"ALTS").unwrap();
    let at = off + len / 2;
    let b = damaged(harness::HPO, at, harness::HPO[at] ^ 0x5A);
    assert_eq!(
        Index::open(b.as_slice()).err(),
        Some(IndexError::Corrupt("alternate ids"))
    );
    // The GEMs of the ICD-9-CM index: each mapping's source codes are an
    // fst inside MAPS, after a count and four names.
    let (off, _) = harness::section(harness::ICD9CM, b"MAPS").unwrap();
    let f = harness::ICD9CM;
    let mut pos = off;
    let varint = |pos: &mut usize| {
        let (mut v, mut shift) = (0usize, 0);
        loop {
            let b = f[*pos];
            *pos += 1;
            v |= ((b & 0x7f) as usize) << shift;
            if b < 0x80 {
                return v;
            }
            shift += 7;
        }
    };
    let count = varint(&mut pos);
    assert!(count >= 1);
    for _ in 0..4 {
        let n = varint(&mut pos);
        pos += n;
    }
    let fst_len = varint(&mut pos);
    let at = pos + fst_len / 2;
    let b = damaged(f, at, f[at] ^ 0x5A);
    assert_eq!(
        Index::open(b.as_slice()).err(),
        Some(IndexError::Corrupt("mappings"))
    );
    // And the word map, as before.
    let (off, len) = harness::section(harness::HPO, b"WFST").unwrap();
    let at = off + len / 2;
    let b = damaged(harness::HPO, at, harness::HPO[at] ^ 0x5A);
    assert_eq!(
        Index::open(b.as_slice()).err(),
        Some(IndexError::Corrupt("word map"))
    );
}

/// CRC-32C (Castagnoli, reflected polynomial 0x82F63B78; RFC 3720,
/// appendix B.4), masked as the fst crate stores it (the Snappy framing
/// format's mask: rotate right by 15, add 0xa282ead8).
fn fst_checksum(bytes: &[u8]) -> u32 {
    let mut crc = !0u32;
    for &b in bytes {
        crc ^= b as u32;
        for _ in 0..8 {
            crc = if crc & 1 != 0 {
                (crc >> 1) ^ 0x82F6_3B78
            } else {
                crc >> 1
            };
        }
    }
    let sum = !crc;
    (sum.rotate_right(15)).wrapping_add(0xA282_EAD8)
}

#[test]
fn a_code_map_claiming_a_huge_number_of_codes_is_refused_without_overflow() {
    // The fst states its number of keys in the 8 bytes before its root
    // address and checksum (fst 0.4, format version 3); every table size of
    // the index is that number times a width. A count whose product
    // overflows (sooner with Wasm's 32-bit usize) must be refused.
    let check = |file: &[u8]| {
        let (off, len) = harness::section(file, b"CFST").unwrap();
        let mut b = file.to_vec();
        let end = off + len;
        for claim in [u64::MAX / 2, u64::MAX / 4 + 1, 1 << 31, u32::MAX as u64] {
            b[end - 20..end - 12].copy_from_slice(&claim.to_le_bytes());
            let crc = fst_checksum(&b[off..end - 4]);
            b[end - 4..end].copy_from_slice(&crc.to_le_bytes());
            harness::reseal(&mut b);
            let opened = Index::open(b.as_slice());
            assert!(opened.is_err(), "a code map of {claim} codes is refused");
        }
    };
    check(harness::ICD9CM);
    check(harness::HPO);
    // The checksum helper is right: the bundled code map verifies with it.
    let (off, len) = harness::section(harness::ICD9CM, b"CFST").unwrap();
    let stored = u32::from_le_bytes(
        harness::ICD9CM[off + len - 4..off + len]
            .try_into()
            .unwrap(),
    );
    assert_eq!(fst_checksum(&harness::ICD9CM[off..off + len - 4]), stored);
}

#[test]
fn a_word_of_a_hundred_thousand_characters_is_searched_like_any_other() {
    // Such a word is no word of the index, nor one or two edits from one;
    // the other words of the query still find their codes.
    let long = "a".repeat(100_000);
    let index = icd10cm();
    let view = index.view();
    let found = rollcall::search::find(&view, &long, day("2024-01-01"), 5, false);
    assert!(found.is_empty());
    let query = format!("{long} type 2 diabetes mellitus without complications");
    let found = rollcall::search::find(&view, &query, day("2024-01-01"), 5, false);
    // E11.9's official title (ICD-10-CM tabular list).
    assert_eq!(found[0].code, "E11.9");
    // As a label, and through the search target.
    let text = format!("E11.9 {long}\n");
    harness::check_text(text.as_bytes());
    let mut data = vec![0x10];
    data.extend_from_slice(long.as_bytes());
    harness::search_words(&data);
}

#[test]
fn compare_on_a_graph_names_the_first_code_of_the_same_category() {
    // HPO: all phenotypic abnormalities (HP:0000118) against the seizure
    // branch (HP:0001250, under the nervous system's category). Every
    // difference whose nearest code is of the same category must get the
    // first code of the other list (in code order) in that category other
    // than itself: the rule as written before the categories were grouped
    // once per list.
    let index = Index::open(harness::HPO).unwrap();
    let view = index.view();
    let opts = on("2025-01-16");
    let c = rollcall::compare::compare(
        &index,
        ("all", "HP:0000118\n"),
        ("seizures", "HP:0001250\n"),
        &opts,
    );
    let (_, reach) = rollcall::check_with_reach(&index, "HP:0001250\n", &opts);
    let mut other: Vec<u32> = reach.iter().flat_map(|r| r.ords.clone()).collect();
    other.sort_unstable();
    other.dedup();
    let mut same_category = 0;
    for d in &c.differences {
        let Some(n) = &d.nearest else { continue };
        if n.relation != rollcall::compare::Relation::SameCategory {
            continue;
        }
        same_category += 1;
        let node = view.ordinal(&d.code.replace('.', "")).unwrap();
        let cat = view.category(node);
        let want = other
            .iter()
            .copied()
            .find(|&o| o != node && view.category(o) == cat)
            .unwrap();
        assert_eq!(n.code, view.display(&view.code(want)), "{}", d.code);
    }
    assert!(same_category > 0);
    // And the pair that once took seconds.
    let mut data = vec![3];
    data.extend_from_slice(b"HP:0000001\n\0HP:0000118\n");
    harness::compare_lists(&data);
}

#[test]
fn a_day_past_the_coverage_is_a_list_warning_and_no_code_is_called_retired() {
    let index = icd10cm();
    // The bundled ICD-10-CM index covers 2015-10-01 to 2027-03-31 (FY2027
    // ends 2027-09-30, but its April update is the last the history has).
    let last = index.meta().coverage_to;
    assert_eq!(last, day("2027-03-31"));
    // I60.20 was valid until 2016-09-30 (the history file in
    // vocab-build/sources; deleted in FY2017, with nothing under it).
    let text = "E11.9\nE11\nI60.20\n";
    for opts in [
        on("2028-01-01"),
        CheckOptions {
            from: day("2026-10-01"),
            to: day("2028-01-01"),
            billable: false,
        },
    ] {
        let r = rollcall::check(&index, text, &opts);
        assert_eq!(line(&r, 1).status, Status::Valid);
        assert_eq!(line(&r, 2).status, Status::Header);
        assert_eq!(line(&r, 3).status, Status::Retired);
        let beyond: Vec<_> = r
            .list_findings
            .iter()
            .filter(|f| f.kind == Kind::BeyondCoverage)
            .collect();
        assert_eq!(beyond.len(), 1);
        assert_eq!(beyond[0].coverage_to, Some(last));
        assert_eq!(beyond[0].severity, rollcall::report::Severity::Warning);
        assert!(beyond[0].message.contains("until 2027-03-31"));
        let json = serde_json::to_value(&r).unwrap();
        let f = &json["list_findings"][0];
        assert_eq!(f["kind"], "beyond-coverage");
        assert_eq!(f["coverage_to"], "2027-03-31");
        assert!(rollcall::render::text(&r).contains("beyond-coverage"));
    }
    // The word search on such a day: E11.9 in use, as on the last day.
    let view = index.view();
    let found = rollcall::search::find(
        &view,
        "type 2 diabetes mellitus without complications",
        day("2028-01-01"),
        1,
        false,
    );
    assert_eq!(
        (found[0].code.as_str(), found[0].status),
        ("E11.9", "billable")
    );
    // Inside the coverage: no such finding, and no `coverage_to` in JSON.
    let r = rollcall::check(&index, text, &on("2026-01-01"));
    assert!(r
        .list_findings
        .iter()
        .all(|f| f.kind != Kind::BeyondCoverage));
    let json = serde_json::to_value(&r).unwrap();
    for f in json["list_findings"].as_array().unwrap() {
        assert!(f.get("coverage_to").is_none(), "{f}");
    }
}

#[test]
fn icd9cm_codes_past_its_last_release_stay_retired_without_a_coverage_warning() {
    // ICD-9-CM was replaced by ICD-10-CM on 2015-10-01 (45 CFR 162.1002):
    // its index's last day is the end of its codes.
    let index = Index::open(harness::ICD9CM).unwrap();
    let r = rollcall::check(&index, "250.00\n", &on("2016-01-01"));
    assert_eq!(line(&r, 1).status, Status::Retired);
    assert!(r
        .list_findings
        .iter()
        .all(|f| f.kind != Kind::BeyondCoverage));
}

/// An unclosed quote on every sampled line of a comma list once made the
/// layout guess index past its table. Each line keeps its entry and its
/// code is still found (named in the finding's suggestions or read).
#[test]
fn a_comma_list_with_an_unclosed_quote_on_every_line_is_read() {
    let index = icd10cm();
    for text in [
        "E11.9,\"Type 2 diabetes\n",
        "E11.9,\"Type 2 diabetes\nI10,\"Essential hypertension\n",
        "code,label\nE11.9,\"Type 2 diabetes\n",
    ] {
        let r = rollcall::check(&index, text, &on("2024-01-01"));
        let lines = text.lines().count();
        assert_eq!(r.summary.lines, lines, "{text:?}");
        let e = r
            .entries
            .iter()
            .find(|e| e.input.starts_with("E11.9"))
            .unwrap();
        let named = e.code.as_deref() == Some("E11.9")
            || e.findings
                .iter()
                .any(|f| f.suggestions.iter().any(|s| s.code == "E11.9"));
        assert!(named, "E11.9 lost in {text:?}: {e:?}");
    }
}

/// Lone CR line ends (old Mac files): each line its own entry, none folded
/// into the label before it.
#[test]
fn lone_carriage_returns_end_lines() {
    let r = rollcall::check(
        &icd10cm(),
        "E11.9 Type 2 diabetes\rI10 Essential hypertension\rE78.5\r",
        &on("2024-01-01"),
    );
    let codes: Vec<_> = r.entries.iter().map(|e| e.code.as_deref()).collect();
    assert_eq!(codes, [Some("E11.9"), Some("I10"), Some("E78.5")]);
}

/// A UTF-8 byte-order mark (as a spreadsheet's "CSV UTF-8" writes) before
/// a system column's header: the column is still the system of each row.
/// 0DTJ4ZZ is in icd10pcs-codes-FY2024.txt; 2345-7 has a correct mod 10
/// check digit (LOINC Users' Guide).
#[test]
fn a_byte_order_mark_does_not_hide_the_system_column() {
    let cm = icd10cm();
    let pcs = Index::open(harness::ICD10PCS).unwrap();
    let text = "\u{feff}System,Code\nICD-10-PCS,0DTJ4ZZ\nLOINC,2345-7\nICD-10-CM,E11.9\n";
    let (r, _) = rollcall::mixed::check_listed(
        rollcall::mixed::Primary::Index(&cm),
        &[&pcs],
        text,
        &on("2024-01-01"),
    );
    let systems: Vec<_> = r
        .entries
        .iter()
        .filter(|e| e.code.is_some())
        .map(|e| (e.line, e.system.as_deref()))
        .collect();
    assert_eq!(
        systems,
        [
            (2, Some("icd10pcs")),
            (3, Some("loinc")),
            (4, Some("icd10cm"))
        ]
    );
    assert_eq!(r.summary.errors, 0);
}
