#!/usr/bin/python3
# An independent pandas/numpy implementation of the work Curvebench's command line does for the
# speed comparison of issue 10: parse a reservation CSV, build the total booking curves, and
# backtest classical additive pickup. No Curvebench code, store or cube is used; the definitions
# below are taken from the brief (../shared/docs/brief.md beside the repository) and written afresh with vectorised
# pandas/numpy (no Python loop over rows, nights or cells), so the comparison is against a fair
# opponent. The slow, per-cell reference for the same definitions is
# tests/reference/pickup_open_city.py.
#
# Inputs (--format):
#   native     Curvebench's own columns: reservation_id,status,booked_on,cancelled_on,arrival,
#              departure,rooms,room_type,segment,channel,rate,currency,block_id (all read, typed).
#   open-data  The open "Hotel booking demand" dataset: Nuno Antonio, Ana de Almeida, Luis Nunes,
#              "Hotel booking demand datasets", Data in Brief 22 (2019) 41-49,
#              doi:10.1016/j.dib.2018.11.126, CC BY 4.0. Derivations as in the shipped profile
#              resources/profiles/hotel-bookings-open-data.json (common practice, no source):
#              arrival from year, English month name and day; departure = arrival + weekend +
#              week nights (0 nights = day use, no night); booked_on = arrival - lead_time days;
#              cancelled_on = reservation_status_date when reservation_status is "Canceled"
#              (No-Show rows stay on the books); one room per row; rate = adr.
#
# Definitions:
#   OTB(s, x) (brief section 4) = rooms of the bookings with booked_on <= x, arrival <= s <
#   departure and not cancelled on or before x; no-shows stay. The curve grid holds
#   OTB(s, s - d) for d = 0..365, d = 365 holding everything booked 365 or more days ahead, in
#   rooms and in revenue (rate per room-night x rooms, summed exactly in millionths of the
#   currency unit). Reading date T = the newest booked_on or cancelled_on in the data. Nights:
#   the first night stayed to the last night stayed, but no later than T + 365; for each night
#   only the cells read on or before T (d >= s - T). Final(s) = OTB(s, s).
#   Classical additive pickup (brief section 5), total of the hotel: for reading date t and lead
#   h, s = t + h and F = max(0, OTB(s, t) + mean_r [Final(r) - OTB(r, r - h)]) over the 8 most
#   recent nights r with the weekday of s, r <= t; at the start of the data, the references
#   are those on or after the first night of the data (the first arrival, day uses included),
#   and a forecast with none is left out. Reading dates t = --from..--to (1 day apart) and
#   before T; only nights s <= T (final known) are scored. Per lead: count, MAE = mean |F -
#   Final(s)|, bias = mean (F - Final(s)).
#
# Output: each step's wall time on standard error as `step,<name>,<seconds>` (parse, save-cache
# or load-cache, curves, backtest; curves.grid and curves.write split the curves step), then
# `step,total,<seconds>` and the peak resident set `rss_mb,<n>`; the backtest summary
# `lead,count,mae,bias` on standard output; the curves CSV (stay_date,series,dba,otb_rooms,
# otb_revenue, as `curvebench curves` writes it) to --curves-out (else formatted and discarded).
#
# Run with Debian's python3 (pandas 1.5.3, numpy 1.24.2):
#   /usr/bin/python3 bench/pandas_pipeline.py --format native reservations.csv \
#       --from 2025-11-01 --to 2026-10-31 --curves-out curves.csv --save-cache frame.pkl
#   /usr/bin/python3 bench/pandas_pipeline.py --from-cache frame.pkl \
#       --from 2025-11-01 --to 2026-10-31 --curves-out curves.csv
#   /usr/bin/python3 bench/pandas_pipeline.py --format open-data \
#       ../shared/data/open/hotel_bookings_city.csv --from 2016-06-01 --to 2016-06-30
import argparse
import os
import resource
import sys
import time

import numpy as np
import pandas as pd

