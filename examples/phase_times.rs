//! Prints how long each phase of a check takes on a list (for profiling).
use std::time::Instant;
fn main() {
    let args: Vec<String> = std::env::args().collect();
    let bytes = std::fs::read(&args[1]).unwrap();
    let text = std::fs::read_to_string(&args[2]).unwrap();
    let t = Instant::now();
    let index = rollcall::Index::open(&bytes[..]).unwrap();
    println!("open {:?}", t.elapsed());
    let t = Instant::now();
    index.verify().unwrap();
    println!("verify {:?}", t.elapsed());
    let opts = rollcall::CheckOptions::on(rollcall::Date::parse("2026-01-01").unwrap(), false);
    let t = Instant::now();
    let (_, lines) = rollcall::parse_list(&text);
    println!("parse {:?} ({} lines)", t.elapsed(), lines.len());
    for _ in 0..3 {
        let t = Instant::now();
        let r = rollcall::check(&index, &text, &opts);
        println!("check {:?}", t.elapsed());
        let t = Instant::now();
        let s = rollcall::render::text(&r);
        println!("text {:?} {}", t.elapsed(), s.len());
    }
}
