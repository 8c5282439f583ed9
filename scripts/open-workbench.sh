#!/usr/bin/env bash
# The README's first command: installs what is missing, builds, and opens the workbench on the
# sample property. With no display it says so and prints the headless summary instead.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"

bash scripts/install-deps.sh
build="${CURVEBENCH_BUILD_DIR:-build}"
cmake -S . -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=RelWithDebInfo >/dev/null
cmake --build "$build" -j "$(nproc)" --target curvebench curvebench-gui

if [[ -n "${DISPLAY:-}" || -n "${WAYLAND_DISPLAY:-}" ]]; then
  exec "$build/app/curvebench-gui" "$@"
fi

data="${XDG_DATA_HOME:-$HOME/.local/share}/curvebench"
store="$data/sample-property.curvebench"
echo "No display found (DISPLAY and WAYLAND_DISPLAY are unset): showing the headless summary of"
echo "the sample property instead. On a desktop, this command opens the workbench window."
echo
if [[ ! -f "$store" ]]; then
  mkdir -p "$data"
  "$build/app/curvebench" sample "$data/sample-files" --store "$store" >/dev/null
fi
exec "$build/app/curvebench" info "$store"
