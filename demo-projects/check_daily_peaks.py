#!/usr/bin/env python3
"""Reads an `offtake run` results folder and prints, per canal, what a canal
operator checks first (issue 11's measures):

- largest daily flow / largest 10-day mean flow (all flows are 24-hour means);
- median over complete irrigation years of (yearly peak 10-day mean flow /
  yearly peak monthly mean flow).

Irrigation years start in the month given (default 6, the demo's); only
years wholly inside the record count. Usage: check_daily_peaks.py DIR [MONTH]
"""
import csv, sys, statistics, collections, datetime

d = sys.argv[1]
m0 = int(sys.argv[2]) if len(sys.argv) > 2 else 6

def year_of(date):
    return date.year if date.month >= m0 else date.year - 1

daily = collections.defaultdict(float)
first = last = None
for r in csv.DictReader(open(f"{d}/node_demand_daily.csv")):
    dt = datetime.date.fromisoformat(r["date"])
    daily[r["node"]] = max(daily[r["node"]], float(r["demand_ls"]))
    first = dt if first is None or dt < first else first
    last = dt if last is None or dt > last else last
complete = {y for y in range(first.year - 1, last.year + 1)
            if datetime.date(y, m0, 1) >= first and datetime.date(y + 1, m0, 1) - datetime.timedelta(days=1) <= last}

def peaks(name):
    per = collections.defaultdict(lambda: collections.defaultdict(float))
    for r in csv.DictReader(open(f"{d}/{name}")):
        dt = datetime.date.fromisoformat(r["period_start"])
        y = year_of(dt)
        per[r["node"]][y] = max(per[r["node"]][y], float(r["mean_flow_ls"]))
    return per

p10 = peaks("demand_10day.csv")
pm = peaks("demand_monthly.csv")
print(f"{'node':14} {'daily max':>10} {'10-day max':>10} {'ratio':>6} {'median pk10/pkM':>16}")
for node in p10:
    mx10 = max(p10[node].values())
    ratios = [p10[node][y] / pm[node][y] for y in sorted(complete) if pm[node].get(y, 0) > 0]
    med = statistics.median(ratios) if ratios else float("nan")
    print(f"{node:14} {daily[node]:10.0f} {mx10:10.0f} {daily[node] / mx10 if mx10 else 0:6.2f} {med:16.2f}")
