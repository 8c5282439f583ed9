#!/usr/bin/env bash
# Backtest of every forecast method (and auto) over one year of reading dates on the open city
# dataset, printing the time, MAE and MAPE by lead and 80 % band coverage (README, "Measured
# accuracy"). Release build of its own in build-bench/.
# Usage: scripts/bench-backtest.sh [FROM TO [BAND_WINDOW_DAYS]]   (default 2016-06-01 2017-05-31)
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="$root/build-bench"
export CURVEBENCH_SHARED_DIR="${CURVEBENCH_SHARED_DIR:-$root/../shared}"
# -Werror off here: GCC 12 at -O3 raises a false -Wrestrict in library code.
cmake -S "$root" -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=Release -DCURVEBENCH_BUILD_BENCH=ON \
  -DCURVEBENCH_BUILD_GUI=OFF -DCURVEBENCH_WERROR=OFF >/dev/null
cmake --build "$build" --target curvebench_bench_backtest -j2 >/dev/null
"$build/tests/bench/curvebench_bench_backtest" "$@"
