#!/usr/bin/env python3
"""ngspice reference for the switching model: transient simulations of the switched converter
with a sine injected in the feedback path, one netlist per case and injection frequency.

Each netlist is the switching circuit itself: the switch pair ideal (buck: the switch node is the
switched source g*Vin; boost: two voltage-controlled switches of 1 mOhm on (taken out of r), 10 MOhm off,
low side on with g and high side without it), lossless, with r = DCR + Rds(on) in series with L
as in the engine's synchronous model, the capacitor branches with C, ESR and ESL, the resistive load, the
Type III network from its parts around a VCVS of gain 1e9 (ideal op-amp), and a trailing-edge
PWM latch: a clock pulse sets the gate g at the start of each period, the comparator resets it
when the amplifier output falls to a 0 -> Vramp sawtooth, and it stays off until the next clock
(behavioural logic behind an RC of 1 ns). The simulation starts
from the averaged operating point, settles, and the last whole injection period (N switching
periods, f = fsw/N) is sampled uniformly; one-bin DFTs of V(out) and V(vs) give
T = -V(out)/V(vs). No transfer function and nothing of the engine is used.

Usage: python3 reference/switching/generate.py [--out DIR] [--only CASE]
"""
from __future__ import annotations

import argparse
import json
import pathlib
import platform
import subprocess
import tempfile

import numpy as np

HERE = pathlib.Path(__file__).resolve().parent
SAMPLES_PER_PERIOD = 400
# Switching periods per injection period (f = fsw/N) for each case: from below the LC
# resonance to fsw/3.
PERIODS = {
    "boost-5v-12v-light": [148, 59, 30, 10, 3],
    # fsw/32 and fsw/31 bracket the crossover, so the phase margin can be read off the transients.
    "boost-5v-12v-low-zeros": [148, 59, 32, 31, 10, 3],
    "buck-12v-3v3": [117, 23, 12, 5, 3],
}
# Settling before the measured period, in switching periods (several times the slowest
# closed-loop time constant of each case).
# The low-zeros boost has a slow closed-loop pole near its zeros: 1600 periods left 0.4 dB at fsw/59.
SETTLE = {"boost-5v-12v-light": 1600, "boost-5v-12v-low-zeros": 4000, "buck-12v-3v3": 600}
AMPLITUDE = 0.01  # V; checked by a second run at half of it (see `linearity` in the output)


def f(x: float) -> str:
    return repr(float(x))


def netlist(case: dict, periods: int, amplitude: float, out_file: str) -> str:
    p = case["plant"]
    ts = 1.0 / p["fsw"]
    vin, vout, iout = p["vin"], p["vout"], p["iout"]
    r = p["inductor"].get("dcr", 0.0) + p.get("rdsOn", 0.0)
    vref = case["feedback"]["vref"]
    r1 = case["feedback"]["r1"]
    rb = r1 * vref / (vout - vref)
    vramp = case["modulator"]["vramp"]
    parts = case["compensator"]["parts"]
    if p["topology"] == "buck":
        duty = vout / vin
        il = iout
    else:
        duty = 1 - vin / vout
        il = iout / (1 - duty)
    vo0 = duty * vramp
    finj = p["fsw"] / periods
    settle = SETTLE[case["_name"]]
    tstop = (settle + periods) * ts
    tstart = settle * ts
    step = ts / SAMPLES_PER_PERIOD
    lines = [f"* {case['_name']} injection at fsw/{periods}", f"Vin in 0 DC {f(vin)}"]
    if p["topology"] == "buck":
        lines += [
            f"Bsw sw 0 V = V(g)*V(in)",
            f"Rser sw x {f(r)}",
            f"L1 x out {f(p['inductor']['l'])} IC={f(il)}",
        ]
    else:
        lines += [
            # The switch on-resistance (1 mOhm) is taken out of r: the current is always in one switch.
            f"Rser in x {f(r - 1e-3)}",
            f"L1 x sw {f(p['inductor']['l'])} IC={f(il)}",
            # Low-side switch on with g, high-side on without it (synchronous, lossless here).
            "Slow sw 0 g 0 swon",
            "Shigh sw out 0 g swoff",
            ".model swon sw vt=0.5 vh=0 ron=1e-3 roff=1e7",
            ".model swoff sw vt=-0.5 vh=0 ron=1e-3 roff=1e7",
        ]
    for k, b in enumerate(p["capacitors"]):
        n = b.get("count", 1)
        c, esr, esl = b["c"] * n, b.get("esr", 0.0) / n, b.get("esl", 0.0) / n
        lines.append(f"Resr{k} out e{k} {f(esr if esr > 0 else 1e-9)}")
        lines.append(f"Lesl{k} e{k} c{k} {f(esl)} IC=0" if esl > 0 else f"Vesl{k} e{k} c{k} DC 0")
        lines.append(f"C{k} c{k} 0 {f(c)} IC={f(vout)}")
    lines += [
        f"Rload out 0 {f(vout / iout)}",
        f"Vinj vs out DC 0 SIN(0 {f(amplitude)} {f(finj)} 0 0 0)",
        f"Vref vref 0 DC {f(vref)}",
        f"R1 vs vm {f(r1)}",
        f"Rb vm 0 {f(rb)}",
        f"R3 vs n3 {f(parts['r3'])}",
        f"C3 n3 vm {f(parts['c3'])} IC={f(vout - vref)}",
        f"C2 vm vo {f(parts['c2'])} IC={f(vref - vo0)}",
        f"R2 vm n2 {f(parts['r2'])}",
        f"C1 n2 vo {f(parts['c1'])} IC={f(vref - vo0)}",
        "Eop vo 0 vref vm 1e9",
        # Sawtooth 0 -> Vramp over Ts (a 1/2000 of Ts fall), trailing-edge comparator.
        f"Vramp ramp 0 PULSE(0 {f(vramp)} 0 {f(ts * (1 - 1 / 2000))} {f(ts / 2000)} 0 {f(ts)})",
        # Latched: set by a clock pulse at the start of each period (1 % of Ts), reset when the
        # amplifier output falls to the ramp, held off until the next clock (an RC of 1 ns).
        f"Vclk clk 0 PULSE(0 1 0 1n 1n {f(ts / 100)} {f(ts)})",
        "Bset gx 0 V = ((V(clk) > 0.5) || ((V(g) > 0.5) && (V(vo) > V(ramp)))) ? 1 : 0",
        "Rg gx g 1k",
        "Cg g 0 1p IC=1",
        ".options reltol=1e-6 abstol=1e-12 vntol=1e-9 method=gear maxord=2",
        f".tran {f(step)} {f(tstop)} {f(tstart)} {f(step)} uic",
        ".control",
        "run",
        "linearize v(out) v(vs)",
        f"wrdata {out_file} v(out) v(vs)",
        "quit",
        ".endc",
        ".end",
    ]
    return "\n".join(lines) + "\n"


