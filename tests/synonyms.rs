//! The synonym layer against outside sources: the HPO table is what the
//! bundled HPO release gives (rebuilt and compared), and the label check and
//! the search on the project's sets of clinicians' words keep their figures
//! (`examples/words_eval.rs` prints them; floors here a little below).

mod common;

use common::*;
use rollcall::{check, Kind, Severity};

#[path = "../examples/hpo_synonyms.rs"]
mod hpo_synonyms;
#[path = "../examples/label_eval.rs"]
mod label_eval;
#[path = "../examples/words_eval.rs"]
mod words_eval;

/// Source: the bundled HPO release (vocab-build/sources/hp-2025-01-16.obo.gz)
/// and ICD-10-CM index: the committed table is exactly what the generator
/// makes of them, and holds the release's "Heart attack" (HP:0001658, an
/// exact layperson synonym of Myocardial infarction).
#[test]
fn the_hpo_table_is_rebuilt_from_the_release() {
    let made = hpo_synonyms::derive(&hpo_synonyms::obo_text(), &index().view());
    assert_eq!(
        made,
        rollcall::synonyms::HPO,
        "src/synonyms/hpo.tsv is stale: cargo run --profile fast --example hpo_synonyms > src/synonyms/hpo.tsv"
    );
    assert!(made.contains("Heart attack\tMyocardial infarction\tHP:0001658\n"));
}

/// Common practice (the project's set, tests/data/clinician-labels.tsv): right
/// codes with labels as clinicians write them get a label-mismatch warning
/// at most 3% of the time; every code of the set is valid on its day.
#[test]
fn clinicians_labels_on_right_codes_are_rarely_warned() {
    let f = words_eval::labels(words_eval::LABELS);
    assert!(f.rows >= 200, "{} rows", f.rows);
    assert!(f.not_valid.is_empty(), "{:?}", f.not_valid);
    // 1 of 509 when written; the floor allows 1%.
    assert!(f.warned.len() * 100 <= f.rows, "{:#?}", f.warned);
    assert!(
        f.unrecognised.len() * 100 <= f.rows * 4,
        "{:#?}",
        f.unrecognised
    );
}

/// Common practice (the project's set, tests/data/everyday-queries.tsv): the
/// code meant, or its category, is among the first five found for at least
/// 95% of everyday queries (96.5% when written).
#[test]
fn everyday_queries_find_the_code_meant() {
    let f = words_eval::queries(words_eval::QUERIES);
    assert!(f.queries >= 200, "{} queries", f.queries);
    assert!(
        f.top5 * 1000 >= f.queries * 955,
        "{} of {}: {:#?}",
        f.top5,
        f.queries,
        f.misses
    );
    assert!(
        f.first * 100 >= f.queries * 65,
        "first {} of {}",
        f.first,
        f.queries
    );
}

fn label_findings(list: &str, d: &str) -> Vec<(Kind, Severity, String, Vec<String>)> {
    let r = check(&index(), list, &on(d));
    r.entries
        .iter()
        .flat_map(|e| e.findings.iter())
        .filter(|f| matches!(f.kind, Kind::LabelMismatch | Kind::LabelUnrecognised))
        .map(|f| {
            (
                f.kind,
                f.severity,
                f.message.clone(),
                f.suggestions.iter().map(|s| s.code.clone()).collect(),
            )
        })
        .collect()
}

/// Source: the CDC tabular XML 2026-04-01: C25.9 "Malignant neoplasm of
/// pancreas, unspecified", R73.9 "Hyperglycemia, unspecified", F43.10
/// "Post-traumatic stress disorder, unspecified", E11.65 "Type 2 diabetes
/// mellitus with hyperglycemia" (the ICD-10-CM index reads "poorly
/// controlled" diabetes as with hyperglycemia, from memory), I21.9 "Acute
/// myocardial infarction, unspecified", I50.30/I50.20 unspecified diastolic
/// and systolic heart failure (HFpEF, HFrEF: common practice).
#[test]
fn clinicians_words_fit_their_codes() {
    let list = "C25.9\tpancreatic cancer\nR73.9\thigh blood sugar\nF43.10\tPTSD\n\
                E11.65\tT2DM, poorly controlled\nI21.9\theart attack\nI50.30\tHFpEF\nI50.20\tHFrEF\n\
                E05.90\thyperthyroidism\nT78.40XA\tallergic reaction, initial encounter\n";
    let found = label_findings(list, "2025-01-01");
    assert!(found.is_empty(), "{found:#?}");
}

/// Source: the CDC tabular XML 2026-04-01 (I50.20 "Unspecified systolic
/// (congestive) heart failure", E11.9 "Type 2 diabetes mellitus without
/// complications", I50.30 diastolic). A label that says the opposite of the
/// code (diastolic for systolic, type 1 for type 2) is a warning naming both
/// words, with the code it fits.
#[test]
fn a_label_that_contradicts_the_code_is_a_warning() {
    for (line, said, official, meant) in [
        ("I50.20\tHFpEF\n", "diastolic", "systolic", "I50.30"),
        (
            "E11.9\ttype 1 diabetes without complications\n",
            "type 1",
            "type 2",
            "E10.9",
        ),
        (
            "I50.30\tsystolic heart failure\n",
            "systolic",
            "diastolic",
            "I50.20",
        ),
    ] {
        let found = label_findings(line, "2025-01-01");
        let (kind, sev, msg, sugg) = &found[0];
        assert_eq!(
            (*kind, *sev),
            (Kind::LabelMismatch, Severity::Warning),
            "{line}"
        );
        assert!(
            msg.contains(&format!(
                "reads \"{said}\" where the description says \"{official}\""
            )),
            "{msg}"
        );
        assert!(sugg.iter().any(|s| s == meant), "{line}: {sugg:?}");
    }
}

