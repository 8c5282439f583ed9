#!/usr/bin/env bash
# Times the curve cube build (sample property, open city dataset, a ~1,000,000-booking synthetic
# property) and store loading with Google Benchmark, in a Release build of its own (build-bench/).
# Usage: scripts/bench.sh [extra benchmark flags, e.g. --benchmark_filter=Cube1M]
# Debian builds libbenchmark in debug mode, hence its warning; our code is Release.
# One benchmark runs at a time on one core; the synthetic property is simulated once at start
# (a few seconds, ~400 MB); the 1M store for the load benchmarks is written to a temporary folder
# and removed at exit.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="$root/build-bench"
export CURVEBENCH_SHARED_DIR="${CURVEBENCH_SHARED_DIR:-$root/../shared}"

cmake -S "$root" -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=Release -DCURVEBENCH_BUILD_BENCH=ON \
  -DCURVEBENCH_BUILD_GUI=OFF >/dev/null
cmake --build "$build" --target curvebench_bench -j2 >/dev/null

"$build/tests/bench/curvebench_bench" --benchmark_counters_tabular=true "$@"
