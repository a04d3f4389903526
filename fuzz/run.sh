#!/usr/bin/env bash
# Build the libFuzzer targets with clang and run each for a bounded time, one after another.
#
#   fuzz/run.sh [SECONDS-PER-TARGET] [TARGET...]     (default 60 s; all targets)
#
# Targets: cell pack drive airframe profile load_csv cell_log bench_csv fit_cell cli_options
# (fuzz/targets.hpp).
# Seeds: the bundled models/** and profiles/** that a target reads, fuzz/corpus/<target>/ and
# fuzz/regressions/<target>/. Inputs the fuzzer finds interesting go to OUT/corpus/<target>/,
# crashes, timeouts and out-of-memory inputs to OUT/crashes/<target>/, logs to OUT/logs/.
# Before fuzzing, every boundary-value variant of the seeds (fuzz/sweep_seeds.cpp: each number set
# to 0, ±1e300, 1e-300, the largest double, 1e±9 in turn) runs once; a variant that fails is kept
# with the crashes (named sweep-*) and the pass goes on without it. Then the fuzzer runs for
# SECONDS and keeps going after a crash (-fork=1 -ignore_crashes=1) until its time is up.
# Exit status: 0 when no target left a crash file, 1 otherwise.
#
# Environment: SORTIE_FUZZ_BUILD (default build-fuzz), SORTIE_FUZZ_OUT (default
# <build>/fuzz-out), CXX (default clang++), SORTIE_FUZZ_JOBS for the build (default 2),
# SORTIE_FUZZ_NO_BUILD=1 to run the targets already built (while the tree does not build),
# SORTIE_FUZZ_SWEEP=0 to leave out the boundary-value pass.
set -euo pipefail

seconds=${1:-60}
shift || true
all_targets=(cell pack drive airframe profile load_csv cell_log bench_csv fit_cell cli_options)
if [[ $# -gt 0 ]]; then targets=("$@"); else targets=("${all_targets[@]}"); fi
if ! [[ $seconds =~ ^[0-9]+$ ]] || [[ $seconds -lt 1 ]]; then
  echo "fuzz/run.sh: seconds per target must be a whole number >= 1 (got '$seconds')" >&2
  exit 2
fi

repo=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
build=${SORTIE_FUZZ_BUILD:-$repo/build-fuzz}
out=${SORTIE_FUZZ_OUT:-$build/fuzz-out}

# The whole library is instrumented for coverage and checked by ASan and UBSan; -O1 keeps the
# stack traces readable, and assert() stays on (no NDEBUG): our own invariants are checked too.
if [[ ${SORTIE_FUZZ_NO_BUILD:-0} != 1 ]]; then
  cmake -S "$repo" -B "$build" -DCMAKE_CXX_COMPILER="${CXX:-clang++}" -DSORTIE_FUZZ=ON \
    -DSORTIE_BUILD_TESTS=OFF -DSORTIE_BUILD_BENCH=OFF \
    -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCMAKE_CXX_FLAGS_RELWITHDEBINFO="-O1 -g" >/dev/null
  build_targets=()
  for t in "${targets[@]}"; do build_targets+=(--target "fuzz_$t"); done
  build_targets+=(--target sweep_seeds)
  cmake --build "$build" -j"${SORTIE_FUZZ_JOBS:-2}" "${build_targets[@]}"
fi
for t in "${targets[@]}"; do
  if [[ ! -x $build/fuzz/fuzz_$t ]]; then
    echo "fuzz/run.sh: no target '$t' in $build/fuzz (expected one of: ${all_targets[*]})" >&2
    exit 2
  fi
done

# Dictionaries: the key names of the bundled models and profiles, and the CSV header names.
mkdir -p "$out/logs"
# Extreme numbers too: a range check passes them, the numerics must cope.
{
  grep -ohE '"[A-Za-z_0-9]+"' -r "$repo/models" "$repo/profiles" | sort -u | sed 's/"/\\"/g; s/.*/"&"/'
  for n in 0 -0 1e-300 4.9e-324 1e300 1.7976931348623157e308 1e6 0.999999999 1.0000001 65 1000; do
    echo "\"$n\""
  done
} >"$out/json.dict"

seeds_of() {  # bundled files a target reads, then its own seeds and past crash inputs
  case $1 in
    cell) echo "$repo/models/cells" ;;
    pack) echo "$repo/models/packs" ;;
    drive) echo "$repo/models/drives" ;;
    airframe) echo "$repo/models/airframes" ;;
    profile) echo "$repo/profiles" ;;
  esac
  for d in "$repo/fuzz/corpus/$1" "$repo/fuzz/regressions/$1"; do [[ -d $d ]] && echo "$d"; done
  return 0
}

