//! The bodies of the fuzz targets, shared with `tests/fuzz_regressions.rs`
//! so that every input the fuzzers kept is replayed by a plain `cargo test`.
//! Each body takes the raw fuzz input, runs it through the library as the
//! CLI would, renders every output (text, CSV, JSON) and checks that no
//! input line is lost from the report. A panic is the failure.

#![allow(dead_code)]

use rollcall::mixed::{check_list, systems_named, Primary};
use rollcall::systems::System;
use rollcall::{render, CheckOptions, Date, Index, Report};

/// The bundled indexes, as the CLI embeds them.
pub const ICD10CM: &[u8] = include_bytes!("../vocab/icd10cm.rcx");
pub const ICD10PCS: &[u8] = include_bytes!("../vocab/icd10pcs.rcx");
pub const ICD9CM: &[u8] = include_bytes!("../vocab/icd9cm.rcx");
pub const HPO: &[u8] = include_bytes!("../vocab/hpo.rcx");

/// Every bundled index with its system, in the CLI's order.
pub const BUNDLED: [(System, &[u8]); 4] = [
    (System::Icd10cm, ICD10CM),
    (System::Icd10pcs, ICD10PCS),
    (System::Icd9cm, ICD9CM),
    (System::Hpo, HPO),
];

/// The bundled index of `system`, opened once for the whole run (opening
/// checks every fst's CRC: not the thing under test in the list targets).
fn bundled(system: System) -> Option<&'static Index<&'static [u8]>> {
    type Opened = Vec<(System, Index<&'static [u8]>)>;
    static OPENED: std::sync::OnceLock<Opened> = std::sync::OnceLock::new();
    let all = OPENED.get_or_init(|| {
        BUNDLED
            .iter()
            .map(|&(s, b)| (s, Index::open(b).expect("a bundled index opens")))
            .collect()
    });
    all.iter().find(|(s, _)| *s == system).map(|(_, i)| i)
}

fn day(s: &str) -> Date {
    Date::parse(s).expect("a date")
}

/// The options a fuzz input is checked with, picked by `k`: a day inside
/// every ICD-10 index's coverage, a study period across a release change,
/// the same with billable codes required, a day in the ICD-9-CM years, and
/// a period running past the ICD-10-CM coverage.
pub fn options(k: u8) -> CheckOptions {
    match k % 5 {
        0 => CheckOptions::on(day("2024-01-01"), false),
        1 => CheckOptions {
            from: day("2019-06-01"),
            to: day("2021-03-31"),
            billable: false,
        },
        2 => CheckOptions {
            from: day("2016-01-01"),
            to: day("2026-12-31"),
            billable: true,
        },
        3 => CheckOptions::on(day("2012-05-01"), false),
        _ => CheckOptions {
            from: day("2026-10-01"),
            to: day("2028-01-01"),
            billable: false,
        },
    }
}

/// Renders a report every way and checks that every input line is in it.
pub fn render_and_check_lines(report: &Report, text: &str) {
    let _ = render::text(report);
    let _ = render::csv(report);
    serde_json::to_string(report).expect("a report serialises");
    assert_lines_covered(report, text);
}

/// Every line number 1..=n of `text` appears among the entries (a line may
/// hold more than one entry), and no entry names a line past the end. Lines
/// end as the list reader ends them (LF, CRLF or a lone CR).
pub fn assert_lines_covered(report: &Report, text: &str) {
    let n = rollcall::list::lines_of(text).count();
    let mut seen = vec![false; n + 1];
    for e in &report.entries {
        assert!(
            (1..=n).contains(&e.line),
            "entry for line {} of a {n}-line list",
            e.line
        );
        seen[e.line] = true;
    }
    if let Some(missing) = (1..=n).find(|&l| !seen[l]) {
        panic!("line {missing} of {n} is missing from the report");
    }
}

/// The indexes a check of `text` in `own` loads beside it, as the CLI's
/// `at_hand`: those the system column names, and ICD-9-CM beside ICD-10-CM
/// (and the reverse).
fn at_hand(own: Option<System>, text: &str) -> Vec<&'static Index<&'static [u8]>> {
    let mut want = systems_named(text);
    match own {
        Some(System::Icd10cm) => want.push(System::Icd9cm),
        Some(System::Icd9cm) => want.push(System::Icd10cm),
        _ => {}
    }
    want.sort();
    want.dedup();
    want.into_iter()
        .filter(|s| Some(*s) != own)
        .filter_map(bundled)
        .collect()
}

/// Checks `text` as `rollcall check` does, against `primary`.
fn check_as_cli(primary: System, text: &str, opts: &CheckOptions) -> Report {
    let others = at_hand(Some(primary), text);
    let p = match bundled(primary) {
        Some(i) => Primary::Index(i),
        None => Primary::Shapes(primary),
    };
    check_list(p, &others, text, opts)
}

/// Target `check_text`: any bytes as a list (lossily UTF-8, as the CLI
/// reads UTF-8), checked against the bundled ICD-10-CM index with ICD-9-CM
/// at hand; the options follow the input's length.
pub fn check_text(data: &[u8]) {
    let text = String::from_utf8_lossy(data);
    let opts = options((data.len() % 251) as u8);
    let report = check_as_cli(System::Icd10cm, &text, &opts);
    render_and_check_lines(&report, &text);
    // The bytes as the reader takes a file (decoding, a workbook's zip).
    let reading = [
        rollcall::list::Reading::Auto,
        rollcall::list::Reading::Lines,
        rollcall::list::Reading::Table,
        rollcall::list::Reading::Json,
    ][data.len() % 4];
    let _ = rollcall::list::read_bytes(data, reading);
    // The same list through the GEMs, as `rollcall translate` does.
    let (cm, nine) = (bundled(System::Icd10cm), bundled(System::Icd9cm));
    if let (Some(cm), Some(nine)) = (cm, nine) {
        if let Ok(t) = rollcall::translate::translate(nine, cm, &text, &opts) {
            let _ = render::translation_text(&t);
            let _ = render::translation_csv(&t);
            serde_json::to_string(&t).expect("a translation serialises");
        }
    }
}

/// Target `mixed_list`: the first byte picks the system of rows with no
/// system cell (every system, bundled or checked by shape) and the options;
/// the rest is a list, usually with a system column.
pub fn mixed_list(data: &[u8]) {
    let Some((&first, rest)) = data.split_first() else {
        return;
    };
    let systems = rollcall::systems::ALL;
    let primary = systems[first as usize % systems.len()];
    let opts = options(first / systems.len() as u8);
    let text = String::from_utf8_lossy(rest);
    let report = check_as_cli(primary, &text, &opts);
    render_and_check_lines(&report, &text);
}

/// Target `compare_lists`: the first byte picks the bundled index and the
/// options; the rest is two lists split at the first NUL byte (or halfway).
pub fn compare_lists(data: &[u8]) {
    let Some((&first, rest)) = data.split_first() else {
        return;
    };
    let (system, _) = BUNDLED[first as usize % BUNDLED.len()];
    let opts = options(first / BUNDLED.len() as u8);
    let (a, b) = match rest.iter().position(|&b| b == 0) {
        Some(at) => (&rest[..at], &rest[at + 1..]),
        None => rest.split_at(rest.len() / 2),
    };
    let (ta, tb) = (String::from_utf8_lossy(a), String::from_utf8_lossy(b));
    let index = bundled(system).expect("bundled");
    // ICD-9-CM beside ICD-10-CM and the reverse, as the CLI's companions.
    let companion = match system {
        System::Icd10cm => bundled(System::Icd9cm),
        System::Icd9cm => bundled(System::Icd10cm),
        _ => None,
    };
    let views: Vec<_> = companion.iter().map(|i| i.view()).collect();
    let c = rollcall::compare::compare_among(index, &views, ("a", &ta), ("b", &tb), &opts);
    let _ = render::comparison_text(&c);
    let _ = render::comparison_csv(&c);
    serde_json::to_string(&c).expect("a comparison serialises");
    assert_lines_covered(&c.a.report, &ta);
    assert_lines_covered(&c.b.report, &tb);
}

/// Target `search_words`: the first byte picks the bundled index and how
/// to search; the rest is the words, searched as `rollcall find` and the
/// page's search as you type do, then written as a label beside a code
/// (the label check searches too).
pub fn search_words(data: &[u8]) {
    let Some((&first, rest)) = data.split_first() else {
        return;
    };
    let (system, _) = BUNDLED[first as usize % BUNDLED.len()];
    let typing = first & 0x10 != 0;
    let query = String::from_utf8_lossy(rest);
    let index = bundled(system).expect("bundled");
    let view = index.view();
    let found = rollcall::search::find(&view, &query, day("2024-01-01"), 10, typing);
    serde_json::to_string(&found).expect("results serialise");
    // `rollcall find` and the page: a code first, then words under it.
    let finds = rollcall::find::find(&view, &query, day("2024-01-01"), 10, typing);
    serde_json::to_string(&finds).expect("results serialise");
    let _ = rollcall::card::codes_named(&view, &query);
    let opts = rollcall::search::SearchOptions {
        limit: 5,
        prefix_last: typing,
        period: None,
        near: Some(query.chars().take(4).collect()),
    };
    for h in rollcall::search::search(&view, &query, &opts) {
        let _ = view.code(h.ord);
    }
    // The words as the label of a code of that index, on one line.
    let code = match system {
        System::Icd10cm => "E11.9",
        System::Icd10pcs => "0DTJ4ZZ",
        System::Icd9cm => "250.00",
        _ => "HP:0001250",
    };
    let label: String = query
        .chars()
        .filter(|c| !matches!(c, '\n' | '\r'))
        .collect();
    let text = format!("{code}\t{label}\n");
    let report = check_as_cli(system, &text, &options(first >> 5));
    render_and_check_lines(&report, &text);
}

/// One way to damage index bytes, decoded from the fuzz input.
#[derive(Debug, Clone)]
pub enum Op {
    /// Set a byte.
    Set(usize, u8),
    /// Flip bits of a byte.
    Xor(usize, u8),
    /// Write an edge value as a little-endian u16.
    Edge16(usize, u16),
    /// Write an edge value as a little-endian u32.
    Edge32(usize, u32),
    /// Cut the file here.
    Truncate(usize),
    /// Remove bytes.
    Delete(usize, usize),
    /// Insert bytes.
    Insert(usize, Vec<u8>),
    /// Copy a run of the file over another place.
    Splice { from: usize, to: usize, len: usize },
}

/// Reads fuzz bytes in order; past the end, zeros.
struct Bytes<'a>(&'a [u8]);