/// Common practice: a label rollcall does not understand cannot be said to
/// contradict the code: a note of its own (info), with no suggestion.
#[test]
fn a_label_nothing_fits_is_a_note() {
    let found = label_findings("I10\tpurple monkey dishwasher\n", "2025-01-01");
    let (kind, sev, msg, sugg) = &found[0];
    assert_eq!((*kind, *sev), (Kind::LabelUnrecognised, Severity::Info));
    assert!(msg.contains("does not recognise the label"), "{msg}");
    assert!(sugg.is_empty());
}

/// Source: the CDC tabular XML 2026-04-01: J18.9 "Pneumonia, unspecified
/// organism" is the general code of pneumonia, A54.84 "Gonococcal
/// pneumonia" a rare one; a single word finds the general one first, and
/// the word that points to the rare one finds it.
#[test]
fn a_single_word_finds_the_general_code_first() {
    let index = index();
    let v = index.view();
    let first = |q: &str| {
        rollcall::search::find(&v, q, day("2026-01-01"), 5, false)
            .first()
            .map(|f| f.code.clone())
    };
    assert_eq!(first("pneumonia").as_deref(), Some("J18.9"));
    assert_eq!(first("gonococcal pneumonia").as_deref(), Some("A54.84"));
    assert_eq!(first("asthma").as_deref(), Some("J45")); // the category, then J45.909
}

/// Source: the CMS ICD-10-PCS code file FY2024 (vocab-build/sources):
/// 0DTJ4ZZ "Resection of Appendix, Percutaneous Endoscopic Approach",
/// 0DTJ0ZZ "Resection of Appendix, Open Approach". A clinical procedure name
/// is read through the root operation and approach (appendectomy as
/// Resection of Appendix, laparoscopic as Percutaneous Endoscopic); a node
/// with no description (0DT, above the body part) gets no label check.
#[test]
fn procedure_names_are_read_through_root_operation_and_approach() {
    let bytes = std::fs::read(root().join("vocab/icd10pcs.rcx")).expect("vocab/icd10pcs.rcx");
    let pcs = rollcall::Index::open(bytes).expect("the ICD-10-PCS index opens");
    let list = "0DTJ4ZZ\tlaparoscopic appendectomy\n0DTJ0ZZ\tlaparoscopic appendectomy\n0DT\tappendectomy\n";
    let r = check(&pcs, list, &on("2025-01-01"));
    let labels = |i: usize| -> Vec<&rollcall::Finding> {
        r.entries[i]
            .findings
            .iter()
            .filter(|f| matches!(f.kind, Kind::LabelMismatch | Kind::LabelUnrecognised))
            .collect()
    };
    assert!(labels(0).is_empty(), "{:?}", labels(0));
    let f = labels(1);
    assert_eq!(f.len(), 1);
    assert_eq!(f[0].kind, Kind::LabelMismatch);
    assert_eq!(f[0].suggestions[0].code, "0DTJ4ZZ");
    assert!(labels(2).is_empty(), "{:?}", labels(2));
}

/// Source: the HPO release hp-2025-01-16.obo (vocab-build/sources):
/// HP:0001658 Myocardial infarction has the exact synonym "Heart attack",
/// HP:0002094 Dyspnea "Trouble breathing"; HP:0001250 is Seizure. The HPO
/// index keeps every synonym of a term in its word map, so a label written as
/// one fits; another term's name is a mismatch that suggests that term.
#[test]
fn hpo_labels_are_compared_with_the_term_s_synonyms() {
    let bytes = std::fs::read(root().join("vocab/hpo.rcx")).expect("vocab/hpo.rcx");
    let hpo = rollcall::Index::open(bytes).expect("the HPO index opens");
    let day = hpo.meta().coverage_to;
    let list = "HP:0001658\tHeart attack\nHP:0002094\tTrouble breathing\nHP:0001658\tSeizure\n";
    let r = check(&hpo, list, &rollcall::CheckOptions::on(day, false));
    let labels = |i: usize| -> Vec<&rollcall::Finding> {
        r.entries[i]
            .findings
            .iter()
            .filter(|f| matches!(f.kind, Kind::LabelMismatch | Kind::LabelUnrecognised))
            .collect()
    };
    assert!(labels(0).is_empty(), "{:?}", labels(0));
    assert!(labels(1).is_empty(), "{:?}", labels(1));
    let f = labels(2);
    assert_eq!(f[0].kind, Kind::LabelMismatch, "{f:?}");
    assert!(
        f[0].suggestions.iter().any(|s| s.code == "HP:0001250"),
        "{f:?}"
    );
}

/// Source: the bundled ICD-10-CM index's own descriptions (CDC/NCHS tabular
/// and order files): a mistyped code given with another code's official
/// description, or a reworded one, still leads to the code meant. The synonym
/// layer must keep the label evaluation's figures (`examples/label_eval.rs`:
/// 98.6% / 98.8% official, 92.4% / 97.5% reworded, top-1 / top-3, when
/// written) within a point.
#[test]
fn the_synonym_layer_keeps_label_recall() {
    let index = index();
    let (opts, samples) = label_eval::samples(&index);
    let f = label_eval::recall(&index, &opts, &samples);
    let n = samples.len();
    assert_eq!(n, 1000);
    let at_least = |hits: usize, per_mille: usize, what: &str| {
        assert!(
            hits * 1000 >= n * per_mille,
            "{what}: {hits} of {n}; misses {:#?}",
            f.misses
        );
    };
    at_least(f.top1, 976, "official labels, top-1");
    at_least(f.top3, 978, "official labels, top-3");
    at_least(f.rtop1, 914, "reworded labels, top-1");
    at_least(f.rtop3, 965, "reworded labels, top-3");
}
