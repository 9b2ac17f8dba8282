#![no_main]
//! See `fuzz/harness.rs` for what this target feeds the engine.

#[path = "../harness.rs"]
#[allow(dead_code)]
mod harness;

libfuzzer_sys::fuzz_target!(|data: &[u8]| harness::session_lines(data));
