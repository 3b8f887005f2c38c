#!/usr/bin/env python3
"""
Independent reference for the governing-margin rule (DEVELOPERS.md, "Verdict rules").

Builds random loop gains with several gain crossings, conditional phase boosts, lightly damped
resonances, RHP zeros and delays, evaluates T(jw) on a dense log grid with plain numpy complex
arithmetic (no engine code, no closed forms), finds every gain crossing (sign change of ln|T|)
and every phase crossing (the numerically unwrapped phase crossing -180 deg + k*360 deg), refines
each by bisection on the complex evaluation, and applies the rule of python-control's
`stability_margins` (from memory): the headline PM is the crossing with the smallest |PM|, the
headline GM the phase crossing with the smallest |GM dB|.

Cases whose two smallest |PM| (or |GM|) are within 1 deg (1 dB) of each other are skipped: the
rule is ambiguous there and a tiny numerical difference could pick another crossing.

Usage: python3 reference/margins/generate.py [--out DIR] [--cases N] [--seed S]
Writes DIR/cases.json (default reference/margins/out).
"""
import argparse
import json
import os
import sys

import numpy as np

TWO_PI = 2 * np.pi


def factor(s, root):
    """(1 + s/w) for a real root, 1 + s/(q w0) + s^2/w0^2 for a pair (w < 0 or q < 0 = RHP)."""
    if root["kind"] == "real":
        return 1 + s / root["omega"]
    w0, q = root["omega0"], root["q"]
    return 1 + s / (q * w0) + (s / w0) ** 2


def evaluate(loop, f):
    s = 1j * TWO_PI * np.asarray(f, dtype=float)
    t = loop["gain"] * s ** loop["originPower"] * np.exp(-s * loop.get("delayS", 0.0))
    for z in loop["zeros"]:
        t = t * factor(s, z)
    for p in loop["poles"]:
        t = t / factor(s, p)
    return t


def reduce_deg(x):
    y = x - 360 * np.floor((x + 180) / 360)
    return y + 360 if y <= -180 else y


def bisect(fun, a, b, fa, iters=80):
    """Root of fun on [a, b] in log f (fun(a) = fa has the other sign from fun(b))."""
    for _ in range(iters):
        m = np.sqrt(a * b)
        fm = fun(m)
        if (fm >= 0) == (fa >= 0):
            a, fa = m, fm
        else:
            b = m
    return np.sqrt(a * b)


def margins(loop, start_hz, stop_hz, per_decade=4000):
    n = int(np.ceil(np.log10(stop_hz / start_hz) * per_decade)) + 1
    f = np.logspace(np.log10(start_hz), np.log10(stop_hz), n)
    t = evaluate(loop, f)
    lnmag = np.log(np.abs(t))
    phase = np.degrees(np.unwrap(np.angle(t)))
    # the unwrapped phase is known up to 360 deg; both margins are taken modulo 360 deg

    def phase_at(x, i):
        # the principal angle nearest the dense-grid phase at the bracket
        p = np.degrees(np.angle(evaluate(loop, [x])[0]))
        return p + 360 * np.round((phase[i] - p) / 360)

    crossings = []
    above = lnmag >= 0
    for i in np.nonzero(above[1:] != above[:-1])[0] + 1:
        fc = bisect(lambda x: np.log(np.abs(evaluate(loop, [x])[0])), f[i - 1], f[i], lnmag[i - 1])
        crossings.append({"freqHz": float(fc), "phaseMarginDeg": float(reduce_deg(180 + phase_at(fc, i)))})
    phase_crossings = []
    band = np.floor((phase + 180) / 360)
    for i in np.nonzero((np.diff(band) != 0) | (np.mod(phase[1:] + 180, 360) == 0))[0] + 1:
        lo, hi = sorted((phase[i - 1], phase[i]))
        for k in range(int(np.ceil((lo + 180) / 360)), int(np.floor((hi + 180) / 360)) + 1):
            line = -180 + 360 * k
            if phase[i - 1] == line:
                continue
            g = lambda x, i=i, line=line: phase_at(x, i) - line
            fp = bisect(g, f[i - 1], f[i], phase[i - 1] - line)
            gm = -20 * np.log10(np.abs(evaluate(loop, [fp])[0]))
            phase_crossings.append({"freqHz": float(fp), "gainMarginDb": float(gm)})
    # where the dense grid stops resolving the phase (a long delay turns it faster than 90 deg per
    # step at high frequency), phase crossings can be missed: report only those below that point
    fast = np.nonzero(np.abs(np.diff(phase)) > 90)[0]
    resolved_hz = float(f[fast[0]]) if len(fast) else float(stop_hz)
    phase_crossings = [p for p in phase_crossings if p["freqHz"] < resolved_hz]
    return crossings, phase_crossings, resolved_hz


def governing(items, key):
    """The smallest |key| and how far the runner-up is from it (inf with one item)."""
    if not items:
        return None, np.inf
    ordered = sorted(items, key=lambda x: abs(x[key]))
    gap = abs(ordered[1][key]) - abs(ordered[0][key]) if len(ordered) > 1 else np.inf
    return ordered[0], gap


