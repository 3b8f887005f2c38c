#!/usr/bin/env python3
"""Closed-loop time-domain references for Loopwright: load step and reference step.

For every design case in reference/cases:
- scipy: the averaged power stage linearised by reference/scipy/generate.py (complex-step Jacobians
  of the circuit equations, no closed-form transfer function), the compensator from its parts as a
  polynomial ratio (ideal op-amp, or the two node equations with a finite single-pole op-amp),
  loop delay as Pade(4,4); the loop is closed in state space (d = -Fm * Gc * (v - vref/H)) and driven
  with scipy.signal.lsim (linear interpolation of the input between samples, which is exact for the
  ramp-and-hold load edge) for the load step, and scipy.signal.step for the reference step.
- ngspice: the same averaged large-signal netlist as reference/ngspice/generate.py (B sources for the
  averaged switch, R/L/C parts, the compensator around an op-amp) with the loop closed through the
  modulator d = v(vc)/vramp, a PWL load-current source, and a transient run (delay as a matched
  lossless line, i.e. exact). The buck's averaged model is linear in d and iL at fixed vin, so its
  step can be large; the boost's is not, so its step is small (0.5 % of iout) to stay linear.
Figures from each waveform with the definitions of src/lib/engine/timeresponse/metrics.ts
(peak deviation, 2 % settling band of the peak deviation around the final value, overshoot).

Usage: python3 reference/closedloop/generate.py [--cases DIR] [--out DIR] [--netlists DIR]
"""
from __future__ import annotations

import argparse
import importlib.util
import json
import math
import pathlib
import re
import subprocess
import sys
import tempfile

import numpy as np
import scipy
import scipy.linalg
import scipy.signal

HERE = pathlib.Path(__file__).resolve().parent
ROOT = HERE.parent


def load(name, path):
    spec = importlib.util.spec_from_file_location(name, path)
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


REF_SCIPY = load("ref_scipy", ROOT / "scipy" / "generate.py")
REF_SPICE = load("ref_spice", ROOT / "ngspice" / "generate.py")
SETTLE = 0.02
PADE_ORDER = 4
TRAN_OPAMP_GAIN = 1e6
SPICE_OPTIONS = ("reltol=1e-7 abstol=1e-12 vntol=1e-9", "reltol=1e-6 abstol=1e-9 vntol=1e-6")


def load_step_spec(doc: dict) -> dict:
    """The load step each case is checked with (A, s)."""
    iout = float(doc["plant"]["iout"])
    frac = 0.25 if doc["plant"]["topology"] == "buck" else 0.005
    return {"step": frac * iout, "riseTime": 1e-6}


# ----------------------------------------------------------------------------------------------
# Compensator polynomials (descending), including the finite single-pole op-amp
# ----------------------------------------------------------------------------------------------
P = np.polynomial.polynomial  # ascending inside the helpers


def imp_r(r):
    return ([r], [1.0])


def imp_c(c):
    return ([1.0], [0.0, c])


def series(a, b):
    return (P.polyadd(P.polymul(a[0], b[1]), P.polymul(b[0], a[1])), P.polymul(a[1], b[1]))


def parallel(a, b):
    return (P.polymul(a[0], b[0]), P.polyadd(P.polymul(a[0], b[1]), P.polymul(b[0], a[1])))


def compensator_tf(doc: dict):
    """Gc = -vc/vout as (num, den), descending powers of s."""
    comp = doc["compensator"]
    if not comp.get("opamp"):
        return REF_SCIPY.compensator_polynomials(doc)
    parts = comp["parts"]
    g = lambda k: float(parts[k])  # noqa: E731
    r1 = float(doc["feedback"]["r1"])
    vref, vout = float(doc["feedback"]["vref"]), float(doc["plant"]["vout"])
    rb = r1 * vref / (vout - vref)
    kind = comp["kind"]
    if kind == "type2":
        zi = imp_r(r1)
    elif kind == "type3":
        zi = parallel(imp_r(r1), series(imp_r(g("r3")), imp_c(g("c3"))))
    else:
        raise NotImplementedError(kind)
    zf = parallel(series(imp_r(g("r2")), imp_c(g("c1"))), imp_c(g("c2")))
    a0 = 10 ** (float(comp["opamp"]["a0Db"]) / 20)
    wa = 2 * math.pi * float(comp["opamp"]["gbw"]) / a0
    ni, di = zi
    nf, df = zf
    # Node equations (1 - vn)/zi + (vc - vn)/zf - vn/rb = 0, vc = -A vn, A = a0/(1 + s/wa):
    # Gc = a0 zf / ((1 + s/wa)(zf + zi + zi zf / rb) + a0 zi), times di*df top and bottom.
    num = P.polymul([a0], P.polymul(nf, di))
    inner = P.polyadd(P.polyadd(P.polymul(nf, di), P.polymul(ni, df)), P.polymul([1 / rb], P.polymul(ni, nf)))
    den = P.polyadd(P.polymul([1.0, 1 / wa], inner), P.polymul([a0], P.polymul(ni, df)))
    return np.array(P.polytrim(num)[::-1]), np.array(P.polytrim(den)[::-1])


