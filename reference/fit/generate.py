#!/usr/bin/env python3
"""Synthetic bench measurements of known parameters, and scipy's fit of them.

For each case: a voltage-mode buck with a two-branch output bank and a Type III op-amp network,
built here from its circuit (complex impedances, nothing from the project imported). The "true"
parameters differ from the typed design by known factors; the response (loop gain T or the
control-to-output Gvd) is sampled with Gaussian noise on magnitude (dB) and phase (deg) plus a few
gross outliers. scipy.optimize.least_squares (method 'trf', loss 'soft_l1', the same f_scale,
bounds and start as the engine) fits the same residual the engine uses: ln(H_meas / H_model),
split into real and imaginary part, phase reduced to (-pi, pi]. Parameters are log factors on the
typed value, the delay in switching periods.

Intervals are computed here independently of scipy's internals: a numpy central-difference
Jacobian of the raw residuals at scipy's solution, weights rho'(r^2) = 1/sqrt(1 + r^2/f^2),
covariance s^2 (J^T W J)^-1 with s^2 = sum(w r^2)/(m - p), 95 % = theta +- 1.959964 sigma.

Run: python3 reference/fit/generate.py  (writes reference/fit/out/cases.json)
"""
import json
import os
import platform

import numpy as np
import scipy
from scipy.optimize import least_squares

HERE = os.path.dirname(os.path.abspath(__file__))
Z95 = 1.959963984540054

DESIGN = {
    "schemaVersion": 1,
    "name": "Fit reference: 12 V to 3.3 V buck, ceramic + polymer bank",
    "plant": {
        "topology": "buck", "vin": 12, "vout": 3.3, "iout": 4, "fsw": 500000,
        "inductor": {"l": 3.3e-6, "dcr": 0.010},
        "capacitors": [
            {"c": 22e-6, "esr": 0.004, "esl": 4e-10, "count": 3},
            {"c": 220e-6, "esr": 0.020, "esl": 2.5e-9, "count": 1},
        ],
        "rdsOn": 0.012,
    },
    "modulator": {"vramp": 1.2, "feedForward": False, "delay": 0},
    "feedback": {"vref": 0.8, "r1": 10000},
    "compensator": {
        "kind": "type3",
        "parts": {"r2": 15000, "r3": 1000, "c1": 2.2e-9, "c2": 100e-12, "c3": 2.2e-9},
        "series": None,
    },
}


def loop_parts(design, factors, delay_s):
    p = design["plant"]
    caps = [dict(b) for b in p["capacitors"]]
    for i, b in enumerate(caps):
        b["c"] *= factors.get(f"c.{i}", 1.0)
        b["esr"] *= factors.get(f"esr.{i}", 1.0)
        b["esl"] *= factors.get(f"esl.{i}", 1.0)
    return {
        "vin": p["vin"], "vout": p["vout"], "iout": p["iout"],
        "l": p["inductor"]["l"] * factors.get("l", 1.0),
        # r lumps the winding and the (equal) switch resistances: the averaged synchronous buck.
        "r": p["inductor"]["dcr"] * factors.get("dcr", 1.0) + p["rdsOn"],
        "caps": caps,
        "vramp": design["modulator"]["vramp"] * factors.get("vramp", 1.0),
        "delay": delay_s,
        "comp": design["compensator"]["parts"],
        "r1": design["feedback"]["r1"],
    }


def responses(q, f):
    s = 2j * np.pi * f
    R = q["vout"] / q["iout"]
    ybank = np.zeros_like(s)
    for b in q["caps"]:
        z = b["esr"] + s * b["esl"] + 1 / (s * b["c"])
        ybank = ybank + b["count"] / z
    zp = 1 / (1 / R + ybank)  # load in parallel with the bank
    zl = q["r"] + s * q["l"]
    gvd = q["vin"] * zp / (zp + zl)  # duty to output: Vg*d through L + r into the output node
    c = q["comp"]
    zf = 1 / (1 / (c["r2"] + 1 / (s * c["c1"])) + s * c["c2"])
    zi = 1 / (1 / q["r1"] + 1 / (c["r3"] + 1 / (s * c["c3"])))
    gc = zf / zi  # inverting amplifier without its -1 (the feedback sign)
    loop = gc * gvd / q["vramp"] * np.exp(-s * q["delay"])
    return {"plant": gvd, "loop": loop}


def residual_vector(meas, model):
    d = np.log(meas) - np.log(model)
    re = d.real
    im = (d.imag + np.pi) % (2 * np.pi) - np.pi
    out = np.empty(2 * len(d))
    out[0::2] = re
    out[1::2] = im
    return out


def case_residual(case, meas, f):
    """The residual of a case's parameters at theta: log factors on the typed values, the delay in periods."""
    fsw = DESIGN["plant"]["fsw"]
    names = [p["key"] for p in case["parameters"]]

    def fun(theta):
        factors, delay = {}, 0.0
        for k, name in enumerate(names):
            if name == "delay":
                delay = theta[k] / fsw
            else:
                factors[name] = np.exp(theta[k])
        return residual_vector(meas, responses(loop_parts(DESIGN, factors, delay), f)[case["response"]])

    return fun


def fit_case(case, fun):
    """scipy's fit of a case: the engine's start, bounds, loss and f_scale."""
    lower = np.array([p["lower"] for p in case["parameters"]])
    upper = np.array([p["upper"] for p in case["parameters"]])
    x0 = np.array([p["start"] for p in case["parameters"]])
    return least_squares(fun, x0, bounds=(lower, upper), method="trf", loss="soft_l1",
                         f_scale=case["fScale"], x_scale="jac", xtol=1e-14, ftol=1e-14, gtol=1e-14, max_nfev=2000)


