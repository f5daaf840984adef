//! Fuzz target `compare_lists`: see `harness::compare_lists`.
#![no_main]

#[path = "../harness.rs"]
mod harness;

libfuzzer_sys::fuzz_target!(|data: &[u8]| harness::compare_lists(data));