MAX_DBA = 365
LEADS = [1, 3, 7, 14, 30, 60, 90]
REFERENCES = 8
NEVER = np.iinfo(np.int64).max // 4  # cancelled_on of a booking never cancelled, as a day number

NATIVE_DTYPES = {
    "reservation_id": "string",
    "status": "category",
    "booked_on": "string",
    "cancelled_on": "string",
    "arrival": "string",
    "departure": "string",
    "rooms": "int32",
    "room_type": "category",
    "segment": "category",
    "channel": "category",
    "rate": "float64",
    "currency": "category",
    "block_id": "category",
}
DATE_COLUMNS = ["booked_on", "cancelled_on", "arrival", "departure"]
OPEN_STATUS = {"Canceled": "cancelled", "No-Show": "no-show", "Check-Out": "checked-out"}
MONTHS = {
    m: i + 1
    for i, m in enumerate(
        [
            "January",
            "February",
            "March",
            "April",
            "May",
            "June",
            "July",
            "August",
            "September",
            "October",
            "November",
            "December",
        ]
    )
}


def step(name, start):
    print(f"step,{name},{time.perf_counter() - start:.3f}", file=sys.stderr, flush=True)


def parse_native(path):
    df = pd.read_csv(
        path, dtype=NATIVE_DTYPES, keep_default_na=False, na_values={"cancelled_on": [""]}
    )
    for c in DATE_COLUMNS:
        df[c] = pd.to_datetime(df[c], format="%Y-%m-%d")
    return df


def parse_open(path):
    raw = pd.read_csv(
        path,
        usecols=[
            "reservation_status",
            "reservation_status_date",
            "arrival_date_year",
            "arrival_date_month",
            "arrival_date_day_of_month",
            "stays_in_weekend_nights",
            "stays_in_week_nights",
            "lead_time",
            "reserved_room_type",
            "market_segment",
            "distribution_channel",
            "adr",
        ],
        keep_default_na=False,
    )
    arrival = pd.to_datetime(
        pd.DataFrame(
            {
                "year": raw["arrival_date_year"],
                "month": raw["arrival_date_month"].map(MONTHS),
                "day": raw["arrival_date_day_of_month"],
            }
        )
    )
    nights = raw["stays_in_weekend_nights"] + raw["stays_in_week_nights"]
    cancelled = raw["reservation_status"] == "Canceled"
    return pd.DataFrame(
        {
            "reservation_id": pd.RangeIndex(2, len(raw) + 2),  # the line number, as the profile
            "status": raw["reservation_status"].map(OPEN_STATUS).astype("category"),
            "booked_on": arrival - pd.to_timedelta(raw["lead_time"], unit="D"),
            "cancelled_on": pd.to_datetime(
                raw["reservation_status_date"].where(cancelled), format="%Y-%m-%d"
            ),
            "arrival": arrival,
            "departure": arrival + pd.to_timedelta(nights, unit="D"),
            "rooms": np.int32(1),
            "room_type": raw["reserved_room_type"].astype("category"),
            "segment": raw["market_segment"].astype("category"),
            "channel": raw["distribution_channel"].astype("category"),
            "rate": raw["adr"].astype("float64"),
        }
    )


def day_numbers(series, missing=NEVER):
    """Dates as int64 days since 1970-01-01; NaT -> `missing`."""
    days = series.values.astype("datetime64[D]").astype(np.int64)
    return np.where(series.isna().values, missing, days)


class Columns:
    """The few columns the computations need, as numpy day numbers."""

    def __init__(self, df):
        self.arrival = day_numbers(df["arrival"])
        self.departure = day_numbers(df["departure"])
        self.booked = day_numbers(df["booked_on"])
        self.cancelled = day_numbers(df["cancelled_on"])
        self.rooms = df["rooms"].values.astype(np.int64)
        rate_micros = df["rate"].values * 1e6
        # Round half away from zero, integer millionths: exact sums whatever the order.
        self.revenue = (np.sign(rate_micros) * np.floor(np.abs(rate_micros) + 0.5)).astype(
            np.int64
        ) * self.rooms
        cancelled = np.where(self.cancelled == NEVER, self.booked, self.cancelled)
        self.reading_date = int(np.max(np.maximum(self.booked, cancelled)))


