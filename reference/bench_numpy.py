#!/usr/bin/env python3
"""The loop analysis an engineer would write in numpy, timed on the designs scripts/bench.ts makes.

Per design: closed-form CCM averaged Gvd of the buck or boost with one capacitor branch
(docs/formulas.md §1.3 and §2.3; [published: Erickson & Maksimovic, Fundamentals of Power
Electronics, 2nd ed., ch. 8, from memory]), Gc = Zf/Zi from the op-amp parts, a dense 500-point
log sweep, numpy.unwrap for the phase, and a sign-change search with linear interpolation (in
log f) for the gain crossover and its phase margin.

Usage: python3 reference/bench_numpy.py designs.json results.json
designs.json: {"designs": [design document, ...]}; results.json gets {"msPerDesign" (wall),
"cpuMsPerDesign" (process CPU time), "results"}.
"""
from __future__ import annotations

import json
import sys
import time

import numpy as np

POINTS = 500


def plant_gvd(p: dict, s: np.ndarray) -> np.ndarray:
    vg, v = p["vin"], p["vout"]
    big_r = v / p["iout"]
    r = p["inductor"]["dcr"] + p.get("rdsOn", 0.0)
    l = p["inductor"]["l"]
    cap = p["capacitors"][0]
    c = cap["c"] * cap["count"]
    rc = cap["esr"] / cap["count"]
    if p["topology"] == "buck":
        den = l * c * (big_r + rc) * s**2 + (l + c * (big_r * r + big_r * rc + r * rc)) * s + big_r + r
        return vg * big_r * (1 + s * rc * c) / den
    dp = (vg * big_r + np.sqrt(vg**2 * big_r**2 - 4 * v**2 * big_r * r)) / (2 * v * big_r)
    den = l * c * (big_r + rc) * s**2 + (l + c * (big_r * r + rc * r + dp**2 * big_r * rc)) * s + dp**2 * big_r + r
    return vg * big_r * (1 + s * rc * c) * (dp**2 * big_r - r - s * l) / ((dp**2 * big_r + r) * den)


def compensator(doc: dict, s: np.ndarray) -> np.ndarray:
    q = doc["compensator"]["parts"]
    r1 = doc["feedback"]["r1"]
    zf = 1 / (1 / (q["r2"] + 1 / (s * q["c1"])) + s * q["c2"])
    zi = 1 / (1 / r1 + 1 / (q["r3"] + 1 / (s * q["c3"])))
    return zf / zi


def sweep(doc: dict) -> np.ndarray:
    sw = doc["sweep"]
    return np.logspace(np.log10(sw["startHz"]), np.log10(sw["stopHz"]), POINTS)


def analyse(doc: dict) -> dict:
    f = sweep(doc)
    s = 2j * np.pi * f
    return margins(f, compensator(doc, s) * plant_gvd(doc["plant"], s) / doc["modulator"]["vramp"])


def margins(f: np.ndarray, t: np.ndarray) -> dict:
    """Governing crossover, phase margin and gain margin of a sampled loop gain t(f)."""
    mag = 20 * np.log10(np.abs(t))
    ph = np.degrees(np.unwrap(np.angle(t)))
    lf = np.log10(f)
    idx = np.nonzero(np.diff(np.sign(mag)) != 0)[0]
    crossings = []
    for i in idx:
        x = mag[i] / (mag[i] - mag[i + 1])
        pm = 180 + ph[i] + x * (ph[i + 1] - ph[i])
        crossings.append((10 ** (lf[i] + x * (lf[i + 1] - lf[i])), (pm + 180) % 360 - 180))
    g = ph + 180
    jdx = np.nonzero(np.diff(np.sign(g)) != 0)[0]
    gms = [-(mag[j] + g[j] / (g[j] - g[j + 1]) * (mag[j + 1] - mag[j])) for j in jdx]
    # governing margins: smallest |PM| and smallest |GM dB| (python-control stability_margins convention, from memory)
    worst = min(crossings, key=lambda c: abs(c[1])) if crossings else (None, None)
    return {"crossoverHz": worst[0], "phaseMarginDeg": worst[1], "gainMarginDb": min(gms, key=abs) if gms else None}


def main(analyse=analyse):
    designs = json.load(open(sys.argv[1]))["designs"]
    # Wall time and this process's CPU time: on a shared machine the CPU time is what the
    # analysis itself costs; both are reported.
    t0 = time.perf_counter()
    c0 = time.process_time()
    results = [analyse(d) for d in designs]
    cpu = time.process_time() - c0
    elapsed = time.perf_counter() - t0
    out = {"msPerDesign": 1000 * elapsed / len(designs), "cpuMsPerDesign": 1000 * cpu / len(designs),
           "points": POINTS, "numpy": np.__version__, "python": sys.version.split()[0], "results": results}
    json.dump(out, open(sys.argv[2], "w"))


if __name__ == "__main__":
    main()