def pade(delay: float, order: int):
    """Pade(n,n) of exp(-s*delay), descending coefficients."""
    c = [math.factorial(2 * order - k) * math.factorial(order) / (math.factorial(2 * order) * math.factorial(k) * math.factorial(order - k)) for k in range(order + 1)]
    den = [ck * delay ** k for k, ck in enumerate(c)]
    num = [(-1) ** k * dk for k, dk in enumerate(den)]
    return np.array(num[::-1]), np.array(den[::-1])


# ----------------------------------------------------------------------------------------------
# Closed loop in state space
# ----------------------------------------------------------------------------------------------
def closed_loop(doc: dict):
    """Closed-loop (A, B, C, D) with inputs [i_inj, r] (r = reference at the output scale) and output v."""
    stage = REF_SCIPY.AveragedStage(doc)
    op = stage.operating_point()
    a, b, c, d = stage.jacobians(op["x"], op["u"])
    ap, bd, bi, cp = a, b[:, [0]], b[:, [2]], c
    dd, di = d[0, 0], d[0, 2]  # direct duty -> v (boost ESR path) and i_inj -> v
    fm = 1.0 / float(doc["modulator"].get("vramp", 1.0))
    num, den = compensator_tf(doc)
    delay = float(doc["modulator"].get("delay", 0.0) or 0.0)
    if delay > 0:
        pn, pd = pade(delay, PADE_ORDER)
        num, den = np.polymul(num, pn), np.polymul(den, pd)
    ac, bc, cc, dc = scipy.signal.tf2ss(fm * num, den)  # e -> -d
    dc = float(dc[0, 0])
    n_p, n_c = ap.shape[0], ac.shape[0]
    # d = -(cc xc + dc e), e = v - r, v = cp xp + dd d + di i: solve the algebraic loop for d.
    k = 1.0 / (1.0 + dc * dd)
    kx = k * np.hstack([-dc * cp, -cc])
    ki, kr = -k * dc * di, k * dc
    cx = np.hstack([cp, np.zeros((1, n_c))]) + dd * kx
    dvi, dvr = di + dd * ki, dd * kr
    A = np.zeros((n_p + n_c, n_p + n_c))
    B = np.zeros((n_p + n_c, 2))
    A[:n_p, :n_p] = ap
    A[:n_p, :] += bd @ kx
    A[n_p:, n_p:] = ac
    A[n_p:, :] += bc @ cx
    B[:n_p, 0] = bi[:, 0] + bd[:, 0] * ki
    B[:n_p, 1] = bd[:, 0] * kr
    B[n_p:, 0] = bc[:, 0] * dvi
    B[n_p:, 1] = bc[:, 0] * (dvr - 1.0)
    C = cx
    D = np.array([[dvi, dvr]])
    return A, B, C, D, op


def figures(t, y, final, kind):
    """Peak, overshoot and 2 % settling with the engine's definitions (refined peak by a parabola)."""
    y0 = y[0]
    i = int(np.argmax(np.abs(y - y0)))
    peak, tp = y[i], t[i]
    if 0 < i < len(y) - 1:
        h = t[i] - t[i - 1]
        curv = y[i - 1] - 2 * y[i] + y[i + 1]
        if curv != 0 and abs(t[i + 1] - t[i] - h) < 1e-9 * h:
            dt = h * (y[i - 1] - y[i + 1]) / (2 * curv)
            if abs(dt) <= h:
                peak, tp = y[i] - (y[i - 1] - y[i + 1]) ** 2 / (8 * curv), t[i] + dt
    dev = peak - y0
    if kind == "disturbance":
        band = SETTLE * abs(dev)
        overshoot = max(0.0, float(np.max(-np.sign(dev) * (y - final))))
    else:
        band = SETTLE * abs(final - y0)
        overshoot = max(0.0, float(np.max(np.sign(final - y0) * (y - final))))
    err = np.abs(y - final) - band
    outside = np.nonzero(err > 0)[0]
    if err[-1] > 0:
        settle = None
    elif len(outside) == 0:
        settle = 0.0
    else:
        k = int(outside[-1])
        settle = float(t[k] + (t[k + 1] - t[k]) * err[k] / (err[k] - err[k + 1]))
    return {"peakDeviation": float(dev), "peakTimeS": float(tp), "overshoot": overshoot, "settlingTimeS": settle, "finalValue": float(final)}


