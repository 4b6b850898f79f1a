#!/usr/bin/env bash
# The whole test suite: Rust unit, property and integration tests, then the checks against
# outside references (rfc8785, jsonschema, sympy), whose Python packages it installs itself into
# a virtual environment (target/py-venv), so it works where the system refuses outside installs.
set -euo pipefail
cd "$(dirname "$0")/.."
# The trusted base may not grow unnoticed: raising this ceiling is a reviewed decision
# (DEVELOPERS.md, "The trusted base").
bash scripts/trusted_lines.sh --max 2560 | tail -1
venv=target/py-venv
[ -x "$venv/bin/python" ] || python3 -m venv "$venv"
"$venv/bin/python" -m pip install --quiet --disable-pip-version-check -r tests/outside/requirements.txt
cargo build --release --workspace
cargo test --release --workspace
"$venv/bin/python" tests/outside/check_outside.py . target/release/tubecert --cases 60 --extra tests/fixtures
# Mutation soundness at a small budget (the README gives the full campaign's command).
target/release/mutation-campaign --per-certificate 300 certificates
