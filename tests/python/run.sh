#!/usr/bin/env bash
# CI for the Python package (python/): a virtual environment with the pinned tools from PyPI, the extension
# built with maturin into it (release, reusing the root's target folder so the dropcut crate compiled by
# `cargo test --release` is not compiled again), pytest on python/tests/ (compares with the binary's files), and
# the example script headless. Prints the time it took.
#
#   bash tests/python/run.sh            # from anywhere in the repository
#
# Environment: CARGO_TARGET_DIR (default: <repo>/target), DROPCUT_PY_VENV (default: $CARGO_TARGET_DIR/python-venv),
# PYTHON (default: python3, 3.9 or newer).
set -euo pipefail
cd "$(dirname "$0")/../.."
ROOT="$PWD"
started=$(date +%s)
export CARGO_TARGET_DIR="${CARGO_TARGET_DIR:-$ROOT/target}"
VENV="${DROPCUT_PY_VENV:-$CARGO_TARGET_DIR/python-venv}"
PYTHON="${PYTHON:-python3}"

if [ ! -x "$VENV/bin/python" ]; then
    "$PYTHON" -m venv "$VENV"
fi
"$VENV/bin/python" -m pip install --quiet --disable-pip-version-check -r tests/python/requirements.txt
echo "python-ci: environment ready after $(( $(date +%s) - started )) s"

# the binary the tests compare with (already built by `cargo test --release`; a no-op then)
cargo build --release --quiet --bin dropcut
export DROPCUT_BIN="$CARGO_TARGET_DIR/release/dropcut"

# build and install the extension into the virtual environment
(cd python && VIRTUAL_ENV="$VENV" PATH="$VENV/bin:$PATH" "$VENV/bin/maturin" develop --release --quiet)
echo "python-ci: module built after $(( $(date +%s) - started )) s"

# tests: run from outside python/ so `import dropcut` finds the installed package, not the source folder
(cd python/tests && "$VENV/bin/python" -m pytest -q -p no:cacheprovider .)

# the example, headless
out="$(mktemp -d)"
trap 'rm -rf "$out"' EXIT
MPLBACKEND=Agg "$VENV/bin/python" examples/python/compare_fuels.py "$out" > "$out/log.txt"
cat "$out/log.txt"
for f in d2.png residue_dcn.png residue_dcn.csv; do
    if [ ! -s "$out/$f" ]; then
        echo "python-ci: the example did not write $f" >&2
        exit 1
    fi
done
echo "python-ci: done in $(( $(date +%s) - started )) s"