def otb_grid(col, first, last, max_dba, as_of, revenue=True):
    """OTB(s, s - d) for nights first..last (rows) and d = 0..max_dba (columns), rooms and
    revenue in millionths; cells read after as_of are 0. A booking is on the books for night s on
    the leads d in [max(0, s - as_of, s - cancelled_on + 1), min(max_dba, s - booked_on)]: each
    such interval adds +rooms at its low end and -rooms past its high end of a difference array,
    summed along d."""
    keep = (
        (col.booked <= as_of)
        & (col.arrival <= last)
        & (col.departure > first)
        & (col.departure > col.arrival)
    )
    lo_night = np.maximum(col.arrival[keep], first)
    hi_night = np.minimum(col.departure[keep], last + 1)
    count = hi_night - lo_night
    owner = np.repeat(np.arange(count.size), count)  # one entry per (booking, night)
    starts = np.cumsum(count) - count
    night = lo_night[owner] + (np.arange(owner.size) - starts[owner])
    booked = col.booked[keep][owner]
    cancelled = col.cancelled[keep][owner]
    lo = np.maximum(np.maximum(0, night - as_of), night - cancelled + 1)
    hi = np.minimum(max_dba, night - booked)
    on = lo <= hi
    night, lo, hi, owner = night[on], lo[on], hi[on], owner[on]
    width = max_dba + 2  # one spare column for the -rooms past d = max_dba
    cells = (last - first + 1) * width
    row = (night - first) * width
    rooms = col.rooms[keep][owner].astype(np.float64)
    diff = np.bincount(row + lo, rooms, cells) - np.bincount(row + hi + 1, rooms, cells)
    otb = np.cumsum(np.rint(diff).astype(np.int64).reshape(-1, width), axis=1)[:, :-1]
    if not revenue:
        return otb, None
    # Float sums of integer millionths are exact below 2**53 (about 9e9 currency units per cell).
    money = col.revenue[keep][owner].astype(np.float64)
    diff = np.bincount(row + lo, money, cells) - np.bincount(row + hi + 1, money, cells)
    rev = np.cumsum(np.rint(diff).astype(np.int64).reshape(-1, width), axis=1)[:, :-1]
    return otb, rev


def curves(col, out_path):
    t0 = time.perf_counter()
    stays = col.departure > col.arrival
    first = int(col.arrival[stays].min())
    last = int(min(col.departure[stays].max() - 1, col.reading_date + MAX_DBA))
    as_of = col.reading_date
    rooms, rev = otb_grid(col, first, last, MAX_DBA, as_of)
    nights = np.arange(first, last + 1)
    dba = np.arange(MAX_DBA + 1)
    known = dba[None, :] >= (nights - as_of)[:, None]  # read on or before the reading date
    s_idx, d_idx = np.nonzero(known)  # row-major: by night, then by lead
    frame = pd.DataFrame(
        {
            "stay_date": (nights[s_idx]).astype("datetime64[D]"),
            "series": "ALL",
            "dba": d_idx,
            "otb_rooms": rooms[s_idx, d_idx],
            "otb_revenue": rev[s_idx, d_idx] / 1e6,
        }
    )
    step("curves.grid", t0)
    t1 = time.perf_counter()
    frame.to_csv(
        out_path or os.devnull,
        index=False,
        float_format="%.2f",
        date_format="%Y-%m-%d",
        lineterminator="\n",
    )
    step("curves.write", t1)
    step("curves", t0)


