//! How well labels lead back to the intended code, on the bundled index.
//!
//! Takes 1,000 codes billable on the last day of the index's coverage,
//! sampled with a fixed seed; changes one character of each code (giving
//! another code or no code) and checks the line with a label beside it:
//! first the official description, then a reworded one (word order changed,
//! a word dropped, or an abbreviation used, in turn). Prints how often the
//! intended code is the first suggestion, or among the first three, and the
//! time per word search. Run: `cargo run --release --example label_eval`.

use rollcall::search::{self, SearchOptions};
use rollcall::{check, CheckOptions, Index, Kind};
use std::time::Instant;

struct Rng(u64);

impl Rng {
    fn next(&mut self) -> u64 {
        // xorshift64 (Marsaglia 2003).
        self.0 ^= self.0 << 13;
        self.0 ^= self.0 >> 7;
        self.0 ^= self.0 << 17;
        self.0
    }
    fn below(&mut self, n: usize) -> usize {
        (self.next() % n as u64) as usize
    }
}

const ABBREVIATE: &[(&str, &str)] = &[
    ("diabetes mellitus", "DM"),
    ("hypertension", "HTN"),
    ("chronic kidney disease", "CKD"),
    ("without", "w/o"),
    ("with", "w/"),
];

fn reword(desc: &str, kind: usize, rng: &mut Rng) -> (String, &'static str) {
    let words: Vec<&str> = desc.split(' ').collect();
    if kind == 2 {
        let lower = desc.to_lowercase();
        for (long, short) in ABBREVIATE {
            if let Some(i) = lower.find(&format!("{long} ")) {
                let mut s = desc.to_string();
                s.replace_range(i..i + long.len(), short);
                return (s, "abbreviation");
            }
        }
    }
    if kind == 1 && words.len() >= 3 {
        let mut w = words.clone();
        w.remove(1 + rng.below(w.len() - 1));
        return (w.join(" "), "word dropped");
    }
    // Word order: the part after the first comma first, else the first word last.
    if let Some((a, b)) = desc.split_once(", ") {
        return (format!("{b} {a}"), "word order");
    }
    let mut w = words.clone();
    if w.len() >= 2 {
        let first = w.remove(0);
        w.push(first);
    }
    (w.join(" "), "word order")
}

fn corrupt(code: &str, rng: &mut Rng) -> String {
    let mut b: Vec<u8> = code.as_bytes().to_vec();
    let at = rng.below(b.len().max(1));
    let old = b[at];
    loop {
        let c = if old.is_ascii_digit() {
            b'0' + rng.below(10) as u8
        } else {
            b'A' + rng.below(26) as u8
        };
        if c != old {
            b[at] = c;
            break;
        }
    }
    String::from_utf8(b).unwrap_or_default()
}

/// Rank of the intended code among the suggestions of the line's finding.
fn rank(index: &Index<Vec<u8>>, line: &str, want: &str, opts: &CheckOptions) -> Option<usize> {
    let r = check(index, line, opts);
    let e = r.entries.first()?;
    let f = e.findings.iter().find(|f| {
        matches!(
            f.kind,
            Kind::LabelMismatch | Kind::Unknown | Kind::Malformed
        )
    })?;
    f.suggestions.iter().position(|s| s.code == want)
}

#[allow(dead_code)]
fn gzip9(b: &[u8]) -> usize {
    use std::io::Write;
    let mut e = flate2::write::GzEncoder::new(Vec::new(), flate2::Compression::best());
    e.write_all(b).expect("in memory");
    e.finish().expect("in memory").len()
}

/// Sizes of the word map (`WFST`, `POST`, `WLEN`) and of the rest of the
/// index, read from the section directory (see src/index/write.rs).
#[allow(dead_code)]
fn sizes(b: &[u8]) {
    let u32_at = |i: usize| u32::from_le_bytes([b[i], b[i + 1], b[i + 2], b[i + 3]]) as usize;
    let count = u32_at(12);
    let (mut words, mut rest) = (Vec::new(), b[..56 + count * 12].to_vec());
    for k in 0..count {
        let at = 56 + k * 12;
        let (off, len) = (u32_at(at + 4), u32_at(at + 8));
        let tag = &b[at..at + 4];
        let part = &b[off..off + len];
        if [&b"WFST"[..], b"POST", b"WLEN"].contains(&tag) {
            println!("  section {}: {len} bytes", String::from_utf8_lossy(tag));
            words.extend_from_slice(part);
        } else {
            rest.extend_from_slice(part);
        }
    }
    println!(
        "word map: {} bytes raw, {} gzip -9; the rest of the index: {} raw, {} gzip -9; whole file: {} raw, {} gzip -9",
        words.len(),
        gzip9(&words),
        rest.len(),
        gzip9(&rest),
        b.len(),
        gzip9(b)
    );
}

/// One sampled code: the line with a mistyped code and its official
/// description, and the same with a reworded label.
pub struct Sample {
    /// The intended code's ordinal.
    pub ord: u32,
    /// The intended code as printed.
    pub want: String,
    /// Whether the mistyped code is another real code.
    pub became_code: bool,
    /// The mistyped code and the official description.
    pub official: String,
    /// The mistyped code and the reworded label.
    pub reworded: String,
    /// The reworded label alone.
    pub label: String,
    /// How it was reworded.
    pub kind: &'static str,
}

