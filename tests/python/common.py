"""Helpers for the reference scripts: run saltwise-cli and read its JSON."""
import json
import os
import subprocess
import sys

CLI = os.environ.get("SALTWISE_CLI", "target/debug/saltwise-cli")
failures = []


def cli_json(*args):
    out = subprocess.run([CLI, *args, "--json"], check=True, capture_output=True, text=True)
    return json.loads(out.stdout)


def check(what, got, expected, tol):
    ok = abs(got - expected) <= tol
    print(f"{'ok  ' if ok else 'FAIL'} {what}: saltwise {got:.6f}, reference {expected:.6f}, tolerance {tol}")
    if not ok:
        failures.append(what)


def finish():
    if failures:
        print(f"{len(failures)} check(s) failed", file=sys.stderr)
        sys.exit(1)