def backtest(col, date_from, date_to):
    t0 = time.perf_counter()
    as_of = col.reading_date
    t_from = int(np.datetime64(date_from, "D").astype(np.int64))
    t_to = int(np.datetime64(date_to, "D").astype(np.int64))
    first = int(col.arrival.min())  # the first night of the data, day uses included
    last = max(first, min(t_to + max(LEADS), as_of))
    # One column past the longest lead, so the cell at d = max(LEADS) is not a "or more" cell.
    rooms, _ = otb_grid(col, first, last, max(LEADS) + 1, as_of, revenue=False)
    final = rooms[:, 0]

    reading = np.arange(t_from, min(t_to, as_of - 1) + 1)
    leads = np.array(LEADS)
    t = np.repeat(reading, leads.size)
    h = np.tile(leads, reading.size)
    s = t + h
    ok = (s <= min(last, as_of)) & (s >= first)
    t, h, s = t[ok], h[ok], s[ok]
    # References: the newest night <= min(t, last) with the weekday of s, then a week at a time.
    latest = np.minimum(t, last)
    newest = latest - (latest - s) % 7
    r = newest[:, None] - 7 * np.arange(REFERENCES)[None, :]
    valid = r >= first
    ri = np.where(valid, r - first, 0)
    pickup = np.where(valid, final[ri] - rooms[ri, h[:, None]], 0)
    n = valid.sum(axis=1)
    has = n > 0
    mean_pickup = pickup.sum(axis=1)[has] / n[has]
    si = s[has] - first
    forecast = np.maximum(0.0, rooms[si, h[has]] + mean_pickup)
    rows = pd.DataFrame(
        {
            "stay_date": s[has].astype("datetime64[D]"),
            "reading_date": t[has].astype("datetime64[D]"),
            "h": h[has],
            "forecast": forecast,
            "final": final[si],
        }
    )
    rows["error"] = rows["forecast"] - rows["final"]
    rows["abs_error"] = rows["error"].abs()
    summary = rows.groupby("h").agg(
        count=("error", "size"), mae=("abs_error", "mean"), bias=("error", "mean")
    )
    step("backtest", t0)
    return summary, rows


def main():
    p = argparse.ArgumentParser(description=__doc__ or "pandas pipeline (see the header)")
    p.add_argument("csv", nargs="?", help="reservation CSV (not with --from-cache)")
    p.add_argument("--format", choices=["native", "open-data"], default="native")
    p.add_argument("--from", dest="date_from", required=True, help="first reading date")
    p.add_argument("--to", dest="date_to", required=True, help="last reading date")
    p.add_argument("--curves-out", help="write the curves CSV here (default: discarded)")
    p.add_argument("--detail-out", help="also write every backtest forecast as CSV here")
    p.add_argument("--save-cache", help="after parsing, pickle the parsed frame here")
    p.add_argument("--from-cache", help="load the parsed frame from this pickle, not the CSV")
    a = p.parse_args()
    if bool(a.csv) == bool(a.from_cache):
        p.error("give either a CSV or --from-cache")

    total = time.perf_counter()
    if a.from_cache:
        t0 = time.perf_counter()
        df = pd.read_pickle(a.from_cache)
        step("load-cache", t0)
    else:
        t0 = time.perf_counter()
        df = parse_native(a.csv) if a.format == "native" else parse_open(a.csv)
        step("parse", t0)
        if a.save_cache:
            t0 = time.perf_counter()
            df.to_pickle(a.save_cache)
            step("save-cache", t0)

    col = Columns(df)
    curves(col, a.curves_out)
    summary, rows = backtest(col, a.date_from, a.date_to)
    out = ["lead,count,mae,bias"]
    for lead, g in summary.iterrows():
        out.append(f"{lead},{int(g['count'])},{g['mae']!r},{g['bias']!r}")
    print("\n".join(out))
    if a.detail_out:
        rows[["stay_date", "reading_date", "h", "forecast", "final"]].to_csv(
            a.detail_out, index=False, float_format="%.2f", lineterminator="\n"
        )
    step("total", total)
    peak_kb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss  # kilobytes on Linux
    print(f"rss_mb,{peak_kb / 1024:.0f}", file=sys.stderr)


if __name__ == "__main__":
    main()
