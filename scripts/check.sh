#!/usr/bin/env bash
# Exactly what CI runs: format, lints, documentation, the test suite, the workbench
# kill-and-recover check under Xvfb, the batch sheet in headless Chromium, and the Python
# reference checks.
set -euo pipefail
cd "$(dirname "$0")/.."
cargo fmt --all -- --check
cargo clippy --workspace --all-targets -- -D warnings
# Documentation builds without warnings (broken or private intra-doc links and the like).
RUSTDOCFLAGS="-D warnings" cargo doc --workspace --no-deps
cargo test --workspace
# The real workbench killed with SIGKILL and restarted under Xvfb: its unsaved work is offered back.
if command -v Xvfb >/dev/null 2>&1 && command -v xdotool >/dev/null 2>&1; then
    # `cargo test` has just built target/debug/saltwise; reuse it rather than build again.
    SALTWISE_BIN=target/debug/saltwise crates/app/scripts/kill_and_recover.sh 2
else
    echo "check.sh: kill-and-recover skipped (needs Xvfb and xdotool; CI installs them)" >&2
fi
# The batch sheet printed by headless Chromium: its PDF text shows the numbers the CLI gives.
tests/browser/run.sh
tests/python/run.sh