impl Bytes<'_> {
    fn u8(&mut self) -> u8 {
        match self.0.split_first() {
            Some((&b, rest)) => {
                self.0 = rest;
                b
            }
            None => 0,
        }
    }
    fn u16(&mut self) -> u16 {
        u16::from_le_bytes([self.u8(), self.u8()])
    }
    fn u32(&mut self) -> u32 {
        u32::from_le_bytes([self.u8(), self.u8(), self.u8(), self.u8()])
    }
}

/// The regions of an index file mutations aim at: the 56-byte header, the
/// section directory, and each section the directory names.
fn regions(file: &[u8]) -> Vec<(usize, usize)> {
    let mut out = vec![(0, 56.min(file.len()))];
    let count = file
        .get(12..16)
        .map_or(0, |b| u32::from_le_bytes([b[0], b[1], b[2], b[3]]) as usize)
        .min(64);
    out.push((56, count * 12));
    for k in 0..count {
        let at = 56 + k * 12;
        if let Some(e) = file.get(at..at + 12) {
            let off = u32::from_le_bytes([e[4], e[5], e[6], e[7]]) as usize;
            let len = u32::from_le_bytes([e[8], e[9], e[10], e[11]]) as usize;
            out.push((off, len));
        }
    }
    out
}

/// Where the section `tag` lies in an index file, from its directory.
pub fn section(file: &[u8], tag: &[u8; 4]) -> Option<(usize, usize)> {
    let count = u32::from_le_bytes(file.get(12..16)?.try_into().ok()?) as usize;
    (0..count.min(64)).find_map(|k| {
        let e = file.get(56 + k * 12..56 + k * 12 + 12)?;
        let off = u32::from_le_bytes(e[4..8].try_into().ok()?) as usize;
        let len = u32::from_le_bytes(e[8..12].try_into().ok()?) as usize;
        (&e[..4] == tag).then_some((off, len))
    })
}

