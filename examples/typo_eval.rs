//! How often a mistyped code leads back to the code meant, on the bundled
//! ICD-10-CM index.
//!
//! Takes codes billable on the last day of the index's coverage, sampled
//! with a fixed seed, and makes one random typing slip in each as written
//! with its dot: a character changed, dropped, added, or two neighbours
//! swapped. Each slip is checked as a line with no label; a slip that gives
//! another real code cannot be caught without a label and is counted apart.
//! Prints how often the code meant is read back (a `normalized` reading) or
//! offered among the suggestions. Run:
//! `cargo run --profile fast --example typo_eval [N]`.

use rollcall::{check, CheckOptions, Index, Status};

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

const KEYS: &[u8] = b"ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789";

/// One slip in `s`, and its name.
fn slip(s: &str, rng: &mut Rng) -> (String, &'static str) {
    let mut b = s.as_bytes().to_vec();
    loop {
        let i = rng.below(b.len());
        match rng.below(4) {
            0 => {
                let c = KEYS[rng.below(KEYS.len())];
                if c == b[i] || b[i] == b'.' {
                    continue;
                }
                b[i] = c;
                return (String::from_utf8(b).unwrap(), "changed");
            }
            1 => {
                if b[i] == b'.' {
                    continue;
                }
                b.remove(i);
                return (String::from_utf8(b).unwrap(), "dropped");
            }
            2 => {
                b.insert(i, KEYS[rng.below(KEYS.len())]);
                return (String::from_utf8(b).unwrap(), "added");
            }
            _ => {
                if i + 1 >= b.len() || b[i] == b[i + 1] || b[i] == b'.' || b[i + 1] == b'.' {
                    continue;
                }
                b.swap(i, i + 1);
                return (String::from_utf8(b).unwrap(), "swapped");
            }
        }
    }
}

/// The figures of one run: slips checked, slips that gave another real
/// code, and slips whose code meant was read back or offered.
pub struct Figures {
    pub checked: usize,
    pub other_code: usize,
    pub found: usize,
    pub by_kind: Vec<(&'static str, usize, usize)>,
}

pub fn run(index: &Index<Vec<u8>>, n: usize, seed: u64) -> Figures {
    let view = index.view();
    let day = index.meta().coverage_to;
    let opts = CheckOptions::on(day, false);
    let period = rollcall::Period::new(day, day);
    let billable: Vec<u32> = (0..view.len() as u32)
        .filter(|&o| view.billable_in(o, &period))
        .collect();
    let mut rng = Rng(seed);
    let mut f = Figures {
        checked: 0,
        other_code: 0,
        found: 0,
        by_kind: vec![
            ("changed", 0, 0),
            ("dropped", 0, 0),
            ("added", 0, 0),
            ("swapped", 0, 0),
        ],
    };
    // Slips are checked in lists of 200 lines, as a user would paste them.
    let mut batch: Vec<(String, String, &'static str)> = Vec::new();
    let flush = |batch: &mut Vec<(String, String, &'static str)>, f: &mut Figures| {
        let text: String = batch.iter().map(|(w, _, _)| format!("{w}\n")).collect();
        let r = check(index, &text, &opts);
        for (e, (_, meant, kind)) in r.entries.iter().zip(batch.iter()) {
            let k = f.by_kind.iter_mut().find(|k| k.0 == *kind).unwrap();
            let read_back = e.code.as_deref() == Some(meant.as_str());
            if matches!(e.status, Status::Valid | Status::Header | Status::Partial) && !read_back {
                f.other_code += 1;
                continue;
            }
            f.checked += 1;
            k.1 += 1;
            let offered = e
                .findings
                .iter()
                .any(|x| x.suggestions.iter().any(|s| &s.code == meant));
            if read_back || offered {
                f.found += 1;
                k.2 += 1;
            } else if std::env::var_os("TYPO_MISSES").is_some() {
                let got: Vec<&str> = e
                    .findings
                    .iter()
                    .flat_map(|x| x.suggestions.iter().map(|s| s.code.as_str()))
                    .collect();
                eprintln!(
                    "{kind:<8} {meant:<9} written {:<10} {:?} {:?}",
                    e.input, e.status, got
                );
            }
        }
        batch.clear();
    };
    while f.checked + f.other_code + batch.len() < n {
        let o = billable[rng.below(billable.len())];
        let meant = view.display(&view.code(o));
        let (written, kind) = slip(&meant, &mut rng);
        batch.push((written, meant, kind));
        if batch.len() == 200 {
            flush(&mut batch, &mut f);
        }
    }
    flush(&mut batch, &mut f);
    f
}

fn main() {
    let n: usize = std::env::args()
        .nth(1)
        .and_then(|a| a.parse().ok())
        .unwrap_or(2000);
    let bytes = std::fs::read("vocab/icd10cm.rcx").expect("run from the repository root");
    let index = Index::open(bytes).unwrap();
    let f = run(&index, n, 0x5eed_2026);
    println!(
        "typos: {} slips; {} gave another real code (not catchable without a label); of the other {}, the code meant was read back or offered for {} ({:.1}%)",
        f.checked + f.other_code,
        f.other_code,
        f.checked,
        f.found,
        100.0 * f.found as f64 / f.checked.max(1) as f64
    );
    for (k, n, hit) in &f.by_kind {
        println!(
            "  {k:<8} {hit:>5} of {n:>5} ({:.1}%)",
            100.0 * *hit as f64 / (*n).max(1) as f64
        );
    }
}
