#!/usr/bin/env bash
# The bench command for a large property (README "Performance"): whole processes of the command
# line on the synthetic ~1,000,000-booking property (simulated into a temporary folder, never
# committed), each step run RUNS times, the median wall time and the largest peak RSS printed as a
# Markdown table; then the same work by the independent pandas pipeline (bench/pandas_pipeline.py)
# and the speed ratios. Nothing is asserted.
#
# Usage: scripts/bench-scale.sh [--runs N] [--size 1m|sample|open] [--build DIR] [--skip-slow]
#   --runs N      runs per step (default 3)
#   --size S      1m (default), sample (the 55,000-row sample property) or open (the open city
#                 dataset, ../shared/data/open/hotel_bookings_city.csv, 79,330 rows, imported
#                 with its mapping profile; pandas reads it with --format open-data)
#   --build DIR   a configured build folder (default build/, the README's RelWithDebInfo build)
#   --skip-slow   leave out forecast --method auto and the backtest of every method
# Needs /usr/bin/time and Debian's python3-pandas (scripts/install-deps.sh installs both).
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
runs=3 size=1m build="$root/build" skipSlow=0
while [[ $# -gt 0 ]]; do
  case "$1" in
    --runs) runs="$2"; shift 2 ;;
    --size) size="$2"; shift 2 ;;
    --build) build="$2"; shift 2 ;;
    --skip-slow) skipSlow=1; shift ;;
    *) echo "unknown option $1" >&2; exit 2 ;;
  esac
done
[[ -x /usr/bin/time ]] || { echo "needs /usr/bin/time (apt-get install time)" >&2; exit 2; }
cmake --build "$build" --target curvebench -j "$(nproc)" >/dev/null
cli="$build/app/curvebench"
work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT

# importArgs: what `curvebench import` needs besides the store and the file; pdFormat: how the
# pandas pipeline reads the file.
if [[ $size == open ]]; then
  # Nuno Antonio, Ana de Almeida, Luis Nunes, "Hotel booking demand datasets", Data in Brief 22
  # (2019) 41-49, doi:10.1016/j.dib.2018.11.126, CC BY 4.0. Capacity 235 as in the README's
  # example (the most rooms any night of the file holds is below it).
  csv="${CURVEBENCH_SHARED_DIR:-$root/../shared}/data/open/hotel_bookings_city.csv"
  [[ -f $csv ]] || { echo "the open dataset is not at $csv (set CURVEBENCH_SHARED_DIR)" >&2; exit 2; }
  capacity=235 importArgs=(--profile hotel-bookings-open-data) pdFormat=open-data
else
  "$cli" sample "$work/files" --size "$size" >/dev/null
  csv="$work/files/reservations.csv"
  capacity=$(/usr/bin/python3 -c 'import json,sys; print(json.load(open(sys.argv[1]))["capacity"])' \
    "$work/files/property.json")
  importArgs=() pdFormat=native
fi
rows=$(($(wc -l <"$csv") - 1))

# Runs "$@" once as a whole process; sets t (wall seconds) and m (peak RSS, KB).
timeOnce() {
  # The last run's writes flushed first, untimed: back to back, an import into a new store
  # otherwise paid for the previous one's (4.4 s became up to 6.9 s on the 1M property).
  sync
  /usr/bin/time -f "%e %M" -o "$work/time.txt" "$@" >/dev/null 2>"$work/stderr.txt" ||
    { echo "failed: $*" >&2; cat "$work/stderr.txt" >&2; exit 1; }
  read -r t m <"$work/time.txt"
}
median() { printf '%s\n' "$@" | sort -n | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }
# Runs "$@" RUNS times; prints "median_seconds max_rss_mb". PREP (a function name or :) runs
# before each run, untimed.
measure() {
  local prep="$1"; shift
  local times=() rss=0
  for ((i = 0; i < runs; i++)); do
    "$prep"
    timeOnce "$@"
    times+=("$t")
    ((m > rss)) && rss=$m
  done
  printf '%s %d\n' "$(median "${times[@]}")" $((rss / 1024))
}
# The two sides of a comparison in turn, RUNS times each (PREP, untimed, then script A, then
# script B): this machine's speed drifts from minute to minute (pandas' end to end took 4.5 s
# to 8.3 s within a day), and timing one side after the other let the drift into the ratio.
# Prints "median_a rss_a_mb median_b rss_b_mb".
pair() {
  local prep="$1" a="$2" b="$3"
  local ta=() tb=() ra=0 rb=0
  for ((i = 0; i < runs; i++)); do
    "$prep"
    timeOnce bash "$a"
    ta+=("$t")
    ((m > ra)) && ra=$m
    timeOnce bash "$b"
    tb+=("$t")
    ((m > rb)) && rb=$m
  done
  printf '%s %d %s %d\n' "$(median "${ta[@]}")" $((ra / 1024)) "$(median "${tb[@]}")" $((rb / 1024))
}
row() { printf '| %s | %s s | %s MB |\n' "$1" "$2" "$3"; }

