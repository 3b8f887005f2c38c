#!/usr/bin/env python3
"""Check the committed IEC 60063 lists (e*.txt, integer mantissas) against the geometric formula.

Run from the repository root: python3 reference/e-series/check_eseries.py
Exits non-zero if any list disagrees with the formula outside the documented exceptions,
if a subset relation fails, or if the E24/E96 overlap differs from the known set.
"""
import math
import pathlib
import sys

HERE = pathlib.Path(__file__).resolve().parent
SERIES = [3, 6, 12, 24, 48, 96, 192]

# Documented departures of IEC 60063 from round(10^(i/n)): index -> standard value (integer mantissa).
# E3..E24 keep the historical values; E192 has the single 9.20 exception.
HISTORICAL_E24 = {27: 26, 30: 29, 33: 32, 36: 35, 39: 38, 43: 42, 47: 46, 82: 83}  # standard: formula


def load(n):
    return [int(line) for line in (HERE / f"e{n}.txt").read_text().split()]


def formula(n):
    digits = 2 if n <= 24 else 3
    scale = 10 ** (digits - 1)
    return [int(math.floor(10 ** (i / n) * scale + 0.5)) for i in range(n)]


def main():
    problems = []
    tables = {n: load(n) for n in SERIES}
    for n, values in tables.items():
        if len(values) != n:
            problems.append(f"E{n}: {len(values)} values, expected {n}")
            continue
        if values != sorted(values) or len(set(values)) != n:
            problems.append(f"E{n}: not strictly increasing")
        for i, (std, geo) in enumerate(zip(values, formula(n))):
            if std == geo:
                continue
            if n <= 24 and HISTORICAL_E24.get(std) == geo:
                continue
            if n == 192 and i == 185 and std == 920 and geo == 919:
                continue
            problems.append(f"E{n}[{i}]: list {std}, formula {geo}")
    for small, big in [(3, 6), (6, 12), (12, 24), (48, 96), (96, 192)]:
        if not set(tables[small]) <= set(tables[big]):
            problems.append(f"E{small} not a subset of E{big}")
    overlap = sorted(v for v in tables[24] if v * 10 in set(tables[96]))
    if overlap != [10, 11, 13, 15, 20, 75]:
        problems.append(f"E24 ∩ E96 = {overlap}, expected 1.0 1.1 1.3 1.5 2.0 7.5")
    for p in problems:
        print(p)
    print("ok" if not problems else f"{len(problems)} problem(s)")
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main())
