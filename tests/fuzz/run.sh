#!/usr/bin/env bash
# Longer fuzzing of the input parsers: runs each proptest target of tests/fuzz_parsers.rs with many cases
# (PROPTEST_CASES, default 20000) for a bounded time (FUZZ_SECONDS in all, default 120, shared by the targets).
# A target that reaches its time share without a failure counts as passed. A failure prints proptest's minimal
# input: add it to `regressions()` in tests/fuzz_parsers.rs, fix the parser, and rerun.
#
#   tests/fuzz/run.sh                         # 20000 cases per target, at most ~120 s
#   PROPTEST_CASES=100000 FUZZ_SECONDS=600 tests/fuzz/run.sh
set -uo pipefail
cd "$(dirname "$0")/../.."
export PROPTEST_CASES="${PROPTEST_CASES:-20000}"
seconds="${FUZZ_SECONDS:-120}"
bin=$(cargo test --release --test fuzz_parsers --no-run --message-format=json 2>/dev/null \
  | grep -o '"executable":"[^"]*fuzz_parsers[^"]*"' | tail -1 | cut -d'"' -f4)
if [ -z "$bin" ] || [ ! -x "$bin" ]; then
  echo "could not build tests/fuzz_parsers.rs" >&2
  exit 1
fi
targets=$("$bin" --list 2>/dev/null | sed -n 's/: test$//p' | grep -v '^regressions$')
n=$(echo "$targets" | wc -l)
share=$(( seconds / n )); [ "$share" -lt 1 ] && share=1
passed=0; failed=0; timed=0
start=$(date +%s)
for t in $targets; do
  t0=$(date +%s)
  timeout "${share}s" "$bin" --exact "$t" --test-threads 1 > "${TMPDIR:-/tmp}/fuzz-$t.log" 2>&1
  rc=$?
  dt=$(( $(date +%s) - t0 ))
  if [ $rc -eq 0 ]; then
    echo "ok      $t: $PROPTEST_CASES cases in ${dt}s"; passed=$((passed + 1))
  elif [ $rc -eq 124 ]; then
    echo "ok      $t: time share of ${share}s reached before $PROPTEST_CASES cases, no failure"; timed=$((timed + 1))
  else
    echo "FAILED  $t (log: ${TMPDIR:-/tmp}/fuzz-$t.log)"; grep -E "minimal failing input|Test failed" -A6 "${TMPDIR:-/tmp}/fuzz-$t.log" | head -20
    failed=$((failed + 1))
  fi
done
echo "fuzz: $((passed + timed)) passed, $failed failed ($timed stopped at their time share) in $(( $(date +%s) - start ))s"
[ $failed -eq 0 ]
