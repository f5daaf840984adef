//! Puts the parsed release files together into one [`Release`]: billable
//! spans from the history (or from dated order/code files), the node set from
//! the union of every tree, header spans derived per date, descriptions,
//! successors, chapters, sections and 7th-character rules.

use crate::{conversion, history, order, tabular};
use rollcall::model::{
    shape_of, CodeEntry, Meta, Note, NoteOwner, Period, Release, SeventhRule, Source, Successor,
};
use std::collections::{BTreeMap, BTreeSet, HashMap, HashSet};

/// A tree (a tabular file or an order file) and the days it was in force.
pub struct Tree {
    pub period: Period,
    pub codes: HashSet<String>,
}

/// The vocabulary an index is for: its id, title, where its codes are
/// written with a dot, and whether its hierarchy is by position.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Vocabulary {
    pub id: &'static str,
    pub title: &'static str,
    pub dot_after: u8,
    pub dot_rules: &'static [(char, u8)],
    pub hierarchy: Hierarchy,
}

/// Where the nodes above the codes come from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Hierarchy {
    /// The tabular and order files (ICD-10-CM).
    Trees,
    /// The first one to `max` characters of a code are nodes above it
    /// (ICD-10-PCS: each of the seven characters has its own meaning, and the
    /// first four name the section, body system, root operation and body
    /// part; ICD-10-PCS Official Guidelines, A.2-A.4). The approach, device
    /// and qualifier levels are left out: they would add 100,000 nodes for
    /// little use in a code list.
    Positional { max: usize },
    /// The category (three characters, four for E codes) and each longer
    /// prefix of a code are nodes above it (ICD-9-CM: 250 > 250.0 > 250.00).
    Categories,
}

pub const ICD10CM: Vocabulary = Vocabulary {
    id: "icd10cm",
    title: "ICD-10-CM",
    dot_after: 3,
    dot_rules: &[],
    hierarchy: Hierarchy::Trees,
};

pub const ICD10PCS: Vocabulary = Vocabulary {
    id: "icd10pcs",
    title: "ICD-10-PCS",
    dot_after: 0,
    dot_rules: &[],
    hierarchy: Hierarchy::Positional { max: 4 },
};

pub const ICD9CM: Vocabulary = Vocabulary {
    id: "icd9cm",
    title: "ICD-9-CM",
    dot_after: 3,
    dot_rules: &[('E', 4)],
    hierarchy: Hierarchy::Categories,
};

impl Default for Vocabulary {
    fn default() -> Self {
        ICD10CM
    }
}

/// Everything read from the source files.
#[derive(Default)]
pub struct Inputs {
    pub vocabulary: Vocabulary,
    pub sources: Vec<Source>,
    pub history: Vec<history::Row>,
    /// Tabular files with the days each was in force, newest last.
    pub tabulars: Vec<(Period, tabular::Tabular)>,
    /// Order files with the days each was in force.
    pub orders: Vec<(Period, Vec<order::Row>)>,
    /// Code-description files with the days each was in force.
    pub codefiles: Vec<(Period, Vec<(String, String)>)>,
    pub conversion: Vec<conversion::Row>,
    /// Mappings to or from other vocabularies (the GEMs), rows sorted by source.
    pub mappings: Vec<rollcall::model::Mapping>,
}

