#!/usr/bin/env bash
# How quick the workbench feels on the sample property: cold start to the first chart (Horizon,
# and Date Study as the first screen), and the Date Study night switch while the background
# forecasts run and once they are ready. Release build of its own (build-bench-gui/), Qt's
# offscreen platform unless a display is set. Timings are reported, never asserted.
# Usage: scripts/bench-gui.sh [--runs N] [--switches N]
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="$root/build-bench-gui"
cmake -S "$root" -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=Release -DCURVEBENCH_BUILD_BENCH=ON \
  -DCURVEBENCH_BUILD_GUI=ON >/dev/null
cmake --build "$build" --target curvebench_bench_gui curvebench -j2 >/dev/null

work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT
"$build/app/curvebench" sample "$work/files" --store "$work/sample.curvebench" >/dev/null
"$build/tests/bench/curvebench_bench_gui" "$work/sample.curvebench" "$@"
