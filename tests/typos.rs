//! Mistyped codes lead back to the code meant. The measure is
//! `examples/typo_eval.rs` (random slips of real codes, with a fixed seed);
//! the floor here is a little below the figure it prints (98.1% of 1,772
//! catchable slips out of 2,000), so a change that loses suggestions fails.

mod common;

#[path = "../examples/typo_eval.rs"]
#[allow(dead_code)]
mod typo_eval;

use common::{index, on};
use rollcall::{check, Status};

fn suggested(text: &str) -> Vec<String> {
    let r = check(&index(), text, &on("2024-01-01"));
    r.entries[0]
        .findings
        .iter()
        .flat_map(|f| f.suggestions.iter().map(|s| s.code.clone()))
        .collect()
}

/// Codes billable in the bundled index (built from the CMS release history),
/// each with one random slip: the code meant is offered for 96% or more.
#[test]
fn random_slips_lead_back_to_the_code_meant() {
    let f = typo_eval::run(&index(), 1200, 0x5eed_2026);
    assert!(f.checked >= 1000, "{} catchable slips", f.checked);
    let share = f.found as f64 / f.checked as f64;
    assert!(share >= 0.96, "{:.1}% of slips led back", 100.0 * share);
}

/// A letter where every code has a digit (`SR2.002B` for S42.002B,
/// "Fracture of unspecified part of left clavicle, initial encounter for
/// open fracture" in the release history), or a digit where a letter must
/// start (`436.810D` for Y36.810D), is malformed, and the codes near it are
/// offered.
#[test]
fn a_code_typed_out_of_shape_gets_near_codes() {
    let r = check(&index(), "SR2.002B\n", &on("2024-01-01"));
    assert_eq!(r.entries[0].status, Status::Malformed);
    assert!(suggested("SR2.002B\n").contains(&"S42.002B".to_string()));
    assert!(suggested("436.810D\n").contains(&"Y36.810D".to_string()));
}

/// A 7th character the node does not allow: every allowed one is offered.
/// Source: the April 2026 tabular XML's 7th character rule at S72 (A to S,
/// 16 characters: A, B, C, D, E, F, G, H, J, K, M, N, P, Q, R, S) and at
/// S06 (A, D, S).
#[test]
fn every_allowed_seventh_character_is_offered() {
    let want: Vec<String> = "ABCDEFGHJKMNPQRS"
        .chars()
        .map(|c| format!("S72.001{c}"))
        .collect();
    assert_eq!(suggested("S72.001Z\n"), want);
    let got = suggested("S06.0X0Z\n");
    assert_eq!(got[..3], ["S06.0X0A", "S06.0X0D", "S06.0X0S"]);
}
