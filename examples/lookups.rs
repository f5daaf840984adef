//! Lookup throughput of an index: code → ordinal through the fst map, and a
//! full status lookup (ordinal, then the billable spans for a date). Prints
//! lookups per second; used by bench/run.sh.
//!
//! usage: cargo run --release --example lookups [INDEX]
use rollcall::{Date, Index, Period};
use std::hint::black_box;
use std::time::Instant;

fn main() {
    let path = std::env::args()
        .nth(1)
        .unwrap_or_else(|| "vocab/icd10cm.rcx".into());
    let bytes = std::fs::read(&path).expect("index file");
    let t = Instant::now();
    let index = Index::open(&bytes[..]).expect("index opens");
    let open = t.elapsed();
    let t = Instant::now();
    index.verify().expect("checksum");
    let verify = t.elapsed();
    let view = index.view();
    let codes: Vec<String> = (0..view.len() as u32).map(|o| view.code(o)).collect();
    let day = Date::parse("2026-01-01").unwrap();
    let p = Period::new(day, day);
    let rounds = 20;
    let t = Instant::now();
    let mut hits = 0u64;
    for _ in 0..rounds {
        for c in &codes {
            hits += black_box(view.ordinal(black_box(c))).is_some() as u64;
        }
    }
    let map_rate = hits as f64 / t.elapsed().as_secs_f64();
    let t = Instant::now();
    let mut live = 0u64;
    for _ in 0..rounds {
        for c in &codes {
            if let Some(o) = view.ordinal(black_box(c)) {
                live += view.billable_in(o, &p) as u64;
            }
        }
    }
    let status_rate = (rounds * codes.len()) as f64 / t.elapsed().as_secs_f64();
    black_box(live);
    println!(
        "index: {} bytes, {} codes; open {:?}, verify {:?}",
        bytes.len(),
        codes.len(),
        open,
        verify
    );
    println!(
        "code -> ordinal lookups per second: {:.2} M",
        map_rate / 1e6
    );
    println!(
        "code -> billable-on-a-date lookups per second: {:.2} M",
        status_rate / 1e6
    );
}
