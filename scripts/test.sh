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
  # The whole suite again (core, command line, ui offscreen) with AddressSanitizer and UBSan,
  # warnings as errors (cmake/CurvebenchWarnings.cmake names the one GCC warning dropped there).
  # -O1 -g1: the usual level for sanitizer runs (line tables are enough for their stack traces),
  # and it compiles far faster than -O2 -g on a 2-core CI machine.
  cmake -S . -B "$build-asan" -G Ninja -DCMAKE_BUILD_TYPE=None -DCMAKE_CXX_FLAGS="-O1 -g1" \
    -DCURVEBENCH_SANITIZE=ON \
    -DCURVEBENCH_BUILD_GUI=ON -DCURVEBENCH_WERROR=ON
  cmake --build "$build-asan" -j "$jobs"
  QT_QPA_PLATFORM=offscreen LSAN_OPTIONS="suppressions=$root/tests/lsan.supp:print_suppressions=0" \
    ctest --test-dir "$build-asan" --output-on-failure -j "$jobs"
fi

if [[ "${CURVEBENCH_FUZZ_RUN:-0}" == "1" ]]; then
  bash scripts/fuzz.sh "${CURVEBENCH_FUZZ_SECONDS:-30}"
fi
