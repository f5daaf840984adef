//! A report written entry by entry as its list is checked (`check::Run`,
//! `render::{text_to, csv_to, json_to}`, what the CLI does for a list that
//! names no system) is byte for byte the report checked whole: the whole
//! report is the reference. And a list kept as its text (`list::Listing`)
//! reads the same lines as `list::read`. Over the demo lists, every draft
//! of demo-data/drafts and the Elixhauser list (AHRQ's CSV), in each
//! reading that applies.

mod common;

use common::*;
use rollcall::check::{check_draft, Run};
use rollcall::list::{read, Listing, Reading};
use rollcall::{render, CheckOptions, Index};

fn lists() -> Vec<(String, String)> {
    let mut out: Vec<(String, String)> = [
        "demo-list.tsv",
        "compare-draft.tsv",
        "compare-expert.tsv",
        "hpo-phenotypes.tsv",
        "mixed-list.tsv",
    ]
    .iter()
    .map(|n| {
        let text = std::fs::read_to_string(root().join("demo-data").join(n)).unwrap();
        (n.to_string(), text)
    })
    .collect();
    let drafts = root().join("demo-data/drafts");
    let mut names: Vec<_> = std::fs::read_dir(&drafts)
        .unwrap()
        .map(|e| e.unwrap().file_name().into_string().unwrap())
        .filter(|n| n != "README.md")
        .collect();
    names.sort();
    for n in names {
        out.push((n.clone(), std::fs::read_to_string(drafts.join(&n)).unwrap()));
    }
    out.push(("elixhauser".into(), elixhauser()));
    // Lines of every kind a table reader meets: a comment, a blank, a row
    // it cannot read, a code it reads in another form, a repeated code.
    out.push((
        "awkward rows".into(),
        "code,label\n# a comment\n\nE119,Type 2 diabetes\n\"E11.65,unclosed\ne11.9,again\nI10,\n,no code\n"
            .into(),
    ));
    out
}

fn streamed(
    index: &Index<Vec<u8>>,
    others: &[rollcall::View<'_>],
    listing: &Listing,
    options: &CheckOptions,
    form: &str,
) -> (Vec<u8>, rollcall::Summary) {
    let run = Run::new(index, others, listing, options);
    let mut out = Vec::new();
    let summary = match form {
        "json" => render::json_to(&mut out, run),
        "csv" => render::csv_to(&mut out, run),
        _ => render::text_to(&mut out, run),
    }
    .unwrap();
    (out, summary)
}

#[test]
fn a_report_written_as_it_is_checked_is_the_whole_report() {
    let index = index();
    let icd9 = icd9_index();
    let others = [icd9.view()];
    let options = period("2019-01-01", "2024-12-31");
    for (name, text) in lists() {
        for reading in [Reading::Auto, Reading::Lines, Reading::Table] {
            let draft = read(&text, reading);
            let listing = Listing::of(text.clone(), reading);
            assert_eq!(
                listing.into_draft(),
                draft,
                "{name} read as {reading:?}: the listing's lines"
            );
            let listing = Listing::of(text.clone(), reading);
            let whole = check_draft(&index, &others, &draft, &options).0;
            let json = serde_json::to_string_pretty(&whole).unwrap();
            for (form, want) in [
                ("json", json),
                ("text", render::text(&whole)),
                ("csv", render::csv(&whole)),
            ] {
                let (got, summary) = streamed(&index, &others, &listing, &options, form);
                assert_eq!(summary, whole.summary, "{name} {reading:?} {form}: summary");
                if got != want.as_bytes() {
                    let got = String::from_utf8_lossy(&got);
                    let at = got
                        .lines()
                        .zip(want.lines())
                        .position(|(a, b)| a != b)
                        .unwrap_or(0);
                    panic!(
                        "{name} read as {reading:?}, {form}: line {} differs\n  whole:    {:?}\n  streamed: {:?}",
                        at + 1,
                        want.lines().nth(at),
                        got.lines().nth(at)
                    );
                }
            }
        }
    }
}

#[test]
fn a_run_counts_the_entries_it_was_not_asked_for() {
    // finish() judges what is left: the summary of a run read halfway is
    // that of the whole report.
    let index = index();
    let options = on("2024-01-01");
    let text = elixhauser();
    let draft = read(&text, Reading::Auto);
    let whole = check_draft(&index, &[], &draft, &options).0;
    let mut run = Run::new(&index, &[], &draft, &options);
    let first: Vec<_> = run.by_ref().take(10).collect();
    assert_eq!(first, whole.entries[..10]);
    let (list_findings, summary) = run.finish();
    assert_eq!(list_findings, whole.list_findings);
    assert_eq!(summary, whole.summary);
}
