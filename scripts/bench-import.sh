#!/usr/bin/env bash
# Times the import path on the open city dataset and the sample property (whole processes,
# wall time and peak RSS from /usr/bin/time). Usage: scripts/bench-import.sh [BUILD_DIR]
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${1:-$root/build}"
cli="$build/app/curvebench"
data="${CURVEBENCH_SHARED_DIR:-$root/../shared}/data/open/hotel_bookings_city.csv"
work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT
[[ -x /usr/bin/time ]] || { echo "needs /usr/bin/time (apt-get install time)"; exit 2; }

t() { local label="$1"; shift; /usr/bin/time -f "$label: %e s wall, %M KB peak RSS" "$@" >/dev/null; }

"$cli" init "$work/city.curvebench" --name "City hotel (open data)" --capacity 400 >/dev/null
t "open dataset, import 79,330 rows into a new store" \
  "$cli" import "$work/city.curvebench" "$data" --profile hotel-bookings-open-data
t "open dataset, re-import unchanged" \
  "$cli" import "$work/city.curvebench" "$data" --profile hotel-bookings-open-data
t "sample property, simulate and write files" "$cli" sample "$work/sample"
t "sample property, simulate, write and build the store" \
  "$cli" sample "$work/sample2" --store "$work/sample.curvebench"
t "info on the open-dataset store" "$cli" info "$work/city.curvebench"
