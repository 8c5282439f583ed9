#!/usr/bin/env bash
# The README's test command: installs what is missing, builds with warnings as errors and runs
# every test (core, command line end to end, ui offscreen), then checks formatting.
# Set CURVEBENCH_SANITIZE_RUN=1 to add an AddressSanitizer/UBSan build of the tests, and
# CURVEBENCH_FUZZ_RUN=1 to add a short libFuzzer run of each harness (scripts/fuzz.sh).
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"

bash scripts/install-deps.sh

jobs="$(nproc)"
build="${CURVEBENCH_BUILD_DIR:-build}"

cmake -S . -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCURVEBENCH_WERROR=ON
cmake --build "$build" -j "$jobs"
QT_QPA_PLATFORM=offscreen ctest --test-dir "$build" --output-on-failure -j "$jobs"

bash scripts/check-format.sh

if [[ "${CURVEBENCH_SANITIZE_RUN:-0}" == "1" ]]; then
  # Warnings are errors in the main build above; not here, because GCC 12 raises false
  # -Wmaybe-uninitialized warnings inside libstdc++ (std::regex) when sanitizers and -O2 meet.
  cmake -S . -B "$build-asan" -G Ninja -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCURVEBENCH_SANITIZE=ON \
    -DCURVEBENCH_BUILD_GUI=OFF -DCURVEBENCH_WERROR=OFF
  cmake --build "$build-asan" -j "$jobs"
  ctest --test-dir "$build-asan" --output-on-failure -j "$jobs"
fi

if [[ "${CURVEBENCH_FUZZ_RUN:-0}" == "1" ]]; then
  bash scripts/fuzz.sh "${CURVEBENCH_FUZZ_SECONDS:-30}"
fi
