//! The committed index is what vocab-build makes from the committed sources,
//! byte for byte (so nobody can edit one without the other).

use std::path::PathBuf;
use std::process::Command;

#[test]
fn rebuilding_the_bundled_index_gives_the_committed_bytes() {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    let out = std::env::temp_dir().join(format!("rollcall-rebuild-{}.rcx", std::process::id()));
    let dir = root.join("vocab-build/sources");
    let arg = |name: &str, period: &str| format!("{}@{period}", dir.join(name).display());
    let status = Command::new(env!("CARGO_BIN_EXE_vocab-build"))
        .args([
            "--history",
            dir.join("icd10cm-history-FY2016-FY2027.tsv.gz")
                .to_str()
                .unwrap(),
        ])
        .args([
            "--tabular",
            &arg("icd10cm-tabular-2021.xml.gz", "2020-10-01..2020-12-31"),
        ])
        .args([
            "--order",
            &arg("icd10cm-order-2021-01.txt.gz", "2021-01-01..2021-09-30"),
        ])
        .args([
            "--codes",
            &arg("icd10cm-codes-FY2024.txt.gz", "2023-10-01..2024-09-30"),
        ])
        .args([
            "--tabular",
            &arg(
                "icd10cm-tabular-2025-04-01.xml.gz",
                "2025-04-01..2025-09-30",
            ),
        ])
        .args([
            "--tabular",
            &arg(
                "icd10cm-tabular-2026-04-01.xml.gz",
                "2026-04-01..2026-09-30",
            ),
        ])
        .args([
            "--conversion",
            dir.join("icd10cm-conversion-FY2017-FY2026.tsv.gz")
                .to_str()
                .unwrap(),
        ])
        .args(["--out", out.to_str().unwrap()])
        .status()
        .unwrap();
    assert!(status.success());
    let built = std::fs::read(&out).unwrap();
    let committed = std::fs::read(root.join("vocab/icd10cm.rcx")).unwrap();
    let _ = std::fs::remove_file(&out);
    // The tabular notes are written beside the index, NAME-notes.rcx.
    let notes_out =
        out.with_file_name(format!("rollcall-rebuild-{}-notes.rcx", std::process::id()));
    let built_notes = std::fs::read(&notes_out).unwrap();
    let committed_notes = std::fs::read(root.join("vocab/icd10cm-notes.rcx")).unwrap();
    let _ = std::fs::remove_file(&notes_out);
    assert!(
        built == committed,
        "vocab/icd10cm.rcx is out of date: run `cargo run --release -p vocab-build`"
    );
    assert!(
        built_notes == committed_notes,
        "vocab/icd10cm-notes.rcx is out of date: run `cargo run --release -p vocab-build`"
    );
    // The notes name the index they were written with, and pair with it.
    let mut index = rollcall::Index::open(committed).unwrap();
    let notes = rollcall::NotesFile::open(committed_notes).unwrap();
    notes.verify().unwrap();
    assert_eq!(notes.release(), index.meta().release);
    assert_eq!(notes.index_checksum(), index.checksum());
    assert!(index.add_notes(notes).is_ok());
}

#[test]
fn rebuilding_the_bundled_pcs_index_gives_the_committed_bytes() {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    let out = std::env::temp_dir().join(format!("rollcall-rebuild-pcs-{}.rcx", std::process::id()));
    let dir = root.join("vocab-build/sources");
    let status = Command::new(env!("CARGO_BIN_EXE_vocab-build"))
        .args(["--vocabulary", "icd10pcs", "--history"])
        .arg(dir.join("icd10pcs-history-FY2016-FY2027.tsv.gz"))
        .arg("--codes")
        .arg(format!(
            "{}@2023-10-01..2024-09-30",
            dir.join("icd10pcs-codes-FY2024.txt.gz").display()
        ))
        .args(["--out", out.to_str().unwrap()])
        .status()
        .unwrap();
    assert!(status.success());
    let built = std::fs::read(&out).unwrap();
    let committed = std::fs::read(root.join("vocab/icd10pcs.rcx")).unwrap();
    let _ = std::fs::remove_file(&out);
    assert!(
        built == committed,
        "vocab/icd10pcs.rcx is out of date: run `cargo run --release -p vocab-build`"
    );
}

