#!/usr/bin/env python3
"""The peak current-mode loop analysis written directly in numpy, timed on the designs scripts/bench.ts makes.

Per design (the whole capacitor bank as its impedance, Type II from its parts): the CCM operating point with
conduction losses (docs/formulas.md §1.1, §2.1), the sensed slopes Sn, mc and Fm = 1/((Sn + Se)·Ts),
the feed-forward gain kr and He(s) = 1 − s·Ts/2 + s²·Ts²/π² [published: R. B. Ridley, IEEE Trans.
Power Electronics 1991, from memory], and the control-to-output response with the current loop
closed, Gvc = Fm·A/(Δ + Fm·Ri·He·E − Fm·kr·A) (docs/formulas.md §14.3), evaluated as complex
numbers on the dense 500-point sweep (no polynomial roots), then the same crossing search as
bench_numpy.py. The same computation as the engine's, written the way an engineer would in numpy.

Usage: python3 reference/bench_currentmode_numpy.py designs.json results.json
"""
from __future__ import annotations

import numpy as np

from bench_numpy import main, margins, sweep


def gvc(p: dict, m: dict, s: np.ndarray) -> np.ndarray:
    vg, v = p["vin"], p["vout"]
    big_r = v / p["iout"]
    r = p["inductor"]["dcr"] + p.get("rdsOn", 0.0)
    l = p["inductor"]["l"]
    ts = 1 / p["fsw"]
    # The bank's impedance Zc = Q/S: every term below is linear in Q and S, so dividing them all
    # by S leaves Zc in place of Q and 1 in place of S (any number of branches, with ESL).
    q = 1 / sum(b["count"] / (b["esr"] + s * b.get("esl", 0.0) + 1 / (s * b["c"])) for b in p["capacitors"])
    qrs = q + big_r
    ri, se = m["senseGain"], m.get("rampSlope", 0.0)
    if p["topology"] == "buck":
        d = v * (big_r + r) / (vg * big_r)
        ripple = v * (1 - d) * ts / l
        delta = (r + s * l) * qrs + big_r * q
        a = vg * big_r * q
        e = vg * qrs
        kr = ri * ts / (2 * l)
    else:
        dp = (vg * big_r + np.sqrt(vg**2 * big_r**2 - 4 * v**2 * big_r * r)) / (2 * v * big_r)
        d = 1 - dp
        il = v / (dp * big_r)
        ripple = vg * d * ts / l
        delta = (r + s * l) * qrs + dp**2 * big_r * q
        a = big_r * il * q * (dp**2 * big_r - r - s * l)
        e = v * qrs + dp * il * big_r * q
        kr = ri * dp**2 * ts / (2 * l)
    sn = ri * ripple / (d * ts)
    fm = 1 / ((sn + se) * ts)
    he = 1 - s * ts / 2 + (s * ts / np.pi) ** 2
    return fm * a / (delta + fm * ri * he * e - fm * kr * a)


def type2(doc: dict, s: np.ndarray) -> np.ndarray:
    q = doc["compensator"]["parts"]
    zf = 1 / (1 / (q["r2"] + 1 / (s * q["c1"])) + s * q["c2"])
    return zf / doc["feedback"]["r1"]


def analyse(doc: dict) -> dict:
    f = sweep(doc)
    s = 2j * np.pi * f
    return margins(f, type2(doc, s) * gvc(doc["plant"], doc["modulator"], s))


if __name__ == "__main__":
    main(analyse)
