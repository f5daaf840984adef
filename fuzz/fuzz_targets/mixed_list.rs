//! Fuzz target `mixed_list`: see `harness::mixed_list`.
#![no_main]

#[path = "../harness.rs"]
mod harness;

libfuzzer_sys::fuzz_target!(|data: &[u8]| harness::mixed_list(data));