#[test]
fn rebuilding_the_bundled_icd9_index_gives_the_committed_bytes() {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    let out =
        std::env::temp_dir().join(format!("rollcall-rebuild-icd9-{}.rcx", std::process::id()));
    let dir = root.join("vocab-build/sources");
    let status = Command::new(env!("CARGO_BIN_EXE_vocab-build"))
        .args(["--vocabulary", "icd9cm", "--codes"])
        .arg(format!(
            "{}@2014-10-01..2015-09-30",
            dir.join("CMS32_DESC_LONG_DX.txt.gz").display()
        ))
        .arg("--gems")
        .arg(dir.join("icd9cm-to-icd10cm-gem-2015.csv.gz"))
        .arg("--gems")
        .arg(dir.join("icd10cm-to-icd9cm-gem-2015.csv.gz"))
        .args(["--out", out.to_str().unwrap()])
        .status()
        .unwrap();
    assert!(status.success());
    let built = std::fs::read(&out).unwrap();
    let committed = std::fs::read(root.join("vocab/icd9cm.rcx")).unwrap();
    let _ = std::fs::remove_file(&out);
    assert!(
        built == committed,
        "vocab/icd9cm.rcx is out of date: run `cargo run --release -p vocab-build`"
    );
}

/// An order file alone (any year's official download) builds a usable index.
#[test]
fn an_order_file_alone_builds_an_index() {
    let dir = std::env::temp_dir().join(format!("rollcall-order-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    // Rows in the layout of the official order file (January 2021 update).
    let order = "00001 A00     0 Cholera                                                      Cholera\n\
                 00002 A000    1 Cholera due to Vibrio cholerae 01, biovar cholerae           Cholera due to Vibrio cholerae 01, biovar cholerae\n\
                 00003 A001    1 Cholera due to Vibrio cholerae 01, biovar eltor              Cholera due to Vibrio cholerae 01, biovar eltor\n";
    std::fs::write(dir.join("order.txt"), order).unwrap();
    let out = dir.join("o.rcx");
    let o = Command::new(env!("CARGO_BIN_EXE_vocab-build"))
        .args([
            "--order",
            &format!("{}@2020-10-01..2021-09-30", dir.join("order.txt").display()),
        ])
        .args(["--out", out.to_str().unwrap()])
        .output()
        .unwrap();
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let progress = String::from_utf8_lossy(&o.stderr);
    assert!(
        progress.contains("3 rows, 2 billable, 1 headers"),
        "{progress}"
    );
    let bytes = std::fs::read(&out).unwrap();
    let idx = rollcall::Index::open(bytes).unwrap();
    idx.verify().unwrap();
    let v = idx.view();
    let a00 = v.ordinal("A00").unwrap();
    assert_eq!(v.header(a00).next().unwrap().from.to_string(), "2020-10-01");
    assert_eq!(
        v.description(v.ordinal("A001").unwrap()),
        "Cholera due to Vibrio cholerae 01, biovar eltor"
    );
    let _ = std::fs::remove_dir_all(&dir);
}

/// A malformed row is reported with its file and line, and nothing is written.
#[test]
fn a_bad_row_names_its_line() {
    let dir = std::env::temp_dir().join(format!("rollcall-bad-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(dir.join("h.tsv"), "code\tvalid_from\tvalid_to\tdescription\nA000\t20151001\t20270331\tx\nA001\t2015-13-01\t20270331\ty\n").unwrap();
    let out = dir.join("h.rcx");
    let o = Command::new(env!("CARGO_BIN_EXE_vocab-build"))
        .args([
            "--history",
            dir.join("h.tsv").to_str().unwrap(),
            "--out",
            out.to_str().unwrap(),
        ])
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(2));
    let msg = String::from_utf8_lossy(&o.stderr);
    assert!(msg.contains("h.tsv line 3"), "{msg}");
    assert!(!out.exists());
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn rebuilding_the_bundled_hpo_index_gives_the_committed_bytes() {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    let out = std::env::temp_dir().join(format!("rollcall-rebuild-hpo-{}.rcx", std::process::id()));
    let status = Command::new(env!("CARGO_BIN_EXE_vocab-build"))
        .arg("--hpo")
        .arg(root.join("vocab-build/sources/hp-2025-01-16.obo.gz"))
        .args(["--out", out.to_str().unwrap()])
        .status()
        .unwrap();
    assert!(status.success());
    let built = std::fs::read(&out).unwrap();
    let committed = std::fs::read(root.join("vocab/hpo.rcx")).unwrap();
    let _ = std::fs::remove_file(&out);
    assert!(
        built == committed,
        "vocab/hpo.rcx is out of date: run `cargo run --release -p vocab-build`"
    );
}
