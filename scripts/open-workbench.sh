#!/usr/bin/env bash
# The README's first command: installs what is missing, builds, and opens the workbench on the
# sample property. With no display it says so and runs the morning review headless instead
# (the store summary, then the outlook of the next 14 nights).
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
echo "No display found (DISPLAY and WAYLAND_DISPLAY are unset): running the morning review of the"
echo "sample property headless instead. On a desktop, this command opens the workbench window."
echo
if [[ ! -f "$store" ]]; then
  mkdir -p "$data"
  "$build/app/curvebench" sample "$data/sample-files" --store "$store" >/dev/null
fi
"$build/app/curvebench" info "$store"
echo
echo "Morning review: the next 14 nights as of the newest data (CSV; notes and caution after it)"
asof="$("$build/app/curvebench" info "$store" | sed -n 's/^Data as of *\([0-9-]*\).*/\1/p' | head -1)"
exec "$build/app/curvebench" outlook "$store" --as-of "${asof:-2026-10-31}" --days 14
