//! Fuzz target `check_text`: see `harness::check_text`.
#![no_main]

#[path = "../harness.rs"]
mod harness;

libfuzzer_sys::fuzz_target!(|data: &[u8]| harness::check_text(data));
