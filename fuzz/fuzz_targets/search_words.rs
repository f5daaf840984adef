//! Fuzz target `search_words`: see `harness::search_words`.
#![no_main]

#[path = "../harness.rs"]
mod harness;

libfuzzer_sys::fuzz_target!(|data: &[u8]| harness::search_words(data));