def measure(case: dict, periods: int, amplitude: float, netlist_dir: pathlib.Path | None) -> dict:
    p = case["plant"]
    ts = 1.0 / p["fsw"]
    with tempfile.TemporaryDirectory() as tmp:
        data = pathlib.Path(tmp) / "wave.txt"
        text = netlist(case, periods, amplitude, str(data))
        cir = pathlib.Path(tmp) / "run.cir"
        cir.write_text(text)
        if netlist_dir is not None:
            (netlist_dir / f"{case['_name']}.N{periods}.cir").write_text(text.replace(str(data), "wave.txt"))
        subprocess.run(["ngspice", "-b", str(cir)], check=True, capture_output=True, timeout=3600)
        raw = np.loadtxt(data)
    t, vout, vs = raw[:, 0], raw[:, 1], raw[:, 3]
    t0 = SETTLE[case["_name"]] * ts
    n = periods * SAMPLES_PER_PERIOD
    # The last n uniform samples span exactly one injection period (rectangle rule = periodic trapezoid).
    t, vout, vs = t[-n - 1 : -1], vout[-n - 1 : -1], vs[-n - 1 : -1]
    omega = 2 * np.pi * p["fsw"] / periods
    z = np.exp(-1j * omega * (t - t0))
    x = np.sum(vout * z)
    y = np.sum(vs * z)
    tl = -x / y
    return {
        "periods": periods,
        "freqHz": p["fsw"] / periods,
        "amplitude": amplitude,
        "magDb": float(20 * np.log10(abs(tl))),
        "phaseDeg": float(np.degrees(np.angle(tl))),
    }


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--out", default=str(HERE / "out"))
    ap.add_argument("--only", default=None)
    args = ap.parse_args()
    out = pathlib.Path(args.out)
    out.mkdir(parents=True, exist_ok=True)
    netlists = HERE / "netlists"
    netlists.mkdir(exist_ok=True)
    version = subprocess.run(["ngspice", "--version"], capture_output=True, text=True).stdout
    version = next((l.strip("* ").strip() for l in version.splitlines() if "ngspice-" in l), "ngspice")
    for path in sorted((HERE / "cases").glob("*.json")):
        name = path.stem
        if args.only and name != args.only:
            continue
        case = json.loads(path.read_text())
        case["_name"] = name
        points = [measure(case, n, AMPLITUDE, netlists) for n in PERIODS[name]]
        mid = PERIODS[name][2]
        half = measure(case, mid, AMPLITUDE / 2, None)
        full = next(pt for pt in points if pt["periods"] == mid)
        result = {
            "case": name,
            "generator": "reference/switching/generate.py",
            "tools": {"ngspice": version, "python": platform.python_version(), "numpy": np.__version__},
            "samplesPerPeriod": SAMPLES_PER_PERIOD,
            "settlePeriods": SETTLE[name],
            "points": points,
            "linearity": {
                "periods": mid,
                "deltaDb": half["magDb"] - full["magDb"],
                "deltaDeg": (half["phaseDeg"] - full["phaseDeg"] + 180) % 360 - 180,
            },
        }
        (out / f"{name}.json").write_text(json.dumps(result, indent=1) + "\n")
        print(name, json.dumps(result["points"]), result["linearity"])


if __name__ == "__main__":
    main()
