"""Writes reference/currentmode/out/<case>.json: the loop gain of each case in cases/ measured on the
cycle-by-cycle switching simulation (simulate.py) by sine injection, and out/subharmonic.json: the
duty sequence of a buck at D ≈ 0.67 without a compensation ramp (period-two oscillation) and with
the ramp that cures it.

    python3 reference/currentmode/generate.py [--out DIR] [--case NAME --freq HZ ...]

The second form (one case, chosen frequencies) is what the regeneration test runs.
"""
import argparse
import json
import os
import platform
import sys
from fractions import Fraction

import numpy as np
import scipy

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)
from simulate import Converter, loop_gain, settle  # noqa: E402

# Injection frequencies as fractions of fsw: the window is a whole number of periods of both.
FRACTIONS = [Fraction(1, 200), Fraction(1, 100), Fraction(1, 50), Fraction(1, 25), Fraction(1, 20),
             Fraction(1, 12), Fraction(1, 10), Fraction(1, 8), Fraction(1, 6), Fraction(1, 5),
             Fraction(3, 10), Fraction(2, 5), Fraction(9, 20)]
SETTLE_PERIODS = 3000      # from the averaged guess to the periodic steady state
INJECTION_SETTLE = 400     # switching periods after the injection starts, before measuring
MIN_WINDOW = 40            # shortest measuring window, switching periods


def injection_amplitude(doc):
    # small against Vout (linear response) and far above rounding: 0.3 % of Vout at the divider input
    return 0.003 * doc["plant"]["vout"]


def load_case(name):
    """The design document of cases/<name>.json."""
    with open(os.path.join(HERE, "cases", f"{name}.json")) as f:
        return json.load(f)


def window_periods(frac):
    """The measuring window for fsw·frac: whole periods of both the sine and the clock, at least
    MIN_WINDOW switching periods."""
    q = frac.denominator
    return q * max(1, -(-MIN_WINDOW // q))


def point(freq, value, value_prev, window):
    """One measured point: the response's dB and degrees, its window, and how far it still moved
    from the same window one window earlier."""
    return {
        "freqHz": freq,
        "magDb": 20 * np.log10(abs(value)),
        "phaseDeg": float(np.degrees(np.angle(value))),
        "windowPeriods": window,
        "settleDeltaDb": abs(20 * np.log10(abs(value) / abs(value_prev))),
        "settleDeltaDeg": abs(float(np.degrees(np.angle(value / value_prev)))),
    }


def write_json(out_dir, filename, result):
    with open(os.path.join(out_dir, filename), "w") as f:
        json.dump(result, f, indent=1)
        f.write("\n")


def measure(doc, z, guess, frac):
    fsw = doc["plant"]["fsw"]
    window = window_periods(frac)
    T, T_prev = loop_gain(doc, z, float(frac) * fsw, window, INJECTION_SETTLE, injection_amplitude(doc), guess)
    return T, T_prev, window


def run_case(name, fractions=None, freqs=None):
    doc = load_case(name)
    fsw = doc["plant"]["fsw"]
    if freqs:
        fractions = [Fraction(f / fsw).limit_denominator(1000) for f in freqs]
    conv, z, duties, guess = settle(doc, SETTLE_PERIODS)
    ripple = float(np.max(np.abs(np.diff(duties[-50:]))))
    rows = []
    for frac in fractions or FRACTIONS:
        T, T_prev, window = measure(doc, z, guess, frac)
        rows.append(point(float(frac) * fsw, T, T_prev, window))
    return {
        "case": name,
        "simulatedDuty": float(duties[-1]),
        "dutyChangeLast50Periods": ripple,
        "simulatedVout": float(conv.vout_row(False) @ z),
        "injectionAmplitudeV": injection_amplitude(doc),
        "settlePeriods": SETTLE_PERIODS,
        "injectionSettlePeriods": INJECTION_SETTLE,
        "points": rows,
        "generator": generator_info(),
    }


def subharmonic(out_dir):
    """The D ≈ 0.53 buck without a ramp, then 10 % below and 10 % above the least ramp for
    stability, (Sf − Sn)/2.
    Without a ramp a valley-current error grows by Sf/Sn ≈ 1.1 per cycle (sign alternating) until
    the duty hits its limits: long and short cycles alternate (period two, the fsw/2 subharmonic).
    (At D ≈ 0.67, Sf/Sn ≈ 1.9, the same circuit runs irregularly rather than in a clean period two.)"""
    doc = load_case("buck-d052-mc11")
    p = doc["plant"]
    ri = doc["modulator"]["senseGain"]
    # the sensed slopes of the simulated circuit in steady state: the inductor sees the switch and
    # winding resistance on both intervals (lossless slopes would put the boundary 40 % too low here)
    il_r = p["iout"] * (p["inductor"]["dcr"] + p["rdsOn"])
    sn = ri * (p["vin"] - p["vout"] - il_r) / p["inductor"]["l"]
    sf = ri * (p["vout"] + il_r) / p["inductor"]["l"]
    boundary = (sf - sn) / 2
    result = {"case": "buck-d052-mc11", "sn": sn, "sf": sf, "boundary": boundary, "runs": [], "generator": generator_info()}
    for se in [0.0, 0.9 * boundary, 1.1 * boundary]:
        conv, z, duties, _ = settle(doc, 6000, se=se)
        last = duties[-200:]
        steps = np.diff(last)
        result["runs"].append({
            "rampSlope": se,
            "lastDuties": [float(d) for d in last[-40:]],
            # the duty's component at fsw/2: |mean((−1)^k·d_k)| over the last 200 cycles
            "fswHalfAmplitude": float(abs(np.mean(last * (-1.0) ** np.arange(len(last))))),
            # share of neighbouring steps that change sign (1 = up, down, up, … every cycle)
            "alternatingSteps": float(np.mean(steps[1:] * steps[:-1] < 0)) if np.any(steps != 0) else 0.0,
            "largestStep": float(np.max(np.abs(steps))),
        })
    write_json(out_dir, "subharmonic.json", result)


def generator_info():
    return {"script": "reference/currentmode/generate.py", "python": platform.python_version(),
            "numpy": np.__version__, "scipy": scipy.__version__}


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--out", default=os.path.join(HERE, "out"))
    ap.add_argument("--case")
    ap.add_argument("--freq", type=float, nargs="*")
    ap.add_argument("--subharmonic-only", action="store_true")
    args = ap.parse_args()
    os.makedirs(args.out, exist_ok=True)
    if args.subharmonic_only:
        subharmonic(args.out)
        return
    names = [args.case] if args.case else sorted(f[:-5] for f in os.listdir(os.path.join(HERE, "cases")))
    for name in names:
        write_json(args.out, f"{name}.json", run_case(name, freqs=args.freq))
        print(name, "done", file=sys.stderr)
    if not args.case:
        subharmonic(args.out)


if __name__ == "__main__":
    main()
