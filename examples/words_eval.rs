//! Labels and searches in the words people write, on the bundled indexes.
//!
//! - `tests/data/clinician-labels.tsv`: right codes with labels as
//!   clinicians write them (shorthand, everyday words, word order changed,
//!   plurals). Each is checked as a one-line list on the last day of its
//!   index's coverage; prints the share that gets a `label-mismatch` warning
//!   (a false warning: the code is right) and the share noted as
//!   `label-unrecognised`.
//! - `tests/data/everyday-queries.tsv`: everyday queries with the code
//!   meant; prints the share whose code, or its three-character category,
//!   is among the first five found.
//!
//! `tests/synonyms.rs` pins floors a little below these figures. Run from
//! the repository root: `cargo run --profile fast --example words_eval`
//! (add `-- -v` to list every miss).

use rollcall::{check, CheckOptions, Index, Kind, Severity, Status};

/// One bundled index per system of the data files.
pub fn open(system: &str) -> Index<Vec<u8>> {
    let path = format!("vocab/{system}.rcx");
    let bytes =
        std::fs::read(&path).unwrap_or_else(|_| panic!("{path}: run from the repository root"));
    Index::open(bytes).unwrap_or_else(|e| panic!("{path}: {e}"))
}

/// The rows of a data file: tab-separated cells, `#` lines left out.
pub fn rows(text: &str) -> Vec<Vec<&str>> {
    text.lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .map(|l| l.split('\t').collect())
        .collect()
}

/// Figures of the label set.
#[derive(Debug, Default)]
pub struct LabelFigures {
    /// Rows checked.
    pub rows: usize,
    /// Rows whose code is not valid on the day (a fault of the data file).
    pub not_valid: Vec<String>,
    /// Rows with a `label-mismatch` warning, with its message.
    pub warned: Vec<String>,
    /// Rows with a `label-unrecognised` note.
    pub unrecognised: Vec<String>,
}

/// Checks every row of `tests/data/clinician-labels.tsv` (its text).
pub fn labels(text: &str) -> LabelFigures {
    let mut fig = LabelFigures::default();
    let mut indexes = std::collections::HashMap::new();
    for row in rows(text) {
        let [system, code, label, ..] = row[..] else {
            panic!("a row of clinician-labels.tsv has fewer than three cells: {row:?}");
        };
        let index = indexes
            .entry(system.to_string())
            .or_insert_with(|| open(system));
        let day = index.meta().coverage_to;
        let r = check(
            &*index,
            &format!("{code}\t{label}\n"),
            &CheckOptions::on(day, false),
        );
        let e = &r.entries[0];
        fig.rows += 1;
        let line = format!("{system} {code}\t{label}");
        if e.status != Status::Valid {
            fig.not_valid.push(format!("{line} ({})", e.status.name()));
        }
        for f in &e.findings {
            if f.kind == Kind::LabelMismatch && f.severity == Severity::Warning {
                fig.warned.push(format!("{line}: {}", f.message));
            }
            if f.kind == Kind::LabelUnrecognised {
                fig.unrecognised.push(line.clone());
            }
        }
    }
    fig
}

/// Figures of the query set.
#[derive(Debug, Default)]
pub struct QueryFigures {
    /// Queries run.
    pub queries: usize,
    /// Queries whose code (or its category) is first.
    pub first: usize,
    /// Queries whose code (or its category) is among the first five.
    pub top5: usize,
    /// Queries whose code or a header above it (a category or subcategory)
    /// is among the first five.
    pub top5_header: usize,
    /// The others, with what was found.
    pub misses: Vec<String>,
}

/// Runs every query of `tests/data/everyday-queries.tsv` (its text): a hit
/// is a code of the row (`|` between codes the query may mean) or the
/// three-character category of one among the first five found.
pub fn queries(text: &str) -> QueryFigures {
    let mut fig = QueryFigures::default();
    let mut indexes = std::collections::HashMap::new();
    for row in rows(text) {
        let [system, query, want, ..] = row[..] else {
            panic!("a row of everyday-queries.tsv has fewer than three cells: {row:?}");
        };
        let index = indexes
            .entry(system.to_string())
            .or_insert_with(|| open(system));
        let v = index.view();
        let day = v.meta().coverage_to;
        let found = rollcall::search::find(&v, query, day, 5, false);
        let want: Vec<&str> = want.split('|').collect();
        let hit = |code: &str| {
            want.iter()
                .any(|w| *w == code || (system != "hpo" && w.len() > 3 && code == &w[..3]))
        };
        let pos = found.iter().position(|f| hit(&f.code));
        let above = |code: &str| {
            want.iter()
                .any(|w| *w == code || (system != "hpo" && w.starts_with(code) && code.len() >= 3))
        };
        fig.top5_header += usize::from(found.iter().any(|f| above(&f.code)));
        fig.queries += 1;
        fig.first += usize::from(pos == Some(0));
        fig.top5 += usize::from(pos.is_some());
        if pos.is_none() {
            let got: Vec<&str> = found.iter().map(|f| f.code.as_str()).collect();
            fig.misses.push(format!(
                "{system} \"{query}\" (want {}): {got:?}",
                want.join("|")
            ));
        }
    }
    fig
}

/// The label set's text.
pub const LABELS: &str = include_str!("../tests/data/clinician-labels.tsv");
/// The query set's text.
pub const QUERIES: &str = include_str!("../tests/data/everyday-queries.tsv");

#[allow(dead_code)]
fn main() {
    let verbose = std::env::args().any(|a| a == "-v");
    let l = labels(LABELS);
    let pct = |x: usize, n: usize| 100.0 * x as f64 / n.max(1) as f64;
    println!(
        "clinician labels: {} right codes; label-mismatch warnings {} ({:.1}%, target <= 3%); label-unrecognised notes {} ({:.1}%)",
        l.rows,
        l.warned.len(),
        pct(l.warned.len(), l.rows),
        l.unrecognised.len(),
        pct(l.unrecognised.len(), l.rows)
    );
    for w in &l.warned {
        println!("  warned: {w}");
    }
    for w in &l.not_valid {
        println!("  not valid on the day (fix the data): {w}");
    }
    if verbose {
        for w in &l.unrecognised {
            println!("  unrecognised: {w}");
        }
    }
    let q = queries(QUERIES);
    println!(
        "everyday queries: {}; right code or its category first {} ({:.1}%), in the top 5 {} ({:.1}%, target >= 95%); the code or a header above it in the top 5 {} ({:.1}%)",
        q.queries,
        q.first,
        pct(q.first, q.queries),
        q.top5,
        pct(q.top5, q.queries),
        q.top5_header,
        pct(q.top5_header, q.queries)
    );
    for m in &q.misses {
        println!("  miss: {m}");
    }
}