def sim_duration(A):
    ev = np.linalg.eigvals(A)
    slowest = np.min(np.abs(ev.real))
    if not np.all(ev.real < 0):
        raise ValueError("closed loop unstable")
    return ev, 10.0 / slowest


def scipy_case(doc: dict, spec: dict) -> dict:
    A, B, C, D, op = closed_loop(doc)
    ev, t_end = sim_duration(A)
    t_end = min(t_end, 2e-2)
    n = 200001
    t = np.linspace(0, t_end, n)
    tr, dI = spec["riseTime"], spec["step"]
    i_load = dI * np.clip(t / tr, 0, 1)
    sys_i = scipy.signal.StateSpace(A, B[:, [0]], C, D[:, [0]])
    _, y, _ = scipy.signal.lsim(sys_i, U=-i_load, T=t, interp=True)
    # Final value of the load step: -Zo,cl(0)*dI from the DC solve of the closed loop.
    g0_i = float((D[:, [0]] - C @ np.linalg.solve(A, B[:, [0]]))[0, 0])
    load = figures(t, y, -g0_i * dI, "disturbance")
    vref = float(doc["feedback"]["vref"])
    h = vref / float(doc["plant"]["vout"])
    d_ref = 0.01 * vref
    sys_r = scipy.signal.StateSpace(A, B[:, [1]] / h, C, D[:, [1]])
    tr_, yr = scipy.signal.step(sys_r, T=t)
    g0_r = float((D[:, [1]] / h - C @ np.linalg.solve(A, B[:, [1]] / h))[0, 0])
    ref = figures(t, yr * d_ref, g0_r * d_ref, "tracking")
    ref["step"] = d_ref
    keep = np.unique(np.concatenate([np.linspace(0, n - 1, 801).astype(int)]))
    return {
        "loadStep": {**spec, **load, "waveform": {"timeS": t[keep].tolist(), "value": y[keep].tolist()}},
        "referenceStep": {**ref},
        "closedLoopPolesHz": sorted([[float(p.real / (2 * np.pi)), float(p.imag / (2 * np.pi))] for p in ev]),
        "durationS": float(t_end),
        "samples": n,
    }


# ----------------------------------------------------------------------------------------------
# ngspice transient of the averaged closed-loop netlist
# ----------------------------------------------------------------------------------------------
def spice_netlist(doc: dict, name: str, spec: dict, op_duty: float, t_end: float, data_file: str, options: str) -> str:
    p = doc["plant"]
    comp_lines = [ln for ln in REF_SPICE.compensator(doc) if not ln.startswith(("Emod", "Tdel", "Rterm"))]
    # The AC netlists' 1e9 ideal op-amp makes the transient too stiff for ngspice's step control
    # ("timestep too small"); 1e6 keeps the error at noise gain / 1e6, far below the 2 % budget.
    comp_lines = [re.sub(r"^Eop vc 0 ninv inv \S+$", f"Eop vc 0 ninv inv {REF_SPICE.fmt(TRAN_OPAMP_GAIN)}", ln) for ln in comp_lines]
    vramp = float(doc["modulator"].get("vramp", 1.0))
    delay = float(doc["modulator"].get("delay", 0.0) or 0.0)
    if delay > 0:
        mod = [f"Emod tm 0 vc 0 {REF_SPICE.fmt(1 / vramp)}", f"Tdel tm 0 dl 0 Z0=50 TD={REF_SPICE.fmt(delay)}", "Rterm dl 0 50", "Ed d 0 dl 0 1"]
    else:
        mod = [f"Ed d 0 vc 0 {REF_SPICE.fmt(1 / vramp)}"]
    t0 = 1e-6
    tr, dI = spec["riseTime"], spec["step"]
    tstep = t_end / 20000
    body = [
        f"* Loopwright closed-loop load step: {name} (averaged model, generated by reference/closedloop/generate.py)",
        f"Vg in 0 DC {REF_SPICE.fmt(p['vin'])}",
        *REF_SPICE.power_stage(p),
        *comp_lines,
        *mod,
        f"Iload out 0 PWL(0 0 {REF_SPICE.fmt(t0)} 0 {REF_SPICE.fmt(t0 + tr)} {REF_SPICE.fmt(dI)})",
        f".nodeset v(out)={REF_SPICE.fmt(p['vout'])} v(d)={REF_SPICE.fmt(op_duty)} v(vc)={REF_SPICE.fmt(op_duty * vramp)}",
        f".options {options}",
        ".control",
        "set numdgt=15",
        "op",
        "let vop = v(out)",
        "print vop",
        f"tran {REF_SPICE.fmt(tstep)} {REF_SPICE.fmt(t0 + t_end)} 0 {REF_SPICE.fmt(tstep)}",
        "set wr_singlescale",
        "set wr_vecnames",
        f"wrdata {data_file} v(out)",
        "quit 0",
        ".endc",
        ".end",
    ]
    return "\n".join(body) + "\n"


