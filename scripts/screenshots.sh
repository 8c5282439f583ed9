#!/usr/bin/env bash
# Screenshots of every workbench screen and of the morning brief's first page, taken under Xvfb
# (a real X server, the xcb platform), each checked not blank. Run by ctest as
# `gui_screenshots_xvfb`; by hand to refresh the README's pictures:
#
#   bash scripts/screenshots.sh [--build DIR] [--out DIR] [--update]
#
#   --build DIR  build folder holding app/curvebench and app/curvebench-gui (default: build)
#   --out DIR    where the PNGs go (default: a temporary folder, removed afterwards)
#   --update     also copy them to resources/screenshots/NAME-sample.png
#
# The sample property is built afresh in a temporary folder; the brief is as of 2026-10-31 (the
# sample's last day of data). Needs xvfb-run (xvfb, xauth), ImageMagick and poppler-utils; the
# README's test command installs them.
#
# "Not blank": the PNG has the window's size (1366×768; the brief's page at 80 dpi is portrait)
# and its central part holds many colours with some contrast. A screen stuck on a busy message
# or an empty chart has a handful of colours and fails.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="$root/build"
out=""
update=0
while [[ $# -gt 0 ]]; do
  case "$1" in
    --build) build="$(cd "$2" && pwd)"; shift 2 ;;
    --out) out="$2"; shift 2 ;;
    --update) update=1; shift ;;
    *) echo "screenshots.sh: unknown option $1" >&2; exit 2 ;;
  esac
done

gui="$build/app/curvebench-gui"
cli="$build/app/curvebench"
for tool in "$gui" "$cli"; do
  [[ -x "$tool" ]] || { echo "screenshots.sh: $tool not built" >&2; exit 2; }
done
for tool in xvfb-run convert identify pdftoppm; do
  command -v "$tool" > /dev/null || { echo "screenshots.sh: $tool missing" >&2; exit 2; }
done

tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
export XDG_RUNTIME_DIR="$tmp" # private (mktemp -d is 0700); Qt warns without one
if [[ -z "$out" ]]; then out="$tmp/out"; fi
mkdir -p "$out"
out="$(cd "$out" && pwd)"

"$cli" sample "$tmp/files" --store "$tmp/sample.curvebench" > /dev/null

# check NAME FILE WIDTH HEIGHT MIN_COLOURS: size exact, the central 60 % has enough colours and
# a standard deviation of at least 5 % (a flat grey window has ~0). Prints "ok …" or "FAIL …".
check() {
  local name="$1" file="$2" w="$3" h="$4" min="$5"
  local size colours sd
  size="$(identify -format '%wx%h' "$file")"
  if [[ -n "$w" && "$size" != "${w}x${h}" ]]; then
    echo "FAIL $name: size $size, expected ${w}x${h}"; return
  fi
  read -r colours sd < <(convert "$file" -gravity center -crop 60%x60%+0+0 +repage \
    -format '%k %[fx:standard_deviation]\n' info:)
  if (( colours < min )) || awk -v s="$sd" 'BEGIN { exit !(s < 0.05) }'; then
    echo "FAIL $name: looks blank ($colours colours, standard deviation $sd)"; return
  fi
  echo "ok   $name: $size, $colours colours, standard deviation $sd"
}

# One X server for all screens: xvfb-run starts it and the loop runs inside (xvfb-run is a
# POSIX sh script, so the check runs afterwards, out here).
screens="$(QT_QPA_PLATFORM=offscreen "$gui" --list-screens)"
export gui out tmp screens
xvfb-run -a -s "-screen 0 1600x1000x24" bash -c '
  for s in $screens; do
    QT_QPA_PLATFORM=xcb XDG_CONFIG_HOME="$tmp/cfg-$s" XDG_DATA_HOME="$tmp/data" \
      timeout 300 "$gui" "$tmp/sample.curvebench" --screen "$s" \
      --size 1366x768 --screenshot "$out/$s.png" > "$tmp/$s.log" 2>&1
    echo $? > "$tmp/$s.rc"
  done
'
: > "$tmp/screens.txt"
for s in $screens; do
  if [[ "$(cat "$tmp/$s.rc")" != 0 || ! -f "$out/$s.png" ]]; then
    echo "FAIL $s: the workbench exited with $(cat "$tmp/$s.rc")" | tee -a "$tmp/screens.txt"
    cat "$tmp/$s.log"
    continue
  fi
  check "$s" "$out/$s.png" 1366 768 40 | tee -a "$tmp/screens.txt"
done

QT_QPA_PLATFORM=offscreen "$cli" brief "$tmp/sample.curvebench" --as-of 2026-10-31 \
  --out "$tmp/brief.pdf" > /dev/null
pdftoppm -png -r 80 -f 1 -l 1 -singlefile "$tmp/brief.pdf" "$out/morning-brief"
check morning-brief "$out/morning-brief.png" "" "" 20 | tee -a "$tmp/screens.txt"
failures=$(grep -c '^FAIL' "$tmp/screens.txt" || true)

if [[ "$update" == 1 ]]; then
  for f in "$out"/*.png; do
    cp "$f" "$root/resources/screenshots/$(basename "$f" .png)-sample.png"
  done
  echo "copied to resources/screenshots/"
fi
if (( failures > 0 )); then
  echo "$failures screenshot(s) failed"
  exit 1
fi
echo "all $(grep -c '^ok' "$tmp/screens.txt") screenshots look right (in $out)"
