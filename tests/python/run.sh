#!/usr/bin/env bash
# CI for the Python package (python/): a virtual environment with the pinned tools of requirements.txt from PyPI,
# the extension built with maturin into it (release), pytest on python/tests/ (which compares with the binary's
# files), and the example script headless. Prints the time each part took.
#
#   bash tests/python/run.sh            # from anywhere in the repository
#
# Kept quick for CI:
# - the virtual environment lives in the user's cache folder, keyed by the pinned requirements and the Python
#   version, and is reused by later runs on the same machine (DROPCUT_PY_VENV chooses another folder);
# - the extension builds in the root's target folder (CARGO_TARGET_DIR), so the dependencies compiled by
#   `cargo test --release` are reused, and the test binary it made is the one the tests compare with;
# - the dropcut crate itself is compiled at opt-level 1 for this build only (DROPCUT_PY_OPT_LEVEL, default 1;
#   3 is the release default): Rust keeps IEEE float semantics at every level, and the tests require every
#   number to equal the fully optimised binary's, so this only trades run speed of the tests for compile time.
#   `maturin develop --release` outside this script builds the usual optimised module.
set -euo pipefail
cd "$(dirname "$0")/../.."
ROOT="$PWD"
started=$(date +%s)
export CARGO_TARGET_DIR="${CARGO_TARGET_DIR:-$ROOT/target}"
PYTHON="${PYTHON:-python3}"
REQ=tests/python/requirements.txt
key="$( (cat "$REQ"; "$PYTHON" -c 'import sys; print(sys.version)') | sha256sum | cut -c1-16)"
VENV="${DROPCUT_PY_VENV:-${XDG_CACHE_HOME:-${HOME:-/tmp}/.cache}/dropcut/python-venv-$key}"

if [ ! -f "$VENV/.dropcut-ready" ]; then
    rm -rf "$VENV"
    mkdir -p "$(dirname "$VENV")"
    "$PYTHON" -m venv "$VENV"
    "$VENV/bin/python" -m pip install --quiet --disable-pip-version-check -r "$REQ"
    touch "$VENV/.dropcut-ready"
fi
echo "python-ci: environment $VENV ready after $(( $(date +%s) - started )) s"

# The binary the tests compare with: the one `cargo test --release` just built; built here only when it is
# missing or older than the sources (a local run after editing).
BIN="$CARGO_TARGET_DIR/release/dropcut"
if [ ! -x "$BIN" ] || [ -n "$(find src mixtures build.rs Cargo.toml Cargo.lock -newer "$BIN" -print -quit)" ]; then
    cargo build --release --quiet --bin dropcut
fi
export DROPCUT_BIN="$BIN"

# build the extension and install it into the virtual environment
export CARGO_PROFILE_RELEASE_PACKAGE_DROPCUT_OPT_LEVEL="${DROPCUT_PY_OPT_LEVEL:-1}"
(cd python && VIRTUAL_ENV="$VENV" PATH="$VENV/bin:$PATH" "$VENV/bin/maturin" develop --release --quiet)
echo "python-ci: module built after $(( $(date +%s) - started )) s"

# tests: run from python/tests so `import dropcut` finds the installed package
(cd python/tests && "$VENV/bin/python" -m pytest -q -p no:cacheprovider .)

# the example, headless
out="$(mktemp -d)"
trap 'rm -rf "$out"' EXIT
MPLBACKEND=Agg "$VENV/bin/python" examples/python/compare_fuels.py "$out" | tee "$out/log.txt"
for f in d2.png residue_dcn.png residue_dcn.csv; do
    if [ ! -s "$out/$f" ]; then
        echo "python-ci: the example did not write $f" >&2
        exit 1
    fi
done
echo "python-ci: done in $(( $(date +%s) - started )) s"