/// The 1,000 samples, from a fixed seed, on the index's last covered day.
pub fn samples(index: &Index<Vec<u8>>) -> (CheckOptions, Vec<Sample>) {
    let v = index.view();
    let day = v.meta().coverage_to;
    let opts = CheckOptions::on(day, false);
    let period = opts.period();
    let billable: Vec<u32> = (0..v.len() as u32)
        .filter(|&o| v.billable_in(o, &period))
        .collect();
    let mut rng = Rng(0x5eed_1234_abcd_0001);
    let mut picked = Vec::new();
    while picked.len() < 1000 {
        let o = billable[rng.below(billable.len())];
        if !picked.contains(&o) {
            picked.push(o);
        }
    }
    let mut out = Vec::new();
    for (i, &o) in picked.iter().enumerate() {
        let code = v.code(o);
        let want = v.display(&code);
        let desc = v.description(o);
        let bad = corrupt(&code, &mut rng);
        let became_code = v.ordinal(&bad).is_some();
        let shown = v.display(&bad);
        let (label, kind) = reword(&desc, i % 3, &mut rng);
        out.push(Sample {
            ord: o,
            official: format!("{shown}\t{desc}\n"),
            reworded: format!("{shown}\t{label}\n"),
            want,
            became_code,
            label,
            kind,
        });
    }
    (opts, out)
}

/// How often the intended code is the first suggestion, or among the first
/// three, with official and with reworded labels; per rewording, the top-3
/// hits of all; and up to eight misses of the official labels.
#[derive(Default)]
pub struct Recall {
    pub top1: usize,
    pub top3: usize,
    pub rtop1: usize,
    pub rtop3: usize,
    pub by_kind: std::collections::BTreeMap<&'static str, (u32, u32)>,
    pub misses: Vec<String>,
}

/// Checks every sample's two lines.
pub fn recall(index: &Index<Vec<u8>>, opts: &CheckOptions, samples: &[Sample]) -> Recall {
    let mut f = Recall::default();
    for s in samples {
        let r = rank(index, &s.official, &s.want, opts);
        f.top1 += usize::from(r == Some(0));
        f.top3 += usize::from(r.is_some_and(|r| r < 3));
        if r.is_none_or(|r| r >= 3) && f.misses.len() < 8 {
            f.misses.push(format!(
                "{}  (want {}, got rank {r:?})",
                s.official.trim_end(),
                s.want
            ));
        }
        let r = rank(index, &s.reworded, &s.want, opts);
        f.rtop1 += usize::from(r == Some(0));
        f.rtop3 += usize::from(r.is_some_and(|r| r < 3));
        let k = f.by_kind.entry(s.kind).or_default();
        k.0 += 1;
        k.1 += u32::from(r.is_some_and(|r| r < 3));
    }
    f
}

#[allow(dead_code)]
fn main() {
    let bytes = std::fs::read("vocab/icd10cm.rcx").expect("run from the repository root");
    let index = Index::open(bytes).expect("the bundled index opens");
    let v = index.view();
    let day = v.meta().coverage_to;
    let (opts, sample) = samples(&index);
    let period = opts.period();
    let f = recall(&index, &opts, &sample);
    let became_code = sample.iter().filter(|s| s.became_code).count();
    let (top1, top3, rtop1, rtop3) = (f.top1, f.top3, f.rtop1, f.rtop3);
    let mut times = Vec::new();
    let mut slow: Vec<(f64, String)> = Vec::new();
    let (mut s1, mut s3) = (0, 0);
    for s in &sample {
        let (o, label) = (s.ord, &s.label);
        // Word search alone, timed.
        let so = SearchOptions {
            limit: 10,
            prefix_last: false,
            period: Some(period),
            near: None,
        };
        // The fastest of three runs: the machine is shared, and a stray
        // pause of another process is not the search's time.
        let mut ms = f64::MAX;
        let mut hits = Vec::new();
        for _ in 0..3 {
            let t = Instant::now();
            hits = search::search(&v, label, &so);
            ms = ms.min(t.elapsed().as_secs_f64() * 1000.0);
        }
        times.push(ms);
        slow.push((ms, label.clone()));
        let pos = hits.iter().position(|h| h.ord == o);
        s1 += usize::from(pos == Some(0));
        s3 += usize::from(pos.is_some_and(|p| p < 3));
    }
    times.sort_by(f64::total_cmp);
    slow.sort_by(|a, b| b.0.total_cmp(&a.0));
    let n = sample.len() as f64;
    let pct = |x: usize| 100.0 * x as f64 / n;
    println!(
        "label evaluation on {} (release {}), {} codes billable on {day}, seed fixed",
        v.meta().title,
        v.meta().release,
        sample.len()
    );
    println!("corrupted codes that are another real code: {became_code}");
    println!(
        "official labels: top-1 {:.1}%, top-3 {:.1}% (target top-3 >= 90%)",
        pct(top1),
        pct(top3)
    );
    println!(
        "reworded labels: top-1 {:.1}%, top-3 {:.1}% (target top-3 >= 75%)",
        pct(rtop1),
        pct(rtop3)
    );
    for (k, (all, hit)) in &f.by_kind {
        println!("  {k}: top-3 {hit} of {all}");
    }
    println!(
        "word search alone (reworded label, no code): top-1 {:.1}%, top-3 {:.1}%",
        pct(s1),
        pct(s3)
    );
    println!(
        "search time per query (fastest of 3 runs): median {:.2} ms, 95th percentile {:.2} ms, max {:.2} ms (target <= 5 ms)",
        times[times.len() / 2],
        times[times.len() * 95 / 100],
        times[times.len() - 1]
    );
    sizes(index.bytes());
    for (ms, q) in slow.iter().take(3) {
        println!("  slowest: {ms:.2} ms for \"{q}\"");
    }
    for m in f.misses {
        println!("  miss: {m}");
    }
}
