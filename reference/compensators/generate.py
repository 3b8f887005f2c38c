#!/usr/bin/env python3
"""ngspice AC reference for the compensator networks (Type I/II/III op-amp, Type II OTA).

Each case is a SPICE netlist of the actual circuit: an AC source of 1 V at the converter output `out`,
R1 (and for Type III R3+C3) into the inverting node `fb`, Rb from `fb` to ground, R2+C1 in series and C2
across it from `fb` to the amplifier output `comp`. The error amplifier is
  - ideal: a VCVS of gain 1e9 driven by (0 − v(fb)) (the reference input is AC ground);
  - finite single pole: a unit VCCS into R = A0 ∥ C = 1/(2π·GBW), buffered by a unity VCVS, so
    A(s) = A0/(1 + s·A0/(2π·GBW));
  - OTA: a VCCS of gm driven by (0 − v(fb)) into R2+C1 ∥ C2 (∥ Ro) to ground; the divider is in the loop.
Gc is reported as −v(comp)/v(out) (the inverting sign stripped, as the engine does), magnitude in dB and
phase in degrees unwrapped from the lowest frequency.

Usage (from the repository root): python3 reference/compensators/generate.py [--out FILE]
Default output: reference/compensators/ngspice-ac.json. Needs ngspice on PATH and numpy.
"""
import argparse
import json
import math
import pathlib
import subprocess
import sys
import tempfile

import numpy as np

HERE = pathlib.Path(__file__).resolve().parent
START_HZ, STOP_HZ, POINTS_PER_DECADE = 10.0, 10e6, 20

# Hand-picked parts, typical of a 1.2 V / 0.6 V-reference buck loop (Rb = R1·Vref/(Vout − Vref)).
CASES = [
    {"name": "type1-ideal", "kind": "type1",
     "parts": {"r1": 10e3, "rb": 10e3, "c1": 10e-9}, "opamp": None},
    {"name": "type1-finite", "kind": "type1",
     "parts": {"r1": 10e3, "rb": 10e3, "c1": 10e-9}, "opamp": {"a0Db": 80, "gbw": 2e6}},
    {"name": "type2-ideal", "kind": "type2",
     "parts": {"r1": 10e3, "rb": 4.99e3, "r2": 20e3, "c1": 10e-9, "c2": 100e-12}, "opamp": None},
    {"name": "type2-finite", "kind": "type2",
     "parts": {"r1": 10e3, "rb": 4.99e3, "r2": 20e3, "c1": 10e-9, "c2": 100e-12},
     "opamp": {"a0Db": 80, "gbw": 2e6}},
    {"name": "type3-ideal", "kind": "type3",
     "parts": {"r1": 10e3, "rb": 10e3, "r2": 2e3, "r3": 150, "c1": 6.8e-9, "c2": 220e-12, "c3": 2.2e-9},
     "opamp": None},
    {"name": "type3-finite", "kind": "type3",
     "parts": {"r1": 10e3, "rb": 10e3, "r2": 2e3, "r3": 150, "c1": 6.8e-9, "c2": 220e-12, "c3": 2.2e-9},
     "opamp": {"a0Db": 100, "gbw": 10e6}},
    {"name": "type3-finite-slow", "kind": "type3",
     "parts": {"r1": 10e3, "rb": 10e3, "r2": 2e3, "r3": 150, "c1": 6.8e-9, "c2": 220e-12, "c3": 2.2e-9},
     "opamp": {"a0Db": 80, "gbw": 3e6}},
    {"name": "type2-ota-ideal", "kind": "type2-ota",
     "parts": {"r1": 10e3, "rb": 10e3, "gm": 200e-6, "r2": 20e3, "c1": 4.7e-9, "c2": 47e-12}, "opamp": None},
    {"name": "type2-ota-ro", "kind": "type2-ota",
     "parts": {"r1": 10e3, "rb": 10e3, "gm": 200e-6, "r2": 20e3, "c1": 4.7e-9, "c2": 47e-12, "ro": 5e6},
     "opamp": None},
]