/// A place in the file: a region and an offset inside it, or anywhere.
fn place(r: &mut Bytes<'_>, regions: &[(usize, usize)], len: usize) -> usize {
    let which = r.u8() as usize;
    let off = r.u32() as usize;
    if which < 0xF0 && !regions.is_empty() {
        let (start, n) = regions[which % regions.len()];
        start.saturating_add(off % n.max(1))
    } else {
        off % len.max(1)
    }
}

const EDGE16: [u16; 6] = [0, 1, 0x7F, 0x7FFF, 0x8000, 0xFFFF];
const EDGE32: [u32; 8] = [
    0,
    1,
    0x7F,
    0x8000,
    0xFFFF,
    0x7FFF_FFFF,
    0x8000_0000,
    0xFFFF_FFFF,
];

/// Decodes the operations (at most 16) that follow the first byte.
pub fn decode_ops(data: &[u8], file: &[u8]) -> Vec<Op> {
    let regions = regions(file);
    let mut r = Bytes(data);
    let mut ops = Vec::new();
    while !r.0.is_empty() && ops.len() < 16 {
        let kind = r.u8();
        let at = place(&mut r, &regions, file.len());
        ops.push(match kind % 8 {
            0 => Op::Set(at, r.u8()),
            1 => Op::Xor(at, r.u8().max(1)),
            2 => Op::Edge16(at, EDGE16[r.u8() as usize % EDGE16.len()]),
            3 => {
                let k = r.u8() as usize;
                // Besides the fixed edges, the file's own length and one past it.
                let v = match k % (EDGE32.len() + 2) {
                    i if i < EDGE32.len() => EDGE32[i],
                    i if i == EDGE32.len() => file.len() as u32,
                    _ => file.len() as u32 + 1,
                };
                Op::Edge32(at, v)
            }
            4 => Op::Truncate(at),
            5 => Op::Delete(at, r.u16() as usize),
            6 => {
                let n = (r.u8() % 16) as usize;
                Op::Insert(at, (0..n).map(|_| r.u8()).collect())
            }
            _ => Op::Splice {
                from: place(&mut r, &regions, file.len()),
                to: at,
                len: r.u16() as usize,
            },
        });
    }
    ops
}