/// Builds the release model; `progress` receives one line per step.
pub fn assemble(mut inp: Inputs, progress: &mut dyn FnMut(String)) -> Release {
    inp.tabulars.sort_by_key(|(p, _)| p.from);

    // 1. Billable spans.
    let mut billable: BTreeMap<String, Vec<Period>> = BTreeMap::new();
    for r in &inp.history {
        billable.entry(r.code.clone()).or_default().push(r.valid);
    }
    if inp.history.is_empty() {
        for (p, rows) in &inp.orders {
            for r in rows.iter().filter(|r| r.billable) {
                billable.entry(r.code.clone()).or_default().push(*p);
            }
        }
        for (p, rows) in &inp.codefiles {
            for (c, _) in rows {
                billable.entry(c.clone()).or_default().push(*p);
            }
        }
    }
    for spans in billable.values_mut() {
        *spans = merge(std::mem::take(spans));
    }
    progress(format!("billable codes: {}", billable.len()));

    // 2. Trees and the node set.
    let mut trees: Vec<Tree> = Vec::new();
    for (p, t) in &inp.tabulars {
        trees.push(Tree {
            period: *p,
            codes: t.nodes.iter().map(|n| n.code.clone()).collect(),
        });
    }
    for (p, rows) in &inp.orders {
        trees.push(Tree {
            period: *p,
            codes: rows.iter().map(|r| r.code.clone()).collect(),
        });
    }
    let mut nodes: BTreeSet<String> = billable.keys().cloned().collect();
    for t in &trees {
        nodes.extend(t.codes.iter().cloned());
    }
    for (_, rows) in &inp.codefiles {
        nodes.extend(rows.iter().map(|(c, _)| c.clone()));
    }
    let prefix_lengths = |c: &str| match inp.vocabulary.hierarchy {
        Hierarchy::Trees => 0..0,
        Hierarchy::Positional { max } => 1..c.len().min(max + 1),
        Hierarchy::Categories => (if c.starts_with('E') { 4 } else { 3 })..c.len(),
    };
    let prefixes: Vec<String> = nodes
        .iter()
        .flat_map(|c| prefix_lengths(c).map(move |n| c[..n].to_string()))
        .collect();
    nodes.extend(prefixes);
    let codes: Vec<String> = nodes.into_iter().collect();
    progress(format!(
        "nodes in the union of {} trees: {}",
        trees.len(),
        codes.len()
    ));

    // 3. Header spans: a node is a header on a day when a billable code lies
    // under it that day, it is not billable itself, and no tree in force that
    // day lacks it.
    let ends = rollcall::model::subtree_ends(&codes);
    let mut header: Vec<Vec<Period>> = vec![Vec::new(); codes.len()];
    for (i, code) in codes.iter().enumerate() {
        let mut under: Vec<Period> = Vec::new();
        for d in &codes[i + 1..ends[i]] {
            if let Some(s) = billable.get(d) {
                under.extend(s.iter().copied());
            }
        }
        if under.is_empty() {
            continue;
        }
        let mut spans = merge(under);
        if let Some(own) = billable.get(code) {
            spans = subtract(spans, own);
        }
        for t in trees.iter().filter(|t| !t.codes.contains(code)) {
            spans = subtract(spans, &[t.period]);
        }
        header[i] = spans;
    }
    let n_headers = header.iter().filter(|h| !h.is_empty()).count();
    progress(format!("header nodes (at some date): {n_headers}"));

    // 4. Descriptions: history, else the newest tree that has the node.
    let mut desc: HashMap<&str, &str> = HashMap::new();
    for (_, rows) in &inp.codefiles {
        for (c, d) in rows {
            desc.insert(c, d);
        }
    }
    for (_, rows) in &inp.orders {
        for r in rows {
            desc.insert(&r.code, &r.long);
        }
    }
    let mut seventh_at: HashMap<&str, Option<&Vec<(char, String)>>> = HashMap::new();
    for (_, t) in &inp.tabulars {
        for n in &t.nodes {
            desc.insert(&n.code, &n.description);
            seventh_at.insert(&n.code, n.seventh.as_ref());
        }
    }
    for r in &inp.history {
        if !r.description.is_empty() {
            desc.insert(&r.code, &r.description);
        }
    }
    // Other wordings for the word map: inclusion terms of every tabular and
    // the descriptions of every file (older wordings are still written in lists).
    let mut terms_at: HashMap<String, Vec<String>> = HashMap::new();
    {
        let mut add = |c: &str, t: &str| {
            let v = terms_at.entry(c.to_string()).or_default();
            if !t.is_empty() && !v.iter().any(|x| x == t) {
                v.push(t.to_string());
            }
        };
        for (_, rows) in &inp.codefiles {
            for (c, d) in rows {
                add(c, d);
            }
        }
        for (_, rows) in &inp.orders {
            for r in rows {
                add(&r.code, &r.long);
            }
        }
        for (_, t) in &inp.tabulars {
            for n in &t.nodes {
                add(&n.code, &n.description);
                for term in &n.terms {
                    add(&n.code, term);
                }
            }
        }
        for r in &inp.history {
            add(&r.code, &r.description);
        }
    }

    // 5. 7th-character rules, deduplicated.
    let mut rules: Vec<SeventhRule> = Vec::new();
    let mut rule_id: HashMap<Vec<(char, String)>, u16> = HashMap::new();

    // 6. Successors.
    let known: HashSet<&str> = codes.iter().map(String::as_str).collect();
    let mut succ: HashMap<&str, Vec<Successor>> = HashMap::new();
    let mut dropped = 0;
    for r in &inp.conversion {
        if known.contains(r.previous.as_str()) && known.contains(r.current.as_str()) {
            succ.entry(&r.previous).or_default().push(Successor {
                code: r.current.clone(),
                effective: r.effective,
            });
        } else {
            dropped += 1;
        }
    }
    progress(format!(
        "conversion pairs: {} kept, {dropped} naming codes outside the release",
        inp.conversion.len() - dropped
    ));

    let mut entries = Vec::new();
    let mut dropped_nodes = 0;
    for (i, code) in codes.iter().enumerate() {
        let b = billable.get(code).cloned().unwrap_or_default();
        if b.is_empty() && header[i].is_empty() {
            dropped_nodes += 1;
            continue;
        }
        let seventh = seventh_at.get(code.as_str()).copied().flatten().map(|ext| {
            *rule_id.entry(ext.clone()).or_insert_with(|| {
                rules.push(SeventhRule {
                    extensions: ext.clone(),
                });
                (rules.len() - 1) as u16
            })
        });
        let mut s = succ.remove(code.as_str()).unwrap_or_default();
        s.sort();
        s.dedup();
        entries.push(CodeEntry {
            code: code.clone(),
            description: desc
                .get(code.as_str())
                .map(|d| d.to_string())
                .unwrap_or_default(),
            billable: b,
            header: std::mem::take(&mut header[i]),
            successors: s,
            seventh,
            terms: terms_at
                .remove(code.as_str())
                .unwrap_or_default()
                .into_iter()
                .filter(|t| Some(t.as_str()) != desc.get(code.as_str()).copied())
                .collect(),
            parents: Vec::new(),
            consider: Vec::new(),
            status: String::new(),
        });
    }
    // Successors must name kept nodes.
    let kept: HashSet<String> = entries.iter().map(|e| e.code.clone()).collect();
    for e in &mut entries {
        e.successors.retain(|s| kept.contains(&s.code));
    }
    progress(format!(
        "index entries: {} ({dropped_nodes} tree nodes with no billable code under them at any date left out); 7th-character rules: {}",
        entries.len(),
        rules.len()
    ));

    let from = entries
        .iter()
        .flat_map(|e| e.billable.iter().map(|p| p.from))
        .min();
    let to = entries
        .iter()
        .flat_map(|e| e.billable.iter().map(|p| p.to))
        .max();
    let latest_start = entries
        .iter()
        .flat_map(|e| e.billable.iter().map(|p| p.from))
        .max();
    let (from, to) = match (from, to) {
        (Some(f), Some(t)) => (f, t),
        _ => (rollcall::Date::from_days(0), rollcall::Date::from_days(0)),
    };
    let release = latest_start
        .map(|d| {
            let (y, m, _) = d.ymd();
            format!("FY{}", if m >= 10 { y + 1 } else { y })
        })
        .unwrap_or_default();
    let shapes: BTreeSet<String> = entries.iter().map(|e| shape_of(&e.code)).collect();
    let (chapters, sections) = inp
        .tabulars
        .last()
        .map(|(_, t)| (t.chapters.clone(), t.sections.clone()))
        .unwrap_or_default();
    let notes = inp
        .tabulars
        .last()
        .map(|(_, t)| notes_of(t, &sections, &kept))
        .unwrap_or_default();
    progress(format!(
        "tabular notes (newest tabular list): {}",
        notes.len()
    ));
    Release {
        meta: Meta {
            vocabulary: inp.vocabulary.id.into(),
            title: inp.vocabulary.title.into(),
            release,
            coverage_from: from,
            coverage_to: to,
            sources: inp.sources,
            dot_after: inp.vocabulary.dot_after,
            dot_rules: inp.vocabulary.dot_rules.to_vec(),
            shapes: shapes.into_iter().collect(),
            notice: String::new(),
        },
        codes: entries,
        chapters,
        sections,
        seventh: rules,
        mappings: inp.mappings,
        hierarchy: Default::default(),
        aliases: Vec::new(),
        notes,
    }
}

