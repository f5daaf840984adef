//! Fuzz target `index_bytes`: see `harness::index_bytes`.
#![no_main]

#[path = "../harness.rs"]
mod harness;

libfuzzer_sys::fuzz_target!(|data: &[u8]| harness::index_bytes(data));
