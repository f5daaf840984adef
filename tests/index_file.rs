//! Opening index files: the header checks, the checksum, and damaged files.

mod common;

use common::*;
use rollcall::{check, Index, IndexError};

fn bundled_bytes() -> Vec<u8> {
    std::fs::read(root().join("vocab/icd10cm.rcx")).unwrap()
}

#[test]
fn a_truncated_file_says_how_much_is_missing() {
    let b = bundled_bytes();
    let cut = &b[..b.len() / 2];
    let err = Index::open(cut).err().unwrap();
    assert!(matches!(err, IndexError::Truncated { .. }));
    let msg = err.to_string();
    assert!(
        msg.contains("truncated") && msg.contains(&format!("{} of {}", cut.len(), b.len())),
        "{msg}"
    );
    assert!(Index::open(&b[..10]).is_err());
    assert!(Index::open(&b[..0]).is_err());
}

#[test]
fn a_wrong_version_names_both_versions() {
    let mut b = bundled_bytes();
    b[8] = 9;
    let err = Index::open(&b[..]).err().unwrap();
    assert_eq!(
        err,
        IndexError::Version {
            expected: 2,
            got: 9
        }
    );
    assert!(err.to_string().contains("format version 9"));
}

#[test]
fn not_an_index_at_all() {
    let err = Index::open(&b"code\tvalid_from\n"[..]).err().unwrap();
    assert_eq!(err, IndexError::NotAnIndex);
}

#[test]
fn a_flipped_byte_is_caught_by_verify() {
    let mut b = bundled_bytes();
    let at = b.len() - 1000;
    b[at] ^= 0x40;
    let idx = Index::open(&b[..]).expect("the header is intact");
    let err = idx.verify().err().unwrap();
    assert!(matches!(err, IndexError::ChecksumMismatch { .. }));
    assert!(err.to_string().contains("corrupted"));
}

/// Damaged files must never panic, verified or not: flip bytes all over the
/// file, then open, look up and check a list.
#[test]
fn damaged_files_never_panic() {
    let good = bundled_bytes();
    let mut seed: u64 = 0x9e3779b97f4a7c15;
    let mut next = || {
        seed ^= seed << 13;
        seed ^= seed >> 7;
        seed ^= seed << 17;
        seed
    };
    for round in 0..60 {
        let mut b = good.clone();
        for _ in 0..(1 + round % 7) * 20 {
            let at = (next() as usize) % b.len();
            b[at] = next() as u8;
        }
        if let Ok(idx) = Index::open(&b[..]) {
            let _ = idx.verify();
            let r = check(
                &idx,
                "E11.9\tType 2 diabetes mellitus with hyperglycemia\nE11.56\tType 2 diabetes\nI10\tHTN\n\
                 E11.*\nC43.11\nI60.20\n",
                &on("2026-01-01"),
            );
            assert_eq!(r.summary.lines, 6);
            let v = idx.view();
            let opts = rollcall::search::SearchOptions {
                limit: 5,
                prefix_last: true,
                ..Default::default()
            };
            for q in ["diabetes hyperglycemia", "diabtes", "chronic kidn"] {
                for h in rollcall::search::search(&v, q, &opts) {
                    let _ = rollcall::search::fit(&v, q, h.ord);
                }
            }
        }
    }
}

#[test]
fn open_is_cheap_and_meta_is_right() {
    let idx = index();
    let m = idx.meta();
    assert_eq!(m.vocabulary, "icd10cm");
    assert_eq!(m.coverage_from.to_string(), "2015-10-01");
    assert_eq!(m.coverage_to.to_string(), "2027-03-31");
    let shipped = std::fs::read_to_string(root().join("vocab-build/sources/SHA256SUMS")).unwrap();
    for s in &m.sources {
        assert!(
            shipped.contains(&format!("{}  {}", s.sha256, s.file)),
            "{} recorded with its checksum",
            s.file
        );
    }
}

/// The word map holds, for every word of a code's description, a posting
/// list with that code, and the lists are sorted (an invariant of the format
/// in src/index/write.rs; checked on every 50th code of the bundled index).
#[test]
fn every_description_word_lists_its_code() {
    let idx = index();
    let v = idx.view();
    for o in (0..v.len() as u32).step_by(50) {
        let words = rollcall::words::distinct(&v.description(o));
        assert_eq!(v.word_count(o) as usize, words.len().min(255));
        for w in words {
            let off = v
                .words()
                .get(&w)
                .unwrap_or_else(|| panic!("{w} not in the word map"));
            let list: Vec<u32> = v.posting(off).collect();
            assert_eq!(
                list.len() as u32,
                v.posting(off).count,
                "{w}: a complete list"
            );
            assert!(list.windows(2).all(|p| p[0] < p[1]), "{w}: sorted");
            assert!(list.binary_search(&o).is_ok(), "{w} lists {}", v.code(o));
        }
    }
}

