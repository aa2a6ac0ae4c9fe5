#!/usr/bin/env bash
# Exactly what CI runs: format, lints, the test suite, and the Python reference checks.
set -euo pipefail
cd "$(dirname "$0")/.."
cargo fmt --all -- --check
cargo clippy --workspace --all-targets -- -D warnings
cargo test --workspace
tests/python/run.sh
