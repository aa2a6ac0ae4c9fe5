//! Running the real `saltwise-cli` binary in tests: its output, its JSON, and refusals.
#![allow(
    dead_code,
    reason = "each test file uses a different part of the helpers"
)]

use std::process::{Command, Output};

use serde_json::Value;

/// Runs the binary with `args`.
pub fn run(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_saltwise-cli"))
        .args(args)
        .output()
        .expect("run saltwise-cli")
}

/// Runs a command that must succeed; returns stdout.
pub fn stdout_ok(args: &[&str]) -> String {
    let out = run(args);
    assert!(
        out.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8(out.stdout).expect("UTF-8 on stdout")
}

/// Runs a command that must succeed and print JSON.
pub fn json(args: &[&str]) -> Value {
    serde_json::from_str(&stdout_ok(args)).expect("JSON on stdout")
}

/// Runs a command that must fail with `error: …` and exit code 1 or 2, never a panic; returns
/// stderr.
pub fn fails(args: &[&str]) -> String {
    let out = run(args);
    let err = String::from_utf8_lossy(&out.stderr).into_owned();
    assert!(!out.status.success(), "{args:?} should fail");
    assert!(
        matches!(out.status.code(), Some(1 | 2)),
        "{args:?}: {out:?}"
    );
    assert!(!err.contains("panicked"), "{args:?} panicked: {err}");
    assert!(err.starts_with("error"), "{args:?}: {err}");
    err
}