/// Applies the operations to a copy of `file`.
pub fn apply(file: &[u8], ops: &[Op]) -> Vec<u8> {
    let mut b = file.to_vec();
    for op in ops {
        let n = b.len();
        match op {
            Op::Set(at, v) => {
                if let Some(x) = b.get_mut(*at) {
                    *x = *v;
                }
            }
            Op::Xor(at, v) => {
                if let Some(x) = b.get_mut(*at) {
                    *x ^= *v;
                }
            }
            Op::Edge16(at, v) => {
                if let Some(x) = b.get_mut(*at..at.saturating_add(2)) {
                    x.copy_from_slice(&v.to_le_bytes());
                }
            }
            Op::Edge32(at, v) => {
                if let Some(x) = b.get_mut(*at..at.saturating_add(4)) {
                    x.copy_from_slice(&v.to_le_bytes());
                }
            }
            Op::Truncate(at) => b.truncate(*at),
            Op::Delete(at, len) => {
                let at = (*at).min(n);
                b.drain(at..at.saturating_add(*len).min(n));
            }
            Op::Insert(at, bytes) => {
                let at = (*at).min(n);
                b.splice(at..at, bytes.iter().copied());
            }
            Op::Splice { from, to, len } => {
                let from = (*from).min(n);
                let run: Vec<u8> = b[from..from.saturating_add(*len).min(n)].to_vec();
                let to = (*to).min(n);
                let end = to.saturating_add(run.len()).min(n);
                b[to..end].copy_from_slice(&run[..end - to]);
            }
        }
    }
    b
}

/// Writes the SHA-256 of the content into the header, as `vocab-build`
/// does, so that `verify` passes and what follows it is reached.
pub fn reseal(b: &mut [u8]) {
    if b.len() >= 56 {
        let digest = rollcall::sha256::digest(&b[56..]);
        b[24..56].copy_from_slice(&digest);
    }
}

/// A short list for each bundled vocabulary: codes, headers, a retired
/// code, a pattern, a range, a label, a code of another system.
fn list_for(system: &str) -> &'static str {
    match system {
        "icd10pcs" => "0DTJ4ZZ\n02703ZZ appendectomy\n0DT*\n0016070-0016077\nZZZZZZZ\n",
        "icd9cm" => "250.00 diabetes\n250\nV58.67\nE880.0\n401-405\n999.99\nE11.9\n",
        "hpo" => "HP:0001250 seizure\nHP:0001251\nHP:0000005\nHP:00012*\nHP:9999999\n",
        _ => "E11.9 diabetes\nE11\nE11.*\nE08-E13\nI10 hypertension\nA00.0\n250.00\nE11.56\n",
    }
}

