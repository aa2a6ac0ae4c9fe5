#!/usr/bin/env bash
# Runs the reference checks that use general-purpose Python libraries from PyPI against the
# real saltwise-cli binary. Creates its own virtual environment (target/py-venv).
set -euo pipefail
cd "$(dirname "$0")/../.."
venv=target/py-venv
if [ ! -x "$venv/bin/python" ]; then
    python3 -m venv "$venv"
fi
"$venv/bin/pip" install --quiet --disable-pip-version-check -r tests/python/requirements.txt
cargo build --quiet -p saltwise-cli
export SALTWISE_CLI="$PWD/target/debug/saltwise-cli"
for script in tests/python/check_*.py; do
    echo "== $script"
    "$venv/bin/python" "$script"
done