def run_case(case, rng):
    fsw = DESIGN["plant"]["fsw"]
    f = np.logspace(np.log10(case["startHz"]), np.log10(case["stopHz"]), case["points"])
    truth = case["truth"]
    true_factors = {k: v for k, v in truth.items() if k != "delay"}
    h_true = responses(loop_parts(DESIGN, true_factors, truth.get("delay", 0.0)), f)[case["response"]]
    mag_db = 20 * np.log10(np.abs(h_true)) + rng.normal(0, case["noiseDb"], len(f))
    phase_deg = np.degrees(np.unwrap(np.angle(h_true))) + rng.normal(0, case["noiseDeg"], len(f))
    for i, (ddb, ddeg) in zip(case["outlierIdx"], case["outlierSize"]):
        mag_db[i] += ddb
        phase_deg[i] += ddeg
    meas = 10 ** (mag_db / 20) * np.exp(1j * np.radians(phase_deg))

    fun = case_residual(case, meas, f)
    res = fit_case(case, fun)
    theta = res.x
    r = fun(theta)
    h = 1e-6
    jac = np.empty((len(r), len(theta)))
    for k in range(len(theta)):
        up, dn = theta.copy(), theta.copy()
        up[k] += h
        dn[k] -= h
        jac[:, k] = (fun(up) - fun(dn)) / (2 * h)
    w = 1 / np.sqrt(1 + (r / case["fScale"]) ** 2)
    a = jac.T @ (w[:, None] * jac)
    s2 = np.sum(w * r ** 2) / (len(r) - len(theta))
    sigma = np.sqrt(np.diag(np.linalg.inv(a)) * s2)

    def to_value(name, t):
        if name == "delay":
            return t / fsw
        return typed_value(name) * np.exp(t)

    estimates = []
    for k, name in enumerate(p["key"] for p in case["parameters"]):
        estimates.append({
            "key": name,
            "true": truth.get(name, 0.0) if name == "delay" else typed_value(name) * truth.get(name, 1.0),
            "fitted": to_value(name, theta[k]),
            "low": to_value(name, theta[k] - Z95 * sigma[k]),
            "high": to_value(name, theta[k] + Z95 * sigma[k]),
        })
    return {
        "name": case["name"],
        "response": case["response"],
        "fScale": case["fScale"],
        "parameters": case["parameters"],
        "measurement": {"freqHz": f.tolist(), "magDb": mag_db.tolist(), "phaseDeg": phase_deg.tolist()},
        "outlierIdx": case["outlierIdx"],
        "scipy": {"status": int(res.status), "nfev": int(res.nfev), "cost": float(res.cost), "estimates": estimates},
    }


def typed_value(name):
    p = DESIGN["plant"]
    if name == "l":
        return p["inductor"]["l"]
    if name == "dcr":
        return p["inductor"]["dcr"]
    if name == "vramp":
        return DESIGN["modulator"]["vramp"]
    kind, branch = name.split(".")
    return p["capacitors"][int(branch)][kind]


def param(key, lo=0.25, hi=4.0):
    if key == "delay":
        return {"key": key, "lower": 0.0, "upper": 4.0, "start": 0.0}
    return {"key": key, "lower": float(np.log(lo)), "upper": float(np.log(hi)), "start": 0.0}


CASES = [
    {
        "name": "loop gain, five parameters",
        "response": "loop",
        "startHz": 100, "stopHz": 240000, "points": 160,
        "noiseDb": 0.1, "noiseDeg": 0.6, "fScale": 0.05,
        "outlierIdx": [37, 81, 118, 140], "outlierSize": [[3.0, -15.0], [-2.5, 20.0], [4.0, 10.0], [-3.0, -25.0]],
        "truth": {"c.0": 0.7, "c.1": 1.15, "esr.1": 1.6, "vramp": 1.1, "delay": 150e-9},
        "parameters": [param(k) for k in ["c.0", "c.1", "esr.1", "vramp", "delay"]],
    },
    {
        "name": "plant Gvd, four parameters",
        "response": "plant",
        "startHz": 200, "stopHz": 240000, "points": 120,
        "noiseDb": 0.15, "noiseDeg": 0.8, "fScale": 0.05,
        "outlierIdx": [20, 64, 99], "outlierSize": [[-3.0, 12.0], [2.0, -18.0], [3.5, 8.0]],
        "truth": {"l": 1.2, "c.0": 0.75, "c.1": 0.9, "esr.1": 1.8},
        "parameters": [param(k) for k in ["l", "c.0", "c.1", "esr.1"]],
    },
]


def main():
    rng = np.random.default_rng(20261203)
    out = {
        "generator": "reference/fit/generate.py",
        "versions": {"python": platform.python_version(), "numpy": np.__version__, "scipy": scipy.__version__},
        "design": DESIGN,
        "cases": [run_case(c, rng) for c in CASES],
    }
    os.makedirs(os.path.join(HERE, "out"), exist_ok=True)
    with open(os.path.join(HERE, "out", "cases.json"), "w") as fh:
        json.dump(out, fh, indent=1)
    for c in out["cases"]:
        print(c["name"], "status", c["scipy"]["status"], "nfev", c["scipy"]["nfev"])
        for e in c["scipy"]["estimates"]:
            inside = e["low"] <= e["true"] <= e["high"]
            print(f"  {e['key']:6s} true {e['true']:.4g} fitted {e['fitted']:.4g} [{e['low']:.4g}, {e['high']:.4g}] {'in' if inside else 'OUT'}")


if __name__ == "__main__":
    main()