def random_loop(rng):
    """One of five families that give several crossings or conditional stability."""
    family = rng.integers(5)
    wc = TWO_PI * 10 ** rng.uniform(2.5, 4.5)
    zeros, poles = [], []
    origin = -1
    delay = 0.0
    if family == 0:  # conditional boost: K (1 + s/wz)^2 / (s^3 (1 + s/wp)^2)
        origin = -3
        wz = wc / 10 ** rng.uniform(0.3, 1.2)
        wp = wc * 10 ** rng.uniform(0.3, 1.2)
        zeros += [{"kind": "real", "omega": wz}] * 2
        poles += [{"kind": "real", "omega": wp}] * 2
        gain = wc * wz ** 2 * 10 ** rng.uniform(-0.6, 0.6)  # |T(j wc)| ~ 1 before the random factor
    elif family == 1:  # integrator with a resonance poking above 0 dB
        w0 = wc * 10 ** rng.uniform(0.4, 1.3)
        q = 10 ** rng.uniform(0.6, 1.4)
        poles.append({"kind": "pair", "omega0": w0, "q": q})
        gain = wc
        if rng.random() < 0.5:
            poles.append({"kind": "real", "omega": w0 * 10 ** rng.uniform(0.3, 1)})
    elif family == 2:  # integrator with a delay: many phase crossings
        gain = wc
        delay = float(10 ** rng.uniform(-0.3, 0.6) / wc)
        if rng.random() < 0.5:
            zeros.append({"kind": "real", "omega": wc / 10 ** rng.uniform(0.3, 1)})
            poles.append({"kind": "real", "omega": wc * 10 ** rng.uniform(0.3, 1)})
    elif family == 3:  # LC plant (pair) with a Type III-like boost and an optional RHP zero
        w0 = wc / 10 ** rng.uniform(0.2, 1.0)
        q = 10 ** rng.uniform(0.3, 1.2)
        origin = -1
        zeros += [{"kind": "real", "omega": w0 * 10 ** rng.uniform(-0.3, 0.3)}, {"kind": "real", "omega": w0 * 10 ** rng.uniform(-0.3, 0.3)}]
        poles += [{"kind": "pair", "omega0": w0, "q": q}, {"kind": "real", "omega": wc * 10 ** rng.uniform(0.3, 1)}, {"kind": "real", "omega": wc * 10 ** rng.uniform(0.5, 1.5)}]
        if rng.random() < 0.4:
            zeros.append({"kind": "real", "omega": -wc * 10 ** rng.uniform(0.5, 1.5)})
        gain = wc * 10 ** rng.uniform(-0.4, 0.4)
    else:  # boost-like: LC pair, a low zero pair, a resonance above, and a small delay
        w0 = wc / 10 ** rng.uniform(0.1, 0.6)
        zeros += [{"kind": "real", "omega": w0 / 10 ** rng.uniform(0.5, 1.2)}] * 2
        poles += [{"kind": "pair", "omega0": w0, "q": 10 ** rng.uniform(0.5, 1.3)}, {"kind": "real", "omega": wc * 10 ** rng.uniform(0.5, 1.5)}]
        gain = wc * 10 ** rng.uniform(-0.5, 0.5)
        delay = float(10 ** rng.uniform(-2, -0.8) / wc)
    return {"gain": float(gain), "originPower": int(origin), "zeros": zeros, "poles": poles, "delayS": delay}, int(family)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "out"))
    ap.add_argument("--cases", type=int, default=60)
    ap.add_argument("--seed", type=int, default=20261202)
    args = ap.parse_args()
    rng = np.random.default_rng(args.seed)
    cases = []
    tried = 0
    quota = int(np.ceil(args.cases / 5))
    per_family = [0] * 5
    rejected = {}
    while len(cases) < args.cases and tried < 100 * args.cases:
        tried += 1
        loop, family = random_loop(rng)
        if per_family[family] >= quota:
            continue
        start_hz, stop_hz = 1.0, 1e7
        crossings, phase_crossings, resolved_hz = margins(loop, start_hz, stop_hz)
        pm, pm_gap = governing(crossings, "phaseMarginDeg")
        gm, gm_gap = governing(phase_crossings, "gainMarginDb")
        why = None
        if pm is None or pm_gap < 1 or gm_gap < 1:
            why = "ambiguous or no crossing"
        # keep the interesting ones: several crossings, or a phase crossing with |T| > 1
        elif len(crossings) < 2 and not any(p["gainMarginDb"] < 0 for p in phase_crossings):
            why = "single plain crossing"
        # crossings near the ends of the range (a delay's phase crossings go on for ever: only the
        # gain crossings and the governing phase crossing must be inside)
        elif any(x["freqHz"] < 2 * start_hz or x["freqHz"] > min(stop_hz, resolved_hz) / 2 for x in crossings + ([gm] if gm else [])):
            why = "crossing at the range edge"
        if why:
            rejected[why] = rejected.get(why, 0) + 1
            continue
        per_family[family] += 1
        cases.append({
            "family": family,
            "loop": loop,
            "rangeHz": {"startHz": start_hz, "stopHz": stop_hz},
            "crossovers": crossings,
            "phaseCrossovers": phase_crossings,
            "phaseResolvedToHz": resolved_hz,
            "crossoverHz": pm["freqHz"],
            "phaseMarginDeg": pm["phaseMarginDeg"],
            "gainMarginDb": gm["gainMarginDb"] if gm else None,
            "phaseCrossoverHz": gm["freqHz"] if gm else None,
        })
    os.makedirs(args.out, exist_ok=True)
    out = {
        "generator": "reference/margins/generate.py",
        "rule": "headline PM = smallest |PM| over gain crossings; headline GM = smallest |GM dB| over phase crossings (python-control stability_margins convention, from memory)",
        "python": sys.version.split()[0],
        "numpy": np.__version__,
        "seed": args.seed,
        "cases": cases,
    }
    with open(os.path.join(args.out, "cases.json"), "w") as fh:
        json.dump(out, fh, indent=1)
    print(f"{len(cases)} cases ({tried} tried; per family {per_family}; rejected {rejected}) -> {os.path.join(args.out, 'cases.json')}")


if __name__ == "__main__":
    main()
