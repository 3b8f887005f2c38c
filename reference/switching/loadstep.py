"""Load step on the switched buck in ngspice: the circuit of generate.py (same parts, latched
trailing-edge comparator, ideal switch) without injection, settled for SETTLE periods, then a load
current step of STEP_A (1 ns edge) at a clock edge; V(out) read at every following clock edge,
minus its value at the step. Written to out/<case>.loadstep.json with the tools' versions.

Usage: python3 reference/switching/loadstep.py
"""
import json
import pathlib
import platform
import subprocess
import tempfile

import numpy as np

import generate as g

CASE = "buck-12v-3v3"
STEP_A = 1.0
AFTER = 150  # periods after the step (fc ≈ 43 kHz: about 12 periods of the crossover)


def main() -> None:
    here = g.HERE
    case = json.loads((here / "cases" / f"{CASE}.json").read_text())
    case["_name"] = CASE
    ts = 1.0 / case["plant"]["fsw"]
    settle = g.SETTLE[CASE]
    t_step = settle * ts
    with tempfile.TemporaryDirectory() as tmp:
        data = pathlib.Path(tmp) / "wave.txt"
        text = g.netlist(case, AFTER, 0.0, str(data))
        text = text.replace(".options", f"Istep out 0 PWL(0 0 {g.f(t_step)} 0 {g.f(t_step + 1e-9)} {g.f(STEP_A)})\n.options", 1)
        text = text.replace("linearize v(out) v(vs)", "linearize v(out)").replace("wrdata " + str(data) + " v(out) v(vs)", "wrdata " + str(data) + " v(out)")
        (here / "netlists" / f"{CASE}.loadstep.cir").write_text(text.replace(str(data), "wave.txt"))
        cir = pathlib.Path(tmp) / "run.cir"
        cir.write_text(text)
        subprocess.run(["ngspice", "-b", str(cir)], check=True, capture_output=True, timeout=3600)
        raw = np.loadtxt(data)
    t, v = raw[:, 0], raw[:, 1]
    edges = t_step + ts * np.arange(AFTER + 1)
    at = np.interp(edges, t, v)
    version = subprocess.run(["ngspice", "--version"], capture_output=True, text=True).stdout
    version = next((l.strip("* ").strip() for l in version.splitlines() if "ngspice-" in l), "ngspice")
    result = {
        "case": CASE,
        "generator": "reference/switching/loadstep.py",
        "tools": {"ngspice": version, "python": platform.python_version(), "numpy": np.__version__},
        "stepA": STEP_A,
        "settlePeriods": settle,
        "timeS": (edges - t_step).tolist(),
        "deviationV": (at - at[0]).tolist(),
    }
    (here / "out" / f"{CASE}.loadstep.json").write_text(json.dumps(result, indent=1) + "\n")
    k = int(np.argmax(np.abs(at - at[0])))
    print(CASE, "peak", at[k] - at[0], "at", k, "periods")


if __name__ == "__main__":
    main()
