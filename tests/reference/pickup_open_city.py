#!/usr/bin/python3
# Reference classical additive pickup forecasts for tests/core/test_pickupmethods.cpp, computed
# independently of Curvebench's code (no import profile, no store, no cube) with pandas.
#
# Source data: the city-hotel half of the open "Hotel booking demand" dataset, Nuno Antonio,
# Ana de Almeida, Luis Nunes, "Hotel booking demand datasets", Data in Brief 22 (2019) 41-49,
# doi:10.1016/j.dib.2018.11.126, CC BY 4.0 (../shared/data/open/hotel_bookings_city.csv).
# Produced with Debian's /usr/bin/python3 and python3-pandas 1.5.3+dfsg-2:
#   /usr/bin/python3 tests/reference/pickup_open_city.py > tests/reference/pickup_open_city.csv
#
# Row derivations, as in the shipped profile resources/profiles/hotel-bookings-open-data.json
# (common practice, no source): arrival from year, English month name and day; departure =
# arrival + weekend nights + week nights (0 nights = day use, no night); booked_on = arrival -
# lead_time days; a row with reservation_status "Canceled" was cancelled on
# reservation_status_date (No-Show rows stay on the books); one room per row.
# OTB(s, x) (brief section 4) = rooms with booked_on <= x, arrival <= s < departure, not cancelled
# on or before x; Final(s) = OTB(s, s).
# Classical additive pickup (brief section 5), total of the hotel: for reading date t and lead h,
# s = t + h and F = OTB(s, t) + mean_r [Final(r) - OTB(r, r - h)] over the 8 most recent nights r
# with the weekday of s and r <= t.
# Output: reading_date,h,stay_date,otb,references,mean_pickup,forecast.
import sys
from pathlib import Path

import pandas as pd

READING_DATES = ["2016-02-10", "2016-06-15", "2016-10-05", "2017-03-22"]
LEADS = [1, 3, 7, 14, 30, 60, 90]
REFERENCES = 8

here = Path(__file__).resolve().parent
default_csv = here.parents[2] / "shared" / "data" / "open" / "hotel_bookings_city.csv"
csv = Path(sys.argv[1]) if len(sys.argv) > 1 else default_csv

df = pd.read_csv(csv, keep_default_na=False, low_memory=False)
arrival = pd.to_datetime(
    df["arrival_date_year"].astype(str)
    + "-"
    + df["arrival_date_month"]
    + "-"
    + df["arrival_date_day_of_month"].astype(str),
    format="%Y-%B-%d",
)
nights = df["stays_in_weekend_nights"] + df["stays_in_week_nights"]
rows = pd.DataFrame(
    {
        "arrival": arrival,
        "departure": arrival + pd.to_timedelta(nights, unit="D"),
        "booked_on": arrival - pd.to_timedelta(df["lead_time"], unit="D"),
        "cancelled_on": pd.to_datetime(
            df["reservation_status_date"].where(df["reservation_status"] == "Canceled"),
            format="%Y-%m-%d",
        ),
    }
)


def otb(night, reading):
    covering = rows[(rows["arrival"] <= night) & (night < rows["departure"])]
    # A missing cancelled_on (NaT) compares False, so a booking never cancelled stays.
    on_books = (covering["booked_on"] <= reading) & ~(covering["cancelled_on"] <= reading)
    return int(on_books.sum())


out = [
    "# Classical additive pickup forecasts, total, of the open Hotel booking demand dataset (city",
    "# hotel): Antonio, de Almeida & Nunes, Data in Brief 22 (2019) 41-49,",
    "# doi:10.1016/j.dib.2018.11.126, CC BY 4.0.",
    f"# Written by tests/reference/pickup_open_city.py with pandas {pd.__version__} (Debian's"
    " python3-pandas).",
    "reading_date,h,stay_date,otb,references,mean_pickup,forecast",
]
for t_text in READING_DATES:
    t = pd.Timestamp(t_text)
    for h in LEADS:
        s = t + pd.Timedelta(days=h)
        # Same weekday as s, on or before t: step back from t to that weekday, then by weeks.
        newest = t - pd.Timedelta(days=(t.dayofweek - s.dayofweek) % 7)
        refs = [newest - pd.Timedelta(weeks=k) for k in range(REFERENCES)]
        pickups = [otb(r, r) - otb(r, r - pd.Timedelta(days=h)) for r in refs]
        mean_pickup = sum(pickups) / len(pickups)
        now = otb(s, t)
        out.append(
            f"{t_text},{h},{s.date()},{now},{' '.join(str(r.date()) for r in refs)},"
            f"{mean_pickup!r},{max(0.0, now + mean_pickup)!r}"
        )
print("\n".join(out))
