#!/usr/bin/python3
"""End-to-end check that bench/pandas_pipeline.py does the same work as the curvebench command
line (ctest cli_pandas_pipeline_agrees), so the speed comparison compares like with like.

Source data: the city-hotel half of the open "Hotel booking demand" dataset, Nuno Antonio, Ana de
Almeida, Luis Nunes, "Hotel booking demand datasets", Data in Brief 22 (2019) 41-49,
doi:10.1016/j.dib.2018.11.126, CC BY 4.0 (shared/data/open/hotel_bookings_city.csv). No value
is written down here: both sides compute from that file and must agree.

Steps: a store from the file (`curvebench init`, `curvebench import --profile
hotel-bookings-open-data`); `curvebench curves` and `curvebench backtest --methods pickup-add
--naive-history` over the reading dates 2016-06-01..2016-06-30; the pandas pipeline on the same
CSV. Fails unless
  - the curves CSVs are identical, byte for byte;
  - every backtest forecast is the same (stay night, reading date, lead, forecast printed with 2
    decimals, final). A pickup forecast is an integer plus a mean of at most 8 integers, so two
    different forecasts differ by at least 1/56 and agree to 2 decimals only when equal;
  - per lead the count is equal and the MAE and bias agree to the 3 decimals curvebench prints.

Usage: check_pandas_agrees.py PATH/TO/curvebench PATH/TO/hotel_bookings_city.csv
Exit 77 (ctest: skipped) when pandas is not installed for this Python.
"""
import csv
import os
import subprocess
import sys
import tempfile
from pathlib import Path

FROM, TO = "2016-06-01", "2016-06-30"
LEADS = "1,3,7,14,30,60,90"
PIPELINE = Path(__file__).resolve().parent / "pandas_pipeline.py"


def run(args):
    env = dict(os.environ, LC_ALL="C.UTF-8", LANG="C.UTF-8")
    r = subprocess.run([str(a) for a in args], capture_output=True, text=True, env=env)
    if r.returncode != 0:
        sys.exit(f"FAIL: {' '.join(map(str, args))} exited {r.returncode}\n{r.stderr}")
    return r.stdout


def rows(path, columns):
    with open(path, newline="") as f:
        return sorted(tuple(row[c] for c in columns) for row in csv.DictReader(f))


def main():
    if len(sys.argv) != 3:
        sys.exit(__doc__)
    try:
        import pandas  # noqa: F401  (only to skip cleanly without it)
    except ImportError:
        print("SKIP: pandas is not installed for", sys.executable)
        return 77
    cb, data = Path(sys.argv[1]), Path(sys.argv[2])
    failures = []
    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        store = tmp / "open.cbstore"
        run([cb, "init", store, "--name", "Open data city hotel", "--capacity", "400"])
        run([cb, "import", store, data, "--profile", "hotel-bookings-open-data"])
        run([cb, "curves", store, "--out", tmp / "cb_curves.csv"])
        summary = run(
            [cb, "backtest", store, "--from", FROM, "--to", TO, "--methods", "pickup-add",
             "--naive-history", "--leads", LEADS, "--detail", tmp / "cb_detail.csv"]
        )
        pd_summary = run(
            [sys.executable, PIPELINE, "--format", "open-data", data, "--from", FROM, "--to", TO,
             "--curves-out", tmp / "pd_curves.csv", "--detail-out", tmp / "pd_detail.csv"]
        )

        a = (tmp / "cb_curves.csv").read_bytes()
        b = (tmp / "pd_curves.csv").read_bytes()
        if a != b:
            la, lb = a.decode().splitlines(), b.decode().splitlines()
            first = next(
                (i for i, (x, y) in enumerate(zip(la, lb)) if x != y), min(len(la), len(lb))
            )
            failures.append(
                f"curves differ: {len(la)} vs {len(lb)} lines; first difference at line "
                f"{first + 1}:"
                f"\n  curvebench: {la[first] if first < len(la) else '(end)'}"
                f"\n  pandas:     {lb[first] if first < len(lb) else '(end)'}"
            )

        keys = ["stay_date", "reading_date", "h", "forecast", "final"]
        da, db = rows(tmp / "cb_detail.csv", keys), rows(tmp / "pd_detail.csv", keys)
        if da != db:
            only_a, only_b = sorted(set(da) - set(db)), sorted(set(db) - set(da))
            failures.append(
                f"backtest forecasts differ ({len(da)} vs {len(db)} rows); curvebench only: "
                f"{only_a[:3]}; pandas only: {only_b[:3]}"
            )

    theirs = {
        r["h"]: r for r in csv.DictReader(summary.splitlines()) if r["method"] == "pickup-add"
    }
    ours = {r["lead"]: r for r in csv.DictReader(pd_summary.splitlines())}
    if sorted(theirs) != sorted(ours):
        failures.append(f"leads differ: {sorted(theirs)} vs {sorted(ours)}")
    for lead in sorted(set(theirs) & set(ours), key=int):
        t, o = theirs[lead], ours[lead]
        if t["count"] != o["count"]:
            failures.append(f"lead {lead}: count {t['count']} (curvebench) vs {o['count']}")
        for k in ["mae", "bias"]:
            if abs(float(t[k]) - float(o[k])) > 0.0005 + 1e-12:
                failures.append(f"lead {lead}: {k} {t[k]} (curvebench) vs {o[k]}")
    if not ours or int(ours.get("1", {}).get("count", 0)) == 0:
        failures.append("the pandas backtest scored no forecast")

    for f in failures:
        print("FAIL:", f)
    if failures:
        return 1
    print(f"OK: curves identical ({len(a.splitlines())} lines), {len(da)} backtest forecasts "
          f"identical, count/MAE/bias agree for leads {LEADS}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