fresh() { rm -f "$work/s.curvebench"*; "$cli" init "$work/s.curvebench" --name Bench --capacity "$capacity" >/dev/null; }
store="$work/s.curvebench"
# One year of reading dates ending at the data's reading date (the newest booking or
# cancellation, as the store reports it), and the nights after it.
fresh
"$cli" import "$store" "$csv" "${importArgs[@]}" >/dev/null
asof=$("$cli" info "$store" | awk '/^Data as of/ {print $4}')
[[ $asof =~ ^[0-9]{4}-[0-9]{2}-[0-9]{2}$ ]] || { echo "no reading date in the store" >&2; exit 1; }
from=$(date -d "$asof - 364 days" +%F)

echo "Curvebench on $size: $(echo "$rows" | sed ':a;s/\B[0-9]\{3\}\>/,&/;ta') reservations, reading date $asof," \
  "$runs runs per step (median wall time, largest peak RSS); $(nproc) cores, $(date +%F)"
echo
echo "| step | time | peak RSS |"
echo "|---|---|---|"
read -r t m < <(measure fresh "$cli" import "$store" "$csv" "${importArgs[@]}"); row "import into a new store" "$t" "$m"
read -r t m < <(measure : "$cli" import "$store" "$csv" "${importArgs[@]}"); row "re-import of the unchanged file" "$t" "$m"
read -r t m < <(measure : "$cli" info "$store"); row "open the store, summary (info)" "$t" "$m"
# An import writes or updates the snapshot (core/reservationsnapshot.h) and the kept total cube
# (core/keptcube.h) beside the store, so reads use them. Without them (deleted, or a store from
# an older Curvebench) the first read goes to the table and writes both; without the kept cube
# alone, `curves` and `backtest` load the reservations and build their cube (and keep it).
nosnap() { rm -f "$store.snapshot" "$store.cube"; }
nocube() { rm -f "$store.cube"; }
read -r t m < <(measure nosnap "$cli" curves "$store" --out "$work/curves.csv")
row "curves, total, with neither snapshot nor kept cube (reads the table, writes both)" "$t" "$m"
read -r t m < <(measure nocube "$cli" curves "$store" --out "$work/curves.csv")
row "curves, total, to CSV, without the kept cube (loads the store, builds the cube, keeps it)" "$t" "$m"
curvesBuildT=$t
read -r t m < <(measure : "$cli" curves "$store" --out "$work/curves.csv")
row "curves, total, to CSV (reads the kept cube, writes the rows)" "$t" "$m"
# (The open dataset has no daily extracts: its rows are in another layout.)
if [[ $size != open ]]; then
  # A daily extract: the rows booked or cancelled on the last day, each with its rate changed (a
  # different change each run, so every run writes them all).
  daily="$work/daily.csv"
  dailyRun=0
  dailyExtract() {
    dailyRun=$((dailyRun + 1))
    head -1 "$csv" >"$daily"
    awk -F, -v d="$asof" -v k="$dailyRun" 'BEGIN {OFS = ","} NR > 1 && ($3 == d || $4 == d) {
      $11 = $11 + k; print }' "$csv" >>"$daily"
  }
  dailyExtract
  dailyRows=$(($(wc -l <"$daily") - 1))
  read -r t m < <(measure dailyExtract "$cli" import "$store" "$daily")
  row "import of a daily extract ($dailyRows changed rows; updates the snapshot)" "$t" "$m"
  printf '#!/usr/bin/env bash\nset -e\n"%s" import "%s" "%s" >/dev/null\n"%s" curves "%s" --out "%s"\n' \
    "$cli" "$store" "$daily" "$cli" "$store" "$work/curves-daily.csv" >"$work/daily-then-curves.sh"
  read -r t m < <(measure dailyExtract bash "$work/daily-then-curves.sh")
  row "the same import, then curves" "$t" "$m"