/// The notes of one tabular list by owner: chapters, then sections, then
/// the kept codes in code order. A block the section index does not list
/// (`C00-C96` around `C00-C14` ...) hands its notes to each listed section
/// inside its range, since they hold for every code there.
fn notes_of(
    t: &tabular::Tabular,
    sections: &[rollcall::model::Section],
    kept: &HashSet<String>,
) -> Vec<Note> {
    let mut notes: Vec<Note> = t
        .chapter_notes
        .iter()
        .map(|(c, kind, text)| Note {
            owner: NoteOwner::Chapter(*c),
            kind: *kind,
            text: text.clone(),
        })
        .collect();
    for (first, last, kind, text) in &t.section_notes {
        let exact = sections
            .iter()
            .position(|s| &s.first == first && &s.last == last);
        let inside: Vec<usize> = match exact {
            Some(i) => vec![i],
            None => (0..sections.len())
                .filter(|&i| &sections[i].first >= first && &sections[i].last <= last)
                .collect(),
        };
        for i in inside {
            notes.push(Note {
                owner: NoteOwner::Section(i as u16),
                kind: *kind,
                text: text.clone(),
            });
        }
    }
    let mut by_code: Vec<&tabular::Node> =
        t.nodes.iter().filter(|n| kept.contains(&n.code)).collect();
    by_code.sort_by(|a, b| a.code.cmp(&b.code));
    for n in by_code {
        for (kind, text) in &n.notes {
            notes.push(Note {
                owner: NoteOwner::Code(n.code.clone()),
                kind: *kind,
                text: text.clone(),
            });
        }
    }
    notes.sort_by(|a, b| a.owner.cmp(&b.owner));
    notes
}

