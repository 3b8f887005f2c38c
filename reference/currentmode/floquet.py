"""Writes reference/currentmode/out/floquet.json: the cycle-to-cycle multipliers of each case's
periodic operation, taken from the switching simulator itself (simulate.py) with nothing of the
engine: the one-period map P (clock edge to clock edge) of the simulated circuit, its fixed point
found by Newton with a central-difference Jacobian, and the eigenvalues of that Jacobian at the
fixed point (the Floquet multipliers of the orbit). The D ≈ 0.53 buck is also run at the three
ramps of subharmonic.json (none, 0.9 and 1.1 × the boundary), where the period-one orbit still
exists (Newton does not need it stable) and a multiplier passes −1.

    python3 reference/currentmode/floquet.py [--out DIR]
"""
import argparse
import json
import os
import platform
import sys

import numpy as np
import scipy

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)
from simulate import Converter  # noqa: E402
from generate import load_case, write_json  # noqa: E402

CASES = ["buck-d028-mc13", "buck-d066-mc17", "buck-d052-mc11", "boost-d058-rhp", "buck-polymer-fc-fsw10"]
SUBHARMONIC_CASE = "buck-d052-mc11"


def circuit_states(c):
    """Indices of the circuit's own states (inductor, capacitors, network), not the exogenous ones."""
    return [i for i in range(c.n) if i not in (c.iS, c.iCo, c.iTau, c.iOne)]


def start(c):
    """simulate.py's averaged guess moved to the clock edge: the inductor at its valley and the
    op-amp output at the peak the comparator needs (with the guess's vc = Ri·IL the first cycle of
    a rampless case would never turn on)."""
    z = c.initial_state()
    d = 1 - c.vg / c.vout if c.boost else c.vout / c.vg
    rise = (c.vg if c.boost else c.vg - c.vout) / c.L * d * c.Ts
    il = z[c.iL]
    z[c.iL] = il - rise / 2
    z[c.iC2] = c.vref - (c.Ri * (il + rise / 2) + c.Se * d * c.Ts)
    z[c.iC1] = z[c.iC2]
    return z


def period_map(c, z, guess):
    z1, duties, _, _, guess = c.run(z, 1, guess=guess)
    return z1, duties[0], guess


def orbit(doc, se=None):
    c = Converter(doc, se=se)
    idx = circuit_states(c)
    z = start(c)
    guess = 0.5 * c.Ts
    for _ in range(30):
        z1, duty, guess = period_map(c, z, guess)
        f = z1[idx] - z[idx]
        if np.max(np.abs(f)) <= 1e-12 * max(np.max(np.abs(z[idx])), 1e-3):
            break
        z[idx] -= np.linalg.solve(jacobian(c, z, idx, guess) - np.eye(len(idx)), f)
    z1, duty, guess = period_map(c, z, guess)
    residual = float(np.max(np.abs(z1[idx] - z[idx])))
    return c, z, duty, residual, jacobian(c, z, idx, guess)


def jacobian(c, z, idx, guess):
    m = np.empty((len(idx), len(idx)))
    for col, j in enumerate(idx):
        step = 1e-6 * max(abs(z[j]), 1e-3)
        zp, zm = z.copy(), z.copy()
        zp[j] += step
        zm[j] -= step
        m[:, col] = (period_map(c, zp, guess)[0][idx] - period_map(c, zm, guess)[0][idx]) / (2 * step)
    return m


def record(doc, se=None):
    c, z, duty, residual, m = orbit(doc, se)
    mult = sorted(np.linalg.eigvals(m), key=lambda v: (v.real, v.imag))
    return {
        "rampSlope": c.Se,
        "duty": duty,
        "fixedPointResidual": residual,
        "multipliers": [{"re": float(v.real), "im": float(v.imag)} for v in mult],
    }


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--out", default=os.path.join(HERE, "out"))
    args = ap.parse_args()
    result = {"cases": {}, "subharmonic": []}
    for name in CASES:
        doc = load_case(name)
        result["cases"][name] = record(doc)
    doc = load_case(SUBHARMONIC_CASE)
    sub = json.load(open(os.path.join(HERE, "out", "subharmonic.json")))
    for run in sub["runs"]:
        result["subharmonic"].append({"boundaryFactor": run["rampSlope"] / sub["boundary"], **record(doc, se=run["rampSlope"])})
    result["subharmonicCase"] = SUBHARMONIC_CASE
    result["method"] = "Newton on the simulated one-period map, central differences (step 1e-6 relative), eigenvalues by numpy.linalg.eigvals"
    result["generator"] = {"script": "reference/currentmode/floquet.py", "python": platform.python_version(), "numpy": np.__version__, "scipy": scipy.__version__}
    os.makedirs(args.out, exist_ok=True)
    write_json(args.out, "floquet.json", result)


if __name__ == "__main__":
    main()
