#!/usr/bin/env python3
"""Monte Carlo loop margins the way an engineer would compute them in numpy, timed for scripts/bench-spread.ts.

Input: the part values of every sample, exported from the engine's own sampler, so both sides analyse
the same designs. Per sample the loop gain T = Gc * Fm * Gvd * exp(-s*Td) is written out from the
averaged CCM models with one output-capacitor branch (docs/formulas.md: buck §1.1-1.3, boost §2.1-2.3,
switch resistance lumped into r §1.4/§2.4 with equal switches; [published: Erickson & Maksimovic,
Fundamentals of Power Electronics, 2nd ed., ch. 7-8, from memory]), the PWM gain Fm = 1/VM with
optional feed-forward (§3), and Gc = Zf/Zi of the op-amp Type I/II/III networks (§5.1-5.3). It is
evaluated on a dense 500-point log sweep; crossings are sign changes with linear interpolation in
log f; PM = 180 deg + phase (reduced to (-180, 180]) at the crossing with the smallest PM; GM = the
smallest positive -|T|dB where the unwrapped phase crosses -180 + k*360 deg.

Two timings: a plain loop over the samples (the reference of the engine bench) and numpy broadcasts
over blocks of 200 samples (what a numpy user might write for a Monte Carlo).

Usage: python3 reference/bench_spread_numpy.py samples.json results.json
samples.json: {"cases": [{"name", "topology", "kind", "points", "targets", "samples": [{...}, ...]}]}
results.json: {"numpy", "python", "cases": [{"name", "msPerSample", "msPerSampleBroadcast", "results", "yield"}]}
"""
from __future__ import annotations

import json
import sys
import time

import numpy as np

BLOCK = 200  # samples per broadcast block


# ---- models (§1-§5), written for arrays so the same code serves one sample or all of them ----

def power_stage_gvd(topology: str, p: dict, s):
    """Control-to-output Gvd(s) of the averaged CCM buck or boost, one capacitor branch."""
    vg, v = p["vin"], p["vout"]
    big_r = v / p["iout"]
    r = p["dcr"] + p["rdsOn"]            # DCR + switch resistance (equal synchronous switches)
    l = p["l"]
    c = p["c"] * p["count"]              # `count` parts in parallel
    rc = p["esr"] / p["count"]
    esr_zero = 1 + s * rc * c
    if topology == "buck":
        a2 = l * c * (big_r + rc)
        a1 = l + c * (big_r * r + big_r * rc + r * rc)
        a0 = big_r + r
        return vg * big_r * esr_zero / (a2 * s**2 + a1 * s + a0)
    # boost: D' on the normal (larger) root of the DC-transformer relation with r (§2.1)
    dp = (vg * big_r + np.sqrt(vg**2 * big_r**2 - 4 * v**2 * big_r * r)) / (2 * v * big_r)
    b2 = l * c * (big_r + rc)
    b1 = l + c * (big_r * r + rc * r + dp**2 * big_r * rc)
    b0 = dp**2 * big_r + r
    rhp = dp**2 * big_r - r - s * l
    return vg * big_r * esr_zero * rhp / ((dp**2 * big_r + r) * (b2 * s**2 + b1 * s + b0))


def compensator_gc(kind: str, p: dict, s):
    """Gc = Zf/Zi of the inverting op-amp network (ideal op-amp; inversion left out, §0)."""
    if kind == "type1":
        return 1 / (s * p["c1"] * p["r1"])
    zf = 1 / (1 / (p["r2"] + 1 / (s * p["c1"])) + s * p["c2"])
    if kind == "type2":
        return zf / p["r1"]
    zi = 1 / (1 / p["r1"] + 1 / (p["r3"] + 1 / (s * p["c3"])))
    return zf / zi


def modulator_fm(p: dict):
    """Fm = 1/VM; with feed-forward the ramp scales with Vin from its value at the nominal Vin (§3)."""
    vm = p["vramp"] * np.where(p["feedForward"], p["vin"] / p["vinNominal"], 1.0)
    return 1 / vm


def loop_gain(case: dict, p: dict, s):
    t = compensator_gc(case["kind"], p, s) * modulator_fm(p) * power_stage_gvd(case["topology"], p, s)
    return t * np.exp(-s * p["delayS"])


# ---- one sample at a time ----

def margins(f: np.ndarray, t: np.ndarray) -> tuple:
    mag = 20 * np.log10(np.abs(t))
    ph = np.degrees(np.unwrap(np.angle(t)))
    lf = np.log10(f)
    best = (None, None)
    for i in np.flatnonzero(np.signbit(mag[:-1]) != np.signbit(mag[1:])):
        x = mag[i] / (mag[i] - mag[i + 1])
        pm = (180 + ph[i] + x * (ph[i + 1] - ph[i]) + 180) % 360 - 180
        pm = 180.0 if pm == -180 else pm
        # governing crossing: smallest |PM| (python-control stability_margins convention, from memory)
        if best[1] is None or abs(pm) < abs(best[1]):
            best = (10 ** (lf[i] + x * (lf[i + 1] - lf[i])), pm)
    # phase crossovers: the integer index of the -180 + k*360 line changes between neighbours
    k = np.floor((ph + 180) / 360)
    gm = None
    for j in np.flatnonzero(k[:-1] != k[1:]):
        line = 360 * max(k[j], k[j + 1]) - 180
        x = (ph[j] - line) / (ph[j] - ph[j + 1])
        g = -(mag[j] + x * (mag[j + 1] - mag[j]))
        if gm is None or abs(g) < abs(gm):
            gm = g
    return best[0], best[1], gm