/// Target `index_bytes`: the first byte picks a bundled index (low two
/// bits), the period (bits 2-4), whether to compare two lists (0x10), to
/// read every mapping row (0x20), to verify (0x40: the SHA-256 of megabytes
/// is most of a run's time) and to reseal after damage (0x80: what a check
/// after `verify` would see; with 0x40, `verify` must pass); the rest is a
/// list of operations. The
/// damaged bytes are opened; when that succeeds every reader (the view's
/// accessors, a check, a search, a comparison, the mappings) must answer
/// without a panic, whether or not the checksum matches (a view promises
/// no panic on unverified bytes).
pub fn index_bytes(data: &[u8]) {
    let Some((&first, rest)) = data.split_first() else {
        return;
    };
    let (_, file) = BUNDLED[first as usize % BUNDLED.len()];
    let ops = decode_ops(rest, file);
    let mut bytes = apply(file, &ops);
    let resealed = first & 0x80 != 0;
    if resealed {
        reseal(&mut bytes);
    }
    let Ok(index) = Index::open(bytes.as_slice()) else {
        return;
    };
    if first & 0x40 != 0 {
        let verified = index.verify();
        if resealed {
            assert!(verified.is_ok(), "a resealed index verifies: {verified:?}");
        }
    }
    let _ = index.checksum();
    let view = index.view();
    read_everything(&view, first & 0x20 != 0);
    let meta = index.meta().clone();
    let text = list_for(&meta.vocabulary);
    // The period: bits 2-4 of the first byte.
    let opts = options((first >> 2) & 7);
    let report = rollcall::check(&index, text, &opts);
    render_and_check_lines(&report, text);
    let found = rollcall::search::find(
        &view,
        "type 2 diabetes seizure appendix",
        day("2024-01-01"),
        5,
        true,
    );
    serde_json::to_string(&found).expect("results serialise");
    // A comparison when bit 4 of the first byte is set.
    if first & 0x10 != 0 {
        let b = "E11.9\nHP:0001250\n250\n0DTJ4ZZ\n";
        let c = rollcall::compare::compare(&index, ("a", text), ("b", b), &opts);
        let _ = render::comparison_text(&c);
        let _ = render::comparison_csv(&c);
        serde_json::to_string(&c).expect("a comparison serialises");
        assert_lines_covered(&c.a.report, text);
        assert_lines_covered(&c.b.report, b);
    }
}

/// Calls every accessor of the view on a spread of ordinals.
fn read_everything(view: &rollcall::View<'_>, all_rows: bool) {
    let n = view.len() as u32;
    let probes: Vec<u32> = [
        0,
        1,
        2,
        n / 3,
        n / 2,
        n.saturating_sub(2),
        n.saturating_sub(1),
        n,
        n + 1,
        u32::MAX,
    ]
    .into_iter()
    .collect();
    let _ = view.is_empty();
    let _ = view.is_graph();
    let _ = view.mean_word_count();
    for &o in &probes {
        let code = view.code(o);
        let _ = view.ordinal(&code);
        let _ = view.display(&code);
        let _ = view.section_of(&code);
        let _ = view.description(o);
        let _ = view.description_or_note(o);
        let _ = view.billable(o).take(64).count();
        let _ = view.header(o).take(64).count();
        let _ = view.successors(o).take(64).count();
        let _ = view.predecessors(o);
        let _ = view.parent(o);
        let _ = view.parents(o).take(64).count();
        let _ = view.ancestors(o).take(64).count();
        let _ = view.descendants(o).take(64).count();
        let _ = view.children(o).take(64).count();
        let _ = view.subtree_end(o);
        let _ = view.category(o);
        let _ = view.consider(o).take(64).count();
        let _ = view.status(o);
        let _ = view.seventh_rule(o);
        let _ = view.word_count(o);
    }
    for code in [
        "E119",
        "E11",
        "25000",
        "0DTJ4ZZ",
        "HP:0001250",
        "",
        "\u{0}",
        "é",
    ] {
        let _ = view.ordinal(code);
        let _ = view.alias(code);
        let _ = view.word_codes(code);
    }
    let _ = view.aliases().len();
    let _ = view.chapters().len();
    let _ = view.sections().len();
    for m in view.mappings() {
        let _ = m.lookup("25000");
        let _ = m.lookup("E119");
        let _ = m.sources();
        if all_rows {
            let _ = m.rows().len();
        }
    }
    for w in ["diabete", "seizure", "fracture"] {
        if let Some(off) = view.words().get(w) {
            let _ = view.posting(off).take(1000).count();
        }
    }
    let _ = rollcall::search::fit(view, "type 2 diabetes mellitus", n / 2);
    let period = rollcall::Period::new(day("2019-01-01"), day("2024-01-01"));
    for &o in probes.iter().take(7) {
        let card = rollcall::card::card_of(view, &[], o, &period);
        serde_json::to_string(&card).expect("a card serialises");
        let _ = view.notes(o);
    }
    for i in [0, 1, usize::MAX] {
        let _ = view.chapter_notes(i);
        let _ = view.section_notes(i);
    }
}