fi
read -r t m < <(measure : "$cli" curves "$store" --by segment --out "$work/curves-seg.csv")
row "curves by segment to CSV" "$t" "$m"
read -r t m < <(measure : "$cli" pace "$store" --as-of "$asof" --days 365); row "pace, 365 nights" "$t" "$m"
read -r t m < <(measure : "$cli" outlook "$store" --as-of "$asof" --days 365)
row "outlook, 365 nights (pickup-adv)" "$t" "$m"
read -r t m < <(measure : "$cli" backtest "$store" --from "$from" --to "$asof" --methods pickup-add \
  --naive-history --summary "$work/bt-add.csv")
row "backtest of additive pickup, one year of reading dates" "$t" "$m"
read -r t m < <(measure nocube "$cli" backtest "$store" --from "$from" --to "$asof" \
  --methods pickup-add --naive-history --summary "$work/bt-add.csv")
row "the same without the kept cube (loads the store, builds the cube, keeps it)" "$t" "$m"
btBuildT=$t
if [[ $skipSlow == 0 ]]; then
  read -r t m < <(measure : "$cli" forecast "$store" --as-of "$asof" --horizon 365 --method auto \
    --out "$work/forecast.csv")
  row "forecast, 365 nights, method auto" "$t" "$m"
  read -r t m < <(measure : "$cli" backtest "$store" --from "$from" --to "$asof" --methods all \
    --summary "$work/bt-all.csv")
  row "backtest of every method, one year of reading dates" "$t" "$m"
fi

echo
echo "Against the pandas pipeline (bench/pandas_pipeline.py, the same parse, total curves and"
echo "additive-pickup backtest; pandas keeps its parsed frame in a pickle as its \"store\"). Each side's"
echo "commands timed as one script, the two sides in turn, $runs runs each (medians); the last row"
echo "adds up the steps above:"
echo
echo "| work | Curvebench | pandas | ratio |"
echo "|---|---|---|---|"
py=(/usr/bin/python3 "$root/bench/pandas_pipeline.py")
# Each side's work as one script, timed whole (the commands one after the other, as a user or a
# scheduled job runs them).
btArgs=(--from "$from" --to "$asof" --methods pickup-add --naive-history --summary "$work/bt-add.csv")
{
  echo 'set -e'
  printf '%q ' "$cli" import "$store" "$csv" "${importArgs[@]}"; echo
  printf '%q ' "$cli" curves "$store" --out "$work/curves.csv"; echo
  printf '%q ' "$cli" backtest "$store" "${btArgs[@]}"; echo
} >"$work/cb-e2e.sh"
{
  echo 'set -e'
  printf '%q ' "$cli" curves "$store" --out "$work/curves.csv"; echo
  printf '%q ' "$cli" backtest "$store" "${btArgs[@]}"; echo
} >"$work/cb-refresh.sh"
{
  echo 'set -e'
  printf '%q ' "${py[@]}" --format "$pdFormat" "$csv" --from "$from" --to "$asof" \
    --curves-out "$work/pd-curves.csv" --save-cache "$work/pd.pkl"; echo
} >"$work/pd-e2e.sh"
{
  echo 'set -e'
  printf '%q ' "${py[@]}" --from-cache "$work/pd.pkl" --from "$from" --to "$asof" \
    --curves-out "$work/pd-curves.csv"; echo
} >"$work/pd-refresh.sh"
read -r cbE _ pe pm < <(pair fresh "$work/cb-e2e.sh" "$work/pd-e2e.sh")
read -r cbR _ pr prm < <(pair : "$work/cb-refresh.sh" "$work/pd-refresh.sh")
cbB=$(awk -v b="$curvesBuildT" -v c="$btBuildT" 'BEGIN {printf "%.2f", b + c}')
ratio() { awk -v p="$1" -v c="$2" 'BEGIN {printf "%.1f", p / c}'; }
printf '| end to end from the CSV (import, curves, backtest) | %s s | %s s (%s MB) | %s× |\n' \
  "$cbE" "$pe" "$pm" "$(ratio "$pe" "$cbE")"
printf '| daily refresh from the store (curves, backtest; the cube the import kept) | %s s | %s s (%s MB) | %s× |\n' \
  "$cbR" "$pr" "$prm" "$(ratio "$pr" "$cbR")"
printf '| the same, each command building its cube (no kept cube) | %s s | %s s | %s× |\n' \
  "$cbB" "$pr" "$(ratio "$pr" "$cbB")"
if cmp -s "$work/curves.csv" "$work/pd-curves.csv"; then
  echo
  echo "The two curves files are identical, byte for byte."
else
  echo
  echo "WARNING: the curves files differ; the comparison is not of the same work." >&2
fi