def netlist(case, data_file):
    p = case["parts"]
    lines = [f"* {case['name']}", "Vin out 0 DC 0 AC 1", f"R1 out fb {p['r1']!r}", f"Rb fb 0 {p['rb']!r}"]
    if case["kind"] == "type2-ota":
        # i = gm·(0 − v(fb)) into comp: the source pulls gm·v(fb) out of comp.
        lines += [f"Gota comp 0 fb 0 {p['gm']!r}",
                  f"R2 comp n1 {p['r2']!r}", f"C1 n1 0 {p['c1']!r}", f"C2 comp 0 {p['c2']!r}"]
        if p.get("ro"):
            lines.append(f"Ro comp 0 {p['ro']!r}")
    else:
        if case["kind"] == "type1":
            lines.append(f"C1 fb comp {p['c1']!r}")
        else:
            lines += [f"R2 fb n1 {p['r2']!r}", f"C1 n1 comp {p['c1']!r}", f"C2 fb comp {p['c2']!r}"]
        if case["kind"] == "type3":
            lines += [f"R3 out n3 {p['r3']!r}", f"C3 n3 fb {p['c3']!r}"]
        amp = case["opamp"]
        if amp is None:
            lines.append("Eamp comp 0 0 fb 1e9")
        else:
            a0 = 10 ** (amp["a0Db"] / 20)
            # v(x) = −v(fb)·A0/(1 + s·A0·Ca), Ca = 1/(2π·GBW): single pole at GBW/A0.
            lines += [f"Gamp x 0 fb 0 1", f"Ra x 0 {a0!r}", f"Ca x 0 {1 / (2 * math.pi * amp['gbw'])!r}",
                      "Ebuf comp 0 x 0 1"]
    decades = math.log10(STOP_HZ / START_HZ)
    lines += [".control", "set wr_singlescale", "set wr_vecnames", "option numdgt=15",
              f"ac dec {POINTS_PER_DECADE} {START_HZ!r} {STOP_HZ!r}",
              f"wrdata {data_file} v(comp) v(out)", "quit", ".endc", ".end"]
    assert decades > 0
    return "\n".join(lines) + "\n"


def run_case(case, workdir):
    cir = workdir / f"{case['name']}.cir"
    data = workdir / f"{case['name']}.txt"
    cir.write_text(netlist(case, data))
    subprocess.run(["ngspice", "-b", str(cir)], check=True, capture_output=True, text=True)
    rows = np.loadtxt(data, skiprows=1)
    freq = rows[:, 0]
    vcomp = rows[:, 1] + 1j * rows[:, 2]
    vout = rows[:, 3] + 1j * rows[:, 4]
    gc = -vcomp / vout
    mag_db = 20 * np.log10(np.abs(gc))
    phase = np.degrees(np.unwrap(np.angle(gc)))
    # Start the unwrapped phase at the DC convention: an integrator starts near −90°, a finite DC gain near 0°.
    phase -= 360 * np.round((phase[0] - (-90 if abs(phase[0] + 90) < 60 else 0)) / 360)
    return {**case, "freqHz": [float(f"{f:.12g}") for f in freq],
            "magDb": [round(float(m), 9) for m in mag_db],
            "phaseDeg": [round(float(a), 9) for a in phase]}


def ngspice_version():
    out = subprocess.run(["ngspice", "-v"], capture_output=True, text=True).stdout
    for line in out.splitlines():
        if "ngspice-" in line:
            return line.strip(" *")
    return "unknown"


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--out", default=str(HERE / "ngspice-ac.json"))
    args = ap.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        cases = [run_case(c, pathlib.Path(tmp)) for c in CASES]
    doc = {"generator": "reference/compensators/generate.py", "tool": ngspice_version(),
           "sweep": {"startHz": START_HZ, "stopHz": STOP_HZ, "pointsPerDecade": POINTS_PER_DECADE},
           "gc": "-v(comp)/v(out), dB and unwrapped degrees", "cases": cases}
    pathlib.Path(args.out).write_text(json.dumps(doc, indent=1) + "\n")
    print(f"wrote {args.out}: {len(cases)} cases")
    return 0


if __name__ == "__main__":
    sys.exit(main())