def spice_case(doc: dict, name: str, spec: dict, t_end: float, netlist_dir: pathlib.Path | None) -> dict:
    op = json.loads((ROOT / "ngspice" / "out" / f"{name}.json").read_text())["operatingPoint"]
    # Tight tolerances first; the delay line's case needs looser ones ("timestep too small" at
    # the load edge otherwise). The options used are recorded with the result.
    for options in SPICE_OPTIONS:
        text = spice_netlist(doc, name, spec, op["duty"], t_end, "tran.txt", options)
        with tempfile.TemporaryDirectory() as tmp:
            work = pathlib.Path(tmp)
            (work / "run.cir").write_text(text)
            res = subprocess.run(["ngspice", "-b", "run.cir"], capture_output=True, text=True, cwd=work, timeout=600)
            m = re.search(r"^vop = (\S+)$", res.stdout, re.M)
            if res.returncode != 0 or not m:
                raise RuntimeError(f"ngspice failed for {name}:\n{res.stdout[-2000:]}\n{res.stderr[-2000:]}")
            if "aborted" in res.stdout + res.stderr:
                continue
            rows = np.loadtxt(work / "tran.txt", skiprows=1)
            break
    else:
        raise RuntimeError(f"ngspice transient aborted for {name} with every option set")
    if netlist_dir is not None:
        (netlist_dir / f"{name}.loadstep.cir").write_text(text)
    t0 = 1e-6
    t, v = rows[:, 0], rows[:, 1]
    v_op = float(m.group(1))
    keep = t >= t0
    # Start exactly at the edge: interpolate the sample at t0.
    tt = np.concatenate([[0.0], t[keep] - t0])
    yy = np.concatenate([[np.interp(t0, t, v) - v_op], v[keep] - v_op])
    fig = figures(tt, yy, 0.0, "disturbance")
    # The last 2 % of the run gives the settled value (0 for an integrating loop up to nonlinearity).
    fig["endValue"] = float(yy[-1])
    idx = np.linspace(0, len(tt) - 1, 801).astype(int)
    return {**spec, **fig, "options": options, "voutOperatingPoint": v_op, "samples": int(len(tt)), "waveform": {"timeS": tt[idx].tolist(), "value": yy[idx].tolist()}}


def ngspice_version() -> str:
    return REF_SPICE.ngspice_version()


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--cases", default=str(ROOT / "cases"))
    ap.add_argument("--out", default=str(HERE / "out"))
    ap.add_argument("--netlists", default=str(HERE / "netlists"))
    ap.add_argument("--only", default=None)
    ap.add_argument("--no-spice", action="store_true")
    args = ap.parse_args(argv)
    out_dir, net_dir = pathlib.Path(args.out), pathlib.Path(args.netlists)
    out_dir.mkdir(parents=True, exist_ok=True)
    net_dir.mkdir(parents=True, exist_ok=True)
    for path in sorted(pathlib.Path(args.cases).glob("*.json")):
        name = path.stem
        if args.only and name != args.only:
            continue
        doc = json.loads(path.read_text())
        spec = load_step_spec(doc)
        sc = scipy_case(doc, spec)
        record = {
            "case": name,
            "generator": "reference/closedloop/generate.py",
            "versions": {"python": sys.version.split()[0], "numpy": np.__version__, "scipy": scipy.__version__},
            "padeOrder": PADE_ORDER,
            "scipy": sc,
        }
        if not args.no_spice:
            record["versions"]["ngspice"] = ngspice_version()
            # ngspice only needs to cover the settling (its own figures decide); past that its step
            # control crawls on some cases, so the run stops at 3x the scipy settling time.
            ls = sc["loadStep"]
            t_spice = min(sc["durationS"], max(3 * (ls["settlingTimeS"] or sc["durationS"]), 50 * ls["peakTimeS"]))
            record["ngspice"] = spice_case(doc, name, spec, t_spice, net_dir)
        (out_dir / f"{name}.json").write_text(json.dumps(record, indent=1) + "\n")
        ls = sc["loadStep"]
        line = f"{name}: scipy peak {ls['peakDeviation']:.6g} V settle {ls['settlingTimeS']}"
        if "ngspice" in record:
            ng = record["ngspice"]
            line += f" | ngspice peak {ng['peakDeviation']:.6g} settle {ng['settlingTimeS']}"
        print(line, flush=True)


if __name__ == "__main__":
    main()