def analyse_loop(case: dict) -> dict:
    lo, hi = case["rangeHz"]
    f = np.logspace(np.log10(lo), np.log10(hi), case["points"])
    s = 2j * np.pi * f
    fc, pm, gm = [], [], []
    for p in case["samples"]:
        a, b, c = margins(f, loop_gain(case, p, s))
        fc.append(a)
        pm.append(b)
        gm.append(c)
    return {"crossoverHz": fc, "phaseMarginDeg": pm, "gainMarginDb": gm}


# ---- all samples in one broadcast ----

def analyse_broadcast(case: dict) -> dict:
    lo, hi = case["rangeHz"]
    f = np.logspace(np.log10(lo), np.log10(hi), case["points"])
    s = (2j * np.pi * f)[None, :]
    keys = case["samples"][0].keys()
    p = {k: np.array([q[k] for q in case["samples"]])[:, None] for k in keys}
    t = loop_gain(case, p, s)
    n = t.shape[0]
    mag = 20 * np.log10(np.abs(t))
    ph = np.degrees(np.unwrap(np.angle(t), axis=1))
    lf = np.log10(f)
    rows, i = np.nonzero(np.signbit(mag[:, :-1]) != np.signbit(mag[:, 1:]))
    x = mag[rows, i] / (mag[rows, i] - mag[rows, i + 1])
    pm = (180 + ph[rows, i] + x * (ph[rows, i + 1] - ph[rows, i]) + 180) % 360 - 180
    pm[pm == -180] = 180.0
    fc = 10 ** (lf[i] + x * (lf[i + 1] - lf[i]))
    # governing crossing per sample: smallest |PM| (python-control stability_margins convention, from memory)
    best_abs = np.full(n, np.inf)
    np.minimum.at(best_abs, rows, np.abs(pm))
    pick = np.abs(pm) == best_abs[rows]
    best_pm = np.full(n, np.inf)
    best_pm[rows[pick]] = pm[pick]
    best_fc = np.full(n, np.nan)
    best_fc[rows[pick]] = fc[pick]
    k = np.floor((ph + 180) / 360)
    rj, j = np.nonzero(k[:, :-1] != k[:, 1:])
    line = 360 * np.maximum(k[rj, j], k[rj, j + 1]) - 180
    y = (ph[rj, j] - line) / (ph[rj, j] - ph[rj, j + 1])
    g = -(mag[rj, j] + y * (mag[rj, j + 1] - mag[rj, j]))
    # governing phase crossing per sample: smallest |GM dB|
    gm_abs = np.full(n, np.inf)
    np.minimum.at(gm_abs, rj, np.abs(g))
    take = np.abs(g) == gm_abs[rj]
    best_gm = np.full(n, np.inf)
    best_gm[rj[take]] = g[take]
    none = lambda a: [None if not np.isfinite(v) else float(v) for v in a]
    return {"crossoverHz": none(best_fc), "phaseMarginDeg": none(best_pm), "gainMarginDb": none(best_gm)}


def analyse_blocks(case: dict) -> dict:
    """The broadcast in blocks of BLOCK samples: one 10 000 x 500 complex broadcast is memory-bound
    (every temporary is 80 MB) and measured slower than the plain loop."""
    out = {"crossoverHz": [], "phaseMarginDeg": [], "gainMarginDb": []}
    samples = case["samples"]
    for i in range(0, len(samples), BLOCK):
        part = analyse_broadcast({**case, "samples": samples[i:i + BLOCK]})
        for k in out:
            out[k] += part[k]
    return out


def yield_of(case: dict, res: dict) -> float:
    tg = case["targets"]
    ok = [pm is not None and pm >= tg["phaseMarginDeg"] and gm is not None and gm >= tg["gainMarginDb"]
          for pm, gm in zip(res["phaseMarginDeg"], res["gainMarginDb"])]
    return sum(ok) / len(ok)


def main():
    cases = json.load(open(sys.argv[1]))["cases"]
    out = []
    for case in cases:
        n = len(case["samples"])
        t0 = time.perf_counter()
        res = analyse_loop(case)
        loop_s = time.perf_counter() - t0
        t0 = time.perf_counter()
        bro = analyse_blocks(case)
        broadcast_s = time.perf_counter() - t0
        # The two numpy versions must agree; the bench reports the largest PM difference between them.
        both = [(a, b) for a, b in zip(res["phaseMarginDeg"], bro["phaseMarginDeg"]) if a is not None and b is not None]
        out.append({
            "name": case["name"],
            "msPerSample": 1000 * loop_s / n,
            "msPerSampleBroadcast": 1000 * broadcast_s / n,
            "broadcastPmDiffDeg": max((abs(a - b) for a, b in both), default=0.0),
            "results": res,
            "yield": yield_of(case, res),
        })
    json.dump({"numpy": np.__version__, "python": sys.version.split()[0], "cases": out}, open(sys.argv[2], "w"))


if __name__ == "__main__":
    main()
