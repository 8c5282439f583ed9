#!/usr/bin/env bash
# Fuzzes the file readers with libFuzzer (clang, AddressSanitizer + UBSan) in a build of its own
# (build-fuzz/): the CSV reader, the mapping profiles (reservations and blocks) and the importers
# into a fresh store. Seeds come from the tests' files; what the fuzzer finds new is kept in
# build-fuzz/corpus-NAME for the next run.
#
#   bash scripts/fuzz.sh [SECONDS]     # per harness; CI runs 30, a long run e.g. 3600
#
# A crash, a sanitizer error or a broken promise (tests/fuzz/fuzzsupport.h) stops the run with
# the input saved as build-fuzz/artifacts/crash-…; turn it into a regression test (tests/data/bad
# or a core test), fix, rerun. Prints executions per harness at the end.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
seconds="${1:-30}"
build="${CURVEBENCH_FUZZ_BUILD_DIR:-$root/build-fuzz}"

CC=clang CXX=clang++ cmake -S "$root" -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=RelWithDebInfo \
  -DCURVEBENCH_FUZZ=ON -DCURVEBENCH_BUILD_GUI=OFF -DBUILD_TESTING=OFF > /dev/null
cmake --build "$build" -j "$(nproc)" --target fuzz_csvreader fuzz_profile fuzz_import

# Seeds: the tests' CSV and JSON files. The CSV reader's and the importer's inputs start with one
# byte that picks options (see the harnesses): each CSV is seeded with a few of them.
seeds="$build/seeds"
rm -rf "$seeds"
mkdir -p "$seeds/csvreader" "$seeds/profile" "$seeds/import" "$build/artifacts"
n=0
while IFS= read -r -d '' f; do
  [[ $(stat -c %s "$f") -le 65536 ]] || continue
  n=$((n + 1))
  for pick in 00 40 81; do
    { printf "\\x$pick"; cat "$f"; } > "$seeds/csvreader/$n-$pick"
  done
  # 0 strict native, 1 lenient native, 4 strict open-data profile, 2 / 3 blocks strict / lenient
  for pick in 00 01 04 02 03; do
    { printf "\\x$pick"; cat "$f"; } > "$seeds/import/$n-$pick"
  done
done < <(find "$root/tests/data" "$root/sample_property" -name '*.csv' -print0 | sort -z)
# Short heads of the sample files (the whole files are too long for quick runs).
for f in reservations blocks; do
  { printf '\x00'; head -n 30 "$root/sample_property/$f.csv"; } > "$seeds/import/sample-$f-00"
  { printf '\x02'; head -n 30 "$root/sample_property/$f.csv"; } > "$seeds/import/sample-$f-02"
done
find "$root/resources/profiles" "$root/tests/data" -name '*.json' -exec cp {} "$seeds/profile/" \;

summary=()
status=0
for harness in csvreader profile import; do
  corpus="$build/corpus-$harness"
  mkdir -p "$corpus"
  log="$build/fuzz-$harness.log"
  echo "== fuzz_$harness for ${seconds} s"
  # -max_len 8192: long enough for several records and a profile; keeps executions fast.
  if ! (cd "$build/artifacts" && "$build/tests/fuzz/fuzz_$harness" -max_total_time="$seconds" \
      -max_len=8192 -timeout=20 -rss_limit_mb=2048 -print_final_stats=1 \
      -artifact_prefix="$build/artifacts/$harness-" "$corpus" "$seeds/$harness") > "$log" 2>&1; then
    echo "FAIL fuzz_$harness: see $log and $build/artifacts/"
    tail -n 40 "$log"
    status=1
  fi
  runs="$(grep -Eo 'stat::number_of_executed_units: *[0-9]+' "$log" | grep -Eo '[0-9]+$' || echo '?')"
  summary+=("fuzz_$harness: $runs executions in ${seconds} s, corpus $(ls "$corpus" | wc -l) inputs")
done
printf '%s\n' "${summary[@]}"
exit "$status"
