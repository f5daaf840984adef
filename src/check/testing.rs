//! Tiny indexes built in memory for the rule tests beside each file: a
//! handful of code entries written through `index::write` and opened, so
//! each rule is tested on one retired or one partial-period code at a time,
//! without the bundled release.

use crate::model::{
    Chapter, CodeEntry, Hierarchy, MapFlags, MapRow, Mapping, Meta, Period, Release, Section,
    Successor,
};
use crate::{check, CheckOptions, Date, Index, Report};

/// A day written `YYYY-MM-DD`.
pub(crate) fn day(s: &str) -> Date {
    Date::parse(s).expect("a test day")
}

/// The days `from` to `to`, both included.
pub(crate) fn span(from: &str, to: &str) -> Period {
    Period::new(day(from), day(to))
}

/// A code billable over `spans`.
pub(crate) fn billable(code: &str, description: &str, spans: &[Period]) -> CodeEntry {
    let mut e = CodeEntry::new(code, description);
    e.billable = spans.to_vec();
    e
}

/// A header over `spans`.
pub(crate) fn header(code: &str, description: &str, spans: &[Period]) -> CodeEntry {
    let mut e = CodeEntry::new(code, description);
    e.header = spans.to_vec();
    e
}

/// The whole coverage of the tiny index.
pub(crate) fn always() -> Period {
    span("2015-10-01", "2027-03-31")
}

/// Ten entries: a category with two billable codes (one under a
/// subcategory), a code retired on 2019-09-30 with a successor from the
/// next day, a code added on 2020-04-01, and a plain billable code.
pub(crate) fn ten() -> Vec<CodeEntry> {
    let a = always();
    let mut retired = billable(
        "R001",
        "Bradycardia, unspecified",
        &[span("2015-10-01", "2019-09-30")],
    );
    retired.successors = vec![Successor {
        code: "R0011".into(),
        effective: day("2019-10-01"),
    }];
    vec![
        header("E11", "Type 2 diabetes mellitus", &[a]),
        header(
            "E116",
            "Type 2 diabetes mellitus with other complications",
            &[a],
        ),
        billable("E1165", "Type 2 diabetes mellitus with hyperglycemia", &[a]),
        billable(
            "E119",
            "Type 2 diabetes mellitus without complications",
            &[a],
        ),
        billable("I10", "Essential (primary) hypertension", &[a]),
        header("R00", "Abnormalities of heart beat", &[a]),
        retired,
        billable(
            "R0011",
            "Sinus bradycardia",
            &[span("2019-10-01", "2027-03-31")],
        ),
        header("U07", "Emergency use of U07", &[a]),
        billable("U071", "COVID-19", &[span("2020-04-01", "2027-03-31")]),
    ]
}

/// An index of `codes` (sorted here), opened and verified.
pub(crate) fn index(codes: Vec<CodeEntry>) -> Index<Vec<u8>> {
    index_of("tiny", "Tiny", always(), codes, Vec::new())
}

/// A second tiny vocabulary, "old", that ended on 2015-09-30 the day
/// before the ten codes' coverage starts (the shape of ICD-9-CM beside
/// ICD-10-CM; invented codes): 428.0 with a mapping into `ten` (to I10,
/// approximate; to R00.1, retired in `ten` since 2019), and I10, a code of
/// both written alike.
pub(crate) fn old() -> Index<Vec<u8>> {
    let days = span("2010-10-01", "2015-09-30");
    let row = |target: &str| MapRow {
        source: "4280".into(),
        target: target.into(),
        flags: MapFlags {
            approximate: true,
            ..MapFlags::default()
        },
    };
    let mapping = Mapping {
        name: "old-tiny".into(),
        title: "Old to Tiny".into(),
        from: "old".into(),
        to: "tiny".into(),
        rows: vec![row("I10"), row("R001")],
    };
    let codes = vec![
        header("428", "Heart failure", &[days]),
        billable("4280", "Congestive heart failure, unspecified", &[days]),
        billable("I10", "Invented old code I10", &[days]),
    ];
    index_of("old", "Old", days, codes, vec![mapping])
}

/// An index of `codes` (sorted here) in the vocabulary `name`, covering
/// `coverage`, opened and verified.
fn index_of(
    name: &str,
    title: &str,
    coverage: Period,
    mut codes: Vec<CodeEntry>,
    mappings: Vec<Mapping>,
) -> Index<Vec<u8>> {
    codes.sort_by(|a, b| a.code.cmp(&b.code));
    let release = Release {
        meta: Meta {
            vocabulary: name.into(),
            title: title.into(),
            release: "T1".into(),
            coverage_from: coverage.from,
            coverage_to: coverage.to,
            sources: Vec::new(),
            dot_after: 3,
            dot_rules: Vec::new(),
            shapes: vec!["A99".into()],
            notice: String::new(),
        },
        codes,
        chapters: vec![Chapter {
            name: "1".into(),
            title: "All (A00-Z99)".into(),
        }],
        sections: vec![Section {
            first: "A00".into(),
            last: "Z99".into(),
            title: "All".into(),
            chapter: 0,
        }],
        seventh: Vec::new(),
        mappings,
        hierarchy: Hierarchy::Prefix,
        aliases: Vec::new(),
        notes: Vec::new(),
    };
    let bytes = crate::index::write::write(&release).expect("a tiny index writes");
    let index = Index::open(bytes).expect("and opens");
    index.verify().expect("and verifies");
    index
}

/// `text` checked against the ten entries for the period `from`..`to`.
pub(crate) fn check_ten(text: &str, from: &str, to: &str) -> Report {
    let opts = CheckOptions {
        from: day(from),
        to: day(to),
        billable: false,
    };
    check(&index(ten()), text, &opts)
}

/// What a list holding (and reaching) the codes `reached` (undotted) knows
/// of itself, for the rules called one at a time.
pub(crate) fn context(view: &crate::View<'_>, reached: &[&str]) -> check::ListContext {
    let mut ctx = check::ListContext {
        listed: check::OrdMap::default(),
        reached: check::Marks::new(view.len()),
        explicit: check::Marks::new(view.len()),
        by_pattern: check::OrdMap::default(),
        dotted: true,
    };
    for (line, code) in reached.iter().enumerate() {
        let ord = view.ordinal(code).expect("a code of the tiny index");
        ctx.listed.insert(ord, vec![line]);
        ctx.reached.insert(ord);
        ctx.explicit.insert(ord);
    }
    ctx
}
