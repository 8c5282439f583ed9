#!/usr/bin/python3
# Reference booking curves for tests/core/test_curvecube.cpp, computed independently of
# Curvebench's code (no import profile, no store, no cube) with pandas.
#
# Source data: the city-hotel half of the open "Hotel booking demand" dataset, Nuno Antonio,
# Ana de Almeida, Luis Nunes, "Hotel booking demand datasets", Data in Brief 22 (2019) 41-49,
# doi:10.1016/j.dib.2018.11.126, CC BY 4.0 (../shared/data/open/hotel_bookings_city.csv).
# Produced with Debian's /usr/bin/python3 and python3-pandas 1.5.3+dfsg-2:
#   /usr/bin/python3 tests/reference/open_city_curves.py > tests/reference/open_city_curves.csv
#
# Derivations, as in the shipped profile resources/profiles/hotel-bookings-open-data.json and
# the dataset's README (common practice, no source): arrival from year, English month name and
# day; departure = arrival + weekend nights + week nights (0 nights = day use, no night);
# booked_on = arrival - lead_time days; a row with reservation_status "Canceled" was cancelled
# on reservation_status_date (No-Show rows stay on the books); one room per row.
# OTB(s, t) (brief section 4) = rooms with booked_on <= t, arrival <= s < departure, and not
# cancelled on or before t. Output: stay_date,series,dba,otb_rooms for dba = 0..60, series ALL
# and every market_segment of the file (zeros included); by night, then ALL and the segments in
# code-point order, then dba.
import sys
from pathlib import Path

import pandas as pd

NIGHTS = ["2016-03-12", "2016-08-20", "2016-12-31", "2017-05-06"]
MAX_DBA = 60

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
        "segment": df["market_segment"],
    }
)
segments = sorted(rows["segment"].unique())

out = [
    "# OTB curves of the open Hotel booking demand dataset (city hotel): Antonio, de Almeida &",
    "# Nunes, Data in Brief 22 (2019) 41-49, doi:10.1016/j.dib.2018.11.126, CC BY 4.0.",
    f"# Written by tests/reference/open_city_curves.py with pandas {pd.__version__} (Debian's"
    " python3-pandas).",
    "stay_date,series,dba,otb_rooms",
]
for night_text in NIGHTS:
    night = pd.Timestamp(night_text)
    covering = rows[(rows["arrival"] <= night) & (night < rows["departure"])]
    for series in ["ALL"] + segments:
        part = covering if series == "ALL" else covering[covering["segment"] == series]
        for dba in range(MAX_DBA + 1):
            t = night - pd.Timedelta(days=dba)
            # A missing cancelled_on (NaT) compares False, so a booking never cancelled stays.
            on_books = (part["booked_on"] <= t) & ~(part["cancelled_on"] <= t)
            out.append(f"{night_text},{series},{dba},{int(on_books.sum())}")
print("\n".join(out))
