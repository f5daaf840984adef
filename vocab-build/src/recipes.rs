//! The bundled indexes: the files of `vocab-build/sources/` each is built
//! from, the days each file was in force, and the file it is written to in
//! `vocab/`. Every source is checked against `SHA256SUMS`.

use crate::assemble::{self, Vocabulary};
use crate::formats::{Format, Given};
use crate::readers::{codefile, conversion, gems, history, obo, order, tabular};
use rollcall::{Date, Period};
use std::path::Path;

/// One bundled index.
pub struct Recipe {
    /// The file written in `vocab/`.
    pub out: &'static str,
    /// The hierarchy of a dated release; none for a release of its own.
    pub vocabulary: Option<Vocabulary>,
    pub files: Vec<Given>,
}

/// The files the recipes write, in the order they are built.
pub const OUTS: [&str; 4] = ["icd10cm.rcx", "icd10pcs.rcx", "icd9cm.rcx", "hpo.rcx"];

/// A file of `dir` in `format`, in force from `from` to `to` when dated.
fn file(dir: &Path, format: &'static Format, name: &str, days: Option<(&str, &str)>) -> Given {
    let day = |d: &str| Date::parse(d).unwrap_or_else(|e| panic!("the recipe's day {d}: {e}"));
    Given {
        format,
        path: dir.join(name),
        period: days.map(|(from, to)| Period::new(day(from), day(to))),
    }
}

/// The recipes, reading from `dir` (`vocab-build/sources`).
pub fn bundled(dir: &Path) -> Vec<Recipe> {
    let f = |format, name, days| file(dir, format, name, days);
    vec![
        Recipe {
            out: OUTS[0],
            vocabulary: Some(assemble::ICD10CM),
            files: vec![
                f(
                    &history::FORMAT,
                    "icd10cm-history-FY2016-FY2027.tsv.gz",
                    None,
                ),
                f(
                    &tabular::FORMAT,
                    "icd10cm-tabular-2021.xml.gz",
                    Some(("2020-10-01", "2020-12-31")),
                ),
                f(
                    &order::FORMAT,
                    "icd10cm-order-2021-01.txt.gz",
                    Some(("2021-01-01", "2021-09-30")),
                ),
                f(
                    &codefile::FORMAT,
                    "icd10cm-codes-FY2024.txt.gz",
                    Some(("2023-10-01", "2024-09-30")),
                ),
                f(
                    &tabular::FORMAT,
                    "icd10cm-tabular-2025-04-01.xml.gz",
                    Some(("2025-04-01", "2025-09-30")),
                ),
                f(
                    &tabular::FORMAT,
                    "icd10cm-tabular-2026-04-01.xml.gz",
                    Some(("2026-04-01", "2026-09-30")),
                ),
                f(
                    &conversion::FORMAT,
                    "icd10cm-conversion-FY2017-FY2026.tsv.gz",
                    None,
                ),
            ],
        },
        // The history gives the billable dates, the FY2024 code file the
        // descriptions of the codes valid that year.
        Recipe {
            out: OUTS[1],
            vocabulary: Some(assemble::ICD10PCS),
            files: vec![
                f(
                    &history::FORMAT,
                    "icd10pcs-history-FY2016-FY2027.tsv.gz",
                    None,
                ),
                f(
                    &codefile::FORMAT,
                    "icd10pcs-codes-FY2024.txt.gz",
                    Some(("2023-10-01", "2024-09-30")),
                ),
            ],
        },
        // The final code file (version 32), in force for FY2015, the last
        // year before the system was retired on 2015-10-01 (HHS final rule,
        // 79 FR 45128), and the 2015 GEMs both ways.
        Recipe {
            out: OUTS[2],
            vocabulary: Some(assemble::ICD9CM),
            files: vec![
                f(
                    &codefile::FORMAT,
                    "CMS32_DESC_LONG_DX.txt.gz",
                    Some(("2014-10-01", "2015-09-30")),
                ),
                f(&gems::FORMAT, "icd9cm-to-icd10cm-gem-2015.csv.gz", None),
                f(&gems::FORMAT, "icd10cm-to-icd9cm-gem-2015.csv.gz", None),
            ],
        },
        Recipe {
            out: OUTS[3],
            vocabulary: None,
            files: vec![f(&obo::FORMAT, "hp-2025-01-16.obo.gz", None)],
        },
    ]
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every file a recipe names is in the sources and listed in SHA256SUMS
    /// (the sources' own list, vocab-build/sources/PROVENANCE.md), in the
    /// form its flag takes.
    #[test]
    fn each_recipe_names_listed_sources_in_their_form() {
        let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("sources");
        let sums = std::fs::read_to_string(dir.join("SHA256SUMS")).unwrap();
        let recipes = bundled(&dir);
        let outs: Vec<&str> = recipes.iter().map(|r| r.out).collect();
        assert_eq!(outs, OUTS);
        for r in &recipes {
            assert_eq!(
                r.vocabulary.is_none(),
                r.files.iter().all(|g| g.format.is_own())
            );
            for g in &r.files {
                let name = g.path.file_name().unwrap().to_str().unwrap();
                assert!(g.path.exists(), "{name}");
                assert!(
                    sums.lines().any(|l| l.ends_with(&format!("  {name}"))),
                    "{name}"
                );
                let dated = g.format.takes == crate::formats::Takes::Dated;
                assert_eq!(g.period.is_some(), dated, "{name}");
            }
        }
    }

    /// What the recipes write is the committed indexes and notes file, byte
    /// for byte (the bundled path of `vocab-build` with no arguments; the
    /// tests in tests/reproducible.rs give the same files as arguments).
    #[test]
    fn each_recipe_builds_the_committed_index() {
        let root = Path::new(env!("CARGO_MANIFEST_DIR"));
        let dir = root.join("sources");
        let sums = std::fs::read_to_string(dir.join("SHA256SUMS")).unwrap();
        let out = std::env::temp_dir().join(format!("rollcall-recipes-{}", std::process::id()));
        for r in bundled(&dir) {
            let dest = out.join(r.out);
            match r.vocabulary {
                Some(v) => crate::build::build(&r.files, &dest, v, Some(&sums)),
                None => crate::build::build_own(
                    &r.files[0],
                    &crate::formats::Options::default(),
                    &dest,
                    Some(&sums),
                ),
            }
            .unwrap_or_else(|e| panic!("{}: {e}", r.out));
            let committed = root.join("../vocab").join(r.out);
            assert!(
                std::fs::read(&dest).unwrap() == std::fs::read(&committed).unwrap(),
                "{} differs from the committed index",
                r.out
            );
        }
        let notes = std::fs::read(out.join("icd10cm-notes.rcx")).unwrap();
        assert!(notes == std::fs::read(root.join("../vocab/icd10cm-notes.rcx")).unwrap());
        let _ = std::fs::remove_dir_all(&out);
    }
}