/// Sorts and joins overlapping or adjacent periods.
pub fn merge(mut spans: Vec<Period>) -> Vec<Period> {
    spans.sort();
    let mut out: Vec<Period> = Vec::with_capacity(spans.len());
    for p in spans {
        match out.last_mut() {
            Some(last) if p.from <= last.to.succ() => last.to = last.to.max(p.to),
            _ => out.push(p),
        }
    }
    out
}

/// The days of `spans` outside every period of `minus`.
pub fn subtract(spans: Vec<Period>, minus: &[Period]) -> Vec<Period> {
    let mut cur = spans;
    for m in minus {
        let mut next = Vec::new();
        for p in cur {
            match p.intersect(m) {
                None => next.push(p),
                Some(_) => {
                    if p.from < m.from {
                        next.push(Period::new(p.from, m.from.pred()));
                    }
                    if p.to > m.to {
                        next.push(Period::new(m.to.succ(), p.to));
                    }
                }
            }
        }
        cur = next;
    }
    cur
}

#[cfg(test)]
mod tests {
    use super::*;
    use rollcall::Date;

    fn p(a: &str, b: &str) -> Period {
        Period::new(Date::parse(a).unwrap(), Date::parse(b).unwrap())
    }

    #[test]
    fn merges_adjacent_and_subtracts() {
        let m = merge(vec![
            p("2016-10-01", "2017-09-30"),
            p("2015-10-01", "2016-09-30"),
        ]);
        assert_eq!(m, vec![p("2015-10-01", "2017-09-30")]);
        let s = subtract(m, &[p("2016-01-01", "2016-01-31")]);
        assert_eq!(
            s,
            vec![p("2015-10-01", "2015-12-31"), p("2016-02-01", "2017-09-30")]
        );
    }
}
