"""The run's cells computed by pandas from the intake files: the baseline of `npm run bench`'s
end-to-end section (scripts/lib/bench-end-to-end.ts), run with Debian's /usr/bin/python3.

    bench-pandas-cells.py ROSTER.csv CASES.csv OUT.csv OUTCOMES_JSON COUNTED_STATUSES

OUTCOMES_JSON: [{"code": "BINJ", "lag": 0, "firstOnly": false}, ...]; COUNTED_STATUSES: a comma
list such as "confirmed". Writes one line per cell (outcome, month, site, exposure_group,
age_band, sex, hours, cases) and prints its timings as one JSON line.

The rule is the run's (worker/src/runs/cells-query.ts) for a store that holds these two files and
nothing else (one roster version, no superseded cases), in its simplest faithful form:

- a case counts when its status is counted; its month is the onset's month;
- first-event outcomes count only a worker's earliest counted case, and drop that worker's
  person-time of the months after it (the onset month stays whole);
- with an exposure lag L, the hours and group of roster month m count in month m + L, and a case
  in month c belongs to the worker's roster row of month c - L with hours > 0 (the most hours
  when there are several, then the lowest site code); months after the last roster month are cut;
- cells are outcome x month x site x group x age band x sex, where the age band is the 10-year
  band of (calendar year of the month - birth year); a cell is kept when it has hours or cases.

Hours are summed as integer hundredths, so the sums are exact, as PostgreSQL's numeric sums are.
"""

import json
import sys
import time

import numpy as np
import pandas as pd

KEYS = ["month", "site", "exposure_group", "birth_year", "sex"]


def month_index(text: pd.Series) -> pd.Series:
    """'YYYY-MM...' to year * 12 + month - 1, parsing each distinct value once."""
    codes, uniques = pd.factorize(text)
    u = pd.Series(uniques)
    values = (u.str.slice(0, 4).astype("int64") * 12 + u.str.slice(5, 7).astype("int64") - 1).to_numpy()
    return pd.Series(values[codes], index=text.index)


def main() -> None:
    roster_path, cases_path, out_path, outcomes_json, statuses = sys.argv[1:6]
    outcomes = json.loads(outcomes_json)
    counted_statuses = [s for s in statuses.split(",") if s]
    t0 = time.perf_counter()

    roster = pd.read_csv(
        roster_path,
        usecols=["worker_key", "site", "exposure_group", "month", "hours", "birth_year", "sex"],
        dtype={"worker_key": str, "site": str, "exposure_group": str, "month": str, "hours": "float64", "birth_year": "int64", "sex": str},
    )
    cases = pd.read_csv(cases_path, dtype=str)
    t_read = time.perf_counter()

    roster["month"] = month_index(roster["month"])
    roster["cents"] = np.rint(roster["hours"].to_numpy() * 100).astype("int64")
    last_month = int(roster["month"].max())
    # Person-time before any outcome: hours per month x site x group x birth year x sex.
    base = roster.groupby(KEYS, sort=False, observed=True)["cents"].sum().reset_index()
    # The row a case belongs to: per worker and month, the row with hours, most hours first.
    attributing = (
        roster[roster["cents"] > 0]
        .sort_values(["cents", "site"], ascending=[False, True], kind="stable")
        .drop_duplicates(["worker_key", "month"])
        [["worker_key", "month", "site", "exposure_group", "birth_year", "sex"]]
    )
    counted = cases[cases["status"].isin(counted_statuses)].copy()
    counted["month"] = month_index(counted["onset_date"])

    parts = []
    for o in outcomes:
        lag = int(o["lag"])
        mine = counted[counted["outcome"] == o["code"]]
        if o["firstOnly"]:
            first = mine.groupby("worker_key", sort=False)["month"].min().reset_index()
            case_counts = first.assign(n=1)
        else:
            case_counts = mine.groupby(["worker_key", "month"], sort=False).size().rename("n").reset_index()
        # Cases at their own month, in the group and site of the roster row L months earlier.
        case_counts = case_counts[case_counts["month"] <= last_month]
        with_row = case_counts.assign(roster_month=case_counts["month"] - lag).merge(
            attributing.rename(columns={"month": "roster_month"}), on=["worker_key", "roster_month"], how="inner"
        )
        case_cells = with_row.groupby(KEYS, sort=False, observed=True)["n"].sum().rename("cases").reset_index()

        pt = base.assign(month=base["month"] + lag)
        pt = pt[pt["month"] <= last_month]
        pieces = [pt.assign(cases=0)]
        if o["firstOnly"]:
            # Person-time after each worker's first case leaves the at-risk time.
            after = roster[["worker_key", "month", "site", "exposure_group", "birth_year", "sex", "cents"]].merge(
                first.rename(columns={"month": "first_month"}), on="worker_key", how="inner"
            )
            after = after.assign(month=after["month"] + lag)
            after = after[(after["month"] > after["first_month"]) & (after["month"] <= last_month)]
            removed = after.groupby(KEYS, sort=False, observed=True)["cents"].sum().reset_index()
            pieces.append(removed.assign(cents=-removed["cents"], cases=0))
        pieces.append(case_cells.assign(cents=0))
        both = pd.concat(pieces, ignore_index=True)
        year = both["month"] // 12
        both["age_band"] = ((year - both["birth_year"]) // 10) * 10
        cells = both.groupby(["month", "site", "exposure_group", "age_band", "sex"], sort=False, observed=True)[["cents", "cases"]].sum().reset_index()
        cells = cells[(cells["cents"] > 0) | (cells["cases"] > 0)]
        parts.append(cells.assign(outcome=o["code"]))
    cells = pd.concat(parts, ignore_index=True)
    t_aggregate = time.perf_counter()

    month = cells["month"]
    out = pd.DataFrame(
        {
            "outcome": cells["outcome"],
            "month": (month // 12).astype(str) + "-" + (month % 12 + 1).astype(str).str.zfill(2),
            "site": cells["site"],
            "exposure_group": cells["exposure_group"],
            "age_band": cells["age_band"],
            "sex": cells["sex"],
            "hours": (cells["cents"] // 100).astype(str) + "." + (cells["cents"] % 100).astype(str).str.zfill(2),
            "cases": cells["cases"],
        }
    )
    out.to_csv(out_path, index=False)
    t_write = time.perf_counter()
    print(json.dumps({
        "cells": len(out),
        "readSeconds": round(t_read - t0, 3),
        "aggregateSeconds": round(t_aggregate - t_read, 3),
        "writeSeconds": round(t_write - t_aggregate, 3),
    }))


if __name__ == "__main__":
    main()
