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
                notes: Vec::new(),
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

/// A release that states its hierarchy: each code takes parents among the
/// codes before it (so the links never form a cycle), some codes are
/// retired with codes to consider, some carry a status word, some have
/// synonyms (the empty one and repeats among them, kept as given), and
/// some have alternate ids.
fn arb_stated_release() -> impl Strategy<Value = Release> {
    (
        proptest::collection::btree_set("[A-Z]{2}:[0-9]{1,4}", 1..120),
        proptest::collection::vec(any::<u32>(), 120),
    )
        .prop_map(|(codes, dice)| {
            let keys: Vec<String> = codes.into_iter().collect();
            let day = date(0);
            let codes: Vec<CodeEntry> = keys
                .iter()
                .enumerate()
                .map(|(i, k)| {
                    let d = dice[i];
                    let mut e = CodeEntry::new(k.clone(), format!("term {i}"));
                    if i > 0 {
                        for n in 0..(d % 3) as usize {
                            let p = keys[(d as usize / 7 + n * 13) % i].clone();
                            if !e.parents.contains(&p) {
                                e.parents.push(p);
                            }
                        }
                        e.parents.sort();
                    }
                    if d % 11 == 0 {
                        e.consider = vec![keys[(d as usize / 3) % keys.len()].clone()];
                        e.consider.retain(|c| c != k);
                    } else {
                        e.billable = vec![Period::new(day, day)];
                    }
                    if d % 5 == 1 {
                        e.status = ["TRIAL", "DISCOURAGED"][(d / 5 % 2) as usize].into();
                    }
                    e.terms = (0..(d / 3 % 4) as usize)
                        .map(|n| ["wording ä", "", "wording ä", "other"][n].to_string())
                        .collect();
                    e
                })
                .collect();
            let aliases: Vec<(String, String)> = keys
                .iter()
                .enumerate()
                .filter(|(i, _)| dice[*i] % 4 == 0)
                .map(|(i, k)| (format!("ALT-{i}"), k.clone()))
                .collect::<std::collections::BTreeMap<_, _>>()
                .into_iter()
                .collect();
            Release {
                meta: Meta {
                    vocabulary: "stated".into(),
                    title: "Stated".into(),
                    release: "R1".into(),
                    coverage_from: day,
                    coverage_to: day,
                    sources: vec![],
                    dot_after: 0,
                    dot_rules: vec![],
                    shapes: vec!["AA99".into()],
                    notice: "Credit line.".into(),
                },
                codes,
                chapters: vec![],
                sections: vec![],
                seventh: vec![],
                mappings: vec![],
                hierarchy: Hierarchy::Explicit,
                aliases,
                notes: Vec::new(),
            }
        })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]

    /// The stated hierarchy survives the index, and its walks agree with
    /// each other: a code is among the descendants of exactly its ancestors.
    #[test]
    fn a_stated_hierarchy_round_trips_and_its_walks_agree(release in arb_stated_release()) {
        let bytes = write(&release).unwrap();
        let index = Index::open(&bytes[..]).unwrap();
        index.verify().unwrap();
        prop_assert_eq!(index.to_release(), release.clone());
        let v = index.view();
        prop_assert!(v.is_graph());
        let n = v.len() as u32;
        for a in 0..n {
            let below: BTreeSet<u32> = v.descendants(a).collect();
            for b in 0..n {
                let above: BTreeSet<u32> = v.ancestors(b).collect();
                prop_assert_eq!(below.contains(&b), above.contains(&a), "{} {}", a, b);
            }
            let kids: BTreeSet<u32> = v.children(a).collect();
            for k in &kids {
                prop_assert!(v.parents(*k).any(|p| p == a));
            }
        }
        for (alt, code) in &release.aliases {
            prop_assert_eq!(v.alias(alt).map(|o| v.code(o)), Some(code.clone()));
        }
    }
}

/// A cycle of parent links is refused with a message naming a code on it.
#[test]
fn a_cycle_of_parents_is_refused() {
    use proptest::strategy::ValueTree;
    let mut release = arb_stated_release()
        .new_tree(&mut proptest::test_runner::TestRunner::deterministic())
        .unwrap()
        .current();
    let mut a = CodeEntry::new("AA:1", "a");
    a.parents = vec!["AA:2".into()];
    let mut b = CodeEntry::new("AA:2", "b");
    b.parents = vec!["AA:1".into()];
    release.codes = vec![a, b];
    release.aliases.clear();
    let e = write(&release).unwrap_err().to_string();
    assert!(e.contains("circle") && e.contains("AA:"), "{e}");
}