# Every boundary-value variant of the seeds once. libFuzzer stops at the first failing input:
# that one is kept (artifact sweep-*), taken out, and the pass starts again.
sweep() {
  local t=$1 dir="$out/sweep/$1" log="$out/logs/$1.sweep.log" files
  rm -rf "$dir"
  mapfile -t files < <(for d in "${seeds[@]}"; do find "$d" -type f; done)
  "$build/fuzz/sweep_seeds" "$dir" "${files[@]}" | sed 's/^/   sweep: /'
  for _ in $(seq 1 50); do
    if (cd "$out/logs" && "$build/fuzz/fuzz_$t" -runs=0 -timeout=10 -rss_limit_mb=2048 \
      -artifact_prefix="$out/crashes/$t/sweep-" "$dir" >"$log" 2>&1); then
      return 0
    fi
    local unit
    unit=$(sed -n 's/.*Test unit written to //p' "$log" | tail -1)
    [[ -n $unit && -f $unit ]] || return 0
    echo "   sweep: $(grep -m1 -E 'ERROR|uncaught|runtime error|Assertion' "$log" | cut -c1-160)"
    for f in "$dir"/*; do cmp -s "$f" "$unit" && rm -f "$f"; done
  done
}

status=0
for t in "${targets[@]}"; do
  mkdir -p "$out/corpus/$t" "$out/crashes/$t"
  dict="$out/json.dict"
  case $t in load_csv | cell_log | bench_csv | fit_cell) dict="$repo/fuzz/csv.dict" ;; cli_options) dict="$repo/fuzz/cli.dict" ;; esac
  mapfile -t seeds < <(seeds_of "$t")
  echo "== $t: ${seconds} s (log: $out/logs/$t.log)"
  # The sweep varies JSON numbers; the command line's words have no JSON to vary.
  [[ ${SORTIE_FUZZ_SWEEP:-1} == 0 || $t == cli_options ]] || sweep "$t"
  # -timeout: one input taking over 10 s is a hang; -rss_limit_mb: a runaway allocation.
  (cd "$out/logs" &&
    "$build/fuzz/fuzz_$t" -max_total_time="$seconds" -timeout=10 -rss_limit_mb=2048 \
      -fork=1 -ignore_crashes=1 -ignore_timeouts=1 -ignore_ooms=1 \
      -artifact_prefix="$out/crashes/$t/" -dict="$dict" -print_final_stats=1 \
      "$out/corpus/$t" "${seeds[@]}" >"$out/logs/$t.log" 2>&1) || true
  found=$(find "$out/crashes/$t" -maxdepth 1 -type f \( -name '*crash-*' -o -name '*timeout-*' -o -name '*oom-*' -o -name '*leak-*' \) | wc -l)
  corpus=$(find "$out/corpus/$t" -type f | wc -l)
  grep -E '^#[0-9]+.*(DONE|cov:)' "$out/logs/$t.log" | tail -1 || true
  echo "   corpus $corpus inputs, $found crash/timeout/oom inputs in $out/crashes/$t"
  [[ $found -eq 0 ]] || status=1
done
exit $status
