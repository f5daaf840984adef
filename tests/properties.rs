//! Property tests: an index written then read gives back exactly its input;
//! a roll-up suggestion expands to exactly the codes it replaces.

mod common;

use common::*;
use proptest::prelude::*;
use rollcall::index::write::write;
use rollcall::model::*;
use rollcall::pattern::{parse, Pattern};
use rollcall::{check, Date, Index, Kind};
use std::collections::BTreeSet;

fn date(d: i32) -> Date {
    Date::from_days(16_000 + d)
}

fn arb_release() -> impl Strategy<Value = Release> {
    let code = "[A-Z][0-9A-Z]{0,5}";
    let entry = (
        "[a-z ,]{0,40}",
        proptest::collection::vec((0..400i32, 0..400i32), 0..3),
        proptest::collection::vec((0..400i32, 0..400i32), 0..2),
        proptest::option::of(0u16..3),
    );
    (
        proptest::collection::btree_map(code, entry, 1..200),
        0usize..5,
    )
        .prop_map(|(m, nsucc)| {
            let keys: Vec<String> = m.keys().cloned().collect();
            let codes: Vec<CodeEntry> = m
                .into_iter()
                .enumerate()
                .map(|(i, (code, (description, b, h, seventh)))| {
                    let spans = |v: Vec<(i32, i32)>| {
                        let mut v: Vec<Period> = v
                            .into_iter()
                            .map(|(a, l)| Period::new(date(a * 3), date(a * 3 + l % 3)))
                            .collect();
                        v.sort();
                        v.dedup();
                        v
                    };
                    let successors = (0..nsucc.min(keys.len()))
                        .map(|k| Successor {
                            code: keys[(i + k) % keys.len()].clone(),
                            effective: date(k as i32),
                        })
                        .collect::<BTreeSet<_>>()
                        .into_iter()
                        .collect();
                    CodeEntry {
                        code,
                        description,
                        billable: spans(b),
                        header: spans(h),
                        successors,
                        seventh,
                        terms: Vec::new(),
                        parents: Vec::new(),
                        consider: Vec::new(),
                        status: String::new(),
                    }
                })
                .collect();
            Release {
                meta: Meta {
                    vocabulary: "test".into(),
                    title: "Test".into(),
                    release: "T1".into(),
                    coverage_from: date(0),
                    coverage_to: date(1200),
                    sources: vec![Source {
                        file: "f".into(),
                        sha256: "00".into(),
                        role: "r".into(),
                    }],
                    dot_after: 3,
                    dot_rules: vec![('E', 4)],
                    shapes: vec!["A99".into()],
                    notice: String::new(),
                },
                codes,
                chapters: vec![Chapter {
                    name: "1".into(),
                    title: "One".into(),
                }],
                sections: vec![Section {
                    first: "A00".into(),
                    last: "Z99".into(),
                    title: "All".into(),
                    chapter: 0,
                }],
                mappings: vec![Mapping {
                    name: "m".into(),
                    title: "M".into(),
                    from: "test".into(),
                    to: "other".into(),
                    rows: keys
                        .iter()
                        .take(5)
                        .enumerate()
                        .map(|(i, k)| MapRow {
                            source: k.clone(),
                            target: format!("T{i}"),
                            flags: MapFlags {
                                approximate: i % 2 == 0,
                                no_map: false,
                                combination: i % 3 == 0,
                                scenario: i as u8,
                                choice_list: 1,
                            },
                        })
                        .collect(),
                }],
                seventh: (0..3)
                    .map(|i| SeventhRule {
                        extensions: vec![('A', format!("rule {i}"))],
                    })
                    .collect(),
                hierarchy: Default::default(),
                aliases: Vec::new(),
            }
        })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]

    #[test]
    fn write_then_read_gives_back_the_release(release in arb_release()) {
        let bytes = write(&release).unwrap();
        let index = Index::open(&bytes[..]).unwrap();
        index.verify().unwrap();
        prop_assert_eq!(index.to_release(), release);
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]

    #[test]
    fn a_roll_up_expands_to_exactly_the_codes_it_replaces(pick in 0usize..1_000_000, shuffle in any::<u64>()) {
        let nodes = roll_up_nodes(&index(), "2026-01-01");
        let node = &nodes[pick % nodes.len()];
        let index = index();
        let v = index.view();
        let opts = on("2026-01-01");
        let p = opts.period();
        let mut codes = Pattern::Prefix(node.clone()).expand(&v, &p);
        // The list order should not matter.
        let k = codes.len();
        codes.rotate_left((shuffle as usize) % k);
        let text: String = codes.iter().map(|&o| v.display(&v.code(o)) + "\n").collect();
        let r = check(&index, &text, &opts);
        let roll: Vec<_> = r.list_findings.iter().filter(|f| f.kind == Kind::RollUp).collect();
        prop_assert_eq!(roll.len(), 1, "one roll-up for {}", node);
        let f = roll[0];
        let pat = parse(&f.suggestions[0].code).unwrap().unwrap();
        let expanded: BTreeSet<String> = pat.expand(&v, &p).into_iter().map(|o| v.display(&v.code(o))).collect();
        let replaced: BTreeSet<String> = f.codes.iter().cloned().collect();
        let listed: BTreeSet<String> = text.lines().map(str::to_string).collect();
        prop_assert_eq!(&expanded, &replaced);
        prop_assert_eq!(&replaced, &listed);
        prop_assert_eq!(f.lines.len(), k);
    }
}
