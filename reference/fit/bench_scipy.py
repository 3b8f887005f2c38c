#!/usr/bin/env python3
"""Times scipy.optimize.least_squares on the committed fit cases (for scripts/bench-fit.ts).

Prints one JSON line: per case the median wall time of `repeats` fits in ms and the cost reached.
"""
import json
import sys
import time

import numpy as np

sys.path.insert(0, __file__.rsplit("/", 1)[0])
import generate  # noqa: E402  (the same model and residual as the committed estimates)
from scipy.optimize import least_squares  # noqa: E402


def main():
    repeats = int(sys.argv[1]) if len(sys.argv) > 1 else 5
    ref = json.load(open(__file__.rsplit("/", 1)[0] + "/out/cases.json"))
    fsw = generate.DESIGN["plant"]["fsw"]
    out = []
    for case in ref["cases"]:
        m = case["measurement"]
        f = np.array(m["freqHz"])
        meas = 10 ** (np.array(m["magDb"]) / 20) * np.exp(1j * np.radians(m["phaseDeg"]))
        names = [p["key"] for p in case["parameters"]]

        def fun(theta):
            factors, delay = {}, 0.0
            for k, name in enumerate(names):
                if name == "delay":
                    delay = theta[k] / fsw
                else:
                    factors[name] = np.exp(theta[k])
            model = generate.responses(generate.loop_parts(generate.DESIGN, factors, delay), f)[case["response"]]
            return generate.residual_vector(meas, model)

        lower = [p["lower"] for p in case["parameters"]]
        upper = [p["upper"] for p in case["parameters"]]
        times = []
        for _ in range(repeats):
            t0 = time.perf_counter()
            res = least_squares(fun, np.zeros(len(names)), bounds=(lower, upper), method="trf", loss="soft_l1", f_scale=case["fScale"], x_scale="jac", xtol=1e-14, ftol=1e-14, gtol=1e-14, max_nfev=2000)
            times.append((time.perf_counter() - t0) * 1000)
        out.append({"name": case["name"], "ms": float(np.median(times)), "cost": float(res.cost), "nfev": int(res.nfev)})
    print(json.dumps(out))


if __name__ == "__main__":
    main()