/// The same for the sections of a stated hierarchy (the HPO index): bytes
/// flipped inside the parent and child tables, codes to consider, status
/// words, alternate ids and synonyms give an error on open or answers,
/// never a panic or a walk that does not end (a damaged table may form a
/// cycle).
#[test]
fn damaged_graph_sections_never_panic() {
    let good = std::fs::read(root().join("vocab/hpo.rcx")).unwrap();
    let u32_at = |b: &[u8], at: usize| u32::from_le_bytes(b[at..at + 4].try_into().unwrap());
    let count = u32_at(&good, 12) as usize;
    let ranges: Vec<(usize, usize)> = (0..count)
        .map(|i| 56 + i * 12)
        .filter(|&d| [&b"GRPH"[..], b"CONS", b"STAT", b"ALTS", b"SYNS"].contains(&&good[d..d + 4]))
        .map(|d| (u32_at(&good, d + 4) as usize, u32_at(&good, d + 8) as usize))
        .collect();
    assert_eq!(ranges.len(), 4, "GRPH, CONS, ALTS and SYNS are present");
    let mut seed: u64 = 0x2545f4914f6cdd1d;
    let mut next = || {
        seed ^= seed << 13;
        seed ^= seed >> 7;
        seed ^= seed << 17;
        seed
    };
    let (mut opened, mut refused) = (0, 0);
    for round in 0..80 {
        let mut b = good.clone();
        for _ in 0..1 + round % 5 {
            let (off, len) = ranges[next() as usize % ranges.len()];
            let at = off + next() as usize % len;
            // Small values keep offsets and ordinals plausible.
            b[at] = (next() % 4) as u8;
        }
        match Index::open(&b[..]) {
            Ok(idx) => {
                opened += 1;
                let _ = rollcall::card::cards(
                    &idx,
                    &[],
                    &["HP:0001658", "HP:0001250"],
                    &on("2026-01-01"),
                );
                let r = check(
                    &idx,
                    "HP:0001250\nHP:0002069\nHP:0001425\nHP:0000118\nHP:0004715\nHP:0012638\n",
                    &on("2026-01-01"),
                );
                assert_eq!(r.summary.lines, 6);
                let v = idx.view();
                for o in [0, 1000, 19_000, u32::MAX] {
                    let _ = v.synonyms(o);
                    let _ = v.descendants(o).len();
                    let _ = v.ancestors(o).count();
                    let _ = v.category(o);
                }
            }
            Err(_) => refused += 1,
        }
    }
    assert!(
        opened > 0 && refused > 0,
        "{opened} opened, {refused} refused"
    );
}

/// A damaged notes file never panics: bytes flipped in its notes (the
/// index it names left whole, so it still pairs), added unverified, then
/// cards of codes with notes at every level.
#[test]
fn damaged_notes_never_panic() {
    let good = notes_bytes();
    let mut seed: u64 = 0x2545f4914f6cdd1d;
    let mut next = || {
        seed ^= seed << 13;
        seed ^= seed >> 7;
        seed ^= seed << 17;
        seed
    };
    let mut paired = 0;
    for round in 0..40 {
        let mut b = good.clone();
        for _ in 0..(1 + round % 5) * 10 {
            // Past the header, the directory and the PAIR section.
            let at = 200 + (next() as usize) % (b.len() - 200);
            b[at] = next() as u8;
        }
        let Ok(notes) = rollcall::NotesFile::open(b) else {
            continue;
        };
        assert!(notes.verify().is_err());
        let mut idx = index();
        if idx.add_notes(notes).is_ok() {
            paired += 1;
            let c = rollcall::card::cards(
                &idx,
                &[],
                &["E11.621", "S06.0X1A", "O24.4", "B03", "Z99"],
                &on("2026-06-01"),
            );
            assert_eq!(c.cards.len(), 5);
        }
    }
    assert!(paired > 0);
}

/// A digest computed elsewhere (the page uses the browser's own SHA-256) is
/// held against the header as `verify` holds its own: the SHA-256 (FIPS
/// 180-4) of every byte from `CONTENT_START` passes, anything else is a
/// checksum mismatch naming both values.
#[test]
fn a_digest_computed_elsewhere_is_held_against_the_header() {
    let b = bundled_bytes();
    let index = Index::open(&b[..]).unwrap();
    let digest = rollcall::sha256::digest(&b[rollcall::index::CONTENT_START..]);
    assert_eq!(rollcall::sha256::hex(&digest), index.checksum());
    index.verify_digest(&digest).unwrap();
    let mut wrong = digest;
    wrong[31] ^= 1;
    let err = index.verify_digest(&wrong).unwrap_err();
    assert!(matches!(err, IndexError::ChecksumMismatch { .. }), "{err}");
    assert!(err.to_string().contains(&index.checksum()), "{err}");
    // A digest of the wrong length never passes.
    assert!(index.verify_digest(&digest[..31]).is_err());
}
